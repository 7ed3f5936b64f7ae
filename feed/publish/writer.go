package publish

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math/rand/v2"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"sync"
	"time"
)

// DefaultTempMaxAge is how old a leftover temporary file must be before a
// writer removes it: older than any write in flight by another worker
// sharing the directory, young enough that a crashed run's debris does not
// linger past the next night.
const DefaultTempMaxAge = 15 * time.Minute

// FileMode is the mode of every published file: readable by a web server
// running as another user, whatever the umask (see createTemp).
const FileMode fs.FileMode = 0o644

// DirMode is the mode of the output directory and of any parent directory
// the writer creates for it, set explicitly so that the umask (077 on many
// hardened hosts) cannot make the files unreachable for a web server.
// Directories that already exist keep their mode.
const DirMode fs.FileMode = 0o755

// tempFile is what the writer needs of a temporary file; *os.File has it.
// Tests wrap a real file to inject a failure part-way.
type tempFile interface {
	io.Writer
	Name() string
	Chmod(fs.FileMode) error
	Sync() error
	Close() error
}

// Writer writes files into Dir atomically: each file goes to a temporary file
// in the same directory and is renamed over the old one, so a reader (or a
// crash) sees either the old complete file or the new complete file, never a
// mix. A file whose bytes are already on disk is not rewritten, so its
// modification time, inode and HTTP validators stay put.
//
// A Writer may be used by one goroutine at a time; several writers (in
// several processes) may share a directory as long as they write different
// names or the same bytes.
type Writer struct {
	// Dir is the output directory; it is created (DirMode, 0755) when missing.
	Dir string
	// TempMaxAge is the age past which leftover temporary files of ours are
	// removed at the start of WriteBundle; zero means DefaultTempMaxAge.
	TempMaxAge time.Duration

	// LockWait bounds the wait for another run's lock on Dir (see LockName);
	// zero means DefaultLockWait.
	LockWait time.Duration
	// Waiting, when set, is called once when the lock is busy and the run
	// starts waiting for it, with the lock file's path.
	Waiting func(lockPath string)
	// RunMaxAge is the age past which an unfinished sharded run of another
	// configuration is taken as abandoned rather than still running; zero
	// means DefaultRunMaxAge. See Publish.
	RunMaxAge time.Duration

	// createTemp creates the temporary file; nil means the package's
	// createTemp.
	// Overridden by tests to inject failures.
	createTemp func(dir, pattern string) (tempFile, error)
	// step, when set, is told about each change a commit makes to the
	// directory, just before it makes it. Tests stop a child process there.
	step func(what string)
	// now is the clock used to age leftovers; nil means time.Now.
	now func() time.Time
	// link makes the hard link keep keeps a replaced file's content by;
	// nil means os.Link. Overridden by tests to refuse it.
	link func(oldname, newname string) error
	// undo, while a commit changes the directory, records each change so
	// that a commit failing part-way can put back what was there before.
	undo *undoLog
	// createdMode: the process's umask, as prepare found it, leaves
	// FileMode as it is, so a temporary file created with it needs no
	// chmod.
	createdMode bool
}

// Stats counts what a publish did.
type Stats struct {
	Shard          Shard // the run's shard (zero: every feed)
	Feeds          int   // feeds in this run (this shard's, when sharded)
	FeedsWritten   int   // .ics files written because their bytes changed
	FeedsUnchanged int   // .ics files already up to date
	FilesWritten   int   // every file written (feeds, feeds.json, index.html…)
	FilesUnchanged int   // every file already up to date
	Events         int   // entries across the run's feeds
	Bytes          int64 // bytes of the run's .ics files
	TempRemoved    int   // leftover temporary files of an earlier crash removed
	// Oversize lists the feeds larger than RenderOptions.MaxFeedBytes,
	// which is recorded in MaxFeedBytes.
	Oversize []FeedInfo
	// Trimmed lists the feeds whose window was shortened to fit
	// MaxFeedBytes (RenderOptions.Oversize = OversizeTrim).
	Trimmed      []Trimmed
	MaxFeedBytes int
	// Index is what happened to feeds.json and index.html: IndexWritten,
	// IndexUnchanged, or IndexPending (sharded, other shards not done yet).
	Index   string
	Elapsed time.Duration
}

// What happened to the index files (Stats.Index).
const (
	IndexWritten   = "written"
	IndexUnchanged = "unchanged"
	IndexPending   = "pending"
)

func (w *Writer) tempPattern(name string) string { return "." + name + ".tmp-*" }

// isTempName reports whether base is one of our temporary names:
// "." + final name + ".tmp-" + the digits createTemp puts for "*".
func isTempName(base string) bool {
	if !strings.HasPrefix(base, ".") {
		return false
	}
	i := strings.LastIndex(base, ".tmp-")
	if i <= 1 {
		return false
	}
	digits := base[i+len(".tmp-"):]
	if digits == "" {
		return false
	}
	for _, r := range digits {
		if r < '0' || r > '9' {
			return false
		}
	}
	return true
}

// checkName refuses names that would leave the directory or hide the file.
func checkName(name string) error {
	if name == "" || name != filepath.Base(name) || name == "." || name == ".." ||
		strings.HasPrefix(name, ".") || strings.ContainsAny(name, `/\`) {
		return fmt.Errorf("publish: invalid file name %q (want a plain name such as \"farm-sun.ics\")", name)
	}
	return nil
}

// prepare creates the directory and removes stale temporary files of ours.
func (w *Writer) prepare() (removed int, err error) {
	if w.Dir == "" {
		return 0, errors.New("publish: output directory is empty")
	}
	if err := mkdirAll(w.Dir); err != nil {
		return 0, fmt.Errorf("publish: output directory: %w", err)
	}
	fi, err := os.Stat(w.Dir)
	if err != nil {
		return 0, fmt.Errorf("publish: output directory: %w", err)
	}
	if !fi.IsDir() {
		return 0, fmt.Errorf("publish: output directory %s: not a directory", w.Dir)
	}
	w.createdMode = umaskKeeps(FileMode)
	return w.removeStaleTemps()
}

// mkdirAll creates dir and its missing parents with DirMode whatever the
// umask: each directory it creates is chmod-ed after os.Mkdir (which applies
// the umask). Directories that already exist are left as they are.
func mkdirAll(dir string) error {
	if fi, err := os.Stat(dir); err == nil {
		if !fi.IsDir() {
			return fmt.Errorf("%s: not a directory", dir)
		}
		return nil
	}
	if parent := filepath.Dir(dir); parent != dir {
		if err := mkdirAll(parent); err != nil {
			return err
		}
	}
	if err := os.Mkdir(dir, DirMode); err != nil {
		if errors.Is(err, fs.ErrExist) {
			return nil // made by a concurrent worker meanwhile
		}
		return err
	}
	return os.Chmod(dir, DirMode)
}

// removeStaleTemps removes our own leftover temporary files (".<name>.tmp-<digits>",
// regular files only) older than TempMaxAge. Younger ones may belong to
// another worker writing right now.
func (w *Writer) removeStaleTemps() (int, error) {
	maxAge := w.TempMaxAge
	if maxAge <= 0 {
		maxAge = DefaultTempMaxAge
	}
	now := time.Now
	if w.now != nil {
		now = w.now
	}
	cutoff := now().Add(-maxAge)
	return w.removeTemps(func(e fs.DirEntry) bool {
		fi, err := e.Info()
		return err == nil && fi.ModTime().Before(cutoff)
	})
}

// removeOrphanTemps removes, when no other run is alive (live, the run's
// shared lock on LiveName, proves it), every temporary file of ours but
// those the run itself has written (own, by base name): a killed run's,
// however young. Called under the directory's lock; it returns how many it
// removed.
func (w *Writer) removeOrphanTemps(live *liveLock, own map[string]bool) int {
	n := 0
	live.alone(func() {
		n, _ = w.removeTemps(func(e fs.DirEntry) bool { return !own[e.Name()] })
	})
	return n
}

// removeTemps removes the temporary files of ours (regular files only) in
// w.Dir that remove chooses.
func (w *Writer) removeTemps(remove func(fs.DirEntry) bool) (int, error) {
	ents, err := os.ReadDir(w.Dir)
	if err != nil {
		return 0, fmt.Errorf("publish: output directory: %w", err)
	}
	n := 0
	for _, e := range ents {
		if !e.Type().IsRegular() || !isTempName(e.Name()) || !remove(e) {
			continue
		}
		if err := os.Remove(filepath.Join(w.Dir, e.Name())); err == nil {
			n++
		}
	}
	return n, nil
}

// tempBases is the set of the base names of the temporary files temps.
func tempBases(temps []string) map[string]bool {
	own := make(map[string]bool, len(temps))
	for _, t := range temps {
		own[filepath.Base(t)] = true
	}
	return own
}

// WriteFile writes one file atomically and makes the rename durable. It
// reports whether the file was written (false: the same bytes were there).
func (w *Writer) WriteFile(name string, data []byte) (bool, error) {
	if w.Dir == "" {
		return false, errors.New("publish: output directory is empty")
	}
	// its temporary file is its own while it lives (see LiveName); where
	// the lock file cannot be opened, the write goes on as before (in a
	// directory that takes no new file, it fails below with its own words)
	if live, err := w.holdLive(context.Background()); err == nil {
		defer live.release()
	}
	written, err := w.writeFile(name, data)
	if err != nil || !written {
		return written, err
	}
	return true, syncDir(w.Dir)
}

// writeFile is WriteFile without the directory fsync, so a batch of renames
// pays for one.
func (w *Writer) writeFile(name string, data []byte) (written bool, err error) {
	if err := checkName(name); err != nil {
		return false, err
	}
	same, err := sameRegularFile(filepath.Join(w.Dir, name), data)
	if err != nil || same {
		return false, err
	}
	tmp, err := w.writeTemp(name, data)
	if err != nil {
		return false, err
	}
	if err := w.install(tmp, name); err != nil {
		os.Remove(tmp)
		return false, err
	}
	return true, nil
}

// writeTemp writes data to a new temporary file beside name, complete,
// with FileMode and flushed to disk, and returns its path. Nothing is left
// behind on error.
func (w *Writer) writeTemp(name string, data []byte) (_ string, err error) {
	create, chmod := w.createTemp, true
	if create == nil {
		create = func(dir, pattern string) (tempFile, error) { return createTemp(dir, pattern) }
		chmod = !w.createdMode
	}
	f, err := create(w.Dir, w.tempPattern(name))
	if err != nil {
		return "", w.writeFailed(name, err)
	}
	tmp := f.Name()
	closed := false
	defer func() {
		if err != nil {
			if !closed {
				f.Close()
			}
			os.Remove(tmp)
		}
	}()
	osf, isFile := f.(*os.File) // not when a test injects failures
	direct := false
	if isFile {
		direct, err = writeDirect(osf, data)
	}
	if !direct {
		var n int
		n, err = f.Write(data)
		if err == nil && n != len(data) {
			err = io.ErrShortWrite
		}
	}
	if err != nil {
		return "", w.writeFailed(name, err)
	}
	if chmod {
		if err = f.Chmod(FileMode); err != nil {
			return "", w.writeFailed(name, err)
		}
	}
	if isFile {
		err = syncHeld(osf)
	} else {
		err = f.Sync()
	}
	if err != nil {
		return "", w.writeFailed(name, err)
	}
	closed = true
	if err = f.Close(); err != nil {
		return "", w.writeFailed(name, err)
	}
	return tmp, nil
}

// writeFailed is the error of writing name's temporary file. A full disk or
// an exhausted quota names the output directory and name, not the
// temporary file the system names (".farm-sun.ics.tmp-81…").
func (w *Writer) writeFailed(name string, err error) error {
	if diskFull(err) {
		return &DiskFullError{Dir: w.Dir, File: name, Err: err}
	}
	return fmt.Errorf("publish: write %s: %w", name, err)
}

// DiskFullError is a file that could not be written into the output
// directory because its disk is full or the user's quota exhausted:
// "publish: write farm-sun.ics into public: no space left on device". It
// unwraps to the system's error (errors.Is finds syscall.ENOSPC).
type DiskFullError struct {
	Dir  string // the output directory, as the Writer was given it
	File string // the file's name in Dir: "farm-sun.ics", "feeds.json"
	Err  error
}

func (e *DiskFullError) Error() string {
	return fmt.Sprintf("publish: write %s into %s: %s", e.File, e.Dir, e.Reason())
}

// Reason is what the system said, without the temporary file's path: "no
// space left on device", "disk quota exceeded".
func (e *DiskFullError) Reason() string { return systemErr(e.Err).Error() }

func (e *DiskFullError) Unwrap() error { return e.Err }

// systemErr is the system's error inside err: a *fs.PathError's Err (an
// errno), without the path; err itself when it holds none.
func systemErr(err error) error {
	if pe := (*fs.PathError)(nil); errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// createTemp is os.CreateTemp creating the file with FileMode (less the
// umask) instead of 0600 (see openNew): pattern's "*" becomes random
// digits, tried again while the name is taken. Where the umask leaves
// FileMode as it is (Writer.createdMode), the file needs no chmod after.
func createTemp(dir, pattern string) (*os.File, error) {
	prefix, suffix, _ := strings.Cut(pattern, "*")
	prefix = filepath.Join(dir, prefix)
	var f *os.File
	_, err := freshName(prefix, suffix, 10000, func(name string) (err error) {
		f, err = openNew(name, FileMode)
		return err
	})
	if errors.Is(err, fs.ErrExist) {
		return nil, &fs.PathError{Op: "createtemp", Path: prefix + "*" + suffix, Err: fs.ErrExist}
	}
	return f, err
}

// freshName calls create with prefix + random digits + suffix, with other
// digits while the name is taken (create fails with fs.ErrExist), at most
// tries times; it returns the name create made, or create's last error.
func freshName(prefix, suffix string, tries int, create func(name string) error) (string, error) {
	err := error(fs.ErrExist)
	for range tries {
		name := prefix + strconv.FormatUint(uint64(rand.Uint32()), 10) + suffix
		if err = create(name); !errors.Is(err, fs.ErrExist) {
			return name, err
		}
	}
	return "", err
}

// install renames the temporary file tmp over name, refusing to replace
// anything but a regular file.
func (w *Writer) install(tmp, name string) error {
	final := filepath.Join(w.Dir, name)
	// Check again just before the rename: a directory or socket put there
	// meanwhile must not be replaced either.
	if _, err := sameRegularFile(final, nil); err != nil {
		return err
	}
	w.keep(name)
	w.tell("rename " + name)
	if err := os.Rename(tmp, final); err != nil {
		w.unkeep()
		var le *os.LinkError
		if errors.As(err, &le) { // not the temporary file's name: the file it would replace
			return fmt.Errorf("publish: %w", &fs.PathError{Op: "replace", Path: final, Err: le.Err})
		}
		return fmt.Errorf("publish: write %s: %w", name, err)
	}
	return nil
}

// prevInfix marks a file's previous content kept by a commit until it
// succeeds: "." + name + ".tmp-prev-" + digits. It is not one of
// isTempName's names, which another run's start removes by their age (a
// hard link has the age of the published file): under the lock, the next
// commit removes any a killed one left (removePrevs).
const prevInfix = ".tmp-prev-"

// undoLog is what a commit has changed in the directory, in order.
type undoLog struct {
	steps []undoStep
}

// undoStep is one file a commit replaced, removed or created.
type undoStep struct {
	name    string // in Writer.Dir
	existed bool   // the file was there before the change
	prev    string // path of its previous content (a hard link to it, or a copy); "" when it could not be kept
}

// keep records, before a commit replaces or removes the file name, what it
// holds: a hard link to it under a prevInfix name, so that nothing is copied
// where the file system allows it, and a failed commit can rename it back
// (endUndo). Where no link can be
// made (a file of another user where the system protects links,
// fs.protected_hardlinks on Linux; a file system without hard links), a
// copy is kept instead. When neither can be made (a full disk), the change
// is made all the same; putting back would stop at that file.
func (w *Writer) keep(name string) {
	if w.undo == nil {
		return
	}
	final := filepath.Join(w.Dir, name)
	st := undoStep{name: name}
	if _, err := os.Lstat(final); err == nil {
		st.existed = true
		w.tell("keep " + name)
		link := w.link
		if link == nil {
			link = os.Link
		}
		prefix := filepath.Join(w.Dir, "."+name+prevInfix)
		prev, err := freshName(prefix, "", 100, func(prev string) error { return link(final, prev) })
		if err != nil {
			prev, err = copyPrev(final, prefix)
		}
		if err == nil {
			st.prev = prev
		}
	}
	w.undo.steps = append(w.undo.steps, st)
}

// copyPrev copies the file final to a new file prefix + digits, with
// final's permission bits and modification time (a file put back from it
// looks to a web server as it did; its owner is this user's, as no copy
// can keep another user's), flushed to disk, and returns its name.
// Nothing is left behind on error.
func copyPrev(final, prefix string) (_ string, err error) {
	src, err := os.Open(final)
	if err != nil {
		return "", err
	}
	defer src.Close()
	fi, err := src.Stat()
	if err != nil {
		return "", err
	}
	var dst *os.File
	prev, err := freshName(prefix, "", 100, func(name string) (err error) {
		dst, err = openNew(name, fi.Mode().Perm())
		return err
	})
	if err != nil {
		return "", err
	}
	defer func() {
		if err != nil {
			os.Remove(prev)
		}
	}()
	_, err = io.Copy(dst, src)
	if err == nil {
		err = dst.Chmod(fi.Mode().Perm()) // the umask may have taken bits off openNew's
	}
	if err == nil {
		err = dst.Sync()
	}
	if cerr := dst.Close(); err == nil {
		err = cerr
	}
	if err == nil {
		err = os.Chtimes(prev, time.Time{}, fi.ModTime())
	}
	return prev, err
}

// unkeep forgets the change keep recorded last: it failed, the file is as
// it was.
func (w *Writer) unkeep() {
	if w.undo == nil || len(w.undo.steps) == 0 {
		return
	}
	last := w.undo.steps[len(w.undo.steps)-1]
	if last.prev != "" {
		os.Remove(last.prev)
	}
	w.undo.steps = w.undo.steps[:len(w.undo.steps)-1]
}

// beginUndo starts recording a commit's changes (see keep); endUndo ends
// it: on success it removes the kept previous contents, on failure it puts
// them back, last change first, removes the files the commit created, and
// says so in the returned error.
func (w *Writer) beginUndo() { w.undo = &undoLog{} }

func (w *Writer) endUndo(err error) error {
	u := w.undo
	w.undo = nil
	if u == nil {
		return err
	}
	defer func() {
		for _, st := range u.steps {
			if st.prev != "" {
				os.Remove(st.prev) // gone when renamed back; left when the change itself failed
			}
		}
	}()
	if err == nil {
		return nil
	}
	// Last change first: each step back is to a state the commit passed
	// through, in which feeds.json was true, so a step that fails stops the
	// walk there rather than skip to one that would not be.
	for i := len(u.steps) - 1; i >= 0; i-- {
		st := u.steps[i]
		final := filepath.Join(w.Dir, st.name)
		var uerr error
		switch {
		case st.prev != "":
			uerr = os.Rename(st.prev, final)
		case !st.existed:
			if uerr = os.Remove(final); errors.Is(uerr, fs.ErrNotExist) {
				uerr = nil
			}
		default:
			uerr = errors.New("its previous content could not be kept")
		}
		if uerr != nil {
			syncDir(w.Dir)
			return fmt.Errorf("%w; putting back the files published before stopped at %s: %w", err, st.name, uerr)
		}
	}
	if serr := syncDir(w.Dir); serr != nil {
		return fmt.Errorf("%w; the files published before are put back, but %w", err, serr)
	}
	return unchanged(err)
}

// nothingChanged ends the error of a publish that failed without changing
// any published file.
const nothingChanged = "nothing was changed: the files published before are as they were"

// unchanged is err, of a publish that failed without changing any
// published file, ended with nothingChanged.
func unchanged(err error) error { return fmt.Errorf("%w; %s", err, nothingChanged) }

// diskFull reports whether err is a full disk or an exhausted quota
// (ENOSPC, EDQUOT: errDiskFull in sys_unix.go).
func diskFull(err error) bool {
	for _, e := range errDiskFull {
		if errors.Is(err, e) {
			return true
		}
	}
	return false
}

// removePrevs removes the previous contents a killed commit kept (see
// keep). Called under the directory's lock, when no commit is under way.
func (w *Writer) removePrevs() {
	ents, err := os.ReadDir(w.Dir)
	if err != nil {
		return
	}
	for _, e := range ents {
		if n := e.Name(); e.Type().IsRegular() && strings.HasPrefix(n, ".") && strings.Contains(n, prevInfix) {
			os.Remove(filepath.Join(w.Dir, n))
		}
	}
}

func (w *Writer) tell(what string) {
	if w.step != nil {
		w.step(what)
	}
}

// sameRegularFile reports whether path is a regular file holding exactly
// data. A missing file is "not the same"; anything but a regular file (a
// directory, a socket, a symbolic link…) is refused with an error, since
// renaming over it would silently replace what someone put there.
func sameRegularFile(path string, data []byte) (bool, error) {
	_, same, err := sameRegular(path, data)
	return same, err
}

// sameRegular is sameRegularFile that also returns what Lstat said of the
// file before its bytes were compared (nil when it does not exist), so a
// later check can tell whether it has been replaced since.
func sameRegular(path string, data []byte) (fs.FileInfo, bool, error) {
	fi, err := os.Lstat(path)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, false, nil
	}
	if err != nil {
		return nil, false, fmt.Errorf("publish: %w", err)
	}
	if !fi.Mode().IsRegular() {
		return nil, false, fmt.Errorf("publish: refusing to replace %s: not a regular file (%s)", path, describeMode(fi.Mode()))
	}
	if data == nil || fi.Size() != int64(len(data)) {
		return fi, false, nil
	}
	equal, err := fileEquals(path, data)
	if err != nil || !equal {
		return fi, false, err
	}
	// Same bytes; make sure a web server can still read them.
	if fi.Mode().Perm() != FileMode {
		if err := os.Chmod(path, FileMode); err != nil {
			return nil, false, fmt.Errorf("publish: %w", err)
		}
	}
	return fi, true, nil
}

// compareChunk is the read size of fileEquals: a changed feed (the usual
// case: the window moved by a day) differs within its first chunk, so it
// costs one small read instead of reading the whole old file.
const compareChunk = 64 << 10

var chunkPool = sync.Pool{New: func() any { b := make([]byte, compareChunk); return &b }}

// fileEquals reports whether the file at path holds exactly data.
func fileEquals(path string, data []byte) (bool, error) {
	f, err := os.Open(path)
	if err != nil {
		return false, fmt.Errorf("publish: %w", err)
	}
	defer f.Close()
	bp := chunkPool.Get().(*[]byte)
	defer chunkPool.Put(bp)
	buf := *bp
	for off := 0; ; {
		n, err := io.ReadFull(f, buf)
		if n > len(data)-off || !bytes.Equal(buf[:n], data[off:off+n]) {
			return false, nil
		}
		off += n
		switch {
		case err == io.EOF || err == io.ErrUnexpectedEOF:
			return off == len(data), nil
		case err != nil:
			return false, fmt.Errorf("publish: %w", err)
		}
	}
}

func describeMode(m fs.FileMode) string {
	switch {
	case m&fs.ModeDir != 0:
		return "a directory"
	case m&fs.ModeSymlink != 0:
		return "a symbolic link"
	case m&fs.ModeSocket != 0:
		return "a socket"
	case m&fs.ModeNamedPipe != 0:
		return "a named pipe"
	case m&fs.ModeDevice != 0:
		return "a device"
	}
	return "mode " + m.String()
}

// syncDir makes the renames in dir durable.
func syncDir(dir string) error {
	d, err := os.Open(dir)
	if err != nil {
		return fmt.Errorf("publish: sync directory: %w", err)
	}
	err = d.Sync()
	if cerr := d.Close(); err == nil {
		err = cerr
	}
	// Some file systems cannot fsync a directory; the rename is done anyway.
	if err != nil && !errors.Is(err, errors.ErrUnsupported) && !isEINVAL(err) {
		return fmt.Errorf("publish: sync directory: %w", err)
	}
	return nil
}

// phase orders a bundle's files: calendars first, then the machine-readable
// lists, then the index page last, so that a reader never finds the index
// pointing at a feed that is not there yet.
func phase(name string) int {
	switch {
	case strings.HasSuffix(name, ".ics"):
		return 0
	case strings.HasSuffix(name, ".html"):
		return 2
	}
	return 1
}

// WriteBundle writes every file of b into Dir: the .ics files, then
// feeds.json (or a shard manifest), then index.html, each phase made durable
// before the next begins, under the directory's lock. As in Publish, the
// changed feeds are first written to temporary files and retracted from the
// current feeds.json before they are renamed into place, so feeds.json never
// lists bytes that are not on disk. It stops at the first error; every file
// it has not reached keeps its previous content.
func (w *Writer) WriteBundle(ctx context.Context, b *Bundle) (st Stats, err error) {
	start := time.Now()
	removed, err := w.prepare()
	st.TempRemoved = removed
	if err != nil {
		return st, err
	}
	live, err := w.holdLive(ctx)
	if err != nil {
		return st, err
	}
	defer live.release()
	files := inPhaseOrder(b)
	staged, err := w.stageBundle(ctx, files, &st)
	defer removeStaged(staged)
	if err != nil {
		return st, err
	}
	unlock, err := w.lockDir(ctx)
	if err != nil {
		return st, err
	}
	defer unlock()
	w.removePrevs()
	temps := make([]string, 0, len(staged))
	for _, sf := range staged {
		temps = append(temps, sf.tmp)
	}
	st.TempRemoved += w.removeOrphanTemps(live, tempBases(temps))
	w.beginUndo()
	defer func() { err = w.endUndo(err) }()
	if err := w.retractFeeds(changedIDs(staged)); err != nil {
		return st, err
	}
	if err := w.installAll(staged, &st); err != nil {
		return st, err
	}
	indexFiles := 0
	st.Index = IndexUnchanged
	for _, f := range files {
		if phase(f.Name) == 0 {
			continue
		}
		indexFiles++
		if err := w.writeCounted(&st, *f, true); err != nil {
			return st, err
		}
	}
	if indexFiles == 0 {
		st.Index = ""
	}
	for _, fi := range b.Feeds {
		st.Events += fi.Events
	}
	st.Elapsed = time.Since(start)
	return st, nil
}

// inPhaseOrder returns b's files in the order they are written: by phase,
// then by name.
func inPhaseOrder(b *Bundle) []*File {
	files := make([]*File, len(b.Files))
	for i := range b.Files {
		files[i] = &b.Files[i]
	}
	sort.SliceStable(files, func(i, j int) bool {
		pi, pj := phase(files[i].Name), phase(files[j].Name)
		if pi != pj {
			return pi < pj
		}
		return files[i].Name < files[j].Name
	})
	return files
}

// stageBundle stages the bundle's .ics files (see stageFile), counting them
// in st.
func (w *Writer) stageBundle(ctx context.Context, files []*File, st *Stats) ([]stagedFeed, error) {
	var staged []stagedFeed
	for _, f := range files {
		if phase(f.Name) != 0 {
			continue
		}
		if err := checkName(f.Name); err != nil {
			return staged, err
		}
		if err := ctx.Err(); err != nil {
			return staged, fmt.Errorf("publish: %w", err)
		}
		sf, err := w.stageFile(Source{ID: strings.TrimSuffix(f.Name, ".ics")}, *f)
		if err != nil {
			return staged, err
		}
		staged = append(staged, sf)
		st.Feeds++
		st.Bytes += int64(len(f.Data))
	}
	return staged, nil
}

// changedIDs returns the ids of the staged feeds that replace their file.
func changedIDs(staged []stagedFeed) map[string]bool {
	ids := map[string]bool{}
	for _, sf := range staged {
		if sf.tmp != "" {
			ids[sf.src.ID] = true
		}
	}
	return ids
}

// installAll renames every staged temporary file over its feed, counting
// in st, and makes the renames durable.
func (w *Writer) installAll(staged []stagedFeed, st *Stats) error {
	for i, sf := range staged {
		if sf.tmp == "" {
			st.FeedsUnchanged++
			st.FilesUnchanged++
			continue
		}
		if err := w.install(sf.tmp, sf.name); err != nil {
			return err
		}
		staged[i].tmp = ""
		st.FeedsWritten++
		st.FilesWritten++
	}
	return syncDir(w.Dir)
}

// removeStaged removes the temporary files of staged feeds not installed.
func removeStaged(staged []stagedFeed) {
	for _, sf := range staged {
		if sf.tmp != "" {
			os.Remove(sf.tmp)
		}
	}
}

// Trimmed is a feed shortened to fit its size limit: its last date now.
type Trimmed struct {
	Feed FeedInfo
	To   time.Time // last local date, 00:00 UTC
}
