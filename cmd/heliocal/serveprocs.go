package main

import (
	"runtime"
	"sync"
)

// A server builds at most one ad-hoc feed per core at once (each build is
// a few milliseconds of uninterrupted computation) and runs the Go
// scheduler with one processor more than that, so that a processor is
// always free for what each request waits for besides its build: noticing
// a new request on a connection, reading it, writing a finished response
// and net/http's reader that watches the connection. With as many
// processors as builds, all of them computed feeds under load, and the
// scheduler polled the network only when a build ended (or every 10 ms):
// a request that had arrived, or a goroutine queued behind a build, waited
// for a whole build, now and then for several.
//
// serveProcs keeps that setting while servers run in this process and
// gives the number of builds at once; GOMAXPROCS in the environment is the
// operator's choice and is left alone (builds at once: GOMAXPROCS).
var serveProcs struct {
	mu    sync.Mutex
	users int
	cores int // GOMAXPROCS before the first user
}

// startServeProcs applies the setting and returns the ad-hoc builds a
// server runs at once, with the function that ends the setting: the
// processors come back to what they were when the last server stops.
func startServeProcs(getenv func(string) (string, bool)) (builds int, stop func()) {
	if v, ok := getenv("GOMAXPROCS"); ok && v != "" {
		return runtime.GOMAXPROCS(0), func() {}
	}
	serveProcs.mu.Lock()
	defer serveProcs.mu.Unlock()
	serveProcs.users++
	if serveProcs.users == 1 {
		serveProcs.cores = runtime.GOMAXPROCS(0)
		runtime.GOMAXPROCS(serveProcs.cores + 1)
	}
	builds = serveProcs.cores
	var once sync.Once
	return builds, func() {
		once.Do(func() {
			serveProcs.mu.Lock()
			defer serveProcs.mu.Unlock()
			serveProcs.users--
			if serveProcs.users == 0 {
				runtime.GOMAXPROCS(serveProcs.cores)
			}
		})
	}
}
