package feed

import (
	"context"
	"math"
	"strings"
	"testing"

	"heliocal/config"
)

// The Sun's lowest altitude in a golden hour around midnight lies inside the
// band, under its +6°, and the text never rounds it onto the bound. At
// 78.2° N, 15.6° E (sea level, Arctic/Longyearbyen) on the night of 10–11
// May 2027 the Sun's centre dips to 5.9537° at 22:53 UT, so "at least 6.0°"
// would contradict the golden hour it is in.
// Source: PyEphem 4.1 (Observer 78.2, 15.6, pressure 0, the Sun's altitude
// minute by minute): lowest 5.9537° at 2027-05-10 22:53 UT.
func TestBandExtremeStaysInsideBand(t *testing.T) {
	s := site(t, "isfjord", 78.2, 15.6, "Arctic/Longyearbyen")
	sk := sky(t, "2027-05-10", "2027-05-12")
	specs := []config.KindSpec{{Kind: mustKinds(t, "golden-hour")[0]}}
	events, _, err := sk.EventsFor(context.Background(), PlaceOf(s), specs, date("2027-05-11"), date("2027-05-11"))
	if err != nil {
		t.Fatal(err)
	}
	if len(events) != 1 || events[0].Part != "night" {
		t.Fatalf("events = %+v, want the one golden hour around midnight", events)
	}
	if a := events[0].Altitude; math.Abs(a-5.9537) > 0.005 {
		t.Errorf("lowest altitude %.4f°, want 5.9537° (PyEphem)", a)
	}
	entries, err := sk.Entries(context.Background(), s, "gold", specs, date("2027-05-11"), date("2027-05-11"))
	if err != nil {
		t.Fatal(err)
	}
	if len(entries) != 1 || !strings.Contains(entries[0].Description, "(at least 5.9°)") {
		t.Errorf("entries = %+v, want one whose text says \"(at least 5.9°)\"", entries)
	}
	// the cut is to the tenth inside the band, never further
	for _, tc := range []struct {
		a, lo, hi float64
		want      string
	}{
		{5.9537, -4, 6, "5.9°"}, {5.94, -4, 6, "5.9°"}, {-3.96, -4, 6, "−3.9°"}, {-4.04, -6, -4, "−4.1°"}, {0.26, -4, 6, "0.3°"},
	} {
		if got := degreesWithin(tc.a, tc.lo, tc.hi); got != tc.want {
			t.Errorf("degreesWithin(%v, %v, %v) = %s, want %s", tc.a, tc.lo, tc.hi, got, tc.want)
		}
	}
}
