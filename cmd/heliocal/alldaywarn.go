package main

import (
	"fmt"
	"slices"
	"strings"
	"time"

	"heliocal/config"
	"heliocal/feed"
)

// allDayWarnings words the options of feed f that an all-day entry makes
// do nothing, and that the configuration may still hold: an alarm on a
// kinds entry whose entries are all-day (daily-summary, photoperiod, or
// all_day: true) or on a plan without a start, all-day too, for a calendar
// sets no reminder before an all-day entry (see ical's entryAlarm); and
// all_day: true on a kind whose entries are all-day already; and the
// feed's own alarm when it gives no reminder (feedAlarmWarning). shown are
// the kinds entries as check's table writes them.
func allDayWarnings(f *config.Feed, shown []string) []string {
	var out []string
	if w := feedAlarmWarning(f, shown); w != "" {
		out = append(out, w)
	}
	for i, k := range f.Kinds {
		if !entriesAllDay(k) {
			continue
		}
		if k.Alarm != nil && k.Alarm.D() > 0 {
			why := "its entries are all-day"
			if k.AllDay && !k.Kind.IsAllDay() {
				why = "all_day: true makes its entries all-day"
			}
			out = append(out, fmt.Sprintf("feed %q: %s: alarm %s gives no reminder: %s, and reminders are set before timed entries only",
				f.ID, shown[i], k.Alarm, why))
		}
		if k.AllDay && k.Kind.IsAllDay() {
			out = append(out, fmt.Sprintf("feed %q: %s: all_day: true changes nothing: its entries are all-day already", f.ID, shown[i]))
		}
	}
	for _, p := range f.Plans {
		if p.Start == "" && p.Alarm != nil && p.Alarm.D() > 0 {
			out = append(out, fmt.Sprintf("feed %q: plan %q: alarm %s gives no reminder: a plan without start is all-day, and reminders are set before timed entries only",
				f.ID, p.Title, p.Alarm))
		}
	}
	return out
}

// feedAlarmWarning words the alarm of feed f when it sets no reminder at
// all, though the feed has entries: none of them is timed (a reminder is
// set before a timed entry only), or each kinds entry and plan whose
// entries are timed turns it off with alarm: 0s. Someone who wrote the
// feed's alarm expects reminders; timed entries that set alarms of their
// own give them, and no warning. "" when there is nothing to warn of.
// shown are the kinds entries as check's table writes them.
func feedAlarmWarning(f *config.Feed, shown []string) string {
	if f.Alarm.D() <= 0 || len(f.Kinds)+len(f.Plans) == 0 {
		return ""
	}
	var off []string // the timed entries that turn it off, as check names them
	remind := func(a *config.Duration, name string) bool {
		if a == nil || a.D() > 0 { // the feed's alarm, or one of its own
			return true
		}
		off = append(off, name)
		return false
	}
	for i, k := range f.Kinds {
		if !entriesAllDay(k) && remind(k.Alarm, shown[i]) {
			return ""
		}
	}
	for _, p := range f.Plans {
		if p.Start != "" && remind(p.Alarm, fmt.Sprintf("plan %q", p.Title)) {
			return ""
		}
	}
	if len(off) == 0 {
		return fmt.Sprintf("feed %q: alarm %s gives no reminder: every entry of the feed is all-day, and reminders are set before timed entries only",
			f.ID, f.Alarm)
	}
	verb := "turns"
	if len(off) > 1 {
		verb = "turn"
	}
	rest := ""
	if len(off) < len(f.Kinds)+len(f.Plans) {
		rest = ", and the feed's other entries are all-day, which take no reminder"
	}
	return fmt.Sprintf("feed %q: alarm %s gives no reminder: %s %s it off with alarm: 0s%s",
		f.ID, f.Alarm, feed.AndList(off), verb, rest)
}

// entriesAllDay reports whether the entries of kinds entry k are all-day:
// by its kind (daily-summary, photoperiod) or by all_day: true.
func entriesAllDay(k config.KindSpec) bool { return k.AllDay || k.Kind.IsAllDay() }

// leapDayWarnings words the plans of feed f on 29 February ("every
// 02-29") whose window, as cal was built for it, holds no 29 February: the
// feed shows nothing for them until the window, which rolls with each day,
// reaches the next one, days_ahead days before it. A plan whose months
// leave February out is planDatesFilteredOut's. rules are the plans' date
// rules (planRules).
func leapDayWarnings(f *config.Feed, rules []config.DateRule, cal *feed.Calendar) []string {
	first, last := cal.FirstDate(), cal.LastDate
	var out []string
	for i, p := range f.Plans {
		if r := rules[i]; r.Type != config.RuleYearly || r.Month != time.February || r.Day != 29 ||
			!config.NewDateFilter(nil, p.Months, nil).Allows(time.Date(2000, time.February, 1, 0, 0, 0, 0, time.UTC)) {
			continue
		}
		next := nextLeapDay(first)
		if !next.After(last) {
			continue
		}
		out = append(out, fmt.Sprintf("feed %q: plan %q: its dates (%s) are in leap years only, and the window %s..%s holds no 29 February: no entry falls in it; the next, %s, is published from %s, when the window reaches it",
			f.ID, p.Title, p.Date, first.Format(time.DateOnly), last.Format(time.DateOnly), next.Format(time.DateOnly),
			next.AddDate(0, 0, -f.DaysAhead).Format(time.DateOnly)))
	}
	return out
}

// nextLeapDay is the first 29 February on or after the date d.
func nextLeapDay(d time.Time) time.Time {
	for y := d.Year(); ; y++ {
		if l := time.Date(y, time.February, 29, 0, 0, 0, 0, time.UTC); l.Day() == 29 && !l.Before(d) {
			return l
		}
	}
}

// eventPlanWarnings warns of a plan whose date is set by an event of the
// sky ("photoperiod:20h", "full-moon") that no date of the window has: the
// feed holds nothing for it, as a kinds entry's threshold never crossed is
// warned of (Calendar.NotCrossed). Plans on listed, weekly or yearly dates
// have their own warnings. rules are the plans' date rules (planRules).
func eventPlanWarnings(f *config.Feed, rules []config.DateRule, cal *feed.Calendar) []string {
	var out []string
	for i, p := range f.Plans {
		if rules[i].Type != config.RuleEvent {
			continue
		}
		if slices.ContainsFunc(cal.Entries, func(e feed.Entry) bool { return e.Kind == feed.KindPlan && e.Title == p.Title }) {
			continue
		}
		out = append(out, fmt.Sprintf("feed %q: plan %q: no date of the window %s..%s has its date (%s)%s: the feed holds no entry for it",
			f.ID, p.Title, cal.FirstDate().Format(time.DateOnly), cal.LastDate.Format(time.DateOnly), p.Date, filterWords(p)))
	}
	return out
}

// filterWords names a plan's months and weekdays, which may be what leaves
// its dates out: " within its months jun, jul"; "" when it has neither.
func filterWords(p config.Plan) string {
	var parts []string
	if len(p.Months) > 0 {
		parts = append(parts, "months "+strings.Join(p.Months, ", "))
	}
	if len(p.Weekdays) > 0 {
		parts = append(parts, "weekdays "+strings.Join(p.Weekdays, ", "))
	}
	if len(parts) == 0 {
		return ""
	}
	return " within its " + strings.Join(parts, " and ")
}

// skippedPlanNotes notes, one line per plan of feed f, the dates of its
// plans in cal's window that the clocks of the site's zone skip whole
// (Calendar.SkippedPlans): such a date does not exist, and the plan has no
// entry on it, as docs/configuration.md says. check and events --feed
// write them.
func skippedPlanNotes(f *config.Feed, cal *feed.Calendar) []string {
	var out []string
	for _, p := range cal.SkippedPlans {
		dates := make([]string, len(p.Dates))
		for i, d := range p.Dates {
			dates[i] = d.Format("2006-01-02 (Mon)")
		}
		list, verb, it := dates[0], "does", "that date"
		if n := len(dates); n > 1 {
			list, verb, it = strings.Join(dates[:n-1], ", ")+" and "+dates[n-1], "do", "those dates"
		}
		out = append(out, fmt.Sprintf("feed %q: plan %q (%s): %s %s not exist in %s, whose clocks skip %s whole: the plan has no entry there",
			f.ID, p.Title, p.Date, list, verb, cal.Site.Location, it))
	}
	return out
}
