package main

import (
	"context"
	"strings"
	"testing"
	"time"

	"heliocal/config"
	"heliocal/feed"
	"heliocal/feed/publish"
)

// The year chart of an invented site at the USNO coordinates of Washington,
// DC, drawn for 1 January 2024: sunrise on the local clock, the new and full
// Moons, the 12 h photoperiod crossings, lamp periods and today's date.
func TestChartClockPhasesAndThresholds(t *testing.T) {
	cfg, err := config.Parse(strings.NewReader(`
sites:
  - {id: mall, latitude: 38.889444, longitude: -77.035278, elevation: 0, timezone: America/New_York}
feeds:
  - {id: mall-sun, site: mall, kinds: [sunrise, sunset, "photoperiod:12h", "lighting:14h", moon-phases]}
`), "yaml")
	if err != nil {
		t.Fatal(err)
	}
	now := time.Date(2024, 1, 1, 15, 0, 0, 0, time.UTC)
	c, err := chartsFor(cfg, now)(context.Background(), feed.SiteOf(&cfg.Sites[0]))
	if err != nil {
		t.Fatal(err)
	}
	if want := time.Date(2024, 1, 1, 0, 0, 0, 0, time.UTC); !c.Today.Equal(want) {
		t.Errorf("today %v, want %v", c.Today, want)
	}
	// The chart runs from four weeks before today to a year after it, so
	// that today's line is not at its edge.
	if first, last := c.Days[0].Date, c.Days[len(c.Days)-1].Date; !first.Equal(time.Date(2023, 12, 4, 0, 0, 0, 0, time.UTC)) ||
		!last.Equal(time.Date(2024, 12, 31, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("chart from %v to %v, want 4 Dec 2023 to 31 Dec 2024", first, last)
	}
	day := func(y int, m time.Month, d int) publish.ChartDay {
		return c.Days[int(time.Date(y, m, d, 0, 0, 0, 0, time.UTC).Sub(c.Days[0].Date).Hours()/24)]
	}
	// USNO one-day data service, Washington DC, 2024-03-05: sunrise 06:34,
	// sunset 18:06 EST (testdata/reference/sun-times.csv sun-0270, sun-0272).
	d := day(2024, 3, 5)
	for _, x := range []struct {
		name string
		got  time.Duration
		ok   bool
		want time.Duration
	}{{"sunrise", d.Rise, d.HasRise, 6*time.Hour + 34*time.Minute}, {"sunset", d.Set, d.HasSet, 18*time.Hour + 6*time.Minute}} {
		if diff := x.got - x.want; !x.ok || diff < -time.Minute || diff > time.Minute {
			t.Errorf("%s on %v: %v (present %v), want %v ± 1 min", x.name, d.Date, x.got, x.ok, x.want)
		}
	}
	// After the change to daylight saving time (10 March 2024) the clock
	// reads an hour later: sunrise well after 07:00 on 11 March.
	if d := day(2024, 3, 11); !d.HasRise || d.Rise < 7*time.Hour {
		t.Errorf("sunrise on %v at %v, want after 07:00 (EDT)", d.Date, d.Rise)
	}
	// USNO moon-phase data (testdata/reference/moon-phases.csv mp-0067,
	// mp-0069): full Moon 2024-01-25 17:54 UTC, new Moon 2024-02-09 22:59 UTC.
	for _, want := range []struct {
		at   time.Time
		full bool
	}{{time.Date(2024, 1, 25, 17, 54, 0, 0, time.UTC), true}, {time.Date(2024, 2, 9, 22, 59, 0, 0, time.UTC), false}} {
		found := false
		for _, p := range c.Phases {
			if p.Full == want.full && p.At.Sub(want.at).Abs() < 2*time.Minute {
				found = true
			}
		}
		if !found {
			t.Errorf("no phase (full %v) at %v among %d", want.full, want.at, len(c.Phases))
		}
	}
	n := 0
	for _, p := range c.Phases {
		if !p.At.Before(now) {
			n++
		}
	}
	if n < 24 || n > 26 {
		t.Errorf("%d new and full Moons in the year ahead, want 24 to 26", n)
	}
	if len(c.Levels) != 1 || c.Levels[0].Length != 12*time.Hour {
		t.Errorf("levels %v, want the 12 h threshold", c.Levels)
	}
	// Lamps bring the short winter days up to 14 h: some on 1 January, none
	// at midsummer (day length near 14 h 50 min at 39° N, from memory).
	var jan, jun int
	for _, s := range c.Lamps {
		if s.To <= s.From || s.From < 0 || s.To > 24*time.Hour {
			t.Errorf("bad lamp piece %+v", s)
		}
		switch s.Date.Format("01-02") {
		case "01-01":
			jan++
		case "06-21":
			jun++
		}
	}
	if jan == 0 || jun != 0 {
		t.Errorf("lamp pieces: %d on 1 Jan (want some), %d on 21 Jun (want none)", jan, jun)
	}
}
