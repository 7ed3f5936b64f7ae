package config

import "time"

// Config is a whole heliocal configuration file: deployment settings, the
// sites and the feeds computed for them.
type Config struct {
	Service Service `mapstructure:"service"`
	Page    Page    `mapstructure:"page"`
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
	// TrustedProxies are the reverse proxies (IP addresses or CIDR
	// prefixes) whose X-Forwarded-Host and X-Forwarded-Proto headers serve
	// believes when base_url is unset; empty: those headers are ignored.
	TrustedProxies []string `mapstructure:"trusted_proxies"`
	// Oversize is what publish and serve do with a feed over MaxFeedBytes:
	// "warn" (default: publish it and say so), "trim" (shorten its window
	// from the far end until it fits, and say how far it reaches) or "fail"
	// (publish exits 1 naming the feed and its size).
	Oversize string `mapstructure:"oversize"`
}

// Page is what the public page of `serve` (and the index of `publish`)
// says about the feeds.
type Page struct {
	Title   string `mapstructure:"title"`   // heading; default "Sun and Moon calendars"
	Intro   string `mapstructure:"intro"`   // a short introduction under the heading
	Contact string `mapstructure:"contact"` // a contact line at the foot
	// Caution replaces the default caution written for the public. Where a
	// feed has kinds people use under rules (sunrise, sunset, twilight), the
	// caution about legal use is shown as well.
	Caution string `mapstructure:"caution"`
	// Builder shows the calendar builder on the served page; default true.
	Builder *bool `mapstructure:"builder"`
}

// ShowBuilder reports whether the served page shows the builder.
func (p Page) ShowBuilder() bool { return p.Builder == nil || *p.Builder }

// Oversize policies (Service.Oversize).
const (
	OversizeWarn = "warn"
	OversizeTrim = "trim"
	OversizeFail = "fail"
)

// Site is a place on Earth.
type Site struct {
	ID        string  `mapstructure:"id"`
	Name      string  `mapstructure:"name"`
	Latitude  float64 `mapstructure:"latitude"`  // degrees, −90..90, north positive
	Longitude float64 `mapstructure:"longitude"` // degrees, −180..180, east positive
	Elevation float64 `mapstructure:"elevation"` // metres above sea level
	TimeZone  Zone    `mapstructure:"timezone"`  // IANA name; when absent, the zone at the coordinates (ZoneAt)
	Horizon   float64 `mapstructure:"-"`         // altitude of the visible horizon in degrees (hills), default 0
	// HorizonSet is true when the horizon is one altitude as written (the
	// horizon key, --horizon, an ad-hoc horizon=), 0 included: a written 0
	// is a level horizon at 0° (refraction at that altitude, no dip), an
	// unset one the flat horizon lowered by the dip of Elevation. In the
	// configuration's fingerprint (publish's configDigest) only for a
	// written 0, so that it is the one versions without the field computed
	// for every other file.
	HorizonSet bool `mapstructure:"-" json:",omitempty"`
	// Skyline is the horizon per direction, [azimuth, altitude] points in
	// degrees (azimuth from the north through the east), sorted by azimuth;
	// nil when the horizon is one altitude. From the file's horizon key: a
	// number (Horizon), a list of points, or the name of a CSV file of
	// points (HorizonFile).
	Skyline     [][2]float64 `mapstructure:"-"`
	HorizonFile string       `mapstructure:"-"`
	// HorizonValue is the horizon key as written; parse resolves it.
	HorizonValue any `mapstructure:"horizon"`
	// Pressure (hPa) and Temperature (°C) of the air scale the refraction
	// at rise and set; nil = not given. When only one is given the other
	// is the standard atmosphere's at Elevation (astro.StandardAtmosphere);
	// when neither is, the almanacs' standard refraction (34′) applies.
	Pressure    *float64 `mapstructure:"pressure_hpa"`
	Temperature *float64 `mapstructure:"temperature_c"`
	// ZoneInferred is true when the file gave no timezone and TimeZone was
	// taken from the coordinates: the commands say so.
	ZoneInferred bool `mapstructure:"-"`
}

// OwnHorizon reports whether rise and set at s are taken over its one
// horizon altitude, Horizon (written, 0 included, or not 0): refraction at
// that altitude and no dip. Otherwise they are over a skyline or over the
// flat horizon lowered by the dip of Elevation.
func (s *Site) OwnHorizon() bool {
	return len(s.Skyline) == 0 && (s.Horizon != 0 || s.HorizonSet)
}

// Feed is one subscribable calendar.
type Feed struct {
	ID          string     `mapstructure:"id"`
	Title       string     `mapstructure:"title"`
	Description string     `mapstructure:"description"`
	Site        string     `mapstructure:"site"`
	Kinds       []KindSpec `mapstructure:"kinds"`
	Plans       []Plan     `mapstructure:"plans"`      // entries anchored to the sky (see Plan)
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
	// Low and High replace the altitude bounds of golden-hour and
	// blue-hour in degrees (nil: the defaults, −4°..6° and −6°..−4°).
	Low  *float64 `mapstructure:"low"`
	High *float64 `mapstructure:"high"`

	// Alarm, when set, replaces the feed's alarm for this kind's timed
	// entries ("0s" for none).
	Alarm *Duration `mapstructure:"alarm"`
	// MinDuration drops spans shorter than this (span kinds only).
	MinDuration Duration `mapstructure:"min_duration"`
	// Weekdays, Months and Dates keep only the entries on these local
	// dates ("mon".."sun", "jan".."dec", "2027-06-12"); an empty list
	// keeps every date.
	Weekdays []string `mapstructure:"weekdays"`
	Months   []string `mapstructure:"months"`
	Dates    []string `mapstructure:"dates"`

	// Lighting options (kind lighting:<duration> only).
	Lamps      string `mapstructure:"lamps"`       // "evening" (default), "morning" or "both"
	Natural    string `mapstructure:"natural"`     // "sunrise-sunset" (default) or "civil"
	LatestOff  string `mapstructure:"latest_off"`  // local clock "HH:MM", optional
	EarliestOn string `mapstructure:"earliest_on"` // local clock "HH:MM", optional
}

// Plan is an entry the user writes whose dates and times the sky sets:
// "Public stargazing night, the Saturday nearest new moon, from
// astronomical dusk to 23:30".
type Plan struct {
	Title       string `mapstructure:"title"`
	Description string `mapstructure:"description"`
	// Date is the date rule (see ParseDateRule): "every friday",
	// "every 04-25", "2027-06-12", "full-moon", "saturday nearest new-moon".
	Date string `mapstructure:"date"`
	// Start and End are times (see ParseTimeSpec): an event kind with an
	// optional offset ("sunset+30m") or a local clock time ("20:00"). No
	// Start makes the plan all-day. An End before the Start is on the next day.
	Start string `mapstructure:"start"`
	End   string `mapstructure:"end"`
	// For is the length of the plan, instead of End.
	For Duration `mapstructure:"for"`
	// Months and Weekdays keep only the dates in these months and on these
	// days of the week; empty keeps every date.
	Months   []string `mapstructure:"months"`
	Weekdays []string `mapstructure:"weekdays"`
	// Alarm, when set, replaces the feed's alarm for this plan.
	Alarm *Duration `mapstructure:"alarm"`
}

// Duration is a time.Duration written in the file as "30m", "12h30m" or "-15m".
type Duration time.Duration
