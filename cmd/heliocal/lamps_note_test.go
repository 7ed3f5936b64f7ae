package main

import (
	"encoding/json"
	"testing"
	"time"
)

// The README's lighting note: at 48.2° N the natural day (sunrise to
// sunset) is 16 h or longer only around the June solstice, from about 11 June
// to 1 July (USNO Duration of Daylight table for 48° N: a longest day of
// about 16 h 05 min; value from memory), so one note names the stretch and
// the date lamps are needed again.
func TestLightingNoLampsNote(t *testing.T) {
	code, out, errOut := runCLI(t, "events", "--lat", "48.2", "--lon", "16.4", "--tz", "Europe/Vienna",
		"--from", "2027-01-01", "--to", "2027-12-31", "--kinds", "lighting:16h", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var doc struct {
		Notes []struct{ Kind, Date, State, Until string }
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Notes) != 1 || doc.Notes[0].Kind != "lighting:16h" || doc.Notes[0].State != "no-lamps-needed" {
		t.Fatalf("notes %+v, want one no-lamps-needed note", doc.Notes)
	}
	near := func(what, got, want string) {
		g, err1 := time.Parse(time.DateOnly, got)
		w, _ := time.Parse(time.DateOnly, want)
		if d := g.Sub(w); err1 != nil || d < -72*time.Hour || d > 72*time.Hour {
			t.Errorf("%s %q, want within 3 days of %s", what, got, want)
		}
	}
	near("date", doc.Notes[0].Date, "2027-06-11")
	near("until", doc.Notes[0].Until, "2027-07-02")
}
