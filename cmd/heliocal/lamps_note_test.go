package main

import (
	"encoding/json"
	"strings"
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
	// the dates at the stretch's ends that need under a minute of lamps
	// (10 June and 2 July) have a note that none are scheduled
	notes := doc.Notes[:0:0]
	for _, n := range doc.Notes {
		if n.State != "lamps-not-scheduled" {
			notes = append(notes, n)
		}
	}
	if len(notes) != 1 || notes[0].Kind != "lighting:16h" || notes[0].State != "no-lamps-needed" || len(doc.Notes) > 3 {
		t.Fatalf("notes %+v, want one no-lamps-needed note (and at most one at each end of its stretch)", doc.Notes)
	}
	doc.Notes = notes
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

// A date whose few minutes of lamps fall under min_duration is not silent:
// its entry is an all-day note with the state lamps-not-scheduled,
// target_not_reached and the day length, as the README says. At 48.2° N the natural day comes within 15 min of
// 16 h in early June (USNO Duration of Daylight table for 48° N, a longest
// day of about 16 h 05 min; value from memory).
func TestLightingNotScheduledJSON(t *testing.T) {
	cfg := `sites:
  - {id: lindenrain, name: Lindenrain, latitude: 48.2, longitude: 16.4, timezone: Europe/Vienna}
feeds:
  - id: lamps
    site: lindenrain
    kinds:
      - {kind: "lighting:16h", min_duration: 15m}
`
	code, out, errOut := runStdin(t, cfg, "events", "--config", "-", "--feed", "lamps", "--from", "2027-05-20", "--to", "2027-06-20", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var doc struct {
		Entries []struct {
			Title, State string
			AllDay       bool     `json:"all_day"`
			DayLength    *float64 `json:"day_length_s"`
			Lamp         *float64 `json:"lamp_s"`
			Short        bool     `json:"target_not_reached"`
		}
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	notes := 0
	for _, e := range doc.Entries {
		switch {
		case e.State == "lamps-not-scheduled":
			notes++
			// an all-day entry with the day length (between 15 h 45 min
			// and 16 h: within 15 min of the target)
			if !e.Short || !strings.HasPrefix(e.Title, "Lamps not scheduled: ") || !e.AllDay || e.DayLength == nil || *e.DayLength < 56700 || *e.DayLength >= 57600 {
				t.Errorf("note %+v, want an all-day entry with target_not_reached, the day length and a title saying so", e)
			}
		case e.Lamp != nil && *e.Lamp < 900:
			t.Errorf("%q: a lamp period under the 15 min minimum", e.Title)
		}
	}
	if notes < 3 {
		t.Errorf("%d lamps-not-scheduled notes, want one per date whose shortfall is under 15 min", notes)
	}
}
