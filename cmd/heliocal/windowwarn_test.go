package main

import (
	"encoding/json"
	"slices"
	"strings"
	"testing"
	"time"
)

// windowFeed is a feed at Auckland whose window, checked at
// windowNow, runs over the local dates 2027-01-06..2027-02-05: at 12:00 UTC
// on 15 January it is already 16 January in Auckland (NZDT, UTC+13 in
// January: tz database), ten days back and twenty ahead. Its dates lie
// just outside the window, on its first and last dates, and one is listed
// by two entries and a plan.
const windowFeed = `sites:
  - {id: kauri-hill, latitude: -36.85, longitude: 174.76, timezone: Pacific/Auckland}
feeds:
  - id: kauri-weddings
    site: kauri-hill
    days_back: 10
    days_ahead: 20
    kinds:
      - kind: golden-hour
        dates: [2027-01-05, 2027-01-06, 2027-02-05, 2027-02-06]
      - kind: sunset
        offset: -15m
        dates: [2027-02-06]
    plans:
      - {title: Open day, date: 2027-02-06}
      - {title: Fair, date: 2027-01-06}
      - {title: Market, date: every 01-01}
`

var windowNow = time.Date(2027, 1, 15, 12, 0, 0, 0, time.UTC)

// check warns about a listed date and a plan's date before the feed's
// window, never published, and notes one after its end, published once
// the window reaches it, days_ahead days before the date. The window's own
// first and last dates, and a yearly plan, give neither.
func TestDatesOutsideWindowWarning(t *testing.T) {
	r := checkReportOf(t, windowFeed, windowNow)
	want := []string{
		`feed "kauri-weddings": golden-hour: 2027-01-05 is before the window's start 2027-01-06 (days_back: 10): it will never be published`,
	}
	wantWarnings(t, r.Warnings, want)
	want = []string{
		`feed "kauri-weddings": golden-hour, sunset-15m and plan "Open day": 2027-02-06 is after the window's end 2027-02-05 (days_ahead: 20): it will be published from 2027-01-17, when the window reaches it`,
	}
	if !slices.Equal(r.Notes, want) {
		t.Errorf("notes:\n%s\nwant:\n%s", strings.Join(r.Notes, "\n"), strings.Join(want, "\n"))
	}
	// a day later the window runs 2027-01-07..2027-02-06: the plan of
	// 2027-01-06 is left behind with the first listed date, and 2027-02-06
	// is published
	r = checkReportOf(t, windowFeed, windowNow.AddDate(0, 0, 1))
	if len(r.Warnings) != 2 || len(r.Notes) != 0 || !strings.HasPrefix(r.Warnings[1], `feed "kauri-weddings": golden-hour and plan "Fair": 2027-01-06 is before the window's start 2027-01-07 (days_back: 10)`) {
		t.Errorf("a day later:\n%s\nnotes:\n%s", strings.Join(r.Warnings, "\n"), strings.Join(r.Notes, "\n"))
	}
}

// No warning when every listed date and plan date lies within the window.
func TestDatesInsideWindowNoWarning(t *testing.T) {
	inside := strings.NewReplacer("2027-01-05, ", "", ", 2027-02-06]", "]", "[2027-02-06]", "[2027-02-01]", "date: 2027-02-06", "date: 2027-01-20").Replace(windowFeed)
	if r := checkReportOf(t, inside, windowNow); len(r.Warnings)+len(r.Notes) != 0 {
		t.Errorf("warnings or notes for dates inside the window:\n%s", strings.Join(append(r.Warnings, r.Notes...), "\n"))
	}
}

// The warning is written as check's other warnings, on standard error
// after "warning: ", the note after the feeds on standard output after
// "note: ", and check still exits 0: dates the window never reaches (1900)
// or reaches only in years (2200), whatever the day the test runs.
func TestDatesOutsideWindowCheckOutput(t *testing.T) {
	cfg := writeConfig(t, `sites:
  - {id: kauri-hill, latitude: -36.85, longitude: 174.76, timezone: Pacific/Auckland}
feeds:
  - id: kauri-weddings
    site: kauri-hill
    days_ahead: 30
    kinds:
      - {kind: sunset, dates: [1900-01-01, 2200-12-31]}
`)
	code, out, errOut := runCLI(t, "check", "--config", cfg)
	if code != 0 || !strings.Contains(out, "(valid)") {
		t.Fatalf("exit %d:\n%s%s", code, out, errOut)
	}
	lines := strings.Split(strings.TrimSpace(errOut), "\n")
	if len(lines) != 1 ||
		!strings.HasPrefix(lines[0], `heliocal: warning: feed "kauri-weddings": sunset: 1900-01-01 is before the window's start `) ||
		!strings.HasSuffix(lines[0], "(days_back: 30): it will never be published") {
		t.Errorf("stderr:\n%s", errOut)
	}
	last := out[strings.LastIndex(strings.TrimSuffix(out, "\n"), "\n")+1:]
	if !strings.HasPrefix(last, `note: feed "kauri-weddings": sunset: 2200-12-31 is after the window's end `) ||
		!strings.HasSuffix(last, "(days_ahead: 30): it will be published from 2200-12-01, when the window reaches it\n") {
		t.Errorf("stdout's last line %q, want the note", last)
	}
	_, js, _ := runCLI(t, "check", "--config", cfg, "--format", "json")
	var doc struct{ Warnings, Notes []string }
	if err := json.Unmarshal([]byte(js), &doc); err != nil || len(doc.Warnings) != 1 || len(doc.Notes) != 1 ||
		!strings.Contains(doc.Warnings[0], `sunset: 1900-01-01 is before the window's start`) ||
		!strings.Contains(doc.Notes[0], `sunset: 2200-12-31 is after the window's end`) {
		t.Errorf("JSON warnings and notes (%v):\n%s", err, js)
	}
}

// check warns of a date a kinds entry lists that its own months or
// weekdays leave out (12 June 2027 is a Saturday: timeanddate.com's 2027
// calendar), naming the feed, the entry, the date and the filter.
func TestDatesFilteredOutWarning(t *testing.T) {
	r := checkReportOf(t, `sites:
  - {id: venue, latitude: 47.5, longitude: 9.7, timezone: Europe/Zurich}
feeds:
  - id: weddings
    site: venue
    days_ahead: 400
    kinds:
      - {kind: sunset, dates: [2027-06-12, 2027-07-10], months: [jul]}
      - {kind: golden-hour, offset: -10m, dates: [2027-06-12, 2027-06-13], weekdays: [sun]}
      - {kind: blue-hour, dates: [2027-06-12], weekdays: [sat], months: [jun]}
`, windowNow)
	want := []string{
		`feed "weddings": sunset: 2027-06-12 is in June, not in its months (jul): it will never be published`,
		`feed "weddings": golden-hour-10m: 2027-06-12 is a Saturday, not in its weekdays (sun): it will never be published`,
	}
	wantWarnings(t, r.Warnings, want)
}

// Kinds entries sharing one dates list (a YAML anchor) and one filter get
// one warning per date naming them together, not one per entry: 12 and 19
// June 2027 are Saturdays (timeanddate.com's 2027 calendar). An entry
// leaving a date out by other weekdays is warned of on its own line.
func TestDatesFilteredOutSharedListOnce(t *testing.T) {
	r := checkReportOf(t, `sites:
  - {id: venue, latitude: 47.5, longitude: 9.7, timezone: Europe/Zurich}
feeds:
  - id: weddings
    site: venue
    days_ahead: 400
    kinds:
      - {kind: sunset, dates: &day [2027-06-12, 2027-06-19], weekdays: [sun]}
      - {kind: golden-hour, dates: *day, weekdays: [sun]}
      - {kind: blue-hour, dates: *day, weekdays: [sun]}
      - {kind: civil-dusk, dates: *day, weekdays: [fri]}
`, windowNow)
	want := []string{
		`feed "weddings": sunset, golden-hour and blue-hour: 2027-06-12 is a Saturday, not in its weekdays (sun): it will never be published`,
		`feed "weddings": sunset, golden-hour and blue-hour: 2027-06-19 is a Saturday, not in its weekdays (sun): it will never be published`,
		`feed "weddings": civil-dusk: 2027-06-12 is a Saturday, not in its weekdays (fri): it will never be published`,
		`feed "weddings": civil-dusk: 2027-06-19 is a Saturday, not in its weekdays (fri): it will never be published`,
	}
	wantWarnings(t, r.Warnings, want)
}

// A listed date that the entry's own weekdays leave out is only that
// warning, never also "before the window's start" or a note that it "will
// be published" once the window reaches it: 13 June 2026 and 17 June 2028
// are Saturdays (timeanddate.com's calendars), outside the window
// 2027-01-05..2028-01-15 of a feed at Zurich checked at windowNow.
func TestDatesFilteredOutNotNotedOutsideWindow(t *testing.T) {
	r := checkReportOf(t, `sites:
  - {id: venue, latitude: 47.5, longitude: 9.7, timezone: Europe/Zurich}
feeds:
  - id: weddings
    site: venue
    days_back: 10
    kinds:
      - {kind: sunset, dates: [2026-06-13, 2028-06-17], weekdays: [sun]}
      - {kind: blue-hour, dates: [2028-06-17]}
`, windowNow)
	want := []string{
		`feed "weddings": sunset: 2026-06-13 is a Saturday, not in its weekdays (sun): it will never be published`,
		`feed "weddings": sunset: 2028-06-17 is a Saturday, not in its weekdays (sun): it will never be published`,
	}
	wantWarnings(t, r.Warnings, want)
	if len(r.Notes) != 1 || !strings.HasPrefix(r.Notes[0], `feed "weddings": blue-hour: 2028-06-17 is after the window's end 2028-01-15 (days_ahead: 365)`) {
		t.Errorf("notes:\n%s\nwant one, of blue-hour alone", strings.Join(r.Notes, "\n"))
	}
}

// check warns of a plan whose date rule names only dates that the plan's
// own months or weekdays leave out (12 June 2027 and 13 June 2026 are
// Saturdays: timeanddate.com's calendars), naming the feed, the plan, its
// dates and the filter, and of such a date outside the window it says only
// that: it will never be published.
func TestPlanDatesFilteredOutWarning(t *testing.T) {
	r := checkReportOf(t, `sites:
  - {id: venue, latitude: 47.5, longitude: 9.7, timezone: Europe/Zurich}
feeds:
  - id: events
    site: venue
    days_ahead: 400
    plans:
      - {title: Rehearsal, date: 2027-06-12, weekdays: [fri]}
      - {title: Frost check, date: every 04-25, months: [may, jun]}
      - {title: Star party, date: saturday nearest new-moon, weekdays: [fri, sun]}
      - {title: Film night, date: every friday, weekdays: [fri]}
      - {title: Open day, date: 2027-06-12, months: [jun], weekdays: [sat]}
      - {title: Last year, date: 2026-06-13, weekdays: [sun]}
      - {title: Open air, date: 2027-06-12, months: [jul]}
`, windowNow)
	want := []string{
		`feed "events": plan "Rehearsal": 2027-06-12 is a Saturday, not in its weekdays (fri): it will never be published`,
		`feed "events": plan "Frost check": its dates (every 04-25) are in April, not in its months (may, jun): it will never be published`,
		`feed "events": plan "Star party": its dates (saturday nearest new-moon) are Saturdays, not in its weekdays (fri, sun): it will never be published`,
		`feed "events": plan "Last year": 2026-06-13 is a Saturday, not in its weekdays (sun): it will never be published`,
		`feed "events": plan "Open air": 2027-06-12 is in June, not in its months (jul): it will never be published`,
	}
	wantWarnings(t, r.Warnings, want)
	if len(r.Notes) != 0 {
		t.Errorf("notes:\n%s\nwant none", strings.Join(r.Notes, "\n"))
	}
}
