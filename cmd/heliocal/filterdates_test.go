package main

import (
	"encoding/csv"
	"encoding/json"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

const weddingConfig = `
sites:
  - id: venue
    name: Wedding venue
    latitude: 47.5
    longitude: 9.7
    timezone: Europe/Zurich
feeds:
  - id: weddings
    site: venue
    kinds:
      - kind: golden-hour
        dates: &weddings [2027-06-12, 2027-08-21]
      - kind: blue-hour
        dates: *weddings
      - kind: sunset
        dates: [2027-06-12]
`

// A kinds entry's dates keep its entries on those dates in every output of
// events --feed (table, JSON, CSV, iCalendar) as in the published feed:
// golden and blue hour (morning and evening) on two dates, the sunset on
// one, nothing on the other dates of the summer.
func TestEventsFeedDates(t *testing.T) {
	cfg := writeConfig(t, weddingConfig)
	window := []string{"--from", "2027-06-01", "--to", "2027-08-31"}
	want := map[string]int{"2027-06-12": 5, "2027-08-21": 4} // entries per date

	code, out, errOut := runCLI(t, append([]string{"-c", cfg, "events", "--feed", "weddings", "--format", "json"}, window...)...)
	if code != 0 {
		t.Fatalf("json: exit %d: %s", code, errOut)
	}
	var doc struct {
		Entries []struct {
			Date, Kind string
		} `json:"entries"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	got := map[string]int{}
	for _, e := range doc.Entries {
		got[e.Date]++
		if e.Kind == "sunset" && e.Date != "2027-06-12" {
			t.Errorf("json: sunset on %s", e.Date)
		}
	}
	if len(got) != len(want) || got["2027-06-12"] != want["2027-06-12"] || got["2027-08-21"] != want["2027-08-21"] {
		t.Errorf("json: entries per date %v, want %v", got, want)
	}

	code, out, errOut = runCLI(t, append([]string{"-c", cfg, "events", "--feed", "weddings", "--format", "csv"}, window...)...)
	if code != 0 {
		t.Fatalf("csv: exit %d: %s", code, errOut)
	}
	rows, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	got = map[string]int{}
	for _, r := range rows[1:] {
		got[r[0]]++
	}
	if len(got) != len(want) || got["2027-06-12"] != want["2027-06-12"] || got["2027-08-21"] != want["2027-08-21"] {
		t.Errorf("csv: entries per date %v, want %v", got, want)
	}

	code, out, errOut = runCLI(t, append([]string{"-c", cfg, "events", "--feed", "weddings"}, window...)...)
	if code != 0 {
		t.Fatalf("table: exit %d: %s", code, errOut)
	}
	got = map[string]int{}
	for _, d := range regexp.MustCompile(`(?m)^(\d{4}-\d\d-\d\d) `).FindAllStringSubmatch(out, -1) {
		got[d[1]]++
	}
	if len(got) != len(want) || got["2027-06-12"] != want["2027-06-12"] || got["2027-08-21"] != want["2027-08-21"] {
		t.Errorf("table: entries per date %v, want %v:\n%s", got, want, out)
	}

	code, out, errOut = runCLI(t, append([]string{"-c", cfg, "events", "--feed", "weddings", "--format", "ics"}, window...)...)
	if code != 0 {
		t.Fatalf("ics: exit %d: %s", code, errOut)
	}
	starts := regexp.MustCompile(`DTSTART;TZID=Europe/Zurich:(\d{8})T`).FindAllStringSubmatch(out, -1)
	got = map[string]int{}
	for _, s := range starts {
		got[s[1]]++
	}
	if len(got) != 2 || got["20270612"] != 5 || got["20270821"] != 4 {
		t.Errorf("ics: events per start date %v, want 5 on 20270612 and 4 on 20270821", got)
	}
}

// check refuses a dates list with a bad date, one listed twice or one
// outside the supported range: exit 2, one line per problem naming the
// field and the value.
func TestCheckBadDates(t *testing.T) {
	b, err := os.ReadFile(filepath.Join("..", "..", "testdata", "config", "bad-dates.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	code, _, errOut := runStdin(t, string(b), "check", "-c", "-")
	if code != exitInput {
		t.Fatalf("exit %d, want %d: %s", code, exitInput, errOut)
	}
	for _, line := range []string{
		"standard input:16: feeds[0].kinds[0].dates[1]: 2027-02-30: not a date",
		"standard input:16: feeds[0].kinds[0].dates[2]: 2027-06-12: listed twice, also as feeds[0].kinds[0].dates[0] (remove one)",
		"standard input:16: feeds[0].kinds[0].dates[4]: 2201-01-01: outside the supported range 1800-01-01..2200-12-31",
	} {
		if !strings.Contains(errOut, line) {
			t.Errorf("stderr lacks %q:\n%s", line, errOut)
		}
	}
}
