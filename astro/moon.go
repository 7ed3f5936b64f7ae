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
// series over 1800–2200 (TestELPTruncation); the series itself is a fit to
// DE405.

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
}

// moonApparent returns the apparent geocentric Moon at jde (TT), as described
// at the top of this file.
func moonApparent(jde float64) moonState {
	lon, lat, dist := elpMoon(jde - moonMeanLightTime)
	tau := dist / speedOfLightKmS / secondsPerDay
	lon -= (tau - moonMeanLightTime) * moonMeanMotion
	dpsi, deps := nutationRad(jde)
	eps := meanObliquityRad(jde) + deps
	lon = norm2Pi(lon + dpsi)
	ra, dec := eclipticToEquatorial(lon, lat, eps)
	return moonState{lon: lon, lat: lat, ra: ra, dec: dec, dist: dist}
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
// and the true obliquity, as described in moon.go. The truncated series is
// within 0.08″ of the published one over 1800–2200. It returns a *RangeError
// (matching ErrOutOfRange) outside MinTime..MaxTime.
func Moon(t time.Time) (MoonPosition, error) {
	e, err := NewEpoch(t)
	if err != nil {
		return MoonPosition{}, err
	}
	return moonApparent(e.JDE).position(), nil
}
