package feed

import (
	"fmt"
	"strings"
	"time"

	"heliocal/astro"
	"heliocal/config"
)

// Lighting parts (Event.Part of a lighting kind).
const (
	partMorning    = "morning"
	partEvening    = "evening"
	partPolarNight = "polar-night"
)

// daylight is the natural light of one local date: its total length, the
// first instant of light (the date's start when the Sun is already up) and
// the last one (the date's end when it is still up).
type daylight struct {
	length      time.Duration
	first, last time.Time
}

// daylights returns, for each local date first..last, the light above alt.
func (c *collector) daylights(alt float64) ([]daylight, error) {
	th, err := c.threshold(alt)
	if err != nil {
		return nil, err
	}
	xs, up := th.xs, th.upFirst
	var out []daylight
	for d := c.first; !d.After(c.last); d = d.AddDate(0, 0, 1) {
		start, end := midnight(d, c.p.Location), midnight(d.AddDate(0, 0, 1), c.p.Location)
		for len(xs) > 0 && xs[0].Time.Before(start) {
			up = xs[0].Direction == astro.Rising
			xs = xs[1:]
		}
		var dl daylight
		cur := start
		if up {
			dl.first = start
		}
		for len(xs) > 0 && xs[0].Time.Before(end) {
			x := xs[0]
			xs = xs[1:]
			if x.Direction == astro.Rising {
				if dl.first.IsZero() {
					dl.first = x.Time
				}
				cur, up = x.Time, true
				continue
			}
			if up {
				dl.length += x.Time.Sub(cur)
				dl.last = x.Time
			}
			up = false
		}
		if up {
			dl.length += end.Sub(cur)
			dl.last = end
		}
		out = append(out, dl)
	}
	return out, nil
}

// lighting adds, for each local date whose natural day is shorter than the
// kind's target, the lamp periods that make up the difference, placed as
// the kind's options say (c.spec: lamps, natural, latest_off, earliest_on).
// A date of polar night (no natural light) gets the whole target, centred
// on solar noon. Dates that need no lamps get one note at the start of each
// such stretch, saying until when.
func (c *collector) lighting(k config.Kind) error {
	spec := c.spec
	alt := c.p.riseAlt()
	if spec.Natural == config.NaturalCivil {
		alt = astro.CivilTwilight
	}
	days, err := c.daylights(alt)
	if err != nil {
		return err
	}
	var noons map[time.Time]time.Time
	needs := make([]bool, len(days))
	for i, dl := range days {
		needs[i] = dl.length < k.DayLength
		if needs[i] && dl.length == 0 && noons == nil {
			from, to := c.span(0)
			ts, err := c.sky.eph.SunTransits(c.p.Observer, from, to)
			if err != nil {
				return err
			}
			noons = make(map[time.Time]time.Time, len(ts))
			for _, t := range ts {
				noons[localDate(t.Time, c.p.Location)] = t.Time
			}
		}
	}
	lamps := spec.Lamps
	if lamps == "" {
		lamps = config.LampsEvening
	}
	for i, dl := range days {
		d := c.first.AddDate(0, 0, i)
		if !needs[i] {
			if i == 0 || needs[i-1] {
				n := Note{Kind: k, Date: d, State: astro.AlwaysAbove, Family: k.String()}
				for j := i + 1; j < len(days); j++ {
					if needs[j] {
						n.Until = c.first.AddDate(0, 0, j)
						break
					}
				}
				c.notes = append(c.notes, n)
			}
			continue
		}
		short := k.DayLength - dl.length
		add := func(part string, start, end time.Time) {
			e := Event{Kind: k, Start: start, End: end, Date: d, Part: part, DayLength: dl.length, DirectSun: alt == skylineKey}
			c.clip(&e, spec)
			if e.End.After(e.Start) {
				e.Lamp = e.End.Sub(e.Start)
				c.events = append(c.events, e)
			}
		}
		switch {
		case dl.length == 0:
			noon, ok := noons[d]
			if !ok {
				noon = midnight(d, c.p.Location).Add(12 * time.Hour)
			}
			add(partPolarNight, noon.Add(-short/2), noon.Add(short-short/2))
		case lamps == config.LampsMorning:
			add(partMorning, dl.first.Add(-short), dl.first)
		case lamps == config.LampsBoth:
			add(partMorning, dl.first.Add(-short/2), dl.first)
			add(partEvening, dl.last, dl.last.Add(short-short/2))
		default:
			add(partEvening, dl.last, dl.last.Add(short))
		}
	}
	return nil
}

// clip shortens a lamp period to the options' earliest_on and latest_off:
// the last earliest_on clock time at or before the period's end, and the
// first latest_off clock time after its start. A clipped period is Short.
func (c *collector) clip(e *Event, spec config.KindSpec) {
	loc := c.p.Location
	at := func(d time.Time, clock time.Duration) time.Time { return clockOn(d, clock, loc) }
	if on, err := config.ParseClock(spec.EarliestOn); spec.EarliestOn != "" && err == nil && e.Part != partEvening {
		d := localDate(e.End, loc)
		t := at(d, on)
		if !t.Before(e.End) {
			t = at(d.AddDate(0, 0, -1), on)
		}
		if e.Start.Before(t) {
			e.Start, e.Short = t, true
		}
	}
	if off, err := config.ParseClock(spec.LatestOff); spec.LatestOff != "" && err == nil && e.Part != partMorning {
		d := localDate(e.Start, loc)
		t := at(d, off)
		if !t.After(e.Start) {
			t = at(d.AddDate(0, 0, 1), off)
		}
		if e.End.After(t) {
			e.End, e.Short = t, true
		}
	}
}

// hmShort writes a local clock time as "16:42".
func hmShort(t time.Time, loc *time.Location) string {
	return ToMinute(t).In(loc).Format("15:04")
}

// describeLighting gives the title and description of a lamp period.
func describeLighting(s *siteInfo, e Event, spec config.KindSpec) (string, string) {
	loc := s.TimeZone.Location
	target := amount(e.Kind.DayLength)
	lamp := hm(e.Lamp) // as the natural day below
	var t strings.Builder
	t.Grow(64)
	t.WriteString("Lamps on ")
	t.WriteString(hmShort(e.Start, loc))
	t.WriteString("–")
	t.WriteString(hmShort(e.End, loc))
	if localDate(e.End.Add(-time.Nanosecond), loc) != e.Date {
		t.WriteString(" (+1 day)")
	}
	t.WriteString(" (" + lamp)
	if e.Short {
		t.WriteString("; " + target + " not reached)")
	} else {
		t.WriteString(", to reach " + target + ")")
	}
	var b strings.Builder
	b.Grow(400)
	part := e.Part
	if part == partPolarNight {
		part = "polar night, centred on solar noon"
	}
	natural := "sunrise to sunset"
	if spec.Natural == config.NaturalCivil {
		natural = "civil dawn to civil dusk"
	}
	b.WriteString("Supplemental lighting (" + part + "): lamps on at " + localClock(e.Start, loc) + ", off at " +
		localClock(e.End, loc) + " (" + lamp + ").\nNatural day (" + natural + ") " + hm(e.DayLength) + " at " +
		s.where + "; target photoperiod " + target + ".\n")
	if e.Short {
		var limits []string
		if spec.EarliestOn != "" {
			limits = append(limits, "lamps on no earlier than "+spec.EarliestOn)
		}
		if spec.LatestOff != "" {
			limits = append(limits, "off no later than "+spec.LatestOff)
		}
		b.WriteString("Clipped (" + strings.Join(limits, ", ") + "): the target of " + target + " is not reached today.\n")
	}
	if spec.Natural == config.NaturalCivil {
		b.WriteString("Civil twilight is counted as natural light (common practice: twilight still drives photoperiod responses).\n")
	}
	b.WriteString("Computed for planning from the site's coordinates; follow the lighting programme of the crop or herd.")
	return t.String(), b.String()
}

// describeLightingNote gives the note at the start of a stretch of dates
// that need no lamps.
func describeLightingNote(s *siteInfo, n Note, last time.Time) (string, string) {
	target := amount(n.Kind.DayLength)
	if n.Until.IsZero() {
		title := fmt.Sprintf("No lamps needed through %s: the natural day is ≥ %s", last.Format("2 Jan"), target)
		return title, fmt.Sprintf("%s at %s, from %s to the end of this calendar (%s).", title, s.where,
			n.Date.Format("Monday 2 January 2006"), last.Format("2 January 2006"))
	}
	title := fmt.Sprintf("No lamps needed until %s: the natural day is ≥ %s", n.Until.Format("2 Jan"), target)
	return title, fmt.Sprintf("%s at %s, from %s; lamps are needed again from %s.", title, s.where,
		n.Date.Format("Monday 2 January 2006"), n.Until.Format("Monday 2 January 2006"))
}
