package feed

import (
	"math/rand"
	"testing"
	"time"
)

// TestToSecondTwoSteps: ToSecond gives what rounding to the millisecond,
// then to the second, gives (the rule written above it), at the halfway
// values of both steps and at random instants, before and after 1970.
func TestToSecondTwoSteps(t *testing.T) {
	twoSteps := func(t time.Time) time.Time { return t.Round(time.Millisecond).Round(time.Second) }
	base := []time.Time{
		time.Date(2027, 3, 28, 0, 59, 59, 0, time.UTC),
		time.Date(1900, 1, 1, 12, 0, 0, 0, time.UTC),
		time.Date(2099, 12, 31, 23, 59, 59, 0, time.FixedZone("", 3600)),
	}
	nanos := []int{0, 1, 499_499_999, 499_500_000, 499_999_999, 500_000_000, 999_499_999, 999_500_000, 999_999_999}
	r := rand.New(rand.NewSource(12))
	for range 2000 {
		nanos = append(nanos, r.Intn(1e9))
	}
	for _, b := range base {
		for _, n := range nanos {
			in := b.Add(time.Duration(n))
			if got, want := ToSecond(in), twoSteps(in); !got.Equal(want) || got.Location() != want.Location() {
				t.Fatalf("ToSecond(%s) = %s, want %s", in.Format(time.RFC3339Nano), got.Format(time.RFC3339Nano), want.Format(time.RFC3339Nano))
			}
		}
	}
}
