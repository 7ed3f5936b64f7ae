// Package feed turns a site and the event kinds a feed asks for into calendar
// entries: the event catalogue. It is pure and deterministic: the same
// configuration and window always give the same entries, with the same UIDs.
//
// Sub-packages render and deliver those entries: feed/ical writes RFC 5545
// iCalendar, feed/publish writes files atomically and feed/serve serves them
// over HTTP, refreshed on the schedule of heliocal/internal/schedule.
package feed

import (
	"path/filepath"
	"time"

	"heliocal/astro"
)

// Entry is one calendar entry: an instant (sunrise), a span (golden hour) or
// an all-day note (the Sun does not set today).
type Entry struct {
	// UID is stable across rebuilds: it is derived from the feed id, the kind,
	// the local date and the occurrence on that date, never from the computed
	// time, so a client updates the entry in place when tomorrow's rebuild
	// moves it by a second.
	UID string
	// Kind is the configured kind name, e.g. "sunrise", "golden-hour",
	// "sun-altitude:-3", "photoperiod:12h".
	Kind  string
	Title string
	// row is the title as a row of the entry's date among other dates
	// shows it (RowTitle), written with the title when it says otherwise;
	// empty when the row shows Title.
	row         string
	Description string
	// Categories are plain words for filtering, e.g. {"Sun", "Sunrise"}.
	Categories []string
	// Start is the instant (UTC) of a timed entry. For an all-day entry it is
	// the local date at 00:00 UTC (only its year, month and day count).
	Start time.Time
	// End is the end of a span (UTC); zero for an instant. For an all-day
	// entry it is the exclusive end date at 00:00 UTC (usually Start + 1 day).
	End time.Time
	// AllDay marks a date-valued entry (VALUE=DATE in iCalendar).
	AllDay bool
	// Date is the site-local calendar date the entry belongs to, at 00:00 UTC.
	Date time.Time
	// Alarm, when not nil, replaces Calendar.Alarm for this entry: the
	// reminder time before its start, 0 for none. Entries of one kinds
	// entry or plan share the pointer.
	Alarm *time.Duration
	// Facts are the values behind the entry, for listings (heliocal events
	// --feed): what the description says, as numbers.
	Facts Facts
}

// Facts are the values an entry was written from. Zero fields do not apply.
type Facts struct {
	Part        string          // "morning", "evening", "all-day", "polar-night", "behind-skyline"…
	Direction   astro.Direction // threshold crossings: rising or setting
	Note        bool            // an all-day note for a date without the event
	NextDay     bool            // plans: the end falls on the next local date
	Open        bool            // bands: not left before the window ends; End is the window's end
	State       astro.State     // notes: on which side the Sun or Moon stays
	Until       time.Time       // lighting notes: first date lamps are needed again (zero: not in the window)
	Altitude    float64         // degrees (solar noon, Moon transit)
	Azimuth     float64         // degrees from north through east (rise and set)
	Distance    float64         // au (perihelion, aphelion)
	Illuminated float64         // the Moon's illuminated fraction
	DayLength   time.Duration   // the natural day on the date
	DirectSun   bool            // DayLength is the hours of direct Sun over the site's skyline
	LongDay     bool            // a sunset that ends the midnight Sun: no day length (DayLength 0)
	Short       bool            // lighting: clipped, the target is not reached
	DayChange   time.Duration   // daily summary: change from the day before
	Lamp        time.Duration   // lighting: the lamp period's length
	Longest     time.Duration   // span notes: the date's spans are all under min_duration, the longest is this long
	Missing     string          // plans: the start event that does not happen on the date
	Eclipse     *EclipseFacts   // eclipses: the local circumstances; nil for other kinds
}

// EclipseFacts are an eclipse entry's local circumstances, as its event has
// them (see Event): one of Solar and Lunar is set.
type EclipseFacts struct {
	Solar   *astro.LocalSolarEclipse
	Lunar   *astro.LocalLunarEclipse
	Skyline bool         // the site has a skyline: Visible applies
	Visible []astro.Span // the spans with the body over the skyline
}

// Site is where a calendar's events are computed, as the feed renderers need it.
type Site struct {
	ID        string
	Name      string
	Latitude  float64 // degrees, north positive
	Longitude float64 // degrees, east positive
	Elevation float64 // metres above sea level
	Location  *time.Location
	// Horizon is the altitude of the visible horizon in degrees (hills), 0
	// for a flat one (lowered by the dip of Elevation) unless HorizonSet;
	// Skyline, when its Points are not zero, the horizon per direction
	// instead.
	Horizon float64
	// HorizonSet is true when rise and set are taken over the one altitude
	// Horizon, 0 included (a level horizon, no dip), as config.Site.OwnHorizon
	// reports it (SiteOf; not config.Site.HorizonSet, which is false for a
	// Horizon other than 0 set without it): never beside a skyline.
	HorizonSet bool
	Skyline    SkylineFacts
	// Pressure (hPa) and Temperature (°C) are the air the refraction is
	// computed for; a zero Pressure is the standard refraction.
	Pressure, Temperature float64
}

// SkylineFacts is a site's skyline (the horizon per direction) as its words
// name it (SkylineText): its lowest and highest altitudes in degrees, its
// number of points, and the base name of the CSV file it was read from, if
// any.
type SkylineFacts struct {
	Low, High float64
	Points    int
	File      string
}

// SkylineFactsOf is the facts of skyline, [azimuth, altitude] points in
// degrees read from file (a path, or "" for points written in the
// configuration); zero for no points.
func SkylineFactsOf(skyline [][2]float64, file string) SkylineFacts {
	if len(skyline) == 0 {
		return SkylineFacts{}
	}
	f := SkylineFacts{Low: skyline[0][1], High: skyline[0][1], Points: len(skyline)}
	for _, p := range skyline {
		f.Low, f.High = min(f.Low, p[1]), max(f.High, p[1])
	}
	if file != "" {
		f.File = filepath.Base(file)
	}
	return f
}

// Calendar is one feed, ready to render: its header and its entries sorted by
// Start then UID.
type Calendar struct {
	ID          string
	Title       string
	Description string
	Site        Site
	// UTC writes every timed entry in UTC ("Z") instead of the site's local
	// time with a TZID and a generated VTIMEZONE.
	UTC bool
	// Color is a CSS3 colour name (RFC 7986 COLOR), may be empty.
	Color string
	// URL is the public https URL of the .ics file (RFC 7986 SOURCE), and
	// PageURL the human page listing the feeds (RFC 7986 URL); both may be empty.
	URL     string
	PageURL string
	// Refresh is the suggested polling interval (REFRESH-INTERVAL,
	// X-PUBLISHED-TTL); zero leaves them out.
	Refresh time.Duration
	// Alarm, when positive, adds a display alarm that long before each timed entry.
	Alarm time.Duration
	// WindowStart and WindowEnd bound the entries (UTC); the generated
	// VTIMEZONE covers at least this span.
	WindowStart time.Time
	WindowEnd   time.Time
	// LastDate is the last local date of the window (00:00 UTC), as the
	// calendar was built for it (TrimmedTo is where a shortened one
	// reaches); FirstDate is the first.
	LastDate time.Time
	// Today is the local date (00:00 UTC) the window was counted from, the
	// date Options.Now is in the site's zone; zero for a calendar built
	// without Options.Now (over dates given outright).
	Today time.Time
	// Stamp is the deterministic DTSTAMP / LAST-MODIFIED: derived from the
	// inputs, never from the wall clock: the window's first local date
	// (00:00 UTC), FirstDate.
	Stamp   time.Time
	Entries []Entry
	// SharedNotes are, by the UID of a note entry written once for several
	// of the feed's kinds, the kinds it stands for beside its Kind: "No
	// civil dusk or dawn today" for civil-dawn (Kind) and civil-dusk, "the
	// Sun does not set today" for sunrise and sunset. Nil without such
	// notes.
	SharedNotes map[string][]string
	// TrimmedTo, when set, is the last local date (00:00 UTC) the entries
	// reach after the window was shortened to keep the feed under its size
	// limit.
	TrimmedTo time.Time
	// LampLimitGaps are the lighting limits of the feed that do nothing on
	// some of its dates, as Sky.Calendar found them (lampLimitGaps), which
	// its description tells of.
	LampLimitGaps []LampLimitGap
	// NotCrossed are the notes of the feed's photoperiod thresholds that no
	// date of the window crosses, as they read on the window's first date,
	// whether or not the kinds entries' months, weekdays and dates keep a
	// date for them.
	NotCrossed []KindNote
	// SkippedPlans are the plans of the feed with a date of the window
	// that the clocks skip whole (30 December 2011 in Pacific/Apia), which
	// their filters keep: a plan has no entry on a date that does not
	// exist. A weekday rule of an event ("friday nearest full-moon") takes
	// another date instead and is not among them.
	SkippedPlans []SkippedPlan

	// text is the memory of the entries' descriptions and UIDs, when the
	// catalogue made them as substrings of one buffer: Release hands it
	// back with the entries.
	text []byte
}

// FirstDate is the first local date of the window (00:00 UTC), as the
// calendar was built for it: the date it is stamped with (Stamp).
func (c *Calendar) FirstDate() time.Time { return c.Stamp }

// SkippedPlan is a plan whose dates Dates (00:00 UTC, ascending) the
// clocks of the site's zone skip whole: Title and Date are the plan's
// title and date rule as written.
type SkippedPlan struct {
	Title, Date string
	Dates       []time.Time
}

// KindNote is a note of a kind as a feed words it: the kind, as in the
// configuration, and the note's title.
type KindNote struct {
	Kind, Title string
}
