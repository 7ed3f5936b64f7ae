package feed

import (
	"context"
	"strings"
	"testing"

	"heliocal/config"
)

// On a date the body never rises its highest point is below the horizon, and
// the title says so in words, never as a negative height ("Sun −11.6° high").
// Sources: USNO one-year table 'Rise and Set for the Sun', N80 00 / 000 00,
// 2015, marker ---- on 21 December (row sun-0182); USNO one-year table 'Rise
// and Set for the Moon', latitude 70° N, 2023, marker ---- on 17 January
// (testdata/reference/moon-times.csv row moon-0064).
func TestHighestPointBelowHorizonInWords(t *testing.T) {
	for _, tc := range []struct {
		lat        float64
		day, kind  string
		wantPrefix string
	}{
		{80, "2015-12-21", "solar-noon", "Solar noon, Sun "},
		{70, "2023-01-17", "moon-transit", "Moon highest, "},
	} {
		s := site(t, "below", tc.lat, 0, "UTC")
		sk := sky(t, tc.day, tc.day)
		specs := []config.KindSpec{{Kind: mustKinds(t, tc.kind)[0]}}
		entries, err := sk.Entries(context.Background(), s, "below", specs, date(tc.day), date(tc.day))
		if err != nil {
			t.Fatal(err)
		}
		if len(entries) != 1 {
			t.Fatalf("%s on %s: %d entries, want 1", tc.kind, tc.day, len(entries))
		}
		title := entries[0].Title
		if !strings.HasPrefix(title, tc.wantPrefix) || !strings.HasSuffix(title, "° below the horizon") || strings.Contains(title, "−") {
			t.Errorf("%s on %s: title %q, want %q… \"° below the horizon\" with no minus sign", tc.kind, tc.day, title, tc.wantPrefix)
		}
	}
	if got := height(35.24, "high"); got != "35.2° high" {
		t.Errorf("height(35.24) = %q", got)
	}
	if got := height(-0.04, "high"); got != "0.0° high" {
		t.Errorf("height(-0.04) = %q, want no negative zero", got)
	}
}
