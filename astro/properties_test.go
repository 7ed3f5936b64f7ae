package astro

import (
	"context"
	"fmt"
	"math"
	"sync"
	"testing"
	"time"
)

// Properties of the daily events over a grid of sites and a year, which
// hold whatever the reference: a level is crossed alternately upwards and
// downwards; the morning events come in the order astronomical dawn <
// nautical dawn < civil dawn < sunrise < noon < sunset < civil dusk <
// nautical dusk < astronomical dusk; every reported crossing is a real sign
// change of the altitude and none is missed by a brute-force scan; the
// per-date states agree with the altitude through the date.

var (
	propEphOnce sync.Once
	propEph     *Ephemeris
	propEphErr  error
)

func propEphemeris(t *testing.T) *Ephemeris {
	propEphOnce.Do(func() {
		propEph, propEphErr = NewEphemeris(time.Date(2026, 12, 1, 0, 0, 0, 0, time.UTC), time.Date(2029, 2, 1, 0, 0, 0, 0, time.UTC))
	})
	if propEphErr != nil {
		t.Fatal(propEphErr)
	}
	return propEph
}

var (
	gridLatitudes  = []float64{-89, -85, -80, -75, -70, -66.5, -60, -50, -40, -30, -20, -10, 0, 10, 23.4, 35, 45, 48.5, 55, 60, 63, 66, 68, 70, 72, 75, 78, 80, 85, 89}
	gridLongitudes = []float64{-179.9, -100, -3, 0, 45, 120, 179.9}
	dailyAltitudes = []float64{AstronomicalTwilight, NauticalTwilight, CivilTwilight, GoldenHourLow, SunriseAltitude, GoldenHourHigh}
)

// TestCrossingsAlternate checks, for every grid site and threshold over
// 2027, that crossings are strictly increasing and alternate in direction
// (a continuous altitude cannot rise twice through a level without setting
// in between), and that solar noon comes once a day.
func TestCrossingsAlternate(t *testing.T) {
	e := propEphemeris(t)
	from := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)
	to := from.AddDate(1, 0, 0)
	for _, lat := range gridLatitudes {
		for _, lon := range gridLongitudes {
			o := Observer{Latitude: lat, Longitude: lon}
			res, err := e.SunCrossingsMany(o, dailyAltitudes, from, to)
			if err != nil {
				t.Fatal(err)
			}
			for i, cs := range res {
				for j := 1; j < len(cs); j++ {
					if !cs[j].Time.After(cs[j-1].Time) {
						t.Errorf("lat %g lon %g alt %g: crossings not increasing at %s", lat, lon, dailyAltitudes[i], cs[j].Time)
					}
					if cs[j].Direction == cs[j-1].Direction {
						t.Errorf("lat %g lon %g alt %g: two %s crossings in a row at %s and %s", lat, lon, dailyAltitudes[i], cs[j].Direction, cs[j-1].Time, cs[j].Time)
					}
				}
			}
			tr, err := e.SunTransits(o, from, to)
			if err != nil {
				t.Fatal(err)
			}
			if len(tr) < 364 || len(tr) > 366 {
				t.Errorf("lat %g lon %g: %d solar noons in 2027", lat, lon, len(tr))
			}
			for j := 1; j < len(tr); j++ {
				if d := tr[j].Time.Sub(tr[j-1].Time) - 24*time.Hour; d.Abs() > 31*time.Second {
					t.Errorf("lat %g lon %g: solar noons %s and %s are not a solar day apart", lat, lon, tr[j-1].Time, tr[j].Time)
				}
			}
		}
	}
}

// TestDailyOrder checks astronomical dawn < nautical dawn < civil dawn <
// sunrise < noon < sunset < civil dusk < nautical dusk < astronomical dusk
// for the events present between two lower culminations of the Sun, with
// the golden and blue hour bounds in their place, at all grid sites over
// 2027. Near the poles the highest point drifts from the meridian, so
// there risings must precede the highest point and settings follow it; up
// to 60° they must also precede and follow solar noon.
func TestDailyOrder(t *testing.T) {
	e := propEphemeris(t)
	from := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)
	to := from.AddDate(1, 0, 0)
	for _, lat := range gridLatitudes {
		for _, lon := range gridLongitudes {
			o := Observer{Latitude: lat, Longitude: lon}
			res, err := e.SunCrossingsMany(o, dailyAltitudes, from, to)
			if err != nil {
				t.Fatal(err)
			}
			noons, err := e.SunTransits(o, from, to)
			if err != nil {
				t.Fatal(err)
			}
			ext := e.sun.extrema(newSite(o), unixSeconds(from), unixSeconds(to))
			for k := 0; k+2 < len(ext); k++ {
				if ext[k].upper || !ext[k+1].upper {
					continue
				}
				L0, U, L1 := timeFromUnix(ext[k].t), timeFromUnix(ext[k+1].t), timeFromUnix(ext[k+2].t)
				var N time.Time
				for len(noons) > 0 && !noons[0].Time.After(L0) {
					noons = noons[1:]
				}
				if len(noons) > 0 && noons[0].Time.Before(L1) {
					N = noons[0].Time
				}
				var morning, evening []time.Time // by increasing threshold
				for i := range dailyAltitudes {
					for _, c := range res[i] {
						if !c.Time.After(L0) || !c.Time.Before(L1) {
							continue
						}
						if (c.Direction == Rising) != c.Time.Before(U) {
							t.Errorf("lat %g lon %g alt %g: %s at %s on the wrong side of the culmination %s", lat, lon, dailyAltitudes[i], c.Direction, c.Time, U)
						}
						if math.Abs(lat) <= 60 && !N.IsZero() && (c.Direction == Rising) != c.Time.Before(N) {
							t.Errorf("lat %g lon %g alt %g: %s at %s on the wrong side of noon %s", lat, lon, dailyAltitudes[i], c.Direction, c.Time, N)
						}
						if c.Direction == Rising {
							morning = append(morning, c.Time)
						} else {
							evening = append(evening, c.Time)
						}
					}
				}
				for j := 1; j < len(morning); j++ {
					if !morning[j].After(morning[j-1]) {
						t.Errorf("lat %g lon %g: morning events out of order near %s: %v", lat, lon, U, morning)
					}
				}
				for j := 1; j < len(evening); j++ {
					if !evening[j].Before(evening[j-1]) {
						t.Errorf("lat %g lon %g: evening events out of order near %s: %v", lat, lon, U, evening)
					}
				}
			}
		}
	}
}

// TestCrossingsAgainstScan compares the crossings with a brute-force scan
// of the altitude every 2 minutes over 2027 for sites from 89° S to 89° N
// (including ±179.9° of longitude): every scanned sign change must be
// found, every crossing found must be a real sign change (altitude on the
// right sides 0.5 s before and after), and the crossings the scan misses
// must be grazing pairs, closer together than the scan step.
func TestCrossingsAgainstScan(t *testing.T) {
	if testing.Short() {
		t.Skip("brute-force scan")
	}
	e := propEphemeris(t)
	from := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)
	to := from.AddDate(1, 0, 0)
	const step = 120.0
	for _, lat := range []float64{-89.9, -89, -80, -70, -66.5, -45, 0, 35, 48.5, 60, 66, 68, 72, 78, 85, 89, 89.9} {
		for _, lon := range []float64{-179.9, 179.9, 16.4} {
			o := Observer{Latitude: lat, Longitude: lon}
			st := newSite(o)
			res, err := e.SunCrossingsMany(o, dailyAltitudes, from, to)
			if err != nil {
				t.Fatal(err)
			}
			a, b := unixSeconds(from), unixSeconds(to)
			var alts []float64
			for x := a; x <= b; x += step {
				alts = append(alts, e.sun.sinAltitude(st, x))
			}
			for i, h0 := range dailyAltitudes {
				s0 := math.Sin(h0 * deg2rad)
				cs := res[i]
				for _, c := range cs {
					x := unixSeconds(c.Time)
					before := e.sun.sinAltitude(st, x-0.5) - s0
					after := e.sun.sinAltitude(st, x+0.5) - s0
					if (c.Direction == Rising && !(before < 0 && after > 0)) || (c.Direction == Setting && !(before > 0 && after < 0)) {
						t.Errorf("lat %g lon %g alt %g: %s at %s is not a sign change (%.3g, %.3g)", lat, lon, h0, c.Direction, c.Time, before, after)
					}
				}
				// scan
				var scanned []float64
				for k := 1; k < len(alts); k++ {
					if (alts[k-1] < s0) != (alts[k] < s0) {
						scanned = append(scanned, a+float64(k)*step)
					}
				}
				// every scanned change has a crossing in its step
				j := 0
				for _, x := range scanned {
					for j < len(cs) && unixSeconds(cs[j].Time) < x-step {
						j++
					}
					if j == len(cs) || unixSeconds(cs[j].Time) > x {
						t.Errorf("lat %g lon %g alt %g: scan finds a crossing in the 2 min before %s, search does not", lat, lon, h0, timeFromUnix(x))
					}
				}
				if extra := len(cs) - len(scanned); extra != 0 {
					// the extra ones must be pairs closer than the step
					var short int
					for k := 1; k < len(cs); k++ {
						if cs[k].Time.Sub(cs[k-1].Time) < 2*step*time.Second {
							short += 2
						}
					}
					if extra < 0 || extra > short {
						t.Errorf("lat %g lon %g alt %g: %d crossings, scan %d, grazing pairs %d", lat, lon, h0, len(cs), len(scanned), short/2)
					}
				}
			}
		}
	}
}

// TestDayStates checks SunDays at polar and other sites: a date without
// crossings is AlwaysAbove or AlwaysBelow as the altitude says every 30
// minutes through it, and a date with crossings is Crosses. It also checks
// that each date's crossings lie within the local date, for a zone far from
// the site's own (events fall on the neighbouring local date).
func TestDayStates(t *testing.T) {
	e := propEphemeris(t)
	for _, c := range []struct {
		lat, lon float64
		zone     string
	}{
		{78.2, 15.6, "Europe/Oslo"},
		{-77.8, 166.7, "Pacific/Auckland"},
		{89, 0, "UTC"},
		{-89, -179.9, "Pacific/Pago_Pago"},
		{69.6, 18.9, "Europe/Oslo"},
		{64.1, -21.9, "Atlantic/Reykjavik"},
		{51.5, 179.9, "America/Adak"},   // far east of its zone's meridian
		{-14.3, -179.9, "Pacific/Fiji"}, // far west of its zone's meridian
	} {
		loc, err := time.LoadLocation(c.zone)
		if err != nil {
			t.Skipf("time zone database: %v", err)
		}
		o := Observer{Latitude: c.lat, Longitude: c.lon}
		first := time.Date(2027, 1, 1, 0, 0, 0, 0, loc)
		last := time.Date(2027, 12, 31, 0, 0, 0, 0, loc)
		for _, h0 := range []float64{o.RiseSetAltitude(), CivilTwilight, AstronomicalTwilight} {
			days, err := e.SunDays(context.Background(), o, h0, loc, first, last)
			if err != nil {
				t.Fatal(err)
			}
			if len(days) != 365 {
				t.Fatalf("%v: %d days", c, len(days))
			}
			for _, d := range days {
				next := d.Date.AddDate(0, 0, 1)
				for _, x := range append(append([]time.Time{}, d.Rising...), d.Setting...) {
					if x.Before(d.Date) || !x.Before(next) {
						t.Errorf("%v alt %g: event %s outside local date %s", c, h0, x, d.Date)
					}
				}
				n := len(d.Rising) + len(d.Setting)
				if n > 0 {
					if d.State != Crosses {
						t.Errorf("%v alt %g %s: %d crossings but state %s", c, h0, d.Date.Format(time.DateOnly), n, d.State)
					}
					continue
				}
				for x := d.Date; x.Before(next); x = x.Add(30 * time.Minute) {
					h, err := e.SunAltitude(o, x)
					if err != nil {
						t.Fatal(err)
					}
					if (h > h0) != (d.State == AlwaysAbove) || d.State == Crosses {
						t.Errorf("%v alt %g %s: state %s but altitude %.3f° at %s", c, h0, d.Date.Format(time.DateOnly), d.State, h, x)
						break
					}
				}
			}
		}
	}
}

// TestPolarSeasons checks the length of polar day and night at 78.2° N
// (Svalbard) against the textbook geometry, within a day: with the
// declination reaching ±(90° − 78.2° − 0.83°) the midnight sun lasts from
// about 19 April to 23 August and the polar night from about 26 October
// to 16 February (common practice: the almanac dates for Longyearbyen,
// from memory).
func TestPolarSeasons(t *testing.T) {
	e := propEphemeris(t)
	o := Observer{Latitude: 78.2, Longitude: 15.6}
	days, err := e.SunDays(context.Background(), o, o.RiseSetAltitude(), time.UTC, time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC), time.Date(2027, 12, 31, 0, 0, 0, 0, time.UTC))
	if err != nil {
		t.Fatal(err)
	}
	var above, below int
	for _, d := range days {
		switch d.State {
		case AlwaysAbove:
			above++
		case AlwaysBelow:
			below++
		}
	}
	// 19 Apr..23 Aug inclusive is 127 days; 26 Oct..16 Feb is 114 days.
	if above < 124 || above > 130 {
		t.Errorf("midnight sun on %d dates, want about 127", above)
	}
	if below < 110 || below > 118 {
		t.Errorf("polar night on %d dates, want about 114", below)
	}
}

// TestObserverValidation checks that bad observers are refused with an
// error naming the field and the value.
func TestObserverValidation(t *testing.T) {
	e := propEphemeris(t)
	from := time.Date(2027, 6, 1, 0, 0, 0, 0, time.UTC)
	for _, c := range []struct {
		o    Observer
		want string
	}{
		{Observer{Latitude: 95}, "astro: observer latitude 95: must be within -90..90 degrees"},
		{Observer{Latitude: math.NaN()}, "astro: observer latitude NaN: must be within -90..90 degrees"},
		{Observer{Longitude: 200}, "astro: observer longitude 200: must be within -180..180 degrees (east positive)"},
		{Observer{Elevation: 30000}, "astro: observer elevation 30000: must be within -500..20000 metres"},
		{Observer{Horizon: 60}, "astro: observer horizon 60: must be within -5..45 degrees"},
	} {
		_, err := e.SunCrossings(c.o, -6, from, from.AddDate(0, 0, 1))
		if err == nil || err.Error() != c.want {
			t.Errorf("%+v: got %v, want %q", c.o, err, c.want)
		}
	}
	_, err := e.SunCrossings(Observer{}, 91, from, from.AddDate(0, 0, 1))
	if err == nil || err.Error() != "astro: altitude 91: must be within -90..90 degrees" {
		t.Errorf("altitude 91: %v", err)
	}
	if _, err := e.SunCrossings(Observer{}, -6, from.AddDate(5, 0, 0), from.AddDate(5, 0, 1)); err == nil {
		t.Error("query outside the ephemeris: no error")
	} else if got := fmt.Sprint(err); got == "" {
		t.Error("empty error")
	}
}

// TestRiseSetAltitude checks the dip and skyline rules: 1.76′·√h (common
// practice: 100 m gives 17.6′) and, for a skyline, the skyline minus the
// refraction there minus 16′.
func TestRiseSetAltitude(t *testing.T) {
	if got := (Observer{}).RiseSetAltitude(); got != SunriseAltitude {
		t.Errorf("sea level: %g", got)
	}
	if got, want := (Observer{Elevation: 100}).RiseSetAltitude(), -0.8333-17.6/60; math.Abs(got-want) > 1e-9 {
		t.Errorf("100 m: %g, want %g", got, want)
	}
	// Skyline at +2°: refraction about 18′ there (Bennett), so the centre
	// is at about 2° − 18′ − 16′ = 1.43°.
	if got := (Observer{Horizon: 2}).RiseSetAltitude(); math.Abs(got-1.43) > 0.02 {
		t.Errorf("skyline 2°: %g", got)
	}
	// A skyline below −1° (from a summit) takes the refraction at −1°:
	// Bennett's formula (Meeus eq. 16.4) there, cot(−1° + 7.31°/3.4) =
	// 49.82′, holds for any lower skyline, where the formula itself would
	// grow to its pole near −2.5° and turn negative beyond.
	for _, h := range []float64{-1, -1.5, -3, -5} {
		if got, want := (Observer{Horizon: h}).RiseSetAltitude(), h-49.82/60-16.0/60; math.Abs(got-want) > 0.0005 {
			t.Errorf("skyline %g°: %g, want %g", h, got, want)
		}
	}
	// A skyline at 0° with the dip ignored: the standard altitude within 0.01°.
	if got := (Observer{Horizon: 1e-9, Elevation: 500}).RiseSetAltitude(); math.Abs(got-SunriseAltitude) > 0.01 {
		t.Errorf("skyline 0°: %g", got)
	}
}

// TestEphemerisInterpolation measures the interpolated track against the
// direct computation of the apparent Sun and sidereal time at 2,000
// instants: the Greenwich hour angle and the declination within 0.005″
// (0.0003 s of time) and the distance within 1e-8 au.
func TestEphemerisInterpolation(t *testing.T) {
	e := propEphemeris(t)
	a, b := unixSeconds(e.from), unixSeconds(e.to)
	var maxH, maxD, maxR float64
	for i := range 2000 {
		sec := a + (b-a)*(float64(i)+0.37)/2000
		gha, dec, dist := e.sun.at(sec)
		ep := epochOf(sec)
		s := apparentSun(ep.JDE)
		gast := ApparentSiderealTime(ep.JDUT1, ep.JDE) * deg2rad
		dh := math.Abs(math.Remainder(gha-(gast-s.ra), 2*math.Pi)) / arcsec2rad
		dd := math.Abs(dec-s.dec) / arcsec2rad
		dr := math.Abs(dist*earthRadiusKm/auKm - s.r)
		maxH, maxD, maxR = max(maxH, dh), max(maxD, dd), max(maxR, dr)
	}
	t.Logf("interpolation error: hour angle %.2e″, declination %.2e″, distance %.1e au", maxH, maxD, maxR)
	if maxH > 0.005 || maxD > 0.005 || maxR > 1e-8 {
		t.Errorf("interpolation error too large: hour angle %.2e″, declination %.2e″, distance %.1e au", maxH, maxD, maxR)
	}
}

// TestEphemerisLeapSecond checks that the track follows UT1 − UTC through a
// leap second (2016-12-31 23:59:60): the hour angle from the ephemeris
// matches direct computation on both sides within 0.05″. (TT itself steps by
// 1 s there against a time.Time, which moves the Sun by 0.04″; the track
// spreads that over a day: 0.003 s of time at most.)
func TestEphemerisLeapSecond(t *testing.T) {
	e, err := NewEphemeris(time.Date(2016, 12, 20, 0, 0, 0, 0, time.UTC), time.Date(2017, 1, 10, 0, 0, 0, 0, time.UTC))
	if err != nil {
		t.Fatal(err)
	}
	leap := float64(time.Date(2017, 1, 1, 0, 0, 0, 0, time.UTC).Unix())
	for _, d := range []float64{-3600, -1, -0.001, 0, 0.001, 1, 3600} {
		sec := leap + d
		gha, _, _ := e.sun.at(sec)
		ep := epochOf(sec)
		s := apparentSun(ep.JDE)
		gast := ApparentSiderealTime(ep.JDUT1, ep.JDE) * deg2rad
		if dh := math.Abs(math.Remainder(gha-(gast-s.ra), 2*math.Pi)) / arcsec2rad; dh > 0.05 {
			t.Errorf("%+g s from the leap second: hour angle off by %.4f″", d, dh)
		}
	}
}

// TestEphemerisConcurrent checks that one Ephemeris serves goroutines at
// once with the same answers as serially (run with -race to check the
// absence of shared mutable state).
func TestEphemerisConcurrent(t *testing.T) {
	e := propEphemeris(t)
	from := time.Date(2027, 3, 1, 0, 0, 0, 0, time.UTC)
	to := from.AddDate(0, 1, 0)
	sites := []Observer{{Latitude: 48.2, Longitude: 16.4}, {Latitude: -33.9, Longitude: 151.2}, {Latitude: 69.6, Longitude: 18.9}, {Latitude: 0, Longitude: -179.9}}
	want := make([][]Crossing, len(sites))
	for i, o := range sites {
		var err error
		if want[i], err = e.SunCrossings(o, CivilTwilight, from, to); err != nil {
			t.Fatal(err)
		}
	}
	var wg sync.WaitGroup
	errs := make(chan string, 64)
	for g := range 16 {
		wg.Go(func() {
			i := g % len(sites)
			got, err := e.SunCrossings(sites[i], CivilTwilight, from, to)
			if err != nil || len(got) != len(want[i]) {
				errs <- fmt.Sprintf("goroutine %d: %d crossings, want %d (%v)", g, len(got), len(want[i]), err)
				return
			}
			for k := range got {
				if got[k] != want[i][k] {
					errs <- fmt.Sprintf("goroutine %d: crossing %d differs", g, k)
					return
				}
			}
		})
	}
	wg.Wait()
	close(errs)
	for m := range errs {
		t.Error(m)
	}
}
