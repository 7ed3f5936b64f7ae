// Package ical writes a feed.Calendar as an iCalendar file (RFC 5545, with the
// calendar properties of RFC 7986) that subscribed calendar clients accept.
//
// The calendar is built and serialized with github.com/arran4/golang-ical
// (v0.3.4), always with CRLF line endings. Its events are components of this
// package that write their own content lines, the bytes the library's
// per-property serializer would write, at a fraction of its cost (see
// vevent). The package works around that library where its output would be
// wrong:
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
// DAYLIGHT when clocks go forward into it, STANDARD otherwise (a move across
// the date line, by a day, takes the tz database's own flag). A local time that
// occurs twice (in the hour that repeats when clocks go back) is written in
// UTC instead: RFC 5545 §3.3.5 reads it as the first occurrence but parsers
// differ, and a UTC value names exactly the computed instant everywhere. With Calendar.UTC, or a site zone that
// is UTC itself, every timed value is written in UTC ("Z") with no TZID and no
// VTIMEZONE. All-day entries are DATE values with an exclusive DTEND.
//
// The output is deterministic: the same Calendar gives byte-identical bytes.
// Nothing reads the wall clock; the events' DTSTAMP and the calendar's
// LAST-MODIFIED are Calendar.Stamp.
//
// # Size
//
// Some widely used web calendars are reported to drop events from
// subscriptions larger than about 1 MB (see MaxAdvisedSize). An event takes
// 350 to 750 bytes (about 470 in BenchmarkMarshal, 560 for the catalogue's
// sunrise, sunset, civil twilight and golden hour), so 1 MB holds roughly
// 1,400 to 2,800 events: keep a feed's window rolling and split feeds by
// kind rather than publishing years of daily events in one file.
package ical

import (
	"encoding/binary"
	"fmt"
	"hash/maphash"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"
	"time"
	"unsafe"

	ics "github.com/arran4/golang-ical"

	"heliocal/astro"
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
	// "-//heliocal//heliocal <Version>//EN"; empty writes "unversioned".
	Version string
}

// ProductID returns the PRODID value written for opts.
func (opts Options) ProductID() string {
	v := opts.Version
	if v == "" {
		v = "unversioned"
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
	return NewEncoder(opts).Append(nil, c)
}

// An Encoder writes calendars as iCalendar files one after another, with
// the bytes of Marshal, and keeps its working memory (the events, the UID
// set, the shared content lines) from one calendar to the next, so that a
// publisher encoding many feeds into one reused buffer allocates little
// beyond the first. An Encoder is for one goroutine at a time.
type Encoder struct {
	opts  Options
	w     writer
	seen  uidSet
	comps []ics.Component
	// piece is WriteTo's buffer, kept for the next calendar.
	piece []byte
	// spanEntries, when not nil, stand for the calendar's entries in
	// sizing the VTIMEZONE (see NewStream).
	spanEntries []feed.Entry
}

// NewEncoder returns an Encoder writing with opts.
func NewEncoder(opts Options) *Encoder { return &Encoder{opts: opts} }

// Append appends c's iCalendar file to dst and returns the extended buffer
// (dst is grown once, to the estimated size, when it has too little room).
// On error dst is returned unchanged, with nothing appended.
func (e *Encoder) Append(dst []byte, c *feed.Calendar) ([]byte, error) {
	dst, _, err := e.appendFile(dst, c, nil, false)
	return dst, err
}

// AppendSizes is Append that also appends to sizes, in the order of
// c.Entries, the bytes each entry's VEVENT takes in the file (its VALARM
// included), and returns the extended slice: what is left of the file is
// its fixed part, the header, the VTIMEZONE and the end. On error dst and
// sizes are returned unchanged.
func (e *Encoder) AppendSizes(dst []byte, c *feed.Calendar, sizes []int) ([]byte, []int, error) {
	return e.appendFile(dst, c, sizes, true)
}

// appendFile is Append, and AppendSizes when sizing.
func (e *Encoder) appendFile(dst []byte, c *feed.Calendar, sizes []int, sizing bool) ([]byte, []int, error) {
	cal, size, err := e.build(c)
	if err != nil {
		return dst, sizes, err
	}
	if cap(dst)-len(dst) < size {
		// make, unlike bytes.Buffer.Grow, does not clear memory fresh from
		// the operating system (Grow always zeroes the whole new capacity).
		grown := make([]byte, len(dst), len(dst)+size)
		copy(grown, dst)
		dst = grown
	}
	out := &appendWriter{b: dst, sizes: sizes, sizing: sizing}
	err = cal.SerializeTo(out, ics.WithNewLineWindows)
	e.release(cal)
	if err != nil {
		return dst, sizes, fmt.Errorf("ical: calendar %q: %w", c.ID, err)
	}
	return out.b, out.sizes, nil
}

// WriteTo writes c's iCalendar file to out, the bytes of Marshal, in
// pieces of about streamPiece bytes as they are rendered, and returns how
// many it wrote. The whole file is never held: a writer that compresses
// what it is given reads each piece while it is still in the processor's
// cache. On error some of the file may have been written.
func (e *Encoder) WriteTo(out io.Writer, c *feed.Calendar) (int64, error) {
	cal, _, err := e.build(c)
	if err != nil {
		return 0, err
	}
	aw := &appendWriter{b: e.piece[:0], out: out}
	err = cal.SerializeTo(aw, ics.WithNewLineWindows)
	e.release(cal)
	if err == nil {
		aw.flush()
		err = aw.err
	}
	e.piece = aw.b[:0]
	if err != nil {
		return aw.n, fmt.Errorf("ical: calendar %q: %w", c.ID, err)
	}
	return aw.n, nil
}

// streamPiece is the size of the pieces WriteTo writes: well within a
// core's cache, and large enough that a piece costs one call.
const streamPiece = 32 << 10

// appendWriter is the io.Writer an Encoder serializes into: an append to
// its buffer. The events recognise it and append their lines directly,
// without a copy through Write. With out (see WriteTo) the buffer is
// written to out and emptied whenever it holds streamPiece bytes or more.
type appendWriter struct {
	b   []byte
	out io.Writer
	n   int64 // bytes written to out
	err error // out's first error; nothing is written after it
	// sizes, when sizing, gets each event's bytes (see AppendSizes).
	sizes  []int
	sizing bool
}

func (a *appendWriter) Write(p []byte) (int, error) {
	a.b = append(a.b, p...)
	a.pieceDone()
	return len(p), a.err
}

// pieceDone writes the buffer to out once it holds a piece.
func (a *appendWriter) pieceDone() {
	if a.out != nil && len(a.b) >= streamPiece {
		a.flush()
	}
}

// flush writes the buffer to out (if any) and empties it.
func (a *appendWriter) flush() {
	if a.out == nil || len(a.b) == 0 {
		return
	}
	if a.err == nil {
		n, err := a.out.Write(a.b)
		a.n += int64(n)
		a.err = err
	}
	a.b = a.b[:0]
}

// release keeps cal's component array for the next calendar.
func (e *Encoder) release(cal *ics.Calendar) {
	clear(cal.Components)
	e.comps = cal.Components[:0]
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

// writer holds what every event of one calendar shares. Besides the inputs
// it keeps the values that are the same for every event, computed once per
// calendar (see prepare) and, once serialization starts, their content lines
// (see eventLines), so that an event costs little more than its own strings.
type writer struct {
	c     *feed.Calendar
	loc   *time.Location // nil: write UTC
	tzid  string
	stamp time.Time
	geo   string

	stampValue string // DTSTAMP value
	location   string // LOCATION value (cleaned site name), "" for none
	trigger    string // VALARM TRIGGER value

	// tzidParam is ";TZID=<tzid>" as the library writes the parameter;
	// "" when the TZID needs DQUOTEs, which the library cannot write:
	// then local times are pre-formatted lines with tzidInLine,
	// ";TZID=<quoted tzid>:".
	tzidParam  string
	tzidInLine string

	// cats caches the CATEGORIES line per distinct list of categories (a
	// feed has a handful: one per kind); catKey is the scratch lookup key.
	cats   map[string]*contentLine
	catKey []byte
	// catRecent remembers the lines of the calendar's last few lists by
	// their backing array: a catalogue's entries of one kind share one
	// list, which is then found without building its key.
	catRecent []catMemo

	// titles are the last few titles cleaned, by their array and length
	// (see cleanTitle).
	titles    [8]cleanMemo
	nextTitle int

	// descs are the DESCRIPTION lines of the last few titles (see
	// descLine), kept from one calendar to the next: a line depends on
	// its text and the serialization's configuration alone.
	descs              [8]descMemo
	nextDesc, lastDesc int

	span offsetSpan // the last offset period looked up (see offsetAt)
	day  dayDigits  // the last date written (see appendSeconds)

	// zoneFrom and zoneTo are the span the VTIMEZONE covers (UTC; zero
	// without one).
	zoneFrom, zoneTo time.Time

	// events is the backing array of the calendar's events, one per entry.
	events []vevent

	// Serialization state (see vevent.SerializeTo): the configuration, the
	// shared lines rendered for it, the event's output and a scratch copy
	// of a line being folded, both reused from event to event.
	cfg          *ics.SerializationConfiguration
	lines        eventLines
	out, scratch []byte

	// eventSize and alarmSize are the sizes of an event's and an alarm's
	// fixed parts, for size.
	eventSize, alarmSize int
}

// reset readies w for calendar c, keeping the memory it allocated for the
// previous one: the event array, the categories cache (a line depends on
// the categories alone) and the scratch buffers.
func (w *writer) reset(c *feed.Calendar) {
	clear(w.catRecent)
	for i := range w.descs {
		w.descs[i].at = nil // the last calendar's strings may be memory used again
	}
	*w = writer{c: c, stamp: c.Stamp.UTC(), cats: w.cats, catKey: w.catKey[:0], catRecent: w.catRecent[:0],
		events: w.events[:0], out: w.out[:0], scratch: w.scratch[:0], descs: w.descs, nextDesc: w.nextDesc, lastDesc: w.lastDesc}
}

// prepare computes the per-calendar values of w, once its inputs are checked.
func (w *writer) prepare() {
	w.stampValue = w.stamp.Format(utcLayout)
	w.location = cleanText(w.c.Site.Name)
	w.trigger = "-" + formatDuration(w.c.Alarm)
	if w.loc != nil {
		if libraryParamSafe(w.tzid) {
			w.tzidParam = ";" + string(ics.ParameterTzid) + "=" + w.tzid
		} else {
			w.tzidInLine = ";TZID=" + paramValue(w.tzid) + ":"
		}
	}
	if w.cats == nil {
		w.cats = make(map[string]*contentLine)
	}
	w.span = offsetSpan{from: 1, to: 0} // empty: the first lookup fills it
	if n := len(w.c.Entries); cap(w.events) >= n {
		w.events = w.events[:n]
	} else {
		w.events = make([]vevent, n)
	}

	// The fixed parts' sizes, from the lines as Marshal renders them;
	// serialization renders them again for its own configuration.
	w.setLines(&ics.SerializationConfiguration{MaxLength: 75, NewLine: "\r\n"})
	l := &w.lines
	timeLine := len("DTSTART;TZID=\"\":20060102T150405Z\r\n") + len(w.tzid)
	w.eventSize = len(l.begin) + len(l.end) + len(l.stamp) + len(l.tail) + 2*timeLine +
		len("UID:\r\nSUMMARY:\r\nDESCRIPTION:\r\n\r\n") // the last "\r\n": CATEGORIES
	w.alarmSize = len(l.alarmHead) + len(l.alarmTail) + len("DESCRIPTION:\r\n")
	w.lines = eventLines{}
}

// build returns the calendar of c and the size to reserve for its
// serialization (see writer.size).
func (e *Encoder) build(c *feed.Calendar) (*ics.Calendar, int, error) {
	if c == nil {
		return nil, 0, fmt.Errorf("ical: nil calendar")
	}
	opts := e.opts
	w := &e.w
	w.reset(c)
	fail := func(format string, args ...any) error {
		return fmt.Errorf("ical: calendar %q: "+format, append([]any{c.ID}, args...)...)
	}
	if c.Stamp.IsZero() {
		return nil, 0, fail("Stamp is zero (it must be derived from the inputs)")
	}
	if c.Refresh < 0 {
		return nil, 0, fail("Refresh %s is negative", c.Refresh)
	}
	if c.Alarm < 0 {
		return nil, 0, fail("Alarm %s is negative", c.Alarm)
	}
	geo, err := formatGeo(c.Site.Latitude, c.Site.Longitude)
	if err != nil {
		return nil, 0, fail("site %q: %w", c.Site.ID, err)
	}
	w.geo = geo
	color := strings.ToLower(strings.TrimSpace(c.Color))
	if color != "" && !cssColors()[color] {
		return nil, 0, fail("Color %q is not a CSS3 colour name (RFC 7986 COLOR)", c.Color)
	}
	for _, u := range []struct{ field, value string }{{"URL", c.URL}, {"PageURL", c.PageURL}} {
		if err := checkURI(u.value); err != nil {
			return nil, 0, fail("%s %q: %w", u.field, u.value, err)
		}
	}
	loc := c.Site.Location
	if loc == nil {
		return nil, 0, fail("site %q has no time zone", c.Site.ID)
	}
	if !c.UTC && !isUTC(loc) {
		w.loc = loc
		w.tzid = loc.String()
		if err := checkTZID(w.tzid); err != nil {
			return nil, 0, fail("site %q: %w", c.Site.ID, err)
		}
	}
	w.prepare()

	cal := ics.NewCalendarFor("heliocal")
	cal.Components = e.comps[:0]
	cal.SetProductId(opts.ProductID())
	cal.SetCalscale("GREGORIAN")
	// No METHOD: a subscribed feed is not an iTIP message (RFC 5546), and
	// METHOD:PUBLISH would oblige every event to carry an ORGANIZER (RFC 5546
	// §3.2.1; libical's restriction check flags each one without it). RFC
	// 5545 §3.6.1 asks DTSTART of every event when METHOD is absent: they all
	// have one.
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
	// No X-WR-TIMEZONE: every time already says its zone (TZID, UTC or an
	// all-day date), and a widely used expansion library reads UTC times
	// through it: an event written in UTC in the hour that repeats when
	// clocks go back comes out an hour late there (tested).
	cal.SetLastModified(w.stamp)

	if w.loc != nil {
		from, to := w.zoneSpan(e.spanEntries)
		w.zoneFrom, w.zoneTo = from, to
		cal.AddVTimezone(vtimezone(w.tzid, w.loc, from, to))
	}

	cal.Components = slices.Grow(cal.Components, len(c.Entries))
	e.seen.reset(len(c.Entries))
	for i := range c.Entries {
		ev, err := e.entry(i, i, &c.Entries[i])
		if err != nil {
			e.release(cal)
			return nil, 0, fail("%w", err)
		}
		cal.Components = append(cal.Components, ev)
	}
	return cal, w.size(cal), nil
}

// uidSet is a set of UIDs for the duplicate check: an open-addressing
// table (linear probing, at most half full) of indices into the UIDs
// added, cheaper per entry than a map, and kept from one calendar to the
// next.
type uidSet struct {
	seed  maphash.Seed
	slots []int32 // 1 + the UID's index in uids; 0 for an empty slot
	uids  []string
}

// reset empties the set, ready for about n UIDs.
func (u *uidSet) reset(n int) {
	if u.slots == nil {
		u.seed = maphash.MakeSeed()
	}
	clear(u.uids) // keep nothing of the previous calendar alive
	u.uids = u.uids[:0]
	size := 16
	for size < 2*n {
		size <<= 1
	}
	if cap(u.slots) >= size {
		u.slots = u.slots[:size]
		clear(u.slots)
	} else {
		u.slots = make([]int32, size)
	}
}

// add adds uid to the set and reports whether it was not there yet.
func (u *uidSet) add(uid string) bool {
	if 2*(len(u.uids)+1) > len(u.slots) {
		u.grow()
	}
	mask := uint64(len(u.slots) - 1)
	for i := maphash.String(u.seed, uid) & mask; ; i = (i + 1) & mask {
		switch k := u.slots[i]; {
		case k == 0:
			u.uids = append(u.uids, uid)
			u.slots[i] = int32(len(u.uids))
			return true
		case u.uids[k-1] == uid:
			return false
		}
	}
}

// grow doubles the table (reset made it 16 slots or more) and adds the
// UIDs again.
func (u *uidSet) grow() {
	u.slots = make([]int32, 2*len(u.slots))
	mask := uint64(len(u.slots) - 1)
	for k, uid := range u.uids {
		i := maphash.String(u.seed, uid) & mask
		for u.slots[i] != 0 {
			i = (i + 1) & mask
		}
		u.slots[i] = int32(k + 1)
	}
}

// entry checks entry number n, whose UID must not have been seen, and sets up
// its event in slot i of the event array.
func (e *Encoder) entry(i, n int, en *feed.Entry) (*vevent, error) {
	if en.UID == "" {
		return nil, fmt.Errorf("entry %d (%s %s): empty UID", n, en.Kind, en.Start.Format(time.RFC3339))
	}
	if !e.seen.add(en.UID) {
		return nil, fmt.Errorf("entry %d: duplicate UID %q", n, en.UID)
	}
	ev, err := e.w.event(i, en)
	if err != nil {
		return nil, fmt.Errorf("entry %q: %w", en.UID, err)
	}
	return ev, nil
}

// zoneSpan is the span the VTIMEZONE must cover: the window and every timed
// entry (of entries, nil: the calendar's), widened by zoneMargin, starting at
// a local midnight.
func (w *writer) zoneSpan(entries []feed.Entry) (from, to time.Time) {
	if entries == nil {
		entries = w.c.Entries
	}
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
	for i := range entries {
		if e := &entries[i]; !e.AllDay {
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

// size estimates the serialized size of cal, slightly above it, so that the
// output buffer is allocated once (a short estimate doubles the buffer and
// copies it; events take 400 to 800 bytes, so no constant per event fits
// every feed). It adds up the properties' names, parameters and values, the
// events' fixed lines and own values (see vevent.size) and the component
// delimiters, plus 1/16 for TEXT escaping and line folding (a fold adds 3
// octets per 74). Only the allocation depends on it, never the output.
func (w *writer) size(cal *ics.Calendar) int {
	n := len("BEGIN:VCALENDAR\r\nEND:VCALENDAR\r\n")
	for i := range cal.CalendarProperties {
		n += lineSize(&cal.CalendarProperties[i].BaseProperty)
	}
	var walk func(ics.Component)
	walk = func(c ics.Component) {
		if ev, ok := c.(*vevent); ok {
			n += ev.size()
			return
		}
		n += len("BEGIN:VTIMEZONE\r\nEND:VTIMEZONE\r\n") // the longest name
		props := c.UnknownPropertiesIANAProperties()
		for i := range props {
			n += lineSize(&props[i].BaseProperty)
		}
		for _, sub := range c.SubComponents() {
			walk(sub)
		}
	}
	for _, c := range cal.Components {
		walk(c)
	}
	return n + n/16
}

// lineSize is the unfolded, unescaped length of p's content line.
func lineSize(p *ics.BaseProperty) int {
	n := len(p.IANAToken) + len(":\r\n") + len(p.Value)
	if len(p.ICalParameters) == 0 {
		return n // most properties: skip starting a map iteration
	}
	for k, vs := range p.ICalParameters {
		n += len(k) + len(";=")
		for _, v := range vs {
			n += len(v) + len(`,""`)
		}
	}
	return n
}

// event checks entry i and sets up its VEVENT (see vevent), which holds the
// entry's own values: its times, rounded to whole seconds (an instant gets
// instantLength), and its cleaned texts. The date-time values are formatted
// when the event is written.
func (w *writer) event(i int, e *feed.Entry) (*vevent, error) {
	ev := &w.events[i]
	*ev = vevent{w: w, uid: e.UID, allDay: e.AllDay}
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
		// DTSTART;VALUE=DATE and the exclusive DTEND;VALUE=DATE.
		ev.start, ev.end = start, end
	} else {
		if e.Start.IsZero() {
			return nil, fmt.Errorf("timed entry has no Start")
		}
		if !e.End.IsZero() && e.End.Before(e.Start) {
			return nil, fmt.Errorf("End %s is before Start %s",
				e.End.UTC().Format(time.RFC3339), e.Start.UTC().Format(time.RFC3339))
		}
		// feed.ToSecond(t).UTC(), made from the Unix second
		start := time.Unix(feed.UnixSecond(e.Start), 0).UTC()
		end := time.Unix(feed.UnixSecond(e.End), 0).UTC()
		if !end.After(start) {
			end = start.Add(instantLength)
		}
		ev.start, ev.end = start, end
	}
	ev.title = w.cleanTitle(e.Title)
	// The description, the longest text, is cleaned as it is escaped (see
	// cleanTextLine): one pass over it instead of two.
	ev.desc = e.Description
	ev.cats = w.categoriesLine(e.Categories)
	alarm := entryAlarm(w.c, e)
	ev.alarm = alarm > 0 && !e.AllDay
	if ev.alarm && alarm != w.c.Alarm {
		ev.trigger = "-" + formatDuration(alarm)
	}
	return ev, nil
}

// cleanTitle returns cleanText(title), from w.titles when title is one of
// the last few strings cleaned: the entries of a kind share their title's
// string ("Sunrise"), which is then not looked at again.
func (w *writer) cleanTitle(title string) string {
	data := unsafe.StringData(title)
	for i := range w.titles {
		if m := &w.titles[i]; m.data == data && m.n == len(title) && data != nil {
			return m.clean
		}
	}
	clean := cleanText(title)
	w.titles[w.nextTitle%len(w.titles)] = cleanMemo{data, len(title), clean}
	w.nextTitle++
	return clean
}

// cleanMemo is a string known by its array and length, and its cleanText.
type cleanMemo struct {
	data  *byte
	n     int
	clean string
}

// entryAlarm is the reminder time of an entry: its own when it has one,
// else the calendar's (0: none). All-day entries never get one.
func entryAlarm(c *feed.Calendar, e *feed.Entry) time.Duration {
	if e.Alarm != nil {
		return *e.Alarm
	}
	return c.Alarm
}

// categoriesLine returns the CATEGORIES line of cats (nil when no category
// is left after cleaning), built once per distinct list.
//
// CATEGORIES is a list of TEXT values on one line: the commas between values
// must stay as they are, commas inside a value are escaped. The library would
// escape the separators too, so the line is written pre-formatted.
func (w *writer) categoriesLine(cats []string) *contentLine {
	// The same array and length within one calendar is the same list: the
	// entries are not changed while they are encoded.
	data := unsafe.SliceData(cats)
	for _, m := range w.catRecent {
		if m.data == data && m.n == len(cats) {
			return m.line
		}
	}
	line := w.categoriesLineByValue(cats)
	if data != nil && len(w.catRecent) < maxCatRecent {
		w.catRecent = append(w.catRecent, catMemo{data, len(cats), line})
	}
	return line
}

// catMemo is a list of categories known by its array and length, and its
// line (see writer.catRecent).
type catMemo struct {
	data *string
	n    int
	line *contentLine
}

// maxCatRecent bounds writer.catRecent: a feed's kinds have a handful of
// lists.
const maxCatRecent = 16

// categoriesLineByValue is categoriesLine looked up by the values.
func (w *writer) categoriesLineByValue(cats []string) *contentLine {
	// The key holds each value prefixed with its length, so that two
	// different lists never share a key; the map lookup with string(key)
	// does not allocate.
	key := w.catKey[:0]
	for _, c := range cats {
		key = binary.AppendUvarint(key, uint64(len(c)))
		key = append(key, c...)
	}
	w.catKey = key
	if line, ok := w.cats[string(key)]; ok {
		return line
	}
	var line *contentLine
	if v := categories(cats); v != "" {
		line = &contentLine{line: "CATEGORIES:" + v}
	}
	w.cats[string(key)] = line
	return line
}

// appendTime appends the DTSTART or DTEND value of a timed entry at t (UTC,
// whole seconds) and reports whether it is local time. In local mode the
// value is the site's wall clock, to be written with TZID; the library's
// SetStartAt cannot be used, since it writes UTC with a trailing "Z" even
// with a TZID. A wall clock that occurs twice (feed.ShownTwice) is written
// in UTC: RFC 5545 §3.3.5 reads such a local time as the first occurrence,
// but parsers differ (Go's time.Date, and so go-ical, picks the second one).
func (w *writer) appendTime(b []byte, t time.Time) ([]byte, bool) {
	u := t.Unix()
	if w.loc == nil {
		return w.appendSeconds(b, u, true), false
	}
	off, ambiguous := w.offsetAt(t)
	if ambiguous {
		return w.appendSeconds(b, u, true), false
	}
	// The wall clock of t in w.loc is t shifted by the offset, read in UTC.
	return w.appendSeconds(b, u+off, false), true
}

// appendSeconds is appendStamp for the instant u Unix seconds (read in
// UTC). Its date's digits are kept (w.day) for the next value, which is
// nearly always on the same date (an event's end, the next event).
func (w *writer) appendSeconds(b []byte, u int64, utc bool) []byte {
	day := u / 86400
	if u%86400 < 0 {
		day--
	}
	if !w.day.set || w.day.n != day {
		t := time.Unix(day*86400, 0).UTC()
		y, mo, d := t.Date()
		if y < 0 || y > 9999 {
			return appendStamp(b, time.Unix(u, 0), utc)
		}
		w.day = dayDigits{n: day, set: true, digits: [8]byte{byte('0' + y/1000), byte('0' + y/100%10), byte('0' + y/10%10),
			byte('0' + y%10), byte('0' + mo/10), byte('0' + mo%10), byte('0' + d/10), byte('0' + d%10)}}
	}
	s := u - day*86400
	h, mi, sec := s/3600, s/60%60, s%60
	b = append(append(b, w.day.digits[:]...), 'T',
		byte('0'+h/10), byte('0'+h%10), byte('0'+mi/10), byte('0'+mi%10), byte('0'+sec/10), byte('0'+sec%10))
	if utc {
		b = append(b, 'Z')
	}
	return b
}

// dayDigits are the digits "20060102" of day n (days since 1970-01-01).
type dayDigits struct {
	n      int64
	set    bool
	digits [8]byte
}

// appendStamp appends t (read in UTC) as "20060102T150405", with a trailing
// "Z" if utc; the same bytes as t.Format(utcLayout or localLayout) for a
// four-digit year, which is every year a feed holds (others go through
// Format).
func appendStamp(b []byte, t time.Time, utc bool) []byte {
	t = t.UTC()
	y, mo, d := t.Date()
	if y < 0 || y > 9999 {
		if utc {
			return t.AppendFormat(b, utcLayout)
		}
		return t.AppendFormat(b, localLayout)
	}
	h, mi, s := t.Clock()
	b = append(b, byte('0'+y/1000), byte('0'+y/100%10), byte('0'+y/10%10), byte('0'+y%10),
		byte('0'+mo/10), byte('0'+mo%10), byte('0'+d/10), byte('0'+d%10), 'T',
		byte('0'+h/10), byte('0'+h%10), byte('0'+mi/10), byte('0'+mi%10), byte('0'+s/10), byte('0'+s%10))
	if utc {
		b = append(b, 'Z')
	}
	return b
}

const (
	utcLayout   = "20060102T150405Z"
	localLayout = "20060102T150405"
	dateLayout  = "20060102"
)

// offsetSpan is one period [from, to) (Unix seconds) over which a zone keeps
// the UTC offset off (seconds). Instants before ambBefore or from ambFrom on
// have a wall clock that repeats (see feed.ShownTwice). Unbounded ends are
// math.MinInt64 and math.MaxInt64.
type offsetSpan struct {
	from, to           int64
	off                int64
	ambBefore, ambFrom int64
}

// offsetAt returns the offset of w.loc at t (whole seconds) and whether the
// wall clock of t is ambiguous, with the same result as feed.ShownTwice.
// Entries come mostly in time order and a zone changes offset at most a few
// times a year, so the period found for the previous entry nearly always
// holds the next one as well: only then are the zone's transitions looked up.
func (w *writer) offsetAt(t time.Time) (int64, bool) {
	u := t.Unix()
	if u < w.span.from || u >= w.span.to {
		w.span = zoneSpanAt(t, w.loc)
	}
	return w.span.off, u < w.span.ambBefore || u >= w.span.ambFrom
}

// zoneSpanAt returns the offset period of loc that holds t. Its ambiguous
// ranges restate feed.ShownTwice's two tests in Unix seconds:
// t - start < prev-off  ⇔  t < start + (prev-off), and
// end - t <= off-next   ⇔  t >= end - (off-next).
func zoneSpanAt(t time.Time, loc *time.Location) offsetSpan {
	lt := t.In(loc)
	_, off := lt.Zone()
	start, end := astro.ZonePeriod(lt)
	s := offsetSpan{from: math.MinInt64, to: math.MaxInt64, off: int64(off),
		ambBefore: math.MinInt64, ambFrom: math.MaxInt64}
	if !start.IsZero() {
		s.from = start.Unix()
		if _, prev := start.Add(-time.Second).In(loc).Zone(); prev > off {
			s.ambBefore = s.from + int64(prev-off)
		}
	}
	if !end.IsZero() {
		s.to = end.Unix()
		if _, next := end.In(loc).Zone(); next < off {
			s.ambFrom = s.to - int64(off-next)
		}
	}
	return s
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
