//go:build unix

package main

import (
	"os"
	"syscall"
	"testing"
)

// sendSIGHUP asks the running serve to reload, as an operator does.
func sendSIGHUP(t *testing.T) {
	t.Helper()
	if err := syscall.Kill(os.Getpid(), syscall.SIGHUP); err != nil {
		t.Fatal(err)
	}
}
