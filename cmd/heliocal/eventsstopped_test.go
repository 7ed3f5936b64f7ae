package main

import (
	"bytes"
	"context"
	"testing"
)

// An events listing stopped by SIGINT or SIGTERM (main cancels the
// context) exits 1 and says on standard error that the listing is
// incomplete, in one line whatever the step it was stopped at, with
// --kinds and with --feed, in every format; a script that reads standard
// output learns from it and from the exit code that what it got is cut
// short.
func TestEventsStoppedSaysListingIncomplete(t *testing.T) {
	cfg := writeConfig(t, ashgroveLamps)
	const want = "heliocal: events: stopped before the listing was complete: context canceled; what was written to standard output is cut short\n"
	for _, args := range [][]string{
		{"--site", "ashgrove", "--kinds", "lighting:16h,moonrise", "--format", "json"},
		{"--site", "ashgrove", "--kinds", "sunrise", "--format", "csv"},
		{"--site", "ashgrove", "--format", "table"},
		{"--site", "ashgrove", "--format", "ics"},
		{"--feed", "ashgrove-lamps", "--format", "csv"},
		{"--feed", "ashgrove-lamps", "--format", "ics"},
	} {
		ctx, cancel := context.WithCancel(context.Background())
		cancel()
		var out, errOut bytes.Buffer
		all := append([]string{"events", "--config", cfg, "--from", "2027-01-01", "--to", "2027-12-31"}, args...)
		code := run(ctx, all, &out, &errOut, noEnv)
		if code != exitFailure || errOut.String() != want {
			t.Errorf("%v: exit %d, stderr %q; want exit %d, %q", args, code, errOut.String(), exitFailure, want)
		}
	}
}
