package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"testing"
)

// What the README's "For scripts" promises of the bytes of a listing,
// through the built binary: TZ, LANG and LC_* change none of them (the times
// are in the site's zone, the numbers have a decimal point whatever the
// locale), and JSON and CSV are UTF-8 without a byte-order mark, each line
// ending with LF alone, within a quoted cell too. The window holds Vienna's
// change to summer time (28 March 2027), a dark window past midnight and
// descriptions of several lines.
func TestEventsBytesIgnoreLocale(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary")
	}
	bin := filepath.Join(t.TempDir(), "heliocal")
	if out, err := exec.Command("go", "build", "-o", bin, ".").CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	cfg := writeConfig(t, `sites:
  - {id: vienna, latitude: 48.21, longitude: 16.37, timezone: Europe/Vienna}
feeds:
  - {id: vienna-night, site: vienna, kinds: [dark-window, sunrise, lighting:16h]}
`)
	envs := [][]string{
		{"TZ=UTC", "LANG=C", "LC_ALL=C"},
		{"TZ=Pacific/Kiritimati", "LANG=de_DE.UTF-8", "LC_ALL=tr_TR.UTF-8", "LC_NUMERIC=fr_FR.UTF-8", "LC_TIME=ja_JP.UTF-8"},
	}
	for _, args := range [][]string{
		{"--site", "vienna", "--kinds", "sunrise,dark-window,lighting:16h", "--format", "json"},
		{"--site", "vienna", "--kinds", "sunrise,dark-window,lighting:16h", "--format", "csv"},
		{"--site", "vienna", "--kinds", "sunrise,dark-window,lighting:16h", "--format", "table"},
		{"--feed", "vienna-night", "--format", "json"},
		{"--feed", "vienna-night", "--format", "csv"},
	} {
		var outs [][]byte
		for _, env := range envs {
			cmd := exec.Command(bin, append([]string{"events", "--config", cfg, "--from", "2027-03-26", "--to", "2027-03-29"}, args...)...)
			cmd.Dir = t.TempDir()
			cmd.Env = append(os.Environ(), env...)
			out, err := cmd.Output()
			if err != nil {
				t.Fatalf("%v with %v: %v", args, env, err)
			}
			outs = append(outs, out)
		}
		if !bytes.Equal(outs[0], outs[1]) {
			t.Errorf("%v: the output with %v differs from the one with %v:\n%s\n----\n%s", args, envs[1], envs[0], outs[1], outs[0])
		}
		if bytes.HasPrefix(outs[0], []byte("\xef\xbb\xbf")) || bytes.Contains(outs[0], []byte("\r")) {
			t.Errorf("%v: a byte-order mark or a CR in the output:\n%q", args, outs[0])
		}
		if args[0] == "--feed" && args[len(args)-1] == "csv" && !bytes.Contains(outs[0], []byte(".\nNatural day")) {
			t.Errorf("%v: no lamp period's description of two lines, its LF in a quoted cell:\n%s", args, outs[0])
		}
	}
}

// The README's "For scripts": a field of an event or an entry that does not
// apply is left out of the JSON, never null or false, over a listing of
// many kinds (timed and all-day entries, notes, lamp periods, plans,
// eclipses, Moon kinds) at a site north of the Arctic Circle, whose polar
// dates give notes too.
func TestEventsJSONLeavesOutWhatDoesNotApply(t *testing.T) {
	cfg := writeConfig(t, `sites:
  - {id: tromso, latitude: 69.65, longitude: 18.96, timezone: Europe/Oslo}
feeds:
  - id: tromso-all
    site: tromso
    kinds: [sunrise, sunset, daily-summary, civil-dusk, dark-window, golden-hour, moonrise, full-moon, photoperiod:12h, lunar-eclipse, lighting:18h]
    plans:
      - {title: Night watch, date: every friday, start: astronomical-dusk, end: astronomical-dawn}
      - {title: Market day, date: every saturday}
`)
	var walk func(path string, v any)
	walk = func(path string, v any) {
		switch x := v.(type) {
		case nil:
			t.Errorf("%s is null", path)
		case bool:
			if !x {
				t.Errorf("%s is false", path)
			}
		case map[string]any:
			for k, y := range x {
				walk(path+"."+k, y)
			}
		case []any:
			for i, y := range x {
				walk(fmt.Sprintf("%s[%d]", path, i), y)
			}
		}
	}
	for _, args := range [][]string{
		{"--feed", "tromso-all", "--from", "2027-12-10", "--to", "2028-01-20"},
		{"--site", "tromso", "--kinds", "sunrise,sunset,daily-summary,dark-window,moonrise,lunar-eclipse,photoperiod:12h,lighting:18h", "--from", "2027-12-10", "--to", "2028-01-20"},
	} {
		code, out, errOut := runCLI(t, append(append([]string{"events", "--config", cfg}, args...), "--format", "json")...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", args, code, errOut)
		}
		var doc map[string]any
		if err := json.Unmarshal([]byte(out), &doc); err != nil {
			t.Fatalf("%v: %v", args, err)
		}
		for _, list := range []string{"entries", "events", "notes"} {
			if items, ok := doc[list].([]any); ok {
				if len(items) == 0 && list != "notes" {
					t.Errorf("%v: no %s to look at", args, list)
				}
				walk(list, items)
			}
		}
	}
}
