package ical

import (
	"time"

	ics "github.com/arran4/golang-ical"
)

// observance is one STANDARD or DAYLIGHT sub-component of a VTIMEZONE: from
// Start on, local time is UTC + To seconds and is called Name.
type observance struct {
	Start    time.Time // the change, UTC
	From, To int       // UTC offsets in seconds before and after Start
	Name     string    // abbreviation after Start, e.g. "CEST"
	DST      bool      // daylight saving time after Start
}

// observances lists the offset changes of loc over [from, to], from Go's time
// zone database: first one observance at from with From = To (the offset in
// effect there), then one per transition after it. It walks
// time.Time.ZoneBounds and skips bounds where neither the offset nor the
// abbreviation changes (Go reports such bounds, e.g. at year boundaries past
// the last stored transition).
func observances(loc *time.Location, from, to time.Time) []observance {
	name, off := from.In(loc).Zone()
	obs := []observance{{Start: from, From: off, To: off, Name: name, DST: from.In(loc).IsDST()}}
	t := from
	for {
		_, end := t.In(loc).ZoneBounds()
		if end.IsZero() || !end.After(t) || end.After(to) {
			return obs
		}
		lt := end.In(loc)
		n, o := lt.Zone()
		if o != off || n != name {
			obs = append(obs, observance{Start: end, From: off, To: o, Name: n, DST: lt.IsDST()})
			name, off = n, o
		}
		t = end
	}
}

// vtimezone builds the VTIMEZONE for tzid with the observances of loc over
// [from, to]. Each observance's DTSTART is the change written as local time
// in the offset in effect before it (RFC 5545 §3.6.5: DTSTART is local time,
// interpreted with TZOFFSETFROM). No RRULE is used: the file is rebuilt as the
// window moves, and explicit changes leave clients nothing to extrapolate.
func vtimezone(tzid string, loc *time.Location, from, to time.Time) *ics.VTimezone {
	tz := ics.NewTimezone(tzid)
	for _, o := range observances(loc, from, to) {
		var cb *ics.ComponentBase
		if o.DST {
			d := &ics.Daylight{}
			tz.Components = append(tz.Components, d)
			cb = &d.ComponentBase
		} else {
			cb = &tz.AddStandard().ComponentBase
		}
		cb.AddProperty(ics.ComponentPropertyDtStart, o.Start.UTC().Add(time.Duration(o.From)*time.Second).Format(localLayout))
		cb.AddProperty(ics.ComponentProperty(ics.PropertyTzoffsetfrom), formatOffset(o.From))
		cb.AddProperty(ics.ComponentProperty(ics.PropertyTzoffsetto), formatOffset(o.To))
		if name := cleanText(o.Name); name != "" {
			cb.AddProperty(ics.ComponentProperty(ics.PropertyTzname), name)
		}
	}
	return tz
}
