package main

import (
	"encoding/json"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"
)

// The preview's "no lamps needed" note says what the subscribed feed says
// on the same dates, not the end of the preview's seven days. At 48.2° N a
// natural day of 16 h or more lasts from 11 June to 1 July 2027 (PyEphem
// 4.1.4, tools/pyephem-checks/values.py), so a preview from 20 June lies
// inside the stretch: the feed from that date, as long as the preview's
// subscription, titles its first date "No lamps needed until 2 Jul" or so,
// where the preview alone would have said "through 26 Jun". At 69.65° N
// (Tromsø) days of 16 h or more last from 15 April to 28 August 2027
// (PyEphem 4.1.4, values.py): from 20 May the note looks three months
// ahead, and names a date in August.
func TestPreviewLampsNoteAsFed(t *testing.T) {
	ts := builderServer(t)
	for _, tc := range []struct{ place, start, month string }{
		{"lat=48.2&lon=16.4&tz=Europe/Vienna", "2027-06-20", "Jul"},
		{"lat=69.65&lon=18.96&tz=Europe/Oslo", "2027-05-20", "Aug"},
	} {
		q := tc.place + "&kinds=lighting:16h&start=" + tc.start
		subscribeDays, preview, fed := previewAndFed(t, ts.URL, q, tc.start)
		if subscribeDays <= 7 || len(fed) != 1 || !strings.HasPrefix(fed[0], tc.start+" No lamps needed until ") || !strings.Contains(fed[0], " "+tc.month+":") {
			t.Fatalf("%s: subscription of %d days, the feed's first date %q: want a note of the stretch saying until when, in %s",
				q, subscribeDays, fed, tc.month)
		}
		if len(preview) != 1 || preview[0] != fed[0] {
			t.Errorf("%s: preview %q, want the feed's %q", q, preview, fed[0])
		}
	}
}

// At 71.29° N (Utqiaġvik) a natural day of 12 h or more lasts from 18 March
// to 24 September 2027 (PyEphem 4.1.4, tools/pyephem-checks/values.py).
// With a dozen kinds the subscription is shorter than a year: from 3 April
// it ends before the stretch does, and the feed's note from that date says
// so, "No lamps needed through" its own last date; from 20 May it ends
// after, and the note names a date in September (25 September, the first
// that needs lamps again). The preview says what the feed says in both.
func TestPreviewLampsNoteSubscriptionEnd(t *testing.T) {
	ts := builderServer(t)
	const kinds = "lighting:12h,sunrise,sunset,civil-dawn,civil-dusk,golden-hour,blue-hour,moonrise,moonset,solar-noon,nautical-dawn,nautical-dusk"
	for _, tc := range []struct {
		start   string
		through bool // the note lasts through the feed's last date
	}{
		{"2027-04-03", true},
		{"2027-05-20", false},
	} {
		q := "lat=71.29&lon=-156.8&tz=America/Anchorage&kinds=" + kinds + "&start=" + tc.start
		subscribeDays, preview, fed := previewAndFed(t, ts.URL, q, tc.start)
		start, err := time.Parse(time.DateOnly, tc.start)
		if err != nil {
			t.Fatal(err)
		}
		want := tc.start + " No lamps needed until "
		if last := start.AddDate(0, 0, subscribeDays-1); tc.through {
			want = tc.start + " No lamps needed through " + last.Format("2 Jan") + ":"
		}
		other := func(e string) bool { return !strings.Contains(e, " No lamps needed ") }
		note := slices.DeleteFunc(fed, other)
		if subscribeDays <= 7 || subscribeDays >= 365 || len(note) != 1 || !strings.HasPrefix(note[0], want) || !tc.through && !strings.Contains(note[0], " Sep:") {
			t.Fatalf("%s: subscription of %d days, the feed's notes %q: want one starting %q", q, subscribeDays, note, want)
		}
		if preview = slices.DeleteFunc(preview, other); !slices.Contains(preview, note[0]) {
			t.Errorf("%s: preview's notes %q, want the feed's %q", q, preview, note[0])
		}
	}
}

// previewAndFed gets the preview of q, whose start is start, and the
// subscribed feed over the same dates: the preview's subscription days, its
// entries' titles ("2027-06-20 No lamps needed until …") and the SUMMARY of
// each of the feed's all-day entries on start.
func previewAndFed(t *testing.T, url, q, start string) (subscribeDays int, preview, fed []string) {
	t.Helper()
	var res struct {
		SubscribeDays int `json:"subscribe_days"`
		Days          []struct {
			Date    string
			Entries []struct{ Kind, Title string }
		}
	}
	if err := json.Unmarshal([]byte(getOK(t, url+"/at.json?"+q)), &res); err != nil {
		t.Fatal(err)
	}
	for _, d := range res.Days {
		for _, e := range d.Entries {
			preview = append(preview, d.Date+" "+e.Title)
		}
	}
	ics := getOK(t, url+"/at.ics?"+q+"&days="+strconv.Itoa(res.SubscribeDays))
	for ev := range strings.SplitSeq(ics, "BEGIN:VEVENT") {
		if strings.Contains(ev, "DTSTART;VALUE=DATE:"+strings.ReplaceAll(start, "-", "")) {
			for line := range strings.SplitSeq(unfold(ev), "\r\n") {
				if s, ok := strings.CutPrefix(line, "SUMMARY:"); ok {
					fed = append(fed, start+" "+strings.ReplaceAll(s, `\,`, ","))
				}
			}
		}
	}
	return res.SubscribeDays, preview, fed
}

// unfold joins the folded content lines of an iCalendar text (RFC 5545
// section 3.1).
func unfold(s string) string { return strings.ReplaceAll(s, "\r\n ", "") }
