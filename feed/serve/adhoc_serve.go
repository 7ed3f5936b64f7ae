package serve

import (
	"bytes"
	"container/list"
	"context"
	"errors"
	"fmt"
	"net/http"
	"runtime"
	"runtime/debug"
	"sync"
	"time"

	"heliocal/feed/publish"
)

// serveAdhoc answers /at.ics: validate, look up the cache, else build once
// (concurrent identical requests share one build) within the concurrency
// limit, cache and serve.
func (s *Server) serveAdhoc(w http.ResponseWriter, r *http.Request) {
	if s.opts.Adhoc == nil {
		plain(w, http.StatusNotFound, "ad-hoc feeds are not enabled on this server")
		return
	}
	q, err := parseAdhoc(r.URL.RawQuery, s.now(), s.limits)
	if err != nil {
		plain(w, http.StatusBadRequest, err.Error())
		return
	}
	key := q.String()
	if a := s.cache.get(key); a != nil {
		s.metrics.adhocCache.WithLabelValues("hit").Inc()
		s.serveAsset(w, r, a)
		return
	}
	if a := s.refused.get(key); a != nil {
		s.metrics.adhocCache.WithLabelValues("hit").Inc()
		plain(w, http.StatusBadRequest, string(a.data))
		return
	}
	s.metrics.adhocCache.WithLabelValues("miss").Inc()
	a, err := s.flights.do(r.Context(), key, func(ctx context.Context) (*asset, error) { return s.buildAdhoc(ctx, q, false) })
	var qe *QueryError
	switch {
	case err == nil:
		s.serveAsset(w, r, a)
	case errors.As(err, &qe):
		plain(w, http.StatusBadRequest, qe.Error())
	case busy(err):
		tryLater(w, plain, "server busy building ad-hoc feeds; try again shortly")
	default:
		s.log.Error("ad-hoc feed failed", "query", key, "err", err)
		plain(w, http.StatusInternalServerError, "internal error building the feed")
	}
}

// busy reports whether err is a computation that found no free ad-hoc slot
// (errAdhocBusy) or was cut short (its deadline, or every request that
// waited for it gone): the server is busy, not failing.
func busy(err error) bool {
	return errors.Is(err, errAdhocBusy) || errors.Is(err, context.DeadlineExceeded) || errors.Is(err, context.Canceled)
}

// tryLater answers 503 with msg through fail (plain, or the table's page),
// and Retry-After.
func tryLater(w http.ResponseWriter, fail failFunc, msg string) {
	w.Header()["Retry-After"] = hdrRetryAfter
	fail(w, http.StatusServiceUnavailable, msg)
}

// warmQuery is the ad-hoc query WarmAdhoc builds: the default kinds and
// window at a place in UTC, whose today is that of most of the world.
const warmQuery = "lat=0&lon=0&tz=UTC"

// WarmAdhoc builds the ad-hoc feed of warmQuery, as a request for it would
// (the feed itself is cached only until a refresh empties the cache: at a
// start, the first build of the feeds right after), so that the first
// requests after a start find ready what every ad-hoc feed shares: the
// ephemeris of today's default window (the same for every place whose
// today is UTC's), the builders' and compressors' working memory, code
// already run. The first few requests of a fresh server otherwise took two
// to seven times as long as the next.
// It does nothing without ad-hoc feeds, and logs that it is done (the
// build-time histogram of /metrics leaves it out: no request asked for it)
// or that it failed.
func (s *Server) WarmAdhoc(ctx context.Context) {
	if s.opts.Adhoc == nil {
		return
	}
	start := time.Now()
	q, err := parseAdhoc(warmQuery, s.now(), s.limits)
	if err == nil {
		_, err = s.buildAdhoc(ctx, q, true)
	}
	var qe *QueryError // over max_feed_bytes: refused, but the ephemeris is ready
	switch {
	case err == nil || errors.As(err, &qe):
		s.log.Info("ad-hoc feeds warmed up", "query", warmQuery, "duration", time.Since(start).Round(time.Microsecond))
	case ctx.Err() == nil:
		s.log.Warn("ad-hoc warm-up failed", "query", warmQuery, "err", err)
	}
}

// adhocSlot waits for one of the ad-hoc concurrency slots (errAdhocBusy
// when ctx ends first) and returns ctx bounded by AdhocTimeout, with the
// function that cancels it and frees the slot. Ad-hoc feeds and previews
// share the slots.
//
// With its slot, a build is about to hold its processor for milliseconds
// without a pause (a one-year feed: 4 ms), so it first lets the goroutines
// queued on that processor run: among them net/http's reader of the
// request's own connection, which the server starts with each request and
// waits for at the request's end. Left queued behind the build, it ran
// only once the build was over, or later still when another goroutine
// came first, and the connection read its next request only then: about
// 2 ms a request on average with four clients on two cores, and now and
// then a whole build or two.
func (s *Server) adhocSlot(ctx context.Context) (context.Context, func(), error) {
	select {
	case s.adhocSem <- struct{}{}:
	case <-ctx.Done():
		return nil, nil, errAdhocBusy
	}
	runtime.Gosched()
	ctx, cancel := context.WithTimeout(ctx, s.opts.AdhocTimeout)
	return ctx, func() { cancel(); <-s.adhocSem }, nil
}

// buildAdhoc runs Options.Adhoc for q with ctx, the build's context: it
// ends when every request waiting for this build has gone (timed out,
// cancelled, disconnected) and after AdhocTimeout, and Adhoc passes it down
// to the per-date loops, so abandoned work stops. The result is cached.
// A warm-up's build (WarmAdhoc) is left out of the build-time histogram,
// which counts the builds that requests asked for, as the cache's misses do.
func (s *Server) buildAdhoc(ctx context.Context, q AdhocQuery, warm bool) (a *asset, err error) {
	ctx, release, err := s.adhocSlot(ctx)
	if err != nil {
		return nil, err
	}
	defer release()
	defer func() {
		if p := recover(); p != nil {
			s.log.Error("ad-hoc build panicked", "panic", fmt.Sprint(p), "stack", string(debug.Stack()))
			a, err = nil, fmt.Errorf("serve: ad-hoc build panicked: %v", p)
		}
	}()
	start := time.Now()
	sink := newAdhocSink(s.opts.AdhocMaxBytes)
	defer sink.release()
	err = s.opts.Adhoc(ctx, q, sink)
	if !warm {
		s.metrics.adhocSeconds.Observe(time.Since(start).Seconds())
	}
	if err != nil {
		return nil, err
	}
	if sink.n > s.opts.AdhocMaxBytes {
		qe := tooLarge(q, sink.n, s.opts.AdhocMaxBytes, s.suggestDays(ctx, q, sink.n))
		s.refused.put(q.String(), &asset{data: []byte(qe.Error())})
		return nil, qe
	}
	a = sink.asset(q.ID()+".ics", start.Truncate(time.Second))
	a.cors = true
	s.cache.put(q.String(), a)
	return a, nil
}

// adhocHold is how much of an ad-hoc feed adhocSink holds before it
// starts compressing: a feed this small is served as newAdhocAsset serves
// any (compressed only when that is worth it).
const adhocHold = 16 << 10

// adhocSink receives an ad-hoc feed as it is rendered (Options.Adhoc
// writes it in pieces) and compresses it as it comes, at the level of
// newAdhocAsset and to the same bytes: the feed itself (about 880 kB for a
// year of the default kinds) is never held whole, and each piece is
// compressed while it is still in the processor's cache. It counts the
// bytes; past limit it only counts them (the feed will be refused).
type adhocSink struct {
	limit int
	n     int           // bytes received
	head  *[]byte       // the bytes received before compressing started
	zw    gzipWriter    // nil until the feed is longer than adhocHold
	gz    *bytes.Buffer // zw's output
}

var adhocHeads = sync.Pool{New: func() any { b := make([]byte, 0, adhocHold); return &b }}

func newAdhocSink(limit int) *adhocSink {
	return &adhocSink{limit: limit, head: adhocHeads.Get().(*[]byte)}
}

// Write never fails.
func (s *adhocSink) Write(p []byte) (int, error) {
	s.n += len(p)
	switch {
	case s.n > s.limit:
		// refused: its size is all that is still needed
	case s.zw != nil:
		s.zw.Write(p) // into a bytes.Buffer: never fails
	case s.n <= adhocHold:
		*s.head = append(*s.head, p...)
	default:
		s.zw = gzipFastest.Get().(gzipWriter)
		s.gz = gzipBuffers.Get().(*bytes.Buffer)
		s.zw.Reset(s.gz)
		s.zw.Write(*s.head)
		s.zw.Write(p)
		*s.head = (*s.head)[:0]
	}
	return len(p), nil
}

// asset is the feed received, as newAdhocAsset makes it, once the feed is
// complete and within the limit.
func (s *adhocSink) asset(name string, mod time.Time) *asset {
	if s.zw == nil {
		return newAdhocAsset(name, *s.head, mod)
	}
	s.zw.Close()
	if !gzipSaves(s.gz.Len(), s.n) { // hardly compressible: kept as it is, as newAdhocAsset would
		return adhocAssetOf(name, gunzip(s.gz.Bytes(), s.n), nil, s.n, mod)
	}
	return adhocAssetOf(name, nil, bytes.Clone(s.gz.Bytes()), s.n, mod)
}

// release gives the sink's buffers and compressor back for the next feed.
func (s *adhocSink) release() {
	*s.head = (*s.head)[:0]
	adhocHeads.Put(s.head)
	if s.zw != nil {
		s.gz.Reset()
		gzipBuffers.Put(s.gz)
		gzipFastest.Put(s.zw)
	}
	*s = adhocSink{}
}

// adhocCache is a small LRU of built ad-hoc feeds, bounded by entries and
// bytes, emptied at every refresh.
type adhocCache struct {
	mu         sync.Mutex
	maxEntries int
	maxBytes   int
	bytes      int
	ll         *list.List // front: most recently used
	m          map[string]*list.Element
}

type cacheEntry struct {
	key string
	a   *asset
}

func newAdhocCache(entries, bytes int) *adhocCache {
	return &adhocCache{maxEntries: entries, maxBytes: bytes, ll: list.New(), m: make(map[string]*list.Element)}
}

func (c *adhocCache) get(key string) *asset {
	c.mu.Lock()
	defer c.mu.Unlock()
	if e, ok := c.m[key]; ok {
		c.ll.MoveToFront(e)
		return e.Value.(*cacheEntry).a
	}
	return nil
}

func (c *adhocCache) put(key string, a *asset) {
	size := len(a.data) + len(a.gz)
	c.mu.Lock()
	defer c.mu.Unlock()
	if size > c.maxBytes {
		return
	}
	if e, ok := c.m[key]; ok {
		c.bytes -= entrySize(e)
		e.Value.(*cacheEntry).a = a
		c.bytes += size
		c.ll.MoveToFront(e)
	} else {
		c.m[key] = c.ll.PushFront(&cacheEntry{key, a})
		c.bytes += size
	}
	for c.ll.Len() > c.maxEntries || c.bytes > c.maxBytes {
		e := c.ll.Back()
		c.bytes -= entrySize(e)
		delete(c.m, e.Value.(*cacheEntry).key)
		c.ll.Remove(e)
	}
}

func entrySize(e *list.Element) int {
	a := e.Value.(*cacheEntry).a
	return len(a.data) + len(a.gz)
}

func (c *adhocCache) purge() {
	c.mu.Lock()
	defer c.mu.Unlock()
	c.ll.Init()
	clear(c.m)
	c.bytes = 0
}

func (c *adhocCache) len() int {
	c.mu.Lock()
	defer c.mu.Unlock()
	return c.ll.Len()
}

// flightGroup makes concurrent callers with the same key share one call.
type flightGroup struct {
	mu sync.Mutex
	m  map[string]*flight
}

type flight struct {
	done    chan struct{}
	a       *asset
	err     error
	waiters int                // callers still waiting (guarded by flightGroup.mu)
	cancel  context.CancelFunc // ends the call's context
}

// do runs fn once per key at a time, sharing its result among the callers
// that ask for the key meanwhile. A caller whose ctx ends stops waiting;
// when the last one has stopped, fn's context is cancelled (nobody wants
// the result any more) and the key is free for a new call.
func (g *flightGroup) do(ctx context.Context, key string, fn func(context.Context) (*asset, error)) (*asset, error) {
	g.mu.Lock()
	if g.m == nil {
		g.m = make(map[string]*flight)
	}
	f, ok := g.m[key]
	if !ok {
		fctx, cancel := context.WithCancel(context.WithoutCancel(ctx))
		f = &flight{done: make(chan struct{}), cancel: cancel}
		g.m[key] = f
		go func() {
			defer func() {
				g.mu.Lock()
				if g.m[key] == f {
					delete(g.m, key)
				}
				g.mu.Unlock()
				cancel()
				close(f.done)
			}()
			f.a, f.err = fn(fctx)
		}()
	}
	f.waiters++
	g.mu.Unlock()
	select {
	case <-f.done:
		return f.a, f.err
	case <-ctx.Done():
		g.mu.Lock()
		f.waiters--
		if f.waiters == 0 {
			f.cancel()
			if g.m[key] == f {
				delete(g.m, key)
			}
		}
		g.mu.Unlock()
		return nil, ctx.Err()
	}
}

// suggestDays is the window the refusal of q's feed, of size bytes,
// suggests: the subscribe link's rule (fitDays) when there is a preview to
// compute it with, otherwise q's days scaled to 90 % of the limit (the size
// is nearly proportional to the days). It is called with q's ad-hoc slot
// held.
func (s *Server) suggestDays(ctx context.Context, q AdhocQuery, size int) int {
	if s.opts.Preview != nil && q.Days > 1 {
		if days, err := s.fitDays(ctx, q, q.Days-1, nil); err == nil {
			return days
		}
	}
	return max(1, q.Days*s.opts.AdhocMaxBytes/size*9/10)
}

// tooLarge is the refusal of an ad-hoc feed of size bytes, over limit: it
// states the limit and how to stay under it (days).
func tooLarge(q AdhocQuery, size, limit, days int) *QueryError {
	got, most := publish.FormatBytesOver(int64(size), int64(limit))
	return &QueryError{Msg: fmt.Sprintf("the feed asked for is %s, over the %s limit per ad-hoc feed "+
		"(some calendar apps drop larger subscriptions); ask for fewer kinds or days (%s=%d should fit with these kinds)",
		got, most, ParamDays, days)}
}
