package astro

import (
	"math"
	"strings"
	"testing"
	"time"
)

func utc(s string) time.Time {
	t, err := time.Parse(time.RFC3339, s)
	if err != nil {
		panic(err)
	}
	return t
}

// TestSolarEclipsesCanon checks the global search against the NASA Five
// Millennium Canon of Solar Eclipses (F. Espenak & J. Meeus, NASA/TP-2006-
// 214141). The values are from memory of the canon's catalogue: greatest
// eclipse in TD converted to UT with ΔT = 69 s, γ to 4 decimals, the type.
// Tolerance 30 s on the instant (memory of the TD time and the ΔT used),
// 0.0005 on γ.
func TestSolarEclipsesCanon(t *testing.T) {
	es, err := SolarEclipses(utc("2026-01-01T00:00:00Z"), utc("2030-01-01T00:00:00Z"))
	if err != nil {
		t.Fatal(err)
	}
	// Canon (from memory): 2026 has two solar eclipses, 2027 two, 2028 two,
	// 2029 four partial ones.
	if len(es) != 10 {
		t.Fatalf("%d solar eclipses in 2026–2029, the canon lists 10", len(es))
	}
	want := []struct {
		greatest string // UT
		gamma    float64
		typ      EclipseType
	}{
		{"2026-02-17T12:11:57Z", -0.9743, Annular}, // canon: 12:13:06 TD
		{"2026-08-12T17:45:57Z", 0.8977, Total},    // canon: 17:47:06 TD
		{"2027-08-02T10:06:41Z", 0.1421, Total},    // canon: 10:07:50 TD
	}
	// and the total eclipse of 2024-04-08: γ 0.3431 (canon, from memory;
	// the instant is not checked: not remembered surely enough)
	past, err := SolarEclipses(utc("2024-04-01T00:00:00Z"), utc("2024-04-30T00:00:00Z"))
	if err != nil || len(past) != 1 {
		t.Fatalf("April 2024: %v %v", past, err)
	}
	if e := past[0]; math.Abs(e.Gamma-0.3431) > 0.0005 || e.Type != Total {
		t.Errorf("2024-04-08: γ %.4f, %s; canon 0.3431, total", e.Gamma, e.Type)
	}
	for _, w := range want {
		var e *SolarEclipse
		for _, x := range es {
			if math.Abs(x.Greatest.Sub(utc(w.greatest)).Hours()) < 1 {
				e = x
			}
		}
		if e == nil {
			t.Errorf("%s: not found", w.greatest)
			continue
		}
		if d := e.Greatest.Sub(utc(w.greatest)).Seconds(); math.Abs(d) > 30 {
			t.Errorf("%s: greatest eclipse %s, %.0f s off", w.greatest, e.Greatest, d)
		}
		if math.Abs(e.Gamma-w.gamma) > 0.0005 {
			t.Errorf("%s: gamma %.4f, canon %.4f", w.greatest, e.Gamma, w.gamma)
		}
		if e.Type != w.typ {
			t.Errorf("%s: type %s, canon %s", w.greatest, e.Type, w.typ)
		}
	}
	for _, e := range es {
		if e.Greatest.Year() == 2029 && e.Type != Partial {
			t.Errorf("%s: %s; the 2029 solar eclipses are all partial (canon, from memory)", e.Greatest, e.Type)
		}
	}
}

// TestSolarEclipseCentralLine checks the local circumstances on the central
// line of the total eclipse of 2027 August 2 at the point of greatest
// duration given by the canon (from memory: 25°30.6′ N, 33°11.8′ E, in Egypt
// near Luxor, totality 6 min 23 s). Tolerance 5 s on the duration (memory of
// the point to 0.1′, and the limb: the canon's duration also uses a mean
// limb). The Sun is high (canon: 82°), the magnitude above 1.
func TestSolarEclipseCentralLine(t *testing.T) {
	es, err := SolarEclipses(utc("2027-08-01T00:00:00Z"), utc("2027-08-03T00:00:00Z"))
	if err != nil || len(es) != 1 {
		t.Fatalf("%v %v", es, err)
	}
	l, ok := es[0].Local(Observer{Latitude: 25 + 30.6/60, Longitude: 33 + 11.8/60})
	if !ok || l.Type != Total {
		t.Fatalf("ok %v, type %s", ok, l.Type)
	}
	d := l.C3.Time.Sub(l.C2.Time)
	if math.Abs(d.Seconds()-383) > 5 {
		t.Errorf("totality %s, canon 6m23s", d)
	}
	if l.Max.Altitude < 80 || l.Max.Altitude > 84 {
		t.Errorf("Sun's altitude at maximum %.1f°, canon 82°", l.Max.Altitude)
	}
	if l.Magnitude < 1.06 || l.Magnitude > 1.09 || l.Obscuration != 1 {
		t.Errorf("magnitude %.4f, obscuration %.4f", l.Magnitude, l.Obscuration)
	}
	if !(l.C1.Time.Before(l.C2.Time) && l.C2.Time.Before(l.Max.Time) && l.Max.Time.Before(l.C3.Time) && l.C3.Time.Before(l.C4.Time)) {
		t.Errorf("contacts out of order: %+v", l)
	}
}

// TestLunarEclipsesCanon checks lunar eclipses against the NASA Five
// Millennium Canon of Lunar Eclipses (Espenak & Meeus, NASA/TP-2009-214172),
// which uses Danjon's shadow enlargement as we do. Values from memory of the
// canon's eclipse pages: contacts in UT to the second, magnitudes to 4
// decimals; tolerance 15 s and 0.002 (memory; the canon's ΔT).
func TestLunarEclipsesCanon(t *testing.T) {
	es, err := LunarEclipses(utc("2025-01-01T00:00:00Z"), utc("2027-01-01T00:00:00Z"))
	if err != nil {
		t.Fatal(err)
	}
	if len(es) != 4 {
		t.Fatalf("%d lunar eclipses in 2025–2026, the canon lists 4 (two total in 2025, a total and a partial in 2026)", len(es))
	}
	march := es[0]
	if march.Type != Total || march.Greatest.Month() != time.March || march.Greatest.Day() != 14 {
		t.Fatalf("first eclipse %s %s, canon: total, 2025-03-14", march.Type, march.Greatest)
	}
	for _, c := range []struct {
		name string
		got  time.Time
		want string
	}{
		{"P1", march.P1, "2025-03-14T03:57:28Z"},
		{"U1", march.U1, "2025-03-14T05:09:40Z"},
		{"U2", march.U2, "2025-03-14T06:26:06Z"},
		{"U3", march.U3, "2025-03-14T07:31:26Z"},
		{"U4", march.U4, "2025-03-14T08:47:52Z"},
		{"P4", march.P4, "2025-03-14T10:00:09Z"},
	} {
		if d := c.got.Sub(utc(c.want)).Seconds(); math.Abs(d) > 15 {
			t.Errorf("2025-03-14 %s: %s, canon %s (%.0f s)", c.name, c.got.Format(time.TimeOnly), c.want, d)
		}
	}
	for _, c := range []struct {
		i                 int
		typ               EclipseType
		umbral, penumbral float64
		date              string
	}{
		{0, Total, 1.1784, 2.2595, "2025-03-14"},
		{1, Total, 1.3619, math.NaN(), "2025-09-07"},
		{2, Total, 1.1507, math.NaN(), "2026-03-03"},
		{3, Partial, 0.9299, math.NaN(), "2026-08-28"},
	} {
		e := es[c.i]
		if e.Greatest.Format(time.DateOnly) != c.date || e.Type != c.typ {
			t.Errorf("eclipse %d: %s %s, canon %s %s", c.i, e.Greatest.Format(time.DateOnly), e.Type, c.date, c.typ)
		}
		if math.Abs(e.UmbralMagnitude-c.umbral) > 0.002 {
			t.Errorf("%s: umbral magnitude %.4f, canon %.4f", c.date, e.UmbralMagnitude, c.umbral)
		}
		if !math.IsNaN(c.penumbral) && math.Abs(e.PenumbralMagnitude-c.penumbral) > 0.002 {
			t.Errorf("%s: penumbral magnitude %.4f, canon %.4f", c.date, e.PenumbralMagnitude, c.penumbral)
		}
	}
}

// TestEclipseFit measures the Chebyshev fits against direct evaluation of
// the Besselian elements and the lunar quantities between the nodes.
func TestEclipseFit(t *testing.T) {
	es, err := SolarEclipses(utc("2027-08-01T00:00:00Z"), utc("2027-08-03T00:00:00Z"))
	if err != nil || len(es) != 1 {
		t.Fatal(err)
	}
	e := es[0]
	var fit, direct [beCount]float64
	worst := 0.0
	for sec := e.el.a; sec <= e.el.b; sec += 397 {
		e.el.eval(sec, fit[:])
		besselian(sec, fit[beMu], direct[:])
		for j := range beCount {
			worst = math.Max(worst, math.Abs(fit[j]-direct[j]))
		}
	}
	if worst > 1e-8 {
		t.Errorf("solar elements: fit off by %.2g (Earth radii or radians)", worst)
	}
	ls, err := LunarEclipses(utc("2025-03-13T00:00:00Z"), utc("2025-03-15T00:00:00Z"))
	if err != nil || len(ls) != 1 {
		t.Fatal(err)
	}
	var lf, ld [leCount]float64
	worst = 0
	for sec := ls[0].s.a; sec <= ls[0].s.b; sec += 397 {
		ls[0].s.eval(sec, lf[:])
		lunarSample(sec, lf[leSunRA], lf[leMoonRA], lf[leGAST], ld[:])
		for j := range leCount {
			d := math.Abs(lf[j] - ld[j])
			if j == leMoonDist {
				d /= earthRadiusKm
			}
			worst = math.Max(worst, d)
		}
	}
	if worst > 1e-8 {
		t.Errorf("lunar series: fit off by %.2g", worst)
	}
}

// TestEclipseOutsideFit: the Besselian elements are given over the twelve
// hours fitted around the new moon and NaN outside them, where the series
// would be extrapolated (two days after Greatest the fit put x at 27.8 Earth
// radii and μ at 8°); an eclipse not made by SolarEclipses or LunarEclipses
// (its zero value) has no circumstances instead of a nil dereference.
func TestEclipseOutsideFit(t *testing.T) {
	es, err := SolarEclipses(utc("2027-08-01T00:00:00Z"), utc("2027-08-03T00:00:00Z"))
	if err != nil || len(es) != 1 {
		t.Fatal(err)
	}
	e := es[0]
	for _, tc := range []struct {
		name string
		t    time.Time
		nan  bool
	}{
		{"start of the fit", secToTime(e.el.a + 1), false},
		{"greatest", e.Greatest, false},
		{"end of the fit", secToTime(e.el.b - 1), false},
		{"a minute before the fit", secToTime(e.el.a - 60), true},
		{"two days after", e.Greatest.Add(48 * time.Hour), true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			x, y, d, mu, l1, l2, f1, f2 := e.Elements(tc.t)
			for i, v := range []float64{x, y, d, mu, l1, l2, f1, f2} {
				if math.IsNaN(v) != tc.nan {
					t.Errorf("element %d at %s = %g, want NaN: %v", i, tc.t.Format(time.RFC3339), v, tc.nan)
				}
			}
		})
	}

	o := Observer{Latitude: 48.21, Longitude: 16.37}
	var zs SolarEclipse
	if x, _, _, _, _, _, _, _ := zs.Elements(e.Greatest); !math.IsNaN(x) {
		t.Errorf("zero SolarEclipse: x = %g, want NaN", x)
	}
	if l, ok := zs.Local(o); ok || l.Visible() || l.Eclipse != &zs {
		t.Errorf("zero SolarEclipse: Local = %+v, %v, want no circumstances", l, ok)
	}
	var zl LunarEclipse
	l := zl.Local(o)
	if l.Visible() || l.Eclipse != &zl || len(l.Horizon) != 0 {
		t.Errorf("zero LunarEclipse: Local = %+v, want no circumstances", l)
	}
	for i, c := range []Contact{l.P1, l.U1, l.U2, l.Greatest, l.U3, l.U4, l.P4} {
		if !c.IsZero() {
			t.Errorf("zero LunarEclipse: contact %d = %+v, want zero", i, c)
		}
	}
}

// TestEclipseRange checks the errors for instants outside 1800–2200.
func TestEclipseRange(t *testing.T) {
	if _, err := SolarEclipses(utc("1700-01-01T00:00:00Z"), utc("1701-01-01T00:00:00Z")); err == nil {
		t.Error("solar: no error for 1700")
	}
	if _, err := LunarEclipses(utc("2200-06-01T00:00:00Z"), utc("2201-06-01T00:00:00Z")); err == nil {
		t.Error("lunar: no error past 2200")
	}
	if es, err := LunarEclipses(utc("2200-01-01T00:00:00Z"), MaxTime()); err != nil || len(es) == 0 {
		t.Errorf("lunar eclipses of 2200: %v, %v", es, err)
	}
}

// TestEclipseWindowMargin checks that every contact lies well inside the
// twelve hours fitted around its syzygy (at least an hour from either end),
// near both ends of the supported range and today, for lunar eclipses and
// for the solar eclipses at 200 sites spread over the Earth.
func TestEclipseWindowMargin(t *testing.T) {
	sites := benchSites(200)
	for _, span := range [][2]string{{"1800-01-02T00:00:00Z", "1804-01-01T00:00:00Z"},
		{"2026-01-01T00:00:00Z", "2030-01-01T00:00:00Z"}, {"2197-01-01T00:00:00Z", "2200-12-30T00:00:00Z"}} {
		from, to := utc(span[0]), utc(span[1])
		ls, err := LunarEclipses(from, to)
		if err != nil {
			t.Fatal(err)
		}
		for _, e := range ls {
			if a, b := unixSeconds(e.P1)-e.s.a, e.s.b-unixSeconds(e.P4); a < 3600 || b < 3600 {
				t.Errorf("lunar %s: P1 %.0f s, P4 %.0f s from the window's ends", e.Greatest, a, b)
			}
		}
		ss, err := SolarEclipses(from, to)
		if err != nil {
			t.Fatal(err)
		}
		if len(ss) < 8 || len(ls) < 8 {
			t.Errorf("%s: %d solar and %d lunar eclipses", span[0], len(ss), len(ls))
		}
		for _, e := range ss {
			for _, o := range sites {
				l, ok := e.Local(o)
				if !ok {
					continue
				}
				if a, b := unixSeconds(l.C1.Time)-e.el.a, e.el.b-unixSeconds(l.C4.Time); a < 3600 || b < 3600 {
					t.Errorf("solar %s at %+v: C1 %.0f s, C4 %.0f s from the window's ends", e.Greatest, o, a, b)
				}
			}
		}
	}
}

// TestEclipseContactPlaces checks the body's altitude and azimuth reported at
// each contact against the package's horizon ephemerides (a separate path:
// the daily-sampled apparent Sun and the Moon's track with parallax):
// within 0.01° (the shadow axis stands for the Sun's direction within 9″),
// azimuths below 85° of altitude.
func TestEclipseContactPlaces(t *testing.T) {
	from, to := utc("2026-01-01T00:00:00Z"), utc("2028-01-01T00:00:00Z")
	sun, err := NewEphemeris(from, to)
	if err != nil {
		t.Fatal(err)
	}
	moon, err := NewMoonEphemeris(from, to)
	if err != nil {
		t.Fatal(err)
	}
	se, _ := SolarEclipses(from, to)
	le, _ := LunarEclipses(from, to)
	n := 0
	check := func(what string, c Contact, alt, az func(Observer, time.Time) (float64, error), o Observer) {
		t.Helper()
		if c.IsZero() {
			return
		}
		h, err1 := alt(o, c.Time)
		a, err2 := az(o, c.Time)
		if err1 != nil || err2 != nil {
			t.Fatal(err1, err2)
		}
		n++
		// the azimuth is ill-defined near the zenith and the nadir
		badAz := math.Abs(h) < 85 && math.Abs(wrapPi((a-c.Azimuth)*deg2rad)) > 0.01*deg2rad
		if math.Abs(h-c.Altitude) > 0.01 || badAz {
			t.Errorf("%s at %+v: altitude %.4f°, azimuth %.4f°; ephemeris %.4f°, %.4f°", what, o, c.Altitude, c.Azimuth, h, a)
		}
	}
	for _, o := range benchSites(50) {
		for _, e := range se {
			if l, ok := e.Local(o); ok {
				for _, c := range []Contact{l.C1, l.C2, l.Max, l.C3, l.C4} {
					check("solar "+e.Greatest.Format(time.DateOnly), c, sun.SunAltitude, sun.SunAzimuth, o)
				}
			}
		}
		for _, e := range le {
			l := e.Local(o)
			for _, c := range []Contact{l.P1, l.U1, l.U2, l.Greatest, l.U3, l.U4, l.P4} {
				check("lunar "+e.Greatest.Format(time.DateOnly), c, moon.MoonAltitude, moon.MoonAzimuth, o)
			}
		}
	}
	if n < 300 {
		t.Errorf("only %d contacts checked", n)
	}
}

// TestEclipseCenturyCanon counts the eclipses of 2001–2100 by type against
// the NASA canons' statistics for the 21st century (Espenak & Meeus; from
// memory): 224 solar eclipses (77 partial, 72 annular, 68 total, 7 hybrid:
// 2005-04-08, 2013-11-03, 2023-04-20, 2031-11-14, 2049-11-25, 2050-05-20,
// 2067-12-06) and 228 lunar eclipses (86 penumbral, 57 partial, 85 total).
// An eclipse missed by the search or misclassified at a limit shows here.
func TestEclipseCenturyCanon(t *testing.T) {
	from, to := utc("2001-01-01T00:00:00Z"), utc("2101-01-01T00:00:00Z")
	se, err := SolarEclipses(from, to)
	if err != nil {
		t.Fatal(err)
	}
	le, err := LunarEclipses(from, to)
	if err != nil {
		t.Fatal(err)
	}
	solar := map[EclipseType]int{}
	var hybrids []string
	for _, e := range se {
		solar[e.Type]++
		if e.Type == Hybrid {
			hybrids = append(hybrids, e.Greatest.Format(time.DateOnly))
		}
	}
	lunar := map[EclipseType]int{}
	for _, e := range le {
		lunar[e.Type]++
	}
	if len(se) != 224 || solar[Partial] != 77 || solar[Annular] != 72 || solar[Total] != 68 || solar[Hybrid] != 7 {
		t.Errorf("solar eclipses 2001–2100: %d %v; canon 224: 77 partial, 72 annular, 68 total, 7 hybrid", len(se), solar)
	}
	if got := strings.Join(hybrids, " "); got != "2005-04-08 2013-11-03 2023-04-20 2031-11-14 2049-11-25 2050-05-20 2067-12-06" {
		t.Errorf("hybrid eclipses %s", got)
	}
	if len(le) != 228 || lunar[Penumbral] != 86 || lunar[Partial] != 57 || lunar[Total] != 85 {
		t.Errorf("lunar eclipses 2001–2100: %d %v; canon 228: 86 penumbral, 57 partial, 85 total", len(le), lunar)
	}
}
