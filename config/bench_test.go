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
	data := []byte(sb.String())
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Parse(bytes.NewReader(data), "yaml"); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkCheckFleetTOML reads a TOML configuration of 1,000 sites, each
// without its latitude, with one feed each: 1,000 problems, each named with
// the line of its site's first key (the last, 4997), [[sites]] having no key of its own
// (fieldLines).
func BenchmarkCheckFleetTOML(b *testing.B) {
	var sb strings.Builder
	for i := range 1000 {
		fmt.Fprintf(&sb, "[[sites]]\nid = \"site-%04d\"\nlongitude = %.3f\ntimezone = \"Europe/Vienna\"\n\n", i, float64(i%360)-179.5)
	}
	for i := range 1000 {
		fmt.Fprintf(&sb, "[[feeds]]\nid = \"site-%04d-sun\"\nsite = \"site-%04d\"\nkinds = [\"sunrise\", \"sunset\"]\n\n", i, i)
	}
	data := []byte(sb.String())
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	for b.Loop() {
		_, err := Parse(bytes.NewReader(data), "toml")
		var ve *ValidationError
		if !errors.As(err, &ve) || len(ve.Problems) != 1000 || ve.Problems[999].Line != 4997 {
			b.Fatalf("want 1,000 problems, the last on line 4997: %v", err)
		}
	}
}
