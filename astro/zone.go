package astro

import (
	"iter"
	"time"
)

// ZoneChanges yields the instants after from and before to at which loc's
// UTC offset or abbreviation changes, in order, each in loc. It walks
// time.Time.ZoneBounds one period of the zone at a time and steps over the
// bounds Go gives past the zone data's last transition (2037 in the tz
// database, the zone's POSIX rule after it) where nothing changes: 1
// January 00:00 UTC of every year and, in a leap year, 31 December 00:00
// UTC, which ZoneBounds gives as the end of the period for every instant of
// that day, so an end at or before the instant asked about (Go 1.26,
// Europe/Zurich: 2040-12-31T12:00Z has the end 2040-12-31T00:00Z). From
// such an end the walk goes on at the next 00:00 UTC, where Go starts the
// new year's period. Every step moves forward, so the walk ends at to.
// feed's changes of the clocks and feed/ical's VTIMEZONEs are walked here.
func ZoneChanges(loc *time.Location, from, to time.Time) iter.Seq[time.Time] {
	return func(yield func(time.Time) bool) {
		name, off := from.In(loc).Zone()
		for t := from; ; {
			_, next := t.In(loc).ZoneBounds()
			if next.IsZero() {
				return
			}
			if !next.After(t) {
				next = t.Truncate(24 * time.Hour).Add(24 * time.Hour).In(loc)
			}
			if !next.Before(to) {
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
