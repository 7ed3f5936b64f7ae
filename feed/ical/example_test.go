package ical_test

import (
	"fmt"
	"strings"
	"time"

	"heliocal/feed"
	"heliocal/feed/ical"
)

// A feed with one sunrise, written in UTC (Calendar.UTC): no TZID and no
// VTIMEZONE. Lines end in CRLF; they are printed here without the CR.
func ExampleMarshal() {
	stamp := time.Date(2026, 6, 1, 0, 0, 0, 0, time.UTC)
	c := &feed.Calendar{
		ID:    "heron-sun",
		Title: "Heron Marsh Greenhouses – sunrise",
		Site:  feed.Site{ID: "heron", Name: "Heron Marsh Greenhouses", Latitude: 52.0123, Longitude: -0.00005, Location: time.UTC},
		UTC:   true, WindowStart: stamp, WindowEnd: stamp.AddDate(0, 1, 0), Stamp: stamp,
		Entries: []feed.Entry{{
			UID:   "heron-sun-sunrise-2026-06-21@heliocal",
			Title: "Sunrise", Categories: []string{"Sun", "Sunrise"},
			Start: time.Date(2026, 6, 21, 3, 42, 31, 0, time.UTC),
		}},
	}
	data, err := ical.Marshal(c, ical.Options{Version: "1.0.0"})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(strings.ReplaceAll(string(data), "\r\n", "\n"))
	// Output:
	// BEGIN:VCALENDAR
	// VERSION:2.0
	// PRODID:-//heliocal//heliocal 1.0.0//EN
	// CALSCALE:GREGORIAN
	// NAME:Heron Marsh Greenhouses – sunrise
	// X-WR-CALNAME:Heron Marsh Greenhouses – sunrise
	// LAST-MODIFIED:20260601T000000Z
	// BEGIN:VEVENT
	// UID:heron-sun-sunrise-2026-06-21@heliocal
	// DTSTAMP:20260601T000000Z
	// DTSTART:20260621T034231Z
	// DTEND:20260621T034331Z
	// SUMMARY:Sunrise
	// LOCATION:Heron Marsh Greenhouses
	// GEO:52.0123;-0.00005
	// TRANSP:TRANSPARENT
	// X-MICROSOFT-CDO-BUSYSTATUS:FREE
	// CATEGORIES:Sun,Sunrise
	// END:VEVENT
	// END:VCALENDAR
}
