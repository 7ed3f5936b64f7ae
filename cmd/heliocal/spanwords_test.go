package main

import (
	"encoding/csv"
	"regexp"
	"slices"
	"strings"
	"testing"
)

// The table names a golden or blue hour's span in the words of the feed's
// title for it (feed.SpanWords), one source for both: a night span at
// 78.2° N on 9 April 2026 is "around midnight" in both, not "evening and
// morning in one"; a span through noon of a Sun that does not rise (1
// November 2026) is twilight glow in both. The same query's iCalendar
// (--format ics) has the feed's titles. The spans are those of the feed
// package's TestMergedBandSpans (PyEphem 4.1.4: lower transit 2026-04-09
// 22:59 UT at −3.9481°, upper transits 2026-10-20 10:42 UT at +1.3720° and
// 2026-11-01 10:41 UT at −2.7057°).
func TestTableSpanWordsAsFeed(t *testing.T) {
	summary := regexp.MustCompile(`(?m)^SUMMARY:(?:Golden|Blue) hour \(([^)]*)\)`)
	for _, c := range []struct {
		day   string
		words []string // of the feed's titles, in order
		says  string   // the table's words with the altitude
	}{
		{"2026-04-09", []string{"around midnight", "morning", "around midnight"}, "around midnight, Sun at least −3.95°"},
		{"2026-10-20", []string{"morning", "morning and evening in one", "evening"}, "morning and evening in one, Sun at most 1.37°"},
		{"2026-11-01", []string{"morning", "twilight glow, Sun below the horizon", "evening"}, "twilight glow, Sun below the horizon, Sun at most −2.71°"},
	} {
		args := []string{"events", "--lat", "78.2", "--lon", "15.6", "--tz", "Arctic/Longyearbyen",
			"--from", c.day, "--to", c.day, "--kinds", "golden-hour,blue-hour"}
		code, table, errOut := runCLI(t, args...)
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", c.day, code, errOut)
		}
		code, ics, errOut := runCLI(t, append(args, "--format", "ics")...)
		if code != 0 {
			t.Fatalf("%s --format ics: exit %d: %s", c.day, code, errOut)
		}
		var words []string
		for _, m := range summary.FindAllStringSubmatch(ics, -1) {
			words = append(words, strings.ReplaceAll(m[1], `\,`, ",")) // as RFC 5545 escapes it
		}
		if strings.Join(words, "|") != strings.Join(c.words, "|") {
			t.Errorf("%s: the feed's titles say %q, want %q", c.day, words, c.words)
		}
		for _, w := range words {
			if !strings.Contains(table, ", "+w) {
				t.Errorf("%s: the table lacks the feed's words %q:\n%s", c.day, w, table)
			}
		}
		if !strings.Contains(table, c.says) {
			t.Errorf("%s: the table lacks %q:\n%s", c.day, c.says, table)
		}
		if strings.Contains(table, "evening and morning in one") {
			t.Errorf("%s: the table has words of its own:\n%s", c.day, table)
		}
	}
}

// A band's span of days near a pole ("around the clock") has no single
// highest or lowest altitude of a day to give: the table and the feed write
// none, and JSON and CSV must not either. At 77.8° S, 166.7° E the Sun stays
// between +5° and +40° from 10 November 2026 to 2 February 2027 (local),
// climbing to 35.63° on 22 December (PyEphem 4.1.4, Observer −77.8°
// 166.7°, pressure 0, elevation 0, sampled every 10 min: 35.6337° at
// 2026-12-22 00:55 UT). It enters through +5° at 2026-11-09 13:24:17 UT
// and leaves at 2027-02-01 12:33:07 UT (PyEphem 4.1.4, the same Observer,
// horizon 5°, next_rising and next_setting of the Sun's centre), which
// the checks below hold to the ten seconds. A one-day search over the
// span had written "altitude_deg": 31.8432, neither the highest nor the
// lowest.
func TestAroundTheClockHasNoAltitude(t *testing.T) {
	args := []string{"events", "--lat", "-77.8", "--lon", "166.7", "--tz", "Antarctica/McMurdo",
		"--from", "2026-11-09", "--to", "2027-02-02", "--kinds", "sun-band:5..40"}
	code, table, errOut := runCLI(t, args...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	if !regexp.MustCompile(`(?m)^2026-11-10 Tue  02:24:1\d NZDT  sun-band:5\.\.40  until 01:33:0\d \+84 days \(83 days 23 h 09 min\), around the clock$`).MatchString(table) {
		t.Errorf("the table lacks the span around the clock:\n%s", table)
	}
	code, js, errOut := runCLI(t, append(args, "--format", "json")...)
	if code != 0 {
		t.Fatalf("--format json: exit %d: %s", code, errOut)
	}
	long := regexp.MustCompile(`"start":"2026-11-09T13:24:1\d\.\d+Z","end":"2027-02-01T12:33:0\d\.\d+Z","date":"2026-11-10","part":"all-day"}`)
	if !long.MatchString(js) {
		t.Errorf("JSON: the span around the clock is not as expected (or has an altitude):\n%s", js)
	}
	// the day before, morning and evening meet within the day: its highest
	// altitude stays (PyEphem 4.1.4 as above: 29.00° on 9 November)
	if !strings.Contains(js, `"date":"2026-11-09","part":"all-day","altitude_deg":29.00`) {
		t.Errorf("JSON: the span of 9 November lost its highest altitude:\n%s", js)
	}
	code, csv, errOut := runCLI(t, append(args, "--format", "csv")...)
	if code != 0 {
		t.Fatalf("--format csv: exit %d: %s", code, errOut)
	}
	row := regexp.MustCompile(`(?m)^2026-11-10,sun-band:5\.\.40,.*$`).FindString(csv)
	if f := strings.Split(row, ","); len(f) < 12 || f[10] != "all-day" || f[11] != "" {
		t.Errorf("CSV: the span around the clock has part/altitude %q, want all-day and none", row)
	}
}

// A band's span that the Sun has not left when the listing ends (the
// McMurdo span of TestAroundTheClockHasNoAltitude, listed to 12 November
// 2026 only) ends in JSON and CSV at the end of the listing, which is no
// crossing of the Sun: "open" says so, as the table's "until past the end of
// the listing" does. A closed span has no "open".
func TestOpenSpanMarked(t *testing.T) {
	args := []string{"events", "--lat", "-77.8", "--lon", "166.7", "--tz", "Antarctica/McMurdo",
		"--from", "2026-11-09", "--to", "2026-11-12", "--kinds", "sun-band:5..40"}
	code, table, errOut := runCLI(t, args...)
	if code != 0 || !strings.Contains(table, "until past the end of the listing, around the clock") {
		t.Fatalf("exit %d: %s\n%s", code, errOut, table)
	}
	code, js, errOut := runCLI(t, append(args, "--format", "json")...)
	if code != 0 {
		t.Fatalf("--format json: exit %d: %s", code, errOut)
	}
	// the end of 12 November in Antarctica/McMurdo (NZDT, UTC+13)
	open := regexp.MustCompile(`"start":"2026-11-09T13:24:1\d\.\d+Z","end":"2026-11-12T11:00:00\.000Z","open":true,"date":"2026-11-10"`)
	if !open.MatchString(js) || strings.Count(js, `"open"`) != 1 {
		t.Errorf("JSON: want the span of 10 November, and it alone, open:\n%s", js)
	}
	code, csv, errOut := runCLI(t, append(args, "--format", "csv")...)
	if code != 0 {
		t.Fatalf("--format csv: exit %d: %s", code, errOut)
	}
	lines := strings.Split(strings.TrimSpace(csv), "\n")
	col := slices.Index(strings.Split(lines[0], ","), "open")
	if col < 0 {
		t.Fatalf("CSV: no column open: %s", lines[0])
	}
	for _, l := range lines[1:] {
		f := strings.Split(l, ",")
		want := ""
		if strings.HasPrefix(l, "2026-11-10,") {
			want = "true"
		}
		if len(f) <= col || f[col] != want {
			t.Errorf("CSV: open %q, want %q: %s", f[min(col, len(f)-1)], want, l)
		}
	}
}

// A span of days is as long in the table as in the feed, and in days: the
// McMurdo span from 02:24:17 NZDT on 10 November 2026 to 01:33:07 NZDT on 2
// February 2027 (PyEphem 4.1.4, as in TestAroundTheClockHasNoAltitude) lasts
// 83 days 23 h 08 min 50 s (calendar arithmetic), 83 days 23 h 09 min to
// the minute, not "2015 h 09 min"; the table marks its end "+84 days", the
// feed's description with its date, as a plan's says another date.
func TestSpanOfDaysInDays(t *testing.T) {
	args := []string{"events", "--lat", "-77.8", "--lon", "166.7", "--tz", "Antarctica/McMurdo",
		"--from", "2026-11-10", "--to", "2027-02-02", "--kinds", "sun-band:5..40"}
	code, table, errOut := runCLI(t, args...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	code, ics, errOut := runCLI(t, append(args, "--format", "ics")...)
	if code != 0 {
		t.Fatalf("--format ics: exit %d: %s", code, errOut)
	}
	unfolded := strings.ReplaceAll(ics, "\r\n ", "")
	for what, c := range map[string]struct{ out, end string }{
		"table": {table, "+84 days (83 days 23 h 09 min)"},
		"feed":  {unfolded, "01:33:08 NZDT on Tue 2 Feb (83 days 23 h 09 min)"},
	} {
		if out := c.out; !strings.Contains(out, c.end) || strings.Contains(out, "2015 h") {
			t.Errorf("%s: the span of days is not 83 days 23 h 09 min long:\n%s", what, out)
		}
	}
}

// A feed's entries (--feed) mark the open span of TestOpenSpanMarked as the
// events do: the table's time reads " – past the end of the listing", not the
// end of the listing as a time, and JSON and CSV have "open".
func TestFeedEntryOpenSpanMarked(t *testing.T) {
	cfg := writeConfig(t, `sites:
  - {id: hut, name: Ross Ice Shelf Hut, latitude: -77.8, longitude: 166.7, timezone: Antarctica/McMurdo}
feeds:
  - {id: hut-band, title: Hut band, site: hut, kinds: ["sun-band:5..40"]}
`)
	args := []string{"events", "--config", cfg, "--feed", "hut-band", "--from", "2026-11-09", "--to", "2026-11-11"}
	code, table, errOut := runCLI(t, args...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	if !regexp.MustCompile(`(?m)^2026-11-10 Tue  02:24:1\d NZDT – past the end of the listing  sun-band:5\.\.40  Sun between \+5° and \+40° \(around the clock\)$`).MatchString(table) {
		t.Errorf("the table does not mark the open span:\n%s", table)
	}
	code, js, errOut := runCLI(t, append(args, "--format", "json")...)
	if code != 0 {
		t.Fatalf("--format json: exit %d: %s", code, errOut)
	}
	if !regexp.MustCompile(`"end":"2026-11-11T11:00:00\.000Z","open":true,`).MatchString(js) || strings.Count(js, `"open"`) != 1 {
		t.Errorf("JSON: want the span of 10 November, and it alone, open:\n%s", js)
	}
	code, out, errOut := runCLI(t, append(args, "--format", "csv")...)
	if code != 0 {
		t.Fatalf("--format csv: exit %d: %s", code, errOut)
	}
	rows, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil || len(rows) < 2 {
		t.Fatalf("CSV: %v:\n%s", err, out)
	}
	col := slices.Index(rows[0], "open")
	opens := 0
	for _, r := range rows[1:] {
		if col >= 0 && r[col] == "true" {
			opens++
		}
	}
	if col < 0 || opens != 1 {
		t.Errorf("CSV: column open at %d, %d rows open, want 1:\n%s", col, opens, out)
	}
}

// A date on which no span of a band begins, the one of the date before
// lasting into it, is not "no event" in the table: the band's light goes
// on, as the feed's note says. At 78.2° N, 15.6° E on 29 April 2027 the Sun
// stays between −3° and +3° from the 28th on (the feed package's
// TestSunBandNotesInTheBandsWords, after PyEphem 4.1.4).
func TestTableBandSpanLastsIntoDate(t *testing.T) {
	code, table, errOut := runCLI(t, "events", "--lat", "78.2", "--lon", "15.6", "--tz", "Arctic/Longyearbyen",
		"--from", "2027-04-29", "--to", "2027-04-29", "--kinds", "sun-band:-3..3")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	if !strings.Contains(table, "sun-band:-3..3  no span begins on this date: the one that began before lasts into it") || strings.Contains(table, "no event") {
		t.Errorf("the table:\n%s", table)
	}
}
