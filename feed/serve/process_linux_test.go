package serve

import (
	"syscall"
	"testing"
)

// process_virtual_memory_max_bytes, read from /proc/self/limits, is the
// soft limit getrlimit(2) gives (RLIM_INFINITY, 2^64 − 1, when unlimited),
// and process_max_fds the one on open files.
func TestProcessLimits(t *testing.T) {
	for _, c := range []struct {
		name  string
		which int
		read  func() (float64, bool)
	}{{"RLIMIT_AS", syscall.RLIMIT_AS, maxVirtual}, {"RLIMIT_NOFILE", syscall.RLIMIT_NOFILE, maxFDs}} {
		var rl syscall.Rlimit
		if err := syscall.Getrlimit(c.which, &rl); err != nil {
			t.Fatal(err)
		}
		if got, ok := c.read(); !ok || got != float64(rl.Cur) {
			t.Errorf("%s: %v (%v), getrlimit %d", c.name, got, ok, rl.Cur)
		}
	}
}
