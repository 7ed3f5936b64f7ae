package astro

import (
	"math"
	"testing"
	"time"
)

// TestLunarApsisMeeus50a: Meeus, Astronomical Algorithms 2nd ed., Example
// 50.a, p. 357: the apogee of 1988 October, mean JDE 2447442.8191
// (k = −148.5), true JDE 2447442.3543 (1988-10-07 20:30 TD) with parallax
// 3240.679″. Meeus's chapter 50 method is within a few minutes of ELP for
// apogees (the book: 3 min at most), so 5 min is allowed on the instant and
// 0.3″ on the parallax (asin(6378.14 km / Δ), as in the book).
func TestLunarApsisMeeus50a(t *testing.T) {
	if got := meanLunarApsisJDE(-148.5); math.Abs(got-2447442.8191) > 1e-4 {
		t.Errorf("mean apogee JDE %.4f, want 2447442.8191 (Meeus eq. 50.1)", got)
	}
	jde, dist := trueLunarApsisJDE(meanLunarApsisJDE(-148.5), false)
	dt := (jde - 2447442.3543) * secondsPerDay
	par := math.Asin(6378.14/dist) / arcsec2rad
	t.Logf("apogee: ours − Meeus %.0f s; parallax %.3f″ (Meeus 3240.679″), distance %.1f km", dt, par, dist)
	if math.Abs(dt) > 300 || math.Abs(par-3240.679) > 0.3 {
		t.Errorf("apogee JDE %.5f parallax %.3f″, want 2447442.3543 and 3240.679″ (Meeus Example 50.a)", jde, par)
	}
}

// TestLunarApsidesProperties: over 1800–2200 samples, perigees and apogees
// alternate, 10 to 19 days apart (the anomalistic month is 27.55 days;
// the apsides wander by up to 2.5 days), perigee distances 356,000–371,000
// km and apogee 404,000–407,000 km (from memory: perigees ~356,400–370,400 km,
// apogees ~404,000–406,700 km), and each is a true extremum of the distance
// (smaller or larger than the distance an hour before and after).
func TestLunarApsidesProperties(t *testing.T) {
	for _, y := range []int{1800, 1900, 1987, 2026, 2100, 2200} {
		aps, err := LunarApsides(time.Date(y, 1, 1, 0, 0, 0, 0, time.UTC), time.Date(y, 12, 31, 0, 0, 0, 0, time.UTC))
		if err != nil {
			t.Fatal(err)
		}
		if len(aps) < 24 {
			t.Errorf("%d: %d apsides", y, len(aps))
		}
		for i, a := range aps {
			if i > 0 {
				gap := a.Time.Sub(aps[i-1].Time)
				if a.Perigee == aps[i-1].Perigee || gap < 10*24*time.Hour || gap > 19*24*time.Hour {
					t.Errorf("%d: %v follows %v", y, a, aps[i-1])
				}
			}
			lo, hi := 404000.0, 407000.0
			if a.Perigee {
				lo, hi = 356000, 371000
			}
			if a.Distance < lo || a.Distance > hi {
				t.Errorf("%d: %v: distance out of %v..%v", y, a, lo, hi)
			}
			jde, err := JulianEphemerisDay(a.Time)
			if err != nil {
				t.Fatal(err)
			}
			for _, off := range []float64{-1.0 / 24, 1.0 / 24} {
				d := elpDistance(jde + off)
				if (a.Perigee && d <= a.Distance) || (!a.Perigee && d >= a.Distance) {
					t.Errorf("%d: %v is not an extremum (%.3f km an hour away)", y, a, d)
				}
			}
		}
	}
}
