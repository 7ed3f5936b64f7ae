package serve

import (
	"container/list"
	"context"
	"errors"
	"fmt"
	"net/http"
	"runtime/debug"
	"sync"
	"time"
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
	s.metrics.adhocCache.WithLabelValues("miss").Inc()
	a, err := s.flights.do(r.Context(), key, func() (*asset, error) { return s.buildAdhoc(r.Context(), q) })
	var qe *QueryError
	switch {
	case err == nil:
		s.serveAsset(w, r, a)
	case errors.As(err, &qe):
		plain(w, http.StatusBadRequest, qe.Error())
	case errors.Is(err, errAdhocBusy), errors.Is(err, context.DeadlineExceeded), errors.Is(err, context.Canceled):
		w.Header()["Retry-After"] = hdrRetryAfter
		plain(w, http.StatusServiceUnavailable, "server busy building ad-hoc feeds; try again shortly")
	default:
		s.log.Error("ad-hoc feed failed", "query", key, "err", err)
		plain(w, http.StatusInternalServerError, "internal error building the feed")
	}
}

// buildAdhoc runs Options.Adhoc for q, detached from the request that asked
// first (others may be waiting on the same build) but bounded by
// AdhocTimeout, and caches the result.
func (s *Server) buildAdhoc(rctx context.Context, q AdhocQuery) (a *asset, err error) {
	select {
	case s.adhocSem <- struct{}{}:
	case <-rctx.Done():
		return nil, errAdhocBusy
	}
	defer func() { <-s.adhocSem }()
	ctx, cancel := context.WithTimeout(context.WithoutCancel(rctx), s.opts.AdhocTimeout)
	defer cancel()
	defer func() {
		if p := recover(); p != nil {
			s.log.Error("ad-hoc build panicked", "panic", fmt.Sprint(p), "stack", string(debug.Stack()))
			a, err = nil, fmt.Errorf("serve: ad-hoc build panicked: %v", p)
		}
	}()
	start := time.Now()
	data, err := s.opts.Adhoc(ctx, q)
	s.metrics.adhocSeconds.Observe(time.Since(start).Seconds())
	if err != nil {
		return nil, err
	}
	a = newAsset(q.ID()+".ics", "", data, start.Truncate(time.Second), nil)
	a.cors = true
	s.cache.put(q.String(), a)
	return a, nil
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
	waiters int // callers that asked for this key (guarded by flightGroup.mu)
}

// do runs fn once per key at a time; a caller whose ctx ends stops waiting
// (the call goes on for the others and for the cache).
func (g *flightGroup) do(ctx context.Context, key string, fn func() (*asset, error)) (*asset, error) {
	g.mu.Lock()
	if g.m == nil {
		g.m = make(map[string]*flight)
	}
	f, ok := g.m[key]
	if !ok {
		f = &flight{done: make(chan struct{})}
		g.m[key] = f
		go func() {
			defer func() {
				g.mu.Lock()
				delete(g.m, key)
				g.mu.Unlock()
				close(f.done)
			}()
			f.a, f.err = fn()
		}()
	}
	f.waiters++
	g.mu.Unlock()
	select {
	case <-f.done:
		return f.a, f.err
	case <-ctx.Done():
		return nil, ctx.Err()
	}
}
