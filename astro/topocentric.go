package astro

import "math"

// The place of the Sun or the Moon in a site's sky at one instant (SunFrom,
// MoonFrom): the apparent geocentric position corrected for parallax by the
// rigorous formulas of Meeus, Astronomical Algorithms 2nd ed., ch. 40
// (eqs. 40.2, 40.3, with ρ sin φ′ and ρ cos φ′ of ch. 11 from the geodetic
// latitude and the elevation), then altitude and azimuth (ch. 13) with the
// apparent sidereal time; for the Sun also the refraction of ch. 16.

// topo is a body's topocentric place, radians and km.
type topo struct {
	ra, dec float64 // topocentric right ascension (not reduced) and declination
	ha      float64 // local topocentric hour angle, not reduced, west positive
	alt, az float64 // geometric altitude; azimuth from the north through the east, not reduced
	dist    float64 // from the observer to the body's centre, km
}

// topocentric returns the place, seen from the valid observer o at epoch e,
// of a body at apparent geocentric right ascension ra, declination dec
// (radians, true equator and equinox of date) and distance dist (km);
// eqEq is the equation of the equinoxes Δψ cos ε at e (radians), which the
// body's apparent position has already computed.
func topocentric(o Observer, e Epoch, ra, dec, dist, eqEq float64) topo {
	st := siteOf(o)
	rhoSin, rhoCos := st.rhoSin, st.rhoCos
	// the apparent sidereal time reduced to [0°, 360°) before the hour
	// angle, as MoonFrom has always taken it (ApparentSiderealTime):
	// greenwichHourAngle, which does not reduce it, moves the last bits
	theta := norm360(meanSiderealRaw(e.JDUT1)+eqEq*rad2deg) * deg2rad
	H := theta + st.lon - ra
	sinPi := earthRadiusKm / dist
	sH, cH := math.Sincos(H)
	sd, cd := math.Sincos(dec)
	den := cd - rhoCos*sinPi*cH
	dRA := math.Atan2(-rhoCos*sinPi*sH, den)
	tdec := math.Atan2((sd-rhoSin*sinPi)*math.Cos(dRA), den)
	Hp := H - dRA
	sHp, cHp := math.Sincos(Hp)
	sp, cp := st.sinLat, st.cosLat
	sdp, cdp := math.Sincos(tdec)
	alt := math.Asin(sp*sdp + cp*cdp*cHp)
	az := math.Atan2(sHp, cHp*sp-sdp/cdp*cp) + math.Pi // Meeus 13.5 counts from the south
	// distance: |geocentric body − observer|, in Earth radii then km
	q := 1 / sinPi
	x := q*cd*cH - rhoCos
	y := q * cd * sH
	z := q*sd - rhoSin
	return topo{
		ra:   ra + dRA,
		dec:  tdec,
		ha:   Hp,
		alt:  alt,
		az:   az,
		dist: math.Sqrt(x*x+y*y+z*z) * earthRadiusKm,
	}
}

// bennettMinAltitude is the lowest apparent altitude (degrees) at which
// refractedAltitude applies Bennett's formula, as RiseSetAltitude takes it.
const bennettMinAltitude = -1.0

// bennettMinRefraction is the standard refraction (arcminutes) at
// bennettMinAltitude.
var bennettMinRefraction, _ = bennett(bennettMinAltitude)

// bennett returns the standard refraction (arcminutes) at apparent altitude
// a (degrees, ≥ bennettMinAltitude): Bennett's formula
// R = 1′/tan(a + 7.31/(a + 4.4)) (Meeus, Astronomical Algorithms 2nd ed.,
// ch. 16), and its derivative dR/da (arcminutes per degree). The formula
// turns negative above 89.92° (−0.08″ at the zenith); it is taken as 0
// there. Observer.RiseSetAltitude takes R from it for a raised Horizon.
func bennett(a float64) (r, dr float64) {
	b := a + 4.4
	r = 1 / math.Tan((a+7.31/b)*deg2rad)
	if r <= 0 {
		return 0, 0
	}
	return r, -(1 - 7.31/(b*b)) * deg2rad * (1 + r*r) // d cot x = −(1 + cot² x) dx
}

// refractedAltitude returns the apparent altitude (degrees) of a body at
// geometric altitude h (degrees) in air whose refraction is f times the
// standard one (Observer.RefractionFactor): the altitude a at which
// a − f·R(a) = h, R being Bennett's formula, which RiseSetAltitude takes
// for a raised Horizon and the skyline searches take; solved by Newton's
// method (a − f·R(a) increases with a), to 1e-12°. Below the geometric
// altitude whose apparent altitude is −1° (−1.83° in the standard air),
// where the formula stops, it returns h: no refraction.
func refractedAltitude(h, f float64) float64 {
	if h < bennettMinAltitude-f*bennettMinRefraction/60 {
		return h
	}
	r, _ := bennett(max(h, bennettMinAltitude))
	a := max(h+f*r/60, bennettMinAltitude)
	for range 20 {
		r, dr := bennett(a)
		step := (a - f*r/60 - h) / (1 - f*dr/60)
		a = max(a-step, bennettMinAltitude)
		if math.Abs(step) < 1e-12 {
			break
		}
	}
	return a
}
