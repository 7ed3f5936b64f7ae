package main

import (
	"bytes"
	"context"
	"slices"
	"strings"
	"testing"
	"time"

	"heliocal/config"
	"heliocal/feed"
	"heliocal/feed/ical"
)

// `events --format ics` streams its calendar chunk by chunk; the bytes are
// those of the whole range's calendar encoded at once (but for the order of
// entries starting in the same second, see sameSecondSorted), over four
// chunks and
// more, for a zone whose clocks skip midnight (America/Havana), southern
// sites (America/Santiago, Punta Arenas), a polar one (Longyearbyen: polar
// day and night notes, golden hours past midnight), a zone east of UTC
// whose all-day entries sort among the morning's (Pacific/Auckland), and
// kinds whose entries are named by their evening and end after midnight;
// kinds whose notes speak of the whole range are encoded whole, with the
// same bytes.
func TestEventsICSStreamedAsWhole(t *testing.T) {
	places := []struct {
		id       string
		lat, lon float64
		zone     string
	}{
		{"havana", 23.1136, -82.3666, "America/Havana"},
		{"santiago", -33.45, -70.67, "America/Santiago"},
		{"punta-arenas", -53.16, -70.91, "America/Punta_Arenas"},
		{"longyearbyen", 78.22, 15.65, "Arctic/Longyearbyen"},
		{"auckland", -36.85, 174.76, "Pacific/Auckland"},
	}
	kinds := [][]string{
		{"sunrise", "sunset", "civil-dawn", "civil-dusk", "golden-hour", "daily-summary"},
		{"moonrise", "moonset", "dark-window", "moon-phases", "seasons", "astronomical-dusk", "sun-hidden", "solar-noon"},
		{"photoperiod:12h", "lighting:16h", "sunrise"}, // notes of the whole range: encoded whole
	}
	from, to := time.Date(2026, 11, 20, 0, 0, 0, 0, time.UTC), time.Date(2028, 12, 31, 0, 0, 0, 0, time.UTC)
	if testing.Short() {
		places, to = places[2:4], time.Date(2027, 12, 31, 0, 0, 0, 0, time.UTC)
	}
	sky, err := feed.NewSky(from, to)
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range places {
		loc, err := time.LoadLocation(p.zone)
		if err != nil {
			t.Fatal(err)
		}
		site := &config.Site{ID: p.id, Name: "Test site " + p.id, Latitude: p.lat, Longitude: p.lon, TimeZone: config.Zone{Location: loc}}
		for _, ks := range kinds {
			var specs []config.KindSpec
			for _, k := range ks {
				kind, err := config.ParseKind(k)
				if err != nil {
					t.Fatal(err)
				}
				specs = append(specs, config.KindSpec{Kind: kind})
			}
			var got bytes.Buffer
			if err := writeEventsICS(context.Background(), &got, site, specs, sky, from, to); err != nil {
				t.Fatalf("%s %v: %v", p.id, ks, err)
			}
			f := &config.Feed{ID: "events", Title: site.Name + " — events", Site: site.ID, Kinds: specs}
			cal, err := sky.Calendar(context.Background(), site, f, from, to, feed.Options{})
			if err != nil {
				t.Fatal(err)
			}
			want, err := ical.Marshal(cal, ical.Options{Version: versionString()})
			if err != nil {
				t.Fatal(err)
			}
			if g, w := sameSecondSorted(got.String()), sameSecondSorted(string(want)); g != w {
				gl, wl := strings.Split(g, "\r\n"), strings.Split(w, "\r\n")
				for i := range min(len(gl), len(wl)) {
					if gl[i] != wl[i] {
						t.Fatalf("%s %v: streamed %d bytes, whole %d; first difference at line %d: %q, want %q",
							p.id, ks, got.Len(), len(want), i+1, gl[i], wl[i])
					}
				}
				t.Fatalf("%s %v: streamed %d lines, whole %d", p.id, ks, len(gl), len(wl))
			}
		}
	}
}

// sameSecondSorted returns an iCalendar file with the events of each run
// that start in the same second (the same DTSTART line) sorted. A calendar's
// entries are in the order of their computed starts; two that start within
// the same second (astronomical dusk and the dark window it begins) are
// ordered by differences under a millisecond, which differ between a search
// over the whole range and one over a chunk of it.
func sameSecondSorted(ics string) string {
	const begin, end = "BEGIN:VEVENT\r\n", "END:VEVENT\r\n"
	head, rest, _ := strings.Cut(ics, begin)
	parts := strings.Split(begin+rest, begin)[1:]
	var out strings.Builder
	out.WriteString(head)
	start := func(ev string) string {
		i := strings.Index(ev, "DTSTART")
		return ev[i : i+strings.Index(ev[i:], "\r\n")]
	}
	for i := 0; i < len(parts); {
		j := i + 1
		for j < len(parts) && start(parts[j]) == start(parts[i]) && strings.HasSuffix(parts[j-1], end) {
			j++
		}
		run := slices.Clone(parts[i:j])
		slices.Sort(run)
		for _, ev := range run {
			out.WriteString(begin + ev)
		}
		i = j
	}
	return out.String()
}

// The live heap stays flat in the span while `events --format ics` writes 5
// and 50 years of five daily kinds, as for JSON (TestEventsMemoryFlat). The
// garbage is collected at each write (one per chunk of dates): the live
// heap is what the command holds, whatever else the test process allocated
// before (with the calendar built whole it was 6.4 MB and 58 MB).
func TestEventsICSMemoryFlat(t *testing.T) { checkMemoryFlat(t, "ics", true) }
