package config

import (
	"errors"
	"os/exec"
	"strings"
	"testing"
	"time"
)

func TestZoneHint(t *testing.T) {
	tests := []struct{ in, want string }{
		{"europe/vienna", `did you mean "Europe/Vienna"?`},       // capitals
		{"Vienna", `did you mean "Europe/Vienna"?`},              // city alone
		{"Europe/Viena", `did you mean "Europe/Vienna"?`},        // misspelt
		{"America/New York", `did you mean "America/New_York"?`}, // space for underscore
		{"Pacific/Aukland", `did you mean "Pacific/Auckland"?`},
		{"Mars/Olympus_Mons", `use an IANA name such as "Europe/Vienna"`},
		// a UTC offset: the tz database's Etc/GMT zones have the sign of
		// POSIX TZ strings, "Etc/GMT-1" one hour ahead of UTC (IANA tz
		// database, file etcetera)
		{"+01:00", `a UTC offset is not a time zone: write the place's zone, such as "Europe/Paris", which follows its clock changes; a fixed offset of +1 h is "Etc/GMT-1", its sign inverted`},
		{"UTC-5", `a fixed offset of -5 h is "Etc/GMT+5"`},
		{"GMT+05:30", `a UTC offset is not a time zone`},
		{"+00:00", `UTC itself is "UTC"`},
	}
	for _, tc := range tests {
		var z Zone
		err := z.UnmarshalText([]byte(tc.in))
		var ze *ZoneError
		if !errors.As(err, &ze) {
			t.Errorf("%q: want a *ZoneError, got %v", tc.in, err)
			continue
		}
		if !strings.Contains(err.Error(), `"`+tc.in+`"`) || !strings.Contains(ze.Hint, tc.want) {
			t.Errorf("%q: %v; want hint %q", tc.in, err, tc.want)
		}
	}
	// Every suggestion list entry is a zone the tz database resolves.
	for _, name := range zoneNames() {
		if _, err := time.LoadLocation(name); err != nil {
			t.Errorf("zonenames.txt lists %q, which does not load: %v", name, err)
		}
	}
	var z Zone
	if err := z.UnmarshalText([]byte("Local")); err == nil {
		t.Error(`"Local" accepted: it would depend on the machine`)
	}
	if err := z.UnmarshalText([]byte("Asia/Kolkata")); err != nil || z.Name() != "Asia/Kolkata" {
		t.Errorf("Asia/Kolkata: %v %q", err, z.Name())
	}
	b, _ := z.MarshalText()
	if string(b) != "Asia/Kolkata" {
		t.Errorf("MarshalText = %q", b)
	}
}

// TestValidateBuiltInCode checks Validate on a configuration built in code,
// where kinds and zones did not pass through the parser.
func TestValidateBuiltInCode(t *testing.T) {
	c := &Config{
		Sites: []Site{{ID: "a", Latitude: 10, Longitude: 20}},
		Feeds: []Feed{{ID: "f", Site: "a", Kinds: []KindSpec{
			{Kind: Kind{Name: "sun-altitude", Altitude: 120}},
			{Kind: Kind{Name: "sunrize"}},
			{},
		}}},
	}
	c.ApplyDefaults()
	if c.Feeds[0].DaysBack != DefaultDaysBack || c.Feeds[0].DaysAhead != DefaultDaysAhead || c.Sites[0].Name != "a" || c.Service.Listen != DefaultListen {
		t.Errorf("ApplyDefaults: %+v", c)
	}
	err := c.Validate()
	ps := problemsOf(t, err)
	var paths []string
	for _, p := range ps {
		paths = append(paths, p.Path)
	}
	if c.Sites[0].TimeZone.Name() != "Africa/Ndjamena" || !c.Sites[0].ZoneInferred { // 10° N 20° E: Chad
		t.Errorf("ApplyDefaults: zone %q (inferred %v), want Africa/Ndjamena from the coordinates", c.Sites[0].TimeZone.Name(), c.Sites[0].ZoneInferred)
	}
	want := "feeds[0].kinds[0].kind feeds[0].kinds[1].kind feeds[0].kinds[2].kind"
	if got := strings.Join(paths, " "); got != want {
		t.Errorf("paths %q, want %q\n%v", got, want, err)
	}
}

// TestZoneNamesMatchToolchain: zonenames.txt is what gen_zonenames.go makes
// from the running Go toolchain's tz database (the data the heliocal binary
// embeds), so suggestions and completion offer exactly the zones it knows.
// After a Go upgrade, run `go generate ./config`.
func TestZoneNamesMatchToolchain(t *testing.T) {
	if testing.Short() {
		t.Skip("compiles and runs the generator")
	}
	goBin, err := exec.LookPath("go")
	if err != nil {
		t.Skip("no go command to run the generator")
	}
	out, err := exec.Command(goBin, "run", "gen_zonenames.go", "-o", "-").Output()
	if err != nil {
		t.Fatalf("go run gen_zonenames.go: %v", err)
	}
	if string(out) == zoneNamesText {
		return
	}
	want := strings.Split(string(out), "\n")
	got := strings.Split(zoneNamesText, "\n")
	for i := 0; i < max(len(want), len(got)); i++ {
		var w, g string
		if i < len(want) {
			w = want[i]
		}
		if i < len(got) {
			g = got[i]
		}
		if w != g {
			t.Fatalf("zonenames.txt differs from the toolchain's tz database at line %d:\n got %q\nwant %q\nrun `go generate ./config`", i+1, g, w)
		}
	}
}
