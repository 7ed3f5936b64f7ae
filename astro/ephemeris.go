package astro

import (
	"context"
	"errors"
	"fmt"
	"math"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"
	"time"
)

// The Sun's daily events for any site: a shared ephemeris (the geocentric
// Sun sampled once a day and interpolated, see horizon.go) and the searches
// built on it.

// Altitudes of the Sun's centre (degrees, geometric, topocentric) that
// define the daily events. Rise and set include the standard refraction at
// the horizon (34′) and the Sun's semidiameter (16′); the others are the
// usual geometric definitions (twilight: USNO; golden and blue hour: common
// practice).
const (
	SunriseAltitude      = -0.8333 // upper limb on a sea-level flat horizon
	CivilTwilight        = -6.0
	NauticalTwilight     = -12.0
	AstronomicalTwilight = -18.0
	GoldenHourHigh       = 6.0
	GoldenHourLow        = -4.0
	BlueHourHigh         = -4.0
	BlueHourLow          = -6.0
)

// Observer is a place on the Earth. Its zero value is a valid place: 0° N
// 0° E at sea level (in the Gulf of Guinea), a flat horizon and the standard
// refraction of almanacs. Validate gives the ranges of its fields: the
// searches of an Ephemeris or a MoonEphemeris, SunFrom and MoonFrom check
// them and return its error; the eclipses' Local and the Observer's own
// methods do not.
type Observer struct {
	Latitude, Longitude float64 // degrees, geodetic (WGS 84), north and east positive
	// Elevation is the height above sea level in metres. It lowers the
	// rise/set altitude by the dip of the horizon, 1.76′·√h (N.
	// Bowditch, The American Practical Navigator, dip of the sea horizon),
	// and enters the parallax.
	Elevation float64
	// Horizon is the apparent altitude of the visible skyline in degrees
	// (hills, buildings), as measured from the site; 0 means a sea or flat
	// horizon and then Elevation's dip applies, unless LevelHorizon is set.
	// See RiseSetAltitude.
	Horizon float64
	// LevelHorizon says that Horizon is exact: no dip of the horizon for
	// Elevation is added. It matters only for a Horizon of 0, which it
	// makes a level horizon at 0° (a plateau whose horizon is land at its
	// own height), taken as any measured Horizon: the refraction at 0°
	// (34.5′) and no dip. A Horizon other than 0 never takes the dip.
	LevelHorizon bool
	// Pressure (hPa) and Temperature (°C) of the air at the site scale the
	// refraction of rise and set (see RefractionFactor). Pressure 0 means
	// the standard refraction of almanacs (34′ at the horizon), whatever
	// Temperature says.
	Pressure, Temperature float64
}

// RefractionFactor is the factor by which the air at the observer scales
// the standard refraction: (P / 1010 hPa) · (283 K / (273 K + T)), Meeus,
// Astronomical Algorithms 2nd ed., ch. 16 (after eq. 16.4), from Bennett
// (1982); 1 when Pressure is 0 (the almanacs' standard, 10 °C and 1010 hPa).
// A cold, high-pressure morning (−20 °C, 1030 hPa) gives 1.14: 39′ instead
// of 34′ at the horizon.
func (o Observer) RefractionFactor() float64 {
	if o.Pressure == 0 {
		return 1
	}
	return o.Pressure / 1010 * 283 / (273 + o.Temperature)
}

// StandardAtmosphere returns the pressure (hPa) and temperature (°C) of the
// ICAO standard atmosphere at elevation metres (ISO 2533: 1013.25 hPa and
// 15 °C at sea level, temperature falling 6.5 °C per km):
// P = 1013.25 · (1 − 0.0065·h / 288.15)^5.25588. At 2400 m: 756 hPa, −0.6 °C.
// It is the formula of the troposphere, the standard atmosphere below
// 11 000 m, and is not extended above: its results pass Observer.Validate up
// to about 15 000 m (then the pressure falls below 100 hPa), and above
// 44 330 m the pressure is NaN.
func StandardAtmosphere(elevation float64) (pressure, temperature float64) {
	return 1013.25 * math.Pow(1-0.0065*elevation/288.15, 5.25588), 15 - 0.0065*elevation
}

// ErrInvalidInput is matched (through errors.Is) by the errors this package
// returns for malformed input such as an observer's latitude of 95°.
var ErrInvalidInput = errors.New("astro: invalid input")

// InputError reports an input value this package cannot use.
type InputError struct {
	Field string  // e.g. "observer latitude"
	Value float64 // the value given
	Msg   string  // what is expected
}

func (e *InputError) Error() string {
	return fmt.Sprintf("astro: %s %v: %s", e.Field, e.Value, e.Msg)
}

// Is reports whether target is ErrInvalidInput.
func (e *InputError) Is(target error) bool { return target == ErrInvalidInput }

// Validate checks the observer's fields: latitude within −90..90, longitude
// within −180..180, elevation within −500..20000 m, horizon within −5..45°,
// pressure 0 or within 100..1200 hPa and, with a pressure, temperature
// within −90..60 °C (with Pressure 0 Temperature is not used, nor checked).
func (o Observer) Validate() error {
	switch {
	case !(o.Latitude >= -90 && o.Latitude <= 90):
		return &InputError{"observer latitude", o.Latitude, "must be within -90..90 degrees"}
	case !(o.Longitude >= -180 && o.Longitude <= 180):
		return &InputError{"observer longitude", o.Longitude, "must be within -180..180 degrees (east positive)"}
	case !(o.Elevation >= -500 && o.Elevation <= 20000):
		return &InputError{"observer elevation", o.Elevation, "must be within -500..20000 metres"}
	case !(o.Horizon >= -5 && o.Horizon <= 45):
		return &InputError{"observer horizon", o.Horizon, "must be within -5..45 degrees"}
	case !(o.Pressure == 0 || o.Pressure >= 100 && o.Pressure <= 1200):
		return &InputError{"observer pressure", o.Pressure, "must be 0 (standard refraction) or within 100..1200 hPa"}
	case o.Pressure != 0 && !(o.Temperature >= -90 && o.Temperature <= 60):
		return &InputError{"observer temperature", o.Temperature, "must be within -90..60 °C"}
	}
	return nil
}

// RiseSetAltitude returns the geometric altitude of the Sun's centre at
// sunrise and sunset for this observer, in degrees:
//
//   - Horizon == 0 (and not LevelHorizon): SunriseAltitude (−0.8333°)
//     lowered by the dip of the horizon 1.76′·√Elevation (Dip; Elevation in
//     metres, none when ≤ 0);
//   - Horizon != 0, or LevelHorizon: the upper limb touches the skyline at apparent altitude
//     Horizon, so the centre's geometric altitude is Horizon − R − 16′, R
//     being the standard refraction at apparent altitude Horizon (Bennett's
//     formula, Meeus eq. 16.4, 34.5′ at 0°, taken at −1° below −1°). The
//     skyline is measured as seen, so no dip is added.
//
// With Pressure set, the refraction (34′, or R) is multiplied by
// RefractionFactor.
func (o Observer) RiseSetAltitude() float64 {
	f := o.RefractionFactor()
	if o.Horizon == 0 && !o.LevelHorizon {
		h := SunriseAltitude
		if f != 1 {
			h = -34.0/60*f - 16.0/60
		}
		return h - Dip(o.Elevation)
	}
	r, _ := bennett(max(o.Horizon, bennettMinAltitude)) // arcminutes
	return o.Horizon - r*f/60 - 16.0/60
}

// RaisedHorizon says whether o's horizon is above level: a Horizon above
// 0°, hills that hide the Sun before it sets (a level horizon at 0°,
// LevelHorizon, is not).
func (o Observer) RaisedHorizon() bool { return o.Horizon > 0 }

// Dip returns the dip of the horizon in degrees for an eye elevation
// metres above a flat (sea) horizon: 1.76′·√elevation (N. Bowditch, The
// American Practical Navigator, dip of the sea horizon; refraction over the
// sea included), 0 at or below sea level: 59.7′ at 1150 m, 94.0′ (1.57°)
// at 2850 m; it grows without a bound, as √elevation. NaN gives NaN.
func Dip(elevation float64) float64 {
	if elevation <= 0 {
		return 0
	}
	return 1.76 / 60 * math.Sqrt(elevation)
}

// Ephemeris holds the Sun's apparent geocentric track (right ascension,
// declination, distance and the Earth's rotation) over a span, sampled once a
// day and interpolated: it does not depend on the site, so one ephemeris
// serves any number of observers and thresholds. Interpolation error against
// direct evaluation is measured in TestEphemerisInterpolation (below
// 0.001″). An Ephemeris is immutable and safe for concurrent use.
type Ephemeris struct {
	coverage // queries allowed in [from, to]
	sun      *track
	sites    siteCache
}

// siteCache keeps the site of the last observer queried, so that the
// queries of one observer after another (an azimuth per sunrise) prepare it
// once. It is safe for concurrent use: a site is never changed once stored.
// Only a valid observer is stored (its callers check it first).
type siteCache struct{ last atomic.Pointer[cachedSite] }

type cachedSite struct {
	o  Observer
	st *site
}

// kept returns o's site if it is the one kept, else nil.
func (c *siteCache) kept(o *Observer) *site {
	if p := c.last.Load(); p != nil && p.o == *o {
		return p.st
	}
	return nil
}

// site returns o's site, prepared or kept; o must be valid.
func (c *siteCache) site(o *Observer) *site {
	if st := c.kept(o); st != nil {
		return st
	}
	return c.keep(o)
}

// keep prepares o's site and keeps it; o must be valid.
func (c *siteCache) keep(o *Observer) *site {
	st := newSite(*o)
	c.last.Store(&cachedSite{*o, st})
	return st
}

// query is coverage.query with the observer's site kept for the next
// query. The observer the cache holds was checked before it was stored,
// so that a caller asking for one instant after another (an azimuth per
// sunrise) has only the span checked. It takes o by pointer: a query per
// event (SunAzimuth) copies the Observer once less.
func (e *Ephemeris) query(o *Observer, from, to time.Time) (*site, error) {
	if st := e.sites.kept(o); st != nil {
		if err := e.checkSpan(from, to); err != nil {
			return nil, err
		}
		return st, nil
	}
	if err := e.check(*o, from, to); err != nil {
		return nil, err
	}
	return e.sites.keep(o), nil
}

// coverage is the span an ephemeris (the Sun's or the Moon's) answers
// queries for, with its ends' whole Unix seconds for checkSpan's test.
type coverage struct {
	from, to   time.Time
	fromS, toS int64
}

// newCoverage returns the coverage [from, to].
func newCoverage(from, to time.Time) coverage {
	return coverage{from: from, to: to, fromS: from.Unix(), toS: to.Unix()}
}

// Coverage returns the span in which the ephemeris answers queries.
func (c coverage) Coverage() (from, to time.Time) { return c.from, c.to }

// query checks the observer and the span [from, to] of a query and returns
// the observer's site for the track search.
func (c *coverage) query(o Observer, from, to time.Time) (*site, error) {
	if err := c.check(o, from, to); err != nil {
		return nil, err
	}
	return newSite(o), nil
}

// check checks the observer and the span [from, to] of a query.
func (c *coverage) check(o Observer, from, to time.Time) error {
	if err := o.Validate(); err != nil {
		return err
	}
	return c.checkSpan(from, to)
}

// checkSpan returns a *RangeError when from or to lies outside the coverage.
// An instant whose whole Unix second lies strictly between those of the
// ends is within it (a query's usual case: an azimuth per sunrise); one in
// an end's second is compared to the nanosecond.
func (c *coverage) checkSpan(from, to time.Time) error {
	if f, t := from.Unix(), to.Unix(); c.fromS < f && f < c.toS && c.fromS < t && t < c.toS {
		return nil
	}
	for _, t := range [2]time.Time{from, to} {
		if t.Before(c.from) || t.After(c.to) {
			return &RangeError{What: "time", Value: t.UTC().Format(time.RFC3339), Min: c.from.Format(time.RFC3339), Max: c.to.Format(time.RFC3339), Coverage: true}
		}
	}
	return nil
}

// ephemerisMargin is how far beyond the requested span an ephemeris answers
// queries; the samples reach two days further for the search's own margin.
const ephemerisMargin = 2 * 24 * time.Hour

// NewEphemeris builds the Sun's track for queries within [from − 2 days,
// to + 2 days]. from and to must lie within MinTime..MaxTime (else a
// *RangeError) and from must not be after to. The days within the shipped
// table (1989-12-28..2101-01-05: any span within 1990..2100) are read
// from it; the others are computed, at a cost per day of the nutation and
// 148 of VSOP87D's terms, plus 20 evaluations of the rest per 256 days
// (a Chebyshev fit of the smaller terms).
func NewEphemeris(from, to time.Time) (*Ephemeris, error) {
	return newEphemeris(from, to, true)
}

// newEphemeris is NewEphemeris, with the table's days read from it when
// useTable is set and computed otherwise.
func newEphemeris(from, to time.Time, useTable bool) (*Ephemeris, error) {
	if err := checkTime("ephemeris start", from); err != nil {
		return nil, err
	}
	if err := checkTime("ephemeris end", to); err != nil {
		return nil, err
	}
	if to.Before(from) {
		return nil, invalidf("astro: ephemeris end %s is before its start %s", to.UTC().Format(time.RFC3339), from.UTC().Format(time.RFC3339))
	}
	qa, qb := from.Add(-ephemerisMargin), to.Add(ephemerisMargin)
	tr := allocSunTrack(from, to)
	start, n := tr.start, len(tr.g)
	// samples k0..k1−1 from the table, the others computed (a run before
	// it, a run after it)
	k0, k1 := n, n
	if useTable {
		k0, k1 = readSunTable(tr)
	}
	put := func(b0 int, gha, dec, dist []float64) {
		for i := range gha {
			tr.set(b0+i, gha[i], dec[i], dist[i])
		}
		tr.trigRange(b0, b0+len(gha))
	}
	sunSamples(start, 0, k0, put)
	sunSamples(start, k1, n, put)
	tr.finish()
	tr.carry = true
	return &Ephemeris{coverage: newCoverage(qa, qb), sun: tr}, nil
}

// allocSunTrack returns the Sun's track for the span from..to, to be
// filled: samples at 0h UTC from 4 days before the start to 4 days after
// the end, with the sine and cosine of the declination (filled block by
// block, trigRange).
func allocSunTrack(from, to time.Time) *track {
	start := math.Floor(unixSeconds(from)/secondsPerDay)*secondsPerDay - 4*secondsPerDay
	n := int(math.Ceil((unixSeconds(to)-start)/secondsPerDay)) + 5
	tr := allocTrack(start, secondsPerDay, n)
	tr.sd, tr.cd = make([]float64, n), make([]float64, n)
	return tr
}

// sunSamples computes the Sun's samples k0..k1−1 at 0h UTC of the days
// start + k·(1 day) (start in Unix s): the Greenwich hour angle (rad, not
// reduced, greenwichHourAngle), the declination (rad) and the distance
// (Earth radii), handed to put a block at a time (put(b0, …): samples b0,
// b0+1, …), possibly from several goroutines at once for different blocks.
// The slices are the goroutine's working memory, overwritten after put
// returns.
//
// The run's Earth series (chebyshev.go) is fitted from its first sample,
// and the samples are taken block by block from k0 (daily starts its
// rotations afresh at each block, whichever goroutine takes it), each core
// taking the next block not yet taken until none is left, so that the
// cores finish within a block of each other; the calling goroutine is one
// of them. A goroutine's working memory serves each of its blocks: the same
// numbers as in one run. They depend on k0 in their last bits: a run from
// another day rotates from other instants.
func sunSamples(start float64, k0, k1 int, put func(b0 int, gha, dec, dist []float64)) {
	n := k1 - k0
	if n <= 0 {
		return
	}
	const earthRadiiPerAU = auKm / earthRadiusKm
	first, last := start+float64(k0)*secondsPerDay, start+float64(k1-1)*secondsPerDay
	series := newEarthSeries(epochOf(first).JDE-0.5, epochOf(last).JDE+0.5)
	blocks := (n + sunChebDays - 1) / sunChebDays
	var next atomic.Int64
	take := func() {
		var buf sampleBuffers
		es := make([]Epoch, 0, sunChebDays)
		jdes := make([]float64, 0, sunChebDays)
		var gha, dec, dist [sunChebDays]float64
		for {
			b := int(next.Add(1) - 1)
			if b >= blocks {
				return
			}
			b0 := k0 + b*sunChebDays
			b1 := min(b0+sunChebDays, k1)
			es, jdes = es[:0], jdes[:0]
			for k := b0; k < b1; k++ {
				e := epochOf(start + float64(k)*secondsPerDay)
				es, jdes = append(es, e), append(jdes, e.JDE)
			}
			Ls, Bs, Rs := series.daily(jdes, &buf)
			dpsi, deps := nutationDaily(jdes, &buf)
			for i, e := range es {
				s := apparentSunNut(e.JDE, Ls[i], Bs[i], Rs[i], dpsi[i], deps[i])
				gha[i] = greenwichHourAngle(e, s.ra, s.eqEq())
				dec[i], dist[i] = s.dec, s.r*earthRadiiPerAU
			}
			m := len(es)
			put(b0, gha[:m], dec[:m], dist[:m])
		}
	}
	var wg sync.WaitGroup
	for range min(runtime.GOMAXPROCS(0), blocks) - 1 {
		wg.Go(take)
	}
	take()
	wg.Wait()
}

// Direction tells whether the Sun or the Moon crosses a threshold going up
// (Rising) or down (Setting); a byte, so that it packs beside a few flags
// in the structs that hold one.
type Direction int8

// Directions of a crossing.
const (
	Rising Direction = iota + 1
	Setting
)

// String returns "rising" or "setting".
func (d Direction) String() string {
	switch d {
	case Rising:
		return "rising"
	case Setting:
		return "setting"
	}
	return fmt.Sprintf("Direction(%d)", int(d))
}

// Crossing is an instant when the Sun or the Moon crosses an altitude
// (SunCrossings: the Sun's centre; MoonRiseSet: the Moon's upper limb) or a
// skyline.
type Crossing struct {
	Time      time.Time // UTC, to the microsecond (solved to 1 ms)
	Direction Direction
}

// SunCrossings returns every crossing of the Sun's centre through altitude
// (degrees; topocentric and geometric: no refraction is applied, the
// thresholds SunriseAltitude, CivilTwilight… already include it) in
// [from, to), sorted; an empty span (to not after from) has none. For
// sunrise and sunset pass o.RiseSetAltitude(). The span must lie within
// Coverage() (else a *RangeError); an invalid observer or altitude gives an
// *InputError.
func (e *Ephemeris) SunCrossings(o Observer, altitude float64, from, to time.Time) ([]Crossing, error) {
	res, err := e.SunCrossingsMany(o, []float64{altitude}, from, to)
	if err != nil {
		return nil, err
	}
	return res[0], nil
}

// SunCrossingsMany is SunCrossings for several altitudes at once: it finds
// the Sun's culminations once and reuses them for every threshold, which
// roughly halves the cost of a site's daily events. The result has one
// slice per altitude, in the order given.
func (e *Ephemeris) SunCrossingsMany(o Observer, altitudes []float64, from, to time.Time) ([][]Crossing, error) {
	return e.AppendSunCrossings(nil, o, altitudes, from, to)
}

// AppendSunCrossings is SunCrossingsMany writing into dst: dst[i][:0]
// receives the crossings of altitudes[i] (dst is lengthened as needed), so
// that a caller computing span after span reuses its slices.
func (e *Ephemeris) AppendSunCrossings(dst [][]Crossing, o Observer, altitudes []float64, from, to time.Time) ([][]Crossing, error) {
	if err := o.Validate(); err != nil {
		return nil, err
	}
	for _, h := range altitudes {
		if !(h >= -90 && h <= 90) {
			return nil, &InputError{"altitude", h, "must be within -90..90 degrees"}
		}
	}
	if err := e.checkSpan(from, to); err != nil {
		return nil, err
	}
	st := e.sites.site(&o)
	a, b := unixSeconds(from), unixSeconds(to)
	sc := crossingScratch.Get().(*scratch)
	defer crossingScratch.Put(sc)
	sc.ext = e.sun.appendExtrema(sc.ext[:0], st, a, b)
	ext := sc.ext
	sines := make([]float64, len(altitudes))
	for len(sc.bufs) < len(altitudes) {
		sc.bufs = append(sc.bufs, nil)
	}
	bufs := sc.bufs[:len(altitudes)]
	for i, h := range altitudes {
		sines[i] = math.Sin(h * deg2rad)
		bufs[i] = bufs[i][:0]
	}
	sc.mids = e.sun.crossingsMany(st, ext, sines, a, b, bufs, sc.mids)
	for len(dst) < len(altitudes) {
		dst = append(dst, nil)
	}
	dst = dst[:len(altitudes)]
	// instants compared as Unix nanoseconds, which hold the whole range
	// (MinTime..MaxTime and the margins)
	fromNs, toNs := from.UnixNano(), to.UnixNano()
	for i, buf := range bufs {
		cs := slices.Grow(dst[i][:0], len(buf))
		for _, c := range buf {
			whole, us := unixMicros(c.t)
			if ns := whole*1e9 + us*1000; ns < fromNs || ns >= toNs {
				continue
			}
			d := Setting
			if c.rising {
				d = Rising
			}
			cs = append(cs, Crossing{Time: time.Unix(whole, us*1000).UTC(), Direction: d})
		}
		dst[i] = cs
	}
	return dst, nil
}

// scratch is the working memory of AppendSunCrossings, kept between calls
// (crossingScratch).
type scratch struct {
	ext  []extremum
	bufs [][]crossing
	mids []midDec
}

var crossingScratch = sync.Pool{New: func() any { return new(scratch) }}

// Transit is an upper meridian transit of the Sun (solar noon, SunTransits)
// or of the Moon (MoonTransits).
type Transit struct {
	Time     time.Time // UTC
	Altitude float64   // topocentric geometric altitude of the centre, degrees (negative in polar night)
}

// SunTransits returns the Sun's upper transits (local hour angle 0: solar
// noon) in [from, to), one per day at every latitude, including polar night.
// The span must lie within Coverage() (else a *RangeError); an invalid
// observer gives an *InputError.
func (e *Ephemeris) SunTransits(o Observer, from, to time.Time) ([]Transit, error) {
	st, err := e.query(&o, from, to)
	if err != nil {
		return nil, err
	}
	return e.sun.transitList(st, from, to), nil
}

// AppendSunTransits is SunTransits appending to dst, so that a caller
// asking span after span reuses one slice.
func (e *Ephemeris) AppendSunTransits(dst []Transit, o Observer, from, to time.Time) ([]Transit, error) {
	st, err := e.query(&o, from, to)
	if err != nil {
		return nil, err
	}
	return e.sun.appendTransits(dst, st, from, to), nil
}

// SunAltitude returns the topocentric geometric altitude of the Sun's
// centre (degrees, no refraction) at t. The instant must lie within
// Coverage() (else a *RangeError); an invalid observer gives an *InputError.
func (e *Ephemeris) SunAltitude(o Observer, t time.Time) (float64, error) {
	st, err := e.query(&o, t, t)
	if err != nil {
		return 0, err
	}
	return e.sun.altitude(st, t), nil
}

// State says whether a threshold is crossed during a date: the Sun's in
// SunDays, the Moon's in MoonDays.
type State int

// States of a date.
const (
	Crosses     State = iota // at least one crossing in the date
	AlwaysAbove              // no crossing: the body stays above the threshold all day (the midnight Sun)
	AlwaysBelow              // no crossing: the body stays below the threshold all day (the polar night)
)

// String returns "crosses", "always-above" or "always-below".
func (s State) String() string {
	switch s {
	case Crosses:
		return "crosses"
	case AlwaysAbove:
		return "always-above"
	case AlwaysBelow:
		return "always-below"
	}
	return fmt.Sprintf("State(%d)", int(s))
}

// Day is the crossings of one threshold by the Sun (SunDays) or the Moon
// (MoonDays) during one local date.
type Day struct {
	Date    time.Time   // first instant of the date in the location asked for: local midnight, or the clock change where midnight is skipped (DateStart)
	Rising  []time.Time // upward crossings within the date, in order (UTC)
	Setting []time.Time // downward crossings within the date, in order (UTC)
	State   State       // Crosses, or AlwaysAbove/AlwaysBelow when the date has no crossing at all
}

// SunDays returns one Day per local date from first to last inclusive
// (the dates of first.In(loc) and last.In(loc): make them in loc, as
// midnight UTC is the previous date west of Greenwich; the clock part is
// otherwise ignored), with
// the crossings of altitude (degrees, geometric; o.RiseSetAltitude() for
// sunrise and sunset) that fall within each date, from its first instant
// (local midnight, or the clock change where midnight is skipped; see
// DateStart) to the next date's. A date may hold zero, one or two crossings
// of each direction (e.g. the Sun sets just after midnight and again before
// the next one at high latitude). A date that does not exist in loc has no
// Day. The dates must lie within Coverage(). It stops with ctx's error when
// ctx is done.
func (e *Ephemeris) SunDays(ctx context.Context, o Observer, altitude float64, loc *time.Location, first, last time.Time) ([]Day, error) {
	s0 := math.Sin(altitude * deg2rad)
	return crossingDays(ctx, "SunDays", o, loc, first, last,
		func(from, to time.Time) ([]Crossing, error) { return e.SunCrossings(o, altitude, from, to) },
		func(st *site, sec float64) bool { return e.sun.sinAltitude(st, sec) > s0 })
}
