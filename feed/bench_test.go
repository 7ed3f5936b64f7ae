package feed

import (
	"context"
	"slices"
	"testing"
	"time"

	"heliocal/astro"
	"heliocal/config"
	"heliocal/internal/cputime"
)

// BenchmarkEntriesSiteYear: one site, 400 days of the daily kinds of the
// publish benchmark (sunrise, sunset, civil dawn and dusk, golden hour),
// from a shared ephemeris built outside the loop.
func BenchmarkEntriesSiteYear(b *testing.B) {
	s, first, last, sk, specs := benchDays(b, 48.2, 16.4, "Europe/Vienna", 400)
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

// benchDays is the setup of the benchmarks of one site: the site at lat,
// lon in zone, the local dates first..last from 2027-01-01 over days
// dates, a Sky for them, and the daily kinds of the publish benchmark
// (sunrise, sunset, civil dawn and dusk, golden hour).
func benchDays(b *testing.B, lat, lon float64, zone string, days int) (s *config.Site, first, last time.Time, sk *Sky, daily []config.KindSpec) {
	s = &config.Site{ID: "b", Name: "Bench", Latitude: lat, Longitude: lon}
	if err := s.TimeZone.UnmarshalText([]byte(zone)); err != nil {
		b.Fatal(err)
	}
	first = time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)
	last = first.AddDate(0, 0, days-1)
	sk, err := NewSky(first, last)
	if err != nil {
		b.Fatal(err)
	}
	for _, n := range []string{"sunrise", "sunset", "civil-dawn", "civil-dusk", "golden-hour"} {
		k, _ := config.ParseKind(n)
		daily = append(daily, config.KindSpec{Kind: k})
	}
	return s, first, last, sk, daily
}

// planDays is the setup of the plans' benchmarks: the site at lat, lon
// in zone, the local dates first..last of 400 days from 2027-01-01, and a
// Sky for them and the plans' margin.
func planDays(b *testing.B, lat, lon float64, zone string) (s *config.Site, first, last time.Time, sk *Sky) {
	s = &config.Site{ID: "b", Name: "Bench", Latitude: lat, Longitude: lon}
	if err := s.TimeZone.UnmarshalText([]byte(zone)); err != nil {
		b.Fatal(err)
	}
	first = time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)
	last = first.AddDate(0, 0, 399)
	sk, err := NewSky(first.AddDate(0, 0, -PlanMargin), last.AddDate(0, 0, PlanMargin))
	if err != nil {
		b.Fatal(err)
	}
	return s, first, last, sk
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
	s, first, last, sk := planDays(b, 48.2, 16.4, "Europe/Vienna")
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

// BenchmarkPlansClockTimes: two daily plans with clock times in a zone
// with summer time (Chicago, 400 days from 2027-01-01), one from 22:00 to
// 23:30, one from sunset to 02:00: every entry asks whether the clocks go
// back during it (goBack).
func BenchmarkPlansClockTimes(b *testing.B) {
	s, first, last, sk := planDays(b, 41.9, -87.6, "America/Chicago")
	f := &config.Feed{ID: "bench", Site: "b", Plans: []config.Plan{
		{Title: "Watch", Date: "every day", Start: "22:00", End: "23:30"},
		{Title: "Night", Date: "every day", Start: "sunset", End: "02:00"},
	}}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := sk.Calendar(context.Background(), s, f, first, last, Options{}); err != nil {
			b.Fatal(err)
		}
	}
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

// BenchmarkLampNotesChunks measures what joinLampNotes adds to a site-year
// computed chunk by chunk (EventChunks, as `heliocal events` computes it):
// the daily kinds of BenchmarkEntriesSiteYear and lighting:16h at 60.17° N,
// where no lamps are needed from May into August: the stretch crosses from
// the first chunk into the second, so that the first chunk's note looks
// ahead for its end. Lighting is kept in May alone ("months=may": the
// second chunk has no note of the stretch, which the filter leaves in May)
// or on every date ("unfiltered", as `heliocal events --kinds` gives it:
// the second chunk's note on its first date looks back a date). Each
// iteration computes the year ("year-cpu-ms", joinLampNotes included) and
// then calls joinLampNotes alone on each chunk's notes as computed before
// it ("join-cpu-ms"); "join-%" is the second's share of the first.
func BenchmarkLampNotesChunks(b *testing.B) {
	s, first, last, sk, daily := benchDays(b, 60.17, 24.94, "Europe/Helsinki", 365)
	k, _ := config.ParseKind("lighting:16h")
	p := PlaceOf(s)
	ctx := context.Background()
	for _, v := range []struct {
		name   string
		months []string
	}{{"months=may", []string{"may"}}, {"unfiltered", nil}} {
		specs := append(slices.Clip(daily), config.KindSpec{Kind: k, Months: v.months})
		lamps := kindsNamed(specs, "lighting")
		// each chunk's notes before joinLampNotes: those of its own
		// computation
		type chunk struct {
			first, last time.Time
			notes       []Note
		}
		var chunks []chunk
		for d := first; !d.After(last); d = d.AddDate(0, 0, ChunkDays) {
			end := d.AddDate(0, 0, ChunkDays-1)
			if end.After(last) {
				end = last
			}
			_, _, _, notes, err := sk.computeEvents(ctx, p, specs, d, end, &buffers{})
			if err != nil {
				b.Fatal(err)
			}
			chunks = append(chunks, chunk{d, end, slices.Clone(notes)})
		}
		// the first chunk's note of the stretch, in May, says no end yet
		open := func(n Note) bool {
			return n.Kind.Name == "lighting" && n.State == astro.AlwaysAbove && n.Until.IsZero()
		}
		if len(chunks) != 2 || !slices.ContainsFunc(chunks[0].notes, open) {
			b.Fatalf("%s: %d chunks, the first's notes %v: want 2, and a note of no lamps needed without its end", v.name, len(chunks), chunks[0].notes)
		}
		b.Run(v.name, func(b *testing.B) {
			var year, join time.Duration
			for b.Loop() {
				t0 := cputime.Used()
				if err := sk.EventChunks(ctx, p, specs, first, last, func(Chunk) error { return nil }); err != nil {
					b.Fatal(err)
				}
				t1 := cputime.Used()
				for _, c := range chunks {
					if _, err := sk.joinLampNotes(ctx, p, lamps, c.first, c.last, first, last, slices.Clone(c.notes)); err != nil {
						b.Fatal(err)
					}
				}
				year, join = year+t1-t0, join+cputime.Used()-t1
			}
			b.ReportMetric(float64(year)/1e6/float64(b.N), "year-cpu-ms")
			b.ReportMetric(float64(join)/1e6/float64(b.N), "join-cpu-ms")
			b.ReportMetric(float64(join)/float64(year)*100, "join-%")
		})
	}
}
