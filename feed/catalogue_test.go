package feed

import (
	"context"
	"math"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"heliocal/astro"
	"heliocal/config"
)

func date(s string) time.Time {
	t, err := time.Parse(time.DateOnly, s)
	if err != nil {
		panic(err)
	}
	return t
}

func mustKinds(t *testing.T, names ...string) []config.Kind {
	t.Helper()
	var ks []config.Kind
	for _, n := range names {
		k, err := config.ParseKind(n)
		if err != nil {
			t.Fatal(err)
		}
		ks = append(ks, k)
	}
	return ks
}

func site(t *testing.T, id string, lat, lon float64, zone string) *config.Site {
	t.Helper()
	s := &config.Site{ID: id, Name: id, Latitude: lat, Longitude: lon}
	if err := s.TimeZone.UnmarshalText([]byte(zone)); err != nil {
		t.Fatal(err)
	}
	return s
}

func sky(t *testing.T, first, last string) *Sky {
	t.Helper()
	s, err := NewSky(date(first), date(last))
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// The USNO tables list an event under the date on which it falls in the
// table's zone: at 29° N 81° W in UT the sunset of the evening of 14 May 2019
// falls at 00:08 UT and is listed on 15 May, together with the sunrise of 15
// May at 10:33 UT. Source: USNO one-year table 'Rise and Set for the Sun',
// 29 00 N 81 00 W, Universal Time, 2019 (rows sun-0195, sun-0196);
// tolerance: the table's minute rounding (±1 min).
func TestEventsGroupedByLocalDate(t *testing.T) {
	s := site(t, "usno-29n81w", 29, -81, "UTC")
	sk := sky(t, "2019-05-14", "2019-05-16")
	events, notes, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "sunrise", "sunset"), date("2019-05-15"), date("2019-05-15"))
	if err != nil {
		t.Fatal(err)
	}
	if len(notes) != 0 {
		t.Errorf("notes = %v, want none (the Sun rises and sets at 29° N)", notes)
	}
	want := []struct {
		kind, utc string
	}{
		{"sunset", "2019-05-15T00:08Z"},  // USNO sun-0196 (the evening of 14 May)
		{"sunrise", "2019-05-15T10:33Z"}, // USNO sun-0195
	}
	if len(events) != len(want) {
		t.Fatalf("got %d events, want %d: %v", len(events), len(want), events)
	}
	for i, w := range want {
		e := events[i]
		ref, _ := time.Parse("2006-01-02T15:04Z", w.utc)
		if e.Kind.Name != w.kind || e.Date.Format(time.DateOnly) != "2019-05-15" {
			t.Errorf("event %d: %s on %s, want %s on 2019-05-15", i, e.Kind, e.Date.Format(time.DateOnly), w.kind)
		}
		if d := e.Start.Sub(ref); d < -90*time.Second || d > 90*time.Second {
			t.Errorf("%s: %s, USNO %s (%v off)", w.kind, e.Start.Format(time.RFC3339), w.utc, d)
		}
	}
}

// At 80° N the Sun stays up all day on 14 April 2015 and down all day on 21
// December 2015. Source: USNO one-year table 'Rise and Set for the Sun',
// N80 00 / 000 00, 2015, markers **** and ---- (rows sun-0169, sun-0182).
func TestPolarStatesBecomeOneNote(t *testing.T) {
	s := site(t, "usno-80n", 80, 0, "UTC")
	for _, tc := range []struct {
		day   string
		state astro.State
		title string
	}{
		{"2015-04-14", astro.AlwaysAbove, "the Sun does not set today"},
		{"2015-12-21", astro.AlwaysBelow, "the Sun does not rise today"},
	} {
		t.Run(tc.day, func(t *testing.T) {
			sk := sky(t, tc.day, tc.day)
			specs := []config.KindSpec{{Kind: mustKinds(t, "sunrise")[0]}, {Kind: mustKinds(t, "sunset")[0]}}
			entries, err := sk.Entries(context.Background(), s, "polar", specs, date(tc.day), date(tc.day))
			if err != nil {
				t.Fatal(err)
			}
			if len(entries) != 1 {
				t.Fatalf("got %d entries, want one all-day note: %+v", len(entries), entries)
			}
			e := entries[0]
			if !e.AllDay || !strings.Contains(e.Title, tc.title) {
				t.Errorf("entry = %q (all-day %v), want an all-day %q", e.Title, e.AllDay, tc.title)
			}
			if !e.Start.Equal(date(tc.day)) || !e.End.Equal(date(tc.day).AddDate(0, 0, 1)) {
				t.Errorf("all-day span %v..%v, want the date with an exclusive end", e.Start, e.End)
			}
		})
	}
}

// The astronomical seasons start at the equinoxes and solstices, and they are
// opposite in the two hemispheres: the March equinox starts spring in the
// north and autumn in the south (common practice).
func TestSeasonNamedForHemisphere(t *testing.T) {
	sk := sky(t, "2027-03-01", "2027-04-01")
	specs := []config.KindSpec{{Kind: mustKinds(t, "march-equinox")[0]}}
	for _, tc := range []struct {
		s    *config.Site
		want string
	}{
		{site(t, "north", 48.2, 16.4, "Europe/Vienna"), "March equinox: spring begins"},
		{site(t, "south", -41.3, 174.8, "Pacific/Auckland"), "March equinox: autumn begins"},
	} {
		entries, err := sk.Entries(context.Background(), tc.s, "seasons", specs, date("2027-03-01"), date("2027-04-01"))
		if err != nil {
			t.Fatal(err)
		}
		if len(entries) != 1 {
			t.Fatalf("%s: %d entries, want 1", tc.s.ID, len(entries))
		}
		if !strings.Contains(entries[0].Title, tc.want) {
			t.Errorf("%s: title %q, want %q", tc.s.ID, entries[0].Title, tc.want)
		}
		// The astronomical spring (north) lasts about 92.8 days (common
		// practice: the seasons are unequal because the orbit is an ellipse).
		if !strings.Contains(entries[0].Description, "lasts 92 d") {
			t.Errorf("%s: description %q does not give the season's length of about 92 d 18 h", tc.s.ID, entries[0].Description)
		}
	}
}

// A season that rounds to whole days gives its length without a zero part:
// the December solstice of 22 Dec 2027 02:42 UTC to the March equinox of
// 20 Mar 2028 02:17 UTC (USNO, "Earth's Seasons and Apsides", 2027 and 2028)
// is 88 d 23.6 h, "89 d", never "89 d 0 h".
func TestSeasonLengthWithoutZeroHours(t *testing.T) {
	sk := sky(t, "2027-12-01", "2028-01-01")
	specs := []config.KindSpec{{Kind: mustKinds(t, "december-solstice")[0]}}
	entries, err := sk.Entries(context.Background(), site(t, "north", 48.2, 16.4, "Europe/Vienna"), "seasons", specs, date("2027-12-01"), date("2028-01-01"))
	if err != nil {
		t.Fatal(err)
	}
	if len(entries) != 1 {
		t.Fatalf("%d entries, want 1", len(entries))
	}
	if d := entries[0].Description; !strings.Contains(d, "it lasts 89 d, until") {
		t.Errorf("description %q, want the season's length as \"it lasts 89 d, until\"", d)
	}
}

// A far-future equinox says how uncertain it is (the Earth's rotation is
// forecast: 9 s per decade after 2023, about a minute by 2090); a near one
// says nothing.
func TestFarFutureSeasonUncertain(t *testing.T) {
	s := site(t, "north", 48.2, 16.4, "Europe/Vienna")
	specs := []config.KindSpec{{Kind: mustKinds(t, "march-equinox")[0]}}
	for _, tc := range []struct {
		year string
		want string
	}{
		{"2030", ""},
		{"2090", "Uncertain by about ±1 min"},
	} {
		sk := sky(t, tc.year+"-03-01", tc.year+"-04-01")
		entries, err := sk.Entries(context.Background(), s, "seasons", specs, date(tc.year+"-03-01"), date(tc.year+"-04-01"))
		if err != nil || len(entries) != 1 {
			t.Fatalf("%s: %d entries, %v", tc.year, len(entries), err)
		}
		got := entries[0].Description
		if tc.want == "" && strings.Contains(got, "Uncertain") || tc.want != "" && !strings.Contains(got, tc.want) {
			t.Errorf("%s: description %q, want %q", tc.year, got, tc.want)
		}
	}
}

// Day length passes 12 h a few days before the March equinox at mid-northern
// latitudes, because sunrise and sunset are taken at the upper limb with
// refraction (the "equilux"; common practice, dates from memory: 16–18 March
// around 48° N).
func TestPhotoperiodTwelveHours(t *testing.T) {
	s := site(t, "mid", 48.2, 16.4, "Europe/Vienna")
	sk := sky(t, "2027-01-01", "2027-12-31")
	events, _, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "photoperiod:12h"), date("2027-01-01"), date("2027-12-31"))
	if err != nil {
		t.Fatal(err)
	}
	if len(events) != 2 {
		t.Fatalf("got %d crossings of 12 h in a year, want 2: %+v", len(events), events)
	}
	up, down := events[0], events[1]
	if up.Direction != astro.Rising || down.Direction != astro.Setting {
		t.Errorf("directions %v, %v; want rising then setting", up.Direction, down.Direction)
	}
	if d := up.Date.Format(time.DateOnly); d < "2027-03-15" || d > "2027-03-19" {
		t.Errorf("12 h reached on %s, want 15..19 March", d)
	}
	if d := down.Date.Format(time.DateOnly); d < "2027-09-24" || d > "2027-09-28" {
		t.Errorf("12 h lost on %s, want 24..28 September", d)
	}
	if up.DayLength < 12*time.Hour || up.DayLength-up.DayChange >= 12*time.Hour {
		t.Errorf("rising crossing: day length %v, day before %v; want the threshold between them", up.DayLength, up.DayLength-up.DayChange)
	}
}

// Golden hour (−4°..+6°) contains sunrise and sunset (−0.83°), and blue hour
// (−6°..−4°) ends where golden hour begins (common practice definitions).
func TestGoldenAndBlueHour(t *testing.T) {
	s := site(t, "mid", 48.2, 16.4, "Europe/Vienna")
	sk := sky(t, "2027-06-01", "2027-06-03")
	events, _, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "golden-hour", "blue-hour", "sunrise", "sunset"), date("2027-06-01"), date("2027-06-03"))
	if err != nil {
		t.Fatal(err)
	}
	byDay := map[string]map[string]Event{}
	for _, e := range events {
		d := e.Date.Format(time.DateOnly)
		if byDay[d] == nil {
			byDay[d] = map[string]Event{}
		}
		byDay[d][e.Kind.Name+"/"+e.Part] = e
	}
	for d, m := range byDay {
		gm, ge := m["golden-hour/morning"], m["golden-hour/evening"]
		bm, be := m["blue-hour/morning"], m["blue-hour/evening"]
		rise, set := m["sunrise/"], m["sunset/"]
		if !(gm.Start.Before(rise.Start) && rise.Start.Before(gm.End)) {
			t.Errorf("%s: sunrise %v outside morning golden hour %v..%v", d, rise.Start, gm.Start, gm.End)
		}
		if !(ge.Start.Before(set.Start) && set.Start.Before(ge.End)) {
			t.Errorf("%s: sunset %v outside evening golden hour %v..%v", d, set.Start, ge.Start, ge.End)
		}
		if !bm.End.Equal(gm.Start) || !be.Start.Equal(ge.End) {
			t.Errorf("%s: blue hour %v..%v / %v..%v does not meet golden hour %v / %v", d, bm.Start, bm.End, be.Start, be.End, gm.Start, ge.End)
		}
	}
	if len(byDay) != 3 {
		t.Errorf("got events on %d dates, want 3", len(byDay))
	}
}

// A calendar rebuilt the next day keeps the UID of every entry that both
// builds contain, so subscribed clients update entries in place (RFC 5545
// §3.8.4.7: UID identifies the component).
func TestUIDsStableAcrossRebuilds(t *testing.T) {
	cfg := config.Demo()
	day1 := time.Date(2027, 5, 10, 12, 0, 0, 0, time.UTC)
	uids := func(now time.Time) map[string]string {
		cat, err := NewCatalogue(cfg, Options{Now: now})
		if err != nil {
			t.Fatal(err)
		}
		out := map[string]string{}
		for i := range cfg.Feeds {
			f := &cfg.Feeds[i]
			cal, err := cat.Calendar(context.Background(), f)
			if err != nil {
				t.Fatal(err)
			}
			for _, e := range cal.Entries {
				key := f.ID + "|" + e.Kind + "|" + e.Date.Format(time.DateOnly) + "|" + e.Title[:min(len(e.Title), 12)]
				if _, dup := out[e.UID]; dup {
					t.Fatalf("feed %s: UID %s used twice", f.ID, e.UID)
				}
				out[e.UID] = key
			}
		}
		return out
	}
	a, b := uids(day1), uids(day1.AddDate(0, 0, 1))
	shared := 0
	for uid, key := range a {
		if other, ok := b[uid]; ok {
			shared++
			if other != key {
				t.Errorf("UID %s names %q in one build and %q in the next", uid, key, other)
			}
		}
	}
	if shared < len(a)*9/10 {
		t.Errorf("only %d of %d UIDs survive a one-day rebuild", shared, len(a))
	}
}

// Options of a kind: an offset shifts the event and names it, a label
// replaces the title, all_day makes a date entry.
func TestKindOptions(t *testing.T) {
	s := site(t, "mid", 48.2, 16.4, "Europe/Vienna")
	sk := sky(t, "2027-06-01", "2027-06-01")
	rise := mustKinds(t, "sunrise")[0]
	plain, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{{Kind: rise}}, date("2027-06-01"), date("2027-06-01"))
	if err != nil {
		t.Fatal(err)
	}
	shifted, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{{Kind: rise, Offset: config.Duration(-30 * time.Minute)}}, date("2027-06-01"), date("2027-06-01"))
	if err != nil {
		t.Fatal(err)
	}
	labelled, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{{Kind: rise, Label: "Open the vents", AllDay: true}}, date("2027-06-01"), date("2027-06-01"))
	if err != nil {
		t.Fatal(err)
	}
	if len(plain) != 1 || len(shifted) != 1 || len(labelled) != 1 {
		t.Fatalf("entries: %d, %d, %d; want 1 each", len(plain), len(shifted), len(labelled))
	}
	if d := plain[0].Start.Sub(shifted[0].Start); d != 30*time.Minute {
		t.Errorf("offset moved the entry by %v, want 30m", d)
	}
	if shifted[0].Title != "30 min before sunrise" {
		t.Errorf("offset title %q", shifted[0].Title)
	}
	if plain[0].UID == shifted[0].UID {
		t.Error("an offset variant shares the plain kind's UID")
	}
	if labelled[0].Title != "Open the vents" || !labelled[0].AllDay || !labelled[0].Start.Equal(date("2027-06-01")) {
		t.Errorf("labelled all-day entry = %+v", labelled[0])
	}
}

// TestOffsetPastMidnight checks that an entry moved past midnight by its
// offset says which date its time is on. Sunset at 23.13° N, 82.38° W on
// 12 March 2028: 23:37:47 UT (PyEphem 4.1.4, centre at −0.8333°, no
// refraction of its own), 19:37:47 CDT: Cuba's clocks go forward at 00:00
// that Sunday (IANA tz database, America/Havana); 5 h later is 00:37:47
// CDT on Monday 13 March.
func TestOffsetPastMidnight(t *testing.T) {
	s := site(t, "palm-yard", 23.13, -82.38, "America/Havana")
	sk := sky(t, "2028-03-01", "2028-03-31")
	set := mustKinds(t, "sunset")[0]
	for _, tc := range []struct {
		offset time.Duration
		want   string
	}{
		{5 * time.Hour, "5 h after sunset: 00:37:47 CDT the next day (Mon 13 Mar).\nSunset at 19:37:47 CDT"},
		{-5 * time.Hour, "5 h before sunset: 14:37:47 CDT.\nSunset at 19:37:47 CDT"},
	} {
		es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{{Kind: set, Offset: config.Duration(tc.offset)}}, date("2028-03-12"), date("2028-03-12"))
		if err != nil {
			t.Fatal(err)
		}
		if len(es) != 1 || !strings.HasPrefix(es[0].Description, tc.want) {
			t.Errorf("offset %v: %+v\nwant a description starting %q", tc.offset, es, tc.want)
		}
	}
	// an offset before the date's first instant: the day before. Sunrise
	// on 13 March 2028: 11:39:41 UT (PyEphem 4.1.4, the same observer),
	// 06:39:41 CDT; 8 h earlier is 22:39:41 CDT on Sunday 12 March
	rise := mustKinds(t, "sunrise")[0]
	es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{{Kind: rise, Offset: config.Duration(-8 * time.Hour)}}, date("2028-03-13"), date("2028-03-13"))
	if err != nil {
		t.Fatal(err)
	}
	if len(es) != 1 || !strings.Contains(es[0].Description, " the day before (Sun 12 Mar).\n") {
		t.Errorf("8 h before sunrise: %+v", es)
	}
}

// The caution about legal times is in every calendar's description, once,
// after the feed's own words and what its kinds' entries mean; of the
// entries only civil dawn and dusk (limits of aviation night in many rules)
// repeat it, not every sunrise. Golden hour and solar noon warn about
// looking at the Sun.
func TestCautions(t *testing.T) {
	s := site(t, "mid", 48.2, 16.4, "Europe/Vienna")
	sk := sky(t, "2027-06-01", "2027-06-01")
	specs := []config.KindSpec{}
	for _, k := range mustKinds(t, "sunrise", "civil-dusk", "golden-hour", "solar-noon", "daily-summary") {
		specs = append(specs, config.KindSpec{Kind: k})
	}
	f := &config.Feed{ID: "f", Description: "Our own words.", Kinds: specs}
	cal, err := sk.Calendar(context.Background(), s, f, date("2027-06-01"), date("2027-06-01"), Options{})
	if err != nil {
		t.Fatal(err)
	}
	caution := CalendarCaution(PlaceOf(s).Observer)
	if want := "Our own words.\n\n" + strings.Join(kindMeanings(s, specs), "\n") + "\n\n" + caution; cal.Description != want ||
		strings.Count(cal.Description, "local rules") != 1 || !strings.Contains(caution, "local rules") ||
		!strings.Contains(caution, "hunting hours") || !strings.Contains(caution, cautionEyes) {
		t.Errorf("calendar description %q", cal.Description)
	}
	for _, e := range cal.Entries {
		legal := strings.Contains(e.Description, "local rules decide")
		switch e.Kind {
		case "civil-dusk":
			if !legal {
				t.Errorf("%s: description lacks the legal caution:\n%s", e.Kind, e.Description)
			}
		case "golden-hour", "solar-noon":
			if !strings.Contains(e.Description, cautionEyes) {
				t.Errorf("%s: description lacks %q:\n%s", e.Kind, cautionEyes, e.Description)
			}
		default:
			if legal {
				t.Errorf("%s: the caution repeated on the entry:\n%s", e.Kind, e.Description)
			}
		}
	}
}

// Daily summaries: one all-day entry per date. In the week after the March
// equinox the day at 48° N lasts a little over 12 h, growing by about 3
// minutes a day (common practice; from memory: 12 h 30 m – 13 h around
// 26 March–1 April at Vienna's latitude).
func TestDailySummary(t *testing.T) {
	s := site(t, "mid", 48.2, 16.4, "Europe/Vienna")
	sk := sky(t, "2027-03-25", "2027-04-02")
	specs := []config.KindSpec{{Kind: mustKinds(t, "daily-summary")[0]}}
	entries, err := sk.Entries(context.Background(), s, "f", specs, date("2027-03-26"), date("2027-04-01"))
	if err != nil {
		t.Fatal(err)
	}
	if len(entries) != 7 {
		t.Fatalf("%d summaries for 7 dates", len(entries))
	}
	for _, e := range entries {
		if !e.AllDay || !strings.HasPrefix(e.Title, "Daylight 12 h") && !strings.HasPrefix(e.Title, "Daylight 13 h") {
			t.Errorf("summary %q (all-day %v)", e.Title, e.AllDay)
		}
		for _, w := range []string{"Sunrise", "Sunset", "Civil dawn", "Civil dusk"} {
			if !strings.Contains(e.Description, w) {
				t.Errorf("%s: summary lacks %s:\n%s", e.Date.Format(time.DateOnly), w, e.Description)
			}
		}
	}
	// 28 March 2027 is the switch to summer time in Vienna (EU rule, last
	// Sunday of March): the summary's clock times change zone.
	if !strings.Contains(entries[1].Description, "CET") || !strings.Contains(entries[3].Description, "CEST") {
		t.Errorf("summaries around the clock change do not follow the zone:\n%s\n%s", entries[1].Description, entries[3].Description)
	}
}

// A date without moonrise becomes an all-day note, never a missing or
// invented event. Source: USNO one-year table 'Rise and Set for the Moon',
// Ithaca NY (42 27 N, 76 30 W), 2015, fixed zone UTC−4: no moonrise on 10
// March 2015 (row moon-0007).
func TestNoMoonriseNote(t *testing.T) {
	s := site(t, "ithaca", 42.45, -76.5, "Etc/GMT+4")
	sk := sky(t, "2015-03-09", "2015-03-11")
	specs := []config.KindSpec{{Kind: mustKinds(t, "moonrise")[0]}}
	entries, err := sk.Entries(context.Background(), s, "moon", specs, date("2015-03-09"), date("2015-03-11"))
	if err != nil {
		t.Fatal(err)
	}
	var notes, rises int
	for _, e := range entries {
		if e.AllDay {
			notes++
			if e.Date.Format(time.DateOnly) != "2015-03-10" || e.Title != "No moonrise today" {
				t.Errorf("note %q on %s, want \"No moonrise today\" on 2015-03-10", e.Title, e.Date.Format(time.DateOnly))
			}
		} else {
			rises++
		}
	}
	if notes != 1 || rises != 2 {
		t.Errorf("%d notes and %d moonrises over 9–11 March, want 1 and 2", notes, rises)
	}
}

// Full moon lands on its local date with the illumination in the text.
// Source: USNO moon-phase data service, full moon 2020-01-10 19:21 UT (row
// mp-0053); tolerance ±2 min (the table's minute rounding and the method).
func TestFullMoonEntry(t *testing.T) {
	sk := sky(t, "2020-01-01", "2020-01-31")
	s := site(t, "south", -41.3, 174.8, "Pacific/Auckland") // UTC+13 in January: 11 January locally
	events, _, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "moon-phases"), date("2020-01-01"), date("2020-01-31"))
	if err != nil {
		t.Fatal(err)
	}
	ref := time.Date(2020, 1, 10, 19, 21, 0, 0, time.UTC)
	found := false
	var prev string
	for _, e := range events {
		if e.Kind.Name == prev {
			t.Errorf("%s twice in a row", prev)
		}
		prev = e.Kind.Name
		if e.Kind.Name != "full-moon" || e.Start.Sub(ref).Abs() > 12*time.Hour {
			continue
		}
		found = true
		if d := e.Start.Sub(ref).Abs(); d > 2*time.Minute {
			t.Errorf("full moon %s, USNO %s", e.Start.Format(time.RFC3339), ref.Format(time.RFC3339))
		}
		if e.Date.Format(time.DateOnly) != "2020-01-11" {
			t.Errorf("full moon on local date %s, want 2020-01-11 in Auckland", e.Date.Format(time.DateOnly))
		}
		if e.Illuminated < 0.99 {
			t.Errorf("full moon %.3f lit", e.Illuminated)
		}
	}
	if !found {
		t.Error("no full moon near 2020-01-10 19:21 UT")
	}
}

// A dark window lies inside astronomical night: never while the Sun is above
// −18° (the definition of astronomical twilight; common practice).
func TestDarkWindowsInsideAstronomicalNight(t *testing.T) {
	s := site(t, "obs", 39.08, -105.42, "America/Denver")
	sk := sky(t, "2027-01-01", "2027-02-28")
	events, notes, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "dark-window", "astronomical-dusk", "astronomical-dawn"), date("2027-01-01"), date("2027-02-27"))
	if err != nil {
		t.Fatal(err)
	}
	var windows int
	for _, e := range events {
		if e.Kind.Name != "dark-window" {
			continue
		}
		windows++
		for _, t2 := range []time.Time{e.Start.Add(time.Second), e.End.Add(-time.Second)} {
			h, err := sk.eph.SunAltitude(PlaceOf(s).Observer, t2)
			if err != nil {
				t.Fatal(err)
			}
			if h > -18 {
				t.Errorf("dark window %v..%v: Sun at %.4f° at %v", e.Start, e.End, h, t2)
			}
		}
	}
	if windows < 40 {
		t.Errorf("%d dark windows in 58 winter nights at 39° N, want most nights", windows)
	}
	for _, n := range notes {
		if n.Kind.Name == "dark-window" && n.State != astro.AlwaysBelow {
			t.Errorf("%s: winter night at 39° N without astronomical night", n.Date.Format(time.DateOnly))
		}
	}
}

// Cross-quarter days are named by the Sun's apparent longitude at the
// instant (the definition: 45°, 135°, 225°, 315°, midway between equinoxes
// and solstices): early February is 315°, between the December solstice and
// the March equinox; early May 45°, early August 135°, early November 225°.
func TestCrossQuarterLabels(t *testing.T) {
	s := site(t, "mid", 48.2, 16.4, "Europe/Vienna")
	sk := sky(t, "2027-01-01", "2027-12-31")
	events, _, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "cross-quarter"), date("2027-01-01"), date("2027-12-31"))
	if err != nil {
		t.Fatal(err)
	}
	want := map[time.Month]struct{ part, between string }{
		time.February: {"315", "the December solstice and the March equinox"},
		time.May:      {"45", "the March equinox and the June solstice"},
		time.August:   {"135", "the June solstice and the September equinox"},
		time.November: {"225", "the September equinox and the December solstice"},
	}
	if len(events) != 4 {
		t.Fatalf("%d cross-quarter days in 2027", len(events))
	}
	for _, e := range events {
		w, ok := want[e.Date.Month()]
		if !ok || e.Part != w.part {
			t.Errorf("%s: part %q, want %q", e.Date.Format(time.DateOnly), e.Part, w.part)
			continue
		}
		p, err := astro.Sun(e.Start)
		if err != nil {
			t.Fatal(err)
		}
		if d := math.Abs(math.Remainder(p.Longitude-mustFloat(t, e.Part), 360)); d > 1e-4 {
			t.Errorf("%s: the Sun is at %.4f°, labelled %s°", e.Date.Format(time.DateOnly), p.Longitude, e.Part)
		}
		_, _, desc := describe(newSiteInfo(s), e)
		if !strings.Contains(desc, "longitude "+w.part+"°") || !strings.Contains(desc, w.between) {
			t.Errorf("%s: description %q", e.Date.Format(time.DateOnly), desc)
		}
	}
}

func mustFloat(t *testing.T, s string) float64 {
	t.Helper()
	f, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatal(err)
	}
	return f
}

// A site with only temperature_c takes the standard atmosphere's pressure
// at its elevation (ICAO: 963.8 hPa at 420 m), says so in the calendar's
// description where it says what a sunrise is,
// and a cold morning's sunrise comes earlier than with the standard
// refraction (Meeus ch. 16: refraction ∝ P/(273+T)).
func TestSiteAtmosphere(t *testing.T) {
	std := site(t, "std", 48.2, 16.4, "Europe/Vienna")
	std.Elevation = 420
	cold := *std
	minus20 := -20.0
	cold.Temperature = &minus20
	if o := PlaceOf(&cold).Observer; math.Abs(o.Pressure-963.8) > 0.1 || o.Temperature != -20 {
		t.Fatalf("observer %+v, want 963.8 hPa and −20 °C", o)
	}
	sk := sky(t, "2027-01-15", "2027-01-15")
	specs := []config.KindSpec{{Kind: mustKinds(t, "sunrise")[0]}}
	a, err := sk.Entries(context.Background(), std, "x", specs, date("2027-01-15"), date("2027-01-15"))
	if err != nil {
		t.Fatal(err)
	}
	b, err := sk.Entries(context.Background(), &cold, "x", specs, date("2027-01-15"), date("2027-01-15"))
	if err != nil {
		t.Fatal(err)
	}
	if !b[0].Start.Before(a[0].Start) {
		t.Errorf("cold sunrise %v not before standard %v", b[0].Start, a[0].Start)
	}
	f := &config.Feed{ID: "x", Kinds: specs}
	// the dip of 420 m, 1.76′·√420 = 36′ (N. Bowditch, The American Practical Navigator, dip of the sea horizon)
	if da, db := CalendarDescription(std, f), CalendarDescription(&cold, f); !strings.Contains(db, "Sunrise: the Sun's upper limb appears over a horizon 36′ below eye level, as seen from 420 m (refraction for 964 hPa and −20 °C).") ||
		!strings.Contains(da, "Sunrise: the Sun's upper limb appears over a horizon 36′ below eye level, as seen from 420 m (standard refraction).") {
		t.Errorf("calendar descriptions:\n%s\n%s", da, db)
	}
}

// Light bands: sun-band:-6..-0.8333 runs in the morning from civil dawn to
// sunrise, checked against the USNO tables for Ithaca, 1 January 2015
// (testdata/reference/sun-times.csv sun-0003 civil dawn 08:04 and sun-0001
// sunrise 08:36 at UTC−04:00: USNO one-year tables 'Civil Twilight' and
// 'Rise and Set for the Sun', minute rounding); golden hour with its
// high bound raised to 8° starts as early and ends later than the default
// (6°), and sun-band:-4..6 gives exactly the default golden hour.
func TestLightBands(t *testing.T) {
	s := site(t, "ithaca", 42.45, -76.5, "America/New_York")
	sk := sky(t, "2015-01-01", "2015-01-01")
	ev, _, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "sun-band:-6..-0.8333"), date("2015-01-01"), date("2015-01-01"))
	if err != nil {
		t.Fatal(err)
	}
	var morning *Event
	for i := range ev {
		if ev[i].Part == "morning" {
			morning = &ev[i]
		}
	}
	if morning == nil {
		t.Fatalf("no morning band in %+v", ev)
	}
	for _, c := range []struct {
		got  time.Time
		want string
	}{{morning.Start, "2015-01-01T12:04:00Z"}, {morning.End, "2015-01-01T12:36:00Z"}} {
		w, _ := time.Parse(time.RFC3339, c.want)
		if d := c.got.Sub(w); d < -time.Minute || d > time.Minute {
			t.Errorf("band bound %s, USNO %s", c.got.Format(time.RFC3339), c.want)
		}
	}

	v := site(t, "mid", 48.2, 16.4, "Europe/Vienna")
	sk = sky(t, "2027-06-01", "2027-06-01")
	golden := config.KindSpec{Kind: mustKinds(t, "golden-hour")[0]}
	eight := 8.0
	wide := golden
	wide.High = &eight
	band := config.KindSpec{Kind: mustKinds(t, "sun-band:-4..6")[0]}
	var spans [3][]Event
	for i, sp := range []config.KindSpec{golden, wide, band} {
		spans[i], _, err = sk.EventsFor(context.Background(), PlaceOf(v), []config.KindSpec{sp}, date("2027-06-01"), date("2027-06-01"))
		if err != nil || len(spans[i]) != 2 {
			t.Fatalf("%v: %d spans, %v", sp.Kind, len(spans[i]), err)
		}
	}
	for j := range 2 {
		g, w, b := spans[0][j], spans[1][j], spans[2][j]
		if w.End.Sub(w.Start) <= g.End.Sub(g.Start) || w.High != 8 {
			t.Errorf("%s: golden hour to 8° (%v) not longer than to 6° (%v)", g.Part, w.End.Sub(w.Start), g.End.Sub(g.Start))
		}
		if !b.Start.Equal(g.Start) || !b.End.Equal(g.End) {
			t.Errorf("%s: sun-band:-4..6 %v–%v, golden hour %v–%v", g.Part, b.Start, b.End, g.Start, g.End)
		}
	}
}

// A night belongs to the date of its evening (noon to noon): a dark window
// that starts after midnight is listed under the evening before, its start
// says "the next day" with its date (once: the end is on that date too), and
// its title and a night's note name the night.
func TestNightDates(t *testing.T) {
	s := site(t, "oslo", 60, 10.75, "Europe/Oslo")
	loc := s.TimeZone.Location
	sk := sky(t, "2027-02-01", "2027-02-28")
	specs := []config.KindSpec{{Kind: mustKinds(t, "dark-window")[0], MaxIllumination: 0.3}}
	events, _, err := sk.EventsFor(context.Background(), PlaceOf(s), specs, date("2027-02-12"), date("2027-02-12"))
	if err != nil {
		t.Fatal(err)
	}
	if len(events) != 1 {
		t.Fatalf("%d dark windows on the night of 12–13 February", len(events))
	}
	e := events[0]
	if e.Date != date("2027-02-12") || localDate(e.Start, loc) != date("2027-02-13") {
		t.Fatalf("window %s listed on %s; want one after midnight listed on the evening's date", e.Start.In(loc), e.Date.Format(time.DateOnly))
	}
	title, _, desc := describe(newSiteInfo(s), e)
	if !strings.Contains(title, "night of 12–13 February 2027") || !strings.Contains(desc, " CET the next day (Sat 13 Feb) to 05:") || strings.Count(desc, "next day") != 1 || !strings.HasPrefix(desc, "Dark sky on the night of 12–13 February 2027 from 01:") {
		t.Errorf("title %q, description %q", title, desc)
	}
	// a window's length is written as every other duration: "14 h 02 min"
	e.End = e.Start.Add(14*time.Hour + 2*time.Minute)
	if title, _, desc := describe(newSiteInfo(s), e); !strings.HasPrefix(title, "Dark sky, 14 h 02 min, night of") || !strings.Contains(desc, "(14 h 02 min)") {
		t.Errorf("title %q, description %q", title, desc)
	}
	n := Note{Kind: mustKinds(t, "dark-window")[0], Date: date("2027-02-13"), State: astro.AlwaysBelow}
	title, _, desc = describeNote(newSiteInfo(s), n)
	if !strings.HasPrefix(title, "No dark sky on the night of 13–14 February 2027") {
		t.Errorf("note %q", title)
	}
	// the description names the night once, not again as a date
	if strings.Count(desc, "February") != 1 || !strings.Contains(desc, "night of 13–14 February 2027") {
		t.Errorf("note's description %q names the night more than once", desc)
	}
	for _, c := range []struct {
		t    string
		want string
	}{
		{"2027-02-12T23:59:59.4+01:00", ""}, {"2027-02-12T23:59:59.6+01:00", " +1 day"}, {"2027-02-14T00:10:00+01:00", " +2 days"},
		{"2027-02-11T23:00:00+01:00", " −1 day"},
	} {
		tm, _ := time.Parse(time.RFC3339Nano, c.t)
		if got := DayMark(tm, date("2027-02-12"), loc); got != c.want {
			t.Errorf("DayMark(%s) = %q, want %q", c.t, got, c.want)
		}
	}
	if got := NightOf(date("2027-12-31"), nil); got != "night of 31 December 2027–1 January 2028" {
		t.Errorf("NightOf: %q", got)
	}
	if got := NightOf(date("2027-03-31"), nil); got != "night of 31 March–1 April 2027" {
		t.Errorf("NightOf: %q", got)
	}
	// zdump -v Pacific/Apia: 2011-12-29 23:59:59 −10 is followed by
	// 2011-12-31 00:00:00 +14, so the night of the 29th ends on the 31st
	apia, err := time.LoadLocation("Pacific/Apia")
	if err != nil {
		t.Fatal(err)
	}
	if got := NightOf(date("2011-12-29"), apia); got != "night of 29–31 December 2011" {
		t.Errorf("NightOf in Pacific/Apia: %q", got)
	}
	if got := NightOf(date("2011-12-28"), apia); got != "night of 28–29 December 2011" {
		t.Errorf("NightOf in Pacific/Apia: %q", got)
	}
}

// A photoperiod threshold never crossed in the window gets one note saying
// so, with the longest day. At 9.9° N the longest day is 12 h 42 min on the
// June solstice and the shortest 11 h 33 min on the December solstice: the
// standard sunrise equation (Meeus, Astronomical Algorithms, ch. 15:
// cos H₀ = (sin −0.8333° − sin φ sin δ) / (cos φ cos δ), δ = ±23.44°) gives
// H₀ = 95.27° (12.70 h) and 86.59° (11.55 h).
func TestPhotoperiodNeverReached(t *testing.T) {
	s := site(t, "tropic", 9.9, -84.1, "America/Costa_Rica")
	sk := sky(t, "2027-01-01", "2027-12-31")
	events, notes, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "photoperiod:14h", "photoperiod:10h"), date("2027-01-01"), date("2027-12-31"))
	if err != nil {
		t.Fatal(err)
	}
	if len(events) != 0 || len(notes) != 2 {
		t.Fatalf("%d events, %d notes; want none and two", len(events), len(notes))
	}
	want := map[string]string{
		"photoperiod:14h": "Day length never reaches 14 h here (longest 12 h 42 min, 21 June)",
		"photoperiod:10h": "Day length never falls below 10 h here (shortest 11 h 33 min, 21 December)",
	}
	for _, n := range notes {
		if got := NotReachedText(n); !strings.HasPrefix(got, want[n.Kind.String()]) || n.Date != date("2027-01-01") {
			t.Errorf("%s on %s: %q, want %q", n.Kind, n.Date.Format(time.DateOnly), got, want[n.Kind.String()])
		}
	}
	// a shorter window says which dates
	_, notes, _ = sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "photoperiod:14h"), date("2027-01-01"), date("2027-03-31"))
	if len(notes) != 1 || !strings.HasPrefix(NotReachedText(notes[0]), "Day length stays below 14 h from 1 January to 31 March 2027 (longest 12 h ") ||
		!strings.HasSuffix(NotReachedText(notes[0]), ", 31 March)") {
		t.Errorf("notes %+v: %q", notes, NotReachedText(notes[0]))
	}
	// in the feed: one all-day entry
	entries, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{{Kind: mustKinds(t, "photoperiod:14h")[0]}}, date("2027-01-01"), date("2027-12-31"))
	if err != nil || len(entries) != 1 || !entries[0].AllDay || !strings.HasPrefix(entries[0].Title, "Day length never reaches 14 h here") {
		t.Errorf("entries %+v, %v", entries, err)
	}
}

// A photoperiod note on the dates a filter keeps says when the longest (or
// shortest) day it names lies outside them: at 9.9° N the longest day is
// 12 h 42 min on 21 June (the values of TestPhotoperiodNeverReached), a
// Monday in 2027, which months jan..mar, weekends or a list of March dates
// leave out, and months may..jul keep. In the feed and in the events of
// the kinds entry alike.
func TestPhotoperiodNoteOutsideKeptDates(t *testing.T) {
	s := site(t, "tropic", 9.9, -84.1, "America/Costa_Rica")
	sk := sky(t, "2027-01-01", "2027-12-31")
	const longest = "Day length never reaches 14 h here (longest 12 h 42 min, 21 June"
	for _, tc := range []struct {
		name                    string
		weekdays, months, dates []string
		want                    string
	}{
		{"first quarter", nil, []string{"jan", "feb", "mar"}, nil, longest + ", outside the months this feed keeps)"},
		{"summer", nil, []string{"may", "jun", "jul"}, nil, longest + ")"},
		{"weekends", []string{"sat", "sun"}, nil, nil, longest + ", a day of the week this feed leaves out)"},
		{"dates", nil, nil, []string{"2027-03-01", "2027-03-08"}, longest + ", not among the dates this feed keeps)"},
		{"none", nil, nil, nil, longest + ")"},
	} {
		spec := config.KindSpec{Kind: mustKinds(t, "photoperiod:14h")[0], Weekdays: tc.weekdays, Months: tc.months, Dates: tc.dates}
		entries, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date("2027-01-01"), date("2027-12-31"))
		if err != nil || len(entries) != 1 || entries[0].Title != tc.want {
			t.Errorf("%s: entries %+v, %v; want one titled %q", tc.name, entries, err, tc.want)
		}
		_, notes, err := sk.EventsFor(context.Background(), PlaceOf(s), []config.KindSpec{spec}, date("2027-01-01"), date("2027-12-31"))
		if err != nil || len(notes) != 1 || NotReachedText(notes[0]) != tc.want {
			t.Errorf("%s: notes %+v, %v; want one saying %q", tc.name, notes, err, tc.want)
		}
	}
}

// A site with a skyline (the demo's invented valley: a 25° peak due south):
// on the winter solstice one sunrise (first appearance) and one sunset (last
// disappearance), the Sun hidden behind the peak around noon as a
// sun-hidden span, and the direct Sun of the date equal to sunset − sunrise
// − the hidden span (to the millisecond rounding). A skyline at 2° all
// round gives the same events as horizon: 2.
func TestSkylineSite(t *testing.T) {
	s := site(t, "valley", 47.05, 11.2, "Europe/Vienna")
	s.Skyline = [][2]float64{{0, 3}, {100, 12}, {150, 4}, {176, 25}, {184, 25}, {190, 4}, {260, 15}, {300, 3}}
	sk := sky(t, "2027-12-21", "2027-12-21")
	ev, _, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "sunrise", "sunset", "sun-hidden"), date("2027-12-21"), date("2027-12-21"))
	if err != nil {
		t.Fatal(err)
	}
	by := map[string][]Event{}
	for _, e := range ev {
		by[e.Kind.Name] = append(by[e.Kind.Name], e)
	}
	if len(by["sunrise"]) != 1 || len(by["sunset"]) != 1 || len(by["sun-hidden"]) != 1 {
		t.Fatalf("events %+v", by)
	}
	rise, set, hid := by["sunrise"][0], by["sunset"][0], by["sun-hidden"][0]
	if !rise.DirectSun || !(hid.Start.After(rise.Start) && hid.End.Before(set.Start)) || hid.Azimuth < 150 || hid.Azimuth > 190 {
		t.Errorf("sunrise %v, hidden %v–%v at %.1f°, sunset %v", rise.Start, hid.Start, hid.End, hid.Azimuth, set.Start)
	}
	direct := set.Start.Sub(rise.Start) - hid.End.Sub(hid.Start)
	if d := rise.DayLength - direct; d.Abs() > 2*time.Millisecond {
		t.Errorf("direct Sun %v, sunset − sunrise − hidden %v", rise.DayLength, direct)
	}

	flat := site(t, "flat", 47.05, 11.2, "Europe/Vienna")
	flat.Skyline = [][2]float64{{0, 2}, {180, 2}}
	hill := site(t, "hill", 47.05, 11.2, "Europe/Vienna")
	hill.Horizon = 2
	a, _, err := sk.Events(context.Background(), PlaceOf(flat), mustKinds(t, "sunrise", "sunset"), date("2027-12-21"), date("2027-12-21"))
	if err != nil {
		t.Fatal(err)
	}
	b, _, err := sk.Events(context.Background(), PlaceOf(hill), mustKinds(t, "sunrise", "sunset"), date("2027-12-21"), date("2027-12-21"))
	if err != nil || len(a) != len(b) {
		t.Fatalf("%d and %d events, %v", len(a), len(b), err)
	}
	for i := range a {
		if !a[i].Start.Equal(b[i].Start) || a[i].DayLength != b[i].DayLength {
			t.Errorf("flat skyline %v, horizon 2 %v", a[i].Start, b[i].Start)
		}
	}
}

// noon-clear at a site with a 25° peak due south (47.05° N): the noon Sun
// goes behind it in mid-November and clears it again at the end of January;
// on each date the Sun's noon altitude is within the day's change (0.4°) of
// the altitude at which its upper limb meets a 25° skyline (the noon
// altitude is 90° − φ + δ, Meeus ch. 13: δ ≈ −18° then).
func TestNoonClear(t *testing.T) {
	s := site(t, "valley", 47.05, 11.2, "Europe/Vienna")
	s.Skyline = [][2]float64{{0, 3}, {100, 12}, {150, 4}, {176, 25}, {184, 25}, {190, 4}, {260, 15}, {300, 3}}
	sk := sky(t, "2027-01-01", "2027-12-31")
	ev, _, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "noon-clear"), date("2027-01-01"), date("2027-12-31"))
	if err != nil {
		t.Fatal(err)
	}
	if len(ev) != 2 || ev[0].Direction != astro.Rising || ev[1].Direction != astro.Setting {
		t.Fatalf("events %+v", ev)
	}
	if m := ev[0].Date.Month(); m != time.January && m != time.February {
		t.Errorf("noon Sun back on %s", ev[0].Date.Format(time.DateOnly))
	}
	if m := ev[1].Date.Month(); m != time.November {
		t.Errorf("noon Sun behind the peak from %s", ev[1].Date.Format(time.DateOnly))
	}
	limb := astro.Observer{Horizon: 25}.RiseSetAltitude()
	for _, e := range ev {
		if d := e.Altitude - limb; d < -0.4 || d > 0.4 {
			t.Errorf("%s: noon altitude %.2f°, the limb meets 25° at %.2f°", e.Date.Format(time.DateOnly), e.Altitude, limb)
		}
	}
}

// Moonrise and moonset at a site with a skyline (the demo's invented
// valley) over a month: each is one of the Moon's crossings of the skyline
// (astro.MoonSkylineCrossings), the first appearance or last disappearance
// of a passage, and the description says so. A skyline at 2° all round
// gives the same events as horizon: 2.
func TestSkylineMoon(t *testing.T) {
	s := site(t, "valley", 47.05, 11.2, "Europe/Vienna")
	s.Skyline = [][2]float64{{0, 3}, {100, 12}, {150, 4}, {176, 25}, {184, 25}, {190, 4}, {260, 15}, {300, 3}}
	sk := sky(t, "2027-03-01", "2027-03-31")
	kinds := mustKinds(t, "moonrise", "moonset")
	ev, notes, err := sk.Events(context.Background(), PlaceOf(s), kinds, date("2027-03-01"), date("2027-03-31"))
	if err != nil {
		t.Fatal(err)
	}
	me, err := sk.moonEphemeris()
	if err != nil {
		t.Fatal(err)
	}
	p := PlaceOf(s)
	all, err := me.MoonSkylineCrossings(p.Observer, p.Skyline, date("2027-02-27"), date("2027-04-03"))
	if err != nil {
		t.Fatal(err)
	}
	if len(ev) < 56 || len(notes) < 2 || len(all) <= len(ev)+2 {
		t.Fatalf("%d events, %d notes, %d skyline crossings (want the Moon hidden behind a peak on some days)", len(ev), len(notes), len(all))
	}
	for _, e := range ev {
		i := slices.IndexFunc(all, func(c astro.Crossing) bool { return c.Time.Equal(e.Start) })
		if i < 0 || all[i].Direction != e.Direction {
			t.Fatalf("%s %v is not a crossing of the skyline", e.Kind.Name, e.Start)
		}
		// a moonrise follows a moonset or a stretch below the skyline
		// longer than a hidden moment behind a peak
		if e.Direction == astro.Rising && i > 0 && e.Start.Sub(all[i-1].Time) < 2*time.Hour {
			t.Errorf("moonrise %v only %v after the Moon went behind the skyline: a reappearance", e.Start, e.Start.Sub(all[i-1].Time))
		}
		// the entry says it is over the skyline; what that means is in
		// the calendar's description
		_, _, desc := describe(newSiteInfo(s), e)
		if !strings.HasPrefix(desc, plainNames[e.Kind.Name]+" over the skyline at ") || strings.Contains(desc, "limb") {
			t.Errorf("%s: %q", e.Kind.Name, desc)
		}
		if m := kindMeanings(s, []config.KindSpec{{Kind: e.Kind}}); len(m) == 0 || !strings.Contains(m[0], "the site's skyline") {
			t.Errorf("%s: meaning %q", e.Kind.Name, m)
		}
	}

	flat := site(t, "flat", 47.05, 11.2, "Europe/Vienna")
	flat.Skyline = [][2]float64{{0, 2}, {180, 2}}
	hill := site(t, "hill", 47.05, 11.2, "Europe/Vienna")
	hill.Horizon = 2
	a, _, err := sk.Events(context.Background(), PlaceOf(flat), kinds, date("2027-03-01"), date("2027-03-31"))
	if err != nil {
		t.Fatal(err)
	}
	b, _, err := sk.Events(context.Background(), PlaceOf(hill), kinds, date("2027-03-01"), date("2027-03-31"))
	if err != nil || len(a) != len(b) {
		t.Fatalf("%d and %d events, %v", len(a), len(b), err)
	}
	for i := range a {
		if !a[i].Start.Equal(b[i].Start) || a[i].Azimuth != b[i].Azimuth {
			t.Errorf("flat skyline %v, horizon 2 %v", a[i].Start, b[i].Start)
		}
	}
}

// Over a skyline, dark-window takes the Moon as down while it is behind
// the skyline (the demo valley's 15° hills to the west hide the setting
// crescent of March 2027 earlier than a flat horizon), says so, and says
// the Sun's 18° are counted from the flat horizon.
func TestDarkWindowOverSkyline(t *testing.T) {
	s := site(t, "valley", 47.05, 11.2, "Europe/Vienna")
	s.Skyline = [][2]float64{{0, 3}, {100, 12}, {150, 4}, {176, 25}, {184, 25}, {190, 4}, {260, 15}, {300, 3}}
	flat := site(t, "flat", 47.05, 11.2, "Europe/Vienna")
	sk := sky(t, "2027-03-10", "2027-03-16")
	specs := []config.KindSpec{{Kind: mustKinds(t, "dark-window")[0]}}
	total := func(s *config.Site) (time.Duration, []Entry) {
		es, err := sk.Entries(context.Background(), s, "f", specs, date("2027-03-10"), date("2027-03-15"))
		if err != nil {
			t.Fatal(err)
		}
		var sum time.Duration
		for _, e := range es {
			if !e.AllDay {
				sum += e.End.Sub(e.Start)
			}
		}
		return sum, es
	}
	valley, es := total(s)
	open, flatEs := total(flat)
	if valley < open+30*time.Minute {
		t.Errorf("dark time %v in the valley, %v over a flat horizon: the hills should hide the setting Moon", valley, open)
	}
	// what a dark window is, once in the calendar's description; the
	// entries give their night and times
	if m := strings.Join(kindMeanings(s, specs), "\n"); !strings.Contains(m, "the Moon is behind the site's skyline") ||
		!strings.Contains(m, "18° are counted from the flat horizon") {
		t.Errorf("meaning: %q", m)
	}
	if m := strings.Join(kindMeanings(flat, specs), "\n"); !strings.Contains(m, "the Moon is below the horizon") || strings.Contains(m, "skyline") {
		t.Errorf("flat meaning: %q", m)
	}
	for _, e := range append(es, flatEs...) {
		if !e.AllDay && (!strings.HasPrefix(e.Description, "Dark sky on the night of ") || strings.Contains(e.Description, "Moon") || strings.Contains(e.Description, "18°")) {
			t.Errorf("description: %q", e.Description)
		}
	}
}

// At a site with a skyline the texts speak of the skyline, not the flat
// horizon: a date on which the Sun stays behind it (78.2° N in February,
// an 8° skyline to the south; over the flat horizon the Sun is back from
// mid-February at that latitude) is "No direct Sun today", not polar
// night, and the daily summary says it once; a date under the midnight Sun
// "stays over the skyline"; a photoperiod threshold is one of direct Sun.
func TestSkylineNoteTexts(t *testing.T) {
	s := site(t, "polar", 78.2, 15.6, "Arctic/Longyearbyen")
	s.Skyline = [][2]float64{{0, 3}, {90, 6}, {180, 8}, {270, 2}}
	sk := sky(t, "2027-02-01", "2027-06-30")
	entries := func(first, last string, kinds ...string) []Entry {
		var specs []config.KindSpec
		for _, k := range mustKinds(t, kinds...) {
			specs = append(specs, config.KindSpec{Kind: k})
		}
		es, err := sk.Entries(context.Background(), s, "f", specs, date(first), date(last))
		if err != nil {
			t.Fatal(err)
		}
		return es
	}
	titles := func(es []Entry) string {
		var out []string
		for _, e := range es {
			out = append(out, e.Title+" | "+e.Description)
		}
		return strings.Join(out, "\n")
	}
	feb := titles(entries("2027-02-20", "2027-02-20", "sunrise", "sunset", "daily-summary"))
	for _, want := range []string{"No direct Sun today: the Sun stays behind the skyline", "The Sun is up but does not get over the site's skyline all day", "Direct Sun 0 min"} {
		if !strings.Contains(feb, want) {
			t.Errorf("20 February lacks %q:\n%s", want, feb)
		}
	}
	if strings.Contains(feb, "Polar night") || strings.Count(feb, "No direct Sun today: the Sun stays behind the skyline.\n") != 1 {
		t.Errorf("20 February:\n%s", feb)
	}
	moon := titles(entries("2027-02-03", "2027-02-03", "moonrise"))
	if !strings.HasPrefix(moon, "The Moon stays behind the skyline all day") {
		t.Errorf("3 February, no moonrise: %s", moon)
	}
	if lamps := titles(entries("2027-02-20", "2027-02-20", "lighting:12h")); !strings.Contains(lamps, "The Sun stays behind the skyline: lamps on at ") ||
		!strings.Contains(lamps, "centred on solar noon") || !strings.Contains(lamps, "Direct Sun over the skyline 0 min; target 12 h.") {
		t.Errorf("lamps on a date without direct Sun: %s", lamps)
	}
	jun := titles(entries("2027-06-20", "2027-06-20", "sunrise"))
	if !strings.Contains(jun, "The Sun stays over the skyline all day: no sunset today") {
		t.Errorf("20 June:\n%s", jun)
	}
	mar := titles(entries("2027-03-01", "2027-04-30", "photoperiod:12h"))
	if !strings.Contains(mar, "Direct Sun rising past 12 h") || !strings.Contains(mar, "the Sun is over the site's skyline for 1") {
		t.Errorf("photoperiod over the skyline:\n%s", mar)
	}
	one := titles(entries("2027-02-20", "2027-02-20", "photoperiod:12h"))
	if !strings.HasPrefix(one, "Direct Sun stays below 12 h on 20 February 2027 (the Sun stays behind the skyline on this date)") {
		t.Errorf("one date's photoperiod note: %s", one)
	}
}

// A date without sunrise is polar night only when the Sun stays below a
// flat horizon; behind a skyline or a horizon altitude it may be up, only
// hidden. At 80° N, 0° (USNO tables, UT, 2015) the Sun rises over the flat
// horizon on 21 February (rows sun-0159/0160: 11:21–13:09) but not to 5°,
// and does not rise on 21 December (sun-0182): behind 5°, the first is "No
// direct Sun today", the second "Polar night", for a skyline of 5° all
// round and for a horizon altitude of 5° alike, in the sunrise note and in
// the daily summary.
func TestPolarNightOrBehindSkyline(t *testing.T) {
	sk := sky(t, "2015-01-01", "2015-12-31")
	skyline, hills := behind5(t)
	for _, s := range []*config.Site{skyline, hills} {
		for d, want := range map[string]string{
			"2015-02-21": "No direct Sun today: the Sun stays behind the skyline",
			"2015-12-21": "Polar night: the Sun does not rise today",
		} {
			specs := []config.KindSpec{{Kind: mustKinds(t, "sunrise")[0]}, {Kind: mustKinds(t, "daily-summary")[0]}}
			es, err := sk.Entries(context.Background(), s, "f", specs, date(d), date(d))
			if err != nil {
				t.Fatal(err)
			}
			var text []string
			for _, e := range es {
				text = append(text, e.Title+" | "+e.Description)
			}
			all := strings.Join(text, "\n")
			if len(es) != 2 || !strings.HasPrefix(all, want) || strings.Count(all, want) != 2 {
				t.Errorf("%s behind 5° (skyline %v, horizon %v):\n%s\nwant %q in the note and the summary", d, s.Skyline, s.Horizon, all, want)
			}
		}
	}
}

// A band the Sun passes through once a day, through noon, is named so
// ("Sun between +15° and +89° (through midday)"), not "morning and evening
// in one", golden hour's name for the span of a winter Sun that never
// climbs out of it (at 69.65° N, 18.96° E on 20 January 2027 the Sun's
// centre at its transit, 10:55 UT, is 0.23° high geometrically, 0.67° with
// refraction: PyEphem 4.1.4, next_transit with pressure 0 and 1010 hPa).
func TestBandThroughMidday(t *testing.T) {
	s := site(t, "havana", 23.13, -82.38, "America/Havana")
	sk := sky(t, "2027-03-14", "2027-03-14")
	es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{{Kind: mustKinds(t, "sun-band:15..89")[0]}}, date("2027-03-14"), date("2027-03-14"))
	if err != nil || len(es) != 1 || es[0].Title != "Sun between +15° and +89° (through midday)" {
		t.Fatalf("%+v, %v", es, err)
	}
	n := site(t, "tromso", 69.65, 18.96, "Europe/Oslo")
	sk = sky(t, "2027-01-20", "2027-01-20")
	es, err = sk.Entries(context.Background(), n, "f", []config.KindSpec{{Kind: mustKinds(t, "golden-hour")[0]}}, date("2027-01-20"), date("2027-01-20"))
	if err != nil || len(es) != 1 || es[0].Title != "Golden hour (morning and evening in one)" {
		t.Fatalf("%+v, %v", es, err)
	}
}

// A date's all-day entries of one kind with different thresholds come in the
// order of their values, as people read them: 9 h before 12 h before 14 h 30.
func TestAllDayOrderByValue(t *testing.T) {
	kinds := []string{"photoperiod:14h30m", "photoperiod:12h", "photoperiod:9h", "photoperiod:14h"}
	slices.SortFunc(kinds, func(a, b string) int { return AllDayOrder(a, "", b, "") })
	want := []string{"photoperiod:9h", "photoperiod:12h", "photoperiod:14h", "photoperiod:14h30m"}
	if !slices.Equal(kinds, want) {
		t.Errorf("order %v, want %v", kinds, want)
	}
	if c := AllDayOrder("sunrise", "", "photoperiod:9h", ""); c >= 0 {
		t.Errorf("the catalogue's order of kinds comes first: sunrise after photoperiod (%d)", c)
	}
}

// A longest (or shortest) day that rounds to the minute onto the threshold
// it does not cross is given to the second, so the note never reads
// "never reaches 14 h (longest 14 h)"; otherwise to the minute.
func TestNotReachedTextNearThreshold(t *testing.T) {
	d, last, june, dec := date("2027-01-01"), date("2027-12-31"), date("2027-06-21"), date("2027-12-22")
	for _, c := range []struct {
		kind   string
		state  astro.State
		length time.Duration
		want   string
	}{
		{"photoperiod:14h", astro.AlwaysBelow, 13*time.Hour + 59*time.Minute + 40*time.Second, "Day length never reaches 14 h here (longest 13 h 59 min 40 s, 21 June)"},
		{"photoperiod:10h", astro.AlwaysAbove, 10*time.Hour + 20*time.Second, "Day length never falls below 10 h here (shortest 10 h 00 min 20 s, 22 December)"},
		{"photoperiod:14h", astro.AlwaysBelow, 13*time.Hour + 58*time.Minute + 40*time.Second, "Day length never reaches 14 h here (longest 13 h 59 min, 21 June)"},
	} {
		extreme := june
		if c.state == astro.AlwaysAbove {
			extreme = dec
		}
		n := Note{Kind: mustKinds(t, c.kind)[0], Date: d, Last: last, State: c.state, DayLength: c.length, ExtremeDate: extreme}
		if got := NotReachedText(n); got != c.want {
			t.Errorf("%s, %v: %q, want %q", c.kind, c.length, got, c.want)
		}
	}
}

// TestSummaryTitlePolarNight checks that the daily summary of a date of
// polar night says so in its title rather than "Daylight 0 min", and
// says it true: not "no daylight" on a date with hours of civil twilight,
// light enough for outdoor work as the feed's civil dawn says. At
// 78.92° N on 21 December 2027 the Sun's noon altitude is about
// 90° − 78.92° − 23.44° = −12.4° (the solstice declination −23.44°,
// Astronomical Almanac), below the horizon all day, and below −6° too;
// on 21 June its lowest, at midnight, is about 23.44° − (90° − 78.92°) =
// +12.4°: up all day. On 17 February 2027 the Sun does not rise there
// (PyEphem 4.1.4, pressure 0, upper limb at −34′: NeverUpError) but its
// centre is above −6° from 07:34:53 to 15:20:26 UTC (PyEphem, use_center):
// 08:35 to 16:20 CET as the summary shows them, 7 h 45 min.
func TestSummaryTitlePolarNight(t *testing.T) {
	sk := sky(t, "2027-01-01", "2027-12-31")
	for _, tc := range []struct{ date, title string }{
		{"2027-12-21", "Polar night: the Sun stays below the horizon"},
		{"2027-02-17", "Polar night: civil twilight 7 h 45 min"},
		{"2027-06-21", "Daylight 24 h"},
	} {
		if es := polarShedSummary(t, sk, tc.date); len(es) != 1 || es[0].Title != tc.title {
			t.Errorf("%s: %+v, want the title %q", tc.date, es, tc.title)
		}
	}
}

// polarShedSummary returns sk's daily summaries of the local date day
// (YYYY-MM-DD) at 78.92° N, 11.93° E (Arctic/Longyearbyen).
func polarShedSummary(t *testing.T, sk *Sky, day string) []Entry {
	t.Helper()
	s := site(t, "polar-shed", 78.92, 11.93, "Arctic/Longyearbyen")
	es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{{Kind: mustKinds(t, "daily-summary")[0]}}, date(day), date(day))
	if err != nil {
		t.Fatal(err)
	}
	return es
}

// TestSummarySameDayLength checks that a daily summary of polar night or
// midnight Sun after a date of the same says so in one unit, not "0 min
// (+0 s from the day before)". At 78.92° N, 11.93° E the Sun does not
// rise on 20 and 21 December 2027 and does not set on 20 and 21 June 2027
// (PyEphem 4.1.4, pressure 0, upper limb at −34′: NeverUpError and
// AlwaysUpError).
func TestSummarySameDayLength(t *testing.T) {
	sk := sky(t, "2027-01-01", "2027-12-31")
	for _, tc := range []struct{ date, want string }{
		{"2027-12-21", "Polar night: the Sun does not rise today.\n" +
			"No civil twilight today: the Sun stays more than 6° below the horizon.\n" +
			"Day length 0 min, the same as the day before."},
		{"2027-06-21", "Midnight sun: the Sun does not set today.\nDay length 24 h, the same as the day before."},
	} {
		if es := polarShedSummary(t, sk, tc.date); len(es) != 1 || es[0].Description != tc.want {
			t.Errorf("%s: %+v, want the description %q", tc.date, es, tc.want)
		}
	}
}

// A photoperiod threshold over a window all in polar night or all under
// the midnight Sun says what the grower sees there, not "longest 0 min" or
// "shortest 24 h": polar night is a date on which the Sun does not rise,
// midnight Sun one on which it does not set (their definitions). At 80° N,
// 0° the Sun is continuously below the horizon on 21 December 2015 and
// continuously above it on 14 April 2015 (USNO, 'Rise and Set for the Sun',
// N80 00, 2015: rows sun-0182 and sun-0169 of
// testdata/reference/sun-times.csv).
func TestPhotoperiodPolarNoteTexts(t *testing.T) {
	s := site(t, "arctic", 80, 0, "UTC")
	for _, c := range []struct{ date, want string }{
		{"2015-12-21", "Day length stays below 12 h on 21 December 2015 (the Sun does not rise on this date)"},
		{"2015-04-14", "Day length stays at or above 12 h on 14 April 2015 (the Sun does not set on this date)"},
	} {
		sk := sky(t, c.date, c.date)
		es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{{Kind: mustKinds(t, "photoperiod:12h")[0]}}, date(c.date), date(c.date))
		if err != nil {
			t.Fatal(err)
		}
		if len(es) != 1 || es[0].Title != c.want {
			t.Errorf("%s: %+v, want one note %q", c.date, es, c.want)
		}
	}
}

// The daily summary of a date on which the clocks change says so, in the
// words of the served tables' row, since its times carry another offset
// than the day before's. Lord Howe Island's clocks go back by 30 min on
// 4 April 2027: Sun Apr 4 01:59:59 +11 is followed by 01:30:00 +1030
// (`zdump -v -c 2027,2028 Australia/Lord_Howe`); the dates around it say
// nothing of the clocks.
func TestSummarySaysClockChange(t *testing.T) {
	s := site(t, "lord-howe", -31.55, 159.08, "Australia/Lord_Howe")
	sk := sky(t, "2027-04-03", "2027-04-05")
	es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{{Kind: mustKinds(t, "daily-summary")[0]}}, date("2027-04-03"), date("2027-04-05"))
	if err != nil {
		t.Fatal(err)
	}
	const clocks = "Clocks go back from summer time by 30 min: 02:00 becomes 01:30."
	if len(es) != 3 {
		t.Fatalf("%d entries, want 3", len(es))
	}
	for _, e := range es {
		said := strings.Contains(e.Description, clocks)
		if want := e.Date.Equal(date("2027-04-04")); said != want || (want && !strings.HasSuffix(e.Description, ").\n"+clocks)) {
			t.Errorf("%s: %q, want the last line %q only on 2027-04-04", e.Date.Format(time.DateOnly), e.Description, clocks)
		}
	}
}
