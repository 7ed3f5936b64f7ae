package config

import (
	"errors"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"
)

// TestKindVocabulary pins the vocabulary the configuration documents: the
// names are file syntax, so a change here is a change for every user.
func TestKindVocabulary(t *testing.T) {
	want := []string{
		"sunrise", "sunset", "solar-noon", "sun-hidden", "noon-clear",
		"civil-dawn", "civil-dusk", "nautical-dawn", "nautical-dusk", "astronomical-dawn", "astronomical-dusk",
		"golden-hour", "blue-hour", "sun-band", "sun-altitude",
		"march-equinox", "june-solstice", "september-equinox", "december-solstice", "seasons", "cross-quarter",
		"perihelion", "aphelion", "photoperiod", "lighting", "daily-summary",
		"new-moon", "first-quarter", "full-moon", "last-quarter", "moon-phases",
		"moonrise", "moonset", "moon-transit", "dark-window",
		"solar-eclipse", "lunar-eclipse",
	}
	if !slices.Equal(KindNames, want) {
		t.Errorf("KindNames\n got %q\nwant %q", KindNames, want)
	}
	if len(KindExamples) != len(KindNames) {
		t.Fatalf("%d examples for %d names", len(KindExamples), len(KindNames))
	}
	for i, ex := range KindExamples {
		k, err := ParseKind(ex)
		if err != nil {
			t.Errorf("example %q: %v", ex, err)
			continue
		}
		if k.Name != KindNames[i] {
			t.Errorf("example %q parses to %q, want %q", ex, k.Name, KindNames[i])
		}
		if KindDoc(k.Name) == "" || k.Family() == "" {
			t.Errorf("%q has no documentation or family", k.Name)
		}
	}
}

func TestParseKind(t *testing.T) {
	tests := []struct {
		in   string
		want Kind
		str  string // String(); "" means in
	}{
		{"sunrise", Kind{Name: "sunrise"}, ""},
		{"  Solar-Noon ", Kind{Name: "solar-noon"}, "solar-noon"},
		{"sun-altitude:-3.5", Kind{Name: "sun-altitude", Altitude: -3.5}, ""},
		{"sun-altitude: 6", Kind{Name: "sun-altitude", Altitude: 6}, "sun-altitude:6"},
		{"sun-altitude:-0.833", Kind{Name: "sun-altitude", Altitude: -0.833}, ""},
		{"photoperiod:12h", Kind{Name: "photoperiod", DayLength: 12 * time.Hour}, ""},
		{"photoperiod:14h30m", Kind{Name: "photoperiod", DayLength: 14*time.Hour + 30*time.Minute}, ""},
		{"photoperiod:870m", Kind{Name: "photoperiod", DayLength: 14*time.Hour + 30*time.Minute}, "photoperiod:14h30m"},
		{"photoperiod:12h0m30s", Kind{Name: "photoperiod", DayLength: 12*time.Hour + 30*time.Second}, ""},
		{"lighting:16h", Kind{Name: "lighting", DayLength: 16 * time.Hour}, ""},
		{"Lighting:15h30m", Kind{Name: "lighting", DayLength: 15*time.Hour + 30*time.Minute}, "lighting:15h30m"},
		{"moon-phases", Kind{Name: "moon-phases"}, ""},
	}
	for _, tc := range tests {
		got, err := ParseKind(tc.in)
		if err != nil {
			t.Errorf("ParseKind(%q): %v", tc.in, err)
			continue
		}
		if got != tc.want {
			t.Errorf("ParseKind(%q) = %+v, want %+v", tc.in, got, tc.want)
		}
		str := tc.str
		if str == "" {
			str = tc.in
		}
		if got.String() != str {
			t.Errorf("ParseKind(%q).String() = %q, want %q", tc.in, got.String(), str)
		}
	}
}

func TestParseKindErrors(t *testing.T) {
	tests := []struct{ in, msg, hint string }{
		{"sunrize", "unknown kind", `did you mean "sunrise"?`},
		{"sun_set", "unknown kind", `did you mean "sunset"?`},
		{"fullmoon", "unknown kind", `did you mean "full-moon"?`},
		{"golden hour", "unknown kind", `did you mean "golden-hour"?`},
		{"photoperoid:12h", "unknown kind", `did you mean "photoperiod:12h"?`},
		{"sunaltitude", "unknown kind", `did you mean "sun-altitude:-3.5"?`},
		{"tea-time", "unknown kind", "known kinds: sunrise, sunset"},
		// a word that names no kind: the family's kinds, or the kind meant
		{"civil-twilight", "unknown kind", `its kinds are "civil-dawn" and "civil-dusk"`},
		{"Civil twilight", "unknown kind", `its kinds are "civil-dawn" and "civil-dusk"`},
		{"dusk", "unknown kind", `its kinds are "civil-dusk", "nautical-dusk" and "astronomical-dusk"`},
		{"noon", "unknown kind", `did you mean "solar-noon"?`},
		{"summary", "unknown kind", `did you mean "daily-summary"?`},
		// a parameter without its colon: the kind with that parameter, not
		// the kind's example ("lighting:16h" for "lighting 14h")
		{"lighting 14h", "unknown kind", `did you mean "lighting:14h"?`},
		{"lighting14h", "unknown kind", `did you mean "lighting:14h"?`},
		{"lighting-14h", "unknown kind", `did you mean "lighting:14h"?`},
		{"lightning 14h", "unknown kind", `did you mean "lighting:14h"?`},
		{"photoperiod 14h30m", "unknown kind", `did you mean "photoperiod:14h30m"?`},
		{"photoperiod=12h", "unknown kind", `did you mean "photoperiod:12h"?`},
		{"sun-altitude -3", "unknown kind", `did you mean "sun-altitude:-3"?`},
		{"sun-altitude-3", "unknown kind", `did you mean "sun-altitude:-3"?`},
		{"sun-altitude=10", "unknown kind", `did you mean "sun-altitude:10"?`},
		{"sun-band 2..12", "unknown kind", `did you mean "sun-band:2..12"?`},
		// several kinds in one text: each to write as its own entry
		{"sunrise, sunset", "2 kinds in one entry", `write each as an entry of its own: "sunrise", "sunset"`},
		{"Sunrise sunset civil-dusk", "3 kinds in one entry", `write each as an entry of its own: "sunrise", "sunset", "civil-dusk"`},
		{"sunrise, tea-time", "unknown kind", "known kinds: sunrise, sunset"},
		{"", "is empty: name a kind", "known kinds:"},
		{"sunrise:5", "takes no parameter", `write "sunrise"`},
		{"sun-altitude", "needs an altitude", ""},
		{"sun-altitude:", "needs an altitude", ""},
		{"sun-altitude:90", "must be above -90 and below 90 (civil", ""},
		{"sun-altitude:-90", "must be above -90 and below 90 (civil", ""},
		{"sun-altitude:NaN", "malformed altitude", ""},
		{"sun-altitude:inf", "malformed altitude", ""},
		{"sun-altitude:six", "malformed altitude", ""},
		{"sun-altitude:30°", "malformed altitude", `did you mean "sun-altitude:30"?`},
		{"sun-band:35..20", "the low altitude must be below the high one", `did you mean "sun-band:20..35"?`},
		{"sun-band:5..5", "the low altitude must be below the high one", `write two altitudes in degrees, low first`},
		{"sun-altitude:-6 deg", "malformed altitude", `did you mean "sun-altitude:-6"?`},
		{"photoperiod", "needs a day length", ""},
		{"photoperiod:12", "malformed day length", ""},
		{"photoperiod:0s", "longer than 0 and shorter than 24h", ""},
		{"photoperiod:24h", "longer than 0 and shorter than 24h", ""},
		{"photoperiod:-1h", "longer than 0 and shorter than 24h", ""},
	}
	for _, tc := range tests {
		_, err := ParseKind(tc.in)
		if err == nil {
			t.Errorf("ParseKind(%q): no error", tc.in)
			continue
		}
		if !strings.Contains(err.Error(), tc.msg) || !strings.Contains(err.Error(), strconv.Quote(tc.in)) {
			t.Errorf("ParseKind(%q): %q lacks %q or the value", tc.in, err, tc.msg)
		}
		if !strings.Contains(err.Error(), tc.hint) {
			t.Errorf("ParseKind(%q): %q lacks hint %q", tc.in, err, tc.hint)
		}
	}
}

func TestKindPredicates(t *testing.T) {
	is := func(pred func(Kind) bool) []string {
		var out []string
		for _, ex := range KindExamples {
			k, _ := ParseKind(ex)
			if pred(k) {
				out = append(out, k.Name)
			}
		}
		return out
	}
	check := func(what string, got, want []string) {
		t.Helper()
		if !slices.Equal(got, want) {
			t.Errorf("%s: got %q, want %q", what, got, want)
		}
	}
	check("IsSpan", is(Kind.IsSpan), []string{"sun-hidden", "golden-hour", "blue-hour", "sun-band", "lighting", "dark-window", "solar-eclipse", "lunar-eclipse"})
	check("IsMoon", is(Kind.IsMoon), []string{"new-moon", "first-quarter", "full-moon", "last-quarter", "moon-phases", "moonrise", "moonset", "moon-transit", "dark-window", "solar-eclipse", "lunar-eclipse"})
	check("IsYearly", is(Kind.IsYearly), []string{"noon-clear", "march-equinox", "june-solstice", "september-equinox", "december-solstice", "seasons", "cross-quarter", "perihelion", "aphelion", "new-moon", "first-quarter", "full-moon", "last-quarter", "moon-phases", "solar-eclipse", "lunar-eclipse"})
	check("IsGroup", is(Kind.IsGroup), []string{"seasons", "moon-phases"})
	check("IsAllDay", is(Kind.IsAllDay), []string{"photoperiod", "daily-summary"})

	var names []string
	for _, m := range (Kind{Name: "seasons"}).Members() {
		names = append(names, m.String())
	}
	check("seasons members", names, []string{"march-equinox", "june-solstice", "september-equinox", "december-solstice"})
	names = nil
	for _, m := range (Kind{Name: "moon-phases"}).Members() {
		names = append(names, m.String())
	}
	check("moon-phases members", names, []string{"new-moon", "first-quarter", "full-moon", "last-quarter"})
	if m := (Kind{Name: "sunrise"}).Members(); len(m) != 1 || m[0].Name != "sunrise" {
		t.Errorf("sunrise members: %v", m)
	}
}

func TestKindText(t *testing.T) {
	var k Kind
	if err := k.UnmarshalText([]byte("photoperiod:16h")); err != nil || k.DayLength != 16*time.Hour {
		t.Fatalf("UnmarshalText: %v %+v", err, k)
	}
	b, _ := k.MarshalText()
	if string(b) != "photoperiod:16h" {
		t.Errorf("MarshalText = %q", b)
	}
	if err := k.UnmarshalText([]byte("sunrize")); err == nil || k.DayLength != 16*time.Hour {
		t.Errorf("a failed UnmarshalText must leave the kind alone: %v %+v", err, k)
	}
}

func TestDuration(t *testing.T) {
	for in, want := range map[string]string{"30m": "30m", "-1h15m": "-1h15m", "90s": "1m30s", "2h": "2h", "0": "0s"} {
		var d Duration
		if err := d.UnmarshalText([]byte(in)); err != nil {
			t.Errorf("%q: %v", in, err)
			continue
		}
		if d.String() != want {
			t.Errorf("%q: String() = %q, want %q", in, d, want)
		}
	}
	var d Duration
	if err := d.UnmarshalText([]byte("30")); err == nil || !strings.Contains(err.Error(), `"30"`) {
		t.Errorf("bare number: %v", err)
	}
	// a number alone, as text (an ad-hoc feed's alarm, a quoted offset), is
	// told its unit as one unquoted is; past an offset's 12 h, minutes only
	for in, want := range map[string]string{
		"6":     `a duration needs a unit: write "6m" for minutes or "6h" for hours`,
		"-2":    `a duration needs a unit: write "-2m" for minutes or "-2h" for hours`,
		"-30":   `a duration needs a unit: write "-30m" for minutes`,
		"1hour": `the units are h, m and s: write "1h" for 1hour`,
	} {
		if got := DurationHint(in); got != want {
			t.Errorf("DurationHint(%q) = %q, want %q", in, got, want)
		}
	}
}

func FuzzParseKind(f *testing.F) {
	for _, ex := range KindExamples {
		f.Add(ex)
	}
	for _, s := range []string{"sun-altitude:-0", "sun-altitude:1e-9", "sun-altitude:89.999999999", "photoperiod:23h59m59.999999999s",
		"photoperiod:1ns", "SUNSET", " moonrise ", "sun-altitude:+6", "photoperiod:.5h", "sunrise:", ":", "seasons:x"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		k, err := ParseKind(s)
		if err != nil {
			if !strings.Contains(err.Error(), strconv.Quote(s)) {
				t.Fatalf("error %q does not name the value %q", err, s)
			}
			return
		}
		back, err := ParseKind(k.String())
		if err != nil {
			t.Fatalf("ParseKind(%q) = %+v, but its String %q does not parse: %v", s, k, k.String(), err)
		}
		if back != k {
			t.Fatalf("round trip of %q: %+v → %q → %+v", s, k, k.String(), back)
		}
		if k.String() != strings.ToLower(k.String()) || strings.ContainsAny(k.String(), " \t\n") {
			t.Fatalf("String %q is not canonical", k.String())
		}
		if _, ok := kindIndex[k.Name]; !ok {
			t.Fatalf("ParseKind(%q) returned unknown name %q", s, k.Name)
		}
	})
}

// A day length written with a space or its unit in a word gets the kind to
// write; one with no unit keeps the form as its hint.
func TestDayLengthWrittenOtherwise(t *testing.T) {
	for in, hint := range map[string]string{
		"photoperiod:16 h":     `did you mean "photoperiod:16h"?`,
		"photoperiod: 14h 30m": `did you mean "photoperiod:14h30m"?`,
		"lighting:16 hours":    `did you mean "lighting:16h"?`,
		"photoperiod:12":       `write hours and minutes with units, e.g. "photoperiod:14h30m"`,
		"photoperiod:25 h":     `write hours and minutes with units, e.g. "photoperiod:14h30m"`,
	} {
		_, err := ParseKind(in)
		var ke *KindError
		if !errors.As(err, &ke) || ke.Msg != "malformed day length" || ke.Hint != hint {
			t.Errorf("%q: %v, want malformed day length (%s)", in, err, hint)
		}
	}
}

// Every word of kindWords names no kind, and every kind it points to is one.
func TestKindWordsAreKinds(t *testing.T) {
	for word, kinds := range kindWords {
		if _, err := ParseKind(word); err == nil {
			t.Errorf("%q is a kind itself", word)
		}
		for _, k := range kinds {
			if _, err := ParseKind(k); err != nil {
				t.Errorf("%q: %q is no kind: %v", word, k, err)
			}
		}
	}
}
