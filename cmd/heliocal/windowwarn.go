package main

import (
	"fmt"
	"strings"
	"time"

	"heliocal/config"
	"heliocal/feed"
)

// planRules are the date rules of plans, read once for check's warnings:
// a rule that does not parse (config.Validate refuses it) is the zero
// DateRule, of no type a warning looks for.
func planRules(plans []config.Plan) []config.DateRule {
	rules := make([]config.DateRule, len(plans))
	for i, p := range plans {
		rules[i], _ = config.ParseDateRule(p.Date)
	}
	return rules
}

// datesOutsideWindow words the dates that the entries of feed f name one by
// one (a kinds entry's dates list, a plan's one date) and that lie outside
// the feed's window as cal was built for it: a date before the window's
// start is never published (a warning); one after its end is published
// once the window, which rolls with each day, reaches it, days_ahead days
// before it (a note: next year's wedding dates are listed ahead). shown are
// the kinds entries as check's table writes them, listed the dates each
// lists (config.ListedDates), rules the plans' date rules (planRules).
// One line per date and side, naming every entry that lists the date; a
// date the entry's own months or weekdays leave out is not named here:
// datesFilteredOut and planDatesFilteredOut say it is never published.
func datesOutsideWindow(f *config.Feed, shown []string, listed [][]time.Time, rules []config.DateRule, cal *feed.Calendar) (warnings, notes []string) {
	first, last := cal.FirstDate(), cal.LastDate
	var order []time.Time             // the dates outside, in the order first named
	named := map[time.Time][]string{} // the entries naming each
	add := func(entry string, d time.Time) {
		if !d.Before(first) && !d.After(last) {
			return
		}
		if _, ok := named[d]; !ok {
			order = append(order, d)
		}
		named[d] = append(named[d], entry)
	}
	for i, dates := range listed {
		kept := config.NewDateFilter(f.Kinds[i].Weekdays, f.Kinds[i].Months, nil)
		for _, d := range dates {
			if kept.Allows(d) {
				add(shown[i], d)
			}
		}
	}
	for i, p := range f.Plans {
		if r := rules[i]; r.Type == config.RuleOnce && p.Filter().Allows(r.Date) {
			add(fmt.Sprintf("plan %q", p.Title), r.Date)
		}
	}
	for _, d := range order {
		entries := feed.AndList(named[d])
		if d.Before(first) {
			warnings = append(warnings, fmt.Sprintf("feed %q: %s: %s is before the window's start %s (days_back: %d): it will never be published",
				f.ID, entries, d.Format(time.DateOnly), first.Format(time.DateOnly), f.DaysBack))
			continue
		}
		notes = append(notes, fmt.Sprintf("feed %q: %s: %s is after the window's end %s (days_ahead: %d): it will be published from %s, when the window reaches it",
			f.ID, entries, d.Format(time.DateOnly), last.Format(time.DateOnly), f.DaysAhead, d.AddDate(0, 0, -f.DaysAhead).Format(time.DateOnly)))
	}
	return warnings, notes
}

// datesFilteredOut words the dates that a kinds entry of feed f lists
// (listed, as datesOutsideWindow has them) and that the same entry's months
// or weekdays leave out, so that it never keeps them: one line per date and
// filter, naming together the entries that list the date and leave it out
// by the same filter (kinds sharing one dates list, a YAML anchor). shown
// are the kinds entries as check's table writes them.
func datesFilteredOut(f *config.Feed, shown []string, listed [][]time.Time) []string {
	var order []string             // the reasons, in the order first given
	named := map[string][]string{} // the entries of each
	for i, k := range f.Kinds {
		for _, d := range listed[i] {
			for _, why := range leftOutWhy(d, k.Months, k.Weekdays) {
				if _, ok := named[why]; !ok {
					order = append(order, why)
				}
				named[why] = append(named[why], shown[i])
			}
		}
	}
	out := make([]string, len(order))
	for i, why := range order {
		out[i] = fmt.Sprintf("feed %q: %s: %s", f.ID, feed.AndList(named[why]), why)
	}
	return out
}

// dateLeftOut words the date d that an entry of feed feedID names and that
// its own months or weekdays leave out: one line per filter.
func dateLeftOut(feedID, entry string, d time.Time, months, weekdays []string) []string {
	var out []string
	for _, why := range leftOutWhy(d, months, weekdays) {
		out = append(out, fmt.Sprintf("feed %q: %s: %s", feedID, entry, why))
	}
	return out
}

// leftOutWhy says why the months or weekdays leave out the date d, one
// reason per filter: "2027-06-12 is a Saturday, not in its weekdays (sun):
// it will never be published".
func leftOutWhy(d time.Time, months, weekdays []string) []string {
	var out []string
	if !config.NewDateFilter(nil, months, nil).Allows(d) {
		out = append(out, fmt.Sprintf("%s is in %s, not in its months (%s): it will never be published",
			d.Format(time.DateOnly), d.Month(), strings.Join(months, ", ")))
	}
	if !config.NewDateFilter(weekdays, nil, nil).Allows(d) {
		out = append(out, fmt.Sprintf("%s is a %s, not in its weekdays (%s): it will never be published",
			d.Format(time.DateOnly), d.Weekday(), strings.Join(weekdays, ", ")))
	}
	return out
}

// planDatesFilteredOut words the plans of feed f whose date rule names only
// dates that the plan's own months or weekdays leave out, so that it is
// never published: one date ("2027-06-12") in another month or on another
// day of the week, a weekday rule ("every friday", "saturday nearest
// new-moon") on a day its weekdays leave out, a yearly date ("every 04-25")
// in a month its months leave out. One line per plan and filter. rules
// are the plans' date rules (planRules).
func planDatesFilteredOut(f *config.Feed, rules []config.DateRule) []string {
	var out []string
	for i, p := range f.Plans {
		r := rules[i]
		entry := fmt.Sprintf("plan %q", p.Title)
		switch r.Type {
		case config.RuleOnce:
			out = append(out, dateLeftOut(f.ID, entry, r.Date, p.Months, p.Weekdays)...)
		case config.RuleWeekly, config.RuleWeekdayOf:
			if !config.NewDateFilter(p.Weekdays, nil, nil).Allows(dateOnWeekday(r.Weekday)) {
				out = append(out, fmt.Sprintf("feed %q: %s: its dates (%s) are %ss, not in its weekdays (%s): it will never be published",
					f.ID, entry, p.Date, r.Weekday, strings.Join(p.Weekdays, ", ")))
			}
		case config.RuleYearly:
			if !config.NewDateFilter(nil, p.Months, nil).Allows(time.Date(2000, r.Month, 1, 0, 0, 0, 0, time.UTC)) {
				out = append(out, fmt.Sprintf("feed %q: %s: its dates (%s) are in %s, not in its months (%s): it will never be published",
					f.ID, entry, p.Date, r.Month, strings.Join(p.Months, ", ")))
			}
		}
	}
	return out
}

// dateOnWeekday is a date that is a wd: in the week of Sunday 2 January
// 2000.
func dateOnWeekday(wd time.Weekday) time.Time {
	return time.Date(2000, 1, 2+int(wd), 0, 0, 0, 0, time.UTC)
}
