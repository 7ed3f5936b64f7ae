package ical

import (
	"bytes"
	"context"
	"strings"
	"testing"
	"time"

	goical "github.com/emersion/go-ical"

	"heliocal/config"
	"heliocal/feed"
)

// The feeds the catalogue makes, with the texts it writes (calendar
// descriptions naming each kind's filter, notes for dates without an event,
// lamp periods past midnight, plan descriptions of several lines, plans
// moved out of the hour the clocks skip), encoded and read back: by the
// strict checker, by github.com/emersion/go-ical (times, every text), through
// the file's own VTIMEZONE against the tz database (see verify), and by
// libical when it is installed. The synthetic calendars of the other tests
// hold the encoder's rules; these hold them for the texts users get.

// catalogueConfig has plans, lamp periods, filters and alarms at a site
// whose clocks skip midnight (America/Havana: 00:00 CST becomes 01:00 CDT on
// 14 March 2027, and 01:00 CDT becomes 00:00 CST on 7 November 2027, tz
// database), a polar site (78.2° N: midnight Sun and polar night) and two
// southern ones (America/Santiago, whose clocks also change at midnight, and
// Pacific/Chatham, +12:45/+13:45). Its texts carry the characters TEXT
// escapes (RFC 5545 §3.3.11: backslash, semicolon, comma, newline),
// multi-byte characters and lines long enough to fold.
const catalogueConfig = `
service:
  base_url: "https://sky.example.org/cal;v=1/"
sites:
  - id: havana
    name: 'Finca; El Mirador, Havana \ Cuba'
    latitude: 23.13
    longitude: -82.38
    timezone: America/Havana
  - id: adventdalen
    name: Adventdalen hut, Svalbard 🌅 北極
    latitude: 78.22
    longitude: 15.65
    elevation: 10
    timezone: Arctic/Longyearbyen
  - id: santiago
    name: Viña "La Cumbre", Santiago
    latitude: -33.45
    longitude: -70.66
    elevation: 570
    timezone: America/Santiago
  - id: chatham
    name: Waitangi, Chatham Islands
    latitude: -43.95
    longitude: -176.56
    timezone: Pacific/Chatham
feeds:
  - id: havana-night
    title: 'Havana; nights, dusk & dawn, \backslash\, commas'
    description: |
      Line one; with semicolon, comma \ backslash and a literal \n.
      Line two: 🌅🌇 ünïcödé — Donaudampfschifffahrtsgesellschaftskapitänsmützeñññññ€€€€€€€€€€€€€€€€.
    site: havana
    kinds:
      - sunrise
      - kind: sunset
        weekdays: [fri, sat]
        alarm: 20m
      - kind: astronomical-dusk
        months: [mar, nov]
      - kind: dark-window
        min_duration: 45m
      - daily-summary
      - kind: solar-noon
        dates: [2027-03-13, 2027-03-14, 2027-11-06, 2027-11-07]
      - kind: golden-hour
        label: 'Golden; light, \ here'
        dates: [2027-03-14]
        alarm: 1h0m30s
    plans:
      - title: 'Midnight check; 00:30'
        description: |
          First line of the plan.
          Second line; with a semicolon, and a comma.

          Fourth line after a blank: \backslash\ and 𝄞.
        date: every day
        start: "00:30"
        for: 1h
        months: [mar, nov]
      - title: Night watch, dusk to dawn
        date: every saturday
        start: astronomical-dusk
        end: astronomical-dawn
        alarm: 36h
      - title: Spring date
        date: march-equinox
    days_back: 30
    days_ahead: 300
    color: darkslateblue
    alarm: 10m
  - id: adventdalen-sun
    title: Svalbard — Sun, midnight Sun and polar night
    site: adventdalen
    kinds:
      - sunrise
      - sunset
      - civil-dusk
      - golden-hour
      - daily-summary
      - kind: lighting:16h
        lamps: both
        natural: civil
        latest_off: "22:00"
        alarm: 5m
      - photoperiod:20h
      - kind: sun-altitude:-3
        label: 'Sun at −3°, hut lamps; check, please'
        all_day: true
    plans:
      - title: Midsummer party
        date: saturday nearest june-solstice
        start: "22:00"
        end: "02:00"
      - title: First sunrise party
        date: every friday
        start: sunrise
        for: 2h
    days_back: 30
    days_ahead: 200
  - id: santiago-golden
    title: Santiago — golden hour (UTC)
    site: santiago
    utc: true
    kinds:
      - kind: golden-hour
        weekdays: [sat, sun]
      - kind: sunset
        offset: "+1h"
        label: 'Back home; \ done, an hour after sunset'
    days_ahead: 300
    alarm: 15m
  - id: santiago-night
    title: Santiago — nights and midnight plans
    site: santiago
    kinds: [sunrise, sunset, nautical-dusk, astronomical-dawn]
    plans:
      - title: Midnight mass
        date: every saturday
        start: "00:00"
        for: 30m
    days_ahead: 300
  - id: chatham-year
    title: Chatham — the year and the Moon
    site: chatham
    kinds: [seasons, cross-quarter, perihelion, moon-phases, lunar-eclipse, moonrise]
    plans:
      - title: Anzac dawn
        date: every 04-25
        start: civil-dawn-30m
        for: 90m
    days_ahead: 300
`

// catalogueNow is the day the feeds are computed on: their windows hold
// the clock changes above, a northern spring and a polar summer.
var catalogueNow = time.Date(2027, 2, 20, 12, 0, 0, 0, time.UTC)

// catalogueCalendars computes every feed of cfg as publish does.
func catalogueCalendars(t *testing.T, cfg *config.Config) []*feed.Calendar {
	t.Helper()
	base := cfg.Service.BaseURL
	cat, err := feed.NewCatalogue(cfg, feed.Options{
		Now:     catalogueNow,
		FeedURL: func(id string) string { return base + id + ".ics" },
		PageURL: base,
		Refresh: 24 * time.Hour,
	})
	if err != nil {
		t.Fatal(err)
	}
	cals, err := cat.Calendars(context.Background())
	if err != nil {
		t.Fatal(err)
	}
	return cals
}

// readTexts checks that go-ical reads back every text of c from data as
// the catalogue wrote it (after the normalisation of normText): the
// calendar's name and description under both their names (RFC 7986 §5.1,
// §5.2; X-WR-CALNAME, X-WR-CALDESC), and each event's summary,
// description, location and its alarm's description (RFC 5545 §3.6.6: a
// DISPLAY alarm's text).
func readTexts(t *testing.T, c *feed.Calendar, data []byte) {
	t.Helper()
	gcal, err := goical.NewDecoder(bytes.NewReader(data)).Decode()
	if err != nil {
		t.Fatalf("%s: go-ical: %v", c.ID, err)
	}
	text := func(props goical.Props, name string) string {
		s, err := props.Text(name)
		if err != nil {
			t.Fatalf("%s: %s: %v", c.ID, name, err)
		}
		return s
	}
	for _, name := range []string{"NAME", "X-WR-CALNAME"} {
		if got, want := text(gcal.Props, name), normText(c.Title); got != want {
			t.Errorf("%s: %s %q, want %q", c.ID, name, got, want)
		}
	}
	for _, name := range []string{"DESCRIPTION", "X-WR-CALDESC"} {
		if got, want := text(gcal.Props, name), normText(c.Description); got != want {
			t.Errorf("%s: %s %q, want %q", c.ID, name, got, want)
		}
	}
	byUID := map[string]*feed.Entry{}
	for i := range c.Entries {
		byUID[c.Entries[i].UID] = &c.Entries[i]
	}
	bad := 0
	for _, ev := range gcal.Events() {
		e := byUID[text(ev.Props, goical.PropUID)]
		if e == nil {
			t.Fatalf("%s: an event the calendar does not have", c.ID)
		}
		alarm := ""
		for _, a := range ev.Children {
			if a.Name == goical.CompAlarm {
				alarm = text(a.Props, goical.PropDescription)
			}
		}
		wantAlarm := ""
		if d := entryAlarm(c, e); d > 0 && !e.AllDay {
			wantAlarm = normText(e.Title)
		}
		for _, v := range []struct{ name, got, want string }{
			{goical.PropSummary, text(ev.Props, goical.PropSummary), normText(e.Title)},
			{goical.PropDescription, text(ev.Props, goical.PropDescription), normText(e.Description)},
			{goical.PropLocation, text(ev.Props, goical.PropLocation), normText(c.Site.Name)},
			{"VALARM DESCRIPTION", alarm, wantAlarm},
		} {
			if v.got != v.want && bad < 5 {
				bad++
				t.Errorf("%s: %s: %s %q, want %q", c.ID, e.UID, v.name, v.got, v.want)
			}
		}
	}
}

// textsCovered says which of today's texts the calendars carry, so that the
// test notices when a change of wording or of the configuration leaves one
// of them unchecked.
func textsCovered(cals []*feed.Calendar) map[string]bool {
	has := map[string]bool{}
	note := func(what string, ok bool) { has[what] = has[what] || ok }
	for _, c := range cals {
		note("a filter named in the calendar's description", strings.Contains(c.Description, ": only "))
		for i := range c.Entries {
			e := &c.Entries[i]
			note("a plan description of several lines", e.Kind == "plan" && strings.Count(e.Description, "\n") >= 3)
			note("a plan moved out of the hour the clocks skip", strings.Contains(e.Description, "the clocks skip"))
			note(`a span's time on the next day, "the next day (…)"`, e.Kind != "plan" && strings.Contains(e.Description, " the next day ("))
			note("a note for a date without the event", e.AllDay && e.Description != "" && strings.HasPrefix(e.Kind, "sun"))
			note("a lamp period with its own alarm", strings.HasPrefix(e.Kind, "lighting:") && e.Alarm != nil)
		}
	}
	return has
}

func TestCatalogueFeedsReadBack(t *testing.T) {
	own, err := config.Parse(strings.NewReader(catalogueConfig), "yaml")
	if err != nil {
		t.Fatal(err)
	}
	var cals []*feed.Calendar
	cals = append(cals, catalogueCalendars(t, own)...)
	if !testing.Short() {
		demo := config.Demo()
		demo.Service.BaseURL = "https://sky.example.org/calendars/"
		cals = append(cals, catalogueCalendars(t, demo)...)
	}
	has := textsCovered(cals)
	for _, want := range []string{"a filter named in the calendar's description", "a plan description of several lines",
		"a plan moved out of the hour the clocks skip", `a span's time on the next day, "the next day (…)"`,
		"a note for a date without the event", "a lamp period with its own alarm"} {
		if !has[want] {
			t.Errorf("no calendar has %s: the test no longer covers it", want)
		}
	}
	libical, _ := buildLibicalCheck(t)
	enc := NewEncoder(Options{Version: "catalogue"})
	for _, c := range cals {
		t.Run(c.ID, func(t *testing.T) {
			data, err := enc.Append(nil, c)
			if err != nil {
				t.Fatal(err)
			}
			verify(t, c, data)
			readTexts(t, c, data)
			if libical == "" {
				return
			}
			libicalReads(t, libical, c, data)
		})
	}
}
