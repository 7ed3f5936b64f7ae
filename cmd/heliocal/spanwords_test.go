package main

import (
	"regexp"
	"strings"
	"testing"
)

// The table names a golden or blue hour's span in the words of the feed's
// title for it (feed.SpanWords), one source for both: a night span at
// 78.2° N on 9 April 2026 is "around midnight" in both, not "evening and
// morning in one"; a span through noon of a Sun that does not rise (1
// November 2026) is twilight glow in both. The same query's iCalendar
// (--format ics) has the feed's titles. The spans are those of the feed
// package's TestMergedBandSpans (PyEphem 4.1: lower transit 2026-04-09
// 22:59 UT at −3.9481°, upper transits 2026-10-20 10:42 UT at +1.3720° and
// 2026-11-01 10:41 UT at −2.7057°).
func TestTableSpanWordsAsFeed(t *testing.T) {
	summary := regexp.MustCompile(`(?m)^SUMMARY:(?:Golden|Blue) hour \(([^)]*)\)`)
	for _, c := range []struct {
		day   string
		words []string // of the feed's titles, in order
		says  string   // the table's words with the altitude
	}{
		{"2026-04-09", []string{"around midnight", "morning", "around midnight"}, "around midnight, Sun at least -3.95°"},
		{"2026-10-20", []string{"morning", "morning and evening in one", "evening"}, "morning and evening in one, Sun at most 1.37°"},
		{"2026-11-01", []string{"morning", "twilight glow, Sun below the horizon", "evening"}, "twilight glow, Sun below the horizon, Sun at most -2.71°"},
	} {
		args := []string{"events", "--lat", "78.2", "--lon", "15.6", "--tz", "Arctic/Longyearbyen",
			"--from", c.day, "--to", c.day, "--kinds", "golden-hour,blue-hour"}
		code, table, errOut := runCLI(t, args...)
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", c.day, code, errOut)
		}
		code, ics, errOut := runCLI(t, append(args, "--format", "ics")...)
		if code != 0 {
			t.Fatalf("%s --format ics: exit %d: %s", c.day, code, errOut)
		}
		var words []string
		for _, m := range summary.FindAllStringSubmatch(ics, -1) {
			words = append(words, strings.ReplaceAll(m[1], `\,`, ",")) // as RFC 5545 escapes it
		}
		if strings.Join(words, "|") != strings.Join(c.words, "|") {
			t.Errorf("%s: the feed's titles say %q, want %q", c.day, words, c.words)
		}
		for _, w := range words {
			if !strings.Contains(table, ", "+w) {
				t.Errorf("%s: the table lacks the feed's words %q:\n%s", c.day, w, table)
			}
		}
		if !strings.Contains(table, c.says) {
			t.Errorf("%s: the table lacks %q:\n%s", c.day, c.says, table)
		}
		if strings.Contains(table, "evening and morning in one") {
			t.Errorf("%s: the table has words of its own:\n%s", c.day, table)
		}
	}
}
