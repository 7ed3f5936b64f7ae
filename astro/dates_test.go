package astro

import (
	"context"
	"errors"
	"testing"
	"time"
)

func mustZone(t *testing.T, name string) *time.Location {
	t.Helper()
	loc, err := time.LoadLocation(name)
	if err != nil {
		t.Fatal(err)
	}
	return loc
}

// TestDateStart checks the first instant of dates whose midnight is
// skipped or repeated. The clock changes are those of the tz database
// (IANA), as shipped with Go: Havana 2026-03-08 00:00 CST → 01:00 CDT,
// Santiago 2026-09-06 00:00 −04 → 01:00 −03, Azores 2026-03-29 00:00 −01 →
// 01:00 +00; Havana falls back 2026-11-01 01:00 CDT → 00:00 CST, so that
// midnight comes twice; Cairo falls back at 24:00 → 23:00 on the last
// Thursday of October, so 23:00 on 2026-10-29 comes twice; Apia skipped
// 2011-12-30 entirely.
func TestDateStart(t *testing.T) {
	cases := []struct {
		zone       string
		y          int
		m          time.Month
		d, hour    int
		want, wall string // UTC instant, local reading
	}{
		{"America/Havana", 2026, 3, 8, 0, "2026-03-08T05:00:00Z", "2026-03-08 01:00 CDT"},
		{"America/Havana", 2026, 3, 7, 0, "2026-03-07T05:00:00Z", "2026-03-07 00:00 CST"},
		{"America/Havana", 2026, 3, 9, 0, "2026-03-09T04:00:00Z", "2026-03-09 00:00 CDT"},
		{"America/Santiago", 2026, 9, 6, 0, "2026-09-06T04:00:00Z", "2026-09-06 01:00 -03"},
		{"Atlantic/Azores", 2026, 3, 29, 0, "2026-03-29T01:00:00Z", "2026-03-29 01:00 +00"},
		{"America/Havana", 2026, 11, 1, 0, "2026-11-01T04:00:00Z", "2026-11-01 00:00 CDT"},
		{"Africa/Cairo", 2026, 10, 29, 23, "2026-10-29T20:00:00Z", "2026-10-29 23:00 EEST"},
		{"Europe/Vienna", 2026, 3, 29, 0, "2026-03-28T23:00:00Z", "2026-03-29 00:00 CET"},
		{"Pacific/Apia", 2011, 12, 30, 0, "2011-12-30T10:00:00Z", "2011-12-31 00:00 +14"},
	}
	for _, c := range cases {
		loc := mustZone(t, c.zone)
		got := wallStart(loc, c.y, c.m, c.d, c.hour)
		if g := got.UTC().Format(time.RFC3339); g != c.want {
			t.Errorf("%s %d-%02d-%02d %02d:00: first instant %s, want %s", c.zone, c.y, c.m, c.d, c.hour, g, c.want)
		}
		if g := got.In(loc).Format("2006-01-02 15:04 MST"); g != c.wall {
			t.Errorf("%s %d-%02d-%02d: reads %s, want %s", c.zone, c.y, c.m, c.d, g, c.wall)
		}
	}
}

// TestLocalDaysSkippedMidnight checks that the date spans of a window
// holding a skipped midnight, a repeated one and a date that does not exist
// tile the window: one span per existing date, each starting where the
// previous ends.
func TestLocalDaysSkippedMidnight(t *testing.T) {
	cases := []struct {
		zone        string
		first, last string
		dates       int
	}{
		{"America/Havana", "2026-03-06", "2026-03-10", 5},
		{"America/Havana", "2026-10-30", "2026-11-02", 4},
		{"America/Santiago", "2026-09-05", "2026-09-07", 3},
		{"Atlantic/Azores", "2026-03-29", "2026-03-29", 1},
		{"Pacific/Apia", "2011-12-29", "2011-12-31", 2}, // 30 December does not exist
	}
	for _, c := range cases {
		loc := mustZone(t, c.zone)
		for _, hour := range []int{0, 12} {
			first, _ := time.ParseInLocation(time.DateOnly, c.first, loc)
			last, _ := time.ParseInLocation(time.DateOnly, c.last, loc)
			spans, err := localDays(context.Background(), "test", loc, first, last, hour)
			if err != nil {
				t.Fatal(err)
			}
			if len(spans) != c.dates {
				t.Errorf("%s %s..%s at %02d:00: %d dates, want %d", c.zone, c.first, c.last, hour, len(spans), c.dates)
			}
			for i, s := range spans {
				if !s.start.Before(s.end) {
					t.Errorf("%s %s: empty span", c.zone, s.date.Format(time.DateOnly))
				}
				if y, m, d := s.start.In(loc).Date(); hour == 0 && time.Date(y, m, d, 0, 0, 0, 0, time.UTC) != s.date {
					t.Errorf("%s: span for %s starts on %d-%02d-%02d", c.zone, s.date.Format(time.DateOnly), y, m, d)
				}
				// a night ends at noon of the next date that exists
				// (zdump -v Pacific/Apia: 2011-12-29 23:59:59 −10 is
				// followed by 2011-12-31 00:00:00 +14)
				if h, m, sec := s.end.In(loc).Clock(); hour == 12 && (h != 12 || m != 0 || sec != 0) {
					t.Errorf("%s: the night of %s ends at %s, not at noon", c.zone, s.date.Format(time.DateOnly), s.end.In(loc))
				}
				if i > 0 && !spans[i-1].end.Equal(s.start) {
					t.Errorf("%s: gap or overlap before %s", c.zone, s.date.Format(time.DateOnly))
				}
			}
		}
	}
}

// TestDailySearchesSkippedMidnight runs every per-date search over dates
// whose midnight is skipped: each returns one result per date, in order.
func TestDailySearchesSkippedMidnight(t *testing.T) {
	from := time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC)
	me, err := NewMoonEphemeris(from, from.AddDate(0, 7, 0))
	if err != nil {
		t.Fatal(err)
	}
	ctx := context.Background()
	for _, c := range []struct {
		zone     string
		lat, lon float64
		date     string
	}{
		{"America/Havana", 23.1, -82.4, "2026-03-08"},
		{"America/Santiago", -33.4, -70.7, "2026-09-06"},
		{"Atlantic/Azores", 37.7, -25.7, "2026-03-29"},
	} {
		loc := mustZone(t, c.zone)
		o := Observer{Latitude: c.lat, Longitude: c.lon}
		d, _ := time.ParseInLocation(time.DateOnly, c.date, loc)
		first, last := d.AddDate(0, 0, -1), d.AddDate(0, 0, 1)
		sun, err := me.Sun().SunDays(ctx, o, o.RiseSetAltitude(), loc, first, last)
		if err != nil {
			t.Fatal(err)
		}
		moon, err := me.MoonDays(ctx, o, loc, first, last)
		if err != nil {
			t.Fatal(err)
		}
		nights, err := me.DarkWindows(ctx, o, loc, first, last, 0)
		if err != nil {
			t.Fatal(err)
		}
		if len(sun) != 3 || len(moon) != 3 || len(nights) != 3 {
			t.Fatalf("%s %s: %d Sun days, %d Moon days, %d nights, want 3 each", c.zone, c.date, len(sun), len(moon), len(nights))
		}
		for i := range 3 {
			want := first.AddDate(0, 0, i).Format(time.DateOnly)
			for _, got := range []time.Time{sun[i].Date, moon[i].Date, nights[i].Date} {
				if g := got.In(loc).Format(time.DateOnly); g != want {
					t.Errorf("%s: result %d is for %s, want %s", c.zone, i, g, want)
				}
			}
			if len(sun[i].Rising) != 1 || len(sun[i].Setting) != 1 {
				t.Errorf("%s %s: %d sunrises, %d sunsets, want 1 each", c.zone, want, len(sun[i].Rising), len(sun[i].Setting))
			}
		}
	}
}

// TestDailySearchesCancelled checks that a cancelled context stops every
// per-date search with the context's error.
func TestDailySearchesCancelled(t *testing.T) {
	from := time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)
	me, err := NewMoonEphemeris(from, from.AddDate(0, 1, 0))
	if err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	o := Observer{Latitude: 47, Longitude: 9}
	last := from.AddDate(0, 0, 20)
	_, err1 := me.Sun().SunDays(ctx, o, o.RiseSetAltitude(), time.UTC, from, last)
	_, err2 := me.MoonDays(ctx, o, time.UTC, from, last)
	_, err3 := me.DarkWindows(ctx, o, time.UTC, from, last, 0)
	for i, err := range []error{err1, err2, err3} {
		if !errors.Is(err, context.Canceled) {
			t.Errorf("search %d: err = %v, want context.Canceled", i, err)
		}
	}
}
