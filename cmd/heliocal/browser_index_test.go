package main

import (
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/chromedp"
)

// chartTextPx is the smallest rendered height, in CSS pixels, of the year
// charts' axis labels.
const chartTextPx = `Math.min(...[...document.querySelectorAll("svg text")]
  .filter(t => getComputedStyle(t).display !== "none")
  .map(t => t.getBoundingClientRect().height).filter(h => h > 0))`

// chartLabelProblems lists the year charts' labels that collide: two
// labels shown over each other, an axis label over the plot, or a label
// past the page's edge.
const chartLabelProblems = `(() => {
  const out = [], w = document.documentElement.clientWidth;
  const meets = (a, b) => a.left < b.right - 0.5 && b.left < a.right - 0.5 && a.top < b.bottom - 0.5 && b.top < a.bottom - 0.5;
  for (const svg of document.querySelectorAll("figure > svg")) {
    const name = svg.closest("section").querySelector("h2").textContent;
    const plot = svg.querySelector("rect.plot").getBoundingClientRect();
    const shown = [...svg.querySelectorAll("text")].filter(t => getComputedStyle(t).display !== "none")
      .map(t => ({t, r: t.getBoundingClientRect()})).filter(x => x.r.width > 0);
    for (const [i, a] of shown.entries()) {
      if (a.r.left < 0 || a.r.right > w) out.push(name + ": label " + JSON.stringify(a.t.textContent) + " past the page's edge");
      if (!a.t.classList.contains("tl") && meets(a.r, plot)) out.push(name + ": label " + JSON.stringify(a.t.textContent) + " over the plot");
      for (const b of shown.slice(i + 1)) if (meets(a.r, b.r)) out.push(name + ": labels " + JSON.stringify(a.t.textContent) + " and " + JSON.stringify(b.t.textContent) + " collide");
    }
  }
  return out;
})()`

// chartPlots lists, per figure, the heights in CSS pixels of the plots of
// the year charts shown (not display:none).
const chartPlots = `[...document.querySelectorAll("figure")].map(f => [...f.querySelectorAll(":scope > svg")]
  .filter(s => getComputedStyle(s).display !== "none").map(s => s.querySelector("rect.plot").getBoundingClientRect().height))`

// The static index `publish` writes fits a 320 px and a 390 px phone, a
// 768 px tablet and a 1280 px desk without horizontal scrolling, and its
// year charts' labels stay readable once the chart is scaled to the width
// without running into each other or over the plot: their boxes (about 1.15
// times the font's size) at least 12 px tall on the 390 px phone, 11 px on
// the 320 px one and 10 px on the tablet and the desk. Each site shows one
// chart, whose plot (the clock from midnight to midnight) is at least 300 px
// tall on the 390 px phone and 240 px on the 320 px one, where the wide
// chart scaled to the width had 117 and 97: a phone draws a chart of its own.
func TestBrowserPublishedIndex(t *testing.T) {
	ctx := browser(t)
	out := t.TempDir()
	if code, _, errOut := runCLI(t, "publish", "--quiet", "--out", out); code != 0 {
		t.Fatalf("publish: exit %d: %s", code, errOut)
	}
	for _, page := range []string{"file://" + filepath.Join(out, "index.html"), publishChartSites(t)} {
		if err := chromedp.Do(ctx, chromedp.Navigate(page)); err != nil {
			t.Fatal(err)
		}
		for _, w := range []struct {
			width, height int64
			px            float64 // the smallest label, in CSS pixels
			plot          float64 // the smallest plot's height, in CSS pixels
		}{{1280, 900, 10, 240}, {768, 1000, 10, 230}, {390, 844, 12, 300}, {320, 640, 11, 240}} {
			if err := chromedp.Do(ctx, chromedp.EmulateViewport(w.width, w.height)); err != nil {
				t.Fatal(err)
			}
			problems, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](layoutProblems))
			if err != nil {
				t.Fatal(err)
			}
			labels, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](chartLabelProblems))
			if err != nil {
				t.Fatal(err)
			}
			if problems = append(problems, labels...); len(problems) > 0 {
				t.Errorf("%s at %d px: %s", page, w.width, strings.Join(problems, "; "))
			}
			px, err := chromedp.Run(ctx, chromedp.Evaluate[float64](chartTextPx))
			if err != nil {
				t.Fatal(err)
			}
			t.Logf("%s at %d px: the smallest chart label is %.1f px tall", page, w.width, px)
			if px < w.px {
				t.Errorf("%s at %d px: chart labels %.1f px tall, want at least %g", page, w.width, px, w.px)
			}
			plots, err := chromedp.Run(ctx, chromedp.Evaluate[[][]float64](chartPlots))
			if err != nil {
				t.Fatal(err)
			}
			for i, p := range plots {
				if len(p) != 1 || p[0] < w.plot {
					t.Errorf("%s at %d px: chart %d shows plots %v px tall, want one at least %g px tall", page, w.width, i+1, p, w.plot)
				}
			}
			if w.width == 390 && strings.HasSuffix(page, out+"/index.html") {
				shot(t, ctx, "index-390.png")
			}
		}
	}
}

// indexReadability reads what makes the published index hard to read at the
// current width and media: a subscribe link or the column's heading broken
// inside a word (a file name breaks after a dash only), a threshold label of
// a year chart under 4.5:1 against the halo it is drawn on or a halo not of
// the page's colour (the label sits over the lamp periods' strokes), and
// text lighter than its page.
const indexReadability = `(() => {
  const out = [];
  const rgb = (s) => s.match(/[\d.]+/g).slice(0, 3).map(Number);
  const lum = (c) => { const l = c.map(v => { v /= 255; return v <= 0.04045 ? v / 12.92 : Math.pow((v + 0.055) / 1.055, 2.4); }); return 0.2126 * l[0] + 0.7152 * l[1] + 0.0722 * l[2]; };
  const ratio = (a, b) => { const [x, y] = [lum(a), lum(b)]; return (Math.max(x, y) + 0.05) / (Math.min(x, y) + 0.05); };
  const breaks = (el) => {
    const r = document.createRange(), got = [];
    let top = null;
    for (const node of [...el.childNodes].filter(n => n.nodeType === 3)) {
      for (let i = 0; i < node.length; i++) {
        r.setStart(node, i); r.setEnd(node, i + 1);
        const y = r.getBoundingClientRect().top;
        if (top !== null && y > top + 2) got.push(node.data.slice(0, i));
        top = y;
      }
    }
    return got;
  };
  for (const th of document.querySelectorAll("th:last-child")) if (th.getClientRects().length && breaks(th).length) out.push("the heading " + JSON.stringify(th.textContent) + " breaks after " + JSON.stringify(breaks(th)));
  for (const a of document.querySelectorAll("td:last-child a")) for (const b of breaks(a)) if (!b.endsWith("-")) out.push("the link " + JSON.stringify(a.textContent) + " breaks after " + JSON.stringify(b));
  const page = rgb(getComputedStyle(document.body).backgroundColor), ink = rgb(getComputedStyle(document.body).color);
  for (const t of document.querySelectorAll("svg text.tl")) {
    const st = getComputedStyle(t);
    if (st.display === "none") continue;
    if (st.paintOrder.split(" ")[0] !== "stroke" || rgb(st.stroke).join() !== page.join() || parseFloat(st.strokeWidth) < 2) out.push("threshold label " + JSON.stringify(t.textContent) + " has no halo of the page colour (stroke " + st.stroke + " " + st.strokeWidth + ", paint-order " + st.paintOrder + ")");
    const c = ratio(rgb(st.fill), page);
    if (c < 4.5) out.push("threshold label " + JSON.stringify(t.textContent) + " " + c.toFixed(2) + ":1 against the page, need 4.5");
  }
  // Each key of a chart's caption is drawn as the chart draws its mark.
  const rgba = (s) => { const v = s.match(/[\d.]+/g).map(Number); return v.length > 3 ? v : v.concat(1); };
  for (const fig of document.querySelectorAll("figure")) {
    for (const key of fig.querySelectorAll("figcaption .key")) {
      const kind = [...key.classList].find(c => c !== "key");
      const mark = fig.querySelector("svg ." + kind);
      if (!mark || kind === "today") continue; // today: the text colour, the caption's and the chart's
      const m = getComputedStyle(mark), k = rgba(getComputedStyle(key).borderTopColor);
      const drawn = rgba(m.stroke);
      drawn[3] *= parseFloat(m.strokeOpacity);
      if (drawn.slice(0, 3).join() !== k.slice(0, 3).join() || Math.abs(drawn[3] - k[3]) > 0.02) out.push(fig.querySelector("title").textContent.split(",")[0] + ": the key of " + kind + " is " + getComputedStyle(key).borderTopColor + ", the chart draws it " + m.stroke + " at opacity " + m.strokeOpacity);
    }
  }
  // Dark windows are hatched, lamp periods flat (they overlap in the
  // evening, in colours 1.04:1 apart): the dark windows' stroke is a
  // pattern whose lines stand 3:1 from its ground (WCAG 2.1 SC 1.4.11), and
  // the caption's key is painted with the same pattern.
  const ref = (paint) => { const m = paint.match(/url\("?[^#]*#([^")]+)"?\)/); return m ? m[1] : ""; };
  const over = (c, a) => c.map((v, i) => a * v + (1 - a) * page[i]);
  for (const fig of document.querySelectorAll("figure")) {
    const dark = fig.querySelector("svg path.dark"), lamp = fig.querySelector("svg path.lamp");
    if (!dark) continue;
    const name = fig.querySelector("title").textContent.split(",")[0];
    const id = ref(getComputedStyle(dark).stroke), pat = id && document.getElementById(id);
    if (!pat || pat.tagName !== "pattern") { out.push(name + ": dark windows drawn " + getComputedStyle(dark).stroke + ", not hatched"); continue; }
    const line = getComputedStyle(pat.querySelector("line")), ground = getComputedStyle(pat.querySelector("rect"));
    const c = ratio(over(rgb(line.stroke), parseFloat(line.strokeOpacity)), over(rgb(ground.fill), parseFloat(ground.fillOpacity)));
    if (c < 3) out.push(name + ": the dark windows' hatching " + c.toFixed(2) + ":1 against its ground, need 3");
    if (lamp && ref(getComputedStyle(lamp).stroke) === id) out.push(name + ": lamp periods hatched as the dark windows are");
    const key = fig.querySelector("figcaption svg.swatch rect");
    if (!key || ref(getComputedStyle(key).fill) !== id) out.push(name + ": the caption's key of dark windows is " + (key ? getComputedStyle(key).fill : "missing") + ", the chart draws them with #" + id);
  }
  // The caption's keys of the new and the full Moon are drawn as the
  // chart draws them: a circle of the same fill, outlined 3:1 against the
  // page (WCAG 2.1 SC 1.4.11), not a yellow glyph of 1.6:1.
  for (const fig of document.querySelectorAll("figure")) {
    const name = fig.querySelector("title").textContent.split(",")[0];
    for (const cls of ["moon", "moon full"]) {
      const of = (sel) => [...fig.querySelectorAll(sel + " circle")].find(c => c.getAttribute("class") === cls);
      const mark = of(":scope > svg"), key = of("figcaption");
      if (!mark) continue;
      if (!key) { out.push(name + ": the caption has no key drawn as the chart's " + cls + " symbols"); continue; }
      const m = getComputedStyle(mark), k = getComputedStyle(key);
      if (m.fill !== k.fill) out.push(name + ": the key of the " + cls + " is filled " + k.fill + ", the chart fills it " + m.fill);
      const c = ratio(rgb(k.stroke), page);
      if (c < 3) out.push(name + ": the key of the " + cls + " is outlined " + c.toFixed(2) + ":1 against the page, need 3");
    }
  }
  if (ratio(ink, [255, 255, 255]) < 4.5) out.push("text " + getComputedStyle(document.body).color + " is " + ratio(ink, [255, 255, 255]).toFixed(2) + ":1 against white paper");
  return out;
})()`

// The published index reads whole at a tablet's 768 px and a desk's 1280 px,
// in the light and the dark palette: subscribe links break only after a dash,
// the charts' threshold labels reach 4.5:1 (WCAG 2.1 SC 1.4.3) on a halo of
// the page colour, each key of a chart's caption has the colour of the
// mark it names (the Moons' keys are drawn as the chart's Moons, outlined), and the dark windows are hatched (in the caption's key too)
// where the lamp periods are flat; printed, from a system in dark mode too, its text is dark
// on the white paper, and a site's heading stays with its chart.
func TestBrowserPublishedIndexReadable(t *testing.T) {
	ctx := browser(t)
	out := t.TempDir()
	if code, _, errOut := runCLI(t, "publish", "--quiet", "--out", out); code != 0 {
		t.Fatalf("publish: exit %d: %s", code, errOut)
	}
	for _, m := range []struct{ media, scheme string }{{"screen", "light"}, {"screen", "dark"}, {"print", "light"}, {"print", "dark"}} {
		if _, err := chromedp.Call(ctx, emulation.SetEmulatedMedia, emulation.SetEmulatedMediaParams{Media: m.media,
			Features: []*emulation.MediaFeature{{Name: "prefers-color-scheme", Value: m.scheme}}}); err != nil {
			t.Fatal(err)
		}
		for _, width := range []int64{768, 1280} {
			if err := chromedp.Do(ctx, chromedp.EmulateViewport(width, 1000), chromedp.Navigate("file://"+filepath.Join(out, "index.html"))); err != nil {
				t.Fatal(err)
			}
			problems, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](indexReadability))
			if err != nil {
				t.Fatal(err)
			}
			if m.media == "screen" && m.scheme == "dark" {
				// Light text on the dark page is right on screen.
				problems = slices.DeleteFunc(problems, func(p string) bool { return strings.Contains(p, "white paper") })
			}
			if m.media == "print" {
				keep, err := chromedp.Run(ctx, chromedp.Evaluate[string](`getComputedStyle(document.querySelector("h2")).breakAfter + " " + getComputedStyle(document.querySelector(".place")).breakAfter + " " + getComputedStyle(document.querySelector("figure")).breakInside`))
				if err != nil {
					t.Fatal(err)
				}
				if keep != "avoid avoid avoid" {
					problems = append(problems, "printed, a site's heading, place and chart may be parted by a page break (break-after of h2 and .place, break-inside of figure: "+keep+")")
				}
			}
			for _, p := range problems {
				t.Errorf("index.html, %s, %s palette, %d px: %s", m.media, m.scheme, width, p)
			}
		}
	}
}

// phoneChart reads the year chart shown for the first site: whether it is
// the phone's, its box and its plot's height in CSS pixels, the size its
// labels are drawn at (the font's size times the chart's scale), the hour
// labels, the threshold labels and those of red lines and today shown, and
// the months labelled in it: those with 27 days or more in the chart and
// those with fewer (short), and of each those shown.
const phoneChart = `(() => {
  const svg = [...document.querySelector("figure").querySelectorAll(":scope > svg")].find(s => getComputedStyle(s).display !== "none");
  const shown = (sel) => [...svg.querySelectorAll(sel)].filter(t => getComputedStyle(t).display !== "none");
  const box = svg.getBoundingClientRect(), yl = shown("text.yl");
  return {
    phone: svg.classList.contains("ph"), width: box.width, height: box.height,
    plot: svg.querySelector("rect.plot").getBoundingClientRect().height,
    px: parseFloat(getComputedStyle(yl[0]).fontSize) * svg.getScreenCTM().a,
    hours: yl.map(t => t.textContent), thresholds: shown("text.tl").length, marks: shown("text.ml, text.tdl").length,
    months: svg.querySelectorAll("text.mo:not(.short)").length, monthsShown: shown("text.mo:not(.short)").length,
    short: svg.querySelectorAll("text.mo.short").length, shortShown: shown("text.mo.short").length,
  };
})()`

// The index's year chart as the README and docs/feeds.md describe it, at
// Fen Glasshouses (52.2° N, a 12 h photoperiod): on a wide screen the
// threshold crossings are labelled "12 h ↑"/"12 h ↓" on the chart, as are
// the red lines and today; under 40rem (640 px) only the caption names
// them, and a month with fewer than 27 of its days in the chart is left
// unlabelled; on a phone (under 28rem) the page shows a chart of its own,
// taller than wide, whose plot is about 345 px tall on a 390 px phone (the
// wide chart, scaled to the width, had 117), its labels drawn about 12.4 px
// tall there and 10.9 px on a 320 px phone, outside the plot, the hours as
// "00", "06" … "24", every month with room for a label labelled on the
// 390 px phone and every second one on the 320 px phone.
func TestBrowserPublishedIndexPhoneChart(t *testing.T) {
	ctx := browser(t)
	page := publishChartSites(t)
	if err := chromedp.Do(ctx, chromedp.Navigate(page)); err != nil {
		t.Fatal(err)
	}
	type chart struct {
		Phone                   bool
		Width, Height, Plot, Px float64
		Hours                   []string
		Thresholds              int
		Marks                   int
		Months                  int
		MonthsShown             int `json:"monthsShown"`
		Short                   int
		ShortShown              int `json:"shortShown"`
	}
	for _, w := range []struct {
		width      int64
		phone      bool
		labelled   bool    // the labels of thresholds, red lines and today drawn on the chart
		plot, px   float64 // on a phone: the plot's height and the labels' size, in CSS pixels
		everyOther bool    // on a phone: every second month labelled
	}{
		{1280, false, true, 0, 0, false}, {768, false, true, 0, 0, false}, {600, false, false, 0, 0, false},
		{390, true, false, 345, 12.4, false}, {320, true, false, 0, 10.9, true},
	} {
		if err := chromedp.Do(ctx, chromedp.EmulateViewport(w.width, 900)); err != nil {
			t.Fatal(err)
		}
		c, err := chromedp.Run(ctx, chromedp.Evaluate[chart](phoneChart))
		if err != nil {
			t.Fatal(err)
		}
		t.Logf("%d px: %+v", w.width, c)
		if c.Phone != w.phone {
			t.Errorf("%d px: the phone's chart shown %v, want %v", w.width, c.Phone, w.phone)
			continue
		}
		if (c.Thresholds > 0) != w.labelled {
			t.Errorf("%d px: %d threshold labels on the chart, want them shown %v", w.width, c.Thresholds, w.labelled)
		}
		if (c.Marks > 0) != w.labelled {
			t.Errorf("%d px: %d labels of red lines and today on the chart, want them shown %v", w.width, c.Marks, w.labelled)
		}
		// The chart starts four weeks before today: on the first half of
		// a month's days the month before it has fewer than 27 in it.
		if wide := w.width >= 640; c.Short > 0 && (c.ShortShown > 0) != wide {
			t.Errorf("%d px: %d of %d months with fewer than 27 days in the chart labelled, want them labelled %v", w.width, c.ShortShown, c.Short, wide)
		}
		if !w.phone {
			continue
		}
		if c.Height <= c.Width {
			t.Errorf("%d px: the phone's chart is %.0f by %.0f px, want it taller than wide", w.width, c.Width, c.Height)
		}
		if w.plot > 0 && (c.Plot < w.plot-5 || c.Plot > w.plot+5) {
			t.Errorf("%d px: the plot is %.1f px tall, want about %g", w.width, c.Plot, w.plot)
		}
		if c.Px < w.px-0.2 || c.Px > w.px+0.2 {
			t.Errorf("%d px: labels %.2f px, want about %g", w.width, c.Px, w.px)
		}
		if !slices.Equal(c.Hours, []string{"00", "06", "12", "18", "24"}) {
			t.Errorf("%d px: hour labels %q, want 00, 06 … 24", w.width, c.Hours)
		}
		if want := c.Months; w.everyOther && (c.MonthsShown < want/2 || c.MonthsShown > (want+1)/2) || !w.everyOther && c.MonthsShown != want {
			t.Errorf("%d px: %d of %d month labels shown, want every second one %v", w.width, c.MonthsShown, c.Months, w.everyOther)
		}
	}
}

// monthGaps reads, per chart shown, the smallest room in CSS pixels between
// two month labels side by side, and the pair.
const monthGaps = `[...document.querySelectorAll("figure")].map(f => {
  const svg = [...f.querySelectorAll(":scope > svg")].find(s => getComputedStyle(s).display !== "none");
  const shown = [...svg.querySelectorAll("text.mo")].filter(t => getComputedStyle(t).display !== "none").map(t => ({s: t.textContent, r: t.getBoundingClientRect()}));
  let min = {gap: Infinity, pair: ""};
  for (let i = 1; i < shown.length; i++) {
    const gap = shown[i].r.left - shown[i - 1].r.right;
    if (gap < min.gap) min = {gap: gap, pair: shown[i - 1].s + " " + shown[i].s};
  }
  return min;
})`

// On a phone the month labels of a year chart stand apart: each is centred
// on its month's days, at least 1.5 px from the next. Begun 3 units after
// their month's first day, "May" and "Jun" touched (0 px apart at 375 px,
// overlapping by 0.1 px at 412 px) and read as one word.
func TestBrowserPhoneChartMonthsApart(t *testing.T) {
	ctx := browser(t)
	page := publishChartSites(t)
	if err := chromedp.Do(ctx, chromedp.Navigate(page)); err != nil {
		t.Fatal(err)
	}
	for _, w := range []int64{412, 390, 375, 320} {
		if err := chromedp.Do(ctx, chromedp.EmulateViewport(w, 900)); err != nil {
			t.Fatal(err)
		}
		gaps, err := chromedp.Run(ctx, chromedp.Evaluate[[]struct {
			Gap  float64
			Pair string
		}](monthGaps))
		if err != nil {
			t.Fatal(err)
		}
		for i, g := range gaps {
			if g.Gap < 1.5 {
				t.Errorf("%d px, chart %d: the month labels %q are %.1f px apart, want 1.5 px at least", w, i+1, g.Pair, g.Gap)
			}
		}
	}
}

// On a 375 px and a 412 px phone the links of the published index's feeds
// ("webcal", "https", or the file's name) are at least 44 by 44 CSS pixels,
// the target size of WCAG 2.1 SC 2.5.5, each alone on its line in the
// phone's layout: they were 19 px tall.
func TestBrowserPublishedIndexTouchTargets(t *testing.T) {
	ctx := browser(t)
	out := t.TempDir()
	if code, _, errOut := runCLI(t, "publish", "--quiet", "--out", out); code != 0 {
		t.Fatalf("publish: exit %d: %s", code, errOut)
	}
	for _, w := range []int64{375, 412} {
		if err := chromedp.Do(ctx, chromedp.EmulateViewport(w, 800), chromedp.Navigate("file://"+filepath.Join(out, "index.html"))); err != nil {
			t.Fatal(err)
		}
		small, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](smallTargetsOf("main td a")))
		if err != nil {
			t.Fatal(err)
		}
		if len(small) > 0 {
			t.Errorf("index.html at %d px, links under 44 by 44 px: %s", w, strings.Join(small, "; "))
		}
	}
}
