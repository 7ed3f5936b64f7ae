package feed

import (
	"context"
	"fmt"
	"math"
	"strings"
	"testing"
	"time"

	"heliocal/config"
)

// planCalendar returns f's calendar of first..last at s, its sky wide
// enough for the plans (PlanMargin).
func planCalendar(t *testing.T, s *config.Site, f *config.Feed, first, last time.Time) *Calendar {
	t.Helper()
	sk, err := NewSky(first.AddDate(0, 0, -PlanMargin), last.AddDate(0, 0, PlanMargin))
	if err != nil {
		t.Fatal(err)
	}
	cal, err := sk.Calendar(context.Background(), s, f, first, last, Options{})
	if err != nil {
		t.Fatal(err)
	}
	return cal
}

// TestDateTheClocksSkip: Pacific/Apia's clocks went from 23:59:59 on 29
// December 2011 (UTC−10) to 00:00 on 31 December (UTC+14) (zdump -v
// Pacific/Apia), so 30 December 2011 has no instant there. A feed lists
// nothing on that date (no "polar night", no lamps, no second plan at the
// 29th's time); every other date keeps one sunrise, one daily summary and
// one entry of an every-day plan; the 31st's day is compared with the 29th's;
// the dark sky of the night of the 29th, which runs to noon on the 31st, is
// that night's. PyEphem 4.1.4 (Sun's upper limb at −0:34, pressure 0, at
// 13.86° S, 171.77° W): sunrise 2011-12-30 17:01:32 UT (07:01 on the 31st,
// UTC+14), day 29 December 12 h 56 min 22 s, 31 December 12 h 56 min 13 s
// (−9 s).
func TestDateTheClocksSkip(t *testing.T) {
	s := site(t, "vailima", -13.86, -171.77, "Pacific/Apia")
	loc := s.TimeZone.Location
	if _, off := time.Date(2011, 12, 31, 0, 0, 0, 0, loc).Zone(); off != 14*3600 {
		t.Fatalf("zone data: offset %d on 31 December 2011", off)
	}
	specs := []config.KindSpec{}
	for _, k := range mustKinds(t, "sunrise", "sunset", "civil-dusk", "golden-hour", "daily-summary", "dark-window", "lighting:13h", "moon-phases") {
		specs = append(specs, config.KindSpec{Kind: k})
	}
	specs[6].Lamps = "both"
	f := &config.Feed{ID: "apia", Site: s.ID, Kinds: specs, Plans: []config.Plan{
		{Title: "Morning round", Date: "every day", Start: "06:30", For: config.Duration(time.Hour)},
	}}
	cal := planCalendar(t, s, f, date("2011-12-28"), date("2012-01-01"))
	count := map[string]int{}
	var night29 []Entry
	for _, e := range cal.Entries {
		day := e.Date.Format(time.DateOnly)
		if day == "2011-12-30" {
			t.Errorf("entry on 30 December 2011, a date Apia's clocks skip: %s %q", e.Kind, e.Title)
		}
		count[day+" "+e.Kind]++
		if e.Kind == "daily-summary" && day == "2011-12-31" {
			if want := -9 * time.Second; (e.Facts.DayChange - want).Abs() > 3*time.Second {
				t.Errorf("31 December: day change %s, want about %s (from the 29th)", e.Facts.DayChange, want)
			}
		}
		if e.Kind == "sunrise" && day == "2011-12-31" {
			want := time.Date(2011, 12, 30, 17, 1, 32, 0, time.UTC)
			if d := e.Start.Sub(want); math.Abs(d.Seconds()) > 5 {
				t.Errorf("sunrise of 31 December at %s, want %s", e.Start, want)
			}
		}
		if e.Kind == "dark-window" && day == "2011-12-29" {
			night29 = append(night29, e)
		}
	}
	for _, day := range []string{"2011-12-28", "2011-12-29", "2011-12-31", "2012-01-01"} {
		for _, k := range []string{"sunrise", "daily-summary", "plan"} {
			if n := count[day+" "+k]; n != 1 {
				t.Errorf("%s: %d %s entries, want 1", day, n, k)
			}
		}
	}
	// the night of the 29th runs from its noon (UTC−10) to noon on the
	// 31st (UTC+14): its dark sky ends in the morning of the 31st (the
	// Moon sets at 23:59:57 UTC−10, Sun at −18° at 05:42 UTC+14)
	if len(night29) == 0 {
		t.Fatal("no dark-window entry for the night of 29 December")
	}
	for _, e := range night29 {
		if e.Facts.Note {
			t.Errorf("night of 29 December: note %q beside its dark sky", e.Title)
			continue
		}
		if !strings.Contains(e.Title, "night of 29–31 December 2011") {
			t.Errorf("title %q, want the night of 29–31 December 2011", e.Title)
		}
		if got := localDate(e.End, loc); got != date("2011-12-31") {
			t.Errorf("dark sky of the night of the 29th ends on %s (%s)", got.Format(time.DateOnly), e.Title)
		}
	}
}

// TestStretchFromDateTheClocksSkip: a stretch of dates without lamps is
// not broken by Pacific/Apia's missing 30 December 2011, and a listing
// that starts on that date has its stretch notes on the 31st (the natural
// day at 13.86° S is about 12 h 56 min all through: PyEphem, as above).
func TestStretchFromDateTheClocksSkip(t *testing.T) {
	s := site(t, "vailima", -13.86, -171.77, "Pacific/Apia")
	p := PlaceOf(s)
	sk := sky(t, "2011-12-10", "2012-01-10")
	for _, first := range []string{"2011-12-20", "2011-12-30"} {
		evs, notes, err := sk.Events(context.Background(), p, mustKinds(t, "lighting:12h", "photoperiod:13h"), date(first), date("2012-01-03"))
		if err != nil {
			t.Fatal(err)
		}
		if len(evs) != 0 {
			t.Errorf("from %s: %d events, want none", first, len(evs))
		}
		var got []string
		for _, n := range notes {
			got = append(got, n.Kind.String()+" "+n.Date.Format(time.DateOnly))
			if n.ExtremeDate.Equal(date("2011-12-30")) {
				t.Errorf("from %s: %s names 30 December as its longest day", first, n.Kind)
			}
		}
		want := first
		if first == "2011-12-30" {
			want = "2011-12-31"
		}
		if strings.Join(got, ", ") != "lighting:12h "+want+", photoperiod:13h "+want {
			t.Errorf("from %s: notes %v, want one of each kind on %s", first, got, want)
		}
	}
}

// The dates the clocks jump over whole, as the tz database has them
// (zdump -v): Pacific/Kiritimati from 23:59:59 on 30 December 1994 (UTC−10)
// to 00:00 on 1 January 1995 (UTC+14), Asia/Manila from 23:59:59 on 30
// December 1844 (its local mean time counted west, −15:56:08) to
// 00:00 on 1 January 1845 (+8:03:52), Pacific/Apia over 30 December 2011
// (and back a day in 1892, from 23:59:59 on 4 July, +12:33:04, to 00:00 on
// 4 July, −11:26:56), Pacific/Kwajalein back almost a day in 1969 (from
// 23:59:59 on 30 September, +11, to 01:00 on 30 September, −12) and over
// 21 August 1993 (from 23:59:59 on the 20th, −12, to 00:00 on the 22nd,
// +12): a window over a jump back and a later jump forward has the date
// skipped. Europe/Vienna's clock changes skip an hour, never a date; a
// window past a zone's last transition in the tz data (Europe/Zurich's
// rule for 2020–2070, Asia/Tokyo's offset since 1951, Pacific/Apia's
// since 2021, Pacific/Kiritimati's since 1995) has none either. NightOf
// names the night of the date before such a date to the date after it.
func TestMissingDates(t *testing.T) {
	for _, tc := range []struct {
		zone, first, last, want, night string
	}{
		{"Pacific/Kiritimati", "1994-12-20", "1995-01-10", "1994-12-31", "night of 30 December 1994–1 January 1995"},
		{"Asia/Manila", "1844-12-20", "1845-01-10", "1844-12-31", "night of 30 December 1844–1 January 1845"},
		{"Pacific/Apia", "2011-12-01", "2012-01-31", "2011-12-30", "night of 29–31 December"},
		{"Pacific/Kwajalein", "1960-01-01", "2000-01-01", "1993-08-21", "night of 20–22 August 1993"},
		{"Pacific/Apia", "1890-01-01", "2012-06-01", "2011-12-30", "night of 29–31 December"},
		{"Europe/Vienna", "2027-01-01", "2027-12-31", "", ""},
		{"Europe/Zurich", "2020-01-01", "2070-12-31", "", ""},
		{"Asia/Tokyo", "2030-01-01", "2060-12-31", "", ""},
		{"Pacific/Apia", "2030-01-01", "2060-12-31", "", ""},
		{"Pacific/Kiritimati", "2000-01-01", "2199-12-31", "", ""},
	} {
		loc, err := time.LoadLocation(tc.zone)
		if err != nil {
			t.Fatal(err)
		}
		var got []string
		for _, d := range missingDates(loc, date(tc.first), date(tc.last)) {
			got = append(got, d.Format(time.DateOnly))
		}
		if strings.Join(got, ",") != tc.want {
			t.Errorf("%s %s..%s: dates %v skipped, want %q", tc.zone, tc.first, tc.last, got, tc.want)
		}
		if tc.want == "" {
			continue
		}
		if n := NightOf(date(tc.want).AddDate(0, 0, -1), loc); !strings.HasPrefix(n, tc.night) {
			t.Errorf("%s: %q, want %q", tc.zone, n, tc.night)
		}
	}
}

// TestFeedOverJumpsBackAndForward: a feed whose window holds a jump of the
// clocks back a day and a later jump forward over a date has no entry on
// that date (zdump -v: Pacific/Kwajalein from +11 to −12 on 30 September
// 1969, then from 23:59:59 on 20 August 1993, −12, to 00:00 on the 22nd,
// +12; Pacific/Apia from +12:33:04 to −11:26:56 on 4 July 1892, then from
// 23:59:59 on 29 December 2011, −10, to 00:00 on the 31st, +14), and the
// dates around it keep one daily summary and one entry of an every-day
// plan each.
func TestFeedOverJumpsBackAndForward(t *testing.T) {
	for _, tc := range []struct {
		zone          string
		lat, lon      float64
		first, last   string
		gone          string
		before, after string
	}{
		{"Pacific/Kwajalein", 8.72, 167.73, "1969-09-01", "1993-09-30", "1993-08-21", "1993-08-20", "1993-08-22"},
		{"Pacific/Apia", -13.86, -171.77, "1890-01-01", "2012-06-01", "2011-12-30", "2011-12-29", "2011-12-31"},
	} {
		s := site(t, "atoll", tc.lat, tc.lon, tc.zone)
		f := &config.Feed{ID: "atoll", Site: s.ID, Kinds: []config.KindSpec{{Kind: mustKinds(t, "daily-summary")[0]}},
			Plans: []config.Plan{{Title: "Morning round", Date: "every day", Start: "06:30", For: config.Duration(time.Hour)}}}
		cal := planCalendar(t, s, f, date(tc.first), date(tc.last))
		count := map[string]int{}
		for _, e := range cal.Entries {
			day := e.Date.Format(time.DateOnly)
			if day == tc.gone {
				t.Errorf("%s: entry on %s, a date the clocks skip: %s %q", tc.zone, day, e.Kind, e.Title)
			}
			count[day+" "+e.Kind]++
		}
		for _, day := range []string{tc.before, tc.after} {
			for _, k := range []string{"daily-summary", "plan"} {
				if n := count[day+" "+k]; n != 1 {
					t.Errorf("%s, %s: %d %s entries, want 1", tc.zone, day, n, k)
				}
			}
		}
	}
}

// TestWeekdayRuleOnDateTheClocksSkip: a weekday rule whose date the clocks
// skip whole takes the nearest such weekday that exists, and the entry
// names the skipped date. Pacific/Apia skips Friday 30 December 2011
// (zdump -v Pacific/Apia: 23:59:59 on the 29th, UTC−10, then 00:00 on the
// 31st, UTC+14); USNO's phases of the Moon: new moon 2011-12-24 18:06 UT
// (Saturday 24 December, 08:06 UTC−10), first quarter 2012-01-01 06:15 UT
// (Sunday 1 January, 20:15 UTC+14). The Friday nearest that first
// quarter would be 30 December (2 days back; 6 January is 5 ahead), the
// Friday before it too, and the Friday after the new moon; the Friday
// after a Moon phase takes the new moon and the first quarter to 6
// January, one entry naming both.
func TestWeekdayRuleOnDateTheClocksSkip(t *testing.T) {
	s := site(t, "vailima", -13.86, -171.77, "Pacific/Apia")
	for _, tc := range []struct {
		rule, start string
		dates       string // the entries' dates from 20 December to 8 January
		moved       string // the one that names 30 December
		anchors     int
	}{
		{"friday nearest first-quarter", "19:00", "2012-01-06", "2012-01-06", 1},
		{"friday before first-quarter", "", "2011-12-23", "2011-12-23", 1},
		{"friday after new-moon", "sunset", "2012-01-06", "2012-01-06", 1},
		// the last quarter of Saturday 17 December gives the 23rd
		{"friday after moon-phases", "", "2011-12-23 2012-01-06", "2012-01-06", 2},
	} {
		pl := config.Plan{Title: "Reef walk", Date: tc.rule, Start: tc.start}
		es := planEntries(t, s, "2011-12-20", "2012-01-08", pl)
		if got := dates(es); got != tc.dates {
			t.Errorf("%s: entries on %s, want %s", tc.rule, got, tc.dates)
			continue
		}
		e := entryOn(t, es, tc.moved)
		line, _, _ := strings.Cut(e.Description, "\n")
		word := strings.Fields(tc.rule)[1]
		if note := "the clocks skip Fri 30 Dec 2011, the Friday " + word + " it"; !strings.Contains(line, note) {
			t.Errorf("%s: description %q, want it to say %q", tc.rule, line, note)
		}
		if n := strings.Count(line, " UTC"); n != tc.anchors {
			t.Errorf("%s: %d events named in %q, want %d", tc.rule, n, line, tc.anchors)
		}
		if tc.start == "19:00" {
			if got, want := e.Start.In(s.TimeZone.Location).Format(time.RFC3339), "2012-01-06T19:00:00+14:00"; got != want {
				t.Errorf("%s: start %s, want %s", tc.rule, got, want)
			}
		}
	}
}

// TestOffsetChanges: the changes of a zone's offset, past the zone data's
// last transition and across the last day of a leap year, where Go's
// ZoneBounds gives an end that does not move on (31 December 2040). zdump
// -v Europe/Zurich (EU Directive 2000/84/EC: last Sunday of March and
// October, 01:00 UTC): back to +1 on 28 October 2040, forward to +2 on 31
// March 2041, back on 27 October 2041; Pacific/Apia: from −10 to +14 at
// 10:00 UTC on 30 December 2011; UTC has none.
func TestOffsetChanges(t *testing.T) {
	for _, tc := range []struct {
		zone, from, to string
		want           []string
	}{
		{"Europe/Zurich", "2040-06-01", "2041-12-31", []string{
			"2040-10-28T01:00:00Z 7200→3600", "2041-03-31T01:00:00Z 3600→7200", "2041-10-27T01:00:00Z 7200→3600"}},
		{"Europe/Zurich", "2040-12-30", "2041-01-02", nil},
		{"Pacific/Apia", "2011-12-01", "2012-01-31", []string{"2011-12-30T10:00:00Z -36000→50400"}},
		{"UTC", "2000-01-01", "2100-01-01", nil},
	} {
		loc, err := time.LoadLocation(tc.zone)
		if err != nil {
			t.Fatal(err)
		}
		var got []string
		for ch := range OffsetChanges(loc, date(tc.from), date(tc.to)) {
			got = append(got, fmt.Sprintf("%s %d→%d", ch.At.UTC().Format(time.RFC3339), ch.Before, ch.After))
		}
		if strings.Join(got, ", ") != strings.Join(tc.want, ", ") {
			t.Errorf("%s %s..%s: %v, want %v", tc.zone, tc.from, tc.to, got, tc.want)
		}
	}
}
