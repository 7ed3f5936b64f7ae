package serve

import (
	"context"
	"io"
	"net/http"
	"net/http/httptest"
	"strings"
	"testing"
	"time"

	"heliocal/config"
	"heliocal/feed"
	"heliocal/feed/publish"
	"heliocal/internal/fleet"
)

// fleetBundle renders the first site of tools/fleet's fleet (internal/fleet):
// one feed of the daily kinds over 400 days, about 1.1 MB, its name and
// bytes, and the bundle, with gzip as its RenderOptions.Gzip.
func fleetBundle(tb testing.TB, gzip GzipFunc) (name string, data []byte, b *publish.Bundle) {
	tb.Helper()
	name, srcs := firstFeed(tb, fleet.YAML(1))
	whole, err := publish.Render(context.Background(), srcs, publish.RenderOptions{MaxFeedBytes: -1})
	if err != nil {
		tb.Fatal(err)
	}
	if b, err = publish.Render(context.Background(), srcs, publish.RenderOptions{MaxFeedBytes: -1, Gzip: gzip}); err != nil {
		tb.Fatal(err)
	}
	return name, whole.File(name).Data, b
}

// heldForm is a bundle of the fleet feed of fleetBundle held in one form.
type heldForm struct {
	form   string // "gzip": in its gzip form alone, as serve holds a feed; "whole": its bytes
	bundle *publish.Bundle
}

// fleetForms is fleetBundle's feed, its name and bytes, and the bundles
// that hold it in its gzip form, as serve holds a configured feed, and
// whole, as it held one before.
func fleetForms(tb testing.TB) (name string, data []byte, forms []heldForm) {
	tb.Helper()
	name, data, held := fleetBundle(tb, feedGzip(nil))
	whole := &publish.Bundle{Files: []publish.File{file(name, "", data)}}
	return name, data, []heldForm{{"gzip", held}, {"whole", whole}}
}

// firstFeed is the file name of the first feed of the configuration
// yamlText and the source that builds it, as of 20 March 2027.
func firstFeed(tb testing.TB, yamlText string) (name string, srcs []publish.Source) {
	tb.Helper()
	cfg, err := config.Parse(strings.NewReader(yamlText), "yaml")
	if err != nil {
		tb.Fatal(err)
	}
	cat, err := feed.NewCatalogue(cfg, feed.Options{Now: time.Date(2027, 3, 20, 12, 0, 0, 0, time.UTC), Refresh: 24 * time.Hour})
	if err != nil {
		tb.Fatal(err)
	}
	f := &cfg.Feeds[0]
	return f.ID + ".ics", []publish.Source{{ID: f.ID, Build: func(ctx context.Context) (*feed.Calendar, error) { return cat.Calendar(ctx, f) }}}
}

// BenchmarkServeFeedIdentity: the handler's cost for a full response to a
// client that does not take gzip, of a 400-day feed of the daily kinds
// (about 1.1 MB): held in its gzip form and inflated into the response, as
// serve holds a configured feed, and held whole, as it held one before.
func BenchmarkServeFeedIdentity(b *testing.B) {
	name, data, forms := fleetForms(b)
	for _, tc := range forms {
		b.Run("held="+tc.form, func(b *testing.B) {
			s, _ := newTestServer(b, Options{Build: func(context.Context, GzipFunc) (*publish.Bundle, error) { return tc.bundle, nil }})
			h := s.Handler()
			if a := s.snap.Load().files[name]; (a.data == nil) != (tc.form == "gzip") || a.size != len(data) {
				b.Fatalf("%s held with %d bytes of %d, not in the form %s", name, len(a.data), len(data), tc.form)
			}
			req := httptest.NewRequest("GET", "/"+name, nil)
			b.SetBytes(int64(len(data)))
			b.ReportAllocs()
			for b.Loop() {
				w := discardWriter{h: http.Header{}}
				h.ServeHTTP(&w, req)
				if w.code != 200 || w.n != len(data) {
					b.Fatalf("status %d, %d bytes of %d", w.code, w.n, len(data))
				}
			}
		})
	}
}

// BenchmarkServeFeedIdentityRevalidated: the handler's cost, for a client
// that does not take gzip, of the fleet feed of BenchmarkServeFeedIdentity
// asked for with an ETag it no longer has (as every subscribed calendar
// revalidates after a refresh that moved the window: 200 and the whole
// feed) and of its last 100 bytes (a Range: 206), held in its gzip form
// and held whole.
func BenchmarkServeFeedIdentityRevalidated(b *testing.B) {
	name, data, forms := fleetForms(b)
	for _, tc := range forms {
		for _, rq := range []struct {
			what, header, value string
			code, n             int
		}{
			{"stale", "If-None-Match", `"0000"`, http.StatusOK, len(data)},
			{"range", "Range", "bytes=-100", http.StatusPartialContent, 100},
		} {
			b.Run("held="+tc.form+"/req="+rq.what, func(b *testing.B) {
				s, _ := newTestServer(b, Options{Build: func(context.Context, GzipFunc) (*publish.Bundle, error) { return tc.bundle, nil }})
				h := s.Handler()
				req := httptest.NewRequest("GET", "/"+name, nil)
				req.Header.Set(rq.header, rq.value)
				b.ReportAllocs()
				for b.Loop() {
					w := discardWriter{h: http.Header{}}
					h.ServeHTTP(&w, req)
					if w.code != rq.code || w.n != rq.n {
						b.Fatalf("status %d, %d bytes; want %d, %d", w.code, w.n, rq.code, rq.n)
					}
				}
			})
		}
	}
}

// BenchmarkConditionalGET: the handler's cost for a revalidation answered
// 304 (no network).
func BenchmarkConditionalGET(b *testing.B) {
	s, _ := newTestServer(b, Options{})
	h := s.Handler()
	etag := `"` + s.snap.Load().files["meadowbrook-sun.ics"].sum + `-gz"`
	b.ReportAllocs()
	b.RunParallel(func(pb *testing.PB) {
		req := httptest.NewRequest("GET", "/feeds/meadowbrook-sun.ics", nil)
		req.Header.Set("Accept-Encoding", "gzip")
		req.Header.Set("If-None-Match", etag)
		for pb.Next() {
			w := discardWriter{h: http.Header{}}
			h.ServeHTTP(&w, req)
			if w.code != 304 {
				b.Fatalf("status %d", w.code)
			}
		}
	})
}

// BenchmarkFullGET: the handler's cost for a full gzip response.
func BenchmarkFullGET(b *testing.B) {
	s, _ := newTestServer(b, Options{})
	h := s.Handler()
	b.ReportAllocs()
	b.RunParallel(func(pb *testing.PB) {
		req := httptest.NewRequest("GET", "/feeds/meadowbrook-sun.ics", nil)
		req.Header.Set("Accept-Encoding", "gzip")
		for pb.Next() {
			w := discardWriter{h: http.Header{}}
			h.ServeHTTP(&w, req)
			if w.code != 200 {
				b.Fatalf("status %d", w.code)
			}
		}
	})
}

// BenchmarkConditionalGETLoopback: 304s over real loopback connections,
// client and server in this process (so sharing its CPUs); reports req/s.
func BenchmarkConditionalGETLoopback(b *testing.B) {
	s, _ := newTestServer(b, Options{})
	ln := listen(b)
	ctx, cancel := context.WithCancel(context.Background())
	done := make(chan error, 1)
	go func() { done <- s.Run(ctx, ln) }()
	defer func() { cancel(); <-done }()
	url := "http://" + ln.Addr().String() + "/feeds/meadowbrook-sun.ics"
	etag := `"` + s.snap.Load().files["meadowbrook-sun.ics"].sum + `-gz"`
	tr := &http.Transport{MaxIdleConnsPerHost: 64, DisableCompression: true}
	defer tr.CloseIdleConnections()
	client := &http.Client{Transport: tr}
	b.SetParallelism(2)
	b.ResetTimer()
	b.RunParallel(func(pb *testing.PB) {
		for pb.Next() {
			req, _ := http.NewRequest("GET", url, nil)
			req.Header.Set("Accept-Encoding", "gzip")
			req.Header.Set("If-None-Match", etag)
			resp, err := client.Do(req)
			if err != nil {
				b.Fatal(err)
			}
			io.Copy(io.Discard, resp.Body)
			resp.Body.Close()
			if resp.StatusCode != 304 {
				b.Fatalf("status %d", resp.StatusCode)
			}
		}
	})
	b.ReportMetric(float64(b.N)/b.Elapsed().Seconds(), "req/s")
}

type discardWriter struct {
	h    http.Header
	code int
	n    int // the bytes written
}

func (w *discardWriter) Header() http.Header { return w.h }
func (w *discardWriter) WriteHeader(c int) {
	if w.code == 0 {
		w.code = c
	}
}
func (w *discardWriter) Write(p []byte) (int, error) {
	if w.code == 0 {
		w.code = 200
	}
	w.n += len(p)
	return len(p), nil
}
