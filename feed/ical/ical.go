// Package ical writes a feed.Calendar as an iCalendar file (RFC 5545, with the
// calendar properties of RFC 7986) that subscribed calendar clients accept.
//
// The calendar and event structure is built and serialized with
// github.com/arran4/golang-ical (v0.3.4), always with CRLF line endings. The
// package works around that library where its output would be wrong:
//
//   - its default line ending is LF: every serialization passes
//     ics.WithNewLineWindows;
//   - NewCalendar stamps the library's own PRODID: heliocal writes
//     "-//heliocal//heliocal <version>//EN";
//   - SetStartAt/SetEndAt always write UTC with a trailing "Z", even next to a
//     TZID parameter: local times are formatted here;
//   - it backslash-escapes parameter values instead of quoting them: a TZID
//     that would need quoting is written here, DQUOTEd (see contentLine);
//   - unknown properties default to TEXT and get TEXT escaping: SOURCE carries
//     VALUE=URI, and CATEGORIES (a comma-separated list of TEXT values) is
//     written here;
//   - a raw CR passes through its TEXT escaping: all text is normalised first
//     (CRLF and lone CR become LF, other control characters are removed);
//   - GEO from floats may come out as "-5e-05": GEO is formatted here as plain
//     decimals.
//
// # Time zones
//
// By default timed entries carry the site's local time with TZID=<IANA name>,
// and the file carries a VTIMEZONE for that zone generated from Go's time zone
// database, with one observance per real offset or abbreviation change across
// the feed's window (plus a margin) and no recurrence rules; an observance is
// DAYLIGHT when clocks go forward into it, STANDARD otherwise. A local time that
// occurs twice (in the hour that repeats when clocks go back) is written in
// UTC instead: RFC 5545 §3.3.5 reads it as the first occurrence but parsers
// differ, and a UTC value names exactly the computed instant everywhere. With Calendar.UTC, or a site zone that
// is UTC itself, every timed value is written in UTC ("Z") with no TZID and no
// VTIMEZONE. All-day entries are DATE values with an exclusive DTEND.
//
// The output is deterministic: the same Calendar gives byte-identical bytes.
// Nothing reads the wall clock; DTSTAMP and LAST-MODIFIED are Calendar.Stamp.
//
// # Size
//
// Some widely used web calendars are reported to drop events from
// subscriptions larger than about 1 MB (see MaxAdvisedSize). An event takes
// 400 to 800 bytes (about 510 in BenchmarkMarshal, 750 with the catalogue's
// longer descriptions), so 1 MB holds roughly 1,300 to 2,000 events: keep a
// feed's window rolling and split feeds by kind rather than publishing years
// of daily events in one file.
package ical

import (
	"bytes"
	"fmt"
	"io"
	"strconv"
	"strings"
	"time"

	ics "github.com/arran4/golang-ical"

	"heliocal/feed"
)

// MaxAdvisedSize is the largest feed, in bytes, that heliocal advises
// publishing. Google Calendar is reported to lose events from subscriptions
// over about 1 MB, and other consumers refuse files over 1 to 2 MB, so a
// larger feed should use a shorter window or be split by kind. Callers compare
// it with len of the Marshal output.
const MaxAdvisedSize = 1_000_000

// Options tune the writer; the zero value is usable.
type Options struct {
	// Version is heliocal's version, written into PRODID as
	// "-//heliocal//heliocal <Version>//EN"; empty writes "dev".
	Version string
}

// ProductID returns the PRODID value written for opts.
func (opts Options) ProductID() string {
	v := opts.Version
	if v == "" {
		v = "dev"
	}
	return "-//heliocal//heliocal " + v + "//EN"
}

// zoneMargin widens the VTIMEZONE beyond the feed's window and entries, so
// that a client looking slightly outside the window still finds an offset.
const zoneMargin = 31 * 24 * time.Hour

// instantLength is the DTEND given to an entry that is an instant: a
// zero-length event displays differently from client to client, a one-minute
// event everywhere.
const instantLength = time.Minute

// Marshal returns c as an iCalendar file.
func Marshal(c *feed.Calendar, opts Options) ([]byte, error) {
	cal, err := build(c, opts)
	if err != nil {
		return nil, err
	}
	var b bytes.Buffer
	b.Grow(4096 + 640*len(c.Entries)) // an event takes 400 to 800 bytes
	if err := cal.SerializeTo(&b, ics.WithNewLineWindows); err != nil {
		return nil, fmt.Errorf("ical: calendar %q: %w", c.ID, err)
	}
	return b.Bytes(), nil
}

// Encode writes c to w as an iCalendar file. The whole file is rendered
// before the first byte is written, so an invalid calendar writes nothing.
func Encode(w io.Writer, c *feed.Calendar, opts Options) error {
	data, err := Marshal(c, opts)
	if err != nil {
		return err
	}
	if _, err := w.Write(data); err != nil {
		return fmt.Errorf("ical: calendar %q: write: %w", c.ID, err)
	}
	return nil
}

// writer holds what every event of one calendar shares.
type writer struct {
	c     *feed.Calendar
	loc   *time.Location // nil: write UTC
	tzid  string
	stamp time.Time
	geo   string
}

func build(c *feed.Calendar, opts Options) (*ics.Calendar, error) {
	if c == nil {
		return nil, fmt.Errorf("ical: nil calendar")
	}
	w := &writer{c: c, stamp: c.Stamp.UTC()}
	fail := func(format string, args ...any) error {
		return fmt.Errorf("ical: calendar %q: "+format, append([]any{c.ID}, args...)...)
	}
	if c.Stamp.IsZero() {
		return nil, fail("Stamp is zero (it must be derived from the inputs)")
	}
	if c.Refresh < 0 {
		return nil, fail("Refresh %s is negative", c.Refresh)
	}
	if c.Alarm < 0 {
		return nil, fail("Alarm %s is negative", c.Alarm)
	}
	geo, err := formatGeo(c.Site.Latitude, c.Site.Longitude)
	if err != nil {
		return nil, fail("site %q: %w", c.Site.ID, err)
	}
	w.geo = geo
	color := strings.ToLower(strings.TrimSpace(c.Color))
	if color != "" && !cssColors[color] {
		return nil, fail("Color %q is not a CSS3 colour name (RFC 7986 COLOR)", c.Color)
	}
	for _, u := range []struct{ field, value string }{{"URL", c.URL}, {"PageURL", c.PageURL}} {
		if err := checkURI(u.value); err != nil {
			return nil, fail("%s %q: %w", u.field, u.value, err)
		}
	}
	loc := c.Site.Location
	if loc == nil {
		return nil, fail("site %q has no time zone", c.Site.ID)
	}
	if !c.UTC && !isUTC(loc) {
		w.loc = loc
		w.tzid = loc.String()
		if err := checkTZID(w.tzid); err != nil {
			return nil, fail("site %q: %w", c.Site.ID, err)
		}
	}

	cal := ics.NewCalendarFor("heliocal")
	cal.SetProductId(opts.ProductID())
	cal.SetCalscale("GREGORIAN")
	cal.SetMethod(ics.MethodPublish)
	if t := cleanText(c.Title); t != "" {
		cal.SetName(t) // NAME and X-WR-CALNAME
	}
	if d := cleanText(c.Description); d != "" {
		cal.SetDescription(d)
		cal.SetXWRCalDesc(d)
	}
	if c.Refresh > 0 {
		d := formatDuration(c.Refresh)
		// The library's SetRefreshInterval uses the parameter as part of the
		// property name; write the name and VALUE=DURATION properly.
		calProp(cal, "REFRESH-INTERVAL", d, ics.WithValue(string(ics.ValueDataTypeDuration)))
		cal.SetXPublishedTTL(d)
	}
	if color != "" {
		cal.SetColor(color)
	}
	if c.URL != "" {
		// SOURCE is unknown to the library, which would TEXT-escape it;
		// VALUE=URI keeps the URI as it is.
		calProp(cal, "SOURCE", c.URL, ics.WithValue(string(ics.ValueDataTypeUri)))
	}
	if c.PageURL != "" {
		cal.SetUrl(c.PageURL) // URL defaults to URI: not escaped
	}
	if tz := loc.String(); tz != "" {
		cal.SetXWRTimezone(cleanText(tz))
	}
	cal.SetLastModified(w.stamp)

	if w.loc != nil {
		from, to := w.zoneSpan()
		cal.AddVTimezone(vtimezone(w.tzid, w.loc, from, to))
	}

	seen := make(map[string]bool, len(c.Entries))
	for i := range c.Entries {
		e := &c.Entries[i]
		if e.UID == "" {
			return nil, fail("entry %d (%s %s): empty UID", i, e.Kind, e.Start.Format(time.RFC3339))
		}
		if seen[e.UID] {
			return nil, fail("entry %d: duplicate UID %q", i, e.UID)
		}
		seen[e.UID] = true
		ev, err := w.event(e)
		if err != nil {
			return nil, fail("entry %q: %w", e.UID, err)
		}
		cal.AddVEvent(ev)
	}
	return cal, nil
}

// zoneSpan is the span the VTIMEZONE must cover: the window and every timed
// entry, widened by zoneMargin, starting at a local midnight.
func (w *writer) zoneSpan() (from, to time.Time) {
	from, to = w.c.WindowStart, w.c.WindowEnd
	widen := func(t time.Time) {
		if t.IsZero() {
			return
		}
		if from.IsZero() || t.Before(from) {
			from = t
		}
		if to.IsZero() || t.After(to) {
			to = t
		}
	}
	widen(w.c.WindowStart)
	widen(w.c.WindowEnd)
	for i := range w.c.Entries {
		if e := &w.c.Entries[i]; !e.AllDay {
			widen(e.Start)
			widen(e.End)
		}
	}
	if from.IsZero() {
		from, to = w.stamp, w.stamp
	}
	from = from.Add(-zoneMargin).In(w.loc)
	from = time.Date(from.Year(), from.Month(), from.Day(), 0, 0, 0, 0, w.loc)
	return from.UTC(), to.Add(zoneMargin).UTC()
}

func (w *writer) event(e *feed.Entry) (*ics.VEvent, error) {
	ev := ics.NewEvent(e.UID)
	// DTSTAMP is the calendar's deterministic stamp, in UTC.
	ev.SetDtStampTime(w.stamp)
	var extra []ics.Component // pre-formatted lines, see contentLine
	if e.AllDay {
		start := dateOf(e.Start)
		end := start.AddDate(0, 0, 1)
		if !e.End.IsZero() {
			end = dateOf(e.End)
		}
		if !end.After(start) {
			return nil, fmt.Errorf("all-day end %s is not after start %s",
				end.Format(time.DateOnly), start.Format(time.DateOnly))
		}
		ev.SetAllDayStartAt(start) // DTSTART;VALUE=DATE
		ev.SetAllDayEndAt(end)     // exclusive DTEND;VALUE=DATE
	} else {
		if e.Start.IsZero() {
			return nil, fmt.Errorf("timed entry has no Start")
		}
		if !e.End.IsZero() && e.End.Before(e.Start) {
			return nil, fmt.Errorf("End %s is before Start %s",
				e.End.UTC().Format(time.RFC3339), e.Start.UTC().Format(time.RFC3339))
		}
		start := e.Start.UTC().Round(time.Second)
		end := e.End.UTC().Round(time.Second)
		if !end.After(start) {
			end = start.Add(instantLength)
		}
		extra = append(extra, w.setTime(ev, ics.ComponentPropertyDtStart, start)...)
		extra = append(extra, w.setTime(ev, ics.ComponentPropertyDtEnd, end)...)
	}
	if s := cleanText(e.Title); s != "" {
		ev.SetSummary(s)
	}
	if d := cleanText(e.Description); d != "" {
		ev.SetDescription(d)
	}
	if cats := categories(e.Categories); cats != "" {
		// CATEGORIES is a list of TEXT values on one line: the commas between
		// values must stay as they are, commas inside a value are escaped.
		// The library would escape the separators too, so the line is
		// written pre-formatted.
		extra = append(extra, &contentLine{line: "CATEGORIES:" + cats})
	}
	if l := cleanText(w.c.Site.Name); l != "" {
		ev.SetLocation(l)
	}
	ev.SetProperty(ics.ComponentPropertyGeo, w.geo) // FLOAT: not escaped
	ev.SetTimeTransparency(ics.TransparencyTransparent)
	ev.AddProperty("X-MICROSOFT-CDO-BUSYSTATUS", "FREE")
	ev.SetSequence(0)
	ev.SetLastModifiedAt(w.stamp)
	// Pre-formatted lines come after the library's properties and before any
	// VALARM (RFC 5545 §3.6.1: alarms follow the event's properties).
	ev.Components = append(ev.Components, extra...)
	if w.c.Alarm > 0 && !e.AllDay {
		a := ev.AddAlarm()
		a.SetAction(ics.ActionDisplay)
		desc := cleanText(e.Title)
		if desc == "" {
			desc = "Reminder"
		}
		a.SetProperty(ics.ComponentPropertyDescription, desc) // required for DISPLAY
		a.SetTrigger("-" + formatDuration(w.c.Alarm))
	}
	return ev, nil
}

// setTime sets DTSTART or DTEND of a timed entry to t (UTC). In local mode
// the value is the site's wall clock with TZID; the library's SetStartAt
// cannot be used, since it writes UTC with a trailing "Z" even with a TZID.
// A wall clock that occurs twice is written in UTC (see isAmbiguous).
// When the TZID needs DQUOTEs the property is returned as a pre-formatted
// line instead of being set, as the library would backslash-escape it.
func (w *writer) setTime(ev *ics.VEvent, prop ics.ComponentProperty, t time.Time) []ics.Component {
	if w.loc == nil || isAmbiguous(t, w.loc) {
		ev.SetProperty(prop, t.Format(utcLayout))
		return nil
	}
	local := t.In(w.loc).Format(localLayout)
	if libraryParamSafe(w.tzid) {
		ev.SetProperty(prop, local, ics.WithTZID(w.tzid))
		return nil
	}
	return []ics.Component{&contentLine{line: string(prop) + ";TZID=" + paramValue(w.tzid) + ":" + local}}
}

const (
	utcLayout   = "20060102T150405Z"
	localLayout = "20060102T150405"
)

// isAmbiguous reports whether the wall clock of t in loc also names another
// instant: t is in the hour that repeats when clocks go back, either its
// first or its second occurrence. RFC 5545 §3.3.5 reads such a local time as
// the first occurrence, but parsers differ (Go's time.Date, and so go-ical,
// picks the second one), so t is written in UTC instead.
func isAmbiguous(t time.Time, loc *time.Location) bool {
	lt := t.In(loc)
	_, off := lt.Zone()
	start, end := lt.ZoneBounds()
	if !start.IsZero() {
		// The same wall clock under the previous offset, if that is larger,
		// is an earlier instant; it is real if it falls before the change.
		if _, prev := start.Add(-time.Second).In(loc).Zone(); prev > off {
			if t.Add(time.Duration(off-prev) * time.Second).Before(start) {
				return true
			}
		}
	}
	if !end.IsZero() {
		// The same wall clock under the next offset, if that is smaller, is
		// a later instant; it is real if it falls on or after the change.
		if _, next := end.In(loc).Zone(); next < off {
			if !t.Add(time.Duration(off-next) * time.Second).Before(end) {
				return true
			}
		}
	}
	return false
}

// dateOf returns the calendar date of an all-day entry's field, which holds
// the date at 00:00 UTC.
func dateOf(t time.Time) time.Time {
	t = t.UTC()
	return time.Date(t.Year(), t.Month(), t.Day(), 0, 0, 0, 0, time.UTC)
}

// calProp appends a calendar property with parameters.
func calProp(cal *ics.Calendar, name, value string, params ...ics.PropertyParameter) {
	p := ics.CalendarProperty{BaseProperty: ics.BaseProperty{
		IANAToken: name, Value: value, ICalParameters: map[string][]string{},
	}}
	for _, kv := range params {
		k, v := kv.KeyValue()
		p.ICalParameters[k] = v
	}
	cal.CalendarProperties = append(cal.CalendarProperties, p)
}

// formatDuration writes d as an RFC 5545 §3.3.6 duration, rounded to whole
// seconds: "P1D", "PT12H", "PT15M", "PT1H0M30S" (an hour followed by seconds
// needs the minutes in between).
func formatDuration(d time.Duration) string {
	secs := int64(d.Round(time.Second) / time.Second)
	if secs == 0 {
		return "PT0S"
	}
	if secs%86400 == 0 {
		return "P" + strconv.FormatInt(secs/86400, 10) + "D"
	}
	var b strings.Builder
	b.WriteString("P")
	if days := secs / 86400; days > 0 {
		b.WriteString(strconv.FormatInt(days, 10) + "D")
		secs %= 86400
	}
	b.WriteString("T")
	h, m, s := secs/3600, secs/60%60, secs%60
	if h > 0 {
		b.WriteString(strconv.FormatInt(h, 10) + "H")
	}
	if m > 0 || (h > 0 && s > 0) {
		b.WriteString(strconv.FormatInt(m, 10) + "M")
	}
	if s > 0 {
		b.WriteString(strconv.FormatInt(s, 10) + "S")
	}
	return b.String()
}
