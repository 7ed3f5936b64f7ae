package schedule

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"log/slog"
	"strings"
	"sync"
	"sync/atomic"
	"testing"
	"testing/synctest"
	"time"
)

// Inside a synctest bubble the clock starts at 2000-01-01 00:00:00 UTC and
// only moves when every goroutine is blocked, so these tests run instantly
// and never depend on the machine's speed.

func TestRunsAtDefaultSpec(t *testing.T) {
	synctest.Test(t, func(t *testing.T) {
		var runs []time.Time
		var mu sync.Mutex
		s, err := New(func(ctx context.Context) error {
			mu.Lock()
			runs = append(runs, time.Now().UTC())
			mu.Unlock()
			return nil
		}, Options{Location: time.UTC})
		if err != nil {
			t.Fatal(err)
		}
		if got, want := s.Spec(), "15 3 * * *"; got != want {
			t.Errorf("Spec() = %q, want %q", got, want)
		}
		want := time.Date(2000, 1, 1, 3, 15, 0, 0, time.UTC)
		if got := s.Next(); !got.Equal(want) {
			t.Errorf("Next() before Start = %v, want %v", got, want)
		}
		s.Start(t.Context())
		time.Sleep(52 * time.Hour) // three nights at 03:15
		synctest.Wait()
		if err := s.Stop(t.Context()); err != nil {
			t.Fatal(err)
		}
		mu.Lock()
		defer mu.Unlock()
		wantRuns := []time.Time{want, want.Add(24 * time.Hour), want.Add(48 * time.Hour)}
		if len(runs) != len(wantRuns) {
			t.Fatalf("runs = %v, want %v", runs, wantRuns)
		}
		for i := range runs {
			if !runs[i].Equal(wantRuns[i]) {
				t.Errorf("run %d at %v, want %v", i, runs[i], wantRuns[i])
			}
		}
	})
}

func TestLocation(t *testing.T) {
	// 03:15 in New York in January is 08:15 UTC (EST is UTC−5, tz database).
	ny, err := time.LoadLocation("America/New_York")
	if err != nil {
		t.Skip("tz database not available:", err)
	}
	synctest.Test(t, func(t *testing.T) {
		var at atomic.Value
		s, err := New(func(ctx context.Context) error {
			at.Store(time.Now().UTC())
			return nil
		}, Options{Location: ny})
		if err != nil {
			t.Fatal(err)
		}
		want := time.Date(2000, 1, 1, 8, 15, 0, 0, time.UTC)
		if got := s.Next(); !got.Equal(want) || got.Location() != ny {
			t.Errorf("Next() = %v, want %v in %v", got, want, ny)
		}
		s.Start(t.Context())
		time.Sleep(9 * time.Hour)
		synctest.Wait()
		s.Stop(t.Context())
		if got, _ := at.Load().(time.Time); !got.Equal(want) {
			t.Errorf("ran at %v, want %v", got, want)
		}
	})
}

func TestSkipsWhileRunningAndStopWaits(t *testing.T) {
	synctest.Test(t, func(t *testing.T) {
		release := make(chan struct{})
		var started, finished atomic.Int32
		s, err := New(func(ctx context.Context) error {
			started.Add(1)
			<-release
			finished.Add(1)
			return nil
		}, Options{Spec: "@every 1m", Location: time.UTC})
		if err != nil {
			t.Fatal(err)
		}
		s.Start(t.Context())
		time.Sleep(5*time.Minute + time.Second) // due five times, the first still running
		synctest.Wait()
		if n := started.Load(); n != 1 {
			t.Fatalf("started %d runs while the first was still running, want 1", n)
		}

		stopped := make(chan error, 1)
		go func() { stopped <- s.Stop(context.Background()) }()
		synctest.Wait()
		select {
		case err := <-stopped:
			t.Fatalf("Stop returned %v while a run was in progress", err)
		default:
		}
		close(release)
		if err := <-stopped; err != nil {
			t.Fatalf("Stop = %v, want nil", err)
		}
		if finished.Load() != 1 {
			t.Fatal("Stop returned before the run finished")
		}
		time.Sleep(time.Hour)
		synctest.Wait()
		if n := started.Load(); n != 1 {
			t.Errorf("ran %d times after Stop, want no more runs", n)
		}
	})
}

// runningEveryMinute is a scheduler of fn every minute in UTC, logging to
// log (nil: the default), started with ctx and in the bubble's time a
// minute on, its first run under way. Call it inside synctest.Test.
func runningEveryMinute(t *testing.T, ctx context.Context, fn func(context.Context) error, log *slog.Logger) *Scheduler {
	t.Helper()
	s, err := New(fn, Options{Spec: "@every 1m", Location: time.UTC, Logger: log})
	if err != nil {
		t.Fatal(err)
	}
	s.Start(ctx)
	time.Sleep(61 * time.Second)
	synctest.Wait()
	return s
}

func TestStopBoundedCancelsRun(t *testing.T) {
	synctest.Test(t, func(t *testing.T) {
		cancelled := make(chan struct{})
		s := runningEveryMinute(t, t.Context(), func(ctx context.Context) error {
			<-ctx.Done()
			close(cancelled)
			return ctx.Err()
		}, nil)
		ctx, cancel := context.WithTimeout(context.Background(), 10*time.Second)
		defer cancel()
		begin := time.Now()
		err := s.Stop(ctx)
		if !errors.Is(err, context.DeadlineExceeded) {
			t.Fatalf("Stop = %v, want deadline exceeded", err)
		}
		if waited := time.Since(begin); waited != 10*time.Second {
			t.Errorf("Stop waited %v, want the 10s bound", waited)
		}
		<-cancelled // the run saw its context cancelled
	})
}

func TestStartContextCancelDoesNotAbortRun(t *testing.T) {
	synctest.Test(t, func(t *testing.T) {
		release := make(chan struct{})
		var runErr atomic.Value
		ctx, cancel := context.WithCancel(t.Context())
		s := runningEveryMinute(t, ctx, func(ctx context.Context) error {
			<-release
			runErr.Store(errors.Join(ctx.Err()))
			return nil
		}, nil)
		cancel() // the server is shutting down: the run must be allowed to finish
		close(release)
		if err := s.Stop(context.Background()); err != nil {
			t.Fatal(err)
		}
		if err, _ := runErr.Load().(error); err != nil {
			t.Errorf("run context was cancelled with the start context: %v", err)
		}
	})
}

func TestFailureAndPanicAreLogged(t *testing.T) {
	synctest.Test(t, func(t *testing.T) {
		var buf bytes.Buffer
		var mu sync.Mutex
		log := slog.New(slog.NewTextHandler(&lockedWriter{w: &buf, mu: &mu}, nil))
		var n atomic.Int32
		s, _ := New(func(ctx context.Context) error {
			if n.Add(1) == 1 {
				return errors.New("site table unreadable")
			}
			panic("boom")
		}, Options{Spec: "@every 1h", Location: time.UTC, Logger: log})
		s.Start(t.Context())
		time.Sleep(time.Hour + time.Second)
		synctest.Wait()
		if at, err := s.Last(); err == nil || at.IsZero() {
			t.Errorf("Last() = %v, %v; want the failure recorded", at, err)
		}
		time.Sleep(time.Hour)
		synctest.Wait()
		s.Stop(t.Context())
		mu.Lock()
		out := buf.String()
		mu.Unlock()
		for _, want := range []string{
			`msg="scheduled refresh failed" err="site table unreadable"`,
			`level=ERROR msg="cron: panic" err=boom`,
		} {
			if !strings.Contains(out, want) {
				t.Errorf("log lacks %q:\n%s", want, out)
			}
		}
		if strings.Contains(out, "cron: wake") || strings.Contains(out, "cron: start") {
			t.Errorf("cron's routine messages logged at info level or above:\n%s", out)
		}
		if n.Load() != 2 {
			t.Errorf("ran %d times, want 2 (a panic must not stop the schedule)", n.Load())
		}
	})
}

type lockedWriter struct {
	w  *bytes.Buffer
	mu *sync.Mutex
}

func (l *lockedWriter) Write(p []byte) (int, error) {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.w.Write(p)
}

func TestInvalidSpec(t *testing.T) {
	for _, spec := range []string{"61 3 * * *", "15 3 * *", "every night", "@fortnightly"} {
		if _, err := New(func(context.Context) error { return nil }, Options{Spec: spec}); err == nil ||
			!strings.Contains(err.Error(), spec) {
			t.Errorf("New(%q) error = %v, want one naming the expression", spec, err)
		}
		if err := Validate(spec); err == nil {
			t.Errorf("Validate(%q) = nil", spec)
		}
	}
	if err := Validate(DefaultSpec); err != nil {
		t.Errorf("Validate(DefaultSpec) = %v", err)
	}
	if _, err := New(nil, Options{}); err == nil {
		t.Error("New(nil) = nil error")
	}
}

func TestInterval(t *testing.T) {
	from := time.Date(2026, 6, 1, 12, 0, 0, 0, time.UTC)
	for _, tc := range []struct {
		spec string
		want time.Duration
	}{
		{"", 24 * time.Hour},
		{"15 3 * * *", 24 * time.Hour},
		{"0 */6 * * *", 6 * time.Hour},
		{"@every 90m", 90 * time.Minute},
		{"0 4 * * 1", 7 * 24 * time.Hour},
	} {
		got, err := Interval(tc.spec, time.UTC, from)
		if err != nil || got != tc.want {
			t.Errorf("Interval(%q) = %v, %v; want %v", tc.spec, got, err, tc.want)
		}
	}
}

func TestStopBeforeStartAndTwice(t *testing.T) {
	s, _ := New(func(context.Context) error { return nil }, Options{})
	if err := s.Stop(t.Context()); err != nil {
		t.Fatal(err)
	}
	s.Start(t.Context()) // refused after Stop
	if err := s.Stop(t.Context()); err != nil {
		t.Fatal(err)
	}
}

// Reschedule takes effect at once, with its own zone, without a restart:
// a nightly 03:15 UTC schedule becomes every six hours, then 01:00 in
// Tokyo (16:00 UTC the day before; JST is UTC+9, no summer time, tz
// database).
func TestReschedule(t *testing.T) {
	tokyo, err := time.LoadLocation("Asia/Tokyo")
	if err != nil {
		t.Skip("tz database not available:", err)
	}
	synctest.Test(t, func(t *testing.T) {
		var runs []time.Time
		var mu sync.Mutex
		s, err := New(func(ctx context.Context) error {
			mu.Lock()
			runs = append(runs, time.Now().UTC())
			mu.Unlock()
			return nil
		}, Options{Location: time.UTC})
		if err != nil {
			t.Fatal(err)
		}
		s.Start(t.Context())
		time.Sleep(4 * time.Hour) // 04:00: one run at 03:15
		synctest.Wait()
		if err := s.Reschedule("@every 6h", nil); err != nil {
			t.Fatal(err)
		}
		if s.Spec() != "@every 6h" {
			t.Errorf("Spec() = %q", s.Spec())
		}
		time.Sleep(13 * time.Hour) // 17:00: runs at 10:00 and 16:00
		synctest.Wait()
		if err := s.Reschedule("0 1 * * *", tokyo); err != nil {
			t.Fatal(err)
		}
		if got, want := s.Next(), time.Date(2000, 1, 2, 16, 0, 0, 0, time.UTC); !got.Equal(want) || got.Location() != tokyo {
			t.Errorf("Next() = %v, want %v in Tokyo", got, want)
		}
		time.Sleep(24 * time.Hour) // to 17:00 the next day: one run at 16:00 UTC
		synctest.Wait()
		if err := s.Reschedule("61 * * * *", nil); err == nil || s.Spec() != "0 1 * * *" {
			t.Errorf("a malformed expression: err %v, spec now %q", err, s.Spec())
		}
		s.Stop(t.Context())
		if err := s.Reschedule("@daily", nil); err == nil {
			t.Error("Reschedule after Stop accepted")
		}
		mu.Lock()
		defer mu.Unlock()
		day := time.Date(2000, 1, 1, 0, 0, 0, 0, time.UTC)
		want := []time.Time{day.Add(3*time.Hour + 15*time.Minute), day.Add(10 * time.Hour), day.Add(16 * time.Hour), day.Add(40 * time.Hour)}
		if len(runs) != len(want) {
			t.Fatalf("runs = %v, want %v", runs, want)
		}
		for i := range runs {
			if !runs[i].Equal(want[i]) {
				t.Errorf("run %d at %v, want %v", i, runs[i], want[i])
			}
		}
	})
}

// Next gives the run that is due, as /healthz's next_refresh and the log
// report it: for "@every" the interval after the last run began, not after
// the moment Next is asked (robfig/cron's ConstantDelaySchedule counts from
// the run, rounded down to the second).
func TestNextIsTheRunDue(t *testing.T) {
	synctest.Test(t, func(t *testing.T) {
		var runs atomic.Int32
		s, err := New(func(ctx context.Context) error { runs.Add(1); return nil }, Options{Spec: "@every 1h", Location: time.UTC})
		if err != nil {
			t.Fatal(err)
		}
		start := time.Now()
		if got, want := s.Next(), start.Add(time.Hour); !got.Equal(want) {
			t.Errorf("Next() before Start = %v, want %v", got, want)
		}
		s.Start(t.Context())
		time.Sleep(20 * time.Minute)
		synctest.Wait()
		if got, want := s.Next(), start.Add(time.Hour); !got.Equal(want) {
			t.Errorf("Next() 20 min after Start = %v, want %v (an hour after Start)", got, want)
		}
		time.Sleep(70 * time.Minute) // 01:30: one run at 01:00
		synctest.Wait()
		if got, want := s.Next(), start.Add(2*time.Hour); !got.Equal(want) || runs.Load() != 1 {
			t.Errorf("Next() at 01:30 = %v after %d runs, want %v after one", got, runs.Load(), want)
		}
		if err := s.Reschedule("45 * * * *", nil); err != nil {
			t.Fatal(err)
		}
		if got, want := s.Next(), start.Add(time.Hour+45*time.Minute); !got.Equal(want) {
			t.Errorf("Next() at 01:30 after Reschedule(\"45 * * * *\") = %v, want %v", got, want)
		}
		s.Stop(t.Context())
	})
}

// A nightly time the clocks skip still runs that night, moved by their jump,
// and a time they show twice runs once. Chile's clocks went from 00:00 to
// 01:00 on Sunday 15 October 2000 and back from 24:00 to 23:00 on Saturday 11
// March 2000 (tz database, rule Chile: "Oct Sun>=9 4:00u", "Mar Sun>=9 3:00u"):
// "@daily" in America/Santiago runs once on every date of 2000, on 15 October
// at 01:00 −03 (04:00 UTC), where robfig/cron alone leaves the date out.
func TestSkippedMidnightRuns(t *testing.T) {
	santiago, err := time.LoadLocation("America/Santiago")
	if err != nil {
		t.Skip("tz database not available:", err)
	}
	synctest.Test(t, func(t *testing.T) {
		var mu sync.Mutex
		runs := map[string][]time.Time{} // by local date
		s, err := New(func(ctx context.Context) error {
			mu.Lock()
			now := time.Now().In(santiago)
			runs[now.Format(time.DateOnly)] = append(runs[now.Format(time.DateOnly)], now)
			mu.Unlock()
			return nil
		}, Options{Spec: "@daily", Location: santiago})
		if err != nil {
			t.Fatal(err)
		}
		s.Start(t.Context())
		time.Sleep(time.Date(2001, 1, 1, 12, 0, 0, 0, time.UTC).Sub(time.Now()))
		synctest.Wait()
		s.Stop(t.Context())
		mu.Lock()
		defer mu.Unlock()
		for d := time.Date(2000, 1, 1, 0, 0, 0, 0, time.UTC); d.Year() == 2000; d = d.AddDate(0, 0, 1) {
			if date := d.Format(time.DateOnly); len(runs[date]) != 1 {
				t.Errorf("%s: %d runs %v, want 1", date, len(runs[date]), runs[date])
			}
		}
		if got, want := runs["2000-10-15"], time.Date(2000, 10, 15, 4, 0, 0, 0, time.UTC); len(got) != 1 || !got[0].Equal(want) {
			t.Errorf("15 October 2000: ran at %v, want %v (01:00 −03, moved by the jump)", got, want.In(santiago))
		}
	})
}

// The next run after a clock change, on both sides of it (tz database: in
// the EU the clocks go forward at 01:00 UTC on the last Sunday of March and
// back at 01:00 UTC on the last Sunday of October; in the US at 02:00 local
// on the first Sunday of November; Chile went from 00:00 to 01:00 on 5
// September 2027), and the same runs as robfig/cron on every other day.
func TestNextOnClocks(t *testing.T) {
	zone := func(name string) *time.Location {
		loc, err := time.LoadLocation(name)
		if err != nil {
			t.Skip("tz database not available:", err)
		}
		return loc
	}
	helsinki, newYork, santiago := zone("Europe/Helsinki"), zone("America/New_York"), zone("America/Santiago")
	lordHowe, nuuk := zone("Australia/Lord_Howe"), zone("America/Nuuk")
	utc := func(y int, mo time.Month, d, h, mi int) time.Time { return time.Date(y, mo, d, h, mi, 0, 0, time.UTC) }
	for _, tc := range []struct {
		spec string
		loc  *time.Location
		from time.Time
		want []time.Time // the next runs, one after the other
	}{
		// 03:15 does not exist on 28 March 2027 in Helsinki (03:00 EET is
		// 04:00 EEST): 04:15 EEST, 01:15 UTC.
		{"15 3 * * *", helsinki, utc(2027, 3, 27, 12, 0), []time.Time{utc(2027, 3, 28, 1, 15), utc(2027, 3, 29, 0, 15)}},
		// 03:15 comes twice on 31 October 2027 (04:00 EEST is 03:00 EET):
		// once, at the first (00:15 UTC).
		{"15 3 * * *", helsinki, utc(2027, 10, 30, 12, 0), []time.Time{utc(2027, 10, 31, 0, 15), utc(2027, 11, 1, 1, 15)}},
		// 01:30 comes twice on 7 November 2027 in New York: once, in EDT.
		{"30 1 * * *", newYork, utc(2027, 11, 6, 12, 0), []time.Time{utc(2027, 11, 7, 5, 30), utc(2027, 11, 8, 6, 30)}},
		// Midnight does not exist on 5 September 2027 in Santiago: 01:00 −03.
		{"0 0 * * *", santiago, utc(2027, 9, 4, 12, 0), []time.Time{utc(2027, 9, 5, 4, 0), utc(2027, 9, 6, 3, 0)}},
		// 23:30 does not exist on 27 March 2027 in Nuuk, whose clocks skip
		// 23:00–24:00 that Saturday (zdump -v -c 2027,2028 America/Nuuk:
		// 22:59:59 −02 at 00:59:59 UTC, 00:00 −01 on Sunday at 01:00 UTC):
		// 00:30 −01 on Sunday (01:30 UTC), then 23:30 −01.
		{"30 23 * * *", nuuk, utc(2027, 3, 27, 12, 0), []time.Time{utc(2027, 3, 28, 1, 30), utc(2027, 3, 29, 0, 30)}},
		// From 04:05 EEST on 28 March 2027 in Helsinki (01:05 UTC), after
		// the jump and before the 03:15 it moved: 04:15 EEST that night.
		{"15 3 * * *", helsinki, utc(2027, 3, 28, 1, 5), []time.Time{utc(2027, 3, 28, 1, 15), utc(2027, 3, 29, 0, 15)}},
		// Lord Howe Island's clocks go from 02:00 to 02:30 on 3 October 2027
		// (tz database, rule LH: "Oct Sun>=1 2:00 0:30"; 15:30 UTC): 02:15
		// runs at 02:45 +11 (15:45 UTC), from 02:35 +11 too.
		{"15 2 * * *", lordHowe, utc(2027, 10, 2, 12, 0), []time.Time{utc(2027, 10, 2, 15, 45), utc(2027, 10, 3, 15, 15)}},
		{"15 2 * * *", lordHowe, utc(2027, 10, 2, 15, 35), []time.Time{utc(2027, 10, 2, 15, 45)}},
		// From 01:10 EST on 7 November 2027 in New York (06:10 UTC), the
		// second showing of 01:00–02:00: every 5 minutes ran at the first
		// (EDT), the next run is 02:00 EST (07:00 UTC).
		{"*/5 * * * *", newYork, utc(2027, 11, 7, 6, 10), []time.Time{utc(2027, 11, 7, 7, 0), utc(2027, 11, 7, 7, 5)}},
	} {
		s, err := parser.Parse(tc.spec)
		if err != nil {
			t.Fatal(err)
		}
		at := tc.from
		for i, want := range tc.want {
			if at = nextOnClocks(s, tc.loc, at); !at.Equal(want) || at.Location() != tc.loc {
				t.Errorf("%q in %s after %v: run %d at %v, want %v", tc.spec, tc.loc, tc.from, i+1, at, want.In(tc.loc))
			}
		}
	}
	// Where no clock change is in the way, robfig/cron's own runs.
	vienna := zone("Europe/Vienna")
	for _, spec := range []string{"15 3 * * *", "0 */6 * * *", "0 4 * * 1", "@daily", "@every 90m"} {
		s, err := parser.Parse(spec)
		if err != nil {
			t.Fatal(err)
		}
		for _, loc := range []*time.Location{vienna, newYork, time.UTC} {
			for at := time.Date(2027, 1, 1, 0, 7, 0, 0, time.UTC); at.Year() == 2027; at = at.Add(5 * time.Hour) {
				if got, want := nextOnClocks(s, loc, at), s.Next(at.In(loc)); !got.Equal(want) {
					t.Errorf("%q in %s after %v: %v, robfig/cron %v", spec, loc, at, got, want)
				}
			}
		}
	}
}

// A run that Stop cancels (its bound reached while shutting down) is logged
// as stopped, at info level, not as a failed refresh.
func TestStoppedRunIsNotAFailure(t *testing.T) {
	synctest.Test(t, func(t *testing.T) {
		var buf bytes.Buffer
		var mu sync.Mutex
		log := slog.New(slog.NewTextHandler(&lockedWriter{w: &buf, mu: &mu}, nil))
		s := runningEveryMinute(t, t.Context(), func(ctx context.Context) error {
			<-ctx.Done()
			return fmt.Errorf("publish: %w", ctx.Err())
		}, log)
		ctx, cancel := context.WithTimeout(context.Background(), 10*time.Second)
		defer cancel()
		s.Stop(ctx)
		synctest.Wait() // the run returns and is logged
		mu.Lock()
		out := buf.String()
		mu.Unlock()
		if strings.Contains(out, "scheduled refresh failed") || !strings.Contains(out, `level=INFO msg="scheduled refresh stopped: shutting down"`) {
			t.Errorf("a run stopped by Stop logged as:\n%s", out)
		}
	})
}
