package main

import (
	"errors"
	"fmt"
	"strconv"
	"strings"
	"testing"

	"heliocal/config"
)

// configHint is the hint of the one problem of a configuration whose site
// (latitude, longitude, elevation) or dark-window entry (max_illumination)
// sets key to value, written as YAML has it: a number bare, anything else
// in quotes.
func configHint(t *testing.T, key, value string) string {
	t.Helper()
	if _, err := strconv.ParseFloat(value, 64); err != nil {
		value = strconv.Quote(value)
	}
	site := map[string]string{"latitude": "1", "longitude": "2", "elevation": "0"}
	entry := "dark-window"
	if key == "max_illumination" {
		entry = "{kind: dark-window, max_illumination: " + value + "}"
	} else {
		site[key] = value
	}
	in := fmt.Sprintf("sites:\n  - {id: x, latitude: %s, longitude: %s, elevation: %s, timezone: UTC}\nfeeds:\n  - {id: f, site: x, kinds: [%s]}\n",
		site["latitude"], site["longitude"], site["elevation"], entry)
	_, err := config.Parse(strings.NewReader(in), "yaml")
	var ve *config.ValidationError
	if !errors.As(err, &ve) || len(ve.Problems) != 1 {
		t.Fatalf("%s: %v, want one problem", in, err)
	}
	return ve.Problems[0].Hint
}

// A max_illumination and --max-illumination given the same value get one
// hint, in the same words: a percentage, written with "%" or not, is told
// the fraction it means.
func TestIlluminationHintsAgree(t *testing.T) {
	for _, tc := range []struct{ value, want string }{
		{"30", "write a fraction of 1: 0.3 for 30 %"},
		{"30%", "write a fraction of 1: 0.3 for 30 %"},
		{"30 %", "write a fraction of 1: 0.3 for 30 %"},
		{"-1", config.IlluminationText},
		{"lots", config.IlluminationText},
	} {
		hint := configHint(t, "max_illumination", tc.value)
		if hint != tc.want {
			t.Errorf("max_illumination: %s: hint %q, want %q", tc.value, hint, tc.want)
		}
		_, _, errOut := runCLI(t, "events", "--lat", "0", "--lon", "0", "--kinds", "dark-window", "--max-illumination", tc.value)
		if !strings.HasSuffix(errOut, " ("+hint+")\n") {
			t.Errorf("--max-illumination %s: %q, want the hint (%s)", tc.value, errOut, hint)
		}
	}
}

// --lat, --lon and --elev that are no number, or out of range, get the
// hint the configuration gives its site's key for the same value, in the
// same words.
func TestPlaceHintsAgree(t *testing.T) {
	for _, tc := range []struct{ flag, key, value string }{
		{"lat", "latitude", "42°52′48″S"},
		{"lat", "latitude", "95"},
		{"lon", "longitude", "72°15′W"},
		{"lon", "longitude", "-181"},
		{"elev", "elevation", "120m"},
		{"elev", "elevation", "high"},
		{"elev", "elevation", "12000"},
	} {
		hint := configHint(t, tc.key, tc.value)
		args := []string{"events", "--lat", "0", "--lon", "0"}
		args = append(args, "--"+tc.flag+"="+tc.value)
		_, _, errOut := runCLI(t, args...)
		if !strings.HasSuffix(errOut, " ("+hint+")\n") {
			t.Errorf("--%s %s: %q, want the hint of %s: %s (%s)", tc.flag, tc.value, errOut, tc.key, tc.value, hint)
		}
	}
}
