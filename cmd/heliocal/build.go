package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"slices"
	"strings"
	"sync"
	"time"

	"heliocal/astro"
	"heliocal/config"
	"heliocal/feed"
	"heliocal/feed/ical"
	"heliocal/feed/publish"
	"heliocal/feed/serve"
	"heliocal/internal/schedule"
)

// layout is the public base URL of the feeds: publish writes "<id>.ics"
// beside index.html, and serve answers "/<id>.ics" as well as
// "/feeds/<id>.ics", so one address works in both modes.
type layout struct {
	base string // public base URL ending in "/", or ""
}

func (l layout) feedURL(id string) string {
	if l.base == "" {
		return ""
	}
	return l.base + id + ".ics"
}

func newLayout(baseURL string) layout {
	if baseURL != "" && !strings.HasSuffix(baseURL, "/") {
		baseURL += "/"
	}
	return layout{base: baseURL}
}

// refreshInterval is the time between two scheduled refreshes, written into
// the feeds as REFRESH-INTERVAL; a day when it cannot be worked out.
func refreshInterval(cfg *config.Config, now time.Time) time.Duration {
	loc := cfg.Service.RefreshZone.Location
	if loc == nil {
		loc = time.Local
	}
	d, err := schedule.Interval(cfg.Service.Refresh, loc, now)
	if err != nil || d <= 0 {
		return 24 * time.Hour
	}
	return d
}

// build prepares everything a publish or a refresh renders: the sources of
// every feed (computed lazily, one at a time) and the render options.
func build(cfg *config.Config, now time.Time, l layout) ([]publish.Source, publish.RenderOptions, error) {
	cat, err := feed.NewCatalogue(cfg, feed.Options{
		Now:     now,
		FeedURL: l.feedURL,
		PageURL: l.base,
		Refresh: refreshInterval(cfg, now),
	})
	if err != nil {
		return nil, publish.RenderOptions{}, err
	}
	srcs := make([]publish.Source, len(cfg.Feeds))
	for i := range cfg.Feeds {
		f := &cfg.Feeds[i]
		srcs[i] = publish.Source{ID: f.ID, Build: func(ctx context.Context) (*feed.Calendar, error) { return cat.Calendar(ctx, f) }, Release: true}
	}
	opts := publish.RenderOptions{
		Version:      versionString(),
		Generated:    time.Date(now.Year(), now.Month(), now.Day(), 0, 0, 0, 0, time.UTC),
		Charts:       chartsFor(cfg, now, cat.Sky()),
		MaxFeedBytes: cfg.Service.MaxFeedBytes,
		Title:        cfg.Page.Title,
		Page:         pageText(cfg),
		Oversize:     cfg.Service.Oversize,
	}
	for i := range cfg.Sites {
		opts.Sites = append(opts.Sites, feed.SiteOf(&cfg.Sites[i]))
	}
	opts.BaseURL = l.base
	return srcs, opts, nil
}

// chartWeeksBefore is how far before today a site's chart starts, so that
// today's line stands among the weeks around it rather than at the edge.
const chartWeeksBefore = 4

// chartsFor draws, for each site, the year ahead and the weeks before
// today: day length and twilight bands, the lamp periods and dark windows of
// the site's feeds, their yearly events as marks, and their photoperiod
// thresholds as levels, each feed's on the dates it holds: its window, up to
// the last date of the feeds oversize: trim shortened (the chart function's
// trimmed, those of the site).
//
// The charts share the feeds' ephemeris (feeds, when it covers the charts'
// dates, as it does when the feeds reach back four weeks and ahead a year):
// the Sun's and Moon's positions, the Moon's phases and the year's events are
// then found once for the feeds and the charts.
func chartsFor(cfg *config.Config, now time.Time, feeds *feed.Sky) func(context.Context, feed.Site, []publish.Trimmed) (*publish.SiteChart, error) {
	// One ephemeris serves every site's chart: a site's local "today" is
	// within a day of the UTC one, and the Sky keeps two days of margin.
	sharedSky := sync.OnceValues(func() (*feed.Sky, error) {
		u := now.UTC()
		today := time.Date(u.Year(), u.Month(), u.Day(), 0, 0, 0, 0, time.UTC)
		first, last := today.AddDate(0, 0, -7*chartWeeksBefore-1), today.AddDate(1, 0, 1)
		if feeds != nil && feeds.Covers(first, last) {
			return feeds, nil
		}
		return feed.NewSky(first, last)
	})
	return func(ctx context.Context, fs feed.Site, trimmed []publish.Trimmed) (*publish.SiteChart, error) {
		site, ok := cfg.Site(fs.ID)
		if !ok {
			return nil, fmt.Errorf("chart: no site %q", fs.ID)
		}
		t := now.In(site.TimeZone.Location)
		today := time.Date(t.Year(), t.Month(), t.Day(), 0, 0, 0, 0, time.UTC)
		first, last := today.AddDate(0, 0, -7*chartWeeksBefore), today.AddDate(1, 0, -1)
		sky, err := sharedSky()
		if err != nil {
			return nil, err
		}
		place := feed.PlaceOf(&site)
		chart := &publish.SiteChart{Location: site.TimeZone.Location}
		if chart.Days, err = chartDays(sky, place, first, last); err != nil {
			return nil, err
		}
		chart.Today = today
		held := make(map[string]feedDates)
		for i := range cfg.Feeds {
			if f := &cfg.Feeds[i]; f.Site == site.ID {
				d := feedDates{}
				d.first, d.last = feed.WindowAt(f, &site, now)
				held[f.ID] = d
			}
		}
		for _, t := range trimmed {
			d := held[t.Feed.ID]
			d.to = t.To
			held[t.Feed.ID] = d
		}
		levels, kinds, heldNotes := chartKinds(cfg, site.ID, held, first, last)
		chart.Held = heldNotes
		// One search for the clock's kinds and the kinds of the feeds that
		// hold every date of the chart: the site's crossings of the Sun
		// (over its skyline too) are found once. A kinds entry of a feed
		// that holds fewer dates is found over those.
		var specs []config.KindSpec
		for _, name := range []string{"sunrise", "sunset", "new-moon", "full-moon"} {
			specs = append(specs, config.KindSpec{Kind: chartKind(name)})
		}
		var fewer []chartSpec
		for _, k := range kinds {
			if k.dates == (feedDates{}) {
				specs = append(specs, k.KindSpec)
			} else {
				fewer = append(fewer, k)
			}
		}
		events, _, err := sky.EventsFor(ctx, place, specs, first, last)
		if err != nil {
			return nil, err
		}
		for _, k := range fewer {
			from, to := laterOf(k.dates.first, first), earlierOf(k.dates.last, last)
			if to.Before(from) {
				continue
			}
			evs, _, err := sky.EventsFor(ctx, place, []config.KindSpec{k.KindSpec}, from, to)
			if err != nil {
				return nil, err
			}
			events = append(events, slices.DeleteFunc(evs, func(e feed.Event) bool {
				return !k.dates.holds(&e, &k.KindSpec, site.TimeZone.Location)
			})...)
		}
		// The feeds' kinds entries may keep the same event twice (the same
		// kind with other filters): it is drawn once.
		marked := map[publish.Mark]bool{}
		drawn := map[clockPiece]bool{}
		crossed := map[time.Duration]map[time.Time]bool{}
		for _, e := range events {
			switch {
			case e.Kind.Name == "photoperiod":
				if crossed[e.Kind.DayLength] == nil {
					crossed[e.Kind.DayLength] = map[time.Time]bool{}
				}
				crossed[e.Kind.DayLength][e.Date] = true
			case !chartClock(e, site.TimeZone.Location, chart, drawn):
				if m := (publish.Mark{At: e.Start, Label: markLabel(e)}); !marked[m] {
					chart.Marks = append(chart.Marks, m)
					marked[m] = true
				}
			}
		}
		for _, lv := range levels {
			// the crossings the feeds keep, on the dates they have them
			if days := crossed[lv.Length]; lv.Filtered {
				lv.Keeps = func(d time.Time) bool { return days[d] }
			}
			chart.Levels = append(chart.Levels, lv.Level)
		}
		return chart, nil
	}
}

// chartDays is the daylight and twilight of each local date first..last.
func chartDays(sky *feed.Sky, place feed.Place, first, last time.Time) ([]publish.ChartDay, error) {
	profiles, err := sky.Profiles(place, first, last)
	if err != nil {
		return nil, err
	}
	days := make([]publish.ChartDay, len(profiles))
	for i, p := range profiles {
		days[i] = publish.ChartDay{Date: p.Date, Daylight: p.Daylight, Civil: p.Civil, Nautical: p.Nautical, Astronomical: p.Astronomical}
	}
	return days, nil
}

// chartLevel is a photoperiod threshold of the chart, Filtered when every
// kinds entry of it keeps some of its crossings only (date filters, or a
// feed shortened to fit its size): the chart then draws those its feeds
// keep.
type chartLevel struct {
	publish.Level
	Filtered bool
}

// chartSpec is a kinds entry whose events the chart draws, on the dates its
// feed holds (dates), or on every date of the chart (dates zero) when the
// feed holds them all.
type chartSpec struct {
	config.KindSpec
	dates feedDates
}

// feedDates are the dates a feed holds, as it is built and published: the
// events of the local dates first..last of its window (00:00 UTC), and of
// their entries, when service.oversize: trim shortened the feed, those
// dated to (its last date then) or before. A feed not shortened has to
// zero.
type feedDates struct {
	first, last, to time.Time
}

// holds reports whether the feed keeps an entry of event e of its kinds
// entry spec: e is on a date of its window, and its entry (dated as
// entryDate says) is not after the date the feed was shortened to.
func (d feedDates) holds(e *feed.Event, spec *config.KindSpec, loc *time.Location) bool {
	if e.Date.Before(d.first) || e.Date.After(d.last) {
		return false
	}
	return d.to.IsZero() || !entryDate(*e, spec, loc).After(d.to)
}

// within is how the chart of the dates first..last draws a feed of the
// dates d: zero when the feed holds every date of the chart (its kinds are
// drawn over the whole chart), else d. A feed shortened to a date after
// the chart's last holds every entry of the chart's events (an offset of
// at most 12 h moves an entry's date by a day at most).
func (d feedDates) within(first, last time.Time) feedDates {
	if !d.first.After(first) && !d.last.Before(last) && (d.to.IsZero() || d.to.After(last)) {
		return feedDates{}
	}
	return d
}

// shown is the last date of the feed's entries: the window's, or the date it
// was shortened to.
func (d feedDates) shown() time.Time {
	if d.to.IsZero() {
		return d.last
	}
	return d.to
}

func laterOf(a, b time.Time) time.Time {
	if a.After(b) {
		return a
	}
	return b
}

func earlierOf(a, b time.Time) time.Time {
	if a.Before(b) {
		return a
	}
	return b
}

// entryDate is the local date of the entry a feed makes of event e of the
// kinds entry spec: an all-day entry's is that of its start moved by the
// offset (as the feed dates and shortens it).
func entryDate(e feed.Event, spec *config.KindSpec, loc *time.Location) time.Time {
	if !spec.AllDay && e.Kind.Name != "photoperiod" {
		return e.Date
	}
	t := e.Start.Add(spec.Offset.D()).In(loc)
	return time.Date(t.Year(), t.Month(), t.Day(), 0, 0, 0, 0, time.UTC)
}

// chartKinds collects, from every feed of the site, the photoperiod
// thresholds (drawn as levels) and the kinds entries whose events the chart
// draws: the yearly kinds drawn as marks (the seasons, cross-quarter days,
// apsides and eclipses, not the Moon's phases, which the chart draws as
// symbols of their own), the lamp periods and dark windows drawn on the
// clock, and the photoperiod thresholds, whose crossings the chart marks.
// Each entry keeps the options that set which events its feed has (the
// lamps' end of the day, their limits and minimum, what counts as natural
// light; the dark window's Moon; min_duration, the date filters, all_day
// with its offset), so that the chart draws what the feed keeps, and the
// dates its feed holds (held, by feed id: its window, and where
// service.oversize: trim shortened it), so that it draws them on those
// dates only when they are fewer than the chart's, first..last. Entries
// with the same such options and dates are computed once. It also says,
// for the caption, which feeds hold fewer dates than the chart and what of
// each the chart draws.
func chartKinds(cfg *config.Config, siteID string, held map[string]feedDates, first, last time.Time) ([]chartLevel, []chartSpec, []publish.HeldDates) {
	var levels []chartLevel
	var specs []chartSpec
	var notes []publish.HeldDates
	type specKey struct {
		held                                  feedDates
		kind                                  string
		maxLit                                float64
		min, offset                           config.Duration
		allDay                                bool
		lamps, natural, latestOff, earliestOn string
		weekdays, months, dates               string
	}
	seen := map[specKey]bool{}
	level := map[time.Duration]int{} // index in levels
	for _, f := range cfg.Feeds {
		if f.Site != siteID {
			continue
		}
		dates := held[f.ID].within(first, last)
		var what []string // what the chart draws of the feed, for the caption
		for _, ks := range f.Kinds {
			k := ks.Kind
			var w string
			switch {
			case k.Name == config.KindLighting:
				w = "lamp periods"
			case k.Name == "dark-window":
				w = "dark windows"
			case k.Name == "photoperiod":
				w = "photoperiod crossings"
			case k.IsYearly() && (!k.IsMoon() || k.Family() == config.FamilyEclipse):
				w = "red lines"
			default:
				continue
			}
			if !slices.Contains(what, w) {
				what = append(what, w)
			}
			// a feed of fewer dates keeps only some crossings, as a filter does
			filtered := !ks.Filter().IsZero() || dates != (feedDates{})
			if k.Name == "photoperiod" {
				if i, ok := level[k.DayLength]; !ok {
					level[k.DayLength] = len(levels)
					levels = append(levels, chartLevel{Level: publish.Level{Length: k.DayLength}, Filtered: filtered})
				} else if !filtered {
					levels[i].Filtered = false
				}
				if !filtered {
					continue // every crossing drawn: no need of the feed's
				}
			}
			sp := config.KindSpec{Kind: k, MaxIllumination: ks.MaxIllumination, MinDuration: ks.MinDuration,
				AllDay: ks.AllDay, Offset: ks.Offset, Weekdays: ks.Weekdays, Months: ks.Months, Dates: ks.Dates}
			if k.Name == config.KindLighting {
				sp.Lamps, sp.Natural, sp.LatestOff, sp.EarliestOn = ks.Lamps, ks.Natural, ks.LatestOff, ks.EarliestOn
			}
			if !filtered {
				sp.Offset = 0 // it moves only the date a filter reads (an all-day entry's)
			}
			key := specKey{dates, k.String(), sp.MaxIllumination, sp.MinDuration, sp.Offset, sp.AllDay, sp.Lamps, sp.Natural, sp.LatestOff, sp.EarliestOn,
				strings.Join(sp.Weekdays, ","), strings.Join(sp.Months, ","), strings.Join(sp.Dates, ",")}
			if !seen[key] {
				specs = append(specs, chartSpec{sp, dates})
			}
			seen[key] = true
		}
		if dates != (feedDates{}) && len(what) > 0 {
			notes = append(notes, publish.HeldDates{Feed: f.ID, What: what,
				First: laterOf(dates.first, first), Last: earlierOf(dates.shown(), last)})
		}
	}
	return levels, specs, notes
}

// chartKind parses a kind name the chart always draws.
func chartKind(name string) config.Kind {
	k, err := config.ParseKind(name)
	if err != nil {
		panic("chart kind " + name + ": " + err.Error())
	}
	return k
}

// clockPiece is a piece of a lamp period (Dark false) or of a dark window
// the chart draws on the clock.
type clockPiece struct {
	Dark bool
	publish.ClockSpan
}

// chartClock draws one event of the clock's kinds: the sunrise and sunset
// of its day on the local clock, a new or full Moon, the pieces of a lamp
// period or dark window (split at local midnight) that drawn does not hold
// yet (the same event kept by two kinds entries is drawn once). It reports
// false for an event of another kind (a mark: the marks are yearly kinds,
// of other names).
func chartClock(e feed.Event, loc *time.Location, c *publish.SiteChart, drawn map[clockPiece]bool) bool {
	first := c.Days[0].Date
	switch e.Kind.Name {
	case "sunrise", "sunset":
		i := int(e.Date.Sub(first).Hours()/24 + 0.5)
		if i < 0 || i >= len(c.Days) {
			return true
		}
		d := &c.Days[i]
		if e.Kind.Name == "sunrise" && !d.HasRise {
			d.Rise, d.HasRise = clockOf(e.Start, loc), true
		}
		if e.Kind.Name == "sunset" && !d.HasSet {
			d.Set, d.HasSet = clockOf(e.Start, loc), true
		}
	case "new-moon", "full-moon":
		c.Phases = append(c.Phases, publish.Phase{At: e.Start, Full: e.Kind.Name == "full-moon"})
	case config.KindLighting, "dark-window":
		dark := e.Kind.Name == "dark-window"
		spans := &c.Lamps
		if dark {
			spans = &c.Dark
		}
		for _, s := range clockSpans(e.Start, e.End, loc) {
			if p := (clockPiece{dark, s}); !drawn[p] {
				drawn[p] = true
				*spans = append(*spans, s)
			}
		}
	default:
		return false
	}
	return true
}

// clockOf is the local clock reading of t as time since midnight.
func clockOf(t time.Time, loc *time.Location) time.Duration {
	l := t.In(loc)
	return time.Duration(l.Hour())*time.Hour + time.Duration(l.Minute())*time.Minute + time.Duration(l.Second())*time.Second
}

// clockSpans splits the span start..end at each local midnight into pieces
// of one local date each.
func clockSpans(start, end time.Time, loc *time.Location) []publish.ClockSpan {
	var out []publish.ClockSpan
	for start.Before(end) {
		l := start.In(loc)
		date := time.Date(l.Year(), l.Month(), l.Day(), 0, 0, 0, 0, time.UTC)
		next := time.Date(l.Year(), l.Month(), l.Day()+1, 0, 0, 0, 0, loc)
		to := 24 * time.Hour
		if next.After(end) {
			next, to = end, clockOf(end, loc)
		}
		if from := clockOf(start, loc); from < to {
			out = append(out, publish.ClockSpan{Date: date, From: from, To: to})
		}
		if !next.After(start) {
			break // a zone whose midnight does not exist: stop rather than loop
		}
		start = next
	}
	return out
}

func markLabel(e feed.Event) string {
	switch e.Kind.Name {
	case "march-equinox":
		return "Mar equinox"
	case "june-solstice":
		return "Jun solstice"
	case "september-equinox":
		return "Sep equinox"
	case "december-solstice":
		return "Dec solstice"
	case "cross-quarter":
		return "cross-quarter " + e.Part + "°"
	case "solar-eclipse", "lunar-eclipse":
		return eclipseMark(e)
	case "noon-clear":
		// the date the noon Sun goes behind the skyline, or clears it again
		if e.Direction == astro.Rising {
			return "noon Sun clears"
		}
		return "noon Sun hidden"
	}
	return e.Kind.Name
}

// skyCache keeps the few shared ephemerides ad-hoc feeds use: most queries
// ask for the same window (today and the year ahead) from different places,
// and the ephemeris does not depend on the place.
type skyCache struct {
	mu    sync.Mutex
	skies map[string]*feed.Sky
	order []string
}

const skyCacheSize = 8

func (c *skyCache) get(first, last time.Time) (*feed.Sky, error) {
	key := first.Format(time.DateOnly) + "/" + last.Format(time.DateOnly)
	c.mu.Lock()
	defer c.mu.Unlock()
	if s, ok := c.skies[key]; ok {
		return s, nil
	}
	s, err := feed.NewSky(first, last)
	if err != nil {
		return nil, err
	}
	if c.skies == nil {
		c.skies = map[string]*feed.Sky{}
	}
	if len(c.order) == skyCacheSize {
		delete(c.skies, c.order[0])
		c.order = c.order[1:]
	}
	c.skies[key] = s
	c.order = append(c.order, key)
	return s, nil
}

// adhocSettings are what an ad-hoc feed takes from the configuration.
type adhocSettings struct {
	layout  layout
	refresh time.Duration
}

// adhocFeed renders the ad-hoc feed of a validated query, with a fixed
// layout and refresh interval.
func adhocFeed(l layout, refresh time.Duration) serve.AdhocFunc {
	return adhocFeedFrom(func() adhocSettings { return adhocSettings{layout: l, refresh: refresh} })
}

// adhocFeedFrom is adhocFeed with the layout and refresh interval read at
// each request from current, so that a reloaded base_url or schedule
// applies at once.
func adhocFeedFrom(current func() adhocSettings) serve.AdhocFunc {
	calendar := adhocCalendarFrom(current)
	// encoders keep their working memory from one feed to the next
	encoders := sync.Pool{New: func() any { return ical.NewEncoder(ical.Options{Version: versionString()}) }}
	return func(ctx context.Context, q serve.AdhocQuery, w io.Writer) error {
		cal, err := calendar(ctx, q)
		if err != nil {
			return err
		}
		enc := encoders.Get().(*ical.Encoder)
		defer encoders.Put(enc)
		_, err = enc.WriteTo(w, cal) // in pieces, compressed as they come
		cal.Release()                // the next feed's entries take its memory
		return err
	}
}

// adhocCalendarFrom computes the calendar of a validated ad-hoc query: the
// ad-hoc feeds and the builder's preview both come from it.
func adhocCalendarFrom(current func() adhocSettings) serve.PreviewFunc {
	skies := &skyCache{}
	return func(ctx context.Context, q serve.AdhocQuery) (*feed.Calendar, error) {
		set := current()
		l, refresh := set.layout, set.refresh
		first := q.Start
		last := first.AddDate(0, 0, q.Days-1)
		site := &config.Site{
			ID:        q.ID(),
			Name:      feed.CoordsName(q.Latitude, q.Longitude),
			Latitude:  q.Latitude,
			Longitude: q.Longitude,
			Elevation: q.Elevation,
			Horizon:   q.Horizon,
			// horizon=0: a level horizon, without the dip
			HorizonSet: q.HorizonSet,
			Skyline:    q.Skyline,
			TimeZone:   config.Zone{Location: q.Location},
		}
		place := feed.Coords(q.Latitude, q.Longitude, 4) // "45.0300° S, 168.6600° E", as events names a place
		if q.Name != "" {
			site.Name, place = q.Name, q.Name
		}
		f := &config.Feed{ID: q.ID(), Title: "Sky events at " + place, Site: site.ID, UTC: q.UTC, Alarm: config.Duration(q.Alarm),
			Description: "Sun and Moon events computed by heliocal for " + place + "."}
		for _, name := range q.Kinds {
			k, err := config.ParseKind(name)
			if err != nil {
				return nil, &serve.QueryError{Param: serve.ParamKinds, Value: name, Msg: err.Error()}
			}
			f.Kinds = append(f.Kinds, config.KindSpec{Kind: k, Offset: config.Duration(q.Offsets[name])})
		}
		sky, err := skies.get(first, last)
		if err != nil {
			if errors.Is(err, astro.ErrOutOfRange) {
				return nil, &serve.QueryError{Param: serve.ParamStart, Value: first.Format(time.DateOnly), Msg: err.Error()}
			}
			return nil, err
		}
		cal, err := sky.Calendar(ctx, site, f, first, last, feed.Options{PageURL: l.base, Refresh: refresh})
		if err != nil {
			return nil, err
		}
		if l.base != "" {
			cal.URL = l.base + strings.TrimPrefix(serve.AdhocPath, "/") + "?" + q.String()
		}
		return cal, nil
	}
}
