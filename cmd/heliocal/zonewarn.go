package main

import (
	"fmt"
	"slices"
	"strings"
	"time"

	"heliocal/astro"
	"heliocal/config"
	"heliocal/feed"
)

// zoneWarnings words each site of cfg whose timezone, a valid name, shows
// other clock times than the zone in force at its coordinates (the zone
// map's, config.ZoneAt) at some instant of the year from now: a zone of a
// neighbour (Pacific/Auckland at the Chatham Islands, 45 min behind
// Pacific/Chatham) reads every clock time the site's configuration writes
// (earliest_on, a plan's start) and every title's in the wrong zone. A
// zone with the same offsets under another name (Europe/Berlin at Vienna)
// is no warning; nor is a site's zone of fixed offset chosen on purpose
// (UTC, Etc/GMT-1), nor a site without timezone, which takes the map's.
// Where the map gives a nautical zone (Etc/GMT+12: the open sea, or a
// place the map leaves to it), which is only the longitude's hour, the
// warning needs more than an hour of difference. Only check calls it: it
// loads the zone map, which other commands load only for a site without
// timezone.
func zoneWarnings(cfg *config.Config, now time.Time) []string {
	var out []string
	for _, s := range cfg.Sites {
		loc := s.TimeZone.Location
		if s.ZoneInferred || loc == nil || fixedZone(loc.String()) {
			continue
		}
		name, err := config.ZoneAt(s.Latitude, s.Longitude)
		if err != nil || name == loc.String() {
			continue
		}
		there, err := time.LoadLocation(name)
		if err != nil {
			continue
		}
		at, diff := offsetsDiffer(loc, there, now, now.AddDate(1, 0, 0))
		if diff == 0 || (fixedZone(name) && diff.Abs() <= time.Hour) {
			continue
		}
		way := "ahead of"
		if diff < 0 {
			way = "behind"
		}
		out = append(out, fmt.Sprintf("site %q: timezone %s: the zone in force at %s is %s, %s %s %s (from %s); name the site's own zone, or check its latitude and longitude",
			s.ID, loc, feed.Coords(s.Latitude, s.Longitude, 4), name, feed.Length(diff.Abs(), time.Minute), way, loc, at.In(there).Format("2 Jan 2006")))
	}
	return out
}

// fixedZone reports whether the zone name is one of a fixed offset that a
// configuration chooses on purpose, whatever the place: UTC, GMT, Etc/….
func fixedZone(name string) bool {
	return name == "UTC" || name == "GMT" || strings.HasPrefix(name, "Etc/")
}

// offsetsDiffer returns by how much zone b's UTC offset is ahead of zone
// a's (negative: behind) for the longest time in [from, to), where they
// differ, and the first instant of that difference; zero when they never
// differ. Lord Howe Island's clocks go back an hour before Sydney's on
// 4 April 2027, then are 30 min ahead of them until October: the warning
// says the months, not the hour. The offsets change only where either
// zone's do (astro.ZoneChanges, past the zone data's last transition too).
func offsetsDiffer(a, b *time.Location, from, to time.Time) (time.Time, time.Duration) {
	held := map[time.Duration]time.Duration{} // how long each difference holds
	first := map[time.Duration]time.Time{}
	var bounds []time.Time
	for _, loc := range []*time.Location{a, b} {
		for at := range astro.ZoneChanges(loc, from, to) {
			bounds = append(bounds, at)
		}
	}
	slices.SortFunc(bounds, time.Time.Compare) // each before to
	t := from
	for _, next := range append(bounds, to) {
		if !next.After(t) { // a change of both zones at once
			continue
		}
		_, oa := t.In(a).Zone()
		_, ob := t.In(b).Zone()
		if d := time.Duration(ob-oa) * time.Second; d != 0 {
			if _, ok := first[d]; !ok {
				first[d] = t
			}
			held[d] += next.Sub(t)
		}
		t = next
	}
	var at time.Time
	var diff time.Duration
	for d, long := range held {
		if long > held[diff] || (long == held[diff] && first[d].Before(at)) {
			at, diff = first[d], d
		}
	}
	return at, diff
}
