package main

import (
	"encoding/json"
	"testing"
)

// A date given with --from/--to is that calendar date even where the clocks
// skip its midnight: in Havana summer time began at 00:00 on 14 March 2027
// (tz database, America/Havana), so 2027-03-14 00:00 local never happened.
func TestEventsDateWithSkippedMidnight(t *testing.T) {
	code, out, errOut := runCLI(t, "events", "--lat", "23.13", "--lon", "-82.38", "--tz", "America/Havana",
		"--from", "2027-03-14", "--to", "2027-03-14", "--kinds", "sunrise", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var doc struct {
		Events []struct{ Date string }
		Site   struct{ From, To string }
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	if doc.Site.From != "2027-03-14" || doc.Site.To != "2027-03-14" || len(doc.Events) != 1 || doc.Events[0].Date != "2027-03-14" {
		t.Errorf("--from/--to 2027-03-14 in Havana gave from %s to %s, events %+v; want the sunrise of 2027-03-14", doc.Site.From, doc.Site.To, doc.Events)
	}
}
