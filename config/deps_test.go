package config

import (
	"os/exec"
	"strings"
	"testing"
)

// TestImports keeps config at the bottom of the module: it imports the
// standard library, viper (and the decoder viper uses), the cron parser
// that checks the refresh schedule and the zone map's data and geometry,
// and no heliocal package.
func TestImports(t *testing.T) {
	out, err := exec.Command("go", "list", "-f", `{{join .Imports "\n"}}`, ".").Output()
	if err != nil {
		t.Skipf("go list unavailable: %v", err)
	}
	allowed := map[string]bool{
		"github.com/spf13/viper":              true,
		"github.com/go-viper/mapstructure/v2": true,
		"github.com/robfig/cron/v3":           true,
		// the decoders' own parsers, to find keys written twice
		"go.yaml.in/yaml/v3":                       true,
		"github.com/pelletier/go-toml/v2/unstable": true,
		// the TOML decoder's type of an unquoted date (read as text)
		"github.com/pelletier/go-toml/v2": true,
		// the offline zone map behind ZoneAt: its data, the polylines its
		// polygons are encoded in, the point-in-polygon test (zonemap.go
		// decodes the files itself: no protobuf runtime at start)
		"github.com/ringsaturn/tzf-rel-lite":  true,
		"github.com/twpayne/go-polyline":      true,
		"github.com/tidwall/geojson/geometry": true,
	}
	for _, imp := range strings.Fields(string(out)) {
		first, _, _ := strings.Cut(imp, "/")
		if !strings.Contains(first, ".") && first != "heliocal" {
			continue // standard library
		}
		if !allowed[imp] {
			t.Errorf("config imports %s", imp)
		}
	}
}
