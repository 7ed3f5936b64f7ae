package publish

import (
	"context"
	"errors"
	"regexp"
	"strings"
	"testing"
	"time"

	"heliocal/config"
	"heliocal/feed"
	"heliocal/feed/ical"
)

// typicalFeed is a single site's everyday feed: sunrise, sunset, a reminder
// before sunrise, a daily summary and the seasons, 400 days.
func typicalFeed(t *testing.T, lat, lon float64, zone string) (*config.Config, *config.Feed) {
	t.Helper()
	var z config.Zone
	if err := z.UnmarshalText([]byte(zone)); err != nil {
		t.Fatal(err)
	}
	kind := func(name string) config.KindSpec {
		k, err := config.ParseKind(name)
		if err != nil {
			t.Fatal(err)
		}
		return config.KindSpec{Kind: k}
	}
	reminder := kind("sunrise")
	reminder.Offset, reminder.Label = config.Duration(-30*time.Minute), "Open the polytunnel vents"
	cfg := &config.Config{
		Sites: []config.Site{{ID: "plot", Name: "Brookfield Allotments", Latitude: lat, Longitude: lon, Elevation: 70, TimeZone: z}},
		Feeds: []config.Feed{{ID: "plot-sun", Title: "Brookfield — sun", Site: "plot", DaysBack: 35, DaysAhead: 365,
			Kinds: []config.KindSpec{kind("sunrise"), kind("sunset"), reminder, kind("daily-summary"), kind("seasons")}}},
	}
	return cfg, &cfg.Feeds[0]
}

// encodeFeed builds and encodes one feed with opts' encoder.
func encodeFeed(t *testing.T, cfg *config.Config, f *config.Feed, opts *RenderOptions) (*feed.Calendar, []byte, error) {
	t.Helper()
	cat, err := feed.NewCatalogue(cfg, feed.Options{Now: time.Date(2027, 3, 1, 0, 0, 0, 0, time.UTC), Refresh: 24 * time.Hour})
	if err != nil {
		t.Fatal(err)
	}
	cal, err := cat.Calendar(context.Background(), f)
	if err != nil {
		t.Fatal(err)
	}
	data, err := opts.encoder()(nil, cal)
	return cal, data, err
}

// Feeds that fit: a typical single site's feed (1,600 entries over 400
// days) stays under the 1,000,000 bytes some web calendars accept (common
// practice: Google Calendar is reported to drop larger subscriptions), with
// the caution once in the calendar's description and not on each sunrise;
// and every feed of the demo with its configured window stays under the
// 0.7 MB docs/feeds.md states.
func TestTypicalFeedsFit(t *testing.T) {
	for _, s := range []struct {
		lat, lon float64
		zone     string
	}{{51.75, -1.26, "Europe/London"}, {-33.45, -70.67, "America/Santiago"}, {23.13, -82.38, "America/Havana"}} {
		cfg, f := typicalFeed(t, s.lat, s.lon, s.zone)
		cal, data, err := encodeFeed(t, cfg, f, &RenderOptions{})
		if err != nil {
			t.Fatal(err)
		}
		t.Logf("%s: %d entries, %d bytes", s.zone, len(cal.Entries), len(data))
		if len(data) >= 1000000 || len(cal.Entries) < 1500 {
			t.Errorf("%s: %d entries in %d bytes, want ≥ 1500 entries under 1,000,000 bytes", s.zone, len(cal.Entries), len(data))
		}
		if n := strings.Count(string(data), "local rules"); n != 2 { // DESCRIPTION and X-WR-CALDESC
			t.Errorf("%s: the caution appears %d times, want once in each calendar description property", s.zone, n)
		}
	}
	cfg := config.Demo()
	for i := range cfg.Feeds {
		_, data, err := encodeFeed(t, cfg, &cfg.Feeds[i], &RenderOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if len(data) >= 700000 { // docs/feeds.md: every demo feed under 0.7 MB
			t.Errorf("demo feed %s: %d bytes, want under 700,000", cfg.Feeds[i].ID, len(data))
		}
	}
}

// service.oversize: fail stops with the feed and its size; trim shortens
// the window from the far end, whole dates, until the feed fits, and says
// how far it reaches; warn (the default) leaves the feed whole.
func TestOversize(t *testing.T) {
	cfg, f := typicalFeed(t, 51.75, -1.26, "Europe/London")
	_, whole, err := encodeFeed(t, cfg, f, &RenderOptions{MaxFeedBytes: 400000})
	if err != nil || len(whole) <= 400000 {
		t.Fatalf("warn: %d bytes, %v", len(whole), err)
	}
	_, _, err = encodeFeed(t, cfg, f, &RenderOptions{MaxFeedBytes: 400000, Oversize: OversizeFail})
	var oe *OversizeError
	if !errors.As(err, &oe) || oe.Feed != "plot-sun" || oe.Bytes != len(whole) || !strings.Contains(err.Error(), "(400 kB)") {
		t.Fatalf("fail: %v", err)
	}
	cal, data, err := encodeFeed(t, cfg, f, &RenderOptions{MaxFeedBytes: 400000, Oversize: OversizeTrim})
	if err != nil {
		t.Fatal(err)
	}
	last := cal.Entries[len(cal.Entries)-1].Date
	if len(data) > 400000 || len(data) < 360000 || !last.Equal(cal.TrimmedTo) || !last.Before(time.Date(2028, 1, 1, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("trim: %d bytes, last date %s, trimmed to %s", len(data), last.Format(time.DateOnly), cal.TrimmedTo.Format(time.DateOnly))
	}
	// the limit written as the notes and warnings write it ("400 kB"), not
	// as a count of bytes nor with a decimal it does not need ("400.0 kB")
	if want := "Shortened to stay under 400 kB: this calendar reaches to " + last.Format(time.DateOnly) + "."; !strings.Contains(cal.Description, want) {
		t.Errorf("trim: description %q lacks %q", cal.Description, want)
	}
	// publish's note writes the limit and the size as the warning writes
	// them: one unit, no needless decimal
	note := TrimNote(Trimmed{Feed: FeedInfo{File: "plot-sun.ics", Bytes: len(data), Events: len(cal.Entries)}, To: cal.TrimmedTo}, 400000)
	if want := regexp.MustCompile(`^plot-sun\.ics shortened to ` + last.Format(time.DateOnly) + ` to stay under 400 kB \(now 3\d\d(\.\d)? kB, \d+ events\)$`); !want.MatchString(note) {
		t.Errorf("trim: note %q, want %s", note, want)
	}
	if cal.Entries[0].Date.After(time.Date(2027, 1, 25, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("trim: the near end moved to %s", cal.Entries[0].Date.Format(time.DateOnly))
	}
	// a limit the calendar is over with no entry left: trim cannot help, and
	// the refusal does not advise setting the trim already set
	_, _, err = encodeFeed(t, cfg, f, &RenderOptions{MaxFeedBytes: 1000, Oversize: OversizeTrim})
	if !errors.As(err, &oe) || !oe.Trimmed || oe.Feed != "plot-sun" || oe.Bytes <= 1000 {
		t.Fatalf("trim to nothing: %v", err)
	}
	for _, msg := range []string{err.Error(), OversizeRefusal(oe)} {
		if !strings.Contains(msg, "with no entry left, over service.max_feed_bytes (1 kB)") || !strings.Contains(msg, "raise service.max_feed_bytes") || strings.Contains(msg, "set service.oversize") || strings.Contains(msg, "oversize: fail") {
			t.Errorf("trim to nothing: %q", msg)
		}
	}
}

// Under service.oversize: trim a feed that fits only shortened to a date
// before today at its site (a long days_back, a small limit) is refused
// whole, as one with no entry left is: a subscribed calendar of past days
// alone would be silently useless. One that fits shortened to today is
// published, reaching today.
func TestTrimBeforeToday(t *testing.T) {
	cfg, f := typicalFeed(t, 51.75, -1.26, "Europe/London")
	f.DaysBack = 400
	today := time.Date(2027, 3, 1, 0, 0, 0, 0, time.UTC) // encodeFeed's Now, in London
	whole, data, err := encodeFeed(t, cfg, f, &RenderOptions{MaxFeedBytes: 400000})
	if err != nil || !whole.Today.Equal(today) {
		t.Fatalf("warn: today %s, %v", whole.Today.Format(time.DateOnly), err)
	}
	// the size of the feed shortened to today, as trim writes it
	n := 0
	for n < len(whole.Entries) && !whole.Entries[n].Date.After(today) {
		n++
	}
	if n == len(whole.Entries) || n == 0 {
		t.Fatalf("%d of %d entries up to %s: the test needs entries on both sides of today", n, len(whole.Entries), today.Format(time.DateOnly))
	}
	toToday := *whole
	toToday.Entries = whole.Entries[:n]
	toToday.TrimmedTo = today
	toToday.WindowEnd = time.Date(2027, 3, 2, 0, 0, 0, 0, time.UTC) // midnight at the end of 1 March in London (GMT)
	var limit int
	for {
		toToday.Description = whole.Description + "\n\nShortened to stay under " + FormatLimit(limit) + ": this calendar reaches to 2027-03-01."
		b, err := ical.NewEncoder(ical.Options{}).Append(nil, &toToday)
		if err != nil {
			t.Fatal(err)
		}
		if len(b) == limit {
			break
		}
		limit = len(b) // once more with this limit written in the note
	}
	if limit >= len(data) {
		t.Fatalf("the feed shortened to today (%d bytes) is not smaller than the whole (%d)", limit, len(data))
	}

	cal, trimmed, err := encodeFeed(t, cfg, f, &RenderOptions{MaxFeedBytes: limit, Oversize: OversizeTrim})
	if err != nil || !cal.TrimmedTo.Equal(today) || len(trimmed) != limit || len(cal.Entries) != n {
		t.Errorf("a limit of %d bytes: trimmed to %s, %d bytes, %d entries, %v; want %s, %d entries", limit, cal.TrimmedTo.Format(time.DateOnly), len(trimmed), len(cal.Entries), err, today.Format(time.DateOnly), n)
	}

	cal, trimmed, err = encodeFeed(t, cfg, f, &RenderOptions{MaxFeedBytes: limit - 1, Oversize: OversizeTrim})
	var oe *OversizeError
	if !errors.As(err, &oe) || !oe.Trimmed || oe.Feed != "plot-sun" || oe.Bytes != len(data) || oe.Limit != limit-1 ||
		!oe.TrimmedTo.Before(today) || !oe.Today.Equal(today) || len(trimmed) != 0 {
		t.Fatalf("a limit of %d bytes: %d bytes, %v; want an *OversizeError before %s", limit-1, len(trimmed), err, today.Format(time.DateOnly))
	}
	// the calendar is left whole, as the refusal gives its size
	if len(cal.Entries) != len(whole.Entries) || cal.Description != whole.Description || !cal.WindowEnd.Equal(whole.WindowEnd) || !cal.TrimmedTo.IsZero() {
		t.Errorf("refused: %d entries, window end %s, trimmed to %s, description %q; want the whole calendar's %d entries",
			len(cal.Entries), cal.WindowEnd, cal.TrimmedTo, cal.Description, len(whole.Entries))
	}
	to := oe.TrimmedTo.Format(time.DateOnly)
	for _, msg := range []string{err.Error(), OversizeRefusal(oe)} {
		if !strings.Contains(msg, "trim would shorten it to "+to+", before today at its site (2027-03-01)") || !strings.Contains(msg, "lower days_back or raise service.max_feed_bytes") ||
			strings.Contains(msg, "no entry left") || strings.Contains(msg, "set service.oversize") {
			t.Errorf("refused: %q", msg)
		}
	}
	if msg := OversizeRefusal(oe); !strings.HasPrefix(msg, `feed "plot-sun" is `) || !strings.Contains(msg, "publish and serve refuse it") {
		t.Errorf("refused: %q", msg)
	}

	// a calendar built over dates given outright has no today: trim
	// shortens it as far as it must
	cal, _, err = encodeFeed(t, cfg, f, &RenderOptions{MaxFeedBytes: 400000})
	if err != nil {
		t.Fatal(err)
	}
	cal.Today = time.Time{}
	if _, err := Encode(cal, &RenderOptions{MaxFeedBytes: limit - 1, Oversize: OversizeTrim}); err != nil || !cal.TrimmedTo.Before(today) {
		t.Errorf("no today: trimmed to %s, %v", cal.TrimmedTo.Format(time.DateOnly), err)
	}
}

// A size and the limit it is over are written with the decimals that tell
// them apart: never "1.0 MB" over "1.0 MB"; the size in the unit and with
// the decimal FormatBytes writes it in where that is enough ("974.6 kB"
// under "1 MB", as check's table writes the same feed, not "0.97 MB"), the
// limit in its own unit with no decimal it does not need.
func TestFormatBytesOver(t *testing.T) {
	for _, c := range []struct {
		n, limit       int64
		size, limitStr string
	}{
		{1_029_056, 1_000_000, "1.03 MB", "1 MB"},
		{2_500_000, 1_000_000, "2.5 MB", "1 MB"},
		{2_000_000, 1_000_000, "2.0 MB", "1 MB"},
		{1_004_000, 1_000_000, "1.004 MB", "1 MB"},
		{1_000_400, 1_000_000, "1,000,400 B", "1,000,000 B"},
		{974_600, 1_000_000, "974.6 kB", "1 MB"},
		{999_960, 1_000_000, "999,960 B", "1,000,000 B"},
		{24_300, 20_000, "24.3 kB", "20 kB"},
		{19_000, 20_000, "19.0 kB", "20 kB"},
		{1_500_000, 1_250_000, "1.5 MB", "1.25 MB"},
		{1_300_000, 1_234_567, "1.3 MB", "1.235 MB"},
		{900, 500, "900 B", "500 B"},
		{1_200, 500, "1.2 kB", "500 B"},
	} {
		size, limit := FormatBytesOver(c.n, c.limit)
		if size != c.size || limit != c.limitStr {
			t.Errorf("FormatBytesOver(%d, %d) = %q, %q; want %q, %q", c.n, c.limit, size, limit, c.size, c.limitStr)
		}
		if c.size != FormatBytes(c.n) && !strings.HasSuffix(c.size, " B") && len(c.size) <= len(FormatBytes(c.n)) {
			t.Errorf("FormatBytesOver(%d, %d) = %q: neither FormatBytes's %q nor more decimals of it", c.n, c.limit, c.size, FormatBytes(c.n))
		}
	}
}

// Every size is written in the unit that keeps it under 1000 with one
// decimal: "999.9 kB", then "1.0 MB", never "1000.0 kB".
func TestFormatBytes(t *testing.T) {
	for n, want := range map[int64]string{
		0: "0 B", 999: "999 B", 1000: "1.0 kB", 974_600: "974.6 kB", 999_949: "999.9 kB", 999_950: "1.0 MB",
		4_200_000: "4.2 MB", 999_949_999: "999.9 MB", 999_950_000: "1.0 GB",
	} {
		if got := FormatBytes(n); got != want {
			t.Errorf("FormatBytes(%d) = %q, want %q", n, got, want)
		}
	}
}
