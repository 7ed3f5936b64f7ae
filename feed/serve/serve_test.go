package serve

import (
	"bytes"
	"compress/gzip"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"log/slog"
	"maps"
	"net/http"
	"net/http/httptest"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"heliocal/feed/publish"
)

func TestRoutes(t *testing.T) {
	built := time.Now().Truncate(time.Second)
	s, _ := newTestServer(t, Options{Adhoc: adhocICS, BaseURL: "https://sky.example.org/"}) // feeds.json as built
	b := testBundle("a")
	h := s.Handler()
	for _, tc := range []struct {
		path, file, ctype string
		cors              bool
	}{
		{"/", "index.html", "text/html; charset=utf-8", false},
		{"/index.html", "index.html", "text/html; charset=utf-8", false},
		{"/feeds/meadowbrook-sun.ics", "meadowbrook-sun.ics", "text/calendar; charset=utf-8", true},
		{"/meadowbrook-sun.ics", "meadowbrook-sun.ics", "text/calendar; charset=utf-8", true},
		{"/feeds/kestrel-ridge-moon.ics", "kestrel-ridge-moon.ics", "text/calendar; charset=utf-8", true},
		{"/feeds.json", "feeds.json", "application/json", true},
		{"/feeds.json?v=2", "feeds.json", "application/json", true}, // cache-busting query ignored
	} {
		t.Run(tc.path, func(t *testing.T) {
			r := get(t, h, "GET", tc.path)
			if r.StatusCode != 200 {
				t.Fatalf("status %d", r.StatusCode)
			}
			if got := body(t, r); got != string(b.File(tc.file).Data) {
				t.Errorf("body differs from the bundle's %s", tc.file)
			}
			if got := r.Header.Get("Content-Type"); got != tc.ctype {
				t.Errorf("Content-Type %q, want %q", got, tc.ctype)
			}
			if got := r.Header.Get("ETag"); got != `"`+b.File(tc.file).Checksum+`"` {
				t.Errorf("ETag %q, want the quoted checksum", got)
			}
			// when the server first served these bytes: its first build
			if got, err := http.ParseTime(r.Header.Get("Last-Modified")); err != nil || got.Before(built) || got.After(time.Now()) {
				t.Errorf("Last-Modified %q (%v), want the time of the first build, after %s", r.Header.Get("Last-Modified"), err, built)
			}
			if got := r.Header.Get("Cache-Control"); got != "public, max-age=86400" {
				t.Errorf("Cache-Control %q, want the nightly refresh interval", got)
			}
			if got := r.Header.Get("X-Content-Type-Options"); got != "nosniff" {
				t.Errorf("X-Content-Type-Options %q", got)
			}
			if got := r.Header.Get("Access-Control-Allow-Origin"); (got == "*") != tc.cors {
				t.Errorf("Access-Control-Allow-Origin %q, want CORS=%v", got, tc.cors)
			}
		})
	}
	for _, p := range []string{"/nope", "/feeds/", "/feeds/nope.ics", "/feeds/../index.html", "/feeds/a/b.ics", "/.ics", "/feeds"} {
		if r := get(t, h, "GET", p); r.StatusCode != 404 {
			t.Errorf("GET %s: status %d, want 404", p, r.StatusCode)
		}
	}
}

func TestContentDisposition(t *testing.T) {
	s, _ := newTestServer(t, Options{})
	r := get(t, s.Handler(), "GET", "/feeds/meadowbrook-sun.ics")
	if got, want := r.Header.Get("Content-Disposition"), `inline; filename="meadowbrook-sun.ics"`; got != want {
		t.Errorf("Content-Disposition %q, want %q", got, want)
	}
}

func TestFeedsJSONSynthesised(t *testing.T) {
	b := testBundle("a")
	b.Files = b.Files[1:] // no feeds.json in this bundle
	s, _ := newTestServer(t, Options{Build: func(context.Context, GzipFunc) (*publish.Bundle, error) { return b, nil }})
	r := get(t, s.Handler(), "GET", "/feeds.json")
	var got []publish.FeedInfo
	if err := json.Unmarshal([]byte(body(t, r)), &got); err != nil || r.StatusCode != 200 {
		t.Fatalf("status %d, %v", r.StatusCode, err)
	}
	if len(got) != 2 || got[0].ID != "meadowbrook-sun" || got[0].Events != 40 {
		t.Errorf("feeds.json = %+v", got)
	}
}

func TestConditionalGET(t *testing.T) {
	s, _ := newTestServer(t, Options{})
	h := s.Handler()
	first := get(t, h, "GET", "/feeds/meadowbrook-sun.ics")
	etag := first.Header.Get("ETag")

	r := get(t, h, "GET", "/feeds/meadowbrook-sun.ics", "If-None-Match", etag)
	if r.StatusCode != http.StatusNotModified || body(t, r) != "" {
		t.Errorf("If-None-Match with the current ETag: status %d, want 304 without body", r.StatusCode)
	}
	if r.Header.Get("ETag") != etag || r.Header.Get("Cache-Control") == "" {
		t.Errorf("304 lacks ETag or Cache-Control: %v", r.Header)
	}
	if r := get(t, h, "GET", "/feeds/meadowbrook-sun.ics", "If-None-Match", `"0000"`); r.StatusCode != 200 {
		t.Errorf("If-None-Match with another ETag: status %d, want 200", r.StatusCode)
	}
	if r := get(t, h, "GET", "/feeds/meadowbrook-sun.ics", "If-None-Match", `"0000", `+etag); r.StatusCode != 304 {
		t.Errorf("If-None-Match list containing the ETag: status %d, want 304", r.StatusCode)
	}

	mod, err := http.ParseTime(first.Header.Get("Last-Modified"))
	if err != nil {
		t.Fatal(err)
	}
	since := mod.Add(time.Hour).Format(http.TimeFormat)
	if r := get(t, h, "GET", "/feeds/meadowbrook-sun.ics", "If-Modified-Since", since); r.StatusCode != 304 {
		t.Errorf("If-Modified-Since after Last-Modified: status %d, want 304", r.StatusCode)
	}
	before := mod.Add(-time.Hour).Format(http.TimeFormat)
	if r := get(t, h, "GET", "/feeds/meadowbrook-sun.ics", "If-Modified-Since", before); r.StatusCode != 200 {
		t.Errorf("If-Modified-Since before Last-Modified: status %d, want 200", r.StatusCode)
	}
	// RFC 9110 §13.1.3: If-Modified-Since is ignored when If-None-Match is present.
	if r := get(t, h, "GET", "/feeds/meadowbrook-sun.ics", "If-None-Match", `"0000"`, "If-Modified-Since", since); r.StatusCode != 200 {
		t.Errorf("non-matching If-None-Match with If-Modified-Since: status %d, want 200", r.StatusCode)
	}
	// The gzip variant has its own ETag, and revalidates with it.
	gz := get(t, h, "GET", "/feeds/meadowbrook-sun.ics", "Accept-Encoding", "gzip")
	gzTag := gz.Header.Get("ETag")
	if gzTag == etag || !strings.HasSuffix(gzTag, `-gz"`) {
		t.Errorf("gzip ETag %q, want distinct from %q with -gz suffix", gzTag, etag)
	}
	if r := get(t, h, "GET", "/feeds/meadowbrook-sun.ics", "Accept-Encoding", "gzip", "If-None-Match", gzTag); r.StatusCode != 304 {
		t.Errorf("If-None-Match with the gzip ETag: status %d, want 304", r.StatusCode)
	}
}

func TestGzip(t *testing.T) {
	s, _ := newTestServer(t, Options{})
	h := s.Handler()
	want := testBundle("a").File("meadowbrook-sun.ics").Data
	for _, tc := range []struct {
		accept string
		gz     bool
	}{
		{"gzip", true},
		{"gzip, deflate, br", true},
		{"br;q=1.0, gzip;q=0.8", true},
		{"x-gzip", true},
		{"*", true},
		{"", false},
		{"identity", false},
		{"gzip;q=0", false},
		{"br, *;q=0", false},
		{"*;q=0.5, gzip;q=0", false},
		{"deflate", false},
	} {
		r := get(t, h, "GET", "/feeds/meadowbrook-sun.ics", "Accept-Encoding", tc.accept)
		if r.Header.Get("Vary") != "Accept-Encoding" {
			t.Errorf("Accept-Encoding %q: Vary %q", tc.accept, r.Header.Get("Vary"))
		}
		raw := []byte(body(t, r))
		if got := r.Header.Get("Content-Encoding") == "gzip"; got != tc.gz {
			t.Errorf("Accept-Encoding %q: gzip=%v, want %v", tc.accept, got, tc.gz)
			continue
		}
		if tc.gz {
			zr, err := gzip.NewReader(bytes.NewReader(raw))
			if err != nil {
				t.Fatal(err)
			}
			if raw, err = io.ReadAll(zr); err != nil {
				t.Fatal(err)
			}
		}
		if !bytes.Equal(raw, want) {
			t.Errorf("Accept-Encoding %q: body differs from the feed", tc.accept)
		}
	}
	// A tiny file is not worth compressing: sent as is, no Vary.
	r := get(t, h, "GET", "/feeds/kestrel-ridge-moon.ics", "Accept-Encoding", "gzip")
	if r.Header.Get("Content-Encoding") != "" {
		t.Error("tiny feed was gzipped")
	}
}

func TestGzipReusedForUnchangedFiles(t *testing.T) {
	s, b := newTestServer(t, Options{})
	before := s.snap.Load().files["meadowbrook-sun.ics"].gz
	b.set(testBundle("a"), nil) // same bytes, a new Bundle
	if err := s.Refresh(t.Context()); err != nil {
		t.Fatal(err)
	}
	after := s.snap.Load().files["meadowbrook-sun.ics"].gz
	if len(before) == 0 || &before[0] != &after[0] {
		t.Error("unchanged feed was compressed again")
	}
}

func TestHEAD(t *testing.T) {
	s, _ := newTestServer(t, Options{Adhoc: adhocICS})
	h := s.Handler()
	for _, p := range []string{"/", "/feeds/meadowbrook-sun.ics", "/feeds.json", "/healthz", "/at.ics?lat=47.5&lon=13&tz=Europe/Vienna&kinds=sunrise"} {
		full := get(t, h, "GET", p)
		r := get(t, h, "HEAD", p)
		if r.StatusCode != 200 || body(t, r) != "" {
			t.Errorf("HEAD %s: status %d, want 200 without body", p, r.StatusCode)
		}
		if r.Header.Get("Content-Length") != full.Header.Get("Content-Length") || r.Header.Get("Content-Length") == "" {
			t.Errorf("HEAD %s: Content-Length %q, GET has %q", p, r.Header.Get("Content-Length"), full.Header.Get("Content-Length"))
		}
	}
}

func TestMethodNotAllowed(t *testing.T) {
	s, _ := newTestServer(t, Options{Adhoc: adhocICS})
	for _, m := range []string{"POST", "PUT", "DELETE", "OPTIONS", "PATCH"} {
		for _, p := range []string{"/", "/feeds/meadowbrook-sun.ics", "/at.ics", "/healthz", "/metrics"} {
			r := get(t, s.Handler(), m, p)
			if r.StatusCode != http.StatusMethodNotAllowed || r.Header.Get("Allow") != "GET, HEAD" {
				t.Errorf("%s %s: status %d Allow %q, want 405 with Allow: GET, HEAD", m, p, r.StatusCode, r.Header.Get("Allow"))
			}
		}
	}
}

func TestHealthz(t *testing.T) {
	reg := NewRegistry()
	b := &builder{err: errors.New("config: sites[0].latitude: must be within -90..90")}
	s, err := New(Options{Build: b.build, Logger: quiet(), Metrics: reg, ScheduleZone: time.UTC})
	if err != nil {
		t.Fatal(err)
	}
	check := func(wantCode int, wantStatus string) health {
		t.Helper()
		r := get(t, s.Handler(), "GET", "/healthz")
		var hb health
		if err := json.Unmarshal([]byte(body(t, r)), &hb); err != nil {
			t.Fatal(err)
		}
		if r.StatusCode != wantCode || hb.Status != wantStatus {
			t.Errorf("healthz %d %q, want %d %q", r.StatusCode, hb.Status, wantCode, wantStatus)
		}
		if r.Header.Get("Cache-Control") != "no-store" {
			t.Error("healthz may be cached")
		}
		return hb
	}
	check(503, "starting")
	if r := get(t, s.Handler(), "GET", "/feeds/meadowbrook-sun.ics"); r.StatusCode != 503 || r.Header.Get("Retry-After") == "" {
		t.Errorf("feed before the first build: status %d, want 503 with Retry-After", r.StatusCode)
	}

	s.Refresh(t.Context())
	hb := check(503, "failing")
	if !strings.Contains(hb.LastError, "sites[0].latitude") || hb.LastSuccess != nil {
		t.Errorf("failing healthz = %+v", hb)
	}

	b.set(testBundle("a"), nil)
	s.Refresh(t.Context())
	hb = check(200, "ok")
	if hb.LastSuccess == nil || hb.Feeds != 2 || hb.Events != 40 || hb.LastError != "" || hb.Built == nil || !hb.Built.Equal(testBuilt) {
		t.Errorf("ok healthz = %+v", hb)
	}
	good := *hb.LastSuccess

	b.set(nil, errors.New("disk full"))
	s.Refresh(t.Context())
	hb = check(200, "stale")
	if hb.LastError != "disk full" || hb.LastSuccess == nil || !hb.LastSuccess.Equal(good) {
		t.Errorf("stale healthz = %+v", hb)
	}
}

func TestFailedRefreshKeepsFeeds(t *testing.T) {
	s, b := newTestServer(t, Options{})
	h := s.Handler()
	paths := []string{"/", "/feeds/meadowbrook-sun.ics", "/feeds/kestrel-ridge-moon.ics", "/feeds.json"}
	snapshot := func() map[string]string {
		m := map[string]string{}
		for _, p := range paths {
			for _, enc := range []string{"", "gzip"} {
				r := get(t, h, "GET", p, "Accept-Encoding", enc)
				m[p+enc] = r.Header.Get("ETag") + "\n" + r.Header.Get("Last-Modified") + "\n" + body(t, r)
			}
		}
		return m
	}
	before := snapshot()
	bad := testBundle("b")
	bad.Files[3].Checksum = strings.Repeat("0", 64) // a corrupt bundle is a failed build too
	unsummed := heldBy(testBundle("b"), feedGzip(nil))
	unsummed.Files[3].Checksum = "" // a feed held in its gzip form needs its sum: the bytes are not at hand
	missized := heldBy(testBundle("b"), feedGzip(nil))
	missized.Feeds[0].Bytes-- // meadowbrook-sun.ics: its gzip form's trailer (RFC 1952, ISIZE) says one byte more
	notGzip := heldBy(testBundle("b"), feedGzip(nil))
	notGzip.Files[3].Gzip = []byte(strings.Repeat("BEGIN:VCALENDAR\r\n", 4)) // no gzip header
	for _, fail := range []func(){
		func() { b.set(nil, errors.New("config: feeds[1].site: unknown site \"nowhere\"")) },
		func() { b.set(nil, nil) },
		func() { b.setWhole(bad) },
		func() { b.setWhole(unsummed) },
		func() { b.setWhole(missized) },
		func() { b.setWhole(notGzip) },
		func() {
			dup := testBundle("b")
			dup.Files = append(dup.Files, dup.Files[0])
			b.set(dup, nil)
		},
	} {
		fail()
		if err := s.Refresh(t.Context()); err == nil {
			t.Fatal("refresh succeeded")
		}
		after := snapshot()
		for k, v := range before {
			if after[k] != v {
				t.Errorf("%s changed after a failed refresh", k)
			}
		}
	}
}

func TestBuildPanicIsAFailedRefresh(t *testing.T) {
	calls := 0
	s, _ := newTestServer(t, Options{Build: func(ctx context.Context, _ GzipFunc) (*publish.Bundle, error) {
		calls++
		if calls > 1 {
			panic("catalogue bug")
		}
		return testBundle("a"), nil
	}})
	if err := s.Refresh(t.Context()); err == nil || !strings.Contains(err.Error(), "catalogue bug") {
		t.Fatalf("Refresh = %v, want the panic as an error", err)
	}
	if r := get(t, s.Handler(), "GET", "/feeds/meadowbrook-sun.ics"); r.StatusCode != 200 {
		t.Errorf("status %d after a panicking build", r.StatusCode)
	}
}

func TestReload(t *testing.T) {
	s, old := newTestServer(t, Options{})
	h := s.Handler()
	// An invalid new configuration: refused, the old feeds and the old build stay.
	err := s.Reload(t.Context(), func(context.Context, GzipFunc) (*publish.Bundle, error) {
		return nil, errors.New(`config: feeds[0].kinds[2]: unknown kind "sunrse"`)
	})
	if err == nil {
		t.Fatal("Reload of a failing build succeeded")
	}
	if got := body(t, get(t, h, "GET", "/")); !strings.Contains(got, "feeds a") {
		t.Errorf("index after a refused reload: %q", got)
	}
	s.Refresh(t.Context())
	if old.calls != 2 {
		t.Errorf("old build called %d times, want 2: a refused reload must keep it", old.calls)
	}
	// A valid one: served at once and kept for later refreshes.
	next := &builder{b: testBundle("b")}
	if err := s.Reload(t.Context(), next.build); err != nil {
		t.Fatal(err)
	}
	if got := body(t, get(t, h, "GET", "/")); !strings.Contains(got, "feeds b") {
		t.Errorf("index after reload: %q", got)
	}
	s.Refresh(t.Context())
	if next.calls != 2 || old.calls != 2 {
		t.Errorf("calls: new %d old %d; want the new build used after reload", next.calls, old.calls)
	}
	if err := s.Reload(t.Context(), nil); err == nil {
		t.Error("Reload(nil) accepted")
	}
}

// TestConcurrentSwaps: while bundles are swapped, every response is one
// whole generation: its body hashes to its ETag and is one of the two.
func TestConcurrentSwaps(t *testing.T) {
	s, b := newTestServer(t, Options{})
	h := s.Handler()
	gens := map[string]bool{}
	for _, rev := range []string{"a", "b"} {
		gens[string(testBundle(rev).File("meadowbrook-sun.ics").Data)] = true
	}
	stop := make(chan struct{})
	var wg sync.WaitGroup
	for range 2 {
		untilStopped(&wg, stop, func() bool {
			r := get(t, h, "GET", "/feeds/meadowbrook-sun.ics")
			got := body(t, r)
			sum := sha256.Sum256([]byte(got))
			if !gens[got] || r.Header.Get("ETag") != `"`+hex.EncodeToString(sum[:])+`"` {
				t.Error("response is not one whole generation of the feed")
				return false
			}
			return true
		})
	}
	for i := range 50 {
		b.set(testBundle([]string{"a", "b"}[i%2]), nil)
		if err := s.Refresh(t.Context()); err != nil {
			t.Fatal(err)
		}
	}
	close(stop)
	wg.Wait()
}

func TestMetrics(t *testing.T) {
	s, b := newTestServer(t, Options{Adhoc: adhocICS})
	h := s.Handler()
	get(t, h, "GET", "/feeds/meadowbrook-sun.ics")
	get(t, h, "GET", "/feeds/nope.ics")
	get(t, h, "GET", "/at.ics?lat=95&lon=0&tz=UTC&kinds=sunrise")
	get(t, h, "GET", "/at.ics?lat=45&lon=0&tz=UTC&kinds=sunrise")
	get(t, h, "GET", "/at.ics?lat=45&lon=0&tz=UTC&kinds=sunrise")
	b.set(nil, errors.New("boom"))
	s.Refresh(t.Context())
	out := body(t, get(t, h, "GET", "/metrics"))
	for _, want := range []string{
		`heliocal_http_requests_total{code="200",route="feed"} 1`,
		`heliocal_http_requests_total{code="404",route="feed"} 1`,
		`heliocal_http_requests_total{code="400",route="adhoc"} 1`,
		`heliocal_http_requests_total{code="200",route="adhoc"} 2`,
		`heliocal_adhoc_cache_total{result="hit"} 1`,
		`heliocal_adhoc_cache_total{result="miss"} 1`,
		`heliocal_refreshes_total{result="success",trigger="manual"} 1`,
		`heliocal_refreshes_total{result="failure",trigger="manual"} 1`,
		`heliocal_refresh_duration_seconds_count 2`,
		`heliocal_refresh_last_successful 0`,
		`heliocal_feeds 2`,
		`heliocal_events 40`,
		`heliocal_http_request_duration_seconds_bucket{route="feed",le=`,
	} {
		if !strings.Contains(out, want) {
			t.Errorf("/metrics lacks %s", want)
		}
	}
	if strings.Contains(out, `heliocal_refresh_last_success_timestamp_seconds 0`) {
		t.Error("last success timestamp not set")
	}
}

func TestAccessLog(t *testing.T) {
	var buf bytes.Buffer
	var mu sync.Mutex
	s, _ := newTestServer(t, Options{AccessLogger: slog.New(slog.NewJSONHandler(&lockedBuf{b: &buf, mu: &mu}, nil))})
	req := get(t, s.Handler(), "GET", "/feeds/meadowbrook-sun.ics")
	n := len(body(t, req))
	var line map[string]any
	if err := json.Unmarshal(buf.Bytes(), &line); err != nil {
		t.Fatalf("access log %q: %v", buf.String(), err)
	}
	for k, want := range map[string]any{"msg": "request", "method": "GET", "path": "/feeds/meadowbrook-sun.ics",
		"route": "feed", "status": 200.0, "bytes": float64(n)} {
		if line[k] != want {
			t.Errorf("access log %s = %v, want %v", k, line[k], want)
		}
	}
	for _, k := range []string{"duration", "remote", "user_agent", "params"} {
		if _, ok := line[k]; !ok {
			t.Errorf("access log lacks %s", k)
		}
	}

	// A query's values never reach the log, only the parameter names. (The
	// values are ones no timestamp, duration or address can contain: a plain
	// "47.5" once matched the seconds of the log line's own time.)
	buf.Reset()
	body(t, get(t, s.Handler(), "GET", "/feeds/meadowbrook-sun.ics?token=s3cr3t-value&lat=N47.5q&x%20y=p%40ss"))
	if strings.Contains(buf.String(), "s3cr3t") || strings.Contains(buf.String(), "N47.5q") || strings.Contains(buf.String(), "p@ss") || strings.Contains(buf.String(), "p%40ss") {
		t.Errorf("access log records query values: %s", buf.String())
	}
	line = nil
	if err := json.Unmarshal(buf.Bytes(), &line); err != nil {
		t.Fatalf("access log %q: %v", buf.String(), err)
	}
	if line["params"] != "token,lat,x y" {
		t.Errorf("access log params = %v, want the names token,lat,x y", line["params"])
	}

	// The remote address is the connection's: behind a reverse proxy the
	// proxy's (docs/serving.md), whatever X-Forwarded-For says, even from a
	// proxy trusted for X-Forwarded-Host and -Proto.
	proxied, _ := newTestServer(t, Options{TrustedProxies: []string{"192.0.2.0/24"}, AccessLogger: slog.New(slog.NewJSONHandler(&lockedBuf{b: &buf, mu: &mu}, nil))})
	for _, srv := range []*Server{s, proxied} {
		buf.Reset()
		body(t, get(t, srv.Handler(), "GET", "/feeds/meadowbrook-sun.ics", "X-Forwarded-For", "203.0.113.7"))
		line = nil
		if err := json.Unmarshal(buf.Bytes(), &line); err != nil {
			t.Fatalf("access log %q: %v", buf.String(), err)
		}
		if line["remote"] != "192.0.2.1:1234" { // httptest.NewRequest's RemoteAddr
			t.Errorf("access log remote = %v, want the connection's 192.0.2.1:1234", line["remote"])
		}
	}
}

type lockedBuf struct {
	b  *bytes.Buffer
	mu *sync.Mutex
}

func (l *lockedBuf) Write(p []byte) (int, error) {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.Write(p)
}

func TestNewOptions(t *testing.T) {
	reg := NewRegistry()
	build := func(context.Context, GzipFunc) (*publish.Bundle, error) { return nil, nil }
	for _, tc := range []struct {
		name string
		opts Options
		want string
	}{
		{"no build", Options{}, "Options.Build"},
		{"bad schedule", Options{Build: build, Schedule: "every night"}, `"every night"`},
		{"bad default kinds", Options{Build: build, AdhocDefaultKinds: []string{"sunrise", "sunrse"}}, `kinds="sunrse"`},
		{"default days", Options{Build: build, AdhocMaxDays: 30, AdhocDefaultDays: 60}, "AdhocDefaultDays"},
		{"registry not made by NewRegistry", Options{Build: build, Metrics: &Registry{}}, "NewRegistry"},
	} {
		if _, err := New(tc.opts); err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: New error %v, want one naming %s", tc.name, err, tc.want)
		}
	}
	// The same registry twice: the second server's metrics collide.
	if _, err := New(Options{Build: build, Metrics: reg}); err != nil {
		t.Fatal(err)
	}
	if _, err := New(Options{Build: build, Metrics: reg}); err == nil {
		t.Error("second server on the same registry: no error")
	}
}

func TestCacheControlBounds(t *testing.T) {
	for _, tc := range []struct {
		opts Options
		want string
	}{
		{Options{ScheduleZone: time.UTC}, "public, max-age=86400"},
		{Options{Schedule: "0 */6 * * *", ScheduleZone: time.UTC}, "public, max-age=21600"},
		{Options{RefreshInterval: time.Second}, "public, max-age=60"},
		{Options{RefreshInterval: 7 * 24 * time.Hour}, "public, max-age=86400"},
	} {
		s, _ := newTestServer(t, tc.opts)
		if got := get(t, s.Handler(), "GET", "/feeds.json").Header.Get("Cache-Control"); got != tc.want {
			t.Errorf("%+v: Cache-Control %q, want %q", tc.opts, got, tc.want)
		}
	}
}

// TestCacheControlOfPages: what docs/serving.md promises of the responses
// that are not feeds. The page, its preview, the table, /healthz, /metrics
// and every error are sent with no-store (a browser or proxy keeps none of
// them); the page's own files with no-cache and an ETag, so that a browser
// revalidates them and gets 304 while they are unchanged.
func TestCacheControlOfPages(t *testing.T) {
	s := builderTestServer(t)
	h := s.Handler()
	for _, tc := range []struct {
		method, path string
		status       int
	}{
		{"GET", "/", 200},
		{"GET", "/at.json?lat=47.8&lon=13.05&kinds=sunrise", 200},
		{"GET", "/at?lat=47.8&lon=13.05&kinds=sunrise&days=3", 200},
		{"GET", "/healthz", 200},
		{"GET", "/metrics", 200},
		{"GET", "/at.ics?lat=95&lon=13.05", 400},
		{"GET", "/at.json?lat=95&lon=13.05", 400},
		{"GET", "/at?lat=95&lon=13.05", 400},
		{"GET", "/feeds/no-such-feed.ics", 404},
		{"GET", "/nothing-here", 404},
		{"POST", "/feeds.json", 405},
		{"DELETE", "/feeds/meadowbrook-sun.ics", 405},
	} {
		r := get(t, h, tc.method, tc.path)
		if r.StatusCode != tc.status || r.Header.Get("Cache-Control") != "no-store" {
			t.Errorf("%s %s: %d, Cache-Control %q; want %d, no-store", tc.method, tc.path, r.StatusCode, r.Header.Get("Cache-Control"), tc.status)
		}
	}
	for _, path := range []string{"/assets/builder.js", "/assets/builder.css", "/favicon.svg"} {
		r := get(t, h, "GET", path)
		etag := r.Header.Get("ETag")
		if r.StatusCode != 200 || r.Header.Get("Cache-Control") != "no-cache" || !strings.HasPrefix(etag, `"`) {
			t.Errorf("%s: %d, Cache-Control %q, ETag %q; want 200, no-cache and an ETag", path, r.StatusCode, r.Header.Get("Cache-Control"), etag)
			continue
		}
		if r := get(t, h, "GET", path, "If-None-Match", etag); r.StatusCode != http.StatusNotModified {
			t.Errorf("%s revalidated with its ETag: %d, want 304", path, r.StatusCode)
		}
	}
}

// TestWholeResponse: an unconditional GET or HEAD of a feed is answered as
// http.ServeContent answers it (same status, headers and body), with a
// Content-Length for the gzip form too, which ServeContent leaves out when
// Content-Encoding is set.
func TestWholeResponse(t *testing.T) {
	s, _ := newTestServer(t, Options{})
	a := s.snap.Load().files["meadowbrook-sun.ics"]
	if a.data != nil {
		t.Fatal("the feed is held whole: the test is of one held in its gzip form")
	}
	for _, method := range []string{"GET", "HEAD"} {
		for _, gz := range []bool{false, true} {
			var enc []string
			want := gunzip(a.gz, a.size)
			if gz {
				enc = []string{"Accept-Encoding", "gzip"}
				want = a.gz
			}
			got := get(t, s.Handler(), method, "/feeds/meadowbrook-sun.ics", enc...)
			b := body(t, got)

			// The reference: ServeContent with the headers serveAsset sets.
			ref := httptest.NewRecorder()
			for k, v := range got.Header {
				if k != "Content-Length" && k != "Last-Modified" && k != "Accept-Ranges" {
					ref.Header()[k] = v
				}
			}
			http.ServeContent(ref, httptest.NewRequest(method, "/feeds/meadowbrook-sun.ics", nil), "", a.modTime, bytes.NewReader(want))
			refResp := ref.Result()
			if !gz {
				if !maps.EqualFunc(got.Header, refResp.Header, slices.Equal) {
					t.Errorf("%s: headers\n%v\nwant as ServeContent's\n%v", method, got.Header, refResp.Header)
				}
			}
			if got.StatusCode != http.StatusOK || got.Header.Get("Content-Length") != strconv.Itoa(len(want)) ||
				got.Header.Get("Last-Modified") != refResp.Header.Get("Last-Modified") || got.Header.Get("Accept-Ranges") != "bytes" {
				t.Errorf("%s gzip=%v: status %d, Content-Length %q (want %d), Last-Modified %q (want %q), Accept-Ranges %q",
					method, gz, got.StatusCode, got.Header.Get("Content-Length"), len(want),
					got.Header.Get("Last-Modified"), refResp.Header.Get("Last-Modified"), got.Header.Get("Accept-Ranges"))
			}
			if wantBody := string(want); method == "HEAD" && b != "" || method == "GET" && b != wantBody {
				t.Errorf("%s gzip=%v: body of %d bytes, want %d", method, gz, len(b), len(want))
			}
		}
	}
}

// Last-Modified is when this server first served a file's bytes, not the
// file's ModTime (a feed's DTSTAMP, which a reload changing the feed may
// leave as it was): a client revalidating with the date it holds gets the
// new bytes after a change (RFC 9110 §13.1.3: 304 only when not modified
// since), and 304 while they stay the same.
func TestLastModifiedFollowsBytes(t *testing.T) {
	for _, tc := range []struct {
		name string
		form func(*publish.Bundle, GzipFunc) *publish.Bundle
	}{
		{"held in gzip form", heldBy},
		{"whole", func(b *publish.Bundle, _ GzipFunc) *publish.Bundle { return b }},
	} {
		t.Run(tc.name, func(t *testing.T) { lastModifiedFollowsBytes(t, tc.form) })
	}
}

// lastModifiedFollowsBytes is TestLastModifiedFollowsBytes for reloads
// whose builds give their feeds in the form form makes of them.
func lastModifiedFollowsBytes(t *testing.T, form func(*publish.Bundle, GzipFunc) *publish.Bundle) {
	s, _ := newTestServer(t, Options{})
	h := s.Handler()
	const feedPath = "/feeds/meadowbrook-sun.ics"
	first := get(t, h, "GET", feedPath)
	lm, etag := first.Header.Get("Last-Modified"), first.Header.Get("ETag")
	listing := get(t, h, "GET", "/feeds.json").Header.Get("Last-Modified")

	// a rebuild giving the same bytes
	if err := s.Reload(t.Context(), func(_ context.Context, gzip GzipFunc) (*publish.Bundle, error) {
		return form(testBundle("a"), gzip), nil
	}); err != nil {
		t.Fatal(err)
	}
	if r := get(t, h, "GET", feedPath); r.Header.Get("Last-Modified") != lm || r.Header.Get("ETag") != etag {
		t.Errorf("unchanged rebuild: Last-Modified %q, ETag %q; want %q, %q as before", r.Header.Get("Last-Modified"), r.Header.Get("ETag"), lm, etag)
	}
	if r := get(t, h, "GET", feedPath, "If-Modified-Since", lm); r.StatusCode != http.StatusNotModified {
		t.Errorf("unchanged rebuild, If-Modified-Since %q: status %d, want 304", lm, r.StatusCode)
	}

	// a reload changing the feed, whose files carry the same ModTime
	changed := testBundle("b")
	if changed.File("meadowbrook-sun.ics").ModTime != testBundle("a").File("meadowbrook-sun.ics").ModTime {
		t.Fatal("the two bundles' feeds should carry the same ModTime")
	}
	if err := s.Reload(t.Context(), func(_ context.Context, gzip GzipFunc) (*publish.Bundle, error) { return form(changed, gzip), nil }); err != nil {
		t.Fatal(err)
	}
	r := get(t, h, "GET", feedPath)
	newLM, _ := http.ParseTime(r.Header.Get("Last-Modified"))
	oldLM, _ := http.ParseTime(lm)
	if r.Header.Get("ETag") == etag || !newLM.After(oldLM) {
		t.Errorf("changed feed: ETag %q (before %q), Last-Modified %q; want a new ETag and a date after %q",
			r.Header.Get("ETag"), etag, r.Header.Get("Last-Modified"), lm)
	}
	r = get(t, h, "GET", feedPath, "If-Modified-Since", lm)
	if got := body(t, r); r.StatusCode != http.StatusOK || got != string(changed.File("meadowbrook-sun.ics").Data) {
		t.Errorf("changed feed, If-Modified-Since the old %q: status %d, want 200 with the new feed", lm, r.StatusCode)
	}
	if r := get(t, h, "GET", feedPath, "If-Modified-Since", r.Header.Get("Last-Modified")); r.StatusCode != http.StatusNotModified {
		t.Errorf("changed feed, If-Modified-Since its own date: status %d, want 304", r.StatusCode)
	}
	// feeds.json, the same bytes in both bundles, keeps its date
	if got := get(t, h, "GET", "/feeds.json").Header.Get("Last-Modified"); got != listing {
		t.Errorf("feeds.json unchanged: Last-Modified %q, want %q as before", got, listing)
	}
}

// A configured feed is held in its gzip form alone, as the command's build
// gives it (publish.RenderOptions.Gzip): no copy of its bytes, so that a
// server of many feeds holds each once, compressed. A feed too small to be
// worth compressing, feeds.json and the index keep their bytes.
func TestFeedHeldInGzipForm(t *testing.T) {
	s, _ := newTestServer(t, Options{})
	want := testBundle("a")
	files := s.snap.Load().files
	a := files["meadowbrook-sun.ics"]
	if a.data != nil || a.gz == nil {
		t.Errorf("meadowbrook-sun.ics held with %d bytes and a gzip form of %d, want its gzip form alone", len(a.data), len(a.gz))
	} else if got := gunzip(a.gz, a.size); !bytes.Equal(got, want.File("meadowbrook-sun.ics").Data) || a.size != len(got) {
		t.Errorf("meadowbrook-sun.ics: its gzip form holds %d bytes (size %d), not the feed's %d", len(got), a.size, len(want.File("meadowbrook-sun.ics").Data))
	}
	for _, name := range []string{"kestrel-ridge-moon.ics", "feeds.json", "index.html"} {
		if a := files[name]; a.data == nil || a.size != len(a.data) || !bytes.Equal(a.data, want.File(name).Data) {
			t.Errorf("%s held without its bytes (size %d)", name, a.size)
		}
	}
}

// A feed held in its gzip form answers every request as the same feed held
// whole does (as serve held every configured feed before): the same
// status, validators, Content-Length, Content-Range and body, for a client
// that takes gzip and one that does not, for GET and HEAD, conditional
// requests and ranges (http.ServeContent's answers), the identity form
// inflated for the request.
func TestHeldFeedAnswersAsWhole(t *testing.T) {
	held, _ := newTestServer(t, Options{})
	b := &builder{}
	b.setWhole(testBundle("a"))
	whole, _ := newTestServer(t, Options{Build: b.build})
	if held.snap.Load().files["meadowbrook-sun.ics"].data != nil || whole.snap.Load().files["meadowbrook-sun.ics"].data == nil {
		t.Fatal("the two servers should hold the feed in its gzip form alone and whole")
	}
	const feedPath = "/meadowbrook-sun.ics"
	n := len(testBundle("a").File("meadowbrook-sun.ics").Data)
	for _, enc := range []string{"", "gzip"} {
		etag := get(t, whole.Handler(), "GET", feedPath, "Accept-Encoding", enc).Header.Get("ETag")
		for _, tc := range [][]string{
			{},
			{"Range", "bytes=0-99"},
			{"Range", "bytes=100-"},
			{"Range", "bytes=-50"},
			{"Range", "bytes=" + strconv.Itoa(n-10) + "-" + strconv.Itoa(n+10)},
			{"Range", "bytes=" + strconv.Itoa(10*n) + "-"}, // not satisfiable: 416
			{"Range", "bytes=0-9,20-29"},                   // multipart/byteranges
			{"Range", "bytes=50-59,0-9,30-39"},             // its parts going backwards
			{"If-None-Match", etag},
			{"If-None-Match", `"0000"`},
			{"If-None-Match", `"0000"`, "Range", "bytes=5-15"},
			{"If-Range", etag, "Range", "bytes=5-15"},
			{"If-Range", `"0000"`, "Range", "bytes=5-15"},
			{"If-Match", etag, "Range", "bytes=5-15"},
			{"If-Match", `"0000"`},
		} {
			for _, method := range []string{"GET", "HEAD"} {
				headers := append([]string{"Accept-Encoding", enc}, tc...)
				got, want := get(t, held.Handler(), method, feedPath, headers...), get(t, whole.Handler(), method, feedPath, headers...)
				gotBody, wantBody := body(t, got), body(t, want)
				what := fmt.Sprintf("%s %q", method, headers)
				if got.StatusCode != want.StatusCode {
					t.Errorf("%s: status %d, want %d", what, got.StatusCode, want.StatusCode)
					continue
				}
				for _, k := range []string{"Etag", "Content-Length", "Content-Range", "Content-Encoding", "Content-Type", "Vary", "Accept-Ranges"} {
					g, w := got.Header.Get(k), want.Header.Get(k)
					if k == "Content-Type" && strings.HasPrefix(w, "multipart/byteranges") {
						g, w = g[:strings.Index(g, "boundary=")], w[:strings.Index(w, "boundary=")]
					}
					if g != w {
						t.Errorf("%s: %s %q, want %q", what, k, g, w)
					}
				}
				if mime := want.Header.Get("Content-Type"); strings.HasPrefix(mime, "multipart/byteranges") {
					// each part's boundary is drawn at random: compare without them
					gotBody = strings.ReplaceAll(gotBody, got.Header.Get("Content-Type")[strings.Index(got.Header.Get("Content-Type"), "boundary=")+len("boundary="):], "")
					wantBody = strings.ReplaceAll(wantBody, mime[strings.Index(mime, "boundary=")+len("boundary="):], "")
				}
				if gotBody != wantBody {
					t.Errorf("%s: body of %d bytes differs from the %d held whole", what, len(gotBody), len(wantBody))
				}
			}
		}
	}
}

// http.ServeContent learns a body's size by seeking to its end and back
// to its start: a feed held in its gzip form answers from the size it
// keeps, so a HEAD costs no decompression; a seek anywhere only moves the
// offset, and a read inflates from where it was sought.
func TestGunzipReaderSize(t *testing.T) {
	data := icsFor("meadowbrook-sun", 40, "a")
	gz := gzipBytes(data)
	g := &gunzipReader{gz: gz, size: int64(len(data))}
	if n, err := g.Seek(0, io.SeekEnd); n != int64(len(data)) || err != nil {
		t.Errorf("Seek to the end: %d, %v; want %d", n, err, len(data))
	}
	if n, err := io.ReadAll(g); len(n) != 0 || err != nil {
		t.Errorf("read at the end: %d bytes, %v; want none", len(n), err)
	}
	g = &gunzipReader{gz: gz, size: int64(len(data))}
	g.Seek(0, io.SeekEnd)
	if n, err := g.Seek(0, io.SeekStart); n != 0 || err != nil || g.zr != nil || g.whole != nil {
		t.Errorf("Seek back to the start: %d, %v, inflated %v; want 0 without inflating", n, err, g.zr != nil || g.whole != nil)
	}
	if got, err := io.ReadAll(g); err != nil || !bytes.Equal(got, data) {
		t.Errorf("read from the start: %d bytes, %v; want the %d of the feed", len(got), err, len(data))
	}
	g = &gunzipReader{gz: gz, size: int64(len(data))}
	if n, err := g.Seek(100, io.SeekStart); n != 100 || err != nil {
		t.Errorf("Seek to 100: %d, %v", n, err)
	}
	if got, err := io.ReadAll(g); err != nil || !bytes.Equal(got, data[100:]) {
		t.Errorf("read from 100: %d bytes, %v; want the feed's last %d", len(got), err, len(data)-100)
	}
}

// A feed held in its gzip form is inflated into the reader's buffer as it
// is read, never whole, wherever the reads start as long as they go
// forwards (a conditional request answered 200, a range, the parts of a
// multipart range in order); a read before where the inflating has reached
// inflates it whole once. Every read gives the feed's own bytes.
func TestGunzipReaderStreams(t *testing.T) {
	data := icsFor("meadowbrook-sun", 400, "a")
	gz := gzipBytes(data)
	g := &gunzipReader{gz: gz, size: int64(len(data))}
	var got []byte
	buf := make([]byte, 4096)
	for {
		n, err := g.Read(buf)
		got = append(got, buf[:n]...)
		if err == io.EOF {
			break
		} else if err != nil {
			t.Fatalf("read at %d: %v", len(got), err)
		}
	}
	if !bytes.Equal(got, data) || g.whole != nil {
		t.Errorf("read in 4 kB pieces: %d bytes of %d, held whole %v; want the feed, never held whole", len(got), len(data), g.whole != nil)
	}
	g.release()

	g = &gunzipReader{gz: gz, size: int64(len(data))}
	read := func(off, n int) []byte {
		t.Helper()
		if _, err := g.Seek(int64(off), io.SeekStart); err != nil {
			t.Fatalf("Seek to %d: %v", off, err)
		}
		b := make([]byte, n)
		if _, err := io.ReadFull(g, b); err != nil {
			t.Fatalf("read %d bytes at %d: %v", n, off, err)
		}
		return b
	}
	for _, part := range [][2]int{{0, 10}, {10, 10}, {5000, 100}, {len(data) - 7, 7}} { // "bytes=0-9,10-19,5000-5099,-7"
		off, n := part[0], part[1]
		if b := read(off, n); !bytes.Equal(b, data[off:off+n]) || g.whole != nil {
			t.Errorf("forwards, %d bytes at %d: %q, held whole %v; want %q, not held whole", n, off, b, g.whole != nil, data[off:off+n])
		}
	}
	for _, off := range []int{100, 50, 6000} { // backwards: inflated whole once, then read from it
		if b := read(off, 20); !bytes.Equal(b, data[off:off+20]) || g.whole == nil || g.zr != nil {
			t.Errorf("backwards, 20 bytes at %d: %q, held whole %v, decompressor kept %v; want %q from the feed held whole",
				off, b, g.whole != nil, g.zr != nil, data[off:off+20])
		}
	}
	if n, err := g.Seek(-1, io.SeekStart); err == nil {
		t.Errorf("Seek to -1: %d, no error", n)
	}
	if n, err := g.Seek(int64(len(data))+10, io.SeekStart); err != nil || n != int64(len(data))+10 {
		t.Errorf("Seek past the end: %d, %v", n, err)
	} else if n, err := g.Read(buf); n != 0 || err != io.EOF {
		t.Errorf("read past the end: %d bytes, %v; want io.EOF", n, err)
	}
}

// A client that does not take gzip and revalidates a feed held in its
// gzip form with an ETag it no longer has (every subscribed calendar after
// a refresh that moves the window) gets the feed inflated into the
// response as an unconditional request does, not into a copy of the whole
// feed held for the request; so does a range of it. Measured as the bytes
// the handler allocates a request, against the feed's size.
func TestRevalidatedHeldFeedNotCopied(t *testing.T) {
	data := icsFor("meadowbrook-sun", 8000, "a") // about 1.1 MB, as a fleet feed
	bundle := &publish.Bundle{Built: testBuilt,
		Feeds: []publish.FeedInfo{{ID: "meadowbrook-sun", File: "meadowbrook-sun.ics", Events: 8000, Bytes: len(data)}},
		Files: []publish.File{file("meadowbrook-sun.ics", "text/calendar; charset=utf-8", data)}}
	s, _ := newTestServer(t, Options{Build: func(_ context.Context, gzip GzipFunc) (*publish.Bundle, error) { return heldBy(bundle, gzip), nil }})
	if a := s.snap.Load().files["meadowbrook-sun.ics"]; a == nil || a.data != nil {
		t.Fatal("the feed should be held in its gzip form alone")
	}
	h := s.Handler()
	for _, tc := range []struct {
		header, value string
		code, n       int
	}{
		{"If-None-Match", `"0000"`, http.StatusOK, len(data)},
		{"If-Modified-Since", testBuilt.Add(-time.Hour).UTC().Format(http.TimeFormat), http.StatusOK, len(data)},
		{"Range", "bytes=-100", http.StatusPartialContent, 100},
		{"Range", "bytes=0-9,500-509", http.StatusPartialContent, -1},
	} {
		req := httptest.NewRequest("GET", "/meadowbrook-sun.ics", nil)
		req.Header.Set(tc.header, tc.value)
		serve := func() {
			w := discardWriter{h: http.Header{}}
			h.ServeHTTP(&w, req)
			if w.code != tc.code || (tc.n >= 0 && w.n != tc.n) {
				t.Fatalf("%s: %s: status %d, %d bytes; want %d, %d", tc.header, tc.value, w.code, w.n, tc.code, tc.n)
			}
		}
		serve() // the decompressor made once
		const requests = 10
		var before, after runtime.MemStats
		runtime.ReadMemStats(&before)
		for range requests {
			serve()
		}
		runtime.ReadMemStats(&after)
		if per := (after.TotalAlloc - before.TotalAlloc) / requests; per > uint64(len(data)/10) {
			t.Errorf("%s: %s: %d bytes allocated a request for a feed of %d; want no copy of the feed (under a tenth of it)",
				tc.header, tc.value, per, len(data))
		}
	}
}

// A browser that asks for nothing (a mistyped or old address) gets a page
// of the site, 404, with its language, title and heading, the address it
// asked for and a link to the main page, and the page's own style found
// relative to its address however deep it is (a proxy may serve heliocal
// under a path); any other client, a calendar app or a script, gets the
// one line of plain text it got before.
func TestNotFoundPage(t *testing.T) {
	s := builderTestServer(t)
	h := s.Handler()
	const browserAccept = "text/html,application/xhtml+xml,application/xml;q=0.9,*/*;q=0.8"
	for _, tc := range []struct{ path, up string }{
		{"/nothing-here", ""}, {"/a/b/nope", "../../"}, {"/feeds/no-such-feed.ics", "../"}, {"/gone.ics", ""},
	} {
		r := get(t, h, "GET", tc.path, "Accept", browserAccept)
		page := body(t, r)
		if r.StatusCode != 404 || r.Header.Get("Content-Type") != "text/html; charset=utf-8" || r.Header.Get("Cache-Control") != "no-store" {
			t.Errorf("%s from a browser: %d, %q, Cache-Control %q; want 404, an HTML page, no-store", tc.path, r.StatusCode, r.Header.Get("Content-Type"), r.Header.Get("Cache-Control"))
			continue
		}
		main := tc.up
		if main == "" {
			main = "./"
		}
		for _, want := range []string{`<html lang="en">`, "<title>Not found · ", "<h1>Nothing here</h1>",
			"Nothing is published at &#34;" + tc.path + "&#34;.", `<a href="` + main + `">The main page</a>`,
			`<link rel="stylesheet" href="` + tc.up + `assets/builder.css">`} {
			if !strings.Contains(page, want) {
				t.Errorf("%s from a browser: the page lacks %q", tc.path, want)
			}
		}
	}
	for _, tc := range []struct{ path, accept, want string }{
		{"/nothing-here", "", `not found: "/nothing-here"` + "\n"},
		{"/feeds/no-such-feed.ics", "text/calendar", `no such feed: "no-such-feed.ics"` + "\n"},
		{"/" + strings.Repeat("a/", maxNotFoundDepth+1) + "b", browserAccept, `not found: "/` + strings.Repeat("a/", maxNotFoundDepth+1) + `b"` + "\n"},
	} {
		r := get(t, h, "GET", tc.path, "Accept", tc.accept)
		if got := body(t, r); r.StatusCode != 404 || r.Header.Get("Content-Type") != "text/plain; charset=utf-8" || got != tc.want {
			t.Errorf("%s, Accept %q: %d, %q, %q; want 404 and the plain %q", tc.path, tc.accept, r.StatusCode, r.Header.Get("Content-Type"), got, tc.want)
		}
	}
}
