package astro

// Horizon events of any body: threshold crossings of the altitude, the
// extrema of the altitude (upper and lower culminations) and meridian
// transits, for an observer on the Earth.
//
// The search is generic over a body track, so the Sun (ephemeris.go) and the
// Moon share it. The internal hook is:
//
//	tr := newTrack(start, step, n, func(e Epoch) (ra, dec, dist, eqEq float64) {
//		// apparent geocentric right ascension and declination of date
//		// (radians), distance from the Earth's centre (Earth radii,
//		// earthRadiusKm) and the equation of the equinoxes Δψ cos ε
//		// (radians, from the nutation the position needed anyway) at epoch e
//	})
//	st := newSite(o)                                   // observer, checked first by o.Validate()
//	ext := tr.extrema(st, a, b)                        // culminations over [a − 1 day, b + 1 day] (Unix s)
//	xs := tr.crossings(st, ext, math.Sin(h0), a, b, nil) // crossings of geometric altitude h0 (rad) in [a, b)
//	ts := tr.transitList(st, from, to)                 // upper meridian transits in [from, to)
//	sh := tr.sinAltitude(st, sec)                      // sine of the topocentric altitude
//
// A track samples the body once per step seconds (the Sun: one day) at UTC
// instants start + k·step and interpolates with 4-point (cubic) Lagrange
// polynomials. It stores the declination, the distance and the smooth part of
// the Greenwich hour angle: GHA − ω·(t − start) − ω·(leap seconds since
// 1972), ω = 360.98564736629°/day, so the Earth's rotation and UT1 − UTC
// steps at leap seconds are added exactly at each query. The track covers
// its samples except one step at the start and two at the end (the cubic
// stencil); callers keep their windows inside coverage().
//
// Altitudes are topocentric and geometric (no refraction: thresholds such
// as −0.8333° include it): the body's geocentric vector minus the
// observer's geocentric position (WGS 84 ellipsoid, height included; Meeus
// ch. 11), projected on the local vertical. For the Sun this is the parallax
// of 8.794″/r (r in au); for the Moon about a degree.
//
// The crossing search never relies on sampling the altitude: between two
// consecutive extrema of the altitude the altitude is monotonic, so each such
// interval holds at most one crossing of any threshold, and holds one exactly
// when the threshold lies between the two extreme values. The extrema are
// found from the instants of hour angle 0 and 180° (Newton's method on the
// interpolated hour angle) refined by Newton's method on the numerical
// derivative of the altitude: near the poles they drift far from the
// meridian (about 4° of hour angle at 89° latitude for the Sun). A crossing
// is then solved by the secant method, safeguarded by bisection within its
// interval, to 1 ms, starting from the classical hour-angle estimate
// cos H = (sin h₀ − sin φ sin δ) / (cos φ cos δ) (Meeus ch. 15). When the
// altitude has no extremum near a meridian passage (only within about 0.1°
// of a pole for the Sun), that passage is used as the interval bound.

import (
	"math"
	"slices"
	"time"
)

// siderealRate is ω, the Earth's rotation rate on the mean equinox in
// radians per second of UT1 (Meeus eq. 12.4).
const siderealRate = 360.98564736629 * deg2rad / secondsPerDay

// auKm is the astronomical unit in km (IAU 2012).
const auKm = 149597870.7

// track is a body's geocentric path sampled at a fixed step.
type track struct {
	start, step  float64   // Unix seconds of sample 0, spacing in seconds
	g, dec, dist []float64 // smooth GHA part (rad, unwrapped), declination (rad), distance (Earth radii)
	// sd and cd, when set (the Sun's track, see trigRange), are the sine and
	// cosine of dec at the samples, interpolated in place of a sine and
	// cosine of the interpolated dec
	sd, cd []float64
	// carry: crossings start from the misses of the days before (see
	// crossingsMany); set for the Sun, whose misses change slowly
	carry bool
	kmax  int       // the last sample index weights returns: len(g) − 3
	leaps []float64 // leap-second instants within the track (Unix s)
	leap0 float64   // leap seconds since 1972 at start
	rate  float64   // mean rate of the Greenwich hour angle, rad/s
}

// leapCount returns the leap seconds inserted since 1972-01-01 at Unix
// second sec (0 before 1972).
func leapCount(sec float64) float64 {
	if sec < utcLeapStart {
		return 0
	}
	return taiMinusUTC(sec) - 10
}

// newTrack samples sample() at start + k·step, k = 0..n−1. Distances are in
// Earth radii; eqEq is the equation of the equinoxes for the apparent
// sidereal time.
func newTrack(start, step float64, n int, sample func(e Epoch) (ra, dec, dist, eqEq float64)) *track {
	tr := allocTrack(start, step, n)
	for k := range n {
		e := epochOf(start + float64(k)*step)
		ra, dec, dist, eqEq := sample(e)
		tr.set(k, greenwichHourAngle(e, ra, eqEq), dec, dist)
	}
	tr.finish()
	return tr
}

// allocTrack returns a track of n samples from start, step apart, to be
// filled (set, possibly by several goroutines over separate runs of
// samples) and then finished.
func allocTrack(start, step float64, n int) *track {
	tr := &track{start: start, step: step, g: make([]float64, n), dec: make([]float64, n), dist: make([]float64, n), kmax: n - 3}
	end := start + float64(n-1)*step
	tr.leap0 = leapCount(start)
	for _, l := range leapSeconds {
		if l > start && l <= end {
			tr.leaps = append(tr.leaps, l)
		}
	}
	return tr
}

// greenwichHourAngle returns the Greenwich hour angle (rad, not reduced) of
// right ascension ra at epoch e: the apparent sidereal time (the mean one
// plus the equation of the equinoxes eqEq) minus ra.
func greenwichHourAngle(e Epoch, ra, eqEq float64) float64 {
	return meanSiderealRaw(e.JDUT1)*deg2rad + eqEq - ra
}

// set stores sample k from its Greenwich hour angle gha (rad, not reduced,
// greenwichHourAngle), declination and distance.
func (tr *track) set(k int, gha, dec, dist float64) {
	sec := tr.start + float64(k)*tr.step
	tr.g[k] = gha - siderealRate*(sec-tr.start) - siderealRate*leapCount(sec)
	tr.dec[k], tr.dist[k] = dec, dist
}

// finish unwraps the hour angle's smooth part once every sample is in and
// takes its mean rate.
func (tr *track) finish() {
	n := len(tr.g)
	for k := 1; k < n; k++ {
		tr.g[k] = tr.g[k-1] + remainder2Pi(tr.g[k]-tr.g[k-1])
	}
	tr.rate = siderealRate
	if n > 1 {
		end := tr.start + float64(n-1)*tr.step
		tr.rate += (tr.g[n-1] - tr.g[0]) / (end - tr.start)
	}
}

// trigRange tabulates the sine and cosine of the declination at the
// samples k0..k1−1 (into tr.sd and tr.cd, allocated already: the blocks of
// samples filled on several goroutines each tabulate their own),
// so that sinAltitude interpolates them rather than computing them from the
// interpolated declination: a third of its cost. Interpolated, sin δ and
// cos δ are no longer exactly on the unit circle, but the altitude is
// taken from the direction of the topocentric vector, which normalises
// them: for the Sun's daily samples the sines of the altitude agree with
// those from δ within 4e-10 (0.0001″) over 2020–2040, a tenth of the
// interpolation's own bound (TestEphemerisInterpolation measures the track
// against the full series).
func (tr *track) trigRange(k0, k1 int) {
	for k := k0; k < k1; k++ {
		tr.sd[k], tr.cd[k] = math.Sincos(tr.dec[k])
	}
}

// coverage returns the span (Unix s) inside which the track interpolates.
func (tr *track) coverage() (a, b float64) {
	return tr.start + tr.step, tr.start + float64(len(tr.g)-2)*tr.step
}

// weights returns the sample index k and the cubic Lagrange weights for
// samples k−1..k+2 at Unix second sec.
func (tr *track) weights(sec float64) (int, [4]float64) {
	x := (sec - tr.start) / tr.step
	// int(x) is math.Floor(x) wherever it is not clamped (x ≥ 0), and the
	// signs are in the divisors: the same numbers, and a function small
	// enough for the compiler to put in line
	k := min(max(int(x), 1), tr.kmax)
	p := x - float64(k)
	pm1, pp1, pm2 := p-1, p+1, p-2
	return k, [4]float64{
		p * pm1 * pm2 / -6,
		pp1 * pm1 * pm2 / 2,
		pp1 * p * pm2 / -2,
		pp1 * p * pm1 / 6,
	}
}

func interp(v []float64, k int, w *[4]float64) float64 {
	s := v[k-1 : k+3] // one bounds check for the four samples
	return w[0]*s[0] + w[1]*s[1] + w[2]*s[2] + w[3]*s[3]
}

// at returns the Greenwich hour angle (rad, not reduced), declination (rad)
// and distance (Earth radii) at Unix second sec.
func (tr *track) at(sec float64) (gha, dec, dist float64) {
	k, w := tr.weights(sec)
	return tr.ghaFrom(sec, k, &w), interp(tr.dec, k, &w), interp(tr.dist, k, &w)
}

// decAt returns the declination (rad) at Unix second sec.
func (tr *track) decAt(sec float64) float64 {
	k, w := tr.weights(sec)
	return interp(tr.dec, k, &w)
}

// ghaFrom is the Greenwich hour angle at sec from the weights of sec:
// interp(tr.g, k, w) written out, the same sum, so that the compiler puts
// the function in line.
func (tr *track) ghaFrom(sec float64, k int, w *[4]float64) float64 {
	leaps := tr.leap0
	for _, l := range tr.leaps {
		if sec >= l {
			leaps++
		}
	}
	s := tr.g[k-1 : k+3]
	return w[0]*s[0] + w[1]*s[1] + w[2]*s[2] + w[3]*s[3] + siderealRate*(sec-tr.start) + siderealRate*leaps
}

// hourAngle returns the local hour angle (rad, not reduced) at sec.
func (tr *track) hourAngle(st *site, sec float64) float64 {
	k, w := tr.weights(sec)
	return tr.ghaFrom(sec, k, &w) + st.lon
}

// site is an observer prepared for altitude computations.
type site struct {
	lat, lon   float64 // geodetic latitude, east longitude, radians
	sinLat     float64
	cosLat     float64
	rhoSin     float64 // ρ sin φ′, Earth radii (Meeus ch. 11)
	rhoCos     float64 // ρ cos φ′, Earth radii
	latDegrees float64
}

// newSite prepares an observer; o must be valid.
func newSite(o Observer) *site {
	st := siteOf(o)
	return &st
}

// siteOf is newSite's site as a value, for a caller that keeps it on its
// stack (SunFrom and MoonFrom allocate nothing).
func siteOf(o Observer) site {
	phi := o.Latitude * deg2rad
	ba := 1 - earthFlattening
	u := math.Atan(ba * math.Tan(phi))
	su, cu := math.Sincos(u)
	sp, cp := math.Sincos(phi)
	hr := o.Elevation / (earthRadiusKm * 1000)
	st := site{lat: phi, lon: o.Longitude * deg2rad, sinLat: sp, cosLat: cp, latDegrees: o.Latitude}
	st.rhoSin = ba*su + hr*sp
	st.rhoCos = cu + hr*cp
	if math.Abs(o.Latitude) == 90 {
		st.rhoSin = math.Copysign(ba+hr, o.Latitude)
		st.rhoCos = 0
	}
	return st
}

// sinAltitudeFrom returns the sine of the topocentric altitude of a body at
// local hour angle H, declination dec (rad) and geocentric distance dist
// (Earth radii).
func (st *site) sinAltitudeFrom(H, dec, dist float64) float64 {
	sd, cd := math.Sincos(dec)
	return st.sinAltitudeSC(H, sd, cd, dist)
}

// sinAltitudeSC is sinAltitudeFrom with the declination's sine and cosine
// given.
func (st *site) sinAltitudeSC(H, sd, cd, dist float64) float64 {
	return st.sinAltitudeCos(math.Cos(H), sd, cd, dist)
}

// sinAltitudeCos is sinAltitudeSC with the cosine of the hour angle given.
func (st *site) sinAltitudeCos(cH, sd, cd, dist float64) float64 {
	// topoVector written out: this is the searches' inner loop, and the
	// compiler does not inline topoVector
	// only y² enters, as (dist·cd)²·(1 − cos²H): a cosine costs half
	// a sine and cosine
	dc := dist * cd
	x := dc*cH - st.rhoCos
	z := dist*sd - st.rhoSin
	return (x*st.cosLat + z*st.sinLat) / math.Sqrt(x*x+dc*dc*(1-cH*cH)+z*z)
}

// topoVector is the vector from the site to a body at local hour angle H
// (rad), with declination sine sd and cosine cd, at geocentric distance
// dist (Earth radii): x towards the meridian on the equator, y towards the
// west, z towards the pole (Earth radii). azimuthFrom and topoDistance
// read the body's direction and distance from it; sinAltitudeSC computes
// the same vector in line.
func (st *site) topoVector(H, sd, cd, dist float64) (x, y, z float64) {
	sH, cH := math.Sincos(H)
	return dist*cd*cH - st.rhoCos, dist * cd * sH, dist*sd - st.rhoSin
}

// sinAltitude returns the sine of the body's topocentric geometric altitude
// at Unix second sec.
func (tr *track) sinAltitude(st *site, sec float64) float64 {
	k, w := tr.weights(sec)
	H := tr.ghaFrom(sec, k, &w) + st.lon
	if tr.sd != nil {
		return st.sinAltitudeSC(H, interp(tr.sd, k, &w), interp(tr.cd, k, &w), interp(tr.dist, k, &w))
	}
	return st.sinAltitudeFrom(H, interp(tr.dec, k, &w), interp(tr.dist, k, &w))
}

// sinAltitudeNear is sinAltitude at sec where the local hour angle is
// near target, whose cosine and sine ct and st are known (a crossing's
// estimate, a meridian passage): within 0.01 rad of it, the hour angle's
// cosine is taken from theirs by the angle-addition formulas and short
// series in the difference (reduceNear, cosSmall) instead of by math.Cos,
// a third of an evaluation.
func (tr *track) sinAltitudeNear(s *site, sec, target, ct, st float64) float64 {
	k, w := tr.weights(sec)
	H := tr.ghaFrom(sec, k, &w) + s.lon
	var cH float64
	if d := reduceNear(H, target); math.Abs(d) <= 0.01 {
		cH = cosSmall(d, ct, st)
	} else {
		cH = math.Cos(H)
	}
	if tr.sd != nil {
		return s.sinAltitudeCos(cH, interp(tr.sd, k, &w), interp(tr.cd, k, &w), interp(tr.dist, k, &w))
	}
	sd, cd := math.Sincos(interp(tr.dec, k, &w))
	return s.sinAltitudeCos(cH, sd, cd, interp(tr.dist, k, &w))
}

// 2π in three parts, the first two with their low 28 bits zero, so that n
// times them is exact for |n| < 2²⁸ (math.Cos's split of π/4, times 8).
// Hour angles within MinTime..MaxTime stay below 10⁶ rad: n < 2¹⁸.
const (
	twoPiA = 8 * 7.85398125648498535156e-1
	twoPiB = 8 * 3.77489470793079817668e-8
	twoPiC = 8 * 2.69515142907905952645e-15
)

// reduceNear returns H − target reduced modulo 2π to [−π, π], in the
// three parts of 2π as math.Cos reduces its argument, so that a small
// difference keeps its digits.
func reduceNear(H, target float64) float64 {
	n := math.Floor((H-target)*(1/(2*math.Pi)) + 0.5)
	return ((H - n*twoPiA) - n*twoPiB) - n*twoPiC - target
}

// cosSmall returns cos(target + d) from the cosine ct and sine st of target,
// for |d| ≤ 0.01: the series of cos d and sin d are cut where the next term
// is below 1e-17. With reduceNear it agrees with math.Cos to a few units of
// the last place (TestCosNear).
func cosSmall(d, ct, st float64) float64 {
	d2 := d * d
	return ct*(1-d2*(0.5-d2*(1.0/24-d2*(1.0/720)))) - st*d*(1-d2*(1.0/6-d2*(1.0/120)))
}

// extremum is a node of the altitude curve: an upper or lower culmination
// (or, where the altitude has none, the meridian passage itself).
type extremum struct {
	t     float64 // Unix seconds
	sinH  float64 // sine of the altitude at t
	upper bool    // near hour angle 0 (maximum) rather than 180° (minimum)
}

// 2π as a float64 (2*math.Pi, the divisor of math.Remainder) in two
// parts whose low bits are zero (25 and 23 significant bits), so that n
// times either is exact for |n| < 2²⁸.
const (
	twoPiHi = 0x1.921fb5p+2
	twoPiLo = 0x1.110b46p-24
)

// remainder2Pi is math.Remainder(x, 2π), the same number (a zero may come
// without the sign of x, which adding it to an angle does not see), at a
// tenth of its cost: x − 2π·n with n = round(x/2π), taken as (x − n·hi) −
// n·lo, is exact when |x − 2π·n| < π, as the IEEE remainder is: n·hi and
// n·lo are exact, x and n·hi lie within a factor of two of each other
// (n ≠ 0), so that their difference is exact, and the remainder is a
// float64, so that the last difference is too. A result not below π (n
// misjudged next to a halfway case, where the remainder rounds n to even)
// goes to math.Remainder. Where the track unwraps its hour angle, each
// sample is taken from an unwrapped one and the Sun's tabulated ones step
// by a turn each year (the right ascension's wrap at the March
// equinox), so that after a few years n is several turns.
func remainder2Pi(x float64) float64 {
	n := math.Round(x / (2 * math.Pi))
	if r := (x - n*twoPiHi) - n*twoPiLo; math.Abs(n) < 1<<28 && math.Abs(r) < math.Pi {
		return r
	}
	return math.Remainder(x, 2*math.Pi)
}

// wrapPi reduces an angle to [−π, π) (cheaper than math.Remainder).
func wrapPi(a float64) float64 {
	return a - 2*math.Pi*math.Floor(a/(2*math.Pi)+0.5)
}

// passageTol returns the first instant ≥ from at which the local hour
// angle equals target modulo 2π, solved to tol seconds.
func (tr *track) passageTol(st *site, from, target, tol float64) float64 {
	d := wrapPi(target - tr.hourAngle(st, from)) // forward distance in [0, 2π)
	if d < 0 {
		d += 2 * math.Pi
	}
	return tr.passageNear(st, from+d/tr.rate, target, tol)
}

// passageNear is passageTol by Newton's method from guess, an instant
// near the passage (within a fraction of the half turn on either side of
// it).
func (tr *track) passageNear(st *site, guess, target, tol float64) float64 {
	t := guess
	for range 8 {
		e := wrapPi(tr.hourAngle(st, t)-target) / tr.rate
		t -= e
		if math.Abs(e) < tol {
			break
		}
	}
	return t
}

// extrema returns the culminations of the body within [a − 1 day,
// b + 1 day] (Unix s; clipped to the track's coverage), in order,
// alternating upper and lower, so that every instant of [a, b] lies between
// two of them.
func (tr *track) extrema(st *site, a, b float64) []extremum {
	return tr.appendExtrema(nil, st, a, b)
}

// appendExtrema is extrema appending to out.
func (tr *track) appendExtrema(out []extremum, st *site, a, b float64) []extremum {
	lo, hi := tr.coverage()
	a = max(a-secondsPerDay, lo)
	b = min(b+secondsPerDay, hi)
	out = slices.Grow(out, int((b-a)/(tr.step/2))+4)
	t := a
	H := math.Mod(tr.hourAngle(st, t), 2*math.Pi)
	if H < 0 {
		H += 2 * math.Pi
	}
	m := math.Floor(H/math.Pi) + 1 // next multiple of π
	var last lastPassages
	for {
		target := m * math.Pi
		upper := int64(m)%2 == 0 // m is a whole number (math.Mod took 400 instructions)
		tp := tr.nextPassage(st, &last, t, target, 0.5)
		if tp > b {
			break
		}
		out = append(out, tr.refineExtremum(st, tp, upper))
		t = tp + 1
		m++
	}
	return out
}

// lastPassages are the last two passages nextPassage found in a search,
// and how many it found.
type lastPassages struct {
	n      int
	p1, p2 float64 // the last, the one before
}

// nextPassage is passageTol from t, noted in last. The Sun's next passage
// (tr.carry) is about as far after the last as the last after the one
// before (within a second), so that once two are known Newton's method
// starts there, not from an instant a half turn before it: one or two
// hour angles a passage instead of three. (The Moon's passages are found
// from t: its searches over different spans give the same instants to the
// microsecond, which its skyline's crossings are matched by.)
func (tr *track) nextPassage(st *site, last *lastPassages, t, target, tol float64) float64 {
	var tp float64
	if last.n >= 2 && tr.carry {
		tp = tr.passageNear(st, 2*last.p1-last.p2, target, tol)
	} else {
		tp = tr.passageTol(st, t, target, tol)
	}
	last.n++
	last.p1, last.p2 = tp, last.p1
	return tp
}

// refineExtremum finds the altitude extremum near the meridian passage tp.
// Near a pole the day's change of declination moves the extremum far from
// the meridian (about 39° of hour angle at 89.9° for the Sun at an
// equinox); when Newton's method would leave the meridian by more than
// maxShift the extremum is found by golden-section search instead, over
// hour angles within ±0.45π of the passage, where the altitude is concave
// (upper) or convex (lower), so that a maximum grazing a threshold by a
// thousandth of a degree is not lost. Successive extrema stay in order:
// each lies within a quarter turn of its own passage.
func (tr *track) refineExtremum(st *site, tp float64, upper bool) extremum {
	const eps = 60.0 // s
	maxShift := 0.45 * math.Pi / tr.rate
	// the hour angle near the passage: 0 or π, whose cosine is ±1 and sine
	// 0 (sinAltitudeNear: for the first step's three evaluations, ±4·10⁻³
	// rad from it)
	target, ct := 0.0, 1.0
	if !upper {
		target, ct = math.Pi, -1
	}
	t := tp
	y0 := tr.sinAltitudeNear(st, t, target, ct, 0)
	for range 12 {
		ym, yp := tr.sinAltitudeNear(st, t-eps, target, ct, 0), tr.sinAltitudeNear(st, t+eps, target, ct, 0)
		d1 := (yp - ym) / (2 * eps)
		d2 := (yp - 2*y0 + ym) / (eps * eps)
		if (upper && !(d2 < 0)) || (!upper && !(d2 > 0)) {
			break // no extremum here (next to a pole): keep the last point
		}
		step := -d1 / d2
		if math.Abs(step) > 3*3600 {
			step = math.Copysign(3*3600, step)
		}
		if math.Abs(t+step-tp) > maxShift {
			return tr.goldenExtremum(st, tp-maxShift, tp+maxShift, upper)
		}
		if math.Abs(step) < 60 {
			// Newton's error is now below 0.1 s: take the step and its
			// Taylor value (exact to far below 1e-12).
			return extremum{t: t + step, sinH: y0 + step*(d1+0.5*d2*step), upper: upper}
		}
		t += step
		y0 = tr.sinAltitudeNear(st, t, target, ct, 0)
	}
	return extremum{t: t, sinH: y0, upper: upper}
}

// goldenExtremum returns the maximum (upper) or minimum of the altitude in
// [a, b] (Unix s) by golden-section search to 0.1 s, for an altitude that is
// concave (upper) or convex there; an end point when it is monotonic.
func (tr *track) goldenExtremum(st *site, a, b float64, upper bool) extremum {
	sign := 1.0
	if !upper {
		sign = -1
	}
	t := minimize(func(t float64) float64 { return -sign * tr.sinAltitude(st, t) }, a, b, 0.1)
	return extremum{t: t, sinH: tr.sinAltitude(st, t), upper: upper}
}

// crossing is one threshold crossing, Unix seconds.
type crossing struct {
	t      float64
	rising bool
}

// crossings returns the crossings of the altitude whose sine is sinH0 in
// [a, b) (Unix s), in order, using the extrema ext (from tr.extrema over a
// span covering [a, b]).
func (tr *track) crossings(st *site, ext []extremum, sinH0, a, b float64, out []crossing) []crossing {
	outs := [1][]crossing{out}
	tr.crossingsMany(st, ext, []float64{sinH0}, a, b, outs[:], nil)
	return outs[0]
}

// crossingsMany appends to outs[i] the crossings of the altitude whose sine
// is sinH0s[i] in [a, b) (Unix s), in order, using the extrema ext (from
// tr.extrema over a span covering [a, b]). Between two extrema the
// altitude is monotonic, so each threshold is crossed at most once in each
// interval; what the estimates of one interval share (the declination at
// its middle) is computed once, in mids (working memory, returned for the
// next call: len(ext)−1 entries are used).
//
// The hour-angle estimate misses the crossing by a few seconds (the
// declination taken at the interval's middle, the culmination off the
// meridian, the parallax), by an amount that changes slowly from one day
// to the next: each threshold and direction remembers the misses of its
// last two crossings and moves the estimate by their linear extrapolation,
// which mostly brings it within a few milliseconds, so that the solver's
// first Newton step ends the search. The solver keeps its bracket: a poor
// start only costs steps. This is done for the Sun's track (carry); the
// Moon's estimates miss by more, and its Newton step's slope is rougher.
// The thresholds are taken one after the other, each over all intervals,
// so that a threshold's misses and its list stay at hand.
func (tr *track) crossingsMany(st *site, ext []extremum, sinH0s []float64, a, b float64, outs [][]crossing, mids []midDec) []midDec {
	if len(ext) < 2 {
		return mids
	}
	// the intervals i (between ext[i] and ext[i+1]) that reach into [a, b)
	i0, i1 := 0, len(ext)-1
	for i0 < i1 && ext[i0+1].t < a {
		i0++
	}
	for i1 > i0 && ext[i1-1].t >= b {
		i1--
	}
	mids = slices.Grow(mids[:0], len(ext)-1)[:len(ext)-1]
	clear(mids)
	for h, sinH0 := range sinH0s {
		out := outs[h]
		var up, down miss // rising, setting
		for i := i0; i < i1; i++ {
			e0, e1 := &ext[i], &ext[i+1]
			f0, f1 := e0.sinH-sinH0, e1.sinH-sinH0
			if !(f0 < 0 && f1 > 0) && !(f0 > 0 && f1 < 0) {
				continue
			}
			md := &mids[i]
			if !md.known {
				md.sd, md.cd = math.Sincos(tr.decAt(0.5 * (e0.t + e1.t)))
				md.known = true
			}
			rising := f1 > 0
			est := tr.estimateFrom(st, sinH0, e0, e1, rising, md.sd, md.cd)
			g, slope := est.g, est.slope
			m := &down
			if rising {
				m = &up
			}
			start := g
			if slope != 0 && tr.carry {
				if c := g + m.next(i); c > e0.t && c < e1.t {
					start = c
				}
			}
			var fs float64
			if slope != 0 {
				// the hour angle at start is near the estimate's
				target, sinTarget := est.H0, est.s0
				if rising {
					target, sinTarget = -target, -sinTarget
				}
				fs = tr.sinAltitudeNear(st, start, target, est.c, sinTarget) - sinH0
			} else {
				fs = tr.sinAltitude(st, start) - sinH0
			}
			t, done := newtonDone(e0.t, f0, e1.t, start, fs, slope)
			if !done {
				t = tr.solve(st, sinH0, e0.t, f0, e1.t, f1, start, fs, slope)
			}
			if slope != 0 {
				m.add(i, t-g)
			} else {
				*m = miss{}
			}
			if t >= a && t < b {
				out = append(out, crossing{t: t, rising: rising})
			}
		}
		outs[h] = out
	}
	return mids
}

// midDec is the sine and cosine of the declination at the middle of an
// interval between two extrema, once known.
type midDec struct {
	sd, cd float64
	known  bool
}

// miss is what a threshold's hour-angle estimates missed its last two
// crossings in one direction by (s), at the intervals numbered i1 and i2.
type miss struct {
	d1, d2 float64
	i1, i2 int // interval + 1; 0: none
}

// next is the expected miss at interval i: the last two extrapolated when
// they belong to the two days before, the last one when only it does, 0
// otherwise.
func (m *miss) next(i int) float64 {
	switch {
	case m.i1 == i-1 && m.i2 == i-3: // a direction's intervals are every other one
		return 2*m.d1 - m.d2
	case m.i1 == i-1:
		return m.d1
	}
	return 0
}

// add records the miss d at interval i.
func (m *miss) add(i int, d float64) {
	m.d2, m.i2 = m.d1, m.i1
	m.d1, m.i1 = d, i+1
}

// guess estimates a crossing time within (e0, e1) by the hour-angle
// formula with the declination at the middle of the interval (see
// estimateFrom).
func (tr *track) guess(st *site, sinH0 float64, e0, e1 extremum, rising bool) float64 {
	sd, cd := math.Sincos(tr.decAt(0.5 * (e0.t + e1.t)))
	return tr.estimateFrom(st, sinH0, &e0, &e1, rising, sd, cd).g
}

// estimate is a crossing's estimated instant g within (e0, e1), with the
// rate of change of the sine of the altitude there (per second; 0 when the
// formula does not apply) and the hour angle of the estimate: cos H0 = c,
// sin H0 = s0 (H = −H0 when rising, +H0 when setting).
type estimate struct {
	g, slope  float64
	H0, c, s0 float64
}

// estimateFrom estimates a crossing time within (e0, e1) by the hour-angle
// formula with the declination at the middle of the interval, whose sine
// and cosine are sd and cd. (A second pass with the declination at the
// estimate saves less than it costs: the solver's first step does it.)
func (tr *track) estimateFrom(st *site, sinH0 float64, e0, e1 *extremum, rising bool, sd, cd float64) estimate {
	mid := 0.5 * (e0.t + e1.t)
	den := st.cosLat * cd
	if den == 0 {
		return estimate{g: mid}
	}
	c := (sinH0 - st.sinLat*sd) / den
	if c < -1 || c > 1 {
		return estimate{g: mid}
	}
	H0 := math.Acos(c)
	var g float64
	if rising { // from the lower to the upper culmination: H = −H0
		g = e1.t - H0/tr.rate
	} else {
		g = e0.t + H0/tr.rate
	}
	if !(g > e0.t && g < e1.t) {
		return estimate{g: mid}
	}
	// d(sin h)/dt = −cos φ cos δ sin H · dH/dt, H = ∓H0, sin H0 =
	// √(1 − c²), written (1 − c)(1 + c) to keep its digits near c = ±1
	s0 := math.Sqrt((1 - c) * (1 + c))
	slope := den * s0 * tr.rate
	if !rising {
		slope = -slope
	}
	return estimate{g: g, slope: slope, H0: H0, c: c, s0: s0}
}

// solve finds the root of sinAltitude − sinH0 in the bracket [a, b] (fa, fb
// of opposite signs) from the estimate g, where it is fg, and the slope
// there (0 if unknown), when newtonDone's first step from g has not ended
// the search: secant steps kept inside the shrinking bracket, bisection
// when they fail. It stops when a step is below 0.05 s: the secant method's
// next error is then below 0.1 ms.
func (tr *track) solve(st *site, sinH0, a, fa, b, fb, g, fg, slope float64) float64 {
	f := func(t float64) float64 { return tr.sinAltitude(st, t) - sinH0 }
	x0, f0 := g, fg
	if (f0 < 0) == (fa < 0) {
		a, fa = x0, f0
	} else {
		b, fb = x0, f0
	}
	var x1 float64
	if slope != 0 {
		x1 = x0 - f0/slope
	}
	if slope == 0 || !(x1 > a && x1 < b) {
		x1 = 0.5 * (a + b)
	}
	if math.Abs(x1-x0) < 0.05 {
		return x1
	}
	f1 := f(x1)
	for i := 0; i < 100; i++ {
		if f1 == 0 {
			return x1
		}
		if (f1 < 0) == (fa < 0) {
			a, fa = x1, f1
		} else {
			b, fb = x1, f1
		}
		var x2 float64
		if f1 != f0 {
			x2 = x1 - f1*(x1-x0)/(f1-f0)
		}
		if f1 == f0 || !(x2 > a && x2 < b) || i > 40 {
			x2 = 0.5 * (a + b)
		} else if math.Abs(x2-x1) < 0.05 {
			return x2
		}
		if b-a < 1e-3 {
			return x2
		}
		x0, f0 = x1, f1
		x1, f1 = x2, f(x2)
	}
	return 0.5 * (a + b)
}

// newtonDone is the search's first step from x0, where the function is f0, in
// the bracket [a, b] (fa at a) with the slope at x0 (0 if unknown): the
// root x0 when f0 is 0, else x1 = x0 − f0/slope, and whether that ends the
// search: x1 within the bracket narrowed by x0, less than 0.05 s from x0.
// Small enough to be put in line where the crossings are solved: most end
// here.
func newtonDone(a, fa, b, x0, f0, slope float64) (float64, bool) {
	if f0 == 0 {
		return x0, true
	}
	if slope == 0 {
		return 0, false
	}
	if (f0 < 0) == (fa < 0) {
		a = x0
	} else {
		b = x0
	}
	x1 := x0 - f0/slope
	return x1, x1 > a && x1 < b && math.Abs(x1-x0) < 0.05
}

// transitList returns the upper meridian transits (hour angle 0) as
// Transit values for the observer's site, with the topocentric geometric
// altitude of the centre at each, within [from, to) after rounding to
// time.Time. Shared by the Sun and the Moon.
func (tr *track) transitList(st *site, from, to time.Time) []Transit {
	return slices.Clip(tr.appendTransits(nil, st, from, to))
}

// appendTransits is transitList appending to out: each passage is found
// from the one before.
func (tr *track) appendTransits(out []Transit, st *site, from, to time.Time) []Transit {
	a, b := unixSeconds(from), unixSeconds(to)
	out = slices.Grow(out, int((b-a)/secondsPerDay)+2)
	t := a
	var last lastPassages // each of the Sun's transits from the two before it
	for {
		tp := tr.nextPassage(st, &last, t, 0, 1e-4) // to 0.1 ms
		if tp >= b {
			break
		}
		if tp >= a {
			if u := timeFromUnix(tp); !u.Before(from) && u.Before(to) {
				// the hour angle is 0 there (to 1e-4 s)
				out = append(out, Transit{Time: u, Altitude: math.Asin(tr.sinAltitudeNear(st, tp, 0, 1, 0)) * rad2deg})
			}
		}
		t = tp + 1
	}
	return out
}

// altitude is the topocentric geometric altitude of the centre, degrees,
// at the instant t.
func (tr *track) altitude(st *site, t time.Time) float64 {
	return math.Asin(tr.sinAltitude(st, unixSeconds(t))) * rad2deg
}
