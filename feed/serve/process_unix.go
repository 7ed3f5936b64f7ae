//go:build unix

package serve

import "syscall"

// maxFDs is the soft limit on open files (RLIMIT_NOFILE).
func maxFDs() (float64, bool) {
	var rl syscall.Rlimit
	if syscall.Getrlimit(syscall.RLIMIT_NOFILE, &rl) != nil {
		return 0, false
	}
	return float64(rl.Cur), true
}
