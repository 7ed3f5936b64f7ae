package publish

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"time"

	"heliocal/feed"
)

// ManifestName is the name of shard sh's manifest: "feeds-<i>-of-<n>.json".
func ManifestName(sh Shard) string {
	return fmt.Sprintf("feeds-%d-of-%d.json", sh.Index, sh.Count)
}

// manifestJSON is a shard's record of the feeds it published: enough to build
// feeds.json and index.html once every shard has published.
type manifestJSON struct {
	Shard     string    `json:"shard"`
	Generated time.Time `json:"generated"`
	// FeedIDs fingerprints the configuration's whole set of feed ids (every
	// shard's): manifests of different configurations are never merged.
	FeedIDs string         `json:"feed_ids_sha256"`
	Feeds   []FeedInfo     `json:"feeds"`
	Sites   []manifestSite `json:"sites"`
}

type manifestSite struct {
	ID        string  `json:"id"`
	Name      string  `json:"name"`
	Latitude  float64 `json:"latitude"`
	Longitude float64 `json:"longitude"`
	Elevation float64 `json:"elevation"`
	TimeZone  string  `json:"timezone"`
}

func (l *listing) manifest(sh Shard, digest string) (File, error) {
	m := manifestJSON{Shard: sh.String(), Generated: l.generated, FeedIDs: digest, Feeds: l.feeds, Sites: []manifestSite{}}
	if m.Feeds == nil {
		m.Feeds = []FeedInfo{}
	}
	for _, s := range l.sites {
		zone := "UTC"
		if s.Location != nil {
			zone = s.Location.String()
		}
		m.Sites = append(m.Sites, manifestSite{s.ID, s.Name, s.Latitude, s.Longitude, s.Elevation, zone})
	}
	b, err := marshalJSON(m)
	if err != nil {
		return File{}, err
	}
	return File{Name: ManifestName(sh), ContentType: ContentTypeJSON, Data: b, Checksum: checksum(b), ModTime: l.generated}, nil
}

// readManifests reads the manifests of every shard of n in dir that belong to
// the configuration digest, in shard order, with their raw bytes.
func readManifests(dir string, n int, digest string) ([]manifestJSON, [][]byte, error) {
	var ms []manifestJSON
	var raws [][]byte
	for i := range n {
		name := ManifestName(Shard{Index: i, Count: n})
		raw, err := os.ReadFile(filepath.Join(dir, name))
		if errors.Is(err, fs.ErrNotExist) {
			continue
		}
		if err != nil {
			return nil, nil, fmt.Errorf("publish: shard manifest: %w", err)
		}
		var m manifestJSON
		if err := json.Unmarshal(raw, &m); err != nil {
			return nil, nil, fmt.Errorf("publish: shard manifest %s: %w", name, err)
		}
		if m.FeedIDs != digest {
			continue // another configuration's; that shard has not run yet
		}
		ms = append(ms, m)
		raws = append(raws, raw)
	}
	return ms, raws, nil
}

// mergeShards writes feeds.json and index.html from the shard manifests when
// all n are present for this configuration. It reports IndexWritten,
// IndexUnchanged or IndexPending, and how many manifests it found.
//
// Two shards finishing together may both merge; each re-reads the manifests
// after writing and merges again if they changed meanwhile, so the last
// index written always reflects every manifest.
func (w *Writer) mergeShards(ctx context.Context, n int, digest string, opts *RenderOptions) (string, int, error) {
	status := IndexUnchanged
	for range 5 {
		ms, raws, err := readManifests(w.Dir, n, digest)
		if err != nil {
			return "", 0, err
		}
		if len(ms) < n {
			return IndexPending, len(ms), nil
		}
		var l listing
		seenSite := map[string]bool{}
		var gen time.Time
		for _, m := range ms {
			l.feeds = append(l.feeds, m.Feeds...)
			if m.Generated.After(gen) {
				gen = m.Generated
			}
			for _, s := range m.Sites {
				if seenSite[s.ID] {
					continue
				}
				seenSite[s.ID] = true
				loc, err := time.LoadLocation(s.TimeZone)
				if err != nil {
					return "", 0, fmt.Errorf("publish: shard manifest: site %s: %w", s.ID, err)
				}
				l.sites = append(l.sites, feed.Site{ID: s.ID, Name: s.Name, Latitude: s.Latitude,
					Longitude: s.Longitude, Elevation: s.Elevation, Location: loc})
			}
		}
		l.finish(gen)
		files, err := l.indexFiles(ctx, opts)
		if err != nil {
			return "", 0, err
		}
		for _, f := range files {
			written, err := w.writeFile(f.Name, f.Data)
			if err != nil {
				return "", 0, err
			}
			if written {
				status = IndexWritten
			}
			if err := syncDir(w.Dir); err != nil {
				return "", 0, err
			}
		}
		_, again, err := readManifests(w.Dir, n, digest)
		if err != nil {
			return "", 0, err
		}
		if equalRaw(raws, again) {
			return status, n, nil
		}
	}
	return status, n, nil
}

func equalRaw(a, b [][]byte) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if !bytes.Equal(a[i], b[i]) {
			return false
		}
	}
	return true
}

// Publish renders the run's feeds and writes them into w.Dir, streaming: each
// feed is computed, encoded and written while the next ones render on the
// other workers, and only its FeedInfo is kept, so memory stays bounded by
// the worker count, not by the number of feeds.
//
// Order and atomicity: every .ics file first (each through a temporary file
// and a rename, skipped when its bytes are unchanged), then feeds.json, then
// index.html, each phase made durable before the next, so the index never
// lists a feed that is not on disk. Files of feeds no longer configured are
// left in place: publish never deletes what subscribers may still poll.
//
// Sharded (opts.Shard.Count > 1): the shard writes its .ics files and its
// manifest ManifestName(shard) listing them. It then looks for the manifests
// of all n shards for the same set of feed ids; when they are all there
// (this shard is the last to finish), it writes feeds.json and index.html
// for every feed from them, otherwise Stats.Index is IndexPending and the
// last shard will. Shards must share the directory (one volume) for that.
func Publish(ctx context.Context, srcs []Source, opts RenderOptions, w *Writer) (Stats, error) {
	start := time.Now()
	st := Stats{Shard: opts.Shard}
	p := opts.Progress
	fail := func(err error) (Stats, error) {
		st.Elapsed = time.Since(start)
		if p != nil {
			p.Abort()
		}
		return st, err
	}
	sel, err := selectSources(srcs, opts.Shard)
	if err != nil {
		return fail(err)
	}
	if _, err := opts.base(); err != nil {
		return fail(err)
	}
	removed, err := w.prepare()
	st.TempRemoved = removed
	if err != nil {
		return fail(err)
	}
	st.Feeds = len(sel)
	if p != nil {
		p.Start(len(sel))
	}
	limit := opts.maxFeedBytes()
	st.MaxFeedBytes = limit
	var l listing
	var stamps []time.Time
	err = renderAll(ctx, sel, &opts, func(r rendered) error {
		written, err := w.writeFile(r.file.Name, r.file.Data)
		if err != nil {
			return err
		}
		if written {
			st.FeedsWritten++
			st.FilesWritten++
		} else {
			st.FeedsUnchanged++
			st.FilesUnchanged++
		}
		st.Events += r.info.Events
		st.Bytes += int64(r.info.Bytes)
		if limit > 0 && r.info.Bytes > limit {
			st.Oversize = append(st.Oversize, r.info)
		}
		l.add(r)
		stamps = append(stamps, r.stamp)
		if p != nil {
			p.Feed(r.info, written)
		}
		return nil
	})
	if err != nil {
		return fail(err)
	}
	if err := syncDir(w.Dir); err != nil {
		return fail(err)
	}
	if err := ctx.Err(); err != nil {
		return fail(fmt.Errorf("publish: %w", err))
	}
	l.finish(opts.Generated, stamps...)

	var files []File
	if opts.Shard.Sharded() {
		m, err := l.manifest(opts.Shard, idsDigest(srcs))
		if err != nil {
			return fail(err)
		}
		files = []File{m}
	} else {
		files, err = l.indexFiles(ctx, &opts)
		if err != nil {
			return fail(err)
		}
	}
	st.Index = IndexUnchanged
	for _, f := range files {
		written, err := w.writeFile(f.Name, f.Data)
		if err != nil {
			return fail(err)
		}
		if written {
			st.FilesWritten++
			st.Index = IndexWritten
		} else {
			st.FilesUnchanged++
		}
		if err := syncDir(w.Dir); err != nil {
			return fail(err)
		}
	}
	if opts.Shard.Sharded() {
		status, _, err := w.mergeShards(ctx, opts.Shard.Count, idsDigest(srcs), &opts)
		if err != nil {
			return fail(err)
		}
		st.Index = status
	}
	sort.Slice(st.Oversize, func(i, j int) bool { return st.Oversize[i].ID < st.Oversize[j].ID })
	st.Elapsed = time.Since(start)
	if p != nil {
		p.Finish(st, w.Dir)
	}
	return st, nil
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
	status, _, err := w.mergeShards(ctx, opts.Shard.Count, idsDigest(srcs), &opts)
	return status, err
}
