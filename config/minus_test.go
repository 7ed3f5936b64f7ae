package config

import (
	"strconv"
	"testing"
)

// The minus sign is U+2212 MINUS SIGN, written in UTF-8 as the bytes
// E2 88 92 (The Unicode Standard, Mathematical Operators chart, and RFC 3629
// for the encoding); the hyphen-minus is U+002D (Basic Latin chart). The SI
// Brochure (9th edition, 5.4.1) and ISO 80000-1 write a negative number
// with the minus sign.
func TestMinus(t *testing.T) {
	if MinusSign != "\xe2\x88\x92" {
		t.Fatalf("MinusSign = %q, want U+2212 (UTF-8 E2 88 92)", MinusSign)
	}
	for _, c := range []struct{ in, want string }{
		{strconv.FormatFloat(-3.5, 'f', -1, 64), "\xe2\x88\x923.5"},
		{strconv.FormatFloat(-0.83, 'f', 1, 64), "\xe2\x88\x920.8"},
		{"-0.0", "\xe2\x88\x920.0"}, // the caller decides whether a zero keeps its sign
		{"UTC-05:00", "UTC\xe2\x88\x9205:00"},
		{"-Inf", "\xe2\x88\x92Inf"},
		{"12.25", "12.25"},
		{"+3", "+3"},
		{"", ""},
	} {
		if got := Minus(c.in); got != c.want {
			t.Errorf("Minus(%q) = %q, want %q", c.in, got, c.want)
		}
	}
}
