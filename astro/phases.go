package astro

import (
	"fmt"
	"math"
	"time"
)

// The Moon's phases: the instants when the apparent geocentric elongation in
// longitude of the Moon from the Sun, λ☾ − λ☉, is 0° (new moon), 90° (first
// quarter), 180° (full moon) or 270° (last quarter).
//
// Method: the mean phases of Meeus, Astronomical Algorithms 2nd ed., ch. 49
// (eq. 49.1, within about 14 hours of the true instants) with the largest of
// the chapter's periodic corrections (within a few minutes) are the starting
// values; each is then solved on the true apparent positions — the Moon of
// moon.go (ELP/MPP02 with light time and nutation) and the Sun of sun.go
// (VSOP87D, FK5, nutation, aberration) — by the secant method until the step
// is below 1 ms. The solution is in Terrestrial Time and converted to UTC
// with the ΔT model of deltat.go.
//
// Accuracy (moon_crosscheck_test.go, phases_test.go): within 0.22 s (TT) of
// the Swiss Ephemeris with its DE431-based files for every phase of 14
// sample years 1900–2099 (median 0.08 s); within USNO's minute rounding for
// its table 1900–2019. In UT the result also carries the ΔT model, which is
// observed 1973–2023 and a model elsewhere (tens of seconds by 2100).

// PhaseKind is one of the four principal phases of the Moon.
type PhaseKind int

// The principal phases, in the order they occur.
const (
	NewMoon      PhaseKind = iota // elongation 0°
	FirstQuarter                  // elongation 90°
	FullMoon                      // elongation 180°
	LastQuarter                   // elongation 270°
)

var phaseNames = [...]string{"new moon", "first quarter", "full moon", "last quarter"}

// String returns the phase's name in lower case, e.g. "first quarter".
func (k PhaseKind) String() string {
	if k < 0 || int(k) >= len(phaseNames) {
		return fmt.Sprintf("PhaseKind(%d)", int(k))
	}
	return phaseNames[k]
}

// Elongation returns the phase's elongation of the Moon from the Sun in
// longitude, degrees (0, 90, 180, 270); NaN for a value that is none of
// the four phases (PhaseKind(7)).
func (k PhaseKind) Elongation() float64 {
	if k < NewMoon || k > LastQuarter {
		return math.NaN()
	}
	return 90 * float64(k)
}

// Phase is one principal phase of the Moon.
type Phase struct {
	Kind PhaseKind
	Time time.Time // UTC
}

const (
	// synodicMonth is the mean synodic month in days (Meeus eq. 49.1).
	synodicMonth = 29.530588861
	// phaseEpoch is the JDE of the mean new moon k = 0 (2000 January 6).
	phaseEpoch = 2451550.09766
)

// meanPhaseJDE returns the JDE (TT) of the mean phase k (an integer for new
// moon, +0.25, +0.5, +0.75 for the other phases; k = 0 is the new moon of
// 2000 January 6): Meeus, Astronomical Algorithms 2nd ed., eq. 49.1.
func meanPhaseJDE(k float64) float64 {
	T := k / 1236.85
	return phaseEpoch + synodicMonth*k + T*T*(0.00015437+T*(-0.000000150+T*0.00000000073))
}

// moonSunElongation returns the apparent geocentric elongation in longitude
// λ☾ − λ☉ at jde (TT), radians in [0, 2π): the Moon as in moonApparent
// (without the latitude series, not needed here) and the Sun's apparent
// longitude of sun.go.
func moonSunElongation(jde float64) float64 {
	lon, dist := elpLongitudeDistance(jde - moonMeanLightTime)
	lon -= (dist/speedOfLightKmS/secondsPerDay - moonMeanLightTime) * moonMeanMotion
	dpsi, _ := nutationRad(jde)
	return norm2Pi(lon + dpsi - sunApparentLongitude(jde))
}

// approxPhaseJDE returns the mean phase k (JDE, eq. 49.1) corrected by the
// largest periodic terms of Meeus ch. 49 (those of 0.0005 day or more; the
// rest change it by a few minutes at most): a starting value for
// truePhaseJDE.
func approxPhaseJDE(k float64) float64 {
	T := k / 1236.85
	r := deg2rad
	E := 1 - T*(0.002516+0.0000074*T)
	M := (2.5534 + 29.10535670*k - T*T*(0.0000014+0.00000011*T)) * r
	Mp := (201.5643 + 385.81693528*k + T*T*(0.0107582+T*(0.00001238-0.000000058*T))) * r
	F := (160.7108 + 390.67050284*k - T*T*(0.0016118+T*(0.00000227-0.000000011*T))) * r
	var c float64
	switch q := math.Round((k - math.Floor(k)) * 4); q {
	case 0, 2: // new moon, full moon (eqs. of ch. 49, first table)
		a := [2][7]float64{
			{-0.40720, 0.17241, 0.01608, 0.01039, 0.00739, -0.00514, 0.00208},
			{-0.40614, 0.17302, 0.01614, 0.01043, 0.00734, -0.00515, 0.00209},
		}[int(q)/2]
		c = a[0]*math.Sin(Mp) + a[1]*E*math.Sin(M) + a[2]*math.Sin(2*Mp) + a[3]*math.Sin(2*F) +
			a[4]*E*math.Sin(Mp-M) + a[5]*E*math.Sin(Mp+M) + a[6]*E*E*math.Sin(2*M) -
			0.00111*math.Sin(Mp-2*F) - 0.00057*math.Sin(Mp+2*F) + 0.00056*E*math.Sin(2*Mp+M)
	default: // quarters
		c = -0.62801*math.Sin(Mp) + 0.17172*E*math.Sin(M) - 0.01183*E*math.Sin(Mp+M) +
			0.00862*math.Sin(2*Mp) + 0.00804*math.Sin(2*F) + 0.00454*E*math.Sin(Mp-M) +
			0.00204*E*E*math.Sin(2*M) - 0.00180*math.Sin(Mp-2*F) - 0.00070*math.Sin(Mp+2*F)
		W := 0.00306 - 0.00038*E*math.Cos(M) + 0.00026*math.Cos(Mp)
		if q == 1 {
			c += W
		} else {
			c -= W
		}
	}
	return meanPhaseJDE(k) + c
}

// truePhaseJDE solves λ☾ − λ☉ = target (radians) starting from jde0, by the
// secant method; the result is in TT.
func truePhaseJDE(jde0, target float64) float64 {
	f := func(jde float64) float64 {
		return math.Remainder(moonSunElongation(jde)-target, 2*math.Pi)
	}
	// The elongation grows by 2π per synodic month on average (12.2°/day).
	const rate = 2 * math.Pi / synodicMonth
	t0, f0 := jde0, f(jde0)
	t1 := t0 - f0/rate
	for range 12 {
		if math.Abs(t1-t0) < 1e-3/secondsPerDay {
			break
		}
		f1 := f(t1)
		if f1 == f0 {
			break
		}
		t2 := t1 - f1*(t1-t0)/(f1-f0)
		t0, f0, t1 = t1, f1, t2
	}
	return t1
}

// MoonPhases returns the principal phases of the Moon (new moon, first
// quarter, full moon, last quarter) with from ≤ Time < to, sorted by time,
// in UTC. Each instant is the apparent geocentric elongation in longitude
// of 0°, 90°, 180° or 270°, solved on ELP/MPP02 and VSOP87D positions;
// measured within a few seconds of the almanac-office instants. It returns
// a *RangeError (matching ErrOutOfRange) when from or to is outside
// MinTime..MaxTime, and an error matching ErrInvalidInput when to is before
// from.
func MoonPhases(from, to time.Time) ([]Phase, error) {
	if err := checkSpan("moon phases", from, to); err != nil {
		return nil, err
	}
	fromSec, toSec := unixSeconds(from), unixSeconds(to)
	// The true phase is within about 0.6 day of the mean phase; start one
	// quarter earlier and stop one quarter later to be safe.
	jdFrom := unixToJD(fromSec)
	k := math.Floor((jdFrom-phaseEpoch)/synodicMonth*4)/4 - 0.25
	var out []Phase
	for ; ; k += 0.25 {
		mean := meanPhaseJDE(k)
		if meanSec := jdToUnix(mean); meanSec > toSec+2*secondsPerDay {
			break
		}
		q := int(math.Round((k - math.Floor(k)) * 4))
		kind := PhaseKind(q % 4)
		jde := truePhaseJDE(approxPhaseJDE(k), float64(kind)*math.Pi/2)
		sec := ttToUnix(jde)
		if sec < fromSec || sec >= toSec {
			continue
		}
		out = append(out, Phase{Kind: kind, Time: timeFromUnix(sec)})
	}
	return out, nil
}

// checkRangeEnd accepts an exclusive end of a span up to MaxTime itself.
func checkRangeEnd(what string, t time.Time) error {
	if t.Equal(maxTime) {
		return nil
	}
	return checkTime(what, t)
}

// checkSpan checks the span [from, to) of a search over instants (what: its
// name in messages, e.g. "moon phases"): from within the supported range,
// to within it or at its end (checkRangeEnd), and to not before from (an
// error matching ErrInvalidInput).
func checkSpan(what string, from, to time.Time) error {
	if err := checkTime(what+" from", from); err != nil {
		return err
	}
	if err := checkRangeEnd(what+" to", to); err != nil {
		return err
	}
	if to.Before(from) {
		return invalidf("astro: %s: to %s is before from %s", what, to.UTC().Format(time.RFC3339), from.UTC().Format(time.RFC3339))
	}
	return nil
}
