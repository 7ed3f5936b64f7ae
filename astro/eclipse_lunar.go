package astro

// Lunar eclipses: contacts, magnitudes and the Moon's place at a site.
//
// The Moon is eclipsed by the Earth's shadow, whose centre is the point
// opposite the apparent Sun. With the Moon's equatorial horizontal parallax
// πm (asin of the Earth's equatorial radius over the distance), the Sun's
// parallax πs = 8.794143″/r and semidiameter ss = 959.63″/r (r in au), the
// shadow radii follow Danjon's enlargement (A. Danjon, L'Astronomie 65,
// 1951; the convention of F. Espenak & J. Meeus, Five Millennium Canon of
// Lunar Eclipses, NASA/TP-2009-214172, 2009): the Earth's radius, taken at
// latitude 45° (π1 = 0.998340 πm), is raised by 1/85 for the atmosphere,
//
//	umbra      ρu = (1 + 1/85) π1 − ss + πs
//	penumbra   ρp = (1 + 1/85) π1 + ss + πs
//
// Chauvenet's older convention (long the Astronomical Almanac's) enlarges
// the whole radius by 1/50 instead, ρ = 1.02 (π1 ∓ ss + πs): an umbra about
// 9″ and a penumbra about 45″ wider, which moves the umbral contacts by some
// 20 s and the penumbral ones by over a minute. The Moon's semidiameter is
// asin(0.2724880 sin πm), the Moon's mean radius of the lunar-eclipse canon.
//
// With D the angular distance of the Moon's centre from the shadow's
// centre, the contacts are D = ρp + sm (P1, P4), ρu + sm (U1, U4) and
// ρu − sm (U2, U3); maximum is the least D; the umbral and penumbral
// magnitudes are (ρ + sm − D)/(2 sm) there. All this is geocentric: the
// instants are the same for every site, and a site sees what happens while
// the Moon is above its horizon.

import (
	"math"
	"time"
)

const (
	// MoonRadiusLunarEclipse is the Moon's mean radius in Earth equatorial
	// radii for the Moon's semidiameter in lunar eclipses.
	MoonRadiusLunarEclipse = 0.2724880
	// ShadowEnlargement is the factor on the Earth's radius (at 45°
	// latitude) for the shadow radii: Danjon's 1 + 1/85.
	ShadowEnlargement = 1 + 1.0/85
	// sunParallax1AU is the Sun's equatorial horizontal parallax at 1 au,
	// arcseconds.
	sunParallax1AU = 8.794143
)

// Series indices of a lunar eclipse.
const (
	leMoonRA = iota
	leMoonDec
	leMoonDist
	leGAST
	leLocal // the series a site needs come first
	leSunRA = iota - 1
	leSunDec
	leSunR
	leCount
)

// LunarEclipse is one eclipse of the Moon; its instants are the same for
// every site. LunarEclipses makes them with the Moon's track that Local
// needs; a LunarEclipse made otherwise (its zero value, a literal) has none,
// and its Local circumstances are all zero.
type LunarEclipse struct {
	Type EclipseType // Penumbral, Partial or Total
	// The contacts (UTC): penumbral P1 and P4, umbral (partial phase) U1
	// and U4, total phase U2 and U3; zero when they do not happen.
	// Greatest is the greatest eclipse (the name SolarEclipse gives it too).
	P1, U1, U2, Greatest, U3, U4, P4 time.Time
	// UmbralMagnitude and PenumbralMagnitude are the fractions of the
	// Moon's diameter inside the umbra and the penumbra at Greatest (negative
	// umbral magnitude: the Moon misses the umbra by that much).
	UmbralMagnitude, PenumbralMagnitude float64
	s                                   *chebSet
	// the Moon's series (leMoonRA..leGAST) at P1, U1, U2, Greatest, U3, U4, P4,
	// evaluated once for every site
	atContact [7][leLocal]float64
}

// lunarAt holds the geometry at one instant, radians.
type lunarAt struct {
	d, rp, ru, sm float64
}

func (e *LunarEclipse) at(sec float64, v []float64) lunarAt {
	e.s.eval(sec, v)
	return lunarGeometry(v)
}

func lunarGeometry(v []float64) lunarAt {
	// unit vectors of the Moon and of the point opposite the Sun
	sdm, cdm := math.Sincos(v[leMoonDec])
	sam, cam := math.Sincos(v[leMoonRA])
	sds, cds := math.Sincos(v[leSunDec])
	sas, cas := math.Sincos(v[leSunRA])
	mx, my, mz := cdm*cam, cdm*sam, sdm
	ax, ay, az := -cds*cas, -cds*sas, -sds
	cx, cy, cz := my*az-mz*ay, mz*ax-mx*az, mx*ay-my*ax
	d := math.Atan2(math.Sqrt(cx*cx+cy*cy+cz*cz), mx*ax+my*ay+mz*az)
	pm := math.Asin(earthRadiusKm / v[leMoonDist])
	p1 := 0.998340 * pm
	r := v[leSunR]
	ps := sunParallax1AU * arcsec2rad / r
	ss := sunSemidiameter1AU * arcsec2rad / r
	return lunarAt{
		d:  d,
		rp: ShadowEnlargement*p1 + ss + ps,
		ru: ShadowEnlargement*p1 - ss + ps,
		sm: math.Asin(MoonRadiusLunarEclipse * math.Sin(pm)),
	}
}

// lunarSample computes the series' quantities at sec directly.
func lunarSample(sec, raS, raM, g float64, out []float64) {
	ep := epochOf(sec)
	sun := apparentSun(ep.JDE)
	moon := moonApparent(ep.JDE)
	out[leSunRA] = unwrapNear(sun.ra, raS)
	out[leSunDec] = sun.dec
	out[leSunR] = sun.r
	out[leMoonRA] = unwrapNear(moon.ra, raM)
	out[leMoonDec] = moon.dec
	out[leMoonDist] = moon.dist
	out[leGAST] = unwrapNear(meanSiderealRaw(ep.JDUT1)*deg2rad+sun.eqEq(), g)
}

// LunarEclipses returns the lunar eclipses (penumbral ones included) whose
// greatest eclipse falls in [from, to), in order. It returns a *RangeError
// outside MinTime..MaxTime and an error matching ErrInvalidInput when to is
// before from.
func LunarEclipses(from, to time.Time) ([]*LunarEclipse, error) {
	fm, err := syzygies(from, to, FullMoon)
	if err != nil {
		return nil, err
	}
	fromSec, toSec := unixSeconds(from), unixSeconds(to)
	var out []*LunarEclipse
	var tmp [leCount]float64
	for _, t0 := range fm {
		lunarSample(t0, 0, 0, 0, tmp[:])
		raS, raM, g0 := tmp[leSunRA], tmp[leMoonRA], tmp[leGAST]
		a, b := t0-eclipseHalfWindow, t0+eclipseHalfWindow
		e := &LunarEclipse{}
		e.s = fitCheb(a, b, leCount, func(sec float64, out []float64) {
			dt := sec - t0
			lunarSample(sec, raS+dt*2*math.Pi/(365.25*secondsPerDay), raM+dt*moonMeanMotion/secondsPerDay,
				g0+siderealRate*dt, out)
		})
		var v [leCount]float64
		tm := minimize(func(sec float64) float64 { return e.at(sec, v[:]).d }, a, b, 0.01)
		g := e.at(tm, v[:])
		if g.d >= g.rp+g.sm || tm < fromSec || tm >= toSec {
			continue
		}
		e.Greatest = secToTime(tm)
		e.UmbralMagnitude = (g.ru + g.sm - g.d) / (2 * g.sm)
		e.PenumbralMagnitude = (g.rp + g.sm - g.d) / (2 * g.sm)
		pair := func(radius func(lunarAt) float64) (time.Time, time.Time) {
			f := func(sec float64) float64 { x := e.at(sec, v[:]); return x.d - radius(x) }
			fm := f(tm)
			if fm >= 0 {
				return time.Time{}, time.Time{}
			}
			root := func(end float64) time.Time {
				fe := f(end)
				if fe <= 0 { // not reached within the window (never seen: it has hours to spare)
					return secToTime(end)
				}
				return secToTime(rootIllinois(f, tm, fm, end, fe, 0.001))
			}
			return root(a), root(b)
		}
		e.P1, e.P4 = pair(func(x lunarAt) float64 { return x.rp + x.sm })
		e.U1, e.U4 = pair(func(x lunarAt) float64 { return x.ru + x.sm })
		e.U2, e.U3 = pair(func(x lunarAt) float64 { return x.ru - x.sm })
		for i, t := range []time.Time{e.P1, e.U1, e.U2, e.Greatest, e.U3, e.U4, e.P4} {
			if !t.IsZero() {
				e.s.evalN(unixSeconds(t), v[:], leLocal)
				copy(e.atContact[i][:], v[:leLocal])
			}
		}
		switch {
		case !e.U2.IsZero():
			e.Type = Total
		case !e.U1.IsZero():
			e.Type = Partial
		default:
			e.Type = Penumbral
		}
		out = append(out, e)
	}
	return out, nil
}

// LocalLunarEclipse is a lunar eclipse with the Moon's place in one site's
// sky at each contact.
type LocalLunarEclipse struct {
	Eclipse *LunarEclipse
	// The contacts as seen from the site (zero Time when the contact does
	// not happen); Altitude and Azimuth are the Moon's topocentric ones.
	// Greatest is the site's circumstances at the greatest eclipse.
	P1, U1, U2, Greatest, U3, U4, P4 Contact
	// Horizon lists the moonrises and moonsets between P1 and P4, with the
	// umbral magnitude at each.
	Horizon []HorizonEvent
}

// Visible reports whether any part of the eclipse (P1 to P4) happens with
// the Moon above the site's horizon.
func (l *LocalLunarEclipse) Visible() bool {
	return l.P1.Up || l.Greatest.Up || l.P4.Up || len(l.Horizon) > 0
}

// Local returns the eclipse's circumstances at the observer's site. The
// observer must be valid: Local does not check it (call Observer.Validate
// first), and an invalid one gives meaningless circumstances (NaN altitudes
// for a NaN latitude). For a LunarEclipse not made by LunarEclipses every
// contact is zero (IsZero) and Visible is false.
func (e *LunarEclipse) Local(o Observer) LocalLunarEclipse {
	if e.s == nil {
		return LocalLunarEclipse{Eclipse: e}
	}
	st := newSite(o)
	// The Moon's rise/set altitude for its distance at maximum: its
	// semidiameter changes by well under 1″ during an eclipse.
	sinH0 := math.Sin(moonRiseSetAltitude(o, math.Asin(moonRadiusKm/e.atContact[3][leMoonDist])))
	sinAlt := func(v []float64) (s, H float64) {
		H = v[leGAST] + st.lon - v[leMoonRA]
		return st.sinAltitudeFrom(H, v[leMoonDec], v[leMoonDist]/earthRadiusKm), H
	}
	contact := func(i int, t time.Time) Contact {
		if t.IsZero() {
			return Contact{}
		}
		v := e.atContact[i][:]
		s, H := sinAlt(v)
		az := st.azimuthFrom(H, v[leMoonDec], v[leMoonDist]/earthRadiusKm)
		return Contact{Time: t, Altitude: math.Asin(s) * rad2deg, Azimuth: az * rad2deg, Up: s > sinH0}
	}
	l := LocalLunarEclipse{Eclipse: e,
		P1: contact(0, e.P1), U1: contact(1, e.U1), U2: contact(2, e.U2), Greatest: contact(3, e.Greatest),
		U3: contact(4, e.U3), U4: contact(5, e.U4), P4: contact(6, e.P4)}
	var v [leCount]float64
	hourAngle := func(sec float64) float64 {
		e.s.evalN(sec, v[:], leLocal)
		return v[leGAST] + st.lon - v[leMoonRA]
	}
	above := func(sec float64) float64 {
		e.s.evalN(sec, v[:], leLocal)
		s, _ := sinAlt(v[:])
		return s - sinH0
	}
	ts, up := crossingsOf(above, hourAngle, siderealRate-moonMeanMotion/secondsPerDay, unixSeconds(e.P1), unixSeconds(e.P4))
	for i, t := range ts {
		g := e.at(t, v[:])
		dir := Setting
		if up[i] {
			dir = Rising
		}
		l.Horizon = append(l.Horizon, HorizonEvent{Time: secToTime(t), Direction: dir,
			Magnitude: (g.ru + g.sm - g.d) / (2 * g.sm)})
	}
	return l
}
