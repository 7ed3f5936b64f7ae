package publish

import (
	"context"
	"errors"
	"fmt"
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
	wait := w.LockWait
	if wait <= 0 {
		wait = DefaultLockWait
	}
	deadline := time.Now().Add(wait)
	told := false
	for {
		ok, err := tryLock(f)
		if err != nil {
			f.Close()
			return nil, fmt.Errorf("publish: lock %s: %w", path, err)
		}
		if ok {
			return func() { unlockFile(f); f.Close() }, nil
		}
		if !told && w.Waiting != nil {
			w.Waiting(path)
			told = true
		}
		if !time.Now().Before(deadline) {
			f.Close()
			return nil, fmt.Errorf("publish: output directory %s: %w (waited %v for %s; is another heliocal publish stuck?)", w.Dir, ErrLocked, wait, path)
		}
		select {
		case <-ctx.Done():
			f.Close()
			return nil, fmt.Errorf("publish: waiting for the lock on %s: %w", w.Dir, ctx.Err())
		case <-time.After(lockPoll):
		}
	}
}
