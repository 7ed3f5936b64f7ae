package main

import (
	"bytes"
	"context"
	"errors"
	"strings"
	"sync/atomic"
	"testing"
	"time"

	"heliocal/feed/serve"
)

// adhocFeedBytes is adhocFeed with the feed appended to dst and returned
// whole.
func adhocFeedBytes(l layout, refresh time.Duration) func(context.Context, serve.AdhocQuery, []byte) ([]byte, error) {
	build := adhocFeed(l, refresh)
	return func(ctx context.Context, q serve.AdhocQuery, dst []byte) ([]byte, error) {
		w := bytes.NewBuffer(dst)
		err := build(ctx, q, w)
		return w.Bytes(), err
	}
}

// countingContext is cancelled from its limit-th Err() call on, and counts
// the calls: the per-date loops ask Err() as they go, so the count says how
// far the computation went after the cancellation.
type countingContext struct {
	context.Context
	limit int32
	calls atomic.Int32
}

func (c *countingContext) Err() error {
	if c.calls.Add(1) >= c.limit {
		return context.Canceled
	}
	return nil
}

// The ad-hoc feed of a cancelled request stops at the first check of its
// context after the cancellation: the request's context reaches the
// per-date loops of the computation.
func TestAdhocFeedStopsWithItsContext(t *testing.T) {
	q := serve.AdhocQuery{Latitude: 23.1, Longitude: -82.4, Location: mustZone(t, "America/Havana"),
		Kinds: []string{"moonrise", "sunrise", "dark-window"}, Start: time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC), Days: 400}
	build := adhocFeedBytes(newLayout(""), 24*time.Hour)
	// How many checks a whole build makes.
	whole := &countingContext{Context: context.Background(), limit: 1 << 30}
	if _, err := build(whole, q, nil); err != nil {
		t.Fatal(err)
	}
	checks := whole.calls.Load()
	t.Logf("a 400-day build of 3 kinds checks its context %d times (the per-date loops check every 64 dates)", checks)
	if checks < 4 {
		t.Fatalf("a 400-day build checks its context %d times", checks)
	}
	for _, limit := range []int32{1, 2, checks / 2, checks - 1} {
		ctx := &countingContext{Context: context.Background(), limit: limit}
		_, err := build(ctx, q, nil)
		if !errors.Is(err, context.Canceled) {
			t.Errorf("cancelled at check %d of %d: error %v, want context.Canceled", limit, checks, err)
		}
		if got := ctx.calls.Load(); got != limit {
			t.Errorf("cancelled at check %d of %d: went on to check %d", limit, checks, got)
		}
	}
}

func mustZone(t *testing.T, name string) *time.Location {
	t.Helper()
	loc, err := time.LoadLocation(name)
	if err != nil {
		t.Fatal(err)
	}
	return loc
}

// An ad-hoc feed reaches both ends of the supported range (1800-01-01 to
// 2200-12-31), as `events` does: the server's default window limits are that
// range, and a feed at either end builds with events on its first and last
// dates.
func TestAdhocFeedAtTheEndsOfTheRange(t *testing.T) {
	build := adhocFeedBytes(newLayout(""), 24*time.Hour)
	for _, start := range []time.Time{
		time.Date(serve.DefaultAdhocMinYear, 1, 1, 0, 0, 0, 0, time.UTC),
		time.Date(serve.DefaultAdhocMaxYear, 12, 1, 0, 0, 0, 0, time.UTC),
	} {
		q := serve.AdhocQuery{Latitude: -33.45, Longitude: -70.67, Location: mustZone(t, "America/Santiago"),
			Kinds: []string{"sunrise", "moonrise", "full-moon", "december-solstice"}, Start: start, Days: 31}
		b, err := build(context.Background(), q, nil)
		if err != nil {
			t.Fatalf("%s: %v", start.Format(time.DateOnly), err)
		}
		first, last := start.Format("20060102"), start.AddDate(0, 0, 30).Format("20060102")
		for _, day := range []string{first, last} {
			if !strings.Contains(string(b), "DTSTART;TZID=America/Santiago:"+day+"T") {
				t.Errorf("%s: no sunrise on %s", start.Format(time.DateOnly), day)
			}
		}
	}
}
