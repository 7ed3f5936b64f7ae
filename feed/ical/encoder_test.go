package ical

import (
	"bytes"
	"errors"
	"fmt"
	"math/rand"
	"testing"

	"heliocal/feed"
)

// TestEncoderReuse: one Encoder appending calendars of different zones,
// sizes and texts one after another into one reused buffer (with a failing
// calendar in between) writes each with the bytes Marshal writes for it
// alone, and leaves the buffer's earlier bytes as they were.
func TestEncoderReuse(t *testing.T) {
	cals := encoderCalendars(t, 7, 30)
	enc := NewEncoder(Options{Version: "test"})
	var buf []byte
	for i, c := range cals {
		want, werr := Marshal(c, Options{Version: "test"})
		prefix := []byte("keep:")
		got, err := enc.Append(append(buf[:0], prefix...), c)
		if (err != nil) != (werr != nil) {
			t.Fatalf("calendar %d: error %v, Marshal's %v", i, err, werr)
		}
		if err != nil {
			if string(got) != string(prefix) {
				t.Fatalf("calendar %d: failed Append changed the buffer to %q", i, got)
			}
			continue
		}
		if !bytes.HasPrefix(got, prefix) || !bytes.Equal(got[len(prefix):], want) {
			t.Fatalf("calendar %d: Append wrote %d bytes differing from Marshal's %d", i, len(got)-len(prefix), len(want))
		}
		buf = got
	}
}

// TestEncoderAppendSizes: AppendSizes writes Append's bytes and gives each
// entry the bytes of its VEVENT, from its BEGIN:VEVENT line to its
// END:VEVENT line (its VALARM within), as the file read back splits them;
// after a failing calendar the sizes are as they were.
func TestEncoderAppendSizes(t *testing.T) {
	const begin, end = "BEGIN:VEVENT\r\n", "END:VEVENT\r\n"
	enc := NewEncoder(Options{Version: "test"})
	var buf []byte
	sizes := []int{-1}
	for i, c := range encoderCalendars(t, 5, 30) {
		want, werr := Marshal(c, Options{Version: "test"})
		got, gotSizes, err := enc.AppendSizes(buf[:0], c, sizes[:1])
		if (err != nil) != (werr != nil) {
			t.Fatalf("calendar %d: error %v, Marshal's %v", i, err, werr)
		}
		if err != nil {
			if len(gotSizes) != 1 || gotSizes[0] != -1 {
				t.Fatalf("calendar %d: failed AppendSizes gave sizes %v, want [-1]", i, gotSizes)
			}
			continue
		}
		if !bytes.Equal(got, want) {
			t.Fatalf("calendar %d: AppendSizes wrote %d bytes differing from Marshal's %d", i, len(got), len(want))
		}
		var split []int
		for rest := want; ; {
			at := bytes.Index(rest, []byte(begin))
			if at < 0 {
				break
			}
			n := bytes.Index(rest[at:], []byte(end)) + len(end)
			split = append(split, n)
			rest = rest[at+n:]
		}
		if len(split) != len(c.Entries) || gotSizes[0] != -1 || fmt.Sprint(gotSizes[1:]) != fmt.Sprint(split) {
			t.Fatalf("calendar %d of %d entries: sizes %v, the file's VEVENTs %v", i, len(c.Entries), gotSizes[1:], split)
		}
		buf, sizes = got, gotSizes
	}
}

// encoderCalendars are calendars for one Encoder to write one after
// another: site-years in three zones, then n random calendars from seed.
func encoderCalendars(t *testing.T, seed int64, n int) []*feed.Calendar {
	r := rand.New(rand.NewSource(seed))
	cals := []*feed.Calendar{siteYear(t, "Europe/Vienna"), siteYear(t, "UTC"), siteYear(t, "Australia/Lord_Howe")}
	for range n {
		cals = append(cals, randomCalendar(t, r))
	}
	return cals
}

// TestEncoderWriteTo: one Encoder writing calendars one after another to
// writers writes each with the bytes Marshal writes for it alone, in
// pieces of at most streamPiece bytes and an event or a line more, and
// counts them; a failing writer stops the file with its error.
func TestEncoderWriteTo(t *testing.T) {
	cals := encoderCalendars(t, 11, 20)
	enc := NewEncoder(Options{Version: "test"})
	for i, c := range cals {
		want, werr := Marshal(c, Options{Version: "test"})
		w := &pieces{}
		n, err := enc.WriteTo(w, c)
		if (err != nil) != (werr != nil) {
			t.Fatalf("calendar %d: error %v, Marshal's %v", i, err, werr)
		}
		if err != nil {
			continue
		}
		if got := bytes.Join(w.p, nil); !bytes.Equal(got, want) || n != int64(len(want)) {
			t.Fatalf("calendar %d: WriteTo wrote %d bytes (said %d) differing from Marshal's %d", i, len(got), n, len(want))
		}
		for _, p := range w.p {
			if len(p) > streamPiece+4096 {
				t.Errorf("calendar %d: a piece of %d bytes, over %d and an event", i, len(p), streamPiece)
			}
		}
		if len(want) > 3*streamPiece && len(w.p) < 3 {
			t.Errorf("calendar %d: %d bytes written in %d pieces", i, len(want), len(w.p))
		}
	}
	broken := errors.New("disk full")
	if _, err := enc.WriteTo(&pieces{fail: broken}, cals[0]); !errors.Is(err, broken) {
		t.Errorf("failing writer: error %v, want %v", err, broken)
	}
}

// pieces is a writer that keeps a copy of each piece written to it, or
// fails with fail.
type pieces struct {
	p    [][]byte
	fail error
}

func (w *pieces) Write(b []byte) (int, error) {
	if w.fail != nil {
		return 0, w.fail
	}
	w.p = append(w.p, bytes.Clone(b))
	return len(b), nil
}

// BenchmarkEncoderAppend is BenchmarkMarshal with one Encoder and one
// output buffer reused from feed to feed, as publish encodes.
func BenchmarkEncoderAppend(b *testing.B) {
	c := siteYear(b, "Europe/Vienna")
	enc := NewEncoder(Options{Version: "bench"})
	b.ReportAllocs()
	var buf []byte
	for b.Loop() {
		var err error
		if buf, err = enc.Append(buf[:0], c); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*len(c.Entries)), "ns/event")
}

// TestUIDSet: the duplicate check's set against a map, over calendars of
// different sizes one after another (sized too small, so that it grows),
// with repeats among the UIDs.
func TestUIDSet(t *testing.T) {
	var u uidSet
	r := rand.New(rand.NewSource(3))
	for _, n := range []int{0, 1, 5, 40, 2400, 7, 3000} {
		u.reset(n / 3)
		want := map[string]bool{}
		for range n {
			uid := fmt.Sprintf("%x@heliocal", r.Intn(2*n+1))
			if got := u.add(uid); got != !want[uid] {
				t.Fatalf("n=%d: add(%q) = %v after %d UIDs", n, uid, got, len(want))
			}
			want[uid] = true
		}
	}
}
