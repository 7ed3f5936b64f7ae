package serve

import (
	"context"
	"io"
	"net/http"
	"net/http/httptest"
	"testing"
)

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
	return len(p), nil
}
