package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"heliocal/config"
)

// placeLineConfig has a site of each kind of horizon and air: flat with the
// standard refraction, a horizon altitude, a skyline read from a file, and
// a configured air (with a horizon below 0°: a site seen from a height).
const placeLineConfig = `sites:
  - id: flat
    name: Flat Field
    latitude: 48.2
    longitude: 16.4
    elevation: 170
    timezone: Europe/Vienna
  - id: raised
    name: Raised Field
    latitude: 48.2
    longitude: 16.4
    elevation: 170
    timezone: Europe/Vienna
    horizon: 1.5
  - id: valley
    name: Valley Field
    latitude: 48.2
    longitude: 16.4
    elevation: 170
    timezone: Europe/Vienna
    horizon: hills.csv
  - id: cold
    name: Cold Field
    latitude: 48.2
    longitude: 16.4
    elevation: 170
    timezone: Europe/Vienna
    horizon: -0.5
    pressure_hpa: 1030
    temperature_c: -20
feeds:
  - {id: flat-sun, title: Flat sun, site: flat, kinds: [sunrise], days_back: 0, days_ahead: 3}
  - {id: raised-sun, title: Raised sun, site: raised, kinds: [sunrise], days_back: 0, days_ahead: 3}
  - {id: valley-sun, title: Valley sun, site: valley, kinds: [sunrise], days_back: 0, days_ahead: 3}
  - {id: cold-sun, title: Cold sun, site: cold, kinds: [sunrise], days_back: 0, days_ahead: 3}
`

// The place line of each site on the index (whole or merged from shards)
// and on the served page names its horizon and air in the words of the
// events table's heading (TestEventsTableHeadingConditions), taken from the
// configuration above: nothing for the flat site, "horizon 1.5°", the
// skyline's lowest and highest altitude and its points from hills.csv, and
// the configured pressure and temperature. A flat site's entry of the shard
// manifests keeps its six fields.
func TestIndexPlaceLineNamesHorizon(t *testing.T) {
	cfgPath := writePlaceLineConfig(t)
	// site id → the conditions of its place line, "" for none
	want := map[string]string{
		"flat":   "",
		"raised": "horizon 1.5°",
		"valley": "skyline 1–8° (4 points, hills.csv)",
		"cold":   "horizon −0.5°, refraction for 1030 hPa and −20 °C",
	}
	names := map[string]string{"flat": "Flat Field", "raised": "Raised Field", "valley": "Valley Field", "cold": "Cold Field"}

	whole, sharded := t.TempDir(), t.TempDir()
	publishShards(t, cfgPath, whole)
	publishShards(t, cfgPath, sharded, "2/3", "0/3", "1/3")
	index := pageWords(sameIndex(t, whole, sharded))
	for id, cond := range want {
		line := "48.2000° N, 16.4000° E, elevation 170 m, time zone Europe/Vienna"
		if cond != "" {
			line = "48.2000° N, 16.4000° E, elevation 170 m, " + cond + ", time zone Europe/Vienna"
		}
		if !strings.Contains(index, `<p class="place">`+line+"</p>") {
			t.Errorf("%s: index has no place line %q", id, line)
		}
		code, out, errOut := runCLI(t, "events", "--config", cfgPath, "--site", id, "--from", "2027-01-15", "--to", "2027-01-15")
		heading, _, _ := strings.Cut(out, "\n")
		wantHeading := names[id] + ": 48.2000° N, 16.4000° E, 170 m, Europe/Vienna"
		if cond != "" {
			wantHeading = names[id] + ": 48.2000° N, 16.4000° E, 170 m, " + cond + ", Europe/Vienna"
		}
		if code != 0 || heading != wantHeading {
			t.Errorf("%s: events heading %q (exit %d, %s), want %q", id, heading, code, errOut, wantHeading)
		}
	}

	cfg, err := config.Load(cfgPath)
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range pageInfo(cfg).Sites {
		var id string
		for k, n := range names {
			if n == s.Name {
				id = k
			}
		}
		place := "48.2000° N, 16.4000° E, 170 m, Europe/Vienna"
		if want[id] != "" {
			place = "48.2000° N, 16.4000° E, 170 m, " + want[id] + ", Europe/Vienna"
		}
		if s.Place != place {
			t.Errorf("served page: %s: place %q, want %q", s.Name, s.Place, place)
		}
	}

	// The flat site's entry in every shard's manifest has the fields it had
	// before horizons and air were written there, and no others.
	for _, name := range []string{"feeds-0-of-3.json", "feeds-1-of-3.json", "feeds-2-of-3.json"} {
		b, err := os.ReadFile(filepath.Join(sharded, name))
		if err != nil {
			t.Fatal(err)
		}
		var m struct{ Sites []map[string]json.RawMessage }
		if err := json.Unmarshal(b, &m); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		for _, s := range m.Sites {
			if string(s["id"]) != `"flat"` {
				continue
			}
			var keys []string
			for k := range s {
				keys = append(keys, k)
			}
			if len(keys) != 6 || s["timezone"] == nil || s["elevation"] == nil || s["latitude"] == nil || s["longitude"] == nil || s["name"] == nil {
				t.Errorf("%s: the flat site has fields %v, want id, name, latitude, longitude, elevation, timezone", name, keys)
			}
		}
	}
}

// Shards published by a version whose manifests did not record the sites'
// horizons and air (no site_conditions, no horizon, skyline, pressure_hpa
// or temperature_c) are merged by the last shard into the index a whole run
// writes: their sites' horizons and air are taken from the configuration.
// Here flat-sun and cold-sun fall in shard 0 of 3, raised-sun and
// valley-sun in shard 1, none in shard 2, which merges.
func TestMergeOldManifestsNamesHorizon(t *testing.T) {
	cfgPath := writePlaceLineConfig(t)
	whole, sharded := t.TempDir(), t.TempDir()
	publishShards(t, cfgPath, whole)
	publishShards(t, cfgPath, sharded, "0/3", "1/3")
	// the two manifests as the earlier version wrote them
	dropped := 0
	for _, name := range []string{"feeds-0-of-3.json", "feeds-1-of-3.json"} {
		path := filepath.Join(sharded, name)
		b, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		var m map[string]any
		if err := json.Unmarshal(b, &m); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if m["site_conditions"] != true {
			t.Fatalf("%s: site_conditions is %v, want true", name, m["site_conditions"])
		}
		delete(m, "site_conditions")
		for _, s := range m["sites"].([]any) {
			site := s.(map[string]any)
			for _, k := range []string{"horizon", "skyline", "pressure_hpa", "temperature_c"} {
				if _, ok := site[k]; ok {
					delete(site, k)
					dropped++
				}
			}
		}
		if b, err = json.Marshal(m); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, b, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	if dropped != 5 { // raised's horizon, valley's skyline, cold's horizon, pressure and temperature
		t.Fatalf("the manifests had %d fields of horizon and air, want 5", dropped)
	}
	publishShards(t, cfgPath, sharded, "2/3")
	merged := pageWords(sameIndex(t, whole, sharded))
	for _, cond := range []string{"horizon 1.5°", "skyline 1–8° (4 points, hills.csv)", "horizon −0.5°, refraction for 1030 hPa and −20 °C"} {
		if !strings.Contains(merged, ", elevation 170 m, "+cond+", time zone Europe/Vienna</p>") {
			t.Errorf("the merged index does not name %q", cond)
		}
	}
}

// writePlaceLineConfig writes placeLineConfig and the skyline file its
// valley site reads, and returns the configuration's path.
func writePlaceLineConfig(t *testing.T) string {
	t.Helper()
	cfgPath := writeConfig(t, placeLineConfig)
	hills := "azimuth,altitude\n0,2\n90,8\n180,1\n270,4\n"
	if err := os.WriteFile(filepath.Join(filepath.Dir(cfgPath), "hills.csv"), []byte(hills), 0o644); err != nil {
		t.Fatal(err)
	}
	return cfgPath
}

// publishShards publishes the configuration at cfgPath into dir: whole
// without shards, else shard by shard in the order given ("2/3").
func publishShards(t *testing.T, cfgPath, dir string, shards ...string) {
	t.Helper()
	if len(shards) == 0 {
		if code, _, errOut := runCLI(t, "publish", "--config", cfgPath, "--out", dir); code != 0 {
			t.Fatalf("publish: exit %d: %s", code, errOut)
		}
	}
	for _, sh := range shards {
		if code, _, errOut := runCLI(t, "publish", "--config", cfgPath, "--out", dir, "--shard", sh); code != 0 {
			t.Fatalf("publish --shard %s: exit %d: %s", sh, code, errOut)
		}
	}
}

// sameIndex is the index.html merged from the shards in sharded, which
// must be the one the whole run wrote into whole.
func sameIndex(t *testing.T, whole, sharded string) string {
	t.Helper()
	index, err := os.ReadFile(filepath.Join(whole, "index.html"))
	if err != nil {
		t.Fatal(err)
	}
	merged, err := os.ReadFile(filepath.Join(sharded, "index.html"))
	if err != nil {
		t.Fatal(err)
	}
	if string(merged) != string(index) {
		t.Errorf("the index merged from the shards differs from the whole run's")
	}
	return string(merged)
}
