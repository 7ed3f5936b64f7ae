package feed

import (
	"context"
	"reflect"
	"strings"
	"testing"
	"time"

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

// The lighting limits a calendar finds as each lighting kind's entries are
// written (from that kind's entries alone, before they are sorted among
// the others) are those a scan of the finished calendar finds
// (lampLimitGaps), over a year and a half at Havana (summer time; the
// limit does nothing from mid-March), at 78.2° N (polar night and midnight
// sun) and at 41.3° S, with evening, morning and both lamps, civil light,
// a weekday filter and a minimum length; two kinds entries of one kind
// are scanned as before, each counting the other's entries.
func TestLampLimitGapsAsWritten(t *testing.T) {
	sk := sky(t, "2026-12-20", "2028-06-20")
	kind := func(name string) config.Kind { return mustKinds(t, name)[0] }
	sites := []*config.Site{
		site(t, "havana", 23.1, -82.4, "America/Havana"),
		site(t, "isfjord", 78.2, 15.6, "Arctic/Longyearbyen"),
		site(t, "ridge", -41.3, 174.8, "Pacific/Auckland"),
	}
	feeds := []*config.Feed{
		{ID: "a", Kinds: []config.KindSpec{{Kind: kind("sunset")}, {Kind: kind("lighting:14h"), LatestOff: "18:45"},
			{Kind: kind("lighting:16h"), Lamps: config.LampsMorning, EarliestOn: "06:30"}}},
		{ID: "b", Kinds: []config.KindSpec{{Kind: kind("lighting:18h"), Lamps: config.LampsBoth, Natural: config.NaturalCivil,
			LatestOff: "20:00", EarliestOn: "05:00", MinDuration: config.Duration(20 * time.Minute), Weekdays: []string{"mon", "thu"}}}},
		{ID: "c", Kinds: []config.KindSpec{{Kind: kind("lighting:15h"), LatestOff: "19:00"}, {Kind: kind("lighting:15h"), Lamps: config.LampsMorning, EarliestOn: "07:00"}},
			Plans: []config.Plan{{Title: "Round", Date: "every day", Start: "sunset"}}},
	}
	found := 0
	for _, s := range sites {
		for _, f := range feeds {
			cal, err := sk.Calendar(context.Background(), s, f, date("2027-01-01"), date("2028-06-01"), Options{})
			if err != nil {
				t.Fatal(err)
			}
			want := lampLimitGaps(f, cal)
			if !reflect.DeepEqual(cal.LampLimitGaps, want) {
				t.Errorf("%s, feed %s: limits %+v as written, %+v by a scan of the calendar", s.ID, f.ID, cal.LampLimitGaps, want)
			}
			found += len(want)
		}
	}
	if found < 4 {
		t.Errorf("%d limits that do nothing on some dates: the cases test little", found)
	}
}
