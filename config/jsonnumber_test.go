package config

import (
	"strings"
	"testing"
)

// TestJSONNumberShownAsWritten: a number where text belongs in a JSON file
// is named in the problem as the file writes it (20270612, not
// 2.0270612e+07), as YAML's is; the values are those of the document below.
func TestJSONNumberShownAsWritten(t *testing.T) {
	doc := `{"sites": [{"id": "a", "name": 1234567, "latitude": 47.5, "longitude": 9.7, "timezone": "Europe/Zurich"}],
"feeds": [{"id": "f", "site": "a", "kinds": [{"kind": "sunset", "dates": [20270612, 0.5, -42, 1e300]}]}]}`
	_, err := Parse(strings.NewReader(doc), "json")
	if err == nil {
		t.Fatal("no error")
	}
	got := problemsByPath(t, err)
	for path, want := range map[string]string{
		"sites[0].name":              "1234567",
		"feeds[0].kinds[0].dates[0]": "20270612",
		"feeds[0].kinds[0].dates[1]": "0.5",
		"feeds[0].kinds[0].dates[2]": "-42",
		"feeds[0].kinds[0].dates[3]": "1e+300",
	} {
		if got[path].Value != want {
			t.Errorf("%s: value %q, want %q\n%v", path, got[path].Value, want, err)
		}
	}
}
