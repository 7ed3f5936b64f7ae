package publish

import (
	"context"
	"time"

	"heliocal/astro"
	"heliocal/feed"
)

// astroChart computes a site's chart for one year with the project's
// astronomy, the way the CLI feeds Charts: one SunDays pass per limit, Above
// per day, the year's equinoxes and solstices as marks.
func astroChart(eph *astro.Ephemeris, s feed.Site, year int) (*SiteChart, error) {
	o := astro.Observer{Latitude: s.Latitude, Longitude: s.Longitude, Elevation: s.Elevation}
	first := time.Date(year, 1, 1, 12, 0, 0, 0, s.Location)
	last := time.Date(year, 12, 31, 12, 0, 0, 0, s.Location)
	limits := []float64{o.RiseSetAltitude(), -6, -12, -18}
	var per [4][]astro.Day
	for i, alt := range limits {
		days, err := eph.SunDays(context.Background(), o, alt, s.Location, first, last)
		if err != nil {
			return nil, err
		}
		per[i] = days
	}
	c := &SiteChart{}
	for i := range per[0] {
		start := per[0][i].Date
		end := time.Date(start.Year(), start.Month(), start.Day()+1, 0, 0, 0, 0, s.Location)
		var v [4]time.Duration
		for k := range limits {
			d := per[k][i]
			v[k] = Above(start, end, d.Rising, d.Setting, d.State == astro.AlwaysAbove)
		}
		c.Days = append(c.Days, ChartDay{
			Date:     time.Date(start.Year(), start.Month(), start.Day(), 0, 0, 0, 0, time.UTC),
			Daylight: v[0], Civil: v[1], Nautical: v[2], Astronomical: v[3],
		})
	}
	seasons, err := astro.Seasons(year)
	if err != nil {
		return nil, err
	}
	names := [4]string{"March equinox", "June solstice", "September equinox", "December solstice"}
	for i, at := range seasons {
		c.Marks = append(c.Marks, Mark{At: at, Label: names[i]})
	}
	return c, nil
}
