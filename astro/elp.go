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

// elpBlock is the number of instants evaluated together by elpUniform.
const elpBlock = 64

// elpUniform evaluates the generated tables (as elpMoon) at the instants
// jde[k] (TT), which must lie within a few seconds of the uniform grid
// g_k = jde[0] + k·h (h in days: a track's UTC samples are uniform in UTC and
// drift from a TT grid only by ΔT's slow change and leap seconds). It
// writes the longitude, latitude (radians) and distance (km) of each
// instant.
//
// Instead of one sine per term and instant, each term's argument is
// advanced along the grid by a rotation (angle addition) over blocks of 64
// instants, restarted exactly at every block; the argument's curvature over
// a block (16 days at h = 6 h) is below 1e-9 rad in the largest term. The
// offset ε_k = jde[k] − g_k is applied to first order with the term's
// rate. TestELPUniform checks the result against elpMoon (a few µas).
func elpUniform(jde []float64, h float64, lon, lat, dist []float64) {
	n := len(jde)
	series := [3]*[4][]elpTerm{&elpL, &elpB, &elpR}
	var val, rate [3][4][elpBlock]float64
	for k0 := 0; k0 < n; k0 += elpBlock {
		m := min(elpBlock, n-k0)
		val, rate = [3][4][elpBlock]float64{}, [3][4][elpBlock]float64{}
		g0 := jde[0] + float64(k0)*h
		ta := (g0 - J2000) / julianCentury
		tb := (g0 + h - J2000) / julianCentury
		for c, s := range series {
			for p := range s {
				v, r := &val[c][p], &rate[c][p]
				for i := range s[p] {
					t := &s[p][i]
					a0 := t.p0 + ta*(t.p1+ta*(t.p2+ta*(t.p3+ta*t.p4)))
					a1 := t.p0 + tb*(t.p1+tb*(t.p2+tb*(t.p3+tb*t.p4)))
					step := a1 - a0
					w := t.a * step / h // amplitude × rate, per day
					sn, cs := math.Sincos(a0)
					sd, cd := math.Sincos(step)
					for k := range m {
						v[k] += t.a * sn
						r[k] += w * cs
						sn, cs = sn*cd+cs*sd, cs*cd-sn*sd
					}
				}
			}
		}
		for k := range m {
			j := k0 + k
			eps := jde[j] - (jde[0] + float64(j)*h)
			t, _, _, _, base := elpTime(jde[j])
			var out [3]float64
			for c := range 3 {
				sum := 0.0
				for p := 3; p >= 0; p-- {
					sum = sum*t + val[c][p][k] + eps*rate[c][p][k]
				}
				out[c] = sum
			}
			lon[j] = base + out[0]*arcsec2rad
			lat[j] = out[1] * arcsec2rad
			dist[j] = out[2]
		}
	}
}
