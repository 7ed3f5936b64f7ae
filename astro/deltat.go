package astro

//go:generate go run gen_deltat.go

import (
	"math"
	"sort"
	"strconv"
	"time"
)

// Time scales.
//
// A time.Time counts UTC. The theories of this package run on Terrestrial
// Time (TT, the successor of Dynamical Time TD; TT and TDB differ by less
// than 2 ms, which is ignored) and the Earth's rotation is measured by
// Universal Time UT1. The conversions are:
//
//   - TT − UTC = 32.184 s + (TAI − UTC), the leap-second count, exactly, for
//     1972-01-01 until the end of the observed ΔT table (2023-05);
//   - UT1 − UTC = (TT − UTC) − ΔT in that span (always within ±0.9 s); before
//     1972 and after the table UT1 = UTC is assumed (the value 7 ms at the
//     table's end fades out over one year);
//   - ΔT = TT − UT1: observed monthly values (zz_deltat.go, from USNO/IERS
//     Earth orientation data) interpolated linearly within 1973-02..2023-05;
//     the Espenak–Meeus polynomials (NASA eclipse web site, 2006; Meeus ch. 10
//     for the method) before, with their 0.08 s offset from the first observed
//     value faded in smoothly over 1968–1973; after the table, the
//     prediction of the long-term trend of Stephenson, Morrison & Hohenkerk
//     (2016, Proc. R. Soc. A 472: 20160404): ΔT grows as 32.5 s·u² (u in
//     centuries), the Earth's day lengthening by 1.78 ms per century, from
//     the last observed value (69.18 s in 2023-05) with the observed rate
//     then, which is zero to a tenth of a second per year (the Earth has not
//     slowed since 2016):
//     ΔT = 69.18 s + 32.5 s·((year − 2023.33)/100)²
//     (69.6 s in 2035, 88.5 s in 2100, 171 s in 2200). A prediction:
//     FutureUncertainty gives its uncertainty, 9 s per decade after the
//     table. (The Espenak–Meeus expressions used before would give 75.7 s in
//     2027 and 203 s in 2100.)
//
// The supported span is MinTime..MaxTime (1800-01-01 to 2200-12-31
// inclusive). The computations also run within RangeMargin beyond it (and
// the yearly ones for 1799 and 2201), so that the local dates at either end,
// in any zone and with the searches' own margins, can be computed.
// Exported functions return a *RangeError outside the span and its margin.

// MinTime returns the first instant this package supports, 1800-01-01
// 00:00 UTC. MinTime and MaxTime bound the supported span: where a
// function's documentation says it returns a *RangeError outside
// MinTime..MaxTime, it still computes within RangeMargin beyond either end
// (so that the first and last local dates can be computed in any zone) and
// refuses what lies further. They are functions, as a time.Time cannot be a
// constant: the range checks read the package's own values, which no
// program can change.
func MinTime() time.Time { return minTime }

// MaxTime returns the first instant past the supported range, 2201-01-01
// 00:00 UTC: the last supported date is 2200-12-31. See MinTime.
func MaxTime() time.Time { return maxTime }

var (
	minTime = time.Date(1800, 1, 1, 0, 0, 0, 0, time.UTC)
	maxTime = time.Date(2201, 1, 1, 0, 0, 0, 0, time.UTC)
)

// RangeMargin is how far beyond MinTime and MaxTime the package still
// computes: a month, for the margins of ephemerides, searches and time
// zones around the first and the last supported dates.
const RangeMargin = 31 * 24 * time.Hour

var (
	minUnix = float64(minTime.Unix())
	maxUnix = float64(maxTime.Unix())
)

// checkTime returns a *RangeError when t is outside MinTime..MaxTime
// widened by RangeMargin.
func checkTime(what string, t time.Time) error {
	if t.Before(minTime.Add(-RangeMargin)) || !t.Before(maxTime.Add(RangeMargin)) {
		return outOfRange(what, t.UTC().Format(time.RFC3339))
	}
	return nil
}

// outOfRange is the *RangeError of the input what, written value, outside
// the supported dates.
func outOfRange(what, value string) *RangeError {
	return &RangeError{What: what, Value: value, Min: "1800-01-01", Max: "2200-12-31"}
}

// checkYear returns a *RangeError when year is outside 1799..2201: the
// supported years and one on each side, whose events (the season before the
// first supported date, the one after the last) a window at either end needs.
func checkYear(year int) error {
	if year < 1799 || year > 2201 {
		return &RangeError{What: "year", Value: itoa(year), Min: "1799", Max: "2201"}
	}
	return nil
}

func itoa(n int) string {
	if n < 0 {
		return "-" + itoa(-n)
	}
	if n < 10 {
		return string(rune('0' + n))
	}
	return itoa(n/10) + string(rune('0'+n%10))
}

// gregorianMonthDays returns the number of days of month m (1..12) of year
// y in the Gregorian calendar.
func gregorianMonthDays(y, m int) int {
	switch m {
	case 2:
		if y%4 == 0 && (y%100 != 0 || y%400 == 0) {
			return 29
		}
		return 28
	case 4, 6, 9, 11:
		return 30
	}
	return 31
}

// Leap seconds: TAI − UTC steps since 1972 (IERS Bulletin C), as the Unix
// second at which each new value starts.
var leapSeconds = func() []float64 {
	dates := [][2]int{
		{1972, 7}, {1973, 1}, {1974, 1}, {1975, 1}, {1976, 1}, {1977, 1}, {1978, 1},
		{1979, 1}, {1980, 1}, {1981, 7}, {1982, 7}, {1983, 7}, {1985, 7}, {1988, 1},
		{1990, 1}, {1991, 1}, {1992, 7}, {1993, 7}, {1994, 7}, {1996, 1}, {1997, 7},
		{1999, 1}, {2006, 1}, {2009, 1}, {2012, 7}, {2015, 7}, {2017, 1},
	}
	out := make([]float64, len(dates))
	for i, d := range dates {
		out[i] = float64(time.Date(d[0], time.Month(d[1]), 1, 0, 0, 0, 0, time.UTC).Unix())
	}
	return out
}()

var (
	utcLeapStart = float64(time.Date(1972, 1, 1, 0, 0, 0, 0, time.UTC).Unix())
	// month starts of the observed ΔT table, Unix seconds: the first from
	// time.Date, each next one a month's days later (a time.Date for each
	// of the 600-odd months was half of the package's start-up).
	deltaTMonthStart = func() []float64 {
		out := make([]float64, len(deltaTMonthly))
		s := time.Date(deltaTFirstYear, deltaTFirstMonth, 1, 0, 0, 0, 0, time.UTC).Unix()
		y, m := deltaTFirstYear, deltaTFirstMonth
		for i := range out {
			out[i] = float64(s)
			s += int64(gregorianMonthDays(y, m)) * 86400
			if m++; m > 12 {
				y, m = y+1, 1
			}
		}
		return out
	}()
	deltaTTableStart = deltaTMonthStart[0]
	deltaTTableEnd   = deltaTMonthStart[len(deltaTMonthStart)-1]
	deltaTLast       = deltaTMonthly[len(deltaTMonthly)-1]
	yearTableStart   = decimalYear(deltaTTableStart)
	yearTableEnd     = decimalYear(deltaTTableEnd)
	// offset between the first observed value and the polynomial there.
	deltaTJoinGap = deltaTMonthly[0] - espenakMeeus(yearTableStart)
	// UT1 − UTC at the end of the table, faded out after it.
	dut1TableEnd = 32.184 + taiMinusUTC(deltaTTableEnd) - deltaTLast
)

const (
	deltaTBlendFrom = 1968.0 // the polynomial is shifted onto the table from here
	// deltaTFutureQuadratic is the long-term growth of ΔT in seconds per
	// century squared (Stephenson, Morrison & Hohenkerk 2016: the parabola
	// ΔT = −320 s + 32.5 s·((year − 1825)/100)²).
	deltaTFutureQuadratic = 32.5
	// deltaTFutureDrift is the uncertainty of the prediction in seconds per
	// year after the table: since 1900 the 20-year mean rate of ΔT has
	// ranged from 0.17 s/yr (1920–1941) to 1.2 s/yr (1900–1920) while it is
	// about 0 now; a forecast that misses the rate by that much drifts by
	// 9 s per decade (about a minute by 2090).
	deltaTFutureDrift = 0.9
)

// decimalYear converts Unix seconds to a decimal year (2000.0 = 2000-01-01 0h).
func decimalYear(sec float64) float64 {
	return 2000 + (sec-946684800)/(365.2425*secondsPerDay)
}

// taiMinusUTC returns TAI − UTC in seconds for Unix second sec (1972 on).
// From the last leap second on (the usual case: every instant since 2017)
// the count is all of them, without the search.
func taiMinusUTC(sec float64) float64 {
	if n := len(leapSeconds); n > 0 && sec >= leapSeconds[n-1] {
		return 10 + float64(n)
	}
	return 10 + float64(sort.SearchFloat64s(leapSeconds, math.Nextafter(sec, math.Inf(1))))
}

// deltaTSeconds returns ΔT = TT − UT1 in seconds for the UTC instant sec
// (Unix seconds). It is defined for any instant; callers check the range.
func deltaTSeconds(sec float64) float64 {
	switch {
	case sec < deltaTTableStart:
		y := decimalYear(sec)
		v := espenakMeeus(y)
		if y > deltaTBlendFrom {
			x := (y - deltaTBlendFrom) / (yearTableStart - deltaTBlendFrom)
			v += deltaTJoinGap * x * x * (3 - 2*x)
		}
		return v
	case sec >= deltaTTableEnd:
		u := (decimalYear(sec) - yearTableEnd) / 100
		return deltaTLast + deltaTFutureQuadratic*u*u
	}
	i := sort.SearchFloat64s(deltaTMonthStart, sec)
	if i > 0 && (i == len(deltaTMonthStart) || deltaTMonthStart[i] > sec) {
		i--
	}
	if i >= len(deltaTMonthStart)-1 {
		return deltaTLast
	}
	a, b := deltaTMonthStart[i], deltaTMonthStart[i+1]
	f := (sec - a) / (b - a)
	return deltaTMonthly[i] + f*(deltaTMonthly[i+1]-deltaTMonthly[i])
}

// FutureUncertainty returns the uncertainty of ΔT, and so of every instant
// computed for t, from the prediction of future ΔT: zero while ΔT is
// observed (to 2023-05), then 0.9 s for each year after (9 s per decade:
// ±52 s in 2080, ±60 s in 2090, ±160 s in 2200). Outside MinTime..MaxTime
// it returns zero.
func FutureUncertainty(t time.Time) time.Duration {
	sec := unixSeconds(t)
	if sec <= deltaTTableEnd || checkTime("time", t) != nil {
		return 0
	}
	return secondsToDuration(deltaTFutureDrift * (decimalYear(sec) - yearTableEnd))
}

// dut1Seconds returns UT1 − UTC in seconds for the UTC instant sec.
func dut1Seconds(sec float64, deltaT float64) float64 {
	switch {
	case sec < utcLeapStart:
		return 0
	case sec < deltaTTableEnd:
		return 32.184 + taiMinusUTC(sec) - deltaT
	}
	f := 1 - (sec-deltaTTableEnd)/(365.25*secondsPerDay)
	if f <= 0 {
		return 0
	}
	return dut1TableEnd * f
}

// espenakMeeus evaluates the Espenak–Meeus ΔT polynomials (NASA eclipse web
// site, "Polynomial expressions for Delta T", 2006) for decimal year y, in
// seconds, up to the observed table (1973). Below 1800 the 1800–1860
// expression is extended (used only for the few days of margin an ephemeris
// may need).
func espenakMeeus(y float64) float64 {
	switch {
	case y < 1860:
		t := y - 1800
		return 13.72 + t*(-0.332447+t*(0.0068612+t*(0.0041116+t*(-0.00037436+t*(0.0000121272+t*(-0.0000001699+t*0.000000000875))))))
	case y < 1900:
		t := y - 1860
		return 7.62 + t*(0.5737+t*(-0.251754+t*(0.01680668+t*(-0.0004473624+t/233174))))
	case y < 1920:
		t := y - 1900
		return -2.79 + t*(1.494119+t*(-0.0598939+t*(0.0061966-t*0.000197)))
	case y < 1941:
		t := y - 1920
		return 21.20 + t*(0.84493+t*(-0.076100+t*0.0020936))
	case y < 1961:
		t := y - 1950
		return 29.07 + t*(0.407+t*(-1.0/233+t/2547))
	}
	t := y - 1975 // the 1961–1986 expression: only used up to 1973
	return 45.45 + t*(1.067+t*(-1.0/260-t/718))
}

// Epoch is one instant on the time scales the theories use.
type Epoch struct {
	JD    float64 // Julian day of the UTC instant (as given by JulianDay)
	JDUT1 float64 // Julian day of Universal Time UT1 (Earth rotation)
	JDE   float64 // Julian Ephemeris Day: Terrestrial Time (TT)
}

// NewEpoch returns the epoch of the UTC instant t, or a *RangeError outside
// MinTime..MaxTime.
func NewEpoch(t time.Time) (Epoch, error) {
	if err := checkTime("time", t); err != nil {
		return Epoch{}, err
	}
	return epochOf(unixSeconds(t)), nil
}

// epochOf returns the epoch of Unix second sec without a range check.
func epochOf(sec float64) Epoch {
	dt := deltaTSeconds(sec)
	du := dut1Seconds(sec, dt)
	jd := unixToJD(sec)
	return Epoch{JD: jd, JDUT1: jd + du/secondsPerDay, JDE: jd + (du+dt)/secondsPerDay}
}

// DeltaT returns ΔT = TT − UT1 at the UTC instant t, from the model the
// package documentation describes (Conventions: observed values
// 1973-02..2023-05, polynomials before, a prediction after, whose uncertainty
// FutureUncertainty gives). It returns a *RangeError outside MinTime..MaxTime.
func DeltaT(t time.Time) (time.Duration, error) {
	if err := checkTime("time", t); err != nil {
		return 0, err
	}
	return secondsToDuration(deltaTSeconds(unixSeconds(t))), nil
}

// UT1MinusUTC returns UT1 − UTC at the UTC instant t: derived from the
// observed ΔT and the leap-second table for 1972-01-01..2023-05, zero
// before and (after a one-year fade) after. It returns a *RangeError outside
// MinTime..MaxTime.
func UT1MinusUTC(t time.Time) (time.Duration, error) {
	if err := checkTime("time", t); err != nil {
		return 0, err
	}
	sec := unixSeconds(t)
	return secondsToDuration(dut1Seconds(sec, deltaTSeconds(sec))), nil
}

// JulianEphemerisDay returns the Julian Ephemeris Day (Terrestrial Time) of
// the UTC instant t. It returns a *RangeError outside MinTime..MaxTime.
func JulianEphemerisDay(t time.Time) (float64, error) {
	e, err := NewEpoch(t)
	return e.JDE, err
}

// TimeFromJulianEphemerisDay returns the UTC instant of the Julian Ephemeris
// Day jde (Terrestrial Time), the inverse of JulianEphemerisDay, to the
// microsecond. It returns a *RangeError when the instant falls outside
// MinTime..MaxTime (widened by RangeMargin) and an *InputError when jde is
// NaN or infinite.
func TimeFromJulianEphemerisDay(jde float64) (time.Time, error) {
	if math.IsNaN(jde) || math.IsInf(jde, 0) {
		return time.Time{}, &InputError{"Julian Ephemeris Day", jde, "must be a finite number"}
	}
	// ΔT is far below a day, so a jde a day beyond the range's Julian days
	// is out of range whatever it is; checking it here keeps a huge value
	// from wrapping round in the conversion to a time.Time.
	if jde < JulianDay(minTime.Add(-RangeMargin))-1 || jde > JulianDay(maxTime.Add(RangeMargin))+1 {
		return time.Time{}, outOfRange("Julian Ephemeris Day", strconv.FormatFloat(jde, 'f', -1, 64))
	}
	sec := ttToUnix(jde)
	t := timeFromUnix(sec)
	if err := checkTime("time", t); err != nil {
		return time.Time{}, err
	}
	return t, nil
}

// ttToUnix converts a JDE (TT) to UTC Unix seconds by fixed-point iteration
// (ΔT changes by far less than a second per second, so it converges at once).
func ttToUnix(jde float64) float64 {
	target := jdToUnix(jde)
	sec := target - 69
	for range 4 {
		e := epochOf(sec)
		sec -= jdToUnix(e.JDE) - target
	}
	return sec
}

func secondsToDuration(s float64) time.Duration {
	return time.Duration(math.Round(s * 1e9))
}
