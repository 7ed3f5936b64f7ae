package feed

import (
	"context"
	"strings"
	"testing"

	"heliocal/config"
)

// A lighting limit that does nothing on some dates of the calendar is said
// in the calendar's description, right after the kind's meaning, so that a
// subscriber is not told "lamps off no later than 18:45" of lamps that run
// past it; a limit that applies on every date, or one meant for the night,
// adds nothing. Havana, 23.1° N 82.4° W (PyEphem 4.1.4, upper limb, 34′
// refraction, no elevation): sunset on 13 Mar 2027 18:37:59 CST, on 14 Mar
// 2027 (first day of summer time) 19:38:22 CDT, and later on the days
// after; the natural day there never reaches 14 h, so every date needs
// lamps.
func TestLampLimitGapInDescription(t *testing.T) {
	havana := site(t, "havana", 23.1, -82.4, "America/Havana")
	sk := sky(t, "2027-03-12", "2027-03-16")
	for _, c := range []struct {
		latestOff, want string
	}{
		{"18:45", "lamps off no later than 18:45. Where the evening lamps start after 18:45 (on 3 dates between 14 Mar 2027 and 16 Mar 2027), they run until the target is reached.\n"},
		{"22:00", "lamps off no later than 22:00.\n"},
		{"01:00", "lamps off no later than 01:00.\n"},
	} {
		f := &config.Feed{ID: "f", Kinds: []config.KindSpec{{Kind: mustKinds(t, "lighting:14h")[0], LatestOff: c.latestOff}}}
		cal, err := sk.Calendar(context.Background(), havana, f, date("2027-03-12"), date("2027-03-16"), Options{})
		if err != nil {
			t.Fatal(err)
		}
		if !strings.Contains(cal.Description, c.want) || strings.Count(cal.Description, "Where the") > 1 {
			t.Errorf("latest_off %s: description\n%s\nwant it to hold %q once", c.latestOff, cal.Description, c.want)
		}
		gaps := cal.LampLimitGaps // as the calendar keeps them
		if want := strings.Contains(c.want, "Where"); (len(gaps) == 1) != want || want && (gaps[0].Dates() != 3 || !gaps[0].Evening()) {
			t.Errorf("latest_off %s: gaps %+v", c.latestOff, gaps)
		}
	}
}
