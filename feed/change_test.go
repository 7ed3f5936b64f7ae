package feed

import (
	"testing"
	"time"
)

// A change of day length reads in the units of a clock (common practice):
// an hour or more in hours, as on the first day the Sun rises after polar
// night, never as "+102 min 55 s".
func TestDayChangeWording(t *testing.T) {
	for d, want := range map[time.Duration]string{
		39 * time.Second:                 "+39 s",
		-(2*time.Minute + 5*time.Second): "−2 min 05 s",
		102*time.Minute + 55*time.Second: "+1 h 42 min 55 s",
		-(61 * time.Minute):              "−1 h 01 min 00 s",
	} {
		if got := Change(d); got != want {
			t.Errorf("Change(%v) = %q, want %q", d, got, want)
		}
	}
}
