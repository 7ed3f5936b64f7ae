package main

import (
	"fmt"
	"io"
	"net/http"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"
)

// unitBreaks lists the amounts in the entries of the day-by-day tables
// (the page /at and the builder's preview) that a line break splits: a
// number and its unit ("to reach 16" over "h"), or the hours and minutes
// of one length ("Daylight 9 h" over "05 min").
var unitBreaks = unitBreaksIn("table.days li")

// unitBreaksIn lists the amounts that a line break splits in the text of
// the elements the CSS selector sel picks, as unitBreaks does.
func unitBreaksIn(sel string) string {
	return `[...document.querySelectorAll(` + strconv.Quote(sel) + `)].flatMap(li => {
  const r = document.createRange(), chars = [];
  const walk = document.createTreeWalker(li, NodeFilter.SHOW_TEXT);
  for (let node = walk.nextNode(); node; node = walk.nextNode()) {
    for (let i = 0; i < node.length; i++) {
      r.setStart(node, i); r.setEnd(node, i + 1);
      chars.push([node.data[i], r.getBoundingClientRect().top]);
    }
  }
  const text = chars.map(c => c[0]).join("");
  const out = [];
  for (const m of text.matchAll(/\d+[ \u00a0](?:h|min|s|days?|k?m)(?:[ \u00a0]\d+[ \u00a0]min)?(?![A-Za-z])/g)) {
    for (let i = m.index + 1; i < m.index + m[0].length; i++) {
      if (chars[i][1] > chars[i - 1][1] + 2) {
        out.push(JSON.stringify(m[0].slice(0, i - m.index)) + " over " + JSON.stringify(m[0].slice(i - m.index)) + " in " + JSON.stringify(text));
        break;
      }
    }
  }
  return out;
})`
}

// dayMonthBreaks lists the dates written in words ("21 Jun", "5 Dec 2026",
// "12–13 February 2027") in the text of the elements the CSS selector sel
// picks that a line break splits, as unitBreaksIn does for amounts.
func dayMonthBreaks(sel string) string {
	return strings.Replace(unitBreaksIn(sel), `/\d+[ \u00a0](?:h|min|s|days?|k?m)(?:[ \u00a0]\d+[ \u00a0]min)?(?![A-Za-z])/g`,
		`/\d+[ \u00a0](?:Jan|Feb|Mar|Apr|May|Jun|Jul|Aug|Sep|Oct|Nov|Dec)[a-z]*(?:[ \u00a0]\d{4})?(?![A-Za-z0-9])/g`, 1)
}

// On a phone the day-by-day table (/at) and the builder's preview keep a
// number and its unit on one line, and the hours and minutes of a length:
// the page joins them with a no-break space (U+00A0); the feeds and the
// JSON keep their plain spaces (TestTableUnitsNoBreak).
func TestBrowserUnitsWhole(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	const kinds = "&kinds=sunrise,sunset,daily-summary,dark-window,lighting:16h,golden-hour,photoperiod:12h"
	table := ts.URL + "/at?lat=59.91&lon=10.75&tz=Europe/Oslo&start=2026-12-05&days=30&name=Bygd%C3%B8y%20allotments" + kinds
	for _, w := range []int64{390, 320} {
		if err := chromedp.Do(ctx, chromedp.EmulateViewport(w, 800), chromedp.Navigate(table), chromedp.WaitVisible(chromedp.CSS("table.days"))); err != nil {
			t.Fatal(err)
		}
		noneSplit(t, ctx, unitBreaks, fmt.Sprintf("the table page at %d px", w), "amounts")
	}
	if err := chromedp.Do(ctx,
		chromedp.EmulateViewport(320, 800),
		chromedp.Navigate(ts.URL+"/"),
		chromedp.WaitVisible(chromedp.ID("lat")),
		chromedp.SendKeys(chromedp.ID("lat"), "59.91"),
		chromedp.SendKeys(chromedp.ID("lon"), "10.75"),
		chromedp.Poll[chromedp.Void](`document.querySelector("#preview th") !== null`),
	); err != nil {
		t.Fatal(err)
	}
	// every kind the builder offers, lighting and daily-summary among them
	if err := chromedp.Do(ctx,
		chromedp.Evaluate[chromedp.Void](`document.querySelectorAll("input[name=kinds]").forEach(c => { if (!c.checked) c.click(); })`),
		chromedp.Poll[chromedp.Void](`[...document.querySelectorAll("#preview li")].some(li => /Daylight/.test(li.textContent))`),
	); err != nil {
		t.Fatal(err)
	}
	noneSplit(t, ctx, unitBreaks, "the builder's preview at 320 px", "amounts")
}

// The index page publish writes keeps a number and its unit on one line
// on a 412, 390, 375 and 320 px phone, as the page /at does: the charts'
// captions ("up to 14 h 30 min", "on 176 days"), the feeds' descriptions,
// the sites' elevations; and a date's day, month and year in the charts'
// captions ("(21 Jun)" had "Jun" alone on the next line at 412 px, "5 Dec
// 2026" its year at 375 px). The feeds and feeds.json keep their plain
// spaces.
func TestBrowserPublishedIndexUnitsWhole(t *testing.T) {
	ctx := browser(t)
	out := t.TempDir()
	if code, _, errOut := runCLI(t, "publish", "--quiet", "--out", out); code != 0 {
		t.Fatalf("publish: exit %d: %s", code, errOut)
	}
	page := "file://" + filepath.Join(out, "index.html")
	for _, w := range []int64{412, 390, 375, 320} {
		if err := chromedp.Do(ctx, chromedp.EmulateViewport(w, 800), chromedp.Navigate(page)); err != nil {
			t.Fatal(err)
		}
		noneSplit(t, ctx, unitBreaksIn("header p, p.place, figcaption, main td"), fmt.Sprintf("the index page at %d px", w), "amounts")
		noneSplit(t, ctx, dayMonthBreaks("figcaption"), fmt.Sprintf("the index page at %d px", w), "dates")
	}
	files, err := filepath.Glob(filepath.Join(out, "*.*"))
	if err != nil || len(files) < 3 {
		t.Fatalf("published files: %v %v", files, err)
	}
	for _, f := range files {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		if filepath.Base(f) != "index.html" && strings.Contains(string(b), "\u00a0") {
			t.Errorf("%s has a no-break space", filepath.Base(f))
		}
	}
}

// The page /at joins each amount with no-break spaces (U+00A0), as the
// builder page does in its list of feeds, and only the pages: the
// preview's JSON and the feed keep the plain spaces of their bytes. At 59.91° N the lamps of a 16 h program run for hours in December
// and the day is under 12 h (the texts, not the values, are under test).
func TestTableUnitsNoBreak(t *testing.T) {
	ts := builderServer(t)
	q := "?lat=59.91&lon=10.75&tz=Europe/Oslo&start=2026-12-05&days=3&name=Bygd%C3%B8y&kinds=daily-summary,lighting:16h"
	get := func(path string) string {
		t.Helper()
		res, err := http.Get(ts.URL + path + q)
		if err != nil {
			t.Fatal(err)
		}
		defer res.Body.Close()
		b, err := io.ReadAll(res.Body)
		if err != nil || res.StatusCode != http.StatusOK {
			t.Fatalf("%s: %d %v", path, res.StatusCode, err)
		}
		return string(b)
	}
	page := get("/at")
	for _, want := range []string{"to reach 16\u00a0h", "Daylight 6\u00a0h\u00a017\u00a0min", "the next 365\u00a0days"} {
		if !strings.Contains(page, want) {
			t.Errorf("the page /at lacks %q", want)
		}
	}
	if strings.Contains(page, "16 h") || strings.Contains(page, "17 min") {
		t.Errorf("the page /at keeps a plain space in an amount")
	}
	// the builder page's list of published feeds, a description of the
	// demo's (fernhollow-lamps) with its amounts
	if home := get("/"); !strings.Contains(home, "lit up to 16\u00a0h, the seedling house up to 14\u00a0h\u00a030\u00a0min") {
		t.Errorf("the builder page lacks the lamps' description with its amounts joined")
	}
	for _, path := range []string{"/at.json", "/at.ics"} {
		if body := get(path); strings.Contains(body, "\u00a0") || !strings.Contains(body, "to reach 16 h") {
			t.Errorf("%s: a no-break space, or no \"to reach 16 h\"", path)
		}
	}
}

// pageWords is an HTML page's text with its no-break spaces (KeepUnits)
// read as spaces, for the tests that compare its words with the preview's
// JSON or the feed.
func pageWords(page string) string { return strings.ReplaceAll(page, "\u00a0", " ") }
