package config

import (
	"fmt"
	"math"
	"strings"
	"sync"
	"time"

	tzfrellite "github.com/ringsaturn/tzf-rel-lite"
)

// ZoneAt returns the IANA time zone in force at a place (degrees, north and
// east positive), from an offline map of the world's zone boundaries (the
// timezone-boundary-builder polygons, simplified, with the nautical zones of
// the open sea): "Europe/Vienna" in Vienna, "Etc/GMT+2" (UTC−2: the Etc signs
// are inverted) in the middle of the Atlantic. The map is built on the first
// call only: a map of tiles that lie wholly within one zone answers for most
// places (0.5 s and 30 MB once); a place in a tile that a border crosses
// also loads the polygons (a further 0.7–4 s and 150 MB peak, 25 MB kept).
// Later calls take microseconds. ZoneAt is safe for concurrent use.
//
// The polygons are simplified, so a place within about a kilometre of a zone
// border may get the neighbour's zone: name the zone where it matters.
func ZoneAt(lat, lon float64) (string, error) {
	if math.IsNaN(lat) || lat < -90 || lat > 90 {
		return "", fmt.Errorf("latitude %v: must be within -90..90", lat)
	}
	if math.IsNaN(lon) || lon < -180 || lon > 180 {
		return "", fmt.Errorf("longitude %v: must be within -180..180", lon)
	}
	name := ""
	if tiles, err := zoneTiles(); err == nil {
		name = tiles.name(lon, lat)
	}
	if name == "" { // near a border: the polygons decide
		f, err := zoneFinder()
		if err != nil {
			return "", err
		}
		name = f.name(lon, lat)
	}
	if name == "" {
		name = nauticalZone(lon)
	}
	if _, err := loadZone(name); err != nil {
		return "", fmt.Errorf("the zone map names %q at %v, %v, which this build's tz database does not know", name, lat, lon)
	}
	return name, nil
}

// ZoneLocationAt is ZoneAt resolved to a Zone.
func ZoneLocationAt(lat, lon float64) (Zone, error) {
	name, err := ZoneAt(lat, lon)
	if err != nil {
		return Zone{}, err
	}
	loc, err := loadZone(name)
	if err != nil {
		return Zone{}, err
	}
	return Zone{Location: loc}, nil
}

// DescribeZone words a zone for a note to the user: its name and its offset
// from UTC at t, e.g. "Etc/GMT+5 (UTC−05:00)" or "Europe/Vienna (UTC+01:00,
// CET)". The inverted sign of the Etc zones is thus spelt out.
func DescribeZone(loc *time.Location, t time.Time) string {
	abbr, off := t.In(loc).Zone()
	sign := "+"
	if off < 0 {
		sign, off = MinusSign, -off
	}
	utc := fmt.Sprintf("UTC%s%02d:%02d", sign, off/3600, off%3600/60)
	if abbr == "" || strings.HasPrefix(abbr, "+") || strings.HasPrefix(abbr, "-") || abbr == "UTC" || abbr == "GMT" {
		return fmt.Sprintf("%s (%s)", loc, utc)
	}
	return fmt.Sprintf("%s (%s, %s)", loc, utc, abbr)
}

// nauticalZone is the zone of the open sea at a longitude: 15° wide, centred
// on multiples of 15°, Etc/GMT+N to the west (common practice: nautical
// time zones). The map covers the seas itself; this only answers if it
// ever has no polygon at a point.
func nauticalZone(lon float64) string {
	n := int(math.Round(lon / 15))
	switch {
	case n == 0:
		return "Etc/GMT"
	case n > 0:
		return fmt.Sprintf("Etc/GMT-%d", n)
	}
	return fmt.Sprintf("Etc/GMT+%d", -n)
}

// zoneTiles loads, once, the tiles that lie wholly within one zone (2 MB in
// the binary): they answer for most places at a fifth of the cost of the
// polygons, and exactly as the polygons would.
var zoneTiles = sync.OnceValues(func() (*zoneTileMap, error) {
	m, err := decodeZoneTiles(tzfrellite.PreindexData)
	if err != nil {
		return nil, fmt.Errorf("time zone tiles: %w", err)
	}
	return m, nil
})

// zoneFinder loads the zone polygons once, when a place falls in a tile that
// a border crosses: the compressed simplified polygons (4.7 MB in the
// binary), each indexed for the point-in-polygon test.
var zoneFinder = sync.OnceValues(loadZoneMap)

func loadZoneMap() (*zonePolygons, error) {
	names, shapes, err := decodeZonePolygons(tzfrellite.LiteCompressData)
	if err != nil {
		return nil, fmt.Errorf("time zone map: %w", err)
	}
	return newZonePolygons(names, shapes), nil
}

// ZoneHintAt is ZoneHint for a zone name given with a place's coordinates
// (--tz beside --lat and --lon, an ad-hoc feed's tz beside lat and lon), as
// a site's timezone is told: the zone in force at lat, lon when name is a UTC
// offset ("+12:45" at the Chatham Islands: "Pacific/Chatham") or names no
// zone near it. key is how the zone is given ("--tz", "tz"), for "leave it
// out".
func ZoneHintAt(name string, lat, lon float64, key string) string {
	return zoneHintAt(name, lat, lon, "place", key)
}

// zoneHintAt is the hint of name, a zone the tz database does not know, at
// a site (what: "site", or "place") at lat, lon, whose zone is given by
// key: the zone in force there when the name's spelling names no zone near
// it ("Europe/Geneva", Geneva being on Europe/Zurich's time, is not
// "Europe/Kiev"), or is a UTC offset; a misspelling of a few letters keeps
// its suggestion, with the zone at the site beside it when that is another.
// ZoneHint's when no zone is found there.
func zoneHintAt(name string, lat, lon float64, what, key string) string {
	z, err := ZoneAt(lat, lon)
	if err != nil {
		return ZoneHint(name)
	}
	here := fmt.Sprintf("the zone at the %s's latitude and longitude is %q", what, z)
	if offsetHint(strings.TrimSpace(name)) != "" {
		return fmt.Sprintf("a UTC offset is not a time zone: %s, which follows its clock changes", here)
	}
	switch near := nearZone(name); {
	case near == z:
		return didYouMean(near) // ZoneHint's, which is the zone there
	case near != "" && distance(strings.ToLower(strings.ReplaceAll(strings.TrimSpace(name), " ", "_")), strings.ToLower(near)) <= 2:
		return didYouMean(near) + " " + here // Europe/Viena at a site in Bratislava
	}
	return here + "; or leave " + key + " out, and it is taken from them"
}
