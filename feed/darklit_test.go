package feed

import (
	"context"
	"math"
	"testing"
	"time"

	"heliocal/astro"
	"heliocal/config"
)

// A dark window with max_illumination carries no illuminated fraction of its
// own: the option is a limit, not the Moon's light. At 45° S, 170.5° E (sea
// level, Pacific/Auckland) the window of the night of 1–2 January 2027 runs
// from astronomical dusk to moonrise, when the waning Moon is 33 % lit;
// "20 % lit" (the limit) beside it would be untrue.
// Source: PyEphem 4.1.4 (Observer at -45.0, 170.5, pressure 0, horizon -34′,
// upper limb): astronomical dusk 2027-01-01 10:57:37 UTC, moonrise
// 2027-01-01 12:35:30 UTC, moon_phase 0.3277.
func TestDarkWindowCarriesNoLimitAsLight(t *testing.T) {
	s := site(t, "south-45", -45, 170.5, "Pacific/Auckland")
	sk := sky(t, "2026-12-31", "2027-01-03")
	spec := config.KindSpec{Kind: mustKinds(t, "dark-window")[0], MaxIllumination: 0.2}
	events, _, err := sk.EventsFor(context.Background(), PlaceOf(s), []config.KindSpec{spec}, date("2027-01-01"), date("2027-01-01"))
	if err != nil {
		t.Fatal(err)
	}
	if len(events) != 1 {
		t.Fatalf("events = %v, want the one dark window of the night of 1–2 January", events)
	}
	e := events[0]
	dusk := time.Date(2027, 1, 1, 10, 57, 37, 0, time.UTC)
	rise := time.Date(2027, 1, 1, 12, 35, 30, 0, time.UTC)
	if d := e.Start.Sub(dusk); math.Abs(d.Seconds()) > 5 {
		t.Errorf("start %s, want astronomical dusk %s (PyEphem)", e.Start, dusk)
	}
	if d := e.End.Sub(rise); math.Abs(d.Seconds()) > 5 {
		t.Errorf("end %s, want moonrise %s (PyEphem)", e.End, rise)
	}
	if e.Illuminated != 0 && math.Abs(e.Illuminated-0.3277) > 0.01 {
		t.Errorf("illuminated = %.4f: neither absent nor the Moon's 0.3277 at moonrise (PyEphem)", e.Illuminated)
	}
}

// A night without a dark window has a note whose state says why, as the
// README's notes list it: AlwaysBelow when the Moon is up and bright all
// through the astronomical night. At 45° S, 170.5° E (sea level) on the
// night of 21–22 January 2027 astronomical dusk falls at 10:32:16 UT and
// dawn at 15:06:35 UT, between moonrise at 07:35:38 and moonset at
// 16:09:59 UT, the Moon 98 % lit. Source: PyEphem 4.1.4 (pressure 0,
// horizon −18° for the Sun's centre, −34′ for the Moon's upper limb).
func TestDarkWindowMoonlitNote(t *testing.T) {
	s := site(t, "south-45", -45, 170.5, "Pacific/Auckland")
	sk := sky(t, "2027-01-20", "2027-01-23")
	spec := config.KindSpec{Kind: mustKinds(t, "dark-window")[0], MaxIllumination: 0.2}
	events, notes, err := sk.EventsFor(context.Background(), PlaceOf(s), []config.KindSpec{spec}, date("2027-01-21"), date("2027-01-21"))
	if err != nil {
		t.Fatal(err)
	}
	if len(events) != 0 || len(notes) != 1 || notes[0].State != astro.AlwaysBelow {
		t.Fatalf("events %v, notes %+v: want one note, always-below (the Moon up and bright)", events, notes)
	}
	if title, _, _ := describeNote(newSiteInfo(s), notes[0]); title != "No dark sky on the night of 21–22 January 2027: the Moon is up and bright all through the astronomical night" {
		t.Errorf("note %q", title)
	}
}
