package publish

import (
	"bytes"
	"strings"
	"testing"
	"time"
)

func TestSummary(t *testing.T) {
	st := Stats{Feeds: 12, FeedsWritten: 3, FeedsUnchanged: 9, Events: 41210, Bytes: 5_210_000, Elapsed: 840 * time.Millisecond}
	want := "published 12 feeds (3 written, 9 unchanged), 41,210 events, 5.2 MB in 0.84 s to public/\n"
	if got := Summary(st, "public"); got != want {
		t.Errorf("Summary:\n got %q\nwant %q", got, want)
	}
	st.Shard, st.Index = Shard{2, 8}, IndexPending
	st.Oversize, st.MaxFeedBytes = []FeedInfo{{ID: "farm-all", File: "farm-all.ics", Bytes: 1_300_000}}, 1_000_000
	got := Summary(st, "/srv/cal/")
	for _, s := range []string{"published shard 2/8: 12 feeds", "to /srv/cal/; index.html and feeds.json wait for the other shards",
		`warning: feed "farm-all" is 1.3 MB, over service.max_feed_bytes (1 MB): published as it is, but some web calendars drop events`} {
		if !strings.Contains(got, s) {
			t.Errorf("summary %q lacks %q", got, s)
		}
	}
}

// A writer that is not a terminal gets the summary only, no bar.
func TestProgressQuietWithoutTerminal(t *testing.T) {
	var buf bytes.Buffer
	p := NewProgress(&buf)
	p.Start(2)
	p.Feed(FeedInfo{ID: "a"}, true)
	p.Feed(FeedInfo{ID: "b"}, false)
	if buf.Len() != 0 {
		t.Errorf("progress wrote %q to a non-terminal", buf.String())
	}
	p.Finish(Stats{Feeds: 2, FeedsWritten: 1, FeedsUnchanged: 1}, "out")
	if got := buf.String(); !strings.HasPrefix(got, "published 2 feeds (1 written, 1 unchanged)") || strings.Contains(got, "\r") {
		t.Errorf("output %q", got)
	}
	if got := barLine(412, 1000, 20); got != "[========>           ]  412/1000 feeds  41%" {
		t.Errorf("barLine = %q", got)
	}
	var nilP *Progress
	nilP.Start(1)
	nilP.Feed(FeedInfo{}, true)
	nilP.Finish(Stats{}, "")
}
