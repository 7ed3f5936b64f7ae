package main

import (
	"context"
	"fmt"
	"math"
	"runtime/debug"
	"sort"
	"strconv"
	"strings"
	"time"

	"github.com/spf13/cobra"

	"heliocal/astro"
	"heliocal/config"
	"heliocal/feed"
	"heliocal/internal/stopped"
)

const defaultKinds = "sunrise,sunset,solar-noon,civil-dawn,civil-dusk"

type eventsOptions struct {
	site      string
	feed      string
	feedSpecs []config.KindSpec // the kinds of --feed
	kindsSet  bool              // --kinds given
	lat, lon  float64
	elev      float64
	horizon   string // a number, azimuth:altitude points, or a CSV file name
	tz        string
	from, to  string
	kinds     string
	format    string
	maxLit    float64
	placeFlag bool // --lat or --lon given
	// placeOnly is the first of --elev, --horizon, --pressure and
	// --temperature given, as written ("--elev 500"): they describe a place
	// given by --lat and --lon, and are refused with --site and --feed,
	// whose site has its own in the configuration
	placeOnly string
	latGiven  bool
	// --pressure and --temperature, nil when not given
	pressure, temperature   *float64
	pressureV, temperatureV float64
	lonGiven                bool
	now                     time.Time
}

func newEventsCommand(g *globals) *cobra.Command {
	o := &eventsOptions{}
	cmd := &cobra.Command{
		Use:   "events",
		Short: "List the events of chosen kinds for a site or any place",
		Long: `List the events of chosen kinds for a configured site (--site) or for any place
(--lat and --lon, both required, optionally --tz, --elev, --horizon, --pressure and --temperature), for the local dates
--from..--to (inclusive, in the place's time zone). Without --tz the zone in force at the
place is taken from an offline map of the zone boundaries (the nautical zone Etc/GMT±N at
sea), and a note on stderr names it.

` + kindsHelpMark + `

Parametrised kinds: sun-altitude:<degrees> (e.g. sun-altitude:-3), sun-band:<low>..<high>
(degrees, e.g. sun-band:20..35), photoperiod:<duration> (e.g. photoperiod:12h30m),
lighting:<duration> (e.g. lighting:16h).

With --feed ID, the entries of a configured feed exactly as the feed has them (its kinds
with their options, plans, lighting, notes and titles), over the feed's window unless
--from/--to are given.

Formats: table (local times, readable), json (UTC instants, RFC 3339 with milliseconds),
csv (both; local times with a numeric offset), ics (an iCalendar file: with --feed the same
bytes as the published feed for the same window).` + exitStatusHelp,
		Example: `  heliocal events --lat 48.2 --lon 16.4 --elev 180 --tz Europe/Vienna --from 2027-01-01 --to 2027-01-07
  heliocal events --site cairnmoor --kinds dark-window,moon-phases --format json
  heliocal events --feed fernhollow-lamps --from 2027-01-01 --to 2027-01-31 --format csv`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			o.latGiven, o.lonGiven = cmd.Flags().Changed("lat"), cmd.Flags().Changed("lon")
			o.placeFlag = o.latGiven || o.lonGiven
			if cmd.Flags().Changed("pressure") {
				o.pressure = &o.pressureV
			}
			if cmd.Flags().Changed("temperature") {
				o.temperature = &o.temperatureV
			}
			for _, name := range []string{"elev", "horizon", "pressure", "temperature"} {
				if fl := cmd.Flags().Lookup(name); fl.Changed {
					o.placeOnly = "--" + name + " " + fl.Value.String()
					break
				}
			}
			o.kindsSet = cmd.Flags().Changed("kinds")
			o.now = time.Now()
			if err := checkEventsFlags(o); err != nil {
				return err
			}
			var err error
			if o.feed != "" && !o.kindsSet {
				err = runEventsFeed(cmd.Context(), g, o)
			} else {
				err = runEvents(cmd.Context(), g, o)
			}
			return eventsStopped(cmd.Context(), err)
		},
	}
	f := cmd.Flags()
	f.StringVar(&o.site, "site", "", "id of a configured site")
	f.StringVar(&o.feed, "feed", "", "id of a configured feed: list its entries as the feed has them, over its window unless --from/--to are given; with --kinds, those kinds at its site")
	f.Float64Var(&o.lat, "lat", 0, "latitude in degrees, north positive (−90..90)")
	f.Float64Var(&o.lon, "lon", 0, "longitude in degrees, east positive (−180..180)")
	f.Float64Var(&o.elev, "elev", 0, "elevation in metres above sea level")
	f.StringVar(&o.horizon, "horizon", "", "altitude of the visible horizon in degrees (hills; 0 is a level horizon, without the dip of --elev an unset one has), or a skyline: points azimuth:altitude, e.g. 0:2,90:8,180:1, or a CSV file of them")
	f.Float64Var(&o.pressureV, "pressure", 0, "air pressure at the place in hPa, for refraction (default: standard refraction)")
	f.Float64Var(&o.temperatureV, "temperature", 0, "air temperature at the place in °C, for refraction (default: standard refraction)")
	f.StringVar(&o.tz, "tz", "", "IANA time zone of the place, e.g. Europe/Vienna (default: the zone in force at --lat/--lon)")
	f.StringVar(&o.from, "from", "", "first local date, YYYY-MM-DD (default today)")
	f.StringVar(&o.to, "to", "", "last local date, YYYY-MM-DD, inclusive (default from + 6 days)")
	f.StringVar(&o.kinds, "kinds", defaultKinds, "comma-separated event kinds")
	f.StringVarP(&o.format, "format", "f", "table", "output format: table, json, csv or ics")
	f.Float64Var(&o.maxLit, "max-illumination", 0, "dark-window: the Moon may be up while less than this fraction is lit (0..1)")
	_ = cmd.RegisterFlagCompletionFunc("format", cobra.FixedCompletions([]string{"table", "json", "csv", "ics"}, cobra.ShellCompDirectiveNoFileComp))
	_ = cmd.RegisterFlagCompletionFunc("kinds", completeKinds)
	_ = cmd.RegisterFlagCompletionFunc("site", completeFromConfig(g, siteIDs))
	_ = cmd.RegisterFlagCompletionFunc("feed", completeFromConfig(g, feedIDs))
	_ = cmd.RegisterFlagCompletionFunc("tz", completeZones)
	for _, name := range []string{"from", "to", "lat", "lon", "elev", "pressure", "temperature", "max-illumination"} {
		_ = cmd.RegisterFlagCompletionFunc(name, cobra.NoFileCompletions) // a date or a number, never a file's name
	}
	return cmd
}

// checkEventsFlags checks the flags whose values stand alone, before
// anything is looked up (the configuration, the zone at a place) or
// printed: a bad one is the only message.
func checkEventsFlags(o *eventsOptions) error {
	switch o.format {
	case "table", "json", "csv", "ics":
	default:
		return badInput("--format: %q: use table, json, csv or ics", o.format)
	}
	if math.IsNaN(o.maxLit) || o.maxLit < 0 || o.maxLit > 1 {
		return badInput("--max-illumination: %v: must be within 0..1 (%s)", o.maxLit, config.IlluminationHint(strconv.FormatFloat(o.maxLit, 'g', -1, 64)))
	}
	if o.feed == "" || o.kindsSet { // runEvents parses them again, after the place and its zone note
		if _, err := parseKinds(o.kinds); err != nil {
			return err
		}
	}
	return nil
}

// eventsPlace resolves the site the events are computed for.
func eventsPlace(g *globals, o *eventsOptions) (*config.Site, error) {
	if o.feed != "" {
		return feedPlace(g, o)
	}
	if o.site != "" {
		if o.placeFlag || o.tz != "" {
			return nil, badInput("--site %q: give either --site or --lat/--lon/--tz, not both", o.site)
		}
		if o.placeOnly != "" {
			return nil, placeOnlyError(o.placeOnly, "--site", o.site)
		}
		cfg, _, err := loadConfig(g)
		if err != nil {
			return nil, err
		}
		for i := range cfg.Sites {
			if cfg.Sites[i].ID == o.site {
				return &cfg.Sites[i], nil
			}
		}
		ids, names := make([]string, len(cfg.Sites)), make([]string, len(cfg.Sites))
		for i, s := range cfg.Sites {
			ids[i], names[i] = s.ID, s.Name
		}
		return nil, noSuchID("--site", "site", o.site, ids, names, "name")
	}
	switch {
	case !o.latGiven && !o.lonGiven:
		return nil, badInput("give a place: --site ID, or --lat and --lon (and --tz, else the zone at the place is used)")
	case !o.latGiven:
		return nil, badInput("--lat: missing: give both --lat and --lon (--lon %v was given)", o.lon)
	case !o.lonGiven:
		return nil, badInput("--lon: missing: give both --lat and --lon (--lat %v was given)", o.lat)
	}
	s := &config.Site{ID: "place", Latitude: o.lat, Longitude: o.lon, Elevation: o.elev,
		Pressure: o.pressure, Temperature: o.temperature}
	if o.horizon != "" {
		if err := s.HorizonFromText("--horizon", o.horizon); err != nil {
			return nil, badInput("%v", err)
		}
	}
	switch {
	case math.IsNaN(o.lat) || o.lat < -90 || o.lat > 90:
		return nil, badInput("--lat: %v: must be within -90..90 (%s)", o.lat, config.LatitudeText)
	case math.IsNaN(o.lon) || o.lon < -180 || o.lon > 180:
		return nil, badInput("--lon: %v: must be within -180..180 (%s)", o.lon, config.LongitudeHint(o.lon))
	case !(o.elev >= config.MinElevation && o.elev <= config.MaxElevation):
		return nil, badInput("--elev: %v: must be within %g..%g metres (%s)", o.elev, config.MinElevation, config.MaxElevation, config.ElevationHint(o.elev))
	case o.pressure != nil && !(*o.pressure >= config.MinPressure && *o.pressure <= config.MaxPressure):
		return nil, badInput("--pressure: %v: must be within %g..%g hPa (the air pressure at the place)", *o.pressure, config.MinPressure, config.MaxPressure)
	case o.temperature != nil && !(*o.temperature >= config.MinTemperature && *o.temperature <= config.MaxTemperature):
		return nil, badInput("--temperature: %v: must be within %g..%g °C (%s)", *o.temperature, config.MinTemperature, config.MaxTemperature, config.TemperatureHint(*o.temperature))
	}
	if o.tz == "" {
		z, err := config.ZoneLocationAt(o.lat, o.lon)
		if err != nil {
			return nil, fmt.Errorf("--tz not given, and the zone at the place could not be found: %w", err)
		}
		s.TimeZone, s.ZoneInferred = z, true
	} else if err := s.TimeZone.UnmarshalText([]byte(o.tz)); err != nil {
		if ze, ok := err.(*config.ZoneError); ok { // the zone at the place, as a site's is told
			ze.Hint = config.ZoneHintAt(o.tz, o.lat, o.lon, "--tz")
		}
		return nil, badInput("--tz: %w", err)
	}
	s.Name = feed.CoordsName(o.lat, o.lon)
	return s, nil
}

// placeOnlyError refuses flag, one of --elev, --horizon, --pressure and
// --temperature as written ("--elev 500"), beside --site or --feed (by, its
// value id): the site's elevation, horizon and air come from the
// configuration, and a flag that changed nothing would go unnoticed.
func placeOnlyError(flag, by, id string) error {
	whose := "the site's"
	if by == "--feed" {
		whose = "its site's"
	}
	return badInput("%s: only for a place given by --lat and --lon; %s %q takes %s elevation, horizon, pressure and temperature from the configuration", flag, by, id, whose)
}

// feedPlace resolves --feed: the feed's site, and its kinds for runEvents.
func feedPlace(g *globals, o *eventsOptions) (*config.Site, error) {
	if o.site != "" || o.placeFlag || o.tz != "" {
		return nil, badInput("--feed %q: give either --feed, --site or --lat/--lon/--tz", o.feed)
	}
	if o.placeOnly != "" {
		return nil, placeOnlyError(o.placeOnly, "--feed", o.feed)
	}
	cfg, _, err := loadConfig(g)
	if err != nil {
		return nil, err
	}
	f, ok := cfg.Feed(o.feed)
	if !ok {
		return nil, noSuchFeed(cfg, o.feed)
	}
	for _, k := range f.Kinds {
		if k.Kind.Name != "daily-summary" { // a feed entry made of other kinds, not an event
			o.feedSpecs = append(o.feedSpecs, k)
		}
	}
	for i := range cfg.Sites {
		if cfg.Sites[i].ID == f.Site {
			return &cfg.Sites[i], nil
		}
	}
	return nil, fmt.Errorf("feed %q: site %q not found", f.ID, f.Site) // Validate prevents this
}

// parseDate reads a calendar date. It is read as a date, not as the local
// midnight that starts it: where the clocks skip midnight (America/Havana,
// America/Santiago) that midnight does not exist and would fall on the day
// before.
func parseDate(flag, v string) (time.Time, error) {
	d, err := time.Parse(time.DateOnly, v)
	if err != nil {
		return time.Time{}, badInput("%s: %q: not a date (%s)", flag, v, config.DateHint(strings.TrimSpace(v)))
	}
	return d, nil
}

// parseKinds reads --kinds. A kind given twice, itself or within a group
// ("seasons", "moon-phases"), is refused as a feed's kinds are: its events
// would be listed twice.
func parseKinds(list string) ([]config.Kind, error) {
	var kinds []config.Kind
	var specs []config.KindSpec
	for _, name := range strings.Split(list, ",") {
		name = strings.TrimSpace(name)
		if name == "" {
			continue
		}
		k, err := config.ParseKind(name)
		if err != nil {
			return nil, badInput("--kinds: %w", err)
		}
		kinds, specs = append(kinds, k), append(specs, config.KindSpec{Kind: k})
	}
	if twice := config.KindsTwice(specs); len(twice) > 0 {
		t := twice[0]
		return nil, badInput("%w", config.FieldError{Path: "--kinds", Value: list, Msg: t.Msg(nil), Hint: t.Hint(false)})
	}
	if len(kinds) == 0 {
		return nil, badInput("--kinds: %q: give at least one kind", list)
	}
	return kinds, nil
}

// eventsStopped is err, or for a listing stopped by SIGINT or SIGTERM (its
// context cancelled) one line that says so, whatever step the signal came
// at ("feed \"events\": sunrise: context canceled" told a script nothing):
// the chunks written before it are on standard output, cut short.
func eventsStopped(ctx context.Context, err error) error {
	if !stopped.By(ctx, err) {
		return err
	}
	return fmt.Errorf("events: stopped before the listing was complete: %w; what was written to standard output is cut short", ctx.Err())
}

// noSuchFeed refuses --feed v, the id of no configured feed (noSuchID: by
// its title, the feed it names).
func noSuchFeed(cfg *config.Config, v string) error {
	ids, titles := make([]string, len(cfg.Feeds)), make([]string, len(cfg.Feeds))
	for i, f := range cfg.Feeds {
		ids[i], titles[i] = f.ID, f.Title
	}
	return noSuchID("--feed", "feed", v, ids, titles, "title")
}

func runEvents(ctx context.Context, g *globals, o *eventsOptions) error {
	site, err := eventsPlace(g, o)
	if err != nil {
		return err
	}
	loc := site.TimeZone.Location
	today := o.now.In(loc)
	from := time.Date(today.Year(), today.Month(), today.Day(), 0, 0, 0, 0, time.UTC)
	if o.from != "" {
		if from, err = parseDate("--from", o.from); err != nil {
			return err
		}
	}
	to := from.AddDate(0, 0, 6)
	if o.to != "" {
		if to, err = parseDate("--to", o.to); err != nil {
			return err
		}
	}
	toDefault := ""
	if o.to == "" {
		toDefault = "--from + 6 days"
		if o.from == "" {
			toDefault = "today + 6 days"
		}
	}
	if err := checkRange(from, to, toDefault); err != nil {
		return err
	}
	if site.ZoneInferred { // named with its offset on the first date listed
		first := noonOn(from, loc)
		line := "note: " + zoneNote(site, first, "")
		if o.site == "" && o.feed == "" { // a place of --lat and --lon
			line = zoneNote(site, first, "--tz")
		}
		fmt.Fprintf(g.stderr, "heliocal: %s\n", line)
	}
	var specs []config.KindSpec
	if o.feedSpecs != nil && !o.kindsSet {
		specs = o.feedSpecs
	} else {
		kinds, err := parseKinds(o.kinds)
		if err != nil {
			return err
		}
		for _, k := range kinds {
			specs = append(specs, config.KindSpec{Kind: k})
		}
	}
	if o.format == "json" {
		defer jsonGC(g.getenv)()
	}
	sky, err := feed.NewSky(from, to)
	if err != nil {
		return inputError{err}
	}
	if o.maxLit != 0 || len(o.feedSpecs) == 0 {
		for i := range specs {
			specs[i].MaxIllumination = o.maxLit
		}
	}
	if o.format == "ics" {
		return writeEventsICS(ctx, g.stdout, site, specs, sky, from, to)
	}
	out := newEventSink(o.format, g.stdout, site, from, to)
	if out == nil {
		return badInput("--format: %q: use table, json, csv or ics", o.format)
	}
	if t, ok := out.(*tableSink); ok {
		t.expect(specs, from, to)
	}
	if err := feed.PreparedChunks(ctx, sky, feed.PlaceOf(site), specs, from, to, out.prepare, out.write); err != nil {
		return err
	}
	return out.close()
}

// jsonGCPercent is the GC percent while events are streamed as JSON. The
// live heap is then the ephemeris and a chunk per core (about 4 MB for 20
// years, 8 MB for 100), and the JSON writer leaves next to no garbage. With
// the runtime's default (collect when the heap has doubled) the 20-year
// listing, which allocates 4.3 MB in all, collected once, and the runtime
// gave the freed pages back to the system and took them again: 550 of its
// 2,330 page faults and about a tenth of its CPU time (GOGC=200 and
// GOGC=off alike: 1,785 faults). With four times the live heap allowed as
// garbage it does not collect at all, and 100 years take 23 MB. (CSV and
// the table leave a string or two per row: they keep the default.)
const jsonGCPercent = 400

// jsonGC applies jsonGCPercent unless GOGC is set in the environment (the
// user's choice wins); the returned func puts the previous percent back.
func jsonGC(getenv func(string) (string, bool)) (restore func()) {
	if _, ok := getenv("GOGC"); ok {
		return func() {}
	}
	prev := debug.SetGCPercent(jsonGCPercent)
	return func() { debug.SetGCPercent(prev) }
}

// The outputs follow feed's one rounding rule: UTC instants to the
// millisecond (feed.UTCStamp), clock times to the nearest second of that.

// localStamp is t's local time in CSV, rounded to the second, with its
// offset: to the second where the offset is not whole minutes.
func localStamp(t time.Time, loc *time.Location) string {
	l := feed.ToSecond(t).In(loc)
	if _, off := l.Zone(); off%60 != 0 {
		return l.Format(localCSVTimeSeconds)
	}
	return l.Format(localCSVTime)
}

func clock(t time.Time, loc *time.Location) string {
	return feed.ToSecond(t).In(loc).Format("15:04:05")
}

// noonOn is 12:00 in loc on the date d (at 00:00 UTC) reads: the time at
// which a zone taken from a place's coordinates is named with its offset,
// on the first date listed.
func noonOn(d time.Time, loc *time.Location) time.Time {
	return time.Date(d.Year(), d.Month(), d.Day(), 12, 0, 0, 0, loc)
}

// endClock is the end of a span from start as the tables show it after
// its start's clock and zone: the clock alone, or with the end's zone
// label when a clock change lies between them ("00:15:00 CST" after a
// start at "00:15:00 CDT"), so that the two readings are not taken for one.
func endClock(start, end time.Time, loc *time.Location) string {
	s, e := feed.ToSecond(start).In(loc), feed.ToSecond(end).In(loc)
	sz, _ := s.Zone()
	if ez, _ := e.Zone(); ez != sz {
		return feed.LocalClock(e, loc, true)
	}
	return e.Format("15:04:05")
}

type jsonEvent struct {
	Kind  string `json:"kind"`
	Start string `json:"start,omitempty"` // none for a date-only event
	End   string `json:"end,omitempty"`
	// Open marks a band's span not left before the listing ends (near a
	// pole): End is then the end of the listing, not the Sun's leaving.
	Open bool `json:"open,omitempty"`
	// eclipse fields (max, type, magnitudes, phases), inline
	*jsonEclipse
	Direction string   `json:"direction,omitempty"`
	Date      string   `json:"date"`
	Part      string   `json:"part,omitempty"`
	Altitude  *float64 `json:"altitude_deg,omitempty"`
	Distance  *float64 `json:"distance_au,omitempty"`
	DayLength *float64 `json:"day_length_s,omitempty"`
	DirectSun *float64 `json:"direct_sun_s,omitempty"`
	Azimuth   *float64 `json:"azimuth_deg,omitempty"`
	Lit       *float64 `json:"illuminated,omitempty"`
	// Uncertainty is set on far-future seasons, apsides and phases.
	Uncertainty *float64 `json:"uncertainty_s,omitempty"`
	DayChange   *float64 `json:"day_change_s,omitempty"`
	Lamp        *float64 `json:"lamp_s,omitempty"`
	Short       bool     `json:"target_not_reached,omitempty"`
}

type jsonNote struct {
	Kind  string `json:"kind"`
	Date  string `json:"date"`
	State string `json:"state"`
	Until string `json:"until,omitempty"` // lighting: the first date lamps are needed again
	// photoperiod not crossed in the window: what the table says
	Detail string `json:"detail,omitempty"`
}

// sitePlace is where a site is, as the JSON of events and of check give it.
type sitePlace struct {
	Name      string  `json:"name"`
	Latitude  float64 `json:"latitude"`
	Longitude float64 `json:"longitude"`
	Elevation float64 `json:"elevation_m"`
	Horizon   float64 `json:"horizon_deg"`
	// Skyline is the horizon per direction, [azimuth, altitude] points.
	Skyline [][2]float64 `json:"skyline,omitempty"`
}

func placeOf(s *config.Site) sitePlace {
	return sitePlace{Name: s.Name, Latitude: s.Latitude, Longitude: s.Longitude, Elevation: s.Elevation,
		Horizon: s.Horizon, Skyline: s.Skyline}
}

type jsonSite struct {
	sitePlace
	siteHorizon
	TimeZone string `json:"timezone"`
	From     string `json:"from"`
	To       string `json:"to"`
}

// siteJSON is the site of a listing of the dates from..to.
func siteJSON(s *config.Site, from, to time.Time) jsonSite {
	return jsonSite{sitePlace: placeOf(s), siteHorizon: horizonOf(s), TimeZone: s.TimeZone.String(),
		From: from.Format(time.DateOnly), To: to.Format(time.DateOnly)}
}

func toJSONEvent(e feed.Event) jsonEvent {
	j := jsonEvent{
		Kind:      e.Kind.String(),
		Direction: direction(e),
		Date:      e.Date.Format(time.DateOnly),
		Part:      e.Part,
	}
	if !e.DateOnly() {
		j.Start = feed.UTCStamp(e.Start)
	}
	if !e.End.IsZero() {
		j.End = feed.UTCStamp(e.End)
	}
	j.Open = e.Open
	switch {
	case e.Kind.Name == "solar-noon" || e.Kind.Name == "moon-transit" || feed.MergedSpan(e):
		a := math.Round(e.Altitude*1e4) / 1e4
		j.Altitude = &a
	case e.Kind.Name == "perihelion" || e.Kind.Name == "aphelion":
		r := e.Distance()
		j.Distance = &r
	}
	if hasAzimuth(e) {
		a := math.Round(e.Azimuth*100) / 100
		j.Azimuth = &a
	}
	switch e.Kind.Name {
	case "march-equinox", "june-solstice", "september-equinox", "december-solstice", "cross-quarter",
		"perihelion", "aphelion", "new-moon", "first-quarter", "full-moon", "last-quarter":
		if u := feed.Uncertain(e.Start); u > 0 {
			s := u.Seconds()
			j.Uncertainty = &s
		}
	}
	if carriesDayLength(e.Kind.Name) && !e.LongDay { // the end of the midnight Sun: no day length
		s := math.Round(e.DayLength.Seconds()*1000) / 1000
		if e.DirectSun {
			j.DirectSun = &s // time above the skyline, not sunrise to sunset
		} else {
			j.DayLength = &s
		}
	}
	if e.Kind.Name == "daily-summary" { // a change of 0 too (polar night, midnight sun): the field is always there
		j.DayChange = roundTo(e.DayChange.Seconds(), 3)
	}
	if e.Kind.Name == config.KindLighting {
		lf := e.LampFacts()
		l := math.Round(lf.Lamp.Seconds()*1000) / 1000
		j.Lamp, j.Short = &l, lf.Short
	}
	j.jsonEclipse = eclipseJSON(e.EclipseFacts())
	if strings.Contains(e.Kind.Name, "moon") || e.Kind.Name == "first-quarter" || e.Kind.Name == "last-quarter" {
		f := math.Round(e.Illuminated*1e4) / 1e4
		j.Lit = &f
	}
	return j
}

// hasAzimuth reports whether the event carries the direction of the body:
// sunrise, sunset, moonrise and moonset.
func hasAzimuth(e feed.Event) bool {
	switch e.Kind.Name {
	case "sunrise", "sunset", "moonrise", "moonset":
		return true
	}
	return false
}

// direction names which way an event crosses its threshold, as every
// output and the calendar text word it: the Sun "rising" or "setting"
// through an altitude, day length "rising" or "falling" through a duration.
func direction(e feed.Event) string { return feed.DirectionWord(e) }

type row struct {
	date  time.Time
	at    time.Time
	event *feed.Event
	note  *feed.Note
}

// mergeRows interleaves events and notes by local date, notes first.
func mergeRows(events []feed.Event, notes []feed.Note) []row {
	rows := make([]row, 0, len(events)+len(notes))
	for i := range events {
		rows = append(rows, row{date: events[i].Date, at: events[i].Start, event: &events[i]})
	}
	for i := range notes {
		rows = append(rows, row{date: notes[i].Date, note: &notes[i]})
	}
	sort.SliceStable(rows, func(i, j int) bool {
		if !rows[i].date.Equal(rows[j].date) {
			return rows[i].date.Before(rows[j].date)
		}
		return rows[i].at.Before(rows[j].at)
	})
	return rows
}

// stateName names a note's state in JSON and CSV: "always-above",
// "always-below", or "no-event" for a date that simply has none (no
// moonrise: the Moon rises about 50 minutes later each day).
func stateName(s astro.State) string {
	if s == astro.Crosses {
		return "no-event"
	}
	return s.String()
}

func stateText(s astro.State) string {
	switch s {
	case astro.AlwaysAbove:
		return "no event: stays above all day"
	case astro.AlwaysBelow:
		return "no event: stays below all day"
	}
	return "no event on this date"
}

// signed writes x with the given decimals for the table, with the minus
// sign of the feeds' texts ("−3.08"), and none on a value that rounds to
// zero ("0.00", never "−0.00"). JSON and CSV write numbers as numbers.
func signed(x float64, decimals int) string {
	s := strconv.FormatFloat(x, 'f', decimals, 64)
	if strings.Trim(s, "-0.") == "" {
		return strings.TrimPrefix(s, "-")
	}
	return config.Minus(s)
}

// detailsAt is the table's DETAILS of an event at the site of observer o.
// A band's span is named in the words of the feeds' titles
// (feed.SpanWords), with the Sun's highest (lowest) altitude when its
// morning and evening (evening and morning) spans meet.
func detailsAt(e *feed.Event, loc *time.Location, o astro.Observer) string {
	var parts []string
	switch {
	case e.Open:
		parts = append(parts, "until past the end of the listing")
	case !e.End.IsZero():
		parts = append(parts, fmt.Sprintf("until %s%s (%s)", endClock(e.Start, e.End, loc), feed.DayMark(e.End, e.Date, loc), feed.SpanLength(feed.ToSecond(e.End).Sub(feed.ToSecond(e.Start)))))
	}
	words := feed.SpanWords(*e, o)
	switch {
	case words == "" && e.Part != "":
		parts = append(parts, e.Part)
	case feed.MergedSpan(*e) && e.Part == "night":
		parts = append(parts, fmt.Sprintf("%s, Sun at least %s°", words, signed(e.Altitude, 2)))
	case feed.MergedSpan(*e):
		parts = append(parts, fmt.Sprintf("%s, Sun at most %s°", words, signed(e.Altitude, 2)))
	case words != "":
		parts = append(parts, words)
	}
	if e.Direction != 0 && (e.Kind.Name == "sun-altitude" || e.Kind.Name == "photoperiod" || e.Kind.Name == "noon-clear") {
		parts = append(parts, direction(*e))
	}
	length := "day length "
	if e.DirectSun {
		length = "direct Sun "
	}
	switch e.Kind.Name {
	case "sunset":
		if e.LongDay {
			parts = append(parts, "ends the midnight sun (up for more than a day)")
		} else {
			parts = append(parts, length+feed.Length(e.DayLength, time.Second))
		}
	case "sunrise", "photoperiod", config.KindLighting:
		parts = append(parts, length+feed.Length(e.DayLength, time.Second))
	case "daily-summary":
		if e.DayChange.Round(time.Second) == 0 && (e.DayLength == 0 || e.DayLength == 24*time.Hour) {
			// polar night or midnight Sun on both dates, as the feeds word
			// it: no "+0 s" beside "0 s"
			parts = append(parts, length+feed.Length(e.DayLength, time.Minute)+", the same as the day before")
			break
		}
		parts = append(parts, length+feed.Length(e.DayLength, time.Second)+", change "+feed.Change(e.DayChange))
		if c := feed.ClockChange(e.Date, loc); c != "" {
			parts = append(parts, feed.Small(c)) // as the feed's summary says it
		}
	}
	if hasAzimuth(*e) {
		parts = append(parts, fmt.Sprintf("azimuth %.1f° (%s)", e.Azimuth, astro.CompassPoint(e.Azimuth)))
	}
	switch e.Kind.Name {
	case "solar-noon", "moon-transit":
		parts = append(parts, fmt.Sprintf("altitude %s°", signed(e.Altitude, 2)))
	case "perihelion", "aphelion":
		parts = append(parts, fmt.Sprintf("%.6f au", e.Distance()))
	}
	if e.Illuminated > 0 {
		// as the feeds write it ("22 % lit"), half a percent rounding up
		parts = append(parts, fmt.Sprintf("%d %% lit", int(math.Round(e.Illuminated*100))))
	}
	parts = append(parts, eclipseDetails(e, loc)...)
	return strings.Join(parts, ", ")
}
