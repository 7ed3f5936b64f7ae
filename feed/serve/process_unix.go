//go:build unix

package serve

import "syscall"

// cpuSeconds is the process's user and system CPU time (getrusage(2)).
func cpuSeconds() (float64, bool) {
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) != nil {
		return 0, false
	}
	return float64(ru.Utime.Nano()+ru.Stime.Nano()) / 1e9, true
}

// maxFDs is the soft limit on open files (RLIMIT_NOFILE).
func maxFDs() (float64, bool) {
	var rl syscall.Rlimit
	if syscall.Getrlimit(syscall.RLIMIT_NOFILE, &rl) != nil {
		return 0, false
	}
	return float64(rl.Cur), true
}
