package main

import (
	"context"
	"fmt"
	"strings"
	"sync"
	"time"

	"heliocal/config"
	"heliocal/feed"
	"heliocal/feed/publish"
)

// lampLimitWarnings finds the lighting limits of feed f that do nothing on
// some of its dates: a latest_off later than noon that comes before the
// evening lamps start (the first latest_off after the start is then the
// next day's, past the lamps' end), or an earliest_on earlier than noon
// that comes after the morning lamps end. A limit past midnight ("01:00")
// or before noon in the evening is meant for the night and is not warned
// about. It reads the lamp periods of cal, the feed as built.
func lampLimitWarnings(f *config.Feed, cal *feed.Calendar) []lampWarning {
	var out []lampWarning
	loc := cal.Site.Location
	for _, k := range f.Kinds {
		if k.Kind.Name != config.KindLighting {
			continue
		}
		name := k.Kind.String()
		for _, lim := range []struct {
			key, value, part string
		}{{"latest_off", k.LatestOff, "evening"}, {"earliest_on", k.EarliestOn, "morning"}} {
			if lim.value == "" {
				continue
			}
			clock, err := config.ParseClock(lim.value)
			if err != nil {
				continue // config has refused it already
			}
			evening := lim.part == "evening"
			if evening != (clock > 12*time.Hour) || clock == 12*time.Hour {
				continue
			}
			var n int
			var stretches [][2]time.Time // runs of consecutive dates: first, last
			for i := range cal.Entries {
				e := &cal.Entries[i]
				if e.Kind != name || e.AllDay || e.Facts.Note || e.Facts.Part != lim.part {
					continue
				}
				// the clock time, on the entry's date, of the end the limit
				// does not move: an evening's start, a morning's end
				at := e.Start
				if !evening {
					at = e.End
				}
				local := at.In(loc)
				y, m, d := local.Date()
				if time.Date(y, m, d, 0, 0, 0, 0, time.UTC) != e.Date {
					continue
				}
				of := time.Duration(local.Hour())*time.Hour + time.Duration(local.Minute())*time.Minute + time.Duration(local.Second())*time.Second
				if evening && of <= clock || !evening && of >= clock {
					continue
				}
				if k := len(stretches) - 1; k >= 0 && e.Date.Sub(stretches[k][1]) <= 24*time.Hour {
					stretches[k][1] = e.Date
				} else {
					stretches = append(stretches, [2]time.Time{e.Date, e.Date})
				}
				n++
			}
			if n == 0 {
				continue
			}
			dates := limitDates(n, stretches)
			w := lampWarning{limit: fmt.Sprintf("%s|%s|%s=%s", f.ID, k.Kind, lim.key, lim.value)}
			if evening {
				w.text = fmt.Sprintf("feed %q: %s latest_off %q comes before the evening lamps start %s, so it does not limit them: they run until the target is reached; for no evening lamps on those dates, use months: or lamps: morning",
					f.ID, k.Kind, lim.value, dates)
			} else {
				w.text = fmt.Sprintf("feed %q: %s earliest_on %q comes after the morning lamps end %s, so it does not limit them: they start as early as the target needs; for no morning lamps on those dates, use months: or lamps: evening",
					f.ID, k.Kind, lim.value, dates)
			}
			out = append(out, w)
		}
	}
	return out
}

// limitDates says on which dates a limit does nothing: "on 7 Nov 2027",
// "on 238 dates between 14 Mar 2027 and 6 Nov 2027" (every date between),
// and for dates in two or three stretches each of them, "on 6 dates in 2
// stretches: 18–20 Nov 2026 and 18–20 Nov 2027" ("on 2 dates: 27 Mar 2027
// and 10 Sep 2027"), which "between" the first and the last would make
// seem a year of dates.
func limitDates(n int, stretches [][2]time.Time) string {
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
	list := strings.Join(parts[:len(parts)-1], ", ") + " and " + parts[len(parts)-1]
	if n == len(stretches) { // single dates
		return fmt.Sprintf("on %d dates: %s", n, list)
	}
	return fmt.Sprintf("on %d dates in %d stretches: %s", n, len(stretches), list)
}

// lampWarning is one warning of lampLimitWarnings: its words, and the limit
// it is about (feed, kind, option and value), which stays the same as the
// feed's window moves and its count of dates changes.
type lampWarning struct {
	limit, text string
}

// hasLampLimit says whether feed f has a lighting limit that
// lampLimitWarnings reads its calendar for.
func hasLampLimit(f *config.Feed) bool {
	for _, k := range f.Kinds {
		if k.Kind.Name == config.KindLighting && (k.LatestOff != "" || k.EarliestOn != "") {
			return true
		}
	}
	return false
}

// lampWatch gathers the warnings of lampLimitWarnings while a publish or a
// serve refresh builds the feeds, for those commands to show what check
// shows: watch wraps the feeds' builders, and warnings lists what they found.
type lampWatch struct {
	mu    sync.Mutex
	found [][]lampWarning // by feed, in the configuration's order
}

// watch makes each builder of srcs, the sources of cfg's feeds in their
// order (build), read the calendar it builds for lamp warnings before
// handing it on. Feeds without a lighting limit are left as they are.
func (w *lampWatch) watch(cfg *config.Config, srcs []publish.Source) {
	w.found = make([][]lampWarning, len(srcs))
	for i := range srcs {
		f := &cfg.Feeds[i]
		if !hasLampLimit(f) {
			continue
		}
		b := srcs[i].Build
		srcs[i].Build = func(ctx context.Context) (*feed.Calendar, error) {
			cal, err := b(ctx)
			if err == nil && cal != nil {
				ws := lampLimitWarnings(f, cal)
				w.mu.Lock()
				w.found[i] = ws
				w.mu.Unlock()
			}
			return cal, err
		}
	}
}

// warnings are the warnings found so far, feed by feed.
func (w *lampWatch) warnings() []lampWarning {
	w.mu.Lock()
	defer w.mu.Unlock()
	var out []lampWarning
	for _, ws := range w.found {
		out = append(out, ws...)
	}
	return out
}
