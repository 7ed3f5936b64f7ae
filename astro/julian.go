package astro

import (
	"math"
	"time"
)

// Julian day numbers (Meeus, Astronomical Algorithms 2nd ed., ch. 7).
//
// A Julian day (JD) counts days and fractions from noon, 1 January 4713 BC
// (Julian calendar). JD 2440587.5 is 1970-01-01T00:00:00 UTC, which lets the
// conversion go through Unix time instead of calendar arithmetic; the result
// equals Meeus's formula 7.1 for every Gregorian date.

const (
	jdUnixEpoch = 2440587.5 // JD of 1970-01-01T00:00:00 UTC
	// J2000 is the Julian day of the standard epoch J2000.0,
	// 2000-01-01 12:00 TT (Meeus p. 62).
	J2000 = 2451545.0
	// julianCentury is the number of days in a Julian century.
	julianCentury = 36525.0
	// julianMillennium is the number of days in a Julian millennium.
	julianMillennium = 365250.0
	secondsPerDay    = 86400.0
)

// JulianDay returns the Julian day of the instant t, read on the scale of t
// itself: for a time.Time (which counts UTC) that is the Julian day of
// Universal Time. The result is exact to the float64 resolution, about 40 µs
// near the present epoch.
func JulianDay(t time.Time) float64 {
	s := t.Unix()
	days := s / 86400
	rem := s % 86400
	if rem < 0 {
		rem += 86400
		days--
	}
	return jdUnixEpoch + float64(days) + (float64(rem)+float64(t.Nanosecond())*1e-9)/secondsPerDay
}

// TimeFromJulianDay returns the UTC instant of the Julian day jd (the inverse
// of JulianDay), rounded to the nearest microsecond, which is below the
// float64 resolution of jd. It takes any Julian day a time.Time can hold (not
// only the supported range); for NaN, an infinity or a Julian day beyond
// time.Time's range it returns the zero Time (IsZero reports it).
func TimeFromJulianDay(jd float64) time.Time {
	d := jd - jdUnixEpoch
	if !(math.Abs(d) < maxTimeDays) {
		return time.Time{}
	}
	whole := math.Floor(d)
	frac := d - whole
	us := math.Round(frac * secondsPerDay * 1e6)
	return time.Unix(int64(whole)*86400, 0).Add(time.Duration(us) * time.Microsecond).UTC()
}

// maxTimeDays bounds the days from the Unix epoch TimeFromJulianDay converts:
// their seconds must fit an int64, as time.Unix takes them (2⁶³ s is about
// 1.07e14 days).
const maxTimeDays = 1e14

// unixToJD converts Unix seconds (float) to a Julian day.
func unixToJD(sec float64) float64 { return jdUnixEpoch + sec/secondsPerDay }

// jdToUnix converts a Julian day to Unix seconds (float).
func jdToUnix(jd float64) float64 { return (jd - jdUnixEpoch) * secondsPerDay }

// unixSeconds returns t as float Unix seconds (resolution ~0.2 µs today).
func unixSeconds(t time.Time) float64 {
	return float64(t.Unix()) + float64(t.Nanosecond())*1e-9
}

// timeFromUnix converts float Unix seconds to a UTC time rounded to the microsecond.
func timeFromUnix(sec float64) time.Time {
	whole, us := unixMicros(sec)
	return time.Unix(whole, us*1000).UTC() // 1e6 µs is the next second
}

// unixMicros rounds float Unix seconds to whole microseconds: the whole
// seconds (rounded down) and the fraction's microseconds, rounded, so that
// the rounding does not depend on the size of sec (us may be 1e6: the next
// second). The whole seconds are taken by a conversion to an integer,
// corrected for negative sec, which is math.Floor's value for any |sec| <
// 2⁶³; the microseconds v ∈ [0, 1e6] are math.Round(v), taken as
// ⌊v + 0.5⌋: for 0.5 ≤ v ≤ 1e6 the sum's rounding cannot reach the next
// whole number (its distance from it is a multiple of v's last place), and
// v below 0.5 gives 0.
func unixMicros(sec float64) (whole, us int64) {
	whole = int64(sec)
	if float64(whole) > sec {
		whole--
	}
	if v := (sec - float64(whole)) * 1e6; v >= 0.5 {
		us = int64(v + 0.5)
	}
	return whole, us
}
