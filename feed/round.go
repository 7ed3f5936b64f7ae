package feed

import (
	"strings"
	"time"

	"heliocal/astro"
)

// One rounding rule for every output. An instant is taken to the millisecond
// (the astronomy solves to 1 ms; JSON shows milliseconds); wherever it is
// shown to the second (tables, CSV local times, calendar files,
// descriptions) that value is rounded to the nearest second, and where it is
// shown to the minute (daily summaries, lamp times) to the nearest minute,
// half a unit rounding up. Every output thus agrees with the JSON: an
// instant at 06:42:29.600 is 06:42:30 everywhere, and one at 06:42:29.4996
// (29.500 in JSON) too.

// ToMillisecond is an instant as JSON shows it.
func ToMillisecond(t time.Time) time.Time { return t.Round(time.Millisecond) }

// JSONTime is the layout of an instant in the JSON and CSV outputs (heliocal
// events, the served /at.json): UTC to the millisecond,
// 2027-11-07T04:48:12.345Z.
const JSONTime = "2006-01-02T15:04:05.000Z07:00"

// UTCStamp is the instant t as the JSON and CSV outputs write it: to the
// millisecond (ToMillisecond), in UTC, as JSONTime lays it out.
func UTCStamp(t time.Time) string { return ToMillisecond(t).UTC().Format(JSONTime) }

// ToSecond is an instant as shown to the second: t.Round(time.Millisecond)
// .Round(time.Second) in one step. Both round half up, so the second goes
// up exactly when the millisecond, rounded, is 500 or more: from
// 499.5 ms on.
func ToSecond(t time.Time) time.Time {
	// t.Truncate(time.Second) is t less its nanoseconds (whole seconds
	// count from the zero time), without Truncate's general division;
	// Round(0) drops a monotonic reading as Truncate does
	ns := t.Nanosecond()
	d := -time.Duration(ns)
	if ns >= 499_500_000 {
		d += time.Second
	}
	return t.Round(0).Add(d)
}

// UnixSecond is ToSecond(t).Unix(), without making the Time: the second
// goes up from 499.5 ms on.
func UnixSecond(t time.Time) int64 {
	u := t.Unix()
	if t.Nanosecond() >= 499_500_000 {
		u++
	}
	return u
}

// ToMinute is an instant as shown to the minute.
func ToMinute(t time.Time) time.Time { return t.Round(time.Millisecond).Round(time.Minute) }

// span is the time between two instants as shown, to the second.
func span(from, to time.Time) time.Duration {
	return time.Duration(UnixSecond(to)-UnixSecond(from)) * time.Second
}

// DateOnly reports whether an event names a date rather than an instant:
// the dates on which day length crosses a threshold, and the daily summary
// of a date (an all-day entry in a feed). Such an event has no
// clock time in any output; its Start is only the local midnight that
// begins its Date.
func (e Event) DateOnly() bool { return e.Kind.Name == "photoperiod" || e.Kind.Name == "daily-summary" }

// DirectionWord names which way an event crosses its threshold, the same
// word in JSON, CSV, the table and the calendar text: the Sun "rising" or
// "setting" through an altitude; day length "rising" or "falling" through a
// duration; "" for events without a direction.
func DirectionWord(e Event) string { return DirectionName(e.Kind.String(), e.Direction) }

// DirectionName is DirectionWord for a kind written as in the
// configuration ("photoperiod:12h", "sun-altitude:-3", "sunrise").
func DirectionName(kind string, d astro.Direction) string {
	switch {
	case d == 0:
		return ""
	case d == astro.Setting && strings.HasPrefix(kind, "photoperiod"):
		return "falling"
	case d == astro.Setting:
		return "setting"
	}
	return "rising"
}
