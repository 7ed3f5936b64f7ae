package astro

import (
	"math"
	"time"
)

// Sidereal time: Meeus, Astronomical Algorithms 2nd ed., ch. 12.

// MeanSiderealTime returns the Greenwich mean sidereal time in degrees
// [0, 360) for the Julian day of Universal Time UT1 jdUT1 (Meeus eq. 12.4,
// the IAU 1982 expression).
func MeanSiderealTime(jdUT1 float64) float64 {
	return norm360(meanSiderealRaw(jdUT1))
}

func meanSiderealRaw(jdUT1 float64) float64 {
	d := jdUT1 - J2000
	T := d / julianCentury
	return 280.46061837 + 360.98564736629*d + T*T*(0.000387933-T/38710000)
}

// ApparentSiderealTime returns the Greenwich apparent sidereal time in
// degrees [0, 360): the mean sidereal time at jdUT1 plus the equation of the
// equinoxes Δψ·cos ε evaluated at jde (Meeus ch. 12, p. 88).
func ApparentSiderealTime(jdUT1, jde float64) float64 {
	dpsi, deps := nutationRad(jde)
	eps := meanObliquityRad(jde) + deps
	return norm360(meanSiderealRaw(jdUT1) + equationOfEquinoxes(dpsi, eps)*rad2deg)
}

// equationOfEquinoxes is the equation of the equinoxes Δψ·cos ε in radians,
// apparent minus mean sidereal time: the nutation in longitude dpsi (rad)
// seen along the true equator, eps being the true obliquity (rad) (Meeus
// ch. 12, p. 88).
func equationOfEquinoxes(dpsi, eps float64) float64 {
	return dpsi * math.Cos(eps)
}

// GreenwichMeanSiderealTime returns the Greenwich mean sidereal time in
// degrees at the UTC instant t (converted to UT1 with UT1MinusUTC).
// It returns a *RangeError outside MinTime..MaxTime.
func GreenwichMeanSiderealTime(t time.Time) (float64, error) {
	e, err := NewEpoch(t)
	if err != nil {
		return 0, err
	}
	return MeanSiderealTime(e.JDUT1), nil
}

// GreenwichApparentSiderealTime returns the Greenwich apparent sidereal time
// in degrees at the UTC instant t. It returns a *RangeError outside
// MinTime..MaxTime.
func GreenwichApparentSiderealTime(t time.Time) (float64, error) {
	e, err := NewEpoch(t)
	if err != nil {
		return 0, err
	}
	return ApparentSiderealTime(e.JDUT1, e.JDE), nil
}

// norm360 reduces an angle in degrees to [0, 360).
func norm360(a float64) float64 {
	a = math.Mod(a, 360)
	if a < 0 {
		a += 360
	}
	return a
}

// norm2Pi reduces an angle in radians to [0, 2π).
func norm2Pi(a float64) float64 {
	a = math.Mod(a, 2*math.Pi)
	if a < 0 {
		a += 2 * math.Pi
	}
	return a
}
