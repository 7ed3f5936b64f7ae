package feed

import (
	"context"
	"fmt"
	"testing"
	"time"
)

// A skyline at one altitude all round gives exactly the results of that
// single horizon (docs/configuration.md), date by date over a year: every
// sunrise and sunset with its date, direction, day length and change, the
// end of the midnight Sun, the notes of the dates without one, and the
// daily summary, photoperiod, lighting, the Moon's rise and set and the
// dark windows, at 78.92° N in two zones (Longyearbyen, whose solar
// midnight is near 01:00 in summer time, and UTC+1 at 15° E, where it is
// near midnight and a date can have two sunsets or two sunrises), at
// 77.85° S (McMurdo), at 48.2° N and at 60° N with a horizon of 2°. The
// crossings themselves are the same (astro.TestSkylineFlatEqualsHorizon);
// what is checked here is which of them each date lists.
func TestFlatSkylineEqualsHorizonByDate(t *testing.T) {
	for _, c := range []struct {
		name     string
		lat, lon float64
		zone     string
		horizon  float64
	}{
		{"78.92N Longyearbyen", 78.92, 11.93, "Arctic/Longyearbyen", 0},
		{"78.92N UTC+1", 78.92, 15, "Etc/GMT-1", 0},
		{"78.92N UTC", 78.92, 15, "Etc/UTC", 0},
		{"70N UTC-1", 70, 0, "Etc/GMT+1", 0},
		{"70N UTC+1", 70, 0, "Etc/GMT-1", 0},
		{"78.92N 8E UTC+1", 78.92, 8, "Etc/GMT-1", 0},
		{"77.85S McMurdo", -77.85, 166.67, "Antarctica/McMurdo", 0},
		{"48.2N Vienna", 48.2, 16.4, "Europe/Vienna", 0},
		{"60N horizon 2", 60, 10, "Europe/Oslo", 2},
	} {
		t.Run(c.name, func(t *testing.T) {
			first, last := date("2027-01-01"), date("2027-12-31")
			sk := sky(t, "2027-01-01", "2027-12-31")
			flat := site(t, "flat", c.lat, c.lon, c.zone)
			flat.Horizon = c.horizon
			one := site(t, "one", c.lat, c.lon, c.zone)
			one.Skyline = [][2]float64{{0, c.horizon}}
			kinds := mustKinds(t, "sunrise", "sunset", "daily-summary", "photoperiod:20h", "lighting:22h", "moonrise", "moonset", "dark-window")
			fe, fn, err := sk.Events(context.Background(), PlaceOf(flat), kinds, first, last)
			if err != nil {
				t.Fatal(err)
			}
			se, sn, err := sk.Events(context.Background(), PlaceOf(one), kinds, first, last)
			if err != nil {
				t.Fatal(err)
			}
			byDate := func(es []Event, ns []Note) map[string][]string {
				m := map[string][]string{}
				for _, e := range es {
					d := e.Date.Format(time.DateOnly)
					m[d] = append(m[d], fmt.Sprintf("%s %s–%s dir %d length %v change %v long day %v lamp %v", e.Kind, e.Start.Format(time.RFC3339Nano), e.End.Format(time.RFC3339Nano), e.Direction, e.DayLength, e.DayChange, e.LongDay, e.LampFacts().Lamp))
				}
				for _, n := range ns {
					d := n.Date.Format(time.DateOnly)
					m[d] = append(m[d], fmt.Sprintf("note %s state %v family %s hidden %v sun up %v until %v lamp %v length %v", n.Kind, n.State, n.Family, n.Hidden, n.SunUp, n.Until, n.Lamp, n.DayLength))
				}
				return m
			}
			fm, sm := byDate(fe, fn), byDate(se, sn)
			differ := 0
			for d := first; !d.After(last); d = d.AddDate(0, 0, 1) {
				k := d.Format(time.DateOnly)
				if fmt.Sprint(fm[k]) != fmt.Sprint(sm[k]) {
					differ++
					if differ <= 5 {
						t.Errorf("%s: horizon %v\n  %q\nskyline at one altitude\n  %q", k, c.horizon, fm[k], sm[k])
					}
				}
			}
			if differ > 0 {
				t.Errorf("%d dates differ", differ)
			}
			if len(fe) < 500 {
				t.Errorf("%d events over the year: the comparison checks little", len(fe))
			}
		})
	}
}

// Over a skyline the sunset after midnight that ends the day before is
// listed on its date, beside the date's own, as over the flat horizon: at
// 78.92° N, 11.93° E on 28 August 2027 the sunset at 00:14:29 CEST that
// ends the day of 27 August and the one at 23:50:16; at 77.85° S,
// 166.67° E on 21 February 2027 the sunset at 01:05:45 NZDT that ends the
// day of 20 February (the date's own is at 00:43:34 on 22 February).
// PyEphem's instants (endsOfMidnightSun: set1, set2), over a skyline at 0°
// and, at 78.92° N, over hills that are at 0° in the north, where the Sun
// sets then.
func TestSkylineSunsetEndingDayBefore(t *testing.T) {
	for _, c := range endsOfMidnightSun {
		for _, sl := range [][][2]float64{{{0, 0}}, {{0, 0}, {60, 0}, {120, 6}, {180, 9}, {240, 6}, {300, 0}}} {
			if c.lat < 0 && len(sl) > 1 {
				continue // the Sun sets due south there
			}
			s := site(t, "polar-"+c.name, c.lat, c.lon, c.zone)
			s.Skyline = sl
			first, last := date(c.day1), date(c.day2).AddDate(0, 0, 1)
			sk := sky(t, c.day1, last.Format(time.DateOnly))
			events, _, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "sunset"), first, last)
			if err != nil {
				t.Fatal(err)
			}
			for _, want := range []time.Time{c.set1, c.set2} {
				n := 0
				for _, e := range events {
					if within(e.Start.Sub(want), 0) && e.Date.Equal(localDate(want, s.TimeZone.Location)) {
						n++
					}
				}
				if n != 1 {
					t.Errorf("%s, skyline %v: the sunset at %s (PyEphem) listed %d times on its date", c.name, sl, want.In(s.TimeZone.Location).Format(time.DateTime), n)
				}
			}
		}
	}
}
