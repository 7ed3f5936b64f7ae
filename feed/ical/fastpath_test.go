package ical

import (
	"bytes"
	"math/bits"
	"math/rand"
	"strings"
	"testing"
	"time"

	"heliocal/feed"

	ics "github.com/arran4/golang-ical"
)

// TestOffsetAtMatchesZone: the cached offset period gives, for every quarter
// hour of two years walked forwards and for instants in random order, the
// offset of Go's time zone database and the answer of feed.ShownTwice, including
// around each clock change (zones with DST north and south, a half-hour and a
// 30-minute-DST zone, negative DST, no DST, and a fixed zone).
func TestOffsetAtMatchesZone(t *testing.T) {
	zones := []*time.Location{time.FixedZone("Fixed west", -5*3600)}
	for _, name := range []string{"Europe/Vienna", "America/New_York", "Australia/Adelaide",
		"Australia/Lord_Howe", "Europe/Dublin", "Asia/Kolkata", "Pacific/Chatham"} {
		zones = append(zones, mustLoad(t, name))
	}
	from := utc(2026, 1, 1, 0, 0, 0)
	check := func(w *writer, at time.Time) {
		t.Helper()
		off, amb := w.offsetAt(at)
		if _, want := at.In(w.loc).Zone(); off != int64(want) {
			t.Fatalf("%s %s: offset %d, want %d", w.loc, at, off, want)
		}
		if want := feed.ShownTwice(at.In(w.loc)); amb != want {
			t.Fatalf("%s %s: ambiguous %v, want %v", w.loc, at, amb, want)
		}
	}
	r := rand.New(rand.NewSource(1))
	for _, loc := range zones {
		w := &writer{loc: loc, span: offsetSpan{from: 1, to: 0}}
		for at := from; at.Before(from.AddDate(2, 0, 0)); at = at.Add(15 * time.Minute) {
			check(w, at)
		}
		for range 20000 {
			check(w, from.Add(time.Duration(r.Int63n(int64(2*365*24*time.Hour)))).Round(time.Second))
		}
	}
}

// TestAppendStamp: the hand-written date-time formatting gives the bytes of
// time.Time.Format, with and without the "Z".
func TestAppendStamp(t *testing.T) {
	for _, at := range []time.Time{utc(2026, 3, 29, 1, 0, 0), utc(1, 1, 1, 0, 0, 0), utc(9999, 12, 31, 23, 59, 59),
		utc(2026, 12, 31, 9, 5, 7), utc(10000, 1, 1, 0, 0, 0), utc(-1, 6, 1, 12, 0, 0),
		time.Date(2026, 7, 1, 23, 30, 0, 0, time.FixedZone("x", 3600))} {
		if got, want := string(appendStamp(nil, at, true)), at.UTC().Format(utcLayout); got != want {
			t.Errorf("%s: %q, want %q", at, got, want)
		}
		if got, want := string(appendStamp(nil, at, false)), at.UTC().Format(localLayout); got != want {
			t.Errorf("%s: %q, want %q", at, got, want)
		}
	}
}

// TestAppendSeconds: formatting from Unix seconds with the date's digits
// kept from one value to the next gives appendStamp's bytes, for instants
// in order and at random (before 1970 and outside four-digit years too).
func TestAppendSeconds(t *testing.T) {
	var w writer
	r := rand.New(rand.NewSource(5))
	at := []time.Time{utc(1969, 12, 31, 23, 59, 59), utc(1970, 1, 1, 0, 0, 0), utc(10000, 1, 1, 0, 0, 0),
		utc(9999, 12, 31, 23, 59, 59), utc(-1, 6, 1, 12, 0, 0), utc(2026, 3, 29, 1, 0, 0)}
	for u := utc(2026, 1, 1, 0, 0, 0); len(at) < 3000; u = u.Add(time.Duration(r.Intn(20000)) * time.Second) {
		at = append(at, u)
	}
	for range 3000 {
		at = append(at, time.Unix(r.Int63n(1<<37)-1<<36, 0))
	}
	for _, t0 := range at {
		for _, z := range []bool{true, false} {
			if got, want := string(w.appendSeconds(nil, t0.Unix(), z)), string(appendStamp(nil, t0, z)); got != want {
				t.Fatalf("%s: %q, want %q", t0, got, want)
			}
		}
	}
}

// TestCleanTextFastPath: the clean-text check returns what the full
// normalisation returns, for texts built from clean and unclean pieces
// (controls C0 and C1, CR, invalid and truncated UTF-8, U+FFFD itself).
func TestCleanTextFastPath(t *testing.T) {
	pieces := []string{"a", "Z", " ", ",", ";", "\\", "\t", "\n", "\r", "\r\n", "\x00", "\x1f", "\x7f", "é",
		"\u0085", "\u009f", "\u00a0", "\u2028", "日", "🌅", "\uFFFD", "\xff", "\xc3", "\xe6\x97", "\xed\xa0\x80"}
	r := rand.New(rand.NewSource(2))
	for range 50000 {
		var s string
		for j := r.Intn(8); j > 0; j-- {
			s += pieces[r.Intn(len(pieces))]
		}
		if got, want := cleanText(s), normaliseText(s); got != want {
			t.Fatalf("cleanText(%q) = %q, want %q", s, got, want)
		}
	}
}

// TestEscapeCleanText: cleaning while escaping gives escapeText of the
// cleaned text, or reports that the text needs normalising first exactly
// when cleanText would change it; texts built from clean and unclean
// pieces, long enough for the 8-octet path.
func TestEscapeCleanText(t *testing.T) {
	pieces := []string{"a", "Z", " ", ",", ";", "\\", "\t", "\n", "\r", "\r\n", "\x00", "\x1f", "\x7f", "é", "°", "−",
		"\u0085", "\u009f", "\u00a0", "\u2028", "日", "🌅", "\uFFFD", "\xff", "\xc3", "\xe6\x97", "\xed\xa0\x80",
		"Sunrise at 06:42:40 CET", "(standard refraction)."}
	r := rand.New(rand.NewSource(7))
	for range 50000 {
		var s string
		for j := r.Intn(24); j > 0; j-- {
			s += pieces[r.Intn(len(pieces))]
		}
		got, ok := escapeCleanText([]byte("DESCRIPTION:"), s)
		if clean := cleanText(s); ok != (clean == s) {
			t.Fatalf("escapeCleanText(%q) reports %v; cleanText gives %q", s, ok, clean)
		}
		if want := escapeText([]byte("DESCRIPTION:"), s); ok && !bytes.Equal(got, want) {
			t.Fatalf("escapeCleanText(%q) = %q, want %q", s, got, want)
		}
	}
}

// TestContentLineShort: a line that needs no folding is written as fold
// would write it, at and around the 75-octet limit.
func TestContentLineShort(t *testing.T) {
	cfg := &ics.SerializationConfiguration{MaxLength: 75, NewLine: "\r\n"}
	for n := 1; n <= 80; n++ {
		line := "CATEGORIES:" + strings.Repeat("x", n)
		var b strings.Builder
		if err := (&contentLine{line: line}).SerializeTo(&b, cfg); err != nil {
			t.Fatal(err)
		}
		if want := fold(line, 75, "\r\n"); b.String() != want {
			t.Errorf("%d octets: %q, want %q", len(line), b.String(), want)
		}
	}
}

// hasLess reports whether an octet of x is below n (n ≤ 128): the
// one-test form escapeMask, escapeCleanMask and cleanMask are built from.
func hasLess(x uint64, n byte) bool { return (x-ones*uint64(n))&^x&highs != 0 }

// hasByte reports whether an octet of x is c.
func hasByte(x uint64, c byte) bool { return hasLess(x^(ones*uint64(c)), 1) }

// TestWordTests: the 8-octet tests agree with octet-wise ones, for random
// words and words built from the octets around the thresholds.
func TestWordTests(t *testing.T) {
	r := rand.New(rand.NewSource(6))
	edge := []byte{0, 1, '\t', '\n', 0x1f, ' ', ',', ';', '\\', 0x7e, 0x7f, 0x80, 0x81, 0xfe, 0xff}
	for n := range 200000 {
		var w [8]byte
		for i := range w {
			if n%2 == 0 {
				w[i] = byte(r.Intn(256))
			} else {
				w[i] = edge[r.Intn(len(edge))]
			}
		}
		x := load64(string(w[:]), 0)
		for _, c := range []byte{' ', 1, 0x7f, ',', ';', '\\', '\n'} {
			less, has := false, false
			for _, o := range w {
				less = less || o < c
				has = has || o == c
			}
			if hasLess(x, c) != less {
				t.Fatalf("hasLess(% x, %#x) = %v", w, c, !less)
			}
			if hasByte(x, c) != has {
				t.Fatalf("hasByte(% x, %#x) = %v", w, c, !has)
			}
		}
		esc, clean := false, false
		firstEsc, firstClean := 8, 8
		for i, o := range w {
			if o == '\\' || o == ';' || o == ',' || o == '\n' {
				esc, firstEsc = true, min(firstEsc, i)
			}
			if o < ' ' || o >= 0x7f {
				clean, firstClean = true, min(firstClean, i)
			}
		}
		if got := bits.TrailingZeros64(escapeMask(x)) / 8; got != firstEsc {
			t.Fatalf("escapeMask(% x) points at octet %d, want %d", w, got, firstEsc)
		}
		if got := bits.TrailingZeros64(cleanMask(x)) / 8; got != firstClean {
			t.Fatalf("cleanMask(% x) points at octet %d, want %d", w, got, firstClean)
		}
		if (escapeMask(x) != 0) != esc {
			t.Fatalf("escapeMask(% x) != 0 is %v", w, !esc)
		}
		if (cleanMask(x) != 0) != clean {
			t.Fatalf("cleanMask(% x) != 0 is %v", w, !clean)
		}
		if got, want := escapeCleanMask(x), escapeMask(x)|cleanMask(x); bits.TrailingZeros64(got) != bits.TrailingZeros64(want) {
			t.Fatalf("escapeCleanMask(% x) points at octet %d, want %d", w, bits.TrailingZeros64(got)/8, bits.TrailingZeros64(want)/8)
		}
	}
}

// TestCleanTextLong: cleanText and escapeText on long texts (the 8-octet
// paths) give what the full normalisation and the library's escaping give.
func TestCleanTextLong(t *testing.T) {
	pieces := []string{"Sunrise at the upper terrace ", "a", ",", ";", "\\", "\t", "\n", "\r", "\r\n", "\x00",
		"\x1f", "\x7f", "é", "°", "\u00a0", "\xc2", "\xc1\xbf", "\u0085", "日", "🌅", "\xff", strings.Repeat("x", 13)}
	r := rand.New(rand.NewSource(7))
	for range 20000 {
		var s string
		for j := r.Intn(20); j > 0; j-- {
			s += pieces[r.Intn(len(pieces))]
		}
		if got, want := cleanText(s), normaliseText(s); got != want {
			t.Fatalf("cleanText(%q) = %q, want %q", s, got, want)
		}
		if got, want := string(escapeText(nil, s)), ics.ToText(s); got != want {
			t.Fatalf("escapeText(%q) = %q, want %q", s, got, want)
		}
	}
}
