package astro

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestCosNear: the cosine of an hour angle taken from a nearby angle's
// cosine and sine (the crossing search's first evaluation) against
// math.Cos, over hour angles as large as a track's (up to 10⁶ rad) and
// differences up to the 0.01 rad it accepts: within 6e-16, a few units of
// the last place, so that the solved instants move by less than 1e-10 s.
// Beyond 0.01 rad it declines.
func TestCosNear(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	worst := 0.0
	for range 200000 {
		target := (r.Float64()*2 - 1) * math.Pi
		n := math.Floor(r.Float64() * 160000)
		d := (r.Float64()*2 - 1) * 0.0099
		H := target + n*2*math.Pi + d
		got, ok := cosNear(H, target, math.Cos(target), math.Sin(target))
		if !ok {
			t.Fatalf("cosNear(%v, %v) declined a difference of %v", H, target, d)
		}
		worst = max(worst, math.Abs(got-math.Cos(H)))
	}
	if worst > 6e-16 {
		t.Errorf("cosNear differs from math.Cos by up to %.3g", worst)
	}
	if _, ok := cosNear(1000+0.0101, 1000-2*math.Pi*159, math.Cos(1000), math.Sin(1000)); ok {
		t.Error("cosNear accepted a difference of 0.0101 rad")
	}
}
