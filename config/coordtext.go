package config

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode"
)

// coordinateHint says how to write a latitude or longitude written as
// people write them elsewhere, as the decimal degrees the key takes: a
// decimal comma ("47,5"), a letter for the hemisphere ("74.0W", "N 40.7"),
// degrees, minutes and seconds ("47°30′N", "9 42 0 E"). It is "write
// -74: decimal degrees, east positive, west negative" for "74.0W", or the
// plain "write decimal degrees, …, e.g. …" when x is none of these or is out
// of range.
func coordinateHint(key, x string) string {
	if v, ok := coordinateValue(key, x); ok {
		return "write " + v + ": " + coordinateUnits(key)
	}
	if over := coordinateOver(key, x); over != "" {
		return over
	}
	return "write " + coordinateText[key]
}

// coordinateUnits says how key, latitude or longitude, is written, its
// text without the example: "decimal degrees, east positive, west
// negative".
func coordinateUnits(key string) string {
	text := coordinateText[key]
	return text[:strings.Index(text, ", e.g.")]
}

// coordinateOver is the hint of x, a latitude or longitude read beyond
// the pole or the date line, a slip of the digits that no form fixes
// ("95N": "a latitude is at most 90°, N or S: write decimal degrees, …");
// "" for another x.
func coordinateOver(key, x string) string {
	limit, pos, neg := coordinateAxis(key)
	if f, read := readCoordinate(x, pos, neg); read && math.Abs(f) > limit {
		return fmt.Sprintf("a %s is at most %g°, %s or %s: write %s", key, limit, pos, neg, coordinateText[key])
	}
	return ""
}

// coordinateValue is x, a latitude or longitude written as coordinateHint
// says, in the decimal degrees key takes ("-74" for "74.0W"); false when
// x is none of these forms or is out of range.
func coordinateValue(key, x string) (string, bool) {
	limit, pos, neg := coordinateAxis(key)
	v, ok := readCoordinate(x, pos, neg)
	if !ok || math.Abs(v) > limit {
		return "", false
	}
	return strconv.FormatFloat(v, 'f', -1, 64), true
}

// coordinateAxis is the largest value of key, latitude or longitude, in
// degrees, and the letters of its positive and negative hemispheres.
func coordinateAxis(key string) (limit float64, pos, neg string) {
	if key == "longitude" {
		return 180, "E", "W"
	}
	return 90, "N", "S"
}

// readCoordinate reads x as decimal degrees: at most three numbers
// (degrees, minutes, seconds) with °, ′, ″ or ', " or spaces between them,
// a comma as the decimal mark of the last, and a hemisphere letter (pos for
// positive, neg for negative) before or after them in place of a sign. The
// result is rounded to 1e-6° (about 0.1 m), so 42°52′48″ is 42.88.
func readCoordinate(x, pos, neg string) (float64, bool) {
	s := strings.ToUpper(strings.TrimSpace(x))
	sign := 1.0
	for _, h := range []string{pos, neg} {
		if t, ok := strings.CutSuffix(s, h); ok {
			s = t
		} else if t, ok := strings.CutPrefix(s, h); ok {
			s = t
		} else {
			continue
		}
		if h == neg {
			sign = -1
		}
		break
	}
	s = strings.TrimSpace(s)
	if strings.HasPrefix(s, "-") {
		if sign < 0 { // "-74W": which one is meant is a guess
			return 0, false
		}
		sign, s = -1, s[1:]
	}
	parts := strings.FieldsFunc(s, func(r rune) bool {
		return unicode.IsSpace(r) || strings.ContainsRune("°º′'″\"", r)
	})
	if len(parts) == 0 || len(parts) > 3 {
		return 0, false
	}
	v, scale := 0.0, 1.0
	for i, p := range parts {
		if i < len(parts)-1 && strings.ContainsAny(p, ".,") {
			return 0, false // only the last number has a fraction
		}
		f, err := strconv.ParseFloat(strings.Replace(p, ",", ".", 1), 64)
		if err != nil || f < 0 || (i > 0 && f >= 60) {
			return 0, false
		}
		v += f / scale
		scale *= 60
	}
	if len(parts) == 1 && !strings.ContainsAny(x, "NSEWnsew,°º") {
		return 0, false // a plain number: no other way of writing it
	}
	return sign * math.Round(v*1e6) / 1e6, true
}
