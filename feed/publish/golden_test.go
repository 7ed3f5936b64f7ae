package publish

import (
	"bytes"
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	goical "github.com/emersion/go-ical"

	"heliocal/config"
	"heliocal/feed"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata/golden")

const demoBase = "https://sky.example.org/calendars/"

// demoRun prepares the built-in demo configuration, restricted to the feeds
// keep selects (all when nil) and optionally given a shorter window, as the
// CLI would: lazily built sources and render options.
func demoRun(t testing.TB, now time.Time, keep map[string]bool, back, ahead int) ([]Source, map[string]*feed.Calendar, RenderOptions) {
	t.Helper()
	cfg := config.Demo()
	var feeds []config.Feed
	for _, f := range cfg.Feeds {
		if keep != nil && !keep[f.ID] {
			continue
		}
		if ahead > 0 {
			f.DaysBack, f.DaysAhead = back, ahead
		}
		feeds = append(feeds, f)
	}
	cfg.Feeds = feeds
	cat, err := feed.NewCatalogue(cfg, feed.Options{
		Now:     now,
		FeedURL: func(id string) string { return demoBase + id + ".ics" },
		PageURL: demoBase,
		Refresh: 24 * time.Hour,
	})
	if err != nil {
		t.Fatal(err)
	}
	built := map[string]*feed.Calendar{}
	srcs := make([]Source, len(cfg.Feeds))
	for i := range cfg.Feeds {
		f := &cfg.Feeds[i]
		srcs[i] = Source{ID: f.ID, Build: func(ctx context.Context) (*feed.Calendar, error) { return cat.Calendar(ctx, f) }, Release: true}
		if keep != nil { // small runs: keep the calendars to compare with
			c, err := cat.Calendar(context.Background(), f)
			if err != nil {
				t.Fatal(err)
			}
			built[f.ID] = c
		}
	}
	opts := RenderOptions{
		BaseURL:   demoBase,
		Title:     "Demo sky calendars",
		Version:   "golden",
		Generated: time.Date(now.Year(), now.Month(), now.Day(), 0, 0, 0, 0, time.UTC),
	}
	return srcs, built, opts
}

// compareGolden checks got against testdata/golden/name, reporting the first
// differing line; on a mismatch it writes name.got beside it for review.
// With -update it rewrites the golden file instead.
func compareGolden(t *testing.T, name string, got []byte) {
	t.Helper()
	path := filepath.Join("testdata", "golden", name)
	if *update {
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test ./feed/publish -run TestGolden -update to create it)", err)
	}
	if bytes.Equal(got, want) {
		os.Remove(path + ".got")
		return
	}
	os.WriteFile(path+".got", got, 0o644)
	gl, wl := strings.Split(string(got), "\n"), strings.Split(string(want), "\n")
	for i := 0; i < len(gl) || i < len(wl); i++ {
		var g, w string
		if i < len(gl) {
			g = gl[i]
		}
		if i < len(wl) {
			w = wl[i]
		}
		if g != w {
			t.Errorf("%s:%d differs (new output in %s.got; review, then -update)\n got %q\nwant %q", path, i+1, path, g, w)
			return
		}
	}
}

// Two demo feeds end to end (configuration, catalogue, encoder, publish)
// over a window holding a clock change: Europe/Vienna springs forward on
// 28 March 2027 and Pacific/Auckland falls back on 4 April 2027 (tz database:
// EU rule last Sunday of March; NZ rule first Sunday of April).
func TestGoldenDemoFeeds(t *testing.T) {
	now := time.Date(2027, 3, 20, 12, 0, 0, 0, time.UTC)
	keep := map[string]bool{"fernhollow-sun": true, "tallowgum-sun": true}
	srcs, cals, opts := demoRun(t, now, keep, 2, 16)
	dir := t.TempDir()
	st, err := Publish(context.Background(), srcs, opts, &Writer{Dir: dir})
	if err != nil {
		t.Fatal(err)
	}
	if st.Feeds != 2 || st.FeedsWritten != 2 {
		t.Fatalf("published %+v", st)
	}
	files := snapshot(t, dir)
	for _, name := range []string{"fernhollow-sun.ics", "tallowgum-sun.ics", "feeds.json"} {
		compareGolden(t, name, files[name])
	}

	// The zones' clock changes are in the files: Vienna from +0100 to +0200,
	// Auckland from +1300 to +1200.
	for name, want := range map[string][]string{
		"fernhollow-sun.ics": {"TZID:Europe/Vienna", "TZOFFSETFROM:+0100\r\nTZOFFSETTO:+0200", "DTSTART;TZID=Europe/Vienna:20270328T"},
		"tallowgum-sun.ics":  {"TZID:Pacific/Auckland", "TZOFFSETFROM:+1300\r\nTZOFFSETTO:+1200", "DTSTART;TZID=Pacific/Auckland:20270404T"},
	} {
		for _, s := range want {
			if !bytes.Contains(files[name], []byte(s)) {
				t.Errorf("%s lacks %q", name, s)
			}
		}
	}

	// An independent parser reads the same events at the same instants.
	for id, cal := range cals {
		checkIndependentParse(t, files[id+".ics"], cal)
	}

	// A second publish of the same inputs writes nothing.
	st, err = Publish(context.Background(), srcs, opts, &Writer{Dir: dir})
	if err != nil {
		t.Fatal(err)
	}
	if st.FilesWritten != 0 {
		t.Errorf("republishing the demo wrote %d files", st.FilesWritten)
	}
}

// checkIndependentParse decodes data with github.com/emersion/go-ical and
// checks every entry of cal is there, once, at its instant.
func checkIndependentParse(t *testing.T, data []byte, cal *feed.Calendar) {
	t.Helper()
	parsed, err := goical.NewDecoder(bytes.NewReader(data)).Decode()
	if err != nil {
		t.Fatalf("%s: go-ical: %v", cal.ID, err)
	}
	events := parsed.Events()
	if len(events) != len(cal.Entries) {
		t.Errorf("%s: go-ical reads %d events, the calendar has %d entries", cal.ID, len(events), len(cal.Entries))
	}
	starts := map[string]time.Time{}
	for _, ev := range events {
		uid := ev.Props.Get(goical.PropUID)
		if uid == nil {
			t.Fatalf("%s: event without UID", cal.ID)
		}
		if _, dup := starts[uid.Value]; dup {
			t.Errorf("%s: UID %s twice", cal.ID, uid.Value)
		}
		start, err := ev.DateTimeStart(time.UTC)
		if err != nil {
			t.Fatalf("%s: %s: DTSTART: %v", cal.ID, uid.Value, err)
		}
		starts[uid.Value] = start
	}
	for _, e := range cal.Entries {
		got, ok := starts[e.UID]
		switch {
		case !ok:
			t.Errorf("%s: entry %s missing", cal.ID, e.UID)
		case e.AllDay:
			if got.Format(time.DateOnly) != e.Start.Format(time.DateOnly) {
				t.Errorf("%s: %s: all-day date %s, want %s", cal.ID, e.UID, got.Format(time.DateOnly), e.Start.Format(time.DateOnly))
			}
		case got.Sub(e.Start).Abs() > 500*time.Millisecond: // the file carries whole seconds
			t.Errorf("%s: %s: starts %s, computed %s", cal.ID, e.UID, got.UTC(), e.Start.UTC())
		}
	}
}

// The whole demo publishes; every feed parses with an independent parser
// with the event count feeds.json states, within the advised size.
func TestPublishDemo(t *testing.T) {
	if testing.Short() {
		t.Skip("computes every demo feed")
	}
	now := time.Date(2027, 3, 20, 12, 0, 0, 0, time.UTC)
	srcs, _, opts := demoRun(t, now, nil, 0, 0)
	dir := t.TempDir()
	st, err := Publish(context.Background(), srcs, opts, &Writer{Dir: dir})
	if err != nil {
		t.Fatal(err)
	}
	files := snapshot(t, dir)
	var list feedsJSON
	if err := json.Unmarshal(files["feeds.json"], &list); err != nil {
		t.Fatal(err)
	}
	if len(list.Feeds) != len(srcs) || st.Feeds != len(srcs) {
		t.Fatalf("feeds.json lists %d feeds, configuration has %d", len(list.Feeds), len(srcs))
	}
	for _, fi := range list.Feeds {
		data := files[fi.File]
		parsed, err := goical.NewDecoder(bytes.NewReader(data)).Decode()
		if err != nil {
			t.Errorf("%s: go-ical: %v", fi.File, err)
			continue
		}
		if n := len(parsed.Events()); n != fi.Events || fi.Bytes != len(data) || fi.Checksum != checksum(data) {
			t.Errorf("%s: %d events, %d bytes on disk; feeds.json says %d, %d", fi.File, n, len(data), fi.Events, fi.Bytes)
		}
		if fi.URL != demoBase+fi.File {
			t.Errorf("%s: url %q", fi.ID, fi.URL)
		}
	}
	for _, f := range st.Oversize {
		t.Errorf("demo feed %s is %d bytes, over the advised size", f.ID, f.Bytes)
	}
	parseStrict(t, files["index.html"])
	fmt.Fprintf(os.Stderr, "%s", Summary(st, "demo"))
}
