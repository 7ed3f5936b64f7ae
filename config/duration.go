package config

import (
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"
	"sync"
	"time"
)

// D returns the duration as a time.Duration.
func (d Duration) D() time.Duration { return time.Duration(d) }

// String writes the duration compactly: "30m", "-1h15m", "0s".
func (d Duration) String() string { return ShortDuration(time.Duration(d)) }

// UnmarshalText parses Go duration syntax with units: "30m", "-1h15m",
// "90s". A bare number is refused: its unit would be a guess.
func (d *Duration) UnmarshalText(b []byte) error {
	s := string(b)
	v, err := time.ParseDuration(s)
	if err != nil {
		return fmt.Errorf("malformed duration %q (%s)", s, durationHint(s))
	}
	*d = Duration(v)
	return nil
}

// DurationHint says how to write a duration that did not parse, as the
// configuration's durations are told: an ad-hoc feed's alarm and offsets
// take their hints from here.
func DurationHint(s string) string { return durationHint(s) }

// durationHint says how to write a duration that did not parse: the units
// are h, m and s, so a number of days or weeks ("1d", "2w") is written in
// hours, and a number alone needs one ("30": "30m" or "30h").
func durationHint(s string) string {
	s = strings.TrimSpace(s)
	if n, err := strconv.ParseFloat(s, 64); err == nil && strings.Trim(s, "+-.0123456789") == "" {
		if math.Abs(n) > MaxOffset.Hours() { // beyond an offset's 12h: minutes, as for a number unquoted
			return fmt.Sprintf(`a duration needs a unit: write "%sm" for minutes`, s)
		}
		return fmt.Sprintf(`a duration needs a unit: write "%sm" for minutes or "%sh" for hours`, s, s)
	}
	num := strings.TrimLeft(strings.TrimRight(s, "dDwW"), "+-")
	if n, err := strconv.ParseFloat(num, 64); err == nil && len(s) > 0 && strings.ContainsAny(s[len(s)-1:], "dDwW") {
		hours := n * 24
		if strings.ContainsAny(s[len(s)-1:], "wW") {
			hours *= 7
		}
		return fmt.Sprintf(`the units are h, m and s: write "%sh" for %s`, strconv.FormatFloat(hours, 'f', -1, 64), s)
	}
	if m := clockDuration().FindStringSubmatch(s); m != nil { // 1:30, as a clock is read
		var b strings.Builder
		b.WriteString(m[1])
		for i, unit := range []string{"h", "m", "s"} {
			if n, _ := strconv.Atoi(m[i+2]); n > 0 {
				b.WriteString(strconv.Itoa(n) + unit)
			}
		}
		if w := b.String(); strings.TrimLeft(w, "+-") != "" {
			return fmt.Sprintf(`the units are h, m and s: write "%s" for %s`, w, s)
		}
	}
	if w := strings.Join(strings.Fields(s), ""); w != s && isBareDuration(w) { // 1h 30m
		return fmt.Sprintf(`write it without spaces: "%s"`, w)
	}
	if strings.HasSuffix(strings.TrimRight(s, "0123456789"), "h") && isBareDuration(s+"m") { // 1h30: the minutes' unit left out
		return fmt.Sprintf(`the minutes need their unit too: write "%sm"`, s)
	}
	if m := wordDuration().FindStringSubmatch(s); m != nil { // 30 min, 2 hours
		return fmt.Sprintf(`the units are h, m and s: write "%s%s" for %s`, m[1], strings.ToLower(m[2][:1]), s)
	}
	return `write a number with a unit, e.g. "30m", "-1h15m", "2h"`
}

// clockDuration is a duration written as a clock reads: hours, minutes and
// maybe seconds ("1:30", "-0:45", "0:01:30").
var clockDuration = sync.OnceValue(func() *regexp.Regexp {
	return regexp.MustCompile(`^([+-]?)([0-9]{1,3}):([0-5][0-9])(?::([0-5][0-9]))?$`)
})

// wordDuration is a number with its unit in a word ("30 min", "-2 hours",
// "90 seconds").
var wordDuration = sync.OnceValue(func() *regexp.Regexp {
	return regexp.MustCompile(`^([+-]?[0-9]+(?:\.[0-9]+)?) ?((?i:hours?|hrs?|minutes?|mins?|seconds?|secs?))$`)
})

// MarshalText writes the duration as UnmarshalText reads it.
func (d Duration) MarshalText() ([]byte, error) { return []byte(d.String()), nil }
