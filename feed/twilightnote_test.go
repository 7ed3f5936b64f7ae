package feed

import (
	"context"
	"strings"
	"testing"
	"time"

	"heliocal/config"
)

// A date without civil dusk or dawn is a white night only when the Sun sets:
// under the midnight Sun there is no twilight at all, and the note says that
// the Sun does not set. At 80° N, 0° (UTC) the Sun stays up all day on 14
// April 2015 (USNO marker ****, row sun-0169) and sets at 22:35 UT on 31
// August 2015 to rise again at 01:29 UT (rows sun-0174, sun-0175): source
// USNO one-year table 'Rise and Set for the Sun', N80 00 / 000 00, 2015. The
// Sun's centre then stays above −6° all night: its lowest, at lower
// culmination, is about −1.5° (the declination, 8.47° by PyEphem 4.1.4 at
// 23:55 UT, less 90° − 80°), so civil twilight lasts all night.
func TestTwilightNoteUnderMidnightSun(t *testing.T) {
	s := site(t, "usno-80n", 80, 0, "UTC")
	for _, tc := range []struct{ day, want, not string }{
		{"2015-04-14", "No civil dusk or dawn today: the Sun does not set", "twilight lasts all night"},
		{"2015-08-31", "No civil dusk or dawn tonight: civil twilight lasts all night", "does not set"},
	} {
		t.Run(tc.day, func(t *testing.T) {
			sk := sky(t, tc.day, tc.day)
			specs := []config.KindSpec{{Kind: mustKinds(t, "civil-dawn")[0]}, {Kind: mustKinds(t, "civil-dusk")[0]}}
			entries, err := sk.Entries(context.Background(), s, "white", specs, date(tc.day), date(tc.day))
			if err != nil {
				t.Fatal(err)
			}
			if len(entries) != 1 || entries[0].Title != tc.want {
				var titles []string
				for _, e := range entries {
					titles = append(titles, e.Title)
				}
				t.Fatalf("entries %q, want the one note %q", titles, tc.want)
			}
			// the daily summary says it once, not once per family
			specs = []config.KindSpec{{Kind: mustKinds(t, "daily-summary")[0]}}
			entries, err = sk.Entries(context.Background(), s, "summary", specs, date(tc.day), date(tc.day))
			if err != nil {
				t.Fatal(err)
			}
			if len(entries) != 1 {
				t.Fatalf("got %d summaries, want one", len(entries))
			}
			if d := entries[0].Description; strings.Contains(d, tc.not) || strings.Count(d, "does not set") > 1 {
				t.Errorf("summary of %s says %q:\n%s", tc.day, tc.not, d)
			}
		})
	}
}

// A plan that starts at a dusk gives the same reason for a date without it:
// at 80° N, 0° on 14 April 2015 (USNO marker ****, row sun-0169, source as
// above) the Sun does not set, on 31 August 2015 it does (rows sun-0174,
// sun-0175) and civil twilight fills the night.
func TestPlanTwilightNoteUnderMidnightSun(t *testing.T) {
	s := site(t, "usno-80n", 80, 0, "UTC")
	for d, why := range map[string]string{
		"2015-04-14": "(no civil dusk or dawn today: the Sun does not set).",
		"2015-08-31": "(no civil dusk or dawn tonight: civil twilight lasts all night).",
	} {
		// one date of a fortnight (searched on that date alone) and every
		// date of a one-day window (from the window's crossings)
		for first, rule := range map[string]string{date(d).AddDate(0, 0, -13).Format(time.DateOnly): d, d: "every day"} {
			es := planEntries(t, s, first, d, config.Plan{Title: "Lamp round", Date: rule, Start: "civil-dusk", For: config.Duration(time.Hour)})
			if len(es) != 1 || !es[0].AllDay || !strings.HasSuffix(es[0].Description, why) {
				t.Errorf("%s (%s from %s): %+v, want an all-day note ending %q", d, rule, first, es, why)
			}
		}
	}
}
