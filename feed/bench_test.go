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

// BenchmarkPlansLighting measures what lighting and plans add to a
// site-year's entries: "base" is a feed of the daily kinds of
// BenchmarkEntriesSiteYear over 400 days; "with" adds a lighting:16h kind
// and three plans (the Saturday nearest each new moon from astronomical dusk
// to 23:30, every Friday from 30 min after sunset for 3 h, every 25 April);
// "lighting" and "plans" add one of the two.
// Compare the two cpu-ms/op (the process's CPU time per build, which a busy
// machine disturbs less than ns/op).
func BenchmarkPlansLighting(b *testing.B) {
	s := &config.Site{ID: "b", Name: "Bench", Latitude: 48.2, Longitude: 16.4}
	if err := s.TimeZone.UnmarshalText([]byte("Europe/Vienna")); err != nil {
		b.Fatal(err)
	}
	first := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)
	last := first.AddDate(0, 0, 399)
	sk, err := NewSky(first.AddDate(0, 0, -PlanMargin), last.AddDate(0, 0, PlanMargin))
	if err != nil {
		b.Fatal(err)
	}
	base := config.Feed{ID: "bench", Site: "b"}
	for _, n := range []string{"sunrise", "sunset", "civil-dawn", "civil-dusk", "golden-hour"} {
		k, _ := config.ParseKind(n)
		base.Kinds = append(base.Kinds, config.KindSpec{Kind: k})
	}
	with := base
	k, _ := config.ParseKind("lighting:16h")
	with.Kinds = append(with.Kinds[:len(with.Kinds):len(with.Kinds)], config.KindSpec{Kind: k, LatestOff: "23:00"})
	with.Plans = []config.Plan{
		{Title: "Public night", Date: "saturday nearest new-moon", Start: "astronomical-dusk", End: "23:30"},
		{Title: "Film", Date: "every friday", Start: "sunset+30m", For: config.Duration(3 * time.Hour)},
		{Title: "Frost", Date: "every 04-25"},
	}
	lighting, plans := with, with
	lighting.Plans = nil
	plans.Kinds = base.Kinds
	for _, tc := range []struct {
		name string
		f    *config.Feed
	}{{"base", &base}, {"lighting", &lighting}, {"plans", &plans}, {"with", &with}} {
		f := tc.f
		b.Run(tc.name, func(b *testing.B) {
			var n int
			b.ReportAllocs()
			cpu0 := cpuTime()
			for b.Loop() {
				cal, err := sk.Calendar(context.Background(), s, f, first, last, Options{})
				if err != nil {
					b.Fatal(err)
				}
				n = len(cal.Entries)
			}
			b.ReportMetric(float64(n), "entries")
			b.ReportMetric(float64(cpuTime()-cpu0)/1e6/float64(b.N), "cpu-ms/op")
		})
	}
}
