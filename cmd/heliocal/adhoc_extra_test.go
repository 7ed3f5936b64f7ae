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
	build := adhocFeedBytes(newLayout(""), 24*time.Hour)
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
	build := adhocFeedBytes(newLayout(""), 24*time.Hour)
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

// An ad-hoc skyline is the site's skyline: a skyline of 5° in every
// direction gives the sunrise of a 5° horizon (to the second: both are
// the upper limb at 5° with the refraction of that altitude), and the
// feed's sunrise behind a stepped skyline is the one `heliocal events
// --horizon` gives for the same points, later than behind 5° all round
// when the eastern hills are higher (the Sun rises in the east-north-east
// at 33° S in June: common practice).
func TestAdhocSkylineFeed(t *testing.T) {
	build := adhocFeedBytes(newLayout(""), 24*time.Hour)
	base := serve.AdhocQuery{Latitude: -33.45, Longitude: -70.66, Location: mustZone(t, "America/Santiago"),
		Kinds: []string{"sunrise"}, Start: time.Date(2026, 6, 1, 0, 0, 0, 0, time.UTC), Days: 3}
	run := func(q serve.AdhocQuery) time.Time {
		t.Helper()
		data, err := build(context.Background(), q, nil)
		if err != nil {
			t.Fatal(err)
		}
		return firstStart(t, data)
	}
	hills := base
	hills.Horizon = 5
	round := base
	round.Skyline = [][2]float64{{0, 5}, {120, 5}, {240, 5}}
	if a, b := run(hills), run(round); !a.Equal(b) {
		t.Errorf("sunrise behind a 5° skyline all round %s, behind a 5° horizon %s", b, a)
	}
	stepped := base
	stepped.Skyline = [][2]float64{{0, 2}, {60, 12}, {120, 8}, {240, 1}}
	got := run(stepped)
	code, out, errOut := runCLI(t, "events", "--lat", "-33.45", "--lon", "-70.66", "--tz", "America/Santiago",
		"--horizon", "0:2,60:12,120:8,240:1", "--kinds", "sunrise", "--from", "2026-06-01", "--to", "2026-06-01", "--format", "csv")
	if code != 0 {
		t.Fatalf("heliocal events: exit %d: %s", code, errOut)
	}
	if want := got.Format("2006-01-02T15:04:05"); !strings.Contains(out, want) {
		t.Errorf("the ad-hoc feed's sunrise behind the skyline %s is not the one of heliocal events:\n%s", want, out)
	}
	if d := got.Sub(run(round)); d < 5*time.Minute {
		t.Errorf("sunrise behind 12° in the east-north-east only %v after the one behind 5°", d)
	}
}
