package serve

import (
	"errors"
	"fmt"
	"net/url"
	"strconv"
	"strings"
	"testing"

	"heliocal/config"
)

// siteKeyHint is the hint of the one problem of a configuration whose site
// sets key (latitude, longitude, elevation) to value, written as YAML has
// it: a number bare, anything else in quotes.
func siteKeyHint(t *testing.T, key, value string) string {
	t.Helper()
	if _, err := strconv.ParseFloat(value, 64); err != nil {
		value = strconv.Quote(value)
	}
	site := map[string]string{"latitude": "1", "longitude": "2", "elevation": "0"}
	site[key] = value
	in := fmt.Sprintf("sites:\n  - {id: x, latitude: %s, longitude: %s, elevation: %s, timezone: UTC}\nfeeds:\n  - {id: f, site: x, kinds: [sunrise]}\n",
		site["latitude"], site["longitude"], site["elevation"])
	_, err := config.Parse(strings.NewReader(in), "yaml")
	var ve *config.ValidationError
	if !errors.As(err, &ve) || len(ve.Problems) != 1 {
		t.Fatalf("%s: %v, want one problem", in, err)
	}
	return ve.Problems[0].Hint
}

// An ad-hoc feed's lat, lon or elev that is no number, or out of range,
// gets the hint the configuration gives its site's key for the same value,
// in the same words.
func TestAdhocPlaceHintsAsConfiguration(t *testing.T) {
	lim := testLimits()
	for _, tc := range []struct{ param, key, value string }{
		{ParamLatitude, "latitude", "33°27′S"},
		{ParamLatitude, "latitude", "95"},
		{ParamLongitude, "longitude", "70°40′W"},
		{ParamLongitude, "longitude", "-181"},
		{ParamElevation, "elevation", "120 m"},
		{ParamElevation, "elevation", "high"},
		{ParamElevation, "elevation", "12000"},
	} {
		hint := siteKeyHint(t, tc.key, tc.value)
		q := url.Values{ParamLatitude: {"47"}, ParamLongitude: {"13"}, ParamZone: {"UTC"}, ParamKinds: {"sunrise"}}
		q.Set(tc.param, tc.value)
		_, err := parseAdhoc(q.Encode(), today, lim)
		if err == nil || !strings.HasSuffix(err.Error(), " ("+hint+")") {
			t.Errorf("%s=%s: %v, want the hint of %s: %s (%s)", tc.param, tc.value, err, tc.key, tc.value, hint)
		}
	}
}
