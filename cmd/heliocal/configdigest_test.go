package main

import (
	"strings"
	"testing"

	"heliocal/config"
)

// The shards of one publish may be of two versions, as while the machines
// that publish them to one volume are upgraded one by one: the fingerprint
// of a configuration (a shard manifest's configuration_sha256 is made from
// it) is the one the version before computed for the same file. The wanted
// values are those cad5212 computed (its configDigest over the same
// configurations, the built-in demo as it has been since). A file that the
// two versions read differently is another configuration to them and keeps
// another fingerprint: a written horizon: 0 was the flat horizon lowered by
// the dip there, and is a level horizon now.
func TestConfigDigestAcrossVersions(t *testing.T) {
	plateau := "sites:\n  - {id: plateau, latitude: -31.27, longitude: 149.07, elevation: 1150, timezone: Australia/Sydney%s}\n" +
		"feeds:\n  - {id: plateau-sun, site: plateau, kinds: [sunrise, sunset]}\n"
	parse := func(src string) *config.Config {
		t.Helper()
		cfg, err := config.ParseEnv(strings.NewReader(src), "yaml", func(string) (string, bool) { return "", false })
		if err != nil {
			t.Fatal(err)
		}
		return cfg
	}
	for _, tc := range []struct {
		name string
		cfg  *config.Config
		base string
		want string // cad5212's configDigest
	}{
		{"demo", config.Demo(), "", "606cea6a7d3d940792a9691e0c74f419b4cc69bf1aa0b67e7ae4851a1c3e9160"},
		{"demo with a base URL", config.Demo(), "https://sky.example.org/calendars/", "a5d39d8b5a65d78c592ae09651f572254cfa22555871666308696bbdf12495fb"},
		{"a site without horizon", parse(strings.Replace(plateau, "%s", "", 1)), "", "1a19760d594ab8f45635ccba65c4dea42fe56b53994046f68784136c1145cf1b"},
	} {
		got, err := configDigest(tc.cfg, tc.base)
		if err != nil {
			t.Fatal(err)
		}
		if got != tc.want {
			t.Errorf("%s: fingerprint %s, want %s as the version before computed: a field added to the configuration's types changed it (tag it json:\",omitempty\")", tc.name, got, tc.want)
		}
	}
	level, err := configDigest(parse(strings.Replace(plateau, "%s", ", horizon: 0", 1)), "")
	if err != nil {
		t.Fatal(err)
	}
	// cad5212's fingerprint of the same file, read there as the flat horizon
	if level == "92e464428eca28a769e4af33277397a76f61fb8a8d0017698f644eff11e83539" || level == "1a19760d594ab8f45635ccba65c4dea42fe56b53994046f68784136c1145cf1b" {
		t.Errorf("horizon: 0 has the fingerprint %s of a configuration read the other way", level)
	}
}
