package main

import (
	"net/http"
	"os"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// The ad-hoc limit as the serving documentation states it: the default
// kinds (sunrise, sunset, civil dawn and dusk) fit under the default 1 MB
// for a year and for the longest window, 400 days, at 47.8° N; six kinds
// (solar noon and golden hour added) for 400 days do not, and the refusal states the size and the limit in MB
// and a number of days that, asked for, fits.
func TestAdhocLimitAsDocumented(t *testing.T) {
	ts := builderServer(t)
	get := func(query string) (int, []byte) {
		t.Helper()
		code, body := status(t, ts.URL+"/at.ics?lat=47.80&lon=13.04&"+query)
		return code, []byte(body)
	}
	// 400 days fitting, a year does too
	var sizes []string // in MB, as docs/serving.md gives them
	for _, days := range []string{"365", "400"} {
		code, b := get("days=" + days)
		if code != http.StatusOK || len(b) >= 1_000_000 {
			t.Errorf("default kinds, %s days: status %d, %d bytes; want 200 under 1 MB", days, code, len(b))
		}
		t.Logf("default kinds, %s days: %d bytes", days, len(b))
		sizes = append(sizes, strconv.FormatFloat(float64(len(b))/1e6, 'f', 2, 64))
	}
	const six = "kinds=sunrise,sunset,civil-dawn,civil-dusk,solar-noon,golden-hour&"
	code, msg := get(six + "days=400")
	m := regexp.MustCompile(`is (\d+\.\d+) MB, over the 1 MB limit per ad-hoc feed .*\bdays=(\d+) should fit`).FindSubmatch(msg)
	if code != http.StatusBadRequest || m == nil {
		t.Fatalf("six kinds, 400 days: status %d, %.200q; want a 400 stating the size in MB and days= that fits", code, msg)
	}
	t.Logf("six kinds, 400 days: %s", msg)
	if code, b := get(six + "days=" + string(m[2])); code != http.StatusOK {
		t.Errorf("days=%s, as the refusal advises: status %d, %q", m[2], code, b[:min(len(b), 200)])
	}
	if size, _ := strconv.ParseFloat(string(m[1]), 64); size <= 1 {
		t.Errorf("refused size %s MB is not over 1 MB", m[1])
	}
	// the refusal is quoted in docs/serving.md word for word
	doc, err := os.ReadFile("../../docs/serving.md")
	if err != nil {
		t.Fatal(err)
	}
	text := strings.Join(strings.Fields(string(doc)), " ")
	if quoted := strings.TrimSpace(string(msg)); !strings.Contains(text, "`"+quoted+"`") {
		t.Errorf("docs/serving.md does not quote the refusal as it is: %q", quoted)
	}
	// and its figures: the default kinds' sizes, the six kinds' size and days
	for _, want := range []string{"(" + sizes[0] + " MB and " + sizes[1] + " MB at 47.8° N)", "(" + string(m[1]) + " MB; `days=" + string(m[2]) + "` fits)"} {
		if !strings.Contains(text, want) {
			t.Errorf("docs/serving.md does not say %q", want)
		}
	}
}
