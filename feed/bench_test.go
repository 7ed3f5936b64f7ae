package feed

import (
	"context"
	"testing"
	"time"

	"heliocal/config"
	"heliocal/internal/cputime"
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

// plansLighting is the setup of the lighting and plans benchmarks: one
// site, a Sky for 400 days (and the plans' margin), and four feeds: "base"
// has the daily kinds of BenchmarkEntriesSiteYear; "with" adds a
// lighting:16h kind (lamps off by 23:00) and three plans (the Saturday
// nearest each new moon from astronomical dusk to 23:30, every Friday from
// 30 min after sunset for 3 h, every 25 April); "lighting" and "plans" add
// one of the two. Each feed is built once here: what a Sky computes once
// for every feed (the Moon's phases of a date rule) and the heap's first
// growth are not a build's cost.
func plansLighting(b *testing.B) (build func(*config.Feed) int, variants []plansVariant) {
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
	build = func(f *config.Feed) int {
		cal, err := sk.Calendar(context.Background(), s, f, first, last, Options{})
		if err != nil {
			b.Fatal(err)
		}
		return len(cal.Entries)
	}
	variants = []plansVariant{{"base", &base}, {"lighting", &lighting}, {"plans", &plans}, {"with", &with}}
	for _, v := range variants {
		build(v.f)
	}
	return build, variants
}

type plansVariant struct {
	name string
	f    *config.Feed
}

// BenchmarkPlansLighting measures each feed of plansLighting on its own:
// time, allocations, entries, and the process's CPU time per build
// (cpu-ms/op), which a busy machine disturbs less than ns/op. To compare
// the variants, BenchmarkPlansLightingAlternating is fairer.
func BenchmarkPlansLighting(b *testing.B) {
	build, variants := plansLighting(b)
	for _, v := range variants {
		b.Run(v.name, func(b *testing.B) {
			var n int
			b.ReportAllocs()
			cpu0 := cputime.Used()
			for b.Loop() {
				n = build(v.f)
			}
			b.ReportMetric(float64(n), "entries")
			b.ReportMetric(float64(cputime.Used()-cpu0)/1e6/float64(b.N), "cpu-ms/op")
		})
	}
}

// BenchmarkPlansLightingAlternating builds the four feeds of plansLighting
// in turn in every iteration (starting with a different one each time), so
// that the machine's load weighs on each alike, and reports each one's
// process CPU time per build ("base-cpu-ms" …) and how much more than the
// base each takes ("with-%": the target is at most 10).
func BenchmarkPlansLightingAlternating(b *testing.B) {
	build, variants := plansLighting(b)
	cpu := make([]time.Duration, len(variants))
	i := 0
	for b.Loop() {
		for j := range variants {
			v := (i + j) % len(variants)
			t0 := cputime.Used()
			build(variants[v].f)
			cpu[v] += cputime.Used() - t0
		}
		i++
	}
	for j, v := range variants {
		b.ReportMetric(float64(cpu[j])/1e6/float64(b.N), v.name+"-cpu-ms")
		if j > 0 {
			b.ReportMetric((float64(cpu[j])/float64(cpu[0])-1)*100, v.name+"-%")
		}
	}
}
