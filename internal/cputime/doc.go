// Package cputime reads the CPU time the process has used, for benchmarks
// that report it beside wall time: on a busy machine the CPU time a piece of
// work takes is disturbed much less than its wall time.
package cputime
