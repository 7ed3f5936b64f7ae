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

// The page has one main landmark holding the caution and every site (the
// heading and the footer outside it), and each feed's count carries its
// unit, shown where the table's header is not (a phone): "1 event",
// "2 events".
func TestIndexMainAndEventUnit(t *testing.T) {
	cals := testCalendars(t, "")
	one := *cals[0]
	one.Entries = one.Entries[:1]
	two := *cals[1]
	two.Entries = two.Entries[:2]
	doc := parseStrict(t, renderIndexFor(t, testOptions(), []*feed.Calendar{&one, &two}))
	counts := map[string]string{}
	for _, tr := range doc.all("tr") {
		if tds := tr.all("td"); len(tds) > 1 {
			counts[tr.Attr["id"]] = strings.TrimSpace(tds[1].text())
		}
	}
	want := map[string]string{"feed-" + one.ID: "1 event", "feed-" + two.ID: "2 events"}
	for id, w := range want {
		if counts[id] != w {
			t.Errorf("row %s counts %q, want %q (all: %v)", id, counts[id], w, counts)
		}
	}
	mains := doc.all("main")
	if len(mains) != 1 {
		t.Fatalf("%d main elements, want 1", len(mains))
	}
	if len(mains[0].all("section")) != len(doc.all("section")) || len(mains[0].all("aside")) != 1 || len(mains[0].all("h1")) != 0 || len(mains[0].all("footer")) != 0 {
		t.Errorf("main holds %d of %d sections, %d asides, %d h1, %d footers; want every section, the caution, no heading or footer",
			len(mains[0].all("section")), len(doc.all("section")), len(mains[0].all("aside")), len(mains[0].all("h1")), len(mains[0].all("footer")))
	}
}
