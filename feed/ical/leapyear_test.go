package ical

import (
	"bytes"
	"context"
	"slices"
	"strings"
	"testing"
	"time"

	goical "github.com/emersion/go-ical"

	"heliocal/config"
	"heliocal/feed"
)

// zurichLeapYear is a feed over the local dates 2040-06-01..2041-09-30 at
// Zurich: its window crosses the end of a leap year after the tz
// database's last transition (2037), where Go's ZoneBounds gives 31 December
// 2040 00:00 UTC as the end of the period for every instant of that day.
const zurichLeapYear = `
sites:
  - id: zurich
    name: Zurich
    latitude: 47.37
    longitude: 8.54
    timezone: Europe/Zurich
feeds:
  - id: zurich-sun
    site: zurich
    kinds: [sunrise, sunset]
    days_back: 0
    days_ahead: 486
`

// zurichOffset is Europe/Zurich's UTC offset at the local wall time wall,
// as zdump -v -c 2040,2042 Europe/Zurich (Debian GLIBC 2.36, Debian's
// tzdata) lists its changes: CEST (+02:00) from Sun Mar 25 03:00:00 2040,
// CET (+01:00) from Sun Oct 28 02:00:00 2040 (02:59:59 CEST before it),
// CEST from Sun Mar 31 03:00:00 2041, CET from Sun Oct 27 02:00:00 2041.
// Sunrise and sunset never fall in the hour the clocks show twice.
func zurichOffset(wall time.Time) string {
	in := func(from, to string) bool {
		f, _ := time.Parse(localLayout, from)
		t, _ := time.Parse(localLayout, to)
		return !wall.Before(f) && wall.Before(t)
	}
	if in("20400325T030000", "20401028T030000") || in("20410331T030000", "20411027T030000") {
		return "+0200"
	}
	return "+0100"
}

// TestZurichAcrossLeapYearEnd: the VTIMEZONE of a window that crosses 31
// December 2040 holds the changes after it (it once stopped there, and
// calendar clients read the summer of 2041 an hour off). The file is read
// by github.com/emersion/go-ical, the offset of each event's DTSTART taken
// from the file's own observances as a client does (the last whose
// DTSTART, local time, is not after the event's) and held to zdump's.
func TestZurichAcrossLeapYearEnd(t *testing.T) {
	cfg, err := config.Parse(strings.NewReader(zurichLeapYear), "yaml")
	if err != nil {
		t.Fatal(err)
	}
	cat, err := feed.NewCatalogue(cfg, feed.Options{Now: time.Date(2040, 6, 1, 12, 0, 0, 0, time.UTC)})
	if err != nil {
		t.Fatal(err)
	}
	cals, err := cat.Calendars(context.Background())
	if err != nil {
		t.Fatal(err)
	}
	c := cals[0]
	data, err := Marshal(c, Options{})
	if err != nil {
		t.Fatal(err)
	}
	verify(t, c, data)

	gcal, err := goical.NewDecoder(bytes.NewReader(data)).Decode()
	if err != nil {
		t.Fatal(err)
	}
	type observance struct {
		start time.Time // local time
		to    string
	}
	var obs []observance
	for _, ch := range gcal.Children {
		if ch.Name != goical.CompTimezone {
			continue
		}
		for _, o := range ch.Children {
			start, err := time.Parse(localLayout, o.Props.Get(goical.PropDateTimeStart).Value)
			if err != nil {
				t.Fatal(err)
			}
			obs = append(obs, observance{start, o.Props.Get(goical.PropTimezoneOffsetTo).Value})
		}
	}
	slices.SortFunc(obs, func(a, b observance) int { return a.start.Compare(b.start) })

	events := gcal.Events()
	// 487 dates, a sunrise and a sunset on each
	if len(events) != 2*487 {
		t.Fatalf("%d events, want %d", len(events), 2*487)
	}
	summer2041 := 0
	for _, ev := range events {
		p := ev.Props.Get(goical.PropDateTimeStart)
		if tz := p.Params.Get(goical.ParamTimezoneID); tz != "Europe/Zurich" {
			t.Fatalf("DTSTART %s: TZID %q, want Europe/Zurich", p.Value, tz)
		}
		wall, err := time.Parse(localLayout, p.Value)
		if err != nil {
			t.Fatal(err)
		}
		got := ""
		for _, o := range obs {
			if !o.start.After(wall) {
				got = o.to
			}
		}
		if want := zurichOffset(wall); got != want {
			t.Errorf("DTSTART %s: the VTIMEZONE gives %q, zdump %s", p.Value, got, want)
		}
		if wall.Year() == 2041 && wall.Month() >= time.April {
			summer2041++
		}
	}
	if summer2041 == 0 {
		t.Error("no event in the summer of 2041: the test no longer covers it")
	}
}

// TestZoneSpanLeapYearEnd: the offset period that holds an instant on 31
// December 2040 holds it (Go's ZoneBounds gives that day's 00:00 UTC as its
// end), with Zurich's offset then, +01:00, and no hour shown twice (zdump
// -v -c 2040,2042 Europe/Zurich, Debian GLIBC 2.36: CET from 28 October
// 2040 01:00 UTC to 31 March 2041 01:00 UTC).
func TestZoneSpanLeapYearEnd(t *testing.T) {
	loc := mustLoad(t, "Europe/Zurich")
	for _, at := range []time.Time{time.Date(2040, 12, 31, 0, 0, 0, 0, time.UTC), time.Date(2040, 12, 31, 12, 0, 0, 0, time.UTC),
		time.Date(2040, 12, 31, 23, 59, 59, 0, time.UTC)} {
		s := zoneSpanAt(at, loc)
		u := at.Unix()
		if u < s.from || u >= s.to {
			t.Errorf("%s: period %s..%s does not hold it", at, time.Unix(s.from, 0).UTC(), time.Unix(s.to, 0).UTC())
		}
		if s.off != 3600 || u < s.ambBefore || u >= s.ambFrom {
			t.Errorf("%s: offset %d, ambiguous %v; want 3600, false", at, s.off, u < s.ambBefore || u >= s.ambFrom)
		}
	}
}
