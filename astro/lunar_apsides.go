package astro

import (
	"fmt"
	"math"
	"time"
)

// The Moon's perigee and apogee: the instants of least and greatest
// distance between the centres of the Earth and the Moon. The mean apsides
// of Meeus, Astronomical Algorithms 2nd ed., ch. 50 (eq. 50.1) are the
// starting values; the true perigee can be up to about 2.5 days from the
// mean one (the apogee about 0.6 day), so the ELP/MPP02 distance (elp.go) is
// sampled every 3 hours within 3.5 days of the mean instant and the extreme
// sample refined by Newton's method on the numerical derivative. The
// distance curve is flat there (a few metres per minute), so the instant is
// well defined to about a minute only; the distance to a few metres.

// LunarApsis is a perigee or an apogee of the Moon.
type LunarApsis struct {
	Perigee  bool      // true at perigee (least distance), false at apogee
	Time     time.Time // UTC
	Distance float64   // between the centres of the Earth and the Moon, km
}

// String returns e.g. "perigee 2026-01-01T21:00Z 360347 km".
func (a LunarApsis) String() string {
	kind := "apogee"
	if a.Perigee {
		kind = "perigee"
	}
	return fmt.Sprintf("%s %s %.0f km", kind, a.Time.Format("2006-01-02T15:04Z"), a.Distance)
}

// meanLunarApsisJDE returns the JDE of the mean apsis k (integer: perigee,
// +0.5: apogee; k = 0 near 1999.97): Meeus eq. 50.1.
func meanLunarApsisJDE(k float64) float64 {
	T := k / 1325.55
	return 2451534.6698 + 27.55454989*k + T*T*(-0.0006691+T*(-0.000001098+T*0.0000000052))
}

// elpDistance returns the ELP/MPP02 distance (km) at jde.
func elpDistance(jde float64) float64 {
	t, t2, t3, t4, _ := elpTime(jde)
	return elpSum(&elpR, t, t2, t3, t4)
}

// trueLunarApsisJDE finds the distance extremum near the mean apsis jde0.
func trueLunarApsisJDE(jde0 float64, perigee bool) (jde, dist float64) {
	sign := 1.0 // minimise sign·R
	if !perigee {
		sign = -1
	}
	f := func(x float64) float64 { return sign * elpDistance(x) }
	const step, half = 0.125, 3.5 // days
	best, fb := jde0, f(jde0)
	for x := jde0 - half; x <= jde0+half; x += step {
		if v := f(x); v < fb {
			best, fb = x, v
		}
	}
	const h = 600.0 / secondsPerDay
	x := best
	for range 8 {
		fm, f0, fp := f(x-h), f(x), f(x+h)
		d2 := (fp - 2*f0 + fm) / (h * h)
		if !(d2 > 0) {
			break
		}
		dx := -(fp - fm) / (2 * h) / d2
		dx = max(-step, min(step, dx))
		x += dx
		if math.Abs(dx) < 0.1/secondsPerDay {
			break
		}
	}
	return x, elpDistance(x)
}

// LunarApsides returns the Moon's perigees and apogees with from ≤ Time < to,
// sorted, alternating: ELP/MPP02 distance extrema started from the mean
// apsides of Meeus ch. 50. It returns a *RangeError outside
// MinTime..MaxTime and an error matching ErrInvalidInput when to is before
// from.
func LunarApsides(from, to time.Time) ([]LunarApsis, error) {
	if err := checkSpan("lunar apsides", from, to); err != nil {
		return nil, err
	}
	fromSec, toSec := unixSeconds(from), unixSeconds(to)
	k := math.Floor((unixToJD(fromSec)-2451534.6698)/27.55454989*2)/2 - 0.5
	var out []LunarApsis
	for ; ; k += 0.5 {
		mean := meanLunarApsisJDE(k)
		if jdToUnix(mean) > toSec+4*secondsPerDay {
			break
		}
		perigee := k == math.Floor(k)
		jde, dist := trueLunarApsisJDE(mean, perigee)
		sec := ttToUnix(jde)
		if sec < fromSec || sec >= toSec {
			continue
		}
		out = append(out, LunarApsis{Perigee: perigee, Time: timeFromUnix(sec), Distance: dist})
	}
	return out, nil
}
