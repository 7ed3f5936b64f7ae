package astro

import (
	"math"
	"testing"
	"time"
)

// TestSunChebyshev measures the Chebyshev fit that the Sun's ephemeris
// samples against the VSOP87D series it replaces, over spans of 400 days
// spread across 1800–2200 and at instants between and on the daily samples:
// the apparent right ascension (as an angle on the sky) and declination
// within 0.001″ and the distance within 5e-9 au (1e-7″ of parallax), the bound the fit must
// keep so that the track's own interpolation error (TestEphemerisInterpolation)
// stays what it was with the series.
func TestSunChebyshev(t *testing.T) {
	var maxA, maxD, maxR float64
	for y := 1800; y <= 2200; y += 20 {
		t0 := time.Date(y, 2, 1, 0, 0, 0, 0, time.UTC)
		if y == 2200 {
			t0 = time.Date(y-1, 11, 1, 0, 0, 0, 0, time.UTC)
		}
		j0 := epochOf(unixSeconds(t0)).JDE
		s := newEarthSeries(j0, j0+400)
		for i := range 400 {
			jde := j0 + 400*(float64(i)+0.5)/400
			if i%10 == 0 {
				jde = j0 + float64(i) // a whole day, as the track samples
			}
			L, B, R := s.at(jde)
			got := apparentSunFrom(jde, L, B, R)
			want := apparentSun(jde)
			da := math.Abs(math.Remainder(got.ra-want.ra, 2*math.Pi)) * math.Cos(want.dec) / arcsec2rad
			dd := math.Abs(got.dec-want.dec) / arcsec2rad
			dr := math.Abs(got.r - want.r)
			maxA, maxD, maxR = max(maxA, da), max(maxD, dd), max(maxR, dr)
		}
	}
	t.Logf("Chebyshev fit vs VSOP87D: right ascension %.2e″, declination %.2e″, distance %.1e au", maxA, maxD, maxR)
	if maxA > 0.001 || maxD > 0.001 || maxR > 5e-9 {
		t.Errorf("fit too far from the series: right ascension %.2e″, declination %.2e″, distance %.1e au (want ≤ 0.001″, 5e-9 au)", maxA, maxD, maxR)
	}
}
