package serve

import (
	"strings"
	"testing"
)

// horizon=0 is a level horizon, which the query keeps (its own cache key
// and calendar): without horizon the flat horizon lowered by the dip of
// elev applies; a skyline is no single altitude.
func TestAdhocHorizonZeroKept(t *testing.T) {
	lim := testLimits()
	const place = "lat=-31.27&lon=149.07&elev=1150&tz=Australia/Sydney&kinds=sunrise"
	for _, c := range []struct {
		extra, words string
		set          bool
		inKey        string
	}{
		{"", "", false, ""},
		{"&horizon=0", ", horizon 0°", true, "&horizon=0&"},
		{"&horizon=0.04", ", horizon 0°", true, "&horizon=0&"}, // rounded to 0.1°
		{"&horizon=1.5", ", horizon 1.5°", true, "&horizon=1.5&"},
		{"&horizon=0:0,90:2", ", skyline 0:0, 90:2 (azimuth:altitude)", false, "&horizon=0%3A0%2C90%3A2&"},
	} {
		q, err := parseAdhoc(place+c.extra, today, lim)
		if err != nil {
			t.Fatalf("%q: %v", c.extra, err)
		}
		if q.HorizonSet != c.set || q.horizonWords() != c.words {
			t.Errorf("%q: HorizonSet %v, words %q; want %v, %q", c.extra, q.HorizonSet, q.horizonWords(), c.set, c.words)
		}
		if key := q.String(); c.inKey == "" && strings.Contains(key, "horizon") || c.inKey != "" && !strings.Contains(key, c.inKey) {
			t.Errorf("%q: query %s, want it to hold %q", c.extra, key, c.inKey)
		}
	}
	a, _ := parseAdhoc(place, today, lim)
	b, _ := parseAdhoc(place+"&horizon=0", today, lim)
	if a.ID() == b.ID() {
		t.Errorf("the flat horizon and a level one share the feed id %s", a.ID())
	}
}
