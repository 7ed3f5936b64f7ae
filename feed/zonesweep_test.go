package feed

import (
	"archive/zip"
	"context"
	"fmt"
	"math"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	"heliocal/astro"
	"heliocal/config"
)

// tzZones lists every zone of the tz database that Go's time package reads:
// the names in the toolchain's $GOROOT/lib/time/zoneinfo.zip (the data that
// time/tzdata embeds), aliases and legacy names included.
func tzZones(t *testing.T) []string {
	t.Helper()
	goroot, err := exec.Command("go", "env", "GOROOT").Output()
	if err != nil {
		t.Fatalf("go env GOROOT: %v", err)
	}
	zr, err := zip.OpenReader(filepath.Join(strings.TrimSpace(string(goroot)), "lib", "time", "zoneinfo.zip"))
	if err != nil {
		t.Fatal(err)
	}
	defer zr.Close()
	var names []string
	for _, f := range zr.File {
		if !strings.HasSuffix(f.Name, "/") {
			names = append(names, f.Name)
		}
	}
	if len(names) < 400 {
		t.Fatalf("only %d zones in the tz database", len(names))
	}
	return names
}

// clockChanges returns the instants in [from, to) at which loc's offset or
// abbreviation changes, bounded in number.
func clockChanges(loc *time.Location, from, to time.Time) []time.Time {
	var out []time.Time
	t := from
	for range 64 {
		_, end := t.In(loc).ZoneBounds()
		if end.IsZero() || !end.Before(to) {
			break
		}
		out = append(out, end)
		t = end
	}
	return out
}

// sweepLatitudes are the sites' latitudes, used in turn zone after zone:
// the tropics, mid and high latitudes of both hemispheres and polar sites
// (midnight Sun, polar night, no astronomical night).
var sweepLatitudes = []float64{0, 23.1, -33.4, 47.5, 60, -45, 69.7, 37.7, -54.8, 78.2, 12, -77.8, 52}

// dailyKinds are the kinds with an event (or a note) on every local date.
var dailyKinds = map[string]bool{
	"sunrise": true, "sunset": true, "civil-dawn": true, "civil-dusk": true, "nautical-dawn": true,
	"nautical-dusk": true, "astronomical-dawn": true, "astronomical-dusk": true, "sun-altitude": true,
	"moonrise": true, "moonset": true, "dark-window": true, "solar-noon": true,
	"moon-transit": true, "golden-hour": true, "blue-hour": true,
}

// TestZoneSweep computes every kind, in every zone of the tz database, on
// the local dates around each of the zone's clock changes in 2026–2027 (the
// date of the change, the day before and the day after) and on two ordinary
// dates. No computation may hang; every date has its events or a note for
// each daily kind, once (no date skipped or doubled); every event belongs to
// the local date of its start (a dark window to the date of its evening);
// and the daily summary gives exactly one entry per date.
func TestZoneSweep(t *testing.T) {
	winFrom := time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)
	winTo := time.Date(2028, 1, 1, 0, 0, 0, 0, time.UTC)
	sk, err := NewSky(winFrom.AddDate(0, 0, -2), winTo.AddDate(0, 0, 2))
	if err != nil {
		t.Fatal(err)
	}
	var specs []config.KindSpec
	for _, ex := range config.KindExamples {
		k, err := config.ParseKind(ex)
		if err != nil {
			t.Fatal(err)
		}
		// the groups (seasons, moon-phases) give their members' events
		if k.Name != "daily-summary" && !isGroupMember(k.Name) {
			specs = append(specs, config.KindSpec{Kind: k})
		}
	}
	summary := []config.KindSpec{{Kind: config.Kind{Name: "daily-summary"}}}
	windows, changes := 0, 0
	for zi, name := range tzZones(t) {
		loc, err := time.LoadLocation(name)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		_, off := winFrom.In(loc).Zone()
		lon := math.Max(-180, math.Min(180, float64(off)/240))
		lat := sweepLatitudes[zi%len(sweepLatitudes)]
		place := Place{Observer: astro.Observer{Latitude: lat, Longitude: lon}, Location: loc}
		dates := []time.Time{date("2026-06-21"), date("2027-12-21")}
		for _, c := range clockChanges(loc, winFrom, winTo) {
			dates = append(dates, localDate(c, loc))
			changes++
		}
		for _, d := range dates {
			first, last := d.AddDate(0, 0, -1), d.AddDate(0, 0, 1)
			ctx, cancel := context.WithTimeout(context.Background(), 20*time.Second)
			events, notes, err := sk.EventsFor(ctx, place, specs, first, last)
			if err == nil {
				var entries []Entry
				entries, err = sk.Entries(ctx, &config.Site{ID: "s", Name: "s", Latitude: lat, Longitude: lon,
					TimeZone: config.Zone{Location: loc}}, "f", summary, first, last)
				checkSummaries(t, name, entries, first, last)
			}
			cancel()
			if err != nil {
				t.Fatalf("%s at %g° %s..%s: %v", name, lat, first.Format(time.DateOnly), last.Format(time.DateOnly), err)
			}
			windows++
			where := fmt.Sprintf("%s at %g°, %g°", name, lat, lon)
			checkSweepWindow(t, where, loc, events, notes, first, last)
		}
	}
	t.Logf("%d windows of 3 dates, %d clock changes", windows, changes)
}

// checkSweepWindow checks the events and notes of the dates first..last.
func checkSweepWindow(t *testing.T, where string, loc *time.Location, events []Event, notes []Note, first, last time.Time) {
	t.Helper()
	type key struct {
		kind string
		date time.Time
	}
	nEvents, nNotes := map[key]int{}, map[key]int{}
	starts := map[string]bool{}
	for _, e := range events {
		k := e.Kind.String()
		if starts[k+e.Start.String()] {
			t.Errorf("%s: %s at %s twice", where, k, e.Start)
		}
		starts[k+e.Start.String()] = true
		want := localDate(e.Start, loc)
		switch e.Kind.Name {
		case "dark-window": // the date of the evening: noon to noon
			w := wallStartOf(e.Start, loc)
			want = civil(w.Add(-12 * time.Hour))
		case "photoperiod": // an all-day entry at the date's first instant
			if !e.Start.Equal(midnight(e.Date, loc)) {
				t.Errorf("%s: photoperiod on %s starts at %s", where, e.Date.Format(time.DateOnly), e.Start)
			}
			want = e.Date
		case "lighting": // the date whose day the lamps extend (lighting_test.go)
			want = e.Date
		}
		if !e.Date.Equal(want) {
			t.Errorf("%s: %s at %s listed on %s, want %s", where, k, e.Start.In(loc).Format(time.RFC3339),
				e.Date.Format(time.DateOnly), want.Format(time.DateOnly))
		}
		if e.Date.Before(first) || e.Date.After(last) {
			t.Errorf("%s: %s on %s outside %s..%s", where, k, e.Date.Format(time.DateOnly), first.Format(time.DateOnly), last.Format(time.DateOnly))
		}
		nEvents[key{e.Kind.Name, e.Date}]++
	}
	for _, n := range notes {
		nNotes[key{n.Kind.Name, n.Date}]++
	}
	for d := first; !d.After(last); d = d.AddDate(0, 0, 1) {
		for kind := range dailyKinds {
			ne, nn := nEvents[key{kind, d}], nNotes[key{kind, d}]
			switch {
			case ne == 0 && nn == 0:
				t.Errorf("%s: %s on %s: no event and no note", where, kind, d.Format(time.DateOnly))
			case nn > 1:
				t.Errorf("%s: %s on %s: %d notes", where, kind, d.Format(time.DateOnly), nn)
			case ne > 0 && nn > 0:
				t.Errorf("%s: %s on %s: %d events and a note", where, kind, d.Format(time.DateOnly), ne)
			case kind == "solar-noon" && ne != 1:
				t.Errorf("%s: %d solar noons on %s", where, ne, d.Format(time.DateOnly))
			}
		}
	}
}

// wallStartOf returns the local wall clock of t as a UTC reading.
func wallStartOf(t time.Time, loc *time.Location) time.Time {
	l := t.In(loc)
	return time.Date(l.Year(), l.Month(), l.Day(), l.Hour(), l.Minute(), l.Second(), 0, time.UTC)
}

// checkSummaries checks one daily summary per date first..last.
func checkSummaries(t *testing.T, where string, entries []Entry, first, last time.Time) {
	t.Helper()
	per := map[time.Time]int{}
	for _, e := range entries {
		per[e.Date]++
	}
	for d := first; !d.After(last); d = d.AddDate(0, 0, 1) {
		if per[d] != 1 {
			t.Errorf("%s: %d daily summaries on %s", where, per[d], d.Format(time.DateOnly))
		}
	}
	if len(entries) != len(per) {
		t.Errorf("%s: %d summaries for %d dates", where, len(entries), len(per))
	}
}

// isGroupMember reports whether a kind is part of a group kind.
func isGroupMember(name string) bool {
	return slices.Contains(seasonNames[:], name) || slices.Contains(phaseNames[:], name)
}
