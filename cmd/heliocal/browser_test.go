package main

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"io"
	"log/slog"
	"net/http"
	"net/http/httptest"
	"net/url"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	ics "github.com/arran4/golang-ical"
	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/chromedp"
	"github.com/chromedp/chromedp/kb"

	"heliocal/config"
	"heliocal/feed"
	"heliocal/feed/serve"
)

// These tests drive a real browser (Debian's chromium) through the served
// page. Screenshots go to $HELIOCAL_SCREENSHOTS when it is set (the
// README's docs/img/*.png are made with HELIOCAL_SCREENSHOTS=$PWD/docs/img),
// else to the test's temporary directory.

// builderServer serves the demo configuration with the builder, as
// `heliocal serve` does, on 127.0.0.1.
func builderServer(t *testing.T) *httptest.Server {
	t.Helper()
	return builderServerFor(t, filepath.Join("..", "..", "config", "demo.yaml"))
}

// builderServerFor is builderServer for the configuration file at path.
func builderServerFor(t *testing.T, path string) *httptest.Server {
	t.Helper()
	ts := httptest.NewServer(builderHandler(t, path))
	t.Cleanup(ts.Close)
	return ts
}

// builderHandler is the handler of builderServerFor.
func builderHandler(t *testing.T, path string) http.Handler {
	t.Helper()
	cfg, err := config.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	set := func() adhocSettings { return adhocSettings{layout: newLayout(""), refresh: 24 * time.Hour} }
	srv, err := serve.New(serve.Options{
		Logger:            slog.New(slog.DiscardHandler),
		Build:             serveBuild(cfg, "", slog.New(slog.DiscardHandler)),
		Adhoc:             adhocFeedFrom(set),
		Preview:           adhocCalendarFrom(set),
		AdhocDefaultKinds: []string{"sunrise", "sunset", "civil-dawn", "civil-dusk"},
		Page:              pageInfo(cfg),
	})
	if err != nil {
		t.Fatal(err)
	}
	if err := srv.Refresh(t.Context()); err != nil {
		t.Fatal(err)
	}
	return srv.Handler()
}

// browser starts a headless chromium with a fresh profile, or skips the
// test when chromium is not installed.
func browser(t *testing.T) context.Context {
	t.Helper()
	path, err := exec.LookPath("chromium")
	if err != nil {
		t.Skip("chromium is not installed (apt-get install chromium; .ci/run installs it)")
	}
	alloc, cancelAlloc := chromedp.NewExecAllocator(context.Background(),
		chromedp.ExecPath(path),
		chromedp.Headless,
		chromedp.NoSandbox,
		chromedp.DisableGPU,
		chromedp.Flag("disable-quic", true),
		chromedp.NoFirstRun,
		chromedp.NoDefaultBrowserCheck,
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true),
		chromedp.UserDataDir(t.TempDir()),
		chromedp.WindowSize(1280, 900),
	)
	ctx, cancelCtx := chromedp.NewContext(alloc)
	ctx, cancelTimeout := context.WithTimeout(ctx, 90*time.Second)
	t.Cleanup(func() { cancelTimeout(); cancelCtx(); cancelAlloc() })
	if err := chromedp.Do(ctx); err != nil {
		t.Fatalf("starting chromium: %v", err)
	}
	return ctx
}

func screenshotDir(t *testing.T) string {
	if d := os.Getenv("HELIOCAL_SCREENSHOTS"); d != "" {
		return d
	}
	return t.TempDir()
}

// shot saves a full-page screenshot (PNG).
func shot(t *testing.T, ctx context.Context, name string) {
	t.Helper()
	save(t, ctx, name, chromedp.FullScreenshot(100))
}

// save saves the image an action takes.
func save(t *testing.T, ctx context.Context, name string, take chromedp.Action[[]byte]) {
	t.Helper()
	png, err := chromedp.Run(ctx, take)
	if err != nil {
		t.Fatal(err)
	}
	p := filepath.Join(screenshotDir(t), name)
	if err := os.WriteFile(p, png, 0o644); err != nil {
		t.Fatal(err)
	}
	t.Logf("screenshot %s (%d bytes)", p, len(png))
}

// layoutProblems lists what is wrong with the page at the current width:
// horizontal scrolling, inputs without a label, controls the keyboard
// cannot reach.
const layoutProblems = `(() => {
  const out = [];
  const w = document.documentElement.clientWidth;
  if (document.documentElement.scrollWidth > w) out.push("scrolls horizontally: " + document.documentElement.scrollWidth + " > " + w);
  for (const el of document.querySelectorAll("input, select, textarea, button")) {
    if (el.type === "hidden") continue;
    const named = (el.labels && el.labels.length > 0) || el.getAttribute("aria-label") || (el.tagName === "BUTTON" && el.textContent.trim());
    if (!named) out.push("no label: " + (el.id || el.outerHTML.slice(0, 60)));
    if (el.tabIndex < 0 || el.disabled) out.push("not reachable from the keyboard: " + (el.id || el.outerHTML.slice(0, 60)));
  }
  return out;
})()`

// previewRows reads the preview table: one "date kind time" line per entry.
const previewRows = `[...document.querySelectorAll("#preview tr")].flatMap(tr => {
  const date = tr.querySelector("th").textContent.split(" ")[1];
  return [...tr.querySelectorAll("li")].map(li => date + " " + li.dataset.kind + " " + (li.querySelector(".t") ? li.querySelector(".t").textContent : ""));
})`

// The builder, filled for a known place and date, previews the same times
// as `heliocal events`; its subscribe link is an absolute URL of a feed
// that parses; its table link shows the same days; the page fits 1280 px
// and 390 px without horizontal scrolling, with every input labelled.
func TestBrowserBuilder(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	// Santiago de Chile, given in degrees and minutes: 33°27′S 70°40′W.
	const lat, lon, from = -33.45, -70.6667, "2026-06-21"
	id := func(s string) chromedp.ID { return chromedp.ID(s) }
	if err := chromedp.Do(ctx,
		chromedp.Navigate(ts.URL+"/"),
		chromedp.WaitVisible(id("lat")),
		chromedp.SendKeys(id("lat"), "33°27′S"),
		chromedp.SendKeys(id("lon"), "70 40 0 W"),
		chromedp.SendKeys(id("name"), "Quebrada vineyard"),
		chromedp.Click(id("k-golden-hour")),
		chromedp.SetValue(id("start"), from),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("builder").dispatchEvent(new Event("input"))`),
		chromedp.Poll[chromedp.Void](`(() => { const th = document.querySelector("#preview th"); return th && th.textContent.includes("`+from+`") && document.getElementById("tz-found").textContent.startsWith("America/Santiago"); })()`),
	); err != nil {
		state, _ := chromedp.Run(ctx, chromedp.Evaluate[string](`JSON.stringify({message: document.getElementById("message").textContent, zone: document.getElementById("tz-found").textContent, lat: document.getElementById("lat").value, lon: document.getElementById("lon").value, start: document.getElementById("start").value, first: (document.querySelector("#preview th") || {}).textContent})`))
		shot(t, ctx, "builder-failed.png")
		t.Fatalf("filling the builder: %v; page state %s", err, state)
	}
	got, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](previewRows))
	if err != nil {
		t.Fatal(err)
	}
	// the preview's heading names the days it shows, those from the date
	// chosen (21 June 2026 is a Sunday), not "the next seven days"
	if h, err := chromedp.Run(ctx, chromedp.Text(id("days-h"))); err != nil || h != "Seven days from Sun "+from {
		t.Errorf("the preview's heading reads %q (%v), want %q", h, err, "Seven days from Sun "+from)
	}
	attr := func(sel, name string) string {
		t.Helper()
		v, err := chromedp.Run(ctx, chromedp.AttributeValue(id(sel), name))
		if err != nil {
			t.Fatal(err)
		}
		return v.Value
	}
	https, err := chromedp.Run(ctx, chromedp.Value(id("https")))
	if err != nil {
		t.Fatal(err)
	}
	webcalHref, page, qr := attr("webcal", "href"), attr("page", "href"), attr("qr", "src")

	// The same week from the command line.
	kinds := "civil-dawn,sunrise,sunset,civil-dusk,golden-hour"
	code, out, errOut := runCLI(t, "events", "--lat", fmt.Sprint(lat), "--lon", fmt.Sprint(lon), "--kinds", kinds,
		"--from", from, "--to", "2026-06-27", "--format", "json")
	if code != 0 {
		t.Fatalf("heliocal events: exit %d: %s", code, errOut)
	}
	var ev struct {
		Events []struct {
			Kind       string
			Start, End time.Time
			Date       string
		}
	}
	if err := json.Unmarshal([]byte(out), &ev); err != nil {
		t.Fatal(err)
	}
	loc, _ := time.LoadLocation("America/Santiago")
	var want []string
	for _, e := range ev.Events {
		clock := feed.ToMinute(e.Start).In(loc).Format("15:04")
		if !e.End.IsZero() {
			clock += "–" + feed.ToMinute(e.End).In(loc).Format("15:04")
		}
		want = append(want, e.Date+" "+e.Kind+" "+clock)
	}
	slices.Sort(got)
	slices.Sort(want)
	if len(want) < 7*6 || !slices.Equal(got, want) {
		t.Errorf("the preview differs from heliocal events:\npreview: %q\nevents:  %q", got, want)
	}

	// The subscribe links are absolute and the feed parses.
	if !strings.HasPrefix(https, ts.URL+"/at.ics?") || webcalHref != "webcal://"+strings.TrimPrefix(https, "http://") {
		t.Errorf("subscribe links %q and %q, want absolute ones under %s", https, webcalHref, ts.URL)
	}
	if !strings.HasPrefix(qr, "data:image/svg+xml;base64,") {
		t.Errorf("QR code src %.40q, want an SVG data: URL", qr)
	}
	resp, err := http.Get(https)
	if err != nil {
		t.Fatal(err)
	}
	body, _ := io.ReadAll(resp.Body)
	resp.Body.Close()
	if resp.StatusCode != 200 || !strings.HasPrefix(resp.Header.Get("Content-Type"), "text/calendar") {
		t.Fatalf("GET %s: %d %s", https, resp.StatusCode, body)
	}
	cal, err := ics.ParseCalendar(bytes.NewReader(body))
	if err != nil {
		t.Fatalf("the subscribed feed does not parse: %v", err)
	}
	// A year of five kinds is over the 1 MB limit: the link asks for the
	// days that fit, and the feed is served whole.
	u, _ := url.Parse(https)
	days, _ := strconv.Atoi(u.Query().Get("days"))
	if n := len(cal.Events()); days < 150 || days >= 365 || n < days*5 || len(body) > 1_000_000 {
		t.Errorf("the subscribed feed: days=%d, %d events, %d bytes; want the days that fit 1 MB, five or more events a day", days, n, len(body))
	}
	if !strings.Contains(string(body), "Quebrada vineyard") {
		t.Errorf("the feed does not carry the place's name")
	}

	for _, w := range []struct {
		width, height int64
		file          string
	}{{1280, 900, "builder-1280.png"}, {390, 844, "builder-390.png"}} {
		if err := chromedp.Do(ctx, chromedp.EmulateViewport(w.width, w.height)); err != nil {
			t.Fatal(err)
		}
		problems, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](layoutProblems))
		if err != nil {
			t.Fatal(err)
		}
		if len(problems) > 0 {
			t.Errorf("at %d px: %s", w.width, strings.Join(problems, "; "))
		}
		if w.width < 500 {
			save(t, ctx, w.file, chromedp.CaptureScreenshot()) // what a phone shows first
		} else {
			shot(t, ctx, w.file)
		}
	}
	// What a phone shows once the place is chosen: the result.
	save(t, ctx, "result-390.png", chromedp.Screenshot(id("result")))

	// A kind is chosen from the keyboard: space on its checkbox.
	if err := chromedp.Do(ctx, chromedp.Focus(id("k-blue-hour")), chromedp.SendKeys(id("k-blue-hour"), " ")); err != nil {
		t.Fatal(err)
	}
	if on, err := chromedp.Run(ctx, chromedp.Evaluate[bool](`document.getElementById("k-blue-hour").checked`)); err != nil || !on {
		t.Errorf("space on the blue-hour checkbox did not tick it (%v)", err)
	}

	// An offset from the builder: sunset 30 minutes earlier, in the
	// preview and in the feed's link.
	if err := chromedp.Do(ctx,
		chromedp.SetValue(id("off-sunset"), "-30"),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("builder").dispatchEvent(new Event("input"))`),
		chromedp.Poll[chromedp.Void](`document.getElementById("https").value.includes("offsets=sunset%3A-30m")`),
	); err != nil {
		t.Fatalf("sunset offset: %v", err)
	}
	shifted, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](previewRows))
	if err != nil {
		t.Fatal(err)
	}
	firstSunset := func(rows []string) time.Time {
		t.Helper()
		for _, r := range rows {
			if f := strings.Fields(r); len(f) == 3 && f[0] == from && f[1] == "sunset" {
				tm, err := time.Parse("15:04", f[2])
				if err != nil {
					t.Fatal(err)
				}
				return tm
			}
		}
		t.Fatalf("no sunset on %s in %q", from, rows)
		return time.Time{}
	}
	sunrise := func(rows []string) string { // the first date's sunrise row
		t.Helper()
		i := slices.IndexFunc(rows, func(s string) bool { return strings.HasPrefix(s, from+" sunrise ") })
		if i < 0 {
			t.Fatalf("no sunrise on %s in %q", from, rows)
		}
		return rows[i]
	}
	if d := firstSunset(want).Sub(firstSunset(shifted)); d != 30*time.Minute {
		t.Errorf("the preview's sunset with offset -30 minutes is %v before the plain one, want 30m", d)
	}

	// A skyline per direction from the builder: the points reach the
	// feed's link in their canonical form, and the preview's sunrise is
	// the one of `heliocal events --horizon` with the same points (hills
	// of 12° to the east-north-east, where the Sun rises at 33° S in June).
	const skyline = "0:2, 60:12,120:8,240:1"
	if err := chromedp.Do(ctx,
		chromedp.SetValue(id("horizon"), skyline),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("builder").dispatchEvent(new Event("input"))`),
		chromedp.Poll[chromedp.Void](`document.getElementById("https").value.includes("horizon=0%3A2%2C60%3A12%2C120%3A8%2C240%3A1")`),
	); err != nil {
		v, _ := chromedp.Run(ctx, chromedp.Evaluate[string](`document.getElementById("https").value + " | " + document.getElementById("message").textContent`))
		t.Fatalf("skyline in the builder: %v (%s)", err, v)
	}
	behind, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](previewRows))
	if err != nil {
		t.Fatal(err)
	}
	code, out, errOut = runCLI(t, "events", "--lat", fmt.Sprint(lat), "--lon", fmt.Sprint(lon), "--kinds", "sunrise",
		"--horizon", strings.ReplaceAll(skyline, " ", ""), "--from", from, "--to", from, "--format", "json")
	if code != 0 {
		t.Fatalf("heliocal events --horizon: exit %d: %s", code, errOut)
	}
	var rise struct{ Events []struct{ Start time.Time } }
	if err := json.Unmarshal([]byte(out), &rise); err != nil || len(rise.Events) != 1 {
		t.Fatalf("heliocal events --horizon: %v %s", err, out)
	}
	wantRise := from + " sunrise " + feed.ToMinute(rise.Events[0].Start).In(loc).Format("15:04")
	if !slices.Contains(behind, wantRise) || slices.Contains(behind, sunrise(want)) {
		t.Errorf("the preview behind the skyline lacks %q (or keeps the flat %q): %q", wantRise, sunrise(want), behind)
	}
	// A bad point: the server's message names the parameter and the point.
	if err := chromedp.Do(ctx,
		chromedp.SetValue(id("horizon"), "0:2,60:50"),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("builder").dispatchEvent(new Event("input"))`),
		chromedp.Poll[chromedp.Void](`document.getElementById("message").textContent.includes("parameter horizon=\"0:2,60:50\": point 2 (60:50): altitude must be within -5..45 degrees")`),
		chromedp.SetValue(id("horizon"), "0"),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("builder").dispatchEvent(new Event("input"))`),
		chromedp.Poll[chromedp.Void](`document.getElementById("message").hidden`),
		// 0 is a level horizon (no dip of the elevation): the link says it
		chromedp.Poll[chromedp.Void](`/[?&]horizon=0(&|$)/.test(document.getElementById("https").value)`),
	); err != nil {
		v, _ := chromedp.Run(ctx, chromedp.Evaluate[string](`document.getElementById("message").textContent`))
		t.Fatalf("a bad skyline in the builder: %v (message %q)", err, v)
	}

	// The shareable page: the same days as a printable table.
	if err := chromedp.Do(ctx,
		chromedp.EmulateViewport(390, 844),
		chromedp.Navigate(page),
		chromedp.WaitVisible(chromedp.CSS("table.days")),
	); err != nil {
		t.Fatal(err)
	}
	rows, err := chromedp.Run(ctx, chromedp.Evaluate[int](`document.querySelectorAll("table.days tbody tr").length`))
	if err != nil {
		t.Fatal(err)
	}
	text, err := chromedp.Run(ctx, chromedp.Text(chromedp.CSS("table.days")))
	if err != nil {
		t.Fatal(err)
	}
	if rows != 7 || !strings.Contains(text, "2026-06-21") {
		t.Errorf("the table page has %d rows from %q…, want 7 from %s", rows, text[:min(len(text), 40)], from)
	}
	if clock := sunrise(want)[strings.LastIndex(sunrise(want), " ")+1:]; !strings.Contains(text, clock) {
		t.Errorf("the table page lacks the first sunrise %s", clock)
	}
	problems, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](layoutProblems))
	if err != nil {
		t.Fatal(err)
	}
	if len(problems) > 0 {
		t.Errorf("table page at 390 px: %s", strings.Join(problems, "; "))
	}
	shot(t, ctx, "table-390.png")

	// Dark mode: the page follows prefers-color-scheme.
	if _, err := chromedp.Call(ctx, emulation.SetEmulatedMedia, emulation.SetEmulatedMediaParams{
		Features: []*emulation.MediaFeature{{Name: "prefers-color-scheme", Value: "dark"}}}); err != nil {
		t.Fatal(err)
	}
	if err := chromedp.Do(ctx,
		chromedp.EmulateViewport(1280, 900),
		chromedp.Navigate(ts.URL+"/"),
		chromedp.WaitVisible(id("lat")),
	); err != nil {
		t.Fatal(err)
	}
	bg, err := chromedp.Run(ctx, chromedp.Evaluate[string](`getComputedStyle(document.body).backgroundColor`))
	if err != nil {
		t.Fatal(err)
	}
	if bg != "rgb(16, 22, 29)" {
		t.Errorf("dark mode background %s, want the dark palette's rgb(16, 22, 29)", bg)
	}
	shot(t, ctx, "builder-dark-1280.png")
}

// contrastProblems lists the text elements of the page whose contrast with
// their background is below WCAG 2.1 SC 1.4.3 (AA): 4.5:1, or 3:1 for large
// text (at least 24 px, or 18.66 px bold). The contrast ratio is
// (L1 + 0.05) / (L2 + 0.05) with L the relative luminance of WCAG 2.1's
// definition: L = 0.2126 R + 0.7152 G + 0.0722 B, each channel c = C/255
// linearised as c/12.92 when c <= 0.04045, else ((c + 0.055)/1.055)^2.4.
// The background is the first opaque one of the element or its ancestors;
// a translucent text colour is laid over it. It also returns how many
// elements it measured.
const contrastProblems = `(() => {
  const rgba = (s) => { const m = s.match(/[\d.]+/g).map(Number); return [m[0], m[1], m[2], m.length > 3 ? m[3] : 1]; };
  const lum = ([r, g, b]) => { const f = (c) => { c /= 255; return c <= 0.04045 ? c / 12.92 : Math.pow((c + 0.055) / 1.055, 2.4); }; return 0.2126 * f(r) + 0.7152 * f(g) + 0.0722 * f(b); };
  const background = (el) => {
    for (; el; el = el.parentElement) { const c = rgba(getComputedStyle(el).backgroundColor); if (c[3] >= 1) return c; }
    return [255, 255, 255, 1];
  };
  const out = [];
  let measured = 0;
  for (const el of document.body.querySelectorAll("*")) {
    const ownText = [...el.childNodes].some((n) => n.nodeType === 3 && n.textContent.trim() !== "");
    const field = (el.tagName === "INPUT" && el.type !== "checkbox" && el.value !== "");
    if (!ownText && !field) continue;
    const st = getComputedStyle(el);
    if (el.getClientRects().length === 0 || st.visibility === "hidden") continue;
    const bg = background(el);
    const fg = rgba(st.color);
    const mix = fg.slice(0, 3).map((c, i) => c * fg[3] + bg[i] * (1 - fg[3]));
    const [a, b] = [lum(mix), lum(bg)];
    const ratio = (Math.max(a, b) + 0.05) / (Math.min(a, b) + 0.05);
    const size = parseFloat(st.fontSize), bold = parseInt(st.fontWeight, 10) >= 700;
    const need = size >= 24 || (bold && size >= 18.66) ? 3 : 4.5;
    measured++;
    if (ratio < need) out.push(el.tagName.toLowerCase() + (el.id ? "#" + el.id : el.className ? "." + el.className : "") + " " + JSON.stringify((el.value || el.textContent).trim().slice(0, 30)) + ": " + ratio.toFixed(2) + ":1 (" + st.color + " on rgb(" + bg.slice(0, 3).join(", ") + "), need " + need + ")");
  }
  return {measured, out};
})()`

// Every text of the builder page (labels, body text, links, buttons, the
// filled preview) and of the printable table page /at (its links, the
// day-by-day table with its times, notes and spans, the caution) meets the
// WCAG 2.1 AA contrast minimum (SC 1.4.3) at 1280 px, in the light and in
// the dark palette.
func TestBrowserContrast(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	// The table page with every sort of row: timed events, spans (golden
	// hour, dark windows), all-day notes (a Moon that does not rise).
	table := ts.URL + "/at?lat=-33.45&lon=-70.67&tz=America/Santiago&name=Quebrada%20vineyard&start=2026-06-21&days=10" +
		"&kinds=sunrise,sunset,civil-dawn,golden-hour,moonrise,dark-window,full-moon&alarm=15m"
	for _, scheme := range []string{"light", "dark"} {
		if _, err := chromedp.Call(ctx, emulation.SetEmulatedMedia, emulation.SetEmulatedMediaParams{
			Features: []*emulation.MediaFeature{{Name: "prefers-color-scheme", Value: scheme}}}); err != nil {
			t.Fatal(err)
		}
		for _, page := range []struct {
			name, url string
			ready     []chromedp.Action[chromedp.Void]
		}{
			{"builder", ts.URL + "/", []chromedp.Action[chromedp.Void]{
				chromedp.WaitVisible(chromedp.ID("lat")),
				chromedp.SendKeys(chromedp.ID("lat"), "-33.45"),
				chromedp.SendKeys(chromedp.ID("lon"), "-70.67"),
				chromedp.Poll[chromedp.Void](`document.getElementById("result").classList.contains("ready") && document.querySelector("#preview li") !== null`),
				// The message box is measured too: shown with a text of its own.
				chromedp.Evaluate[chromedp.Void](`(() => { const m = document.getElementById("message"); m.textContent = "Latitude: enter decimal degrees."; m.hidden = false; })()`),
			}},
			{"table", table, []chromedp.Action[chromedp.Void]{chromedp.WaitVisible(chromedp.CSS("table.days"))}},
			// The note on the values of the builder's link it left out.
			{"builder from a link", ts.URL + "/?lat=-33.45&lon=-70.67&tz=America/Santigo&kinds=sunrise,sunrize", []chromedp.Action[chromedp.Void]{
				chromedp.WaitVisible(chromedp.ID("fill-note")),
				chromedp.Poll[chromedp.Void](`document.querySelector("#preview li") !== null`),
			}},
		} {
			actions := append([]chromedp.Action[chromedp.Void]{chromedp.EmulateViewport(1280, 900), chromedp.Navigate(page.url)}, page.ready...)
			if err := chromedp.Do(ctx, actions...); err != nil {
				t.Fatalf("%s, %s: %v", page.name, scheme, err)
			}
			var res struct {
				Measured int
				Out      []string
			}
			got, err := chromedp.Run(ctx, chromedp.Evaluate[map[string]any](contrastProblems))
			if err != nil {
				t.Fatal(err)
			}
			b, _ := json.Marshal(got)
			if err := json.Unmarshal(b, &res); err != nil {
				t.Fatal(err)
			}
			t.Logf("%s, %s: %d text elements measured", page.name, scheme, res.Measured)
			if res.Measured < 50 {
				t.Errorf("%s, %s: only %d text elements measured", page.name, scheme, res.Measured)
			}
			for _, p := range res.Out {
				t.Errorf("%s, %s: contrast below WCAG 2.1 AA: %s", page.name, scheme, p)
			}
		}
	}
}

// fieldError reads what the page shows about a refused input: the inputs
// marked invalid (with what describes them), the message under an input
// and how far below that input it starts, in CSS pixels.
const fieldError = `(() => {
  const err = document.getElementById("field-error");
  const bad = [...document.querySelectorAll("[aria-invalid=true]")];
  const gap = bad.length && !err.hidden ? err.getBoundingClientRect().top - bad[0].getBoundingClientRect().bottom : -1;
  return {invalid: bad.map(e => e.id + " " + e.getAttribute("aria-describedby")), text: err.hidden ? "" : err.textContent, gap};
})()`

// On a 390 px phone the result card is screens below the place: a refused
// input is marked invalid and its message shown under it, whether the page
// refuses it (a latitude of 95°, over the −90..90 the form's help gives) or
// the server does (a time zone that is not in the IANA database, tz=Europe/Viena
// instead of Europe/Vienna); the mark goes once the input is corrected.
func TestBrowserBuilderFieldError(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	type state struct {
		Invalid []string
		Text    string
		Gap     float64
	}
	read := func(wait string) state {
		t.Helper()
		if err := chromedp.Do(ctx,
			chromedp.Evaluate[chromedp.Void](`document.getElementById("builder").dispatchEvent(new Event("input"))`),
			chromedp.Poll[chromedp.Void](wait),
		); err != nil {
			t.Fatalf("waiting for %s: %v", wait, err)
		}
		got, err := chromedp.Run(ctx, chromedp.Evaluate[map[string]any](fieldError))
		if err != nil {
			t.Fatal(err)
		}
		var s state
		b, _ := json.Marshal(got)
		if err := json.Unmarshal(b, &s); err != nil {
			t.Fatal(err)
		}
		return s
	}
	id := func(s string) chromedp.ID { return chromedp.ID(s) }
	if err := chromedp.Do(ctx,
		chromedp.EmulateViewport(390, 844),
		chromedp.Navigate(ts.URL+"/"),
		chromedp.WaitVisible(id("lat")),
		chromedp.SendKeys(id("lat"), "95"),
		chromedp.SendKeys(id("lon"), "10"),
	); err != nil {
		t.Fatal(err)
	}
	s := read(`document.getElementById("lat").getAttribute("aria-invalid") === "true"`)
	if !slices.Equal(s.Invalid, []string{"lat coord-help field-error"}) || !strings.HasPrefix(s.Text, "Latitude: ") || s.Gap < 0 || s.Gap > 120 {
		t.Errorf("latitude 95: %+v; want lat alone invalid, described by the message shown within 120 px under it", s)
	}

	if err := chromedp.Do(ctx, chromedp.SetValue(id("lat"), "47.05"), chromedp.SendKeys(id("tz"), "Europe/Viena")); err != nil {
		t.Fatal(err)
	}
	// typed a key at a time: wait for the answer to the whole name, not to
	// an earlier request's part of it ("Europe/V" is refused too)
	s = read(`document.getElementById("tz").getAttribute("aria-invalid") === "true" && document.getElementById("field-error").textContent.includes('tz="Europe/Viena"')`)
	if !slices.Equal(s.Invalid, []string{"tz tz-help field-error"}) || !strings.Contains(s.Text, `tz="Europe/Viena"`) || !strings.Contains(s.Text, "Europe/Vienna") || s.Gap < 0 || s.Gap > 120 {
		t.Errorf("time zone Europe/Viena: %+v; want tz alone invalid, the server's message (with its suggestion) within 120 px under it", s)
	}

	if err := chromedp.Do(ctx, chromedp.SetValue(id("tz"), "Europe/Vienna")); err != nil {
		t.Fatal(err)
	}
	s = read(`document.querySelector("[aria-invalid]") === null && document.getElementById("message").hidden`)
	if len(s.Invalid) != 0 || s.Text != "" {
		t.Errorf("corrected: %+v; want no input marked and no message", s)
	}
	if d, err := chromedp.Run(ctx, chromedp.AttributeValue(id("tz"), "aria-describedby")); err != nil || d.Value != "tz-help" {
		t.Errorf("corrected: tz described by %q (%v), want tz-help again", d.Value, err)
	}
}

// noneSplit runs script, which lists what a line break splits on the page
// in ctx, and reports each such piece of what (dates, amounts) as split
// where (the page and its width).
func noneSplit(t *testing.T, ctx context.Context, script, where, what string) {
	t.Helper()
	split, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](script))
	if err != nil {
		t.Fatal(err)
	}
	if len(split) > 0 {
		t.Errorf("%s splits %d %s: %s", where, len(split), what, strings.Join(split, "; "))
	}
}

// dateBreaks lists the row headings of the day-by-day tables (the page /at
// and the builder's preview) that a line break splits inside the date:
// "Tue 2026-12-" over "29". A heading may break after its weekday only.
const dateBreaks = `[...document.querySelectorAll("table.days tbody th")].flatMap(th => {
  const r = document.createRange(), out = [];
  let top = null, seen = "";
  const walk = document.createTreeWalker(th, NodeFilter.SHOW_TEXT);
  for (let node = walk.nextNode(); node; node = walk.nextNode()) {
    for (let i = 0; i < node.length; i++) {
      r.setStart(node, i); r.setEnd(node, i + 1);
      const y = r.getBoundingClientRect().top;
      if (top !== null && y > top + 2 && !/^[A-Z][a-z]{2} $/.test(seen)) out.push(JSON.stringify(seen) + " over " + JSON.stringify(th.textContent.slice(seen.length)));
      top = y;
      seen += node.data[i];
    }
  }
  return out;
})`

// introDates lists the dates of the line under the /at table page's
// heading ("… · times in Arctic/Longyearbyen · 2026-12-04 to 2027-01-02")
// as they are shown: "2026-12-" over "04" when a line break splits one.
var introDates = datesShown(".intro")

// datesShown lists the dates (YYYY-MM-DD) of the element the CSS selector
// sel picks as they are shown, as introDates does.
func datesShown(sel string) string {
	return `(() => {
  const p = document.querySelector(` + strconv.Quote(sel) + `), r = document.createRange(), chars = [];
  const walk = document.createTreeWalker(p, NodeFilter.SHOW_TEXT);
  for (let node = walk.nextNode(); node; node = walk.nextNode()) {
    for (let i = 0; i < node.length; i++) {
      r.setStart(node, i); r.setEnd(node, i + 1);
      chars.push([node.data[i], Math.round(r.getBoundingClientRect().top)]);
    }
  }
  const text = chars.map(c => c[0]).join("");
  return [...text.matchAll(/\d{4}-\d{2}-\d{2}/g)].map(m => {
    let out = "";
    for (let i = m.index; i < m.index + m[0].length; i++) {
      if (i > m.index && chars[i][1] > chars[i - 1][1] + 2) out += " over ";
      out += chars[i][0];
    }
    return JSON.stringify(out);
  });
})()`
}

// On a phone the dates of the day-by-day table (/at) and of the builder's
// preview are never split over two lines, down to a 320 px screen.
func TestBrowserDatesWhole(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	table := ts.URL + "/at?lat=78.22&lon=15.65&start=2026-12-04&days=30&name=Longyearbyen"
	for _, w := range []int64{390, 320} {
		if err := chromedp.Do(ctx, chromedp.EmulateViewport(w, 800), chromedp.Navigate(table), chromedp.WaitVisible(chromedp.CSS("table.days"))); err != nil {
			t.Fatal(err)
		}
		noneSplit(t, ctx, dateBreaks, fmt.Sprintf("the table page at %d px", w), "dates")
		intro, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](introDates))
		if err != nil {
			t.Fatal(err)
		}
		if strings.Join(intro, " ") != `"2026-12-04" "2027-01-02"` {
			t.Errorf("the table page's heading at %d px shows its dates as %s, want each on one line", w, strings.Join(intro, " and "))
		}
	}
	if err := chromedp.Do(ctx,
		chromedp.Navigate(ts.URL+"/"),
		chromedp.WaitVisible(chromedp.ID("lat")),
		chromedp.SendKeys(chromedp.ID("lat"), "-33.45"),
		chromedp.SendKeys(chromedp.ID("lon"), "-70.67"),
		chromedp.SetValue(chromedp.ID("start"), "2026-12-05"),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("builder").dispatchEvent(new Event("input"))`),
		chromedp.Poll[chromedp.Void](`document.getElementById("days-h").textContent.endsWith("2026-12-05")`),
	); err != nil {
		t.Fatal(err)
	}
	// The preview's heading, "Seven days from Sat 2026-12-05", had its date
	// split after "2026-12-" on a 375 px phone.
	for _, w := range []int64{320, 375, 412} {
		if err := chromedp.Do(ctx, chromedp.EmulateViewport(w, 800)); err != nil {
			t.Fatal(err)
		}
		noneSplit(t, ctx, dateBreaks, fmt.Sprintf("the builder's preview at %d px", w), "dates")
		heading, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](datesShown("#days-h")))
		if err != nil {
			t.Fatal(err)
		}
		if strings.Join(heading, " ") != `"2026-12-05"` {
			t.Errorf("the preview's heading at %d px shows its date as %s, want it on one line", w, strings.Join(heading, " and "))
		}
	}
}

// On a tablet and a desk the day-by-day table (/at) keeps its date column
// as narrow as its dates and gives the events the rest of the width: the
// column's heading was as wide as the events' (9rem each, the table's
// spare width shared between them), which left the dates half the table at
// 1280 px and wrapped the events into a column of its other half.
func TestBrowserTableColumns(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	table := ts.URL + "/at?lat=-37.9&lon=145.1&tz=Australia/Melbourne&start=2026-12-05&days=7&name=Wirrabend%20paddock" +
		"&kinds=civil-dawn,sunrise,sunset,civil-dusk,golden-hour,dark-window,lighting:15h"
	for _, w := range []int64{1280, 768} {
		if err := chromedp.Do(ctx, chromedp.EmulateViewport(w, 900), chromedp.Navigate(table), chromedp.WaitVisible(chromedp.CSS("table.days"))); err != nil {
			t.Fatal(err)
		}
		cols, err := chromedp.Run(ctx, chromedp.Evaluate[[]float64](`[...document.querySelectorAll("table.days thead th")].map(th => th.getBoundingClientRect().width)`))
		if err != nil {
			t.Fatal(err)
		}
		rem, err := chromedp.Run(ctx, chromedp.Evaluate[float64](`parseFloat(getComputedStyle(document.documentElement).fontSize)`))
		if err != nil {
			t.Fatal(err)
		}
		if len(cols) != 2 || cols[0] > 11*rem || cols[1] < 2*cols[0] {
			t.Errorf("the table page at %d px: columns %v px wide, want the dates' at most %g (11rem) and the events' at least twice as wide", w, cols, 11*rem)
		}
	}
}

// A refused value is shown in its message as it was given, and a skyline
// can be 72 points long: on a 390 px phone the message wraps within the
// page, on the table page (/at) that refuses a 73-point skyline as in the
// builder, whose message under the input says the same, rather than
// running off its right edge and scrolling the page sideways.
func TestBrowserLongMessageWraps(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	points := make([]string, 73)
	for i := range points {
		points[i] = fmt.Sprintf("%d:%d", i*5, 1+i%7)
	}
	skyline := strings.Join(points[:72], ",") + ",3:99" // 73 points, the last over 45°
	if err := chromedp.Do(ctx,
		chromedp.EmulateViewport(390, 844),
		chromedp.Navigate(ts.URL+"/at?lat=47.05&lon=11.2&tz=Europe/Vienna&horizon="+url.QueryEscape(skyline)),
		chromedp.WaitVisible(chromedp.CSS("p.message")),
	); err != nil {
		t.Fatal(err)
	}
	problems, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](layoutProblems))
	if err != nil {
		t.Fatal(err)
	}
	if len(problems) > 0 {
		t.Errorf("the table page refusing a 73-point skyline at 390 px: %s", strings.Join(problems, "; "))
	}
	if err := chromedp.Do(ctx,
		chromedp.Navigate(ts.URL+"/"),
		chromedp.WaitVisible(chromedp.ID("lat")),
		chromedp.SendKeys(chromedp.ID("lat"), "47.05"),
		chromedp.SendKeys(chromedp.ID("lon"), "11.2"),
		chromedp.SetValue(chromedp.ID("horizon"), skyline),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("builder").dispatchEvent(new Event("input"))`),
		chromedp.Poll[chromedp.Void](`document.getElementById("horizon").getAttribute("aria-invalid") === "true" && !document.getElementById("field-error").hidden`),
	); err != nil {
		t.Fatal(err)
	}
	problems, err = chromedp.Run(ctx, chromedp.Evaluate[[]string](layoutProblems))
	if err != nil {
		t.Fatal(err)
	}
	if len(problems) > 0 {
		t.Errorf("the builder refusing a 73-point skyline at 390 px: %s", strings.Join(problems, "; "))
	}
}

// longWords is a configuration whose page title, site name and feed title
// hold words longer than a phone's line: compound words as German writes
// them (the names are invented).
const longWords = `page:
  title: "Sternwartenbeobachtungsgemeinschaft Kestrelhöhe"
  intro: "Himmelsbeobachtungsnachmittagsveranstaltungen und Dunkelheitsfenster"
sites:
  - id: kestrel
    name: "Volkssternwartenförderverein Kestrelhöhe"
    latitude: -31.52
    longitude: 149.07
    timezone: Australia/Sydney
feeds:
  - id: kestrel-dark
    title: "Dunkelheitsfensterbenachrichtigungen Kestrelhöhe"
    description: "Beobachtungsnachtankündigungen"
    site: kestrel
    kinds: [dark-window]
    days_ahead: 30
`

// A word longer than a line (a compound of German, a name written without
// spaces) wraps within the page on a phone, in the served page's heading,
// introduction and list of feeds and in the published index's, instead of
// running off the right edge and scrolling the page sideways.
func TestBrowserLongWordsWrap(t *testing.T) {
	dir := t.TempDir()
	cfg := filepath.Join(dir, "heliocal.yaml")
	if err := os.WriteFile(cfg, []byte(longWords), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "public")
	if code, _, errOut := runCLI(t, "publish", "--quiet", "--config", cfg, "--out", out); code != 0 {
		t.Fatalf("publish: exit %d: %s", code, errOut)
	}
	ts := builderServerFor(t, cfg)
	ctx := browser(t)
	for _, page := range []string{ts.URL + "/", "file://" + filepath.Join(out, "index.html")} {
		for _, w := range []int64{390, 320} {
			if err := chromedp.Do(ctx, chromedp.EmulateViewport(w, 800), chromedp.Navigate(page), chromedp.WaitVisible(chromedp.CSS("h1"))); err != nil {
				t.Fatal(err)
			}
			problems, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](layoutProblems))
			if err != nil {
				t.Fatal(err)
			}
			if len(problems) > 0 {
				t.Errorf("%s at %d px: %s", page, w, strings.Join(problems, "; "))
			}
		}
	}
}

// havanaPreview opens the builder on a phone's screen (390 px wide) at
// Havana, 23.11° N 82.41° W, with the kinds given chosen too, and waits for
// its preview to begin on the date start (YYYY-MM-DD).
func havanaPreview(url, start string, kinds ...string) chromedp.Action[chromedp.Void] {
	steps := []chromedp.Action[chromedp.Void]{
		chromedp.EmulateViewport(390, 844),
		chromedp.Navigate(url + "/"),
		chromedp.WaitVisible(chromedp.ID("lat")),
	}
	for _, k := range kinds {
		steps = append(steps, chromedp.Click(chromedp.ID("k-"+k)))
	}
	return chromedp.Steps(append(steps,
		chromedp.SendKeys(chromedp.ID("lat"), "23.11"),
		chromedp.SendKeys(chromedp.ID("lon"), "-82.41"),
		chromedp.SetValue(chromedp.ID("start"), start),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("builder").dispatchEvent(new Event("input"))`),
		chromedp.Poll[chromedp.Void](`(() => { const th = document.querySelector("#preview th"); return th && th.textContent.includes("`+start+`"); })()`),
	)...)
}

// The builder's preview says on which date the clocks change, before that
// date's times, which shift with them, as the table page does: Havana's
// clocks go from 00:00 to 01:00 on 14 March 2027 (zdump, tz database), and
// no other date of the week says anything.
func TestBrowserPreviewClockChange(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	if err := chromedp.Do(ctx, havanaPreview(ts.URL, "2027-03-12")); err != nil {
		t.Fatal(err)
	}
	said, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](`[...document.querySelectorAll("#preview tr")].filter(tr => tr.querySelector(".clocks"))
  .map(tr => tr.querySelector("th").textContent + ": " + tr.querySelector(".clocks").textContent + (tr.querySelector("td").firstChild.className === "clocks" ? "" : " (not first)"))`))
	if err != nil {
		t.Fatal(err)
	}
	if want := "Sun 2027-03-14: Clocks go forward for summer time by 1\u00a0h: 00:00 becomes 01:00"; len(said) != 1 || said[0] != want {
		t.Errorf("the preview says of the clocks %q, want %q", said, want)
	}
}

// A time in the hour the clocks show twice carries its zone's label in the
// builder's preview and on the table page (/at), so that it reads as one
// pass: Havana's moonset of 7 November 2027 is at 05:48:24 UTC (PyEphem
// 4.1.4, Debian python3-ephem: Observer at 23.11, -82.41, elevation 0,
// pressure 0, horizon -0:34, Moon().next_setting from 2027/11/07 04:00,
// the upper limb), 00:48 CST, in the second pass of 00:00–00:59 (the
// clocks go back from 00:59:59 CDT to 00:00:00 CST, zdump, tz database).
// At 390 px both fit the width.
func TestBrowserRepeatedHour(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	// moonset checks the page shown: its moonset times (the text of the
	// elements times selects) are 00:48 CST alone, and it fits the width.
	moonset := func(page, times, png string) {
		t.Helper()
		got, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](`[...`+times+`].map(t => t.textContent)`))
		if err != nil {
			t.Fatal(err)
		}
		if len(got) != 1 || got[0] != "00:48 CST" {
			t.Errorf("%s: the moonset of 2027-11-07 at %q, want 00:48 CST", page, got)
		}
		const fits = `document.documentElement.scrollWidth <= window.innerWidth`
		if ok, err := chromedp.Run(ctx, chromedp.Evaluate[bool](fits)); err != nil || !ok {
			t.Errorf("%s at 390 px is wider than the screen (%v)", page, err)
		}
		shot(t, ctx, png)
	}
	if err := chromedp.Do(ctx, havanaPreview(ts.URL, "2027-11-06", "moonset")); err != nil {
		t.Fatal(err)
	}
	row := `[...document.querySelectorAll("#preview tr")].find(tr => tr.querySelector("th").textContent.includes("2027-11-07"))`
	moonset("the builder's preview", row+`.querySelectorAll("li[data-kind=moonset] .t")`, "repeated-hour-builder.png")

	if err := chromedp.Do(ctx,
		chromedp.Navigate(ts.URL+"/at?lat=23.11&lon=-82.41&tz=America/Havana&kinds=moonset&start=2027-11-07&days=1"),
		chromedp.WaitVisible(chromedp.CSS("table.days")),
	); err != nil {
		t.Fatal(err)
	}
	moonset("the table page", `document.querySelectorAll("table.days .t")`, "repeated-hour-table.png")
}

// Until a date is chosen, the builder previews from today at the place,
// as the subscribed feed and the table page start, not from the server's
// date, which the page came with and which is another date where the
// place's is not: for a place 14 hours ahead of UTC from 10:00 UTC
// (Pacific/Kiritimati, UTC+14 in the tz database) or 12 hours behind it
// before 12:00 UTC (Etc/GMT+12, the nautical zone of 172.5° W to 180°, UTC−12).
// The date input then shows that date.
func TestBrowserPreviewFromTodayAtThePlace(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	lat, lon, zone := "1.87", "-157.4", "Pacific/Kiritimati"
	if time.Now().UTC().Hour() < 12 {
		lat, lon, zone = "0", "-177.5", "Etc/GMT+12"
	}
	loc, err := time.LoadLocation(zone)
	if err != nil {
		t.Fatal(err)
	}
	before := time.Now().In(loc).Format(time.DateOnly)
	if err := chromedp.Do(ctx,
		chromedp.Navigate(ts.URL+"/"),
		chromedp.WaitVisible(chromedp.ID("lat")),
		chromedp.SendKeys(chromedp.ID("lat"), lat),
		chromedp.SendKeys(chromedp.ID("lon"), lon),
		chromedp.Poll[chromedp.Void](`document.querySelector("#preview th") !== null && document.getElementById("tz-found").textContent.startsWith("`+zone+`")`),
	); err != nil {
		t.Fatal(err)
	}
	got, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](`[document.querySelector("#preview th .date").textContent, document.getElementById("start").value]`))
	if err != nil {
		t.Fatal(err)
	}
	if after := time.Now().In(loc).Format(time.DateOnly); after != before {
		t.Skipf("the date at %s changed during the test (%s to %s)", zone, before, after)
	}
	if len(got) != 2 || got[0] != before || got[1] != before {
		t.Errorf("at %s, %s (%s) the preview starts on %q and the date input shows %q, want today there, %s", lat, lon, zone, got[0], got[1], before)
	}
}

// The lighting input takes hours, and a target it refuses is told back in
// hours, as it was given: 30 (over the 24 h of a day) is `lighting="30h"`,
// not the "1800m" the page sent for it; 14.5 is a target of 14h30m.
func TestBrowserLightingInHours(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	if err := chromedp.Do(ctx,
		chromedp.Navigate(ts.URL+"/"),
		chromedp.WaitVisible(chromedp.ID("lat")),
		chromedp.SendKeys(chromedp.ID("lat"), "48.2"),
		chromedp.SendKeys(chromedp.ID("lon"), "16.4"),
		chromedp.SetValue(chromedp.ID("lighting"), "30"),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("builder").dispatchEvent(new Event("input"))`),
		chromedp.Poll[chromedp.Void](`document.getElementById("lighting").getAttribute("aria-invalid") === "true"`),
	); err != nil {
		t.Fatal(err)
	}
	msg, err := chromedp.Run(ctx, chromedp.Text(chromedp.ID("field-error")))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(msg, `parameter lighting="30h"`) {
		t.Errorf("lighting 30 h: the message under the input reads %q, want it to name lighting=\"30h\"", msg)
	}
	// half an hour below zero: the minutes keep the sign of the hours
	if err := chromedp.Do(ctx,
		chromedp.SetValue(chromedp.ID("lighting"), "-0.5"),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("builder").dispatchEvent(new Event("input"))`),
		chromedp.Poll[chromedp.Void](`document.getElementById("field-error").textContent.includes("lighting=\"-")`),
	); err != nil {
		t.Fatal(err)
	}
	if msg, err = chromedp.Run(ctx, chromedp.Text(chromedp.ID("field-error"))); err != nil || !strings.Contains(msg, `parameter lighting="-0h30m"`) {
		t.Errorf("lighting -0.5 h: the message under the input reads %q (%v), want it to name lighting=\"-0h30m\"", msg, err)
	}
	if err := chromedp.Do(ctx,
		chromedp.SetValue(chromedp.ID("lighting"), "14.5"),
		chromedp.Evaluate[chromedp.Void](`document.getElementById("builder").dispatchEvent(new Event("input"))`),
		chromedp.Poll[chromedp.Void](`document.getElementById("lighting").getAttribute("aria-invalid") === null && document.getElementById("https").value.includes("lighting")`),
	); err != nil {
		t.Fatal(err)
	}
	https, err := chromedp.Run(ctx, chromedp.Value(chromedp.ID("https")))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(https, "lighting:14h30m") {
		t.Errorf("lighting 14.5 h: the subscribe link %s, want a target of 14h30m", https)
	}
}

// Printed, the day-by-day table (/at) keeps each date's row on one page: a
// row split over two pages went on at the top of the next without its date
// ("19:41 Sunset" under an empty date cell, a fortnight of four kinds at
// Havana printed to PDF by chromium). Each row, under the print media, is
// not to break inside.
func TestBrowserTablePrintsRowsWhole(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	table := ts.URL + "/at?lat=23.11&lon=-82.41&tz=America/Havana&name=Solmar%20Pavilion&kinds=sunset,golden-hour,moonrise,dark-window&start=2027-03-12&days=14"
	if err := chromedp.Do(ctx, chromedp.Navigate(table), chromedp.WaitVisible(chromedp.CSS("table.days"))); err != nil {
		t.Fatal(err)
	}
	if _, err := chromedp.Call(ctx, emulation.SetEmulatedMedia, emulation.SetEmulatedMediaParams{Media: "print"}); err != nil {
		t.Fatal(err)
	}
	got, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](`[...new Set([...document.querySelectorAll("table.days tbody tr")].map(tr => getComputedStyle(tr).breakInside))]`))
	if err != nil {
		t.Fatal(err)
	}
	if len(got) != 1 || got[0] != "avoid" {
		t.Errorf("printed, the table's rows break inside: %q, want \"avoid\" for every row", got)
	}
}

// Behind a reverse proxy that serves heliocal under a path of its site
// (https://sky.example.org/calendars/, the base_url of the README's
// example, the proxy passing /calendars/… on without the prefix), the page
// finds its style, script and icon and asks for its preview under that
// path too, and the table page and its "make another" link (to the builder
// filled with the table's place) stay there: they were asked for at the
// site's root (/assets/builder.css, /at.json?…), where the proxy has none
// of them.
func TestBrowserUnderPathPrefix(t *testing.T) {
	mux := http.NewServeMux()
	mux.Handle("/calendars/", http.StripPrefix("/calendars", builderHandler(t, filepath.Join("..", "..", "config", "demo.yaml"))))
	var mu sync.Mutex
	var asked []string // what was asked for outside the prefix
	root := func() []string { mu.Lock(); defer mu.Unlock(); return slices.Clone(asked) }
	ts := httptest.NewServer(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		if !strings.HasPrefix(r.URL.Path, "/calendars/") {
			mu.Lock()
			asked = append(asked, r.URL.Path)
			mu.Unlock()
		}
		mux.ServeHTTP(w, r)
	}))
	t.Cleanup(ts.Close)
	ctx := browser(t)
	styled := `getComputedStyle(document.body).fontFamily.includes("system-ui")`
	if err := chromedp.Do(ctx,
		chromedp.Navigate(ts.URL+"/calendars/"),
		chromedp.WaitVisible(chromedp.ID("lat")),
		chromedp.SendKeys(chromedp.ID("lat"), "23.11"),
		chromedp.SendKeys(chromedp.ID("lon"), "-82.41"),
		chromedp.Poll[chromedp.Void](`document.querySelector("#preview th") !== null && `+styled),
	); err != nil {
		t.Errorf("the page under /calendars/: no styled preview (%v); asked at the root for %q", err, root())
	}
	if err := chromedp.Do(ctx,
		chromedp.Navigate(ts.URL+"/calendars/at?lat=23.11&lon=-82.41&days=2"),
		chromedp.WaitVisible(chromedp.CSS("table.days")),
		chromedp.Poll[chromedp.Void](styled),
	); err != nil {
		t.Errorf("the table page under /calendars/: not styled (%v); asked at the root for %q", err, root())
	}
	another, err := chromedp.Run(ctx, chromedp.Evaluate[string](`[...document.querySelectorAll("a")].find(a => a.textContent === "make another").href`))
	rest, under := strings.CutPrefix(another, ts.URL+"/calendars/?")
	if v, _ := url.ParseQuery(rest); err != nil || !under || v.Get("lat") != "23.11" || v.Get("lon") != "-82.41" {
		t.Errorf("the table page's \"make another\" leads to %q (%v), want %s and the table's place", another, err, ts.URL+"/calendars/?")
	}
	if r := root(); len(r) > 0 {
		t.Errorf("the pages under /calendars/ asked at the site's root for %q", r)
	}
}

// The builder's preview says, beside a row whose span the clocks change
// during, how they change, as the entry's description and the table page
// do: the dark window of the night of 13–14 March 2027 at Havana, whose
// clocks go from 00:00 CST to 01:00 CDT on the 14th (zdump, tz database).
func TestBrowserPreviewClockChangeDuringARow(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	if err := chromedp.Do(ctx, havanaPreview(ts.URL, "2027-03-12", "dark-window")); err != nil {
		t.Fatal(err)
	}
	said, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](`[...document.querySelectorAll("#preview li .during")]
  .map(s => s.closest("tr").querySelector("th").textContent + ": " + s.parentElement.dataset.kind + ": " + s.textContent)`))
	if err != nil {
		t.Fatal(err)
	}
	if want := "Sat 2027-03-13: dark-window: The clocks go forward for summer time by 1\u00a0h during it: 00:00 CST becomes 01:00 CDT."; len(said) != 1 || said[0] != want {
		t.Errorf("the preview says of the clocks during its rows %q, want %q", said, want)
	}
}

// smallTargets lists the builder's controls shown that a finger may miss:
// an input, button, button-styled link or published feed's "Subscribe" link
// under 44 by 44 CSS pixels, the target size of WCAG 2.1 SC 2.5.5. A
// checkbox is left out: its label beside it, the kind's name and
// explanation, is the larger target.
var smallTargets = smallTargetsOf("input, button, a.button, .feeds a:not(.url)")

// smallTargetsOf is smallTargets for the elements the CSS selector sel
// picks.
func smallTargetsOf(sel string) string {
	return `[...document.querySelectorAll(` + strconv.Quote(sel) + `)].filter(el => {
  if (el.type === "hidden" || el.type === "checkbox") return false;
  const r = el.getBoundingClientRect();
  return r.width > 0 && (r.width < 44 || r.height < 44);
}).map(el => { const r = el.getBoundingClientRect(); return (el.id || el.textContent.trim()) + " " + Math.round(r.width) + "×" + Math.round(r.height) + " px"; })`
}

// On a 375 px and a 412 px phone every field of the builder, its shifts'
// minutes included, every button and each published feed's "Subscribe"
// link is at least 44 px tall and wide: the fields were 40 px tall, the
// shifts' 32 px and the links 19 px.
func TestBrowserTouchTargets(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	for _, w := range []int64{375, 412} {
		if err := chromedp.Do(ctx,
			chromedp.EmulateViewport(w, 800),
			chromedp.Navigate(ts.URL+"/?lat=57.05&lon=-3.65&tz=Europe/London&kinds=sunset,dark-window&start=2026-12-05"),
			chromedp.Poll[chromedp.Void](`document.getElementById("result").classList.contains("ready")`),
		); err != nil {
			t.Fatal(err)
		}
		small, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](smallTargets))
		if err != nil {
			t.Fatal(err)
		}
		if len(small) > 0 {
			t.Errorf("at %d px, controls under 44 by 44 px: %s", w, strings.Join(small, "; "))
		}
	}
}

// previewSpoken reads what a screen reader is told of the builder's
// preview: the live regions around the table (an aria-live or a status or
// alert role on it or an ancestor) and the status line's words, with the
// number of entries the table shows.
const previewSpoken = `(() => {
  const live = [];
  for (let el = document.getElementById("preview"); el; el = el.parentElement) {
    if (el.getAttribute("aria-live") || ["status", "alert", "log"].includes(el.getAttribute("role"))) live.push(el.id || el.tagName);
  }
  const s = document.getElementById("preview-status");
  return {live: live, role: s.getAttribute("role"), text: s.textContent, entries: document.querySelectorAll("#preview li").length};
})()`

// A screen reader hears one line when the builder's preview changes,
// "Preview updated: Seven days from Sat 2026-12-05, 14 entries, times in
// Europe/London.", from a status region (WAI-ARIA 1.2, role status), not
// the seven days' table again after each key: the table was itself a
// polite live region. The line follows the form: a kind more, more entries.
func TestBrowserPreviewAnnounced(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	type spoken struct {
		Live    []string
		Role    string
		Text    string
		Entries int
	}
	read := func(wait string) spoken {
		t.Helper()
		if err := chromedp.Do(ctx, chromedp.Poll[chromedp.Void](wait)); err != nil {
			t.Fatalf("waiting for %s: %v", wait, err)
		}
		got, err := chromedp.Run(ctx, chromedp.Evaluate[map[string]any](previewSpoken))
		if err != nil {
			t.Fatal(err)
		}
		var s spoken
		b, _ := json.Marshal(got)
		if err := json.Unmarshal(b, &s); err != nil {
			t.Fatal(err)
		}
		return s
	}
	if err := chromedp.Do(ctx,
		chromedp.EmulateViewport(412, 915),
		chromedp.Navigate(ts.URL+"/?lat=57.05&lon=-3.65&tz=Europe/London&kinds=sunset,dark-window&start=2026-12-05"),
	); err != nil {
		t.Fatal(err)
	}
	s := read(`document.getElementById("preview-status").textContent !== ""`)
	want := fmt.Sprintf("Preview updated: Seven days from Sat 2026-12-05, %d entries, times in Europe/London.", s.Entries)
	if len(s.Live) != 0 || s.Role != "status" || s.Text != want || s.Entries < 14 {
		t.Errorf("the preview is told as %+v; want no live region around the table and the status line %q", s, want)
	}
	if err := chromedp.Do(ctx, chromedp.Click(chromedp.ID("k-sunrise"))); err != nil {
		t.Fatal(err)
	}
	s = read(`document.getElementById("preview-status").textContent !== "" && document.querySelectorAll("#preview li[data-kind=sunrise]").length > 0`)
	if want := fmt.Sprintf("Preview updated: Seven days from Sat 2026-12-05, %d entries, times in Europe/London.", s.Entries); s.Text != want || s.Entries < 21 {
		t.Errorf("with sunrise added, the status line says %q over %d entries; want %q", s.Text, s.Entries, want)
	}
}

// A phone that follows an old or mistyped link gets a page of the site at
// its width (it was a line of plain text laid out 980 px wide, with
// sideways scrolling), styled by the page's own sheet however deep the
// address, in its language, titled, with a heading and a link back to the
// main page.
func TestBrowserNotFound(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	for _, w := range []int64{375, 412} {
		for _, path := range []string{"/calendars/old-feed.ics", "/nope"} {
			if err := chromedp.Do(ctx, chromedp.EmulateViewport(w, 800), chromedp.Navigate(ts.URL+path)); err != nil {
				t.Fatal(err)
			}
			problems, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](layoutProblems))
			if err != nil {
				t.Fatal(err)
			}
			got, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](`[document.documentElement.lang, document.title, (document.querySelector("h1") || {}).textContent || "",
  getComputedStyle(document.body).backgroundColor, (document.querySelector("main a") || {}).href || ""]`))
			if err != nil {
				t.Fatal(err)
			}
			want := []string{"en", "Not found · Sky calendars of the Fernhollow valley", "Nothing here", "rgb(246, 244, 238)", ts.URL + "/"}
			if len(problems) > 0 || !slices.Equal(got, want) {
				t.Errorf("%s at %d px: %s; lang, title, heading, background and link %q, want %q", path, w, strings.Join(problems, "; "), got, want)
			}
			if w == 375 && path == "/nope" {
				shot(t, ctx, "notfound-375.png")
			}
		}
	}
}

// With JavaScript off the builder cannot preview or link, and says so at
// its top, pointing to the published calendars, which need none; it said
// "Enter a latitude and longitude … to see seven days of events", which
// never came. With JavaScript on, the note is not shown.
func TestBrowserBuilderWithoutScript(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	const note = `[...document.querySelectorAll("section[aria-labelledby=make-h] .message")].filter(p => p.getClientRects().length).map(p => p.textContent)`
	if err := chromedp.Do(ctx, chromedp.EmulateViewport(375, 740), chromedp.Navigate(ts.URL+"/")); err != nil {
		t.Fatal(err)
	}
	if shown, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](note)); err != nil || len(shown) != 0 {
		t.Errorf("with JavaScript on, the builder shows %q (%v), want no note", shown, err)
	}
	if _, err := chromedp.Call(ctx, emulation.SetScriptExecutionDisabled, emulation.SetScriptExecutionDisabledParams{Value: true}); err != nil {
		t.Fatal(err)
	}
	if err := chromedp.Do(ctx, chromedp.Navigate(ts.URL+"/")); err != nil {
		t.Fatal(err)
	}
	want := "This builder needs JavaScript, which is off in this browser: it shows no preview and no subscribe links without it. The published calendars below work without it."
	if shown, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](note)); err != nil || len(shown) != 1 || shown[0] != want {
		t.Errorf("with JavaScript off, the builder shows %q (%v), want %q", shown, err, want)
	}
}

// Every stop of the keyboard in the builder's date field ("Preview from")
// shows the focus, the calendar button inside it too: on that stop, the
// last of the field's (month, day, year, button in Chromium), the field lost
// its outline and nothing on the page showed where the focus was (WCAG 2.1
// SC 2.4.7).
func TestBrowserDateFieldFocusShown(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	if err := chromedp.Do(ctx, chromedp.Navigate(ts.URL+"/"), chromedp.Focus(chromedp.ID("alarm"))); err != nil {
		t.Fatal(err)
	}
	stops := 0
	for range 8 {
		if err := chromedp.Do(ctx, chromedp.KeyEvent(kb.Tab)); err != nil {
			t.Fatal(err)
		}
		at, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](`[document.activeElement.id, getComputedStyle(document.getElementById("start")).outlineStyle]`))
		if err != nil {
			t.Fatal(err)
		}
		if at[0] != "start" {
			break
		}
		stops++
		if at[1] != "solid" {
			t.Errorf("stop %d in the date field: its outline is %q, want it shown (solid)", stops, at[1])
		}
	}
	if stops < 2 {
		t.Errorf("the keyboard stopped %d times in the date field, want its parts and its button", stops)
	}
}
