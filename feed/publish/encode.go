package publish

import (
	"heliocal/feed"
	"heliocal/feed/ical"
)

// encoder returns the calendar encoder of opts: opts.Encode, or feed/ical's
// with the build's version in PRODID.
func (o *RenderOptions) encoder() func(*feed.Calendar) ([]byte, error) {
	if o.Encode != nil {
		return o.Encode
	}
	io := ical.Options{Version: o.Version}
	return func(c *feed.Calendar) ([]byte, error) { return ical.Marshal(c, io) }
}
