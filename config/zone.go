package config

import (
	_ "embed"
	"fmt"
	"slices"
	"strings"
	"sync"
	"time"
)

// Zone is an IANA time zone name, resolved through the tz database.
type Zone struct {
	*time.Location
}

// UnmarshalText resolves an IANA zone name such as "Europe/Vienna".
func (z *Zone) UnmarshalText(b []byte) error {
	name := string(b)
	if name == "" {
		z.Location = nil
		return nil
	}
	loc, err := loadZone(name)
	if err != nil {
		return &ZoneError{Name: name, Hint: ZoneHint(name)}
	}
	z.Location = loc
	return nil
}

// loadZone refuses "Local" (it would depend on the machine running
// heliocal) and names the tz database cannot hold.
func loadZone(name string) (*time.Location, error) {
	if name == "Local" || strings.ContainsAny(name, "\x00\\") || len(name) > 100 {
		return nil, fmt.Errorf("not an IANA zone name")
	}
	if loc, ok := zoneCache.Load(name); ok {
		return loc.(*time.Location), nil
	}
	loc, err := time.LoadLocation(name)
	if err != nil {
		return nil, err
	}
	zoneCache.Store(name, loc)
	return loc, nil
}

// zoneCache holds resolved zones (a *time.Location is immutable and safe to
// share); a fleet configuration names the same few zones many times. Only
// names the tz database knows are stored, so it stays small.
var zoneCache sync.Map

// MarshalText writes the zone's IANA name.
func (z Zone) MarshalText() ([]byte, error) {
	if z.Location == nil {
		return nil, nil
	}
	return []byte(z.Location.String()), nil
}

// Name returns the zone's IANA name, or "" when no zone is set.
func (z Zone) Name() string {
	if z.Location == nil {
		return ""
	}
	return z.Location.String()
}

// ZoneError reports a time zone name the tz database does not know.
type ZoneError struct {
	Name string // as written
	Hint string // a suggestion
}

func (e *ZoneError) Error() string {
	return fmt.Sprintf("unknown time zone %q (%s)", e.Name, e.Hint)
}

//go:generate go run gen_zonenames.go

//go:embed zonenames.txt
var zoneNamesText string

// zoneNames are the tz database's zone names, for suggestions, generated
// from the Go toolchain's tz data by gen_zonenames.go, read at first use.
var zoneNames = sync.OnceValue(func() []string {
	var names []string
	for _, line := range strings.Split(zoneNamesText, "\n") {
		line = strings.TrimSpace(line)
		if line != "" && !strings.HasPrefix(line, "#") {
			names = append(names, line)
		}
	}
	return names
})

// ZoneNames returns the time zone names heliocal knows, sorted (UTC first),
// for shell completion: the tz database of the Go toolchain heliocal was
// built with (see gen_zonenames.go).
func ZoneNames() []string { return slices.Clone(zoneNames()) }

// ZoneHint suggests the known zone nearest to a misspelt name: same name with
// other capitals, same city with another region, or the nearest by edit
// distance; without one (or for an empty name), two examples of IANA names.
// The configuration's errors and the ad-hoc feeds' give the same hint.
func ZoneHint(name string) string {
	const generic = `use an IANA name such as "Europe/Vienna" or "America/New_York"`
	n := strings.ReplaceAll(strings.TrimSpace(name), " ", "_")
	if n == "" {
		return generic
	}
	for _, z := range zoneNames() {
		if strings.EqualFold(z, n) {
			return didYouMean(z)
		}
	}
	city := n[strings.LastIndex(n, "/")+1:]
	for _, z := range zoneNames() {
		if strings.EqualFold(z[strings.LastIndex(z, "/")+1:], city) {
			return didYouMean(z)
		}
	}
	if near := closest(n, zoneNames()); near != "" {
		return didYouMean(near)
	}
	return generic
}
