package main

import (
	"fmt"
	"runtime"
	"runtime/debug"
	"runtime/metrics"
	"testing"
	"time"
)

func TestGCHeadroomPercent(t *testing.T) {
	const mib = 1 << 20
	for _, c := range []struct {
		live, headroom uint64
		want           int
	}{
		{35 * mib, 128 * mib, 365},  // the demo server's heap: collect at 35 + 128 MiB
		{128 * mib, 128 * mib, 100}, // from here on the default
		{2048 * mib, 128 * mib, 100},
		{10 * mib, 128 * mib, 1000}, // 1280 %, bounded
		{0, 128 * mib, 1000},
	} {
		if got := gcHeadroomPercent(c.live, c.headroom); got != c.want {
			t.Errorf("gcHeadroomPercent(%d MiB, %d MiB) = %d, want %d", c.live/mib, c.headroom/mib, got, c.want)
		}
	}
}

// gcPercent is the GC percent in force.
func gcPercent() int {
	s := []metrics.Sample{{Name: "/gc/gogc:percent"}}
	metrics.Read(s)
	return int(s[0].Value.Uint64())
}

// awaitServeGCPercent collects until the GC percent in force is the one
// the serve policy sets for the live heap, or fails after 10 s.
func awaitServeGCPercent() error {
	want := func() int { return gcHeadroomPercent(liveHeap(), serveGCHeadroom) }
	for deadline := time.Now().Add(10 * time.Second); gcPercent() != want(); {
		if time.Now().After(deadline) {
			return fmt.Errorf("after collections the GC percent is %d, want %d (live heap %d bytes)", gcPercent(), want(), liveHeap())
		}
		runtime.GC()
		time.Sleep(10 * time.Millisecond) // the hook runs on the cleanup goroutine
	}
	return nil
}

// TestServeGCPolicy: while a server runs, every collection sets the GC
// percent from the live heap it found; the percent before comes back when
// the server stops; a GOGC in the environment is left alone.
func TestServeGCPolicy(t *testing.T) {
	before := gcPercent()
	stop := startServeGC(func(string) (string, bool) { return "", false })
	debug.SetGCPercent(3000) // a percent the policy never sets
	if err := awaitServeGCPercent(); err != nil {
		stop()
		t.Fatal(err)
	}
	stop()
	stop() // a second call changes nothing
	if got := gcPercent(); got != before {
		t.Errorf("after stop the GC percent is %d, want %d as before", got, before)
	}
	runtime.GC()
	time.Sleep(50 * time.Millisecond)
	if got := gcPercent(); got != before {
		t.Errorf("a collection after stop set the GC percent to %d, want %d as before", got, before)
	}

	stop = startServeGC(func(k string) (string, bool) { return "50", k == "GOGC" })
	runtime.GC()
	time.Sleep(50 * time.Millisecond)
	stop()
	if got := gcPercent(); got != before {
		t.Errorf("with GOGC set the GC percent became %d, want %d untouched", got, before)
	}
}
