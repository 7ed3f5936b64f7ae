package astro

import (
	"math"
	"time"
)

// The apparent geocentric Sun: Meeus, Astronomical Algorithms 2nd ed.,
// ch. 25 ("higher accuracy"): the VSOP87D Earth (ch. 32), λ = L + 180°,
// β = −B, the conversion to the FK5 system (eq. 32.3) and the IAU 2000
// precession-rate correction (see precessionRateCorrection), nutation in longitude
// (ch. 22) and the annual aberration −20.4898″/R (eq. 25.10), then right
// ascension and declination with the true obliquity (eq. 13.3, 13.4). The
// equation of time follows eq. 28.1–28.2.

// SunPosition is the apparent geocentric position of the Sun at an instant.
type SunPosition struct {
	RightAscension float64 // apparent, true equator and equinox of date, degrees [0, 360)
	Declination    float64 // apparent, degrees
	Longitude      float64 // apparent ecliptic longitude, of date, degrees [0, 360)
	Latitude       float64 // apparent ecliptic latitude, of date, degrees
	Distance       float64 // Earth centre – Sun centre, au
	// EquationOfTime is apparent minus mean solar time (positive when a
	// sundial is fast, as in early November).
	EquationOfTime time.Duration
	SiderealTime   float64 // Greenwich apparent sidereal time, degrees [0, 360)
}

// Sun returns the apparent geocentric position of the Sun at the UTC instant
// t. Accuracy against the complete theory: a few milliarcseconds in
// longitude (truncation of VSOP87 and of the nutation series), well below
// 0.05″. It returns a *RangeError outside MinTime..MaxTime.
func Sun(t time.Time) (SunPosition, error) {
	e, err := NewEpoch(t)
	if err != nil {
		return SunPosition{}, err
	}
	a := apparentSun(e.JDE)
	gast := meanSiderealRaw(e.JDUT1) + a.dpsi*math.Cos(a.eps)*rad2deg
	tau := (e.JDE - J2000) / julianMillennium
	l0 := 280.4664567 + tau*(360007.6982779+tau*(0.03032028+tau*(1.0/49931+tau*(-1.0/15300-tau/2000000))))
	eqt := l0 - 0.0057183 - a.ra*rad2deg + a.dpsi*math.Cos(a.eps)*rad2deg
	eqt = math.Mod(eqt, 360)
	if eqt > 180 {
		eqt -= 360
	} else if eqt < -180 {
		eqt += 360
	}
	return SunPosition{
		RightAscension: a.ra * rad2deg,
		Declination:    a.dec * rad2deg,
		Longitude:      a.lambda * rad2deg,
		Latitude:       a.beta * rad2deg,
		Distance:       a.r,
		EquationOfTime: secondsToDuration(eqt * 240),
		SiderealTime:   norm360(gast),
	}, nil
}

// sunApparent holds the apparent Sun in radians.
type sunApparent struct {
	lambda, beta float64 // apparent ecliptic longitude [0, 2π), latitude
	ra, dec      float64 // apparent right ascension [0, 2π), declination
	r            float64 // au
	dpsi, eps    float64 // nutation in longitude, true obliquity
}

// apparentSun computes the apparent geocentric Sun at jde (TT).
func apparentSun(jde float64) sunApparent {
	L, B, R := earthHeliocentric(jde)
	return apparentSunFrom(jde, L, B, R)
}

// apparentSunFrom is apparentSun from the Earth's heliocentric L, B, R at
// jde (VSOP87D or its Chebyshev fit).
func apparentSunFrom(jde, L, B, R float64) sunApparent {
	dpsi, deps := nutationRad(jde)
	return apparentSunNut(jde, L, B, R, dpsi, deps)
}

// apparentSunNut is apparentSunFrom with the nutation at jde given.
func apparentSunNut(jde, L, B, R, dpsi, deps float64) sunApparent {
	lambda, beta := sunFK5(jde, L, B)
	eps := meanObliquityRad(jde) + deps
	lambda = norm2Pi(lambda + dpsi - 20.4898*arcsec2rad/R)
	ra, dec := eclipticToEquatorial(lambda, beta, eps)
	return sunApparent{lambda: lambda, beta: beta, ra: ra, dec: dec, r: R, dpsi: dpsi, eps: eps}
}

// sunFK5 turns the heliocentric VSOP87D L, B of the Earth into the Sun's
// geometric geocentric λ, β in the FK5 system (Meeus eq. 32.3).
func sunFK5(jde, L, B float64) (lambda, beta float64) {
	T := (jde - J2000) / julianCentury
	theta := L + math.Pi
	beta = -B
	lp := theta - (1.397*T+0.00031*T*T)*deg2rad
	sl, cl := math.Sincos(lp)
	return theta - (0.09033+precessionRateCorrection*T)*arcsec2rad, beta + 0.03916*arcsec2rad*(cl-sl)
}

// precessionRateCorrection is the IAU 2000 correction to the rate of
// precession in longitude, 0.29965″ per Julian century (Mathews, Herring &
// Buffett 2002; adopted in IAU 2000 and kept in IAU 2006). VSOP87D's
// equinox of date follows the older IAU 1976 rate, so without it the Sun's
// longitude drifts from modern references by 0.3″ per century (7 s on a
// season instant at 1900 or 2100); measured against ERFA's IAU 2006/2000A in
// TestSunAgainstERFA.
const precessionRateCorrection = 0.29965

// sunApparentLongitude returns only the Sun's apparent longitude (radians,
// [0, 2π)) at jde, as used by the season and cross-quarter solvers.
func sunApparentLongitude(jde float64) float64 {
	L, B, R := earthHeliocentric(jde)
	lambda, _ := sunFK5(jde, L, B)
	dpsi, _ := nutationRad(jde)
	return norm2Pi(lambda + dpsi - 20.4898*arcsec2rad/R)
}
