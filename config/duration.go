package config

import (
	"fmt"
	"strconv"
	"strings"
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

// durationHint says how to write a duration that did not parse: the units
// are h, m and s, so a number of days or weeks ("1d", "2w") is written in
// hours.
func durationHint(s string) string {
	s = strings.TrimSpace(s)
	num := strings.TrimLeft(strings.TrimRight(s, "dDwW"), "+-")
	if n, err := strconv.ParseFloat(num, 64); err == nil && len(s) > 0 && strings.ContainsAny(s[len(s)-1:], "dDwW") {
		hours := n * 24
		if strings.ContainsAny(s[len(s)-1:], "wW") {
			hours *= 7
		}
		return fmt.Sprintf(`the units are h, m and s: write "%sh" for %s`, strconv.FormatFloat(hours, 'f', -1, 64), s)
	}
	return `write a number with a unit, e.g. "30m", "-1h15m", "2h"`
}

// MarshalText writes the duration as UnmarshalText reads it.
func (d Duration) MarshalText() ([]byte, error) { return []byte(d.String()), nil }
