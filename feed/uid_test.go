package feed

import (
	"context"
	"crypto/sha256"
	"encoding/binary"
	"encoding/hex"
	"strconv"
	"strings"
	"testing"
	"time"

	"heliocal/config"
)

// wantUID is an event entry's UID as the catalogue promises to derive it:
// the first 12 bytes of the SHA-256 of "<feed>|<kind>|<offset>|<local
// date>|<part>|<direction>|<n>" in hex, n counting the entries with the same
// key before it, and "@heliocal". Calendar clients update an entry in place
// only while its UID stays the same, so the derivation never changes.
func wantUID(feed, kind, offset string, date time.Time, part, dir string, n int) string {
	key := feed + "|" + kind + "|" + offset + "|" + date.Format(time.DateOnly) + "|" + part + "|" + dir + "|" + strconv.Itoa(n)
	sum := sha256.Sum256([]byte(key))
	return hex.EncodeToString(sum[:12]) + "@heliocal"
}

// TestEventUIDs: every event entry has the UID of its key, however the
// writer counts repeats: a kind listed once (counted date by date), the same
// kind and offset given twice (the configuration refuses it, the API does
// not: the second gets n = 1), an offset, a lamp period, and the dates at
// 78° N with two sunsets or two golden hours of one part (n = 1 for the
// second).
func TestEventUIDs(t *testing.T) {
	s := site(t, "polar", 78.2, 15.6, "Arctic/Longyearbyen")
	first, last := date("2027-01-01"), date("2027-12-31")
	sk := sky(t, "2027-01-01", "2027-12-31")
	var specs []config.KindSpec
	for _, n := range []string{"sunrise", "sunset", "golden-hour", "civil-dusk", "lighting:16h", "sunrise"} {
		k, err := config.ParseKind(n)
		if err != nil {
			t.Fatal(err)
		}
		specs = append(specs, config.KindSpec{Kind: k})
	}
	specs = append(specs, config.KindSpec{Kind: specs[0].Kind, Offset: config.Duration(-30 * time.Minute)})
	es, err := sk.Entries(context.Background(), s, "f", specs, first, last)
	if err != nil {
		t.Fatal(err)
	}
	type key struct {
		kind, offset, part, dir string
		date                    time.Time
	}
	seen := map[key]int{}
	// the entries in the order written: by kinds entry, date after date
	// (the second sunrise entry of a date counted after the first's)
	var repeats, doubled, offsets int
	for _, e := range es {
		if e.Facts.Note {
			continue
		}
		offset := "0s"
		if strings.HasPrefix(e.Title, "30 min before") {
			offset = "-30m0s"
			offsets++
		}
		k := key{e.Kind, offset, e.Facts.Part, dirString(e.Facts.Direction), e.Date}
		seen[k]++
		if seen[k] == 2 {
			repeats++
		}
		if e.Kind == "sunrise" && offset == "0s" && seen[k] == 2 {
			doubled++
		}
	}
	if repeats == 0 || doubled == 0 || offsets == 0 {
		t.Fatalf("repeats %d, doubled kinds %d, offsets %d: the test does not reach every case", repeats, doubled, offsets)
	}
	// every key's UIDs are those of n = 0 .. count-1, each once
	uids := map[string]bool{}
	for _, e := range es {
		if !e.Facts.Note {
			uids[e.UID] = true
		}
	}
	for k, c := range seen {
		for n := range c {
			if u := wantUID("f", k.kind, k.offset, k.date, k.part, k.dir, n); !uids[u] {
				t.Errorf("%v: no entry has UID %s (n = %d of %d)", k, u, n, c)
			}
		}
	}
}

// TestBlockDigest: the UIDs' digest of a padded key is sha256.Sum256 of
// the key (FIPS 180-4's SHA-256) for every key length, those of one block
// and of two and the longer ones it hands back, one digest reused from
// key to key; and with it a UID is the first 12 bytes of that in hex.
func TestBlockDigest(t *testing.T) {
	d := newBlockDigest()
	var w entryWriter
	for n := range 200 {
		key := make([]byte, n)
		for i := range key {
			key[i] = byte('a' + (n*7+i)%26)
		}
		want := sha256.Sum256(key)
		var got [sha256.Size]byte
		if ok := d.sum(&got, key); ok != (n <= 119) || ok && got != want {
			t.Fatalf("key of %d octets: sum %x (%v), want %x", n, got, ok, want)
		}
		if uid := string(w.appendHash(nil, key)); uid != hex.EncodeToString(want[:12])+"@heliocal" {
			t.Fatalf("key of %d octets: UID %s, want the first 12 bytes of %x", n, uid, want)
		}
	}
	// FIPS 180-4's example "abc" (NIST, SHA-256 example with intermediate
	// values: ba7816bf…f20015ad)
	var got [sha256.Size]byte
	if !d.sum(&got, []byte("abc")) || hex.EncodeToString(got[:]) != "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad" {
		t.Fatalf(`sum("abc") = %x`, got)
	}
}

// TestHexDigits: the UIDs' 4-octets-at-a-time hex is encoding/hex's
// (RFC 4648 §8, base 16, in lower case) for every nibble in every place.
func TestHexDigits(t *testing.T) {
	for _, v := range []uint32{0, 0xffffffff, 0x01234567, 0x89abcdef, 0xfedcba98, 0x76543210, 0x9a9a0f0f, 0xa0b1c2d3} {
		var got [8]byte
		binary.BigEndian.PutUint64(got[:], hexDigits(v))
		var src [4]byte
		binary.BigEndian.PutUint32(src[:], v)
		if want := hex.EncodeToString(src[:]); string(got[:]) != want {
			t.Errorf("hexDigits(%#x) = %q, want %q", v, got, want)
		}
	}
}

// BenchmarkUIDHash: a UID of a typical key of the fleet benchmark's feeds.
func BenchmarkUIDHash(b *testing.B) {
	var w entryWriter
	key := []byte("site-0003-daily|golden-hour||2026-11-03|morning||0")
	var dst []byte
	for b.Loop() {
		dst = w.appendHash(dst[:0], key)
	}
}

// TestKeyDates: the UIDs' keys name a date as appendDate (time.DateOnly)
// does, from the window's table or without it, for dates in the window,
// outside it, before 1970 and of years that are not four digits.
func TestKeyDates(t *testing.T) {
	first := time.Date(1969, 12, 20, 0, 0, 0, 0, time.UTC)
	w := entryWriter{dates: make([]dateText, 40), firstDay: first.Unix() / secondsPerDay}
	var dates []time.Time
	for i := -3; i < 45; i++ {
		dates = append(dates, first.AddDate(0, 0, i))
	}
	dates = append(dates, first.Add(time.Hour), time.Date(-1, 6, 1, 0, 0, 0, 0, time.UTC), time.Date(10000, 1, 2, 0, 0, 0, 0, time.UTC))
	for range 2 { // the second time from the filled table
		for _, d := range dates {
			if got, want := string(w.appendKeyDate([]byte("k|"), d)), "k|"+d.Format(time.DateOnly); got != want {
				t.Fatalf("%v: %q, want %q", d, got, want)
			}
		}
	}
	// a year of five digits in the table's place
	w = entryWriter{dates: make([]dateText, 3), firstDay: time.Date(10000, 1, 1, 0, 0, 0, 0, time.UTC).Unix() / secondsPerDay}
	for range 2 {
		d := time.Date(10000, 1, 2, 0, 0, 0, 0, time.UTC)
		if got, want := string(w.appendKeyDate(nil, d)), d.Format(time.DateOnly); got != want {
			t.Fatalf("%v: %q, want %q", d, got, want)
		}
	}
}
