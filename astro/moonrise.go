package astro

import (
	"context"
	"math"
	"time"
)

// Moonrise, moonset and the Moon's meridian transit for any site.
//
// Definitions (USNO; common practice): moonrise and moonset are the instants
// when the Moon's upper limb is on the horizon, with the standard refraction
// of 34′ at the horizon, for the topocentric Moon (its horizontal parallax,
// about 57′, is what makes it rise up to ~4 minutes later than a geocentric
// Moon would). The geometric altitude of the topocentric centre is then
//
//	h₀ = −34′ − s′ − dip      (flat or sea horizon; dip = 1.76′·√height m)
//	h₀ = Horizon − R(Horizon) − s′  (a skyline at apparent altitude Horizon)
//
// with s′ the topocentric semidiameter asin(1737.4 km / Δ′), Δ′ the distance
// from the observer — the same rule as the Sun's Observer.RiseSetAltitude,
// with the Moon's semidiameter in place of the Sun's 16′. Because s′ changes
// (14.7′–16.8′ over a month), the crossing is solved on the altitude minus
// the moving threshold (see moonCrossings).
//
// The geocentric apparent Moon (moon.go) does not depend on the site: a
// MoonEphemeris samples it every 6 hours and interpolates with the generic
// body track of horizon.go (cubic Lagrange; error below 0.2″, measured in
// TestMoonEphemerisInterpolation), so every site shares one set of
// evaluations and only the parallax and the altitude are per site. The
// crossing search is the Sun's (horizon.go): crossings between consecutive
// extrema of the topocentric altitude, so a date can hold no moonrise (once
// a month, since the Moon rises about 50 minutes later each day), two, or
// none at all when the Moon stays up or down (high latitudes), and never an
// invented or duplicated event.
//
// Accuracy (moon_crosscheck_test.go): against the Swiss Ephemeris with its
// DE431-based files, 1,292 moonrises and moonsets at 24 sites 60°S–60°N
// differ by 0.07 s (median) and 0.54 s at most where the two ΔT models agree
// (to 2023); the same events, within 0.5 s, at 66°–85°. After 2050 the ΔT
// model moves them by 0.04–0.07 s per second of ΔT difference. USNO's tables
// agree within their minute rounding.

// moonTrackStep is the sampling step of the Moon's track, seconds.
const moonTrackStep = 6 * 3600.0

// MoonEphemeris holds the Moon's apparent geocentric track (and the Sun's,
// for illumination and dark-sky windows) over a span; it serves any number
// of observers. It is immutable and safe for concurrent use.
type MoonEphemeris struct {
	coverage // queries allowed in [from, to]
	moon     *track
	sun      *Ephemeris
}

// NewMoonEphemeris builds the Moon's track (and a Sun Ephemeris) for queries
// within [from − 2 days, to + 2 days]. from and to must lie within
// MinTime..MaxTime (else a *RangeError) and from must not be after to. Cost:
// four lunar positions per day of span, evaluated together, about 7 µs
// each.
func NewMoonEphemeris(from, to time.Time) (*MoonEphemeris, error) {
	sun, err := NewEphemeris(from, to)
	if err != nil {
		return nil, err
	}
	start := sun.sun.start // 0h UTC, 4 days before from (allocSunTrack)
	n := int(math.Ceil((unixSeconds(to)-start)/moonTrackStep)) + int(4*secondsPerDay/moonTrackStep) + 1
	// The series for all samples at once (elpUniform), at t − light time.
	jde := make([]float64, n)
	for k := range jde {
		jde[k] = epochOf(start+float64(k)*moonTrackStep).JDE - moonMeanLightTime
	}
	lon, lat, dist := make([]float64, n), make([]float64, n), make([]float64, n)
	elpUniform(jde, moonTrackStep/secondsPerDay, lon, lat, dist)
	tr := newTrack(start, moonTrackStep, n, func(e Epoch) (ra, dec, d, eqEq float64) {
		k := int(math.Round((jdToUnix(e.JD) - start) / moonTrackStep))
		s := moonApparentFrom(e.JDE, lon[k], lat[k], dist[k])
		return s.ra, s.dec, s.dist / earthRadiusKm, s.eqEq
	})
	return &MoonEphemeris{coverage: sun.coverage, moon: tr, sun: sun}, nil
}

// Sun returns the Sun's ephemeris over the same span, built with the Moon's.
func (e *MoonEphemeris) Sun() *Ephemeris { return e.sun }

// moonRiseSetAltitude returns h₀ (radians) for the topocentric semidiameter
// sd (radians): the Sun's rise/set altitude for this observer with the Sun's
// 16′ replaced by sd (see the top of this file).
func moonRiseSetAltitude(o Observer, sd float64) float64 {
	return (o.RiseSetAltitude()+16.0/60)*deg2rad - sd
}

// topoDistance returns the distance (Earth radii) from the site to a body at
// local hour angle H, declination dec and geocentric distance dist (Earth
// radii), with the geometry of site.sinAltitudeFrom.
func (st *site) topoDistance(H, dec, dist float64) float64 {
	sd, cd := math.Sincos(dec)
	x, y, z := st.topoVector(H, sd, cd, dist)
	return math.Sqrt(x*x + y*y + z*z)
}

// moonSemidiameter returns the Moon's topocentric semidiameter (radians) at
// Unix second sec.
func (e *MoonEphemeris) moonSemidiameter(st *site, sec float64) float64 {
	k, w := e.moon.weights(sec)
	H := e.moon.ghaFrom(sec, k, &w) + st.lon
	d := st.topoDistance(H, interp(e.moon.dec, k, &w), interp(e.moon.dist, k, &w))
	return math.Asin(moonRadiusKm / (d * earthRadiusKm))
}

// moonCrossings returns the Moon's rise/set crossings (upper limb, as at the
// top of this file) in [a, b), using the extrema ext of the altitude.
//
// The threshold h₀ moves with the semidiameter, so the search works on
// g(t) = sin h(t) − sin h₀(t) directly: g is evaluated once at every
// extremum and each pair of consecutive extrema whose values differ in sign
// holds exactly one crossing (the altitude is monotonic between them and h₀
// changes by a few arcseconds a day). A grazing culmination is therefore
// judged once, at the extremum, for both neighbouring brackets: a moonrise
// is never reported without its moonset or the reverse.
func (e *MoonEphemeris) moonCrossings(o Observer, st *site, ext []extremum, a, b float64) []crossing {
	lg := e.newLimbG(o, st)
	gExt := make([]float64, len(ext))
	for i, x := range ext {
		if ext[min(i+1, len(ext)-1)].t < a || (i > 0 && ext[i-1].t >= b) {
			continue // not a bound of any bracket overlapping [a, b)
		}
		gExt[i] = lg.g(x.t)
	}
	var out []crossing
	for i := 0; i+1 < len(ext); i++ {
		e0, e1 := ext[i], ext[i+1]
		if e1.t < a || e0.t >= b {
			continue
		}
		f0, f1 := gExt[i], gExt[i+1]
		if !(f0 < 0 && f1 > 0) && !(f0 > 0 && f1 < 0) {
			continue
		}
		rising := f1 > 0
		sd := e.moonSemidiameter(st, 0.5*(e0.t+e1.t))
		guess := e.moon.guess(st, math.Sin(moonRiseSetAltitude(o, sd)), e0, e1, rising)
		t := rootInBracket(lg.g, e0.t, f0, e1.t, f1, guess)
		if t >= a && t < b {
			out = append(out, crossing{t: t, rising: rising})
		}
	}
	return out
}

// limbG evaluates g(t) = sin h(t) − sin h₀(t) for one site: the sine of the
// topocentric altitude of the Moon's centre minus that of the rise/set
// threshold h₀ = base − s′(t), in one pass over the track (the geometry of
// site.sinAltitudeFrom, plus the topocentric distance for s′).
type limbG struct {
	tr               *track
	st               *site
	sinBase, cosBase float64
	radiusEarthRadii float64
}

func (e *MoonEphemeris) newLimbG(o Observer, st *site) *limbG {
	base := (o.RiseSetAltitude() + 16.0/60) * deg2rad
	sb, cb := math.Sincos(base)
	return &limbG{tr: e.moon, st: st, sinBase: sb, cosBase: cb, radiusEarthRadii: moonRadiusKm / earthRadiusKm}
}

func (l *limbG) g(sec float64) float64 {
	k, w := l.tr.weights(sec)
	H := l.tr.ghaFrom(sec, k, &w) + l.st.lon
	dec, dist := interp(l.tr.dec, k, &w), interp(l.tr.dist, k, &w)
	sH, cH := math.Sincos(H)
	sd, cd := math.Sincos(dec)
	x := dist*cd*cH - l.st.rhoCos
	y := dist * cd * sH
	z := dist*sd - l.st.rhoSin
	r := math.Sqrt(x*x + y*y + z*z)
	sinAlt := (x*l.st.cosLat + z*l.st.sinLat) / r
	// s′ = asin(R/r) ≈ q + q³/6 with q = R/r ≤ 0.0048 (error < 1e-13 rad);
	// sin(base − s′) by the addition formula with the same series.
	q := l.radiusEarthRadii / r
	s := q + q*q*q/6
	sinS, cosS := s-s*s*s/6, 1-s*s/2+s*s*s*s/24
	return sinAlt - (l.sinBase*cosS - l.cosBase*sinS)
}

// rootInBracket returns the root of f in [a, b] (fa, fb of opposite signs)
// to 1 ms, starting from the estimate x: secant steps from x and a point a
// minute away, each kept inside the shrinking bracket (bisection when a
// step leaves it or after 30 steps).
func rootInBracket(f func(float64) float64, a, fa, b, fb, x float64) float64 {
	if !(x > a && x < b) {
		x = 0.5 * (a + b)
	}
	shrink := func(x, fx float64) {
		if (fx < 0) == (fa < 0) {
			a, fa = x, fx
		} else {
			b, fb = x, fx
		}
	}
	x0, f0 := x, f(x)
	if f0 == 0 {
		return x0
	}
	shrink(x0, f0)
	x1 := x0 + 60
	if !(x1 < b) {
		x1 = x0 - 60
	}
	if !(x1 > a && x1 < b) {
		x1 = 0.5 * (a + b)
	}
	f1 := f(x1)
	shrink(x1, f1)
	for i := 0; i < 200; i++ {
		if f1 == 0 {
			return x1
		}
		var x2 float64
		if f1 != f0 {
			x2 = x1 - f1*(x1-x0)/(f1-f0)
		}
		if f1 == f0 || !(x2 > a && x2 < b) || i >= 30 {
			x2 = 0.5 * (a + b)
		}
		f2 := f(x2)
		shrink(x2, f2)
		if math.Abs(x2-x1) < 1e-3 || b-a < 1e-3 {
			return x2
		}
		x0, f0, x1, f1 = x1, f1, x2, f2
	}
	return 0.5 * (a + b)
}

// MoonRiseSet returns every moonrise (Direction Rising) and moonset
// (Setting) for the observer in [from, to), sorted: the upper limb on the
// horizon with 34′ of refraction and the observer's dip or Horizon, for the
// topocentric Moon (its parallax makes it rise up to 4 minutes later than
// the geocentric Moon would). The span must lie within Coverage()
// (else a *RangeError); an invalid observer gives an *InputError.
func (e *MoonEphemeris) MoonRiseSet(o Observer, from, to time.Time) ([]Crossing, error) {
	st, err := e.query(o, from, to)
	if err != nil {
		return nil, err
	}
	a, b := unixSeconds(from), unixSeconds(to)
	cs := e.moonCrossings(o, st, e.moon.extrema(st, a, b), a, b)
	out := make([]Crossing, 0, len(cs))
	for _, c := range cs {
		t := timeFromUnix(c.t)
		if t.Before(from) || !t.Before(to) {
			continue
		}
		d := Setting
		if c.rising {
			d = Rising
		}
		out = append(out, Crossing{Time: t, Direction: d})
	}
	return out, nil
}

// MoonTransits returns the Moon's upper meridian transits (local hour angle
// 0 of the apparent right ascension; the parallax in right ascension is zero
// on the meridian, so geocentric and topocentric transits coincide) in
// [from, to), with the topocentric geometric altitude of the centre. A date has no transit about
// once a month (the Moon transits about 50 minutes later each day).
func (e *MoonEphemeris) MoonTransits(o Observer, from, to time.Time) ([]Transit, error) {
	st, err := e.query(o, from, to)
	if err != nil {
		return nil, err
	}
	return e.moon.transitList(st, from, to), nil
}

// MoonAltitude returns the topocentric geometric altitude of the Moon's
// centre (degrees, no refraction) at t. The instant must lie within
// Coverage() (else a *RangeError); an invalid observer gives an *InputError.
func (e *MoonEphemeris) MoonAltitude(o Observer, t time.Time) (float64, error) {
	st, err := e.query(o, t, t)
	if err != nil {
		return 0, err
	}
	return e.moon.altitude(st, t), nil
}

// moonUp reports whether the Moon's upper limb is above the (refracted)
// horizon at Unix second sec, by the rise/set rule.
func (e *MoonEphemeris) moonUp(o Observer, st *site, sec float64) bool {
	h0 := moonRiseSetAltitude(o, e.moonSemidiameter(st, sec))
	return e.moon.sinAltitude(st, sec) > math.Sin(h0)
}

// MoonDays returns one Day per local date from first to last inclusive
// (the dates of first.In(loc) and last.In(loc), as in SunDays), with
// the moonrises (Rising) and moonsets (Setting) within each date, from its
// first instant to the next date's (as in SunDays). A date commonly has no
// moonrise or no moonset (about once a month each): then that list is empty
// and State is still Crosses. State is AlwaysAbove or AlwaysBelow only when
// the date has neither: the Moon stays up (or down) the whole date. The
// dates must lie within Coverage(). It stops with ctx's error when ctx is
// done.
func (e *MoonEphemeris) MoonDays(ctx context.Context, o Observer, loc *time.Location, first, last time.Time) ([]Day, error) {
	return crossingDays(ctx, "MoonDays", o, loc, first, last,
		func(from, to time.Time) ([]Crossing, error) { return e.MoonRiseSet(o, from, to) },
		func(st *site, sec float64) bool { return e.moonUp(o, st, sec) })
}
