package feed

import (
	"context"
	"fmt"
	"strings"
	"testing"
	"time"

	"heliocal/config"
)

// The changes of the clocks these tests read, from the tz database
// (zdump -v -c 2027,2028 for each zone; zdump -v -c 2011,2012 Pacific/Apia):
//   - America/Nuuk: "Sun Mar 28 00:59:59 2027 UT = Sat Mar 27 22:59:59 2027
//     -02" and "Sun Mar 28 01:00:00 2027 UT = Sun Mar 28 00:00:00 2027 -01":
//     the clocks skip 23:00–24:00 on Saturday 27 March, a skipped hour that
//     runs into midnight;
//   - America/Havana: "Sun Mar 14 04:59:59 2027 UT = Sat Mar 13 23:59:59
//     2027 CST" and "Sun Mar 14 05:00:00 2027 UT = Sun Mar 14 01:00:00 2027
//     CDT": they skip 00:00–01:00 on Sunday 14 March, a skipped hour that
//     starts at midnight;
//   - America/Santiago: "Sun Sep 5 03:59:59 2027 UT = Sat Sep 4 23:59:59
//     2027 -04" and "Sun Sep 5 04:00:00 2027 UT = Sun Sep 5 01:00:00 2027
//     -03": 24:00 on Saturday becomes 01:00 on Sunday 5 September;
//   - Europe/London: 01:00 GMT becomes 02:00 BST at 01:00 UT on Sunday 28
//     March 2027 (Rule EU, Mar lastSun 1:00u);
//   - Pacific/Apia: "Fri Dec 30 09:59:59 2011 UT = Thu Dec 29 23:59:59 2011
//     -10" and "Fri Dec 30 10:00:00 2011 UT = Sat Dec 31 00:00:00 2011 +14":
//     the whole of Friday 30 December is skipped.
type skipChange struct {
	zone          string
	at            string // the UTC instant of the change
	before, after int    // the offsets around it, in hours
}

var (
	nuukSkip     = skipChange{"America/Nuuk", "2027-03-28T01:00:00Z", -2, -1}
	havanaSkip   = skipChange{"America/Havana", "2027-03-14T05:00:00Z", -5, -4}
	santiagoSkip = skipChange{"America/Santiago", "2027-09-05T04:00:00Z", -4, -3}
	londonSkip   = skipChange{"Europe/London", "2027-03-28T01:00:00Z", 0, 1}
	apiaSkip     = skipChange{"Pacific/Apia", "2011-12-30T10:00:00Z", -10, 14}
)

// location loads the change's zone and checks that its data has the
// change as zdump prints it.
func (c skipChange) location(t *testing.T) *time.Location {
	t.Helper()
	loc, err := time.LoadLocation(c.zone)
	if err != nil {
		t.Fatal(err)
	}
	at := utc(c.at)
	if _, off := at.Add(-time.Second).In(loc).Zone(); off != c.before*3600 {
		t.Fatalf("zone data: %s offset %d s before %s, want %d h", c.zone, off, at, c.before)
	}
	if _, off := at.In(loc).Zone(); off != c.after*3600 {
		t.Fatalf("zone data: %s offset %d s at %s, want %d h", c.zone, off, at, c.after)
	}
	return loc
}

func utc(s string) time.Time {
	t, err := time.Parse(time.RFC3339, s)
	if err != nil {
		panic(err)
	}
	return t
}

// TestClockOnSkippedHour: a clock time the clocks skip is moved by their
// jump (docs/configuration.md), on whichever date that puts it: 23:10 of
// Saturday 27 March 2027 in America/Nuuk is 00:10 −01 on Sunday (01:10 UT),
// not 22:10 −02 on Saturday, an hour early; the skipped hours that start
// at midnight, or end past it, stay as they were.
func TestClockOnSkippedHour(t *testing.T) {
	for _, c := range []struct {
		change skipChange
		date   string
		clock  string
		want   string // UTC
	}{
		// the hour skipped runs into midnight: to the next date
		{nuukSkip, "2027-03-27", "23:10", "2027-03-28T01:10:00Z"}, // 00:10 −01 on Sunday
		{nuukSkip, "2027-03-27", "23:00", "2027-03-28T01:00:00Z"}, // 00:00 −01
		{nuukSkip, "2027-03-27", "23:59", "2027-03-28T01:59:00Z"}, // 00:59 −01
		{nuukSkip, "2027-03-27", "22:59", "2027-03-28T00:59:00Z"}, // shown: 22:59 −02
		{nuukSkip, "2027-03-28", "00:00", "2027-03-28T01:00:00Z"}, // shown: the change
		{nuukSkip, "2027-03-28", "23:10", "2027-03-29T00:10:00Z"}, // 23:10 −01
		// the hour skipped starts at midnight: on the date
		{havanaSkip, "2027-03-14", "00:00", "2027-03-14T05:00:00Z"},   // 01:00 CDT
		{havanaSkip, "2027-03-14", "00:30", "2027-03-14T05:30:00Z"},   // 01:30 CDT
		{havanaSkip, "2027-03-13", "23:59", "2027-03-14T04:59:00Z"},   // shown: 23:59 CST
		{santiagoSkip, "2027-09-05", "00:00", "2027-09-05T04:00:00Z"}, // 01:00 −03
		{santiagoSkip, "2027-09-05", "00:30", "2027-09-05T04:30:00Z"}, // 01:30 −03
		{santiagoSkip, "2027-09-04", "23:30", "2027-09-05T03:30:00Z"}, // shown: 23:30 −04
		// within the date
		{londonSkip, "2027-03-28", "01:30", "2027-03-28T01:30:00Z"}, // 02:30 BST
		// a date skipped whole: moved by the jump, 24 h, to Saturday
		{apiaSkip, "2011-12-30", "12:00", "2011-12-30T22:00:00Z"}, // 12:00 +14 on Sat 31 Dec
	} {
		loc := c.change.location(t)
		clock, err := config.ParseClock(c.clock)
		if err != nil {
			t.Fatal(err)
		}
		if got, want := clockOn(date(c.date), clock, loc), utc(c.want); !got.Equal(want) {
			t.Errorf("%s %s %s: %s (%s), want %s (%s)", c.change.zone, c.date, c.clock, got.UTC(), got.In(loc), want, want.In(loc))
		}
	}
}

// TestLampLimitSkippedIntoMidnight: a lamp limit the clocks skip in an
// hour that runs into midnight (America/Nuuk, 64.18° N 51.72° W, Saturday
// 27 March 2027) clips the lamps at its moved instant, the next day, and
// the text names the date it is skipped on and the jump, 1 h. The targets
// are far enough from the natural day there (about 13 h, the entries'
// own figure) that each period runs past the limit unclipped. The limits
// of Havana's and Santiago's skipped hours, at and after midnight, stay as
// they were.
func TestLampLimitSkippedIntoMidnight(t *testing.T) {
	sk := sky(t, "2027-01-01", "2027-12-31")
	nuuk := func() *config.Site { return site(t, "nuuk", 64.18, -51.72, "America/Nuuk") }
	behind := nuuk()
	// a skyline of 35° all round: the noon Sun reaches about 28.5° there
	// (90° − 64.18° + its declination, +2.7°), so it stays behind it
	behind.Skyline = [][2]float64{{0, 35}, {120, 35}, {240, 35}}
	for _, c := range []struct {
		name      string
		s         *config.Site
		change    skipChange
		kind      string
		lamps     string
		on, off   string
		date      string
		at        string // the limit's moved instant, UTC
		shown     string // in the description, beside the limit
		skippedOn string
	}{
		{"latest_off", nuuk(), nuukSkip, "lighting:18h", "", "", "23:10", "2027-03-27", "2027-03-28T01:10:00Z",
			"off at 00:10:00 UTC−01 the next day (Sun 28 Mar; ", "Sat 27 Mar 2027"},
		{"earliest_on", nuuk(), nuukSkip, "lighting:22h", config.LampsMorning, "23:10", "", "2027-03-28", "2027-03-28T01:10:00Z",
			"Morning lamps on at 00:10:00 UTC−01 (", "Sat 27 Mar 2027"},
		{"latest_off, behind the skyline", behind, nuukSkip, "lighting:20h", "", "", "23:10", "2027-03-27", "2027-03-28T01:10:00Z",
			"off at 00:10:00 UTC−01 the next day (Sun 28 Mar; 20 h; ", "Sat 27 Mar 2027"},
		{"latest_off, Havana", site(t, "havana", 23.13, -82.38, "America/Havana"), havanaSkip, "lighting:22h", "", "", "00:30", "2027-03-13", "2027-03-14T05:30:00Z",
			"off at 01:30:00 CDT the next day (Sun 14 Mar; ", "Sun 14 Mar 2027"},
		{"earliest_on, Santiago", site(t, "santiago", -33.45, -70.67, "America/Santiago"), santiagoSkip, "lighting:22h", config.LampsMorning, "00:30", "", "2027-09-05", "2027-09-05T04:30:00Z",
			"Morning lamps on at 01:30:00 UTC−03 (", "Sun 5 Sep 2027"},
	} {
		t.Run(c.name, func(t *testing.T) {
			c.change.location(t)
			spec := lightingSpec(t, c.kind, func(ks *config.KindSpec) { ks.Lamps, ks.EarliestOn, ks.LatestOff = c.lamps, c.on, c.off })
			es, err := sk.Entries(context.Background(), c.s, "f", []config.KindSpec{spec}, date(c.date), date(c.date))
			if err != nil {
				t.Fatal(err)
			}
			if len(es) != 1 || es[0].Facts.Note {
				t.Fatalf("%d entries, want one lamp period: %+v", len(es), es)
			}
			e := es[0]
			limit, written := e.End, c.off
			if c.off == "" {
				limit, written = e.Start, c.on
			}
			if !limit.Equal(utc(c.at)) {
				t.Errorf("limit at %s, want %s", limit.UTC(), c.at)
			}
			moved := "moved from " + written + ", which the clocks skip on " + c.skippedOn + ": the clocks go forward for summer time by 1 h"
			if !strings.Contains(e.Description, c.shown) || strings.Count(e.Description, moved) != 1 {
				t.Errorf("description\n%s\nwant %q and, once, %q", e.Description, c.shown, moved)
			}
		})
	}
}

// TestPlanSkippedIntoMidnight: a plan's clock times the clocks skip in an
// hour that runs into midnight (America/Nuuk, Saturday 27 March 2027: 23:00
// becomes 00:00 on Sunday) move by the jump, 1 h, to Sunday; the plan keeps
// its date, and its description says the next day and the date the clocks
// skip the time on.
func TestPlanSkippedIntoMidnight(t *testing.T) {
	s := site(t, "nuuk", 64.18, -51.72, "America/Nuuk")
	nuukSkip.location(t)
	const skip = "which the clocks skip on Sat 27 Mar 2027: the clocks go forward for summer time by 1 h"
	for _, c := range []struct {
		name       string
		plan       config.Plan
		from, to   string // UTC; "" for the date's note
		title      string
		text       string // in the description
		otherDates string // the description on 26 and 28 March (every day)
	}{
		{"start", config.Plan{Start: "23:30", For: config.Duration(30 * time.Minute)}, "2027-03-28T01:30:00Z", "2027-03-28T02:00:00Z", "Night check",
			"From 00:30:00 UTC−01 the next day (Sun 28 Mar; moved from 23:30, " + skip + ") to 01:00:00 UTC−01.",
			"From 23:30:00 UTC−0%d to 00:00:00 UTC−0%d the next day"},
		{"end", config.Plan{Start: "22:00", End: "23:30"}, "2027-03-28T00:00:00Z", "2027-03-28T01:30:00Z", "Night check",
			"From 22:00:00 UTC−02 to 00:30:00 UTC−01 the next day (Sun 28 Mar; moved from 23:30, " + skip + ").",
			"From 22:00:00 UTC−0%d to 23:30:00 UTC−0%d."},
		{"end after an evening event", config.Plan{Start: "sunset", End: "23:20"}, "", "2027-03-28T01:20:00Z", "Night check",
			" to 00:20:00 UTC−01 the next day (Sun 28 Mar; moved from 23:20, " + skip + ").\n",
			" to 23:20:00 UTC−0%[2]d.\n"},
		{"start and end", config.Plan{Start: "23:10", End: "23:40"}, "2027-03-28T01:10:00Z", "2027-03-28T01:40:00Z", "Night check",
			"From 00:10:00 UTC−01 the next day (Sun 28 Mar) to 00:40:00 UTC−01 (both moved by 1 h from 23:10 and 23:40: the clocks skip 23:00–00:00 on Sat 27 Mar 2027 for summer time).",
			"From 23:10:00 UTC−0%d to 23:40:00 UTC−0%d."},
		// the start moved past an end the next day: no time, and why
		{"start moved past the end", config.Plan{Start: "23:30", End: "00:15"}, "", "", "Night check: no time today",
			"No time today: the start, 23:30, is at 00:30:00 UTC−01 (moved from 23:30, " + skip + "), not before the end, 00:15, on Saturday 27 March 2027.",
			"From 23:30:00 UTC−0%d to 00:15:00 UTC−0%d the next day"},
	} {
		t.Run(c.name, func(t *testing.T) {
			c.plan.Title, c.plan.Date = "Night check", "every day"
			es := planEntries(t, s, "2027-03-26", "2027-03-28", c.plan)
			e := entryOn(t, es, "2027-03-27")
			if e.Title != c.title || !strings.Contains(e.Description, c.text) {
				t.Errorf("%q: description\n%s\nwant %q in it", e.Title, e.Description, c.text)
			}
			if c.to == "" {
				if !e.AllDay {
					t.Errorf("%s–%s, want the date's note", e.Start.UTC(), e.End.UTC())
				}
			} else if e.AllDay || c.from != "" && !e.Start.Equal(utc(c.from)) || !e.End.Equal(utc(c.to)) || !e.Facts.NextDay {
				t.Errorf("%s–%s (all day %v, next day %v), want %s–%s the next day", e.Start.UTC(), e.End.UTC(), e.AllDay, e.Facts.NextDay, c.from, c.to)
			}
			// the dates around it show the clock times as written, in
			// UTC−02 on Friday and UTC−01 on Sunday, and say no move
			for day, off := range map[string]int{"2027-03-26": 2, "2027-03-28": 1} {
				o := entryOn(t, es, day)
				if want := fmt.Sprintf(c.otherDates, off, off); !strings.Contains(o.Description, want) || strings.Contains(o.Description, "moved") {
					t.Errorf("%s: description\n%s\nwant %q, no move", day, o.Description, want)
				}
			}
		})
	}
}
