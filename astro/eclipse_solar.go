package astro

// Solar eclipses: Besselian elements and local circumstances.
//
// Method: Explanatory Supplement to the Astronomical Almanac (P. K.
// Seidelmann ed., 1992), ch. 8.3 ("Solar eclipses"). At each instant the
// shadow axis is the line through the apparent centres of the Sun and the
// Moon (sun.go, moon.go); the fundamental plane passes through the Earth's
// centre perpendicular to it. The Besselian elements are
//
//	x, y      the Moon's centre projected on the fundamental plane, Earth radii
//	d, μ      the declination and the Greenwich hour angle of the axis
//	          (μ from the Greenwich apparent sidereal time and UT1)
//	l1, l2    the radii of the penumbral and umbral cones on the plane
//	          (l2 < 0: the umbra's vertex lies beyond the plane)
//	tan f1,2  the half-angles of the cones
//
// with the Sun's radius from its semidiameter at 1 au, 959.63″, and the
// Moon's from k = 0.2725076 Earth equatorial radii (the IAU 1982 mean radius
// of the Moon, used for every contact: the limb is the mean limb, without
// its mountains and valleys, which move second and third contacts by a
// second or two). The observer's place (WGS 84, height included) gives
// ξ, η, ζ, and the contacts are the instants at which the distance m of the
// observer from the axis equals the cone radius there, L1 = l1 − ζ tan f1
// (first and last contact) or |L2| = |l2 − ζ tan f2| (second and third).
// Maximum is the least m; the magnitude is the fraction of the Sun's diameter
// covered, (L1 − m)/(L1 + L2), and for a total or annular eclipse the ratio
// of the diameters (L1 − L2)/(L1 + L2); the obscuration is the fraction of
// the Sun's disc covered, from the two discs of radii (L1 + L2)/2 and
// (L1 − L2)/2 at distance m.
//
// The Sun's altitude and azimuth at each contact are those of the shadow
// axis (within 9″ of the Sun's direction), geometric: a contact is above the
// horizon when the Sun's centre is above the observer's sunrise altitude
// (Observer.RiseSetAltitude: upper limb on the horizon with standard
// refraction), so an eclipse "at sunrise" agrees with the sunrise event.

import (
	"fmt"
	"math"
	"time"
)

const (
	// MoonRadiusSolarEclipse is k, the Moon's mean radius in Earth
	// equatorial radii used for solar eclipses: the IAU 1982 value.
	MoonRadiusSolarEclipse = 0.2725076
	// sunSemidiameter1AU is the Sun's semidiameter at 1 au, arcseconds
	// (Explanatory Supplement 1992; IAU 1976).
	sunSemidiameter1AU = 959.63
)

// Element indices in a solar eclipse's series.
const (
	beX = iota
	beY
	beD
	beMu
	beL1
	beL2
	beTanF1
	beTanF2
	beCount
)

// EclipseType is the kind of an eclipse, globally or at a site.
type EclipseType int

// Eclipse types. Solar: Partial, Annular, Total (and Hybrid globally: total
// along part of the track, annular along the rest). Lunar: Penumbral,
// Partial, Total.
const (
	Partial EclipseType = iota + 1
	Annular
	Total
	Hybrid
	Penumbral
)

// String returns the type in lower case: "partial", "annular", "total",
// "hybrid" or "penumbral"; "none" for the zero value (the Type of a site
// that sees no phase), and "EclipseType(9)" for any other, as the package's
// other enumerations write an unknown value.
func (t EclipseType) String() string {
	switch t {
	case Partial:
		return "partial"
	case Annular:
		return "annular"
	case Total:
		return "total"
	case Hybrid:
		return "hybrid"
	case Penumbral:
		return "penumbral"
	case 0:
		return "none"
	}
	return fmt.Sprintf("EclipseType(%d)", int(t))
}

// SolarEclipse is one solar eclipse as seen from the whole Earth, with its
// Besselian elements for the local circumstances of any site. SolarEclipses
// makes them; a SolarEclipse made otherwise (its zero value, a literal) has
// no elements: Elements gives NaN and Local no circumstances.
type SolarEclipse struct {
	// Greatest is the instant the shadow axis passes nearest the Earth's
	// centre (UTC).
	Greatest time.Time
	// Gamma is that least distance in Earth radii, negative when the axis
	// passes south of the centre.
	Gamma float64
	// Type is the eclipse's type along the track of the axis (Partial when
	// the umbra or antumbra misses the Earth). Hybrid is reported when the
	// umbra reaches the surface at the greatest eclipse but not at the ends
	// of the track.
	Type EclipseType
	el   *chebSet
}

// Elements returns the Besselian elements at the UTC instant t: x, y, l1,
// l2 in Earth radii, d and μ in degrees (μ in [0, 360)), tan f1 and tan f2.
// They are fitted over the twelve hours centred on the new moon, which hold
// Greatest and the whole eclipse; for an instant outside them (more than
// about six hours from Greatest), where the fit would run wild, every value
// is NaN.
func (e *SolarEclipse) Elements(t time.Time) (x, y, d, mu, l1, l2, tanF1, tanF2 float64) {
	sec := unixSeconds(t)
	if e.el == nil || !(sec >= e.el.a && sec <= e.el.b) {
		n := math.NaN()
		return n, n, n, n, n, n, n, n
	}
	var v [beCount]float64
	e.el.eval(sec, v[:])
	return v[beX], v[beY], v[beD] * rad2deg, norm360(v[beMu] * rad2deg), v[beL1], v[beL2], v[beTanF1], v[beTanF2]
}

// besselian computes the Besselian elements at Unix second sec directly from
// the apparent Sun and Moon; mu is reduced near muRef.
func besselian(sec, muRef float64, out []float64) {
	ep := epochOf(sec)
	sun := apparentSun(ep.JDE)
	moon := moonApparent(ep.JDE)
	rs := sun.r * auKm / earthRadiusKm
	rm := moon.dist / earthRadiusKm
	sdS, cdS := math.Sincos(sun.dec)
	saS, caS := math.Sincos(sun.ra)
	sdM, cdM := math.Sincos(moon.dec)
	saM, caM := math.Sincos(moon.ra)
	gx := rs*cdS*caS - rm*cdM*caM
	gy := rs*cdS*saS - rm*cdM*saM
	gz := rs*sdS - rm*sdM
	g := math.Sqrt(gx*gx + gy*gy + gz*gz)
	d := math.Asin(gz / g)
	a := math.Atan2(gy, gx)
	sd, cd := math.Sincos(d)
	sh, ch := math.Sincos(moon.ra - a)
	x := rm * cdM * sh
	y := rm * (sdM*cd - cdM*sd*ch)
	z := rm * (sdM*sd + cdM*cd*ch)
	rsun := auKm * math.Sin(sunSemidiameter1AU*arcsec2rad) / earthRadiusKm
	k := MoonRadiusSolarEclipse
	sf1 := (rsun + k) / g
	sf2 := (rsun - k) / g
	tf1 := sf1 / math.Sqrt(1-sf1*sf1)
	tf2 := sf2 / math.Sqrt(1-sf2*sf2)
	gast := meanSiderealRaw(ep.JDUT1)*deg2rad + sun.eqEq()
	out[beX], out[beY], out[beD] = x, y, d
	out[beMu] = unwrapNear(gast-a, muRef)
	out[beL1] = (z + k/sf1) * tf1
	out[beL2] = (z - k/sf2) * tf2
	out[beTanF1], out[beTanF2] = tf1, tf2
}

// SolarEclipses returns the solar eclipses whose greatest eclipse falls in
// [from, to), in order. It returns a *RangeError outside MinTime..MaxTime and
// an error matching ErrInvalidInput when to is before from.
func SolarEclipses(from, to time.Time) ([]*SolarEclipse, error) {
	nm, err := syzygies(from, to, NewMoon)
	if err != nil {
		return nil, err
	}
	fromSec, toSec := unixSeconds(from), unixSeconds(to)
	var out []*SolarEclipse
	var tmp [beCount]float64
	for _, t0 := range nm {
		besselian(t0, 0, tmp[:])
		mu0 := tmp[beMu]
		a, b := t0-eclipseHalfWindow, t0+eclipseHalfWindow
		el := fitCheb(a, b, beCount, func(sec float64, out []float64) {
			besselian(sec, mu0+siderealRate*(sec-t0), out)
		})
		var v [beCount]float64
		r2 := func(sec float64) float64 {
			el.eval(sec, v[:])
			return v[beX]*v[beX] + v[beY]*v[beY]
		}
		tg := minimize(r2, a, b, 0.01)
		el.eval(tg, v[:])
		gamma := math.Hypot(v[beX], v[beY])
		// The penumbra touches the Earth when the axis passes within
		// 1 + l1 (a little less on the flattened Earth: the local search
		// decides for each site).
		if gamma > 1+v[beL1]+0.005 || tg < fromSec || tg >= toSec {
			continue
		}
		if v[beY] < 0 {
			gamma = -gamma
		}
		out = append(out, &SolarEclipse{Greatest: secToTime(tg), Gamma: gamma, Type: solarType(el, tg, gamma), el: el})
	}
	return out, nil
}

// solarType classifies an eclipse by whether the umbra reaches the Earth
// and, when it does, whether the Moon covers the Sun at the greatest eclipse
// and at the first and last instants the axis meets the Earth.
func solarType(el *chebSet, tg, gamma float64) EclipseType {
	var v [beCount]float64
	el.eval(tg, v[:])
	if math.Abs(gamma) > 0.9972+math.Abs(v[beL2]) {
		return Partial
	}
	// L2 at the point of the Earth on the axis: ζ = √(1 − x² − y²).
	l2At := func(sec float64) (float64, bool) {
		el.eval(sec, v[:])
		r2 := v[beX]*v[beX] + v[beY]*v[beY]
		if r2 >= 1 {
			return 0, false
		}
		return v[beL2] - math.Sqrt(1-r2)*v[beTanF2], true
	}
	l, ok := l2At(tg)
	if !ok { // non-central: the edge of the umbra grazes the Earth
		if v[beL2] < 0 {
			return Total
		}
		return Annular
	}
	central := Annular
	if l < 0 {
		central = Total
	}
	// the track's ends: the axis meets the Earth's limb, ζ = 0, L2 = l2
	for _, dir := range []float64{-1, 1} {
		s := tg
		for range 40 {
			if _, in := l2At(s + dir*600); !in {
				break
			}
			s += dir * 600
		}
		el.eval(s, v[:])
		if (v[beL2] < 0) != (central == Total) {
			return Hybrid
		}
	}
	return central
}

// Contact is one instant of a local eclipse with the body's place in the
// site's sky.
type Contact struct {
	Time time.Time // UTC; zero when the contact does not happen at the site
	// Altitude of the body's centre, degrees, geometric (no refraction),
	// and its Azimuth from north through east, degrees [0, 360).
	Altitude, Azimuth float64
	// Up reports whether the body is above the horizon: its upper limb
	// above the site's horizon as for sunrise (Observer.RiseSetAltitude)
	// or moonrise.
	Up bool
}

// IsZero reports whether the contact does not happen.
func (c Contact) IsZero() bool { return c.Time.IsZero() }

// HorizonEvent is a rising or a setting of the body during an eclipse, with
// the eclipse's magnitude at that instant.
type HorizonEvent struct {
	Time      time.Time // UTC
	Direction Direction // Rising or Setting
	Magnitude float64   // fraction of the Sun's diameter covered (solar), umbral magnitude (lunar)
}

// LocalSolarEclipse is a solar eclipse as seen from one site.
type LocalSolarEclipse struct {
	Eclipse *SolarEclipse
	// Type at the site: Partial, Annular or Total.
	Type EclipseType
	// First contact C1, second C2, maximum, third C3, last C4. C2 and C3
	// are zero unless the eclipse is total or annular at the site.
	C1, C2, Max, C3, C4 Contact
	// Magnitude at maximum: the fraction of the Sun's diameter covered (for
	// a total or annular eclipse the ratio of the apparent diameters of the
	// Moon and the Sun). Obscuration: the fraction of the Sun's disc covered.
	Magnitude, Obscuration float64
	// Horizon lists the sunrises and sunsets between C1 and C4 (an eclipse
	// in progress at sunrise or sunset), with the magnitude at each.
	Horizon []HorizonEvent
}

// Visible reports whether any part of the eclipse happens with the Sun
// above the site's horizon.
func (l *LocalSolarEclipse) Visible() bool {
	return l.C1.Up || l.C4.Up || l.Max.Up || len(l.Horizon) > 0
}

// solarLocal holds the site-dependent quantities at one instant.
type solarLocal struct {
	u, v, l1, l2 float64 // Earth radii
	sinAlt       float64 // sine of the Sun's altitude
	H, d         float64 // hour angle and declination of the axis, radians
}

// Local returns the eclipse's circumstances at the observer's site, and
// false when the site sees no phase of it (whether the Sun is up or not:
// see Visible). The observer must be valid: Local does not check it (call
// Observer.Validate first), and an invalid one gives meaningless
// circumstances (a NaN magnitude for a NaN latitude). For a SolarEclipse not
// made by SolarEclipses it returns false.
func (e *SolarEclipse) Local(o Observer) (LocalSolarEclipse, bool) {
	if e.el == nil {
		return LocalSolarEclipse{Eclipse: e}, false
	}
	st := newSite(o)
	var v [beCount]float64
	at := func(sec float64) solarLocal {
		e.el.eval(sec, v[:])
		H := v[beMu] + st.lon
		sH, cH := math.Sincos(H)
		sd, cd := math.Sincos(v[beD])
		xi := st.rhoCos * sH
		eta := st.rhoSin*cd - st.rhoCos*cH*sd
		zeta := st.rhoSin*sd + st.rhoCos*cH*cd
		return solarLocal{
			u: v[beX] - xi, v: v[beY] - eta,
			l1: v[beL1] - zeta*v[beTanF1], l2: v[beL2] - zeta*v[beTanF2],
			sinAlt: st.sinLat*sd + st.cosLat*cd*cH, H: H, d: v[beD],
		}
	}
	a, b := e.el.a, e.el.b
	// The site's maximum: least m, from Newton's method on d(m²)/dt started
	// at the greatest eclipse (u and v are nearly linear in time), kept
	// within the window.
	tm := unixSeconds(e.Greatest)
	for range 10 {
		const h = 60.0
		s1, s2 := at(tm), at(tm+h)
		du, dv := (s2.u-s1.u)/h, (s2.v-s1.v)/h
		step := -(s1.u*du + s1.v*dv) / (du*du + dv*dv)
		tm = math.Min(math.Max(tm+step, a+60), b-60)
		if math.Abs(step) < 0.01 {
			break
		}
	}
	sm := at(tm)
	m := math.Hypot(sm.u, sm.v)
	if m >= sm.l1 {
		return LocalSolarEclipse{}, false
	}
	sinH0 := math.Sin(o.RiseSetAltitude() * deg2rad)
	contact := func(sec float64) Contact {
		s := at(sec)
		alt, az := math.Asin(s.sinAlt), st.azimuthFrom(s.H, s.d, auKm/earthRadiusKm)
		return Contact{Time: secToTime(sec), Altitude: alt * rad2deg, Azimuth: az * rad2deg, Up: s.sinAlt > sinH0}
	}
	outer := func(sec float64) float64 { s := at(sec); return math.Hypot(s.u, s.v) - s.l1 }
	inner := func(sec float64) float64 { s := at(sec); return math.Hypot(s.u, s.v) - math.Abs(s.l2) }
	solve := func(f func(float64) float64, end float64) float64 {
		fe := f(end)
		if fe <= 0 { // not reached within the window (never seen: the window has hours to spare)
			return end
		}
		return rootIllinois(f, tm, f(tm), end, fe, 0.005)
	}
	l := LocalSolarEclipse{Eclipse: e, Type: Partial}
	c1, c4 := solve(outer, a), solve(outer, b)
	l.C1, l.Max, l.C4 = contact(c1), contact(tm), contact(c4)
	L1, L2 := sm.l1, sm.l2
	if m < math.Abs(L2) {
		l.Type = Annular
		if L2 < 0 {
			l.Type = Total
		}
		l.C2, l.C3 = contact(solve(inner, c1)), contact(solve(inner, c4))
		l.Magnitude = (L1 - L2) / (L1 + L2)
	} else {
		l.Magnitude = (L1 - m) / (L1 + L2)
	}
	l.Obscuration = discOverlap((L1+L2)/2, (L1-L2)/2, m)
	ts, up := crossingsOf(func(sec float64) float64 { return at(sec).sinAlt - sinH0 },
		func(sec float64) float64 { return at(sec).H }, siderealRate, c1, c4)
	for i, t := range ts {
		s := at(t)
		dir := Setting
		if up[i] {
			dir = Rising
		}
		mag := (s.l1 - math.Hypot(s.u, s.v)) / (s.l1 + s.l2)
		l.Horizon = append(l.Horizon, HorizonEvent{Time: secToTime(t), Direction: dir, Magnitude: math.Max(mag, 0)})
	}
	return l, true
}

// discOverlap returns the fraction of a disc of radius rs covered by a disc
// of radius rm whose centre is at distance d.
func discOverlap(rs, rm, d float64) float64 {
	rs, rm = math.Abs(rs), math.Abs(rm)
	switch {
	case d >= rs+rm:
		return 0
	case d <= math.Abs(rs-rm):
		if rm >= rs {
			return 1
		}
		return rm * rm / (rs * rs)
	}
	a1 := rs * rs * math.Acos((d*d+rs*rs-rm*rm)/(2*d*rs))
	a2 := rm * rm * math.Acos((d*d+rm*rm-rs*rs)/(2*d*rm))
	a3 := 0.5 * math.Sqrt((-d+rs+rm)*(d+rs-rm)*(d-rs+rm)*(d+rs+rm))
	return (a1 + a2 - a3) / (math.Pi * rs * rs)
}
