package astro

import (
	"context"
	"errors"
	"math"
	"testing"
	"time"
)

// TestDarkSkylineFlatEqualsHorizon: a skyline at one altitude all round
// gives exactly the dark windows of that single horizon altitude.
func TestDarkSkylineFlatEqualsHorizon(t *testing.T) {
	from := time.Date(2027, 3, 1, 0, 0, 0, 0, time.UTC)
	last := from.AddDate(0, 0, 20)
	e, err := NewMoonEphemeris(from.AddDate(0, 0, -1), last.AddDate(0, 0, 2))
	if err != nil {
		t.Fatal(err)
	}
	for _, h := range []float64{0, 3} {
		o := Observer{Latitude: 39.1, Longitude: -105.2, Elevation: 2400, Horizon: h}
		sky, _ := NewSkyline([]SkyPoint{{0, h}, {180, h}})
		want, err := e.DarkWindows(context.Background(), o, time.UTC, from, last, 0.25)
		if err != nil {
			t.Fatal(err)
		}
		o.Horizon = 7 // ignored over a skyline
		got, err := e.DarkSkylineWindows(context.Background(), o, sky, time.UTC, from, last, 0.25)
		if err != nil {
			t.Fatal(err)
		}
		if len(got) != len(want) {
			t.Fatalf("horizon %g: %d nights, skyline %d", h, len(want), len(got))
		}
		for i := range want {
			if len(got[i].Windows) != len(want[i].Windows) || got[i].State != want[i].State {
				t.Fatalf("horizon %g, night %d: %+v, skyline %+v", h, i, want[i], got[i])
			}
			for j, w := range want[i].Windows {
				if g := got[i].Windows[j]; !g.Start.Equal(w.Start) || !g.End.Equal(w.End) {
					t.Errorf("horizon %g: window %v–%v, skyline %v–%v", h, w.Start, w.End, g.Start, g.End)
				}
			}
		}
	}
}

// TestDarkSkylineBruteForce: over a stepped skyline the Moon counts as
// down while it is behind the skyline (also while a peak hides it), and
// the Sun's −18° stays as over a flat horizon. Checked against an
// independent computation of the Moon's side of the skyline: the scan of
// TestMoonSkylineBruteForce (Meeus, Astronomical Algorithms 2nd ed., eq.
// 11.1–11.3, 13.5–13.6 and 40.2–40.3, Sæmundsson's refraction), whose
// crossings, with the Sun's −18° crossings (checked against USNO
// elsewhere), give the dark spans: every window must agree within 10 s.
// The Moon must hide behind the skyline at least once in a window that
// the flat horizon would not give.
func TestDarkSkylineBruteForce(t *testing.T) {
	sky, err := NewSkyline([]SkyPoint{
		{0, 2}, {40, 12}, {60, 12}, {60.1, 0},
		{80, 0}, {80.1, 8}, {130, 8}, {130.1, 1},
		{170, 1}, {175, 30}, {185, 30}, {190, 1},
		{235, 1}, {235.1, 18}, {300, 18}, {300.1, 2},
	})
	if err != nil {
		t.Fatal(err)
	}
	o := Observer{Latitude: 46.5, Longitude: 8.0}
	gained := 0
	for _, from := range []time.Time{
		time.Date(2027, 3, 12, 0, 0, 0, 0, time.UTC),  // a waxing crescent setting behind the western wall
		time.Date(2027, 9, 18, 0, 0, 0, 0, time.UTC),  // a Moon near full, behind the southern peak
		time.Date(2027, 10, 27, 0, 0, 0, 0, time.UTC), // a waning Moon rising behind the eastern walls
	} {
		to := from.Add(4 * 24 * time.Hour)
		e, err := NewMoonEphemeris(from.AddDate(0, 0, -1), to.AddDate(0, 0, 1))
		if err != nil {
			t.Fatal(err)
		}
		// nights of from .. to−2 days: noon of from to noon of to−1 day (UTC)
		a, b := from.Add(12*time.Hour), to.Add(-12*time.Hour)
		nights, err := e.DarkSkylineWindows(context.Background(), o, sky, time.UTC, from, to.AddDate(0, 0, -2), 0)
		if err != nil {
			t.Fatal(err)
		}
		flat, err := e.DarkWindows(context.Background(), o, time.UTC, from, to.AddDate(0, 0, -2), 0)
		if err != nil {
			t.Fatal(err)
		}
		var got, flatWins []Span
		for i, n := range nights {
			got = append(got, n.Windows...)
			flatWins = append(flatWins, flat[i].Windows...)
		}
		moon, _ := bruteMoonSkyline(t, o, sky, a, b)
		sun, err := e.sun.SunCrossings(o, AstronomicalTwilight, a, b)
		if err != nil {
			t.Fatal(err)
		}
		want := darkSpansBrute(a, b, sun, moon, e.moonOverSkyline(o, newSite(o), sky, unixSeconds(a)))
		what := from.Format(time.DateOnly)
		if len(got) != len(want) {
			t.Fatalf("%s: windows %v, brute force %v", what, got, want)
		}
		for i := range got {
			if got[i].Start.Sub(want[i].Start).Abs() > 10*time.Second || got[i].End.Sub(want[i].End).Abs() > 10*time.Second {
				t.Errorf("%s: window %s–%s, brute force %s–%s", what, got[i].Start.Format(time.RFC3339), got[i].End.Format(time.RFC3339),
					want[i].Start.Format(time.RFC3339), want[i].End.Format(time.RFC3339))
			}
		}
		var sum, flatSum time.Duration
		for _, w := range got {
			sum += w.Length
		}
		for _, w := range flatWins {
			flatSum += w.Length
		}
		t.Logf("%s: dark %v over the skyline, %v over a flat horizon", what, sum.Round(time.Minute), flatSum.Round(time.Minute))
		if sum > flatSum+10*time.Minute {
			gained++
		}
	}
	if gained == 0 {
		t.Error("the skyline never adds dark time: the test does not exercise the Moon behind the skyline")
	}
}

// darkSpansBrute intersects astronomical night (the Sun's −18° crossings) with
// the Moon behind the skyline (its crossings; up0: over it at a) in [a, b).
func darkSpansBrute(a, b time.Time, sun, moon []Crossing, up0 bool) []Span {
	type ev struct {
		t    time.Time
		id   int
		rise bool
	}
	var evs []ev
	for _, c := range sun {
		evs = append(evs, ev{c.Time, 0, c.Direction == Rising})
	}
	for _, c := range moon {
		evs = append(evs, ev{c.Time, 1, c.Direction == Rising})
	}
	for i := 1; i < len(evs); i++ { // insertion sort: few events
		for j := i; j > 0 && evs[j].t.Before(evs[j-1].t); j-- {
			evs[j], evs[j-1] = evs[j-1], evs[j]
		}
	}
	sunDark := len(sun) > 0 && sun[0].Direction == Rising // rising through −18°: it was night
	moonUp := up0
	var out []Span
	var open time.Time
	dark := sunDark && !moonUp
	if dark {
		open = a
	}
	for _, e := range evs {
		if e.id == 0 {
			sunDark = !e.rise
		} else {
			moonUp = e.rise
		}
		switch now := sunDark && !moonUp; {
		case now && !dark:
			open = e.t
		case !now && dark:
			out = append(out, Span{Start: open, End: e.t, Length: e.t.Sub(open)})
		}
		dark = sunDark && !moonUp
	}
	if dark {
		out = append(out, Span{Start: open, End: b, Length: b.Sub(open)})
	}
	return out
}

// skylineQuerySetup gives the skyline queries' tests an ephemeris of three
// days from 1 March 2027, a site at 46.5° N 8° E, and the first day.
func skylineQuerySetup(t *testing.T) (e *MoonEphemeris, o Observer, from, to time.Time) {
	t.Helper()
	from = time.Date(2027, 3, 1, 0, 0, 0, 0, time.UTC)
	e, err := NewMoonEphemeris(from, from.AddDate(0, 0, 3))
	if err != nil {
		t.Fatal(err)
	}
	return e, Observer{Latitude: 46.5, Longitude: 8.0}, from, from.AddDate(0, 0, 1)
}

// TestSkylineEmpty: NewSkyline and every skyline query refuse a skyline
// without points with an *InputError that says what the 0 counts
// ("astro: skyline points 0: …", not "skyline 0", which reads as an
// azimuth).
func TestSkylineEmpty(t *testing.T) {
	e, o, from, to := skylineQuerySetup(t)
	_, errSun := e.sun.SunSkylineCrossings(o, nil, from, to)
	_, errMoon := e.MoonSkylineCrossings(o, nil, from, to)
	_, errDark := e.DarkSkylineWindows(context.Background(), o, nil, time.UTC, from, from, 0)
	_, errNew := NewSkyline(nil)
	for name, err := range map[string]error{"SunSkylineCrossings": errSun, "MoonSkylineCrossings": errMoon, "DarkSkylineWindows": errDark, "NewSkyline": errNew} {
		var ie *InputError
		if !errors.As(err, &ie) || err.Error() != "astro: skyline points 0: needs at least one [azimuth, altitude] point" {
			t.Errorf("%s: error %v, want an *InputError for the skyline", name, err)
		}
	}
}

// TestSkylineUnchecked: a Skyline written as a literal, not made by
// NewSkyline, is refused by every skyline query with an *InputError naming
// the point, where the search would otherwise interpolate between the wrong
// points (unsorted, 360 beside 0, a direction twice) or compare with a NaN
// and find nothing.
func TestSkylineUnchecked(t *testing.T) {
	e, o, from, to := skylineQuerySetup(t)
	ctx := context.Background()
	queries := map[string]func(Skyline) error{
		"SunSkylineCrossings":  func(s Skyline) error { _, err := e.Sun().SunSkylineCrossings(o, s, from, to); return err },
		"SunSkylineSpans":      func(s Skyline) error { _, err := e.Sun().SunSkylineSpans(o, s, from, to); return err },
		"MoonSkylineCrossings": func(s Skyline) error { _, err := e.MoonSkylineCrossings(o, s, from, to); return err },
		"MoonSkylineRiseSet":   func(s Skyline) error { _, err := e.MoonSkylineRiseSet(o, s, from, to); return err },
		"MoonSkylineSpans":     func(s Skyline) error { _, err := e.MoonSkylineSpans(o, s, from, to); return err },
		"MoonSkylineDays": func(s Skyline) error {
			_, err := e.MoonSkylineDays(ctx, o, s, time.UTC, from, from)
			return err
		},
		"DarkSkylineWindows": func(s Skyline) error {
			_, err := e.DarkSkylineWindows(ctx, o, s, time.UTC, from, from, 0)
			return err
		},
	}
	for _, tc := range []struct {
		name string
		sky  Skyline
		want string
	}{
		{"unsorted", Skyline{{200, 3}, {10, 12}}, "astro: skyline azimuth 10: follows 200: the points must be sorted by azimuth, each direction once (NewSkyline sorts them)"},
		{"twice", Skyline{{10, 3}, {10, 12}}, "astro: skyline azimuth 10: follows 10: the points must be sorted by azimuth, each direction once (NewSkyline sorts them)"},
		{"360", Skyline{{10, 3}, {360, 12}}, "astro: skyline azimuth 360: must be below 360 in a Skyline (NewSkyline makes 360 0)"},
		{"NaN altitude", Skyline{{10, 3}, {90, math.NaN()}}, "astro: skyline altitude NaN: must be within -5..45 degrees"},
		{"altitude 60", Skyline{{10, 60}, {90, 3}}, "astro: skyline altitude 60: must be within -5..45 degrees"},
		{"negative azimuth", Skyline{{-10, 3}, {90, 3}}, "astro: skyline azimuth -10: must be within 0..360 degrees from the north through the east"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			for name, q := range queries {
				err := q(tc.sky)
				var ie *InputError
				if !errors.As(err, &ie) || !errors.Is(err, ErrInvalidInput) || err.Error() != tc.want {
					t.Errorf("%s: error %v, want %q", name, err, tc.want)
				}
			}
		})
	}
}
