package main

import (
	"context"
	"log/slog"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"heliocal/config"
)

// meadowOversize is a feed of a few hundred kB over a max_feed_bytes of 20 kB.
const meadowOversize = `service:
  max_feed_bytes: 20000
sites:
  - id: upper-meadow
    latitude: 46.5
    longitude: 7.9
    timezone: Europe/Zurich
feeds:
  - id: meadow
    site: upper-meadow
    kinds: [sunrise, sunset, civil-dawn, civil-dusk]
    days_back: 0
    days_ahead: 200
`

// oversizeWords is the one wording of the size warning, without its
// "warning: " on standard error.
var oversizeWords = regexp.MustCompile(`^feed "meadow" is \d+(\.\d+)? kB, over service\.max_feed_bytes \(20 kB\): some web calendars drop events from subscriptions this large; shorten days_back/days_ahead or split the kinds into several feeds$`)

// The size warning of a feed over service.max_feed_bytes writes sizes one
// way from check, publish and publish --quiet: "41.2 kB" over "20 kB", never
// raw bytes; and it is the same sentence from each.
func TestOversizeWarningOneForm(t *testing.T) {
	cfg := writeConfig(t, meadowOversize)
	out := filepath.Join(t.TempDir(), "public")
	raw := regexp.MustCompile(`\d{4,} bytes|\(\d{4,}\)`)
	sized := regexp.MustCompile(`is \d+(\.\d+)? [kMG]?B, over [^:]*\b20 kB\b`)
	for _, args := range [][]string{
		{"check", "--config", cfg},
		{"publish", "--config", cfg, "--out", out},
		{"publish", "--quiet", "--config", cfg, "--out", out},
	} {
		_, _, errOut := runCLI(t, args...)
		var warning string
		for _, l := range strings.Split(errOut, "\n") {
			if strings.Contains(l, "max_feed_bytes") || strings.Contains(l, "limit") {
				warning = l
			}
		}
		if warning == "" || raw.MatchString(warning) || !sized.MatchString(warning) {
			t.Errorf("%v: size warning %q (stderr %q), want sizes as \"41.2 kB\"", args, warning, errOut)
		}
		if w, ok := strings.CutPrefix(warning, "warning: "); !ok || !oversizeWords.MatchString(w) {
			t.Errorf("%v: size warning %q, want \"warning: \" and %s", args, warning, oversizeWords)
		}
	}
}

// serve publishes a feed over max_feed_bytes under oversize: warn (the
// default) and logs the warning of check and publish, at its first build
// and not again at a refresh that finds the same feed over.
func TestServeOversizeWarning(t *testing.T) {
	c, err := config.Parse(strings.NewReader(meadowOversize), "yaml")
	if err != nil {
		t.Fatal(err)
	}
	var logged lockedBuffer
	b := serveBuild(c, "", slog.New(slog.NewJSONHandler(&logged, nil)))
	warned := func() []string { return warnings(t, &logged) }
	for range 2 {
		bundle, err := b(context.Background())
		if err != nil {
			t.Fatal(err)
		}
		if f := bundle.File("meadow.ics"); f == nil {
			t.Fatal("meadow.ics not served")
		}
	}
	if got := warned(); len(got) != 1 || !oversizeWords.MatchString(got[0]) {
		t.Errorf("two builds logged %q, want once %s", got, oversizeWords)
	}
}

// Under service.oversize: trim serve logs publish's note on the shortened
// feed at WARN, once for two builds that shorten it alike, in publish's
// words, with the sizes written as the warning writes them ("20 kB", not
// "20.0 kB").
func TestServeTrimNote(t *testing.T) {
	yaml := strings.Replace(meadowOversize, "max_feed_bytes: 20000\n", "max_feed_bytes: 20000\n  oversize: trim\n", 1)
	c, err := config.Parse(strings.NewReader(yaml), "yaml")
	if err != nil {
		t.Fatal(err)
	}
	var logged lockedBuffer
	b := serveBuild(c, "", slog.New(slog.NewJSONHandler(&logged, nil)))
	for range 2 {
		if _, err := b(context.Background()); err != nil {
			t.Fatal(err)
		}
	}
	note := regexp.MustCompile(`^meadow\.ics shortened to \d{4}-\d\d-\d\d to stay under 20 kB \(now 1\d(\.\d)? kB, \d+ events\)$`)
	got := warnings(t, &logged)
	if len(got) != 1 || !note.MatchString(got[0]) {
		t.Fatalf("two builds logged %q, want once %s", got, note)
	}
	cfg := writeConfig(t, yaml)
	code, _, errOut := runCLI(t, "publish", "--config", cfg, "--out", filepath.Join(t.TempDir(), "public"))
	if code != 0 || !strings.Contains(errOut, "\nnote: "+got[0]+"\n") {
		t.Errorf("publish: exit %d, stderr %q; want the note %q", code, errOut, got[0])
	}
}
