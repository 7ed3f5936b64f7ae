package config

import (
	"fmt"
	"time"
)

// Zone is an IANA time zone name, resolved through the tz database.
type Zone struct {
	*time.Location
}

// UnmarshalText resolves an IANA zone name such as "Europe/Vienna".
func (z *Zone) UnmarshalText(b []byte) error {
	name := string(b)
	if name == "" {
		z.Location = nil
		return nil
	}
	loc, err := time.LoadLocation(name)
	if err != nil {
		return fmt.Errorf("unknown time zone %q (use an IANA name such as \"Europe/Vienna\")", name)
	}
	z.Location = loc
	return nil
}

// MarshalText writes the zone's IANA name.
func (z Zone) MarshalText() ([]byte, error) {
	if z.Location == nil {
		return nil, nil
	}
	return []byte(z.Location.String()), nil
}
