package main

import (
	"encoding/csv"
	"encoding/json"
	"os"
	"path/filepath"
	"reflect"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"
)

// `events --feed ID --format ics` over the feed's own window gives the same
// bytes as the published file, for feeds with lighting, plans, filters and
// per-entry alarms (the weddings feed: kinds kept on listed dates).
func TestEventsFeedICSEqualsPublished(t *testing.T) {
	dir := t.TempDir()
	if code, _, errOut := runCLI(t, "publish", "--out", dir); code != 0 {
		t.Fatalf("publish: exit %d: %s", code, errOut)
	}
	for _, id := range []string{"fernhollow-lamps", "cairnmoor-twilight", "fernhollow-year", "skarvlia-evening", "skarvlia-weddings"} {
		code, out, errOut := runCLI(t, "events", "--feed", id, "--format", "ics")
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", id, code, errOut)
		}
		want, err := os.ReadFile(filepath.Join(dir, id+".ics"))
		if err != nil {
			t.Fatal(err)
		}
		if out != string(want) {
			t.Errorf("%s: events --format ics differs from the published feed (%d vs %d bytes)", id, len(out), len(want))
		}
	}
}

// A feed that service.oversize: trim shortens is listed whole by `events
// --feed`, over its whole window; the published file stops at the date
// check names (trimmed_to) and holds the listing's entries up to it.
func TestEventsFeedTrimmedListedWhole(t *testing.T) {
	cfg := writeConfig(t, strings.Replace(meadowOversize, "max_feed_bytes: 20000\n", "max_feed_bytes: 20000\n  oversize: trim\n", 1))
	dir := t.TempDir()
	if code, _, errOut := runCLI(t, "publish", "--config", cfg, "--out", dir); code != 0 {
		t.Fatalf("publish: exit %d: %s", code, errOut)
	}
	published, err := os.ReadFile(filepath.Join(dir, "meadow.ics"))
	if err != nil {
		t.Fatal(err)
	}
	code, out, errOut := runCLI(t, "check", "--config", cfg, "--format", "json")
	var report struct {
		Feeds []struct {
			TrimmedTo string `json:"trimmed_to"`
		}
	}
	if err := json.Unmarshal([]byte(out), &report); code != 0 || err != nil || len(report.Feeds) != 1 || report.Feeds[0].TrimmedTo == "" {
		t.Fatalf("check: exit %d, %v, %s%s", code, err, out, errOut)
	}
	to := report.Feeds[0].TrimmedTo
	code, out, errOut = runCLI(t, "events", "--config", cfg, "--feed", "meadow", "--format", "json")
	if code != 0 {
		t.Fatalf("events: exit %d: %s", code, errOut)
	}
	var listed struct {
		Entries []struct{ Date string }
	}
	if err := json.Unmarshal([]byte(out), &listed); err != nil || len(listed.Entries) == 0 {
		t.Fatalf("events: %v, %d entries", err, len(listed.Entries))
	}
	upTo := 0
	for _, e := range listed.Entries {
		if e.Date <= to {
			upTo++
		}
	}
	// days_back 0, days_ahead 200: the window ends 200 days after today in
	// the site's zone (a day either side: the test may run across midnight)
	last := time.Now().In(mustZone(t, "Europe/Zurich")).AddDate(0, 0, 200)
	got, err := time.Parse(time.DateOnly, listed.Entries[len(listed.Entries)-1].Date)
	if d := got.Sub(time.Date(last.Year(), last.Month(), last.Day(), 0, 0, 0, 0, time.UTC)); err != nil || d < -24*time.Hour || d > 24*time.Hour || got.Format(time.DateOnly) <= to {
		t.Errorf("events --feed ends on %s; want the window's end %s, past the published %s", got.Format(time.DateOnly), last.Format(time.DateOnly), to)
	}
	if n := strings.Count(string(published), "BEGIN:VEVENT"); n != upTo || n >= len(listed.Entries) {
		t.Errorf("published %d events, the listing %d up to %s and %d in all", n, upTo, to, len(listed.Entries))
	}
	starts := regexp.MustCompile(`(?m)^DTSTART;TZID=Europe/Zurich:(\d{4})(\d\d)(\d\d)T`).FindAllStringSubmatch(string(published), -1)
	if len(starts) == 0 {
		t.Fatal("no DTSTART in the published feed")
	}
	if m := starts[len(starts)-1]; m[1]+"-"+m[2]+"-"+m[3] != to {
		t.Errorf("the published feed's last date %s-%s-%s, check's trimmed_to %s", m[1], m[2], m[3], to)
	}
}

const alarmConfig = `
sites:
  - id: yard
    latitude: 48.2
    longitude: 16.4
    timezone: Europe/Vienna
feeds:
  - id: yard-sun
    site: yard
    alarm: 10m
    kinds:
      - sunset                 # the feed's alarm
      - kind: sunrise
        alarm: 0s              # none
      - kind: civil-dusk
        alarm: 1h
      - daily-summary          # all-day: never an alarm
    plans:
      - title: Feed the hens
        date: every day
        start: "20:00"
        alarm: 2h
      - title: Lock the barn
        date: every day
        start: civil-dusk+15m  # the feed's alarm
      - title: Market day
        date: every saturday   # all-day
        alarm: 1h
`

func writeConfig(t *testing.T, text string) string {
	t.Helper()
	p := filepath.Join(t.TempDir(), "heliocal.yaml")
	if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// Alarms go only where asked: per kinds entry and plan, else the feed's,
// never on all-day entries (RFC 5545 VALARM with a relative TRIGGER).
func TestAlarmsOnlyWhereAsked(t *testing.T) {
	cfg := writeConfig(t, alarmConfig)
	// 2027-01-04..10: seven dates, one Saturday (9 January 2027)
	code, out, errOut := runCLI(t, "--config", cfg, "events", "--feed", "yard-sun", "--from", "2027-01-04", "--to", "2027-01-10", "--format", "ics")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	count := func(s string) int { return strings.Count(out, s) }
	if n := count("BEGIN:VEVENT"); n != 7*6+1 {
		t.Errorf("%d events, want %d", n, 7*6+1)
	}
	for _, tc := range []struct {
		line string
		want int
	}{
		{"BEGIN:VALARM", 28},          // sunset, civil dusk, two timed plans: 4 × 7
		{"TRIGGER:-PT10M", 14},        // sunset and "Lock the barn"
		{"TRIGGER:-PT1H\r\n", 7},      // civil dusk
		{"TRIGGER:-PT2H\r\n", 7},      // "Feed the hens"
		{"SUMMARY:Market day\r\n", 1}, // all-day plan, no alarm (counted above)
		{"SUMMARY:Feed the hens\r\n", 7},
	} {
		if n := count(tc.line); n != tc.want {
			t.Errorf("%q: %d, want %d", strings.TrimSpace(tc.line), n, tc.want)
		}
	}
	// every VALARM sits in a timed event
	for _, ev := range strings.Split(out, "BEGIN:VEVENT")[1:] {
		if strings.Contains(ev, "VALUE=DATE") && strings.Contains(ev, "VALARM") {
			t.Errorf("all-day event with an alarm:\n%s", ev)
		}
	}
}

// The JSON of a feed's entries: plans with date, start and end (all-day
// plans with a date and no start), lighting periods with part and lamp_s.
func TestEventsFeedJSON(t *testing.T) {
	code, out, errOut := runCLI(t, "events", "--feed", "fernhollow-lamps", "--from", "2027-01-10", "--to", "2027-01-10", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var doc struct {
		Entries []map[string]any `json:"entries"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	lamps := 0
	for _, e := range doc.Entries {
		if !strings.HasPrefix(e["kind"].(string), "lighting:") {
			continue
		}
		lamps++
		start, _ := time.Parse(time.RFC3339, e["start"].(string))
		end, _ := time.Parse(time.RFC3339, e["end"].(string))
		if e["date"] != "2027-01-10" || e["part"] == nil || e["lamp_s"] == nil ||
			int(e["lamp_s"].(float64)+0.5) != int(end.Sub(start).Seconds()+0.5) {
			t.Errorf("lighting entry %v", e)
		}
	}
	if lamps != 3 { // 16 h in the evening; 14 h 30 min morning and evening
		t.Errorf("%d lamp periods, want 3:\n%s", lamps, out)
	}

	code, out, errOut = runCLI(t, "events", "--feed", "fernhollow-year", "--from", "2027-04-25", "--to", "2027-06-30", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	doc.Entries = nil
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	var plans []map[string]any
	for _, e := range doc.Entries {
		if e["kind"] == "plan" {
			plans = append(plans, e)
		}
	}
	// 25 April: the frost date, all-day; the open farm day: the Sunday after
	// the June solstice of 21 June 2027 (USNO seasons), 27 June.
	if len(plans) != 2 || plans[0]["date"] != "2027-04-25" || plans[0]["start"] != nil ||
		plans[1]["date"] != "2027-06-27" || plans[1]["start"] == nil || plans[1]["end"] == nil || plans[1]["title"] != "Open farm day" {
		t.Errorf("plans %v", plans)
	}
}

// CSV carries the details JSON has, and local times never end in "Z",
// also for a site in UTC.
func TestEventsCSVLocalTimes(t *testing.T) {
	code, out, errOut := runCLI(t, "events", "--lat", "51.48", "--lon", "0", "--tz", "UTC", "--from", "2027-01-10", "--to", "2027-01-11",
		"--kinds", "sunrise,daily-summary,lighting:16h,golden-hour,moonrise,solar-noon", "--format", "csv")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	rows, col := csvByHeader(t, out)
	for _, h := range []string{"start_local", "end_local", "part", "day_length_s", "day_change_s", "illuminated", "altitude_deg", "lamp_s"} {
		if _, ok := col[h]; !ok {
			t.Fatalf("no column %q in %v", h, rows[0])
		}
	}
	seen := map[string]bool{}
	for _, r := range rows[1:] {
		for _, c := range []string{"start_local", "end_local"} {
			if v := r[col[c]]; v != "" && (strings.HasSuffix(v, "Z") || !strings.HasSuffix(v, "+00:00")) {
				t.Errorf("%s %q", c, v)
			}
		}
		for _, c := range []string{"day_change_s", "lamp_s", "illuminated", "altitude_deg", "part"} {
			if r[col[c]] != "" {
				seen[c] = true
			}
		}
	}
	if len(seen) != 5 {
		t.Errorf("details seen: %v", seen)
	}
	code, out, _ = runCLI(t, "events", "--feed", "fernhollow-lamps", "--from", "2027-01-10", "--to", "2027-01-10", "--format", "csv")
	rows, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if code != 0 || err != nil || len(rows) != 4 {
		t.Fatalf("feed CSV (exit %d, %v): %s", code, err, out)
	}
	for _, r := range rows[1:] {
		for i, h := range rows[0] {
			if strings.HasSuffix(h, "_local") && !strings.HasSuffix(r[i], "+01:00") {
				t.Errorf("%s %q", h, r[i])
			}
		}
	}
}

// Every field of the JSON form of events and notes, and of a feed's
// entries, has its CSV column.
func TestEventsCSVHasEveryJSONField(t *testing.T) {
	cols := map[string]bool{}
	for _, c := range eventsCSVHeader {
		cols[strings.TrimSuffix(c, "_utc")] = true
	}
	checkCSVColumns(t, cols, reflect.TypeFor[jsonEvent](), reflect.TypeFor[jsonEclipse](), reflect.TypeFor[jsonNote]())
	cols = map[string]bool{}
	for _, c := range entriesCSVHeader {
		cols[strings.TrimSuffix(c, "_utc")] = true
	}
	checkCSVColumns(t, cols, reflect.TypeFor[jsonEntry](), reflect.TypeFor[jsonEclipse]())
}

func checkCSVColumns(t *testing.T, cols map[string]bool, types ...reflect.Type) {
	t.Helper()
	for _, typ := range types {
		for i := range typ.NumField() {
			name, _, _ := strings.Cut(typ.Field(i).Tag.Get("json"), ",")
			if name == "" || name == "-" {
				continue // the embedded eclipse fields, checked on their own
			}
			if !cols[name] {
				t.Errorf("JSON field %q of %s has no CSV column", name, typ.Name())
			}
		}
	}
}

// Over a skyline, the hours of direct Sun are direct_sun_s (in place of
// day_length_s) on sunrise, sunset and the daily summary alike, in the
// events of the kinds and in a feed's entries, JSON and CSV, with the same
// value for the same date.
func TestDirectSunInEveryForm(t *testing.T) {
	args := []string{"--from", "2027-01-10", "--to", "2027-01-10"}
	code, out, errOut := runCLI(t, append([]string{"events", "--feed", "brackenfold-sun", "--format", "json"}, args...)...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var doc struct {
		Entries []map[string]any `json:"entries"`
		Events  []map[string]any `json:"events"`
		Site    struct {
			Skyline [][2]float64 `json:"skyline"`
		} `json:"site"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	direct := map[string]float64{}
	for _, e := range doc.Entries {
		k := e["kind"].(string)
		if k != "sunrise" && k != "sunset" && k != "daily-summary" {
			continue
		}
		v, ok := e["direct_sun_s"].(float64)
		if !ok || e["day_length_s"] != nil {
			t.Errorf("feed entry %s: direct_sun_s %v, day_length_s %v", k, e["direct_sun_s"], e["day_length_s"])
		}
		direct[k] = v
	}
	if len(direct) != 3 || direct["sunrise"] != direct["daily-summary"] || direct["sunset"] != direct["sunrise"] {
		t.Fatalf("direct Sun per kind in the feed: %v", direct)
	}
	if sk := doc.Site.Skyline; len(sk) != 8 || sk[3] != [2]float64{176, 25} { // config/demo.yaml
		t.Errorf("site skyline %v", sk)
	}
	code, out, errOut = runCLI(t, append([]string{"events", "--site", "brackenfold", "--kinds", "sunrise,daily-summary", "--format", "json"}, args...)...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	for _, e := range doc.Events {
		if v, ok := e["direct_sun_s"].(float64); !ok || v != direct["sunrise"] || e["day_length_s"] != nil {
			t.Errorf("event %s: direct_sun_s %v (feed %v), day_length_s %v", e["kind"], e["direct_sun_s"], direct["sunrise"], e["day_length_s"])
		}
	}
	if len(doc.Events) != 2 {
		t.Errorf("%d events, want sunrise and the summary", len(doc.Events))
	}
	// the table says what the length is
	code, out, errOut = runCLI(t, append([]string{"events", "--site", "brackenfold", "--kinds", "sunrise,daily-summary"}, args...)...)
	if code != 0 || strings.Count(out, "direct Sun 5 h") != 2 || strings.Contains(out, "day length") {
		t.Errorf("table (exit %d, %s):\n%s", code, errOut, out)
	}
	for _, a := range [][]string{{"--feed", "brackenfold-sun"}, {"--site", "brackenfold", "--kinds", "sunrise,sunset,daily-summary"}} {
		code, out, errOut = runCLI(t, append(append([]string{"events", "--format", "csv"}, a...), args...)...)
		rows, err := csv.NewReader(strings.NewReader(out)).ReadAll()
		if code != 0 || err != nil {
			t.Fatalf("%v: exit %d, %v: %s", a, code, err, errOut)
		}
		col := map[string]int{}
		for i, h := range rows[0] {
			col[h] = i
		}
		n := 0
		for _, r := range rows[1:] {
			if k := r[col["kind"]]; k == "sunrise" || k == "sunset" || k == "daily-summary" {
				n++
				if v, _ := strconv.ParseFloat(r[col["direct_sun_s"]], 64); v != direct["sunrise"] || r[col["day_length_s"]] != "" {
					t.Errorf("%v CSV %s: direct_sun_s %q day_length_s %q", a, k, r[col["direct_sun_s"]], r[col["day_length_s"]])
				}
			}
		}
		if n != 3 {
			t.Errorf("%v CSV: %d rows of sunrise, sunset and the summary", a, n)
		}
	}
}

// --horizon takes a skyline too: azimuth:altitude points, or a CSV file in
// the working directory; the events equal those of a configured site with
// the same skyline (the demo's brackenfold), and bad values exit 2 naming
// --horizon and the value.
func TestEventsHorizonSkylineFlag(t *testing.T) {
	args := []string{"events", "--kinds", "sunrise,sunset,sun-hidden", "--from", "2027-12-20", "--to", "2027-12-21", "--format", "json"}
	_, want, _ := runCLI(t, append(args, "--site", "brackenfold")...)
	place := []string{"--lat", "47.05", "--lon", "11.2", "--elev", "900", "--temperature", "-5", "--tz", "Europe/Vienna"}
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "ridge.csv"), []byte("azimuth,altitude\n0,3\n100,12\n150,4\n176,25\n184,25\n190,4\n260,15\n300,3\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	t.Chdir(dir)
	events := func(out string) []string {
		var doc struct {
			Events []struct{ Kind, Start, End string }
		}
		if err := json.Unmarshal([]byte(out), &doc); err != nil {
			t.Fatalf("%v: %s", err, out)
		}
		var s []string
		for _, e := range doc.Events {
			s = append(s, e.Kind+" "+e.Start+" "+e.End)
		}
		return s
	}
	w := events(want)
	if len(w) != 6 { // sunrise, the noon Sun behind the 25° peak, sunset; two dates
		t.Fatalf("brackenfold: %v", w)
	}
	for _, h := range []string{"0:3,100:12,150:4,176:25,184:25,190:4,260:15,300:3", "ridge.csv"} {
		code, out, errOut := runCLI(t, append(append(args, place...), "--horizon", h)...)
		if got := events(out); code != 0 || !slices.Equal(got, w) {
			t.Errorf("--horizon %s (exit %d, %s): %v, want %v", h, code, errOut, got, w)
		}
	}
	for h, want := range map[string]string{
		"50": "--horizon: 50: must be within -5..45 degrees (the altitude of the visible skyline in degrees: 0 for a flat horizon, 2 behind low hills)",
		// a point named by its place in the list and as written, as an
		// ad-hoc feed's horizon parameter names it
		"0:2,90:x":      `--horizon: "0:2,90:x": point 2 (90:x): must be azimuth:altitude`,
		"0:2,90:60":     `--horizon: "0:2,90:60": point 2 (90:60): altitude must be within -5..45 degrees`,
		"missing.csv":   "--horizon: missing.csv: no such skyline file",
		"0:2,360:3,0:4": `--horizon: "0:2,360:3,0:4": point 2 (360:3): azimuth 0 given twice, also at point 1:`,
	} {
		code, _, errOut := runCLI(t, "events", "--lat", "47", "--lon", "11", "--tz", "UTC", "--horizon", h)
		if code != exitInput || !strings.Contains(errOut, want) {
			t.Errorf("--horizon %s: exit %d, %q, want %q", h, code, errOut, want)
		}
	}
}

// A day length of 0 (polar night) and a change of 0 from the day before
// (polar night or midnight Sun on both dates) are values, written as 0 in
// the JSON and CSV of events with --kinds and with --feed alike, not left
// out as if unknown. At 78.2° N, 15.6° E the Sun stays below the horizon on
// 31 December 2026 and 1 January 2027 and above it on 31 May and 1 June
// 2027 (PyEphem 4.1.4, upper limb, 34′ refraction: next_rising raises
// NeverUpError and AlwaysUpError on those dates).
func TestZeroDayLengthAndChangeWritten(t *testing.T) {
	const cfgText = `sites:
  - {id: isfjord-hut, latitude: 78.2, longitude: 15.6, timezone: Arctic/Longyearbyen}
feeds:
  - id: hut-day
    site: isfjord-hut
    kinds: [daily-summary, "lighting:16h"]
`
	cfg := writeConfig(t, cfgText)
	for _, tc := range []struct {
		date      string
		dayLength float64
	}{{"2027-01-01", 0}, {"2027-06-01", 86400}} {
		for _, args := range [][]string{
			{"events", "--lat", "78.2", "--lon", "15.6", "--tz", "Arctic/Longyearbyen", "--kinds", "daily-summary,lighting:16h"},
			{"--config", cfg, "events", "--feed", "hut-day"},
		} {
			args = append(args, "--from", tc.date, "--to", tc.date, "--format", "json")
			code, out, errOut := runCLI(t, args...)
			if code != 0 {
				t.Fatalf("%v: exit %d: %s", args, code, errOut)
			}
			var doc struct {
				Events  []map[string]any `json:"events"`
				Entries []map[string]any `json:"entries"`
			}
			if err := json.Unmarshal([]byte(out), &doc); err != nil {
				t.Fatalf("%v: %v\n%s", args, err, out)
			}
			summaries, lamps := 0, 0
			for _, e := range append(doc.Events, doc.Entries...) {
				if e["note"] == true { // --feed: the all-day note of dates that need no lamps
					continue
				}
				switch e["kind"] {
				case "daily-summary":
					summaries++
					if e["day_length_s"] != tc.dayLength || e["day_change_s"] != 0.0 {
						t.Errorf("%v: daily summary %v, want day_length_s %v and day_change_s 0", args, e, tc.dayLength)
					}
				case "lighting:16h":
					lamps++
					if e["day_length_s"] != 0.0 {
						t.Errorf("%v: lamps %v, want day_length_s 0", args, e)
					}
				}
			}
			if wantLamps := map[bool]int{true: 1, false: 0}[tc.dayLength == 0]; summaries != 1 || lamps != wantLamps {
				t.Errorf("%v: %d summaries and %d lamp periods, want 1 and %d:\n%s", args, summaries, lamps, wantLamps, out)
			}
			csvArgs := append(args[:len(args)-1:len(args)-1], "csv")
			code, out, errOut = runCLI(t, csvArgs...)
			rows, err := csv.NewReader(strings.NewReader(out)).ReadAll()
			if code != 0 || err != nil || len(rows) < 2 {
				t.Fatalf("%v: exit %d, %v: %s%s", csvArgs, code, err, out, errOut)
			}
			col := map[string]int{}
			for i, h := range rows[0] {
				col[h] = i
			}
			for _, r := range rows[1:] {
				if r[col["kind"]] == "daily-summary" && (r[col["day_length_s"]] == "" || r[col["day_change_s"]] != "0") {
					t.Errorf("%v: CSV daily summary %v", csvArgs, r)
				}
			}
		}
	}
}

// A night whose dark windows are all shorter than min_duration is a note
// in `events --feed`, its JSON and CSV state "under-min-duration": at
// 50° N, 10° E the only window of the night of 12–13 May 2027 runs from
// moonset at 00:37:00 UTC to astronomical dawn at 00:59:42 UTC, 22.70 min
// (PyEphem 4.1.4: pressure 0, the Moon's upper limb at −34′, the Sun's
// centre at −18°).
func TestEventsFeedUnderMinimumNote(t *testing.T) {
	cfg := writeConfig(t, `
sites:
  - id: mid
    latitude: 50
    longitude: 10
    timezone: Europe/Berlin
feeds:
  - id: dark
    site: mid
    kinds:
      - kind: dark-window
        min_duration: 45m
`)
	const title = "No dark sky of 45 min or more on the night of 12–13 May 2027: the longest dark window is 23 min"
	code, out, errOut := runCLI(t, "--config", cfg, "events", "--feed", "dark", "--from", "2027-05-12", "--to", "2027-05-12", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var got struct{ Entries []jsonEntry }
	if err := json.Unmarshal([]byte(out), &got); err != nil {
		t.Fatal(err)
	}
	if len(got.Entries) != 1 || got.Entries[0].Title != title || !got.Entries[0].Note || got.Entries[0].State != "under-min-duration" || !got.Entries[0].AllDay {
		t.Errorf("json entries %+v, want one note %q, state under-min-duration", got.Entries, title)
	}
	code, out, errOut = runCLI(t, "--config", cfg, "events", "--feed", "dark", "--from", "2027-05-12", "--to", "2027-05-12", "--format", "csv")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	rows, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	state, titleCol := slices.Index(rows[0], "state"), slices.Index(rows[0], "title")
	if len(rows) != 2 || rows[1][state] != "under-min-duration" || rows[1][titleCol] != title {
		t.Errorf("csv rows %q, want one note, state under-min-duration", rows)
	}
}

// A date the clocks skip is left out over a long window that also holds a
// jump back a day, in `heliocal events --feed` and in `heliocal events`
// (zdump -v Pacific/Kwajalein: from +11 to −12 on 30 September 1969, then
// from 23:59:59 on 20 August 1993, −12, to 00:00 on the 22nd, +12).
func TestEventsLongWindowSkippedDate(t *testing.T) {
	cfg := writeConfig(t, `sites:
  - id: atoll
    latitude: 8.72
    longitude: 167.73
    timezone: Pacific/Kwajalein
feeds:
  - id: atoll-days
    site: atoll
    kinds: [daily-summary, lighting:13h]
    plans:
      - title: Morning round
        date: every day
        start: "06:30"
        for: 1h
`)
	for _, args := range [][]string{
		{"--config", cfg, "events", "--feed", "atoll-days", "--from", "1960-01-01", "--to", "2000-01-01", "--format", "csv"},
		{"events", "--lat", "8.72", "--lon", "167.73", "--tz", "Pacific/Kwajalein", "--kinds", "daily-summary,lighting:13h",
			"--from", "1960-01-01", "--to", "2000-01-01", "--format", "csv"},
	} {
		code, out, errOut := runCLI(t, args...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", args, code, errOut)
		}
		count := map[string]int{}
		for _, line := range strings.Split(out, "\n") {
			if d, _, ok := strings.Cut(line, ","); ok {
				count[d]++
			}
		}
		if n := count["1993-08-21"]; n != 0 {
			t.Errorf("%v: %d rows on 1993-08-21, a date the clocks skip", args, n)
		}
		for _, d := range []string{"1993-08-20", "1993-08-22"} {
			if count[d] == 0 {
				t.Errorf("%v: no rows on %s", args, d)
			}
		}
	}
}

// A local time in CSV and its offset give the instant of start_utc, also
// where the zone's offset is not whole minutes. The offsets are zdump -v's
// (tzdata): Europe/Amsterdam gmtoff=4772 (+01:19:32, NST) until 22:40:28 UT
// on 30 June 1937, then 4800 (+01:20); Africa/Monrovia gmtoff=-2670
// (−00:44:30, MMT) until 00:44:30 UT on 7 January 1972, then GMT.
func TestEventsCSVLocalOffsetSeconds(t *testing.T) {
	for _, c := range []struct {
		lat, lon, tz, from, to string
		offsets                []string // of the start_local column, row by row
	}{
		{"52.37", "4.9", "Europe/Amsterdam", "1937-06-30", "1937-07-01", []string{"+01:19:32", "+01:20"}},
		{"6.3", "-10.8", "Africa/Monrovia", "1972-01-06", "1972-01-07", []string{"-00:44:30", "+00:00"}},
	} {
		code, out, errOut := runCLI(t, "events", "--lat", c.lat, "--lon", c.lon, "--tz", c.tz, "--from", c.from, "--to", c.to,
			"--kinds", "sunrise", "--format", "csv")
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", c.tz, code, errOut)
		}
		rows, col := csvByHeader(t, out)
		if len(rows) != 1+len(c.offsets) {
			t.Fatalf("%s: %d rows, want %d: %s", c.tz, len(rows)-1, len(c.offsets), out)
		}
		for i, r := range rows[1:] {
			local, utc := r[col["start_local"]], r[col["start_utc"]]
			if !strings.HasSuffix(local, c.offsets[i]) {
				t.Errorf("%s: start_local %q, want the offset %s", c.tz, local, c.offsets[i])
			}
			layout := "2006-01-02T15:04:05-07:00"
			if strings.Count(c.offsets[i], ":") == 2 {
				layout += ":00"
			}
			l, err := time.Parse(layout, local)
			if err != nil {
				t.Fatalf("%s: %v", c.tz, err)
			}
			u, err := time.Parse(time.RFC3339, utc)
			if err != nil {
				t.Fatalf("%s: %v", c.tz, err)
			}
			if d := l.Sub(u.Round(time.Second)); d != 0 {
				t.Errorf("%s: start_local %q is %v from start_utc %q", c.tz, local, d, utc)
			}
		}
	}
}

// csvByHeader reads a CSV listing and the index of each column by its
// header's name, as the README tells scripts to read it.
func csvByHeader(t *testing.T, out string) ([][]string, map[string]int) {
	t.Helper()
	rows, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) == 0 {
		t.Fatal("no CSV header")
	}
	col := map[string]int{}
	for i, h := range rows[0] {
		col[h] = i
	}
	return rows, col
}
