package publish

import (
	"context"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"time"
)

// LockName is the lock file publish keeps in the output directory. Runs into
// one directory hold it only while they change what the directory lists
// (the renames, the shard manifests, feeds.json and index.html), so shards of
// one run still compute their feeds in parallel.
const LockName = ".heliocal-publish.lock"

// DefaultLockWait is how long a run waits for another run's commit to end
// before giving up: a commit only renames files and rewrites two small ones,
// so a lock held longer than this belongs to a stuck process.
const DefaultLockWait = 2 * time.Minute

// lockPoll is the interval between two attempts at a busy lock.
const lockPoll = 20 * time.Millisecond

// ErrLocked is wrapped by the error of a run that gave up waiting for the
// output directory's lock.
var ErrLocked = errors.New("locked by another publish")

// lockDir takes the exclusive lock on w.Dir, waiting up to w.LockWait (or
// until ctx ends) while another process holds it. The lock is released by
// the returned function, or by the kernel when the process dies, so a killed
// run never leaves the directory locked.
func (w *Writer) lockDir(ctx context.Context) (unlock func(), err error) {
	path := filepath.Join(w.Dir, LockName)
	f, err := openLock(path)
	if err != nil {
		return nil, err
	}
	wait := w.LockWait
	if wait <= 0 {
		wait = DefaultLockWait
	}
	deadline := time.Now().Add(wait)
	told := false
	err = w.pollLock(ctx, f, tryLock, func() error {
		if !told && w.Waiting != nil {
			w.Waiting(path)
			told = true
		}
		if !time.Now().Before(deadline) {
			return fmt.Errorf("publish: output directory %s: %w (waited %v for %s; is another heliocal publish stuck?)", w.Dir, ErrLocked, wait, path)
		}
		return nil
	})
	if err != nil {
		f.Close()
		return nil, err
	}
	return func() { unlockFile(f); f.Close() }, nil
}

// pollLock calls try on f, the lock file, every lockPoll until it takes
// the lock; while the lock is busy, busy may end the wait with an error,
// and so does the end of ctx.
func (w *Writer) pollLock(ctx context.Context, f *os.File, try func(*os.File) (bool, error), busy func() error) error {
	for {
		ok, err := try(f)
		if err != nil {
			return fmt.Errorf("publish: lock %s: %w", f.Name(), err)
		}
		if ok {
			return nil
		}
		if err := busy(); err != nil {
			return err
		}
		select {
		case <-ctx.Done():
			return fmt.Errorf("publish: waiting for the lock on %s: %w", w.Dir, ctx.Err())
		case <-time.After(lockPoll):
		}
	}
}

// openLock opens (creating it if need be) the lock file at path.
func openLock(path string) (*os.File, error) {
	f, err := os.OpenFile(path, os.O_RDWR|os.O_CREATE, FileMode)
	if err != nil {
		if fi, serr := os.Stat(path); serr == nil && fi.IsDir() {
			// a directory made under the lock file's name (by hand, by a
			// copy of the tree): the system's "is a directory" alone
			// leaves the user guessing what the name is
			return nil, fmt.Errorf("publish: lock %s: %w; remove it: it is heliocal's lock file (an empty file), which the next publish creates again", path, systemErr(err))
		}
		return nil, fmt.Errorf("publish: lock %s: %w", path, err)
	}
	// Mode as documented whatever the umask (the file is empty; it is only
	// ever locked).
	if err := f.Chmod(FileMode); err != nil {
		f.Close()
		return nil, fmt.Errorf("publish: lock %s: %w", path, err)
	}
	return f, nil
}

// LiveName is the second lock file publish keeps in the output directory,
// while a run is alive. Every run holds a shared lock on it from its start
// to its end, the whole time it may own temporary files there (WriteBundle
// and WriteFile too). A run that holds the directory's lock (LockName) and
// can also lock LiveName exclusively has proof that no other run is alive:
// every temporary file but its own is then a killed run's, and it removes
// them, however young (removeOrphanTemps). The last run to end removes the
// file; the kernel releases the locks of a process that dies, so a killed
// run leaves it, unlocked, for the next run to use and remove.
const LiveName = ".heliocal-publish-live.lock"

// liveLock is a run's shared lock on LiveName.
type liveLock struct {
	f    *os.File
	path string
}

// holdLive takes the shared lock on w.Dir's LiveName, waiting (until ctx
// ends) while a run holds it exclusively, which it does only while it looks
// for leftovers or removes the file. In a directory where this user may
// create no file, where LiveName is not, it holds nothing (nil, no error):
// the run can write no temporary file there either, and a republish that
// finds every file unchanged still succeeds, as it did before LiveName.
func (w *Writer) holdLive(ctx context.Context) (*liveLock, error) {
	path := filepath.Join(w.Dir, LiveName)
	for {
		f, err := openLock(path)
		if err != nil {
			if errors.Is(err, fs.ErrPermission) {
				if _, serr := os.Lstat(path); errors.Is(serr, fs.ErrNotExist) {
					return nil, nil
				}
			}
			return nil, err
		}
		if err := w.pollLock(ctx, f, tryLockShared, func() error { return nil }); err != nil {
			f.Close()
			return nil, err
		}
		if l := (&liveLock{f: f, path: path}); l.current() {
			return l, nil
		}
		// removed by the last run out while this one waited: the lock
		// that counts is on the file there now
		f.Close()
	}
}

// current reports whether the file l locks is still the one at its path.
func (l *liveLock) current() bool {
	a, err := l.f.Stat()
	if err != nil {
		return false
	}
	b, err := os.Stat(l.path)
	return err == nil && os.SameFile(a, b)
}

// exclusive trades the shared lock for an exclusive one, which is there
// only when no other run holds the shared one, and reports whether it has
// it on the file still at the path. The caller gives it up (unlockFile).
func (l *liveLock) exclusive() bool {
	unlockFile(l.f)
	ok, err := tryLock(l.f)
	return ok && err == nil && l.current()
}

// alone calls fn if no other run is alive, and reports whether it did.
// The caller holds the directory's lock: no run can hold LiveName
// exclusively meanwhile but one that ends, so the shared lock is taken
// back after fn; the caller writes its remaining files under the
// directory's lock, which keeps them from any other run's look for
// leftovers anyway. A run that starts meanwhile waits for the shared lock
// (holdLive) before it writes anything.
func (l *liveLock) alone(fn func()) bool {
	if l == nil {
		return false
	}
	ok := l.exclusive()
	if ok {
		fn()
	}
	unlockFile(l.f)
	tryLockShared(l.f)
	return ok
}

// release gives the lock back, and closes the file; the last run out (the
// one that can lock it exclusively) removes it. Where an open file can be
// removed, it is removed while still locked: a run that opened it before
// and waits for its lock then finds it gone from the path (holdLive), and
// one that opens the path after creates another. Windows removes no file
// that a handle holds open without FILE_SHARE_DELETE, which os.OpenFile
// does not give: there the file is closed first, and when another run
// opens it meanwhile, before it takes the lock, the removal fails and the
// file stays for that run. Nil: nothing to give back.
func (l *liveLock) release() {
	if l == nil {
		return
	}
	last := l.exclusive()
	if last && removesOpenFiles {
		os.Remove(l.path)
	}
	unlockFile(l.f)
	l.f.Close()
	if last && !removesOpenFiles {
		os.Remove(l.path)
	}
}
