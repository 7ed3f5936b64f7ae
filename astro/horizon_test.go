package astro

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestCosNear: the cosine of an hour angle taken from a nearby angle's
// cosine and sine (reduceNear, cosSmall: the searches' evaluations near a
// known hour angle) against math.Cos, over hour angles as large as a
// track's (up to 10⁶ rad) and differences up to the 0.01 rad they are
// used for: within 6e-16, a few units of the last place, so that the
// solved instants move by less than 1e-10 s.
func TestCosNear(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	worst := 0.0
	for range 200000 {
		target := (r.Float64()*2 - 1) * math.Pi
		n := math.Floor(r.Float64() * 160000)
		d := (r.Float64()*2 - 1) * 0.0099
		H := target + n*2*math.Pi + d
		dr := reduceNear(H, target)
		if math.Abs(dr-d) > 1e-9 {
			t.Fatalf("reduceNear(%v, %v) = %v, want %v", H, target, dr, d)
		}
		got := cosSmall(dr, math.Cos(target), math.Sin(target))
		worst = max(worst, math.Abs(got-math.Cos(H)))
	}
	if worst > 6e-16 {
		t.Errorf("cosSmall differs from math.Cos by up to %.3g", worst)
	}
}

// TestUnixMicros: the crossings' rounding to the microsecond against its
// definition by math.Floor and math.Round, over instants before and after
// 1970, fractions of a second at random and at the halves of a
// microsecond, and the fraction just below half a microsecond.
func TestUnixMicros(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	check := func(sec float64) {
		t.Helper()
		whole := math.Floor(sec)
		wantUs := math.Round((sec - whole) * 1e6)
		gotWhole, gotUs := unixMicros(sec)
		if gotWhole != int64(whole) || gotUs != int64(wantUs) {
			t.Fatalf("unixMicros(%v) = %d s %d µs, want %d s %v µs", sec, gotWhole, gotUs, int64(whole), wantUs)
		}
	}
	for range 200000 {
		sec := (r.Float64()*2 - 1) * 7e9 // 1748..2191
		check(sec)
		check(math.Floor(sec) + (math.Floor(r.Float64()*1e6)+0.5)*1e-6)
	}
	for _, sec := range []float64{0, -0.5e-6, 0.5e-6, math.Nextafter(0.5e-6, 0), 0.49999999999999994e-6, -1e-7, 1 - 1e-7, 1e9 + 0.9999996, -1e9 - 0.9999996} {
		check(sec)
	}
}

// TestRemainder2Pi: the track's unwrapping step gives math.Remainder(x, 2π)
// to the bit (a zero's sign aside), for differences of a fraction of a
// turn to 10⁶ rad (the hour angles' size over the years), at random, at
// and next to the multiples of π (where a halfway case rounds to even),
// and at the yearly turns of the Sun's tabulated hour angle.
func TestRemainder2Pi(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	check := func(x float64) {
		t.Helper()
		got, want := remainder2Pi(x), math.Remainder(x, 2*math.Pi)
		if got != want || got != 0 && math.Float64bits(got) != math.Float64bits(want) {
			t.Fatalf("remainder2Pi(%v) = %v, want %v", x, got, want)
		}
	}
	for range 200000 {
		check((r.Float64()*2 - 1) * 12 * math.Pi)
		check((r.Float64()*2 - 1) * 1e6)
		check(2*math.Pi*math.Floor(r.Float64()*40) + (r.Float64()*2-1)*0.05)
	}
	for _, m := range []float64{0, 1, 2, 3, 4, 5, 7, 12, 41, 1e3 + 1, 318309, 1 << 20} {
		for _, x := range []float64{m * math.Pi, -m * math.Pi} {
			check(x)
			check(math.Nextafter(x, math.Inf(1)))
			check(math.Nextafter(x, math.Inf(-1)))
		}
	}
}
