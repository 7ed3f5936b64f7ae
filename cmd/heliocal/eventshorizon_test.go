package main

import (
	"encoding/json"
	"testing"
	"time"
)

// The site of events --format json says which horizon its rise and set
// are taken over, as check's JSON does: on a pier 12 m over the sea
// (8.5° S, 179.2° E) without --horizon, the flat horizon lowered by the
// dip, 1.76′·√12 = 6.1′ = 0.102° (N. Bowditch, The American Practical
// Navigator, dip of the sea horizon); with --horizon 0 a level horizon,
// no dip. Both printed "horizon_deg": 0 alone, which read the same. The
// sunrises on 1 January 2027 are those of PyEphem 4.1.4 (pressure 0, the
// Sun's centre at −56.10′ and −50.48′): 17:47:35.008 and 17:47:59.784 UTC
// on 31 December 2026, here within 0.1 s.
func TestEventsJSONSaysHorizonDip(t *testing.T) {
	for _, c := range []struct {
		horizon string
		set     bool
		dip     float64
		start   string
	}{
		{"", false, 0.102, "2026-12-31T17:47:35.008Z"},
		{"0", true, 0, "2026-12-31T17:47:59.784Z"},
	} {
		for _, feedArgs := range [][]string{nil, {"--feed", "pier-sun"}} {
			args := []string{"events", "--lat", "-8.5", "--lon", "179.2", "--elev", "12", "--tz", "Pacific/Funafuti",
				"--kinds", "sunrise", "--from", "2027-01-01", "--to", "2027-01-01", "--format", "json"}
			if c.horizon != "" {
				args = append(args, "--horizon", c.horizon)
			}
			var code int
			var out, errOut string
			if feedArgs != nil {
				cfg := "sites:\n  - {id: pier, latitude: -8.5, longitude: 179.2, elevation: 12, timezone: Pacific/Funafuti"
				if c.horizon != "" {
					cfg += ", horizon: " + c.horizon
				}
				cfg += "}\nfeeds:\n  - {id: pier-sun, site: pier, kinds: [sunrise]}\n"
				code, out, errOut = runStdin(t, cfg, "events", "-c", "-", "--feed", "pier-sun",
					"--from", "2027-01-01", "--to", "2027-01-01", "--format", "json")
			} else {
				code, out, errOut = runCLI(t, args...)
			}
			if code != 0 {
				t.Fatalf("horizon %q, feed %v: exit %d: %s", c.horizon, feedArgs != nil, code, errOut)
			}
			var doc struct {
				Events []struct {
					Start string `json:"start"`
				} `json:"events"`
				Entries []struct {
					Start string `json:"start"`
				} `json:"entries"`
				Site map[string]any `json:"site"`
			}
			if err := json.Unmarshal([]byte(out), &doc); err != nil {
				t.Fatalf("horizon %q: %v\n%s", c.horizon, err, out)
			}
			starts := doc.Events
			if feedArgs != nil {
				starts = doc.Entries
			}
			want, _ := time.Parse(time.RFC3339Nano, c.start)
			if len(starts) != 1 {
				t.Fatalf("horizon %q, feed %v: %d sunrises, want 1", c.horizon, feedArgs != nil, len(starts))
			}
			if got, err := time.Parse(time.RFC3339Nano, starts[0].Start); err != nil || got.Sub(want).Abs() > 100*time.Millisecond {
				t.Errorf("horizon %q, feed %v: sunrise %s, want %s (PyEphem) within 0.1 s", c.horizon, feedArgs != nil, starts[0].Start, c.start)
			}
			if doc.Site["horizon_deg"] != 0.0 || doc.Site["horizon_set"] != c.set || doc.Site["dip_deg"] != c.dip {
				t.Errorf("horizon %q, feed %v: site %v; want horizon_deg 0, horizon_set %v, dip_deg %v",
					c.horizon, feedArgs != nil, doc.Site, c.set, c.dip)
			}
		}
	}
}
