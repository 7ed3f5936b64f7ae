package feed

import (
	"context"
	"fmt"
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
	date   time.Time
	anchor *Event // the event of the rule (RuleEvent, RuleWeekdayOf)
}

// feedEntries computes the entries of a feed's kinds and plans on the local
// dates first..last, sorted by Start then UID, finding the Sun's crossings
// for both in one pass.
func (sky *Sky) feedEntries(ctx context.Context, s *config.Site, f *config.Feed, first, last time.Time) ([]Entry, error) {
	col := &collector{ctx: ctx, sky: sky, p: PlaceOf(s), first: civil(first), last: civil(last)}
	if len(f.Plans) == 0 {
		es, err := sky.entries(col, s, f.ID, f.Kinds)
		if err != nil {
			return nil, err
		}
		return sortEntries(es), nil
	}
	parsed, kinds, err := parsePlans(f.Plans)
	if err != nil {
		return nil, err
	}
	if err := col.prepare(append(altitudes(col.p.Observer, f.Kinds), altitudes(col.p.Observer, kinds)...)...); err != nil {
		return nil, err
	}
	es, err := sky.entries(col, s, f.ID, f.Kinds)
	if err != nil {
		return nil, err
	}
	pe, err := sky.planEntries(col, s, f.ID, parsed, kinds)
	if err != nil {
		return nil, err
	}
	return sortEntries2(es, pe), nil
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
	if err := col.prepare(altitudes(col.p.Observer, kinds)...); err != nil {
		return nil, err
	}
	es, err := sky.planEntries(col, s, feedID, parsed, kinds)
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

// planEntries writes the plans' entries for the collector's dates, unsorted.
func (sky *Sky) planEntries(col *collector, s *config.Site, feedID string, parsed []*plan, kinds []config.KindSpec) ([]Entry, error) {
	first, last := col.first, col.last
	col.spec, col.maxLit = config.KindSpec{}, 0
	w := entryWriter{feedID: feedID, site: newSiteInfo(s), seen: map[string]int{}, noted: map[string]bool{}, last: last}
	// the times of every kind the plans start or end at; an end may be on
	// the day after the last date
	next := &collector{ctx: col.ctx, sky: sky, p: col.p, first: last.AddDate(0, 0, 1), last: last.AddDate(0, 0, 1)}
	times := map[config.Kind]*kindTimes{}
	for _, ks := range kinds {
		if kt, ok, err := col.sunTimes(ks.Kind); err != nil {
			return nil, err
		} else if ok {
			times[ks.Kind] = kt
			continue
		}
		kt, err := col.kindTimes(ks.Kind, nil)
		if err != nil {
			return nil, err
		}
		if kt, err = next.kindTimes(ks.Kind, kt); err != nil {
			return nil, err
		}
		times[ks.Kind] = kt
	}
	for _, pl := range parsed {
		dates, err := sky.planDates(col.ctx, col.p, pl.rule, first, last)
		if err != nil {
			return nil, fmt.Errorf("plan %q: %w", pl.cfg.Title, err)
		}
		w.alarm = pl.alarm
		for _, pd := range dates {
			if pl.filter.Allows(pd.date) {
				w.plan(pl, pd, times)
			}
		}
	}
	return w.out, nil
}

// kindTimes are the events of one kind by local date, and its notes; for
// the Sun's rise, set, dawns and dusks, the crossings of its altitude,
// looked up by date.
type kindTimes struct {
	events map[time.Time]Event
	notes  map[time.Time]Note

	sun    *threshold
	dir    astro.Direction
	family string
	kind   config.Kind
	loc    *time.Location
}

// sunKinds are the kinds a plan time can follow straight from the Sun's
// crossings: direction and note family (see collector.add).
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

// sunTimes returns the kindTimes of a Sun kind from the collector's
// crossings (which cover two days beyond its dates); false for other kinds.
func (c *collector) sunTimes(k config.Kind) (*kindTimes, bool, error) {
	sk, ok := sunKinds[k.Name]
	if !ok {
		return nil, false, nil
	}
	alt := sk.alt
	if alt == 0 {
		alt = c.p.riseAlt()
	}
	th, err := c.threshold(alt)
	if err != nil {
		return nil, false, err
	}
	return &kindTimes{sun: th, dir: sk.dir, family: sk.family, kind: k, loc: c.p.Location}, true, nil
}

// at returns the instant of the kind on the local date d.
func (kt *kindTimes) at(d time.Time) (time.Time, bool) {
	if kt.sun == nil {
		e, ok := kt.events[d]
		return e.Start, ok
	}
	start, end := midnight(d, kt.loc), midnight(d.AddDate(0, 0, 1), kt.loc)
	xs := kt.sun.xs
	for i := sort.Search(len(xs), func(i int) bool { return !xs[i].Time.Before(start) }); i < len(xs) && xs[i].Time.Before(end); i++ {
		if xs[i].Direction == kt.dir {
			return xs[i].Time, true
		}
	}
	return time.Time{}, false
}

// note returns the note of a date without the kind's event, when there is one.
func (kt *kindTimes) note(d time.Time) (Note, bool) {
	if kt.sun == nil {
		n, ok := kt.notes[d]
		return n, ok
	}
	start, end := midnight(d, kt.loc), midnight(d.AddDate(0, 0, 1), kt.loc)
	xs := kt.sun.xs
	i := sort.Search(len(xs), func(i int) bool { return !xs[i].Time.Before(start) })
	if i < len(xs) && xs[i].Time.Before(end) {
		return Note{}, false // the Sun crosses the altitude, the other way
	}
	up := kt.sun.upFirst
	if i > 0 {
		up = xs[i-1].Direction == astro.Rising
	}
	state := astro.AlwaysBelow
	if up {
		state = astro.AlwaysAbove
	}
	return Note{Kind: kt.kind, Date: d, State: state, Family: kt.family}, true
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
	switch r.Type {
	case config.RuleEveryDay, config.RuleWeekly, config.RuleYearly, config.RuleOnce:
		for d := first; !d.After(last); d = d.AddDate(0, 0, 1) {
			ok := r.Type == config.RuleEveryDay ||
				(r.Type == config.RuleWeekly && d.Weekday() == r.Weekday) ||
				(r.Type == config.RuleYearly && d.Month() == r.Month && d.Day() == r.Day) ||
				(r.Type == config.RuleOnce && d.Equal(r.Date))
			if ok {
				out = append(out, planDate{date: d})
			}
		}
		return out, nil
	}
	c := &collector{ctx: ctx, sky: sky, p: p, first: first.AddDate(0, 0, -PlanMargin+1), last: last.AddDate(0, 0, PlanMargin-1)}
	if _, phase := phaseKinds[r.Event.Name]; phase || r.Event.Name == "moon-phases" {
		// the phases are the same for every site: found once per Sky, and
		// a date rule needs no illumination
		ps, err := sky.moonPhases()
		if err != nil {
			return nil, err
		}
		for _, ph := range ps {
			if name := phaseNames[ph.Kind]; r.Event.Name == name || r.Event.Name == "moon-phases" {
				if d := localDate(ph.Time, p.Location); c.inRange(d) {
					c.events = append(c.events, Event{Kind: config.Kind{Name: name}, Start: ph.Time, Date: d})
				}
			}
		}
	} else if err := c.add(r.Event); err != nil {
		return nil, err
	}
	slices.SortStableFunc(c.events, func(a, b Event) int { return a.Start.Compare(b.Start) })
	seen := map[time.Time]bool{}
	for i := range c.events {
		e := &c.events[i]
		d := e.Date
		if r.Type == config.RuleWeekdayOf {
			d = weekdayOf(d, r.Weekday, r.Relation)
		}
		if d.Before(first) || d.After(last) || seen[d] {
			continue
		}
		seen[d] = true
		out = append(out, planDate{date: d, anchor: e})
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

// plan writes the entry of one plan on one date.
func (w *entryWriter) plan(pl *plan, pd planDate, times map[config.Kind]*kindTimes) {
	loc := w.site.TimeZone.Location
	d := pd.date
	en := Entry{
		UID:        w.uid(KindPlan, pl.cfg.Title, pl.cfg.Date, d.Format(time.DateOnly)),
		Kind:       KindPlan,
		Title:      pl.cfg.Title,
		Categories: []string{"Plan"},
		Date:       d,
		Alarm:      w.alarm,
	}
	var b strings.Builder
	if pl.cfg.Description != "" {
		b.WriteString(strings.TrimSpace(pl.cfg.Description) + "\n")
	}
	if pd.anchor != nil {
		fmt.Fprintf(&b, "Date: %s (%s %s).\n", ruleText(pl.rule), inText(pd.anchor.Kind), pd.anchor.Start.In(loc).Format("Mon 2 Jan 2006 15:04 MST"))
	}
	allDay := func() {
		en.AllDay, en.Start, en.End = true, d, d.AddDate(0, 0, 1)
	}
	if pl.start == nil {
		allDay()
		b.WriteString("All day at " + w.site.where + ".")
		en.Description = b.String()
		w.out = append(w.out, en)
		return
	}
	start, ok := planTime(*pl.start, d, loc, times)
	if !ok {
		// the start event does not happen on this date: say so, no time
		allDay()
		name := inText(pl.start.Event)
		en.Title = fmt.Sprintf("%s: no %s today", pl.cfg.Title, name)
		en.Facts.Missing = pl.start.Event.String()
		fmt.Fprintf(&b, "No time today: the start, %s, does not happen on %s", name, d.Format("Monday 2 January 2006"))
		if n, ok := times[pl.start.Event].note(d); ok {
			t, _ := describeNote(w.site, n)
			b.WriteString(" (" + t + ")")
		}
		b.WriteString(" at " + w.site.where + ".")
		en.Description = b.String()
		w.out = append(w.out, en)
		return
	}
	en.Start = start
	fmt.Fprintf(&b, "From %s%s", localClock(start, loc), timeWords(*pl.start))
	b.WriteString(skippedClock(*pl.start, start, loc))
	switch {
	case pl.end != nil:
		end, ok := planTime(*pl.end, d, loc, times)
		if ok && !end.After(start) {
			end, ok = planTime(*pl.end, d.AddDate(0, 0, 1), loc, times)
		}
		if !ok {
			fmt.Fprintf(&b, "; no %s that day or the next to end it", inText(pl.end.Event))
			break
		}
		en.End = end
	case pl.cfg.For > 0:
		en.End = start.Add(pl.cfg.For.D())
	}
	if !en.End.IsZero() {
		fmt.Fprintf(&b, " to %s", localClock(en.End, loc))
		if pl.end != nil {
			b.WriteString(timeWords(*pl.end))
			b.WriteString(skippedClock(*pl.end, en.End, loc))
		}
		if ed := localDate(en.End, loc); ed.After(d) {
			en.Facts.NextDay = true
			fmt.Fprintf(&b, " the next day (%s)", ed.Format("Mon 2 Jan"))
		}
	}
	b.WriteString(" at " + w.site.where + ".\n" + cautionLegal)
	en.Description = b.String()
	w.out = append(w.out, en)
}

// planTime is the instant of a plan time on the local date d: the clock
// time, or the event of that date with its offset; false when the event
// does not happen on d.
func planTime(ts config.TimeSpec, d time.Time, loc *time.Location, times map[config.Kind]*kindTimes) (time.Time, bool) {
	if ts.IsClock {
		return clockOn(d, ts.Clock, loc), true
	}
	t, ok := times[ts.Event].at(d)
	if !ok {
		return time.Time{}, false
	}
	return t.Add(ts.Offset), true
}

// skippedClock says why a clock time of a plan is shown later than written:
// the local clock skips it on that date (clocks set forward, as for summer
// time), so clockOn moved it by the jump. It is "" otherwise.
func skippedClock(ts config.TimeSpec, t time.Time, loc *time.Location) string {
	if !ts.IsClock {
		return ""
	}
	lt := t.In(loc)
	shown := time.Duration(lt.Hour())*time.Hour + time.Duration(lt.Minute())*time.Minute
	if shown == ts.Clock {
		return ""
	}
	moved := (shown - ts.Clock + 24*time.Hour) % (24 * time.Hour)
	why := "the clocks go forward"
	if lt.IsDST() {
		why = "the clocks go forward for summer time"
	}
	written := fmt.Sprintf("%02d:%02d", int(ts.Clock/time.Hour), int(ts.Clock%time.Hour/time.Minute))
	return fmt.Sprintf(" (moved from %s, which the clocks skip on %s: %s by %s)", written,
		lt.Format("Mon 2 Jan 2006"), why, amount(moved))
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
	return strings.ToLower(n[:1]) + n[1:]
}

// plainName is a kind's name in words: "New moon", "Sunset", "Day length 12 h".
func plainName(k config.Kind) string {
	if n, ok := plainNames[k.Name]; ok {
		return n
	}
	if k.Name == config.KindPhotoperiod {
		return "day length crossing " + amount(k.DayLength)
	}
	return k.String()
}

// ruleText says a date rule in words: "the Saturday nearest the new moon".
func ruleText(r config.DateRule) string {
	ev := inText(r.Event)
	switch r.Type {
	case config.RuleWeekdayOf:
		return fmt.Sprintf("the %s %s the %s", r.Weekday, r.Relation, ev)
	case config.RuleEvent:
		return "the date of the " + ev
	}
	return ""
}

// moonPhases returns the Moon's phases over the Sky's dates, found once.
func (sky *Sky) moonPhases() ([]astro.Phase, error) {
	sky.phaseOnce.Do(func() {
		sky.phaseList, sky.phaseErr = astro.MoonPhases(sky.from, sky.to)
	})
	return sky.phaseList, sky.phaseErr
}

// sortEntries2 is sortEntries of the entries of a and b together, without
// first copying them into one slice.
func sortEntries2(a, b []Entry) []Entry {
	n := len(a)
	at := func(i int32) *Entry {
		if int(i) < n {
			return &a[i]
		}
		return &b[int(i)-n]
	}
	idx := make([]int32, n+len(b))
	for i := range idx {
		idx[i] = int32(i)
	}
	slices.SortFunc(idx, func(i, j int32) int {
		x, y := at(i), at(j)
		if c := x.Start.Compare(y.Start); c != 0 {
			return c
		}
		return strings.Compare(x.UID, y.UID)
	})
	out := make([]Entry, len(idx))
	for i, j := range idx {
		out[i] = *at(j)
	}
	return out
}

// clockOn is the instant the local clock shows clock (since midnight) on
// the local date d. A clock time skipped by a change to summer time is
// taken as that long after the last instant before the change, as clocks
// that are set forward show it (00:30 on a night that jumps from 00:00 to
// 01:00 is 01:30); Go's time.Date may instead give the previous evening.
func clockOn(d time.Time, clock time.Duration, loc *time.Location) time.Time {
	h, m := int(clock/time.Hour), int(clock%time.Hour/time.Minute)
	t := time.Date(d.Year(), d.Month(), d.Day(), h, m, 0, 0, loc)
	if lt := t.In(loc); lt.Hour() == h && lt.Minute() == m && lt.Day() == d.Day() {
		return t
	}
	wall := time.Date(d.Year(), d.Month(), d.Day(), h, m, 0, 0, time.UTC)
	best := t
	for _, probe := range []time.Time{t.Add(-6 * time.Hour), t, t.Add(6 * time.Hour)} {
		_, off := probe.In(loc).Zone()
		u := wall.Add(-time.Duration(off) * time.Second)
		if localDate(u, loc).Equal(civil(d)) && (!localDate(best, loc).Equal(civil(d)) || u.After(best)) {
			best = u
		}
	}
	return best
}
