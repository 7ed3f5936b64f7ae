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

// removesOpenFiles: a file that is open is removed as on Unix (see
// liveLock.release); no lock is held here anyway.
const removesOpenFiles = true
