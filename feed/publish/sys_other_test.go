//go:build !unix

package publish

import (
	"io/fs"
	"testing"
)

// inode is 0 where files have no inode number (Windows): the tests compare
// the files' times alone.
func inode(fs.FileInfo) uint64 { return 0 }

// setUmask skips the test: this system has no umask (Windows).
func setUmask(t *testing.T, _ int) {
	t.Helper()
	t.Skip("no umask on this system")
}
