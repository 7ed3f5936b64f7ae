package main

import (
	"bufio"
	"bytes"
	"context"
	"errors"
	"fmt"
	"net/http"
	"net/http/httptest"
	"net/url"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"sync/atomic"
	"testing"
	"time"
)

func TestLoopbackOnly(t *testing.T) {
	for _, u := range []string{
		"http://127.0.0.1:8080/feeds/a.ics",
		"http://127.8.9.10/at.ics",
		"http://[::1]:8080/",
		"http://localhost:18080/feeds.json",
	} {
		if err := loopbackOnly(u); err != nil {
			t.Errorf("loopbackOnly(%q) = %v, want accepted", u, err)
		}
	}
	for _, u := range []string{
		"http://192.168.1.10:8080/feeds/a.ics",
		"http://10.0.0.1/",
		"http://sky.example.org/feeds/a.ics",
		"http://0.0.0.0:8080/",
		"https://127.0.0.1/",
		"http://[::ffff:8.8.8.8]/",
		"ftp://127.0.0.1/",
		"http://127.0.0.1.example.org/",
	} {
		if err := loopbackOnly(u); err == nil || !strings.Contains(err.Error(), u) {
			t.Errorf("loopbackOnly(%q) = %v, want refused naming the URL", u, err)
		}
	}
}

func TestPercentile(t *testing.T) {
	// Nearest-rank percentiles of 1..100 ms are 50 ms and 99 ms.
	var sorted []time.Duration
	for i := 1; i <= 100; i++ {
		sorted = append(sorted, time.Duration(i)*time.Millisecond)
	}
	if p := pct(sorted, 50); p != 50*time.Millisecond {
		t.Errorf("p50 = %v, want 50ms", p)
	}
	if p := pct(sorted, 99); p != 99*time.Millisecond {
		t.Errorf("p99 = %v, want 99ms", p)
	}
	if p := pct(sorted[:1], 99); p != time.Millisecond {
		t.Errorf("p99 of one sample = %v, want 1ms", p)
	}
}

func TestAdhocRequest(t *testing.T) {
	u, err := url.Parse("http://127.0.0.1:18080/at.ics?lon=13.05&tz=Europe%2FVienna&days=365")
	if err != nil {
		t.Fatal(err)
	}
	build := adhocRequest(u, 47, true)
	var lats []string
	var buf []byte
	for i := range 3 {
		buf = build(buf[:0], i)
		req, err := http.ReadRequest(bufio.NewReader(bytes.NewReader(buf)))
		if err != nil {
			t.Fatalf("request %d: %v\n%s", i, err, buf)
		}
		q := req.URL.Query()
		if req.Method != "GET" || req.URL.Path != "/at.ics" || req.Host != "127.0.0.1:18080" ||
			q.Get("lon") != "13.05" || q.Get("tz") != "Europe/Vienna" || q.Get("days") != "365" ||
			req.Header.Get("Accept-Encoding") != "gzip" {
			t.Errorf("request %d: %s %s host %q, Accept-Encoding %q", i, req.Method, req.URL, req.Host, req.Header.Get("Accept-Encoding"))
		}
		lats = append(lats, q.Get("lat"))
	}
	if want := []string{"47.0000", "47.0010", "47.0020"}; !slices.Equal(lats, want) {
		t.Errorf("latitudes %v, want %v (a new place per request)", lats, want)
	}
	if buf = adhocRequest(u, 47, false)(buf[:0], 5); !bytes.Contains(buf, []byte("lat=47.0000&")) {
		t.Errorf("repeated query: %s", buf)
	}
}

// TestRawLoadReadsWholeResponses: the raw client counts every byte of every
// body (gzip bodies as sent, not inflated), keeps its connections alive and
// reconnects when the server closes one.
func TestRawLoadReadsWholeResponses(t *testing.T) {
	body := bytes.Repeat([]byte("BEGIN:VEVENT\r\nEND:VEVENT\r\n"), 4000) // 104 kB
	var served atomic.Int64
	srv := httptest.NewServer(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		if served.Add(1)%7 == 0 {
			w.Header().Set("Connection", "close")
		}
		if r.URL.Query().Get("lat") == "" {
			http.Error(w, "no lat", http.StatusBadRequest)
			return
		}
		w.Header().Set("Content-Encoding", "gzip") // not gzip at all: the client must not inflate
		w.Write(body)
	}))
	defer srv.Close()
	u, _ := url.Parse(srv.URL + "/at.ics?lon=1")
	r := rawLoad(context.Background(), "test", u, 3, 50, 30*time.Second, adhocRequest(u, 10, true))
	if r.errors != 0 || r.statuses[200] != 50 || len(r.latencies) != 50 {
		t.Fatalf("errors %d (%v), statuses %v, %d latencies; want 50 × 200", r.errors, r.firstErr, r.statuses, len(r.latencies))
	}
	if want := int64(50 * len(body)); r.bytes != want {
		t.Errorf("read %d body bytes, want %d", r.bytes, want)
	}
}

// The slowest requests are listed slowest first, each with its number and
// when it was sent; every request of a run is a sample.
func TestSlowest(t *testing.T) {
	t0 := time.Date(2026, 12, 3, 12, 0, 0, 0, time.UTC)
	r := &result{start: t0}
	for i, ms := range []int{5, 40, 7, 300, 6, 9, 41, 8} {
		r.samples = append(r.samples, sample{i: i, sent: t0.Add(time.Duration(i*10) * time.Millisecond), took: time.Duration(ms) * time.Millisecond})
	}
	want := "#3 at 30ms: 300ms, #6 at 60ms: 41ms, #1 at 10ms: 40ms, #5 at 50ms: 9ms, #7 at 70ms: 8ms"
	if got := r.slowestText(); got != want {
		t.Errorf("slowest:\n got %s\nwant %s", got, want)
	}

	srv := httptest.NewServer(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {}))
	defer srv.Close()
	u, _ := url.Parse(srv.URL + "/at.ics?lon=1")
	run := rawLoad(context.Background(), "test", u, 2, 20, 30*time.Second, adhocRequest(u, 10, true))
	seen := map[int]bool{}
	for _, x := range run.samples {
		seen[x.i] = true
		if x.sent.Before(run.start) || x.took <= 0 {
			t.Errorf("request %d sent %v before the run's start %v, or took %v", x.i, x.sent, run.start, x.took)
		}
	}
	if len(seen) != 20 || len(run.samples) != 20 {
		t.Errorf("%d samples of %d requests, want 20 of 20", len(run.samples), len(seen))
	}
}

func TestProcessPeakRSS(t *testing.T) {
	big := make([]byte, 32<<20)
	for i := range big {
		big[i] = 1 // touched: resident
	}
	if rss := processPeakRSS(os.Getpid()); rss < int64(len(big)) {
		t.Errorf("peak RSS %d bytes, want at least the %d just touched", rss, len(big))
	}
	if rss := processPeakRSS(0); rss != 0 {
		t.Errorf("pid 0: %d, want 0 (unknown)", rss)
	}
	_ = big[len(big)-1]
}

// The samples file has a line per request of every run, in the order sent,
// with when each was sent from the run's and the server's start and in
// Unix microseconds.
func TestWriteSamples(t *testing.T) {
	t0 := time.Date(2026, 12, 3, 12, 0, 0, 0, time.UTC)
	r := &result{start: t0, samples: []sample{
		{i: 1, sent: t0.Add(1500 * time.Microsecond), took: 9 * time.Millisecond, conn: 1, status: 200, bytes: 70000},
		{i: 0, sent: t0.Add(400 * time.Microsecond), took: 12500 * time.Microsecond, conn: 0, status: 200, bytes: 71000},
	}}
	var b bytes.Buffer
	writeSamples(&b, []*result{r}, t0.Add(-2*time.Second))
	want := "run\tn\tconn\tsent_ms\tserver_s\tsent_unix_us\tlatency_ms\tstatus\tbytes\n" +
		"1\t0\t0\t0.400\t2.0004\t1796299200000400\t12.500\t200\t71000\n" +
		"1\t1\t1\t1.500\t2.0015\t1796299200001500\t9.000\t200\t70000\n"
	if b.String() != want {
		t.Errorf("samples:\n%s\nwant:\n%s", b.String(), want)
	}
	b.Reset()
	writeSamples(&b, []*result{r}, time.Time{}) // no server started: no server clock
	if lines := strings.Split(b.String(), "\n"); len(lines) != 4 || !strings.HasPrefix(lines[1], "1\t0\t0\t0.400\t\t1796299200000400\t") {
		t.Errorf("without a started server:\n%s", b.String())
	}
}

// The server's collections, and a heliocal server's ad-hoc cache hits and
// misses, come from its /metrics; a server without one gives none. A run
// counts the cache's hits and misses during it, so that a run meant to
// miss can say it did not (a server that had seen its places before).
func TestServerCounts(t *testing.T) {
	var served atomic.Int64
	srv := httptest.NewServer(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		switch r.URL.Path {
		case "/metrics":
			n := served.Load()
			fmt.Fprintf(w, "# HELP go_gc_duration_seconds x\ngo_gc_duration_seconds_sum 0.012\ngo_gc_duration_seconds_count 7\ngo_goroutines 9\n"+
				"heliocal_adhoc_cache_total{result=\"hit\"} %d\nheliocal_adhoc_cache_total{result=\"miss\"} %d\n", 3+n/2, 5+(n+1)/2)
		case "/at.ics":
			served.Add(1)
		default:
			http.NotFound(w, r)
		}
	}))
	defer srv.Close()
	u, _ := url.Parse(srv.URL)
	if c, ok := serverCounts(context.Background(), u.Host); !ok || c != (serverCounters{gc: 7, hits: 3, misses: 5, cache: true}) {
		t.Errorf("serverCounts = %+v, %v; want 7 collections, 3 hits, 5 misses, true", c, ok)
	}
	u, _ = url.Parse(srv.URL + "/at.ics?lon=1")
	r := rawLoad(context.Background(), "test", u, 2, 40, 30*time.Second, adhocRequest(u, 10, true))
	if r.serverGC != 0 || r.cacheHits != 20 || r.cacheMisses != 20 {
		t.Errorf("a run of 40 requests, half of them hits: %d collections, %d hits, %d misses; want 0, 20, 20", r.serverGC, r.cacheHits, r.cacheMisses)
	}
	none := httptest.NewServer(http.NotFoundHandler())
	defer none.Close()
	u, _ = url.Parse(none.URL)
	if c, ok := serverCounts(context.Background(), u.Host); ok {
		t.Errorf("serverCounts without /metrics = %+v, true; want false", c)
	}
	u, _ = url.Parse(none.URL + "/at.ics?lon=1")
	if r := rawLoad(context.Background(), "test", u, 1, 2, 30*time.Second, adhocRequest(u, 10, true)); r.serverGC != -1 || r.cacheHits != -1 || r.cacheMisses != -1 {
		t.Errorf("without /metrics: %d collections, %d hits, %d misses; want -1 each (unknown)", r.serverGC, r.cacheHits, r.cacheMisses)
	}
}

// A -samples file that cannot be created is bad input (exit 2, naming the
// flag and the path), said before any request is sent, not after the
// runs. The command runs as a process of its own: this test binary, asked
// to run main.
func TestSamplesFileCheckedFirst(t *testing.T) {
	if args := os.Getenv("LOADTEST_TEST_ARGS"); args != "" {
		os.Args = append([]string{"loadtest"}, strings.Fields(args)...)
		main()
		os.Exit(0)
	}
	var requests atomic.Int64
	srv := httptest.NewServer(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) { requests.Add(1) }))
	defer srv.Close()
	bad := filepath.Join(t.TempDir(), "no-such-dir", "samples.tsv")
	cmd := exec.Command(os.Args[0], "-test.run=^TestSamplesFileCheckedFirst$")
	cmd.Env = append(os.Environ(), "LOADTEST_TEST_ARGS=-adhoc "+srv.URL+"/at.ics?lon=1 -adhoc-n 20 -samples "+bad)
	out, err := cmd.CombinedOutput()
	var exit *exec.ExitError
	if !errors.As(err, &exit) || exit.ExitCode() != 2 || !strings.Contains(string(out), "-samples "+bad+": ") {
		t.Errorf("exit %v, output\n%s\nwant exit 2 naming -samples and %s", err, out, bad)
	}
	if n := requests.Load(); n != 0 {
		t.Errorf("%d requests sent before the error, want none", n)
	}
}

// A run that fails after the -samples file was made leaves a samples file
// already there as it was, and no part of a new one beside it.
func TestSamplesFileKeptOnFailure(t *testing.T) {
	var requests atomic.Int64
	srv := httptest.NewServer(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) { requests.Add(1) }))
	defer srv.Close()
	dir := t.TempDir()
	path := filepath.Join(dir, "samples.tsv")
	if err := os.WriteFile(path, []byte("an earlier run\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	// lat= in the ad-hoc URL is refused once the samples file is made
	cmd := exec.Command(os.Args[0], "-test.run=^TestSamplesFileCheckedFirst$")
	cmd.Env = append(os.Environ(), "LOADTEST_TEST_ARGS=-adhoc "+srv.URL+"/at.ics?lat=1&lon=1 -adhoc-n 20 -samples "+path)
	out, err := cmd.CombinedOutput()
	var exit *exec.ExitError
	if !errors.As(err, &exit) || exit.ExitCode() != 2 || !strings.Contains(string(out), "-adhoc ") {
		t.Errorf("exit %v, output\n%s\nwant exit 2 naming -adhoc", err, out)
	}
	if b, err := os.ReadFile(path); err != nil || string(b) != "an earlier run\n" {
		t.Errorf("the earlier samples file after a failed run: %q, %v; want it as it was", b, err)
	}
	if names, _ := os.ReadDir(dir); len(names) != 1 {
		t.Errorf("files beside it after a failed run: %v, want the samples file alone", names)
	}
}
