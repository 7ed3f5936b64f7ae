package publish

import (
	"bytes"
	"fmt"
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

// Feeds over the limit under service.oversize: warn get a warning each up
// to EachWarned of them; the rest are named together in one line, each
// with its size, none left out: a fleet of 30 reads as 3 + 1 lines.
func TestOversizeWarningsGrouped(t *testing.T) {
	feeds := make([]FeedInfo, 30)
	for i := range feeds {
		feeds[i] = FeedInfo{ID: fmt.Sprintf("site-%04d-daily", i), Bytes: 1_100_000 + 10_000*i}
	}
	got := OversizeWarnings(feeds, 1_000_000)
	if len(got) != EachWarned+1 {
		t.Fatalf("%d feeds over the limit gave %d lines, want %d: %q", len(feeds), len(got), EachWarned+1, got)
	}
	for i := range EachWarned {
		if want := OversizeWarning(feeds[i].ID, feeds[i].Bytes, 1_000_000); got[i] != want {
			t.Errorf("line %d = %q, want %q", i, got[i], want)
		}
	}
	more := got[EachWarned]
	if !strings.HasPrefix(more, "27 more feeds over service.max_feed_bytes (1 MB), published as they are: site-0003-daily (1.1 MB), site-0004-daily (1.1 MB), ") ||
		!strings.HasSuffix(more, ", site-0029-daily (1.4 MB)") || strings.Contains(more, "…") {
		t.Errorf("the line of the rest = %q", more)
	}
	for i, f := range feeds {
		if n := strings.Count(strings.Join(got, "\n"), f.ID); n != 1 {
			t.Errorf("feed %d (%s) named %d times, want once", i, f.ID, n)
		}
	}
	// up to EachWarned feeds keep a line each; one more is named alone
	if got := OversizeWarnings(feeds[:EachWarned], 1_000_000); len(got) != EachWarned || strings.Contains(strings.Join(got, "\n"), "more feed") {
		t.Errorf("%d feeds over the limit gave %q, want a line each", EachWarned, got)
	}
	got = OversizeWarnings(feeds[:EachWarned+1], 1_000_000)
	if want := "1 more feed over service.max_feed_bytes (1 MB), published as it is: site-0003-daily (1.1 MB)"; len(got) != EachWarned+1 || got[EachWarned] != want {
		t.Errorf("%d feeds over the limit gave %q, want the last line %q", EachWarned+1, got, want)
	}
	// publish's summary (and --quiet) writes them so
	st := Stats{Feeds: 30, FeedsWritten: 30, Oversize: feeds, MaxFeedBytes: 1_000_000}
	if n := strings.Count(Summary(st, "public"), "\nwarning: "); n != EachWarned+1 {
		t.Errorf("the summary has %d warnings, want %d:\n%s", n, EachWarned+1, Summary(st, "public"))
	}
}

// Feeds shortened to fit under service.oversize: trim get TrimNote each up
// to EachWarned of them; the rest are named together in one line with the
// date each reaches and its size, none left out.
func TestTrimNotesGrouped(t *testing.T) {
	to := time.Date(2027, 10, 1, 0, 0, 0, 0, time.UTC)
	ts := make([]Trimmed, 5)
	for i := range ts {
		id := fmt.Sprintf("plot-%d", i)
		ts[i] = Trimmed{Feed: FeedInfo{ID: id, File: id + ".ics", Events: 2000 + i, Bytes: 970_000 + 1_000*i}, To: to.AddDate(0, 0, i)}
	}
	got := TrimNotes(ts, 1_000_000)
	if len(got) != EachWarned+1 {
		t.Fatalf("%d feeds shortened gave %d lines, want %d: %q", len(ts), len(got), EachWarned+1, got)
	}
	for i := range EachWarned {
		if want := TrimNote(ts[i], 1_000_000); got[i] != want {
			t.Errorf("line %d = %q, want %q", i, got[i], want)
		}
	}
	if want := "2 more feeds shortened to stay under 1 MB: plot-3.ics to 2027-10-04 (now 973.0 kB), plot-4.ics to 2027-10-05 (now 974.0 kB)"; got[EachWarned] != want {
		t.Errorf("the line of the rest = %q, want %q", got[EachWarned], want)
	}
	st := Stats{Feeds: 5, FeedsWritten: 5, Trimmed: ts, MaxFeedBytes: 1_000_000}
	if n := strings.Count(Summary(st, "public"), "\nnote: "); n != EachWarned+1 {
		t.Errorf("the summary has %d notes, want %d:\n%s", n, EachWarned+1, Summary(st, "public"))
	}
}
