package main

import (
	"context"
	"strings"
	"testing"
	"time"

	"heliocal/config"
)

// checkWarnings is what heliocal check warns about the configuration text
// cfg on the date now.
func checkWarnings(t *testing.T, cfg string, now time.Time) []string {
	t.Helper()
	c, err := config.Parse(strings.NewReader(cfg), "yaml")
	if err != nil {
		t.Fatal(err)
	}
	r, _, err := checkConfig(context.Background(), c, config.Source{}, now)
	if err != nil {
		t.Fatal(err)
	}
	return r.Warnings
}

// A latest_off before sunset does not limit the evening lamps (the first
// latest_off after their start is the next day's), and check says so.
// Havana, 23.1° N 82.4° W: sunset on 13 Mar 2027 18:37:59 CST, on 14 Mar
// 2027 (first day of summer time) 19:38:22 CDT, on 6 Nov 2027 18:48:41
// CDT, on 7 Nov 2027 (standard time again) 17:48:12 CST (PyEphem 4.1.4,
// upper limb, 34′ refraction, no elevation). The natural day there never
// reaches 14 h (13 h 33 min at the June solstice, same source), so every
// date needs lamps: the 238 dates from 14 Mar to 6 Nov 2027 have their
// evening lamps start after 18:45. A limit past midnight ("01:00") and one
// in the evening before the morning lamps ("22:00") are meant for the night: no warning.
func TestLampLimitWarning(t *testing.T) {
	cfg := `sites:
  - {id: malecon-farm, name: Malecón Farm, latitude: 23.1, longitude: -82.4, timezone: America/Havana}
feeds:
  - id: havana-lamps
    site: malecon-farm
    days_back: 0
    days_ahead: 364
    kinds:
      - {kind: "lighting:14h", lamps: evening, latest_off: "18:45"}
  - id: night-lamps
    site: malecon-farm
    days_back: 0
    days_ahead: 364
    kinds:
      - {kind: "lighting:14h", lamps: evening, latest_off: "01:00"}
      - {kind: "lighting:13h", lamps: morning, earliest_on: "22:00"}
  - id: morning-lamps
    site: malecon-farm
    days_back: 0
    days_ahead: 364
    kinds:
      - {kind: "lighting:14h", lamps: morning, earliest_on: "07:25", months: [apr, may, jun, jul, aug, sep, oct]}
`
	got := checkWarnings(t, cfg, time.Date(2027, 1, 1, 12, 0, 0, 0, time.UTC))
	want := []string{
		`feed "havana-lamps": lighting:14h latest_off "18:45" comes before the evening lamps start on 238 dates between 14 Mar 2027 and 6 Nov 2027`,
		// Sunrise at Havana on 11 Oct 2027 07:24:49 CDT, on 12 Oct
		// 07:25:13 CDT (PyEphem 4.1.4, as above), and before 07:25 every
		// day from 1 Apr: the morning lamps end before 07:25 on those
		// 194 dates.
		`feed "morning-lamps": lighting:14h earliest_on "07:25" comes after the morning lamps end on 194 dates between 1 Apr 2027 and 11 Oct 2027`,
	}
	if len(got) != len(want) {
		t.Fatalf("warnings:\n%s\nwant %d", strings.Join(got, "\n"), len(want))
	}
	for i := range want {
		if !strings.HasPrefix(got[i], want[i]+", so it does not limit them: ") {
			t.Errorf("warning %d:\n%s\nwant it to start\n%s", i, got[i], want[i])
		}
	}
}
