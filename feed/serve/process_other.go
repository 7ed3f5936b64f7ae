//go:build !unix

package serve

// Without getrlimit(2) the process's limit on open files is left out of
// /metrics, as its CPU time (internal/cputime) and the figures of /proc are
// where they are missing.

func maxFDs() (float64, bool) { return 0, false }
