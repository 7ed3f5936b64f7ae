package astro

import (
	"math"
	"time"
)

// The Moon's apparent geocentric position.
//
// Method: the ELP/MPP02 lunar theory fitted to DE405 (J. Chapront &
// G. Francou, A&A 404, 735, 2003; elp.go, tables in zz_elp_moon.go) gives the
// geometric position referred to the mean ecliptic and equinox of date. The
// apparent position adds:
//
//   - light time: the Moon is seen where it was τ = Δ/c ≈ 1.3 s earlier. For
//     a geocentric observer the annual aberration and the Earth's own motion
//     during τ cancel to first order (both are the Earth's barycentric
//     velocity times τ), so the apparent direction is the geometric
//     geocentric position at t − τ, about 0.7″ behind the geometric one. The
//     series is evaluated once, at t − 1.2822 s (the light time at the mean
//     distance), and the remainder (τ − 1.2822 s, at most ±0.08 s) is applied
//     with the Moon's mean motion: error below 0.01″;
//   - nutation in longitude Δψ (IAU 1980, nutation.go) for the true equinox;
//   - the true obliquity ε₀ + Δε for right ascension and declination
//     (Meeus, Astronomical Algorithms 2nd ed., eqs. 13.3, 13.4).
//
// Accuracy: the generated tables are within 0.08″ of the published 4,862-term
// series over 1800–2200 (TestELPTruncation); the apparent position is within
// 0.13″ and 0.4 km of the Swiss Ephemeris with its DE431-based files at 400
// instants over 1800–2199 (TestMoonPositionSwissEphemeris).

const (
	// moonMeanLightTime is the light time at the Moon's mean distance
	// 384,400 km, in days.
	moonMeanLightTime = 384400.0 / speedOfLightKmS / secondsPerDay
	// speedOfLightKmS is the speed of light, km/s (IAU).
	speedOfLightKmS = 299792.458
	// moonMeanMotion is the Moon's mean motion in longitude, radians per day
	// (481267.88°/Julian century, Meeus eq. 47.1).
	moonMeanMotion = 481267.88123421 / julianCentury * deg2rad
	// earthRadiusKm is the Earth's equatorial radius (WGS 84 / IERS), km.
	earthRadiusKm = 6378.137
	// earthFlattening is the Earth's flattening (WGS 84).
	earthFlattening = 1 / 298.257223563
	// moonRadiusKm is the Moon's mean radius (IAU), km; the semidiameter is
	// asin(moonRadiusKm / distance).
	moonRadiusKm = 1737.4
)

// moonState is the apparent geocentric Moon at one instant, radians and km.
type moonState struct {
	lon, lat float64 // apparent ecliptic longitude [0, 2π) and latitude, true equinox of date
	ra, dec  float64 // apparent right ascension [0, 2π) and declination, true equator of date
	dist     float64 // distance between the centres, km
	eqEq     float64 // equation of the equinoxes Δψ cos ε, radians
}

// moonApparent returns the apparent geocentric Moon at jde (TT), as described
// at the top of this file.
func moonApparent(jde float64) moonState {
	lon, lat, dist := elpMoon(jde - moonMeanLightTime)
	return moonApparentFrom(jde, lon, lat, dist)
}

// moonApparentFrom completes moonApparent from the series' geometric
// position at jde − moonMeanLightTime.
func moonApparentFrom(jde, lon, lat, dist float64) moonState {
	tau := dist / speedOfLightKmS / secondsPerDay
	lon -= (tau - moonMeanLightTime) * moonMeanMotion
	dpsi, deps := nutationRad(jde)
	eps := meanObliquityRad(jde) + deps
	lon = norm2Pi(lon + dpsi)
	ra, dec := eclipticToEquatorial(lon, lat, eps)
	return moonState{lon: lon, lat: lat, ra: ra, dec: dec, dist: dist, eqEq: equationOfEquinoxes(dpsi, eps)}
}

// eclipticToEquatorial converts ecliptic longitude and latitude to right
// ascension [0, 2π) and declination for the obliquity eps, all radians
// (Meeus eqs. 13.3, 13.4).
func eclipticToEquatorial(lon, lat, eps float64) (ra, dec float64) {
	sl, cl := math.Sincos(lon)
	sb, cb := math.Sincos(lat)
	se, ce := math.Sincos(eps)
	ra = norm2Pi(math.Atan2(sl*ce*cb-sb*se, cl*cb))
	dec = math.Asin(sb*ce + cb*se*sl)
	return ra, dec
}

// MoonPosition is the apparent geocentric position of the Moon at one
// instant. Angles are in degrees.
type MoonPosition struct {
	// Longitude and Latitude are the apparent ecliptic coordinates referred
	// to the true equinox and the mean ecliptic of date; Longitude in [0, 360).
	Longitude, Latitude float64
	// RightAscension in [0, 360) and Declination, true equator and equinox
	// of date.
	RightAscension, Declination float64
	// Distance between the centres of the Earth and the Moon, km.
	Distance float64
	// Parallax is the equatorial horizontal parallax, asin(a/Δ) with the
	// Earth's equatorial radius a = 6378.137 km (about 0.9°).
	Parallax float64
	// Semidiameter is the geocentric apparent radius of the disk,
	// asin(1737.4 km/Δ) (about 0.26°).
	Semidiameter float64
}

func (s moonState) position() MoonPosition {
	return MoonPosition{
		Longitude:      s.lon * rad2deg,
		Latitude:       s.lat * rad2deg,
		RightAscension: s.ra * rad2deg,
		Declination:    s.dec * rad2deg,
		Distance:       s.dist,
		Parallax:       math.Asin(earthRadiusKm/s.dist) * rad2deg,
		Semidiameter:   math.Asin(moonRadiusKm/s.dist) * rad2deg,
	}
}

// Moon returns the apparent geocentric position of the Moon at the UTC
// instant t: ELP/MPP02 (fitted to DE405) with light time, IAU 1980 nutation
// and the true obliquity: within 0.13″ of DE431 over 1800–2199 (measured).
// It returns a *RangeError (matching ErrOutOfRange) outside
// MinTime..MaxTime.
func Moon(t time.Time) (MoonPosition, error) {
	e, err := NewEpoch(t)
	if err != nil {
		return MoonPosition{}, err
	}
	return moonApparent(e.JDE).position(), nil
}

// Illumination describes the Moon's lit disk as seen from the Earth's
// centre (Meeus, Astronomical Algorithms 2nd ed., ch. 48).
type Illumination struct {
	// Fraction is the illuminated fraction of the disk, 0..1:
	// (1 + cos i)/2 (eq. 48.1).
	Fraction float64
	// PhaseAngle i is the Sun–Moon–Earth angle, degrees 0..180 (eqs. 48.2,
	// 48.3, from the geocentric elongation ψ and both distances).
	PhaseAngle float64
	// Elongation is the apparent geocentric elongation in longitude
	// λ☾ − λ☉, degrees [0, 360): 0 at new moon, 90 at first quarter, 180 at
	// full moon, 270 at last quarter.
	Elongation float64
	// BrightLimb is the position angle χ of the midpoint of the bright limb,
	// degrees [0, 360), from the north point of the disk towards the east
	// (eq. 48.5); near 270° the waxing Moon is lit on its west (right, for a
	// northern observer) side.
	BrightLimb float64
	// Waxing is true from new moon to full moon (Elongation in [0, 180)).
	Waxing bool
}

// illumination computes the Moon's illumination from the apparent
// geocentric Moon (ra, dec, dist in km) and Sun (ra0, dec0, r0 in km),
// radians, and the elongation in longitude (radians).
func illumination(ra, dec, dist, ra0, dec0, r0, elong float64) Illumination {
	sd, cd := math.Sincos(dec)
	sd0, cd0 := math.Sincos(dec0)
	sa, ca := math.Sincos(ra0 - ra)
	cosPsi := sd0*sd + cd0*cd*ca
	psi := math.Acos(max(-1, min(1, cosPsi)))
	i := math.Atan2(r0*math.Sin(psi), dist-r0*cosPsi)
	chi := math.Atan2(cd0*sa, sd0*cd-cd0*sd*ca)
	elong = norm2Pi(elong)
	return Illumination{
		Fraction:   (1 + math.Cos(i)) / 2,
		PhaseAngle: i * rad2deg,
		Elongation: elong * rad2deg,
		BrightLimb: norm2Pi(chi) * rad2deg,
		Waxing:     elong < math.Pi,
	}
}

// MoonIllumination returns the Moon's illuminated fraction, phase angle,
// elongation, position angle of the bright limb and whether it is waxing,
// at the UTC instant t, from the apparent positions Moon and Sun give
// (Meeus ch. 48, the rigorous eqs. 48.2–48.3, not the approximate 48.4). It
// returns a *RangeError outside MinTime..MaxTime.
func MoonIllumination(t time.Time) (Illumination, error) {
	e, err := NewEpoch(t)
	if err != nil {
		return Illumination{}, err
	}
	m := moonApparent(e.JDE)
	s := apparentSun(e.JDE)
	return illumination(m.ra, m.dec, m.dist, s.ra, s.dec, s.r*auKm, m.lon-s.lambda), nil
}

// MoonTopocentric is the apparent position of the Moon as seen from a place
// on the Earth's surface. Angles are in degrees.
type MoonTopocentric struct {
	RightAscension, Declination float64 // topocentric, true equator and equinox of date; RA in [0, 360)
	HourAngle                   float64 // local topocentric hour angle, (−180, 180], west positive
	Altitude                    float64 // geometric altitude of the centre (no refraction)
	Azimuth                     float64 // from north through east, [0, 360)
	Distance                    float64 // from the observer to the Moon's centre, km
	Semidiameter                float64 // topocentric, asin(1737.4 km / Distance)
}

// MoonFrom returns the Moon's topocentric position for the observer at the
// UTC instant t: the apparent geocentric Moon corrected for parallax by the
// rigorous formulas of Meeus, Astronomical Algorithms 2nd ed., ch. 40
// (eqs. 40.2, 40.3, with ρ sin φ′, ρ cos φ′ of ch. 11 from the geodetic
// latitude and the elevation), then altitude and azimuth (ch. 13) with the
// apparent sidereal time. It returns a *RangeError outside
// MinTime..MaxTime and an *InputError for an invalid observer.
func MoonFrom(o Observer, t time.Time) (MoonTopocentric, error) {
	if err := o.Validate(); err != nil {
		return MoonTopocentric{}, err
	}
	e, err := NewEpoch(t)
	if err != nil {
		return MoonTopocentric{}, err
	}
	m := moonApparent(e.JDE)
	p := topocentric(o, e, m.ra, m.dec, m.dist, m.eqEq)
	return MoonTopocentric{
		RightAscension: norm2Pi(p.ra) * rad2deg,
		Declination:    p.dec * rad2deg,
		HourAngle:      math.Remainder(p.ha, 2*math.Pi) * rad2deg,
		Altitude:       p.alt * rad2deg,
		Azimuth:        norm2Pi(p.az) * rad2deg,
		Distance:       p.dist,
		Semidiameter:   math.Asin(moonRadiusKm/p.dist) * rad2deg,
	}, nil
}
