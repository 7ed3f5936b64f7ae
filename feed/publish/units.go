package publish

import "strings"

// KeepUnits joins the amounts of a text of the HTML pages (this package's
// index page; feed/serve's page /at) with no-break spaces (U+00A0), so that
// a narrow screen does not put "16" at the end of one line and "h" on the
// next; the feeds, JSON and CSV keep their plain spaces. feed/serve's
// builder.js has its twin for the builder's preview, written as the two
// regular expressions these scans follow.
func KeepUnits(s string) string {
	if !strings.Contains(s, " ") {
		return s
	}
	return joinSpaces(joinSpaces(s, unitSpace), hourMinute)
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

func isDigit(c byte) bool { return '0' <= c && c <= '9' }

// isWordByte is a byte of a word as `\b` reads it: an ASCII letter, digit
// or underscore.
func isWordByte(c byte) bool {
	return isDigit(c) || 'a' <= c && c <= 'z' || 'A' <= c && c <= 'Z' || c == '_'
}
