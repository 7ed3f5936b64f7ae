package ical

import (
	"io"
	"math/bits"
	"time"
	"unicode"
	"unicode/utf8"
	"unsafe"

	ics "github.com/arran4/golang-ical"
)

// vevent is one VEVENT, with its VALARM if any, as a golang-ical Component
// that writes its own content lines. The calendar (header, VTIMEZONE,
// component order, the SerializeTo entry point) stays golang-ical's; only
// the events bypass the library's per-property serializer, which builds
// every content line in a fresh strings.Builder, escapes TEXT through a
// strings.Replacer and folds by slicing strings: it was measured at 4.2-4.7
// µs and 45 allocations per event, about 40% of the CPU of publishing a
// thousand feeds (BenchmarkPublishFleet). SerializeTo writes the same bytes
// with one reused buffer and no allocation, in under 1 µs per event (see
// BenchmarkMarshal): the same properties in the same order
// (those the library's setters wrote: NewEvent, SetDtStampTime,
// SetAllDayStartAt or SetProperty with TZID, SetSummary, SetDescription,
// SetLocation, GEO, SetTimeTransparency, X-MICROSOFT-CDO-BUSYSTATUS, then
// the pre-formatted lines and the VALARM), the library's TEXT escaping (escapeText) and its folding
// (libraryFold), and the pre-formatted lines folded as contentLine folds
// them. TestMarshalMatchesReference, TestEventsOtherConfigurations and
// FuzzMarshalMatchesReference hold the output byte-identical to the
// library's own serialization of the same event (reference_test.go): a
// change here must keep them passing, and a new golang-ical version must be
// checked against them before it is taken.
type vevent struct {
	w          *writer
	uid        string
	title      string       // cleaned SUMMARY, "" for none
	desc       string       // DESCRIPTION as given (cleaned as it is written), "" for none
	cats       *contentLine // the CATEGORIES line, nil for none
	start, end time.Time    // UTC, whole seconds; all-day: the dates at 00:00
	allDay     bool
	alarm      bool
	trigger    string // the entry's own TRIGGER value; "" for the calendar's
}

var _ ics.Component = (*vevent)(nil)

func (ev *vevent) UnknownPropertiesIANAProperties() []ics.IANAProperty { return nil }
func (ev *vevent) SubComponents() []ics.Component                      { return nil }

// eventLines are the content lines shared by every event of a calendar,
// rendered (folded, with newlines) for one serialization configuration.
type eventLines struct {
	max     int    // cfg.MaxLength they were rendered for
	newline string // cfg.NewLine they were rendered for

	begin, end []byte // BEGIN:VEVENT, END:VEVENT
	stamp      []byte // DTSTAMP
	// tail: LOCATION, GEO, TRANSP, X-MICROSOFT-CDO-BUSYSTATUS.
	tail []byte
	// alarmHead is BEGIN:VALARM and ACTION, alarmTail TRIGGER and
	// END:VALARM; the alarm's DESCRIPTION goes between them.
	alarmHead, alarmTail []byte

	// summaries are the SUMMARY lines of the last titles written (see
	// summaryLine): a feed's titles repeat from date to date (the
	// fleet benchmark's feeds have six a day).
	summaries   [8]titleLine
	nextSummary int

	// The lines an event's own values go between, joined where nothing
	// of the event's comes between them (see appendTo): head is
	// BEGIN:VEVENT and the UID's name; startLines[k] the end of the UID
	// line, DTSTAMP and DTSTART's name and parameter for a value of kind
	// k (timeDate, timeLocal, timeUTC), endLines[k] the end of the
	// DTSTART line and DTEND's name and parameter; startName[k] and
	// endName[k] are the lengths of the two lines before their value.
	// The joined lines serve only where each line fits unfolded, and not
	// for a local time whose TZID needs DQUOTEs (!tzidPlain), which goes
	// after the other lines.
	head                 []byte
	startLines, endLines [3][]byte
	startName, endName   [3]int
	tzidPlain            bool
	// closings are the lines that end the events without an alarm of
	// the last few lists of categories (LOCATION to END:VEVENT), by
	// their CATEGORIES line (nil for none): see closing.
	closings    [8]closingLines
	nextClosing int
}

// The kinds of a DTSTART or DTEND value in appendTo: a DATE, a local
// time with the TZID parameter, a time in UTC.
const (
	timeDate = iota
	timeLocal
	timeUTC
)

// closingLines are the lines after an event's DESCRIPTION, when it has no
// alarm, for one CATEGORIES line.
type closingLines struct {
	cats  *contentLine
	set   bool
	lines []byte
}

// titleLine is a title and its SUMMARY line.
type titleLine struct {
	title string
	line  []byte
}

// summaryLine appends the SUMMARY line of title, as textLine writes it:
// from w.lines.summaries when one of the last few titles was the same
// ("Sunrise", "Golden hour (morning)"), so that most are copied, not
// escaped and measured for folding again.
func (w *writer) summaryLine(b []byte, title string) []byte {
	l := &w.lines
	for i := range l.summaries {
		// the same string as a rule (a kind's entries share their
		// title's), told without comparing the octets
		if m := &l.summaries[i]; m.line != nil && len(m.title) == len(title) &&
			(unsafe.StringData(m.title) == unsafe.StringData(title) || m.title == title) {
			return append(b, m.line...)
		}
	}
	start := len(b)
	b = w.textLine(b, "SUMMARY:", title)
	m := &l.summaries[l.nextSummary%len(l.summaries)]
	l.nextSummary++
	m.title, m.line = title, append(m.line[:0], b[start:]...)
	return b
}

// setLines renders w.lines for cfg unless they already are.
func (w *writer) setLines(cfg *ics.SerializationConfiguration) {
	w.cfg = cfg
	l := &w.lines
	if l.begin != nil && l.max == cfg.MaxLength && l.newline == cfg.NewLine {
		return
	}
	*l = eventLines{max: cfg.MaxLength, newline: cfg.NewLine}
	l.begin = append([]byte("BEGIN:VEVENT"), cfg.NewLine...)
	l.end = append([]byte("END:VEVENT"), cfg.NewLine...)
	l.stamp = w.plainLine(nil, "DTSTAMP:", w.stampValue)
	if w.location != "" {
		l.tail = w.textLine(l.tail, "LOCATION:", w.location)
	}
	l.tail = w.plainLine(l.tail, "GEO:", w.geo) // FLOAT: not escaped
	l.tail = w.textLine(l.tail, "TRANSP:", string(ics.TransparencyTransparent))
	l.tail = w.textLine(l.tail, "X-MICROSOFT-CDO-BUSYSTATUS:", "FREE") // unknown to the library: TEXT
	// No SEQUENCE: an event never revised has sequence 0, which RFC 5546
	// §3.2.2 asks to leave out ("MUST be present if value is greater than
	// 0"). No LAST-MODIFIED per event: in a calendar without METHOD,
	// DTSTAMP is equivalent to it (RFC 5545 §3.8.7.2), and it held the
	// calendar's own LAST-MODIFIED anyway. 44 octets an event fewer.
	l.alarmHead = append([]byte("BEGIN:VALARM"), cfg.NewLine...)
	l.alarmHead = w.textLine(l.alarmHead, "ACTION:", string(ics.ActionDisplay))
	l.alarmTail = w.plainLine(nil, "TRIGGER:", w.trigger)
	l.alarmTail = append(append(l.alarmTail, "END:VALARM"...), cfg.NewLine...)

	l.head = append(append([]byte(nil), l.begin...), "UID:"...)
	params := [3]string{timeDate: ";VALUE=DATE", timeLocal: w.tzidParam, timeUTC: ""}
	for k, p := range params {
		l.startLines[k] = append(append(append(append([]byte(cfg.NewLine), l.stamp...), "DTSTART"...), p...), ':')
		l.endLines[k] = append(append(append([]byte(cfg.NewLine), "DTEND"...), p...), ':')
		l.startName[k], l.endName[k] = len("DTSTART")+len(p)+1, len("DTEND")+len(p)+1
	}
	l.tzidPlain = w.tzidParam != ""
}

// closing returns the lines that end an event without an alarm whose
// CATEGORIES line is cats (nil for none), as appendTo writes them: the
// shared LOCATION to X-MICROSOFT-CDO-BUSYSTATUS, CATEGORIES, END:VEVENT.
// A feed has a few lists of categories, one per kind: the last few are
// kept.
func (w *writer) closing(cats *contentLine) []byte {
	l := &w.lines
	for i := range l.closings {
		if c := &l.closings[i]; c.set && c.cats == cats {
			return c.lines
		}
	}
	c := &l.closings[l.nextClosing%len(l.closings)]
	l.nextClosing++
	b := append(c.lines[:0], l.tail...)
	if cats != nil {
		start := len(b)
		b = w.endRawLine(append(b, cats.line...), start)
	}
	*c = closingLines{cats: cats, set: true, lines: append(b, l.end...)}
	return c.lines
}

// SerializeTo writes the event's content lines to out in one Write, or
// appends them straight to the buffer when out is an Encoder's (see
// appendWriter).
func (ev *vevent) SerializeTo(out io.Writer, cfg *ics.SerializationConfiguration) error {
	w := ev.w
	w.setLines(cfg)
	if aw, ok := out.(*appendWriter); ok {
		n := len(aw.b)
		aw.b = ev.appendTo(aw.b)
		if aw.sizing {
			aw.sizes = append(aw.sizes, len(aw.b)-n)
		}
		aw.pieceDone()
		return aw.err
	}
	w.out = ev.appendTo(w.out[:0])
	_, err := out.Write(w.out)
	return err
}

// appendTo appends the event's content lines, rendered for w.cfg, to b.
//
// An event whose UID, DTSTART and DTEND lines need neither escaping nor
// folding, nor a TZID in DQUOTEs, and that has no alarm (nearly every
// event) is written from the joined lines of w.lines (see eventLines.head)
// with its own values between them: the same bytes as appendLines, in a
// third of the appends.
func (ev *vevent) appendTo(b []byte) []byte {
	w := ev.w
	l := &w.lines
	maxLen := w.cfg.MaxLength
	if len("UID:")+len(ev.uid) > maxLen || nextEscape(ev.uid, 0) < len(ev.uid) {
		return ev.appendLines(b)
	}
	var kinds [2]int
	var times [2 * len(utcLayout)]byte
	tv := times[:0]
	n := 0
	if ev.allDay {
		tv = ev.start.AppendFormat(tv, dateLayout)
		n = len(tv)
		tv = ev.end.AppendFormat(tv, dateLayout)
	} else {
		var local bool
		tv, local = w.appendTime(tv, ev.start)
		kinds[0] = timeUTC
		if local {
			kinds[0] = timeLocal
		}
		n = len(tv)
		tv, local = w.appendTime(tv, ev.end)
		kinds[1] = timeUTC
		if local {
			kinds[1] = timeLocal
		}
	}
	if ev.alarm || l.startName[kinds[0]]+n > maxLen || l.endName[kinds[1]]+len(tv)-n > maxLen ||
		(kinds[0] == timeLocal || kinds[1] == timeLocal) && !l.tzidPlain {
		return ev.appendLines(b)
	}
	b = append(append(b, l.head...), ev.uid...)
	b = append(append(b, l.startLines[kinds[0]]...), tv[:n]...)
	b = append(append(b, l.endLines[kinds[1]]...), tv[n:]...)
	b = append(b, w.cfg.NewLine...)
	if ev.title != "" {
		b = w.summaryLine(b, ev.title)
	}
	if ev.desc != "" {
		b = w.descLine(b, ev.title, ev.desc)
	}
	return append(b, w.closing(ev.cats)...)
}

// appendLines is appendTo for any event, line by line.
func (ev *vevent) appendLines(b []byte) []byte {
	w := ev.w
	b = append(b, w.lines.begin...)
	b = w.textLine(b, "UID:", ev.uid)
	b = append(b, w.lines.stamp...)

	// DTSTART and DTEND. A local time whose TZID the library would
	// backslash-escape is a pre-formatted line after the properties
	// (deferred here), as timeProp placed it.
	var times [2 * len("20060102T150405Z")]byte
	var local [2]bool
	tv := times[:0]
	var n int
	if ev.allDay {
		tv = ev.start.AppendFormat(tv, dateLayout)
		n = len(tv)
		tv = ev.end.AppendFormat(tv, dateLayout)
	} else {
		tv, local[0] = w.appendTime(tv, ev.start)
		n = len(tv)
		tv, local[1] = w.appendTime(tv, ev.end)
	}
	values := [2][]byte{tv[:n], tv[n:]}
	names := [2]string{"DTSTART", "DTEND"}
	deferred := [2]bool{}
	for i, v := range values {
		start := len(b)
		b = append(b, names[i]...)
		switch {
		case ev.allDay:
			b = append(b, ";VALUE=DATE"...)
		case local[i] && w.tzidParam == "":
			deferred[i] = true
			b = b[:start]
			continue
		case local[i]:
			b = append(b, w.tzidParam...)
		}
		b = append(append(b, ':'), v...)
		b = w.endLine(b, start)
	}

	if ev.title != "" {
		b = w.summaryLine(b, ev.title)
	}
	if ev.desc != "" {
		b = w.descLine(b, ev.title, ev.desc)
	}
	b = append(b, w.lines.tail...)
	for i, v := range values {
		if deferred[i] {
			start := len(b)
			b = append(append(append(b, names[i]...), w.tzidInLine...), v...)
			b = w.endRawLine(b, start)
		}
	}
	if ev.cats != nil {
		start := len(b)
		b = w.endRawLine(append(b, ev.cats.line...), start)
	}
	if ev.alarm {
		b = append(b, w.lines.alarmHead...)
		desc := ev.title // required for DISPLAY
		if desc == "" {
			desc = "Reminder"
		}
		b = w.textLine(b, "DESCRIPTION:", desc)
		if ev.trigger != "" {
			b = w.plainLine(b, "TRIGGER:", ev.trigger)
			b = append(append(b, "END:VALARM"...), w.cfg.NewLine...)
		} else {
			b = append(b, w.lines.alarmTail...)
		}
	}
	return append(b, w.lines.end...)
}

// size is an estimate of the event's serialized size (see writer.size).
func (ev *vevent) size() int {
	w := ev.w
	n := w.eventSize + len(ev.uid) + len(ev.title) + len(ev.desc)
	if ev.cats != nil {
		n += len(ev.cats.line)
	}
	if ev.alarm {
		n += w.alarmSize + max(len(ev.title), len("Reminder")) + len(ev.trigger)
	}
	return n
}

// plainLine appends the content line prefix+value ("NAME:" or
// "NAME;PARAM=V:" as prefix), value unescaped, folded as the library folds.
func (w *writer) plainLine(b []byte, prefix, value string) []byte {
	start := len(b)
	b = append(append(b, prefix...), value...)
	return w.endLine(b, start)
}

// textLine is plainLine for a TEXT value, escaped as the library escapes it.
func (w *writer) textLine(b []byte, prefix, value string) []byte {
	start := len(b)
	b = escapeText(append(b, prefix...), value)
	return w.endLine(b, start)
}

// cleanTextLine is textLine for a value not yet cleaned: it is cleaned
// (cleanText) as it is escaped, in one pass, and the line is left out, as
// textLine's caller leaves it out, when nothing is left of the value. It
// reports whether the value was clean as given (not normalised, not
// empty); then, with cuts, it appends to *cuts where the escaped line
// (left in w.scratch) was folded (see foldCuts).
//
// The line is escaped into w.scratch and folded from there into b, so that
// a long line is copied once, not written to b, copied out and folded back.
func (w *writer) cleanTextLine(b []byte, prefix, value string, cuts *[]int32) ([]byte, bool) {
	line, ok := escapeCleanText(append(w.scratch[:0], prefix...), value)
	if !ok {
		value = normaliseText(value)
		if value == "" {
			w.scratch = line
			return b, false
		}
		line = escapeText(line[:len(prefix)], value)
	}
	w.scratch = line
	if len(line) <= w.cfg.MaxLength {
		return append(append(b, line...), w.cfg.NewLine...), ok
	}
	if !ok {
		cuts = nil
	}
	return foldCuts(b, line, w.cfg.MaxLength, w.cfg.NewLine, validCut, cuts), ok
}

// endLine ends the unfolded content line b[start:] as the library's
// BaseProperty.SerializeTo does: folded by libraryFold when it is longer
// than cfg.MaxLength, then the newline.
func (w *writer) endLine(b []byte, start int) []byte {
	if len(b)-start <= w.cfg.MaxLength {
		return append(b, w.cfg.NewLine...)
	}
	w.scratch = append(w.scratch[:0], b[start:]...)
	return libraryFold(b[:start], w.scratch, w.cfg.MaxLength, w.cfg.NewLine)
}

// endRawLine ends the unfolded pre-formatted line b[start:] as
// contentLine.SerializeTo does.
func (w *writer) endRawLine(b []byte, start int) []byte {
	if max := w.cfg.MaxLength; max >= 5 && len(b)-start <= max {
		return append(b, w.cfg.NewLine...)
	}
	w.scratch = append(w.scratch[:0], b[start:]...)
	return appendFold(b[:start], w.scratch, w.cfg.MaxLength, w.cfg.NewLine)
}

// escapeText appends s with the TEXT escaping of golang-ical's ToText
// (RFC 5545 §3.3.11): backslash, semicolon and comma get a backslash, a
// newline becomes `\n`; nothing else changes.
func escapeText(b []byte, s string) []byte {
	from := 0
	for i := nextEscape(s, 0); i < len(s); i = nextEscape(s, i+1) {
		b = append(append(b, s[from:i]...), '\\', textEscapes[s[i]])
		from = i + 1
	}
	return append(b, s[from:]...)
}

// escapeCleanText is escapeText(b, cleanText(s)) for a text cleanText
// leaves as it is, checked as it is escaped; it reports false, with part
// of s appended, for any other text (invalid UTF-8, or a control character
// other than HTAB and LF), which the caller normalises first. Octets are
// tested 8 at a time, for escaping and cleaning at once (escapeMask and
// cleanMask), going straight to the first one that needs a look.
func escapeCleanText(b []byte, s string) ([]byte, bool) {
	from, i := 0, 0
	for {
		for i+8 <= len(s) {
			x := load64(s, i)
			if m := escapeCleanMask(x); m != 0 {
				i += bits.TrailingZeros64(m) / 8
				break
			}
			i += 8
		}
		for i < len(s) && cleanAscii[s[i]] {
			i++
		}
		if i >= len(s) {
			return append(b, s[from:]...), true
		}
		switch c := s[i]; {
		case textEscapes[c] != 0:
			b = append(append(b, s[from:i]...), '\\', textEscapes[c])
			i++
			from = i
		case c == '\t':
			i++
		case c < utf8.RuneSelf: // another control character
			return b, false
		case c >= 0xc2 && c <= 0xdf && i+1 < len(s) && s[i+1]&0xc0 == 0x80 && (c > 0xc2 || s[i+1] >= 0xa0):
			// A two-octet sequence ("°", "é") that is not a C1 control
			// (U+0080-U+009F): what the general case below accepts,
			// without decoding.
			i += 2
		default:
			r, size := utf8.DecodeRuneInString(s[i:])
			if (r == utf8.RuneError && size == 1) || unicode.IsControl(r) {
				return b, false
			}
			i += size
		}
	}
}

// cleanAscii holds the octets escapeCleanText copies without a look:
// printable ASCII other than backslash, semicolon and comma.
var cleanAscii = func() (t [256]bool) {
	for c := ' '; c < 0x7f; c++ {
		t[c] = textEscapes[c] == 0
	}
	return t
}()

// nextEscape returns the index of the first octet of s at or after i that
// escapeText escapes, or len(s) if there is none. It tests 8 octets at a
// time and goes straight to the first one found (the lowest flag of
// escapeMask), so a text with a comma or newline every few words costs
// one test per 8 octets, not one per octet after each of them.
func nextEscape(s string, i int) int {
	for ; i+8 <= len(s); i += 8 {
		if m := escapeMask(load64(s, i)); m != 0 {
			return i + bits.TrailingZeros64(m)/8
		}
	}
	for ; i < len(s); i++ {
		if textEscapes[s[i]] != 0 {
			return i
		}
	}
	return len(s)
}

// textEscapes maps each byte escapeText escapes to the byte after the
// backslash; 0 for the others.
var textEscapes = [256]byte{'\\': '\\', ';': ';', ',': ',', '\n': 'n'}

// libraryFold appends the content line s folded as golang-ical v0.3.4's
// BaseProperty.SerializeTo folds it when it is longer than max: a first
// physical line of at most max octets, then continuation lines of one space
// and at most max-1 octets, each cut where libraryCut says, every physical
// line ending with newline.
func libraryFold(b, s []byte, max int, newline string) []byte {
	cut := libraryCut
	if len(s) > max && utf8.Valid(s) {
		cut = validCut // the same cuts, faster
	}
	return foldCuts(b, s, max, newline, cut, nil)
}

// foldCuts is libraryFold with the cuts of cut, libraryCut or, for valid
// UTF-8, validCut. With cuts it appends to *cuts each index of s a
// physical line starts at, after the first.
func foldCuts(b, s []byte, max int, newline string, cut func(int, []byte) int, cuts *[]int32) []byte {
	if len(s) > max {
		n := cut(max, s)
		b = append(append(b, s[:n]...), newline...)
		s = s[n:]
		at := n
		for len(s) > max-1 {
			if cuts != nil {
				*cuts = append(*cuts, int32(at))
			}
			n := cut(max-1, s)
			if n == 0 {
				// The library would loop here for ever (a rune longer
				// than max-1 octets); never with max 75.
				_, n = utf8.DecodeRune(s)
			}
			b = append(append(append(b, ' '), s[:n]...), newline...)
			s = s[n:]
			at += n
		}
		if cuts != nil {
			*cuts = append(*cuts, int32(at))
		}
		b = append(b, ' ')
	}
	return append(append(b, s...), newline...)
}

// libraryCut is the length of the first physical line golang-ical's
// trimUT8StringUpTo cuts from s for at most max octets: it walks the runes
// while their lengths (utf8.RuneLen, so 3 for each invalid byte) add up to
// at most max, and prefers the last word boundary seen on the way (before a
// space or "<", after a ">"), the rune that overflows included, if it is
// not at the start.
func libraryCut(max int, s []byte) int {
	length, boundary := 0, -1
	var last rune
	for i := 0; i < len(s); {
		// What ranging over string(s) gives, without converting.
		r, size := rune(s[i]), 1
		if r >= utf8.RuneSelf {
			r, size = utf8.DecodeRune(s[i:])
		}
		if r == ' ' || r == '<' {
			boundary = i
		} else if last == '>' {
			boundary = i
		}
		last = r
		n := length + utf8.RuneLen(r)
		if n > max {
			break
		}
		length = n
		i += size
	}
	if boundary > 0 {
		return boundary
	}
	return length
}

// validCut is libraryCut(max, s) for valid UTF-8 s longer than max octets,
// without decoding. There every rune's length is its octet count, so the
// runes libraryCut walks are those starting at or before octet max, and
// " ", "<" and ">" are single octets that never occur inside another
// rune's sequence: the boundary is the last i in 1..max with s[i] a space
// or "<" or s[i-1] a ">", and without one the cut is the start of the rune
// holding octet max.
func validCut(max int, s []byte) int {
	for i := max; i > 0; i-- {
		if c := s[i]; c == ' ' || c == '<' || s[i-1] == '>' {
			return i
		}
	}
	i := max
	for i > 0 && !utf8.RuneStart(s[i]) {
		i--
	}
	return i
}

// Word-at-a-time tests on 8 octets (the usual bit tricks: a borrow out of
// an octet that was below n sets its top bit; octets are unsigned).
const (
	ones  = 0x0101010101010101
	highs = 0x8080808080808080
)

// load64 reads the 8 octets of s from i as a little-endian word.
func load64(s string, i int) uint64 {
	s = s[i : i+8]
	return uint64(s[0]) | uint64(s[1])<<8 | uint64(s[2])<<16 | uint64(s[3])<<24 |
		uint64(s[4])<<32 | uint64(s[5])<<40 | uint64(s[6])<<48 | uint64(s[7])<<56
}

// escapeMask has a high bit set in the octets of x that escapeText
// escapes (backslash, semicolon, comma, newline: four hasByte tests of
// fastpath_test.go in one), and possibly in octets above the first of
// them (a borrow); its lowest set bit is always in the first such octet,
// and no bit is set when there is none.
func escapeMask(x uint64) uint64 {
	a, b, c, d := x^(ones*'\\'), x^(ones*';'), x^(ones*','), x^(ones*'\n')
	return ((a-ones)&^a | (b-ones)&^b | (c-ones)&^c | (d-ones)&^d) & highs
}

// escapeCleanMask is escapeMask(x) | cleanMask(x) in fewer steps (LF is
// found as a control character): its lowest set bit is in the first octet
// of x that escapeText escapes or cleanText looks at octet by octet.
func escapeCleanMask(x uint64) uint64 {
	// x+ones carries into the top bit of an octet 0x7f, and out of an
	// octet 0xff only, which x's own top bit already flags.
	a, b, c := x^(ones*'\\'), x^(ones*';'), x^(ones*',')
	return (x | (x + ones) | (x-ones*' ')&^x | (a-ones)&^a | (b-ones)&^b | (c-ones)&^c) & highs
}

// cleanMask is escapeMask for cleanText's octet-wise path: its lowest set
// bit is in the first octet of x that is not printable ASCII or is HTAB or
// LF (x&highs, hasLess(x, ' ') and hasByte(x, 0x7f) in one).
func cleanMask(x uint64) uint64 {
	d := x ^ (ones * 0x7f)
	return (x | (x-ones*' ')&^x | (d-ones)&^d) & highs
}
