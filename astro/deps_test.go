package astro

import (
	"os/exec"
	"strings"
	"testing"
)

// TestDependencies enforces the package's dependency policy: astro imports
// the Go standard library only (no I/O of data files, nothing of the
// project's own), so that it stays a self-contained library. The one file
// built into it is the Sun's daily table it computes itself (suntable.go),
// part of the binary, not read at run time.
func TestDependencies(t *testing.T) {
	goTool, err := exec.LookPath("go")
	if err != nil {
		t.Skip("go tool not found")
	}
	out, err := exec.Command(goTool, "list", "-deps", "-f", "{{if not .Standard}}{{.ImportPath}}{{end}}", ".").CombinedOutput()
	if err != nil {
		t.Fatalf("go list: %v\n%s", err, out)
	}
	for _, p := range strings.Fields(string(out)) {
		if p != "heliocal/astro" {
			t.Errorf("astro depends on %s; only the standard library is allowed", p)
		}
	}
	// Nor may it read files or the environment at run time (direct
	// imports), nor embed any file but its table.
	out, err = exec.Command(goTool, "list", "-f", `{{join .Imports " "}}|{{join .EmbedFiles " "}}`, ".").CombinedOutput()
	if err != nil {
		t.Fatalf("go list: %v\n%s", err, out)
	}
	imports, embeds, _ := strings.Cut(strings.TrimSpace(string(out)), "|")
	for _, p := range strings.Fields(imports) {
		switch p {
		case "os", "io/ioutil", "net", "net/http", "log", "log/slog":
			t.Errorf("astro imports %s (no I/O or logging in astro)", p)
		}
	}
	if embeds != "suntable.bin" {
		t.Errorf("astro embeds %q; only its own computed table suntable.bin is allowed", embeds)
	}
}
