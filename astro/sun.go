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
	eqEq := a.eqEq() * rad2deg
	gast := meanSiderealRaw(e.JDUT1) + eqEq
	tau := (e.JDE - J2000) / julianMillennium
	l0 := 280.4664567 + tau*(360007.6982779+tau*(0.03032028+tau*(1.0/49931+tau*(-1.0/15300-tau/2000000))))
	eqt := l0 - 0.0057183 - a.ra*rad2deg + eqEq
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

// SunTopocentric is the apparent position of the Sun as seen from a place
// on the Earth's surface (SunFrom). Angles are in degrees.
type SunTopocentric struct {
	RightAscension, Declination float64 // topocentric, true equator and equinox of date; RA in [0, 360)
	HourAngle                   float64 // local topocentric hour angle, (−180, 180], west positive
	// Altitude is the geometric altitude of the centre (no refraction), the
	// altitude that Ephemeris.SunAltitude gives and that the thresholds of
	// the daily events (SunriseAltitude, CivilTwilight…) are compared with.
	Altitude float64
	// RefractedAltitude is the altitude of the centre as seen through the
	// air: Altitude raised by Bennett's refraction (Meeus ch. 16, 34.5′ at
	// an apparent 0°, 1′ at 45°, 0 at the zenith; the formula of
	// RiseSetAltitude for a raised Horizon and of the skyline searches)
	// scaled by the Observer's RefractionFactor (the standard air when
	// Pressure is 0). The formula stops at an apparent −1°: below (a
	// geometric −1.83° in the standard air) it is Altitude. The air's
	// layers can move the low Sun by more than the formula says (see the
	// package's Incomplete).
	RefractedAltitude float64
	Azimuth           float64 // of the centre, from north through east, [0, 360)
	Distance          float64 // from the observer to the Sun's centre, au
	// Semidiameter is the topocentric apparent radius of the disk,
	// asin(sin 959.63″ / Distance) (the radius of the eclipse computations:
	// about 0.27°), geometric: refraction flattens the low disk.
	Semidiameter float64
}

// SunFrom returns the Sun's topocentric position for the observer at the
// UTC instant t, the Sun's counterpart of MoonFrom: the apparent geocentric
// Sun that Sun gives (VSOP87D, nutation, aberration) corrected for parallax
// by the rigorous formulas of Meeus, Astronomical Algorithms 2nd ed.,
// ch. 40 (eqs. 40.2, 40.3; the Sun's parallax is 8.8″ at most), then
// altitude and azimuth (ch. 13) with the apparent sidereal time, and the
// refracted altitude (ch. 16). It needs no Ephemeris: one call for one
// instant, at the cost of the VSOP87D series and the nutation (about
// 190,000 instructions, some 10 µs); for many instants of a span an
// Ephemeris's SunAltitude and SunAzimuth cost less a query and agree with
// it within 0.001″. The Observer's Elevation enters the parallax, Pressure
// and Temperature the refraction; Horizon and LevelHorizon are not used. It
// returns a *RangeError outside MinTime..MaxTime and an *InputError for an
// invalid observer (NaN and infinities included).
func SunFrom(o Observer, t time.Time) (SunTopocentric, error) {
	if err := o.Validate(); err != nil {
		return SunTopocentric{}, err
	}
	e, err := NewEpoch(t)
	if err != nil {
		return SunTopocentric{}, err
	}
	return sunFrom(o, e), nil
}

// sunFrom is SunFrom for a valid observer at epoch e.
func sunFrom(o Observer, e Epoch) SunTopocentric {
	s := apparentSun(e.JDE)
	p := topocentric(o, e, s.ra, s.dec, s.r*auKm, s.eqEq())
	alt := p.alt * rad2deg
	return SunTopocentric{
		RightAscension:    norm2Pi(p.ra) * rad2deg,
		Declination:       p.dec * rad2deg,
		HourAngle:         math.Remainder(p.ha, 2*math.Pi) * rad2deg,
		Altitude:          alt,
		RefractedAltitude: refractedAltitude(alt, o.RefractionFactor()),
		Azimuth:           norm2Pi(p.az) * rad2deg,
		Distance:          p.dist / auKm,
		Semidiameter:      math.Asin(math.Sin(sunSemidiameter1AU*arcsec2rad)*auKm/p.dist) * rad2deg,
	}
}

// sunApparent holds the apparent Sun in radians.
type sunApparent struct {
	lambda, beta float64 // apparent ecliptic longitude [0, 2π), latitude
	ra, dec      float64 // apparent right ascension [0, 2π), declination
	r            float64 // au
	dpsi, eps    float64 // nutation in longitude, true obliquity
}

// eqEq is the equation of the equinoxes at the Sun's instant, radians.
func (s sunApparent) eqEq() float64 { return equationOfEquinoxes(s.dpsi, s.eps) }

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
