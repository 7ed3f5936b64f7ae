package feed

import "testing"

// A site's conditions in words, as the events table's heading and the
// index's place line give them. The minus is U+2212, as every altitude in
// the texts is written (Unicode "MINUS SIGN" for negative numbers, common
// typographic practice); a skyline that dips below eye level has its range
// written out, since "−1–3°" reads as two minus signs.
func TestSiteConditions(t *testing.T) {
	for _, tc := range []struct {
		site Site
		want string
	}{
		{Site{}, ""},
		{Site{Horizon: 1.5}, "horizon 1.5°"},
		{Site{Horizon: -0.8}, "horizon −0.8°"},
		{Site{Skyline: SkylineFacts{Low: 1, High: 14, Points: 8, File: "hills.csv"}}, "skyline 1–14° (8 points, hills.csv)"},
		{Site{Skyline: SkylineFacts{Low: -1, High: 3, Points: 4}}, "skyline −1° to 3° (4 points)"},
		{Site{Skyline: SkylineFacts{Low: -2.5, High: -0.5, Points: 2}, Pressure: 1030, Temperature: -20}, "skyline −2.5° to −0.5° (2 points), refraction for 1030 hPa and −20 °C"},
		{Site{Horizon: 2, Pressure: 910, Temperature: -5}, "horizon 2°, refraction for 910 hPa and −5 °C"},
	} {
		if got := tc.site.Conditions(); got != tc.want {
			t.Errorf("%+v: %q, want %q", tc.site, got, tc.want)
		}
	}
}
