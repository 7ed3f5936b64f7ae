package feed

import (
	"fmt"
	"math"
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
	// partBehindSkyline: no natural light on the date because the Sun, up
	// over the flat horizon at noon, stays behind the site's skyline (or
	// under its horizon altitude) all day. Not polar night.
	partBehindSkyline = "behind-skyline"
)

// daylight is the natural light of one local date, counted as the day
// length of the daily summary and photoperiod is (dayLengths, dayEnds): a
// daylight period shorter than a day belongs whole to the date of its
// sunrise, even when its sunset falls after midnight; a longer one counts on
// each date for its own part, except its end on a date with light of its
// own, which is that date's day alone. first is the date's first instant of light (its start when
// the Sun is up from a longer period), last the end of its last one (its end
// when the Sun stays up). dawnFrom is when the dark before first begins
// (first itself when there is none), duskTo when the dark after last ends
// (last itself when there is none); zero when not known. Lamps go only in
// that dark. touched reports light on the date that belongs to an earlier
// date's day.
type daylight struct {
	length           time.Duration
	first, last      time.Time
	dawnFrom, duskTo time.Time
	touched          bool
}

// lightSpan is a period of light: from r to s (Unix nanoseconds), the
// crossings xs[ri] and xs[si] of the threshold's; ri < 0 when it began
// before the crossings (r is then math.MinInt64), si < 0 when it does not
// end within them (s is math.MaxInt64, and the end is never).
type lightSpan struct {
	r, s   int64
	ri, si int32
}

// never is the end of a period of light that does not end within the
// crossings: far away.
var never = time.Unix(1<<40, 0).UTC()

var (
	// lightSpans and daylightBuffers hold the scratch slices of
	// daylights and lighting, for the next feed's.
	lightSpans      slicePool[lightSpan]
	daylightBuffers slicePool[daylight]
)

// daylights returns, for each local date first..last, the light above alt;
// the caller gives the slice back to daylightBuffers when done with it.
// Instants are compared as Unix nanoseconds (which hold every instant
// astro serves), and the daylight's are the crossings' and midnights'
// own.
func (c *collector) daylights(alt float64) ([]daylight, error) {
	th, err := c.threshold(alt)
	if err != nil {
		return nil, err
	}
	// the periods above alt, as indices of their crossings: before the
	// span (r) or never (s) when the index is negative
	xs := th.xs
	spans := lightSpans.get(len(xs)/2 + 2)
	defer func() { lightSpans.put(spans) }()
	if th.upFirst {
		spans = append(spans, lightSpan{r: math.MinInt64, s: math.MaxInt64, ri: -1, si: -1})
	}
	for k := range xs {
		x := &xs[k]
		if x.Direction == astro.Rising {
			spans = append(spans, lightSpan{r: x.Time.UnixNano(), s: math.MaxInt64, ri: int32(k), si: -1})
		} else if n := len(spans); n > 0 && spans[n-1].si < 0 {
			spans[n-1].s, spans[n-1].si = x.Time.UnixNano(), int32(k)
		}
	}
	rise := func(sp *lightSpan) time.Time {
		if sp.ri < 0 {
			return time.Time{}
		}
		return xs[sp.ri].Time
	}
	set := func(sp *lightSpan) time.Time {
		if sp.si < 0 {
			return never
		}
		return xs[sp.si].Time
	}
	late, err := c.dayEnds(alt)
	if err != nil {
		return nil, err
	}
	unixNano := func(t time.Time) int64 { // zero: none
		if t.IsZero() {
			return math.MinInt64
		}
		return t.UnixNano()
	}
	starts := c.dayStarts()
	out := daylightBuffers.get(len(starts) - 3)[:len(starts)-3]
	j := 0
	startN, endN := starts[1].UnixNano(), int64(0)
	endsHere := unixNano(late[1])
	for i := range out {
		dl := &out[i]
		endN = starts[i+2].UnixNano()
		// the days of the date before and of this one, past midnight
		endsBefore := endsHere
		endsHere = unixNano(late[i+2])
		for j < len(spans) && spans[j].s < startN {
			j++
		}
		if j < len(spans) && wholeWithin(spans, j, startN, endN) {
			// the one period of light of most dates, from its rise to its
			// set within the date: what the loop below finds for it,
			// without the loop; written field by field (a literal was
			// made aside and copied in)
			sp := &spans[j]
			dl.length, dl.first, dl.last, dl.touched = time.Duration(sp.s-sp.r), xs[sp.ri].Time, xs[sp.si].Time, false
			dl.dawnFrom, dl.duskTo = time.Time{}, time.Time{}
			if j > 0 {
				dl.dawnFrom = set(&spans[j-1])
			}
			if j+1 < len(spans) {
				dl.duskTo = rise(&spans[j+1])
			}
			startN = endN
			continue
		}
		*dl = daylight{}
		fi, li := -1, -1
		var firstN, lastN int64
		for k := j; k < len(spans) && spans[k].r < endN; k++ {
			sp := &spans[k]
			a, b := sp.r, sp.s
			if a < startN {
				if b == endsBefore { // the date before's day
					dl.touched = true
					continue
				}
				if (sp.ri < 0 || b-a >= int64(24*time.Hour)) && b < endN && k+1 < len(spans) && spans[k+1].r < endN {
					// the end of a period of a day or more (the
					// midnight Sun's), on a date with light of its own:
					// not the date's day (dayLengths, dropLongTails)
					dl.touched = true
					continue
				}
				a = startN
			}
			if b > endN && b != endsHere {
				b = endN
			}
			if b <= a {
				continue
			}
			dl.length += time.Duration(b - a)
			if fi < 0 {
				fi, firstN = k, a
				if a == sp.r {
					dl.first = rise(sp)
				} else {
					dl.first = starts[i+1]
				}
			}
			li, lastN = k, b
			if b == sp.s {
				dl.last = set(sp)
			} else {
				dl.last = starts[i+2]
			}
		}
		if fi >= 0 {
			switch {
			case firstN > spans[fi].r:
				dl.dawnFrom = dl.first // up since before the date
			case fi > 0:
				dl.dawnFrom = set(&spans[fi-1])
			}
			switch {
			case lastN < spans[li].s:
				dl.duskTo = dl.last // up after the date
			case li+1 < len(spans):
				dl.duskTo = rise(&spans[li+1])
			}
		}
		startN = endN
	}
	return out, nil
}

// wholeWithin reports whether spans[j] is the only period of light that
// the local date from startN to endN (Unix nanoseconds) has, and lies
// whole within it: from a rise after the date's start to a set before its
// end, with no other period of light before the date ends (spans[j-1]
// ended before the date began, as daylights skips the periods that ended
// before it). The date's day is then that period, as daylights counts it.
func wholeWithin(spans []lightSpan, j int, startN, endN int64) bool {
	sp := &spans[j]
	return sp.ri >= 0 && sp.si >= 0 && sp.r >= startN && sp.s < endN && sp.s > sp.r &&
		(j+1 == len(spans) || spans[j+1].r >= endN)
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
	defer daylightBuffers.put(days)
	needs := c.flags(len(days))
	for i := range days {
		// a date whose only light is the date before's day, past midnight,
		// has no day of its own and no polar night either: no lamps
		dl := &days[i]
		needs[i] = dl.length < k.DayLength && !(dl.length == 0 && dl.touched)
	}
	// a date the clocks jump over has no day (and no entry): it neither
	// ends a stretch of dates without lamps nor starts one
	for _, g := range c.missing() {
		if i := daysBetween(c.first, g); i >= 0 && i < len(needs) {
			needs[i] = i > 0 && needs[i-1]
		}
	}
	lim := limitsOf(spec)
	minLen := lampMinimum(spec.MinDuration.D())
	lamps := spec.Lamps
	if lamps == "" {
		lamps = config.LampsEvening
	}
	// one period a date: the limit of its side from the table of the
	// limit's instants by date (limitNanos)
	switch {
	case lamps == config.LampsEvening && lim.hasOff:
		lim.offAt, lim.starts = c.limitNanos(lim.off)
	case lamps == config.LampsMorning && lim.hasOn:
		lim.onAt, lim.starts = c.limitNanos(lim.on)
	}
	dates := c.dayDates()
	for i := range days {
		dl, d := &days[i], dates[i]
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
		direct := alt == skylineKey
		if dl.length > 0 && lamps != config.LampsBoth {
			// one period, from sunset or to sunrise: written in place
			c.events = append(c.events, Event{})
			e := &c.events[len(c.events)-1]
			var l LampFacts
			c.onePeriod(e, &l, k, d, i, dl, short, lamps == config.LampsMorning, direct, &lim)
			got, dropped := l.Lamp, time.Duration(0)
			switch {
			case got <= 0:
				got = 0
				c.events = c.events[:len(c.events)-1]
			case got < minLen:
				got, dropped = 0, l.Lamp
				c.events = c.events[:len(c.events)-1]
			default:
				l.Short = got < short
				e.more = c.keepLamps(l)
			}
			if got == 0 {
				c.unscheduled(k, d, dl.length, short, dropped, minLen, &lim)
			}
			continue
		}
		period := func(part string, start, end time.Time) (e lampSpan) {
			c.lampPeriod(&e, k, d, part, start, end, dl.length, direct, &lim)
			return e
		}
		// never while the Sun is up: a morning period starts no earlier
		// than the dark before sunrise, an evening one ends no later than
		// the dark after sunset (short nights at high latitude). With lamps
		// both a night serves two dates, the evening of one and the morning
		// of the next: each gets its half of the night, so the two never
		// burn at once and a date's lamps do not depend on the window.
		dawnFrom, duskTo := dl.dawnFrom, dl.duskTo
		if lamps == config.LampsBoth {
			if !dawnFrom.IsZero() {
				dawnFrom = dawnFrom.Add(dl.first.Sub(dawnFrom) / 2)
			}
			if !duskTo.IsZero() {
				duskTo = dl.last.Add(duskTo.Sub(dl.last) / 2)
			}
		}
		morning := func(n time.Duration) lampSpan {
			from := dl.first.Add(-n)
			if !dawnFrom.IsZero() && from.Before(dawnFrom) {
				from = dawnFrom
			}
			return period(partMorning, from, dl.first)
		}
		evening := func(n time.Duration) lampSpan {
			to := dl.last.Add(n)
			if !duskTo.IsZero() && to.After(duskTo) {
				to = duskTo
			}
			return period(partEvening, dl.last, to)
		}
		var ps [2]lampSpan
		switch {
		case dl.length == 0:
			tr, ok, err := c.noonOf(d)
			if err != nil {
				return err
			}
			noon := tr.Time
			if !ok {
				noon = midnight(d, c.p.Location).Add(12 * time.Hour)
			}
			part := partPolarNight
			if ok && alt != astro.CivilTwilight && c.upAtNoon(tr) {
				part = partBehindSkyline // up at noon, but not over the skyline
			}
			ps[0] = period(part, noon.Add(-short/2), noon.Add(short-short/2))
			if lost := short - ps[0].Lamp; lost > 0 {
				// cut at one end: moved towards the other, as far as its limit allows
				p := period(part, ps[0].Start.Add(-lost), ps[0].End.Add(lost))
				p.MadeUp, p.MadeUpWhy = p.Lamp-ps[0].Lamp, MadeUpClipped
				ps[0] = p
			}
		default:
			ps[0], ps[1] = c.bothPeriods(short, minLen, morning, evening)
		}
		var got, dropped time.Duration
		for i := range ps {
			switch l := ps[i].Lamp; {
			case l <= 0:
			case l < minLen:
				dropped += l
			default:
				got += l
			}
		}
		for i := range ps {
			if p := &ps[i]; p.Lamp >= minLen { // minLen is a minute at least
				p.Short = got < short
				e := p.Event
				e.more = c.keepLamps(p.LampFacts)
				c.events = append(c.events, e)
			}
		}
		if got == 0 {
			c.unscheduled(k, d, dl.length, short, dropped, minLen, &lim)
		}
	}
	return nil
}

// lampSpan is a lamp period of lamps: both, or of polar night, while it
// is placed: its event and its lamp figures, which the event keeps out of
// line once it is scheduled (keepLamps).
type lampSpan struct {
	Event
	LampFacts
}

// keepLamps returns the out-of-line facts of an event with the lamp
// figures l, taken from a block of them (a lighting kind has one or two
// periods a date: one allocation each would cost more than placing the
// period).
func (c *collector) keepLamps(l LampFacts) *eventMore {
	if len(c.lamps) == 0 {
		c.lampBlock = min(max(2*c.lampBlock, 8), 512)
		c.lamps = make([]eventMore, c.lampBlock)
	}
	m := &c.lamps[0]
	c.lamps = c.lamps[1:]
	m.lamps = l
	return m
}

// lampPeriod sets e to the lamp period of kind k on the local date d from
// start to end, clipped to the limits lim; its Lamp is its length.
func (c *collector) lampPeriod(e *lampSpan, k config.Kind, d time.Time, part string, start, end time.Time, length time.Duration, direct bool, lim *lampLimits) {
	e.Kind, e.Start, e.End, e.Date, e.Part, e.DayLength, e.DirectSun = k, start, end, d, part, length, direct
	c.clip(e, lim)
	if !e.End.After(e.Start) {
		e.End = e.Start
	}
	e.Lamp = e.End.Sub(e.Start)
}

// onePeriod sets e and its lamp figures l to the one lamp period of the
// local date d (lamps: morning or evening), as lampPeriod places it: the
// lamp time short before the date's first light (morning) or after its
// last, no further than the dark around that light and than the limit of
// its side (earliest_on, latest_off). The instants are compared as Unix
// nanoseconds, and the period's moving end is made from the instant it is
// taken from.
func (c *collector) onePeriod(e *Event, l *LampFacts, k config.Kind, d time.Time, i int, dl *daylight, short time.Duration, morning, direct bool, lim *lampLimits) {
	// fixed: the sunset the period starts at, or the sunrise it ends at;
	// the other end lies dist away from it, on the side of sign
	fixed, dark, sign, part, limited, table, clock := dl.last, dl.duskTo, int64(1), partEvening, lim.hasOff, lim.offAt, lim.off
	if morning {
		fixed, dark, sign, part, limited, table, clock = dl.first, dl.dawnFrom, -1, partMorning, lim.hasOn, lim.onAt, lim.on
	}
	fixedN := fixed.UnixNano()
	dist, by := int64(short), 0 // by: the lamp time, the dark's bound, the limit
	if !dark.IsZero() {
		if n := sign * (dark.UnixNano() - fixedN); dist > n {
			dist, by = n, 1
		}
	}
	var limit time.Time
	at := -1 // the index of the limit's date in dayStarts, when from table
	if limited {
		var n int64
		var ok bool
		if n, at, ok = limitNear(table, lim.starts, i+1, fixedN, morning); !ok {
			at = -1
			if morning {
				limit, n = c.onBefore(fixed, lim)
			} else {
				limit, n = c.offAfter(fixed, lim)
			}
		}
		if n = sign * (n - fixedN); dist > n {
			dist, by = n, 2
		}
	}
	moving := limit
	switch {
	case by == 0:
		moving = fixed.Add(time.Duration(sign) * short)
	case by == 1:
		moving = dark
	case at >= 0: // clockOnDay's instant, made only for a period it clips
		moving = c.dayStarts()[at].Add(clock)
	}
	start, end := fixed, moving
	if morning {
		start, end = moving, fixed
	}
	if dist <= 0 { // no time left: the period ends where it starts
		end, dist = start, 0
	}
	e.Kind, e.Start, e.End, e.Date, e.Part, e.DayLength, e.DirectSun = k, start, end, d, part, dl.length, direct
	l.Clipped, l.Lamp = by == 2, time.Duration(dist)
}

// shortestLamps is the shortest lamp period scheduled whatever the
// kind's min_duration: a period under a minute is not worth switching the
// lamps on for (its title would read "Lamps on 06:55–06:55"), and is left
// out as one under min_duration is.
const shortestLamps = time.Minute

// lampMinimum is the shortest lamp period scheduled for a kind of
// min_duration d: d, and never under shortestLamps.
func lampMinimum(d time.Duration) time.Duration { return max(d, shortestLamps) }

// unscheduled notes a date that needs short of lamps none of which are
// scheduled, and why: dropped is the lamp time left out for being under
// the minimum minLen.
func (c *collector) unscheduled(k config.Kind, d time.Time, length, short, dropped, minLen time.Duration, lim *lampLimits) {
	why := "under the " + amount(minLen) + " minimum"
	switch {
	case dropped > 0 && minLen <= shortestLamps && short < shortestLamps:
		why = "too short to switch the lamps on"
	case dropped > 0 && minLen <= shortestLamps:
		why = "the time left is under 1 min, too short to switch the lamps on"
	case dropped == 0 && lim.text == "":
		why = "the Sun is up again before they could come on"
	case dropped == 0:
		why = "the lamp limits leave no time (" + lim.text + ")"
	}
	c.notes = append(c.notes, Note{Kind: k, Date: d, State: astro.AlwaysBelow, Family: k.String(),
		DayLength: length, Lamp: short, Why: why})
}

// bothPeriods places the lamp time short of a date as two periods, half
// before sunrise (morning) and half after sunset (evening), as lamps: both
// asks. A period cut by its limit (earliest_on, latest_off) is made up by
// the other as far as the other's own limit allows; a period under minLen
// gives its time to the other, so that the date gets one period of the
// whole shortfall instead of two too short to schedule.
func (c *collector) bothPeriods(short, minLen time.Duration, morning, evening func(time.Duration) lampSpan) (lampSpan, lampSpan) {
	half := short / 2
	m := morning(half)
	e := evening(short - m.Lamp) // its half, and what the morning could not take
	if e.Lamp < short-m.Lamp {
		m = morning(short - e.Lamp) // the evening is cut: the morning makes it up
	}
	why := MadeUpClipped
	var dropped time.Duration // the period under minLen, left out
	if minLen > 0 && m.Lamp > 0 && m.Lamp < minLen {
		dropped = m.Lamp
		m, e, why = lampSpan{}, evening(short), MadeUpMinimum
	} else if minLen > 0 && e.Lamp > 0 && e.Lamp < minLen {
		dropped = e.Lamp
		e, m, why = lampSpan{}, morning(short), MadeUpMinimum
	}
	// a period cut short without a limit is cut by the Sun's light
	whyFor := func(cut lampSpan) MadeUpReason {
		if why == MadeUpMinimum || cut.Clipped {
			return why
		}
		return MadeUpDark
	}
	if x := m.Lamp - half; x > 0 {
		m.MadeUp, m.MadeUpWhy, m.Dropped = x, whyFor(e), dropped
	}
	if x := e.Lamp - (short - half); x > 0 {
		e.MadeUp, e.MadeUpWhy, e.Dropped = x, whyFor(m), dropped
	}
	return m, e
}

// lampLimits are the earliest_on and latest_off clock times of a lighting
// kind, parsed once (config checked them).
type lampLimits struct {
	on, off       time.Duration
	hasOn, hasOff bool
	text          string // "lamps on no earlier than 05:30, off no later than 22:00"
	// onAt (lamps: morning) or offAt (evening) is its limit's instants on
	// the collector's dates (limitNanos), and starts the dates' first
	// instants, all as Unix nanoseconds; nil otherwise
	onAt, offAt, starts []int64
}

// limitNanos returns the clock time's instant on each of the collector's
// dates, indexed as dayStarts, as Unix nanoseconds, where clockOnDay makes
// it from the date's first instant (the zone keeps one offset from a day
// before that instant to two days after it), 0 on the other dates; and
// the dates' first instants as Unix nanoseconds.
func (c *collector) limitNanos(clock time.Duration) ([]int64, []int64) {
	starts := c.dayStarts()
	startsN := make([]int64, len(starts))
	for j := range starts {
		startsN[j] = starts[j].UnixNano()
	}
	out := make([]int64, len(starts))
	z := c.zone()
	for j := range starts {
		u := starts[j].Unix()
		if z.nextChange(u-secondsPerDay) > u+2*secondsPerDay {
			out[j] = startsN[j] + int64(clock)
		}
	}
	return out, startsN
}

// limitNear is onBefore (morning) or offAfter for an instant (fixedN, as
// Unix nanoseconds) on the date of index j in dayStarts, from the table of
// the limit's instants and that of the dates' first instants (startsN,
// see limitNanos): the limit's instant and the index of
// its date; false when the table does not have them, or fixedN is not on
// that date. Where the table has a date's limit, the zone keeps one offset
// from a day before the date to two days after it, so that the instants
// from the date's first to the next date's are that date's.
func limitNear(table, startsN []int64, j int, fixedN int64, morning bool) (int64, int, bool) {
	if j < 1 || j+1 >= len(table) || j+1 >= len(startsN) || table[j] == 0 || fixedN < startsN[j] || fixedN >= startsN[j+1] {
		return 0, 0, false
	}
	at := j
	switch {
	case morning && table[j] >= fixedN:
		at = j - 1 // the last one before: the date before's
	case !morning && table[j] <= fixedN:
		at = j + 1 // the first one after: the next date's
	}
	if table[at] == 0 {
		return 0, 0, false
	}
	return table[at], at, true
}

func limitsOf(spec config.KindSpec) lampLimits {
	var l lampLimits
	var text []string
	if spec.EarliestOn != "" {
		on, err := config.ParseClock(spec.EarliestOn)
		l.on, l.hasOn = on, err == nil
		text = append(text, "lamps on no earlier than "+spec.EarliestOn)
	}
	if spec.LatestOff != "" {
		off, err := config.ParseClock(spec.LatestOff)
		l.off, l.hasOff = off, err == nil
		text = append(text, "off no later than "+spec.LatestOff)
	}
	l.text = strings.Join(text, ", ")
	return l
}

// clip shortens a lamp period to the limits: the last earliest_on clock
// time at or before the period's end, and the first latest_off clock time
// after its start, and marks a period it cuts Clipped.
func (c *collector) clip(e *lampSpan, lim *lampLimits) {
	if lim.hasOn && e.Part != partEvening {
		if t, n := c.onBefore(e.End, lim); e.Start.UnixNano() < n {
			e.Start, e.Clipped = t, true
		}
	}
	if lim.hasOff && e.Part != partMorning {
		if t, n := c.offAfter(e.Start, lim); e.End.UnixNano() > n {
			e.End, e.Clipped = t, true
		}
	}
}

// onBefore is the last earliest_on clock time before end (the instant, and
// as Unix nanoseconds): where the lamps before end may come on.
func (c *collector) onBefore(end time.Time, lim *lampLimits) (time.Time, int64) {
	day := c.zone().day(end)
	t := c.clockOnDay(day, lim.on)
	if n := t.UnixNano(); n < end.UnixNano() {
		return t, n
	}
	t = c.clockOnDay(day-1, lim.on)
	return t, t.UnixNano()
}

// offAfter is the first latest_off clock time after start (the instant,
// and as Unix nanoseconds): when the lamps on from start must go off.
func (c *collector) offAfter(start time.Time, lim *lampLimits) (time.Time, int64) {
	day := c.zone().day(start)
	t := c.clockOnDay(day, lim.off)
	if n := t.UnixNano(); n > start.UnixNano() {
		return t, n
	}
	t = c.clockOnDay(day+1, lim.off)
	return t, t.UnixNano()
}

// clockOnDay is clockOn for the local date day (days since 1970-01-01):
// the date's first instant (dayStarts) plus clock when the zone keeps one
// offset from a day before that instant to two days after it, for then
// the date begins at 00:00 and the clock time is that instant, once;
// clockOn otherwise.
func (c *collector) clockOnDay(day int64, clock time.Duration) time.Time {
	starts := c.dayStarts()
	if j := int(day-c.first.Unix()/secondsPerDay) + 1; j >= 0 && j < len(starts) {
		s := starts[j]
		// the zone's period from a day before s: it must last past two
		// days after s
		z := c.zone()
		u := s.Unix()
		if z.nextChange(u-secondsPerDay) > u+2*secondsPerDay {
			return s.Add(clock)
		}
	}
	return clockOn(time.Unix(day*secondsPerDay, 0).UTC(), clock, c.p.Location)
}

// lampText is room for the title, description and UID of most lamp
// periods: an evening period clipped by latest_off takes about 270 bytes,
// one of lamps both that makes up for the other about 420. The text of a
// kind that needs more grows as it is written.
const lampText = 320

// shownClock is an instant as the lamp entries show it: the local clock
// to the second with the zone's abbreviation ("16:42:10 CET"), and to the
// minute ("16:42"), each found with one look-up of the zone.
type shownClock struct {
	h, m, s uint32 // to the second (unsigned: their digits are divided unsigned)
	hm, mm  uint32 // to the minute
	zone    string // at the second
	unix    int64  // the instant to the second, in seconds since 1970
	minute  int64  // the instant to the minute, in seconds since 1970
}

func shownAt(t time.Time, z *zoneCache) shownClock {
	sec, ns := t.Unix(), int64(t.Nanosecond())
	us := sec // ToSecond: up from 499.5 ms
	if ns >= 499_500_000 {
		us++
	}
	// ToMinute: to the millisecond, then to the minute, each half up; the
	// zero time is a whole number of minutes before 1970
	um := floorDiv(sec*1000+int64(uint64(ns+500_000)/1_000_000)+30_000, 60_000) * 60
	zone, off := z.at(us)
	s := daySeconds(us + off)
	// the minute's clock: us's moved by the whole minutes' rounding (at
	// most 31 s either way), or looked up when a clock change may lie
	// between the two
	sm := s + int(um-us)
	if _, offM := z.at(um); offM != off {
		sm = daySeconds(um + offM)
	} else if sm < 0 {
		sm += secondsPerDay
	} else if sm >= secondsPerDay {
		sm -= secondsPerDay
	}
	// 0 ≤ s, sm < secondsPerDay: unsigned divisions
	us32, mins := uint32(s), uint32(sm)/60
	return shownClock{h: us32 / 3600, m: us32 / 60 % 60, s: us32 % 60, hm: mins / 60, mm: mins % 60, zone: zone, unix: us, minute: um}
}

// second is the clock to the second as seconds since midnight.
func (c shownClock) second() int { return int(c.h*3600 + c.m*60 + c.s) }

// daySeconds is the time of day, in seconds, of a count of seconds since
// 1970-01-01 00:00 on some clock.
func daySeconds(u int64) int {
	if u >= 0 {
		return int(uint64(u) % secondsPerDay) // unsigned: see floorDiv
	}
	s := u % secondsPerDay
	if s < 0 {
		s += secondsPerDay
	}
	return int(s)
}

// appendSecond appends the clock to the second and the zone, as
// localClock writes it.
func (c shownClock) appendSecond(b []byte) []byte {
	return appendClockZone(b, int(c.h), int(c.m), int(c.s), c.zone)
}

// lightingText is the text of a lighting kind's entries that is the same
// on every date, written once per feed. What the kind's entries mean (what
// counts as natural light, where the lamps go, their limits) is in the
// calendar's description (lightingMeaning); each entry keeps its own
// numbers.
type lightingText struct {
	key lightingKey
	// the title's end, before its bracket: ", to reach 16 h" and "; 16 h
	// not reached"
	reached, notReached string
	// after the period's length in the description, up to the natural
	// day's: ").\nNatural day " ("Civil dawn to dusk " with natural:
	// civil, "Direct Sun over the skyline " with a
	// skyline), and the same for one period round solar noon, centred on
	// it or moved within the limits
	open, centred, near string
	goal                string // "; target 16 h.\n"
	limits              string // "lamps on no earlier than 05:30, off no later than 22:00"
	minimum             string // "15 min"
	// the last line of a clipped period by its part (partIndex: morning,
	// evening, any other), with the part's limit (partLimit): "Clipped
	// (off no later than 22:00): the target is not reached today.\n", and
	// when the other period makes up for it "Clipped (…); the morning
	// lamps make up the difference: the target is reached.\n"
	clippedShort [3]string
	clippedMade  [3]string
	// the limit that clips a morning period (earliest_on) and an evening
	// one (latest_off), as limits writes it; "" when the kind has none
	onLimit, offLimit string
	// the limits' clock times (time since midnight), and as seconds of
	// the day; -1 when the kind has none
	on, off       time.Duration
	onSec, offSec int
	// the end of the description of a morning (0) or evening (1) period
	// that makes up for no other, after the natural day's length, by
	// whether it is clipped and short: the goal and the period's last
	// line, without its newline ("; target 16 h.\nClipped (off no later
	// than 23:00): the target is not reached today.")
	tail [2][2][2]string
	// both are the events of the kinds entry being written when its lamps
	// are both (lightingBoth), at the index of the next one; nil otherwise
	both []Event
	at   int
}

// lampLeads begin the description of a morning (0) or evening (1) period.
var lampLeads = [2]string{"Morning lamps on at ", "Evening lamps on at "}

// lightingKey is what a lighting kind's text depends on.
type lightingKey struct {
	target, minimum  time.Duration
	natural, on, off string
}

// lightingText returns the text of a lighting kind, built once per feed.
func (w *entryWriter) lightingText(spec *config.KindSpec) *lightingText {
	key := lightingKey{spec.Kind.DayLength, spec.MinDuration.D(), spec.Natural, spec.EarliestOn, spec.LatestOff}
	if w.lamp != nil && w.lamp.key == key {
		return w.lamp
	}
	target := amount(spec.Kind.DayLength)
	natural := "Natural day "
	switch {
	case spec.Natural == config.NaturalCivil:
		// named: not the day length of sunrise to sunset, which the
		// date's summary and the lamps of natural: sunrise-sunset give
		natural = "Civil dawn to dusk "
	case len(w.site.Skyline) > 0:
		natural = "Direct Sun over the skyline "
	}
	lt := &lightingText{key: key, goal: "; target " + target + ".\n",
		reached: ", to reach " + target, notReached: "; " + target + " not reached",
		open: ").\n" + natural, centred: "), centred on solar noon.\n" + natural,
		near: "), as near solar noon as the limits allow.\n" + natural}
	lim := limitsOf(*spec)
	lt.limits = lim.text
	lt.on, lt.off, lt.onSec, lt.offSec = lim.on, lim.off, -1, -1
	if lim.hasOn {
		lt.onSec = int(lim.on / time.Second)
	}
	if lim.hasOff {
		lt.offSec = int(lim.off / time.Second)
	}
	if spec.EarliestOn != "" {
		lt.onLimit = limitsOf(config.KindSpec{EarliestOn: spec.EarliestOn}).text
	}
	if spec.LatestOff != "" {
		lt.offLimit = limitsOf(config.KindSpec{LatestOff: spec.LatestOff}).text
	}
	lt.minimum = amount(lampMinimum(spec.MinDuration.D()))
	for i, part := range []string{partMorning, partEvening, partPolarNight} {
		lt.clippedShort[i] = "Clipped (" + lt.partLimit(part) + "): the target is not reached today.\n"
		lt.clippedMade[i] = "Clipped (" + lt.partLimit(part) + "); the " + otherPart(part) + " lamps make up the difference: the target is reached.\n"
	}
	for pi := range lt.tail {
		for clipped, last := range [2][2]string{{"", "The target is not reached today.\n"}, {lt.clippedMade[pi], lt.clippedShort[pi]}} {
			for short, line := range last {
				tail := lt.goal + line
				lt.tail[pi][clipped][short] = tail[:len(tail)-1]
			}
		}
	}
	w.lamp = lt
	return lt
}

// partIndex numbers a part of lamps for the lines of lightingText:
// morning 0, evening 1, any other 2.
func partIndex(part string) int {
	switch part {
	case partMorning:
		return 0
	case partEvening:
		return 1
	}
	return 2
}

// b2i is 1 for true, 0 for false.
func b2i(b bool) int {
	if b {
		return 1
	}
	return 0
}

// otherPart is the other period of lamps: both, for a period of the part.
func otherPart(part string) string {
	if part == partMorning {
		return partEvening
	}
	return partMorning
}

// appendDescription appends the description of a lamp period to dst and
// its title to title: "Evening lamps on at 16:15:43 CET, off at 23:00:00
// CET (6 h 44 min).\nNatural day 8 h 32 min; target 16 h.", and why the
// period is clipped or longer than its share when it is. It returns the
// title ("Lamps on 16:16–23:00 (6 h 44 min, to reach 16 h)") and after it,
// in title's array, its form in a row of the date (RowTitle), where the
// times stand in their own column: "Lamps on for 6 h 44 min, to reach 16 h".
func (lt *lightingText) appendDescription(dst, title []byte, s *siteInfo, e *Event) (_, _, row []byte) {
	l := e.LampFacts()
	on, off := shownAt(e.Start, s.zone), shownAt(e.End, s.zone)
	// "Lamps on 16:16–23:00", the dash in UTF-8
	t := append(title, 'L', 'a', 'm', 'p', 's', ' ', 'o', 'n', ' ',
		byte('0'+on.hm/10), byte('0'+on.hm%10), ':', byte('0'+on.mm/10), byte('0'+on.mm%10), 0xe2, 0x80, 0x93,
		byte('0'+off.hm/10), byte('0'+off.hm%10), ':', byte('0'+off.mm/10), byte('0'+off.mm%10))
	// the local date of the period's last instant, a nanosecond before
	// its end
	last := e.End.Unix()
	if e.End.Nanosecond() == 0 {
		last--
	}
	if s.zone.dayOf(last) != e.Date.Unix()/secondsPerDay {
		t = append(t, " +1 day"...) // the short mark of titles and the listing's tables (DayMark)
	}
	t = append(t, ' ', '(')
	if s.zone.dayOf(UnixSecond(e.Start)) < e.Date.Unix()/secondsPerDay {
		// a morning period of a long target, on after the sunset before:
		// the row's time says it (its start's weekday), the title in words
		t = append(t, fromEveningBefore...)
	}
	lamp := len(t)
	// the length between the clock times as the title shows them, to the
	// minute: 05:39:18 to 06:18:45 is 39 min 27 s, but 05:39–06:19 reads
	// as 40 min; the row puts the same clock times beside it
	t = appendHM(t, time.Duration(off.minute-on.minute)*time.Second)
	lampHM := t[lamp:]
	end := lt.reached
	if l.Short {
		end = lt.notReached
	}
	t = append(append(t, end...), ')')
	row = append(append(append(t[len(t):], "Lamps on for "...), lampHM...), end...)
	// the description's clock times are to the second, and so is the
	// length it takes, to the nearest minute: 05:39:18 to 06:18:45 is
	// 39 min; mostly the title's
	descHM := lampHM
	var buf [24]byte
	// hm rounds half a minute up: the two agree when the length to the
	// second is within [−30 s, 30 s) of the title's whole minutes
	sec := off.unix - on.unix
	if d := sec - (off.minute - on.minute); d < -30 || d >= 30 {
		descHM = appendHM(buf[:0], time.Duration(sec)*time.Second)
	}
	pi := partIndex(e.Part)
	if pi < 2 && l.MadeUp <= 0 {
		// a morning or evening period that makes up for no other (nearly
		// every period): the text below, its last lines written once
		// per feed
		b := append(dst, lampLeads[pi]...)
		b = append(b, byte('0'+on.h/10), byte('0'+on.h%10), ':', byte('0'+on.m/10), byte('0'+on.m%10), ':', byte('0'+on.s/10), byte('0'+on.s%10), ' ')
		// a morning's start the evening before: " the day before (Sat 30 Oct)"
		b = s.zone.appendDayOf(append(b, on.zone...), e.Start, e.Date)
		said := false // a limit the clocks move, said with the change
		if l.Clipped && pi == 0 && on.second() != lt.onSec {
			if m := movedLimit(s.zone, e.Start, lt.on); m != "" {
				b = append(append(append(b, " ("...), m...), ')')
				said = true
			}
		}
		b = append(b, ',', ' ', 'o', 'f', 'f', ' ', 'a', 't', ' ',
			byte('0'+off.h/10), byte('0'+off.h%10), ':', byte('0'+off.m/10), byte('0'+off.m%10), ':', byte('0'+off.s/10), byte('0'+off.s%10), ' ')
		b = s.zone.appendDayBracket(append(b, off.zone...), e.End, s.zone.endRef(e.Start, e.End, e.Date)) // " the next day (Sun 10 Jan; " after midnight
		b = append(b, descHM...)
		if l.Clipped && pi == 1 && off.second() != lt.offSec {
			if m := movedLimit(s.zone, e.End, lt.off); m != "" {
				b = append(append(b, "; off "...), m...)
				said = true
			}
		}
		if lt.both != nil {
			b = lt.appendOtherLamps(b, s, e, pi)
		}
		b = appendTail(b, said, lt.open, on, off, e, s.zone)
		return append(appendHM(b, e.DayLength), lt.tail[pi][b2i(l.Clipped)][b2i(l.Short)]...), t, row
	}
	whole := e.Part == partPolarNight || e.Part == partBehindSkyline // one period round solar noon
	b := dst
	switch {
	case e.Part == partPolarNight:
		b = append(b, "Polar night: lamps on at "...)
	case e.Part == partBehindSkyline:
		b = append(b, "The Sun stays behind the skyline: lamps on at "...)
	case pi == 0:
		b = append(b, "Morning lamps on at "...)
	default:
		b = append(b, "Evening lamps on at "...)
	}
	b = s.zone.appendDayOf(on.appendSecond(b), e.Start, e.Date)
	said := false // as above
	if l.Clipped && e.Part != partEvening && lt.onSec >= 0 && on.second() != lt.onSec {
		if m := movedLimit(s.zone, e.Start, lt.on); m != "" {
			b = append(append(append(b, " ("...), m...), ')')
			said = true
		}
	}
	b = s.zone.appendDayBracket(off.appendSecond(append(b, ", off at "...)), e.End, s.zone.endRef(e.Start, e.End, e.Date))
	b = append(b, descHM...)
	if l.Clipped && e.Part != partMorning && lt.offSec >= 0 && off.second() != lt.offSec {
		if m := movedLimit(s.zone, e.End, lt.off); m != "" {
			b = append(append(b, "; off "...), m...) // as the text above words it
			said = true
		}
	}
	if lt.both != nil {
		b = lt.appendOtherLamps(b, s, e, pi)
	}
	switch {
	case whole && l.Clipped:
		b = appendTail(b, said, lt.near, on, off, e, s.zone)
	case whole:
		b = appendTail(b, said, lt.centred, on, off, e, s.zone)
	default:
		b = appendTail(b, said, lt.open, on, off, e, s.zone)
	}
	b = append(appendHM(b, e.DayLength), lt.goal...)
	other := otherPart(e.Part)
	switch {
	case whole && l.Clipped && l.Short:
		b = append(b, lt.clippedShort[2]...)
	case whole && l.Clipped:
		b = append(append(append(b, "Moved within the limits ("...), lt.limits...), "): the target is reached.\n"...)
	case l.MadeUp > 0 && l.MadeUpWhy == MadeUpMinimum && l.Dropped < shortestLamps:
		b = append(append(append(b, "All of the shortfall in one period: the "...), other...), " period would be under 1 min.\n"...)
	case l.MadeUp > 0 && l.MadeUpWhy == MadeUpMinimum:
		b = append(b, "All of the shortfall in one period: the "...)
		if l.Dropped.Round(time.Minute) >= lampMinimum(lt.key.minimum) {
			b = appendDuration(b, l.Dropped, time.Second, false) // "9 min 43 s", not "10 min" under a 10 min minimum
		} else {
			b = appendHM(b, l.Dropped)
		}
		b = append(b, ' ')
		b = append(append(append(append(b, other...), " period would be under the minimum of "...), lt.minimum...), ".\n"...)
	case l.MadeUp > 0 && l.MadeUpWhy == MadeUpDark:
		b = sentenceHM(b, l.MadeUp)
		b = append(append(append(b, " longer than half the shortfall: the short night leaves no more time for the "...), other...), " lamps.\n"...)
	case l.MadeUp > 0:
		b = sentenceHM(b, l.MadeUp)
		b = append(append(append(b, " longer than half the shortfall, to make up for the "...), other...), " lamps, which are clipped ("...)
		b = append(append(b, lt.partLimit(other)...), ").\n"...)
	}
	switch {
	case whole:
	case l.Clipped && l.Short:
		b = append(b, lt.clippedShort[pi]...)
	case l.Clipped:
		b = append(b, lt.clippedMade[pi]...)
	case l.Short:
		b = append(b, "The target is not reached today.\n"...)
	}
	return b[:len(b)-1], t, row // without the last line's newline
}

// appendTail appends tail, the end of the bracket after a lamp period's
// length and of its sentence (lightingText's open, centred or near), with
// a change of the clocks between on and off said at the end of that
// sentence (clocksDuring): the period's clock times are then nearer or
// further apart than its length, "23:35:35 BST, off at 06:59:17 GMT (8 h
// 24 min). The clocks go back from summer time by 1 h during it: 02:00 BST
// becomes 01:00 GMT." Nearly every period has one zone's label at both
// ends, and nothing more to look up. said is true when the period's text
// has said the change already, beside a limit the clocks move (movedLimit:
// "off moved from 00:30, which the clocks skip …: the clocks go forward
// …"): then it is not said twice.
func appendTail(b []byte, said bool, tail string, on, off shownClock, e *Event, z *zoneCache) []byte {
	if on.zone == off.zone || said {
		return append(b, tail...)
	}
	i := strings.Index(tail, ".\n") + 1
	return append(append(append(b, tail[:i]...), clocksDuring(ToSecond(e.Start), ToSecond(e.End), z.loc)...), tail[i:]...)
}

// fromEveningBefore leads the bracket of a lamp period's title whose start
// is on the date before the period's (a morning period of a long target,
// on after the sunset before): "Lamps on 18:24–10:11 (from the evening
// before, 15 h 47 min, to reach 20 h)".
const fromEveningBefore = "from the evening before, "

// otherLamps name the other period of lamps: both, after a morning (0) or
// an evening (1) period's length.
var otherLamps = [2]string{"; evening lamps ", "; morning lamps "}

// appendOtherLamps appends, in the bracket after a period's length, the
// date's other period of lamps: both, if it has one (otherPeriod), with its
// clock times as its title writes them and its length, so that the entry's
// numbers add up to the target: "; evening lamps 15:34–20:18, 4 h 44 min".
func (lt *lightingText) appendOtherLamps(b []byte, s *siteInfo, e *Event, pi int) []byte {
	o := lt.otherPeriod(e)
	if o == nil {
		return b
	}
	from, to := o.Start, o.End
	on, off := shownAt(from, s.zone), shownAt(to, s.zone)
	b = append(b, otherLamps[pi]...)
	b = append(b, byte('0'+on.hm/10), byte('0'+on.hm%10), ':', byte('0'+on.mm/10), byte('0'+on.mm%10), 0xe2, 0x80, 0x93,
		byte('0'+off.hm/10), byte('0'+off.hm%10), ':', byte('0'+off.mm/10), byte('0'+off.mm%10))
	last := to.Unix() // the period's last instant's second, as the title finds it
	if to.Nanosecond() == 0 {
		last--
	}
	if s.zone.dayOf(last) != e.Date.Unix()/secondsPerDay {
		b = append(b, " +1 day"...)
	}
	if s.zone.dayOf(UnixSecond(from)) < e.Date.Unix()/secondsPerDay {
		b = append(append(b, ", "...), fromEveningBefore[:len(fromEveningBefore)-2]...)
	}
	return appendHM(append(b, ',', ' '), time.Duration(off.minute-on.minute)*time.Second) // as the clock times read
}

// otherPeriod returns the other period of e's date among the events of a
// lamps: both kind, which are written in order (both, at: lightingBoth),
// e's morning or evening beside it; nil when its date has one period.
func (lt *lightingText) otherPeriod(e *Event) *Event {
	evs, i := lt.both, lt.at
	for i < len(evs) && &evs[i] != e {
		i++
	}
	if i == len(evs) {
		return nil
	}
	lt.at = i + 1
	for _, j := range [2]int{i - 1, i + 1} {
		if j < 0 || j >= len(evs) {
			continue
		}
		if o := &evs[j]; o.Date.Equal(e.Date) && o.Part != e.Part && (o.Part == partMorning || o.Part == partEvening) {
			return o
		}
	}
	return nil
}

// lightingBoth tells lt the events of a kinds entry about to be written,
// evs, which with lamps: both (spec's) name each other's period; nil for
// another lamps.
func (lt *lightingText) lightingBoth(spec *config.KindSpec, evs []Event) {
	lt.both, lt.at = nil, 0
	if spec.Lamps == config.LampsBoth {
		lt.both = evs
	}
}

// sentenceHM appends hm(d) at the start of a sentence: "Under 1 min", not
// "under 1 min".
func sentenceHM(b []byte, d time.Duration) []byte {
	n := len(b)
	b = appendHM(b, d)
	if b[n] == 'u' {
		b[n] = 'U'
	}
	return b
}

// movedLimit says why a lamp period's end at t, clipped by the limit
// clock, shows another clock time: the local clock skips the limit on that
// date (clocks set forward), so the lamps come on or go off that much
// later. The words are a plan's (skippedClock) without their brackets:
// "moved from 00:30, which the clocks skip on Sun 28 Mar 2027: the clocks
// go forward for summer time by 1 h". It is "" when t is not the limit's
// instant on the date the clocks skip it on, which is the date before t's
// when the skipped hour runs into midnight.
func movedLimit(z *zoneCache, t time.Time, clock time.Duration) string {
	m, ok := movedClock(config.TimeSpec{IsClock: true, Clock: clock}, t, z)
	if !ok || !clockOn(m.day(), clock, z.loc).Equal(t) {
		return ""
	}
	return m.words(true)
}

// partLimit is the limit that clips a period of lamps of the part (clip:
// earliest_on a morning period, latest_off an evening one), all the
// kind's limits for another part.
func (lt *lightingText) partLimit(part string) string {
	switch {
	case part == partMorning && lt.onLimit != "":
		return lt.onLimit
	case part == partEvening && lt.offLimit != "":
		return lt.offLimit
	}
	return lt.limits
}

// lightingMeaning says, once in the calendar's description, what the
// entries of a lighting kinds entry mean: "Supplemental lighting to 16 h:
// lamp periods that make the natural day (sunrise to sunset) up to 16 h,
// in the evening; off no later than 23:00."
func lightingMeaning(s *config.Site, spec config.KindSpec) string {
	target := amount(spec.Kind.DayLength)
	natural := "sunrise to sunset"
	switch {
	case spec.Natural == config.NaturalCivil:
		natural = "civil dawn to civil dusk"
	case len(s.Skyline) > 0:
		natural = "the direct Sun over the site's skyline"
	}
	where := map[string]string{config.LampsMorning: "in the morning", config.LampsBoth: "half in the morning, half in the evening"}[spec.Lamps]
	if where == "" {
		where = "in the evening"
	}
	m := "Supplemental lighting to " + target + ": lamp periods that make the natural day (" + natural + ") up to " + target + ", " + where
	if l := limitsOf(spec).text; strings.HasPrefix(l, "off") {
		m += "; lamps " + l
	} else if l != "" {
		m += "; " + l
	}
	if d := spec.MinDuration.D(); d > 0 {
		m += "; none under " + amount(d)
	}
	return m + "."
}

// Lines of the calendar's description for feeds with a lighting kind.
const (
	civilLightMeaning = "Civil twilight is counted as natural light (common practice: twilight still drives photoperiod responses)."
	lightingAdvice    = "Lamp times are for planning; follow the lighting programme of the crop or herd."
)

// IsNoLampsNote reports whether e is a lighting kind's note that no lamps
// are needed from its date on (not the note of a date whose lamps are not
// scheduled, Facts.Short).
func IsNoLampsNote(e *Entry) bool {
	return e.Facts.Note && !e.Facts.Short && strings.HasPrefix(e.Kind, config.KindLighting+":")
}

// LampNoteWithin gives e, a lighting kind's note that no lamps are needed
// from its date on, the title, description and Facts.Until it has in a
// calendar of the same kind from e's date to last: until is the first date
// lamps are needed again, or zero when none is known; a date after last is
// past that calendar, whose note then says the stretch lasts through last.
func LampNoteWithin(e *Entry, until, last time.Time) error {
	if !IsNoLampsNote(e) {
		return fmt.Errorf("feed: entry %q of kind %q on %s is not a note that no lamps are needed",
			e.Title, e.Kind, e.Date.Format(time.DateOnly))
	}
	k, err := config.ParseKind(e.Kind)
	if err != nil {
		return fmt.Errorf("feed: note of kind %q: %w", e.Kind, err)
	}
	last = civil(last)
	if !until.IsZero() && civil(until).After(last) {
		until = time.Time{}
	}
	e.Title, e.Description = describeLightingNote(nil, Note{Kind: k, Date: e.Date, State: e.Facts.State, Until: until}, last)
	e.Facts.Until = until
	return nil
}

// describeLightingNote gives the note at the start of a stretch of dates
// that need no lamps, or of a date that needs lamps none of which are
// scheduled.
func describeLightingNote(s *siteInfo, n Note, last time.Time) (string, string) {
	target := amount(n.Kind.DayLength)
	if n.Lamp > 0 {
		need := hm(n.Lamp)
		if n.Lamp < time.Minute { // not "1 min needed" for 42 s
			need = "less than 1 min"
		}
		title := "Lamps not scheduled: " + need + " needed, " + n.Why
		return title, title + ".\nThe target of " + target + " is not reached on this date: the natural day is " + hm(n.DayLength) + "."
	}
	if n.Until.IsZero() {
		title := fmt.Sprintf("No lamps needed through %s: the natural day is ≥ %s", last.Format("2 Jan"), target)
		return title, fmt.Sprintf("%s, from %s to the end of this calendar (%s).", title,
			n.start().Format("Monday 2 January 2006"), last.Format("2 January 2006"))
	}
	title := fmt.Sprintf("No lamps needed until %s: the natural day is ≥ %s", n.Until.Format("2 Jan"), target)
	return title, fmt.Sprintf("%s, from %s; lamps are needed again from %s.", title,
		n.start().Format("Monday 2 January 2006"), n.Until.Format("Monday 2 January 2006"))
}
