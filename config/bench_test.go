package config

import (
	"bytes"
	"errors"
	"fmt"
	"strings"
	"testing"
)

func BenchmarkParseDemo(b *testing.B) {
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Parse(bytes.NewReader(demoYAML), "yaml"); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkParseFleet parses a configuration of 1,000 sites with one feed
// each, the size of a cooperative's fleet.
func BenchmarkParseFleet(b *testing.B) {
	var sb strings.Builder
	sb.WriteString("sites:\n")
	for i := range 1000 {
		fmt.Fprintf(&sb, "  - {id: site-%04d, latitude: %.3f, longitude: %.3f, timezone: Europe/Vienna}\n", i, float64(i%180)-89.5, float64(i%360)-179.5)
	}
	sb.WriteString("feeds:\n")
	for i := range 1000 {
		fmt.Fprintf(&sb, "  - {id: site-%04d-sun, site: site-%04d, kinds: [sunrise, sunset, {kind: civil-dusk, offset: -15m}]}\n", i, i)
	}
	benchParse(b, sb.String(), "yaml", func(err error) error { return err })
}

// benchParse parses data, written in format, once per operation; check
// returns the error of a result not as it should be.
func benchParse(b *testing.B, data, format string, check func(error) error) {
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	for b.Loop() {
		_, err := Parse(strings.NewReader(data), format)
		if err := check(err); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkCheckFleetTOML reads a TOML configuration of 1,000 sites, each
// without its latitude, with one feed each (10,000 lines): 1,000 problems,
// each named with the line of its site's first key, [[sites]] having no
// key of its own (fieldLines): the last, 4997.
func BenchmarkCheckFleetTOML(b *testing.B) {
	var sb strings.Builder
	for i := range 1000 {
		fmt.Fprintf(&sb, "[[sites]]\nid = \"site-%04d\"\nlongitude = %.3f\ntimezone = \"Europe/Vienna\"\n\n", i, float64(i%360)-179.5)
	}
	for i := range 1000 {
		fmt.Fprintf(&sb, "[[feeds]]\nid = \"site-%04d-sun\"\nsite = \"site-%04d\"\nkinds = [\"sunrise\", \"sunset\"]\n\n", i, i)
	}
	benchParse(b, sb.String(), "toml", func(err error) error {
		var ve *ValidationError
		if !errors.As(err, &ve) || len(ve.Problems) != 1000 || ve.Problems[999].Line != 4997 {
			return fmt.Errorf("want 1,000 problems, the last on line 4997: %w", err)
		}
		return nil
	})
}
