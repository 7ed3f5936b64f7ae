//go:build unix

package publish

import (
	"errors"
	"syscall"
)

func isEINVAL(err error) bool { return errors.Is(err, syscall.EINVAL) }

// errDiskFull are the errors of a full disk and of an exhausted quota.
var errDiskFull = []error{syscall.ENOSPC, syscall.EDQUOT}
