package feed

import (
	"context"
	"testing"

	"heliocal/config"
)

// A date with the Moon down (or up) all day is one note in a feed with both
// moonrise and moonset, as polar night is one for sunrise and sunset.
// Source: USNO one-year table 'Rise and Set for the Moon', latitude 70° N,
// longitude 0, 2023: markers ---- on 17 January and **** on 24 December
// (testdata/reference/moon-times.csv rows moon-0064, moon-0077).
func TestMoonAllDayIsOneNote(t *testing.T) {
	s := site(t, "usno-70n", 70, 0, "UTC")
	for _, tc := range []struct{ day, title string }{
		{"2023-01-17", "The Moon stays below the horizon all day"},
		{"2023-12-24", "The Moon stays above the horizon all day"},
	} {
		sk := sky(t, tc.day, tc.day)
		specs := []config.KindSpec{{Kind: mustKinds(t, "moonrise")[0]}, {Kind: mustKinds(t, "moonset")[0]}}
		entries, err := sk.Entries(context.Background(), s, "moon", specs, date(tc.day), date(tc.day))
		if err != nil {
			t.Fatal(err)
		}
		if len(entries) != 1 || !entries[0].AllDay || entries[0].Title != tc.title {
			var titles []string
			for _, e := range entries {
				titles = append(titles, e.Title)
			}
			t.Errorf("%s: entries %q, want the one all-day note %q", tc.day, titles, tc.title)
		}
	}
}
