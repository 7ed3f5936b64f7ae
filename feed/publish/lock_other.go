//go:build !unix && !windows

package publish

import (
	"errors"
	"os"
)

func tryLock(*os.File) (bool, error) {
	return false, errors.New("locking a directory is not supported on this system")
}

func unlockFile(*os.File) {}
