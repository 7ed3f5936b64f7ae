package astro

import (
	"math"
	"testing"
	"time"
)

// benchSites returns n sites spread over the Earth (a Fibonacci lattice).
func benchSites(n int) []Observer {
	out := make([]Observer, n)
	for i := range out {
		z := 1 - (2*float64(i)+1)/float64(n)
		lon := norm360(float64(i)*137.50776405003785) - 180
		out[i] = Observer{Latitude: math.Asin(z) * rad2deg, Longitude: lon, Elevation: float64(i % 500)}
	}
	return out
}

// BenchmarkEclipses1000Sites10Years is the whole job for 1,000 sites over
// ten years (2026–2035): the global search for solar and lunar eclipses
// once, then the local circumstances of every eclipse at every site and the
// visibility test.
func BenchmarkEclipses1000Sites10Years(b *testing.B) {
	sites := benchSites(1000)
	from, to := time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC), time.Date(2036, 1, 1, 0, 0, 0, 0, time.UTC)
	b.ReportAllocs()
	for b.Loop() {
		se, err := SolarEclipses(from, to)
		if err != nil {
			b.Fatal(err)
		}
		le, err := LunarEclipses(from, to)
		if err != nil {
			b.Fatal(err)
		}
		seen := 0
		for _, o := range sites {
			for _, e := range se {
				if l, ok := e.Local(o); ok && l.Visible() {
					seen++
				}
			}
			for _, e := range le {
				if l := e.Local(o); l.Visible() {
					seen++
				}
			}
		}
		b.ReportMetric(float64(seen), "visible")
	}
}

// BenchmarkEclipseSearch10Years is the global search alone.
func BenchmarkEclipseSearch10Years(b *testing.B) {
	from, to := time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC), time.Date(2036, 1, 1, 0, 0, 0, 0, time.UTC)
	for b.Loop() {
		if _, err := SolarEclipses(from, to); err != nil {
			b.Fatal(err)
		}
		if _, err := LunarEclipses(from, to); err != nil {
			b.Fatal(err)
		}
	}
}
