package feed

import (
	"context"
	"os/exec"
	"strings"
	"testing"

	"heliocal/config"
)

// Every kind of the configuration vocabulary has a computation here, and
// gives at least one event or note over a year at a mid-latitude site (for
// sun-hidden, one with a 30° peak due south, which hides the winter noon Sun).
func TestEveryKindComputed(t *testing.T) {
	flat := site(t, "mid", 48.2, 16.4, "Europe/Vienna")
	peak := site(t, "peak", 48.2, 16.4, "Europe/Vienna")
	peak.Skyline = [][2]float64{{0, 0}, {170, 0}, {176, 30}, {184, 30}, {190, 0}}
	sk := sky(t, "2027-01-01", "2027-12-31")
	for _, example := range config.KindExamples {
		s := flat
		if example == "sun-hidden" || example == "noon-clear" {
			s = peak
		}
		t.Run(example, func(t *testing.T) {
			k := mustKinds(t, example)
			entries, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{{Kind: k[0]}}, date("2027-01-01"), date("2027-12-31"))
			if err != nil {
				t.Fatal(err)
			}
			if len(entries) == 0 {
				t.Error("no entries in a year")
			}
			for _, e := range entries {
				if e.Title == "" || e.Description == "" || e.UID == "" {
					t.Fatalf("incomplete entry %+v", e)
				}
			}
		})
	}
}

// feed imports heliocal/astro and heliocal/config, never the renderers or
// servers built on it (STYLE: imports point one way).
func TestDependencies(t *testing.T) {
	out, err := exec.Command("go", "list", "-deps", "-f", "{{if not .Standard}}{{.ImportPath}}{{end}}", ".").Output()
	if err != nil {
		t.Fatalf("go list: %v", err)
	}
	for _, p := range strings.Fields(string(out)) {
		if strings.HasPrefix(p, "heliocal/") && p != "heliocal/feed" && p != "heliocal/astro" && p != "heliocal/config" {
			t.Errorf("heliocal/feed depends on %s", p)
		}
	}
}

// Every kind's entries carry two CATEGORIES (RFC 5545 §3.8.1.2), the body
// and the kind, so that a calendar app can filter them: lamp periods as
// "Supplemental lighting", not a bare "Sun". Groups (moon-phases) give
// their members' entries.
func TestCategoriesEveryKind(t *testing.T) {
	for _, n := range config.KindNames {
		switch n {
		case config.KindSunBand:
			n += ":20..35"
		case "sun-altitude":
			n += ":-3"
		case "photoperiod", config.KindLighting:
			n += ":16h"
		}
		k, err := config.ParseKind(n)
		if err != nil {
			t.Fatal(err)
		}
		if len(k.Members()) > 1 {
			continue
		}
		if c := categories(k); len(c) != 2 || c[0] == "" || c[1] == "" {
			t.Errorf("%s: categories %q, want the body and the kind", n, c)
		}
	}
	if c := categories(mustKinds(t, "lighting:16h")[0]); c[1] != "Supplemental lighting" {
		t.Errorf("lighting: categories %q", c)
	}
}
