package cputime

import (
	"runtime"
	"testing"
)

func TestUsedGrowsWithWork(t *testing.T) {
	if runtime.GOOS == "windows" || runtime.GOOS == "plan9" || runtime.GOOS == "js" || runtime.GOOS == "wasip1" {
		t.Skip("no CPU time on this system")
	}
	before := Used()
	x := 0.0
	for i := 0; i < 50_000_000; i++ {
		x += float64(i % 7)
	}
	if x == 0 {
		t.Fatal("no work done")
	}
	if after := Used(); after <= before {
		t.Fatalf("CPU time did not grow: %v then %v", before, after)
	}
}
