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
