package publish

import (
	"strings"
	"testing"
)

// The page section gives the index its texts and the configuration's order.
func TestIndexPageSection(t *testing.T) {
	cals := testCalendars(t, "")
	opts := testOptions()
	opts.Page = &PageText{Intro: "Times for the valley.", Contact: "Ask the orchard office.", Legal: true,
		Order:        []string{"ice-camp-sun", "orchard-sunset", "orchard-sunrise"},
		Descriptions: map[string]string{"orchard-sunset": "When the pickers stop."}}
	page := renderIndexFor(t, opts, cals)
	doc := parseStrict(t, page)
	html := string(page)
	for _, want := range []string{"Times for the valley.", "Ask the orchard office.", "When the pickers stop.", PublicCaution, LegalCaution} {
		if !strings.Contains(html, want) {
			t.Errorf("the index lacks %q", want)
		}
	}
	sections := doc.all("section")
	if len(sections) != 2 || strings.Contains(sections[0].text(), "Cayuga") {
		t.Fatalf("the ice camp (first in the configuration) is not the first section")
	}
	orchard := sections[1].text()
	if strings.Index(orchard, "orchard-sunset") > strings.Index(orchard, "orchard-sunrise") {
		t.Errorf("the orchard's feeds are not in configuration order")
	}
	opts.Page = &PageText{Caution: "Computed, not observed."}
	html = string(renderIndexFor(t, opts, cals))
	if !strings.Contains(html, "Computed, not observed.") || strings.Contains(html, LegalCaution) {
		t.Errorf("a page caution without legal kinds: the index should carry it alone")
	}
}
