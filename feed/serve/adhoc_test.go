package serve

import (
	"bytes"
	"compress/gzip"
	"context"
	"errors"
	"fmt"
	"io"
	"log/slog"
	"net/http"
	"net/http/httptest"
	"regexp"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"testing"
	"time"

	"github.com/cespare/xxhash/v2"
)

// today is the server's "now" in these tests.
var today = time.Date(2026, 12, 2, 4, 30, 0, 0, time.UTC)

func adhocServer(t *testing.T, fn AdhocFunc) *Server {
	t.Helper()
	s, _ := newTestServer(t, Options{Adhoc: fn})
	s.now = func() time.Time { return today }
	return s
}

func TestAdhocBadParameters(t *testing.T) {
	s := adhocServer(t, adhocICS)
	ok := "lat=47.5&lon=13.05&tz=Europe/Vienna&kinds=sunrise"
	for _, tc := range []struct {
		query string
		param string // the parameter the message must name
		value string // and the value, when there is one
	}{
		{"lon=13&tz=UTC&kinds=sunrise", "lat", ""},
		{"lat=&lon=13&tz=UTC&kinds=sunrise", "lat", `""`},
		{"lat=91&lon=13&tz=UTC&kinds=sunrise", "lat", `"91"`},
		{"lat=-90.0001&lon=13&tz=UTC&kinds=sunrise", "lat", `"-90.0001"`},
		{"lat=north&lon=13&tz=UTC&kinds=sunrise", "lat", `"north"`},
		{"lat=NaN&lon=13&tz=UTC&kinds=sunrise", "lat", `"NaN"`},
		{"lat=Inf&lon=13&tz=UTC&kinds=sunrise", "lat", `"Inf"`},
		{"lat=1e400&lon=13&tz=UTC&kinds=sunrise", "lat", `"1e400"`},
		{"lat=47,5&lon=13&tz=UTC&kinds=sunrise", "lat", `"47,5"`},
		{"lat=47&tz=UTC&kinds=sunrise", "lon", ""},
		{"lat=47&lon=180.5&tz=UTC&kinds=sunrise", "lon", `"180.5"`},
		{"lat=47&lon=-181&tz=UTC&kinds=sunrise", "lon", `"-181"`},
		// a duration without its unit, or in words: the one to write, as
		// the configuration says it; a lighting target in hours alone
		{"lat=-43.95&lon=-176.56&kinds=sunrise&offsets=sunrise:-30", "offsets", `"sunrise:-30": malformed duration "-30" (a duration needs a unit: write "-30m" for minutes)`},
		{"lat=-43.95&lon=-176.56&kinds=sunrise&alarm=60", "alarm", `"60": malformed duration (a duration needs a unit: write "60m" for minutes`},
		{"lat=-43.95&lon=-176.56&kinds=sunrise&alarm=1hour", "alarm", `"1hour": malformed duration (the units are h, m and s: write "1h" for 1hour)`},
		{"lat=-43.95&lon=-176.56&kinds=sunrise&lighting=14", "lighting", `"14": must be a day length between 0 and 24h, e.g. "16h" or "14h30m" (did you mean "14h"?)`},
		{"lat=27.7&lon=85.36&tz=UTC&kinds=sunrise&elev=1,340", "elev", `"1,340": not a decimal number (write the number without separators: 1340)`},
		// counted east all the way round: the longitude to write (the Chatham
		// Islands, 176.56°W)
		{"lat=-43.95&lon=183.44&tz=UTC&kinds=sunrise", "lon", `"183.44": must be within -180..180 (decimal degrees, east positive, west negative: write -176.56 (176.56°W) for 183.44° counted east)`},
		{ok + "&name=", "name", `""`},
		{ok + "&name=" + strings.Repeat("a", 81), "name", "1..80"},
		{ok + "&name=a%00b", "name", "control"},
		{ok + "&horizon=46", "horizon", `"46": must be within -5..45 degrees (the altitude of the visible skyline in degrees: 0 for a flat horizon, 2 behind low hills)`},
		{ok + "&horizon=-6", "horizon", `"-6"`},
		{ok + "&horizon=hill", "horizon", `"hill": not a decimal number (the altitude of the visible skyline in degrees: 0 for a flat horizon, 2 behind low hills; or skyline points azimuth:altitude, e.g. 0:2,90:8,180:1)`},
		{ok + "&horizon=0:2,90:x", "horizon", `"0:2,90:x"`},
		{ok + "&horizon=0:2,90:60", "horizon", `"0:2,90:60": point 2 (90:60): altitude must be within -5..45 degrees (`},
		{ok + "&horizon=0:2,361:4", "horizon", `point 2 (361:4): azimuth must be within 0..360`},
		{ok + "&horizon=0:2,360:4", "horizon", `azimuth 0 given twice, also at point 1:`},
		{ok + "&horizon=10.01:2,10.04:3", "horizon", `given twice`},
		{ok + "&horizon=0:2,,90:8", "horizon", `point 2 ()`},
		{ok + "&horizon=0:2/90:8", "horizon", `point 1 (0:2/90:8): must be azimuth:altitude`},
		{ok + "&horizon=" + skylinePoints(73), "horizon", "73 skyline points, at most 72"},
		{ok + "&alarm=15", "alarm", `"15"`},
		{ok + "&alarm=-5m", "alarm", `"-5m"`},
		{ok + "&alarm=169h", "alarm", `"169h"`},
		{ok + "&lighting=24h", "lighting", `"24h"`},
		{ok + "&lighting=0h", "lighting", `"0h"`},
		{ok + "&lighting=long", "lighting", `"long"`},
		{ok + "&offsets=sunrise", "offsets", `"sunrise"`},
		{ok + "&offsets=sunrise:30", "offsets", `"sunrise:30"`},
		{ok + "&offsets=sunrise:soon", "offsets", `"sunrise:soon"`},
		{ok + "&offsets=sunrise:-13h", "offsets", `"sunrise:-13h"`},
		{ok + "&offsets=sunset:-30m", "offsets", `"sunset:-30m"`},
		{ok + "&offsets=sunrse:-30m", "offsets", `"sunrse:-30m"`},
		{ok + "&offsets=sunrise:5m,sunrise:10m", "offsets", `"sunrise:10m"`},
		{ok + "&offsets=:5m", "offsets", `":5m"`},
		{"lat=47&lon=13&tz=UTC&kinds=daily-summary&offsets=daily-summary:1h", "offsets", `"daily-summary:1h"`},
		{"lat=47&lon=13&tz=UTC&kinds=sunrise&lighting=16h&offsets=lighting:16h:1h", "offsets", `"lighting:16h:1h"`},
		{"lat=47&lon=13&tz=Mars/Olympus_Mons&kinds=sunrise", "tz", `"Mars/Olympus_Mons"`},
		{"lat=47&lon=13&tz=Local&kinds=sunrise", "tz", `"Local"`},
		{"lat=47&lon=13&tz=../../etc/passwd&kinds=sunrise", "tz", `"../../etc/passwd"`},
		{"lat=47&lon=13&tz=/etc/localtime&kinds=sunrise", "tz", `"/etc/localtime"`},
		{"lat=47&lon=13&tz=europe/vienna&kinds=sunrise", "tz", `"europe/vienna"`},
		// the nearest zone of the tz database is suggested, as for --tz
		{"lat=47&lon=13&tz=europe/vienna&kinds=sunrise", "tz", `did you mean "Europe/Vienna"?`},
		{"lat=-33.45&lon=-70.66&tz=America/Santiag&kinds=sunrise", "tz", `did you mean "America/Santiago"?`},
		{"lat=47&lon=13&tz=", "tz", `""`},
		// an empty name and one nothing resembles get the zone in force at
		// the coordinates, as a site's timezone does (47° N, 13° E is in
		// Austria: Europe/Vienna in the tz database's zone1970.tab)
		{"lat=47&lon=13&tz=", "tz", `the zone at the place's latitude and longitude is "Europe/Vienna"; or leave tz out, and it is taken from them`},
		{"lat=47&lon=13&tz=Local&kinds=sunrise", "tz", `the zone at the place's latitude and longitude is "Europe/Vienna"; or leave tz out`},
		{"lat=47&lon=13&tz=UTC", "kinds", ""},
		{"lat=47&lon=13&tz=UTC&kinds=", "kinds", `""`},
		{"lat=47&lon=13&tz=UTC&kinds=sunrise,,sunset", "kinds", `"sunrise,,sunset"`},
		{"lat=47&lon=13&tz=UTC&kinds=sunrse", "kinds", `"sunrse"`},
		{"lat=47&lon=13&tz=UTC&kinds=sunrise,moonwalk", "kinds", `"moonwalk"`},
		{"lat=47&lon=13&tz=UTC&kinds=sun-altitude:95", "kinds", `"sun-altitude:95"`},
		{"lat=47&lon=13&tz=UTC&kinds=photoperiod:25h", "kinds", `"photoperiod:25h"`},
		{"lat=47&lon=13&tz=UTC&kinds=" + strings.Repeat("sunrise,", 40) + "sunset", "kinds", "more than"},
		{ok + "&days=0", "days", `"0"`},
		{ok + "&days=401", "days", `"401"`},
		{ok + "&days=-5", "days", `"-5"`},
		{ok + "&days=1.5", "days", `"1.5"`},
		{ok + "&days=99999999999999999999", "days", `"99999999999999999999"`},
		{ok + "&start=2026-13-01", "start", `"2026-13-01"`},
		{ok + "&start=2026-02-30", "start", `"2026-02-30"`},
		{ok + "&start=01.03.2026", "start", `"01.03.2026"`},
		// a date that does not exist or is written another way gets the hint
		// the configuration's dates and --from get (February 2026 has 28 days:
		// 2026 is not divisible by 4, Gregorian calendar)
		{ok + "&start=2026-02-30", "start", `"2026-02-30": not a date (February 2026 has 28 days)`},
		{ok + "&start=2026-2-3", "start", `"2026-2-3": not a date (write it 2026-02-03)`},
		{ok + "&start=26-02-03", "start", `"26-02-03": not a date (write the year in full: 2026-02-03)`},
		{ok + "&start=1799-12-31", "start", `"1799-12-31"`},
		{ok + "&start=2200-12-01&days=60", "start", `"2200-12-01"`},
		// a window past the last date says where it ends and which start
		// fits: Gregorian calendar, 2200 a common year (divisible by 100,
		// not by 400), 2200-12-01 + 59 days = 2201-01-29, 2200-12-31 − 59
		// days = 2200-11-02; the default window is 365 days
		// (DefaultAdhocDefaultDays): 2200-12-31 + 364 days = 2201-12-30,
		// 2200-12-31 − 364 days = 2200-01-01
		{ok + "&start=2200-12-01&days=60", "start", `"2200-12-01": the window of 60 days from it ends 2201-01-29, past the supported dates 1800-01-01..2200-12-31: start 2200-11-02 at the latest, or ask fewer days`},
		{ok + "&start=2200-12-31", "start", `"2200-12-31": the window of 365 days (days not given) from it ends 2201-12-30, past the supported dates 1800-01-01..2200-12-31: start 2200-01-01 at the latest, or ask fewer days`},
		{ok + "&start=2201-01-01&days=1", "start", `"2201-01-01": the window must lie within 1800-01-01..2200-12-31`},
		{ok + "&elev=9001", "elev", `"9001"`},
		{ok + "&elev=-501", "elev", `"-501"`},
		{ok + "&elev=12000", "elev", `"12000": must be within -500..9000 metres (metres above sea level, not feet: write 3658 for 12000 ft)`}, // 12000 × 0.3048 m = 3657.6 m (the international foot, 0.3048 m exactly: NIST SP 811, appendix B)
		{ok + "&elev=high", "elev", `"high"`},
		// a number written with its unit or in degrees and minutes: the hint
		// says how to write it (the value itself is checked above)
		{ok + "&horizon=2%C2%B0", "horizon", "not a decimal number (write the number alone, without the unit: 2; or skyline points azimuth:altitude, e.g. 0:2,90:8,180:1)"},
		{ok + "&horizon=-1.5%20deg", "horizon", "not a decimal number (write the number alone, without the unit: -1.5; or skyline points azimuth:altitude, e.g. 0:2,90:8,180:1)"},
		{ok + "&elev=120%20m", "elev", "not a decimal number (write the number alone, without the unit: 120)"},
		{"lat=33%C2%B027%E2%80%B2S&lon=13&tz=UTC&kinds=sunrise", "lat", "not a decimal number (write -33.45: decimal degrees, north positive, south negative)"},
		{ok + "&utc=maybe", "utc", `"maybe"`},
		{ok + "&lat=48", "lat", `"47.5,48"`},
		{ok + "&latitude=48", "latitude", `"48"`},
		{ok + "&callback=x", "callback", `"x"`},
		{ok + "&%zz=1", "", "malformed"},
		{ok + "&a=1;b=2", "", "malformed"},
		{strings.Repeat("x", 3000), "", "longer than"},
	} {
		t.Run(tc.query, func(t *testing.T) {
			r := get(t, s.Handler(), "GET", "/at.ics?"+tc.query)
			msg := body(t, r)
			if r.StatusCode != http.StatusBadRequest {
				t.Fatalf("status %d (%q), want 400", r.StatusCode, msg)
			}
			if !strings.HasPrefix(r.Header.Get("Content-Type"), "text/plain") {
				t.Errorf("Content-Type %q", r.Header.Get("Content-Type"))
			}
			if strings.Count(msg, "\n") != 1 || !strings.HasSuffix(msg, "\n") {
				t.Errorf("message is not one line: %q", msg)
			}
			if tc.param != "" && !strings.Contains(msg, "parameter "+tc.param) {
				t.Errorf("message %q does not name parameter %s", msg, tc.param)
			}
			if !strings.Contains(msg, tc.value) {
				t.Errorf("message %q does not name the value %s", msg, tc.value)
			}
		})
	}
}

func TestAdhocNormalisedAndCached(t *testing.T) {
	var calls atomic.Int32
	var got AdhocQuery
	var mu sync.Mutex
	s := adhocServer(t, writes(func(ctx context.Context, q AdhocQuery) ([]byte, error) {
		calls.Add(1)
		mu.Lock()
		got = q
		mu.Unlock()
		return adhocBytes(ctx, q)
	}))
	h := s.Handler()
	first := get(t, h, "GET", "/at.ics?lat=47.50001&lon=13.05&tz=Europe/Vienna&kinds=sunset,sunrise&elev=424.4")
	if first.StatusCode != 200 {
		t.Fatalf("status %d: %s", first.StatusCode, body(t, first))
	}
	// the kinds in the query's order: the description explains them in it
	want := "lat=47.5&lon=13.05&elev=424&tz=Europe/Vienna&kinds=sunset,sunrise&utc=false&start=2026-12-02&days=365"
	if got.String() != want {
		t.Errorf("query = %s\nwant    %s", got.String(), want)
	}
	id := got.ID()
	if got.Location.String() != "Europe/Vienna" || got.Days != 365 || !got.Start.Equal(time.Date(2026, 12, 2, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("query = %+v", got)
	}
	for _, h := range []string{"Content-Type", "ETag", "Last-Modified", "Cache-Control", "Access-Control-Allow-Origin"} {
		if first.Header.Get(h) == "" {
			t.Errorf("ad-hoc response lacks %s", h)
		}
	}
	if ct := first.Header.Get("Content-Type"); ct != "text/calendar; charset=utf-8" {
		t.Errorf("Content-Type %q", ct)
	}
	// Offsets are normalised too: sorted, zero dropped, the duration rewritten.
	get(t, h, "GET", "/at.ics?lat=47.5&lon=13.05&tz=Europe/Vienna&kinds=sunset,sunrise,sun-altitude:-6&offsets=sunset:-0.5h,sun-altitude:-6:%2B1h,sunrise:0s")
	if want := "offsets=sun-altitude%3A-6%3A1h%2Csunset%3A-30m"; !strings.Contains(got.String(), want) {
		t.Errorf("query = %s\nwant it to hold %s", got.String(), want)
	}
	if got.Offsets["sunset"] != -30*time.Minute || got.Offsets["sun-altitude:-6"] != time.Hour || len(got.Offsets) != 2 {
		t.Errorf("offsets = %v", got.Offsets)
	}
	calls.Store(1) // that request is not the one the cache checks below count
	// The same query spelled differently is a cache hit (a kind given
	// twice is where it was first).
	for _, q := range []string{
		"kinds=sunset,sunrise&tz=Europe/Vienna&lon=13.0500&lat=47.5&elev=424",
		"lat=47.5&lon=13.05&tz=Europe/Vienna&kinds=%20sunset%20,sunrise,sunset&elev=423.6&utc=FALSE&start=2026-12-02&days=365",
	} {
		r := get(t, h, "GET", "/at.ics?"+q)
		if r.StatusCode != 200 || r.Header.Get("ETag") != first.Header.Get("ETag") {
			t.Errorf("%s: status %d ETag %q", q, r.StatusCode, r.Header.Get("ETag"))
		}
	}
	if n := calls.Load(); n != 1 {
		t.Errorf("ad-hoc builder called %d times, want 1 (cache)", n)
	}
	r := get(t, h, "GET", "/at.ics?lat=47.5&lon=13.05&tz=Europe/Vienna&kinds=sunset,sunrise&elev=424", "If-None-Match", first.Header.Get("ETag"))
	if r.StatusCode != 304 {
		t.Errorf("conditional ad-hoc request: status %d, want 304", r.StatusCode)
	}
	// The kinds in another order are another feed (its description
	// explains them in that order), with the same ID and so the same UIDs.
	if r := get(t, h, "GET", "/at.ics?lat=47.5&lon=13.05&tz=Europe/Vienna&kinds=sunrise,sunset&elev=424"); r.StatusCode != 200 || calls.Load() != 2 {
		t.Errorf("kinds in another order: status %d, builder called %d times, want 2", r.StatusCode, calls.Load())
	}
	if strings.Join(got.Kinds, ",") != "sunrise,sunset" || got.ID() != id {
		t.Errorf("kinds in another order: kinds %v ID %s, want sunrise,sunset and the ID %s", got.Kinds, got.ID(), id)
	}
	// A refresh empties the cache.
	if s.cache.len() == 0 {
		t.Fatal("nothing cached")
	}
	s.Refresh(t.Context())
	if s.cache.len() != 0 {
		t.Error("refresh kept the ad-hoc cache")
	}
	// "today" in the requested zone: at 04:30 UTC it is still 1 December in Honolulu (UTC−10).
	get(t, h, "GET", "/at.ics?lat=21.3&lon=-157.86&tz=Pacific/Honolulu&kinds=sunrise&days=1")
	if want := time.Date(2026, 12, 1, 0, 0, 0, 0, time.UTC); !got.Start.Equal(want) {
		t.Errorf("default start in Honolulu = %v, want %v", got.Start, want)
	}
}

// testLimits are the ad-hoc limits the tests that read queries with
// parseAdhoc share: 400 days at most, 365 by default, years 1900..2100.
func testLimits() *adhocLimits {
	return &adhocLimits{parseKind: parseKind, maxDays: 400, defaultDays: 365, minYear: 1900, maxYear: 2100, zones: &zoneCache{}}
}

func TestAdhocIDStable(t *testing.T) {
	lim := testLimits()
	a, err := parseAdhoc("lat=47.5&lon=13&tz=Europe/Vienna&kinds=sunrise", today, lim)
	if err != nil {
		t.Fatal(err)
	}
	b, _ := parseAdhoc("lat=47.5&lon=13&tz=Europe/Vienna&kinds=sunrise&start=2027-01-01&days=30", today, lim)
	c, _ := parseAdhoc("lat=47.5&lon=13&tz=Europe/Vienna&kinds=sunset", today, lim)
	if a.ID() != b.ID() || a.ID() == c.ID() || !strings.HasPrefix(a.ID(), "at-") || len(a.ID()) != 15 {
		t.Errorf("IDs %s %s %s: want equal for the same place and kinds whatever the window", a.ID(), b.ID(), c.ID())
	}
	d, _ := parseAdhoc("lat=-0.00001&lon=-180&tz=UTC&kinds=sunrise", today, lim)
	if d.Latitude != 0 || d.Longitude != 180 || strings.HasPrefix(d.String(), "lat=-") {
		t.Errorf("normalisation of -0 and -180: %s", d.String())
	}
}

func TestAdhocDisabledAndDefaults(t *testing.T) {
	s, _ := newTestServer(t, Options{})
	if r := get(t, s.Handler(), "GET", "/at.ics?lat=1&lon=1&tz=UTC&kinds=sunrise"); r.StatusCode != 404 {
		t.Errorf("ad-hoc without a builder: status %d, want 404", r.StatusCode)
	}
	var got AdhocQuery
	s, _ = newTestServer(t, Options{
		Adhoc: writes(func(ctx context.Context, q AdhocQuery) ([]byte, error) {
			got = q
			return adhocBytes(ctx, q)
		}),
		AdhocDefaultKinds: []string{"Sunset", "sunrise"},
		AdhocDefaultDays:  30,
		AdhocMaxDays:      60,
	})
	if r := get(t, s.Handler(), "GET", "/at.ics?lat=1&lon=1&tz=UTC"); r.StatusCode != 200 {
		t.Fatalf("status %d", r.StatusCode)
	}
	if strings.Join(got.Kinds, ",") != "sunset,sunrise" || got.Days != 30 { // in the operator's order
		t.Errorf("defaults: %s", got.String())
	}
	if r := get(t, s.Handler(), "GET", "/at.ics?lat=1&lon=1&tz=UTC&days=61"); r.StatusCode != 400 {
		t.Errorf("days over AdhocMaxDays: status %d", r.StatusCode)
	}
}

func TestAdhocBuilderErrors(t *testing.T) {
	var mode atomic.Value
	s := adhocServer(t, writes(func(ctx context.Context, q AdhocQuery) ([]byte, error) {
		switch mode.Load() {
		case "query":
			return nil, &QueryError{Param: ParamKinds, Value: "moonrise", Msg: "not available above 80° latitude"}
		case "fail":
			return nil, errors.New("ical: encoder failed")
		case "panic":
			panic("index out of range")
		}
		return adhocBytes(ctx, q)
	}))
	h := s.Handler()
	for i, tc := range []struct {
		mode string
		code int
		msg  string
	}{
		{"query", 400, "parameter kinds=\"moonrise\": not available"},
		{"fail", 500, "internal error"},
		{"panic", 500, "internal error"},
		{"ok", 200, "BEGIN:VCALENDAR"},
	} {
		mode.Store(tc.mode)
		r := get(t, h, "GET", "/at.ics?lat=81&lon=1&tz=UTC&kinds=moonrise&days="+string(rune('1'+i)))
		if got := body(t, r); r.StatusCode != tc.code || !strings.Contains(got, tc.msg) {
			t.Errorf("%s: %d %q, want %d %q", tc.mode, r.StatusCode, got, tc.code, tc.msg)
		}
	}
}

// TestAdhocSharedBuild: identical concurrent requests build once.
func TestAdhocSharedBuild(t *testing.T) {
	release := make(chan struct{})
	entered := make(chan struct{}, 10)
	var calls atomic.Int32
	s := adhocServer(t, writes(func(ctx context.Context, q AdhocQuery) ([]byte, error) {
		calls.Add(1)
		entered <- struct{}{}
		<-release
		return adhocBytes(ctx, q)
	}))
	var wg sync.WaitGroup
	const n = 5
	codes := make([]int, n)
	for i := range n {
		wg.Go(func() {
			codes[i] = get(t, s.Handler(), "GET", "/at.ics?lat=10&lon=10&tz=UTC&kinds=sunrise").StatusCode
		})
	}
	<-entered
	// Release the build only once every request has joined it.
	key := "lat=10&lon=10&elev=0&tz=UTC&kinds=sunrise&utc=false&start=2026-12-02&days=365"
	for {
		s.flights.mu.Lock()
		w := s.flights.m[key].waiters
		s.flights.mu.Unlock()
		if w == n {
			break
		}
		runtime.Gosched()
	}
	close(release)
	wg.Wait()
	for i, c := range codes {
		if c != 200 {
			t.Errorf("request %d: status %d", i, c)
		}
	}
	if c := calls.Load(); c != 1 {
		t.Errorf("%d identical concurrent requests built %d times, want once", n, c)
	}
}

func FuzzAdhocQuery(f *testing.F) {
	for _, seed := range []string{
		"lat=47.5&lon=13.05&tz=Europe/Vienna&kinds=sunrise,sunset&days=365&start=2026-12-02&elev=424&utc=true",
		"lat=-33.9&lon=151.2&tz=Australia/Sydney&kinds=sun-altitude:-3.5,photoperiod:12h",
		"lat=89.9999&lon=-180&tz=UTC&kinds=moonrise&days=400",
		"lat=1e400&lon=NaN&tz=../x&kinds=,&days=-1",
		"%zz&;;==&lat=1&lat=2",
		"lat=0x1p-2&lon=1_000&tz=Local&kinds=\x00",
		"start=0000-01-01&days=400&lat=0&lon=0&tz=UTC&kinds=sunrise",
	} {
		f.Add(seed)
	}
	s, _ := newTestServer(f, Options{Adhoc: adhocICS})
	s.now = func() time.Time { return today }
	h := s.Handler()
	f.Fuzz(func(t *testing.T, raw string) {
		// Set the raw query directly: a request line that a real server
		// would refuse to parse still reaches the parser this way.
		req := httptest.NewRequest("GET", "/at.ics", nil)
		req.URL.RawQuery = raw
		w := httptest.NewRecorder()
		h.ServeHTTP(w, req)
		r := w.Result()
		if r.StatusCode >= 500 {
			t.Fatalf("query %q: status %d %s", raw, r.StatusCode, body(t, r))
		}
		if r.StatusCode == 400 {
			if msg := body(t, r); strings.Count(msg, "\n") != 1 {
				t.Fatalf("query %q: message not one line: %q", raw, msg)
			}
		}
	})
}

// dateLoop is an ad-hoc builder that computes one date per tick, checking
// its context before each date as the real per-date loops do, and reports
// how many dates it computed and why it stopped.
type dateLoop struct {
	tick    chan struct{}
	started chan struct{}
	dates   atomic.Int32
	stopped chan error
}

func newDateLoop() *dateLoop {
	return &dateLoop{tick: make(chan struct{}), started: make(chan struct{}, 8), stopped: make(chan error, 8)}
}

func (d *dateLoop) build(ctx context.Context, q AdhocQuery) ([]byte, error) {
	d.started <- struct{}{}
	for range q.Days {
		select {
		case <-ctx.Done():
			d.stopped <- ctx.Err()
			return nil, ctx.Err()
		case <-d.tick:
			d.dates.Add(1)
		}
	}
	d.stopped <- nil
	return adhocBytes(ctx, q)
}

// serveAsync runs one request whose context the caller can cancel.
func serveAsync(h http.Handler, target string) (cancel func(), code <-chan int) {
	ctx, cancel := context.WithCancel(context.Background())
	ch := make(chan int, 1)
	go func() {
		w := httptest.NewRecorder()
		h.ServeHTTP(w, httptest.NewRequest("GET", target, nil).WithContext(ctx))
		ch <- w.Code
	}()
	return cancel, ch
}

// A cancelled or timed-out /at.ics request cancels its computation: the
// per-date loop stops at the next date instead of computing the other 362.
func TestAdhocCancelledRequestStopsWork(t *testing.T) {
	loop := newDateLoop()
	s, _ := newTestServer(t, Options{Adhoc: writes(loop.build), AdhocTimeout: time.Hour})
	s.now = func() time.Time { return today }
	cancel, code := serveAsync(s.Handler(), "/at.ics?lat=10&lon=10&tz=UTC&kinds=sunrise&days=365")
	<-loop.started
	for range 3 {
		loop.tick <- struct{}{}
	}
	cancel()
	if err := <-loop.stopped; !errors.Is(err, context.Canceled) {
		t.Errorf("the build stopped with %v, want context.Canceled", err)
	}
	if n := loop.dates.Load(); n != 3 {
		t.Errorf("%d dates computed, want the 3 before the request was cancelled (of 365)", n)
	}
	if c := <-code; c != http.StatusServiceUnavailable {
		t.Errorf("status %d", c)
	}
	// The key is free again: the next request builds afresh.
	cancel, _ = serveAsync(s.Handler(), "/at.ics?lat=10&lon=10&tz=UTC&kinds=sunrise&days=365")
	<-loop.started
	cancel()
	<-loop.stopped
}

// A build shared by two requests goes on while one of them still waits, and
// stops when both have gone.
func TestAdhocSharedBuildStopsWithTheLastRequest(t *testing.T) {
	loop := newDateLoop()
	s, _ := newTestServer(t, Options{Adhoc: writes(loop.build), AdhocTimeout: time.Hour})
	s.now = func() time.Time { return today }
	const target = "/at.ics?lat=10&lon=10&tz=UTC&kinds=sunrise&days=3"
	waiters := func(lat string) int {
		key := "lat=" + lat + "&lon=10&elev=0&tz=UTC&kinds=sunrise&utc=false&start=2026-12-02&days=3"
		s.flights.mu.Lock()
		defer s.flights.mu.Unlock()
		if f := s.flights.m[key]; f != nil {
			return f.waiters
		}
		return 0
	}
	cancel1, code1 := serveAsync(s.Handler(), target)
	<-loop.started
	cancel2, code2 := serveAsync(s.Handler(), target)
	for waiters("10") != 2 {
		runtime.Gosched()
	}
	loop.tick <- struct{}{}
	cancel1()
	if c := <-code1; c != http.StatusServiceUnavailable {
		t.Errorf("the cancelled request: status %d", c)
	}
	loop.tick <- struct{}{} // the build goes on for the other request
	loop.tick <- struct{}{}
	if err := <-loop.stopped; err != nil {
		t.Errorf("the shared build stopped: %v", err)
	}
	if c := <-code2; c != http.StatusOK {
		t.Errorf("the waiting request: status %d", c)
	}
	cancel2()

	// Both requests gone: the build stops.
	const other = "/at.ics?lat=11&lon=10&tz=UTC&kinds=sunrise&days=3"
	cancel1, code1 = serveAsync(s.Handler(), other)
	<-loop.started
	cancel2, code2 = serveAsync(s.Handler(), other)
	for waiters("11") != 2 {
		runtime.Gosched()
	}
	cancel1()
	<-code1
	loop.tick <- struct{}{}
	cancel2()
	<-code2
	if err := <-loop.stopped; !errors.Is(err, context.Canceled) {
		t.Errorf("the build nobody waits for stopped with %v, want context.Canceled", err)
	}
}

// An ad-hoc feed larger than AdhocMaxBytes is refused with a 400 that states
// the limit and a window that fits; the refusal is remembered, so asking
// again costs no computation. A feed within the limit is served.
func TestAdhocSizeCap(t *testing.T) {
	var calls atomic.Int32
	s, _ := newTestServer(t, Options{AdhocMaxBytes: 20_000, Adhoc: writes(func(ctx context.Context, q AdhocQuery) ([]byte, error) {
		calls.Add(1)
		return icsFor(q.ID(), q.Days, "cap"), nil // one event a day, about 200 bytes each
	})})
	s.now = func() time.Time { return today }
	h := s.Handler()
	for i := range 2 {
		r := get(t, h, "GET", "/at.ics?lat=10&lon=10&tz=UTC&kinds=sunrise&days=365")
		msg := body(t, r)
		if r.StatusCode != http.StatusBadRequest {
			t.Fatalf("request %d: status %d, want 400", i, r.StatusCode)
		}
		// Sizes in units people read, the limit named exactly.
		sized := regexp.MustCompile(`is \d+(\.\d+)? kB, over the 20 kB limit per ad-hoc feed`)
		if !sized.MatchString(msg) || strings.Contains(msg, "bytes") {
			t.Errorf("message %q does not state the size and the 20 kB limit in kB", msg)
		}
		for _, want := range []string{"fewer kinds or days", "days="} {
			if !strings.Contains(msg, want) {
				t.Errorf("message %q does not say %q", msg, want)
			}
		}
		if strings.Contains(msg, "\n") != strings.HasSuffix(msg, "\n") || strings.Count(msg, "\n") > 1 {
			t.Errorf("message is not one line: %q", msg)
		}
	}
	if n := calls.Load(); n != 1 {
		t.Errorf("the refused feed was computed %d times, want once", n)
	}
	// The window the message suggests fits.
	msg := body(t, get(t, h, "GET", "/at.ics?lat=10&lon=10&tz=UTC&kinds=sunrise&days=365"))
	days := msg[strings.LastIndex(msg, "days=")+len("days="):]
	days = days[:strings.IndexFunc(days, func(r rune) bool { return r < '0' || r > '9' })]
	if r := get(t, h, "GET", "/at.ics?lat=10&lon=10&tz=UTC&kinds=sunrise&days="+days); r.StatusCode != http.StatusOK {
		t.Errorf("days=%s, suggested by the refusal: status %d", days, r.StatusCode)
	}
}

// TestAdhocGzip: an ad-hoc feed, compressed at its own (fastest) level,
// comes as gzip to a client that accepts it, with its own ETag, and
// compress/gzip reads back exactly the bytes sent to a client that does
// not (RFC 9110 §8.4.1.3, gzip coding).
func TestAdhocGzip(t *testing.T) {
	s := adhocServer(t, adhocICS)
	h := s.Handler()
	const target = "/at.ics?lat=47.5&lon=13.05&tz=Europe/Vienna&kinds=sunrise&days=365"
	plainResp := get(t, h, "GET", target)
	want := body(t, plainResp)
	gz := get(t, h, "GET", target, "Accept-Encoding", "gzip")
	if gz.StatusCode != 200 || gz.Header.Get("Content-Encoding") != "gzip" {
		t.Fatalf("status %d, Content-Encoding %q, want 200 gzip", gz.StatusCode, gz.Header.Get("Content-Encoding"))
	}
	raw := body(t, gz)
	// both ETags are the 64-bit xxHash of the gzip form in 16 hex digits
	// (docs/serving.md), that of the gzip form with "-gz"; the test vector
	// of the hash is checked in TestAdhocSum
	sum := fmt.Sprintf("%016x", xxhash.Sum64String(raw))
	if e, want := gz.Header.Get("ETag"), `"`+sum+`-gz"`; e != want {
		t.Errorf("gzip ETag %q, want %q", e, want)
	}
	if e, want := plainResp.Header.Get("ETag"), `"`+sum+`"`; e != want {
		t.Errorf("identity ETag %q, want %q", e, want)
	}
	zr, err := gzip.NewReader(strings.NewReader(raw))
	if err != nil {
		t.Fatal(err)
	}
	got, err := io.ReadAll(zr)
	if err != nil {
		t.Fatal(err)
	}
	if string(got) != want || len(want) < 4*minGzip {
		t.Errorf("gzip body decodes to %d bytes, want the %d bytes of the identity body", len(got), len(want))
	}
	if len(raw) >= len(want)/2 {
		t.Errorf("gzip body %d bytes for %d: hardly compressed", len(raw), len(want))
	}
	// The ETags name the content: the same feed built again (the cache
	// emptied by a refresh) has the same ones, another feed others.
	s.Refresh(t.Context())
	again := get(t, h, "GET", target, "Accept-Encoding", "gzip")
	if again.Header.Get("ETag") != gz.Header.Get("ETag") {
		t.Errorf("rebuilt feed: ETag %q, was %q", again.Header.Get("ETag"), gz.Header.Get("ETag"))
	}
	other := get(t, h, "GET", strings.Replace(target, "lat=47.5", "lat=47.6", 1), "Accept-Encoding", "gzip")
	if other.Header.Get("ETag") == gz.Header.Get("ETag") {
		t.Errorf("another feed has the same ETag %q", other.Header.Get("ETag"))
	}
}

// TestAdhocSum: the sum in an ad-hoc feed's ETags is the 64-bit xxHash
// (XXH64, seed 0) in 16 hex digits, big-endian as the algorithm's own tool
// prints it. Check values: XXH64 of the empty input and of "asdf" as the
// xxHash reference tool prints them (`printf asdf | xxhsum -H1`, Debian's
// xxhash package); the tests of github.com/cespare/xxhash/v2 state the same.
func TestAdhocSum(t *testing.T) {
	for in, want := range map[string]string{"": "ef46db3751d8e999", "asdf": "415872f599cea71e"} {
		if got := adhocSum([]byte(in)); got != want {
			t.Errorf("adhocSum(%q) = %s, want %s", in, got, want)
		}
	}
}

// A cached ad-hoc feed keeps only its gzip form: a client that does not
// take gzip gets the built bytes decompressed, with the identity ETag, a
// 304 when it has them (RFC 9110 §13.1.2) and ranges of them (§14).
func TestAdhocIdentityFromGzip(t *testing.T) {
	s := adhocServer(t, adhocICS)
	h := s.Handler()
	const query = "lat=47.5&lon=13.05&tz=Europe/Vienna&kinds=sunrise&days=365"
	q, err := parseAdhoc(query, today, s.limits)
	if err != nil {
		t.Fatal(err)
	}
	built, _ := adhocBytes(t.Context(), q)
	first := get(t, h, "GET", "/at.ics?"+query) // built for this request
	if got := body(t, first); got != string(built) {
		t.Fatalf("first identity body: %d bytes, want the %d built", len(got), len(built))
	}
	a := s.cache.get(q.String())
	if a == nil || a.gz == nil || a.data != nil {
		t.Fatalf("cached asset: want the gzip form only, got %+v", a)
	}
	if s.cache.bytes != len(a.gz) {
		t.Errorf("cache counts %d bytes, want the %d of the gzip form", s.cache.bytes, len(a.gz))
	}
	again := get(t, h, "GET", "/at.ics?"+query) // from the cache
	if got := body(t, again); got != string(built) {
		t.Errorf("cached identity body: %d bytes, want the %d built", len(got), len(built))
	}
	etag := again.Header.Get("ETag")
	if etag == "" || strings.HasSuffix(etag, `-gz"`) || again.Header.Get("Content-Encoding") != "" {
		t.Errorf("identity response: ETag %q, Content-Encoding %q", etag, again.Header.Get("Content-Encoding"))
	}
	if r := get(t, h, "GET", "/at.ics?"+query, "If-None-Match", etag); r.StatusCode != http.StatusNotModified {
		t.Errorf("If-None-Match with the identity ETag: status %d, want 304", r.StatusCode)
	}
	r := get(t, h, "GET", "/at.ics?"+query, "Range", "bytes=0-14")
	if got := body(t, r); r.StatusCode != http.StatusPartialContent || got != string(built[:15]) {
		t.Errorf("range 0-14: status %d, body %q, want 206 %q", r.StatusCode, got, built[:15])
	}
}

// skylinePoints writes n skyline points, evenly spread round the horizon.
func skylinePoints(n int) string {
	items := make([]string, n)
	for i := range items {
		items[i] = strconv.FormatFloat(float64(i)*360/float64(n), 'f', 2, 64) + ":3"
	}
	return strings.Join(items, ",")
}

// A feed written in pieces, whatever their sizes, becomes the asset of the
// whole feed (newAdhocAsset): the same compressed bytes, ETag and, for a
// feed too small or too random to compress, the same bytes kept.
func TestAdhocSinkPieces(t *testing.T) {
	random := make([]byte, 50_000) // gzip would not save a tenth
	for i := range random {
		random[i] = byte(i*7919>>3 ^ i*104729>>11)
	}
	feeds := [][]byte{icsFor("p", 0, "r"), icsFor("p", 3, "r"), icsFor("p", 100, "r"), icsFor("p", 1000, "r"), random}
	for _, data := range feeds {
		want := newAdhocAsset("p.ics", data, testBuilt)
		for _, piece := range []int{1, 777, adhocHold, adhocHold + 1, 32 << 10, len(data) + 1} {
			if piece == 1 && len(data) > 20_000 {
				continue // a byte at a time: slow, and covered by the small feeds
			}
			sink := newAdhocSink(len(data))
			for rest := data; len(rest) > 0; {
				k := min(piece, len(rest))
				if n, err := sink.Write(rest[:k]); n != k || err != nil {
					t.Fatalf("Write: %d, %v", n, err)
				}
				rest = rest[k:]
			}
			got := sink.asset("p.ics", testBuilt)
			sink.release()
			if got.sum != want.sum || !bytes.Equal(got.gz, want.gz) || !bytes.Equal(got.data, want.data) {
				t.Errorf("%d bytes in pieces of %d: sum %s, %d gzip bytes, %d kept; want %s, %d, %d",
					len(data), piece, got.sum, len(got.gz), len(got.data), want.sum, len(want.gz), len(want.data))
			}
		}
		if len(data) > 0 { // over the limit: counted whole, for the refusal's message
			sink := newAdhocSink(len(data) - 1)
			sink.Write(data[:len(data)/2])
			sink.Write(data[len(data)/2:])
			if sink.n != len(data) {
				t.Errorf("over the limit: %d bytes counted, want %d", sink.n, len(data))
			}
			sink.release()
		}
	}
}

// WarmAdhoc builds the default query's feed at a place in UTC, as a request
// would, once, and logs that it did ("ad-hoc feeds warmed up", as
// docs/serving.md says); the feed is then served from the cache. A builder
// that fails or panics does not stop the server: the failure is logged.
func TestWarmAdhoc(t *testing.T) {
	var calls atomic.Int32
	var got AdhocQuery
	var logged bytes.Buffer
	warmServer := func(fn AdhocFunc) *Server {
		s, _ := newTestServer(t, Options{Adhoc: fn, AdhocDefaultKinds: []string{"sunrise", "sunset"},
			Logger: slog.New(slog.NewTextHandler(&logged, nil))})
		s.now = func() time.Time { return today }
		return s
	}
	s := warmServer(writes(func(ctx context.Context, q AdhocQuery) ([]byte, error) {
		calls.Add(1)
		got = q
		return adhocBytes(ctx, q)
	}))
	logged.Reset()
	s.WarmAdhoc(t.Context())
	if n := calls.Load(); n != 1 {
		t.Fatalf("%d builds, want 1", n)
	}
	if out := logged.String(); !strings.Contains(out, `msg="ad-hoc feeds warmed up" query="`+warmQuery+`" duration=`) {
		t.Errorf("the warm-up logged %q, want it said done, with its query and duration", out)
	}
	if got.Latitude != 0 || got.Longitude != 0 || got.Location.String() != "UTC" || got.Days != DefaultAdhocDefaultDays ||
		!got.Start.Equal(time.Date(2026, 12, 2, 0, 0, 0, 0, time.UTC)) || strings.Join(got.Kinds, ",") != "sunrise,sunset" {
		t.Errorf("warm-up query %+v, want the defaults at 0, 0 in UTC from today", got)
	}
	if r := get(t, s.Handler(), "GET", "/at.ics?"+warmQuery); r.StatusCode != 200 || calls.Load() != 1 {
		t.Errorf("the warm-up's feed: status %d after %d builds, want 200 from the cache", r.StatusCode, calls.Load())
	}
	// the warm-up is no request's build: /metrics counts it neither as a
	// build nor as a miss; a request's build counts once in each
	builds := func() string {
		out := body(t, get(t, s.Handler(), "GET", "/metrics"))
		return strings.Join(regexp.MustCompile(`(?m)^(heliocal_adhoc_build_duration_seconds_(?:count|bucket\{le="\+Inf"\})|heliocal_adhoc_cache_total\{result="miss"\}) \d+$`).FindAllString(out, -1), ", ")
	}
	if got, want := builds(), `heliocal_adhoc_build_duration_seconds_bucket{le="+Inf"} 0, heliocal_adhoc_build_duration_seconds_count 0, heliocal_adhoc_cache_total{result="miss"} 0`; got != want {
		t.Errorf("after the warm-up and its feed from the cache, /metrics says %s; want %s", got, want)
	}
	get(t, s.Handler(), "GET", "/at.ics?lat=1&lon=0&tz=UTC")
	if got, want := builds(), `heliocal_adhoc_build_duration_seconds_bucket{le="+Inf"} 1, heliocal_adhoc_build_duration_seconds_count 1, heliocal_adhoc_cache_total{result="miss"} 1`; got != want {
		t.Errorf("after a request's build, /metrics says %s; want %s", got, want)
	}

	for _, fn := range []AdhocFunc{
		func(context.Context, AdhocQuery, io.Writer) error { return errors.New("broken") },
		func(context.Context, AdhocQuery, io.Writer) error { panic("broken") },
	} {
		s := warmServer(fn)
		logged.Reset()
		s.WarmAdhoc(t.Context()) // logs, returns
		if out := logged.String(); !strings.Contains(out, `level=WARN msg="ad-hoc warm-up failed" query="`+warmQuery+`" err=`) ||
			strings.Contains(out, "warmed up") {
			t.Errorf("a warm-up that failed logged %q, want the failure alone", out)
		}
	}
	s, _ = newTestServer(t, Options{}) // no ad-hoc feeds: nothing to do
	s.WarmAdhoc(t.Context())
}

// At most AdhocConcurrency ad-hoc builds run at once; the others wait and
// start in the order they came as builds end.
func TestAdhocBuildsAtOnce(t *testing.T) {
	var running, most atomic.Int32
	started := make(chan float64, 8)
	release := make(chan struct{})
	s, _ := newTestServer(t, Options{AdhocConcurrency: 2, AdhocTimeout: time.Hour,
		Adhoc: writes(func(ctx context.Context, q AdhocQuery) ([]byte, error) {
			n := running.Add(1)
			for m := most.Load(); n > m && !most.CompareAndSwap(m, n); m = most.Load() {
			}
			started <- q.Latitude
			<-release
			running.Add(-1)
			return adhocBytes(ctx, q)
		})})
	h := s.Handler()
	var codes []<-chan int
	for i := range 4 {
		_, code := serveAsync(h, fmt.Sprintf("/at.ics?lat=%d&lon=10&tz=UTC&kinds=sunrise&days=3", 10+i))
		codes = append(codes, code)
		if i < 2 {
			<-started // the first two start at once
		} else {
			time.Sleep(50 * time.Millisecond) // the third waits before the fourth comes
		}
	}
	select {
	case lat := <-started:
		t.Fatalf("a third build (lat %v) started while two ran", lat)
	case <-time.After(50 * time.Millisecond):
	}
	var order []float64
	for range 2 {
		release <- struct{}{} // one build ends: the next waiting one starts
		order = append(order, <-started)
	}
	close(release)
	for i, c := range codes {
		if code := <-c; code != http.StatusOK {
			t.Errorf("request %d: status %d", i, code)
		}
	}
	if most.Load() != 2 || !slices.Equal(order, []float64{12, 13}) {
		t.Errorf("at most %d builds at once, the waiting ones started in the order %v; want 2 and [12 13] (first come, first served)", most.Load(), order)
	}
}

// A build that gets its slot first lets the goroutines queued on its
// processor run (net/http's reader of the request's connection is one),
// instead of keeping them waiting for milliseconds: with one processor, a
// goroutine started just before has run when adhocSlot returns (nearly
// always: now and then the scheduler takes the yielding goroutine back
// first, to be fair to its global queue).
func TestAdhocSlotLetsQueuedGoroutinesRun(t *testing.T) {
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(1))
	s, _ := newTestServer(t, Options{Adhoc: adhocICS})
	const tries = 40
	ran := 0
	for range tries {
		var done atomic.Bool
		go done.Store(true) // queued on this processor, as the reader is
		_, release, err := s.adhocSlot(t.Context())
		if err != nil {
			t.Fatal(err)
		}
		if done.Load() {
			ran++
		}
		release()
	}
	if ran < tries*3/4 {
		t.Errorf("a goroutine queued before a build had run when the build got its slot in %d of %d tries, want nearly all", ran, tries)
	}
}
