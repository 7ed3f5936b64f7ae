package feed

import (
	"context"
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
