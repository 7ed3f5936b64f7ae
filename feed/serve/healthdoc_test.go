package serve

import (
	"context"
	"math"
	"os"
	"reflect"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"

	"heliocal/feed/publish"
)

// docs/serving.md's row for /healthz names every field of its JSON, and
// none that it lacks.
func TestHealthFieldsDocumented(t *testing.T) {
	doc, err := os.ReadFile("../../docs/serving.md")
	if err != nil {
		t.Fatal(err)
	}
	row := regexp.MustCompile("(?m)^\\| `/healthz` \\|.*$").Find(doc)
	if row == nil {
		t.Fatal("docs/serving.md has no row for /healthz")
	}
	named := map[string]bool{}
	for _, m := range regexp.MustCompile("`([a-z_]+)`").FindAllStringSubmatch(string(row), -1) {
		named[m[1]] = true
	}
	var fields []string
	ty := reflect.TypeFor[health]()
	for i := range ty.NumField() {
		name, _, _ := strings.Cut(ty.Field(i).Tag.Get("json"), ",")
		fields = append(fields, name)
		if !named[name] {
			t.Errorf("docs/serving.md's /healthz row does not name the field %q", name)
		}
	}
	for _, status := range []string{"ok", "degraded", "stale", "starting", "failing"} {
		delete(named, status)
	}
	delete(named, "generated") // feeds.json's, named to say what built is
	for name := range named {
		if !slices.Contains(fields, name) {
			t.Errorf("docs/serving.md's /healthz row names %q, which /healthz does not give", name)
		}
	}
}

// docs/serving.md's ratios of the gzip forms hold for the feed of the fleet
// (internal/fleet's first site: the daily Sun kinds over 400 days) and for
// one of dark windows and the Moon's phases at the same site over the same
// window: the configured feeds' default level within "about N- to M-fold"
// and the figure it gives for each feed to 0.1, the ad-hoc feeds' fastest
// level (for the fleet's feed) within "about N- to M-fold" too.
func TestGzipRatiosDocumented(t *testing.T) {
	doc, err := os.ReadFile("../../docs/serving.md")
	if err != nil {
		t.Fatal(err)
	}
	conf := regexp.MustCompile(`once per\s+rebuild \(about (\d+)- to (\d+)-fold: ([\d.]+)-fold for a 400-day feed of the daily Sun kinds,\s+([\d.]+)-fold for\s+one of\s+dark windows and the Moon's phases\)`).FindSubmatch(doc)
	adhoc := regexp.MustCompile(`compressed at the fastest level \(about (\d+)- to (\d+)-fold`).FindSubmatch(doc)
	if conf == nil || adhoc == nil {
		t.Fatal("docs/serving.md: the ratios of the configured and the ad-hoc feeds' gzip forms not found")
	}
	num := func(b []byte) float64 { f, _ := strconv.ParseFloat(string(b), 64); return f }
	_, data, _ := fleetBundle(t, nil)
	dark := darkFeed(t)
	for _, c := range []struct {
		what string
		data []byte
		said []byte
	}{{"the fleet's feed", data, conf[3]}, {"the dark windows' and Moon phases' feed", dark, conf[4]}} {
		def := float64(len(c.data)) / float64(len(gzipBytes(c.data)))
		if def < num(conf[1]) || def > num(conf[2]) || math.Abs(def-num(c.said)) > 0.05 {
			t.Errorf("%s compresses %.2f-fold at the default level; docs/serving.md says %s, %s-fold for it", c.what, def, conf[0], c.said)
		}
	}
	fast := float64(len(data)) / float64(len(gzipFast(data)))
	if fast < num(adhoc[1]) || fast > num(adhoc[2]) {
		t.Errorf("the fleet's feed compresses %.2f-fold at the fastest level; docs/serving.md says %s", fast, adhoc[0])
	}
}

// darkFeed is the bytes of a feed of dark windows and the Moon's phases at
// the fleet's first site (internal/fleet), over the 400 days of its feed.
func darkFeed(tb testing.TB) []byte {
	tb.Helper()
	const yaml = `sites:
  - {id: site-0000, name: Fleet site 0, latitude: 48.2000, longitude: 16.4000, elevation: 0, timezone: Europe/Vienna}
feeds:
  - {id: site-0000-dark, title: Fleet site 0 dark sky, site: site-0000, days_back: 30, days_ahead: 369,
     kinds: [dark-window, moon-phases]}
`
	name, srcs := firstFeed(tb, yaml)
	b, err := publish.Render(context.Background(), srcs, publish.RenderOptions{MaxFeedBytes: -1})
	if err != nil {
		tb.Fatal(err)
	}
	return b.File(name).Data
}
