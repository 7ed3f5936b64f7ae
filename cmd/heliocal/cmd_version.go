package main

import (
	"fmt"
	"runtime"
	"runtime/debug"
	"strings"
	"sync"
	"time"

	"github.com/spf13/cobra"
)

// version is set by a packager at build time with
// -ldflags "-X main.version=v1.2.3"; it wins over the build information.
var version = ""

// unversioned names a build that carries no version at all: neither a
// linker-set version, nor a module version, nor version-control
// information (go run, or go build outside a clone).
const unversioned = "unversioned"

// buildVersion is what the running binary knows of its own version.
type buildVersion struct {
	// Version is the linker-set version, else the module version from the
	// build information (a release tag such as v1.2.3, or the
	// pseudo-version the go command derives from the commit, e.g.
	// v0.0.0-20261203074401-13b7d4a63c14), else a pseudo-version made from
	// the version-control settings, else "unversioned". It is written into
	// every feed's PRODID.
	Version  string
	Revision string    // the commit, when the build recorded it
	Time     time.Time // the commit's time, when recorded
	Modified bool      // built from a tree with uncommitted changes
	Go       string    // the Go release that built the binary
}

// readBuildVersion works out the version from the linker-set value and the
// build information (either may be missing).
func readBuildVersion(linked string, bi *debug.BuildInfo) buildVersion {
	v := buildVersion{Version: linked, Go: runtime.Version()}
	if bi == nil {
		if v.Version == "" {
			v.Version = unversioned
		}
		return v
	}
	if bi.GoVersion != "" {
		v.Go = bi.GoVersion
	}
	for _, s := range bi.Settings {
		switch s.Key {
		case "vcs.revision":
			v.Revision = s.Value
		case "vcs.time":
			v.Time, _ = time.Parse(time.RFC3339, s.Value)
		case "vcs.modified":
			v.Modified = s.Value == "true"
		}
	}
	switch {
	case v.Version != "":
	case bi.Main.Version != "" && bi.Main.Version != "(devel)":
		v.Version = bi.Main.Version
	case v.Revision != "" && !v.Time.IsZero():
		v.Version = "v0.0.0-" + v.Time.UTC().Format("20060102150405") + "-" + short(v.Revision)
		if v.Modified {
			v.Version += "+dirty"
		}
	default:
		v.Version = unversioned
	}
	return v
}

// short is the first 12 characters of a revision, as Go's pseudo-versions
// write it.
func short(rev string) string {
	if len(rev) > 12 {
		return rev[:12]
	}
	return rev
}

// String is the line `heliocal --version` prints, e.g.
// "heliocal v1.2.3 (commit 13b7d4a63c14 of 2026-12-03 07:44 UTC, go1.26.8 linux/amd64)".
func (v buildVersion) String() string {
	var details []string
	if v.Revision != "" {
		c := "commit " + short(v.Revision)
		if !v.Time.IsZero() {
			c += " of " + v.Time.UTC().Format("2006-01-02 15:04 MST")
		}
		if v.Modified {
			c += " with uncommitted changes"
		}
		details = append(details, c)
	}
	details = append(details, v.Go+" "+runtime.GOOS+"/"+runtime.GOARCH)
	return fmt.Sprintf("heliocal %s (%s)", v.Version, strings.Join(details, ", "))
}

// currentVersion is read once: the build information does not change while
// the program runs.
var currentVersion = sync.OnceValue(func() buildVersion {
	bi, ok := debug.ReadBuildInfo()
	if !ok {
		bi = nil
	}
	return readBuildVersion(version, bi)
})

// versionString is the version written into PRODID and feeds.json.
func versionString() string { return currentVersion().Version }

func newVersionCommand(g *globals) *cobra.Command {
	return &cobra.Command{
		Use:   "version",
		Short: "Print the version (also: heliocal --version)",
		Args:  cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			_, err := fmt.Fprintln(g.stdout, currentVersion())
			return err
		},
	}
}
