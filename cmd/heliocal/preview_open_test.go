package main

import (
	"encoding/json"
	"net/http"
	"strings"
	"testing"
)

// A band's span that the Sun has not left when the preview's days end has
// no end to show: at 77.8° S, 166.7° E the Sun stays between +5° and +40°
// from 02:24 NZDT on 10 November 2026 for 84 days (TestAroundTheClockHasNoAltitude),
// so a preview from 9 November shows "from 02:24", open, in /at.json and the
// /at table page, not the end of its last day as the span's ("02:24–Thu
// 00:00" for three days).
func TestPreviewOpenSpan(t *testing.T) {
	ts := builderServer(t)
	get := func(path string) string { return getOK(t, ts.URL+path) }
	q := "lat=-77.8&lon=166.7&tz=Antarctica/McMurdo&kinds=sun-band:5..40&start=2026-11-09"
	var res struct {
		Days []struct {
			Entries []struct {
				Title, When, End string
				EndDate          string `json:"end_date"`
				Open             bool
			}
		}
	}
	if err := json.Unmarshal([]byte(get("/at.json?"+q)), &res); err != nil {
		t.Fatal(err)
	}
	var open []string
	for _, d := range res.Days {
		for _, e := range d.Entries {
			if e.Open {
				open = append(open, e.Title+" | "+e.When+" | "+e.End+e.EndDate)
			}
		}
	}
	if len(open) != 1 || open[0] != "Sun between +5° and +40° (around the clock) | from 02:24 | " {
		t.Errorf("open spans %q, want one, \"from 02:24\", without an end", open)
	}
	if page := get("/at?" + q + "&days=3"); !strings.Contains(page, "from 02:24") || strings.Contains(page, "02:24–") {
		t.Errorf("the table page does not show the open span \"from 02:24\":\n%s", page)
	}
}

// getOK returns the body of a GET of url, failing t unless it is 200 OK.
func getOK(t *testing.T, url string) string {
	t.Helper()
	code, body := status(t, url)
	if code != http.StatusOK {
		t.Fatalf("%s: status %d: %s", url, code, body)
	}
	return body
}

// An ad-hoc feed for a place without a name is titled by its coordinates as
// events names a place, with the hemispheres (45.03° S is south of the
// equator, 168.66° E east of Greenwich), not the signed numbers of the query.
func TestAdhocTitleNamesHemispheres(t *testing.T) {
	ts := builderServer(t)
	q := "lat=-45.03&lon=168.66&tz=Pacific/Auckland&kinds=sunset&start=2027-01-01&days=3"
	ics := getOK(t, ts.URL+"/at.ics?"+q)
	if !strings.Contains(ics, "X-WR-CALNAME:Sky events at 45.0300° S\\, 168.6600° E\r\n") {
		t.Errorf("ad-hoc feed's name:\n%s", ics)
	}
	if page := getOK(t, ts.URL+"/at?"+q); !strings.Contains(page, "<h1>Sky events at 45.0300° S, 168.6600° E</h1>") || !strings.Contains(page, `<p class="intro">Elevation 0 m ·`) {
		t.Errorf("the /at page names the place by signed numbers:\n%s", page)
	}
}

// The /at page names the place once, where it is read: a place without a
// name by its coordinates in the heading (not again in the line under
// it), a named one by its name in the heading and its coordinates under it.
func TestAdhocPageNamesPlaceOnce(t *testing.T) {
	ts := builderServer(t)
	for _, tc := range []struct{ query, h1, intro string }{
		{"", "<h1>Sky events at 47.8000° N, 13.0500° E</h1>", `<p class="intro">Elevation 0 m, horizon 2.5° · times in Europe/Vienna`},
		{"&name=Gaisberg", "<h1>Sky events at Gaisberg</h1>", `<p class="intro">47.8000° N, 13.0500° E, 0 m, horizon 2.5° · times in Europe/Vienna`},
	} {
		page := getOK(t, ts.URL+"/at?lat=47.8&lon=13.05&tz=Europe/Vienna&kinds=sunrise&days=3&horizon=2.5"+tc.query)
		_, shown, _ := strings.Cut(page, "<body>")
		if !strings.Contains(shown, tc.h1) || !strings.Contains(shown, tc.intro) || strings.Count(shown, "47.8000° N, 13.0500° E") != 1 {
			t.Errorf("/at%s: want %q, then %q, the coordinates once:\n%s", tc.query, tc.h1, tc.intro, shown)
		}
	}
}
