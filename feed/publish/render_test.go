package publish

import (
	"context"
	"errors"
	"fmt"
	"os"
	"sort"
	"strings"
	"sync"
	"testing"

	"heliocal/feed"
)

// Publish keeps at most Workers feeds between "computed" and "written" (each
// worker writes the feed it has just computed before it computes another),
// whatever the number of feeds: memory does not grow with the configuration.
// Every feed is written once.
func TestPublishBoundsFeedsInFlight(t *testing.T) {
	base := testCalendars(t, "")[0]
	var mu sync.Mutex
	built, written, peak := 0, 0, 0
	var order []string
	var srcs []Source
	for i := range 40 {
		id := fmt.Sprintf("orchard-sunrise-%02d", i)
		srcs = append(srcs, Source{ID: id, Build: func(context.Context) (*feed.Calendar, error) {
			c := *base
			c.ID = id
			mu.Lock()
			built++
			peak = max(peak, built-written)
			mu.Unlock()
			return &c, nil
		}})
	}
	dir := t.TempDir()
	w := &Writer{Dir: dir, createTemp: func(dir, pattern string) (tempFile, error) {
		mu.Lock()
		if strings.HasSuffix(pattern, ".ics.tmp-*") {
			written++
			order = append(order, strings.TrimSuffix(strings.TrimPrefix(pattern, "."), ".ics.tmp-*"))
		}
		mu.Unlock()
		return os.CreateTemp(dir, pattern)
	}}
	opts := testOptions()
	opts.Workers = 2
	if _, err := Publish(context.Background(), srcs, opts, w); err != nil {
		t.Fatal(err)
	}
	if peak > opts.Workers {
		t.Errorf("%d feeds computed but not yet written at once, want at most %d", peak, opts.Workers)
	}
	sort.Strings(order)
	if len(order) != len(srcs) {
		t.Fatalf("%d feeds written, want %d", len(order), len(srcs))
	}
	for i, id := range order {
		if id != srcs[i].ID {
			t.Fatalf("written: %v", order)
		}
	}
}

// A feed that cannot be built stops the run with its id in the error, and
// the index is not touched.
func TestPublishBuildError(t *testing.T) {
	dir := t.TempDir()
	publishTo(t, dir, "", testOptions())
	old := snapshot(t, dir)
	srcs := Calendars(testCalendars(t, " (revised)")...)
	boom := errors.New("site cayuga-orchard: ephemeris out of range")
	srcs[1].Build = func(context.Context) (*feed.Calendar, error) { return nil, boom }
	_, err := Publish(context.Background(), srcs, testOptions(), &Writer{Dir: dir})
	if !errors.Is(err, boom) || !strings.HasPrefix(err.Error(), "publish: feed orchard-sunset: ") {
		t.Fatalf("error %v", err)
	}
	now := snapshot(t, dir)
	for _, name := range []string{"orchard-sunset.ics", "ice-camp-sun.ics", "feeds.json", "index.html"} {
		if string(now[name]) != string(old[name]) {
			t.Errorf("%s changed by a failed run", name)
		}
	}

	// Duplicate and unsafe ids are refused before anything is computed.
	for _, tc := range []struct {
		ids  []string
		want string
	}{
		{[]string{"a", "a"}, `publish: feeds[1]: feed id "a" appears twice`},
		{[]string{"../etc"}, `publish: feeds[0]: invalid feed id "../etc"`},
		{[]string{""}, `publish: feeds[0]: invalid feed id ""`},
	} {
		var srcs []Source
		for _, id := range tc.ids {
			srcs = append(srcs, Source{ID: id, Build: func(context.Context) (*feed.Calendar, error) {
				t.Errorf("feed %s built despite bad ids", id)
				return nil, nil
			}})
		}
		if _, err := Publish(context.Background(), srcs, testOptions(), &Writer{Dir: dir}); err == nil || err.Error() != tc.want {
			t.Errorf("ids %q: %v, want %s", tc.ids, err, tc.want)
		}
	}

	// A cancelled run stops with the context's error.
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := Publish(ctx, Calendars(testCalendars(t, "")...), testOptions(), &Writer{Dir: dir}); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled publish: %v", err)
	}
}
