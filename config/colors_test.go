package config

import (
	"strings"
	"testing"
)

// The colours' values are those of CSS Color Module Level 3 (W3C
// Recommendation), section 4.3, "Extended color keywords": one per name.
func TestColorValues(t *testing.T) {
	if len(cssColorValues) != len(cssColorNames) {
		t.Fatalf("%d values for %d names", len(cssColorValues), len(cssColorNames))
	}
	for name, want := range map[string]uint32{
		"darkorange": 0xff8c00, // CSS Color 3, §4.3
		"goldenrod":  0xdaa520, // CSS Color 3, §4.3
		"steelblue":  0x4682b4, // CSS Color 3, §4.3
		"gray":       0x808080, // CSS Color 3, §4.3 (X11's gray is #bebebe)
		"green":      0x008000, // CSS Color 3, §4.3 (X11's green is #00ff00)
	} {
		for i, n := range cssColorNames {
			if n == name && cssColorValues[i] != want {
				t.Errorf("%s: #%06x, want #%06x", name, cssColorValues[i], want)
			}
		}
	}
}

// A feed's color takes a CSS3 colour name only (RFC 7986's COLOR): a colour
// code, hex or rgb(…), is told the nearest name with that name's code,
// and a code that is none (four digits, a letter past f) how a code is
// written and a name to write instead. The nearest names are worked by
// hand from CSS Color 3's table: #ff8800 is 4 from darkorange's #ff8c00 in
// green, and 29 from orange's #ffa500.
func TestColorHint(t *testing.T) {
	for in, want := range map[string]string{
		"#ff8800":           `color takes a CSS3 colour name, not a colour code: the nearest to #ff8800 is "darkorange" (#ff8c00)`,
		"#F80":              `color takes a CSS3 colour name, not a colour code: the nearest to #ff8800 is "darkorange" (#ff8c00)`,
		"ff8800":            `color takes a CSS3 colour name, not a colour code: the nearest to #ff8800 is "darkorange" (#ff8c00)`,
		"rgb(70, 130, 180)": `color takes a CSS3 colour name, not a colour code: #4682b4 is "steelblue"`,
		"#ff88":             `a colour code has 6 hex digits, #rrggbb, and color takes none: write a CSS3 colour name such as "goldenrod" or "steelblue"`,
		"#gg0000":           `a colour code has 6 hex digits, #rrggbb, and color takes none: write a CSS3 colour name such as "goldenrod" or "steelblue"`,
		"dark orange":       `did you mean "darkorange"?`,
	} {
		if got := colorHint(in); got != want {
			t.Errorf("%s: %q, want %q", in, got, want)
		}
	}
	// the whole problem, at its line
	_, err := Parse(strings.NewReader("sites: [{id: a, latitude: 1, longitude: 2, timezone: UTC}]\nfeeds:\n  - id: f\n    site: a\n    kinds: [sunrise]\n    color: \"#ff88\"\n"), "yaml")
	ps := problemsOf(t, err)
	if len(ps) != 1 || ps[0].Line != 6 || ps[0].Error() != `feeds[0].color: "#ff88": not a CSS3 colour name (a colour code has 6 hex digits, #rrggbb, and color takes none: write a CSS3 colour name such as "goldenrod" or "steelblue")` {
		t.Errorf("problems %v", ps)
	}
}
