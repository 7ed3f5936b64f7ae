package config

import (
	"bytes"
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
