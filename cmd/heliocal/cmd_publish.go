package main

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"runtime/debug"
	"slices"
	"strings"
	"syscall"
	"time"

	"github.com/spf13/cobra"

	"heliocal/config"
	"heliocal/feed"
	"heliocal/feed/publish"
)

type publishOptions struct {
	out      string
	shard    string
	baseURL  string
	quiet    bool
	lockWait time.Duration
}

func newPublishCommand(g *globals) *cobra.Command {
	o := &publishOptions{}
	cmd := &cobra.Command{
		Use:   "publish",
		Short: "Write every feed, feeds.json and index.html to a directory",
		Long: `Compute every configured feed and write it to the output directory as <feed-id>.ics,
with feeds.json (machine-readable list) and index.html (subscribe links and a chart of the
year per site). Each file is written to a temporary file and renamed, so subscribers never
see a half-written feed; files whose bytes did not change are not rewritten. A lighting
limit that does nothing on some dates gets the warning check gives, on standard error.

With --shard i/n (i counted from 0, n at most 10000) only the feeds whose id hashes to i are
published, so n workers can share a large configuration; the last shard to finish writes the
index.

Runs into one directory compute in parallel and take turns to change it: each holds the lock
file .heliocal-publish.lock there only while it renames its files and updates feeds.json. A run
that finds the lock taken waits for it (up to --lock-wait, then exit 1). feeds.json never lists
a file that is not on disk with the listed size and sha256, even after a crash or a kill. A
sharded run refuses (exit 1) a directory where an unfinished sharded run of another
configuration or shard count has written within the last hour.

Without --config, ./heliocal.yaml is used if present, else the built-in demo.` + exitStatusHelp,
		Example: `  heliocal publish
  heliocal publish --config farm.yaml --out /var/www/sky --base-url https://sky.example.org/
  heliocal publish --config fleet.yaml --shard 3/8 --out /srv/public`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			return runPublish(cmd.Context(), g, o, time.Now())
		},
	}
	f := cmd.Flags()
	f.StringVarP(&o.out, "out", "o", "", "output directory (default: service.out_dir, \"public\")")
	f.StringVar(&o.shard, "shard", "", "publish only shard i of n, written i/n with i from 0 (e.g. 0/4)")
	f.StringVar(&o.baseURL, "base-url", "", "public URL of the output directory (default: service.base_url)")
	f.BoolVarP(&o.quiet, "quiet", "q", false, "print nothing but errors and warnings")
	f.DurationVar(&o.lockWait, "lock-wait", publish.DefaultLockWait, "how long to wait for another publish into the same directory to finish its commit")
	return cmd
}

func runPublish(ctx context.Context, g *globals, o *publishOptions, now time.Time) error {
	if err := checkBaseURLFlag(o.baseURL); err != nil {
		return err
	}
	cfg, src, err := loadConfig(g)
	if err != nil {
		return err
	}
	shard := publish.Shard{}
	if o.shard != "" {
		if shard, err = publish.ParseShard(o.shard); err != nil {
			return badInput("--%w", err) // --shard "5/4": …
		}
	}
	if o.lockWait <= 0 {
		return badInput("--lock-wait: %v: must be positive, e.g. 30s or 5m", o.lockWait)
	}
	base := cfg.Service.BaseURL
	if o.baseURL != "" {
		base = o.baseURL
	}
	out, outField := cfg.Service.OutDir, "service.out_dir"
	if o.out != "" {
		out, outField = o.out, "--out"
	}
	// A missing directory is created; a file in its place, or in the place
	// of a directory above it, is bad input, named here with the flag or
	// key that gave it.
	if err := checkOutDir(outField, out); err != nil {
		return err
	}
	// A publish is a batch job: trading memory for fewer collections makes
	// a large configuration about 10% faster (1,000 feeds: 55 → 118 MB
	// peak). An explicit GOGC in the environment wins.
	if _, ok := g.getenv("GOGC"); !ok {
		debug.SetGCPercent(400)
	}
	srcs, opts, err := build(cfg, now, newLayout(base))
	if err != nil {
		return err
	}
	opts.Shard = shard
	lamps := &lampWatch{}
	lamps.watch(cfg, srcs)
	if opts.Configuration, err = configDigest(cfg, base); err != nil {
		return err
	}
	w := &publish.Writer{Dir: out, LockWait: o.lockWait}
	// The messages name the configuration's directory resolved, since a
	// relative out_dir is read from the working directory, not the
	// file's; --out as it was typed.
	shown := out
	if o.out == "" {
		shown = resolvedOutDir(out)
	}
	if !o.quiet {
		w.Waiting = func(lock string) {
			fmt.Fprintf(g.stderr, "heliocal: another publish is writing to %s; waiting up to %v for its lock (%s)\n", shown, o.lockWait, lock)
		}
	}
	if !o.quiet {
		for _, n := range zoneNotes(cfg, now) {
			fmt.Fprintln(g.stderr, "heliocal: "+n)
		}
		fmt.Fprintf(g.stderr, "heliocal: publishing %s from %s to %s\n", publishingWhat(srcs, shard), src, shown)
		opts.Progress = publish.NewProgress(g.stderr)
		opts.Progress.SummaryDir, opts.Progress.Prefix = shown, "heliocal: "
	}
	st, err := publish.Publish(ctx, srcs, opts, w)
	if err != nil {
		return outDirFailed(outField, out, err)
	}
	if o.quiet { // else the summary has listed the oversize feeds
		for _, w := range publish.Warnings(st) {
			fmt.Fprintln(g.stderr, "heliocal: "+w)
		}
	}
	for _, w := range lamps.warnings() {
		fmt.Fprintln(g.stderr, "heliocal: warning: "+w.text) // as check writes them
	}
	return nil
}

// resolvedOutDir is service.out_dir as publish finds it: a relative
// directory is taken from the working directory (not the configuration
// file's, from which a skyline file is read), so it is named joined to it.
// A directory whose absolute form cannot be had (the working directory
// removed) is named as written.
func resolvedOutDir(dir string) string {
	if filepath.IsAbs(dir) {
		return dir
	}
	abs, err := filepath.Abs(dir)
	if err != nil {
		return dir
	}
	return abs
}

// checkOutDir refuses an output directory that cannot be one: out itself,
// or the nearest of its parents that exists, is not a directory ("--out
// farm.yaml/sub" as well as "--out farm.yaml"), or is a symbolic link that
// leads nowhere (its target removed, or a loop): publish would neither
// follow it nor make a directory in its place. Any other failure (a
// directory that cannot be read or written) is left to the publish, as a
// run-time failure.
func checkOutDir(field, out string) error {
	for p := filepath.Clean(out); ; p = filepath.Dir(p) {
		fi, err := os.Stat(p)
		if err != nil {
			if li, lerr := os.Lstat(p); lerr == nil && li.Mode()&fs.ModeSymlink != 0 {
				return brokenLink(field, out, p, err)
			}
		}
		if err == nil {
			if fi.IsDir() {
				return nil
			}
			if p == filepath.Clean(out) {
				return badInput("%s: %q: not a directory (the feeds are written into a directory; give a new or existing one)", field, out)
			}
			return badInput("%s: %q: %s is not a directory (the feeds are written into a directory; give a new or existing one)", field, out, p)
		}
		if parent := filepath.Dir(p); parent == p {
			return nil
		}
	}
}

// brokenLink words the refusal of out (given by field) because p, out or a
// directory above it, is a symbolic link that cannot be followed: statErr
// is what following it gave.
func brokenLink(field, out, p string, statErr error) error {
	target, err := os.Readlink(p)
	if err != nil {
		target = "?"
	}
	what := "a symbolic link"
	if p != filepath.Clean(out) {
		what = p + " is a symbolic link"
	}
	why := "which does not exist (create it, or give another directory)"
	if !errors.Is(statErr, fs.ErrNotExist) {
		var pe *fs.PathError
		if errors.As(statErr, &pe) {
			statErr = pe.Err
		}
		why = fmt.Sprintf("which cannot be followed (%v; give another directory)", statErr)
	}
	return badInput("%s: %q: %s to %q, %s", field, out, what, target, why)
}

// outDirFailed words err, a failed publish into out (given by field: --out
// or service.out_dir), when the directory cannot be written: one the user may
// not write to or create, one on a read-only file system, or one in which
// nothing can be created (/proc/1, for the superuser too), is named with the
// flag or key that gave it and a hint, not by the temporary file or lock file
// the publish tried first ("open public/.farm-sun.ics.tmp-81…: permission
// denied"); a file already there that the user may not open or replace (a
// lock file or a feed of another user, in a directory the user may write
// to; a feed in a sticky directory, or an immutable one, which the commit
// cannot rename over) is named with the directory; a full disk or an exhausted quota is named
// with the file that found it so, as the user knows it ("farm-sun.ics").
// What the publish says of the files it left (the writer keeps nothing
// half-written: "nothing was changed: …") follows. It stays a run-time
// failure (exit 1): out was checked to be a directory, or to be one that
// can be created, before (checkOutDir). Other errors are returned as they
// are.
func outDirFailed(field, out string, err error) error {
	if full := (*publish.DiskFullError)(nil); errors.As(err, &full) {
		_, tail, _ := strings.Cut(err.Error(), full.Error())
		return &outDirError{msg: fmt.Sprintf("%s: %q: no room for %s (%s; free some space on its file system, or give a directory on another)%s",
			field, out, full.File, full.Reason(), tail), err: err}
	}
	var pe *fs.PathError
	if !errors.As(err, &pe) || !sameTree(pe.Path, out) {
		return err
	}
	hint, what := "give a directory this user may write to, or change its permissions", "cannot write into it"
	switch {
	case errors.Is(pe.Err, fs.ErrPermission) && filepath.Dir(filepath.Clean(pe.Path)) == filepath.Clean(out) && exists(pe.Path):
		// a file already there that this user may not open (the lock file
		// or a feed another user published), in a directory the user may
		// well write to: the file is named, not the directory
		what = "cannot use " + filepath.Base(pe.Path) + " in it"
		if pe.Op == "open" {
			what = "cannot open " + filepath.Base(pe.Path) + " in it"
		}
		hint = "this user may not: change the file's owner or permissions, or remove it, and publish writes it again"
	case errors.Is(pe.Err, fs.ErrPermission):
	case errors.Is(pe.Err, syscall.EROFS):
		hint = "give a directory on a file system that can be written"
	case errors.Is(pe.Err, fs.ErrNotExist) && (pe.Op == "mkdir" || pe.Op == "open" && filepath.Dir(filepath.Clean(pe.Path)) == filepath.Clean(out)):
		// a directory that exists but takes nothing new, as /proc/1 for
		// the superuser: the system says what was to be created is missing
		hint, what = "give a directory on an ordinary file system, where files can be created", "cannot create a file in it"
	default:
		return err
	}
	if pe.Op == "mkdir" {
		what = "cannot create it"
	}
	// what the publish added after the failure: "; nothing was changed: …"
	_, tail, _ := strings.Cut(err.Error(), pe.Error())
	return &outDirError{msg: fmt.Sprintf("%s: %q: %s (%v; %s)%s", field, out, what, pe.Err, hint, tail), err: err}
}

// exists reports whether there is a file, of any type, at path.
func exists(path string) bool {
	_, err := os.Lstat(path)
	return err == nil
}

// sameTree reports whether the path p is the directory out, inside it, or
// one of the directories above it (one MkdirAll creates on the way).
func sameTree(p, out string) bool {
	p, out = filepath.Clean(p), filepath.Clean(out)
	inside := func(a, b string) bool { // a is b or under it
		r, err := filepath.Rel(b, a)
		return err == nil && r != ".." && !strings.HasPrefix(r, ".."+string(filepath.Separator))
	}
	return inside(p, out) || inside(out, p)
}

// outDirError is a failure to write into the output directory, worded by
// outDirFailed; it unwraps to the publish's error.
type outDirError struct {
	msg string
	err error
}

func (e *outDirError) Error() string { return e.msg }
func (e *outDirError) Unwrap() error { return e.err }

// publishingWhat says which feeds a publish writes: "3 feeds", or for a
// shard "shard 0/2: 1 feed of 3".
func publishingWhat(srcs []publish.Source, shard publish.Shard) string {
	feeds := func(n int) string {
		if n == 1 {
			return "1 feed"
		}
		return feed.FormatCount(n) + " feeds"
	}
	if !shard.Sharded() {
		return feeds(len(srcs))
	}
	n := 0
	for _, s := range srcs {
		if shard.Has(s.ID) {
			n++
		}
	}
	return fmt.Sprintf("shard %s: %s of %s", shard, feeds(n), feed.FormatCount(len(srcs)))
}

// configDigest fingerprints what shapes the published files: the sites, the
// feeds, the base URL and the refresh schedule. Shards of one run must agree
// on it (publish refuses to mix configurations in one directory). It is the
// JSON of the parsed configuration, so a field added to config.Site,
// config.Feed or what they hold is left out of it (`json:",omitempty"`)
// where it says nothing the versions before it did not read from the same
// file: that file then has the same fingerprint in both, and shards of one
// run may be published by two versions, as while machines are upgraded one
// by one (TestConfigDigestAcrossVersions). Site.HorizonSet is in it only
// for a written horizon: 0, which those versions read as the flat horizon
// lowered by the dip; a horizon other than 0 says it is set.
func configDigest(cfg *config.Config, base string) (string, error) {
	sites := slices.Clone(cfg.Sites)
	for i := range sites {
		if sites[i].Horizon != 0 {
			sites[i].HorizonSet = false
		}
	}
	b, err := json.Marshal(struct {
		Sites       []config.Site
		Feeds       []config.Feed
		BaseURL     string
		Refresh     string
		RefreshZone config.Zone
	}{sites, cfg.Feeds, base, cfg.Service.Refresh, cfg.Service.RefreshZone})
	if err != nil {
		return "", fmt.Errorf("publish: configuration fingerprint: %w", err)
	}
	h := sha256.Sum256(b)
	return hex.EncodeToString(h[:]), nil
}
