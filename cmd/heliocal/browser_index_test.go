package main

import (
	"path/filepath"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"
)

// chartTextPx is the smallest rendered height, in CSS pixels, of the year
// charts' axis labels.
const chartTextPx = `Math.min(...[...document.querySelectorAll("svg text")]
  .filter(t => getComputedStyle(t).display !== "none")
  .map(t => t.getBoundingClientRect().height).filter(h => h > 0))`

// The static index `publish` writes fits a 390 px phone and a 1280 px desk
// without horizontal scrolling, and its year charts' labels stay readable on
// the phone (at least 7 px tall once the chart is scaled to the width).
func TestBrowserPublishedIndex(t *testing.T) {
	ctx := browser(t)
	out := t.TempDir()
	if code, _, errOut := runCLI(t, "publish", "--quiet", "--out", out); code != 0 {
		t.Fatalf("publish: exit %d: %s", code, errOut)
	}
	if err := chromedp.Do(ctx, chromedp.Navigate("file://"+filepath.Join(out, "index.html"))); err != nil {
		t.Fatal(err)
	}
	for _, w := range []struct{ width, height int64 }{{1280, 900}, {390, 844}} {
		if err := chromedp.Do(ctx, chromedp.EmulateViewport(w.width, w.height)); err != nil {
			t.Fatal(err)
		}
		problems, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](layoutProblems))
		if err != nil {
			t.Fatal(err)
		}
		if len(problems) > 0 {
			t.Errorf("index.html at %d px: %s", w.width, strings.Join(problems, "; "))
		}
		px, err := chromedp.Run(ctx, chromedp.Evaluate[float64](chartTextPx))
		if err != nil {
			t.Fatal(err)
		}
		if px < 7 {
			t.Errorf("index.html at %d px: chart labels %.1f px tall, want at least 7", w.width, px)
		}
	}
	shot(t, ctx, "index-390.png")
}
