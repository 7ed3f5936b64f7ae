package publish_test

import (
	"fmt"

	"heliocal/feed/publish"
)

// Shards are written i/n with i counted from 0, like the completion index of
// a Kubernetes Indexed Job; every feed id falls in exactly one shard.
func ExampleParseShard() {
	sh, err := publish.ParseShard("2/4")
	fmt.Println(sh, err)
	_, err = publish.ParseShard("4/4")
	fmt.Println(err)
	n := 0
	for i := range 4 {
		if publish.InShard("fernhollow-sun", i, 4) {
			n++
		}
	}
	fmt.Println("shards holding fernhollow-sun:", n)
	// Output:
	// 2/4 <nil>
	// shard "4/4": index must be within 0..3 (0-based, like JOB_COMPLETION_INDEX)
	// shards holding fernhollow-sun: 1
}

func ExampleSummary() {
	fmt.Print(publish.Summary(publish.Stats{Feeds: 12, FeedsWritten: 3, FeedsUnchanged: 9, Events: 41210, Bytes: 5_210_000}, "public"))
	// Output:
	// published 12 feeds (3 written, 9 unchanged), 41,210 events, 5.2 MB in 0.00 s to public/
}
