package main

import (
	"context"
	"encoding/json"
	"slices"
	"sort"
	"strings"
	"testing"
	"time"

	"heliocal/config"
	"heliocal/feed"
)

// eventKeys runs `heliocal events --format json` and returns the keys of
// each event object.
func eventKeys(t *testing.T, args ...string) ([][]string, []map[string]any) {
	t.Helper()
	code, out, errOut := runCLI(t, append([]string{"events", "--format", "json"}, args...)...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var doc struct {
		Events []map[string]any `json:"events"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	var keys [][]string
	for _, e := range doc.Events {
		var k []string
		for name := range e {
			k = append(k, name)
		}
		sort.Strings(k)
		keys = append(keys, k)
	}
	return keys, doc.Events
}

// The JSON of eclipse events has the fields the documentation gives, and
// only those (with the common "date").
func TestEventsJSONEclipses(t *testing.T) {
	// partial at Vienna, 2026-08-12
	keys, evs := eventKeys(t, "--lat", "48.21", "--lon", "16.37", "--elev", "190", "--tz", "Europe/Vienna",
		"--from", "2026-08-12", "--to", "2026-08-12", "--kinds", "solar-eclipse")
	want := []string{"date", "end", "kind", "magnitude", "max", "obscuration", "start", "type"}
	if len(keys) != 1 || !slices.Equal(keys[0], want) {
		t.Fatalf("keys %v, want %v", keys, want)
	}
	if evs[0]["type"] != "partial" || !strings.HasPrefix(evs[0]["start"].(string), "2026-08-12T17:22:0") {
		t.Errorf("event %v", evs[0])
	}
	// total on the central line of 2027-08-02 (the canon's point of greatest
	// duration, from memory)
	keys, evs = eventKeys(t, "--lat", "25.51", "--lon", "33.1967", "--tz", "Africa/Cairo",
		"--from", "2027-08-02", "--to", "2027-08-02", "--kinds", "solar-eclipse")
	want = []string{"date", "end", "kind", "magnitude", "max", "obscuration", "start", "total_end", "total_start", "type"}
	if len(keys) != 1 || !slices.Equal(keys[0], want) || evs[0]["type"] != "total" || evs[0]["obscuration"] != 1.0 {
		t.Fatalf("keys %v, event %v", keys, evs)
	}
	// total lunar eclipse of 2029-06-26 from Buenos Aires, partial one of
	// 2028-01-12
	keys, evs = eventKeys(t, "--lat", "-34.6", "--lon", "-58.38", "--tz", "America/Argentina/Buenos_Aires",
		"--from", "2028-01-11", "--to", "2029-06-26", "--kinds", "lunar-eclipse")
	var total, partial []string
	for i, e := range evs {
		switch e["type"] {
		case "total":
			total = keys[i]
		case "partial":
			partial = keys[i]
		}
	}
	if w := []string{"date", "end", "kind", "max", "partial_end", "partial_start", "start", "total_end", "total_start", "type", "umbral_magnitude"}; !slices.Equal(total, w) {
		t.Errorf("total lunar eclipse: keys %v, want %v", total, w)
	}
	if w := []string{"date", "end", "kind", "max", "partial_end", "partial_start", "start", "type", "umbral_magnitude"}; !slices.Equal(partial, w) {
		t.Errorf("partial lunar eclipse: keys %v, want %v", partial, w)
	}
}

// The year chart of a site marks the date of each eclipse its feeds list:
// at Vienna from 2026-08-01, the partial solar eclipse of 2026-08-12 and the
// partial lunar eclipse of 2026-08-28 (both partial there: Swiss Ephemeris
// 2.10.03, testdata/reference/eclipses-swiss.csv).
func TestChartMarksEclipses(t *testing.T) {
	cfg, err := config.Parse(strings.NewReader(`
sites:
  - {id: vienna, latitude: 48.21, longitude: 16.37, elevation: 190, timezone: Europe/Vienna}
feeds:
  - {id: dim, site: vienna, kinds: [solar-eclipse, lunar-eclipse]}
`), "yaml")
	if err != nil {
		t.Fatal(err)
	}
	chart, err := chartsFor(cfg, time.Date(2026, 8, 1, 12, 0, 0, 0, time.UTC), nil)(context.Background(), feed.SiteOf(&cfg.Sites[0]))
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, m := range chart.Marks {
		got = append(got, m.At.In(cfg.Sites[0].TimeZone.Location).Format(time.DateOnly)+" "+m.Label)
	}
	for _, want := range []string{"2026-08-12 partial solar eclipse", "2026-08-28 partial lunar eclipse"} {
		if !slices.Contains(got, want) {
			t.Errorf("marks %q lack %q", got, want)
		}
	}
}

// At a site with a skyline the JSON of an eclipse says how long the body is
// over the skyline during it (visible_s, 0 when it stays behind) and its
// first appearance and last disappearance within it; the demo's valley
// loses the setting Sun of 12 August 2026 behind its western hills and
// sees none of the eclipse of 26 January 2028.
func TestEventsJSONEclipseSkyline(t *testing.T) {
	_, evs := eventKeys(t, "--site", "brackenfold", "--kinds", "solar-eclipse", "--from", "2026-08-01", "--to", "2028-01-31")
	by := map[string]map[string]any{}
	for _, e := range evs {
		by[e["date"].(string)] = e
	}
	p, h := by["2026-08-12"], by["2028-01-26"]
	if p == nil || h == nil {
		t.Fatalf("events %v", evs)
	}
	start, _ := time.Parse(time.RFC3339, p["visible_start"].(string))
	end, _ := time.Parse(time.RFC3339, p["visible_end"].(string))
	if p["visible_start"] != p["start"] || p["visible_end"] == p["end"] || p["visible_s"].(float64) < 60 ||
		int(p["visible_s"].(float64)+0.5) != int(end.Sub(start).Seconds()+0.5) {
		t.Errorf("12 Aug 2026: %v", p)
	}
	if h["visible_s"] != 0.0 || h["visible_start"] != nil || h["visible_end"] != nil {
		t.Errorf("26 Jan 2028: %v", h)
	}
	_, flat := eventKeys(t, "--lat", "47.05", "--lon", "11.2", "--tz", "Europe/Vienna", "--kinds", "solar-eclipse", "--from", "2026-08-01", "--to", "2026-08-31")
	if len(flat) != 1 || flat[0]["visible_s"] != nil {
		t.Errorf("a flat horizon: %v", flat)
	}
}
