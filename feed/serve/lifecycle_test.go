package serve

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"log/slog"
	"net"
	"net/http"
	"strings"
	"sync"
	"sync/atomic"
	"testing"
	"testing/synctest"
	"time"

	"heliocal/feed/publish"
)

func listen(t testing.TB) net.Listener {
	t.Helper()
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	return ln
}

// waitHealthy polls /healthz until it answers 200. Each poll is a real round
// trip to the server; nothing sleeps.
func waitHealthy(t *testing.T, base string) {
	t.Helper()
	for {
		r, err := http.Get(base + "/healthz")
		if err == nil {
			io.Copy(io.Discard, r.Body)
			r.Body.Close()
			if r.StatusCode == 200 {
				return
			}
		}
		if t.Context().Err() != nil {
			t.Fatal("server never became healthy")
		}
	}
}

// TestGracefulShutdown: cancelling Run's context while a request is in
// flight lets that request finish with its whole body, then Run returns nil.
func TestGracefulShutdown(t *testing.T) {
	entered := make(chan struct{})
	release := make(chan struct{})
	reg := NewRegistry()
	s, err := New(Options{
		Build:   func(context.Context, GzipFunc) (*publish.Bundle, error) { return testBundle("a"), nil },
		Logger:  quiet(),
		Metrics: reg,
		Adhoc: writes(func(ctx context.Context, q AdhocQuery) ([]byte, error) {
			close(entered)
			<-release
			return adhocBytes(ctx, q)
		}),
	})
	if err != nil {
		t.Fatal(err)
	}
	ln := listen(t)
	base := "http://" + ln.Addr().String()
	ctx, cancel := context.WithCancel(t.Context())
	runErr := make(chan error, 1)
	go func() { runErr <- s.Run(ctx, ln) }()
	waitHealthy(t, base)

	type result struct {
		code int
		body string
		err  error
	}
	inflight := make(chan result, 1)
	go func() {
		r, err := http.Get(base + "/at.ics?lat=52.1&lon=5.2&tz=Europe/Amsterdam&kinds=sunrise&start=2026-06-01&days=60")
		if err != nil {
			inflight <- result{err: err}
			return
		}
		b, err := io.ReadAll(r.Body)
		r.Body.Close()
		inflight <- result{r.StatusCode, string(b), err}
	}()
	<-entered
	cancel() // SIGTERM
	// Run must not return while the request is in flight.
	select {
	case err := <-runErr:
		t.Fatalf("Run returned %v with a request in flight", err)
	default:
	}
	close(release)
	res := <-inflight
	if res.err != nil || res.code != 200 {
		t.Fatalf("in-flight request: %d %v", res.code, res.err)
	}
	q, _ := parseAdhoc("lat=52.1&lon=5.2&tz=Europe/Amsterdam&kinds=sunrise&start=2026-06-01&days=60", time.Now(), s.limits)
	want, _ := adhocBytes(context.Background(), q)
	if res.body != string(want) {
		t.Error("in-flight request got a partial body")
	}
	if err := <-runErr; err != nil {
		t.Fatalf("Run = %v, want nil after a graceful shutdown", err)
	}
	if _, err := http.Get(base + "/healthz"); err == nil {
		t.Error("server still accepts connections after shutdown")
	}
}

// TestRunServesBeforeFirstBuild: the listener answers at once; /healthz is
// 503 until a build succeeds, then 200.
func TestRunServesBeforeFirstBuild(t *testing.T) {
	gate := make(chan struct{})
	reg := NewRegistry()
	s, err := New(Options{
		Build: func(ctx context.Context, _ GzipFunc) (*publish.Bundle, error) {
			select {
			case <-gate:
				return testBundle("a"), nil
			case <-ctx.Done():
				return nil, ctx.Err()
			}
		},
		Logger: quiet(), Metrics: reg,
	})
	if err != nil {
		t.Fatal(err)
	}
	ln := listen(t)
	base := "http://" + ln.Addr().String()
	ctx, cancel := context.WithCancel(t.Context())
	runErr := make(chan error, 1)
	go func() { runErr <- s.Run(ctx, ln) }()
	r, err := http.Get(base + "/healthz")
	if err != nil {
		t.Fatal(err)
	}
	r.Body.Close()
	if r.StatusCode != 503 {
		t.Errorf("healthz during the first build: %d, want 503", r.StatusCode)
	}
	close(gate)
	waitHealthy(t, base)
	cancel()
	if err := <-runErr; err != nil {
		t.Fatal(err)
	}
	if err := s.Run(t.Context(), listen(t)); err == nil {
		t.Error("second Run accepted")
	}
}

// TestInitialBuildRetries: while no build has succeeded, builds are retried
// with doubling waits (on synctest's fake clock: no real waiting).
func TestInitialBuildRetries(t *testing.T) {
	synctest.Test(t, func(t *testing.T) {
		var attempts []time.Duration
		start := time.Now()
		var n atomic.Int32
		reg := NewRegistry()
		s, err := New(Options{
			Build: func(context.Context, GzipFunc) (*publish.Bundle, error) {
				attempts = append(attempts, time.Since(start))
				if n.Add(1) < 5 {
					return nil, errors.New("config: sites[0]: unreadable")
				}
				return testBundle("a"), nil
			},
			Logger: quiet(), Metrics: reg,
			RetryMin: 10 * time.Second, RetryMax: 30 * time.Second,
		})
		if err != nil {
			t.Fatal(err)
		}
		s.initialBuild(t.Context())
		want := []time.Duration{0, 10 * time.Second, 30 * time.Second, 60 * time.Second, 90 * time.Second}
		if len(attempts) != len(want) {
			t.Fatalf("attempts at %v, want %v", attempts, want)
		}
		for i := range want {
			if attempts[i] != want[i] {
				t.Errorf("attempt %d at %v, want %v", i, attempts[i], want[i])
			}
		}
		if s.snap.Load() == nil {
			t.Error("no bundle after a successful retry")
		}
		s.initialBuild(t.Context()) // already built: returns without building
		if len(attempts) != 5 {
			t.Error("built again although a bundle is served")
		}
	})
}

// TestRunStopsOnRefusedFeed: a first build that fails because a feed is
// over its size limit under oversize: fail is not retried (no retry mends
// it): Run shuts down and returns the error, as publish stops with it,
// instead of answering 503 "failing" for ever. A build failing otherwise
// is still retried (TestInitialBuildRetries).
func TestRunStopsOnRefusedFeed(t *testing.T) {
	var n atomic.Int32
	refusal := &publish.OversizeError{Feed: "plot-sun", Bytes: 1_200_000, Limit: 1_000_000}
	s, err := New(Options{
		Build: func(context.Context, GzipFunc) (*publish.Bundle, error) {
			n.Add(1)
			return nil, fmt.Errorf("publish: feed plot-sun: %w", refusal)
		},
		Logger: quiet(), Metrics: NewRegistry(),
	})
	if err != nil {
		t.Fatal(err)
	}
	err = s.Run(t.Context(), listen(t))
	var oe *publish.OversizeError
	if !errors.As(err, &oe) || oe != refusal || !strings.Contains(err.Error(), "plot-sun: 1.2 MB, over service.max_feed_bytes (1 MB)") {
		t.Errorf("Run = %v, want the refusal naming the feed and its size", err)
	}
	if got := n.Load(); got != 1 {
		t.Errorf("%d builds, want 1 (no retry)", got)
	}
}

// TestScheduledRefresh: the refresh runs on the cron schedule, on the fake
// clock, and a failing one keeps the feeds.
func TestScheduledRefresh(t *testing.T) {
	synctest.Test(t, func(t *testing.T) {
		b := &builder{b: testBundle("a")}
		reg := NewRegistry()
		s, err := New(Options{Build: b.build, Logger: quiet(), Metrics: reg,
			Schedule: "15 3 * * *", ScheduleZone: time.UTC})
		if err != nil {
			t.Fatal(err)
		}
		if err := s.Refresh(t.Context()); err != nil {
			t.Fatal(err)
		}
		if want := time.Date(2000, 1, 1, 3, 15, 0, 0, time.UTC); !s.NextRefresh().Equal(want) {
			t.Errorf("NextRefresh %v, want %v", s.NextRefresh(), want)
		}
		s.sched.Start(t.Context())
		b.set(testBundle("b"), nil)
		time.Sleep(4 * time.Hour)
		synctest.Wait()
		if got := body(t, get(t, s.Handler(), "GET", "/")); got != string(testBundle("b").File("index.html").Data) {
			t.Errorf("after the 03:15 refresh: %q", got)
		}
		b.set(nil, errors.New("catalogue: out of range"))
		time.Sleep(24 * time.Hour)
		synctest.Wait()
		if got := body(t, get(t, s.Handler(), "GET", "/")); got != string(testBundle("b").File("index.html").Data) {
			t.Errorf("after a failed refresh: %q", got)
		}
		s.sched.Stop(t.Context())
		if b.calls != 3 {
			t.Errorf("builds %d, want 3 (manual, two scheduled)", b.calls)
		}
	})
}

// A build cut short by the shutdown (SIGTERM during the first build, or
// during a reload's) is logged as stopped, at info level, not as a failed
// refresh or a refused reload: an operator alerting on errors is not paged
// by a restart. It is not counted among the failures either.
func TestShutdownStopsBuildQuietly(t *testing.T) {
	var logged bytes.Buffer
	var mu sync.Mutex
	entered := make(chan struct{}, 2)
	reg := NewRegistry()
	s, err := New(Options{
		Build: func(ctx context.Context, _ GzipFunc) (*publish.Bundle, error) {
			entered <- struct{}{}
			<-ctx.Done()
			return nil, fmt.Errorf("publish: %w", ctx.Err())
		},
		Logger:  slog.New(slog.NewTextHandler(&lockedBuf{b: &logged, mu: &mu}, nil)),
		Metrics: reg,
	})
	if err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancel(t.Context())
	runErr := make(chan error, 1)
	go func() { runErr <- s.Run(ctx, listen(t)) }()
	<-entered
	reload := make(chan error, 1)
	go func() {
		reload <- s.Reload(ctx, func(ctx context.Context, _ GzipFunc) (*publish.Bundle, error) {
			return nil, fmt.Errorf("publish: %w", ctx.Err())
		})
	}()
	cancel() // SIGTERM
	if err := <-runErr; err != nil {
		t.Fatalf("Run = %v, want nil", err)
	}
	if err := <-reload; !errors.Is(err, context.Canceled) {
		t.Errorf("Reload = %v, want the cancellation", err)
	}
	mu.Lock()
	out := logged.String()
	mu.Unlock()
	if strings.Contains(out, "level=ERROR") || strings.Contains(out, "level=WARN") {
		t.Errorf("a shutdown during a build logged an error:\n%s", out)
	}
	if !strings.Contains(out, `level=INFO msg="refresh stopped: shutting down" trigger=initial`) {
		t.Errorf("log does not say the first build was stopped:\n%s", out)
	}
	metrics := body(t, get(t, s.Handler(), "GET", "/metrics"))
	for _, want := range []string{
		`heliocal_refreshes_total{result="failure",trigger="initial"} 0`,
		`heliocal_refreshes_total{result="failure",trigger="reload"} 0`,
		`heliocal_reloads_refused_total 0`,
	} {
		if !strings.Contains(metrics, want) {
			t.Errorf("/metrics lacks %s", want)
		}
	}
}

// A scheduled refresh that the shutdown cuts short (Stop's bound reached
// while it runs) is logged once, by the scheduler, as stopped: not once
// more by the server, and never as a failure.
func TestShutdownStopsScheduledRefreshOnce(t *testing.T) {
	synctest.Test(t, func(t *testing.T) {
		var logged bytes.Buffer
		var mu sync.Mutex
		running := make(chan struct{}, 1)
		first := true
		s, err := New(Options{
			Build: func(ctx context.Context, gzip GzipFunc) (*publish.Bundle, error) {
				if first {
					first = false
					return heldBy(testBundle("a"), gzip), nil
				}
				running <- struct{}{}
				<-ctx.Done()
				return nil, fmt.Errorf("publish: %w", ctx.Err())
			},
			Logger:   slog.New(slog.NewTextHandler(&lockedBuf{b: &logged, mu: &mu}, nil)),
			Metrics:  NewRegistry(),
			Schedule: "15 3 * * *", ScheduleZone: time.UTC,
		})
		if err != nil {
			t.Fatal(err)
		}
		if err := s.Refresh(t.Context()); err != nil {
			t.Fatal(err)
		}
		s.sched.Start(t.Context())
		time.Sleep(4 * time.Hour) // past 03:15
		<-running
		ctx, cancel := context.WithTimeout(t.Context(), time.Second)
		defer cancel()
		if err := s.sched.Stop(ctx); !errors.Is(err, context.DeadlineExceeded) {
			t.Errorf("Stop = %v, want its bound reached", err)
		}
		synctest.Wait() // the run returns and is logged
		mu.Lock()
		out := logged.String()
		mu.Unlock()
		if n := strings.Count(out, "refresh stopped"); n != 1 || strings.Contains(out, "level=ERROR") {
			t.Errorf("%d records of the stopped refresh, want 1, and no error:\n%s", n, out)
		}
	})
}
