package astro

import (
	"bytes"
	"encoding/binary"
	"flag"
	"fmt"
	"math"
	"os"
	"strings"
	"testing"
	"time"
)

var updateSunTable = flag.Bool("update", false, "rewrite astro/suntable.bin from the computation")

// The table's days: the samples NewEphemeris takes for any span within
// 1990-01-01 00:00 .. 2101-01-01 00:00 UTC (4 days before the span's first
// date, 4 after its end).
var (
	sunTableFirstDay = time.Date(1989, 12, 28, 0, 0, 0, 0, time.UTC)
	sunTableLastDay  = time.Date(2101, 1, 5, 0, 0, 0, 0, time.UTC)
)

// buildSunTable computes the table: the days from first to last inclusive
// (0h UTC) in one run of sunSamples, as NewEphemeris computes a span.
func buildSunTable(first, last time.Time) []byte {
	n := int(last.Sub(first)/(24*time.Hour)) + 1
	b := make([]byte, sunTableHeader+n*sunTableRecord)
	le := binary.LittleEndian
	copy(b, sunTableMark)
	le.PutUint32(b[8:], 1)
	le.PutUint32(b[12:], sunChebDays)
	le.PutUint64(b[16:], uint64(first.Unix()/86400))
	le.PutUint32(b[24:], uint32(n))
	le.PutUint32(b[28:], sunTableRecord)
	days := b[sunTableHeader:]
	sunSamples(unixSeconds(first), 0, n, func(b0 int, gha, dec, dist []float64) {
		for i := range gha {
			r := days[(b0+i)*sunTableRecord:]
			le.PutUint64(r, math.Float64bits(gha[i]))
			le.PutUint64(r[8:], math.Float64bits(dec[i]))
			le.PutUint64(r[16:], math.Float64bits(dist[i]))
		}
	})
	return b
}

// ulps returns how many representable float64 values lie between a and b
// (both finite, of one sign).
func ulps(a, b float64) uint64 {
	x, y := math.Float64bits(a), math.Float64bits(b)
	if x > y {
		return x - y
	}
	return y - x
}

// TestSunTable computes every day of the shipped table again (sunSamples,
// the same run from the same first day: 40,551 days, a few hundredths
// of a second) and requires each stored value within 4 ulps of the computed
// one where the compiler does not fuse multiply-adds (sunTableExact: amd64
// below GOAMD64=v3, where the table is written and they are equal). Where
// it does, the last bits differ by more than ulps can bound (measured with
// GOAMD64=v3: 8.7e-11 rad of hour angle, 6 ulps; 4.5e-14 rad of
// declination, 1.7e6 ulps near the equinoxes; 1.4e-15 of the distance), and
// each value is held to sunTableFused instead. A change of the ΔT model,
// the nutation or VSOP87D shows at once: 1 ms more ΔT in one month of the
// observed table (1972–2023, where TT follows from UTC and ΔT sets UT1)
// turns the hour angle of the 61 days interpolated from it by up to 7e-8
// rad, 1.6e8 ulps; outside the observed years ΔT sets TT too, and 1 ms
// moves the Sun by 2e-10 rad, far over the declination's 4 ulps (2e-16
// rad) and its 1e-12 rad with fused multiply-adds. Run with -update to
// write the table again from the computation (refused where sunTableExact
// does not hold: the table would store other last bits).
func TestSunTable(t *testing.T) {
	want := buildSunTable(sunTableFirstDay, sunTableLastDay)
	if *updateSunTable {
		if !sunTableExact {
			t.Fatal("-update: this build fuses multiply-adds and would store other last bits; write the table on amd64 with GOAMD64 v1 or v2")
		}
		if err := os.WriteFile("suntable.bin", want, 0o644); err != nil {
			t.Fatal(err)
		}
		t.Logf("wrote suntable.bin: %d bytes", len(want))
		return
	}
	got := sunTableData
	if !bytes.Equal(got[:sunTableHeader], want[:sunTableHeader]) || len(got) != len(want) {
		t.Fatalf("table header or size differs from the computation's (%d bytes, want %d): run go test ./astro -run TestSunTable -update", len(got), len(want))
	}
	tab, ok := parseSunTable(got)
	if !ok {
		t.Fatal("parseSunTable rejects the table")
	}
	wt, _ := parseSunTable(want)
	var worst [3]uint64
	bad := 0
	for i := range tab.n {
		g0, g1, g2 := tab.day(i)
		w0, w1, w2 := wt.day(i)
		for v, p := range [3][2]float64{{g0, w0}, {g1, w1}, {g2, w2}} {
			u := ulps(p[0], p[1])
			worst[v] = max(worst[v], u)
			if !sunTableClose(v, p[0], p[1]) {
				if bad++; bad <= 5 {
					day := sunTableFirstDay.AddDate(0, 0, i).Format(time.DateOnly)
					t.Errorf("%s: value %d is %.17g in the table, %.17g computed (%d ulps): run go test ./astro -run TestSunTable -update", day, v, p[0], p[1], u)
				}
			}
		}
	}
	t.Logf("%d days, largest difference from the computation: %d, %d, %d ulps (hour angle, declination, distance)", tab.n, worst[0], worst[1], worst[2])
	if bad > 5 {
		t.Errorf("… %d values differ in all", bad)
	}
}

// sunTableFused bounds the difference of a stored value from the computed
// one where multiply-adds are fused: the hour angle and declination in
// rad, the distance relative to itself.
var sunTableFused = [3]float64{1e-9, 1e-12, 1e-13}

// sunTableClose reports whether value v of a day (0 hour angle, 1
// declination, 2 distance) as stored, a, agrees with the computed one, b:
// within 4 ulps where sunTableExact holds, else within sunTableFused[v].
func sunTableClose(v int, a, b float64) bool {
	if sunTableExact {
		return ulps(a, b) <= 4
	}
	d := math.Abs(a - b)
	if v == 2 {
		d /= math.Abs(b)
	}
	return d <= sunTableFused[v]
}

// TestSunTableRange checks that the table holds the days that spans from
// 1990-01-01 to 2101-01-01 need (the range README.md and NewEphemeris
// promise), and that a span reads from it exactly the days it holds.
func TestSunTableRange(t *testing.T) {
	tab := loadSunTable()
	if tab.n == 0 {
		t.Fatal("no table loaded")
	}
	cases := []struct {
		from, to      string
		before, after int  // samples computed before and after the table's
		none          bool // no sample from the table
	}{
		{"1990-01-01T00:00:00Z", "2101-01-01T00:00:00Z", 0, 0, false},
		{"2020-01-01T00:00:00Z", "2039-12-31T00:00:00Z", 0, 0, false},
		{"1989-12-31T23:59:59Z", "1990-03-01T00:00:00Z", 1, 0, false},
		{"2100-12-01T00:00:00Z", "2101-01-01T00:00:01Z", 0, 1, false},
		{"1989-06-01T00:00:00Z", "2101-06-01T00:00:00Z", 214, 151, false},
		{"2150-01-01T00:00:00Z", "2151-01-01T00:00:00Z", 0, 0, true},
		{"1800-01-01T00:00:00Z", "1989-12-01T00:00:00Z", 0, 0, true},
	}
	for _, c := range cases {
		from, to := utc(c.from), utc(c.to)
		tr := allocSunTrack(from, to)
		n := len(tr.g)
		k0, k1 := readSunTable(tr)
		wantK0, wantK1 := c.before, n-c.after
		if c.none {
			wantK0, wantK1 = n, n
		}
		if k0 != wantK0 || k1 != wantK1 {
			t.Errorf("%s..%s: samples %d..%d of %d from the table, want %d..%d", c.from, c.to, k0, k1, n, wantK0, wantK1)
		}
	}
}

// TestSunTableEvents compares an ephemeris reading the table with one
// computing every day (newEphemeris without the table), over a span inside
// the table, spans across either of its ends (the days outside computed)
// and one outside it. The table's days are computed in one run from its
// first day, the other ephemeris's from its span's start: their Chebyshev
// blocks of VSOP87D's slow terms lie on other grids, and each fit is within
// 0.00002″ (1e-10 rad) of the series (TestSunChebyshev), so the samples may
// differ by twice that: within 2e-10 rad in hour angle and declination and
// 2e-10 relative in distance (measured over 1,750 spans of 300 days starting
// every 23 days from 1990 to 2100: 1.2e-10 rad, 5.1e-11 rad, 9.6e-11). The
// rise, set, twilight and golden-hour crossings and the solar noons of a
// mid-latitude, a southern and a polar site agree within 1 ms, the output's
// resolution, the same number of them.
func TestSunTableEvents(t *testing.T) {
	sites := []Observer{{Latitude: 47.3, Longitude: 8.5, Elevation: 400}, {Latitude: -33.9, Longitude: 151.2}, {Latitude: 78.2, Longitude: 15.6}}
	alts := []float64{SunriseAltitude, CivilTwilight, NauticalTwilight, AstronomicalTwilight, GoldenHourHigh}
	spans := [][2]string{
		{"2031-03-01T00:00:00Z", "2032-03-01T00:00:00Z"},
		{"1989-09-01T00:00:00Z", "1990-06-01T00:00:00Z"},
		{"2100-08-01T00:00:00Z", "2101-05-01T00:00:00Z"},
		{"2150-01-01T00:00:00Z", "2150-07-01T00:00:00Z"},
	}
	var maxH, maxD, maxR float64
	var maxDt time.Duration
	for _, sp := range spans {
		from, to := utc(sp[0]), utc(sp[1])
		et, err := newEphemeris(from, to, true)
		if err != nil {
			t.Fatal(err)
		}
		ec, err := newEphemeris(from, to, false)
		if err != nil {
			t.Fatal(err)
		}
		for k := range et.sun.g {
			maxH = max(maxH, math.Abs(et.sun.g[k]-ec.sun.g[k]))
			maxD = max(maxD, math.Abs(et.sun.dec[k]-ec.sun.dec[k]))
			maxR = max(maxR, math.Abs(et.sun.dist[k]/ec.sun.dist[k]-1))
		}
		for _, o := range sites {
			got, err := et.SunCrossingsMany(o, alts, from, to)
			if err != nil {
				t.Fatal(err)
			}
			want, err := ec.SunCrossingsMany(o, alts, from, to)
			if err != nil {
				t.Fatal(err)
			}
			for i := range alts {
				if len(got[i]) != len(want[i]) {
					t.Errorf("%s..%s, %+v, %g°: %d crossings from the table, %d computed", sp[0], sp[1], o, alts[i], len(got[i]), len(want[i]))
					continue
				}
				for k, c := range got[i] {
					dt := (c.Time.Sub(want[i][k].Time)).Abs()
					maxDt = max(maxDt, dt)
					if dt > time.Millisecond || c.Direction != want[i][k].Direction {
						t.Errorf("%s..%s, %+v, %g°: crossing %v, computed %v", sp[0], sp[1], o, alts[i], c, want[i][k])
					}
				}
			}
			gt, err := et.SunTransits(o, from, to)
			if err != nil {
				t.Fatal(err)
			}
			wt, err := ec.SunTransits(o, from, to)
			if err != nil || len(gt) != len(wt) {
				t.Fatalf("%s..%s: %d transits from the table, %d computed (%v)", sp[0], sp[1], len(gt), len(wt), err)
			}
			for k := range gt {
				dt := gt[k].Time.Sub(wt[k].Time).Abs()
				maxDt = max(maxDt, dt)
				if dt > time.Millisecond {
					t.Errorf("%s..%s: transit %v, computed %v", sp[0], sp[1], gt[k].Time, wt[k].Time)
				}
			}
		}
	}
	t.Logf("table vs computed from the span's start: hour angle %.1e rad, declination %.1e rad, distance %.1e (relative); events %v", maxH, maxD, maxR, maxDt)
	if maxH > 2e-10 || maxD > 2e-10 || maxR > 2e-10 {
		t.Errorf("samples differ: hour angle %.1e rad, declination %.1e rad, distance %.1e (want ≤ 2e-10, 2e-10, 2e-10)", maxH, maxD, maxR)
	}
}

// TestSunTableDocs checks what README.md, DEVELOPERS.md and
// docs/accuracy.md say of the table against the table itself: its size,
// its number of days, the dates it holds and the span of dates it serves
// (TestSunTableRange), and the command that writes it again.
func TestSunTableDocs(t *testing.T) {
	tab := loadSunTable()
	days := fmt.Sprintf("%d,%03d days", tab.n/1000, tab.n%1000)
	first, last := sunTableFirstDay.Format(time.DateOnly), sunTableLastDay.Format(time.DateOnly)
	const regen = "`go test ./astro -run TestSunTable -update`"
	for file, claims := range map[string][]string{
		"../README.md": {
			fmt.Sprintf("(%.2f MB)", float64(len(sunTableData))/1e6),
			days,
			"within 1990-01-01 .. 2100-12-31",
		},
		"../DEVELOPERS.md":    {first + ".." + last, regen},
		"../docs/accuracy.md": {"days " + first + " to " + last, fmt.Sprintf("%s × %d bytes", days, sunTableRecord), regen},
	} {
		b, err := os.ReadFile(file)
		if err != nil {
			t.Fatal(err)
		}
		text := strings.Join(strings.Fields(string(b)), " ")
		for _, c := range claims {
			if !strings.Contains(text, c) {
				t.Errorf("%s does not say %q", file, c)
			}
		}
	}
}
