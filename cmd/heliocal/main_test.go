package main

import (
	"bytes"
	"context"
	"encoding/csv"
	"encoding/json"
	"flag"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"
)

var update = flag.Bool("update", false, "rewrite golden files")

// noEnv is an empty environment, so the host's HELIOCAL_ variables do not
// leak into tests.
func noEnv(string) (string, bool) { return "", false }

func runCLI(t *testing.T, args ...string) (int, string, string) {
	t.Helper()
	var out, errOut bytes.Buffer
	code := run(context.Background(), args, &out, &errOut, noEnv)
	return code, out.String(), errOut.String()
}

// runJSON runs the command, which must succeed, and decodes its JSON output
// into v.
func runJSON(t *testing.T, v any, args ...string) {
	t.Helper()
	code, out, errOut := runCLI(t, args...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	if err := json.Unmarshal([]byte(out), v); err != nil {
		t.Fatal(err)
	}
}

// The events table of a demo site over a fixed week is compared with a
// golden file; regenerate with `go test ./cmd/heliocal -update` and review
// the diff.
func TestEventsTableGolden(t *testing.T) {
	code, out, errOut := runCLI(t, "events", "--site", "fernhollow", "--from", "2027-03-26", "--to", "2027-03-29",
		"--kinds", "sunrise,sunset,solar-noon,civil-dawn,civil-dusk,golden-hour,march-equinox")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	golden := filepath.Join("..", "..", "testdata", "golden", "events-table.txt")
	if *update {
		if err := os.MkdirAll(filepath.Dir(golden), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(golden, []byte(out), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(golden)
	if err != nil {
		t.Fatalf("%v (run with -update to create it)", err)
	}
	if out != string(want) {
		got := golden + ".got"
		_ = os.WriteFile(got, []byte(out), 0o644)
		gl, wl := strings.Split(out, "\n"), strings.Split(string(want), "\n")
		for i := 0; i < len(gl) && i < len(wl); i++ {
			if gl[i] != wl[i] {
				t.Fatalf("%s:%d differs (output in %s):\n got: %s\nwant: %s", golden, i+1, got, gl[i], wl[i])
			}
		}
		t.Fatalf("%s: %d lines, want %d (output in %s)", golden, len(gl), len(wl), got)
	}
	// The clock change of 28 March 2027 (EU rule: last Sunday of March) shows in the zone column.
	if !strings.Contains(out, "CET") || !strings.Contains(out, "CEST") {
		t.Error("table does not switch from CET to CEST")
	}
}

// The JSON form: one object per event with kind and an RFC 3339 UTC start,
// sorted by time; spans have an end; custom thresholds have a direction.
func TestEventsJSON(t *testing.T) {
	var doc struct {
		Events []struct {
			Kind, Start, End, Direction string
		}
	}
	runJSON(t, &doc, "events", "--lat", "48.2", "--lon", "16.4", "--elev", "180", "--tz", "Europe/Vienna",
		"--from", "2027-01-01", "--to", "2027-01-10", "--kinds", "sunrise,sunset,golden-hour,sun-altitude:10,perihelion", "--format", "json")
	// 10 days × (sunrise + sunset + 2 golden hours + 2 crossings of 10°) + perihelion
	if len(doc.Events) != 61 {
		t.Errorf("%d events, want 61", len(doc.Events))
	}
	var prev time.Time
	for _, e := range doc.Events {
		start, err := time.Parse(time.RFC3339, e.Start)
		if err != nil || !strings.HasSuffix(e.Start, "Z") {
			t.Fatalf("start %q is not RFC 3339 UTC", e.Start)
		}
		if start.Before(prev) {
			t.Errorf("%s %s before the previous event", e.Kind, e.Start)
		}
		prev = start
		switch e.Kind {
		case "golden-hour":
			if e.End == "" {
				t.Error("golden-hour without end")
			}
		case "sun-altitude:10":
			if e.Direction != "rising" && e.Direction != "setting" {
				t.Errorf("sun-altitude direction %q", e.Direction)
			}
		}
	}
}

// Sunrise, sunset, moonrise and moonset carry their direction in JSON
// (azimuth_deg, from the north through the east) and CSV. At 48.2° N on the
// June solstice the Sun rises at 52.2° and sets at 307.8°: the spherical
// triangle cos A = (sin δ − sin h sin φ) / (cos h cos φ) with δ = 23.44°
// (the solstice declination: the obliquity, IAU value), h = −0.833°
// (Meeus ch. 13 and 15).
func TestEventsAzimuth(t *testing.T) {
	args := []string{"events", "--lat", "48.2", "--lon", "16.4", "--tz", "Europe/Vienna",
		"--from", "2027-06-21", "--to", "2027-06-21", "--kinds", "sunrise,sunset,moonrise,moonset,solar-noon"}
	var doc struct {
		Events []struct {
			Kind    string
			Azimuth *float64 `json:"azimuth_deg"`
		}
	}
	runJSON(t, &doc, append(args, "--format", "json")...)
	want := map[string]float64{"sunrise": 52.2, "sunset": 307.8}
	seen := 0
	for _, e := range doc.Events {
		switch {
		case e.Kind == "solar-noon":
			if e.Azimuth != nil {
				t.Errorf("solar-noon has an azimuth")
			}
		case e.Azimuth == nil:
			t.Errorf("%s without azimuth_deg", e.Kind)
		case e.Kind == "moonrise" && !(*e.Azimuth > 0 && *e.Azimuth < 180), e.Kind == "moonset" && !(*e.Azimuth > 180 && *e.Azimuth < 360):
			t.Errorf("%s at azimuth %.2f°", e.Kind, *e.Azimuth)
		default:
			if w, ok := want[e.Kind]; ok {
				seen++
				if d := *e.Azimuth - w; d > 0.1 || d < -0.1 {
					t.Errorf("%s at azimuth %.2f°, want %.1f°", e.Kind, *e.Azimuth, w)
				}
			}
		}
	}
	if seen != 2 {
		t.Errorf("%d of sunrise and sunset found", seen)
	}
	code, out, errOut := runCLI(t, append(args, "--format", "csv")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	if !strings.Contains(out, "azimuth_deg,") || !strings.Contains(out, ",52.19,") {
		t.Errorf("CSV without the azimuth column or the sunrise azimuth 52.19:\n%s", out)
	}
	// In words, the nearest of the 16 compass points (22.5° each; common
	// practice): north-east and north-west, in the table and in the
	// calendar text. The sunrise, 04:53:49 CEST: PyEphem 4.1.4 (libastro)
	// gives 02:53:48.932 UT with Observer(48.2 N, 16.4 E, 0 m), pressure 0,
	// horizon −0.8333°, use_center (heliocal's sunrise: the upper limb with
	// 34′ of refraction); tools/pyephem-checks/values.py prints it.
	code, out, errOut = runCLI(t, args...)
	if code != 0 || !strings.Contains(out, "azimuth 52.2° (north-east)") || !strings.Contains(out, "azimuth 307.8° (north-west)") {
		t.Errorf("table (exit %d, %s):\n%s", code, errOut, out)
	}
	code, out, errOut = runCLI(t, append(args, "--format", "ics")...)
	text := strings.NewReplacer("\r\n ", "", "\\,", ",").Replace(out) // unfolded, commas unescaped
	for _, w := range []string{"Sunrise at 04:53:49 CEST, azimuth 52° (north-east).", ", azimuth 308° (north-west).", "Moonrise at ", "Moonset at "} {
		if code != 0 || !strings.Contains(text, w) {
			t.Errorf("calendar text lacks %q (exit %d, %s)", w, code, errOut)
		}
	}
}

// Exit codes: 2 for bad input, each message naming the flag or field and
// the value.
func TestEventsBadInput(t *testing.T) {
	for _, tc := range []struct {
		name string
		args []string
		want string
	}{
		{"latitude", []string{"events", "--lat", "95", "--lon", "0"}, "--lat: 95"},
		{"longitude", []string{"events", "--lat", "0", "--lon", "-200"}, "--lon: -200"},
		// README: "--lat and --lon are both required (a missing one is an error, never 0°)".
		{"missing longitude", []string{"events", "--lat", "48.2"}, "--lon: missing"},
		{"missing latitude", []string{"events", "--lon", "16.4"}, "--lat: missing"},
		{"zone", []string{"events", "--lat", "0", "--lon", "0", "--tz", "Mars/Olympus"}, "Mars/Olympus"},
		{"kind", []string{"events", "--lat", "0", "--lon", "0", "--kinds", "sunrize"}, "sunrize"},
		{"kind twice", []string{"events", "--lat", "0", "--lon", "0", "--kinds", "sunrise,sunset,sunrise"}, `--kinds: "sunrise,sunset,sunrise": "sunrise" listed twice`},
		{"kind twice in a group", []string{"events", "--lat", "0", "--lon", "0", "--kinds", "seasons,june-solstice"}, `"june-solstice" listed twice, also in "seasons" (give each kind once)`},
		{"kind twice, the group after", []string{"events", "--lat", "0", "--lon", "0", "--kinds", "june-solstice,seasons"}, `"june-solstice" listed twice, also in "seasons" (give each kind once)`},
		{"group twice", []string{"events", "--lat", "0", "--lon", "0", "--kinds", "seasons,seasons"}, `--kinds: "seasons,seasons": "seasons" listed twice (give each kind once)`},
		// a feed's kinds are checked by the same function, with the same words
		{"kind twice in a config", []string{"check", "--config", filepath.Join("..", "..", "testdata", "config", "duplicate-kind.yaml")},
			`feeds[0].kinds[1]: june-solstice: "june-solstice" listed twice, also in "seasons" at feeds[0].kinds[0] (give each kind once, or give one an offset)`},
		{"kind twice in a group, flag", []string{"events", "--lat", "0", "--lon", "0", "--kinds", "seasons,june-solstice"},
			`--kinds: "seasons,june-solstice": "june-solstice" listed twice, also in "seasons" (give each kind once)`},
		{"date", []string{"events", "--lat", "0", "--lon", "0", "--from", "2027-13-01"}, "--from: \"2027-13-01\""},
		// a date of the command line is written as the configuration's, with the same hint
		{"one-digit month", []string{"events", "--lat", "0", "--lon", "0", "--from", "2027-6-12"}, `heliocal: --from: "2027-6-12": not a date (write it 2027-06-12)` + "\n"},
		{"two-digit year", []string{"events", "--lat", "0", "--lon", "0", "--to", "27-06-12"}, `heliocal: --to: "27-06-12": not a date (write the year in full: 2027-06-12)` + "\n"},
		{"order", []string{"events", "--lat", "0", "--lon", "0", "--from", "2027-02-01", "--to", "2027-01-01"}, "--to"},
		{"range", []string{"events", "--lat", "0", "--lon", "0", "--from", "1700-01-01", "--to", "1700-01-02"}, "1700"},
		{"format", []string{"events", "--lat", "0", "--lon", "0", "--format", "xml"}, "--format: \"xml\""},
		{"site", []string{"events", "--site", "nowhere"}, "nowhere"},
		{"flag", []string{"events", "--latitude", "1"}, "latitude"},
		{"not a number", []string{"events", "--lat", "4O.5", "--lon", "0"}, `heliocal: --lat: "4O.5": not a number (write decimal degrees, north positive, south negative, e.g. -42.88 for 42°52′48″S)` + "\n"},
		// a place's flags say how to write them, as the site's keys do
		{"degrees and minutes", []string{"events", "--lat", "0", "--lon", "72°15′W"}, `heliocal: --lon: "72°15′W": not a number (write -72.25: decimal degrees, east positive, west negative)`},
		{"elevation with its unit", []string{"events", "--lat", "0", "--lon", "0", "--elev", "120m"}, `--elev: "120m": not a number (write the number alone, without the unit: 120)`},
		{"elevation in feet", []string{"events", "--lat", "0", "--lon", "0", "--elev", "29000"}, `--elev: 29000: must be within -500..9000 metres (metres above sea level, not feet: write 8839 for 29000 ft)`}, // 29000 × 0.3048 m = 8839.2 m (the international foot, 0.3048 m exactly: NIST SP 811, appendix B)
		{"latitude out of range", []string{"events", "--lat", "95", "--lon", "0"}, `--lat: 95: must be within -90..90 (decimal degrees, north positive, south negative, e.g. -42.88 for 42°52′48″S)`},
		{"temperature in Fahrenheit", []string{"events", "--lat", "0", "--lon", "0", "--temperature", "80"}, `(degrees Celsius, not Fahrenheit: write 26.7 for 80 °F)`}, // (80 − 32) × 5/9 = 26.67 (°C from °F: NIST SP 811, appendix B)
		{"illumination as a percentage", []string{"events", "--lat", "0", "--lon", "0", "--kinds", "dark-window", "--max-illumination", "30"}, `--max-illumination: 30: must be within 0..1 (write a fraction of 1: 0.3 for 30 %)`},
		{"not a duration", []string{"publish", "--lock-wait", "5", "--out", "unused"}, `heliocal: --lock-wait: "5": not a duration`},
		{"shard count", []string{"publish", "--shard", "0/10001", "--out", "unused"}, `--shard "0/10001": count must be at most 10000`},
		{"out is a file", []string{"publish", "--out", "main_test.go"}, `heliocal: --out: "main_test.go": not a directory`},
		// a directory under a file cannot be made either: bad input too,
		// not a failed write
		{"out under a file", []string{"publish", "--out", filepath.Join("main_test.go", "sub")},
			`heliocal: --out: "` + filepath.Join("main_test.go", "sub") + `": main_test.go is not a directory`},
		{"config", []string{"check", "--config", filepath.Join("..", "..", "testdata", "config", "bad-latitude.yaml")}, "latitude"},
		{"missing config", []string{"check", "--config", "nope.yaml"}, "heliocal: --config nope.yaml: no such file\n"},
		{"config extension", []string{"check", "--config", "farm.ini"}, `heliocal: --config farm.ini: unknown file extension ".ini"`},
		{"config directory", []string{"check", "--config", filepath.Join("..", "..", "testdata", "config")},
			"heliocal: --config " + filepath.Join("..", "..", "testdata", "config") + ": is a directory, not a configuration file\n"},
		// an empty value is refused, not taken for the flag left out: a
		// script's --config "$CONF" with $CONF unset would check the demo
		{"empty config", []string{"check", "--config", ""},
			`heliocal: --config: "": empty (give a file, or drop the flag to read ./heliocal.yaml or the built-in demo)` + "\n"},
		{"empty zone", []string{"events", "--lat", "0", "--lon", "0", "--tz", ""}, `heliocal: --tz: "": empty (give a value, or drop the flag for its default)` + "\n"},
		{"empty date", []string{"events", "--lat", "0", "--lon", "0", "--from="}, `heliocal: --from: "": empty`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			code, _, errOut := runCLI(t, tc.args...)
			if code != exitInput {
				t.Errorf("exit %d, want %d (%s)", code, exitInput, errOut)
			}
			if !strings.Contains(errOut, tc.want) {
				t.Errorf("message %q does not name %q", errOut, tc.want)
			}
		})
	}
}

// A flag whose value is out of range is the only message: it is checked
// before the zone at the place is looked up and named in a note.
func TestEventsFlagsBeforeZone(t *testing.T) {
	for _, args := range [][]string{
		{"events", "--lat", "48.2", "--lon", "16.4", "--max-illumination", "1.5"},
		{"events", "--lat", "48.2", "--lon", "16.4", "--format", "xml"},
		{"events", "--lat", "48.2", "--lon", "16.4", "--kinds", "dark-window", "--max-illumination", "-0.1"},
	} {
		code, out, errOut := runCLI(t, args...)
		if code != exitInput || out != "" || strings.Count(errOut, "\n") != 1 || strings.Contains(errOut, "--tz") {
			t.Errorf("%s: exit %d, stdout %q, stderr %q; want exit %d and one line of error", strings.Join(args, " "), code, out, errOut, exitInput)
		}
	}
}

func TestVersionAndHelp(t *testing.T) {
	code, out, _ := runCLI(t, "version")
	if code != 0 || !strings.HasPrefix(out, "heliocal ") {
		t.Errorf("version: exit %d, %q", code, out)
	}
	for _, cmd := range []string{"events", "check", "publish", "serve", "version"} {
		code, out, _ := runCLI(t, cmd, "--help")
		if code != 0 || !strings.Contains(out, "Usage:") {
			t.Errorf("%s --help: exit %d", cmd, code)
		}
	}
	code, out, _ = runCLI(t, "completion", "bash")
	if code != 0 || !strings.Contains(out, "heliocal") {
		t.Errorf("completion bash: exit %d", code)
	}
}

// check on the built-in demo: valid, every site and feed listed.
func TestCheckDemo(t *testing.T) {
	t.Chdir(t.TempDir()) // no ./heliocal.yaml: the built-in demo
	code, out, errOut := runCLI(t, "check")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	for _, w := range []string{"built-in demo", "fernhollow", "tallowgum", "skarvlia", "cairnmoor-night"} {
		if !strings.Contains(out, w) {
			t.Errorf("check output lacks %q:\n%s", w, out)
		}
	}
}

// publish with no flags on a fresh directory publishes the demo; a second
// run writes nothing.
func TestPublishDemoTwice(t *testing.T) {
	dir := t.TempDir()
	t.Chdir(dir)
	code, _, errOut := runCLI(t, "publish")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	for _, name := range []string{"index.html", "feeds.json", "fernhollow-sun.ics", "tallowgum-sun.ics"} {
		if _, err := os.Stat(filepath.Join(dir, "public", name)); err != nil {
			t.Error(err)
		}
	}
	code, _, errOut = runCLI(t, "publish")
	if code != 0 {
		t.Fatalf("second run: exit %d: %s", code, errOut)
	}
	if !strings.Contains(errOut, "(0 written") {
		t.Errorf("second run rewrote files: %s", errOut)
	}
}

// service.out_dir naming a file is refused as bad input naming the key,
// before anything is computed or written.
func TestPublishOutDirIsFile(t *testing.T) {
	file := filepath.Join(t.TempDir(), "feeds")
	if err := os.WriteFile(file, []byte("not a directory"), 0o644); err != nil {
		t.Fatal(err)
	}
	minimal, err := os.ReadFile(filepath.Join("..", "..", "testdata", "config", "good-minimal.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	cfg := writeConfig(t, string(minimal)+"service:\n  out_dir: "+file+"\n")
	code, _, errOut := runCLI(t, "publish", "--config", cfg)
	if want := `heliocal: service.out_dir: "` + file + `": not a directory`; code != exitInput || !strings.Contains(errOut, want) {
		t.Errorf("exit %d, %q; want %d and %q", code, errOut, exitInput, want)
	}
	if b, err := os.ReadFile(file); err != nil || string(b) != "not a directory" {
		t.Errorf("the file was touched: %q, %v", b, err)
	}
}

// publish --out "" is refused before anything is written: it would
// otherwise publish into service.out_dir (the demo into ./public here).
func TestPublishEmptyOut(t *testing.T) {
	dir := t.TempDir()
	t.Chdir(dir)
	code, _, errOut := runCLI(t, "publish", "--out", "")
	want := `heliocal: --out: "": empty (give a directory, or drop the flag to use service.out_dir, public by default)` + "\n"
	if code != exitInput || errOut != want {
		t.Errorf("exit %d, %q; want %d and %q", code, errOut, exitInput, want)
	}
	if entries, _ := os.ReadDir(dir); len(entries) != 0 {
		t.Errorf("a refused publish wrote %d files", len(entries))
	}
}

// Shards of one directory must share a configuration: a shard with another
// base URL is refused (exit 1) while the first run is unfinished, and a
// non-positive --lock-wait is bad input.
func TestPublishRefusesMixedShards(t *testing.T) {
	dir := t.TempDir()
	code, _, errOut := runCLI(t, "publish", "-q", "--out", dir, "--shard", "0/2", "--base-url", "https://sky.example.org/a/")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	code, _, errOut = runCLI(t, "publish", "-q", "--out", dir, "--shard", "1/2", "--base-url", "https://sky.example.org/b/")
	if code != exitFailure || !strings.Contains(errOut, "unfinished sharded run of another configuration") ||
		!strings.Contains(errOut, "feeds-0-of-2.json") {
		t.Errorf("exit %d, %q; want 1 and a message naming the other run", code, errOut)
	}
	code, _, errOut = runCLI(t, "publish", "-q", "--out", dir, "--shard", "1/2", "--base-url", "https://sky.example.org/a/")
	if code != 0 {
		t.Errorf("the run's own second shard: exit %d: %s", code, errOut)
	}
	code, _, errOut = runCLI(t, "publish", "-q", "--out", dir, "--lock-wait", "0s")
	if code != exitInput || !strings.Contains(errOut, "--lock-wait: 0s") {
		t.Errorf("--lock-wait 0s: exit %d, %q", code, errOut)
	}
}

// The line a publish starts with counts the feeds it writes: a shard's own
// feeds, as its summary does, out of all of them; one feed is "1 feed".
func TestPublishStartLineCountsShard(t *testing.T) {
	started := regexp.MustCompile(`(?m)^heliocal: publishing shard (\d)/2: (\d+) feeds? of (\d+) from built-in demo to `)
	summary := regexp.MustCompile(`(?m)^heliocal: published shard (\d)/2: (\d+) feeds? \(`)
	total := 0
	for _, shard := range []string{"0/2", "1/2"} {
		code, _, errOut := runCLI(t, "publish", "--out", t.TempDir(), "--shard", shard)
		s, w := started.FindStringSubmatch(errOut), summary.FindStringSubmatch(errOut)
		if code != 0 || s == nil || w == nil || s[1] != w[1] || s[2] != w[2] {
			t.Fatalf("--shard %s: exit %d, stderr\n%s\nwant the start line to count the shard's feeds as the summary does", shard, code, errOut)
		}
		n, _ := strconv.Atoi(s[2])
		total += n
		if all, _ := strconv.Atoi(s[3]); all != 19 { // the demo's feeds (`heliocal check`)
			t.Errorf("--shard %s: %s feeds in all, want 19", shard, s[3])
		}
	}
	if total != 19 {
		t.Errorf("the two shards start %d feeds, want the demo's 19", total)
	}
	one := writeConfig(t, "sites:\n  - {id: plot, latitude: 48.2, longitude: 16.4, timezone: Europe/Vienna}\nfeeds:\n  - {id: plot-sun, site: plot, kinds: [sunrise]}\n")
	code, _, errOut := runCLI(t, "--config", one, "publish", "--out", t.TempDir())
	if code != 0 || !strings.Contains(errOut, "heliocal: publishing 1 feed from "+one+" to ") {
		t.Errorf("one feed: exit %d, stderr\n%s\nwant \"publishing 1 feed from …\"", code, errOut)
	}
}

// The sunset that ends the midnight Sun at 78.92° N, 11.93° E at 00:59:39
// CEST on 27 August 2027 (PyEphem 22:59:39.023 UT, see
// feed.TestSunsetEndingMidnightSun) has no day length in any format: its
// day lasted more than a day, and the length of the date's own day, which
// its sunrise at 01:30:45 carries, is not its.
func TestEventsSunsetEndingMidnightSun(t *testing.T) {
	args := []string{"events", "--lat", "78.92", "--lon", "11.93", "--tz", "Arctic/Longyearbyen",
		"--from", "2027-08-27", "--to", "2027-08-27", "--kinds", "sunrise,sunset"}
	var doc struct {
		Events []struct {
			Kind      string
			Start     string
			DayLength *float64 `json:"day_length_s"`
		}
	}
	runJSON(t, &doc, append(args, "--format", "json")...)
	if len(doc.Events) != 2 || doc.Events[0].Kind != "sunset" || !strings.HasPrefix(doc.Events[0].Start, "2027-08-26T22:59:39") {
		t.Fatalf("events %+v: want the sunset at 22:59:39 UT, then the sunrise", doc.Events)
	}
	if set, rise := doc.Events[0], doc.Events[1]; set.DayLength != nil || rise.DayLength == nil {
		t.Errorf("JSON: the sunset's day_length_s %v, the sunrise's %v; want none, then the day's", set.DayLength, rise.DayLength)
	}
	code, out, errOut := runCLI(t, append(args, "--format", "csv")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	rows, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil || len(rows) != 3 {
		t.Fatalf("CSV %q (%v): want a header and two rows", out, err)
	}
	col := slices.Index(rows[0], "day_length_s")
	if rows[1][1] != "sunset" || rows[1][col] != "" || rows[2][col] == "" {
		t.Errorf("CSV: sunset day_length_s %q, sunrise %q; want none, then the day's", rows[1][col], rows[2][col])
	}
	code, out, errOut = runCLI(t, args...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	if !strings.Contains(out, "00:59:39 CEST  sunset   ends the midnight sun (up for more than a day), azimuth") {
		t.Errorf("table:\n%s\nwant the sunset at 00:59:39 to say it ends the midnight sun", out)
	}
	// a feed's entries, likewise
	cfg := writeConfig(t, `sites:
  - id: isfjell
    latitude: 78.92
    longitude: 11.93
    timezone: Arctic/Longyearbyen
feeds:
  - id: isfjell-sun
    site: isfjell
    kinds: [sunrise, sunset]
`)
	var entries struct {
		Entries []struct {
			Kind      string
			DayLength *float64 `json:"day_length_s"`
		}
	}
	runJSON(t, &entries, "events", "--config", cfg, "--feed", "isfjell-sun", "--from", "2027-08-27", "--to", "2027-08-27", "--format", "json")
	if es := entries.Entries; len(es) != 2 || es[0].Kind != "sunset" || es[0].DayLength != nil || es[1].DayLength == nil {
		t.Errorf("--feed JSON %+v: want the sunset without day_length_s, then the sunrise with it", es)
	}
}

// The table writes a negative number with the minus sign of the feeds'
// texts, JSON and CSV with the ASCII hyphen of a number: at 78.92° N,
// 11.93° E on 21 December 2027 the Sun culminates at 11:10:12 UT at
// −12.3579° (PyEphem 4.1.4, geometric altitude, the Sun's centre), and the
// listing's elevation of −5 m is in its heading.
func TestEventsTableMinusSign(t *testing.T) {
	args := []string{"events", "--lat", "78.92", "--lon", "11.93", "--elev", "-5", "--tz", "Arctic/Longyearbyen",
		"--from", "2027-12-21", "--to", "2027-12-21", "--kinds", "solar-noon"}
	code, out, errOut := runCLI(t, args...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	if !strings.Contains(out, ", −5 m, ") || !strings.Contains(out, "12:10:12 CET  solar-noon  altitude −12.36°\n") {
		t.Errorf("table:\n%s\nwant −5 m and altitude −12.36°", out)
	}
	code, out, errOut = runCLI(t, append(args, "--format", "json")...)
	if code != 0 || !strings.Contains(out, `"altitude_deg":-12.3579`) || !strings.Contains(out, `"elevation_m": -5`) {
		t.Errorf("JSON (exit %d, %s):\n%s\nwant altitude_deg -12.3579", code, errOut, out)
	}
}

// The table's DETAILS of a daily summary say a change of the clocks on its
// date as the feed's summary does: Lord Howe Island's clocks go back by
// 30 min on 4 April 2027, 01:59:59 +11 then 01:30:00 +1030 (`zdump -v -c
// 2027,2028 Australia/Lord_Howe`).
func TestEventsTableSummaryClockChange(t *testing.T) {
	code, out, errOut := runCLI(t, "events", "--lat", "-31.55", "--lon", "159.08", "--tz", "Australia/Lord_Howe",
		"--from", "2027-04-03", "--to", "2027-04-05", "--kinds", "daily-summary")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	const clocks = ", clocks go back from summer time by 30 min: 02:00 becomes 01:30\n"
	if strings.Count(out, clocks) != 1 || !strings.Contains(out, "2027-04-04 Sun  all day  daily-summary  day length 11 h 40 min 22 s, change −1 min 54 s"+clocks) {
		t.Errorf("table:\n%s\nwant %q on 2027-04-04 alone", out, clocks)
	}
}
