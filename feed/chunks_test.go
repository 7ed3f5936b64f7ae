package feed

import (
	"cmp"
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"slices"
	"sync"
	"testing"
	"time"

	"heliocal/astro"
	"heliocal/config"
)

// Computed chunk by chunk, a long range gives the events and notes of one
// computation over the whole range: same kinds, dates, directions and parts
// in the same order, times within 2 ms (each search solves to 1 ms), at a
// southern site across clock changes and at a polar one with notes.
func TestEventChunksAsWhole(t *testing.T) {
	first, last := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC), time.Date(2028, 6, 30, 0, 0, 0, 0, time.UTC)
	sky, err := NewSky(first, last)
	if err != nil {
		t.Fatal(err)
	}
	var specs []config.KindSpec
	for _, n := range []string{"sunrise", "sunset", "solar-noon", "civil-dusk", "golden-hour", "blue-hour", "seasons", "photoperiod:12h", "moonrise", "dark-window", "moon-phases"} {
		k, err := config.ParseKind(n)
		if err != nil {
			t.Fatal(err)
		}
		specs = append(specs, config.KindSpec{Kind: k})
	}
	for _, site := range []struct {
		lat, lon float64
		zone     string
	}{{-33.45, -70.67, "America/Santiago"}, {69.65, 18.96, "Europe/Oslo"}} {
		loc, err := time.LoadLocation(site.zone)
		if err != nil {
			t.Fatal(err)
		}
		p := Place{Observer: astro.Observer{Latitude: site.lat, Longitude: site.lon}, Location: loc}
		wantEv, wantNotes, err := sky.EventsFor(context.Background(), p, specs, first, last)
		if err != nil {
			t.Fatal(err)
		}
		var gotEv []Event
		var gotNotes []Note
		chunks := 0
		err = sky.EventChunks(context.Background(), p, specs, first, last, func(c Chunk) error {
			chunks++
			if len(c.Order) != len(c.Events) || len(c.Spec) != len(c.Events) {
				t.Fatalf("%s: chunk of %d events with %d in order and %d kinds", site.zone, len(c.Events), len(c.Order), len(c.Spec))
			}
			for o, i := range c.Order {
				// each event's kind is its spec's, or one of a group's
				if g, w := c.Events[i].Kind, specs[c.Spec[o]].Kind; g != w && w.Name != "seasons" && w.Name != "moon-phases" {
					t.Fatalf("%s: a %s event given the kind %s", site.zone, g, w)
				}
			}
			c.Sort()
			gotEv, gotNotes = append(gotEv, c.Events...), append(gotNotes, c.Notes...)
			return nil
		})
		if err != nil {
			t.Fatal(err)
		}
		if chunks != 3 || len(gotEv) != len(wantEv) || len(gotNotes) != len(wantNotes) {
			t.Fatalf("%s: %d chunks, %d events and %d notes, want 3, %d and %d", site.zone, chunks, len(gotEv), len(gotNotes), len(wantEv), len(wantNotes))
		}
		for i, g := range gotEv {
			w := wantEv[i]
			if d := g.Start.Sub(w.Start).Abs(); d > 2*time.Millisecond || g.Kind != w.Kind || !g.Date.Equal(w.Date) || g.Direction != w.Direction || g.Part != w.Part {
				t.Errorf("%s: event %d: %s %s %s, whole range %s %s %s", site.zone, i, g.Kind, g.Date.Format(time.DateOnly), g.Start, w.Kind, w.Date.Format(time.DateOnly), w.Start)
			}
		}
		for i, g := range gotNotes {
			if w := wantNotes[i]; g.Kind != w.Kind || !g.Date.Equal(w.Date) || g.State != w.State {
				t.Errorf("%s: note %d: %+v, whole range %+v", site.zone, i, g, w)
			}
		}
	}
}

// fiveYearsOfSunrise is the setup of the chunk tests: a Sky for 2027–2031
// and sunrise at 47.3° N, 8.5° E in UTC.
func fiveYearsOfSunrise(t *testing.T) (*Sky, Place, []config.KindSpec, time.Time, time.Time) {
	t.Helper()
	first, last := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC), time.Date(2031, 12, 31, 0, 0, 0, 0, time.UTC)
	sky, err := NewSky(first, last)
	if err != nil {
		t.Fatal(err)
	}
	k, err := config.ParseKind("sunrise")
	if err != nil {
		t.Fatal(err)
	}
	specs := []config.KindSpec{{Kind: k}}
	p := Place{Observer: astro.Observer{Latitude: 47.3, Longitude: 8.5}, Location: time.UTC}
	return sky, p, specs, first, last
}

// The chunks reach fn in order of their dates, each with its own dates,
// however many goroutines compute them; an error of fn or a cancelled
// context stops the computation and is returned.
func TestEventChunksOrderAndStop(t *testing.T) {
	sky, p, specs, first, last := fiveYearsOfSunrise(t)
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(4))
	want := first
	err := sky.EventChunks(context.Background(), p, specs, first, last, func(c Chunk) error {
		c.Sort()
		if !c.First.Equal(want) || len(c.Events) == 0 || !c.Events[0].Date.Equal(c.First) || !c.Events[len(c.Events)-1].Date.Equal(c.Last) {
			t.Fatalf("chunk %s..%s (events %d), want it to start on %s", c.First.Format(time.DateOnly), c.Last.Format(time.DateOnly), len(c.Events), want.Format(time.DateOnly))
		}
		want = c.Last.AddDate(0, 0, 1)
		return nil
	})
	if err != nil || !want.Equal(last.AddDate(0, 0, 1)) {
		t.Fatalf("ended at %s with %v", want.Format(time.DateOnly), err)
	}
	stop := errors.New("stop")
	n := 0
	err = sky.EventChunks(context.Background(), p, specs, first, last, func(Chunk) error {
		if n++; n == 2 {
			return stop
		}
		return nil
	})
	if err != stop || n != 2 {
		t.Errorf("fn's error: got %v after %d chunks", err, n)
	}
	ctx, cancel := context.WithCancel(context.Background())
	n = 0
	err = sky.EventChunks(ctx, p, specs, first, last, func(Chunk) error {
		if n++; n == 3 {
			cancel()
		}
		return nil
	})
	if !errors.Is(err, context.Canceled) || n != 3 {
		t.Errorf("cancelled: got %v after %d chunks", err, n)
	}
}

// PreparedChunks calls prepare with each chunk on the goroutine that
// computed it and fn then in order with the same chunk and the T that
// prepare filled, one T per goroutine reused from chunk to chunk; an error
// of prepare is returned in its chunk's turn, after fn has had the chunks
// before it.
func TestPreparedChunks(t *testing.T) {
	sky, p, specs, first, last := fiveYearsOfSunrise(t)
	const procs = 3
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(procs))
	// made is what prepare did: the chunk's first date and its first
	// event's start, and the chunks prepared with the same T
	type made struct {
		first, start time.Time
		chunks       int
	}
	var mu sync.Mutex
	ts := map[*made]bool{}
	prepare := func(c *Chunk, m *made) error {
		c.Sort()
		m.first, m.start = c.First, c.Events[0].Start
		m.chunks++
		mu.Lock()
		ts[m] = true
		mu.Unlock()
		return nil
	}
	want, chunks := first, 0
	err := PreparedChunks(context.Background(), sky, p, specs, first, last, prepare, func(c Chunk, m *made) error {
		if !c.First.Equal(want) || !m.first.Equal(c.First) {
			t.Fatalf("chunk %d: fn has the chunk of %s and what prepare made of %s, want %s", chunks, c.First.Format(time.DateOnly), m.first.Format(time.DateOnly), want.Format(time.DateOnly))
		}
		if c.Order != nil || !c.Events[0].Start.Equal(m.start) {
			t.Fatalf("chunk %d: fn does not have the chunk as prepare left it", chunks)
		}
		want, chunks = c.Last.AddDate(0, 0, 1), chunks+1
		return nil
	})
	if err != nil || !want.Equal(last.AddDate(0, 0, 1)) {
		t.Fatalf("ended at %s with %v", want.Format(time.DateOnly), err)
	}
	n := 0
	for m := range ts {
		n += m.chunks
	}
	if len(ts) > procs || n != chunks {
		t.Errorf("%d chunks prepared with %d Ts, want %d chunks with %d at most", n, len(ts), chunks, procs)
	}
	stop := errors.New("stop")
	chunks = 0
	err = PreparedChunks(context.Background(), sky, p, specs, first, last, func(c *Chunk, _ *struct{}) error {
		if c.First.Year() == 2029 {
			return stop
		}
		return nil
	}, func(c Chunk, _ *struct{}) error {
		if c.First.Year() >= 2029 {
			t.Errorf("fn has the chunk of %s after prepare failed", c.First.Format(time.DateOnly))
		}
		chunks++
		return nil
	})
	// the chunks of ChunkDays (184) dates before 2029: from 2027-01-01,
	// 2027-07-04, 2028-01-04 and 2028-07-06 (the next from 2029-01-06)
	if err != stop || chunks != 4 {
		t.Errorf("prepare's error: got %v after %d chunks, want it after 4", err, chunks)
	}
}

// sortByKey and orderRuns give what a stable sort gives, for runs in
// order, out of order, empty, with ties within and across runs, with keys
// bunched in a few places (crowded buckets), and more runs than
// orderRuns's ring holds.
func TestSortByKey(t *testing.T) {
	type item struct{ key, id int64 }
	var scratch orderScratch
	r := rand.New(rand.NewPCG(1, 2))
	for trial := range 500 {
		var xs []item
		bounds := []int32{0}
		runs := r.IntN(14)
		if trial%7 == 3 {
			runs = r.IntN(50)
		}
		for run := range runs {
			n := r.IntN(30)
			k := int64(r.IntN(50))
			for range n {
				switch {
				case trial%3 == 0 && run%2 == 1:
					k = int64(r.IntN(50)) // out of order
				case trial%5 == 1:
					k = int64(r.IntN(3)) * 1e9 // bunched
				case trial%5 == 2:
					k = int64(r.IntN(200)) // a crowd in one bucket
					if r.IntN(10) == 0 {
						k = 1e12
					}
				default:
					k += int64(r.IntN(3))
				}
				xs = append(xs, item{k, int64(len(xs))})
			}
			bounds = append(bounds, int32(len(xs)))
		}
		want := slices.Clone(xs)
		slices.SortStableFunc(want, func(a, b item) int { return cmp.Compare(a.key, b.key) })
		got := sortByKey(slices.Clone(xs), nil, func(x *item) int64 { return x.key })
		if !slices.Equal(got, want) {
			t.Fatalf("runs %v of %v: sorted %v, want %v", bounds, xs, got, want)
		}
		events := make([]Event, len(xs))
		for i, x := range xs {
			events[i].Start = time.Unix(0, x.key)
		}
		got = got[:0]
		order, runOf := orderRuns(events, bounds, &scratch)
		for o, i := range order {
			got = append(got, xs[i])
			if r := runOf[o]; i < bounds[r] || i >= bounds[r+1] {
				t.Fatalf("runs %v of %v: position %d given run %d", bounds, xs, i, r)
			}
		}
		if !slices.Equal(got, want) {
			t.Fatalf("runs %v of %v: merged %v, want %v", bounds, xs, got, want)
		}
	}
	// keys as far apart as int64 allows (the buckets' width is then 2⁶³)
	xs := []item{{math.MaxInt64, 0}, {0, 1}, {math.MinInt64, 2}, {math.MaxInt64, 3}, {math.MinInt64, 4}}
	want := []item{{math.MinInt64, 2}, {math.MinInt64, 4}, {0, 1}, {math.MaxInt64, 0}, {math.MaxInt64, 3}}
	if got := sortByKey(slices.Clone(xs), nil, func(x *item) int64 { return x.key }); !slices.Equal(got, want) {
		t.Errorf("extreme keys: %v, want %v", got, want)
	}
}

// orderRuns gives what a stable sort gives for runs that take turns in the
// same order day after day (a site's daily kinds), with the order broken
// now and then: a kind missing a day, two kinds swapping places, a tie
// with a kind after or before, a kind with two events a day, the kinds'
// days drifting past each other, a run out of order late in the span.
func TestOrderRunsDaily(t *testing.T) {
	var scratch orderScratch
	r := rand.New(rand.NewPCG(3, 4))
	const day = int64(86400e9)
	for trial := range 300 {
		kinds := 1 + r.IntN(14)
		days := 1 + r.IntN(120)
		offsets := make([]int64, kinds) // each kind's time of day
		for k := range offsets {
			offsets[k] = r.Int64N(day)
		}
		var keys []int64
		bounds := []int32{0}
		for k := range kinds {
			twice := r.IntN(4) == 0
			drift := int64(0)
			if trial%4 == 1 {
				drift = r.Int64N(day/20) - day/40
			}
			for d := range int64(days) {
				if r.IntN(30) == 0 {
					continue // no event this day
				}
				at := d*day + offsets[k] + d*drift
				switch r.IntN(40) {
				case 0: // a tie with a kind before or after
					at = d*day + offsets[r.IntN(kinds)]
				case 1: // a swap of places
					at += r.Int64N(day/4) - day/8
				}
				keys = append(keys, at)
				if twice {
					keys = append(keys, at+day/3)
				}
			}
			if trial%10 == 7 && k == kinds-1 && len(keys) > int(bounds[k])+3 {
				keys[len(keys)-2], keys[len(keys)-1] = keys[len(keys)-1]+1, keys[len(keys)-2] // out of order
			}
			bounds = append(bounds, int32(len(keys)))
		}
		events := make([]Event, len(keys))
		for i, k := range keys {
			events[i].Start = time.Unix(0, k)
		}
		want := make([]int32, len(keys))
		for i := range want {
			want[i] = int32(i)
		}
		slices.SortStableFunc(want, func(a, b int32) int { return cmp.Compare(keys[a], keys[b]) })
		order, runOf := orderRuns(events, bounds, &scratch)
		if !slices.Equal(order, want) {
			t.Fatalf("trial %d, runs %v of %v: order %v, want %v", trial, bounds, keys, order, want)
		}
		for o, i := range order {
			if r := runOf[o]; i < bounds[r] || i >= bounds[r+1] {
				t.Fatalf("trial %d, runs %v: position %d given run %d", trial, bounds, i, r)
			}
		}
	}
}

// A stretch of dates that need no lamps gets one note saying until when,
// however the range is cut into chunks: computed chunk by chunk, the
// lighting notes are those of one computation over the whole range. At
// 48.2° N the natural day passes 16 h around the June solstice only (about
// 16 h 05 min on 21 June: USNO duration-of-daylight tables for 48° N, from
// memory), in a stretch a chunk boundary falls in when the range starts on
// 20 December; at 89.5° N the midnight Sun lasts longer than a chunk (about
// 190 days near the pole, common knowledge), so its stretch spans three.
func TestEventChunksLampNotesAsWhole(t *testing.T) {
	k, err := config.ParseKind("lighting:16h")
	if err != nil {
		t.Fatal(err)
	}
	specs := []config.KindSpec{{Kind: k}}
	for _, c := range []struct {
		lat, lon    float64
		zone        string
		first, last time.Time
		solstice    time.Time // a date the stretch must contain
	}{
		{48.2, 16.4, "Europe/Vienna", time.Date(2026, 12, 20, 0, 0, 0, 0, time.UTC), time.Date(2027, 12, 31, 0, 0, 0, 0, time.UTC), time.Date(2027, 6, 21, 0, 0, 0, 0, time.UTC)},
		{89.5, 0, "UTC", time.Date(2026, 12, 20, 0, 0, 0, 0, time.UTC), time.Date(2028, 1, 31, 0, 0, 0, 0, time.UTC), time.Date(2027, 6, 21, 0, 0, 0, 0, time.UTC)},
		// the stretch outlasts the range: no until, one note
		{89.5, 0, "UTC", time.Date(2026, 12, 20, 0, 0, 0, 0, time.UTC), time.Date(2027, 8, 31, 0, 0, 0, 0, time.UTC), time.Date(2027, 6, 21, 0, 0, 0, 0, time.UTC)},
	} {
		loc, err := time.LoadLocation(c.zone)
		if err != nil {
			t.Fatal(err)
		}
		sky, err := NewSky(c.first, c.last)
		if err != nil {
			t.Fatal(err)
		}
		p := Place{Observer: astro.Observer{Latitude: c.lat, Longitude: c.lon}, Location: loc}
		_, want, err := sky.EventsFor(context.Background(), p, specs, c.first, c.last)
		if err != nil {
			t.Fatal(err)
		}
		var got []Note
		chunks := 0
		err = sky.EventChunks(context.Background(), p, specs, c.first, c.last, func(ch Chunk) error {
			chunks++
			got = append(got, ch.Notes...)
			return nil
		})
		if err != nil {
			t.Fatal(err)
		}
		name := c.zone + " " + c.last.Format(time.DateOnly)
		if chunks < 2 {
			t.Fatalf("%s: %d chunk, want the range cut", name, chunks)
		}
		if len(got) != len(want) {
			t.Fatalf("%s: chunked notes %+v, whole range %+v", name, got, want)
		}
		for i := range got {
			if g, w := got[i], want[i]; g.Kind != w.Kind || !g.Date.Equal(w.Date) || g.State != w.State || !g.Until.Equal(w.Until) {
				t.Errorf("%s: note %d: %s %s until %s, whole range %s %s until %s", name, i,
					g.Kind, g.Date.Format(time.DateOnly), g.Until.Format(time.DateOnly), w.Kind, w.Date.Format(time.DateOnly), w.Until.Format(time.DateOnly))
			}
		}
		// the whole range's own answer: one stretch around the solstice
		found := false
		for _, n := range want {
			if n.State == astro.AlwaysAbove && !n.Date.After(c.solstice) && (n.Until.IsZero() || n.Until.After(c.solstice)) {
				found = true
			}
		}
		if !found {
			t.Errorf("%s: no stretch without lamps around %s: %+v", name, c.solstice.Format(time.DateOnly), want)
		}
	}
}

// With a filter too (months, weekdays) the lighting notes computed chunk
// by chunk are those of one computation over the whole range: a stretch's
// note on the first date of it the filter keeps, saying until when, however
// the chunk boundaries fall in the stretch (at 60.17° N the natural day is
// over 16 h from about mid-May to the end of July, from memory; at 89.5° N
// the midnight Sun outlasts a chunk).
func TestEventChunksFilteredLampNotesAsWhole(t *testing.T) {
	k, err := config.ParseKind("lighting:16h")
	if err != nil {
		t.Fatal(err)
	}
	first, last := time.Date(2026, 12, 20, 0, 0, 0, 0, time.UTC), time.Date(2028, 1, 31, 0, 0, 0, 0, time.UTC)
	sky, err := NewSky(first, last)
	if err != nil {
		t.Fatal(err)
	}
	stretches := 0
	for _, lat := range []float64{60.17, 89.5} {
		p := Place{Observer: astro.Observer{Latitude: lat, Longitude: 24.94}, Location: time.UTC}
		for _, spec := range []config.KindSpec{
			{Kind: k, Months: []string{"may"}},
			{Kind: k, Months: []string{"jul"}},
			{Kind: k, Months: []string{"jun", "aug"}},
			{Kind: k, Weekdays: []string{"sat"}},
		} {
			name := fmt.Sprintf("%g° N, months %v, weekdays %v", lat, spec.Months, spec.Weekdays)
			specs := []config.KindSpec{spec}
			_, want, err := sky.EventsFor(context.Background(), p, specs, first, last)
			if err != nil {
				t.Fatal(err)
			}
			var got []Note
			err = sky.EventChunks(context.Background(), p, specs, first, last, func(ch Chunk) error {
				got = append(got, ch.Notes...)
				return nil
			})
			if err != nil {
				t.Fatal(err)
			}
			if len(got) != len(want) {
				t.Errorf("%s: chunked notes %+v, whole range %+v", name, got, want)
				continue
			}
			for i := range got {
				if g, w := got[i], want[i]; g.Kind != w.Kind || !g.Date.Equal(w.Date) || g.State != w.State || !g.Until.Equal(w.Until) {
					t.Errorf("%s: note %d: %s %s until %s, whole range %s %s until %s", name, i,
						g.Kind, g.Date.Format(time.DateOnly), g.Until.Format(time.DateOnly), w.Kind, w.Date.Format(time.DateOnly), w.Until.Format(time.DateOnly))
				}
				if got[i].State == astro.AlwaysAbove {
					stretches++
				}
			}
		}
	}
	if stretches < 8 {
		t.Errorf("%d notes of no lamps needed in all; want at least one per place and filter", stretches)
	}
}

// dayStarts follows a zone's midnights 24 h apart between clock changes:
// it must give what midnight (astro.DateStart) gives for every date,
// across clock changes at midnight (America/Havana, America/Santiago,
// America/Sao_Paulo), half-hour shifts (Australia/Lord_Howe), a date that
// does not exist (Pacific/Apia, 2011-12-30) and zones without changes.
func TestDayStartsAsMidnight(t *testing.T) {
	for _, z := range []string{"UTC", "America/Havana", "America/Santiago", "America/Sao_Paulo", "Europe/Zurich",
		"Australia/Lord_Howe", "Pacific/Apia", "Asia/Tehran", "Africa/Casablanca", "Etc/GMT+5"} {
		loc, err := time.LoadLocation(z)
		if err != nil {
			t.Fatal(err)
		}
		c := &collector{p: Place{Location: loc}, first: time.Date(1990, 1, 1, 0, 0, 0, 0, time.UTC), last: time.Date(2045, 12, 31, 0, 0, 0, 0, time.UTC)}
		for i, got := range c.dayStarts() {
			d := c.first.AddDate(0, 0, i-1)
			if want := midnight(d, loc); !got.Equal(want) {
				t.Fatalf("%s, %s: start %v, want %v", z, d.Format(time.DateOnly), got.In(loc), want.In(loc))
			}
		}
	}
}
