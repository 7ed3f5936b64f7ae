package serve

import (
	"os"
	"reflect"
	"regexp"
	"slices"
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
