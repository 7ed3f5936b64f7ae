package main

import (
	"encoding/json"
	"strings"
	"testing"
)

// README ("date is the local date the event belongs to"): a morning lamp
// period belongs to the morning it ends on, even when it starts the evening
// before: its JSON date is the morning's, the table marks its start "−1
// day" and the title says "from the evening before". At 52.95° N 1.05° W
// on 31 October 2027 sunrise is at 06:59:17 and sunset at 16:35:35 UTC
// (PyEphem 4.1.4, pressure 0, the Sun's centre at −50′): a natural day of
// 9 h 36 min, so 18 h of light need 8 h 24 min of lamps before sunrise,
// from 22:35 UTC on the 30th (23:35 BST, the clocks going back at 02:00
// BST that night).
func TestMorningLampsFromEveningBefore(t *testing.T) {
	cfg := `sites:
  - {id: n, latitude: 52.95, longitude: -1.05, timezone: Europe/London}
feeds:
  - id: m
    site: n
    kinds: [{kind: "lighting:18h", lamps: morning}]
`
	code, out, errOut := runStdin(t, cfg, "events", "-c", "-", "--feed", "m", "--from", "2027-10-31", "--to", "2027-10-31", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var r struct {
		Entries []struct {
			Date, Start, Title string
		} `json:"entries"`
	}
	if err := json.Unmarshal([]byte(out), &r); err != nil {
		t.Fatal(err)
	}
	if len(r.Entries) != 1 {
		t.Fatalf("want one lamp period, got %d: %s", len(r.Entries), out)
	}
	e := r.Entries[0]
	if e.Date != "2027-10-31" || !strings.HasPrefix(e.Start, "2027-10-30T22:3") || !strings.Contains(e.Title, "from the evening before") {
		t.Errorf("date %s, start %s, title %q; want the 31st's period from 22:3x UTC on the 30th, from the evening before", e.Date, e.Start, e.Title)
	}
	code, out, errOut = runStdin(t, cfg, "events", "-c", "-", "--feed", "m", "--from", "2027-10-31", "--to", "2027-10-31")
	if code != 0 || !strings.Contains(out, "2027-10-31 Sun  23:3") || !strings.Contains(out, "BST −1 day") {
		t.Errorf("table (exit %d): want the 31st's row starting 23:3x BST −1 day:\n%s%s", code, out, errOut)
	}
}
