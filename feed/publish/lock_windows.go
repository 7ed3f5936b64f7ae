//go:build windows

package publish

import (
	"errors"
	"os"

	"golang.org/x/sys/windows"
)

// tryLock takes an exclusive LockFileEx on f's first byte without blocking.
func tryLock(f *os.File) (bool, error) { return lockFileNB(f, windows.LOCKFILE_EXCLUSIVE_LOCK) }

// tryLockShared takes a shared LockFileEx on f's first byte without
// blocking.
func tryLockShared(f *os.File) (bool, error) { return lockFileNB(f, 0) }

// lockFileNB is LockFileEx of f's first byte with flags and
// LOCKFILE_FAIL_IMMEDIATELY; false means the lock is held in a conflicting
// way.
func lockFileNB(f *os.File, flags uint32) (bool, error) {
	ol := new(windows.Overlapped)
	err := windows.LockFileEx(windows.Handle(f.Fd()), flags|windows.LOCKFILE_FAIL_IMMEDIATELY, 0, 1, 0, ol)
	if errors.Is(err, windows.ERROR_LOCK_VIOLATION) {
		return false, nil
	}
	return err == nil, err
}

func unlockFile(f *os.File) {
	windows.UnlockFileEx(windows.Handle(f.Fd()), 0, 1, 0, new(windows.Overlapped))
}

// removesOpenFiles: Windows removes no file that a handle holds open
// without FILE_SHARE_DELETE (see liveLock.release).
const removesOpenFiles = false
