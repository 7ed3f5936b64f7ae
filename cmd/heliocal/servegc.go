package main

import (
	"runtime"
	"runtime/debug"
	"runtime/metrics"
	"sync"
	"sync/atomic"
)

// serveGCHeadroom is the garbage a server lets pile up between two
// collections while its live heap is smaller. An ad-hoc feed leaves about
// 0.9 MB of garbage; with the runtime's default (GOGC=100: collect when the
// heap has grown by the live heap's size) a server holding 35 MB collected
// every 40 feeds or so, and a feed built while a collection ran took about
// three times as long as one that was not (the collector's share of the 2
// cores, its write barrier and assists, its stops). With this headroom it
// collects about every 140 feeds, for up to 128 MiB more memory.
const serveGCHeadroom = 128 << 20

// Bounds of the GC percent the headroom sets.
const (
	minServeGCPercent = 100  // the default: never collect more often than it would
	maxServeGCPercent = 1000 // a nearly empty heap is not allowed to grow without end
)

// gcHeadroomPercent is the GC percent that lets a heap of live bytes grow
// by headroom bytes before the next collection, within the bounds.
func gcHeadroomPercent(live, headroom uint64) int {
	if live == 0 {
		return maxServeGCPercent
	}
	p := headroom * 100 / live
	return int(min(max(p, minServeGCPercent), maxServeGCPercent))
}

// gcPolicy re-sets the GC percent after every collection from the live heap
// that collection found (see serveGCHeadroom). One policy serves the whole
// process: servers started in the same process (tests) share it, and the
// default comes back when the last one stops.
var gcPolicy struct {
	mu    sync.Mutex
	users int
	prev  int          // the GC percent before the first user
	gen   atomic.Int64 // incremented when the last user stops: older hooks end
}

// startServeGC applies the serve GC policy unless GOGC is set in the
// environment (the operator's choice wins; a GOMEMLIMIT still caps the heap,
// as the runtime applies it whatever the percent). stop ends it.
func startServeGC(getenv func(string) (string, bool)) (stop func()) {
	if _, ok := getenv("GOGC"); ok {
		return func() {}
	}
	gcPolicy.mu.Lock()
	defer gcPolicy.mu.Unlock()
	gcPolicy.users++
	if gcPolicy.users == 1 {
		gcPolicy.prev = debug.SetGCPercent(gcHeadroomPercent(liveHeap(), serveGCHeadroom))
		armGCHook(gcPolicy.gen.Load())
	}
	var once sync.Once
	return func() {
		once.Do(func() {
			gcPolicy.mu.Lock()
			defer gcPolicy.mu.Unlock()
			gcPolicy.users--
			if gcPolicy.users == 0 {
				gcPolicy.gen.Add(1)
				debug.SetGCPercent(gcPolicy.prev)
			}
		})
	}
}

// armGCHook runs the policy once after the next collection: the cleanup of
// an object nothing refers to runs once a collection has found it
// unreachable, and arms the next one. A hook of an ended generation stops.
func armGCHook(gen int64) {
	sentinel := new([64]byte) // not a tiny allocation, whose cleanup might never run
	runtime.AddCleanup(sentinel, func(gen int64) {
		gcPolicy.mu.Lock()
		defer gcPolicy.mu.Unlock()
		if gcPolicy.gen.Load() != gen {
			return
		}
		debug.SetGCPercent(gcHeadroomPercent(liveHeap(), serveGCHeadroom))
		armGCHook(gen)
	}, gen)
}

// liveHeap is the heap the last collection found live, in bytes.
func liveHeap() uint64 {
	s := []metrics.Sample{{Name: "/gc/heap/live:bytes"}}
	metrics.Read(s)
	if s[0].Value.Kind() != metrics.KindUint64 {
		return 0
	}
	return s[0].Value.Uint64()
}
