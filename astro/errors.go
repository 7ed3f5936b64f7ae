package astro

import (
	"errors"
	"fmt"
)

// ErrOutOfRange is matched (through errors.Is) by every error this package
// returns for an instant, a year or a span outside the supported range.
var ErrOutOfRange = errors.New("astro: out of supported range")

// RangeError reports an input outside the range this package supports
// (see MinTime and MaxTime), or, with Coverage, outside the dates an
// Ephemeris or a MoonEphemeris covers (its Coverage). It matches
// ErrOutOfRange with errors.Is.
type RangeError struct {
	What  string // the input, e.g. "time", "year", "ephemeris start"
	Value string // the value given
	Min   string // lowest supported value
	Max   string // highest supported value
	// Coverage says that Min..Max is an ephemeris's own span, not the
	// package's supported range: "outside this ephemeris's dates".
	Coverage bool
}

func (e *RangeError) Error() string {
	if e.Coverage {
		return fmt.Sprintf("astro: %s %s outside this ephemeris's dates %s..%s", e.What, e.Value, e.Min, e.Max)
	}
	return fmt.Sprintf("astro: %s %s outside the supported range %s..%s", e.What, e.Value, e.Min, e.Max)
}

// Is reports whether target is ErrOutOfRange.
func (e *RangeError) Is(target error) bool { return target == ErrOutOfRange }

// invalidf returns an error with the formatted message that matches
// ErrInvalidInput, for malformed input that is not one number (an InputError
// names a field and a float64): a span that ends before it starts, a nil
// location.
func invalidf(format string, args ...any) error {
	return &invalidError{fmt.Sprintf(format, args...)}
}

type invalidError struct{ msg string }

func (e *invalidError) Error() string { return e.msg }

// Is reports whether target is ErrInvalidInput.
func (e *invalidError) Is(target error) bool { return target == ErrInvalidInput }
