package config

import (
	"fmt"
	"strconv"
	"strings"
	"time"
)

// dateForm is the hint for text that is no date at all.
const dateForm = "write YYYY-MM-DD, e.g. 2027-06-12"

// parseDate reads a date as every date of the file is written, in YAML,
// TOML and JSON alike: YYYY-MM-DD, four digits of the year, two of the
// month and two of the day, a date the Gregorian calendar has. Anything
// else is a "not a date" *RuleError whose hint says how to write it
// (DateHint).
func parseDate(s string) (time.Time, *RuleError) {
	t := strings.TrimSpace(s)
	d, err := time.Parse(time.DateOnly, t)
	if err != nil {
		return time.Time{}, &RuleError{Msg: "not a date", Hint: DateHint(t)}
	}
	return d, nil
}

// DateHint says how to write the date s, which time.DateOnly refused:
// "write it 2027-06-12" for a date of one-digit month or day ("2027-6-12")
// or other separators ("2027/06/12"), "write the year in full: 2027-06-12"
// for a two-digit year ("27-06-12": a feed's window is around today, so
// the year is 20YY), the days of the month for a day it does not have
// ("2027-02-30": February 2027 has 28 days), and the form for the rest.
// A date with a time of day ("2027-06-12T10:00:00Z", as YAML's and TOML's
// timestamps are written) gets "write it 2027-06-12".
// The configuration's dates and the command line's give the same hint.
func DateHint(s string) string {
	if n := len(time.DateOnly); len(s) > n && (isDateTime(s) || s[n] == ' ') {
		if d, err := time.Parse(time.DateOnly, s[:n]); err == nil {
			return "write it " + d.Format(time.DateOnly)
		}
	}
	parts := strings.FieldsFunc(s, func(r rune) bool { return r == '-' || r == '/' || r == '.' })
	if len(parts) != 3 || len(parts[0])+len(parts[1])+len(parts[2])+2 != len(s) {
		return dateForm
	}
	var n [3]int
	for i, p := range parts {
		v, err := strconv.Atoi(p)
		if err != nil || v < 0 || strings.ContainsAny(p, "+-") {
			return dateForm
		}
		n[i] = v
	}
	year, month, day := n[0], n[1], n[2]
	switch {
	case len(parts[2]) == 4 && len(parts[0]) <= 2 && len(parts[1]) <= 2:
		return yearLastHint(s, n[0], n[1], n[2])
	case len(parts[2]) == 4 && len(parts[0]) <= 2:
		return "write YYYY-MM-DD, the year first, e.g. 2027-06-12"
	case strings.Count(s, ".") == 2 && len(parts[0]) <= 2 && len(parts[1]) <= 2 && len(parts[2]) == 2 && validDate(2000+n[2], n[1], n[0]):
		// 12.06.27, day.month.year as in Europe, or a year first
		d := time.Date(2000+n[2], time.Month(n[1]), n[0], 0, 0, 0, 0, time.UTC)
		if len(parts[0]) == 2 && validDate(2000+n[0], n[1], n[2]) && n[0] != n[2] {
			return fmt.Sprintf("write YYYY-MM-DD, the year in full: %s for %s, %04d-%02d-%02d for %d %s %d",
				d.Format(time.DateOnly), d.Format("2 January 2006"), 2000+n[0], n[1], n[2], n[2], time.Month(n[1]), 2000+n[0])
		}
		return d.Format("2 January 2006") + ": write it " + d.Format(time.DateOnly)
	case len(parts[0]) == 2:
		year += 2000
	case len(parts[0]) != 4 || len(parts[1]) > 2 || len(parts[2]) > 2:
		return dateForm
	}
	if month < 1 || month > 12 {
		return "a month is 01..12: " + dateForm
	}
	if last := daysIn(time.Month(month), year); day < 1 || day > last {
		return fmt.Sprintf("%s %d has %d days", time.Month(month), year, last)
	}
	if len(parts[0]) == 2 {
		return fmt.Sprintf("write the year in full: %04d-%02d-%02d", year, month, day)
	}
	return fmt.Sprintf("write it %04d-%02d-%02d", year, month, day)
}

// yearLastHint says how to write s, a date written with its year last,
// a and b its first two numbers: with dots it is day.month.year, as
// German, Swiss and other European dates are written ("12.06.2027": "12
// June 2027: write it 2027-06-12"); with - or / it is that too when a is
// no month (a > 12), month-day-year when b is no month, and when both
// may be months both readings are given to choose from.
func yearLastHint(s string, a, b, year int) string {
	const form = "write YYYY-MM-DD, the year first"
	spell := func(m, d int) string {
		return fmt.Sprintf("%d %s %d: write it %04d-%02d-%02d", d, time.Month(m), year, year, m, d)
	}
	dmy, mdy := validDate(year, b, a), validDate(year, a, b)
	sep := s[strings.IndexAny(s, "-/.")]
	switch {
	case strings.Count(s, string(sep)) != 2: // "12.06-2027"
	case sep == '.' && dmy:
		return spell(b, a)
	case sep == '.' && b >= 1 && b <= 12:
		return fmt.Sprintf("%s %d has %d days", time.Month(b), year, daysIn(time.Month(b), year))
	case sep == '.':
		return "a month is 01..12: " + form + ", e.g. 2027-06-12"
	case dmy && mdy && a != b:
		return fmt.Sprintf("%s: %04d-%02d-%02d for %d %s, %04d-%02d-%02d for %d %s",
			form, year, b, a, a, time.Month(b), year, a, b, b, time.Month(a))
	case dmy:
		return spell(b, a)
	case mdy:
		return spell(a, b)
	}
	return form + ", e.g. 2027-06-12"
}

// validDate reports whether year, month m and day d are a date of the
// Gregorian calendar.
func validDate(year, m, d int) bool {
	return m >= 1 && m <= 12 && d >= 1 && d <= daysIn(time.Month(m), year)
}

// daysIn is the number of days of month m of year y (Gregorian calendar).
func daysIn(m time.Month, y int) int {
	return time.Date(y, m+1, 0, 0, 0, 0, 0, time.UTC).Day()
}

// isDateLike reports whether s is written as a date, three groups of
// digits joined by '-', '/' or '.' ("2027-6-12", "27-06-12"), rather than
// as words: a plan's date rule of one such word is a date, whatever is
// wrong with it, and not a kind.
func isDateLike(s string) bool {
	groups, digits := 1, 0
	for i := 0; i < len(s); i++ {
		switch c := s[i]; {
		case c >= '0' && c <= '9':
			digits++
		case (c == '-' || c == '/' || c == '.') && digits > 0 && i+1 < len(s):
			groups, digits = groups+1, 0
		default:
			return false
		}
	}
	return groups == 3 && digits > 0
}

// isDateTime reports whether s is a date followed by a time of day, as
// YAML and TOML write their timestamps ("2027-06-12T10:00:00Z", lower case
// too).
func isDateTime(s string) bool {
	n := len(time.DateOnly)
	return len(s) > n && (s[n] == 'T' || s[n] == 't') && isDateLike(s[:n])
}

// monthDay reads a date of the year written as two groups of one or two
// digits joined by '-' ("06-12", "6-12", "13-01"), whether or not it is a
// date of the year, and returns its month and day.
func monthDay(s string) (month, day int, ok bool) {
	m, d, found := strings.Cut(s, "-")
	if !found || len(m) < 1 || len(m) > 2 || len(d) < 1 || len(d) > 2 || strings.Trim(m+d, "0123456789") != "" {
		return 0, 0, false
	}
	month, _ = strconv.Atoi(m)
	day, _ = strconv.Atoi(d)
	return month, day, true
}
