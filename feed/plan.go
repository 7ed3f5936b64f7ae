package feed

import (
	"context"
	"fmt"
	"math"
	"slices"
	"sort"
	"strings"
	"time"

	"heliocal/astro"
	"heliocal/config"
)

// PlanMargin is how many days beyond a feed's window the Sky must cover for
// its plans: a date rule "saturday after full-moon" looks up to a week
// before the first date for the event, "saturday before" a week after.
const PlanMargin = 8

// KindPlan is the Entry.Kind of a plan's entries.
const KindPlan = "plan"

// plan is a configured plan with its rules parsed.
type plan struct {
	cfg        *config.Plan
	rule       config.DateRule
	start, end *config.TimeSpec
	filter     config.DateFilter
	alarm      *time.Duration
}

func parsePlan(p *config.Plan) (*plan, error) {
	rule, err := config.ParseDateRule(p.Date)
	if err != nil {
		return nil, fmt.Errorf("plan %q: date %q: %w", p.Title, p.Date, err)
	}
	out := &plan{cfg: p, rule: rule, filter: p.Filter(), alarm: alarmOf(p.Alarm)}
	for _, t := range []struct {
		text string
		dst  **config.TimeSpec
	}{{p.Start, &out.start}, {p.End, &out.end}} {
		if t.text == "" {
			continue
		}
		ts, err := config.ParseTimeSpec(t.text)
		if err != nil {
			return nil, fmt.Errorf("plan %q: time %q: %w", p.Title, t.text, err)
		}
		*t.dst = &ts
	}
	return out, nil
}

// planDate is a date a plan falls on, with the event that set it, if any.
type planDate struct {
	date time.Time
	// the event of the rule (RuleEvent, RuleWeekdayOf), when anchored:
	// its kind and instant
	anchored bool
	kind     config.Kind
	at       time.Time
	dir      astro.Direction // a photoperiod's: rising past its day length or falling below
	// skipped is the date a weekday rule gave for the event that the
	// clocks skip whole (zero: none): date is the next such weekday
	// instead
	skipped time.Time
	// also are the other events of the rule that fall to the same date
	// ("saturday after moon-phases": a first quarter on a Saturday and the
	// full moon on the Friday after), in the order of their instants
	also []planAnchor
}

// planAnchor is one more event of a plan's date rule on a date.
type planAnchor struct {
	kind    config.Kind
	at      time.Time
	dir     astro.Direction
	skipped time.Time // as planDate's
}

// feedEntries computes the entries of a feed's kinds and plans on the local
// dates first..last, sorted by Start then UID, finding the Sun's crossings
// for both in one pass.
//
// With a lighting limit that its kinds' entries alone can be checked
// against (ownLimitGaps), it returns too the limits that do nothing on
// some dates, found as the entries are written; nil otherwise.
func (sky *Sky) feedEntries(ctx context.Context, s *config.Site, f *config.Feed, first, last time.Time) ([]Entry, []byte, found, error) {
	col := &collector{ctx: ctx, sky: sky, p: PlaceOf(s), first: civil(first), last: civil(last)}
	if HasLampLimit(f) && ownLimitGaps(f) {
		col.found.gaps = &limitGaps{}
	}
	// the collector's events are scratch: entries copies each into an
	// entry, the plans' times copy those they keep (kindTimes), and
	// nothing else sees the collector
	col.events = scratchEvents.get(0)
	defer func() { scratchEvents.put(col.events) }()
	// and so are its working slices (the thresholds' crossings, the
	// slices by date, the transits): entries copy what they keep
	buf := collectorBuffers.Get().(*buffers)
	buf.releaseWorking()
	col.xsBuf, col.scratch = &buf.crossings, buf
	defer collectorBuffers.Put(buf)
	if len(f.Plans) == 0 {
		es, text, err := sky.entries(col, s, f.ID, f.Kinds, 0, true)
		if err != nil {
			return nil, nil, found{}, err
		}
		return sortEntries(es), text, col.found, nil
	}
	parsed, kinds, err := parsePlans(f.Plans)
	if err != nil {
		return nil, nil, found{}, err
	}
	days := daysBetween(col.first, col.last) + 1
	col.keyDates = dateTexts.get(days)[:days]
	defer dateTexts.put(col.keyDates)
	pd, err := sky.allPlanDates(col, parsed)
	if err != nil {
		return nil, nil, found{}, err
	}
	// the kinds' crossings in one pass; the plans take theirs from it, or
	// find them on their own dates only (planEntries), and append their
	// entries to the kinds' (room made for them)
	es, text, err := sky.entries(col, s, f.ID, f.Kinds, pd.total, true)
	if err != nil {
		return nil, nil, found{}, err
	}
	if es, text, err = sky.planEntries(col, s, f.ID, parsed, kinds, pd, es, text); err != nil {
		return nil, nil, found{}, err
	}
	col.found.skippedPlans = pd.skipped
	return sortEntries(es), text, col.found, nil
}

// found is what feedEntries finds beside the entries (collector.found).
type found struct {
	// gaps, when set, receives the lighting limits that do nothing on
	// some dates, each lighting kind's found from its own entries as they
	// are written (appendLimitGaps); nil when not looked for
	gaps *limitGaps
	// notCrossed are the notes of the photoperiod thresholds that no date
	// crosses, whatever dates their kinds entries' filters keep
	// (Calendar.NotCrossed)
	notCrossed []KindNote
	// skippedPlans are the plans' dates the clocks skip
	skippedPlans []SkippedPlan
	// shared are the kinds a note entry stands for beside its own, by its
	// UID (Calendar.SharedNotes), as the entries' writer found them
	shared map[string][]string
}

// limitGaps are the lighting limits of a feed that do nothing on some of
// its dates (see collector.gaps).
type limitGaps struct {
	gaps []LampLimitGap
}

// PlanEntries computes the entries of a feed's plans on the local dates
// first..last, sorted by Start then UID. The Sky must cover PlanMargin days
// beyond the window (NewCatalogue sees to it).
func (sky *Sky) PlanEntries(ctx context.Context, s *config.Site, feedID string, plans []config.Plan, first, last time.Time) ([]Entry, error) {
	parsed, kinds, err := parsePlans(plans)
	if err != nil {
		return nil, err
	}
	col := &collector{ctx: ctx, sky: sky, p: PlaceOf(s), first: civil(first), last: civil(last)}
	pd, err := sky.allPlanDates(col, parsed)
	if err != nil {
		return nil, err
	}
	es, _, err := sky.planEntries(col, s, feedID, parsed, kinds, pd, make([]Entry, 0, pd.total), nil)
	if err != nil {
		return nil, err
	}
	return sortEntries(es), nil
}

// parsePlans parses the plans and lists the kinds their times follow.
func parsePlans(plans []config.Plan) ([]*plan, []config.KindSpec, error) {
	parsed := make([]*plan, len(plans))
	var kinds []config.KindSpec
	for i := range plans {
		pl, err := parsePlan(&plans[i])
		if err != nil {
			return nil, nil, err
		}
		parsed[i] = pl
		for _, spec := range []*config.TimeSpec{pl.start, pl.end} {
			if spec != nil && !spec.IsClock && !slices.ContainsFunc(kinds, func(k config.KindSpec) bool { return k.Kind == spec.Event }) {
				kinds = append(kinds, config.KindSpec{Kind: spec.Event})
			}
		}
	}
	return parsed, kinds, nil
}

// planDates are the dates of a feed's plans within its window, by plan,
// with how many dates look up each kind's time and how many there are, and
// the plans' dates that the clocks skip whole, which have no entry.
type planDates struct {
	dates   [][]planDate
	uses    map[config.Kind]int
	total   int
	skipped []SkippedPlan
}

// allPlanDates lists the dates of each plan that its filters keep.
func (sky *Sky) allPlanDates(col *collector, parsed []*plan) (planDates, error) {
	pd := planDates{dates: make([][]planDate, len(parsed)), uses: map[config.Kind]int{}}
	for i, pl := range parsed {
		ds, err := sky.planDates(col.ctx, col.p, pl.rule, col.first, col.last)
		if err != nil {
			return pd, fmt.Errorf("plan %q: %w", pl.cfg.Title, err)
		}
		n := 0
		var gone []time.Time
		for _, d := range ds {
			switch {
			case !pl.filter.Allows(d.date):
			case col.gone(d.date): // no plan on a date the clocks jump over
				gone = append(gone, d.date)
			default:
				ds[n] = d
				n++
			}
		}
		if gone != nil {
			pd.skipped = append(pd.skipped, SkippedPlan{Title: pl.cfg.Title, Date: pl.cfg.Date, Dates: gone})
		}
		pd.dates[i] = ds[:n]
		pd.total += n
		if pl.start != nil && !pl.start.IsClock {
			pd.uses[pl.start.Event] += n
		}
		if pl.end != nil && !pl.end.IsClock {
			pd.uses[pl.end.Event] += 2 * n // the date, and the next one when the end comes first
		}
	}
	return pd, nil
}

// planEntries appends to out the plans' entries on their dates pd,
// unsorted. A time of the Sun that the feed's kinds did not already need is
// found on the plans' dates only, unless they are so many that one pass
// over the window costs less.
//
// text, when not nil, is the calendar's text buffer (entries with
// keepText): the plans' texts are written after the kinds' and their
// strings are substrings of it, which is returned, when it has room for
// them; otherwise, and when text is nil, they are copies and text is
// returned as it is.
func (sky *Sky) planEntries(col *collector, s *config.Site, feedID string, parsed []*plan, kinds []config.KindSpec, pd planDates, out []Entry, text []byte) ([]Entry, []byte, error) {
	last := col.last
	col.spec, col.maxLit = config.KindSpec{}, 0
	w := entryWriter{feedID: feedID, site: col.siteInfo(s), noted: map[string]noted{}, last: last, out: out, clockOn: col,
		dates: col.keyDates, firstDay: col.first.Unix() / secondsPerDay}
	w.spans = textSpans.get(pd.total)
	defer func() { textSpans.put(w.spans) }()
	if text != nil && cap(text)-len(text) >= pd.total*textPerEntry {
		w.text, w.keepText, w.flushed = text, true, len(text)
	} else {
		w.text = textBuffers.get(pd.total * textPerEntry)
		defer func() { textBuffers.reuse(w.text) }()
	}
	dates, uses := pd.dates, pd.uses
	// the times of every kind the plans start or end at; an end may be on
	// the day after the last date
	next := &collector{ctx: col.ctx, sky: sky, p: col.p, first: last.AddDate(0, 0, 1), last: last.AddDate(0, 0, 1)}
	times := map[config.Kind]*kindTimes{}
	for _, ks := range kinds {
		if kt, ok, err := col.sunTimes(ks.Kind, uses[ks.Kind]); err != nil {
			return nil, nil, err
		} else if ok {
			times[ks.Kind] = kt
			continue
		}
		kt, err := col.kindTimes(ks.Kind, nil)
		if err != nil {
			return nil, nil, err
		}
		if kt, err = next.kindTimes(ks.Kind, kt); err != nil {
			return nil, nil, err
		}
		times[ks.Kind] = kt
	}
	cats := []string{"Plan"}
	for i, pl := range parsed {
		w.alarm = pl.alarm
		pt := newPlanText(pl)
		// a plan's UID keys differ by date; they are counted in seen only
		// when another plan has the same title and date rule
		pt.counted = true
		for j, o := range parsed {
			if j != i && o.cfg.Title == pl.cfg.Title && o.cfg.Date == pl.cfg.Date {
				pt.counted = false
			}
		}
		for _, pd := range dates[i] {
			if err := w.plan(pl, pt, pd, times, cats); err != nil {
				return nil, nil, fmt.Errorf("plan %q: %w", pl.cfg.Title, err)
			}
		}
	}
	w.flushText()
	if w.keepText {
		return w.out, w.text, nil
	}
	return w.out, text, nil
}

// kindTimes are the events of one kind by local date, and its notes; for
// the Sun's rise, set, dawns and dusks, the crossings of its altitude,
// looked up by date: those of the whole window (sun) or those of each date
// looked up, found when first asked for (byDate).
type kindTimes struct {
	events map[time.Time]Event
	notes  map[time.Time]Note

	sun    *threshold
	next   int // sun: the first crossing at or after the start of the date last looked up
	byDate map[time.Time]dayCrossings
	c      *collector // the place, the ephemeris and the dates' midnights
	alt    float64    // the altitude (skylineKey: the skyline)
	dir    astro.Direction
	family string
	kind   config.Kind
	loc    *time.Location
}

// dayCrossings are the Sun's crossings of an altitude within one local
// date, and whether it is above the altitude when the date begins (only
// known, and only needed, for a date without crossings).
type dayCrossings struct {
	xs []astro.Crossing
	up bool
}

// sunKinds are the kinds that list the Sun's crossings of one altitude
// (collector.crossingKind) and that a plan time can follow straight from
// them: altitude, direction and note family (see collector.add).
var sunKinds = map[string]struct {
	alt    float64 // 0: the site's rise and set altitude
	dir    astro.Direction
	family string
}{
	"sunrise":           {0, astro.Rising, "sun-horizon"},
	"sunset":            {0, astro.Setting, "sun-horizon"},
	"civil-dawn":        {astro.CivilTwilight, astro.Rising, "civil"},
	"civil-dusk":        {astro.CivilTwilight, astro.Setting, "civil"},
	"nautical-dawn":     {astro.NauticalTwilight, astro.Rising, "nautical"},
	"nautical-dusk":     {astro.NauticalTwilight, astro.Setting, "nautical"},
	"astronomical-dawn": {astro.AstronomicalTwilight, astro.Rising, "astronomical"},
	"astronomical-dusk": {astro.AstronomicalTwilight, astro.Setting, "astronomical"},
}

// sunTimes returns the kindTimes of a Sun kind, false for other kinds:
// from the collector's crossings (which cover two days beyond its dates)
// when its kinds needed the altitude too or uses (the dates that look a
// time up) are many, else found date by date. A date costs about three
// dates of a pass over the window (the Sun's culminations of the day
// before and after are found again).
func (c *collector) sunTimes(k config.Kind, uses int) (*kindTimes, bool, error) {
	sk, ok := sunKinds[k.Name]
	if !ok {
		return nil, false, nil
	}
	alt := sk.alt
	if alt == 0 {
		alt = c.p.riseAlt()
	}
	kt := &kindTimes{dir: sk.dir, family: sk.family, kind: k, loc: c.p.Location, c: c, alt: alt}
	days := int(c.last.Sub(c.first).Hours()/24) + 1
	if _, done := c.thresholds[alt]; !done && alt != skylineKey && 3*uses < days {
		kt.byDate = map[time.Time]dayCrossings{}
		return kt, true, nil
	}
	th, err := c.threshold(alt)
	if err != nil {
		return nil, false, err
	}
	kt.sun = th
	return kt, true, nil
}

// day returns the Sun's crossings within the local date d.
func (kt *kindTimes) day(d time.Time) (dayCrossings, error) {
	if kt.byDate != nil {
		if dc, ok := kt.byDate[d]; ok {
			return dc, nil
		}
		start, end := kt.c.bounds(d)
		eph, o := kt.c.sky.eph, kt.c.p.Observer
		xs, err := eph.SunCrossings(o, kt.alt, start, end)
		if err != nil {
			return dayCrossings{}, err
		}
		dc := dayCrossings{xs: xs}
		if len(xs) == 0 {
			// the side the Sun stays on, for the date's note
			h, err := eph.SunAltitude(o, start)
			if err != nil {
				return dayCrossings{}, err
			}
			dc.up = h > kt.alt
		}
		kt.byDate[d] = dc
		return dc, nil
	}
	xs := kt.sun.xs
	if dates, i := kt.c.dayDates(), d.Unix()/secondsPerDay-kt.c.first.Unix()/secondsPerDay; i >= 0 && i < int64(len(dates)) && d == dates[i] {
		// a date of the collector's: its crossings from the index of
		// the threshold's by date (dateCrossings), which finds them as
		// the search below does (a local midnight is a whole second)
		at := kt.c.dateCrossings(kt.sun)
		lo, hi := at[i], at[i+1]
		up := kt.sun.upFirst
		if lo > 0 {
			up = xs[lo-1].Direction == astro.Rising
		}
		kt.next = int(lo)
		return dayCrossings{xs: xs[lo:hi], up: up}, nil
	}
	// the crossings from start to end: a plan's dates come in order, so
	// the search goes on from the last date's (next) when it lies before
	// start, and compares the instants as Unix nanoseconds
	start, end := kt.c.bounds(d)
	startN, endN := start.UnixNano(), end.UnixNano()
	i := kt.next
	if i > 0 && xs[i-1].Time.UnixNano() >= startN {
		i = sort.Search(len(xs), func(i int) bool { return xs[i].Time.UnixNano() >= startN })
	}
	for i < len(xs) && xs[i].Time.UnixNano() < startN {
		i++
	}
	j := i
	for j < len(xs) && xs[j].Time.UnixNano() < endN {
		j++
	}
	kt.next = i
	up := kt.sun.upFirst
	if i > 0 {
		up = xs[i-1].Direction == astro.Rising
	}
	return dayCrossings{xs: xs[i:j], up: up}, nil
}

// bounds returns the first instant of the local date d and of the next
// date, from dayStarts when d is within first-1..last+1.
func (c *collector) bounds(d time.Time) (time.Time, time.Time) {
	starts := c.dayStarts()
	if off := d.Sub(c.first); off%(24*time.Hour) == 0 {
		if i := int(off/(24*time.Hour)) + 1; i >= 0 && i+1 < len(starts) {
			return starts[i], starts[i+1]
		}
	}
	return midnight(d, c.p.Location), midnight(d.AddDate(0, 0, 1), c.p.Location)
}

// at returns the instant of the kind on the local date d.
func (kt *kindTimes) at(d time.Time) (time.Time, bool, error) {
	if kt.sun == nil && kt.byDate == nil {
		e, ok := kt.events[d]
		return e.Start, ok, nil
	}
	dc, err := kt.day(d)
	if err != nil {
		return time.Time{}, false, err
	}
	for _, x := range dc.xs {
		if x.Direction == kt.dir {
			return x.Time, true, nil
		}
	}
	return time.Time{}, false, nil
}

// after returns the first instant of the kind on the local date d that is
// after t.
func (kt *kindTimes) after(d, t time.Time) (time.Time, bool, error) {
	if kt.sun == nil && kt.byDate == nil {
		e, ok := kt.events[d]
		return e.Start, ok && e.Start.After(t), nil
	}
	dc, err := kt.day(d)
	if err != nil {
		return time.Time{}, false, err
	}
	for _, x := range dc.xs {
		if x.Direction == kt.dir && x.Time.After(t) {
			return x.Time, true, nil
		}
	}
	return time.Time{}, false, nil
}

// evening reports whether the kind is an evening one, a sunset or a dusk:
// a plan takes it on its date's evening (ofEvening), which may end past
// midnight, not the first of the date, which may be the evening before's.
func (kt *kindTimes) evening() bool {
	return kt.dir == astro.Setting && (kt.sun != nil || kt.byDate != nil)
}

// ofEvening returns the event of an evening kind on the local date d's
// evening: the first after the date's solar noon, on d or past midnight,
// before the next date's noon and its first rising; false when that
// evening has none. Over a
// flat horizon a setting that follows a rising of its date is after that
// date's noon (the Sun culminates between them): noon is looked up only for
// one that does not. A skyline's peaks may hide the Sun and show it again
// before noon: each of its settings is compared with noon.
func (kt *kindTimes) ofEvening(d time.Time) (time.Time, bool, error) {
	dc, err := kt.day(d)
	if err != nil {
		return time.Time{}, false, err
	}
	rose, flat := false, kt.alt != skylineKey
	for _, x := range dc.xs {
		if x.Direction != kt.dir {
			rose = flat
			continue
		}
		if rose {
			return x.Time, true, nil
		}
		noon, err := kt.noon(d)
		if err != nil {
			return time.Time{}, false, err
		}
		if x.Time.After(noon) {
			return x.Time, true, nil
		}
		// before noon: the evening before's, past midnight
	}
	// none on d: the next date's first, when it is before that date's noon
	// and no rising comes before it (the Sun still up from d's evening at
	// midnight): a setting after a rising is the next date's own, over a
	// skyline too (the Sun out over the hills in the morning and behind a
	// peak again before noon is not d's evening)
	next := d.AddDate(0, 0, 1)
	if dc, err = kt.day(next); err != nil {
		return time.Time{}, false, err
	}
	for _, x := range dc.xs {
		if x.Direction != kt.dir {
			break
		}
		noon, err := kt.noon(next)
		if err != nil || !x.Time.Before(noon) {
			return time.Time{}, false, err
		}
		return x.Time, true, nil
	}
	return time.Time{}, false, nil
}

// noon returns the Sun's upper transit (solar noon) on the local date d,
// or the local noon when the date has none (collector.solarNoon).
func (kt *kindTimes) noon(d time.Time) (time.Time, error) { return kt.c.solarNoon(d) }

// note returns the note of a date without the kind's event, when there is one.
func (kt *kindTimes) note(d time.Time) (Note, bool) {
	if kt.sun == nil && kt.byDate == nil {
		n, ok := kt.notes[d]
		return n, ok
	}
	dc, err := kt.day(d) // found already by at
	if err != nil {
		return Note{}, false
	}
	up := dc.up
	if kt.evening() {
		if kt.alt == skylineKey && len(dc.xs) > 0 {
			// the Sun out over the skyline and behind it again before
			// noon, or hidden by a peak in the morning only: it neither
			// stays behind the skyline nor over it all day, and the date
			// gets no reason
			return Note{}, false
		}
		// no event that evening: the Sun stays on the side of the altitude
		// it is on at the date's noon, from the last crossing before it
		noon, err := kt.noon(d)
		if err != nil {
			return Note{}, false
		}
		if len(dc.xs) > 0 {
			up = dc.xs[0].Direction == astro.Setting
		}
		for _, x := range dc.xs {
			if x.Time.Before(noon) {
				up = x.Direction == astro.Rising
			}
		}
	} else if len(dc.xs) > 0 {
		return Note{}, false // the Sun crosses the altitude, the other way
	}
	n := Note{Kind: kt.kind, Date: d, State: astro.AlwaysBelow, Family: kt.family}
	if up {
		n.State = astro.AlwaysAbove
		if twilight(kt.family) { // white night or midnight sun
			start, end := kt.c.bounds(d)
			n.SunUp, err = kt.c.sunStaysUp(start, end)
			if err != nil {
				n.SunUp = false // the reason stays the twilight's
			}
		}
	} else if kt.family == "sun-horizon" && (kt.alt == skylineKey || kt.c.p.Observer.RaisedHorizon()) {
		// the Sun up over the flat horizon at noon but behind the hills
		// all day, not the polar night: as the sunrise and sunset kinds'
		// notes (collector.crossings)
		tr, ok, err := kt.c.noonOf(d)
		n.Hidden = err == nil && ok && kt.c.upAtNoon(tr)
	}
	return n, true
}

// kindTimes adds the events and notes of kind k on the collector's dates
// to kt (a new one when nil).
func (c *collector) kindTimes(k config.Kind, kt *kindTimes) (*kindTimes, error) {
	c.events, c.notes = c.events[:0], c.notes[:0]
	if err := c.add(k); err != nil {
		return nil, err
	}
	if kt == nil {
		kt = &kindTimes{events: make(map[time.Time]Event, len(c.events)+1), notes: map[time.Time]Note{}}
	}
	for _, e := range c.events {
		if _, dup := kt.events[e.Date]; !dup {
			kt.events[e.Date] = e
		}
	}
	for _, n := range c.notes {
		kt.notes[n.Date] = n
	}
	return kt, nil
}

// planDates lists the local dates first..last a date rule gives.
func (sky *Sky) planDates(ctx context.Context, p Place, r config.DateRule, first, last time.Time) ([]planDate, error) {
	var out []planDate
	// first and last are civil dates (00:00 UTC, see collector): a date
	// is the one before plus 24 h
	switch r.Type {
	case config.RuleEveryDay:
		out = make([]planDate, 0, daysBetween(first, last)+1)
		for d := first; !d.After(last); d = d.Add(24 * time.Hour) {
			out = append(out, planDate{date: d})
		}
		return out, nil
	case config.RuleWeekly:
		ahead := (int(r.Weekday-first.Weekday()) + 7) % 7
		out = make([]planDate, 0, daysBetween(first, last)/7+1)
		for d := first.Add(time.Duration(ahead) * 24 * time.Hour); !d.After(last); d = d.Add(7 * 24 * time.Hour) {
			out = append(out, planDate{date: d})
		}
		return out, nil
	case config.RuleYearly:
		for y := first.Year(); y <= last.Year(); y++ {
			d := time.Date(y, r.Month, r.Day, 0, 0, 0, 0, time.UTC)
			if d.Month() == r.Month && !d.Before(first) && !d.After(last) { // 02-29 only in leap years
				out = append(out, planDate{date: d})
			}
		}
		return out, nil
	case config.RuleOnce:
		if d := civil(r.Date); !d.Before(first) && !d.After(last) {
			out = append(out, planDate{date: d})
		}
		return out, nil
	}
	c := &collector{ctx: ctx, sky: sky, p: p, first: first.AddDate(0, 0, -PlanMargin+1), last: last.AddDate(0, 0, PlanMargin-1)}
	// the rule's events: their kind, instant and local date, by instant
	type anchor struct {
		kind    config.Kind
		at, day time.Time
		dir     astro.Direction
	}
	var evs []anchor
	if _, phase := phaseKinds[r.Event.Name]; phase || r.Event.Name == "moon-phases" {
		// the phases are the same for every site: found once per Sky, and
		// a date rule needs no illumination
		ps, err := sky.moonPhases()
		if err != nil {
			return nil, err
		}
		z := newZoneCache(p.Location)
		if r.Event.Name == "moon-phases" {
			evs = make([]anchor, 0, len(ps))
		} else {
			evs = make([]anchor, 0, len(ps)/4+2) // one phase of four
		}
		for _, ph := range ps {
			if name := phaseNames[ph.Kind]; r.Event.Name == name || r.Event.Name == "moon-phases" {
				if d := z.date(ph.Time); c.inRange(d) {
					evs = append(evs, anchor{kind: config.Kind{Name: name}, at: ph.Time, day: d})
				}
			}
		}
	} else {
		if err := c.add(r.Event); err != nil {
			return nil, err
		}
		evs = make([]anchor, len(c.events))
		for i, e := range c.events {
			evs[i] = anchor{e.Kind, e.Start, e.Date, e.Direction}
		}
	}
	slices.SortStableFunc(evs, func(a, b anchor) int { return a.at.Compare(b.at) })
	out = make([]planDate, 0, len(evs))
	// A date is listed once, for all of its anchors: two anchors give one
	// date when a weekday rule takes them to the same weekday ("saturday
	// after moon-phases": a first quarter on a Saturday, the full moon on
	// the Friday after), and the entry names both. listed holds, by day of
	// the window, 1 + the index in out of the date's entry (0: none yet),
	// so that finding it costs the same whatever the order of the dates.
	listed := make([]int, daysBetween(first, last)+1)
	for _, e := range evs {
		d := e.day
		var skipped time.Time
		if r.Type == config.RuleWeekdayOf {
			d = weekdayOf(d, r.Weekday, r.Relation)
			// a date the clocks skip whole (Friday 30 December 2011 in
			// Pacific/Apia) is no such weekday: the rule takes the
			// nearest one that exists, a week before or after (c's
			// dates, a week beyond the window, hold every one that can
			// reach it)
			if c.gone(d) {
				skipped, d = d, otherWeekday(d, e.day, r.Relation)
			}
		}
		if d.Before(first) || d.After(last) {
			continue
		}
		i := daysBetween(first, d)
		if j := listed[i]; j > 0 {
			out[j-1].also = append(out[j-1].also, planAnchor{e.kind, e.at, e.dir, skipped})
			continue
		}
		out = append(out, planDate{date: d, anchored: true, kind: e.kind, at: e.at, dir: e.dir, skipped: skipped})
		listed[i] = len(out)
	}
	return out, nil
}

// weekdayOf is the date with weekday wd nearest to d (d itself when it is
// one), or the last one strictly before d, or the first one strictly after.
func weekdayOf(d time.Time, wd time.Weekday, rel string) time.Time {
	diff := int(wd - d.Weekday()) // −6..6
	switch rel {
	case config.RelBefore:
		back := (int(d.Weekday()-wd) + 7) % 7
		if back == 0 {
			back = 7
		}
		return d.AddDate(0, 0, -back)
	case config.RelAfter:
		ahead := (diff + 7) % 7
		if ahead == 0 {
			ahead = 7
		}
		return d.AddDate(0, 0, ahead)
	}
	// nearest: within three days either way
	ahead := (diff + 7) % 7
	if ahead > 3 {
		return d.AddDate(0, 0, ahead-7)
	}
	return d.AddDate(0, 0, ahead)
}

// otherWeekday is the date of a weekday rule for an event on the local
// date day when the date d it gives does not exist: the same weekday a
// week earlier for "before", a week later for "after", and for "nearest"
// the one on the other side of day, which is nearer than any other.
func otherWeekday(d, day time.Time, rel string) time.Time {
	if rel == config.RelBefore || rel == config.RelNearest && d.After(day) {
		return d.AddDate(0, 0, -7)
	}
	return d.AddDate(0, 0, 7)
}

// planText is the text of a plan that is the same on each of its dates.
type planText struct {
	lead       string // the plan's own description, with its newline
	rule       string // the date rule in words
	startWords string // " (30 min after sunset)"
	endWords   string
	startName  string // the start event in words, "astronomical dusk"
	endName    string
	counted    bool // the plan's dates are each once in its UID keys: no need to count them in seen
	// the name in text of the kind of the anchors (inText), for the last
	// kind asked
	anchorKind config.Kind
	anchorText string
}

// anchorName is inText(k), kept for the next entry: a plan's anchors are
// mostly of one kind.
func (pt *planText) anchorName(k config.Kind) string {
	if pt.anchorText == "" || pt.anchorKind != k {
		pt.anchorKind, pt.anchorText = k, inText(k)
	}
	return pt.anchorText
}

func newPlanText(pl *plan) *planText {
	pt := &planText{}
	if r := pl.rule.Type; r == config.RuleEvent || r == config.RuleWeekdayOf {
		pt.rule = ruleText(pl.rule)
	}
	if d := strings.TrimSpace(pl.cfg.Description); d != "" {
		pt.lead = d + "\n"
	}
	if pl.start != nil {
		pt.startWords = timeWords(*pl.start)
		if !pl.start.IsClock {
			pt.startName = inText(pl.start.Event)
		}
	}
	if pl.end != nil {
		pt.endWords = timeWords(*pl.end)
		if !pl.end.IsClock {
			pt.endName = inText(pl.end.Event)
		}
	}
	return pt
}

// plan writes the entry of one plan on one date. Its description and UID
// go to text (see flushText).
func (w *entryWriter) plan(pl *plan, pt *planText, pd planDate, times map[config.Kind]*kindTimes, cats []string) error {
	z := w.site.zone
	d := pd.date
	en := w.next() // out's elements past its length are zero, as entries leaves them
	en.Kind, en.Title, en.Categories, en.Date, en.Alarm = KindPlan, pl.cfg.Title, cats, d, w.alarm
	from := len(w.text)
	b := append(w.text, pt.lead...)
	if pd.anchored {
		b = append(append(append(b, "Date: "...), pt.rule...), " ("...)
		anchor := func(b []byte, a planAnchor) []byte {
			if a.kind.Name == config.KindPhotoperiod {
				// a date without a time (at is its first instant): the
				// rule names the day length
				return a.at.In(z.loc).AppendFormat(append(b, photoperiodWay(a.dir)...), "Mon 2 Jan 2006")
			}
			b = append(b, pt.anchorName(a.kind)...)
			b = z.appendStamp(append(b, ' '), ToMinute(a.at)) // to the minute: rounded, as every output
			if !a.skipped.IsZero() {
				b = a.skipped.AppendFormat(append(b, "; the clocks skip "...), "Mon 2 Jan 2006")
				b = append(append(append(b, ", the "...), pl.rule.Weekday.String()...), ' ')
				b = append(append(b, pl.rule.Relation...), " it"...)
			}
			return b
		}
		b = anchor(b, planAnchor{pd.kind, pd.at, pd.dir, pd.skipped})
		for _, a := range pd.also {
			b = anchor(append(b, "; "...), a)
		}
		b = append(b, ").\n"...)
	}
	allDay := func() {
		en.AllDay, en.Start, en.End = true, d, d.AddDate(0, 0, 1)
	}
	done := func(b []byte) error {
		sp := textSpan{entry: len(w.out) - 1, from: from, to: len(b), uid: len(b)}
		key := append(append(append(append(append(w.buf[:0], w.feedID...), '|'), KindPlan...), '|'), pl.cfg.Title...)
		key = w.appendKeyDate(append(append(append(key, '|'), pl.cfg.Date...), '|'), d)
		if pt.counted {
			key = append(key, "|0"...)
			w.buf = key
			w.text = w.appendHash(b, key)
		} else {
			w.text = w.appendUID(b, key)
		}
		w.spans = append(w.spans, sp)
		return nil
	}
	if pl.start == nil {
		allDay()
		return done(append(b, "All day."...))
	}
	start, ok, err := w.planTime(*pl.start, d, times)
	if err != nil {
		return err
	}
	if !ok {
		// the start event does not happen on this date: say so, no time
		allDay()
		en.Title = pl.cfg.Title + ": no " + pt.startName + " today"
		en.Facts.Missing = pl.start.Event.String()
		b = append(append(append(b, "No time today: the start, "...), pt.startName...), ", does not happen on "...)
		kt := times[pl.start.Event]
		if kt.evening() {
			b = append(b, "the evening of "...)
		}
		b = d.AppendFormat(b, "Monday 2 January 2006")
		if n, ok := kt.note(d); ok {
			// the note's title as the reason in brackets, within the
			// sentence: "(polar night: the Sun does not rise today)"
			t, _, _ := describeNote(w.site, n)
			b = append(append(append(b, " ("...), Small(t)...), ')')
		}
		return done(append(b, '.'))
	}
	var end time.Time
	if pl.end != nil && pl.end.IsClock {
		var ok bool
		if end, ok = w.clockEnd(*pl.end, *pl.start, d, start); !ok || !end.After(start) {
			// no time that date: the start has passed an afternoon or
			// evening end, or the clocks skip a start and move it, by
			// their jump, to or past a later end
			allDay()
			st, et := startText(*pl.start), clockText(pl.end.Clock)
			b = append(append(append(b, "No time today: the start, "...), st...), ", "...)
			if !ok {
				en.Title = pl.cfg.Title + ": " + st
				if !pl.start.IsClock {
					at := ToMinute(start).In(z.loc)
					if z.date(start).After(d) {
						en.Title += " (" + at.Format("15:04 Mon") + ")" // past midnight
					} else {
						en.Title += " (" + at.Format("15:04") + ")"
					}
					b = appendOtherDay(z.appendClock(append(b, "at "...), start), z.date(start), d)
					b = append(b, ", "...)
				}
				en.Title += " comes after the end, " + et
				b = append(append(b, "comes after the end, "...), et...)
			} else {
				en.Title = pl.cfg.Title + ": no time today"
				b = append(z.appendClock(append(b, "is at "...), start), skippedClock(*pl.start, start, z)...)
				b = append(append(b, ", not before the end, "...), et...)
			}
			return done(append(d.AppendFormat(append(b, ", on "...), "Monday 2 January 2006"), '.'))
		}
	}
	en.Start = start
	noEnd := false
	switch {
	case pl.end != nil && pl.end.IsClock:
		en.End = end
	case pl.end != nil:
		end, ok, err := w.planEnd(*pl.end, d, start, times)
		if err != nil {
			return err
		}
		en.End, noEnd = end, !ok
	case pl.cfg.For > 0:
		en.End = start.Add(pl.cfg.For.D())
	}
	// a clock time moved by the clocks' jump forward, or one they show
	// twice going back (the first of the two taken): said beside it
	sm, sMoved := movedClock(*pl.start, start, z)
	if !sMoved && z.changeNear(start.Unix()) {
		sm, sMoved = twiceClock(*pl.start, start, z)
	}
	var em clockMove
	eMoved := false
	if pl.end != nil && !en.End.IsZero() {
		if em, eMoved = movedClock(*pl.end, en.End, z); !eMoved && z.changeNear(en.End.Unix()) {
			em, eMoved = twiceClock(*pl.end, en.End, z)
		}
	}
	// a start and an end the same jump of the clocks moves: said once,
	// after the end
	sd := z.date(start)
	both := sMoved && eMoved && sm.by > 0 && sm.by == em.by && sd.Equal(z.date(en.End))
	var next time.Time // the start's date, when it is past the plan's
	if sd.After(d) {
		next = sd
	}
	// a plan with no end (an instant) is at its start; one whose end was
	// not found is still a span, from its start
	lead := "From "
	if en.End.IsZero() && !noEnd {
		lead = "At "
	}
	b = append(z.appendClock(append(b, lead...), start), pt.startWords...)
	b = appendMoved(b, sm, sMoved && !both, next, true)
	// the clocks going back, said once: after the end the plan lasts
	// across the change to, else after a start the clocks show twice
	back, across := "", false
	if (pl.start.IsClock || pl.end != nil && pl.end.IsClock) && sm.by >= 0 && em.by >= 0 { // else said beside that time
		back, across = goBack(start, en.End, z)
	}
	if back != "" && !across {
		b = append(b, back...)
	}
	if noEnd {
		b = append(append(append(b, "; no "...), pt.endName...), " that day or the next to end it"...)
	}
	if !en.End.IsZero() {
		b = z.appendClock(append(b, " to "...), en.End)
		if pl.end != nil {
			b = append(b, pt.endWords...)
		}
		ed := z.date(en.End)
		en.Facts.NextDay = ed.After(d)
		switch {
		case both:
			b = append(append(append(b, " ("...), bothMovedWords(sm, em)...), ')')
		case ed.After(d) && ed.After(sd): // said once when the start is past midnight too
			b = appendMoved(b, em, eMoved, ed, false)
		case eMoved && em.by < 0 && sm.by < 0: // the start said why
			b = append(append(append(b, " (the first "...), clockText(em.written)...), " too)"...)
		case !eMoved && z.secondPass(en.End):
			// after the clocks went back (a for: or an event's end), the
			// reading the start may have called the first
			b = append(append(append(b, " (the second "...), en.End.In(z.loc).Format("15:04")...), ')')
		default: // the date of a move is not said twice either
			b = appendMoved(b, em, eMoved, time.Time{}, next.IsZero() || !ed.Equal(next))
		}
	}
	b = append(b, '.')
	// a change of the clocks the plan lasts across, in the sentence the
	// dark windows and lamp periods write: its clock times are nearer or
	// further apart than its length; not when a time beside it has said
	// the change (moved, or shown twice)
	if !en.End.IsZero() && (across || !sMoved && !eMoved) {
		b = append(b, z.clocksDuring(start, en.End)...)
	}
	// the legal caution is for times the sky sets; a plan from 23:30 to
	// 00:30 by the clock has none
	if !pl.start.IsClock || (pl.end != nil && !pl.end.IsClock) {
		b = append(append(b, '\n'), cautionLegal...)
	}
	return done(b)
}

// planTime is the instant of a plan time on the local date d: the clock
// time (clockOn, from the collector's midnights when it has them: see
// entryWriter.clockOn), or the event of that date with its offset (an
// evening kind's: of the date's evening, which may be past midnight);
// false when the event does not happen on d.
func (w *entryWriter) planTime(ts config.TimeSpec, d time.Time, times map[config.Kind]*kindTimes) (time.Time, bool, error) {
	if ts.IsClock {
		return w.clockOn.clockOnDay(floorDiv(d.Unix(), secondsPerDay), ts.Clock), true, nil
	}
	kt := times[ts.Event]
	at := kt.at
	if kt.evening() {
		at = kt.ofEvening
	}
	t, ok, err := at(d)
	if err != nil || !ok {
		return time.Time{}, false, err
	}
	return t.Add(ts.Offset), true, nil
}

// clockEnd is the end, at the clock time ts, of a plan that starts at
// start (the time spec from, an instant at) on the local date d: that clock
// time on d when it is later than the start (a clock start compared as
// written, so that one the clocks skip, moved, does not put the end on the
// next day); otherwise on the next date when it is before 12:00 (an end
// past midnight, "01:00"), false when an event start is past it too. An
// end at or after 12:00 that the start has passed leaves the plan no time
// that date: false. A clock start that the clocks skip, moved past such an
// end (23:30 in America/Nuuk on Saturday 27 March 2027, whose clocks go
// from 23:00 to 00:00, is 00:30 on Sunday, past an end "00:15"), keeps it:
// the caller finds no time between them and says that the start moved.
func (w *entryWriter) clockEnd(ts, from config.TimeSpec, d, start time.Time) (time.Time, bool) {
	day := floorDiv(d.Unix(), secondsPerDay)
	end := w.clockOn.clockOnDay(day, ts.Clock)
	if from.IsClock && ts.Clock > from.Clock || !from.IsClock && end.After(start) {
		return end, true
	}
	if ts.Clock >= 12*time.Hour {
		return time.Time{}, false
	}
	end = w.clockOn.clockOnDay(day+1, ts.Clock)
	return end, from.IsClock || end.After(start)
}

// planEnd is the end of a plan that starts at start on the local date d
// at an event: the first event of the end's kind, with its offset, after
// start (and, for an evening kind, after the date's solar noon), on d or on
// the next date (of two dusks on d, the one after start; a dusk past
// midnight, on the next date); false when neither date has one.
func (w *entryWriter) planEnd(ts config.TimeSpec, d, start time.Time, times map[config.Kind]*kindTimes) (time.Time, bool, error) {
	kt := times[ts.Event]
	from := start.Add(-ts.Offset)
	if kt.evening() {
		noon, err := kt.noon(d)
		if err != nil {
			return time.Time{}, false, err
		}
		if noon.After(from) {
			from = noon
		}
	}
	for _, day := range []time.Time{d, d.AddDate(0, 0, 1)} {
		t, ok, err := kt.after(day, from)
		if err != nil {
			return time.Time{}, false, err
		}
		if ok {
			return t.Add(ts.Offset), true, nil
		}
	}
	return time.Time{}, false, nil
}

// startText names a plan's start in a sentence: "astronomical dusk", "30
// min after sunset", "20:00".
func startText(ts config.TimeSpec) string {
	switch {
	case ts.IsClock:
		return clockText(ts.Clock)
	case ts.Offset != 0:
		return offsetTitle(ts.Offset, plainName(ts.Event))
	}
	return inText(ts.Event)
}

// clockText is a plan's clock time as written: "23:30".
func clockText(c time.Duration) string {
	return fmt.Sprintf("%02d:%02d", int(c/time.Hour), int(c%time.Hour/time.Minute))
}

// clockMove is a plan's clock time that the local clock skips on its date
// (clocks set forward, as for summer time), so that clockOn moved it by the
// jump: see movedClock; or, by negative, one the clocks show twice when
// they go back, of which clockOn takes the first: see twiceClock.
type clockMove struct {
	written time.Duration // the clock time as written
	by      time.Duration // how much later it is shown; negative when shown twice, the clocks going back by −by
	t       time.Time     // the instant, in the site's zone
}

// movedClock is the move of the clock time ts shown at t; false when ts is
// not a clock time or t shows it as written.
func movedClock(ts config.TimeSpec, t time.Time, z *zoneCache) (clockMove, bool) {
	if !ts.IsClock {
		return clockMove{}, false
	}
	// the clock shown, to the minute, from the zone's cached offset
	u := t.Unix()
	_, off := z.at(u)
	shown := time.Duration(daySeconds(u+off)/60) * time.Minute
	if shown == ts.Clock {
		return clockMove{}, false
	}
	return clockMove{written: ts.Clock, by: (shown - ts.Clock + 24*time.Hour) % (24 * time.Hour), t: t.In(z.loc)}, true
}

// day is the local date the clocks skip the clock time as written on, as
// 00:00 UTC: the date of the clock shown at the instant less the move. It
// is the date before the instant's when the skipped hour runs into
// midnight (23:10 in America/Nuuk on Saturday 27 March 2027, shown as
// 00:10 on Sunday).
func (m clockMove) day() time.Time {
	_, off := m.t.Zone()
	wall := m.t.Unix() + int64(off) - int64(m.by/time.Second)
	return time.Unix(floorDiv(wall, secondsPerDay)*secondsPerDay, 0).UTC()
}

// twiceClock is the clock time ts shown at t when the clocks show it twice
// on t's date, going back, t being the first of the two (as clockOn takes
// it); false when ts is not a clock time or the clocks show it once.
func twiceClock(ts config.TimeSpec, t time.Time, z *zoneCache) (clockMove, bool) {
	if !ts.IsClock {
		return clockMove{}, false
	}
	u := t.Unix()
	_, off := z.at(u)
	next := z.nextChange(u)
	if next-u > 2*secondsPerDay { // see changeNear
		return clockMove{}, false
	}
	_, after := z.at(next)
	by := shownAgain(int(off), int(after), time.Duration(next-u)*time.Second)
	if by == 0 {
		return clockMove{}, false
	}
	return clockMove{written: ts.Clock, by: -by, t: t.In(z.loc)}, true
}

// changeNear reports whether the zone's offset may change within two days
// after the Unix second u (no change has set the clocks back further):
// only then can the clocks show u's reading twice (twiceClock), and the
// zone's next period is looked up, which the next entry's times would look
// up back. A second outside the cached period may be near one too.
func (z *zoneCache) changeNear(u int64) bool {
	return u < z.from || z.to-u <= 2*secondsPerDay
}

// words says why the time moved, "moved from 00:30, which the clocks skip
// on Sun 28 Mar 2027: the clocks go forward for summer time by 1 h", or,
// when its date is said beside it (not dated), "moved from 00:30, which the
// clocks skip: they go forward for summer time by 1 h". The date the
// clocks skip it on is said beside it too when that is not the date shown
// at the instant: "moved from 23:30, which the clocks skip on Sat 27 Mar
// 2027" beside Sun 28 Mar. It says which of two readings a time the clocks
// show twice is, "the first 01:30, which the clocks show twice: on Sun 7
// Nov 2027 at 02:00 EDT they go back from summer time by 1 h" (without "on
// Sun 7 Nov 2027" when not dated and the change is on the time's date; see
// twiceClock).
func (m clockMove) words(dated bool) string {
	if m.by < 0 {
		// the change ends m.t's period: its clock before the change
		name, off := m.t.Zone()
		_, end := astro.ZonePeriod(m.t)
		label := ZoneLabel(name)
		change := end.In(time.FixedZone(label, off))
		w := "the first " + clockText(m.written) + ", which the clocks show twice: "
		if y, mo, d := m.t.Date(); dated || change.Day() != d || change.Month() != mo || change.Year() != y {
			w += "on " + change.Format("Mon 2 Jan 2006") + " "
		}
		summer := m.t.IsDST() && !end.In(m.t.Location()).IsDST()
		return w + "at " + ChangeClock(change) + " " + label + " they " + ClocksGo(false, summer, -m.by)
	}
	change := ClocksGo(true, m.t.IsDST(), m.by)
	day := m.day()
	if y, mo, d := m.t.Date(); !dated && day.Equal(time.Date(y, mo, d, 0, 0, 0, 0, time.UTC)) {
		return "moved from " + clockText(m.written) + ", which the clocks skip: they " + change
	}
	return "moved from " + clockText(m.written) + ", which the clocks skip on " + day.Format("Mon 2 Jan 2006") + ": the clocks " + change
}

// ClocksGo says how the clocks change, by how much: "go forward for summer
// time by 1 h" when forward into summer time, "go back from summer time by
// 1 h" when back out of it, "go forward by 30 min" for another change. A
// plan's note of the clocks and the served day-by-day table's line of a
// date the clocks change on say it in these words.
func ClocksGo(forward, summer bool, by time.Duration) string {
	how, season := "back", " from summer time"
	if forward {
		how, season = "forward", " for summer time"
	}
	if !summer {
		season = ""
	}
	return "go " + how + season + " by " + amount(by)
}

// ChangeClock is the clock t shows at a change of the clocks, in the words
// that say the change (ClocksGo): "01:00", or "00:44:30" where the change is
// not whole minutes (Africa/Monrovia's from −00:44:30 to GMT in 1972), so
// that "00:00 becomes 00:44:30" says the jump.
func ChangeClock(t time.Time) string {
	if t.Second() != 0 {
		return t.Format("15:04:05")
	}
	return t.Format("15:04")
}

// ClockChange says how the clocks of loc change on the local date d (its
// midnight in UTC, as the rows' dates are), "" when they do not: "Clocks go
// forward for summer time by 1 h: 00:00 becomes 01:00" (America/Havana,
// 14 March 2027), "Clocks go back from summer time by 1 h: 24:00 becomes
// 23:00" (America/Santiago, 3 April 2027). A change belongs to the date
// the clocks show after it, so a skipped midnight is said on the date that
// then starts at 01:00; the time it is read at is the clock's before it,
// 24:00 for the end of the row's own date. A change that jumps over whole
// dates names the dates on both sides ("24:00 on Thu 29 Dec becomes 00:00
// on Sat 31 Dec", Pacific/Apia in 2011), and the row of a date it jumps
// over says that the date is skipped. The served day-by-day tables write
// it on the row of d, the daily summary of d at the end of its description.
func ClockChange(d time.Time, loc *time.Location) string {
	row := d.Format(time.DateOnly)
	var said []string
	// from two days before the date to three after it, as instants: the
	// date's noon in loc may not exist (the clocks skip the whole date)
	for ch := range OffsetChanges(loc, d.Add(-48*time.Hour), d.Add(72*time.Hour)) {
		tr, before, after := ch.At, ch.Before, ch.After
		old, now := tr.In(time.FixedZone("", before)), tr.In(loc)
		was, wasDate := ChangeClock(old), old
		if was == "00:00" && old.Format(time.DateOnly) != now.Format(time.DateOnly) {
			was, wasDate = "24:00", old.AddDate(0, 0, -1) // the end of the date before
		}
		jumpsDates := wasDate.Format(time.DateOnly) < row && row < now.Format(time.DateOnly)
		if now.Format(time.DateOnly) != row && !jumpsDates {
			continue // a change of another date
		}
		// summer time is the clock's after a change forward, before one back
		by, forward, summer := time.Duration(after-before)*time.Second, after > before, now.IsDST()
		if !forward {
			by, summer = -by, tr.Add(-time.Second).In(loc).IsDST()
		}
		becomes := ChangeClock(now)
		y, m, day := now.Date() // the date before now's, as a civil date: it may not exist in loc
		if d := wasDate.Format(time.DateOnly); d != row && d != time.Date(y, m, day-1, 0, 0, 0, 0, time.UTC).Format(time.DateOnly) {
			// the clocks jump over at least one whole date
			was += " on " + wasDate.Format("Mon 2 Jan")
			becomes += " on " + now.Format("Mon 2 Jan")
		}
		if jumpsDates {
			said = append(said, "This date is skipped: the clocks "+ClocksGo(forward, summer, by)+", "+was+" becomes "+becomes)
			continue
		}
		said = append(said, "Clocks "+ClocksGo(forward, summer, by)+": "+was+" becomes "+becomes)
	}
	return strings.Join(said, "; ")
}

// skipped is the span of clock times skipped by the change of offset that
// moved the time, "00:00–01:00", from the tz database's transition; "" if
// the zone does not give it.
func (m clockMove) skipped() string {
	tr, _ := m.t.ZoneBounds()
	if tr.IsZero() || tr.After(m.t) {
		return ""
	}
	_, before := tr.Add(-time.Second).Zone()
	_, after := tr.Zone()
	if time.Duration(after-before)*time.Second != m.by {
		return ""
	}
	from := tr.In(time.FixedZone("", before))
	return from.Format("15:04") + "–" + tr.Format("15:04")
}

// bothMovedWords says once why a plan's start and end, both skipped by the
// same change of the clocks, moved: "both moved by 1 h from 00:00 and
// 00:45: the clocks skip 00:00–01:00 on Sun 28 Mar 2027 for summer time".
func bothMovedWords(start, end clockMove) string {
	b := fmt.Sprintf("both moved by %s from %s and %s: the clocks skip ", amount(start.by), clockText(start.written),
		clockText(end.written))
	if sk := start.skipped(); sk != "" {
		b += sk + " "
	}
	b += "on " + start.day().Format("Mon 2 Jan 2006")
	if start.t.IsDST() {
		b += " for summer time"
	}
	return b
}

// goBack says that the clocks go back at start or between start and end
// (zero: none), " (on Sun 7 Nov 2027 at 01:00 CDT the clocks go back from
// summer time by 1 h)", as movedClock's words say they go forward; across
// when the change comes after start, not after end, and "" when there is
// none: the clocks show start's reading again after the change (a start
// in the repeated hour, the first of the two: see clockOn), or end is at
// or after it.
func goBack(start, end time.Time, z *zoneCache) (words string, across bool) {
	label, off := z.at(start.Unix())
	next := z.nextChange(start.Unix())
	if next == math.MaxInt64 {
		return "", false // no change after start
	}
	change := time.Unix(next, 0)
	_, after := z.at(next)
	by := time.Duration(off-after) * time.Second
	across = !end.IsZero() && !change.After(end)
	if by <= 0 || !across && change.Sub(start) > by { // the repeated hour's first reading is shown twice too
		return "", false
	}
	summer := start.In(z.loc).IsDST() && !change.In(z.loc).IsDST()
	at := change.In(time.FixedZone(label, int(off))) // the clock before the change
	return " (on " + at.Format("Mon 2 Jan 2006") + " at " + ChangeClock(at) + " " + label + " the clocks " + ClocksGo(false, summer, by) + ")", across
}

// appendMoved appends what follows a plan's time shown: " the next day (Sun
// 28 Mar)" when next, its date, is not zero, with the move within the
// brackets, " the next day (Sun 28 Mar; moved from 00:30, which the clocks
// skip: …)"; otherwise the move alone, " (moved from 00:30, …)", with its
// date when dated; nothing when neither.
func appendMoved(b []byte, m clockMove, moved bool, next time.Time, dated bool) []byte {
	if !next.IsZero() {
		b = next.AppendFormat(append(b, " the next day ("...), "Mon 2 Jan")
		if moved {
			b = append(append(b, "; "...), m.words(false)...)
		}
		return append(b, ')')
	}
	if moved {
		b = append(append(append(b, " ("...), m.words(dated)...), ')')
	}
	return b
}

// skippedClock says why a clock time of a plan is shown later than written
// (movedClock), " (moved from 00:30, which the clocks skip on Sun 28 Mar
// 2027: the clocks go forward for summer time by 1 h)", or "" when it is
// not.
func skippedClock(ts config.TimeSpec, t time.Time, z *zoneCache) string {
	m, ok := movedClock(ts, t, z)
	if !ok {
		return ""
	}
	return " (" + m.words(true) + ")"
}

// timeWords says which event a plan time follows, " (30 min after
// sunset)", or "" for a clock time.
func timeWords(ts config.TimeSpec) string {
	if ts.IsClock {
		return ""
	}
	if ts.Offset != 0 {
		return " (" + offsetTitle(ts.Offset, plainName(ts.Event)) + ")"
	}
	return " (" + inText(ts.Event) + ")"
}

// inText is a kind's name inside a sentence: "sunset", "new moon", but
// "June solstice".
func inText(k config.Kind) string {
	n := plainName(k)
	for _, m := range []string{"March", "June", "September", "December"} {
		if strings.HasPrefix(n, m) {
			return n
		}
	}
	return Small(n)
}

// plainName is a kind's name in words: "New moon", "Sunset", "day length
// crossing 12 h", "Sun at −3°", "Sun between +2° and +12°", "Lamps to 16 h".
func plainName(k config.Kind) string {
	if n, ok := plainNames[k.Name]; ok {
		return n
	}
	switch k.Name {
	case config.KindPhotoperiod:
		return "day length crossing " + amount(k.DayLength)
	case "sun-altitude":
		return "Sun at " + signedDegrees(k.Altitude)
	case config.KindSunBand:
		return bandBase(k.Altitude, k.High)
	case config.KindLighting:
		return "Lamps to " + amount(k.DayLength)
	}
	return k.String()
}

// ruleText says a date rule in words: "the Saturday nearest the new moon",
// "the date of a Moon phase".
func ruleText(r config.DateRule) string {
	ev := "the " + inText(r.Event)
	switch r.Event.Name { // a group: one of its kinds
	case "moon-phases":
		ev = "a Moon phase"
	case "seasons":
		ev = "an equinox or solstice"
	}
	switch r.Type {
	case config.RuleWeekdayOf:
		return fmt.Sprintf("the %s %s %s", r.Weekday, r.Relation, ev)
	case config.RuleEvent:
		if r.Event.Name == config.KindPhotoperiod {
			return "the date the day length crosses " + amount(r.Event.DayLength)
		}
		return "the date of " + ev
	}
	return ""
}

// photoperiodWay is the way a photoperiod's day length crosses it, before
// the date: "rising past it on ".
func photoperiodWay(dir astro.Direction) string {
	if dir == astro.Rising {
		return "rising past it on "
	}
	return "falling below it on "
}

// moonPhases returns the Moon's phases over the Sky's dates, found once.
func (sky *Sky) moonPhases() ([]astro.Phase, error) {
	sky.phaseOnce.Do(func() {
		sky.phaseList, sky.phaseErr = astro.MoonPhases(sky.from, sky.to)
	})
	return sky.phaseList, sky.phaseErr
}

// clockOn is the instant the local clock shows clock (since midnight) on
// the local date d. A clock time skipped by a change to summer time is
// taken as that long after the last instant before the change, as clocks
// that are set forward show it (00:30 on a night that jumps from 00:00 to
// 01:00 is 01:30); Go's time.Date may instead give the previous evening.
// That instant is on the next date when the skipped hour runs into
// midnight (23:10 in America/Nuuk on Saturday 27 March 2027, whose clocks
// go from 23:00 to 00:00 on Sunday, is 00:10 on Sunday). A clock time the
// clocks show twice, when they go back, is the first of the two, the
// earlier instant (RFC 5545 §3.3.5: "the first occurrence"); Go's
// time.Date gives either, by zone.
func clockOn(d time.Time, clock time.Duration, loc *time.Location) time.Time {
	h, m := int(clock/time.Hour), int(clock%time.Hour/time.Minute)
	t := time.Date(d.Year(), d.Month(), d.Day(), h, m, 0, 0, loc)
	if lt := t.In(loc); lt.Hour() == h && lt.Minute() == m && lt.Day() == d.Day() {
		return firstReading(t)
	}
	// The clocks skip the reading: it is wall less the offset before the
	// change, an instant after the change (its offset is larger) whose
	// reading with the offset after the change, wall less that offset, is
	// before it (still on the offset before), whatever its date. On a date
	// the clocks skip whole the probes may all be after the change: t, as
	// Go gives it, is then moved by the jump (12:00 on Friday 30 December
	// 2011 in Pacific/Apia is 12:00 on Saturday).
	wall := time.Date(d.Year(), d.Month(), d.Day(), h, m, 0, 0, time.UTC)
	for _, probe := range []time.Time{t.Add(-6 * time.Hour), t, t.Add(6 * time.Hour)} {
		_, before := probe.In(loc).Zone()
		u := wall.Add(-time.Duration(before) * time.Second)
		_, after := u.In(loc).Zone()
		if after <= before {
			continue
		}
		if _, o := wall.Add(-time.Duration(after) * time.Second).In(loc).Zone(); o == before {
			return u
		}
	}
	return t
}

// firstReading is the first instant at which the local clock reads what it
// reads at t: t itself, or, when the clocks went back to read it again
// (t in the zone period after the change), the same reading an offset's
// difference earlier, before the change.
func firstReading(t time.Time) time.Time {
	zs, _ := t.ZoneBounds()
	if zs.IsZero() {
		return t
	}
	_, off := t.Zone()
	_, before := zs.Add(-time.Second).Zone()
	if before <= off {
		return t
	}
	if c := t.Add(-time.Duration(before-off) * time.Second); c.Before(zs) {
		if _, o := c.Zone(); o == before {
			return c
		}
	}
	return t
}
