package astro

import "math"

//go:generate go run gen_elp.go

// elpTerm is one term A·sin(φ0 + φ1·T + φ2·T² + φ3·T³ + φ4·T⁴) of the
// ELP/MPP02 series in reduced form (A in arcseconds or kilometres, φ in
// radians, T in Julian centuries of TT from J2000.0).
type elpTerm struct {
	a, p0, p1, p2, p3, p4 float64
}

// elpSum returns Σₚ Tᵖ · Σᵢ Aᵢ sin(φᵢ(T)) for one coordinate's series.
func elpSum(s *[4][]elpTerm, t, t2, t3, t4 float64) float64 {
	var sum [4]float64
	for p := range s {
		var acc float64
		for i := range s[p] {
			k := &s[p][i]
			acc += k.a * math.Sin(k.p0+k.p1*t+k.p2*t2+k.p3*t3+k.p4*t4)
		}
		sum[p] = acc
	}
	return sum[0] + t*(sum[1]+t*(sum[2]+t*sum[3]))
}

// elpEval evaluates ELP/MPP02 series (Chapront & Francou 2003, as described in
// testdata/reference/series/README of the shared references): geometric
// geocentric ecliptic longitude and latitude of the Moon referred to the mean
// ecliptic and equinox of date (radians; longitude not reduced to 0..2π) and
// the distance between the centres of the Earth and the Moon (km), for jde in
// TT. The longitude is W1 + ΣL plus the general precession in longitude pA
// from J2000 (with the DE405 fit's correction to its first coefficient, from
// the ELP/MPP02 documentation).
func elpEval(jde float64, l, b, r *[4][]elpTerm) (lon, lat, dist float64) {
	t, t2, t3, t4, base := elpTime(jde)
	lon = base + elpSum(l, t, t2, t3, t4)*arcsec2rad
	lat = elpSum(b, t, t2, t3, t4) * arcsec2rad
	dist = elpSum(r, t, t2, t3, t4)
	return lon, lat, dist
}

// elpTime returns the powers of T (Julian centuries of TT from J2000.0) at
// jde and the longitude's polynomial part W1 + pA, radians.
func elpTime(jde float64) (t, t2, t3, t4, base float64) {
	t = (jde - J2000) / julianCentury
	t2 = t * t
	t3 = t2 * t
	t4 = t3 * t
	w1 := elpW1[0] + t*(elpW1[1]+t*(elpW1[2]+t*(elpW1[3]+t*elpW1[4])))
	pA := (5029.0966-0.29965)*t + 1.1120*t2 + 0.000077*t3 - 0.00002353*t4
	return t, t2, t3, t4, w1 + pA*arcsec2rad
}

// elpMoon returns the Moon's geometric geocentric ecliptic longitude and
// latitude (radians, mean ecliptic and equinox of date, longitude not reduced)
// and distance (km) at jde (TT) from the generated, truncated ELP/MPP02 tables
// (zz_elp_moon.go). Measured truncation error against the complete published
// series over 1800–2200: see TestELPTruncation (≤ 0.08″ in longitude and
// latitude, ≤ 0.3 km in distance).
func elpMoon(jde float64) (lon, lat, dist float64) {
	return elpEval(jde, &elpL, &elpB, &elpR)
}

// elpLongitudeDistance returns only the longitude (radians, mean ecliptic and
// equinox of date, not reduced) and the distance (km) at jde (TT), skipping
// the latitude series; used where the latitude is not needed (phases).
func elpLongitudeDistance(jde float64) (lon, dist float64) {
	t, t2, t3, t4, base := elpTime(jde)
	return base + elpSum(&elpL, t, t2, t3, t4)*arcsec2rad, elpSum(&elpR, t, t2, t3, t4)
}
