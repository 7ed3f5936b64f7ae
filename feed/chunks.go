package feed

import (
	"context"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"
	"time"

	"heliocal/astro"
	"heliocal/config"
)

// Chunk is the part of a long date range that EventChunks computes at once:
// the local dates First..Last (00:00 UTC civil dates) with their events and
// notes (sorted by date), as EventsFor gives them for those dates. The
// events are as computed, kind after kind: Order lists their positions in
// the order of Start (Events[Order[0]] first), the order EventsFor gives
// them in, and Spec[i] is the index in EventChunks's specs of the kind
// that gave Events[Order[i]] (its Kind is that kind's, or one of the
// kinds of a group: "seasons"). A Chunk without Order has its events in
// that order already, and no Spec.
type Chunk struct {
	First, Last time.Time
	Events      []Event
	Order, Spec []int32
	Notes       []Note
}

// Sort puts c's events in the order of Order, in place, moving each once,
// and drops Order and Spec.
func (c *Chunk) Sort() {
	if c.Order != nil {
		permute(c.Events, c.Order)
		c.Order, c.Spec = nil, nil
	}
}

// ChunkDays is the number of dates EventChunks computes at once: long
// enough that the searches' margins (two days each side) cost little, short
// enough that a chunk of a site's daily kinds stays within a few megabytes.
const ChunkDays = 184

// EventChunks computes the events of specs on the local dates first..last
// chunk by chunk (ChunkDays dates each) and hands each chunk to fn in
// order, so that memory stays that of a few chunks whatever the span. The
// chunks hold the same events and notes as one EventsFor call over the whole
// range (times within the searches' 1 ms). An event's Start is never before
// the local midnight that begins its date, but a span named by its evening
// (a dark window) may start after the next midnight; writers that order by
// Start across chunks hold back the events of a chunk that start after it
// ends. The chunk's slices are reused for a later chunk once fn returns.
//
// The chunks are computed by up to GOMAXPROCS goroutines at once (the
// calling one among them), and each hands its chunk to fn when the chunks
// before it have been: fn is called by one goroutine at a time, in order,
// not always by the calling one. At most one chunk per goroutine is held.
func (s *Sky) EventChunks(ctx context.Context, p Place, specs []config.KindSpec, first, last time.Time, fn func(Chunk) error) error {
	return PreparedChunks(ctx, s, p, specs, first, last, nil, func(c Chunk, _ *struct{}) error { return fn(c) })
}

// PreparedChunks is s.EventChunks with a step before each chunk's turn:
// prepare(c, t) is called on the goroutine that computed the chunk *c as
// soon as it has, at the same time as other chunks' prepare and fn (it may
// change nothing but *c and *t, nor read what fn changes), and fn(*c, t)
// then in order, as EventChunks calls fn, with the chunk as prepare left
// it (sorted, say) and the same t.
// t is the goroutine's own T, the zero value before its first chunk and
// handed to prepare again with its next one (buffers kept in it are
// reused), so that there are as many Ts as goroutines, at most GOMAXPROCS.
// A writer thus formats the chunks in parallel and writes them in order.
// A nil prepare is not called. An error of prepare is returned in its
// chunk's turn, as one of fn.
func PreparedChunks[T any](ctx context.Context, s *Sky, p Place, specs []config.KindSpec, first, last time.Time, prepare func(*Chunk, *T) error, fn func(Chunk, *T) error) error {
	first, last, err := dateRange(first, last)
	if err != nil {
		return err
	}
	// A photoperiod threshold that the whole range never crosses gets one
	// note for the range, not one per chunk.
	var whole []Note
	chunked := last.After(first.AddDate(0, 0, ChunkDays-1))
	if ps := kindsNamed(specs, "photoperiod"); chunked && len(ps) > 0 {
		_, notes, err := s.eventsFor(ctx, p, ps, first, last, &buffers{})
		if err != nil {
			return err
		}
		whole = notes
	}
	lamps := kindsNamed(specs, "lighting")
	var starts []time.Time
	for d := first; !d.After(last); d = d.AddDate(0, 0, ChunkDays) {
		starts = append(starts, d)
	}
	compute := func(ctx context.Context, i int, buf *buffers) (Chunk, error) {
		d := starts[i]
		end := d.AddDate(0, 0, ChunkDays-1)
		if end.After(last) {
			end = last
		}
		events, order, spec, notes, err := s.computeEvents(ctx, p, specs, d, end, buf)
		if err != nil {
			return Chunk{}, err
		}
		if chunked {
			notes = slices.DeleteFunc(notes, func(n Note) bool { return n.Kind.Name == "photoperiod" })
			// each in the chunk of its date: the first, unless a filter
			// moved it (moveStretchNotes)
			var own []Note
			for _, n := range whole {
				if !n.Date.Before(d) && !n.Date.After(end) {
					own = append(own, n)
				}
			}
			if len(own) > 0 {
				notes = append(own, notes...)
			}
			if notes, err = s.joinLampNotes(ctx, p, lamps, d, end, first, last, notes); err != nil {
				return Chunk{}, err
			}
		}
		return Chunk{First: d, Last: end, Events: events, Order: order, Spec: spec, Notes: notes}, nil
	}
	return inOrder(ctx, len(starts), min(runtime.GOMAXPROCS(0), len(starts)), compute, prepare, fn)
}

// inOrder runs compute for 0..n−1 on workers goroutines, the calling one
// among them, each with its own buffers and T, and hands the results to fn
// in order: the goroutine that computed chunk i calls prepare with it and
// its T (unless prepare is nil), waits until chunk i−1 has been handed
// over, hands chunk i to fn itself and goes on with the next chunk not yet
// taken. fn is thus called by one goroutine at a time, in the order of the
// chunks, and only workers chunks exist at once. The goroutines mostly
// find their turn come when they finish: one hands its chunk over while
// the other computes, so that neither waits for a hand-off between
// goroutines, as a writer fed by the computing goroutines would at every
// chunk. The first error (of compute, of prepare, of fn, or ctx's) in the
// order of the chunks stops the rest; the goroutines have ended when it
// returns.
func inOrder[T any](ctx context.Context, n, workers int, compute func(context.Context, int, *buffers) (Chunk, error), prepare func(*Chunk, *T) error, fn func(Chunk, *T) error) error {
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	// turn[i] is closed once the chunks before i have been handed to fn
	turn := make([]chan struct{}, n+1)
	for i := range turn {
		turn[i] = make(chan struct{})
	}
	close(turn[0])
	var next atomic.Int64 // the next chunk to take
	var first error       // the error that stopped the chunks, set in turn
	work := func() {
		buf := &buffers{}
		var t T
		for {
			i := int(next.Add(1) - 1)
			if i >= n {
				return
			}
			c, err := compute(ctx, i, buf)
			if err == nil && prepare != nil {
				err = prepare(&c, &t)
			}
			select {
			case <-turn[i]:
			case <-ctx.Done():
				return
			}
			if err == nil {
				err = ctx.Err()
			}
			if err == nil {
				err = fn(c, &t)
			}
			if err != nil {
				first = err // before cancel, which the others wait on
				cancel()
				return
			}
			close(turn[i+1])
		}
	}
	var wg sync.WaitGroup
	for range workers - 1 {
		wg.Go(work)
	}
	work()
	wg.Wait()
	if first != nil {
		return first
	}
	return ctx.Err()
}

// kindsNamed returns the kinds of specs named name ("photoperiod",
// "lighting").
func kindsNamed(specs []config.KindSpec, name string) []config.KindSpec {
	var out []config.KindSpec
	for _, sp := range specs {
		if sp.Kind.Name == name {
			out = append(out, sp)
		}
	}
	return out
}

// lookAheadDays is how many dates after its chunk joinLampNotes computes
// first to find where a stretch without lamps ends.
const lookAheadDays = 7

// joinLampNotes makes the "no lamps needed" notes of the chunk d..end of
// the range first..last those of one computation over the whole range: a
// stretch of dates that need no lamps has one note, on its first date,
// saying until when, even where it crosses from one chunk into the next.
// A chunk's note on its first date is dropped when the date before (in the
// range) needs no lamps either, and a note whose stretch reaches the
// chunk's last date gets the first date after it that needs lamps (looked
// up a week ahead, then over twice as many dates each time, up to a
// chunk's; none when the stretch outlasts the range). Each date's needs do
// not depend on the dates computed with it.
//
// With a filter (months, weekdays, dates) a stretch's note is on the first
// date of the stretch the filter keeps (moveStretchNotes): a chunk's note
// of a stretch that began before it is then dropped only when the filter
// keeps a date of the stretch before the chunk, whose note is there; the
// dates that need lamps are those of the kind without its filter.
func (s *Sky) joinLampNotes(ctx context.Context, p Place, lamps []config.KindSpec, d, end, first, last time.Time, notes []Note) ([]Note, error) {
	// noLamps returns the "no lamps needed" note of sp, without its
	// filter, dated on from, if any, computing from..to.
	noLamps := func(sp config.KindSpec, from, to time.Time) (Note, bool, error) {
		sp.Weekdays, sp.Months, sp.Dates = nil, nil, nil
		_, ns, err := s.eventsFor(ctx, p, []config.KindSpec{sp}, from, to, &buffers{})
		if err != nil {
			return Note{}, false, err
		}
		for _, n := range ns {
			if n.State == astro.AlwaysAbove && n.Date.Equal(from) {
				return n, true, nil
			}
		}
		return Note{}, false, nil
	}
	for _, sp := range lamps {
		mine := func(n *Note) bool { return n.Kind == sp.Kind && n.State == astro.AlwaysAbove }
		// only a note on d itself may belong to a stretch begun before
		// d: without one there is nothing to look back for
		if d.After(first) && slices.ContainsFunc(notes, func(n Note) bool { return mine(&n) && n.start().Equal(d) }) {
			before := d.AddDate(0, 0, -1)
			_, ok, err := noLamps(sp, before, before)
			if err != nil {
				return nil, err
			}
			if f := sp.Filter(); ok && !f.IsZero() {
				// the stretch runs on from before d: its note is in an
				// earlier chunk if the filter keeps one of its dates
				// there, the latest date kept before d among them
				ok = false
				for b := before; !b.Before(first); b = b.AddDate(0, 0, -1) {
					if f.Allows(b) {
						n, in, err := noLamps(sp, b, before)
						if err != nil {
							return nil, err
						}
						ok = in && n.Until.IsZero()
						break
					}
				}
			}
			if ok {
				notes = slices.DeleteFunc(notes, func(n Note) bool { return mine(&n) && n.start().Equal(d) })
			}
		}
		for i := range notes {
			n := &notes[i]
			if !mine(n) || !n.Until.IsZero() {
				continue
			}
			// a week ahead first, then twice as many dates each time
			// (up to a chunk's): a stretch mostly ends within weeks
			days := lookAheadDays
			for from := end.AddDate(0, 0, 1); !from.After(last); from, days = from.AddDate(0, 0, days), min(2*days, ChunkDays) {
				to := from.AddDate(0, 0, days-1)
				if to.After(last) {
					to = last
				}
				next, ok, err := noLamps(sp, from, to)
				if err != nil {
					return nil, err
				}
				if !ok {
					n.Until = from // lamps are needed again on the first date looked at
					break
				}
				if !next.Until.IsZero() {
					n.Until = next.Until
					break
				}
			}
		}
	}
	return notes, nil
}
