package main

import (
	"context"
	"encoding/json"
	"slices"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"
)

// builderForm reads the builder's form as the page shows it: each field's
// value, the kinds ticked, the shifts that are not 0, and the zone the
// preview is in.
const builderForm = `(() => {
  const v = (id) => document.getElementById(id).value;
  return {
    fields: ["lat", "lon", "elev", "name", "horizon", "tz", "lighting", "alarm", "start"].map((id) => id + "=" + v(id)),
    kinds: [...document.querySelectorAll("input[name=kinds]:checked")].map((c) => c.value),
    shifts: [...document.querySelectorAll("input.offset")].filter((o) => o.value !== "0").map((o) => o.dataset.kind + ":" + o.value),
    zone: document.getElementById("tz-found").textContent,
  };
})()`

type formRead struct {
	Fields, Kinds, Shifts []string
	Zone                  string
}

// readForm runs builderForm.
func readForm(t *testing.T, ctx context.Context) formRead {
	t.Helper()
	got, err := chromedp.Run(ctx, chromedp.Evaluate[map[string]any](builderForm))
	if err != nil {
		t.Fatal(err)
	}
	var f formRead
	b, _ := json.Marshal(got)
	if err := json.Unmarshal(b, &f); err != nil {
		t.Fatal(err)
	}
	return f
}

// dayTexts reads a day-by-day table, the table page's (sel "table.days
// tbody tr") or the builder's preview ("#preview tr"): per row its date and
// the text of each of its entries.
func dayTexts(sel string) string {
	return `[...document.querySelectorAll("` + sel + `")].map(tr => tr.querySelector(".date").textContent + ": " + [...tr.querySelectorAll("li")].map(li => li.textContent).join(" | "))`
}

// tableRows opens the day-by-day table at url and reads its rows
// (dayTexts).
func tableRows(t *testing.T, ctx context.Context, url string) []string {
	t.Helper()
	if err := chromedp.Do(ctx, chromedp.Navigate(url), chromedp.WaitVisible(chromedp.CSS("table.days"))); err != nil {
		t.Fatal(err)
	}
	rows, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](dayTexts("table.days tbody tr")))
	if err != nil {
		t.Fatal(err)
	}
	return rows
}

// makeAnother follows the table's "make another" to the builder and waits
// for the preview it shows as it loads.
func makeAnother(t *testing.T, ctx context.Context) {
	t.Helper()
	if err := chromedp.Do(ctx,
		chromedp.Click(chromedp.Search(`//a[text()="make another"]`)),
		chromedp.WaitVisible(chromedp.ID("lat")),
		chromedp.Poll[chromedp.Void](`document.getElementById("result").classList.contains("ready") && document.querySelector("#preview th") !== null`),
	); err != nil {
		t.Fatalf("make another: %v", err)
	}
}

// The table page's "make another" opens the builder filled with the
// table's query, for a place in the southern hemisphere (Hobart, Tasmania,
// in its winter): the place, its name, elevation and horizon, the kinds
// with a shift, the lighting target and the reminder in their fields, the
// date the table starts on, and the zone found again from the coordinates;
// the builder then previews, as it loads, the very rows of the table, and
// its subscribe and share links are the table's own.
func TestBrowserMakeAnother(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	table := ts.URL + "/at?lat=-42.8821&lon=147.3272&elev=40&name=Battery+Point&horizon=1.5" +
		"&kinds=civil-dawn,sunrise,sunset,moonrise,lighting:14h&offsets=sunset:-20m,moonrise:10m&alarm=15m&start=2027-06-21"
	rows := tableRows(t, ctx, table)
	links, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](`[document.querySelector("a.button").href.replace(/^webcal:/, "http:"), document.querySelector("p.noprint a.url").href]`))
	if err != nil {
		t.Fatal(err)
	}
	makeAnother(t, ctx)
	f := readForm(t, ctx)
	wantFields := []string{"lat=-42.8821", "lon=147.3272", "elev=40", "name=Battery Point", "horizon=1.5", "tz=", "lighting=14", "alarm=15", "start=2027-06-21"}
	if !slices.Equal(f.Fields, wantFields) {
		t.Errorf("the builder opens with %q, want %q", f.Fields, wantFields)
	}
	slices.Sort(f.Kinds)
	slices.Sort(f.Shifts)
	if want := []string{"civil-dawn", "moonrise", "sunrise", "sunset"}; !slices.Equal(f.Kinds, want) {
		t.Errorf("kinds ticked %q, want %q", f.Kinds, want)
	}
	if want := []string{"moonrise:10", "sunset:-20"}; !slices.Equal(f.Shifts, want) {
		t.Errorf("shifts %q, want %q", f.Shifts, want)
	}
	// the tz database's zone of Tasmania
	if f.Zone != "Australia/Hobart (found from the coordinates)" {
		t.Errorf("zone %q, want Australia/Hobart found from the coordinates", f.Zone)
	}
	preview, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](dayTexts("#preview tr")))
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 7 || !strings.HasPrefix(rows[0], "2027-06-21: ") || !slices.Equal(preview, rows) {
		t.Errorf("the builder's preview differs from the table it was made from:\npreview: %q\ntable:   %q", preview, rows)
	}
	got, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](`[document.getElementById("https").value, document.getElementById("page").href]`))
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(got, links) {
		t.Errorf("the builder's subscribe and share links %q, want the table's %q", got, links)
	}
	if n, err := chromedp.Run(ctx, chromedp.Evaluate[bool](`document.getElementById("fill-note") === null`)); err != nil || !n {
		t.Errorf("the builder notes values left out of the table's own query (%v)", err)
	}
}

// A link to the builder with values it cannot use opens the page all the
// same: each such value is said in a note naming the parameter and the
// value, its field is left at its default, and the rest of the link fills
// the form and gives a preview: Wellington, New Zealand, its zone misspelt
// (Pacific/Aukland for the tz database's Pacific/Auckland, found again
// from the coordinates), a kind misspelt, an elevation in words and
// 30 February. At 390 px the page does not scroll sideways.
func TestBrowserBuilderLinkBadValues(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	if err := chromedp.Do(ctx,
		chromedp.EmulateViewport(390, 844),
		chromedp.Navigate(ts.URL+"/?lat=-41.2865&lon=174.7762&tz=Pacific/Aukland&kinds=sunrise,sunrize,sunset&elev=high&start=2027-02-30&name=Te+Aro"),
		chromedp.WaitVisible(chromedp.ID("fill-note")),
		chromedp.Poll[chromedp.Void](`document.getElementById("result").classList.contains("ready") && document.querySelector("#preview li") !== null`),
	); err != nil {
		shot(t, ctx, "builder-link-bad-failed.png")
		t.Fatal(err)
	}
	note, err := chromedp.Run(ctx, chromedp.Text(chromedp.ID("fill-note")))
	if err != nil {
		t.Fatal(err)
	}
	for _, w := range []string{`parameter tz="Pacific/Aukland": unknown time zone (did you mean "Pacific/Auckland"?)`,
		`parameter kinds="sunrize": unknown kind "sunrize" (did you mean "sunrise"?)`, `parameter elev="high": not a decimal number`,
		`parameter start="2027-02-30": not a date`} {
		if !strings.Contains(note, w) {
			t.Errorf("the note lacks %q:\n%s", w, note)
		}
	}
	f := readForm(t, ctx)
	if want := []string{"lat=-41.2865", "lon=174.7762", "elev=0", "name=Te Aro", "horizon=", "tz=", "lighting=", "alarm=0"}; !slices.Equal(f.Fields[:8], want) {
		t.Errorf("the builder opens with %q, want %q and the server's today", f.Fields, want)
	}
	slices.Sort(f.Kinds)
	if want := []string{"sunrise", "sunset"}; !slices.Equal(f.Kinds, want) || f.Zone != "Pacific/Auckland (found from the coordinates)" {
		t.Errorf("kinds %q in %q, want %q in Pacific/Auckland found from the coordinates", f.Kinds, f.Zone, want)
	}
	if shown, err := chromedp.Run(ctx, chromedp.Evaluate[bool](`!document.getElementById("message").hidden`)); err != nil || shown {
		t.Errorf("the preview of what the link could give is refused (%v)", err)
	}
	problems, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](layoutProblems))
	if err != nil {
		t.Fatal(err)
	}
	if len(problems) > 0 {
		t.Errorf("at 390 px: %s", strings.Join(problems, "; "))
	}
}

// "make another" from a table of 31 days keeps its length: the builder
// previews the first seven of its days, and its share link, named "of 31
// days", opens a table of 31 days again, the table's own link, and keeps
// that length when a kind is changed; the table's 31 rows begin with the
// builder's seven (Lisbon in December).
func TestBrowserMakeAnotherKeepsDays(t *testing.T) {
	ts := builderServer(t)
	ctx := browser(t)
	table := ts.URL + "/at?lat=38.7223&lon=-9.1393&kinds=sunrise,sunset&start=2027-12-01&days=31"
	rows := tableRows(t, ctx, table)
	share, err := chromedp.Run(ctx, chromedp.Evaluate[string](`document.querySelector("p.noprint a.url").href`))
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 31 || !strings.Contains(share, "days=31") {
		t.Fatalf("the table has %d rows and the share link %q, want 31 days", len(rows), share)
	}
	makeAnother(t, ctx)
	preview, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](dayTexts("#preview tr")))
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(preview, rows[:7]) {
		t.Errorf("the builder's preview %q, want the table's first seven rows %q", preview, rows[:7])
	}
	got, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](`[document.getElementById("page").href, document.getElementById("page").textContent, document.getElementById("days-h").textContent]`))
	if err != nil {
		t.Fatal(err)
	}
	if want := []string{share, "Printable table of 31 days and shareable link", "Seven days from Wed 2027-12-01"}; !slices.Equal(got, want) {
		t.Errorf("the builder's share link, its words and the preview's heading %q, want %q", got, want)
	}
	// sunset unticked: a new preview, the share link still of 31 days
	if err := chromedp.Do(ctx,
		chromedp.Click(chromedp.ID("k-sunset")),
		chromedp.Poll[chromedp.Void](`!document.getElementById("page").href.includes("sunset")`),
	); err != nil {
		t.Fatalf("untick sunset: %v", err)
	}
	if page, err := chromedp.Run(ctx, chromedp.Evaluate[string](`document.getElementById("page").href`)); err != nil || !strings.HasSuffix(page, "&start=2027-12-01&days=31") {
		t.Errorf("after sunset unticked, the share link %q (%v), want the table of 31 days from 2027-12-01", page, err)
	}
}
