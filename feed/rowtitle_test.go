package feed

import (
	"context"
	"regexp"
	"strings"
	"testing"
	"time"

	"heliocal/astro"
	"heliocal/config"
)

// lampTitle is a lamp period's title in a calendar app: its clock times,
// then its length and target in brackets.
var lampTitle = regexp.MustCompile(`^Lamps on \d\d:\d\d–\d\d:\d\d( \+1 day)? \((.+)\)$`)

// A row of the served table or the builder's preview shows an entry's
// times and date beside its title (the time column, the row's date): the
// entry carries its title's form for the row, written with the title, which
// says neither again. Salzburg (47.8° N) in December needs lamps every
// evening for a 16 h day and has dark windows. A label is the user's title,
// in a row too; an offset names its shift in the row as in the title.
func TestRowTitleSaysTimesOnce(t *testing.T) {
	s := site(t, "salzburg", 47.8, 13.06, "Europe/Vienna")
	first, last := date("2026-12-01"), date("2026-12-14")
	sk := sky(t, "2026-12-01", "2026-12-14")
	kinds := mustKinds(t, "lighting:16h", "dark-window")
	entries := func(spec ...config.KindSpec) []Entry {
		t.Helper()
		es, err := sk.Entries(context.Background(), s, "f", spec, first, last)
		if err != nil {
			t.Fatal(err)
		}
		return es
	}
	lamps, windows := 0, 0
	for _, e := range entries(config.KindSpec{Kind: kinds[0]}, config.KindSpec{Kind: kinds[1]}) {
		row := RowTitle(&e)
		switch {
		case e.Kind == "lighting:16h" && !e.Facts.Note:
			lamps++
			if m := lampTitle.FindStringSubmatch(e.Title); m == nil || row != "Lamps on for "+m[2] {
				t.Errorf("lamps %q: row %q, want its length and target", e.Title, row)
			}
		case e.Kind == "dark-window" && !e.Facts.Note:
			windows++
			if e.Title != row+", "+NightOf(e.Date, time.UTC) {
				t.Errorf("dark window %q: row %q, want the title without its night", e.Title, row)
			}
		}
	}
	if lamps == 0 || windows == 0 {
		t.Fatalf("%d lamp periods, %d dark windows: want both", lamps, windows)
	}
	const label = "Lamps on 16:42–20:12 (from the timer)"
	for _, e := range entries(config.KindSpec{Kind: kinds[0], Label: label}, config.KindSpec{Kind: kinds[1], Label: "Dark sky, night of the count"}) {
		if !e.Facts.Note && RowTitle(&e) != e.Title {
			t.Errorf("label %q: row %q", e.Title, RowTitle(&e))
		}
	}
	for _, e := range entries(config.KindSpec{Kind: kinds[1], Offset: config.Duration(-20 * time.Minute)}) {
		if row := RowTitle(&e); !e.Facts.Note && (e.Title != row+", "+NightOf(e.Date, time.UTC) || !strings.HasPrefix(row, "20 min before dark sky, ")) {
			t.Errorf("dark window 20 min before %q: row %q", e.Title, row)
		}
	}
}

// A date without its kind's event has a note, whose title in a calendar
// app names its date as today, tonight or the night of its dates, and in a
// row the row's date ("on this date", "this night"). At 50° N, 10° E (sea
// level, Europe/Berlin) the only dark window of the night of 12–13 May 2027
// runs from moonset at 00:37:00 UTC to astronomical dawn at 00:59:42 UTC,
// 22.70 min, under a minimum of 45 min (PyEphem 4.1.4, Observer at 50.0,
// 10.0, pressure 0; the Sun's centre at −18°, the Moon's upper limb at
// −34′). The other notes' states are given.
func TestRowTitleOfDatesWithoutEvent(t *testing.T) {
	s := site(t, "mid-50", 50, 10, "Europe/Berlin")
	sk := sky(t, "2027-05-12", "2027-05-12")
	dark := config.KindSpec{Kind: mustKinds(t, "dark-window")[0], MinDuration: config.Duration(45 * time.Minute)}
	es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{dark}, date("2027-05-12"), date("2027-05-12"))
	if err != nil {
		t.Fatal(err)
	}
	if len(es) != 1 || es[0].Title != "No dark sky of 45 min or more on the night of 12–13 May 2027: the longest dark window is 23 min" ||
		RowTitle(&es[0]) != "No dark sky of 45 min or more on this night: the longest dark window is 23 min" {
		for _, e := range es {
			t.Errorf("%s: %q, row %q", e.Date.Format(time.DateOnly), e.Title, RowTitle(&e))
		}
		t.Fatalf("%d entries, want the note of the night of 12–13 May", len(es))
	}

	info := newSiteInfo(s)
	k := func(name string) config.Kind { return mustKinds(t, name)[0] }
	night := date("2027-01-21")
	for _, tc := range []struct {
		note       Note
		title, row string
	}{
		{Note{Kind: k("sunrise"), Family: "sun-horizon", State: astro.AlwaysBelow, Date: night},
			"Polar night: the Sun does not rise today", "Polar night: the Sun does not rise on this date"},
		{Note{Kind: k("civil-dawn"), Family: "civil", State: astro.AlwaysAbove, Date: night, Dusk: night.Add(23*time.Hour + 20*time.Minute)},
			"No civil dawn today: civil twilight lasted all last night", "No civil dawn on this date: civil twilight lasted all the night before"},
		{Note{Kind: k("nautical-dusk"), Family: "nautical", State: astro.AlwaysAbove, Date: night},
			"No nautical dusk or dawn tonight: nautical twilight lasts all night", "No nautical dusk or dawn on this date: nautical twilight lasts all night"},
		{Note{Kind: k("solar-noon"), Family: "solar-noon", State: astro.Crosses, Date: night},
			"No solar noon today", "No solar noon on this date"},
		{Note{Kind: k("moonrise"), Family: "moonrise", State: astro.Crosses, Date: night},
			"No moonrise today", "No moonrise on this date"},
		{Note{Kind: k("dark-window"), Family: "dark-window", State: astro.AlwaysBelow, Date: night},
			"No dark sky on the night of 21–22 January 2027: the Moon is up and bright all through the astronomical night",
			"No dark sky on this night: the Moon is up and bright all through the astronomical night"},
		// no date in the title: the same in a row
		{Note{Kind: k("moonset"), Family: "moonset", State: astro.AlwaysAbove, Date: night}, "The Moon stays above the horizon all day", ""},
	} {
		title, row, _ := describeNote(info, tc.note)
		if title != tc.title || row != tc.row {
			t.Errorf("%s note: %q, row %q; want %q, row %q", tc.note.Kind, title, row, tc.title, tc.row)
		}
	}
}
