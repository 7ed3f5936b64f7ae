//go:build !unix

package serve

// Without getrusage(2) and getrlimit(2) the process's CPU time and its
// limit on open files are left out of /metrics, as the figures of /proc are
// where it is missing.

func cpuSeconds() (float64, bool) { return 0, false }
func maxFDs() (float64, bool)     { return 0, false }
