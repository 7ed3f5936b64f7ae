package serve

import (
	"math"
	"os"
	"reflect"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"
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
// (internal/fleet's first site: the daily Sun kinds over 400 days): the
// configured feeds' default level within "about N- to M-fold" and the
// figure it gives for that feed to 0.1, the ad-hoc feeds' fastest level
// within "about N- to M-fold" too.
func TestGzipRatiosDocumented(t *testing.T) {
	doc, err := os.ReadFile("../../docs/serving.md")
	if err != nil {
		t.Fatal(err)
	}
	conf := regexp.MustCompile(`once per\s+rebuild \(about (\d+)- to (\d+)-fold: ([\d.]+)-fold for a 400-day feed`).FindSubmatch(doc)
	adhoc := regexp.MustCompile(`compressed at the fastest level \(about (\d+)- to (\d+)-fold`).FindSubmatch(doc)
	if conf == nil || adhoc == nil {
		t.Fatal("docs/serving.md: the ratios of the configured and the ad-hoc feeds' gzip forms not found")
	}
	num := func(b []byte) float64 { f, _ := strconv.ParseFloat(string(b), 64); return f }
	_, data, _ := fleetBundle(t, nil)
	def := float64(len(data)) / float64(len(gzipBytes(data)))
	fast := float64(len(data)) / float64(len(gzipFast(data)))
	if def < num(conf[1]) || def > num(conf[2]) || math.Abs(def-num(conf[3])) > 0.05 {
		t.Errorf("the fleet's feed compresses %.2f-fold at the default level; docs/serving.md says %s, %s-fold for it", def, conf[0], conf[3])
	}
	if fast < num(adhoc[1]) || fast > num(adhoc[2]) {
		t.Errorf("the fleet's feed compresses %.2f-fold at the fastest level; docs/serving.md says %s", fast, adhoc[0])
	}
}
