package feed

import (
	"context"
	"math"
	"testing"
	"time"

	"heliocal/config"
)

// A dark window with max_illumination carries no illuminated fraction of its
// own: the option is a limit, not the Moon's light. At 45° S, 170.5° E (sea
// level, Pacific/Auckland) the window of the night of 1–2 January 2027 runs
// from astronomical dusk to moonrise, when the waning Moon is 33 % lit;
// "20 % lit" (the limit) beside it would be untrue.
// Source: PyEphem 4.1 (Observer at -45.0, 170.5, pressure 0, horizon -34′,
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
