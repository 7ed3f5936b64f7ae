package serve

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"log/slog"
	"net/http"
	"net/url"
	"runtime/debug"
	"strconv"
	"strings"
	"sync"
	"time"

	"heliocal/config"
	"heliocal/feed/publish"
	"heliocal/internal/schedule"
)

// The routes:
//
//	/, /index.html        the index page (the bundle's index.html)
//	/<id>.ics             a feed (the bundle's <id>.ics), at the published directory's layout
//	/feeds/<id>.ics       the same feed (the address the page gave before)
//	/feeds.json           the list of feeds
//	/at.ics?…             an ad-hoc feed (see AdhocQuery and the Param constants)
//	/healthz              200 once feeds are served, 503 before
//	/metrics              Prometheus text format
//
// Only GET and HEAD are allowed (405 with Allow otherwise).

var (
	hdrNosniff    = hdr("nosniff")
	hdrCORS       = hdr("*")
	hdrVary       = hdr("Accept-Encoding")
	hdrGzip       = hdr("gzip")
	hdrBytes      = hdr("bytes")
	hdrNoStore    = hdr("no-store")
	hdrAllow      = hdr("GET, HEAD")
	hdrRetryAfter = hdr("30")
)

func (s *Server) newHandler() http.Handler {
	metricsHandler := s.registry
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		start := time.Now()
		rec := recorderPool.Get().(*recorder)
		rec.ResponseWriter, rec.status, rec.bytes = w, 0, 0
		route, name := routeOf(r.URL.Path)
		defer func() {
			if p := recover(); p != nil {
				if p == http.ErrAbortHandler {
					panic(p)
				}
				s.log.Error("handler panicked", "path", r.URL.Path, "panic", fmt.Sprint(p), "stack", string(debug.Stack()))
				if rec.status == 0 {
					plain(rec, http.StatusInternalServerError, "internal error")
				}
			}
			s.finish(rec, r, route, start)
			rec.ResponseWriter = nil
			recorderPool.Put(rec)
		}()

		h := rec.Header()
		h["X-Content-Type-Options"] = hdrNosniff
		if route == routeOther {
			s.notFound(rec, r, "not found: "+quoteValue(r.URL.Path))
			return
		}
		if r.Method != http.MethodGet && r.Method != http.MethodHead {
			h["Allow"] = hdrAllow
			plain(rec, http.StatusMethodNotAllowed, "method "+quoteValue(r.Method)+" not allowed: use GET or HEAD")
			return
		}
		switch route {
		case routeHealth:
			s.serveHealth(rec, r)
		case routeMetrics:
			h["Cache-Control"] = hdrNoStore
			metricsHandler.ServeHTTP(rec, r)
		case routeAdhoc:
			s.serveAdhoc(rec, r)
		case routeFeeds:
			s.serveFeedsJSON(rec, r)
		case routeIndex:
			if name == "/" && s.opts.Preview != nil {
				s.serveHome(rec, r)
			} else {
				s.serveBundleFile(rec, r, "index.html")
			}
		case routePage, routePreview:
			s.serveBuilder(rec, r, route, name)
		default:
			s.serveBundleFile(rec, r, name)
		}
	})
}

// routeOf maps a path to its route and, for bundle files, the file name.
func routeOf(p string) (route, name string) {
	if route, ok := builderRoute(p); ok {
		return route, p
	}
	switch p {
	case "/":
		return routeIndex, "/" // the builder page when it is on, else index.html
	case "/index.html":
		return routeIndex, "index.html"
	case "/feeds.json":
		return routeFeeds, "feeds.json"
	case "/healthz":
		return routeHealth, ""
	case "/metrics":
		return routeMetrics, ""
	case AdhocPath:
		return routeAdhoc, ""
	}
	if !strings.HasSuffix(p, ".ics") {
		return routeOther, ""
	}
	name = strings.TrimPrefix(p, "/feeds/")
	if name == p {
		name = p[1:]
	}
	if name == ".ics" || strings.ContainsAny(name, "/\\") {
		return routeOther, ""
	}
	return routeFeed, name
}

// finish records the request in metrics and the access log.
func (s *Server) finish(rec *recorder, r *http.Request, route string, start time.Time) {
	if rec.status == 0 {
		rec.status = http.StatusOK
	}
	d := time.Since(start)
	s.metrics.request(route, rec.status, d)
	ctx := r.Context()
	if s.access.Enabled(ctx, slog.LevelInfo) {
		s.access.LogAttrs(ctx, slog.LevelInfo, "request",
			slog.String("method", r.Method),
			slog.String("path", truncate(r.URL.Path, 256)),
			slog.String("params", truncate(paramNames(r.URL.RawQuery), 256)),
			slog.String("route", route),
			slog.Int("status", rec.status),
			slog.Int64("bytes", rec.bytes),
			slog.Duration("duration", d),
			slog.String("remote", r.RemoteAddr),
			slog.String("user_agent", truncate(r.UserAgent(), 256)),
		)
	}
}

// paramNames lists the names of a query's parameters, comma-separated, in
// the order given, without their values: a value may carry a token or a
// password that has no place in a log (e.g. "lat,lon,tz").
func paramNames(rawQuery string) string {
	if rawQuery == "" {
		return ""
	}
	var b strings.Builder
	for part := range strings.SplitSeq(rawQuery, "&") {
		if part == "" {
			continue
		}
		name, _, _ := strings.Cut(part, "=")
		if n, err := url.QueryUnescape(name); err == nil {
			name = n
		}
		if b.Len() > 0 {
			b.WriteByte(',')
		}
		b.WriteString(name)
	}
	return b.String()
}

func truncate(s string, n int) string {
	if len(s) > n {
		return s[:n]
	}
	return s
}

// serveBundleFile serves one file of the current snapshot.
func (s *Server) serveBundleFile(w http.ResponseWriter, r *http.Request, name string) {
	snap := s.snap.Load()
	if snap == nil {
		tryLater(w, plain, "feeds are being built; try again shortly")
		return
	}
	a := snap.files[name]
	if a == nil {
		s.notFound(w, r, "no such feed: "+quoteValue(name))
		return
	}
	s.serveAsset(w, r, a)
}

// serveAsset writes a with its validators; http.ServeContent answers
// conditional requests (If-None-Match against the ETag set here,
// If-Modified-Since against modTime), HEAD and Range.
func (s *Server) serveAsset(w http.ResponseWriter, r *http.Request, a *asset) {
	writeAsset(w, r, a, *s.cacheControl.Load())
}

// writeAsset is serveAsset with the Cache-Control cacheControl: the feeds'
// (from the refresh interval), or the page's own files' no-cache.
func writeAsset(w http.ResponseWriter, r *http.Request, a *asset, cacheControl []string) {
	h := w.Header()
	h["Content-Type"] = a.contentType
	h["Cache-Control"] = cacheControl
	if a.cors {
		h["Access-Control-Allow-Origin"] = hdrCORS
	}
	if a.disposition != nil {
		h["Content-Disposition"] = a.disposition
	}
	if a.gz != nil {
		h["Vary"] = hdrVary
	}
	var body io.ReadSeeker
	switch {
	case a.gz != nil && acceptsGzip(r.Header.Get("Accept-Encoding")):
		body = bytes.NewReader(a.gz)
		h["Etag"] = a.gzETag
		h["Content-Encoding"] = hdrGzip
	case a.data == nil && a.gz != nil: // a feed held in its gzip form alone
		h["Etag"] = a.etag
		if unconditional(r) {
			writeInflated(w, r, a)
			return
		}
		g := &gunzipReader{gz: a.gz, size: int64(a.size)}
		http.ServeContent(w, r, "", a.modTime, g)
		if !strings.Contains(r.Header.Get("Range"), ",") { // one range at most: ServeContent read g itself
			g.release()
		}
		return
	default:
		body = bytes.NewReader(a.data)
		h["Etag"] = a.etag
	}
	if br, ok := body.(*bytes.Reader); ok && unconditional(r) {
		writeWhole(w, r, a.lastModified, br)
		return
	}
	http.ServeContent(w, r, "", a.modTime, body)
}

// writeInflated is writeWhole for a feed held in its gzip form alone,
// asked for by a client that does not take gzip: its bytes are inflated
// into the response as they are written, never held whole.
func writeInflated(w http.ResponseWriter, r *http.Request, a *asset) {
	if writeWholeHeader(w, r, a.lastModified, a.size) {
		gunzipTo(w, a.gz) // an error is the client's going away: nothing to tell it
	}
}

// unconditional reports whether r asks for the whole representation
// whatever it is: no validator to check, no range.
func unconditional(r *http.Request) bool {
	for _, k := range [...]string{"If-Match", "If-None-Match", "If-Modified-Since", "If-Unmodified-Since", "Range"} {
		if _, ok := r.Header[k]; ok {
			return false
		}
	}
	return true
}

// writeWhole answers an unconditional GET or HEAD with the whole of body as
// http.ServeContent would (Last-Modified, formatted once per asset, and
// Accept-Ranges), and with its Content-Length even when the body is the
// gzip form (ServeContent leaves it out when Content-Encoding is set, so
// such a response went chunked).
// The body is written with one call: ServeContent's io.CopyN allocated a
// 32 kB copy buffer for every response.
func writeWhole(w http.ResponseWriter, r *http.Request, lastModified []string, body *bytes.Reader) {
	if writeWholeHeader(w, r, lastModified, body.Len()) {
		body.WriteTo(w)
	}
}

// writeWholeHeader writes the header of writeWhole's response, for a body
// of size bytes, and reports whether the body is to follow (not for HEAD).
func writeWholeHeader(w http.ResponseWriter, r *http.Request, lastModified []string, size int) bool {
	h := w.Header()
	if lastModified != nil {
		h["Last-Modified"] = lastModified
	}
	h["Accept-Ranges"] = hdrBytes
	h["Content-Length"] = []string{strconv.Itoa(size)}
	w.WriteHeader(http.StatusOK)
	return r.Method != http.MethodHead
}

// health is the /healthz body.
type health struct {
	// Status is "ok"; "degraded" (feeds served, but a reload was refused or
	// the feeds are older than two refresh periods: see Reasons); "stale"
	// (the last refresh failed); "starting" or "failing" (no feeds yet).
	Status      string     `json:"status"`
	Reasons     []string   `json:"reasons,omitempty"`
	Built       *time.Time `json:"built,omitempty"`
	LastSuccess *time.Time `json:"last_success,omitempty"`
	LastAttempt *time.Time `json:"last_attempt,omitempty"`
	LastError   string     `json:"last_error,omitempty"`
	NextRefresh time.Time  `json:"next_refresh"`
	Feeds       int        `json:"feeds"`
	Events      int        `json:"events"`
}

func (s *Server) serveHealth(w http.ResponseWriter, r *http.Request) {
	hb, code := s.health()
	body, _ := json.MarshalIndent(hb, "", "  ") // plain struct: cannot fail
	h := w.Header()
	h.Set("Content-Type", "application/json")
	h["Cache-Control"] = hdrNoStore
	h.Set("Content-Length", strconv.Itoa(len(body)+1))
	w.WriteHeader(code)
	if r.Method != http.MethodHead {
		w.Write(append(body, '\n'))
	}
}

// health assesses the server for /healthz.
func (s *Server) health() (health, int) {
	snap := s.snap.Load()
	now := s.now()
	s.healthMu.Lock()
	hb := health{NextRefresh: s.sched.Next().UTC()}
	if !s.lastSuccess.IsZero() {
		t := s.lastSuccess.UTC()
		hb.LastSuccess = &t
	}
	if !s.lastAttempt.IsZero() {
		t := s.lastAttempt.UTC()
		hb.LastAttempt = &t
	}
	if s.lastErr != nil {
		hb.LastError = errLine(s.lastErr)
	}
	failed := s.lastErr != nil
	if s.reloadErr != nil {
		what := "configuration reload refused at %s"
		if s.reloadBuild {
			what = "configuration reload at %s failed to build"
		}
		hb.Reasons = append(hb.Reasons, fmt.Sprintf(what+", still serving the previous configuration: %s",
			s.reloadAt.UTC().Format(time.RFC3339), errLine(s.reloadErr)))
	}
	if period, err := schedule.Interval(s.sched.Spec(), s.sched.Location(), now); err == nil && !s.lastSuccess.IsZero() {
		if age := now.Sub(s.lastSuccess); age > 2*period {
			hb.Reasons = append(hb.Reasons, fmt.Sprintf("feeds last built %s ago, more than two refresh periods (%s each)",
				age.Round(time.Second), period))
		}
	}
	s.healthMu.Unlock()

	code := http.StatusOK
	switch {
	case snap == nil && failed:
		hb.Status, code = "failing", http.StatusServiceUnavailable
	case snap == nil:
		hb.Status, code = "starting", http.StatusServiceUnavailable
	case failed:
		hb.Status = "stale"
	case len(hb.Reasons) > 0:
		hb.Status = "degraded"
	default:
		hb.Status = "ok"
	}
	if snap != nil {
		t := snap.built.UTC()
		hb.Built, hb.Feeds, hb.Events = &t, snap.feeds, snap.events
	}
	return hb, code
}

// maxErrLine is the length beyond which errLine gives the number of
// problems or joined errors and the first, not each of them.
const maxErrLine = 1024

// errLine is err on one line for /healthz. An error of several lines, each
// a line of the log too (publish's refusal of every feed over
// service.max_feed_bytes, joined; an invalid configuration's problems), is
// given whole, its lines separated by "; ", or, when that is over
// maxErrLine bytes, as its number of errors and the first: "40 feeds over
// service.max_feed_bytes, the first: publish: feed a: …", "30 problems,
// the first: heliocal.yaml: sites[0].latitude: 95: …". Other errors keep
// their first line.
func errLine(err error) string {
	var (
		joined  interface{ Unwrap() []error }
		invalid *config.ValidationError
		n       int
		what    string
	)
	switch {
	case errors.As(err, &joined):
		errs := joined.Unwrap()
		n, what = len(errs), "feeds over service.max_feed_bytes"
		for _, e := range errs {
			if !errors.As(e, new(*publish.OversizeError)) { // not only feeds over the limit
				what = "errors"
				break
			}
		}
	case errors.As(err, &invalid):
		n, what = len(invalid.Problems), "problems"
	default:
		return oneLine(err.Error())
	}
	lines := strings.FieldsFunc(err.Error(), func(r rune) bool { return r == '\n' || r == '\r' })
	if one := strings.Join(lines, "; "); len(one) <= maxErrLine || len(lines) < 2 {
		return one
	}
	return fmt.Sprintf("%d %s, the first: %s", n, what, lines[0])
}

// plain writes a one-line text/plain response that is never cached.
func plain(w http.ResponseWriter, code int, msg string) {
	h := w.Header()
	h.Del("Etag")
	h.Del("Content-Encoding")
	h.Del("Content-Disposition")
	h.Set("Content-Type", "text/plain; charset=utf-8")
	h["Cache-Control"] = hdrNoStore
	h.Set("Content-Length", strconv.Itoa(len(msg)+1))
	w.WriteHeader(code)
	w.Write([]byte(msg + "\n"))
}

// recorder notes the status and size of a response.
type recorder struct {
	http.ResponseWriter
	status int
	bytes  int64
}

var recorderPool = sync.Pool{New: func() any { return new(recorder) }}

func (r *recorder) WriteHeader(code int) {
	if r.status == 0 {
		r.status = code
	}
	r.ResponseWriter.WriteHeader(code)
}

func (r *recorder) Write(p []byte) (int, error) {
	if r.status == 0 {
		r.status = http.StatusOK
	}
	n, err := r.ResponseWriter.Write(p)
	r.bytes += int64(n)
	return n, err
}

// Unwrap lets http.ResponseController reach the connection.
func (r *recorder) Unwrap() http.ResponseWriter { return r.ResponseWriter }

var errAdhocBusy = errors.New("serve: too many ad-hoc feeds being built")
