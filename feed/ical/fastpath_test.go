package ical

import (
	"math/rand"
	"testing"
	"time"
)

// TestOffsetAtMatchesZone: the cached offset period gives, for every quarter
// hour of two years walked forwards and for instants in random order, the
// offset of Go's time zone database and the answer of isAmbiguous, including
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
		if want := isAmbiguous(at, w.loc); amb != want {
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
