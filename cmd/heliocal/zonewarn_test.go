package main

import (
	"strings"
	"testing"
	"time"

	"heliocal/config"
)

// check warns of a site's timezone whose offsets are not those of the zone
// in force at its coordinates, and only then. The offsets are zdump's
// (`zdump -v -c 2026,2028 Pacific/Chatham Pacific/Auckland Australia/Lord_Howe
// Australia/Sydney Pacific/Tahiti Europe/Berlin Europe/Vienna`): Chatham
// +1345 while Auckland is +13 in December 2026 (45 min ahead); Lord Howe
// +1030 from 03 Apr 2027 15:00 UT while Sydney is +10 from 16:00 UT that
// day to 2 Oct (30 min ahead for six months, 30 min behind for an hour:
// the months are said); Berlin and Vienna alike all year; Tahiti −10, the
// hour of 150° W (the nautical zone of the open sea, common practice), as
// at 40° S, 150° W.
func TestCheckWarnsOfAWrongZone(t *testing.T) {
	path := writeConfig(t, `sites:
  - {id: chatham, name: Chatham Islands, latitude: -43.95, longitude: -176.56, timezone: Pacific/Auckland}
  - {id: lordhowe, name: Lord Howe, latitude: -31.55, longitude: 159.08, timezone: Australia/Sydney}
  - {id: vienna, name: Vienna, latitude: 48.2, longitude: 16.4, timezone: Europe/Berlin}
  - {id: sea, name: At sea, latitude: -40, longitude: -150, timezone: Pacific/Tahiti}
  - {id: utc, name: Vienna in UTC, latitude: 48.2, longitude: 16.4, timezone: UTC}
  - {id: right, name: Chatham, latitude: -43.95, longitude: -176.56, timezone: Pacific/Chatham}
feeds:
  - {id: d, site: chatham, kinds: [sunrise]}
`)
	cfg, err := config.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	got := zoneWarnings(cfg, time.Date(2026, 12, 5, 12, 0, 0, 0, time.UTC))
	want := []string{
		`site "chatham": timezone Pacific/Auckland: the zone in force at 43.9500° S, 176.5600° W is Pacific/Chatham, 45 min ahead of Pacific/Auckland (from 6 Dec 2026); name the site's own zone, or check its latitude and longitude`,
		`site "lordhowe": timezone Australia/Sydney: the zone in force at 31.5500° S, 159.0800° E is Australia/Lord_Howe, 30 min ahead of Australia/Sydney (from 4 Apr 2027); name the site's own zone, or check its latitude and longitude`,
	}
	if strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("warnings:\n%s\nwant:\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
	// and check says it
	code, _, errOut := runCLI(t, "check", "--config", path)
	if code != 0 || !strings.Contains(errOut, "heliocal: warning: site \"chatham\": timezone Pacific/Auckland: the zone in force") {
		t.Errorf("check (exit %d):\n%s\nwant the warning of site chatham", code, errOut)
	}
}

// The difference said is the one that holds longest: at 40° S, 150° W the
// map gives Etc/GMT+10 (UTC−10, the hour of 150° W, common practice). By
// zdump -v (2026–2028): Pacific/Marquesas is −09:30 all year, 30 min
// ahead; America/Adak is HST −10 until 14 Mar 2027, then HDT −9 to
// 7 Nov, 1 h ahead for eight months; America/Anchorage is AKST −9, then
// AKDT −8, 2 h ahead for those months (past the hour the nautical zone is
// allowed: check warns of Anchorage there, not of Adak).
func TestOffsetsDifferAtSea(t *testing.T) {
	now := time.Date(2026, 12, 5, 12, 0, 0, 0, time.UTC)
	sea, _ := time.LoadLocation("Etc/GMT+10")
	for name, want := range map[string]time.Duration{"Pacific/Marquesas": -30 * time.Minute, "America/Adak": -time.Hour,
		"America/Anchorage": -2 * time.Hour, "Pacific/Tahiti": 0} {
		loc, _ := time.LoadLocation(name)
		if _, d := offsetsDiffer(loc, sea, now, now.AddDate(1, 0, 0)); d != want {
			t.Errorf("%s: %v, want %v", name, d, want)
		}
	}
}
