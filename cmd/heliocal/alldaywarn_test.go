package main

import (
	"slices"
	"strings"
	"testing"
	"time"

	"heliocal/config"
)

// allDayFeed is a feed whose options all-day entries make do nothing: an
// alarm on daily-summary, on seasons shown all day and on a plan without
// start, and all_day on photoperiod; and a plan on 29 February whose
// window, checked on 5 December 2026, runs 2026-12-05..2027-10-01 (300
// days ahead), with no 29 February in it: 2027 is no leap year, 2028 is
// (Gregorian calendar: a year divisible by 4, not by 100 unless by 400).
const allDayFeed = `sites:
  - {id: farm, latitude: 47.07, longitude: 8.3, timezone: Europe/Zurich}
feeds:
  - id: farm-year
    site: farm
    days_back: 0
    days_ahead: 300
    kinds:
      - {kind: daily-summary, alarm: 15m}
      - {kind: seasons, all_day: true, alarm: 1h}
      - {kind: "photoperiod:12h", all_day: true}
      - {kind: sunset, alarm: 10m}
      - {kind: sunrise, all_day: true, alarm: 0s}
    plans:
      - {title: Leap-day walk, date: every 02-29, start: "10:00"}
      - {title: Last frost, date: every 04-25, alarm: 1h}
      - {title: Vents, date: every day, start: sunrise, alarm: 5m}
`

var allDayNow = time.Date(2026, 12, 5, 12, 0, 0, 0, time.UTC)

// check warns of each, and of nothing else: an alarm on timed entries,
// "0s" on all-day ones and a yearly plan in the window are fine.
func TestAllDayWarnings(t *testing.T) {
	r := checkReportOf(t, allDayFeed, allDayNow)
	want := []string{
		`feed "farm-year": plan "Leap-day walk": its dates (every 02-29) are in leap years only, and the window 2026-12-05..2027-10-01 holds no 29 February: no entry falls in it; the next, 2028-02-29, is published from 2027-05-05, when the window reaches it`,
		`feed "farm-year": daily-summary: alarm 15m gives no reminder: its entries are all-day, and reminders are set before timed entries only`,
		`feed "farm-year": seasons: alarm 1h gives no reminder: all_day: true makes its entries all-day, and reminders are set before timed entries only`,
		`feed "farm-year": photoperiod:12h: all_day: true changes nothing: its entries are all-day already`,
		`feed "farm-year": plan "Last frost": alarm 1h gives no reminder: a plan without start is all-day, and reminders are set before timed entries only`,
	}
	wantWarnings(t, r.Warnings, want)
	// a window that holds 2028-02-29 (from 2027-05-05 on) has the plan's
	// entry: no warning of it
	r = checkReportOf(t, allDayFeed, time.Date(2027, 5, 5, 12, 0, 0, 0, time.UTC))
	if slices.ContainsFunc(r.Warnings, func(w string) bool { return strings.Contains(w, "Leap-day walk") }) {
		t.Errorf("window 2027-05-05..2028-02-29:\n%s", strings.Join(r.Warnings, "\n"))
	}
}

// allDayOnlyFeed has a feed-level alarm and entries all-day only: a kind
// all-day by itself, one shown all day, and a plan without start; the
// second feed has the same alarm and one timed kind (sunset). The others
// have timed entries that turn the feed's alarm off with "0s": the one
// timed kind beside an all-day one, a kind and a plan, and, without a
// warning, a kind beside one with an alarm of its own.
const allDayOnlyFeed = `sites:
  - {id: farm, latitude: 47.07, longitude: 8.3, timezone: Europe/Zurich}
feeds:
  - id: farm-days
    site: farm
    alarm: 30m
    kinds:
      - daily-summary
      - {kind: seasons, all_day: true}
    plans:
      - {title: Last frost, date: every 04-25}
  - id: farm-evenings
    site: farm
    alarm: 30m
    kinds:
      - daily-summary
      - sunset
  - id: farm-quiet
    site: farm
    alarm: 30m
    kinds:
      - daily-summary
      - {kind: sunset, alarm: 0s}
  - id: farm-vents
    site: farm
    alarm: 15m
    kinds:
      - {kind: sunrise, alarm: 0s}
    plans:
      - {title: Vents, date: every day, start: sunrise, alarm: 0s}
  - id: farm-own
    site: farm
    alarm: 30m
    kinds:
      - {kind: sunset, alarm: 0s}
      - {kind: sunrise, alarm: 1h}
`

// check warns of a feed's alarm when none of its entries is timed, or
// when each timed one turns it off, and not when one kind of the feed
// gives timed entries with a reminder.
func TestFeedAlarmAllDayWarning(t *testing.T) {
	r := checkReportOf(t, allDayOnlyFeed, allDayNow)
	want := []string{
		`feed "farm-days": alarm 30m gives no reminder: every entry of the feed is all-day, and reminders are set before timed entries only`,
		`feed "farm-quiet": alarm 30m gives no reminder: sunset turns it off with alarm: 0s, and the feed's other entries are all-day, which take no reminder`,
		`feed "farm-vents": alarm 15m gives no reminder: sunrise and plan "Vents" turn it off with alarm: 0s`,
	}
	wantWarnings(t, r.Warnings, want)
}

// eventPlanFeed is at 34.6° S, where the longest day is 14 h 32 min and
// the shortest 9 h 53 min (PyEphem 4.1.4, sunrise to sunset at the upper
// limb's standard altitude of -50′, on 21 December 2026 and 21 June 2027),
// so that the day length passes 12 h twice a year: a plan on the date the
// day length passes 20 h has no date, while the plans on the 12 h
// crossings and the full Moons have theirs.
const eventPlanFeed = `sites:
  - {id: pampa, latitude: -34.6, longitude: -58.4, timezone: America/Argentina/Buenos_Aires}
feeds:
  - id: pampa-plans
    site: pampa
    plans:
      - {title: Lamps off for summer, date: "photoperiod:20h", start: sunrise}
      - {title: Equal day and night walk, date: "photoperiod:12h", start: sunset}
      - {title: Full Moon walk, date: full-moon, start: moonrise}
`

// check warns of a plan whose date is an event of the sky that the feed's
// window does not have; its months and weekdays are named, as they may be why.
func TestEventPlanWarning(t *testing.T) {
	r := checkReportOf(t, eventPlanFeed, allDayNow)
	var got []string
	for _, w := range r.Warnings {
		if strings.Contains(w, "no date of the window") {
			got = append(got, w)
		}
	}
	want := []string{
		`feed "pampa-plans": plan "Lamps off for summer": no date of the window 2026-11-05..2027-12-05 has its date (photoperiod:20h): the feed holds no entry for it`,
	}
	if !slices.Equal(got, want) {
		t.Errorf("warnings:\n%s\nwant:\n%s", strings.Join(r.Warnings, "\n"), strings.Join(want, "\n"))
	}
}

func TestEventPlanWarningNamesFilters(t *testing.T) {
	for _, tc := range []struct {
		p    config.Plan
		want string
	}{
		{config.Plan{}, ""},
		{config.Plan{Months: []string{"jun", "jul"}}, " within its months jun, jul"},
		{config.Plan{Months: []string{"jun"}, Weekdays: []string{"sun"}}, " within its months jun and weekdays sun"},
	} {
		if got := filterWords(tc.p); got != tc.want {
			t.Errorf("%+v: %q, want %q", tc.p, got, tc.want)
		}
	}
}

// skippedFeed is a feed at Apia, whose clocks went from 23:59:59 on 29
// December 2011 to 00:00 on 31 December (UTC−10 to UTC+14; IANA tz
// database, Pacific/Apia; zdump -v Pacific/Apia), checked on 5 January
// 2012 with the 30 days before it: Friday 30 December 2011 does not exist
// there. The weekly, yearly and one-off plans on it have no entry; "June"
// leaves December out by its months, and the Friday nearest the first
// quarter of Sunday 1 January 2012 moves to Friday 6 January instead.
const skippedFeed = `sites:
  - {id: vailima, latitude: -13.86, longitude: -171.77, timezone: Pacific/Apia}
feeds:
  - id: apia-plans
    site: vailima
    days_back: 30
    days_ahead: 10
    plans:
      - {title: Film, date: every friday, start: sunset}
      - {title: Party, date: every 12-30}
      - {title: Once, date: 2011-12-30, start: "20:00"}
      - {title: June, date: every day, months: [jun]}
      - {title: Quarter, date: friday nearest first-quarter}
`

// check notes each plan whose date the clocks skip, once, naming the plan
// and the date.
func TestSkippedPlanNotes(t *testing.T) {
	r := checkReportOf(t, skippedFeed, time.Date(2012, 1, 5, 12, 0, 0, 0, time.UTC))
	var got []string
	for _, n := range r.Notes {
		if strings.Contains(n, "2011-12-30") {
			got = append(got, n)
		}
	}
	want := []string{
		`feed "apia-plans": plan "Film" (every friday): 2011-12-30 (Fri) does not exist in Pacific/Apia, whose clocks skip that date whole: the plan has no entry there`,
		`feed "apia-plans": plan "Party" (every 12-30): 2011-12-30 (Fri) does not exist in Pacific/Apia, whose clocks skip that date whole: the plan has no entry there`,
		`feed "apia-plans": plan "Once" (2011-12-30): 2011-12-30 (Fri) does not exist in Pacific/Apia, whose clocks skip that date whole: the plan has no entry there`,
	}
	if !slices.Equal(got, want) {
		t.Errorf("notes:\n%s\nwant:\n%s", strings.Join(r.Notes, "\n"), strings.Join(want, "\n"))
	}
	// events --feed says the same on standard error, over the dates asked
	path := writeConfig(t, skippedFeed)
	code, _, errOut := runCLI(t, "events", "--config", path, "--feed", "apia-plans", "--from", "2011-12-28", "--to", "2012-01-07")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var lines []string
	for _, w := range want {
		lines = append(lines, "heliocal: note: "+w)
	}
	if errOut != strings.Join(lines, "\n")+"\n" {
		t.Errorf("events --feed: stderr\n%s\nwant\n%s", errOut, strings.Join(lines, "\n"))
	}
	// a window without the date: no note
	if code, _, errOut = runCLI(t, "events", "--config", path, "--feed", "apia-plans", "--from", "2011-12-31", "--to", "2012-01-07"); code != 0 || errOut != "" {
		t.Errorf("31 December on: exit %d, stderr %q", code, errOut)
	}
}
