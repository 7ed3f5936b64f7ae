package feed

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"time"

	"heliocal/astro"
	"heliocal/config"
)

// Eclipses of the Sun and the Moon for a site: the global search runs once
// per Sky (every eclipse of its span), and each site then takes the local
// circumstances of those it sees.

// eclipseList is the global search of one Sky.
type eclipseList struct {
	solar []*astro.SolarEclipse
	lunar []*astro.LunarEclipse
	err   error
}

// eclipseSearch finds every eclipse of the Sky's span, once.
func (s *Sky) eclipseSearch() *eclipseList {
	s.eclipseOnce.Do(func() {
		l := &s.eclipses
		l.solar, l.err = astro.SolarEclipses(s.from, s.to)
		if l.err == nil {
			l.lunar, l.err = astro.LunarEclipses(s.from, s.to)
		}
	})
	return &s.eclipses
}

// eclipses adds the eclipses the site sees: those with any part (first to
// last contact, P1 to P4 for the Moon) while the body is above the site's
// horizon, on the local date of their first contact.
func (c *collector) eclipses(k config.Kind) error {
	list := c.sky.eclipseSearch()
	if list.err != nil {
		return list.err
	}
	o := c.p.Observer
	if err := o.Validate(); err != nil {
		return err
	}
	var me *astro.MoonEphemeris
	add := func(start, end time.Time, x EclipseFacts) error {
		e := Event{Kind: k, Start: start, End: end, Date: localDate(start, c.p.Location)}
		if !c.inRange(e.Date) {
			return nil
		}
		if len(c.p.Skyline) > 0 { // the part over the skyline is what the site sees
			var err error
			x.Skyline = true
			if x.Solar != nil {
				x.Visible, err = c.sky.eph.SunSkylineSpans(o, c.p.Skyline, start, end)
			} else {
				if me == nil {
					if me, err = c.sky.moonEphemeris(); err != nil {
						return err
					}
				}
				x.Visible, err = me.MoonSkylineSpans(o, c.p.Skyline, start, end)
			}
			if err != nil {
				return err
			}
		}
		e.more = &eventMore{eclipse: x}
		c.events = append(c.events, e)
		return nil
	}
	if k.Name == "solar-eclipse" {
		for _, e := range list.solar {
			if l, ok := e.Local(o); ok && l.Visible() {
				if err := c.riseSetAsEntries(l.Horizon, nil); err != nil {
					return err
				}
				if err := add(l.C1.Time, l.C4.Time, EclipseFacts{Solar: &l}); err != nil {
					return err
				}
			}
		}
		return nil
	}
	for _, e := range list.lunar {
		if l := e.Local(o); l.Visible() {
			if len(l.Horizon) > 0 && me == nil {
				var err error
				if me, err = c.sky.moonEphemeris(); err != nil {
					return err
				}
			}
			if err := c.riseSetAsEntries(l.Horizon, me); err != nil {
				return err
			}
			if err := add(l.P1.Time, l.P4.Time, EclipseFacts{Lunar: &l}); err != nil {
				return err
			}
		}
	}
	return nil
}

// riseSetAsEntries puts each sunrise or sunset (me nil) or moonrise or
// moonset during an eclipse at the instant the sunrise, sunset, moonrise
// and moonset entries give it. The eclipse's own search of the horizon works
// from its fitted positions and lands a few tenths of a second away, enough
// for its text to say a second other than the entry beside it. A rise or set
// the entries' search does not find within a minute keeps its time.
func (c *collector) riseSetAsEntries(hs []astro.HorizonEvent, me *astro.MoonEphemeris) error {
	o := c.p.Observer
	for i := range hs {
		h := &hs[i]
		from, to := h.Time.Add(-time.Minute), h.Time.Add(time.Minute)
		var xs []astro.Crossing
		var err error
		if me != nil {
			xs, err = me.MoonRiseSet(o, from, to)
		} else {
			xs, err = c.sky.eph.SunCrossings(o, o.RiseSetAltitude(), from, to)
		}
		var re *astro.RangeError
		if errors.As(err, &re) {
			continue // at an end of the sky's span: the eclipse's own time
		}
		if err != nil {
			return err
		}
		for _, x := range xs {
			if x.Direction == h.Direction && x.Time.Sub(h.Time).Abs() < time.Minute {
				h.Time = x.Time
				break
			}
		}
	}
	return nil
}

// Cautions and conventions written into every eclipse entry.
const (
	cautionEclipse = "Never look at the Sun without eye protection made to the ISO 12312-2 standard " +
		"(eclipse glasses or a hand-held solar viewer): sunglasses do not protect, and neither do " +
		"unfiltered cameras, binoculars or telescopes. Follow the advice of your local health authority."
	solarMethod = "Computed for the site from Besselian elements of heliocal's own Sun and Moon, with the " +
		"Moon's mean limb (k = 0.2725076): the Moon's mountains can move second and third contact by a " +
		"second or two. Sun altitudes are geometric, for the Sun's centre."
	lunarMethod = "The contacts are the same for everyone who sees the Moon. The Earth's shadow is enlarged " +
		"by Danjon's rule (1/85 of the Earth's radius for the atmosphere), as in NASA's Five Millennium " +
		"Canon of Lunar Eclipses; other conventions move the contacts by up to about a minute. " +
		"A lunar eclipse is safe to watch with the naked eye."
)

// share writes a fraction as a whole percentage like percent, "89 %", but a
// fraction that is not zero never rounds to "0 %" and one below 1 never to
// "100 %" (an eclipse of 0.3 % is still an eclipse), nor up or down to a
// figure it is not: 0.1 % is "less than 1 %", 99.7 % "more than 99 %".
func share(f float64) string {
	p := math.Round(f * 100)
	switch {
	case p == 0 && f > 0:
		return "less than 1 %"
	case p == 100 && f < 1:
		return "more than 99 %"
	}
	return fmt.Sprintf("%.0f %%", p)
}

// bodyPlace describes a body's place at a contact: "Sun 23° high in the
// southwest", "Sun on the horizon in the west" (up, but its centre less
// than 1° high: refraction lifts it into sight) or "Sun below the horizon".
func bodyPlace(body string, c astro.Contact) string {
	switch {
	case !c.Up:
		return body + " below the horizon"
	case c.Altitude < 1:
		return fmt.Sprintf("%s on the horizon in the %s (azimuth %.0f°)", body, astro.CompassPoint(c.Azimuth), c.Azimuth)
	}
	return fmt.Sprintf("%s %.0f° high in the %s (azimuth %.0f°)", body, c.Altitude, astro.CompassPoint(c.Azimuth), c.Azimuth)
}

// describeEclipse gives the title and description of an eclipse entry.
func describeEclipse(s *siteInfo, e Event) (string, string) {
	x := e.EclipseFacts()
	if x.Solar != nil {
		return describeSolar(s, e, x)
	}
	return describeLunar(s, e, x)
}

// skylineText says, for an eclipse at a site with a skyline, when the body
// (body: "Sun" or "Moon") is over the skyline, so seen from the site, and
// adds to the title ("behind the skyline here", "partly behind the
// skyline"); phase names the eclipse's phase at an instant of it. It
// returns "" and the title unchanged at a site without one. x is e's
// circumstances.
func skylineText(s *siteInfo, e Event, x *EclipseFacts, body, title string, phase func(time.Time) string) (string, string) {
	if !x.Skyline {
		return "", title
	}
	loc := s.TimeZone.Location
	if len(x.Visible) == 0 {
		return fmt.Sprintf("The %s stays behind the site's skyline all through the eclipse: none of it can be seen from the site.\n", body),
			title + " (behind the skyline here)"
	}
	if len(x.Visible) == 1 && !x.Visible[0].Start.After(e.Start) && !x.Visible[0].End.Before(e.End) {
		return fmt.Sprintf("The %s is over the site's skyline all through the eclipse.\n", body), title
	}
	var b strings.Builder
	var seen time.Duration
	for _, v := range x.Visible {
		seen += v.Length
		if v.Start.After(e.Start) {
			fmt.Fprintf(&b, "The %s appears over the site's skyline at %s, %s.\n", body, localClock(v.Start, loc), phase(v.Start))
		}
		if v.End.Before(e.End) {
			fmt.Fprintf(&b, "The %s disappears behind the site's skyline at %s, %s.\n", body, localClock(v.End, loc), phase(v.End))
		}
	}
	fmt.Fprintf(&b, "Seen from the site, over its skyline, for %s of the eclipse's %s.\n",
		hm(seen), hm(span(e.Start, e.End)))
	return b.String(), title + " (partly behind the skyline)"
}

// aboveHorizon says, for an eclipse from start to end during which the
// body ("Sun", "Moon") rises or sets (hs, in order; up: whether it is
// above the horizon at start), when it is above the horizon, which is what
// the site sees of the entry's span (the whole eclipse): "The Moon is above
// the horizon, so seen from the site, from moonrise at 07:36:26 UTC to the
// end of the eclipse at 09:03:09 UTC: 1 h 27 min of the eclipse's 3 h 39
// min.\n", a time on another date than the one said before it (at first
// d) followed by its date (appendDayOf, against d), as appendSpanDays marks
// a span's end; rise and set name the body's rising and setting
// ("moonrise", "moonset"). "" when it neither rises nor sets.
func aboveHorizon(s *siteInfo, body string, hs []astro.HorizonEvent, up bool, start, end, d time.Time, rise, set string) string {
	if len(hs) == 0 {
		return ""
	}
	z := s.zone
	b := append(append([]byte("The "), body...), " is above the horizon, so seen from the site,"...)
	said := d // the date of the time said last
	at := func(t time.Time) {
		b = z.appendClock(b, t)
		if td := z.dateOf(t); !td.Equal(said) {
			b, said = z.appendDayOf(b, t, d), td
		}
	}
	var seen time.Duration
	from, fromWords, n := start, "the start of the eclipse", 0
	span := func(to time.Time, toWords string) {
		if n > 0 {
			b = append(b, " and"...)
		}
		n++
		b = append(append(append(b, " from "...), fromWords...), " at "...)
		at(from)
		b = append(append(append(b, " to "...), toWords...), " at "...)
		at(to)
		seen += ToSecond(to).Sub(ToSecond(from))
	}
	for _, h := range hs {
		switch {
		case h.Direction == astro.Rising && !up:
			from, fromWords, up = h.Time, rise, true
		case h.Direction == astro.Setting && up:
			span(h.Time, set)
			up = false
		}
	}
	if up {
		span(end, "the end of the eclipse")
	}
	b = append(appendHM(append(b, ": "...), seen), " of the eclipse's "...)
	return string(append(appendHM(b, ToSecond(end).Sub(ToSecond(start))), ".\n"...))
}

// horizonPart is the bracket of an eclipse's title that says which part of
// it the site sees when the body ("Sun", "Moon") rises or sets during it
// (hs), rise and set naming its rising and setting: " (seen from
// moonrise)", " (seen until sunset)", " (the Sun rises and sets during it)"
// when it does both (near the polar circles); "" when it does neither. The
// entry spans the whole eclipse; its description says when (aboveHorizon).
func horizonPart(body string, hs []astro.HorizonEvent, rise, set string) string {
	rises, sets := false, false
	for _, h := range hs {
		if h.Direction == astro.Rising {
			rises = true
		} else {
			sets = true
		}
	}
	switch {
	case rises && sets:
		return " (the " + body + " rises and sets during it)"
	case rises:
		return " (seen from " + rise + ")"
	case sets:
		return " (seen until " + set + ")"
	}
	return ""
}

// placeAt is bodyPlace, with "behind the skyline" for a body above the
// horizon but behind the site's skyline.
func placeAt(x *EclipseFacts, body string, c astro.Contact) string {
	p := bodyPlace(body, c)
	if c.Up && !x.seen(c.Time) {
		p += ", behind the site's skyline"
	}
	return p
}

func describeSolar(s *siteInfo, e Event, x *EclipseFacts) (string, string) {
	l := x.Solar
	loc := s.TimeZone.Location
	typ := l.Type.String()
	var b strings.Builder
	fmt.Fprintf(&b, "%s solar eclipse seen from %s, %s to %s%s.\n", Capital(typ), s.where,
		localClock(l.C1.Time, loc), localClock(l.C4.Time, loc), s.zone.appendDayOf(nil, l.C4.Time, e.Date))
	if !x.Skyline { // else the skyline's text below says it
		b.WriteString(aboveHorizon(s, "Sun", l.Horizon, l.C1.Up, l.C1.Time, l.C4.Time, e.Date, "sunrise", "sunset"))
	}
	line := func(name string, c astro.Contact, extra string) {
		fmt.Fprintf(&b, "%s %s; %s%s.\n", localClock(c.Time, loc), name, placeAt(x, "Sun", c), extra)
	}
	line("first contact, the Moon begins to cover the Sun", l.C1, "")
	if !l.C2.IsZero() {
		line("second contact, the "+typ+" phase begins", l.C2, "")
	}
	cover := fmt.Sprintf("; the Moon covers %s of the Sun's diameter and %s of its disc", share(l.Magnitude), share(l.Obscuration))
	if l.Type != astro.Partial {
		cover = fmt.Sprintf("; the Moon's disc is %s the Sun's diameter (magnitude %.3f), the %s phase lasts %s",
			share(l.Magnitude), l.Magnitude, typ, Length(span(l.C2.Time, l.C3.Time), time.Second))
	}
	line("greatest eclipse", l.Max, cover)
	if !l.C3.IsZero() {
		line("third contact, the "+typ+" phase ends", l.C3, "")
	}
	line("last contact, the eclipse ends", l.C4, "")
	best := l.Magnitude
	if !l.Max.Up {
		best = 0
	}
	for _, h := range l.Horizon {
		if x.Skyline {
			best = math.Max(best, h.Magnitude)
			continue // the skyline's appearance and disappearance are said below
		}
		verb, state := "rises", "already eclipsed"
		if h.Direction == astro.Setting {
			verb, state = "sets", "still eclipsed"
		}
		fmt.Fprintf(&b, "The Sun %s at %s %s, %s of its diameter covered.\n", verb, localClock(h.Time, loc), state, share(h.Magnitude))
		best = math.Max(best, h.Magnitude)
	}
	if !l.Max.Up && !x.Skyline {
		b.WriteString("Greatest eclipse happens with the Sun below the horizon here; the part listed above the horizon is what can be seen.\n")
	}
	eclipsed := func(time.Time) string { return "eclipsed" }
	over, _ := skylineText(s, e, x, "Sun", "", eclipsed)
	b.WriteString(over)
	if g := l.Eclipse.Type; g != l.Type && !(g == astro.Hybrid && l.Type != astro.Partial) {
		fmt.Fprintf(&b, "Elsewhere on the Earth this eclipse is %s.\n", g)
	}
	b.WriteString(cautionEclipse + "\n" + solarMethod)
	b.WriteString(FutureNote(l.Max.Time))

	title := fmt.Sprintf("%s solar eclipse: %s of the Sun's diameter covered", Capital(typ), share(best))
	switch l.Type {
	case astro.Total:
		title = fmt.Sprintf("Total solar eclipse: %s of totality", Length(span(l.C2.Time, l.C3.Time), time.Second))
	case astro.Annular:
		title = fmt.Sprintf("Annular solar eclipse: %s of annularity", Length(span(l.C2.Time, l.C3.Time), time.Second))
	}
	if l.Type != astro.Partial && (!l.C2.Up || !l.C3.Up) {
		title = fmt.Sprintf("%s solar eclipse at the horizon", Capital(typ))
	}
	if !x.Skyline { // else the skyline's suffix
		title += horizonPart("Sun", l.Horizon, "sunrise", "sunset")
	}
	_, title = skylineText(s, e, x, "Sun", title, eclipsed)
	return title, b.String()
}

func describeLunar(s *siteInfo, ev Event, x *EclipseFacts) (string, string) {
	l := x.Lunar
	loc := s.TimeZone.Location
	e := l.Eclipse
	typ := e.Type.String()
	var b strings.Builder
	fmt.Fprintf(&b, "%s lunar eclipse seen from %s, %s to %s%s.\n", Capital(typ), s.where,
		localClock(l.P1.Time, loc), localClock(l.P4.Time, loc), s.zone.appendDayOf(nil, l.P4.Time, ev.Date))
	if !x.Skyline { // else the skyline's text below says it
		b.WriteString(aboveHorizon(s, "Moon", l.Horizon, l.P1.Up, l.P1.Time, l.P4.Time, ev.Date, "moonrise", "moonset"))
	}
	line := func(name string, c astro.Contact, extra string) {
		if c.IsZero() {
			return
		}
		fmt.Fprintf(&b, "%s %s; %s%s.\n", localClock(c.Time, loc), name, placeAt(x, "Moon", c), extra)
	}
	line("the Moon enters the faint outer shadow (penumbra)", l.P1, "")
	line("the partial eclipse begins: the Moon enters the dark shadow (umbra)", l.U1, "")
	line("the total eclipse begins", l.U2, "")
	var depth string
	switch e.Type {
	case astro.Total:
		depth = fmt.Sprintf("; umbral magnitude %.3f: the whole Moon is in the Earth's shadow, "+
			"its far edge %s of its diameter inside; totality lasts %s", e.UmbralMagnitude,
			share(e.UmbralMagnitude-1), Length(span(e.U2, e.U3), time.Second))
	case astro.Partial:
		depth = fmt.Sprintf("; umbral magnitude %.3f: %s of the Moon's diameter is in the Earth's shadow",
			e.UmbralMagnitude, share(e.UmbralMagnitude))
	default:
		depth = fmt.Sprintf("; penumbral magnitude %.3f: %s of the Moon's diameter is in the faint outer shadow, "+
			"a slight dimming that is easy to miss", e.PenumbralMagnitude, share(e.PenumbralMagnitude))
	}
	line("greatest eclipse", l.Greatest, depth)
	line("the total eclipse ends", l.U3, "")
	line("the partial eclipse ends: the Moon leaves the umbra", l.U4, "")
	line("the Moon leaves the penumbra: the eclipse ends", l.P4, "")
	for _, h := range l.Horizon {
		verb := "rises"
		if h.Direction == astro.Setting {
			verb = "sets"
		}
		if x.Skyline {
			continue // the skyline's appearance and disappearance are said below
		}
		fmt.Fprintf(&b, "The Moon %s at %s during the eclipse (%s).\n", verb, localClock(h.Time, loc), lunarPhaseAt(e, h.Time))
	}
	phase := func(t time.Time) string { return lunarPhaseAt(e, t) }
	over, _ := skylineText(s, ev, x, "Moon", "", phase)
	b.WriteString(over)
	b.WriteString(lunarMethod)
	b.WriteString(FutureNote(e.Greatest))

	var title string
	switch e.Type {
	case astro.Total:
		title = fmt.Sprintf("Total lunar eclipse: the Moon in the Earth's shadow for %s", hm(span(e.U2, e.U3)))
	case astro.Partial:
		title = fmt.Sprintf("Partial lunar eclipse: %s of the Moon's diameter in the Earth's shadow", share(e.UmbralMagnitude))
	default:
		title = "Penumbral lunar eclipse: a slight dimming of the Moon"
	}
	if !x.Skyline { // else the skyline's suffix
		title += horizonPart("Moon", l.Horizon, "moonrise", "moonset")
	}
	_, title = skylineText(s, ev, x, "Moon", title, phase)
	return title, b.String()
}

// lunarPhaseAt names the phase of a lunar eclipse in progress at t.
func lunarPhaseAt(e *astro.LunarEclipse, t time.Time) string {
	in := func(a, b time.Time) bool { return !a.IsZero() && !t.Before(a) && t.Before(b) }
	switch {
	case in(e.U2, e.U3):
		return "in the total phase"
	case in(e.U1, e.U4):
		return "in the partial phase"
	}
	return "in the penumbral phase, hardly noticeable"
}
