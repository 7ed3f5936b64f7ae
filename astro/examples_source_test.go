package astro

import (
	"go/ast"
	"go/parser"
	"go/token"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// namesSource matches a source the examples are checked against: a U.S.
// Naval Observatory table, Meeus's Astronomical Algorithms, or PyEphem or
// the Swiss Ephemeris with its version (their figures move between
// versions).
var namesSource = regexp.MustCompile(`U\.S\. Naval Observatory|USNO|Meeus|PyEphem [0-9]|Swiss Ephemeris [0-9]`)

// TestExamplesNameTheirSource holds the README's word on this package's
// runnable examples: each that prints an astronomical result names, in its
// comments, the source it is checked against (namesSource).
// Example_errors prints the package's own messages, which no outside source
// gives.
func TestExamplesNameTheirSource(t *testing.T) {
	files, err := filepath.Glob("*_test.go")
	if err != nil {
		t.Fatal(err)
	}
	fset := token.NewFileSet()
	examples := 0
	for _, name := range files {
		f, err := parser.ParseFile(fset, name, nil, parser.ParseComments)
		if err != nil {
			t.Fatal(err)
		}
		for _, d := range f.Decls {
			fn, ok := d.(*ast.FuncDecl)
			if !ok || fn.Recv != nil || !strings.HasPrefix(fn.Name.Name, "Example") || fn.Name.Name == "Example_errors" {
				continue
			}
			examples++
			s := fn.Doc.Text()             // "" without one
			for _, c := range f.Comments { // and those in its body
				if c.Pos() > fn.Body.Lbrace && c.End() < fn.Body.Rbrace {
					s += c.Text()
				}
			}
			if !namesSource.MatchString(s) {
				t.Errorf("%s (%s): no source named in its comments", fn.Name.Name, name)
			}
		}
	}
	if examples < 20 {
		t.Errorf("%d examples found, want the 20 or more of this package", examples)
	}
}
