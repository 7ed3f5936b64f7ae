package main

import (
	"runtime"
	"testing"
)

// TestServeProcs: while servers run, the scheduler has one processor more
// than the ad-hoc builds a server runs at once, which are the processors
// from before; they come back when the last server stops; GOMAXPROCS in
// the environment is left alone.
func TestServeProcs(t *testing.T) {
	noEnv := func(string) (string, bool) { return "", false }
	before := runtime.GOMAXPROCS(0)
	builds, stop := startServeProcs(noEnv)
	if builds != before || runtime.GOMAXPROCS(0) != before+1 {
		stop()
		t.Fatalf("one server: %d builds at once, GOMAXPROCS %d; want %d and %d", builds, runtime.GOMAXPROCS(0), before, before+1)
	}
	builds2, stop2 := startServeProcs(noEnv) // a second server in the same process
	if builds2 != before || runtime.GOMAXPROCS(0) != before+1 {
		t.Errorf("two servers: %d builds at once, GOMAXPROCS %d; want %d and %d", builds2, runtime.GOMAXPROCS(0), before, before+1)
	}
	stop()
	stop() // a second call does nothing
	if got := runtime.GOMAXPROCS(0); got != before+1 {
		t.Errorf("one of two servers stopped: GOMAXPROCS %d, want %d", got, before+1)
	}
	stop2()
	if got := runtime.GOMAXPROCS(0); got != before {
		t.Errorf("both servers stopped: GOMAXPROCS %d, want %d as before", got, before)
	}

	env := func(k string) (string, bool) { return map[string]string{"GOMAXPROCS": "3"}[k], k == "GOMAXPROCS" }
	builds, stop = startServeProcs(env)
	defer stop()
	if builds != before || runtime.GOMAXPROCS(0) != before {
		t.Errorf("GOMAXPROCS in the environment: %d builds at once, GOMAXPROCS %d; want %d and %d (left alone)", builds, runtime.GOMAXPROCS(0), before, before)
	}
}
