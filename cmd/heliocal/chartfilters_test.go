package main

import (
	"context"
	"fmt"
	"slices"
	"testing"
	"time"

	"heliocal/config"
	"heliocal/feed"
	"heliocal/feed/publish"
)

// filtersConfig has kinds entries whose date filters, min_duration and
// all_day decide which of their events a feed keeps, on an invented site at
// the USNO coordinates of Washington, DC: the same lamps in two feeds with
// other filters (drawn once where both keep them), dark windows of at least
// 3 h on Fridays and Saturdays (in two feeds), and others lit up to half in
// June and July,
// the equinoxes only in March, the 12 h crossing only in spring, and
// cross-quarter days as all-day entries early in the week.
const filtersConfig = `
sites:
  - {id: mall, latitude: 38.889444, longitude: -77.035278, elevation: 0, timezone: America/New_York}
feeds:
  - id: mall-a
    site: mall
    kinds:
      - {kind: "lighting:14h", lamps: both, months: [nov, dec, jan]}
      - {kind: dark-window, min_duration: 3h, weekdays: [fri, sat]}
      - {kind: seasons, months: [mar]}
      - {kind: "photoperiod:12h", months: [feb, mar, apr]}
  - id: mall-b
    site: mall
    kinds:
      - {kind: "lighting:14h", lamps: both, dates: [2027-01-10, 2027-02-14]}
      - {kind: dark-window, max_illumination: 0.5, months: [jun, jul]}
      - {kind: cross-quarter, all_day: true, weekdays: [sun, mon, tue, wed]}
  - id: mall-c
    site: mall
    kinds:
      - {kind: dark-window, min_duration: 3h, weekdays: [fri, sat]}
`

// The year chart draws, for each kind of the site's feeds, exactly what
// the feeds keep: every lamp period, dark window, yearly mark and
// photoperiod crossing it draws is an entry of events --feed of that kind
// on that date, and every such entry is drawn, with the kinds entries'
// date filters (weekdays, months, dates), min_duration and all_day applied
// (within the chart's resolution: a minute on the clock, a date across).
// The demo's lamps of lighting:14h30m are for October to February, and its
// observatory's dark windows last 45 min or more.
func TestChartDrawsWhatFeedsKeep(t *testing.T) {
	for _, tc := range []struct {
		name, yaml string
		now        time.Time
	}{
		{"demo", string(config.DemoYAML()), time.Date(2027, 1, 15, 12, 0, 0, 0, time.UTC)},
		{"filters", filtersConfig, time.Date(2026, 12, 1, 12, 0, 0, 0, time.UTC)},
	} {
		t.Run(tc.name, func(t *testing.T) {
			path := writeConfig(t, tc.yaml)
			cfg := parseYAML(t, tc.yaml)
			drawn := map[string]int{}
			for i := range cfg.Sites {
				site := &cfg.Sites[i]
				c, err := chartsFor(cfg, tc.now, nil)(context.Background(), feed.SiteOf(site), nil)
				if err != nil {
					t.Fatal(err)
				}
				for what, n := range checkChartAgainstFeeds(t, path, cfg, site, c, tc.now) {
					drawn[what] += n
				}
			}
			// charts and feeds that agree on drawing nothing check nothing
			for _, what := range []string{"lamp periods", "dark windows", "marks", "photoperiod crossings"} {
				if drawn[what] == 0 {
					t.Errorf("no %s drawn: the test checks none", what)
				}
			}
		})
	}
}

// checkChartAgainstFeeds compares the chart c of site with the entries of
// its feeds listed by events --feed (over each feed's window, built at now)
// on the chart's dates, and returns how
// many of each it compared: lamp periods, dark windows, marks and
// photoperiod crossings.
func checkChartAgainstFeeds(t *testing.T, path string, cfg *config.Config, site *config.Site, c *publish.SiteChart, now time.Time) map[string]int {
	t.Helper()
	loc := site.TimeZone.Location
	first, last := c.Days[0].Date, c.Days[len(c.Days)-1].Date
	var lamps, dark []publish.ClockSpan
	marks := map[string]bool{}                   // "date kind" of the yearly entries
	crossings := map[time.Duration][]time.Time{} // photoperiod entries by threshold
	for _, f := range cfg.Feeds {
		if f.Site != site.ID {
			continue
		}
		var doc struct {
			Entries []struct {
				Kind, Date string
				Start, End time.Time
				Note       bool
			} `json:"entries"`
		}
		// the feed over its own window as built at now: the chart draws its
		// kinds on the dates of the chart the feed holds
		from, to := feed.WindowAt(&f, site, now)
		runJSON(t, &doc, "-c", path, "events", "--feed", f.ID, "--format", "json",
			"--from", from.Format(time.DateOnly), "--to", to.Format(time.DateOnly))
		for _, e := range doc.Entries {
			if e.Note || e.Kind == "plan" || e.Date < first.Format(time.DateOnly) || e.Date > last.Format(time.DateOnly) {
				continue
			}
			k, err := config.ParseKind(e.Kind)
			if err != nil {
				t.Fatalf("%s: kind %q: %v", f.ID, e.Kind, err)
			}
			switch {
			case k.Name == config.KindLighting:
				lamps = append(lamps, clockSpans(e.Start, e.End, loc)...)
			case k.Name == "dark-window":
				dark = append(dark, clockSpans(e.Start, e.End, loc)...)
			case k.Name == "photoperiod":
				d, err := time.Parse(time.DateOnly, e.Date)
				if err != nil {
					t.Fatal(err)
				}
				if d.After(first) && !slices.ContainsFunc(crossings[k.DayLength], d.Equal) {
					crossings[k.DayLength] = append(crossings[k.DayLength], d) // the chart marks a crossing from its second date
				}
			case k.IsYearly() && (!k.IsMoon() || k.Family() == config.FamilyEclipse):
				marks[e.Date+" "+e.Kind] = true
			}
		}
	}
	sameSpans(t, site.ID+" lamps", c.Lamps, lamps)
	sameSpans(t, site.ID+" dark windows", c.Dark, dark)

	// the marks: as many on each date as the feeds have entries of
	// different yearly kinds
	want, got := map[string]int{}, map[string]int{}
	for m := range marks {
		want[m[:len(time.DateOnly)]]++
	}
	for _, m := range c.Marks {
		got[m.At.In(loc).Format(time.DateOnly)]++
	}
	for d, n := range want {
		if got[d] != n {
			t.Errorf("%s: %d marks on %s, want %d (the feeds' yearly entries: %v)", site.ID, got[d], d, n, marks)
		}
	}
	for d, n := range got {
		if want[d] == 0 {
			t.Errorf("%s: %d marks on %s, which no feed has", site.ID, n, d)
		}
	}

	// the photoperiod crossings, as publish marks them
	crossed := 0
	for _, lv := range c.Levels {
		var drawn []time.Time
		for i := 1; i < len(c.Days); i++ {
			if (c.Days[i-1].Daylight >= lv.Length) != (c.Days[i].Daylight >= lv.Length) && (lv.Keeps == nil || lv.Keeps(c.Days[i].Date)) {
				drawn = append(drawn, c.Days[i].Date)
			}
		}
		if w := crossings[lv.Length]; fmt.Sprint(drawn) != fmt.Sprint(w) {
			t.Errorf("%s: %v crossings drawn on %v, the feeds have them on %v", site.ID, lv.Length, drawn, w)
		}
		crossed += len(drawn)
		delete(crossings, lv.Length)
	}
	for l, w := range crossings {
		t.Errorf("%s: no level for the %v crossings on %v", site.ID, l, w)
	}
	return map[string]int{"lamp periods": len(c.Lamps), "dark windows": len(c.Dark), "marks": len(c.Marks), "photoperiod crossings": crossed}
}

// sameSpans checks that the pieces drawn are those of the feeds (each drawn
// once), within a minute at each end.
func sameSpans(t *testing.T, what string, drawn, feeds []publish.ClockSpan) {
	t.Helper()
	near := func(a, b publish.ClockSpan) bool {
		return a.Date.Equal(b.Date) && (a.From-b.From).Abs() <= time.Minute && (a.To-b.To).Abs() <= time.Minute
	}
	for i, s := range drawn {
		if !slices.ContainsFunc(feeds, func(f publish.ClockSpan) bool { return near(s, f) }) {
			t.Errorf("%s: %s %v–%v drawn, no feed has it", what, s.Date.Format(time.DateOnly), s.From, s.To)
		}
		if slices.ContainsFunc(drawn[:i], func(d publish.ClockSpan) bool { return near(s, d) }) {
			t.Errorf("%s: %s %v–%v drawn twice", what, s.Date.Format(time.DateOnly), s.From, s.To)
		}
	}
	for _, f := range feeds {
		if !slices.ContainsFunc(drawn, func(s publish.ClockSpan) bool { return near(s, f) }) {
			t.Errorf("%s: %s %v–%v in a feed, not drawn", what, f.Date.Format(time.DateOnly), f.From, f.To)
		}
	}
}
