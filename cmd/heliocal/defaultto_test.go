package main

import (
	"strings"
	"testing"
)

// A range whose end is --to's default (--from + 6 days) and past the last
// supported date says that the end was not given and which --to works: the
// user wrote 2200-12-28 alone, never 2201-01-03.
func TestEventsDefaultToPastRange(t *testing.T) {
	code, out, errOut := runCLI(t, "events", "--lat", "48.2", "--lon", "16.4", "--tz", "Europe/Vienna", "--from", "2200-12-28")
	want := "--to: not given, so --from + 6 days: 2200-12-28..2201-01-03, past the supported dates 1800-01-01..2200-12-31: give --to 2200-12-31"
	if code != exitInput || out != "" || !strings.Contains(errOut, want) {
		t.Errorf("exit %d, stdout %q, stderr %q; want exit %d and %q", code, out, errOut, exitInput, want)
	}
	code, out, errOut = runCLI(t, "events", "--lat", "48.2", "--lon", "16.4", "--tz", "Europe/Vienna", "--from", "2200-12-28", "--to", "2200-12-31")
	if code != 0 || !strings.Contains(out, "\n2200-12-31 Wed  ") {
		t.Errorf("with --to 2200-12-31: exit %d, %s\n%s", code, errOut, out)
	}
	// a --to the user wrote is named as before
	code, _, errOut = runCLI(t, "events", "--lat", "48.2", "--lon", "16.4", "--tz", "Europe/Vienna", "--from", "2200-12-28", "--to", "2201-01-03")
	if code != exitInput || !strings.Contains(errOut, "--from/--to: 2200-12-28..2201-01-03: outside the supported dates") {
		t.Errorf("with --to 2201-01-03: exit %d, %s", code, errOut)
	}
}
