package config

import (
	"bytes"
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"reflect"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"
	_ "time/tzdata"
	"unicode/utf16" // the tests do not depend on the machine's zoneinfo
)

const testdata = "../testdata/config"

func loadTestdata(t *testing.T, name string) (*Config, error) {
	t.Helper()
	return Load(filepath.Join(testdata, name))
}

func problemsOf(t *testing.T, err error) []FieldError {
	t.Helper()
	var verr *ValidationError
	if !errors.As(err, &verr) {
		t.Fatalf("want a *ValidationError, got %T: %v", err, err)
	}
	return verr.Problems
}

// problemsByPath is each problem of err, a *ValidationError, by its path.
func problemsByPath(t *testing.T, err error) map[string]FieldError {
	t.Helper()
	m := map[string]FieldError{}
	for _, p := range problemsOf(t, err) {
		m[p.Path] = p
	}
	return m
}

// problemLines is each problem of err, a *ValidationError, as printed.
func problemLines(t *testing.T, err error) []string {
	t.Helper()
	var lines []string
	for _, p := range problemsOf(t, err) {
		lines = append(lines, p.Error())
	}
	return lines
}

// TestSkylineFromCSV reads a skyline from a CSV file (header and comments
// skipped), sorted by azimuth.
func TestSkylineFromCSV(t *testing.T) {
	c, err := loadTestdata(t, "good-skyline.yaml")
	if err != nil {
		t.Fatal(err)
	}
	s := c.Sites[0]
	if len(s.Skyline) != 7 || s.Skyline[0] != [2]float64{0, 3} || s.Skyline[6] != [2]float64{260, 15} || s.Horizon != 0 {
		t.Errorf("skyline %v, horizon %v", s.Skyline, s.Horizon)
	}
}

// TestSkylineFileRelativeToConfig: a relative skyline file name is read
// from the configuration file's directory, whatever the working directory;
// a missing one is a problem naming the field, the name and the path
// looked for; from standard input (no file) the working directory is used.
func TestSkylineFileRelativeToConfig(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "farm")
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	yaml := "sites:\n  - id: valley\n    latitude: 47\n    longitude: 11\n    timezone: Europe/Vienna\n    horizon: hills.csv\n" +
		"feeds:\n  - id: v\n    site: valley\n    kinds: [sunrise]\n"
	cfg := filepath.Join(dir, "heliocal.yaml")
	if err := os.WriteFile(cfg, []byte(yaml), 0o644); err != nil {
		t.Fatal(err)
	}
	t.Chdir(t.TempDir()) // elsewhere: no hills.csv here
	_, err := Load(cfg)
	ps := problemsOf(t, err)
	want := filepath.Join(dir, "hills.csv")
	if len(ps) != 1 || ps[0].Path != "sites[0].horizon" || ps[0].Value != "hills.csv" || !strings.Contains(ps[0].Msg, want) ||
		!strings.Contains(ps[0].Hint, "configuration file's directory") {
		t.Fatalf("missing file: %+v", ps)
	}
	if err := os.WriteFile(want, []byte("azimuth,altitude\n90,8\n270,2\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	c, err := Load(cfg)
	if err != nil {
		t.Fatal(err)
	}
	if s := c.Sites[0]; len(s.Skyline) != 2 || s.Skyline[0] != [2]float64{90, 8} || s.HorizonFile != want {
		t.Errorf("skyline %v from %q", s.Skyline, s.HorizonFile)
	}
	// standard input has no directory: the working directory
	if _, err := Parse(strings.NewReader(yaml), "yaml"); err == nil {
		t.Error("hills.csv found in the working directory, where it is not")
	}
	t.Chdir(dir)
	if _, err := Parse(strings.NewReader(yaml), "yaml"); err != nil {
		t.Errorf("from standard input in the file's directory: %v", err)
	}
}

// A skyline with several bad points, as a list or in a file, has every
// point reported, in the order written, and no "has no skyline" problem
// for the feed that needs it (the site has one, refused).
func TestSkylineEveryBadPoint(t *testing.T) {
	for _, tc := range []struct {
		file string
		want []string // each problem as printed, without the file name
	}{
		{"bad-skyline-points.yaml", []string{
			"sites[0].horizon[1]: [8, 90]: altitude must be within -5..45 degrees",
			"sites[0].horizon[2]: [90]: must be a pair [azimuth, altitude] of numbers",
			"sites[0].horizon[3]: [400, 2]: azimuth must be within 0..360",
			"sites[0].horizon[5]: [180, 4]: azimuth 180 given twice, also at sites[0].horizon[4]",
			"sites[0].horizon[6]: [270, 60]: altitude must be within -5..45 degrees",
		}},
		{"bad-skyline-file-points.yaml", []string{
			"sites[0].horizon: bad-skyline-points.csv: line 3: [120, 60]: altitude must be within -5..45 degrees",
			`sites[0].horizon: bad-skyline-points.csv: line 4: "ridge,high" is not two numbers`,
			"sites[0].horizon: bad-skyline-points.csv: line 6: [240, 5]: azimuth 240 given twice, also at line 5",
			"sites[0].horizon: bad-skyline-points.csv: line 7: 1 field, want azimuth,altitude",
			"sites[0].horizon: bad-skyline-points.csv: line 8: [400, 1]: azimuth must be within 0..360",
		}},
	} {
		t.Run(tc.file, func(t *testing.T) {
			_, err := loadTestdata(t, tc.file)
			if err == nil {
				t.Fatal("no error")
			}
			ps := problemsOf(t, err)
			if len(ps) != len(tc.want) {
				t.Errorf("%d problems, want %d:\n%v", len(ps), len(tc.want), err)
			}
			for i := range min(len(ps), len(tc.want)) {
				if got := ps[i].Path + ": " + ps[i].Value + ": " + ps[i].Msg; !strings.HasPrefix(got, tc.want[i]) {
					t.Errorf("problem %d: %q, want %q", i, got, tc.want[i])
				}
			}
			if strings.Contains(err.Error(), "no skyline") {
				t.Errorf("a refused skyline is reported missing too:\n%v", err)
			}
		})
	}
}

// A port alone where host:port belongs gets one hint, in the same words,
// whether listen holds it as a number or as text: the port after a colon,
// or, for a number that is no port, the ports there are (0..65535: TCP
// ports are 16 bits, RFC 9293, section 3.1).
func TestListenPortHintOnce(t *testing.T) {
	hint := func(listen string) string {
		t.Helper()
		in := "service:\n  listen: " + listen + "\nsites:\n  - {id: x, latitude: 1, longitude: 2, timezone: UTC}\nfeeds:\n  - {id: f, site: x, kinds: [sunrise]}\n"
		_, err := Parse(strings.NewReader(in), "yaml")
		var ve *ValidationError
		if !errors.As(err, &ve) || len(ve.Problems) != 1 {
			t.Fatalf("listen: %s: %v, want one problem", listen, err)
		}
		return ve.Problems[0].Hint
	}
	for port, want := range map[string]string{
		"8080":  `a port alone comes after a colon: write it ":8080"`,
		"0":     `a port alone comes after a colon: write it ":0"`,
		"70000": `a port is 0..65535, written after a colon, e.g. ":8080"`,
		"-1":    `a port is 0..65535, written after a colon, e.g. ":8080"`,
	} {
		if number, text := hint(port), hint(strconv.Quote(port)); number != want || text != want {
			t.Errorf("listen: %s: %q, and in quotes %q; want both %q", port, number, text, want)
		}
	}
}

// TestValidationErrors checks one file per problem: the error names the
// field path and the offending value, and says what is wrong.
func TestValidationErrors(t *testing.T) {
	tests := []struct {
		file  string
		path  string // FieldError.Path
		value string // FieldError.Value
		msg   string // substring of FieldError.Msg
		hint  string // substring of FieldError.Hint, "" = not checked
		n     int    // expected number of problems; 0 means 1
	}{
		{"bad-latitude.yaml", "sites[0].latitude", "95", "must be within -90..90", "", 0},
		{"bad-latitude-quoted.yaml", "sites[0].latitude", `"95"`, "must be a number, not text", "without quotes", 0},
		{"bad-latitude-text.yaml", "sites[0].latitude", `"abc"`, "must be a number", "", 0},
		{"bad-longitude.yaml", "sites[0].longitude", "-181.5", "must be within -180..180", "east positive", 0},
		{"bad-longitude-east.yaml", "sites[0].longitude", "183.44", "must be within -180..180", "write -176.56 (176.56°W) for 183.44° counted east", 0},
		{"bad-elevation.yaml", "sites[0].elevation", "12000", "must be within -500..9000 metres", "not feet: write 3658 for 12000 ft", 0}, // 12000 × 0.3048 m = 3657.6 m (the international foot, 0.3048 m exactly: NIST SP 811, appendix B)
		{"bad-horizon.yaml", "sites[0].horizon", "60", "must be within -5..45 degrees", "the altitude of the visible skyline in degrees: 0 for a flat horizon, 2 behind low hills", 0},
		{"band-wrong-kind.yaml", "feeds[0].kinds[0].low", "10", "applies only to golden-hour and blue-hour", "sun-band:10..30", 0},
		{"bad-band-empty.yaml", "feeds[0].kinds[0].low", "7", "the band 7..6 is empty", "-4..6", 0},
		{"bad-sun-band.yaml", "feeds[0].kinds[0]", "sun-band:30..10", "low altitude must be below the high one", `did you mean "sun-band:10..30"?`, 0},
		{"bad-skyline-point.yaml", "sites[0].horizon[1]", "[8, 90]", "altitude must be within -5..45 degrees", "azimuth comes first", 0},
		{"bad-skyline-shape.yaml", "sites[0].horizon[1]", "[90]", "must be a pair [azimuth, altitude]", "horizon: [[0, 2.5]", 0},
		{"bad-skyline-file.yaml", "sites[0].horizon", "no-such-skyline.csv", "no such skyline file", "azimuth,altitude", 0},
		{"bad-horizon-degrees.yaml", "sites[0].horizon", "2°", "no such skyline file", "for one altitude, write the number alone: horizon: 2", 0},
		{"bad-skyline-file-point.yaml", "sites[0].horizon", "bad-skyline-point.csv", "line 5: [120, 60]: altitude must be within -5..45 degrees", "azimuth comes first", 0},
		{"sun-hidden-no-skyline.yaml", "feeds[0].kinds[1]", "sun-hidden", `site "valley" has no skyline`, "horizon: [[0, 2]", 0},
		{"bad-pressure.yaml", "sites[0].pressure_hpa", "29.9", "must be within 300..1100 hPa", "not reduced to sea level", 0},
		{"bad-temperature.yaml", "sites[0].temperature_c", "95", "must be within -90..60 °C", "not Fahrenheit: write 35 for 95 °F", 0},                // (95 − 32) × 5/9 = 35 (°C from °F: NIST SP 811, appendix B)
		{"bad-temperature-fahrenheit.yaml", "sites[0].temperature_c", `"68F"`, "must be a number, not text", "not Fahrenheit: write 20 for 68 °F", 0}, // (68 − 32) × 5/9 = 20 (°C from °F: NIST SP 811, appendix B)
		{"bad-pressure-text.yaml", "sites[0].pressure_hpa", `"1013 hPa"`, "must be a number", "without the unit: 1013", 0},
		{"bad-elevation-unit.yaml", "sites[0].elevation", `"420 m"`, "must be a number, not text", "without the unit: 420", 0},
		{"bad-latitude-dms.yaml", "sites[0].latitude", `"47°30′N"`, "must be a number, not text", "write 47.5: decimal degrees, north positive, south negative", 0},
		{"bad-timezone.yaml", "sites[0].timezone", "Europe/Zurik", "unknown time zone", `"Europe/Zurich"`, 0},
		{"missing-latitude.yaml", "sites[0].latitude", "", "is required", "degrees", 0},
		// written without a value: missing, not 0°
		{"null-coordinates.yaml", "sites[0].latitude", "", "is required", "degrees", 2},
		{"null-coordinates.yaml", "sites[0].longitude", "", "is required", "degrees", 2},
		{"null-latitude.json", "sites[0].latitude", "", "is required", "degrees", 0},
		{"bad-timezone-number.yaml", "sites[0].timezone", "2", "must be a time zone name, not a number", `"Europe/Vienna"`, 0},
		{"bad-kind-number.yaml", "feeds[0].kinds[1]", "5", `must be a kind name or a mapping with a "kind" key, not a number`, "kind: sunrise", 0},
		{"bad-days-huge.yaml", "feeds[0].days_ahead", "1e+20", "is far too large", "", 0},
		{"bad-kind-empty.yaml", "feeds[0].kinds[0].kind", `""`, "is empty: name a kind", "known kinds: sunrise, sunset", 0},
		{"bad-plan-date-words.yaml", "feeds[0].plans[0].date", "every blue moon", `"every" takes one word, a weekday, "day" or a date MM-DD, not "blue moon"`, `"every friday"`, 0},
		{"unknown-kind.yaml", "feeds[0].kinds[0]", "sunrize", "unknown kind", `did you mean "sunrise"?`, 0},
		// "- sunrise:" is a mapping of one key: one problem, at the entry,
		// not "kind: is required" and "sunrise: unknown key"
		{"bad-kind-colon.yaml", "feeds[0].kinds[0]", `"sunrise:"`, "a kind with a colon after it is a mapping without a kind: key", "write - sunrise, without the colon", 0},
		// typographic quotes are part of the text: the value without them,
		// in straight quotes (YAML takes it without quotes too)
		{"bad-typographic-quotes.yaml", "sites[0].timezone", "“Europe/Zurich”", "unknown time zone", `the quotes “ ” are typographic, part of the text: write "Europe/Zurich", in straight quotes, or without quotes`, 2},
		{"bad-typographic-quotes.yaml", "feeds[0].kinds[1]", "“sunset”", "unknown kind", `the quotes “ ” are typographic, part of the text: write "sunset", in straight quotes, or without quotes`, 2},
		{"bad-typographic-quotes.json", "feeds[0].kinds[1]", "„sunset“", "unknown kind", `the quotes „ “ are typographic, part of the text: write "sunset", in straight quotes`, 0},
		{"unknown-kind-mapping.yaml", "feeds[0].kinds[1].kind", "moonrize", "unknown kind", `"moonrise"`, 0},
		{"duplicate-site-id.yaml", "sites[1].id", "north-field", "duplicate site id, also that of sites[0]", "", 0},
		{"duplicate-feed-id.yaml", "feeds[1].id", "north-sun", "duplicate feed id, also that of feeds[0]", "", 0},
		{"bad-site-id.yaml", "sites[0].id", "North Field", "must match [a-z0-9][a-z0-9-]*", `"north-field"`, 0},
		// the id suggested is one no other feed has, nor is told to take:
		// following the hint gives no duplicate id
		{"bad-feed-id-taken.yaml", "feeds[0].id", "North-Sun", "must match [a-z0-9][a-z0-9-]*", `ids become file names and URLs, and "north-sun" is the id of feeds[1]: e.g. "north-sun-2"`, 3},
		{"bad-feed-id-taken.yaml", "feeds[2].id", "north moon", "must match [a-z0-9][a-z0-9-]*", `ids become file names and URLs; e.g. "north-moon"`, 3},
		{"bad-feed-id-taken.yaml", "feeds[3].id", "north moon", "must match [a-z0-9][a-z0-9-]*", `ids become file names and URLs, and "north-moon" is the one suggested for feeds[2]: e.g. "north-moon-2"`, 3},
		{"bad-feed-id.yaml", "feeds[0].id", "north_sun", "must match [a-z0-9][a-z0-9-]*", `"north-sun"`, 0},
		// nul.ics is the device NUL on Windows
		{"bad-feed-id-device.yaml", "feeds[0].id", "nul", "is a device name on Windows, with any extension: nul.ics cannot be created there, nor synced to a Windows computer", `e.g. "nul-feed"`, 0},
		{"missing-site.yaml", "feeds[0].site", "north-feild", "no site has this id", `did you mean "north-field"?`, 0},
		{"feed-site-name.yaml", "feeds[0].site", "Kereru Ridge Deer Club", "no site has this id", `that is the name of the site "kereru-ridge": a feed names its site by id`, 0},
		{"no-sites.yaml", "sites", "", "no sites", "", 2},
		{"no-kinds.yaml", "feeds[0].kinds", "", "no kinds", "", 0},
		{"window-too-long.yaml", "feeds[0].days_ahead", "4000", "window of 4030 days (days_back 30 + days_ahead 4000) is over 10 years", "", 0},
		{"negative-days.yaml", "feeds[0].days_back", "-1", "must not be negative", "", 0},
		{"bad-sun-altitude.yaml", "feeds[0].kinds[0]", "sun-altitude:95", "altitude must be above -90 and below 90", "", 0},
		{"bad-sun-altitude-text.yaml", "feeds[0].kinds[0]", "sun-altitude:low", "malformed altitude", "", 0},
		{"bad-photoperiod.yaml", "feeds[0].kinds[0]", "photoperiod:25h", "longer than 0 and shorter than 24h", "", 0},
		{"bad-photoperiod-unit.yaml", "feeds[0].kinds[0]", "photoperiod:12", "malformed day length", "14h30m", 0},
		{"bad-offset.yaml", "feeds[0].kinds[0].offset", "13h", "must be within -12h..12h", "", 0},
		{"bad-offset-unit.yaml", "feeds[0].kinds[0].offset", "30", "a duration needs a unit", `"30m"`, 0},
		{"malformed-offset.yaml", "feeds[0].kinds[0].offset", "-30 min", "malformed duration", `the units are h, m and s: write "-30m" for -30 min`, 0},
		{"bad-alarm-clock.yaml", "feeds[0].alarm", "1:30", "malformed duration", `the units are h, m and s: write "1h30m" for 1:30`, 0},
		{"offset-all-day.yaml", "feeds[0].kinds[0].offset", "1h", "has no meaning for daily-summary", "", 0},
		{"bad-alarm-negative.yaml", "feeds[0].alarm", "-5m", "must not be negative", "", 0},
		{"bad-alarm-long.yaml", "feeds[0].alarm", "200h", "must be at most 7 days", "", 0},
		{"bad-alarm-bool.yaml", "feeds[0].kinds[0].alarm", "false", "must be a duration such as \"30m\", not true/false", `write "0s" for none`, 0},
		{"bad-band-word.yaml", "feeds[0].kinds[0].high", `"high"`, "must be a number, not text", "the Sun's altitude in degrees, e.g. 6", 0},
		{"bad-max-illumination.yaml", "feeds[0].kinds[0].max_illumination", "1.5", "must be within 0..1", "", 0},
		{"bad-max-illumination-percent.yaml", "feeds[0].kinds[0].max_illumination", `"25%"`, "must be a number, not text", "0.25 for 25 %", 0},
		{"max-illumination-wrong-kind.yaml", "feeds[0].kinds[0].max_illumination", "0.5", "applies only to dark-window", "", 0},
		{"bad-color.yaml", "feeds[0].color", "goldenrood", "not a CSS3 colour name", `did you mean "goldenrod"?`, 0},
		// a value that begins with # is a comment in YAML: the key is
		// empty, which is said rather than a feed without its colour
		{"bad-value-comment.yaml", "feeds[0].color", "", `is empty: "#ff8800" after it is a comment in YAML`, `color takes a CSS3 colour name, not a colour code: the nearest to #ff8800 is "darkorange" (#ff8c00)`, 2},
		{"bad-value-comment.yaml", "sites[0].name", "", `is empty: "#1 field" after it is a comment in YAML`, `write it in quotes: name: "#1 field"`, 2},
		{"bad-refresh.yaml", "service.refresh", "15 3 * *", "must have 5 fields, has 4", "minute hour", 0},
		{"bad-refresh-field.yaml", "service.refresh", "61 3 * * *", "malformed cron expression", "", 0},
		{"refresh-never.yaml", "service.refresh", "0 0 30 2 *", "never fires: no date matches it", `"15 3 * * *"`, 0},
		{"refresh-often.yaml", "service.refresh", "@every 1ns", "fires every 1s, more often than once a minute", `"@every 6h"`, 0},
		{"refresh-often-seconds.yaml", "service.refresh", "@every 30s", "fires every 30s, more often than once a minute", "", 0},
		{"bad-refresh-zone.yaml", "service.refresh_zone", "Europe/Viena", "unknown time zone", `"Europe/Vienna"`, 0},
		{"bad-base-url.yaml", "service.base_url", "sky.example.org/calendars", "must be an absolute http or https URL", "", 0},
		{"bad-base-url-scheme.yaml", "service.base_url", "ftp://sky.example.org/calendars", "must be an absolute http or https URL", "", 0},
		{"bad-listen.yaml", "service.listen", "8080", "must be host:port", `a port alone comes after a colon: write it ":8080"`, 0},
		{"bad-listen-number.yaml", "service.listen", "8080", "must be text, not a number", `a port alone comes after a colon: write it ":8080"`, 0},
		// TCP ports are 16 bits, 0..65535 (RFC 9293, section 3.1): "70000" in quotes is no port either
		{"bad-listen-port-range.yaml", "service.listen", "70000", "must be text, not a number", `a port is 0..65535`, 0},
		{"bad-max-feed-bytes.yaml", "service.max_feed_bytes", "-1", "must not be negative", "", 0},
		{"bad-max-feed-bytes-unit.yaml", "service.max_feed_bytes", `"1MB"`, "must be a whole number, not text", "write the number of bytes: 1000000", 0},
		{"bad-oversize.yaml", "service.oversize", "shrink", "must be warn, trim or fail", "", 0},
		{"unknown-key.yaml", "sites[0].lattitude", "lattitude", "unknown key", `did you mean "latitude"?`, 0},
		{"unknown-top-key.yaml", "feed", "feed", "unknown key", `did you mean "feeds"?`, 0},
		// a key of another place is said to be one
		// another word for a key where that key is written: the key
		{"key-words.yaml", "feeds[0].name", "name", "unknown key", `did you mean "title"?`, 2},
		{"key-words.yaml", "feeds[0].plans[0].time", "time", "unknown key", `did you mean "start"?`, 2},
		{"misplaced-key.yaml", "feeds[0].timezone", "timezone", "unknown key", "timezone is a key of a site; known keys here: id, title,", 0},
		{"misplaced-alarm.yaml", "sites[0].alarm", "alarm", "unknown key", "alarm is a key of a feed, a kinds entry ({kind: …}) or a plan; known keys here: id, name,", 0},
		{"bad-bool.yaml", "feeds[0].utc", `"yes"`, "must be true or false", "write true, without quotes", 0},
		// yes written without quotes is text to YAML 1.2: no quotes to remove
		{"bad-bool-plain.yaml", "feeds[0].utc", `"yes"`, "must be true or false", "write true", 0},
		{"bad-days-fraction.yaml", "feeds[0].days_ahead", "36.5", "must be a whole number", "write 36 or 37", 0},
		{"duplicate-kind.yaml", "feeds[0].kinds[1]", "june-solstice", `"june-solstice" listed twice, also in "seasons" at feeds[0].kinds[0]`, "", 0},
		{"duplicate-golden-hour.yaml", "feeds[0].kinds[1]", "golden-hour", `"golden-hour" listed twice, also as feeds[0].kinds[0]`, `"sun-band:-4..8"`, 0},
		{"bad-title-control.yaml", "feeds[0].title", "North\rSun", "control character", "", 0},
		{"bad-sites-shape.yaml", "sites", "3", "must be a list, not a number", "", 0},
		{"bad-site-entry.yaml", "sites[1]", "south-field", "must be a mapping of keys, not text", "", 0},
		// a list written as one mapping is said so, how the format writes a
		// list, and alone: its feeds' site is not said missing as well
		{"bad-sites-table.toml", "sites", "", "must be a list, not a mapping", "in TOML each entry of the list begins with [[sites]], in two brackets", 0},
		{"bad-sites-mapping.yaml", "sites", "", "must be a list, not a mapping", `each entry of the list begins with "- "`, 0},
		{"bad-kinds-shape.yaml", "feeds[0].kinds", "sunrise", "must be a list, not text", `write it ["sunrise"]`, 0},
		// one value where a list belongs: the value as written (a date, not
		// a date and time) and the list of one to write
		{"bad-dates-one.yaml", "feeds[0].kinds[0].dates", "2027-06-12", "must be a list, not a date", `write it ["2027-06-12"]`, 0},
		{"bad-weekdays-one.yaml", "feeds[0].kinds[0].weekdays", "fri", "must be a list, not text", `write it ["fri"]`, 0},
		// text with commas is a list written without its brackets: its items
		{"bad-kinds-commas.yaml", "feeds[0].kinds", "sunrise, sunset,", "must be a list, not text", `write it ["sunrise", "sunset"]`, 0},
		// kinds on lines of their own without dashes are one text to YAML:
		// its words, when each is a kind, else the text as one item, whose
		// own error then suggests "golden-hour"
		{"bad-kinds-dashless.yaml", "feeds[0].kinds", "sunrise sunset", "must be a list, not text", `write it ["sunrise", "sunset"]`, 2},
		{"bad-kinds-dashless.yaml", "feeds[1].kinds", "golden hour", "must be a list, not text", `write it ["golden hour"]`, 2},
		{"bad-weekdays-spaces.yaml", "feeds[0].kinds[0].weekdays", "sat sun", "must be a list, not text", `write it ["sat", "sun"]`, 0},
		// a number there: the list of the month's name (6 is June in the
		// Gregorian calendar's numbering, ISO 8601), as ["6"] is no month;
		// a weekday's number has no one numbering, so the names are shown
		{"bad-months-one.yaml", "feeds[0].kinds[0].months", "6", "must be a list, not a number", `write it ["jun"]`, 2},
		{"bad-months-one.yaml", "feeds[0].kinds[1].weekdays", "5", "must be a list, not a number", `write a list of the days' names, e.g. ["sat", "sun"]`, 2},
		{"bad-types.toml", "sites[0].latitude", `"95"`, "must be a number, not text", "", 2},
		{"bad-types.json", "feeds[0].kinds[0].offset", "30", "a duration needs a unit", "", 3},
		{"bad-types.json", "feeds[0].days_ahead", "10.5", "must be a whole number", "", 3},
		{"bad-lamps.yaml", "feeds[0].kinds[0].lamps", "night", "must be evening, morning or both", "", 0},
		{"bad-natural.yaml", "feeds[0].kinds[0].natural", "nautical", "must be sunrise-sunset or civil", "what counts as natural light", 0},
		// a value written with a capital or misspelt gets the one it likely means
		{"bad-natural-twilight.yaml", "feeds[0].kinds[0].natural", "civil-twilight", "must be sunrise-sunset or civil", `did you mean "civil"?`, 0},
		{"bad-natural-case.yaml", "feeds[0].kinds[0].natural", "Civil", "must be sunrise-sunset or civil", `did you mean "civil"?`, 0},
		{"bad-lamps-typo.yaml", "feeds[0].kinds[0].lamps", "bothe", "must be evening, morning or both", `did you mean "both"?`, 0},
		{"bad-oversize-case.yaml", "service.oversize", "Trim", "must be warn, trim or fail", `did you mean "trim"?`, 0},
		{"bad-latest-off.yaml", "feeds[0].kinds[0].latest_off", "25:00", "not a clock time", "HH:MM", 0},
		{"bad-latest-off-number.yaml", "feeds[0].kinds[0].latest_off", "2300", "must be text, not a number", `write it "23:00"`, 0},
		{"bad-latest-off-hour.yaml", "feeds[0].kinds[0].latest_off", "23", "must be text, not a number", `write it "23:00"`, 0}, // not "00:23"
		{"bad-plan-start-number.yaml", "feeds[0].plans[0].start", "2000", "must be text, not a number", `write it "20:00"`, 0},
		// the start is written, though unreadable: its length is no problem of its own
		{"bad-plan-start-number-for.yaml", "feeds[0].plans[0].start", "2000", "must be text, not a number", `write it "20:00"`, 0},
		{"bad-earliest-on.yaml", "feeds[0].kinds[0].earliest_on", "5am", "not a clock time", `the clock has 24 hours: write it "05:00"`, 0},
		{"lamps-wrong-kind.yaml", "feeds[0].kinds[0].lamps", "evening", "applies only to lighting", "", 0},
		// on a photoperiod kind, the lighting kind of its day length, not another's
		{"lamps-photoperiod.yaml", "feeds[0].kinds[0].lamps", "morning", "applies only to lighting", `remove it, or use kind: "lighting:14h"`, 2},
		{"lamps-photoperiod.yaml", "feeds[0].kinds[0].earliest_on", "05:00", "applies only to lighting", `remove it, or use kind: "lighting:14h"`, 2},
		{"bad-lighting.yaml", "feeds[0].kinds[0]", "lighting:26h", "shorter than 24h", "lighting:12h", 0},
		// a kind's parameter written as a key beside it: the kind to write,
		// in the file's format, not the list of the entry's keys
		{"bad-lighting-target.yaml", "feeds[0].kinds[0].target", "target", "unknown key", "a lighting entry takes its day length in the kind: write kind: lighting:16h and leave target out", 2},
		{"bad-altitude-key.toml", "feeds[0].kinds[0].altitude", "altitude", "unknown key", `a sun-altitude entry takes its altitude in the kind: write kind = "sun-altitude:-3.5" and leave altitude out`, 2},
		{"lighting-offset.yaml", "feeds[0].kinds[0].offset", "30m", "has no meaning for lighting", "latest_off", 0},
		{"bad-min-duration.yaml", "feeds[0].kinds[0].min_duration", "-5m", "must be within 0..24h", "", 0},
		{"min-duration-wrong-kind.yaml", "feeds[0].kinds[0].min_duration", "30m", "has no meaning for sunrise", "dark-window", 0},
		{"bad-weekday.yaml", "feeds[0].kinds[0].weekdays[1]", "satday", "not a day of the week", "sat", 0},
		{"bad-month.yaml", "feeds[0].kinds[0].months[1]", "fbr", "not a month", "feb", 0},
		// months and weekdays are names: a number gets the name to write
		{"bad-month-number.yaml", "feeds[0].kinds[0].months[0]", "6", "must be text, not a number", `write the month's name: "jun"`, 2},
		{"bad-month-number.yaml", "feeds[0].kinds[0].months[1]", "8", "not a month", `write the month's name: "aug"`, 2},
		{"bad-weekday-number.yaml", "feeds[0].kinds[0].weekdays[0]", "1", "must be text, not a number", "write the day's name: mon", 0},
		// a misspelt full name gets the full name it is nearest to
		{"bad-weekday-full.yaml", "feeds[0].kinds[0].weekdays[1]", "wednesdy", "not a day of the week", `did you mean "wednesday"?`, 0},
		{"bad-month-full.yaml", "feeds[0].plans[0].months[1]", "febuary", "not a month", `did you mean "february"?`, 0},
		{"bad-kind-alarm.yaml", "feeds[0].kinds[0].alarm", "-10m", "must not be negative", `"0s" for no reminder`, 0},
		{"bad-plan-date.yaml", "feeds[0].plans[0].date", "every fortnight", "is not a weekday", "every friday", 0},
		{"bad-plan-date-day.yaml", "feeds[0].plans[0].date", "every 02-30", `"02-30" is not a date of the year`, "every 02-29", 0},
		{"plan-date-daily-kind.yaml", "feeds[0].plans[0].date", "saturday nearest sunset", "happens every day", "full-moon", 0},
		{"bad-plan-start.yaml", "feeds[0].plans[0].start", "sunsett+30m", `unknown kind "sunsett"`, `did you mean "sunset+30m"?`, 0},
		{"bad-plan-end.yaml", "feeds[0].plans[0].end", "24:30", "not a clock time", "HH:MM", 0},
		{"plan-end-without-start.yaml", "feeds[0].plans[0].end", "23:00", "needs a start", "", 0},
		{"plan-end-and-for.yaml", "feeds[0].plans[0].for", "3h", "either end or for", "", 0},
		// an end before 12:00 is on the next day; one after noon that is not after the start never comes
		{"plan-end-never.yaml", "feeds[0].plans[1].end", "18:00", `is not after the start "20:00" and not before 12:00`, `one before 12:00 for an end past midnight ("01:00"), or a length: for: 2h`, 0},
		{"plan-no-title.yaml", "feeds[0].plans[0].title", "", "is required", "", 0},
		{"bad-plan-month.yaml", "feeds[0].plans[0].months[0]", "juli", "not a month", `did you mean "jul"?`, 0},
		{"bad-weekday-twice.yaml", "feeds[0].kinds[0].weekdays[2]", "Saturday", "listed twice, also as feeds[0].kinds[0].weekdays[0]", "remove one", 0},
		{"bad-plan-month-twice.yaml", "feeds[0].plans[0].months[2]", "jul", "listed twice, also as feeds[0].plans[0].months[0]", "remove one", 0},
		{"bad-plan-alarm.yaml", "feeds[0].plans[0].alarm", "200h", "must be at most 7 days", "", 0},
		{"bad-plan-alarm-days.yaml", "feeds[0].plans[0].alarm", "1d", "malformed duration", `the units are h, m and s: write "24h" for 1d`, 0},
	}
	for _, tc := range tests {
		t.Run(strings.TrimSuffix(tc.file, filepath.Ext(tc.file))+"/"+tc.path, func(t *testing.T) {
			c, err := loadTestdata(t, tc.file)
			if err == nil {
				t.Fatalf("no error; config: %+v", c)
			}
			ps := problemsOf(t, err)
			want := tc.n
			if want == 0 {
				want = 1
			}
			if len(ps) != want {
				t.Errorf("%d problems, want %d:\n%v", len(ps), want, err)
			}
			var got *FieldError
			for i := range ps {
				if ps[i].Path == tc.path {
					got = &ps[i]
					break
				}
			}
			if got == nil {
				t.Fatalf("no problem at %s:\n%v", tc.path, err)
			}
			if got.Value != tc.value {
				t.Errorf("value %q, want %q", got.Value, tc.value)
			}
			if !strings.Contains(got.Msg, tc.msg) {
				t.Errorf("message %q does not contain %q", got.Msg, tc.msg)
			}
			if tc.hint != "" && !strings.Contains(got.Hint, tc.hint) {
				t.Errorf("hint %q does not contain %q", got.Hint, tc.hint)
			}
			// The printed error names the file, the line, the path and the
			// value; a value written is on the line named.
			line := got.Error()
			text := err.Error()
			at := filepath.Join(testdata, tc.file) + ": "
			if got.Line > 0 {
				at = fmt.Sprintf("%s:%d: ", filepath.Join(testdata, tc.file), got.Line)
			}
			if !strings.Contains(text, at+line) {
				t.Errorf("error text lacks the line %q:\n%s", at+line, text)
			}
			if tc.value != "" {
				raw, err := os.ReadFile(filepath.Join(testdata, tc.file))
				if err != nil {
					t.Fatal(err)
				}
				l, _ := lineAt(raw, got.Line)
				key := tc.path[strings.LastIndexAny(tc.path, ".[")+1:]
				if !bytes.Contains(l, []byte(strings.Trim(tc.value, `"`))) && !bytes.Contains(l, []byte(key)) {
					t.Errorf("line %d, %q, holds neither the value %s nor the key %s", got.Line, l, tc.value, key)
				}
			}
			if !strings.HasPrefix(line, tc.path+": ") {
				t.Errorf("line %q does not start with the path", line)
			}
			if tc.value != "" && !strings.Contains(line, quoteValue(tc.value)) {
				t.Errorf("line %q does not show the value %q", line, tc.value)
			}
		})
	}
}

// TestEveryProblemAtOnce checks that decoding problems (unknown zone and
// kind, text for a number) and validation problems (ranges, duplicates,
// references) of one file are all reported together.
func TestEveryProblemAtOnce(t *testing.T) {
	_, err := loadTestdata(t, "every-problem.yaml")
	ps := problemsOf(t, err)
	want := []string{
		"service.listen",
		"service.refresh",
		"sites[0].latitude",
		"sites[0].timezone",
		"sites[1].longitude",
		"feeds[0].kinds[0]",
		"feeds[0].color",
		"feeds[1].id",
		"feeds[1].site",
	}
	var got []string
	for _, p := range ps {
		got = append(got, p.Path)
	}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("paths\n got %q\nwant %q\nerror:\n%v", got, want, err)
	}
	if n := strings.Count(err.Error(), "\n") + 1; n != len(want) {
		t.Errorf("%d lines, want one per problem (%d):\n%v", n, len(want), err)
	}
}

func TestGoodMinimalAndDefaults(t *testing.T) {
	c, err := loadTestdata(t, "good-minimal.yaml")
	if err != nil {
		t.Fatal(err)
	}
	s := c.Service
	if s.Listen != ":8080" || s.OutDir != "public" || s.Refresh != "15 3 * * *" || s.MaxFeedBytes != 1000000 || s.RefreshZone.Location != nil {
		t.Errorf("service defaults: %+v", s)
	}
	f := c.Feeds[0]
	if f.DaysBack != 30 || f.DaysAhead != 365 || f.Title != "north-sun" || f.Alarm != 0 || f.UTC {
		t.Errorf("feed defaults: %+v", f)
	}
	if c.Sites[0].Name != "North Field" || c.Sites[0].TimeZone.Name() != "Europe/Zurich" {
		t.Errorf("site: %+v", c.Sites[0])
	}
	want := []KindSpec{{Kind: Kind{Name: "sunrise"}}, {Kind: Kind{Name: "sunset"}}}
	if !reflect.DeepEqual(f.Kinds, want) {
		t.Errorf("kinds %+v, want %+v", f.Kinds, want)
	}
}

// TestWindowOverflow checks that huge day counts cannot wrap around the
// ten-year limit.
func TestWindowOverflow(t *testing.T) {
	_, err := Parse(strings.NewReader(`
sites: [{id: a, latitude: 1, longitude: 2, timezone: UTC}]
feeds: [{id: f, site: a, kinds: [sunrise], days_back: 9223372036854775807, days_ahead: 1}]
`), "yaml")
	ps := problemsOf(t, err)
	if len(ps) != 1 || ps[0].Path != "feeds[0].days_ahead" || !strings.Contains(ps[0].Msg, "over 10 years") {
		t.Errorf("got %v", err)
	}
}

func TestExplicitZeroWindowKept(t *testing.T) {
	c, err := Parse(strings.NewReader(`
sites: [{id: a, latitude: 1, longitude: 2, timezone: UTC}]
feeds: [{id: f, site: a, kinds: [sunrise], days_back: 0}]
`), "yaml")
	if err != nil {
		t.Fatal(err)
	}
	if c.Feeds[0].DaysBack != 0 || c.Feeds[0].DaysAhead != DefaultDaysAhead {
		t.Errorf("days_back %d days_ahead %d, want 0 and %d", c.Feeds[0].DaysBack, c.Feeds[0].DaysAhead, DefaultDaysAhead)
	}
}

// A window key written without a value ("days_ahead:") is not an
// explicit 0: the feed keeps the default window.
func TestEmptyWindowKeyIsDefault(t *testing.T) {
	c, err := loadTestdata(t, "null-days.yaml")
	if err != nil {
		t.Fatal(err)
	}
	if c.Feeds[0].DaysBack != DefaultDaysBack || c.Feeds[0].DaysAhead != DefaultDaysAhead {
		t.Errorf("days_back %d days_ahead %d, want %d and %d", c.Feeds[0].DaysBack, c.Feeds[0].DaysAhead, DefaultDaysBack, DefaultDaysAhead)
	}
}

// comparable gives a form of a Config that reflect.DeepEqual can compare:
// zones by name.
func comparable(c *Config) string {
	var b strings.Builder
	fmt.Fprintf(&b, "%+v zone=%s\n", c.Service, c.Service.RefreshZone.Name())
	for _, s := range c.Sites {
		fmt.Fprintf(&b, "%+v zone=%s\n", s, s.TimeZone.Name())
	}
	for _, f := range c.Feeds {
		fmt.Fprintf(&b, "%+v\n", f)
	}
	return b.String()
}

func TestFormatParity(t *testing.T) {
	var ref string
	for _, name := range []string{"parity.yaml", "parity.toml", "parity.json"} {
		c, err := loadTestdata(t, name)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		got := comparable(c)
		if ref == "" {
			ref = got
			// Spot-check the reference itself.
			f := c.Feeds[0]
			if f.DaysBack != 0 || f.DaysAhead != 200 || f.Alarm.D() != 15*time.Minute || !f.UTC ||
				f.Kinds[1].Offset.D() != -30*time.Minute || f.Kinds[1].Label != "Close the gates" ||
				f.Kinds[2].MaxIllumination != 0.2 || f.Kinds[3].Kind.DayLength != 14*time.Hour+30*time.Minute ||
				!f.Kinds[3].AllDay || c.Service.RefreshZone.Name() != "Europe/Zurich" || c.Sites[0].Horizon != 1.5 {
				t.Errorf("%s decoded wrongly:\n%s", name, got)
			}
			continue
		}
		if got != ref {
			t.Errorf("%s differs from parity.yaml:\n got %s\nwant %s", name, got, ref)
		}
	}
}

// A file that starts with a UTF-8 byte order mark, as some Windows editors
// write them, that is UTF-16 with its byte order mark (Windows' "Unicode"),
// or that ends its lines with CR LF, reads as the same file in UTF-8 with
// LF, in every format.
func TestByteOrderMarkAndCRLF(t *testing.T) {
	utf16Text := func(b []byte, order binary.AppendByteOrder) []byte {
		out := order.AppendUint16(nil, 0xFEFF)
		for _, u := range utf16.Encode([]rune(string(b))) {
			out = order.AppendUint16(out, u)
		}
		return out
	}
	for _, name := range []string{"parity.yaml", "parity.toml", "parity.json"} {
		raw, err := os.ReadFile(filepath.Join(testdata, name))
		if err != nil {
			t.Fatal(err)
		}
		format := strings.TrimPrefix(filepath.Ext(name), ".")
		c, err := Parse(bytes.NewReader(raw), format)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		want := comparable(c)
		for what, in := range map[string][]byte{
			"byte order mark": append([]byte("\ufeff"), raw...),
			"CR LF":           bytes.ReplaceAll(raw, []byte("\n"), []byte("\r\n")),
			"UTF-16LE text":   utf16Text(raw, binary.LittleEndian),
			"UTF-16BE text":   utf16Text(raw, binary.BigEndian),
		} {
			c, err := Parse(bytes.NewReader(in), format)
			if err != nil {
				t.Errorf("%s with a %s: %v", name, what, err)
				continue
			}
			if got := comparable(c); got != want {
				t.Errorf("%s with a %s reads\n%s\nwant\n%s", name, what, got, want)
			}
		}
	}
}

func TestEnvOverrides(t *testing.T) {
	env := map[string]string{
		"HELIOCAL_LISTEN":         "127.0.0.1:9999",
		"HELIOCAL_OUT_DIR":        "/srv/calendars",
		"HELIOCAL_BASE_URL":       "https://cal.example.net/",
		"HELIOCAL_REFRESH":        "0 4 * * *",
		"HELIOCAL_REFRESH_ZONE":   "Pacific/Auckland",
		"HELIOCAL_MAX_FEED_BYTES": "750000",
		"HELIOCAL_SITES":          "ignored: only deployment settings are read",
		// ignored: these come only from the file (docs/configuration.md)
		"HELIOCAL_OVERSIZE":        "fail",
		"HELIOCAL_TRUSTED_PROXIES": "10.0.0.0/8",
		"HELIOCAL_PAGE_TITLE":      "Set from the environment",
		"HELIOCAL_PAGE_BUILDER":    "false",
	}
	lookup := func(k string) (string, bool) { v, ok := env[k]; return v, ok }
	f, err := os.Open(filepath.Join(testdata, "parity.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	c, err := ParseEnv(f, "yaml", lookup)
	if err != nil {
		t.Fatal(err)
	}
	s := c.Service
	if s.Listen != "127.0.0.1:9999" || s.OutDir != "/srv/calendars" || s.BaseURL != "https://cal.example.net/" ||
		s.Refresh != "0 4 * * *" || s.RefreshZone.Name() != "Pacific/Auckland" || s.MaxFeedBytes != 750000 {
		t.Errorf("overrides not applied: %+v zone %s", s, s.RefreshZone.Name())
	}
	if _, err := f.Seek(0, io.SeekStart); err != nil {
		t.Fatal(err)
	}
	plain, err := ParseEnv(f, "yaml", nil)
	if err != nil {
		t.Fatal(err)
	}
	if s.Oversize != plain.Service.Oversize || !slices.Equal(s.TrustedProxies, plain.Service.TrustedProxies) || !reflect.DeepEqual(c.Page, plain.Page) || len(c.Sites) != len(plain.Sites) {
		t.Errorf("the environment set what only the file sets: oversize %q, trusted_proxies %q, page %+v; the file alone: %q, %q, %+v",
			s.Oversize, s.TrustedProxies, c.Page, plain.Service.Oversize, plain.Service.TrustedProxies, plain.Page)
	}

	// A bad value from the environment is reported at its key, naming the variable.
	env = map[string]string{"HELIOCAL_LISTEN": "nowhere", "HELIOCAL_MAX_FEED_BYTES": "1MB", "HELIOCAL_REFRESH_ZONE": "Mars/Olympus"}
	_, err = ParseEnv(bytes.NewReader(DemoYAML()), "yaml", lookup)
	ps := problemsOf(t, err)
	if len(ps) != 3 {
		t.Fatalf("want 3 problems, got:\n%v", err)
	}
	// The variable and the hint share one bracket.
	for _, want := range []string{
		`service.listen: nowhere: must be host:port (set by HELIOCAL_LISTEN; e.g. ":8080" or "127.0.0.1:8080")`,
		`service.refresh_zone: Mars/Olympus: unknown time zone (set by HELIOCAL_REFRESH_ZONE; use an IANA name`,
		`service.max_feed_bytes: 1MB: must be a whole number of bytes (set by HELIOCAL_MAX_FEED_BYTES; e.g. 1000000)`,
	} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("error lacks %q:\n%v", want, err)
		}
	}
	if strings.Contains(err.Error(), ") (") {
		t.Errorf("two brackets in a row:\n%v", err)
	}

	// Parse and Load never read the process environment.
	t.Setenv("HELIOCAL_LISTEN", "not-an-address")
	if _, err := Load(filepath.Join(testdata, "good-minimal.yaml")); err != nil {
		t.Errorf("Load read the process environment: %v", err)
	}
}

func TestDemo(t *testing.T) {
	c := Demo()
	if err := c.Validate(); err != nil {
		t.Fatalf("demo invalid: %v", err)
	}
	var north, south, polar bool
	for _, s := range c.Sites {
		north = north || s.Latitude > 0
		south = south || s.Latitude < 0
		// Above the polar circle (about 66.56°) the Sun stays up at midsummer
		// and down at midwinter (common practice: the polar circle is at
		// 90° − obliquity of the ecliptic).
		polar = polar || s.Latitude > 66.6 || s.Latitude < -66.6
	}
	if !north || !south || !polar {
		t.Errorf("demo sites: north %v south %v polar %v; want all", north, south, polar)
	}
	used := map[string]bool{}
	var offsetLabel, alarm, utc bool
	for _, f := range c.Feeds {
		if f.DaysBack > 30 || f.DaysAhead > 365 {
			t.Errorf("%s: window %d+%d days; keep demo feeds to 30 back, 365 ahead at most", f.ID, f.DaysBack, f.DaysAhead)
		}
		if f.Color == "" {
			t.Errorf("%s: no colour", f.ID)
		}
		alarm = alarm || f.Alarm > 0
		utc = utc || f.UTC
		for _, k := range f.Kinds {
			used[k.Kind.Name] = true
			for _, m := range k.Kind.Members() {
				used[m.Name] = true
			}
			offsetLabel = offsetLabel || (k.Offset < 0 && k.Label != "")
		}
	}
	if !offsetLabel || !alarm || !utc {
		t.Errorf("demo lacks: offset with label %v, alarm %v, UTC feed %v", offsetLabel, alarm, utc)
	}
	var missing []string
	for _, n := range KindNames {
		if !used[n] {
			missing = append(missing, n)
		}
	}
	if len(missing) > 0 {
		t.Errorf("demo does not use the kinds %v", missing)
	}
	// Demo returns a fresh copy each time.
	c.Sites[0].Name = "changed"
	if Demo().Sites[0].Name == "changed" {
		t.Error("Demo shares state between calls")
	}
}

// TestDemoDocumentsEveryKey checks that each key of the configuration is
// explained in a comment of the demo file.
func TestDemoDocumentsEveryKey(t *testing.T) {
	text := string(DemoYAML())
	var comments strings.Builder
	for _, line := range strings.Split(text, "\n") {
		if i := strings.Index(line, "#"); i >= 0 {
			comments.WriteString(line[i:] + "\n")
		}
	}
	for _, path := range []string{"", "service", "sites", "feeds", "feeds[0].kinds[0]"} {
		for _, key := range keysAt(path) {
			if !strings.Contains(comments.String(), key+":") {
				t.Errorf("key %q (under %q) is not documented in a comment of demo.yaml", key, path)
			}
		}
	}
}

// TestReferenceDocumentsEveryKey checks that docs/configuration.md has a
// row for each key of the configuration in the section of its place in the
// file: a table row whose first column names it ("| `key` |", or
// "| `low`, `high` |").
func TestReferenceDocumentsEveryKey(t *testing.T) {
	b, err := os.ReadFile(filepath.Join("..", "docs", "configuration.md"))
	if err != nil {
		t.Fatal(err)
	}
	named := map[string]string{} // section ("service", "feeds") → the first cells of its rows
	section := ""
	for _, line := range strings.Split(string(b), "\n") {
		if h, ok := strings.CutPrefix(line, "## `"); ok {
			section, _, _ = strings.Cut(h, "`")
			continue
		}
		if cells := strings.Split(line, "|"); strings.HasPrefix(line, "| `") && len(cells) > 2 {
			named[section] += cells[1]
		}
	}
	for path, section := range map[string]string{
		"service": "service", "page": "page", "sites": "sites",
		"feeds": "feeds", "feeds[0].kinds[0]": "feeds", "feeds[0].plans[0]": "feeds",
	} {
		keys := keysAt(path)
		if len(keys) == 0 {
			t.Errorf("no keys under %q", path)
		}
		for _, key := range keys {
			if !strings.Contains(named[section], "`"+key+"`") {
				t.Errorf("docs/configuration.md, section %s: no row names the key %q (under %q)", section, key, path)
			}
		}
	}
}

func TestLoadErrors(t *testing.T) {
	_, err := Load(filepath.Join(testdata, "does-not-exist.yaml"))
	if !errors.Is(err, fs.ErrNotExist) || err.Error() != filepath.Join(testdata, "does-not-exist.yaml")+": no such file" {
		t.Errorf("missing file: %v", err)
	}
	// a link to a file that is gone says so, not "no such file" of a name
	// that is there
	link := filepath.Join(t.TempDir(), "heliocal.yaml")
	if err := os.Symlink("/etc/heliocal/farm.yaml.old", link); err == nil {
		_, err = Load(link)
		if want := link + ": no such file: a symbolic link to /etc/heliocal/farm.yaml.old, which does not exist"; !errors.Is(err, fs.ErrNotExist) || err == nil || err.Error() != want {
			t.Errorf("dangling link: %v\nwant %s", err, want)
		}
	}
	_, err = Load(filepath.Join(testdata, "parity.ini"))
	if err == nil || !strings.Contains(err.Error(), `unknown file extension ".ini"`) {
		t.Errorf("bad extension: %v", err)
	}
	_, err = Parse(strings.NewReader("sites: ["), "yaml")
	if !errors.Is(err, ErrUnreadable) || !strings.Contains(err.Error(), "as yaml") {
		t.Errorf("syntax error: %v", err)
	}
	// named file:line: (file:line:column: where the reader gives the
	// column), as a compiler names an error and as a ValidationError's
	// problems are
	for name, want := range map[string]string{
		"syntax-error.yaml": ":4: cannot read the file as yaml: a list opened with [ is not closed with ] (its items are separated by commas)",
		"syntax-error.toml": ":3:9: cannot read the file as toml: expected character ]",
		"syntax-error.json": ":3: cannot read the file as json: invalid character '}'",
		// text without quotes is said so, not "unable to parse float"
		"syntax-bare-text.toml":    `:7: cannot read the file as toml: timezone = Europe/Zurich: text is written in quotes in TOML (write timezone = "Europe/Zurich")`,
		"not-a-mapping.yaml":       ":2: cannot read the file as yaml: the document is a list, not a mapping of keys (a configuration starts with keys such as sites: and feeds:)",
		"two-documents.yaml":       ":11: cannot read the file as yaml: a second document begins here with ---, and heliocal reads one (write every site and feed under one sites: and one feeds:)",
		"end-marker-document.yaml": ":13: cannot read the file as yaml: a second document begins here, after the end marker ... of line 12, and heliocal reads one (write every site and feed under one sites: and one feeds:, without ...)",
		"not-a-mapping.json":       ": cannot read the file as json: the document is a list, not a mapping of keys (a configuration starts with keys such as sites: and feeds:)",
	} {
		_, err = loadTestdata(t, name)
		if want = filepath.Join(testdata, name) + want; !errors.Is(err, ErrUnreadable) || !strings.HasPrefix(err.Error(), want) {
			t.Errorf("%s: %v\nwant it to begin %q", name, err, want)
		}
	}
	// a document that ends with ..., followed by comments only or by
	// nothing, is one document
	for _, end := range []string{"...\n", "...\n# end\n\n", "... # end\n"} {
		in := "sites:\n  - {id: x, latitude: 1, longitude: 2, timezone: UTC}\nfeeds:\n  - {id: f, site: x, kinds: [sunrise]}\n" + end
		if c, err := Parse(strings.NewReader(in), "yaml"); err != nil || len(c.Feeds) != 1 {
			t.Errorf("%q: %v", end, err)
		}
	}
	// a --- that begins the file (on its first line, or after comments) is
	// the one document's start marker, not a second document (README,
	// Configuration)
	for _, start := range []string{"---\n", "--- # farm\n", "# farm\n\n---\n"} {
		in := start + "sites:\n  - {id: x, latitude: 1, longitude: 2, timezone: UTC}\nfeeds:\n  - {id: f, site: x, kinds: [sunrise]}\n"
		if c, err := Parse(strings.NewReader(in), "yaml"); err != nil || len(c.Feeds) != 1 {
			t.Errorf("%q: %v", start, err)
		}
	}
	// A %YAML directive of version 1.2 (YAML 1.2.2, section 6.8.1) or 1.1
	// is read, the decoder taking 1.1 alone; a problem after it keeps its
	// line. Another version, or directives without the start marker ---
	// after them, are said with their line, not in the decoder's words
	// ("found incompatible YAML document", "did not find expected <document
	// start>").
	body := "sites:\n  - {id: x, latitude: 1, longitude: 2, timezone: UTC}\nfeeds:\n  - {id: f, site: x, kinds: [sunrise]}\n"
	for _, head := range []string{"%YAML 1.2\n---\n", "%YAML 1.1\n---\n", "# farm\n%YAML 1.2 # version\n\n--- # start\n",
		"\ufeff%YAML 1.2\n---\n", "%TAG !f! tag:example.org,2026:\n%YAML 1.2\n---\n"} {
		if c, err := Parse(strings.NewReader(head+body), "yaml"); err != nil || len(c.Feeds) != 1 {
			t.Errorf("%q: %v", head, err)
		}
	}
	if _, err := Parse(strings.NewReader("%YAML 1.2\n---\nsites:\n  - id: x\n\tlatitude: 1\n"), "yaml"); err == nil ||
		!strings.HasSuffix(err.Error(), "yaml: line 5: a tab in the indentation (YAML indents with spaces only)") {
		t.Errorf("%%YAML 1.2 and a tab on line 5: %v", err)
	}
	for head, want := range map[string]string{
		"%YAML 2.0\n---\n":         "line 1: %YAML 2.0: a version of YAML heliocal does not read (it reads 1.1 and 1.2: write %YAML 1.2, or remove the line)",
		"# farm\n%YAML 1.3\n---\n": "line 2: %YAML 1.3: a version of YAML heliocal does not read (it reads 1.1 and 1.2: write %YAML 1.2, or remove the line)",
		"%YAML # 1.2\n---\n":       "line 1: %YAML without a version (heliocal reads YAML 1.1 and 1.2: write %YAML 1.2, or remove the line)",
		"%YAML 1.2\n\n":            "line 1: the directive %YAML 1.2 is not followed by ---, the start of the document (add a line --- before line 3, or remove the directive)",
	} {
		_, err = Parse(strings.NewReader(head+body), "yaml")
		if want = "cannot read the file as yaml: " + want; !errors.Is(err, ErrUnreadable) || err.Error() != want {
			t.Errorf("%q: %v\nwant %s", head, err, want)
		}
	}
	// A tab in YAML's indentation is named with its own line: the decoder
	// says "line 2" of the tab on line 3 below, and of the one on line 2 only
	// that a character cannot start a token.
	for in, want := range map[string]string{
		"sites:\n  - id: x\n\tlatitude: 1\n":     "line 3: a tab in the indentation (YAML indents with spaces only)",
		"sites:\n  - id: x\n  \t  latitude: 1\n": "line 3: a tab in the indentation (YAML indents with spaces only)",
		"sites:\n\t- id: x\n":                    "line 2: a tab in the indentation (YAML indents with spaces only)",
		"sites:\n  - id: x\n  @latitude: 1\n":    "line 3: found character that cannot start any token",
	} {
		_, err = Parse(strings.NewReader(in), "yaml")
		if !errors.Is(err, ErrUnreadable) || !strings.HasSuffix(err.Error(), want) {
			t.Errorf("%q: %v\nwant it to end %q", in, err, want)
		}
	}
	// a list of words and TOML's yes are written as TOML has them
	for in, want := range map[string]string{
		"[[feeds]]\nkinds = [sunrise, sunset]\n": `line 2: kinds = [sunrise, sunset]: text is written in quotes in TOML (write kinds = ["sunrise", "sunset"])`,
		"[[feeds]]\nutc = yes # in UTC\n":        `line 2: utc = yes: not a TOML value (write utc = true)`,
		"[[feeds.kinds]]\nweekdays = sat\n":      `line 2: weekdays = sat: text is written in quotes in TOML (write weekdays = ["sat"])`, // not "sat", which is no list
		"[[feeds.kinds]]\noffset = -30m\n":       `line 2: offset = -30m: text is written in quotes in TOML (write offset = "-30m")`,
		"[[feeds]]\nalarm = 1h30m\n":             `line 2: alarm = 1h30m: text is written in quotes in TOML (write alarm = "1h30m")`,
		// a negative alarm says both slips at once, not the second once
		// the first is mended
		"[[feeds.plans]]\nalarm = -15m\n": `line 2: alarm = -15m: text is written in quotes in TOML, and an alarm must not be negative: it is the time before each event (write alarm = "15m")`,
		// a clock time, which TOML reads as a time only with seconds: not
		// its "times are expected to have the format HH:MM:SS[.NNNNNN]"
		"[[feeds.plans]]\nstart = 20:00\n":             `line 2: start = 20:00: text is written in quotes in TOML (write start = "20:00")`,
		"[[feeds.kinds]]\nlatest_off = 5:30 # lamps\n": `line 2: latest_off = 5:30: text is written in quotes in TOML (write latest_off = "5:30")`,
	} {
		_, err = Parse(strings.NewReader(in), "toml")
		if !errors.Is(err, ErrUnreadable) || !strings.HasSuffix(err.Error(), want) {
			t.Errorf("%q: %v\nwant it to end %q", in, err, want)
		}
	}
	// JSON's usual slips are named after the decoder's words
	for in, want := range map[string]string{
		`{"sites":[{"id":"a","latitude":1,}]}`: "looking for beginning of object key string (JSON has no comma after the last item of a list or mapping)",
		"{\"feeds\":[{\"id\":\"f\"},\n]}":      "line 2: invalid character ']' looking for beginning of value (JSON has no comma after the last item of a list or mapping)",
		`{'sites':[]}`:                         `(JSON writes text and keys in double quotes: "sites")`,
		"{\"sites\":[] // the places\n}":       "(JSON has no comments)",
		`{sites:[]}`:                           `(JSON writes keys in double quotes: "sites")`,
		`{"sites":[{"id":"a" "latitude":1}]}`:  "(a comma is missing before it)",
		`{"sites":[{"id" "a"}]}`:               `after object key (a colon is missing between the key and its value, as in "id": "a")`,
		`{"sites" []}`:                         `after object key (a colon is missing between the key and its value, as in "id": "a")`,
	} {
		_, err = Parse(strings.NewReader(in), "json")
		if !errors.Is(err, ErrUnreadable) || !strings.HasSuffix(err.Error(), want) {
			t.Errorf("%q: %v\nwant it to end %q", in, err, want)
		}
	}
	_, err = Parse(strings.NewReader("{}"), "xml")
	if err == nil || !strings.Contains(err.Error(), `unsupported format "xml"`) {
		t.Errorf("format: %v", err)
	}
}

func TestResolve(t *testing.T) {
	good, err := os.ReadFile(filepath.Join(testdata, "good-minimal.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	t.Chdir(t.TempDir())
	env := func(k string) (string, bool) {
		if k == "HELIOCAL_OUT_DIR" {
			return "from-env", true
		}
		return "", false
	}

	// No flag, no ./heliocal.yaml: the built-in demo, with the environment.
	c, src, err := Resolve("", env)
	if err != nil || !src.Demo || src.String() != "built-in demo" || len(c.Sites) != len(Demo().Sites) || c.Service.OutDir != "from-env" {
		t.Fatalf("demo: source %v, err %v", src, err)
	}

	// ./heliocal.yaml when present.
	if err := os.WriteFile(DefaultPath, good, 0o644); err != nil {
		t.Fatal(err)
	}
	c, src, err = Resolve("", env)
	if err != nil || src.Demo || src.Path != DefaultPath || c.Sites[0].ID != "north-field" || c.Service.OutDir != "from-env" {
		t.Fatalf("./heliocal.yaml: source %v, err %v", src, err)
	}

	// --config wins, and a missing file is an error, not a fallback.
	_, src, err = Resolve("elsewhere.yaml", env)
	if !errors.Is(err, fs.ErrNotExist) || src.Path != "elsewhere.yaml" {
		t.Fatalf("missing --config file: source %v, err %v", src, err)
	}
}

// A refresh written as a word of cron's without its @ ("daily", "every
// 6h") is told the schedule with it; one that is no such word, or whose @
// form would fire too often, gets the form of five fields.
func TestRefreshWithoutAt(t *testing.T) {
	const fields = `five fields: minute hour day-of-month month day-of-week, e.g. "15 3 * * *" for 03:15 every night`
	for refresh, want := range map[string]string{
		"daily":    `did you mean "@daily"?`,
		"Hourly":   `did you mean "@hourly"?`,
		"every 6h": `did you mean "@every 6h"?`,
		"every 1s": fields,
		"nightly":  fields,
	} {
		_, err := Parse(strings.NewReader("service:\n  refresh: "+refresh+"\nsites: [{id: a, latitude: 1, longitude: 2, timezone: UTC}]\nfeeds: [{id: f, site: a, kinds: [sunrise]}]\n"), "yaml")
		ps := problemsOf(t, err)
		if len(ps) != 1 || ps[0].Path != "service.refresh" || ps[0].Hint != want {
			t.Errorf("%s: %v\nwant the hint %s", refresh, err, want)
		}
	}
}

// Schedules that fire at most once a minute, however rarely, are accepted:
// the check refuses only those that never fire or fire more often.
func TestRefreshSchedulesAccepted(t *testing.T) {
	now := time.Date(2026, 12, 3, 8, 0, 0, 0, time.UTC)
	for _, spec := range []string{"* * * * *", "@every 1m", "@every 90s", "0 0 29 2 *", "@daily", "15 3 * * *", "0 4 1 1 *"} {
		if msg := checkCronFires(spec, now); msg != "" {
			t.Errorf("%q refused: %s", spec, msg)
		}
	}
	for spec, want := range map[string]string{
		"0 0 30 2 *": "never fires: no date matches it",
		"0 0 31 4 *": "never fires: no date matches it",
		"@every 1ns": "fires every 1s, more often than once a minute",
	} {
		if msg := checkCronFires(spec, now); msg != want {
			t.Errorf("%q: %q, want %q", spec, msg, want)
		}
	}
}

// "Write the number without quotes" is said only of text that is a number
// in quotes ("95"), not of words where a number belongs (days_ahead: lots,
// written without quotes).
func TestQuotesHintOnlyForQuotedNumbers(t *testing.T) {
	for file, want := range map[string]bool{"bad-latitude-quoted.yaml": true, "bad-days-words.yaml": false} {
		_, err := loadTestdata(t, file)
		if err == nil {
			t.Fatalf("%s: no error", file)
		}
		ps := problemsOf(t, err)
		if len(ps) != 1 {
			t.Fatalf("%s: %d problems, want 1: %v", file, len(ps), err)
		}
		if got := strings.Contains(ps[0].Hint, "without quotes"); got != want {
			t.Errorf("%s: %s: hint %q, want the quotes hint: %v", file, ps[0].Path, ps[0].Hint, want)
		}
	}
}

// A temperature written in Fahrenheit is told its value in Celsius, to a
// tenth of a degree: °C = (°F − 32) × 5/9, the two scales' definitions
// (NIST SP 811, appendix B; 68 °F = 20 °C; they meet at −40; 31.99 °F is
// −0.0056 °C, which is 0.0 to a tenth, written "0", not "-0").
func TestFahrenheitHint(t *testing.T) {
	for _, tc := range []struct{ written, want string }{
		{"68F", "write 20 for 68 °F"},
		{"-40 °F", "write -40 for -40 °F"},
		{"31.99F", "write 0 for 31.99 °F"},
	} {
		if got := NumberTextHint("temperature_c", tc.written); !strings.HasSuffix(got, tc.want) {
			t.Errorf("temperature_c %q: hint %q, want it to end %q", tc.written, got, tc.want)
		}
	}
}

// lineAt finds the line that splitting the file at every "\n" gives, the
// last one after a final "\n" (empty) included, and none past it.
func TestLineAt(t *testing.T) {
	for _, data := range []string{"", "a", "a\n", "a\r\nb = 1\r\n", "\n\nx\n y"} {
		lines := bytes.Split([]byte(data), []byte("\n"))
		for row := -1; row <= len(lines)+1; row++ {
			got, ok := lineAt([]byte(data), row)
			want, wantOK := []byte(nil), row >= 1 && row <= len(lines)
			if wantOK {
				want = lines[row-1]
			}
			if ok != wantOK || !bytes.Equal(got, want) {
				t.Errorf("lineAt(%q, %d) = %q, %v; want %q, %v", data, row, got, ok, want, wantOK)
			}
		}
	}
}

// Feed ids that name a device on Windows are refused, and only those. The
// names are Microsoft's, "Naming Files, Paths, and Namespaces" (Win32 file
// naming conventions): CON, PRN, AUX, NUL, COM1-COM9 and LPT1-LPT9, "also
// avoid these names followed immediately by an extension"; Go's
// internal/filepathlite (isReservedBaseName, path_windows.go) keeps the
// same list. Ids are lower case, Windows' names are not case-sensitive.
func TestWindowsDeviceIDs(t *testing.T) {
	for _, id := range []string{"con", "prn", "aux", "nul", "com1", "com9", "lpt1", "lpt9"} {
		if !windowsDevice(id) {
			t.Errorf("%s: not taken for a device", id)
		}
	}
	for _, id := range []string{"com", "com0", "com10", "lpt0", "lpt", "nul-sun", "console", "aux1", "null", "con-1", "north-sun"} {
		if windowsDevice(id) {
			t.Errorf("%s: taken for a device", id)
		}
	}
}

// TestShortKeys: a site written with the command line's short names (--lat,
// --lon, --elev, --tz) is told each key's name, which the misspelling
// search does not find ("lat" is too far from "latitude").
func TestShortKeys(t *testing.T) {
	_, err := loadTestdata(t, "short-keys.yaml")
	if err == nil {
		t.Fatal("no error")
	}
	problems := problemsByPath(t, err)
	for short, key := range map[string]string{"lat": "latitude", "lon": "longitude", "elev": "elevation", "tz": "timezone"} {
		if got, want := problems["sites[0]."+short].Hint, `did you mean "`+key+`"?`; got != want {
			t.Errorf("sites[0].%s: hint %q, want %q", short, got, want)
		}
	}
}

// TestProblemsInLineOrder: problems named file:line: come in the order of
// their lines, as a compiler lists them (by field, "elev" sorted before
// "lat" though written after it).
func TestProblemsInLineOrder(t *testing.T) {
	_, err := loadTestdata(t, "short-keys.yaml")
	if err == nil {
		t.Fatal("no error")
	}
	ps := problemsOf(t, err)
	for i := 1; i < len(ps); i++ {
		if ps[i].Line < ps[i-1].Line {
			t.Errorf("%s (line %d) after %s (line %d):\n%v", ps[i].Path, ps[i].Line, ps[i-1].Path, ps[i-1].Line, err)
		}
	}
	if len(ps) != 4 {
		t.Errorf("%d problems, want 4:\n%v", len(ps), err)
	}
}

// TestShortKeyNamedOnce: a short key's problem names the key once, in its
// path, and says what to write; latitude and longitude, which the short
// keys stand for, are not said to be missing as well, as writing the key
// the hint names is the one change to make.
func TestShortKeyNamedOnce(t *testing.T) {
	_, err := loadTestdata(t, "short-keys.yaml")
	if err == nil {
		t.Fatal("no error")
	}
	text := err.Error()
	want := filepath.Join(testdata, "short-keys.yaml") + `:5: sites[0].lat: unknown key (did you mean "latitude"?)`
	if !strings.Contains(text, want) {
		t.Errorf("no line %q:\n%s", want, text)
	}
	for _, bad := range []string{"lat: lat:", "is required"} {
		if strings.Contains(text, bad) {
			t.Errorf("%q in:\n%s", bad, text)
		}
	}
	// a key that is missing without a short key for it still is
	_, err = loadTestdata(t, "null-latitude.json")
	if err == nil || !strings.Contains(err.Error(), "sites[0].latitude: is required") {
		t.Errorf("a missing latitude not said missing: %v", err)
	}
}

// TestFeedIDHintsFollowed: the ids the hints of bad-feed-id-taken.yaml
// suggest, written in, give a configuration without problems.
func TestFeedIDHintsFollowed(t *testing.T) {
	data, err := os.ReadFile(filepath.Join(testdata, "bad-feed-id-taken.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	text := strings.Replace(string(data), "id: North-Sun", "id: north-sun-2", 1)
	text = strings.Replace(text, "id: north moon", "id: north-moon", 1)
	text = strings.Replace(text, "id: north moon", "id: north-moon-2", 1)
	if _, err := Parse(strings.NewReader(text), "yaml"); err != nil {
		t.Errorf("the hints followed: %v", err)
	}
}

// TestMissingFieldLineTOML: a field missing from a TOML [[sites]] or
// [[feeds.kinds]] entry is named with the line of the entry's first key, as
// in YAML and JSON with the entry's own line, and so in the order of the
// file; it had no line and came first.
func TestMissingFieldLineTOML(t *testing.T) {
	_, err := loadTestdata(t, "missing-fields.toml")
	if err == nil {
		t.Fatal("no error")
	}
	problems := problemsByPath(t, err)
	for path, want := range map[string]int{"sites[0].latitude": 3, "feeds[0].kinds[0].kind": 12} {
		if p, ok := problems[path]; !ok || p.Line != want {
			t.Errorf("%s: line %d, want %d:\n%v", path, p.Line, want, err)
		}
	}
}

// TestBoolHintPlain: yes written without quotes is not told to be written
// without quotes.
func TestBoolHintPlain(t *testing.T) {
	_, err := loadTestdata(t, "bad-bool-plain.yaml")
	if err == nil || strings.Contains(err.Error(), "without quotes") || !strings.Contains(err.Error(), "(write true)") {
		t.Errorf("%v", err)
	}
}

// max_feed_bytes: 0, in the file or from HELIOCAL_MAX_FEED_BYTES, is the
// default limit, not "no limit", and docs/configuration.md's row says so.
func TestMaxFeedBytesZeroIsTheDefault(t *testing.T) {
	const file = "service:\n  max_feed_bytes: 0\nsites:\n  - id: a\n    latitude: 47.5\n    longitude: 9.7\n    timezone: Europe/Zurich\nfeeds:\n  - id: a-sun\n    site: a\n    kinds: [sunrise]\n"
	for _, env := range []LookupEnv{nil, func(k string) (string, bool) { return "0", k == "HELIOCAL_MAX_FEED_BYTES" }} {
		c, err := ParseEnv(strings.NewReader(file), "yaml", env)
		if err != nil {
			t.Fatal(err)
		}
		if c.Service.MaxFeedBytes != DefaultMaxFeedBytes {
			t.Errorf("max_feed_bytes 0 gives %d, want the default %d", c.Service.MaxFeedBytes, DefaultMaxFeedBytes)
		}
	}
	b, err := os.ReadFile(filepath.Join("..", "docs", "configuration.md"))
	if err != nil {
		t.Fatal(err)
	}
	for _, line := range strings.Split(string(b), "\n") {
		if strings.HasPrefix(line, "| `max_feed_bytes` |") {
			if cells := strings.Split(line, " | "); !strings.HasPrefix(cells[len(cells)-2], "`1000000`, also when 0") {
				t.Errorf("docs/configuration.md's max_feed_bytes row gives the default as %q, without saying that 0 is the default", cells[len(cells)-2])
			}
			return
		}
	}
	t.Error("docs/configuration.md has no row for max_feed_bytes")
}

// A number written with separators between its thousands is told the
// number to write, and an elevation in feet its metres, to the metre: the
// international foot is 0.3048 m exactly (NIST SP 811, appendix B), so
// 4400 ft is 1341.12 m. A decimal comma in a coordinate keeps its own hint.
func TestNumberWrittenOtherwise(t *testing.T) {
	for _, tc := range []struct{ key, written, want string }{
		{"elevation", "1,340", "write the number without separators: 1340"},
		{"elevation", "1 340", "write the number without separators: 1340"},
		{"pressure_hpa", "1\u202f013", "write the number without separators: 1013"},
		{"max_feed_bytes", "1,000,000", "write the number without separators: 1000000"},
		{"elevation", "4400ft", "metres above sea level, not feet: write 1341 for 4400 ft"},
		{"elevation", "4400 feet", "metres above sea level, not feet: write 1341 for 4400 ft"},
		{"elevation", "1340m", "write the number alone, without the unit: 1340"},
		{"latitude", "-43,95", "write -43.95: decimal degrees, north positive, south negative"},
	} {
		if got := NumberTextHint(tc.key, tc.written); got != tc.want {
			t.Errorf("%s %q: hint %q, want %q", tc.key, tc.written, got, tc.want)
		}
	}
}
