//go:build !linux

package publish

import "os"

// writeDirect writes nothing: the page cache is bypassed on Linux only.
func writeDirect(*os.File, []byte) (bool, error) { return false, nil }

// syncHeld is f.Sync.
func syncHeld(f *os.File) error { return f.Sync() }
