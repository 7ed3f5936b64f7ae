package publish

import (
	"fmt"
	"io"
	"os"
	"strings"
	"sync"
	"time"

	"golang.org/x/term"

	"heliocal/feed"
)

// Progress reports a publish to a writer (the CLI passes stderr): a progress
// bar redrawn in place when the writer is a terminal, nothing while it runs
// otherwise, and a summary line at the end either way. Its methods may be
// called from any goroutine; a nil *Progress reports nothing.
type Progress struct {
	// SummaryDir, when not empty, is the directory the summary names in
	// place of the one Finish is given (Publish gives the Writer's Dir):
	// the same directory written as the user knows it, e.g. a relative one
	// resolved.
	SummaryDir string
	// Prefix begins each line of the summary (the CLI's "heliocal: ", which
	// begins every line it writes to stderr).
	Prefix string

	w   io.Writer
	bar bool

	mu      sync.Mutex
	total   int
	done    int
	drawn   time.Time
	visible bool
}

// NewProgress reports to w, with a bar only when w is a terminal.
func NewProgress(w io.Writer) *Progress {
	bar := false
	if f, ok := w.(*os.File); ok {
		bar = term.IsTerminal(int(f.Fd()))
	}
	return &Progress{w: w, bar: bar}
}

// Start announces how many feeds the run will publish.
func (p *Progress) Start(total int) {
	if p == nil {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	p.total, p.done = total, 0
}

// Feed records one published feed.
func (p *Progress) Feed(info FeedInfo, written bool) {
	if p == nil {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	p.done++
	if !p.bar {
		return
	}
	now := time.Now()
	if p.done < p.total && now.Sub(p.drawn) < 100*time.Millisecond {
		return
	}
	p.drawn = now
	p.visible = true
	fmt.Fprintf(p.w, "\r\x1b[K%s %s", barLine(p.done, p.total, 30), info.ID)
}

// barLine draws "[=========>          ]  412/1000 feeds  41%".
func barLine(done, total, width int) string {
	if total <= 0 {
		total = 1
	}
	filled := min(width, done*width/total)
	bar := strings.Repeat("=", filled)
	if filled < width {
		bar += ">" + strings.Repeat(" ", width-filled-1)
	}
	return fmt.Sprintf("[%s] %*d/%d feeds %3d%%", bar, len(fmt.Sprint(total)), done, total, done*100/total)
}

func (p *Progress) clear() {
	if p.visible {
		fmt.Fprint(p.w, "\r\x1b[K")
		p.visible = false
	}
}

// Abort removes the bar after a failed run (the caller prints the error).
func (p *Progress) Abort() {
	if p == nil {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	p.clear()
}

// Finish removes the bar and prints the summary of st, naming dir as the
// output directory, or SummaryDir when that is set.
func (p *Progress) Finish(st Stats, dir string) {
	if p == nil {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	p.clear()
	if p.SummaryDir != "" {
		dir = p.SummaryDir
	}
	s := Summary(st, dir)
	if p.Prefix != "" {
		s = p.Prefix + strings.ReplaceAll(strings.TrimSuffix(s, "\n"), "\n", "\n"+p.Prefix) + "\n"
	}
	fmt.Fprint(p.w, s)
}

// Summary is the end-of-run report, one line plus a line per warning, e.g.
// "published 12 feeds (3 written, 9 unchanged), 41,210 events, 5.2 MB in 0.84 s to public/".
func Summary(st Stats, dir string) string {
	var b strings.Builder
	b.WriteString("published ")
	if st.Shard.Sharded() {
		fmt.Fprintf(&b, "shard %s: ", st.Shard)
	}
	fmt.Fprintf(&b, "%s %s (%s written, %s unchanged), %s events, %s in %.2f s to %s",
		feed.FormatCount(st.Feeds), plural(st.Feeds, "feed", "feeds"),
		feed.FormatCount(st.FeedsWritten), feed.FormatCount(st.FeedsUnchanged),
		feed.FormatCount(st.Events), FormatBytes(st.Bytes), st.Elapsed.Seconds(), displayDir(dir))
	if st.Shard.Sharded() {
		switch st.Index {
		case IndexPending:
			b.WriteString("; index.html and feeds.json wait for the other shards")
		case IndexWritten:
			b.WriteString("; all shards done, index.html and feeds.json written")
		case IndexUnchanged:
			b.WriteString("; all shards done, index.html and feeds.json unchanged")
		}
	}
	b.WriteByte('\n')
	if st.TempRemoved > 0 {
		fmt.Fprintf(&b, "removed %d leftover temporary %s of an interrupted run\n",
			st.TempRemoved, plural(st.TempRemoved, "file", "files"))
	}
	for _, w := range Warnings(st) {
		b.WriteString(w + "\n")
	}
	return b.String()
}

// Warnings are the lines of Summary about feeds shortened to fit
// MaxFeedBytes ("note: …", TrimNotes) and feeds over it ("warning: …",
// OversizeWarnings), for a run that prints nothing else.
func Warnings(st Stats) []string {
	var out []string
	for _, n := range TrimNotes(st.Trimmed, st.MaxFeedBytes) {
		out = append(out, "note: "+n)
	}
	for _, w := range OversizeWarnings(st.Oversize, st.MaxFeedBytes) {
		out = append(out, "warning: "+w)
	}
	return out
}

// EachWarned is how many feeds of one warning or note (and one outcome:
// published as they are, shortened) get a line of their own, in the words
// of OversizeWarning or TrimNote; the feeds after them are named together
// in one line, each with its size, so that a fleet of a thousand feeds
// over the limit reads as four lines, not a thousand, and still names
// every feed.
const EachWarned = 3

// OversizeWarnings are the warnings about feeds over limit under
// service.oversize: warn, in the configuration's order: the first
// EachWarned each in OversizeWarning's words, then OversizeMore for the
// rest, if any.
func OversizeWarnings(feeds []FeedInfo, limit int) []string {
	return eachThenMore(feeds,
		func(f FeedInfo) string { return OversizeWarning(f.ID, f.Bytes, limit) },
		func(rest []FeedInfo) string { return OversizeMore(rest, limit) })
}

// eachThenMore is a line each (one) for the first EachWarned of items,
// then one line (more) for the rest, if any.
func eachThenMore[T any](items []T, one func(T) string, more func([]T) string) []string {
	var out []string
	for i, it := range items {
		if i == EachWarned {
			return append(out, more(items[i:]))
		}
		out = append(out, one(it))
	}
	return out
}

// OversizeMore names together the feeds over limit after the first
// EachWarned, each with its size as OversizeWarning writes it: "27 more
// feeds over service.max_feed_bytes (1 MB), published as they are:
// site-0003-daily (1.1 MB), site-0004-daily (1.1 MB), …", every one of
// them named.
func OversizeMore(feeds []FeedInfo, limit int) string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s more %s over service.max_feed_bytes (%s), published as %s:",
		feed.FormatCount(len(feeds)), plural(len(feeds), "feed", "feeds"), formatLimit(int64(limit)),
		plural(len(feeds), "it is", "they are"))
	for i, f := range feeds {
		size, _ := FormatBytesOver(int64(f.Bytes), int64(limit))
		if i > 0 {
			b.WriteByte(',')
		}
		fmt.Fprintf(&b, " %s (%s)", f.ID, size)
	}
	return b.String()
}

// TrimNotes are the notes about feeds shortened to stay under limit
// (service.oversize: trim), in the configuration's order: the first
// EachWarned each in TrimNote's words, then TrimMore for the rest, if any.
func TrimNotes(ts []Trimmed, limit int) []string {
	return eachThenMore(ts,
		func(t Trimmed) string { return TrimNote(t, limit) },
		func(rest []Trimmed) string { return TrimMore(rest, limit) })
}

// TrimMore names together the feeds shortened to stay under limit after
// the first EachWarned, each with the date it reaches and its size as
// TrimNote writes them: "27 more feeds shortened to stay under 1 MB:
// site-0003-daily.ics to 2027-06-03 (now 974.6 kB), …", every one of them
// named.
func TrimMore(ts []Trimmed, limit int) string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s more %s shortened to stay under %s:",
		feed.FormatCount(len(ts)), plural(len(ts), "feed", "feeds"), formatLimit(int64(limit)))
	for i, t := range ts {
		now, _ := FormatBytesOver(int64(t.Feed.Bytes), int64(limit))
		if i > 0 {
			b.WriteByte(',')
		}
		fmt.Fprintf(&b, " %s to %s (now %s)", t.Feed.File, t.To.Format(time.DateOnly), now)
	}
	return b.String()
}

// OversizeWarning is the warning about the feed id of the given size over
// the limit service.max_feed_bytes under service.oversize: warn, in the one
// wording of check, publish and serve.
func OversizeWarning(id string, bytes, limit int) string {
	size, most := FormatBytesOver(int64(bytes), int64(limit))
	return fmt.Sprintf("feed %q is %s, over service.max_feed_bytes (%s): published as it is, but some web calendars drop events from subscriptions this large; shorten days_back/days_ahead, split the kinds into several feeds, or set service.oversize: trim", id, size, most)
}

// OversizeRefusal says that the feed of e is refused, under
// service.oversize: fail or, under trim, still over the limit with no
// entry left or fitting only shortened to a date before today at its site:
// check's words for what publish and serve do with it, e's own after the
// feed's name.
func OversizeRefusal(e *OversizeError) string {
	return fmt.Sprintf("feed %q is %s", e.Feed, e.Error())
}

// TrimNote is the note about a feed shortened to stay under limit
// (service.oversize: trim), in the one wording of check, publish and
// serve: "plot-sun.ics shortened to 2027-06-03 to stay under 1 MB (now
// 974.6 kB, 2,032 events)", the size and the count written as check's
// table and publish's summary write them.
func TrimNote(t Trimmed, limit int) string {
	now, most := FormatBytesOver(int64(t.Feed.Bytes), int64(limit))
	return fmt.Sprintf("%s shortened to %s to stay under %s (now %s, %s %s)",
		t.Feed.File, t.To.Format(time.DateOnly), most, now, feed.FormatCount(t.Feed.Events), plural(t.Feed.Events, "event", "events"))
}

// FormatLimit writes a size limit as OversizeWarning and TrimNote write it:
// with no more decimals than it needs ("400 kB", "1 MB", "1.25 MB").
func FormatLimit(limit int) string { return formatLimit(int64(limit)) }

func displayDir(dir string) string {
	if dir == "" || strings.HasSuffix(dir, string(os.PathSeparator)) || strings.HasSuffix(dir, "/") {
		return dir
	}
	return dir + string(os.PathSeparator)
}
