package serve

import "testing"

// An ad-hoc feed's id, from which its entries' UIDs are made, is the one
// cad5212 gave the same query (its AdhocQuery.ID): a subscriber to an
// /at.ics link sees no entry twice after an upgrade. The queries have the
// kinds in the order given and in another (the id sorts them), an
// elevation, a lighting target, an alarm and an offset, a skyline, a
// horizon altitude with a name and UTC times, a zone whose "+" the link
// escapes, and a zone taken from the coordinates. horizon=0 is the one
// query whose id changed on purpose: a level horizon, another feed than
// the flat one it was (TestAdhocHorizonZeroKept).
func TestAdhocIDsKeptFromCad5212(t *testing.T) {
	lim := testLimits()
	for _, tc := range []struct{ query, id string }{
		{"lat=47.5&lon=13.05&tz=Europe/Vienna&kinds=sunrise,sunset,civil-dawn,civil-dusk", "at-c06c2c96bf1e"},
		{"lat=47.5&lon=13.05&tz=Europe/Vienna&kinds=civil-dusk,sunset,civil-dawn,sunrise", "at-c06c2c96bf1e"},
		{"lat=-42.78&lon=147.06&elev=300&tz=Australia/Hobart&kinds=sunrise,sunset,dark-window,photoperiod:12h&lighting=16h&alarm=15m&offsets=sunrise:-30m", "at-984c2f188f64"},
		{"lat=78.22&lon=15.65&tz=Arctic/Longyearbyen&kinds=sunrise,moon-phases&horizon=0:2,120:3,170:6", "at-58f7e15455c7"},
		{"lat=48.2&lon=16.4&tz=Europe/Vienna&kinds=golden-hour,sun-altitude:-3.5&horizon=2&name=Kahlenberg%20Hill&utc=true", "at-3a07fc285961"},
		{"lat=-20&lon=-170&tz=Etc/GMT%2B11&kinds=sunrise", "at-33d43a0cc475"},
		{"lat=22.99&lon=-82.41&kinds=sunrise,full-moon", "at-060057796370"},
		{"lat=47.3&lon=8.5&elev=1150&kinds=sunrise", "at-30c8bde44921"},
	} {
		q, err := parseAdhoc(tc.query, today, lim)
		if err != nil {
			t.Fatalf("%s: %v", tc.query, err)
		}
		if q.ID() != tc.id {
			t.Errorf("%s: id %s, want %s as cad5212 gave it: every entry of its subscribers' calendars would change its UID", tc.query, q.ID(), tc.id)
		}
	}
}
