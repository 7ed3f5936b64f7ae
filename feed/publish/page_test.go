package publish

import (
	"strconv"
	"strings"
	"testing"

	"heliocal/feed"
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

// Without a page title the index carries the default of page.title given in
// docs/configuration.md, "Sun and Moon calendars" (the heading of the page
// serve answers at / too), and counts its feeds in words that agree with
// the number: "1 calendar feed", "3 calendar feeds".
func TestIndexDefaultTitleAndCount(t *testing.T) {
	cals := testCalendars(t, "")
	opts := testOptions()
	opts.Title = ""
	for _, tc := range []struct {
		n    int
		want string
	}{{1, "<p>1 calendar feed, "}, {3, "<p>3 calendar feeds, "}} {
		html := string(renderIndexFor(t, opts, cals[:tc.n]))
		if !strings.Contains(html, "<h1>Sun and Moon calendars</h1>") {
			t.Errorf("%d feeds: the index's heading is not the default of page.title", tc.n)
		}
		if i := strings.Index(html, "<p>"+strconv.Itoa(tc.n)+" calendar feed"); i < 0 || !strings.HasPrefix(html[i:], tc.want) {
			t.Errorf("%d feeds: the index does not say %q", tc.n, tc.want)
		}
	}
	one := *cals[0]
	one.Entries = one.Entries[:1]
	if html := string(renderIndexFor(t, opts, []*feed.Calendar{&one})); !strings.Contains(html, "<p>1 calendar feed, 1 event, ") {
		t.Error("a feed of one event: the index does not say \"1 event\"")
	}
}
