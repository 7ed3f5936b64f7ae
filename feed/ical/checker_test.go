package ical

import (
	"strings"
	"testing"
	"time"
)

// TestCheckerCatches feeds the strict checker files that break one rule each,
// so a clean result elsewhere means something.
func TestCheckerCatches(t *testing.T) {
	const head = "BEGIN:VCALENDAR\r\nVERSION:2.0\r\nPRODID:-//t//t//EN\r\n"
	const tz = "BEGIN:VTIMEZONE\r\nTZID:Europe/Vienna\r\nBEGIN:STANDARD\r\nDTSTART:20260101T000000\r\n" +
		"TZOFFSETFROM:+0100\r\nTZOFFSETTO:+0100\r\nEND:STANDARD\r\nEND:VTIMEZONE\r\n"
	ev := func(props ...string) string {
		return "BEGIN:VEVENT\r\nUID:a@t\r\nDTSTAMP:20260101T000000Z\r\n" + strings.Join(props, "\r\n") + "\r\nEND:VEVENT\r\n"
	}
	const end = "END:VCALENDAR\r\n"
	good := head + tz + ev("DTSTART;TZID=Europe/Vienna:20260301T060000", "DTEND;TZID=Europe/Vienna:20260301T060100") + end
	if p := checkStrict([]byte(good)); len(p) > 0 {
		t.Fatalf("good file rejected: %v", p)
	}
	for _, tc := range []struct {
		name, data, want string
	}{
		{"LF", strings.ReplaceAll(good, "\r\n", "\n"), "bare CR or LF"},
		{"BOM", "\xef\xbb\xbf" + good, "byte order mark"},
		{"after END", good + "X", "does not end with END:VCALENDAR"},
		{"long line", head + ev("DTSTART:20260301T060000Z", "SUMMARY:"+strings.Repeat("x", 70)) + end, "more than 75"},
		{"split UTF-8", head + ev("DTSTART:20260301T060000Z", "SUMMARY:"+strings.Repeat("x", 66)+"\xf0\x9f\r\n \x8c\x85") + end,
			"splits a UTF-8 sequence"},
		{"bare CR", head + ev("DTSTART:20260301T060000Z", "SUMMARY:a\rb") + end, "bare CR"},
		{"no VTIMEZONE", head + ev("DTSTART;TZID=Europe/Vienna:20260301T060000") + end, "has no VTIMEZONE"},
		{"empty VTIMEZONE", head + "BEGIN:VTIMEZONE\r\nTZID:Europe/Vienna\r\nEND:VTIMEZONE\r\n" + ev("DTSTART:20260301T060000Z") + end,
			"no STANDARD or DAYLIGHT"},
		{"Z with TZID", head + tz + ev("DTSTART;TZID=Europe/Vienna:20260301T060000Z") + end, "UTC value"},
		{"floating", head + ev("DTSTART:20260301T060000") + end, "floating"},
		{"bare date", head + ev("DTSTART:20260301") + end, "needs VALUE=DATE"},
		{"end before start", head + ev("DTSTART:20260301T060000Z", "DTEND:20260301T050000Z") + end, "not after DTSTART"},
		{"mixed types", head + ev("DTSTART;VALUE=DATE:20260301", "DTEND:20260302T000000Z") + end, "different value types"},
		{"duplicate UID", head + ev("DTSTART:20260301T060000Z") + ev("DTSTART:20260301T060000Z") + end, "duplicate UID"},
		{"no DTSTAMP", head + "BEGIN:VEVENT\r\nUID:b@t\r\nDTSTART:20260301T060000Z\r\nEND:VEVENT\r\n" + end, "0 DTSTAMP"},
		{"two SUMMARY", head + ev("DTSTART:20260301T060000Z", "SUMMARY:a", "SUMMARY:b") + end, "2 SUMMARY"},
		{"escaped param", head + tz + ev(`DTSTART;TZID=Europe\/Vienna:20260301T060000Z`) + end, "backslash"},
		{"escaped URI", head + "URL:https://example.org/a\\;b\r\n" + end, "is escaped"},
		{"unescaped comma", head + ev("DTSTART:20260301T060000Z", "SUMMARY:a,b") + end, "unescaped ','"},
		{"bad escape", head + ev("DTSTART:20260301T060000Z", `SUMMARY:a\:b`) + end, `invalid escape \:`},
		{"GEO exponent", head + ev("DTSTART:20260301T060000Z", "GEO:5e-05;1") + end, "plain decimals"},
		{"library PRODID", "BEGIN:VCALENDAR\r\nVERSION:2.0\r\nPRODID:-//arran4//Golang ICS Library\r\n" + end, "library default PRODID"},
		{"METHOD", head + "METHOD:REQUEST\r\n" + end, "METHOD"},
		{"REFRESH-INTERVAL", head + "REFRESH-INTERVAL:PT12H\r\n" + end, "without VALUE=DURATION"},
		{"duration", head + "REFRESH-INTERVAL;VALUE=DURATION:PT1H5S\r\n" + end, "not a DURATION"},
		{"colour", head + "COLOR:#ff8800\r\n" + end, "not a CSS3"},
		{"alarm", head + ev("DTSTART:20260301T060000Z", "BEGIN:VALARM\r\nACTION:DISPLAY\r\nTRIGGER:-PT15M\r\nEND:VALARM") + end,
			"VALARM has 0 DESCRIPTION"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			probs := checkStrict([]byte(tc.data))
			if !strings.Contains(strings.Join(probs, "\n"), tc.want) {
				t.Errorf("want a problem containing %q, got %q", tc.want, probs)
			}
		})
	}
}

// TestZoneCheckCatches: the VTIMEZONE-vs-tz-database comparison fails for a
// VTIMEZONE of the wrong zone.
func TestZoneCheckCatches(t *testing.T) {
	from, to := utc(2026, 1, 1, 0, 0, 0), utc(2026, 12, 31, 0, 0, 0)
	z := &vzone{}
	for _, o := range observances(mustLoad(t, "Europe/Vienna"), from.Add(-48*time.Hour*24), to.Add(48*time.Hour*24)) {
		z.obs = append(z.obs, vobs{onset: o.Start, from: o.From, to: o.To, name: o.Name})
	}
	if probs := zoneProblems(z, mustLoad(t, "Europe/London"), from, to); len(probs) == 0 {
		t.Error("Vienna's VTIMEZONE passed as London's")
	}
	if probs := zoneProblems(z, mustLoad(t, "Europe/Vienna"), from, to); len(probs) != 0 {
		t.Errorf("Vienna's VTIMEZONE failed as Vienna's: %v", probs[0])
	}
}
