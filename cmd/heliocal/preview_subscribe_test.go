package main

import (
	"encoding/json"
	"io"
	"net/http"
	"os"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"
)

// subscribeKinds are many kinds near a pole, where a summer date carries
// far more events than a winter one (the Moon's and the twilights' all
// come and go).
const subscribeKinds = "sunrise,sunset,civil-dawn,civil-dusk,golden-hour,moonrise,moonset"

// The builder's subscribe link is a rolling window from the day of each
// fetch: its days must give a feed under max_feed_bytes (1 MB by default:
// some web calendars are reported to drop larger subscriptions, common
// practice) whatever day of the year the calendar app fetches it on. Near
// a pole, in December, the weeks after the request are poor in events and
// a window sized from them was refused from May to September; the days of
// Utqiaġvik's link from 4 December are those docs/serving.md gives.
// Places: Utqiaġvik, Alaska (71.29° N, 156.8° W) and Tromsø, Norway
// (69.65° N, 18.96° E), from their published coordinates; Vienna (48.2° N,
// 16.4° E), where the events are spread evenly over the year: its link is
// no shorter than the estimate from the four weeks after the request, the
// rule before, and a year with the four default kinds.
func TestSubscribeLinkFitsAllYear(t *testing.T) {
	ts := builderServer(t)
	for _, tc := range []struct {
		name, place, kinds string
		even               bool // the events spread evenly over the year
	}{
		{"utqiagvik", "lat=71.29&lon=-156.8", subscribeKinds, false},
		{"tromso", "lat=69.65&lon=18.96", subscribeKinds, false},
		{"vienna", "lat=48.2&lon=16.4", subscribeKinds, true},
		{"vienna-default", "lat=48.2&lon=16.4", "sunrise,sunset,civil-dawn,civil-dusk", true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			q := tc.place + "&kinds=" + tc.kinds
			days := subscribeDays(t, ts.URL+"/at.json?"+q+"&start=2026-12-04")
			if tc.name == "utqiagvik" {
				// docs/serving.md gives this link's days
				doc, err := os.ReadFile("../../docs/serving.md")
				if err != nil {
					t.Fatal(err)
				}
				text := strings.Join(strings.Fields(string(doc)), " ")
				if want := "at 71.29° N with sunrise, sunset, civil twilight, golden hour, moonrise and moonset, " + strconv.Itoa(days) + " days from December"; !strings.Contains(text, want) {
					t.Errorf("docs/serving.md does not say %q", want)
				}
			}
			if tc.even {
				_, month := status(t, ts.URL+"/at.ics?"+q+"&start=2026-12-04&days=28")
				if est := min(365, 900_000*28/len(month)); days < est {
					t.Errorf("subscribe_days %d, shorter than the four weeks' estimate %d", days, est)
				}
			}
			first := time.Date(2026, 12, 4, 0, 0, 0, 0, time.UTC)
			for i := 0; i < 365; i += 7 {
				start := first.AddDate(0, 0, i).Format(time.DateOnly)
				url := ts.URL + "/at.ics?" + q + "&days=" + strconv.Itoa(days) + "&start=" + start
				if code, body := status(t, url); code != http.StatusOK {
					t.Errorf("the subscription of %d days fetched on %s: status %d: %s", days, start, code, body)
				}
			}
		})
	}
}

// A refused ad-hoc feed suggests the window the builder's link would give
// from the same date, and that window is served.
func TestRefusalSuggestsLinkDays(t *testing.T) {
	ts := builderServer(t)
	q := "lat=71.29&lon=-156.8&kinds=" + subscribeKinds + "&start=2027-07-01" // Utqiaġvik, as above
	code, body := status(t, ts.URL+"/at.ics?"+q+"&days=355")
	m := regexp.MustCompile(`days=(\d+) should fit`).FindStringSubmatch(body)
	if code != http.StatusBadRequest || m == nil {
		t.Fatalf("355 days from 1 July: status %d, %q; want a refusal suggesting days", code, body)
	}
	suggested, _ := strconv.Atoi(m[1])
	if link := subscribeDays(t, ts.URL+"/at.json?"+q); suggested != link {
		t.Errorf("the refusal suggests days=%d, the builder's link from the same date %d", suggested, link)
	}
	if code, body := status(t, ts.URL+"/at.ics?"+q+"&days="+m[1]); code != http.StatusOK {
		t.Errorf("the suggested days=%s: status %d: %s", m[1], code, body)
	}
}

// A preview of the last week of the dates served (the supported range ends
// on 2200-12-31: DefaultAdhocMaxYear, the ephemeris's own range) sizes its
// subscribe link from the year before that end: the year from its start
// would run past it, and the preview was refused.
func TestPreviewAtEndOfRange(t *testing.T) {
	ts := builderServer(t)
	if days := subscribeDays(t, ts.URL+"/at.json?lat=1&lon=2&start=2200-12-25"); days != 365 {
		t.Errorf("subscribe_days %d, want 365 (the default kinds fit a year)", days)
	}
}

// subscribeDays is the subscribe_days of the preview at url.
func subscribeDays(t *testing.T, url string) int {
	t.Helper()
	var res struct {
		SubscribeDays int `json:"subscribe_days"`
	}
	if err := json.Unmarshal([]byte(getOK(t, url)), &res); err != nil {
		t.Fatal(err)
	}
	return res.SubscribeDays
}

// status fetches url and returns its status and body.
func status(t *testing.T, url string) (int, string) {
	t.Helper()
	r, err := http.Get(url)
	if err != nil {
		t.Fatal(err)
	}
	defer r.Body.Close()
	b, err := io.ReadAll(r.Body)
	if err != nil {
		t.Fatal(err)
	}
	return r.StatusCode, string(b)
}
