package config

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

var fuzzFormats = []string{"yaml", "toml", "json"}

// FuzzParseConfig feeds arbitrary bytes to Parse in each format. Parse never
// panics; it either returns a valid configuration or an error that says the
// file is unreadable or lists problems, each naming a field path.
func FuzzParseConfig(f *testing.F) {
	f.Add(DemoYAML(), uint8(0))
	files, _ := filepath.Glob(filepath.Join(testdata, "*"))
	for _, name := range files {
		data, err := os.ReadFile(name)
		if err != nil {
			f.Fatal(err)
		}
		switch filepath.Ext(name) {
		case ".yaml":
			f.Add(data, uint8(0))
		case ".toml":
			f.Add(data, uint8(1))
		case ".json":
			f.Add(data, uint8(2))
		}
	}
	f.Add([]byte("sites: [{id: a, latitude: 1e308, longitude: -0, timezone: Local}]"), uint8(0))
	f.Add([]byte(`{"feeds": [{"kinds": [null, {}, [], 1, true]}]}`), uint8(2))
	f.Add([]byte("[[sites]]\nid = 1979-05-27T07:32:00Z\n"), uint8(1))
	// an empty key written twice (an anchor with no key), and a key under it
	// that is not the top-level key of the same name
	f.Add([]byte("&0000:\n    00: 00000000000\n000000000000:\n&0000:\n000000: 0\n00: 00"), uint8(0))
	f.Add([]byte(`{"": 1, "": 2}`), uint8(2))

	f.Fuzz(func(t *testing.T, data []byte, fi uint8) {
		format := fuzzFormats[int(fi)%len(fuzzFormats)]
		c, err := Parse(bytes.NewReader(data), format)
		if err == nil {
			if c == nil {
				t.Fatal("nil config without error")
			}
			if verr := c.Validate(); verr != nil {
				t.Fatalf("Parse accepted a configuration Validate refuses: %v", verr)
			}
			return
		}
		if c != nil {
			t.Fatal("config returned with an error")
		}
		msg := err.Error()
		if msg == "" {
			t.Fatal("empty error")
		}
		if errors.Is(err, ErrUnreadable) {
			if !strings.HasPrefix(msg, "cannot read the file") {
				t.Fatalf("unreadable error without its prefix: %q", msg)
			}
			return
		}
		var verr *ValidationError
		if !errors.As(err, &verr) {
			t.Fatalf("error is neither unreadable nor a validation error: %T %q", err, msg)
		}
		if len(verr.Problems) == 0 {
			t.Fatal("validation error without problems")
		}
		for _, p := range verr.Problems {
			if p.Path == "" || p.Msg == "" {
				t.Fatalf("problem without path or message: %+v", p)
			}
			if !strings.HasPrefix(p.Error(), p.Path+": ") {
				t.Fatalf("problem line does not start with its path: %q", p.Error())
			}
		}
		if n := strings.Count(msg, "\n") + 1; n < len(verr.Problems) {
			t.Fatalf("%d lines for %d problems", n, len(verr.Problems))
		}
	})
}
