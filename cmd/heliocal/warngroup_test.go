package main

import (
	"context"
	"encoding/json"
	"fmt"
	"log/slog"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"

	"heliocal/feed/publish"
)

// meadowFleet is meadowOversize with n feeds of the one site, meadow-0 to
// meadow-<n−1>, each over max_feed_bytes (20 kB), under service.oversize
// mode.
func meadowFleet(n int, mode string) string {
	var b strings.Builder
	b.WriteString("service:\n  max_feed_bytes: 20000\n  oversize: " + mode + "\n")
	b.WriteString("sites:\n  - {id: upper-meadow, latitude: 46.5, longitude: 7.9, timezone: Europe/Zurich}\nfeeds:\n")
	for i := range n {
		fmt.Fprintf(&b, "  - {id: meadow-%d, site: upper-meadow, kinds: [sunrise, sunset, civil-dawn, civil-dusk], days_back: 0, days_ahead: 200}\n", i)
	}
	return b.String()
}

// linesWith are the lines of text that contain s.
func linesWith(text, s string) []string {
	var out []string
	for _, l := range strings.Split(text, "\n") {
		if strings.Contains(l, s) {
			out = append(out, l)
		}
	}
	return out
}

// checkGrouped fails unless lines are the first publish.EachWarned feeds
// of n, meadow-0, meadow-1, …, each in a line of its own that first
// matches, then one line, prefix followed by the others each with a size,
// so that every feed is named once.
func checkGrouped(t *testing.T, what string, lines []string, n int, first *regexp.Regexp, prefix string) {
	t.Helper()
	if len(lines) != publish.EachWarned+1 {
		t.Fatalf("%s: %d feeds gave %d lines, want %d: %q", what, n, len(lines), publish.EachWarned+1, lines)
	}
	for i := range publish.EachWarned {
		if !first.MatchString(lines[i]) || !strings.Contains(lines[i], fmt.Sprintf("meadow-%d", i)) {
			t.Errorf("%s: line %d = %q, want meadow-%d in a line of %s", what, i, lines[i], i, first)
		}
	}
	rest, ok := strings.CutPrefix(lines[publish.EachWarned], prefix)
	if !ok {
		t.Fatalf("%s: the line of the rest = %q, want it to start %q", what, lines[publish.EachWarned], prefix)
	}
	named := regexp.MustCompile(`meadow-(\d+)(\.ics to \d{4}-\d\d-\d\d)? \((now )?\d+(\.\d+)? kB\)`).FindAllStringSubmatch(rest, -1)
	if len(named) != n-publish.EachWarned {
		t.Errorf("%s: the line of the rest names %d feeds with a size, want %d: %q", what, len(named), n-publish.EachWarned, rest)
	}
	for i, m := range named {
		if want := fmt.Sprint(publish.EachWarned + i); m[1] != want {
			t.Errorf("%s: the line of the rest names meadow-%s where meadow-%s is due: %q", what, m[1], want, rest)
		}
	}
}

// A fleet of feeds over max_feed_bytes published as they are gets from
// check, publish and publish --quiet the size warning of each of the first
// three, then one line naming the others with their sizes: 3 + 1 lines
// for 7 feeds, every feed named; check --format json keeps a warning per
// feed.
func TestOversizeWarningsGroupedCLI(t *testing.T) {
	const n = 7
	cfg := writeConfig(t, meadowFleet(n, "warn"))
	out := filepath.Join(t.TempDir(), "public")
	first := regexp.MustCompile(`^heliocal: warning: feed "meadow-\d" is \d+(\.\d+)? kB, over service\.max_feed_bytes \(20 kB\): published as it is, but some web calendars drop events`)
	prefix := "heliocal: warning: 4 more feeds over service.max_feed_bytes (20 kB), published as they are: "
	for _, args := range [][]string{
		{"check", "--config", cfg},
		{"publish", "--config", cfg, "--out", out},
		{"publish", "--quiet", "--config", cfg, "--out", out},
	} {
		code, _, errOut := runCLI(t, args...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", args, code, errOut)
		}
		checkGrouped(t, strings.Join(args[:2], " "), linesWith(errOut, "max_feed_bytes"), n, first, prefix)
	}
	var r struct{ Warnings []string }
	runJSON(t, &r, "check", "--config", cfg, "--format", "json")
	if len(r.Warnings) != n {
		t.Errorf("check --format json: %d warnings, want one per feed (%d): %q", len(r.Warnings), n, r.Warnings)
	}
	for i, w := range r.Warnings {
		if !first.MatchString("heliocal: warning: "+w) || !strings.Contains(w, fmt.Sprintf(`"meadow-%d"`, i)) {
			t.Errorf("check --format json: warning %d = %q, want meadow-%d's own", i, w, i)
		}
	}
}

// Under oversize: trim, check (its notes on standard output) and publish
// note the first three feeds shortened each in publish's words, then the
// others in one line with the date each reaches and its size; check
// --format json keeps a note per feed.
func TestTrimNotesGroupedCLI(t *testing.T) {
	const n = 6
	cfg := writeConfig(t, meadowFleet(n, "trim"))
	first := regexp.MustCompile(`^note: meadow-\d\.ics shortened to \d{4}-\d\d-\d\d to stay under 20 kB \(now 1\d(\.\d)? kB, \d+ events\)$`)
	prefix := "note: 3 more feeds shortened to stay under 20 kB: "
	code, stdout, errOut := runCLI(t, "check", "--config", cfg)
	if code != 0 {
		t.Fatalf("check: exit %d: %s", code, errOut)
	}
	checkGrouped(t, "check", linesWith(stdout, "shortened to"), n, first, prefix)
	code, _, errOut = runCLI(t, "publish", "--config", cfg, "--out", filepath.Join(t.TempDir(), "public"))
	if code != 0 {
		t.Fatalf("publish: exit %d: %s", code, errOut)
	}
	// on stderr, each line begins as every line heliocal writes there
	var lines []string
	for _, l := range linesWith(errOut, "shortened to") {
		l, ok := strings.CutPrefix(l, "heliocal: ")
		if !ok {
			t.Errorf("publish: %q, want it to begin \"heliocal: \"", l)
		}
		lines = append(lines, l)
	}
	checkGrouped(t, "publish", lines, n, first, prefix)
	var r struct{ Notes []string }
	runJSON(t, &r, "check", "--config", cfg, "--format", "json")
	if len(r.Notes) != n {
		t.Errorf("check --format json: %d notes, want one per feed (%d): %q", len(r.Notes), n, r.Notes)
	}
}

// serve logs the first three feeds over the limit in a record each and
// the others in one record naming them with their sizes, their ids in
// feed_ids; a refresh that finds the same feeds over logs nothing again.
func TestServeOversizeWarningsGrouped(t *testing.T) {
	const n = 7
	logged := &lockedBuffer{}
	b := serveBuild(parseYAML(t, meadowFleet(n, "warn")), "", slog.New(slog.NewJSONHandler(logged, nil)))
	for range 2 {
		if _, err := b(context.Background(), nil); err != nil {
			t.Fatal(err)
		}
	}
	var msgs []string
	var ids [][]string
	dec := json.NewDecoder(strings.NewReader(logged.String()))
	for dec.More() {
		var rec struct {
			Level, Msg string
			FeedIDs    []string `json:"feed_ids"`
		}
		if err := dec.Decode(&rec); err != nil {
			t.Fatal(err)
		}
		if rec.Level == "WARN" {
			msgs, ids = append(msgs, "warning: "+rec.Msg), append(ids, rec.FeedIDs)
		}
	}
	first := regexp.MustCompile(`^warning: feed "meadow-\d" is \d+(\.\d+)? kB, over service\.max_feed_bytes \(20 kB\): published as it is, but some web calendars drop events`)
	checkGrouped(t, "serve", msgs, n, first, "warning: 4 more feeds over service.max_feed_bytes (20 kB), published as they are: ")
	if want := []string{"meadow-3", "meadow-4", "meadow-5", "meadow-6"}; len(ids) == publish.EachWarned+1 && !slices.Equal(ids[publish.EachWarned], want) {
		t.Errorf("the record of the rest has feed_ids %q, want %q", ids[publish.EachWarned], want)
	}
	for i := range min(publish.EachWarned, len(ids)) {
		if ids[i] != nil {
			t.Errorf("record %d has feed_ids %q, want none", i, ids[i])
		}
	}
}
