package astro

import (
	"context"
	"encoding/csv"
	"errors"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"
)

// Tests against the published tables copied into testdata/reference (each
// row names its source in its "source" column; see
// testdata/reference/README.md).

// readRecords reads a CSV file below testdata/reference (name may contain
// a sub-directory, e.g. "series/vsop87d-earth.csv"), header included; lines
// starting with '#' are comments.
func readRecords(tb testing.TB, name string) [][]string {
	tb.Helper()
	f, err := os.Open(filepath.Join("..", "testdata", "reference", filepath.FromSlash(name)))
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.Comment = '#'
	rows, err := r.ReadAll()
	if err != nil {
		tb.Fatalf("%s: %v", name, err)
	}
	return rows
}

// readCSV reads a reference table as maps keyed by the header.
func readCSV(t testing.TB, name string) []map[string]string {
	t.Helper()
	rows := readRecords(t, name)
	var out []map[string]string
	for _, r := range rows[1:] {
		m := make(map[string]string, len(r))
		for i, h := range rows[0] {
			m[h] = r[i]
		}
		out = append(out, m)
	}
	return out
}

func mustFloat(t testing.TB, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(strings.TrimSpace(s), 64)
	if err != nil {
		t.Fatalf("bad number %q: %v", s, err)
	}
	return v
}

// summary collects misses (seconds) and reports their spread.
type summary struct {
	name string
	abs  []float64
}

func (s *summary) add(d float64) { s.abs = append(s.abs, math.Abs(d)) }

func (s *summary) log(t *testing.T) {
	if len(s.abs) == 0 {
		return
	}
	sort.Float64s(s.abs)
	p := func(q float64) float64 { return s.abs[int(q*float64(len(s.abs)-1))] }
	t.Logf("%s: %d values, |miss| median %.2f s, p99 %.2f s, max %.2f s", s.name, len(s.abs), p(0.5), p(0.99), s.abs[len(s.abs)-1])
}

// TestSeasonsUSNO checks every equinox and solstice of
// testdata/reference/seasons.csv (USNO, UT rounded to the minute, 1905–2100)
// within a minute in every year, 2030–2100 included (the table's README
// allows 2 minutes to 2060 and 3 after for other ΔT forecasts); the report
// gives the misses in seconds. Rounding to the minute alone accounts for up
// to 30 s.
func TestSeasonsUSNO(t *testing.T) {
	kinds := map[string]int{"march_equinox": 0, "june_solstice": 1, "september_equinox": 2, "december_solstice": 3}
	sum := summary{name: "seasons vs USNO (minute rounding included)"}
	for _, r := range readCSV(t, "seasons.csv") {
		year, _ := strconv.Atoi(r["year"])
		k, ok := kinds[r["kind"]]
		if !ok {
			t.Fatalf("%s: unknown kind %q", r["id"], r["kind"])
		}
		want, err := time.Parse("2006-01-02T15:04Z", r["utc"])
		if err != nil {
			t.Fatal(err)
		}
		s, err := Seasons(year)
		if err != nil {
			t.Fatalf("Seasons(%d): %v", year, err)
		}
		d := s[k].Sub(want).Seconds()
		sum.add(d)
		const tol = 60.0 // to the minute, 1905–2100 (future ΔT as in deltat.go)
		if math.Abs(d) > tol {
			t.Errorf("%s: got %s, USNO %s: miss %.0f s > %.0f s (%s)", r["id"], s[k].Format(time.RFC3339), r["utc"], d, tol, r["source"])
		}
	}
	sum.log(t)
}

// TestApsidesUSNO checks every perihelion and aphelion of
// testdata/reference/apsides.csv (USNO, Earth centre, UT to the minute)
// within 3 minutes (the README's advice for VSOP87-class positions).
func TestApsidesUSNO(t *testing.T) {
	sum := summary{name: "apsides vs USNO (minute rounding included)"}
	for _, r := range readCSV(t, "apsides.csv") {
		year, _ := strconv.Atoi(r["year"])
		want, err := time.Parse("2006-01-02T15:04Z", r["utc"])
		if err != nil {
			t.Fatal(err)
		}
		var got time.Time
		switch r["kind"] {
		case "perihelion":
			got, _, err = Perihelion(year)
		case "aphelion":
			got, _, err = Aphelion(year)
		default:
			t.Fatalf("%s: unknown kind %q", r["id"], r["kind"])
		}
		if err != nil {
			t.Fatal(err)
		}
		d := got.Sub(want).Seconds()
		sum.add(d)
		if math.Abs(d) > 180 {
			t.Errorf("%s: got %s, USNO %s: miss %.0f s (%s)", r["id"], got.Format(time.RFC3339), r["utc"], d, r["source"])
		}
	}
	sum.log(t)
}

// workedExamples returns the rows of worked-examples.csv whose id has the
// prefix.
func workedExamples(t *testing.T, prefix string) []map[string]string {
	var out []map[string]string
	for _, r := range readCSV(t, "worked-examples.csv") {
		if strings.HasPrefix(r["example_id"], prefix) {
			out = append(out, r)
		}
	}
	if len(out) == 0 {
		t.Fatalf("no worked example %s*", prefix)
	}
	return out
}

// TestMeeusSeasonTable checks Meeus's table of equinoxes and solstices
// 1996–2005 (Astronomical Algorithms 2nd ed., ch. 27, computed with VSOP87,
// TD to the second). This package adds the IAU 2000 precession-rate
// correction the book lacks (under 0.02″ in these years, 0.5 s) and a
// truncated VSOP87, so the tolerance is 2 s.
func TestMeeusSeasonTable(t *testing.T) {
	kinds := map[string]int{"march-equinox": 0, "june-solstice": 1, "september-equinox": 2, "december-solstice": 3}
	sum := summary{name: "seasons vs Meeus ch. 27 table (TD)"}
	for _, r := range workedExamples(t, "M27-table-") {
		rest := strings.TrimPrefix(r["example_id"], "M27-table-")
		i := strings.LastIndex(rest, "-")
		k, ok := kinds[rest[:i]]
		if !ok {
			t.Fatalf("%s: unknown kind", r["example_id"])
		}
		year, _ := strconv.Atoi(rest[i+1:])
		want, err := time.Parse("2006-01-02T15:04:05 TD", r["expected"])
		if err != nil {
			t.Fatal(err)
		}
		s, err := Seasons(year)
		if err != nil {
			t.Fatal(err)
		}
		jde, _ := JulianEphemerisDay(s[k])
		d := (jde - JulianDay(want)) * secondsPerDay
		sum.add(d)
		if math.Abs(d) > 2 {
			t.Errorf("%s: miss %.1f s (%s)", r["example_id"], d, r["source"])
		}
	}
	sum.log(t)
}

// TestMeeusExample27 checks Example 27.a (the mean instant of Table 27.B)
// and 27.b (the rigorous June solstice of 1962, 21:24:42 TD; within 5 s,
// the book's VSOP87 lacking the 2.7 s precession-rate correction).
func TestMeeusExample27(t *testing.T) {
	r := workedExamples(t, "M27a-mean")[0]
	if got, want := seasonMeanJDE(1962, 1), mustFloat(t, r["expected"]); math.Abs(got-want) > 1e-5 {
		t.Errorf("mean June solstice 1962: JDE %.5f, want %.5f (%s)", got, want, r["source"])
	}
	s, err := Seasons(1962)
	if err != nil {
		t.Fatal(err)
	}
	jde, _ := JulianEphemerisDay(s[1])
	want := JulianDay(time.Date(1962, 6, 21, 21, 24, 42, 0, time.UTC))
	if d := (jde - want) * secondsPerDay; math.Abs(d) > 5 {
		t.Errorf("June solstice 1962: miss %.1f s against Meeus Example 27.b", d)
	}
}

// TestMeeusApsidesTable checks Meeus's table of Earth perihelia and aphelia
// 1991–2010 (Astronomical Algorithms 2nd ed., ch. 38, p. 274; hours TD to
// 0.01 h, distances to 1e-6 au) within 0.02 h and 2e-6 au.
func TestMeeusApsidesTable(t *testing.T) {
	re := regexp.MustCompile(`^(\d{4}-\d{2}-\d{2}) ([\d.]+) h TD; r=([\d.]+) AU$`)
	sum := summary{name: "apsides vs Meeus ch. 38 table (TD)"}
	for _, r := range workedExamples(t, "M38-table-") {
		m := re.FindStringSubmatch(r["expected"])
		if m == nil {
			t.Fatalf("%s: cannot read %q", r["example_id"], r["expected"])
		}
		day, _ := time.Parse("2006-01-02", m[1])
		wantJDE := JulianDay(day) + mustFloat(t, m[2])/24
		wantR := mustFloat(t, m[3])
		var got time.Time
		var dist float64
		var err error
		if strings.Contains(r["example_id"], "perihelion") {
			got, dist, err = Perihelion(day.Year())
		} else {
			got, dist, err = Aphelion(day.Year())
		}
		if err != nil {
			t.Fatal(err)
		}
		jde, _ := JulianEphemerisDay(got)
		d := (jde - wantJDE) * secondsPerDay
		sum.add(d)
		if math.Abs(d) > 72 || math.Abs(dist-wantR) > 2e-6 {
			t.Errorf("%s: miss %.0f s, distance %.6f au want %.6f (%s)", r["example_id"], d, dist, wantR, r["source"])
		}
	}
	sum.log(t)
}

// TestDeltaTReference checks ΔT against the published values of
// worked-examples.csv (USNO/IERS observed values, USNO historic values,
// Meeus Example 10.a), each within the tolerance of its row.
func TestDeltaTReference(t *testing.T) {
	when := map[string]time.Time{
		"M10a":    time.Date(1977, 2, 18, 3, 37, 40, 0, time.UTC),
		"DT-1800": time.Date(1800, 1, 1, 0, 0, 0, 0, time.UTC),
		"DT-1900": time.Date(1900, 1, 1, 0, 0, 0, 0, time.UTC),
		"DT-1950": time.Date(1950, 1, 1, 0, 0, 0, 0, time.UTC),
		"DT-2000": time.Date(2000, 1, 1, 0, 0, 0, 0, time.UTC),
		"DT-2010": time.Date(2010, 1, 1, 0, 0, 0, 0, time.UTC),
		"DT-2015": time.Date(2015, 1, 1, 0, 0, 0, 0, time.UTC),
		"DT-2019": time.Date(2019, 1, 1, 0, 0, 0, 0, time.UTC),
		"DT-2020": time.Date(2020, 1, 1, 0, 0, 0, 0, time.UTC),
	}
	lead := regexp.MustCompile(`^[+-]?[0-9.]+`)
	n := 0
	for _, r := range readCSV(t, "worked-examples.csv") {
		tm, ok := when[r["example_id"]]
		if !ok {
			continue
		}
		n++
		want := mustFloat(t, lead.FindString(r["expected"]))
		tol := mustFloat(t, lead.FindString(r["tolerance"]))
		dt, err := DeltaT(tm)
		if err != nil {
			t.Fatal(err)
		}
		if d := dt.Seconds() - want; math.Abs(d) > tol {
			t.Errorf("%s: ΔT %.3f s, want %g ± %g (%s)", r["example_id"], dt.Seconds(), want, tol, r["source"])
		}
	}
	if n != len(when) {
		t.Fatalf("found %d of %d ΔT rows", n, len(when))
	}
}

// TestDeltaTSmooth checks that ΔT has no jump anywhere in the supported
// range (the joins between polynomials, table and extrapolation): the change
// over a day stays below 0.01 s except at 1800 and 1860 and 1900 ... where
// the Espenak–Meeus pieces meet (they meet within 0.1 s).
func TestDeltaTSmooth(t *testing.T) {
	prev := deltaTSeconds(minUnix)
	for sec := minUnix + secondsPerDay; sec < maxUnix; sec += secondsPerDay {
		v := deltaTSeconds(sec)
		if math.Abs(v-prev) > 0.1 {
			t.Errorf("ΔT jumps by %.3f s at %s", v-prev, timeFromUnix(sec).Format(time.DateOnly))
		}
		prev = v
	}
	// Future: stays near the last observed value until the mid-2030s
	// (observed values have not exceeded 69.4 s since 2019).
	for _, y := range []int{2024, 2027, 2030, 2035} {
		dt, _ := DeltaT(time.Date(y, 1, 1, 0, 0, 0, 0, time.UTC))
		if dt.Seconds() < 68.5 || dt.Seconds() > 71 {
			t.Errorf("ΔT(%d) = %.2f s, want within 68.5..71", y, dt.Seconds())
		}
	}
}

// TestDeltaTFutureSwiss compares the future ΔT (the long-term trend of
// Stephenson, Morrison & Hohenkerk 2016 from the last observed value) with
// the prediction of the Swiss Ephemeris 2.10.03
// (testdata/reference/deltat-future-swiss.csv): within 6 s up to 2100 and
// 10 s up to 2200, far inside the uncertainty of either prediction
// (FutureUncertainty: 9 s per decade), while the Espenak–Meeus expressions
// used before ran 110 s above it by 2100.
func TestDeltaTFutureSwiss(t *testing.T) {
	var max1, max2 float64
	for _, r := range readCSV(t, "deltat-future-swiss.csv") {
		y := mustFloat(t, r["year"])
		if y < 2024 {
			continue // observed values
		}
		sec := 946684800 + (y-2000)*365.2425*secondsPerDay
		d := deltaTSeconds(sec) - mustFloat(t, r["delta_t_s"])
		tol := 6.0
		if y > 2100 {
			tol = 10
			max2 = max(max2, math.Abs(d))
		} else {
			max1 = max(max1, math.Abs(d))
		}
		if math.Abs(d) > tol {
			t.Errorf("ΔT(%.1f): ours − Swiss Ephemeris %.2f s, beyond %.0f s (%s)", y, d, tol, r["source"])
		}
		if u := FutureUncertainty(timeFromUnix(sec)).Seconds(); math.Abs(d) > u {
			t.Errorf("ΔT(%.1f): ours − Swiss Ephemeris %.2f s exceeds the stated uncertainty %.0f s", y, d, u)
		}
	}
	t.Logf("future ΔT vs Swiss Ephemeris: max %.2f s 2024–2100, %.2f s 2101–2200", max1, max2)
	// The stated uncertainty: zero while observed, about a minute in 2090.
	if u := FutureUncertainty(time.Date(2020, 1, 1, 0, 0, 0, 0, time.UTC)); u != 0 {
		t.Errorf("uncertainty in 2020 = %v, want 0 (observed)", u)
	}
	if u := FutureUncertainty(time.Date(2090, 3, 20, 0, 0, 0, 0, time.UTC)).Seconds(); u < 55 || u > 65 {
		t.Errorf("uncertainty in 2090 = %.0f s, want about a minute", u)
	}
}

// TestTimeScalesLeapSeconds checks TT − UTC = 32.184 s + (TAI − UTC) in the
// observed span (IERS Bulletin C: 37 s since 2017-01-01, 32 s in 2000) and
// |UT1 − UTC| < 0.9 s there (the definition of UTC).
func TestTimeScalesLeapSeconds(t *testing.T) {
	for _, c := range []struct {
		when time.Time
		tai  float64
	}{
		{time.Date(1975, 6, 1, 0, 0, 0, 0, time.UTC), 14},
		{time.Date(2000, 1, 1, 0, 0, 0, 0, time.UTC), 32},
		{time.Date(2016, 12, 31, 23, 59, 59, 0, time.UTC), 36},
		{time.Date(2017, 1, 1, 0, 0, 0, 0, time.UTC), 37},
		{time.Date(2023, 3, 1, 0, 0, 0, 0, time.UTC), 37},
	} {
		e, err := NewEpoch(c.when)
		if err != nil {
			t.Fatal(err)
		}
		if d := (e.JDE-e.JD)*secondsPerDay - (32.184 + c.tai); math.Abs(d) > 1e-4 {
			t.Errorf("%s: TT − UTC off by %.6f s", c.when, d)
		}
	}
	for sec := float64(time.Date(1972, 1, 2, 0, 0, 0, 0, time.UTC).Unix()); sec < maxUnix; sec += 7 * secondsPerDay {
		e := epochOf(sec)
		if d := (e.JDUT1 - e.JD) * secondsPerDay; math.Abs(d) > 0.9 {
			t.Fatalf("%s: UT1 − UTC = %.3f s", timeFromUnix(sec), d)
		}
	}
}

// TestUTCAheadIsUT1 checks what docs/accuracy.md says of the years after
// the observed table: UT1 − UTC is taken as zero, as if leap seconds went
// on keeping the two within a second, so that TT − UTC is ΔT (TT − UT1),
// by the definitions of the time scales (IERS Conventions 2010, ch. 5:
// TT − UTC = (TT − UT1) + (UT1 − UTC)). From a year after the table's end
// (2023-05, after which the last observed UT1 − UTC fades to zero) to the
// end of the supported dates.
func TestUTCAheadIsUT1(t *testing.T) {
	for sec := deltaTTableEnd + 366*secondsPerDay; sec < maxUnix; sec += 29 * secondsPerDay {
		at := timeFromUnix(sec)
		dut1, err := UT1MinusUTC(at)
		if err != nil {
			t.Fatal(err)
		}
		dt, _ := DeltaT(at)
		e := epochOf(sec)
		if d := (e.JDE-e.JD)*secondsPerDay - dt.Seconds(); dut1 != 0 || math.Abs(d) > 1e-3 {
			t.Fatalf("%s: UT1 − UTC = %v, TT − UTC − ΔT = %.6f s; want both zero", at, dut1, d)
		}
	}
}

// TestJulianDayMeeus checks the Julian days of Meeus ch. 7 (Example 7.a
// and the table of p. 62) and the weekday of Example 7.e.
func TestJulianDayMeeus(t *testing.T) {
	re := regexp.MustCompile(`^(\d{4})-(\d{2})-(\d{2})(\.\d+)? \(Gregorian`)
	n := 0
	for _, r := range workedExamples(t, "M7") {
		m := re.FindStringSubmatch(r["input"])
		if m == nil || r["category"] != "julian-day" || r["unit"] != "day" {
			continue
		}
		y, _ := strconv.Atoi(m[1])
		mo, _ := strconv.Atoi(m[2])
		d, _ := strconv.Atoi(m[3])
		frac := 0.0
		if m[4] != "" {
			frac = mustFloat(t, "0"+m[4])
		}
		tm := time.Date(y, time.Month(mo), d, 0, 0, 0, 0, time.UTC).Add(time.Duration(frac * 86400e9))
		want := mustFloat(t, r["expected"])
		tol := mustFloat(t, r["tolerance"])
		if got := JulianDay(tm); math.Abs(got-want) > tol {
			t.Errorf("%s: JulianDay(%s) = %.6f, want %.6f (%s)", r["example_id"], tm, got, want, r["source"])
		}
		if back := TimeFromJulianDay(want); back.Sub(tm).Abs() > time.Millisecond {
			t.Errorf("%s: TimeFromJulianDay(%.6f) = %s, want %s", r["example_id"], want, back, tm)
		}
		n++
	}
	if n < 10 {
		t.Fatalf("only %d Julian day rows read", n)
	}
	// Meeus Example 7.e: JD 2434923.5 (1954 June 30) was a Wednesday.
	if wd := TimeFromJulianDay(2434923.5).Weekday(); wd != time.Wednesday {
		t.Errorf("JD 2434923.5 is a %s, want Wednesday (Meeus Example 7.e)", wd)
	}
}

var (
	usnoEphOnce sync.Once
	usnoEph     *Ephemeris
	usnoEphErr  error
)

// sunTimesKind maps a kind of sun-times.csv to a threshold and direction.
func sunTimesKind(kind string) (alt float64, dir Direction, ok bool) {
	switch kind {
	case "sunrise":
		return SunriseAltitude, Rising, true
	case "sunset":
		return SunriseAltitude, Setting, true
	case "civil_dawn":
		return CivilTwilight, Rising, true
	case "civil_dusk":
		return CivilTwilight, Setting, true
	case "nautical_dawn":
		return NauticalTwilight, Rising, true
	case "nautical_dusk":
		return NauticalTwilight, Setting, true
	case "astronomical_dawn":
		return AstronomicalTwilight, Rising, true
	case "astronomical_dusk":
		return AstronomicalTwilight, Setting, true
	}
	return 0, 0, false
}

// parseFixedZone reads "UTC-04:00".
func parseFixedZone(t testing.TB, s string) *time.Location {
	t.Helper()
	m := regexp.MustCompile(`^UTC([+-])(\d{2}):(\d{2})$`).FindStringSubmatch(s)
	if m == nil {
		t.Fatalf("bad zone %q", s)
	}
	h, _ := strconv.Atoi(m[2])
	mi, _ := strconv.Atoi(m[3])
	off := h*3600 + mi*60
	if m[1] == "-" {
		off = -off
	}
	return time.FixedZone(s, off)
}

// TestSunTimesUSNO checks every row of testdata/reference/sun-times.csv
// (USNO one-year tables and one-day responses, minute rounding, fixed UTC
// offsets without daylight saving; dates are dates in that offset). Times
// must agree within 40 s (the minute rounding plus 10 s) up to 65° of
// latitude and 10 min beyond, where presence and absence of events and the
// polar day/night states must match. Rows outside the supported range
// (1750) must give a RangeError.
func TestSunTimesUSNO(t *testing.T) {
	usnoEphOnce.Do(func() {
		usnoEph, usnoEphErr = NewEphemeris(time.Date(1999, 12, 1, 0, 0, 0, 0, time.UTC), time.Date(2025, 1, 31, 0, 0, 0, 0, time.UTC))
	})
	if usnoEphErr != nil {
		t.Fatal(usnoEphErr)
	}
	sum := summary{name: "sun times vs USNO (minute rounding included)"}
	for _, r := range readCSV(t, "sun-times.csv") {
		lat, lon := mustFloat(t, r["lat"]), mustFloat(t, r["lon"])
		loc := parseFixedZone(t, r["tz"])
		date, err := time.ParseInLocation(time.DateOnly, r["date"], loc)
		if err != nil {
			t.Fatal(err)
		}
		o := Observer{Latitude: lat, Longitude: lon}
		if date.Year() < 1800 {
			_, err := NewEphemeris(date, date)
			if !errors.Is(err, ErrOutOfRange) {
				t.Errorf("%s: %s is outside 1800..2200 but NewEphemeris returned %v", r["id"], r["date"], err)
			}
			var re *RangeError
			if !errors.As(err, &re) || re.What != "ephemeris start" {
				t.Errorf("%s: want a *RangeError naming the ephemeris start, got %v", r["id"], err)
			}
			continue
		}
		// Tighter than the README's advice (1 min to 50°, 2 min to 65°):
		// the minute rounding plus 10 s.
		tol := 40.0
		if math.Abs(lat) > 65 {
			tol = 600
		}
		if r["kind"] == "solar_noon" {
			want, _ := time.Parse("2006-01-02T15:04Z", r["utc"])
			tr, err := usnoEph.SunTransits(o, date, date.AddDate(0, 0, 1))
			if err != nil || len(tr) != 1 {
				t.Fatalf("%s: transits %v %v", r["id"], tr, err)
			}
			d := tr[0].Time.Sub(want).Seconds()
			sum.add(d)
			if math.Abs(d) > tol {
				t.Errorf("%s: solar noon %s, USNO %s (%s)", r["id"], tr[0].Time.Format(time.RFC3339), r["utc"], r["source"])
			}
			continue
		}
		if r["kind"] == "polar_day" || r["kind"] == "polar_night" {
			days, err := usnoEph.SunDays(context.Background(), o, o.RiseSetAltitude(), loc, date, date)
			if err != nil {
				t.Fatal(err)
			}
			want := AlwaysAbove
			if r["kind"] == "polar_night" {
				want = AlwaysBelow
			}
			if days[0].State != want {
				t.Errorf("%s: state %s, USNO says %s (%s)", r["id"], days[0].State, r["kind"], r["source"])
			}
			continue
		}
		alt, dir, ok := sunTimesKind(r["kind"])
		if !ok {
			t.Fatalf("%s: unknown kind %q", r["id"], r["kind"])
		}
		if alt == SunriseAltitude {
			alt = o.RiseSetAltitude()
		}
		// USNO rounds to the minute, so an event within a minute of
		// midnight may sit on either date: search a little beyond the date
		// and, for "none", accept events in that last minute only.
		edge := time.Minute
		cs, err := usnoEph.SunCrossings(o, alt, date.Add(-edge), date.AddDate(0, 0, 1).Add(edge))
		if err != nil {
			t.Fatal(err)
		}
		var got []time.Time
		for _, c := range cs {
			if c.Direction == dir {
				got = append(got, c.Time)
			}
		}
		if r["local_time"] == "none" {
			for _, g := range got {
				if g.Sub(date) > edge && date.AddDate(0, 0, 1).Sub(g) > edge {
					t.Errorf("%s: USNO has no %s on %s, got %s (%s)", r["id"], r["kind"], r["date"], g.Format(time.RFC3339), r["source"])
				}
			}
			continue
		}
		want, err := time.Parse("2006-01-02T15:04Z", r["utc"])
		if err != nil {
			t.Fatal(err)
		}
		if len(got) == 0 {
			t.Errorf("%s: want a %s on %s, got none (%s)", r["id"], r["kind"], r["date"], r["source"])
			continue
		}
		best := got[0]
		for _, g := range got {
			if g.Sub(want).Abs() < best.Sub(want).Abs() {
				best = g
			}
		}
		d := best.Sub(want).Seconds()
		sum.add(d)
		if math.Abs(d) > tol {
			t.Errorf("%s: %s %s, USNO %s: miss %.0f s > %.0f s (%s)", r["id"], r["kind"], best.Format(time.RFC3339), r["utc"], d, tol, r["source"])
		}
	}
	sum.log(t)
}
