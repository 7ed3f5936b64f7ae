//go:build unix

package publish

import (
	"errors"
	"os"
	"syscall"
)

// tryLock takes an exclusive flock(2) on f without blocking; false means
// another open file description holds it.
func tryLock(f *os.File) (bool, error) { return flockNB(f, syscall.LOCK_EX) }

// tryLockShared takes a shared flock(2) on f without blocking; false means
// another open file description holds it exclusively.
func tryLockShared(f *os.File) (bool, error) { return flockNB(f, syscall.LOCK_SH) }

// flockNB is flock(2) of f with how (LOCK_EX or LOCK_SH) and LOCK_NB; false
// means the lock is held in a conflicting way.
func flockNB(f *os.File, how int) (bool, error) {
	for {
		err := syscall.Flock(int(f.Fd()), how|syscall.LOCK_NB)
		switch {
		case err == nil:
			return true, nil
		case errors.Is(err, syscall.EINTR):
			continue
		case errors.Is(err, syscall.EWOULDBLOCK):
			return false, nil
		}
		return false, err
	}
}

func unlockFile(f *os.File) { syscall.Flock(int(f.Fd()), syscall.LOCK_UN) }

// removesOpenFiles: unlink(2) removes the name of a file that is open
// (see liveLock.release).
const removesOpenFiles = true
