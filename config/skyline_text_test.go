package config

import (
	"errors"
	"fmt"
	"math"
	"os"
	"strings"
	"testing"
)

// SkylineFromText names the point at fault itself, by its place and as
// written, and another point by its place: a server answers with its
// message as it is (feed/serve), reading the points once.
func TestSkylineFromTextNamesPoints(t *testing.T) {
	tenth := func(x float64) float64 { return math.Round(x*10) / 10 }
	for v, want := range map[string]string{
		"0:2,90:60":       `horizon: "0:2,90:60": point 2 (90:60): altitude must be within -5..45 degrees (the apparent altitude of the skyline in that direction; azimuth comes first)`,
		"0:2, 361:4":      `point 2 (361:4): azimuth must be within 0..360`,
		"90:8,0:2,360:1":  `point 3 (360:1): azimuth 0 given twice, also at point 2: 0 and 360 are the same`,
		"90:8,0:2,90:1":   `point 3 (90:1): azimuth 90 given twice, also at point 1 (one altitude per direction)`, // 0 and 360 not in question
		"10.01:2,10.04:3": `point 2 (10.04:3): azimuth 10 given twice, also at point 1 (`,                         // rounded first
		"0:2,,90:8":       `point 2 (): must be azimuth:altitude, two numbers`,
		// every point at fault, in the order written, as the configuration
		// lists them; the hints differ, so none is given
		"0:2,400:3,90:50": `horizon: "0:2,400:3,90:50": point 2 (400:3): azimuth must be within 0..360; point 3 (90:50): altitude must be within -5..45 degrees`,
		"x:3,0:2,90:y":    `point 1 (x:3): must be azimuth:altitude, two numbers; point 3 (90:y): must be azimuth:altitude, two numbers (e.g. horizon 0:2`,
	} {
		_, err := SkylineFromText("horizon", v, tenth)
		var fe FieldError
		if !errors.As(err, &fe) || fe.Path != "horizon" || fe.Value != v || !strings.Contains(err.Error(), want) {
			t.Errorf("%q: %v, want a FieldError for horizon saying %q", v, err, want)
		}
	}
	pts, err := SkylineFromText("horizon", "270:4.04, 0:2,90:8,360:1.96", nil)
	if err == nil {
		t.Errorf("0 and 360 given: %v", pts)
	}
	pts, err = SkylineFromText("horizon", "270:4.04, 0:2,90:7.96", tenth)
	if err != nil || fmt.Sprint(pts) != "[[0 2] [90 8] [270 4]]" {
		t.Errorf("%v, %v", pts, err)
	}
}

// A skyline file given on the command line has every bad line named in the
// one error, as the configuration's horizon key lists them.
func TestHorizonFromTextFileEveryLine(t *testing.T) {
	name := t.TempDir() + "/hills.csv"
	if err := os.WriteFile(name, []byte("0,2\n400,3\n90,50\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	var s Site
	err := s.HorizonFromText("--horizon", name)
	want := "line 2: [400, 3]: azimuth must be within 0..360; line 3: [90, 50]: altitude must be within -5..45 degrees"
	if err == nil || !strings.Contains(err.Error(), want) {
		t.Errorf("%v, want %q", err, want)
	}
}

// A horizon flag written with its degree sign is told the number to give.
func TestHorizonFromTextDegreeSign(t *testing.T) {
	var s Site
	err := s.HorizonFromText("--horizon", "2°")
	want := "(for one altitude, write the number alone: --horizon 2)"
	if err == nil || !strings.Contains(err.Error(), want) {
		t.Errorf("%v, want %q", err, want)
	}
}

// A site's horizon written with its degree sign is told the number to
// write, the key written as the file's format writes it.
func TestHorizonDegreeSignEachFormat(t *testing.T) {
	for format, doc := range map[string]string{
		"yaml": "sites: [{id: a, latitude: 1, longitude: 2, timezone: UTC, horizon: 2°}]\n",
		"toml": "[[sites]]\nid = \"a\"\nlatitude = 1\nlongitude = 2\ntimezone = \"UTC\"\nhorizon = \"2°\"\n",
		"json": `{"sites": [{"id": "a", "latitude": 1, "longitude": 2, "timezone": "UTC", "horizon": "2°"}]}`,
	} {
		_, err := Parse(strings.NewReader(doc), format)
		want := map[string]string{"yaml": "horizon: 2", "toml": "horizon = 2", "json": `"horizon": 2`}[format]
		found := false
		for _, p := range problemsOf(t, err) {
			found = found || p.Path == "sites[0].horizon" && p.Hint == "for one altitude, write the number alone: "+want
		}
		if !found {
			t.Errorf("%s: %v\nwant the hint to write %s", format, err, want)
		}
	}
}
