package main

import (
	"encoding/json"
	"html"
	"net/http"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// tableAddress is the calendar address of the /at page.
var tableAddress = regexp.MustCompile(`Calendar address: <a href="([^"]+)"`)

// The /at table's subscribe link is the builder's: where a year of the
// chosen kinds is over the ad-hoc size limit (five kinds at 33°27′S
// 70°40′W, as in TestBrowserBuilder) it asks for the days that fit, so the
// feed it names is served, not refused, and the page says how many days
// the calendar covers, as the builder's result does.
func TestTableSubscribesAsPreview(t *testing.T) {
	ts := builderServer(t)
	q := "lat=-33.45&lon=-70.6667&tz=America/Santiago&kinds=civil-dawn,sunrise,sunset,civil-dusk,golden-hour&start=2026-06-21"
	var res struct {
		HTTPS         string
		SubscribeDays int    `json:"subscribe_days"`
		SubscribeNote string `json:"subscribe_note"`
	}
	if err := json.Unmarshal([]byte(getOK(t, ts.URL+"/at.json?"+q)), &res); err != nil {
		t.Fatal(err)
	}
	if res.SubscribeDays < 150 || res.SubscribeDays >= 365 {
		t.Fatalf("the preview subscribes to %d days; want fewer than a year, the days that fit", res.SubscribeDays)
	}
	page := pageWords(getOK(t, ts.URL+"/at?"+q))
	m := tableAddress.FindStringSubmatch(page)
	if m == nil {
		t.Fatalf("the table page has no calendar address:\n%s", page)
	}
	if link := html.UnescapeString(m[1]); link != res.HTTPS {
		t.Errorf("the table subscribes to %s, the preview to %s", link, res.HTTPS)
	}
	if code, body := status(t, html.UnescapeString(m[1])); code != http.StatusOK || !strings.HasPrefix(body, "BEGIN:VCALENDAR") {
		t.Errorf("the table's calendar address answers %d: %.200s", code, body)
	}
	// the builder's script shows the preview's subscribe_note as it is
	want := "The calendar always covers the next " + strconv.Itoa(res.SubscribeDays) + " days (a year of these events would be too large for some calendar apps)."
	if !strings.Contains(page, `<p class="help">`+want+`</p>`) {
		t.Errorf("the table page does not say %q", want)
	}
	if res.SubscribeNote != want {
		t.Errorf("the preview's subscribe_note is %q, want %q as the table says it", res.SubscribeNote, want)
	}
}

// A "no lamps needed" note on the /at table says until when as the
// subscribed feed and the builder's preview say it on the same date, not
// "through" the table's last date, as if lamps were needed after it: at
// 48.2° N, 16.4° E the natural day is over 14 h from early May to the middle
// of August (from memory; the day lengths are held to USNO in the astro
// tests), and a table of ten days from 1 May 2027 ends long before.
func TestTableLampNoteAsFed(t *testing.T) {
	ts := builderServer(t)
	q := "lat=48.2&lon=16.4&tz=Europe/Vienna&kinds=sunrise&lighting=14h&start=2027-05-01"
	var res struct {
		Days []struct {
			Date    string
			Entries []struct{ Title string }
		}
	}
	if err := json.Unmarshal([]byte(getOK(t, ts.URL+"/at.json?"+q)), &res); err != nil {
		t.Fatal(err)
	}
	var note string
	for _, e := range res.Days[0].Entries {
		if strings.HasPrefix(e.Title, "No lamps needed") {
			note = e.Title
		}
	}
	if !strings.HasPrefix(note, "No lamps needed until ") {
		t.Fatalf("the preview's note on %s is %q, want one that says until when", res.Days[0].Date, note)
	}
	page := pageWords(getOK(t, ts.URL+"/at?"+q+"&days=10"))
	if !strings.Contains(page, "<li>"+html.EscapeString(note)+"</li>") || strings.Contains(page, "No lamps needed through") {
		t.Errorf("the table's note is not the preview's %q:\n%s", note, page)
	}
}

// tableShare is the "Share this page" link of the /at page.
var tableShare = regexp.MustCompile(`Share this page: <a href="([^"]+)"`)

// The /at page's "Share this page" link opens the same page: a table of 30
// days shares a link to 30 days (docs/serving.md: `days` up to 62, default
// 7), and the default table's link carries no days.
func TestTableSharesItsDays(t *testing.T) {
	ts := builderServer(t)
	q := "lat=48.2&lon=16.4&tz=Europe/Vienna&kinds=sunrise,sunset&start=2027-03-01"
	for _, tc := range []struct {
		query, want string
	}{
		{q + "&days=30", "&days=30"},
		{q, ""},
	} {
		page := getOK(t, ts.URL+"/at?"+tc.query)
		m := tableShare.FindStringSubmatch(page)
		if m == nil {
			t.Fatalf("%s: no share link:\n%.500s", tc.query, page)
		}
		link := html.UnescapeString(m[1])
		if got := regexp.MustCompile(`&days=\d+`).FindString(link); got != tc.want {
			t.Errorf("%s: shares %s, want days %q", tc.query, link, tc.want)
		}
		shared := getOK(t, link)
		if strings.Count(shared, "<tr") != strings.Count(page, "<tr") {
			t.Errorf("%s: the shared page has %d rows, the page %d", tc.query, strings.Count(shared, "<tr"), strings.Count(page, "<tr"))
		}
	}
}
