package main

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"
	"time"

	"heliocal/astro"
	"heliocal/config"
	"heliocal/feed"
	"heliocal/feed/ical"
)

// One rounding rule for every output: the table, the CSV, a display made
// from the JSON's milliseconds and the calendar file show the same second.
// 29.6 s rounds up; 29.4996 s is 29.500 in JSON and so also shows as :30;
// 29.4994 s (29.499 in JSON) shows as :29 everywhere.
func TestRoundingAgreesEverywhere(t *testing.T) {
	loc, err := time.LoadLocation("Europe/Vienna")
	if err != nil {
		t.Fatal(err)
	}
	site := &config.Site{ID: "orchard", Name: "Test Orchard", Latitude: 48.2, Longitude: 16.4, TimeZone: config.Zone{Location: loc}}
	sunrise, _ := config.ParseKind("sunrise")
	for _, tc := range []struct {
		frac time.Duration
		want string // local clock as shown
	}{
		{600 * time.Millisecond, "06:42:30"},
		{499600 * time.Microsecond, "06:42:30"},
		{499400 * time.Microsecond, "06:42:29"},
		{0, "06:42:29"},
	} {
		at := time.Date(2027, 1, 1, 5, 42, 29, 0, time.UTC).Add(tc.frac) // 06:42:29.x CET
		ev := feed.Event{Kind: sunrise, Start: at, Date: time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC), Direction: 1, DayLength: 8 * time.Hour}

		var table, csvOut, js bytes.Buffer
		if err := writeEventsTable(&table, site, []feed.Event{ev}, nil); err != nil {
			t.Fatal(err)
		}
		if err := writeEventsCSV(&csvOut, site, []feed.Event{ev}, nil); err != nil {
			t.Fatal(err)
		}
		if err := writeEventsJSON(&js, site, ev.Date, ev.Date, []feed.Event{ev}, nil); err != nil {
			t.Fatal(err)
		}
		var doc struct{ Events []struct{ Start string } }
		if err := json.Unmarshal(js.Bytes(), &doc); err != nil {
			t.Fatal(err)
		}
		fromJSON, err := time.Parse(time.RFC3339Nano, doc.Events[0].Start)
		if err != nil {
			t.Fatal(err)
		}
		jsonShown := fromJSON.Round(time.Second).In(loc).Format("15:04:05")

		cal := &feed.Calendar{ID: "orchard-sun", Title: "Orchard", Site: feed.Site{ID: "orchard", Name: "Test Orchard", Latitude: 48.2, Longitude: 16.4, Location: loc},
			WindowStart: ev.Date, WindowEnd: ev.Date.AddDate(0, 0, 2), Stamp: ev.Date,
			Entries: []feed.Entry{{UID: "u@heliocal", Kind: "sunrise", Title: "Sunrise", Start: at, Date: ev.Date}}}
		ics, err := ical.Marshal(cal, ical.Options{Version: "test"})
		if err != nil {
			t.Fatal(err)
		}
		wantICS := "DTSTART;TZID=Europe/Vienna:20270101T" + strings.ReplaceAll(tc.want, ":", "")

		if !strings.Contains(table.String(), tc.want+" CET") {
			t.Errorf("%v: table lacks %s:\n%s", tc.frac, tc.want, table.String())
		}
		if !strings.Contains(csvOut.String(), "2027-01-01T"+tc.want+"+01:00") {
			t.Errorf("%v: CSV lacks %s:\n%s", tc.frac, tc.want, csvOut.String())
		}
		if jsonShown != tc.want {
			t.Errorf("%v: JSON start %s shows as %s, want %s", tc.frac, doc.Events[0].Start, jsonShown, tc.want)
		}
		if !strings.Contains(string(ics), wantICS) {
			t.Errorf("%v: calendar lacks %s", tc.frac, wantICS)
		}
	}
}

// A date-only event (the date day length crosses a threshold) has a date and
// no start in JSON, and no clock time in the table or the CSV.
func TestDateOnlyEvents(t *testing.T) {
	code, out, errOut := runCLI(t, "events", "--lat", "48.2", "--lon", "16.4", "--tz", "Europe/Vienna",
		"--from", "2027-03-01", "--to", "2027-10-31", "--kinds", "photoperiod:12h", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var doc struct{ Events []map[string]any }
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	// common practice: day length passes 12 h a few days before the March
	// equinox and a few days after the September one at mid-latitudes
	if len(doc.Events) != 2 || doc.Events[0]["direction"] != "rising" || doc.Events[1]["direction"] != "falling" {
		t.Fatalf("events %v, want one rising in March and one falling in September", doc.Events)
	}
	for _, e := range doc.Events {
		if _, ok := e["start"]; ok || e["date"] == nil {
			t.Errorf("date-only event %v: want a date and no start", e)
		}
	}
	_, table, _ := runCLI(t, "events", "--lat", "48.2", "--lon", "16.4", "--tz", "Europe/Vienna",
		"--from", "2027-03-01", "--to", "2027-10-31", "--kinds", "photoperiod:12h")
	_, csvOut, _ := runCLI(t, "events", "--lat", "48.2", "--lon", "16.4", "--tz", "Europe/Vienna",
		"--from", "2027-03-01", "--to", "2027-10-31", "--kinds", "photoperiod:12h", "--format", "csv")
	for name, text := range map[string]string{"table": table, "csv": csvOut} {
		if strings.Contains(text, "00:00") {
			t.Errorf("%s shows a clock time for a date-only event:\n%s", name, text)
		}
		for _, w := range []string{"rising", "falling"} {
			if !strings.Contains(text, w) {
				t.Errorf("%s lacks the direction %q:\n%s", name, w, text)
			}
		}
	}
	if !strings.Contains(table, "all day") {
		t.Errorf("table does not mark the date-only rows:\n%s", table)
	}
}

// The table writes the Moon's illuminated fraction as the feeds do, "13 %
// lit", with a space and half a percent rounding up (12.5 % is 13 %, as
// math.Round gives; fmt's %.0f would give 12, rounding half to even).
func TestTableIlluminationAsFeeds(t *testing.T) {
	k, err := config.ParseKind("moonrise")
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		lit  float64
		want string
	}{{0.125, "13 % lit"}, {0.375, "38 % lit"}, {0.22, "22 % lit"}} {
		e := feed.Event{Kind: k, Start: time.Date(2027, 1, 1, 0, 53, 0, 0, time.UTC), Illuminated: c.lit}
		if got := detailsAt(&e, time.UTC, astro.Observer{}); !strings.HasSuffix(got, c.want) {
			t.Errorf("illuminated %v: %q, want it to end %q", c.lit, got, c.want)
		}
	}
}
