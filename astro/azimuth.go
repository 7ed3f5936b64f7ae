package astro

import (
	"math"
	"time"
)

// Direction of a body on the sky: the topocentric azimuth, measured from the
// north through the east (0° north, 90° east, 180° south, 270° west), the
// convention of surveyors and of Meeus (who counts from the south, ch. 13;
// his A + 180° is this azimuth).

// azimuthFrom returns the topocentric azimuth (radians, 0 ≤ A < 2π, from the
// north through the east) of a body at local hour angle H, declination dec
// (rad) and geocentric distance dist (Earth radii), with the geometry of
// site.sinAltitudeFrom: x towards the meridian on the equator, y towards the
// west, z towards the pole. At a pole, where every direction is south (or
// north), it returns the direction of the body's hour angle measured as if
// from the Greenwich meridian.
func (st *site) azimuthFrom(H, dec, dist float64) float64 {
	sd, cd := math.Sincos(dec)
	return st.azimuthSC(H, sd, cd, dist)
}

// azimuthSC is azimuthFrom with the declination's sine and cosine given.
func (st *site) azimuthSC(H, sd, cd, dist float64) float64 {
	x, y, z := st.topoVector(H, sd, cd, dist)
	north := -x*st.sinLat + z*st.cosLat
	east := -y
	a := math.Atan2(east, north)
	if a < 0 {
		a += 2 * math.Pi
	}
	return a
}

// azimuth returns the body's topocentric azimuth (radians) at Unix second
// sec: on a track with the declination's sine and cosine tabulated (the
// Sun's), from them interpolated, as sinAltitude does.
func (tr *track) azimuth(st *site, sec float64) float64 {
	k, w := tr.weights(sec)
	H := tr.ghaFrom(sec, k, &w) + st.lon
	if tr.sd != nil {
		return st.azimuthSC(H, interp(tr.sd, k, &w), interp(tr.cd, k, &w), interp(tr.dist, k, &w))
	}
	return st.azimuthFrom(H, interp(tr.dec, k, &w), interp(tr.dist, k, &w))
}

// SunAzimuth returns the topocentric azimuth of the Sun's centre at t, in
// degrees from the north through the east (0 ≤ A < 360): e.g. where the
// Sun rises. The instant must lie within Coverage() (else a *RangeError); an
// invalid observer gives an *InputError.
func (e *Ephemeris) SunAzimuth(o Observer, t time.Time) (float64, error) {
	st, err := e.query(&o, t, t)
	if err != nil {
		return 0, err
	}
	return e.sun.azimuth(st, unixSeconds(t)) * rad2deg, nil
}

// MoonAzimuth returns the topocentric azimuth of the Moon's centre at t, in
// degrees from the north through the east (0 ≤ A < 360). The instant must
// lie within Coverage() (else a *RangeError); an invalid observer gives an
// *InputError.
func (e *MoonEphemeris) MoonAzimuth(o Observer, t time.Time) (float64, error) {
	st, err := e.query(o, t, t)
	if err != nil {
		return 0, err
	}
	return e.moon.azimuth(st, unixSeconds(t)) * rad2deg, nil
}

// compassPoints are the 16 points of the compass, from north through east.
var compassPoints = [16]string{
	"north", "north-north-east", "north-east", "east-north-east",
	"east", "east-south-east", "south-east", "south-south-east",
	"south", "south-south-west", "south-west", "west-south-west",
	"west", "west-north-west", "north-west", "north-north-west",
}

// CompassPoint names the nearest of the 16 points of the compass to the
// azimuth az (degrees from the north through the east, any value: −10 is
// "north", 450 "east"), e.g. 118° → "east-south-east". For NaN or an infinity
// it returns "".
func CompassPoint(az float64) string {
	if math.IsNaN(az) || math.IsInf(az, 0) {
		return ""
	}
	az = math.Mod(az, 360)
	if az < 0 {
		az += 360
	}
	return compassPoints[int(math.Floor(az/22.5+0.5))%16]
}
