package main

import (
	"bytes"
	"context"
	"encoding/json"
	"log/slog"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	"heliocal/config"
	"heliocal/feed/serve"
)

// parseYAML is the YAML configuration text cfg, parsed.
func parseYAML(t *testing.T, cfg string) *config.Config {
	t.Helper()
	c, err := config.Parse(strings.NewReader(cfg), "yaml")
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// checkWarnings is what heliocal check warns about the configuration text
// cfg on the date now.
func checkWarnings(t *testing.T, cfg string, now time.Time) []string {
	t.Helper()
	return checkReportOf(t, cfg, now).Warnings
}

// checkReportOf is check's report on the YAML configuration cfg at now.
func checkReportOf(t *testing.T, cfg string, now time.Time) *checkReport {
	t.Helper()
	c := parseYAML(t, cfg)
	r, _, err := checkConfig(context.Background(), c, config.Source{}, now)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// wantWarnings checks that the warnings got are want, in order.
func wantWarnings(t *testing.T, got, want []string) {
	t.Helper()
	if !slices.Equal(got, want) {
		t.Errorf("warnings:\n%s\nwant:\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
}

// wantWarningsStart checks that the lamp warnings got are as many as want
// and that each starts with its want, up to the words all of them share.
func wantWarningsStart(t *testing.T, got, want []string) {
	t.Helper()
	if len(got) != len(want) {
		t.Fatalf("warnings:\n%s\nwant %d", strings.Join(got, "\n"), len(want))
	}
	for i := range want {
		if !strings.HasPrefix(got[i], want[i]+", so it does not limit them: ") {
			t.Errorf("warning %d:\n%s\nwant it to start\n%s", i, got[i], want[i])
		}
	}
}

// havanaLamps are feeds at Havana with lighting limits, two of which do
// nothing on some dates of the year from havanaLampsNow
// (TestLampLimitWarning says which, and the source of its dates).
const havanaLamps = `sites:
  - {id: malecon-farm, name: Malecón Farm, latitude: 23.1, longitude: -82.4, timezone: America/Havana}
feeds:
  - id: havana-lamps
    site: malecon-farm
    days_back: 0
    days_ahead: 364
    kinds:
      - {kind: "lighting:14h", lamps: evening, latest_off: "18:45"}
  - id: night-lamps
    site: malecon-farm
    days_back: 0
    days_ahead: 364
    kinds:
      - {kind: "lighting:14h", lamps: evening, latest_off: "01:00"}
      - {kind: "lighting:13h", lamps: morning, earliest_on: "22:00"}
  - id: morning-lamps
    site: malecon-farm
    days_back: 0
    days_ahead: 364
    kinds:
      - {kind: "lighting:14h", lamps: morning, earliest_on: "07:25", months: [apr, may, jun, jul, aug, sep, oct]}
`

var havanaLampsNow = time.Date(2027, 1, 1, 12, 0, 0, 0, time.UTC)

// A latest_off before sunset does not limit the evening lamps (the first
// latest_off after their start is the next day's), and check says so.
// Havana, 23.1° N 82.4° W: sunset on 13 Mar 2027 18:37:59 CST, on 14 Mar
// 2027 (first day of summer time) 19:38:22 CDT, on 6 Nov 2027 18:48:41
// CDT, on 7 Nov 2027 (standard time again) 17:48:12 CST (PyEphem 4.1.4,
// upper limb, 34′ refraction, no elevation). The natural day there never
// reaches 14 h (13 h 33 min at the June solstice, same source), so every
// date needs lamps: the 238 dates from 14 Mar to 6 Nov 2027 have their
// evening lamps start after 18:45. A limit past midnight ("01:00") and one
// in the evening before the morning lamps ("22:00") are meant for the night: no warning.
func TestLampLimitWarning(t *testing.T) {
	got := checkWarnings(t, havanaLamps, havanaLampsNow)
	want := []string{
		`feed "havana-lamps": lighting:14h latest_off "18:45" comes before the evening lamps start on 238 dates between 14 Mar 2027 and 6 Nov 2027`,
		// Sunrise at Havana on 11 Oct 2027 07:24:49 CDT, on 12 Oct
		// 07:25:13 CDT (PyEphem 4.1.4, as above), and before 07:25 every
		// day from 1 Apr: the morning lamps end before 07:25 on those
		// 194 dates.
		`feed "morning-lamps": lighting:14h earliest_on "07:25" comes after the morning lamps end on 194 dates between 1 Apr 2027 and 11 Oct 2027`,
	}
	wantWarningsStart(t, got, want)
}

// Dates in a few stretches are named stretch by stretch, not as "between"
// the first and the last, which would make them seem the whole of the
// months between. Longyearbyen, 78.22° N 15.63° E (PyEphem 4.1.4, upper
// limb, 34′ refraction, no elevation): the natural day is under 16 h up to
// 2 Apr 2027 (15 h 52 min) and again from 10 Sep (15 h 52 min; 16 h 09 min
// on 3 Apr, 16 h 09 min on 9 Sep). Sunset comes after 20:00 from 28 Mar
// (20:20:02 CEST, the first day of summer time; 27 Mar 19:12:22 CET) and
// until 15 Sep (20:05:56; 16 Sep 19:57:52). Sunrise is before 07:00 from
// 12 Mar (06:56), and before 05:00 on 27 Mar (04:58:07 CET) and 10 Sep
// (04:55:56 CEST) only, among the dates that need lamps.
func TestLampLimitWarningStretches(t *testing.T) {
	const polar = `sites:
  - {id: isfjord-shed, latitude: 78.22, longitude: 15.63, timezone: Arctic/Longyearbyen}
feeds:
  - id: polar-lamps
    site: isfjord-shed
    days_back: 0
    days_ahead: 364
    kinds:
      - {kind: "lighting:16h", lamps: both, latest_off: "20:00", earliest_on: "07:00"}
  - id: dawn-lamps
    site: isfjord-shed
    days_back: 0
    days_ahead: 364
    kinds:
      - {kind: "lighting:16h", lamps: both, earliest_on: "05:00", latest_off: "23:00"}
`
	got := checkWarnings(t, polar, havanaLampsNow)
	want := []string{
		`feed "polar-lamps": lighting:16h latest_off "20:00" comes before the evening lamps start on 12 dates in 2 stretches: 28 Mar–2 Apr 2027 and 10–15 Sep 2027`,
		`feed "polar-lamps": lighting:16h earliest_on "07:00" comes after the morning lamps end on 39 dates in 2 stretches: 12 Mar–2 Apr 2027 and 10–26 Sep 2027`,
		`feed "dawn-lamps": lighting:16h earliest_on "05:00" comes after the morning lamps end on 2 dates: 27 Mar 2027 and 10 Sep 2027`,
	}
	wantWarningsStart(t, got, want)
}

// publish prints check's lamp warnings, in check's words, on standard
// error where it prints its other warnings, with --quiet too, and still
// exits 0 (the feeds are published).
func TestPublishLampLimitWarning(t *testing.T) {
	want := checkWarnings(t, havanaLamps, havanaLampsNow)
	if len(want) != 2 {
		t.Fatalf("check warns %d times, want 2: %q", len(want), want)
	}
	dir := t.TempDir()
	cfgPath := filepath.Join(dir, "havana.yaml")
	if err := os.WriteFile(cfgPath, []byte(havanaLamps), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, quiet := range []bool{false, true} {
		var out, errOut bytes.Buffer
		g := &globals{configPath: cfgPath, stdout: &out, stderr: &errOut, getenv: noEnv}
		o := &publishOptions{out: filepath.Join(dir, "public"), quiet: quiet, lockWait: time.Minute}
		if err := runPublish(context.Background(), g, o, havanaLampsNow); err != nil {
			t.Fatalf("quiet %v: %v\n%s", quiet, err, errOut.String())
		}
		var lines []string
		for _, l := range strings.Split(errOut.String(), "\n") {
			if strings.Contains(l, "latest_off") || strings.Contains(l, "earliest_on") {
				lines = append(lines, l)
			}
		}
		if len(lines) != len(want) {
			t.Fatalf("quiet %v: stderr:\n%s\nwant the %d warnings of check", quiet, errOut.String(), len(want))
		}
		for i := range want {
			if lines[i] != "heliocal: warning: "+want[i] {
				t.Errorf("quiet %v: line\n%s\nwant\n%s", quiet, lines[i], "heliocal: warning: "+want[i])
			}
		}
		if out.Len() != 0 {
			t.Errorf("quiet %v: standard output: %q", quiet, out.String())
		}
		if _, err := os.Stat(filepath.Join(dir, "public", "havana-lamps.ics")); err != nil {
			t.Error(err)
		}
	}
	// exit code: 0, through the command line
	code, _, errOut := runCLI(t, "--config", cfgPath, "publish", "--quiet", "--out", filepath.Join(dir, "public2"))
	if code != 0 || !strings.Contains(errOut, `warning: feed "havana-lamps": lighting:14h latest_off "18:45" comes before the evening lamps start`) {
		t.Errorf("exit %d, stderr:\n%s", code, errOut)
	}
}

// serve logs check's lamp warnings, in check's words, at its first build,
// and at a refresh only a limit it has not warned about at the build
// before: the same limits again log nothing.
func TestServeLampLimitWarning(t *testing.T) {
	b, warned := serveWarnings(t, havanaLamps)
	if _, err := b(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	// serve's window starts today: any year ahead has summer time at
	// Havana and April to October, so both limits warn, whatever the date
	want := checkWarnings(t, havanaLamps, time.Now())
	got := warned()
	if len(want) != 2 || !slices.Equal(got, want) {
		t.Fatalf("first build logged\n%s\nwant check's\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
	if _, err := b(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	if got := warned(); len(got) != 2 {
		t.Errorf("a refresh with the same limits logged them again:\n%s", strings.Join(got, "\n"))
	}
}

// The built-in demo, which the README's first command publishes, shows its
// lighting limits doing what they say whatever the day it is run: no
// lighting-limit warning for a run on the first of any month.
func TestDemoHasNoLampLimitWarning(t *testing.T) {
	c := config.Demo()
	for m := time.January; m <= time.December; m++ {
		now := time.Date(2027, m, 1, 12, 0, 0, 0, time.UTC)
		r, _, err := checkConfig(context.Background(), c, config.Source{}, now)
		if err != nil {
			t.Fatal(err)
		}
		for _, w := range r.Warnings {
			if strings.Contains(w, "lamps") {
				t.Errorf("run on %s: %s", now.Format("2 Jan 2006"), w)
			}
		}
	}
}

// serveWarnings is serve's build function for the YAML configuration cfg,
// and what it has logged at WARN so far, in order.
func serveWarnings(t *testing.T, cfg string) (serve.BuildFunc, func() []string) {
	t.Helper()
	c := parseYAML(t, cfg)
	logged := &lockedBuffer{}
	return serveBuild(c, "", slog.New(slog.NewJSONHandler(logged, nil))), func() []string { return warnings(t, logged) }
}

// warnings returns the messages of the WARN lines a JSON slog handler has
// written to logged, in order.
func warnings(t *testing.T, logged *lockedBuffer) []string {
	t.Helper()
	var msgs []string
	dec := json.NewDecoder(strings.NewReader(logged.String()))
	for dec.More() {
		var line struct{ Level, Msg string }
		if err := dec.Decode(&line); err != nil {
			t.Fatal(err)
		}
		if line.Level == "WARN" {
			msgs = append(msgs, line.Msg)
		}
	}
	return msgs
}
