package feed

import (
	"context"
	"fmt"
	"slices"
	"strings"
	"time"

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

// PlanEntries computes the entries of a feed's plans on the local dates
// first..last, sorted by Start then UID. The Sky must cover PlanMargin days
// beyond the window (NewCatalogue sees to it).
func (sky *Sky) PlanEntries(ctx context.Context, s *config.Site, feedID string, plans []config.Plan, first, last time.Time) ([]Entry, error) {
	first, last = civil(first), civil(last)
	p := PlaceOf(s)
	w := entryWriter{feedID: feedID, site: newSiteInfo(s), seen: map[string]int{}, noted: map[string]bool{}, last: last}
	times := map[config.Kind]*kindTimes{}
	for i := range plans {
		pl, err := parsePlan(&plans[i])
		if err != nil {
			return nil, err
		}
		dates, err := sky.planDates(ctx, p, pl.rule, first, last)
		if err != nil {
			return nil, fmt.Errorf("plan %q: %w", pl.cfg.Title, err)
		}
		for _, spec := range []*config.TimeSpec{pl.start, pl.end} {
			if spec == nil || spec.IsClock || times[spec.Event] != nil {
				continue
			}
			kt, err := sky.kindTimes(ctx, p, spec.Event, first, last.AddDate(0, 0, 1))
			if err != nil {
				return nil, fmt.Errorf("plan %q: %w", pl.cfg.Title, err)
			}
			times[spec.Event] = kt
		}
		w.alarm = pl.alarm
		for _, pd := range dates {
			if pl.filter.Allows(pd.date) {
				w.plan(pl, pd, times)
			}
		}
	}
	return sortEntries(w.out), nil
}

// kindTimes are the events of one kind by local date, and its notes.
type kindTimes struct {
	events map[time.Time]Event
	notes  map[time.Time]Note
}

func (sky *Sky) kindTimes(ctx context.Context, p Place, k config.Kind, first, last time.Time) (*kindTimes, error) {
	c := &collector{ctx: ctx, sky: sky, p: p, first: first, last: last}
	if err := c.add(k); err != nil {
		return nil, err
	}
	kt := &kindTimes{events: map[time.Time]Event{}, notes: map[time.Time]Note{}}
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
	if err := c.add(r.Event); err != nil {
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
		if n, ok := times[pl.start.Event].notes[d]; ok {
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
		return time.Date(d.Year(), d.Month(), d.Day(), int(ts.Clock/time.Hour), int(ts.Clock%time.Hour/time.Minute), 0, 0, loc), true
	}
	e, ok := times[ts.Event].events[d]
	if !ok {
		return time.Time{}, false
	}
	return e.Start.Add(ts.Offset), true
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

// MergeEntries merges two lists sorted by Start then UID into one.
func MergeEntries(a, b []Entry) []Entry {
	if len(b) == 0 {
		return a
	}
	out := make([]Entry, 0, len(a)+len(b))
	i, j := 0, 0
	for i < len(a) && j < len(b) {
		c := a[i].Start.Compare(b[j].Start)
		if c == 0 {
			c = strings.Compare(a[i].UID, b[j].UID)
		}
		if c <= 0 {
			out = append(out, a[i])
			i++
		} else {
			out = append(out, b[j])
			j++
		}
	}
	out = append(out, a[i:]...)
	return append(out, b[j:]...)
}
