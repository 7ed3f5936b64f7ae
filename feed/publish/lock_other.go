//go:build !unix && !windows

package publish

import (
	"errors"
	"os"
)

func tryLock(*os.File) (bool, error) {
	return false, errors.New("locking a directory is not supported on this system")
}

// tryLockShared holds nothing: a run is not kept from others' look for
// leftovers, which never happens here (tryLock fails).
func tryLockShared(*os.File) (bool, error) { return true, nil }

func unlockFile(*os.File) {}

// removeLive removes LiveName at path, f being its file, locked
// exclusively, while f stays locked: a run that opened the file before and
// waits for its lock then finds it gone from the path (holdLive), and one
// that opens the path after creates another.
func removeLive(_ *os.File, path string) { os.Remove(path) }
