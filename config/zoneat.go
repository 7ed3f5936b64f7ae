package config

import (
	"fmt"
	"math"
	"strings"
	"sync"
	"time"

	"github.com/ringsaturn/tzf"
	tzfrellite "github.com/ringsaturn/tzf-rel-lite"
	pb "github.com/ringsaturn/tzf/gen/go/tzf/v1"
	"google.golang.org/protobuf/proto"
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
		name = tiles.GetTimezoneName(lon, lat)
	}
	if name == "" { // near a border: the polygons decide
		f, err := zoneFinder()
		if err != nil {
			return "", err
		}
		name = f.GetTimezoneName(lon, lat)
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
		sign, off = "−", -off
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
var zoneTiles = sync.OnceValues(func() (tzf.F, error) {
	in := &pb.PreindexTimezones{}
	if err := proto.Unmarshal(tzfrellite.PreindexData, in); err != nil {
		return nil, fmt.Errorf("time zone tiles: %w", err)
	}
	return tzf.NewFuzzyFinderFromPB(in)
})

// zoneFinder loads the zone polygons once, when a place falls in a tile that
// a border crosses: the polygon finder over the compressed simplified
// polygons (4.7 MB in the binary).
var zoneFinder = sync.OnceValues(loadZoneMap)

func loadZoneMap() (tzf.F, error) {
	in := &pb.CompressedTimezones{}
	if err := proto.Unmarshal(tzfrellite.LiteCompressData, in); err != nil {
		return nil, fmt.Errorf("time zone map: %w", err)
	}
	f, err := tzf.NewFinderFromCompressed(in, tzf.SetDropPBTZ)
	if err != nil {
		return nil, fmt.Errorf("time zone map: %w", err)
	}
	return f, nil
}
