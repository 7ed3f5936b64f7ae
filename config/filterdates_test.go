package config

import (
	"fmt"
	"strings"
	"testing"
	"time"
)

// TestDatesProblems: every bad entry of a dates list is one problem naming
// its path and its value: a date that does not exist (February has no 30th
// day, Gregorian calendar), one written twice (the second names the first),
// dates outside 1800-01-01..2200-12-31 (the span astro computes) and text
// that is no date.
func TestDatesProblems(t *testing.T) {
	_, err := loadTestdata(t, "bad-dates.yaml")
	if err == nil {
		t.Fatal("no error")
	}
	got := problemLines(t, err)
	want := []string{
		`feeds[0].kinds[0].dates[1]: 2027-02-30: not a date (February 2027 has 28 days)`,
		`feeds[0].kinds[0].dates[2]: 2027-06-12: listed twice, also as feeds[0].kinds[0].dates[0] (remove one)`,
		`feeds[0].kinds[0].dates[3]: 1799-12-31: outside the supported range 1800-01-01..2200-12-31 (the sky is computed for these dates only)`,
		`feeds[0].kinds[0].dates[4]: 2201-01-01: outside the supported range 1800-01-01..2200-12-31 (the sky is computed for these dates only)`,
		`feeds[0].kinds[0].dates[5]: "12 June 2027": not a date (write YYYY-MM-DD, e.g. 2027-06-12)`,
	}
	if strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("problems:\n%s\nwant:\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
}

// TestDatesFormats: a dates list reads the same from YAML and TOML, whose
// parsers take an unquoted 2027-06-12 for a date (YAML 1.1 timestamp, TOML
// local date), and from JSON, where dates are strings; the first and last
// supported dates are accepted.
func TestDatesFormats(t *testing.T) {
	const site = "id: a\nname: A\nlatitude: 47.5\nlongitude: 9.7\ntimezone: Europe/Zurich\n"
	docs := map[string]string{
		"yaml": "sites:\n  - " + strings.ReplaceAll(site, "\n", "\n    ") +
			"\nfeeds:\n  - id: f\n    site: a\n    kinds:\n      - kind: sunset\n        dates: [2027-06-12, \"2027-08-21\", 1800-01-01, 2200-12-31]\n",
		"toml": "[[sites]]\nid = \"a\"\nname = \"A\"\nlatitude = 47.5\nlongitude = 9.7\ntimezone = \"Europe/Zurich\"\n" +
			"[[feeds]]\nid = \"f\"\nsite = \"a\"\n[[feeds.kinds]]\nkind = \"sunset\"\ndates = [2027-06-12, \"2027-08-21\", 1800-01-01, 2200-12-31]\n",
		"json": `{"sites": [{"id": "a", "name": "A", "latitude": 47.5, "longitude": 9.7, "timezone": "Europe/Zurich"}],
"feeds": [{"id": "f", "site": "a", "kinds": [{"kind": "sunset", "dates": ["2027-06-12", "2027-08-21", "1800-01-01", "2200-12-31"]}]}]}`,
	}
	want := []string{"2027-06-12", "2027-08-21", "1800-01-01", "2200-12-31"}
	for format, doc := range docs {
		c, err := Parse(strings.NewReader(doc), format)
		if err != nil {
			t.Fatalf("%s: %v", format, err)
		}
		if got := c.Feeds[0].Kinds[0].Dates; fmt.Sprint(got) != fmt.Sprint(want) {
			t.Errorf("%s: dates %q, want %q", format, got, want)
		}
	}
}

// TestDateFilterDates: a dates list keeps its dates and no other; with
// weekdays or months as well, a date must pass every list; an empty list
// keeps every date, as an empty weekdays or months list does. A date is
// its year, month and day, whatever the location of the time.Time
// (2027-06-12 was a Saturday: Gregorian calendar).
func TestDateFilterDates(t *testing.T) {
	day := func(s string) time.Time {
		d, err := time.Parse(time.DateOnly, s)
		if err != nil {
			t.Fatal(err)
		}
		return d
	}
	tokyo := time.FixedZone("UTC+9", 9*3600)
	f := NewDateFilter(nil, nil, []string{"2027-08-21", "2027-06-12", "1800-01-01", "2200-12-31"})
	if f.IsZero() {
		t.Fatal("a filter of dates keeps every date")
	}
	for s, want := range map[string]bool{
		"2027-06-12": true, "2027-08-21": true, "1800-01-01": true, "2200-12-31": true,
		"2027-06-11": false, "2027-06-13": false, "2028-06-12": false, "1969-12-31": false, "1800-01-02": false,
	} {
		if got := f.Allows(day(s)); got != want {
			t.Errorf("Allows(%s) = %v, want %v", s, got, want)
		}
	}
	// 2027-06-12 00:30 in Tokyo is 2027-06-11 15:30 UTC: its date is the 12th
	if !f.Allows(time.Date(2027, 6, 12, 0, 30, 0, 0, tokyo)) || f.Allows(time.Date(2027, 6, 11, 23, 30, 0, 0, tokyo)) {
		t.Error("the date of a time in another location is not its own year, month and day")
	}
	both := NewDateFilter([]string{"sat"}, []string{"jun"}, []string{"2027-06-12", "2027-06-13", "2027-08-21"})
	for s, want := range map[string]bool{"2027-06-12": true, "2027-06-13": false, "2027-08-21": false, "2027-06-19": false} {
		if got := both.Allows(day(s)); got != want {
			t.Errorf("sat, jun and dates: Allows(%s) = %v, want %v", s, got, want)
		}
	}
	if empty := NewDateFilter(nil, nil, []string{}); !empty.IsZero() || !empty.Allows(day("2027-06-11")) {
		t.Error("an empty dates list does not keep every date")
	}
}

// TestTOMLTimeWhereTextBelongs: an unquoted TOML time or date and time
// where text belongs (a plan's start, a dates list) is named in the file's
// terms, not by the decoder's Go type (TOML v1.0.0: local time, local
// date-time), and the hint is what to write, not quotes, which would give
// "not a clock time" or "not a date": the time as HH:MM where a clock time
// belongs, the date where a date belongs.
func TestTOMLTimeWhereTextBelongs(t *testing.T) {
	const head = "[[sites]]\nid = \"a\"\nlatitude = 47.5\nlongitude = 9.7\ntimezone = \"Europe/Zurich\"\n[[feeds]]\nid = \"f\"\nsite = \"a\"\n"
	for doc, want := range map[string]string{
		head + "[[feeds.plans]]\ntitle = \"x\"\ndate = \"every day\"\nstart = 20:00:00\n": `feeds[0].plans[0].start: 20:00:00: must be text, not a time of day (write it "20:00")`,
		head + "[[feeds.kinds]]\nkind = \"lighting:16h\"\nlatest_off = 23:30:00\n":        `feeds[0].kinds[0].latest_off: 23:30:00: must be text, not a time of day (write it "23:30")`,
		head + "[[feeds.kinds]]\nkind = \"sunset\"\ndates = [2027-06-12T10:00:00]\n":      "feeds[0].kinds[0].dates[0]: 2027-06-12T10:00:00: must be a date, not a date and time (write it 2027-06-12)",
	} {
		_, err := Parse(strings.NewReader(doc), "toml")
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("%q: %v\nwant it to contain %q", doc, err, want)
		}
	}
}

// TestDateOfAnotherType: a value of another type where a date belongs (a
// kinds entry's dates, a plan's date) gets the date to write as its hint,
// not quotes around the value, which would give "not a date":
//   - TOML v1.0.0 reads 2027-06-12T10:00:00 unquoted as a local date-time
//     and 2027-06-12T10:00:00Z as an offset date-time;
//   - JSON (RFC 8259) reads 20270612 as a number: the date it spells as
//     YYYYMMDD is written back in quotes, as JSON needs them;
//   - YAML 1.1's timestamp type reads 2027-06-12T10:00:00 unquoted as a
//     date and time.
func TestDateOfAnotherType(t *testing.T) {
	const toml = "[[sites]]\nid = \"a\"\nlatitude = 47.5\nlongitude = 9.7\ntimezone = \"Europe/Zurich\"\n[[feeds]]\nid = \"f\"\nsite = \"a\"\n"
	const json = `{"sites":[{"id":"a","latitude":47.5,"longitude":9.7,"timezone":"Europe/Zurich"}],"feeds":[{"id":"f","site":"a",`
	const yaml = "sites: [{id: a, latitude: 47.5, longitude: 9.7, timezone: Europe/Zurich}]\nfeeds: [{id: f, site: a, "
	for _, c := range []struct{ format, doc, want string }{
		{"toml", toml + "[[feeds.plans]]\ntitle = \"x\"\nstart = \"20:00\"\ndate = 2027-06-12T10:00:00\n",
			"feeds[0].plans[0].date: 2027-06-12T10:00:00: must be a date or a date rule, not a date and time (write it 2027-06-12)"},
		{"toml", toml + "[[feeds.kinds]]\nkind = \"sunset\"\ndates = [2027-06-12T10:00:00Z]\n",
			"feeds[0].kinds[0].dates[0]: 2027-06-12T10:00:00Z: not a date (write it 2027-06-12)"},
		{"toml", toml + "[[feeds.kinds]]\nkind = \"sunset\"\ndates = [10:00:00]\n",
			`feeds[0].kinds[0].dates[0]: 10:00:00: must be a date, not a time of day (write YYYY-MM-DD in quotes, e.g. "2027-06-12")`},
		{"json", json + `"kinds":[{"kind":"sunset","dates":[20270612]}]}]}`,
			`feeds[0].kinds[0].dates[0]: 20270612: must be a date, not a number (write it "2027-06-12")`},
		{"json", json + `"plans":[{"title":"x","start":"20:00","date":20270612}]}]}`,
			`feeds[0].plans[0].date: 20270612: must be a date or a date rule, not a number (write it "2027-06-12")`},
		// 2027-02-30 is no date (February 2027 has 28 days): the form
		{"json", json + `"kinds":[{"kind":"sunset","dates":[20270230]}]}]}`,
			`feeds[0].kinds[0].dates[0]: 20270230: must be a date, not a number (write YYYY-MM-DD in quotes, e.g. "2027-06-12")`},
		{"json", json + `"kinds":[{"kind":"sunset","dates":[true]}]}]}`,
			`feeds[0].kinds[0].dates[0]: true: must be a date, not true/false (write YYYY-MM-DD in quotes, e.g. "2027-06-12")`},
		{"yaml", yaml + "kinds: [{kind: sunset, dates: [2027-06-12T10:00:00]}]}]\n",
			"feeds[0].kinds[0].dates[0]: 2027-06-12T10:00:00: not a date (write it 2027-06-12)"},
		{"yaml", yaml + "plans: [{title: x, start: \"20:00\", date: 2027-06-12T10:00:00}]}]\n",
			"feeds[0].plans[0].date: 2027-06-12T10:00:00: not a date (write it 2027-06-12)"},
		// elsewhere a number where text belongs still gets quotes
		{"json", json + `"kinds":[{"kind":"sunset","label":20270612}]}]}`,
			`feeds[0].kinds[0].label: 20270612: must be text, not a number (put the value in quotes)`},
	} {
		_, err := Parse(strings.NewReader(c.doc), c.format)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s %q: %v\nwant it to contain %q", c.format, c.doc, err, c.want)
		}
	}
}
