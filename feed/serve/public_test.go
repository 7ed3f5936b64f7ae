package serve

import (
	"context"
	"encoding/json"
	"net/http"
	"net/http/httptest"
	"net/url"
	"slices"
	"strings"
	"testing"
	"time"
)

// Links are absolute: from the base URL, else from the request's Host, and
// from X-Forwarded-Host/-Proto only when the request comes from a listed
// proxy.
func TestBaseFor(t *testing.T) {
	s, _ := newTestServer(t, Options{})
	req := func(remote, host string, hdr map[string]string) *http.Request {
		r := httptest.NewRequest("GET", "/feeds.json", nil)
		r.RemoteAddr, r.Host = remote, host
		for k, v := range hdr {
			r.Header.Set(k, v)
		}
		return r
	}
	fwd := map[string]string{"X-Forwarded-Host": "sky.example.org", "X-Forwarded-Proto": "https"}
	for _, tc := range []struct {
		base    string
		trusted []string
		r       *http.Request
		want    string
	}{
		{"", nil, req("192.0.2.7:5000", "farm.lan:8080", nil), "http://farm.lan:8080/"},
		{"", nil, req("192.0.2.7:5000", "farm.lan:8080", fwd), "http://farm.lan:8080/"}, // headers from anyone: ignored
		{"", []string{"10.0.0.0/8"}, req("192.0.2.7:5000", "farm.lan:8080", fwd), "http://farm.lan:8080/"},
		{"", []string{"10.0.0.0/8"}, req("10.1.2.3:5000", "farm.lan:8080", fwd), "https://sky.example.org/"},
		{"", []string{"::1"}, req("[::1]:5000", "127.0.0.1:8080", fwd), "https://sky.example.org/"},
		{"", []string{"10.0.0.1"}, req("10.0.0.1:1", "a", map[string]string{"X-Forwarded-Proto": "gopher"}), "http://a/"},
		{"", nil, req("192.0.2.7:5000", "evil\"><script>", nil), "http://localhost/"},
		{"https://sky.example.org/cal", []string{"10.0.0.0/8"}, req("10.1.2.3:5000", "farm.lan", fwd), "https://sky.example.org/cal/"},
	} {
		if err := s.SetPublic(tc.base, tc.trusted); err != nil {
			t.Fatal(err)
		}
		if got := s.baseFor(tc.r); got != tc.want {
			t.Errorf("base %q trusted %v from %s Host %s %v: %q, want %q", tc.base, tc.trusted, tc.r.RemoteAddr, tc.r.Host, tc.r.Header, got, tc.want)
		}
	}
	for _, bad := range []string{"10.0.0.0/33", "farm.lan", ""} {
		if err := s.SetPublic("", []string{bad}); err == nil || !strings.Contains(err.Error(), "trusted_proxies[0]") {
			t.Errorf("trusted proxy %q: err %v, want one naming trusted_proxies[0]", bad, err)
		}
	}
}

// feeds.json carries each feed's absolute url even without a base URL.
func TestFeedsJSONCarriesURL(t *testing.T) {
	s, _ := newTestServer(t, Options{})
	r := httptest.NewRequest("GET", "/feeds.json", nil)
	r.Host = "greenhouse.lan:8080"
	w := httptest.NewRecorder()
	s.Handler().ServeHTTP(w, r)
	var list []struct{ ID, URL string }
	if err := json.Unmarshal(w.Body.Bytes(), &list); err != nil {
		var obj struct{ Feeds []struct{ ID, URL string } }
		if err := json.Unmarshal(w.Body.Bytes(), &obj); err != nil {
			t.Fatalf("feeds.json: %v\n%s", err, w.Body)
		}
		list = obj.Feeds
	}
	if len(list) == 0 {
		t.Fatalf("no feeds in %s", w.Body)
	}
	for _, f := range list {
		if want := "http://greenhouse.lan:8080/" + f.ID + ".ics"; f.URL != want {
			t.Errorf("feed %s: url %q, want %q (beside index.html, as published)", f.ID, f.URL, want)
		}
	}
}

// name, horizon, alarm and lighting reach the builder; tz may be left out.
func TestAdhocExtras(t *testing.T) {
	var got AdhocQuery
	s := adhocServer(t, writes(func(ctx context.Context, q AdhocQuery) ([]byte, error) {
		got = q
		return adhocBytes(ctx, q)
	}))
	// No tz: the zone at the coordinates (Linz, Austria).
	r := get(t, s.Handler(), "GET", "/at.ics?lat=48.3&lon=14.29&kinds=sunrise&name=Fernhollow%20%20Farm&horizon=2.04&alarm=15m&lighting=16h")
	if r.StatusCode != 200 {
		t.Fatalf("status %d: %s", r.StatusCode, body(t, r))
	}
	if got.Location.String() != "Europe/Vienna" || !got.ZoneFound {
		t.Errorf("zone %s (found %v), want Europe/Vienna found from the coordinates", got.Location, got.ZoneFound)
	}
	if got.Name != "Fernhollow Farm" || got.Horizon != 2 || got.Alarm != 15*time.Minute {
		t.Errorf("name %q horizon %v alarm %v", got.Name, got.Horizon, got.Alarm)
	}
	if strings.Join(got.Kinds, ",") != "sunrise,lighting:16h" { // the lamps after the kinds asked for
		t.Errorf("kinds %v, want sunrise, then lighting:16h", got.Kinds)
	}
	for _, part := range []string{"name=Fernhollow+Farm", "horizon=2", "alarm=15m", "kinds=sunrise,lighting:16h"} {
		if !strings.Contains(got.String(), part) {
			t.Errorf("canonical query %q lacks %q", got.String(), part)
		}
	}
}

// horizon takes a skyline too, as azimuth:altitude points: checked, in
// its canonical form (sorted by azimuth, rounded to 0.1°, 360 written 0)
// in the cache key and the feed's id, so that two spellings of one skyline
// share a feed, and a skyline is never confused with a flat horizon.
func TestAdhocSkyline(t *testing.T) {
	lim := testLimits()
	ask := func(horizon string) AdhocQuery {
		t.Helper()
		q, err := parseAdhoc("lat=47.05&lon=11.2&tz=Europe/Vienna&kinds=sunrise&horizon="+url.QueryEscape(horizon), today, lim)
		if err != nil {
			t.Fatalf("horizon=%s: %v", horizon, err)
		}
		return q
	}
	a := ask("360:3, 100:12.04,180:25,270:15")
	want := [][2]float64{{0, 3}, {100, 12}, {180, 25}, {270, 15}}
	if !slices.Equal(a.Skyline, want) || a.Horizon != 0 {
		t.Fatalf("skyline %v horizon %v, want %v", a.Skyline, a.Horizon, want)
	}
	if !strings.Contains(a.String(), "horizon="+url.QueryEscape("0:3,100:12,180:25,270:15")) {
		t.Errorf("canonical query %q lacks the skyline", a.String())
	}
	b := ask("270:15.0,0:3,180:25,100:12")
	if a.String() != b.String() || a.ID() != b.ID() {
		t.Errorf("two spellings of one skyline: %q (%s) and %q (%s)", a.String(), a.ID(), b.String(), b.ID())
	}
	flat, one := ask("3"), ask("0:3")
	if flat.ID() == one.ID() || len(flat.Skyline) != 0 || flat.Horizon != 3 || len(one.Skyline) != 1 {
		t.Errorf("a horizon of 3° and a skyline of one point at 3° share id %s", flat.ID())
	}
	if a.ID() == ask("0:3,100:12,180:25,270:14.9").ID() {
		t.Errorf("two skylines share id %s", a.ID())
	}
	// the canonical form reads back as the same query
	if again := ask(a.skylineText()); again.String() != a.String() {
		t.Errorf("canonical skyline %q reads back as %q", a.String(), again.String())
	}
	// and the server serves it
	s := adhocServer(t, adhocICS)
	if r := get(t, s.Handler(), "GET", "/at.ics?"+a.String()); r.StatusCode != 200 {
		t.Errorf("GET the canonical query: %d %s", r.StatusCode, body(t, r))
	}
}
