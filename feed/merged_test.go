package feed

import (
	"context"
	"math"
	"strings"
	"testing"
	"time"

	"heliocal/config"
)

// At high latitudes a golden or blue hour's morning and evening spans meet
// when the Sun stays under the band's upper bound all day (or, around
// midnight, over its lower bound all night). Such a span says so and gives
// the Sun's highest (lowest) altitude in it; where the Sun does not rise
// (its centre never above the sunrise altitude, −0.83°), a golden hour is
// twilight glow and carries no eye caution; where it rises, it keeps it.
//
// The altitudes are the Sun's centre at upper (lower) transit, geometric (no
// refraction), topocentric, sea level, from PyEphem 4.1.4 (libastro) with
// pressure = 0: Observer.next_transit / next_antitransit, then Sun.alt;
// printed by /usr/bin/python3 with `import ephem` (the same definitions as
// tools/pyephem-checks/values.py). heliocal's text rounds to 0.1°; the test
// allows 0.06° (PyEphem's own solar theory and ΔT).
func TestMergedBandSpans(t *testing.T) {
	svalbard := site(t, "svalbard", 78.2, 15.6, "Arctic/Longyearbyen")
	mcmurdo := site(t, "mcmurdo", -77.8, 166.7, "Antarctica/McMurdo")
	cases := []struct {
		s       *config.Site
		date    string
		kind    string
		part    string
		pyephem float64 // the Sun's highest (part all-day) or lowest (night) altitude, degrees
		title   string
		says    string // in the description, with the altitude as written
		eyes    bool
	}{
		// PyEphem: upper transit 2026-10-20 10:42:24 UT, alt +1.3720°
		{svalbard, "2026-10-20", "golden-hour", "all-day", 1.3720, "Golden hour (morning and evening in one)",
			"the Sun's centre stays below +6° (at most 1.4°), so the morning and evening spans meet.", true},
		// PyEphem: upper transit 2026-11-01 10:41:11 UT, alt −2.7057°
		{svalbard, "2026-11-01", "golden-hour", "all-day", -2.7057, "Golden hour (twilight glow, Sun below the horizon)",
			"the Sun does not rise (its centre at most −2.7°), the light is twilight glow and the morning and evening spans meet.", false},
		// PyEphem: upper transit 2026-11-10 10:41:31 UT, alt −5.4088°
		{svalbard, "2026-11-10", "blue-hour", "all-day", -5.4088, "Blue hour (morning and evening in one)",
			"the Sun's centre stays below −4° (at most −5.4°), so the morning and evening spans meet.", false},
		// PyEphem: lower transit 2026-04-09 22:59:01 UT, alt −3.9481°
		{svalbard, "2026-04-09", "golden-hour", "night", -3.9481, "Golden hour (around midnight)",
			"the Sun's centre stays above −4° (at least −3.9°), so the evening and morning spans meet.", true},
		// PyEphem: upper transit 2026-04-22 00:51:47 UT, alt +0.0567°
		{mcmurdo, "2026-04-22", "golden-hour", "all-day", 0.0567, "Golden hour (morning and evening in one)",
			"the Sun's centre stays below +6° (at most 0.1°), so the morning and evening spans meet.", true},
		// PyEphem: upper transit 2026-05-04 00:50:00 UT, alt −3.7190°
		{mcmurdo, "2026-05-04", "golden-hour", "all-day", -3.7190, "Golden hour (twilight glow, Sun below the horizon)",
			"the Sun does not rise (its centre at most −3.7°)", false},
		// PyEphem: upper transit 2026-05-12 00:49:33 UT, alt −5.8946°
		{mcmurdo, "2026-05-12", "blue-hour", "all-day", -5.8946, "Blue hour (morning and evening in one)",
			"the Sun's centre stays below −4° (at most −5.9°)", false},
	}
	for _, tc := range cases {
		sk := sky(t, tc.date, tc.date)
		es, err := sk.Entries(context.Background(), tc.s, "f", []config.KindSpec{{Kind: mustKinds(t, tc.kind)[0]}}, date(tc.date), date(tc.date))
		if err != nil {
			t.Fatal(err)
		}
		found := false
		for _, e := range es {
			if e.Facts.Part != tc.part || !e.Date.Equal(date(tc.date)) {
				continue
			}
			found = true
			if math.Abs(e.Facts.Altitude-tc.pyephem) > 0.06 {
				t.Errorf("%s %s %s: the Sun's extreme altitude %.4f°, PyEphem %.4f°", tc.s.ID, tc.date, tc.kind, e.Facts.Altitude, tc.pyephem)
			}
			// what the wording rests on, by PyEphem's altitude: under the
			// band's upper bound (over its lower one), and the Sun up or not
			switch lo, hi := bandOf(tc.kind); {
			case tc.part == "all-day" && tc.pyephem >= hi, tc.part == "night" && tc.pyephem <= lo:
				t.Errorf("%s %s: PyEphem's %.4f° does not keep the Sun inside the band", tc.s.ID, tc.date, tc.pyephem)
			case tc.part == "all-day" && tc.kind == "golden-hour" && (tc.pyephem > -0.8333) != tc.eyes:
				t.Errorf("%s %s: PyEphem's %.4f° and the Sun rising (eye caution %v) disagree", tc.s.ID, tc.date, tc.pyephem, tc.eyes)
			}
			if e.Title != tc.title {
				t.Errorf("%s %s %s: title %q, want %q", tc.s.ID, tc.date, tc.kind, e.Title, tc.title)
			}
			if !strings.Contains(e.Description, tc.says) {
				t.Errorf("%s %s %s: %q\nwant it to say %q", tc.s.ID, tc.date, tc.kind, e.Description, tc.says)
			}
			if strings.Contains(e.Description, cautionEyes) != tc.eyes {
				t.Errorf("%s %s %s: %q\nwant the eye caution %v", tc.s.ID, tc.date, tc.kind, e.Description, tc.eyes)
			}
			for _, wrong := range []string{"all day, low Sun", "low Sun"} {
				if strings.Contains(e.Title+e.Description, wrong) {
					t.Errorf("%s %s %s: %q says %q", tc.s.ID, tc.date, tc.kind, e.Title, wrong)
				}
			}
		}
		if !found {
			t.Errorf("%s %s: no %s span of part %s in %+v", tc.s.ID, tc.date, tc.kind, tc.part, es)
		}
	}
}

// bandOf is the altitude band of golden hour or blue hour (common practice,
// as the calendar's description says).
func bandOf(kind string) (float64, float64) {
	if kind == "blue-hour" {
		return -6, -4
	}
	return -4, 6
}

// A band's span that starts the evening before a listing's first date and
// runs past midnight covers that date: no note claims the Sun stays out of
// the band on it (78.2° N, 8 April 2026: blue hour from 23:38 on the 7th to
// 02:17 on the 8th, and the next from 00:04 on the 9th).
func TestBandSpanFromTheDayBeforeCoversTheFirstDate(t *testing.T) {
	s := site(t, "svalbard", 78.2, 15.6, "Arctic/Longyearbyen")
	sk := sky(t, "2026-04-08", "2026-04-08")
	es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{{Kind: mustKinds(t, "blue-hour")[0]}}, date("2026-04-08"), date("2026-04-08"))
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range es {
		if strings.Contains(e.Title, "stays above") || strings.Contains(e.Title, "stays below") {
			t.Errorf("8 April 2026: %q, but the blue hour that began on the 7th runs to 02:17 on the 8th", e.Title)
		}
	}
}

// Near a pole the Sun stays in the golden band for weeks around an
// equinox: at 89.5° N it enters through −4° on 11 March 2026 and leaves
// through +6° on 4 April. The span is "around the clock" and says so, not
// a "morning" of 580 hours; where it outlasts the listing it runs to the
// listing's end, said in words; the dates it covers say that the golden
// hour begun before them lasts into them.
//
// PyEphem 4.1.4 (libastro), Observer 89.5° N 0° E, pressure 0, elevation 0:
// next_rising(Sun, use_center=True) with horizon −4° from 2026-03-10 20:00
// UT gives 2026-03-11 04:01:01 UT; the Sun's altitude, sampled every 10 s,
// passes +6° between 08:08:40 and 08:08:50 UT on 2026-04-04.
func TestBandAroundTheClock(t *testing.T) {
	s := site(t, "pole", 89.5, 0, "UTC")
	golden := []config.KindSpec{{Kind: mustKinds(t, "golden-hour")[0]}}
	sk := sky(t, "2026-03-01", "2026-04-05")
	es, err := sk.Entries(context.Background(), s, "f", golden, date("2026-03-01"), date("2026-04-05"))
	if err != nil {
		t.Fatal(err)
	}
	var long []Entry
	for _, e := range es {
		if !e.AllDay && e.End.Sub(e.Start) > 24*time.Hour {
			long = append(long, e)
		}
		if e.AllDay && e.Date.After(date("2026-03-11")) && e.Date.Before(date("2026-04-04")) &&
			(e.Title != "No golden hour begins today" || e.Description != "No golden hour begins on this date: the one that began before it lasts into it.") {
			t.Errorf("%s: %q / %q", e.Date.Format(time.DateOnly), e.Title, e.Description)
		}
	}
	if len(long) != 1 {
		t.Fatalf("%d spans longer than a day, want 1: %+v", len(long), long)
	}
	e := long[0]
	if e.Facts.Altitude != 0 {
		t.Errorf("a span of days has the altitude %v°: no day's highest is the span's", e.Facts.Altitude)
	}
	if d := e.Start.Sub(time.Date(2026, 3, 11, 4, 1, 1, 0, time.UTC)); d < -5*time.Second || d > 5*time.Second {
		t.Errorf("enters the band at %v, PyEphem 04:01:01 UT on 11 March", e.Start)
	}
	if e.End.Before(time.Date(2026, 4, 4, 8, 8, 35, 0, time.UTC)) || e.End.After(time.Date(2026, 4, 4, 8, 8, 55, 0, time.UTC)) {
		t.Errorf("leaves the band at %v, PyEphem 08:08:40–08:08:50 UT on 4 April", e.End)
	}
	if e.Title != "Golden hour (around the clock)" || !strings.Contains(e.Description, " on Sat 4 Apr (24 days ") ||
		!strings.Contains(e.Description, "the Sun's centre stays between −4° and +6° day and night.") || !strings.Contains(e.Description, cautionEyes) {
		t.Errorf("%q: %q", e.Title, e.Description)
	}

	// a listing that ends before the Sun leaves the band
	sk = sky(t, "2026-03-11", "2026-03-12")
	es, err = sk.Entries(context.Background(), s, "f", golden, date("2026-03-11"), date("2026-03-12"))
	if err != nil {
		t.Fatal(err)
	}
	if len(es) != 2 || es[0].AllDay || es[0].Title != "Golden hour (around the clock)" ||
		!strings.Contains(es[0].Description, " from 04:01:0") || !strings.Contains(es[0].Description, " to past the end of this calendar: ") ||
		!es[0].End.Equal(time.Date(2026, 3, 13, 0, 0, 0, 0, time.UTC)) || !es[1].AllDay {
		for _, e := range es {
			t.Errorf("%v–%v %q: %q", e.Start, e.End, e.Title, e.Description)
		}
	}
}
