package ical

import (
	"bytes"
	"fmt"
	"slices"
	"strings"
	"testing"
	"time"
	_ "time/tzdata" // tests must not depend on the host's zoneinfo
	"unicode"

	ics "github.com/arran4/golang-ical"
	goical "github.com/emersion/go-ical"

	"heliocal/feed"
)

func mustLoad(t testing.TB, name string) *time.Location {
	t.Helper()
	loc, err := time.LoadLocation(name)
	if err != nil {
		t.Fatalf("load %s: %v", name, err)
	}
	return loc
}

func utc(y int, m time.Month, d, h, min, s int) time.Time {
	return time.Date(y, m, d, h, min, s, 0, time.UTC)
}

// testCalendar is a synthetic feed for zone over [from, to): timed instants
// and spans every 11 h 17 min (so they visit every local hour), an all-day
// entry every tenth step, and instants around every offset change of the
// zone, including both occurrences of a repeated local hour.
func testCalendar(t testing.TB, zone string, from, to time.Time) *feed.Calendar {
	t.Helper()
	loc := mustLoad(t, zone)
	c := &feed.Calendar{
		ID:          "test-" + strings.ToLower(strings.ReplaceAll(zone, "/", "-")),
		Title:       "Test feed for " + zone,
		Description: "Synthetic entries, every local hour and every clock change",
		Site: feed.Site{ID: "test-site", Name: "Test site", Latitude: -33.8688, Longitude: 151.2093,
			Location: loc},
		Refresh:     12 * time.Hour,
		WindowStart: from,
		WindowEnd:   to,
		Stamp:       from,
	}
	n := 0
	add := func(e feed.Entry) {
		n++
		e.UID = fmt.Sprintf("e%05d@test.heliocal", n)
		if e.Title == "" {
			e.Title = fmt.Sprintf("Entry %d", n)
		}
		c.Entries = append(c.Entries, e)
	}
	step := 11*time.Hour + 17*time.Minute + 13*time.Second
	for i, tm := 0, from; tm.Before(to); i, tm = i+1, tm.Add(step) {
		switch {
		case i%10 == 9:
			d := tm.In(loc)
			day := time.Date(d.Year(), d.Month(), d.Day(), 0, 0, 0, 0, time.UTC)
			add(feed.Entry{Kind: "note", AllDay: true, Start: day, End: day.AddDate(0, 0, 1), Date: day})
		case i%2 == 0:
			add(feed.Entry{Kind: "instant", Start: tm, Categories: []string{"Sun"}})
		default:
			add(feed.Entry{Kind: "span", Start: tm, End: tm.Add(47*time.Minute + 500*time.Millisecond)})
		}
	}
	for _, o := range goTransitions(loc, from, to) {
		for _, d := range []time.Duration{-90 * time.Minute, -30 * time.Minute, -time.Second, 0, time.Second,
			30 * time.Minute, 90 * time.Minute} {
			add(feed.Entry{Kind: "edge", Start: o.Add(d)})
		}
		add(feed.Entry{Kind: "edge-span", Start: o.Add(-45 * time.Minute), End: o.Add(45 * time.Minute)})
	}
	slices.SortStableFunc(c.Entries, func(a, b feed.Entry) int { return a.Start.Compare(b.Start) })
	return c
}

// goTransitions lists the instants in [from, to] where loc's offset changes,
// found independently of the encoder: an hourly scan refined by bisection.
func goTransitions(loc *time.Location, from, to time.Time) []time.Time {
	var r []time.Time
	off := func(t time.Time) int { _, o := t.In(loc).Zone(); return o }
	for t := from; t.Before(to); t = t.Add(time.Hour) {
		a, b := t, t.Add(time.Hour)
		if off(a) == off(b) {
			continue
		}
		for b.Sub(a) > time.Second {
			mid := a.Add(b.Sub(a) / 2).Truncate(time.Second)
			if off(mid) == off(a) {
				a = mid
			} else {
				b = mid
			}
		}
		r = append(r, b)
	}
	return r
}

// normText is the TEXT normalisation the feed promises, written
// independently: valid UTF-8, CRLF and CR to LF, no control characters
// except LF and HTAB.
func normText(s string) string {
	s = strings.ToValidUTF8(s, "\uFFFD")
	s = strings.ReplaceAll(strings.ReplaceAll(s, "\r\n", "\n"), "\r", "\n")
	var b strings.Builder
	for _, r := range s {
		if unicode.IsControl(r) && r != '\n' && r != '\t' {
			continue
		}
		b.WriteRune(r)
	}
	return b.String()
}

// wantTimes is what DTSTART/DTEND must mean for e.
func wantTimes(e *feed.Entry) (start, end time.Time) {
	if e.AllDay {
		s := e.Start.UTC()
		start = time.Date(s.Year(), s.Month(), s.Day(), 0, 0, 0, 0, time.UTC)
		end = start.AddDate(0, 0, 1)
		if !e.End.IsZero() {
			x := e.End.UTC()
			end = time.Date(x.Year(), x.Month(), x.Day(), 0, 0, 0, 0, time.UTC)
		}
		return start, end
	}
	// Shown to the second as every output shows an instant: to the
	// millisecond first, as JSON does, then to the second (feed/round.go).
	start = e.Start.UTC().Round(time.Millisecond).Round(time.Second)
	end = e.End.UTC().Round(time.Millisecond).Round(time.Second)
	if !end.After(start) {
		end = start.Add(time.Minute)
	}
	return start, end
}

// verify runs every check on one encoded calendar: the strict checker, the
// independent parser (go-ical) with TZIDs resolved through the tz database,
// the file's own VTIMEZONE, and the VTIMEZONE against the tz database.
func verify(t *testing.T, c *feed.Calendar, data []byte) {
	t.Helper()
	for _, p := range checkStrict(data) {
		t.Errorf("strict: %s", p)
	}
	cal, _ := parseStrict(data)
	if cal == nil {
		t.Fatal("no calendar")
	}
	zones := map[string]*vzone{}
	for _, tz := range cal.children("VTIMEZONE") {
		z, err := parseVZone(tz)
		if err != nil {
			t.Fatal(err)
		}
		zones[tz.get("TZID").Value] = z
	}
	byUID := map[string]*feed.Entry{}
	for i := range c.Entries {
		byUID[c.Entries[i].UID] = &c.Entries[i]
	}

	// The independent parser.
	gcal, err := goical.NewDecoder(bytes.NewReader(data)).Decode()
	if err != nil {
		t.Fatalf("go-ical: %v", err)
	}
	events := gcal.Events()
	if len(events) != len(c.Entries) {
		t.Fatalf("go-ical sees %d events, want %d", len(events), len(c.Entries))
	}
	for _, ev := range events {
		uid, err := ev.Props.Text(goical.PropUID)
		if err != nil {
			t.Fatal(err)
		}
		e := byUID[uid]
		if e == nil {
			t.Fatalf("unknown UID %q", uid)
		}
		ws, we := wantTimes(e)
		gs, err1 := ev.DateTimeStart(time.UTC)
		ge, err2 := ev.DateTimeEnd(time.UTC)
		if err1 != nil || err2 != nil {
			t.Fatalf("%s: go-ical times: %v %v", uid, err1, err2)
		}
		if !gs.Equal(ws) || !ge.Equal(we) {
			t.Errorf("%s (%s): go-ical reads %s..%s, want %s..%s", uid, e.Kind, gs.UTC(), ge.UTC(), ws, we)
		}
		if s, _ := ev.Props.Text(goical.PropSummary); s != normText(e.Title) {
			t.Errorf("%s: SUMMARY %q, want %q", uid, s, normText(e.Title))
		}
		if p := ev.Props.Get(goical.PropDateTimeStamp); p == nil || p.Value != c.Stamp.UTC().Format(utcLayout) {
			t.Errorf("%s: DTSTAMP %v, want %s", uid, p, c.Stamp.UTC().Format(utcLayout))
		}
	}

	// The file's own VTIMEZONE, read by the checker.
	for _, ev := range cal.children("VEVENT") {
		e := byUID[ev.get("UID").Value]
		ws, we := wantTimes(e)
		s, err1 := resolveTime(ev.get("DTSTART"), zones)
		en, err2 := resolveTime(ev.get("DTEND"), zones)
		if err1 != nil || err2 != nil {
			t.Fatalf("%s: %v %v", e.UID, err1, err2)
		}
		if !s.Equal(ws) || !en.Equal(we) {
			t.Errorf("%s (%s): VTIMEZONE gives %s..%s, want %s..%s (DTSTART %s)", e.UID, e.Kind, s, en, ws, we,
				ev.get("DTSTART").Value)
		}
	}

	// The VTIMEZONE against the tz database.
	for id, z := range zones {
		loc := c.Site.Location
		if id != loc.String() {
			t.Errorf("VTIMEZONE %q for site zone %q", id, loc)
		}
		for i, p := range zoneProblems(z, loc, c.WindowStart, c.WindowEnd) {
			if i == 5 {
				t.Error("...")
				break
			}
			t.Error(p)
		}
	}
	if len(zones) == 0 && !c.UTC && !isUTC(c.Site.Location) {
		t.Errorf("no VTIMEZONE for local-time calendar")
	}
}

// zoneProblems samples every hour (and one second either side of every
// change) from a week before the window to a week after it and compares the
// offset and abbreviation the VTIMEZONE implies with Go's tz database.
func zoneProblems(z *vzone, loc *time.Location, from, to time.Time) []string {
	var probs []string
	if !z.obs[0].onset.Before(from) {
		probs = append(probs, fmt.Sprintf("%s: first observance %s is not before the window start %s", loc, z.obs[0].onset, from))
	}
	var samples []time.Time
	for tm := from.Add(-7 * 24 * time.Hour); tm.Before(to.Add(7 * 24 * time.Hour)); tm = tm.Add(time.Hour) {
		samples = append(samples, tm)
	}
	for _, tr := range goTransitions(loc, from.Add(-7*24*time.Hour), to.Add(7*24*time.Hour)) {
		samples = append(samples, tr.Add(-time.Second), tr, tr.Add(time.Second))
	}
	for _, tm := range samples {
		got, ok := z.offsetAt(tm)
		name, want := tm.In(loc).Zone()
		if !ok || got != want {
			probs = append(probs, fmt.Sprintf("%s at %s: VTIMEZONE offset %s (covered %v), tz database %s", loc, tm,
				formatOffset(got), ok, formatOffset(want)))
		}
		var oname string
		for _, o := range z.obs {
			if !o.onset.After(tm) {
				oname = o.name
			}
		}
		if oname != name {
			probs = append(probs, fmt.Sprintf("%s at %s: TZNAME %q, tz database %q", loc, tm, oname, name))
		}
	}
	return probs
}

var zoneCases = []struct {
	zone string
	why  string
}{
	{"Europe/Vienna", "northern DST"},
	{"America/New_York", "northern DST, west of Greenwich"},
	{"Asia/Tokyo", "no DST"},
	{"America/Phoenix", "no DST, in a country that has it"},
	{"Asia/Kolkata", "half-hour offset"},
	{"Australia/Adelaide", "half-hour offset, DST, southern"},
	{"Australia/Sydney", "southern DST"},
	{"America/Santiago", "southern DST, irregular rules"},
	{"Pacific/Auckland", "southern DST, +13"},
	{"Pacific/Chatham", "+12:45 / +13:45"},
	{"Asia/Kathmandu", "+05:45"},
	{"Europe/Dublin", "negative DST in the tz database"},
	{"America/St_Johns", "-03:30 with DST"},
	{"UTC", "UTC itself: no VTIMEZONE"},
}

func TestEncodeZones(t *testing.T) {
	from, to := utc(2026, 1, 1, 0, 0, 0), utc(2027, 3, 1, 0, 0, 0)
	for _, tc := range zoneCases {
		t.Run(tc.zone, func(t *testing.T) {
			c := testCalendar(t, tc.zone, from, to)
			data, err := Marshal(c, Options{Version: "test"})
			if err != nil {
				t.Fatal(err)
			}
			verify(t, c, data)
			hasTZ := bytes.Contains(data, []byte("BEGIN:VTIMEZONE"))
			if hasTZ == (tc.zone == "UTC") {
				t.Errorf("VTIMEZONE present = %v", hasTZ)
			}
		})
	}
}

func TestEncodeUTCOption(t *testing.T) {
	c := testCalendar(t, "Europe/Vienna", utc(2026, 3, 1, 0, 0, 0), utc(2026, 11, 30, 0, 0, 0))
	c.UTC = true
	data, err := Marshal(c, Options{})
	if err != nil {
		t.Fatal(err)
	}
	verify(t, c, data)
	if bytes.Contains(data, []byte("TZID")) || bytes.Contains(data, []byte("VTIMEZONE")) {
		t.Error("UTC calendar has a TZID or VTIMEZONE")
	}
	if bytes.Contains(data, []byte("X-WR-TIMEZONE")) {
		t.Error("X-WR-TIMEZONE written: every time carries its own zone")
	}
	cal, _ := parseStrict(data)
	for _, ev := range cal.children("VEVENT") {
		for _, n := range []string{"DTSTART", "DTEND"} {
			p := ev.get(n)
			if p.param("VALUE") != "DATE" && !strings.HasSuffix(p.Value, "Z") {
				t.Errorf("%s %s is not UTC", n, p.Value)
			}
		}
	}
}

// Published clock-change rules, from memory; Go's tz database agrees.
func TestObservancesPublished(t *testing.T) {
	type change struct {
		dtstart  string // observance DTSTART: local time in the old offset
		from, to string
		name     string
		daylight bool
	}
	cases := []struct {
		zone, source string
		from, to     time.Time
		want         []change // after the initial observance
		initial      change
	}{
		{"Europe/Vienna", "EU Directive 2000/84/EC: last Sunday of March and October, 01:00 UTC",
			utc(2026, 1, 15, 0, 0, 0), utc(2026, 12, 15, 0, 0, 0),
			[]change{{"20260329T020000", "+0100", "+0200", "CEST", true}, {"20261025T030000", "+0200", "+0100", "CET", false}},
			change{"", "+0100", "+0100", "CET", false}},
		{"America/New_York", "US Energy Policy Act of 2005: second Sunday of March, first Sunday of November, 02:00 local",
			utc(2026, 1, 15, 0, 0, 0), utc(2026, 12, 15, 0, 0, 0),
			[]change{{"20260308T020000", "-0500", "-0400", "EDT", true}, {"20261101T020000", "-0400", "-0500", "EST", false}},
			change{"", "-0500", "-0500", "EST", false}},
		{"Australia/Sydney", "NSW: DST ends first Sunday of April 03:00, starts first Sunday of October 02:00",
			utc(2026, 1, 15, 0, 0, 0), utc(2026, 12, 15, 0, 0, 0),
			[]change{{"20260405T030000", "+1100", "+1000", "AEST", false}, {"20261004T020000", "+1000", "+1100", "AEDT", true}},
			change{"", "+1100", "+1100", "AEDT", true}},
		{"Australia/Adelaide", "South Australia: same dates as NSW, UTC+09:30 / +10:30",
			utc(2026, 1, 15, 0, 0, 0), utc(2026, 12, 15, 0, 0, 0),
			[]change{{"20260405T030000", "+1030", "+0930", "ACST", false}, {"20261004T020000", "+0930", "+1030", "ACDT", true}},
			change{"", "+1030", "+1030", "ACDT", true}},
		{"Pacific/Chatham", "New Zealand: DST ends first Sunday of April, starts last Sunday of September; Chatham 45 min ahead",
			utc(2026, 1, 15, 0, 0, 0), utc(2026, 12, 15, 0, 0, 0),
			[]change{{"20260405T034500", "+1345", "+1245", "+1245", false}, {"20260927T024500", "+1245", "+1345", "+1345", true}},
			change{"", "+1345", "+1345", "+1345", true}},
		{"Europe/Dublin", "Ireland: GMT in winter, IST (UTC+1) in summer, EU dates; the tz database's negative DST is written the conventional way",
			utc(2026, 1, 15, 0, 0, 0), utc(2026, 12, 15, 0, 0, 0),
			[]change{{"20260329T010000", "+0000", "+0100", "IST", true}, {"20261025T020000", "+0100", "+0000", "GMT", false}},
			change{"", "+0000", "+0000", "GMT", false}},
		{"Europe/Dublin", "Ireland, window in summer only: the initial observance is daylight time",
			utc(2026, 5, 15, 0, 0, 0), utc(2026, 8, 15, 0, 0, 0), nil,
			change{"", "+0100", "+0100", "IST", true}},
		{"Pacific/Apia", "zdump -v Pacific/Apia: −10 daylight time (isdst=1) from 24 September 2011, +14 (isdst=1) from 00:00 on 31 December, 24:00 on the 29th −10, then +13 (isdst=0) from 03:00 on 1 April 2012",
			utc(2011, 11, 1, 0, 0, 0), utc(2012, 5, 31, 0, 0, 0),
			[]change{{"20111230T000000", "-1000", "+1400", "+14", true}, {"20120401T040000", "+1400", "+1300", "+13", false}},
			change{"", "-1000", "-1000", "-10", true}},
		// The tz database's other jumps across the date line are between
		// standard times (zdump -v, isdst=0 on both sides), forward over a
		// date and back to show one twice: neither side is daylight time.
		{"Pacific/Kiritimati", "zdump -v Pacific/Kiritimati: −10 (isdst=0) to 23:59:59 on 30 December 1994, +14 (isdst=0) from 00:00 on 1 January 1995",
			utc(1994, 12, 21, 0, 0, 0), utc(1995, 1, 10, 0, 0, 0),
			[]change{{"19941231T000000", "-1000", "+1400", "+14", false}},
			change{"", "-1000", "-1000", "-10", false}},
		{"Pacific/Kanton", "zdump -v Pacific/Kanton: −11 (isdst=0) to 23:59:59 on 30 December 1994, +13 (isdst=0) from 00:00 on 1 January 1995",
			utc(1994, 12, 21, 0, 0, 0), utc(1995, 1, 10, 0, 0, 0),
			[]change{{"19941231T000000", "-1100", "+1300", "+13", false}},
			change{"", "-1100", "-1100", "-11", false}},
		{"Pacific/Kwajalein", "zdump -v Pacific/Kwajalein: −12 (isdst=0) to 23:59:59 on 20 August 1993, +12 (isdst=0) from 00:00 on 22 August",
			utc(1993, 8, 11, 0, 0, 0), utc(1993, 8, 31, 0, 0, 0),
			[]change{{"19930821T000000", "-1200", "+1200", "+12", false}},
			change{"", "-1200", "-1200", "-12", false}},
		{"Pacific/Fakaofo", "zdump -v Pacific/Fakaofo: −11 (isdst=0) to 23:59:59 on 29 December 2011, +13 (isdst=0) from 00:00 on 31 December",
			utc(2011, 12, 20, 0, 0, 0), utc(2012, 1, 9, 0, 0, 0),
			[]change{{"20111230T000000", "-1100", "+1300", "+13", false}},
			change{"", "-1100", "-1100", "-11", false}},
		{"Asia/Manila", "zdump -v Asia/Manila: LMT −15:56:08 (isdst=0) to 23:59:59 on 30 December 1844, LMT +08:03:52 (isdst=0) from 00:00 on 1 January 1845",
			utc(1844, 12, 21, 0, 0, 0), utc(1845, 1, 10, 0, 0, 0),
			[]change{{"18441231T000000", "-155608", "+080352", "LMT", false}},
			change{"", "-155608", "-155608", "LMT", false}},
		{"America/Anchorage", "zdump -v America/Anchorage: LMT +14:00:24 (isdst=0) to 14:31:36 on 19 October 1867, LMT −09:59:36 (isdst=0) from 14:31:37 on 18 October",
			utc(1867, 10, 9, 0, 0, 0), utc(1867, 10, 29, 0, 0, 0),
			[]change{{"18671019T143137", "+140024", "-095936", "LMT", false}},
			change{"", "+140024", "+140024", "LMT", false}},
		{"Pacific/Apia", "zdump -v Pacific/Apia: LMT +12:33:04 (isdst=0) to 23:59:59 on 4 July 1892, LMT −11:26:56 (isdst=0) from 00:00 on 4 July",
			utc(1892, 6, 24, 0, 0, 0), utc(1892, 7, 14, 0, 0, 0),
			[]change{{"18920705T000000", "+123304", "-112656", "LMT", false}},
			change{"", "+123304", "+123304", "LMT", false}},
		{"Pacific/Kwajalein", "zdump -v Pacific/Kwajalein: +11 (isdst=0) to 23:59:59 on 30 September 1969, −12 (isdst=0) from 01:00 on 30 September",
			utc(1969, 9, 20, 0, 0, 0), utc(1969, 10, 10, 0, 0, 0),
			[]change{{"19691001T000000", "+1100", "-1200", "-12", false}},
			change{"", "+1100", "+1100", "+11", false}},
		{"Asia/Kolkata", "India: UTC+05:30 all year, no DST",
			utc(2026, 1, 15, 0, 0, 0), utc(2026, 12, 15, 0, 0, 0), nil,
			change{"", "+0530", "+0530", "IST", false}},
		{"Asia/Tokyo", "Japan: UTC+09:00 all year, no DST",
			utc(2026, 1, 15, 0, 0, 0), utc(2026, 12, 15, 0, 0, 0), nil,
			change{"", "+0900", "+0900", "JST", false}},
		{"America/Phoenix", "Arizona: MST all year, no DST",
			utc(2026, 1, 15, 0, 0, 0), utc(2026, 12, 15, 0, 0, 0), nil,
			change{"", "-0700", "-0700", "MST", false}},
	}
	for _, tc := range cases {
		t.Run(tc.zone, func(t *testing.T) {
			loc := mustLoad(t, tc.zone)
			tz := vtimezone(tc.zone, loc, tc.from, tc.to)
			var b strings.Builder
			if err := tz.SerializeTo(&b, &testSerial); err != nil {
				t.Fatal(err)
			}
			cal, probs := parseStrict([]byte("BEGIN:VCALENDAR\r\n" + b.String() + "END:VCALENDAR\r\n"))
			if len(probs) > 0 {
				t.Fatalf("%s: %v", tc.source, probs)
			}
			var got []change
			for _, o := range cal.children("VTIMEZONE")[0].Children {
				got = append(got, change{o.get("DTSTART").Value, o.get("TZOFFSETFROM").Value,
					o.get("TZOFFSETTO").Value, o.get("TZNAME").Value, o.Name == "DAYLIGHT"})
			}
			init := got[0]
			init.dtstart = ""
			if init != tc.initial {
				t.Errorf("%s: initial observance %+v, want %+v", tc.source, init, tc.initial)
			}
			if !slices.Equal(got[1:], tc.want) {
				t.Errorf("%s:\n got %+v\nwant %+v", tc.source, got[1:], tc.want)
			}
		})
	}
}

var testSerial = ics.SerializationConfiguration{MaxLength: 75, PropertyMaxLength: 75, NewLine: "\r\n"}

// TestRepeatedHour: when clocks go back the local hour repeats. RFC 5545
// §3.3.5 reads a repeated local time as the first occurrence, but Go's
// time.Date (so go-ical) picks the second: entries in that hour, either
// occurrence, are written in UTC; the hour before stays local.
func TestRepeatedHour(t *testing.T) {
	loc := mustLoad(t, "Europe/Vienna")
	// Vienna 2026-10-25: at 01:00 UTC, 03:00 CEST becomes 02:00 CET, so
	// 02:30 local is 00:30 UTC (CEST) and again 01:30 UTC (CET).
	before, first, second := utc(2026, 10, 24, 23, 30, 0), utc(2026, 10, 25, 0, 30, 0), utc(2026, 10, 25, 1, 30, 0)
	c := &feed.Calendar{ID: "fallback", Site: feed.Site{ID: "s", Location: loc},
		WindowStart: utc(2026, 10, 1, 0, 0, 0), WindowEnd: utc(2026, 11, 1, 0, 0, 0), Stamp: utc(2026, 10, 1, 0, 0, 0),
		Entries: []feed.Entry{{UID: "before@t", Start: before}, {UID: "first@t", Start: first}, {UID: "second@t", Start: second}}}
	data, err := Marshal(c, Options{})
	if err != nil {
		t.Fatal(err)
	}
	verify(t, c, data)
	for _, want := range []string{
		"DTSTART;TZID=Europe/Vienna:20261025T013000\r\n",
		"DTEND;TZID=Europe/Vienna:20261025T013100\r\n",
		"DTSTART:20261025T003000Z\r\n",
		"DTEND:20261025T003100Z\r\n",
		"DTSTART:20261025T013000Z\r\n",
		"DTEND:20261025T013100Z\r\n",
	} {
		if !bytes.Contains(data, []byte(want)) {
			t.Errorf("missing %q", want)
		}
	}
}
