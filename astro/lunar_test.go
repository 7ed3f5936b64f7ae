package astro

import (
	"context"
	"math"
	"testing"
	"time"
)

// TestSynodicMonth: the mean synodic month is 29.530589 days (common
// practice; Meeus eq. 49.1 has 29.530588861). The least-squares slope of
// the true new moons of 1950–2050 (1,237 lunations; the true ones wander by
// up to ±14 h around the mean) must match it within 1e-4 day.
func TestSynodicMonth(t *testing.T) {
	k0 := math.Round((2433282.5 - phaseEpoch) / synodicMonth) // 1950
	const n = 1237
	var sx, sy, sxx, sxy float64
	for i := range n {
		x := float64(i)
		y := truePhaseJDE(meanPhaseJDE(k0+x), 0)
		sx, sy, sxx, sxy = sx+x, sy+y, sxx+x*x, sxy+x*y
	}
	slope := (n*sxy - sx*sy) / (n*sxx - sx*sx)
	t.Logf("mean synodic month from the true new moons of 1950–2050: %.6f d", slope)
	if math.Abs(slope-29.530589) > 1e-4 {
		t.Errorf("mean synodic month %.6f d, want 29.530589 d (common practice)", slope)
	}
}

// TestMoonriseDailyDelay: the Moon rises on average about 50 minutes later
// each day (common practice: the mean lunar day is 24 h 50 min). Over a
// year at latitudes 0°–50° N and S the mean interval between consecutive
// moonrises must be 24 h 50 min ± 2 min.
func TestMoonriseDailyDelay(t *testing.T) {
	from := time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)
	to := from.AddDate(1, 0, 0)
	me, err := NewMoonEphemeris(from, to)
	if err != nil {
		t.Fatal(err)
	}
	for _, lat := range []float64{-50, -25, 0, 25, 50} {
		cs, err := me.MoonRiseSet(Observer{Latitude: lat, Longitude: 15}, from, to)
		if err != nil {
			t.Fatal(err)
		}
		var rises []time.Time
		for _, c := range cs {
			if c.Direction == Rising {
				rises = append(rises, c.Time)
			}
		}
		mean := rises[len(rises)-1].Sub(rises[0]) / time.Duration(len(rises)-1)
		want := 24*time.Hour + 50*time.Minute
		if absDur(mean-want) > 2*time.Minute {
			t.Errorf("lat %v: mean interval between moonrises %v, want about %v (common practice)", lat, mean, want)
		}
	}
}

// TestPhasesAlternate: over ten sample years 1800–2200 the phases come
// strictly in the order new, first quarter, full, last quarter, with
// increasing times 5.5 to 9 days apart (the quarters of a lunation last
// between about 6.5 and 8.3 days).
func TestPhasesAlternate(t *testing.T) {
	for _, y := range []int{1800, 1850, 1901, 1950, 1999, 2024, 2050, 2101, 2150, 2200} {
		ph, err := MoonPhases(time.Date(y, 1, 1, 0, 0, 0, 0, time.UTC), time.Date(y, 12, 31, 0, 0, 0, 0, time.UTC))
		if err != nil {
			t.Fatal(err)
		}
		if len(ph) < 48 {
			t.Errorf("%d: only %d phases", y, len(ph))
		}
		for i := 1; i < len(ph); i++ {
			gap := ph[i].Time.Sub(ph[i-1].Time)
			if ph[i].Kind != (ph[i-1].Kind+1)%4 || gap < 132*time.Hour || gap > 216*time.Hour {
				t.Errorf("%d: %v at %v follows %v at %v (gap %v)", y, ph[i].Kind, ph[i].Time, ph[i-1].Kind, ph[i-1].Time, gap)
			}
		}
	}
}

// TestMoonRiseSetAlternate: at latitudes from 89°S to 89°N (two longitudes
// each) over three years,
// moonrises and moonsets strictly alternate (no duplicated or invented
// event) and none falls within a minute of another; for |latitude| < 60°
// every 30-day window has at least one date without a moonrise or without
// a moonset (the Moon rises about 50 minutes later each day).
func TestMoonRiseSetAlternate(t *testing.T) {
	from := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)
	last := from.AddDate(3, 0, -1)
	me, err := NewMoonEphemeris(from, last.AddDate(0, 0, 1))
	if err != nil {
		t.Fatal(err)
	}
	for i := range 50 {
		lat := -89 + float64(i/2)*7.25
		o := Observer{Latitude: lat, Longitude: math.Remainder(100-2*lat+float64(i%2)*137, 360)}
		days, err := me.MoonDays(context.Background(), o, time.UTC, from, last)
		if err != nil {
			t.Fatal(err)
		}
		var prev Crossing
		missing := make([]bool, len(days))
		for i, d := range days {
			var evs []Crossing
			for _, r := range d.Rising {
				evs = append(evs, Crossing{Time: r, Direction: Rising})
			}
			for _, s := range d.Setting {
				evs = append(evs, Crossing{Time: s, Direction: Setting})
			}
			sortCrossings(evs)
			for _, c := range evs {
				if !prev.Time.IsZero() && (c.Direction == prev.Direction || c.Time.Sub(prev.Time) < time.Minute) {
					t.Errorf("lat %v: %v at %v follows %v at %v", lat, c.Direction, c.Time, prev.Direction, prev.Time)
				}
				prev = c
			}
			missing[i] = len(d.Rising) == 0 || len(d.Setting) == 0
			if (d.State != Crosses) != (len(evs) == 0) {
				t.Errorf("lat %v %s: state %v with %d events", lat, d.Date.Format(time.DateOnly), d.State, len(evs))
			}
		}
		if math.Abs(lat) >= 60 {
			continue
		}
		for i := 0; i+30 <= len(days); i++ {
			found := false
			for _, m := range missing[i : i+30] {
				found = found || m
			}
			if !found {
				t.Errorf("lat %v: every date of the 30 days from %s has both a moonrise and a moonset", lat, days[i].Date.Format(time.DateOnly))
			}
		}
	}
}

func sortCrossings(cs []Crossing) {
	for i := 1; i < len(cs); i++ {
		for j := i; j > 0 && cs[j].Time.Before(cs[j-1].Time); j-- {
			cs[j], cs[j-1] = cs[j-1], cs[j]
		}
	}
}

// TestMoonRiseSetScan: the crossing search (between extrema of the
// altitude) must find exactly the sign changes of the upper limb's altitude
// above its rise/set threshold that a plain scan every 20 s finds, over half
// a year at latitudes from 85°S to 85°N; a scan interval holding two
// crossings (a grazing culmination shorter than 20 s) would show up as a
// difference of two and is reported with its place.
func TestMoonRiseSetScan(t *testing.T) {
	from := time.Date(2030, 3, 1, 0, 0, 0, 0, time.UTC)
	to := from.AddDate(0, 6, 0)
	me, err := NewMoonEphemeris(from, to)
	if err != nil {
		t.Fatal(err)
	}
	for _, lat := range []float64{-85, -72, -61, -40, 0, 35, 58, 64, 69, 77, 85} {
		o := Observer{Latitude: lat, Longitude: 47 - lat}
		cs, err := me.MoonRiseSet(o, from, to)
		if err != nil {
			t.Fatal(err)
		}
		lg := me.newLimbG(o, newSite(o))
		a, b := unixSeconds(from), unixSeconds(to)
		n := 0
		prev := lg.g(a)
		for x := a + 20; x < b; x += 20 {
			v := lg.g(x)
			if (v > 0) != (prev > 0) {
				n++
			}
			prev = v
		}
		if n != len(cs) {
			t.Errorf("lat %v: the scan finds %d crossings, the search %d", lat, n, len(cs))
		}
	}
}
