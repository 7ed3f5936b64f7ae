package feed

import (
	"context"
	"encoding/csv"
	"os"
	"regexp"
	"slices"
	"strings"
	"testing"
	"time"

	"heliocal/config"
)

// usnoRow is one row of testdata/reference/sun-times.csv.
type usnoRow struct{ id, place, date, kind, local string }

func usnoRows(t *testing.T) []usnoRow {
	t.Helper()
	f, err := os.Open("../testdata/reference/sun-times.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	var out []usnoRow
	for _, r := range recs[1:] {
		out = append(out, usnoRow{id: r[0], place: r[1], date: r[5], kind: r[6], local: r[7]})
	}
	return out
}

// usnoDay is one date of a USNO table: the listed local times by kind
// ("sunrise", "sunset", "civil_dawn", "civil_dusk") and the row ids.
type usnoDay struct {
	date  string
	times map[string]time.Time
	ids   []string
}

// usnoDays groups the rows of one place by date, reading local times in zone.
func usnoDays(t *testing.T, placePrefix string, zone *time.Location) []*usnoDay {
	t.Helper()
	var days []*usnoDay
	byDate := map[string]*usnoDay{}
	for _, r := range usnoRows(t) {
		if !strings.HasPrefix(r.place, placePrefix) {
			continue
		}
		d := byDate[r.date]
		if d == nil {
			d = &usnoDay{date: r.date, times: map[string]time.Time{}}
			byDate[r.date] = d
			days = append(days, d)
		}
		d.ids = append(d.ids, r.id)
		if tm, err := time.ParseInLocation("2006-01-02 15:04", r.date+" "+r.local, zone); err == nil {
			d.times[r.kind] = tm
		}
	}
	return days
}

func lightingSpec(t *testing.T, kind string, opts func(*config.KindSpec)) config.KindSpec {
	t.Helper()
	k, err := config.ParseKind(kind)
	if err != nil {
		t.Fatal(err)
	}
	ks := config.KindSpec{Kind: k}
	if opts != nil {
		opts(&ks)
	}
	return ks
}

func near(a, b time.Time, tol time.Duration) bool {
	d := a.Sub(b)
	return d <= tol && d >= -tol
}

// TestLightingAgainstUSNO checks lamp periods against the natural day of
// the USNO one-year tables for Ithaca, NY (42°27′ N, 76°30′ W, UTC−4 without
// daylight saving), 2015: 'Rise and Set for the Sun' and 'Civil Twilight',
// rows sun-0001..sun-0090 of testdata/reference/sun-times.csv. With the
// target T, evening lamps run from the table's sunset to its sunrise + T,
// morning lamps from sunset − T to sunrise, and "both" splits the shortfall;
// with natural: civil, civil dusk and dawn take the place of sunset and
// sunrise. Tolerance 75 s: each table time is rounded to the minute.
func TestLightingAgainstUSNO(t *testing.T) {
	zone := time.FixedZone("UTC-04:00", -4*3600)
	s := &config.Site{ID: "ithaca", Name: "Ithaca", Latitude: 42.45, Longitude: -76.5, TimeZone: config.Zone{Location: zone}}
	sk := sky(t, "2015-01-01", "2015-12-31")
	const tol = 75 * time.Second
	target := 16 * time.Hour
	days := usnoDays(t, "Ithaca", zone)
	checked := 0
	for _, day := range days {
		rise, set := day.times["sunrise"], day.times["sunset"]
		dawn, dusk := day.times["civil_dawn"], day.times["civil_dusk"]
		if rise.IsZero() || set.IsZero() {
			continue
		}
		short := target - set.Sub(rise)
		cases := []struct {
			name   string
			opts   func(*config.KindSpec)
			starts []time.Time
			ends   []time.Time
		}{
			{"evening", nil, []time.Time{set}, []time.Time{rise.Add(target)}},
			{"morning", func(ks *config.KindSpec) { ks.Lamps = config.LampsMorning }, []time.Time{set.Add(-target)}, []time.Time{rise}},
			{"both", func(ks *config.KindSpec) { ks.Lamps = config.LampsBoth },
				[]time.Time{rise.Add(-short / 2), set}, []time.Time{rise, set.Add(short / 2)}},
		}
		if !dawn.IsZero() && !dusk.IsZero() {
			cases = append(cases, struct {
				name   string
				opts   func(*config.KindSpec)
				starts []time.Time
				ends   []time.Time
			}{"civil", func(ks *config.KindSpec) { ks.Natural = config.NaturalCivil }, []time.Time{dusk}, []time.Time{dawn.Add(target)}})
		}
		for _, tc := range cases {
			spec := lightingSpec(t, "lighting:16h", tc.opts)
			evs, notes, err := sk.EventsFor(context.Background(), PlaceOf(s), []config.KindSpec{spec}, date(day.date), date(day.date))
			if err != nil {
				t.Fatal(err)
			}
			if tc.name == "civil" && dusk.Sub(dawn) >= target {
				// the civil day is long enough: no lamps, a note
				if len(evs) != 0 || len(notes) != 1 {
					t.Errorf("%s civil (%v): %d periods and %d notes, want none and a note", day.date, day.ids, len(evs), len(notes))
				}
				continue
			}
			if len(notes) != 0 || len(evs) != len(tc.starts) {
				t.Errorf("%s %s (%v): %d periods and %d notes, want %d periods", day.date, tc.name, day.ids, len(evs), len(notes), len(tc.starts))
				continue
			}
			for i, e := range evs {
				if !near(e.Start, tc.starts[i], tol) || !near(e.End, tc.ends[i], tol) {
					t.Errorf("%s %s (%v): lamps %s–%s, want %s–%s", day.date, tc.name, day.ids,
						e.Start.In(zone).Format("15:04:05"), e.End.In(zone).Format("15:04:05"),
						tc.starts[i].Format("15:04"), tc.ends[i].Format("15:04"))
				}
				if l := e.LampFacts(); l.Lamp != e.End.Sub(e.Start) || l.Short {
					t.Errorf("%s %s: lamp %s, short %v", day.date, tc.name, l.Lamp, l.Short)
				}
			}
			checked++
		}
	}
	if checked < 25 {
		t.Fatalf("only %d date/option pairs checked", checked)
	}
}

// TestLightingPolarUSNO checks the polar cases at 80° N, 0° (USNO tables,
// UT, 2015, rows sun-0169, sun-0179/0180, sun-0182): polar night on
// 21 December gets lamps for the whole target, centred on solar noon;
// 14 April (the Sun does not set) needs none; on 21 October the table's
// short day (sunrise 11:02, sunset 12:24) gets evening lamps until sunrise
// + 16 h, 03:02 the next morning. Tolerance 75 s (minute rounding).
func TestLightingPolarUSNO(t *testing.T) {
	s := site(t, "lat80", 80, 0, "UTC")
	sk := sky(t, "2015-01-01", "2015-12-31")
	spec := lightingSpec(t, "lighting:16h", nil)
	run := func(d string) ([]Event, []Note) {
		evs, notes, err := sk.EventsFor(context.Background(), PlaceOf(s), []config.KindSpec{spec}, date(d), date(d))
		if err != nil {
			t.Fatal(err)
		}
		return evs, notes
	}
	evs, notes := run("2015-12-21")
	if len(evs) != 1 || len(notes) != 0 || evs[0].Part != partPolarNight || evs[0].LampFacts().Lamp != 16*time.Hour {
		t.Fatalf("polar night: %+v %+v, want one 16 h period", evs, notes)
	}
	// solar noon at longitude 0 on 21 December: 12:00 UT − equation of
	// time (+1.9 min, common practice value for the solstice)
	noon := evs[0].Start.Add(8 * time.Hour)
	if want := time.Date(2015, 12, 21, 11, 58, 0, 0, time.UTC); !near(noon, want, 2*time.Minute) {
		t.Errorf("polar night lamps centred on %s, want about %s", noon, want)
	}
	evs, notes = run("2015-04-14")
	if len(evs) != 0 || len(notes) != 1 || notes[0].Kind.Name != config.KindLighting {
		t.Fatalf("midnight sun: %+v %+v, want no lamps and one note", evs, notes)
	}
	evs, _ = run("2015-10-21")
	rise, set := time.Date(2015, 10, 21, 11, 2, 0, 0, time.UTC), time.Date(2015, 10, 21, 12, 24, 0, 0, time.UTC)
	if len(evs) != 1 || !near(evs[0].Start, set, 75*time.Second) || !near(evs[0].End, rise.Add(16*time.Hour), 75*time.Second) {
		t.Fatalf("21 October: %+v, want %s–%s", evs, set, rise.Add(16*time.Hour))
	}
}

// TestLightingEntries checks the calendar entries: clipping at latest_off,
// the title that says the target is not reached, and one note per stretch
// of dates that need no lamps.
func TestLightingEntries(t *testing.T) {
	s := site(t, "vienna", 48.2, 16.4, "Europe/Vienna")
	sk := sky(t, "2027-01-01", "2027-12-31")
	spec := lightingSpec(t, "lighting:16h", func(ks *config.KindSpec) { ks.LatestOff = "22:00" })
	es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date("2027-01-10"), date("2027-01-11"))
	if err != nil {
		t.Fatal(err)
	}
	if len(es) != 2 {
		t.Fatalf("%d entries, want 2", len(es))
	}
	for _, e := range es {
		off := e.End.In(s.TimeZone.Location)
		if off.Format("15:04") != "22:00" || !e.Facts.Short || !strings.Contains(e.Title, "16 h not reached") ||
			!strings.Contains(e.Description, "not reached today") {
			t.Errorf("%s: %q ends %s, short %v", e.Date.Format(time.DateOnly), e.Title, off, e.Facts.Short)
		}
	}
	// lighting:14h over April..September: lamps until the day reaches 14 h,
	// one note for the long days, lamps again once it falls below; the
	// stretch is the one photoperiod:14h marks. The date before it (21
	// April, a day of 13 h 59 min 06.2 s, PyEphem 4.1.4,
	// tools/pyephem-checks/values.py lamp_periods) needs lamps for under a minute: a note says none
	// are scheduled, and the date counts among those that need lamps.
	spec = lightingSpec(t, "lighting:14h", nil)
	es, err = sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date("2027-04-01"), date("2027-09-30"))
	if err != nil {
		t.Fatal(err)
	}
	var notes []Entry
	lamps := 0
	for _, e := range es {
		switch {
		case e.Facts.Note && e.Facts.Short:
			if e.Title != "Lamps not scheduled: less than 1 min needed, too short to switch the lamps on" {
				t.Errorf("%s: %q, want a note for a period under a minute", e.Date.Format(time.DateOnly), e.Title)
			}
			lamps++
		case e.Facts.Note:
			notes = append(notes, e)
		default:
			lamps++
		}
	}
	if len(notes) != 1 || !strings.HasPrefix(notes[0].Title, "No lamps needed until ") || !notes[0].AllDay {
		t.Fatalf("notes %+v, want one", notes)
	}
	n := notes[0]
	pp, _, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "photoperiod:14h"), date("2027-04-01"), date("2027-09-30"))
	if err != nil {
		t.Fatal(err)
	}
	if len(pp) != 2 || !n.Date.Equal(pp[0].Date) || !n.Facts.Until.Equal(pp[1].Date) {
		t.Errorf("stretch %s..%s, photoperiod:14h crossings %+v", n.Date.Format(time.DateOnly), n.Facts.Until.Format(time.DateOnly), pp)
	}
	if days := int(n.Facts.Until.Sub(n.Date).Hours() / 24); lamps != 183-days {
		t.Errorf("%d lamp entries, want %d (one per date needing lamps)", lamps, 183-days)
	}
}

// Lamp titles and descriptions write every hours-and-minutes duration one
// way, as the rest of the feed does: "1 h 08 min", never "1 h 8 min"; and
// each writes the length its own clock times show: the title's between
// its times to the minute (17:05–21:13 is 4 h 08 min, though 17:04:34 to
// 21:13:08 is 4 h 08 min 34 s), the description's between its times to
// the second, to the nearest minute (4 h 09 min).
func TestLightingDurationsOneFormat(t *testing.T) {
	s := site(t, "vienna", 48.2, 16.4, "Europe/Vienna")
	sk := sky(t, "2027-01-01", "2027-12-31")
	spec := lightingSpec(t, "lighting:14h", nil)
	es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date("2027-02-01"), date("2027-04-10"))
	if err != nil {
		t.Fatal(err)
	}
	hmRe := regexp.MustCompile(`(\d+) h (\d+) min`)
	lampRe := regexp.MustCompile(`\((\d+ h \d+ min|\d+ min)[,;]`)
	titleTimesRe := regexp.MustCompile(`^Lamps on (\d\d:\d\d)–(\d\d:\d\d) \(`)
	descTimesRe := regexp.MustCompile(`on at (\d\d:\d\d:\d\d) CES?T, off at (\d\d:\d\d:\d\d) CES?T \((.*?)\)`)
	padded, differ := 0, 0
	for _, e := range es {
		if e.Facts.Note {
			continue
		}
		for _, text := range []string{e.Title, e.Description} {
			for _, m := range hmRe.FindAllStringSubmatch(text, -1) {
				if len(m[2]) != 2 {
					t.Errorf("%s: %q writes minutes unpadded in %q", e.Date.Format(time.DateOnly), m[0], text)
				} else if m[2][0] == '0' {
					padded++
				}
			}
		}
		lamp := lampRe.FindStringSubmatch(e.Title)
		times := titleTimesRe.FindStringSubmatch(e.Title)
		if lamp == nil || times == nil || lamp[1] != hm(clockSpan(t, times[1], times[2], 60)) {
			t.Errorf("%s: title %q: the length is not the time between its clock times", e.Date.Format(time.DateOnly), e.Title)
		}
		secs := descTimesRe.FindStringSubmatch(e.Description)
		if secs == nil || !strings.HasPrefix(secs[3], hm(clockSpan(t, secs[1], secs[2], 1))) {
			t.Errorf("%s: description %q: the length is not the time between its clock times", e.Date.Format(time.DateOnly), e.Description)
		}
		if lamp != nil && lamp[1] != secs[3][:len(lamp[1])] {
			differ++
		}
	}
	if differ == 0 {
		t.Error("no title whose clock times to the minute read another length than the description's: the check did not run")
	}
	if padded == 0 {
		t.Error("no duration with fewer than 10 minutes in the window: the check did not run")
	}
}

// ithacaDay returns the USNO table's sunrise and sunset for Ithaca, NY on
// d (see TestLightingAgainstUSNO), in the table's zone.
func ithacaDay(t *testing.T, d string) (rise, set time.Time, s *config.Site) {
	t.Helper()
	zone := time.FixedZone("UTC-04:00", -4*3600)
	s = &config.Site{ID: "ithaca", Name: "Ithaca", Latitude: 42.45, Longitude: -76.5, TimeZone: config.Zone{Location: zone}}
	for _, day := range usnoDays(t, "Ithaca", zone) {
		if day.date == d {
			rise, set = day.times["sunrise"], day.times["sunset"]
		}
	}
	if rise.IsZero() || set.IsZero() {
		t.Fatalf("no USNO sunrise and sunset for Ithaca on %s", d)
	}
	return rise, set, s
}

// TestLightingBothMakesUp checks lamps: both under latest_off and
// earliest_on against the USNO table for Ithaca, NY, 1 January 2015
// (sunrise 08:36, sunset 17:44 in UTC−4, rows sun-0001 and sun-0002 of
// testdata/reference/sun-times.csv): an evening cut by latest_off is made
// up in the morning, so the date still gets the whole shortfall and both
// entries say the target is reached; when the morning is cut too, both say
// it is not. Tolerance 150 s: two table times, each rounded to the minute.
func TestLightingBothMakesUp(t *testing.T) {
	rise, set, s := ithacaDay(t, "2015-01-01")
	zone := s.TimeZone.Location
	sk := sky(t, "2015-01-01", "2015-12-31")
	const tol = 150 * time.Second
	short := 16*time.Hour - set.Sub(rise)
	run := func(on, off string) []Entry {
		spec := lightingSpec(t, "lighting:16h", func(ks *config.KindSpec) {
			ks.Lamps, ks.EarliestOn, ks.LatestOff = config.LampsBoth, on, off
		})
		es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date("2015-01-01"), date("2015-01-01"))
		if err != nil {
			t.Fatal(err)
		}
		if len(es) != 2 || es[0].Facts.Part != partMorning || es[1].Facts.Part != partEvening {
			t.Fatalf("on %s, off %s: %d entries, want a morning and an evening period", on, off, len(es))
		}
		return es
	}
	// evening off an hour before the end of its half: the morning starts
	// an hour earlier than its half would
	offAt := set.Add(short/2 - time.Hour).Truncate(time.Minute)
	es := run("", offAt.Format("15:04"))
	m, e := es[0], es[1]
	if !e.End.Equal(offAt) || !near(m.Start, rise.Add(-(short-offAt.Sub(set))), tol) || !near(m.End, rise, tol) {
		t.Errorf("lamps %s–%s and %s–%s, want morning from %s and evening off at %s", m.Start.In(zone), m.End.In(zone),
			e.Start.In(zone), e.End.In(zone), rise.Add(-(short - offAt.Sub(set))).Format("15:04"), offAt.Format("15:04"))
	}
	if got := m.Facts.Lamp + e.Facts.Lamp; !near(time.Time{}.Add(got), time.Time{}.Add(short), tol) {
		t.Errorf("lamps %s in all, want the shortfall %s", got, short)
	}
	for _, x := range es {
		if x.Facts.Short || !strings.Contains(x.Title, "to reach 16 h") {
			t.Errorf("%s: %q, short %v: the morning makes up the evening, the target is reached", x.Facts.Part, x.Title, x.Facts.Short)
		}
	}
	if !strings.Contains(e.Description, "the morning lamps make up the difference: the target is reached") ||
		!strings.Contains(m.Description, "longer than half the shortfall, to make up for the evening lamps, which are clipped") {
		t.Errorf("descriptions do not say who makes up what:\n%s\n%s", m.Description, e.Description)
	}
	// the morning cannot start before 30 min after its half would: 30 min
	// and the hour the evening lost are missing
	onAt := rise.Add(-short/2 + 30*time.Minute).Truncate(time.Minute).Add(time.Minute)
	es = run(onAt.Format("15:04"), offAt.Format("15:04"))
	m, e = es[0], es[1]
	if !m.Start.Equal(onAt) || !e.End.Equal(offAt) {
		t.Errorf("lamps from %s and off at %s, want %s and %s", m.Start.In(zone), e.End.In(zone), onAt.Format("15:04"), offAt.Format("15:04"))
	}
	for _, x := range es {
		if !x.Facts.Short || !strings.Contains(x.Title, "16 h not reached") || !strings.Contains(x.Description, "not reached today") {
			t.Errorf("%s: %q, short %v: both periods are cut, the target is not reached", x.Facts.Part, x.Title, x.Facts.Short)
		}
	}
	// each period names the limit that cuts it (earliest_on the morning,
	// latest_off the evening), not both
	onText, offText := "lamps on no earlier than "+onAt.Format("15:04"), "off no later than "+offAt.Format("15:04")
	if !strings.Contains(m.Description, "Clipped ("+onText+"): the target is not reached today.") || strings.Contains(m.Description, offText) ||
		!strings.Contains(e.Description, "Clipped ("+offText+"): the target is not reached today.") || strings.Contains(e.Description, onText) {
		t.Errorf("each period should name its own limit:\n%s\n%s", m.Description, e.Description)
	}
	// with both limits set and only the evening cut, the morning says that
	// the evening is clipped by latest_off alone
	es = run("00:30", offAt.Format("15:04"))
	m, e = es[0], es[1]
	if m.Facts.Short || !strings.Contains(m.Description, "which are clipped ("+offText+").") || strings.Contains(m.Description, "00:30") ||
		!strings.Contains(e.Description, "Clipped ("+offText+"); the morning lamps make up the difference") {
		t.Errorf("only the evening is cut, by latest_off:\n%s\n%s", m.Description, e.Description)
	}
}

// TestLightingMinimum checks min_duration on lamp periods against the USNO
// table for Ithaca, NY, 1 January 2015 (rows sun-0001 and sun-0002:
// sunrise 08:36, sunset 17:44, a day of 9 h 08 min): a target 8 min above the day needs about 8 min of
// lamps, under a 15 min minimum, so the date gets a note saying so instead
// of silence; a target 20 min above it with lamps: both would give two
// 10 min periods, so the date gets one evening period of the whole 20 min.
// Tolerance 2 min (two table times rounded to the minute).
func TestLightingMinimum(t *testing.T) {
	rise, set, s := ithacaDay(t, "2015-01-01")
	sk := sky(t, "2015-01-01", "2015-12-31")
	day := set.Sub(rise)
	run := func(extra time.Duration, lamps string) []Entry {
		spec := config.KindSpec{Kind: config.Kind{Name: config.KindLighting, DayLength: day + extra},
			Lamps: lamps, MinDuration: config.Duration(15 * time.Minute)}
		es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date("2015-01-01"), date("2015-01-01"))
		if err != nil {
			t.Fatal(err)
		}
		return es
	}
	es := run(8*time.Minute, "")
	if len(es) != 1 || !es[0].Facts.Note || !es[0].Facts.Short || !es[0].AllDay {
		t.Fatalf("%+v, want one all-day note", es)
	}
	title := regexp.MustCompile(`^Lamps not scheduled: (\d+) min needed, under the 15 min minimum$`).FindStringSubmatch(es[0].Title)
	// the site and the date are the entry's LOCATION and date, not in its text
	if title == nil || !strings.Contains(es[0].Description, "The target of 9 h 16 min is not reached") ||
		!regexp.MustCompile(`not reached on this date: the natural day is 9 h (07|08|09) min\.$`).MatchString(es[0].Description) {
		t.Fatalf("note %q: %q", es[0].Title, es[0].Description)
	}
	if n := title[1]; n < "6" || n > "9" || len(n) != 1 {
		t.Errorf("note says %s min needed, want 8 ± 2", n)
	}
	es = run(20*time.Minute, config.LampsBoth)
	if len(es) != 1 || es[0].Facts.Part != partEvening || es[0].Facts.Short ||
		!near(es[0].Start.Add(es[0].Facts.Lamp), es[0].Start.Add(20*time.Minute), 2*time.Minute) ||
		!strings.Contains(es[0].Description, "All of the shortfall in one period") {
		t.Fatalf("%+v, want one evening period of about 20 min", es)
	}
}

// TestLightingPolarNightLimits checks polar night at 80° N, 0° on
// 21 December 2015 (USNO: the Sun does not rise; row sun-0169 of
// testdata/reference/sun-times.csv) under lamp limits: the 16 h centred on
// solar noon (about 03:58–19:58 UT) start at earliest_on 06:00 instead and
// run on to 22:00, so the target is still reached; with latest_off 21:00
// as well they run 06:00–21:00, 15 h, and the entry says the target is not
// reached.
func TestLightingPolarNightLimits(t *testing.T) {
	s := site(t, "lat80", 80, 0, "UTC")
	sk := sky(t, "2015-01-01", "2015-12-31")
	run := func(on, off string) Entry {
		spec := lightingSpec(t, "lighting:16h", func(ks *config.KindSpec) { ks.EarliestOn, ks.LatestOff = on, off })
		es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date("2015-12-21"), date("2015-12-21"))
		if err != nil {
			t.Fatal(err)
		}
		if len(es) != 1 || es[0].Facts.Part != partPolarNight {
			t.Fatalf("%+v, want one polar-night period", es)
		}
		return es[0]
	}
	e := run("06:00", "")
	if e.Start.Format("15:04") != "06:00" || e.End.Format("15:04") != "22:00" || e.Facts.Short ||
		!strings.Contains(e.Title, "to reach 16 h") || !strings.Contains(e.Description, "Moved within the limits") {
		t.Errorf("%s–%s %q short %v:\n%s", e.Start, e.End, e.Title, e.Facts.Short, e.Description)
	}
	e = run("06:00", "21:00")
	if e.Start.Format("15:04") != "06:00" || e.End.Format("15:04") != "21:00" || !e.Facts.Short ||
		!strings.Contains(e.Title, "(15 h; 16 h not reached)") {
		t.Errorf("%s–%s %q short %v", e.Start, e.End, e.Title, e.Facts.Short)
	}
}

// Lamps use the day of the daily summary and photoperiod (common practice:
// day length runs from sunrise to sunset, the sunset that ends the day even
// past midnight), and never burn while the Sun is up. At 78.2° N in April the
// sunset crosses midnight and the nights are short: a 23 h 50 min target
// puts evening lamps after the sunset past midnight, cut where the Sun rises
// again, and each lamp entry gives the summary's day length. The site is
// invented, at Svalbard's latitude.
func TestLightingDayAcrossMidnight(t *testing.T) {
	s := site(t, "isfjell-hut", 78.2, 15.6, "Arctic/Longyearbyen")
	sk := sky(t, "2027-04-08", "2027-04-22")
	from, to := date("2027-04-10"), date("2027-04-18")
	for _, lamps := range []string{config.LampsEvening, config.LampsMorning, config.LampsBoth} {
		spec := lightingSpec(t, "lighting:23h50m", func(ks *config.KindSpec) { ks.Lamps = lamps })
		var specs []config.KindSpec
		for _, k := range mustKinds(t, "sunrise", "sunset", "daily-summary") {
			specs = append(specs, config.KindSpec{Kind: k})
		}
		specs = append(specs, spec)
		events, _, err := sk.EventsFor(context.Background(), PlaceOf(s), specs, from, to)
		if err != nil {
			t.Fatal(err)
		}
		summary := map[time.Time]time.Duration{}
		var sun []Event // sunrises and sunsets in order
		for _, e := range events {
			switch e.Kind.Name {
			case "daily-summary":
				summary[e.Date] = e.DayLength
			case "sunrise", "sunset":
				sun = append(sun, e)
			}
		}
		slices.SortFunc(sun, func(a, b Event) int { return a.Start.Compare(b.Start) })
		up := func(t time.Time) bool { // the Sun up at t, by the last rise or set before it
			u := false
			for _, e := range sun {
				if !e.Start.Before(t) {
					break
				}
				u = e.Kind.Name == "sunrise"
			}
			return u
		}
		n := 0
		var lastOff time.Time
		for _, e := range events {
			if e.Kind.Name != config.KindLighting {
				continue
			}
			n++
			// one night shared by two dates: never two lamp periods at once
			if e.Start.Before(lastOff) {
				t.Errorf("lamps %s, %s: on at %s, before the lamps of the period before go off at %s", lamps, e.Date.Format(time.DateOnly),
					e.Start.In(s.TimeZone.Location).Format("2 Jan 15:04:05"), lastOff.In(s.TimeZone.Location).Format("2 Jan 15:04:05"))
			}
			lastOff = e.End

			if want, ok := summary[e.Date]; !ok || e.DayLength != want {
				t.Errorf("lamps %s, %s: day length %v, daily summary %v", lamps, e.Date.Format(time.DateOnly), e.DayLength, want)
			}
			for m := e.Start.Add(time.Second); m.Before(e.End); m = m.Add(time.Minute) {
				if up(m) {
					t.Errorf("lamps %s, %s: on %s–%s while the Sun is up at %s", lamps, e.Date.Format(time.DateOnly),
						e.Start.In(s.TimeZone.Location).Format("2 Jan 15:04:05"), e.End.In(s.TimeZone.Location).Format("2 Jan 15:04:05"),
						m.In(s.TimeZone.Location).Format("2 Jan 15:04"))
					break
				}
			}
		}
		if n == 0 {
			t.Errorf("lamps %s: no lamp period on %s..%s", lamps, from.Format(time.DateOnly), to.Format(time.DateOnly))
		}
		// a period made up for one the dark cuts says so, not "clipped ()";
		// a date's lamps are the same whichever date the calendar starts on,
		// to the millisecond the outputs show at most (the Sun's crossings are
		// solved to 0.1 ms, and their microseconds follow the span searched:
		// the sunrise of 11 April 2027 here falls 1 µs apart)
		es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, from, to)
		if err != nil {
			t.Fatal(err)
		}
		for _, e := range es {
			if strings.Contains(e.Description, "()") {
				t.Errorf("lamps %s, %s: %q", lamps, e.Date.Format(time.DateOnly), e.Description)
			}
			if e.Facts.Note {
				continue
			}
			one, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, e.Date, e.Date)
			if err != nil {
				t.Fatal(err)
			}
			if !slices.ContainsFunc(one, func(o Entry) bool {
				return o.Start.Sub(e.Start).Abs() < time.Millisecond && o.End.Sub(e.End).Abs() < time.Millisecond
			}) {
				t.Errorf("lamps %s, %s: %s–%s in the calendar from %s, not in the calendar of that date alone", lamps, e.Date.Format(time.DateOnly),
					e.Start.In(s.TimeZone.Location).Format("15:04:05"), e.End.In(s.TimeZone.Location).Format("15:04:05"), from.Format(time.DateOnly))
			}
		}
	}
}

// A date without natural light because of the site's skyline is not polar
// night. At 80° N, 0° (USNO tables, UT, 2015) the Sun rises over the flat
// horizon on 21 February (row sun-0159/0160: 11:21–13:09) and 21 October
// (sun-0179/0180: 11:02–12:24) but, so briefly, never reaches 5°: behind a
// skyline of 5° all round, or under a horizon altitude of 5°, those dates
// have no direct Sun and their lamps say "behind-skyline"; on 21 December
// (sun-0182, the Sun does not rise) they stay "polar-night", skyline or
// not, and so they do with civil twilight as the natural light.
func TestLightingBehindSkylineIsNotPolarNight(t *testing.T) {
	sk := sky(t, "2015-01-01", "2015-12-31")
	skyline, hills := behind5(t)
	flat := site(t, "lat80", 80, 0, "UTC")
	part := func(s *config.Site, d string, natural string) (string, string) {
		spec := lightingSpec(t, "lighting:16h", func(ks *config.KindSpec) { ks.Natural = natural })
		es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date(d), date(d))
		if err != nil {
			t.Fatal(err)
		}
		if len(es) != 1 {
			t.Fatalf("%s: %+v, want one lamp period", d, es)
		}
		return es[0].Facts.Part, es[0].Description
	}
	for _, s := range []*config.Site{skyline, hills} {
		for _, d := range []string{"2015-02-21", "2015-10-21"} {
			p, desc := part(s, d, "")
			if p != partBehindSkyline || !strings.HasPrefix(desc, "The Sun stays behind the skyline: lamps on at ") ||
				!strings.Contains(desc, "), centred on solar noon.\n") || strings.Contains(desc, "olar night") {
				t.Errorf("%s behind a 5° skyline (%v): part %q\n%s", d, s.Skyline, p, desc)
			}
		}
		if p, desc := part(s, "2015-12-21", ""); p != partPolarNight || !strings.HasPrefix(desc, "Polar night: lamps on at ") || !strings.Contains(desc, "), centred on solar noon.\n") {
			t.Errorf("21 December behind a 5° skyline: part %q\n%s", p, desc)
		}
	}
	// the same dates with a flat horizon have a natural day: lamps in the evening
	for _, d := range []string{"2015-02-21", "2015-10-21"} {
		if p, _ := part(flat, d, ""); p != partEvening {
			t.Errorf("%s at a flat horizon: part %q, want evening", d, p)
		}
	}
	// civil twilight as natural light: 21 December at 80° N has none
	// (the Sun's noon altitude, about −13.4°, is below −6°: common practice
	// value from the solstice declination −23.4°) — polar night, skyline or not
	if p, _ := part(skyline, "2015-12-21", config.NaturalCivil); p != partPolarNight {
		t.Errorf("21 December, civil natural light, skyline: part %q", p)
	}
}

// behind5 is the USNO tables' place at 80° N, 0° behind 5°: a skyline of
// 5° all round, and a horizon altitude of 5°.
func behind5(t *testing.T) (skyline, hills *config.Site) {
	skyline = site(t, "lat80", 80, 0, "UTC")
	skyline.Skyline = [][2]float64{{0, 5}, {120, 5}, {240, 5}}
	hills = site(t, "lat80", 80, 0, "UTC")
	hills.Horizon = 5
	return skyline, hills
}

// What a lighting kind's entries mean — what counts as natural light,
// where the lamps go and their limits, civil twilight counted as light
// (common practice), the advice to follow the crop's or herd's programme —
// is written once, in the calendar's description; each lamp entry keeps its
// own numbers: its lamp times and length, the natural day (named "Civil
// dawn to dusk" with natural: civil, so that it does not read as the
// sunrise-to-sunset day length of the other entries), the target, and why
// it is clipped or longer than its half.
func TestLightingMeaningOncePerCalendar(t *testing.T) {
	s := site(t, "vienna", 48.2, 16.4, "Europe/Vienna")
	sk := sky(t, "2027-01-01", "2027-01-31")
	tomato := lightingSpec(t, "lighting:16h", func(ks *config.KindSpec) {
		ks.LatestOff, ks.MinDuration = "23:00", config.Duration(10*time.Minute)
	})
	seedling := lightingSpec(t, "lighting:14h30m", func(ks *config.KindSpec) {
		ks.Lamps, ks.Natural, ks.EarliestOn = config.LampsBoth, config.NaturalCivil, "05:30"
	})
	sunrise := config.KindSpec{Kind: mustKinds(t, "sunrise")[0]}
	f := &config.Feed{ID: "f", Kinds: []config.KindSpec{tomato, seedling, sunrise}}
	cal, err := sk.Calendar(context.Background(), s, f, date("2027-01-10"), date("2027-01-16"), Options{})
	if err != nil {
		t.Fatal(err)
	}
	want := []string{
		"Supplemental lighting to 16 h: lamp periods that make the natural day (sunrise to sunset) up to 16 h, in the evening; lamps off no later than 23:00; none under 10 min.",
		"Supplemental lighting to 14 h 30 min: lamp periods that make the natural day (civil dawn to civil dusk) up to 14 h 30 min, half in the morning, half in the evening; lamps on no earlier than 05:30.",
		civilLightMeaning, lightingAdvice,
	}
	for _, m := range want {
		if n := strings.Count(cal.Description, m); n != 1 {
			t.Errorf("%q %d times in the calendar's description:\n%s", m, n, cal.Description)
		}
	}
	if !strings.Contains(civilLightMeaning, "common practice") || !strings.Contains(lightingAdvice, "lighting programme of the crop or herd") {
		t.Errorf("lines %q, %q", civilLightMeaning, lightingAdvice)
	}
	loc := s.TimeZone.Location
	lamps := 0
	for _, e := range cal.Entries {
		if !strings.HasPrefix(e.Kind, "lighting:") {
			continue
		}
		lamps++
		for _, w := range append(want, "Civil twilight", "lighting programme", "Natural day (", s.Name, "Supplemental lighting") {
			if strings.Contains(e.Description, w) {
				t.Errorf("%s %s repeats %q:\n%s", e.Date.Format(time.DateOnly), e.Kind, w, e.Description)
			}
		}
		// its own numbers: the lamp times to the second, the lamp time,
		// the natural day and the target
		target := "16 h"
		if e.Kind == "lighting:14h30m" {
			target = "14 h 30 min"
		}
		// (lamps: both) and the date's other period, by its clock times
		// and length (TestLightingBothNamesTheOtherPeriod)
		line := Capital(e.Facts.Part) + " lamps on at " + localClock(e.Start, loc) + ", off at " + localClock(e.End, loc) + " (" + hm(e.Facts.Lamp)
		if e.Kind == "lighting:14h30m" {
			line += "; " + otherPart(e.Facts.Part) + " lamps "
		}
		natural := ").\nNatural day " + hm(e.Facts.DayLength) + "; target " + target + "."
		if e.Kind == "lighting:14h30m" {
			// natural: civil, named beside the sunrise-to-sunset day
			// of the tomato house's entries and of a daily summary
			natural = ").\nCivil dawn to dusk " + hm(e.Facts.DayLength) + "; target " + target + "."
		}
		if !strings.HasPrefix(e.Description, line) || !strings.Contains(e.Description, natural) {
			t.Errorf("%s %s: description\n%s\nwant it to start\n%s…%s", e.Date.Format(time.DateOnly), e.Kind, e.Description, line, natural)
		}
		if e.Facts.Short != strings.Contains(e.Description, "the target is not reached today") {
			t.Errorf("%s %s: short %v:\n%s", e.Date.Format(time.DateOnly), e.Kind, e.Facts.Short, e.Description)
		}
		if len(e.Description) > 300 {
			t.Errorf("%s %s: %d bytes of description:\n%s", e.Date.Format(time.DateOnly), e.Kind, len(e.Description), e.Description)
		}
	}
	if lamps != 3*7 { // the tomato house's evening, the seedlings' morning and evening
		t.Errorf("%d lamp entries in 7 days, want 21", lamps)
	}
	// a feed without lighting has none of these lines; without natural:
	// civil, no line on civil twilight
	for _, kinds := range [][]config.KindSpec{{sunrise}, {tomato}} {
		cal, err := sk.Calendar(context.Background(), s, &config.Feed{ID: "g", Kinds: kinds}, date("2027-01-10"), date("2027-01-10"), Options{})
		if err != nil {
			t.Fatal(err)
		}
		lit := kinds[0].Kind.Name == config.KindLighting
		if strings.Contains(cal.Description, civilLightMeaning) || strings.Contains(cal.Description, lightingAdvice) != lit ||
			strings.Contains(cal.Description, "Supplemental lighting") != lit {
			t.Errorf("%s: calendar description\n%s", kinds[0].Kind, cal.Description)
		}
	}
}

// TestLightingMinimumNamesTheDroppedPeriod checks the sentence of a period
// that takes all of a date's shortfall because the other would be under
// min_duration: it gives the length of that other period, what the limit
// left of it, not what its partner took over. lighting:14h, lamps: both,
// natural: civil, earliest_on 07:00, latest_off 21:00, min_duration 20m at
// 78.92° N, 11.93° E (Arctic/Longyearbyen). Civil dawn and dusk, PyEphem
// 4.1.4 (tools/pyephem-checks/values.py, lamp_periods): 27 February 2027
// 06:12:31.2 and 16:40:55.0 UT (07:12:31 and 17:40:55 CET), so the
// morning period left after 07:00 is 12 min 31 s ("13 min"); 9 October
// 2027 civil dawn 05:00:57.6 UT (07:00:58 CEST), a morning period of 58 s,
// and civil dusk 18:54:26 CEST, where the evening period starts (the
// same line of lamp_periods).
func TestLightingMinimumNamesTheDroppedPeriod(t *testing.T) {
	s := site(t, "polar-shed", 78.92, 11.93, "Arctic/Longyearbyen")
	sk := sky(t, "2027-01-01", "2027-12-31")
	spec := lightingSpec(t, "lighting:14h", func(ks *config.KindSpec) {
		ks.Lamps, ks.Natural, ks.EarliestOn, ks.LatestOff = config.LampsBoth, config.NaturalCivil, "07:00", "21:00"
		ks.MinDuration = config.Duration(20 * time.Minute)
	})
	for _, tc := range []struct{ date, start, sentence string }{
		{"2027-02-27", "17:40:55", "All of the shortfall in one period: the 13 min morning period would be under the minimum of 20 min.\n"},
		{"2027-10-09", "18:54:26", "All of the shortfall in one period: the morning period would be under 1 min.\n"},
	} {
		es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date(tc.date), date(tc.date))
		if err != nil {
			t.Fatal(err)
		}
		if len(es) != 1 || es[0].Facts.Part != partEvening {
			t.Fatalf("%s: %d entries, want one evening period", tc.date, len(es))
		}
		d := es[0].Description
		if !strings.Contains(d, "Evening lamps on at "+tc.start) || !strings.Contains(d, tc.sentence) {
			t.Errorf("%s: %q\nwant the evening from civil dusk %s and %q", tc.date, d, tc.start, tc.sentence)
		}
	}
}

// TestLightingUnderAMinute checks that a lamp period under a minute is
// not scheduled, whatever min_duration, and that the date gets the note of
// a period under the minimum. lighting:14h at 35° S, 144.96° E
// (Australia/Melbourne) on 26 January 2027: sunrise 19:32:39.3 UT on the
// 25th, sunset 09:31:56.2 UT, a day of 13 h 59 min 16.9 s, 43 s short of
// 14 h (PyEphem 4.1.4, tools/pyephem-checks/values.py, lamp_periods);
// with lamps: both the two halves of 21 and 22 s are each under a minute.
// Without the rule the entry read "Lamps on 20:32–20:32 (under 1 min, …)".
func TestLightingUnderAMinute(t *testing.T) {
	s := site(t, "river-bend", -35.0, 144.96, "Australia/Melbourne")
	sk := sky(t, "2027-01-01", "2027-12-31")
	for _, lamps := range []string{"", config.LampsMorning, config.LampsBoth} {
		spec := lightingSpec(t, "lighting:14h", func(ks *config.KindSpec) { ks.Lamps = lamps })
		es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date("2027-01-26"), date("2027-01-26"))
		if err != nil {
			t.Fatal(err)
		}
		const want = "Lamps not scheduled: less than 1 min needed, too short to switch the lamps on"
		if len(es) != 1 || !es[0].Facts.Note || es[0].Title != want {
			for _, e := range es {
				t.Logf("%s", e.Title)
			}
			t.Errorf("lamps %q: %d entries, want one note %q", lamps, len(es), want)
		}
	}
}

// TestLightingTitleAfterMidnight checks the title of a lamp period that
// ends after midnight: the mark of the next date comes after the end's
// clock, as a night's end is marked, and the one bracket holds the
// length. USNO table for Ithaca, NY, 1 January 2015 (rows sun-0001 and
// sun-0002: sunrise 08:36, sunset 17:44, UTC−4): lighting:16h in the
// evening runs from sunset to 00:36 the next date, 6 h 52 min; each
// table time is rounded to the minute.
func TestLightingTitleAfterMidnight(t *testing.T) {
	_, _, s := ithacaDay(t, "2015-01-01")
	sk := sky(t, "2015-01-01", "2015-12-31")
	spec := lightingSpec(t, "lighting:16h", nil)
	es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date("2015-01-01"), date("2015-01-01"))
	if err != nil {
		t.Fatal(err)
	}
	re := regexp.MustCompile(`^Lamps on 17:4[3-5]–00:3[5-7] \+1 day \(6 h 5[1-3] min, to reach 16 h\)$`)
	if len(es) != 1 || !re.MatchString(es[0].Title) {
		t.Fatalf("%+v; want one entry titled %s", es, re)
	}
	// the description marks the end in words, with its date, in one
	// bracket with the length
	off := regexp.MustCompile(`, off at 00:3[5-7]:\d\d UTC-04:00 the next day \(Fri 2 Jan; 6 h 5[1-3] min\)`)
	if !off.MatchString(es[0].Description) {
		t.Errorf("description %q; want %s", es[0].Description, off)
	}
}

// TestLightingTextsReadTrue checks the sentences of lamp periods that take
// more than their half of the shortfall, with lamps: both, lighting:16h or
// 14h, natural civil or sunrise to sunset. At 78.92° N, 11.93° E
// (Arctic/Longyearbyen, CET = UT + 1 h, tz database) with earliest_on
// 07:03, latest_off 21:00 and min_duration 10m, the civil dawn of
// 27 February 2027 at 06:12:31.2 UT (PyEphem 4.1.4, tools/pyephem-checks/
// values.py, lamp_periods) leaves a morning period of 9 min 31 s, which
// rounds to the 10 min minimum: the sentence says it to the second. At
// 48.2° N, 16.4° E (Europe/Vienna, CET) with latest_off 20:00, on 6 January
// 2027 the sunrise and sunset are 06:44:27.4 and 15:16:00.6 UT (PyEphem
// 4.1.4, the Sun's centre at −0.8333°, pressure 0, sea level): a day of
// 8 h 31 min 33 s, a shortfall of 7 h 28 min 27 s, half of it 3 h 44 min
// 13 s, and the evening to 20:00 CET is 3 h 43 min 59 s, so the morning
// makes up 14 s: its sentence begins with a capital.
func TestLightingTextsReadTrue(t *testing.T) {
	sk := sky(t, "2027-01-01", "2027-12-31")
	polar := site(t, "polar-shed", 78.92, 11.93, "Arctic/Longyearbyen")
	spec := lightingSpec(t, "lighting:14h", func(ks *config.KindSpec) {
		ks.Lamps, ks.Natural, ks.EarliestOn, ks.LatestOff = config.LampsBoth, config.NaturalCivil, "07:03", "21:00"
		ks.MinDuration = config.Duration(10 * time.Minute)
	})
	es, err := sk.Entries(context.Background(), polar, "f", []config.KindSpec{spec}, date("2027-02-27"), date("2027-02-27"))
	if err != nil {
		t.Fatal(err)
	}
	const minimum = "All of the shortfall in one period: the 9 min 31 s morning period would be under the minimum of 10 min.\n"
	if len(es) != 1 || es[0].Facts.Part != partEvening || !strings.Contains(es[0].Description, minimum) {
		t.Errorf("%+v\nwant one evening period saying %q", es, minimum)
	}
	vienna := site(t, "vienna", 48.2, 16.4, "Europe/Vienna")
	spec = lightingSpec(t, "lighting:16h", func(ks *config.KindSpec) { ks.Lamps, ks.LatestOff = config.LampsBoth, "20:00" })
	es, err = sk.Entries(context.Background(), vienna, "f", []config.KindSpec{spec}, date("2027-01-06"), date("2027-01-06"))
	if err != nil {
		t.Fatal(err)
	}
	const made = "\nUnder 1 min longer than half the shortfall, to make up for the evening lamps, which are clipped (off no later than 20:00)."
	if len(es) != 2 || !strings.HasPrefix(es[0].Description, "Morning lamps on at 04:00:00 CET, off at 07:44:27 CET") ||
		!strings.Contains(es[0].Description, made) {
		t.Errorf("%+v\nwant the morning from 04:00:00 to the sunrise at 07:44:27 saying %q", es, made)
	}
}

// TestLightingLimitSkippedByTheClocks checks a lamp limit that the clocks
// skip: in Asia/Beirut the clocks go from 00:00 to 01:00 on Sunday 28 March
// 2027 (IANA tz database, Lebanon: the last Sunday of March at 0:00), so
// earliest_on (latest_off) 00:30 clips the lamps at 01:30 EEST, 22:30 UT
// on the 27th, and the text says why, in the words of a plan's moved time.
// The targets (20 h, 21 h) are far from any natural day at 33.9° N, so
// both periods are clipped whatever the sunrise and sunset.
func TestLightingLimitSkippedByTheClocks(t *testing.T) {
	s := site(t, "cedar-room", 33.89, 35.50, "Asia/Beirut")
	sk := sky(t, "2027-01-01", "2027-12-31")
	at := time.Date(2027, 3, 27, 22, 30, 0, 0, time.UTC)
	const moved = "moved from 00:30, which the clocks skip on Sun 28 Mar 2027: the clocks go forward for summer time by 1 h"
	for _, tc := range []struct {
		kind, lamps, on, off, date, want string
	}{
		{"lighting:20h", config.LampsMorning, "00:30", "", "2027-03-28", "Morning lamps on at 01:30:00 EEST (" + moved + "), off at "},
		{"lighting:21h", "", "", "00:30", "2027-03-27", " min; off " + moved + ").\n"},
	} {
		spec := lightingSpec(t, tc.kind, func(ks *config.KindSpec) { ks.Lamps, ks.EarliestOn, ks.LatestOff = tc.lamps, tc.on, tc.off })
		es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date(tc.date), date(tc.date))
		if err != nil {
			t.Fatal(err)
		}
		if len(es) != 1 || !es[0].Facts.Short {
			t.Fatalf("%s: %d entries, want one clipped period", tc.kind, len(es))
		}
		e := es[0]
		if (tc.on != "" && !e.Start.Equal(at)) || (tc.off != "" && (!e.End.Equal(at) || !strings.Contains(e.Description, ", off at 01:30:00 EEST the next day (Sun 28 Mar; "))) ||
			!strings.Contains(e.Description, tc.want) {
			t.Errorf("%s: %s–%s %q\nwant the limit at %s and %q", tc.kind, e.Start, e.End, e.Description, at, tc.want)
		}
	}
	// an evening period that makes up for the morning's (not the text of
	// a period alone) words its moved end the same way: in
	// America/Santiago the clocks go from 00:00 −04 to 01:00 −03 on Sunday
	// 5 September 2027 (IANA tz database, Rule Chile 2023 max - Sep Sun>=2
	// 4:00u; zdump -v America/Santiago), so latest_off 00:30 clips the
	// lamps of the 4th at 01:30 −03, 04:30 UT
	santiago := site(t, "santiago", -33.45, -70.67, "America/Santiago")
	spec := lightingSpec(t, "lighting:22h", func(ks *config.KindSpec) {
		ks.Lamps, ks.EarliestOn, ks.LatestOff = config.LampsBoth, "06:30", "00:30"
	})
	es, err := sk.Entries(context.Background(), santiago, "f", []config.KindSpec{spec}, date("2027-09-04"), date("2027-09-04"))
	if err != nil {
		t.Fatal(err)
	}
	const evening = "; off moved from 00:30, which the clocks skip on Sun 5 Sep 2027: the clocks go forward for summer time by 1 h; morning lamps "
	if len(es) != 2 || !es[1].End.Equal(time.Date(2027, 9, 5, 4, 30, 0, 0, time.UTC)) || !strings.Contains(es[1].Description, "to make up for the morning lamps") ||
		!strings.Contains(es[1].Description, evening) {
		t.Errorf("%+v\nwant an evening period making up, off at 04:30 UT, saying %q", es, evening)
	}
	// the date after, 00:30 is on the clock again: no such words
	spec = lightingSpec(t, "lighting:20h", func(ks *config.KindSpec) { ks.Lamps, ks.EarliestOn = config.LampsMorning, "00:30" })
	es, err = sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date("2027-03-29"), date("2027-03-29"))
	if err != nil {
		t.Fatal(err)
	}
	if len(es) != 1 || strings.Contains(es[0].Description, "moved") || !strings.HasPrefix(es[0].Description, "Morning lamps on at 00:30:00 EEST, off at ") {
		t.Errorf("29 March: %+v", es)
	}
}

// TestLampNoteWithin: the "no lamps needed" note of a year's calendar,
// given another last date, has the title, description and end of the note
// that a calendar from its date to that last date computes: "through" the
// last date when lamps are needed again after it, "until" the date
// otherwise. At 48.2° N the days of 14 h or more last from about 21 April
// to about 22 August (TestLightingEntries, photoperiod:14h).
func TestLampNoteWithin(t *testing.T) {
	s := site(t, "vienna", 48.2, 16.4, "Europe/Vienna")
	sk := sky(t, "2027-01-01", "2027-12-31")
	specs := []config.KindSpec{lightingSpec(t, "lighting:14h", nil)}
	note := func(first, last time.Time) Entry {
		t.Helper()
		es, err := sk.Entries(context.Background(), s, "f", specs, first, last)
		if err != nil {
			t.Fatal(err)
		}
		for _, e := range es {
			if e.Facts.Note && !e.Facts.Short {
				return e
			}
		}
		t.Fatalf("%s..%s: no note that no lamps are needed", first.Format(time.DateOnly), last.Format(time.DateOnly))
		return Entry{}
	}
	year := note(date("2027-01-01"), date("2027-12-31"))
	if year.Facts.Until.IsZero() || year.Date.Month() != time.April || year.Facts.Until.Month() != time.August {
		t.Fatalf("the year's note %s..%s, want April to August", year.Date.Format(time.DateOnly), year.Facts.Until.Format(time.DateOnly))
	}
	for _, last := range []time.Time{year.Date.AddDate(0, 0, 6), year.Facts.Until.AddDate(0, 0, -1), year.Facts.Until, date("2027-10-31")} {
		want := note(year.Date, last)
		got := year
		if err := LampNoteWithin(&got, year.Facts.Until, last); err != nil {
			t.Fatal(err)
		}
		if got.Title != want.Title || got.Description != want.Description || !got.Facts.Until.Equal(want.Facts.Until) {
			t.Errorf("through %s: %q, %q, until %s; the calendar's %q, %q, until %s", last.Format(time.DateOnly),
				got.Title, got.Description, got.Facts.Until, want.Title, want.Description, want.Facts.Until)
		}
	}
	other := Entry{Kind: "sunrise", Title: "Sunrise", Date: date("2027-06-01")}
	if err := LampNoteWithin(&other, time.Time{}, date("2027-06-30")); err == nil || !strings.Contains(err.Error(), `"sunrise"`) {
		t.Errorf("a sunrise: error %v, want one naming the kind", err)
	}
}

// TestLightingLimitRepeatedByTheClocks checks a lamp limit that the clocks
// show twice: in Europe/Berlin they go back from 03:00 CEST to 02:00 CET
// at 01:00 UT on Sunday 31 October 2027 (IANA tz database, Rule EU 1981
// max - Oct lastSun 1:00u), so latest_off 02:30 is 00:30 UT (CEST) and
// again 01:30 UT (CET); the lamps go off at the first, 02:30:00 CEST, as
// RFC 5545 §3.3.5 reads an ambiguous local time ("the first occurrence"),
// and earliest_on 02:30 puts them on at that first 02:30 too. The target
// (21 h) is far from any natural day at 52.5° N, so the evening and the
// morning periods are clipped whatever the sunset and sunrise.
func TestLightingLimitRepeatedByTheClocks(t *testing.T) {
	s := site(t, "berlin-room", 52.52, 13.40, "Europe/Berlin")
	sk := sky(t, "2027-01-01", "2027-12-31")
	spec := lightingSpec(t, "lighting:21h", func(ks *config.KindSpec) { ks.LatestOff = "02:30" })
	es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date("2027-10-30"), date("2027-10-30"))
	if err != nil {
		t.Fatal(err)
	}
	if len(es) != 1 || !es[0].Facts.Short {
		t.Fatalf("%d entries, want one clipped period", len(es))
	}
	e := es[0]
	if at := time.Date(2027, 10, 31, 0, 30, 0, 0, time.UTC); !e.End.Equal(at) || !strings.Contains(e.Description, ", off at 02:30:00 CEST the next day (Sun 31 Oct; ") ||
		strings.Contains(e.Description, "moved") {
		t.Errorf("%s–%s %q\nwant the lamps off at %s, 02:30:00 CEST", e.Start, e.End, e.Description, at)
	}
	// the same holds for earliest_on: morning lamps on no earlier than
	// 02:30 go on at the first 02:30 of 31 October, 00:30 UT (CEST)
	spec = lightingSpec(t, "lighting:21h", func(ks *config.KindSpec) { ks.Lamps, ks.EarliestOn = config.LampsMorning, "02:30" })
	es, err = sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date("2027-10-31"), date("2027-10-31"))
	if err != nil {
		t.Fatal(err)
	}
	if len(es) != 1 || !es[0].Facts.Short {
		t.Fatalf("%d entries, want one clipped period", len(es))
	}
	e = es[0]
	if at := time.Date(2027, 10, 31, 0, 30, 0, 0, time.UTC); !e.Start.Equal(at) || !strings.Contains(e.Description, "on at 02:30:00 CEST") ||
		strings.Contains(e.Description, "moved") {
		t.Errorf("%s–%s %q\nwant the lamps on at %s, 02:30:00 CEST", e.Start, e.End, e.Description, at)
	}
}

// clockSpan is the time from clock from to clock to on one date, both
// "15:04" (unit 60) or "15:04:05" (unit 1).
func clockSpan(t *testing.T, from, to string, unit int) time.Duration {
	t.Helper()
	layout := "15:04:05"
	if unit == 60 {
		layout = "15:04"
	}
	a, err1 := time.Parse(layout, from)
	b, err2 := time.Parse(layout, to)
	if err1 != nil || err2 != nil {
		t.Fatalf("clock times %q, %q: %v, %v", from, to, err1, err2)
	}
	return b.Sub(a)
}

// A morning period of a long target that goes on the evening before its
// date says so in its title ("from the evening before"), as an evening
// period's end after midnight is marked "+1 day", and its description
// names that date in the words a plan's uses; the row of the date keeps
// the length alone (its time column shows the start's date). At 52.95° N,
// 1.05° W (sea level, Europe/London) the Sun rises at 06:59:17 UT on 31
// October 2027 and sets at 16:35:35 UT (PyEphem 4.1.4: pressure 0, the
// Sun's centre at −50′): a natural day of 9 h 36 min, so lighting:18h in
// the morning runs 8 h 24 min, from 22:35:35 UT (23:35:35 BST) on Saturday
// 30 October. On 28 March 2027 the same period goes on at 00:31:19 GMT, on
// its own date (TestLampPeriodAcrossClockChange), and says nothing of it.
func TestMorningLampsFromTheEveningBefore(t *testing.T) {
	s := site(t, "Thistlewick Barn", 52.95, -1.05, "Europe/London")
	spec := lightingSpec(t, "lighting:18h", func(ks *config.KindSpec) { ks.Lamps = config.LampsMorning })
	for _, c := range []struct {
		day, title, desc, row string
	}{
		{"2027-10-31", "Lamps on 23:36–06:59 (from the evening before, 8 h 23 min, to reach 18 h)",
			"Morning lamps on at 23:35:35 BST the day before (Sat 30 Oct), off at 06:59:17 GMT (8 h 24 min).",
			"Lamps on for 8 h 23 min, to reach 18 h"},
		{"2027-03-28", "Lamps on 00:31–06:48 (5 h 17 min, to reach 18 h)",
			"Morning lamps on at 00:31:19 GMT, off at 06:48:26 BST (5 h 17 min).",
			"Lamps on for 5 h 17 min, to reach 18 h"},
	} {
		sk := sky(t, c.day, c.day)
		es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date(c.day), date(c.day))
		if err != nil {
			t.Fatal(err)
		}
		if len(es) != 1 {
			t.Fatalf("%s: %d entries, want one period: %+v", c.day, len(es), es)
		}
		e := &es[0]
		if e.Title != c.title || !strings.HasPrefix(e.Description, c.desc) || RowTitle(e) != c.row {
			t.Errorf("%s: title %q, row %q, description %q\nwant %q, %q, %q", c.day, e.Title, RowTitle(e), e.Description, c.title, c.row, c.desc)
		}
	}
}
