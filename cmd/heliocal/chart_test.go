package main

import (
	"context"
	"fmt"
	"reflect"
	"strings"
	"testing"
	"time"

	"heliocal/astro"
	"heliocal/config"
	"heliocal/feed"
	"heliocal/feed/publish"
)

// The year chart of an invented site at the USNO coordinates of Washington,
// DC, drawn for 1 January 2024: sunrise on the local clock, the new and full
// Moons, the 12 h photoperiod crossings, lamp periods and today's date.
func TestChartClockPhasesAndThresholds(t *testing.T) {
	cfg := parseYAML(t, `
sites:
  - {id: mall, latitude: 38.889444, longitude: -77.035278, elevation: 0, timezone: America/New_York}
feeds:
  - {id: mall-sun, site: mall, kinds: [sunrise, sunset, "photoperiod:12h", "lighting:14h", moon-phases]}
`)
	now := time.Date(2024, 1, 1, 15, 0, 0, 0, time.UTC)
	c, err := chartsFor(cfg, now, nil)(context.Background(), feed.SiteOf(&cfg.Sites[0]), nil)
	if err != nil {
		t.Fatal(err)
	}
	if want := time.Date(2024, 1, 1, 0, 0, 0, 0, time.UTC); !c.Today.Equal(want) {
		t.Errorf("today %v, want %v", c.Today, want)
	}
	// The chart runs from four weeks before today to a year after it, so
	// that today's line is not at its edge.
	if first, last := c.Days[0].Date, c.Days[len(c.Days)-1].Date; !first.Equal(time.Date(2023, 12, 4, 0, 0, 0, 0, time.UTC)) ||
		!last.Equal(time.Date(2024, 12, 31, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("chart from %v to %v, want 4 Dec 2023 to 31 Dec 2024", first, last)
	}
	if c.Location == nil || c.Location.String() != "America/New_York" {
		t.Errorf("chart zone %v, want the site's (marks are dated on its local dates)", c.Location)
	}
	day := func(y int, m time.Month, d int) publish.ChartDay {
		return c.Days[int(time.Date(y, m, d, 0, 0, 0, 0, time.UTC).Sub(c.Days[0].Date).Hours()/24)]
	}
	// USNO one-day data service, Washington DC, 2024-03-05: sunrise 06:34,
	// sunset 18:06 EST (testdata/reference/sun-times.csv sun-0270, sun-0272).
	d := day(2024, 3, 5)
	for _, x := range []struct {
		name string
		got  time.Duration
		ok   bool
		want time.Duration
	}{{"sunrise", d.Rise, d.HasRise, 6*time.Hour + 34*time.Minute}, {"sunset", d.Set, d.HasSet, 18*time.Hour + 6*time.Minute}} {
		if diff := x.got - x.want; !x.ok || diff < -time.Minute || diff > time.Minute {
			t.Errorf("%s on %v: %v (present %v), want %v ± 1 min", x.name, d.Date, x.got, x.ok, x.want)
		}
	}
	// After the change to daylight saving time (10 March 2024) the clock
	// reads an hour later: sunrise well after 07:00 on 11 March.
	if d := day(2024, 3, 11); !d.HasRise || d.Rise < 7*time.Hour {
		t.Errorf("sunrise on %v at %v, want after 07:00 (EDT)", d.Date, d.Rise)
	}
	// USNO moon-phase data (testdata/reference/moon-phases.csv mp-0067,
	// mp-0069): full Moon 2024-01-25 17:54 UTC, new Moon 2024-02-09 22:59 UTC.
	for _, want := range []struct {
		at   time.Time
		full bool
	}{{time.Date(2024, 1, 25, 17, 54, 0, 0, time.UTC), true}, {time.Date(2024, 2, 9, 22, 59, 0, 0, time.UTC), false}} {
		found := false
		for _, p := range c.Phases {
			if p.Full == want.full && p.At.Sub(want.at).Abs() < 2*time.Minute {
				found = true
			}
		}
		if !found {
			t.Errorf("no phase (full %v) at %v among %d", want.full, want.at, len(c.Phases))
		}
	}
	n := 0
	for _, p := range c.Phases {
		if !p.At.Before(now) {
			n++
		}
	}
	if n < 24 || n > 26 {
		t.Errorf("%d new and full Moons in the year ahead, want 24 to 26", n)
	}
	if len(c.Levels) != 1 || c.Levels[0].Length != 12*time.Hour {
		t.Errorf("levels %v, want the 12 h threshold", c.Levels)
	}
	// Lamps bring the short winter days up to 14 h: some on 1 January, none
	// at midsummer (day length near 14 h 50 min at 39° N, from memory).
	var jan, jun int
	for _, s := range c.Lamps {
		if s.To <= s.From || s.From < 0 || s.To > 24*time.Hour {
			t.Errorf("bad lamp piece %+v", s)
		}
		switch s.Date.Format("01-02") {
		case "01-01":
			jan++
		case "06-21":
			jun++
		}
	}
	if jan == 0 || jun != 0 {
		t.Errorf("lamp pieces: %d on 1 Jan (want some), %d on 21 Jun (want none)", jan, jun)
	}
}

// A chart drawn on the feeds' ephemeris (the catalogue's Sky, which covers
// the chart's dates) is the chart drawn on an ephemeris of its own, and the
// marks and the clock's events come out of one search: the seasons are
// marked at the USNO instants (testdata/reference/seasons.csv,
// march-equinox-2024 … december-solstice-2024, within the chart's minute),
// beside the lamp periods, dark windows and the Moon's phases.
func TestChartSharesFeedsSky(t *testing.T) {
	cfg := parseYAML(t, `
sites:
  - {id: mall, latitude: 38.889444, longitude: -77.035278, elevation: 0, timezone: America/New_York}
feeds:
  - {id: mall-sun, site: mall, days_back: 40, days_ahead: 400, kinds: [sunrise, sunset, "lighting:14h", moon-phases, seasons, dark-window]}
`)
	now := time.Date(2024, 1, 1, 15, 0, 0, 0, time.UTC)
	cat, err := feed.NewCatalogue(cfg, feed.Options{Now: now})
	if err != nil {
		t.Fatal(err)
	}
	site := feed.SiteOf(&cfg.Sites[0])
	shared, err := chartsFor(cfg, now, cat.Sky())(context.Background(), site, nil)
	if err != nil {
		t.Fatal(err)
	}
	own, err := chartsFor(cfg, now, nil)(context.Background(), site, nil)
	if err != nil {
		t.Fatal(err)
	}
	// The day's durations come from the ephemeris' fit, whose blocks start
	// where its span does: they agree to well within a millisecond (the
	// chart draws them to a tenth of a pixel, about 6 s); all else exactly.
	near := func(a, b time.Duration) bool { return (a - b).Abs() < time.Millisecond }
	for i := range own.Days {
		s, o := shared.Days[i], own.Days[i]
		if !near(s.Daylight, o.Daylight) || !near(s.Civil, o.Civil) || !near(s.Nautical, o.Nautical) || !near(s.Astronomical, o.Astronomical) {
			t.Errorf("day %v: %+v on the feeds' ephemeris, %+v on its own", o.Date, s, o)
		}
		shared.Days[i] = o
	}
	if !reflect.DeepEqual(shared, own) {
		t.Error("the chart on the feeds' ephemeris differs from the chart on its own")
	}
	if len(own.Lamps) == 0 || len(own.Dark) == 0 || len(own.Phases) < 24 {
		t.Errorf("%d lamp pieces, %d dark pieces, %d phases: want some of each (and 24+ phases)", len(own.Lamps), len(own.Dark), len(own.Phases))
	}
	for _, want := range []struct {
		label string
		at    time.Time
	}{{"Mar equinox", time.Date(2024, 3, 20, 3, 6, 0, 0, time.UTC)}, {"Jun solstice", time.Date(2024, 6, 20, 20, 51, 0, 0, time.UTC)},
		{"Sep equinox", time.Date(2024, 9, 22, 12, 44, 0, 0, time.UTC)}, {"Dec solstice", time.Date(2024, 12, 21, 9, 20, 0, 0, time.UTC)}} {
		found := false
		for _, m := range own.Marks {
			if d := m.At.Sub(want.at); m.Label == want.label && d > -time.Minute && d < time.Minute {
				found = true
			}
		}
		if !found {
			t.Errorf("no mark %q at %v among %v", want.label, want.at, own.Marks)
		}
	}
}

// The chart draws the lamp periods where the feed puts them, with the kinds
// entry's options: morning lamps end at sunrise, evening lamps start at
// sunset, and a latest_off cuts them. At the USNO coordinates of
// Washington, DC, on 5 March 2024 sunrise is 06:34 and sunset 18:06 EST
// (USNO one-day data service, testdata/reference/sun-times.csv sun-0270,
// sun-0272): a day of 11 h 32 min, 2 h 28 min short of 14 h.
func TestChartLampsFollowTheirOptions(t *testing.T) {
	for _, tc := range []struct {
		name, opts string
		from, to   time.Duration // the one lamp piece on 5 March, ± 1 min
	}{
		{"morning", "lamps: morning", 4*time.Hour + 6*time.Minute, 6*time.Hour + 34*time.Minute},
		{"evening", "lamps: evening", 18*time.Hour + 6*time.Minute, 20*time.Hour + 34*time.Minute},
		{"cut", `lamps: evening, latest_off: "19:30"`, 18*time.Hour + 6*time.Minute, 19*time.Hour + 30*time.Minute},
	} {
		cfg := parseYAML(t, `
sites:
  - {id: mall, latitude: 38.889444, longitude: -77.035278, elevation: 0, timezone: America/New_York}
feeds:
  - {id: mall-lamps, site: mall, kinds: [{kind: "lighting:14h", `+tc.opts+`}]}
`)
		c, err := chartsFor(cfg, time.Date(2024, 1, 1, 15, 0, 0, 0, time.UTC), nil)(context.Background(), feed.SiteOf(&cfg.Sites[0]), nil)
		if err != nil {
			t.Fatal(err)
		}
		var got []publish.ClockSpan
		for _, s := range c.Lamps {
			if s.Date.Equal(time.Date(2024, 3, 5, 0, 0, 0, 0, time.UTC)) {
				got = append(got, s)
			}
		}
		if len(got) != 1 || (got[0].From-tc.from).Abs() > time.Minute || (got[0].To-tc.to).Abs() > time.Minute {
			t.Errorf("%s: lamp pieces on 5 March 2024 %+v, want one from %v to %v (± 1 min)", tc.name, got, tc.from, tc.to)
		}
	}
}

// A noon-clear date is marked in words that say which way it goes: the
// noon Sun going behind the skyline, or clearing it again, as the feed's
// titles say ("The noon Sun stays behind the skyline from today", "The
// noon Sun clears the skyline again"), not by the kind's name for both.
func TestChartNoonClearMarks(t *testing.T) {
	k, err := config.ParseKind("noon-clear")
	if err != nil {
		t.Fatal(err)
	}
	for dir, want := range map[astro.Direction]string{astro.Setting: "noon Sun hidden", astro.Rising: "noon Sun clears"} {
		if got := markLabel(feed.Event{Kind: k, Direction: dir}); got != want {
			t.Errorf("noon-clear %v: mark %q, want %q", dir, got, want)
		}
	}
}

// A feed that service.oversize: trim shortened is drawn as it is
// published: the chart's lamp periods, dark windows, season marks and
// photoperiod crossings of its kinds stop at its last entry's date, not at
// the end of the chart's year (the invented site at the USNO coordinates
// of Washington, DC; lamps are needed there every evening of the winter).
func TestChartStopsWhereTrimmedFeedStops(t *testing.T) {
	cfg := parseYAML(t, `
service: {max_feed_bytes: 150000, oversize: trim}
sites:
  - {id: mall, latitude: 38.889444, longitude: -77.035278, elevation: 0, timezone: America/New_York}
feeds:
  - {id: mall-lamps, site: mall, kinds: ["lighting:14h", seasons, "photoperiod:12h", dark-window]}
`)
	now := time.Date(2024, 1, 1, 15, 0, 0, 0, time.UTC)
	srcs, opts, err := build(cfg, now, layout{})
	if err != nil {
		t.Fatal(err)
	}
	// the feed as published: its last entry's date
	cal, err := srcs[0].Build(context.Background())
	if err != nil {
		t.Fatal(err)
	}
	if _, err := publish.Encode(cal, &opts); err != nil {
		t.Fatal(err)
	}
	if cal.TrimmedTo.IsZero() {
		t.Fatalf("feed not shortened (%d entries): the test checks nothing", len(cal.Entries))
	}
	last := cal.Entries[len(cal.Entries)-1].Date
	lastOf := map[string]time.Time{} // the last entry's date of each kind
	for _, e := range cal.Entries {
		lastOf[e.Kind] = e.Date
	}

	var c *publish.SiteChart
	charts := opts.Charts
	opts.Charts = func(ctx context.Context, s feed.Site, trimmed []publish.Trimmed) (*publish.SiteChart, error) {
		c, err = charts(ctx, s, trimmed)
		return c, err
	}
	if _, err := publish.Render(context.Background(), srcs, opts); err != nil {
		t.Fatal(err)
	}
	if c == nil {
		t.Fatal("no chart drawn")
	}
	loc := cfg.Sites[0].TimeZone.Location
	var drawn time.Time // the last date the chart draws an event of the feed's on
	later := func(what string, d time.Time) {
		if d.After(drawn) {
			drawn = d
		}
		if d.After(last) {
			t.Errorf("%s drawn on %s, after the feed's last entry on %s", what, d.Format(time.DateOnly), last.Format(time.DateOnly))
		}
	}
	for _, s := range c.Lamps {
		later("lamp period", s.Date)
	}
	for _, s := range c.Dark {
		later("dark window", s.Date)
	}
	for _, m := range c.Marks {
		l := m.At.In(loc)
		later(m.Label, time.Date(l.Year(), l.Month(), l.Day(), 0, 0, 0, 0, time.UTC))
	}
	for _, lv := range c.Levels {
		for i := 1; i < len(c.Days); i++ {
			if (c.Days[i-1].Daylight >= lv.Length) != (c.Days[i].Daylight >= lv.Length) && (lv.Keeps == nil || lv.Keeps(c.Days[i].Date)) {
				later(lv.Length.String()+" crossing", c.Days[i].Date)
			}
		}
	}
	if !drawn.Equal(last) {
		t.Errorf("the chart draws the feed's events through %s, the feed's last entry is on %s", drawn.Format(time.DateOnly), last.Format(time.DateOnly))
	}
	// each kind drawn before the end, where the feed has it
	if len(c.Marks) == 0 || len(c.Lamps) == 0 || len(c.Dark) == 0 {
		t.Errorf("%d marks, %d lamp pieces, %d dark-window pieces drawn (the feed's last of each: %v): the test checks none of some", len(c.Marks), len(c.Lamps), len(c.Dark), lastOf)
	}
}

// A feed with a shorter window than the chart's year is drawn on the dates
// it holds: its lamp periods, dark windows and photoperiod crossings start
// and stop where its entries do (the last of each kind on the date of the
// feed's last entry of that kind), and the caption says so; the same kinds
// in a feed whose window is longer than the chart are drawn over the
// chart's whole year. The invented sites are at the USNO coordinates of
// Washington, DC, where lamps bring every day of the winter and spring up
// to 14 h and the day length crosses 12 h in March and September (from
// memory: the day there is under 14 h through April and 12 h near the
// equinoxes; the chart's sunrise and sunset there are held to USNO in
// TestChartClockPhasesAndThresholds).
func TestChartDrawsFeedWindow(t *testing.T) {
	cfg := parseYAML(t, `
sites:
  - {id: mall, latitude: 38.889444, longitude: -77.035278, elevation: 0, timezone: America/New_York}
  - {id: ellipse, latitude: 38.889444, longitude: -77.035278, elevation: 0, timezone: America/New_York}
feeds:
  - {id: mall-spring, site: mall, days_back: 7, days_ahead: 120, kinds: ["lighting:14h", "photoperiod:12h", dark-window]}
  - {id: ellipse-long, site: ellipse, days_back: 40, days_ahead: 400, kinds: ["lighting:14h", "photoperiod:12h", dark-window]}
`)
	now := time.Date(2024, 1, 1, 15, 0, 0, 0, time.UTC)
	srcs, opts, err := build(cfg, now, layout{})
	if err != nil {
		t.Fatal(err)
	}
	charts := map[string]*publish.SiteChart{}
	draw := opts.Charts
	opts.Charts = func(ctx context.Context, s feed.Site, trimmed []publish.Trimmed) (*publish.SiteChart, error) {
		c, err := draw(ctx, s, trimmed)
		charts[s.ID] = c
		return c, err
	}
	b, err := publish.Render(context.Background(), srcs, opts)
	if err != nil {
		t.Fatal(err)
	}
	page := string(b.File(publish.IndexName).Data)
	day := func(m time.Month, d int) time.Time { return time.Date(2024, m, d, 0, 0, 0, 0, time.UTC) }

	// the published feed's entries: the first and last date each kind's
	// entries are drawn on (a span's pieces split at midnight, as the
	// chart draws them), and the dates of its photoperiod crossings
	cal, err := srcs[0].Build(context.Background())
	if err != nil {
		t.Fatal(err)
	}
	if first, last := cal.FirstDate(), cal.LastDate; !first.Equal(time.Date(2023, 12, 25, 0, 0, 0, 0, time.UTC)) || !last.Equal(day(4, 30)) {
		t.Fatalf("feed window %v to %v, want 2023-12-25 to 2024-04-30", first, last)
	}
	loc := cfg.Sites[0].TimeZone.Location
	type reach struct{ first, last, lastEntry time.Time }
	feedReach := map[string]*reach{}
	var crossings []time.Time
	for _, e := range cal.Entries {
		if e.Facts.Note {
			continue
		}
		k, err := config.ParseKind(e.Kind)
		if err != nil {
			t.Fatal(err)
		}
		if k.Name == "photoperiod" {
			crossings = append(crossings, e.Date)
			continue
		}
		r := feedReach[k.Name]
		if r == nil {
			r = &reach{first: e.Date}
			feedReach[k.Name] = r
		}
		r.lastEntry = e.Date
		for _, s := range clockSpans(e.Start, e.End, loc) {
			if s.Date.After(r.last) {
				r.last = s.Date
			}
		}
	}
	// lamps every evening or morning of the window, to its last date
	if r := feedReach[config.KindLighting]; r == nil || !r.lastEntry.Equal(cal.LastDate) {
		t.Fatalf("the feed's lamp periods %+v, want some to its last date: the test checks nothing", r)
	}
	if r := feedReach["dark-window"]; r == nil || r.lastEntry.Before(day(4, 20)) {
		t.Fatalf("the feed's dark windows %+v, want some in its last weeks", r)
	}
	if len(crossings) != 1 || crossings[0].Month() != time.March {
		t.Fatalf("the feed's 12 h crossings on %v, want the March one alone", crossings)
	}

	short := charts["mall"]
	for what, pieces := range map[string][]publish.ClockSpan{config.KindLighting: short.Lamps, "dark-window": short.Dark} {
		r := feedReach[what]
		var first, last time.Time
		for _, s := range pieces {
			if first.IsZero() || s.Date.Before(first) {
				first = s.Date
			}
			if s.Date.After(last) {
				last = s.Date
			}
		}
		if !first.Equal(r.first) || !last.Equal(r.last) {
			t.Errorf("%s drawn from %s to %s, the feed's from %s to %s (its last entry on %s)", what,
				first.Format(time.DateOnly), last.Format(time.DateOnly), r.first.Format(time.DateOnly), r.last.Format(time.DateOnly), r.lastEntry.Format(time.DateOnly))
		}
	}
	if got := drawnCrossings(short); fmt.Sprint(got) != fmt.Sprint(crossings) {
		t.Errorf("12 h crossings drawn on %v, the feed has them on %v", got, crossings)
	}
	if want := "Lamp periods, photoperiod crossings and dark windows of the feed mall-spring drawn from 25 Dec 2023, in the shaded weeks before today, to 30 Apr, the dates it holds."; !strings.Contains(pageWords(page), want) {
		t.Errorf("the caption does not say %q", want)
	}

	// a window longer than the chart: drawn from its first date to its
	// last, both crossings, and no word of the feed's dates
	long := charts["ellipse"]
	first, last := long.Days[0].Date, long.Days[len(long.Days)-1].Date
	var lampsFirst, lampsLast bool
	for _, s := range long.Lamps {
		lampsFirst = lampsFirst || s.Date.Equal(first)
		lampsLast = lampsLast || s.Date.Equal(last)
	}
	if !lampsFirst || !lampsLast {
		t.Errorf("the long feed's lamps drawn on the chart's first date %v, on its last %v: want both", lampsFirst, lampsLast)
	}
	if got := drawnCrossings(long); len(got) != 2 || got[0].Month() != time.March || got[1].Month() != time.September {
		t.Errorf("the long feed's 12 h crossings drawn on %v, want March and September", got)
	}
	if len(long.Held) != 0 || strings.Contains(page, "ellipse-long drawn") {
		t.Errorf("the long feed said to hold fewer dates than the chart: %+v", long.Held)
	}
}

// drawnCrossings are the dates the chart c marks a photoperiod crossing on,
// as publish marks them.
func drawnCrossings(c *publish.SiteChart) []time.Time {
	var out []time.Time
	for _, lv := range c.Levels {
		for i := 1; i < len(c.Days); i++ {
			if (c.Days[i-1].Daylight >= lv.Length) != (c.Days[i].Daylight >= lv.Length) && (lv.Keeps == nil || lv.Keeps(c.Days[i].Date)) {
				out = append(out, c.Days[i].Date)
			}
		}
	}
	return out
}
