package astro

import "math"

// Nutation and the obliquity of the ecliptic: the IAU 1980 theory of
// nutation as tabulated in Meeus, Astronomical Algorithms 2nd ed., ch. 22,
// Table 22.A (the 63 terms of the 106-term IAU 1980 series with amplitudes
// of 0.0003″ or more), with the fundamental arguments of eq. 22 and the
// IAU 1980 mean obliquity of eq. 22.2.
//
// Measured against the complete 106-term IAU 1980 series (ERFA nut80) over
// 1800–2200 the largest difference is reported in nutation_test.go
// (TestNutationAgainstComplete); it is a few milliarcseconds, i.e. a few
// hundredths of a second on a season instant.

const (
	deg2rad    = math.Pi / 180
	rad2deg    = 180 / math.Pi
	arcsec2rad = math.Pi / (180 * 3600)
)

// nutationTerm is one row of Meeus Table 22.A: multiples of D, M, M', F, Ω
// and the coefficients of sin (Δψ) and cos (Δε) in units of 0.0001″, with
// their rates per Julian century.
type nutationTerm struct {
	d, m, mp, f, om int8
	s0, s1, c0, c1  float64
}

var nutationTable = [...]nutationTerm{
	{0, 0, 0, 0, 1, -171996, -174.2, 92025, 8.9},
	{-2, 0, 0, 2, 2, -13187, -1.6, 5736, -3.1},
	{0, 0, 0, 2, 2, -2274, -0.2, 977, -0.5},
	{0, 0, 0, 0, 2, 2062, 0.2, -895, 0.5},
	{0, 1, 0, 0, 0, 1426, -3.4, 54, -0.1},
	{0, 0, 1, 0, 0, 712, 0.1, -7, 0},
	{-2, 1, 0, 2, 2, -517, 1.2, 224, -0.6},
	{0, 0, 0, 2, 1, -386, -0.4, 200, 0},
	{0, 0, 1, 2, 2, -301, 0, 129, -0.1},
	{-2, -1, 0, 2, 2, 217, -0.5, -95, 0.3},
	{-2, 0, 1, 0, 0, -158, 0, 0, 0},
	{-2, 0, 0, 2, 1, 129, 0.1, -70, 0},
	{0, 0, -1, 2, 2, 123, 0, -53, 0},
	{2, 0, 0, 0, 0, 63, 0, 0, 0},
	{0, 0, 1, 0, 1, 63, 0.1, -33, 0},
	{2, 0, -1, 2, 2, -59, 0, 26, 0},
	{0, 0, -1, 0, 1, -58, -0.1, 32, 0},
	{0, 0, 1, 2, 1, -51, 0, 27, 0},
	{-2, 0, 2, 0, 0, 48, 0, 0, 0},
	{0, 0, -2, 2, 1, 46, 0, -24, 0},
	{2, 0, 0, 2, 2, -38, 0, 16, 0},
	{0, 0, 2, 2, 2, -31, 0, 13, 0},
	{0, 0, 2, 0, 0, 29, 0, 0, 0},
	{-2, 0, 1, 2, 2, 29, 0, -12, 0},
	{0, 0, 0, 2, 0, 26, 0, 0, 0},
	{-2, 0, 0, 2, 0, -22, 0, 0, 0},
	{0, 0, -1, 2, 1, 21, 0, -10, 0},
	{0, 2, 0, 0, 0, 17, -0.1, 0, 0},
	{2, 0, -1, 0, 1, 16, 0, -8, 0},
	{-2, 2, 0, 2, 2, -16, 0.1, 7, 0},
	{0, 1, 0, 0, 1, -15, 0, 9, 0},
	{-2, 0, 1, 0, 1, -13, 0, 7, 0},
	{0, -1, 0, 0, 1, -12, 0, 6, 0},
	{0, 0, 2, -2, 0, 11, 0, 0, 0},
	{2, 0, -1, 2, 1, -10, 0, 5, 0},
	{2, 0, 1, 2, 2, -8, 0, 3, 0},
	{0, 1, 0, 2, 2, 7, 0, -3, 0},
	{-2, 1, 1, 0, 0, -7, 0, 0, 0},
	{0, -1, 0, 2, 2, -7, 0, 3, 0},
	{2, 0, 0, 2, 1, -7, 0, 3, 0},
	{2, 0, 1, 0, 0, 6, 0, 0, 0},
	{-2, 0, 2, 2, 2, 6, 0, -3, 0},
	{-2, 0, 1, 2, 1, 6, 0, -3, 0},
	{2, 0, -2, 0, 1, -6, 0, 3, 0},
	{2, 0, 0, 0, 1, -6, 0, 3, 0},
	{0, -1, 1, 0, 0, 5, 0, 0, 0},
	{-2, -1, 0, 2, 1, -5, 0, 3, 0},
	{-2, 0, 0, 0, 1, -5, 0, 3, 0},
	{0, 0, 2, 2, 1, -5, 0, 3, 0},
	{-2, 0, 2, 0, 1, 4, 0, 0, 0},
	{-2, 1, 0, 2, 1, 4, 0, 0, 0},
	{0, 0, 1, -2, 0, 4, 0, 0, 0},
	{-1, 0, 1, 0, 0, -4, 0, 0, 0},
	{-2, 1, 0, 0, 0, -4, 0, 0, 0},
	{1, 0, 0, 0, 0, -4, 0, 0, 0},
	{0, 0, 1, 2, 0, 3, 0, 0, 0},
	{0, 0, -2, 2, 2, -3, 0, 0, 0},
	{-1, -1, 1, 0, 0, -3, 0, 0, 0},
	{0, 1, 1, 0, 0, -3, 0, 0, 0},
	{0, -1, 1, 2, 2, -3, 0, 0, 0},
	{2, -1, -1, 2, 2, -3, 0, 0, 0},
	{0, 0, 3, 2, 2, -3, 0, 0, 0},
	{2, -1, 0, 2, 2, -3, 0, 0, 0},
}

// nutationRad returns the nutation in longitude Δψ and in obliquity Δε, in
// radians, for the Julian Ephemeris Day jde.
func nutationRad(jde float64) (dpsi, deps float64) {
	T := (jde - J2000) / julianCentury
	// Each term's argument is a sum of small multiples (−3..3) of the five
	// fundamental arguments, so its sine and cosine are products of the
	// arguments' powers on the unit circle: five sines and cosines per call
	// instead of 63.
	var pw [5][7]complex128 // pw[a][n+3] = e^{i n x_a}
	for a, x := range nutationArgs(T) {
		sx, cx := math.Sincos(reduceDeg(x) * deg2rad)
		z := complex(cx, sx)
		pw[a][3] = 1
		for n := 1; n <= 3; n++ {
			pw[a][3+n] = pw[a][2+n] * z
			pw[a][3-n] = complex(real(pw[a][3+n]), -imag(pw[a][3+n]))
		}
	}
	var s, c float64
	for i := range nutationTable {
		n := &nutationTable[i]
		z := pw[0][n.d+3] * pw[1][n.m+3] * pw[2][n.mp+3] * pw[3][n.f+3] * pw[4][n.om+3]
		s += (n.s0 + n.s1*T) * imag(z)
		c += (n.c0 + n.c1*T) * real(z)
	}
	return s * 1e-4 * arcsec2rad, c * 1e-4 * arcsec2rad
}

// nutationArgs returns the fundamental arguments D, M, M′, F and Ω
// (degrees) at T Julian centuries from J2000 (Meeus eq. after 22.1).
func nutationArgs(T float64) [5]float64 {
	return [5]float64{
		297.85036 + T*(445267.111480+T*(-0.0019142+T/189474)),
		357.52772 + T*(35999.050340+T*(-0.0001603-T/300000)),
		134.96298 + T*(477198.867398+T*(0.0086972+T/56250)),
		93.27191 + T*(483202.017538+T*(-0.0036825+T/327270)),
		125.04452 + T*(-1934.136261+T*(0.0020708+T/450000)),
	}
}

// nutationRates returns the rates of nutationArgs (degrees per Julian
// century) at T: their derivatives, term by term (TestNutationRates).
func nutationRates(T float64) [5]float64 {
	return [5]float64{
		445267.111480 + T*(2*-0.0019142+3*T/189474),
		35999.050340 + T*(2*-0.0001603-3*T/300000),
		477198.867398 + T*(2*0.0086972+3*T/56250),
		483202.017538 + T*(2*-0.0036825+3*T/327270),
		-1934.136261 + T*(2*0.0020708+3*T/450000),
	}
}

// reduceDeg reduces x (degrees) to [0, 360) as x − 360·⌊x/360⌋: within an
// ulp of x (1e-10° at most over 1800–2200), where norm360's exact
// reduction by math.Mod costs a loop.
func reduceDeg(x float64) float64 { return x - 360*math.Floor(x/360) }

// nutationDaily returns nutationRad at each of jdes, instants about a day
// apart in increasing order (the Sun's daily samples at 0h UTC): each
// term's sine and cosine are carried from one sample to the next by a
// rotation through the term's argument's daily change, started afresh (as
// nutationRad computes them) every sunChebDays samples. Over a run the
// arguments' quadratic parts, and the samples' offsets from an exact
// one-day grid in TT (ΔT drifts by under a second in a run), move a term by
// less than 1e-5 rad: Δψ and Δε stay within 2e-6″ of nutationRad's
// (TestSunChebyshev). The results and the working memory are buf's,
// overwritten by the next call.
func nutationDaily(jdes []float64, buf *sampleBuffers) (dpsi, deps []float64) {
	n := len(jdes)
	dpsi, deps = floats(&buf.dpsi, n), floats(&buf.deps, n)
	T := floats(&buf.t, n)
	for k, j := range jdes {
		T[k] = (j - J2000) / julianCentury
	}
	const h = 1 / julianCentury // a day in centuries
	// per run, every term's sine and cosine rotated together from sample
	// to sample: the terms' rotations are independent of one another
	const nt = len(nutationTable)
	var S, C, sr, cr [nt]float64
	for k0 := 0; k0 < n; k0 += sunChebDays {
		// the fundamental arguments (degrees, reduced) and their rates
		// (degrees per century, nutationRates) at the run's start
		T0 := T[k0]
		x := nutationArgs(T0)
		for j := range x {
			x[j] = reduceDeg(x[j])
		}
		rate := nutationRates(T0)
		for i := range nutationTable {
			m := &nutationTable[i]
			mult := [5]float64{float64(m.d), float64(m.m), float64(m.mp), float64(m.f), float64(m.om)}
			var a, r float64 // the argument (reduced, degrees) and its rate (degrees per century)
			for j := range 5 {
				a += mult[j] * x[j]
				r += mult[j] * rate[j]
			}
			r *= deg2rad
			S[i], C[i] = math.Sincos(a * deg2rad)
			sr[i], cr[i] = math.Sincos(r * h)
		}
		for k := k0; k < min(k0+sunChebDays, n); k++ {
			Tk := T[k]
			var ps, pc float64
			for i := range nutationTable {
				m := &nutationTable[i]
				ps += (m.s0 + m.s1*Tk) * S[i]
				pc += (m.c0 + m.c1*Tk) * C[i]
				// rotated on to the next sample here, not at the top of
				// the loop, where the run's first sample would have to
				// be told apart (the last sample's rotation goes unused)
				C[i], S[i] = C[i]*cr[i]-S[i]*sr[i], S[i]*cr[i]+C[i]*sr[i]
			}
			dpsi[k], deps[k] = ps, pc
		}
	}
	for k := range n {
		dpsi[k] *= 1e-4 * arcsec2rad
		deps[k] *= 1e-4 * arcsec2rad
	}
	return dpsi, deps
}

// meanObliquityRad returns the IAU 1980 mean obliquity of the ecliptic
// (Meeus eq. 22.2), radians.
func meanObliquityRad(jde float64) float64 {
	T := (jde - J2000) / julianCentury
	return (84381.448 + T*(-46.8150+T*(-0.00059+T*0.001813))) * arcsec2rad
}

// Nutation returns the nutation in longitude Δψ and in obliquity Δε, in
// degrees, for the Julian Ephemeris Day jde (Terrestrial Time): IAU 1980
// theory, Meeus ch. 22 (Table 22.A). Valid for several millennia around
// J2000; within a few milliarcseconds of the complete series.
func Nutation(jde float64) (longitude, obliquity float64) {
	dpsi, deps := nutationRad(jde)
	return dpsi * rad2deg, deps * rad2deg
}

// MeanObliquity returns the mean obliquity of the ecliptic ε₀ in degrees for
// the Julian Ephemeris Day jde: IAU 1980 (Meeus eq. 22.2), accurate to
// 0.01″ within 1800–2200.
func MeanObliquity(jde float64) float64 { return meanObliquityRad(jde) * rad2deg }

// TrueObliquity returns the true obliquity of the ecliptic ε = ε₀ + Δε in
// degrees for the Julian Ephemeris Day jde.
func TrueObliquity(jde float64) float64 {
	_, deps := nutationRad(jde)
	return (meanObliquityRad(jde) + deps) * rad2deg
}
