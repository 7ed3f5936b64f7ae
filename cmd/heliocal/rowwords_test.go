package main

import (
	"encoding/json"
	"html"
	"regexp"
	"strings"
	"testing"
)

// dayWords name a day from the reader's: right in a calendar app, where a
// note sits on its own date, wrong in a row of the served table or the
// builder's preview for a date weeks ahead.
var dayWords = regexp.MustCompile(`(?i)\b(today|tonight|tomorrow|yesterday|last night|this evening|this morning)\b`)

// rowKinds are the kinds whose notes the rows show near the poles: every
// Sun and Moon kind with a state for a date without its event (polar day
// and night, no dusk, twilight all night, the Moon always up or down, a
// golden hour that does not happen, a band not entered); the queries add
// the lamps.
const rowKinds = "sunrise,sunset,civil-dawn,civil-dusk,nautical-dawn,nautical-dusk,astronomical-dawn,astronomical-dusk," +
	"golden-hour,blue-hour,solar-noon,daily-summary,dark-window,moonrise,moonset,moon-transit,sun-altitude:-3,sun-band:5..40"

// tableItem is an entry of the /at page's rows, tableTime its time.
var (
	tableItem = regexp.MustCompile(`(?s)<li>(.*?)</li>`)
	tableTime = regexp.MustCompile(`^<span class="t">[^<]*</span> `)
)

// The rows of the day-by-day table (/at) and of the builder's preview
// (/at.json) are dates among others: their notes speak of the row's date
// ("Polar night: the Sun does not rise on this date", as the notes'
// descriptions say it), never of today, tonight or last night. At 78.2° N
// (Longyearbyen) and 69° S (near Mawson station) over a whole year they
// show polar day and night, dates without a dusk, twilight all night, the
// Moon up or down all day, golden and blue hours that do not happen and
// bands not entered. The Sun does not rise at 78.2° N from late October to
// mid-February and does not set from about 20 April to 23 August (from
// memory; the polar states themselves are held to published values in the
// astro tests).
func TestRowsNameNoDay(t *testing.T) {
	ts := builderServer(t)
	places := []string{"lat=78.2&lon=15.6&tz=Arctic/Longyearbyen&kinds=" + rowKinds, "lat=-69&lon=76.4&tz=Antarctica/Mawson&kinds=" + rowKinds,
		// a skyline (8° to the south): the noon Sun behind it, no direct Sun
		"lat=78.2&lon=15.6&tz=Arctic/Longyearbyen&horizon=0:3,90:6,180:8,270:2&kinds=noon-clear,sun-hidden," + rowKinds}
	seen := map[string]bool{}
	check := func(where, title string) {
		seen[title] = true
		if dayWords.MatchString(title) {
			t.Errorf("%s: %q names a day from the reader's, not the row's date", where, title)
		}
	}
	for _, place := range places {
		for _, start := range []string{"2027-01-01", "2027-03-04", "2027-05-05", "2027-07-06", "2027-09-06", "2027-11-07"} {
			q := place + "&lighting=16h&start=" + start
			page := getOK(t, ts.URL+"/at?"+q+"&days=62")
			body, _, _ := strings.Cut(page[strings.Index(page, "<tbody>"):], "</tbody>")
			for _, m := range tableItem.FindAllStringSubmatch(body, -1) {
				check("/at?"+q, html.UnescapeString(tableTime.ReplaceAllString(m[1], "")))
			}
		}
		for _, start := range []string{"2027-01-10", "2027-06-18", "2027-08-20"} {
			q := place + "&lighting=16h&start=" + start
			var res struct {
				Days []struct{ Entries []struct{ Title string } }
			}
			if err := json.Unmarshal([]byte(getOK(t, ts.URL+"/at.json?"+q)), &res); err != nil {
				t.Fatal(err)
			}
			for _, d := range res.Days {
				for _, e := range d.Entries {
					check("/at.json?"+q, e.Title)
				}
			}
		}
	}
	// the rows say the notes, in words for the row's date
	for _, want := range []string{
		"Polar night: the Sun does not rise on this date",
		"Midnight sun: the Sun does not set on this date",
		"No civil dusk or dawn on this date: the Sun does not set",
		"No nautical dusk or dawn on this date: nautical twilight lasts all night",
		"No civil twilight on this date: the Sun stays more than 6° below the horizon",
		"No golden hour on this date: the Sun stays too low",
		"No blue hour on this date: the Sun stays too high",
		"The Moon stays above the horizon all day",
		"The Moon stays below the horizon all day",
		"The noon Sun stays behind the skyline from this date",
		"No direct Sun on this date: the Sun stays behind the skyline",
		"The Sun stays over the skyline all day: no sunset on this date",
	} {
		if !seen[want] {
			t.Errorf("no row says %q", want)
		}
	}
}
