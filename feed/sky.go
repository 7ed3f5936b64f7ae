package feed

import (
	"cmp"
	"context"
	"fmt"
	"iter"
	"slices"
	"strconv"
	"sync"
	"time"

	"heliocal/astro"
	"heliocal/config"
)

// Event is one computed sky event for a site: an instant (sunrise, an
// equinox, a threshold crossing) or a span (golden hour, a dark window).
// Events carry the numbers the descriptions quote.
type Event struct {
	Kind config.Kind
	// Start is the instant (UTC); End is the end of a span, zero for an instant.
	Start, End time.Time
	// Date is the site-local date of Start, at 00:00 UTC; a dark window's
	// is the date of its night (the evening it begins on), also when it
	// begins after midnight.
	Date time.Time
	// Part distinguishes the occurrences of a span kind on one date:
	// "morning", "evening", "night" or "all-day"; for a cross-quarter day it
	// is the Sun's apparent longitude in degrees ("315" in early February).
	Part string

	// Values quoted in descriptions; zero when they do not apply.
	Altitude    float64       // solar noon: the Sun's altitude, degrees; a band's span of part "all-day" ("night"): the Sun's highest (lowest) altitude in it
	DayLength   time.Duration // sunrise/sunset/photoperiod: time the Sun is up on Date
	DayChange   time.Duration // DayLength minus the previous date's
	Azimuth     float64       // sunrise/sunset/moonrise/moonset: direction, degrees from north through east
	Low, High   float64       // golden-hour, blue-hour, sun-band: the altitude bounds, degrees
	Illuminated float64       // Moon events: illuminated fraction 0..1
	DirectSun   bool          // DayLength is the direct Sun over a skyline (sunrise, sunset, daily summary, photoperiod, lighting)
	LongDay     bool          // sunset: it ends a period of more than a day above the horizon (midnight sun); DayLength and DayChange are zero
	Open        bool          // a band's span not left again before the window ends (near a pole): End is the end of the window
	Waxing      bool          // Moon events: the Moon is waxing
	// Direction is set for threshold crossings: astro.Rising or astro.Setting.
	Direction astro.Direction

	// more holds the facts of the kinds whose events are few or have more
	// to say (lighting, eclipses, perihelion and aphelion, seasons), read
	// through LampFacts, EclipseFacts, Distance and SeasonLength; nil for
	// every other kind.
	more *eventMore
}

// eventMore is what an Event keeps out of line, so that the events of the
// daily kinds stay small: a listing's chunk holds thousands of them, each
// written for the first time.
type eventMore struct {
	lamps    LampFacts
	eclipse  EclipseFacts
	distance float64       // perihelion, aphelion: the Earth–Sun distance, au
	season   time.Duration // seasons: the time until the next season starts
}

// Distance returns a perihelion's or aphelion's Earth–Sun distance in au,
// zero for other kinds.
func (e *Event) Distance() float64 {
	if e.more == nil {
		return 0
	}
	return e.more.distance
}

// SeasonLength returns, for the start of a season, the time until the next
// season starts; zero for other kinds.
func (e *Event) SeasonLength() time.Duration {
	if e.more == nil {
		return 0
	}
	return e.more.season
}

// LampFacts are a lighting event's figures of its lamp period
// (Event.LampFacts).
type LampFacts struct {
	Lamp      time.Duration // length of the lamp period
	MadeUp    time.Duration // lamps both: how much longer than its half this period is
	Dropped   time.Duration // lamps both, MadeUpWhy MadeUpMinimum: the length of the other period, left out
	MadeUpWhy MadeUpReason  // lamps both: why this period is longer than its half (MadeUp)
	Short     bool          // the date's lamps fall short of the target (clipped by latest_off/earliest_on)
	Clipped   bool          // this period was cut by latest_off/earliest_on
}

// LampFacts returns a lighting event's lamp figures, zero for other kinds.
func (e *Event) LampFacts() LampFacts {
	if e.more == nil {
		return LampFacts{}
	}
	return e.more.lamps
}

// MadeUpReason says why a lamp period of lamps: both is longer than its
// half of the shortfall (LampFacts.MadeUpWhy); a byte, so that it packs
// beside the lighting flags.
type MadeUpReason uint8

const (
	MadeUpNone    MadeUpReason = iota // not longer than its half
	MadeUpClipped                     // the other period was cut by its limit
	MadeUpMinimum                     // the other period would be under min_duration
	MadeUpDark                        // the other period was cut by the Sun's light (a short night)
)

// MergedSpan reports whether e is a golden or blue hour's (or a sun band's)
// span in which a morning and an evening meet within a day, part "all-day"
// (the Sun stays under the band's upper bound) or "night" (over its lower
// bound): its Altitude is then the Sun's highest or lowest in it. A span of
// days (AroundTheClock) is not one: it has no such altitude.
func MergedSpan(e Event) bool {
	return isBand(e.Kind) && (e.Part == "all-day" || e.Part == "night") && !AroundTheClock(e)
}

// AroundTheClock reports whether e is a band's span in which the Sun stays
// for more than a day (near a pole), or one not left before the window
// ends (Open).
func AroundTheClock(e Event) bool {
	return isBand(e.Kind) && (e.Open || span(e.Start, e.End) > 24*time.Hour)
}

// isBand reports whether k's events are the spans the Sun spends between
// two altitudes (collector.band): golden hour, blue hour, a sun band.
func isBand(k config.Kind) bool {
	switch k.Name {
	case "golden-hour", "blue-hour", config.KindSunBand:
		return true
	}
	return false
}

// EclipseFacts returns the eclipse circumstances of an event, nil for
// other kinds.
func (e *Event) EclipseFacts() *EclipseFacts {
	if e.more == nil || e.more.eclipse.Solar == nil && e.more.eclipse.Lunar == nil {
		return nil
	}
	return &e.more.eclipse
}

// seen reports whether an eclipse's body is over the site's skyline at t
// (always, at a site without a skyline).
func (x *EclipseFacts) seen(t time.Time) bool {
	if !x.Skyline {
		return true
	}
	for _, s := range x.Visible {
		if !t.Before(s.Start) && !t.After(s.End) {
			return true
		}
	}
	return false
}

// Note is an explicit "no event" state for a local date: the Sun does not set,
// twilight never ends, there is no dark window tonight. Feeds show notes as
// all-day entries so a missing event is never silent.
type Note struct {
	Kind  config.Kind
	Date  time.Time // site-local date, 00:00 UTC
	State astro.State
	// Family groups kinds that share one note, e.g. sunrise and sunset both
	// give "the Sun does not set today": one entry, not two.
	Family string
	// Until is, for a lighting note (no lamps needed), the first date on
	// which lamps are needed again; zero when that is after the last date.
	Until time.Time
	// Lamp is, for a lighting note on a date that needs lamps none of which
	// are scheduled, the lamp time needed; Why says why none are ("under
	// the 15 min minimum").
	Lamp time.Duration
	Why  string
	// For a photoperiod threshold that no date of the window crosses (one
	// note on the first date, AlwaysBelow: never reached, AlwaysAbove:
	// never fallen below): the longest (or shortest) day length of the
	// window, its date, and the window's last date.
	DayLength   time.Duration
	ExtremeDate time.Time
	Last        time.Time
	// ExtremeLeftOut is, when the kinds entry's filter leaves ExtremeDate
	// out, the list that does: "months", "weekdays" or "dates"
	// (config.DateFilter.LeftOutBy); the note then says so.
	ExtremeLeftOut string
	// DirectSun: DayLength is the direct Sun over the site's skyline.
	DirectSun bool
	// Hidden: a sunrise or sunset note of a date the Sun stays below the
	// site's skyline (or horizon altitude) while it is up over a flat
	// horizon at noon: behind the hills, not polar night.
	Hidden bool
	// SunUp: a twilight note of a date the Sun stays above the threshold
	// on which the Sun does not set either (midnight sun): there is no
	// twilight that night, only daylight.
	SunUp bool
	// Longest is, for a note of a date whose spans are all shorter than
	// the kind's min_duration (Minimum), the longest of them
	// (noteUnderMinimum); zero for other notes.
	Longest, Minimum time.Duration
	// Dusk is, for a twilight's dusk note (state Crosses) of a date
	// without a dusk of its own (no crossing, or a dawn only), the dusk of
	// that evening, after midnight on the next date; for a dawn's note
	// (state AlwaysAbove) of the last date after a night without one, that
	// evening's dusk likewise; zero otherwise.
	Dusk time.Time
	// from is, for a note of a stretch of dates moved to the first date of
	// the stretch its kinds entry's filter keeps (moveStretchNotes), the
	// stretch's first date; zero for a note on its own date.
	from time.Time
}

// start is the first date of the stretch (or the date) n is the note of.
func (n *Note) start() time.Time {
	if n.from.IsZero() {
		return n.Date
	}
	return n.from
}

// Place is where events are computed: an observer and the zone whose local
// dates the events are grouped by.
type Place struct {
	Observer astro.Observer
	Location *time.Location
	// Skyline, when set, is the horizon per direction: sunrise and sunset
	// are the Sun's first appearance over it and last disappearance behind
	// it, and day lengths count the time above it (direct Sun); moonrise
	// and moonset likewise are the Moon's first appearance and last
	// disappearance in each of its passages across the sky.
	Skyline astro.Skyline
}

// direct reports whether the place's day lengths are hours of direct Sun
// over a skyline per direction rather than sunrise to sunset.
func (p Place) direct() bool { return len(p.Skyline) > 0 }

// skylineKey stands for the skyline in the collector's thresholds (no real
// altitude is this high).
const skylineKey = 1000.0

// riseAlt is the threshold of sunrise and sunset: the geometric altitude of
// the Sun's centre for a single horizon altitude, or skylineKey.
func (p Place) riseAlt() float64 {
	if len(p.Skyline) > 0 {
		return skylineKey
	}
	return p.Observer.RiseSetAltitude()
}

// Sky computes events for any place from one shared ephemeris. It is safe
// for concurrent use.
type Sky struct {
	from, to time.Time
	eph      *astro.Ephemeris

	moonOnce sync.Once
	moon     *astro.MoonEphemeris
	moonErr  error

	years sync.Map // yearKey → yearValue: seasons, cross-quarters, apsides

	eclipseOnce sync.Once
	eclipses    eclipseList

	phaseOnce sync.Once // the Moon's phases over from..to, for plans' date rules
	phaseList []astro.Phase
	phaseErr  error
}

// yearKey names one year's result of a yearly computation.
type yearKey struct {
	what string
	year int
}

type yearValue struct {
	v   any
	err error
}

// yearly returns f(year), computed once per Sky: every feed and site of a
// build shares the year's seasons, cross-quarter days and apsides.
func yearly[T any](s *Sky, what string, year int, f func(int) (T, error)) (T, error) {
	k := yearKey{what, year}
	if v, ok := s.years.Load(k); ok {
		yv := v.(yearValue)
		return yv.v.(T), yv.err
	}
	v, err := f(year)
	s.years.Store(k, yearValue{v, err})
	return v, err
}

// NewSky prepares the shared ephemeris for events on local dates first..last
// (any zone): it adds two days of margin on both sides.
func NewSky(first, last time.Time) (*Sky, error) {
	from, to := first.AddDate(0, 0, -2), last.AddDate(0, 0, 3)
	eph, err := astro.NewEphemeris(from, to)
	if err != nil {
		return nil, err
	}
	return &Sky{from: from, to: to, eph: eph}, nil
}

// Covers reports whether the Sky serves the local dates first..last, as a
// NewSky(first, last) would.
func (s *Sky) Covers(first, last time.Time) bool {
	return !civil(first).AddDate(0, 0, -2).Before(s.from) && !civil(last).AddDate(0, 0, 3).After(s.to)
}

// civil returns the date part of t as 00:00 UTC.
func civil(t time.Time) time.Time {
	y, m, d := t.Date()
	return time.Date(y, m, d, 0, 0, 0, 0, time.UTC)
}

// daysBetween is the number of dates from the civil date from to the civil
// date to (00:00 UTC both): 0 when they are the same date.
func daysBetween(from, to time.Time) int {
	return int(to.Sub(from).Hours()/24 + 0.5)
}

// localDate is the site-local date of the instant t, at 00:00 UTC.
func localDate(t time.Time, loc *time.Location) time.Time {
	return civil(t.In(loc))
}

// midnight is the first instant of the civil date d in loc: its local
// midnight, or the clock change where the clocks jump over midnight.
func midnight(d time.Time, loc *time.Location) time.Time {
	return astro.DateStart(loc, d.Year(), d.Month(), d.Day())
}

// OffsetChange is a change of a zone's UTC offset: from At on, local
// time is UTC + After seconds instead of UTC + Before.
type OffsetChange struct {
	At            time.Time
	Before, After int
}

// OffsetChanges yields the changes of loc's UTC offset after from and
// before to, in order (a change of the zone's abbreviation alone is none).
// It walks astro.ZoneChanges, which steps over the bounds Go's ZoneBounds
// gives past the zone data's last transition without a change (in a leap
// year, 31 December 00:00 UTC as the end of the period for the whole of
// that day: Go 1.26, Europe/Zurich in 2040). The missing dates of a
// listing and the served tables' line of a change of the clocks walk the
// changes here.
func OffsetChanges(loc *time.Location, from, to time.Time) iter.Seq[OffsetChange] {
	return func(yield func(OffsetChange) bool) {
		_, before := from.In(loc).Zone()
		for at := range astro.ZoneChanges(loc, from, to) {
			_, after := at.Zone()
			if after != before && !yield(OffsetChange{At: at, Before: before, After: after}) {
				return
			}
			before = after
		}
	}
}

// missingDates returns the local dates first..last (00:00 UTC) that do not
// exist in loc, in order: dates the clocks jumped over whole, as
// Pacific/Apia's did over 30 December 2011 (from 23:59:59 on the 29th,
// UTC−10, to 00:00 on the 31st, UTC+14). Nearly every zone has none: the
// clocks jump over a date only by moving the offset forward by a day at
// once (every such jump of the tz database: Apia, Fakaofo, Kiritimati,
// Kanton, Kwajalein; Manila, Guam, Saipan, Palau, Chuuk, Pohnpei and Kosrae
// at the end of 1844), so the dates are looked at one by one only around a
// change of offset of 20 h or more forward. Each change in the window is
// looked at (OffsetChanges), not only the offsets at its two ends: over
// 1960–2000 Kwajalein's went back almost a day in 1969 and forward one in
// 1993.
func missingDates(loc *time.Location, first, last time.Time) []time.Time {
	var out []time.Time
	for ch := range OffsetChanges(loc, first.Add(-3*24*time.Hour), last.Add(3*24*time.Hour)) {
		if ch.After-ch.Before < 20*3600 {
			continue
		}
		// the dates from the one the clocks leave to the one they show
		// after the change
		d, end := localDate(ch.At.Add(-time.Second), loc), localDate(ch.At, loc)
		if d.Before(first) {
			d = first
		}
		if end.After(last) {
			end = last
		}
		for ; !d.After(end); d = d.AddDate(0, 0, 1) {
			if skipped(d, loc) {
				out = append(out, d)
			}
		}
	}
	return out
}

// skipped reports whether the local date d (00:00 UTC) does not exist in
// loc: the clocks jump over it whole, so its first instant is on another
// date.
func skipped(d time.Time, loc *time.Location) bool {
	return !localDate(midnight(d, loc), loc).Equal(d)
}

// gone reports whether the local date d (00:00 UTC, first-2..last+1) does
// not exist in the site's zone (missingDates, found once).
func (c *collector) gone(d time.Time) bool {
	return slices.ContainsFunc(c.missing(), d.Equal)
}

// missing returns the dates first-2..last+1 that do not exist in the
// site's zone, found once.
func (c *collector) missing() []time.Time {
	if !c.missingKnown {
		if c.p.Location != nil {
			c.missingDates = missingDates(c.p.Location, c.first.AddDate(0, 0, -2), c.last.AddDate(0, 0, 1))
		}
		c.missingKnown = true
	}
	return c.missingDates
}

// dropMissing takes out of the events from n0 and the notes from m0 those
// of dates that do not exist in the site's zone: a date the clocks jump
// over has no sunrise, no polar night, no lamps and no note. The note of a
// stretch of dates that starts on it (no lamps needed until…) goes to the
// date after it.
func (c *collector) dropMissing(n0, m0 int) {
	if len(c.missing()) == 0 {
		return
	}
	evs := slices.DeleteFunc(c.events[n0:], func(e Event) bool { return c.gone(e.Date) })
	c.events = c.events[:n0+len(evs)]
	ns := c.notes[m0:]
	kept := ns[:0]
	for _, n := range ns {
		if c.gone(n.Date) {
			end, ok := stretchEnd(&n, c.last)
			next := n.Date.AddDate(0, 0, 1)
			if !ok || next.After(end) {
				continue
			}
			n.Date = next
		}
		kept = append(kept, n)
	}
	c.notes = c.notes[:m0+len(kept)]
}

// Events computes every event of kinds on local dates first..last (inclusive,
// 00:00 UTC civil dates) and the notes for dates on which a kind has no
// event. Events are sorted by Start. It stops with ctx's error when ctx is
// done.
func (s *Sky) Events(ctx context.Context, p Place, kinds []config.Kind, first, last time.Time) ([]Event, []Note, error) {
	specs := make([]config.KindSpec, len(kinds))
	for i, k := range kinds {
		specs[i] = config.KindSpec{Kind: k}
	}
	return s.EventsFor(ctx, p, specs, first, last)
}

// EventsFor is Events with the options of each kind that change what is
// computed (a dark window's largest illuminated fraction, the lamps'
// options) or kept: the events and notes are those the kind's entries in a
// feed keep, with its date filters (weekdays, months, dates) and
// min_duration applied as the catalogue applies them (a date whose spans
// min_duration all leaves out has its note). The options that only change
// how entries look (offset, label, all_day) are for the catalogue: the
// events keep their own times (an all-day entry's date, that of its start
// with the offset, is the one its filter reads).
func (s *Sky) EventsFor(ctx context.Context, p Place, specs []config.KindSpec, first, last time.Time) ([]Event, []Note, error) {
	return s.eventsFor(ctx, p, specs, first, last, &buffers{})
}

// buffers are the slices one computation fills, kept by a caller that
// computes chunk after chunk (EventChunks) so that each chunk reuses them.
type buffers struct {
	events        []Event
	notes, mnotes []Note
	order         orderScratch
	crossings     [][]astro.Crossing // the thresholds' crossings (collector.prepare)
	// the collector's working slices by date (day starts and ends, day
	// lengths, dates seen) and the Sun's transits, taken again by the
	// next chunk's collector
	times     reuse[time.Time]
	durations reuse[time.Duration]
	flags     reuse[bool]
	indices   reuse[int32]
	marks     reuse[bandMark] // the crossings of a band's bounds (collector.band)
	transits  []astro.Transit
}

// bandMark is a crossing of one of a band's two bounds.
type bandMark struct {
	t    time.Time
	high bool
	dir  astro.Direction
}

// reuse hands out zeroed slices from a list kept from one chunk to the
// next: a chunk's collector takes the slices it needs, and once the chunk
// is done (release) the next one takes the same slices again.
type reuse[T any] struct {
	list [][]T
	used int
}

// take returns n zero values.
func (r *reuse[T]) take(n int) []T {
	if r.used == len(r.list) {
		r.list = append(r.list, nil)
	}
	s := slices.Grow(r.list[r.used][:0], n)[:n]
	clear(s)
	r.list[r.used] = s
	r.used++
	return s
}

// release makes every slice taken available again.
func (r *reuse[T]) release() { r.used = 0 }

// releaseWorking makes the collector's working slices (times, durations,
// flags by date, a band's crossings) available to the next chunk's
// collector.
func (b *buffers) releaseWorking() {
	b.times.release()
	b.durations.release()
	b.flags.release()
	b.indices.release()
	b.marks.release()
}

// eventsPerDate is about how many events specs give a date: one per kind,
// two for a threshold crossed both ways.
func eventsPerDate(specs []config.KindSpec) int {
	n := 0
	for _, sp := range specs {
		n++
		if sp.Kind.Name == "sun-altitude" {
			n++
		}
	}
	return n
}

// orderScratch is the working memory of orderRuns, kept from one call to
// the next.
type orderScratch struct {
	keys         []int64
	order        []int32
	starts, next []int32 // stableOrder's buckets
	runs         []int32 // where each run of events starts, and the end
	runOf        []int32 // orderRuns: the run of each position in order
}

// orderRuns returns the positions of events in the order of their Start,
// equal starts by position (what a stable sort gives), where runs holds
// the positions at which each run of events begins (a kind's events, in
// order or nearly so) and, last, len(events). It returns too the run of
// each position in order (runOf[i] is the run of events[order[i]]). Both
// are s's, overwritten by the next call.
//
// The runs are merged (merger): a site's kinds come in the same order day
// after day, so the merge takes each event from the run the event one
// period before it came from, checking only that it does not come before
// the event taken last; the runs' next events in a ring in order of start
// (runRing) find the order where that pattern breaks. A run out of order
// (or more runs than the ring holds) sends all the positions through
// stableOrder instead.
func orderRuns(events []Event, runs []int32, s *orderScratch) (order, runOf []int32) {
	n := len(events)
	order = slices.Grow(s.order[:0], n)[:n]
	s.order = order
	runOf = slices.Grow(s.runOf[:0], n)[:n]
	s.runOf = runOf
	if n == 0 {
		return order, runOf
	}
	if len(runs) <= len(runRing{}.heads)+1 {
		m := merger{events: events, order: order, runOf: runOf, nr: len(runs) - 1}
		for r := range m.nr {
			m.at.pos[r], m.end[r] = runs[r], runs[r+1]
		}
		if m.merge() {
			return order, runOf
		}
	}
	keys := slices.Grow(s.keys[:0], n)[:n]
	s.keys = keys
	for i := range events {
		keys[i] = events[i].Start.UnixNano()
	}
	order = stableOrder(keys, s)
	// the run of each position, looked up through the position's run
	// (keys are done with: they hold it)
	for r := 0; r+1 < len(runs); r++ {
		for i := runs[r]; i < runs[r+1]; i++ {
			keys[i] = int64(r)
		}
	}
	for o, i := range order {
		runOf[o] = int32(keys[i])
	}
	return order, runOf
}

// merger merges runs of keys, each in order, into order and runOf (see
// orderRuns).
type merger struct {
	events       []Event
	order, runOf []int32
	nr           int                         // the number of runs
	end          [len(runRing{}.heads)]int32 // where each run ends
	at           mergeState
}

// mergeState is how far a merge has come: the next position of each run,
// the count of positions put in order, the key and run of the last.
type mergeState struct {
	pos     [len(runRing{}.heads)]int32
	o       int
	lastKey int64
	lastRun int32
}

// merge puts every position in order, or returns false for a run out of
// order. The ring takes the first events (two periods of the pattern at
// least) and the stretches after a break; byPattern the rest. A state the
// ring leaves has no run's next event before the last one taken, a state
// byPattern leaves is checked for it (headsAfterLast) before a break can
// send the merge back to it; and each event taken comes after the one
// before (the ring: as long as its runs are in order, which it checks), so
// that the order is a stable sort's.
func (m *merger) merge() bool {
	n := len(m.order)
	stop := min(n, 4*m.nr+8)
	for {
		if !m.byRing(stop) {
			return false
		}
		if m.at.o == n {
			return true
		}
		L := m.period()
		if L == 0 {
			stop = min(n, m.at.o+m.nr+1)
			continue
		}
		good := m.at
		m.byPattern(L, &good)
		if m.at.o == n {
			return true
		}
		// a break of the pattern: from the last state known right, the
		// ring goes on past it
		broke := m.at.o
		m.at = good
		stop = min(n, broke+2*L)
	}
}

// byRing puts positions in order by the ring until stop (at most the
// number of positions); false for a run out of order.
func (m *merger) byRing(stop int) bool {
	var ring runRing
	for r := range m.nr {
		if p := m.at.pos[r]; p < m.end[r] {
			ring.insert(runHead{m.events[p].Start.UnixNano(), int32(r), p})
		}
	}
	o := m.at.o
	for ; o < stop; o++ {
		h := ring.heads[ring.first&ringMask]
		ring.first, ring.n = ring.first+1, ring.n-1
		m.order[o], m.runOf[o] = h.pos, h.run
		m.at.lastKey, m.at.lastRun = h.key, h.run
		if h.pos++; h.pos < m.end[h.run] {
			k := m.events[h.pos].Start.UnixNano()
			if k < h.key {
				return false
			}
			h.key = k
			ring.insert(h)
		} else {
			m.at.pos[h.run] = h.pos
		}
	}
	m.at.o = o
	for j := range ring.n {
		h := &ring.heads[(ring.first+j)&ringMask]
		m.at.pos[h.run] = h.pos
	}
	return true
}

// period returns the shortest period (at most four times the number of
// runs) in which the runs of the last positions put in order repeat twice
// over, 0 when there is none.
func (m *merger) period() int {
	o := m.at.o
	for L := 1; L <= 4*m.nr && 2*L <= o; L++ {
		i := 1
		for i <= L && m.runOf[o-i] == m.runOf[o-i-L] {
			i++
		}
		if i > L {
			return L
		}
	}
	return 0
}

// byPattern puts positions in order, each from the run of the position L
// before it, while that run has one left whose key does not come before
// the last one's (on a tie, whose run does not come before its run): the
// order is then what a stable sort gives, if the state it started from
// was right and no event of another run should come earlier. That is
// checked every 4·L positions (headsAfterLast), and the state then kept
// in good; byPattern returns at the first position that fails either.
func (m *merger) byPattern(L int, good *mergeState) {
	order, runOf, events := m.order, m.runOf[:len(m.order)], m.events
	pos, end := &m.at.pos, &m.end
	lastKey, lastRun := m.at.lastKey, m.at.lastRun
	o := m.at.o
	for o < len(order) {
		stop := min(len(order), o+4*L)
		for ; o < stop; o++ {
			r := runOf[o-L] & int32(ringMask) // (a run is below the ring's size)
			p := pos[r]
			if p >= end[r] {
				break
			}
			k := events[p].Start.UnixNano()
			if k < lastKey || k == lastKey && r < lastRun {
				break
			}
			order[o], runOf[o] = p, r
			pos[r] = p + 1
			lastKey, lastRun = k, r
		}
		m.at.o, m.at.lastKey, m.at.lastRun = o, lastKey, lastRun
		if o < stop || !m.headsAfterLast() {
			return
		}
		*good = m.at
	}
}

// headsAfterLast reports whether the next event of every run comes after
// the last one put in order (on a tie, is of its run or a later one): the
// positions in order so far are then the first of all, in their order.
func (m *merger) headsAfterLast() bool {
	for r := range m.nr {
		if p := m.at.pos[r]; p < m.end[r] {
			if k := m.events[p].Start.UnixNano(); k < m.at.lastKey || k == m.at.lastKey && int32(r) < m.at.lastRun {
				return false
			}
		}
	}
	return true
}

// runHead is a run's next event in orderRuns: its key, its run, its
// position.
type runHead struct {
	key      int64
	run, pos int32
}

// runRing holds the runs' next events in order of key (on a tie, of run),
// in heads[first&ringMask:] and on from the start, n of them.
type runRing struct {
	heads    [32]runHead
	first, n int
}

const ringMask = len(runRing{}.heads) - 1 // the ring's size is a power of two

// insert puts h into the ring in its place, looked for from the back.
func (g *runRing) insert(h runHead) {
	j := g.first + g.n
	for ; j > g.first; j-- {
		q := g.heads[(j-1)&ringMask]
		if h.key > q.key || h.key == q.key && h.run > q.run {
			break
		}
		g.heads[j&ringMask] = q
	}
	g.heads[j&ringMask] = h
	g.n++
}

// stableOrder returns the positions of keys (at least one) in the order of
// their keys, equal keys by position (what a stable sort gives): the
// positions go by a counting sort into buckets of equal width in key, a
// power of two (a shift finds the bucket, not a division), two to four
// positions to a bucket (an hour or two of a site's daily events), and
// each bucket is put in order by insertion (by slices.SortStableFunc when
// it holds many). A site's events come as one run per kind, each in order:
// this takes a few steps per event, where merging the runs through a heap
// took a comparison per level of the heap. The slices are s's, overwritten
// by the next call.
func stableOrder(keys []int64, s *orderScratch) []int32 {
	n := len(keys)
	lo, hi := keys[0], keys[0]
	for _, k := range keys {
		lo, hi = min(lo, k), max(hi, k)
	}
	span := uint64(hi) - uint64(lo)
	shift := 0
	for span>>shift > uint64(n/2) {
		shift++
	}
	nb := int(span>>shift) + 1 // at most n/2 + 1
	bucket := func(k int64) uint64 { return (uint64(k) - uint64(lo)) >> shift }
	starts := slices.Grow(s.starts[:0], nb+1)[:nb+1] // bucket b holds order[starts[b]:starts[b+1]]
	clear(starts)
	for _, k := range keys {
		starts[bucket(k)+1]++
	}
	for b := range nb {
		starts[b+1] += starts[b]
	}
	next := append(s.next[:0], starts[:nb]...)
	order := slices.Grow(s.order[:0], n)[:n]
	for i, k := range keys {
		b := bucket(k)
		order[next[b]] = int32(i)
		next[b]++
	}
	s.starts, s.next, s.order = starts, next, order
	for b := range nb {
		run := order[starts[b]:starts[b+1]]
		if len(run) > 32 {
			slices.SortStableFunc(run, func(x, y int32) int { return cmp.Compare(keys[x], keys[y]) })
			continue
		}
		for j := 1; j < len(run); j++ {
			for m := j; m > 0 && keys[run[m]] < keys[run[m-1]]; m-- {
				run[m], run[m-1] = run[m-1], run[m]
			}
		}
	}
	return order
}

// permute rearranges xs so that xs[i] is what xs[order[i]] was, moving
// each item once along the cycles of order (a permutation of the
// positions), which it uses up.
func permute[T any](xs []T, order []int32) {
	for i := range xs {
		if order[i] < 0 || int(order[i]) == i {
			continue
		}
		held := xs[i]
		j := i
		for {
			k := int(order[j])
			order[j] = -1
			if k == i {
				xs[j] = held
				break
			}
			xs[j] = xs[k]
			j = k
		}
	}
}

// dateRange returns the civil dates of first and last, or an error naming
// both when the range ends before it starts.
func dateRange(first, last time.Time) (time.Time, time.Time, error) {
	first, last = civil(first), civil(last)
	if last.Before(first) {
		return first, last, fmt.Errorf("feed: date range ends (%s) before it starts (%s)",
			last.Format(time.DateOnly), first.Format(time.DateOnly))
	}
	return first, last, nil
}

func (s *Sky) eventsFor(ctx context.Context, p Place, specs []config.KindSpec, first, last time.Time, buf *buffers) ([]Event, []Note, error) {
	events, order, _, notes, err := s.computeEvents(ctx, p, specs, first, last, buf)
	if err != nil {
		return nil, nil, err
	}
	permute(events, order)
	return events, notes, nil
}

// computeEvents is eventsFor without putting the events in order: they
// come as computed, kind after kind, and order lists their positions in
// the order of Start (equal starts in the order of the kinds), as a
// stable sort would put them; spec[i] is the index in specs of the kind
// of events[order[i]]. A writer that reads them through order spares
// moving each 312-byte event once.
func (s *Sky) computeEvents(ctx context.Context, p Place, specs []config.KindSpec, first, last time.Time, buf *buffers) (events []Event, order, spec []int32, notes []Note, err error) {
	first, last, err = dateRange(first, last)
	if err != nil {
		return nil, nil, nil, nil, err
	}
	buf.releaseWorking()
	c := &collector{ctx: ctx, sky: s, p: p, first: first, last: last, events: buf.events[:0], notes: buf.notes[:0], xsBuf: &buf.crossings, scratch: buf}
	// room for about every event at once: grown step by step, the buffer
	// would be copied a dozen times
	days := int(last.Sub(first).Hours()/24) + 1
	c.events = slices.Grow(c.events, days*eventsPerDate(specs)+16)
	if err := c.prepare(altitudes(p.Observer, specs)...); err != nil {
		return nil, nil, nil, nil, fmt.Errorf("feed: %w", err)
	}
	// Each kind appends its own run of events (and of notes), in order or
	// nearly so; the runs are then merged by Start (orderRuns), the notes
	// put in order into a second slice (sortByKey).
	runs := buf.order.runs[:0]
	for _, k := range specs {
		n0, m0 := len(c.events), len(c.notes)
		runs = append(runs, int32(n0))
		c.maxLit, c.spec = k.MaxIllumination, k
		if err := c.add(k.Kind); err != nil {
			return nil, nil, nil, nil, fmt.Errorf("feed: %s: %w", k.Kind, err)
		}
		// what the kind's entries keep, as the catalogue's keep
		c.noteUnderMinimum(k, n0)
		evs, ns := keepEvents(c.events[n0:], c.notes[m0:], k, p.Location, last)
		c.events, c.notes = c.events[:n0+len(evs)], c.notes[:m0+len(ns)]
	}
	runs = append(runs, int32(len(c.events)))
	buf.order.runs = runs
	buf.events, buf.notes = c.events, c.notes
	order, spec = orderRuns(c.events, runs, &buf.order)
	buf.mnotes = sortByKey(c.notes, buf.mnotes[:0], func(n *Note) int64 { return n.Date.Unix() })
	return c.events, order, spec, buf.mnotes, nil
}

// sortByKey appends to out the items of xs in the order of key, equal keys
// in the order of xs (a stable sort, by stableOrder), moving each item
// once.
func sortByKey[T any](xs []T, out []T, key func(*T) int64) []T {
	n := len(xs)
	if n == 0 {
		return out
	}
	keys := make([]int64, n)
	for i := range xs {
		keys[i] = key(&xs[i])
	}
	out = slices.Grow(out, n)
	for _, i := range stableOrder(keys, &orderScratch{}) {
		out = append(out, xs[i])
	}
	return out
}

type collector struct {
	ctx          context.Context // checked between kinds and in the per-date loops
	sky          *Sky
	p            Place
	first, last  time.Time
	events       []Event
	notes        []Note
	lengths      []time.Duration // day lengths for first-1..last, computed once
	lengthBefore time.Duration   // the day length of first-2, for a sunset on first
	starts       []time.Time     // local midnights beginning first-1..last+2, computed once
	dates        []time.Time     // the dates first..last, computed once (dayDates)
	thresholds   map[float64]*threshold
	maxLit       float64         // dark-window: the Moon's largest illuminated fraction still dark
	spec         config.KindSpec // the options of the kind being added (lighting)
	// lamps is the rest of a block of room for the lamp periods' figures
	// (keepLamps), lampBlock the block's length
	lamps     []eventMore
	lampBlock int
	// xsBuf, when set, holds slices the first pass of prepare fills (a
	// chunk's buffers, reused from chunk to chunk)
	xsBuf *[][]astro.Crossing
	// scratch, when set, is where the working slices by date come from
	// (times, durations, flags): a chunk's buffers
	scratch *buffers
	// found receives what the feed's entries find beside them: the notes
	// of the photoperiod thresholds no date crosses, the lighting limits
	// that do nothing on some dates, the kinds a note stands for beside
	// its own
	found found
	// keyDates, when set, is the table of the window's date texts of the
	// UID keys (entryWriter.dates) that the feed's kinds and its plans
	// share: the plans' dates are among the dates the kinds wrote
	keyDates []dateText

	transits    []astro.Transit             // the Sun's transits over first-1..last, computed once (sunTransits)
	noonsByDate map[time.Time]astro.Transit // the same by local date (noonOf)
	noonAlone   map[time.Time]time.Time     // dates' solar noons searched one by one (solarNoon)
	zc          *zoneCache                  // see zone
	si          *siteInfo                   // see siteInfo
	// missingDates are the dates first-2..last+1 that do not exist in
	// the site's zone, once missingKnown (see missing)
	missingDates []time.Time
	missingKnown bool
}

// siteInfo returns the text of the collector's site s, made once for the
// writers of a feed's kinds and plans.
func (c *collector) siteInfo(s *config.Site) *siteInfo {
	if c.si == nil || c.si.Site != s {
		c.si = newSiteInfo(s)
	}
	return c.si
}

// times, durations, flags and indices return n zero values, from the chunk's
// buffers when the collector has them.
func (c *collector) times(n int) []time.Time {
	if c.scratch == nil {
		return make([]time.Time, n)
	}
	return c.scratch.times.take(n)
}

func (c *collector) durations(n int) []time.Duration {
	if c.scratch == nil {
		return make([]time.Duration, n)
	}
	return c.scratch.durations.take(n)
}

func (c *collector) flags(n int) []bool {
	if c.scratch == nil {
		return make([]bool, n)
	}
	return c.scratch.flags.take(n)
}

func (c *collector) indices(n int) []int32 {
	if c.scratch == nil {
		return make([]int32, n)
	}
	return c.scratch.indices.take(n)
}

// bandMarks returns n zero crossings for collector.band, as times does.
func (c *collector) bandMarks(n int) []bandMark {
	if c.scratch == nil {
		return make([]bandMark, n)
	}
	return c.scratch.marks.take(n)
}

// zone returns the collector's cache of its zone's periods.
func (c *collector) zone() *zoneCache {
	if c.zc == nil {
		c.zc = newZoneCache(c.p.Location)
	}
	return c.zc
}

func (c *collector) inRange(d time.Time) bool {
	return !d.Before(c.first) && !d.After(c.last)
}

// span is the UTC interval covering the local dates first..last, widened by
// pad days on each side.
func (c *collector) span(pad int) (time.Time, time.Time) {
	return midnight(c.first.AddDate(0, 0, -pad), c.p.Location), midnight(c.last.AddDate(0, 0, 1+pad), c.p.Location)
}

func (c *collector) add(k config.Kind) error {
	if err := c.ctx.Err(); err != nil {
		return err
	}
	n0, m0 := len(c.events), len(c.notes)
	if err := c.compute(k); err != nil {
		return err
	}
	if noteSilentKinds[k.Name] {
		c.noteSilent(k, n0, m0)
	}
	c.dropMissing(n0, m0)
	return nil
}

// noteSilentKinds are the kinds with an event or a note on every local
// date whose dates without either add notes (noteSilent). The other kinds
// with one on every date are collector.crossings's (sunrise, sunset, the
// twilights' dawns and dusks, sun-altitude), which notes those dates
// itself.
var noteSilentKinds = map[string]bool{
	"solar-noon": true, "golden-hour": true, "blue-hour": true, config.KindSunBand: true,
	"moonrise": true, "moonset": true, "moon-transit": true, "dark-window": true,
}

// noteSilent gives each date of a daily kind without an event or a note a
// note of state Crosses: the date has none because the event passed to the
// neighbouring dates (an astronomical dusk that slid past midnight, a Moon
// transit 50 minutes later each day, a golden hour running on from the
// evening before). Dates are never silent.
func (c *collector) noteSilent(k config.Kind, n0, m0 int) {
	first := c.first.Unix() / secondsPerDay
	n := int(c.last.Unix()/secondsPerDay-first) + 1
	has := c.flags(n) // by date, from first
	see := func(d time.Time) {
		if i := d.Unix()/secondsPerDay - first; i >= 0 && i < int64(n) {
			has[i] = true
		}
	}
	for i := range c.events[n0:] {
		see(c.events[n0+i].Date)
	}
	for i := range c.notes[m0:] {
		see(c.notes[m0+i].Date)
	}
	for i, h := range has {
		if !h {
			c.notes = append(c.notes, Note{Kind: k, Date: c.first.AddDate(0, 0, i), State: astro.Crosses, Family: "no-event:" + k.String()})
		}
	}
}

// secondsPerDay is a civil date's length in UTC, where the collector's
// dates (00:00 UTC) are one day apart.
const secondsPerDay = 86400

// compute adds the events and notes of one kind.
func (c *collector) compute(k config.Kind) error {
	if alt, dir, family, ok := c.crossingKind(k); ok {
		// one call for every crossing kind: the loop is put in line once
		return c.crossings(k, alt, dir, family)
	}
	switch k.Name {
	case "sun-hidden":
		return c.hidden(k)
	case "noon-clear":
		return c.noonClear(k)
	case "solar-noon":
		return c.noons(k)
	case "golden-hour", "blue-hour":
		lo, hi := c.spec.Band()
		return c.band(k, lo, hi)
	case config.KindSunBand:
		return c.band(k, k.Altitude, k.High)
	case "march-equinox", "june-solstice", "september-equinox", "december-solstice", "seasons":
		return c.seasons(k)
	case "cross-quarter":
		return c.crossQuarters(k)
	case "perihelion", "aphelion":
		return c.apsides(k)
	case "photoperiod":
		return c.photoperiod(k)
	case config.KindLighting:
		return c.lighting(k)
	case "daily-summary":
		return c.summaryEvents(k) // the catalogue writes its own entries (see summaries)
	case "solar-eclipse", "lunar-eclipse":
		return c.eclipses(k)
	}
	return c.addMoon(k)
}

// crossingKind returns the threshold, direction (0: both) and family of a
// kind that lists the Sun's crossings of one altitude (collector.crossings):
// the Sun kinds of sunKinds and sun-altitude; false for the other kinds.
func (c *collector) crossingKind(k config.Kind) (alt float64, dir astro.Direction, family string, ok bool) {
	if k.Name == "sun-altitude" {
		return k.Altitude, 0, fmt.Sprintf("altitude:%g", k.Altitude), true
	}
	sk, ok := sunKinds[k.Name]
	if !ok {
		return 0, 0, "", false
	}
	if alt = sk.alt; alt == 0 {
		alt = c.p.riseAlt()
	}
	return alt, sk.dir, sk.family, true
}

// threshold is the Sun's crossings of one altitude over the collector's
// span, with the Sun's side of it at the start of the span.
type threshold struct {
	xs      []astro.Crossing
	upFirst bool // above the altitude at the start of the span
	// lateEnds is the record of days that end after midnight (see
	// dayEnds), made once.
	lateEnds []time.Time
	// byDate[i] is where the crossings of the date first+i begin in xs,
	// and byDate[i+1] where they end (dateCrossings), found once for the
	// kinds of the threshold (a dawn and a dusk)
	byDate []int32
}

// thresholdSpan is the UTC span over which crossings are computed: the
// dates first-2..last+2, enough for spans that start the day before.
func (c *collector) thresholdSpan() (time.Time, time.Time) {
	return c.span(2)
}

// prepare computes the crossings of every altitude not yet known, in one
// pass of the ephemeris (the Sun's culminations are found once for all).
func (c *collector) prepare(alts ...float64) error {
	if c.thresholds == nil {
		c.thresholds = map[float64]*threshold{}
	}
	var missing []float64
	for _, a := range alts {
		if _, ok := c.thresholds[a]; !ok && !slices.Contains(missing, a) {
			if a == skylineKey {
				if err := c.prepareSkyline(); err != nil {
					return err
				}
				continue
			}
			missing = append(missing, a)
		}
	}
	if len(missing) == 0 {
		return nil
	}
	from, to := c.thresholdSpan()
	o := c.p.Observer
	var dst [][]astro.Crossing
	if c.xsBuf != nil {
		dst = *c.xsBuf
	}
	lists, err := c.sky.eph.AppendSunCrossings(dst, o, missing, from, to)
	if err != nil {
		return err
	}
	if c.xsBuf != nil {
		*c.xsBuf, c.xsBuf = lists, nil // a later pass must not overwrite these
	}
	h0, err := c.sky.eph.SunAltitude(o, from)
	if err != nil {
		return err
	}
	for i, a := range missing {
		c.thresholds[a] = &threshold{xs: lists[i], upFirst: h0 > a}
	}
	return nil
}

// prepareSkyline computes the Sun's crossings of the place's skyline.
func (c *collector) prepareSkyline() error {
	from, to := c.thresholdSpan()
	o := c.p.Observer
	xs, err := c.sky.eph.SunSkylineCrossings(o, c.p.Skyline, from, to)
	if err != nil {
		return err
	}
	th := &threshold{xs: xs}
	if len(xs) > 0 {
		th.upFirst = xs[0].Direction == astro.Setting
	} else {
		h, err := c.sky.eph.SunAltitude(o, from)
		if err != nil {
			return err
		}
		az, err := c.sky.eph.SunAzimuth(o, from)
		if err != nil {
			return err
		}
		at := o
		at.Horizon = c.p.Skyline.Altitude(az)
		th.upFirst = h > at.RiseSetAltitude()
	}
	c.thresholds[skylineKey] = th
	return nil
}

// threshold returns the crossings of alt, computing them if needed.
func (c *collector) threshold(alt float64) (*threshold, error) {
	if err := c.prepare(alt); err != nil {
		return nil, err
	}
	return c.thresholds[alt], nil
}

// altitudes lists the thresholds the Sun's kinds of specs need, so that
// prepare finds them all in one pass.
func altitudes(o astro.Observer, specs []config.KindSpec) []float64 {
	var out []float64
	for _, sp := range specs {
		switch k := sp.Kind; k.Name {
		case "sunrise", "sunset", "photoperiod":
			out = append(out, o.RiseSetAltitude())
		case config.KindLighting:
			if sp.Natural == config.NaturalCivil {
				out = append(out, astro.CivilTwilight)
			} else {
				out = append(out, o.RiseSetAltitude())
			}
		case "daily-summary":
			out = append(out, o.RiseSetAltitude(), astro.CivilTwilight)
		case "civil-dawn", "civil-dusk":
			out = append(out, astro.CivilTwilight)
		case "nautical-dawn", "nautical-dusk":
			out = append(out, astro.NauticalTwilight)
		case "astronomical-dawn", "astronomical-dusk":
			out = append(out, astro.AstronomicalTwilight)
		case "golden-hour", "blue-hour":
			lo, hi := sp.Band()
			out = append(out, lo, hi)
		case config.KindSunBand:
			out = append(out, k.Altitude, k.High)
		case "sun-altitude":
			out = append(out, k.Altitude)
		}
	}
	return out
}

// crossings adds the crossings of a threshold altitude in one direction
// (both when dir is 0), and a note for each date without any crossing,
// saying on which side of the threshold the Sun stays, or without one in
// that direction (state Crosses, as noteSilent gives).
func (c *collector) crossings(k config.Kind, alt float64, dir astro.Direction, family string) error {
	th, err := c.threshold(alt)
	if err != nil {
		return err
	}
	c.events = slices.Grow(c.events, len(th.xs))
	byDate := c.dateCrossings(th)
	dates := c.dayDates()
	if family != "sun-horizon" {
		return c.twilightEvents(k, th, dir, family, byDate, dates, c.dayStarts())
	}
	// the horizon (sunrise, sunset): each event with its day length
	if err := c.dayLengths(); err != nil {
		return err
	}
	late, err := c.dayEnds(alt) // the sunsets after midnight that end a day
	if err != nil {
		return err
	}
	for i := range dates {
		lo, hi := int(byDate[i]), int(byDate[i+1]) // the date's crossings: th.xs[lo:hi]
		up := th.upFirst                           // the Sun above alt: as the last crossing left it
		if lo > 0 {
			up = th.xs[lo-1].Direction == astro.Rising
		}
		crossed := hi > lo
		keep := -1 // with a skyline: the date's first appearance, last disappearance (and dayBound's)
		if alt == skylineKey {
			for j := lo; j < hi; j++ {
				if th.xs[j].Direction == dir && (keep < 0 || dir == astro.Setting) {
					keep = j
				}
			}
		}
		listed := false
		for j := lo; j < hi; j++ {
			x := &th.xs[j]
			up = x.Direction == astro.Rising
			if dir != 0 && x.Direction != dir || keep >= 0 && j != keep && !dayBound(th, j, lo, hi, late, i) {
				continue
			}
			listed = true
			// the event is written in its place in the slice (grown above),
			// field by field: a literal would be built aside and copied
			c.events = c.events[:len(c.events)+1]
			e := &c.events[len(c.events)-1]
			*e = Event{}
			e.Kind, e.Start, e.Direction, e.Date = k, x.Time, x.Direction, dates[i]
			e.DayLength, e.DayChange = c.lengths[i+1], c.lengths[i+1]-c.lengths[i]
			if late != nil && !up && x.Time.Equal(late[i+1]) {
				// a sunset after midnight ends the day of the date before
				before := c.lengthBefore
				if i > 0 {
					before = c.lengths[i-1]
				}
				e.DayLength, e.DayChange = c.lengths[i], c.lengths[i]-before
			}
			if late != nil && endsLongDay(th, j, hi) {
				// the end of the midnight Sun, which no date's day
				// length counts (dropLongTails): no length of another
				// date's day
				e.DayLength, e.DayChange, e.LongDay = 0, 0, true
			}
			e.DirectSun = alt == skylineKey
			if e.Azimuth, err = c.sky.eph.SunAzimuth(c.p.Observer, x.Time); err != nil {
				return err
			}
		}
		if !crossed {
			d := dates[i]
			n := Note{Kind: k, Date: d, State: astro.AlwaysBelow, Family: family}
			if up {
				n.State = astro.AlwaysAbove
			}
			if !up && (alt == skylineKey || c.p.Observer.RaisedHorizon()) {
				tr, ok, err := c.noonOf(d)
				if err != nil {
					return err
				}
				n.Hidden = ok && c.upAtNoon(tr)
			}
			c.notes = append(c.notes, n)
		} else if !listed {
			// crossed the other way only: the event passed to a
			// neighbouring date (noteSilent's note)
			c.notes = append(c.notes, Note{Kind: k, Date: dates[i], State: astro.Crosses, Family: "no-event:" + k.String()})
		}
	}
	return nil
}

// dayBound says whether the crossing th.xs[j] of the date dates[i] (whose
// crossings are th.xs[lo:hi]) begins or ends a day by the rule of the day
// length (dayEnds, dropLongTails), as a sunrise or sunset over the flat
// horizon does: a disappearance after midnight that ends the day of the
// date before (late[i+1]) or ends the midnight Sun on a date with an
// appearance after it, or an appearance that begins a day ending after
// the next midnight (late[i+2]) or begins the midnight Sun on a date with
// a disappearance before it. Over a skyline a date lists its first
// appearance and last disappearance, not the Sun hidden behind a peak and
// out again between them; these are listed too, so that a skyline at one
// altitude all round lists what that horizon does (at 78.92° N on 28
// August 2027 the sunset at 00:14 that ends the day of 27 August, and the
// one at 23:50).
func dayBound(th *threshold, j, lo, hi int, late []time.Time, i int) bool {
	xs := th.xs
	if xs[j].Direction == astro.Setting {
		return xs[j].Time.Equal(late[i+1]) || endsLongDay(th, j, hi)
	}
	if j+1 < len(xs) && i+2 < len(late) && !late[i+2].IsZero() && xs[j+1].Time.Equal(late[i+2]) {
		return true
	}
	// the midnight Sun begins: up for a day or more (or to the end of the
	// crossings known), after a sunset of the date's own
	return j > lo && xs[j-1].Direction == astro.Setting &&
		(j+1 == len(xs) || xs[j+1].Time.UnixNano()-xs[j].Time.UnixNano() >= int64(24*time.Hour))
}

// twilightEvents is crossings for a threshold other than the horizon (the
// twilights, sun-altitude): an event per crossing in direction dir (both
// when 0), a note for a date without one. The dates' crossings are walked
// in one loop, the notes' work left to the few dates that need it.
func (c *collector) twilightEvents(k config.Kind, th *threshold, dir astro.Direction, family string, byDate []int32, dates, starts []time.Time) error {
	xs := th.xs[:byDate[len(dates)]]
	events := c.events
	j := int(byDate[0])
	for i, d := range dates {
		end := int(byDate[i+1])
		listed := false
		for ; j < end; j++ {
			x := &xs[j]
			if dir != 0 && x.Direction != dir {
				continue
			}
			listed = true
			// the event is written in its place in the slice (grown by
			// crossings), field by field: a literal would be built aside
			// and copied
			events = events[:len(events)+1]
			e := &events[len(events)-1]
			*e = Event{}
			e.Kind, e.Start, e.Direction, e.Date = k, x.Time, x.Direction, d
		}
		if listed {
			continue
		}
		lo := int(byDate[i])
		// a dusk's note speaks of the date's evening and night, up to the
		// next date's solar noon: its dusk may come after midnight
		evening := dir == astro.Setting && twilight(family)
		var dusk time.Time
		if evening {
			var err error
			if dusk, err = c.duskAfterMidnight(th, end, d); err != nil {
				c.events = events
				return err
			}
		}
		if lo < end && !evening || !dusk.IsZero() {
			// crossed the other way only: the event passed to a
			// neighbouring date (noteSilent's note); or, for a dusk,
			// this evening's comes after midnight (crossed the other
			// way, or the first after nights without one), which the
			// note says
			c.notes = append(c.notes, Note{Kind: k, Date: d, State: astro.Crosses, Family: "no-event:" + k.String(), Dusk: dusk})
			continue
		}
		up := th.upFirst // the Sun above the threshold: as the date's last crossing left it
		if end > 0 {
			up = th.xs[end-1].Direction == astro.Rising
		}
		n := Note{Kind: k, Date: d, State: astro.AlwaysBelow, Family: family}
		if up {
			n.State = astro.AlwaysAbove
			if twilight(family) {
				var err error
				if n.SunUp, err = c.sunStaysUp(starts[i+1], starts[i+2]); err != nil {
					c.events = events
					return err
				}
				if dir == astro.Rising && !n.SunUp {
					// a dawn's note speaks of the night before the date:
					// the evening may already have its dusk, after midnight
					if n.Dusk, err = c.duskAfterMidnight(th, end, d); err != nil {
						c.events = events
						return err
					}
				}
			}
		}
		c.notes = append(c.notes, n)
	}
	c.events = events
	return nil
}

// duskAfterMidnight returns the dusk of the date d's evening that comes
// after midnight: the crossing th.xs[next] (the first after the date) when
// it is a setting one before the solar noon of the next date; zero when
// there is none. At 69.65° N, 18.95° E on 17 September 2027 the
// astronomical dusk comes at 00:00:58 CEST on the 18th, after a summer of
// nights without one.
func (c *collector) duskAfterMidnight(th *threshold, next int, d time.Time) (time.Time, error) {
	if next >= len(th.xs) || th.xs[next].Direction != astro.Setting {
		return time.Time{}, nil
	}
	noon, err := c.solarNoon(d.AddDate(0, 0, 1))
	if err != nil || !th.xs[next].Time.Before(noon) {
		return time.Time{}, err
	}
	return th.xs[next].Time, nil
}

// solarNoon returns the Sun's upper transit on the local date d (any date
// the Sky serves), or the local noon when the date has none, each date
// searched alone and once: a plan's evening events and the twilight notes
// at the edges of the white nights need the noons of a few dates, for
// which noonOf's transits of every date would cost more.
func (c *collector) solarNoon(d time.Time) (time.Time, error) {
	if t, ok := c.noonAlone[d]; ok {
		return t, nil
	}
	start, end := c.bounds(d)
	ts, err := c.sky.eph.SunTransits(c.p.Observer, start, end)
	if err != nil {
		return time.Time{}, err
	}
	t := clockOn(d, 12*time.Hour, c.p.Location)
	if len(ts) > 0 {
		t = ts[0].Time
	}
	if c.noonAlone == nil {
		c.noonAlone = map[time.Time]time.Time{}
	}
	c.noonAlone[d] = t
	return t, nil
}

// dateCrossings returns where each date's crossings of th begin in th.xs
// (see threshold.byDate), found once for all kinds: the crossings from
// the local midnight that begins the date to the next.
func (c *collector) dateCrossings(th *threshold) []int32 {
	if th.byDate != nil {
		return th.byDate
	}
	dates := c.dayDates()
	at := c.indices(len(dates) + 1)
	starts := c.dayStarts() // the dates first-1..last+2
	// a local midnight is a whole Unix second s (the zones' offsets are
	// whole seconds), and an instant t is before it when its whole second,
	// ⌊t⌋, is: compared as Unix seconds, without time.Time.Before's call
	x, xs := 0, th.xs
	for i := range at {
		start := starts[i+1].Unix()
		for x < len(xs) && xs[x].Time.Unix() < start {
			x++
		}
		at[i] = int32(x)
	}
	th.byDate = at
	return at
}

// twilight reports whether family is a twilight's (civil, nautical,
// astronomical): its notes may be of a white night or of midnight sun.
func twilight(family string) bool {
	return family == "civil" || family == "nautical" || family == "astronomical"
}

// sunStaysUp reports whether the Sun stays above the horizon (the altitude
// of sunrise and sunset) from start to end, with no sunset or sunrise
// between: a date without dusk or dawn is then one of midnight sun. Asked
// only for such dates, near the poles: from the crossings of sunrise and
// sunset when the collector has them, else searched on that date alone.
func (c *collector) sunStaysUp(start, end time.Time) (bool, error) {
	alt, o := c.p.Observer.RiseSetAltitude(), c.p.Observer
	th, ok := c.thresholds[alt]
	if !ok {
		xs, err := c.sky.eph.SunCrossings(o, alt, start, end)
		if err != nil || len(xs) > 0 {
			return false, err
		}
		h, err := c.sky.eph.SunAltitude(o, start)
		return h > alt, err
	}
	i, _ := slices.BinarySearchFunc(th.xs, start, func(x astro.Crossing, t time.Time) int { return x.Time.Compare(t) })
	if i < len(th.xs) && th.xs[i].Time.Before(end) {
		return false, nil // it sets or rises on the date
	}
	if i == 0 {
		return th.upFirst, nil
	}
	return th.xs[i-1].Direction == astro.Rising, nil
}

// dayDates returns, computed once for all kinds, the dates first..last
// (00:00 UTC, 24 h apart).
func (c *collector) dayDates() []time.Time {
	if c.dates == nil {
		c.dates = c.times(daysBetween(c.first, c.last) + 1)
		// first is a date at 00:00 UTC: time.Unix gives what Add would,
		// without its checks
		first := c.first.Unix()
		for i := range c.dates {
			c.dates[i] = time.Unix(first+int64(i)*secondsPerDay, 0).UTC()
		}
	}
	return c.dates
}

// dayStarts returns, computed once for all kinds, the instants of the
// local midnights that begin the dates first−1..last+2.
func (c *collector) dayStarts() []time.Time {
	if c.starts == nil {
		n := daysBetween(c.first, c.last) + 4
		c.starts = c.times(n)
		// Within one period of the zone (between two clock changes) the
		// local midnights lie 24 h apart: the next one is the last plus
		// a day while that stays inside the period (no instant between
		// them reads the new date); midnight works out the others.
		// A date that starts at a clock change instead (the clocks skip
		// midnight), or that does not exist at all, is not followed that
		// way.
		var end time.Time // the end of the last midnight's period; zero: none
		known := false    // the last start is a midnight and end is its period's
		for i := range c.starts {
			if known {
				// (what Add(24 * time.Hour) gives, without its checks)
				next := time.Unix(c.starts[i-1].Unix()+secondsPerDay, 0).In(c.p.Location)
				if end.IsZero() || next.Before(end) {
					c.starts[i] = next
					continue
				}
			}
			d := c.first.AddDate(0, 0, i-1)
			c.starts[i] = midnight(d, c.p.Location)
			local := c.starts[i].In(c.p.Location)
			_, end = astro.ZonePeriod(local)
			h, m, sec := local.Clock()
			known = h == 0 && m == 0 && sec == 0 && local.Nanosecond() == 0 && civil(local).Equal(d)
		}
	}
	return c.starts
}

// noonOf returns the Sun's upper transit (solar noon, with its altitude)
// on the local date d (first..last), computed once for all dates; false
// when the date has none.
func (c *collector) noonOf(d time.Time) (astro.Transit, bool, error) {
	if c.noonsByDate == nil {
		ts, err := c.sunTransits()
		if err != nil {
			return astro.Transit{}, false, err
		}
		c.noonsByDate = make(map[time.Time]astro.Transit, len(ts))
		for _, t := range ts {
			c.noonsByDate[localDate(t.Time, c.p.Location)] = t
		}
	}
	tr, ok := c.noonsByDate[d]
	return tr, ok, nil
}

// sunTransits returns the Sun's upper transits over the local dates
// first-1..last, computed once for the solar-noon kind, noonOf and
// noonClear (which starts from the date before first).
func (c *collector) sunTransits() ([]astro.Transit, error) {
	if c.transits == nil {
		from, to := midnight(c.first.AddDate(0, 0, -1), c.p.Location), midnight(c.last.AddDate(0, 0, 1), c.p.Location)
		var dst []astro.Transit
		if c.scratch != nil {
			dst = c.scratch.transits[:0]
		}
		ts, err := c.sky.eph.AppendSunTransits(dst, c.p.Observer, from, to)
		if err != nil {
			return nil, err
		}
		if c.scratch != nil {
			c.scratch.transits = ts
		}
		c.transits = ts
	}
	return c.transits, nil
}

// upAtNoon reports whether the Sun at the transit tr is up over a flat
// horizon (the site's elevation and air, horizon altitude 0): on a date
// without sunrise at a site with a skyline or a horizon altitude above 0,
// the Sun is then behind the skyline, not in polar night.
func (c *collector) upAtNoon(tr astro.Transit) bool {
	return tr.Altitude > flatRiseAltitude(c.p.Observer)
}

// flatRiseAltitude is the geometric altitude of the Sun's centre at which
// it rises and sets for o over a flat horizon (o's elevation and air,
// horizon altitude 0, lowered by the dip unless o's horizon is written as
// a level 0): a skyline or a raised horizon hides the Sun, it does not set
// it.
func flatRiseAltitude(o astro.Observer) float64 {
	o.Horizon = 0
	return o.RiseSetAltitude()
}

// noonClear adds, for a site with a skyline, the dates whose solar noon
// finds the Sun over the skyline when the date before's did not (Rising:
// the noon Sun is back) and the reverse (Setting: from today it stays
// behind the skyline at noon), at the instant of solar noon.
func (c *collector) noonClear(k config.Kind) error {
	if len(c.p.Skyline) == 0 {
		return nil
	}
	th, err := c.threshold(skylineKey)
	if err != nil {
		return err
	}
	noons, err := c.sunTransits()
	if err != nil {
		return err
	}
	xs, up := th.xs, th.upFirst
	prev := -1 // unknown
	for _, n := range noons {
		for len(xs) > 0 && !xs[0].Time.After(n.Time) {
			up = xs[0].Direction == astro.Rising
			xs = xs[1:]
		}
		state := 0
		if up {
			state = 1
		}
		if d := localDate(n.Time, c.p.Location); prev >= 0 && state != prev && c.inRange(d) {
			dir := astro.Setting
			if up {
				dir = astro.Rising
			}
			c.events = append(c.events, Event{Kind: k, Start: n.Time, Date: d, Direction: dir, Altitude: n.Altitude})
		}
		prev = state
	}
	return nil
}

// hidden adds the spans during which the Sun, up over the skyline earlier
// on the date and again later, is hidden behind it: a disappearance
// followed by a reappearance on the same local date. A site without a
// skyline has none.
func (c *collector) hidden(k config.Kind) error {
	if len(c.p.Skyline) == 0 {
		return nil
	}
	th, err := c.threshold(skylineKey)
	if err != nil {
		return err
	}
	for i := 0; i+1 < len(th.xs); i++ {
		a, b := th.xs[i], th.xs[i+1]
		if a.Direction != astro.Setting || b.Direction != astro.Rising {
			continue
		}
		d := localDate(a.Time, c.p.Location)
		if !c.inRange(d) || !localDate(b.Time, c.p.Location).Equal(d) {
			continue
		}
		if i == 0 || !localDate(th.xs[i-1].Time, c.p.Location).Equal(d) {
			continue // no appearance before it on this date: the night
		}
		e := Event{Kind: k, Start: a.Time, End: b.Time, Date: d}
		if e.Azimuth, err = c.sky.eph.SunAzimuth(c.p.Observer, a.Time); err != nil {
			return err
		}
		c.events = append(c.events, e)
	}
	return nil
}

// dayLengths computes, once, the day length of each local date
// first-1..last: the photoperiod. With a flat horizon it is the time from
// the date's sunrise to the sunset that ends that day, even past midnight
// (see dayEnds): at 78° N in April the Sun rises at 02:14 and sets at 00:03
// the next day, a day of 21 h 48 min on the date of the sunrise, not
// 21 h 46 min and 2 min more on the next date; a period of more than a day
// (the Sun up for days) counts on each date for its own part, except its
// end on a date with a sunrise of its own (dropLongTails). With a skyline
// it is the time the Sun is over the skyline, by the same rule (its
// sunrises and sunsets are the Sun's appearances over it and
// disappearances behind it), as lighting counts it (daylights).
func (c *collector) dayLengths() error {
	if c.lengths != nil {
		return nil
	}
	alt := c.p.riseAlt()
	l, err := c.aboveFrom(alt, 2)
	if err != nil {
		return err
	}
	// the part of a day that runs past midnight moves from the next date
	// to the date of its sunrise
	late, err := c.dayEnds(alt)
	if err != nil {
		return err
	}
	starts := c.dayStarts()
	for i := range l { // late[i] and l[i] are both the date first-2+i
		if late[i].IsZero() {
			continue
		}
		spill := late[i].Sub(starts[i]) // starts[i]: the midnight ending the date
		l[i] += spill
		if i+1 < len(l) {
			l[i+1] -= spill
		}
	}
	if err := c.dropLongTails(l, alt); err != nil {
		return err
	}
	// a date the clocks jump over has no day: the date after it compares
	// its day with the one before it
	for _, g := range c.missing() {
		if i := daysBetween(c.first.AddDate(0, 0, -2), g); i > 0 && i < len(l) {
			l[i] = l[i-1]
		}
	}
	c.lengthBefore, c.lengths = l[0], l[1:]
	return nil
}

// dropLongTails takes out of l (the dates first-2..last, as aboveFrom
// with back 2 gives them) the last part of each period above alt that
// lasted a day or more, from the midnight beginning the date of its sunset
// to that sunset, when that date has a sunrise of its own: the end of the
// midnight Sun is not that date's day, which runs from its sunrise to the
// sunset that ends it. At 78.92° N on 27 August 2027 the midnight Sun sets
// at 00:59 and the date's day runs from its sunrise at 01:31 to 00:14 the
// next date: 22 h 44 min, not 23 h 43 min. A date with no sunrise of its
// own keeps the part (the Sun is up most of it, and it has no other day).
func (c *collector) dropLongTails(l []time.Duration, alt float64) error {
	th, err := c.threshold(alt)
	if err != nil {
		return err
	}
	xs := th.xs
	base := c.first.Unix()/secondsPerDay - 2 // the day number of first-2
	starts := c.dayStarts()                  // starts[i]: the midnight ending the date first-2+i
	for k := range xs {
		set := &xs[k]
		if set.Direction != astro.Setting {
			continue
		}
		// instants compared as Unix nanoseconds, as dayEnds does
		s := set.Time.UnixNano()
		if k > 0 && (xs[k-1].Direction != astro.Rising || s-xs[k-1].Time.UnixNano() < int64(24*time.Hour)) {
			continue // a shorter day (dayEnds), or no period above before it
		}
		if k == 0 && !th.upFirst {
			continue
		}
		// k == 0: up since before the span, which begins two dates
		// before the first of l that counts (l[0] is only for the spill)
		i := int(c.zone().day(set.Time) - base)
		if i < 1 || i >= len(l) {
			continue
		}
		if k+1 == len(xs) || xs[k+1].Direction != astro.Rising || xs[k+1].Time.UnixNano() >= starts[i].UnixNano() {
			continue // no sunrise of its own on the date
		}
		l[i] -= time.Duration(s - starts[i-1].UnixNano())
	}
	return nil
}

// endsLongDay says whether th.xs[j] is a sunset that ends a period above
// the threshold of more than a day (midnight sun) on a date with a sunrise
// of its own after it (th.xs[j+1], before hi, the end of the date's
// crossings): the part of that period on the date counts on no date
// (dropLongTails), so the sunset has no day length of its own.
func endsLongDay(th *threshold, j, hi int) bool {
	xs := th.xs
	if xs[j].Direction != astro.Setting || j+1 >= hi || xs[j+1].Direction != astro.Rising {
		return false
	}
	if j == 0 {
		return th.upFirst
	}
	return xs[j-1].Direction == astro.Rising && xs[j].Time.UnixNano()-xs[j-1].Time.UnixNano() >= int64(24*time.Hour)
}

// dayEnds is the one record of which sunset ends a day after midnight, for
// the threshold alt (the horizon, or civil twilight for lamps' natural
// light): for each local date first-2..last+1 (index 0 is first-2), the
// instant the Sun goes below alt after the midnight ending the date, when
// that ends a period above alt that began on the date and lasted less than
// a day; zero for the other dates. Such a period is that date's day, whole:
// its length counts on the date of its sunrise (dayLengths, lamps), its
// sunset is listed in the date's daily summary, and the next date does not
// count it as its own.
func (c *collector) dayEnds(alt float64) ([]time.Time, error) {
	th, err := c.threshold(alt)
	if err != nil {
		return nil, err
	}
	if th.lateEnds != nil {
		return th.lateEnds, nil
	}
	late := c.times(daysBetween(c.first, c.last) + 4)
	base := c.first.Unix()/secondsPerDay - 2 // the day number of first-2
	starts := c.dayStarts()                  // starts[i]: the midnight ending the date first-2+i
	for k := 0; k+1 < len(th.xs); k++ {
		rise, set := &th.xs[k], &th.xs[k+1]
		if rise.Direction != astro.Rising || set.Direction != astro.Setting {
			continue
		}
		// instants compared as Unix nanoseconds, as the crossings' loop does
		r, s := rise.Time.UnixNano(), set.Time.UnixNano()
		i := int(c.zone().day(rise.Time) - base)
		if s-r >= int64(24*time.Hour) || i < 0 || i >= len(late) || s <= starts[i].UnixNano() {
			continue
		}
		late[i] = set.Time
	}
	th.lateEnds = late
	return late, nil
}

// lateEnd returns the sunset after midnight that ends the day of the local
// date d (first-2..last+1) in the record late of dayEnds, or zero.
func (c *collector) lateEnd(late []time.Time, d time.Time) time.Time {
	i := daysBetween(c.first.AddDate(0, 0, -2), d)
	if i < 0 || i >= len(late) {
		return time.Time{}
	}
	return late[i]
}

// above returns, for each local date first-1..last, the time the Sun's
// centre spends above alt: the sum of the above-threshold intervals within
// the date, so it is 24 h (or the date's length across a clock change) when
// the Sun never drops below, 0 when it never gets there, and an interval that
// runs past midnight counts on each date for its own part.
func (c *collector) above(alt float64) ([]time.Duration, error) {
	return c.aboveFrom(alt, 1)
}

// aboveFrom is above for the local dates first-back..last (back is 1 or 2).
func (c *collector) aboveFrom(alt float64, back int) ([]time.Duration, error) {
	th, err := c.threshold(alt)
	if err != nil {
		return nil, err
	}
	from := midnight(c.first.AddDate(0, 0, -back), c.p.Location)
	xs, up := th.xs, th.upFirst
	for len(xs) > 0 && xs[0].Time.Before(from) {
		up = xs[0].Direction == astro.Rising
		xs = xs[1:]
	}
	n := daysBetween(c.first, c.last) + 1 + back
	lengths := c.durations(n)
	// instants as Unix nanoseconds, as the crossings' loop has them
	cur := from.UnixNano()
	starts := c.dayStarts()
	for day := 0; day < n; {
		next := starts[day-back+2].UnixNano() // the date's end
		crossing := len(xs) > 0 && xs[0].Time.UnixNano() < next
		if crossing {
			next = xs[0].Time.UnixNano()
		}
		if up {
			lengths[day] += time.Duration(next - cur)
		}
		cur = next
		if crossing {
			up = xs[0].Direction == astro.Rising
			xs = xs[1:]
			continue
		}
		day++
	}
	return lengths, nil
}

// Profile is one local date of a site's year, for charts: how long the Sun
// stays above the horizon and above each twilight limit.
type Profile struct {
	Date         time.Time     // local date, 00:00 UTC
	Daylight     time.Duration // the day length of the daily summary and photoperiod (dayLengths)
	Civil        time.Duration // centre above −6°
	Nautical     time.Duration // centre above −12°
	Astronomical time.Duration // centre above −18°
}

// Profiles returns the day length and twilight durations of each local
// date first..last.
func (s *Sky) Profiles(p Place, first, last time.Time) ([]Profile, error) {
	c := &collector{ctx: context.Background(), sky: s, p: p, first: civil(first), last: civil(last)}
	var cols [4][]time.Duration
	for i, alt := range []float64{astro.CivilTwilight, astro.NauticalTwilight, astro.AstronomicalTwilight} {
		l, err := c.above(alt)
		if err != nil {
			return nil, err
		}
		cols[i+1] = l
	}
	// the day length as the feeds count it: a day that ends after
	// midnight counts whole on the date of its sunrise
	if err := c.dayLengths(); err != nil {
		return nil, err
	}
	cols[0] = c.lengths
	out := make([]Profile, 0, len(cols[0])-1)
	for i := 1; i < len(cols[0]); i++ {
		out = append(out, Profile{Date: c.first.AddDate(0, 0, i-1),
			Daylight: cols[0][i], Civil: cols[1][i], Nautical: cols[2][i], Astronomical: cols[3][i]})
	}
	return out, nil
}

// noons adds the upper transit of every date, with the Sun's altitude; it
// exists in polar night too.
func (c *collector) noons(k config.Kind) error {
	ts, err := c.sunTransits()
	if err != nil {
		return err
	}
	// the dates compared as day numbers (zoneCache.day), the date made
	// for the transits in range only
	z := c.zone()
	first, last := c.first.Unix()/secondsPerDay, c.last.Unix()/secondsPerDay
	c.events = slices.Grow(c.events, len(ts))
	for i := range ts {
		t := &ts[i]
		day := z.day(t.Time)
		if day < first || day > last {
			continue
		}
		// written in its place in the slice, as crossings does
		c.events = c.events[:len(c.events)+1]
		e := &c.events[len(c.events)-1]
		*e = Event{}
		e.Kind, e.Start, e.Date, e.Altitude = k, t.Time, time.Unix(day*secondsPerDay, 0).UTC(), t.Altitude
	}
	return nil
}

// band adds the spans during which the Sun's centre is between low and high:
// golden hour (−4°..+6°) or blue hour (−6°..−4°). A span entered while the Sun
// rises is "morning", while it sets "evening"; one that is entered and left
// through the same bound without reaching the other (the low winter Sun at
// high latitude) is "all-day". Dates on which the Sun never enters the band
// get a note.
func (c *collector) band(k config.Kind, low, high float64) error {
	o := c.p.Observer
	if err := c.prepare(low, high); err != nil {
		return err
	}
	lo, hi := c.thresholds[low].xs, c.thresholds[high].xs
	part := func(m bandMark) string { // of a span entered at m and not left
		if m.high {
			return "evening"
		}
		return "morning"
	}
	// the crossings of both bounds in time order: each list is in order
	marks := c.bandMarks(len(lo) + len(hi))
	for i, j := 0, 0; i < len(lo) || j < len(hi); {
		if j == len(hi) || i < len(lo) && !hi[j].Time.Before(lo[i].Time) {
			marks[i+j] = bandMark{lo[i].Time, false, lo[i].Direction}
			i++
		} else {
			marks[i+j] = bandMark{hi[j].Time, true, hi[j].Direction}
			j++
		}
	}

	in := c.thresholds[low].upFirst && !c.thresholds[high].upFirst
	c.events = slices.Grow(c.events, len(lo)/2)
	n0 := len(c.events) // this kind's spans start here
	var start time.Time
	var entered bandMark
	var before []Event                                // spans that start before the first date
	seen := c.flags(daysBetween(c.first, c.last) + 1) // by date from first: a span starts on it
	for _, m := range marks {
		entering := (!m.high && m.dir == astro.Rising) || (m.high && m.dir == astro.Setting)
		if entering && !in {
			in, start, entered = true, m.t, m
			continue
		}
		if !entering && in {
			in = false
			if start.IsZero() {
				continue // entered before the computed span: not ours
			}
			part := "morning"
			switch {
			case entered.high && m.high: // the Sun dips into the band around midnight
				part = "night"
			case entered.high:
				part = "evening"
			case !m.high: // in through the low bound, out through it again
				part = "all-day"
			}
			d := c.zone().date(start)
			if d.Before(c.first) {
				// not listed, but it may run into the first date
				before = append(before, Event{Start: start, End: m.t})
			}
			if c.inRange(d) {
				e := Event{Kind: k, Start: start, End: m.t, Date: d, Part: part, Low: low, High: high}
				if MergedSpan(e) {
					// one span where a morning and an evening meet: its
					// text gives the Sun's highest (lowest) altitude in it.
					// Not for a span of days near a pole (AroundTheClock):
					// the search of one day's extreme would find one of its
					// days' extremes, not the span's. The writers ask
					// MergedSpan too, so they read the altitude set here
					h, err := c.sunExtreme(start, m.t, part == "all-day")
					if err != nil {
						return err
					}
					e.Altitude = h
				}
				c.events = append(c.events, e)
				seen[daysBetween(c.first, d)] = true
			}
			start = time.Time{}
		}
	}
	if d := c.zone().date(start); in && !start.IsZero() && c.inRange(d) {
		// entered, and not left again while the crossings are known (the
		// Sun in the band for weeks near a pole): the span is listed to the
		// end of the last date, marked open
		_, end := c.span(0)
		c.events = append(c.events, Event{Kind: k, Start: start, End: end, Date: d, Part: part(entered), Low: low, High: high, Open: true})
		seen[daysBetween(c.first, d)] = true
	}
	for i, d := range c.dayDates() {
		if seen[i] {
			continue
		}
		// No span starts on this date: either one runs through it from the
		// day before, or the Sun stays above or below the band all day.
		noon := midnight(d, c.p.Location).Add(12 * time.Hour)
		h, err := c.sky.eph.SunAltitude(o, noon)
		if err != nil {
			return err
		}
		switch {
		case h > high && c.noSpanCovers(d, c.events[n0:]) && c.noSpanCovers(d, before):
			c.notes = append(c.notes, Note{Kind: k, Date: d, State: astro.AlwaysAbove, Family: k.String()})
		case h < low && c.noSpanCovers(d, c.events[n0:]) && c.noSpanCovers(d, before):
			c.notes = append(c.notes, Note{Kind: k, Date: d, State: astro.AlwaysBelow, Family: k.String()})
		}
	}
	return nil
}

// sunExtreme returns the highest (high) or lowest geometric altitude of the
// Sun's centre between from and to, degrees: a band's span that is entered
// and left through the same bound has one such extreme, found by
// golden-section search to well under a second (at an extreme the altitude
// changes by less than 0.001° in a minute).
func (c *collector) sunExtreme(from, to time.Time, high bool) (float64, error) {
	o := c.p.Observer
	alt := func(t float64) (float64, error) {
		h, err := c.sky.eph.SunAltitude(o, from.Add(time.Duration(t*float64(time.Second))))
		if !high {
			h = -h
		}
		return h, err
	}
	const g = 0.6180339887498949 // (√5 − 1) / 2
	a, b := 0.0, to.Sub(from).Seconds()
	x1, x2 := b-g*(b-a), a+g*(b-a)
	f1, err := alt(x1)
	if err != nil {
		return 0, err
	}
	f2, err := alt(x2)
	if err != nil {
		return 0, err
	}
	for b-a > 1 {
		if f1 > f2 {
			b, x2, f2 = x2, x1, f1
			x1 = b - g*(b-a)
			if f1, err = alt(x1); err != nil {
				return 0, err
			}
		} else {
			a, x1, f1 = x1, x2, f2
			x2 = a + g*(b-a)
			if f2, err = alt(x2); err != nil {
				return 0, err
			}
		}
	}
	h := max(f1, f2)
	if !high {
		h = -h
	}
	return h, nil
}

// noSpanCovers reports whether none of the spans overlaps the local date d.
func (c *collector) noSpanCovers(d time.Time, spans []Event) bool {
	from := midnight(d, c.p.Location)
	to := midnight(d.AddDate(0, 0, 1), c.p.Location)
	for _, e := range spans {
		if !e.End.IsZero() && e.Start.Before(to) && e.End.After(from) {
			return false
		}
	}
	return true
}

// years lists the calendar years that the window touches, with one more on
// each side so events near New Year in far zones are not missed.
func (c *collector) years() []int {
	var ys []int
	for y := c.first.Year() - 1; y <= c.last.Year()+1; y++ {
		ys = append(ys, y)
	}
	return ys
}

var seasonIndex = map[string]int{"march-equinox": 0, "june-solstice": 1, "september-equinox": 2, "december-solstice": 3}

func (c *collector) seasons(k config.Kind) error {
	var all []time.Time
	for _, y := range c.years() {
		s, err := yearly(c.sky, "seasons", y, astro.Seasons)
		if err != nil {
			return err
		}
		all = append(all, s[:]...)
	}
	for i := 0; i+1 < len(all); i++ {
		name := seasonNames[i%4]
		if k.Name != "seasons" && k.Name != name {
			continue
		}
		d := localDate(all[i], c.p.Location)
		if !c.inRange(d) {
			continue
		}
		kk := k
		if k.Name == "seasons" {
			kk = config.Kind{Name: name}
		}
		c.events = append(c.events, Event{Kind: kk, Start: all[i], Date: d, more: &eventMore{season: all[i+1].Sub(all[i])}})
	}
	return nil
}

var seasonNames = [4]string{"march-equinox", "june-solstice", "september-equinox", "december-solstice"}

func (c *collector) crossQuarters(k config.Kind) error {
	for _, y := range c.years() {
		q, err := yearly(c.sky, "cross-quarters", y, astro.CrossQuarters)
		if err != nil {
			return err
		}
		lons := astro.CrossQuarterLongitudes()
		for i, t := range q {
			d := localDate(t, c.p.Location)
			if c.inRange(d) {
				part := strconv.FormatFloat(lons[i], 'f', -1, 64)
				c.events = append(c.events, Event{Kind: k, Start: t, Date: d, Part: part})
			}
		}
	}
	return nil
}

func (c *collector) apsides(k config.Kind) error {
	f := astro.Perihelion
	if k.Name == "aphelion" {
		f = astro.Aphelion
	}
	type apsis struct {
		t time.Time
		r float64
	}
	for _, y := range c.years() {
		a, err := yearly(c.sky, k.Name, y, func(y int) (apsis, error) {
			t, r, err := f(y)
			return apsis{t, r}, err
		})
		if err != nil {
			return err
		}
		t, r := a.t, a.r
		d := localDate(t, c.p.Location)
		if c.inRange(d) {
			c.events = append(c.events, Event{Kind: k, Start: t, Date: d, more: &eventMore{distance: r}})
		}
	}
	return nil
}

// photoperiod adds an event on each local date whose day length crosses the
// configured duration: rising when it reaches it, setting when it falls below.
// Start is the local midnight that begins the date; the entry is all-day.
func (c *collector) photoperiod(k config.Kind) error {
	if err := c.dayLengths(); err != nil {
		return err
	}
	crossed := false
	for i := 1; i < len(c.lengths); i++ {
		prev, cur := c.lengths[i-1], c.lengths[i]
		var dir astro.Direction
		switch {
		case prev < k.DayLength && cur >= k.DayLength:
			dir = astro.Rising
		case prev >= k.DayLength && cur < k.DayLength:
			dir = astro.Setting
		default:
			continue
		}
		d := c.first.AddDate(0, 0, i-1)
		c.events = append(c.events, Event{Kind: k, Start: midnight(d, c.p.Location), Date: d,
			Direction: dir, DayLength: cur, DayChange: cur - prev, DirectSun: c.p.direct()})
		crossed = true
	}
	if !crossed {
		c.notes = append(c.notes, c.notReached(k))
	}
	return nil
}

// notReached is the one note of a window whose day length never crosses
// the photoperiod k: on the window's first date, with the longest day
// length (when it stays below) or the shortest (when it stays above).
func (c *collector) notReached(k config.Kind) Note {
	n := Note{Kind: k, Date: c.first, State: astro.AlwaysBelow, Family: "never:" + k.String(), Last: c.last, DirectSun: c.p.direct()}
	above := c.lengths[1] >= k.DayLength
	if above {
		n.State = astro.AlwaysAbove
	}
	for i := 1; i < len(c.lengths); i++ {
		l := c.lengths[i]
		if len(c.missing()) > 0 && c.gone(c.first.AddDate(0, 0, i-1)) {
			continue // no day: its length is the date before's (dayLengths)
		}
		if n.ExtremeDate.IsZero() || (!above && l > n.DayLength) || (above && l < n.DayLength) {
			n.DayLength, n.ExtremeDate = l, c.first.AddDate(0, 0, i-1)
		}
	}
	return n
}

// summaryEvents adds one event per local date for daily-summary, at the
// date's start, with the day length and its change from the day before.
func (c *collector) summaryEvents(k config.Kind) error {
	if err := c.dayLengths(); err != nil {
		return err
	}
	for i, d := range c.dayDates() {
		c.events = append(c.events, Event{Kind: k, Start: midnight(d, c.p.Location), Date: d,
			DayLength: c.lengths[i+1], DayChange: c.lengths[i+1] - c.lengths[i], DirectSun: c.p.direct()})
	}
	return nil
}
