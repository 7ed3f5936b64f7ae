package main

import (
	"bytes"
	"compress/gzip"
	"io"
	"os"
	"testing"
)

// TestPGOProfile: cmd/heliocal/default.pgo, which every build of the command
// compiles with (DEVELOPERS.md, "Profile-guided optimisation"), is a CPU
// profile (gzip-compressed protocol buffer, as tools/pgo/collect.sh writes
// it) of this program's hot paths: the Sun's samples, the crossing search
// and the collector are named in it.
func TestPGOProfile(t *testing.T) {
	f, err := os.Open("default.pgo")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	zr, err := gzip.NewReader(f)
	if err != nil {
		t.Fatalf("default.pgo is not gzip-compressed: %v", err)
	}
	data, err := io.ReadAll(zr)
	if err != nil {
		t.Fatal(err)
	}
	for _, fn := range []string{"heliocal/astro.(*earthSeries).daily", "heliocal/astro.(*track).crossingsMany",
		"heliocal/feed.(*collector).crossings", "heliocal/feed/publish.renderOne"} {
		if !bytes.Contains(data, []byte(fn)) {
			t.Errorf("default.pgo does not name %s: refresh it with tools/pgo/collect.sh", fn)
		}
	}
}
