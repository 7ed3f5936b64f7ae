package ical

import (
	"bytes"
	"fmt"
	"math/rand"
	"testing"

	ics "github.com/arran4/golang-ical"
)

// TestDescLineMemo: a DESCRIPTION line written from the memo of its title's
// last one (descLine) has the bytes cleanTextLine writes for the text: texts
// of escaped octets, spaces, non-ASCII runes, long runs without a space
// (folded inside a word) and digits, each followed by others that differ
// from it in digits only (written from the memo), in other octets, or in
// length, for several titles at once and line lengths down to 8 octets.
func TestDescLineMemo(t *testing.T) {
	pieces := []string{"a", "Z", " ", ",", ";", "\\", "\n", "\t", "é", "°", "−", "日", "🌅", "<", ">", "x>y",
		"0", "7", "42", "06:42:40", "Sunrise at 06:42:40 CET", "from 18:14:42 MST", "abcdefghijklmnopqrstuvwxyz",
		"\r", "\x00"}
	titles := []string{"Sunrise", "Civil dawn", "Golden hour (morning)", "Dark sky, 9 h"}
	r := rand.New(rand.NewSource(11))
	for _, cfg := range []*ics.SerializationConfiguration{{MaxLength: 75, NewLine: "\r\n"}, {MaxLength: 20, NewLine: "\n"}, {MaxLength: 8, NewLine: "\r\n"}} {
		w, ref := &writer{cfg: cfg}, &writer{cfg: cfg}
		last := map[string]string{}
		for i := range 40000 {
			title := titles[r.Intn(len(titles))]
			desc := last[title]
			switch k := r.Intn(10); {
			case desc == "" || k == 0: // a new text
				desc = ""
				for j := r.Intn(30); j > 0; j-- {
					desc += pieces[r.Intn(len(pieces))]
				}
			case k == 1: // one octet changed to a letter
				b := []byte(desc)
				b[r.Intn(len(b))] = 'q'
				desc = string(b)
			default: // digits changed to digits
				b := []byte(desc)
				for j := range b {
					if isDigit(b[j]) && r.Intn(3) == 0 {
						b[j] = byte('0' + r.Intn(10))
					}
				}
				desc = string(b)
			}
			last[title] = desc
			got := w.descLine([]byte("x"), title, desc)
			want, clean := ref.cleanTextLine([]byte("x"), descPrefix, desc, nil)
			if !bytes.Equal(got, want) {
				t.Fatalf("MaxLength %d, text %d %q: descLine wrote %q, want %q", cfg.MaxLength, i, desc, got, want)
			}
			var m *descMemo
			for j := range w.descs {
				if d := &w.descs[j]; d.set && string(d.title) == title {
					m = d
				}
			}
			if clean && (m == nil || string(m.desc) != desc) {
				t.Fatalf("MaxLength %d, text %d %q: not kept as the memo of %q", cfg.MaxLength, i, desc, title)
			}
		}
	}
}

// TestDescLineFromMemo: a text that differs from the title's last one in
// digits only is written from the memo (marked here to tell), one that
// differs in another octet is written afresh.
func TestDescLineFromMemo(t *testing.T) {
	w := &writer{cfg: &ics.SerializationConfiguration{MaxLength: 75, NewLine: "\r\n"}}
	first := "Civil dawn at 06:11:17 CET.\nComputed for planning; local rules decide legal times such as hunting hours, lighting-up times and aviation night."
	w.descLine(nil, "Civil dawn", first)
	w.descs[0].line[0] = 'd' // the memo's mark
	next := "Civil dawn at 06:13:02 CET.\nComputed for planning; local rules decide legal times such as hunting hours, lighting-up times and aviation night."
	got := string(w.descLine(nil, "Civil dawn", next))
	// RFC 5545 §3.3.11: ";" and "," escaped with a backslash, a newline
	// written "\n"; §3.1: lines of at most 75 octets, each continuation
	// line starting with a space
	want := "dESCRIPTION:Civil dawn at 06:13:02 CET.\\nComputed for planning\\; local\r\n" +
		"  rules decide legal times such as hunting hours\\, lighting-up times and\r\n  aviation night.\r\n"
	if got != want {
		t.Fatalf("digits changed: %q, want %q from the memo", got, want)
	}
	other := "Civil dusk at 06:13:02 CET.\nComputed for planning; local rules decide legal times such as hunting hours, lighting-up times and aviation night."
	if got := string(w.descLine(nil, "Civil dawn", other)); got[0] != 'D' {
		t.Fatalf("a letter changed: %q, want it written afresh", got)
	}
}

// TestDigitsNonZero: the 8-octet tests of patch agree with octet-wise ones
// for every octet value in every place of a word.
func TestDigitsNonZero(t *testing.T) {
	for c := range 256 {
		for k := range 8 {
			x := uint64(c)<<(8*k) | 0x3030303030303030&^(0xff<<(8*k)) // '0' elsewhere
			wantD, wantN := isDigit(byte(c)), c != 0
			if got := digits(x)>>(8*k+7)&1 == 1; got != wantD || digits(x)&^(0x80<<(8*k)) != 0x8080808080808080&^(0x80<<(8*k)) {
				t.Errorf("digits(%#x): %#x", x, digits(x))
			}
			y := uint64(c) << (8 * k)
			if got := nonZero(y); (got != 0) != wantN || got&^(0x80<<(8*k)) != 0 {
				t.Errorf("nonZero(%#x) = %#x", y, got)
			}
		}
	}
}

// fleetTexts are a feed's titles and descriptions as the fleet's daily
// feeds have them: six a day for a year, the clock times, lengths and
// azimuths changing from day to day.
func fleetTexts() (titles, descs []string) {
	dirs := []string{"east-south-east", "south-east", "east", "east-north-east"}
	for d := range 365 {
		m, s := d%60, (d*7)%60
		titles = append(titles, "Civil dawn", "Golden hour (morning)", "Sunrise", "Golden hour (evening)", "Sunset", "Civil dusk")
		descs = append(descs,
			fmt.Sprintf("Civil dawn at 06:%02d:%02d CET.\nComputed for planning; local rules decide legal times such as hunting hours, lighting-up times and aviation night.", m, s),
			fmt.Sprintf("Golden hour (morning) from 07:%02d:%02d CET to 08:%02d:%02d CET (1 h %02d min).\nNever look directly at the Sun.", m, s, m, s, m),
			fmt.Sprintf("Sunrise at 07:%02d:%02d CET, azimuth %d° (%s).\nDay length 8 h %02d min (−%d min %02d s from the day before).", m, s, 100+d/10, dirs[d/92], m, d%5, s),
			fmt.Sprintf("Golden hour (evening) from 15:%02d:%02d CET to 16:%02d:%02d CET (1 h %02d min).\nNever look directly at the Sun.", m, s, m, s, m),
			fmt.Sprintf("Sunset at 16:%02d:%02d CET, azimuth %d° (%s).\nDay length 8 h %02d min (−%d min %02d s from the day before).", m, s, 200+d/10, dirs[d/92], m, d%5, s),
			fmt.Sprintf("Civil dusk at 16:%02d:%02d CET.\nComputed for planning; local rules decide legal times such as hunting hours, lighting-up times and aviation night.", m, s))
	}
	return titles, descs
}

// BenchmarkDescLine writes a year of a fleet feed's DESCRIPTION lines,
// from the titles' memos ("memo") and cleaned, escaped and folded each
// ("fresh").
func BenchmarkDescLine(b *testing.B) {
	titles, descs := fleetTexts()
	cfg := &ics.SerializationConfiguration{MaxLength: 75, NewLine: "\r\n"}
	for _, memo := range []bool{true, false} {
		b.Run(map[bool]string{true: "memo", false: "fresh"}[memo], func(b *testing.B) {
			w := &writer{cfg: cfg}
			var out []byte
			for b.Loop() {
				out = out[:0]
				for i, d := range descs {
					if memo {
						out = w.descLine(out, titles[i], d)
					} else {
						out, _ = w.cleanTextLine(out, descPrefix, d, nil)
					}
				}
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*len(descs)), "ns/line")
		})
	}
}
