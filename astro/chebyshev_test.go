package astro

import (
	"math"
	"testing"
	"time"
)

// TestSunChebyshev measures the Earth's position that the Sun's ephemeris
// samples (Chebyshev fits of VSOP87D's slow terms plus its fast terms,
// carried from day to day, and the nutation carried likewise) against the
// VSOP87D series it replaces, over spans of 400 days spread across
// 1800–2200 (one across the leap second of 2016-12-31), at every daily
// sample as NewEphemeris takes them and at instants between them: the
// apparent right ascension (as an angle on the sky) and declination within
// 0.001″, the distance within 5e-9 au (1e-7″ of parallax) and the daily
// nutation within 1e-5″ of the direct series, so that the track's own
// interpolation error (TestEphemerisInterpolation) stays what it was with
// the series.
func TestSunChebyshev(t *testing.T) {
	var maxA, maxD, maxR, maxN float64
	check := func(jde, L, B, R float64, nut ...float64) {
		got := apparentSunFrom(jde, L, B, R)
		if nut != nil {
			got = apparentSunNut(jde, L, B, R, nut[0], nut[1])
			dpsi, deps := nutationRad(jde)
			maxN = max(maxN, math.Abs(nut[0]-dpsi)/arcsec2rad, math.Abs(nut[1]-deps)/arcsec2rad)
		}
		want := apparentSun(jde)
		da := math.Abs(math.Remainder(got.ra-want.ra, 2*math.Pi)) * math.Cos(want.dec) / arcsec2rad
		dd := math.Abs(got.dec-want.dec) / arcsec2rad
		dr := math.Abs(got.r - want.r)
		maxA, maxD, maxR = max(maxA, da), max(maxD, dd), max(maxR, dr)
	}
	starts := []time.Time{time.Date(2016, 6, 1, 0, 0, 0, 0, time.UTC)}
	for y := 1800; y < 2200; y += 20 {
		starts = append(starts, time.Date(y, 2, 1, 0, 0, 0, 0, time.UTC))
	}
	starts = append(starts, time.Date(2199, 11, 1, 0, 0, 0, 0, time.UTC))
	for _, t0 := range starts {
		sec := unixSeconds(t0)
		jdes := make([]float64, 400)
		for k := range jdes {
			jdes[k] = epochOf(sec + float64(k)*secondsPerDay).JDE
		}
		s := newEarthSeries(jdes[0]-0.5, jdes[len(jdes)-1]+0.5)
		var buf sampleBuffers
		Ls, Bs, Rs := s.daily(jdes, &buf)
		dpsi, deps := nutationDaily(jdes, &buf)
		for k, jde := range jdes {
			check(jde, Ls[k], Bs[k], Rs[k], dpsi[k], deps[k])
		}
		for i := range 50 {
			jde := jdes[0] + 399*(float64(i)+0.37)/50
			L, B, R := s.at(jde)
			check(jde, L, B, R)
		}
	}
	t.Logf("fit vs VSOP87D: right ascension %.2e″, declination %.2e″, distance %.1e au", maxA, maxD, maxR)
	t.Logf("daily nutation vs direct: %.2e″", maxN)
	if maxN > 1e-5 {
		t.Errorf("daily nutation %.2e″ from the direct series (want ≤ 1e-5″)", maxN)
	}
	if maxA > 0.001 || maxD > 0.001 || maxR > 5e-9 {
		t.Errorf("fit too far from the series: right ascension %.2e″, declination %.2e″, distance %.1e au (want ≤ 0.001″, 5e-9 au)", maxA, maxD, maxR)
	}
}
