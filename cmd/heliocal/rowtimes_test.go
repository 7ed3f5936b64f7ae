package main

import (
	"encoding/json"
	"html"
	"regexp"
	"strings"
	"testing"
)

// clockWord is a clock time in a title, nightWord a night named by its dates.
var (
	clockWord = regexp.MustCompile(`\b\d\d:\d\d\b`)
	nightWord = regexp.MustCompile(`night of \d`)
	// zeroMinutes is a whole number of hours written with its zero
	// minutes, "14 h 00 min", where a target beside it reads "14 h"
	zeroMinutes = regexp.MustCompile(`\d h 00 min`)
	// longDate is a date with its month in full: the table's prose writes
	// its dates as the lamp notes do, "until 2 Jul" ("May" is both forms)
	longDate = regexp.MustCompile(`\d (January|February|March|April|June|July|August|September|October|November|December)\b`)
	// lampRow is a lamp period's title in a row: its length and target,
	// its times in the time column
	lampRow = regexp.MustCompile(`^Lamps on for \d+ (h|min)( \d\d min)?(, to reach 16 h|; 16 h not reached)$`)
)

// A row of the day-by-day table (/at) or of the builder's preview (/at.json)
// shows an entry's times in its own column and the date in the row's: the
// title says neither again ("16:16–22:40 Lamps on for 6 h 24 min, to reach
// 16 h", not "16:16–22:40 Lamps on 16:16–22:40 (…)"; "18:08–Sun 05:17 Dark
// sky, 11 h 09 min" in the row of Saturday, not "…, night of 5–6 December
// 2026"), while the subscribed calendar keeps its titles with the times
// ("Lamps on 16:16–22:40 (6 h 24 min, to reach 16 h)"), which a calendar app
// shows apart from the entry's own times. A length of whole hours reads as
// the target beside it, "16 h", never "16 h 00 min", in the rows and the
// feed alike. Salzburg (47.8° N) in December
// needs lamps every evening for a 16 h day and has dark windows; Tromsø
// (69.65° N) in January has lamp periods across midnight around its polar
// night, and Longyearbyen (78.2° N) in April nights without dark sky.
func TestRowsSayTimesOnce(t *testing.T) {
	ts := builderServer(t)
	places := []string{
		"lat=47.8&lon=13.06&tz=Europe/Vienna&start=2026-12-05",
		"lat=69.65&lon=18.96&tz=Europe/Oslo&start=2027-01-02",
		"lat=78.2&lon=15.6&tz=Arctic/Longyearbyen&start=2027-04-10",
	}
	const kinds = "&kinds=golden-hour,blue-hour,dark-window,sunset&lighting=16h"
	lamps, whole := 0, 0
	check := func(where, when, title string) {
		if when != "" && clockWord.MatchString(title) {
			t.Errorf("%s: %q beside %q says a time again", where, title, when)
		}
		if nightWord.MatchString(title) {
			t.Errorf("%s: %q names the night by its dates beside the row's date", where, title)
		}
		if strings.HasPrefix(title, "Lamps on") {
			lamps++
			if !lampRow.MatchString(title) {
				t.Errorf("%s: lamp row %q, want \"Lamps on for <length>, to reach 16 h\"", where, title)
			}
		}
	}
	for _, place := range places {
		q := place + kinds
		page := pageWords(getOK(t, ts.URL+"/at?"+q+"&days=14"))
		body, _, _ := strings.Cut(page[strings.Index(page, "<tbody>"):], "</tbody>")
		feed := getOK(t, ts.URL+"/at.ics?"+q+"&days=14")
		for what, text := range map[string]string{"/at": page, "/at.ics": strings.ReplaceAll(feed, "\r\n ", "")} {
			if m := zeroMinutes.FindString(text); m != "" {
				t.Errorf("%s?%s: a length written %q: whole hours read \"14 h\", as the target does", what, q, m)
			}
		}
		if m := longDate.FindString(page); m != "" {
			t.Errorf("/at?%s: a date written %q: the page's prose writes \"2 Jul\"", q, m)
		}
		for _, m := range tableItem.FindAllStringSubmatch(body, -1) {
			item := html.UnescapeString(m[1])
			when := ""
			if tm := tableTime.FindString(item); tm != "" {
				when = strings.TrimSuffix(strings.TrimPrefix(tm, `<span class="t">`), "</span> ")
			}
			title := tableTime.ReplaceAllString(item, "")
			check("/at?"+q, when, title)
			if title == "Lamps on for 16 h, to reach 16 h" {
				whole++
			}
			// the calendar's entry keeps the times in its title
			if strings.HasPrefix(title, "Lamps on") && !strings.Contains(when, " ") &&
				!strings.Contains(feed, "SUMMARY:Lamps on "+when+" (") {
				t.Errorf("/at.ics?%s: no entry titled \"Lamps on %s (…)\" for the row %q", q, when, when+" "+title)
			}
		}
		var res struct {
			Days []struct {
				Entries []struct{ Title, When string }
			}
		}
		if err := json.Unmarshal([]byte(getOK(t, ts.URL+"/at.json?"+q)), &res); err != nil {
			t.Fatal(err)
		}
		for _, d := range res.Days {
			for _, e := range d.Entries {
				check("/at.json?"+q, e.When, e.Title)
			}
		}
	}
	if lamps == 0 {
		t.Error("no lamp period in the rows")
	}
	// in Tromsø's polar night (no sunrise from 29 November 2026 to 13
	// January 2027: PyEphem 4.1.4, the upper limb's standard altitude of
	// -50′) the lamps give the whole 16 h
	if whole == 0 {
		t.Error(`no row "Lamps on for 16 h, to reach 16 h" in Tromsø's polar night`)
	}
}

// A time in the hour the clocks show twice is written with its zone's
// label on the table page (/at) and in the preview's /at.json, where its
// time stays the clock alone: Havana's moonset of 7 November 2027 is at
// 05:48:24 UTC (PyEphem 4.1.4, Debian python3-ephem: Observer at 23.11,
// -82.41, elevation 0, pressure 0, horizon -0:34, Moon().next_setting from
// 2027/11/07 04:00, the upper limb), 00:48 CST, the second pass of
// 00:00–00:59 (the clocks go back from 00:59:59 CDT to 00:00:00 CST, zdump,
// tz database).
func TestRowsMarkRepeatedHour(t *testing.T) {
	ts := builderServer(t)
	q := "lat=23.11&lon=-82.41&tz=America/Havana&kinds=moonset&start=2027-11-07&days=1"
	if page := getOK(t, ts.URL+"/at?"+q); !strings.Contains(page, `<span class="t">00:48 CST</span> Moonset`) {
		t.Errorf("/at?%s: no moonset at 00:48 CST:\n%s", q, page)
	}
	var res struct {
		Days []struct {
			Entries []struct{ Kind, Time, When string }
		}
	}
	if err := json.Unmarshal([]byte(getOK(t, ts.URL+"/at.json?"+q)), &res); err != nil {
		t.Fatal(err)
	}
	if len(res.Days) != 1 || len(res.Days[0].Entries) != 1 || res.Days[0].Entries[0].When != "00:48 CST" || res.Days[0].Entries[0].Time != "00:48" {
		t.Errorf("/at.json?%s: days %+v, want the moonset when 00:48 CST, time 00:48", q, res.Days)
	}
}
