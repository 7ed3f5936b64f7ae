package astro

import (
	"math"
	"time"
)

// Perihelion and aphelion of the Earth: the extrema of the distance between
// the centres of the Earth and the Sun, from VSOP87D (whose Earth is the
// Earth's centre, not the Earth–Moon barycentre; the Moon moves the instant
// by up to a couple of days). The first estimate is Meeus, Astronomical
// Algorithms 2nd ed., eq. 38.1 (for the barycentre); the extremum is then
// located on the daily values of R within ±6 days and refined by Newton's
// method on the numerical derivative of R to 0.1 s.

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
	for d := -6.0; d <= 6; d++ {
		if r := sign * earthRadius(guess+d); r < bestR {
			best, bestR = guess+d, r
		}
	}
	const h = 0.02 // days
	x := best
	for range 30 {
		rm, r0, rp := earthRadius(x-h), earthRadius(x), earthRadius(x+h)
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
	return timeFromUnix(ttToUnix(x)), earthRadius(x), nil
}
