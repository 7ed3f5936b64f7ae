package ical

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"heliocal/feed"
)

var update = flag.Bool("update", false, "rewrite golden files")

// goldenCalendars are hand-built feeds for invented sites: one northern with
// DST (its window crosses the March change), one southern with a half-hour
// offset and DST (its window crosses the April change, with an entry in the
// repeated hour). The times are illustrative, not computed.
func goldenCalendars(t testing.TB) map[string]*feed.Calendar {
	vienna, adelaide := mustLoad(t, "Europe/Vienna"), mustLoad(t, "Australia/Adelaide")
	return map[string]*feed.Calendar{
		"kestrelbrook-sun": {
			ID: "kestrelbrook-sun", Title: "Kestrelbrook Orchard – Sun",
			Description: "Sunrise, sunset and golden hour for Kestrelbrook Orchard; times are local (Vienna).",
			Site: feed.Site{ID: "kestrelbrook", Name: "Kestrelbrook Orchard, upper terrace", Latitude: 48.3127,
				Longitude: 16.41875, Elevation: 212, Location: vienna},
			Color: "darkorange", URL: "https://feeds.example.org/kestrelbrook-sun.ics",
			PageURL: "https://feeds.example.org/", Refresh: 12 * time.Hour,
			WindowStart: utc(2026, 3, 20, 0, 0, 0), WindowEnd: utc(2026, 4, 3, 0, 0, 0), Stamp: utc(2026, 3, 20, 0, 0, 0),
			Entries: []feed.Entry{
				{UID: "kestrelbrook-sun-2026-03-20-equinox@heliocal", Kind: "equinox", Title: "🌍 March equinox",
					Description: "The Sun crosses the celestial equator northwards.\nDay and night are close to equal everywhere.",
					Categories:  []string{"Sun", "Season"}, AllDay: true, Start: utc(2026, 3, 20, 0, 0, 0),
					End: utc(2026, 3, 21, 0, 0, 0), Date: utc(2026, 3, 20, 0, 0, 0)},
				{UID: "kestrelbrook-sun-2026-03-28-sunrise@heliocal", Kind: "sunrise", Title: "🌅 Sunrise 05:36",
					Description: "Upper limb on the horizon, standard refraction; azimuth 84°.",
					Categories:  []string{"Sun", "Sunrise"}, Start: utc(2026, 3, 28, 4, 36, 12), Date: utc(2026, 3, 28, 0, 0, 0)},
				{UID: "kestrelbrook-sun-2026-03-28-golden-hour-evening@heliocal", Kind: "golden-hour", Title: "Golden hour (evening)",
					Description: "Sun between +6° and -4°: warm, low light; long shadows, for photography and field checks.",
					Categories:  []string{"Sun", "Golden hour"}, Start: utc(2026, 3, 28, 16, 41, 3), End: utc(2026, 3, 28, 17, 33, 47),
					Date: utc(2026, 3, 28, 0, 0, 0)},
				{UID: "kestrelbrook-sun-2026-03-29-sunrise@heliocal", Kind: "sunrise", Title: "🌅 Sunrise 06:34 (clocks forward)",
					Description: "First sunrise in summer time (CEST, UTC+2).",
					Categories:  []string{"Sun", "Sunrise"}, Start: utc(2026, 3, 29, 4, 34, 5), Date: utc(2026, 3, 29, 0, 0, 0)},
			},
		},
		"saltbush-moon": {
			ID: "saltbush-moon", Title: "Saltbush Flat Vineyard — Moon & dusk",
			Description: "Moon phases and evening twilight; alarms 15 minutes before.",
			Site: feed.Site{ID: "saltbush", Name: "Saltbush Flat Vineyard", Latitude: -34.71845, Longitude: 138.95402,
				Elevation: 310, Location: adelaide},
			Refresh: 24 * time.Hour, Alarm: 15 * time.Minute,
			WindowStart: utc(2026, 3, 30, 0, 0, 0), WindowEnd: utc(2026, 4, 10, 0, 0, 0), Stamp: utc(2026, 3, 30, 0, 0, 0),
			Entries: []feed.Entry{
				{UID: "saltbush-moon-2026-04-02-full-moon@heliocal", Kind: "full-moon", Title: "🌕 Full moon",
					Categories: []string{"Moon", "Phase"}, Start: utc(2026, 4, 2, 2, 11, 40), Date: utc(2026, 4, 2, 0, 0, 0)},
				{UID: "saltbush-moon-2026-04-04-civil-dusk@heliocal", Kind: "civil-dusk", Title: "Civil dusk",
					Description: "Sunset to Sun 6° below the horizon; lighting-up rules are set by local regulations.",
					Categories:  []string{"Sun", "Twilight, civil"}, Start: utc(2026, 4, 4, 8, 21, 30), End: utc(2026, 4, 4, 8, 46, 55),
					Date: utc(2026, 4, 4, 0, 0, 0)},
				// 02:30 local on 5 April occurs twice (03:00 ACDT becomes
				// 02:00 ACST at 16:30 UTC); this is the second one.
				{UID: "saltbush-moon-2026-04-05-moonset@heliocal", Kind: "moonset", Title: "Moonset",
					Categories: []string{"Moon"}, Start: utc(2026, 4, 4, 17, 0, 0), Date: utc(2026, 4, 5, 0, 0, 0)},
				{UID: "saltbush-moon-2026-04-05-civil-dusk@heliocal", Kind: "civil-dusk", Title: "Civil dusk",
					Description: "Sunset to Sun 6° below the horizon; lighting-up rules are set by local regulations.",
					Categories:  []string{"Sun", "Twilight, civil"}, Start: utc(2026, 4, 5, 8, 20, 2), End: utc(2026, 4, 5, 8, 45, 24),
					Date: utc(2026, 4, 5, 0, 0, 0)},
			},
		},
	}
}

func TestGolden(t *testing.T) {
	for name, c := range goldenCalendars(t) {
		t.Run(name, func(t *testing.T) {
			got := mustMarshal(t, c, Options{Version: "golden"})
			verify(t, c, got)
			path := filepath.Join("testdata", name+".ics")
			if *update {
				if err := os.WriteFile(path, got, 0o644); err != nil {
					t.Fatal(err)
				}
			}
			want, err := os.ReadFile(path)
			if err != nil {
				t.Fatalf("%v (run go test ./feed/ical -run TestGolden -update)", err)
			}
			if !bytes.Equal(got, want) {
				gl, wl := strings.Split(string(got), "\r\n"), strings.Split(string(want), "\r\n")
				for i := 0; i < len(gl) || i < len(wl); i++ {
					var g, w string
					if i < len(gl) {
						g = gl[i]
					}
					if i < len(wl) {
						w = wl[i]
					}
					if g != w {
						t.Errorf("%s:%d: got %q, want %q", path, i+1, g, w)
						break
					}
				}
				_ = os.WriteFile(path+".got", got, 0o644)
				t.Errorf("output differs from %s; wrote %s.got", path, path)
			}
			// The golden file itself passes the strict checker.
			for _, p := range checkStrict(want) {
				t.Errorf("golden: %s", p)
			}
		})
	}
}
