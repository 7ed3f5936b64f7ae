package astro

import (
	"context"
	"errors"
	"math"
	"testing"
	"time"
)

// darkBrute says whether the instant t is dark by direct evaluation, without
// the ephemeris, the crossing search or the interval logic: the Sun's
// altitude from Sun(t) (apparent RA/Dec and sidereal time, parallax
// neglected: 9″), the Moon's from MoonFrom (Meeus ch. 40 parallax), the
// fraction from MoonIllumination.
func darkBrute(t *testing.T, o Observer, when time.Time, maxFraction float64) bool {
	s, err := Sun(when)
	if err != nil {
		t.Fatal(err)
	}
	H := (s.SiderealTime + o.Longitude - s.RightAscension) * deg2rad
	phi := o.Latitude * deg2rad
	sinAlt := math.Sin(phi)*math.Sin(s.Declination*deg2rad) + math.Cos(phi)*math.Cos(s.Declination*deg2rad)*math.Cos(H)
	if sinAlt >= math.Sin(-18*deg2rad) {
		return false
	}
	m, err := MoonFrom(o, when)
	if err != nil {
		t.Fatal(err)
	}
	if m.Altitude < -34.0/60-m.Semidiameter {
		return true
	}
	il, err := MoonIllumination(when)
	if err != nil {
		t.Fatal(err)
	}
	return il.Fraction < maxFraction
}

// TestDarkWindowsBruteForce compares the windows with the dark/not-dark
// verdict of direct evaluation every 7 minutes over ten nights at three
// sites and two thresholds; instants within 15 s of a window boundary are
// skipped (the Sun's neglected parallax moves it by about a second).
func TestDarkWindowsBruteForce(t *testing.T) {
	for _, tc := range []struct {
		name string
		o    Observer
		zone *time.Location
		date time.Time
		thr  float64
	}{
		{"48N 16E, moon must be down", Observer{Latitude: 48.2, Longitude: 16.4}, time.FixedZone("UTC+1", 3600), time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC), 0},
		{"34S 18E, crescent allowed", Observer{Latitude: -33.9, Longitude: 18.5}, time.FixedZone("UTC+2", 7200), time.Date(2026, 3, 15, 0, 0, 0, 0, time.UTC), 0.3},
		{"37N 112W, half moon allowed", Observer{Latitude: 37, Longitude: -112.5, Elevation: 0}, time.FixedZone("UTC-7", -7*3600), time.Date(2027, 9, 20, 0, 0, 0, 0, time.UTC), 0.5},
	} {
		t.Run(tc.name, func(t *testing.T) {
			me, err := NewMoonEphemeris(tc.date.AddDate(0, 0, -1), tc.date.AddDate(0, 0, 12))
			if err != nil {
				t.Fatal(err)
			}
			nights, err := me.DarkWindows(context.Background(), tc.o, tc.zone, tc.date, tc.date.AddDate(0, 0, 9), tc.thr)
			if err != nil {
				t.Fatal(err)
			}
			if len(nights) != 10 {
				t.Fatalf("%d nights, want 10", len(nights))
			}
			checked := 0
			for _, n := range nights {
				y, m, d := n.Date.Date()
				n0 := time.Date(y, m, d, 12, 0, 0, 0, tc.zone)
				for when := n0; when.Before(n0.Add(24 * time.Hour)); when = when.Add(7 * time.Minute) {
					in, near := false, false
					for _, w := range n.Windows {
						if !when.Before(w.Start) && when.Before(w.End) {
							in = true
						}
						if absDur(when.Sub(w.Start)) < 15*time.Second || absDur(when.Sub(w.End)) < 15*time.Second {
							near = true
						}
					}
					if near {
						continue
					}
					checked++
					if want := darkBrute(t, tc.o, when, tc.thr); want != in {
						t.Errorf("night of %s, %v: in a window = %v, direct evaluation says dark = %v (windows %v)", n.Date.Format(time.DateOnly), when.Format(time.RFC3339), in, want, n.Windows)
					}
				}
			}
			if checked < 1900 {
				t.Errorf("only %d instants checked", checked)
			}
		})
	}
}

// TestDarkWindowsProperties: over a year at sites from 60°S to 60°N, every
// window lies within its night, windows are ordered and disjoint, Length is
// End − Start, and no window overlaps civil twilight (the Sun above −6°):
// the Sun is below −17.99° at both ends and the middle of each window.
func TestDarkWindowsProperties(t *testing.T) {
	from := time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)
	me, err := NewMoonEphemeris(from.AddDate(0, 0, -1), from.AddDate(1, 0, 1))
	if err != nil {
		t.Fatal(err)
	}
	for _, lat := range []float64{-60, -35, 0, 20, 45, 60} {
		o := Observer{Latitude: lat, Longitude: 30 - lat}
		nights, err := me.DarkWindows(context.Background(), o, time.UTC, from, from.AddDate(1, 0, -1), 0.25)
		if err != nil {
			t.Fatal(err)
		}
		for _, n := range nights {
			n0, n1 := n.Date.Add(12*time.Hour), n.Date.Add(36*time.Hour)
			if (n.State == DarkNight) != (len(n.Windows) > 0) {
				t.Errorf("lat %v night %s: state %v with %d windows", lat, n.Date.Format(time.DateOnly), n.State, len(n.Windows))
			}
			var prev time.Time
			for _, w := range n.Windows {
				if w.Start.Before(n0) || w.End.After(n1) || !w.Start.Before(w.End) || w.Start.Before(prev) || w.Length != w.End.Sub(w.Start) {
					t.Errorf("lat %v night %s: bad window %v", lat, n.Date.Format(time.DateOnly), w)
				}
				prev = w.End
				for _, at := range []time.Time{w.Start, w.Start.Add(w.Length / 2), w.End} {
					h, err := me.Sun().SunAltitude(o, at)
					if err != nil {
						t.Fatal(err)
					}
					if h > -17.99 {
						t.Errorf("lat %v night %s: Sun at %.3f° at %v inside a dark window (civil twilight is above -6°)", lat, n.Date.Format(time.DateOnly), h, at)
					}
				}
			}
		}
	}
}

// TestDarkWindowsStates: at 60°N and 55°N the Sun stays above −18° all
// through the nights around the June solstice (it is −6.6° and −11.6° at
// midnight; common practice: no astronomical night north of ~48.5° then),
// so those nights say NoAstronomicalNight; at 45°N in January, with the
// Moon required to be down, the night of the full moon of 2026-01-03 is
// Moonlit (the full moon is up from dusk to dawn).
func TestDarkWindowsStates(t *testing.T) {
	me, err := NewMoonEphemeris(time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC), time.Date(2026, 6, 30, 0, 0, 0, 0, time.UTC))
	if err != nil {
		t.Fatal(err)
	}
	for _, lat := range []float64{60, 55} {
		nights, err := me.DarkWindows(context.Background(), Observer{Latitude: lat, Longitude: 10}, time.UTC, time.Date(2026, 6, 14, 0, 0, 0, 0, time.UTC), time.Date(2026, 6, 28, 0, 0, 0, 0, time.UTC), 1)
		if err != nil {
			t.Fatal(err)
		}
		for _, n := range nights {
			if n.State != NoAstronomicalNight || len(n.Windows) != 0 {
				t.Errorf("lat %v night %s: %v %v, want no-astronomical-night", lat, n.Date.Format(time.DateOnly), n.State, n.Windows)
			}
		}
	}
	nights, err := me.DarkWindows(context.Background(), Observer{Latitude: 45, Longitude: 0}, time.UTC, time.Date(2026, 1, 2, 0, 0, 0, 0, time.UTC), time.Date(2026, 1, 3, 0, 0, 0, 0, time.UTC), 0)
	if err != nil {
		t.Fatal(err)
	}
	moonlit := false
	for _, n := range nights {
		moonlit = moonlit || n.State == Moonlit
	}
	if !moonlit {
		t.Errorf("no moonlit night around the full moon of 2026-01-03 at 45°N: %+v", nights)
	}
}

// TestDarkWindowsBadInput: a threshold outside 0..1 and an observer out of
// range are errors naming the field and value; a span outside the
// ephemeris is a *RangeError.
func TestDarkWindowsBadInput(t *testing.T) {
	day := time.Date(2026, 1, 10, 0, 0, 0, 0, time.UTC)
	me, err := NewMoonEphemeris(day, day.AddDate(0, 0, 3))
	if err != nil {
		t.Fatal(err)
	}
	_, err = me.DarkWindows(context.Background(), Observer{Latitude: 45}, time.UTC, day, day, 1.5)
	if !errors.Is(err, ErrInvalidInput) || err.Error() != "astro: moon fraction threshold 1.5: must be within 0..1" {
		t.Errorf("threshold 1.5: %v", err)
	}
	_, err = me.DarkWindows(context.Background(), Observer{Latitude: 95}, time.UTC, day, day, 0)
	if !errors.Is(err, ErrInvalidInput) {
		t.Errorf("latitude 95: %v", err)
	}
	_, err = me.DarkWindows(context.Background(), Observer{Latitude: 45}, time.UTC, day.AddDate(0, 0, 30), day.AddDate(0, 0, 31), 0)
	if !errors.Is(err, ErrOutOfRange) {
		t.Errorf("outside coverage: %v", err)
	}
	// an instant outside the ephemeris's own dates is named as such, not as
	// outside the package's supported range (1800..2200)
	from, to := me.Coverage()
	_, err = me.MoonRiseSet(Observer{Latitude: 45}, to, to.Add(time.Hour))
	if want := "astro: time " + to.Add(time.Hour).Format(time.RFC3339) + " outside this ephemeris's dates " +
		from.Format(time.RFC3339) + ".." + to.Format(time.RFC3339); err == nil || err.Error() != want {
		t.Errorf("after the coverage: %v, want %q", err, want)
	}
}

// TestEphemerisIllumination: the interpolated illumination equals the
// directly computed one (MoonIllumination) at 500 instants of a year:
// fraction within 1e-6, phase angle, elongation and bright limb within
// 0.001°, the same waxing flag.
func TestEphemerisIllumination(t *testing.T) {
	from := time.Date(2028, 1, 1, 0, 0, 0, 0, time.UTC)
	me, err := NewMoonEphemeris(from, from.AddDate(1, 0, 0))
	if err != nil {
		t.Fatal(err)
	}
	var dk, dAng float64
	for i := range 500 {
		when := from.Add(time.Duration(i) * 17 * time.Hour).Add(time.Duration(i%11) * time.Minute)
		a, err := me.Illumination(when)
		if err != nil {
			t.Fatal(err)
		}
		b, err := MoonIllumination(when)
		if err != nil {
			t.Fatal(err)
		}
		dk = math.Max(dk, math.Abs(a.Fraction-b.Fraction))
		for _, d := range []float64{a.PhaseAngle - b.PhaseAngle, math.Remainder(a.Elongation-b.Elongation, 360), math.Remainder(a.BrightLimb-b.BrightLimb, 360)} {
			dAng = math.Max(dAng, math.Abs(d))
		}
		if a.Waxing != b.Waxing {
			t.Errorf("%v: waxing %v, direct %v (elongation %.4f°)", when, a.Waxing, b.Waxing, b.Elongation)
		}
	}
	t.Logf("interpolated illumination: fraction within %.1e, angles within %.1e°", dk, dAng)
	if dk > 1e-6 || dAng > 1e-3 {
		t.Errorf("interpolated illumination differs: fraction %.1e, angles %.1e°", dk, dAng)
	}
}
