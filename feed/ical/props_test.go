package ical

import (
	"bytes"
	"math"
	"strings"
	"testing"
	"time"
	"unicode/utf8"

	"heliocal/feed"
)

// TestCalendarHeader checks the calendar properties and their fixed order
// (RFC 5545 §3.7, RFC 7986 §5, and the X-WR-* names clients read).
func TestCalendarHeader(t *testing.T) {
	c := smallCalendar(t, "Europe/Vienna")
	c.Title = "Kestrelbrook Orchard: sun, twilight"
	c.Description = "Sunrise; sunset\nand twilight"
	c.Color = "DarkOrange"
	c.URL = "https://feeds.example.org/kestrel-sun.ics"
	c.PageURL = "https://feeds.example.org/"
	c.Refresh = 12 * time.Hour
	data := mustMarshal(t, c, Options{Version: "0.9.0"})
	header, _, _ := strings.Cut(string(data), "BEGIN:VTIMEZONE")
	want := strings.Join([]string{
		"BEGIN:VCALENDAR",
		"VERSION:2.0",
		"PRODID:-//heliocal//heliocal 0.9.0//EN",
		"CALSCALE:GREGORIAN",
		`NAME:Kestrelbrook Orchard: sun\, twilight`,
		`X-WR-CALNAME:Kestrelbrook Orchard: sun\, twilight`,
		`DESCRIPTION:Sunrise\; sunset\nand twilight`,
		`X-WR-CALDESC:Sunrise\; sunset\nand twilight`,
		"REFRESH-INTERVAL;VALUE=DURATION:PT12H",
		"X-PUBLISHED-TTL:PT12H",
		"COLOR:darkorange",
		"SOURCE;VALUE=URI:https://feeds.example.org/kestrel-sun.ics",
		"URL:https://feeds.example.org/",
		"LAST-MODIFIED:20260601T000000Z",
		"",
	}, "\r\n")
	if header != want {
		t.Errorf("header:\n%s\nwant:\n%s", header, want)
	}

	// Optional properties are left out when unset.
	c.Color, c.URL, c.PageURL, c.Refresh = "", "", "", 0
	data = mustMarshal(t, c, Options{})
	for _, absent := range []string{"COLOR", "SOURCE", "URL:", "REFRESH-INTERVAL", "X-PUBLISHED-TTL"} {
		if bytes.Contains(data, []byte("\r\n"+absent)) {
			t.Errorf("%s written although unset", absent)
		}
	}
}

// TestEventProperties checks one timed instant, one span and one all-day
// entry property by property.
func TestEventProperties(t *testing.T) {
	c := smallCalendar(t, "Europe/Vienna")
	c.Entries = []feed.Entry{
		{UID: "sunrise@t", Title: "Sunrise", Description: "Upper limb", Categories: []string{"Sun", "Sunrise"},
			Start: utc(2026, 6, 21, 2, 54, 10)},
		{UID: "golden@t", Title: "Golden hour", Start: utc(2026, 6, 21, 18, 10, 0), End: utc(2026, 6, 21, 19, 0, 0)},
		{UID: "solstice@t", Title: "June solstice", AllDay: true, Start: utc(2026, 6, 21, 0, 0, 0)},
		{UID: "long@t", Title: "Midnight sun", AllDay: true, Start: utc(2026, 6, 20, 0, 0, 0), End: utc(2026, 6, 24, 0, 0, 0)},
	}
	data := mustMarshal(t, c, Options{})
	verify(t, c, data)
	_, body, _ := strings.Cut(string(data), "END:VTIMEZONE\r\n")
	want := strings.Join([]string{
		"BEGIN:VEVENT",
		"UID:sunrise@t",
		"DTSTAMP:20260601T000000Z",
		"DTSTART;TZID=Europe/Vienna:20260621T045410",
		"DTEND;TZID=Europe/Vienna:20260621T045510", // instant: one minute
		"SUMMARY:Sunrise",
		"DESCRIPTION:Upper limb",
		"LOCATION:Kestrelbrook Orchard",
		"GEO:48.25;16.35",
		"TRANSP:TRANSPARENT",
		"X-MICROSOFT-CDO-BUSYSTATUS:FREE",
		"CATEGORIES:Sun,Sunrise",
		"END:VEVENT",
		"BEGIN:VEVENT",
		"UID:golden@t",
		"DTSTAMP:20260601T000000Z",
		"DTSTART;TZID=Europe/Vienna:20260621T201000",
		"DTEND;TZID=Europe/Vienna:20260621T210000",
		"SUMMARY:Golden hour",
		"LOCATION:Kestrelbrook Orchard",
		"GEO:48.25;16.35",
		"TRANSP:TRANSPARENT",
		"X-MICROSOFT-CDO-BUSYSTATUS:FREE",
		"END:VEVENT",
		"BEGIN:VEVENT",
		"UID:solstice@t",
		"DTSTAMP:20260601T000000Z",
		"DTSTART;VALUE=DATE:20260621",
		"DTEND;VALUE=DATE:20260622", // exclusive
		"SUMMARY:June solstice",
		"LOCATION:Kestrelbrook Orchard",
		"GEO:48.25;16.35",
		"TRANSP:TRANSPARENT",
		"X-MICROSOFT-CDO-BUSYSTATUS:FREE",
		"END:VEVENT",
		"BEGIN:VEVENT",
		"UID:long@t",
		"DTSTAMP:20260601T000000Z",
		"DTSTART;VALUE=DATE:20260620",
		"DTEND;VALUE=DATE:20260624",
		"SUMMARY:Midnight sun",
		"LOCATION:Kestrelbrook Orchard",
		"GEO:48.25;16.35",
		"TRANSP:TRANSPARENT",
		"X-MICROSOFT-CDO-BUSYSTATUS:FREE",
		"END:VEVENT",
		"END:VCALENDAR",
		"",
	}, "\r\n")
	if body != want {
		t.Errorf("events:\n%s\nwant:\n%s", body, want)
	}
	if bytes.Contains(data, []byte("VALARM")) {
		t.Error("VALARM without Calendar.Alarm")
	}
}

func TestAlarm(t *testing.T) {
	c := smallCalendar(t, "Europe/Vienna")
	c.Alarm = 15 * time.Minute
	data := mustMarshal(t, c, Options{})
	verify(t, c, data)
	cal, _ := parseStrict(data)
	for _, ev := range cal.children("VEVENT") {
		alarms := ev.children("VALARM")
		allDay := ev.get("DTSTART").param("VALUE") == "DATE"
		if allDay && len(alarms) != 0 {
			t.Errorf("%s: alarm on an all-day entry", ev.get("UID").Value)
		}
		if !allDay {
			if len(alarms) != 1 {
				t.Fatalf("%s: %d alarms", ev.get("UID").Value, len(alarms))
			}
			a := alarms[0]
			if a.get("ACTION").Value != "DISPLAY" || a.get("TRIGGER").Value != "-PT15M" || a.get("DESCRIPTION").Value != "Sunrise" {
				t.Errorf("alarm %+v", a.Props)
			}
		}
	}
}

func TestDeterministic(t *testing.T) {
	c := testCalendar(t, "Australia/Adelaide", utc(2026, 1, 1, 0, 0, 0), utc(2026, 12, 31, 0, 0, 0))
	c.Alarm = 10 * time.Minute
	a := mustMarshal(t, c, Options{Version: "1"})
	for i := 0; i < 3; i++ {
		if b := mustMarshal(t, c, Options{Version: "1"}); !bytes.Equal(a, b) {
			t.Fatal("two encodings differ")
		}
	}
	var w bytes.Buffer
	if err := Encode(&w, c, Options{Version: "1"}); err != nil || !bytes.Equal(w.Bytes(), a) {
		t.Errorf("Encode differs from Marshal (%v)", err)
	}
}

func TestBadInput(t *testing.T) {
	cases := []struct {
		name string
		edit func(c *feed.Calendar)
		want string
	}{
		{"nil zone", func(c *feed.Calendar) { c.Site.Location = nil }, `site "kestrel" has no time zone`},
		{"zero stamp", func(c *feed.Calendar) { c.Stamp = time.Time{} }, "Stamp is zero"},
		{"empty UID", func(c *feed.Calendar) { c.Entries[0].UID = "" }, "entry 0 (sunrise 2026-06-21T02:54:10Z): empty UID"},
		{"duplicate UID", func(c *feed.Calendar) { c.Entries[1].UID = c.Entries[0].UID },
			`entry 1: duplicate UID "sunrise-2026-06-21@t"`},
		{"end before start", func(c *feed.Calendar) { c.Entries[0].End = c.Entries[0].Start.Add(-time.Hour) },
			`entry "sunrise-2026-06-21@t": End 2026-06-21T01:54:10Z is before Start 2026-06-21T02:54:10Z`},
		{"all-day end", func(c *feed.Calendar) { c.Entries[1].End = c.Entries[1].Start },
			`entry "solstice-2026-06-21@t": all-day end 2026-06-21 is not after start 2026-06-21`},
		{"no start", func(c *feed.Calendar) { c.Entries[0].Start = time.Time{} }, "timed entry has no Start"},
		{"colour", func(c *feed.Calendar) { c.Color = "#ff8800" }, `Color "#ff8800" is not a CSS3 colour name`},
		{"relative URL", func(c *feed.Calendar) { c.URL = "feeds/sun.ics" }, `URL "feeds/sun.ics": not an absolute URI`},
		{"page URL space", func(c *feed.Calendar) { c.PageURL = "https://example.org/a b" },
			`PageURL "https://example.org/a b": contains a space`},
		{"latitude", func(c *feed.Calendar) { c.Site.Latitude = 95 }, `site "kestrel": latitude 95 is outside -90..90`},
		{"longitude NaN", func(c *feed.Calendar) { c.Site.Longitude = math.NaN() }, "longitude NaN is outside -180..180"},
		{"refresh", func(c *feed.Calendar) { c.Refresh = -time.Hour }, "Refresh -1h0m0s is negative"},
		{"alarm", func(c *feed.Calendar) { c.Alarm = -time.Minute }, "Alarm -1m0s is negative"},
		{"zone quote", func(c *feed.Calendar) { c.Site.Location = time.FixedZone(`say "hi"`, 0) },
			`time zone name "say \"hi\"" cannot be a TZID parameter`},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			c := smallCalendar(t, "Europe/Vienna")
			tc.edit(c)
			var w bytes.Buffer
			err := Encode(&w, c, Options{})
			if err == nil {
				t.Fatal("no error")
			}
			if !strings.HasPrefix(err.Error(), `ical: calendar "small": `) || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("error %q, want it to contain %q", err, tc.want)
			}
			if w.Len() != 0 {
				t.Error("Encode wrote output for an invalid calendar")
			}
		})
	}
	if _, err := Marshal(nil, Options{}); err == nil {
		t.Error("nil calendar accepted")
	}
}

// TestFormatDuration: RFC 5545 §3.3.6 dur-value; an hour followed by seconds
// needs the minutes in between (dur-hour = 1*DIGIT "H" [dur-minute]).
func TestFormatDuration(t *testing.T) {
	for _, tc := range []struct {
		d    time.Duration
		want string
	}{
		{12 * time.Hour, "PT12H"},
		{15 * time.Minute, "PT15M"},
		{90 * time.Second, "PT1M30S"},
		{time.Hour + 30*time.Second, "PT1H0M30S"},
		{time.Hour + 30*time.Minute, "PT1H30M"},
		{24 * time.Hour, "P1D"},
		{7 * 24 * time.Hour, "P7D"},
		{36 * time.Hour, "P1DT12H"},
		{1500 * time.Millisecond, "PT2S"},
		{0, "PT0S"},
	} {
		got := formatDuration(tc.d)
		if got != tc.want || !durationRE.MatchString(got) {
			t.Errorf("formatDuration(%s) = %q, want %q", tc.d, got, tc.want)
		}
	}
}

// TestFold: at most 75 octets per line, continuation lines start with one
// space, UTF-8 sequences are never split, and unfolding restores the line
// (RFC 5545 §3.1).
func TestFold(t *testing.T) {
	for _, s := range []string{
		"CATEGORIES:" + strings.Repeat("a", 64),
		"CATEGORIES:" + strings.Repeat("a", 65),
		"CATEGORIES:" + strings.Repeat("🌅", 40),
		"CATEGORIES:x" + strings.Repeat("é", 100),
		"CATEGORIES:xy" + strings.Repeat("日", 100),
		"DTSTART;TZID=\"" + strings.Repeat("Zone, ", 20) + "\":20260101T000000",
	} {
		out := fold(s, 75, "\r\n")
		if !strings.HasSuffix(out, "\r\n") {
			t.Errorf("no final CRLF")
		}
		lines := strings.Split(strings.TrimSuffix(out, "\r\n"), "\r\n")
		var un strings.Builder
		for i, l := range lines {
			if len(l) > 75 || !utf8.ValidString(l) {
				t.Errorf("line %d: %d octets, valid %v", i, len(l), utf8.ValidString(l))
			}
			if i > 0 {
				if l[0] != ' ' {
					t.Errorf("continuation %q", l)
				}
				l = l[1:]
			}
			un.WriteString(l)
		}
		if un.String() != s {
			t.Errorf("unfold changed the line")
		}
	}
}

// TestColors: COLOR takes a CSS3 colour keyword (RFC 7986 §5.9); CSS Color
// Module Level 3 §4.3 lists 147 of them (counting grey/gray twins), and
// rebeccapurple came only with Level 4.
func TestColors(t *testing.T) {
	if len(cssColors()) != 147 {
		t.Errorf("%d colour names, want 147", len(cssColors()))
	}
	for n := range cssColorNames {
		if !cssColors()[n] {
			t.Errorf("%s missing", n)
		}
	}
	for color, ok := range map[string]bool{"DarkOrange": true, " tomato ": true, "rebeccapurple": false, "#ff8800": false} {
		c := smallCalendar(t, "Europe/Vienna")
		c.Color = color
		_, err := Marshal(c, Options{})
		if (err == nil) != ok {
			t.Errorf("Color %q: error %v", color, err)
		}
	}
}
