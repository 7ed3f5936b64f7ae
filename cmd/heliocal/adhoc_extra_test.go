package main

import (
	"context"
	"strings"
	"testing"
	"time"

	"heliocal/feed/serve"
)

// The ad-hoc name, alarm and skyline reach the feed: the name in the
// titles, a display alarm before each event (RFC 5545 §3.6.6, TRIGGER
// before the start), and a sunrise later behind a 5° skyline than over a
// flat horizon (the Sun needs time to climb above the hills: common
// practice).
func TestAdhocNameAlarmHorizon(t *testing.T) {
	build := adhocFeed(newLayout(""), 24*time.Hour)
	base := serve.AdhocQuery{Latitude: -33.45, Longitude: -70.66, Location: mustZone(t, "America/Santiago"),
		Kinds: []string{"sunrise"}, Start: time.Date(2026, 6, 1, 0, 0, 0, 0, time.UTC), Days: 3}
	flat, err := build(context.Background(), base, nil)
	if err != nil {
		t.Fatal(err)
	}
	q := base
	q.Name, q.Alarm, q.Horizon = "Quebrada Vineyard", 15*time.Minute, 5
	hills, err := build(context.Background(), q, nil)
	if err != nil {
		t.Fatal(err)
	}
	text := string(hills)
	if !strings.Contains(text, "Quebrada Vineyard") {
		t.Errorf("the name is not in the feed:\n%s", text)
	}
	if !strings.Contains(text, "TRIGGER:-PT15M") {
		t.Errorf("no 15-minute alarm in the feed:\n%s", text)
	}
	if d := firstStart(t, hills).Sub(firstStart(t, flat)); d < 10*time.Minute || d > 60*time.Minute {
		t.Errorf("sunrise behind a 5° skyline %v after the flat-horizon one, want 10..60 minutes", d)
	}
}

// firstStart is the first event's DTSTART, local time.
func firstStart(t *testing.T, data []byte) time.Time {
	t.Helper()
	_, events, _ := strings.Cut(string(data), "BEGIN:VEVENT")
	for line := range strings.SplitSeq(events, "\r\n") {
		if strings.HasPrefix(line, "DTSTART") {
			_, v, _ := strings.Cut(line, ":")
			tm, err := time.Parse("20060102T150405", v)
			if err != nil {
				t.Fatalf("%s: %v", line, err)
			}
			return tm
		}
	}
	t.Fatalf("no DTSTART in\n%s", data)
	return time.Time{}
}

// An ad-hoc offset shifts each event of its kind by exactly that much, as a
// configuration's kinds entry offset does: 30 minutes before sunset is the
// sunset's time less 30 minutes.
func TestAdhocOffset(t *testing.T) {
	build := adhocFeed(newLayout(""), 24*time.Hour)
	base := serve.AdhocQuery{Latitude: -33.45, Longitude: -70.66, Location: mustZone(t, "America/Santiago"),
		Kinds: []string{"sunset"}, Start: time.Date(2026, 6, 1, 0, 0, 0, 0, time.UTC), Days: 3}
	plain, err := build(context.Background(), base, nil)
	if err != nil {
		t.Fatal(err)
	}
	q := base
	q.Offsets = map[string]time.Duration{"sunset": -30 * time.Minute}
	early, err := build(context.Background(), q, nil)
	if err != nil {
		t.Fatal(err)
	}
	if d := firstStart(t, plain).Sub(firstStart(t, early)); d != 30*time.Minute {
		t.Errorf("sunset with offset -30m is %v before the plain one, want 30m", d)
	}
	if string(plain) == string(early) {
		t.Error("the offset changed nothing")
	}
	if !strings.Contains(string(early), "SUMMARY:30 min before sunset") {
		t.Errorf("the title does not say the shift:\n%s", early)
	}
}
