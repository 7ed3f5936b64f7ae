package config

import "time"

// Config is a whole heliocal configuration file: deployment settings, the
// sites and the feeds computed for them.
type Config struct {
	Service Service `mapstructure:"service"`
	Sites   []Site  `mapstructure:"sites"`
	Feeds   []Feed  `mapstructure:"feeds"`
}

// Service holds deployment settings. Each can be overridden from the
// environment with the HELIOCAL_ prefix (HELIOCAL_LISTEN, HELIOCAL_OUT_DIR,
// HELIOCAL_REFRESH, HELIOCAL_REFRESH_ZONE, HELIOCAL_BASE_URL,
// HELIOCAL_MAX_FEED_BYTES); see EnvNames and ParseEnv.
type Service struct {
	Listen       string `mapstructure:"listen"`         // default ":8080"
	OutDir       string `mapstructure:"out_dir"`        // default "public"
	BaseURL      string `mapstructure:"base_url"`       // public URL the feeds are reached at, may be empty
	Refresh      string `mapstructure:"refresh"`        // cron expression, default "15 3 * * *"
	RefreshZone  Zone   `mapstructure:"refresh_zone"`   // zone of the cron expression, default: the server's
	MaxFeedBytes int    `mapstructure:"max_feed_bytes"` // warn above this size, default 1000000
}

// Site is a place on Earth.
type Site struct {
	ID        string  `mapstructure:"id"`
	Name      string  `mapstructure:"name"`
	Latitude  float64 `mapstructure:"latitude"`  // degrees, −90..90, north positive
	Longitude float64 `mapstructure:"longitude"` // degrees, −180..180, east positive
	Elevation float64 `mapstructure:"elevation"` // metres above sea level
	TimeZone  Zone    `mapstructure:"timezone"`  // IANA name; when absent, the zone at the coordinates (ZoneAt)
	Horizon   float64 `mapstructure:"horizon"`   // altitude of the visible horizon in degrees (hills), default 0
	// ZoneInferred is true when the file gave no timezone and TimeZone was
	// taken from the coordinates: the commands say so.
	ZoneInferred bool `mapstructure:"-"`
}

// Feed is one subscribable calendar.
type Feed struct {
	ID          string     `mapstructure:"id"`
	Title       string     `mapstructure:"title"`
	Description string     `mapstructure:"description"`
	Site        string     `mapstructure:"site"`
	Kinds       []KindSpec `mapstructure:"kinds"`
	DaysBack    int        `mapstructure:"days_back"`  // default 30
	DaysAhead   int        `mapstructure:"days_ahead"` // default 365
	Color       string     `mapstructure:"color"`      // CSS3 colour name
	Alarm       Duration   `mapstructure:"alarm"`      // display alarm before each timed event; 0 = none
	UTC         bool       `mapstructure:"utc"`        // write times in UTC instead of the site's zone
}

// KindSpec is one event kind a feed asks for, with its options. In the file it
// is either a bare kind name ("sunrise") or a mapping with a "kind" key.
type KindSpec struct {
	Kind   Kind     `mapstructure:"kind"`
	Offset Duration `mapstructure:"offset"`  // shift every event, e.g. "-30m" (30 min before)
	Label  string   `mapstructure:"label"`   // custom title replacing the default
	AllDay bool     `mapstructure:"all_day"` // show as an all-day entry on the event's local date
	// MaxIllumination applies to dark-window: the Moon counts as absent while
	// its illuminated fraction is below this (0..1); default 0 (Moon must be down).
	MaxIllumination float64 `mapstructure:"max_illumination"`
}

// Duration is a time.Duration written in the file as "30m", "12h30m" or "-15m".
type Duration time.Duration
