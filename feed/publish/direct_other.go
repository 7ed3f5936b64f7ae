//go:build !linux

package publish

import (
	"io/fs"
	"os"
)

// writeDirect writes nothing: the page cache is bypassed on Linux only.
func writeDirect(*os.File, []byte) (bool, error) { return false, nil }

// syncHeld is f.Sync.
func syncHeld(f *os.File) error { return f.Sync() }

// umaskKeeps is false: the file mode is set after creating the file.
func umaskKeeps(fs.FileMode) bool { return false }

// openNew creates the file name, which must not exist, for reading and
// writing with mode (less the umask).
func openNew(name string, mode fs.FileMode) (*os.File, error) {
	return os.OpenFile(name, os.O_RDWR|os.O_CREATE|os.O_EXCL, mode)
}

// newFeedBuffer returns an empty buffer for a worker's feeds.
func newFeedBuffer() (buf []byte, free func()) { return nil, func() {} }
