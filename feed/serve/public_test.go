package serve

import (
	"context"
	"encoding/json"
	"net/http"
	"net/http/httptest"
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
		if !strings.HasPrefix(f.URL, "http://greenhouse.lan:8080/feeds/") {
			t.Errorf("feed %s: url %q, want it under http://greenhouse.lan:8080/feeds/", f.ID, f.URL)
		}
	}
}

// name, horizon, alarm and lighting reach the builder; tz may be left out.
func TestAdhocExtras(t *testing.T) {
	var got AdhocQuery
	s := adhocServer(t, func(ctx context.Context, q AdhocQuery, _ []byte) ([]byte, error) {
		got = q
		return adhocICS(ctx, q, nil)
	})
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
	if strings.Join(got.Kinds, ",") != "lighting:16h,sunrise" {
		t.Errorf("kinds %v, want lighting:16h and sunrise", got.Kinds)
	}
	for _, part := range []string{"name=Fernhollow+Farm", "horizon=2", "alarm=15m", "kinds=lighting:16h,sunrise"} {
		if !strings.Contains(got.String(), part) {
			t.Errorf("canonical query %q lacks %q", got.String(), part)
		}
	}
}
