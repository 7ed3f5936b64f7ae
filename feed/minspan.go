package feed

import (
	"strings"
	"time"

	"heliocal/astro"
	"heliocal/config"
)

// dailySpanKinds are the span kinds with a span or a note on every local
// date (noteSilentKinds): a date whose spans min_duration leaves out gets
// a note in their place (noteUnderMinimum). The eclipses are spans too,
// but a few a year: a date without one says nothing.
var dailySpanKinds = map[string]bool{
	"dark-window": true, "golden-hour": true, "blue-hour": true, config.KindSunBand: true,
}

// noteUnderMinimum gives a note to each date on which the kind of spec,
// one of dailySpanKinds, has spans (the events from n0 on) that are all
// shorter than the kind's min_duration: the catalogue leaves those spans
// out (keep), and the date would otherwise have no entry of the kind. The
// note has the longest of them. Spans are measured as keep measures them;
// an all_day kind keeps every span, and gets no such note.
func (c *collector) noteUnderMinimum(spec config.KindSpec, n0 int) {
	minLen := spec.MinDuration.D()
	if minLen <= 0 || spec.AllDay || !dailySpanKinds[spec.Kind.Name] {
		return
	}
	n := daysBetween(c.first, c.last) + 1
	longest := make([]time.Duration, n) // by date from first; -1: a span is kept
	for i := range c.events[n0:] {
		e := &c.events[n0+i]
		d := daysBetween(c.first, e.Date)
		if d < 0 || d >= n || e.End.IsZero() || longest[d] < 0 {
			continue
		}
		if l := e.End.Sub(e.Start); l >= minLen {
			longest[d] = -1
		} else {
			longest[d] = max(longest[d], l)
		}
	}
	for d, l := range longest {
		if l > 0 {
			c.notes = append(c.notes, Note{Kind: spec.Kind, Date: c.first.AddDate(0, 0, d), State: astro.Crosses,
				Family: "under-minimum:" + spec.Kind.String(), Longest: l, Minimum: minLen})
		}
	}
}

// underMinimumText is the title, its row's form (onDate) and the end of
// the description of a note from noteUnderMinimum: "No dark sky of 45 min
// or more on the night of 3–4 May 2027: the longest dark window is 9 min",
// "No dark sky of 45 min or more on this night: …" and ", under the 45 min
// minimum".
func underMinimumText(n Note, loc *time.Location) (title, row, why string) {
	minimum := amount(n.Minimum)
	longest := hm(n.Longest)
	if n.Longest.Round(time.Minute) >= n.Minimum {
		// "44 min 40 s" under the 45 min minimum, not "45 min"
		longest = Amount(n.Longest.Round(time.Second))
	}
	var what string
	switch n.Kind.Name {
	case "dark-window":
		title, row = onNight("No dark sky of "+minimum+" or more", n.Date, loc, ": the longest dark window is "+longest)
		return title, row, ", under the " + minimum + " minimum"
	case config.KindSunBand:
		what = "No span with the " + bandBase(n.Kind.Altitude, n.Kind.High)
	default:
		what = "No " + strings.ToLower(plainNames[n.Kind.Name])
	}
	title, row = onDate(what+" of "+minimum+" or more", "today", ": the longest is "+longest)
	return title, row, ", under the " + minimum + " minimum"
}
