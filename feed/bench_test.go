package feed

import (
	"context"
	"testing"
	"time"

	"heliocal/config"
)

// BenchmarkEntriesSiteYear: one site, 400 days of the daily kinds of the
// publish benchmark (sunrise, sunset, civil dawn and dusk, golden hour),
// from a shared ephemeris built outside the loop.
func BenchmarkEntriesSiteYear(b *testing.B) {
	s := &config.Site{ID: "b", Name: "Bench", Latitude: 48.2, Longitude: 16.4}
	if err := s.TimeZone.UnmarshalText([]byte("Europe/Vienna")); err != nil {
		b.Fatal(err)
	}
	first := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)
	last := first.AddDate(0, 0, 399)
	sk, err := NewSky(first, last)
	if err != nil {
		b.Fatal(err)
	}
	var specs []config.KindSpec
	for _, n := range []string{"sunrise", "sunset", "civil-dawn", "civil-dusk", "golden-hour"} {
		k, _ := config.ParseKind(n)
		specs = append(specs, config.KindSpec{Kind: k})
	}
	var n int
	b.ReportAllocs()
	for b.Loop() {
		es, err := sk.Entries(context.Background(), s, "bench", specs, first, last)
		if err != nil {
			b.Fatal(err)
		}
		n = len(es)
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/entry")
}
