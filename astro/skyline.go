package astro

import (
	"context"
	"fmt"
	"math"
	"sort"
	"time"
)

// Skyline rise and set: a site's visible horizon as altitudes per direction
// (hills to the east, a building to the south-west), and the instants the
// Sun's upper limb meets it in the direction where the Sun is.
//
// The skyline is given as points (azimuth from the north through the east,
// apparent altitude, degrees), joined by straight lines in azimuth and
// wrapping round at 360°. Where the skyline stands at apparent altitude S in
// the Sun's direction A, the upper limb meets it when the centre's geometric
// altitude is Observer{Horizon: S}.RiseSetAltitude(): S less the refraction
// at S (Bennett's formula, Meeus eq. 16.4, scaled for the site's air) less
// the semidiameter; a point at exactly 0° is a flat sea-level horizon with
// the site's dip, as the single horizon altitude (the observer's Horizon
// and LevelHorizon are ignored). So a skyline at one
// altitude everywhere gives exactly the single-altitude results.
//
// The search: the threshold lies between the lowest and the highest of the
// skyline's vertices, so the Sun can meet the skyline only while its own
// altitude is between those two thresholds; those windows are bracketed by
// the ordinary crossing search, widened by a minute on each side, and each is
// scanned every 30 s for changes of side, each change being refined by
// bisection to 1 ms. A passage behind a
// narrow peak that is over in less than a scan step may be missed.
//
// The Moon's skyline crossings (MoonSkylineCrossings) use the same search
// (skylineCrossings) on the Moon's track, with its topocentric semidiameter
// in place of the Sun's 16′; its windows are widened by the range of that
// semidiameter.

// SkyPoint is one point of a skyline: apparent altitude (degrees) in the
// direction Azimuth (degrees from the north through the east).
type SkyPoint struct {
	Azimuth, Altitude float64
}

// Skyline is a site's visible horizon, sorted by azimuth (see NewSkyline).
// The skyline queries (SunSkylineCrossings and the others) return an
// *InputError for one that NewSkyline would not give: empty, with a point
// out of range or NaN, or not strictly sorted by azimuth within [0, 360).
type Skyline []SkyPoint

// NewSkyline checks and sorts skyline points: at least one, azimuths within
// 0..360 (360 is 0) and distinct, altitudes within −5..45°. A single point
// is a skyline at one altitude in every direction.
func NewSkyline(points []SkyPoint) (Skyline, error) {
	if len(points) == 0 {
		return nil, noSkyline()
	}
	s := make(Skyline, len(points))
	for i, p := range points {
		if err := p.check(); err != nil {
			return nil, err
		}
		s[i] = SkyPoint{math.Mod(p.Azimuth, 360), p.Altitude}
	}
	sort.SliceStable(s, func(i, j int) bool { return s[i].Azimuth < s[j].Azimuth })
	for i := 1; i < len(s); i++ {
		if s[i].Azimuth == s[i-1].Azimuth {
			return nil, &InputError{"skyline azimuth", s[i].Azimuth, "appears twice (0 and 360 are the same direction)"}
		}
	}
	return s, nil
}

// noSkyline returns the error for a skyline without points.
func noSkyline() error {
	return &InputError{"skyline points", 0, "needs at least one [azimuth, altitude] point"}
}

// check returns an *InputError for a point outside the ranges NewSkyline
// accepts (NaN and infinities included).
func (p SkyPoint) check() error {
	if !(p.Azimuth >= 0 && p.Azimuth <= 360) {
		return &InputError{"skyline azimuth", p.Azimuth, "must be within 0..360 degrees from the north through the east"}
	}
	if !(p.Altitude >= -5 && p.Altitude <= 45) {
		return &InputError{"skyline altitude", p.Altitude, "must be within -5..45 degrees"}
	}
	return nil
}

// Altitude returns the skyline's altitude (degrees) in the direction az
// (degrees), interpolated linearly between its points, round the circle.
func (s Skyline) Altitude(az float64) float64 {
	n := len(s)
	switch n {
	case 0:
		return 0
	case 1:
		return s[0].Altitude
	}
	az = math.Mod(az, 360)
	if az < 0 {
		az += 360
	}
	i := sort.Search(n, func(i int) bool { return s[i].Azimuth > az }) // first point past az
	a, b := s[(i-1+n)%n], s[i%n]
	span := b.Azimuth - a.Azimuth
	if span <= 0 {
		span += 360
	}
	d := az - a.Azimuth
	if d < 0 {
		d += 360
	}
	return a.Altitude + (b.Altitude-a.Altitude)*d/span
}

// threshold returns the geometric altitude (degrees) of the Sun's centre at
// which its upper limb meets a skyline at apparent altitude h for o.
func (o Observer) threshold(h float64) float64 {
	o.Horizon, o.LevelHorizon = h, false
	return o.RiseSetAltitude()
}

// skylineStep is the scan step of the skyline search, seconds.
const skylineStep = 30.0

// SunSkylineCrossings returns every instant in [from, to) at which the
// Sun's upper limb meets the skyline sky (Rising: it appears above it;
// Setting: it disappears behind it), sorted, for the observer o (whose
// Horizon and LevelHorizon are ignored). With several crossings on one day, the first Rising
// is the Sun's first appearance, the last Setting its last disappearance,
// and the pairs between are the times it is hidden behind the skyline. The
// span must lie within Coverage().
func (e *Ephemeris) SunSkylineCrossings(o Observer, sky Skyline, from, to time.Time) ([]Crossing, error) {
	if err := sky.check(); err != nil {
		return nil, err
	}
	lo, hi := skylineBounds(o, sky)
	if lo == hi { // one altitude everywhere: the ordinary search
		return e.SunCrossings(o, lo, from, to)
	}
	st, err := e.query(&o, from, to)
	if err != nil {
		return nil, err
	}
	// f > 0: the upper limb is above the skyline.
	f := func(sec float64) float64 {
		sh := e.sun.sinAltitude(st, sec)
		az := e.sun.azimuth(st, sec) * rad2deg
		return math.Asin(sh)*rad2deg - o.threshold(sky.Altitude(az))
	}
	return skylineCrossings(e.sun, st, lo, hi, f, unixSeconds(from), unixSeconds(to)), nil
}

// skylineBounds returns the lowest and the highest of the thresholds
// (Observer.threshold, degrees) of the skyline's vertices: the upper limb
// of a body of the Sun's semidiameter can meet the skyline only while its
// centre's geometric altitude is between them.
func skylineBounds(o Observer, sky Skyline) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, p := range sky {
		t := o.threshold(p.Altitude)
		lo, hi = min(lo, t), max(hi, t)
	}
	return lo, hi
}

// skylineCrossings is the skyline search for any body with track tr (the
// Sun's or the Moon's): the changes of sign of f (positive while the upper
// limb is above the skyline) in [a, b), for a body whose centre can meet
// the skyline only while its geometric altitude is within lo..hi degrees.
func skylineCrossings(tr *track, st *site, lo, hi float64, f func(sec float64) float64, a, b float64) []Crossing {
	ext := tr.extrema(st, a, b)
	// Windows where the centre is between lo and hi.
	type mark struct {
		t      float64
		high   bool
		rising bool
	}
	var marks []mark
	for i, h := range [2]float64{lo, hi} {
		for _, c := range tr.crossings(st, ext, math.Sin(h*deg2rad), a, b, nil) {
			if c.t >= a && c.t < b {
				marks = append(marks, mark{c.t, i == 1, c.rising})
			}
		}
	}
	sort.Slice(marks, func(i, j int) bool { return marks[i].t < marks[j].t })
	h0 := math.Asin(tr.sinAltitude(st, a)) * rad2deg
	inside := h0 > lo && h0 < hi
	start := a
	var windows [][2]float64
	for _, m := range marks {
		entering := (!m.high && m.rising) || (m.high && !m.rising)
		if entering && !inside {
			inside, start = true, m.t
		} else if !entering && inside {
			inside = false
			windows = append(windows, [2]float64{start, m.t})
		}
	}
	if inside {
		windows = append(windows, [2]float64{start, b})
	}
	// Pad each window by two scan steps, so that a skyline crossing at a
	// window's edge (the body leaving the window where the skyline is at its
	// lowest or highest) is bracketed by clear signs, then merge overlaps.
	merged := windows[:0]
	for _, w := range windows {
		w[0], w[1] = max(w[0]-2*skylineStep, a), min(w[1]+2*skylineStep, b)
		if n := len(merged); n > 0 && w[0] <= merged[n-1][1] {
			merged[n-1][1] = max(merged[n-1][1], w[1])
			continue
		}
		merged = append(merged, w)
	}
	var out []Crossing
	for _, w := range merged {
		t0 := w[0]
		f0 := f(t0)
		for t0 < w[1] {
			t1 := min(t0+skylineStep, w[1])
			f1 := f(t1)
			if (f0 > 0) != (f1 > 0) {
				x0, x1, g0 := t0, t1, f0
				for x1-x0 > 1e-3 {
					m := 0.5 * (x0 + x1)
					if gm := f(m); (gm > 0) == (g0 > 0) {
						x0, g0 = m, gm
					} else {
						x1 = m
					}
				}
				c := 0.5 * (x0 + x1)
				if c >= a && c < b {
					d := Setting
					if f1 > 0 {
						d = Rising
					}
					out = append(out, Crossing{Time: timeFromUnix(c), Direction: d})
				}
			}
			t0, f0 = t1, f1
		}
	}
	return out
}

// The Moon's topocentric semidiameter stays within these bounds (degrees;
// 14.7′ at apogee on the horizon to 17.0′ at perigee near the zenith, with
// a margin): they widen the Moon's search windows, never narrow them.
const moonSDLow, moonSDHigh = 14.0 / 60, 18.0 / 60

// MoonSkylineCrossings is SunSkylineCrossings for the Moon: every instant
// in [from, to) at which the upper limb of the topocentric Moon (its
// semidiameter at its distance from the site) meets the skyline, with the
// refraction of the skyline's altitude in the Moon's direction (Rising: it
// appears; Setting: it disappears), sorted. A skyline at one altitude
// everywhere gives exactly MoonRiseSet with that Horizon.
func (e *MoonEphemeris) MoonSkylineCrossings(o Observer, sky Skyline, from, to time.Time) ([]Crossing, error) {
	st, flat, err := e.moonSkylineQuery(o, sky, from, to)
	if err != nil || st == nil {
		return flat, err
	}
	return e.moonSkyline(o, st, sky, unixSeconds(from), unixSeconds(to)), nil
}

// moonSkylineQuery checks a Moon skyline query and returns the site for the
// search, or (nil site) the result of MoonRiseSet for a skyline at one
// altitude everywhere.
func (e *MoonEphemeris) moonSkylineQuery(o Observer, sky Skyline, from, to time.Time) (*site, []Crossing, error) {
	if err := sky.check(); err != nil {
		return nil, nil, err
	}
	if flat, ok := sky.flat(); ok {
		o.Horizon, o.LevelHorizon = flat, false
		cs, err := e.MoonRiseSet(o, from, to)
		return nil, cs, err
	}
	st, err := e.query(o, from, to)
	return st, nil, err
}

// moonSkyline is the skyline search for the Moon in [a, b) (Unix s).
func (e *MoonEphemeris) moonSkyline(o Observer, st *site, sky Skyline, a, b float64) []Crossing {
	lo, hi := skylineBounds(o, sky)
	// threshold() holds the Sun's 16′; the Moon's centre is lower or higher
	// by the difference of the semidiameters.
	lo, hi = lo+16.0/60-moonSDHigh, hi+16.0/60-moonSDLow
	f := func(sec float64) float64 {
		h := math.Asin(e.moon.sinAltitude(st, sec)) * rad2deg
		az := e.moon.azimuth(st, sec) * rad2deg
		sd := e.moonSemidiameter(st, sec) * rad2deg
		return h - (o.threshold(sky.Altitude(az)) + 16.0/60 - sd)
	}
	return skylineCrossings(e.moon, st, lo, hi, f, a, b)
}

// check returns an *InputError for a skyline that NewSkyline would not have
// given, which every skyline query refuses: one without points, with a point
// out of range (a NaN among them) or with azimuths not strictly increasing
// within 0..360 (a Skyline written as a literal, unsorted, with 360 for 0 or
// a direction twice), on which Altitude would interpolate between the wrong
// points.
func (s Skyline) check() error {
	if len(s) == 0 {
		return noSkyline()
	}
	for i, p := range s {
		if err := p.check(); err != nil {
			return err
		}
		if p.Azimuth == 360 {
			return &InputError{"skyline azimuth", p.Azimuth, "must be below 360 in a Skyline (NewSkyline makes 360 0)"}
		}
		if i > 0 && p.Azimuth <= s[i-1].Azimuth {
			return &InputError{"skyline azimuth", p.Azimuth, fmt.Sprintf("follows %g: the points must be sorted by azimuth, each direction once (NewSkyline sorts them)", s[i-1].Azimuth)}
		}
	}
	return nil
}

// flat reports whether the skyline has one altitude in every direction,
// and that altitude.
func (s Skyline) flat() (float64, bool) {
	if len(s) == 0 {
		return 0, false
	}
	for _, p := range s[1:] {
		if p.Altitude != s[0].Altitude {
			return 0, false
		}
	}
	return s[0].Altitude, true
}

// MoonSkylineRiseSet returns the moonrises (Rising) and moonsets (Setting)
// over the skyline in [from, to), sorted: within each passage of the Moon
// across the sky (from one lower culmination to the next), its first
// appearance over the skyline and its last disappearance behind it. The
// times it is hidden behind a peak in between are left out (they are in
// MoonSkylineCrossings), and a passage that begins (or ends) with the Moon
// over the skyline has no moonrise (or moonset), as over a flat horizon. A
// skyline at one altitude everywhere gives exactly MoonRiseSet with that
// Horizon.
func (e *MoonEphemeris) MoonSkylineRiseSet(o Observer, sky Skyline, from, to time.Time) ([]Crossing, error) {
	st, flat, err := e.moonSkylineQuery(o, sky, from, to)
	if err != nil || st == nil {
		return flat, err
	}
	// Search beyond [from, to) so that every passage overlapping it is
	// whole: the track reaches two days beyond the queries allowed.
	lo, hi := e.moon.coverage()
	a, b := max(unixSeconds(from)-1.5*secondsPerDay, lo), min(unixSeconds(to)+1.5*secondsPerDay, hi)
	cs := e.moonSkyline(o, st, sky, a, b)
	var bounds []float64 // lower culminations
	for _, x := range e.moon.extrema(st, a, b) {
		if !x.upper {
			bounds = append(bounds, x.t)
		}
	}
	var out []Crossing
	keep := func(c Crossing) {
		if !c.Time.Before(from) && c.Time.Before(to) {
			out = append(out, c)
		}
	}
	for i := 0; i < len(cs); {
		// the passage of cs[i]: up to the next lower culmination after it
		t := unixSeconds(cs[i].Time)
		k := sort.SearchFloat64s(bounds, t)
		j := i
		for j < len(cs) && (k == len(bounds) || unixSeconds(cs[j].Time) < bounds[k]) {
			j++
		}
		if cs[i].Direction == Rising {
			keep(cs[i])
		}
		if last := cs[j-1]; last.Direction == Setting {
			keep(last)
		}
		i = j
	}
	return out, nil
}

// MoonSkylineDays is MoonDays over a skyline: the moonrises and moonsets of
// MoonSkylineRiseSet grouped by local date; a date with neither is
// AlwaysAbove when the Moon's upper limb is over the skyline in the middle
// of the date.
func (e *MoonEphemeris) MoonSkylineDays(ctx context.Context, o Observer, sky Skyline, loc *time.Location, first, last time.Time) ([]Day, error) {
	if err := sky.check(); err != nil {
		return nil, err
	}
	if flat, ok := sky.flat(); ok {
		o.Horizon, o.LevelHorizon = flat, false
		return e.MoonDays(ctx, o, loc, first, last)
	}
	return crossingDays(ctx, "MoonSkylineDays", o, loc, first, last,
		func(from, to time.Time) ([]Crossing, error) { return e.MoonSkylineRiseSet(o, sky, from, to) },
		func(st *site, sec float64) bool { return e.moonOverSkyline(o, st, sky, sec) })
}

// moonOverSkyline reports whether the Moon's upper limb is over the skyline
// in its direction at Unix second sec.
func (e *MoonEphemeris) moonOverSkyline(o Observer, st *site, sky Skyline, sec float64) bool {
	az := e.moon.azimuth(st, sec) * rad2deg
	h0 := (o.threshold(sky.Altitude(az))+16.0/60)*deg2rad - e.moonSemidiameter(st, sec)
	return e.moon.sinAltitude(st, sec) > math.Sin(h0)
}

// String writes a skyline as "[az, alt] …" for messages.
func (s Skyline) String() string {
	out := ""
	for i, p := range s {
		if i > 0 {
			out += " "
		}
		out += fmt.Sprintf("[%g, %g]", p.Azimuth, p.Altitude)
	}
	return out
}

// sunOverSkyline reports whether the Sun's upper limb is over the skyline
// in its direction at Unix second sec.
func (e *Ephemeris) sunOverSkyline(o Observer, st *site, sky Skyline, sec float64) bool {
	az := e.sun.azimuth(st, sec) * rad2deg
	return e.sun.sinAltitude(st, sec) > math.Sin(o.threshold(sky.Altitude(az))*deg2rad)
}

// SunSkylineSpans returns the spans within [from, to) during which the
// Sun's upper limb is over the skyline sky (by SunSkylineCrossings), e.g.
// the part of an eclipse that can be seen from a valley. The span must lie
// within Coverage().
func (e *Ephemeris) SunSkylineSpans(o Observer, sky Skyline, from, to time.Time) ([]Span, error) {
	cs, err := e.SunSkylineCrossings(o, sky, from, to) // checks o and the span
	if err != nil {
		return nil, err
	}
	return spansOver(cs, from, to, func() bool {
		return e.sunOverSkyline(o, e.sites.site(&o), sky, unixSeconds(from))
	}), nil
}

// MoonSkylineSpans is SunSkylineSpans for the Moon (by
// MoonSkylineCrossings).
func (e *MoonEphemeris) MoonSkylineSpans(o Observer, sky Skyline, from, to time.Time) ([]Span, error) {
	cs, err := e.MoonSkylineCrossings(o, sky, from, to) // checks o and the span
	if err != nil {
		return nil, err
	}
	return spansOver(cs, from, to, func() bool {
		return e.moonOverSkyline(o, newSite(o), sky, unixSeconds(from))
	}), nil
}

// spansOver turns the crossings cs of [from, to) into the spans over the
// skyline; upAtFrom, called only when there is no crossing (else the first
// crossing tells it), gives the state at from.
func spansOver(cs []Crossing, from, to time.Time, upAtFrom func() bool) []Span {
	var up bool
	if len(cs) > 0 {
		up = cs[0].Direction == Setting
	} else {
		up = upAtFrom()
	}
	var out []Span
	start := from
	add := func(end time.Time) {
		if end.After(start) {
			out = append(out, Span{Start: start, End: end, Length: end.Sub(start)})
		}
	}
	for _, c := range cs {
		if c.Direction == Rising {
			start, up = c.Time, true
		} else {
			if up {
				add(c.Time)
			}
			up = false
		}
	}
	if up {
		add(to)
	}
	return out
}
