package astro

import "math"

// The Sun's shared ephemeris needs the Earth's heliocentric position once a
// day. The full VSOP87D series costs about 15 µs a call (1,567 cosines), so
// the daily samples split it: the 148 terms with periods under fastPeriod
// days (the Moon's pull on the Earth and its harmonics, 7″ in all) are
// summed at every sample, and the rest, smooth over months, is read from
// Chebyshev polynomials fitted over blocks of sunChebDays days, each from
// sunChebNodes evaluations at the Chebyshev nodes of its block (Press et
// al., Numerical Recipes 3rd ed., §5.8; the scheme of the JPL ephemerides'
// files): 20 evaluations of the slow part per 256 days. The apparent
// position from the fit stays within 0.00002″ of the one from the series
// and the distance within 1e-10 au over 1800–2200 (TestSunChebyshev, bound
// 0.001″).

const (
	sunChebDays  = 256 // days per block
	sunChebNodes = 20  // nodes per block: polynomials of degree 19
)

// chebBlock is one block's fit of L (unwrapped), B and R.
type chebBlock struct {
	a, b float64 // JDE span of the block
	c    [3][sunChebNodes]float64
}

// earthSeries is the Earth's heliocentric L, B, R over a span of JDE as
// consecutive Chebyshev blocks.
type earthSeries struct {
	start  float64 // JDE of the first block's start
	blocks []chebBlock
}

// newEarthSeries fits the blocks covering [jde0, jde1].
func newEarthSeries(jde0, jde1 float64) *earthSeries {
	n := int(math.Floor((jde1-jde0)/sunChebDays)) + 1
	s := &earthSeries{start: jde0, blocks: make([]chebBlock, n)}
	var f [3][sunChebNodes]float64
	for i := range s.blocks {
		blk := &s.blocks[i]
		blk.a = jde0 + float64(i)*sunChebDays
		blk.b = blk.a + sunChebDays
		mid, half := 0.5*(blk.a+blk.b), 0.5*(blk.b-blk.a)
		for j := range sunChebNodes {
			x := math.Cos(math.Pi * (float64(j) + 0.5) / sunChebNodes)
			L, B, R := earthSlow(mid + half*x)
			if j > 0 {
				L = f[0][j-1] + math.Remainder(L-f[0][j-1], 2*math.Pi)
			}
			f[0][j], f[1][j], f[2][j] = L, B, R
		}
		for v := range 3 {
			for k := range sunChebNodes {
				var sum float64
				for j := range sunChebNodes {
					sum += f[v][j] * math.Cos(math.Pi*float64(k)*(float64(j)+0.5)/sunChebNodes)
				}
				blk.c[v][k] = 2 * sum / sunChebNodes
			}
		}
	}
	return s
}

// slowAt returns the slow part of L (not reduced), B and R at jde, which
// must lie within the fitted span (the last block's end is included).
func (s *earthSeries) slowAt(jde float64) (L, B, R float64) {
	i := int((jde - s.start) / sunChebDays)
	i = min(max(i, 0), len(s.blocks)-1)
	blk := &s.blocks[i]
	x := (2*jde - blk.a - blk.b) / (blk.b - blk.a)
	return clenshaw(&blk.c[0], x), clenshaw(&blk.c[1], x), clenshaw(&blk.c[2], x)
}

// at returns L (radians, [0, 2π)), B (radians) and R (au) at jde, within
// the fitted span.
func (s *earthSeries) at(jde float64) (L, B, R float64) {
	L, B, R = s.slowAt(jde)
	tau := (jde - J2000) / julianMillennium
	L += evalVSOP(fastTerms[0], tau)
	B += evalVSOP(fastTerms[1], tau)
	R += evalVSOP(fastTerms[2], tau)
	return norm2Pi(L), B, R
}

// daily returns L (radians, [0, 2π)), B and R at each of jdes, instants
// about a day apart in increasing order within the fitted span: at as for
// a single instant, with each fast term's cosine carried from one sample to
// the next by a rotation (two multiplications instead of a cosine), started
// afresh every sunChebDays samples. A sample's offset from the exact
// one-day grid (TT − UTC changes: ΔT, leap seconds; under a second over a
// block) is corrected to first order; the error is below 1e-15 rad.
func (s *earthSeries) daily(jdes []float64) (L, B, R []float64) {
	n := len(jdes)
	out := [3][]float64{make([]float64, n), make([]float64, n), make([]float64, n)}
	const h = 1 / julianMillennium // a day in millennia
	tau := make([]float64, n)
	for k, j := range jdes {
		tau[k] = (j - J2000) / julianMillennium
		out[0][k], out[1][k], out[2][k] = s.slowAt(j)
	}
	part := make([]float64, n)
	for v := range 3 {
		for p, terms := range fastTerms[v] {
			clear(part)
			for _, t := range terms {
				sr, cr := math.Sincos(t.c * h)
				var C, S, t0 float64
				for k := range n {
					if k%sunChebDays == 0 {
						t0 = tau[k] - float64(k)*h
						S, C = math.Sincos(t.b + t.c*tau[k])
					} else {
						C, S = C*cr-S*sr, S*cr+C*sr
					}
					d := t.c * (tau[k] - t0 - float64(k)*h) // offset from the grid, rad
					part[k] += t.a * (C - S*d)
				}
			}
			for k := range n {
				out[v][k] += part[k] * math.Pow(tau[k], float64(p))
			}
		}
	}
	for k := range out[0] {
		out[0][k] = norm2Pi(out[0][k])
	}
	return out[0], out[1], out[2]
}

// fastPeriod splits the series: terms of shorter period (days) are summed
// at every sample, the others are fitted.
const fastPeriod = 60

// slowTerms and fastTerms are the VSOP87D series of L, B and R split at
// fastPeriod: the fast ones are the Moon's pull on the Earth and its
// harmonics (about 150 of the 1,567 terms).
var slowTerms, fastTerms = splitVSOP()

func splitVSOP() (slow, fast [3][][]vsopTerm) {
	cut := 2 * math.Pi * julianMillennium / fastPeriod // rad per millennium
	for v, series := range [3][][]vsopTerm{earthL[:], earthB[:], earthR[:]} {
		slow[v], fast[v] = make([][]vsopTerm, len(series)), make([][]vsopTerm, len(series))
		for p, terms := range series {
			for _, t := range terms {
				if math.Abs(t.c) > cut {
					fast[v][p] = append(fast[v][p], t)
				} else {
					slow[v][p] = append(slow[v][p], t)
				}
			}
		}
	}
	return slow, fast
}

// earthSlow is earthHeliocentric without the fast terms (L not reduced).
func earthSlow(jde float64) (L, B, R float64) {
	tau := (jde - J2000) / julianMillennium
	return evalVSOP(slowTerms[0], tau), evalVSOP(slowTerms[1], tau), evalVSOP(slowTerms[2], tau)
}

// clenshaw evaluates Σₖ cₖ Tₖ(x) − c₀/2 (Clenshaw's recurrence).
func clenshaw(c *[sunChebNodes]float64, x float64) float64 {
	var b1, b2 float64
	x2 := 2 * x
	for k := sunChebNodes - 1; k >= 1; k-- {
		b1, b2 = x2*b1-b2+c[k], b1
	}
	return x*b1 - b2 + 0.5*c[0]
}
