//go:build !unix

package publish

func isEINVAL(error) bool { return false }

// errDiskFull are the errors of a full disk, none told apart here.
var errDiskFull []error
