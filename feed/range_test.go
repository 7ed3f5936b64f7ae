package feed

import (
	"context"
	"testing"
	"time"

	"heliocal/astro"
	"heliocal/config"
)

// TestSupportedRangeEnds computes every kind on the first and the last
// supported dates (1800-01-01 and 2200-12-31, astro.MinTime and MaxTime) and
// the dates next to them, in the zones furthest west and east of UTC: no
// error, and each daily kind has an event or a note on every date (as in
// the zone sweep). Over the whole first and last years the yearly kinds
// give four seasons, four cross-quarter days, both apsides and every Moon
// phase.
func TestSupportedRangeEnds(t *testing.T) {
	var specs []config.KindSpec
	for _, ex := range config.KindExamples {
		if k := mustKinds(t, ex)[0]; !isGroupMember(k.Name) {
			specs = append(specs, config.KindSpec{Kind: k})
		}
	}
	first, last := civil(astro.MinTime()), civil(astro.MaxTime().AddDate(0, 0, -1))
	if first != date("1800-01-01") || last != date("2200-12-31") {
		t.Fatalf("supported dates %s..%s", first.Format(time.DateOnly), last.Format(time.DateOnly))
	}
	ctx := context.Background()
	for _, w := range []struct{ from, to time.Time }{
		{first, date("1800-12-31")}, {date("2200-01-01"), last},
	} {
		sk, err := NewSky(w.from, w.to)
		if err != nil {
			t.Fatalf("%s..%s: %v", w.from.Format(time.DateOnly), w.to.Format(time.DateOnly), err)
		}
		for _, zone := range []string{"Etc/GMT+12", "UTC", "Pacific/Kiritimati"} {
			s := site(t, "edge", 51.5, 0, zone)
			where := zone + " " + w.from.Format("2006")
			// every kind on the three dates at the end of the range
			a, b := w.from, w.from.AddDate(0, 0, 2)
			if w.to == last {
				a, b = last.AddDate(0, 0, -2), last
			}
			events, notes, err := sk.EventsFor(ctx, PlaceOf(s), specs, a, b)
			if err != nil {
				t.Fatalf("%s: %v", where, err)
			}
			checkSweepWindow(t, where, s.TimeZone.Location, events, notes, a, b)
			if _, err := sk.Entries(ctx, s, "edge", specs, a, b); err != nil {
				t.Fatalf("%s: %v", where, err)
			}
			// the yearly kinds over the whole year
			events, _, err = sk.Events(ctx, PlaceOf(s), mustKinds(t, "seasons", "cross-quarter", "perihelion", "aphelion", "moon-phases"), w.from, w.to)
			if err != nil {
				t.Fatalf("%s: %v", where, err)
			}
			n := map[string]int{}
			for _, e := range events {
				n[e.Kind.Name]++
			}
			for _, name := range []string{"march-equinox", "june-solstice", "september-equinox", "december-solstice", "aphelion"} {
				if n[name] != 1 {
					t.Errorf("%s: %d %s", where, n[name], name)
				}
			}
			// the anomalistic year is 25 minutes longer than the calendar
			// year: in 1800 the perihelion falls on 1 January and again on 31
			// December (UTC)
			if n["perihelion"] < 1 || n["perihelion"] > 2 {
				t.Errorf("%s: %d perihelion", where, n["perihelion"])
			}
			if n["cross-quarter"] != 4 || n["full-moon"] < 12 || n["new-moon"] < 12 || n["first-quarter"] < 12 || n["last-quarter"] < 12 {
				t.Errorf("%s: %v", where, n)
			}
		}
	}
}

// A date range that ends before it starts is refused by EventsFor and
// EventChunks alike, with an error naming both dates.
func TestRangeEndsBeforeStart(t *testing.T) {
	s := site(t, "north-field", 47.5, 9.7, "Europe/Zurich")
	sk := sky(t, "2027-03-01", "2027-03-10")
	specs := []config.KindSpec{{Kind: mustKinds(t, "sunrise")[0]}}
	from, to := date("2027-03-05"), date("2027-03-04")
	want := "feed: date range ends (2027-03-04) before it starts (2027-03-05)"
	if _, _, err := sk.EventsFor(context.Background(), PlaceOf(s), specs, from, to); err == nil || err.Error() != want {
		t.Errorf("EventsFor: error %v, want %q", err, want)
	}
	called := false
	err := sk.EventChunks(context.Background(), PlaceOf(s), specs, from, to, func(Chunk) error { called = true; return nil })
	if err == nil || err.Error() != want || called {
		t.Errorf("EventChunks: error %v (chunk handed on: %v), want %q", err, called, want)
	}
}
