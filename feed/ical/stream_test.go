package ical

import (
	"bytes"
	"math/rand"
	"strings"
	"testing"
	"time"

	"heliocal/feed"
)

// streamed writes c through a Stream in batches of the given sizes (the
// last batch takes the rest), with the first and last batches as the head's
// entries.
func streamed(t *testing.T, c *feed.Calendar, sizes []int) ([]byte, error) {
	t.Helper()
	var batches [][]feed.Entry
	rest := c.Entries
	for _, n := range sizes {
		n = min(n, len(rest))
		batches = append(batches, rest[:n])
		rest = rest[n:]
	}
	batches = append(batches, rest)
	head := *c
	head.Entries = append(append([]feed.Entry(nil), batches[0]...), batches[len(batches)-1]...)
	var out bytes.Buffer
	s, err := NewStream(&out, &head, Options{Version: "test"})
	if err != nil {
		return nil, err
	}
	for _, b := range batches {
		if err := s.Write(b); err != nil {
			return nil, err
		}
	}
	if err := s.Close(); err != nil {
		return nil, err
	}
	return out.Bytes(), nil
}

// TestStreamMatchesMarshal: a calendar streamed in batches of any sizes
// (none, one entry, uneven) is byte for byte Marshal's file of the whole
// calendar, in zones with and without clock changes and in UTC, for the
// random calendars of the reference tests too; and what Marshal refuses, the
// stream refuses.
func TestStreamMatchesMarshal(t *testing.T) {
	r := rand.New(rand.NewSource(11))
	cals := []*feed.Calendar{siteYear(t, "Europe/Vienna"), siteYear(t, "UTC"), siteYear(t, "America/Santiago"),
		siteYear(t, "Australia/Lord_Howe")}
	empty := *cals[0]
	empty.Entries = nil
	cals = append(cals, &empty)
	for range 40 {
		cals = append(cals, randomCalendar(t, r))
	}
	for i, c := range cals {
		want, werr := Marshal(c, Options{Version: "test"})
		for _, sizes := range [][]int{nil, {0, 1}, {r.Intn(50) + 1, r.Intn(500) + 1, 0, r.Intn(900) + 1}} {
			got, err := streamed(t, c, sizes)
			if (err != nil) != (werr != nil) {
				t.Fatalf("calendar %d, batches %v: error %v, Marshal's %v", i, sizes, err, werr)
			}
			if err == nil && !bytes.Equal(got, want) {
				t.Fatalf("calendar %d, batches %v: streamed %d bytes differing from Marshal's %d", i, sizes, len(got), len(want))
			}
		}
	}
}

// A Stream refuses a timed entry its head's time zone does not cover, and
// writes nothing after an error or after Close.
func TestStreamRefuses(t *testing.T) {
	c := siteYear(t, "Europe/Vienna")
	head := *c
	head.Entries = nil
	var out bytes.Buffer
	s, err := NewStream(&out, &head, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if err := s.Write(c.Entries[:10]); err != nil {
		t.Fatal(err)
	}
	far := c.Entries[10]
	far.Start = c.WindowEnd.AddDate(0, 3, 0)
	far.End = time.Time{}
	err = s.Write([]feed.Entry{far})
	if err == nil || !strings.Contains(err.Error(), "outside the span of the time zone") {
		t.Fatalf("an entry months after the window: %v", err)
	}
	n := out.Len()
	if s.Write(c.Entries[11:12]) == nil || s.Close() == nil || out.Len() != n {
		t.Error("the stream went on after an error")
	}
	s, _ = NewStream(&out, &head, Options{})
	if s.Close() != nil || s.Write(c.Entries[:1]) == nil {
		t.Error("a closed stream took more entries")
	}
}

// TestStreamReusedCategories: a caller that writes each batch's categories
// into the same list (one array) gets each batch's own CATEGORIES line.
func TestStreamReusedCategories(t *testing.T) {
	c := siteYear(t, "Europe/Vienna")
	c.Entries = c.Entries[:2]
	cats := []string{"Sun", "Sunrise"}
	var out bytes.Buffer
	s, err := NewStream(&out, c, Options{})
	if err != nil {
		t.Fatal(err)
	}
	for i, name := range []string{"Sunrise", "Sunset"} {
		cats[1] = name
		e := c.Entries[i]
		e.Categories = cats
		if err := s.Write([]feed.Entry{e}); err != nil {
			t.Fatal(err)
		}
	}
	if err := s.Close(); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"CATEGORIES:Sun,Sunrise\r\n", "CATEGORIES:Sun,Sunset\r\n"} {
		if !strings.Contains(out.String(), want) {
			t.Errorf("no %q in the stream", want)
		}
	}
}
