package config

import "time"

// Kind is one event kind of the configuration vocabulary, parsed from its
// written form: "sunrise", "sun-altitude:-3.5", "photoperiod:12h30m".
type Kind struct {
	// Name is the base name, e.g. "sunrise", "sun-altitude", "photoperiod".
	Name string
	// Altitude is the threshold in degrees for "sun-altitude:<deg>".
	Altitude float64
	// DayLength is the threshold for "photoperiod:<duration>".
	DayLength time.Duration
}
