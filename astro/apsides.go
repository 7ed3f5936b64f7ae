package astro

import (
	"math"
	"time"
)

// Perihelion and aphelion of the Earth: the extrema of the distance between
// the centres of the Earth and the Sun (not the Earth–Moon barycentre; the
// Moon moves the instant by up to a couple of days).
//
// Near an apsis the Earth's radial velocity changes by only a·e·n² ≈ 740
// km/day per day, so an error of 0.26 km/day in that velocity moves the
// instant by 30 s. Most of that velocity's short-period part is the Earth's monthly
// swing about the Earth–Moon barycentre (≈ 4,700 km, ≈ 1,000 km/day), which
// VSOP87D carries as a few dozen lunar terms of its own. Here the Earth is
// instead the barycentre — VSOP87D without those terms (earthLunarL, B, R,
// picked out by gen_vsop87.go) — minus μ times the geocentric Moon of
// ELP/MPP02 (elpMoon), as vectors in the mean ecliptic of date, with
// μ = 1/(1 + 81.30056), the Earth/Moon mass ratio of JPL DE405 (Standish
// 1998, JPL IOM 312.F-98-048), to which ELP/MPP02 is fitted.
// TestApsidesAgainstDE405 measures the result against DE405 itself.
//
// The first estimate is Meeus, Astronomical Algorithms 2nd ed., eq. 38.1
// (for the barycentre); the extremum is then located on the daily values of
// VSOP87D's R within ±6 days and refined on the distance above by Newton's
// method on the numerical derivative to 0.1 s.

// Perihelion returns the instant (UTC) of the Earth's perihelion in year
// (early January) and the distance then, in au. It returns a *RangeError for
// years outside 1799..2201.
func Perihelion(year int) (time.Time, float64, error) { return apsis(year, false) }

// Aphelion returns the instant (UTC) of the Earth's aphelion in year (early
// July) and the distance then, in au. It returns a *RangeError for years
// outside 1799..2201.
func Aphelion(year int) (time.Time, float64, error) { return apsis(year, true) }

func apsis(year int, aphelion bool) (time.Time, float64, error) {
	if err := checkYear(year); err != nil {
		return time.Time{}, 0, err
	}
	k := math.Round((float64(year) - 2000.01) * 0.99997)
	if aphelion {
		k += 0.5
	}
	guess := 2451547.507 + 365.2596358*k + 0.0000000156*k*k // Meeus eq. 38.1
	sign := 1.0                                             // minimise sign·R
	if aphelion {
		sign = -1
	}
	best, bestR := guess, math.Inf(1)
	for d := -6.0; d <= 6; d++ { // VSOP87D's own R is close enough to pick the day
		if r := sign * evalVSOP(earthR[:], (guess+d-J2000)/julianMillennium); r < bestR {
			best, bestR = guess+d, r
		}
	}
	const h = 0.02 // days
	x := best
	for range 30 {
		rm, r0, rp := earthSunDistance(x-h), earthSunDistance(x), earthSunDistance(x+h)
		d1 := (rp - rm) / (2 * h)
		d2 := (rp - 2*r0 + rm) / (h * h)
		if d2 == 0 {
			break
		}
		step := -d1 / d2
		if step > 1 {
			step = 1
		} else if step < -1 {
			step = -1
		}
		x += step
		if math.Abs(step) < 1e-6 {
			break
		}
	}
	return timeFromUnix(ttToUnix(x)), earthSunDistance(x), nil
}

// earthMoonRatio is the Earth/Moon mass ratio of JPL DE405 (EMRAT).
const earthMoonRatio = 81.30056

// earthSunDistance returns the distance (au) between the centres of the
// Earth and the Sun at jde (TT): the Earth–Moon barycentre from VSOP87D
// without its lunar terms, less μ·(geocentric Moon from ELP/MPP02).
func earthSunDistance(jde float64) float64 {
	tau := (jde - J2000) / julianMillennium
	l := evalVSOP(earthL[:], tau) - evalVSOP(earthLunarL[:], tau)
	b := evalVSOP(earthB[:], tau) - evalVSOP(earthLunarB[:], tau)
	r := evalVSOP(earthR[:], tau) - evalVSOP(earthLunarR[:], tau)
	lon, lat, dist := elpMoon(jde)
	m := dist / auKm / (1 + earthMoonRatio)
	sl, cl := math.Sincos(l)
	sb, cb := math.Sincos(b)
	sλ, cλ := math.Sincos(lon)
	sβ, cβ := math.Sincos(lat)
	x := r*cb*cl - m*cβ*cλ
	y := r*cb*sl - m*cβ*sλ
	z := r*sb - m*sβ
	return math.Sqrt(x*x + y*y + z*z)
}
