package feed

import (
	"context"
	"fmt"
	"time"

	"heliocal/config"
)

// siteOf returns the site of the feed f, or an error naming both.
func (c *Catalogue) siteOf(f *config.Feed) (*config.Site, error) {
	s, ok := c.sites[f.Site]
	if !ok {
		return nil, fmt.Errorf("feed %q: site %q: no site has this id", f.ID, f.Site)
	}
	return s, nil
}

// Window returns the first and last local dates (00:00 UTC) of a feed's
// window: days_back before and days_ahead after today in its site's zone.
func (c *Catalogue) Window(f *config.Feed) (time.Time, time.Time, error) {
	s, err := c.siteOf(f)
	if err != nil {
		return time.Time{}, time.Time{}, err
	}
	first, last := c.window(f, s)
	return first, last, nil
}

// CalendarBetween builds a feed over the local dates first..last instead of
// its window. It computes on the catalogue's ephemeris when that covers the
// dates, so that over the feed's own window the result is exactly the
// published calendar; else on an ephemeris of its own.
func (c *Catalogue) CalendarBetween(ctx context.Context, f *config.Feed, first, last time.Time) (*Calendar, error) {
	s, err := c.siteOf(f)
	if err != nil {
		return nil, err
	}
	first, last = civil(first), civil(last)
	a, b := first, last
	if len(f.Plans) > 0 {
		a, b = a.AddDate(0, 0, -PlanMargin), b.AddDate(0, 0, PlanMargin)
	}
	sky := c.sky
	if !sky.Covers(a, b) {
		if sky, err = NewSky(a, b); err != nil {
			return nil, err
		}
	}
	return sky.Calendar(ctx, s, f, first, last, c.opts)
}
