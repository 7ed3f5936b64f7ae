package feed

import (
	"math/rand"
	"strings"
	"testing"
	"time"
)

// TestToSecondTwoSteps: ToSecond (and UnixSecond, its Unix second) gives
// what rounding to the millisecond,
// then to the second, gives (the rule written above it), at the halfway
// values of both steps and at random instants, before and after 1970.
func TestToSecondTwoSteps(t *testing.T) {
	twoSteps := func(t time.Time) time.Time { return t.Round(time.Millisecond).Round(time.Second) }
	base := []time.Time{
		time.Date(2027, 3, 28, 0, 59, 59, 0, time.UTC),
		time.Date(1900, 1, 1, 12, 0, 0, 0, time.UTC),
		time.Date(2099, 12, 31, 23, 59, 59, 0, time.FixedZone("", 3600)),
		time.Now(), // with a monotonic reading, which neither keeps
	}
	nanos := []int{0, 1, 499_499_999, 499_500_000, 499_999_999, 500_000_000, 999_499_999, 999_500_000, 999_999_999}
	r := rand.New(rand.NewSource(12))
	for range 2000 {
		nanos = append(nanos, r.Intn(1e9))
	}
	for _, b := range base {
		for _, n := range nanos {
			in := b.Add(time.Duration(n))
			if got, want := ToSecond(in), twoSteps(in); !got.Equal(want) || got.Location() != want.Location() || got != want {
				t.Fatalf("ToSecond(%s) = %s, want %s", in.Format(time.RFC3339Nano), got.Format(time.RFC3339Nano), want.Format(time.RFC3339Nano))
			}
			if got, want := UnixSecond(in), twoSteps(in).Unix(); got != want {
				t.Fatalf("UnixSecond(%s) = %d, want %d", in.Format(time.RFC3339Nano), got, want)
			}
		}
	}
}

// TestShownAt: a lamp entry's clock to the second and to the minute are
// those of ToSecond and ToMinute in the zone, at the halfway values and
// across the clock changes of a zone with summer time.
func TestShownAt(t *testing.T) {
	loc, err := time.LoadLocation("Europe/Vienna")
	if err != nil {
		t.Fatal(err)
	}
	z := newZoneCache(loc)
	r := rand.New(rand.NewSource(3))
	var ts []time.Time
	for _, base := range []time.Time{time.Date(2027, 3, 28, 0, 59, 29, 499_499_999, time.UTC), time.Date(2027, 10, 31, 0, 59, 59, 500_000_000, time.UTC),
		time.Date(1969, 12, 31, 23, 59, 29, 499_500_000, time.UTC)} {
		for _, d := range []time.Duration{0, time.Nanosecond, 500 * time.Microsecond, 30 * time.Second, -time.Hour, time.Minute} {
			ts = append(ts, base.Add(d))
		}
	}
	for range 2000 {
		ts = append(ts, time.Unix(r.Int63n(4e9)-1e9, r.Int63n(1e9)).UTC())
	}
	for _, u := range ts {
		got := shownAt(u, z)
		s, m := ToSecond(u).In(loc), ToMinute(u).In(loc)
		zone, _ := s.Zone()
		if int(got.h) != s.Hour() || int(got.m) != s.Minute() || int(got.s) != s.Second() || got.zone != zone || int(got.hm) != m.Hour() || int(got.mm) != m.Minute() {
			t.Fatalf("shownAt(%v) = %+v, want %s and %s", u, got, s.Format("15:04:05 MST"), m.Format("15:04"))
		}
	}
}

// TestAppendHM: the minute durations' fast path writes what the general
// rule does (appendDuration), on both sides of each rounding.
func TestAppendHM(t *testing.T) {
	for _, d := range []time.Duration{0, 29 * time.Second, 30 * time.Second, 59*time.Minute + 29*time.Second,
		59*time.Minute + 30*time.Second, time.Hour, 9*time.Hour + 5*time.Minute, 23*time.Hour + 59*time.Minute + 45*time.Second,
		36 * time.Hour, 101*time.Hour + 7*time.Minute, -5 * time.Minute, 9*time.Minute + 29*time.Second + 999*time.Millisecond,
		9*time.Minute + 30*time.Second, 9*time.Hour + 59*time.Minute + 30*time.Second, 10 * time.Hour, 99*time.Hour + 59*time.Minute + 31*time.Second} {
		want := "x" + string(appendDuration(nil, d, time.Minute, false))
		if d > 0 && d < 30*time.Second {
			want = "xunder 1 min" // lasts, but rounds to no minute
		}
		if got := string(appendHM([]byte("x"), d)); got != want {
			t.Errorf("appendHM(%v) = %q, want %q", d, got, want)
		}
	}
}

// TestAppendStamp: a plan's anchor instant, written from the zone cache,
// reads as the standard library's Format writes it ("Mon 2 Jan 2006 15:04",
// the clock cut to the minute) with the zone's label (ZoneLabel of the
// abbreviation Format's "MST" gives), in zones with offsets of half and
// three quarters of an hour, numeric abbreviations ("-03") and clocks that
// skip midnight, before 1970 and after, on both sides of their changes.
func TestAppendStamp(t *testing.T) {
	const layout = "Mon 2 Jan 2006 15:04 "
	for _, name := range []string{"Europe/Vienna", "America/Santiago", "America/Havana", "Asia/Kolkata",
		"Pacific/Chatham", "Australia/Lord_Howe", "Arctic/Longyearbyen", "UTC"} {
		loc, err := time.LoadLocation(name)
		if err != nil {
			t.Fatal(err)
		}
		z := newZoneCache(loc)
		n := 0
		for u := int64(-3_000_000_000); u < 5_000_000_000; u += 7_777_777 {
			for _, d := range []time.Duration{0, 59*time.Second + 999*time.Millisecond, 17 * time.Hour} {
				at := time.Unix(u, 0).Add(d)
				got := string(z.appendStamp([]byte("x"), at))
				if want := "x" + at.In(loc).Format(layout) + ZoneLabel(at.In(loc).Format("MST")); got != want {
					t.Fatalf("%s: appendStamp(%v) = %q, want %q", name, at, got, want)
				}
				n++
			}
		}
		// around each change of the clocks from 2026 to 2029
		for at := time.Date(2026, 1, 1, 0, 0, 0, 0, loc); at.Year() < 2030; {
			_, end := at.ZoneBounds()
			if end.IsZero() {
				break
			}
			for _, d := range []time.Duration{-time.Hour, -time.Second, 0, time.Second, 30 * time.Minute, time.Hour} {
				x := end.Add(d)
				if got, want := string(z.appendStamp(nil, x)), x.In(loc).Format(layout)+ZoneLabel(x.In(loc).Format("MST")); got != want {
					t.Fatalf("%s: appendStamp(%v) = %q, want %q", name, x, got, want)
				}
				n++
			}
			at = end
		}
		if n < 3000 {
			t.Fatalf("%s: %d instants", name, n)
		}
	}
}

// Capital makes the first letter a capital by the Unicode case mappings
// (UnicodeData.txt: U+0074 t → U+0054 T, U+00E9 é → U+00C9 É, U+03B1 α →
// U+0391 Α); a first character without one (a digit, U+00DF ß, whose
// single-letter mapping is itself) leaves the text as it is.
func TestCapital(t *testing.T) {
	for _, c := range []struct{ in, want string }{
		{"total solar eclipse", "Total solar eclipse"},
		{"Total", "Total"},
		{"t", "T"},
		{"été", "Été"},
		{"\u03b1 Centauri", "\u0391 Centauri"},
		{"ße", "ße"},
		{"24 h", "24 h"},
		{"", ""},
		{"\xffab", "\xffab"}, // not UTF-8: left as it is
	} {
		if got := Capital(c.in); got != c.want {
			t.Errorf("Capital(%q) = %q, want %q", c.in, got, c.want)
		}
	}
}

// Small makes the first letter a small one by the Unicode case mappings
// (UnicodeData.txt: U+0054 T → U+0074 t, U+00C9 É → U+00E9 é, U+0391 Α →
// U+03B1 α, U+0130 İ → U+0069 i, one byte shorter in UTF-8); a first
// character without one (a digit, a small letter) leaves the text as it is.
func TestSmall(t *testing.T) {
	for _, c := range []struct{ in, want string }{
		{"Polar night: the Sun does not rise today", "polar night: the Sun does not rise today"},
		{"polar", "polar"},
		{"T", "t"},
		{"Été", "été"},
		{"\u0391 Centauri", "\u03b1 Centauri"},
		{"\u0130stanbul", "istanbul"},
		{"24 h", "24 h"},
		{"", ""},
		{"\xffAb", "\xffAb"}, // not UTF-8: left as it is
	} {
		if got := Small(c.in); got != c.want {
			t.Errorf("Small(%q) = %q, want %q", c.in, got, c.want)
		}
	}
}

// ZoneLabel names a zone as its abbreviation where the time zone database
// has one, and spells out the numeric ones it gives where it has none
// (IANA tz database: America/Santiago "-04" and "-03", Asia/Kathmandu
// "+0545", Asia/Kolkata "IST", Europe/Vienna "CET"), as an offset from
// UTC with a true minus sign (common practice: "UTC−03", "UTC+05:45").
func TestZoneLabel(t *testing.T) {
	for _, c := range []struct {
		zone string
		at   time.Time
		want string
	}{
		{"America/Santiago", time.Date(2026, 9, 5, 12, 0, 0, 0, time.UTC), "UTC−04"},
		{"America/Santiago", time.Date(2026, 9, 7, 12, 0, 0, 0, time.UTC), "UTC−03"},
		{"Asia/Kathmandu", time.Date(2026, 9, 5, 12, 0, 0, 0, time.UTC), "UTC+05:45"},
		{"Asia/Kolkata", time.Date(2026, 9, 5, 12, 0, 0, 0, time.UTC), "IST"},
		{"Europe/Vienna", time.Date(2026, 1, 5, 12, 0, 0, 0, time.UTC), "CET"},
		{"UTC", time.Date(2026, 1, 5, 12, 0, 0, 0, time.UTC), "UTC"},
	} {
		loc, err := time.LoadLocation(c.zone)
		if err != nil {
			t.Fatal(err)
		}
		if got := zoneLabelOf(c.at.In(loc)); got != c.want {
			t.Errorf("%s at %s: %q, want %q", c.zone, c.at.Format(time.RFC3339), got, c.want)
		}
		if got := LocalClock(c.at, loc, true); !strings.HasSuffix(got, " "+c.want) {
			t.Errorf("LocalClock in %s: %q, want it to end in %q", c.zone, got, c.want)
		}
	}
	for _, s := range []string{"", "+", "-3", "-0a", "+05300", "GMT"} {
		if got := ZoneLabel(s); got != s {
			t.Errorf("ZoneLabel(%q) = %q, want it unchanged", s, got)
		}
	}
}

// TestZoneCacheLeapYearEnd: on 31 December of a leap year past the tz
// database's last transition (2037), the zone's next change is after the
// instant asked about (Go's ZoneBounds gives 31 December 00:00 UTC as the
// end of the period), not after the next real change (zdump -v -c
// 2040,2042 Europe/Zurich, Debian GLIBC 2.36: CET, +01:00, from 28 October
// 2040 to 31 March 2041 01:00 UTC), and the day's instants are answered
// from the one period looked up.
func TestZoneCacheLeapYearEnd(t *testing.T) {
	loc, err := time.LoadLocation("Europe/Zurich")
	if err != nil {
		t.Fatal(err)
	}
	z := newZoneCache(loc)
	day := time.Date(2040, 12, 31, 0, 0, 0, 0, time.UTC).Unix()
	spring := time.Date(2041, 3, 31, 1, 0, 0, 0, time.UTC).Unix()
	for u := day; u < day+secondsPerDay; u += 600 {
		if next := z.nextChange(u); next <= u || next > spring {
			t.Fatalf("nextChange(%s) = %s", time.Unix(u, 0).UTC(), time.Unix(next, 0).UTC())
		}
		if name, off := z.at(u); name != "CET" || off != 3600 {
			t.Fatalf("at(%s) = %s %d, want CET 3600", time.Unix(u, 0).UTC(), name, off)
		}
	}
	if z.nseen != 1 {
		t.Errorf("%d periods looked up for one day, want 1", z.nseen)
	}
}
