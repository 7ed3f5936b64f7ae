package publish

import (
	"fmt"
	"hash/fnv"
	"strconv"
	"strings"
)

// Shard selects one part of a configuration's feeds, so that a fleet of
// workers can split a large configuration between them: worker i of n
// publishes the feeds whose id hashes to i modulo n.
//
// Index is 0-based, like the JOB_COMPLETION_INDEX of a Kubernetes Indexed
// Job: the shards of n are 0/n, 1/n … (n-1)/n. The zero Shard (and any shard
// of Count ≤ 1) means "every feed".
type Shard struct {
	Index int // 0-based, 0 ≤ Index < Count
	Count int
}

// Sharded reports whether s selects a strict part of the feeds (Count > 1).
func (s Shard) Sharded() bool { return s.Count > 1 }

// String writes the shard as "i/n"; the zero Shard is "0/1".
func (s Shard) String() string {
	if s.Count <= 1 {
		return "0/1"
	}
	return strconv.Itoa(s.Index) + "/" + strconv.Itoa(s.Count)
}

// Has reports whether the feed with this id belongs to the shard.
func (s Shard) Has(feedID string) bool {
	if s.Count <= 1 {
		return true
	}
	return InShard(feedID, s.Index, s.Count)
}

// InShard reports whether the feed id falls in shard i (0-based) of n. The
// assignment is the 64-bit FNV-1a hash of the id modulo n: it depends on the
// id alone, never on the order or the number of feeds in the configuration,
// so adding a feed never moves another one to a different worker (changing n
// does). For n ≤ 1 every id is in shard 0.
func InShard(feedID string, i, n int) bool {
	if n <= 1 {
		return i == 0
	}
	h := fnv.New64a()
	h.Write([]byte(feedID))
	return h.Sum64()%uint64(n) == uint64(i)
}

// MaxShards is the largest shard count ParseShard accepts. The last shard to
// finish reads one manifest per shard, so the count is bounded; ten thousand
// workers is far more than any fleet needs (each holds at least one feed).
const MaxShards = 10_000

// ParseShard reads a shard written "i/n", with i 0-based: "0/4" … "3/4", and
// n at most MaxShards.
func ParseShard(s string) (Shard, error) {
	a, b, ok := strings.Cut(strings.TrimSpace(s), "/")
	if !ok {
		return Shard{}, fmt.Errorf("shard %q: want i/n, e.g. \"0/4\" (i is 0-based)", s)
	}
	n, err := strconv.Atoi(strings.TrimSpace(b))
	if err != nil {
		return Shard{}, fmt.Errorf("shard %q: count %q is not a whole number", s, b)
	}
	if n < 1 {
		return Shard{}, fmt.Errorf("shard %q: count must be at least 1", s)
	}
	if n > MaxShards {
		return Shard{}, fmt.Errorf("shard %q: count must be at most %d", s, MaxShards)
	}
	i, err := strconv.Atoi(strings.TrimSpace(a))
	if err != nil {
		return Shard{}, fmt.Errorf("shard %q: index %q is not a whole number", s, a)
	}
	if i < 0 || i >= n {
		return Shard{}, fmt.Errorf("shard %q: index must be within 0..%d (0-based, like JOB_COMPLETION_INDEX)", s, n-1)
	}
	return Shard{Index: i, Count: n}, nil
}
