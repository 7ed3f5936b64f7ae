package astro

import (
	"context"
	"fmt"
	"time"
)

// Local dates. The per-date searches (SunDays, MoonDays, DarkWindows) step
// through the calendar by year, month and day, never by adding hours to a
// local time: in a zone whose clocks jump forward at midnight (America/
// Havana on 2026-03-08, America/Santiago, Atlantic/Azores) the wall time
// 00:00 does not exist, and a date begins at the instant of the jump
// (01:00). A date that does not exist at all in a zone (Pacific/Apia skipped
// 2011-12-30) has no instant and is left out. Every loop is bounded by the
// number of calendar dates asked for and checks its context.

// DateStart returns the first instant of the local date y-m-d in loc: its
// local midnight, or, when the clocks jump over midnight, the instant of the
// jump. When the clocks go back over midnight it is the first of the two
// midnights. Like time.Date, it panics when loc is nil.
func DateStart(loc *time.Location, y int, m time.Month, d int) time.Time {
	return wallStart(loc, y, m, d, 0)
}

// wallStart returns the first instant at which the local clock in loc
// reads y-m-d hour:00 or later (and stays on that date or later).
func wallStart(loc *time.Location, y int, m time.Month, d, hour int) time.Time {
	want := time.Date(y, m, d, hour, 0, 0, 0, time.UTC)
	t := time.Date(y, m, d, hour, 0, 0, 0, loc)
	zs, ze := t.ZoneBounds()
	switch w := wallClock(t); {
	case w.Before(want):
		// The wall time was skipped and t reads the clock just before the
		// jump: the wanted time begins at the jump, the end of t's zone.
		if !ze.IsZero() {
			return ze
		}
	case w.After(want):
		// Skipped, and t is after the jump: the jump is the start of t's zone.
		if !zs.IsZero() {
			return zs
		}
	default:
		// Clocks that went back read the wall time twice: take the first.
		if !zs.IsZero() {
			_, off := zs.Add(-time.Nanosecond).Zone()
			c := want.Add(-time.Duration(off) * time.Second).In(loc)
			if c.Before(zs) && wallClock(c).Equal(want) {
				return c
			}
		}
	}
	return t
}

// wallClock returns the local date and clock of t as the same reading in
// UTC, so wall times can be compared.
func wallClock(t time.Time) time.Time {
	y, m, d := t.Date()
	hh, mm, ss := t.Clock()
	return time.Date(y, m, d, hh, mm, ss, t.Nanosecond(), time.UTC)
}

// dateSpan is one local date: its civil date (00:00 UTC) and the instants
// [start, end) at which it begins and the next date begins (at midnight, or
// at noon for nights), in the zone asked for.
type dateSpan struct {
	date       time.Time
	start, end time.Time
}

// maxDates bounds the dates one call can ask for: every date of the
// supported range, with a margin.
var maxDates = int(maxTime.Sub(minTime).Hours()/24) + 8

// localDays returns the spans of the local dates first..last inclusive
// (dates read in loc; the clock part is ignored), each running from hour:00
// local time of the date to hour:00 of the next (or the first instant after,
// where that wall time is skipped). A date that does not exist in loc is
// left out; with hour > 0 the date before it runs to hour:00 of the date
// after it. what names the calling function in errors. The loop runs once
// per calendar date and stops with ctx's error when ctx is done.
func localDays(ctx context.Context, what string, loc *time.Location, first, last time.Time, hour int) ([]dateSpan, error) {
	if loc == nil {
		return nil, invalidf("astro: %s: nil location", what)
	}
	fy, fm, fd := first.In(loc).Date()
	ly, lm, ld := last.In(loc).Date()
	d0 := time.Date(fy, fm, fd, 0, 0, 0, 0, time.UTC)
	d1 := time.Date(ly, lm, ld, 0, 0, 0, 0, time.UTC)
	if d1.Before(d0) {
		return nil, invalidf("astro: %s: last date %s is before the first %s", what,
			d1.Format(time.DateOnly), d0.Format(time.DateOnly))
	}
	n := int(d1.Sub(d0).Hours()/24) + 1 // UTC has no clock changes: exact
	if n > maxDates {
		return nil, &RangeError{What: what + " dates", Value: fmt.Sprintf("%s..%s", d0.Format(time.DateOnly), d1.Format(time.DateOnly)),
			Min: minTime.Format(time.DateOnly), Max: maxTime.AddDate(0, 0, -1).Format(time.DateOnly)}
	}
	out := make([]dateSpan, 0, n)
	start := wallStart(loc, fy, fm, fd, hour)
	for k := range n {
		if k%64 == 0 {
			if err := ctx.Err(); err != nil {
				return nil, err
			}
		}
		date := d0.AddDate(0, 0, k)
		after := date.AddDate(0, 0, 1)
		if hour != 0 && !dateExists(loc, after) {
			// the clocks jump over the whole next date: the night runs
			// to noon of the date after it (Pacific/Apia's night of 29
			// December 2011 ends at noon on the 31st, not at the jump)
			after = after.AddDate(0, 0, 1)
		}
		y, m, d := after.Date()
		next := wallStart(loc, y, m, d, hour)
		if next.After(start) && (hour == 0 || dateExists(loc, date)) {
			out = append(out, dateSpan{date: date, start: start.In(loc), end: next.In(loc)})
			start = next
		}
	}
	return out, nil
}

// dateExists reports whether the civil date (00:00 UTC) has any instant in
// loc.
func dateExists(loc *time.Location, date time.Time) bool {
	y, m, d := date.Date()
	return DateStart(loc, y, m, d+1).After(DateStart(loc, y, m, d))
}

// crossingDays is the shared body of the per-date searches (SunDays,
// MoonDays, MoonSkylineDays): it checks the dates and the observer, finds
// the crossings over the whole span of the local dates first..last with
// find, and groups them by date with groupDays; up says whether the body is
// above its threshold at sec, for a date without a crossing.
func crossingDays(ctx context.Context, what string, o Observer, loc *time.Location, first, last time.Time,
	find func(from, to time.Time) ([]Crossing, error), up func(st *site, sec float64) bool) ([]Day, error) {
	spans, err := localDays(ctx, what, loc, first, last, 0)
	if err != nil {
		return nil, err
	}
	if err := o.Validate(); err != nil {
		return nil, err
	}
	if len(spans) == 0 {
		return nil, nil
	}
	cs, err := find(spans[0].start, spans[len(spans)-1].end)
	if err != nil {
		return nil, err
	}
	st := newSite(o)
	return groupDays(ctx, spans, cs, func(sec float64) bool { return up(st, sec) })
}

// groupDays sorts the crossings cs (in order, covering the spans) into one
// Day per date span. A date without a crossing gets AlwaysAbove or
// AlwaysBelow from above(t), asked at the middle of the date. Shared by the
// Sun's and the Moon's daily searches.
func groupDays(ctx context.Context, spans []dateSpan, cs []Crossing, above func(sec float64) bool) ([]Day, error) {
	days := make([]Day, 0, len(spans))
	i := 0
	for k, sp := range spans {
		if k%64 == 0 {
			if err := ctx.Err(); err != nil {
				return nil, err
			}
		}
		for ; i < len(cs) && cs[i].Time.Before(sp.start); i++ {
		}
		dd := Day{Date: sp.start}
		for ; i < len(cs) && cs[i].Time.Before(sp.end); i++ {
			if cs[i].Direction == Rising {
				dd.Rising = append(dd.Rising, cs[i].Time)
			} else {
				dd.Setting = append(dd.Setting, cs[i].Time)
			}
		}
		if len(dd.Rising)+len(dd.Setting) == 0 {
			dd.State = AlwaysBelow
			if above(0.5 * (unixSeconds(sp.start) + unixSeconds(sp.end))) {
				dd.State = AlwaysAbove
			}
		}
		days = append(days, dd)
	}
	return days, nil
}
