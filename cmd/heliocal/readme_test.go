package main

import (
	"encoding/json"
	"os"
	"strings"
	"testing"
	"time"
)

// The JSON example of the README's tour is the output of the command it
// names: each event line it shows is an event heliocal prints, every field
// equal, the instants within 5 ms (the README shows them to the
// millisecond; the search may move its last digit).
func TestReadmeEventsExample(t *testing.T) {
	readme, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	var shown []map[string]any
	for _, l := range strings.Split(string(readme), "\n") {
		l = strings.TrimSuffix(strings.TrimSpace(l), ",")
		if !strings.HasPrefix(l, `{"kind": "`) || !strings.Contains(l, `"date": "2027-01-01"`) || !strings.Contains(l, `"start": "2027-01-01T`) {
			continue
		}
		var e map[string]any
		if err := json.Unmarshal([]byte(l), &e); err != nil {
			t.Fatalf("README line %s: %v", l, err)
		}
		if k := e["kind"]; k == "golden-hour" || k == "sunrise" || k == "sun-altitude:10" {
			shown = append(shown, e)
		}
	}
	if len(shown) != 3 {
		t.Fatalf("found %d example events in the README, want 3", len(shown))
	}
	code, out, errOut := runCLI(t, "events", "--lat", "48.2", "--lon", "16.4", "--elev", "180", "--tz", "Europe/Vienna",
		"--from", "2027-01-01", "--to", "2027-01-01", "--kinds", "sunrise,golden-hour,sun-altitude:10", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var got struct{ Events []map[string]any }
	if err := json.Unmarshal([]byte(out), &got); err != nil {
		t.Fatal(err)
	}
	for i, want := range shown {
		if i >= len(got.Events) {
			t.Fatalf("only %d events printed", len(got.Events))
		}
		for k, w := range want {
			g := got.Events[i][k]
			if k == "start" || k == "end" {
				wt, _ := time.Parse(time.RFC3339Nano, w.(string))
				gt, _ := time.Parse(time.RFC3339Nano, g.(string))
				if d := gt.Sub(wt); d < -5*time.Millisecond || d > 5*time.Millisecond {
					t.Errorf("event %d %s: printed %v, README %v", i, k, g, w)
				}
				continue
			}
			if g != w {
				t.Errorf("event %d %s: printed %v, README %v", i, k, g, w)
			}
		}
	}
}
