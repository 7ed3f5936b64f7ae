package main

import (
	"encoding/csv"
	"encoding/json"
	"strings"
	"testing"
)

// ashgroveLamps is a glasshouse at 53.4° N, 2.2° W with evening lamps to
// 16 h: in January they burn past midnight.
const ashgroveLamps = `sites:
  - id: ashgrove
    name: Ashgrove Nursery
    latitude: 53.4
    longitude: -2.2
    timezone: Europe/London
feeds:
  - id: ashgrove-lamps
    title: Ashgrove lamps
    site: ashgrove
    kinds: [lighting:16h]
`

// An entry whose end falls on the date after its own has next_day in JSON
// and CSV, a lamp period as a plan: the README says next_day marks an end
// on the next date, and the title's "+1 day" says the same. PyEphem 4.1.4
// (centre at −50′, no pressure) at 53.4° N, 2.2° W: on 1 January 2027 the
// Sun rises at 08:24:22 UTC and sets at 16:00:19, a day of 7 h 36 min, so
// the lamps burn until 00:24:22 GMT on 2 January; on 1 March it rises at
// 06:57:08 and sets at 17:46:06, and the lamps are off at 22:57:08.
func TestLampPeriodPastMidnightNextDay(t *testing.T) {
	cfg := writeConfig(t, ashgroveLamps)
	for _, c := range []struct {
		date, end string
		next      bool
	}{
		{"2027-01-01", "2027-01-02T00:24:22", true},
		{"2027-03-01", "2027-03-01T22:57:08", false},
	} {
		code, out, errOut := runCLI(t, "events", "--config", cfg, "--feed", "ashgrove-lamps", "--from", c.date, "--to", c.date, "--format", "json")
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", c.date, code, errOut)
		}
		var doc struct {
			Entries []struct {
				Date    string `json:"date"`
				End     string `json:"end"`
				NextDay *bool  `json:"next_day"`
			} `json:"entries"`
		}
		if err := json.Unmarshal([]byte(out), &doc); err != nil || len(doc.Entries) != 1 {
			t.Fatalf("%s: %v: %s", c.date, err, out)
		}
		e := doc.Entries[0]
		if !strings.HasPrefix(e.End, c.end) {
			t.Errorf("%s: end %s, want %s (PyEphem)", c.date, e.End, c.end)
		}
		if got := e.NextDay != nil && *e.NextDay; got != c.next || (e.NextDay != nil && !*e.NextDay) {
			t.Errorf("%s: next_day %v, want %v (given only when true)", c.date, e.NextDay, c.next)
		}
		code, out, errOut = runCLI(t, "events", "--config", cfg, "--feed", "ashgrove-lamps", "--from", c.date, "--to", c.date, "--format", "csv")
		if code != 0 {
			t.Fatalf("%s: csv: exit %d: %s", c.date, code, errOut)
		}
		rows, err := csv.NewReader(strings.NewReader(out)).ReadAll()
		if err != nil || len(rows) != 2 {
			t.Fatalf("%s: csv: %v: %q", c.date, err, out)
		}
		want := ""
		if c.next {
			want = "true"
		}
		for i, h := range rows[0] {
			if h == "next_day" && rows[1][i] != want {
				t.Errorf("%s: csv next_day %q, want %q", c.date, rows[1][i], want)
			}
		}
	}
}
