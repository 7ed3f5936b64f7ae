//go:build !unix

package main

import "testing"

// sendSIGHUP skips the test: a reload is asked for by SIGHUP, which this
// system cannot send (Windows).
func sendSIGHUP(t *testing.T) {
	t.Helper()
	t.Skip("no SIGHUP to send on this system")
}
