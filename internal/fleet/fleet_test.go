package fleet

import (
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
