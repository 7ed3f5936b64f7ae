package feed

import (
	"testing"
	"time"
)

// A row of the served table or the builder's preview shows an entry's
// times and date beside its title (the time column, the row's date): the
// title says neither again. The lamp title is the one the issue gives for
// the calendar entry; the other titles are those appendDescription,
// describeMoon and describeMoonNote write. A title in another form (a
// label) is kept as it is.
func TestRowTitleSaysTimesOnce(t *testing.T) {
	d := time.Date(2026, 12, 5, 0, 0, 0, 0, time.UTC)
	for _, tc := range []struct {
		kind  string
		note  bool
		title string
		want  string
	}{
		{"lighting:16h", false, "Lamps on 16:42–20:12 (3 h 30 min, to reach 16 h)", "Lamps on for 3 h 30 min, to reach 16 h"},
		{"lighting:16h", false, "Lamps on 22:15–01:05 +1 day (2 h 50 min; 16 h not reached)", "Lamps on for 2 h 50 min; 16 h not reached"},
		{"lighting:16h", false, "Glasshouse lamps", "Glasshouse lamps"},
		{"lighting:16h", false, "Lamps on 16:42 (3 h 30 min, to reach 16 h)", "Lamps on 16:42 (3 h 30 min, to reach 16 h)"},
		{"dark-window", false, "Dark sky, 11 h 09 min, night of 5–6 December 2026", "Dark sky, 11 h 09 min"},
		// another night's name is not the row's: kept
		{"dark-window", false, "Dark sky, 11 h 09 min, night of 4–5 December 2026", "Dark sky, 11 h 09 min, night of 4–5 December 2026"},
		{"dark-window", true, "No dark sky on the night of 5–6 December 2026: the Moon is up and bright all through the astronomical night",
			"No dark sky on this night: the Moon is up and bright all through the astronomical night"},
		{"dark-window", true, "No dark sky of 45 min or more on the night of 5–6 December 2026: the longest dark window is 9 min",
			"No dark sky of 45 min or more on this night: the longest dark window is 9 min"},
		{"golden-hour", false, "Golden hour (evening)", "Golden hour (evening)"},
	} {
		e := Entry{Kind: tc.kind, Title: tc.title, Date: d, Facts: Facts{Note: tc.note}}
		if got := RowTitle(&e); got != tc.want {
			t.Errorf("%s %q: row title %q, want %q", tc.kind, tc.title, got, tc.want)
		}
	}
}
