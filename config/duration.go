package config

import (
	"fmt"
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
		return fmt.Errorf("malformed duration %q (write a number with a unit, e.g. \"30m\", \"-1h15m\", \"2h\")", s)
	}
	*d = Duration(v)
	return nil
}

// MarshalText writes the duration as UnmarshalText reads it.
func (d Duration) MarshalText() ([]byte, error) { return []byte(d.String()), nil }
