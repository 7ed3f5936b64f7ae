package feed

import (
	"context"
	"testing"
	"time"

	"heliocal/config"
)

// A sun band's all-day entries name the band as its spans' titles do
// ("Sun between −3° and +3°"), not in other figures ("−3.0°", "3.0°"). At
// 78.2° N, 15.6° E (Arctic/Longyearbyen) the Sun stays below −3° all of 1
// January 2027 (PyEphem 4.1.4, Observer 78.2° 15.6°, pressure 0, sampled every
// minute of the local date: at most −11.20°) and above +3° all of 1 May
// 2027 (at least +3.13°); on 29 April 2027 no span begins, the one of the
// 28th lasting into it (the table's "no event on this date").
func TestSunBandNotesInTheBandsWords(t *testing.T) {
	s := site(t, "isfjord", 78.2, 15.6, "Arctic/Longyearbyen")
	band := []config.KindSpec{{Kind: mustKinds(t, "sun-band:-3..3")[0]}}
	for _, c := range []struct {
		day, title, desc string
	}{
		{"2027-01-01", "The Sun stays below −3° all day", "The Sun stays below −3° all day."},
		{"2027-04-29", "No span with the Sun between −3° and +3° begins today",
			"No span with the Sun between −3° and +3° begins on this date: the one that began before it lasts into it."},
		{"2027-05-01", "The Sun stays above +3° all day", "The Sun stays above +3° all day."},
	} {
		sk := sky(t, c.day, c.day)
		es, err := sk.Entries(context.Background(), s, "f", band, date(c.day), date(c.day))
		if err != nil {
			t.Fatal(err)
		}
		var found bool
		for _, e := range es {
			if e.AllDay && e.Date.Format(time.DateOnly) == c.day {
				found = true
				if e.Title != c.title || e.Description != c.desc {
					t.Errorf("%s: %q / %q, want %q / %q", c.day, e.Title, e.Description, c.title, c.desc)
				}
			}
		}
		if !found {
			t.Errorf("%s: no all-day entry: %+v", c.day, es)
		}
	}
}
