package feed

import (
	"context"
	"reflect"
	"testing"
	"time"

	"heliocal/config"
)

// TestDateFilters keeps sunsets on Fridays and Saturdays of January only:
// January 2027 has five Fridays (1, 8, 15, 22, 29) and five Saturdays
// (2, 9, 16, 23, 30) (the Gregorian calendar: 1 January 2027 is a Friday).
func TestDateFilters(t *testing.T) {
	s := site(t, "vienna", 48.2, 16.4, "Europe/Vienna")
	sk := sky(t, "2027-01-01", "2027-03-31")
	spec := config.KindSpec{Kind: mustKinds(t, "sunset")[0], Weekdays: []string{"fri", "Saturday"}, Months: []string{"jan"}}
	es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date("2027-01-01"), date("2027-03-31"))
	if err != nil {
		t.Fatal(err)
	}
	if len(es) != 10 {
		t.Fatalf("%d entries, want 10", len(es))
	}
	for _, e := range es {
		if wd := e.Date.Weekday(); e.Date.Month() != time.January || (wd != time.Friday && wd != time.Saturday) {
			t.Errorf("entry on %s", e.Date.Format("Mon 2006-01-02"))
		}
	}
}

// TestMinDuration drops dark windows shorter than 45 minutes and keeps
// every other one; a night whose windows are all shorter gets a note in
// their place.
func TestMinDuration(t *testing.T) {
	s := site(t, "hill", 39.08, -105.42, "America/Denver")
	sk := sky(t, "2027-01-01", "2027-03-31")
	k := mustKinds(t, "dark-window")[0]
	all, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{{Kind: k}}, date("2027-01-01"), date("2027-03-31"))
	if err != nil {
		t.Fatal(err)
	}
	kept, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{{Kind: k, MinDuration: config.Duration(45 * time.Minute)}}, date("2027-01-01"), date("2027-03-31"))
	if err != nil {
		t.Fatal(err)
	}
	short := 0
	longest := map[time.Time]time.Duration{} // by night: its longest window
	for _, e := range all {
		if e.AllDay {
			continue
		}
		l := e.End.Sub(e.Start)
		if l < 45*time.Minute {
			short++
		}
		longest[e.Date] = max(longest[e.Date], l)
	}
	if short == 0 {
		t.Fatal("no short dark window in the quarter: the test checks nothing")
	}
	noted := 0
	for _, l := range longest {
		if l < 45*time.Minute {
			noted++
		}
	}
	if len(kept) != len(all)-short+noted {
		t.Errorf("%d entries kept of %d with %d short ones and %d nights of short ones alone", len(kept), len(all), short, noted)
	}
	for _, e := range kept {
		if !e.AllDay && e.End.Sub(e.Start) < 45*time.Minute {
			t.Errorf("kept a %s dark window on %s", e.End.Sub(e.Start), e.Date.Format(time.DateOnly))
		}
		if e.Facts.Longest > 0 && e.Facts.Longest != longest[e.Date] {
			t.Errorf("note on %s: longest %s, want %s", e.Date.Format(time.DateOnly), e.Facts.Longest, longest[e.Date])
		}
	}
}

// TestFilteredThenWritten: the entries a filter drops leave no trace in
// the entries written after them, which go into the room the dropped ones
// had (entryWriter.next does not zero it again). A golden-hour kind kept
// on Fridays only, followed by a sunrise kind, gives the same sunrises as
// a sunrise kind on its own (none with the end of a span), and the golden
// hours it keeps are those of the filter.
func TestFilteredThenWritten(t *testing.T) {
	s := site(t, "vienna", 48.2, 16.4, "Europe/Vienna")
	sk := sky(t, "2027-01-01", "2027-03-31")
	first, last := date("2027-01-01"), date("2027-01-31")
	golden := config.KindSpec{Kind: mustKinds(t, "golden-hour")[0], Weekdays: []string{"fri"}}
	sunrise := config.KindSpec{Kind: mustKinds(t, "sunrise")[0]}
	both, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{golden, sunrise}, first, last)
	if err != nil {
		t.Fatal(err)
	}
	alone, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{sunrise}, first, last)
	if err != nil {
		t.Fatal(err)
	}
	var rises []Entry
	spans := 0
	for _, e := range both {
		switch e.Kind {
		case "sunrise":
			rises = append(rises, e)
		case "golden-hour":
			spans++
			if e.Date.Weekday() != time.Friday {
				t.Errorf("golden hour on %s", e.Date.Format("Mon 2006-01-02"))
			}
		}
	}
	// January 2027 has five Fridays: 1, 8, 15, 22 and 29 (the Gregorian
	// calendar), each with a morning and an evening golden hour at 48° N
	if spans != 10 {
		t.Errorf("%d golden hours, want 10", spans)
	}
	if !reflect.DeepEqual(rises, alone) {
		t.Errorf("the sunrises after a filtered kind differ from the sunrises alone")
	}
}

// TestKeepClearsDropped: keep leaves the room of the entries it drops
// zero, as entryWriter.next expects of the room past the entries.
func TestKeepClearsDropped(t *testing.T) {
	es := make([]Entry, 0, 8)
	for i := range 6 {
		d := date("2027-01-01").AddDate(0, 0, i) // Fri 1 … Wed 6 January 2027
		es = append(es, Entry{Kind: "sunset", Title: "Sunset", UID: "u", Date: d, Start: d, Facts: Facts{Part: "x", Azimuth: 240}})
	}
	out := keep(es, 1, config.KindSpec{Weekdays: []string{"sat", "sun"}})
	if len(out) != 3 { // Fri 1 (before from), Sat 2, Sun 3
		t.Fatalf("%d entries kept, want 3", len(out))
	}
	for i, e := range es[len(out):] {
		if !reflect.DeepEqual(e, Entry{}) {
			t.Errorf("dropped room %d not zero: %+v", i, e)
		}
	}
	w := entryWriter{out: out}
	if e := w.next(); !reflect.DeepEqual(*e, Entry{}) || len(w.out) != 4 {
		t.Errorf("next gave %+v, %d entries", *e, len(w.out))
	}
}

// TestEventsForKeepsAsEntries: EventsFor gives a kinds entry's events that
// its feed's entries keep, with the same date filters and min_duration
// (the year chart draws them): dark windows of 45 min or more on Fridays
// and Saturdays, lamps in January and February, and the seasons as all-day
// entries 12 h late on the one date listed, the day after the March
// equinox in Colorado (at 14:24 MDT on 20 March 2027 there, 20:24 UTC:
// ERFA, testdata/reference/crosscheck-seasons-erfa.csv, JD 2461485.3513 TT
// less ΔT; 12 h later is the 21st; the date comes from the start with the
// offset, as the entry's).
func TestEventsForKeepsAsEntries(t *testing.T) {
	s := site(t, "hill", 39.08, -105.42, "America/Denver")
	first, last := date("2027-01-01"), date("2027-06-30")
	sk := sky(t, "2027-01-01", "2027-06-30")
	for _, spec := range []config.KindSpec{
		{Kind: mustKinds(t, "dark-window")[0], MinDuration: config.Duration(45 * time.Minute), Weekdays: []string{"fri", "sat"}},
		{Kind: mustKinds(t, "lighting:14h")[0], Lamps: "both", Months: []string{"jan", "feb"}},
		{Kind: mustKinds(t, "seasons")[0], AllDay: true, Offset: config.Duration(12 * time.Hour), Dates: []string{"2027-03-21"}},
	} {
		t.Run(spec.Kind.String(), func(t *testing.T) {
			es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, first, last)
			if err != nil {
				t.Fatal(err)
			}
			evs, _, err := sk.EventsFor(context.Background(), PlaceOf(s), []config.KindSpec{spec}, first, last)
			if err != nil {
				t.Fatal(err)
			}
			var want []string // the entries' dates and times, as the events give them
			for _, e := range es {
				if e.Facts.Note {
					continue
				}
				if e.AllDay {
					want = append(want, e.Date.Format(time.DateOnly))
				} else {
					want = append(want, e.Date.Format(time.DateOnly)+" "+e.Start.Add(-spec.Offset.D()).Format(time.RFC3339)+" "+e.End.Add(-spec.Offset.D()).Format(time.RFC3339))
				}
			}
			var got []string
			for _, e := range evs {
				if spec.AllDay {
					got = append(got, e.Start.Add(spec.Offset.D()).In(s.TimeZone.Location).Format(time.DateOnly))
				} else {
					got = append(got, e.Date.Format(time.DateOnly)+" "+e.Start.Format(time.RFC3339)+" "+e.End.Format(time.RFC3339))
				}
			}
			if len(want) == 0 || len(want) == len(evsAll(t, sk, s, spec, first, last)) {
				t.Fatalf("%d entries kept: the filters keep nothing or everything, the test checks nothing", len(want))
			}
			if !reflect.DeepEqual(got, want) {
				t.Errorf("events %v\nentries %v", got, want)
			}
		})
	}
}

// evsAll is the events of spec without its date filters and min_duration.
func evsAll(t *testing.T, sk *Sky, s *config.Site, spec config.KindSpec, first, last time.Time) []Event {
	t.Helper()
	spec.Weekdays, spec.Months, spec.Dates, spec.MinDuration = nil, nil, nil, 0
	evs, _, err := sk.EventsFor(context.Background(), PlaceOf(s), []config.KindSpec{spec}, first, last)
	if err != nil {
		t.Fatal(err)
	}
	return evs
}
