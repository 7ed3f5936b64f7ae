package feed

import (
	"context"
	"fmt"
	"testing"
	"time"

	"heliocal/astro"
	"heliocal/config"
)

// TestNoSilentDates: at high latitudes, where twilight and even sunrise
// slide past midnight and stop for weeks, every local date of a year has an
// event or a note for each daily kind: 49 site-years at 55°–89.9° north and
// south, each in the zone of its longitude.
func TestNoSilentDates(t *testing.T) {
	var specs []config.KindSpec
	for name := range dailyKinds {
		if name == "sun-altitude" {
			name = "sun-altitude:-3.5"
		}
		specs = append(specs, config.KindSpec{Kind: mustKinds(t, name)[0]})
	}
	lats := []float64{55, 60, 63.4, 66.6, 69.7, 74, 78.2, 82.5, 89.9, -55, -60, -64.8, -66.6, -69, -72, -77.8, -89.9}
	sk := sky(t, "2026-01-01", "2028-12-31")
	siteYears := 0
	for i, lat := range lats {
		for y := 2026; y <= 2028 && siteYears < 49; y++ {
			lon := float64(i*47%360 - 180)
			zone := fmt.Sprintf("Etc/GMT%+d", -int(lon/15))
			loc, err := time.LoadLocation(zone)
			if err != nil {
				t.Fatal(err)
			}
			first, last := time.Date(y, 1, 1, 0, 0, 0, 0, time.UTC), time.Date(y, 12, 31, 0, 0, 0, 0, time.UTC)
			events, notes, err := sk.EventsFor(context.Background(), Place{Observer: astro.Observer{Latitude: lat, Longitude: lon}, Location: loc}, specs, first, last)
			if err != nil {
				t.Fatal(err)
			}
			checkSweepWindow(t, fmt.Sprintf("%g°, %g° %s %d", lat, lon, zone, y), loc, events, notes, first, last)
			siteYears++
		}
	}
	if siteYears != 49 {
		t.Fatalf("%d site-years", siteYears)
	}
}
