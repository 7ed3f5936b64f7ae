package serve

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"io"
	"log/slog"
	"net/http"
	"net/http/httptest"
	"path"
	"slices"
	"strings"
	"sync"
	"testing"
	"time"

	"heliocal/feed/publish"
)

// The bundles in these tests are small but real: real iCalendar text, real
// SHA-256 checksums, as feed/publish produces them. The serve layer is what
// is under test.

var testBuilt = time.Date(2026, 3, 20, 3, 15, 0, 0, time.UTC)

// icsFor renders a minimal RFC 5545 calendar with n events; rev makes two
// generations of the same feed differ.
func icsFor(id string, n int, rev string) []byte {
	var b strings.Builder
	b.WriteString("BEGIN:VCALENDAR\r\nVERSION:2.0\r\nPRODID:-//heliocal//test//EN\r\nMETHOD:PUBLISH\r\n")
	fmt.Fprintf(&b, "X-WR-CALNAME:%s %s\r\n", id, rev)
	for i := range n {
		day := testBuilt.AddDate(0, 0, i)
		fmt.Fprintf(&b, "BEGIN:VEVENT\r\nUID:%s-sunrise-%s@heliocal\r\nDTSTAMP:20260320T000000Z\r\n"+
			"DTSTART:%sZ\r\nSUMMARY:Sunrise (%s)\r\nTRANSP:TRANSPARENT\r\nEND:VEVENT\r\n",
			id, day.Format("20060102"), day.Add(6*time.Hour).Format("20060102T150405"), rev)
	}
	b.WriteString("END:VCALENDAR\r\n")
	return []byte(b.String())
}

func file(name, ctype string, data []byte) publish.File {
	sum := sha256.Sum256(data)
	return publish.File{Name: name, ContentType: ctype, Data: data, Checksum: hex.EncodeToString(sum[:]), ModTime: testBuilt}
}

// testBundle has two feeds (one big enough to be gzipped, one tiny),
// feeds.json and index.html.
func testBundle(rev string) *publish.Bundle {
	farm := icsFor("meadowbrook-sun", 40, rev)
	tiny := icsFor("kestrel-ridge-moon", 0, rev)
	feeds := []publish.FeedInfo{
		{ID: "meadowbrook-sun", Title: "Meadowbrook Farm sun", Site: "meadowbrook", File: "meadowbrook-sun.ics", Events: 40, Bytes: len(farm)},
		{ID: "kestrel-ridge-moon", Title: "Kestrel Ridge Observatory moon", Site: "kestrel-ridge", File: "kestrel-ridge-moon.ics", Events: 0, Bytes: len(tiny)},
	}
	for i, f := range []publish.File{file("", "", farm), file("", "", tiny)} {
		feeds[i].Checksum = f.Checksum
	}
	index := []byte("<!doctype html><title>heliocal feeds " + rev + "</title><h1>Feeds</h1>\n")
	return &publish.Bundle{
		Built: testBuilt,
		Feeds: feeds,
		Files: []publish.File{
			file("feeds.json", "application/json", []byte(`[{"id":"meadowbrook-sun"},{"id":"kestrel-ridge-moon"}]`+"\n")),
			file("index.html", "text/html; charset=utf-8", index),
			file("kestrel-ridge-moon.ics", "text/calendar; charset=utf-8", tiny),
			file("meadowbrook-sun.ics", "text/calendar; charset=utf-8", farm),
		},
	}
}

// heldBy is b as publish.Render makes it with RenderOptions.Gzip set to
// gzip, as the command's build does: each feed in the form gzip gives it,
// its gzip form alone (Data nil) or, when gzip gives none, its bytes.
func heldBy(b *publish.Bundle, gzip GzipFunc) *publish.Bundle {
	if b == nil || gzip == nil {
		return b
	}
	out := *b
	out.Files = slices.Clone(b.Files)
	for i := range out.Files {
		f := &out.Files[i]
		if path.Ext(f.Name) != ".ics" {
			continue // Render keeps feeds.json and index.html whole
		}
		if f.Gzip = gzip(f); f.Gzip != nil {
			f.Data = nil
		}
	}
	return &out
}

// builder returns a BuildFunc serving whatever bundle (or error) is set,
// its feeds held as the command's build holds them (heldBy).
type builder struct {
	mu    sync.Mutex
	b     *publish.Bundle
	err   error
	whole bool // serve b as it is, its feeds' bytes kept
	calls int
}

func (b *builder) set(bundle *publish.Bundle, err error) {
	b.mu.Lock()
	defer b.mu.Unlock()
	b.b, b.err, b.whole = bundle, err, false
}

// setWhole serves bundle as it is, as a build that renders without the
// server's GzipFunc hands it over.
func (b *builder) setWhole(bundle *publish.Bundle) {
	b.mu.Lock()
	defer b.mu.Unlock()
	b.b, b.err, b.whole = bundle, nil, true
}

func (b *builder) build(ctx context.Context, gzip GzipFunc) (*publish.Bundle, error) {
	b.mu.Lock()
	defer b.mu.Unlock()
	b.calls++
	if b.whole {
		return b.b, b.err
	}
	return heldBy(b.b, gzip), b.err
}

// adhocICS is the ad-hoc builder of the tests: a calendar whose name is the
// normalised query, so a test can see what the server asked for.
var adhocICS = writes(adhocBytes)

// adhocBytes is adhocICS's feed.
func adhocBytes(ctx context.Context, q AdhocQuery) ([]byte, error) {
	return icsFor(q.ID(), q.Days/30, q.String()), nil
}

// writes is the AdhocFunc that writes the feed fn returns, in one piece.
func writes(fn func(ctx context.Context, q AdhocQuery) ([]byte, error)) AdhocFunc {
	return func(ctx context.Context, q AdhocQuery, w io.Writer) error {
		data, err := fn(ctx, q)
		if err == nil {
			_, err = w.Write(data)
		}
		return err
	}
}

func quiet() *slog.Logger { return slog.New(slog.DiscardHandler) }

// newTestServer returns a server with a private registry whose first build
// has succeeded.
func newTestServer(t testing.TB, opts Options) (*Server, *builder) {
	t.Helper()
	b := &builder{b: testBundle("a")}
	if opts.Build == nil {
		opts.Build = b.build
	}
	if opts.Logger == nil {
		opts.Logger = quiet()
	}
	if opts.Metrics == nil {
		opts.Metrics = NewRegistry()
	}
	s, err := New(opts)
	if err != nil {
		t.Fatal(err)
	}
	if err := s.Refresh(t.Context()); err != nil {
		t.Fatal(err)
	}
	return s, b
}

// get performs one request against h with optional header pairs.
func get(t *testing.T, h http.Handler, method, target string, headers ...string) *http.Response {
	t.Helper()
	req := httptest.NewRequest(method, target, nil)
	for i := 0; i+1 < len(headers); i += 2 {
		req.Header.Set(headers[i], headers[i+1])
	}
	w := httptest.NewRecorder()
	h.ServeHTTP(w, req)
	return w.Result()
}

func body(t *testing.T, r *http.Response) string {
	t.Helper()
	b, err := io.ReadAll(r.Body)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// untilStopped runs fn over and over on a goroutine of wg, until stop is
// closed or fn returns false.
func untilStopped(wg *sync.WaitGroup, stop <-chan struct{}, fn func() bool) {
	wg.Go(func() {
		for {
			select {
			case <-stop:
				return
			default:
			}
			if !fn() {
				return
			}
		}
	})
}
