package feed

import (
	"context"
	"slices"
	"strings"
	"testing"
	"time"

	"heliocal/config"
)

// A change of day length reads in the units of a clock (common practice):
// an hour or more in hours, as on the first day the Sun rises after polar
// night, never as "+102 min 55 s".
func TestDayChangeWording(t *testing.T) {
	for d, want := range map[time.Duration]string{
		39 * time.Second:                 "+39 s",
		-(2*time.Minute + 5*time.Second): "−2 min 05 s",
		102*time.Minute + 55*time.Second: "+1 h 42 min 55 s",
		-(61 * time.Minute):              "−1 h 01 min",
	} {
		if got := Change(d); got != want {
			t.Errorf("Change(%v) = %q, want %q", d, got, want)
		}
	}
}

// Outside values at 78.2° N, 15.6° E, sea level: PyEphem 4.1.4 (libastro),
// Observer with pressure 0, horizon −0.8333°, use_center (heliocal's
// sunrise: the upper limb with 34′ of refraction at a flat sea-level
// horizon), topocentric as heliocal; computed once with
// tools/pyephem-checks/values.py and recorded here. CEST is UTC+2.
var (
	pyephemRise16 = time.Date(2027, 4, 16, 0, 33, 24, 306e6, time.UTC) // 02:33:24 CEST
	pyephemSet16  = time.Date(2027, 4, 16, 21, 38, 4, 881e6, time.UTC) // 23:38:05 CEST
	pyephemRise17 = time.Date(2027, 4, 17, 0, 14, 20, 933e6, time.UTC) // 02:14:21 CEST
	pyephemSet17  = time.Date(2027, 4, 17, 22, 2, 31, 812e6, time.UTC) // 00:02:32 CEST on the 18th
	// 18 April: the Sun rises and does not set again for days (PyEphem: the
	// centre stays above −0.8333° for the next 48 h), the midnight Sun
	pyephemRise18 = time.Date(2027, 4, 17, 23, 49, 28, 546e6, time.UTC) // 01:49:29 CEST, 18 April
	// the midnight Sun ends: its last sunset, then the day of 25 August
	// that ends after midnight, then 26 August's
	pyephemLastSet = time.Date(2027, 8, 24, 22, 39, 52, 303e6, time.UTC) // 00:39:52 CEST, 25 August
	pyephemRise25  = time.Date(2027, 8, 24, 23, 22, 6, 950e6, time.UTC)  // 01:22:07 CEST, 25 August
	pyephemSet25   = time.Date(2027, 8, 25, 22, 0, 39, 406e6, time.UTC)  // 00:00:39 CEST on the 26th
	pyephemRise26  = time.Date(2027, 8, 26, 0, 0, 48, 894e6, time.UTC)   // 02:00:49 CEST
	pyephemSet26   = time.Date(2027, 8, 26, 21, 37, 51, 948e6, time.UTC) // 23:37:52 CEST
)

// pyephemTolerance bounds heliocal's distance from those values: PyEphem's
// shorter solar theory and its own ΔT put it within about 0.2 s of heliocal
// there even where the Sun grazes the horizon (about 0.7° an hour at the
// sunset near midnight in April, 0.3° an hour at the midnight Sun's last
// sunset; a day length that sums three such instants within 0.6 s), while
// a real error exceeds it by far (1′ of refraction moves the April sunset
// by about 85 s, the Sun's parallax about 12 s).
const pyephemTolerance = time.Second

func within(d, want time.Duration) bool {
	return d-want >= -pyephemTolerance && d-want <= pyephemTolerance
}

// Day length is the time from sunrise to sunset (common practice), taken
// from the two instants even when the sunset falls after midnight: at 78.2° N
// in mid-April and late August the sunset crosses midnight, and the day that
// began with a sunrise at 02:14 and ended at 00:03 the next date counts in
// full on the date of its sunrise, the sunset after midnight carries that
// day, and each change from the day before is the difference of two such
// days, not of clock times. A date that also ends a stretch of midnight
// Sun, 25 August, does not count that stretch's last minutes after its
// midnight: its day runs from its own sunrise (common practice). The
// site is invented, at Svalbard's latitude. The instants and day lengths of
// 16–18 April and 25–26 August are PyEphem's (see pyephemRise16).
func TestDayLengthAcrossMidnight(t *testing.T) {
	s := site(t, "isfjell-hut", 78.2, 15.6, "Arctic/Longyearbyen")
	for _, w := range [][2]string{{"2027-04-08", "2027-04-22"}, {"2027-08-20", "2027-09-03"}} {
		t.Run(w[0], func(t *testing.T) {
			sk := sky(t, w[0], w[1])
			events, _, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "sunrise", "sunset", "daily-summary"), date(w[0]), date(w[1]))
			if err != nil {
				t.Fatal(err)
			}
			summary := map[time.Time]Event{}
			for _, e := range events {
				if e.Kind.Name == "daily-summary" {
					summary[e.Date] = e
				}
			}
			for d := date(w[0]).AddDate(0, 0, 1); !d.After(date(w[1])); d = d.AddDate(0, 0, 1) {
				e, prev := summary[d], summary[d.AddDate(0, 0, -1)]
				if e.DayChange != e.DayLength-prev.DayLength {
					t.Errorf("%s: change %v, want %v − %v", d.Format(time.DateOnly), e.DayChange, e.DayLength, prev.DayLength)
				}
			}
			// 16 and 17 April, 25 and 26 August against PyEphem (see pyephemRise16)
			want := map[string]time.Time{"sunrise 2027-04-16": pyephemRise16, "sunset 2027-04-16": pyephemSet16,
				"sunrise 2027-04-17": pyephemRise17, "sunset 2027-04-18": pyephemSet17, "sunrise 2027-04-18": pyephemRise18}
			if w[0] == "2027-08-20" {
				want = map[string]time.Time{"sunset 2027-08-25": pyephemLastSet, "sunrise 2027-08-25": pyephemRise25,
					"sunset 2027-08-26": pyephemSet25, "sunrise 2027-08-26": pyephemRise26}
			}
			for _, e := range events {
				k := e.Kind.Name + " " + e.Date.Format(time.DateOnly)
				if at, ok := want[k]; ok {
					delete(want, k)
					if !within(e.Start.Sub(at), 0) {
						t.Errorf("%s: heliocal %s, PyEphem %s", k, e.Start.Format(time.RFC3339Nano), at.Format(time.RFC3339Nano))
					}
				}
			}
			if len(want) > 0 {
				t.Errorf("not found: %v", want)
			}
			first, second := "2027-04-16", "2027-04-17"
			w1, w2 := pyephemSet16.Sub(pyephemRise16), pyephemSet17.Sub(pyephemRise17)
			if w[0] == "2027-08-20" {
				// 25 August: the day across midnight, without the
				// midnight Sun's last minutes after 00:00 CEST before it
				first, second = "2027-08-25", "2027-08-26"
				w1 = pyephemSet25.Sub(pyephemRise25)
				w2 = pyephemSet26.Sub(pyephemRise26)
			}
			if w[0] == "2027-04-08" {
				// 18 April: from the sunrise to the end of the date (00:00
				// CEST, 22:00 UTC), the midnight Sun's first part
				want := time.Date(2027, 4, 18, 22, 0, 0, 0, time.UTC).Sub(pyephemRise18)
				if d := summary[date("2027-04-18")].DayLength; !within(d, want) {
					t.Errorf("2027-04-18: day %v, PyEphem %v", d, want)
				}
			}
			d1, d2 := summary[date(first)], summary[date(second)]
			if !within(d1.DayLength, w1) || !within(d2.DayLength, w2) || !within(d2.DayChange, w2-w1) {
				t.Errorf("%s: day %v; %s: day %v, change %v; PyEphem: %v; %v, %v",
					first, d1.DayLength, second, d2.DayLength, d2.DayChange, w1, w2, w2-w1)
			}
			pastMidnight := 0
			var rise *Event
			for i := range events {
				e := &events[i]
				switch e.Kind.Name {
				case "sunrise":
					rise = e
				case "sunset":
					if rise == nil || e.Start.Sub(rise.Start) >= 24*time.Hour {
						continue // the midnight Sun's last sunset
					}
					day := e.Start.Sub(rise.Start)
					sum, ok := summary[rise.Date]
					if !e.Date.Equal(rise.Date) {
						pastMidnight++
					}
					for _, got := range []Event{*rise, *e, sum} {
						if !ok && got.Kind.Name == "daily-summary" {
							continue
						}
						if d := got.DayLength - day; d < -time.Millisecond || d > time.Millisecond {
							t.Errorf("%s of %s: day length %v, want %v (sunrise %s to sunset %s)", got.Kind, rise.Date.Format(time.DateOnly),
								got.DayLength, day, rise.Start.In(s.TimeZone.Location).Format("Jan 2 15:04:05"), e.Start.In(s.TimeZone.Location).Format("Jan 2 15:04:05"))
						}
					}
					if ok && e.DayChange != sum.DayChange {
						t.Errorf("sunset %s: change %v, want the change of the day it ends, %v", e.Start.In(s.TimeZone.Location).Format("Jan 2 15:04"), e.DayChange, sum.DayChange)
					}
				}
			}
			if pastMidnight == 0 {
				t.Errorf("no sunset after midnight in %v: the test checks nothing of that case", w)
			}
		})
	}
}

// A daily summary says each note once: civil dawn and civil dusk both
// missing on a night of midnight Sun make one line, not two.
func TestSummaryNotesOnce(t *testing.T) {
	s := site(t, "isfjell-hut", 78.2, 15.6, "Arctic/Longyearbyen")
	sk := sky(t, "2027-06-21", "2027-06-21")
	es, err := sk.Entries(context.Background(), s, "hut", []config.KindSpec{{Kind: mustKinds(t, "daily-summary")[0]}}, date("2027-06-21"), date("2027-06-21"))
	if err != nil || len(es) != 1 {
		t.Fatalf("entries %v, %v; want one summary", es, err)
	}
	lines := strings.Split(es[0].Description, "\n")
	for i, l := range lines {
		if slices.Contains(lines[:i], l) {
			t.Errorf("summary says %q twice:\n%s", l, es[0].Description)
		}
	}
	if !strings.Contains(es[0].Description, "Midnight sun") {
		t.Errorf("summary of 21 June at 78° N does not say midnight sun:\n%s", es[0].Description)
	}
}

// A daily summary whose day ends with a sunset after midnight shows that
// sunset (its length counts it) instead of saying there is no sunset today,
// and the next date's summary says its early sunset ends the day before. At
// 78.2° N (invented site at Svalbard's latitude) the day of 17 April 2027
// begins at 02:14 and ends at 00:03 on the 18th (PyEphem's instants, see
// pyephemRise16; day length from sunrise to sunset is common practice).
func TestSummaryShowsSunsetAfterMidnight(t *testing.T) {
	s := site(t, "isfjell-hut", 78.2, 15.6, "Arctic/Longyearbyen")
	sk := sky(t, "2027-04-16", "2027-04-18")
	es, err := sk.Entries(context.Background(), s, "hut", []config.KindSpec{{Kind: mustKinds(t, "daily-summary")[0]}}, date("2027-04-16"), date("2027-04-18"))
	if err != nil || len(es) != 3 {
		t.Fatalf("entries %v, %v; want three summaries", es, err)
	}
	byDate := map[string]string{}
	for _, e := range es {
		byDate[e.Date.Format(time.DateOnly)] = e.Description
	}
	d17, d18 := byDate["2027-04-17"], byDate["2027-04-18"]
	// the sunsets to the minute: PyEphem's (see pyephemRise16), 00:02:32 and 23:38:05 CEST
	set17, set16 := cestMinute(pyephemSet17), cestMinute(pyephemSet16)
	if set17 != "00:03" || set16 != "23:38" {
		t.Fatalf("PyEphem's sunsets %s and %s: the recorded values changed", set17, set16)
	}
	if strings.Contains(d17, "No sunset") || !strings.Contains(d17, "Sunset "+set17+" CEST (after midnight, Sun 18 April)") {
		t.Errorf("summary of 17 April does not show its sunset after midnight at %s:\n%s", set17, d17)
	}
	if !strings.Contains(d18, "Sunset "+set17+" CEST (ending the day before)") {
		t.Errorf("summary of 18 April does not say its early sunset at %s ends the day before:\n%s", set17, d18)
	}
	if d16 := byDate["2027-04-16"]; strings.Contains(d16, "after midnight") || strings.Contains(d16, "ending the day before") || !strings.Contains(d16, "Sunset "+set16+" CEST") {
		t.Errorf("summary of 16 April (sunset %s the same date) is marked or lacks it:\n%s", set16, d16)
	}
}

// The summary of the date on which the midnight Sun begins says so: at
// 78.2° N the Sun rises at 01:49 CEST on 18 April 2027 and then stays above
// the horizon for days (PyEphem, see pyephemRise18), so that date's day
// length runs from sunrise to midnight; the date before, whose day ends
// with a sunset after midnight, says nothing of the kind.
func TestSummaryMidnightSunBegins(t *testing.T) {
	s := site(t, "isfjell-hut", 78.2, 15.6, "Arctic/Longyearbyen")
	sk := sky(t, "2027-04-17", "2027-04-18")
	es, err := sk.Entries(context.Background(), s, "hut", []config.KindSpec{{Kind: mustKinds(t, "daily-summary")[0]}}, date("2027-04-17"), date("2027-04-18"))
	if err != nil || len(es) != 2 {
		t.Fatalf("entries %v, %v; want two summaries", es, err)
	}
	d17, d18 := es[0].Description, es[1].Description
	rise := "Sunrise " + cestMinute(pyephemRise18) + " CEST (the Sun then stays up for more than a day: midnight sun)"
	if cestMinute(pyephemRise18) != "01:49" {
		t.Fatalf("PyEphem's sunrise %s: the recorded value changed", cestMinute(pyephemRise18))
	}
	if !strings.Contains(d18, rise+".\n") || !strings.Contains(d18, ", sunrise to midnight (") {
		t.Errorf("summary of 18 April does not say the Sun stays up after its sunrise at 01:49:\n%s", d18)
	}
	// the day length to midnight: 22 h 10 min from PyEphem's sunrise
	if want := "Day length " + hm(time.Date(2027, 4, 18, 22, 0, 0, 0, time.UTC).Sub(pyephemRise18)); !strings.Contains(d18, want+", sunrise to midnight") {
		t.Errorf("summary of 18 April lacks %q:\n%s", want, d18)
	}
	if strings.Contains(d17, "stays up") || strings.Contains(d17, "to midnight") {
		t.Errorf("summary of 17 April (its day ends at 00:03 the next date) says the Sun stays up:\n%s", d17)
	}
}

// Over a skyline the daily summary marks the sunset after midnight that
// ends a day, and the sunrise that begins the midnight Sun, as over the
// flat horizon, since its direct Sun is counted by the same rule: at
// 78.2° N over a skyline at 0° all round (the flat horizon's crossings,
// astro.TestSkylineFlatEqualsHorizon), 17 April 2027 lists its sunset at
// 00:03 on the 18th instead of "No sunset today", 18 April says that sunset
// ends the day before and that after its sunrise at 01:49 the Sun stays up
// (PyEphem's instants, see pyephemRise16 and pyephemRise18).
func TestSkylineSummaryMarksDayEnds(t *testing.T) {
	s := site(t, "isfjell-hut", 78.2, 15.6, "Arctic/Longyearbyen")
	s.Skyline = [][2]float64{{0, 0}}
	sk := sky(t, "2027-04-16", "2027-04-18")
	es, err := sk.Entries(context.Background(), s, "hut", []config.KindSpec{{Kind: mustKinds(t, "daily-summary")[0]}}, date("2027-04-16"), date("2027-04-18"))
	if err != nil || len(es) != 3 {
		t.Fatalf("entries %v, %v; want three summaries", es, err)
	}
	set, rise := cestMinute(pyephemSet17), cestMinute(pyephemRise18)
	for i, c := range []struct{ want, not []string }{
		{not: []string{"after midnight", "ending the day before", "stays up"}},
		{want: []string{"Sunset " + set + " CEST (after midnight, Sun 18 April).\n"}, not: []string{"No sunset"}},
		{want: []string{
			"Sunset " + set + " CEST (ending the day before).\n",
			"Sunrise " + rise + " CEST (the Sun then stays up for more than a day: midnight sun).\n",
			", sunrise to midnight (",
		}},
	} {
		d := es[i].Description
		for _, w := range c.want {
			if !strings.Contains(d, w) {
				t.Errorf("summary of %s lacks %q:\n%s", es[i].Date.Format(time.DateOnly), w, d)
			}
		}
		for _, n := range c.not {
			if strings.Contains(d, n) {
				t.Errorf("summary of %s says %q:\n%s", es[i].Date.Format(time.DateOnly), n, d)
			}
		}
	}
}

// cestMinute is instant t in CEST (UTC+2) to the nearest minute, as "15:04".
func cestMinute(t time.Time) string {
	return t.In(time.FixedZone("CEST", 2*3600)).Round(time.Minute).Format("15:04")
}

// The day that ends after midnight is the same one whatever the window: a
// calendar whose last date is 17 April shows that date's sunset after
// midnight, and one whose first date is 18 April says its early sunset
// ends the day before, as the three-date calendar above does (one record of
// the days that end after midnight, dayEnds, serves every date of the
// window and its neighbours).
func TestSummaryAfterMidnightAtWindowEdges(t *testing.T) {
	s := site(t, "isfjell-hut", 78.2, 15.6, "Arctic/Longyearbyen")
	set := cestMinute(pyephemSet17) // 00:03, PyEphem's (see pyephemRise16)
	for _, c := range []struct{ day, want string }{
		{"2027-04-17", "Sunset " + set + " CEST (after midnight, Sun 18 April)"},
		{"2027-04-18", "Sunset " + set + " CEST (ending the day before)"},
	} {
		sk := sky(t, c.day, c.day)
		es, err := sk.Entries(context.Background(), s, "hut", []config.KindSpec{{Kind: mustKinds(t, "daily-summary")[0]}}, date(c.day), date(c.day))
		if err != nil || len(es) != 1 {
			t.Fatalf("entries %v, %v; want one summary", es, err)
		}
		if d := es[0].Description; strings.Contains(d, "No sunset") || !strings.Contains(d, c.want) {
			t.Errorf("summary of %s alone does not say %q:\n%s", c.day, c.want, d)
		}
	}
}

// The index chart's day lengths are the feeds' (common practice: sunrise to
// sunset): at 78.2° N in mid-April, with sunsets after midnight, each
// date's Profile.Daylight is the daily summary's day length, so the chart's
// caption and photoperiod marks agree with the photoperiod entries.
func TestProfilesDayLengthIsTheSummarys(t *testing.T) {
	s := site(t, "isfjell-hut", 78.2, 15.6, "Arctic/Longyearbyen")
	sk := sky(t, "2027-04-10", "2027-04-25")
	events, _, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "daily-summary"), date("2027-04-10"), date("2027-04-25"))
	if err != nil {
		t.Fatal(err)
	}
	ps, err := sk.Profiles(PlaceOf(s), date("2027-04-10"), date("2027-04-25"))
	if err != nil || len(ps) != len(events) {
		t.Fatalf("%d profiles (%v) for %d summaries", len(ps), err, len(events))
	}
	for i, e := range events {
		if p := ps[i]; !p.Date.Equal(e.Date) || p.Daylight != e.DayLength {
			t.Errorf("%s: chart day length %v, summary %v", p.Date.Format(time.DateOnly), p.Daylight, e.DayLength)
		}
	}
	// 17 April: the day from 02:14 to 00:03 the next date, whole (PyEphem's
	// 21 h 48 min 10.879 s, see pyephemRise16)
	if d, want := ps[7].Daylight, pyephemSet17.Sub(pyephemRise17); !within(d, want) {
		t.Errorf("17 April: chart day length %v, PyEphem %v", d, want)
	}
}

// endsOfMidnightSun are the dates on which the midnight Sun ends at two
// sites, with PyEphem's crossings (tools/pyephem-checks/values.py,
// midnight_sun_tails): TestDayLengthEndOfMidnightSun,
// TestDirectSunEndOfMidnightSun.
var endsOfMidnightSun = []midnightSunEnd{
	{
		// 78.92° N, 11.93° E, CEST (UTC+2)
		name: "78.92N", zone: "Arctic/Longyearbyen", day0: "2027-08-26", day1: "2027-08-27", day2: "2027-08-28",
		lat: 78.92, lon: 11.93,
		lastSet: time.Date(2027, 8, 26, 22, 59, 39, 23e6, time.UTC),  // 00:59:39 CEST, 27 August
		rise1:   time.Date(2027, 8, 26, 23, 30, 44, 917e6, time.UTC), // 01:30:45 CEST, 27 August
		set1:    time.Date(2027, 8, 27, 22, 14, 28, 799e6, time.UTC), // 00:14:29 CEST, 28 August
		rise2:   time.Date(2027, 8, 28, 0, 15, 22, 857e6, time.UTC),  // 02:15:23 CEST, 28 August
		set2:    time.Date(2027, 8, 28, 21, 50, 15, 671e6, time.UTC), // 23:50:16 CEST, 28 August
	},
	{
		// McMurdo Station, 77.85° S, 166.67° E, NZDT (UTC+13)
		name: "77.85S", zone: "Antarctica/McMurdo", day0: "2027-02-19", day1: "2027-02-20", day2: "2027-02-21",
		lat: -77.85, lon: 166.67,
		lastSet: time.Date(2027, 2, 19, 12, 41, 48, 49e6, time.UTC),  // 01:41:48 NZDT, 20 February
		rise1:   time.Date(2027, 2, 19, 13, 34, 39, 625e6, time.UTC), // 02:34:40 NZDT, 20 February
		set1:    time.Date(2027, 2, 20, 12, 5, 44, 924e6, time.UTC),  // 01:05:45 NZDT, 21 February
		rise2:   time.Date(2027, 2, 20, 14, 10, 32, 570e6, time.UTC), // 03:10:33 NZDT, 21 February
		set2:    time.Date(2027, 2, 21, 11, 43, 33, 696e6, time.UTC), // 00:43:34 NZDT, 22 February
	},
}

type midnightSunEnd struct {
	name, zone, day0, day1, day2 string
	lat, lon                     float64
	lastSet, rise1, set1         time.Time
	rise2, set2                  time.Time
}

// checkDayLengths compares the daily summary's lengths of day1 and day2 and
// day2's change with PyEphem's days (sunrise to sunset), then the length the
// sunrise, photoperiod and lighting of day1 (byKind) and the chart give with
// the summary's; what names the length in the messages.
func (c midnightSunEnd) checkDayLengths(t *testing.T, sk *Sky, s *config.Site, summary, byKind map[string]Event, what string) {
	t.Helper()
	w1, w2 := c.set1.Sub(c.rise1), c.set2.Sub(c.rise2)
	d1, d2 := summary[c.day1], summary[c.day2]
	if !within(d1.DayLength, w1) || !within(d2.DayLength, w2) || !within(d2.DayChange, w2-w1) {
		t.Errorf("%s: %s %v; %s: %v, change %v; PyEphem: %v; %v, %v", c.day1, what, d1.DayLength, c.day2, d2.DayLength, d2.DayChange, w1, w2, w2-w1)
	}
	for _, k := range []string{"sunrise", "photoperiod:23h", "lighting:23h"} {
		if e, ok := byKind[k]; !ok || e.DayLength != d1.DayLength {
			t.Errorf("%s %s: %s %v (listed %v), want the summary's %v", c.day1, k, what, e.DayLength, ok, d1.DayLength)
		}
	}
	ps, err := sk.Profiles(PlaceOf(s), date(c.day1), date(c.day1))
	if err != nil || len(ps) != 1 || ps[0].Daylight != d1.DayLength {
		t.Errorf("%s: chart %+v (%v), want the summary's %s %v", c.day1, ps, err, what, d1.DayLength)
	}
}

// The date on which the midnight Sun ends, at two sites, against PyEphem
// (tools/pyephem-checks/values.py, midnight_sun_tails; the same Observer as
// pyephemRise16's, sea level; the Sun stays above −0.8333° for the 24 h
// before the first midnight, above −0.52° at 78.92° N and −0.56° at
// 77.85° S): the midnight Sun's last sunset comes after the date's midnight,
// and the date's day runs from its own sunrise to the sunset that ends it,
// after the next midnight (common practice). The minutes from midnight to
// the midnight Sun's last sunset are not the date's day: its day length, in
// the daily summary, the sunrise, the chart (Profiles), photoperiod and
// lighting, is sunrise to sunset alone, and the next date's change is the
// difference of the two days.
func TestDayLengthEndOfMidnightSun(t *testing.T) {
	for _, c := range endsOfMidnightSun {
		t.Run(c.name, func(t *testing.T) {
			s := site(t, "polar-"+c.name, c.lat, c.lon, c.zone)
			sk := sky(t, c.day0, c.day2)
			events, _, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "sunrise", "sunset", "daily-summary", "photoperiod:23h", "lighting:23h"), date(c.day0), date(c.day2))
			if err != nil {
				t.Fatal(err)
			}
			var rises, sets []time.Time
			summary := map[string]Event{}
			byKind := map[string]Event{} // the first of a kind on day1
			for _, e := range events {
				d := e.Date.Format(time.DateOnly)
				switch e.Kind.Name {
				case "sunrise":
					rises = append(rises, e.Start)
				case "sunset":
					sets = append(sets, e.Start)
				case "daily-summary":
					summary[d] = e
				}
				if _, ok := byKind[e.Kind.String()]; !ok && d == c.day1 {
					byKind[e.Kind.String()] = e
				}
			}
			if len(rises) < 2 || len(sets) < 2 {
				t.Fatalf("sunrises %v, sunsets %v: want two of each", rises, sets)
			}
			for i, p := range [][2]time.Time{{sets[0], c.lastSet}, {rises[0], c.rise1}, {sets[1], c.set1}, {rises[1], c.rise2}} {
				if !within(p[0].Sub(p[1]), 0) {
					t.Errorf("crossing %d: heliocal %s, PyEphem %s", i, p[0].Format(time.RFC3339Nano), p[1].Format(time.RFC3339Nano))
				}
			}
			if d0 := summary[c.day0]; d0.DayLength != 24*time.Hour {
				t.Errorf("%s (midnight Sun): day %v, want 24 h", c.day0, d0.DayLength)
			}
			c.checkDayLengths(t, sk, s, summary, byKind, "day length")
		})
	}
}

// The sunset that ends the midnight Sun on a date with a sunrise of its own
// ends a day of more than 24 h, which no date's day length counts
// (TestDayLengthEndOfMidnightSun): at 78.92° N, 11.93° E it comes at
// 00:59:39 CEST on 27 August 2027 (PyEphem, tools/pyephem-checks/values.py,
// midnight_sun_tails: 2027-08-26 22:59:39.023 UT), and its entry says it
// ends the midnight sun, as the daily summary says it of the sunrise that
// begins it, instead of the day length of the date's own day (22 h 44 min,
// from 01:31 to 00:14 the next date); the date's summary marks it.
func TestSunsetEndingMidnightSun(t *testing.T) {
	s := site(t, "isfjell", 78.92, 11.93, "Arctic/Longyearbyen")
	sk := sky(t, "2027-08-26", "2027-08-28")
	kinds := mustKinds(t, "sunset", "daily-summary")
	lastSet := time.Date(2027, 8, 26, 22, 59, 39, 23e6, time.UTC) // PyEphem, see above
	events, _, err := sk.Events(context.Background(), PlaceOf(s), kinds, date("2027-08-26"), date("2027-08-28"))
	if err != nil {
		t.Fatal(err)
	}
	var sets []Event
	for _, e := range events {
		if e.Kind.Name == "sunset" {
			sets = append(sets, e)
		}
	}
	if len(sets) != 3 || !within(sets[0].Start.Sub(lastSet), 0) {
		t.Fatalf("sunsets %v: want three, the first at PyEphem's %s", sets, lastSet.Format(time.RFC3339Nano))
	}
	if e := sets[0]; !e.LongDay || e.DayLength != 0 || e.DayChange != 0 {
		t.Errorf("the sunset ending the midnight Sun: long day %v, day length %v, change %v; want no day length", e.LongDay, e.DayLength, e.DayChange)
	}
	for _, e := range sets[1:] {
		if e.LongDay || e.DayLength == 0 {
			t.Errorf("sunset %s: long day %v, day length %v; want a day of its own", e.Start.Format(time.RFC3339), e.LongDay, e.DayLength)
		}
	}
	var specs []config.KindSpec
	for _, k := range kinds {
		specs = append(specs, config.KindSpec{Kind: k})
	}
	es, err := sk.Entries(context.Background(), s, "isfjell", specs, date("2027-08-27"), date("2027-08-27"))
	if err != nil {
		t.Fatal(err)
	}
	var set, summary string
	for _, e := range es {
		switch {
		case e.AllDay:
			summary = e.Description
		case set == "":
			set = e.Description
		}
	}
	want := "Sunset at 00:59:39 CEST, azimuth 356° (north).\nIt ends the midnight sun: the Sun had stayed up for more than a day."
	if !strings.HasPrefix(set, want) || strings.Contains(set, "Day length") {
		t.Errorf("sunset at 00:59:39 CEST:\n%s\nwant it to begin:\n%s", set, want)
	}
	if !strings.Contains(summary, "Sunset 01:00 CEST (ending the midnight sun: the Sun had stayed up for more than a day).\n") {
		t.Errorf("summary of 27 August does not mark its sunset at 01:00 as ending the midnight sun:\n%s", summary)
	}
}

// A civil dusk after midnight that ends the twilight of the day before is
// marked in the daily summary as a sunset after midnight is: at 59.9° N,
// 10.75° E (Europe/Oslo, CEST = UT + 2 h, tz database) the civil dusks of
// 6 June and 8 July 2027 pass midnight (PyEphem 4.1.4, Sun's centre at −6°,
// pressure 0, sea level: 2027-06-06 22:01:07 UT, 2027-07-08 22:00:20 UT,
// then 2027-07-09 21:57:38 UT, the evening's own).
func TestSummaryMarksCivilDuskAfterMidnight(t *testing.T) {
	s := site(t, "oslo", 59.9, 10.75, "Europe/Oslo")
	sk := sky(t, "2027-06-06", "2027-07-09")
	es, err := sk.Entries(context.Background(), s, "oslo", []config.KindSpec{{Kind: mustKinds(t, "daily-summary")[0]}}, date("2027-06-06"), date("2027-07-09"))
	if err != nil {
		t.Fatal(err)
	}
	byDate := map[string]string{}
	for _, e := range es {
		byDate[e.Date.Format(time.DateOnly)] = e.Description
	}
	for _, c := range []struct {
		date       string
		dusk       time.Time // PyEphem, UT
		has, lacks string
	}{
		{"2027-06-07", time.Date(2027, 6, 6, 22, 1, 7, 0, time.UTC), "Civil dusk 00:01 CEST (ending the day before).\n", ""},
		{"2027-07-09", time.Date(2027, 7, 8, 22, 0, 20, 0, time.UTC), "Civil dusk 00:00 CEST (ending the day before).\n", ""},
		{"2027-07-09", time.Date(2027, 7, 9, 21, 57, 38, 0, time.UTC), "Civil dusk 23:58 CEST.\n", "Civil dusk 23:58 CEST ("},
	} {
		if !strings.HasPrefix(c.has, "Civil dusk "+cestMinute(c.dusk)+" CEST") {
			t.Fatalf("PyEphem's dusk %s: the recorded value changed", cestMinute(c.dusk))
		}
		d := byDate[c.date]
		if !strings.Contains(d, c.has) || c.lacks != "" && strings.Contains(d, c.lacks) {
			t.Errorf("summary of %s lacks %q:\n%s", c.date, c.has, d)
		}
	}
	if d := byDate["2027-06-06"]; strings.Contains(d, "ending the day before") {
		t.Errorf("summary of 6 June (its dusk passed to 7 June) is marked:\n%s", d)
	}
}

// Over a skyline the day length is the time the Sun is over it, by the
// same rule as over the flat horizon: the end of the midnight Sun after a
// date's midnight is not the day of a date that has a sunrise of its own,
// and a day that runs past midnight counts on the date of its sunrise. The
// daily summary, sunrise, photoperiod, the chart and lighting (which
// counted it so before the others) give one length, and the sunset that
// ends the midnight Sun gives none. A skyline at one
// altitude all round gives exactly the results of that single horizon
// (README), so at 0° the flat horizon's PyEphem values apply
// (endsOfMidnightSun); over a skyline of hills the lengths are compared
// with each other, date by date, from ten days before the midnight Sun
// ends to twenty after.
func TestDirectSunEndOfMidnightSun(t *testing.T) {
	for _, c := range endsOfMidnightSun {
		t.Run(c.name+"/flat skyline", func(t *testing.T) {
			s := site(t, "polar-"+c.name, c.lat, c.lon, c.zone)
			s.Skyline = [][2]float64{{0, 0}, {90, 0}, {180, 0}, {270, 0}}
			sk := sky(t, c.day0, c.day2)
			events, _, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "sunrise", "sunset", "daily-summary", "photoperiod:23h", "lighting:23h"), date(c.day0), date(c.day2))
			if err != nil {
				t.Fatal(err)
			}
			summary := map[string]Event{}
			byKind := map[string]Event{} // the first of a kind on day1
			ended := false
			for _, e := range events {
				d := e.Date.Format(time.DateOnly)
				if e.Kind.Name == "daily-summary" {
					summary[d] = e
				}
				if e.Kind.Name == "sunset" && within(e.Start.Sub(c.lastSet), 0) {
					// the end of the midnight Sun: no date's day
					// (TestSunsetEndingMidnightSun)
					ended = true
					if !e.LongDay || e.DayLength != 0 {
						t.Errorf("the sunset ending the midnight Sun: long day %v, direct Sun %v; want none", e.LongDay, e.DayLength)
					}
				}
				if _, ok := byKind[e.Kind.String()]; !ok && d == c.day1 {
					byKind[e.Kind.String()] = e
				}
			}
			if !ended {
				t.Errorf("no sunset at PyEphem's %s, the end of the midnight Sun", c.lastSet.Format(time.RFC3339))
			}
			c.checkDayLengths(t, sk, s, summary, byKind, "direct Sun")
		})
		t.Run(c.name+"/hills", func(t *testing.T) {
			s := site(t, "polar-"+c.name, c.lat, c.lon, c.zone)
			s.Skyline = [][2]float64{{0, 1}, {90, 4}, {180, 8}, {270, 3}}
			first, last := date(c.day0).AddDate(0, 0, -10), date(c.day2).AddDate(0, 0, 20)
			sk := sky(t, first.Format(time.DateOnly), last.Format(time.DateOnly))
			events, _, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "daily-summary", "lighting:23h59m"), first, last)
			if err != nil {
				t.Fatal(err)
			}
			summary := map[time.Time]time.Duration{}
			for _, e := range events {
				if e.Kind.Name == "daily-summary" {
					summary[e.Date] = e.DayLength
				}
			}
			lamps := 0
			for _, e := range events {
				if e.Kind.Name != config.KindLighting {
					continue
				}
				lamps++
				if want, ok := summary[e.Date]; !ok || e.DayLength != want {
					t.Errorf("%s: lighting's direct Sun %v, the summary's %v", e.Date.Format(time.DateOnly), e.DayLength, want)
				}
			}
			if lamps < 20 {
				t.Errorf("%d lamp periods: want one on most dates, each compared", lamps)
			}
		})
	}
}

// Over a skyline the twilights are counted from the flat horizon: on a date
// the Sun stays above it but sets behind northern hills, the summary lists
// the sunset behind the skyline and says the Sun stays above the flat
// horizon, not "the Sun does not set". At 78.2° N, 15.6° E the Sun is at
// its lowest near 23:00 UTC on 10 May 2027, 5.96° up at azimuth 1.4°
// (PyEphem 4.1.4, geometric: 5°57'31"), under hills of 8° in the north and
// over the flat horizon.
func TestSkylineSummaryTwilightNote(t *testing.T) {
	s := site(t, "isfjell-hut", 78.2, 15.6, "Arctic/Longyearbyen")
	s.Skyline = [][2]float64{{0, 8}, {90, 2}, {180, 1}, {270, 2}}
	sk := sky(t, "2027-05-10", "2027-05-10")
	es, err := sk.Entries(context.Background(), s, "hut", []config.KindSpec{{Kind: mustKinds(t, "daily-summary")[0]}}, date("2027-05-10"), date("2027-05-10"))
	if err != nil || len(es) != 1 {
		t.Fatalf("entries %v, %v; want one summary", es, err)
	}
	d := es[0].Description
	if !strings.Contains(d, "Sunset ") || strings.Contains(d, "does not set") || !strings.Contains(d, "No civil dusk or dawn today: the Sun stays above the flat horizon.") {
		t.Errorf("summary over the skyline:\n%s", d)
	}
}
