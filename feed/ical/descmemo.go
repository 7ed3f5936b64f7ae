package ical

import (
	"bytes"
	"encoding/binary"
	"math/bits"
	"unsafe"
)

// descPrefix is the name an event's description line starts with.
const descPrefix = "DESCRIPTION:"

// descMemo is the DESCRIPTION line last written for one title, kept so
// that the next event with that title, whose description nearly always
// differs from it only in digits ("Civil dawn at 06:11:17 CET." against
// "06:13:02"), is written by copying the line and putting the new digits
// in their places, instead of cleaning, escaping and folding the text
// again (see descLine).
//
// That is the same line: a digit is printable ASCII, escaped by nothing,
// never a place validCut prefers nor the inside of a rune, so a text that
// differs from another only in digits has its escapes and its folds at the
// same places; every octet keeps its place in the line, shifted by the
// octets inserted before it (insertion).
type descMemo struct {
	set   bool
	title []byte // the events' cleaned SUMMARY
	// at is the array of the title string last found equal to title in
	// the calendar being written (nil from the start of each): a kind's
	// entries share their title's string, which is then not compared
	at      *byte
	max     int // the serialization's MaxLength and NewLine the line is for
	newline string
	desc    []byte      // the description as given
	line    []byte      // its content line as written: folded, with the newline
	ins     []insertion // the octets the line has beyond descPrefix and desc, in order
	cuts    []int32     // scratch: where the line was folded (see descLine)
}

// insertion is n octets put in the line before the description's octet at
// (a backslash before an escaped octet, a fold's newline and space).
type insertion struct{ at, n int32 }

// descLine appends the DESCRIPTION line of desc for an event titled title,
// as cleanTextLine writes it, from the memo of the title's last description
// when the two differ only in digits.
func (w *writer) descLine(b []byte, title, desc string) []byte {
	if title == "" {
		b, _ = w.cleanTextLine(b, descPrefix, desc, nil)
		return b
	}
	max, newline := w.cfg.MaxLength, w.cfg.NewLine
	var m *descMemo
	at := unsafe.StringData(title)
	// from the memo after the last one used: a feed's kinds take their
	// turns in the same order from date to date
	for n, i := 0, w.lastDesc; n < len(w.descs); n++ {
		i = (i + 1) % len(w.descs)
		if d := &w.descs[i]; d.set && len(d.title) == len(title) && (d.at == at || string(d.title) == title) {
			m, d.at, w.lastDesc = d, at, i
			break
		}
	}
	if m != nil && m.max == max && m.newline == newline && len(m.desc) == len(desc) && m.patch(desc) {
		return append(b, m.line...)
	}
	if m == nil {
		w.lastDesc = w.nextDesc % len(w.descs)
		m = &w.descs[w.lastDesc]
		w.nextDesc++
	}
	m.set = false
	start := len(b)
	cuts := m.cuts[:0]
	b, ok := w.cleanTextLine(b, descPrefix, desc, &cuts)
	if !ok {
		return b // a text that was normalised, or empty: not kept
	}
	*m = descMemo{set: true, title: append(m.title[:0], title...), at: at, max: max, newline: newline,
		desc: append(m.desc[:0], desc...), line: append(m.line[:0], b[start:]...),
		ins: m.insertions(w.scratch, cuts, len(newline)+1), cuts: cuts}
	return b
}

// insertions returns the memo's insertions (reusing m.ins) for the line
// escaped from its description, line (with descPrefix, unfolded), folded
// before line[c] for each c of cuts (ascending) with fold octets each.
func (m *descMemo) insertions(line []byte, cuts []int32, fold int) []insertion {
	ins := m.ins[:0]
	esc := 0 // backslashes before the octet looked at
	k := len(descPrefix)
	for {
		i := bytes.IndexByte(line[k:], '\\')
		at := len(line)
		if i >= 0 {
			at = k + i
		}
		for len(cuts) > 0 && int(cuts[0]) <= at {
			ins = append(ins, insertion{int32(max(0, int(cuts[0])-len(descPrefix)-esc)), int32(fold)})
			cuts = cuts[1:]
		}
		if i < 0 {
			return ins
		}
		ins = append(ins, insertion{int32(at - len(descPrefix) - esc), 1})
		esc++
		k = at + 2 // the backslash and the octet it escapes
	}
}

// patch makes the memo that of desc, of the memo's length, and reports
// true, when desc differs from the memo's description in ASCII digits
// only; otherwise it reports false. Octets are compared 8 at a time, and
// each digit that differs is put in its place in the line at once: a memo
// left by a false report, some of its line's digits already changed, is
// dropped.
func (m *descMemo) patch(desc string) bool {
	p := placer{line: m.line, ins: m.ins, shift: len(descPrefix)}
	old, put := m.desc, false
	i := 0
	for ; i+8 <= len(desc); i += 8 {
		a, b := load64(desc, i), binary.LittleEndian.Uint64(old[i:])
		if a == b {
			continue
		}
		diff := nonZero(a ^ b)
		if diff&^(digits(a)&digits(b)) != 0 {
			m.set = !put // a line half changed is dropped
			return false
		}
		for ; diff != 0; diff &= diff - 1 {
			j := i + bits.TrailingZeros64(diff)/8
			p.put(j, desc[j])
			put = true
		}
	}
	for ; i < len(desc); i++ {
		if desc[i] == old[i] {
			continue
		}
		if !isDigit(desc[i]) || !isDigit(old[i]) {
			m.set = !put
			return false
		}
		p.put(i, desc[i])
		put = true
	}
	copy(old, desc)
	return true
}

// placer puts octets of a memo's description in their places in its line,
// in ascending order.
type placer struct {
	line  []byte
	ins   []insertion // those not yet passed
	shift int         // where the description's next octet is in the line, less its index
}

// put makes octet j of the line's description c.
func (p *placer) put(j int, c byte) {
	for len(p.ins) > 0 && int(p.ins[0].at) <= j {
		p.shift += int(p.ins[0].n)
		p.ins = p.ins[1:]
	}
	p.line[j+p.shift] = c
}

func isDigit(c byte) bool { return c-'0' < 10 }

// nonZero has the high bit of each octet of x that is not zero, and no
// other bit: (x&0x7f)+0x7f has it exactly when x&0x7f is not zero, and
// never carries into the next octet.
func nonZero(x uint64) uint64 {
	const low7 = ones * 0x7f
	return ((x&low7 + low7) | x) & highs
}

// digits has the high bit of each octet of x that is an ASCII digit, and no
// other bit (the two sums, as in nonZero, never carry).
func digits(x uint64) uint64 {
	const low7 = ones * 0x7f
	y := x & low7
	return (y + ones*(0x80-'0')) &^ (y + ones*(0x80-'9'-1)) &^ x & highs
}
