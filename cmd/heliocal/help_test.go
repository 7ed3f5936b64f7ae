package main

import (
	"bytes"
	"context"
	"strconv"
	"strings"
	"testing"
	"unicode/utf8"

	"heliocal/config"
)

func runCLIEnv(t *testing.T, env map[string]string, args ...string) (int, string, string) {
	t.Helper()
	var out, errOut bytes.Buffer
	getenv := func(k string) (string, bool) { v, ok := env[k]; return v, ok }
	code := runWithInput(context.Background(), args, strings.NewReader(""), &out, &errOut, getenv)
	return code, out.String(), errOut.String()
}

// Help is wrapped to the terminal's width (COLUMNS when the output is not
// a terminal), and the kinds are listed by family, not in one long line.
func TestHelpWrapped(t *testing.T) {
	for _, cols := range []int{60, 100} {
		for _, cmd := range []string{"events", "check", "serve", "publish"} {
			code, out, errOut := runCLIEnv(t, map[string]string{"COLUMNS": strconv.Itoa(cols)}, cmd, "--help")
			if code != 0 {
				t.Fatalf("%s --help: exit %d: %s", cmd, code, errOut)
			}
			inExamples := false
			for _, line := range strings.Split(out, "\n") {
				switch {
				case line == "Examples:":
					inExamples = true // command lines are not broken
				case line == "" || !strings.HasPrefix(line, " "):
					inExamples = false
				}
				n := utf8.RuneCountInString(line)
				if n <= cols-1 || inExamples {
					continue
				}
				// only a single word longer than the width may stick out
				if f := strings.Fields(line); len(f) > 1 && !strings.HasPrefix(strings.TrimSpace(line), "(default") {
					t.Errorf("%s --help at %d columns: line of %d: %q", cmd, cols, n, line)
				}
			}
		}
	}
	_, out, _ := runCLIEnv(t, map[string]string{"COLUMNS": "80"}, "events", "--help")
	for _, row := range []string{"  Sun:       sunrise, sunset, solar-noon", "  Twilight:  civil-dawn, civil-dusk", "  Year:      march-equinox", "  Moon:      new-moon"} {
		if !strings.Contains(out, row) {
			t.Errorf("events --help lacks the row %q:\n%s", row, out)
		}
	}
	if strings.Contains(out, "sunrise, sunset, solar-noon, civil-dawn") {
		t.Error("events --help still lists every kind in one line")
	}
	// every kind is in the list
	for _, k := range []string{"dark-window", "moon-transit", "photoperiod:<duration>", "sun-altitude:<degrees>", "sun-band:<low>..<high>", "aphelion", "blue-hour"} {
		if !strings.Contains(out, k) {
			t.Errorf("events --help lacks %s", k)
		}
	}
	// a kind's parameter is written as the kind takes it: two altitudes
	// for a band, not a duration
	if strings.Contains(out, "sun-band:<duration>") || strings.Contains(out, "sun-band:<degrees>") {
		t.Error("events --help writes sun-band's parameter as one value, not <low>..<high>")
	}
}

// The list of kinds and the usage with wrapped flags are made when help is
// written, whichever way it is asked for: no help shows the list's mark,
// and the usage after an unknown help topic wraps the flags as --help does.
func TestHelpMadeWhenWritten(t *testing.T) {
	env := map[string]string{"COLUMNS": "50"}
	for _, args := range [][]string{{"events", "--help"}, {"events", "-h"}, {"help", "events"}} {
		_, out, _ := runCLIEnv(t, env, args...)
		if strings.Contains(out, kindsHelpMark) || !strings.Contains(out, "\n  Sun:       sunrise,") {
			t.Errorf("%s: no list of kinds:\n%s", strings.Join(args, " "), out)
		}
	}
	_, help, _ := runCLIEnv(t, env, "--help")
	_, unknown, _ := runCLIEnv(t, env, "help", "nosuch")
	i, j := strings.Index(help, "  -c, --config"), strings.Index(help, "from standard input\n")
	if i < 0 || j < i || !strings.Contains(help[i:j], "\n") {
		t.Fatalf("--help at 50 columns: --config not wrapped:\n%s", help)
	}
	if config := help[i:j]; !strings.Contains(unknown, config) {
		t.Errorf("help nosuch:\n%s\nwant --config wrapped as --help wraps it:\n%s", unknown, config)
	}
}

func TestWrapText(t *testing.T) {
	in := "one two three four five six seven\n\nHead:\n  Row:   a, b, c, d, e, f, g, h\n  2  short"
	want := "one two three\nfour five six\nseven\n\nHead:\n  Row:   a, b,\n         c, d,\n         e, f,\n         g, h\n  2  short"
	if got := wrapText(in, 14); got != want {
		t.Errorf("wrapText:\n%s\nwant:\n%s", got, want)
	}
}

// Completion offers the configured site and feed ids, the tz database's
// zones and the kinds (the last of a comma-separated list).
func TestCompletion(t *testing.T) {
	complete := func(args ...string) []string {
		t.Helper()
		code, out, errOut := runCLI(t, append([]string{"__complete"}, args...)...)
		if code != 0 {
			t.Fatalf("__complete %v: exit %d: %s", args, code, errOut)
		}
		var words []string
		for _, line := range strings.Split(strings.TrimSpace(out), "\n") {
			if !strings.HasPrefix(line, ":") {
				word, _, _ := strings.Cut(line, "\t")
				words = append(words, word)
			}
		}
		return words
	}
	check := func(got []string, want ...string) {
		t.Helper()
		if strings.Join(got, " ") != strings.Join(want, " ") {
			t.Errorf("got %q, want %q", got, want)
		}
	}
	demo := config.Demo()
	var sites, feeds []string
	for _, s := range demo.Sites {
		sites = append(sites, s.ID)
	}
	for _, f := range demo.Feeds {
		if strings.HasPrefix(f.ID, "cairnmoor-") {
			feeds = append(feeds, f.ID)
		}
	}
	check(complete("events", "--site", ""), sites...)
	check(complete("events", "--site", "tallow"), "tallowgum")
	check(complete("events", "--feed", "cairnmoor-"), feeds...)
	if len(feeds) < 3 {
		t.Errorf("the demo has %d cairnmoor feeds", len(feeds))
	}
	check(complete("events", "--tz", "Pacific/Ch"), "Pacific/Chatham", "Pacific/Chuuk")
	check(complete("events", "--tz", "europe/vien"), "Europe/Vienna")
	check(complete("events", "--kinds", "sunrise,sun"), "sunrise,sunset", "sunrise,sun-hidden", "sunrise,sun-band:", "sunrise,sun-altitude:")
	check(complete("events", "--kinds", "moon"), "moon-phases", "moonrise", "moonset", "moon-transit")
	if zones := complete("events", "--tz", ""); len(zones) < 400 || zones[0] != "UTC" {
		t.Errorf("%d zones offered, first %q", len(zones), zones[0])
	}
}

// A date or a number after events' flags is completed with nothing, not
// with the names of the files in the working directory (cobra's directive
// 4, ShellCompDirectiveNoFileComp); --horizon, which takes a CSV file,
// still offers them (directive 0).
func TestCompletionNoFilesForDatesAndNumbers(t *testing.T) {
	for flag, want := range map[string]string{"--from": ":4", "--to": ":4", "--lat": ":4", "--lon": ":4", "--elev": ":4",
		"--pressure": ":4", "--temperature": ":4", "--max-illumination": ":4", "--horizon": ":0"} {
		code, out, errOut := runCLI(t, "__complete", "events", flag, "")
		if code != 0 {
			t.Fatalf("__complete events %s: exit %d: %s", flag, code, errOut)
		}
		if got := strings.TrimSpace(out); got != want {
			t.Errorf("__complete events %s '': %q, want %q", flag, got, want)
		}
	}
}

// events --feed: the site and kinds of a configured feed, with its options.
func TestEventsFeed(t *testing.T) {
	code, out, errOut := runCLI(t, "events", "--feed", "cairnmoor-night", "--from", "2027-01-01", "--to", "2027-01-01")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	for _, want := range []string{"Cairnmoor Hill Public Observatory", "astronomical-dawn", "astronomical-dusk", "dark-window"} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}
	code, out, _ = runCLI(t, "events", "--feed", "cairnmoor-night", "--kinds", "sunrise", "--from", "2027-01-01", "--to", "2027-01-01")
	if code != 0 || !strings.Contains(out, "sunrise") || strings.Contains(out, "dark-window") {
		t.Errorf("--kinds with --feed: exit %d\n%s", code, out)
	}
	if code, _, errOut := runCLI(t, "events", "--feed", "cairnmoor-nite"); code != exitInput || !strings.Contains(errOut, `--feed: "cairnmoor-nite": no such feed: did you mean "cairnmoor-night"? (configured: `) {
		t.Errorf("unknown feed: exit %d: %s", code, errOut)
	}
	for _, args := range [][]string{{"--feed", "glasshouse-lamps"}, {"--site", "nowhere-at-all", "--kinds", "sunrise"}} {
		if code, _, errOut := runCLI(t, append([]string{"events"}, args...)...); code != exitInput || !strings.Contains(errOut, "(configured: ") || strings.Contains(errOut, "did you mean") {
			t.Errorf("%s: exit %d: %s; want the configured ids and no guess", args, code, errOut)
		}
	}
	if code, _, errOut := runCLI(t, "events", "--site", "cairnmor", "--kinds", "sunrise"); code != exitInput || !strings.Contains(errOut, `--site: "cairnmor": no such site: did you mean "cairnmoor"?`) {
		t.Errorf("unknown site: exit %d: %s", code, errOut)
	}
	// the site's name or the feed's title for its id: the id it names
	if code, _, errOut := runCLI(t, "events", "--site", "Cairnmoor Hill Public Observatory", "--kinds", "sunrise"); code != exitInput ||
		!strings.Contains(errOut, `--site: "Cairnmoor Hill Public Observatory": no such site: that is the name of the site "cairnmoor": give its id (configured: `) {
		t.Errorf("--site by its name: exit %d: %s", code, errOut)
	}
	if code, _, errOut := runCLI(t, "events", "--feed", "Cairnmoor Observatory — twilight and dark sky"); code != exitInput ||
		!strings.Contains(errOut, `--feed: "Cairnmoor Observatory — twilight and dark sky": no such feed: that is the title of the feed "cairnmoor-night": give its id (configured: `) {
		t.Errorf("--feed by its title: exit %d: %s", code, errOut)
	}
	if code, _, errOut := runCLI(t, "events", "--feed", "cairnmoor-night", "--site", "cairnmoor"); code != exitInput || !strings.Contains(errOut, "--feed") {
		t.Errorf("--feed with --site: exit %d: %s", code, errOut)
	}
}

// The root help names every family of what heliocal computes, as the
// README's opening does: the lamp periods and the eclipses too.
func TestRootHelpNamesFamilies(t *testing.T) {
	code, out, _ := runCLI(t, "--help")
	text := strings.Join(strings.Fields(out), " ")
	for _, w := range []string{"sunrise", "twilight", "golden hour", "lamp periods", "Moon phases", "dark-sky windows", "solar and lunar eclipses"} {
		if code != 0 || !strings.Contains(text, w) {
			t.Errorf("heliocal --help (exit %d) does not name %q:\n%s", code, w, out)
		}
	}
}

// --version is described in the words of the version command, not as
// cobra's "version for heliocal", and still prints the version.
func TestVersionFlagHelp(t *testing.T) {
	code, out, errOut := runCLI(t, "--help")
	if code != 0 || !strings.Contains(out, "print the version (also: heliocal version)") || strings.Contains(out, "version for heliocal") {
		t.Errorf("heliocal --help: exit %d, stderr %q:\n%s", code, errOut, out)
	}
	for _, flag := range []string{"--version", "-v"} {
		if code, out, _ := runCLI(t, flag); code != 0 || !strings.HasPrefix(out, "heliocal ") {
			t.Errorf("heliocal %s: exit %d, %q", flag, code, out)
		}
	}
}
