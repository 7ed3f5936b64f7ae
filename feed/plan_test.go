package feed

import (
	"context"
	"fmt"
	"regexp"
	"strings"
	"testing"
	"time"

	"heliocal/config"
)

func planEntries(t *testing.T, s *config.Site, first, last string, plans ...config.Plan) []Entry {
	t.Helper()
	sk, err := NewSky(date(first).AddDate(0, 0, -PlanMargin), date(last).AddDate(0, 0, PlanMargin))
	if err != nil {
		t.Fatal(err)
	}
	for i := range plans {
		cfg := &config.Config{Sites: []config.Site{*s}, Feeds: []config.Feed{{ID: "f", Site: s.ID, Plans: plans[i : i+1]}}}
		cfg.ApplyDefaults()
		if err := cfg.Validate(); err != nil {
			t.Fatalf("plan %d: %v", i, err)
		}
	}
	es, err := sk.PlanEntries(context.Background(), s, "f", plans, date(first), date(last))
	if err != nil {
		t.Fatal(err)
	}
	return es
}

// entryOn returns the one entry of es on the local date day (YYYY-MM-DD).
func entryOn(t *testing.T, es []Entry, day string) *Entry {
	t.Helper()
	var e *Entry
	for i, x := range es {
		if x.Date.Format(time.DateOnly) == day {
			if e != nil {
				t.Fatalf("two entries on %s", day)
			}
			e = &es[i]
		}
	}
	if e == nil {
		t.Fatalf("no entry on %s: %s", day, dates(es))
	}
	return e
}

func dates(es []Entry) string {
	var out []string
	for _, e := range es {
		out = append(out, e.Date.Format(time.DateOnly))
	}
	return strings.Join(out, " ")
}

// TestWeekdayRules checks "<weekday> nearest|before|after new-moon" around
// month and year ends and a clock change. New moons from the USNO
// moon-phase data (testdata/reference/moon-phases.csv): 2024-03-10 09:00 UT
// (mp-0073), 2024-11-01 12:47 UT (mp-0105), 2024-12-30 22:27 UT (mp-0113);
// the local date is the zone's; weekdays from the Gregorian calendar
// (1 November 2024 was a Friday, 30 December 2024 a Monday).
func TestWeekdayRules(t *testing.T) {
	ny := site(t, "ny", 40.71, -74.0, "America/New_York")
	akl := site(t, "akl", -36.85, 174.76, "Pacific/Auckland")
	tests := []struct {
		s           *config.Site
		rule        string
		first, last string
		want        string
	}{
		// 2024-12-30 17:27 EST, a Monday: Friday 27th is 3 days back, 3 January 4 ahead
		{ny, "friday nearest new-moon", "2024-12-20", "2025-01-10", "2024-12-27"},
		// 2024-12-31 11:27 NZDT, a Tuesday: Friday 3 January is 3 days ahead
		{akl, "friday nearest new-moon", "2024-12-20", "2025-01-10", "2025-01-03"},
		{ny, "saturday after new-moon", "2024-12-20", "2025-01-10", "2025-01-04"},
		{ny, "monday after new-moon", "2024-12-20", "2025-01-10", "2025-01-06"}, // strictly after: not the 30th
		{ny, "monday before new-moon", "2024-12-20", "2025-01-10", "2024-12-23"},
		{ny, "monday nearest new-moon", "2024-12-20", "2025-01-10", "2024-12-30"}, // the date itself
		// 2024-11-01 08:47 EDT, a Friday: Tuesday 29 October is 3 days back
		{ny, "tuesday nearest new-moon", "2024-10-20", "2024-11-10", "2024-10-29"},
		// Sunday 3 November 2024: clocks go back in New York
		{ny, "sunday after new-moon", "2024-10-20", "2024-11-10", "2024-11-03"},
		// 2024-03-10 05:00 EDT, the Sunday clocks go forward
		{ny, "sunday nearest new-moon", "2024-03-01", "2024-03-20", "2024-03-10"},
		{ny, "saturday nearest new-moon", "2024-03-01", "2024-03-20", "2024-03-09"},
		// window edges: the new moon of 30 December lies outside a January window
		{ny, "saturday after new-moon", "2025-01-01", "2025-01-10", "2025-01-04"},
		{ny, "friday nearest new-moon", "2024-12-28", "2025-01-10", ""},
	}
	for _, tc := range tests {
		es := planEntries(t, tc.s, tc.first, tc.last, config.Plan{Title: "Night", Date: tc.rule})
		if got := dates(es); got != tc.want {
			t.Errorf("%s, %s %s..%s: dates %q, want %q", tc.s.ID, tc.rule, tc.first, tc.last, got, tc.want)
		}
	}
	// The clock change: 20:00 local on Sunday 3 November 2024 is 01:00 UT
	// on the 4th (EST, UTC−5); 20:00 on Sunday 27 October is 00:00 UT (EDT).
	es := planEntries(t, ny, "2024-10-20", "2024-11-10",
		config.Plan{Title: "Night", Date: "sunday after new-moon", Start: "20:00", For: config.Duration(2 * time.Hour)})
	if len(es) != 1 || !es[0].Start.Equal(time.Date(2024, 11, 4, 1, 0, 0, 0, time.UTC)) || es[0].End.Sub(es[0].Start) != 2*time.Hour {
		t.Errorf("plan on the clock change: %+v", es)
	}
}

// Two anchors of a weekday rule can fall to the same weekday, and the date
// is then listed once, and its entry names both, in the order they happen.
// USNO moon-phase data (testdata/reference/moon-phases.csv): new moon
// 2024-11-01 12:47 UT (mp-0105), first quarter 2024-11-09 05:55 UT
// (mp-0106), full moon 2024-11-15 21:28 UT (mp-0107); London keeps GMT
// (UT) in November, and 9 November 2024 was a Saturday (Gregorian
// calendar). "saturday after" each: 2 November, then 16 November for the
// first quarter and again for the full moon (the first Saturday after
// Friday 15th); "tuesday nearest" each: 29 October (outside the window),
// then 12 November for both (3 days after the 9th, 3 days before the 15th).
func TestWeekdayRuleTwoAnchorsOneDate(t *testing.T) {
	london := site(t, "london", 51.5, -0.13, "Europe/London")
	for _, tc := range []struct {
		rule, want string
	}{
		{"saturday after moon-phases", "2024-11-02 2024-11-16"},
		{"tuesday nearest moon-phases", "2024-11-12"},
	} {
		es := planEntries(t, london, "2024-11-01", "2024-11-20", config.Plan{Title: "Night", Date: tc.rule})
		if got := dates(es); got != tc.want {
			t.Errorf("%s: dates %q, want %q", tc.rule, got, tc.want)
			continue
		}
		// the entry of the shared date names both of its anchors
		if d := es[len(es)-1].Description; !regexp.MustCompile(
			`\(first quarter Sat 9 Nov 2024 05:5\d GMT; full moon Fri 15 Nov 2024 21:2\d GMT\)\.\n`).MatchString(d) {
			t.Errorf("%s: the entry of two anchors says\n%s\nwant the first quarter and the full moon", tc.rule, d)
		}
		// and the entry of a date with one anchor only that one
		if d := es[0].Description; len(es) > 1 && (!strings.Contains(d, "(new moon Fri 1 Nov 2024 12:4") || strings.Contains(d, ";")) {
			t.Errorf("%s: the entry of one anchor says\n%s\nwant the new moon alone", tc.rule, d)
		}
	}
}

// A rule on a group of kinds names one of its kinds in words, not the
// group's configuration name: "the Saturday after a Moon phase", "the date
// of an equinox or solstice"; a rule on one kind names it with "the".
// USNO (testdata/reference/moon-phases.csv, mp-0106): first quarter
// 2024-11-09 05:55 UT; USNO Earth's seasons (testdata/reference/seasons.csv,
// december-solstice-2024): December solstice 2024-12-21
// 09:20 UT.
func TestRuleTextGroups(t *testing.T) {
	london := site(t, "london", 51.5, -0.13, "Europe/London")
	for _, tc := range []struct{ rule, first, last, want string }{
		{"saturday after moon-phases", "2024-11-16", "2024-11-16", "Date: the Saturday after a Moon phase (first quarter Sat 9 Nov 2024 05:5"},
		{"moon-phases", "2024-11-09", "2024-11-09", "Date: the date of a Moon phase (first quarter Sat 9 Nov 2024 05:5"},
		{"seasons", "2024-12-21", "2024-12-21", "Date: the date of an equinox or solstice (December solstice Sat 21 Dec 2024 09:2"},
		{"sunday nearest seasons", "2024-12-22", "2024-12-22", "Date: the Sunday nearest an equinox or solstice (December solstice"},
		{"saturday after first-quarter", "2024-11-16", "2024-11-16", "Date: the Saturday after the first quarter (first quarter Sat 9 Nov"},
	} {
		es := planEntries(t, london, tc.first, tc.last, config.Plan{Title: "Night", Date: tc.rule})
		if len(es) != 1 || !strings.HasPrefix(es[0].Description, tc.want) {
			t.Errorf("%s: %d entries, %+v; want one whose description starts %q", tc.rule, len(es), es, tc.want)
		}
	}
}

// TestPlanDates checks the other date rules over a year: every day,
// every <weekday>, every MM-DD (29 February only in leap years), one date,
// and each date of an event kind.
func TestPlanDates(t *testing.T) {
	s := site(t, "vienna", 48.2, 16.4, "Europe/Vienna")
	count := func(rule, first, last string) int {
		return len(planEntries(t, s, first, last, config.Plan{Title: "x", Date: rule}))
	}
	// Gregorian calendar: 2024 has 366 days and 52 Fridays; 2028 is a leap year
	for _, tc := range []struct {
		rule, first, last string
		want              int
	}{
		{"every day", "2024-01-01", "2024-12-31", 366},
		{"every friday", "2024-01-01", "2024-12-31", 52},
		{"every 04-25", "2024-01-01", "2026-12-31", 3},
		{"every 02-29", "2025-01-01", "2028-12-31", 1},
		{"2025-06-12", "2025-01-01", "2025-12-31", 1},
		{"2025-06-12", "2025-06-13", "2025-12-31", 0},
		// USNO seasons: one June solstice a year
		{"june-solstice", "2024-01-01", "2025-12-31", 2},
	} {
		if got := count(tc.rule, tc.first, tc.last); got != tc.want {
			t.Errorf("%q %s..%s: %d dates, want %d", tc.rule, tc.first, tc.last, got, tc.want)
		}
	}
	// USNO moon phases 2024: full moons on 25 Jan 17:54 UT (mp-0067) and
	// 23 May 13:53 UT (mp-0083), local dates in Vienna the same.
	es := planEntries(t, s, "2024-01-01", "2024-06-30", config.Plan{Title: "Walk", Date: "full-moon"})
	got := dates(es)
	for _, d := range []string{"2024-01-25", "2024-05-23"} {
		if !strings.Contains(got, d) {
			t.Errorf("full-moon dates %s lack %s", got, d)
		}
	}
	if len(es) != 6 {
		t.Errorf("%d full-moon dates in the first half of 2024, want 6", len(es))
	}
}

// TestPlanSouthern checks a plan at a southern site against the USNO table
// for 42°27′ S, 76°30′ E (UTC+4, rows of testdata/reference/sun-times.csv):
// "sunset+30m" for 2 h, and an end written before the start that falls on
// the next day. Tolerance 75 s (the table's minute rounding).
func TestPlanSouthern(t *testing.T) {
	zone := time.FixedZone("UTC+04:00", 4*3600)
	s := &config.Site{ID: "south", Name: "South", Latitude: -42.45, Longitude: 76.5, TimeZone: config.Zone{Location: zone}}
	checked := 0
	for _, day := range usnoDays(t, "Open-ocean point 42 27 S", zone) {
		set, ok := day.times["sunset"]
		if !ok {
			continue
		}
		es := planEntries(t, s, day.date, day.date,
			config.Plan{Title: "Sundowner", Date: "every day", Start: "sunset+30m", For: config.Duration(2 * time.Hour), Months: []string{"jan", "feb", "mar", "apr", "may", "jun", "jul", "aug", "sep", "oct", "nov", "dec"}},
			config.Plan{Title: "Late watch", Date: "every day", Start: "23:00", End: "01:30"})
		if len(es) != 2 {
			t.Fatalf("%s: %d entries", day.date, len(es))
		}
		sun, watch := es[0], es[1]
		if sun.Title != "Sundowner" || !near(sun.Start, set.Add(30*time.Minute), 75*time.Second) || sun.End.Sub(sun.Start) != 2*time.Hour {
			t.Errorf("%s (%v): %q %s, want sunset %s + 30 min", day.date, day.ids, sun.Title, sun.Start.In(zone), set.Format("15:04"))
		}
		if watch.End.Sub(watch.Start) != 150*time.Minute || !watch.Facts.NextDay || !strings.Contains(watch.Description, "the next day") {
			t.Errorf("%s: late watch %s–%s, next day %v", day.date, watch.Start.In(zone), watch.End.In(zone), watch.Facts.NextDay)
		}
		checked++
	}
	if checked < 4 {
		t.Fatalf("%d dates checked", checked)
	}
}

// TestPlanPolar checks plans at 80° N, 0° (USNO table, UT, 2015): on
// 21 December (polar night, row sun-0182) and 14 April (no sunset, row
// sun-0169) a plan starting at sunset gets an all-day note instead of a
// time; on 21 October the sunset at 12:24 (row sun-0180) starts it.
func TestPlanPolar(t *testing.T) {
	s := site(t, "lat80", 80, 0, "UTC")
	// the reason, the date's note, is written within the sentence, in
	// brackets and without a capital
	for d, why := range map[string]string{"2015-12-21": "(polar night: the Sun does not rise today).", "2015-04-14": "(midnight sun: the Sun does not set today)."} {
		es := planEntries(t, s, d, d, config.Plan{Title: "Evening round", Date: "every day", Start: "sunset", End: "23:00"})
		if len(es) != 1 || !es[0].AllDay || es[0].Facts.Missing != "sunset" || !strings.Contains(es[0].Title, "no sunset today") ||
			!strings.Contains(es[0].Description, "the start, sunset, does not happen on ") || !strings.Contains(es[0].Description, why) {
			t.Errorf("%s: %+v, want an all-day note ending %q", d, es, why)
		}
	}
	es := planEntries(t, s, "2015-10-21", "2015-10-21", config.Plan{Title: "Evening round", Date: "every day", Start: "sunset", End: "23:00"})
	if len(es) != 1 || es[0].AllDay || !near(es[0].Start, time.Date(2015, 10, 21, 12, 24, 0, 0, time.UTC), 75*time.Second) {
		t.Errorf("21 October: %+v", es)
	}
}

// TestPlanUIDsStable: the same plan computed over two windows that share
// dates gives the shared dates the same UIDs, and an all-day plan has a
// date and no time.
func TestPlanUIDsStable(t *testing.T) {
	s := site(t, "vienna", 48.2, 16.4, "Europe/Vienna")
	p := config.Plan{Title: "Frost", Date: "every 04-25"}
	a := planEntries(t, s, "2025-01-01", "2026-12-31", p)
	b := planEntries(t, s, "2026-01-01", "2027-12-31", p)
	if len(a) != 2 || len(b) != 2 || a[1].UID != b[0].UID || a[0].UID == a[1].UID {
		t.Fatalf("UIDs %v / %v", a, b)
	}
	if !a[0].AllDay || a[0].End.Sub(a[0].Start) != 24*time.Hour {
		t.Errorf("all-day plan %+v", a[0])
	}
}

// TestPlanClockSkipped: in America/Havana the clocks go from 00:00 to 01:00
// on Sunday 14 March 2027 (tz database), so a plan at "00:30" that night
// starts at 01:30 CDT (05:30 UT), on its own date, not the evening before.
func TestPlanClockSkipped(t *testing.T) {
	s := site(t, "hav", 23.13, -82.38, "America/Havana")
	loc := s.TimeZone.Location
	if _, off := time.Date(2027, 3, 14, 2, 0, 0, 0, loc).Zone(); off != -4*3600 {
		t.Fatalf("zone data: offset %d on 14 March 2027", off)
	}
	es := planEntries(t, s, "2027-03-13", "2027-03-15", config.Plan{Title: "Night check", Date: "every day", Start: "00:30", For: config.Duration(30 * time.Minute)})
	want := []time.Time{
		time.Date(2027, 3, 13, 5, 30, 0, 0, time.UTC), // 00:30 CST
		time.Date(2027, 3, 14, 5, 30, 0, 0, time.UTC), // 01:30 CDT
		time.Date(2027, 3, 15, 4, 30, 0, 0, time.UTC), // 00:30 CDT
	}
	if len(es) != 3 {
		t.Fatalf("%d entries", len(es))
	}
	for i, e := range es {
		if !e.Start.Equal(want[i]) || localDate(e.Start, loc) != e.Date {
			t.Errorf("%s: starts %s, want %s", e.Date.Format(time.DateOnly), e.Start.In(loc), want[i].In(loc))
		}
		// the night the clocks skip 00:30, the description says it moved and why
		moved := strings.Contains(e.Description, "moved from 00:30, which the clocks skip on Sun 14 Mar 2027: the clocks go forward for summer time by 1 h")
		if moved != (i == 1) {
			t.Errorf("%s: description %q (moved note %v)", e.Date.Format(time.DateOnly), e.Description, moved)
		}
	}
}

// TestPlanClockSkippedEnd: "an end before the start is on the next day"
// compares the clock times as written, not a start the clocks skip once
// moved. In America/Havana the clocks go from 00:00 CST (UT − 5 h) to 01:00
// CDT (UT − 4 h) on Sunday 14 March 2027 (tz database: Rule Cuba, Mar
// Sun>=8 0:00s): a skipped clock time moves by the jump, as elsewhere
// (00:30 is 05:30 UT, 01:30 CDT).
func TestPlanClockSkippedEnd(t *testing.T) {
	s := site(t, "hav", 23.13, -82.38, "America/Havana")
	const moved = "(moved from %s, which the clocks skip on Sun 14 Mar 2027: the clocks go forward for summer time by 1 h)"
	for _, c := range []struct {
		name, start, end string
		date             string
		from, to         string // UTC; "" for the date's note
		text             string // in the description
	}{
		// 00:30 moves to 01:30 CDT, the end as written: nothing is left
		{"start moved to the end", "00:30", "01:30", "2027-03-14", "", "",
			"No time today: the start, 00:30, is at 01:30:00 CDT " + fmt.Sprintf(moved, "00:30") + ", not before the end, 01:30, on Sunday 14 March 2027."},
		{"start moved before the end", "00:30", "01:45", "2027-03-14", "2027-03-14T05:30:00Z", "2027-03-14T05:45:00Z",
			"From 01:30:00 CDT " + fmt.Sprintf(moved, "00:30") + " to 01:45:00 CDT."},
		// both in the skipped hour: both move, the plan keeps its 30 min,
		// and the move is said once
		{"start and end skipped", "00:10", "00:40", "2027-03-14", "2027-03-14T05:10:00Z", "2027-03-14T05:40:00Z",
			"From 01:10:00 CDT to 01:40:00 CDT (both moved by 1 h from 00:10 and 00:40: the clocks skip 00:00–01:00 on Sun 14 Mar 2027 for summer time)."},
		// an end past midnight in the skipped hour: 00:30 the next day,
		// the date said once, the move beside it
		{"end skipped the next day", "23:00", "00:30", "2027-03-13", "2027-03-14T04:00:00Z", "2027-03-14T05:30:00Z",
			"From 23:00:00 CST to 01:30:00 CDT the next day (Sun 14 Mar; moved from 00:30, which the clocks skip: they go forward for summer time by 1 h)."},
	} {
		t.Run(c.name, func(t *testing.T) {
			es := planEntries(t, s, "2027-03-13", "2027-03-15", config.Plan{Title: "Night check", Date: "every day", Start: c.start, End: c.end})
			e := entryOn(t, es, c.date)
			if !strings.Contains(e.Description, c.text) {
				t.Errorf("description\n%s\nwant %q", e.Description, c.text)
			}
			if c.from == "" {
				if !e.AllDay || e.Title != "Night check: no time today" {
					t.Errorf("%+v, want the date's note", e)
				}
				return
			}
			from, _ := time.Parse(time.RFC3339, c.from)
			to, _ := time.Parse(time.RFC3339, c.to)
			if e.AllDay || !e.Start.Equal(from) || !e.End.Equal(to) || e.Facts.NextDay != (c.date == "2027-03-13") {
				t.Errorf("%s–%s (next day %v), want %s–%s", e.Start.UTC(), e.End.UTC(), e.Facts.NextDay, from, to)
			}
		})
	}
}

// TestPlanClockSkippedSaidOnce: a plan's clock times the clocks skip are
// said to have moved once per sentence, the date once. The changes, from the
// tz database:
//   - Asia/Beirut, Rule Lebanon 1993 max - Mar lastSun 0:00 1:00 S: 00:00
//     EET (UT + 2 h) to 01:00 EEST (UT + 3 h) on Sunday 28 March 2027;
//   - America/Santiago, Rule Chile 2023 max - Sep Sun>=2 4:00u 1:00 -: 00:00
//     -04 to 01:00 -03 on Sunday 6 September 2026 (spring in the south);
//   - Europe/London, Rule EU 1981 max - Mar lastSun 1:00u 1:00 S: 01:00 GMT
//     to 02:00 BST on Sunday 28 March 2027 (a skip not at midnight).
func TestPlanClockSkippedSaidOnce(t *testing.T) {
	type clockChange struct {
		zone          string
		lat, lon      float64
		change        string // a UTC instant of the change, from the tz database
		before, after int    // the offsets around it, in hours
	}
	beirut := clockChange{"Asia/Beirut", 33.89, 35.50, "2027-03-27T22:00:00Z", 2, 3}
	santiago := clockChange{"America/Santiago", -33.45, -70.67, "2026-09-06T04:00:00Z", -4, -3}
	london := clockChange{"Europe/London", 51.51, -0.13, "2027-03-28T01:00:00Z", 0, 1}
	for _, c := range []struct {
		name string
		clockChange
		start, end string
		date       string // the plan's date
		from, to   string // UTC
		text       string // the description
	}{
		{"Beirut, astronomical dusk to an end skipped the next day", beirut,
			"astronomical-dusk", "00:30", "2027-03-27", "", "2027-03-27T22:30:00Z",
			" to 01:30:00 EEST the next day (Sun 28 Mar; moved from 00:30, which the clocks skip: they go forward for summer time by 1 h).\n"},
		{"Beirut, midnight check", beirut,
			"00:00", "00:45", "2027-03-28", "2027-03-27T22:00:00Z", "2027-03-27T22:45:00Z",
			"From 01:00:00 EEST to 01:45:00 EEST (both moved by 1 h from 00:00 and 00:45: the clocks skip 00:00–01:00 on Sun 28 Mar 2027 for summer time)."},
		{"Santiago, an end skipped the next day", santiago,
			"23:30", "00:30", "2026-09-05", "2026-09-06T03:30:00Z", "2026-09-06T04:30:00Z",
			"From 23:30:00 UTC−04 to 01:30:00 UTC−03 the next day (Sun 6 Sep; moved from 00:30, which the clocks skip: they go forward for summer time by 1 h)."},
		{"Santiago, midnight check", santiago,
			"00:00", "00:45", "2026-09-06", "2026-09-06T04:00:00Z", "2026-09-06T04:45:00Z",
			"From 01:00:00 UTC−03 to 01:45:00 UTC−03 (both moved by 1 h from 00:00 and 00:45: the clocks skip 00:00–01:00 on Sun 6 Sep 2026 for summer time)."},
		{"London, both in the skipped hour", london,
			"01:15", "01:45", "2027-03-28", "2027-03-28T01:15:00Z", "2027-03-28T01:45:00Z",
			"From 02:15:00 BST to 02:45:00 BST (both moved by 1 h from 01:15 and 01:45: the clocks skip 01:00–02:00 on Sun 28 Mar 2027 for summer time)."},
		{"London, an end skipped the next day", london,
			"23:00", "01:30", "2027-03-27", "2027-03-27T23:00:00Z", "2027-03-28T01:30:00Z",
			"From 23:00:00 GMT to 02:30:00 BST the next day (Sun 28 Mar; moved from 01:30, which the clocks skip: they go forward for summer time by 1 h)."},
		// the start past midnight names the date; the end's move does not
		// name it again
		{"London, a start past midnight and an end skipped", london,
			"sunset+6h", "01:30", "2027-03-27", "", "2027-03-28T01:30:00Z",
			" (6 h after sunset) the next day (Sun 28 Mar) to 02:30:00 BST (moved from 01:30, which the clocks skip: they go forward for summer time by 1 h).\n"},
		{"London, the start alone skipped", london,
			"01:30", "03:00", "2027-03-28", "2027-03-28T01:30:00Z", "2027-03-28T02:00:00Z",
			"From 02:30:00 BST (moved from 01:30, which the clocks skip on Sun 28 Mar 2027: the clocks go forward for summer time by 1 h) to 03:00:00 BST."},
	} {
		t.Run(c.name, func(t *testing.T) {
			s := site(t, "s", c.lat, c.lon, c.zone)
			ch, _ := time.Parse(time.RFC3339, c.change)
			if _, off := ch.Add(-time.Second).In(s.TimeZone.Location).Zone(); off != c.before*3600 {
				t.Fatalf("zone data: offset %d s before %s", off, ch)
			}
			if _, off := ch.In(s.TimeZone.Location).Zone(); off != c.after*3600 {
				t.Fatalf("zone data: offset %d s at %s", off, ch)
			}
			es := planEntries(t, s, c.date, c.date, config.Plan{Title: "Midnight check", Date: "every day", Start: c.start, End: c.end})
			if len(es) != 1 {
				t.Fatalf("%d entries", len(es))
			}
			e := es[0]
			if !strings.Contains(e.Description, c.text) {
				t.Errorf("description\n%s\nwant %q", e.Description, c.text)
			}
			if n := strings.Count(e.Description, "moved"); n != 1 {
				t.Errorf("description\n%s\nsays %d times that a time moved", e.Description, n)
			}
			if day := ch.In(s.TimeZone.Location).Format("Mon 2 Jan"); strings.Count(e.Description, day) != 1 {
				t.Errorf("description\n%s\nnames %s %d times", e.Description, day, strings.Count(e.Description, day))
			}
			to, _ := time.Parse(time.RFC3339, c.to)
			if !e.End.Equal(to) {
				t.Errorf("ends %s, want %s", e.End.UTC(), to)
			}
			if c.from != "" {
				if from, _ := time.Parse(time.RFC3339, c.from); !e.Start.Equal(from) {
					t.Errorf("starts %s, want %s", e.Start.UTC(), from)
				}
			}
		})
	}
}

// In America/Santiago the clocks go from 00:00 to 01:00 on Sunday 6
// September 2026 (tz database): a plan at "00:00" that night starts at 01:00
// and its description says so.
func TestPlanMidnightSkippedSaysSo(t *testing.T) {
	s := site(t, "scl", -33.45, -70.67, "America/Santiago")
	loc := s.TimeZone.Location
	es := planEntries(t, s, "2026-09-05", "2026-09-06", config.Plan{Title: "Gate", Date: "every day", Start: "00:00", End: "02:00"})
	if len(es) != 2 {
		t.Fatalf("%d entries", len(es))
	}
	if got := es[1].Start.In(loc).Format("15:04"); got != "01:00" {
		t.Fatalf("6 September starts %s, want 01:00", got)
	}
	if !strings.Contains(es[1].Description, "(moved from 00:00, which the clocks skip on Sun 6 Sep 2026: the clocks go forward for summer time by 1 h)") {
		t.Errorf("description %q does not say the start moved", es[1].Description)
	}
	if strings.Contains(es[0].Description, "moved") || strings.Contains(es[1].Description, "moved from 02:00") {
		t.Errorf("a clock time that exists is said to have moved: %q / %q", es[0].Description, es[1].Description)
	}
}

// TestPlanSunTimesByDate checks that a plan's Sun time found on its own
// dates only (the feed's kinds do not need that altitude) is the one a pass
// over the whole window finds (the feed lists astronomical dusk too), to
// the millisecond the outputs show, and that both feeds give the plan the
// same text.
func TestPlanSunTimesByDate(t *testing.T) {
	s := site(t, "vienna", 48.2, 16.4, "Europe/Vienna")
	first, last := date("2027-01-01"), date("2027-12-31")
	sk, err := NewSky(first.AddDate(0, 0, -PlanMargin), last.AddDate(0, 0, PlanMargin))
	if err != nil {
		t.Fatal(err)
	}
	plan := config.Plan{Title: "Public night", Date: "saturday nearest new-moon", Start: "astronomical-dusk", End: "nautical-dawn"}
	kind := func(n string) config.KindSpec { k, _ := config.ParseKind(n); return config.KindSpec{Kind: k} }
	alone := &config.Feed{ID: "f", Site: s.ID, Kinds: []config.KindSpec{kind("sunrise")}, Plans: []config.Plan{plan}}
	shared := &config.Feed{ID: "f", Site: s.ID, Kinds: []config.KindSpec{kind("sunrise"), kind("astronomical-dusk"), kind("nautical-dawn")}, Plans: []config.Plan{plan}}
	plans := func(f *config.Feed) []Entry {
		cal, err := sk.Calendar(context.Background(), s, f, first, last, Options{})
		if err != nil {
			t.Fatal(err)
		}
		var out []Entry
		for _, e := range cal.Entries {
			if e.Kind == KindPlan {
				out = append(out, e)
			}
		}
		return out
	}
	a, b := plans(alone), plans(shared)
	// 2027 has 13 new moons, 7 January to 27 December (USNO phases, from
	// memory), each with its Saturday
	if len(a) != 13 || len(b) != len(a) {
		t.Fatalf("%d and %d plan entries, want 13", len(a), len(b))
	}
	for i := range a {
		if !ToMillisecond(a[i].Start).Equal(ToMillisecond(b[i].Start)) || !ToMillisecond(a[i].End).Equal(ToMillisecond(b[i].End)) ||
			a[i].Description != b[i].Description || a[i].UID != b[i].UID {
			t.Errorf("%s: found by date %s–%s, over the window %s–%s", a[i].Date.Format(time.DateOnly), a[i].Start, a[i].End, b[i].Start, b[i].End)
		}
	}
}

// The legal caution (hunting hours, lighting-up times, aviation night: the
// project's rule for times people may rely on) goes on plans whose start or
// end the sky sets, not on a plan kept by the clock, where nothing is
// computed.
func TestPlanCautionOnlyForSkyTimes(t *testing.T) {
	s := site(t, "scl", -33.45, -70.67, "America/Santiago")
	for _, c := range []struct {
		plan config.Plan
		want bool
	}{
		{config.Plan{Title: "Late shift", Date: "every day", Start: "23:30", End: "00:30"}, false},
		{config.Plan{Title: "Gate", Date: "every day", Start: "20:00", For: config.Duration(time.Hour)}, false},
		{config.Plan{Title: "Dusk walk", Date: "every day", Start: "sunset", End: "22:00"}, true},
		{config.Plan{Title: "Dawn patrol", Date: "every day", Start: "05:00", End: "sunrise"}, true},
	} {
		es := planEntries(t, s, "2027-01-10", "2027-01-10", c.plan)
		if len(es) != 1 {
			t.Fatalf("%s: %d entries", c.plan.Title, len(es))
		}
		if got := strings.Contains(es[0].Description, "local rules decide legal times"); got != c.want {
			t.Errorf("%s: caution %v, want %v:\n%s", c.plan.Title, got, c.want, es[0].Description)
		}
	}
}

// The anchor named in a plan's description is shown to the minute by the
// one rounding rule, rounded, not cut: USNO moon-phase data
// (testdata/reference/moon-phases.csv, times rounded to the minute): new
// moon 2024-05-08 03:22 UT (mp-0081), 2024-06-06 12:38 UT (mp-0085) and
// 2024-12-30 22:27 UT (mp-0113), each 4 to 16 s before the minute that
// USNO names; London keeps BST (UT+1) in May and June, GMT in December.
// 6 June 2024 was a Thursday, 30 December 2024 a Monday (Gregorian
// calendar): the Saturdays nearest are 8 June and 28 December.
func TestPlanAnchorRoundedToMinute(t *testing.T) {
	london := site(t, "london", 51.5, -0.13, "Europe/London")
	es := planEntries(t, london, "2024-05-01", "2024-12-31", config.Plan{Title: "Night", Date: "saturday nearest new-moon"})
	want := map[string]string{
		"2024-05-11": "(new moon Wed 8 May 2024 04:22 BST)",
		"2024-06-08": "(new moon Thu 6 Jun 2024 13:38 BST)",
		"2024-12-28": "(new moon Mon 30 Dec 2024 22:27 GMT)",
	}
	for _, e := range es {
		d := e.Date.Format(time.DateOnly)
		if w, ok := want[d]; ok {
			if !strings.Contains(e.Description, w) {
				t.Errorf("%s: description\n%s\nwant %s", d, e.Description, w)
			}
			delete(want, d)
		}
	}
	if len(want) > 0 {
		t.Errorf("no entries on %v", want)
	}
}

// TestPlanEndFirstAfterStart: an event end is the first event of its kind
// after the start, on the start's date or the next. Values from PyEphem
// (tools/pyephem-checks/values.py, plan_ends_past_midnight; the Sun's
// centre at −12°, −18° and −6°, at −0.8333° for the sunset).
func TestPlanEndFirstAfterStart(t *testing.T) {
	wren := site(t, "wren", 52.3, 0, "Europe/London")
	isfjell := site(t, "isfjell", 78.92, 11.93, "Arctic/Longyearbyen")
	fjord := site(t, "fjord", 69.7, 19.0, "Europe/Oslo")
	walk := config.Plan{Title: "Dusk walk", Date: "every friday", Start: "nautical-dusk", End: "astronomical-dusk"}
	watch := config.Plan{Title: "Fjord watch", Date: "every day", Start: "sunset", End: "civil-dusk"}
	for _, c := range []struct {
		name        string
		s           *config.Site
		first, last string
		plan        config.Plan
		date        string
		start, end  string // UTC, PyEphem; end "" when there is none
		nextDay     bool
		text        string // in the description
	}{
		// 52.3° N, Friday 14 May 2027: nautical dusk 21:28:03.594 UT, the
		// astronomical dusk after it 23:02:51.695 UT (00:02:52 BST, 15 May)
		{"dusk past midnight", wren, "2027-05-14", "2027-05-14", walk, "2027-05-14",
			"2027-05-14T21:28:03.594Z", "2027-05-14T23:02:51.695Z", true,
			"to 00:02:52 BST (astronomical dusk) the next day (Sat 15 May)."},
		// the same date alone in a month: its times found for it alone
		{"dusk past midnight, found by date", wren, "2027-05-01", "2027-05-31",
			config.Plan{Title: "Dusk walk", Date: "2027-05-14", Start: "nautical-dusk", End: "astronomical-dusk"}, "2027-05-14",
			"2027-05-14T21:28:03.594Z", "2027-05-14T23:02:51.695Z", true, "the next day (Sat 15 May)."},
		// 78.92° N, 10 September 2027: sunset 19:10:23.224 UT, civil dusk
		// 22:12:47.295 UT (00:12:47 CEST on the 11th)
		{"civil dusk past midnight", isfjell, "2027-09-10", "2027-09-12", watch, "2027-09-10",
			"2027-09-10T19:10:23.224Z", "2027-09-10T22:12:47.295Z", true, "the next day (Sat 11 Sep)."},
		// 11 September has two civil dusks, 00:12:47 and 23:46:29 CEST
		// (21:46:29.433 UT): the one after the sunset of 19:01:08.424 UT
		{"second dusk of the date", isfjell, "2027-09-10", "2027-09-12", watch, "2027-09-11",
			"2027-09-11T19:01:08.424Z", "2027-09-11T21:46:29.433Z", false, "(civil dusk)."},
		{"second dusk of the date, found by date", isfjell, "2027-09-01", "2027-09-30",
			config.Plan{Title: "Fjord watch", Date: "2027-09-11", Start: "sunset", End: "civil-dusk"}, "2027-09-11",
			"2027-09-11T19:01:08.424Z", "2027-09-11T21:46:29.433Z", false, "(civil dusk)."},
		// 69.7° N, 19.0° E, 28 July 2027: an evening end from 00:00 CEST
		// (22:00 UT on the 27th, tz database: Europe/Oslo, UT + 2 h in
		// summer) is that evening's sunset, 21:52:26.776 UT, not the
		// evening before's at 22:04:53.562 UT on the 27th (00:04:54 CEST)
		// (plan_evening_starts)
		{"the date's evening", fjord, "2027-07-28", "2027-07-28",
			config.Plan{Title: "Long day", Date: "every day", Start: "00:00", End: "sunset"}, "2027-07-28",
			"2027-07-27T22:00:00Z", "2027-07-28T21:52:26.776Z", false, "to 23:52:27 CEST (sunset)."},
		// 9 September: sunset at 21:19:49 CEST, then no civil dusk until
		// 22:12:47 UT on the 10th, which is on the 11th in CEST
		{"none that day or the next", isfjell, "2027-09-09", "2027-09-09", watch, "2027-09-09",
			"2027-09-09T19:19:49Z", "", false, "From 21:19:49 CEST (sunset); no civil dusk that day or the next to end it."},
	} {
		t.Run(c.name, func(t *testing.T) {
			e := entryOn(t, planEntries(t, c.s, c.first, c.last, c.plan), c.date)
			start, _ := time.Parse(time.RFC3339, c.start)
			if !near(e.Start, start, 3*time.Second) {
				t.Errorf("start %s, want %s (PyEphem)", e.Start.UTC(), start)
			}
			if c.end == "" {
				if !e.End.IsZero() {
					t.Errorf("end %s, want none", e.End.UTC())
				}
			} else if end, _ := time.Parse(time.RFC3339, c.end); !near(e.End, end, 3*time.Second) {
				t.Errorf("end %s, want %s (PyEphem)", e.End.UTC(), end)
			}
			if e.Facts.NextDay != c.nextDay || !strings.Contains(e.Description, c.text) {
				t.Errorf("next day %v, description\n%s\nwant %v and %q", e.Facts.NextDay, e.Description, c.nextDay, c.text)
			}
		})
	}
}

// TestPlanEveningStart: a plan that starts at an evening event (a sunset,
// a dusk) takes the one of its date's evening, the first after the date's
// solar noon, past midnight too, not the first of the date, which may be
// the evening before's; an evening without one gets the date's note. A
// plan with a start alone is an instant: "At 23:44:18 BST", where a span
// says "From … to …" (one whose end is not found too, above).
// Values from PyEphem (tools/pyephem-checks/values.py,
// plan_ends_past_midnight and plan_evening_starts; the Sun's centre at
// −0.8333° and −18°).
func TestPlanEveningStart(t *testing.T) {
	glen := site(t, "glen", 56.5, -4.0, "Europe/London")
	fjord := site(t, "fjord", 69.7, 19.0, "Europe/Oslo")
	isfjell := site(t, "isfjell", 78.92, 11.93, "Arctic/Longyearbyen")
	party := config.Plan{Title: "Star party", Date: "every day", Start: "astronomical-dusk"}
	walk := config.Plan{Title: "Sunset walk", Date: "every day", Start: "sunset"}
	watch := config.Plan{Title: "Fjord watch", Date: "every day", Start: "sunset", End: "civil-dusk"}
	for _, c := range []struct {
		name        string
		s           *config.Site
		first, last string
		plan        config.Plan
		date        string
		start       string // UTC, PyEphem; "" for the date's note
		text        string // in the description
	}{
		// 56.5° N: astronomical dusk 22:44:17.914 UT on Saturday 24 April
		// 2027; on the evening of 1 May 23:43:54.004 UT (00:43:54 BST on
		// the 2nd), not the evening before's 23:30:10.684 UT on 30 April
		// (00:30:11 BST on 1 May); none on the evening of 2 May
		{"dusk before midnight", glen, "2027-04-24", "2027-05-02", party, "2027-04-24", "2027-04-24T22:44:17.914Z", "At 23:44:18 BST (astronomical dusk)."},
		{"dusk past midnight", glen, "2027-04-24", "2027-05-02", party, "2027-05-01", "2027-05-01T23:43:54.004Z",
			"At 00:43:54 BST (astronomical dusk) the next day (Sun 2 May)."},
		{"dusk past midnight, found by date", glen, "2027-04-01", "2027-05-31",
			config.Plan{Title: "Star party", Date: "every saturday", Start: "astronomical-dusk"}, "2027-05-01", "2027-05-01T23:43:54.004Z",
			"the next day (Sun 2 May)."},
		{"no dusk that evening", glen, "2027-04-24", "2027-05-02", party, "2027-05-02", "",
			"does not happen on the evening of Sunday 2 May 2027 (no astronomical dusk or dawn tonight: astronomical twilight lasts all night)."},
		{"no dusk that evening, found by date", glen, "2027-04-01", "2027-05-31",
			config.Plan{Title: "Star party", Date: "2027-05-02", Start: "astronomical-dusk"}, "2027-05-02", "",
			"does not happen on the evening of Sunday 2 May 2027 (no astronomical dusk or dawn tonight: astronomical twilight lasts all night)."},
		// 69.7° N, 19.0° E: sunsets 22:21:45.115 UT on 26 July 2027
		// (00:21:45 CEST on the 27th), 22:04:53.562 UT on the 27th (00:04:54
		// CEST on the 28th), 21:52:26.776 UT on the 28th (23:52:27 CEST)
		{"sunset past midnight", fjord, "2027-07-26", "2027-07-28", walk, "2027-07-26", "2027-07-26T22:21:45.115Z", "the next day (Tue 27 Jul)."},
		{"sunset past midnight again", fjord, "2027-07-26", "2027-07-28", walk, "2027-07-27", "2027-07-27T22:04:53.562Z", "the next day (Wed 28 Jul)."},
		{"sunset before midnight", fjord, "2027-07-26", "2027-07-28", walk, "2027-07-28", "2027-07-28T21:52:26.776Z", "At 23:52:27 CEST (sunset)."},
		// 78.92° N, 11.93° E: sunset 21:51:28.353 UT on 14 April 2027, then
		// 22:17:31.223 UT on the 15th (00:17:31 CEST on the 16th)
		{"the evening of the 14th", isfjell, "2027-04-14", "2027-04-16", watch, "2027-04-14", "2027-04-14T21:51:28.353Z", "From 23:51:28 CEST (sunset)"},
		{"the evening of the 15th", isfjell, "2027-04-14", "2027-04-16", watch, "2027-04-15", "2027-04-15T22:17:31.223Z",
			"From 00:17:31 CEST (sunset) the next day (Fri 16 Apr)"},
		{"the evening of the 15th, found by date", isfjell, "2027-04-01", "2027-04-30",
			config.Plan{Title: "Fjord watch", Date: "2027-04-15", Start: "sunset", End: "civil-dusk"}, "2027-04-15", "2027-04-15T22:17:31.223Z",
			"From 00:17:31 CEST (sunset) the next day (Fri 16 Apr)"},
	} {
		t.Run(c.name, func(t *testing.T) {
			e := entryOn(t, planEntries(t, c.s, c.first, c.last, c.plan), c.date)
			if c.start == "" {
				if !e.AllDay || e.Facts.Missing != c.plan.Start || !strings.HasSuffix(e.Title, ": no "+inText(config.Kind{Name: c.plan.Start})+" today") {
					t.Errorf("%+v, want the date's all-day note", e)
				}
			} else if start, _ := time.Parse(time.RFC3339, c.start); e.AllDay || !near(e.Start, start, 2*time.Second) {
				t.Errorf("start %s, want %s (PyEphem)", e.Start.UTC(), start)
			}
			if !strings.Contains(e.Description, c.text) {
				t.Errorf("description\n%s\nwant %q", e.Description, c.text)
			}
		})
	}
}

// TestPlanEveningStartSkyline: over a skyline the Sun may pass behind a peak
// in the morning and come out again; a plan at sunset takes the evening's,
// after solar noon, which is the sunset kind's (the date's last
// disappearance), not the peak's. The valley is invented: a 45° peak to
// the east-southeast, which the Sun of 21 June 2027 passes behind in the
// morning (the sun-hidden span, checked before noon).
func TestPlanEveningStartSkyline(t *testing.T) {
	s := site(t, "valley", 47.05, 11.2, "Europe/Vienna")
	s.Skyline = [][2]float64{{0, 3}, {85, 3}, {90, 45}, {103, 45}, {108, 3}, {300, 3}}
	sk := sky(t, "2027-06-14", "2027-06-28")
	ev, _, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "sunset", "sun-hidden", "solar-noon"), date("2027-06-21"), date("2027-06-21"))
	if err != nil {
		t.Fatal(err)
	}
	by := map[string][]Event{}
	for _, e := range ev {
		by[e.Kind.Name] = append(by[e.Kind.Name], e)
	}
	if len(by["sunset"]) != 1 || len(by["sun-hidden"]) != 1 || len(by["solar-noon"]) != 1 || !by["sun-hidden"][0].End.Before(by["solar-noon"][0].Start) {
		t.Fatalf("want one sunset and a hidden span before noon: %+v", by)
	}
	es := planEntries(t, s, "2027-06-21", "2027-06-21", config.Plan{Title: "Valley dusk", Date: "every day", Start: "sunset"})
	if len(es) != 1 || !es[0].Start.Equal(by["sunset"][0].Start) {
		t.Errorf("%+v, want the start at the sunset %s, not the peak's %s", es, by["sunset"][0].Start, by["sun-hidden"][0].Start)
	}
}

// TestPlanEveningStartSkylineMorningOnly: over a skyline that hides the
// Sun from late morning on, a date has no evening sunset, and a plan at
// sunset gets the date's note, not the next date's disappearance in the
// morning, which follows that date's own appearance over the hills. The
// valley is invented: open from 100° to 150° of azimuth, a 45° wall
// elsewhere; at 47.05° N in late December the Sun rises at about 127°
// and culminates at about 19.5° (δ = −23.4°, the obliquity, IAU value),
// so it goes behind the wall at 150° before noon and stays there.
func TestPlanEveningStartSkylineMorningOnly(t *testing.T) {
	s := site(t, "gorge", 47.05, 11.2, "Europe/Vienna")
	s.Skyline = [][2]float64{{0, 45}, {95, 45}, {100, 0}, {150, 0}, {155, 45}}
	sk := sky(t, "2027-12-14", "2027-12-28")
	ev, _, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "sunrise", "sunset", "solar-noon"), date("2027-12-20"), date("2027-12-22"))
	if err != nil {
		t.Fatal(err)
	}
	noons := map[string]time.Time{}
	for _, e := range ev {
		if e.Kind.Name == "solar-noon" {
			noons[e.Date.Format(time.DateOnly)] = e.Start
		}
	}
	sets := 0
	for _, e := range ev {
		if e.Kind.Name == "sunset" {
			sets++
			if noon := noons[e.Date.Format(time.DateOnly)]; noon.IsZero() || !e.Start.Before(noon) {
				t.Fatalf("sunset %s on %s, solar noon %s: want it before noon", e.Start, e.Date.Format(time.DateOnly), noon)
			}
		}
	}
	if sets != 3 {
		t.Fatalf("%d sunsets over 20–22 December, want one each morning: %+v", sets, ev)
	}
	es := planEntries(t, s, "2027-12-20", "2027-12-22", config.Plan{Title: "Gorge dusk", Date: "every day", Start: "sunset"})
	if len(es) != 3 {
		t.Fatalf("%d entries, want one a date: %+v", len(es), es)
	}
	for _, e := range es {
		if !e.AllDay || !strings.Contains(e.Title, "no sunset today") {
			t.Errorf("%s: %q from %s, want the note of an evening without a sunset", e.Date.Format(time.DateOnly), e.Title, e.Start)
		}
		// the Sun rose over the gap: neither polar night nor a day
		// behind the skyline
		if strings.Contains(e.Description, "polar night") || strings.Contains(e.Description, "behind the skyline") {
			t.Errorf("%s: the reason does not fit the date: %s", e.Date.Format(time.DateOnly), e.Description)
		}
	}
	// a wall at 45° all round: the Sun, up over the flat horizon (19.5° at
	// noon), stays behind it, as the sunset kind's note says
	s.Skyline = [][2]float64{{0, 45}}
	es = planEntries(t, s, "2027-12-21", "2027-12-21", config.Plan{Title: "Gorge dusk", Date: "every day", Start: "sunset"})
	if len(es) != 1 || !strings.Contains(es[0].Description, "(no direct Sun today: the Sun stays behind the skyline)") {
		t.Errorf("%+v, want the note of the Sun behind the skyline all day, not of the polar night", es)
	}
	// likewise a raised horizon: at 65° N on the December solstice the noon
	// Sun is at 90° − 65° − 23.44° = 1.56° (the obliquity, IAU value), over
	// the flat horizon, under a horizon of 5°
	h := site(t, "fell", 65, 25, "Europe/Helsinki")
	h.Horizon = 5
	es = planEntries(t, h, "2027-12-21", "2027-12-21", config.Plan{Title: "Fell dusk", Date: "every day", Start: "sunset"})
	if len(es) != 1 || !strings.Contains(es[0].Description, "(no direct Sun today: the Sun stays behind the skyline)") {
		t.Errorf("%+v, want the note of the Sun behind the raised horizon all day, not of the polar night", es)
	}
}

// TestPlanEndClockPassed: an end clock time before the start is on the next
// day only when it is before 12:00; one at or after 12:00 that the start
// has passed leaves the date no time, and its note says so. At 56.5° N the
// astronomical dusk is at 23:44:18 BST on Saturday 24 April 2027 and, on
// the evening of Saturday 1 May, 00:43:54 BST on the 2nd (PyEphem,
// tools/pyephem-checks/values.py, plan_evening_starts: 22:44:17.914 and
// 23:43:54.004 UT).
func TestPlanEndClockPassed(t *testing.T) {
	glen := site(t, "glen", 56.5, -4.0, "Europe/London")
	party := func(end string) config.Plan {
		return config.Plan{Title: "Star party", Date: "every saturday", Start: "astronomical-dusk", End: end}
	}
	for _, c := range []struct {
		name  string
		plan  config.Plan
		date  string
		end   string // UTC; "" for the note
		title string
		text  string // in the description
	}{
		{"evening end passed", party("23:30"), "2027-04-24", "",
			"Star party: astronomical dusk (23:44) comes after the end, 23:30",
			"No time today: the start, astronomical dusk, at 23:44:18 BST, comes after the end, 23:30, on Saturday 24 April 2027."},
		{"evening end passed past midnight", party("23:30"), "2027-05-01", "",
			"Star party: astronomical dusk (00:44 Sun) comes after the end, 23:30",
			"No time today: the start, astronomical dusk, at 00:43:54 BST the next day (Sun 2 May), comes after the end, 23:30, on Saturday 1 May 2027."},
		// 01:00 BST is 00:00 UT (tz database: Europe/London on summer time,
		// UT + 1 h, from 28 March 2027)
		{"end past midnight", party("01:00"), "2027-04-24", "2027-04-25T00:00:00Z",
			"Star party", "From 23:44:18 BST (astronomical dusk) to 01:00:00 BST the next day (Sun 25 Apr)."},
		{"start and end past midnight", party("01:00"), "2027-05-01", "2027-05-02T00:00:00Z",
			"Star party", "From 00:43:54 BST (astronomical dusk) the next day (Sun 2 May) to 01:00:00 BST."},
		// two clock times that never leave a time ("20:00" to "18:00") are
		// refused by the configuration's check (plan-end-never.yaml)
	} {
		t.Run(c.name, func(t *testing.T) {
			e := entryOn(t, planEntries(t, glen, "2027-04-24", "2027-05-01", c.plan), c.date)
			if e.Title != c.title || !strings.Contains(e.Description, c.text) {
				t.Errorf("%q\n%s\nwant %q and %q", e.Title, e.Description, c.title, c.text)
			}
			if c.end == "" {
				if !e.AllDay || e.Facts.NextDay {
					t.Errorf("%+v, want an all-day note", e)
				}
			} else if end, _ := time.Parse(time.RFC3339, c.end); e.AllDay || !e.End.Equal(end) || !e.Facts.NextDay {
				t.Errorf("end %s (next day %v), want %s the next day", e.End.UTC(), e.Facts.NextDay, end)
			}
		})
	}
}

// TestPlanDateOnlyAnchor: a photoperiod crossing has a date and no time.
// At 78.92° N, 11.93° E the Sun does not rise on 17 February 2027 and is
// up 1 h 46 min 38 s on the 18th; it is up 1 h 18 min 35 s on 24 October
// and does not rise on the 25th (PyEphem, tools/pyephem-checks/values.py).
func TestPlanDateOnlyAnchor(t *testing.T) {
	s := site(t, "isfjell", 78.92, 11.93, "Arctic/Longyearbyen")
	es := planEntries(t, s, "2027-01-01", "2027-12-31",
		config.Plan{Title: "Dayfold talk", Date: "photoperiod:1h", Start: "20:00"},
		config.Plan{Title: "Dayfold fair", Date: "saturday nearest photoperiod:1h"})
	want := map[string]string{
		"Dayfold talk 2027-02-18": "Date: the date the day length crosses 1 h (rising past it on Thu 18 Feb 2027).\n",
		"Dayfold talk 2027-10-25": "Date: the date the day length crosses 1 h (falling below it on Mon 25 Oct 2027).\n",
		// 20 February 2027 is a Saturday, 23 October too (Gregorian calendar)
		"Dayfold fair 2027-02-20": "Date: the Saturday nearest the day length crossing 1 h (rising past it on Thu 18 Feb 2027).\n",
		"Dayfold fair 2027-10-23": "Date: the Saturday nearest the day length crossing 1 h (falling below it on Mon 25 Oct 2027).\n",
	}
	for _, e := range es {
		k := e.Title + " " + e.Date.Format(time.DateOnly)
		w, ok := want[k]
		if !ok {
			t.Errorf("unexpected entry %s", k)
			continue
		}
		if !strings.HasPrefix(e.Description, w) {
			t.Errorf("%s: description\n%s\nwant it to begin %q", k, e.Description, w)
		}
		delete(want, k)
	}
	if len(want) > 0 {
		t.Errorf("no entries %v", want)
	}
}

// TestPlanClockRepeatedTakesTheFirst: a plan's clock time that the clocks
// show twice, when they go back, is the first of the two, the earlier
// instant still on summer time (RFC 5545 §3.3.5, "the first occurrence").
// The changes, from the tz database:
//   - Europe/Berlin, Rule EU 1981 max - Oct lastSun 1:00u 0 -: 03:00 CEST
//     (UT + 2 h) back to 02:00 CET (UT + 1 h) at 01:00 UT on Sunday 31
//     October 2027, so 02:30 is 00:30 UT (CEST) and again 01:30 UT (CET);
//   - America/New_York, Rule US 2007 max - Nov Sun>=1 2:00 0 S: 02:00 EDT
//     (UT − 4 h) back to 01:00 EST (UT − 5 h) on Sunday 7 November 2027, so
//     01:30 is 05:30 UT and again 06:30 UT;
//   - Asia/Beirut, Rule Lebanon 1992 max - Oct lastSun 0:00 0 -: 00:00 EEST
//     (UT + 3 h) on Sunday 31 October 2027 back to 23:00 EET (UT + 2 h) on
//     Saturday 30 October, so 23:40 on the 30th is 20:40 UT and again
//     21:40 UT;
//   - America/Santiago, Rule Chile 2023 max - Apr Sun>=2 3:00u 0 -: 00:00
//     -03 on Sunday 4 April 2027 back to 23:00 -04 on Saturday 3 April, so
//     23:30 on the 3rd is 02:30 UT on the 4th and again 03:30 UT.
func TestPlanClockRepeatedTakesTheFirst(t *testing.T) {
	for _, c := range []struct {
		zone          string
		lat, lon      float64
		date, clock   string
		first, second string // UTC, from the tz database's rules above
	}{
		{"Europe/Berlin", 52.52, 13.40, "2027-10-31", "02:30", "2027-10-31T00:30:00Z", "2027-10-31T01:30:00Z"},
		{"America/New_York", 40.71, -74.01, "2027-11-07", "01:30", "2027-11-07T05:30:00Z", "2027-11-07T06:30:00Z"},
		{"Asia/Beirut", 33.89, 35.50, "2027-10-30", "23:40", "2027-10-30T20:40:00Z", "2027-10-30T21:40:00Z"},
		{"America/Santiago", -33.45, -70.67, "2027-04-03", "23:30", "2027-04-04T02:30:00Z", "2027-04-04T03:30:00Z"},
	} {
		t.Run(c.zone, func(t *testing.T) {
			s := site(t, "s", c.lat, c.lon, c.zone)
			loc := s.TimeZone.Location
			first, _ := time.Parse(time.RFC3339, c.first)
			second, _ := time.Parse(time.RFC3339, c.second)
			// the zone data reads the clock time at both instants
			for _, u := range []time.Time{first, second} {
				if l := u.In(loc); l.Format(time.DateOnly) != c.date || l.Format("15:04") != c.clock {
					t.Fatalf("zone data: %s is %s local, want %s %s", u, l, c.date, c.clock)
				}
			}
			es := planEntries(t, s, c.date, c.date, config.Plan{Title: "Check", Date: "every day", Start: c.clock})
			if len(es) != 1 || es[0].AllDay {
				t.Fatalf("%+v, want one timed entry", es)
			}
			if !es[0].Start.Equal(first) {
				t.Errorf("starts %s, want the first %s at %s (not %s)", es[0].Start.UTC(), c.clock, first, second)
			}
			if strings.Contains(es[0].Description, "moved") {
				t.Errorf("description %q says a time the clock shows moved", es[0].Description)
			}
		})
	}
}

// A plan in the hour the clocks show twice says they go back, and that its
// clock time is the first of the two readings, as one in the hour they
// skip says it moved and why (TestPlanClockSkipped). In
// America/Havana the clocks go back from 01:00 CDT (UT − 4 h) to 00:00 CST
// (UT − 5 h) at 05:00 UT on Sunday 7 November 2027 (tz database: Rule Cuba
// 2012 max - Nov Sun>=1 0:00s 0 S), so a plan from "00:30" for 30 min that
// night runs from 00:30 CDT (04:30 UT) to 00:00 CST; in America/New_York
// they go back from 02:00 EDT to 01:00 EST on the same date (Rule US 2007
// max - Nov Sun>=1 2:00 0 S), so a plan at "01:30", without end, is at the
// first 01:30 (05:30 UT), before the change. The nights before have no
// such note. A plan whose end alone is shown twice (Havana, 23:50 to 00:20
// the night before) says it of its end, and one whose start and end both
// are (00:15 to 00:45) says it once in full. An end after the change at a
// reading the clocks showed before it is "the second" (00:00 CST, the
// second 00:00; 23:15 UT − 4 h in Santiago below).
func TestPlanClockRepeatedSaysSo(t *testing.T) {
	const havana = "which the clocks show twice: on Sun 7 Nov 2027 at 01:00 CDT they go back from summer time by 1 h)"
	hav := site(t, "hav", 23.13, -82.38, "America/Havana")
	es := planEntries(t, hav, "2027-11-06", "2027-11-07", config.Plan{Title: "Night check", Date: "every day", Start: "00:30", For: config.Duration(30 * time.Minute)})
	if len(es) != 2 {
		t.Fatalf("%d entries", len(es))
	}
	if want := "From 00:30:00 CDT to 01:00:00 CDT."; !strings.HasPrefix(es[0].Description, want) {
		t.Errorf("6 November: %q, want %q", es[0].Description, want)
	}
	if want := "From 00:30:00 CDT (the first 00:30, " + havana + " to 00:00:00 CST (the second 00:00)."; !strings.HasPrefix(es[1].Description, want) ||
		!es[1].Start.Equal(time.Date(2027, 11, 7, 4, 30, 0, 0, time.UTC)) {
		t.Errorf("7 November: %q from %s, want %q from 04:30 UT", es[1].Description, es[1].Start.UTC(), want)
	}
	ny := site(t, "ny", 40.71, -74.01, "America/New_York")
	es = planEntries(t, ny, "2027-11-06", "2027-11-07", config.Plan{Title: "Check", Date: "every day", Start: "01:30"})
	if len(es) != 2 {
		t.Fatalf("%d entries", len(es))
	}
	if strings.Contains(es[0].Description, "clocks") {
		t.Errorf("6 November: %q", es[0].Description)
	}
	if want := "At 01:30:00 EDT (the first 01:30, which the clocks show twice: on Sun 7 Nov 2027 at 02:00 EDT they go back from summer time by 1 h)."; !strings.HasPrefix(es[1].Description, want) {
		t.Errorf("7 November: %q, want %q", es[1].Description, want)
	}
	// 01:00, the repeated hour's first reading, is shown twice too: at 05:00
	// UT (EDT) and at 06:00 UT (EST)
	es = planEntries(t, ny, "2027-11-07", "2027-11-07", config.Plan{Title: "Check", Date: "every day", Start: "01:00"})
	if want := "At 01:00:00 EDT (the first 01:00, which the clocks show twice: on Sun 7 Nov 2027 at 02:00 EDT they go back from summer time by 1 h)."; len(es) != 1 || !strings.HasPrefix(es[0].Description, want) {
		t.Errorf("7 November at 01:00: %v, want %q", es, want)
	}
	// America/Santiago, whose abbreviations the tz database writes as
	// offsets ("-03", "-04"): the clocks go back from 00:00 UT − 3 h to 23:00
	// UT − 4 h at 03:00 UT on Sunday 4 April 2027 (Rule Chile 2023 max - Apr
	// Sun>=2 3:00u 0 -); the change is named as the times are, "UTC−03",
	// not "-03", which reads as a subtraction.
	scl := site(t, "scl", -33.45, -70.67, "America/Santiago")
	es = planEntries(t, scl, "2027-04-03", "2027-04-03", config.Plan{Title: "Night pick", Date: "every day", Start: "23:15", For: config.Duration(time.Hour)})
	if len(es) != 1 {
		t.Fatalf("%d entries", len(es))
	}
	if want := "From 23:15:00 UTC−03 (the first 23:15, which the clocks show twice: on Sun 4 Apr 2027 at 00:00 UTC−03 they go back from summer time by 1 h) to 23:15:00 UTC−04 (the second 23:15)."; !strings.HasPrefix(es[0].Description, want) {
		t.Errorf("3 April: %q, want %q", es[0].Description, want)
	}
	// A change that is not whole minutes is said to the second: zdump -v
	// America/New_York gives 12:03:57 LMT (UT − 4:56:02) at 16:59:59 UT on
	// 18 November 1883, then 12:00:00 EST, so that 12:00:00 to 12:03:58 are
	// shown twice; "12:01" for 10 min is 16:57:02 to 17:07:02 UT.
	nyc := site(t, "nyc", 40.71, -74.0, "America/New_York")
	es = planEntries(t, nyc, "1883-11-18", "1883-11-18", config.Plan{Title: "Noon bell", Date: "every day", Start: "12:01", For: config.Duration(10 * time.Minute)})
	if want := "From 12:01:00 LMT (the first 12:01, which the clocks show twice: on Sun 18 Nov 1883 at 12:03:58 LMT they go back by 3 min 58 s) to 12:07:02 EST."; len(es) != 1 || !strings.HasPrefix(es[0].Description, want) ||
		!es[0].Start.Equal(time.Date(1883, 11, 18, 16, 57, 2, 0, time.UTC)) {
		t.Errorf("18 November 1883: %v, want %q from 16:57:02 UT", es, want)
	}
	es = planEntries(t, nyc, "1883-11-18", "1883-11-18", config.Plan{Title: "Across", Date: "every day", Start: "11:50", End: "12:30"})
	if want := "From 11:50:00 LMT to 12:30:00 EST. The clocks go back by 3 min 58 s during it: 12:03:58 LMT becomes 12:00 EST."; len(es) != 1 || !strings.HasPrefix(es[0].Description, want) {
		t.Errorf("18 November 1883, across: %v, want %q", es, want)
	}
	for _, c := range []struct {
		pl   config.Plan
		from string
		want string
		end  time.Time
	}{
		{config.Plan{Title: "Late", Date: "every day", Start: "23:50", End: "00:20"}, "2027-11-06",
			"From 23:50:00 CDT to 00:20:00 CDT the next day (Sun 7 Nov; the first 00:20, which the clocks show twice: at 01:00 CDT they go back from summer time by 1 h).",
			time.Date(2027, 11, 7, 4, 20, 0, 0, time.UTC)},
		{config.Plan{Title: "Water", Date: "every day", Start: "00:15", End: "00:45"}, "2027-11-07",
			"From 00:15:00 CDT (the first 00:15, " + havana + " to 00:45:00 CDT (the first 00:45 too).",
			time.Date(2027, 11, 7, 4, 45, 0, 0, time.UTC)},
	} {
		es = planEntries(t, hav, c.from, c.from, c.pl)
		if len(es) != 1 || !strings.HasPrefix(es[0].Description, c.want) || !es[0].End.Equal(c.end) {
			t.Errorf("%s on %s: %v, want %q to %s", c.pl.Title, c.from, es, c.want, c.end)
		}
	}
}

// The end of a plan that the clocks going back put in the second pass of a
// reading is called so, as its start in the first is: zdump -v
// Pacific/Chatham gives 03:44:59 +1345 at 13:59:59 UT on Sat 3 April 2027,
// then 02:45:00 +1245, so the readings 02:45–03:45 are shown twice on
// Sun 4 April. A plan from the first 03:15 for 1 h ends at the second
// 03:15; one from 02:00 for 2 h at the second 03:00; one from the first
// 03:15 for 30 min at the change itself, the second 02:45. The day before,
// no end is "the second".
func TestPlanEndInSecondPass(t *testing.T) {
	s := site(t, "chatham", -43.95, -176.56, "Pacific/Chatham")
	const back = "which the clocks show twice: on Sun 4 Apr 2027 at 03:45 UTC+13:45 they go back from summer time by 1 h)"
	for _, c := range []struct {
		start string
		long  time.Duration
		want  string
	}{
		{"03:15", time.Hour, "From 03:15:00 UTC+13:45 (the first 03:15, " + back + " to 03:15:00 UTC+12:45 (the second 03:15)."},
		{"02:00", 2 * time.Hour, "From 02:00:00 UTC+13:45 to 03:00:00 UTC+12:45 (the second 03:00). The clocks go back"},
		{"03:15", 30 * time.Minute, "From 03:15:00 UTC+13:45 (the first 03:15, " + back + " to 02:45:00 UTC+12:45 (the second 02:45)."},
	} {
		es := planEntries(t, s, "2027-04-03", "2027-04-04", config.Plan{Title: "Watch", Date: "every day", Start: c.start, For: config.Duration(c.long)})
		if len(es) != 2 {
			t.Fatalf("%s for %s: %d entries, want 2", c.start, c.long, len(es))
		}
		if strings.Contains(es[0].Description, "second") || !strings.HasPrefix(es[1].Description, c.want) {
			t.Errorf("%s for %s:\n%q\n%q\nwant the second\n%q", c.start, c.long, es[0].Description, es[1].Description, c.want)
		}
	}
}
