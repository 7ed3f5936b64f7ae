package astro

// Eclipses of the Sun and the Moon: the search shared by both kinds.
//
// The search runs once for all sites. Every new moon (phases.go) is a
// possible solar eclipse and every full moon a possible lunar one. Around
// each, the needed geocentric quantities (the Besselian elements for the Sun,
// the Sun's and the Moon's apparent places for the Moon) are computed from
// this package's own Sun (VSOP87D, sun.go) and Moon (ELP/MPP02, moon.go) at
// the Chebyshev nodes of a twelve-hour window centred on the syzygy and
// fitted by Chebyshev series (the Explanatory Supplement fits its Besselian
// elements by polynomials in the same way). Local circumstances for a site
// then cost only series evaluations: no further Sun or Moon positions.
//
// The window: the greatest eclipse lies within an hour of the syzygy in
// longitude, and the penumbral phases of a solar eclipse (first to last
// contact anywhere on the Earth) or of a lunar eclipse (P1 to P4) last at
// most about 6.3 h, so every contact lies within ±4.5 h of the syzygy.

import (
	"math"
	"time"
)

// eclipseHalfWindow is half the span fitted around each syzygy, seconds.
const eclipseHalfWindow = 6 * 3600

// eclipseNodes is the number of Chebyshev nodes (and terms) of each fit.
// With 9 terms over 12 h the fits reproduce direct evaluation to better
// than 1e-8 Earth radii (6 cm) and 1e-8 rad (0.002″) (TestEclipseFit).
const eclipseNodes = 9

// chebSet is a set of Chebyshev series sharing one interval [a, b] (Unix
// seconds): coef[j] is the series of quantity j.
type chebSet struct {
	a, b float64
	coef [][eclipseNodes]float64
}

// fitCheb samples f at the Chebyshev nodes of [a, b] and returns the
// interpolating series of each of the m quantities f writes into out.
func fitCheb(a, b float64, m int, f func(sec float64, out []float64)) *chebSet {
	const n = eclipseNodes
	cs := &chebSet{a: a, b: b, coef: make([][n]float64, m)}
	vals := make([][]float64, n)
	for i := range n {
		x := math.Cos(math.Pi * (float64(i) + 0.5) / n)
		vals[i] = make([]float64, m)
		f(0.5*(a+b)+0.5*(b-a)*x, vals[i])
	}
	for j := range m {
		for k := range n {
			s := 0.0
			for i := range n {
				s += vals[i][j] * math.Cos(math.Pi*float64(k)*(float64(i)+0.5)/n)
			}
			cs.coef[j][k] = 2 * s / n
		}
		cs.coef[j][0] /= 2
	}
	return cs
}

// eval writes the value of every series at sec into out.
func (cs *chebSet) eval(sec float64, out []float64) { cs.evalN(sec, out, len(cs.coef)) }

// evalN writes the values of the first n series at sec into out.
func (cs *chebSet) evalN(sec float64, out []float64, n int) {
	x := (2*sec - cs.a - cs.b) / (cs.b - cs.a)
	var t [eclipseNodes]float64
	t[0], t[1] = 1, x
	for k := 2; k < eclipseNodes; k++ {
		t[k] = 2*x*t[k-1] - t[k-2]
	}
	for j := range n {
		c := &cs.coef[j]
		s := 0.0
		for k := range eclipseNodes {
			s += c[k] * t[k]
		}
		out[j] = s
	}
}

// unwrapNear returns the angle a + 2πn closest to ref.
func unwrapNear(a, ref float64) float64 {
	return ref + wrapPi(a-ref)
}

// syzygies returns the Unix seconds (UTC) of the new moons (kind NewMoon)
// or the full moons (FullMoon) near which an eclipse may have its greatest
// phase in [from, to), with a day of margin on each side. The instants are
// Meeus's (Astronomical Algorithms 2nd ed., ch. 49) with the largest
// periodic terms, within a few minutes of the true syzygy: enough to centre
// the twelve-hour window. A syzygy is left out when the Moon is far from
// its node: |sin F| > 0.40, F being the Moon's argument of latitude (Meeus
// ch. 54 gives 0.36 as the limit for any eclipse).
func syzygies(from, to time.Time, kind PhaseKind) ([]float64, error) {
	if err := checkSpan("eclipses", from, to); err != nil {
		return nil, err
	}
	lo := math.Max(unixSeconds(from)-secondsPerDay, minUnix+eclipseHalfWindow)
	hi := math.Min(unixSeconds(to)+secondsPerDay, maxUnix-eclipseHalfWindow)
	var out []float64
	k := math.Floor((unixToJD(lo)-phaseEpoch)/synodicMonth) - 1 + float64(kind)/4
	for ; ; k++ {
		sec := ttToUnix(approxPhaseJDE(k))
		if sec > hi {
			break
		}
		T := k / 1236.85
		F := (160.7108 + 390.67050284*k - T*T*(0.0016118+T*(0.00000227-0.000000011*T))) * deg2rad
		if sec < lo || math.Abs(math.Sin(F)) > 0.40 {
			continue
		}
		out = append(out, sec)
	}
	return out, nil
}

// minimize returns the argument of the least value of f on [a, b], f being
// unimodal there: golden-section search to tol seconds.
func minimize(f func(float64) float64, a, b, tol float64) float64 {
	const g = 0.6180339887498949
	c, d := b-g*(b-a), a+g*(b-a)
	fc, fd := f(c), f(d)
	for b-a > tol {
		if fc < fd {
			b, d, fd = d, c, fc
			c = b - g*(b-a)
			fc = f(c)
		} else {
			a, c, fc = c, d, fd
			d = a + g*(b-a)
			fd = f(d)
		}
	}
	return 0.5 * (a + b)
}

// rootIllinois returns the root of f in [a, b] where f(a) and f(b) differ in
// sign: regula falsi with the Illinois modification, to tol seconds.
func rootIllinois(f func(float64) float64, a, fa, b, fb, tol float64) float64 {
	side := 0
	for range 100 {
		c := b - fb*(b-a)/(fb-fa)
		if !(c > math.Min(a, b) && c < math.Max(a, b)) {
			c = 0.5 * (a + b)
		}
		fc := f(c)
		if fc == 0 || math.Abs(b-a) < tol {
			return c
		}
		if (fc > 0) == (fb > 0) {
			b, fb = c, fc
			if side == -1 {
				fa /= 2
			}
			side = -1
		} else {
			a, fa = c, fc
			if side == 1 {
				fb /= 2
			}
			side = 1
		}
		if math.Abs(b-a) < tol {
			return 0.5 * (a + b)
		}
	}
	return 0.5 * (a + b)
}

// crossingsOf returns the instants in (a, b) at which f, the altitude of a
// body above its rise/set altitude, changes sign, with the sign after each
// (true: rising). The altitude is monotonic between the body's meridian
// passages, where hourAngle (rad) is a multiple of π, and its rate is
// rate (rad/s): the interval is cut there and every hour at most (the
// extremum drifts from the meridian at high latitude), and each piece
// with a change of sign is solved to 0.1 s.
func crossingsOf(f, hourAngle func(float64) float64, rate, a, b float64) (ts []float64, up []bool) {
	cuts := []float64{a}
	h := hourAngle(a)
	next := a + (math.Ceil(h/math.Pi)*math.Pi-h)/rate
	for t := a; t < b; {
		step := math.Min(t+3600, b)
		if next > t && next < step {
			step = next
			next += math.Pi / rate
		}
		cuts = append(cuts, step)
		t = step
	}
	t0, f0 := a, f(a)
	for _, t1 := range cuts[1:] {
		f1 := f(t1)
		if (f0 > 0) != (f1 > 0) {
			ts = append(ts, rootIllinois(f, t0, f0, t1, f1, 0.1))
			up = append(up, f1 > 0)
		}
		t0, f0 = t1, f1
	}
	return ts, up
}

// secToTime converts Unix seconds to a time.Time rounded to the millisecond.
func secToTime(sec float64) time.Time {
	return timeFromUnix(math.Round(sec*1000) / 1000)
}
