package main

import (
	"context"
	"encoding/csv"
	"encoding/json"
	"reflect"
	"slices"
	"sort"
	"strconv"
	"strings"
	"testing"
	"time"

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
	cfg := parseYAML(t, `
sites:
  - {id: vienna, latitude: 48.21, longitude: 16.37, elevation: 190, timezone: Europe/Vienna}
feeds:
  - {id: dim, site: vienna, kinds: [solar-eclipse, lunar-eclipse]}
`)
	chart, err := chartsFor(cfg, time.Date(2026, 8, 1, 12, 0, 0, 0, time.UTC), nil)(context.Background(), feed.SiteOf(&cfg.Sites[0]), nil)
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

// A feed's eclipse entries, in JSON and CSV, carry every field the events
// of the same kinds have, with the same values: at Vienna the partial solar
// eclipse of 2026-08-12 and the partial lunar eclipse of 2026-08-28 (type
// and first contact: Swiss Ephemeris 2.10.03,
// testdata/reference/eclipses-swiss.csv), over a skyline the time the body
// is over it, and on the central line of 2027-08-02 (the canon's point of
// greatest duration, from memory) the total phase.
func TestFeedEclipsesAsEvents(t *testing.T) {
	cfg := `
sites:
  - {id: vienna, name: Vienna test yard, latitude: 48.21, longitude: 16.37, elevation: 190, timezone: Europe/Vienna}
  - {id: dale, name: Dale test yard, latitude: 47.05, longitude: 11.2, elevation: 900, timezone: Europe/Vienna,
     horizon: [[0, 3], [100, 12], [150, 4], [176, 25], [184, 25], [190, 4], [260, 15], [300, 3]]}
  - {id: line, name: Central line test camp, latitude: 25.51, longitude: 33.1967, timezone: Africa/Cairo}
feeds:
  - {id: vienna-dim, site: vienna, kinds: [solar-eclipse, lunar-eclipse]}
  - {id: dale-dim, site: dale, kinds: [solar-eclipse, lunar-eclipse]}
  - {id: line-dim, site: line, kinds: [solar-eclipse]}
`
	dates := []string{"--from", "2026-08-01", "--to", "2027-08-03"}
	eclipseKeys := map[string]bool{}
	typ := reflect.TypeFor[jsonEclipse]()
	for i := range typ.NumField() {
		name, _, _ := strings.Cut(typ.Field(i).Tag.Get("json"), ",")
		eclipseKeys[name] = true
	}
	list := func(key string, args ...string) []map[string]any {
		t.Helper()
		code, out, errOut := runStdin(t, cfg, append(append([]string{"events", "--config", "-", "--format", "json"}, dates...), args...)...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", args, code, errOut)
		}
		var doc map[string]json.RawMessage
		var rows []map[string]any
		if err := json.Unmarshal([]byte(out), &doc); err != nil {
			t.Fatal(err)
		}
		if err := json.Unmarshal(doc[key], &rows); err != nil {
			t.Fatal(err)
		}
		return rows
	}
	by := map[string]map[string]any{} // site date kind: the feed's entry
	for _, site := range []string{"vienna", "dale", "line"} {
		kinds := "solar-eclipse,lunar-eclipse"
		if site == "line" {
			kinds = "solar-eclipse"
		}
		events := list("events", "--site", site, "--kinds", kinds)
		entries := list("entries", "--feed", site+"-dim")
		if len(entries) != len(events) || len(events) == 0 {
			t.Fatalf("%s: %d entries, %d events", site, len(entries), len(events))
		}
		for i, e := range events {
			en := entries[i]
			for k, v := range e {
				if en[k] != v {
					t.Errorf("%s %s %s: feed %s %v, events %v", site, e["date"], e["kind"], k, en[k], v)
				}
			}
			for k := range en {
				if _, ok := e[k]; eclipseKeys[k] && !ok {
					t.Errorf("%s %s %s: feed has %s, events do not", site, e["date"], e["kind"], k)
				}
			}
			by[site+" "+e["date"].(string)+" "+e["kind"].(string)] = en
		}
		// CSV: the eclipse columns hold the JSON's values
		code, out, errOut := runStdin(t, cfg, append([]string{"events", "--config", "-", "--format", "csv", "--feed", site + "-dim"}, dates...)...)
		rows, err := csv.NewReader(strings.NewReader(out)).ReadAll()
		if code != 0 || err != nil || len(rows) != len(entries)+1 {
			t.Fatalf("%s CSV: exit %d, %v, %d rows: %s", site, code, err, len(rows), errOut)
		}
		for i, r := range rows[1:] {
			for c, h := range rows[0] {
				if !eclipseKeys[h] {
					continue
				}
				want := ""
				switch v := entries[i][h].(type) {
				case string:
					want = v
				case float64:
					want = strconv.FormatFloat(v, 'f', -1, 64)
				}
				if r[c] != want {
					t.Errorf("%s CSV row %d %s: %q, JSON %q", site, i+1, h, r[c], want)
				}
			}
		}
	}
	near := func(got any, want string) bool {
		a, err1 := time.Parse(time.RFC3339, got.(string))
		b, err2 := time.Parse(time.RFC3339, want)
		return err1 == nil && err2 == nil && a.Sub(b).Abs() < 2*time.Second
	}
	s, l := by["vienna 2026-08-12 solar-eclipse"], by["vienna 2026-08-28 lunar-eclipse"]
	if s == nil || s["type"] != "partial" || !near(s["start"], "2026-08-12T17:22:05.10Z") || s["magnitude"] == nil || s["max"] == nil {
		t.Errorf("Vienna, 2026-08-12: %v", s)
	}
	if l == nil || l["type"] != "partial" || !near(l["start"], "2026-08-28T01:23:57.68Z") ||
		!near(l["partial_start"], "2026-08-28T02:33:52.78Z") || l["umbral_magnitude"] == nil {
		t.Errorf("Vienna, 2026-08-28: %v", l)
	}
	if d := by["dale 2026-08-12 solar-eclipse"]; d == nil || d["visible_s"] == nil || d["visible_end"] == nil || d["visible_end"] == d["end"] {
		t.Errorf("over the skyline, 2026-08-12: %v", d)
	}
	if c := by["line 2027-08-02 solar-eclipse"]; c == nil || c["type"] != "total" || c["total_start"] == nil || c["total_end"] == nil {
		t.Errorf("central line, 2027-08-02: %v", c)
	}
}
