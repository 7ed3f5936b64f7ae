package config

import (
	"fmt"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"sync"
)

// cssColorNames are the extended colour keywords of CSS Color Module Level 3
// (W3C Recommendation, section 4.3), which RFC 7986 section 5.9 names as the
// values of the calendar COLOR property.
var cssColorNames = []string{
	"aliceblue", "antiquewhite", "aqua", "aquamarine", "azure", "beige", "bisque", "black",
	"blanchedalmond", "blue", "blueviolet", "brown", "burlywood", "cadetblue", "chartreuse",
	"chocolate", "coral", "cornflowerblue", "cornsilk", "crimson", "cyan", "darkblue", "darkcyan",
	"darkgoldenrod", "darkgray", "darkgreen", "darkgrey", "darkkhaki", "darkmagenta",
	"darkolivegreen", "darkorange", "darkorchid", "darkred", "darksalmon", "darkseagreen",
	"darkslateblue", "darkslategray", "darkslategrey", "darkturquoise", "darkviolet", "deeppink",
	"deepskyblue", "dimgray", "dimgrey", "dodgerblue", "firebrick", "floralwhite", "forestgreen",
	"fuchsia", "gainsboro", "ghostwhite", "gold", "goldenrod", "gray", "green", "greenyellow",
	"grey", "honeydew", "hotpink", "indianred", "indigo", "ivory", "khaki", "lavender",
	"lavenderblush", "lawngreen", "lemonchiffon", "lightblue", "lightcoral", "lightcyan",
	"lightgoldenrodyellow", "lightgray", "lightgreen", "lightgrey", "lightpink", "lightsalmon",
	"lightseagreen", "lightskyblue", "lightslategray", "lightslategrey", "lightsteelblue",
	"lightyellow", "lime", "limegreen", "linen", "magenta", "maroon", "mediumaquamarine",
	"mediumblue", "mediumorchid", "mediumpurple", "mediumseagreen", "mediumslateblue",
	"mediumspringgreen", "mediumturquoise", "mediumvioletred", "midnightblue", "mintcream",
	"mistyrose", "moccasin", "navajowhite", "navy", "oldlace", "olive", "olivedrab", "orange",
	"orangered", "orchid", "palegoldenrod", "palegreen", "paleturquoise", "palevioletred",
	"papayawhip", "peachpuff", "peru", "pink", "plum", "powderblue", "purple", "red", "rosybrown",
	"royalblue", "saddlebrown", "salmon", "sandybrown", "seagreen", "seashell", "sienna", "silver",
	"skyblue", "slateblue", "slategray", "slategrey", "snow", "springgreen", "steelblue", "tan",
	"teal", "thistle", "tomato", "turquoise", "violet", "wheat", "white", "whitesmoke", "yellow",
	"yellowgreen",
}

// cssColorValues are the sRGB values of cssColorNames, in their order, as
// 0xRRGGBB: the same table of CSS Color Module Level 3, section 4.3.
var cssColorValues = []uint32{
	0xf0f8ff, 0xfaebd7, 0x00ffff, 0x7fffd4, 0xf0ffff, 0xf5f5dc, 0xffe4c4, 0x000000, 0xffebcd,
	0x0000ff, 0x8a2be2, 0xa52a2a, 0xdeb887, 0x5f9ea0, 0x7fff00, 0xd2691e, 0xff7f50, 0x6495ed,
	0xfff8dc, 0xdc143c, 0x00ffff, 0x00008b, 0x008b8b, 0xb8860b, 0xa9a9a9, 0x006400, 0xa9a9a9,
	0xbdb76b, 0x8b008b, 0x556b2f, 0xff8c00, 0x9932cc, 0x8b0000, 0xe9967a, 0x8fbc8f, 0x483d8b,
	0x2f4f4f, 0x2f4f4f, 0x00ced1, 0x9400d3, 0xff1493, 0x00bfff, 0x696969, 0x696969, 0x1e90ff,
	0xb22222, 0xfffaf0, 0x228b22, 0xff00ff, 0xdcdcdc, 0xf8f8ff, 0xffd700, 0xdaa520, 0x808080,
	0x008000, 0xadff2f, 0x808080, 0xf0fff0, 0xff69b4, 0xcd5c5c, 0x4b0082, 0xfffff0, 0xf0e68c,
	0xe6e6fa, 0xfff0f5, 0x7cfc00, 0xfffacd, 0xadd8e6, 0xf08080, 0xe0ffff, 0xfafad2, 0xd3d3d3,
	0x90ee90, 0xd3d3d3, 0xffb6c1, 0xffa07a, 0x20b2aa, 0x87cefa, 0x778899, 0x778899, 0xb0c4de,
	0xffffe0, 0x00ff00, 0x32cd32, 0xfaf0e6, 0xff00ff, 0x800000, 0x66cdaa, 0x0000cd, 0xba55d3,
	0x9370db, 0x3cb371, 0x7b68ee, 0x00fa9a, 0x48d1cc, 0xc71585, 0x191970, 0xf5fffa, 0xffe4e1,
	0xffe4b5, 0xffdead, 0x000080, 0xfdf5e6, 0x808000, 0x6b8e23, 0xffa500, 0xff4500, 0xda70d6,
	0xeee8aa, 0x98fb98, 0xafeeee, 0xdb7093, 0xffefd5, 0xffdab9, 0xcd853f, 0xffc0cb, 0xdda0dd,
	0xb0e0e6, 0x800080, 0xff0000, 0xbc8f8f, 0x4169e1, 0x8b4513, 0xfa8072, 0xf4a460, 0x2e8b57,
	0xfff5ee, 0xa0522d, 0xc0c0c0, 0x87ceeb, 0x6a5acd, 0x708090, 0x708090, 0xfffafa, 0x00ff7f,
	0x4682b4, 0xd2b48c, 0x008080, 0xd8bfd8, 0xff6347, 0x40e0d0, 0xee82ee, 0xf5deb3, 0xffffff,
	0xf5f5f5, 0xffff00, 0x9acd32,
}

// IsColorName reports whether s is a CSS3 colour keyword (case-insensitive).
func IsColorName(s string) bool {
	_, ok := slices.BinarySearch(cssColorNames, strings.ToLower(s))
	return ok
}

// colorHint says what to write for the colour c, which is no CSS3 colour
// name: for a hex code (#ff8800, #f80) or rgb(255, 136, 0), which color
// does not take, the name of the nearest colour with its own code, for a
// code that is no colour ("#ff88": four digits) how a code is written and
// a name to write; else the nearest name in spelling, or examples.
func colorHint(c string) string {
	const names = `a CSS3 colour name such as "goldenrod" or "steelblue"`
	rgb, code, ok := readColor(c)
	if !ok {
		if strings.HasPrefix(strings.TrimSpace(c), "#") {
			return "a colour code has 6 hex digits, #rrggbb, and color takes none: write " + names
		}
		return nearValue(c, cssColorNames, names)
	}
	best := 0
	for i, v := range cssColorValues {
		if colorDistance(v, rgb) < colorDistance(cssColorValues[best], rgb) {
			best = i
		}
	}
	if cssColorValues[best] == rgb {
		return fmt.Sprintf(`color takes a CSS3 colour name, not a colour code: %s is "%s"`, code, cssColorNames[best])
	}
	return fmt.Sprintf(`color takes a CSS3 colour name, not a colour code: the nearest to %s is "%s" (#%06x)`, code, cssColorNames[best], cssColorValues[best])
}

// readColor reads c as a colour written as a code: "#rrggbb" (or
// "rrggbb"), "#rgb" (each digit doubled) or "rgb(r, g, b)" with r, g, b 0..255. It returns
// the colour as 0xRRGGBB and its code as #rrggbb.
func readColor(c string) (rgb uint32, code string, ok bool) {
	c = strings.ToLower(strings.TrimSpace(c))
	if m := rgbFunc().FindStringSubmatch(c); m != nil {
		for _, s := range m[1:] {
			n, err := strconv.Atoi(s)
			if err != nil || n > 255 {
				return 0, "", false
			}
			rgb = rgb<<8 | uint32(n)
		}
		return rgb, fmt.Sprintf("#%06x", rgb), true
	}
	h, found := strings.CutPrefix(c, "#")
	if !found && len(h) == 6 && strings.Trim(h, "0123456789abcdef") == "" {
		found = true // ff8800, its # left out: no name is six hex digits
	}
	if !found || (len(h) != 3 && len(h) != 6) {
		return 0, "", false
	}
	if len(h) == 3 {
		h = string([]byte{h[0], h[0], h[1], h[1], h[2], h[2]})
	}
	v, err := strconv.ParseUint(h, 16, 32)
	if err != nil {
		return 0, "", false
	}
	return uint32(v), "#" + h, true
}

var rgbFunc = sync.OnceValue(func() *regexp.Regexp {
	return regexp.MustCompile(`^rgb\(\s*([0-9]{1,3})\s*,\s*([0-9]{1,3})\s*,\s*([0-9]{1,3})\s*\)$`)
})

// colorDistance is the squared distance of two colours 0xRRGGBB in sRGB.
func colorDistance(a, b uint32) int {
	d := 0
	for shift := 0; shift < 24; shift += 8 {
		x := int(a>>shift&0xff) - int(b>>shift&0xff)
		d += x * x
	}
	return d
}
