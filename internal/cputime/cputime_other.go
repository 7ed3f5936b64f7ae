//go:build !unix

package cputime

import "time"

// Used is not measured here: benchmarks report 0 CPU time.
func Used() time.Duration { return 0 }
