package main

import (
	"context"
	"encoding/json"
	"io"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// A place needs both coordinates: a missing one is named, never taken as 0°.
func TestEventsCoordinatesRequired(t *testing.T) {
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"events", "--lat", "23.1", "--tz", "America/Havana"}, "--lon: missing"},
		{[]string{"events", "--lon", "-82.4", "--tz", "America/Havana"}, "--lat: missing"},
		{[]string{"events", "--tz", "America/Havana"}, "--lat and --lon"},
	} {
		code, out, errOut := runCLI(t, tc.args...)
		if code != exitInput || !strings.Contains(errOut, tc.want) || out != "" {
			t.Errorf("%v: exit %d, stderr %q, stdout %q; want exit 2 naming %q and no events", tc.args, code, errOut, out, tc.want)
		}
	}
}

// An --elev written with a thousands separator is told the number to write.
func TestEventsElevationGrouped(t *testing.T) {
	code, out, errOut := runCLI(t, "events", "--lat", "27.7", "--lon", "85.36", "--tz", "Asia/Kathmandu", "--elev", "1,340", "--kinds", "sunrise")
	if want := `--elev: "1,340": not a number (write the number without separators: 1340)`; code != exitInput || !strings.Contains(errOut, want) || out != "" {
		t.Errorf("exit %d, stderr %q, stdout %q; want exit 2 with %q", code, errOut, out, want)
	}
}

// A --lon counted east all the way round (183.44 for the Chatham Islands,
// 176.56°W) is told the longitude to write.
func TestEventsLongitudeCountedEast(t *testing.T) {
	code, out, errOut := runCLI(t, "events", "--lat", "-43.95", "--lon", "183.44", "--tz", "Pacific/Chatham", "--kinds", "sunrise")
	if want := "--lon: 183.44: must be within -180..180 (decimal degrees, east positive, west negative: write -176.56 (176.56°W) for 183.44° counted east)"; code != exitInput || !strings.Contains(errOut, want) || out != "" {
		t.Errorf("exit %d, stderr %q, stdout %q; want exit 2 with %q", code, errOut, out, want)
	}
}

// A --tz the tz database does not know, beside --lat and --lon, is told the
// zone in force at the place, as a site's timezone is: "+12:45" at the
// Chatham Islands is Pacific/Chatham (the tz database's zone1970.tab: NZ,
// -4357-17633), which keeps summer time too.
func TestEventsUnknownZoneNamesZoneAtPlace(t *testing.T) {
	for tz, want := range map[string]string{
		"+12:45": `--tz: unknown time zone "+12:45" (a UTC offset is not a time zone: the zone at the place's latitude and longitude is "Pacific/Chatham", which follows its clock changes)`,
		"Chatam": `--tz: unknown time zone "Chatam" (the zone at the place's latitude and longitude is "Pacific/Chatham"; or leave --tz out, and it is taken from them)`,
	} {
		code, out, errOut := runCLI(t, "events", "--lat", "-43.95", "--lon", "-176.56", "--tz", tz, "--kinds", "sunrise")
		if code != exitInput || !strings.Contains(errOut, want) || out != "" {
			t.Errorf("--tz %s: exit %d, stderr %q, stdout %q; want exit 2 with %q", tz, code, errOut, out, want)
		}
	}
}

// --elev, --horizon, --pressure and --temperature describe a place given by
// --lat and --lon; beside --site or --feed, whose site has its own in the
// configuration, each is refused naming the flag and its value, not ignored.
func TestEventsPlaceFlagsRefusedWithSite(t *testing.T) {
	day := []string{"--from", "2027-01-01", "--to", "2027-01-01"}
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"--site", "fernhollow", "--elev", "500"}, `--elev 500: only for a place given by --lat and --lon; --site "fernhollow" takes the site's elevation`},
		{[]string{"--site", "fernhollow", "--kinds", "sunrise", "--horizon", "0:2,90:8"}, `--horizon 0:2,90:8: only for a place given by --lat and --lon`},
		{[]string{"--feed", "fernhollow-sun", "--temperature", "-20"}, `--temperature -20: only for a place given by --lat and --lon; --feed "fernhollow-sun" takes its site's`},
		{[]string{"--feed", "fernhollow-sun", "--kinds", "sunrise", "--pressure", "990"}, `--pressure 990: only for`},
	} {
		code, out, errOut := runCLI(t, append(append([]string{"events"}, tc.args...), day...)...)
		if code != exitInput || !strings.Contains(errOut, tc.want) || out != "" {
			t.Errorf("%v: exit %d, stderr %q, stdout %q; want exit 2 with %q and no events", tc.args, code, errOut, out, tc.want)
		}
	}
	if code, out, errOut := runCLI(t, append([]string{"events", "--lat", "48.26", "--lon", "15.92", "--tz", "Europe/Vienna", "--elev", "500", "--kinds", "sunrise"}, day...)...); code != 0 || !strings.Contains(out, "500 m") {
		t.Errorf("--elev with --lat/--lon: exit %d, stderr %q, stdout %q", code, errOut, out)
	}
}

// Without --tz the zone in force at the place is used, and a note on stderr
// names it and the place, with its hemispheres, as the README shows it
// (zones: the tz database; nautical zones at sea, common practice).
func TestEventsZoneFromCoordinates(t *testing.T) {
	for _, tc := range []struct {
		lat, lon, zone, note, at string
	}{
		{"23.13", "-82.38", "America/Havana", "America/Havana (UTC−05:00, CST)", "23.1300° N, 82.3800° W"}, // Havana, winter time on 1 March
		{"-33.45", "-70.67", "America/Santiago", "America/Santiago (UTC−03:00)", "33.4500° S, 70.6700° W"}, // Santiago de Chile, summer time until April
		{"0", "-30", "Etc/GMT+2", "Etc/GMT+2 (UTC−02:00)", "0.0000° N, 30.0000° W"},                        // mid-Atlantic
	} {
		code, out, errOut := runCLI(t, "events", "--lat", tc.lat, "--lon", tc.lon, "--from", "2027-03-01", "--to", "2027-03-01",
			"--kinds", "sunrise", "--format", "json")
		if code != 0 {
			t.Fatalf("%s, %s: exit %d: %s", tc.lat, tc.lon, code, errOut)
		}
		var doc struct{ Site struct{ TimeZone string } }
		if err := json.Unmarshal([]byte(out), &doc); err != nil {
			t.Fatal(err)
		}
		if doc.Site.TimeZone != tc.zone {
			t.Errorf("%s, %s: timezone %q, want %q", tc.lat, tc.lon, doc.Site.TimeZone, tc.zone)
		}
		if want := "heliocal: no --tz given: using " + tc.note + ", the zone in force at " + tc.at + " (give --tz to choose another)\n"; errOut != want {
			t.Errorf("%s, %s: stderr %q, want %q", tc.lat, tc.lon, errOut, want)
		}
	}
	// the README quotes the Havana note as printed
	readme := strings.Join(strings.Fields(string(readmeBytes(t))), " ")
	if want := "(`no --tz given: using America/Havana (UTC−05:00, CST), the zone in force at 23.1300° N, 82.3800° W`)"; !strings.Contains(readme, want) {
		t.Errorf("README does not quote the note as %s", want)
	}
	// an explicit --tz wins and needs no note
	code, out, errOut := runCLI(t, "events", "--lat", "23.13", "--lon", "-82.38", "--tz", "UTC", "--from", "2027-03-01", "--to", "2027-03-01", "--kinds", "sunrise")
	if code != 0 || errOut != "" || !strings.Contains(out, "UTC") {
		t.Errorf("--tz UTC: exit %d, stderr %q\n%s", code, errOut, out)
	}
}

// check names the zone it chose for a site without timezone.
func TestCheckInferredZone(t *testing.T) {
	code, out, errOut := runCLI(t, "check", "--config", filepath.Join("..", "..", "testdata", "config", "missing-timezone.yaml"))
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	for _, w := range []string{"America/Havana (from the coordinates)", "site cane-field has no timezone: using America/Havana (UTC−0"} {
		if !strings.Contains(out, w) {
			t.Errorf("check output lacks %q:\n%s", w, out)
		}
	}
}

// events on a configured site without timezone names the zone it took in
// check's words, with the offset of the first date listed (CDT from 14 March
// 2027, second Sunday of March: Cuba's rule in the tz database).
func TestEventsNamesInferredZoneAsCheck(t *testing.T) {
	cfg := filepath.Join("..", "..", "testdata", "config", "missing-timezone.yaml")
	for _, args := range [][]string{{"--site", "cane-field"}, {"--feed", "cane-sun"}} {
		code, _, errOut := runCLI(t, append([]string{"--config", cfg, "events", "--from", "2027-06-01", "--to", "2027-06-01"}, args...)...)
		want := "heliocal: note: site cane-field has no timezone: using America/Havana (UTC−04:00, CDT), the zone in force at 22.9500° N, 82.3000° W; add timezone: to choose another\n"
		if code != 0 || errOut != want {
			t.Errorf("%v: exit %d, stderr %q, want %q", args, code, errOut, want)
		}
	}
}

// publish says which zone it took for a site without timezone.
func TestPublishNamesInferredZone(t *testing.T) {
	cfg := filepath.Join("..", "..", "testdata", "config", "missing-timezone.yaml")
	code, _, errOut := runCLI(t, "publish", "--config", cfg, "--out", t.TempDir())
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	if !strings.Contains(errOut, "site cane-field has no timezone: using America/Havana") {
		t.Errorf("publish does not name the zone it took:\n%s", errOut)
	}
}

// serve logs which zone it took for a site without timezone.
func TestServeLogsInferredZone(t *testing.T) {
	cfg := filepath.Join("..", "..", "testdata", "config", "missing-timezone.yaml")
	ctx, cancel := context.WithCancel(context.Background())
	logs := &lockedBuffer{}
	done := make(chan int, 1)
	go func() {
		done <- run(ctx, []string{"serve", "--config", cfg, "--listen", "127.0.0.1:0", "--access-log=false"}, io.Discard, logs, noEnv)
	}()
	for deadline := time.Now().Add(30 * time.Second); !strings.Contains(logs.String(), "msg=serving"); time.Sleep(20 * time.Millisecond) {
		if time.Now().After(deadline) {
			t.Fatalf("serve did not start:\n%s", logs.String())
		}
	}
	cancel()
	<-done
	if !strings.Contains(logs.String(), "site without timezone") || !strings.Contains(logs.String(), "zone=America/Havana") {
		t.Errorf("serve does not log the zone it took:\n%s", logs.String())
	}
}

// A photoperiod the day never reaches at the site is a check warning, and
// events says so once for the whole range (not once per computed chunk).
func TestPhotoperiodNeverReached(t *testing.T) {
	code, out, errOut := runCLI(t, "check", "--config", filepath.Join("..", "..", "testdata", "config", "photoperiod-never.yaml"))
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	if !strings.Contains(out+errOut, `warning: feed "nursery-lamps": photoperiod:14h: Day length never reaches 14 h here (longest 12 h 42 min,`) {
		t.Errorf("check says nothing of the unreached photoperiod:\n%s\n%s", out, errOut)
	}
	code, out, errOut = runCLI(t, "events", "--lat", "9.9", "--lon", "-84.1", "--tz", "America/Costa_Rica",
		"--from", "2027-01-01", "--to", "2028-12-31", "--kinds", "photoperiod:14h")
	if code != 0 {
		t.Fatalf("events: exit %d: %s", code, errOut)
	}
	if n := strings.Count(out, "Day length never reaches 14 h here"); n != 1 {
		t.Errorf("events says it %d times over two years:\n%s", n, out)
	}
}

// The table's heading says what its times are for besides the place: a
// horizon altitude, a skyline per direction, the air the refraction is
// scaled for (the pressure from the standard atmosphere at sea level when
// only the temperature is given: 1013 hPa, ICAO); nothing for a flat
// horizon and the standard refraction.
func TestEventsTableHeadingConditions(t *testing.T) {
	day := []string{"--lat", "48.2", "--lon", "16.4", "--tz", "Europe/Vienna", "--from", "2027-01-15", "--to", "2027-01-15", "--kinds", "sunrise"}
	for _, tc := range []struct {
		args []string
		want string
	}{
		{nil, "48.2000° N, 16.4000° E, 0 m, Europe/Vienna\n"},
		{[]string{"--horizon", "1.5"}, "48.2000° N, 16.4000° E, 0 m, horizon 1.5°, Europe/Vienna\n"},
		{[]string{"--horizon", "-0.5", "--temperature", "-20"}, "48.2000° N, 16.4000° E, 0 m, horizon −0.5°, refraction for 1013 hPa and −20 °C, Europe/Vienna\n"},
		{[]string{"--horizon", "0:2,90:8,180:1,270:4", "--pressure", "1030", "--temperature", "-20"}, "48.2000° N, 16.4000° E, 0 m, skyline 1–8° (4 points), refraction for 1030 hPa and −20 °C, Europe/Vienna\n"},
	} {
		code, out, errOut := runCLI(t, append(append([]string{"events"}, day...), tc.args...)...)
		if first, _, _ := strings.Cut(out, "\n"); code != 0 || first+"\n" != tc.want {
			t.Errorf("%v: exit %d, heading %q, want %q; stderr %s", tc.args, code, first, tc.want, errOut)
		}
	}
}

// A bad --kinds is the only message: it is found before the zone at the
// place is looked up and named in a note.
func TestEventsBadKindsBeforeZoneNote(t *testing.T) {
	code, out, errOut := runCLI(t, "events", "--lat", "23.13", "--lon", "-82.38", "--kinds", "sunrise,sunrize")
	if want := "heliocal: --kinds: unknown kind \"sunrize\" (did you mean \"sunrise\"?)\n"; code != exitInput || errOut != want || out != "" {
		t.Errorf("exit %d, stderr %q, stdout %q; want exit 2 and stderr %q alone", code, errOut, out, want)
	}
}
