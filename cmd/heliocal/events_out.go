package main

import (
	"bufio"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"
	"time"
	"unicode/utf8"

	"heliocal/astro"
	"heliocal/config"
	"heliocal/feed"
)

// The events command writes its output chunk by chunk as feed.EventChunks
// computes it (JSON, CSV or the table), so memory does not grow with the
// span. An eventSink is one output format.
type eventSink interface {
	chunk(c feed.Chunk) error
	close() error // writes what ends the document and flushes
}

// newEventSink returns the writer for format ("json", "csv", "table"), or
// nil for an unknown format.
func newEventSink(format string, w io.Writer, s *config.Site, from, to time.Time) eventSink {
	bw := bufio.NewWriterSize(w, 64<<10)
	switch format {
	case "json":
		return &jsonSink{w: bw, site: s, from: from, to: to}
	case "csv":
		return newCSVSink(bw, s)
	case "table":
		return newTableSink(bw, s)
	}
	return nil
}

// jsonSink writes {"events": […], "notes": […], "site": {…}} indented by
// two spaces, byte for byte as encoding/json's Encoder with SetIndent("",
// "  ") writes the same document. Events are ordered by start across
// chunks: the events of a chunk that start after its last date are held
// back and merged with the next chunk's. Notes follow the events in the
// document, so they are kept (already encoded, about 100 bytes each) until
// the end; most places have none or a few per year.
type jsonSink struct {
	w        *bufio.Writer
	site     *config.Site
	from, to time.Time
	buf      []byte
	events   int
	notes    []byte
	held     []feed.Event // in order of start
	spare    []feed.Event // the next chunk's held events are gathered here
	ident    []int32      // the order of a chunk without one
	kinds    []jsonKind   // the kinds met so far, looked up in order
	last     int          // index + 1 in kinds of the last event's kind; 0: none yet
	lastDir  int          // the last event's direction (dirIndex)
	days     dayCache
}

// dayCache keeps the last day written as YYYY-MM-DD: consecutive events
// mostly fall on the same UTC day.
type dayCache struct {
	day  int64 // days since 1970-01-01, +1 (0: empty)
	text [10]byte
}

// appendDay appends the date of the day numbered days from 1970-01-01.
func (c *dayCache) appendDay(b []byte, days int64) []byte {
	if c.day != days+1 {
		y, m, d := civilFromDays(days)
		appendDate(c.text[:0], y, m, d)
		c.day = days + 1
	}
	return append(b, c.text[:]...)
}

// jsonKind is what the writer knows of one kind: the start of its object,
// formatted once, and how its fields are written.
type jsonKind struct {
	kind  config.Kind
	head  string // `\n    {\n      "kind": "…",\n      "start": "`
	plain bool   // written by event itself (see plainJSONKinds)
	noon  bool   // altitude_deg
	rise  bool   // day_length_s and azimuth_deg
	// next[d] is the index + 1 in kinds of the kind that followed this
	// one in direction d (none, rising, setting) the last time; 0: none
	// yet
	next [3]int
}

// jsonFlush is the size at which the writer hands its buffer on.
const jsonFlush = 256 << 10

func (j *jsonSink) chunk(c feed.Chunk) error {
	if j.events == 0 && j.buf == nil {
		// room for what is written between flushes: an event object
		// takes a few hundred bytes
		j.buf = append(make([]byte, 0, jsonFlush+16<<10), "{\n  \"events\": ["...)
	}
	loc := j.site.TimeZone.Location
	next := astro.DateStart(loc, c.Last.Year(), c.Last.Month(), c.Last.Day()+1)
	evs, order := c.Events, c.Order
	if order == nil {
		for len(j.ident) < len(evs) {
			j.ident = append(j.ident, int32(len(j.ident)))
		}
		order = j.ident[:len(evs)]
	}
	cut := len(order)
	for cut > 0 && !evs[order[cut-1]].Start.Before(next) {
		cut--
	}
	// the events held back from the chunk before go in among these,
	// before an event that starts at the same instant
	held := j.held
	for _, i := range order[:cut] {
		e := &evs[i]
		for len(held) > 0 && !e.Start.Before(held[0].Start) {
			if err := j.write(&held[0]); err != nil {
				return err
			}
			held = held[1:]
		}
		if err := j.write(e); err != nil {
			return err
		}
	}
	for len(held) > 0 && held[0].Start.Before(next) {
		if err := j.write(&held[0]); err != nil {
			return err
		}
		held = held[1:]
	}
	// held back now: the rest of those and the events that start after
	// this chunk's last date, merged by start
	keep, tail := j.spare[:0], order[cut:]
	for len(held) > 0 || len(tail) > 0 {
		if len(tail) == 0 || len(held) > 0 && !evs[tail[0]].Start.Before(held[0].Start) {
			keep, held = append(keep, held[0]), held[1:]
		} else {
			keep, tail = append(keep, evs[tail[0]]), tail[1:]
		}
	}
	j.held, j.spare = keep, j.held[:0]
	for i := range c.Notes {
		obj, err := json.MarshalIndent(toJSONNote(c.Notes[i]), "    ", "  ")
		if err != nil {
			return err
		}
		if len(j.notes) > 0 {
			j.notes = append(j.notes, ',')
		}
		j.notes = append(j.notes, "\n    "...)
		j.notes = append(j.notes, obj...)
	}
	return j.flush()
}

// write appends one event object, and hands the buffer on once it is full.
func (j *jsonSink) write(e *feed.Event) error {
	j.event(e)
	if len(j.buf) >= jsonFlush {
		return j.flush()
	}
	return nil
}

func (j *jsonSink) flush() error {
	_, err := j.w.Write(j.buf)
	j.buf = j.buf[:0]
	return err
}

// event appends one event object: the Sun's daily kinds (nearly all of a
// long listing) written directly, any other kind (and a sunrise or sunset
// over a skyline, with its direct_sun_s) through toJSONEvent and
// encoding/json.
func (j *jsonSink) event(e *feed.Event) {
	b := j.buf
	if j.events > 0 {
		b = append(b, ',')
	}
	j.events++
	k := j.kind(&e.Kind, e.Direction)
	if !k.plain || e.DirectSun || e.Open {
		obj, err := json.MarshalIndent(toJSONEvent(*e), "    ", "  ")
		if err != nil { // plain strings and finite numbers: cannot fail
			panic(err)
		}
		b = append(b, "\n    "...)
		j.buf = append(b, obj...)
		return
	}
	b = append(b, k.head...)
	b = j.days.appendUTCMillis(b, e.Start)
	if !e.End.IsZero() {
		b = append(b, "\",\n      \"end\": \""...)
		b = j.days.appendUTCMillis(b, e.End)
	}
	// the start's (or end's) closing quote up to the date's opening one,
	// in one piece; the plain kinds cross altitudes: rising or setting
	// (feed.DirectionWord)
	switch e.Direction {
	case astro.Rising:
		b = append(b, "\",\n      \"direction\": \"rising\",\n      \"date\": \""...)
	case astro.Setting:
		b = append(b, "\",\n      \"direction\": \"setting\",\n      \"date\": \""...)
	default:
		b = append(b, "\",\n      \"date\": \""...)
	}
	b = j.days.appendCivilDate(b, e.Date)
	b = append(b, '"')
	if e.Part != "" {
		b = append(b, ",\n      \"part\": "...)
		b = appendJSONString(b, e.Part)
	}
	switch {
	case k.noon || e.Part != "" && feed.MergedSpan(*e): // a merged span has a part: most events are spared the call
		b = append(b, ",\n      \"altitude_deg\": "...)
		b = appendRounded(b, e.Altitude, 4)
	case k.rise:
		b = append(b, ",\n      \"day_length_s\": "...)
		b = appendRounded(b, e.DayLength.Seconds(), 3)
		b = append(b, ",\n      \"azimuth_deg\": "...)
		b = appendRounded(b, e.Azimuth, 2)
	}
	j.buf = append(b, "\n    }"...)
}

// kind returns what the writer knows of k, the kind of an event crossing
// in direction dir, working it out the first time.
//
// The kinds of a listing follow one another in much the same order every
// day, so the kind that followed the last one (in the last one's
// direction: a threshold crossed rising is followed by another kind than
// when crossed setting) the time before is tried first.
func (j *jsonSink) kind(k *config.Kind, d astro.Direction) *jsonKind {
	dir := dirIndex(d)
	if j.last > 0 {
		if n := j.kinds[j.last-1].next[j.lastDir]; n > 0 && sameKind(&j.kinds[n-1].kind, k) {
			j.last, j.lastDir = n, dir
			return &j.kinds[n-1]
		}
	}
	for i := range j.kinds {
		if sameKind(&j.kinds[i].kind, k) {
			j.follow(i, dir)
			return &j.kinds[i]
		}
	}
	jk := jsonKind{kind: *k, plain: plainJSONKinds[k.Name], noon: k.Name == "solar-noon",
		rise: k.Name == "sunrise" || k.Name == "sunset"}
	jk.head = string(append(appendJSONString([]byte("\n    {\n      \"kind\": "), k.String()), ",\n      \"start\": \""...))
	j.kinds = append(j.kinds, jk)
	j.follow(len(j.kinds)-1, dir)
	return &j.kinds[len(j.kinds)-1]
}

// dirIndex numbers a direction for jsonKind.next: 0 none, 1 rising, 2
// setting.
func dirIndex(d astro.Direction) int {
	switch d {
	case astro.Rising:
		return 1
	case astro.Setting:
		return 2
	}
	return 0
}

// sameKind is a == b, written out so that it is inlined and kinds whose
// names differ in length are told apart at once.
func sameKind(a, b *config.Kind) bool {
	return len(a.Name) == len(b.Name) && a.Altitude == b.Altitude && a.High == b.High &&
		a.DayLength == b.DayLength && a.Name == b.Name
}

// follow records that the kind at index i, crossing in direction dir
// (dirIndex), follows the last event's kind.
func (j *jsonSink) follow(i, dir int) {
	if j.last > 0 {
		j.kinds[j.last-1].next[j.lastDir] = i + 1
	}
	j.last, j.lastDir = i+1, dir
}

// plainJSONKinds are the kinds whose JSON event.event writes itself, with
// the fields toJSONEvent gives them: kind, start, end, direction, date,
// part, and altitude_deg (solar noon; the Sun's highest or lowest in a
// golden or blue hour's span of part "all-day" or "night") or day_length_s
// and azimuth_deg (sunrise, sunset).
var plainJSONKinds = map[string]bool{
	"sunrise": true, "sunset": true, "solar-noon": true, "civil-dawn": true, "civil-dusk": true,
	"nautical-dawn": true, "nautical-dusk": true, "astronomical-dawn": true, "astronomical-dusk": true,
	"sun-altitude": true, "golden-hour": true, "blue-hour": true,
}

func (j *jsonSink) close() error {
	if j.buf == nil {
		j.buf = append(j.buf, "{\n  \"events\": ["...)
	}
	for i := range j.held {
		j.event(&j.held[i])
	}
	if j.events > 0 {
		j.buf = append(j.buf, "\n  "...)
	}
	j.buf = append(j.buf, "],\n  \"notes\": ["...)
	if len(j.notes) > 0 {
		j.buf = append(j.buf, j.notes...)
		j.buf = append(j.buf, "\n  "...)
	}
	j.buf = append(j.buf, "],\n  \"site\": "...)
	s := j.site
	site, err := json.MarshalIndent(siteJSON(s, j.from, j.to), "  ", "  ")
	if err != nil {
		return err
	}
	j.buf = append(j.buf, site...)
	j.buf = append(j.buf, "\n}\n"...)
	if err := j.flush(); err != nil {
		return err
	}
	return j.w.Flush()
}

// appendUTCMillis appends t rounded to the millisecond (feed.ToMillisecond)
// in UTC as jsonTime writes it (2027-01-01T06:42:12.854Z), for years
// 0–9999.
func (c *dayCache) appendUTCMillis(b []byte, t time.Time) []byte {
	sec, ms := t.Unix(), uint((t.Nanosecond()+500_000)/1_000_000) // half a millisecond rounds up, as time.Round
	if ms == 1000 {
		sec, ms = sec+1, 0
	}
	days, r := floorDiv(sec, 86400)
	b = c.appendDay(b, days)
	s := uint(r)
	h, m := s/3600*2, s/60%60*2 // offsets in twoDigits
	s = s % 60 * 2
	f := ms % 100 * 2
	return append(b, 'T', twoDigits[h], twoDigits[h+1], ':', twoDigits[m], twoDigits[m+1], ':',
		twoDigits[s], twoDigits[s+1], '.', byte('0'+ms/100), twoDigits[f], twoDigits[f+1], 'Z')
}

// twoDigits holds 00 to 99: the digits of n are twoDigits[2n:2n+2].
const twoDigits = "00010203040506070809101112131415161718192021222324252627282930313233343536373839" +
	"40414243444546474849505152535455565758596061626364656667686970717273747576777879" +
	"8081828384858687888990919293949596979899"

// appendCivilDate appends the UTC date of t as YYYY-MM-DD.
func (c *dayCache) appendCivilDate(b []byte, t time.Time) []byte {
	days, _ := floorDiv(t.Unix(), 86400)
	return c.appendDay(b, days)
}

// floorDiv returns the quotient rounded down and the remainder (≥ 0).
func floorDiv(a, n int64) (q int64, r int) {
	q, m := a/n, a%n
	if m < 0 {
		q, m = q-1, m+n
	}
	return q, int(m)
}

// civilFromDays returns the proleptic Gregorian date of the day numbered
// days from 1970-01-01 (the "days from civil" algorithm run backwards: H.
// Hinnant, chrono-compatible low-level date algorithms; the same dates as
// time.Time.Date).
func civilFromDays(days int64) (y, m, d int) {
	z := days + 719468
	era, _ := floorDiv(z, 146097)
	doe := z - era*146097                                  // [0, 146096]
	yoe := (doe - doe/1460 + doe/36524 - doe/146096) / 365 // [0, 399]
	doy := doe - (365*yoe + yoe/4 - yoe/100)               // [0, 365]
	mp := (5*doy + 2) / 153                                // [0, 11], from March
	d = int(doy - (153*mp+2)/5 + 1)
	m = int(mp + 3)
	if m > 12 {
		m -= 12
	}
	y = int(yoe + era*400)
	if m <= 2 {
		y++
	}
	return y, m, d
}

// appendDate appends YYYY-MM-DD.
func appendDate(b []byte, y, m, d int) []byte {
	return append(b, byte('0'+y/1000), byte('0'+y/100%10), byte('0'+y/10%10), byte('0'+y%10), '-',
		byte('0'+m/10), byte('0'+m%10), '-', byte('0'+d/10), byte('0'+d%10))
}

// appendRounded appends x rounded to digits decimals (1–6), as
// appendJSONFloat writes math.Round(x·10^digits)/10^digits: that number is
// the double nearest to the decimal n·10^−digits, and with at most 15
// significant digits no shorter decimal reads back as it, so the decimal is
// written directly. Zero (which may be −0) and larger values go through
// appendJSONFloat.
func appendRounded(b []byte, x float64, digits int) []byte {
	scale := pow10[digits]
	n := math.Round(x * scale)
	if n == 0 || !(math.Abs(n) < 1e15) {
		return appendJSONFloat(b, n/scale)
	}
	i := int64(n)
	if i < 0 {
		b, i = append(b, '-'), -i
	}
	// the digits of i from the right, into d[p:end]: the fraction's
	// digits-many (its zeros on the right dropped, and the point with them
	// when all are), then the whole part's
	u := uint64(i)
	var d [24]byte
	p, end := len(d), len(d)
	for range digits {
		p--
		d[p] = byte('0' + u%10)
		u /= 10
		if end == p+1 && d[p] == '0' {
			end = p
		}
	}
	if end > p {
		p--
		d[p] = '.'
	}
	for {
		p--
		d[p] = byte('0' + u%10)
		u /= 10
		if u == 0 {
			break
		}
	}
	return append(b, d[p:end]...)
}

var pow10 = [...]float64{1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6}

// appendJSONString appends s quoted as encoding/json writes it: plain
// printable ASCII directly, anything else through the encoder.
func appendJSONString(b []byte, s string) []byte {
	for i := 0; i < len(s); i++ {
		if c := s[i]; c < 0x20 || c >= utf8.RuneSelf || c == '"' || c == '\\' || c == '<' || c == '>' || c == '&' {
			q, _ := json.Marshal(s)
			return append(b, q...)
		}
	}
	b = append(b, '"')
	b = append(b, s...)
	return append(b, '"')
}

// appendJSONFloat appends f as encoding/json writes a float64: the shortest
// decimal that reads back exactly, in exponent form below 1e-6 and from
// 1e21 on.
func appendJSONFloat(b []byte, f float64) []byte {
	if math.IsInf(f, 0) || math.IsNaN(f) {
		return append(b, "null"...)
	}
	abs := math.Abs(f)
	if abs != 0 && (abs < 1e-6 || abs >= 1e21) {
		n := len(b)
		b = strconv.AppendFloat(b, f, 'e', -1, 64)
		// clean up e-09 to e-9, as encoding/json does
		if m := len(b) - n; m >= 4 && b[len(b)-4] == 'e' && b[len(b)-3] == '-' && b[len(b)-2] == '0' {
			b[len(b)-2] = b[len(b)-1]
			b = b[:len(b)-1]
		}
		return b
	}
	return strconv.AppendFloat(b, f, 'f', -1, 64)
}

// csvSink writes one row per event and per note, by local date (notes
// first on their date), chunk by chunk.
type csvSink struct {
	w   *bufio.Writer
	cw  *csv.Writer
	loc *time.Location
}

func newCSVSink(w *bufio.Writer, s *config.Site) *csvSink {
	c := &csvSink{w: w, cw: csv.NewWriter(w), loc: s.TimeZone.Location}
	_ = c.cw.Write(eventsCSVHeader)
	return c
}

func (c *csvSink) chunk(ch feed.Chunk) error {
	ch.Sort()
	if err := writeEventsCSVRows(c.cw, c.loc, ch.Events, ch.Notes); err != nil {
		return err
	}
	c.cw.Flush()
	return c.cw.Error()
}

func (c *csvSink) close() error {
	c.cw.Flush()
	if err := c.cw.Error(); err != nil {
		return err
	}
	return c.w.Flush()
}

// tableSink writes the readable table: a heading, then DATE, TIME, KIND
// and DETAILS columns separated by two spaces at least. A chunk's rows are
// aligned together; the column widths only grow from one chunk to the next
// (a wider zone abbreviation or kind name later in a long span shifts the
// rows after it).
type tableSink struct {
	w      *bufio.Writer
	loc    *time.Location
	o      astro.Observer // the site's: the words of band spans (feed.SpanWords)
	widths [3]int
	header bool
	rows   [][4]string
}

func newTableSink(w *bufio.Writer, s *config.Site) *tableSink {
	loc := s.TimeZone.Location
	fmt.Fprintf(w, "%s: %s, %g m, %s\n\n", s.Name, feed.Coords(s.Latitude, s.Longitude, 4), s.Elevation, loc)
	return &tableSink{w: w, loc: loc, o: feed.PlaceOf(s).Observer}
}

func (t *tableSink) chunk(ch feed.Chunk) error {
	ch.Sort()
	t.rows = t.rows[:0]
	if !t.header {
		t.rows = append(t.rows, [4]string{"DATE", "TIME", "KIND", "DETAILS"})
		t.header = true
	}
	for _, r := range mergeRows(ch.Events, ch.Notes) {
		if r.note != nil {
			t.rows = append(t.rows, [4]string{r.note.Date.Format("2006-01-02 Mon"), "-", r.note.Kind.String(), noteText(r.note)})
			continue
		}
		e := r.event
		at := "all day"
		if !e.DateOnly() {
			at = feed.ToSecond(e.Start).In(t.loc).Format("15:04:05 MST") + feed.DayMark(e.Start, e.Date, t.loc)
		}
		t.rows = append(t.rows, [4]string{e.Date.Format("2006-01-02 Mon"), at, e.Kind.String(), detailsAt(e, t.loc, t.o)})
	}
	for _, r := range t.rows {
		for i := range t.widths {
			t.widths[i] = max(t.widths[i], utf8.RuneCountInString(r[i]))
		}
	}
	for _, r := range t.rows {
		for i := range t.widths {
			t.w.WriteString(r[i])
			for range t.widths[i] - utf8.RuneCountInString(r[i]) + 2 {
				t.w.WriteByte(' ')
			}
		}
		t.w.WriteString(r[3])
		if err := t.w.WriteByte('\n'); err != nil {
			return err
		}
	}
	return nil
}

func (t *tableSink) close() error {
	if !t.header { // no chunk at all: the heading alone
		if err := t.chunk(feed.Chunk{}); err != nil {
			return err
		}
	}
	return t.w.Flush()
}

// writeEventsOnce writes events and notes already computed for the local
// dates from..to in one format, through the same writer as the streamed
// command.
func writeEventsOnce(format string, w io.Writer, s *config.Site, from, to time.Time, events []feed.Event, notes []feed.Note) error {
	out := newEventSink(format, w, s, from, to)
	if out == nil {
		return fmt.Errorf("events: unknown format %q", format)
	}
	if err := out.chunk(feed.Chunk{First: from, Last: to, Events: events, Notes: notes}); err != nil {
		return err
	}
	return out.close()
}

// writeEventsTable, writeEventsCSV and writeEventsJSON are writeEventsOnce
// for one format; the events' dates bound the JSON's site range.
func writeEventsTable(w io.Writer, s *config.Site, events []feed.Event, notes []feed.Note) error {
	from, to := eventDates(events, notes)
	return writeEventsOnce("table", w, s, from, to, events, notes)
}

func writeEventsCSV(w io.Writer, s *config.Site, events []feed.Event, notes []feed.Note) error {
	from, to := eventDates(events, notes)
	return writeEventsOnce("csv", w, s, from, to, events, notes)
}

func writeEventsJSON(w io.Writer, s *config.Site, from, to time.Time, events []feed.Event, notes []feed.Note) error {
	return writeEventsOnce("json", w, s, from, to, events, notes)
}

// eventDates returns the first and last local dates of events and notes.
func eventDates(events []feed.Event, notes []feed.Note) (first, last time.Time) {
	see := func(d time.Time) {
		if first.IsZero() || d.Before(first) {
			first = d
		}
		if d.After(last) {
			last = d
		}
	}
	for i := range events {
		see(events[i].Date)
	}
	for i := range notes {
		see(notes[i].Date)
	}
	return first, last
}
