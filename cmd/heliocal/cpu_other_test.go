//go:build !unix

package main

import "time"

// cpuTime is not measured here: benchmarks report 0 CPU time.
func cpuTime() time.Duration { return 0 }
