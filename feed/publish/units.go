package publish

import "strings"

// KeepUnits joins the amounts and the dates of a text of the HTML pages
// (this package's index page; feed/serve's page /at) with no-break spaces
// (U+00A0), so that a narrow screen does not put "16" at the end of one
// line and "h" on the next, nor "21" and "Jun" of a date; the feeds, JSON
// and CSV keep their plain spaces. feed/serve's builder.js has its twin for
// the builder's preview, written as the four regular expressions these
// scans follow.
func KeepUnits(s string) string {
	if !strings.Contains(s, " ") {
		return s
	}
	return joinSpaces(joinSpaces(s, unitSpace), afterUnits)
}

// afterUnits is the space that hourMinute, dayMonth or monthYear joins, in
// one scan once unitSpace has joined the amounts (hourMinute reads its
// no-break spaces; the dates' tests read no space of another).
func afterUnits(s string, i int) bool {
	return hourMinute(s, i) || dayMonth(s, i) || monthYear(s, i)
}

// joinSpaces is s with each space for which joins(s, i) holds, i its
// index, made a no-break space; s itself when there is none.
func joinSpaces(s string, joins func(s string, i int) bool) string {
	var b strings.Builder
	done := 0 // s[:done] is in b
	for i := strings.IndexByte(s, ' '); i >= 0; {
		if joins(s, i) {
			if done == 0 {
				b.Grow(len(s) + 8)
			}
			b.WriteString(s[done:i])
			b.WriteString("\u00a0")
			done = i + 1
		}
		j := strings.IndexByte(s[i+1:], ' ')
		if j < 0 {
			break
		}
		i += 1 + j
	}
	if done == 0 {
		return s
	}
	b.WriteString(s[done:])
	return b.String()
}

// units are the units unitSpace joins to their number.
var units = []string{"h", "min", "s", "day", "days", "km", "m"}

// unitSpace is the space between a number and its unit ("16 h", "45 min",
// "+1 day", "240 m"): `(\d) (h|min|s|days?|k?m)\b`.
func unitSpace(s string, i int) bool {
	if i == 0 || !isDigit(s[i-1]) {
		return false
	}
	rest := s[i+1:]
	for _, u := range units {
		if strings.HasPrefix(rest, u) && (len(rest) == len(u) || !isWordByte(rest[len(u)])) {
			return true
		}
	}
	return false
}

// hourMinute is the space between the hours and the minutes of one length
// once unitSpace has joined them to their numbers ("9\u00a0h 05\u00a0min"):
// `(\d\u00a0h) (\d+\u00a0min)`.
func hourMinute(s string, i int) bool {
	const hours = "\u00a0h"
	if i < len(hours)+1 || s[i-len(hours):i] != hours || !isDigit(s[i-len(hours)-1]) {
		return false
	}
	j := i + 1
	for j < len(s) && isDigit(s[j]) {
		j++
	}
	return j > i+1 && strings.HasPrefix(s[j:], "\u00a0min")
}

// monthNames are the names of the months, whole and shortened, that dayMonth
// and monthYear join to their day and year.
var monthNames = []string{"January", "February", "March", "April", "May", "June", "July", "August", "September",
	"October", "November", "December", "Jan", "Feb", "Mar", "Apr", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"}

// monthAt is the length of the month's name s starts with, followed by
// no letter or digit; 0 when there is none.
func monthAt(s string) int {
	for _, m := range monthNames {
		if strings.HasPrefix(s, m) && (len(s) == len(m) || !isWordByte(s[len(m)])) {
			return len(m)
		}
	}
	return 0
}

// dayMonth is the space between a date's day and its month ("21 Jun",
// "5 December"): `(\d) (Month)\b`, Month one of monthNames.
func dayMonth(s string, i int) bool {
	return i > 0 && isDigit(s[i-1]) && monthAt(s[i+1:]) > 0
}

// monthYear is the space between a date's month and its year ("Dec 2026"):
// `\b(Month) (\d{4})\b`.
func monthYear(s string, i int) bool {
	if i+5 > len(s) || !isDigit(s[i+1]) || !isDigit(s[i+2]) || !isDigit(s[i+3]) || !isDigit(s[i+4]) || i+5 < len(s) && isWordByte(s[i+5]) {
		return false
	}
	for _, m := range monthNames {
		if j := i - len(m); j >= 0 && s[j:i] == m && (j == 0 || !isWordByte(s[j-1])) {
			return true
		}
	}
	return false
}

func isDigit(c byte) bool { return '0' <= c && c <= '9' }

// isWordByte is a byte of a word as `\b` reads it: an ASCII letter, digit
// or underscore.
func isWordByte(c byte) bool {
	return isDigit(c) || 'a' <= c && c <= 'z' || 'A' <= c && c <= 'Z' || c == '_'
}
