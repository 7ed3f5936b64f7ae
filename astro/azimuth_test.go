package astro

import (
	"math"
	"testing"
	"time"
)

// TestSunAzimuthNOAA checks the Sun's azimuth against cells of NOAA's solar
// calculation spreadsheet at 40° N 105° W on 2010-06-21 (worked-examples.csv
// NOAA-2-pos: 12:00 at UTC−7, azimuth 178.533230037881°; NOAA-1-pos: 00:06,
// azimuth 1.09867118388445°). NOAA's low-accuracy solar formulas (Meeus
// ch. 25, about 0.01°) allow 0.02°.
func TestSunAzimuthNOAA(t *testing.T) {
	o := Observer{Latitude: 40, Longitude: -105}
	for _, c := range []struct {
		at   time.Time
		want float64
	}{
		{time.Date(2010, 6, 21, 19, 0, 0, 0, time.UTC), 178.533230037881},
		{time.Date(2010, 6, 21, 7, 6, 0, 0, time.UTC), 1.09867118388445},
	} {
		e, err := NewEphemeris(c.at, c.at)
		if err != nil {
			t.Fatal(err)
		}
		az, err := e.SunAzimuth(o, c.at)
		if err != nil {
			t.Fatal(err)
		}
		if d := math.Abs(math.Remainder(az-c.want, 360)); d > 0.02 {
			t.Errorf("%s: azimuth %.4f°, NOAA %.4f°", c.at.Format(time.RFC3339), az, c.want)
		}
	}
}

// TestRiseAzimuthSphericalTriangle checks the azimuth at sunrise and sunset
// against the spherical-triangle relation for a body at altitude h,
// declination δ and latitude φ: cos A = (sin δ − sin h sin φ) / (cos h cos φ)
// (Meeus ch. 13, eq. 13.5–13.6 solved for A; rising in the east, setting in
// the west), with δ of the apparent geocentric Sun: within 0.02° (the
// relation ignores the Sun's parallax, 8.8″ in altitude, which moves the
// azimuth of a slanting winter sunrise at 65° by 0.01°). At an equinox the Sun rises
// close to due east (common practice).
func TestRiseAzimuthSphericalTriangle(t *testing.T) {
	from, to := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC), time.Date(2027, 12, 31, 0, 0, 0, 0, time.UTC)
	e, err := NewEphemeris(from, to)
	if err != nil {
		t.Fatal(err)
	}
	for _, lat := range []float64{-60, -33.9, 0, 48.2, 65} {
		o := Observer{Latitude: lat, Longitude: 16.4}
		cs, err := e.SunCrossings(o, o.RiseSetAltitude(), from, to)
		if err != nil {
			t.Fatal(err)
		}
		for _, c := range cs[:40] {
			az, err := e.SunAzimuth(o, c.Time)
			if err != nil {
				t.Fatal(err)
			}
			s, err := Sun(c.Time)
			if err != nil {
				t.Fatal(err)
			}
			h, phi, dec := o.RiseSetAltitude()*deg2rad, lat*deg2rad, s.Declination*deg2rad
			want := math.Acos((math.Sin(dec)-math.Sin(h)*math.Sin(phi))/(math.Cos(h)*math.Cos(phi))) * rad2deg
			if c.Direction == Setting {
				want = 360 - want
			}
			if d := math.Abs(az - want); d > 0.02 {
				t.Errorf("lat %g %s %v: azimuth %.4f°, spherical triangle %.4f°", lat, c.Time.Format(time.RFC3339), c.Direction, az, want)
			}
		}
	}
	o := Observer{Latitude: 48.2, Longitude: 16.4}
	eq := time.Date(2027, 3, 20, 0, 0, 0, 0, time.UTC)
	cs, _ := e.SunCrossings(o, o.RiseSetAltitude(), eq, eq.Add(24*time.Hour))
	az, _ := e.SunAzimuth(o, cs[0].Time)
	if math.Abs(az-90) > 1.5 {
		t.Errorf("equinox sunrise at %.2f°, want about 90° (east)", az)
	}
}

// TestMoonAzimuthRiseEastSetWest checks that at moonrise the Moon's azimuth
// lies in the eastern half of the horizon and at moonset in the western half
// (common practice: the Moon, like the Sun, rises in the east).
func TestMoonAzimuthRiseEastSetWest(t *testing.T) {
	from, to := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC), time.Date(2027, 3, 1, 0, 0, 0, 0, time.UTC)
	me, err := NewMoonEphemeris(from, to)
	if err != nil {
		t.Fatal(err)
	}
	o := Observer{Latitude: 48.2, Longitude: 16.4}
	cs, err := me.MoonRiseSet(o, from, to)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range cs {
		az, err := me.MoonAzimuth(o, c.Time)
		if err != nil {
			t.Fatal(err)
		}
		east := az > 0 && az < 180
		if east != (c.Direction == Rising) {
			t.Errorf("%s %v at azimuth %.1f°", c.Time.Format(time.RFC3339), c.Direction, az)
		}
	}
}

// TestCompassPoint checks the 16-point names (common practice: 22.5° each,
// centred on the point).
func TestCompassPoint(t *testing.T) {
	for az, want := range map[float64]string{0: "north", 359: "north", 11.2: "north", 11.3: "north-north-east",
		90: "east", 118: "east-south-east", 180: "south", 247.5: "west-south-west", 300: "west-north-west", -10: "north"} {
		if got := CompassPoint(az); got != want {
			t.Errorf("CompassPoint(%g) = %q, want %q", az, got, want)
		}
	}
}
