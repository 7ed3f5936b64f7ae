//go:build !unix

package publish

func isEINVAL(error) bool { return false }
