package ical

import (
	"bytes"
	"fmt"
	"math/rand"
	"strings"
	"testing"
	"time"

	ics "github.com/arran4/golang-ical"

	"heliocal/feed"
)

// This file keeps a reference encoder for the events: each VEVENT is built
// with golang-ical's own setters (NewEvent, SetDtStampTime,
// SetAllDayStartAt, SetSummary, AddAlarm, ...) and serialized by the
// library's per-property serializer, as the package did before it wrote
// events itself. The differential tests below require Marshal's output to be
// byte-identical to it: same properties in the same order, same parameter
// quoting, TEXT escaping, folding (the library's, which prefers to break
// before a space) and CRLF.

// referenceMarshal encodes c like Marshal, with every event replaced by
// referenceEvent's; the calendar header and VTIMEZONE are Marshal's own.
func referenceMarshal(t testing.TB, c *feed.Calendar, opts Options) ([]byte, error) {
	t.Helper()
	cal, err := referenceCalendar(t, c, opts)
	if err != nil {
		return nil, err
	}
	var b bytes.Buffer
	if err := cal.SerializeTo(&b, ics.WithNewLineWindows); err != nil {
		t.Fatal(err)
	}
	return b.Bytes(), nil
}

// referenceCalendar is the calendar referenceMarshal serializes.
func referenceCalendar(t testing.TB, c *feed.Calendar, opts Options) (*ics.Calendar, error) {
	t.Helper()
	cal, _, err := NewEncoder(opts).build(c)
	if err != nil {
		return nil, err
	}
	w := &writer{c: c, stamp: c.Stamp.UTC()}
	if w.geo, err = formatGeo(c.Site.Latitude, c.Site.Longitude); err != nil {
		t.Fatal(err)
	}
	if loc := c.Site.Location; !c.UTC && !isUTC(loc) {
		w.loc, w.tzid = loc, loc.String()
	}
	k := 0
	for i, comp := range cal.Components {
		if _, ok := comp.(*ics.VTimezone); ok {
			continue
		}
		ev, err := referenceEvent(w, &c.Entries[k])
		if err != nil {
			t.Fatalf("reference: entry %d: %v", k, err)
		}
		cal.Components[i] = ev
		k++
	}
	if k != len(c.Entries) {
		t.Fatalf("reference: %d event components for %d entries", k, len(c.Entries))
	}
	return cal, nil
}

// referenceEvent builds the VEVENT of e with the library's setters.
func referenceEvent(w *writer, e *feed.Entry) (*ics.VEvent, error) {
	ev := ics.NewEvent(e.UID)
	ev.SetDtStampTime(w.stamp)
	var extra []ics.Component // pre-formatted lines, see contentLine
	if e.AllDay {
		start := dateOf(e.Start)
		end := start.AddDate(0, 0, 1)
		if !e.End.IsZero() {
			end = dateOf(e.End)
		}
		ev.SetAllDayStartAt(start) // DTSTART;VALUE=DATE
		ev.SetAllDayEndAt(end)     // exclusive DTEND;VALUE=DATE
	} else {
		// to the millisecond, as JSON shows it, then to the second, the
		// rule of every output (feed/round.go), in two steps here
		start := e.Start.UTC().Round(time.Millisecond).Round(time.Second)
		end := e.End.UTC().Round(time.Millisecond).Round(time.Second)
		if !end.After(start) {
			end = start.Add(instantLength)
		}
		extra = append(extra, referenceTime(w, ev, ics.ComponentPropertyDtStart, start)...)
		extra = append(extra, referenceTime(w, ev, ics.ComponentPropertyDtEnd, end)...)
	}
	if s := cleanText(e.Title); s != "" {
		ev.SetSummary(s)
	}
	if d := cleanText(e.Description); d != "" {
		ev.SetDescription(d)
	}
	if l := cleanText(w.c.Site.Name); l != "" {
		ev.SetLocation(l)
	}
	ev.SetProperty(ics.ComponentPropertyGeo, w.geo)
	ev.SetTimeTransparency(ics.TransparencyTransparent)
	ev.AddProperty("X-MICROSOFT-CDO-BUSYSTATUS", "FREE")
	if cats := categories(e.Categories); cats != "" {
		extra = append(extra, &contentLine{line: "CATEGORIES:" + cats})
	}
	ev.Components = append(ev.Components, extra...)
	if alarm := entryAlarm(w.c, e); alarm > 0 && !e.AllDay {
		a := ev.AddAlarm()
		a.SetAction(ics.ActionDisplay)
		desc := cleanText(e.Title)
		if desc == "" {
			desc = "Reminder"
		}
		a.SetProperty(ics.ComponentPropertyDescription, desc)
		a.SetTrigger("-" + formatDuration(alarm))
	}
	return ev, nil
}

// referenceTime sets DTSTART or DTEND at t: UTC when the calendar is UTC or
// the wall clock repeats, else local with TZID, as a pre-formatted line when
// the library would backslash-escape the TZID.
func referenceTime(w *writer, ev *ics.VEvent, prop ics.ComponentProperty, t time.Time) []ics.Component {
	if w.loc == nil || feed.ShownTwice(t.In(w.loc)) {
		ev.SetProperty(prop, t.Format(utcLayout))
		return nil
	}
	local := t.In(w.loc).Format(localLayout)
	if libraryParamSafe(w.tzid) {
		ev.SetProperty(prop, local, ics.WithTZID(w.tzid))
		return nil
	}
	return []ics.Component{&contentLine{line: string(prop) + ";TZID=" + paramValue(w.tzid) + ":" + local}}
}

// sameAsReference fails t unless Marshal and referenceMarshal agree on c:
// both fail, or both give the same bytes.
func sameAsReference(t testing.TB, name string, c *feed.Calendar) {
	t.Helper()
	opts := Options{Version: "diff"}
	got, err := Marshal(c, opts)
	want, werr := referenceMarshal(t, c, opts)
	if (err != nil) != (werr != nil) {
		t.Fatalf("%s: error %v, reference %v", name, err, werr)
	}
	if bytes.Equal(got, want) {
		return
	}
	gl, wl := strings.SplitAfter(string(got), "\r\n"), strings.SplitAfter(string(want), "\r\n")
	for i := range max(len(gl), len(wl)) {
		var g, w string
		if i < len(gl) {
			g = gl[i]
		}
		if i < len(wl) {
			w = wl[i]
		}
		if g != w {
			t.Fatalf("%s: line %d: got %q, reference %q", name, i+1, g, w)
		}
	}
	t.Fatalf("%s: output differs from the reference", name)
}

// TestMarshalMatchesReference: the golden feeds, site-years in several
// zones and modes, every local hour and clock change of a few zones, and
// calendars of random text are encoded byte for byte as the reference does.
func TestMarshalMatchesReference(t *testing.T) {
	for name, c := range goldenCalendars(t) {
		sameAsReference(t, name, c)
	}
	for _, zone := range []string{"Europe/Vienna", "Australia/Adelaide", "America/New_York", "Etc/UTC"} {
		c := siteYear(t, zone)
		sameAsReference(t, zone+" site-year", c)
		c.UTC = true
		sameAsReference(t, zone+" site-year UTC", c)
		c.UTC = false
		c.Alarm, c.Color, c.URL, c.PageURL = 10*time.Minute, "teal", "https://feeds.example.org/k.ics", "https://feeds.example.org/"
		c.Site.Name = ""
		sameAsReference(t, zone+" site-year alarm", c)
	}
	from, to := utc(2026, 1, 1, 0, 0, 0), utc(2027, 1, 1, 0, 0, 0)
	for _, zone := range []string{"Europe/Vienna", "Australia/Lord_Howe", "Europe/Dublin", "Pacific/Chatham"} {
		c := testCalendar(t, zone, from, to)
		sameAsReference(t, zone+" every hour", c)
		c.Alarm = 90 * time.Second
		sameAsReference(t, zone+" every hour, alarm", c)
	}
	for _, zone := range []string{"Site time, west: 5", "Kestrel's time", "Zone<a>b", strings.Repeat("Long zone name ", 6),
		strings.Repeat("Zone; ", 14), strings.Repeat("日", 30)} {
		c := testCalendar(t, "UTC", from, from.AddDate(0, 1, 0))
		c.Site.Location = time.FixedZone(zone, -5*3600)
		c.Alarm = time.Hour
		sameAsReference(t, zone, c)
	}
	r := rand.New(rand.NewSource(3))
	for i := range 300 {
		sameAsReference(t, fmt.Sprintf("random %d", i), randomCalendar(t, r))
	}
}

// TestEventsOtherConfigurations: with other line lengths and line endings
// than Marshal's, the events still serialize as the reference's do.
func TestEventsOtherConfigurations(t *testing.T) {
	r := rand.New(rand.NewSource(4))
	cals := []*feed.Calendar{goldenCalendars(t)["saltbush-moon"]}
	for range 40 {
		cals = append(cals, randomCalendar(t, r))
	}
	configs := [][]any{{}, {ics.WithNewLine("\n")}, {ics.WithLineLength(20)},
		{ics.WithLineLength(40), ics.WithNewLineWindows}, {ics.WithLineLength(100), ics.WithNewLine("\r")}}
	for i, c := range cals {
		cal, _, err := NewEncoder(Options{}).build(c)
		if err != nil {
			continue
		}
		ref, err := referenceCalendar(t, c, Options{})
		if err != nil {
			t.Fatal(err)
		}
		// Each configuration twice over, with the same calendar: the
		// events' shared lines follow the configuration.
		for _, ops := range append(configs, configs...) {
			var got, want bytes.Buffer
			if err := cal.SerializeTo(&got, ops...); err != nil {
				t.Fatal(err)
			}
			if err := ref.SerializeTo(&want, ops...); err != nil {
				t.Fatal(err)
			}
			if !bytes.Equal(got.Bytes(), want.Bytes()) {
				t.Fatalf("%v, calendar %d:\n%q\nreference:\n%q", ops, i, got.String(), want.String())
			}
		}
	}
}

// TestValidCut: on valid UTF-8 the fast cut is the library's, for random
// texts and every line length from 5 to 100 octets.
func TestValidCut(t *testing.T) {
	r := rand.New(rand.NewSource(5))
	for range 20000 {
		s := []byte(strings.ToValidUTF8(randomText(r)+randomText(r)+randomText(r), "\uFFFD"))
		for max := 5; max < min(len(s), 100); max++ {
			if got, want := validCut(max, s), libraryCut(max, s); got != want {
				t.Fatalf("max %d, %q: cut %d, library %d", max, s, got, want)
			}
		}
	}
}

// textPieces build random texts: plain words, the characters TEXT escapes,
// folding boundaries the library looks for (space, "<", ">"), controls,
// CR and CRLF, multi-byte and invalid UTF-8.
var textPieces = []string{"a", "Sunrise", " ", "  ", ",", ";", "\\", ":", "\"", "'", "<", ">", "<b>", "\t", "\n",
	"\r", "\r\n", "\x00", "\x1f", "\x7f", "é", "\u0085", "\u00a0", "\u2028", "日", "🌅", "\uFFFD", "\xff", "\xc3",
	"\xe6\x97", "\xed\xa0\x80", strings.Repeat("x", 40), strings.Repeat("日本", 20), strings.Repeat("word ", 12)}

func randomText(r *rand.Rand) string {
	var b strings.Builder
	for n := r.Intn(12); n > 0; n-- {
		b.WriteString(textPieces[r.Intn(len(textPieces))])
	}
	return b.String()
}

// randomCalendar is a small calendar of random texts, zones, modes and
// entries (timed, instants, all-day, in a repeated hour).
func randomCalendar(t testing.TB, r *rand.Rand) *feed.Calendar {
	zones := []*time.Location{mustLoad(t, "Europe/Vienna"), mustLoad(t, "Australia/Adelaide"), time.UTC,
		time.FixedZone("Site time, west: 5", -5*3600), time.FixedZone(strings.Repeat("Far zone ", 9), 3600)}
	from := utc(2026, 1, 1, 0, 0, 0)
	c := &feed.Calendar{ID: "random", Title: randomText(r), Description: randomText(r),
		Site: feed.Site{ID: "s", Name: randomText(r), Latitude: r.Float64()*180 - 90, Longitude: r.Float64()*360 - 180,
			Location: zones[r.Intn(len(zones))]},
		UTC: r.Intn(4) == 0, WindowStart: from, WindowEnd: from.AddDate(1, 0, 0), Stamp: from}
	if r.Intn(2) == 0 {
		c.Alarm = time.Duration(r.Intn(7200)) * time.Second
	}
	for i := r.Intn(8); i >= 0; i-- {
		e := feed.Entry{UID: fmt.Sprintf("%d-%s", i, randomText(r)), Title: randomText(r), Description: randomText(r)}
		for j := r.Intn(4); j > 0; j-- {
			e.Categories = append(e.Categories, randomText(r))
		}
		switch r.Intn(4) {
		case 0:
			e.AllDay = true
			e.Start = from.AddDate(0, 0, r.Intn(365))
			if r.Intn(2) == 0 {
				e.End = e.Start.AddDate(0, 0, 1+r.Intn(3))
			}
		case 1: // the repeated hour in Vienna and Adelaide
			e.Start = []time.Time{utc(2026, 10, 25, 0, 30, 0), utc(2026, 10, 25, 1, 30, 0),
				utc(2026, 4, 4, 16, 0, 0), utc(2026, 4, 4, 17, 0, 0)}[r.Intn(4)]
			e.End = e.Start.Add(time.Duration(r.Intn(3)) * 30 * time.Minute)
		default:
			e.Start = from.Add(time.Duration(r.Int63n(int64(365 * 24 * time.Hour))))
			if r.Intn(2) == 0 {
				e.End = e.Start.Add(time.Duration(r.Int63n(int64(3 * time.Hour))))
			}
		}
		c.Entries = append(c.Entries, e)
	}
	return c
}

// FuzzMarshalMatchesReference: whatever the texts, UID and zone name, Marshal
// writes the reference's bytes (or both reject the calendar).
func FuzzMarshalMatchesReference(f *testing.F) {
	for _, s := range [][5]string{
		{"Sunrise", "Upper limb; refraction 34'", "Sun", "sunrise-2026-03-29@heliocal", "Europe/Vienna"},
		{"a,b;c\\d", "line\r\nline\rline\nend", "Dawn, civil", "x\xff,y;z", "Site time, west: 5"},
		{"🌅🌄🌇" + string(make([]byte, 3)), "\x00\x1b\x7f\u0085\u2028", ";,\\", "<uid>" + strings.Repeat(" ", 80), "Kestrel's time"},
		{"\xff\xfe invalid", "é" + strings.Repeat("日", 40), "\t", strings.Repeat("é", 50), strings.Repeat("Long zone ", 9)},
		{strings.Repeat("word ", 30), strings.Repeat("<a>b", 40), strings.Repeat("x", 80), "u", ""},
	} {
		f.Add(s[0], s[1], s[2], s[3], s[4])
	}
	vienna := mustLoad(f, "Europe/Vienna")
	f.Fuzz(func(t *testing.T, summary, description, category, uid, zone string) {
		loc := vienna
		if zone != "Europe/Vienna" {
			loc = time.FixedZone(zone, 3600)
		}
		c := &feed.Calendar{ID: "fuzz", Title: summary, Description: description,
			Site:        feed.Site{ID: "s", Name: category, Latitude: 48.2, Longitude: 16.4, Location: loc},
			WindowStart: utc(2026, 10, 1, 0, 0, 0), WindowEnd: utc(2026, 11, 1, 0, 0, 0), Stamp: utc(2026, 10, 1, 0, 0, 0),
			Entries: []feed.Entry{
				{UID: uid + "1", Title: summary, Description: description, Categories: []string{category, "Sun", summary},
					Start: utc(2026, 10, 25, 0, 30, 0), End: utc(2026, 10, 25, 1, 30, 0)},
				{UID: uid + "2", Title: description, Description: summary, Categories: []string{description},
					Start: utc(2026, 10, 25, 1, 30, 0)},
				{UID: uid + "3", Title: category, AllDay: true, Start: utc(2026, 10, 26, 0, 0, 0)},
			},
			Alarm: time.Minute,
		}
		sameAsReference(t, "fuzz", c)
	})
}
