package feed

import (
	"context"
	"math"
	"slices"
	"strings"
	"testing"

	"heliocal/config"
)

// The Sun's lowest altitude in a golden hour around midnight lies inside the
// band, under its +6°, and the text never rounds it onto the bound. At
// 78.2° N, 15.6° E (sea level, Arctic/Longyearbyen) on the night of 10–11
// May 2027 the Sun's centre dips to 5.9537° at 22:53 UT, so "at least 6.0°"
// would contradict the golden hour it is in.
// Source: PyEphem 4.1.4 (Observer 78.2, 15.6, pressure 0, the Sun's altitude
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

// The crossings a band puts in time order are taken from the chunk's
// buffers and taken again by the next chunk (no new slice once the first
// chunk has sized them), and a chunk computed with reused buffers has the
// events of one computed afresh.
func TestBandMarksReusedByNextChunk(t *testing.T) {
	s := site(t, "vienna", 48.2, 16.4, "Europe/Vienna")
	sk := sky(t, "2027-01-01", "2027-03-05")
	specs := []config.KindSpec{{Kind: mustKinds(t, "golden-hour")[0]}, {Kind: mustKinds(t, "blue-hour")[0]}}
	p := PlaceOf(s)
	buf := &buffers{}
	var held []*bandMark
	for i, first := range []string{"2027-01-02", "2027-01-30"} {
		last := date(first).AddDate(0, 0, 27)
		got, _, err := sk.eventsFor(context.Background(), p, specs, date(first), last, buf)
		if err != nil {
			t.Fatal(err)
		}
		if len(buf.marks.list) != 2 {
			t.Fatalf("chunk %d: %d slices of crossings, want one per band (2)", i, len(buf.marks.list))
		}
		if i == 0 {
			// sized by the first chunk; the second, of as many days, needs no more
			for _, l := range buf.marks.list {
				held = append(held, &l[:cap(l)][cap(l)-1])
			}
		} else {
			for k, l := range buf.marks.list {
				if &l[:cap(l)][cap(l)-1] != held[k] {
					t.Errorf("chunk %d: band %d's crossings in a new slice", i, k)
				}
			}
		}
		want, _, err := sk.EventsFor(context.Background(), p, specs, date(first), last)
		if err != nil {
			t.Fatal(err)
		}
		if len(got) == 0 || !slices.EqualFunc(got, want, func(a, b Event) bool {
			return a.Kind == b.Kind && a.Start.Equal(b.Start) && a.End.Equal(b.End) && a.Part == b.Part && a.Date.Equal(b.Date)
		}) {
			t.Errorf("chunk %d: %d events with reused buffers, %d afresh, or they differ", i, len(got), len(want))
		}
	}
}
