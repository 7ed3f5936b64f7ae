package main

import (
	"encoding/json"
	"fmt"
	"os"
	"regexp"
	"slices"
	"strings"
	"testing"
	"time"

	"heliocal/config"
)

// The JSON example of the README's tour is the output of the command it
// names: each event line it shows is an event heliocal prints, every field
// equal, the instants within 5 ms (the README shows them to the
// millisecond; the search may move its last digit).
func TestReadmeEventsExample(t *testing.T) {
	shown := readmeJSON(t, func(l string) bool {
		return strings.HasPrefix(l, `{"kind": "`) && strings.Contains(l, `"date": "2027-01-01"`) && strings.Contains(l, `"start": "2027-01-01T`)
	})
	shown = slices.DeleteFunc(shown, func(e map[string]any) bool {
		k := e["kind"]
		return k != "golden-hour" && k != "sunrise" && k != "sun-altitude:10"
	})
	if len(shown) != 3 {
		t.Fatalf("found %d example events in the README, want 3", len(shown))
	}
	got := printedEvents(t, "--lat", "48.2", "--lon", "16.4", "--elev", "180", "--tz", "Europe/Vienna",
		"--from", "2027-01-01", "--to", "2027-01-01", "--kinds", "sunrise,golden-hour,sun-altitude:10")
	for i, want := range shown {
		if i >= len(got) {
			t.Fatalf("only %d events printed", len(got))
		}
		samePrinted(t, fmt.Sprintf("event %d", i), want, got[i])
	}
}

// readmeJSON returns the README's lines that keep takes (trimmed, without a
// trailing comma), each parsed as a JSON object.
func readmeJSON(t *testing.T, keep func(line string) bool) []map[string]any {
	t.Helper()
	readme, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	var out []map[string]any
	for _, l := range strings.Split(string(readme), "\n") {
		l = strings.TrimSuffix(strings.TrimSpace(l), ",")
		if !keep(l) {
			continue
		}
		var e map[string]any
		if err := json.Unmarshal([]byte(l), &e); err != nil {
			t.Fatalf("README line %s: %v", l, err)
		}
		out = append(out, e)
	}
	return out
}

// printedEvents runs `heliocal events` with args and --format json and
// returns the events it prints.
func printedEvents(t *testing.T, args ...string) []map[string]any {
	t.Helper()
	code, out, errOut := runCLI(t, append(append([]string{"events"}, args...), "--format", "json")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var got struct{ Events []map[string]any }
	if err := json.Unmarshal([]byte(out), &got); err != nil {
		t.Fatal(err)
	}
	return got.Events
}

// samePrinted checks that an object the README shows is the one printed:
// every field equal, the instants within 5 ms (the README shows them to the
// millisecond; the search may move its last digit). A field the README
// shortens to "…" is not compared.
func samePrinted(t *testing.T, what string, want, got map[string]any) {
	t.Helper()
	for k, w := range want {
		g := got[k]
		if w == "…" {
			continue
		}
		ws, _ := w.(string)
		if wt, err := time.Parse(time.RFC3339Nano, ws); err == nil && strings.Contains(ws, "T") {
			gs, _ := g.(string)
			gt, err := time.Parse(time.RFC3339Nano, gs)
			if d := gt.Sub(wt); err != nil || d < -5*time.Millisecond || d > 5*time.Millisecond {
				t.Errorf("%s %s: printed %v, README %v", what, k, g, w)
			}
			continue
		}
		if g != w {
			t.Errorf("%s %s: printed %v, README %v", what, k, g, w)
		}
	}
}

// The README's eclipse example is what the command it names prints: the
// two eclipses of August 2026 at Vienna, every field shown equal and every
// field printed shown, the instants (contacts and maximum) within 5 ms.
func TestReadmeEclipseExample(t *testing.T) {
	shown := readmeJSON(t, func(l string) bool {
		return strings.HasPrefix(l, `{"kind": "solar-eclipse"`) || strings.HasPrefix(l, `{"kind": "lunar-eclipse"`)
	})
	if len(shown) != 2 {
		t.Fatalf("found %d eclipse lines in the README, want 2", len(shown))
	}
	got := printedEvents(t, "--lat", "48.21", "--lon", "16.37", "--elev", "190", "--tz", "Europe/Vienna",
		"--from", "2026-08-01", "--to", "2026-08-31", "--kinds", "solar-eclipse,lunar-eclipse")
	if len(got) != len(shown) {
		t.Fatalf("printed %d events, the README shows %d", len(got), len(shown))
	}
	for i, want := range shown {
		what := fmt.Sprint(want["kind"])
		samePrinted(t, what, want, got[i])
		for k := range got[i] {
			if _, ok := want[k]; !ok {
				t.Errorf("%s: printed field %s not in the README", what, k)
			}
		}
	}
}

// The README's example of a feed's entries (`events --feed`, from the
// demo's cairnmoor-twilight, fernhollow-lamps and fernhollow-year feeds)
// is what those feeds print: each line shown is an entry of one of them
// on its date, every field equal, the instants within 5 ms.
func TestReadmeFeedExample(t *testing.T) {
	readme, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	for _, l := range strings.Split(string(readme), "\n") {
		if !strings.HasPrefix(l, `{"kind": "`) || !strings.Contains(l, `"uid": "…"`) {
			continue
		}
		n++
		var want map[string]any
		if err := json.Unmarshal([]byte(l), &want); err != nil {
			t.Fatalf("README line %s: %v", l, err)
		}
		date, _ := want["date"].(string)
		var found map[string]any
		for _, f := range []string{"cairnmoor-twilight", "fernhollow-lamps", "fernhollow-year"} {
			code, out, errOut := runCLI(t, "events", "--feed", f, "--from", date, "--to", date, "--format", "json")
			if code != 0 {
				t.Fatalf("--feed %s: exit %d: %s", f, code, errOut)
			}
			var got struct{ Entries []map[string]any }
			if err := json.Unmarshal([]byte(out), &got); err != nil {
				t.Fatal(err)
			}
			for _, e := range got.Entries {
				if e["kind"] == want["kind"] && e["title"] == want["title"] {
					found = e
				}
			}
		}
		if found == nil {
			t.Errorf("README entry %s: no feed prints it on %s", want["title"], date)
			continue
		}
		samePrinted(t, fmt.Sprint(want["title"]), want, found)
		for k := range found {
			if _, ok := want[k]; !ok {
				t.Errorf("%s: printed field %s not in the README", want["title"], k)
			}
		}
	}
	if n != 3 {
		t.Errorf("found %d feed entries in the README, want 3", n)
	}
}

// The README's day across midnight is heliocal's output at the place it
// names: at 78.2° N, 15.6° E on 17 April 2027 the Sun rises at 02:14 and
// sets at 00:03 on the 18th, a day of 21 h 48 min, 43 min 30 s longer than
// the day before.
func TestReadmeDayAcrossMidnight(t *testing.T) {
	readme, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	text := strings.Join(strings.Fields(string(readme)), " ")
	const claim = "at 78.2° N, 15.6° E (sea level, Arctic/Longyearbyen) on 17 April 2027 the Sun rises at 02:14 and sets at 00:03 the next date, a day of 21 h 48 min (+43 min 30 s from the day before)"
	if !strings.Contains(text, claim) {
		t.Fatalf("README does not say %q", claim)
	}
	code, out, errOut := runCLI(t, "events", "--lat", "78.2", "--lon", "15.6", "--tz", "Arctic/Longyearbyen",
		"--from", "2027-04-17", "--to", "2027-04-18", "--kinds", "sunrise,sunset,daily-summary")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	for _, w := range []string{
		"day length 21 h 48 min 11 s, change +43 min 30 s", // the summary of 17 April
		"2027-04-17 Sat  02:14:21 CEST",
		"2027-04-18 Sun  00:02:32 CEST",
	} {
		if !strings.Contains(out, w) {
			t.Errorf("output lacks %q:\n%s", w, out)
		}
	}
}

// The README's list of the built-in demo names every site of the demo.
func TestReadmeDemoSites(t *testing.T) {
	readme, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	text := string(readme)
	start := strings.Index(text, "### The built-in demo")
	if start < 0 {
		t.Fatal("README has no section on the built-in demo")
	}
	section := text[start:]
	if end := strings.Index(section[1:], "\n#"); end > 0 {
		section = section[:end+1]
	}
	for _, s := range config.Demo().Sites {
		if !strings.Contains(section, "**"+s.Name+"**") {
			t.Errorf("README's built-in demo does not list site %s (%s)", s.ID, s.Name)
		}
	}
}

// The README's polar-night note is what the command prints: at 69.65° N
// (18.96° E, Europe/Oslo) on 21 December 2027 `--kinds sunrise` lists no
// event and one note, the README's. The Sun's highest altitude there that
// day is about 90° − 69.65° − 23.44° = −3.1°: it does not rise (common
// practice: noon altitude 90° − latitude + declination).
func TestReadmePolarNightNote(t *testing.T) {
	readme, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	m := regexp.MustCompile("At 69\\.65° N on 21 December `--kinds sunrise` lists no\\s+event and `notes` says `(\\{[^`]*\\})`").FindSubmatch(readme)
	if m == nil {
		t.Fatal("README: the polar-night note is not where this test looks for it")
	}
	var want map[string]any
	if err := json.Unmarshal(m[1], &want); err != nil {
		t.Fatal(err)
	}
	code, out, errOut := runCLI(t, "events", "--lat", "69.65", "--lon", "18.96", "--tz", "Europe/Oslo",
		"--from", "2027-12-21", "--to", "2027-12-21", "--kinds", "sunrise", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var got struct{ Events, Notes []map[string]any }
	if err := json.Unmarshal([]byte(out), &got); err != nil {
		t.Fatal(err)
	}
	if len(got.Events) != 0 || len(got.Notes) != 1 {
		t.Fatalf("printed %d events and %d notes, want none and one: %s", len(got.Events), len(got.Notes), out)
	}
	samePrinted(t, "note", want, got.Notes[0])
	if len(got.Notes[0]) != len(want) {
		t.Errorf("note %v has fields the README does not show: %v", got.Notes[0], want)
	}
}
