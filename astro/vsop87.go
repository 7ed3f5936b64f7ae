package astro

//go:generate go run gen_vsop87.go

import "math"

// VSOP87D for the Earth: heliocentric ecliptic coordinates referred to the
// mean ecliptic and equinox of date (P. Bretagnon & G. Francou, Astron.
// Astrophys. 202, 309, 1988), evaluated as in Meeus, Astronomical Algorithms
// 2nd ed., ch. 32. The tables (zz_vsop87_earth.go) are generated from the
// complete series by gen_vsop87.go, which documents the truncation.
//
// VSOP87's Earth is the Earth's centre (not the Earth–Moon barycentre). Its
// lunar terms (earthLunarL, B, R: the Earth about the barycentre) are also
// listed apart, for the apsides (apsides.go).

type vsopTerm struct{ a, b, c float64 }

// evalVSOP sums Σₚ τᵖ Σᵢ Aᵢ cos(Bᵢ + Cᵢ τ).
func evalVSOP(series [][]vsopTerm, tau float64) float64 {
	var sum float64
	tp := 1.0
	for _, terms := range series {
		var s float64
		for i := range terms {
			t := &terms[i]
			s += t.a * math.Cos(t.b+t.c*tau)
		}
		sum += s * tp
		tp *= tau
	}
	return sum
}

// earthHeliocentric returns the Earth's heliocentric longitude L and
// latitude B (radians, mean ecliptic and equinox of date) and radius vector R
// (au) for the Julian Ephemeris Day jde.
func earthHeliocentric(jde float64) (L, B, R float64) {
	tau := (jde - J2000) / julianMillennium
	return norm2Pi(evalVSOP(earthL[:], tau)), evalVSOP(earthB[:], tau), evalVSOP(earthR[:], tau)
}
