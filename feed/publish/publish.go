package publish

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"sort"
	"sync"
	"time"

	"heliocal/feed"
	"heliocal/internal/stopped"
)

// DefaultRunMaxAge is how long an unfinished sharded run is taken as still
// running: while its newest manifest is younger, a run of another
// configuration (or shard count) refuses to publish into the directory.
const DefaultRunMaxAge = time.Hour

// ErrMixedRuns is wrapped by the error of a run refused because the output
// directory holds an unfinished sharded run of another configuration.
var ErrMixedRuns = errors.New("refusing to mix two configurations in one directory")

// ManifestName is the name of shard sh's manifest: "feeds-<i>-of-<n>.json".
func ManifestName(sh Shard) string {
	return fmt.Sprintf("feeds-%d-of-%d.json", sh.Index, sh.Count)
}

// parseManifestName recognises a shard manifest's name.
func parseManifestName(name string) (Shard, bool) {
	var sh Shard
	if _, err := fmt.Sscanf(name, "feeds-%d-of-%d.json", &sh.Index, &sh.Count); err != nil {
		return Shard{}, false
	}
	if sh.Count < 2 || sh.Count > MaxShards || sh.Index < 0 || sh.Index >= sh.Count || ManifestName(sh) != name {
		return Shard{}, false
	}
	return sh, true
}

// manifestJSON is a shard's record of the feeds it published: enough to build
// feeds.json and index.html once every shard has published.
type manifestJSON struct {
	Shard     string    `json:"shard"`
	Generated time.Time `json:"generated"`
	// Configuration fingerprints the run's configuration (runDigest):
	// manifests of different configurations are never merged.
	Configuration string `json:"configuration_sha256"`
	// Conditions tells that Sites carry each site's horizon and air where
	// they are not a flat horizon and the standard refraction; the
	// manifests of earlier versions do not, and a merge takes them from the
	// configuration instead (RenderOptions.Sites).
	Conditions bool           `json:"site_conditions"`
	Feeds      []FeedInfo     `json:"feeds"`
	Sites      []manifestSite `json:"sites"`
	// Trimmed are the feeds service.oversize: trim shortened, for the
	// charts of the index.
	Trimmed []manifestTrim `json:"trimmed,omitempty"`
}

// manifestTrim is a feed shortened to its last date To ("2027-03-01").
type manifestTrim struct {
	Feed string `json:"feed"`
	To   string `json:"to"`
}

type manifestSite struct {
	ID        string  `json:"id"`
	Name      string  `json:"name"`
	Latitude  float64 `json:"latitude"`
	Longitude float64 `json:"longitude"`
	Elevation float64 `json:"elevation"`
	TimeZone  string  `json:"timezone"`
	// The horizon and the air, written only when they are not a flat
	// horizon and the standard refraction (feed.Site): the merged index's
	// place lines name them. A level horizon written 0 is "horizon": 0.
	Horizon     *float64         `json:"horizon,omitempty"`
	Skyline     *manifestSkyline `json:"skyline,omitempty"`
	Pressure    float64          `json:"pressure_hpa,omitempty"`
	Temperature *float64         `json:"temperature_c,omitempty"` // with Pressure
}

// manifestSkyline is a site's skyline as its words name it (feed.SkylineFacts).
type manifestSkyline struct {
	Low    float64 `json:"low"`
	High   float64 `json:"high"`
	Points int     `json:"points"`
	File   string  `json:"file,omitempty"`
}

func (l *listing) manifest(sh Shard, digest string) (File, error) {
	m := manifestJSON{Shard: sh.String(), Generated: l.generated, Configuration: digest, Conditions: true, Feeds: l.feeds, Sites: []manifestSite{}}
	if m.Feeds == nil {
		m.Feeds = []FeedInfo{}
	}
	for _, s := range l.sites {
		zone := "UTC"
		if s.Location != nil {
			zone = s.Location.String()
		}
		ms := manifestSite{ID: s.ID, Name: s.Name, Latitude: s.Latitude, Longitude: s.Longitude, Elevation: s.Elevation,
			TimeZone: zone, Pressure: s.Pressure}
		if s.Horizon != 0 || s.HorizonSet {
			ms.Horizon = &s.Horizon
		}
		if k := s.Skyline; k.Points > 0 {
			ms.Skyline = &manifestSkyline{k.Low, k.High, k.Points, k.File}
		}
		if s.Pressure != 0 {
			ms.Temperature = &s.Temperature
		}
		m.Sites = append(m.Sites, ms)
	}
	for _, t := range l.trimmed {
		m.Trimmed = append(m.Trimmed, manifestTrim{t.Feed.ID, t.To.Format(time.DateOnly)})
	}
	b, err := marshalJSON(m)
	if err != nil {
		return File{}, err
	}
	return File{Name: ManifestName(sh), ContentType: ContentTypeJSON, Data: b, Checksum: checksum(b), ModTime: l.generated}, nil
}

// runDigest fingerprints a run: the whole configuration's feed ids (every
// shard's) and RenderOptions.Configuration. Shards of one run agree on it.
func runDigest(srcs []Source, opts *RenderOptions) string {
	h := sha256.Sum256([]byte(idsDigest(srcs) + "\n" + opts.Configuration))
	return hex.EncodeToString(h[:])
}

// shardSet is the manifests in a directory of one configuration and shard
// count: one sharded run, finished when every shard's manifest is there.
type shardSet struct {
	digest  string
	count   int
	names   []string
	indexes map[int]bool
	newest  time.Time // the newest manifest's modification time
}

func (s *shardSet) complete() bool { return len(s.indexes) == s.count }

var digestField = sync.OnceValue(func() *regexp.Regexp {
	return regexp.MustCompile(`"configuration_sha256":\s*"([0-9a-f]{64})"`)
})

// manifestDigest reads a manifest's configuration fingerprint from its head
// (where marshalJSON puts it), without reading the feeds it lists; "" when
// the file is not a manifest of ours.
func manifestDigest(path string) (string, error) {
	f, err := os.Open(path)
	if err != nil {
		return "", err
	}
	defer f.Close()
	head := make([]byte, 512)
	n, err := io.ReadFull(f, head)
	if err != nil && err != io.ErrUnexpectedEOF && err != io.EOF {
		return "", err
	}
	if m := digestField().FindSubmatch(head[:n]); m != nil {
		return string(m[1]), nil
	}
	return "", nil
}

// scanManifests groups the shard manifests in w.Dir by run.
func (w *Writer) scanManifests() ([]*shardSet, error) {
	ents, err := os.ReadDir(w.Dir)
	if err != nil {
		return nil, fmt.Errorf("publish: output directory: %w", err)
	}
	type key struct {
		digest string
		count  int
	}
	byKey := map[key]*shardSet{}
	var sets []*shardSet
	for _, e := range ents {
		sh, ok := parseManifestName(e.Name())
		if !ok || !e.Type().IsRegular() {
			continue
		}
		path := filepath.Join(w.Dir, e.Name())
		digest, err := manifestDigest(path)
		if errors.Is(err, fs.ErrNotExist) {
			continue
		}
		if err != nil {
			return nil, fmt.Errorf("publish: shard manifest: %w", err)
		}
		fi, err := e.Info()
		if err != nil {
			continue
		}
		k := key{digest, sh.Count}
		s := byKey[k]
		if s == nil {
			s = &shardSet{digest: digest, count: sh.Count, indexes: map[int]bool{}}
			byKey[k] = s
			sets = append(sets, s)
		}
		s.names = append(s.names, e.Name())
		s.indexes[sh.Index] = true
		if fi.ModTime().After(s.newest) {
			s.newest = fi.ModTime()
		}
	}
	return sets, nil
}

// checkMix refuses a run whose configuration or shard count differs from an
// unfinished sharded run in the directory whose newest manifest is younger
// than RunMaxAge: the two would publish a mix. Finished runs, and runs
// abandoned longer ago, do not hold the directory.
func (w *Writer) checkMix(sets []*shardSet, digest string, sh Shard) error {
	maxAge := w.RunMaxAge
	if maxAge <= 0 {
		maxAge = DefaultRunMaxAge
	}
	now := time.Now()
	if w.now != nil {
		now = w.now()
	}
	for _, s := range sets {
		if sh.Sharded() && s.digest == digest && s.count == sh.Count {
			continue
		}
		age := now.Sub(s.newest)
		if s.complete() || age > maxAge {
			continue
		}
		other := "another configuration"
		if s.digest == digest {
			other = fmt.Sprintf("this configuration split into %d shards", s.count)
		}
		this := "this whole run"
		if sh.Sharded() {
			this = "shard " + sh.String()
		}
		sort.Strings(s.names)
		return fmt.Errorf("publish: output directory %s holds an unfinished sharded run of %s (%d of %d shards done, the last %v ago: %s): %w with %s; let that run finish, or remove its manifests if it was abandoned (after %v it is taken as abandoned)",
			w.Dir, other, len(s.indexes), s.count, age.Round(time.Second), s.names[0], ErrMixedRuns, this, maxAge)
	}
	return nil
}

// removeFiles removes the named files of w.Dir, durably.
func (w *Writer) removeFiles(names []string) error {
	for _, name := range names {
		w.keep(name)
		w.tell("remove " + name)
		if err := os.Remove(filepath.Join(w.Dir, name)); err != nil && !errors.Is(err, fs.ErrNotExist) {
			w.unkeep()
			return fmt.Errorf("publish: %w", err)
		}
	}
	if len(names) == 0 {
		return nil
	}
	return syncDir(w.Dir)
}

// readFeedsJSON reads w.Dir's feeds.json; ok is false when there is none or
// it cannot be read as one.
func (w *Writer) readFeedsJSON() (fj feedsJSON, ok bool, err error) {
	raw, err := os.ReadFile(filepath.Join(w.Dir, FeedsJSONName))
	if errors.Is(err, fs.ErrNotExist) {
		return fj, false, nil
	}
	if err != nil {
		return fj, false, fmt.Errorf("publish: %w", err)
	}
	if json.Unmarshal(raw, &fj) != nil {
		return feedsJSON{}, false, nil
	}
	return fj, true, nil
}

// retractFeeds rewrites feeds.json without the feeds whose files are about
// to be replaced, so it never lists a checksum the disk does not hold. A
// feeds.json that cannot be read is emptied: nothing vouches for it.
func (w *Writer) retractFeeds(ids map[string]bool) error {
	raw, err := os.ReadFile(filepath.Join(w.Dir, FeedsJSONName))
	if errors.Is(err, fs.ErrNotExist) || len(ids) == 0 {
		return nil
	}
	if err != nil {
		return fmt.Errorf("publish: %w", err)
	}
	var fj feedsJSON
	keep := []FeedInfo{}
	if json.Unmarshal(raw, &fj) == nil {
		for _, f := range fj.Feeds {
			if !ids[f.ID] {
				keep = append(keep, f)
			}
		}
		if len(keep) == len(fj.Feeds) {
			return nil
		}
	}
	fj.Feeds = keep
	b, err := marshalJSON(fj)
	if err != nil {
		return err
	}
	if _, err := w.writeFile(FeedsJSONName, b); err != nil {
		return err
	}
	return syncDir(w.Dir)
}

// shardListing returns the listing files a shard writes after its manifest:
// when every shard of the run has committed, feeds.json and index.html made
// from all the manifests (complete); before, feeds.json alone, the current
// one with this shard's entries replaced by own's.
func (w *Writer) shardListing(ctx context.Context, srcs []Source, opts *RenderOptions, digest string, own *listing) ([]File, bool, error) {
	sets, err := w.scanManifests()
	if err != nil {
		return nil, false, err
	}
	for _, s := range sets {
		if s.digest == digest && s.count == opts.Shard.Count && s.complete() {
			files, err := w.mergeManifests(ctx, s.count, digest, opts)
			return files, true, err
		}
	}
	cur, _, err := w.readFeedsJSON()
	if err != nil {
		return nil, false, err
	}
	configured := make(map[string]bool, len(srcs))
	for _, s := range srcs {
		configured[s.ID] = true
	}
	l := listing{feeds: append([]FeedInfo(nil), own.feeds...)}
	for _, f := range cur.Feeds {
		if configured[f.ID] && !opts.Shard.Has(f.ID) {
			l.feeds = append(l.feeds, f)
		}
	}
	gen := own.generated
	if cur.Generated.After(gen) {
		gen = cur.Generated
	}
	l.finish(gen)
	b, err := l.feedsJSON()
	if err != nil {
		return nil, false, err
	}
	return []File{{Name: FeedsJSONName, ContentType: ContentTypeJSON, Data: b, Checksum: checksum(b), ModTime: l.generated}}, false, nil
}

// readManifests reads the manifests of every shard of n in dir that belong to
// the configuration digest, in shard order.
func readManifests(dir string, n int, digest string) ([]manifestJSON, error) {
	var ms []manifestJSON
	for i := range n {
		name := ManifestName(Shard{Index: i, Count: n})
		raw, err := os.ReadFile(filepath.Join(dir, name))
		if errors.Is(err, fs.ErrNotExist) {
			continue
		}
		if err != nil {
			return nil, fmt.Errorf("publish: shard manifest: %w", err)
		}
		var m manifestJSON
		if err := json.Unmarshal(raw, &m); err != nil {
			return nil, fmt.Errorf("publish: shard manifest %s: %w", name, err)
		}
		if m.Configuration != digest {
			continue // another configuration's; that shard has not run yet
		}
		ms = append(ms, m)
	}
	return ms, nil
}

// mergeManifests renders feeds.json and index.html from the manifests of
// all n shards of the run digest; nil when some are missing.
func (w *Writer) mergeManifests(ctx context.Context, n int, digest string, opts *RenderOptions) ([]File, error) {
	ms, err := readManifests(w.Dir, n, digest)
	if err != nil || len(ms) < n {
		return nil, err
	}
	var l listing
	seenSite := map[string]bool{}
	var gen time.Time
	for _, m := range ms {
		l.feeds = append(l.feeds, m.Feeds...)
		if m.Generated.After(gen) {
			gen = m.Generated
		}
		for j, t := range m.Trimmed {
			to, err := time.Parse(time.DateOnly, t.To)
			if err != nil {
				return nil, fmt.Errorf("publish: shard manifest of shard %s: trimmed[%d].to: %q is not a date (YYYY-MM-DD)", m.Shard, j, t.To)
			}
			i := slices.IndexFunc(m.Feeds, func(f FeedInfo) bool { return f.ID == t.Feed })
			if i < 0 {
				return nil, fmt.Errorf("publish: shard manifest of shard %s: trimmed[%d].feed: %q is not one of the shard's feeds", m.Shard, j, t.Feed)
			}
			l.trimmed = append(l.trimmed, Trimmed{Feed: m.Feeds[i], To: to})
		}
		for _, s := range m.Sites {
			if seenSite[s.ID] {
				continue
			}
			seenSite[s.ID] = true
			loc, err := time.LoadLocation(s.TimeZone)
			if err != nil {
				return nil, fmt.Errorf("publish: shard manifest: site %s: %w", s.ID, err)
			}
			site := feed.Site{ID: s.ID, Name: s.Name, Latitude: s.Latitude, Longitude: s.Longitude, Elevation: s.Elevation,
				Location: loc, Pressure: s.Pressure}
			if s.Horizon != nil {
				site.Horizon, site.HorizonSet = *s.Horizon, true
			}
			if k := s.Skyline; k != nil {
				if k.Points <= 0 {
					return nil, fmt.Errorf("publish: shard manifest of shard %s: site %s: skyline.points: %d is not a number of points", m.Shard, s.ID, k.Points)
				}
				site.Skyline = feed.SkylineFacts{Low: k.Low, High: k.High, Points: k.Points, File: k.File}
			}
			if s.Temperature != nil {
				site.Temperature = *s.Temperature
			}
			if !m.Conditions {
				site = conditionsOf(site, opts.Sites)
			}
			l.sites = append(l.sites, site)
		}
	}
	l.finish(gen)
	return l.indexFiles(ctx, opts)
}

// conditionsOf is site with the horizon and air of the site of its id
// among sites (RenderOptions.Sites), for a shard manifest that does not
// record them (written before manifests did); site as it is when none has
// its id.
func conditionsOf(site feed.Site, sites []feed.Site) feed.Site {
	i := slices.IndexFunc(sites, func(s feed.Site) bool { return s.ID == site.ID })
	if i < 0 {
		return site
	}
	c := sites[i]
	site.Horizon, site.HorizonSet, site.Skyline, site.Pressure, site.Temperature = c.Horizon, c.HorizonSet, c.Skyline, c.Pressure, c.Temperature
	return site
}

// Publish renders the run's feeds and writes them into w.Dir, streaming: each
// feed is computed, encoded and written to a temporary file while the next
// ones render on the other workers, and only its FeedInfo is kept, so memory
// stays bounded by the worker count, not by the number of feeds.
//
// Consistency: the computing runs without a lock, so shards of one run work
// in parallel; then the run takes the output directory's exclusive lock
// (LockName; a second run waits up to w.LockWait for it) and commits: it
// retracts from feeds.json the feeds it is about to replace, renames the
// temporary files over them, and writes its manifest (sharded), feeds.json
// and index.html, each step durable before the next (see publishRun.commit).
// Whatever moment the process is killed at, every file feeds.json lists is
// on disk with the listed size and SHA-256, and every file is complete.
// Files of feeds no longer configured are left in place: publish never
// deletes what subscribers may still poll.
//
// Sharded (opts.Shard.Count > 1): the shard commits its .ics files, its
// manifest ManifestName(shard) and feeds.json with its feeds' entries
// updated. When the manifests of all n shards of the run are there (this
// shard is the last to finish), it writes feeds.json and index.html for
// every feed from them, otherwise Stats.Index is IndexPending and the last
// shard will. Shards must share the directory (one volume) for that. A run
// of another configuration or shard count (runDigest) is refused with
// ErrMixedRuns while such a run is unfinished and its newest manifest is
// younger than w.RunMaxAge.
func Publish(ctx context.Context, srcs []Source, opts RenderOptions, w *Writer) (Stats, error) {
	r, err := startRun(srcs, &opts, w)
	if err == nil {
		if r.live, err = w.holdLive(ctx); err != nil {
			err = unchanged(err)
		}
	}
	if err == nil {
		if err = r.stage(ctx); stopped.By(ctx, err) {
			// interrupted (SIGINT, SIGTERM) while computing: staging
			// replaces nothing, and the error says so
			err = unchanged(fmt.Errorf("publish: stopped before any file was replaced: %w", ctx.Err()))
		}
	}
	if err == nil {
		err = r.commit(ctx)
	}
	return r.finish(err)
}

// MergeIndex writes feeds.json and index.html into w.Dir from the shard
// manifests found there, when all opts.Shard.Count of them are present for
// this configuration (srcs lists every feed, of every shard); otherwise it
// reports IndexPending and writes nothing. Publish does this itself when its
// shard finishes on a directory the shards share; MergeIndex is for a final
// step where they do not (each worker uploads to object storage, and one
// job gathers the manifests and writes the index).
func MergeIndex(ctx context.Context, srcs []Source, opts RenderOptions, w *Writer) (string, error) {
	if !opts.Shard.Sharded() {
		return "", fmt.Errorf("publish: merging the index needs the shard count (opts.Shard.Count > 1)")
	}
	if _, err := selectSources(srcs, Shard{}); err != nil {
		return "", err
	}
	if _, err := w.prepare(); err != nil {
		return "", err
	}
	unlock, err := w.lockDir(ctx)
	if err != nil {
		return "", err
	}
	defer unlock()
	files, err := w.mergeManifests(ctx, opts.Shard.Count, runDigest(srcs, &opts), &opts)
	if err != nil || files == nil {
		return IndexPending, err
	}
	var st Stats
	st.Index = IndexUnchanged
	for _, f := range files {
		if err := w.writeCounted(&st, f, true); err != nil {
			return "", err
		}
	}
	return st.Index, nil
}
