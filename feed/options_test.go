package feed

import (
	"context"
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
// every other one.
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
	for _, e := range all {
		if !e.AllDay && e.End.Sub(e.Start) < 45*time.Minute {
			short++
		}
	}
	if short == 0 {
		t.Fatal("no short dark window in the quarter: the test checks nothing")
	}
	if len(kept) != len(all)-short {
		t.Errorf("%d entries kept of %d with %d short ones", len(kept), len(all), short)
	}
	for _, e := range kept {
		if !e.AllDay && e.End.Sub(e.Start) < 45*time.Minute {
			t.Errorf("kept a %s dark window on %s", e.End.Sub(e.Start), e.Date.Format(time.DateOnly))
		}
	}
}
