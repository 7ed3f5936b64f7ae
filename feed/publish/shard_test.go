package publish

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
	"time"

	"heliocal/feed"
)

func TestShardsPartitionFeeds(t *testing.T) {
	ids := make([]string, 2000)
	for i := range ids {
		ids[i] = fmt.Sprintf("site-%04d-sun", i)
	}
	for n := 1; n <= 16; n++ {
		count := make([]int, n)
		for _, id := range ids {
			in := 0
			for i := range n {
				if InShard(id, i, n) {
					in++
					count[i]++
				}
			}
			if in != 1 {
				t.Fatalf("n=%d: %s is in %d shards, want exactly 1", n, id, in)
			}
		}
		// FNV-1a spreads similar ids: no shard gets less than half or more
		// than twice its share.
		for i, c := range count {
			if share := len(ids) / n; c < share/2 || c > 2*share {
				t.Errorf("n=%d: shard %d has %d of %d ids", n, i, c, len(ids))
			}
		}
	}
	// The assignment depends on the id alone.
	if InShard("farm-sun", 0, 4) != (Shard{0, 4}).Has("farm-sun") || !(Shard{}).Has("anything") {
		t.Error("Shard.Has disagrees with InShard")
	}
}

func TestParseShard(t *testing.T) {
	good := []struct {
		in   string
		want Shard
	}{
		{"0/1", Shard{0, 1}}, {"0/4", Shard{0, 4}}, {"9999/10000", Shard{9999, 10000}}, {"3/4", Shard{3, 4}}, {" 2/8 ", Shard{2, 8}},
	}
	for _, tc := range good {
		got, err := ParseShard(tc.in)
		if err != nil || got != tc.want {
			t.Errorf("ParseShard(%q) = %v, %v; want %v", tc.in, got, err, tc.want)
		}
		if got.String() != fmt.Sprintf("%d/%d", tc.want.Index, tc.want.Count) {
			t.Errorf("%v.String() = %q", got, got.String())
		}
	}
	bad := []struct{ in, want string }{
		{"4/4", `shard "4/4": index must be within 0..3 (0-based, like JOB_COMPLETION_INDEX)`},
		{"-1/4", `shard "-1/4": index must be within 0..3 (0-based, like JOB_COMPLETION_INDEX)`},
		{"1/0", `shard "1/0": count must be at least 1`},
		{"0/10001", `shard "0/10001": count must be at most 10000`},
		{"0/99999999999999999", `shard "0/99999999999999999": count must be at most 10000`},
		{"3", `shard "3": want i/n, e.g. "0/4" (i is 0-based)`},
		{"a/4", `shard "a/4": index "a" is not a whole number`},
		{"1/four", `shard "1/four": count "four" is not a whole number`},
		{"", `shard "": want i/n, e.g. "0/4" (i is 0-based)`},
	}
	for _, tc := range bad {
		if _, err := ParseShard(tc.in); err == nil || err.Error() != tc.want {
			t.Errorf("ParseShard(%q): error %v\nwant %s", tc.in, err, tc.want)
		}
	}
}

// A fleet of three workers sharing one volume ends with the same feeds,
// feeds.json and index.html as one unsharded run; the index appears only when
// the last shard is done, and a rerun of any shard changes nothing.
func TestShardedPublishMergesIndex(t *testing.T) {
	whole := t.TempDir()
	publishTo(t, whole, "", testOptions())
	want := snapshot(t, whole)

	dir := t.TempDir()
	const n = 3
	// Publish the shards in an order where the last one is not shard n-1.
	order := []int{2, 0, 1}
	for k, i := range order {
		opts := testOptions()
		opts.Shard = Shard{Index: i, Count: n}
		st := publishTo(t, dir, "", opts)
		last := k == len(order)-1
		if _, err := os.Stat(filepath.Join(dir, IndexName)); (err == nil) != last {
			t.Fatalf("after shard %d (%d of %d done): index.html present = %v", i, k+1, n, err == nil)
		}
		wantIndex := IndexPending
		if last {
			wantIndex = IndexWritten
		}
		if st.Index != wantIndex || st.Shard != opts.Shard {
			t.Errorf("shard %d: Index %q, Shard %v; want %q", i, st.Index, st.Shard, wantIndex)
		}
	}
	got := snapshot(t, dir)
	for name, b := range want {
		if !bytes.Equal(got[name], b) {
			t.Errorf("%s differs between the sharded and the unsharded run", name)
		}
	}
	for i := range n {
		if _, ok := got[ManifestName(Shard{i, n})]; !ok {
			t.Errorf("manifest of shard %d missing", i)
		}
	}
	feeds := 0
	for i := range n {
		opts := testOptions()
		opts.Shard = Shard{Index: i, Count: n}
		st := publishTo(t, dir, "", opts)
		feeds += st.Feeds
		if st.FilesWritten != 0 || st.Index != IndexUnchanged {
			t.Errorf("rerun of shard %d wrote something: %+v", i, st)
		}
	}
	if feeds != 3 {
		t.Errorf("the shards published %d feeds in all, want 3", feeds)
	}

	// A separate merge step over the gathered manifests (no shared volume)
	// writes the same index.
	gathered := t.TempDir()
	for i := range n {
		name := ManifestName(Shard{i, n})
		if err := os.WriteFile(filepath.Join(gathered, name), got[name], 0o644); err != nil {
			t.Fatal(err)
		}
	}
	opts := testOptions()
	opts.Shard = Shard{Count: n}
	status, err := MergeIndex(context.Background(), Calendars(testCalendars(t, "")...), opts, &Writer{Dir: gathered})
	if err != nil || status != IndexWritten {
		t.Fatalf("MergeIndex: %q, %v", status, err)
	}
	merged := snapshot(t, gathered)
	for _, name := range []string{FeedsJSONName, IndexName} {
		if !bytes.Equal(merged[name], want[name]) {
			t.Errorf("MergeIndex wrote a different %s", name)
		}
	}

	// Manifests of another configuration (a feed added) are not merged.
	srcs := Calendars(testCalendars(t, "")...)
	extra := *testCalendars(t, "")[0]
	extra.ID = "orchard-dawn"
	srcs = append(srcs, Calendars(&extra)...)
	opts = testOptions()
	opts.Shard = Shard{Index: 0, Count: n}
	st, err := Publish(context.Background(), srcs, opts, &Writer{Dir: dir})
	if err != nil {
		t.Fatal(err)
	}
	if st.Index != IndexPending {
		t.Errorf("shard 0 of a changed configuration merged old manifests: %+v", st)
	}
}

// The charts learn which feeds of their site service.oversize: trim
// shortened, and to which date, alike in memory (Render), on disk (Publish)
// and from the manifests of a sharded run, so that each draws those feeds
// as they are published.
func TestChartsLearnTrimmedFeeds(t *testing.T) {
	opts := func(got map[string]string) RenderOptions {
		o := testOptions()
		// ice-camp-sun (5.1 kB) and orchard-sunrise (3.8 kB) are over it,
		// orchard-sunset (3.78 kB) is not
		o.MaxFeedBytes, o.Oversize = 3790, OversizeTrim
		o.Charts = func(_ context.Context, s feed.Site, trimmed []Trimmed) (*SiteChart, error) {
			var ts []string
			for _, tr := range trimmed {
				ts = append(ts, tr.Feed.ID+" to "+tr.To.Format(time.DateOnly))
			}
			got[s.ID] = strings.Join(ts, ", ")
			return nil, nil
		}
		return o
	}
	rendered := map[string]string{}
	b, err := Render(context.Background(), Calendars(testCalendars(t, "")...), opts(rendered))
	if err != nil {
		t.Fatal(err)
	}
	if len(b.Trimmed) != 2 {
		t.Fatalf("%d feeds shortened, want 2 (ice-camp-sun, orchard-sunrise): %+v", len(b.Trimmed), b.Trimmed)
	}
	for _, tr := range b.Trimmed {
		want := tr.Feed.ID + " to " + tr.To.Format(time.DateOnly)
		if rendered[tr.Feed.Site] != want {
			t.Errorf("Render: the chart of %s learnt %q, want %q", tr.Feed.Site, rendered[tr.Feed.Site], want)
		}
	}
	if len(rendered) != 2 {
		t.Errorf("Render: charts of %v, want both sites", rendered)
	}

	whole := map[string]string{}
	if _, err := Publish(context.Background(), Calendars(testCalendars(t, "")...), opts(whole), &Writer{Dir: t.TempDir()}); err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	sharded := map[string]string{}
	const n = 3
	for i := range n {
		o := opts(sharded)
		o.Shard = Shard{Index: i, Count: n}
		if _, err := Publish(context.Background(), Calendars(testCalendars(t, "")...), o, &Writer{Dir: dir}); err != nil {
			t.Fatal(err)
		}
	}
	for what, got := range map[string]map[string]string{"Publish": whole, "sharded Publish": sharded} {
		if !reflect.DeepEqual(got, rendered) {
			t.Errorf("%s: the charts learnt %v, Render's %v", what, got, rendered)
		}
	}
}

// mergeEdited publishes the first two of three shards, lets edit change
// the manifest of shard 0 as it is on disk, and returns the error of the
// last shard, which merges the manifests.
func mergeEdited(t *testing.T, edit func(m *manifestJSON)) error {
	t.Helper()
	dir := t.TempDir()
	const n = 3
	publishShard := func(i int) error {
		o := testOptions()
		o.Shard = Shard{Index: i, Count: n}
		_, err := Publish(context.Background(), Calendars(testCalendars(t, "")...), o, &Writer{Dir: dir})
		return err
	}
	for i := range n - 1 {
		if err := publishShard(i); err != nil {
			t.Fatal(err)
		}
	}
	path := filepath.Join(dir, ManifestName(Shard{Index: 0, Count: n}))
	raw, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var m manifestJSON
	if err := json.Unmarshal(raw, &m); err != nil {
		t.Fatal(err)
	}
	if len(m.Feeds) == 0 || len(m.Sites) == 0 {
		t.Fatal("shard 0 published no feed: the test checks nothing")
	}
	edit(&m)
	if raw, err = json.Marshal(m); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, raw, 0o644); err != nil {
		t.Fatal(err)
	}
	return publishShard(n - 1)
}

// putBack ends the error of a commit that failed after changing files: the
// last shard's manifest and feeds are put back as they were.
const putBack = "; nothing was changed: the files published before are as they were"

// A shard manifest whose list of shortened feeds names a date that does not
// exist or a feed the shard did not publish is refused when the last shard
// merges the manifests, the error naming the manifest's shard, the field
// and the value.
func TestMergeRefusesBadTrimmed(t *testing.T) {
	for _, tc := range []struct {
		name string
		bad  func(feeds []FeedInfo) manifestTrim
		want string
	}{
		{"date", func(feeds []FeedInfo) manifestTrim { return manifestTrim{Feed: feeds[0].ID, To: "2027-02-30"} },
			`publish: shard manifest of shard 0/3: trimmed[0].to: "2027-02-30" is not a date (YYYY-MM-DD)` + putBack},
		{"feed", func([]FeedInfo) manifestTrim { return manifestTrim{Feed: "no-such-feed", To: "2027-02-01"} },
			`publish: shard manifest of shard 0/3: trimmed[0].feed: "no-such-feed" is not one of the shard's feeds` + putBack},
	} {
		t.Run(tc.name, func(t *testing.T) {
			err := mergeEdited(t, func(m *manifestJSON) { m.Trimmed = []manifestTrim{tc.bad(m.Feeds)} })
			if err == nil || err.Error() != tc.want {
				t.Errorf("the last shard: %v, want %s", err, tc.want)
			}
		})
	}
}

// A shard manifest whose site has a skyline of no points is refused when
// the last shard merges the manifests, the error naming the manifest's
// shard, the site, the field and the value.
func TestMergeRefusesBadSkyline(t *testing.T) {
	var site string
	err := mergeEdited(t, func(m *manifestJSON) {
		site = m.Sites[0].ID
		m.Sites[0].Skyline = &manifestSkyline{Low: 1, High: 8, Points: 0}
	})
	want := "publish: shard manifest of shard 0/3: site " + site + ": skyline.points: 0 is not a number of points" + putBack
	if err == nil || err.Error() != want {
		t.Errorf("the last shard: %v, want %s", err, want)
	}
}
