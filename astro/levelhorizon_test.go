package astro

import (
	"math"
	"testing"
	"time"
)

// A horizon the site gives as 0 (Horizon 0 with LevelHorizon) is a level horizon: the
// refraction at 0° (Bennett, Meeus eq. 16.4: 34.48′) and no dip, while an
// unset one is the flat horizon lowered by the dip, 1.76′·√1150 = 59.7′
// (N. Bowditch, The American Practical Navigator, dip of the sea horizon). At 31.27° S 149.07° E, 1150 m, on 1 March 2027 (UTC
// 28 February), PyEphem 4.1.4 (pressure 0; the Sun's centre at −50.48′
// and −1.828°, the Moon's upper limb at −34.48′ and −1.561°) gives the
// level horizon's sunrise at 19:53:04.4 and moonrise at 13:03:49.2, the
// dipped horizon's at 19:48:22.9 and 12:58:09.2.
func TestLevelHorizonWithoutDip(t *testing.T) {
	dipped := Observer{Latitude: -31.27, Longitude: 149.07, Elevation: 1150}
	level := dipped
	level.LevelHorizon = true
	if d := Dip(1150) * 60; math.Abs(d-59.68) > 0.01 {
		t.Errorf("Dip(1150) = %.2f′, want 59.68′", d)
	}
	if h := level.RiseSetAltitude(); math.Abs(h-(-(34.478+16)/60)) > 1e-4 {
		t.Errorf("level horizon: rise altitude %.5f°, want −0.84130°", h)
	}
	r, _ := bennett(0) // the altitude of a horizon at exactly 0° taken as measured
	if h := level.RiseSetAltitude(); h != -r/60-16.0/60 {
		t.Errorf("level horizon: rise altitude %v, not %v to the last bit", h, -r/60-16.0/60)
	}
	if h := dipped.RiseSetAltitude(); math.Abs(h-(SunriseAltitude-59.68/60)) > 1e-4 {
		t.Errorf("flat horizon from 1150 m: rise altitude %.5f°, want −1.82801°", h)
	}
	from := time.Date(2027, 2, 28, 12, 0, 0, 0, time.UTC)
	to := from.Add(12 * time.Hour)
	e, err := NewEphemeris(from, to)
	if err != nil {
		t.Fatal(err)
	}
	me, err := NewMoonEphemeris(from, to)
	if err != nil {
		t.Fatal(err)
	}
	pyephem := func(s string) time.Time {
		v, err := time.Parse("15:04:05.000", s)
		if err != nil {
			t.Fatal(err)
		}
		return time.Date(2027, 2, 28, v.Hour(), v.Minute(), v.Second(), v.Nanosecond(), time.UTC)
	}
	for _, c := range []struct {
		name      string
		o         Observer
		sun, moon time.Time
	}{
		{"level", level, pyephem("19:53:04.365"), pyephem("13:03:49.245")},
		{"dipped", dipped, pyephem("19:48:22.873"), pyephem("12:58:09.184")},
	} {
		cs, err := e.SunCrossings(c.o, c.o.RiseSetAltitude(), from, to)
		if err != nil || len(cs) != 1 {
			t.Fatalf("%s: sunrises %v, %v", c.name, cs, err)
		}
		if d := cs[0].Time.Sub(c.sun); d.Abs() > time.Second {
			t.Errorf("%s: sunrise %v, PyEphem %v", c.name, cs[0].Time, c.sun)
		}
		ms, err := me.MoonRiseSet(c.o, from, to)
		if err != nil || len(ms) == 0 || ms[0].Direction != Rising {
			t.Fatalf("%s: moonrises %v, %v", c.name, ms, err)
		}
		if d := ms[0].Time.Sub(c.moon); d.Abs() > time.Second {
			t.Errorf("%s: moonrise %v, PyEphem %v", c.name, ms[0].Time, c.moon)
		}
	}
}

// A level horizon written 0 (LevelHorizon) is not a raised one: only a
// Horizon that hides the Sun above the flat horizon is, as 0.5° and 10° do;
// an unset one (0) and a sea horizon below level (−0.5°) are not.
func TestRaisedHorizon(t *testing.T) {
	for _, tc := range []struct {
		o    Observer
		want bool
	}{
		{Observer{}, false}, {Observer{LevelHorizon: true}, false}, {Observer{Horizon: -0.5}, false},
		{Observer{Horizon: 0.5}, true}, {Observer{Horizon: 10, LevelHorizon: true}, true},
	} {
		if got := tc.o.RaisedHorizon(); got != tc.want {
			t.Errorf("%+v.RaisedHorizon() = %v, want %v", tc.o, got, tc.want)
		}
	}
}

// LevelHorizon adds nothing to a Horizon other than 0, which never takes
// the dip (Observer.RiseSetAltitude): from 1150 m, a skyline at 2° or at
// −0.5° gives the same rise altitude with it and without it.
func TestLevelHorizonOnlyAtZero(t *testing.T) {
	for _, h := range []float64{2, -0.5} {
		o := Observer{Elevation: 1150, Horizon: h}
		level := o
		level.LevelHorizon = true
		if a, b := o.RiseSetAltitude(), level.RiseSetAltitude(); a != b {
			t.Errorf("Horizon %g: rise altitude %v, with LevelHorizon %v", h, a, b)
		}
	}
}
