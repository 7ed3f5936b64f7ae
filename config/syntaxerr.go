package config

import (
	"fmt"
	"regexp"
	"strconv"
	"strings"
	"sync"
)

// SyntaxError is a file that is no YAML, TOML or JSON document heliocal
// reads, at a line: it wraps ErrUnreadable. Load sets Source to the file's
// path, and the error is then named as a compiler names one, as a
// ValidationError's problems are: "farm.yaml:5: cannot read the file as
// yaml: a tab in the indentation (…)".
type SyntaxError struct {
	Source string // the file's path, or "standard input"; "" when not known
	Format string // "yaml", "toml" or "json"
	Line   int    // from 1
	Column int    // from 1; 0 when not known
	Msg    string // what is wrong, and the hint
}

func (e *SyntaxError) Error() string {
	if e.Source != "" {
		at := e.Source + ":" + strconv.Itoa(e.Line)
		if e.Column > 0 {
			at += ":" + strconv.Itoa(e.Column)
		}
		return fmt.Sprintf("%s: %s as %s: %s", at, ErrUnreadable, e.Format, e.Msg)
	}
	at := "line " + strconv.Itoa(e.Line)
	if e.Column > 0 {
		at += ", column " + strconv.Itoa(e.Column)
	}
	return fmt.Sprintf("%s as %s: %s: %s", ErrUnreadable, e.Format, at, e.Msg)
}

func (e *SyntaxError) Unwrap() error { return ErrUnreadable }

// syntaxAt is the position a reader's message begins with: "line 5: ",
// "line 3, column 16: ", the YAML reader's "yaml: line 5: "; the reader's
// own name after it ("toml: ") is dropped too, as the error says which
// format the file was read as.
var syntaxAt = sync.OnceValue(func() *regexp.Regexp {
	return regexp.MustCompile(`^(?:(?:yaml|toml): )?line ([0-9]+)(?:, column ([0-9]+))?: (?:(?:yaml|toml): )?`)
})

// unreadable is the error of a file read as format whose reader says msg:
// a *SyntaxError when msg names a line, else ErrUnreadable with msg.
func unreadable(format, msg string) error {
	m := syntaxAt().FindStringSubmatch(msg)
	if m == nil {
		return fmt.Errorf("%w as %s: %s", ErrUnreadable, format, msg)
	}
	line, _ := strconv.Atoi(m[1])
	col, _ := strconv.Atoi(m[2])
	return &SyntaxError{Format: format, Line: line, Column: col, Msg: strings.TrimSpace(msg[len(m[0]):])}
}
