package config

import (
	"slices"
	"strings"
	"testing"
)

// A feed naming a missing site is offered only ids that are valid and
// exist: a site id that is itself refused is never suggested.
func TestSiteSuggestionOnlyValidIDs(t *testing.T) {
	doc := "sites:\n  - id: Bad_Site\n    latitude: 47.5\n    longitude: 9.7\n    timezone: Europe/Zurich\n" +
		"  - id: good-site\n    latitude: 47.5\n    longitude: 9.7\n    timezone: Europe/Zurich\n" +
		"feeds:\n  - id: f\n    site: bad-site\n    kinds: [sunrise]\n  - id: g\n    site: good-sit\n    kinds: [sunrise]\n"
	_, err := Parse(strings.NewReader(doc), "yaml")
	ps := problemsOf(t, err)
	seen := map[string]string{}
	for _, p := range ps {
		seen[p.Path] = p.Hint
	}
	if h, ok := seen["feeds[0].site"]; !ok || strings.Contains(h, "Bad_Site") {
		t.Errorf("feeds[0].site hint %q (present %v) suggests the invalid id", h, ok)
	}
	if h := seen["feeds[1].site"]; h != `did you mean "good-site"?` {
		t.Errorf("feeds[1].site hint %q, want the valid near id", h)
	}
	if _, ok := seen["sites[0].id"]; !ok {
		t.Errorf("the invalid id itself is not reported: %v", err)
	}
}

// An id with accented letters is refused (ids become file names and URLs)
// with a suggestion that keeps the words: "viña-aurora" suggests
// "vina-aurora", not "vi-a-aurora".
func TestIDSuggestionKeepsAccentedWords(t *testing.T) {
	for in, want := range map[string]string{"viña-aurora": "vina-aurora", "Güira Ñandú": "guira-nandu", "Skarvlia Øst": "skarvlia-ost", "North Field #2": "north-field-2"} {
		if got := slug(in); got != want {
			t.Errorf("slug(%q) = %q, want %q", in, got, want)
		}
	}
	_, err := Parse(strings.NewReader("sites:\n  - {id: viña-aurora, latitude: -35.42, longitude: -71.65, timezone: America/Santiago}\n"), "yaml")
	if err == nil || !strings.Contains(err.Error(), `"vina-aurora"`) {
		t.Errorf("error %v, want the suggestion \"vina-aurora\"", err)
	}
}

// The flags of the command line that give a configuration's value (--lat,
// --lon, --elev, --tz, --pressure, --temperature, --max-illumination) stand
// for its keys, and so do other tools' short names: one table, which the
// file's "unknown key" hint and the flags' hints both read. Every key it
// names is a key of the configuration.
func TestShortKey(t *testing.T) {
	for name, want := range map[string]string{
		"lat": "latitude", "lon": "longitude", "elev": "elevation", "tz": "timezone",
		"pressure": "pressure_hpa", "temperature": "temperature_c", "max-illumination": "max_illumination",
		"lng": "longitude", "altitude": "elevation", "zone": "timezone",
	} {
		if got, ok := ShortKey(name); !ok || got != want {
			t.Errorf("%s: %q, %v; want %q", name, got, ok, want)
		}
	}
	if key, ok := ShortKey("latitude"); ok {
		t.Errorf("latitude: %q, want no key: it is the key itself", key)
	}
	known := append(keysAt("sites"), keysAt("feeds.kinds")...)
	for name, key := range shortKeys {
		if !slices.Contains(known, key) {
			t.Errorf("%s: %q is no key of a site or a kinds entry (%v)", name, key, known)
		}
	}
}
