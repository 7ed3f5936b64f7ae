package feed

import (
	"fmt"
	"math"
	"strings"
	"time"
	"unsafe"

	"heliocal/config"
)

// LampLimitGap is a lighting limit of a feed that does nothing on some of
// its dates: a latest_off later than noon that comes before the evening
// lamps start (the first latest_off after the start is then the next
// day's, past the lamps' end), or an earliest_on earlier than noon that
// comes after the morning lamps end.
type LampLimitGap struct {
	Kind      config.Kind
	Option    string         // "latest_off" or "earliest_on"
	Value     string         // the clock time, "18:45"
	Stretches [][2]time.Time // the runs of consecutive dates: first, last
}

// Dates is how many dates the limit does nothing on: those of its stretches.
func (g LampLimitGap) Dates() int {
	n := 0
	for _, st := range g.Stretches {
		n += int(st[1].Sub(st[0])/(24*time.Hour)) + 1
	}
	return n
}

// Evening says whether the gap is a latest_off's (the evening lamps').
func (g LampLimitGap) Evening() bool { return g.Option == "latest_off" }

// HasLampLimit says whether feed f has a lighting limit (lampLimitGaps
// reads its calendar).
func HasLampLimit(f *config.Feed) bool {
	for _, k := range f.Kinds {
		if k.Kind.Name == config.KindLighting && (k.LatestOff != "" || k.EarliestOn != "") {
			return true
		}
	}
	return false
}

// lampLimitGaps finds the lighting limits of feed f that do nothing on
// some of the dates of cal, the feed as built. A limit past midnight
// ("01:00") or before noon in the evening is meant for the night and is
// not one.
func lampLimitGaps(f *config.Feed, cal *Calendar) []LampLimitGap {
	var out []LampLimitGap
	z := newZoneCache(cal.Site.Location)
	for _, k := range f.Kinds {
		if k.Kind.Name == config.KindLighting {
			out = appendLimitGaps(out, k, k.Kind.String(), cal.Entries, z)
		}
	}
	return out
}

// ownLimitGaps reports whether the limits of each lighting kinds entry of
// feed f can be checked against its own entries alone (appendLimitGaps
// as the entries are written): no other kinds entry of f writes entries
// of the same kind, which lampLimitGaps would count for it too.
func ownLimitGaps(f *config.Feed) bool {
	for i, k := range f.Kinds {
		if k.Kind.Name != config.KindLighting {
			continue
		}
		for _, o := range f.Kinds[i+1:] {
			if o.Kind == k.Kind {
				return false
			}
		}
	}
	return true
}

// appendLimitGaps appends to out the limits of the lighting kinds entry k
// that do nothing on some of the dates of es, entries in the order of
// their dates (those of k's kind, name as the entries write it, count; z
// is the site's zone).
func appendLimitGaps(out []LampLimitGap, k config.KindSpec, name string, es []Entry, z *zoneCache) []LampLimitGap {
	for _, lim := range [...]struct {
		key, value, part string
	}{{"latest_off", k.LatestOff, partEvening}, {"earliest_on", k.EarliestOn, partMorning}} {
		if lim.value == "" {
			continue
		}
		clock, err := config.ParseClock(lim.value)
		if err != nil {
			continue // config has refused it already
		}
		evening := lim.part == partEvening
		if evening != (clock > 12*time.Hour) || clock == 12*time.Hour {
			continue
		}
		g := LampLimitGap{Kind: k.Kind, Option: lim.key, Value: lim.value}
		lastDay := int64(math.MinInt64) // the last date of the last stretch, days since 1970-01-01
		for i := range es {
			e := &es[i]
			// the part against the constants, compared in place, and the
			// kind mostly the same string as name
			if evening && e.Facts.Part != partEvening || !evening && e.Facts.Part != partMorning ||
				e.AllDay || e.Facts.Note || !sameString(e.Kind, name) {
				continue
			}
			// the clock time, on the entry's date, of the end the limit
			// does not move: an evening's start, a morning's end
			at := e.Start
			if !evening {
				at = e.End
			}
			// the local date of at is the entry's (a date is 00:00 UTC)
			u := at.Unix()
			_, off := z.at(u)
			day := floorDiv(u+off, secondsPerDay)
			if d := e.Date.Unix(); d != day*secondsPerDay || e.Date.Nanosecond() != 0 {
				continue
			}
			of := time.Duration(daySeconds(u+off)) * time.Second
			if evening && of <= clock || !evening && of >= clock {
				continue
			}
			if k := len(g.Stretches) - 1; k >= 0 && day-lastDay <= 1 {
				g.Stretches[k][1] = e.Date
			} else {
				g.Stretches = append(g.Stretches, [2]time.Time{e.Date, e.Date})
			}
			lastDay = day
		}
		if len(g.Stretches) > 0 {
			out = append(out, g)
		}
	}
	return out
}

// DatesText says on which dates the limit does nothing: "on 7 Nov 2027",
// "on 238 dates between 14 Mar 2027 and 6 Nov 2027" (every date between),
// and for dates in two or three stretches each of them, "on 6 dates in 2
// stretches: 18–20 Nov 2026 and 18–20 Nov 2027" ("on 2 dates: 27 Mar 2027
// and 10 Sep 2027"), which "between" the first and the last would make
// seem a year of dates.
func (g LampLimitGap) DatesText() string {
	n, stretches := g.Dates(), g.Stretches
	first, last := stretches[0][0], stretches[len(stretches)-1][1]
	switch {
	case n == 1:
		return "on " + first.Format("2 Jan 2006")
	case len(stretches) == 1:
		return fmt.Sprintf("on %d dates between %s and %s", n, first.Format("2 Jan 2006"), last.Format("2 Jan 2006"))
	case len(stretches) > 3:
		return fmt.Sprintf("on %d dates in %d stretches between %s and %s", n, len(stretches), first.Format("2 Jan 2006"), last.Format("2 Jan 2006"))
	}
	parts := make([]string, len(stretches))
	for i, st := range stretches {
		a, b := st[0], st[1]
		switch {
		case a.Equal(b):
			parts[i] = a.Format("2 Jan 2006")
		case a.Year() == b.Year() && a.Month() == b.Month():
			parts[i] = a.Format("2") + "–" + b.Format("2 Jan 2006")
		case a.Year() == b.Year():
			parts[i] = a.Format("2 Jan") + "–" + b.Format("2 Jan 2006")
		default:
			parts[i] = a.Format("2 Jan 2006") + "–" + b.Format("2 Jan 2006")
		}
	}
	list := AndList(parts)
	if n == len(stretches) { // single dates
		return fmt.Sprintf("on %d dates: %s", n, list)
	}
	return fmt.Sprintf("on %d dates in %d stretches: %s", n, len(stretches), list)
}

// lampLimitSentence is what the calendar's description adds to a lighting
// kind's meaning for a limit that does nothing on some dates, so that a
// subscriber is not told "lamps off no later than 18:45" of lamps that run
// to 21:39: "Where the evening lamps start after 18:45 (on 238 dates
// between 14 Mar 2027 and 6 Nov 2027), they run until the target is
// reached."
func (g LampLimitGap) lampLimitSentence() string {
	if g.Evening() {
		return fmt.Sprintf("Where the evening lamps start after %s (%s), %s.", g.Value, g.DatesText(), g.Outcome())
	}
	return fmt.Sprintf("Where the morning lamps end before %s (%s), %s.", g.Value, g.DatesText(), g.Outcome())
}

// Outcome says what the lamps do on the dates where the limit does
// nothing, in the calendar's description and in check's warning alike:
// "they run until the target is reached".
func (g LampLimitGap) Outcome() string {
	if g.Evening() {
		return "they run until the target is reached"
	}
	return "they start as early as the target needs"
}

// noteLampLimitGaps keeps in cal.LampLimitGaps the limits of f that do
// nothing on some of cal's dates, and adds to cal's description, after the
// meaning of each lighting kind of f, the sentence of each of them. gaps
// are those limits when found as the entries were written (not nil);
// lampLimitGaps finds them otherwise.
func noteLampLimitGaps(s *config.Site, f *config.Feed, cal *Calendar, gaps *limitGaps) {
	if !HasLampLimit(f) {
		return
	}
	if gaps != nil {
		cal.LampLimitGaps = gaps.gaps
	} else {
		cal.LampLimitGaps = lampLimitGaps(f, cal)
	}
	for _, spec := range f.Kinds {
		var add []string
		for _, g := range cal.LampLimitGaps {
			if g.Kind == spec.Kind {
				add = append(add, g.lampLimitSentence())
			}
		}
		if len(add) == 0 {
			continue
		}
		m := lightingMeaning(s, spec)
		if i := strings.Index(cal.Description, m); i >= 0 {
			i += len(m)
			cal.Description = cal.Description[:i] + " " + strings.Join(add, " ") + cal.Description[i:]
		}
	}
}

// sameString reports whether a == b, at once when both are the same
// string (the entries of a kinds entry share their kind's).
func sameString(a, b string) bool {
	return len(a) == len(b) && (unsafe.StringData(a) == unsafe.StringData(b) || a == b)
}
