package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/chromedp/cdproto/accessibility"
	"github.com/chromedp/chromedp"
)

// chartSites is a configuration whose year charts are full: at 52° N lamps
// up to 16 h and dark windows overlap in the evening, and at 68° N (an
// invented station in the Scandinavian mountains) the polar night's lamp
// periods and dark windows are the largest shapes of the chart.
const chartSites = `
sites:
  - {id: fen, name: Fen Glasshouses, latitude: 52.2, longitude: 0.12, elevation: 5, timezone: Europe/London}
  - {id: fell, name: Fell Station, latitude: 68.35, longitude: 18.8, elevation: 400, timezone: Europe/Stockholm}
feeds:
  - {id: fen-lamps, site: fen, kinds: [sunrise, sunset, "lighting:16h", dark-window, "photoperiod:12h", seasons]}
  - {id: fell-night, site: fell, kinds: [sunrise, sunset, "lighting:14h", dark-window, seasons]}
`

// publishChartSites publishes chartSites and returns the index page's URL.
func publishChartSites(t *testing.T) string {
	t.Helper()
	dir := t.TempDir()
	cfg := filepath.Join(dir, "heliocal.yaml")
	if err := os.WriteFile(cfg, []byte(chartSites), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "public")
	if code, _, errOut := runCLI(t, "publish", "--quiet", "--config", cfg, "--out", out); code != 0 {
		t.Fatalf("publish: exit %d: %s", code, errOut)
	}
	return "file://" + filepath.Join(out, "index.html")
}

// axText is the text of an accessibility value, "" when it has none.
func axText(v *accessibility.Value) string {
	if v == nil {
		return ""
	}
	var s string
	if json.Unmarshal(v.Value, &s) != nil {
		return ""
	}
	return s
}

// A screen reader hears a year chart once: the chart (an image) is named by
// its title, which says what it draws, lamp periods and dark windows
// included, with no description of its own beside the caption under it;
// the caption says in words when the lamp periods and the dark windows
// fall and the longest of each, and the summary is said once on the page.
func TestBrowserChartTextAlternative(t *testing.T) {
	ctx := browser(t)
	if err := chromedp.Do(ctx, chromedp.Navigate(publishChartSites(t))); err != nil {
		t.Fatal(err)
	}
	tree, err := chromedp.Call(ctx, accessibility.GetFullAXTree, accessibility.GetFullAXTreeParams{})
	if err != nil {
		t.Fatal(err)
	}
	type chartText struct{ Title, Caption string }
	charts, err := chromedp.Run(ctx, chromedp.Evaluate[[]chartText](`[...document.querySelectorAll("figure")].map(f => ({Title: f.querySelector("svg > title").textContent, Caption: f.querySelector("figcaption").textContent}))`))
	if err != nil {
		t.Fatal(err)
	}
	if len(charts) != 2 {
		t.Fatalf("%d charts, want 2", len(charts))
	}
	for _, c := range charts {
		site := strings.SplitN(strings.SplitN(c.Title, " at ", 2)[1], ",", 2)[0]
		if !strings.HasPrefix(c.Title, "Sunrise, sunset, lamp periods and dark windows at ") {
			t.Errorf("%s: title %q, want it to name the lamp periods and dark windows it draws", site, c.Title)
		}
		for _, s := range []string{"Lamp periods on ", "; the longest ", "Dark windows on ", " nights, ", "(the night of "} {
			if !strings.Contains(c.Caption, s) {
				t.Errorf("%s: caption %q lacks %q", site, c.Caption, s)
			}
		}
		summary, _, _ := strings.Cut(c.Caption, " Local clock time")
		var images int
		heard := 0 // how often the summary is said: names, descriptions and text
		for _, n := range tree.Nodes {
			if n.Ignored || axText(n.Role) == "InlineTextBox" { // a line of the text above it
				continue
			}
			name, desc := axText(n.Name), axText(n.Description)
			heard += strings.Count(name, summary) + strings.Count(desc, summary)
			if axText(n.Role) != "image" || !strings.Contains(name, site) {
				continue
			}
			images++
			if name != c.Title || desc != "" {
				t.Errorf("%s: the chart is named %q and described %q; want its title, %q, and no description of its own", site, name, desc, c.Title)
			}
		}
		if images != 1 {
			t.Errorf("%s: %d images named for the site, want 1", site, images)
		}
		if heard > 1 {
			t.Errorf("%s: the summary %q is said %d times", site, summary, heard)
		}
	}
}
