package astro

import (
	"errors"
	"math"
	"testing"
)

// TestNonFiniteInput: NaN and infinities given to the functions that take a
// bare number (not an Observer) give a clear error or an empty answer, never
// an instant or a direction that looks like a result.
func TestNonFiniteInput(t *testing.T) {
	for _, v := range []float64{math.NaN(), math.Inf(1), math.Inf(-1)} {
		if tm, err := SolarLongitudeTime(2027, v); !errors.Is(err, ErrInvalidInput) || !tm.IsZero() {
			t.Errorf("SolarLongitudeTime(2027, %v) = %v, %v; want the zero time and an *InputError", v, tm, err)
		}
		if tm, err := TimeFromJulianEphemerisDay(v); !errors.Is(err, ErrInvalidInput) || !tm.IsZero() {
			t.Errorf("TimeFromJulianEphemerisDay(%v) = %v, %v; want the zero time and an *InputError", v, tm, err)
		}
		if tm := TimeFromJulianDay(v); !tm.IsZero() {
			t.Errorf("TimeFromJulianDay(%v) = %v, want the zero time", v, tm)
		}
		if got := CompassPoint(v); got != "" {
			t.Errorf("CompassPoint(%v) = %q, want \"\"", v, got)
		}
	}
	if got, want := errString(SolarLongitudeTime(2027, math.NaN())), "astro: solar longitude NaN: must be a finite number of degrees"; got != want {
		t.Errorf("SolarLongitudeTime(2027, NaN): %q, want %q", got, want)
	}
	// A Julian Ephemeris Day far outside the range is a *RangeError naming
	// the value given, not an instant wrapped round by the conversion.
	for _, jde := range []float64{1e20, -1e20, 2300000} {
		_, err := TimeFromJulianEphemerisDay(jde)
		var re *RangeError
		if !errors.As(err, &re) || re.What != "Julian Ephemeris Day" {
			t.Errorf("TimeFromJulianEphemerisDay(%g): %v, want a *RangeError naming the Julian Ephemeris Day", jde, err)
		}
	}
	if got, want := errString(TimeFromJulianEphemerisDay(2300000)), "astro: Julian Ephemeris Day 2300000 outside the supported range 1800-01-01..2200-12-31"; got != want {
		t.Errorf("TimeFromJulianEphemerisDay(2300000): %q, want %q", got, want)
	}
	// Meeus, Astronomical Algorithms 2nd ed., ch. 7, p. 61: JD 0 is
	// −4712 January 1 at 12h (Julian calendar), −4713 November 24 in the
	// proleptic Gregorian calendar that time.Time counts: far outside the
	// supported range, and still converted.
	if got := TimeFromJulianDay(0).Format("2006-01-02 15:04"); got != "-4713-11-24 12:00" {
		t.Errorf("TimeFromJulianDay(0) = %s, want -4713-11-24 12:00", got)
	}
	// Any finite azimuth is reduced to the circle by whole turns of 360°:
	// 450 − 360 = 90 (east), −90 + 360 = 270 (west), 720 − 2·360 = 0
	// (north), −3510 + 10·360 = 90 (east).
	for az, want := range map[float64]string{450: "east", -90: "west", 720: "north", -3510: "east"} {
		if got := CompassPoint(az); got != want {
			t.Errorf("CompassPoint(%g) = %q, want %q", az, got, want)
		}
	}
}

func errString[T any](_ T, err error) string {
	if err == nil {
		return "<nil>"
	}
	return err.Error()
}
