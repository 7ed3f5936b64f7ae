package config

import (
	_ "embed"
	"fmt"
	"regexp"
	"slices"
	"strconv"
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

// ZoneHint suggests the known zone nearest to a misspelt name (nearZone);
// for a UTC offset, that it is no zone; without a suggestion (or for an
// empty name), two examples of IANA names. The configuration's errors and
// the ad-hoc feeds' give the same hint.
func ZoneHint(name string) string {
	if hint := offsetHint(strings.TrimSpace(name)); hint != "" {
		return hint
	}
	if near := nearZone(name); near != "" {
		return didYouMean(near)
	}
	return `use an IANA name such as "Europe/Vienna" or "America/New_York"`
}

// nearZone is the known zone a misspelt name likely means: the same name
// with other capitals, the same city with another region, or the nearest by
// edit distance; "" for none and for an empty name.
func nearZone(name string) string {
	n := strings.ReplaceAll(strings.TrimSpace(name), " ", "_")
	if n == "" {
		return ""
	}
	for _, z := range zoneNames() {
		if strings.EqualFold(z, n) {
			return z
		}
	}
	city := n[strings.LastIndex(n, "/")+1:]
	for _, z := range zoneNames() {
		if strings.EqualFold(z[strings.LastIndex(z, "/")+1:], city) {
			return z
		}
	}
	return closest(n, zoneNames())
}

// utcOffset is a UTC offset written as a zone: "+01:00", "UTC+1",
// "GMT-05:00", "-0330".
var utcOffset = sync.OnceValue(func() *regexp.Regexp {
	return regexp.MustCompile(`^(?i:UTC|GMT)?\s*([+-])([0-9]{1,2})(?::?([0-9]{2}))?$`)
})

// offsetHint says that name, a UTC offset, is no zone: a place's zone
// follows its clock changes, and a fixed offset of whole hours is the tz
// database's Etc/GMT zone of the opposite sign (its file etcetera: "Etc/GMT-1"
// is one hour ahead of UTC); "" for a name that is no offset.
func offsetHint(name string) string {
	m := utcOffset().FindStringSubmatch(name)
	if m == nil {
		return ""
	}
	hint := "a UTC offset is not a time zone: write the place's zone, such as \"Europe/Paris\", which follows its clock changes"
	h, _ := strconv.Atoi(m[2])
	if m[3] != "" && m[3] != "00" {
		return hint
	}
	sign := map[string]string{"+": "-", "-": "+"}[m[1]]
	if h == 0 {
		return hint + `; UTC itself is "UTC"`
	}
	etc := fmt.Sprintf("Etc/GMT%s%d", sign, h)
	if _, err := loadZone(etc); err == nil {
		hint += fmt.Sprintf("; a fixed offset of %s%d h is %q, its sign inverted as the tz database writes it", m[1], h, etc)
	}
	return hint
}
