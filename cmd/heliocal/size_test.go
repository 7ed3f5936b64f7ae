package main

import (
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"
)

// meadowOversize is a feed of a few hundred kB over a max_feed_bytes of 20 kB.
const meadowOversize = `service:
  max_feed_bytes: 20000
sites:
  - id: upper-meadow
    latitude: 46.5
    longitude: 7.9
    timezone: Europe/Zurich
feeds:
  - id: meadow
    site: upper-meadow
    kinds: [sunrise, sunset, civil-dawn, civil-dusk]
    days_back: 0
    days_ahead: 200
`

// oversizeWords is the one wording of the size warning, without its
// "warning: " on standard error.
var oversizeWords = regexp.MustCompile(`^feed "meadow" is \d+(\.\d+)? kB, over service\.max_feed_bytes \(20 kB\): published as it is, but some web calendars drop events from subscriptions this large; shorten days_back/days_ahead, split the kinds into several feeds, or set service\.oversize: trim$`)

// The size warning of a feed over service.max_feed_bytes writes sizes one
// way from check, publish and publish --quiet: "41.2 kB" over "20 kB", never
// raw bytes; and it is the same sentence from each.
func TestOversizeWarningOneForm(t *testing.T) {
	cfg := writeConfig(t, meadowOversize)
	out := filepath.Join(t.TempDir(), "public")
	raw := regexp.MustCompile(`\d{4,} bytes|\(\d{4,}\)`)
	sized := regexp.MustCompile(`is \d+(\.\d+)? [kMG]?B, over [^:]*\b20 kB\b`)
	for _, args := range [][]string{
		{"check", "--config", cfg},
		{"publish", "--config", cfg, "--out", out},
		{"publish", "--quiet", "--config", cfg, "--out", out},
	} {
		_, _, errOut := runCLI(t, args...)
		var warning string
		for _, l := range strings.Split(errOut, "\n") {
			if strings.Contains(l, "max_feed_bytes") || strings.Contains(l, "limit") {
				warning = l
			}
		}
		if warning == "" || raw.MatchString(warning) || !sized.MatchString(warning) {
			t.Errorf("%v: size warning %q (stderr %q), want sizes as \"41.2 kB\"", args, warning, errOut)
		}
		if w, ok := strings.CutPrefix(warning, "heliocal: warning: "); !ok || !oversizeWords.MatchString(w) {
			t.Errorf("%v: size warning %q, want \"heliocal: warning: \" and %s", args, warning, oversizeWords)
		}
	}
}

// serve publishes a feed over max_feed_bytes under oversize: warn (the
// default) and logs the warning of check and publish, at its first build
// and not again at a refresh that finds the same feed over.
func TestServeOversizeWarning(t *testing.T) {
	b, warned := serveWarnings(t, meadowOversize)
	for range 2 {
		bundle, err := b(context.Background(), nil)
		if err != nil {
			t.Fatal(err)
		}
		if f := bundle.File("meadow.ics"); f == nil {
			t.Fatal("meadow.ics not served")
		}
	}
	if got := warned(); len(got) != 1 || !oversizeWords.MatchString(got[0]) {
		t.Errorf("two builds logged %q, want once %s", got, oversizeWords)
	}
}

// Under service.oversize: trim serve logs publish's note on the shortened
// feed at WARN, once for two builds that shorten it alike, in publish's
// words, with the sizes written as the warning writes them ("20 kB", not
// "20.0 kB").
func TestServeTrimNote(t *testing.T) {
	yaml := strings.Replace(meadowOversize, "max_feed_bytes: 20000\n", "max_feed_bytes: 20000\n  oversize: trim\n", 1)
	b, warned := serveWarnings(t, yaml)
	for range 2 {
		if _, err := b(context.Background(), nil); err != nil {
			t.Fatal(err)
		}
	}
	note := regexp.MustCompile(`^meadow\.ics shortened to \d{4}-\d\d-\d\d to stay under 20 kB \(now 1\d(\.\d)? kB, \d+ events\)$`)
	got := warned()
	if len(got) != 1 || !note.MatchString(got[0]) {
		t.Fatalf("two builds logged %q, want once %s", got, note)
	}
	cfg := writeConfig(t, yaml)
	code, _, errOut := runCLI(t, "publish", "--config", cfg, "--out", filepath.Join(t.TempDir(), "public"))
	if code != 0 || !strings.Contains(errOut, "\nheliocal: note: "+got[0]+"\n") {
		t.Errorf("publish: exit %d, stderr %q; want the note %q", code, errOut, got[0])
	}
}

// check says what publish and serve do with a feed over max_feed_bytes
// under each service.oversize, and exits as publish does: warn publishes
// it as it is (a warning, exit 0), trim shortens it (publish's note, the
// shortened feed's size in the table; in JSON its trimmed_to, events and
// bytes, and the note in notes; exit 0), fail refuses it (exit 1,
// naming the feed and its size, in text and in JSON).
func TestCheckOversizeModes(t *testing.T) {
	for _, mode := range []string{"warn", "trim", "fail"} {
		t.Run(mode, func(t *testing.T) {
			cfg := writeConfig(t, strings.Replace(meadowOversize, "max_feed_bytes: 20000\n", "max_feed_bytes: 20000\n  oversize: "+mode+"\n", 1))
			pubDir := filepath.Join(t.TempDir(), "public")
			pubCode, _, pubErr := runCLI(t, "publish", "--config", cfg, "--out", pubDir)
			code, out, errOut := runCLI(t, "check", "--config", cfg)
			if code != pubCode {
				t.Errorf("check exits %d, publish %d (%s)", code, pubCode, pubErr)
			}
			switch mode {
			case "warn":
				if code != 0 || !strings.Contains(errOut, "warning: feed \"meadow\"") || !strings.Contains(errOut, "published as it is") {
					t.Errorf("exit %d, stderr %q", code, errOut)
				}
			case "trim":
				note := regexp.MustCompile(`note: meadow\.ics shortened to \d{4}-\d\d-\d\d to stay under 20 kB \(now 1\d(\.\d)? kB, \d+ events\)\n`).FindString(pubErr)
				if code != 0 || note == "" || !strings.Contains(out, note) || strings.Contains(out+errOut, "shorten days_back") {
					t.Errorf("exit %d, stdout %q, stderr %q; want publish's note %q and no advice to shorten", code, out, errOut, note)
				}
				if m := regexp.MustCompile(`(?m)^meadow .* (\d+(\.\d)? kB)$`).FindStringSubmatch(out); m == nil || !strings.HasPrefix(m[1], "1") {
					t.Errorf("the table does not show the shortened size:\n%s", out)
				}
				// JSON: the feed's trimmed_to, events and bytes are those of the
				// file publish wrote, and notes has publish's note
				published, err := os.ReadFile(filepath.Join(pubDir, "meadow.ics"))
				if err != nil {
					t.Fatal(err)
				}
				m := regexp.MustCompile(`shortened to (\d{4}-\d\d-\d\d) .*, (\d+) events\)`).FindStringSubmatch(note)
				code, out, errOut := runCLI(t, "check", "--config", cfg, "--format", "json")
				var r struct {
					Notes []string
					Feeds []struct {
						Events, Bytes int
						Oversize      bool
						TrimmedTo     string `json:"trimmed_to"`
					}
				}
				if err := json.Unmarshal([]byte(out), &r); err != nil {
					t.Fatal(err)
				}
				if code != 0 || errOut != "" || m == nil || len(r.Feeds) != 1 || !r.Feeds[0].Oversize || r.Feeds[0].TrimmedTo != m[1] ||
					strconv.Itoa(r.Feeds[0].Events) != m[2] || r.Feeds[0].Events != strings.Count(string(published), "BEGIN:VEVENT") ||
					r.Feeds[0].Bytes != len(published) || len(r.Notes) != 1 || "note: "+r.Notes[0]+"\n" != note {
					t.Errorf("json: exit %d, stderr %q, feeds %+v, notes %q; want trimmed_to, events and bytes of the published %d bytes and the note %q",
						code, errOut, r.Feeds, r.Notes, len(published), note)
				}
			case "fail":
				refused := regexp.MustCompile(`heliocal: feed "meadow" is \d+(\.\d+)? kB, over service\.max_feed_bytes \(20 kB\): publish and serve refuse it \(service\.oversize: fail\)`)
				if code != exitFailure || !refused.MatchString(errOut) || !strings.Contains(pubErr, "feed meadow") {
					t.Errorf("exit %d, stderr %q; want %d and %s (publish: %q)", code, errOut, exitFailure, refused, pubErr)
				}
				// publish refuses the feed in check's words
				if _, words, ok := strings.Cut(strings.TrimSpace(errOut), `feed "meadow" is `); !ok || !strings.Contains(pubErr, "publish: feed meadow: "+words) {
					t.Errorf("publish says %q, check %q: want check's words after the feed's name", pubErr, errOut)
				}
				code, out, errOut := runCLI(t, "check", "--config", cfg, "--format", "json")
				var r struct {
					Valid   bool
					Refused []string
					Feeds   []struct {
						ID       string
						Oversize bool
					}
				}
				if err := json.Unmarshal([]byte(out), &r); err != nil {
					t.Fatal(err)
				}
				if code != exitFailure || errOut != "" || len(r.Refused) != 1 || !strings.HasPrefix(r.Refused[0], `feed "meadow" is `) || len(r.Feeds) != 1 || !r.Feeds[0].Oversize {
					t.Errorf("json: exit %d, stderr %q, report %+v", code, errOut, r)
				}
			}
		})
	}
}

// publish under oversize: fail names every feed it refuses, as check does,
// not the first alone, exits 1 and writes nothing: a small feed between
// two refused ones is not published either.
func TestPublishNamesEveryRefusedFeed(t *testing.T) {
	yaml := strings.Replace(meadowOversize, "max_feed_bytes: 20000\n", "max_feed_bytes: 20000\n  oversize: fail\n", 1) +
		`  - id: meadow-noon
    site: upper-meadow
    kinds: [solar-noon]
    days_back: 0
    days_ahead: 7
  - id: meadow-twilight
    site: upper-meadow
    kinds: [nautical-dawn, nautical-dusk, astronomical-dawn, astronomical-dusk]
    days_back: 0
    days_ahead: 200
`
	cfg := writeConfig(t, yaml)
	out := filepath.Join(t.TempDir(), "public")
	code, _, errOut := runCLI(t, "publish", "--config", cfg, "--out", out)
	if code != exitFailure || !strings.Contains(errOut, "feed meadow:") || !strings.Contains(errOut, "feed meadow-twilight:") ||
		strings.Contains(errOut, "feed meadow-noon") {
		t.Errorf("exit %d, stderr %q; want %d naming meadow and meadow-twilight", code, errOut, exitFailure)
	}
	if files, _ := filepath.Glob(filepath.Join(out, "*")); len(files) != 0 {
		t.Errorf("a refused publish wrote %v", files)
	}
	// check names the same two
	code, _, errOut = runCLI(t, "check", "--config", cfg)
	if code != exitFailure || !strings.Contains(errOut, `feed "meadow" is`) || !strings.Contains(errOut, `feed "meadow-twilight" is`) {
		t.Errorf("check: exit %d, stderr %q", code, errOut)
	}
}

// A feed shortened to stay under 1 MB is written one way in check's table,
// check's and publish's notes and publish's summary: its size as the table
// writes every size ("974.6 kB", not "0.97 MB") and its events with the
// thousands separated ("2,032", not "2032").
func TestTrimmedFeedNumbersOneWay(t *testing.T) {
	yaml := strings.NewReplacer("max_feed_bytes: 20000\n", "max_feed_bytes: 1000000\n  oversize: trim\n",
		"days_ahead: 200", "days_ahead: 800").Replace(meadowOversize)
	cfg := writeConfig(t, yaml)
	code, out, errOut := runCLI(t, "check", "--config", cfg)
	row := regexp.MustCompile(`(?m)^meadow .* (\d,\d{3}) +(\d{3}\.\d kB)$`).FindStringSubmatch(out)
	if code != 0 || row == nil {
		t.Fatalf("check: exit %d, stderr %q; no row of meadow with its events and size in kB:\n%s", code, errOut, out)
	}
	note := "(now " + row[2] + ", " + row[1] + " events)\n"
	if !strings.Contains(out, note) {
		t.Errorf("check: the note does not say %q as the table does:\n%s", note, out)
	}
	code, _, pubErr := runCLI(t, "publish", "--config", cfg, "--out", filepath.Join(t.TempDir(), "public"))
	if code != 0 || !strings.Contains(pubErr, note) || !strings.Contains(pubErr, ", "+row[1]+" events, "+row[2]+" in ") {
		t.Errorf("publish: exit %d, stderr %q; want the note %q and the summary's %s events, %s", code, pubErr, note, row[1], row[2])
	}
}

// Under oversize: trim a feed that fits max_feed_bytes only shortened to a
// date before today at its site (here 12 kB of 40 days back and 30 ahead)
// is refused as one with no entry left is: check exits 1 naming it, its
// shortened date and today's date there (in JSON among refused, with its
// whole size), publish exits 1 naming it and writes nothing, serve exits 1
// at start. A subscribed calendar of past days alone would be useless.
func TestTrimBeforeTodayRefused(t *testing.T) {
	yaml := strings.NewReplacer("max_feed_bytes: 20000\n", "max_feed_bytes: 12000\n  oversize: trim\n",
		"days_back: 0", "days_back: 40", "days_ahead: 200", "days_ahead: 30").Replace(meadowOversize)
	cfg := writeConfig(t, yaml)
	zurich, err := time.LoadLocation("Europe/Zurich")
	if err != nil {
		t.Fatal(err)
	}
	// today at the site, read before and after a run (which may span
	// midnight there)
	todays := func(run func()) []string {
		before := time.Now().In(zurich).Format(time.DateOnly)
		run()
		return []string{before, time.Now().In(zurich).Format(time.DateOnly)}
	}
	refusal := regexp.MustCompile(`feed "meadow" is (\d+(?:\.\d+)? kB), over service\.max_feed_bytes \(12 kB\): publish and serve refuse it \(service\.oversize: trim would shorten it to (\d{4}-\d\d-\d\d), before today at its site \((\d{4}-\d\d-\d\d)\), leaving past days alone\); lower days_back or raise service\.max_feed_bytes`)
	refusedOn := func(what, msg string, days []string) {
		t.Helper()
		m := refusal.FindStringSubmatch(msg)
		if m == nil || !slices.Contains(days, m[3]) || m[2] >= m[3] {
			t.Errorf("%s: %q; want %s with today %v", what, msg, refusal, days)
		}
	}

	var code int
	var out, errOut string
	days := todays(func() { code, out, errOut = runCLI(t, "check", "--config", cfg) })
	if code != exitFailure || strings.Contains(errOut, "no entry left") || strings.Contains(out, "shortened to") {
		t.Errorf("check: exit %d, stdout %q, stderr %q", code, out, errOut)
	}
	refusedOn("check", errOut, days)

	days = todays(func() { code, out, errOut = runCLI(t, "check", "--config", cfg, "--format", "json") })
	var r struct {
		Refused []string
		Feeds   []struct {
			Bytes     int
			Oversize  bool
			TrimmedTo string `json:"trimmed_to"`
		}
	}
	if err := json.Unmarshal([]byte(out), &r); err != nil {
		t.Fatal(err)
	}
	if code != exitFailure || errOut != "" || len(r.Refused) != 1 || len(r.Feeds) != 1 || !r.Feeds[0].Oversize || r.Feeds[0].TrimmedTo != "" || r.Feeds[0].Bytes <= 12000 {
		t.Errorf("check json: exit %d, stderr %q, report %+v", code, errOut, r)
	} else {
		refusedOn("check json", r.Refused[0], days)
	}

	pub := filepath.Join(t.TempDir(), "public")
	days = todays(func() { code, _, errOut = runCLI(t, "publish", "--config", cfg, "--out", pub) })
	if m := regexp.MustCompile(`publish: feed meadow: \d+(?:\.\d+)? kB, over service\.max_feed_bytes \(12 kB\): publish and serve refuse it \(service\.oversize: trim would shorten it to (\d{4}-\d\d-\d\d), before today at its site \((\d{4}-\d\d-\d\d)\), leaving past days alone\); lower days_back or raise service\.max_feed_bytes`).FindStringSubmatch(errOut); code != exitFailure || m == nil || !slices.Contains(days, m[2]) || m[1] >= m[2] {
		t.Errorf("publish: exit %d, stderr %q", code, errOut)
	}
	if files, _ := filepath.Glob(filepath.Join(pub, "*")); len(files) != 0 {
		t.Errorf("a refused publish wrote %v", files)
	}

	code, _, last := serveExits(t, "--config", cfg, "--access-log=false")
	if code != exitFailure || !strings.HasPrefix(last, "heliocal: ") || !strings.Contains(last, "feed meadow: ") || !strings.Contains(last, "before today at its site") {
		t.Errorf("serve exited %d, last line %q", code, last)
	}
}

// A feed refused under oversize: trim has one events count in check's table
// and JSON whichever way trim fails: left with no entry (a limit of 1 kB,
// under its header and description alone) or fitting only shortened to a
// date before today (12 kB, as in TestTrimBeforeTodayRefused). It is the
// whole window's, as check counts the same feed under oversize: warn.
func TestTrimRefusalsCountAlike(t *testing.T) {
	window := strings.NewReplacer("days_back: 0", "days_back: 40", "days_ahead: 200", "days_ahead: 30").Replace(meadowOversize)
	row := regexp.MustCompile(`(?m)^meadow .* (\d[\d,]*) +[\d.]+ k?B$`)
	// check's events of the feed in its table and its JSON, and its
	// refusal ("" for none)
	check := func(service string) (table, inJSON int, refused string) {
		t.Helper()
		cfg := writeConfig(t, strings.Replace(window, "max_feed_bytes: 20000\n", service, 1))
		_, out, errOut := runCLI(t, "check", "--config", cfg)
		m := row.FindStringSubmatch(out)
		if m == nil {
			t.Fatalf("%q: no row of meadow in:\n%s", service, out)
		}
		table, _ = strconv.Atoi(strings.ReplaceAll(m[1], ",", ""))
		_, out, _ = runCLI(t, "check", "--config", cfg, "--format", "json")
		var r struct {
			Refused []string
			Feeds   []struct{ Events int }
		}
		if err := json.Unmarshal([]byte(out), &r); err != nil || len(r.Feeds) != 1 {
			t.Fatalf("%q: check json %v:\n%s", service, err, out)
		}
		if len(r.Refused) > 0 {
			refused = r.Refused[0]
		}
		if !strings.Contains(errOut, refused) {
			t.Errorf("%q: the table's run refuses %q, the JSON's %q", service, errOut, refused)
		}
		return table, r.Feeds[0].Events, refused
	}
	wantTable, want, refused := check("max_feed_bytes: 12000\n")
	if refused != "" || want < 100 || wantTable != want {
		t.Fatalf("under oversize: warn: %d events in the table, %d in JSON, refused %q; want the same, about 280", wantTable, want, refused)
	}
	for _, tc := range []struct{ service, says string }{
		{"max_feed_bytes: 1000\n  oversize: trim\n", "with no entry left"},
		{"max_feed_bytes: 12000\n  oversize: trim\n", "before today at its site"},
	} {
		table, inJSON, refused := check(tc.service)
		if !strings.Contains(refused, tc.says) || table != want || inJSON != want {
			t.Errorf("%q: refused %q, %d events in the table, %d in JSON; want %q and %d events, the whole window's", tc.service, refused, table, inJSON, tc.says, want)
		}
	}
}

// A feed a little over max_feed_bytes has the size in check's table that
// its warning gives, with the decimals that tell it from the limit: the
// table said "41.2 kB" of a feed whose warning said "41.23 kB, over … (41.2
// kB)", a size that reads as the limit itself.
func TestCheckTableSizeOverLimit(t *testing.T) {
	code, out, errOut := runCLI(t, "check", "--format", "json", "--config", writeConfig(t, meadowOversize))
	var r checkReport
	if err := json.Unmarshal([]byte(out), &r); err != nil || len(r.Feeds) != 1 {
		t.Fatalf("check --format json: exit %d, %v: %s%s", code, err, out, errOut)
	}
	// the limit 10 bytes under the feed: one decimal does not tell them apart
	n := r.Feeds[0].Bytes
	cfg := strings.Replace(meadowOversize, "max_feed_bytes: 20000", "max_feed_bytes: "+strconv.Itoa(n-10), 1)
	_, out, errOut = runCLI(t, "check", "--config", writeConfig(t, cfg))
	warned := regexp.MustCompile(`feed "meadow" is (\S+ kB), over service\.max_feed_bytes \((\S+ kB)\)`).FindStringSubmatch(errOut)
	if warned == nil || warned[1] == warned[2] {
		t.Fatalf("check warned %q, want the size and the limit told apart", errOut)
	}
	var row string
	for _, l := range strings.Split(out, "\n") {
		if strings.HasPrefix(l, "meadow ") {
			row = l
		}
	}
	if !strings.HasSuffix(row, "  "+warned[1]) {
		t.Errorf("check's table row %q, want the size %s of the warning (over %s)", row, warned[1], warned[2])
	}
}
