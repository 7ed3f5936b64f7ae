package publish

import (
	"context"
	"fmt"
	"io/fs"
	"net/url"
	"os"
	"path/filepath"
	"sort"
	"sync"
	"time"
)

// publishRun is one Publish call, in the order of its steps: start checks
// the inputs and prepares the directory, stage renders every feed and writes
// the changed ones to temporary files (no lock: shards of one run do this in
// parallel), commit takes the directory's lock and makes the new set visible.
type publishRun struct {
	w      *Writer
	opts   *RenderOptions
	srcs   []Source // every feed of the configuration
	sel    []Source // the run's shard of them
	digest string   // configuration fingerprint, see runDigest
	enc    encodeFunc
	base   *url.URL
	start  time.Time
	st     Stats
	list   listing
	stamps []time.Time
	staged []stagedFeed

	// temps are the temporary files the workers have written, emitted or
	// not yet, so that a failed run removes every one it left.
	mu    sync.Mutex
	temps []string
	// live is the run's shared lock on LiveName, from the start to the
	// end: its temporary files are its own.
	live *liveLock
}

// stagedFeed is one rendered feed waiting for the commit.
type stagedFeed struct {
	src  Source
	name string
	tmp  string      // its temporary file; "" when the file on disk already holds the bytes
	seen fs.FileInfo // that file as found at staging, to notice a replacement since
}

func startRun(srcs []Source, opts *RenderOptions, w *Writer) (*publishRun, error) {
	r := &publishRun{w: w, opts: opts, srcs: srcs, start: time.Now(), st: Stats{Shard: opts.Shard}}
	sel, err := selectSources(srcs, opts.Shard)
	if err != nil {
		return r, err
	}
	r.sel = sel
	if r.base, err = opts.base(); err != nil {
		return r, err
	}
	r.enc = opts.encoder()
	r.digest = runDigest(srcs, opts)
	removed, err := w.prepare()
	r.st.TempRemoved = removed
	if err != nil {
		return r, err
	}
	r.st.Feeds = len(sel)
	r.st.MaxFeedBytes = opts.maxFeedBytes()
	if p := opts.Progress; p != nil {
		p.Start(len(sel))
	}
	return r, nil
}

// stage renders the shard's feeds on the worker pool; each worker writes
// each changed feed it renders to a complete temporary file beside its final
// name (each unchanged one is only remembered), so the disk's work overlaps
// the computing and each worker reuses one buffer for all its feeds.
func (r *publishRun) stage(ctx context.Context) error {
	work := func(rd *rendered) error {
		sf, err := r.w.stageFile(rd.src, rd.file)
		if sf.tmp != "" {
			r.mu.Lock()
			r.temps = append(r.temps, sf.tmp)
			r.mu.Unlock()
		}
		rd.staged = sf
		if err != nil {
			// staging replaces nothing: say so, as a failed commit does,
			// to whoever finds the disk full or a directory where a feed
			// goes
			err = unchanged(err)
		}
		return err
	}
	err := renderAll(ctx, r.sel, r.opts, work, func(rd rendered) error {
		sf := rd.staged
		r.staged = append(r.staged, sf)
		r.st.Events += rd.info.Events
		r.st.Bytes += int64(rd.info.Bytes)
		if limit := r.st.MaxFeedBytes; limit > 0 && rd.info.Bytes > limit {
			r.st.Oversize = append(r.st.Oversize, rd.info)
		}
		r.list.add(rd) // with the feed shortened, if it was (r.list.trimmed)
		r.stamps = append(r.stamps, rd.stamp)
		if p := r.opts.Progress; p != nil {
			p.Feed(rd.info, sf.tmp != "")
		}
		return nil
	})
	r.st.Trimmed = r.list.trimmed
	if err != nil {
		return err
	}
	if err := ctx.Err(); err != nil {
		return fmt.Errorf("publish: %w", err)
	}
	r.list.finish(r.opts.Generated, r.stamps...)
	return nil
}

// stageFile writes f to a temporary file unless the directory already holds
// its bytes.
func (w *Writer) stageFile(src Source, f File) (stagedFeed, error) {
	sf := stagedFeed{src: src, name: f.Name}
	fi, same, err := sameRegular(filepath.Join(w.Dir, f.Name), f.Data)
	if err != nil {
		return sf, err
	}
	if same {
		sf.seen = fi
		return sf, nil
	}
	sf.tmp, err = w.writeTemp(f.Name, f.Data)
	return sf, err
}

// commit makes the staged feeds visible under the directory's lock:
//
//  1. feeds found unchanged at staging but replaced since (by another run)
//     are rendered again, so the listing never vouches for bytes it did not
//     check;
//  2. manifests of another configuration or shard count are removed when
//     that run is finished or abandoned, and the commit is refused when it
//     is still running (a mix of two configurations);
//  3. retract: feeds.json stops listing, and the shard's old manifest goes,
//     before any listed file is replaced;
//  4. the temporary files are renamed over the feeds;
//  5. the shard's manifest, feeds.json and index.html are written.
//
// Each step is durable (directory fsync) before the next, so at every instant
// every file feeds.json lists is on disk with the listed size and checksum.
//
// A commit that fails part-way (a file it cannot replace, a full disk)
// puts back every file it changed, so the directory holds the publication
// before it, whole (see Writer.keep).
func (r *publishRun) commit(ctx context.Context) (err error) {
	unlock, err := r.w.lockDir(ctx)
	if err != nil {
		return unchanged(err)
	}
	defer unlock()
	r.w.removePrevs()
	r.mu.Lock()
	own := tempBases(r.temps)
	r.mu.Unlock()
	r.st.TempRemoved += r.w.removeOrphanTemps(r.live, own)
	// until the undo log begins, nothing published is changed: a failure
	// says so, as one while staging does
	if err := r.restage(ctx); err != nil {
		return unchanged(err)
	}
	sets, err := r.w.scanManifests()
	if err != nil {
		return unchanged(err)
	}
	if err := r.w.checkMix(sets, r.digest, r.opts.Shard); err != nil {
		return unchanged(err)
	}
	r.w.beginUndo()
	defer func() { err = r.w.endUndo(err) }()
	if err := r.retract(sets); err != nil {
		return err
	}
	if err := r.w.installAll(r.staged, &r.st); err != nil {
		return err
	}
	return r.writeListing(ctx)
}

// restage renders again every feed found unchanged at staging whose file has
// been replaced or touched since, and stages it as changed if it differs.
func (r *publishRun) restage(ctx context.Context) error {
	for i, sf := range r.staged {
		if sf.tmp != "" {
			continue
		}
		now, err := os.Lstat(filepath.Join(r.w.Dir, sf.name))
		if err == nil && os.SameFile(sf.seen, now) && now.Size() == sf.seen.Size() && now.ModTime().Equal(sf.seen.ModTime()) {
			continue
		}
		rd, err := renderOne(ctx, sf.src, r.enc, r.base, nil)
		if err != nil {
			return err
		}
		if r.staged[i], err = r.w.stageFile(sf.src, rd.file); err != nil {
			return err
		}
	}
	return nil
}

// retract removes from the directory every record that would stop being
// true once the staged feeds are renamed: the manifests of other runs
// (checkMix has found them finished or abandoned), this shard's previous
// manifest, and feeds.json's entries for the feeds about to change.
func (r *publishRun) retract(sets []*shardSet) error {
	changed := changedIDs(r.staged)
	var names []string
	for _, s := range sets {
		if s.digest == r.digest && s.count == r.opts.Shard.Count && r.opts.Shard.Sharded() {
			if s.indexes[r.opts.Shard.Index] && len(changed) > 0 {
				names = append(names, ManifestName(r.opts.Shard))
			}
			continue
		}
		names = append(names, s.names...)
	}
	if err := r.w.removeFiles(names); err != nil {
		return err
	}
	return r.w.retractFeeds(changed)
}

// writeListing writes what lists the feeds: for a whole run feeds.json and
// index.html; for a shard its manifest, then feeds.json updated with the
// shard's feeds, and index.html once every shard of the run has committed.
func (r *publishRun) writeListing(ctx context.Context) error {
	if !r.opts.Shard.Sharded() {
		files, err := r.list.indexFiles(ctx, r.opts)
		if err != nil {
			return err
		}
		r.st.Index = IndexUnchanged
		for _, f := range files {
			if err := r.w.writeCounted(&r.st, f, true); err != nil {
				return err
			}
		}
		return nil
	}
	m, err := r.list.manifest(r.opts.Shard, r.digest)
	if err != nil {
		return err
	}
	if err := r.w.writeCounted(&r.st, m, false); err != nil {
		return err
	}
	files, complete, err := r.w.shardListing(ctx, r.srcs, r.opts, r.digest, &r.list)
	if err != nil {
		return err
	}
	r.st.Index = IndexPending
	if complete {
		r.st.Index = IndexUnchanged
	}
	for _, f := range files {
		if err := r.w.writeCounted(&r.st, f, complete); err != nil {
			return err
		}
	}
	return nil
}

// writeCounted writes one listing file durably and counts it in st (as the
// index when index is set).
func (w *Writer) writeCounted(st *Stats, f File, index bool) error {
	written, err := w.writeFile(f.Name, f.Data)
	if err != nil {
		return err
	}
	if written {
		st.FilesWritten++
		if index {
			st.Index = IndexWritten
		}
	} else {
		st.FilesUnchanged++
	}
	return syncDir(w.Dir)
}

// finish ends the run: on error it removes the temporary files it staged
// and has not renamed.
func (r *publishRun) finish(err error) (Stats, error) {
	defer r.live.release()
	r.st.Elapsed = time.Since(r.start)
	p := r.opts.Progress
	if err != nil {
		removeStaged(r.staged)
		r.mu.Lock()
		for _, tmp := range r.temps {
			os.Remove(tmp) // those renamed into place are gone already
		}
		r.mu.Unlock()
		if p != nil {
			p.Abort()
		}
		return r.st, err
	}
	sort.Slice(r.st.Oversize, func(i, j int) bool { return r.st.Oversize[i].ID < r.st.Oversize[j].ID })
	if p != nil {
		p.Finish(r.st, r.w.Dir)
	}
	return r.st, nil
}
