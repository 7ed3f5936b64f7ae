package feed

import (
	"cmp"
	"context"
	"crypto/sha256"
	"encoding"
	"encoding/binary"
	"fmt"
	"hash"
	"slices"
	"sort"
	"strconv"
	"strings"
	"sync"
	"time"
	"unsafe"

	"heliocal/astro"
	"heliocal/config"
)

// Options control how the catalogue turns configured feeds into calendars.
type Options struct {
	// Now fixes "today": each feed's window is counted in days back and
	// ahead from Now's date in the feed site's zone.
	Now time.Time
	// FeedURL returns the public URL of a feed's .ics file, or "" when the
	// feeds have no known public address.
	FeedURL func(feedID string) string
	// PageURL is the public address of the page listing the feeds, may be "".
	PageURL string
	// Refresh is the suggested polling interval written into each calendar.
	Refresh time.Duration
}

// Catalogue builds the calendars of one configuration. It shares a single
// ephemeris across all feeds and is safe for concurrent use.
type Catalogue struct {
	cfg   *config.Config
	opts  Options
	sky   *Sky
	sites map[string]*config.Site
}

// NewCatalogue prepares the shared ephemeris covering every feed's window.
// The configuration must be valid (config.Config.Validate).
func NewCatalogue(cfg *config.Config, opts Options) (*Catalogue, error) {
	c := &Catalogue{cfg: cfg, opts: opts, sites: map[string]*config.Site{}}
	for i := range cfg.Sites {
		c.sites[cfg.Sites[i].ID] = &cfg.Sites[i]
	}
	var first, last time.Time
	for i := range cfg.Feeds {
		f := &cfg.Feeds[i]
		s, ok := c.sites[f.Site]
		if !ok {
			return nil, fmt.Errorf("feeds[%d].site: %q: no site has this id", i, f.Site)
		}
		a, b := c.window(f, s)
		if len(f.Plans) > 0 {
			a, b = a.AddDate(0, 0, -PlanMargin), b.AddDate(0, 0, PlanMargin)
		}
		if first.IsZero() || a.Before(first) {
			first = a
		}
		if last.IsZero() || b.After(last) {
			last = b
		}
	}
	if first.IsZero() {
		first, last = civil(opts.Now), civil(opts.Now)
	}
	sky, err := NewSky(first, last)
	if err != nil {
		return nil, err
	}
	c.sky = sky
	return c, nil
}

// Sky is the catalogue's shared ephemeris, for computations that should
// share it with the feeds (the index page's charts).
func (c *Catalogue) Sky() *Sky { return c.sky }

// window returns the first and last local dates of a feed (00:00 UTC).
func (c *Catalogue) window(f *config.Feed, s *config.Site) (time.Time, time.Time) {
	return WindowAt(f, s, c.opts.Now)
}

// WindowAt returns the first and last local dates (00:00 UTC) of the window
// of feed f of site s built at now: days_back before and days_ahead after
// the date now is in the site's zone, as a catalogue of Options.Now builds it.
func WindowAt(f *config.Feed, s *config.Site, now time.Time) (first, last time.Time) {
	today := localDate(now, s.TimeZone.Location)
	return today.AddDate(0, 0, -f.DaysBack), today.AddDate(0, 0, f.DaysAhead)
}

// Calendars builds every feed of the configuration, in configuration order.
func (c *Catalogue) Calendars(ctx context.Context) ([]*Calendar, error) {
	out := make([]*Calendar, 0, len(c.cfg.Feeds))
	for i := range c.cfg.Feeds {
		cal, err := c.Calendar(ctx, &c.cfg.Feeds[i])
		if err != nil {
			return nil, err
		}
		out = append(out, cal)
	}
	return out, nil
}

// Calendar builds one feed: its header and its entries over its window. It
// stops with ctx's error when ctx is done.
func (c *Catalogue) Calendar(ctx context.Context, f *config.Feed) (*Calendar, error) {
	s, err := c.siteOf(f)
	if err != nil {
		return nil, err
	}
	first, last := c.window(f, s)
	return c.sky.Calendar(ctx, s, f, first, last, c.opts)
}

// Calendar builds one feed for a site over the local dates first..last,
// which must lie within the dates the Sky was made for. It stops with ctx's
// error when ctx is done.
func (sky *Sky) Calendar(ctx context.Context, s *config.Site, f *config.Feed, first, last time.Time, opts Options) (*Calendar, error) {
	first, last = civil(first), civil(last)
	loc := s.TimeZone.Location
	cal := &Calendar{
		ID:          f.ID,
		Title:       f.Title,
		Description: CalendarDescription(s, f),
		Site:        SiteOf(s),
		UTC:         f.UTC,
		Color:       f.Color,
		PageURL:     opts.PageURL,
		Refresh:     opts.Refresh,
		Alarm:       time.Duration(f.Alarm),
		WindowStart: midnight(first, loc).UTC(),
		WindowEnd:   midnight(last.AddDate(0, 0, 1), loc).UTC(),
		LastDate:    last,
		Stamp:       first, // FirstDate
	}
	if !opts.Now.IsZero() {
		cal.Today = localDate(opts.Now, loc)
	}
	if opts.FeedURL != nil {
		cal.URL = opts.FeedURL(f.ID)
	}
	entries, text, found, err := sky.feedEntries(ctx, s, f, first, last)
	if err != nil {
		return nil, fmt.Errorf("feed %q: %w", f.ID, err)
	}
	cal.Entries, cal.text, cal.NotCrossed, cal.SkippedPlans = entries, text, found.notCrossed, found.skippedPlans
	cal.SharedNotes = found.shared
	noteLampLimitGaps(s, f, cal, found.gaps)
	return cal, nil
}

// SiteOf converts a configured site for the renderers.
func SiteOf(s *config.Site) Site {
	site := Site{ID: s.ID, Name: s.Name, Latitude: s.Latitude, Longitude: s.Longitude,
		Elevation: s.Elevation, Location: s.TimeZone.Location, Horizon: s.Horizon, HorizonSet: s.OwnHorizon(),
		Skyline: SkylineFactsOf(s.Skyline, s.HorizonFile)}
	site.Pressure, site.Temperature = airOf(s)
	return site
}

// airOf is the pressure (hPa) and temperature (°C) of the air at site s
// the refraction is computed for: those configured, the standard
// atmosphere's at the site's elevation for the one left out, or zero
// (the standard refraction) without either.
func airOf(s *config.Site) (pressure, temperature float64) {
	if s.Pressure == nil && s.Temperature == nil {
		return 0, 0
	}
	pressure, temperature = astro.StandardAtmosphere(s.Elevation)
	if s.Pressure != nil {
		pressure = *s.Pressure
	}
	if s.Temperature != nil {
		temperature = *s.Temperature
	}
	return pressure, temperature
}

// PlaceOf is the observer and zone of a configured site.
func PlaceOf(s *config.Site) Place {
	o := astro.Observer{Latitude: s.Latitude, Longitude: s.Longitude, Elevation: s.Elevation, Horizon: s.Horizon,
		LevelHorizon: s.Horizon == 0 && s.OwnHorizon()} // horizon: 0 written, without the dip
	o.Pressure, o.Temperature = airOf(s)
	pl := Place{Observer: o, Location: s.TimeZone.Location}
	if len(s.Skyline) > 0 {
		pts := make([]astro.SkyPoint, len(s.Skyline))
		for i, p := range s.Skyline {
			pts[i] = astro.SkyPoint{Azimuth: p[0], Altitude: p[1]}
		}
		pl.Skyline, _ = astro.NewSkyline(pts) // checked by config
	}
	return pl
}

// Entries turns the kinds of one feed into calendar entries for the local
// dates first..last: events with their options applied, notes for dates
// without an event, and daily summaries. Entries are sorted by Start, then
// UID. It stops with ctx's error when ctx is done.
func (sky *Sky) Entries(ctx context.Context, s *config.Site, feedID string, specs []config.KindSpec, first, last time.Time) ([]Entry, error) {
	col := &collector{ctx: ctx, sky: sky, p: PlaceOf(s), first: civil(first), last: civil(last)}
	es, _, err := sky.entries(col, s, feedID, specs, 0, false)
	if err != nil {
		return nil, err
	}
	return sortEntries(es), nil
}

// entries is Entries, unsorted, on a collector for the feed's dates, which
// may have computed some of the Sun's crossings already, with room for
// room more entries (a feed's plans).
//
// With keepText the entries' descriptions and UIDs are not copied out of
// the writer's text buffer but are substrings of it (see flushText), and
// the buffer is returned: it is the memory of those strings, for a
// calendar to hand back on Release (Calendar.text). Without it the
// strings are copies and the buffer is used again at once.
func (sky *Sky) entries(col *collector, s *config.Site, feedID string, specs []config.KindSpec, room int, keepText bool) (_ []Entry, text []byte, _ error) {
	last := col.last
	days := int(col.last.Sub(col.first).Hours()/24) + 1
	w := entryWriter{feedID: feedID, site: col.siteInfo(s), noted: map[string]noted{}, last: civil(last), keepText: keepText}
	w.out = releasedEntries.get(days*(len(specs)+1) + room)
	if keepText {
		// the text of every kind, one after the other, and of the plans
		// (planEntries) after them
		w.text = calendarTexts.get((days*len(specs) + room) * textPerEntry)
	} else {
		w.text = textBuffers.get(days * textPerEntry)
	}
	w.spans = textSpans.get(days + days/8) // a kind's entries: flushText empties it after each
	w.dates, w.firstDay = col.keyDates, col.first.Unix()/secondsPerDay
	if len(w.dates) != days {
		w.dates = dateTexts.get(days)[:days]
		defer dateTexts.put(w.dates)
	}
	defer func() {
		if !keepText {
			textBuffers.reuse(w.text)
		}
		textSpans.put(w.spans)
	}()
	if err := col.prepare(altitudes(col.p.Observer, specs)...); err != nil {
		return nil, nil, err
	}
	for si, spec := range specs {
		w.alarm = alarmOf(spec.Alarm)
		from := len(w.out)
		if spec.Kind.Name == "daily-summary" {
			if err := summaries(col, &w, spec); err != nil {
				return nil, nil, fmt.Errorf("%s: %w", spec.Kind, err)
			}
			w.out = keep(w.out, from, spec)
			continue
		}
		n0, m0 := len(col.events), len(col.notes)
		col.maxLit, col.spec = spec.MaxIllumination, spec
		if err := col.add(spec.Kind); err != nil {
			return nil, nil, fmt.Errorf("%s: %w", spec.Kind, err)
		}
		col.noteUnderMinimum(spec, n0)
		w.out = slices.Grow(w.out, len(col.events)-n0+len(col.notes)-m0)
		if spec.Kind.Name == config.KindLighting {
			w.text = slices.Grow(w.text, (len(col.events)-n0)*lampText)
		}
		evs := col.events[n0:]
		w.begin(&spec, evs, specs, si)
		for i := range evs {
			w.event(&spec, &evs[i])
		}
		for _, n := range col.notes[m0:] {
			if n.Kind.Name == "photoperiod" && !n.Last.IsZero() {
				title, _, _ := describeNote(w.site, n)
				col.found.notCrossed = append(col.found.notCrossed, KindNote{Kind: n.Kind.String(), Title: title})
			}
		}
		moveStretchNotes(col.notes[m0:], spec.Filter(), col.last)
		for _, n := range col.notes[m0:] {
			w.note(n)
		}
		w.flushText()
		w.out = keep(w.out, from, spec)
		if col.found.gaps != nil && spec.Kind.Name == config.KindLighting {
			col.found.gaps.gaps = appendLimitGaps(col.found.gaps.gaps, spec, w.cur.kind, w.out[from:], w.site.zone)
		}
		// each kind's events are done with once they are entries
		col.events, col.notes = col.events[:0], col.notes[:0]
	}
	w.flushText()
	col.found.shared = w.shared
	if keepText {
		return w.out, w.text, nil
	}
	return w.out, nil, nil
}

// slicePool keeps the memory of slices a feed has done with for the next
// feed's: a server making one feed after another spent much of its time
// collecting them.
type slicePool[T any] struct{ p sync.Pool } // of *[]T, empty

// get returns an empty slice with room for n elements, a used one when one
// has enough.
func (sp *slicePool[T]) get(n int) []T {
	if p, ok := sp.p.Get().(*[]T); ok && cap(*p) >= n {
		return *p
	}
	return make([]T, 0, n)
}

// put gives s back for get; nothing it held is kept alive. Neither s nor
// what it holds may be used after the call.
func (sp *slicePool[T]) put(s []T) {
	sp.putUsed(s[:cap(s)])
}

// putUsed is put for a slice that was only appended to from empty, as a
// calendar's text is: what it held past its length was cleared when it
// was given back before, so its length is all there is to clear (a
// calendar's text buffer is made for about 40 % more than it takes).
func (sp *slicePool[T]) putUsed(s []T) {
	clear(s)
	sp.reuse(s)
}

// reuse gives s back for get without clearing it, for a pool of values
// without pointers that nothing reads before writing them (the entry
// writers' scratch text, which flushText copies out).
func (sp *slicePool[T]) reuse(s []T) {
	s = s[:0]
	sp.p.Put(&s)
}

var (
	// releasedEntries holds the entries of released calendars
	// (Calendar.Release): about 0.6 MB for an ad-hoc year feed.
	releasedEntries slicePool[Entry]
	// textBuffers holds the scratch text buffers of entry writers whose
	// flushText copies the text into the entries' strings (about 140 kB
	// for a year of four kinds).
	textBuffers slicePool[byte]
	// calendarTexts holds calendars' text buffers, their entries' text,
	// given back by Release (about 0.6 MB for a year of five kinds): a pool
	// of their own, so that a calendar is not handed a scratch buffer too
	// small for it, to drop.
	calendarTexts slicePool[byte]
	// textSpans holds the entry writers' lists of where each entry's
	// text is (entryWriter.spans), about 15 kB for a year.
	textSpans slicePool[textSpan]
	// collectorBuffers holds the working slices of feeds' collectors (see
	// feedEntries): about 70 kB for a year of four kinds.
	collectorBuffers = sync.Pool{New: func() any { return new(buffers) }}
	// scratchEvents holds collectors' event buffers (see feedEntries):
	// about 0.2 MB for a year of four kinds.
	scratchEvents slicePool[Event]
)

// Release tells that c's entries are no longer used: their memory, and
// that of their descriptions, titles and UIDs (substrings of c.text),
// serves a calendar built after. Neither the entries nor any string taken
// from them may be used after the call; c's other fields (ID, Title,
// Site, URL, Stamp, Today, TrimmedTo) are not pooled and stay as they are.
func (c *Calendar) Release() {
	releasedEntries.put(c.Entries)
	c.Entries = nil
	if c.text != nil {
		calendarTexts.putUsed(c.text)
		c.text = nil
	}
}

// kindRank is each kind's place in the catalogue (config.KindNames).
var kindRank = func() map[string]int {
	m := make(map[string]int, len(config.KindNames))
	for i, n := range config.KindNames {
		m[n] = i
	}
	return m
}()

// AllDayOrder orders the all-day entries of one date, given by their kind
// (as written, "photoperiod:12h") and title, by one fixed rule that feeds,
// `heliocal events --feed`, the builder's preview and the /at table share:
// the kinds in the catalogue's order (config.KindNames: the Sun, twilight,
// the year, the Moon, eclipses; plans after them all), then the kind as
// written, then the title.
func AllDayOrder(aKind, aTitle, bKind, bTitle string) int {
	return allDayOrder(aKind, aTitle, bKind, bTitle, nil)
}

// allDayOrder is AllDayOrder with the kinds' ranks from kr (nil: each
// looked up).
func allDayOrder(aKind, aTitle, bKind, bTitle string, kr *kindRanks) int {
	if aKind != bKind {
		if c := kr.of(aKind) - kr.of(bKind); c != 0 {
			return c
		}
		return naturalCompare(aKind, bKind)
	}
	return strings.Compare(aTitle, bTitle)
}

// kindRankOf is the rank of a kind as written ("photoperiod:12h") in
// AllDayOrder: its base name's place in the catalogue, any other after
// them all.
func kindRankOf(k string) int {
	base, _, _ := strings.Cut(k, ":")
	if r, ok := kindRank[base]; ok {
		return r
	}
	return len(kindRank)
}

// kindRanks keeps the ranks (kindRankOf) of the first kinds a sort asks
// for, by their strings: the entries of one kinds entry share the kind's
// string, and a sort asks for a rank at every tie (a lamp period and the
// sunset it starts at), where looking it up in kindRank cost more than
// the rest of the comparison.
type kindRanks struct {
	n    int
	kind [8]string
	rank [8]int
}

// of returns kindRankOf(k), kept in kr (when kr is not nil).
func (kr *kindRanks) of(k string) int {
	if kr == nil {
		return kindRankOf(k)
	}
	for i := range kr.n {
		if sameString(kr.kind[i], k) {
			return kr.rank[i]
		}
	}
	r := kindRankOf(k)
	if kr.n < len(kr.kind) {
		kr.kind[kr.n], kr.rank[kr.n] = k, r
		kr.n++
	}
	return r
}

// naturalCompare orders strings as text, but runs of digits by their value:
// "photoperiod:9h" before "photoperiod:12h".
func naturalCompare(a, b string) int {
	isDigit := func(c byte) bool { return '0' <= c && c <= '9' }
	for a != "" && b != "" {
		if isDigit(a[0]) && isDigit(b[0]) {
			i, j := 0, 0
			for i < len(a) && isDigit(a[i]) {
				i++
			}
			for j < len(b) && isDigit(b[j]) {
				j++
			}
			x, y := strings.TrimLeft(a[:i], "0"), strings.TrimLeft(b[:j], "0")
			if c := len(x) - len(y); c != 0 {
				return c
			}
			if c := strings.Compare(x, y); c != 0 {
				return c
			}
			a, b = a[i:], b[j:]
			continue
		}
		if a[0] != b[0] {
			return int(a[0]) - int(b[0])
		}
		a, b = a[1:], b[1:]
	}
	return len(a) - len(b)
}

// CompareEntries is the order of a calendar's entries: by their site-local
// Date; a date's all-day entries first, among themselves by AllDayOrder;
// then its timed ones by Start, those with the same Start (lamps that come
// on at sunset, and the sunset) by AllDayOrder too, the same on every
// date; then by UID. It is the order of the
// builder's preview and the /at table, date by date, in which an entry
// listed under the evening before (the part of a night after midnight)
// stays with its date.
func CompareEntries(a, b *Entry) int {
	if c := a.Date.Compare(b.Date); c != 0 {
		return c
	}
	switch {
	case a.AllDay != b.AllDay:
		if a.AllDay {
			return -1
		}
		return 1
	case a.AllDay:
		if c := AllDayOrder(a.Kind, a.Title, b.Kind, b.Title); c != 0 {
			return c
		}
	}
	if c := a.Start.Compare(b.Start); c != 0 {
		return c
	}
	if !a.AllDay { // all-day entries: AllDayOrder said 0 above
		if c := AllDayOrder(a.Kind, a.Title, b.Kind, b.Title); c != 0 {
			return c
		}
	}
	return strings.Compare(a.UID, b.UID)
}

// sortEntries puts entries in the order of CompareEntries, in place. The
// entries come in a few runs already in that order (each kind's, date after
// date), so it finds the runs and merges them as indices, then moves each
// entry once: entries are large, and moving them dominated the sort.
func sortEntries(es []Entry) []Entry {
	n := int32(len(es))
	if n < 2 {
		return es
	}
	// CompareEntries on a copy of what it reads first, side by side
	keys := sortKeys.get(int(n))[:n]
	defer sortKeys.put(keys)
	for i := range es {
		e := &es[i]
		keys[i] = sortKey{date: e.Date.Unix(), dateNs: int32(e.Date.Nanosecond()), start: e.Start.Unix(), startNs: int32(e.Start.Nanosecond()), allDay: e.AllDay}
	}
	var ranks kindRanks
	order := func(i, j int32) int {
		a, b := &keys[i], &keys[j]
		switch {
		case a.date != b.date:
			return cmp.Compare(a.date, b.date)
		case a.dateNs != b.dateNs:
			return cmp.Compare(a.dateNs, b.dateNs)
		case a.allDay != b.allDay:
			if a.allDay {
				return -1
			}
			return 1
		case a.allDay:
			if c := allDayOrder(es[i].Kind, es[i].Title, es[j].Kind, es[j].Title, &ranks); c != 0 {
				return c
			}
		}
		switch {
		case a.start != b.start:
			return cmp.Compare(a.start, b.start)
		case a.startNs != b.startNs:
			return cmp.Compare(a.startNs, b.startNs)
		}
		if !a.allDay { // all-day entries: AllDayOrder said 0 above
			if c := allDayOrder(es[i].Kind, es[i].Title, es[j].Kind, es[j].Title, &ranks); c != 0 {
				return c
			}
		}
		return strings.Compare(es[i].UID, es[j].UID)
	}
	ends := []int32{} // the end of each run but the last
	for i := int32(1); i < n; i++ {
		// a run's neighbours are mostly of different dates, which the
		// keys order without a call
		if a, b := &keys[i-1], &keys[i]; a.date > b.date || a.date == b.date && order(i-1, i) > 0 {
			ends = append(ends, i)
		}
	}
	if len(ends) == 0 {
		return es // in order already
	}
	ends = append(ends, n)
	idx, tmp := sortIndices.get(int(n))[:n], sortIndices.get(int(n))[:n]
	defer sortIndices.put(idx)
	defer sortIndices.put(tmp)
	for i := range idx {
		idx[i] = int32(i)
	}
	if !byDate(keys, idx, order) {
		mergeRuns(idx, tmp, ends, order)
	}
	// es[i] takes the entry at idx[i]: follow each cycle of the permutation
	for i := range idx {
		if idx[i] == int32(i) {
			continue
		}
		held, j := es[i], int32(i)
		for {
			k := idx[j]
			idx[j] = j
			if k == int32(i) {
				es[j] = held
				break
			}
			es[j], j = es[k], k
		}
	}
	return es
}

// byDate puts the indices idx (0..n-1) in the order given by order: by a counting
// sort of the entries' dates (keys), then each date's few entries by
// insertion, in time linear in the entries however many runs they come in.
// It keeps the order of equal entries. It reports false, leaving idx as it
// is, when the dates are too far apart for one bucket each.
func byDate(keys []sortKey, idx []int32, order func(i, j int32) int) bool {
	lo, hi := keys[0].date, keys[0].date
	for i := range keys {
		lo, hi = min(lo, keys[i].date), max(hi, keys[i].date)
	}
	nb := (hi-lo)/secondsPerDay + 1
	if nb > 4*int64(len(keys))+8 {
		return false
	}
	starts := sortIndices.get(int(nb) + 1)[:nb+1] // bucket b holds idx[starts[b]:starts[b+1]]
	defer sortIndices.put(starts)
	for i := range keys {
		starts[(keys[i].date-lo)/secondsPerDay+1]++
	}
	for b := range nb {
		starts[b+1] += starts[b]
	}
	next := sortIndices.get(int(nb))[:nb]
	defer sortIndices.put(next)
	copy(next, starts[:nb])
	for i := range keys {
		b := (keys[i].date - lo) / secondsPerDay
		idx[next[b]] = int32(i)
		next[b]++
	}
	for b := range nb {
		run := idx[starts[b]:starts[b+1]]
		if len(run) > 32 {
			slices.SortStableFunc(run, order)
			continue
		}
		for j := 1; j < len(run); j++ {
			for m := j; m > 0; m-- {
				// two timed entries of one date at different instants
				// (most of a date's) are ordered by their keys' starts,
				// as order orders them, without a call
				a, b := &keys[run[m]], &keys[run[m-1]]
				if a.date == b.date && a.dateNs == b.dateNs && !a.allDay && !b.allDay && (a.start != b.start || a.startNs != b.startNs) {
					if a.start > b.start || a.start == b.start && a.startNs > b.startNs {
						break
					}
				} else if order(run[m], run[m-1]) >= 0 {
					break
				}
				run[m], run[m-1] = run[m-1], run[m]
			}
		}
	}
	return true
}

// mergeRuns puts the indices idx (0..n-1, in runs ending at ends, each in
// the order given by order) in that order, using tmp; it keeps the order of
// equal entries.
func mergeRuns(idx, tmp, ends []int32, order func(i, j int32) int) {
	startOf := func(r int) int32 {
		if r == 0 {
			return 0
		}
		return ends[r-1]
	}
	// merge the two neighbouring runs with the fewest entries until one
	// run is left: a short run (a plan's dates, a note) is not merged again
	// and again with the long ones. Each merge keeps the order of equal
	// entries, and so does the whole.
	for len(ends) > 1 {
		best := 0
		for r := 1; r+1 < len(ends); r++ {
			if ends[r+1]-startOf(r) < ends[best+1]-startOf(best) {
				best = r
			}
		}
		lo, mid, hi := startOf(best), ends[best], ends[best+1]
		i, j, k := lo, mid, lo
		for ; i < mid && j < hi; k++ {
			if order(idx[j], idx[i]) < 0 {
				tmp[k], j = idx[j], j+1
			} else {
				tmp[k], i = idx[i], i+1
			}
		}
		k += int32(copy(tmp[k:], idx[i:mid]))
		copy(tmp[k:], idx[j:hi])
		copy(idx[lo:hi], tmp[lo:hi])
		ends = append(ends[:best], ends[best+1:]...)
	}
}

// sortKey is what CompareEntries reads of an entry before its kind, title
// and UID: its Date and Start as seconds and nanoseconds, and AllDay.
type sortKey struct {
	date, start     int64
	dateNs, startNs int32
	allDay          bool
}

var (
	sortKeys    slicePool[sortKey]
	sortIndices slicePool[int32]
)

// summaries adds one all-day entry per date: sunrise, sunset, day length and
// civil twilight.
func summaries(col *collector, w *entryWriter, spec config.KindSpec) error {
	sub := &collector{ctx: col.ctx, sky: col.sky, p: col.p, first: col.first, last: col.last, thresholds: col.thresholds, lengths: col.lengths}
	for _, name := range []string{"sunrise", "sunset", "civil-dawn", "civil-dusk"} {
		if err := sub.add(config.Kind{Name: name}); err != nil {
			return err
		}
	}
	if err := sub.dayLengths(); err != nil {
		return err
	}
	byDate := map[time.Time][]Event{}
	for _, e := range sub.events {
		byDate[e.Date] = append(byDate[e.Date], e)
	}
	notes := map[time.Time][]Note{}
	for _, n := range sub.notes {
		notes[n.Date] = append(notes[n.Date], n)
	}
	byStart := func(evs []Event) {
		sort.Slice(evs, func(a, b int) bool { return evs[a].Start.Before(evs[b].Start) })
	}
	late, err := sub.dayEnds(col.p.riseAlt()) // the sunsets after midnight that end a day (over a skyline too, as dayLengths counts them)
	if err != nil {
		return err
	}
	lateDusks, err := sub.dayEnds(astro.CivilTwilight) // the civil dusks after midnight that end a date's twilight
	if err != nil {
		return err
	}
	for i, d := 0, col.first; !d.After(col.last); i, d = i+1, d.AddDate(0, 0, 1) {
		if sub.gone(d) {
			continue // the clocks jump over the date: no daylight to sum up
		}
		evs, ns := byDate[d], notes[d]
		byStart(evs)
		if t := sub.lateEnd(late, d); !t.IsZero() {
			// The day's sunset comes after midnight: the day length
			// counts it, so the summary shows it instead of saying
			// there is no sunset today.
			set := Event{Kind: config.Kind{Name: "sunset"}, Start: t, Direction: astro.Setting, Date: d.AddDate(0, 0, 1)}
			evs = append(evs[:len(evs):len(evs)], set)
			ns = slices.DeleteFunc(slices.Clone(ns), func(n Note) bool {
				return n.Kind.Name == "sunset" && n.State == astro.Crosses
			})
		}
		carried := !sub.lateEnd(late, d.AddDate(0, 0, -1)).IsZero() // the date's first sunset ends the day before
		dusk := sub.lateEnd(lateDusks, d.AddDate(0, 0, -1))         // the civil dusk that ends the day before's twilight
		w.summary(spec, d, sub.lengths[i+1], sub.lengths[i+1]-sub.lengths[i], evs, ns, carried, dusk)
	}
	return nil
}

// entryWriter turns events and notes into entries with stable UIDs.
type entryWriter struct {
	feedID string
	site   *siteInfo
	seen   map[string]int
	// keys holds the bytes of seen's keys, one after the other (see keep).
	keys  []byte
	noted map[string]noted // notes already written, by family and date
	// shared are the kinds a note stands for beside its own (SharedNotes)
	shared map[string][]string
	cats   map[string][]string
	buf    []byte
	// out holds the entries written; its elements past its length are
	// zero (keep clears those it drops), so that next need not zero them
	out   []Entry
	last  time.Time      // the last local date of the feed
	alarm *time.Duration // the alarm of the kinds entry or plan being written, nil for the feed's
	lamp  *lightingText  // the text of the lighting kind last written
	names map[config.Kind]string
	cur   specState // the kinds entry being written
	// scratch holds a description while an offset's line goes before it
	scratch []byte

	// text holds the descriptions and UIDs of the events written since
	// the last flushText, and spans where each is: flushText makes them
	// substrings of one string, instead of two strings per entry. With
	// keepText that string is text itself from flushed on, never copied:
	// text is only appended to, and the entries own it (see entries).
	text     []byte
	spans    []textSpan
	keepText bool
	flushed  int

	// digest hashes the UIDs' keys (see appendHash).
	digest *blockDigest
	// clockOn finds the plans' clock times on their dates
	// (collector.clockOnDay, from its midnights); planEntries sets it
	clockOn *collector

	// dates are the texts of the window's dates in the UIDs' keys, from
	// the date firstDay (days since 1970-01-01), each written when first
	// asked (see appendKeyDate); empty when the writer has none.
	dates    []dateText
	firstDay int64
}

// dateText is a date as appendDate writes it, "2026-11-03"; all zero
// until it is written.
type dateText [len(time.DateOnly)]byte

// dateTexts holds the entry writers' tables of date texts (about 4 kB
// for a 400-day window).
var dateTexts slicePool[dateText]

// appendKeyDate appends the date d (00:00 UTC) as appendDate writes it,
// from the window's table of date texts when d is in it: each of a
// feed's kinds names every date of the window in its UIDs' keys, and the
// civil date of an instant is the costly part of writing one.
func (w *entryWriter) appendKeyDate(b []byte, d time.Time) []byte {
	u := d.Unix()
	if i := u/secondsPerDay - w.firstDay; i >= 0 && i < int64(len(w.dates)) && u%secondsPerDay == 0 && d.Nanosecond() == 0 {
		t := &w.dates[i]
		if t[0] == 0 {
			// a date of four-digit year fills the array in place;
			// any other (longer: part of it may be in the array) is
			// written afresh each time
			if s := appendDate(t[:0], d); len(s) != len(t) {
				*t = dateText{}
				return appendDate(b, d)
			}
		}
		return append(b, t[:]...)
	}
	return appendDate(b, d)
}

// kindName returns k.String(), written once per feed for the kinds with a
// parameter (lighting:16h).
func (w *entryWriter) kindName(k config.Kind) string {
	switch k.Name {
	case config.KindSunAltitude, config.KindSunBand, config.KindPhotoperiod, config.KindLighting:
	default:
		return k.Name
	}
	if n, ok := w.names[k]; ok {
		return n
	}
	if w.names == nil {
		w.names = map[config.Kind]string{}
	}
	n := k.String()
	w.names[k] = n
	return n
}

// textSpan locates the description (text[from:to]) and the UID
// (text[uid:uid+uidLen]) of the entry out[entry], and its title
// (text[title:row]) and the title's row form (text[row:uid], RowTitle)
// when title is not 0.
type textSpan struct{ entry, from, to, uid, title, row int }

// textPerEntry is room for the description and UID of most entries: a
// dawn or dusk with its caution takes about 190 bytes with its title, a
// sunrise 150, a golden hour 160, a lamp period 220–270, a plan 250–300.
// A calendar keeps all of its buffer (keepText) until it is released, so
// room to spare is memory the collector must sweep with every calendar.
const textPerEntry = 256

// keysChunk is the largest size of an array of entryWriter.keys: a new
// one is started when a key does not fit in the rest of the last one.
const keysChunk = 16 << 10

// uidLen is the length of a UID: 24 hex digits and "@heliocal".
const uidLen = 24 + len("@heliocal")

// uid derives a stable UID from the identity of an entry, never from its
// computed time: a rebuild that moves an event by a second keeps its UID.
func (w *entryWriter) uid(parts ...string) string {
	b := append(w.buf[:0], w.feedID...)
	for _, p := range parts {
		b = append(append(b, '|'), p...)
	}
	return string(w.appendUID(make([]byte, 0, uidLen), b))
}

// appendUID appends to dst the UID of the entry whose identity is key (the
// feed id and the parts, each after a '|'): the first 12 bytes of the
// SHA-256 of key and the number of entries with the same key before it, in
// hex, and "@heliocal". key may be w.buf, which it reuses.
func (w *entryWriter) appendUID(dst, key []byte) []byte {
	if w.seen == nil {
		w.seen = map[string]int{}
	}
	n, ok := w.seen[string(key)]
	if ok {
		w.seen[string(key)] = n + 1
	} else {
		w.seen[w.keep(key)] = 1
	}
	key = strconv.AppendInt(append(key, '|'), int64(n), 10)
	w.buf = key
	return w.appendHash(dst, key)
}

// appendHash appends the UID of a key with its count: the first 12 bytes
// of its SHA-256 in hex, and "@heliocal".
func (w *entryWriter) appendHash(dst, key []byte) []byte {
	var sum [sha256.Size]byte
	if w.digest == nil {
		w.digest = newBlockDigest()
	}
	if !w.digest.sum(&sum, key) {
		sum = sha256.Sum256(key)
	}
	// hex.AppendEncode's digits, written in place 4 octets at a time
	n := len(dst)
	dst = slices.Grow(dst, uidLen)[:n+uidLen]
	uid := (*[uidLen]byte)(dst[n:])
	binary.BigEndian.PutUint64(uid[0:8], hexDigits(binary.BigEndian.Uint32(sum[0:4])))
	binary.BigEndian.PutUint64(uid[8:16], hexDigits(binary.BigEndian.Uint32(sum[4:8])))
	binary.BigEndian.PutUint64(uid[16:24], hexDigits(binary.BigEndian.Uint32(sum[8:12])))
	copy(uid[24:], "@heliocal")
	return dst
}

// hexDigits returns the 8 lower-case hex digits of v, the first in the
// top octet: v's nibbles are spread one to an octet (each step moves the
// upper half of every group up by the half's width), then each becomes
// '0'+n, or 'a'+n-10 where n+6 carries into the octet's high nibble.
func hexDigits(v uint32) uint64 {
	x := uint64(v)
	x = (x<<16 | x) & 0x0000ffff0000ffff
	x = (x<<8 | x) & 0x00ff00ff00ff00ff
	x = (x<<4 | x) & 0x0f0f0f0f0f0f0f0f
	letters := (x + 0x0606060606060606) >> 4 & 0x0101010101010101
	return x + 0x3030303030303030 + letters*('a'-'0'-10)
}

// sum writes the SHA-256 of a key of up to two blocks (119 octets)
// to sum and reports true, or reports false for a longer key. A UID's key
// is short, and sha256.Sum256 spent more on its own bookkeeping (copying
// the key into its block, padding it in a second Write, writing out the
// sum) than on compressing the block: here the key is padded in place, as
// FIPS 180-4 §5.1.1 pads it (0x80, zeros, the length in bits), the padded
// blocks go to a reused digest in one Write, which compresses them straight
// from the array, and the digest's state after them, which is the SHA-256
// of the key, is read from its binary form (crypto/sha256: "sha\x03", then
// the eight state words, big-endian). A test holds it to sha256.Sum256
// for every length.
func (d *blockDigest) sum(sum *[sha256.Size]byte, key []byte) bool {
	const block = 64
	n := len(key)
	if n > 2*block-9 {
		return false
	}
	size := block
	if n > block-9 {
		size = 2 * block
	}
	padded := d.padded[:size]
	copy(padded, key)
	padded[n] = 0x80
	clear(padded[n+1 : size-8])
	binary.BigEndian.PutUint64(padded[size-8:], uint64(n)*8)
	d.h.Reset()
	d.h.Write(padded)
	state, err := d.state.AppendBinary(d.buf[:0])
	if err != nil || len(state) < 4+sha256.Size || string(state[:4]) != "sha\x03" {
		return false
	}
	copy(sum[:], state[4:])
	return true
}

// blockDigest is a reused digest for sum and the buffer its state is
// read into.
type blockDigest struct {
	h     hash.Hash
	state encoding.BinaryAppender
	// padded is the padded key; the digest's Write would move an array
	// of the stack to the heap.
	padded [128]byte
	buf    [256]byte
}

func newBlockDigest() *blockDigest {
	h := sha256.New()
	return &blockDigest{h: h, state: h.(encoding.BinaryAppender)}
}

// keep returns key as a string over a copy of it in w.keys, instead of
// an allocation of its own per entry. Bytes once written to keys are never
// changed: a key that does not fit in the rest of keys starts a new array.
func (w *entryWriter) keep(key []byte) string {
	if len(key) == 0 {
		return ""
	}
	if cap(w.keys)-len(w.keys) < len(key) {
		// twice the last array, up to keysChunk: a feed whose only keys
		// are a few notes' takes little
		w.keys = make([]byte, 0, max(min(keysChunk, 2*cap(w.keys)), 1024, len(key)))
	}
	from := len(w.keys)
	w.keys = append(w.keys, key...)
	return unsafe.String(&w.keys[from], len(key))
}

// flushText gives the entries written since the last call their
// descriptions and UIDs (see text). It must run before the entries move.
func (w *entryWriter) flushText() {
	if len(w.spans) == 0 {
		return
	}
	var s string
	base := w.flushed
	if w.keepText {
		// the bytes from flushed on are never written again (a longer
		// text goes to a new array, and this one stays as it is)
		s = unsafe.String(&w.text[base], len(w.text)-base)
		w.flushed = len(w.text)
	} else {
		s = string(w.text)
	}
	for _, sp := range w.spans {
		e := &w.out[sp.entry]
		e.Description, e.UID = s[sp.from-base:sp.to-base], s[sp.uid-base:sp.uid-base+uidLen]
		if sp.title > 0 {
			e.Title, e.row = s[sp.title-base:sp.row-base], s[sp.row-base:sp.uid-base]
		}
	}
	if !w.keepText {
		w.text = w.text[:0]
	}
	w.spans = w.spans[:0]
}

// categories returns the CATEGORIES of a kind, built once per feed.
func (w *entryWriter) categories(k config.Kind) []string {
	name := k.Name
	if c, ok := w.cats[name]; ok {
		return c
	}
	if w.cats == nil {
		w.cats = map[string][]string{}
	}
	c := categories(k)
	w.cats[name] = c
	return c
}

// countedKinds are the kinds whose events have the kind of their kinds
// entry: when no other kinds entry of the feed has the same kind and
// offset, their UID keys are told apart by date, part and direction only,
// and begin counts them date by date instead of in seen.
var countedKinds = map[string]bool{
	"sunrise": true, "sunset": true, "civil-dawn": true, "civil-dusk": true, "nautical-dawn": true,
	"nautical-dusk": true, "astronomical-dawn": true, "astronomical-dusk": true, "solar-noon": true,
	"golden-hour": true, "blue-hour": true, config.KindSunBand: true, config.KindSunAltitude: true,
	config.KindPhotoperiod: true, config.KindLighting: true,
}

// specState is what the entries of the kinds entry being written share.
type specState struct {
	kind   string   // the kind as written, of every event
	cats   []string // their CATEGORIES
	prefix []byte   // the start of their UID keys: "<feed>|<kind>|<offset>|"
	// counted: the UID keys are counted per date here (day, onDate)
	// instead of in seen: the events come date after date, and no other
	// entry of the feed can have the same key (countedKinds).
	counted bool
	day     int64
	onDate  []dateCount
	// lamp is the text of a lighting kind's entries (lightingText),
	// looked up once for the kinds entry instead of once per entry
	lamp *lightingText
}

// dateCount counts the entries of one date with one part and direction.
type dateCount struct {
	part string
	dir  astro.Direction
	n    int
}

// offsetText is an offset as UID keys write it.
func offsetText(offset time.Duration) string {
	if offset == 0 {
		return "0s"
	}
	return offset.String()
}

// begin prepares the writing of the events evs of spec, specs[si].
func (w *entryWriter) begin(spec *config.KindSpec, evs []Event, specs []config.KindSpec, si int) {
	st := &w.cur
	st.kind, st.cats, st.counted, st.day, st.onDate = w.kindName(spec.Kind), w.categories(spec.Kind), false, 0, st.onDate[:0]
	st.lamp = nil
	if spec.Kind.Name == config.KindLighting {
		st.lamp = w.lightingText(spec)
		st.lamp.lightingBoth(spec, evs)
	}
	off := offsetText(time.Duration(spec.Offset))
	st.prefix = append(append(append(append(append(st.prefix[:0], w.feedID...), '|'), st.kind...), '|'), off...)
	st.prefix = append(st.prefix, '|')
	if !countedKinds[spec.Kind.Name] {
		return
	}
	for i := range specs {
		if o := &specs[i]; i != si && countedKinds[o.Kind.Name] && o.Kind == spec.Kind && o.Offset == spec.Offset {
			return // the same keys twice: counted in seen
		}
	}
	// the dates in order: each not before the one before, compared as
	// seconds and nanoseconds (Before, without its call)
	var sec int64
	var ns int
	for i := range evs {
		e := &evs[i]
		s, n := e.Date.Unix(), e.Date.Nanosecond()
		if !sameKind(&e.Kind, &spec.Kind) || i > 0 && (s < sec || s == sec && n < ns) {
			return
		}
		sec, ns = s, n
	}
	st.counted = true
}

// sameKind is *a == *b, the parameters first and the name by its
// string's address before its bytes: the events of a kinds entry mostly
// share the kind's string, and the generated comparison of the structs
// was a call per event.
func sameKind(a, b *config.Kind) bool {
	return a.Altitude == b.Altitude && a.High == b.High && a.DayLength == b.DayLength && sameString(a.Name, b.Name)
}

// occurrence returns how many entries of the kinds entry being written
// came before on the local date day with the same part and direction.
func (st *specState) occurrence(day int64, part string, dir astro.Direction) int {
	if day != st.day || len(st.onDate) == 0 {
		st.day, st.onDate = day, st.onDate[:0]
	}
	for i := range st.onDate {
		if c := &st.onDate[i]; c.part == part && c.dir == dir {
			c.n++
			return c.n - 1
		}
	}
	st.onDate = append(st.onDate, dateCount{part, dir, 1})
	return 0
}

// event writes the entry of an event of spec, the kinds entry begin
// prepared. Its description and UID go to text (see flushText).
func (w *entryWriter) event(spec *config.KindSpec, e *Event) {
	offset := time.Duration(spec.Offset)
	z := w.site.zone
	var title, row string // row: the title's form in a row of the date (RowTitle), if another
	// a lamp period's title and its row's form, written to text when
	// kept as they are
	var lamp, lampRow []byte
	from := len(w.text)
	if e.Kind.Name == config.KindLighting {
		var buf [160]byte
		w.text, lamp, lampRow = w.cur.lamp.appendDescription(w.text, buf[:0], w.site, e) // begin's, for spec
		if offset != 0 || spec.Label != "" {
			title, lamp = string(lamp), nil
		}
	} else {
		w.text, title, row = appendDescription(w.text, w.site, e)
	}
	if offset != 0 {
		// "<title>: <clock>.\n" before the event's own description
		title = offsetTitle(offset, title)
		if row != "" {
			row = offsetTitle(offset, row)
		}
		w.scratch = append(w.scratch[:0], w.text[from:]...)
		at := e.Start.Add(offset)
		w.text = z.appendClock(append(append(w.text[:from], title...), ": "...), at)
		w.text = append(z.appendDayOf(w.text, at, e.Date), ".\n"...)
		w.text = append(w.text, w.scratch...)
	}
	if spec.Label != "" {
		title, row = spec.Label, "" // the user's words, in a row too
	}
	st := &w.cur
	kind := st.kind
	if !sameKind(&e.Kind, &spec.Kind) {
		kind = w.kindName(e.Kind)
	}
	en := w.next()
	en.Kind, en.Title, en.row, en.Start, en.End, en.Date, en.Alarm = kind, title, row, e.Start, e.End, e.Date, w.alarm
	if offset != 0 {
		en.Start = e.Start.Add(offset)
		if !e.End.IsZero() {
			en.End = e.End.Add(offset)
		}
	}
	if e.Kind.Name == spec.Kind.Name {
		en.Categories = st.cats
	} else {
		en.Categories = w.categories(e.Kind)
	}
	// field by field into the zero entry: no Facts made and copied
	f := &en.Facts
	f.Part, f.Direction, f.Altitude, f.Azimuth = e.Part, e.Direction, e.Altitude, e.Azimuth
	f.Illuminated, f.DayLength, f.DirectSun = e.Illuminated, e.DayLength, e.DirectSun
	f.Open, f.LongDay = e.Open, e.LongDay
	if e.more != nil { // a lamp period, an eclipse, a perihelion or aphelion, a season
		f.Lamp, f.Short, f.Distance = e.more.lamps.Lamp, e.more.lamps.Short, e.more.distance
		f.Eclipse = e.EclipseFacts()
	}
	if entryAllDay(spec, &e.Kind) {
		d := e.Date
		if !onNightDate(e, offset) {
			d = z.date(en.Start)
		}
		en.AllDay, en.Start, en.End, en.Date = true, d, d.AddDate(0, 0, 1), d
	}
	sp := textSpan{entry: len(w.out) - 1, from: from, to: len(w.text), uid: len(w.text)}
	if lamp != nil {
		w.text = append(append(w.text, lamp...), lampRow...)
		sp.title, sp.row, sp.uid = sp.to, sp.to+len(lamp), len(w.text)
	}
	// the UID of the parts kind, offset, date, part and direction
	var key []byte
	if kind == st.kind {
		key = append(w.buf[:0], st.prefix...)
	} else {
		key = append(append(append(append(w.buf[:0], w.feedID...), '|'), kind...), '|')
		key = append(append(key, offsetText(offset)...), '|')
	}
	key = append(w.appendKeyDate(key, e.Date), '|')
	key = append(append(append(key, e.Part...), '|'), dirString(e.Direction)...)
	if st.counted {
		n := st.occurrence(e.Date.Unix()/secondsPerDay, e.Part, e.Direction)
		key = strconv.AppendInt(append(key, '|'), int64(n), 10)
		w.buf = key
		w.text = w.appendHash(w.text, key)
	} else {
		w.text = w.appendUID(w.text, key)
	}
	w.spans = append(w.spans, sp)
}

// next adds a zero entry to out and returns it. out's elements past its
// length are zero (see entryWriter.out): the entry is not zeroed again
// when there is room, which cost as much as writing it.
func (w *entryWriter) next() *Entry {
	if len(w.out) == cap(w.out) {
		w.out = append(w.out, Entry{})
	} else {
		w.out = w.out[:len(w.out)+1]
	}
	return &w.out[len(w.out)-1]
}

func (w *entryWriter) note(n Note) {
	var title, row, desc string
	if n.Kind.Name == config.KindLighting {
		title, desc = describeLightingNote(w.site, n, w.last)
	} else {
		title, row, desc = describeNote(w.site, n)
	}
	key := "note|" + n.Family + "|" + n.Date.Format(time.DateOnly)
	if was, ok := w.noted[key]; ok {
		// the same state from a sibling kind (sunrise and sunset): one
		// entry, which stands for this kind too
		if k := n.Kind.String(); k != was.kind && !slices.Contains(w.shared[was.uid], k) {
			if w.shared == nil {
				w.shared = map[string][]string{}
			}
			w.shared[was.uid] = append(w.shared[was.uid], k)
		}
		return
	}
	uid := w.uid(key)
	w.noted[key] = noted{uid, n.Kind.String()}
	w.out = append(w.out, Entry{
		UID:         uid,
		Kind:        n.Kind.String(),
		Title:       title,
		row:         row,
		Description: desc,
		Categories:  w.categories(n.Kind),
		Start:       n.Date,
		End:         n.Date.AddDate(0, 0, 1),
		AllDay:      true,
		Date:        n.Date,
		Alarm:       w.alarm,
		Facts:       Facts{Note: true, State: n.State, Until: n.Until, DayLength: n.DayLength, DirectSun: n.DirectSun, Short: n.Lamp > 0, Longest: n.Longest},
	})
}

// noted is a note entry written: its UID and kind.
type noted struct{ uid, kind string }

func (w *entryWriter) summary(spec config.KindSpec, d time.Time, length, change time.Duration, evs []Event, notes []Note, carried bool, dusk time.Time) {
	title, desc := describeSummary(w.site, d, length, change, evs, notes, carried, dusk)
	if spec.Label != "" {
		title = spec.Label
	}
	w.out = append(w.out, Entry{
		UID:         w.uid("daily-summary", d.Format(time.DateOnly)),
		Kind:        "daily-summary",
		Title:       title,
		Description: desc,
		Categories:  []string{"Sun", "Daylight"},
		Start:       d,
		End:         d.AddDate(0, 0, 1),
		AllDay:      true,
		Date:        d,
		Alarm:       w.alarm,
		Facts:       Facts{DayLength: length, DayChange: change, DirectSun: len(w.site.Skyline) > 0},
	})
}

// alarmOf converts a configured alarm (nil: the feed's) for the entries.
func alarmOf(a *config.Duration) *time.Duration {
	if a == nil {
		return nil
	}
	d := a.D()
	return &d
}

// keep applies the date filters (weekdays, months, dates) and min_duration of
// spec to the entries es[from:] it produced, in place.
func keep(es []Entry, from int, spec config.KindSpec) []Entry {
	f, minLen := spec.Filter(), spec.MinDuration.D()
	if f.IsZero() && minLen <= 0 {
		return es
	}
	out := es[:from]
	for i := from; i < len(es); i++ {
		e := &es[i]
		if !kept(f, minLen, e.Date, e.Start, e.End, e.AllDay) {
			continue
		}
		if len(out) != i {
			es[len(out)] = *e
		}
		out = out[:len(out)+1]
	}
	clear(es[len(out):]) // what entryWriter.next expects past the length
	return out
}

// kept reports whether a kinds entry with the date filter f and the
// min_duration minLen keeps its entry of the local date date, from start
// to end (zero for an instant), all-day or not: an all-day entry or an
// instant has no length to fall short of the minimum.
func kept(f config.DateFilter, minLen time.Duration, date, start, end time.Time, allDay bool) bool {
	if !f.Allows(date) {
		return false
	}
	return minLen <= 0 || allDay || end.IsZero() || end.Sub(start) >= minLen
}

// entryAllDay reports whether spec makes the entry of an event of kind k
// all-day: on the local date of its start (offset included), with no length.
func entryAllDay(spec *config.KindSpec, k *config.Kind) bool {
	return spec.AllDay || k.Name == "photoperiod"
}

// onNightDate reports whether the all-day entry of e, moved by offset, is
// on the date of its night (e.Date) rather than on the local date of its
// start: a dark window without an offset, as its title and the notes of
// nights without one have it, not on the next morning's date of a window
// that begins after midnight.
func onNightDate(e *Event, offset time.Duration) bool {
	return offset == 0 && e.Kind.Name == "dark-window"
}

// keepEvents applies the date filters and min_duration of spec to the
// events it gave (evs) and their notes as keep applies them to the
// entries made of them, in place, and returns what is kept: an event is
// kept when its entry is, dated and measured as entryWriter.event makes it
// (an all-day entry on the local date in loc of its start with spec's
// offset, or on its night's, onNightDate). Notes are all-day entries of their date, a stretch's note
// moved first to the first date of its stretch the filters keep
// (moveStretchNotes; last is the last date computed).
func keepEvents(evs []Event, notes []Note, spec config.KindSpec, loc *time.Location, last time.Time) ([]Event, []Note) {
	f, minLen := spec.Filter(), spec.MinDuration.D()
	if f.IsZero() && minLen <= 0 {
		return evs, notes
	}
	offset := spec.Offset.D()
	if loc == nil {
		loc = time.UTC
	}
	evs = slices.DeleteFunc(evs, func(e Event) bool {
		if entryAllDay(&spec, &e.Kind) {
			d := e.Date
			if !onNightDate(&e, offset) {
				d = localDate(e.Start.Add(offset), loc)
			}
			return !kept(f, minLen, d, e.Start, e.End, true)
		}
		return !kept(f, minLen, e.Date, e.Start, e.End, false)
	})
	moveStretchNotes(notes, f, last)
	notes = slices.DeleteFunc(notes, func(n Note) bool { return !kept(f, minLen, n.Date, n.Date, time.Time{}, true) })
	return evs, notes
}

// moveStretchNotes moves each note of notes that stands for a stretch of
// dates and whose date the filter f leaves out to the first date of the
// stretch that f keeps, in place: the note of a lighting kind that no lamps
// are needed, from its date until the date before its Until (through last,
// the last date computed, without one), and that of a photoperiod
// threshold no date crosses, from its date through its Last. Their words
// hold on any date of the stretch ("No lamps needed until 19 Jan", "Day
// length never reaches 15 h here"), and a date of the stretch the filter
// keeps would otherwise have no entry of the kind and no note either. A
// note of a stretch f keeps no date of stays where it is, for f to leave
// out. A photoperiod note whose longest (or shortest) day f leaves out
// says so (ExtremeLeftOut): the dates it is on do not have that length.
func moveStretchNotes(notes []Note, f config.DateFilter, last time.Time) {
	if f.IsZero() {
		return
	}
	for i := range notes {
		n := &notes[i]
		if n.Kind.Name == "photoperiod" && !n.ExtremeDate.IsZero() {
			n.ExtremeLeftOut = f.LeftOutBy(n.ExtremeDate)
		}
		if f.Allows(n.Date) {
			continue
		}
		end, ok := stretchEnd(n, last)
		if !ok {
			continue
		}
		for d := n.Date.AddDate(0, 0, 1); !d.After(end); d = d.AddDate(0, 0, 1) {
			if f.Allows(d) {
				n.from, n.Date = n.start(), d
				break
			}
		}
	}
}

// stretchEnd is the last date of the stretch n is the note of, and whether
// n is the note of a stretch (see moveStretchNotes) rather than of its own
// date; last is the last date computed.
func stretchEnd(n *Note, last time.Time) (time.Time, bool) {
	switch {
	case n.Kind.Name == "photoperiod" && !n.Last.IsZero():
		return n.Last, true
	case n.Kind.Name == config.KindLighting && n.State == astro.AlwaysAbove && n.Lamp == 0:
		if n.Until.IsZero() {
			return last, true
		}
		return n.Until.AddDate(0, 0, -1), true
	}
	return time.Time{}, false
}
