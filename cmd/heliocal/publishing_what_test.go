package main

import (
	"fmt"
	"testing"

	"heliocal/feed"
	"heliocal/feed/publish"
)

// The line publish starts with counts feeds the way its summary and the
// index page do: with grouping commas, and "1 feed" in the singular.
func TestPublishingWhatCounts(t *testing.T) {
	srcs := make([]publish.Source, 1000)
	for i := range srcs {
		srcs[i].ID = fmt.Sprintf("site-%04d", i)
	}
	if got, want := publishingWhat(srcs, publish.Shard{}), "1,000 feeds"; got != want {
		t.Errorf("1,000 sources: %q, want %q", got, want)
	}
	if got, want := publishingWhat(srcs[:1], publish.Shard{}), "1 feed"; got != want {
		t.Errorf("one source: %q, want %q", got, want)
	}
	shard, err := publish.ParseShard("1/4")
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	for _, s := range srcs {
		if shard.Has(s.ID) {
			n++
		}
	}
	if want := fmt.Sprintf("shard 1/4: %s feeds of 1,000", feed.FormatCount(n)); publishingWhat(srcs, shard) != want {
		t.Errorf("shard 1/4: %q, want %q", publishingWhat(srcs, shard), want)
	}
}
