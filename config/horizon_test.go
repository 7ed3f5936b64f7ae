package config

import (
	"strings"
	"testing"
)

// A horizon written as 0, in any of the three formats or on a command
// line, is a level horizon the site gives (OwnHorizon: no dip), unlike a
// horizon left out; a horizon of 2 is the site's own either way.
func TestHorizonZeroWrittenIsLevel(t *testing.T) {
	yamlSite := func(horizon string) string {
		return "sites:\n  - id: owlgate\n    latitude: -31.27\n    longitude: 149.07\n    elevation: 1150\n    timezone: Australia/Sydney\n" +
			horizon + "feeds:\n  - id: sky\n    site: owlgate\n    kinds: [sunrise]\n"
	}
	tomlSite := func(horizon string) string {
		return "[[sites]]\nid = \"owlgate\"\nlatitude = -31.27\nlongitude = 149.07\nelevation = 1150\ntimezone = \"Australia/Sydney\"\n" +
			horizon + "[[feeds]]\nid = \"sky\"\nsite = \"owlgate\"\nkinds = [\"sunrise\"]\n"
	}
	jsonSite := func(horizon string) string {
		return `{"sites": [{"id": "owlgate", "latitude": -31.27, "longitude": 149.07, "elevation": 1150, "timezone": "Australia/Sydney"` +
			horizon + `}], "feeds": [{"id": "sky", "site": "owlgate", "kinds": ["sunrise"]}]}`
	}
	for _, c := range []struct {
		name, format, text string
		own                bool
		horizon            float64
	}{
		{"yaml unset", "yaml", yamlSite(""), false, 0},
		{"yaml 0", "yaml", yamlSite("    horizon: 0\n"), true, 0},
		{"yaml 0.0", "yaml", yamlSite("    horizon: 0.0\n"), true, 0},
		{"yaml null", "yaml", yamlSite("    horizon:\n"), false, 0},
		{"yaml 2", "yaml", yamlSite("    horizon: 2\n"), true, 2},
		{"toml unset", "toml", tomlSite(""), false, 0},
		{"toml 0", "toml", tomlSite("horizon = 0\n"), true, 0},
		{"toml 0.0", "toml", tomlSite("horizon = 0.0\n"), true, 0},
		{"json unset", "json", jsonSite(""), false, 0},
		{"json 0", "json", jsonSite(`, "horizon": 0`), true, 0},
		{"json -0.8", "json", jsonSite(`, "horizon": -0.8`), true, -0.8},
	} {
		cfg, err := Parse(strings.NewReader(c.text), c.format)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		s := cfg.Sites[0]
		if s.OwnHorizon() != c.own || s.Horizon != c.horizon {
			t.Errorf("%s: horizon %g, OwnHorizon %v; want %g, %v", c.name, s.Horizon, s.OwnHorizon(), c.horizon, c.own)
		}
	}
	for _, c := range []struct {
		text string
		own  bool
	}{{"0", true}, {"0.0", true}, {"1.5", true}, {"0:2,90:8", false}} {
		s := &Site{ID: "place", Latitude: -31.27, Longitude: 149.07, Elevation: 1150}
		if err := s.HorizonFromText("--horizon", c.text); err != nil {
			t.Fatalf("--horizon %s: %v", c.text, err)
		}
		if s.OwnHorizon() != c.own {
			t.Errorf("--horizon %s: OwnHorizon %v, want %v", c.text, s.OwnHorizon(), c.own)
		}
	}
	if s := (&Site{Elevation: 1150}); s.OwnHorizon() {
		t.Error("a site without a horizon: OwnHorizon true, want the flat horizon with the dip")
	}
}
