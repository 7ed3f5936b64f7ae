package ical

import (
	"bytes"
	"errors"
	"fmt"
	"io"

	ics "github.com/arran4/golang-ical"

	"heliocal/feed"
)

// streamConfig is the serialization configuration of Marshal
// (golang-ical's defaults with ics.WithNewLineWindows), which a Stream
// renders its events for.
var streamConfig = ics.SerializationConfiguration{MaxLength: 75, PropertyMaxLength: 75, NewLine: "\r\n"}

// calendarEnd closes every file.
const calendarEnd = "END:VCALENDAR\r\n"

// A Stream writes one calendar's iCalendar file to an io.Writer a batch of
// entries at a time, so that a long span is never held whole: its memory
// is that of one batch. The bytes are Marshal's for the calendar with every
// batch's entries in order (TestStreamMatchesMarshal), given the header
// NewStream was given sizes the VTIMEZONE as the whole calendar would.
//
// Each batch is checked as Marshal checks a calendar, except that a UID is
// only compared with those of its own batch: the catalogue derives UIDs
// from the local date, so batches of different dates cannot share one.
type Stream struct {
	out    io.Writer
	enc    Encoder
	buf    []byte
	n      int // entries written so far
	err    error
	closed bool
}

// NewStream writes the head of c's iCalendar file to out (the calendar's
// properties and its VTIMEZONE) and returns the Stream its entries go
// through. c.Entries are not written: as in Marshal they only widen the
// VTIMEZONE beyond the window, so they need to hold just the entries that
// start earliest and end latest (the first and last batches do).
func NewStream(out io.Writer, c *feed.Calendar, opts Options) (*Stream, error) {
	s := &Stream{out: out, enc: Encoder{opts: opts}}
	if c == nil {
		return nil, fmt.Errorf("ical: nil calendar")
	}
	head := *c
	head.Entries = nil
	s.enc.spanEntries = c.Entries
	if s.enc.spanEntries == nil {
		s.enc.spanEntries = []feed.Entry{}
	}
	cal, _, err := s.enc.build(&head)
	if err != nil {
		return nil, err
	}
	var b bytes.Buffer
	cfg := streamConfig
	if err := cal.SerializeTo(&b, &cfg); err != nil {
		return nil, fmt.Errorf("ical: calendar %q: %w", c.ID, err)
	}
	data, ok := bytes.CutSuffix(b.Bytes(), []byte(calendarEnd))
	if !ok {
		return nil, fmt.Errorf("ical: calendar %q: the head does not end with %q", c.ID, calendarEnd)
	}
	s.enc.w.setLines(&cfg)
	return s, s.write(data)
}

// Write writes the events of entries, which follow those of the earlier
// calls. A timed entry outside the span the VTIMEZONE covers is refused.
// After an error the Stream writes nothing more.
func (s *Stream) Write(entries []feed.Entry) error {
	if s.err != nil {
		return s.err
	}
	if s.closed {
		return errors.New("ical: write to a closed stream")
	}
	e := &s.enc
	w := &e.w
	if cap(w.events) < len(entries) {
		w.events = make([]vevent, len(entries))
	}
	w.events = w.events[:len(entries)]
	e.seen.reset(len(entries))
	// A caller may reuse the memory of one batch's lists of categories
	// for the next one's: lists are known by their arrays within a batch.
	clear(w.catRecent)
	w.catRecent = w.catRecent[:0]
	buf := s.buf[:0]
	for i := range entries {
		en := &entries[i]
		ev, err := e.entry(i, s.n+i, en)
		if err == nil && w.loc != nil && !en.AllDay && (ev.start.Before(w.zoneFrom) || ev.end.After(w.zoneTo)) {
			err = fmt.Errorf("entry %q: outside the span of the time zone written in the head (%s to %s)",
				en.UID, w.zoneFrom.Format(utcLayout), w.zoneTo.Format(utcLayout))
		}
		if err != nil {
			s.err = fmt.Errorf("ical: calendar %q: %w", w.c.ID, err)
			return s.err
		}
		buf = ev.appendTo(buf)
	}
	s.buf = buf
	s.n += len(entries)
	return s.write(buf)
}

// Close ends the file. It does not close the underlying writer.
func (s *Stream) Close() error {
	if s.err != nil || s.closed {
		return s.err
	}
	s.closed = true
	return s.write([]byte(calendarEnd))
}

func (s *Stream) write(b []byte) error {
	if _, err := s.out.Write(b); err != nil {
		s.err = fmt.Errorf("ical: calendar %q: write: %w", s.enc.w.c.ID, err)
	}
	return s.err
}
