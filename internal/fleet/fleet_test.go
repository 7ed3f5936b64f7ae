package fleet

import (
	"fmt"
	"strings"
	"testing"

	"heliocal/config"
)

// The fleet parses as a valid configuration with one site and one feed per
// member, and members stay apart (ids distinct, coordinates in range).
func TestYAMLIsAValidConfiguration(t *testing.T) {
	const n = 25
	cfg, err := config.Parse(strings.NewReader(YAML(n)), "yaml")
	if err != nil {
		t.Fatal(err)
	}
	if len(cfg.Sites) != n || len(cfg.Feeds) != n {
		t.Fatalf("%d sites and %d feeds, want %d of each", len(cfg.Sites), len(cfg.Feeds), n)
	}
	if got := cfg.Sites[n-1].ID; got != "site-0024" {
		t.Errorf("last site %q, want site-0024", got)
	}
}

// A fleet of 5,000 sites, the size an operator tries first beyond the
// benchmark's, is a valid configuration too: its sites past the 4,120th
// once had longitudes over 180° and the whole file was refused.
func TestYAMLLargeFleetIsValid(t *testing.T) {
	const n = 5000
	cfg, err := config.Parse(strings.NewReader(YAML(n)), "yaml")
	if err != nil {
		t.Fatal(err)
	}
	if len(cfg.Sites) != n {
		t.Fatalf("%d sites, want %d", len(cfg.Sites), n)
	}
}

// Every site tools/fleet can write (it takes up to MaxSites) has a latitude
// and a longitude in range, and no two sites stand on the same point as
// the configuration writes it (four decimals).
func TestPlaceInRangeAndDistinct(t *testing.T) {
	const most = MaxSites
	seen := make(map[string]int, most)
	for i := range most {
		lat, lon, _ := place(i)
		if lat < -90 || lat > 90 || lon < -180 || lon > 180 {
			t.Fatalf("site %d at latitude %.4f, longitude %.4f: out of range", i, lat, lon)
		}
		key := fmt.Sprintf("%.4f %.4f", lat, lon)
		if j, ok := seen[key]; ok {
			t.Fatalf("sites %d and %d both at %s", j, i, key)
		}
		seen[key] = i
	}
}
