package config

import (
	"fmt"
	"strings"
)

// distance is the Levenshtein edit distance between a and b, counted in
// bytes (names of the vocabulary are ASCII).
func distance(a, b string) int {
	if len(a) < len(b) {
		a, b = b, a
	}
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(b)]
}

// closest returns the candidate nearest to s (case-insensitive), or "" when
// none is near enough to be a plausible misspelling: at most a third of the
// longer string's length, and at least 1 edit allowed (2 for names of 6
// bytes or more).
func closest(s string, candidates []string) string {
	s = strings.ToLower(strings.TrimSpace(s))
	if s == "" || len(s) > 200 {
		return ""
	}
	best, bestD := "", -1
	for _, c := range candidates {
		d := distance(s, strings.ToLower(c))
		if bestD < 0 || d < bestD {
			best, bestD = c, d
		}
	}
	if bestD < 0 {
		return ""
	}
	limit := max(len(s), len(best)) / 3
	if limit < 1 {
		limit = 1
	}
	if len(s) >= 6 && limit < 2 {
		limit = 2
	}
	if bestD > limit {
		return ""
	}
	return best
}

// Suggest returns the candidate that s likely means, as the configuration's
// own suggestions pick it (a misspelt kind, month, zone or site id), or ""
// when none is near enough: for the command line's ids (--site, --feed).
func Suggest(s string, candidates []string) string { return closest(s, candidates) }

// didYouMean is the hint naming the value that a misspelt one likely means,
// near, as every suggestion of the configuration words it: `did you mean
// "civil"?`. Each finder picks near from its own candidates.
func didYouMean(near string) string { return fmt.Sprintf("did you mean %q?", near) }

// nearValue is the hint for a value v that is none of the values a key
// takes: the one v likely means (`did you mean "civil"?` for "Civil",
// "both" for "bothe"), else hint (what the values mean, or the values).
func nearValue(v string, values []string, hint string) string {
	if near := closest(v, values); near != "" {
		return didYouMean(near)
	}
	return hint
}
