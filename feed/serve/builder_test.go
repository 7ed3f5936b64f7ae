package serve

import (
	"compress/gzip"
	"context"
	"encoding/base64"
	"encoding/json"
	"errors"
	"fmt"
	"html"
	"io"
	"net/http"
	"strconv"
	"strings"
	"testing"
	"time"

	"heliocal/config"
	"heliocal/feed"
)

// previewCalendar is a Preview that lists one entry per kind per date at
// 06:29:30 UTC: the serve package's own tests need no astronomy.
func previewCalendar(_ context.Context, q AdhocQuery) (*feed.Calendar, error) {
	cal := &feed.Calendar{Title: "Sky events at " + q.Name, Site: feed.Site{Name: q.Name, Location: q.Location}, Stamp: q.Start}
	for i := range q.Days {
		d := q.Start.AddDate(0, 0, i)
		for _, k := range q.Kinds {
			cal.Entries = append(cal.Entries, feed.Entry{Kind: k, Title: k, Date: d, UID: k + "-" + d.Format("20060102") + "@heliocal",
				Start: d.Add(6*time.Hour + 29*time.Minute + 30*time.Second)})
		}
	}
	return cal, nil
}

func builderTestServer(t testing.TB) *Server {
	s, _ := newTestServer(t, Options{Adhoc: adhocICS, Preview: previewCalendar})
	s.now = func() time.Time { return today }
	return s
}

// previewOf is /at.json's answer to query, which must be a 200.
func previewOf(t *testing.T, s *Server, query string) previewResult {
	t.Helper()
	r := get(t, s.Handler(), "GET", "/at.json?"+query)
	b := body(t, r)
	if r.StatusCode != 200 {
		t.Fatalf("%s: status %d: %s", query, r.StatusCode, b)
	}
	var res previewResult
	if err := json.Unmarshal([]byte(b), &res); err != nil {
		t.Fatal(err)
	}
	return res
}

func TestPreviewJSON(t *testing.T) {
	s := builderTestServer(t)
	res := previewOf(t, s, "lat=-33.45&lon=-70.6667&kinds=sunrise&name=Quebrada&start=2026-06-21")
	if res.Zone != "America/Santiago" || !res.ZoneFound {
		t.Errorf("zone %q found=%v, want America/Santiago from the coordinates", res.Zone, res.ZoneFound)
	}
	if len(res.Days) != 7 || res.Days[0].Date != "2026-06-21" || res.Days[0].Weekday != "Sun" {
		t.Fatalf("days %+v", res.Days)
	}
	// 06:29:30 UTC is 02:29:30 in Santiago (UTC−4 in June): 02:30 to the minute.
	if e := res.Days[0].Entries; len(e) != 1 || e[0].Time != "02:30" || e[0].Kind != "sunrise" {
		t.Errorf("entries %+v, want sunrise at 02:30 local", e)
	}
	if !strings.HasPrefix(res.HTTPS, "http://example.com/at.ics?lat=-33.45&lon=-70.6667") || strings.Contains(res.HTTPS, "start=") ||
		res.Webcal != "webcal://"+strings.TrimPrefix(res.HTTPS, "http://") {
		t.Errorf("links %q, %q: want absolute, rolling (no start)", res.HTTPS, res.Webcal)
	}
	if !strings.HasPrefix(res.Page, "http://example.com/at?") || !strings.Contains(res.Page, "start=2026-06-21") {
		t.Errorf("page link %q", res.Page)
	}
	svg, err := base64.StdEncoding.DecodeString(strings.TrimPrefix(res.QR, "data:image/svg+xml;base64,"))
	if err != nil || !strings.HasPrefix(string(svg), "<svg") {
		t.Errorf("QR %.60q: not an SVG data URL (%v)", res.QR, err)
	}
	// days is the table the share link opens, as long as a table may be:
	// the preview is of its first seven days (a table's "make another"
	// keeps its length through the builder)
	var long previewResult
	if err := json.Unmarshal([]byte(body(t, get(t, s.Handler(), "GET", "/at.json?lat=-33.45&lon=-70.6667&kinds=sunrise&start=2026-06-21&days=31"))), &long); err != nil {
		t.Fatal(err)
	}
	if len(long.Days) != 7 || long.Days[0].Date != "2026-06-21" || !strings.HasSuffix(long.Page, "&start=2026-06-21&days=31") || strings.Contains(long.HTTPS, "days=") {
		t.Errorf("days=31: %d days from %s, page link %q, subscribe %q; want 7 days, the page of 31 and the rolling subscription of every day",
			len(long.Days), long.Days[0].Date, long.Page, long.HTTPS)
	}
	for _, bad := range []string{"days=63", "days=0", "lat=95", "horizon=50"} {
		r := get(t, s.Handler(), "GET", "/at.json?lat=1&lon=2&kinds=sunrise&"+bad)
		if m := body(t, r); r.StatusCode != 400 || strings.Count(m, "\n") != 1 {
			t.Errorf("%s: %d %q, want a one-line 400", bad, r.StatusCode, m)
		}
	}
}

func TestBuilderPages(t *testing.T) {
	s := builderTestServer(t)
	h := s.Handler()
	for _, tc := range []struct{ path, ctype, has string }{
		{"/", "text/html; charset=utf-8", `id="builder"`},
		{"/at?lat=47.8&lon=13.05&kinds=sunrise&days=3&start=2026-03-20", "text/html; charset=utf-8", "2026-03-22"},
		// the heading says which horizon the times are for
		{"/at?lat=47.8&lon=13.05&kinds=sunrise&days=3&horizon=90:8,0:2,180:1", "text/html; charset=utf-8", "Elevation 0 m, skyline 0:2, 90:8, 180:1 (azimuth:altitude)"},
		{"/at?lat=47.8&lon=13.05&kinds=sunrise&days=3&horizon=" + skylinePoints(9), "text/html; charset=utf-8", "0 m, skyline of 9 points"},
		{"/at?lat=47.8&lon=13.05&kinds=sunrise&days=3&horizon=2.5", "text/html; charset=utf-8", "0 m, horizon 2.5°"},
		{"/assets/builder.js", "text/javascript; charset=utf-8", "parseAngle"},
		{"/assets/builder.css", "text/css; charset=utf-8", "prefers-color-scheme: dark"},
		{"/favicon.svg", "image/svg+xml", "<svg"},
	} {
		r := get(t, h, "GET", tc.path)
		b := body(t, r)
		if r.StatusCode != 200 || r.Header.Get("Content-Type") != tc.ctype || !strings.Contains(b, tc.has) {
			t.Errorf("%s: %d %q, body has %q: %v", tc.path, r.StatusCode, r.Header.Get("Content-Type"), tc.has, strings.Contains(b, tc.has))
		}
		if strings.HasPrefix(tc.ctype, "text/html") {
			csp := r.Header.Get("Content-Security-Policy")
			if !strings.Contains(csp, "default-src 'none'") || !strings.Contains(csp, "script-src 'self'") {
				t.Errorf("%s: Content-Security-Policy %q", tc.path, csp)
			}
			// No inline script or style, no external resource.
			for _, bad := range []string{"<script>", "<style", " style=", `src="http`, `stylesheet" href="http`} {
				if strings.Contains(b, bad) {
					t.Errorf("%s: the page contains %q", tc.path, bad)
				}
			}
		}
	}
	// The table's subscribe button carries the webcal: link (the scheme
	// Apple's and most desktop calendars subscribe with, common practice),
	// not html/template's "#ZgotmplZ" for a scheme it does not trust.
	tb := body(t, get(t, h, "GET", "/at?lat=-33.6&lon=-70.7&tz=America/Santiago&kinds=sunrise&days=2&start=2027-09-03"))
	want := `<a class="button" href="webcal://example.com/at.ics?lat=-33.6&amp;lon=-70.7&amp;`
	if !strings.Contains(tb, want) || strings.Contains(tb, "ZgotmplZ") {
		i := strings.Index(tb, `class="button"`)
		t.Errorf("/at subscribe button: %.160q, want it to begin %q", tb[max(i, 0):], want)
	}
	if r := get(t, h, "GET", "/at?lat=47.8&lon=13.05&kinds=sunrise&days=63"); r.StatusCode != 400 {
		t.Errorf("a 63-day table: %d, want 400", r.StatusCode)
	}
	// Without Preview, / is the bundle's index.html.
	plainServer, _ := newTestServer(t, Options{})
	if got := body(t, get(t, plainServer.Handler(), "GET", "/")); got != string(testBundle("a").File("index.html").Data) {
		t.Errorf("/ without the builder is not the bundle's index.html")
	}
}

// Every kind the builder offers is a kind of the vocabulary, each once.
func TestKindGroupsAreKinds(t *testing.T) {
	seen := map[string]bool{}
	for _, g := range kindGroups {
		for _, k := range g.Kinds {
			if _, err := config.ParseKind(k.Kind); err != nil || seen[k.Kind] {
				t.Errorf("group %s: kind %q: %v (repeated: %v)", g.ID, k.Kind, err, seen[k.Kind])
			}
			seen[k.Kind] = true
			if k.Explain == "" || k.Label == "" {
				t.Errorf("kind %s has no label or explanation", k.Kind)
			}
		}
	}
	_ = http.StatusOK
}

// The builder's golden hour is the feeds' band, the Sun's centre from −4°
// to 6° (the vocabulary's golden-hour): it begins before sunrise and ends
// after sunset (at 52.95° N, 1.05° W on 12 June 2027 it begins at
// 04:08:56 BST, 30 min before the sunrise at 04:38:48 BST: PyEphem 4.1.4),
// so its words give the band, not "shortly after sunrise and before
// sunset".
func TestGoldenHourExplainedAsItsBand(t *testing.T) {
	found := false
	for _, g := range kindGroups {
		for _, k := range g.Kinds {
			if k.Kind != "golden-hour" {
				continue
			}
			found = true
			if !strings.Contains(k.Explain, "4° below") || !strings.Contains(k.Explain, "6° above") || strings.Contains(k.Explain, "after sunrise") {
				t.Errorf("golden hour explained as %q, want the band −4°..6° around sunrise and sunset", k.Explain)
			}
		}
	}
	if !found {
		t.Error("the builder offers no golden hour")
	}
}

// The builder offers each twilight's dawn with its dusk: the evening's
// crossing of an altitude without the morning's leaves an observer who
// stays out, or a crew that sails at first light, without the other end.
func TestKindGroupsPairDawnAndDusk(t *testing.T) {
	offered := map[string]bool{}
	for _, g := range kindGroups {
		for _, k := range g.Kinds {
			offered[k.Kind] = true
		}
	}
	for k := range offered {
		twin := ""
		if stem, ok := strings.CutSuffix(k, "-dusk"); ok {
			twin = stem + "-dawn"
		} else if stem, ok := strings.CutSuffix(k, "-dawn"); ok {
			twin = stem + "-dusk"
		}
		if twin != "" && !offered[twin] {
			t.Errorf("the builder offers %s but not %s", k, twin)
		}
	}
}

// The page lists the configured sites and feeds in the order given, with
// descriptions, only feeds being served (at the address index.html and
// feeds.json give them), a link to the year charts of index.html, and the
// legal caution when asked; without the builder the form is gone.
func TestPageSitesAndCaution(t *testing.T) {
	s := builderTestServer(t)
	s.SetPage(PageInfo{Title: "Kestrel Ridge sky", Contact: "Ask the warden", Legal: true, NoBuilder: true, Sites: []PageSite{
		{Name: "Kestrel Ridge", Place: "46.50° N", Feeds: []PageFeed{{ID: "kestrel-ridge-moon", Title: "Moon", Description: "Moonrise and moonset."}}},
		{Name: "Meadowbrook", Place: "47.00° N", Feeds: []PageFeed{{ID: "meadowbrook-sun", Title: "Sun"}, {ID: "not-built", Title: "Gone"}}},
	}})
	b := body(t, get(t, s.Handler(), "GET", "/"))
	kestrel, meadow := strings.Index(b, "Kestrel Ridge</h3>"), strings.Index(b, "Meadowbrook</h3>")
	if kestrel < 0 || meadow < kestrel {
		t.Errorf("sites not in the order given (%d, %d)", kestrel, meadow)
	}
	for _, want := range []string{"Moonrise and moonset.", "http://example.com/kestrel-ridge-moon.ics", "webcal://example.com/meadowbrook-sun.ics", `<a href="http://example.com/index.html">Year charts</a>`, "Ask the warden", LegalCaution, DefaultCaution} {
		if !strings.Contains(b, want) {
			t.Errorf("the page lacks %q", want)
		}
	}
	// the addresses wrap at their natural points, never inside a word
	if want := `class="url">http://<wbr/>example.<wbr/>com/<wbr/>kestrel-<wbr/>ridge-<wbr/>moon.<wbr/>ics</a>`; !strings.Contains(b, want) {
		t.Errorf("the page lacks %q", want)
	}
	if css := body(t, get(t, s.Handler(), "GET", "/assets/builder.css")); strings.Contains(css, "break-all") {
		t.Errorf("builder.css breaks words anywhere (word-break: break-all)")
	}
	if strings.Contains(b, "not-built") || strings.Contains(b, `id="builder"`) {
		t.Errorf("the page lists a feed not served, or shows the builder it should not")
	}
}

// A time on another date than its row (a dark window after midnight, which
// belongs to the night before, or its end the next morning) is shown with
// its weekday in the preview and the table page, as `heliocal events` marks
// it "+1 day". Havana, 13–15 March 2027 (the clocks skip 00:00–01:00 on
// the 14th): a window 23:55 CST to 06:25 CDT, and one 01:59–06:24 CDT on the
// 15th that belongs to the night of the 14th.
func TestPreviewTimesOnAnotherDate(t *testing.T) {
	havana, err := time.LoadLocation("America/Havana")
	if err != nil {
		t.Fatal(err)
	}
	d := func(s string) time.Time { t, _ := time.Parse(time.DateOnly, s); return t }
	u := func(s string) time.Time { t, _ := time.Parse(time.RFC3339, s); return t }
	cal := &feed.Calendar{Entries: []feed.Entry{
		{Kind: "dark-window", Title: "night 13–14", Date: d("2027-03-13"), Start: u("2027-03-14T04:55:00Z"), End: u("2027-03-14T10:25:00Z")},
		{Kind: "dark-window", Title: "night 14–15", Date: d("2027-03-14"), Start: u("2027-03-15T05:59:00Z"), End: u("2027-03-15T10:24:00Z")},
		{Kind: "sunrise", Title: "Sunrise", Date: d("2027-03-15"), Start: u("2027-03-15T11:39:00Z")},
	}}
	got := days(cal, AdhocQuery{Start: d("2027-03-13"), Days: 3, Location: havana})
	for i, want := range []struct{ when, startDate, endDate string }{
		{"23:55–Sun 06:25", "", "2027-03-14"}, {"Mon 01:59–06:24", "2027-03-15", ""}, {"07:39", "", ""},
	} {
		if len(got[i].Entries) != 1 {
			t.Fatalf("day %d: entries %+v", i, got[i].Entries)
		}
		e := got[i].Entries[0]
		if e.When != want.when || e.StartDate != want.startDate || e.EndDate != want.endDate {
			t.Errorf("%s: when %q, start_date %q, end_date %q; want %q, %q, %q", got[i].Date, e.When, e.StartDate, e.EndDate, want.when, want.startDate, want.endDate)
		}
	}
}

// The all-day entries of a row come first and in the feeds' order (the
// catalogue's order of kinds), whatever order the calendar gave them in;
// timed ones keep theirs.
func TestPreviewAllDayOrder(t *testing.T) {
	d := time.Date(2027, 4, 19, 0, 0, 0, 0, time.UTC)
	cal := &feed.Calendar{Entries: []feed.Entry{
		{Kind: "sunrise", Title: "Midnight sun: the Sun does not set today", Date: d, Start: d, AllDay: true},
		{Kind: "moonrise", Title: "Moonrise", Date: d, Start: d.Add(20 * time.Hour)},
		{Kind: "daily-summary", Title: "Daylight 24 h", Date: d, Start: d, AllDay: true},
		{Kind: "civil-dawn", Title: "No civil dusk or dawn tonight", Date: d, Start: d, AllDay: true},
		{Kind: "moonset", Title: "Moonset", Date: d, Start: d.Add(21 * time.Hour)},
	}}
	got := days(cal, AdhocQuery{Start: d, Days: 1, Location: time.UTC})
	var kinds []string
	for _, e := range got[0].Entries {
		kinds = append(kinds, e.Kind)
	}
	if want := "sunrise civil-dawn daily-summary moonrise moonset"; strings.Join(kinds, " ") != want {
		t.Errorf("order %v, want %s", kinds, want)
	}
}

// Without a page title the served page carries the default of page.title
// given in docs/configuration.md, the heading of the published index.html
// too.
func TestPageDefaultTitle(t *testing.T) {
	s := builderTestServer(t)
	if html := body(t, get(t, s.Handler(), "GET", "/")); !strings.Contains(html, "<h1>Sun and Moon calendars</h1>") {
		t.Errorf("the page's heading is not the default of page.title")
	}
}

// A table link that cannot be shown (a latitude of 95°, outside −90..90; a
// table of 63 days, over its 62) answers a page in the page's language and
// style that says why and leads back to the builder with its query, with
// the status of the refusal; the builder's own preview /at.json keeps its
// one line of text.
func TestTableErrorPage(t *testing.T) {
	s := builderTestServer(t)
	h := s.Handler()
	for _, tc := range []struct{ query, says string }{
		{"lat=95&lon=10", `parameter lat=&#34;95&#34;: must be within -90..90 (decimal degrees, north positive, south negative`},
		{"lat=47.8&lon=13.05&kinds=sunrise&days=63", "parameter days=&#34;63&#34;"},
	} {
		r := get(t, h, "GET", "/at?"+tc.query)
		b := body(t, r)
		if r.StatusCode != 400 || !strings.HasPrefix(r.Header.Get("Content-Type"), "text/html") || r.Header.Get("Content-Security-Policy") == "" {
			t.Errorf("/at?%s: %d %q (CSP %q), want 400 text/html under the page's policy", tc.query, r.StatusCode, r.Header.Get("Content-Type"), r.Header.Get("Content-Security-Policy"))
		}
		for _, want := range []string{`<html lang="en">`, "<title>This table cannot be shown", `<p class="message">` + tc.says, `<a href="./?` + strings.ReplaceAll(tc.query, "&", "&amp;") + `">`, `href="assets/builder.css"`} {
			if !strings.Contains(b, want) {
				t.Errorf("/at?%s: the page lacks %q:\n%s", tc.query, want, b)
			}
		}
		if strings.Contains(b, "serve: ") {
			t.Errorf("/at?%s: the page says the program's prefix \"serve: \"", tc.query)
		}
		r = get(t, h, "GET", "/at.json?"+tc.query)
		if b := body(t, r); r.StatusCode != 400 || !strings.HasPrefix(r.Header.Get("Content-Type"), "text/plain") || !strings.HasPrefix(b, "serve: parameter ") {
			t.Errorf("/at.json?%s: %d %q %q, want 400 and the plain message", tc.query, r.StatusCode, r.Header.Get("Content-Type"), b)
		}
	}
}

// A table whose computation fails for a reason of the server's own says
// that computing the table failed (with status 500), not the preview; the
// builder's preview /at.json says the preview.
func TestTableInternalErrorNamesTable(t *testing.T) {
	failing := func(context.Context, AdhocQuery) (*feed.Calendar, error) {
		return nil, errors.New("ephemeris out of order")
	}
	s, _ := newTestServer(t, Options{Adhoc: adhocICS, Preview: failing})
	s.now = func() time.Time { return today }
	h := s.Handler()
	const q = "lat=47.8&lon=13.05&kinds=sunrise"
	r := get(t, h, "GET", "/at?"+q)
	if b := body(t, r); r.StatusCode != 500 || !strings.Contains(b, `<p class="message">internal error computing the table`) || strings.Contains(b, "preview") {
		t.Errorf("/at?%s: %d, want 500 and a page saying the table failed:\n%s", q, r.StatusCode, b)
	}
	r = get(t, h, "GET", "/at.json?"+q)
	if b := body(t, r); r.StatusCode != 500 || strings.TrimSpace(b) != "internal error computing the preview" {
		t.Errorf("/at.json?%s: %d %q, want 500 and the preview's message", q, r.StatusCode, b)
	}
}

// The form's field for the horizon names it as the table's heading names
// what it was given: one altitude is the horizon ("horizon 2.5°", as
// `heliocal events` and the configuration's `horizon` say it), points per
// direction a skyline ("skyline 0:2, 90:8 …").
func TestHorizonFieldNamesAsTable(t *testing.T) {
	s := builderTestServer(t)
	h := s.Handler()
	form := body(t, get(t, h, "GET", "/"))
	_, label, _ := strings.Cut(form, `<label for="horizon">`)
	label, _, _ = strings.Cut(label, "</label>")
	for _, given := range []string{"2.5", "90:8,0:2,180:1"} {
		page := body(t, get(t, h, "GET", "/at?lat=47.8&lon=13.05&kinds=sunrise&days=1&horizon="+given))
		_, intro, _ := strings.Cut(page, "Elevation 0 m, ")
		word, _, _ := strings.Cut(intro, " ") // "horizon", "skyline"
		if word == "" || !strings.Contains(strings.ToLower(label), word) {
			t.Errorf("horizon=%s: the table says %q, the form's field %q", given, word, label)
		}
	}
}

// A date on which the clocks change says so in the preview and the table
// page, whose times shift with them; the other dates say nothing. The
// changes of 2027, as zdump (tz database) lists them: America/Havana from
// 23:59:59 CST on 13 March to 01:00:00 CDT on the 14th, and from 00:59:59
// CDT on 7 November to 00:00:00 CST; America/Santiago from 23:59:59 -03 on
// 3 April to 23:00:00 -04 the same date, and from 23:59:59 -04 on
// 4 September to 01:00:00 -03 on the 5th; Australia/Sydney from 02:59:59
// AEDT on 4 April to 02:00:00 AEST, and from 01:59:59 AEST on 3 October to
// 03:00:00 AEDT.
func TestPreviewClockChange(t *testing.T) {
	for _, tc := range []struct {
		zone, start string
		want        []string // the days' clocks from start
	}{
		{"America/Havana", "2027-03-13", []string{"", "Clocks go forward for summer time by 1 h: 00:00 becomes 01:00", ""}},
		{"America/Havana", "2027-11-06", []string{"", "Clocks go back from summer time by 1 h: 01:00 becomes 00:00", ""}},
		{"America/Santiago", "2027-04-02", []string{"", "Clocks go back from summer time by 1 h: 24:00 becomes 23:00", ""}},
		{"America/Santiago", "2027-09-04", []string{"", "Clocks go forward for summer time by 1 h: 00:00 becomes 01:00", ""}},
		{"Australia/Sydney", "2027-04-03", []string{"", "Clocks go back from summer time by 1 h: 03:00 becomes 02:00", ""}},
		{"Australia/Sydney", "2027-10-02", []string{"", "Clocks go forward for summer time by 1 h: 02:00 becomes 03:00", ""}},
		{"UTC", "2027-03-13", []string{"", "", ""}},
		// zdump -v Africa/Monrovia: 23:59:59 MMT (−00:44:30) on 6 January
		// 1972, then 00:44:30 GMT on the 7th: a change not of whole minutes
		{"Africa/Monrovia", "1972-01-06", []string{"", "Clocks go forward by 44 min 30 s: 00:00 becomes 00:44:30", ""}},
		// zdump -v Europe/Zurich: no change from 28 October 2040 to 31
		// March 2041; Go's ZoneBounds gives 31 December 2040 as a bound
		// for the whole of that day, which once held the table forever
		{"Europe/Zurich", "2040-12-30", []string{"", "", ""}},
		// zdump -v Pacific/Apia: 23:59:59 -10 on 29 December 2011, then
		// 00:00:00 +14 on the 31st (isdst=1 on both sides); the 30th has
		// no instant
		{"Pacific/Apia", "2011-12-29", []string{"",
			"This date is skipped: the clocks go forward for summer time by 24 h, 24:00 on Thu 29 Dec becomes 00:00 on Sat 31 Dec",
			"Clocks go forward for summer time by 24 h: 24:00 on Thu 29 Dec becomes 00:00 on Sat 31 Dec", ""}},
	} {
		loc, err := time.LoadLocation(tc.zone)
		if err != nil {
			t.Fatal(err)
		}
		start, _ := time.Parse(time.DateOnly, tc.start)
		got := days(&feed.Calendar{}, AdhocQuery{Start: start, Days: len(tc.want), Location: loc})
		for i, want := range tc.want {
			if got[i].Clocks != want {
				t.Errorf("%s, %s: clocks %q, want %q", tc.zone, got[i].Date, got[i].Clocks, want)
			}
		}
	}
	// the table page and the preview carry it
	h := builderTestServer(t).Handler()
	q := "lat=23.11&lon=-82.41&tz=America/Havana&kinds=sunset&days=2&start=2027-03-13"
	if b := body(t, get(t, h, "GET", "/at?"+q)); strings.Count(b, `<p class="clocks">`) != 1 ||
		!strings.Contains(b, `<p class="clocks">Clocks go forward for summer time by 1`+"\u00a0"+`h: 00:00 becomes 01:00</p>`) {
		t.Errorf("the table page does not say the clocks change on 14 March 2027 once:\n%s", b)
	}
	var res previewResult
	if err := json.Unmarshal([]byte(body(t, get(t, h, "GET", "/at.json?"+q))), &res); err != nil {
		t.Fatal(err)
	}
	if len(res.Days) != 2 || res.Days[0].Clocks != "" || res.Days[1].Clocks != "Clocks go forward for summer time by 1 h: 00:00 becomes 01:00" {
		t.Errorf("/at.json days %+v, want the clocks said on 2027-03-14 only", res.Days)
	}
}

// The page, its files, its preview and the table (a refusal too) go
// gzip-compressed to a client that accepts it, as the feeds do: behind the
// shipped nginx site, which compresses nothing itself (deploy/nginx), they
// went as they are. The compressed bytes are the same page, and a client
// that does not take gzip gets it as it is; a page's own file revalidates
// with the ETag of the form it got.
func TestPagesGzipped(t *testing.T) {
	h := builderTestServer(t).Handler()
	q := "lat=47.5&lon=13.05&tz=Europe/Vienna&kinds=sunrise,sunset&start=2026-06-21"
	for _, tc := range []struct {
		path string
		code int
	}{
		{"/", 200}, {"/at.json?" + q, 200}, {"/at?" + q, 200}, {"/at?lat=95&lon=13", 400},
		{"/assets/builder.js", 200}, {"/assets/builder.css", 200},
	} {
		plainRes := get(t, h, "GET", tc.path)
		want := body(t, plainRes)
		if plainRes.StatusCode != tc.code || plainRes.Header.Get("Content-Encoding") != "" || plainRes.Header.Get("Vary") != "Accept-Encoding" {
			t.Errorf("%s without gzip: %d, Content-Encoding %q, Vary %q; want %d, none, Accept-Encoding", tc.path, plainRes.StatusCode,
				plainRes.Header.Get("Content-Encoding"), plainRes.Header.Get("Vary"), tc.code)
		}
		r := get(t, h, "GET", tc.path, "Accept-Encoding", "gzip, deflate, br")
		gz := body(t, r)
		if r.StatusCode != tc.code || r.Header.Get("Content-Encoding") != "gzip" || r.Header.Get("Vary") != "Accept-Encoding" ||
			r.Header.Get("Content-Length") != strconv.Itoa(len(gz)) {
			t.Errorf("%s with gzip: %d, Content-Encoding %q, Vary %q, Content-Length %q of %d bytes; want %d, gzip", tc.path, r.StatusCode,
				r.Header.Get("Content-Encoding"), r.Header.Get("Vary"), r.Header.Get("Content-Length"), len(gz), tc.code)
			continue
		}
		zr, err := gzip.NewReader(strings.NewReader(gz))
		if err != nil {
			t.Fatalf("%s: %v", tc.path, err)
		}
		got, err := io.ReadAll(zr)
		if err != nil || string(got) != want || len(gz) >= len(want) {
			t.Errorf("%s: %d compressed bytes (%v) inflate to %d bytes, want the %d of the page as it is", tc.path, len(gz), err, len(got), len(want))
		}
		if etag := r.Header.Get("Etag"); strings.HasPrefix(tc.path, "/assets/") {
			if etag == plainRes.Header.Get("Etag") || !strings.HasSuffix(etag, `-gz"`) {
				t.Errorf("%s: the gzip form's ETag %s, the other's %s; want one of its own", tc.path, etag, plainRes.Header.Get("Etag"))
			}
			if r := get(t, h, "GET", tc.path, "Accept-Encoding", "gzip", "If-None-Match", etag); r.StatusCode != http.StatusNotModified {
				t.Errorf("%s: revalidating the gzip form: %d, want 304", tc.path, r.StatusCode)
			}
		}
	}
}

// A time in the hour the clocks show twice, when they go back, is followed
// by its zone's label in the preview and the table page, as the feeds'
// descriptions write every time, so that its two passes read apart; the
// other times, those around a change forward too, are shown alone. The
// changes of 2027 as zdump (tz database) lists them: America/Havana from
// 00:59:59 CDT on 7 November to 00:00:00 CST, and from 23:59:59 CST on
// 13 March to 01:00:00 CDT on the 14th; America/Santiago from 23:59:59 -03
// on 3 April to 23:00:00 -04; Australia/Lord_Howe from 01:59:59 +11 on
// 4 April to 01:30:00 +1030.
func TestPreviewRepeatedHour(t *testing.T) {
	u := func(s string) time.Time { t, _ := time.Parse(time.RFC3339, s); return t }
	for _, tc := range []struct {
		zone, row   string
		start, end  string // UTC; end "" for an instant
		when, time_ string
	}{
		{"America/Havana", "2027-11-06", "2027-11-07T03:59:00Z", "", "23:59", "23:59"},
		{"America/Havana", "2027-11-07", "2027-11-07T04:00:00Z", "", "00:00 CDT", "00:00"},
		{"America/Havana", "2027-11-07", "2027-11-07T04:48:00Z", "", "00:48 CDT", "00:48"},
		{"America/Havana", "2027-11-07", "2027-11-07T05:48:00Z", "", "00:48 CST", "00:48"},
		{"America/Havana", "2027-11-07", "2027-11-07T06:00:00Z", "", "01:00", "01:00"},
		{"America/Havana", "2027-11-07", "2027-11-07T04:30:00Z", "2027-11-07T05:20:00Z", "00:30 CDT–00:20 CST", "00:30"},
		{"America/Havana", "2027-11-06", "2027-11-07T04:10:00Z", "2027-11-07T10:21:00Z", "Sun 00:10 CDT–05:21", "00:10"},
		{"America/Havana", "2027-11-06", "2027-11-06T23:10:00Z", "2027-11-07T05:05:00Z", "19:10–Sun 00:05 CST", "19:10"},
		{"America/Havana", "2027-03-14", "2027-03-14T05:00:00Z", "", "01:00", "01:00"},
		{"America/Havana", "2027-03-13", "2027-03-14T04:59:00Z", "", "23:59", "23:59"},
		{"America/Santiago", "2027-04-03", "2027-04-04T02:30:00Z", "", "23:30 UTC−03", "23:30"},
		{"America/Santiago", "2027-04-03", "2027-04-04T03:30:00Z", "", "23:30 UTC−04", "23:30"},
		{"America/Santiago", "2027-04-03", "2027-04-04T01:59:00Z", "", "22:59", "22:59"},
		{"Australia/Lord_Howe", "2027-04-04", "2027-04-03T14:45:00Z", "", "01:45 UTC+11", "01:45"},
		{"Australia/Lord_Howe", "2027-04-04", "2027-04-03T15:15:00Z", "", "01:45 UTC+10:30", "01:45"},
		{"Australia/Lord_Howe", "2027-04-04", "2027-04-03T14:20:00Z", "", "01:20", "01:20"},
		{"Australia/Lord_Howe", "2027-04-04", "2027-04-03T15:30:00Z", "", "02:00", "02:00"},
	} {
		loc, err := time.LoadLocation(tc.zone)
		if err != nil {
			t.Fatal(err)
		}
		row, _ := time.Parse(time.DateOnly, tc.row)
		e := feed.Entry{Kind: "moonset", Title: "Moonset", Date: row, Start: u(tc.start)}
		if tc.end != "" {
			e.Kind, e.Title, e.End = "dark-window", "Dark sky", u(tc.end)
		}
		got := days(&feed.Calendar{Entries: []feed.Entry{e}}, AdhocQuery{Start: row, Days: 1, Location: loc})
		if len(got[0].Entries) != 1 {
			t.Fatalf("%s %s: entries %+v", tc.zone, tc.start, got[0].Entries)
		}
		if pe := got[0].Entries[0]; pe.When != tc.when || pe.Time != tc.time_ {
			t.Errorf("%s, %s: when %q, time %q; want %q, %q", tc.zone, tc.start, pe.When, pe.Time, tc.when, tc.time_)
		}
	}
}

// The two passes of a reading the clocks show twice have the same time and
// end in /at.json; start_utc and end_utc, the instants as the events
// listing's JSON writes them, tell them apart for a script. America/Havana
// goes back from 00:59:59 CDT (UTC−4) to 00:00:00 CST (UTC−5) on
// 7 November 2027, as zdump (tz database) lists it: 00:48 is 04:48 UTC,
// then 05:48 UTC.
func TestPreviewInstantsInUTC(t *testing.T) {
	havana, err := time.LoadLocation("America/Havana")
	if err != nil {
		t.Fatal(err)
	}
	row, _ := time.Parse(time.DateOnly, "2027-11-07")
	at := func(s string) time.Time { t, _ := time.Parse(time.RFC3339Nano, s); return t }
	cal := &feed.Calendar{Entries: []feed.Entry{
		{Kind: "moonset", Title: "Moonset", Date: row, Start: at("2027-11-07T04:48:12.3456Z")},
		{Kind: "dark-window", Title: "Dark sky", Date: row, Start: at("2027-11-07T05:47:43.2104Z"), End: at("2027-11-07T10:21:00Z")},
		{Kind: "moon-phases", Title: "Full Moon", Date: row, AllDay: true},
	}}
	b, err := json.Marshal(days(cal, AdhocQuery{Start: row, Days: 1, Location: havana}))
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{
		`"time":"00:48","when":"00:48 CDT","start_utc":"2027-11-07T04:48:12.346Z"`,
		`"time":"00:48","end":"05:21","when":"00:48 CST–05:21","start_utc":"2027-11-07T05:47:43.210Z","end_utc":"2027-11-07T10:21:00.000Z"`,
		`{"kind":"moon-phases","title":"Full Moon"}`, // an all-day entry has no instant
	} {
		if !strings.Contains(string(b), want) {
			t.Errorf("/at.json's day lacks %s:\n%s", want, b)
		}
	}
}

// TestLinksEscapeZone: the zone found at sea west of 172.5° W is
// Etc/GMT+12 (the tz database's zones at sea are named with the sign
// reversed: UTC−12). A "+" in a query string is a space, so the subscribe
// and table links write it %2B; fetched, they are the feed and the table
// of that zone, and the feed's id is the one the unescaped query gives.
func TestLinksEscapeZone(t *testing.T) {
	s := builderTestServer(t)
	res := previewOf(t, s, "lat=0&lon=-177.5&kinds=sunrise")
	if res.Zone != "Etc/GMT+12" {
		t.Fatalf("zone %q, want Etc/GMT+12 at sea at 177.5° W", res.Zone)
	}
	for _, link := range []string{res.HTTPS, res.Page} {
		if !strings.Contains(link, "&tz=Etc/GMT%2B12&") {
			t.Errorf("link %q: want the zone written tz=Etc/GMT%%2B12", link)
		}
		r := get(t, s.Handler(), "GET", strings.TrimPrefix(link, "http://example.com"))
		if m := body(t, r); r.StatusCode != 200 {
			t.Errorf("GET %s: %d %.200q, want 200", link, r.StatusCode, m)
		}
	}
	// a link written by hand with the "+" as it is: told how to write it
	r := get(t, s.Handler(), "GET", "/at.ics?lat=0&lon=-177.5&kinds=sunrise&tz=Etc/GMT+12")
	if m, want := body(t, r), `parameter tz="Etc/GMT 12": unknown time zone (a "+" in a link is read as a space: for Etc/GMT+12 write tz=Etc/GMT%2B12)`; r.StatusCode != 400 || !strings.Contains(m, want) {
		t.Errorf("tz=Etc/GMT+12: %d %q, want 400 saying %q", r.StatusCode, m, want)
	}
	lim := testLimits()
	q, err := parseAdhoc("lat=0&lon=-177.5&kinds=sunrise&tz=Etc/GMT%2B12", today, lim)
	if err != nil {
		t.Fatal(err)
	}
	if got := q.linkPlace(); strings.Replace(got, "%2B", "+", 1) != q.place() {
		t.Errorf("linkPlace %q differs from place %q by more than the zone's +", got, q.place())
	}
}

// A UTC offset given as tz is told the zone in force at the query's
// coordinates, as a site's timezone is in the configuration: "+12:45" at
// the Chatham Islands is Pacific/Chatham (the tz database's zone1970.tab:
// NZ, -4357-17633), which also keeps summer time (+13:45).
func TestAdhocOffsetZoneNamesZoneAtPlace(t *testing.T) {
	s := builderTestServer(t)
	r := get(t, s.Handler(), "GET", "/at.ics?lat=-43.95&lon=-176.56&kinds=sunrise&tz=%2B12:45")
	want := `parameter tz="+12:45": unknown time zone (a UTC offset is not a time zone: the zone at the place's latitude and longitude is "Pacific/Chatham", which follows its clock changes)`
	if m := body(t, r); r.StatusCode != 400 || !strings.Contains(m, want) {
		t.Errorf("tz=+12:45: %d %q, want 400 saying %q", r.StatusCode, m, want)
	}
}

// The preview, the table and the builder refuse a start whose seven days
// (previewDays, days not given) run past the last supported date, and say
// so with the start that fits: 2200-12-31 + 6 days = 2201-01-06,
// 2200-12-31 − 6 days = 2200-12-25 (Gregorian calendar).
func TestPreviewStartPastLastDate(t *testing.T) {
	s := builderTestServer(t)
	want := `start=%q: the window of 7 days (days not given) from it ends 2201-01-06, past the supported dates 1800-01-01..2200-12-31: start 2200-12-25 at the latest, or ask fewer days`
	want = fmt.Sprintf(want, "2200-12-31")
	r := get(t, s.Handler(), "GET", "/at.json?lat=48.2&lon=16.4&kinds=sunrise&start=2200-12-31")
	if m := body(t, r); r.StatusCode != 400 || !strings.Contains(m, want) {
		t.Errorf("/at.json: %d %q, want 400 and %q", r.StatusCode, m, want)
	}
	escaped := html.EscapeString(want)
	for _, path := range []string{"/at?lat=48.2&lon=16.4&kinds=sunrise&start=2200-12-31", "/?lat=48.2&lon=16.4&kinds=sunrise&start=2200-12-31"} {
		if m := body(t, get(t, s.Handler(), "GET", path)); !strings.Contains(m, escaped) {
			t.Errorf("%s: no %q in the page", path, escaped)
		}
	}
	if r := get(t, s.Handler(), "GET", "/at.json?lat=48.2&lon=16.4&kinds=sunrise&start=2200-12-25"); r.StatusCode != 200 {
		t.Errorf("start=2200-12-25: status %d, want 200", r.StatusCode)
	}
}
