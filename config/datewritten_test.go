package config

import (
	"fmt"
	"strings"
	"testing"
)

// dateDocs writes a configuration whose kinds entry lists the date v (in
// place "dates") or whose plan has v as its date rule (in place "plan"),
// in each format: YAML and TOML with v unquoted and quoted, JSON quoted.
func dateDocs(place, v string) map[string]string {
	yamlValue := func(q string) string {
		if place == "dates" {
			return fmt.Sprintf("    kinds:\n      - kind: sunset\n        dates: [2027-06-11, %s]\n", q)
		}
		return fmt.Sprintf("    plans:\n      - title: Open day\n        date: %s\n", q)
	}
	tomlValue := func(q string) string {
		if place == "dates" {
			return fmt.Sprintf("[[feeds.kinds]]\nkind = \"sunset\"\ndates = [2027-06-11, %s]\n", q)
		}
		return fmt.Sprintf("[[feeds.plans]]\ntitle = \"Open day\"\ndate = %s\n", q)
	}
	jsonValue := fmt.Sprintf(`"plans": [{"title": "Open day", "date": %q}]`, v)
	if place == "dates" {
		jsonValue = fmt.Sprintf(`"kinds": [{"kind": "sunset", "dates": ["2027-06-11", %q]}]`, v)
	}
	const yamlHead = "sites:\n  - {id: a, latitude: 47.5, longitude: 9.7, timezone: Europe/Zurich}\nfeeds:\n  - id: f\n    site: a\n"
	const tomlHead = "[[sites]]\nid = \"a\"\nlatitude = 47.5\nlongitude = 9.7\ntimezone = \"Europe/Zurich\"\n[[feeds]]\nid = \"f\"\nsite = \"a\"\n"
	return map[string]string{
		"yaml unquoted": yamlHead + yamlValue(v),
		"yaml quoted":   yamlHead + yamlValue(`"`+v+`"`),
		"toml unquoted": tomlHead + tomlValue(v),
		"toml quoted":   tomlHead + tomlValue(`"`+v+`"`),
		"json":          `{"sites": [{"id": "a", "latitude": 47.5, "longitude": 9.7, "timezone": "Europe/Zurich"}], "feeds": [{"id": "f", "site": "a", ` + jsonValue + `}]}`,
	}
}

// TestDatesWrittenOneWay: a date of the file, in a kinds entry's dates
// list or as a plan's date rule, is written YYYY-MM-DD in YAML, TOML and
// JSON alike, quoted or not. YAML 1.1 would read an unquoted 2027-6-12 as
// the timestamp 2027-06-12 and TOML refuses it as a syntax error: each is
// refused as in JSON, naming the field and the value as written, with the
// date as it should be written. February 2027 has 28 days (Gregorian
// calendar: 2027 is not divisible by 4).
func TestDatesWrittenOneWay(t *testing.T) {
	for _, c := range []struct{ value, problem string }{
		{"2027-6-12", "2027-6-12: not a date (write it 2027-06-12)"},
		{"2027-06-1", "2027-06-1: not a date (write it 2027-06-01)"},
		{"2027-02-30", "2027-02-30: not a date (February 2027 has 28 days)"},
		{"27-06-12", "27-06-12: not a date (write the year in full: 2027-06-12)"},
		{"2027-13-01", "2027-13-01: not a date (a month is 01..12: write YYYY-MM-DD, e.g. 2027-06-12)"},
		{"12.06.2027", "12.06.2027: not a date (12 June 2027: write it 2027-06-12)"},
	} {
		for _, place := range []string{"dates", "plan"} {
			path := "feeds[0].kinds[0].dates[1]"
			if place == "plan" {
				path = "feeds[0].plans[0].date"
			}
			for name, doc := range dateDocs(place, c.value) {
				format, _, _ := strings.Cut(name, " ")
				_, err := Parse(strings.NewReader(doc), format)
				if err == nil {
					t.Errorf("%s, %s %s: accepted", c.value, place, name)
					continue
				}
				got := problemLines(t, err)
				if want := path + ": " + c.problem; len(got) != 1 || got[0] != want {
					t.Errorf("%s, %s %s: problems\n%s\nwant\n%s", c.value, place, name, strings.Join(got, "\n"), want)
				}
			}
		}
	}
	// the date as it should be written is read from every format
	for _, place := range []string{"dates", "plan"} {
		for name, doc := range dateDocs(place, "2027-06-12") {
			format, _, _ := strings.Cut(name, " ")
			c, err := Parse(strings.NewReader(doc), format)
			if err != nil {
				t.Errorf("2027-06-12, %s %s: %v", place, name, err)
				continue
			}
			got := c.Feeds[0].Plans
			if place == "dates" && fmt.Sprint(c.Feeds[0].Kinds[0].Dates) != "[2027-06-11 2027-06-12]" {
				t.Errorf("2027-06-12, %s %s: dates %q", place, name, c.Feeds[0].Kinds[0].Dates)
			} else if place == "plan" && (len(got) != 1 || got[0].Date != "2027-06-12") {
				t.Errorf("2027-06-12, %s %s: plans %+v", place, name, got)
			}
		}
	}
}

// TestDatesWrittenOneWayEveryProblem: every date written otherwise is one
// problem of its own, listed with the file's other problems: several in one
// TOML list (each quoted in turn for the parser), and beside a key written
// twice in YAML and TOML (whose documents are read without the second).
func TestDatesWrittenOneWayEveryProblem(t *testing.T) {
	docs := map[string]string{
		"toml": "[[sites]]\nid = \"a\"\nlatitude = 47.5\nlongitude = 9.7\nLatitude = 47.5\ntimezone = \"Europe/Zurich\"\n[[feeds]]\nid = \"f\"\nsite = \"a\"\n" +
			"[[feeds.kinds]]\nkind = \"sunset\"\ndates = [2027-6-12,2027-06-13, 2027-06-1]\n[[feeds.plans]]\ntitle = \"Open day\"\ndate = 27-06-12\r\n",
		"yaml": "sites:\n  - {id: a, latitude: 47.5, longitude: 9.7, Latitude: 47.5, timezone: Europe/Zurich}\nfeeds:\n  - id: f\n    site: a\n" +
			"    kinds:\n      - kind: sunset\n        dates: [2027-6-12, 2027-06-13, 2027-06-1]\n    plans:\n      - title: Open day\n        date: 27-06-12\n",
	}
	for format, doc := range docs {
		_, err := Parse(strings.NewReader(doc), format)
		if err == nil {
			t.Fatalf("%s: accepted", format)
		}
		got := problemLines(t, err)
		want := []string{
			"feeds[0].kinds[0].dates[0]: 2027-6-12: not a date (write it 2027-06-12)",
			"feeds[0].kinds[0].dates[2]: 2027-06-1: not a date (write it 2027-06-01)",
			"feeds[0].plans[0].date: 27-06-12: not a date (write the year in full: 2027-06-12)",
		}
		if len(got) != 4 || !strings.HasPrefix(got[0], "sites[0].latitude: duplicate key") || strings.Join(got[1:], "\n") != strings.Join(want, "\n") {
			t.Errorf("%s: problems\n%s\nwant the duplicate latitude, then\n%s", format, strings.Join(got, "\n"), strings.Join(want, "\n"))
		}
	}
}

// TestDateHintYearLast: a date written with its year last is given the
// date to write. With dots it is day.month.year, as dates are written in
// Germany, Switzerland and much of Europe (common practice); with - or /
// the order is told by a number over 12, which is no month, and a date
// that reads as two is given both to choose from. A two-digit year after
// dots is 20YY, as a feed's window is around today. The days of the months
// are the Gregorian calendar's (2028 is a leap year, 2027 is not).
func TestDateHintYearLast(t *testing.T) {
	for in, want := range map[string]string{
		"12.06.2027": "12 June 2027: write it 2027-06-12",
		"6.7.2027":   "6 July 2027: write it 2027-07-06",
		"29.02.2028": "29 February 2028: write it 2028-02-29",
		"29.02.2027": "February 2027 has 28 days",
		"12.13.2027": "a month is 01..12: write YYYY-MM-DD, the year first, e.g. 2027-06-12",
		"13/06/2027": "13 June 2027: write it 2027-06-13",
		"06/13/2027": "13 June 2027: write it 2027-06-13",
		"12-06-2027": "write YYYY-MM-DD, the year first: 2027-06-12 for 12 June, 2027-12-06 for 6 December",
		"06/06/2027": "6 June 2027: write it 2027-06-06",
		"12.06-2027": "write YYYY-MM-DD, the year first, e.g. 2027-06-12",
		"6.7.27":     "6 July 2027: write it 2027-07-06",
		"12.06.27":   "write YYYY-MM-DD, the year in full: 2027-06-12 for 12 June 2027, 2012-06-27 for 27 June 2012",
	} {
		if got := DateHint(in); got != want {
			t.Errorf("%s: %q, want %q", in, got, want)
		}
	}
}
