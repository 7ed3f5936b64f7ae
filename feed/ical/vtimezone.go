package ical

import (
	"time"

	ics "github.com/arran4/golang-ical"

	"heliocal/astro"
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
// effect there), then one per change after it. It walks
// the changes of the zone's offset or abbreviation (nextChange), never a
// bound where neither changes (Go reports such bounds, e.g. at year
// boundaries past the last stored transition).
//
// An observance is DAYLIGHT when clocks go forward into it and STANDARD when
// they go back, the way calendar clients expect. The tz database's own flag
// is not used: for zones with "negative DST" (Europe/Dublin, whose legal
// standard time is the summer time) it would mark winter as daylight time.
// The initial observance takes its kind from the next change (up to a year
// on); a change of abbreviation alone keeps the kind before it. A change
// of 20 h or more is no change of season but the zone moving across the
// date line (dateLine), skipping a date or showing one twice: the
// observances on both sides of it take the tz database's flag. Pacific/
// Apia's −10 and +14 on either side of its jump on 30 December 2011 were
// daylight time (zdump -v Pacific/Apia: isdst=1); every other such jump of
// the tz database is between standard times, forward (Kiritimati and
// Kanton 1994, Kwajalein 1993, Fakaofo 2011, Manila 1844) or back (Alaska
// 1867, Apia 1892, Kwajalein 1969): zdump -v gives isdst=0 on both sides.
func observances(loc *time.Location, from, to time.Time) []observance {
	name, off := from.In(loc).Zone()
	first := observance{Start: from, From: off, To: off, Name: name}
	// The initial observance is daylight time if clocks next go back.
	if o, _, ok := nextChange(loc, from, to.AddDate(1, 0, 0), func(_ string, o int) bool { return o != off }); ok {
		first.DST = o < off
		if dateLine(off, o) {
			first.DST = from.In(loc).IsDST()
		}
	}
	obs := []observance{first}
	for t := from; ; {
		o, at, ok := nextChange(loc, t, to, func(n string, o int) bool { return o != off || n != name })
		if !ok {
			return obs
		}
		n, _ := at.In(loc).Zone()
		dst := obs[len(obs)-1].DST
		switch {
		case dateLine(off, o):
			dst = at.In(loc).IsDST()
		case o != off:
			dst = o > off
		}
		obs = append(obs, observance{Start: at, From: off, To: o, Name: n, DST: dst})
		name, off, t = n, o, at
	}
}

// dateLine says whether a change of the UTC offset from one to o (in
// seconds) moves the zone across the date line: by 20 h or more, either
// way, where a change of season is an hour or two.
func dateLine(from, o int) bool { return o-from >= 20*3600 || from-o >= 20*3600 }

// nextChange walks the changes of loc's offset or abbreviation after t, up
// to limit (astro.ZoneChanges, which steps over the bounds Go gives without
// a change past the zone data's last transition), and returns the first
// whose abbreviation and offset satisfy changed.
func nextChange(loc *time.Location, t, limit time.Time, changed func(name string, off int) bool) (int, time.Time, bool) {
	for at := range astro.ZoneChanges(loc, t, limit.Add(time.Nanosecond)) {
		if n, o := at.Zone(); changed(n, o) {
			return o, at, true
		}
	}
	return 0, time.Time{}, false
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
