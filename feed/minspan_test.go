package feed

import (
	"context"
	"math"
	"strings"
	"testing"
	"time"

	"heliocal/config"
)

// Dates whose spans are all under min_duration are not silent: at 50° N,
// 10° E (sea level, Europe/Berlin) in May and June 2027 the astronomical
// night is short and the waxing Moon shortens it further, and every night
// has its dark window of 45 min or more or a note, as every date has a
// blue hour of 20 min or more or a note.
//
// Source: PyEphem 4.1.4 (Observer at 50.0, 10.0, pressure 0; the Sun's
// centre at −18°, the Moon's upper limb at −34′; for the blue hour the
// Sun's centre at −6° and −4°):
//   - night of 11–12 May: moonset 2027-05-12 00:14:13 UTC, astronomical
//     dawn 01:03:05 UTC: a window of 48.86 min, kept;
//   - night of 12–13 May: moonset 2027-05-13 00:37:00 UTC, astronomical
//     dawn 00:59:42 UTC: 22.70 min, the only window;
//   - night of 13–14 May: moonset 2027-05-14 00:55:13 UTC, astronomical
//     dawn 00:56:17 UTC: 1.06 min;
//   - blue hour of 12 May: 03:00:18–03:15:41 and 19:18:08–19:33:36 UTC,
//     15.38 and 15.48 min.
func TestSpansUnderMinimumNoted(t *testing.T) {
	s := site(t, "mid-50", 50, 10, "Europe/Berlin")
	first, last := date("2027-05-01"), date("2027-06-30")
	sk := sky(t, "2027-05-01", "2027-06-30")
	dark := config.KindSpec{Kind: mustKinds(t, "dark-window")[0], MinDuration: config.Duration(45 * time.Minute)}
	blue := config.KindSpec{Kind: mustKinds(t, "blue-hour")[0], MinDuration: config.Duration(20 * time.Minute)}
	es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{dark, blue}, first, last)
	if err != nil {
		t.Fatal(err)
	}
	byDate := map[string][]Entry{}
	for _, e := range es {
		k := e.Kind + " " + e.Date.Format(time.DateOnly)
		byDate[k] = append(byDate[k], e)
	}
	notes := 0
	for d := first; !d.After(last); d = d.AddDate(0, 0, 1) {
		for _, kind := range []string{"dark-window", "blue-hour"} {
			got := byDate[kind+" "+d.Format(time.DateOnly)]
			if len(got) == 0 {
				t.Errorf("%s %s: no entry", kind, d.Format(time.DateOnly))
			}
			for _, e := range got {
				if e.Facts.Longest > 0 {
					notes++
				}
			}
		}
	}
	if notes < 61 { // the blue hour of every date, and some nights
		t.Errorf("%d notes of spans under the minimum, want at least 61", notes)
	}
	for _, tc := range []struct {
		kind, date, title string
		longest           float64 // minutes, PyEphem
	}{
		{"dark-window", "2027-05-12", "No dark sky of 45 min or more on the night of 12–13 May 2027: the longest dark window is 23 min", 22.70},
		{"dark-window", "2027-05-13", "No dark sky of 45 min or more on the night of 13–14 May 2027: the longest dark window is 1 min", 1.06},
		{"blue-hour", "2027-05-12", "No blue hour of 20 min or more today: the longest is 15 min", 15.48},
	} {
		got := byDate[tc.kind+" "+tc.date]
		if len(got) != 1 || !got[0].AllDay || !got[0].Facts.Note {
			t.Errorf("%s %s: %d entries, want one all-day note", tc.kind, tc.date, len(got))
			continue
		}
		e := got[0]
		if e.Title != tc.title {
			t.Errorf("%s %s: title %q, want %q", tc.kind, tc.date, e.Title, tc.title)
		}
		if !strings.HasPrefix(e.Description, tc.title) || !strings.HasSuffix(e.Description, " minimum.") {
			t.Errorf("%s %s: description %q", tc.kind, tc.date, e.Description)
		}
		if d := e.Facts.Longest.Minutes() - tc.longest; math.Abs(d) > 0.1 {
			t.Errorf("%s %s: longest %v, want %.2f min (PyEphem)", tc.kind, tc.date, e.Facts.Longest, tc.longest)
		}
	}
	if got := byDate["dark-window 2027-05-11"]; len(got) != 1 || got[0].AllDay || got[0].End.Sub(got[0].Start) < 45*time.Minute {
		t.Errorf("night of 11–12 May: %+v, want its window of 48.86 min (PyEphem)", got)
	}
}

// The weekdays and months filters apply to such a note as to any entry,
// and an all_day kind keeps every span: no note.
func TestSpansUnderMinimumFiltered(t *testing.T) {
	s := site(t, "mid-50", 50, 10, "Europe/Berlin")
	sk := sky(t, "2027-05-12", "2027-05-13")
	k := mustKinds(t, "dark-window")[0]
	wed := config.KindSpec{Kind: k, MinDuration: config.Duration(45 * time.Minute), Weekdays: []string{"wed"}}
	es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{wed}, date("2027-05-12"), date("2027-05-13"))
	if err != nil {
		t.Fatal(err)
	}
	// 12 May 2027 is a Wednesday, 13 May a Thursday
	if len(es) != 1 || !es[0].Date.Equal(date("2027-05-12")) || es[0].Facts.Longest == 0 {
		t.Errorf("weekdays [wed]: %+v, want the note of Wednesday 12 May alone", es)
	}
	allDay := config.KindSpec{Kind: k, MinDuration: config.Duration(45 * time.Minute), AllDay: true}
	es, err = sk.Entries(context.Background(), s, "f", []config.KindSpec{allDay}, date("2027-05-12"), date("2027-05-13"))
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range es {
		if e.Facts.Note {
			t.Errorf("all_day: a note %q, want the windows kept", e.Title)
		}
	}
	if len(es) != 2 {
		t.Errorf("all_day: %d entries, want the 2 windows", len(es))
	}
}

// A longest span that rounds to the minimum is written to the second: 44
// min 40 s is under the 45 min minimum, "45 min" would not be.
func TestUnderMinimumTextRounding(t *testing.T) {
	n := Note{Kind: mustKinds(t, "golden-hour")[0], Date: date("2027-05-12"), Longest: 44*time.Minute + 40*time.Second, Minimum: 45 * time.Minute}
	title, _, why := underMinimumText(n, time.UTC)
	if want := "No golden hour of 45 min or more today: the longest is 44 min 40 s"; title != want {
		t.Errorf("title %q, want %q", title, want)
	}
	if why != ", under the 45 min minimum" {
		t.Errorf("why %q", why)
	}
	n.Kind, n.Longest, n.Minimum = mustKinds(t, "sun-band:-3..12")[0], 100*time.Minute, 2*time.Hour
	if title, _, _ := underMinimumText(n, time.UTC); title != "No span with the Sun between −3° and +12° of 2 h or more today: the longest is 1 h 40 min" {
		t.Errorf("sun band: %q", title)
	}
}

// The calendar's description says once for each span kind with a
// min_duration what is left out and that the dates (nights) left without a
// span get a note; a kind without one, and a point kind, say nothing of it.
func TestMinDurationInCalendarDescription(t *testing.T) {
	s := site(t, "mid-50", 50, 10, "Europe/Berlin")
	sk := sky(t, "2027-05-12", "2027-05-12")
	spec := func(name string, d time.Duration) config.KindSpec {
		return config.KindSpec{Kind: mustKinds(t, name)[0], MinDuration: config.Duration(d)}
	}
	f := &config.Feed{ID: "spans", Site: s.ID, Kinds: []config.KindSpec{
		spec("dark-window", 45*time.Minute), spec("golden-hour", 20*time.Minute), spec("sun-band:2..12", 15*time.Minute),
		spec("solar-eclipse", 30*time.Minute), spec("blue-hour", 0), spec("sunset", 0),
	}}
	cal, err := sk.Calendar(context.Background(), s, f, date("2027-05-12"), date("2027-05-12"), Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{
		"\nDark sky: windows under 45 min are left out; a night that has only shorter ones gets a note saying so.\n",
		"\nGolden hour: spans under 20 min are left out; a date that has only shorter ones gets a note saying so.\n",
		"\nSun between +2° and +12°: spans under 15 min are left out; a date that has only shorter ones gets a note saying so.\n",
		"\nSolar eclipse: spans under 30 min are left out.\n",
	} {
		if strings.Count(cal.Description, want) != 1 {
			t.Errorf("the description does not say once %q:\n%s", want, cal.Description)
		}
	}
	if strings.Contains(cal.Description, "Blue hour: spans") || strings.Contains(cal.Description, "Sunset: spans") {
		t.Errorf("a kind without min_duration is said to leave spans out:\n%s", cal.Description)
	}
}

// The calendar's description says on which dates the filters keep a kind's
// entries, kinds with the same filters named together, weekdays from Monday
// and months in the calendar's order (the Gregorian calendar), dates as
// written out.
func TestFiltersInCalendarDescription(t *testing.T) {
	s := site(t, "venue", 47.5, 9.7, "Europe/Zurich")
	sk := sky(t, "2027-06-12", "2027-06-12")
	dates := []string{"2027-08-21", "2027-06-12"}
	f := &config.Feed{ID: "f", Site: s.ID, Kinds: []config.KindSpec{
		{Kind: mustKinds(t, "golden-hour")[0], Dates: dates},
		{Kind: mustKinds(t, "sunset")[0], Dates: dates},
		{Kind: mustKinds(t, "sun-altitude:-3")[0], Weekdays: []string{"sat", "Friday"}, Months: []string{"dec", "jan"}},
		{Kind: mustKinds(t, "sunrise")[0]},
	}}
	cal, err := sk.Calendar(context.Background(), s, f, date("2027-06-12"), date("2027-06-12"), Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{
		"\nGolden hour and sunset: only on 12 June 2027 and 21 August 2027.\n",
		"\nSun at −3°: only on Fridays and Saturdays, in January and December.\n",
	} {
		if strings.Count(cal.Description, want) != 1 {
			t.Errorf("the description does not say once %q:\n%s", want, cal.Description)
		}
	}
	if strings.Contains(cal.Description, "Sunrise: only") {
		t.Errorf("a kind without filters is said to be filtered:\n%s", cal.Description)
	}
}

// A dark window shown all day is on the date of its night, as its title
// and the notes of nights without one are, also when it begins after
// midnight. At 50° N, 10° E (sea level, Europe/Berlin) the window of the
// night of 11–12 May 2027 begins at moonset, 2027-05-12 00:14:13 UTC
// (02:14 CEST on 12 May), and ends at astronomical dawn, 01:03:05 UTC
// (PyEphem 4.1.4, as in TestSpansUnderMinimumNoted).
func TestDarkWindowAllDayDate(t *testing.T) {
	s := site(t, "mid-50", 50, 10, "Europe/Berlin")
	sk := sky(t, "2027-05-11", "2027-05-11")
	spec := config.KindSpec{Kind: mustKinds(t, "dark-window")[0], AllDay: true}
	es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date("2027-05-11"), date("2027-05-11"))
	if err != nil {
		t.Fatal(err)
	}
	if len(es) != 1 {
		t.Fatalf("%d entries, want the window of the night of 11–12 May: %+v", len(es), es)
	}
	e := es[0]
	if !e.AllDay || !e.Date.Equal(date("2027-05-11")) || !e.Start.Equal(date("2027-05-11")) || !strings.Contains(e.Title, "night of 11–12 May 2027") {
		t.Errorf("all-day dark window: %q on %s (start %s), want it on 2027-05-11, the date of its night", e.Title, e.Date.Format(time.DateOnly), e.Start)
	}
	// the date filters read the same date, in a feed and in a listing of
	// events: 11 May 2027 is a Tuesday, 12 May a Wednesday (proleptic
	// Gregorian calendar, as time.Time counts)
	for _, c := range []struct {
		day  string
		kept int
	}{{"tue", 1}, {"wed", 0}} {
		spec.Weekdays = []string{c.day}
		es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date("2027-05-11"), date("2027-05-11"))
		if err != nil {
			t.Fatal(err)
		}
		evs, _, err := sk.EventsFor(context.Background(), PlaceOf(s), []config.KindSpec{spec}, date("2027-05-11"), date("2027-05-11"))
		if err != nil {
			t.Fatal(err)
		}
		if len(es) != c.kept || len(evs) != c.kept {
			t.Errorf("all-day dark window of the night of 11–12 May, weekdays %s: %d entries and %d events, want %d", c.day, len(es), len(evs), c.kept)
		}
	}
}
