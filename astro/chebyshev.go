package astro

import (
	"math"
	"slices"
	"sync"
)

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

// newEarthSeries fits the blocks covering [jde0, jde1]. The slow part at
// the nodes comes from slowNodes.
func newEarthSeries(jde0, jde1 float64) *earthSeries {
	n := int(math.Floor((jde1-jde0)/sunChebDays)) + 1
	s := &earthSeries{start: jde0, blocks: make([]chebBlock, n)}
	vals := slowNodes(jde0, n)
	var f [3][sunChebNodes]float64
	chebCos := chebCosines()
	for i := range s.blocks {
		blk := &s.blocks[i]
		blk.a = jde0 + float64(i)*sunChebDays
		blk.b = blk.a + sunChebDays
		for j := range sunChebNodes {
			L, B, R := vals[0][i*sunChebNodes+j], vals[1][i*sunChebNodes+j], vals[2][i*sunChebNodes+j]
			if j > 0 {
				L = f[0][j-1] + math.Remainder(L-f[0][j-1], 2*math.Pi)
			}
			f[0][j], f[1][j], f[2][j] = L, B, R
		}
		for v := range 3 {
			for k := range sunChebNodes {
				var sum float64
				for j := range sunChebNodes {
					sum += f[v][j] * chebCos[k][j]
				}
				blk.c[v][k] = 2 * sum / sunChebNodes
			}
		}
	}
	return s
}

// chebCosines returns the table chebCos[k][j] = cos(πk(j + ½)/sunChebNodes),
// the Chebyshev polynomial Tₖ at node j, made on first use: only a span
// outside the shipped Sun table fits blocks, and the 400 cosines were a
// third of the package's initialisation at every start.
var chebCosines = sync.OnceValue(func() *[sunChebNodes][sunChebNodes]float64 {
	c := new([sunChebNodes][sunChebNodes]float64)
	for k := range sunChebNodes {
		for j := range sunChebNodes {
			c[k][j] = math.Cos(math.Pi * float64(k) * (float64(j) + 0.5) / sunChebNodes)
		}
	}
	return c
})

// slowNodes returns the slow terms' L (not reduced), B and R at the nodes
// of n consecutive blocks from jde0 (value [v][i·sunChebNodes + j]: node
// j, at mid + half·T₁(node j) = mid + half·chebCosines()[1][j], of block i).
// Node j of successive blocks lies sunChebDays apart, so each term's cosine
// is carried from one block to the next by a rotation (as daily does for
// the fast terms), computed afresh every slowRestart blocks: the values
// agree with the series summed (evalVSOP of the slow terms) to about 1e-15 of
// each term's amplitude.
func slowNodes(jde0 float64, n int) (vals [3][]float64) {
	xs := &chebCosines()[1]
	m := n * sunChebNodes
	tau := make([]float64, m)
	for i := range n {
		mid := jde0 + (float64(i)+0.5)*sunChebDays
		for j := range sunChebNodes {
			tau[i*sunChebNodes+j] = (mid + 0.5*sunChebDays*xs[j] - J2000) / julianMillennium
		}
	}
	// L, B and R are summed on their own goroutines (each in the same
	// order as alone): their sums are independent, and this is most of
	// the fit's cost, which the daily samples wait for. The slow series
	// have 595 terms (L), 154 (B) and 670 (R): R on a goroutine of its
	// own, L then B on the calling one, which shares two cores about
	// evenly. (Sharing the nodes out instead, each goroutine summing its
	// half of every block, took 30 % more instructions, for a wall time no
	// shorter.)
	splitTerms()
	for v := range 3 {
		vals[v] = make([]float64, m)
	}
	var wg sync.WaitGroup
	wg.Go(func() { slowSum(vals[2], slowTerms[2], tau, n) })
	slowSum(vals[0], slowTerms[0], tau, n)
	slowSum(vals[1], slowTerms[1], tau, n)
	wg.Wait()
	return vals
}

// slowSum adds to vals the terms of series (by power of τ) at the nodes
// tau of n blocks, as slowNodes describes.
func slowSum(vals []float64, series [][]vsopTerm, tau []float64, n int) {
	const slowRestart = 32
	const h = sunChebDays / julianMillennium // a block in millennia
	m := len(vals)
	part := make([]float64, m)
	tp := make([]float64, m) // τᵖ
	for k := range m {
		tp[k] = 1
	}
	for _, terms := range series {
		clear(part)
		for _, t := range terms {
			sr, cr := math.Sincos(t.c * h)
			var C, S [sunChebNodes]float64 // node j's rotation: independent of the others'
			for i := range n {
				ps := part[i*sunChebNodes : (i+1)*sunChebNodes]
				ts := tau[i*sunChebNodes : (i+1)*sunChebNodes]
				if i%slowRestart == 0 {
					for j := range sunChebNodes {
						S[j], C[j] = math.Sincos(t.b + t.c*ts[j])
						ps[j] += t.a * C[j]
					}
				} else {
					for j := range sunChebNodes {
						c := C[j]*cr - S[j]*sr
						C[j], S[j] = c, S[j]*cr+C[j]*sr
						ps[j] += t.a * c
					}
				}
			}
		}
		for k := range m {
			vals[k] += part[k] * tp[k]
			tp[k] *= tau[k]
		}
	}
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
// block) is corrected to first order; the error is below 1e-15 rad. The
// results and the working memory are buf's, overwritten by the next call.
func (s *earthSeries) daily(jdes []float64, buf *sampleBuffers) (L, B, R []float64) {
	n := len(jdes)
	out := [3][]float64{floats(&buf.L, n), floats(&buf.B, n), floats(&buf.R, n)}
	const h = 1 / julianMillennium // a day in millennia
	tau := floats(&buf.tau, n)
	for k, j := range jdes {
		tau[k] = (j - J2000) / julianMillennium
		out[0][k], out[1][k], out[2][k] = s.slowAt(j)
	}
	// off[k] is sample k's offset from the one-day grid of its run (days
	// in millennia), each term's rotation being restarted at every
	// sunChebDays-th sample.
	off := floats(&buf.off, n)
	var t0 float64
	for k := range n {
		if k%sunChebDays == 0 {
			t0 = tau[k] - float64(k)*h
		}
		off[k] = tau[k] - t0 - float64(k)*h
	}
	// per run of sunChebDays samples and power of τ, every term's cosine
	// and sine rotated together from sample to sample: the terms' rotations
	// are independent of one another
	tp := floats(&buf.tp, n) // τᵖ
	for v := range 3 {
		for k := range n {
			tp[k] = 1
		}
		for _, terms := range fastTerms[v] {
			m := len(terms)
			C, S, cr, sr := floats(&buf.c, m), floats(&buf.s, m), floats(&buf.cr, m), floats(&buf.sr, m)
			// of the terms' length, so that the compiler drops the index
			// checks from the loops below
			C, S, cr, sr = C[:m], S[:m], cr[:m], sr[:m]
			for i, t := range terms {
				sr[i], cr[i] = math.Sincos(t.c * h)
			}
			for k := range n {
				var sum float64
				if k%sunChebDays == 0 {
					for i, t := range terms {
						S[i], C[i] = math.Sincos(t.b + t.c*tau[k])
						sum += t.a * C[i]
					}
				} else {
					d := off[k]
					for i, t := range terms {
						c, s := C[i]*cr[i]-S[i]*sr[i], S[i]*cr[i]+C[i]*sr[i]
						C[i], S[i] = c, s
						sum += t.a * (c - s*t.c*d)
					}
				}
				out[v][k] += sum * tp[k]
			}
			for k := range n {
				tp[k] *= tau[k]
			}
		}
	}
	for k, L := range out[0] {
		out[0][k] = L - 2*math.Pi*math.Floor(L/(2*math.Pi)) // within an ulp of norm2Pi's
	}
	return out[0], out[1], out[2]
}

// fastPeriod splits the series: terms of shorter period (days) are summed
// at every sample, the others are fitted.
const fastPeriod = 60

// sampleBuffers is the working memory of daily and nutationDaily and
// their results, kept by a caller taking the Sun's samples block after
// block.
type sampleBuffers struct {
	L, B, R, tau, off, tp, c, s, cr, sr []float64 // daily
	dpsi, deps, t                       []float64 // nutationDaily
}

// floats returns *b with length n, growing it if needed; its values are
// left as they were.
func floats(b *[]float64, n int) []float64 {
	*b = slices.Grow((*b)[:0], n)[:n]
	return *b
}

// slowTerms and fastTerms are the VSOP87D series of L, B and R split at
// fastPeriod: the fast ones are the Moon's pull on the Earth and its
// harmonics (about 150 of the 1,567 terms). They are split at first use,
// not when the program starts: by slowNodes, which newEarthSeries calls
// before any method of the series it makes can use them.
var slowTerms, fastTerms [3][][]vsopTerm

var splitTerms = sync.OnceFunc(func() { slowTerms, fastTerms = splitVSOP() })

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

// clenshaw evaluates Σₖ cₖ Tₖ(x) − c₀/2 (Clenshaw's recurrence).
func clenshaw(c *[sunChebNodes]float64, x float64) float64 {
	var b1, b2 float64
	x2 := 2 * x
	for k := sunChebNodes - 1; k >= 1; k-- {
		b1, b2 = x2*b1-b2+c[k], b1
	}
	return x*b1 - b2 + 0.5*c[0]
}
