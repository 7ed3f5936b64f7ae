package config

import (
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
