package main

import (
	"path/filepath"
	"strings"
	"testing"
)

// Every line heliocal writes to standard error begins "heliocal: ": its
// errors (each problem of a configuration, one per line), notes and
// warnings, publish's start line, summary and notes, with --quiet too.
func TestStderrLinesNamedHeliocal(t *testing.T) {
	warn, trim := writeConfig(t, meadowFleet(5, "warn")), writeConfig(t, meadowFleet(5, "trim"))
	bad := writeConfig(t, "sites:\n  - {id: a, latitude: 95, longitude: 8, timezone: Europe/Zurik}\nfeeds:\n  - {id: f, site: b, kinds: [sunrize]}\n")
	nozone := writeConfig(t, "sites:\n  - {id: a, latitude: 47.37, longitude: 8.54}\nfeeds:\n  - {id: f, site: a, kinds: [sunrise]}\n")
	for _, tc := range []struct {
		args []string
		code int
		has  string // a line the run writes, after "heliocal: "
	}{
		{[]string{"check", "--config", warn}, 0, `warning: feed "meadow-0" is `},
		{[]string{"publish", "--config", warn, "--out", filepath.Join(t.TempDir(), "p")}, 0, "published 5 feeds"},
		{[]string{"publish", "--quiet", "--config", warn, "--out", filepath.Join(t.TempDir(), "p")}, 0, "warning: 2 more feeds over"},
		{[]string{"publish", "--config", trim, "--out", filepath.Join(t.TempDir(), "p")}, 0, "note: meadow-0.ics shortened to "},
		{[]string{"publish", "--quiet", "--config", trim, "--out", filepath.Join(t.TempDir(), "p")}, 0, "note: 2 more feeds shortened"},
		{[]string{"publish", "--config", nozone, "--out", filepath.Join(t.TempDir(), "p")}, 0, "note: site a has no timezone"},
		{[]string{"check", "--config", bad}, 2, "feeds[0].kinds[0]: sunrize: unknown kind"},
		{[]string{"events", "--config", writeConfig(t, skippedFeed), "--feed", "apia-plans", "--from", "2011-12-28"}, 0, `note: feed "apia-plans": plan "Film"`},
	} {
		code, _, errOut := runCLI(t, tc.args...)
		if code != tc.code {
			t.Errorf("%v: exit %d, want %d: %s", tc.args, code, tc.code, errOut)
		}
		found := false
		for _, l := range strings.Split(strings.TrimSuffix(errOut, "\n"), "\n") {
			rest, ok := strings.CutPrefix(l, "heliocal: ")
			if !ok {
				t.Errorf("%v: stderr line %q does not begin \"heliocal: \"", tc.args, l)
			}
			found = found || strings.Contains(rest, tc.has)
		}
		if !found {
			t.Errorf("%v: stderr\n%s\nwant a line \"heliocal: …%s…\"", tc.args, errOut, tc.has)
		}
	}
}
