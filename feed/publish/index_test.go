package publish

import (
	"context"
	"encoding/xml"
	"errors"
	"fmt"
	"io"
	"math"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"heliocal/feed"
)

// element is a parsed XML element with its text, for looking things up.
type element struct {
	Name     string
	Attr     map[string]string
	Text     string
	Children []*element
}

// parseStrict parses a document as strict XML: every element closed, every
// entity known, attributes quoted. The index page is written to pass this.
func parseStrict(t *testing.T, data []byte) *element {
	t.Helper()
	d := xml.NewDecoder(strings.NewReader(string(data)))
	d.Strict = true
	root := &element{Name: "#document"}
	stack := []*element{root}
	for {
		tok, err := d.Token()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			line, col := d.InputPos()
			t.Fatalf("not well-formed at %d:%d: %v", line, col, err)
		}
		top := stack[len(stack)-1]
		switch tok := tok.(type) {
		case xml.StartElement:
			e := &element{Name: tok.Name.Local, Attr: map[string]string{}}
			for _, a := range tok.Attr {
				e.Attr[a.Name.Local] = a.Value
			}
			top.Children = append(top.Children, e)
			stack = append(stack, e)
		case xml.EndElement:
			stack = stack[:len(stack)-1]
		case xml.CharData:
			top.Text += string(tok)
		}
	}
	if len(stack) != 1 {
		t.Fatalf("%d elements left open", len(stack)-1)
	}
	return root
}

func (e *element) all(name string) []*element {
	var out []*element
	var walk func(*element)
	walk = func(x *element) {
		for _, c := range x.Children {
			if c.Name == name {
				out = append(out, c)
			}
			walk(c)
		}
	}
	walk(e)
	return out
}

// charts are the year charts drawn in one class of geometry: "desk" (a
// tablet, a desk, paper) or "ph" (a phone).
func (e *element) charts(class string) []*element {
	var out []*element
	for _, svg := range e.all("svg") {
		if svg.Attr["class"] == class {
			out = append(out, svg)
		}
	}
	return out
}

func (e *element) text() string {
	s := e.Text
	for _, c := range e.Children {
		s += c.text()
	}
	return s
}

func renderIndexFor(t *testing.T, opts RenderOptions, cals []*feed.Calendar) []byte {
	t.Helper()
	b, err := Render(context.Background(), Calendars(cals...), opts)
	if err != nil {
		t.Fatal(err)
	}
	f := b.File(IndexName)
	if f == nil || f.ContentType != ContentTypeHTML {
		t.Fatalf("no index.html in the bundle: %+v", f)
	}
	return f.Data
}

func TestIndexPage(t *testing.T) {
	cals := testCalendars(t, "")
	cals[0].Title = `Sunrise & "first light" <b>`
	opts := testOptions()
	opts.Charts = func(_ context.Context, s feed.Site, _ []Trimmed) (*SiteChart, error) { return usnoChart(t, s), nil }
	page := renderIndexFor(t, opts, cals)
	doc := parseStrict(t, page)
	html := string(page)

	if strings.Contains(html, "<script") || strings.Contains(html, `src="http`) || strings.Contains(html, `<link `) {
		t.Error("the page loads a script or an external asset")
	}
	if !strings.Contains(html, "Sunrise &amp; &#34;first light&#34; &lt;b&gt;") {
		t.Error("the feed title is not escaped")
	}
	// Both link kinds for every feed.
	var https, webcal []string
	for _, a := range doc.all("a") {
		switch h := a.Attr["href"]; {
		case strings.HasPrefix(h, "https://sky.example.org/cal/"):
			https = append(https, h)
		case strings.HasPrefix(h, "webcal://sky.example.org/cal/"):
			webcal = append(webcal, h)
		}
	}
	if len(https) != 3 || len(webcal) != 3 {
		t.Errorf("links: https %v, webcal %v; want 3 of each", https, webcal)
	}
	if !contains(webcal, "webcal://sky.example.org/cal/ice-camp-sun.ics") {
		t.Errorf("webcal links %v", webcal)
	}
	// Grouped by site, with name, coordinates and zone.
	sections := doc.all("section")
	if len(sections) != 2 {
		t.Fatalf("%d site sections, want 2", len(sections))
	}
	first := sections[0].text()
	for _, s := range []string{"Cayuga Ridge Orchard", "42.4500° N, 76.5000° W", "America/New_York", "orchard-sunrise", "orchard-sunset"} {
		if !strings.Contains(first, s) {
			t.Errorf("orchard section lacks %q", s)
		}
	}
	if strings.Contains(first, "ice-camp-sun") {
		t.Error("the ice camp's feed is listed under the orchard")
	}
	for _, figure := range doc.all("figure") {
		if desk, ph := len(figure.charts("desk")), len(figure.charts("ph")); desk != 1 || ph != 1 {
			t.Errorf("a figure of %d wide and %d phone charts, want one of each", desk, ph)
		}
	}
	if got := len(doc.charts("desk")); got != 2 {
		t.Errorf("%d charts, want one per site", got)
	}
	// The caution, whole.
	var caution string
	for _, a := range doc.all("aside") {
		caution += a.text()
	}
	for _, s := range []string{"not official", "hunting hours", "aviation night", "lighting-up times", "local regulations", "Never look at the Sun"} {
		if !strings.Contains(caution, s) {
			t.Errorf("caution lacks %q", s)
		}
	}

	// Over MaxCharts sites, no charts, and the page says so.
	opts.MaxCharts = 1
	page = renderIndexFor(t, opts, cals)
	if n := len(parseStrict(t, page).all("svg")); n != 0 || !strings.Contains(string(page), "2 sites are more than this page draws (1)") {
		t.Errorf("MaxCharts 1 with 2 sites: %d charts", n)
	}
	opts.MaxCharts = 0

	// Without a base URL: relative links, and no webcal (it needs a host).
	opts.BaseURL = ""
	doc = parseStrict(t, renderIndexFor(t, opts, cals))
	for _, a := range doc.all("a") {
		h := a.Attr["href"]
		if strings.Contains(h, "://") || strings.HasPrefix(h, "webcal:") {
			t.Errorf("link %q without a base URL", h)
		}
	}
	if !contains(hrefs(doc), "orchard-sunrise.ics") {
		t.Errorf("no relative link to orchard-sunrise.ics in %v", hrefs(doc))
	}
}

func hrefs(doc *element) []string {
	var out []string
	for _, a := range doc.all("a") {
		out = append(out, a.Attr["href"])
	}
	return out
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// usnoChart is a year's chart built with Above from the USNO rows of site s
// (only the dates the table lists; enough for the shape of the chart).
func usnoChart(t *testing.T, s feed.Site) *SiteChart {
	t.Helper()
	type day struct {
		rise, set   time.Time
		up, hasRows bool
	}
	days := map[time.Time]*day{}
	for _, r := range loadUSNO(t) {
		if r.Lat != s.Latitude {
			continue
		}
		d := days[r.Date]
		if d == nil {
			d = &day{}
			days[r.Date] = d
		}
		switch r.Kind {
		case "sunrise":
			d.rise = r.At
		case "sunset":
			d.set = r.At
		case "polar_day":
			d.up = true
		}
	}
	c := &SiteChart{
		Marks:  []Mark{{At: time.Date(2015, 3, 20, 22, 45, 0, 0, time.UTC), Label: "March equinox"}},
		Levels: []Level{{Length: 12 * time.Hour, Label: "12 h photoperiod"}},
	}
	first := time.Date(2015, 1, 1, 0, 0, 0, 0, time.UTC)
	for d := first; d.Year() == 2015; d = d.AddDate(0, 0, 1) {
		cd := ChartDay{Date: d}
		if x := days[d]; x != nil {
			start := time.Date(d.Year(), d.Month(), d.Day(), 0, 0, 0, 0, s.Location)
			end := start.AddDate(0, 0, 1)
			var rising, setting []time.Time
			if !x.rise.IsZero() {
				rising = append(rising, x.rise)
			}
			if !x.set.IsZero() {
				setting = append(setting, x.set)
			}
			cd.Daylight = Above(start, end, rising, setting, x.up)
			if !x.rise.IsZero() {
				cd.Rise, cd.HasRise = x.rise.Sub(start), true
			}
			if !x.set.IsZero() {
				cd.Set, cd.HasSet = x.set.Sub(start), true
			}
			cd.Civil, cd.Nautical, cd.Astronomical = cd.Daylight, cd.Daylight, cd.Daylight
		}
		c.Days = append(c.Days, cd)
	}
	return c
}

// Day lengths at 80° N, 0° in 2015 from the USNO one-year table 'Rise and
// Set for the Sun' (Universal Time), rows of testdata/usno-sun-2015.csv.
func TestAboveUSNO80North(t *testing.T) {
	tests := []struct {
		ids  string
		date string
		want time.Duration
	}{
		{"sun-0163/0164", "2015-03-20", 12*time.Hour + 30*time.Minute}, // 05:55 to 18:25
		{"sun-0167/0168", "2015-04-13", 23*time.Hour + 2*time.Minute},  // rises 00:58, no set
		{"sun-0169", "2015-04-14", 24 * time.Hour},                     // **** (polar day)
		{"sun-0171/0172", "2015-08-30", 23*time.Hour + 1*time.Minute},  // no rise, sets 23:01
		{"sun-0173/0174", "2015-08-31", 21*time.Hour + 33*time.Minute}, // 01:02 to 22:35
		{"sun-0179/0180", "2015-10-21", 1*time.Hour + 22*time.Minute},  // 11:02 to 12:24
		{"sun-0182", "2015-12-21", 0},                                  // ---- (polar night)
	}
	_, camp := testSites(t)
	chart := usnoChart(t, camp)
	for _, tc := range tests {
		d, _ := time.Parse("2006-01-02", tc.date)
		got := chart.Days[d.YearDay()-1]
		if got.Daylight != tc.want {
			t.Errorf("USNO %s, %s: Above = %v, want %v", tc.ids, tc.date, got.Daylight, tc.want)
		}
	}
	// A set before the rise counts both ends of the day.
	d0 := time.Date(2015, 8, 30, 0, 0, 0, 0, time.UTC)
	if got := Above(d0, d0.Add(24*time.Hour), []time.Time{d0.Add(2 * time.Hour)}, []time.Time{d0.Add(time.Hour)}, false); got != 23*time.Hour {
		t.Errorf("set 01:00, rise 02:00: %v, want 23h", got)
	}
	// Two sets and a rise in one day (the Sun dips below the limit around
	// local midnight at the end of a polar day): above 00:00-00:30 and
	// 02:00-23:40.
	if got := Above(d0, d0.Add(24*time.Hour), []time.Time{d0.Add(2 * time.Hour)},
		[]time.Time{d0.Add(30 * time.Minute), d0.Add(23*time.Hour + 40*time.Minute)}, false); got != 22*time.Hour+10*time.Minute {
		t.Errorf("two sets and a rise: %v, want 22h10m", got)
	}
}

// polygonYs returns the y of each interior point of a band polygon, by x.
func polygonPoints(t *testing.T, pts string) [][2]float64 {
	t.Helper()
	var out [][2]float64
	for _, p := range strings.Fields(pts) {
		x, y, ok := strings.Cut(p, ",")
		if !ok {
			t.Fatalf("bad point %q", p)
		}
		fx, err1 := strconv.ParseFloat(x, 64)
		fy, err2 := strconv.ParseFloat(y, 64)
		if err1 != nil || err2 != nil {
			t.Fatalf("bad point %q", p)
		}
		out = append(out, [2]float64{fx, fy})
	}
	return out
}

// The chart of a polar site: the sunrise and sunset curves on the clock,
// broken through the polar day and night, the photoperiod threshold crossing,
// the eclipse-style marks, today and the Moon's phases, inside the plot.
func TestChartPolarDayAndNight(t *testing.T) {
	_, camp := testSites(t)
	c := usnoChart(t, camp)
	c.Today = time.Date(2015, 3, 20, 0, 0, 0, 0, time.UTC)
	// New Moon 2015-03-20 09:36 UTC and full Moon 2015-04-04 12:06 UTC, the
	// Moons of that spring's solar and lunar eclipses (from memory; the
	// test needs only their dates).
	c.Phases = []Phase{{At: time.Date(2015, 3, 20, 9, 36, 0, 0, time.UTC)}, {At: time.Date(2015, 4, 4, 12, 6, 0, 0, time.UTC), Full: true}}
	// Give the polar stretch its real extent: USNO marks 14 April as ****
	// and 21 December as ----; fill the weeks around them the same way.
	for i := range c.Days {
		d := c.Days[i].Date
		switch {
		case d.After(time.Date(2015, 4, 14, 0, 0, 0, 0, time.UTC)) && d.Before(time.Date(2015, 8, 29, 0, 0, 0, 0, time.UTC)):
			c.Days[i].Daylight, c.Days[i].Civil = 24*time.Hour, 25*time.Hour
			c.Days[i].HasRise, c.Days[i].HasSet = false, false
		case d.After(time.Date(2015, 10, 26, 0, 0, 0, 0, time.UTC)) || d.Before(time.Date(2015, 2, 15, 0, 0, 0, 0, time.UTC)):
			c.Days[i].Daylight, c.Days[i].Civil = 0, -time.Hour
			c.Days[i].HasRise, c.Days[i].HasSet = false, false
		}
	}
	opts := testOptions()
	opts.Charts = func(_ context.Context, s feed.Site, _ []Trimmed) (*SiteChart, error) {
		if s.ID == camp.ID {
			return c, nil
		}
		return nil, nil // no chart for the other site
	}
	doc := parseStrict(t, renderIndexFor(t, opts, testCalendars(t, "")))
	svgs := doc.charts("desk")
	if len(svgs) != 1 {
		t.Fatalf("%d charts, want 1 (the other site has none)", len(svgs))
	}
	svg := svgs[0]
	if svg.Attr["viewBox"] != "0 0 760 318" {
		t.Errorf("viewBox %q", svg.Attr["viewBox"])
	}
	if title := svg.all("title")[0].text(); svg.Attr["role"] != "img" || !strings.HasPrefix(title, "Sunrise and sunset at Driftwood Ice Camp") {
		t.Errorf("role %q, title %q", svg.Attr["role"], title)
	}
	paths := map[string]string{}
	for _, p := range svg.all("path") {
		paths[p.Attr["class"]] = p.Attr["d"]
	}
	step := float64(plotW) / float64(len(c.Days))
	xOf := func(date string) string {
		d, _ := time.Parse("2006-01-02", date)
		return num(plotLeft + (float64(d.YearDay()-1)+0.5)*step)
	}
	// Sunrise 05:55 and sunset 18:25 on 20 March (USNO, sun-0163/0164).
	for _, x := range []struct{ class, point string }{
		{"rise", xOf("2015-03-20") + "," + num(yOf(5+55.0/60))},
		{"set", xOf("2015-03-20") + "," + num(yOf(18+25.0/60))},
	} {
		if !strings.Contains(paths[x.class], x.point) {
			t.Errorf("%s curve %q lacks the point %s", x.class, paths[x.class], x.point)
		}
	}
	// No sunrise in the polar day or night: the curve has no point there
	// and is broken into pieces.
	for _, date := range []string{"2015-06-21", "2015-12-21"} {
		if strings.Contains(paths["rise"], xOf(date)+",") {
			t.Errorf("rise curve has a point on %s", date)
		}
	}
	if strings.Count(paths["rise"], "M") < 2 {
		t.Errorf("rise curve not broken: %q", paths["rise"])
	}
	for _, f := range strings.FieldsFunc(paths["rise"]+" "+paths["set"], func(r rune) bool { return r == ' ' || r == 'M' || r == 'L' }) {
		x, y, _ := strings.Cut(f, ",")
		fx, _ := strconv.ParseFloat(x, 64)
		fy, _ := strconv.ParseFloat(y, 64)
		if fx < plotLeft || fx > plotLeft+plotW || fy < plotTop || fy > plotBottom {
			t.Errorf("curve point %s outside the plot", f)
		}
	}
	var markX, todayX string
	var thr []string
	for _, l := range svg.all("line") {
		switch l.Attr["class"] {
		case "mark":
			markX = l.Attr["x1"]
		case "thr":
			thr = append(thr, l.Attr["x1"])
		case "today":
			todayX = l.Attr["x1"]
		}
	}
	wantX := plotLeft + float64(plotW)*(78+22.75/24)/365
	if x, _ := strconv.ParseFloat(markX, 64); math.Abs(x-wantX) > 0.1 {
		t.Errorf("equinox mark at x=%s, want %.1f", markX, wantX)
	}
	if todayX != xOf("2015-03-20") {
		t.Errorf("today at x=%q, want %s", todayX, xOf("2015-03-20"))
	}
	// The dates before today are shaded, from the plot's left edge to the
	// start of today's column.
	var pastW string
	for _, r := range svg.all("rect") {
		if r.Attr["class"] == "past" {
			pastW = r.Attr["width"]
		}
	}
	if pastW != num(78*step) {
		t.Errorf("shade before today %q wide, want %s (78 days)", pastW, num(78*step))
	}
	// The day length reaches 12 h on 20 March (12 h 30 min, after a date
	// with no row) and drops under it again.
	if want := num(plotLeft + 78*step); !slices.Contains(thr, want) {
		t.Errorf("threshold lines at %v, none at %s (20 Mar)", thr, want)
	}
	var full, newMoon int
	for _, cl := range svg.all("circle") {
		switch cl.Attr["class"] {
		case "moon full":
			full++
		case "moon":
			newMoon++
		}
	}
	if full != 1 || newMoon != 1 {
		t.Errorf("%d full and %d new Moon symbols, want 1 and 1", full, newMoon)
	}
	text := doc.all("figure")[0].text() // the chart and its caption
	for _, s := range []string{"Sunrise and sunset at Driftwood Ice Camp <North>, 2015", "March equinox", "12 h ↑",
		"Day length reaches 12 h on 20 Mar (12 h photoperiod)", "today", "full Moon, 4 Apr", "new Moon, 20 Mar",
		"The Sun stays up all day on", "It stays down all day on"} {
		if !strings.Contains(text, s) {
			t.Errorf("chart text lacks %q", s)
		}
	}
}

// A phone draws its own chart of the year in place of the wide one: on a
// 390 px phone (371 px wide inside the page's padding) the wide chart's
// plot was 117 px tall, the day-length curves and lamp strokes crowded into
// it; the phone's plot is at least 300 px tall, holds the same points (the
// USNO sunrise and sunset of 20 March) and draws its lines without the
// labels it has no room for (their tooltips and the caption keep them).
func TestChartPhoneGeometry(t *testing.T) {
	_, camp := testSites(t)
	c := usnoChart(t, camp)
	c.Today = time.Date(2015, 3, 20, 0, 0, 0, 0, time.UTC)
	opts := testOptions()
	opts.Charts = func(_ context.Context, s feed.Site, _ []Trimmed) (*SiteChart, error) {
		if s.ID == camp.ID {
			return c, nil
		}
		return nil, nil
	}
	page := renderIndexFor(t, opts, testCalendars(t, ""))
	doc := parseStrict(t, page)
	phones := doc.charts("ph")
	if len(phones) != 1 {
		t.Fatalf("%d phone charts, want 1", len(phones))
	}
	svg := phones[0]
	var vb [4]float64
	if _, err := fmt.Sscanf(svg.Attr["viewBox"], "%g %g %g %g", &vb[0], &vb[1], &vb[2], &vb[3]); err != nil {
		t.Fatalf("viewBox %q: %v", svg.Attr["viewBox"], err)
	}
	var plot *element
	for _, r := range svg.all("rect") {
		if r.Attr["class"] == "plot" {
			plot = r
		}
	}
	if plot == nil {
		t.Fatal("the phone chart has no plot")
	}
	at := func(k string) float64 { v, _ := strconv.ParseFloat(plot.Attr[k], 64); return v }
	scale := 371 / vb[2]
	if h := at("height") * scale; h < 300 {
		t.Errorf("viewBox %q, plot %g units tall: %.0f px on a 390 px phone, want at least 300", svg.Attr["viewBox"], at("height"), h)
	}
	if at("x") < 0 || at("y") < 0 || at("x")+at("width") > vb[2] || at("y")+at("height") > vb[3] {
		t.Errorf("plot %v outside the viewBox %q", plot.Attr, svg.Attr["viewBox"])
	}
	if title := svg.all("title")[0].text(); svg.Attr["role"] != "img" || !strings.HasPrefix(title, "Sunrise and sunset at Driftwood Ice Camp") {
		t.Errorf("role %q, title %q", svg.Attr["role"], title)
	}
	paths := map[string]string{}
	for _, p := range svg.all("path") {
		paths[p.Attr["class"]] = p.Attr["d"]
	}
	x := num(phone.Left + (78+0.5)*phone.dayStep(len(c.Days))) // 20 March, the 79th day
	// Sunrise 05:55 and sunset 18:25 on 20 March (USNO, sun-0163/0164).
	for class, h := range map[string]float64{"rise": 5 + 55.0/60, "set": 18 + 25.0/60} {
		if p := x + "," + num(phone.yOf(h)); !strings.Contains(paths[class], p) {
			t.Errorf("phone %s curve lacks the point %s", class, p)
		}
	}
	lines := map[string]int{}
	for _, l := range svg.all("line") {
		lines[l.Attr["class"]]++
	}
	if lines["mark"] != 1 || lines["thr"] == 0 || lines["today"] != 1 {
		t.Errorf("phone chart lines %v, want the equinox, the threshold crossings and today", lines)
	}
	for _, tx := range svg.all("text") {
		if cl := tx.Attr["class"]; cl == "ml" || cl == "tl" || cl == "tdl" || len(tx.Children) > 0 {
			t.Errorf("phone chart draws the label %q (class %q), which it has no room for", tx.text(), cl)
		}
	}
	if !strings.Contains(string(page), "@media (max-width:28rem){svg.desk{display:none}svg.ph{display:block") {
		t.Error("the page's style does not show the phone chart in place of the wide one on a phone")
	}
}

// A clock time that passes midnight from one day to the next breaks the
// curve instead of drawing a line across the plot.
func TestCurveBreaksAtMidnight(t *testing.T) {
	d0 := time.Date(2015, 7, 28, 0, 0, 0, 0, time.UTC)
	days := []ChartDay{
		{Date: d0, Set: 23*time.Hour + 50*time.Minute, HasSet: true},
		{Date: d0.AddDate(0, 0, 1), Set: 10 * time.Minute, HasSet: true},
		{Date: d0.AddDate(0, 0, 2), Set: 20 * time.Minute, HasSet: true},
	}
	got := desk.curve(days, func(d ChartDay) (time.Duration, bool) { return d.Set, d.HasSet })
	if strings.Count(got, "M") != 2 || strings.Count(got, "L") != 1 {
		t.Errorf("curve %q, want two pieces (M, then M L)", got)
	}
}

// A chart of more than a year (four weeks before today to a year after it)
// can hold one day of the year twice: those dates carry their year, the
// others stay short.
func TestChartDateYearWhenTwice(t *testing.T) {
	first, last := time.Date(2026, 11, 5, 0, 0, 0, 0, time.UTC), time.Date(2027, 12, 2, 0, 0, 0, 0, time.UTC)
	for d, want := range map[string]string{
		"2026-11-07": "7 Nov 2026", "2027-11-07": "7 Nov 2027", "2026-12-21": "21 Dec", "2027-03-20": "20 Mar", "2026-12-02": "2 Dec 2026",
	} {
		day, _ := time.Parse(time.DateOnly, d)
		if got := chartDate(day, first, last); got != want {
			t.Errorf("chartDate(%s) = %q, want %q", d, got, want)
		}
	}
}

// polarNightDays are ten days of a chart from 10 January 2027, the first
// three of polar night, then from 3 h of daylight on 13 January to 9 h on
// 19 January (an hour more each day).
func polarNightDays() (first time.Time, days []ChartDay) {
	first = time.Date(2027, 1, 10, 0, 0, 0, 0, time.UTC)
	for i := range 10 {
		d := ChartDay{Date: first.AddDate(0, 0, i), Daylight: time.Duration(i) * time.Hour}
		if i < 3 {
			d.Daylight = 0
		}
		days = append(days, d)
	}
	return first, days
}

// The chart's words speak of the year from today: the weeks drawn before
// today (here three days of polar night) count neither in the shortest day
// nor in the days the Sun stays down.
func TestChartSummaryFromToday(t *testing.T) {
	first, days := polarNightDays()
	v := chart("ice", "Ice camp", &SiteChart{Days: days, Today: first.AddDate(0, 0, 3)})
	if strings.Contains(v.Summary, "stays down") || !strings.Contains(v.Summary, "Daylight from 3 h (13 Jan) to 9 h (19 Jan)") {
		t.Errorf("summary %q: want the days from 13 Jan only", v.Summary)
	}
	// and say so, since the strokes of a feed can start before today
	if want := " Today at this site (13 Jan 2027) is marked; the figures are for the year from it."; !strings.HasSuffix(v.Summary, want) {
		t.Errorf("summary %q: want it to end %q", v.Summary, want)
	}
}

// A year whose shortest days are polar night has no "0 min" of daylight:
// the caption gives the longest daylight and counts the days the Sun stays
// down, as it counts the days it stays up; with no day of midnight Sun
// before them, the Sun is named in that sentence.
func TestChartSummaryPolarNight(t *testing.T) {
	first, days := polarNightDays()
	v := chart("ice", "Ice camp", &SiteChart{Days: days, Today: first})
	if want := "Daylight up to 9 h (19 Jan). The Sun stays down all day on 3 days."; !strings.HasPrefix(v.Summary, want) {
		t.Errorf("summary %q: want it to start %q", v.Summary, want)
	}
	// a year of midnight Sun and polar night both
	days[9].Daylight = 24 * time.Hour
	v = chart("ice", "Ice camp", &SiteChart{Days: days, Today: first})
	if want := "Daylight up to 24 h (19 Jan). The Sun stays up all day on 1 day. It stays down all day on 3 days."; !strings.HasPrefix(v.Summary, want) {
		t.Errorf("summary %q: want it to start %q", v.Summary, want)
	}
}

// The header's date is the build's UTC date and each chart's today is its
// site's local date; near midnight they differ by a day, so the page says
// whose each is. At 23:23 UTC on 4 December 2015 it is 5 December in
// Sydney (AEDT, UTC+11 from 4 October 2015 to 3 April 2016: tz database,
// australasia, rule AN).
func TestIndexSaysWhoseDate(t *testing.T) {
	built := time.Date(2015, 12, 4, 23, 23, 0, 0, time.UTC)
	sydney, err := time.LoadLocation("Australia/Sydney")
	if err != nil {
		t.Fatal(err)
	}
	local := built.In(sydney)
	opts := testOptions()
	opts.Generated = time.Date(built.Year(), built.Month(), built.Day(), 0, 0, 0, 0, time.UTC)
	opts.Charts = func(_ context.Context, s feed.Site, _ []Trimmed) (*SiteChart, error) {
		c := usnoChart(t, s)
		c.Today = time.Date(local.Year(), local.Month(), local.Day(), 0, 0, 0, 0, time.UTC)
		return c, nil
	}
	doc := parseStrict(t, renderIndexFor(t, opts, testCalendars(t, "")))
	var header string
	for _, h := range doc.all("header") {
		header += h.text()
	}
	// one form of date on the page, the captions' "5 Dec 2015"
	if want := "computed on 4 Dec 2015 (UTC)."; !strings.Contains(header, want) {
		t.Errorf("header %q: want it to say %q", header, want)
	}
	caps := doc.all("figcaption")
	if len(caps) == 0 {
		t.Fatal("no chart caption")
	}
	// the page joins a date's day, month and year with no-break spaces
	// (KeepUnits): read as words, they are spaces
	words := func(e *element) string { return strings.ReplaceAll(e.text(), "\u00a0", " ") }
	longMonth := regexp.MustCompile(`\d (January|February|March|April|June|July|August|September|October|November|December)\b`)
	for _, c := range append(caps, doc.all("header")...) {
		if m := longMonth.FindString(words(c)); m != "" {
			t.Errorf("%q writes %s in full, the page's dates read \"5 Dec 2015\"", words(c), m)
		}
	}
	for _, c := range caps {
		if want := "Today at this site (5 Dec 2015) is marked"; !strings.Contains(words(c), want) {
			t.Errorf("caption %q: want it to say %q", words(c), want)
		}
	}
}

// A feed's address on the index wraps only at its natural points: the page
// marks them (<wbr/>) and breaks no word anywhere (word-break: break-all
// cut "sky.exampl" / "e.net" at 1280 px), keeping overflow-wrap on the
// cells for a part longer than a phone's line.
func TestIndexURLsBreakAtNaturalPoints(t *testing.T) {
	page := string(renderIndexFor(t, testOptions(), testCalendars(t, "")))
	if want := "<code>https://<wbr/>sky.<wbr/>example.<wbr/>org/<wbr/>cal/<wbr/>ice-<wbr/>camp-<wbr/>sun.<wbr/>ics</code>"; !strings.Contains(page, want) {
		t.Errorf("the index lacks %q", want)
	}
	if strings.Contains(page, "break-all") || !strings.Contains(page, "overflow-wrap:anywhere") {
		t.Errorf("the index's style breaks words anywhere, or nothing wraps a long part")
	}
}

// The caption says once that the weeks before today are shaded: in the
// key, beside today's line, not again in the words before it.
func TestChartCaptionShadeOnce(t *testing.T) {
	opts := testOptions()
	opts.Charts = func(_ context.Context, s feed.Site, _ []Trimmed) (*SiteChart, error) {
		c := usnoChart(t, s)
		c.Today = c.Days[28].Date
		return c, nil
	}
	doc := parseStrict(t, renderIndexFor(t, opts, testCalendars(t, "")))
	caps := doc.all("figcaption")
	if len(caps) == 0 {
		t.Fatal("no chart caption")
	}
	for _, c := range caps {
		if text := c.text(); strings.Count(text, "the weeks before it shaded") != 1 || !strings.Contains(text, "is marked; the figures are for the year from it.") {
			t.Errorf("caption: %q", text)
		}
	}
}

// A mark is drawn and dated on the site's local date, as the chart's days
// are: the December solstice of 2026, 21 December 20:50 UTC (USNO, Earth's
// Seasons, testdata/reference/seasons.csv december-solstice-2026), falls on
// 22 December in Auckland (UTC+13 in summer).
func TestChartMarkOnLocalDate(t *testing.T) {
	auckland, err := time.LoadLocation("Pacific/Auckland")
	if err != nil {
		t.Fatal(err)
	}
	first := time.Date(2026, 12, 1, 0, 0, 0, 0, time.UTC)
	var days []ChartDay
	for i := range 62 {
		days = append(days, ChartDay{Date: first.AddDate(0, 0, i), Daylight: 14 * time.Hour})
	}
	solstice := time.Date(2026, 12, 21, 20, 50, 0, 0, time.UTC)
	c := &SiteChart{Days: days, Location: auckland, Marks: []Mark{{At: solstice, Label: "Dec solstice"}}, Phases: []Phase{{At: solstice, Full: true}}}
	v := chart("orchard", "Orchard", c)
	if len(v.Marks) != 1 || len(v.Phases) != 1 {
		t.Fatalf("marks %v, phases %v", v.Marks, v.Phases)
	}
	step := dayStep(len(days))
	x, _ := strconv.ParseFloat(v.Marks[0].X, 64)
	if col := int((x - plotLeft) / step); v.Marks[0].Date != "22 Dec" || col != 21 || v.Phases[0].Date != "22 Dec" || v.Phases[0].X != v.Marks[0].X {
		t.Errorf("solstice mark dated %q in column %d (phase %q at %s); want 22 Dec, column 21 (the 22nd)", v.Marks[0].Date, col, v.Phases[0].Date, v.Phases[0].X)
	}
}

// The caption says on which dates the kinds of a feed holding fewer dates
// than the chart are drawn: to its last date when it starts before the
// chart, from its first when it ends after it, else both; a feed shortened
// to before the chart's first date is said to be drawn on none.
func TestChartCaptionSaysFeedDates(t *testing.T) {
	d := func(y int, m time.Month, day int) time.Time { return time.Date(y, m, day, 0, 0, 0, 0, time.UTC) }
	first, last := d(2026, 12, 4), d(2027, 12, 31) // a chart of four weeks and a year
	for _, tc := range []struct {
		name string
		held HeldDates
		want string
	}{
		{"ends", HeldDates{Feed: "lamps", What: []string{"lamp periods"}, First: first, Last: d(2027, 6, 2)},
			"Lamp periods of the feed lamps drawn to 2 Jun, where it ends."},
		{"begins", HeldDates{Feed: "dark", What: []string{"dark windows", "red lines"}, First: d(2026, 12, 25), Last: last},
			"Dark windows and red lines of the feed dark drawn from 25 Dec 2026, where it begins."},
		{"both", HeldDates{Feed: "spring", What: []string{"lamp periods", "photoperiod crossings", "dark windows"}, First: d(2026, 12, 25), Last: d(2027, 4, 30)},
			"Lamp periods, photoperiod crossings and dark windows of the feed spring drawn from 25 Dec 2026 to 30 Apr, the dates it holds."},
		{"none", HeldDates{Feed: "old", What: []string{"red lines"}, First: first, Last: d(2026, 11, 30)},
			"Red lines of the feed old not drawn: it holds none of the chart's dates."},
	} {
		if got := heldText([]HeldDates{tc.held}, first, last, time.Time{}); got != tc.want {
			t.Errorf("%s: %q, want %q", tc.name, got, tc.want)
		}
	}
	if got := heldText(nil, first, last, time.Time{}); got != "" {
		t.Errorf("no feed of fewer dates: %q, want nothing", got)
	}
	// today marked on 1 January 2027, the weeks before it shaded: a feed
	// that begins in them is said to, beside the figures counted from today
	today := d(2027, 1, 1)
	for _, tc := range []struct {
		name string
		held HeldDates
		want string
	}{
		{"begins before today", HeldDates{Feed: "dark", What: []string{"dark windows"}, First: d(2026, 12, 25), Last: last},
			"Dark windows of the feed dark drawn from 25 Dec 2026, where it begins, in the shaded weeks before today."},
		{"both, before today", HeldDates{Feed: "spring", What: []string{"lamp periods"}, First: d(2026, 12, 25), Last: d(2027, 4, 30)},
			"Lamp periods of the feed spring drawn from 25 Dec 2026, in the shaded weeks before today, to 30 Apr, the dates it holds."},
		{"begins after today", HeldDates{Feed: "dark", What: []string{"dark windows"}, First: d(2027, 1, 10), Last: last},
			"Dark windows of the feed dark drawn from 10 Jan, where it begins."},
		{"begins on today", HeldDates{Feed: "dark", What: []string{"dark windows"}, First: today, Last: last},
			"Dark windows of the feed dark drawn from 1 Jan, where it begins."},
	} {
		if got := heldText([]HeldDates{tc.held}, first, last, today); got != tc.want {
			t.Errorf("%s: %q, want %q", tc.name, got, tc.want)
		}
	}
}

// A shard manifest written before manifests recorded the sites' conditions
// takes them from the configuration's site of its id, a level horizon
// written 0 too: the merged index's place line says "horizon 0°", as a
// whole run's does (feed.Site.Conditions).
func TestConditionsOfOldManifestKeepLevelHorizon(t *testing.T) {
	level := feed.Site{ID: "plateau", Elevation: 1150, HorizonSet: true}
	got := conditionsOf(feed.Site{ID: "plateau", Elevation: 1150}, []feed.Site{level})
	if c, want := got.Conditions(), level.Conditions(); c != want || want != "horizon 0°" {
		t.Errorf("conditions %q, want %q (horizon 0°)", c, want)
	}
}
