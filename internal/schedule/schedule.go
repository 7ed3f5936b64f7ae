// Package schedule runs a refresh function on a cron expression: the nightly
// rebuild of heliocal's feeds. It wraps github.com/robfig/cron/v3 and takes a
// plain func(ctx) error, so it knows nothing of feeds.
//
// Runs never overlap (a run still going when the next is due is skipped), a
// panicking run is recovered and logged, and Stop waits, bounded by a
// context, for a run in progress.
package schedule

import (
	"context"
	"errors"
	"fmt"
	"log/slog"
	"sync"
	"time"

	"github.com/robfig/cron/v3"

	"heliocal/internal/stopped"
)

// DefaultSpec is the default refresh schedule: every night at 03:15.
const DefaultSpec = "15 3 * * *"

// Func is the work a Scheduler runs. The context is cancelled when Stop gives
// up waiting for it.
type Func func(ctx context.Context) error

// Options configure a Scheduler. The zero value runs at DefaultSpec in the
// server's local zone and logs nowhere.
type Options struct {
	// Spec is a five-field cron expression (minute hour day-of-month month
	// day-of-week), or a descriptor such as "@daily" or "@every 6h".
	// Empty means DefaultSpec.
	Spec string
	// Location is the zone Spec is read in; nil means time.Local.
	Location *time.Location
	// Logger receives one line per run and the scheduler's own messages
	// (the latter at debug level); nil discards them.
	Logger *slog.Logger
}

// Scheduler runs one Func on a cron schedule.
type Scheduler struct {
	fn       Func
	spec     string
	loc      *time.Location
	log      *slog.Logger
	sched    cron.Schedule
	cron     *cron.Cron
	entry    cron.EntryID
	mu       sync.Mutex // guards the fields below, and spec, loc, sched and entry
	started  bool
	stopped  bool
	cancel   context.CancelFunc
	runCtx   context.Context
	lastErr  error
	lastDone time.Time
}

// parser accepts the standard five fields and descriptors, as cron.New does
// by default; it is spelled out so Validate and New agree.
var parser = cron.NewParser(cron.Minute | cron.Hour | cron.Dom | cron.Month | cron.Dow | cron.Descriptor)

// Validate reports whether spec is a cron expression the Scheduler accepts.
// The error names the expression.
func Validate(spec string) error {
	if _, err := parser.Parse(spec); err != nil {
		return fmt.Errorf("schedule: invalid cron expression %q: %w", spec, err)
	}
	return nil
}

// Interval returns the time between the next two runs of spec after from, in
// loc (nil means time.Local): a hint for how long a refreshed result stays
// current, e.g. 24h for DefaultSpec.
func Interval(spec string, loc *time.Location, from time.Time) (time.Duration, error) {
	if spec == "" {
		spec = DefaultSpec
	}
	s, err := parser.Parse(spec)
	if err != nil {
		return 0, fmt.Errorf("schedule: invalid cron expression %q: %w", spec, err)
	}
	if loc == nil {
		loc = time.Local
	}
	a := nextOnClocks(s, loc, from)
	b := nextOnClocks(s, loc, a)
	if a.IsZero() || b.IsZero() {
		return 0, fmt.Errorf("schedule: cron expression %q never runs", spec)
	}
	return b.Sub(a), nil
}

// New returns a Scheduler for fn. It checks the expression but starts
// nothing; call Start.
func New(fn Func, opts Options) (*Scheduler, error) {
	if fn == nil {
		return nil, errors.New("schedule: nil function")
	}
	spec := opts.Spec
	if spec == "" {
		spec = DefaultSpec
	}
	sched, err := parser.Parse(spec)
	if err != nil {
		return nil, fmt.Errorf("schedule: invalid cron expression %q: %w", spec, err)
	}
	loc := opts.Location
	if loc == nil {
		loc = time.Local
	}
	log := opts.Logger
	if log == nil {
		log = slog.New(slog.DiscardHandler)
	}
	s := &Scheduler{fn: fn, spec: spec, loc: loc, log: log, sched: sched}
	cl := cronLogger{log}
	s.cron = cron.New(
		cron.WithLocation(loc),
		cron.WithParser(parser),
		cron.WithLogger(cl),
		cron.WithChain(cron.Recover(cl), cron.SkipIfStillRunning(cl)),
	)
	s.entry = s.cron.Schedule(zoned{sched, loc}, cron.FuncJob(s.run))
	return s, nil
}

// zoned reads a schedule in a zone of its own, so that Reschedule can change
// the zone without a new cron runner.
type zoned struct {
	cron.Schedule
	loc *time.Location
}

func (z zoned) Next(t time.Time) time.Time { return nextOnClocks(z.Schedule, z.loc, t) }

// nextOnClocks is the first time of s after t, read on the clocks of loc. A
// clock time the clocks skip when they go forward is moved by their jump
// (03:15 where they go from 03:00 to 04:00, as in Europe/Helsinki in March,
// is 04:15; midnight where they go from 00:00 to 01:00, as in
// America/Santiago in September, is 01:00), where robfig/cron would leave
// that day out; one they show twice when they go back runs once, at the
// first. The rule is the one of the configuration's clock times.
func nextOnClocks(s cron.Schedule, loc *time.Location, t time.Time) time.Time {
	spec, ok := s.(*cron.SpecSchedule)
	if !ok || spec.Location != time.Local { // @every (no clock times), or a zone of its own
		return s.Next(t.In(loc))
	}
	lt := t.In(loc)
	// The clock time written in UTC, whose days are all 24 h long: the
	// schedule's times are found among them, then put on loc's clocks.
	wall := clockInUTC(lt)
	// A time the clocks skipped in the last day runs moved by their jump,
	// perhaps after t (04:15 from 04:05 in Helsinki on the night of the
	// jump): the search starts the jump earlier on the clocks.
	_, now := lt.Zone()
	if _, before := t.Add(-24 * time.Hour).In(loc).Zone(); now > before {
		wall = wall.Add(-time.Duration(now-before) * time.Second)
	}
	// The clock times at or before t are passed over, those of a time the
	// clocks show twice too when t is at its second showing (it ran at the
	// first). The search ends: wall grows, and spec.Next gives the zero
	// time once it finds no time in five years.
	for {
		if wall = spec.Next(wall); wall.IsZero() {
			return wall
		}
		if at := onClocks(wall, loc); at.After(t) {
			return at
		}
	}
}

// onClocks is the instant loc's clocks show wall (a clock time written in
// UTC): the first of two when they show it twice, and, when they skip it,
// the instant it would be on the clocks before the jump, so that it is
// moved forward by the jump.
func onClocks(wall time.Time, loc *time.Location) time.Time {
	_, before := wall.Add(-24 * time.Hour).In(loc).Zone()
	_, after := wall.Add(24 * time.Hour).In(loc).Zone()
	shows := func(at time.Time) bool { return clockInUTC(at.In(loc)).Equal(wall) }
	first := wall.Add(-time.Duration(before) * time.Second)
	if second := wall.Add(-time.Duration(after) * time.Second); shows(second) && (!shows(first) || second.Before(first)) {
		first = second
	}
	return first.In(loc)
}

// clockInUTC is the clock time t shows, written in UTC.
func clockInUTC(t time.Time) time.Time {
	return time.Date(t.Year(), t.Month(), t.Day(), t.Hour(), t.Minute(), t.Second(), t.Nanosecond(), time.UTC)
}

// Reschedule replaces the expression and its zone (nil means time.Local)
// without stopping the Scheduler: the next run is the new expression's next
// time from now; a run in progress finishes. A malformed expression is an
// error and changes nothing.
func (s *Scheduler) Reschedule(spec string, loc *time.Location) error {
	if spec == "" {
		spec = DefaultSpec
	}
	sched, err := parser.Parse(spec)
	if err != nil {
		return fmt.Errorf("schedule: invalid cron expression %q: %w", spec, err)
	}
	if loc == nil {
		loc = time.Local
	}
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.stopped {
		return errors.New("schedule: Reschedule after Stop")
	}
	s.cron.Remove(s.entry)
	s.entry = s.cron.Schedule(zoned{sched, loc}, cron.FuncJob(s.run))
	s.spec, s.loc, s.sched = spec, loc, sched
	return nil
}

// Spec returns the cron expression in use.
func (s *Scheduler) Spec() string {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.spec
}

// Location returns the zone the expression is read in.
func (s *Scheduler) Location() *time.Location {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.loc
}

// Start begins scheduling. Runs receive a context derived from ctx without
// its cancellation: cancelling ctx does not abort a run (Stop decides that),
// but its values are kept. Start after Start or Stop does nothing.
func (s *Scheduler) Start(ctx context.Context) {
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.started || s.stopped {
		return
	}
	s.started = true
	s.runCtx, s.cancel = context.WithCancel(context.WithoutCancel(ctx))
	s.cron.Start()
}

// Stop ends scheduling and waits for a run in progress to finish. If ctx ends
// first, Stop cancels the run's context and returns ctx's error without
// waiting further. Stop is safe to call more than once and before Start.
func (s *Scheduler) Stop(ctx context.Context) error {
	s.mu.Lock()
	started := s.started
	s.stopped = true
	cancel := s.cancel
	s.mu.Unlock()
	if !started {
		return nil
	}
	done := s.cron.Stop()
	select {
	case <-done.Done():
		cancel()
		return nil
	case <-ctx.Done():
		cancel()
		s.log.Warn("schedule: stopped without waiting for the running refresh", "err", ctx.Err())
		return fmt.Errorf("schedule: waiting for the running refresh: %w", ctx.Err())
	}
}

// Next returns the next time the function is due, in the schedule's zone:
// once started, the time the runner has set for the next run; before Start
// and after Stop, the expression's next time from now. The two differ for
// "@every", whose runs follow each other by the interval: its next time
// from now is always the interval away, never the run that is due.
func (s *Scheduler) Next() time.Time {
	s.mu.Lock()
	sched, loc, id, running := s.sched, s.loc, s.entry, s.started && !s.stopped
	s.mu.Unlock()
	if running {
		if next := s.cron.Entry(id).Next; !next.IsZero() {
			return next.In(loc)
		}
	}
	return nextOnClocks(sched, loc, time.Now())
}

// Last returns when the latest run finished, and its error (zero time if
// none has finished yet).
func (s *Scheduler) Last() (time.Time, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.lastDone, s.lastErr
}

// run is the cron job: one call of fn, logged with its duration.
func (s *Scheduler) run() {
	s.mu.Lock()
	ctx := s.runCtx
	s.mu.Unlock()
	start := time.Now()
	err := s.fn(ctx)
	d := time.Since(start)
	s.mu.Lock()
	s.lastDone, s.lastErr = time.Now(), err
	s.mu.Unlock()
	if stopped.By(ctx, err) {
		// stopped by Stop (the server is shutting down), not failed
		s.log.Info("scheduled refresh stopped: shutting down", "duration", d)
		return
	}
	next := s.Next()
	if err != nil {
		s.log.Error("scheduled refresh failed", "err", err, "duration", d, "next_run", next)
		return
	}
	s.log.Info("scheduled refresh done", "duration", d, "next_run", next)
}

// cronLogger adapts a slog.Logger to cron.Logger (whose default prints to
// standard output). cron's routine messages go to debug level; its errors
// (a recovered panic) to error level.
type cronLogger struct{ l *slog.Logger }

func (c cronLogger) Info(msg string, kv ...any) {
	c.l.Debug("cron: "+msg, kv...)
}

func (c cronLogger) Error(err error, msg string, kv ...any) {
	c.l.Error("cron: "+msg, append([]any{"err", err}, kv...)...)
}
