package serve

import (
	"bytes"
	"context"
	"embed"
	"encoding/base64"
	"encoding/json"
	"errors"
	"fmt"
	"html/template"
	"net/http"
	"net/url"
	"path"
	"slices"
	"strconv"
	"strings"
	"sync"
	"time"

	"rsc.io/qr"

	"heliocal/feed"
	"heliocal/feed/ical"
	"heliocal/feed/publish"
)

// PreviewFunc computes the calendar of a validated ad-hoc query, through
// the same code as the ad-hoc feeds: the builder's preview (/at.json) and
// the day-by-day table (/at) show its entries.
type PreviewFunc func(ctx context.Context, q AdhocQuery) (*feed.Calendar, error)

// PageInfo is what the served page says beside the builder and the feeds.
type PageInfo struct {
	Title   string // the page's heading; default publish.DefaultPageTitle
	Intro   string // a short introduction under the heading
	Contact string // a contact line at the foot
	Caution string // the caution for the public; default DefaultCaution
	// Legal adds LegalCaution: some feed has kinds people use under rules.
	Legal     bool
	NoBuilder bool // leave the builder off the page (the preview and table stay)
	// Sites are the configured sites in configuration order, each with its
	// feeds; empty: the feeds of feeds.json are listed.
	Sites []PageSite
}

// PageSite is a site on the page with its feeds.
type PageSite struct {
	Name, Place string // the name, and where it is in words ("47.81° N, 13.06° E, 430 m, Europe/Vienna")
	Feeds       []PageFeed
}

// PageFeed is a feed on the page.
type PageFeed struct {
	ID, Title, Description string
	HTTPS                  string // set when the page is rendered
}

// DefaultCaution is the caution of the page, written for the public;
// LegalCaution is added where times may be used under rules.
const (
	DefaultCaution = publish.PublicCaution
	LegalCaution   = publish.LegalCaution
)

// LegalKind reports whether people use a kind's times under rules:
// sunrise, sunset, the twilights and the daily summary.
func LegalKind(kind string) bool {
	switch {
	case kind == "sunrise", kind == "sunset", kind == "daily-summary":
		return true
	}
	for _, p := range []string{"civil-", "nautical-", "astronomical-"} {
		if strings.HasPrefix(kind, p) {
			return true
		}
	}
	return false
}

// SetPage changes what the served page says, as after a reload.
func (s *Server) SetPage(p PageInfo) {
	if p.Title == "" {
		p.Title = publish.DefaultPageTitle
	}
	if p.Caution == "" {
		p.Caution = DefaultCaution
	}
	s.pageInfo.Store(&p)
}

// Routes of the builder.
const (
	PreviewPath = "/at.json" // the next days of an ad-hoc query as JSON
	TablePath   = "/at"      // the same query as a printable day-by-day table
	previewDays = 7
	maxTable    = 62 // days of the table at most
)

// contentSecurityPolicy allows the page its own files only: no inline
// script or style, nothing from elsewhere (the QR code is a data: image).
const contentSecurityPolicy = "default-src 'none'; script-src 'self'; style-src 'self'; img-src 'self' data:; " +
	"connect-src 'self'; form-action 'self'; base-uri 'none'; frame-ancestors 'none'; manifest-src 'self'"

//go:embed assets
var assetFiles embed.FS

// The page's templates and files are prepared on first use, not when any
// command of the program starts.
var (
	pageTemplates = sync.OnceValue(func() *template.Template {
		return template.Must(template.New("").Funcs(template.FuncMap{
			"webcal":    func(u string) template.URL { return template.URL(webcal(u)) },
			"urlBreaks": publish.URLBreaks,
			"legal":     func() string { return LegalCaution },
			"units":     publish.KeepUnits,
			"headAt":    func(up, title string) headView { return headView{Up: up, Title: title} },
		}).ParseFS(assetFiles, "assets/*.html"))
	})
	staticAssets = sync.OnceValue(loadStatic)
	hdrCSP       = hdr(contentSecurityPolicy)
	hdrNoCache   = hdr("no-cache")
)

// loadStatic prepares the page's own files (script, style, icon) once.
func loadStatic() map[string]*asset {
	out := map[string]*asset{}
	for name, ctype := range map[string]string{
		"builder.js":  "text/javascript; charset=utf-8",
		"builder.css": "text/css; charset=utf-8",
		"favicon.svg": "image/svg+xml",
	} {
		data, err := assetFiles.ReadFile("assets/" + name)
		if err != nil {
			panic(err) // embedded: cannot fail
		}
		out["/assets/"+name] = newAsset(name, ctype, data, time.Time{}, nil)
	}
	out["/favicon.svg"] = out["/assets/favicon.svg"]
	out["/favicon.ico"] = out["/assets/favicon.svg"]
	return out
}

// builderRoute tells the builder's routes apart.
func builderRoute(p string) (string, bool) {
	switch {
	case p == PreviewPath:
		return routePreview, true
	case p == TablePath || staticAssets()[p] != nil:
		return routePage, true
	}
	return "", false
}

func (s *Server) serveBuilder(w http.ResponseWriter, r *http.Request, route, p string) {
	if a := staticAssets()[p]; a != nil {
		// compressed once, as a feed is, with an ETag of its own
		writeAsset(w, r, a, hdrNoCache)
		return
	}
	if s.opts.Preview == nil {
		plain(w, http.StatusNotFound, "the preview is not enabled on this server")
		return
	}
	if route == routePreview {
		s.servePreview(w, r)
		return
	}
	s.serveTable(w, r)
}

// previewQuery parses an ad-hoc query for a preview of at most maxDays
// days (defaultDays when days is not given).
func (s *Server) previewQuery(r *http.Request, defaultDays, maxDays int) (AdhocQuery, bool, error) {
	lim := *s.limits
	lim.defaultDays, lim.maxDays = defaultDays, maxDays
	q, err := parseAdhoc(r.URL.RawQuery, s.now(), &lim)
	_, hasStart := r.URL.Query()[ParamStart]
	return q, hasStart, err
}

// compute runs Preview within the ad-hoc concurrency limit and timeout.
func (s *Server) compute(ctx context.Context, q AdhocQuery) (*feed.Calendar, error) {
	ctx, release, err := s.adhocSlot(ctx)
	if err != nil {
		return nil, err
	}
	defer release()
	return s.opts.Preview(ctx, q)
}

// previewEntry and previewDay are the JSON of /at.json.
type previewEntry struct {
	Kind  string `json:"kind"`
	Title string `json:"title"`
	Time  string `json:"time,omitempty"` // local HH:MM; empty for an all-day entry
	End   string `json:"end,omitempty"`  // local HH:MM of a span's end
	// EndDate is the local date of the end when it is not the entry's date.
	EndDate string `json:"end_date,omitempty"`
	// StartDate is the local date of the start when it is not the entry's
	// date: a dark window after midnight belongs to the night before.
	StartDate string `json:"start_date,omitempty"`
	// When is Time and End as shown, each with its weekday when it falls
	// on another date than the entry's: "23:55–Sun 06:25", "Mon 01:59–06:24",
	// and with its zone's label when it is in the hour the clocks show
	// twice: "00:48 CDT", "00:12 CST" (clockOn).
	When string `json:"when,omitempty"`
	// Clocks says that the clocks change during the span, whose clock
	// times they put nearer or further apart than its length, in the words
	// of the feeds' descriptions (feed.ClocksDuring): "The clocks go back
	// from summer time by 1 h during it: 02:00 MDT becomes 01:00 MST."
	Clocks string `json:"clocks,omitempty"`
	// Open marks a band's span not left before these days end (near a
	// pole): it has no end, and When reads "from 02:24".
	Open bool `json:"open,omitempty"`
	// StartUTC and EndUTC are the instants of Time and End in UTC to the
	// millisecond, as the events listing's JSON writes its start and end
	// (feed.UTCStamp: 2027-11-07T04:48:12.345Z): a script's way to tell
	// apart the two passes of a reading the clocks show twice, which Time
	// and End alone do not.
	StartUTC string `json:"start_utc,omitempty"`
	EndUTC   string `json:"end_utc,omitempty"`
	// feedTitle is the title the feed gives the entry, by which the
	// all-day entries of a kind are in the feeds' order.
	feedTitle string
}

type previewDay struct {
	Date    string `json:"date"` // YYYY-MM-DD, local
	Weekday string `json:"weekday"`
	// Clocks says that the clocks change on this date, the times of its
	// row shifting with them (clockChange); "" on the other dates.
	Clocks  string         `json:"clocks,omitempty"`
	Entries []previewEntry `json:"entries"`
}

type previewResult struct {
	Zone      string `json:"zone"`
	ZoneFound bool   `json:"zone_found"`
	Name      string `json:"name"`
	Title     string `json:"title"`
	HTTPS     string `json:"https"`
	Webcal    string `json:"webcal"`
	Page      string `json:"page"`
	QR        string `json:"qr"` // a data: URL of an SVG image of Page
	// SubscribeDays is the window of the subscription, from the day of
	// each refresh: fewer than the default when a year would be too large.
	SubscribeDays int `json:"subscribe_days"`
	// SubscribeNote says that window to people (subscribeNote), as the
	// table at TablePath says it; "" without ad-hoc feeds.
	SubscribeNote string       `json:"subscribe_note"`
	Days          []previewDay `json:"days"`
}

// subscribeNote is the line under the subscribe links of the builder and
// the table: how many days the calendar always covers, and why fewer than a
// year; "" for days 0 (no ad-hoc feeds).
func subscribeNote(days int) string {
	switch {
	case days <= 0:
		return ""
	case days < 365:
		return "The calendar always covers the next " + strconv.Itoa(days) + " days (a year of these events would be too large for some calendar apps)."
	}
	return "The calendar always covers the next " + strconv.Itoa(days) + " days."
}

// subscribeDays is the window of q's subscription: the default ad-hoc
// window, or fewer days when that feed would be over the size limit on
// some day of the year it may be fetched on (see fitDays). lamps gets the
// "no lamps needed" notes of the year it computes.
func (s *Server) subscribeDays(ctx context.Context, q AdhocQuery, lamps *yearLamps) (int, error) {
	ctx, release, err := s.adhocSlot(ctx)
	if err != nil {
		return 0, err
	}
	defer release()
	return s.fitDays(ctx, q, s.opts.AdhocDefaultDays, lamps)
}

// subscription gives the window of q's subscribe link, as the preview and the
// table give it (subscribeDays; 0 without ad-hoc feeds), and words cal's
// "no lamps needed" notes as that feed does (lampNotesAsFed). It reports
// false when it failed, answered by fail as computeFailed does for the
// page that computes what ("the table").
func (s *Server) subscription(w http.ResponseWriter, r *http.Request, q AdhocQuery, cal *feed.Calendar, fail failFunc, what string) (int, bool) {
	subDays := 0
	var lamps yearLamps
	if s.opts.Adhoc != nil {
		var err error
		if subDays, err = s.subscribeDays(r.Context(), q, &lamps); s.computeFailed(w, q, err, fail, what) {
			return 0, false
		}
	}
	if err := s.lampNotesAsFed(r.Context(), q, subDays, &lamps, cal); s.computeFailed(w, q, err, fail, what) {
		return 0, false
	}
	return subDays, true
}

// fitDays is the longest rolling window, of at most most days, whose feed
// for q stays within 90 % of the size limit whatever day it starts on: it
// computes a year of q's entries from q.Start (or AdhocDefaultDays, when
// longer), takes the bytes each date's events take in the feed, and keeps
// the largest number of days whose every window over that year, taken
// cyclically, fits with the file's fixed part (header, time zone). Near a
// pole a summer date carries more events than a winter one: a window sized
// from the weeks after the request would be refused when the rolling
// subscription reaches summer. lamps, when not nil, gets the year's "no
// lamps needed" notes. It is called with an ad-hoc slot held, and only
// when Options.Preview is set.
func (s *Server) fitDays(ctx context.Context, q AdhocQuery, most int, lamps *yearLamps) (int, error) {
	year := max(daysPerYear, s.opts.AdhocDefaultDays)
	q.Days = year
	// near the end of the dates served, the year before it stands in
	if end := time.Date(s.limits.maxYear, 12, 31, 0, 0, 0, 0, q.Start.Location()); q.Start.AddDate(0, 0, year-1).After(end) {
		q.Start = end.AddDate(0, 0, 1-year)
	}
	cal, err := s.opts.Preview(ctx, q)
	if err != nil {
		return 0, err
	}
	defer cal.Release()
	if lamps != nil {
		lamps.keep(cal, q.Start, year)
	}
	sz := sizers.Get().(*sizer)
	defer sizers.Put(sz)
	if sz.enc == nil || sz.version != s.opts.Version {
		sz.enc, sz.version = ical.NewEncoder(ical.Options{Version: s.opts.Version}), s.opts.Version
	}
	sz.buf, sz.sizes, err = sz.enc.AppendSizes(sz.buf[:0], cal, sz.sizes[:0])
	if err != nil {
		return 0, err
	}
	perDate, events := dateBytes(sz.sizes, cal, q, year)
	// the fixed part, with room for a longer version in PRODID than the
	// one this server knows
	fixed := len(sz.buf) - events + prodIDSlack
	budget := s.opts.AdhocMaxBytes*9/10 - fixed
	sums := make([]int, 2*year+1) // sums[i]: the bytes of dates 0..i-1, the year repeated
	for i := range 2 * year {
		sums[i+1] = sums[i] + perDate[i%year]
	}
	fits := func(n int) bool {
		for i := range year {
			if sums[i+n]-sums[i] > budget {
				return false
			}
		}
		return true
	}
	lo, hi := 1, min(most, year) // the answer is at least lo
	if fits(hi) {
		return hi, nil
	}
	for lo+1 < hi { // fits(lo) or lo == 1; !fits(hi)
		mid := (lo + hi) / 2
		if fits(mid) {
			lo = mid
		} else {
			hi = mid
		}
	}
	return lo, nil
}

// daysPerYear is the length of the year fitDays looks over.
const daysPerYear = 365

// prodIDSlack is what fitDays allows for the PRODID of the feed served,
// whose version may be longer than Options.Version.
const prodIDSlack = 64

// A sizer is fitDays' encoder, its encoded year (about a megabyte) and
// the bytes of each of the year's entries, kept from one request to the
// next: an encoder's first calendar allocates its working memory.
type sizer struct {
	enc     *ical.Encoder
	version string
	buf     []byte
	sizes   []int
}

var sizers = sync.Pool{New: func() any { return new(sizer) }}

// dateBytes adds up the bytes of cal's entries, each one VEVENT of sizes
// bytes, by their local date: perDate[i] is the bytes of the events of the
// date i days after q.Start, events their total.
func dateBytes(sizes []int, cal *feed.Calendar, q AdhocQuery, year int) (perDate []int, events int) {
	perDate = make([]int, year)
	first := time.Date(q.Start.Year(), q.Start.Month(), q.Start.Day(), 0, 0, 0, 0, time.UTC)
	for i := range cal.Entries {
		e := &cal.Entries[i]
		date := e.Date
		if date.IsZero() {
			date = e.Start.In(q.Location)
		}
		d := time.Date(date.Year(), date.Month(), date.Day(), 0, 0, 0, 0, time.UTC)
		day := min(max(int(d.Sub(first).Hours()/24), 0), year-1)
		perDate[day] += sizes[i]
		events += sizes[i]
	}
	return perDate, events
}

// yearLamps are the "no lamps needed" notes of the year fitDays computes,
// from first to last, each at the start of its stretch of dates.
type yearLamps struct {
	first, last time.Time
	notes       []lampNote
}

// lampNote is a "no lamps needed" note of a lighting kind: from date,
// until the first date that needs lamps again (zero: not within the year).
type lampNote struct {
	kind        string
	date, until time.Time
}

// keep keeps the "no lamps needed" notes of cal, the year of days from first.
func (y *yearLamps) keep(cal *feed.Calendar, first time.Time, days int) {
	*y = yearLamps{first: first, last: first.AddDate(0, 0, days-1)}
	for i := range cal.Entries {
		if e := &cal.Entries[i]; feed.IsNoLampsNote(e) {
			// the calendar's memory goes to the next one
			y.notes = append(y.notes, lampNote{kind: strings.Clone(e.Kind), date: e.Date, until: e.Facts.Until})
		}
	}
}

// until is the first date that needs lamps again after date, a date that
// needs none, as the year has it (zero: none within the year). ok is false
// when the year cannot tell what a feed of kind from date to last says:
// it does not hold date, or the stretch of dates without lamps lasts past
// the year's end and the feed goes further.
func (y *yearLamps) until(kind string, date, last time.Time) (until time.Time, ok bool) {
	if date.Before(y.first) || date.After(y.last) {
		return time.Time{}, false
	}
	// the stretch that holds date starts on the latest note's date
	var n *lampNote
	for i := range y.notes {
		if m := &y.notes[i]; m.kind == kind && !m.date.After(date) && (n == nil || m.date.After(n.date)) {
			n = m
		}
	}
	switch {
	case n == nil || !n.until.IsZero() && !n.until.After(date):
		return time.Time{}, false
	case n.until.IsZero() && last.After(y.last):
		return time.Time{}, false
	}
	return n.until, true
}

// links are the subscribe links of q (a rolling window from the day of
// each request: no start; days only when fewer than the default) and its
// shareable table page of pageDays days (days only when not previewDays:
// the page shared is the page shown).
func (s *Server) links(r *http.Request, q AdhocQuery, start string, days, pageDays int) (https, page string) {
	base := s.baseFor(r)
	place := q.linkPlace()
	https = base + strings.TrimPrefix(AdhocPath, "/") + "?" + place
	if days > 0 && days < s.opts.AdhocDefaultDays {
		https += "&" + ParamDays + "=" + strconv.Itoa(days)
	}
	page = base + strings.TrimPrefix(TablePath, "/") + "?" + place
	if start != "" {
		page += "&" + ParamStart + "=" + start
	}
	if pageDays != previewDays {
		page += "&" + ParamDays + "=" + strconv.Itoa(pageDays)
	}
	return https, page
}

// servePreview answers /at.json: the first days of the table its query
// asks for (days, 1..maxTable, previewDays by default), previewDays of
// them at most, and the links, the share link to the table of every day
// asked for: a table's "make another" keeps the table's length through the
// builder.
func (s *Server) servePreview(w http.ResponseWriter, r *http.Request) {
	q, cal, start, asked, ok := s.previewCalendar(w, r, maxTable, previewDays, plain, "the preview")
	if !ok {
		return
	}
	subDays, ok := s.subscription(w, r, q, cal, plain, "the preview")
	if !ok {
		return
	}
	https, page := s.links(r, q, start, subDays, asked)
	res := previewResult{SubscribeDays: subDays, SubscribeNote: subscribeNote(subDays), Zone: q.Location.String(), ZoneFound: q.ZoneFound, Name: cal.Site.Name, Title: cal.Title,
		HTTPS: https, Webcal: webcal(https), Page: page, QR: qrDataURL(page), Days: days(cal, q)}
	body, err := json.Marshal(res)
	if err != nil {
		plain(w, http.StatusInternalServerError, "internal error")
		return
	}
	h := w.Header()
	h.Set("Content-Type", "application/json")
	h["Cache-Control"] = hdrNoStore
	writeBody(w, r, http.StatusOK, body)
}

// writeBody answers r with body under status code, compressed at the
// fastest level (as an ad-hoc feed is) for a client that accepts gzip when
// it is long enough to gain from it: the page, its preview and the table,
// made for each request, of which the QR code and the kinds' list are most
// of the bytes. The headers but Content-Length and Content-Encoding are
// set already.
func writeBody(w http.ResponseWriter, r *http.Request, code int, body []byte) {
	h := w.Header()
	if len(body) >= minGzip {
		h["Vary"] = hdrVary
		if acceptsGzip(r.Header.Get("Accept-Encoding")) {
			if gz := gzipFast(body); gz != nil { // nil: it would save too little
				body, h["Content-Encoding"] = gz, hdrGzip
			}
		}
	}
	h.Set("Content-Length", strconv.Itoa(len(body)))
	w.WriteHeader(code)
	if r.Method != http.MethodHead {
		w.Write(body)
	}
}

// lampNotesAsFed gives the "no lamps needed" notes of the preview (or the
// table) cal whose stretch of dates outlasts it ("No lamps needed through 14 Jun")
// the title the subscribed feed gives them on the same dates: the feed,
// feedDays long from the preview's first date, looks further and says until
// when ("No lamps needed until 2 Jul", the first date that needs lamps
// again), or through its own last date. The year computed for the
// subscription's window (lamps, see fitDays) says when lamps are needed
// again; only when it cannot (near the end of the dates served, where the
// year ends before the feed) is the feed's lighting computed for the notes.
func (s *Server) lampNotesAsFed(ctx context.Context, q AdhocQuery, feedDays int, lamps *yearLamps, cal *feed.Calendar) error {
	if feedDays <= q.Days {
		return nil
	}
	last := q.Start.AddDate(0, 0, feedDays-1)
	open := func(e *feed.Entry) bool { return feed.IsNoLampsNote(e) && e.Facts.Until.IsZero() }
	var kinds []string // those the year does not answer for
	for i := range cal.Entries {
		e := &cal.Entries[i]
		if !open(e) {
			continue
		}
		if until, ok := lamps.until(e.Kind, e.Date, last); ok {
			if err := feed.LampNoteWithin(e, until, last); err != nil {
				return err
			}
		} else if !slices.Contains(kinds, e.Kind) {
			kinds = append(kinds, e.Kind)
		}
	}
	if len(kinds) == 0 {
		return nil
	}
	q.Kinds, q.Days = kinds, feedDays
	long, err := s.compute(ctx, q)
	if err != nil {
		return err
	}
	defer long.Release()
	for i := range cal.Entries {
		e := &cal.Entries[i]
		if !open(e) || !slices.Contains(kinds, e.Kind) {
			continue
		}
		for j := range long.Entries {
			if f := &long.Entries[j]; feed.IsNoLampsNote(f) && f.Kind == e.Kind && f.Date.Equal(e.Date) {
				e.Title, e.Description = strings.Clone(f.Title), strings.Clone(f.Description)
				e.Facts.Until = f.Facts.Until
				break
			}
		}
	}
	return nil
}

// previewCalendar reads a preview or table query of at most maxDays days and
// computes its calendar of the first shown of them at most (q.Days; asked
// is the days the query asks for); start is the query's own start date (""
// when it gave none). It answers the request itself and reports false when the
// query is bad or the computation fails (computeFailed, for the page that
// computes what).
func (s *Server) previewCalendar(w http.ResponseWriter, r *http.Request, maxDays, shown int, fail failFunc, what string) (q AdhocQuery, cal *feed.Calendar, start string, asked int, ok bool) {
	q, hasStart, err := s.previewQuery(r, previewDays, maxDays)
	if err != nil {
		fail(w, http.StatusBadRequest, err.Error())
		return q, nil, "", 0, false
	}
	asked, q.Days = q.Days, min(q.Days, shown)
	cal, err = s.compute(r.Context(), q)
	if s.computeFailed(w, q, err, fail, what) {
		return q, nil, "", 0, false
	}
	if hasStart {
		start = q.Start.Format(time.DateOnly)
	}
	return q, cal, start, asked, true
}

// failFunc answers a refused or failed request with its status and message:
// plain for /at.json (the builder's script shows the text), an HTML page for
// the table /at that people open from a shared link.
type failFunc func(w http.ResponseWriter, code int, msg string)

// computeFailed answers a failed computation of the page that computes
// what ("the preview", "the table") and reports whether it did: an
// internal error's message names what failed.
func (s *Server) computeFailed(w http.ResponseWriter, q AdhocQuery, err error, fail failFunc, what string) bool {
	var qe *QueryError
	switch {
	case err == nil:
		return false
	case errors.As(err, &qe):
		fail(w, http.StatusBadRequest, qe.Error())
	case busy(err):
		tryLater(w, fail, "server busy; try again shortly")
	default:
		s.log.Error(strings.TrimPrefix(what, "the ")+" failed", "query", q.String(), "err", err)
		fail(w, http.StatusInternalServerError, "internal error computing "+what)
	}
	return true
}

// days groups the calendar's entries by local date, every date of the
// window listed (a date may have no entry: polar day or night).
func days(cal *feed.Calendar, q AdhocQuery) []previewDay {
	loc := q.Location
	out := make([]previewDay, q.Days)
	index := map[string]int{}
	for i := range out {
		d := q.Start.AddDate(0, 0, i)
		out[i] = previewDay{Date: d.Format(time.DateOnly), Weekday: d.Format("Mon"), Clocks: feed.ClockChange(d, loc), Entries: []previewEntry{}}
		index[out[i].Date] = i
	}
	for _, e := range cal.Entries {
		date := e.Date
		if date.IsZero() {
			date = e.Start
		}
		i, ok := index[date.Format(time.DateOnly)]
		if !ok {
			continue
		}
		// a row is one date among others: a note's "today" would name the
		// wrong day (feed.RowTitle)
		pe := previewEntry{Kind: e.Kind, Title: feed.RowTitle(&e), feedTitle: e.Title}
		if !e.AllDay {
			row := out[i].Date
			start := feed.ToMinute(e.Start).In(loc) // shown to the minute: the one rounding rule
			pe.Time, pe.When, pe.StartUTC = start.Format("15:04"), clockOn(start, row), feed.UTCStamp(e.Start)
			if d := start.Format(time.DateOnly); d != row {
				pe.StartDate = d
			}
			switch {
			case e.Facts.Open: // its End is these days' end, not the Sun's leaving the band
				pe.Open, pe.When = true, "from "+pe.When
			case !e.End.IsZero():
				end := feed.ToMinute(e.End).In(loc)
				pe.End, pe.EndUTC = end.Format("15:04"), feed.UTCStamp(e.End)
				if end.Format(time.DateOnly) != start.Format(time.DateOnly) {
					pe.EndDate = end.Format(time.DateOnly)
					pe.When += "–" + clockOn(end, row)
				} else {
					pe.When += "–" + pe.End + twiceLabel(end)
				}
				pe.Clocks = feed.ClocksDuring(e.Start, e.End, loc)
			}
		}
		out[i].Entries = append(out[i].Entries, pe)
	}
	for _, d := range out {
		// the all-day entries first and in the feeds' order
		// (feed.AllDayOrder), the timed ones in the order of their times
		slices.SortStableFunc(d.Entries, func(a, b previewEntry) int {
			switch {
			case (a.Time == "") != (b.Time == ""):
				if a.Time == "" {
					return -1
				}
				return 1
			case a.Time != "":
				return 0
			}
			return feed.AllDayOrder(a.Kind, a.feedTitle, b.Kind, b.feedTitle)
		})
	}
	return out
}

// clockOn writes the local time t as "15:04", led by its weekday ("Mon
// 01:59") when it falls on another date than row (YYYY-MM-DD), and
// followed by its zone's label (feed.ZoneLabel, as the feeds' descriptions
// write every time) when the clocks show its reading twice: "00:48 CDT",
// the first pass, or "00:48 CST", the second (America/Havana, 7 November
// 2027).
func clockOn(t time.Time, row string) string {
	layout := "15:04"
	if t.Format(time.DateOnly) != row {
		layout = "Mon 15:04"
	}
	return t.Format(layout) + twiceLabel(t)
}

// twiceLabel is what follows the local time t as clockOn writes it: its
// zone's label after a space when the clocks show its reading twice
// (feed.ShownTwice), else nothing.
func twiceLabel(t time.Time) string {
	if !feed.ShownTwice(t) {
		return ""
	}
	abbr, _ := t.Zone()
	return " " + feed.ZoneLabel(abbr)
}

// qrDataURL draws text as a QR code (error correction M, 4-module quiet
// zone) in an SVG data: URL; empty if it does not fit.
func qrDataURL(text string) string {
	c, err := qr.Encode(text, qr.M)
	if err != nil {
		return ""
	}
	const quiet = 4
	n := c.Size + 2*quiet
	var b strings.Builder
	fmt.Fprintf(&b, `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 %d %d" shape-rendering="crispEdges">`, n, n)
	fmt.Fprintf(&b, `<rect width="%d" height="%d" fill="#fff"/><path fill="#000" d="`, n, n)
	for y := 0; y < c.Size; y++ {
		for x := 0; x < c.Size; {
			if !c.Black(x, y) {
				x++
				continue
			}
			run := 1
			for x+run < c.Size && c.Black(x+run, y) {
				run++
			}
			fmt.Fprintf(&b, "M%d %dh%dv1h-%dz", x+quiet, y+quiet, run, run)
			x += run
		}
	}
	b.WriteString(`"/></svg>`)
	return "data:image/svg+xml;base64," + base64.StdEncoding.EncodeToString([]byte(b.String()))
}

// htmlHeaders are the headers of the served HTML pages.
func htmlHeaders(w http.ResponseWriter) {
	h := w.Header()
	h.Set("Content-Type", "text/html; charset=utf-8")
	h["Content-Security-Policy"] = hdrCSP
	h["Cache-Control"] = hdrNoStore
	h.Set("Referrer-Policy", "no-referrer")
}

func (s *Server) render(w http.ResponseWriter, r *http.Request, name string, data any) {
	s.renderStatus(w, r, http.StatusOK, name, data)
}

// renderStatus answers with the page name made of data, under status code.
func (s *Server) renderStatus(w http.ResponseWriter, r *http.Request, code int, name string, data any) {
	var buf bytes.Buffer
	if err := pageTemplates().ExecuteTemplate(&buf, name, data); err != nil {
		s.log.Error("page template failed", "page", name, "err", err)
		plain(w, http.StatusInternalServerError, "internal error")
		return
	}
	htmlHeaders(w)
	writeBody(w, r, code, buf.Bytes())
}

// tableView is the data of table.html.
type tableView struct {
	Page        PageInfo
	Title, Zone string
	Coords      string // under the heading: the coordinates (unless the heading names the place by them), elevation, horizon
	HTTPS       string
	// Webcal is the subscribe link; html/template would replace a plain
	// string of the webcal: scheme with "#ZgotmplZ" (it lets only http,
	// https and mailto through), leaving the button dead.
	Webcal   template.URL
	Link, QR template.URL
	// SubscribeNote says the subscription's window, as the builder's
	// preview says it (subscribeNote); "" without ad-hoc feeds.
	SubscribeNote string
	Days          []previewDay
	From, To      string
	Builder       bool
	// Another is the builder's address filled with this table's query
	// ("make another": AdhocQuery.builderQuery), relative to the page.
	Another string
	Legal   bool
}

func (s *Server) serveTable(w http.ResponseWriter, r *http.Request) {
	fail := s.tableFailed(r)
	q, cal, start, _, ok := s.previewCalendar(w, r, maxTable, maxTable, fail, "the table")
	if !ok {
		return
	}
	// the subscribe link asks for the days that fit, as the preview's does:
	// without them a year over the size limit would be refused; a "no
	// lamps needed" note says until when as that feed does, not through
	// the table's last date
	subDays, ok := s.subscription(w, r, q, cal, fail, "the table")
	if !ok {
		return
	}
	https, page := s.links(r, q, start, subDays, q.Days)
	// the heading names a place without a name by its coordinates: the
	// line under it does not say them again
	place := feed.Coords(q.Latitude, q.Longitude, 4) + fmt.Sprintf(", %g m", q.Elevation)
	if q.Name == "" {
		place = fmt.Sprintf("Elevation %g m", q.Elevation)
	}
	v := tableView{Page: s.page(), Title: cal.Title, Zone: q.Location.String(),
		Coords: place + q.horizonWords(),
		HTTPS:  https, Webcal: template.URL(webcal(https)), Link: template.URL(page), QR: template.URL(qrDataURL(page)), SubscribeNote: subscribeNote(subDays),
		Days: days(cal, q), From: q.Start.Format(time.DateOnly), To: q.Start.AddDate(0, 0, q.Days-1).Format(time.DateOnly),
		Builder: !s.page().NoBuilder, Another: "./?" + q.builderQuery(start), Legal: slices.ContainsFunc(q.Kinds, LegalKind)}
	s.render(w, r, "table.html", v)
}

// headView is the data of head.html's headAt: the page's title, and Up,
// the way from the page's folder up to the root's ("../../" for /a/b/c),
// before the addresses of the page's own files.
type headView struct{ Up, Title string }

// notFoundView is the data of notfound.html.
type notFoundView struct {
	Page    PageInfo
	Up      string // as headView's
	Message string
	Builder bool
}

// maxNotFoundDepth is the deepest address a browser is answered a page
// for when nothing is there; deeper, the plain text of any other client.
const maxNotFoundDepth = 16

// notFound answers a request for nothing: a browser (one that accepts
// HTML) with a page in the site's language and style that says so and
// links to the main page, so that a phone shows it at its width and a
// screen reader has its title, language and heading; any other client (a
// calendar app, a script) with the plain text msg.
func (s *Server) notFound(w http.ResponseWriter, r *http.Request, msg string) {
	depth := strings.Count(r.URL.Path, "/") - 1
	if !strings.Contains(r.Header.Get("Accept"), "text/html") || depth < 0 || depth > maxNotFoundDepth {
		plain(w, http.StatusNotFound, msg)
		return
	}
	s.renderStatus(w, r, http.StatusNotFound, "notfound.html", notFoundView{
		Page: s.page(), Up: strings.Repeat("../", depth), Builder: !s.page().NoBuilder,
		Message: "Nothing is published at " + quoteValue(r.URL.Path) + ". A calendar's address may have changed: the main page lists them all.",
	})
}

// errorView is the data of error.html.
type errorView struct {
	Page    PageInfo
	Message string
	Builder bool
	// Again is the builder's address with the refused table's query: the
	// builder keeps what it can use and says what it leaves out
	// (builderFill).
	Again string
}

// tableFailed answers a table that cannot be shown with a page that says
// why, in the page's language and style, and leads back to the builder.
func (s *Server) tableFailed(r *http.Request) failFunc {
	return func(w http.ResponseWriter, code int, msg string) {
		again := "./"
		if r.URL.RawQuery != "" {
			again += "?" + r.URL.RawQuery
		}
		s.renderStatus(w, r, code, "error.html", errorView{Page: s.page(), Message: strings.TrimPrefix(msg, "serve: "), Builder: !s.page().NoBuilder, Again: again})
	}
}

// page is the page settings with their defaults.
func (s *Server) page() PageInfo { return *s.pageInfo.Load() }

// homeFeed is one published feed on the page.
type homeFeed struct {
	ID, Title, Site, HTTPS string
}

type homeView struct {
	Page    PageInfo
	Builder bool
	Legal   bool
	Groups  []kindGroup
	Sites   []PageSite
	Feeds   []homeFeed // when the page has no sites: feeds.json's
	Index   string     // the published index.html (the sites' year charts), absolute
	// Fill is what the form opens with: the page's query (builderFill),
	// or its defaults, the server's today the date of the preview.
	Fill builderFill
}

func (s *Server) serveHome(w http.ResponseWriter, r *http.Request) {
	p := s.page()
	v := homeView{Page: p, Builder: !p.NoBuilder, Legal: p.Legal || !p.NoBuilder}
	v.Fill, v.Groups = s.builderFill(r.URL.RawQuery, s.now().Format(time.DateOnly))
	snap := s.snap.Load()
	base := s.baseFor(r)
	if snap != nil && snap.files[publish.IndexName] != nil {
		v.Index = base + publish.IndexName
	}
	if snap != nil && len(p.Sites) > 0 {
		for _, site := range p.Sites {
			ps := PageSite{Name: site.Name, Place: site.Place}
			for _, f := range site.Feeds {
				if snap.files[f.ID+".ics"] != nil { // only feeds being served
					f.HTTPS = feedAddress(base, f.ID+".ics")
					ps.Feeds = append(ps.Feeds, f)
				}
			}
			if len(ps.Feeds) > 0 {
				v.Sites = append(v.Sites, ps)
			}
		}
	} else if snap != nil && snap.files["feeds.json"] != nil {
		v.Feeds = feedLinks(snap.files["feeds.json"].data, base)
	}
	s.render(w, r, "builder.html", v)
}

// feedLinks lists the feeds of a feeds.json document with absolute URLs.
func feedLinks(doc []byte, base string) []homeFeed {
	doc, _ = withURLs(doc, base)
	var obj struct {
		Feeds []struct{ ID, Title, Site, URL string }
	}
	if json.Unmarshal(doc, &obj) != nil || obj.Feeds == nil {
		json.Unmarshal(doc, &obj.Feeds)
	}
	out := make([]homeFeed, 0, len(obj.Feeds))
	for _, f := range obj.Feeds {
		u, err := url.Parse(f.URL)
		if err != nil || (u.Scheme != "http" && u.Scheme != "https") || path.Ext(u.Path) != ".ics" {
			continue
		}
		out = append(out, homeFeed{ID: f.ID, Title: f.Title, Site: f.Site, HTTPS: f.URL})
	}
	return out
}
