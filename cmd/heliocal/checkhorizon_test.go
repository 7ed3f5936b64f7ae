package main

import (
	"encoding/json"
	"strings"
	"testing"
)

// check says which horizon rise and set are taken over: a site without a
// horizon at 1150 m has the flat one lowered by the dip, 1.76′·√1150 =
// 59.7′ (N. Bowditch, The American Practical Navigator, dip of the sea horizon), a horizon written 0 is level, without it; at sea
// level there is no dip to name. The JSON says it in horizon_set and
// dip_deg. And events --horizon 0 is that level horizon: at 31.27° S
// 149.07° E, 1150 m, PyEphem 4.1.4 (pressure 0, the Sun's centre at
// −50.48′: 34.48′ of refraction at 0° and 16′) has sunrise on 1 March
// 2027 at 19:53:04.4 UTC, 06:53:04 AEDT; with the dip (−1.828°) 06:48:23.
func TestCheckSaysHorizonDip(t *testing.T) {
	cfg := `sites:
  - id: plateau
    latitude: -31.27
    longitude: 149.07
    elevation: 1150
    timezone: Australia/Sydney
    horizon: 0
  - id: summit
    latitude: -31.27
    longitude: 149.07
    elevation: 1150
    timezone: Australia/Sydney
  - id: coast
    latitude: -31.27
    longitude: 149.07
    timezone: Australia/Sydney
feeds:
  - {id: plateau-sun, site: plateau, kinds: [sunrise]}
  - {id: summit-sun, site: summit, kinds: [sunrise]}
  - {id: coast-sun, site: coast, kinds: [sunrise]}
`
	code, out, errOut := runStdin(t, cfg, "check", "-c", "-")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	for _, want := range []string{"1150 m     0° level, no dip ", "1150 m     0°, dip 1.0°     ", "0 m        0°               "} {
		if !strings.Contains(out, want) {
			t.Errorf("no %q in the sites' table:\n%s", want, out)
		}
	}
	code, out, errOut = runStdin(t, cfg, "check", "-c", "-", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var r struct {
		Sites []struct {
			ID         string  `json:"id"`
			HorizonSet bool    `json:"horizon_set"`
			Dip        float64 `json:"dip_deg"`
		} `json:"sites"`
	}
	if err := json.Unmarshal([]byte(out), &r); err != nil {
		t.Fatal(err)
	}
	want := map[string][2]any{"plateau": {true, 0.0}, "summit": {false, 0.995}, "coast": {false, 0.0}}
	for _, s := range r.Sites {
		if w := want[s.ID]; s.HorizonSet != w[0] || s.Dip != w[1] {
			t.Errorf("%s: horizon_set %v, dip_deg %v; want %v, %v", s.ID, s.HorizonSet, s.Dip, w[0], w[1])
		}
	}
	for horizon, want := range map[string]string{"0": "06:53:04 AEDT", "": "06:48:23 AEDT"} {
		args := []string{"events", "--lat", "-31.27", "--lon", "149.07", "--elev", "1150", "--tz", "Australia/Sydney",
			"--kinds", "sunrise", "--from", "2027-03-01", "--to", "2027-03-01"}
		if horizon != "" {
			args = append(args, "--horizon", horizon)
		}
		code, out, errOut := runCLI(t, args...)
		if code != 0 || !strings.Contains(out, want) {
			t.Errorf("--horizon %q: exit %d, want sunrise %s:\n%s%s", horizon, code, want, out, errOut)
		}
	}
}

// docs/serving.md ("Upgrading"): at sea level a horizon written 0 changes
// only the refraction, 34.5′ for 34′ (the Sun's centre at −50.48′ instead
// of −50′), so sunrise comes 3 s earlier at 48.2° N 16.4° E on 1 March 2027
// and 7 s at 60.2° N 24.9° E on 21 June 2027. PyEphem 4.1.4 (pressure 0,
// use_center, horizon −0:50 and −0:50.48): 05:36:21 and 05:36:18 UTC;
// 00:53:48 and 00:53:41 UTC.
func TestHorizonZeroAtSeaLevelOnlyRefraction(t *testing.T) {
	for _, c := range []struct {
		lat, lon, tz, date string
		dip, level         string
	}{
		{"48.2", "16.4", "Europe/Vienna", "2027-03-01", "06:36:21 CET", "06:36:18 CET"},
		{"60.2", "24.9", "Europe/Helsinki", "2027-06-21", "03:53:48 EEST", "03:53:41 EEST"},
	} {
		for horizon, want := range map[string]string{"": c.dip, "0": c.level} {
			args := []string{"events", "--lat", c.lat, "--lon", c.lon, "--tz", c.tz,
				"--kinds", "sunrise", "--from", c.date, "--to", c.date}
			if horizon != "" {
				args = append(args, "--horizon", horizon)
			}
			code, out, errOut := runCLI(t, args...)
			if code != 0 || !strings.Contains(out, want) {
				t.Errorf("%s° N %s --horizon %q: exit %d, want sunrise %s:\n%s%s", c.lat, c.date, horizon, code, want, out, errOut)
			}
		}
	}
}
