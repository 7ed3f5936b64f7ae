package astro

import (
	"math"
	"time"
)

// Equinoxes, solstices and other instants of a given apparent solar
// longitude. The starting values are the mean instants of Meeus,
// Astronomical Algorithms 2nd ed., ch. 27 (Table 27.B, years 1000–3000);
// the instant is then solved on the apparent longitude of sun.go (VSOP87D,
// FK5, nutation, aberration) by the secant method to 1 ms, as Meeus does in
// Example 27.b ("iterate on the true position"). The result is converted
// from TT to UTC with the ΔT model of deltat.go.

// seasonMeanJDE returns Meeus's mean JDE (Table 27.B) of the March equinox
// (k = 0), June solstice (1), September equinox (2) or December solstice (3)
// of year (valid 1000–3000, within about a minute of the true instant).
func seasonMeanJDE(year, k int) float64 {
	Y := (float64(year) - 2000) / 1000
	c := [4][5]float64{
		{2451623.80984, 365242.37404, 0.05169, -0.00411, -0.00057},
		{2451716.56767, 365241.62603, 0.00325, 0.00888, -0.00030},
		{2451810.21715, 365242.01767, -0.11575, 0.00337, 0.00078},
		{2451900.05952, 365242.74049, -0.06223, -0.00823, 0.00032},
	}[k]
	return c[0] + Y*(c[1]+Y*(c[2]+Y*(c[3]+Y*c[4])))
}

// Seasons returns the instants (UTC) of the March equinox, June solstice,
// September equinox and December solstice of year: the Sun's apparent
// geocentric longitude is 0°, 90°, 180° and 270°. Measured against the
// almanac-office values for 1905–2100 in testdata/reference/seasons.csv
// (rounded to the minute) and against ERFA's for 1900–2100, in TT: within
// 2 s. It returns a *RangeError for years outside 1799..2201.
func Seasons(year int) ([4]time.Time, error) {
	var out [4]time.Time
	if err := checkYear(year); err != nil {
		return out, err
	}
	for k := range out {
		jde := solveSolarLongitude(seasonMeanJDE(year, k), float64(k)*math.Pi/2)
		out[k] = timeFromUnix(ttToUnix(jde))
	}
	return out, nil
}

// CrossQuarterLongitudes returns the Sun's apparent longitudes (degrees) at
// the cross-quarter instants CrossQuarters returns, in its order: 315°
// (early February, between the December solstice and the March equinox),
// 45° (early May), 135° (early August), 225° (early November). The array is
// a copy: CrossQuarters keeps its own.
func CrossQuarterLongitudes() [4]float64 { return crossQuarterLongitudes }

// crossQuarterLongitudes are the longitudes CrossQuarters solves for.
var crossQuarterLongitudes = [4]float64{315, 45, 135, 225}

// CrossQuarters returns the instants (UTC) in year when the Sun's apparent
// longitude is CrossQuarterLongitudes[i]: 315° (early February), 45° (early
// May), 135° (early August) and 225° (early November), in that calendar
// order: the cross-quarter days of farm calendars, midway between the
// equinoxes and solstices. It returns a *RangeError for years outside
// 1799..2201.
func CrossQuarters(year int) ([4]time.Time, error) {
	var out [4]time.Time
	for i, lon := range crossQuarterLongitudes {
		t, err := SolarLongitudeTime(year, lon)
		if err != nil {
			return out, err
		}
		out[i] = t
	}
	return out, nil
}

// SolarLongitudeTime returns the instant (UTC) in year when the Sun's
// apparent geocentric longitude equals longitude (degrees, any value; it is
// reduced to [0, 360)). The Sun passes longitude 280° about 1 January, so a
// longitude within about a degree of it may be reached twice or not at all in
// a calendar year; the instant returned is then the one nearest to where
// that longitude falls in an average year, which can lie in the neighbouring
// year. It returns a *RangeError for years outside 1799..2201 and an
// *InputError for a longitude that is NaN or infinite.
func SolarLongitudeTime(year int, longitude float64) (time.Time, error) {
	if err := checkYear(year); err != nil {
		return time.Time{}, err
	}
	if math.IsNaN(longitude) || math.IsInf(longitude, 0) {
		return time.Time{}, &InputError{"solar longitude", longitude, "must be a finite number of degrees"}
	}
	lon := norm360(longitude)
	// Start from the March equinox of the year (or of the next one for the
	// longitudes the Sun reaches before it, from 1 January on).
	days := (lon) / 360 * 365.2422
	base := seasonMeanJDE(year, 0)
	if lon >= 280 {
		days -= 365.2422
	}
	return timeFromUnix(ttToUnix(solveSolarLongitude(base+days, lon*deg2rad))), nil
}

// solveSolarLongitude returns the JDE near guess at which the apparent
// longitude of the Sun equals target (radians).
func solveSolarLongitude(guess, target float64) float64 {
	const rate = 2 * math.Pi / 365.2422 // rad per day, mean
	diff := func(jde float64) float64 {
		return math.Remainder(target-sunApparentLongitude(jde), 2*math.Pi)
	}
	x0 := guess
	f0 := diff(x0)
	x1 := x0 + f0/rate
	for range 20 {
		f1 := diff(x1)
		if f1 == 0 || f1 == f0 {
			return x1
		}
		x2 := x1 + f1*(x1-x0)/(f0-f1)
		if math.Abs(x2-x1) > 5 { // keep the step sane if the secant misbehaves
			x2 = x1 + f1/rate
		}
		x0, f0, x1 = x1, f1, x2
		if math.Abs(x1-x0) < 1e-8 {
			break
		}
	}
	return x1
}
