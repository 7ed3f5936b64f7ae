package astro

import (
	"testing"
	"time"
)

// Benchmarks of the speed targets. The shared ephemeris is built
// once, outside the timed loop.

// siteYearAltitudes are the thresholds of the daily kinds: sunrise/sunset,
// civil, nautical and astronomical twilight, golden hour (+6°, −4°) and
// blue hour (−4°, −6°: shared with the previous ones).
func siteYearAltitudes(o Observer) []float64 {
	return []float64{o.RiseSetAltitude(), CivilTwilight, NauticalTwilight, AstronomicalTwilight, GoldenHourHigh, GoldenHourLow}
}

func benchEphemeris(b *testing.B) (*Ephemeris, time.Time, time.Time) {
	from := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)
	to := from.AddDate(1, 0, 0)
	e, err := NewEphemeris(from, to)
	if err != nil {
		b.Fatal(err)
	}
	return e, from, to
}

// siteYear computes all daily kinds of one site for a year and returns the
// number of events.
func siteYear(b *testing.B, e *Ephemeris, o Observer, from, to time.Time) int {
	res, err := e.SunCrossingsMany(o, siteYearAltitudes(o), from, to)
	if err != nil {
		b.Fatal(err)
	}
	tr, err := e.SunTransits(o, from, to)
	if err != nil {
		b.Fatal(err)
	}
	n := len(tr)
	for _, cs := range res {
		n += len(cs)
	}
	return n
}

// BenchmarkSiteYear: sunrise, sunset, solar noon, three dawns, three dusks,
// golden and blue hour bounds for one site (48.2° N, 16.4° E) over 2027.
func BenchmarkSiteYear(b *testing.B) {
	e, from, to := benchEphemeris(b)
	o := Observer{Latitude: 48.2, Longitude: 16.4, Elevation: 180}
	b.ReportAllocs()
	var n int
	for b.Loop() {
		n = siteYear(b, e, o, from, to)
	}
	b.ReportMetric(float64(n), "events/op")
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/event")
}

// BenchmarkThousandSitesYear: the same for 1,000 sites spread over
// latitudes −60..60 and all longitudes, sharing one ephemeris.
func BenchmarkThousandSitesYear(b *testing.B) {
	e, from, to := benchEphemeris(b)
	sites := make([]Observer, 1000)
	for i := range sites {
		sites[i] = Observer{Latitude: -60 + 120*float64(i%97)/96, Longitude: -180 + 360*float64(i)/1000}
	}
	b.ReportAllocs()
	var n int
	for b.Loop() {
		n = 0
		for _, o := range sites {
			n += siteYear(b, e, o, from, to)
		}
	}
	b.ReportMetric(float64(n), "events/op")
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/event")
}

// BenchmarkSeasons: the four equinoxes and solstices of one year.
func BenchmarkSeasons(b *testing.B) {
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Seasons(2027); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkNewEphemerisYear: building the shared ephemeris for a year
// (2027: its days read from the shipped table).
func BenchmarkNewEphemerisYear(b *testing.B) {
	from := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := NewEphemeris(from, from.AddDate(1, 0, 0)); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkNewEphemerisYearComputed: the same for a year outside the
// table (2150), every day computed (VSOP87D, nutation).
func BenchmarkNewEphemerisYearComputed(b *testing.B) {
	from := time.Date(2150, 1, 1, 0, 0, 0, 0, time.UTC)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := NewEphemeris(from, from.AddDate(1, 0, 0)); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkSunFrom: the Sun's altitude and azimuth from a site at one
// instant, by SunFrom ("direct": VSOP87D, nutation, parallax, refraction)
// and, as a library user had to before SunFrom, by an Ephemeris built for
// that instant and queried once ("ephemeris"), or built once for a month
// and queried at an instant after another ("ephemeris-month").
func BenchmarkSunFrom(b *testing.B) {
	o := Observer{Latitude: 48.2, Longitude: 16.4, Elevation: 170}
	from := time.Date(2027, 3, 1, 0, 0, 0, 0, time.UTC)
	b.Run("direct", func(b *testing.B) {
		b.ReportAllocs()
		t := from
		for b.Loop() {
			if _, err := SunFrom(o, t); err != nil {
				b.Fatal(err)
			}
			t = t.Add(time.Minute)
		}
	})
	b.Run("ephemeris", func(b *testing.B) {
		b.ReportAllocs()
		t := from
		for b.Loop() {
			e, err := NewEphemeris(t, t)
			if err != nil {
				b.Fatal(err)
			}
			if _, err := e.SunAltitude(o, t); err != nil {
				b.Fatal(err)
			}
			if _, err := e.SunAzimuth(o, t); err != nil {
				b.Fatal(err)
			}
			t = t.Add(time.Minute)
		}
	})
	b.Run("ephemeris-month", func(b *testing.B) {
		end := from.AddDate(0, 1, 0)
		e, err := NewEphemeris(from, end)
		if err != nil {
			b.Fatal(err)
		}
		b.ReportAllocs()
		t := from
		for b.Loop() {
			if _, err := e.SunAltitude(o, t); err != nil {
				b.Fatal(err)
			}
			if _, err := e.SunAzimuth(o, t); err != nil {
				b.Fatal(err)
			}
			if t = t.Add(time.Minute); t.After(end) {
				t = from
			}
		}
	})
}
