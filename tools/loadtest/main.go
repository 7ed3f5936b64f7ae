// Command loadtest measures a heliocal server on this machine: requests per
// second for a cached feed, with and without conditional GET (If-None-Match,
// answered 304), and latency percentiles for ad-hoc one-year feeds.
//
// It only ever talks to loopback addresses (127.0.0.0/8, ::1, localhost):
// it is a measuring tool for the machine it runs on, never a load generator
// against someone else's server. Every run is bounded by a request count and
// a time limit.
//
// Usage, against a running `heliocal serve` (without --config or a
// heliocal.yaml it serves the built-in demo on :8080, whose feeds include
// fernhollow-sun.ics):
//
//	loadtest -feed http://127.0.0.1:8080/feeds/fernhollow-sun.ics \
//	         -adhoc 'http://127.0.0.1:8080/at.ics?lon=13.05&tz=Europe/Vienna&kinds=sunrise,sunset,civil-dawn,civil-dusk&days=365'
//
// or let it start the server and stop it afterwards:
//
//	loadtest -start 'heliocal serve --listen 127.0.0.1:18080' \
//	         -feed http://127.0.0.1:18080/feeds/fernhollow-sun.ics \
//	         -adhoc 'http://127.0.0.1:18080/at.ics?lon=13.05&tz=Europe/Vienna&kinds=sunrise,sunset,civil-dawn,civil-dusk&days=365'
//
// The ad-hoc URL must leave out lat: loadtest adds a different latitude to
// every request (from -lat upwards in steps of 0.001°), so each one misses
// the server's cache and measures a real build; -adhoc-cached repeats one
// query instead.
//
// -samples FILE writes every request of every run to FILE, one line each
// (tab-separated, with a header): its number, its connection, when it was
// sent (from the run's start; with -start, from the server's start, the
// clock of the server's GODEBUG=gctrace=1 lines; and in Unix microseconds,
// the clock of a runtime trace's clock snapshot) and how long it took,
// so that slow requests can be set beside the server's collections and
// whatever else happened at the time.
package main

import (
	"bufio"
	"cmp"
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"net"
	"net/http"
	"net/url"
	"os"
	"os/exec"
	"os/signal"
	"path/filepath"
	"runtime"
	"runtime/metrics"
	"slices"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"syscall"
	"time"

	"heliocal/internal/cputime"
)

func main() {
	if err := run(); err != nil {
		fmt.Fprintln(os.Stderr, "loadtest:", err)
		if errors.As(err, new(badInput)) {
			os.Exit(2)
		}
		os.Exit(1)
	}
}

// badInput is an error in the flags, which names the flag and its value:
// the exit status is 2, as for a flag the flag package cannot parse.
type badInput struct{ error }

// serverPID is the process started with -start, whose CPU time each run
// reports (0: unknown), and when it was started.
var (
	serverPID     int
	serverStarted time.Time
)

type config struct {
	feed, adhoc     string
	start           string
	concurrency     int
	adhocConc       int
	requests        int
	adhocRequests   int
	duration        time.Duration
	lat             float64
	adhocCached     bool
	startupDeadline time.Duration
	samples         string
}

func run() error {
	var c config
	flag.StringVar(&c.feed, "feed", "", "URL of a served feed (loopback only)")
	flag.StringVar(&c.adhoc, "adhoc", "", "ad-hoc feed URL without lat= (loopback only)")
	flag.StringVar(&c.start, "start", "", "command that starts the server (split on spaces); stopped with SIGTERM at the end")
	flag.IntVar(&c.concurrency, "c", 2*runtime.GOMAXPROCS(0), "concurrent connections for the feed runs")
	flag.IntVar(&c.adhocConc, "adhoc-c", runtime.GOMAXPROCS(0), "concurrent connections for the ad-hoc run")
	flag.IntVar(&c.requests, "n", 200000, "requests per feed run (at most)")
	flag.IntVar(&c.adhocRequests, "adhoc-n", 300, "requests in the ad-hoc run (at most)")
	flag.DurationVar(&c.duration, "d", 10*time.Second, "time limit of each run")
	flag.Float64Var(&c.lat, "lat", 47.0, "first latitude of the ad-hoc run")
	flag.BoolVar(&c.adhocCached, "adhoc-cached", false, "repeat one ad-hoc query (cache hits) instead of a new place per request")
	flag.DurationVar(&c.startupDeadline, "wait", 2*time.Minute, "how long to wait for a started server's /healthz")
	flag.StringVar(&c.samples, "samples", "", "write every request (number, connection, when sent, latency, status, bytes) to this file")
	flag.Parse()
	if c.feed == "" && c.adhoc == "" {
		return badInput{errors.New("nothing to measure: give -feed and/or -adhoc")}
	}
	for _, f := range [...]struct{ name, url string }{{"feed", c.feed}, {"adhoc", c.adhoc}} {
		if f.url == "" {
			continue
		}
		if err := loopbackOnly(f.url); err != nil {
			return badInput{fmt.Errorf("-%s: %w", f.name, err)}
		}
	}
	for _, f := range []struct {
		name  string
		bad   bool
		value any
	}{
		{"c", c.concurrency < 1, c.concurrency}, {"adhoc-c", c.adhocConc < 1, c.adhocConc},
		{"n", c.requests < 1, c.requests}, {"adhoc-n", c.adhocRequests < 1, c.adhocRequests},
		{"d", c.duration <= 0, c.duration},
	} {
		if f.bad {
			return badInput{fmt.Errorf("-%s %v: must be positive", f.name, f.value)}
		}
	}

	// The samples file is made before any request, so that a path that
	// cannot be written is said at once, not after the runs: as a temporary
	// file beside it, renamed to it once every run is done, so that a run
	// that fails leaves an earlier samples file as it was and no part of one.
	var samples *os.File
	if c.samples != "" {
		f, err := os.CreateTemp(filepath.Dir(c.samples), "."+filepath.Base(c.samples)+".*")
		if err != nil {
			return badInput{fmt.Errorf("-samples %s: %w", c.samples, err)}
		}
		f.Chmod(0o644) // as a file of its own (CreateTemp's is the owner's alone)
		defer func() {
			f.Close()
			os.Remove(f.Name()) // after the rename: nothing
		}()
		samples = f
	}

	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()

	if c.start != "" {
		target := c.feed
		if target == "" {
			target = c.adhoc
		}
		stopServer, err := startServer(ctx, c.start, target, c.startupDeadline)
		if err != nil {
			return err
		}
		defer stopServer()
	}

	fmt.Printf("loadtest: GOMAXPROCS=%d (client and server share this machine's CPUs)\n", runtime.GOMAXPROCS(0))
	var runs []*result
	if c.feed != "" {
		rs, err := measureFeed(ctx, c)
		if err != nil {
			return err
		}
		runs = append(runs, rs...)
	}
	if c.adhoc != "" {
		r, err := measureAdhoc(ctx, c)
		if err != nil {
			return err
		}
		runs = append(runs, r)
	}
	if samples != nil {
		if err := writeSamplesFile(samples, runs); err != nil {
			return fmt.Errorf("-samples %s: %w", c.samples, err)
		}
		if err := os.Rename(samples.Name(), c.samples); err != nil {
			return fmt.Errorf("-samples %s: %w", c.samples, err)
		}
	}
	return nil
}

// loopbackOnly refuses any URL whose host is not a loopback address.
func loopbackOnly(raw string) error {
	u, err := url.Parse(raw)
	if err != nil {
		return fmt.Errorf("url %q: %w", raw, err)
	}
	if u.Scheme != "http" {
		return fmt.Errorf("url %q: only http:// to a loopback address is measured", raw)
	}
	host := u.Hostname()
	if host == "localhost" {
		return nil
	}
	ip := net.ParseIP(host)
	if ip == nil || !ip.IsLoopback() {
		return fmt.Errorf("url %q: host %q is not a loopback address (127.0.0.1, ::1, localhost): loadtest measures this machine only", raw, host)
	}
	return nil
}

// newClient returns a client that keeps its one connection and leaves gzip
// bodies compressed (as a calendar client caching them would): the runs
// themselves go over rawLoad's connections.
func newClient() *http.Client {
	tr := &http.Transport{
		Proxy:               nil,
		DialContext:         loopbackDialer,
		MaxIdleConns:        1,
		MaxIdleConnsPerHost: 1,
		MaxConnsPerHost:     1,
		DisableCompression:  true,
		IdleConnTimeout:     30 * time.Second,
	}
	return &http.Client{Transport: tr, Timeout: 60 * time.Second,
		CheckRedirect: func(*http.Request, []*http.Request) error { return http.ErrUseLastResponse }}
}

// loopbackDialer checks the resolved address again: "localhost" must
// resolve to loopback too.
func loopbackDialer(ctx context.Context, network, addr string) (net.Conn, error) {
	var d net.Dialer
	conn, err := d.DialContext(ctx, network, addr)
	if err != nil {
		return nil, err
	}
	if ta, ok := conn.RemoteAddr().(*net.TCPAddr); !ok || !ta.IP.IsLoopback() {
		conn.Close()
		return nil, fmt.Errorf("refusing non-loopback peer %v", conn.RemoteAddr())
	}
	return conn, nil
}

// startServer runs cmdline and waits until /healthz on target's host says 200.
func startServer(ctx context.Context, cmdline, target string, wait time.Duration) (func(), error) {
	args := strings.Fields(cmdline)
	cmd := exec.Command(args[0], args[1:]...)
	cmd.Stdout = io.Discard
	logf, err := os.CreateTemp("", "loadtest-server-*.log")
	if err != nil {
		return nil, err
	}
	cmd.Stderr = logf
	if err := cmd.Start(); err != nil {
		return nil, fmt.Errorf("starting %q: %w", cmdline, err)
	}
	serverPID, serverStarted = cmd.Process.Pid, time.Now()
	stop := func() {
		cmd.Process.Signal(syscall.SIGTERM)
		cmd.Wait()
		logf.Close()
		fmt.Printf("loadtest: server stopped; its log is %s\n", logf.Name())
	}
	u, _ := url.Parse(target)
	health := u.Scheme + "://" + u.Host + "/healthz"
	client := newClient()
	deadline := time.Now().Add(wait)
	for {
		req, _ := http.NewRequestWithContext(ctx, "GET", health, nil)
		if r, err := client.Do(req); err == nil {
			io.Copy(io.Discard, r.Body)
			r.Body.Close()
			if r.StatusCode == 200 {
				return stop, nil
			}
		}
		if time.Now().After(deadline) || ctx.Err() != nil {
			stop()
			return nil, fmt.Errorf("server did not become healthy at %s within %v", health, wait)
		}
		select { // poll the server every 100 ms while it builds
		case <-ctx.Done():
		case <-time.After(100 * time.Millisecond):
		}
	}
}

// result of one run.
type result struct {
	name      string
	conns     int
	elapsed   time.Duration
	latencies []time.Duration
	statuses  map[int]int
	errors    int
	firstErr  error
	bytes     int64
	serverCPU time.Duration // CPU time the started server used during the run (0: unknown)
	serverRSS int64         // the started server's peak resident memory so far, bytes (0: unknown)
	clientCPU time.Duration // CPU time loadtest itself used
	clientGC  uint64        // collections of loadtest's own heap during the run
	serverGC  int           // collections of the server's heap during the run (-1: unknown)
	// the server's ad-hoc cache hits and misses during the run (-1: unknown)
	cacheHits, cacheMisses int
	wantMisses             bool      // every request is meant to miss the cache (a new place each)
	start                  time.Time // when the run started
	samples                []sample  // every request, for the slowest
}

// sample is one request: its number in the run, when it was sent and how
// long its response took, its connection (0 to conns-1), status and body
// bytes.
type sample struct {
	i      int
	sent   time.Time
	took   time.Duration
	conn   int
	status int
	bytes  int64
}

// slowest is how many of the slowest requests a run lists.
const slowest = 5

// slowestText lists the slowest requests of r, the slowest first, with
// when each was sent (from the start of the run): a slow start (a server
// still preparing) and slow moments later in the run tell apart.
func (r *result) slowestText() string {
	s := slices.Clone(r.samples)
	slices.SortStableFunc(s, func(a, b sample) int { return cmp.Compare(b.took, a.took) })
	var parts []string
	for _, x := range s[:min(slowest, len(s))] {
		parts = append(parts, fmt.Sprintf("#%d at %v: %v", x.i, x.sent.Sub(r.start).Round(time.Millisecond), x.took.Round(time.Microsecond)))
	}
	return strings.Join(parts, ", ")
}

func (r *result) print() {
	slices.Sort(r.latencies)
	n := len(r.latencies)
	fmt.Printf("\n%s\n", r.name)
	fmt.Printf("  connections %d, requests %d in %v, errors %d\n", r.conns, n, r.elapsed.Round(time.Millisecond), r.errors)
	if n == 0 {
		if r.firstErr != nil {
			fmt.Printf("  first error: %v\n", r.firstErr)
		}
		return
	}
	fmt.Printf("  throughput  %.0f req/s, %.1f MB/s\n", float64(n)/r.elapsed.Seconds(), float64(r.bytes)/r.elapsed.Seconds()/1e6)
	fmt.Printf("  latency     p50 %v  p90 %v  p99 %v  max %v\n",
		pct(r.latencies, 50), pct(r.latencies, 90), pct(r.latencies, 99), r.latencies[n-1].Round(time.Microsecond))
	if len(r.samples) > 0 {
		fmt.Printf("  slowest     %s\n", r.slowestText())
	}
	var codes []string
	for _, c := range slices.Sorted(mapKeys(r.statuses)) {
		codes = append(codes, fmt.Sprintf("%d×%d", c, r.statuses[c]))
	}
	fmt.Printf("  status      %s\n", strings.Join(codes, " "))
	// On a machine shared with other work, CPU time per request is steadier
	// than wall-clock rates: cores ÷ (server CPU per request) is the rate
	// the server could sustain with the machine to itself.
	if r.serverCPU > 0 {
		per := r.serverCPU / time.Duration(n)
		fmt.Printf("  server CPU  %v per request → about %.0f req/s per core\n", per, float64(time.Second)/float64(per))
	}
	if r.serverRSS > 0 {
		fmt.Printf("  server RSS  peak %.0f MB so far\n", float64(r.serverRSS)/1e6)
	}
	if r.serverGC >= 0 {
		fmt.Printf("  server GC   %d collections during the run\n", r.serverGC)
	}
	if r.cacheHits > 0 || r.cacheMisses > 0 {
		fmt.Printf("  server cache %d misses, %d hits (ad-hoc feeds)\n", r.cacheMisses, r.cacheHits)
		if r.wantMisses && r.cacheHits > 0 {
			fmt.Printf("  warning     %d requests were answered from the server's cache, which had these places already (an earlier run?): the figures above are not of builds; restart the server or start elsewhere with -lat\n", r.cacheHits)
		}
	}
	if r.clientCPU > 0 {
		fmt.Printf("  client CPU  %v per request, %d collections of its own heap\n", r.clientCPU/time.Duration(n), r.clientGC)
	}
	if r.firstErr != nil {
		fmt.Printf("  first error: %v\n", r.firstErr)
	}
}

func mapKeys(m map[int]int) func(func(int) bool) {
	return func(yield func(int) bool) {
		for k := range m {
			if !yield(k) {
				return
			}
		}
	}
}

func pct(sorted []time.Duration, p int) time.Duration {
	i := (len(sorted)*p + 99) / 100
	i = min(max(i-1, 0), len(sorted)-1)
	return sorted[i].Round(time.Microsecond)
}

// tally is what one connection of a run counted.
type tally struct {
	conn     int      // the connection's number in the run
	samples  []sample // every request answered, in the order sent
	statuses map[int]int
	errors   int
	firstErr error
	bytes    int64
}

// measure runs worker on conns goroutines, each with a tally of its own,
// and merges the tallies with the CPU time the server and this process
// used meanwhile.
func measure(name string, conns, n int, worker func(l *tally)) *result {
	locals := make([]tally, conns)
	var wg sync.WaitGroup
	cpu0, cpuOK := processCPU(serverPID)
	self0, gc0 := cputime.Used(), gcCycles()
	start := time.Now()
	for w := range conns {
		l := &locals[w]
		l.conn = w
		l.statuses = map[int]int{}
		l.samples = make([]sample, 0, n/conns+1)
		wg.Go(func() { worker(l) })
	}
	wg.Wait()
	r := &result{name: name, conns: conns, elapsed: time.Since(start), statuses: map[int]int{}, start: start}
	if cpu1, ok := processCPU(serverPID); ok && cpuOK {
		r.serverCPU = cpu1 - cpu0
	}
	r.clientCPU, r.clientGC = cputime.Used()-self0, gcCycles()-gc0
	r.serverRSS = processPeakRSS(serverPID)
	for _, l := range locals {
		for _, x := range l.samples {
			r.latencies = append(r.latencies, x.took)
		}
		r.samples = append(r.samples, l.samples...)
		for k, v := range l.statuses {
			r.statuses[k] += v
		}
		r.errors += l.errors
		r.bytes += l.bytes
		r.firstErr = firstError(r.firstErr, l.firstErr)
	}
	return r
}

// firstError is a, or b when a is nil.
func firstError(a, b error) error {
	if a != nil {
		return a
	}
	return b
}

// gcCycles is how many collections this process's heap has had.
func gcCycles() uint64 {
	s := []metrics.Sample{{Name: "/gc/cycles/total:gc-cycles"}}
	metrics.Read(s)
	if s[0].Value.Kind() != metrics.KindUint64 {
		return 0
	}
	return s[0].Value.Uint64()
}

// serverCounters are counters of the server's /metrics: its collections
// so far (go_gc_duration_seconds_count) and, from a heliocal server, its
// ad-hoc cache's hits and misses (heliocal_adhoc_cache_total).
type serverCounters struct {
	gc, hits, misses int
	cache            bool // the cache's counters were there
}

// serverCounts reads serverCounters from the server's /metrics; ok is false
// when it has none, or no collection count.
func serverCounts(ctx context.Context, host string) (c serverCounters, ok bool) {
	req, _ := http.NewRequestWithContext(ctx, "GET", "http://"+host+"/metrics", nil)
	resp, err := newClient().Do(req)
	if err != nil {
		return c, false
	}
	defer resp.Body.Close()
	if resp.StatusCode != 200 {
		return c, false
	}
	sc := bufio.NewScanner(resp.Body)
	sc.Buffer(nil, 1<<20)
	var hit, miss bool
	counters := []struct {
		prefix string
		dst    *int
		found  *bool
	}{
		{"go_gc_duration_seconds_count ", &c.gc, &ok},
		{`heliocal_adhoc_cache_total{result="hit"} `, &c.hits, &hit},
		{`heliocal_adhoc_cache_total{result="miss"} `, &c.misses, &miss},
	}
	for sc.Scan() {
		line := sc.Text()
		for _, m := range counters {
			if v, found := strings.CutPrefix(line, m.prefix); found {
				f, err := strconv.ParseFloat(strings.TrimSpace(v), 64)
				*m.dst, *m.found = int(f), err == nil
			}
		}
	}
	c.cache = hit && miss
	return c, ok
}

// writeSamplesFile writes every request of runs to f, the -samples file, and
// closes it.
func writeSamplesFile(f *os.File, runs []*result) error {
	w := bufio.NewWriter(f)
	writeSamples(w, runs, serverStarted)
	if err := w.Flush(); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}

// writeSamples writes the header and one line per request of runs, each
// run's requests in the order sent. server_s is when the request was sent
// in seconds from serverStarted (empty when that is zero: no -start).
func writeSamples(w io.Writer, runs []*result, serverStarted time.Time) {
	fmt.Fprintln(w, "run\tn\tconn\tsent_ms\tserver_s\tsent_unix_us\tlatency_ms\tstatus\tbytes")
	for k, r := range runs {
		s := slices.Clone(r.samples)
		slices.SortFunc(s, func(a, b sample) int { return a.sent.Compare(b.sent) })
		for _, x := range s {
			at := ""
			if !serverStarted.IsZero() {
				at = strconv.FormatFloat(x.sent.Sub(serverStarted).Seconds(), 'f', 4, 64)
			}
			fmt.Fprintf(w, "%d\t%d\t%d\t%.3f\t%s\t%d\t%.3f\t%d\t%d\n", k+1, x.i, x.conn,
				float64(x.sent.Sub(r.start))/1e6, at, x.sent.UnixMicro(), float64(x.took)/1e6, x.status, x.bytes)
		}
	}
}

// measureFeed: one warm-up GET for the ETag, then a run of full GETs
// (gzip accepted) and a run of conditional GETs.
func measureFeed(ctx context.Context, c config) ([]*result, error) {
	client := newClient()
	req, _ := http.NewRequestWithContext(ctx, "GET", c.feed, nil)
	req.Header.Set("Accept-Encoding", "gzip")
	resp, err := client.Do(req)
	if err != nil {
		return nil, fmt.Errorf("feed: %w", err)
	}
	size, _ := io.Copy(io.Discard, resp.Body)
	resp.Body.Close()
	if resp.StatusCode != 200 {
		return nil, fmt.Errorf("feed %s: status %d", c.feed, resp.StatusCode)
	}
	etag := resp.Header.Get("ETag")
	if etag == "" {
		return nil, fmt.Errorf("feed %s: no ETag: conditional GET cannot be measured", c.feed)
	}
	fmt.Printf("feed %s: %d bytes as sent (%s), ETag %s\n", c.feed, size, orDefault(resp.Header.Get("Content-Encoding"), "identity"), etag)

	u, _ := url.Parse(c.feed)
	full := rawLoad(ctx, "cached feed, full GET (Accept-Encoding: gzip) → 200", u, c.concurrency, c.requests, c.duration,
		fixedRequest(u, "Accept-Encoding: gzip\r\n"))
	full.print()
	cond := rawLoad(ctx, "cached feed, conditional GET (If-None-Match) → 304", u, c.concurrency, c.requests, c.duration,
		fixedRequest(u, "Accept-Encoding: gzip\r\nIf-None-Match: "+etag+"\r\n"))
	cond.print()
	return []*result{full, cond}, nil
}

// rawLoad sends up to n requests from conns workers for at most d, over
// plain keep-alive TCP connections with one request in flight on each (no
// pipelining). request appends the bytes of request i (the request line
// and headers, ending with the empty line) to dst; the responses are read
// whole with http.ReadResponse, bodies as sent (gzip is not inflated).
// This costs the client a fraction of what net/http.Client does, leaving
// the shared CPUs to the server.
func rawLoad(ctx context.Context, name string, u *url.URL, conns, n int, d time.Duration, request func(dst []byte, i int) []byte) *result {
	c0, ok0 := serverCounts(ctx, u.Host)
	runCtx, cancel := context.WithTimeout(ctx, d)
	defer cancel()
	r := rawRun(runCtx, name, u, conns, n, request)
	r.serverGC, r.cacheHits, r.cacheMisses = -1, -1, -1
	if c1, ok := serverCounts(ctx, u.Host); ok && ok0 {
		r.serverGC = c1.gc - c0.gc
		if c0.cache && c1.cache {
			r.cacheHits, r.cacheMisses = c1.hits-c0.hits, c1.misses-c0.misses
		}
	}
	return r
}

// rawRun is rawLoad's run itself, until ctx ends.
func rawRun(ctx context.Context, name string, u *url.URL, conns, n int, request func(dst []byte, i int) []byte) *result {
	var issued atomic.Int64
	return measure(name, conns, n, func(l *tally) {
		var conn net.Conn
		var br *bufio.Reader
		defer func() {
			if conn != nil {
				conn.Close()
			}
		}()
		fail := func(err error) {
			if ctx.Err() == nil {
				l.errors++
				l.firstErr = firstError(l.firstErr, err)
			}
			if conn != nil {
				conn.Close()
				conn = nil
			}
		}
		var req []byte
		for ctx.Err() == nil {
			i := int(issued.Add(1)) - 1
			if i >= n {
				return
			}
			req = request(req[:0], i)
			if conn == nil {
				c, err := loopbackDialer(ctx, "tcp", u.Host)
				if err != nil {
					fail(err)
					continue
				}
				conn, br = c, bufio.NewReaderSize(c, 64<<10)
				context.AfterFunc(ctx, func() { c.SetDeadline(time.Unix(1, 0)) })
			}
			t0 := time.Now()
			if _, err := conn.Write(req); err != nil {
				fail(err)
				continue
			}
			resp, err := http.ReadResponse(br, nil)
			if err != nil {
				fail(err)
				continue
			}
			nb, err := io.Copy(io.Discard, resp.Body)
			resp.Body.Close()
			if err != nil {
				fail(err)
				continue
			}
			l.samples = append(l.samples, sample{i, t0, time.Since(t0), l.conn, resp.StatusCode, nb})
			l.statuses[resp.StatusCode]++
			l.bytes += nb
			if resp.Close {
				conn.Close()
				conn = nil
			}
		}
	})
}

// fixedRequest is a request builder for rawLoad that sends the same GET of
// u with headers (each ending in CRLF) every time.
func fixedRequest(u *url.URL, headers string) func([]byte, int) []byte {
	b := requestHead(u.Host) + headers + "\r\n"
	line := "GET " + u.RequestURI() + " HTTP/1.1\r\n"
	return func(dst []byte, _ int) []byte { return append(append(dst, line...), b...) }
}

// requestHead is the Host and User-Agent header lines.
func requestHead(host string) string {
	return "Host: " + host + "\r\nUser-Agent: heliocal-loadtest\r\n"
}

// measureAdhoc: a new place per request (a cache miss each time) unless
// -adhoc-cached.
func measureAdhoc(ctx context.Context, c config) (*result, error) {
	u, err := url.Parse(c.adhoc)
	if err != nil {
		return nil, err
	}
	if u.Query().Has("lat") {
		return nil, badInput{fmt.Errorf("-adhoc %q: leave lat= out of the URL; loadtest varies it", c.adhoc)}
	}
	name := "ad-hoc feed, a new place per request (cache miss) → 200"
	if c.adhocCached {
		name = "ad-hoc feed, one repeated query (cache hit) → 200"
	}
	r := rawLoad(ctx, name, u, c.adhocConc, c.adhocRequests, c.duration, adhocRequest(u, c.lat, !c.adhocCached))
	r.wantMisses = !c.adhocCached
	r.print()
	return r, nil
}

// adhocRequest is the request builder of the ad-hoc run: u's query with
// lat= in front, lat0 + i × 0.001° for request i when vary is set (a new
// place each time), lat0 otherwise; gzip accepted, as calendar clients do.
func adhocRequest(u *url.URL, lat0 float64, vary bool) func([]byte, int) []byte {
	path := u.EscapedPath()
	if path == "" {
		path = "/"
	}
	rest := ""
	if u.RawQuery != "" {
		rest = "&" + u.RawQuery
	}
	tail := " HTTP/1.1\r\n" + requestHead(u.Host) + "Accept-Encoding: gzip\r\n\r\n"
	return func(dst []byte, i int) []byte {
		lat := lat0
		if vary {
			lat += float64(i) * 0.001
		}
		dst = append(dst, "GET "...)
		dst = append(dst, path...)
		dst = append(dst, "?lat="...)
		dst = strconv.AppendFloat(dst, lat, 'f', 4, 64)
		dst = append(dst, rest...)
		return append(dst, tail...)
	}
}

func orDefault(s, d string) string {
	if s == "" {
		return d
	}
	return s
}

// processCPU returns the user+system CPU time of process pid from
// /proc/<pid>/stat (Linux); ok is false elsewhere or for pid 0.
func processCPU(pid int) (time.Duration, bool) {
	if pid == 0 {
		return 0, false
	}
	data, err := os.ReadFile("/proc/" + strconv.Itoa(pid) + "/stat")
	if err != nil {
		return 0, false
	}
	// Fields after the command name (which may hold spaces) start after ")".
	i := strings.LastIndexByte(string(data), ')')
	if i < 0 {
		return 0, false
	}
	f := strings.Fields(string(data[i+1:]))
	if len(f) < 13 {
		return 0, false
	}
	utime, err1 := strconv.ParseInt(f[11], 10, 64)
	stime, err2 := strconv.ParseInt(f[12], 10, 64)
	if err1 != nil || err2 != nil {
		return 0, false
	}
	const clkTck = 100 // USER_HZ on Linux
	return time.Duration(utime+stime) * time.Second / clkTck, true
}

// processPeakRSS returns the peak resident set size of process pid in bytes
// (VmHWM in /proc/<pid>/status, Linux); 0 elsewhere or for pid 0.
func processPeakRSS(pid int) int64 {
	if pid == 0 {
		return 0
	}
	data, err := os.ReadFile("/proc/" + strconv.Itoa(pid) + "/status")
	if err != nil {
		return 0
	}
	for line := range strings.Lines(string(data)) {
		if v, ok := strings.CutPrefix(line, "VmHWM:"); ok {
			f := strings.Fields(v) // "12345 kB"
			if len(f) == 2 && f[1] == "kB" {
				if kb, err := strconv.ParseInt(f[0], 10, 64); err == nil {
					return kb << 10
				}
			}
		}
	}
	return 0
}
