package main

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"time"
	"unicode/utf8"

	"heliocal/astro"
	"heliocal/config"
	"heliocal/feed"
)

// The events command writes its output chunk by chunk as
// feed.PreparedChunks computes it (JSON, CSV or the table), so memory does
// not grow with the span. An eventSink is one output format: it formats a chunk on the
// goroutine that computed it, while other chunks are computed and written
// (prepare, into that goroutine's chunkOut), and writes it in the order
// of the chunks (write), doing then only what depends on the chunks
// before.
type eventSink interface {
	prepare(c *feed.Chunk, out *chunkOut) error
	write(c feed.Chunk, out *chunkOut) error
	close() error // writes what ends the document and flushes
}

// chunkOut is a chunk's output as prepare makes it ready for write. Each
// goroutine that computes chunks has its own (feed.PreparedChunks) and
// reuses its buffers from one of its chunks to the next.
type chunkOut struct {
	json  jsonPart
	csv   csvPart
	table tablePart
}

// newEventSink returns the writer for format ("json", "csv", "table"), or
// nil for an unknown format.
func newEventSink(format string, w io.Writer, s *config.Site, from, to time.Time) eventSink {
	bw := &pieceWriter{Writer: bufio.NewWriterSize(w, writePiece), raw: w}
	switch format {
	case "json":
		return &jsonSink{w: bw, site: s, from: from, to: to}
	case "csv":
		return newCSVSink(bw, s)
	case "table":
		return newTableSink(bw.Writer, s)
	}
	return nil
}

// jsonSink writes {"events": […], "notes": […], "site": {…}}: each event
// and each note on a line of its own, four spaces in, byte for byte as
// encoding/json's Marshal writes it, the rest indented by two spaces, the
// site as MarshalIndent writes it. Events are ordered by start across
// chunks: the events of a chunk that start after its last date are held
// back and merged with the next chunk's. Notes follow the events in the
// document, so they are kept (already encoded, about 100 bytes each) until
// the end; most places have none or a few per year. The events' and the
// notes' text is made by prepare (jsonPart), each object after a comma:
// write drops the comma before the document's first.
type jsonSink struct {
	w        *pieceWriter
	err      error // the first error of a write
	site     *config.Site
	from, to time.Time
	begun    bool // the document's start is written
	any      bool // an event is written
	notes    []byte
	held     eventTexts // in order of start
	spare    eventTexts // the next chunk's held events are gathered here
}

// eventTexts are the texts of events, one after the other, each after a
// comma, with where each begins and when it starts.
type eventTexts struct {
	text   []byte
	at     []int32
	starts []time.Time
}

func (t *eventTexts) len() int { return len(t.at) }

// piece returns the text of the i-th event.
func (t *eventTexts) piece(i int) []byte {
	if i+1 < len(t.at) {
		return t.text[t.at[i]:t.at[i+1]]
	}
	return t.text[t.at[i]:]
}

// add appends the i-th event of from.
func (t *eventTexts) add(from *eventTexts, i int) {
	t.at = append(t.at, int32(len(t.text)))
	t.text = append(t.text, from.piece(i)...)
	t.starts = append(t.starts, from.starts[i])
}

func (t *eventTexts) reset() {
	t.text, t.at, t.starts = t.text[:0], t.at[:0], t.starts[:0]
}

// jsonPart is a chunk's JSON as prepare makes it: its events in order of
// start, those that start after its last date apart, and its notes. What
// it knows of the kinds met is kept from chunk to chunk.
type jsonPart struct {
	text  []byte  // the events that start before the chunk's next date
	order []int32 // the chunk's events in order of start
	cut   int     // the events in text: order[:cut]
	next  time.Time
	held  eventTexts // the events order[cut:], held back
	notes []byte

	kinds  []*jsonKind // the kinds met so far, looked up in order
	bySpec []*jsonKind // the kind last met of each kind spec (Chunk.Spec)
	ident  []int32     // the order of a chunk without one
	days   dayCache
}

// dayCache keeps the last day written as YYYY-MM-DD: consecutive events
// mostly fall on the same UTC day.
type dayCache struct {
	day  int64 // days since 1970-01-01, +1 (0: empty)
	text [10]byte
}

// appendDay appends the date of the day numbered days from 1970-01-01.
func (c *dayCache) appendDay(b []byte, days int64) []byte {
	return append(b, c.dateText(days)[:]...)
}

// dateText returns the text of the day numbered days from 1970-01-01,
// made once for the days in a row that are the same.
func (c *dayCache) dateText(days int64) *[10]byte {
	if c.day != days+1 {
		c.date(days)
	}
	return &c.text
}

// date makes the day numbered days from 1970-01-01 the cached one. It is
// a function of its own so that dateText, on the path of every event,
// stays small enough to be inlined.
func (c *dayCache) date(days int64) {
	y, m, d := civilFromDays(days)
	appendDate(c.text[:0], y, m, d)
	c.day = days + 1
}

// jsonKind is what the writer knows of one kind: the start of its object,
// formatted once, and how its fields are written.
type jsonKind struct {
	kind  config.Kind
	head  string // `\n    {"kind":"…","start":"`
	plain bool   // written by event itself (see plainJSONKinds)
	noon  bool   // altitude_deg
	rise  bool   // day_length_s and azimuth_deg
	// tmpl[d] is the text of an event in direction d without end or
	// part, made at its first use; nil for a kind that is not plain or
	// whose name makes the text too long
	tmpl [3]*jsonTemplate
	// long[d]: the text in direction d does not fit a template (a kind
	// name over 80 bytes), so that it is not made again for each event
	long [3]bool
}

// jsonTemplate is the text of one kind's event in one direction, without
// end or part, from the comma before it up to the name of its first
// number (or to its end, when it has none), with zeros for the digits of
// its start and date: the event is this text with its digits written over
// the zeros and its numbers appended. The text is an array, copied whole
// without a call; the bytes after n are zeros.
type jsonTemplate struct {
	text        [jsonTemplateSize]byte
	n           int // the text's length
	start, date int // where the start's and the date's digits begin
}

// jsonTemplateSize bounds a template's text: a kind name of up to 80
// bytes fits (the rest of the longest template, a sunset's, is 109).
const jsonTemplateSize = 192

// template makes the text of the plain kind k's events in direction d
// without end or part, and returns it; nil when it does not fit.
func (k *jsonKind) template(d astro.Direction) *jsonTemplate {
	b := append([]byte{','}, k.head...)
	start := len(b)
	b = append(b, "0000-00-00T00:00:00.000Z"...)
	b = appendToDate(b, d)
	date := len(b)
	b = append(b, "0000-00-00\""...)
	switch {
	case k.noon:
		b = append(b, ",\"altitude_deg\":"...)
	case k.rise:
		b = append(b, ",\"day_length_s\":"...)
	default:
		b = append(b, '}')
	}
	if len(b) > jsonTemplateSize {
		k.long[dirIndex(d)] = true
		return nil
	}
	t := &jsonTemplate{n: len(b), start: start, date: date}
	copy(t.text[:], b)
	k.tmpl[dirIndex(d)] = t
	return t
}

func (j *jsonSink) prepare(c *feed.Chunk, out *chunkOut) error {
	p := &out.json
	loc := j.site.TimeZone.Location
	p.next = astro.DateStart(loc, c.Last.Year(), c.Last.Month(), c.Last.Day()+1)
	evs, order, spec := c.Events, c.Order, c.Spec
	if order == nil {
		for len(p.ident) < len(evs) {
			p.ident = append(p.ident, int32(len(p.ident)))
		}
		order = p.ident[:len(evs)]
	}
	if len(spec) != len(order) {
		spec = nil
	}
	cut := len(order)
	for cut > 0 && !evs[order[cut-1]].Start.Before(p.next) {
		cut--
	}
	p.order, p.cut = order, cut
	p.text = p.ordered(p.text[:0], evs, order[:cut], specs(spec, 0, cut))
	p.held.reset()
	for o, i := range order[cut:] {
		p.held.at = append(p.held.at, int32(len(p.held.text)))
		p.held.text = p.ordered(p.held.text, evs, order[cut+o:cut+o+1], specs(spec, cut+o, cut+o+1))
		p.held.starts = append(p.held.starts, evs[i].Start)
	}
	p.notes = p.notes[:0]
	for i := range c.Notes {
		obj, err := json.Marshal(toJSONNote(c.Notes[i]))
		if err != nil {
			return err
		}
		p.notes = append(p.notes, ",\n    "...)
		p.notes = append(p.notes, obj...)
	}
	return nil
}

// write writes the events prepared, with the events held back from the
// chunk before among them, and keeps the notes and the events held back
// now.
func (j *jsonSink) write(c feed.Chunk, out *chunkOut) error {
	p := &out.json
	j.begin()
	evs, order := c.Events, p.order
	// the events held back from the chunk before go in among these,
	// before an event that starts at the same instant
	h, done, at := 0, 0, 0 // held[:h] and order[:done] (text[:at]) written
	for ; h < j.held.len(); h++ {
		start := j.held.starts[h]
		q := done
		for q < p.cut && evs[order[q]].Start.Before(start) {
			q++
		}
		if q == p.cut && !start.Before(p.next) {
			break
		}
		end := at + eventAt(p.text[at:], q-done)
		j.put(p.text[at:end])
		j.put(j.held.piece(h))
		done, at = q, end
	}
	j.put(p.text[at:])
	// held back now: the rest of those and the chunk's, merged by start
	keep := &j.spare
	keep.reset()
	for t := 0; h < j.held.len() || t < p.held.len(); {
		if t == p.held.len() || h < j.held.len() && !p.held.starts[t].Before(j.held.starts[h]) {
			keep.add(&j.held, h)
			h++
		} else {
			keep.add(&p.held, t)
			t++
		}
	}
	j.held, j.spare = j.spare, j.held
	if len(p.notes) > 0 {
		n := p.notes
		if len(j.notes) == 0 {
			n = n[1:] // the comma
		}
		j.notes = append(j.notes, n...)
	}
	return j.err
}

// eventAt returns where the i-th event of text (events one after the
// other, each after a comma) begins, or len(text) when it has i events.
// Each object begins with a comma, a line break and four spaces, and no
// text within an object does: an object is one line, and a string has no
// line break.
func eventAt(text []byte, i int) int {
	at := 0
	for ; i > 0; i-- {
		n := bytes.Index(text[at+1:], jsonEventStart)
		if n < 0 {
			return len(text)
		}
		at += 1 + n
	}
	return at
}

var jsonEventStart = []byte(",\n    {")

// begin writes the start of the document, once.
func (j *jsonSink) begin() {
	if !j.begun {
		j.begun = true
		j.writeBytes([]byte("{\n  \"events\": ["))
	}
}

// put writes the text of events, without the comma before the first event
// of the document.
func (j *jsonSink) put(b []byte) {
	if len(b) == 0 {
		return
	}
	if !j.any {
		b, j.any = b[1:], true
	}
	j.writeBytes(b)
}

func (j *jsonSink) writeBytes(b []byte) {
	if err := j.w.pieces(b); err != nil && j.err == nil {
		j.err = err
	}
}

// writePiece is the most that a write hands to the system at once. Into a
// fresh file, the 20-year JSON listing (14.5 MB when it was indented one
// field per line) took 26 ms when written 64 KB at a time, 27 ms with 32 KB or 128 KB and 34 ms with 256 KB
// (medians of 8 runs after a 3 s pause each); a chunk's 360 KB at once
// took about 10 ms longer than 256 KB. (Why larger writes cost the system
// more was not looked into.)
const writePiece = 64 << 10

// pieceWriter is the buffered output of the events command, which can
// also write a chunk's text writePiece bytes at a time without copying it
// into the buffer.
type pieceWriter struct {
	*bufio.Writer // of writePiece bytes
	raw           io.Writer
}

// pieces writes b in pieces of writePiece bytes: what is buffered first,
// with the start of b up to a piece, then b's whole pieces directly, and
// its rest into the buffer.
func (w *pieceWriter) pieces(b []byte) error {
	if w.Buffered() > 0 {
		n := min(len(b), w.Available())
		if _, err := w.Write(b[:n]); err != nil {
			return err // an earlier write's, which the buffer keeps
		}
		if b = b[n:]; len(b) == 0 {
			return nil
		}
		if err := w.Flush(); err != nil {
			return err
		}
	}
	for ; len(b) >= writePiece; b = b[writePiece:] {
		if _, err := w.raw.Write(b[:writePiece]); err != nil {
			return err
		}
	}
	_, err := w.Write(b)
	return err
}

// specs is spec[from:to], or nil when spec is.
func specs(spec []int32, from, to int) []int32 {
	if spec == nil {
		return nil
	}
	return spec[from:to]
}

// ordered appends to b the objects of evs[order[0]], evs[order[1]] and on,
// the kind spec of each in spec (nil: not known).
func (p *jsonPart) ordered(b []byte, evs []feed.Event, order, spec []int32) []byte {
	for o, i := range order {
		if o%jsonBlock == 0 {
			b = jsonRoom(b, len(order)-o)
		}
		e := &evs[i]
		// the kind last met of the event's kind spec, nearly always
		var k *jsonKind
		if spec != nil && int(spec[o]) < len(p.bySpec) {
			k = p.bySpec[spec[o]]
		}
		if k == nil || !sameKind(&k.kind, &e.Kind) {
			k = p.kindOf(e, spec, o)
		}
		// nearly every event of a long listing: its kind's text with the
		// digits written in, the text made the first time
		t := k.tmpl[dirIndex(e.Direction)]
		if t == nil && k.plain && !k.long[dirIndex(e.Direction)] {
			t = k.template(e.Direction)
		}
		if t != nil && e.End.IsZero() && e.Part == "" && !e.DirectSun && !e.LongDay {
			b = p.plainEvent(b, k, t, e)
		} else {
			b = jsonRoom(p.event(b, e, k), jsonBlock)
		}
	}
	return b
}

// jsonEventRoom is the room that plainEvent needs for an event and leaves
// for the next: its text array and at most 80 bytes more (two numbers of
// up to 24 bytes, appendRounded, a field's name and the closing brace).
// ordered makes room for jsonBlock events at a time.
const (
	jsonEventRoom = jsonTemplateSize + 80
	jsonBlock     = 64
)

// jsonRoom returns b with room for the next jsonBlock events written by
// plainEvent, one after the other, so that they need not check it. When it
// grows b, it makes room for n events of 120 bytes at least (a sunrise
// takes 147, a twilight 104 to 111): the runtime clears the whole buffer
// when it allocates it, so it is not made much larger than a chunk needs.
// (The 20-year listing of 11 kinds took 1,320 page faults with 120, 1,375
// with 160, and 1,490 with 112, whose buffers a chunk outgrows.)
func jsonRoom(b []byte, n int) []byte {
	if cap(b)-len(b) < jsonBlock*jsonEventRoom {
		b = slices.Grow(b, max(jsonBlock*jsonEventRoom, n*120))
	}
	return b
}

// event appends one event object after a comma: the Sun's daily kinds
// (nearly all of a long listing) written directly, any other kind (and a
// sunrise or sunset over a skyline, with its direct_sun_s) through
// toJSONEvent and encoding/json.
func (p *jsonPart) event(b []byte, e *feed.Event, k *jsonKind) []byte {
	b = append(b, ',')
	if !k.plain || e.DirectSun || e.Open || e.LongDay {
		obj, err := json.Marshal(toJSONEvent(*e))
		if err != nil { // plain strings and finite numbers: cannot fail
			panic(err)
		}
		b = append(b, "\n    "...)
		return append(b, obj...)
	}
	b = append(b, k.head...)
	b = p.days.appendUTCMillis(b, e.Start)
	if !e.End.IsZero() {
		b = append(b, "\",\"end\":\""...)
		b = p.days.appendUTCMillis(b, e.End)
	}
	b = appendToDate(b, e.Direction)
	b = p.days.appendCivilDate(b, e.Date)
	b = append(b, '"')
	if e.Part != "" {
		b = append(b, ",\"part\":"...)
		b = appendJSONString(b, e.Part)
	}
	switch {
	case k.noon || e.Part != "" && feed.MergedSpan(*e): // a merged span has a part: most events are spared the call
		b = append(b, ",\"altitude_deg\":"...)
		b = appendRounded(b, e.Altitude, 4)
	case k.rise:
		b = append(b, ",\"day_length_s\":"...)
		b = appendRounded(b, e.DayLength.Seconds(), 3)
		b = append(b, ",\"azimuth_deg\":"...)
		b = appendRounded(b, e.Azimuth, 2)
	}
	return append(b, '}')
}

// plainEvent appends the event e of the plain kind k, without end or part,
// through k's text t for e's direction (which begins with the comma): the
// text is copied whole, e's start and date are written over its zeros,
// and its numbers follow. b has room for the whole text array and the
// numbers (jsonEventRoom). The start is cut from Unix nanoseconds (every
// instant astro serves, 1800–2200).
func (p *jsonPart) plainEvent(b []byte, k *jsonKind, t *jsonTemplate, e *feed.Event) []byte {
	n := len(b)
	w := (*[jsonTemplateSize]byte)(b[n : n+jsonTemplateSize])
	*w = t.text
	b = b[:n+t.n]
	p.days.putStamp((*[24]byte)(w[t.start:t.start+24]), e.Start.UnixNano())
	d, _ := floorDiv(e.Date.Unix(), 86400)
	*(*[10]byte)(w[t.date : t.date+10]) = *p.days.dateText(d)
	switch {
	case k.noon:
		b = appendRounded(b, e.Altitude, 4)
		b = append(b, '}')
	case k.rise:
		b = appendRounded(b, e.DayLength.Seconds(), 3)
		b = append(b, ",\"azimuth_deg\":"...)
		b = appendRounded(b, e.Azimuth, 2)
		b = append(b, '}')
	}
	return b
}

// kindOf returns what the writer knows of the kind of e, the event at
// o in the order of a chunk whose kind specs are spec (nil: none known),
// and remembers it as the kind last met of e's kind spec.
func (p *jsonPart) kindOf(e *feed.Event, spec []int32, o int) *jsonKind {
	k := p.kind(&e.Kind)
	if spec != nil {
		for int(spec[o]) >= len(p.bySpec) {
			p.bySpec = append(p.bySpec, nil)
		}
		p.bySpec[spec[o]] = k
	}
	return k
}

// kind returns what the writer knows of k, working it out the first time.
func (p *jsonPart) kind(k *config.Kind) *jsonKind {
	for _, jk := range p.kinds {
		if sameKind(&jk.kind, k) {
			return jk
		}
	}
	jk := &jsonKind{kind: *k, plain: plainJSONKinds[k.Name], noon: k.Name == "solar-noon",
		rise: k.Name == "sunrise" || k.Name == "sunset"}
	jk.head = string(append(appendJSONString([]byte("\n    {\"kind\":"), k.String()), ",\"start\":\""...))
	p.kinds = append(p.kinds, jk)
	return jk
}

// appendToDate appends what follows the digits of a start (or an end) up
// to the date's, in one piece: the closing quote, the direction (the
// plain kinds cross altitudes: rising or setting, feed.DirectionWord) and
// the date's name.
func appendToDate(b []byte, d astro.Direction) []byte {
	switch d {
	case astro.Rising:
		return append(b, "\",\"direction\":\"rising\",\"date\":\""...)
	case astro.Setting:
		return append(b, "\",\"direction\":\"setting\",\"date\":\""...)
	}
	return append(b, "\",\"date\":\""...)
}

// dirIndex numbers a direction for jsonKind.tmpl: 0 none, 1 rising, 2
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
// names differ in length are told apart at once. Names that are the same
// string (an event's kind is a copy of its kind spec's) are not compared
// byte by byte: the runtime's comparison returns at once on the same
// array.
func sameKind(a, b *config.Kind) bool {
	return len(a.Name) == len(b.Name) && a.Altitude == b.Altitude && a.High == b.High &&
		a.DayLength == b.DayLength && a.Name == b.Name
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

// appendSiteEnd appends the end of a listing's JSON document after its last
// array: the site, one field per line, and the closing brace.
func appendSiteEnd(b []byte, s *config.Site, from, to time.Time) ([]byte, error) {
	site, err := json.MarshalIndent(siteJSON(s, from, to), "  ", "  ")
	if err != nil {
		return b, err
	}
	b = append(b, ",\n  \"site\": "...)
	b = append(b, site...)
	return append(b, "\n}\n"...), nil
}

func (j *jsonSink) close() error {
	j.begin()
	for h := range j.held.len() {
		j.put(j.held.piece(h))
	}
	var b []byte
	if j.any {
		b = append(b, "\n  "...)
	}
	b = append(b, "],\n  \"notes\": ["...)
	if len(j.notes) > 0 {
		b = append(b, j.notes...)
		b = append(b, "\n  "...)
	}
	b, err := appendSiteEnd(append(b, ']'), j.site, j.from, j.to)
	if err != nil {
		return err
	}
	j.writeBytes(b)
	if j.err != nil {
		return j.err
	}
	return j.w.Flush()
}

// appendUTCMillis appends t rounded to the millisecond (feed.ToMillisecond)
// in UTC as feed.JSONTime writes it (2027-01-01T06:42:12.854Z), for years
// 0–9999.
func (c *dayCache) appendUTCMillis(b []byte, t time.Time) []byte {
	sec, ms := t.Unix(), uint((t.Nanosecond()+500_000)/1_000_000) // half a millisecond rounds up, as time.Round
	if ms == 1000 {
		sec, ms = sec+1, 0
	}
	days, r := floorDiv(sec, 86400)
	b = c.appendDay(b, days)
	s := uint(r)
	h, m, f := digitPairs[uint8(s/3600)], digitPairs[uint8(s/60%60)], digitPairs[uint8(ms%100)]
	sp := digitPairs[uint8(s%60)]
	return append(b, 'T', h[0], h[1], ':', m[0], m[1], ':', sp[0], sp[1], '.', byte('0'+ms/100), f[0], f[1], 'Z')
}

// putStamp writes the instant ns (Unix nanoseconds, 1800–2200) rounded to
// the millisecond (feed.ToMillisecond) in UTC into st as feed.JSONTime writes
// it, YYYY-MM-DDThh:mm:ss.mmmZ: its digits, over a text that has the rest.
// It counts from stampDays days before 1970 (in 1790), so that every
// division is one of unsigned numbers by a constant: a multiplication.
func (c *dayCache) putStamp(st *[24]byte, ns int64) {
	ms := (uint64(ns) + stampDays*86_400_000_000_000 + 500_000) / 1_000_000 // half a millisecond rounds up, as time.Round
	days := ms / 86_400_000
	r := uint32(ms - days*86_400_000)
	*(*[10]byte)(st[:10]) = *c.dateText(int64(days) - stampDays)
	s := r / 1000
	f := r - s*1000
	h := s / 3600
	s -= h * 3600
	m := s / 60
	s -= m * 60
	f1 := f / 100
	*(*[2]byte)(st[11:13]) = digitPairs[uint8(h)]
	*(*[2]byte)(st[14:16]) = digitPairs[uint8(m)]
	*(*[2]byte)(st[17:19]) = digitPairs[uint8(s)]
	st[20] = byte('0' + f1)
	*(*[2]byte)(st[21:23]) = digitPairs[uint8(f-f1*100)]
}

// stampDays is the number of days putStamp counts from before 1970: its
// nanoseconds (5.7e18) fit an int64.
const stampDays = 1 << 16

// digitPairs holds the two digits of 0 to 99 at their index, in a table
// that a byte indexes without a bounds check.
var digitPairs = func() (p [256][2]byte) {
	for n := range 100 {
		p[n] = [2]byte{byte('0' + n/10), byte('0' + n%10)}
	}
	return p
}()

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
	if n < 0 {
		b, n = append(b, '-'), -n
	}
	// the digits from the right, two at a time, into d[p:24]: the
	// fraction's (its zeros on the right dropped, and the point with them
	// when all are), then the whole part's
	u := uint64(n)
	whole, frac := u/pow10i[digits], u%pow10i[digits]
	var d [48]byte
	p := 24
	if frac != 0 {
		for frac%10 == 0 {
			frac, digits = frac/10, digits-1
		}
		for ; digits >= 2; digits -= 2 {
			p -= 2
			*(*[2]byte)(d[p:]) = digitPairs[uint8(frac%100)]
			frac /= 100
		}
		if digits == 1 {
			p--
			d[p] = byte('0' + frac)
		}
		p--
		d[p] = '.'
	}
	for whole >= 100 {
		p -= 2
		*(*[2]byte)(d[p:]) = digitPairs[uint8(whole%100)]
		whole /= 100
	}
	if whole >= 10 {
		p -= 2
		*(*[2]byte)(d[p:]) = digitPairs[uint8(whole)]
	} else {
		p--
		d[p] = byte('0' + whole)
	}
	// with room in b, the 24 bytes from d[p] copied whole, without a
	// call, and b cut after the digits
	at := len(b)
	if cap(b)-at < 24 {
		return append(b, d[p:24]...)
	}
	*(*[24]byte)(b[at : at+24]) = *(*[24]byte)(d[p : p+24])
	return b[:at+24-p]
}

var (
	pow10  = [...]float64{1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6}
	pow10i = [...]uint64{1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6}
)

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
	w   *pieceWriter
	loc *time.Location
}

// csvPart is a chunk's rows as prepare writes them.
type csvPart struct {
	buf bytes.Buffer
	cw  *csv.Writer // writes to buf
}

// newCSVSink writes the header into w's buffer, which is empty: that
// cannot fail.
func newCSVSink(w *pieceWriter, s *config.Site) *csvSink {
	cw := csv.NewWriter(w)
	_ = cw.Write(eventsCSVHeader)
	cw.Flush()
	return &csvSink{w: w, loc: s.TimeZone.Location}
}

func (c *csvSink) prepare(ch *feed.Chunk, out *chunkOut) error {
	p := &out.csv
	if p.cw == nil {
		p.cw = csv.NewWriter(&p.buf)
	}
	p.buf.Reset()
	ch.Sort()
	if err := writeEventsCSVRows(p.cw, c.loc, ch.Events, ch.Notes); err != nil {
		return err
	}
	p.cw.Flush()
	return p.cw.Error()
}

func (c *csvSink) write(_ feed.Chunk, out *chunkOut) error {
	return c.w.pieces(out.csv.buf.Bytes())
}

func (c *csvSink) close() error {
	return c.w.Flush()
}

// tableSink writes the readable table: a heading, then DATE, TIME, KIND
// and DETAILS columns separated by two spaces at least. The streamed
// command sets the TIME and KIND columns' widths before the first row
// (expect): as wide as the zone's longest label over the dates and the
// longest kind asked for, so that a "CEST" after "CET" or a
// "september-equinox" late in a long span does not push the rows after it
// out of line with the heading. A column wider still in a chunk (a day
// mark, " +1 day", of a time past midnight) widens it from that chunk on.
type tableSink struct {
	w      *bufio.Writer
	loc    *time.Location
	o      astro.Observer // the site's: the words of band spans (feed.SpanWords)
	widths [3]int
	header bool
}

// tablePart is a chunk's rows as prepare makes them, and the widths of
// their first three columns.
type tablePart struct {
	rows   [][4]string
	widths [3]int
}

func newTableSink(w *bufio.Writer, s *config.Site) *tableSink {
	loc := s.TimeZone.Location
	place := feed.Coords(s.Latitude, s.Longitude, 4)
	if s.Name != place { // a place named by its coordinates alone is not named twice
		place = s.Name + ": " + place
	}
	// what the times are for besides the place, when it is not the flat
	// horizon and the standard refraction, in the words of the index's
	// place lines
	var cond string
	if c := feed.SiteOf(s).Conditions(); c != "" {
		cond = ", " + c
	}
	o := feed.PlaceOf(s).Observer
	fmt.Fprintf(w, "%s, %s m%s, %s\n\n", place, signed(s.Elevation, -1), cond, loc)
	return &tableSink{w: w, loc: loc, o: o}
}

func (t *tableSink) prepare(ch *feed.Chunk, out *chunkOut) error {
	ch.Sort()
	p := &out.table
	p.rows, p.widths = p.rows[:0], [3]int{}
	for _, r := range mergeRows(ch.Events, ch.Notes) {
		if r.note != nil {
			p.rows = append(p.rows, [4]string{r.note.Date.Format("2006-01-02 Mon"), "-", r.note.Kind.String(), noteText(r.note, t.loc)})
			continue
		}
		e := r.event
		at := "all day"
		if !e.DateOnly() {
			at = feed.LocalClock(feed.ToSecond(e.Start), t.loc, true) + feed.DayMark(e.Start, e.Date, t.loc)
		}
		p.rows = append(p.rows, [4]string{e.Date.Format("2006-01-02 Mon"), at, e.Kind.String(), detailsAt(e, t.loc, t.o)})
	}
	for _, r := range p.rows {
		p.widths = rowWidths(p.widths, &r)
	}
	return nil
}

// rowWidths returns widths widened to r's first three columns.
func rowWidths(widths [3]int, r *[4]string) [3]int {
	for i := range widths {
		widths[i] = max(widths[i], utf8.RuneCountInString(r[i]))
	}
	return widths
}

// expect widens the TIME and KIND columns to what the kinds of specs can
// write over the local dates from..to when they take more than one chunk
// (feed.ChunkDays dates): every kind's name (a group's members': "seasons"
// lists "september-equinox") and a clock, "06:47:12 CEST", with each label
// the zone has over those dates (astro.ZoneChanges). A kind of a few dates
// a year may then have a column wider than its rows need (a march-equinox
// asked over a span without one); the dates of one chunk are aligned by
// their own rows.
func (t *tableSink) expect(specs []config.KindSpec, from, to time.Time) {
	day := func(d time.Time) time.Time { return time.Date(d.Year(), d.Month(), d.Day(), 0, 0, 0, 0, time.UTC) }
	if day(to).Sub(day(from)) < feed.ChunkDays*24*time.Hour {
		return
	}
	for _, s := range specs {
		for _, k := range s.Kind.Members() {
			t.widths[2] = max(t.widths[2], utf8.RuneCountInString(k.String()))
		}
	}
	start := time.Date(from.Year(), from.Month(), from.Day(), 0, 0, 0, 0, t.loc)
	end := time.Date(to.Year(), to.Month(), to.Day()+1, 0, 0, 0, 0, t.loc)
	label := func(at time.Time) {
		t.widths[1] = max(t.widths[1], len("15:04:05 ")+utf8.RuneCountInString(feed.ZoneLabel(zoneAbbr(at))))
	}
	label(start)
	for at := range astro.ZoneChanges(t.loc, start, end) {
		label(at)
	}
}

// zoneAbbr is the abbreviation of t's zone at t.
func zoneAbbr(t time.Time) string {
	abbr, _ := t.Zone()
	return abbr
}

// tableHeading is the table's first row.
var tableHeading = [4]string{"DATE", "TIME", "KIND", "DETAILS"}

func (t *tableSink) write(_ feed.Chunk, out *chunkOut) error {
	p := &out.table
	rows := p.rows
	if !t.header {
		t.header = true
		t.widths = rowWidths(t.widths, &tableHeading)
		rows = append([][4]string{tableHeading}, rows...)
	}
	for i := range t.widths {
		t.widths[i] = max(t.widths[i], p.widths[i])
	}
	for _, r := range rows {
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
		if err := t.write(feed.Chunk{}, &chunkOut{}); err != nil {
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
	c, o := feed.Chunk{First: from, Last: to, Events: events, Notes: notes}, &chunkOut{}
	if err := out.prepare(&c, o); err != nil {
		return err
	}
	if err := out.write(c, o); err != nil {
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
