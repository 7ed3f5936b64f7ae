package main

import (
	"context"
	"fmt"
	"sync"

	"heliocal/config"
	"heliocal/feed"
	"heliocal/feed/publish"
)

// lampLimitWarnings words the lighting limits of feed f that do nothing
// on some of its dates, as cal, the feed as built, found them
// (feed.Calendar.LampLimitGaps).
func lampLimitWarnings(f *config.Feed, cal *feed.Calendar) []lampWarning {
	var out []lampWarning
	for _, g := range cal.LampLimitGaps {
		w := lampWarning{limit: fmt.Sprintf("%s|%s|%s=%s", f.ID, g.Kind, g.Option, g.Value)}
		if g.Evening() {
			w.text = fmt.Sprintf("feed %q: %s latest_off %q comes before the evening lamps start %s, so it does not limit them: %s; for no evening lamps on those dates, use months: or lamps: morning",
				f.ID, g.Kind, g.Value, g.DatesText(), g.Outcome())
		} else {
			w.text = fmt.Sprintf("feed %q: %s earliest_on %q comes after the morning lamps end %s, so it does not limit them: %s; for no morning lamps on those dates, use months: or lamps: evening",
				f.ID, g.Kind, g.Value, g.DatesText(), g.Outcome())
		}
		out = append(out, w)
	}
	return out
}

// lampWarning is one warning of lampLimitWarnings: its words, and the limit
// it is about (feed, kind, option and value), which stays the same as the
// feed's window moves and its count of dates changes.
type lampWarning struct {
	limit, text string
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
		if !feed.HasLampLimit(f) {
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
