package feed

import (
	"context"
	"fmt"
	"slices"
	"time"

	"heliocal/config"
)

// Chunk is the part of a long date range that EventChunks computes at once:
// the local dates First..Last (00:00 UTC civil dates) with their events
// (sorted by Start) and notes (sorted by date), as EventsFor gives them for
// those dates.
type Chunk struct {
	First, Last time.Time
	Events      []Event
	Notes       []Note
}

// ChunkDays is the number of dates EventChunks computes at once: long
// enough that the searches' margins (two days each side) cost little, short
// enough that a chunk of a site's daily kinds stays within a few megabytes.
const ChunkDays = 184

// EventChunks computes the events of specs on the local dates first..last
// chunk by chunk (ChunkDays dates each) and hands each chunk to fn in
// order, so that memory stays that of one chunk whatever the span. The
// chunks hold the same events and notes as one EventsFor call over the whole
// range (times within the searches' 1 ms). An event's Start is never before the local midnight that begins its
// date, but a span named by its evening (a dark window) may start after the
// next midnight; writers that order by Start across chunks hold back the
// events of a chunk that start after it ends. The chunk's slices are
// reused for the next chunk once fn returns.
func (s *Sky) EventChunks(ctx context.Context, p Place, specs []config.KindSpec, first, last time.Time, fn func(Chunk) error) error {
	first, last = civil(first), civil(last)
	if last.Before(first) {
		return fmt.Errorf("feed: date range ends (%s) before it starts (%s)",
			last.Format(time.DateOnly), first.Format(time.DateOnly))
	}
	// A photoperiod threshold that the whole range never crosses gets one
	// note for the range, not one per chunk.
	var whole []Note
	chunked := last.After(first.AddDate(0, 0, ChunkDays-1))
	if ps := photoperiods(specs); chunked && len(ps) > 0 {
		_, notes, err := s.eventsFor(ctx, p, ps, first, last, &buffers{})
		if err != nil {
			return err
		}
		whole = notes
	}
	buf := &buffers{}
	for d := first; !d.After(last); d = d.AddDate(0, 0, ChunkDays) {
		end := d.AddDate(0, 0, ChunkDays-1)
		if end.After(last) {
			end = last
		}
		events, notes, err := s.eventsFor(ctx, p, specs, d, end, buf)
		if err != nil {
			return err
		}
		if chunked {
			notes = slices.DeleteFunc(notes, func(n Note) bool { return n.Kind.Name == "photoperiod" })
			if d.Equal(first) {
				notes = append(whole, notes...)
			}
		}
		if err := fn(Chunk{First: d, Last: end, Events: events, Notes: notes}); err != nil {
			return err
		}
	}
	return nil
}

// photoperiods returns the photoperiod kinds of specs.
func photoperiods(specs []config.KindSpec) []config.KindSpec {
	var out []config.KindSpec
	for _, sp := range specs {
		if sp.Kind.Name == "photoperiod" {
			out = append(out, sp)
		}
	}
	return out
}
