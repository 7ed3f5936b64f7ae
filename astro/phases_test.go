package astro

import (
	"math"
	"sort"
	"testing"
	"time"
)

// phaseAt returns the phase of the given kind nearest to t.
func phaseAt(tb testing.TB, kind PhaseKind, t time.Time) time.Time {
	tb.Helper()
	ph, err := MoonPhases(t.Add(-10*24*time.Hour), t.Add(10*24*time.Hour))
	if err != nil {
		tb.Fatal(err)
	}
	best := time.Time{}
	for _, p := range ph {
		if p.Kind == kind && (best.IsZero() || absDur(p.Time.Sub(t)) < absDur(best.Sub(t))) {
			best = p.Time
		}
	}
	if best.IsZero() {
		tb.Fatalf("no %v near %v", kind, t)
	}
	return best
}

func absDur(d time.Duration) time.Duration {
	if d < 0 {
		return -d
	}
	return d
}

// ttOf returns the instant t read on Terrestrial Time (t + ΔT + UT1−UTC
// corrections as in deltat.go), as a time.Time labelled UTC.
func ttOf(tb testing.TB, t time.Time) time.Time {
	tb.Helper()
	jde, err := JulianEphemerisDay(t)
	if err != nil {
		tb.Fatal(err)
	}
	return timeFromUnix(jdToUnix(jde))
}

// TestMoonPhasesMeeus49: Meeus, Astronomical Algorithms 2nd ed.,
// Example 49.a, p. 353: the new moon of 1977 February, by the chapter's
// method JDE 2443192.65118 = 1977-02-18 03:37:42 TD; Example 49.b: the first
// last quarter of 2044, JDE 2467636.49186 = 2044-01-21 23:48:17 TD. The
// chapter's method itself is good to a few seconds (up to ~17 s), so the
// tolerance for the solution on the true positions is 20 s; the differences
// are logged.
func TestMoonPhasesMeeus49(t *testing.T) {
	for _, tc := range []struct {
		name string
		kind PhaseKind
		want time.Time // TD
	}{
		{"Example 49.a", NewMoon, time.Date(1977, 2, 18, 3, 37, 42, 0, time.UTC)},
		{"Example 49.b", LastQuarter, time.Date(2044, 1, 21, 23, 48, 17, 0, time.UTC)},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got := ttOf(t, phaseAt(t, tc.kind, tc.want))
			d := got.Sub(tc.want)
			t.Logf("%s: %v TT, Meeus %v TD, difference %.1f s", tc.kind, got.Format("2006-01-02 15:04:05.0"), tc.want.Format("15:04:05"), d.Seconds())
			if absDur(d) > 20*time.Second {
				t.Errorf("%s at %v TT, want %v TD ± 20 s (Meeus %s)", tc.kind, got, tc.want, tc.name)
			}
		})
	}
}

// TestApproxPhaseMeeus49: the starting values (mean phase plus the largest
// corrections of ch. 49) are within 5 minutes of the chapter's complete
// result in Meeus, Astronomical Algorithms 2nd ed., Examples 49.a (new moon,
// k = −283: JDE 2443192.65118) and 49.b (last quarter, k = 544.75: JDE
// 2467636.49186).
func TestApproxPhaseMeeus49(t *testing.T) {
	for _, c := range []struct{ k, want float64 }{{-283, 2443192.65118}, {544.75, 2467636.49186}} {
		got := approxPhaseJDE(c.k)
		t.Logf("k=%v: %.5f, complete method %.5f (%.0f s)", c.k, got, c.want, (got-c.want)*secondsPerDay)
		if math.Abs(got-c.want)*secondsPerDay > 300 {
			t.Errorf("k=%v: starting value %.5f, want within 5 min of %.5f (Meeus ch. 49)", c.k, got, c.want)
		}
	}
}

// TestMeanPhaseMeeus49: Meeus, Astronomical Algorithms 2nd ed., eq. 49.1 and
// Examples 49.a (k = −283, mean JDE 2443192.94102) and 49.b (k = 544.75,
// mean JDE 2467636.88597).
func TestMeanPhaseMeeus49(t *testing.T) {
	for _, c := range []struct{ k, want float64 }{{-283, 2443192.94102}, {544.75, 2467636.88597}} {
		if got := meanPhaseJDE(c.k); math.Abs(got-c.want) > 1e-5 {
			t.Errorf("mean phase k=%v: JDE %.5f, want %.5f", c.k, got, c.want)
		}
	}
}

var phaseKindByName = map[string]PhaseKind{
	"new_moon": NewMoon, "first_quarter": FirstQuarter, "full_moon": FullMoon, "last_quarter": LastQuarter,
}

type usnoPhase struct {
	id, source string
	kind       PhaseKind
	utc        time.Time
}

func loadUSNOPhases(tb testing.TB) []usnoPhase {
	tb.Helper()
	recs := readRecords(tb, "moon-phases.csv")
	var out []usnoPhase
	for _, r := range recs[1:] {
		k, ok := phaseKindByName[r[1]]
		if !ok {
			tb.Fatalf("%s: phase %q", r[0], r[1])
		}
		u, err := time.Parse("2006-01-02T15:04Z", r[2])
		if err != nil {
			tb.Fatalf("%s: %v", r[0], err)
		}
		out = append(out, usnoPhase{r[0], r[3], k, u})
	}
	return out
}

// TestMoonPhasesUSNO checks every row of testdata/reference/moon-phases.csv
// (U.S. Naval Observatory moon-phase data service, UT rounded to the minute,
// 1900–2100, downloaded 2019; source column in the file). The instants are
// in UT, so they carry USNO's ΔT: observed up to 2018, predicted after. The
// tolerance is the half-minute rounding plus 4 s up to 2019, plus 20 s for
// 2020–2035 (USNO's 2019 ΔT prediction ran ahead of the observed ΔT by up to
// ~15 s by 2030: the misses there are late by that much on average) and
// ±2 min after 2035 (the reference README's advice: ΔT extrapolations
// differ). Misses are reported in seconds.
func TestMoonPhasesUSNO(t *testing.T) {
	rows := loadUSNOPhases(t)
	var misses []float64 // up to 2019
	for _, r := range rows {
		got := phaseAt(t, r.kind, r.utc)
		miss := got.Sub(r.utc).Seconds()
		if r.utc.Year() <= 2019 {
			misses = append(misses, math.Abs(miss))
		}
		tol := 34.0
		switch y := r.utc.Year(); {
		case y > 2035:
			tol = 120
		case y > 2019:
			tol = 50
		}
		if math.Abs(miss) > tol {
			t.Errorf("%s %v: got %v, USNO %v: miss %.1f s > %.0f s (%s)", r.id, r.kind, got.Format(time.RFC3339), r.utc.Format("2006-01-02T15:04Z"), miss, tol, r.source)
		}
	}
	sort.Float64s(misses)
	t.Logf("USNO phases 1900–2019: %d rows, |miss| median %.1f s, max %.1f s (includes USNO's minute rounding)", len(misses), misses[len(misses)/2], misses[len(misses)-1])
}
