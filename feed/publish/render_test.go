package publish

import (
	"bytes"
	"compress/gzip"
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"reflect"
	"slices"
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

// With RenderOptions.Gzip, Render keeps each feed in the form Gzip gives
// it, made from the feed's bytes as soon as they are rendered: its gzip
// form alone (Data nil) or, when Gzip gives none, a copy of the bytes that
// outlives the buffer the worker renders its next feed into. Either way the
// bundle states the same feeds, sums and sizes as one rendered without it,
// and feeds.json and index.html are kept as they are.
func TestRenderGzip(t *testing.T) {
	cals := testCalendars(t, "")
	opts := testOptions()
	opts.Workers = 1 // one buffer for every feed: a kept copy must not share it
	whole, err := Render(context.Background(), Calendars(cals...), opts)
	if err != nil {
		t.Fatal(err)
	}
	keep := cals[0].ID + ".ics" // kept whole: Gzip gives no gzip form
	var mu sync.Mutex
	called := map[string]bool{}
	opts.Gzip = func(f *File) []byte {
		mu.Lock()
		defer mu.Unlock()
		called[f.Name] = true
		if w := whole.File(f.Name); w == nil || !bytes.Equal(f.Data, w.Data) || f.Checksum != w.Checksum {
			t.Errorf("Gzip given %s of %d bytes (sum %s), not the feed's", f.Name, len(f.Data), f.Checksum)
		}
		if f.Name == keep {
			return nil
		}
		var b bytes.Buffer
		zw := gzip.NewWriter(&b)
		zw.Write(f.Data)
		zw.Close()
		return b.Bytes()
	}
	held, err := Render(context.Background(), Calendars(cals...), opts)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(held.Feeds, whole.Feeds) || len(held.Files) != len(whole.Files) {
		t.Fatalf("feeds %+v, files %d; want %+v, %d as rendered without Gzip", held.Feeds, len(held.Files), whole.Feeds, len(whole.Files))
	}
	for i, f := range held.Files {
		w := whole.Files[i]
		if f.Name != w.Name || f.ContentType != w.ContentType || f.Checksum != w.Checksum || !f.ModTime.Equal(w.ModTime) {
			t.Errorf("file %d: %s %q sum %s at %v; want %s %q sum %s at %v",
				i, f.Name, f.ContentType, f.Checksum, f.ModTime, w.Name, w.ContentType, w.Checksum, w.ModTime)
		}
		isFeed := strings.HasSuffix(f.Name, ".ics")
		if i := slices.IndexFunc(held.Feeds, func(fi FeedInfo) bool { return fi.File == f.Name }); isFeed && (i < 0 || held.Feeds[i].Bytes != len(w.Data)) {
			t.Errorf("%s: no feed gives its length, %d bytes (the gzip form's size)", f.Name, len(w.Data))
		}
		if isFeed != called[f.Name] {
			t.Errorf("%s: Gzip called %v, want %v", f.Name, called[f.Name], isFeed)
		}
		got := f.Data
		switch {
		case !isFeed || f.Name == keep:
			if f.Gzip != nil {
				t.Errorf("%s: held with a gzip form", f.Name)
			}
		case f.Data != nil || f.Gzip == nil:
			t.Errorf("%s: held with %d bytes and a gzip form of %d, want its gzip form alone", f.Name, len(f.Data), len(f.Gzip))
		default:
			zr, err := gzip.NewReader(bytes.NewReader(f.Gzip))
			if err != nil {
				t.Fatalf("%s: %v", f.Name, err)
			}
			if got, err = io.ReadAll(zr); err != nil {
				t.Fatalf("%s: %v", f.Name, err)
			}
		}
		if !bytes.Equal(got, w.Data) {
			t.Errorf("%s: holds %d bytes that differ from the %d rendered without Gzip", f.Name, len(got), len(w.Data))
		}
	}
}
