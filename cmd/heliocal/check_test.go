package main

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

func runStdin(t *testing.T, stdin string, args ...string) (int, string, string) {
	t.Helper()
	var out, errOut bytes.Buffer
	code := runWithInput(context.Background(), args, strings.NewReader(stdin), &out, &errOut, noEnv)
	return code, out.String(), errOut.String()
}

func readConfig(t *testing.T, name string) string {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "..", "testdata", "config", name))
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// --config - reads the configuration from standard input, in any of the
// three formats, told apart by their text.
func TestConfigFromStdin(t *testing.T) {
	for _, name := range []string{"parity.yaml", "parity.toml", "parity.json", "good-minimal.yaml"} {
		t.Run(name, func(t *testing.T) {
			code, out, errOut := runStdin(t, readConfig(t, name), "check", "--config", "-")
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errOut)
			}
			if !strings.Contains(out, "configuration: standard input (valid)") || !strings.Contains(out, "north-field") {
				t.Errorf("output:\n%s", out)
			}
		})
	}
	// Problems name standard input where a file name would be, with the
	// line.
	code, _, errOut := runStdin(t, readConfig(t, "bad-latitude.yaml"), "check", "-c", "-")
	if code != exitInput || !strings.Contains(errOut, "standard input:5: sites[0].latitude: 95: must be within -90..90") {
		t.Errorf("exit %d, stderr:\n%s", code, errOut)
	}
	// A file that cannot be read is named file:line: too, as its
	// problems are, not "--config farm.yaml: … line 4:"
	code, _, errOut = runStdin(t, "sites:\n  - id: x\n\tlatitude: 1\n", "check", "-c", "-")
	if want := "heliocal: standard input:3: cannot read the file as yaml: a tab in the indentation (YAML indents with spaces only)\n"; code != exitInput || errOut != want {
		t.Errorf("exit %d, stderr:\n%s\nwant\n%s", code, errOut, want)
	}
	path := filepath.Join(t.TempDir(), "farm.json")
	if err := os.WriteFile(path, []byte("{\n  \"sites\": [],\n}\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	code, _, errOut = runCLI(t, "check", "--config", path)
	if want := "heliocal: " + path + ":3: cannot read the file as json: "; code != exitInput || !strings.HasPrefix(errOut, want) {
		t.Errorf("exit %d, stderr:\n%s\nwant it to begin\n%s", code, errOut, want)
	}
	code, _, errOut = runStdin(t, "  \n", "events", "--config", "-", "--site", "x")
	if code != exitInput || !strings.Contains(errOut, "standard input is empty") {
		t.Errorf("empty input: exit %d, stderr: %s", code, errOut)
	}
}

// check --format json: one document a script can read, for a valid and for
// an invalid configuration (then exit 2, and nothing on stderr).
func TestCheckJSON(t *testing.T) {
	code, out, errOut := runCLI(t, "check", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var r checkReport
	if err := json.Unmarshal([]byte(out), &r); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	if !r.Valid || r.Configuration != "built-in demo" || len(r.Sites) != 5 || len(r.Feeds) == 0 || r.Problems != nil {
		t.Fatalf("report %+v", r)
	}
	for _, f := range r.Feeds {
		if f.ID == "" || f.Site == "" || len(f.Kinds) == 0 || f.Events <= 0 || f.Bytes <= 0 {
			t.Errorf("incomplete feed %+v", f)
		}
	}
	// The same figures as the text form (the demo's feeds are all under
	// max_feed_bytes: their sizes are written as every size is).
	_, text, _ := runCLI(t, "check")
	for _, f := range r.Feeds {
		if !strings.Contains(text, f.ID) || !strings.Contains(text, " "+f.size(0)) {
			t.Errorf("feed %s (%s) not in the text form", f.ID, f.size(0))
		}
	}
	// Each site's horizon: one altitude, or the skyline (config/demo.yaml).
	for _, s := range r.Sites {
		switch s.ID {
		case "cairnmoor":
			if s.Horizon != -0.8 || s.Skyline != nil || !strings.Contains(text, "−0.8°") {
				t.Errorf("cairnmoor horizon %+v", s)
			}
		case "brackenfold":
			if len(s.Skyline) != 8 || s.Skyline[3] != [2]float64{176, 25} || !strings.Contains(text, "skyline 3–25° (8 points)") {
				t.Errorf("brackenfold skyline %+v", s)
			}
		}
	}

	code, out, errOut = runStdin(t, readConfig(t, "every-problem.yaml"), "check", "--config", "-", "--format", "json")
	if code != exitInput || errOut != "" {
		t.Fatalf("invalid configuration: exit %d, stderr %q", code, errOut)
	}
	var bad struct {
		Valid    *bool
		Problems []checkProblem
	}
	if err := json.Unmarshal([]byte(out), &bad); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	if bad.Valid == nil || *bad.Valid || len(bad.Problems) < 3 {
		t.Fatalf("report %s", out)
	}
	found := false
	for _, p := range bad.Problems {
		if p.Field == "" || p.Message == "" {
			t.Errorf("problem without field or message: %+v", p)
		}
		if p.Field == "sites[0].latitude" && p.Value == "95" && strings.Contains(p.Message, "-90..90") && p.Line == 8 {
			found = true
		}
	}
	if !found {
		t.Errorf("no problem for sites[0].latitude = 95 on line 8 in %s", out)
	}

	if code, _, errOut := runCLI(t, "check", "--format", "yaml"); code != exitInput || !strings.Contains(errOut, `--format: "yaml"`) {
		t.Errorf("--format yaml: exit %d, %s", code, errOut)
	}
}

// check's table writes a kinds entry with its offset, so that a reminder
// before sunrise reads apart from the sunrise itself; the JSON keeps the
// kind names in kinds and gives the table's form in kinds_shown.
func TestCheckShowsOffsets(t *testing.T) {
	cfg := writeConfig(t, `sites:
  - {id: finca-guira, latitude: 22.85, longitude: -82.5, timezone: America/Havana}
feeds:
  - id: guira-sun
    site: finca-guira
    days_ahead: 10
    kinds: [sunrise, {kind: sunrise, offset: -30m, label: Open the barn vents}, {kind: sunset, offset: 15m}]
`)
	code, out, errOut := runCLI(t, "check", "--config", cfg)
	if code != 0 || !strings.Contains(out, "sunrise,sunrise-30m,sunset+15m") {
		t.Errorf("exit %d, table:\n%s%s\nwant the kinds sunrise,sunrise-30m,sunset+15m", code, out, errOut)
	}
	_, js, _ := runCLI(t, "check", "--config", cfg, "--format", "json")
	var r checkReport
	if err := json.Unmarshal([]byte(js), &r); err != nil || len(r.Feeds) != 1 {
		t.Fatalf("%v\n%s", err, js)
	}
	if got, want := r.Feeds[0].Kinds, []string{"sunrise", "sunrise", "sunset"}; !slices.Equal(got, want) {
		t.Errorf("JSON kinds %q, want %q", got, want)
	}
	if got, want := r.Feeds[0].KindsShown, []string{"sunrise", "sunrise-30m", "sunset+15m"}; !slices.Equal(got, want) {
		t.Errorf("JSON kinds_shown %q, want %q", got, want)
	}
}

// Two kinds entries of a feed differ in their kind or their offset: the
// other options of an entry (label, alarm, min_duration, weekdays, months,
// dates) do not make another entry, so the kind and the offset that
// check's table and kinds_shown write tell every entry apart.
func TestCheckEntriesApartByOffset(t *testing.T) {
	for _, opt := range []string{"label: Close the shutters", "alarm: 10m", "min_duration: 1h",
		"weekdays: [sat]", "months: [jan]", "dates: [2027-01-09]"} {
		code, _, errOut := runStdin(t, `sites:
  - {id: finca-guira, latitude: 22.85, longitude: -82.5, timezone: America/Havana}
feeds:
  - id: guira-sun
    site: finca-guira
    kinds: [sunset, {kind: sunset, `+opt+`}]
`, "check", "--config", "-")
		if code != exitInput || !strings.Contains(errOut, `feeds[0].kinds[1]: sunset: "sunset" listed twice`) {
			t.Errorf("%s: exit %d, want %d and \"sunset\" listed twice:\n%s", opt, code, exitInput, errOut)
		}
	}
}

// check's table writes a feed's window without a side of zero days: no
// "-0/+365 d".
func TestCheckWindow(t *testing.T) {
	cfg := writeConfig(t, `sites:
  - {id: finca-guira, latitude: 22.85, longitude: -82.5, timezone: America/Havana}
feeds:
  - {id: ahead-only, site: finca-guira, days_back: 0, days_ahead: 365, kinds: [sunrise]}
  - {id: back-only, site: finca-guira, days_back: 30, days_ahead: 0, kinds: [sunrise]}
  - {id: both-ways, site: finca-guira, days_back: 30, days_ahead: 60, kinds: [sunrise]}
  - {id: one-day, site: finca-guira, days_back: 0, days_ahead: 0, kinds: [sunrise]}
`)
	code, out, errOut := runCLI(t, "check", "--config", cfg)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	for _, want := range []string{"sunrise  +365 d ", "sunrise  -30 d ", "sunrise  -30/+60 d ", "sunrise  today "} {
		if !strings.Contains(out, want) {
			t.Errorf("table:\n%s\nwant %q", out, want)
		}
	}
	if strings.Contains(out, "-0/") || strings.Contains(out, "/+0 ") {
		t.Errorf("a side of zero days is shown:\n%s", out)
	}
}

// fullWriter is an output that takes nothing, as /dev/full: every write
// fails with the error ENOSPC gives.
type fullWriter struct{}

func (fullWriter) Write([]byte) (int, error) { return 0, errors.New("no space left on device") }

// check's report, as text or JSON, on an output that cannot take it is a
// run-time failure (exit 1) that says why, never a silent success.
func TestCheckOutputFull(t *testing.T) {
	cfg := readConfig(t, "good-minimal.yaml")
	for _, format := range []string{"text", "json"} {
		var errOut bytes.Buffer
		code := runWithInput(context.Background(), []string{"check", "--config", "-", "--format", format}, strings.NewReader(cfg), fullWriter{}, &errOut, noEnv)
		if code != exitFailure || !strings.Contains(errOut.String(), "no space left on device") {
			t.Errorf("--format %s: exit %d, stderr %q; want exit 1 naming the failed write", format, code, errOut.String())
		}
	}
}
