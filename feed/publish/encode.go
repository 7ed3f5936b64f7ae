package publish

import (
	"fmt"
	"time"

	"heliocal/feed"
	"heliocal/feed/ical"
)

// encoder returns the calendar encoder of opts: opts.Encode, or feed/ical's
// with the build's version in PRODID, applying opts.Oversize to a feed over
// the size limit.
func (o *RenderOptions) encoder() func(*feed.Calendar) ([]byte, error) {
	enc := o.Encode
	if enc == nil {
		io := ical.Options{Version: o.Version}
		enc = func(c *feed.Calendar) ([]byte, error) { return ical.Marshal(c, io) }
	}
	limit := o.maxFeedBytes()
	if limit <= 0 || o.Oversize == "" || o.Oversize == OversizeWarn {
		return enc
	}
	return func(c *feed.Calendar) ([]byte, error) {
		data, err := enc(c)
		if err != nil || len(data) <= limit {
			return data, err
		}
		if o.Oversize == OversizeFail {
			return nil, &OversizeError{Feed: c.ID, Bytes: len(data), Limit: limit}
		}
		return trimToFit(c, data, limit, enc)
	}
}

// Oversize policies for RenderOptions.Oversize (the configuration's
// service.oversize).
const (
	OversizeWarn = "warn" // publish the feed, list it in Stats.Oversize
	OversizeTrim = "trim" // shorten the window from the far end until it fits
	OversizeFail = "fail" // stop with an *OversizeError
)

// OversizeError is a feed larger than the limit under OversizeFail.
type OversizeError struct {
	Feed         string
	Bytes, Limit int
}

func (e *OversizeError) Error() string {
	size, limit := FormatBytesOver(int64(e.Bytes), int64(e.Limit))
	return fmt.Sprintf("%s, over service.max_feed_bytes (%s): shorten days_back/days_ahead, split the kinds, or set service.oversize: trim", size, limit)
}

// trimToFit drops c's entries from the far end of its window, whole local
// dates at a time, until its encoding fits in limit bytes, and says in the
// calendar's description how far it now reaches (c.TrimmedTo). data is c's
// encoding before trimming.
func trimToFit(c *feed.Calendar, data []byte, limit int, enc func(*feed.Calendar) ([]byte, error)) ([]byte, error) {
	desc := c.Description
	for len(data) > limit {
		n := len(c.Entries)
		if n == 0 {
			return nil, &OversizeError{Feed: c.ID, Bytes: len(data), Limit: limit}
		}
		// keep the share of entries that should fit (a little less: the
		// header stays), at least one date fewer than now
		keep := min(n-1, int(float64(n)*float64(limit)/float64(len(data))*0.98))
		last := c.Entries[max(keep, 0)].Date.AddDate(0, 0, -1)
		if !last.Before(c.Entries[n-1].Date) {
			last = c.Entries[n-1].Date.AddDate(0, 0, -1)
		}
		kept := c.Entries[:0]
		for _, e := range c.Entries {
			if !e.Date.After(last) {
				kept = append(kept, e)
			}
		}
		c.Entries = kept
		c.TrimmedTo = last
		end := time.Date(last.Year(), last.Month(), last.Day()+1, 0, 0, 0, 0, c.Site.Location).UTC()
		if end.Before(c.WindowEnd) {
			c.WindowEnd = end
		}
		note := fmt.Sprintf("Shortened to stay under %d bytes: this calendar reaches to %s.", limit, last.Format(time.DateOnly))
		if desc == "" {
			c.Description = note
		} else {
			c.Description = desc + "\n\n" + note
		}
		var err error
		if data, err = enc(c); err != nil {
			return nil, err
		}
	}
	return data, nil
}
