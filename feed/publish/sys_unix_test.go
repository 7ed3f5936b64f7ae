//go:build unix

package publish

import (
	"io/fs"
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
