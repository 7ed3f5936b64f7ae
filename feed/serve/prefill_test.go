package serve

import (
	"html"
	"net/http/httptest"
	"net/url"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"
)

// inputTag is the tag of the input with the given id on page.
func inputTag(t *testing.T, page, id string) string {
	t.Helper()
	tag := regexp.MustCompile(`<input [^>]*\bid="` + regexp.QuoteMeta(id) + `"[^>]*>`).FindString(page)
	if tag == "" {
		t.Fatalf("the page has no input %s", id)
	}
	return tag
}

// formState reads what the builder's form opens with: each input's value
// (a checkbox "on" or "off"), and whether the date was chosen.
func formState(t *testing.T, page string, ids ...string) map[string]string {
	t.Helper()
	out := map[string]string{}
	for _, id := range ids {
		tag := inputTag(t, page, id)
		if strings.Contains(tag, `type="checkbox"`) {
			out[id] = "off"
			if strings.Contains(tag, " checked") {
				out[id] = "on"
			}
			continue
		}
		v := ""
		if m := regexp.MustCompile(` value="([^"]*)"`).FindStringSubmatch(tag); m != nil {
			v = html.UnescapeString(m[1])
		}
		out[id] = v
		if strings.Contains(tag, " data-chosen") {
			out[id] += " (chosen)"
		}
	}
	return out
}

// fillNotes are the lines of the builder's note on the values of its link
// it left out; nil without the note.
func fillNotes(page string) []string {
	_, note, ok := strings.Cut(page, `<div id="fill-note" class="message">`)
	if !ok {
		return nil
	}
	note, _, _ = strings.Cut(note, "</div>")
	var out []string
	for _, m := range regexp.MustCompile(`<li>(.*?)</li>`).FindAllStringSubmatch(note, -1) {
		out = append(out, html.UnescapeString(m[1]))
	}
	return out
}

var formIDs = []string{"lat", "lon", "elev", "name", "horizon", "tz", "k-civil-dawn", "k-sunrise", "k-sunset", "k-golden-hour",
	"off-sunrise", "off-sunset", "lighting", "alarm", "start", "days"}

// The table's "make another" link opens the builder with the table's own
// query: every parameter the builder has a field for, in its field, the
// kinds ticked and shifted, the lighting target in hours, the reminder in
// minutes and the table's first date; the zone only when the table was
// given one (else the builder finds it from the coordinates, as the table
// did), and the table's length when it is not the preview's seven days,
// which the builder's share link keeps.
func TestMakeAnotherFillsBuilder(t *testing.T) {
	h := builderTestServer(t).Handler()
	for _, tc := range []struct {
		name, table string
		want        map[string]string
	}{
		{"southern, zone found", "lat=-33.45&lon=-70.6667&elev=520&name=Quebrada+vineyard&horizon=60:12,0:2&kinds=sunset,sunrise,golden-hour,lighting:14h30m" +
			"&offsets=sunset:-30m&alarm=1h30m&start=2026-06-21&days=14",
			map[string]string{"lat": "-33.45", "lon": "-70.6667", "elev": "520", "name": "Quebrada vineyard", "horizon": "0:2,60:12", "tz": "",
				"k-civil-dawn": "off", "k-sunrise": "on", "k-sunset": "on", "k-golden-hour": "on", "off-sunrise": "0", "off-sunset": "-30",
				"lighting": "14.5", "alarm": "90", "start": "2026-06-21 (chosen)", "days": "14"}},
		// without a start, the builder's date is the server's today (2026-12-02)
		{"zone given, no start", "lat=47.8&lon=13.05&tz=Europe/Vienna&horizon=2.5&kinds=sunrise",
			map[string]string{"lat": "47.8", "lon": "13.05", "elev": "0", "name": "", "horizon": "2.5", "tz": "Europe/Vienna",
				"k-civil-dawn": "off", "k-sunrise": "on", "k-sunset": "off", "k-golden-hour": "off", "off-sunrise": "0", "off-sunset": "0",
				"lighting": "", "alarm": "0", "start": "2026-12-02"}},
		// a plateau site: horizon=0 written is a level horizon without the
		// dip of its 1,150 m, and stays so through the builder
		{"level horizon", "lat=-31.27&lon=149.07&elev=1150&horizon=0&kinds=sunrise",
			map[string]string{"lat": "-31.27", "lon": "149.07", "elev": "1150", "name": "", "horizon": "0", "tz": "",
				"k-civil-dawn": "off", "k-sunrise": "on", "k-sunset": "off", "k-golden-hour": "off", "off-sunrise": "0", "off-sunset": "0",
				"lighting": "", "alarm": "0", "start": "2026-12-02"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			table := body(t, get(t, h, "GET", "/at?"+tc.table))
			m := regexp.MustCompile(`<a href="([^"]*)">make another</a>`).FindStringSubmatch(table)
			if m == nil {
				t.Fatalf("the table has no \"make another\" link:\n%s", table)
			}
			link := html.UnescapeString(m[1])
			q, ok := strings.CutPrefix(link, "./?")
			if !ok {
				t.Fatalf("\"make another\" leads to %q, want ./? and the query", link)
			}
			if v, _ := url.ParseQuery(q); v.Get(ParamDays) != tc.want["days"] || v.Has(ParamUTC) {
				t.Errorf("\"make another\" %q: days %q, want %q; utc, which the builder has no field for, left out", link, v.Get(ParamDays), tc.want["days"])
			}
			page := body(t, get(t, h, "GET", "/?"+q))
			got := formState(t, page, formIDs...)
			for _, id := range formIDs {
				if got[id] != tc.want[id] {
					t.Errorf("%s: %q, want %q", id, got[id], tc.want[id])
				}
			}
			if n := fillNotes(page); n != nil {
				t.Errorf("the builder notes values left out of the table's own query: %q", n)
			}
		})
	}
}

// Values the builder cannot use are left out, each said in a note naming
// the parameter and the value with the ad-hoc feed's reason; the rest of
// the link fills the form. Nothing of a query longer than the feeds take is
// used.
func TestBuilderFillIgnoresBadValues(t *testing.T) {
	h := builderTestServer(t).Handler()
	// Wellington, New Zealand: its zone misspelt
	page := body(t, get(t, h, "GET", "/?lat=-41.2865&lon=174.7762&tz=Pacific/Aukland&elev=high&kinds=sunrise,sunrize,sun-altitude:10,lighting:16h,lighting:12h"+
		"&offsets=golden-hour:10m,sunrise:-15m&days=90&utc=true&colour=red&name=Te+Aro&name=Kelburn"))
	got := formState(t, page, formIDs...)
	want := map[string]string{"lat": "-41.2865", "lon": "174.7762", "elev": "0", "name": "", "horizon": "", "tz": "",
		"k-civil-dawn": "off", "k-sunrise": "on", "k-sunset": "off", "k-golden-hour": "off", "off-sunrise": "-15", "off-sunset": "0",
		"lighting": "16", "alarm": "0", "start": "2026-12-02"}
	for _, id := range formIDs {
		if got[id] != want[id] {
			t.Errorf("%s: %q, want %q", id, got[id], want[id])
		}
	}
	notes := fillNotes(page)
	for _, w := range []string{
		`parameter colour="red": unknown parameter`,
		`parameter name="Te Aro,Kelburn": given more than once`,
		`parameter elev="high": not a decimal number`,
		`parameter tz="Pacific/Aukland": unknown time zone`,
		`parameter kinds="sunrize": unknown kind`,
		`parameter kinds="sun-altitude:10": the builder has no box for this kind`,
		`parameter kinds="lighting:12h": the builder takes one lighting target, lighting:16h`,
		`parameter offsets="golden-hour:10m": the kind golden-hour is not among the kinds asked for`,
		`parameter utc="true": the builder's calendars give local times`,
		`parameter days="90": must be within 1..62`, // a table's days at most
	} {
		if !slices.ContainsFunc(notes, func(n string) bool { return strings.HasPrefix(n, w) }) {
			t.Errorf("the note lacks %q: %q", w, notes)
		}
	}
	if len(notes) != 10 {
		t.Errorf("%d notes, want 10: %q", len(notes), notes)
	}
	// the misspelt zone's note suggests the zone meant
	if !slices.ContainsFunc(notes, func(n string) bool { return strings.Contains(n, "Pacific/Auckland") }) {
		t.Errorf("the note on tz does not suggest Pacific/Auckland: %q", notes)
	}

	long := body(t, get(t, h, "GET", "/?lat=1&lon=2&name="+strings.Repeat("x", maxQueryLength)))
	if got := formState(t, long, "lat", "name"); got["lat"] != "" || got["name"] != "" || len(fillNotes(long)) != 1 {
		t.Errorf("a query over %d bytes: form %v, notes %q; want nothing used and one note", maxQueryLength, got, fillNotes(long))
	}
	// 40 kinds, over the 32 a query may ask for, and 20 unknown parameters:
	// the kinds are left out whole, and the note keeps to 12 lines
	many := "lat=1&lon=2&kinds=" + strings.Repeat("sunrise,", 39) + "golden-hour"
	for i := range 20 {
		many += "&p" + strconv.Itoa(i) + "=1"
	}
	manyPage := body(t, get(t, h, "GET", "/?"+many))
	notes = fillNotes(manyPage)
	if got := formState(t, manyPage, "k-golden-hour", "k-civil-dawn"); got["k-golden-hour"] != "off" || got["k-civil-dawn"] != "on" ||
		len(notes) != 12 || !strings.HasPrefix(notes[0], `parameter kinds="sunrise,`) || !strings.Contains(notes[0], "more than 32 kinds") || notes[11] != "10 more values left out" {
		t.Errorf("40 kinds and 20 unknown parameters: form %v, notes %q; want the default kinds, the kinds' note and 12 lines", got, notes)
	}
	// a page without a query opens with the form's defaults and no note
	plainPage := body(t, get(t, h, "GET", "/"))
	if got := formState(t, plainPage, formIDs...); got["lat"] != "" || got["k-civil-dawn"] != "on" || got["k-golden-hour"] != "off" ||
		got["start"] != "2026-12-02" || fillNotes(plainPage) != nil {
		t.Errorf("the page without a query: %v, notes %q", got, fillNotes(plainPage))
	}
}

// A table the server refuses links back to the builder with its query, for
// the builder to keep what it can and say what it left out.
func TestRefusedTableLinksBuilderWithQuery(t *testing.T) {
	h := builderTestServer(t).Handler()
	const q = "lat=-33.45&lon=-70.6667&kinds=sunrise&days=90"
	r := get(t, h, "GET", "/at?"+q)
	page := body(t, r)
	if want := `<a href="./?` + html.EscapeString(q) + `">`; r.StatusCode != 400 || !strings.Contains(page, want) {
		t.Errorf("/at?%s: %d, want 400 and a link %s:\n%s", q, r.StatusCode, want, page)
	}
}

// Whatever the query, the builder's page opens (200, with its form), and
// every note it gives on what it left out names a parameter (or says that
// the value had none, or why none of the query is used).
func FuzzBuilderFill(f *testing.F) {
	for _, seed := range []string{
		"lat=-33.45&lon=-70.6667&elev=520&name=Quebrada+vineyard&horizon=60:12,0:2&kinds=sunset,lighting:14h30m&offsets=sunset:-30m&alarm=1h30m&start=2026-06-21",
		"lat=1e400&lon=NaN&tz=../x&kinds=,&offsets=:,sunrise:&lighting=0&days=-1&utc=maybe",
		"%zz&;;==&lat=1&lat=2&kinds=lighting:16h,lighting:12h",
		"lat=0x1p-2&lon=1_000&tz=Local&kinds=\x00&name=%00&horizon=0:2,0:3",
		"start=0000-01-01&lat=0&lon=0&tz=UTC&kinds=sun-altitude:-6&offsets=sun-altitude:-6:10m",
	} {
		f.Add(seed)
	}
	h := builderTestServer(f).Handler()
	f.Fuzz(func(t *testing.T, raw string) {
		req := httptest.NewRequest("GET", "/", nil)
		req.URL.RawQuery = raw
		w := httptest.NewRecorder()
		h.ServeHTTP(w, req)
		r := w.Result()
		page := body(t, r)
		if r.StatusCode != 200 || !strings.Contains(page, `<form id="builder"`) {
			t.Fatalf("query %q: status %d, the form shown: %v", raw, r.StatusCode, strings.Contains(page, `<form id="builder"`))
		}
		for _, n := range fillNotes(page) {
			if !strings.HasPrefix(n, "parameter ") && !strings.HasPrefix(n, "the link's query") && !strings.HasPrefix(n, "a part of the link's query") &&
				!strings.HasPrefix(n, "a value without a parameter's name") && !strings.HasSuffix(n, " more values left out") {
				t.Fatalf("query %q: the note %q names no parameter", raw, n)
			}
		}
	})
}

// A link's UTC offset as tz is told the zone in force at the link's
// coordinates, as /at.ics tells it: "+12:45" at the Chatham Islands is
// Pacific/Chatham (the tz database's zone1970.tab: NZ, -4357-17633). A link
// whose coordinates are left out as well gets the spelling's hint alone,
// never the zone at 0°, 0°.
func TestBuilderFillOffsetZoneNamesZoneAtPlace(t *testing.T) {
	h := builderTestServer(t).Handler()
	for link, want := range map[string]string{
		"/?lat=-43.95&lon=-176.56&tz=%2B12:45": `parameter tz="+12:45": unknown time zone (a UTC offset is not a time zone: the zone at the place's latitude and longitude is "Pacific/Chatham", which follows its clock changes)`,
		"/?lat=north&lon=-176.56&tz=%2B12:45":  `parameter tz="+12:45": unknown time zone (a UTC offset is not a time zone: write the place's zone, such as "Europe/Paris", which follows its clock changes)`,
	} {
		if notes := fillNotes(body(t, get(t, h, "GET", link))); !slices.Contains(notes, want) {
			t.Errorf("%s: notes %q, want %q", link, notes, want)
		}
	}
}
