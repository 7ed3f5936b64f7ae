//go:build !unix

package feed

import "time"

// cpuTime is not measured here: benchmarks report 0 CPU time.
func cpuTime() time.Duration { return 0 }
