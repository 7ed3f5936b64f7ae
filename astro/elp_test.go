package astro

import (
	"math"
	"sort"
	"strconv"
	"testing"
)

// loadCompleteELP reads the complete published series (4,862 terms) that
// gen_elp.go truncates.
func loadCompleteELP(tb testing.TB) (l, b, r [4][]elpTerm) {
	tb.Helper()
	const path = "series/elpmpp02-de405-truncated.csv"
	recs := readRecords(tb, path)
	var err error
	for i, rec := range recs[1:] {
		var v [6]float64
		for k := range 6 {
			v[k], err = strconv.ParseFloat(rec[3+k], 64)
			if err != nil {
				tb.Fatalf("%s:%d: %v", path, i+2, err)
			}
		}
		p, err := strconv.Atoi(rec[1])
		if err != nil {
			tb.Fatalf("%s:%d: %v", path, i+2, err)
		}
		t := elpTerm{v[0], v[1], v[2], v[3], v[4], v[5]}
		switch rec[0] {
		case "L":
			l[p] = append(l[p], t)
		case "B":
			b[p] = append(b[p], t)
		case "R":
			r[p] = append(r[p], t)
		default:
			tb.Fatalf("%s:%d: coordinate %q", path, i+2, rec[0])
		}
	}
	return l, b, r
}

// TestELPCheckValue: the check value of the series' documentation
// (shared reference series README, complete ELP/MPP02 DE405 series):
// JDE 2448724.5 (1992 April 12.0 TD) → λ = 133.162318°, β = −3.229202°,
// Δ = 368,405.5 km (mean ecliptic and equinox of date).
func TestELPCheckValue(t *testing.T) {
	const jde = 2448724.5
	l, b, r := loadCompleteELP(t)
	for _, tc := range []struct {
		name    string
		lon     func() (float64, float64, float64)
		tolDeg  float64
		tolDist float64
	}{
		{"complete series", func() (float64, float64, float64) { return elpEval(jde, &l, &b, &r) }, 0.6e-6, 0.06},
		{"generated tables", func() (float64, float64, float64) { return elpMoon(jde) }, 0.1 / 3600, 0.3},
	} {
		t.Run(tc.name, func(t *testing.T) {
			lon, lat, dist := tc.lon()
			lonDeg, latDeg := norm360(lon*180/math.Pi), lat*180/math.Pi
			if d := math.Abs(lonDeg - 133.162318); d > tc.tolDeg {
				t.Errorf("λ = %.7f°, want 133.162318° (off %.3f″)", lonDeg, d*3600)
			}
			if d := math.Abs(latDeg - -3.229202); d > tc.tolDeg {
				t.Errorf("β = %.7f°, want -3.229202° (off %.3f″)", latDeg, d*3600)
			}
			if d := math.Abs(dist - 368405.5); d > tc.tolDist {
				t.Errorf("Δ = %.2f km, want 368405.5 km", dist)
			}
		})
	}
}

// TestELPTruncation measures the generated tables against the complete
// published series at 4,000 instants spread over 1800–2200 and checks the
// bound stated in elpMoon's documentation. The Moon moves about 0.5″ per
// second of time, so 0.08″ is about 0.16 s on a phase instant.
func TestELPTruncation(t *testing.T) {
	l, b, r := loadCompleteELP(t)
	var dLon []float64
	var maxLat, maxDist float64
	const n = 4000
	for i := range n {
		jde := 2378496.5 + float64(i)*(146097.0/n) + 0.137*float64(i%11)
		l1, b1, r1 := elpEval(jde, &l, &b, &r)
		l2, b2, r2 := elpMoon(jde)
		dLon = append(dLon, math.Abs(l1-l2)/arcsec2rad)
		maxLat = math.Max(maxLat, math.Abs(b1-b2)/arcsec2rad)
		maxDist = math.Max(maxDist, math.Abs(r1-r2))
	}
	sort.Float64s(dLon)
	maxLon, p95 := dLon[n-1], dLon[n*95/100]
	t.Logf("truncation error 1800–2200: longitude max %.3f″ (p95 %.3f″), latitude max %.3f″, distance max %.3f km", maxLon, p95, maxLat, maxDist)
	if maxLon > 0.08 || maxLat > 0.08 || maxDist > 0.3 {
		t.Errorf("truncation error above the documented bound (0.08″, 0.08″, 0.3 km)")
	}
}

func BenchmarkELPMoon(b *testing.B) {
	b.ReportAllocs()
	jde := 2460000.5
	for b.Loop() {
		elpMoon(jde)
		jde += 0.37
	}
}

func BenchmarkELPComplete(b *testing.B) {
	l, bb, r := loadCompleteELP(b)
	b.ReportAllocs()
	jde := 2460000.5
	for b.Loop() {
		elpEval(jde, &l, &bb, &r)
		jde += 0.37
	}
}

// TestELPUniform: the block evaluation used to build the Moon's track
// equals direct evaluation at every 6-hour UTC sample of two years that
// include a leap second (2015-06-30) and a year of the extrapolated ΔT,
// to 1e-4″ and 1e-4 km (measured: a few microarcseconds, the rounding of
// the rotations).
func TestELPUniform(t *testing.T) {
	for _, start := range []float64{1420070400, 3786912000} { // 2015-01-01, 2090-01-01 UTC
		const n, step = 2 * 1461, 6 * 3600.0
		jde := make([]float64, n)
		for k := range jde {
			jde[k] = epochOf(start+float64(k)*step).JDE - moonMeanLightTime
		}
		lon, lat, dist := make([]float64, n), make([]float64, n), make([]float64, n)
		elpUniform(jde, step/secondsPerDay, lon, lat, dist)
		var maxA, maxD float64
		for k := range jde {
			l, b, r := elpMoon(jde[k])
			maxA = math.Max(maxA, math.Max(math.Abs(l-lon[k]), math.Abs(b-lat[k]))/arcsec2rad)
			maxD = math.Max(maxD, math.Abs(r-dist[k]))
		}
		t.Logf("block evaluation vs direct: %.2e″, %.2e km", maxA, maxD)
		if maxA > 1e-4 || maxD > 1e-4 {
			t.Errorf("block evaluation differs from direct by %.2e″ / %.2e km", maxA, maxD)
		}
	}
}

func BenchmarkELPUniform(b *testing.B) {
	const n = 1461
	jde := make([]float64, n)
	for k := range jde {
		jde[k] = 2461041.5 + float64(k)*0.25
	}
	lon, lat, dist := make([]float64, n), make([]float64, n), make([]float64, n)
	b.ReportAllocs()
	for b.Loop() {
		elpUniform(jde, 0.25, lon, lat, dist)
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/n, "ns/instant")
}
