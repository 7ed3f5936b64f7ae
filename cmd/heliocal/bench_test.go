package main

import (
	"bytes"
	"context"
	"fmt"
	"io"
	"log/slog"
	"net/http"
	"net/http/httptest"
	"os"
	"testing"
	"time"

	"heliocal/feed/publish"
	"heliocal/feed/serve"
	"heliocal/internal/cputime"
)

// eventsArgs is the events command measured against PyEphem by
// tools/pyephem-compare (README, Performance): 20 years, 11 kinds of the
// Sun's daily events, JSON.
var eventsArgs = []string{"events", "--lat", "47.3", "--lon", "8.5", "--elev", "400", "--tz", "UTC",
	"--from", "2020-01-01", "--to", "2039-12-31", "--kinds",
	"sunrise,sunset,solar-noon,civil-dawn,civil-dusk,nautical-dawn,nautical-dusk,astronomical-dawn,astronomical-dusk,sun-altitude:6,sun-altitude:-4",
	"--format", "json"}

// countingWriter counts the bytes written, and the events ("kind" keys)
// when events is set.
type countingWriter struct {
	bytes  int
	count  bool
	events int
}

func (c *countingWriter) Write(p []byte) (int, error) {
	c.bytes += len(p)
	if c.count {
		c.events += bytes.Count(p, []byte(`"kind"`))
	}
	return len(p), nil
}

// benchCommand runs the whole command path (flags, ephemeris, search,
// writing) as main does, output discarded; the events are counted once,
// before the timed runs. cpu-ms/op is the process's CPU time per command
// (garbage collection included), which a busy machine disturbs less than
// the wall time.
func benchCommand(b *testing.B, args []string) {
	w := &countingWriter{count: true}
	if code := run(context.Background(), args, w, io.Discard, noEnv); code != 0 {
		b.Fatalf("exit %d", code)
	}
	n := w.events
	b.ReportAllocs()
	cpu0 := cputime.Used()
	for b.Loop() {
		if code := run(context.Background(), args, &countingWriter{}, io.Discard, noEnv); code != 0 {
			b.Fatalf("exit %d", code)
		}
	}
	b.ReportMetric(float64(cputime.Used()-cpu0)/1e6/float64(b.N), "cpu-ms/op")
	b.ReportMetric(float64(n), "events/op")
	b.ReportMetric(float64(n)*float64(b.N)/b.Elapsed().Seconds(), "events/s")
}

// BenchmarkEventsCommand20Years: the 20-year, 11-kind JSON events command
// (≈ 95,000 events), ephemeris build included.
func BenchmarkEventsCommand20Years(b *testing.B) { benchCommand(b, eventsArgs) }

// BenchmarkEventsCommand20YearsCSV and …Table: the same in the other
// formats.
func BenchmarkEventsCommand20YearsCSV(b *testing.B) {
	benchCommand(b, append(eventsArgs[:len(eventsArgs)-1:len(eventsArgs)-1], "csv"))
}

func BenchmarkEventsCommand20YearsTable(b *testing.B) {
	benchCommand(b, append(eventsArgs[:len(eventsArgs)-1:len(eventsArgs)-1], "table"))
}

// BenchmarkAdhocFeed: the server's work for an ad-hoc one-year feed for a
// new place (sunrise, sunset, civil dawn and dusk: the default kinds),
// catalogue and iCalendar encoding; the dates' shared ephemeris is built
// once, as the server keeps it for every place.
func BenchmarkAdhocFeed(b *testing.B) { benchAdhocFeed(b, nil) }

// BenchmarkAdhocFeedSkyline: the same with a skyline of 72 points, one
// every 5° (the most an ad-hoc query takes), between 3° and 11°.
func BenchmarkAdhocFeedSkyline(b *testing.B) {
	pts := make([][2]float64, 72)
	for i := range pts {
		pts[i] = [2]float64{float64(i * 5), float64(3 + 2*(i*7%5))}
	}
	benchAdhocFeed(b, pts)
}

func benchAdhocFeed(b *testing.B, skyline [][2]float64) {
	vienna, err := time.LoadLocation("Europe/Vienna")
	if err != nil {
		b.Fatal(err)
	}
	build := adhocFeedBytes(newLayout(""), 24*time.Hour)
	q := serve.AdhocQuery{Latitude: 47.8, Longitude: 13.05, Location: vienna,
		Kinds: []string{"civil-dawn", "civil-dusk", "sunrise", "sunset"},
		Start: time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC), Days: 365, Skyline: skyline}
	if _, err := build(context.Background(), q, nil); err != nil { // the shared ephemeris
		b.Fatal(err)
	}
	b.ReportAllocs()
	var size int
	var data []byte // the server reuses its buffer from one feed to the next
	cpu0 := cputime.Used()
	for i := 0; b.Loop(); i++ {
		q.Latitude = 40 + float64(i%1000)*0.01 // a new place each time
		var err error
		data, err = build(context.Background(), q, data[:0])
		if err != nil {
			b.Fatal(err)
		}
		size = len(data)
	}
	b.ReportMetric(float64(cputime.Used()-cpu0)/1e6/float64(b.N), "cpu-ms/op")
	b.ReportMetric(float64(size), "bytes/feed")
}

// BenchmarkAdhocRequest: all the server does for a request of an ad-hoc
// one-year feed for a new place, as `heliocal serve` answers it: the
// handler parses the query, misses the cache, builds the feed (catalogue
// and encoding), hashes and compresses it, caches it and writes the gzip
// response a calendar client asks for. cpu-ms/op is the process's CPU
// time per request (garbage collection included), which a busy machine
// disturbs less than the wall time.
func BenchmarkAdhocRequest(b *testing.B) {
	defer startServeGC(os.LookupEnv)() // the collector's policy of heliocal serve (GOGC=100 in the environment: the runtime's default)
	set := func() adhocSettings { return adhocSettings{layout: newLayout(""), refresh: 24 * time.Hour} }
	srv, err := serve.New(serve.Options{
		Logger:            slog.New(slog.DiscardHandler),
		Build:             func(context.Context, serve.GzipFunc) (*publish.Bundle, error) { return &publish.Bundle{}, nil },
		Adhoc:             adhocFeedFrom(set),
		AdhocDefaultKinds: []string{"sunrise", "sunset", "civil-dawn", "civil-dusk"},
	})
	if err != nil {
		b.Fatal(err)
	}
	h := srv.Handler()
	get := func(i int) *discardResponse {
		// a new place each time (the latitude's third decimal), as tools/loadtest asks
		r := httptest.NewRequest("GET", fmt.Sprintf("/at.ics?lat=%.3f&lon=13.05&tz=Europe/Vienna&start=2027-01-01&days=365", 40+float64(i)*0.001), nil)
		r.Header.Set("Accept-Encoding", "gzip")
		w := &discardResponse{h: http.Header{}}
		h.ServeHTTP(w, r)
		if w.code != http.StatusOK || w.h.Get("Content-Encoding") != "gzip" {
			b.Fatalf("status %d, Content-Encoding %q", w.code, w.h.Get("Content-Encoding"))
		}
		return w
	}
	get(-1) // the dates' shared ephemeris, built once for every place
	b.ReportAllocs()
	var size int64
	cpu0 := cputime.Used()
	for i := 0; b.Loop(); i++ {
		size = get(i).n
	}
	b.ReportMetric(float64(cputime.Used()-cpu0)/1e6/float64(b.N), "cpu-ms/op")
	b.ReportMetric(float64(size), "gzip-bytes/op")
}

// BenchmarkAdhocPreview: the builder's preview (/at.json) as a visitor
// asks for it: seven days, and the subscribe link's window, sized so that
// the rolling subscription fits max_feed_bytes on every day of the year (a
// year of the query's entries, encoded). At 48.2° N with the default kinds
// a year fits; at 71.29° N with seven kinds it does not (290 days).
// cpu-ms/op is the process's CPU time per request.
func BenchmarkAdhocPreview(b *testing.B) {
	benchPreviews(b, previewServer(b, "sunrise", "sunset", "civil-dawn", "civil-dusk"), []struct{ name, query string }{
		{"vienna", "lat=48.2&lon=16.4&tz=Europe/Vienna&start=2026-12-04"},
		{"utqiagvik", "lat=71.29&lon=-156.8&kinds=sunrise,sunset,civil-dawn,civil-dusk,golden-hour,moonrise,moonset&start=2026-12-04"},
	})
}

// BenchmarkPreviewLampsNote: the builder's preview (/at.json) of a week
// that needs no lamps, whose note looks beyond the week for the date the
// lamps are needed again, as the subscribed feed does: 2 July, within two
// weeks (vienna), or months on (tromso, and utqiagvik at 71.29° N, with
// the Moon's kinds too). cpu-ms/op is the process's CPU time per request.
func BenchmarkPreviewLampsNote(b *testing.B) {
	benchPreviews(b, previewServer(b, "sunrise", "sunset"), []struct{ name, query string }{
		{"vienna", "lat=48.2&lon=16.4&tz=Europe/Vienna&kinds=lighting:16h,sunrise,sunset&start=2027-06-20"},
		{"tromso", "lat=69.65&lon=18.96&tz=Europe/Oslo&kinds=lighting:16h,sunrise,sunset&start=2027-05-20"},
		{"utqiagvik", "lat=71.29&lon=-156.8&kinds=lighting:16h,sunrise,sunset,moonrise,moonset&start=2027-05-20"},
	})
}

// benchPreviews runs a sub-benchmark a case that asks h for the preview of
// its query, after one request that builds the dates' shared ephemeris.
func benchPreviews(b *testing.B, h http.Handler, cases []struct{ name, query string }) {
	for _, c := range cases {
		b.Run(c.name, func(b *testing.B) {
			get := func() {
				w := &discardResponse{h: http.Header{}}
				h.ServeHTTP(w, httptest.NewRequest("GET", "/at.json?"+c.query, nil))
				if w.code != http.StatusOK {
					b.Fatalf("status %d", w.code)
				}
			}
			get()
			cpu0 := cputime.Used()
			for b.Loop() {
				get()
			}
			b.ReportMetric(float64(cputime.Used()-cpu0)/1e6/float64(b.N), "cpu-ms/op")
		})
	}
}

// discardResponse is a ResponseWriter that keeps the status and headers
// and counts the body's bytes.
type discardResponse struct {
	h    http.Header
	code int
	n    int64
}

func (w *discardResponse) Header() http.Header { return w.h }
func (w *discardResponse) WriteHeader(c int) {
	if w.code == 0 {
		w.code = c
	}
}
func (w *discardResponse) Write(p []byte) (int, error) {
	if w.code == 0 {
		w.code = http.StatusOK
	}
	w.n += int64(len(p))
	return len(p), nil
}

// BenchmarkPublishDemo publishes the built-in demo (its feeds, feeds.json
// and index.html with a year's chart per site) into a fresh directory, as
// `heliocal publish` does. Its CPU profile shows the charts' share.
func BenchmarkPublishDemo(b *testing.B) {
	b.ReportAllocs()
	for b.Loop() {
		if code := run(context.Background(), []string{"publish", "--out", b.TempDir()}, io.Discard, io.Discard, noEnv); code != 0 {
			b.Fatalf("exit %d", code)
		}
	}
}

// previewServer is the handler of a server whose ad-hoc feeds and previews
// (/at.ics, /at.json) are built as serve builds them, with kinds as their
// default kinds, and which has no configured feeds.
func previewServer(b *testing.B, kinds ...string) http.Handler {
	set := func() adhocSettings { return adhocSettings{layout: newLayout(""), refresh: 24 * time.Hour} }
	srv, err := serve.New(serve.Options{
		Logger:            slog.New(slog.DiscardHandler),
		Build:             func(context.Context, serve.GzipFunc) (*publish.Bundle, error) { return &publish.Bundle{}, nil },
		Adhoc:             adhocFeedFrom(set),
		Preview:           adhocCalendarFrom(set),
		AdhocDefaultKinds: kinds,
	})
	if err != nil {
		b.Fatal(err)
	}
	return srv.Handler()
}
