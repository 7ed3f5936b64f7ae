package feed

import "testing"

// Coordinates are written as degrees with the hemisphere letter, south and
// west for negative values (common practice in almanacs and charts), never
// a minus sign, also for values that round to zero.
func TestCoords(t *testing.T) {
	for _, c := range []struct {
		lat, lon float64
		dec      int
		want     string
	}{
		{-33.45, -70.6667, 3, "33.450° S, 70.667° W"},
		{78.2, 15.6, 4, "78.2000° N, 15.6000° E"},
		{47.8095, 13.055, 2, "47.81° N, 13.05° E"},
		{-0.00001, 180, 3, "0.000° S, 180.000° E"},
		{0, -0.0, 1, "0.0° N, 0.0° E"},
	} {
		if got := Coords(c.lat, c.lon, c.dec); got != c.want {
			t.Errorf("Coords(%v, %v, %d) = %q, want %q", c.lat, c.lon, c.dec, got, c.want)
		}
	}
}
