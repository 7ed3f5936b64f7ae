package astro

import (
	"math"
	"testing"
	"time"
)

// TestSkylineAltitude checks the interpolation: linear between points,
// round the circle through north.
func TestSkylineAltitude(t *testing.T) {
	s, err := NewSkyline([]SkyPoint{{90, 8}, {0, 2.5}, {180, 1}, {270, 4}})
	if err != nil {
		t.Fatal(err)
	}
	for az, want := range map[float64]float64{0: 2.5, 45: 5.25, 90: 8, 135: 4.5, 315: 3.25, 359: 2.5 + 1.5/90, 360: 2.5, -45: 3.25} {
		if got := s.Altitude(az); math.Abs(got-want) > 1e-12 {
			t.Errorf("Altitude(%g) = %g, want %g", az, got, want)
		}
	}
	for _, bad := range [][]SkyPoint{nil, {{-1, 0}}, {{10, 50}}, {{0, 1}, {360, 2}}} {
		if _, err := NewSkyline(bad); err == nil {
			t.Errorf("%v accepted", bad)
		}
	}
}

// TestSkylineFlatEqualsHorizon: a skyline at one altitude all round gives
// exactly the events of that single horizon altitude (0° with the dip of an
// elevated site, and 2°).
func TestSkylineFlatEqualsHorizon(t *testing.T) {
	from := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)
	to := from.AddDate(0, 2, 0)
	e, err := NewEphemeris(from, to)
	if err != nil {
		t.Fatal(err)
	}
	for _, h := range []float64{0, 2} {
		o := Observer{Latitude: 48.2, Longitude: 16.4, Elevation: 300, Horizon: h}
		sky, _ := NewSkyline([]SkyPoint{{0, h}, {120, h}, {240, h}})
		a, err := e.SunCrossings(o, o.RiseSetAltitude(), from, to)
		if err != nil {
			t.Fatal(err)
		}
		b, err := e.SunSkylineCrossings(o, sky, from, to)
		if err != nil {
			t.Fatal(err)
		}
		if len(a) != len(b) {
			t.Fatalf("horizon %g: %d crossings, skyline %d", h, len(a), len(b))
		}
		for i := range a {
			if !a[i].Time.Equal(b[i].Time) || a[i].Direction != b[i].Direction {
				t.Errorf("horizon %g: %v, skyline %v", h, a[i], b[i])
			}
		}
	}
}

// TestSkylineBruteForce checks a stepped skyline (an 8° wall to the
// east-south-east, a peak of 30° due south that hides the winter noon Sun,
// a 10° wall to the west-south-west) against an independent computation
// written here: the Sun's apparent position from Sun() (every 10 min,
// interpolated) scanned every 5 s, its
// altitude and azimuth from the textbook formulas (Meeus eq. 13.5–13.6, no
// parallax), the upper limb 16′ above the centre, and the refraction of the
// true altitude by Sæmundsson's formula (Meeus eq. 16.4's companion,
// R = 1.02′ / tan(h + 10.3/(h + 5.11))) instead of Bennett's. Every crossing
// must be found, in the same order and direction, within 20 s (the two
// refraction formulas and the parallax differ by a few arcseconds; near a
// wall the Sun climbs slowly against it).
func TestSkylineBruteForce(t *testing.T) {
	sky, err := NewSkyline([]SkyPoint{
		{0, 0}, {99.9, 0}, {100, 8}, {150, 8}, {150.1, 1},
		{172, 1}, {176, 30}, {184, 30}, {188, 1},
		{230, 1}, {230.1, 10}, {290, 10}, {290.1, 0},
	})
	if err != nil {
		t.Fatal(err)
	}
	o := Observer{Latitude: 48.2, Longitude: 16.4}
	for _, day := range []time.Time{
		time.Date(2027, 12, 21, 0, 0, 0, 0, time.UTC), // winter: the peak hides the noon Sun
		time.Date(2027, 3, 20, 0, 0, 0, 0, time.UTC),
		time.Date(2027, 6, 21, 0, 0, 0, 0, time.UTC),
	} {
		from, to := day, day.Add(24*time.Hour)
		e, err := NewEphemeris(from, to)
		if err != nil {
			t.Fatal(err)
		}
		got, err := e.SunSkylineCrossings(o, sky, from, to)
		if err != nil {
			t.Fatal(err)
		}
		want := bruteSkyline(t, o, sky, from, to)
		if len(got) != len(want) {
			t.Fatalf("%s: %d crossings %v, brute force %d %v", day.Format(time.DateOnly), len(got), got, len(want), want)
		}
		for i := range got {
			if got[i].Direction != want[i].Direction || got[i].Time.Sub(want[i].Time).Abs() > 20*time.Second {
				t.Errorf("%s: %v %s, brute force %v %s", day.Format(time.DateOnly), got[i].Direction, got[i].Time.Format(time.TimeOnly), want[i].Direction, want[i].Time.Format(time.TimeOnly))
			}
		}
		if day.Month() == 12 && len(got) != 4 {
			t.Errorf("winter solstice: %d crossings, want 4 (rise, hidden behind the peak, out again, set)", len(got))
		}
	}
}

// bruteSkyline scans every 5 s with the independent computation described
// at TestSkylineBruteForce.
func bruteSkyline(t *testing.T, o Observer, sky Skyline, from, to time.Time) []Crossing {
	t.Helper()
	phi := o.Latitude * math.Pi / 180
	// Sun() every 10 minutes, linear in between (the apparent right
	// ascension and declination bend by far less than 0.1″ in that time;
	// sidereal time is exactly linear in it).
	node := func(tm time.Time) SunPosition {
		s, err := Sun(tm)
		if err != nil {
			t.Fatal(err)
		}
		return s
	}
	const every = 10 * time.Minute
	n0, n1 := from, from.Add(every)
	s0, s1 := node(n0), node(n1)
	above := func(tm time.Time) bool {
		for !tm.Before(n1) {
			n0, s0 = n1, s1
			n1 = n0.Add(every)
			s1 = node(n1)
		}
		f := float64(tm.Sub(n0)) / float64(every)
		lerp := func(a, b float64) float64 { return a + f*math.Remainder(b-a, 360) }
		H := (lerp(s0.SiderealTime, s1.SiderealTime) + o.Longitude - lerp(s0.RightAscension, s1.RightAscension)) * math.Pi / 180
		dec := lerp(s0.Declination, s1.Declination) * math.Pi / 180
		h := math.Asin(math.Sin(phi)*math.Sin(dec) + math.Cos(phi)*math.Cos(dec)*math.Cos(H))
		// Meeus eq. 13.5 gives the azimuth from the south; +180° is from the north.
		az := math.Atan2(math.Sin(H), math.Cos(H)*math.Sin(phi)-math.Tan(dec)*math.Cos(phi))*180/math.Pi + 180
		limb := h*180/math.Pi + 16.0/60
		r := 1.02 / math.Tan((limb+10.3/(limb+5.11))*math.Pi/180) / 60
		return limb+r > sky.Altitude(az)
	}
	var out []Crossing
	prev := above(from)
	for tm := from.Add(5 * time.Second); tm.Before(to); tm = tm.Add(5 * time.Second) {
		if now := above(tm); now != prev {
			d := Setting
			if now {
				d = Rising
			}
			out = append(out, Crossing{Time: tm.Add(-2500 * time.Millisecond), Direction: d})
			prev = now
		}
	}
	return out
}

// TestSkylineEdgeOfWindow: where the Sun sets in the direction of the
// skyline's lowest point, the crossing coincides with the end of the
// search window; every June date must still have exactly one rise and one
// set (a valley skyline, 3° to the north-west).
func TestSkylineEdgeOfWindow(t *testing.T) {
	sky, _ := NewSkyline([]SkyPoint{{0, 3}, {100, 12}, {150, 4}, {176, 25}, {184, 25}, {190, 4}, {260, 15}, {300, 3}})
	o := Observer{Latitude: 47.05, Longitude: 11.2, Elevation: 900, Pressure: 910, Temperature: -5}
	from := time.Date(2027, 6, 1, 0, 0, 0, 0, time.UTC)
	to := from.AddDate(0, 1, 0)
	e, _ := NewEphemeris(from, to)
	cs, err := e.SunSkylineCrossings(o, sky, from, to)
	if err != nil {
		t.Fatal(err)
	}
	if len(cs) != 60 {
		t.Fatalf("%d crossings in June, want 60", len(cs))
	}
	for i, c := range cs {
		if want := [2]Direction{Rising, Setting}[i%2]; c.Direction != want {
			t.Fatalf("%s: %v, want %v", c.Time.Format(time.RFC3339), c.Direction, want)
		}
	}
}
