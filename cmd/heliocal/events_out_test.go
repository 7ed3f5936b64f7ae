package main

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"runtime"
	"runtime/metrics"
	"slices"
	"strings"
	"testing"
	"time"

	"heliocal/astro"
	"heliocal/config"
	"heliocal/feed"
)

// The streamed JSON is byte for byte what encoding/json's indenting encoder
// writes for the same document, over several chunks, with notes (a polar
// site), spans named by their evening that start after midnight (dark
// windows), far-future uncertainties and a plain kind whose name is too
// long for its prepared text (sun-altitude:-1e-50 written out in full).
func TestEventsJSONStreamedAsEncoder(t *testing.T) {
	kinds := "sunrise,sunset,solar-noon,sun-altitude:-4,sun-altitude:-1e-50,civil-dusk,golden-hour,dark-window,moon-phases,seasons,perihelion,photoperiod:20h,lighting:16h"
	code, out, errOut := runCLI(t, "events", "--lat", "69.65", "--lon", "18.96", "--tz", "Europe/Oslo", "--from", "2098-06-01",
		"--to", "2099-09-30", "--kinds", kinds, "--max-illumination", "0.25", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	want, st := encoderJSON(t, 69.65, 18.96, "Europe/Oslo", kinds, 0.25, "2098-06-01", "2099-09-30")
	if st.chunks < 3 || st.notes == 0 || !strings.Contains(out, `"uncertainty_s"`) || !strings.Contains(out, `"dark-window"`) || !strings.Contains(out, `"lamp_s"`) ||
		!strings.Contains(out, `"sun-altitude:-0.00000000000000000000000000000000000000000000000001"`) {
		t.Fatalf("the case does not exercise the writer: %d chunks, %d notes", st.chunks, st.notes)
	}
	sameLines(t, out, want)
}

// The events that a chunk holds back (spans named by their evening that
// start after its last date: dark windows from a moonset or an
// astronomical dusk after midnight, at a site whose clock runs two and a
// half hours ahead of the Sun in summer) go in among the next chunk's
// events, which are written before them or after them, before the events
// of that chunk that start at the same instant, over eight years (16
// chunks), byte for byte as encoding/json writes the sorted listing.
func TestEventsJSONHeldSpliced(t *testing.T) {
	kinds := "dark-window,moonrise,moonset,astronomical-dusk,sunrise"
	code, out, errOut := runCLI(t, "events", "--lat", "43.37", "--lon", "-8.4", "--tz", "Europe/Madrid", "--from", "2030-01-01",
		"--to", "2037-12-31", "--kinds", kinds, "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	want, st := encoderJSON(t, 43.37, -8.4, "Europe/Madrid", kinds, 0, "2030-01-01", "2037-12-31")
	t.Logf("%d chunks, %d events held back: %d after an event of the next chunk, %d with one at the same instant", st.chunks, st.held, st.inside, st.ties)
	if st.chunks < 16 || st.inside == 0 || st.ties == 0 {
		t.Fatalf("the case does not exercise the splice: %d chunks, %d events held back, %d after an event of the next chunk, %d with one at the same instant",
			st.chunks, st.held, st.inside, st.ties)
	}
	sameLines(t, out, want)
}

// chunkStats counts what a listing's chunks hold: notes, events held back
// (starting after their chunk's last date), of them those that start
// after an event of the next chunk, and those that start at the same
// instant as one.
type chunkStats struct{ chunks, notes, held, inside, ties int }

// encoderJSON returns the document of the events command's JSON for the
// place and kinds on the dates from..to (YYYY-MM-DD) as encoding/json's
// Marshal writes it, one event a line (lineDocument): every chunk's events sorted by start, stable,
// and its notes in order.
func encoderJSON(t *testing.T, lat, lon float64, zone, kindList string, maxLit float64, fromText, toText string) (string, chunkStats) {
	t.Helper()
	// the place's name: its coordinates with their hemispheres, as the
	// README shows ("48.2000° N, 16.4000° E")
	ns, ew := "N", "E"
	if lat < 0 {
		ns = "S"
	}
	if lon < 0 {
		ew = "W"
	}
	name := fmt.Sprintf("%.4f° %s, %.4f° %s", math.Abs(lat), ns, math.Abs(lon), ew)
	site := &config.Site{ID: "place", Name: name, Latitude: lat, Longitude: lon}
	if err := site.TimeZone.UnmarshalText([]byte(zone)); err != nil {
		t.Fatal(err)
	}
	from, err := time.Parse(time.DateOnly, fromText)
	if err != nil {
		t.Fatal(err)
	}
	to, err := time.Parse(time.DateOnly, toText)
	if err != nil {
		t.Fatal(err)
	}
	kinds, err := parseKinds(kindList)
	if err != nil {
		t.Fatal(err)
	}
	specs := make([]config.KindSpec, len(kinds))
	for i, k := range kinds {
		specs[i] = config.KindSpec{Kind: k, MaxIllumination: maxLit}
	}
	sky, err := feed.NewSky(from, to)
	if err != nil {
		t.Fatal(err)
	}
	doc := struct {
		Events []jsonEvent `json:"events"`
		Notes  []jsonNote  `json:"notes"`
		Site   jsonSite    `json:"site"`
	}{Events: []jsonEvent{}, Notes: []jsonNote{}}
	var st chunkStats
	var events []feed.Event
	var held []time.Time // the starts of the chunk before's events held back
	loc := site.TimeZone.Location
	err = sky.EventChunks(context.Background(), feed.PlaceOf(site), specs, from, to, func(c feed.Chunk) error {
		c.Sort()
		st.chunks++
		for _, h := range held {
			before, same := false, false
			for i := range c.Events {
				before = before || c.Events[i].Start.Before(h)
				same = same || c.Events[i].Start.Equal(h)
			}
			if before {
				st.inside++
			}
			if same {
				st.ties++
			}
		}
		held = held[:0]
		next := astro.DateStart(loc, c.Last.Year(), c.Last.Month(), c.Last.Day()+1)
		for i := range c.Events {
			if !c.Events[i].Start.Before(next) {
				held = append(held, c.Events[i].Start)
				st.held++
			}
		}
		events = append(events, c.Events...)
		for _, n := range c.Notes {
			doc.Notes = append(doc.Notes, toJSONNote(n))
		}
		st.notes += len(c.Notes)
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	slices.SortStableFunc(events, func(a, b feed.Event) int { return a.Start.Compare(b.Start) })
	for _, e := range events {
		doc.Events = append(doc.Events, toJSONEvent(e))
	}
	doc.Site = jsonSite{sitePlace: sitePlace{Name: site.Name, Latitude: lat, Longitude: lon}, TimeZone: zone, From: fromText, To: toText}
	return lineDocument(t, doc.Events, doc.Notes, doc.Site), st
}

// lineDocument is the events document as encoding/json writes its parts:
// {"events": […], "notes": […], "site": {…}} with each event and note
// compact on a line of its own, four spaces in, and the site indented by
// two spaces.
func lineDocument(t *testing.T, events []jsonEvent, notes []jsonNote, site jsonSite) string {
	t.Helper()
	var b strings.Builder
	lines := func(name string, objs []any) {
		b.WriteString("  \"" + name + "\": [")
		for i, o := range objs {
			if i > 0 {
				b.WriteString(",")
			}
			line, err := json.Marshal(o)
			if err != nil {
				t.Fatal(err)
			}
			b.WriteString("\n    " + string(line))
		}
		if len(objs) > 0 {
			b.WriteString("\n  ")
		}
		b.WriteString("],\n")
	}
	b.WriteString("{\n")
	lines("events", anys(events))
	lines("notes", anys(notes))
	s, err := json.MarshalIndent(site, "  ", "  ")
	if err != nil {
		t.Fatal(err)
	}
	b.WriteString("  \"site\": " + string(s) + "\n}\n")
	return b.String()
}

func anys[T any](s []T) []any {
	a := make([]any, len(s))
	for i := range s {
		a[i] = s[i]
	}
	return a
}

// sameLines fails t at the first line where got and want differ.
func sameLines(t *testing.T, got, want string) {
	t.Helper()
	if got != want {
		a, b := strings.Split(got, "\n"), strings.Split(want, "\n")
		for i := range min(len(a), len(b)) {
			if a[i] != b[i] {
				t.Fatalf("line %d: streamed %q, encoding/json %q", i+1, a[i], b[i])
			}
		}
		t.Fatalf("streamed %d lines, encoding/json %d", len(a), len(b))
	}
}

// An empty result is still a complete document, in each format.
func TestEventsEmptyStreamed(t *testing.T) {
	for _, f := range []string{"json", "csv", "table"} {
		code, out, errOut := runCLI(t, "events", "--lat", "10", "--lon", "0", "--from", "2027-01-05", "--to", "2027-01-05",
			"--kinds", "perihelion", "--format", f)
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", f, code, errOut)
		}
		switch f {
		case "json":
			var doc map[string]any
			if err := json.Unmarshal([]byte(out), &doc); err != nil || !strings.Contains(out, `"events": [],`) {
				t.Errorf("json: %v\n%s", err, out)
			}
		case "csv":
			if out != strings.Join(eventsCSVHeader, ",")+"\n" {
				t.Errorf("csv: %q", out)
			}
		case "table":
			if !strings.HasSuffix(out, "\n\nDATE  TIME  KIND  DETAILS\n") {
				t.Errorf("table: %q", out)
			}
		}
	}
}

// heapPeakWriter discards what is written and samples the bytes of live
// and not yet collected heap objects at each write (every 64 KB of output);
// with collect, it collects the garbage first, so that it samples the live
// heap alone.
type heapPeakWriter struct {
	sample  []metrics.Sample
	peak    uint64
	collect bool
}

func (h *heapPeakWriter) Write(p []byte) (int, error) {
	if h.collect {
		runtime.GC()
	}
	metrics.Read(h.sample)
	h.peak = max(h.peak, h.sample[0].Value.Uint64())
	return len(p), nil
}

// checkMemoryFlat fails t when the heap seen while `events --format format`
// writes 50 years of five daily kinds is more than twice that of 5 years
// plus 8 MB (see heapPeakWriter for collect).
func checkMemoryFlat(t *testing.T, format string, collect bool) {
	t.Helper()
	if testing.Short() {
		t.Skip("computes 55 years of events")
	}
	peak := func(to string) uint64 {
		h := &heapPeakWriter{sample: []metrics.Sample{{Name: "/memory/classes/heap/objects:bytes"}}, collect: collect}
		runtime.GC()
		code := run(context.Background(), []string{"events", "--lat", "47.3", "--lon", "8.5", "--tz", "Europe/Zurich", "--from", "2020-01-01", "--to", to,
			"--kinds", "sunrise,sunset,solar-noon,civil-dawn,civil-dusk", "--format", format}, h, io.Discard, noEnv)
		if code != 0 {
			t.Fatalf("exit %d", code)
		}
		return h.peak
	}
	short, long := peak("2024-12-31"), peak("2069-12-31")
	t.Logf("heap peak while writing %s: 5 years %.1f MB, 50 years %.1f MB", format, float64(short)/1e6, float64(long)/1e6)
	if long > 2*short+8<<20 {
		t.Errorf("50 years take %.1f MB of heap, 5 years %.1f MB: memory grows with the span", float64(long)/1e6, float64(short)/1e6)
	}
}

// Memory does not grow with the span: the heap seen while writing 50 years
// of events is not more than that of 5 years plus a few megabytes (before
// streaming it was about 1 KB per event, here 70 MB for 50 years).
func TestEventsMemoryFlat(t *testing.T) { checkMemoryFlat(t, "json", false) }

// Each CSV column appears once.
func TestEventsCSVColumnsOnce(t *testing.T) {
	seen := map[string]bool{}
	for _, c := range eventsCSVHeader {
		if seen[c] {
			t.Errorf("column %q twice", c)
		}
		seen[c] = true
	}
}

// The JSON writer's own number and time formatting writes what
// encoding/json and feed.JSONTime write: rounded values of every size and sign,
// and instants across centuries (before 1970 too), leap days and half
// milliseconds, from time.Time and from Unix nanoseconds.
func TestEventsJSONFormatting(t *testing.T) {
	r := rand.New(rand.NewPCG(12, 34))
	for i := range 200_000 {
		digits := 2 + i%3
		x := (r.Float64() - 0.5) * math.Pow(10, float64(r.IntN(9)-3))
		if i%7 == 0 {
			x = float64(r.IntN(2001)-1000) / math.Pow(10, float64(digits)) // exact decimals, ±0 among them
		}
		v := math.Round(x*math.Pow(10, float64(digits))) / math.Pow(10, float64(digits))
		want, _ := json.Marshal(v)
		if got := appendRounded(nil, x, digits); string(got) != string(want) {
			t.Fatalf("%v to %d decimals: %s, encoding/json %s", x, digits, got, want)
		}
	}
	lo, hi := time.Date(1800, 1, 1, 0, 0, 0, 0, time.UTC).Unix(), time.Date(2201, 1, 1, 0, 0, 0, 0, time.UTC).Unix()
	var cache dayCache
	for i := range 200_000 {
		sec, ns := lo+r.Int64N(hi-lo), r.Int64N(1e9)
		if i%4 == 2 && cache.day != 0 {
			sec = cache.day*86400 - 86400 + r.Int64N(86400) // the cached day
		}
		if i%5 == 0 {
			ns = ns/1e6*1e6 + 499_999 + int64(i%3) // around half a millisecond
		}
		tm := time.Unix(sec, ns)
		var c dayCache
		if i%2 == 0 {
			c = cache // the day written before, or another
		}
		if got, want := string(c.appendUTCMillis(nil, tm)), feed.UTCStamp(tm); got != want {
			t.Fatalf("%v: %s, want %s", tm, got, want)
		}
		st := [24]byte([]byte("0000-00-00T00:00:00.000Z"))
		if c.putStamp(&st, tm.UnixNano()); string(st[:]) != feed.UTCStamp(tm) {
			t.Fatalf("%v: written over the zeros %s, want %s", tm, st, feed.UTCStamp(tm))
		}
		if got, want := string(c.appendCivilDate(nil, tm)), tm.UTC().Format(time.DateOnly); got != want {
			t.Fatalf("%v: date %s, want %s", tm, got, want)
		}
		cache = c
	}
}

// appendRounded writes what encoding/json writes for every number of
// decimals it takes (1–6), at magnitudes from 1e-8 to 1e17 (across 1e15
// units, where it hands over to appendJSONFloat), for halves, which
// math.Round takes away from zero, and for zeros of either sign.
func TestEventsJSONRoundedEdges(t *testing.T) {
	r := rand.New(rand.NewPCG(56, 78))
	edges := []float64{0, math.Copysign(0, -1), 0.125, -0.125, 0.5, -0.5, 2.5, -2.5, 0.0025, -0.004,
		9999999999999.99, 10000000000000, 99999999999.9999, 1e11, -999999999.999999, 1e15, 123456789012345.6}
	for digits := 1; digits <= 6; digits++ {
		scale := math.Pow(10, float64(digits))
		xs := slices.Clone(edges)
		for e := -8; e <= 17; e++ {
			for range 200 {
				xs = append(xs, (r.Float64()-0.5)*math.Pow(10, float64(e)))
			}
			xs = append(xs, -(float64(r.Int64N(1_000_000))+0.5)/scale) // a half in the last decimal
		}
		for _, x := range xs {
			want, _ := json.Marshal(math.Round(x*scale) / scale)
			if got := appendRounded(nil, x, digits); string(got) != string(want) {
				t.Fatalf("%v to %d decimals: %s, encoding/json %s", x, digits, got, want)
			}
		}
	}
}

// The CSV rows of the kinds written directly (plainCSVRow) are those of the
// general path (the event's JSON object, field by field), at a polar site
// (dates without sunrise, days after midnight) with a clock change, for
// every plain kind: golden and blue hours with their parts, a threshold
// crossed both ways.
func TestEventsCSVPlainRows(t *testing.T) {
	first, last := time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC), time.Date(2026, 12, 31, 0, 0, 0, 0, time.UTC)
	sky, err := feed.NewSky(first, last)
	if err != nil {
		t.Fatal(err)
	}
	loc, err := time.LoadLocation("Europe/Oslo")
	if err != nil {
		t.Fatal(err)
	}
	var specs []config.KindSpec
	for name := range plainJSONKinds {
		if name == "sun-altitude" {
			name = "sun-altitude:-4"
		}
		k, err := config.ParseKind(name)
		if err != nil {
			t.Fatal(err)
		}
		specs = append(specs, config.KindSpec{Kind: k})
	}
	p := feed.Place{Observer: astro.Observer{Latitude: 69.65, Longitude: 18.96}, Location: loc}
	events, _, err := sky.EventsFor(context.Background(), p, specs, first, last)
	if err != nil {
		t.Fatal(err)
	}
	seen := map[string]bool{}
	for i := range events {
		e := &events[i]
		local := map[string]string{"start_local": localStamp(e.Start, loc)}
		if !e.End.IsZero() {
			local["end_local"] = localStamp(e.End, loc)
		}
		want := csvRow(toJSONEvent(*e), local)
		if got := plainCSVRow(e, loc); !slices.Equal(got, want) {
			t.Fatalf("%s %s: row %q, want %q", e.Kind, e.Start, got, want)
		}
		seen[e.Kind.Name] = true
	}
	if len(seen) != len(plainJSONKinds) {
		t.Errorf("kinds seen %v, want all of %d", seen, len(plainJSONKinds))
	}
}

// pieceRecorder records the size of each write and fails every write from
// the failAt-th on (0: never), having written half of it, as a disk that
// fills up does.
type pieceRecorder struct {
	bytes.Buffer
	sizes  []int
	failAt int
}

var errPieceFull = errors.New("no space left on device")

func (r *pieceRecorder) Write(b []byte) (int, error) {
	if r.failAt > 0 && len(r.sizes)+1 >= r.failAt {
		r.sizes = append(r.sizes, -len(b))
		n, _ := r.Buffer.Write(b[:len(b)/2])
		return n, errPieceFull
	}
	r.sizes = append(r.sizes, len(b))
	return r.Buffer.Write(b)
}

// pieces hands the system the text whole, in writes of writePiece bytes
// (the buffered start topped up to one, then the whole pieces, the rest
// buffered), and returns a failed write's error at once and at every
// later call, also for text that fits the buffer.
func TestPieceWriter(t *testing.T) {
	text := make([]byte, 3*writePiece+500)
	for i := range text {
		text[i] = byte('a' + i%26)
	}
	r := &pieceRecorder{}
	w := &pieceWriter{Writer: bufio.NewWriterSize(r, writePiece), raw: r}
	for _, b := range [][]byte{text[:100], text[100:]} {
		if err := w.pieces(b); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Flush(); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(r.Bytes(), text) || !slices.Equal(r.sizes, []int{writePiece, writePiece, writePiece, 500}) {
		t.Errorf("writes of %v bytes (%d in all), want %d, %d, %d, 500 making up the text", r.sizes, r.Len(), writePiece, writePiece, writePiece)
	}
	r = &pieceRecorder{failAt: 1}
	w = &pieceWriter{Writer: bufio.NewWriterSize(r, writePiece), raw: r}
	if err := w.pieces(text[:100]); err != nil {
		t.Fatalf("buffered text: %v", err)
	}
	if err := w.pieces(text[100 : 100+writePiece]); err != errPieceFull {
		t.Fatalf("a piece that fills the buffer: %v, want %v", err, errPieceFull)
	}
	if err := w.pieces(text[:10]); err != errPieceFull {
		t.Errorf("text that fits the buffer after a failed write: %v, want %v", err, errPieceFull)
	}
}

// The supported dates, as the README states them: every kind from
// 1800-01-01 to 2200-12-31 (local dates), for a place and for a configured
// feed; a range that reaches a day past either end is refused with exit 2,
// naming the range, and nothing on standard output.
func TestEventsSupportedDates(t *testing.T) {
	for _, where := range [][]string{
		{"--lat", "48.2", "--lon", "16.4", "--tz", "Europe/Vienna", "--kinds", "sunrise,moonrise,dark-window,daily-summary"},
		{"--feed", "cairnmoor-twilight"},
	} {
		for _, r := range [][2]string{{"1800-01-01", "1800-01-02"}, {"2200-12-30", "2200-12-31"}} {
			code, out, errOut := runCLI(t, append([]string{"events", "--from", r[0], "--to", r[1], "--format", "csv"}, where...)...)
			if code != 0 || !strings.Contains(out, "\n"+r[0]+",") || !strings.Contains(out, "\n"+r[1]+",") {
				t.Errorf("%v %s..%s: exit %d, stderr %q; want events on both dates:\n%s", where, r[0], r[1], code, errOut, out)
			}
		}
		for _, r := range [][2]string{{"1799-12-31", "1800-01-01"}, {"2200-12-31", "2201-01-01"}} {
			code, out, errOut := runCLI(t, append([]string{"events", "--from", r[0], "--to", r[1]}, where...)...)
			if code != exitInput || out != "" || !strings.Contains(errOut, "--from/--to: "+r[0]+".."+r[1]+": outside the supported dates 1800-01-01..2200-12-31") {
				t.Errorf("%v %s..%s: exit %d, stdout %q, stderr %q; want 2 naming the supported dates", where, r[0], r[1], code, out, errOut)
			}
		}
	}
}
