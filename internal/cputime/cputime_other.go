//go:build !unix

package cputime

import "time"

// Read has no CPU time to give here: it returns false.
func Read() (time.Duration, bool) { return 0, false }
