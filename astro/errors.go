package astro

import (
	"errors"
	"fmt"
)

// ErrOutOfRange is matched (through errors.Is) by every error this package
// returns for an instant, a year or a span outside the supported range.
var ErrOutOfRange = errors.New("astro: out of supported range")

// RangeError reports an input outside the range this package supports
// (see MinTime and MaxTime). It matches ErrOutOfRange with errors.Is.
type RangeError struct {
	What  string // the input, e.g. "time", "year", "ephemeris start"
	Value string // the value given
	Min   string // lowest supported value
	Max   string // highest supported value
}

func (e *RangeError) Error() string {
	return fmt.Sprintf("astro: %s %s outside the supported range %s..%s", e.What, e.Value, e.Min, e.Max)
}

// Is reports whether target is ErrOutOfRange.
func (e *RangeError) Is(target error) bool { return target == ErrOutOfRange }
