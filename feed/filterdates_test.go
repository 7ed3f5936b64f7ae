package feed

import (
	"context"
	"reflect"
	"slices"
	"testing"
	"time"

	"heliocal/config"
)

// TestDatesGoldenHour keeps a place's golden hours on two dates of a summer
// and no others, at the times an independent computation gives, while a
// kind without the filter beside it keeps every date.
//
// The times are those at which the Sun's centre crosses −4° and +6°
// (geometric, topocentric, sea level) at 47.5° N 9.7° E, from PyEphem 4.1.4
// (libastro), printed by /usr/bin/python3 with `import ephem`: Observer
// with pressure = 0, elevation 0, horizon −4 or 6, next_rising and
// next_setting of Sun() with use_center=True, searched from 22:00 UT the
// evening before (the definitions of tools/pyephem-checks/values.py).
// PyEphem has its own solar theory and ΔT: the test allows 1 s.
func TestDatesGoldenHour(t *testing.T) {
	s := site(t, "venue", 47.5, 9.7, "Europe/Zurich")
	sk := sky(t, "2027-06-01", "2027-08-31")
	first, last := date("2027-06-01"), date("2027-08-31")
	golden := config.KindSpec{Kind: mustKinds(t, "golden-hour")[0], Dates: []string{"2027-08-21", "2027-06-12"}}
	blue := config.KindSpec{Kind: mustKinds(t, "blue-hour")[0]}
	es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{golden, blue}, first, last)
	if err != nil {
		t.Fatal(err)
	}
	utc := func(s string) time.Time {
		t, err := time.Parse("2006-01-02T15:04:05.000000", s)
		if err != nil {
			panic(err)
		}
		return t
	}
	want := []struct {
		date, part string
		start, end time.Time
	}{
		// PyEphem: +6° and −4° crossings, UT
		{"2027-06-12", "morning", utc("2027-06-12T02:59:37.746268"), utc("2027-06-12T04:11:39.143467")},
		{"2027-06-12", "evening", utc("2027-06-12T18:30:37.004246"), utc("2027-06-12T19:42:44.135576")},
		{"2027-08-21", "morning", utc("2027-08-21T04:04:36.408242"), utc("2027-08-21T05:06:44.327441")},
		{"2027-08-21", "evening", utc("2027-08-21T17:41:18.373339"), utc("2027-08-21T18:43:12.459441")},
	}
	var got []Entry
	blues := 0
	for _, e := range es {
		switch e.Kind {
		case "golden-hour":
			got = append(got, e)
		case "blue-hour":
			blues++
		}
	}
	if len(got) != len(want) {
		t.Fatalf("%d golden hours, want %d: %s", len(got), len(want), dates(got))
	}
	for i, w := range want {
		e := got[i]
		if e.Date.Format(time.DateOnly) != w.date || e.Facts.Part != w.part {
			t.Errorf("golden hour %d: %s %s, want %s %s", i, e.Date.Format(time.DateOnly), e.Facts.Part, w.date, w.part)
		}
		if d := e.Start.Sub(w.start).Abs(); d > time.Second {
			t.Errorf("%s %s: starts %s, PyEphem %s", w.date, w.part, e.Start.Format(time.RFC3339Nano), w.start.Format(time.RFC3339Nano))
		}
		if d := e.End.Sub(w.end).Abs(); d > time.Second {
			t.Errorf("%s %s: ends %s, PyEphem %s", w.date, w.part, e.End.Format(time.RFC3339Nano), w.end.Format(time.RFC3339Nano))
		}
	}
	// blue hour, unfiltered: a morning and an evening span on each of the
	// 92 dates of June, July and August (the Sun dips below −6° every night
	// at 47.5° N)
	if blues != 2*92 {
		t.Errorf("%d blue hours beside the filtered golden hour, want %d", blues, 2*92)
	}
}

// onDates returns the entries of es dated on one of days.
func onDates(es []Entry, days ...string) []Entry {
	var out []Entry
	for _, e := range es {
		if slices.Contains(days, e.Date.Format(time.DateOnly)) {
			out = append(out, e)
		}
	}
	return out
}

// TestDatesLocalDate: the entry's local date decides, across a clock
// change and in a zone whose clocks skip midnight. The filtered entries
// are those of the unfiltered listing dated on the dates, every timed one
// starting on its date by the zone's clock (time.Time.In, the tz
// database), and the notes of those dates are kept with them. The changes
// (tz database): Europe/Zurich springs forward at 02:00 on 28 March 2027
// and falls back at 03:00 on 31 October 2027; America/Santiago skips from
// 23:59:59 on 4 September 2027 to 01:00 on 5 September, and repeats the
// hour before midnight on 3 April 2027. Each case has entries whose UTC
// date is not their local date: the moonrise of 00:08 on 27 March in
// Zurich (23:08 UT on the 26th), the moonset of 23:09 on 4 September in
// Santiago (03:09 UT on the 5th, a date listed: the moonset is not kept).
func TestDatesLocalDate(t *testing.T) {
	cases := []struct {
		s           *config.Site
		first, last string
		days        []string
	}{
		{site(t, "zurich", 47.37, 8.54, "Europe/Zurich"), "2027-03-25", "2027-11-03", []string{"2027-03-27", "2027-03-28", "2027-10-31"}},
		{site(t, "santiago", -33.45, -70.67, "America/Santiago"), "2027-03-30", "2027-09-08", []string{"2027-04-03", "2027-04-04", "2027-09-05"}},
	}
	kinds := mustKinds(t, "sunrise", "sunset", "solar-noon", "astronomical-dusk", "moonrise", "moonset", "moon-transit", "golden-hour")
	for _, tc := range cases {
		loc := tc.s.TimeZone.Location
		sk := sky(t, tc.first, tc.last)
		var all, filtered []config.KindSpec
		for _, k := range kinds {
			all = append(all, config.KindSpec{Kind: k})
			filtered = append(filtered, config.KindSpec{Kind: k, Dates: tc.days})
		}
		every, err := sk.Entries(context.Background(), tc.s, "f", all, date(tc.first), date(tc.last))
		if err != nil {
			t.Fatal(err)
		}
		kept, err := sk.Entries(context.Background(), tc.s, "f", filtered, date(tc.first), date(tc.last))
		if err != nil {
			t.Fatal(err)
		}
		if want := onDates(every, tc.days...); !reflect.DeepEqual(kept, want) {
			t.Errorf("%s: kept %d entries on %s, want the %d the listing dates on them", tc.s.ID, len(kept), dates(kept), len(want))
		}
		for _, e := range kept {
			if e.AllDay {
				continue
			}
			local := e.Start.In(loc).Format(time.DateOnly)
			if !slices.Contains(tc.days, local) || local != e.Date.Format(time.DateOnly) {
				t.Errorf("%s: %s %s starts %s, dated %s", tc.s.ID, e.Kind, e.Facts.Part, e.Start.In(loc).Format(time.RFC3339), e.Date.Format(time.DateOnly))
			}
		}
		// the entries the UTC date would decide otherwise
		border := 0
		for _, e := range every {
			if !e.AllDay && slices.Contains(tc.days, e.Start.UTC().Format(time.DateOnly)) != slices.Contains(tc.days, e.Start.In(loc).Format(time.DateOnly)) {
				border++
			}
		}
		if border == 0 {
			t.Errorf("%s: no entry whose UTC date is listed and local date not, or the other way round: the test checks less than it says", tc.s.ID)
		}
	}
}

// TestDatesDarkWindow: a dark window is named by its evening, so the dates
// filter keeps a window that begins after midnight on the date of the
// evening before it, and drops it for the date of its start.
func TestDatesDarkWindow(t *testing.T) {
	s := site(t, "hill", 39.08, -105.42, "America/Denver")
	sk := sky(t, "2027-01-01", "2027-03-31")
	k := mustKinds(t, "dark-window")[0]
	all, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{{Kind: k}}, date("2027-01-01"), date("2027-03-31"))
	if err != nil {
		t.Fatal(err)
	}
	var late *Entry // a window starting after the midnight that ends its evening's date
	for i, e := range all {
		if !e.AllDay && e.Start.In(s.TimeZone.Location).Format(time.DateOnly) != e.Date.Format(time.DateOnly) {
			late = &all[i]
			break
		}
	}
	if late == nil {
		t.Fatal("no dark window starting after midnight in the quarter: the test checks nothing")
	}
	evening := late.Date.Format(time.DateOnly)
	morning := late.Start.In(s.TimeZone.Location).Format(time.DateOnly)
	for _, c := range []struct {
		day  string
		want bool
	}{{evening, true}, {morning, false}} {
		kept, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{{Kind: k, Dates: []string{c.day}}}, date("2027-01-01"), date("2027-03-31"))
		if err != nil {
			t.Fatal(err)
		}
		if want := onDates(all, c.day); !reflect.DeepEqual(kept, want) {
			t.Errorf("dates [%s]: kept %s, want %s", c.day, dates(kept), dates(want))
		}
		if got := slices.ContainsFunc(kept, func(e Entry) bool { return e.UID == late.UID }); got != c.want {
			t.Errorf("dates [%s]: the window of the evening of %s starting %s kept: %v, want %v", c.day, evening,
				late.Start.In(s.TimeZone.Location).Format(time.RFC3339), got, c.want)
		}
	}
}
