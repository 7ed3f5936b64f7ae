package main

import (
	"bytes"
	"context"
	"encoding/json"
	"io"
	"net"
	"net/http"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"sync"
	"testing"
	"time"

	"heliocal/config"

	goical "github.com/emersion/go-ical"
)

// waitFor polls ok every 50 ms until it holds, and fails t after 60 s,
// naming what it waited for, with the server's log so far.
func waitFor(t *testing.T, logs *lockedBuffer, what string, ok func() bool) {
	t.Helper()
	for deadline := time.Now().Add(60 * time.Second); !ok(); time.Sleep(50 * time.Millisecond) {
		if time.Now().After(deadline) {
			t.Fatalf("timed out waiting for %s\n%s", what, logs.String())
		}
	}
}

// fetcher returns a GET of a path on the server at addr: the status and
// the body, or 0 and "" when the server does not answer (yet).
func fetcher(addr string) func(path string) (int, string) {
	return func(path string) (int, string) {
		resp, err := http.Get("http://" + addr + path)
		if err != nil {
			return 0, ""
		}
		defer resp.Body.Close()
		b, _ := io.ReadAll(resp.Body)
		return resp.StatusCode, string(b)
	}
}

// freePort returns a loopback address that was free a moment ago.
func freePort(t *testing.T) string {
	t.Helper()
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	addr := ln.Addr().String()
	ln.Close()
	return addr
}

// serveInBackground runs heliocal serve with args on a free loopback
// address until the test ends or stop is called: its address, its log, and
// stop, which shuts it down and returns its exit code.
func serveInBackground(t *testing.T, args ...string) (addr string, logs *lockedBuffer, stop func() int) {
	t.Helper()
	addr, logs, cancel, done := startServe(t, args...)
	return addr, logs, func() int { cancel(); return <-done }
}

// serveExits runs heliocal serve with args as serveInBackground does and
// waits up to a minute for it to stop by itself, as it does when its first
// build fails: its exit code, its log and the log's last line. A serve
// still running then fails the test.
func serveExits(t *testing.T, args ...string) (code int, logs *lockedBuffer, last string) {
	t.Helper()
	_, logs, cancel, done := startServe(t, args...)
	select {
	case code = <-done:
	case <-time.After(60 * time.Second):
		cancel()
		t.Fatalf("serve %s still runs:\n%s", strings.Join(args, " "), logs.String())
	}
	last = logs.String()[strings.LastIndex(strings.TrimSuffix(logs.String(), "\n"), "\n")+1:]
	return code, logs, last
}

// startServe starts heliocal serve with args on a free loopback address,
// cancelled when the test ends: its address, its log, its cancel and the
// channel of its exit code.
func startServe(t *testing.T, args ...string) (addr string, logs *lockedBuffer, cancel func(), done chan int) {
	t.Helper()
	addr = freePort(t)
	ctx, cancel := context.WithCancel(context.Background())
	t.Cleanup(cancel)
	logs = &lockedBuffer{}
	done = make(chan int, 1)
	go func() {
		done <- run(ctx, append([]string{"serve", "--listen", addr}, args...), io.Discard, logs, noEnv)
	}()
	return addr, logs, cancel, done
}

// heliocal serve on the built-in demo: the wiring of the command (build,
// ad-hoc feeds, schedule, shutdown) end to end over real HTTP on loopback.
func TestServeDemo(t *testing.T) {
	t.Chdir(t.TempDir())
	gcBefore := gcPercent()
	addr := freePort(t)
	ctx, cancel := context.WithCancel(context.Background())
	errOut := &lockedBuffer{}
	done := make(chan int, 1)
	go func() {
		done <- run(ctx, []string{"serve", "--listen", addr, "--access-log=false"}, io.Discard, errOut, noEnv)
	}()
	base := "http://" + addr
	get := func(path string) (*http.Response, string) {
		t.Helper()
		resp, err := http.Get(base + path)
		if err != nil {
			t.Fatal(err)
		}
		defer resp.Body.Close()
		b, _ := io.ReadAll(resp.Body)
		return resp, string(b)
	}
	// wait for the first build (bounded: the demo builds in well under a second)
	deadline := time.Now().Add(60 * time.Second)
	for {
		resp, err := http.Get(base + "/healthz")
		if err == nil {
			resp.Body.Close()
			if resp.StatusCode == http.StatusOK {
				break
			}
		}
		if time.Now().After(deadline) {
			cancel()
			t.Fatalf("server not healthy: %v\n%s", err, errOut.String())
		}
		time.Sleep(50 * time.Millisecond)
	}

	// The collector's policy while serving (no GOGC in the environment).
	if err := awaitServeGCPercent(); err != nil {
		t.Error(err)
	}

	// It built one ad-hoc feed when it started, before any request for one,
	// so that the first requests find the ephemeris ready, and said so in
	// its log; /metrics counts only the builds requests asked for
	// (docs/serving.md, "Metrics").
	if strings.Count(errOut.String(), `msg="ad-hoc feeds warmed up"`) != 1 {
		t.Errorf("not one ad-hoc warm-up logged at start:\n%s", errOut.String())
	}
	if _, m := get("/metrics"); !strings.Contains(m, "heliocal_adhoc_build_duration_seconds_count 0\n") {
		t.Errorf("the warm-up counted as a request's build:\n%s", m)
	}

	resp, body := get("/feeds/fernhollow-sun.ics")
	if resp.StatusCode != http.StatusOK || resp.Header.Get("Content-Type") != "text/calendar; charset=utf-8" {
		t.Errorf("feed: %d %q", resp.StatusCode, resp.Header.Get("Content-Type"))
	}
	if _, err := goical.NewDecoder(strings.NewReader(body)).Decode(); err != nil {
		t.Errorf("served feed does not parse: %v", err)
	}

	// One address for a feed wherever it is copied from: the page at /, the
	// index (a link relative to /index.html) and feeds.json all give
	// /<id>.ics, where publish writes the file (docs/serving.md, routes).
	want := base + "/fernhollow-sun.ics"
	if _, home := get("/"); !strings.Contains(home, `href="`+want+`"`) || strings.Contains(home, "/feeds/fernhollow-sun.ics") {
		t.Errorf("the page at / does not link %s", want)
	}
	if _, index := get("/index.html"); !strings.Contains(index, `href="fernhollow-sun.ics"`) {
		t.Errorf("/index.html does not link fernhollow-sun.ics")
	}
	_, list := get("/feeds.json")
	var feeds struct{ Feeds []struct{ ID, URL string } }
	if err := json.Unmarshal([]byte(list), &feeds); err != nil {
		t.Fatalf("feeds.json: %v", err)
	}
	for _, f := range feeds.Feeds {
		if f.ID == "fernhollow-sun" && f.URL != want {
			t.Errorf("feeds.json: url %q, want %q", f.URL, want)
		}
	}

	// An ad-hoc feed for a place: the sunrise of 2027-06-21 in Vienna, one day.
	resp, body = get("/at.ics?lat=48.2&lon=16.4&tz=Europe/Vienna&kinds=sunrise&days=1&start=2027-06-21")
	if resp.StatusCode != http.StatusOK || !strings.Contains(body, "DTSTART;TZID=Europe/Vienna:20270621T04") {
		t.Errorf("ad-hoc feed: %d\n%s", resp.StatusCode, body)
	}
	// Bad input is a 400 naming the parameter and the value.
	resp, body = get("/at.ics?lat=95&lon=0&tz=UTC")
	if resp.StatusCode != http.StatusBadRequest || !strings.Contains(body, "lat") || !strings.Contains(body, "95") {
		t.Errorf("bad latitude: %d %q", resp.StatusCode, body)
	}
	resp, body = get("/at.ics?lat=10&lon=0&tz=UTC&kinds=sunrize")
	if resp.StatusCode != http.StatusBadRequest || !strings.Contains(body, "sunrize") {
		t.Errorf("bad kind: %d %q", resp.StatusCode, body)
	}

	cancel()
	select {
	case code := <-done:
		if code != 0 {
			t.Errorf("serve exited %d: %s", code, errOut.String())
		}
	case <-time.After(30 * time.Second):
		t.Fatal("serve did not shut down")
	}
	if got := gcPercent(); got != gcBefore {
		t.Errorf("after serve the GC percent is %d, want %d as before", got, gcBefore)
	}
}

// lockedBuffer is a bytes.Buffer safe for the server's log goroutines.
type lockedBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (l *lockedBuffer) Write(p []byte) (int, error) {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.Write(p)
}

func (l *lockedBuffer) String() string {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.String()
}

// SIGHUP with a configuration made invalid is refused: the error is logged
// and the old feeds keep being served.
func TestServeReloadRefusesInvalidConfig(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "farm.yaml")
	if err := os.WriteFile(path, config.DemoYAML(), 0o644); err != nil {
		t.Fatal(err)
	}
	addr, logs, stop := serveInBackground(t, "--config", path, "--access-log=false")
	fetch := fetcher(addr)
	waitFor(t, logs, "the first build", func() bool { code, _ := fetch("/healthz"); return code == http.StatusOK })
	_, before := fetch("/feeds/fernhollow-sun.ics")

	if err := os.WriteFile(path, []byte("sites:\n  - id: x\n    latitude: 95\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	sendSIGHUP(t)
	waitFor(t, logs, "the refused reload", func() bool { return strings.Contains(logs.String(), "reload refused") })
	if !strings.Contains(logs.String(), "latitude") {
		t.Errorf("the log does not name the bad field:\n%s", logs.String())
	}
	code, after := fetch("/feeds/fernhollow-sun.ics")
	if code != http.StatusOK || after != before {
		t.Errorf("after a refused reload the feed changed (status %d)", code)
	}
	// The refusal is visible: /healthz says degraded and why, /metrics counts it.
	if code, health := fetch("/healthz"); code != http.StatusOK || !strings.Contains(health, `"status": "degraded"`) ||
		!strings.Contains(health, "configuration reload refused") || !strings.Contains(health, "latitude") {
		t.Errorf("/healthz after a refused reload: %d\n%s", code, health)
	}
	if _, metrics := fetch("/metrics"); !strings.Contains(metrics, "heliocal_reloads_refused_total 1\n") {
		t.Error("/metrics does not count the refused reload")
	}
	if code := stop(); code != 0 {
		t.Errorf("serve exited %d:\n%s", code, logs.String())
	}
}

// serve's log as docs/serving.md describes it: with --log-format json every
// line is one JSON object whose durations (the access log's duration, the
// shutdown's timeout) are whole nanoseconds, as log/slog's JSON handler
// writes a time.Duration; the text format writes them with their unit
// (the shutdown's 20 s as "timeout=20s").
func TestServeLogFormats(t *testing.T) {
	path := writeConfig(t, reloadSite)
	for _, format := range []string{"json", "text"} {
		t.Run(format, func(t *testing.T) {
			addr, logs, stop := serveInBackground(t, "--config", path, "--log-format", format)
			status := func(p string) int {
				resp, err := http.Get("http://" + addr + p)
				if err != nil {
					return 0
				}
				resp.Body.Close()
				return resp.StatusCode
			}
			waitFor(t, logs, "the first build", func() bool { return status("/healthz") == http.StatusOK })
			if code := status("/north-sun.ics"); code != http.StatusOK {
				t.Fatalf("north-sun.ics: %d", code)
			}
			if code := stop(); code != 0 {
				t.Fatalf("serve exited %d:\n%s", code, logs.String())
			}
			var request, shutdown string
			for _, l := range strings.Split(strings.TrimSuffix(logs.String(), "\n"), "\n") {
				if strings.Contains(l, "/north-sun.ics") {
					request = l
				}
				if strings.Contains(l, "shutting down") {
					shutdown = l
				}
				if format == "json" && !json.Valid([]byte(l)) {
					t.Errorf("not a JSON object: %s", l)
				}
			}
			if format == "json" {
				var req, stop struct{ Duration, Timeout json.Number }
				if err := json.Unmarshal([]byte(request), &req); err != nil || !regexp.MustCompile(`^[1-9]\d*$`).MatchString(string(req.Duration)) {
					t.Errorf("access log line %q (%v): want a duration in whole nanoseconds", request, err)
				}
				if err := json.Unmarshal([]byte(shutdown), &stop); err != nil || stop.Timeout != "20000000000" {
					t.Errorf("shutdown line %q (%v): want the timeout 20000000000 (20 s in nanoseconds)", shutdown, err)
				}
				return
			}
			if !regexp.MustCompile(` duration=\d+(\.\d+)?(ns|µs|ms|s) `).MatchString(request) || !strings.Contains(shutdown, " timeout=20s") {
				t.Errorf("access log line %q, shutdown line %q: want durations with their unit", request, shutdown)
			}
		})
	}
}
