package main

import (
	"slices"
	"strings"
	"testing"
	"time"
)

// stretchFeed is a farm at 32.88° S whose kinds entries keep some months
// only. Its day never reaches 15 h: the longest is 14 h 19.5 min, on 22
// December 2026; and it is 14 h or more from 24 November 2026 (14 h 0.9
// min; 23 November 13 h 59.6 min) through 19 January 2027 (14 h 0.2 min;
// 20 January 13 h 58.9 min). Source: PyEphem 4.1.4, Observer -32.88°
// 151.7°, elevation 0, pressure 0, horizon -0:50, use_center=True, sunrise
// to sunset of the local date in Australia/Sydney (UTC+11).
const stretchFeed = `sites:
  - {id: farm, latitude: -32.88, longitude: 151.7, timezone: Australia/Sydney}
feeds:
  - id: lamps
    site: farm
    kinds:
      - {kind: "photoperiod:15h", months: [jan]}
      - {kind: "lighting:14h", months: [MONTHS]}
`

// noteOf is a note of events --feed's JSON: its date, kind and title.
type noteOf struct{ Date, Kind, Title string }

// feedNotes runs events --feed lamps of stretchFeed, lighting kept in
// months, over from..to as JSON, and returns its notes.
func feedNotes(t *testing.T, months, from, to string) []noteOf {
	t.Helper()
	cfg := writeConfig(t, strings.Replace(stretchFeed, "MONTHS", months, 1))
	var doc struct {
		Entries []struct {
			noteOf
			Note bool
		}
	}
	runJSON(t, &doc, "-c", cfg, "events", "--feed", "lamps", "--format", "json", "--from", from, "--to", to)
	var out []noteOf
	for _, e := range doc.Entries {
		if e.Note {
			out = append(out, e.noteOf)
		}
	}
	return out
}

// A stretch's note whose date a kinds entry's months leave out goes on the
// first date of the stretch they keep: the photoperiod's, on the window's
// first date, and lighting's "No lamps needed", on 24 November, both on 1
// January; lighting's words stay those of the whole stretch, and the
// photoperiod's say that its longest day (22 December) is not in the
// months it keeps.
func TestStretchNoteMovedToKeptDate(t *testing.T) {
	got := feedNotes(t, "jan, feb", "2026-11-01", "2027-03-01")
	want := []noteOf{
		{"2027-01-01", "photoperiod:15h", "Day length stays below 15 h from 1 November to 1 March 2027 (longest 14 h 20 min, 22 December, outside the months this feed keeps)"},
		{"2027-01-01", "lighting:14h", "No lamps needed until 20 Jan: the natural day is ≥ 14 h"},
	}
	if !slices.Equal(got, want) {
		t.Errorf("notes %q\nwant %q", got, want)
	}
}

// Over two chunks computed apart (2026-07-01..2026-12-31, 184 dates, and
// 2027) the stretch of 24 November to 19 January has one note: on 1 January
// when December is left out, on 1 December when it is kept (not again on 1
// January); none when no date of it is kept.
func TestStretchNoteAcrossChunks(t *testing.T) {
	for _, c := range []struct {
		months string
		want   []noteOf
	}{
		{"jan, feb", []noteOf{
			{"2027-01-01", "photoperiod:15h", "Day length never reaches 15 h here (longest 14 h 20 min, 22 December, outside the months this feed keeps)"},
			{"2027-01-01", "lighting:14h", "No lamps needed until 20 Jan: the natural day is ≥ 14 h"},
		}},
		{"dec, jan", []noteOf{
			{"2026-12-01", "lighting:14h", "No lamps needed until 20 Jan: the natural day is ≥ 14 h"},
			{"2027-01-01", "photoperiod:15h", "Day length never reaches 15 h here (longest 14 h 20 min, 22 December, outside the months this feed keeps)"},
		}},
		{"mar", []noteOf{
			{"2027-01-01", "photoperiod:15h", "Day length never reaches 15 h here (longest 14 h 20 min, 22 December, outside the months this feed keeps)"},
		}},
	} {
		if got := feedNotes(t, c.months, "2026-07-01", "2027-06-30"); !slices.Equal(got, c.want) {
			t.Errorf("months %s: notes %q\nwant %q", c.months, got, c.want)
		}
	}
}

// The feed as published (events --feed as iCalendar, built whole) has the
// same notes on 1 January, lighting's description telling the whole
// stretch.
func TestStretchNoteMovedInFeed(t *testing.T) {
	cfg := writeConfig(t, strings.Replace(stretchFeed, "MONTHS", "jan, feb", 1))
	code, out, errOut := runCLI(t, "-c", cfg, "events", "--feed", "lamps", "--format", "ics", "--from", "2026-11-01", "--to", "2027-03-01")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	unfolded := strings.ReplaceAll(strings.ReplaceAll(out, "\r\n ", ""), "\r\n", "\n")
	var notes []string
	for _, ev := range strings.Split(unfolded, "BEGIN:VEVENT\n")[1:] {
		if !strings.Contains(ev, "DTSTART;VALUE=DATE:") {
			continue
		}
		var date, summary, desc string
		for _, l := range strings.Split(ev, "\n") {
			switch {
			case strings.HasPrefix(l, "DTSTART;VALUE=DATE:"):
				date = strings.TrimPrefix(l, "DTSTART;VALUE=DATE:")
			case strings.HasPrefix(l, "SUMMARY:"):
				summary = strings.TrimPrefix(l, "SUMMARY:")
			case strings.HasPrefix(l, "DESCRIPTION:"):
				desc = strings.TrimPrefix(l, "DESCRIPTION:")
			}
		}
		notes = append(notes, date+" "+summary)
		if strings.HasPrefix(summary, "No lamps") && !strings.Contains(desc, `from Tuesday 24 November 2026\; lamps are needed again from Wednesday 20 January 2027.`) {
			t.Errorf("lighting note's description %q", desc)
		}
	}
	want := []string{
		`20270101 Day length stays below 15 h from 1 November to 1 March 2027 (longest 14 h 20 min\, 22 December\, outside the months this feed keeps)`,
		`20270101 No lamps needed until 20 Jan: the natural day is ≥ 14 h`,
	}
	if !slices.Equal(notes, want) {
		t.Errorf("all-day entries %q\nwant %q", notes, want)
	}
}

// check warns of a photoperiod no date crosses whatever the months its
// entry keeps, in the words it has without them: also when the window
// (4-24 December) has no date of those months and the feed shows nothing
// of the kind.
func TestStretchNoteCheckWarning(t *testing.T) {
	now := time.Date(2026, 12, 4, 0, 0, 0, 0, time.UTC) // 11:00 in Sydney
	short := strings.Replace(stretchFeed, "    site: farm\n", "    site: farm\n    days_back: 0\n    days_ahead: 20\n", 1)
	const title = `feed "lamps": photoperiod:15h: Day length stays below 15 h from 4 December to 24 December 2026 (longest 14 h 20 min, 22 December); `
	for _, c := range []struct {
		cfg, want string
	}{
		{strings.Replace(short, "months: [jan]", "months: []", 1), title + "the feed shows only this note for it"},
		{short, title + "the feed shows nothing for it: its months, weekdays or dates keep no date of the window"},
	} {
		r := checkReportOf(t, strings.Replace(c.cfg, "MONTHS", "jan", 1), now)
		if len(r.Warnings) != 1 || r.Warnings[0] != c.want {
			t.Errorf("warnings:\n%s\nwant:\n%s", strings.Join(r.Warnings, "\n"), c.want)
		}
	}
	r := checkReportOf(t, strings.Replace(stretchFeed, "MONTHS", "jan", 1), now)
	want := `feed "lamps": photoperiod:15h: Day length never reaches 15 h here (longest 14 h 20 min, 22 December); the feed shows only this note for it`
	if len(r.Warnings) != 1 || r.Warnings[0] != want {
		t.Errorf("default window: warnings:\n%s\nwant:\n%s", strings.Join(r.Warnings, "\n"), want)
	}
}
