package astro

import (
	"context"
	"testing"
	"time"
)

// BenchmarkMoonSiteYear: moonrise, moonset and dark-sky windows (Moon
// down, Sun below −18°) for one site and one year, with the shared Moon
// track built outside the loop. Reports ns per event (rises, sets and
// windows).
func BenchmarkMoonSiteYear(b *testing.B) {
	from := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)
	to := from.AddDate(1, 0, 0)
	me, err := NewMoonEphemeris(from, to)
	if err != nil {
		b.Fatal(err)
	}
	o := Observer{Latitude: 48.2, Longitude: 16.4, Elevation: 180}
	loc := time.FixedZone("UTC+1", 3600)
	b.ReportAllocs()
	events := 0
	for b.Loop() {
		cs, err := me.MoonRiseSet(o, from, to)
		if err != nil {
			b.Fatal(err)
		}
		nights, err := me.DarkWindows(context.Background(), o, loc, from, to.AddDate(0, 0, -1), 0)
		if err != nil {
			b.Fatal(err)
		}
		events = len(cs)
		for _, n := range nights {
			events += len(n.Windows)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(events), "ns/event")
	b.ReportMetric(float64(events), "events")
}

// BenchmarkMoonPhases: the principal phases of one year (about 50).
func BenchmarkMoonPhases(b *testing.B) {
	from := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)
	to := from.AddDate(1, 0, 0)
	b.ReportAllocs()
	n := 0
	for b.Loop() {
		ph, err := MoonPhases(from, to)
		if err != nil {
			b.Fatal(err)
		}
		n = len(ph)
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/event")
}

// BenchmarkNewMoonEphemeris: building the shared Moon (and Sun) track for
// one year, the cost paid once for any number of sites.
func BenchmarkNewMoonEphemeris(b *testing.B) {
	from := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := NewMoonEphemeris(from, from.AddDate(1, 0, 0)); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkMoon: one apparent geocentric position (ELP/MPP02, light time,
// nutation).
func BenchmarkMoon(b *testing.B) {
	t := time.Date(2027, 3, 1, 0, 0, 0, 0, time.UTC)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Moon(t); err != nil {
			b.Fatal(err)
		}
		t = t.Add(time.Hour)
	}
}

// BenchmarkMoonFrom: the Moon's topocentric place from a site at one
// instant (ELP/MPP02, nutation, parallax).
func BenchmarkMoonFrom(b *testing.B) {
	o := Observer{Latitude: 48.2, Longitude: 16.4, Elevation: 170}
	t := time.Date(2027, 3, 1, 0, 0, 0, 0, time.UTC)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := MoonFrom(o, t); err != nil {
			b.Fatal(err)
		}
		t = t.Add(time.Minute)
	}
}

// BenchmarkMoonIllumination: direct (MoonIllumination) against interpolated
// (MoonEphemeris.Illumination) illumination of one instant.
func BenchmarkMoonIllumination(b *testing.B) {
	from := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)
	me, err := NewMoonEphemeris(from, from.AddDate(0, 1, 0))
	if err != nil {
		b.Fatal(err)
	}
	b.Run("direct", func(b *testing.B) {
		b.ReportAllocs()
		t := from
		for b.Loop() {
			if _, err := MoonIllumination(t); err != nil {
				b.Fatal(err)
			}
			t = t.Add(time.Minute)
		}
	})
	b.Run("ephemeris", func(b *testing.B) {
		b.ReportAllocs()
		t := from
		for b.Loop() {
			if _, err := me.Illumination(t); err != nil {
				b.Fatal(err)
			}
			t = t.Add(time.Minute)
		}
	})
}
