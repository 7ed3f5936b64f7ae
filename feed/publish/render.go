package publish

import (
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"net/url"
	"runtime"
	"sort"
	"strings"
	"sync"
	"time"

	"heliocal/config"
	"heliocal/feed"
	"heliocal/feed/ical"
)

// Names and content types of the files beside the feeds.
const (
	FeedsJSONName = "feeds.json"
	IndexName     = "index.html"

	ContentTypeICS  = "text/calendar; charset=utf-8"
	ContentTypeJSON = "application/json"
	ContentTypeHTML = "text/html; charset=utf-8"
)

// DefaultMaxFeedBytes is the feed size above which publish warns: some widely
// used web calendars are reported to drop events from subscriptions larger
// than about 1 MB.
const DefaultMaxFeedBytes = ical.MaxAdvisedSize

// DefaultMaxCharts bounds the charts on the index page: a fleet-sized
// configuration gets a listing that still loads quickly.
const DefaultMaxCharts = 100

// Source is one feed to render: its id, known before any computation (so
// sharding costs nothing), and a function computing its calendar. Build is
// called at most once, possibly from another goroutine, and the calendar is
// dropped as soon as it is encoded, so a large configuration never holds
// every feed's entries at once.
type Source struct {
	ID    string
	Build func(ctx context.Context) (*feed.Calendar, error)
	// Release says that the calendar Build returns is made for this call
	// alone (as feed.Catalogue's are): once it is encoded its entries are
	// handed back (feed.Calendar.Release) and the next feed's reuse their
	// memory, instead of a run allocating every feed's entries afresh.
	Release bool
}

// Calendars wraps calendars that are already built as sources.
func Calendars(cals ...*feed.Calendar) []Source {
	out := make([]Source, len(cals))
	for i, c := range cals {
		out[i] = Source{ID: c.ID, Build: func(context.Context) (*feed.Calendar, error) { return c, nil }}
	}
	return out
}

// RenderOptions control Render and Publish.
type RenderOptions struct {
	// Encode writes one calendar as iCalendar bytes; nil means
	// ical.Marshal with Version.
	Encode func(*feed.Calendar) ([]byte, error)
	// Version is heliocal's version, written into each feed's PRODID.
	Version string
	// BaseURL is the public http(s) URL of the output directory, e.g.
	// "https://sky.example.org/cal/". With it, feeds.json carries absolute
	// URLs and the index offers https:// and webcal:// links; without it the
	// index links are relative and there is no webcal:// link (it needs a host).
	BaseURL string
	// Title heads the index page; empty means DefaultPageTitle.
	Title string
	// Page, when set, gives the index the configuration's page texts and
	// order; nil keeps the built-in caution and the sites by name.
	Page *PageText
	// Generated is the build's date written into feeds.json and the index. It
	// must come from the inputs (e.g. the day the windows are counted from),
	// never from the wall clock, so an unchanged night writes nothing. Zero
	// means the latest Stamp of the feeds.
	Generated time.Time
	// Charts supplies the year's chart of a site for the index page; nil
	// leaves the charts out. It is called once per site, from one goroutine,
	// with the feeds of the site that Oversize "trim" shortened (none
	// otherwise): the chart draws none of their events after the last date
	// each kept (Trimmed.To).
	Charts func(ctx context.Context, site feed.Site, trimmed []Trimmed) (*SiteChart, error)
	// MaxCharts is the most sites the index draws charts for (each weighs
	// about 15 kB); with more sites the page lists them without charts.
	// Zero means DefaultMaxCharts, negative means no limit.
	MaxCharts int
	// Shard restricts the run to one part of the feeds; see Publish for what
	// happens to feeds.json and index.html then.
	Shard Shard
	// Sites are the configuration's sites, of every shard: merging shard
	// manifests written before they recorded a site's horizon and air
	// takes them from here, by the site's id (without the site, its place
	// line names none).
	Sites []feed.Site
	// Configuration fingerprints what the feeds are made from (the command
	// passes a hash of the sites, the feeds and the settings that shape the
	// output). Shards of one run must agree on it: Publish refuses to mix
	// runs of different configurations in one directory. Empty: only the
	// set of feed ids is compared.
	Configuration string
	// Workers bounds the feeds rendered at once; zero means GOMAXPROCS.
	// A worker waits for the disk while it writes its feed, but more
	// workers than cores cost more CPU than those waits: for 1,000 feeds
	// on 2 cores, 4 workers took 10.2 s of CPU and 134-147 MB, 3 took 9.7 s
	// and 120-128 MB, 2 took 9.2 s and 92-99 MB (runs alternating under
	// the same load), with no longer wall time.
	Workers int
	// MaxFeedBytes is the size above which a feed is listed in
	// Stats.Oversize; zero means DefaultMaxFeedBytes, negative disables it.
	MaxFeedBytes int
	// Oversize is what happens to a feed over MaxFeedBytes: OversizeWarn
	// (or ""), OversizeTrim or OversizeFail.
	Oversize string
	// Progress, when set, is told about every feed (a bar on a terminal).
	Progress *Progress
	// Gzip, when set, makes Render keep each feed in the form it returns,
	// made as soon as the feed is rendered: its gzip form (File.Gzip, with
	// File.Data nil), or nil to keep the bytes themselves (a copy in
	// File.Data). It is called on the goroutine that rendered the feed,
	// with the feed's file, whose Data is that goroutine's buffer, reused
	// for its next feed once Gzip returns. Render then holds no more than a
	// few feeds' bytes at once, instead of every feed's before their
	// compressed forms are made. Publish does not call it.
	Gzip func(f *File) []byte
}

func (o *RenderOptions) workers() int {
	if o.Workers > 0 {
		return o.Workers
	}
	return max(1, runtime.GOMAXPROCS(0))
}

func (o *RenderOptions) maxFeedBytes() int {
	if o.MaxFeedBytes == 0 {
		return DefaultMaxFeedBytes
	}
	return o.MaxFeedBytes
}

// base returns the validated base URL ending in "/", or nil.
func (o *RenderOptions) base() (*url.URL, error) {
	if o.BaseURL == "" {
		return nil, nil
	}
	if err := config.CheckBaseURL(o.BaseURL); err != nil {
		return nil, fmt.Errorf("publish: base URL: %w", err)
	}
	u, err := url.Parse(o.BaseURL)
	if err != nil {
		return nil, fmt.Errorf("publish: base URL: %w", err)
	}
	if !strings.HasSuffix(u.Path, "/") {
		u.Path += "/"
		if u.RawPath != "" {
			u.RawPath += "/"
		}
	}
	return u, nil
}

// rendered is one encoded feed with what the index needs of it.
type rendered struct {
	info      FeedInfo
	trimmedTo time.Time // the window was shortened to this last date
	site      feed.Site
	src       Source
	file      File
	data      []byte // the encoder's buffer, file.Data on success
	stamp     time.Time
	staged    stagedFeed // what renderAll's work did with the bytes
	kept      []byte     // what renderAll's work kept of them: file.Data after it
}

// select returns the sources of the run's shard, checking ids.
func selectSources(srcs []Source, sh Shard) ([]Source, error) {
	seen := make(map[string]bool, len(srcs))
	var out []Source
	for i, s := range srcs {
		if err := checkName(s.ID + ".ics"); err != nil || s.ID == "" {
			return nil, fmt.Errorf("publish: feeds[%d]: invalid feed id %q", i, s.ID)
		}
		if seen[s.ID] {
			return nil, fmt.Errorf("publish: feeds[%d]: feed id %q appears twice", i, s.ID)
		}
		if s.Build == nil {
			return nil, fmt.Errorf("publish: feeds[%d] (%s): no calendar builder", i, s.ID)
		}
		seen[s.ID] = true
		if sh.Has(s.ID) {
			out = append(out, s)
		}
	}
	return out, nil
}

// idsDigest fingerprints the whole configuration's feed ids (every shard's),
// so shard manifests of different configurations are never merged.
func idsDigest(srcs []Source) string {
	ids := make([]string, len(srcs))
	for i, s := range srcs {
		ids[i] = s.ID
	}
	sort.Strings(ids)
	h := sha256.Sum256([]byte(strings.Join(ids, "\n")))
	return hex.EncodeToString(h[:])
}

func checksum(b []byte) string {
	h := sha256.Sum256(b)
	return hex.EncodeToString(h[:])
}

// renderOne builds and encodes one feed, appending its bytes to dst[:0]
// (rendered.file.Data is that buffer); the calendar is dropped on return.
func renderOne(ctx context.Context, s Source, enc encodeFunc, base *url.URL, dst []byte) (rendered, error) {
	cal, err := s.Build(ctx)
	if err != nil {
		return rendered{}, fmt.Errorf("publish: feed %s: %w", s.ID, err)
	}
	if cal == nil {
		return rendered{}, fmt.Errorf("publish: feed %s: no calendar", s.ID)
	}
	if cal.ID != s.ID {
		return rendered{}, fmt.Errorf("publish: feed %s: calendar has id %q", s.ID, cal.ID)
	}
	data, err := enc(dst[:0], cal)
	events := len(cal.Entries)
	if s.Release {
		cal.Release()
	}
	if err != nil {
		return rendered{data: data}, fmt.Errorf("publish: feed %s: %w", s.ID, err)
	}
	name := s.ID + ".ics"
	sum := checksum(data)
	u := cal.URL
	if base != nil {
		u = base.JoinPath(name).String()
	}
	return rendered{
		info: FeedInfo{
			ID: s.ID, Title: cal.Title, Site: cal.Site.ID, File: name, URL: u,
			Events: events, Bytes: len(data), Checksum: sum,
		},
		trimmedTo: cal.TrimmedTo,
		site:      cal.Site,
		src:       s,
		file:      File{Name: name, ContentType: ContentTypeICS, Data: data, Checksum: sum, ModTime: cal.Stamp.UTC()},
		data:      data,
		stamp:     cal.Stamp,
	}, nil
}

// renderAll renders srcs with a bounded pool of workers and hands each result
// to emit in the order of srcs, from the calling goroutine. At most 2×workers
// feeds are in flight (rendered but not yet emitted), which bounds memory.
//
// With work set, each worker calls it on its goroutine with each feed it has
// rendered, before the feed goes to emit: there the feed's bytes are in the
// worker's own buffer, reused for its next feed, so emit sees the feed
// without its bytes (file.Data is what work left in rendered.kept, nil
// unless it kept a copy). Without work every feed gets a buffer of its own,
// kept in file.Data.
func renderAll(ctx context.Context, srcs []Source, opts *RenderOptions, work func(*rendered) error, emit func(rendered) error) error {
	base, err := opts.base()
	if err != nil {
		return err
	}
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()

	workers := min(opts.workers(), max(1, len(srcs)))
	type result struct {
		r   rendered
		err error
	}
	results := make([]chan result, len(srcs))
	for i := range results {
		results[i] = make(chan result, 1)
	}
	jobs := make(chan int)
	slots := make(chan struct{}, 2*workers)
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			enc := opts.encoder()
			var buf []byte
			if work != nil {
				// the worker's own buffer, which no feed outlives (see
				// below): it is freed when the worker is done
				var free func()
				buf, free = newFeedBuffer()
				defer free()
			}
			for i := range jobs {
				if err := ctx.Err(); err != nil {
					results[i] <- result{err: fmt.Errorf("publish: %w", err)}
					continue
				}
				r, err := renderOne(ctx, srcs[i], enc, base, buf)
				if work != nil {
					buf = r.data[:0]
					if err == nil {
						err = work(&r)
					}
					r.file.Data, r.data, r.kept = r.kept, nil, nil
				}
				results[i] <- result{r, err}
			}
		}()
	}
	go func() {
		defer close(jobs)
		for i := range srcs {
			select {
			case slots <- struct{}{}:
			case <-ctx.Done():
				return
			}
			select {
			case jobs <- i:
			case <-ctx.Done():
				return
			}
		}
	}()
	defer wg.Wait()
	// feeds refused for their size: the rest are still rendered, so that
	// the error names every one of them (as check does), but no longer
	// emitted, as the publish fails
	var refused []error
	for i := range srcs {
		var res result
		select {
		case res = <-results[i]:
		case <-ctx.Done():
			return fmt.Errorf("publish: %w", ctx.Err())
		}
		if res.err != nil {
			if errors.As(res.err, new(*OversizeError)) {
				refused = append(refused, res.err)
				<-slots
				continue
			}
			cancel()
			return errors.Join(append(refused, res.err)...)
		}
		if len(refused) == 0 {
			if err := emit(res.r); err != nil {
				cancel()
				return err
			}
		}
		<-slots
	}
	return errors.Join(refused...)
}

// listing is what feeds.json and the index are made of.
type listing struct {
	generated time.Time
	feeds     []FeedInfo  // sorted by id
	sites     []feed.Site // one per site id, sorted by id
	trimmed   []Trimmed   // the feeds Oversize "trim" shortened
}

func (l *listing) add(r rendered) {
	l.feeds = append(l.feeds, r.info)
	if !r.trimmedTo.IsZero() {
		l.trimmed = append(l.trimmed, Trimmed{Feed: r.info, To: r.trimmedTo})
	}
	for _, s := range l.sites {
		if s.ID == r.site.ID {
			return
		}
	}
	l.sites = append(l.sites, r.site)
}

func (l *listing) finish(generated time.Time, stamps ...time.Time) {
	sort.Slice(l.feeds, func(i, j int) bool { return l.feeds[i].ID < l.feeds[j].ID })
	sort.Slice(l.sites, func(i, j int) bool { return l.sites[i].ID < l.sites[j].ID })
	if generated.IsZero() {
		for _, s := range stamps {
			if s.After(generated) {
				generated = s
			}
		}
	}
	l.generated = generated.UTC()
}

// feedsJSON is the layout of feeds.json.
type feedsJSON struct {
	Generated time.Time  `json:"generated"`
	Feeds     []FeedInfo `json:"feeds"`
}

func marshalJSON(v any) ([]byte, error) {
	b, err := json.MarshalIndent(v, "", "  ")
	if err != nil {
		return nil, fmt.Errorf("publish: %w", err)
	}
	return append(b, '\n'), nil
}

func (l *listing) feedsJSON() ([]byte, error) {
	feeds := l.feeds
	if feeds == nil {
		feeds = []FeedInfo{}
	}
	return marshalJSON(feedsJSON{Generated: l.generated, Feeds: feeds})
}

// indexFiles renders feeds.json and index.html for the listing.
func (l *listing) indexFiles(ctx context.Context, opts *RenderOptions) ([]File, error) {
	fj, err := l.feedsJSON()
	if err != nil {
		return nil, err
	}
	html, err := renderIndex(ctx, l, opts)
	if err != nil {
		return nil, err
	}
	return []File{
		{Name: FeedsJSONName, ContentType: ContentTypeJSON, Data: fj, Checksum: checksum(fj), ModTime: l.generated},
		{Name: IndexName, ContentType: ContentTypeHTML, Data: html, Checksum: checksum(html), ModTime: l.generated},
	}, nil
}

// Render builds every feed of the run in memory: the .ics files, feeds.json
// and index.html (or, for a shard, its manifest; see Publish). feed/serve
// holds the result, each feed in its gzip form (RenderOptions.Gzip); for
// writing a large configuration to disk, Publish keeps memory bounded
// instead. Files are sorted by name.
func Render(ctx context.Context, srcs []Source, opts RenderOptions) (*Bundle, error) {
	sel, err := selectSources(srcs, opts.Shard)
	if err != nil {
		return nil, err
	}
	var l listing
	var files []File
	var stamps []time.Time
	var work func(*rendered) error
	if opts.Gzip != nil {
		work = func(r *rendered) error {
			if r.file.Gzip = opts.Gzip(&r.file); r.file.Gzip == nil {
				r.kept = bytes.Clone(r.data)
			}
			return nil
		}
	}
	err = renderAll(ctx, sel, &opts, work, func(r rendered) error {
		l.add(r) // with the feed shortened, if it was (l.trimmed)
		files = append(files, r.file)
		stamps = append(stamps, r.stamp)
		if opts.Progress != nil {
			opts.Progress.Feed(r.info, true)
		}
		return nil
	})
	if err != nil {
		return nil, err
	}
	l.finish(opts.Generated, stamps...)
	if opts.Shard.Sharded() {
		m, err := l.manifest(opts.Shard, runDigest(srcs, &opts))
		if err != nil {
			return nil, err
		}
		files = append(files, m)
	} else {
		more, err := l.indexFiles(ctx, &opts)
		if err != nil {
			return nil, err
		}
		files = append(files, more...)
	}
	sort.Slice(files, func(i, j int) bool { return files[i].Name < files[j].Name })
	return &Bundle{Built: l.generated, Feeds: l.feeds, Files: files, Trimmed: l.trimmed}, nil
}
