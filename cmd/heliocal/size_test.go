package main

import (
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// The size warning of a feed over service.max_feed_bytes writes sizes one
// way from check, publish and publish --quiet: "41.2 kB" over "20 kB", never
// raw bytes.
func TestOversizeWarningOneForm(t *testing.T) {
	cfg := writeConfig(t, `service:
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
`)
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
	}
}
