package feed

// RowTitle is e's title where it is shown in a row of its date among other
// dates (the served page's day-by-day table and the builder's preview),
// beside the row's date and the entry's times.
//
// In a calendar app a note sits on its own date, and its title speaks of
// that date as today ("Polar night: the Sun does not rise today"); in a
// row for a date weeks ahead that would name the wrong day, so there the
// date is meant as the descriptions say it ("… on this date"), and a night
// is the row's ("No dark sky on this night", not "on the night of 5–6
// December 2026" beside the row's date).
//
// A title that carries its own times or date says them once in a calendar
// app, which shows the entry's times apart; in a row they stand beside the
// row's date and times, and are left out: "Lamps on 16:42–20:12 (3 h 30
// min, to reach 16 h)" is "Lamps on for 3 h 30 min, to reach 16 h", and
// "Dark sky, 11 h 09 min, night of 5–6 December 2026" is "Dark sky, 11 h
// 09 min".
//
// Each of these titles is written with its row's form beside it (the
// notes' in describeNote, a dark window's and the noon Sun's in describe,
// a lamp period's in lightingText.appendDescription), which the entry
// keeps; a label, and any other title, is the same in a row.
func RowTitle(e *Entry) string {
	if e.row != "" {
		return e.row
	}
	return e.Title
}
