package config

import "strings"

// MinusSign is the minus sign, U+2212, which every text written for a person
// uses for a negative number or offset ("−0.8°", "UTC−05:00") in place of the
// ASCII hyphen-minus, which a line may break after and which reads as a dash.
const MinusSign = "\u2212"

// Minus writes s, a number as strconv or fmt format it, with the minus sign
// in place of its hyphen-minus: "-3.5" is "−3.5". A number that rounds to
// zero keeps its sign ("-0.0" is "−0.0"): where it should have none, the
// caller says so.
func Minus(s string) string {
	i := strings.IndexByte(s, '-')
	if i < 0 {
		return s
	}
	return s[:i] + MinusSign + s[i+1:]
}
