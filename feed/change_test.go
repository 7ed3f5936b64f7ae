package feed

import (
	"context"
	"slices"
	"strings"
	"testing"
	"time"

	"heliocal/config"
)

// A change of day length reads in the units of a clock (common practice):
// an hour or more in hours, as on the first day the Sun rises after polar
// night, never as "+102 min 55 s".
func TestDayChangeWording(t *testing.T) {
	for d, want := range map[time.Duration]string{
		39 * time.Second:                 "+39 s",
		-(2*time.Minute + 5*time.Second): "−2 min 05 s",
		102*time.Minute + 55*time.Second: "+1 h 42 min 55 s",
		-(61 * time.Minute):              "−1 h 01 min 00 s",
	} {
		if got := Change(d); got != want {
			t.Errorf("Change(%v) = %q, want %q", d, got, want)
		}
	}
}

// Day length is the time from sunrise to sunset (common practice), taken
// from the two instants even when the sunset falls after midnight: at 78.2° N
// in mid-April and late August the sunset crosses midnight, and the day that
// began with a sunrise at 02:14 and ended at 00:03 the next date counts in
// full on the date of its sunrise, the sunset after midnight carries that
// day, and each change from the day before is the difference of two such
// days, not of clock times. (A date that also ends a stretch of midnight
// Sun, 25 August, adds that stretch's last minutes after its midnight.) The
// site is invented, at Svalbard's latitude.
func TestDayLengthAcrossMidnight(t *testing.T) {
	s := site(t, "isfjell-hut", 78.2, 15.6, "Arctic/Longyearbyen")
	for _, w := range [][2]string{{"2027-04-08", "2027-04-22"}, {"2027-08-20", "2027-09-03"}} {
		t.Run(w[0], func(t *testing.T) {
			sk := sky(t, w[0], w[1])
			events, _, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "sunrise", "sunset", "daily-summary"), date(w[0]), date(w[1]))
			if err != nil {
				t.Fatal(err)
			}
			summary := map[time.Time]Event{}
			for _, e := range events {
				if e.Kind.Name == "daily-summary" {
					summary[e.Date] = e
				}
			}
			for d := date(w[0]).AddDate(0, 0, 1); !d.After(date(w[1])); d = d.AddDate(0, 0, 1) {
				e, prev := summary[d], summary[d.AddDate(0, 0, -1)]
				if e.DayChange != e.DayLength-prev.DayLength {
					t.Errorf("%s: change %v, want %v − %v", d.Format(time.DateOnly), e.DayChange, e.DayLength, prev.DayLength)
				}
			}
			pastMidnight := 0
			var rise *Event
			longEnd := time.Time{} // the date on which the midnight Sun last set
			for i := range events {
				e := &events[i]
				switch e.Kind.Name {
				case "sunrise":
					rise = e
				case "sunset":
					if rise == nil || e.Start.Sub(rise.Start) >= 24*time.Hour {
						longEnd = e.Date
						continue
					}
					day := e.Start.Sub(rise.Start)
					sum, ok := summary[rise.Date]
					if rise.Date.Equal(longEnd) {
						day = sum.DayLength // and more than the span
						if !ok || sum.DayLength <= e.Start.Sub(rise.Start) {
							t.Errorf("%s: day length %v, want more than the span %v", rise.Date.Format(time.DateOnly), sum.DayLength, e.Start.Sub(rise.Start))
						}
					}
					if !e.Date.Equal(rise.Date) {
						pastMidnight++
					}
					for _, got := range []Event{*rise, *e, sum} {
						if !ok && got.Kind.Name == "daily-summary" {
							continue
						}
						if d := got.DayLength - day; d < -time.Millisecond || d > time.Millisecond {
							t.Errorf("%s of %s: day length %v, want %v (sunrise %s to sunset %s)", got.Kind, rise.Date.Format(time.DateOnly),
								got.DayLength, day, rise.Start.In(s.TimeZone.Location).Format("Jan 2 15:04:05"), e.Start.In(s.TimeZone.Location).Format("Jan 2 15:04:05"))
						}
					}
					if ok && e.DayChange != sum.DayChange {
						t.Errorf("sunset %s: change %v, want the change of the day it ends, %v", e.Start.In(s.TimeZone.Location).Format("Jan 2 15:04"), e.DayChange, sum.DayChange)
					}
				}
			}
			if pastMidnight == 0 {
				t.Errorf("no sunset after midnight in %v: the test checks nothing of that case", w)
			}
		})
	}
}

// A daily summary says each note once: civil dawn and civil dusk both
// missing on a night of midnight Sun make one line, not two.
func TestSummaryNotesOnce(t *testing.T) {
	s := site(t, "isfjell-hut", 78.2, 15.6, "Arctic/Longyearbyen")
	sk := sky(t, "2027-06-21", "2027-06-21")
	es, err := sk.Entries(context.Background(), s, "hut", []config.KindSpec{{Kind: mustKinds(t, "daily-summary")[0]}}, date("2027-06-21"), date("2027-06-21"))
	if err != nil || len(es) != 1 {
		t.Fatalf("entries %v, %v; want one summary", es, err)
	}
	lines := strings.Split(es[0].Description, "\n")
	for i, l := range lines {
		if slices.Contains(lines[:i], l) {
			t.Errorf("summary says %q twice:\n%s", l, es[0].Description)
		}
	}
	if !strings.Contains(es[0].Description, "Midnight sun") {
		t.Errorf("summary of 21 June at 78° N does not say midnight sun:\n%s", es[0].Description)
	}
}
