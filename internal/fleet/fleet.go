// Package fleet writes the configuration of an invented fleet of sites used
// to measure publishing at scale: the publish benchmark parses it in
// process, and tools/fleet writes it to a file for timing the command as
// it ships.
package fleet

import (
	"fmt"
	"strings"
)

// regions are the ten places the fleet's sites are spread around (each
// site jittered a little from its region's point), north and south, east
// and west, with zones that do and do not change their clocks.
var regions = []struct {
	lat, lon float64
	zone     string
}{
	{48.2, 16.4, "Europe/Vienna"}, {-41.3, 173.0, "Pacific/Auckland"}, {39.1, -105.4, "America/Denver"},
	{59.9, 10.7, "Europe/Oslo"}, {-23.5, -46.6, "America/Sao_Paulo"}, {35.7, 139.7, "Asia/Tokyo"},
	{22.6, 88.4, "Asia/Kolkata"}, {-33.9, 151.2, "Australia/Sydney"}, {42.4, -76.5, "America/New_York"},
	{-1.3, 36.8, "Africa/Nairobi"},
}

// MaxSites is the most sites tools/fleet writes; TestPlaceInRangeAndDistinct
// checks every one of them.
const MaxSites = 100000

// jitterRounds is how many sites of a region step away from its point
// before the steps start again, a little shifted: 400 steps of 0.017° keep
// every site within 6.8° of its region's point (Auckland's 173° E stays
// below 180°, Oslo's 59.9° N below 67°), whatever the size of the fleet.
const jitterRounds = 400

// place returns the latitude and longitude (degrees) and the zone of site i:
// its region's point, moved 0.017° north and east for each earlier site of
// the region, the steps starting again after jitterRounds of them, each
// round 0.0011° further than the one before so that no two sites coincide.
func place(i int) (lat, lon float64, zone string) {
	r := regions[i%len(regions)]
	k := i / len(regions)
	j := float64(k%jitterRounds)*0.017 + float64(k/jitterRounds)*0.0011
	return r.lat + j, r.lon + j, r.zone
}

// YAML returns the configuration of n sites, each with one feed of the
// daily kinds (sunrise, sunset, civil dawn and dusk, golden hour) over 400
// days (30 back, 369 ahead).
func YAML(n int) string {
	var b strings.Builder
	b.WriteString("sites:\n")
	for i := range n {
		lat, lon, zone := place(i)
		fmt.Fprintf(&b, "  - {id: site-%04d, name: Fleet site %d, latitude: %.4f, longitude: %.4f, elevation: %d, timezone: %s}\n",
			i, i, lat, lon, 10*(i%50), zone)
	}
	b.WriteString("feeds:\n")
	for i := range n {
		fmt.Fprintf(&b, "  - {id: site-%04d-daily, title: Fleet site %d daily sun, site: site-%04d, days_back: 30, days_ahead: 369,\n"+
			"     kinds: [sunrise, sunset, civil-dawn, civil-dusk, golden-hour]}\n", i, i, i)
	}
	return b.String()
}
