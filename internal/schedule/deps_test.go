package schedule

import (
	"os/exec"
	"strings"
	"testing"
)

// TestDeps enforces the layering: the scheduler takes a function, so it never
// imports the feed packages (of ours, only internal/stopped, which tells a
// run Stop cut short); its only module outside the standard library is
// robfig/cron.
func TestDeps(t *testing.T) {
	out, err := exec.Command("go", "list", "-deps", "-f", "{{if not .Standard}}{{.ImportPath}}{{end}}", ".").Output()
	if err != nil {
		t.Skip("go list unavailable:", err)
	}
	for _, p := range strings.Fields(string(out)) {
		switch {
		case p == "heliocal/internal/schedule", p == "heliocal/internal/stopped", p == "github.com/robfig/cron/v3":
		case strings.HasPrefix(p, "heliocal/"):
			t.Errorf("internal/schedule imports %s: it must take a function instead", p)
		default:
			t.Errorf("internal/schedule imports %s: only the standard library and robfig/cron are allowed", p)
		}
	}
}
