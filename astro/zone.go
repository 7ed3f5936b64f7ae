package astro

import (
	"iter"
	"time"
)

// ZonePeriod returns the period of t's zone (t.Location()) that holds t, as
// time.Time.ZoneBounds gives it (zero: unbounded), but with an end after t.
// Past the zone data's last transition (2037 in the tz database, the
// zone's POSIX rule after it) ZoneBounds gives, in a leap year, 31 December
// 00:00 UTC as the end of the period for every instant of that day, an end
// at or before the instant asked about (Go 1.26, Europe/Zurich:
// 2040-12-31T12:00Z has the end 2040-12-31T00:00Z); ZonePeriod gives the
// next 00:00 UTC instead, where Go starts the new year's period. Its other
// bounds there, 1 January 00:00 UTC of every year, change nothing either:
// ZoneChanges steps over them.
func ZonePeriod(t time.Time) (start, end time.Time) {
	start, end = t.ZoneBounds()
	if !end.IsZero() && !end.After(t) {
		end = t.Truncate(24 * time.Hour).Add(24 * time.Hour).In(t.Location())
	}
	return start, end
}

// ZoneChanges yields the instants after from and before to at which loc's
// UTC offset or abbreviation changes, in order, each in loc. It walks the
// zone's periods (ZonePeriod) and steps over their bounds where nothing
// changes, as Go gives them past the zone data's last transition. Every
// step moves forward, so the walk ends at to. feed's changes of the clocks
// and feed/ical's VTIMEZONEs are walked here. Like time.Time.In, the walk
// panics when loc is nil.
func ZoneChanges(loc *time.Location, from, to time.Time) iter.Seq[time.Time] {
	return func(yield func(time.Time) bool) {
		name, off := from.In(loc).Zone()
		for t := from.In(loc); ; {
			_, next := ZonePeriod(t)
			if next.IsZero() || !next.Before(to) {
				return
			}
			n, o := next.Zone()
			if (n != name || o != off) && !yield(next) {
				return
			}
			t, name, off = next, n, o
		}
	}
}
