package config

import "testing"

// A latitude or longitude written as people write them elsewhere gets the
// decimal degrees to write; one that is no coordinate, or out of range,
// gets the plain hint. The degrees, minutes and seconds are the README's
// examples worked by hand (42 + 52/60 + 48/3600 = 42.88).
func TestCoordinateHint(t *testing.T) {
	for _, tc := range []struct{ key, in, want string }{
		{"latitude", "42°52′48″S", "write -42.88: decimal degrees, north positive, south negative"},
		{"longitude", "72°15′36″W", "write -72.26: decimal degrees, east positive, west negative"},
		{"latitude", "47°30'N", "write 47.5: decimal degrees, north positive, south negative"},
		{"longitude", "9° 42′ 0″ E", "write 9.7: decimal degrees, east positive, west negative"},
		{"latitude", "47 30 N", "write 47.5: decimal degrees, north positive, south negative"},
		{"latitude", "N 40.7", "write 40.7: decimal degrees, north positive, south negative"},
		{"longitude", "74.0W", "write -74: decimal degrees, east positive, west negative"},
		{"longitude", "9,7", "write 9.7: decimal degrees, east positive, west negative"},
		{"latitude", "-33°27,5′", "write -33.458333: decimal degrees, north positive, south negative"},
		// beyond the pole or the date line: the range; the letter of the
		// other axis, a sign and a letter, minutes of 60, words: the plain
		// hint
		{"latitude", "9.7E", "write " + LatitudeText},
		{"longitude", "-74W", "write " + LongitudeText},
		{"latitude", "95N", "a latitude is at most 90°, N or S: write " + LatitudeText},
		{"longitude", "200 E", "a longitude is at most 180°, E or W: write " + LongitudeText},
		{"latitude", "47°60′N", "write " + LatitudeText},
		{"latitude", "4O.5", "write " + LatitudeText},
		{"latitude", "north", "write " + LatitudeText},
	} {
		if got := coordinateHint(tc.key, tc.in); got != tc.want {
			t.Errorf("%s %q: %q, want %q", tc.key, tc.in, got, tc.want)
		}
	}
}
