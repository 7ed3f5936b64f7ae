package serve

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"math"
	"net/url"
	"slices"
	"strconv"
	"strings"
	"sync"
	"time"
	"unicode/utf8"

	"heliocal/config"
)

// The ad-hoc route and its query parameters. Every parameter is checked
// here; anything unknown, repeated, malformed or out of range is refused with
// a 400 naming the parameter and its value.
const (
	AdhocPath = "/at.ics"

	ParamLatitude  = "lat"      // degrees, −90..90, north positive (required)
	ParamLongitude = "lon"      // degrees, −180..180, east positive (required)
	ParamZone      = "tz"       // IANA time zone name, e.g. Europe/Vienna (default: the zone at lat, lon)
	ParamKinds     = "kinds"    // comma-separated event kinds (default: Options.AdhocDefaultKinds)
	ParamDays      = "days"     // number of days, 1..Options.AdhocMaxDays (default Options.AdhocDefaultDays)
	ParamStart     = "start"    // first local date, YYYY-MM-DD (default: today in tz)
	ParamElevation = "elev"     // metres above sea level, −500..9000 (default 0)
	ParamUTC       = "utc"      // true/false: write times in UTC instead of tz (default false)
	ParamName      = "name"     // the place's name in titles, 1..80 characters (default: the coordinates)
	ParamHorizon   = "horizon"  // altitude of the skyline in degrees, -5..45 (default 0), or points azimuth:altitude, e.g. 0:2,90:8,180:1
	ParamAlarm     = "alarm"    // reminder before each timed event, e.g. 15m, 0..168h (default none)
	ParamLighting  = "lighting" // lamp target day length, e.g. 16h: adds the kind lighting:16h
	ParamOffsets   = "offsets"  // per-kind shifts, kind:duration comma-separated, e.g. sunset:-30m (default none)
)

var adhocParams = []string{ParamLatitude, ParamLongitude, ParamZone, ParamKinds, ParamDays, ParamStart, ParamElevation, ParamUTC,
	ParamName, ParamHorizon, ParamAlarm, ParamLighting, ParamOffsets}

// Bounds of the ad-hoc parameters.
const (
	maxKinds       = 32
	maxZoneLen     = 64
	coordDecimals  = 1e4 // latitude and longitude are rounded to 0.0001° (about 11 m)
	maxQueryLength = 2048
)

// AdhocQuery is a validated, normalised ad-hoc feed request. Two requests
// that differ only in spelling (parameter order, trailing zeros, case of
// true/false) give the same AdhocQuery and share a cache entry. Two that
// differ in the order of their kinds do not (the calendar's description
// says what the kinds mean in that order, as a configured feed's does in
// the order of its kinds entries), but they share the ID, and so the
// entries' UIDs.
type AdhocQuery struct {
	Latitude  float64        // degrees, north positive, rounded to 0.0001°
	Longitude float64        // degrees, east positive, rounded to 0.0001°
	Elevation float64        // metres above sea level, rounded to 1 m
	Location  *time.Location // the zone local dates and times are in
	// Kinds are the event kinds in the canonical form returned by
	// Options.ParseKind, in the order the query gave them (the operator's
	// default ones in the order of Options.AdhocDefaultKinds), without
	// duplicates: a kind given twice is where it was first.
	Kinds []string
	// Start is the first local date of the window, at 00:00 UTC (only its
	// year, month and day count).
	Start time.Time
	Days  int  // length of the window in days
	UTC   bool // write times in UTC instead of Location

	Name    string        // the place's name; empty: the coordinates
	Horizon float64       // skyline altitude in degrees, rounded to 0.1°
	Alarm   time.Duration // reminder before each timed event; 0 = none
	// Offsets shift the events of some of Kinds (keys in Kinds' canonical
	// form), as the offset of a configuration's kinds entry does.
	Offsets map[string]time.Duration
	// ZoneFound is true when tz was not given and Location is the zone at
	// the coordinates (config.ZoneAt).
	ZoneFound bool
	// Skyline, when set (Horizon is then 0), is the skyline per direction:
	// [azimuth, altitude] points in degrees, sorted by azimuth, as a
	// site's horizon list.
	Skyline [][2]float64
	// HorizonSet is true when horizon was given as one altitude, 0
	// included: horizon=0 is a level horizon, without the dip of the
	// elevation (config.Site.HorizonSet).
	HorizonSet bool

	// placed is true once Latitude and Longitude are read: an unknown tz
	// is then told the zone in force there.
	placed bool
}

// horizonGiven reports whether the query names one altitude of the
// horizon: one other than 0, or 0 written (HorizonSet), a level horizon.
func (q AdhocQuery) horizonGiven() bool { return q.Horizon != 0 || q.HorizonSet }

// String returns the canonical query string, the cache key.
func (q AdhocQuery) String() string {
	return q.place() + "&" + ParamStart + "=" + q.Start.Format(time.DateOnly) +
		"&" + ParamDays + "=" + strconv.Itoa(q.Days)
}

// place is everything but the window.
func (q AdhocQuery) place() string { return q.placeWithZone(q.Location.String()) }

// placeWithZone is place with the zone's name written as tz.
func (q AdhocQuery) placeWithZone(tz string) string {
	var b strings.Builder
	b.WriteString(ParamLatitude + "=" + strconv.FormatFloat(q.Latitude, 'f', -1, 64))
	b.WriteString("&" + ParamLongitude + "=" + strconv.FormatFloat(q.Longitude, 'f', -1, 64))
	b.WriteString("&" + ParamElevation + "=" + strconv.FormatFloat(q.Elevation, 'f', -1, 64))
	b.WriteString("&" + ParamZone + "=" + tz)
	b.WriteString("&" + ParamKinds + "=" + strings.Join(q.Kinds, ","))
	b.WriteString("&" + ParamUTC + "=" + strconv.FormatBool(q.UTC))
	if q.Name != "" {
		b.WriteString("&" + ParamName + "=" + url.QueryEscape(q.Name))
	}
	if q.horizonGiven() {
		b.WriteString("&" + ParamHorizon + "=" + strconv.FormatFloat(q.Horizon, 'f', -1, 64))
	}
	if len(q.Skyline) > 0 {
		b.WriteString("&" + ParamHorizon + "=" + url.QueryEscape(q.skylineText()))
	}
	if q.Alarm != 0 {
		b.WriteString("&" + ParamAlarm + "=" + config.ShortDuration(q.Alarm))
	}
	if len(q.Offsets) > 0 {
		b.WriteString("&" + ParamOffsets + "=" + url.QueryEscape(q.offsetList()))
	}
	return b.String()
}

// zoneInLink escapes what a zone name may hold that a query string reads
// otherwise: the "+" of Etc/GMT+1 … Etc/GMT+12 (the zones at sea west of 7.5° W)
// is a space there. The slashes stay as they are.
var zoneInLink = strings.NewReplacer("%", "%25", "+", "%2B", "&", "%26", "#", "%23", " ", "%20")

// linkPlace is place as a link writes it: the zone's name escaped. place
// itself, the cache key and the source of ID (and so of the entries'
// UIDs), keeps the name as it is.
func (q AdhocQuery) linkPlace() string {
	return q.placeWithZone(zoneInLink.Replace(q.Location.String()))
}

// ID is a short identifier of the place, zone and kinds (not of the window,
// nor of the kinds' order): "at-" and 12 hex digits. Use it as the feed id
// so event UIDs stay the same when the same query is asked again another
// day, its kinds in another order too.
func (q AdhocQuery) ID() string {
	q.Kinds = slices.Sorted(slices.Values(q.Kinds))
	sum := sha256.Sum256([]byte(q.place()))
	return "at-" + hex.EncodeToString(sum[:6])
}

// QueryError is a refused ad-hoc parameter. Its message is one line and names
// the parameter and the value.
type QueryError struct {
	Param string
	Value string
	Msg   string
}

func (e *QueryError) Error() string {
	if e.Param == "" {
		return "serve: " + e.Msg
	}
	return fmt.Sprintf("serve: parameter %s=%s: %s", paramName(e.Param), quoteValue(e.Value), e.Msg)
}

// paramName writes a parameter name as is when it is a plain word, quoted
// otherwise (an unknown parameter may hold anything).
func paramName(p string) string {
	for _, r := range p {
		if !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || r == '_' || r == '-') {
			return quoteValue(p)
		}
	}
	return p
}

// quoteValue quotes v for a one-line message, cut to a readable length.
func quoteValue(v string) string {
	const max = 64
	if utf8.RuneCountInString(v) > max {
		r := []rune(v)
		return strconv.Quote(string(r[:max])) + "…"
	}
	return strconv.Quote(v)
}

// adhocLimits are the bounds and defaults parseAdhoc applies.
type adhocLimits struct {
	parseKind    func(string) (string, error)
	defaultKinds []string
	maxDays      int
	defaultDays  int
	minYear      int
	maxYear      int
	zones        *zoneCache
}

// parseAdhoc validates and normalises a raw query string. now fixes "today"
// when start is absent. Each step refuses its parameter with a QueryError.
func parseAdhoc(raw string, now time.Time, lim *adhocLimits) (AdhocQuery, error) {
	var q AdhocQuery
	get, err := adhocValues(raw)
	if err != nil {
		return q, err
	}
	for _, step := range []func() error{
		func() error { return q.parsePlace(get) },
		func() error { return q.parseZone(get, lim) },
		func() error { return q.parseKinds(get, lim) },
		func() error { return q.parseWindow(get, now, lim) },
		func() error { return q.parseUTC(get) },
		func() error { return q.parseExtras(get, lim) },
	} {
		if err := step(); err != nil {
			return q, err
		}
	}
	return q, nil
}

// getter returns a parameter's value and whether it was given.
type getter func(name string) (string, bool)

// adhocValues parses the query string, refusing one that is too long,
// malformed, or has an unknown or repeated parameter.
func adhocValues(raw string) (getter, error) {
	if len(raw) > maxQueryLength {
		return nil, &QueryError{Msg: fmt.Sprintf("query string longer than %d bytes", maxQueryLength)}
	}
	vals, err := url.ParseQuery(raw)
	if err != nil {
		return nil, &QueryError{Msg: "malformed query string: " + quoteValue(raw)}
	}
	keys := make([]string, 0, len(vals))
	for k := range vals {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	for _, k := range keys {
		if !slices.Contains(adhocParams, k) {
			return nil, &QueryError{Param: k, Value: vals.Get(k),
				Msg: "unknown parameter (known: " + strings.Join(adhocParams, ", ") + ")"}
		}
		if len(vals[k]) > 1 {
			return nil, &QueryError{Param: k, Value: strings.Join(vals[k], ","), Msg: "given more than once"}
		}
	}
	return func(name string) (string, bool) {
		v, ok := vals[name]
		if !ok {
			return "", false
		}
		return v[0], true
	}, nil
}

// parsePlace reads lat, lon and elev.
func (q *AdhocQuery) parsePlace(get getter) error {
	var err error
	if q.Latitude, err = parseCoord(get, ParamLatitude, 90, config.LatitudeText); err != nil {
		return err
	}
	if q.Longitude, err = parseCoord(get, ParamLongitude, 180, config.LongitudeText); err != nil {
		return err
	}
	if q.Longitude == -180 {
		q.Longitude = 180 // the same meridian, one spelling
	}
	q.placed = true
	return q.parseElevation(get)
}

// parseElevation reads elev.
func (q *AdhocQuery) parseElevation(get getter) error {
	if v, ok := get(ParamElevation); ok {
		e, err := parseFloat(ParamElevation, v)
		if err != nil {
			return err
		}
		if e < config.MinElevation || e > config.MaxElevation {
			return &QueryError{Param: ParamElevation, Value: v,
				Msg: fmt.Sprintf("must be within %g..%g metres (%s)", config.MinElevation, config.MaxElevation, config.ElevationHint(e))}
		}
		q.Elevation = math.Round(e) + 0 // + 0 turns −0 into 0
	}
	return nil
}

// parseZone reads tz; without it the zone is the one at the coordinates.
func (q *AdhocQuery) parseZone(get getter, lim *adhocLimits) error {
	tz, ok := get(ParamZone)
	if !ok {
		name, err := config.ZoneAt(q.Latitude, q.Longitude)
		if err == nil {
			q.Location, err = lim.zones.load(name)
		}
		if err != nil {
			return &QueryError{Param: ParamZone, Msg: "no zone found at the coordinates: give an IANA time zone name such as Europe/Vienna"}
		}
		q.ZoneFound = true
		return nil
	}
	var err error
	if q.Location, err = lim.zones.load(tz); err != nil {
		if plus := strings.ReplaceAll(tz, " ", "+"); plus != tz {
			if _, err := lim.zones.load(plus); err == nil {
				// a link that wrote Etc/GMT+12 as it is: its "+" is a space
				return &QueryError{Param: ParamZone, Value: tz, Msg: fmt.Sprintf("unknown time zone (a \"+\" in a link is read as a space: for %s write tz=%s)", plus, zoneInLink.Replace(plus))}
			}
		}
		// the configuration's suggestion: the nearest known name, or the
		// zone at the coordinates, as a site's timezone is told
		hint := config.ZoneHint(tz)
		if q.placed {
			hint = config.ZoneHintAt(tz, q.Latitude, q.Longitude, ParamZone)
		}
		return &QueryError{Param: ParamZone, Value: tz, Msg: "unknown time zone (" + hint + ")"}
	}
	return nil
}

// parseKinds reads kinds, or takes the default ones.
func (q *AdhocQuery) parseKinds(get getter, lim *adhocLimits) error {
	v, ok := get(ParamKinds)
	switch {
	case ok:
		var err error
		q.Kinds, err = parseKinds(v, lim.parseKind)
		return err
	case len(lim.defaultKinds) > 0:
		q.Kinds = lim.defaultKinds
		return nil
	}
	return &QueryError{Param: ParamKinds, Msg: "required: a comma-separated list of event kinds"}
}

// parseWindow reads days and start, and checks that the window lies within
// the supported years.
func (q *AdhocQuery) parseWindow(get getter, now time.Time, lim *adhocLimits) error {
	q.Days = lim.defaultDays
	if v, ok := get(ParamDays); ok {
		d, err := strconv.Atoi(v)
		if err != nil {
			return &QueryError{Param: ParamDays, Value: v, Msg: "not a whole number"}
		}
		if d < 1 || d > lim.maxDays {
			return &QueryError{Param: ParamDays, Value: v, Msg: fmt.Sprintf("must be within 1..%d", lim.maxDays)}
		}
		q.Days = d
	}
	v, ok := get(ParamStart)
	if ok {
		d, err := time.Parse(time.DateOnly, v)
		if err != nil {
			return &QueryError{Param: ParamStart, Value: v, Msg: "not a date (" + config.DateHint(v) + ")"}
		}
		q.Start = d
	} else {
		y, m, d := now.In(q.Location).Date()
		q.Start = time.Date(y, m, d, 0, 0, 0, 0, time.UTC)
		v = q.Start.Format(time.DateOnly)
	}
	first := time.Date(lim.minYear, 1, 1, 0, 0, 0, 0, time.UTC)
	last := time.Date(lim.maxYear, 12, 31, 0, 0, 0, 0, time.UTC)
	if q.Start.Before(first) || q.Start.After(last) {
		return &QueryError{Param: ParamStart, Value: v,
			Msg: fmt.Sprintf("the window must lie within %d-01-01..%d-12-31", lim.minYear, lim.maxYear)}
	}
	if end := q.Start.AddDate(0, 0, q.Days-1); end.After(last) {
		// the end is not written in the query: say how the window gets
		// there and which start keeps it within the dates
		days := "1 day"
		if q.Days > 1 {
			days = strconv.Itoa(q.Days) + " days"
		}
		if _, ok := get(ParamDays); !ok {
			days += " (days not given)"
		}
		fix := ""
		if q.Days > 1 {
			fix = ", or ask fewer days"
		}
		return &QueryError{Param: ParamStart, Value: v,
			Msg: fmt.Sprintf("the window of %s from it ends %s, past the supported dates %d-01-01..%d-12-31: start %s at the latest%s",
				days, end.Format(time.DateOnly), lim.minYear, lim.maxYear, last.AddDate(0, 0, 1-q.Days).Format(time.DateOnly), fix)}
	}
	return nil
}

// parseUTC reads utc.
func (q *AdhocQuery) parseUTC(get getter) error {
	v, ok := get(ParamUTC)
	if !ok {
		return nil
	}
	switch strings.ToLower(v) {
	case "1", "true", "yes":
		q.UTC = true
	case "0", "false", "no":
	default:
		return &QueryError{Param: ParamUTC, Value: v, Msg: "must be true or false"}
	}
	return nil
}

func parseFloat(name, v string) (float64, error) {
	f, err := strconv.ParseFloat(strings.TrimSpace(v), 64)
	if err != nil || math.IsNaN(f) || math.IsInf(f, 0) {
		msg := "not a decimal number"
		if hint := numberHint(name, v); hint != "" {
			msg += " (" + hint + ")"
		}
		return 0, &QueryError{Param: name, Value: v, Msg: msg}
	}
	return f, nil
}

// numberHint says how to write the number of a parameter, v, that is not
// one ("2°", "120 m", "33°27′S"): that of a place or a horizon in the words
// of the configuration's hint for its key (config.NumberTextHint); "" for a
// parameter without a hint.
func numberHint(name, v string) string {
	if key, ok := paramKeys[name]; ok {
		return config.NumberTextHint(key, strings.TrimSpace(v))
	}
	return ""
}

// paramKeys are the configuration's keys of the place's parameters.
var paramKeys = map[string]string{ParamLatitude: "latitude", ParamLongitude: "longitude", ParamElevation: "elevation", ParamHorizon: "horizon"}

// parseCoord reads the coordinate name, within -limit..limit, whose hint
// out of range is hint.
func parseCoord(get getter, name string, limit float64, hint string) (float64, error) {
	v, ok := get(name)
	if !ok {
		return 0, &QueryError{Param: name, Msg: fmt.Sprintf("required: decimal degrees within -%g..%g", limit, limit)}
	}
	f, err := parseFloat(name, v)
	if err != nil {
		return 0, err
	}
	if f < -limit || f > limit {
		if name == ParamLongitude {
			hint = config.LongitudeHint(f) // 183.44: -176.56
		}
		return 0, &QueryError{Param: name, Value: v, Msg: fmt.Sprintf("must be within -%g..%g (%s)", limit, limit, hint)}
	}
	return math.Round(f*coordDecimals)/coordDecimals + 0, nil
}

// parseKinds reads v, a comma-separated list of kinds, each read by parse
// into its canonical form; a kind given twice is kept where it was first.
func parseKinds(v string, parse func(string) (string, error)) ([]string, error) {
	kinds := make([]string, 0, strings.Count(v, ",")+1)
	var bad error
	err := kindItems(v, parse, func(item, k string, err error) bool {
		switch {
		case item == "":
			bad = &QueryError{Param: ParamKinds, Value: v, Msg: "empty kind in the list"}
		case err != nil:
			bad = err
		case !slices.Contains(kinds, k):
			kinds = append(kinds, k)
		}
		return bad == nil
	})
	if err == nil {
		err = bad
	}
	if err != nil {
		return nil, err
	}
	return kinds, nil
}

// kindItems reads v, a comma-separated list of kinds: more than maxKinds
// is an error; otherwise each item, trimmed, goes to yield with the kind
// parse reads it as, or with a *QueryError naming it (an empty item, "",
// is not read), until yield returns false. The ad-hoc feed refuses the
// list at its first bad item (parseKinds), the builder's page leaves that
// item out (filler.kinds).
func kindItems(v string, parse func(string) (string, error), yield func(item, kind string, err error) bool) error {
	if strings.Count(v, ",") >= maxKinds {
		return &QueryError{Param: ParamKinds, Value: v, Msg: fmt.Sprintf("more than %d kinds", maxKinds)}
	}
	for p := range strings.SplitSeq(v, ",") {
		var k string
		var err error
		if p = strings.TrimSpace(p); p != "" {
			if k, err = parse(p); err != nil {
				k, err = "", &QueryError{Param: ParamKinds, Value: p, Msg: oneLine(err.Error())}
			}
		}
		if !yield(p, k, err) {
			break
		}
	}
	return nil
}

// oneLine keeps the first line of a message.
func oneLine(s string) string {
	if i := strings.IndexAny(s, "\r\n"); i >= 0 {
		return s[:i]
	}
	return s
}

// zoneCache remembers the zones it has loaded: time.LoadLocation reads the
// tz database on every call. Only names that loaded are kept, so its size is
// bounded by the database.
type zoneCache struct{ m sync.Map }

func (z *zoneCache) load(name string) (*time.Location, error) {
	if v, ok := z.m.Load(name); ok {
		return v.(*time.Location), nil
	}
	// "Local" would be the server's own zone, meaningless to a caller;
	// time.LoadLocation already refuses ".." and absolute paths.
	if name == "" || name == "Local" || len(name) > maxZoneLen || strings.ContainsAny(name, "\\\x00") {
		return nil, fmt.Errorf("serve: unknown time zone %q", name)
	}
	loc, err := time.LoadLocation(name)
	if err != nil {
		return nil, err
	}
	z.m.Store(name, loc)
	return loc, nil
}
