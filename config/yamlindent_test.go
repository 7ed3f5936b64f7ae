package config

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"go.yaml.in/yaml/v3"
)

// A line indented unlike the lines above it is named by its own line: the
// YAML decoder's "did not find expected key" and "did not find expected '-'
// indicator" give the line where the block began, line 1 below.
func TestYAMLMisalignedLine(t *testing.T) {
	for in, want := range map[string]string{
		// a key one space short of its siblings
		"sites:\n  - id: a\n    latitude: 1\n   longitude: 2\nfeeds: []\n": "yaml: line 4: indented by 3, unlike the lines above it (did not find expected '-' indicator)",
		// a key at the indentation of the list items
		"sites:\n  - id: a\n    latitude: 1\n  longitude: 2\nfeeds: []\n": "yaml: line 4: indented by 2, unlike the lines above it (did not find expected '-' indicator)",
		// a list item one space short of the one above it
		"feeds:\n  - id: f\n    kinds:\n      - sunrise\n     - sunset\n": "yaml: line 5: indented by 5, unlike the lines above it (did not find expected key)",
		// a list item among the keys of a mapping
		"feeds:\n  - id: f\n    kinds:\n      - sunrise\n    - sunset\n": "yaml: line 5: indented by 4, unlike the lines above it (did not find expected key)",
	} {
		_, err := Parse(strings.NewReader(in), "yaml")
		if !errors.Is(err, ErrUnreadable) || !strings.HasSuffix(err.Error(), want) {
			t.Errorf("%q: %v\nwant it to end %q", in, err, want)
		}
	}
}

// No line of a YAML file that the decoder reads is taken for a misaligned
// one: the configurations of the tests, the demo, the deployment manifests.
func TestYAMLMisalignedNotInValidFiles(t *testing.T) {
	var files []string
	for _, pattern := range []string{"../testdata/config/*.yaml", "demo.yaml", "../deploy/*/*.yaml", "../deploy/*/*/*.yaml"} {
		m, err := filepath.Glob(pattern)
		if err != nil {
			t.Fatal(err)
		}
		files = append(files, m...)
	}
	read := 0
	for _, name := range files {
		data, err := os.ReadFile(name)
		if err != nil {
			t.Fatal(err)
		}
		var v any
		if yaml.Unmarshal(data, &v) != nil {
			continue // a test of a malformed file
		}
		read++
		if n, indent := yamlMisaligned(bytes.Split(data, []byte("\n")), 1); n != 0 {
			t.Errorf("%s: line %d (indented by %d) taken for a misaligned line", name, n, indent)
		}
	}
	if read < 100 {
		t.Errorf("%d YAML files read, want the configurations of the tests and the demo (over 100)", read)
	}
}

// A key where none may be ("mapping values are not allowed in this
// context") says why: a value holding ": ", which YAML reads as a second
// key, two keys of one mapping on one line, or a line indented deeper than
// the one above it.
func TestYAMLColonInValue(t *testing.T) {
	for in, want := range map[string]string{
		"sites:\n  - id: a\n    name: Ridge: north side\n":                   `yaml: line 3: mapping values are not allowed in this context (a value with ": " in it goes in quotes: name: "Ridge: north side")`,
		"feeds:\n  - id: f\n    plans:\n      - title: Film: the night\n":    `yaml: line 4: mapping values are not allowed in this context (a value with ": " in it goes in quotes: title: "Film: the night")`,
		"sites:\n  - id: a\n    latitude: 1\n     longitude: 2\nfeeds: []\n": "yaml: line 4: mapping values are not allowed in this context (the line is indented deeper than line 3 above it)",
		// two keys of a kinds entry on one line: the key is not put in
		// quotes in the value ("sunset offset: -30m" is no kind)
		"feeds:\n  - id: f\n    kinds:\n      - kind: sunset offset: -30m\n": `yaml: line 4: mapping values are not allowed in this context (two keys on one line: write offset: -30m on a line of its own below kind: sunset, or both in braces: {kind: sunset, offset: -30m})`,
		// a key of a list's entry indented deeper than the entry's first
		"feeds:\n  - id: f\n    kinds:\n      - kind: golden-hour\n         offset: 10m\n": `yaml: line 5: mapping values are not allowed in this context (the line is indented deeper than kind: on line 4 above it: indent it by 8 spaces, as kind: is)`,
		// a word that is a key of another section only is text
		"sites:\n  - id: a\n    name: Ridge kinds: many\n": `yaml: line 3: mapping values are not allowed in this context (a value with ": " in it goes in quotes: name: "Ridge kinds: many")`,
	} {
		_, err := Parse(strings.NewReader(in), "yaml")
		if !errors.Is(err, ErrUnreadable) || !strings.HasSuffix(err.Error(), want) {
			t.Errorf("%q: %v\nwant it to end %q", in, err, want)
		}
	}
}
