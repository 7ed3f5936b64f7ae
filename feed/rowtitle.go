package feed

import "strings"

// RowTitle is e's title where it is shown in a row of its date among other
// dates (the served page's day-by-day table and the builder's preview).
// In a calendar app a note sits on its own date, and its title speaks of
// that date as today ("Polar night: the Sun does not rise today"); in a
// row for a date weeks ahead that would name the wrong day, so there the
// date is meant as the descriptions say it ("… on this date"). Titles with
// no time word, and those of other entries, are returned as they are.
func RowTitle(e *Entry) string {
	t := e.Title
	switch {
	case e.Facts.Note:
		// a note's title is the program's words only: no label, no user text
		t = rowWords.Replace(t)
		if s, ok := strings.CutSuffix(t, " today"); ok {
			t = s + " on this date"
		}
	case e.Kind == "noon-clear":
		if s, ok := strings.CutSuffix(t, " from today"); ok {
			t = s + " from this date"
		}
	}
	return t
}

// rowWords are the time words of the notes' titles inside them (see
// describeNote, noEventToday, describeMoonNote and underMinimumText) and
// what a row of the note's date says instead.
var rowWords = strings.NewReplacer(
	" today:", " on this date:",
	" tonight:", " on this date:",
	" all last night", " all the night before",
)
