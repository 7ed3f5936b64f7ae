package feed

import (
	"strings"
	"testing"

	"heliocal/config"
)

// A plan that lasts across a change of the clocks says so after its times,
// in the sentence of the dark windows and lamp periods: its clock times are
// an hour nearer or further apart than its length. America/Denver: the
// clocks go back from 02:00 MDT to 01:00 MST on Sunday 7 November 2027 and
// forward from 02:00 MST to 03:00 MDT on Sunday 14 March 2027 (IANA tz
// database, Rule US 2007 max: first Sunday in November, second Sunday in
// March, at 2:00). A plan of clock times across the change back says it
// once, in that sentence, where it had a bracket of its own; the nights
// before and after say nothing of the clocks.
func TestPlanAcrossClockChange(t *testing.T) {
	s := site(t, "cairnmoor", 39.08, -105.42, "America/Denver")
	night := config.Plan{Title: "Observing", Date: "every saturday", Start: "astronomical-dusk", End: "astronomical-dawn"}
	late := config.Plan{Title: "Late", Date: "every saturday", Start: "23:00", End: "05:00"}
	back := " The clocks go back from summer time by 1 h during it: 02:00 MDT becomes 01:00 MST."
	forward := " The clocks go forward for summer time by 1 h during it: 02:00 MST becomes 03:00 MDT."
	for _, c := range []struct {
		plan        config.Plan
		first, last string
		day, want   string // want: "" for a night without a change
	}{
		{night, "2027-10-30", "2027-11-13", "2027-11-06", "(astronomical dawn) the next day (Sun 7 Nov)." + back},
		{night, "2027-10-30", "2027-11-13", "2027-10-30", ""},
		{night, "2027-10-30", "2027-11-13", "2027-11-13", ""},
		{night, "2027-03-06", "2027-03-20", "2027-03-13", "(astronomical dawn) the next day (Sun 14 Mar)." + forward},
		{late, "2027-10-30", "2027-11-13", "2027-11-06", "From 23:00:00 MDT to 05:00:00 MST the next day (Sun 7 Nov)." + back},
		{late, "2027-03-06", "2027-03-20", "2027-03-13", "From 23:00:00 MST to 05:00:00 MDT the next day (Sun 14 Mar)." + forward},
		{late, "2027-03-06", "2027-03-20", "2027-03-20", ""},
	} {
		e := entryOn(t, planEntries(t, s, c.first, c.last, c.plan), c.day)
		if c.want == "" {
			if strings.Contains(e.Description, "clocks") {
				t.Errorf("%s %s: %q speaks of the clocks", c.plan.Title, c.day, e.Description)
			}
			continue
		}
		if !strings.Contains(e.Description, c.want) || strings.Count(e.Description, "clocks") != 1 {
			t.Errorf("%s %s: description\n%s\nwant, and the clocks once, %q", c.plan.Title, c.day, e.Description, c.want)
		}
	}
}
