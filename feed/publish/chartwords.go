package publish

import (
	"fmt"
	"slices"
	"time"

	"heliocal/feed"
)

// period is a stretch of the local clock, From to To, as a local date and
// clock time written in UTC (the way the chart's dates are): a lamp period
// or a dark window joined again across midnight.
type period struct{ From, To time.Time }

// periods joins the pieces of spans (each within one local date) into
// whole periods: a piece to midnight and the next date's piece from
// midnight are one period, as a dark window from 21:40 to 04:10 is.
func periods(ss []ClockSpan) []period {
	var ps []period
	for _, s := range ss {
		if s.To > s.From {
			ps = append(ps, period{s.Date.Add(s.From), s.Date.Add(s.To)})
		}
	}
	slices.SortFunc(ps, func(a, b period) int { return a.From.Compare(b.From) })
	var out []period
	for _, p := range ps {
		if n := len(out); n > 0 && !p.From.After(out[n-1].To) {
			if p.To.After(out[n-1].To) {
				out[n-1].To = p.To
			}
			continue
		}
		out = append(out, p)
	}
	return out
}

// dateOf is the local date of a clock time written in UTC, at 00:00.
func dateOf(t time.Time) time.Time { return t.Truncate(24 * time.Hour) }

// nightOf is the date of the evening a period belongs to: a dark window
// that begins after midnight and before noon is part of the night that
// began the evening before.
func nightOf(p period) time.Time {
	d := dateOf(p.From)
	if p.From.Sub(d) < 12*time.Hour {
		d = d.AddDate(0, 0, -1)
	}
	return d
}

// seasonGap is the shortest stretch without a period that parts two
// seasons of them in words; shorter gaps (the weeks around a full Moon, a
// feed's weekdays) leave one season.
const seasonGap = 28 * 24 * time.Hour

// seasons writes the dates (sorted, distinct) as their stretches, each
// "from 5 Dec to 10 Feb", parted where seasonGap or more have none.
func seasons(dates []time.Time, first, last time.Time) string {
	var parts []string
	start := 0
	for i := 1; i <= len(dates); i++ {
		if i < len(dates) && dates[i].Sub(dates[i-1]) < seasonGap {
			continue
		}
		a, b := stretchDates(dates[start], dates[i-1], first, last)
		if a == b {
			parts = append(parts, "on "+a)
		} else {
			parts = append(parts, "from "+a+" to "+b)
		}
		start = i
	}
	return feed.AndList(parts)
}

// spanWords says in words when lamp periods (lamps) or dark windows (not
// lamps) fall from the date from on (today; for dark windows, from
// today's evening), in a chart of first..last: on how many days (nights,
// for dark windows), in which seasons, and the longest. Empty when there
// are none at all; when none are from from on, it says so.
func spanWords(ss []ClockSpan, lamps bool, from, first, last time.Time) string {
	if len(ss) == 0 {
		return ""
	}
	what, unit, units := "Dark windows", "night", "nights"
	if lamps {
		what, unit, units = "Lamp periods", "day", "days"
	}
	var ahead []period
	for _, p := range periods(ss) {
		switch {
		case !lamps && nightOf(p).Before(from): // the night before today
			continue
		case !p.To.After(from):
			continue
		case p.From.Before(from):
			p.From = from
		}
		ahead = append(ahead, p)
	}
	if len(ahead) == 0 {
		return "No " + feed.Small(what) + " from today on."
	}
	var dates []time.Time
	longest := ahead[0]
	for _, p := range ahead {
		if p.To.Sub(p.From) > longest.To.Sub(longest.From) {
			longest = p
		}
		if lamps {
			dates = append(dates, dateOf(p.From))
		} else {
			dates = append(dates, nightOf(p))
		}
	}
	slices.SortFunc(dates, func(a, b time.Time) int { return a.Compare(b) })
	dates = slices.Compact(dates)
	when := "on " + chartDate(dateOf(longest.From), first, last)
	if !lamps {
		when = "the night of " + chartDate(nightOf(longest), first, last)
	}
	return fmt.Sprintf("%s on %d %s, %s; the longest %s (%s).", what, len(dates), plural(len(dates), unit, units),
		seasons(dates, first, last), feed.Length(longest.To.Sub(longest.From), time.Minute), when)
}
