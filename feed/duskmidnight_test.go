package feed

import (
	"context"
	"strings"
	"testing"
	"time"

	"heliocal/astro"
	"heliocal/config"
)

// A dusk's note speaks of the date's evening and night, up to the next
// date's solar noon. At the edges of the white nights the evening's dusk
// may come after midnight, on the next date (the date's note then says so,
// state Crosses, with that dusk), or there may be none that night although
// the date has a dawn after midnight (the night's note: twilight lasts all
// night). Every instant is PyEphem 4.1.4's (Sun's centre, pressure 0, horizon
// −18° or −12°, next_setting/next_rising with use_center=True, the site's
// elevation); the crossings at these edges are grazing, so an instant is
// held to 1 s.
func TestDuskNoteFollowsTheEvening(t *testing.T) {
	tromso := site(t, "tromso", 69.65, 18.95, "Europe/Oslo")
	tromso.Elevation = 120
	palmer := site(t, "palmer", -64.77, -64.05, "Antarctica/Palmer")
	south60 := site(t, "south60", -60, -45, "America/Argentina/Ushuaia")
	type want struct {
		day   string
		state astro.State // of the date's note (Crosses: with its dusk), or anEvent
		dusk  string      // PyEphem, UTC: the evening's dusk (the note's, or the date's event)
		text  string      // the note's description begins so
	}
	for _, tc := range []struct {
		name  string
		s     *config.Site
		kind  string
		first string
		dates []want
	}{
		{"69.65N autumn, astronomical", tromso, "astronomical-dusk", "2027-09-16", []want{
			// PyEphem: AlwaysUpError, the Sun's centre at −17°54′ at the
			// lower transit 2027-09-16 22:38:58 UT
			{"2027-09-16", astro.AlwaysAbove, "", "The Sun's centre stays less than 18° below the horizon all night."},
			// PyEphem: setting 2027-09-17 22:00:57.658 UT (00:00:58 CEST on the 18th)
			{"2027-09-17", astro.Crosses, "2027-09-17T22:00:57.658Z",
				"No astronomical dusk on this date: this evening's comes after midnight, at 00:00:58 CEST on Sat 18 Sep."},
			// PyEphem: setting 2027-09-18 21:40:28.289 UT, the date's own
			// (besides the one of the evening before)
			{"2027-09-18", anEvent, "2027-09-18T21:40:28.289Z", ""},
		}},
		{"69.65N autumn, nautical", tromso, "nautical-dusk", "2027-08-31", []want{
			// PyEphem: AlwaysUpError, −11°53′ at the lower transit 2027-08-31 22:44:27 UT
			{"2027-08-31", astro.AlwaysAbove, "", "The Sun's centre stays less than 12° below the horizon all night."},
			// PyEphem: setting 2027-09-01 22:07:53.182 UT (00:07:53 CEST on the 2nd)
			{"2027-09-01", astro.Crosses, "2027-09-01T22:07:53.182Z",
				"No nautical dusk on this date: this evening's comes after midnight, at 00:07:53 CEST on Thu 2 Sep."},
			// PyEphem: setting 2027-09-02 21:47:18.213 UT
			{"2027-09-02", anEvent, "2027-09-02T21:47:18.213Z", ""},
		}},
		{"69.65N spring, astronomical", tromso, "astronomical-dusk", "2027-03-24", []want{
			// PyEphem: settings 2027-03-24 21:48:52.325 UT, 2027-03-25 22:07:56.247 UT
			{"2027-03-24", anEvent, "2027-03-24T21:48:52.325Z", ""},
			{"2027-03-25", anEvent, "2027-03-25T22:07:56.247Z", ""},
			// the date's only crossing is the dawn at 00:30:52 CET
			// (PyEphem: rising 2027-03-25 23:30:52 UT), and no dusk follows:
			// AlwaysUpError, the Sun's centre above −18° at the lower
			// transit 2027-03-26 22:49:47 UT
			{"2027-03-26", astro.AlwaysAbove, "", "The Sun's centre stays less than 18° below the horizon all night."},
			{"2027-03-27", astro.AlwaysAbove, "", "The Sun's centre stays less than 18° below the horizon all night."},
		}},
		{"69.65N midsummer", tromso, "astronomical-dusk", "2027-06-21", []want{
			// PyEphem: AlwaysUpError at horizon 0°, 2027-06-21 22:46:04 UT
			{"2027-06-21", astro.AlwaysAbove, "", "The Sun stays above the horizon all day and night."},
		}},
		{"64.77S autumn, nautical", palmer, "nautical-dusk", "2027-02-12", []want{
			// PyEphem: AlwaysUpError, −11°47′ at the lower transit 2027-02-13 04:30:23 UT
			{"2027-02-12", astro.AlwaysAbove, "", "The Sun's centre stays less than 12° below the horizon all night."},
			// PyEphem: setting 2027-02-14 04:07:27.238 UT (01:07:27 UTC−03 on the 14th)
			{"2027-02-13", astro.Crosses, "2027-02-14T04:07:27.238Z",
				"No nautical dusk on this date: this evening's comes after midnight, at 01:07:2"},
			// PyEphem: setting 2027-02-15 03:45:51.903 UT, the evening of the 14th's
			{"2027-02-14", anEvent, "2027-02-14T04:07:27.238Z", ""},
		}},
		{"60S spring, nautical", south60, "nautical-dusk", "2027-11-12", []want{
			// PyEphem: setting 2027-11-13 02:21:25.229 UT (23:21:25 UTC−03 on the 12th)
			{"2027-11-12", anEvent, "2027-11-13T02:21:25.229Z", ""},
			// the date's only crossing is the dawn at 00:06:15 UTC−03
			// (PyEphem: rising 2027-11-13 03:06:14.739 UT), and no dusk
			// follows: AlwaysUpError, −12°08′ at the lower transit
			// 2027-11-13 02:44:11 UT, then above −12° at 2027-11-14 02:44:19 UT
			{"2027-11-13", astro.AlwaysAbove, "", "The Sun's centre stays less than 12° below the horizon all night."},
		}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			last := tc.dates[len(tc.dates)-1].day
			sk := sky(t, tc.first, last)
			events, notes, err := sk.Events(context.Background(), PlaceOf(tc.s), mustKinds(t, tc.kind), date(tc.first), date(last))
			if err != nil {
				t.Fatal(err)
			}
			entries, err := sk.Entries(context.Background(), tc.s, "dusk", []config.KindSpec{{Kind: mustKinds(t, tc.kind)[0]}}, date(tc.first), date(last))
			if err != nil {
				t.Fatal(err)
			}
			for _, w := range tc.dates {
				d := date(w.day)
				var note *Note
				for i := range notes {
					if notes[i].Date.Equal(d) {
						note = &notes[i]
					}
				}
				var evs []Event
				for _, e := range events {
					if e.Date.Equal(d) {
						evs = append(evs, e)
					}
				}
				if w.state == anEvent {
					if note != nil || len(evs) == 0 || !nearInstant(evs[len(evs)-1].Start, w.dusk) {
						t.Errorf("%s: note %+v, events %+v, want the dusk at %s", w.day, note, evs, w.dusk)
					}
					continue
				}
				if note == nil || note.State != w.state || len(evs) > 0 {
					t.Errorf("%s: note %+v, events %+v, want a note of state %v", w.day, note, evs, w.state)
					continue
				}
				if w.dusk == "" && !note.Dusk.IsZero() || w.dusk != "" && !nearInstant(note.Dusk, w.dusk) {
					t.Errorf("%s: the note's dusk %v, want %q", w.day, note.Dusk, w.dusk)
				}
				var desc string
				for _, e := range entries {
					if e.Date.Equal(d) && e.AllDay {
						desc = e.Description
					}
				}
				if !strings.HasPrefix(desc, w.text) {
					t.Errorf("%s: description %q, want it to begin %q", w.day, desc, w.text)
				}
				if w.state == astro.Crosses && strings.Contains(desc, "tonight") {
					t.Errorf("%s: %q speaks of tonight", w.day, desc)
				}
			}
		})
	}
}

// anEvent marks a date with an event in TestDuskNoteFollowsTheEvening.
const anEvent astro.State = -1

// nearInstant says whether t is within 1 s of the instant s (RFC 3339).
func nearInstant(t time.Time, s string) bool {
	want, err := time.Parse(time.RFC3339Nano, s)
	if err != nil {
		panic(err)
	}
	return near(t, want, time.Second)
}

// notesOf returns the notes of the kind at s on the dates first to last
// (YYYY-MM-DD).
func notesOf(t *testing.T, s *config.Site, kind, first, last string) []Note {
	t.Helper()
	_, notes, err := sky(t, first, last).EventsFor(context.Background(), PlaceOf(s), []config.KindSpec{{Kind: mustKinds(t, kind)[0]}}, date(first), date(last))
	if err != nil {
		t.Fatalf("%s: %v", kind, err)
	}
	return notes
}

// A dawn's note speaks of the night before its date: on the last date
// after nights without a dawn, whose own evening has its dusk after
// midnight, it says that twilight lasted all last night and when this
// evening's dusk comes, not that it "lasts all night" tonight; the dates
// before keep the shared note. Instants from PyEphem 4.1.4 as in
// TestDuskNoteFollowsTheEvening.
func TestDawnNoteSpeaksOfLastNight(t *testing.T) {
	s := site(t, "tromso", 69.65, 18.95, "Europe/Oslo")
	s.Elevation = 120
	for _, tc := range []struct {
		kind, before, last, dusk, desc string
	}{
		// PyEphem: no −18° crossing the night of 16–17 September 2027 (the
		// Sun's centre at −17°54′ at 22:38:58 UT on the 16th); setting
		// 2027-09-17 22:00:57.658 UT
		{"astronomical-dawn", "2027-09-16", "2027-09-17", "2027-09-17T22:00:57.658Z",
			"The Sun's centre stayed less than 18° below the horizon all last night; this evening's astronomical dusk comes after midnight, at 00:00:58 CEST on Sat 18 Sep."},
		// PyEphem: no −12° crossing the night of 31 August–1 September
		// (−11°53′ at 22:44:27 UT on the 31st); setting 2027-09-01 22:07:53.182 UT
		{"nautical-dawn", "2027-08-31", "2027-09-01", "2027-09-01T22:07:53.182Z",
			"The Sun's centre stayed less than 12° below the horizon all last night; this evening's nautical dusk comes after midnight, at 00:07:53 CEST on Thu 2 Sep."},
	} {
		notes := notesOf(t, s, tc.kind, tc.before, tc.last)
		if len(notes) != 2 {
			t.Fatalf("%s: notes %+v; want two", tc.kind, notes)
		}
		if n := notes[1]; n.State != astro.AlwaysAbove || !nearInstant(n.Dusk, tc.dusk) {
			t.Errorf("%s %s: %+v; want always-above with this evening's dusk %s", tc.kind, tc.last, n, tc.dusk)
		} else if title, _, desc := describeNote(newSiteInfo(s), n); !strings.HasPrefix(title, "No "+strings.TrimSuffix(tc.kind, "-dawn")+" dawn today: ") || desc != tc.desc {
			t.Errorf("%s %s: %q\n%q\nwant %q", tc.kind, tc.last, title, desc, tc.desc)
		}
		if n := notes[0]; n.State != astro.AlwaysAbove || !n.Dusk.IsZero() {
			t.Errorf("%s %s: %+v; want the night's note without a dusk", tc.kind, tc.before, n)
		} else if title, _, _ := describeNote(newSiteInfo(s), n); !strings.Contains(title, "lasts all night") {
			t.Errorf("%s %s: %q", tc.kind, tc.before, title)
		}
	}
}

// A date whose only crossing is a dawn, its evening's dusk coming after
// midnight, says when that dusk comes as the date without any crossing
// does. At 69.65° N, 18.95° E, 120 m on 10 April 2027 (PyEphem 4.1.4, Sun's
// centre, pressure 0, horizon −12°): nautical dusk 2027-04-09 21:49:40 UT
// (the evening before, 23:49:40 CEST), dawn 2027-04-09 23:40:26 UT (01:40:26
// CEST on the 10th), the evening's dusk 2027-04-10 22:11:06.589 UT.
func TestDuskNoteAfterADawnGivesTheDusk(t *testing.T) {
	s := site(t, "tromso", 69.65, 18.95, "Europe/Oslo")
	s.Elevation = 120
	notes := notesOf(t, s, "nautical-dusk", "2027-04-10", "2027-04-10")
	if len(notes) != 1 {
		t.Fatalf("notes %+v; want one", notes)
	}
	want := time.Date(2027, 4, 10, 22, 11, 6, 589e6, time.UTC)
	n := notes[0]
	if n.State != astro.Crosses || n.Dusk.Sub(want).Abs() > time.Second {
		t.Fatalf("%+v; want no-event with this evening's dusk %v", n, want)
	}
	if _, _, desc := describeNote(newSiteInfo(s), n); !strings.HasPrefix(desc, "No nautical dusk on this date: this evening's comes after midnight, at 00:11:0") || !strings.HasSuffix(desc, " CEST on Sun 11 Apr.") {
		t.Errorf("%q", desc)
	}
}
