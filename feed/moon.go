package feed

import (
	"fmt"
	"math"
	"slices"
	"strings"
	"time"

	"heliocal/astro"
	"heliocal/config"
)

// moonEphemeris builds the Moon's shared track on first use: feeds without
// Moon kinds never pay for it.
func (s *Sky) moonEphemeris() (*astro.MoonEphemeris, error) {
	s.moonOnce.Do(func() {
		s.moon, s.moonErr = astro.NewMoonEphemeris(s.from, s.to)
	})
	return s.moon, s.moonErr
}

var phaseKinds = map[string]astro.PhaseKind{
	"new-moon":      astro.NewMoon,
	"first-quarter": astro.FirstQuarter,
	"full-moon":     astro.FullMoon,
	"last-quarter":  astro.LastQuarter,
}

var phaseNames = [4]string{"new-moon", "first-quarter", "full-moon", "last-quarter"}

// addMoon adds the Moon's kinds.
func (c *collector) addMoon(k config.Kind) error {
	switch k.Name {
	case "new-moon", "first-quarter", "full-moon", "last-quarter", "moon-phases":
		return c.phases(k)
	case "moonrise", "moonset":
		return c.moonRiseSet(k)
	case "moon-transit":
		return c.moonTransits(k)
	case "dark-window":
		return c.darkWindows(k)
	}
	return fmt.Errorf("kind %q has no computation", k.String())
}

// lit fills the illumination of a Moon event at its start, from the shared
// Moon track.
func (c *collector) lit(e *Event) error {
	me, err := c.sky.moonEphemeris()
	if err != nil {
		return err
	}
	il, err := me.Illumination(e.Start)
	if err != nil {
		return err
	}
	e.Illuminated, e.Waxing = il.Fraction, il.Waxing
	return nil
}

func (c *collector) phases(k config.Kind) error {
	from, to := c.span(0)
	ps, err := c.sky.phasesBetween(from, to)
	if err != nil {
		return err
	}
	for _, p := range ps {
		name := phaseNames[p.Kind]
		if k.Name != "moon-phases" && k.Name != name {
			continue
		}
		if err := c.addLit(Event{Kind: config.Kind{Name: name}, Start: p.Time}); err != nil {
			return err
		}
	}
	return nil
}

// phasesBetween returns the Moon's phases with from ≤ Time < to: from the
// Sky's list, found once for every feed and chart of a build, when the Sky
// covers the span (astro.MoonPhases solves each phase on its own, so the
// instants are those of a search over the span alone), else searched.
func (sky *Sky) phasesBetween(from, to time.Time) ([]astro.Phase, error) {
	if from.Before(sky.from) || to.After(sky.to) {
		return astro.MoonPhases(from, to)
	}
	all, err := sky.moonPhases()
	if err != nil {
		return nil, err
	}
	i, _ := slices.BinarySearchFunc(all, from, func(p astro.Phase, t time.Time) int { return p.Time.Compare(t) })
	j, _ := slices.BinarySearchFunc(all, to, func(p astro.Phase, t time.Time) int { return p.Time.Compare(t) })
	return all[i:j], nil
}

// addLit adds a Moon event at its local date, when that date is in range,
// with the Moon's illumination.
func (c *collector) addLit(e Event) error {
	e.Date = localDate(e.Start, c.p.Location)
	if !c.inRange(e.Date) {
		return nil
	}
	if err := c.lit(&e); err != nil {
		return err
	}
	c.events = append(c.events, e)
	return nil
}

func (c *collector) moonRiseSet(k config.Kind) error {
	me, err := c.sky.moonEphemeris()
	if err != nil {
		return err
	}
	first, last := midnight(c.first, c.p.Location), midnight(c.last, c.p.Location)
	var days []astro.Day
	if len(c.p.Skyline) > 0 {
		// first appearance over the skyline, last disappearance behind it
		days, err = me.MoonSkylineDays(c.ctx, c.p.Observer, c.p.Skyline, c.p.Location, first, last)
	} else {
		days, err = me.MoonDays(c.ctx, c.p.Observer, c.p.Location, first, last)
	}
	if err != nil {
		return err
	}
	rising := k.Name == "moonrise"
	for _, d := range days {
		date := civil(d.Date)
		ts := d.Setting
		if rising {
			ts = d.Rising
		}
		if len(ts) == 0 {
			state := d.State
			if state == astro.Crosses {
				// the Moon rises (or sets) about 50 minutes later each day,
				// so about once a month a date has none
				state = 0
			}
			// "No moonrise today" and "No moonset today" are two notes; a
			// Moon up (or down) all day is one, as for the Sun
			family := "moon-horizon"
			if state != astro.AlwaysAbove && state != astro.AlwaysBelow {
				family += ":" + k.Name
			}
			c.notes = append(c.notes, Note{Kind: k, Date: date, State: state, Family: family})
			continue
		}
		for _, t := range ts {
			e := Event{Kind: k, Start: t, Date: date, Direction: astro.Setting}
			if rising {
				e.Direction = astro.Rising
			}
			if err := c.lit(&e); err != nil {
				return err
			}
			if e.Azimuth, err = me.MoonAzimuth(c.p.Observer, t); err != nil {
				return err
			}
			c.events = append(c.events, e)
		}
	}
	return nil
}

func (c *collector) moonTransits(k config.Kind) error {
	me, err := c.sky.moonEphemeris()
	if err != nil {
		return err
	}
	from, to := c.span(0)
	ts, err := me.MoonTransits(c.p.Observer, from, to)
	if err != nil {
		return err
	}
	for _, t := range ts {
		if err := c.addLit(Event{Kind: k, Start: t.Time, Altitude: t.Altitude}); err != nil {
			return err
		}
	}
	return nil
}

func (c *collector) darkWindows(k config.Kind) error {
	me, err := c.sky.moonEphemeris()
	if err != nil {
		return err
	}
	from, to := midnight(c.first, c.p.Location), midnight(c.last, c.p.Location)
	var nights []astro.Night
	if len(c.p.Skyline) > 0 { // the Moon behind the hills is out of the sky
		nights, err = me.DarkSkylineWindows(c.ctx, c.p.Observer, c.p.Skyline, c.p.Location, from, to, c.maxLit)
	} else {
		nights, err = me.DarkWindows(c.ctx, c.p.Observer, c.p.Location, from, to, c.maxLit)
	}
	if err != nil {
		return err
	}
	for _, n := range nights {
		date := civil(n.Date)
		if len(n.Windows) == 0 {
			st := astro.AlwaysAbove // no astronomical night: the Sun stays above −18°
			if n.State == astro.Moonlit {
				st = astro.AlwaysBelow // dark enough, but the Moon is up and bright
			}
			c.notes = append(c.notes, Note{Kind: k, Date: date, State: st, Family: "dark-window"})
			continue
		}
		for _, w := range n.Windows {
			e := Event{Kind: k, Start: w.Start, End: w.End, Date: date}
			c.events = append(c.events, e)
		}
	}
	return nil
}

func percent(f float64) string {
	return fmt.Sprintf("%d %%", int(math.Round(f*100)))
}

func waxing(e Event) string {
	if e.Waxing {
		return "waxing"
	}
	return "waning"
}

// moonMeaning is the meaning of the entries of a Moon kind at site s (one
// line of the calendar's description, kindMeanings), "" for other kinds;
// maxLit is a dark window's largest illuminated fraction still dark.
func moonMeaning(s *config.Site, kind string, maxLit float64) string {
	name := plainNames[kind]
	switch kind {
	case "new-moon":
		return name + ": the Moon passes between the Earth and the Sun and is not seen; the darkest nights of the month are around now."
	case "first-quarter":
		return name + ": the Moon is 90° east of the Sun, half lit, high in the evening sky and setting around midnight."
	case "full-moon":
		return name + ": the Moon is opposite the Sun and fully lit; away from the polar regions it rises around sunset and sets around sunrise."
	case "last-quarter":
		return name + ": the Moon is 90° west of the Sun, half lit, rising around midnight and high in the morning sky."
	case "moonrise", "moonset":
		return limbMeaning(s, kind, "Moon", kind == "moonrise")
	case "moon-transit":
		return name + ": the Moon crosses the meridian, its highest of the day (below the horizon on some dates)."
	case "dark-window":
		down := "below the horizon"
		switch {
		case len(s.Skyline) > 0:
			down = "behind the site's skyline"
		case s.OwnHorizon():
			// the Moon's rise and set over the site's horizon altitude
			// (limbMeaning), the Sun's 18° under the flat horizon
			down = "below the site's horizon (" + horizonHeight(s.Horizon) + ")"
		}
		m := name + ": the Sun is more than 18° below the horizon and the Moon is " + down
		if maxLit > 0 {
			m += " or less than " + percent(maxLit) + " lit"
		}
		m += "."
		switch {
		case len(s.Skyline) > 0:
			m += " The Sun's 18° are counted from the flat horizon, not the skyline: the glow of twilight lights the sky over the hills as well."
		case s.OwnHorizon():
			m += " The Sun's 18° are counted from the flat horizon, not the site's horizon."
		}
		return m
	}
	return ""
}

// describeMoon gives the title, its row's form (describe) and the
// description of a Moon event: its own
// times and numbers; what the kind means is in the calendar's description
// (moonMeaning), as is the site (LOCATION and GEO).
func describeMoon(s *siteInfo, e Event) (title, row, desc string) {
	loc := s.TimeZone.Location
	at := localClock(e.Start, loc)
	title = plainNames[e.Kind.Name]
	var b strings.Builder
	switch e.Kind.Name {
	case "new-moon", "first-quarter", "full-moon", "last-quarter":
		fmt.Fprintf(&b, "%s at %s (%s UTC).", title, at, ToSecond(e.Start).UTC().Format("2006-01-02 15:04:05"))
		b.WriteString(FutureNote(e.Start))
	case "moonrise", "moonset":
		title = fmt.Sprintf("%s (%s, %s lit)", title, waxing(e), percent(e.Illuminated))
		over := ""
		if len(s.Skyline) > 0 {
			over = " over the skyline"
		}
		fmt.Fprintf(&b, "%s%s at %s, azimuth %s); %s, %s lit.", plainNames[e.Kind.Name], over, at,
			appendAzimuthWords(nil, &e), waxing(e), percent(e.Illuminated))
	case "moon-transit":
		title = "Moon highest, " + height(e.Altitude, "up")
		fmt.Fprintf(&b, "Moon highest at %s, at %s altitude", at, degrees(e.Altitude))
		if e.Altitude < 0 {
			b.WriteString(", below the horizon")
		}
		fmt.Fprintf(&b, " (%s, %s lit).", waxing(e), percent(e.Illuminated))
	case "dark-window":
		length := hm(ToSecond(e.End).Sub(ToSecond(e.Start)))
		// the night is the row's (RowTitle)
		row = "Dark sky, " + length
		title = row + ", " + NightOf(e.Date, loc)
		fmt.Fprintf(&b, "Dark sky on the %s from ", NightOf(e.Date, loc))
		b.Write(s.zone.appendSpanDays(nil, e.Start, e.End, e.Date))
		b.WriteString(length + ").")
		b.WriteString(s.zone.clocksDuring(e.Start, e.End))
	default:
		return e.Kind.String(), "", fmt.Sprintf("%s at %s.", e.Kind, at)
	}
	return title, row, b.String()
}

// describeMoonNote gives the all-day entry for a date without a Moon event,
// as describeNote does.
func describeMoonNote(s *siteInfo, n Note) (title, row, desc string) {
	switch n.Kind.Name {
	case "moonrise", "moonset":
		verb := map[string]string{"moonrise": "rise", "moonset": "set"}[n.Kind.Name]
		switch {
		case n.State == astro.AlwaysAbove && len(s.Skyline) > 0:
			title = "The Moon stays over the skyline all day"
		case n.State == astro.AlwaysBelow && len(s.Skyline) > 0:
			title = "The Moon stays behind the skyline all day"
		case n.State == astro.AlwaysAbove:
			title = "The Moon stays above the horizon all day"
		case n.State == astro.AlwaysBelow:
			title = "The Moon stays below the horizon all day"
		default:
			title, row = onDate("No moon"+verb, "today", "")
			return title, row, row + ": the Moon " + verb + "s about 50 minutes later each day."
		}
	case "moon-transit":
		// the site and the date are the entry's LOCATION and date
		title, row = onDate("No Moon transit", "today", ": the Moon crosses the meridian about 50 minutes later each day")
		return title, row, row + "."
	case "dark-window":
		why := "the Moon is up and bright all through the astronomical night"
		switch {
		case n.State == astro.AlwaysAbove:
			why = "the Sun stays less than 18° below the horizon"
		case len(s.Skyline) > 0:
			why = "the Moon is over the skyline and bright all through the astronomical night"
		}
		title, row = onNight("No dark sky", n.Date, s.TimeZone.Location, ": "+why)
		return title, row, title + "."
	default:
		title = n.Kind.String()
	}
	// the site and the date are the entry's LOCATION and date
	return title, "", title + "."
}

// ClocksDuring is the sentence a span's description writes when the clocks
// of loc change between start and end (each as shown, to the second: see
// ToSecond), without its leading space: "The clocks go back from summer
// time by 1 h during it: 03:00 AEDT becomes 02:00 AEST."; "" when they do
// not change. The served day-by-day tables write it beside such a row.
func ClocksDuring(start, end time.Time, loc *time.Location) string {
	return strings.TrimPrefix(clocksDuring(ToSecond(start), ToSecond(end), loc), " ")
}

// clocksDuring says how the clocks of loc change between start and end, "
// The clocks go back from summer time by 1 h during it: 03:00 AEDT becomes
// 02:00 AEST." (Australia/Melbourne, 4 April 2027), so that a span's clock
// times, which the change puts nearer or further apart than its length,
// read with it; "" when they do not change, or change and change back
// (then the clock times read with the length again).
func clocksDuring(start, end time.Time, loc *time.Location) string {
	_, from := start.In(loc).Zone()
	if _, to := end.In(loc).Zone(); from == to {
		return "" // nearly every span: the walk of the changes is not needed
	}
	return spanClockChanges(start, end, loc)
}

// spanClockChanges is clocksDuring of a span whose two ends' offsets differ:
// the sentence of each change of the clocks between start and end.
func spanClockChanges(start, end time.Time, loc *time.Location) string {
	var b strings.Builder
	for ch := range OffsetChanges(loc, start, end) {
		prev, next := ch.At.Add(-time.Second).In(loc), ch.At.In(loc)
		before, _ := prev.Zone()
		after, _ := next.Zone()
		was := ch.At.In(time.FixedZone(ZoneLabel(before), ch.Before))
		now := ch.At.In(time.FixedZone(ZoneLabel(after), ch.After))
		// summer time is the clock's after a change forward, before one back
		by, forward, summer := time.Duration(ch.After-ch.Before)*time.Second, ch.After > ch.Before, next.IsDST()
		if !forward {
			by, summer = -by, prev.IsDST()
		}
		fmt.Fprintf(&b, " The clocks %s during it: %s %s becomes %s %s.", ClocksGo(forward, summer, by),
			ChangeClock(was), ZoneLabel(before), ChangeClock(now), ZoneLabel(after))
	}
	return b.String()
}

// clocksDuring is clocksDuring of the span from start to end as shown (to
// the second), its two ends' offsets looked up in z: nearly every span has
// the same at both, and then nothing more is looked up (nor looked up again
// in the zone when they differ).
func (z *zoneCache) clocksDuring(start, end time.Time) string {
	_, from := z.at(UnixSecond(start))
	if _, to := z.at(UnixSecond(end)); from == to {
		return ""
	}
	return spanClockChanges(ToSecond(start), ToSecond(end), z.loc)
}
