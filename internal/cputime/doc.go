// Package cputime reads the CPU time the process has used, for benchmarks
// that report it beside wall time (on a busy machine the CPU time a piece of
// work takes is disturbed much less than its wall time) and for the
// server's process_cpu_seconds_total.
package cputime

import "time"

// Used is the CPU time the process has used (user and system), 0 where it
// cannot be read: benchmarks then report 0 CPU time.
func Used() time.Duration {
	d, _ := Read()
	return d
}
