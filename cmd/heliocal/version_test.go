package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"runtime/debug"
	"strings"
	"testing"
)

// The version comes from, in order: the linker, the module version, the
// version-control settings; a build with none of them says "unversioned",
// never "dev".
func TestReadBuildVersion(t *testing.T) {
	vcs := []debug.BuildSetting{
		{Key: "vcs", Value: "git"},
		{Key: "vcs.revision", Value: "13b7d4a63c14037dd2db9ac6b1724d51a87316ec"},
		{Key: "vcs.time", Value: "2026-12-03T07:44:01Z"},
		{Key: "vcs.modified", Value: "true"},
	}
	tests := []struct {
		name    string
		linked  string
		bi      *debug.BuildInfo
		version string
		line    string
	}{
		{"linker wins", "v1.4.0", &debug.BuildInfo{Main: debug.Module{Version: "v1.3.0"}}, "v1.4.0", "heliocal v1.4.0 ("},
		{"release tag", "", &debug.BuildInfo{Main: debug.Module{Version: "v1.3.0"}}, "v1.3.0", "heliocal v1.3.0 (go"},
		{"pseudo-version from the go command", "", &debug.BuildInfo{Main: debug.Module{Version: "v0.0.0-20261203074401-13b7d4a63c14"}, Settings: vcs[:3]},
			"v0.0.0-20261203074401-13b7d4a63c14", "(commit 13b7d4a63c14 of 2026-12-03 07:44 UTC, go"},
		{"revision only", "", &debug.BuildInfo{Main: debug.Module{Version: "(devel)"}, Settings: vcs},
			"v0.0.0-20261203074401-13b7d4a63c14+dirty", "commit 13b7d4a63c14 of 2026-12-03 07:44 UTC with uncommitted changes"},
		{"nothing known", "", &debug.BuildInfo{Main: debug.Module{Version: "(devel)"}}, "unversioned", "heliocal unversioned (go"},
		{"no build information", "", nil, "unversioned", "heliocal unversioned (go"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			v := readBuildVersion(tc.linked, tc.bi)
			if v.Version != tc.version {
				t.Errorf("Version = %q, want %q", v.Version, tc.version)
			}
			if line := v.String(); !strings.Contains(line, tc.line) || strings.Contains(line, "dev") {
				t.Errorf("line %q, want it to contain %q and no \"dev\"", line, tc.line)
			}
		})
	}
}

// A binary built from a git checkout knows its commit: --version prints the
// go command's pseudo-version with the commit and its date, and every
// published feed carries that version in PRODID. The test commits the
// working tree, as it is, to a new repository and builds there.
func TestVersionOfABuiltBinary(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the command from a copy of the tree")
	}
	gitBin, err := exec.LookPath("git")
	if err != nil {
		t.Skip("no git")
	}
	goBin, err := exec.LookPath("go")
	if err != nil {
		t.Skip("no go command")
	}
	root, err := filepath.Abs(filepath.Join("..", ".."))
	if err != nil {
		t.Fatal(err)
	}
	files, err := exec.Command(gitBin, "-C", root, "ls-files", "-z", "--cached", "--others", "--exclude-standard").Output()
	if err != nil {
		t.Skipf("not in a git checkout: %v", err)
	}
	dir := t.TempDir()
	src := filepath.Join(dir, "src")
	for _, name := range strings.Split(strings.TrimRight(string(files), "\x00"), "\x00") {
		data, err := os.ReadFile(filepath.Join(root, name))
		if os.IsNotExist(err) {
			continue // deleted, not yet committed
		}
		if err != nil {
			t.Fatal(err)
		}
		if err := os.MkdirAll(filepath.Join(src, filepath.Dir(name)), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(src, name), data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	git := func(args ...string) string {
		t.Helper()
		cmd := exec.Command(gitBin, append([]string{"-C", src, "-c", "user.name=heliocal test", "-c", "user.email=test@example.org", "-c", "commit.gpgsign=false"}, args...)...)
		cmd.Env = append(os.Environ(), "GIT_AUTHOR_DATE=2026-12-03T07:44:01Z", "GIT_COMMITTER_DATE=2026-12-03T07:44:01Z")
		out, err := cmd.CombinedOutput()
		if err != nil {
			t.Fatalf("git %s: %v\n%s", args[0], err, out)
		}
		return strings.TrimSpace(string(out))
	}
	git("init", "-q")
	git("add", "-A")
	git("commit", "-q", "-m", "tree under test")
	rev := git("rev-parse", "HEAD")[:12]

	bin := filepath.Join(dir, "heliocal")
	build := exec.Command(goBin, "build", "-buildvcs=true", "-o", bin, "./cmd/heliocal")
	build.Dir = src
	build.Env = append(os.Environ(), "GOFLAGS=")
	if out, err := build.CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	out, err := exec.Command(bin, "--version").CombinedOutput()
	if err != nil {
		t.Fatalf("--version: %v\n%s", err, out)
	}
	line := strings.TrimSpace(string(out))
	want := "heliocal v0.0.0-20261203074401-" + rev + " (commit " + rev + " of 2026-12-03 07:44 UTC, go"
	if !strings.HasPrefix(line, want) || strings.Contains(line, "dev") {
		t.Fatalf("--version printed\n%q\nwant it to start with\n%q\n(and no \"dev\")", line, want)
	}
	pub := exec.Command(bin, "publish", "--quiet", "--out", filepath.Join(dir, "public"))
	pub.Dir = dir
	if out, err := pub.CombinedOutput(); err != nil {
		t.Fatalf("publish: %v\n%s", err, out)
	}
	ics, err := os.ReadFile(filepath.Join(dir, "public", "fernhollow-sun.ics"))
	if err != nil {
		t.Fatal(err)
	}
	if want := "\r\nPRODID:-//heliocal//heliocal v0.0.0-20261203074401-" + rev + "//EN\r\n"; !strings.Contains(string(ics), want) {
		t.Errorf("the feed lacks %q", want)
	}
}
