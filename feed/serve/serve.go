// Package serve serves heliocal's feeds over HTTP: the index page, every
// feed's .ics file, feeds.json, ad-hoc feeds for any place, /healthz and
// /metrics. It holds the rendered publish.Bundle behind an atomic pointer and
// swaps it whole after each rebuild, so a request never sees a half-built
// feed; a failed rebuild keeps the last good one.
//
// The package builds nothing itself: the command line injects the full
// rebuild (Options.Build) and the ad-hoc builder (Options.Adhoc).
//
// Routes (GET and HEAD only; anything else is 405 with an Allow header):
//
//	/, /index.html     the bundle's index.html
//	/<id>.ics          a feed, at the published directory's layout (the address
//	                   the pages and feeds.json give); also at /feeds/<id>.ics
//	/feeds.json        the list of feeds (the bundle's, or one made from Bundle.Feeds)
//	/at.ics?…          an ad-hoc feed for any place (see AdhocQuery)
//	/healthz           JSON; 200 once feeds are served, 503 before the first good build
//	/metrics           Prometheus text format
//
// Files are served with a strong ETag (the quoted SHA-256 of the bytes, for
// an ad-hoc feed the 64-bit xxHash of its gzip form; the gzip form has its
// own, ending in -gz"), Last-Modified, Cache-Control
// public with max-age equal to the refresh interval (1 minute to 24 hours),
// Vary: Accept-Encoding, and Access-Control-Allow-Origin: * on .ics and
// .json. Conditional requests (If-None-Match, If-Modified-Since), HEAD and
// Range are answered by http.ServeContent. Gzip bytes are computed once per
// file when a bundle is swapped in, never per request.
package serve

import (
	"context"
	"errors"
	"fmt"
	"io"
	"log/slog"
	"net"
	"net/http"
	"runtime"
	"runtime/debug"
	"sync"
	"sync/atomic"
	"time"

	"heliocal/config"
	"heliocal/feed/publish"
	"heliocal/internal/schedule"
	"heliocal/internal/stopped"
)

// BuildFunc renders every configured feed. It must not modify a Bundle it
// has returned before. It is given the server's GzipFunc, to render with as
// publish.RenderOptions.Gzip.
type BuildFunc func(ctx context.Context, gzip GzipFunc) (*publish.Bundle, error)

// GzipFunc is publish.RenderOptions.Gzip as the server gives it to a
// BuildFunc: each feed is compressed as soon as it is rendered (or its gzip
// form taken from the feeds served, when their bytes are the same) and
// held in that form alone, so that a build never holds every feed's bytes
// at once. A Bundle rendered without it is served all the same: the server
// compresses its files then. For a file held in its gzip form alone the
// server takes the Checksum the bundle states, and the Bytes of the feed
// whose File it is (Bundle.Feeds), unable to hash or count bytes it does
// not hold: a File.Gzip is the GzipFunc's result for the file, never a
// form made otherwise.
type GzipFunc func(f *publish.File) []byte

// AdhocFunc renders one ad-hoc feed for a validated query: it writes the
// .ics bytes to w, best in pieces as they are rendered (the server
// compresses each as it comes, and never needs the feed whole); w never
// fails and must not be kept. An error that is (or wraps) a *QueryError is
// reported to the client as a 400 with its message; any other error is a
// 500, and what was written is dropped.
type AdhocFunc func(ctx context.Context, q AdhocQuery, w io.Writer) error

// Defaults of Options.
const (
	DefaultAdhocMaxDays      = 400
	DefaultAdhocDefaultDays  = 365
	DefaultAdhocCacheEntries = 256
	DefaultAdhocCacheBytes   = 64 << 20
	DefaultAdhocTimeout      = 30 * time.Second
	// DefaultAdhocMaxBytes: some web calendars are reported to drop
	// subscriptions over about 1 MB (about 1,300 to 2,000 events).
	DefaultAdhocMaxBytes     = 1_000_000
	DefaultAdhocMinYear      = 1800
	DefaultAdhocMaxYear      = 2200
	DefaultReadHeaderTimeout = 5 * time.Second
	DefaultReadTimeout       = 10 * time.Second
	DefaultWriteTimeout      = 60 * time.Second
	DefaultIdleTimeout       = 120 * time.Second
	DefaultMaxHeaderBytes    = 16 << 10
	DefaultShutdownTimeout   = 20 * time.Second
	DefaultRetryMin          = 10 * time.Second
	DefaultRetryMax          = 5 * time.Minute

	// Cache-Control max-age is the refresh interval, kept within these.
	minMaxAge = time.Minute
	maxMaxAge = 24 * time.Hour
)

// Options configure a Server. Build is required; every other zero value
// means the documented default.
type Options struct {
	// Logger receives lifecycle and error messages; nil discards them.
	Logger *slog.Logger
	// AccessLogger receives one line per request at info level; nil means
	// Logger. Give a logger whose handler discards to turn access logs off.
	AccessLogger *slog.Logger

	// Metrics is where the server's metrics go and what /metrics shows
	// (make it with NewRegistry; one server per registry). Nil: a private
	// registry with the process's and the Go runtime's metrics as well.
	Metrics *Registry

	// Build renders every feed; called at start, on schedule and by Refresh.
	Build BuildFunc

	// Version and Revision label the heliocal_build_info metric: the
	// program's version and its VCS revision (either may be empty).
	Version, Revision string

	// BaseURL is the public URL the server is reached at; empty: links are
	// made absolute from each request's Host. TrustedProxies are the
	// proxies (IPs or CIDR prefixes) whose X-Forwarded-Host and
	// X-Forwarded-Proto are believed then. SetPublic changes both.
	BaseURL        string
	TrustedProxies []string

	// Preview computes the calendar of an ad-hoc query for the builder page
	// (/), its preview (/at.json) and the day-by-day table (/at); nil turns
	// them off: / is then the bundle's index.html.
	Preview PreviewFunc
	// Page is what the served page shows beside the builder (SetPage
	// changes it).
	Page PageInfo

	// Adhoc renders an ad-hoc feed; nil turns the ad-hoc route off (404).
	Adhoc AdhocFunc
	// ParseKind validates one event kind of the ad-hoc "kinds" parameter
	// and returns its canonical spelling; nil means the configuration's
	// vocabulary (config.ParseKind). Its error message becomes the 400
	// response, after the parameter and value.
	ParseKind func(kind string) (string, error)
	// AdhocDefaultKinds are used when the query has no "kinds"; empty makes
	// the parameter required. Each must pass ParseKind.
	AdhocDefaultKinds []string
	AdhocMaxDays      int           // longest window, default 400
	AdhocDefaultDays  int           // window without "days", default 365
	AdhocMinYear      int           // earliest year of a window, default 1800 (the supported range)
	AdhocMaxYear      int           // latest year of a window, default 2200 (the supported range)
	AdhocCacheEntries int           // cached ad-hoc feeds, default 256
	AdhocCacheBytes   int           // and their total size, default 64 MiB
	AdhocConcurrency  int           // ad-hoc builds at once, default GOMAXPROCS
	AdhocTimeout      time.Duration // one ad-hoc build, default 30s
	// AdhocMaxBytes is the largest ad-hoc feed served; a larger one is
	// refused with a 400 that states the limit (and the refusal is cached
	// like a feed). Zero means DefaultAdhocMaxBytes.
	AdhocMaxBytes int

	// Schedule is the refresh's cron expression (default "15 3 * * *") read
	// in ScheduleZone (nil: the server's zone).
	Schedule     string
	ScheduleZone *time.Location
	// RefreshInterval sets Cache-Control max-age (kept within 1m..24h);
	// zero means the schedule's interval.
	RefreshInterval time.Duration
	// RetryMin and RetryMax bound the back-off between attempts while no
	// build has ever succeeded (default 10s doubling up to 5m).
	RetryMin, RetryMax time.Duration

	// HTTP server limits (see net/http.Server); zero means the default.
	ReadHeaderTimeout time.Duration // 5s
	ReadTimeout       time.Duration // 10s
	WriteTimeout      time.Duration // 60s
	IdleTimeout       time.Duration // 120s
	MaxHeaderBytes    int           // 16 KiB
	// ShutdownTimeout bounds the graceful shutdown: in-flight requests and a
	// running refresh get this long to finish (default 20s).
	ShutdownTimeout time.Duration
}

// Server serves the feeds. Create it with New, then call Run.
type Server struct {
	opts     Options
	log      *slog.Logger
	access   *slog.Logger
	registry *Registry
	metrics  *metrics
	sched    *schedule.Scheduler
	handler  http.Handler
	limits   *adhocLimits
	cache    *adhocCache
	refused  *adhocCache // ad-hoc queries whose feed is over AdhocMaxBytes: the 400's message
	adhocSem chan struct{}
	flights  flightGroup

	cacheControl atomic.Pointer[[]string] // the Cache-Control header, from the refresh interval
	snap         atomic.Pointer[snapshot]
	public       publicHolder             // how links name the server (SetPublic)
	pageInfo     atomic.Pointer[PageInfo] // what the served page says (SetPage)
	now          func() time.Time         // time.Now; tests fix "today"

	buildMu sync.Mutex // serialises builds, so an older build never overwrites a newer one
	build   BuildFunc  // guarded by buildMu

	healthMu    sync.Mutex
	lastAttempt time.Time
	lastSuccess time.Time
	lastErr     error
	// reloadErr is why the last configuration reload did not take effect
	// (nil once a reload has succeeded); reloadAt is when it was refused;
	// reloadBuild says that the new configuration was valid but its feeds
	// did not build.
	reloadErr   error
	reloadAt    time.Time
	reloadBuild bool

	runMu   sync.Mutex
	running bool
}

// New checks opts and returns a Server. It builds nothing yet.
func New(opts Options) (*Server, error) {
	if opts.Build == nil {
		return nil, errors.New("serve: Options.Build is required")
	}
	if opts.ParseKind == nil {
		opts.ParseKind = parseKind
	}
	setDefault(&opts.AdhocMaxDays, DefaultAdhocMaxDays)
	setDefault(&opts.AdhocDefaultDays, min(DefaultAdhocDefaultDays, opts.AdhocMaxDays))
	setDefault(&opts.AdhocMinYear, DefaultAdhocMinYear)
	setDefault(&opts.AdhocMaxYear, DefaultAdhocMaxYear)
	setDefault(&opts.AdhocCacheEntries, DefaultAdhocCacheEntries)
	setDefault(&opts.AdhocCacheBytes, DefaultAdhocCacheBytes)
	setDefault(&opts.AdhocConcurrency, runtime.GOMAXPROCS(0))
	setDefault(&opts.AdhocTimeout, DefaultAdhocTimeout)
	setDefault(&opts.AdhocMaxBytes, DefaultAdhocMaxBytes)
	setDefault(&opts.RetryMin, DefaultRetryMin)
	setDefault(&opts.RetryMax, DefaultRetryMax)
	setDefault(&opts.ReadHeaderTimeout, DefaultReadHeaderTimeout)
	setDefault(&opts.ReadTimeout, DefaultReadTimeout)
	setDefault(&opts.WriteTimeout, DefaultWriteTimeout)
	setDefault(&opts.IdleTimeout, DefaultIdleTimeout)
	setDefault(&opts.MaxHeaderBytes, DefaultMaxHeaderBytes)
	setDefault(&opts.ShutdownTimeout, DefaultShutdownTimeout)
	switch {
	case opts.AdhocDefaultDays < 1 || opts.AdhocDefaultDays > opts.AdhocMaxDays:
		return nil, fmt.Errorf("serve: Options.AdhocDefaultDays %d must be within 1..AdhocMaxDays (%d)", opts.AdhocDefaultDays, opts.AdhocMaxDays)
	case opts.AdhocMinYear > opts.AdhocMaxYear:
		return nil, fmt.Errorf("serve: Options.AdhocMinYear %d is after AdhocMaxYear %d", opts.AdhocMinYear, opts.AdhocMaxYear)
	case opts.RetryMin > opts.RetryMax:
		return nil, fmt.Errorf("serve: Options.RetryMin %v is longer than RetryMax %v", opts.RetryMin, opts.RetryMax)
	}

	s := &Server{opts: opts, build: opts.Build, now: time.Now}
	s.log = opts.Logger
	if s.log == nil {
		s.log = slog.New(slog.DiscardHandler)
	}
	s.access = opts.AccessLogger
	if s.access == nil {
		s.access = s.log
	}

	var err error
	if s.registry, err = registry(opts.Metrics); err != nil {
		return nil, err
	}
	if s.metrics, err = newMetrics(s.registry); err != nil {
		return nil, err
	}
	if err := registerBuildInfo(s.registry, opts.Version, opts.Revision); err != nil {
		return nil, err
	}

	s.sched, err = schedule.New(func(ctx context.Context) error {
		return s.refresh(ctx, triggerSchedule, nil)
	}, schedule.Options{Spec: opts.Schedule, Location: opts.ScheduleZone, Logger: s.log})
	if err != nil {
		return nil, fmt.Errorf("serve: Options.Schedule: %w", err)
	}
	s.setCacheControl()
	if err := s.SetPublic(opts.BaseURL, opts.TrustedProxies); err != nil {
		return nil, err
	}
	s.SetPage(opts.Page)

	s.limits = &adhocLimits{
		parseKind:   opts.ParseKind,
		maxDays:     opts.AdhocMaxDays,
		defaultDays: opts.AdhocDefaultDays,
		minYear:     opts.AdhocMinYear,
		maxYear:     opts.AdhocMaxYear,
		zones:       &zoneCache{},
	}
	if len(opts.AdhocDefaultKinds) > 0 {
		joined := ""
		for i, k := range opts.AdhocDefaultKinds {
			if i > 0 {
				joined += ","
			}
			joined += k
		}
		if s.limits.defaultKinds, err = parseKinds(joined, opts.ParseKind); err != nil {
			return nil, fmt.Errorf("serve: Options.AdhocDefaultKinds: %w", err)
		}
	}
	s.cache = newAdhocCache(opts.AdhocCacheEntries, opts.AdhocCacheBytes)
	s.refused = newAdhocCache(opts.AdhocCacheEntries, opts.AdhocCacheEntries*1024)
	s.adhocSem = make(chan struct{}, opts.AdhocConcurrency)
	s.handler = s.newHandler()
	return s, nil
}

// parseKind is the default Options.ParseKind: the configuration file's kind
// vocabulary, in its canonical written form.
func parseKind(s string) (string, error) {
	k, err := config.ParseKind(s)
	if err != nil {
		return "", err
	}
	return k.String(), nil
}

func setDefault[T int | time.Duration](p *T, v T) {
	if *p <= 0 {
		*p = v
	}
}

// setCacheControl sets Cache-Control max-age to the refresh interval
// (Options.RefreshInterval, else the schedule's), kept within 1m..24h.
func (s *Server) setCacheControl() {
	interval := s.opts.RefreshInterval
	if interval <= 0 {
		interval, _ = schedule.Interval(s.sched.Spec(), s.sched.Location(), time.Now()) // spec already checked
	}
	interval = min(max(interval, minMaxAge), maxMaxAge)
	h := hdr(fmt.Sprintf("public, max-age=%d", int(interval.Seconds())))
	s.cacheControl.Store(&h)
}

// Reschedule changes the refresh schedule (a cron expression, read in loc;
// nil means the server's zone) while the server runs, as after a reload of
// a configuration with a new refresh setting: the next refresh follows the
// new expression, and Cache-Control follows its interval. A malformed
// expression is an error and changes nothing.
func (s *Server) Reschedule(spec string, loc *time.Location) error {
	if err := s.sched.Reschedule(spec, loc); err != nil {
		return fmt.Errorf("serve: %w", err)
	}
	s.setCacheControl()
	s.log.Info("refresh schedule changed", "refresh", s.sched.Spec(), "zone", s.sched.Location().String(), "next_refresh", s.sched.Next())
	return nil
}

// Handler returns the HTTP handler, for tests or to mount elsewhere. It
// serves 503 until the first build has succeeded.
func (s *Server) Handler() http.Handler { return s.handler }

// NextRefresh returns when the scheduled refresh runs next.
func (s *Server) NextRefresh() time.Time { return s.sched.Next() }

// Refresh rebuilds every feed with the current build function and swaps the
// result in. On failure the served feeds are kept, and the error is logged,
// counted and shown on /healthz.
func (s *Server) Refresh(ctx context.Context) error {
	return s.refresh(ctx, triggerManual, nil)
}

// Reload rebuilds every feed with a new build function (the configuration
// was reloaded). Only if the build succeeds is its result served and the
// function kept for later refreshes; otherwise the old feeds and the old
// function stay, and the error is logged, counted and returned.
func (s *Server) Reload(ctx context.Context, build BuildFunc) error {
	if build == nil {
		return errors.New("serve: Reload: nil build function")
	}
	if err := s.refresh(ctx, triggerReload, build); err != nil {
		if !stopped.By(ctx, err) { // shutting down is not a refused reload
			s.refuseReload(err, true)
		}
		return err
	}
	s.healthMu.Lock()
	s.reloadErr, s.reloadAt = nil, time.Time{}
	s.healthMu.Unlock()
	return nil
}

// RefuseReload records a configuration reload that was refused before any
// build (the new file is invalid): it is counted in
// heliocal_reloads_refused_total, and /healthz reports "degraded" with err
// as the reason until a reload succeeds. The served feeds are not touched.
func (s *Server) RefuseReload(err error) { s.refuseReload(err, false) }

// refuseReload records a reload that did not take effect: refused before
// any build, or, with build, one whose feeds did not build.
func (s *Server) refuseReload(err error, build bool) {
	s.metrics.reloadsRefused.Inc()
	s.healthMu.Lock()
	s.reloadErr, s.reloadAt, s.reloadBuild = err, s.now(), build
	s.healthMu.Unlock()
}

// refresh runs a build (the current function, or next if non-nil) and swaps
// in its result.
func (s *Server) refresh(ctx context.Context, trigger string, next BuildFunc) (err error) {
	s.buildMu.Lock()
	defer s.buildMu.Unlock()
	build := s.build
	if next != nil {
		build = next
	}
	start := time.Now()
	snap, err := s.runBuild(ctx, build)
	d := time.Since(start)
	if stopped.By(ctx, err) {
		// Shutting down: the build was cut short, not failed, and its
		// feeds would not be served. Logged as what it is, not counted as
		// a failure, and the health of the feeds served is untouched.
		if trigger != triggerSchedule { // the scheduler logs its own runs
			s.log.Info("refresh stopped: shutting down", "trigger", trigger, "duration", d)
		}
		return err
	}
	s.metrics.refreshSeconds.Observe(d.Seconds())

	s.healthMu.Lock()
	s.lastAttempt = start
	s.lastErr = err
	if err == nil {
		s.lastSuccess = s.now()
	}
	s.healthMu.Unlock()

	if err != nil {
		s.metrics.refreshes.WithLabelValues(trigger, "failure").Inc()
		s.metrics.lastOK.Set(0)
		if trigger != triggerSchedule { // the scheduler logs its own runs
			msg := "refresh failed; serving the previous feeds"
			switch {
			case s.snap.Load() == nil: // the first build: there are none
				msg = "refresh failed; no feeds to serve yet"
			case trigger == triggerReload:
				msg = "reload failed: the new configuration's feeds did not build; still serving the previous feeds"
			}
			s.log.Error(msg, "trigger", trigger, "err", err, "duration", d)
		}
		return err
	}
	s.snap.Store(snap)
	s.cache.purge() // "today" has moved for ad-hoc feeds without a start
	s.refused.purge()
	if next != nil {
		s.build = next
	}
	s.metrics.refreshes.WithLabelValues(trigger, "success").Inc()
	s.metrics.lastOK.Set(1)
	s.metrics.lastSuccess.Set(float64(s.lastSuccessTime().UnixNano()) / 1e9)
	s.metrics.feeds.Set(float64(snap.feeds))
	s.metrics.events.Set(float64(snap.events))
	s.log.Info("feeds refreshed", "trigger", trigger, "feeds", snap.feeds, "events", snap.events,
		"files", len(snap.files), "duration", d)
	return nil
}

func (s *Server) lastSuccessTime() time.Time {
	s.healthMu.Lock()
	defer s.healthMu.Unlock()
	return s.lastSuccess
}

// runBuild calls build and prepares its bundle; a panic becomes an error.
func (s *Server) runBuild(ctx context.Context, build BuildFunc) (snap *snapshot, err error) {
	defer func() {
		if r := recover(); r != nil {
			s.log.Error("build panicked", "panic", fmt.Sprint(r), "stack", string(debug.Stack()))
			snap, err = nil, fmt.Errorf("serve: build panicked: %v", r)
		}
	}()
	prev := s.snap.Load()
	b, err := build(ctx, feedGzip(prev))
	if err != nil {
		return nil, err
	}
	return prepare(b, prev, time.Now())
}

// Run builds the feeds, serves HTTP on ln and refreshes on schedule until ctx
// is cancelled; then it shuts down gracefully: it stops accepting, lets
// in-flight requests and a running scheduled refresh finish within
// Options.ShutdownTimeout, stops the first build at once, and returns nil.
// If the first build fails the server still answers (503 on /healthz and
// the feed routes) and retries with back-off until a build succeeds; but if
// it fails because a feed is over its size limit under service.oversize:
// fail (*publish.OversizeError), which no retry mends, Run shuts down the
// same way and returns that error.
// Run closes ln. A Server runs once.
func (s *Server) Run(ctx context.Context, ln net.Listener) error {
	s.runMu.Lock()
	if s.running {
		s.runMu.Unlock()
		ln.Close()
		return errors.New("serve: Run called twice")
	}
	s.running = true
	s.runMu.Unlock()

	hs := &http.Server{
		Handler:           s.handler,
		ReadHeaderTimeout: s.opts.ReadHeaderTimeout,
		ReadTimeout:       s.opts.ReadTimeout,
		WriteTimeout:      s.opts.WriteTimeout,
		IdleTimeout:       s.opts.IdleTimeout,
		MaxHeaderBytes:    s.opts.MaxHeaderBytes,
		ErrorLog:          slog.NewLogLogger(s.log.Handler(), slog.LevelWarn),
		// Requests must outlive ctx: cancelling it starts the graceful
		// shutdown, which lets them finish.
		BaseContext: func(net.Listener) context.Context { return context.WithoutCancel(ctx) },
	}
	serveErr := make(chan error, 1)
	go func() { serveErr <- hs.Serve(ln) }()
	s.log.Info("serving", "addr", ln.Addr().String(), "next_refresh", s.sched.Next())

	buildCtx, cancelBuild := context.WithCancel(ctx)
	initialDone := make(chan struct{})
	refused := make(chan error, 1)
	go func() {
		defer close(initialDone)
		if err := s.initialBuild(buildCtx); err != nil {
			refused <- err
		}
	}()
	s.sched.Start(ctx)

	var runErr error
	select {
	case <-ctx.Done():
		s.log.Info("shutting down", "timeout", s.opts.ShutdownTimeout)
	case err := <-serveErr:
		runErr = fmt.Errorf("serve: %w", err)
		s.log.Error("server stopped", "err", err)
	case err := <-refused:
		runErr = err
		s.log.Error("the feeds cannot be built from this configuration; stopping", "err", err)
	}

	sctx, cancel := context.WithTimeout(context.WithoutCancel(ctx), s.opts.ShutdownTimeout)
	defer cancel()
	cancelBuild()
	schedDone := make(chan error, 1)
	go func() { schedDone <- s.sched.Stop(sctx) }()
	if err := hs.Shutdown(sctx); err != nil {
		hs.Close()
		runErr = errors.Join(runErr, fmt.Errorf("serve: graceful shutdown: %w", err))
	}
	if err := <-schedDone; err != nil {
		runErr = errors.Join(runErr, err)
	}
	<-initialDone
	if runErr == nil {
		s.log.Info("stopped")
	}
	return runErr
}

// ListenAndRun listens on the TCP address addr (e.g. ":8080") and calls Run.
func (s *Server) ListenAndRun(ctx context.Context, addr string) error {
	ln, err := net.Listen("tcp", addr)
	if err != nil {
		return fmt.Errorf("serve: listen: %w", err)
	}
	return s.Run(ctx, ln)
}

// initialBuild builds until one build has succeeded (here, on schedule or by
// Reload), waiting RetryMin, then twice as long each time up to RetryMax.
// A build that fails because a feed is over its size limit under
// service.oversize: fail (a *publish.OversizeError) is not retried, as
// no retry mends it: initialBuild returns the error, and Run stops with
// it, as publish does, unless feeds are served by then.
func (s *Server) initialBuild(ctx context.Context) error {
	wait := s.opts.RetryMin
	trigger := triggerInitial
	for {
		if s.snap.Load() != nil {
			return nil
		}
		err := s.refresh(ctx, trigger, nil)
		if err == nil || ctx.Err() != nil {
			return nil
		}
		var oe *publish.OversizeError
		if errors.As(err, &oe) && s.snap.Load() == nil {
			return err
		}
		s.log.Warn("no feeds to serve yet; retrying", "in", wait)
		t := time.NewTimer(wait)
		select {
		case <-ctx.Done():
			t.Stop()
			return nil
		case <-t.C:
		}
		wait = min(2*wait, s.opts.RetryMax)
	}
}
