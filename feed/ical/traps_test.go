package ical

// Each known trap of golang-ical v0.3.4 gets a test on heliocal's output, and
// a control that shows the input really triggers the trap in the library used
// naively (so the test keeps meaning something if the library changes: if a
// control fails, the workaround may be removable).

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	ics "github.com/arran4/golang-ical"
	goical "github.com/emersion/go-ical"

	"heliocal/feed"
)

// smallCalendar is a two-entry calendar in zone for focused tests.
func smallCalendar(t testing.TB, zone string) *feed.Calendar {
	t.Helper()
	return &feed.Calendar{
		ID: "small", Title: "Small", Description: "Two entries",
		Site:        feed.Site{ID: "kestrel", Name: "Kestrelbrook Orchard", Latitude: 48.25, Longitude: 16.35, Location: mustLoad(t, zone)},
		WindowStart: utc(2026, 6, 1, 0, 0, 0), WindowEnd: utc(2026, 7, 1, 0, 0, 0), Stamp: utc(2026, 6, 1, 0, 0, 0),
		Entries: []feed.Entry{
			{UID: "sunrise-2026-06-21@t", Kind: "sunrise", Title: "Sunrise", Start: utc(2026, 6, 21, 2, 54, 10)},
			{UID: "solstice-2026-06-21@t", Kind: "solstice", Title: "June solstice", AllDay: true,
				Start: utc(2026, 6, 21, 0, 0, 0), End: utc(2026, 6, 22, 0, 0, 0)},
		},
	}
}

func mustMarshal(t testing.TB, c *feed.Calendar, opts Options) []byte {
	t.Helper()
	data, err := Marshal(c, opts)
	if err != nil {
		t.Fatal(err)
	}
	return data
}

func libraryOutput(build func(cal *ics.Calendar, ev *ics.VEvent)) string {
	cal := ics.NewCalendar()
	ev := cal.AddEvent("control@t")
	build(cal, ev)
	return cal.Serialize()
}

func TestTrapLineEnding(t *testing.T) {
	data := mustMarshal(t, smallCalendar(t, "Europe/Vienna"), Options{})
	if n, crlf := bytes.Count(data, []byte("\n")), bytes.Count(data, []byte("\r\n")); n != crlf || n == 0 {
		t.Errorf("%d LF, of which %d in CRLF", n, crlf)
	}
	if bytes.Count(data, []byte("\r")) != bytes.Count(data, []byte("\r\n")) {
		t.Error("bare CR in output")
	}
	if !bytes.HasPrefix(data, []byte("BEGIN:VCALENDAR\r\n")) || !bytes.HasSuffix(data, []byte("\r\nEND:VCALENDAR\r\n")) {
		t.Error("output must start with BEGIN:VCALENDAR and end right after END:VCALENDAR CRLF (no BOM, nothing after)")
	}
	// Control: the library's default line ending is LF on every OS.
	if out := libraryOutput(func(*ics.Calendar, *ics.VEvent) {}); strings.Contains(out, "\r\n") {
		t.Error("control: library default no longer LF")
	}
}

func TestTrapStartWithTZID(t *testing.T) {
	data := mustMarshal(t, smallCalendar(t, "Europe/Vienna"), Options{})
	// 02:54:10 UTC is 04:54:10 CEST.
	if !bytes.Contains(data, []byte("DTSTART;TZID=Europe/Vienna:20260621T045410\r\n")) {
		t.Errorf("local DTSTART missing:\n%s", data)
	}
	for _, l := range strings.Split(string(data), "\r\n") {
		if strings.Contains(l, "TZID=") && strings.HasSuffix(l, "Z") {
			t.Errorf("UTC value with TZID: %s", l)
		}
	}
	// Control: SetStartAt writes UTC "Z" next to the TZID.
	out := libraryOutput(func(_ *ics.Calendar, ev *ics.VEvent) {
		ev.SetStartAt(utc(2026, 6, 21, 2, 54, 10), ics.WithTZID("Europe/Vienna"))
	})
	if !strings.Contains(out, "DTSTART;TZID=Europe/Vienna:20260621T025410Z") {
		t.Errorf("control: library SetStartAt changed: %s", out)
	}
}

func TestTrapParameterEscaping(t *testing.T) {
	for _, tc := range []struct {
		zone  string
		param string // as it must appear
	}{
		{"Site time, west: 5", `TZID="Site time, west: 5"`},
		{"Kestrel's time", `TZID=Kestrel's time`},
	} {
		t.Run(tc.zone, func(t *testing.T) {
			c := smallCalendar(t, "UTC")
			c.Site.Location = time.FixedZone(tc.zone, -5*3600)
			data := mustMarshal(t, c, Options{})
			probs := checkStrict(data)
			for _, p := range probs {
				t.Errorf("strict: %s", p)
			}
			if want := "DTSTART;" + tc.param + ":20260620T215410\r\n"; !bytes.Contains(data, []byte(want)) {
				t.Errorf("missing %q in\n%s", want, data)
			}
			if _, err := goical.NewDecoder(bytes.NewReader(data)).Decode(); err != nil {
				t.Errorf("go-ical: %v", err)
			}
			// The checker resolves the quoted TZID through the VTIMEZONE.
			cal, _ := parseStrict(data)
			zones := map[string]*vzone{}
			for _, tz := range cal.children("VTIMEZONE") {
				id, _ := unescapeText(tz.get("TZID").Value, false)
				zones[id[0]], _ = parseVZone(tz)
			}
			ev := cal.children("VEVENT")[0]
			if got, err := resolveTime(ev.get("DTSTART"), zones); err != nil || !got.Equal(utc(2026, 6, 21, 2, 54, 10)) {
				t.Errorf("resolved %s, %v", got, err)
			}
		})
	}
	// Control: the library backslash-escapes parameter values.
	out := libraryOutput(func(_ *ics.Calendar, ev *ics.VEvent) {
		ev.SetProperty(ics.ComponentPropertyDtStart, "20260620T215410", ics.WithTZID("Site time, west: 5"))
	})
	if !strings.Contains(out, `TZID=Site time\, west\: 5`) {
		t.Errorf("control: library parameter escaping changed: %s", out)
	}
}

func TestTrapURIEscaping(t *testing.T) {
	c := smallCalendar(t, "Europe/Vienna")
	c.URL = "https://feeds.example.org/v2;site=kestrel/sun,moon.ics"
	c.PageURL = "https://feeds.example.org/?sites=kestrel,heron;view=list"
	data := mustMarshal(t, c, Options{})
	for _, want := range []string{
		"SOURCE;VALUE=URI:https://feeds.example.org/v2;site=kestrel/sun,moon.ics\r\n",
		"URL:https://feeds.example.org/?sites=kestrel,heron;view=list\r\n",
	} {
		if !bytes.Contains(data, []byte(want)) {
			t.Errorf("missing %q", want)
		}
	}
	// Control: an unknown property such as SOURCE is TEXT-escaped.
	out := libraryOutput(func(cal *ics.Calendar, _ *ics.VEvent) {
		cal.CalendarProperties = append(cal.CalendarProperties, ics.CalendarProperty{BaseProperty: ics.BaseProperty{
			IANAToken: "SOURCE", ICalParameters: map[string][]string{}, Value: c.URL}})
	})
	if !strings.Contains(out, `v2\;site=kestrel/sun\,moon`) {
		t.Errorf("control: library SOURCE escaping changed: %s", out)
	}
}

func TestTrapRawCR(t *testing.T) {
	c := smallCalendar(t, "Europe/Vienna")
	c.Entries[0].Description = "Line one\r\nLine two\rLine three\x00\x1b[0m\x7f end\u0085"
	c.Entries[0].Title = "Sunrise\r\n(local)"
	data := mustMarshal(t, c, Options{})
	if !bytes.Contains(data, []byte(`DESCRIPTION:Line one\nLine two\nLine three[0m end`+"\r\n")) {
		t.Errorf("description not normalised:\n%s", data)
	}
	if !bytes.Contains(data, []byte(`SUMMARY:Sunrise\n(local)`+"\r\n")) {
		t.Errorf("summary not normalised:\n%s", data)
	}
	for _, p := range checkStrict(data) {
		t.Errorf("strict: %s", p)
	}
	// Control: the library's TEXT escaping passes CR through.
	out := libraryOutput(func(_ *ics.Calendar, ev *ics.VEvent) { ev.SetDescription("a\r\nb") })
	if !strings.Contains(out, "DESCRIPTION:a\r\\nb") {
		t.Errorf("control: library CR handling changed: %q", out)
	}
}

func TestTrapGeo(t *testing.T) {
	for _, tc := range []struct {
		lat, lon float64
		want     string
	}{
		{0.00005, -0.00005, "GEO:0.00005;-0.00005"},
		{-0.0000001, 0.0000004, "GEO:0;0"},
		{51.4778, -0.0014, "GEO:51.4778;-0.0014"},
		{-33.86881234567, 151.2093, "GEO:-33.868812;151.2093"},
		{90, -180, "GEO:90;-180"},
		{1e-7, 123456.0 / 1e6, "GEO:0;0.123456"},
	} {
		c := smallCalendar(t, "Europe/Vienna")
		c.Site.Latitude, c.Site.Longitude = tc.lat, tc.lon
		data := mustMarshal(t, c, Options{})
		if !bytes.Contains(data, []byte(tc.want+"\r\n")) {
			t.Errorf("lat %v lon %v: want %s", tc.lat, tc.lon, tc.want)
		}
		for _, p := range checkStrict(data) {
			t.Errorf("strict: %s", p)
		}
	}
	// Control: SetGeo with floats uses exponent notation.
	out := libraryOutput(func(_ *ics.Calendar, ev *ics.VEvent) { ev.SetGeo(0.00005, -0.00005) })
	if !strings.Contains(out, "GEO:5e-05;-5e-05") {
		t.Errorf("control: library GEO changed: %s", out)
	}
}

func TestTrapProductID(t *testing.T) {
	data := mustMarshal(t, smallCalendar(t, "Europe/Vienna"), Options{Version: "1.2.3"})
	if !bytes.Contains(data, []byte("\r\nPRODID:-//heliocal//heliocal 1.2.3//EN\r\n")) {
		t.Errorf("PRODID:\n%s", data)
	}
	if bytes.Contains(data, []byte("arran4")) || bytes.Contains(data, []byte("Golang ICS Library")) {
		t.Error("library PRODID leaked")
	}
	if got := (Options{}).ProductID(); got != "-//heliocal//heliocal unversioned//EN" {
		t.Errorf("default ProductID %q", got)
	}
	// Control: NewCalendar stamps the library author's PRODID.
	if out := libraryOutput(func(*ics.Calendar, *ics.VEvent) {}); !strings.Contains(out, "PRODID:-//arran4//Golang ICS Library") {
		t.Errorf("control: library PRODID changed: %s", out)
	}
}

// TestCategories: one CATEGORIES line; commas inside a value are escaped,
// the separators are not (the library would escape both).
func TestCategories(t *testing.T) {
	c := smallCalendar(t, "Europe/Vienna")
	c.Entries[0].Categories = []string{"Sun", "Dawn, dusk; twilight", "", `Back\slash`}
	data := mustMarshal(t, c, Options{})
	if !bytes.Contains(data, []byte(`CATEGORIES:Sun,Dawn\, dusk\; twilight,Back\\slash`+"\r\n")) {
		t.Errorf("CATEGORIES:\n%s", data)
	}
	gcal, err := goical.NewDecoder(bytes.NewReader(data)).Decode()
	if err != nil {
		t.Fatal(err)
	}
	got, err := gcal.Events()[0].Props.Get(goical.PropCategories).TextList()
	if err != nil || strings.Join(got, "|") != `Sun|Dawn, dusk; twilight|Back\slash` {
		t.Errorf("go-ical reads %q, %v", got, err)
	}
	if bytes.Count(data, []byte("CATEGORIES")) != 1 {
		t.Error("want exactly one CATEGORIES line")
	}
	for _, p := range checkStrict(data) {
		t.Errorf("strict: %s", p)
	}
}

// TestNoWallClock: determinism is a property of the source too: nothing in
// the package may read the wall clock.
func TestNoWallClock(t *testing.T) {
	files, _ := filepath.Glob("*.go")
	for _, f := range files {
		if strings.HasSuffix(f, "_test.go") {
			continue
		}
		src, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		for _, bad := range []string{"time.Now", "time.Since", "time.Until", "math/rand"} {
			if bytes.Contains(src, []byte(bad)) {
				t.Errorf("%s uses %s", f, bad)
			}
		}
	}
}
