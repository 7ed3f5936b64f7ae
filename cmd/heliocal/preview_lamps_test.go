package main

import (
	"encoding/json"
	"strconv"
	"strings"
	"testing"
)

// The preview's "no lamps needed" note says what the subscribed feed says
// on the same dates, not the end of the preview's seven days. At 48.2° N a
// natural day of 16 h or more lasts from about 11 June to 1 July (USNO
// Duration of Daylight table for 48° N, a longest day of about 16 h 05 min;
// value from memory; TestLightingNoLampsNote), so a preview from 20 June
// lies inside the stretch: the feed from that date, as long as the preview's
// subscription, titles its first date "No lamps needed until 2 Jul" or so,
// where the preview alone would have said "through 26 Jun". At 69.65° N
// (Tromsø) days of 16 h or more last from late April to late August (value
// from memory), longer than the preview's first look ahead of eight weeks:
// from 20 May the note needs the whole feed, and names a date in August.
func TestPreviewLampsNoteAsFed(t *testing.T) {
	ts := builderServer(t)
	get := func(path string) string { return getOK(t, ts.URL+path) }
	for _, tc := range []struct{ place, start, month string }{
		{"lat=48.2&lon=16.4&tz=Europe/Vienna", "2027-06-20", "Jul"},
		{"lat=69.65&lon=18.96&tz=Europe/Oslo", "2027-05-20", "Aug"},
	} {
		q := tc.place + "&kinds=lighting:16h&start=" + tc.start
		var res struct {
			SubscribeDays int `json:"subscribe_days"`
			Days          []struct {
				Date    string
				Entries []struct{ Kind, Title string }
			}
		}
		if err := json.Unmarshal([]byte(get("/at.json?"+q)), &res); err != nil {
			t.Fatal(err)
		}
		var preview []string
		for _, d := range res.Days {
			for _, e := range d.Entries {
				preview = append(preview, d.Date+" "+e.Title)
			}
		}
		// the subscribed feed over the same dates: its SUMMARY of the
		// first date
		ics := get("/at.ics?" + q + "&days=" + strconv.Itoa(res.SubscribeDays))
		var fed []string
		for ev := range strings.SplitSeq(ics, "BEGIN:VEVENT") {
			if strings.Contains(ev, "DTSTART;VALUE=DATE:"+strings.ReplaceAll(tc.start, "-", "")) {
				for line := range strings.SplitSeq(unfold(ev), "\r\n") {
					if s, ok := strings.CutPrefix(line, "SUMMARY:"); ok {
						fed = append(fed, tc.start+" "+strings.ReplaceAll(s, `\,`, ","))
					}
				}
			}
		}
		if res.SubscribeDays <= 7 || len(fed) != 1 || !strings.HasPrefix(fed[0], tc.start+" No lamps needed until ") || !strings.Contains(fed[0], " "+tc.month+":") {
			t.Fatalf("%s: subscription of %d days, the feed's first date %q: want a note of the stretch saying until when, in %s",
				q, res.SubscribeDays, fed, tc.month)
		}
		if len(preview) != 1 || preview[0] != fed[0] {
			t.Errorf("%s: preview %q, want the feed's %q", q, preview, fed[0])
		}
	}
}

// unfold joins the folded content lines of an iCalendar text (RFC 5545
// section 3.1).
func unfold(s string) string { return strings.ReplaceAll(s, "\r\n ", "") }
