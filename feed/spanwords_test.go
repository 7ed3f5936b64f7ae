package feed

import (
	"context"
	"testing"

	"heliocal/config"
)

// SpanWords gives the words the entries' titles give each band span, for
// the spans of TestMergedBandSpans and TestBandAroundTheClock (their
// sources: PyEphem 4.1.4): a morning and an evening, one span around
// midnight, one through noon with the Sun up, one of twilight glow where
// it does not rise, one the Sun stays in for weeks near the pole, and a
// sun band's span through noon. The two sun bands: on 20 October 2026 the
// Sun culminates at +1.37° (TestMergedBandSpans, PyEphem 4.1.4), inside
// −2..3°, so its span runs through midday; on 20 June 2026, a day before
// the solstice, its declination is near the obliquity of the ecliptic,
// 23.4° (from memory), so it culminates about 90° − 78.2° + 23.4° = 35.2°
// high, over the band's 35°, and stays above 23.4° − 11.8° = 11.6°, under
// its 20°: a morning and an evening span.
func TestSpanWordsAsTitles(t *testing.T) {
	svalbard := site(t, "svalbard", 78.2, 15.6, "Arctic/Longyearbyen")
	pole := site(t, "pole", 89.5, 0, "UTC")
	cases := []struct {
		s           *config.Site
		first, last string
		kinds       []string
		want        []string // SpanWords of the spans, in order
	}{
		{svalbard, "2026-04-08", "2026-04-09", []string{"golden-hour"},
			[]string{"morning", "evening", "morning", "around midnight"}},
		{svalbard, "2026-10-20", "2026-10-20", []string{"golden-hour"}, []string{"morning and evening in one"}},
		{svalbard, "2026-11-01", "2026-11-01", []string{"golden-hour"}, []string{"twilight glow, Sun below the horizon"}},
		{svalbard, "2026-11-10", "2026-11-10", []string{"blue-hour"}, []string{"morning and evening in one"}},
		{svalbard, "2026-06-20", "2026-06-20", []string{"sun-band:20..35"}, []string{"morning", "evening"}},
		{svalbard, "2026-10-20", "2026-10-20", []string{"sun-band:-2..3"}, []string{"through midday"}},
		{pole, "2026-03-11", "2026-03-12", []string{"golden-hour"}, []string{"around the clock"}},
	}
	for _, c := range cases {
		s := c.s
		var specs []config.KindSpec
		for _, k := range mustKinds(t, c.kinds...) {
			specs = append(specs, config.KindSpec{Kind: k})
		}
		sk := sky(t, c.first, c.last)
		events, _, err := sk.EventsFor(context.Background(), PlaceOf(s), specs, date(c.first), date(c.last))
		if err != nil {
			t.Fatal(err)
		}
		entries, err := sk.Entries(context.Background(), s, "f", specs, date(c.first), date(c.last))
		if err != nil {
			t.Fatal(err)
		}
		var titles []string
		for _, e := range entries {
			if !e.AllDay {
				titles = append(titles, e.Title)
			}
		}
		if len(events) != len(c.want) || len(titles) != len(c.want) {
			t.Errorf("%s %s %v: %d spans and %d timed entries %q, want %d", s.ID, c.first, c.kinds, len(events), len(titles), titles, len(c.want))
			continue
		}
		for i, e := range events {
			w := SpanWords(e, PlaceOf(s).Observer)
			if w != c.want[i] {
				t.Errorf("%s %s %s span %d (part %q): SpanWords %q, want %q", s.ID, c.first, e.Kind, i, e.Part, w, c.want[i])
			}
			if suffix := " (" + w + ")"; len(titles[i]) < len(suffix) || titles[i][len(titles[i])-len(suffix):] != suffix {
				t.Errorf("%s %s %s span %d: title %q does not end in %q", s.ID, c.first, e.Kind, i, titles[i], suffix)
			}
		}
	}
	if w := SpanWords(Event{Kind: mustKinds(t, "sunrise")[0], Part: "morning"}, PlaceOf(svalbard).Observer); w != "" {
		t.Errorf("SpanWords of a sunrise = %q, want none", w)
	}
}
