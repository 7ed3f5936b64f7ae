//go:build unix

package publish

import (
	"bytes"
	"context"
	"errors"
	"io/fs"
	"maps"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

// inode is the file's inode number: a file replaced by a rename has
// another.
func inode(fi fs.FileInfo) uint64 {
	if st, ok := fi.Sys().(*syscall.Stat_t); ok {
		return st.Ino
	}
	return 0
}

// setUmask sets the process's umask for the rest of the test.
func setUmask(t *testing.T, umask int) {
	old := syscall.Umask(umask)
	t.Cleanup(func() { syscall.Umask(old) })
}

// A directory where the lock file should be (made by hand, or by a copy of
// the tree) stops the run with a message that says what the name is and
// what to do, not only the system's "is a directory"; nothing is changed.
func TestLockNameIsADirectory(t *testing.T) {
	dir := t.TempDir()
	publishTo(t, dir, "", testOptions())
	old := snapshot(t, dir)
	lock := filepath.Join(dir, LockName)
	if err := os.Remove(lock); err != nil && !errors.Is(err, fs.ErrNotExist) {
		t.Fatal(err)
	}
	if err := os.Mkdir(lock, 0o755); err != nil {
		t.Fatal(err)
	}
	_, err := Publish(context.Background(), Calendars(testCalendars(t, " (revised)")...), testOptions(), &Writer{Dir: dir})
	if err == nil {
		t.Fatal("publish succeeded with a directory in place of its lock file")
	}
	want := "publish: lock " + lock + ": is a directory; remove it: it is heliocal's lock file (an empty file), which the next publish creates again"
	if !strings.HasPrefix(err.Error(), want) {
		t.Errorf("message\n%s\ndoes not start with\n%s", err, want)
	}
	if !errors.Is(err, syscall.EISDIR) {
		t.Errorf("errors.Is(%v, EISDIR) = false", err)
	}
	if now := snapshot(t, dir); !maps.EqualFunc(now, old, bytes.Equal) {
		t.Errorf("files changed by a run that could not lock: %v, before: %v", keys(now), keys(old))
	}
}
