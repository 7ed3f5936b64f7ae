package main

import (
	"strings"
	"testing"
)

// A span across a clock change ends in another zone than it starts in; the
// tables then name the end's zone, so that "00:15:00 CDT – 00:15:00" is
// not read as a span of no length. The changes, from the tz database:
// Europe/Vienna goes from CEST to CET at 03:00 CEST on 31 October 2027
// (the last Sunday of October); America/Havana from CDT to CST at 01:00
// CDT on 7 November 2027 (the first Sunday of November).
func TestTableEndAcrossClockChange(t *testing.T) {
	code, out, errOut := runCLI(t, "events", "--lat", "48.2", "--lon", "16.4", "--tz", "Europe/Vienna",
		"--from", "2027-10-30", "--to", "2027-10-31", "--kinds", "dark-window")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	// the night of 30–31 October starts in CEST and ends in CET; the next
	// one keeps CET
	across, after := lineWith(t, out, "2027-10-30"), lineWith(t, out, "2027-10-31")
	if !strings.Contains(across, "CEST") || !strings.Contains(across, " CET +1 day") {
		t.Errorf("the night across the change: %q, want its end in CET", across)
	}
	if strings.Count(after, "CET") != 1 {
		t.Errorf("the night after the change: %q, want the zone named once", after)
	}

	cfg := `sites:
  - {id: farm, latitude: 22.62, longitude: -83.71, timezone: America/Havana}
feeds:
  - id: irrigation
    site: farm
    plans:
      - {title: Night irrigation, date: every day, start: "00:15", for: 1h}
`
	code, out, errOut = runStdin(t, cfg, "events", "--config", "-", "--feed", "irrigation", "--from", "2027-11-06", "--to", "2027-11-07")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	if l := lineWith(t, out, "2027-11-07"); !strings.Contains(l, "00:15:00 CDT – 00:15:00 CST") {
		t.Errorf("the plan across the change: %q, want it to end at 00:15:00 CST", l)
	}
	if l := lineWith(t, out, "2027-11-06"); !strings.Contains(l, "00:15:00 CDT – 01:15:00 ") {
		t.Errorf("the plan the day before: %q, want it to end at 01:15:00 with no zone of its own", l)
	}
}

// lineWith is the one line of out that starts with prefix.
func lineWith(t *testing.T, out, prefix string) string {
	t.Helper()
	var found []string
	for _, l := range strings.Split(out, "\n") {
		if strings.HasPrefix(l, prefix) {
			found = append(found, l)
		}
	}
	if len(found) != 1 {
		t.Fatalf("%d lines start with %q in:\n%s", len(found), prefix, out)
	}
	return found[0]
}
