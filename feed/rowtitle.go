package feed

import (
	"strings"

	"heliocal/config"
)

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
// 09 min". Other titles, and titles not in these forms (a label), are
// returned as they are.
func RowTitle(e *Entry) string {
	t := e.Title
	switch {
	case e.Facts.Note:
		// a note's title is the program's words only: no label, no user text
		t = rowWords.Replace(t)
		if s, ok := strings.CutSuffix(t, " today"); ok {
			t = s + " on this date"
		}
		if e.Kind == "dark-window" {
			t = strings.Replace(t, "the "+NightOf(e.Date), "this night", 1)
		}
	case e.Kind == "noon-clear":
		if s, ok := strings.CutSuffix(t, " from today"); ok {
			t = s + " from this date"
		}
	case e.Kind == "dark-window":
		t, _ = strings.CutSuffix(t, ", "+NightOf(e.Date))
	case strings.HasPrefix(e.Kind, config.KindLighting+":"):
		t = lampRowTitle(t)
	}
	return t
}

// lampRowTitle is a lamp period's title without its clock times (see
// appendDescription): "Lamps on 16:16–23:00 +1 day (6 h 44 min, to reach
// 16 h)" is "Lamps on for 6 h 44 min, to reach 16 h"; a title in another
// form is returned as it is.
func lampRowTitle(t string) string {
	const lead = "Lamps on "
	rest, ok := strings.CutPrefix(t, lead)
	// "16:16–23:00": two clock times and the dash (3 bytes in UTF-8)
	const span = len("00:00–00:00")
	if !ok || len(rest) < span || !isClock(rest[:5]) || rest[5:8] != "–" || !isClock(rest[8:span]) {
		return t
	}
	rest = rest[span:]
	rest = strings.TrimPrefix(rest, " +1 day")
	inner, ok := strings.CutPrefix(rest, " (")
	if !ok {
		return t
	}
	if inner, ok = strings.CutSuffix(inner, ")"); !ok {
		return t
	}
	return lead + "for " + inner
}

// isClock reports whether s is a clock time written "15:04".
func isClock(s string) bool {
	return len(s) == 5 && s[2] == ':' && isDigit(s[0]) && isDigit(s[1]) && isDigit(s[3]) && isDigit(s[4])
}

func isDigit(c byte) bool { return '0' <= c && c <= '9' }

// rowWords are the time words of the notes' titles inside them (see
// describeNote, noEventToday, describeMoonNote and underMinimumText) and
// what a row of the note's date says instead.
var rowWords = strings.NewReplacer(
	" today:", " on this date:",
	" tonight:", " on this date:",
	" all last night", " all the night before",
)
