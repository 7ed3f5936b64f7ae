package publish

import (
	"fmt"
	"time"

	"heliocal/feed"
	"heliocal/feed/ical"
)

// encodeFunc appends one calendar's iCalendar bytes to dst and returns the
// extended buffer; on error dst's bytes are unchanged.
type encodeFunc func(dst []byte, c *feed.Calendar) ([]byte, error)

// encoder returns a calendar encoder of opts, for one goroutine: opts.Encode,
// or a feed/ical Encoder with the build's version in PRODID, applying
// opts.Oversize to a feed over the size limit.
func (o *RenderOptions) encoder() encodeFunc {
	var enc encodeFunc
	if o.Encode != nil {
		enc = func(dst []byte, c *feed.Calendar) ([]byte, error) {
			data, err := o.Encode(c)
			if err != nil {
				return dst, err
			}
			return append(dst, data...), nil
		}
	} else {
		e := ical.NewEncoder(ical.Options{Version: o.Version})
		enc = e.Append
	}
	limit := o.maxFeedBytes()
	if limit <= 0 || o.Oversize == "" || o.Oversize == OversizeWarn {
		return enc
	}
	return func(dst []byte, c *feed.Calendar) ([]byte, error) {
		n := len(dst)
		data, err := enc(dst, c)
		if err != nil || len(data)-n <= limit {
			return data, err
		}
		if o.Oversize == OversizeFail {
			return dst, &OversizeError{Feed: c.ID, Bytes: len(data) - n, Limit: limit}
		}
		return trimToFit(c, data, n, limit, enc)
	}
}

// Encode writes one calendar as Render and Publish write it, with opts's
// encoder and size limit: under OversizeTrim a calendar over the limit is
// shortened first (c.Entries and c.TrimmedTo say how far), under
// OversizeFail it is an *OversizeError. It tells what publishing c gives,
// without writing anything.
func Encode(c *feed.Calendar, opts *RenderOptions) ([]byte, error) {
	return opts.encoder()(nil, c)
}

// Oversize policies for RenderOptions.Oversize (the configuration's
// service.oversize).
const (
	OversizeWarn = "warn" // publish the feed, list it in Stats.Oversize
	OversizeTrim = "trim" // shorten the window from the far end until it fits
	OversizeFail = "fail" // stop with an *OversizeError
)

// OversizeError is a feed larger than the limit under OversizeFail, or,
// with Trimmed, one that OversizeTrim cannot shorten to a calendar worth
// publishing: still larger with no entry left (its header and description
// alone are over the limit), or, with TrimmedTo set, one that fits only
// shortened to TrimmedTo, a date before Today at its site, so that it
// would show past days alone. Bytes is the size of the feed as it was
// refused: with no entry left, or whole when shortened before Today.
type OversizeError struct {
	Feed         string
	Bytes, Limit int
	Trimmed      bool
	// TrimmedTo and Today are the last local date the shortened feed
	// would reach and the date at its site its window was counted from.
	TrimmedTo, Today time.Time
}

// Error words the refusal as check, publish and serve say it (check names
// the feed before it, OversizeRefusal): the size over the limit, that
// publish and serve refuse the feed under service.oversize and why, and
// what to change.
func (e *OversizeError) Error() string {
	size, limit := FormatBytesOver(int64(e.Bytes), int64(e.Limit))
	switch {
	case !e.TrimmedTo.IsZero():
		return fmt.Sprintf("%s, over service.max_feed_bytes (%s): publish and serve refuse it (service.oversize: trim would shorten it to %s, before today at its site (%s), leaving past days alone); lower days_back or raise service.max_feed_bytes",
			size, limit, e.TrimmedTo.Format(time.DateOnly), e.Today.Format(time.DateOnly))
	case e.Trimmed:
		return fmt.Sprintf("%s with no entry left, over service.max_feed_bytes (%s): publish and serve refuse it (service.oversize: trim cannot shorten it enough); raise service.max_feed_bytes", size, limit)
	}
	return fmt.Sprintf("%s, over service.max_feed_bytes (%s): publish and serve refuse it (service.oversize: fail); shorten days_back/days_ahead, split the kinds, or set service.oversize: trim", size, limit)
}

// trimToFit drops c's entries from the far end of its window, whole local
// dates at a time, until its encoding fits in limit bytes, and says in the
// calendar's description how far it now reaches (c.TrimmedTo). buf[n:] is
// c's encoding before trimming; each new encoding replaces it. A feed that
// fits only shortened to a date before c.Today (when set) is refused
// whole: c is left as it came and the error is an *OversizeError with
// TrimmedTo. One still over the limit with no entry left is refused with
// Trimmed alone, c left as trimmed: no entries, its note in the
// description.
func trimToFit(c *feed.Calendar, buf []byte, n, limit int, enc encodeFunc) ([]byte, error) {
	data := buf[n:]
	whole, entries0, desc, windowEnd := len(data), len(c.Entries), c.Description, c.WindowEnd
	for len(data) > limit {
		entries := len(c.Entries)
		if entries == 0 {
			return buf[:n], &OversizeError{Feed: c.ID, Bytes: len(data), Limit: limit, Trimmed: true}
		}
		// keep the share of entries that should fit (a little less: the
		// header stays), at least one date fewer than now
		keep := min(entries-1, int(float64(entries)*float64(limit)/float64(len(data))*0.98))
		last := c.Entries[max(keep, 0)].Date.AddDate(0, 0, -1)
		if !last.Before(c.Entries[entries-1].Date) {
			last = c.Entries[entries-1].Date.AddDate(0, 0, -1)
		}
		// try today before any earlier date: a feed that reaches today
		// fits or none does
		if last.Before(c.Today) && c.Today.Before(c.Entries[entries-1].Date) {
			last = c.Today
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
		note := fmt.Sprintf("Shortened to stay under %s: this calendar reaches to %s.", FormatLimit(limit), last.Format(time.DateOnly))
		if desc == "" {
			c.Description = note
		} else {
			c.Description = desc + "\n\n" + note
		}
		var err error
		if buf, err = enc(buf[:n], c); err != nil {
			return buf[:n], err
		}
		data = buf[n:]
	}
	if c.TrimmedTo.Before(c.Today) {
		// the entries are sorted by date: those kept are the first ones,
		// in place, and the others are still behind them
		to := c.TrimmedTo
		c.Entries, c.Description, c.WindowEnd, c.TrimmedTo = c.Entries[:entries0], desc, windowEnd, time.Time{}
		return buf[:n], &OversizeError{Feed: c.ID, Bytes: whole, Limit: limit, Trimmed: true, TrimmedTo: to, Today: c.Today}
	}
	return buf, nil
}
