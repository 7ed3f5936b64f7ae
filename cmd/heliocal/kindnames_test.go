package main

import (
	"encoding/json"
	"html"
	"regexp"
	"slices"
	"strings"
	"testing"
)

// formKind is a kind the builder's form offers and its label:
// `value="civil-dawn" checked>` … `<span class="kname">Civil dawn</span>`.
var formKind = regexp.MustCompile(`name="kinds" value="([^"]+)"[^>]*>\s*<div><label for="k-[^"]+"><span class="kname">([^<]+)</span>`)

// One kind has one name between the builder's form, its preview, the /at
// table and the feed: the form's label for a kind is the name the feed's
// entries of that kind carry in their categories (Civil dawn, Astronomical
// dusk, Dark sky, Daylight; in the plural for a few a year: "Solar
// eclipses"), not other words for it ("First light", "Night begins");
// plain words stay in the explanation beside it. The preview's and the
// table's entries of the kind are titled by that name. A label that stands
// for several kinds (Moon phases: new moon, first quarter…) is the name of
// none of them. Over 2027 at 48.2° N, 16.4° E (Vienna), where the partial
// solar eclipse of 2 August and the penumbral lunar eclipse of 20–21
// February are seen (Swiss Ephemeris, testdata/reference/eclipses-swiss.csv,
// rows vienna).
func TestFormNamesKindsAsFeed(t *testing.T) {
	ts := builderServer(t)
	page := getOK(t, ts.URL+"/")
	offered := formKind.FindAllStringSubmatch(page, -1)
	if len(offered) < 20 {
		t.Fatalf("the form offers %d kinds, not the builder's:\n%s", len(offered), page)
	}
	const place = "lat=48.2&lon=16.4&tz=Europe/Vienna"
	names := map[string][]string{} // kind offered: its entries' names in the feed
	for _, m := range offered {
		kind := m[1]
		ics := getOK(t, ts.URL+"/at.ics?"+place+"&kinds="+kind+"&start=2027-01-01&days=365")
		for line := range strings.SplitSeq(ics, "\r\n") {
			if cats, ok := strings.CutPrefix(line, "CATEGORIES:"); ok {
				_, name, _ := strings.Cut(cats, ",") // "Sun,Civil dawn"
				if !slices.Contains(names[kind], name) {
					names[kind] = append(names[kind], name)
				}
			}
		}
	}
	for _, m := range offered {
		kind, label := m[1], html.UnescapeString(m[2])
		switch n := names[kind]; {
		case len(n) == 0:
			t.Errorf("%s: no entry in 2027 to compare the label %q with", kind, label)
		case len(n) == 1 && label != n[0] && label != n[0]+"s":
			t.Errorf("%s: the form says %q, the feed %q", kind, label, n[0])
		case len(n) > 1:
			for other, on := range names {
				if other != kind && slices.Contains(on, label) {
					t.Errorf("%s: the form's %q is the name of %s", kind, label, other)
				}
			}
		}
	}
	// the lamps too: the form's field for them names them as the feed does
	// ("Supplemental lighting: target day length", not "Lamp target day
	// length")
	var lamps string
	for line := range strings.SplitSeq(getOK(t, ts.URL+"/at.ics?"+place+"&kinds=sunrise&lighting=16h&start=2027-01-01&days=7"), "\r\n") {
		if cats, ok := strings.CutPrefix(line, "CATEGORIES:"); ok && cats != "Sun,Sunrise" {
			_, lamps, _ = strings.Cut(cats, ",")
		}
	}
	_, field, _ := strings.Cut(page, `<label for="lighting">`)
	if field, _, _ = strings.Cut(field, "</label>"); lamps == "" || !strings.HasPrefix(field, lamps+":") {
		t.Errorf("the form's lamp field is %q, the feed names the lamps %q", field, lamps)
	}

	// the preview and the table title the kinds' events by the same names
	q := place + "&kinds=civil-dawn,civil-dusk,astronomical-dawn,astronomical-dusk,dark-window&start=2027-01-01"
	var res struct {
		Days []struct {
			Entries []struct{ Kind, Title, Time string }
		}
	}
	if err := json.Unmarshal([]byte(getOK(t, ts.URL+"/at.json?"+q)), &res); err != nil {
		t.Fatal(err)
	}
	table := pageWords(getOK(t, ts.URL+"/at?"+q))
	n := 0
	for _, d := range res.Days {
		for _, e := range d.Entries {
			if e.Time == "" {
				continue
			}
			n++
			name := names[e.Kind][0]
			if !strings.HasPrefix(e.Title, name) {
				t.Errorf("preview: %s titled %q, not by the form's and the feed's %q", e.Kind, e.Title, name)
			}
			if !strings.Contains(table, "</span> "+html.EscapeString(e.Title)+"</li>") {
				t.Errorf("the /at table has no entry %q as the preview has it", e.Title)
			}
		}
	}
	if n != 35 {
		t.Errorf("%d timed entries in the preview, want 5 a day for 7 days", n)
	}
}
