package serve

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"strings"
	"testing"
	"time"

	"heliocal/config"
	"heliocal/feed/publish"
)

// /healthz says "degraded", with the reason, after a refused reload (until
// a reload succeeds) and while the feeds are older than two refresh
// periods; /metrics counts the refused reloads. The clock is injected.
func TestHealthDegraded(t *testing.T) {
	reg := NewRegistry()
	b := &builder{b: testBundle("a")}
	s, err := New(Options{Build: b.build, Logger: quiet(), Metrics: reg,
		Schedule: "15 3 * * *", ScheduleZone: time.UTC})
	if err != nil {
		t.Fatal(err)
	}
	clock := time.Date(2026, 12, 2, 3, 15, 0, 0, time.UTC)
	s.now = func() time.Time { return clock }
	if err := s.Refresh(t.Context()); err != nil {
		t.Fatal(err)
	}
	h := s.Handler()
	check := func(when, wantStatus string, wantReasons ...string) {
		t.Helper()
		r := get(t, h, "GET", "/healthz")
		var hb health
		if err := json.Unmarshal([]byte(body(t, r)), &hb); err != nil {
			t.Fatal(err)
		}
		if r.StatusCode != 200 || hb.Status != wantStatus || len(hb.Reasons) != len(wantReasons) {
			t.Errorf("%s: healthz %d %q %q, want 200 %q with %d reasons", when, r.StatusCode, hb.Status, hb.Reasons, wantStatus, len(wantReasons))
			return
		}
		for i, want := range wantReasons {
			if !strings.Contains(hb.Reasons[i], want) {
				t.Errorf("%s: reason %q does not say %q", when, hb.Reasons[i], want)
			}
		}
	}
	refused := func(want string) {
		t.Helper()
		if out := body(t, get(t, h, "GET", "/metrics")); !strings.Contains(out, "heliocal_reloads_refused_total "+want+"\n") {
			t.Errorf("/metrics lacks heliocal_reloads_refused_total %s", want)
		}
	}
	check("after a build", "ok")
	refused("0")

	s.RefuseReload(errors.New("heliocal.yaml: sites[0].latitude: 95: must be within -90..90\nmore lines"))
	check("after a refused reload", "degraded",
		"configuration reload refused at 2026-12-02T03:15:00Z, still serving the previous configuration: heliocal.yaml: sites[0].latitude: 95: must be within -90..90")
	refused("1")
	// A scheduled refresh of the old configuration does not hide it.
	if err := s.Refresh(t.Context()); err != nil {
		t.Fatal(err)
	}
	check("after a refresh", "degraded", "reload refused")

	err = s.Reload(t.Context(), func(context.Context, GzipFunc) (*publish.Bundle, error) {
		return nil, errors.New("ical: encoder failed")
	})
	if err == nil {
		t.Fatal("a failing reload succeeded")
	}
	refused("2")
	// The last build failed: stale, with the reload named as the reason.
	check("right after a failed reload", "stale",
		"configuration reload at 2026-12-02T03:15:00Z failed to build, still serving the previous configuration: ical: encoder failed")
	if err := s.Refresh(t.Context()); err != nil {
		t.Fatal(err)
	}
	check("after a failed reload and a refresh", "degraded",
		"configuration reload at 2026-12-02T03:15:00Z failed to build, still serving the previous configuration: ical: encoder failed")

	if err := s.Reload(t.Context(), b.build); err != nil {
		t.Fatal(err)
	}
	check("after a good reload", "ok")
	refused("2")

	// The schedule runs every 24 h: feeds 47 h old are fine, 49 h old are not.
	clock = clock.Add(47 * time.Hour)
	check("47 h after the last build", "ok")
	clock = clock.Add(2 * time.Hour)
	check("49 h after the last build", "degraded", "feeds last built 49h0m0s ago, more than two refresh periods (24h0m0s each)")
	if err := s.Refresh(t.Context()); err != nil {
		t.Fatal(err)
	}
	check("after a refresh", "ok")
}

// A reload refused because several feeds are over service.max_feed_bytes
// (publish joins one error per feed, each a line of the log) names every
// one of them on /healthz, in its reason and last_error, not only the
// first; so many that the line would be long are counted, with the first.
func TestHealthNamesEveryOversizeFeed(t *testing.T) {
	refusals := func(ids ...string) []error {
		errs := make([]error, len(ids))
		for i, id := range ids { // as publish's renderOne wraps them
			errs[i] = fmt.Errorf("publish: feed %s: %w", id, &publish.OversizeError{Feed: id, Bytes: 1_200_000, Limit: 1_000_000})
		}
		return errs
	}
	refusal := func(ids ...string) error { return errors.Join(refusals(ids...)...) }
	over := (&publish.OversizeError{Bytes: 1_200_000, Limit: 1_000_000}).Error()
	for _, tc := range []struct {
		name string
		err  error
		want string
	}{
		{"two feeds", refusal("plot-sun", "barn-moon"),
			"publish: feed plot-sun: " + over + "; publish: feed barn-moon: " + over},
		{"ten feeds", refusal("f0", "f1", "f2", "f3", "f4", "f5", "f6", "f7", "f8", "f9"),
			"10 feeds over service.max_feed_bytes, the first: publish: feed f0: " + over},
		// publish stops at a feed that fails otherwise, with those refused before it
		{"ten errors, one not of size", errors.Join(append(refusals("f0", "f1", "f2", "f3", "f4", "f5", "f6", "f7", "f8"), errors.New("publish: feed f9: ical: encoder failed"))...),
			"10 errors, the first: publish: feed f0: " + over},
	} {
		t.Run(tc.name, func(t *testing.T) {
			s := builtAt(t, time.Date(2026, 12, 2, 3, 15, 0, 0, time.UTC))
			if s.Reload(t.Context(), func(context.Context, GzipFunc) (*publish.Bundle, error) { return nil, tc.err }) == nil {
				t.Fatal("a failing reload succeeded")
			}
			hb := healthOf(t, s)
			reason := "configuration reload at 2026-12-02T03:15:00Z failed to build, still serving the previous configuration: " + tc.want
			if len(hb.Reasons) != 1 || hb.Reasons[0] != reason {
				t.Errorf("reasons %q\nwant [%q]", hb.Reasons, reason)
			}
			if hb.LastError != tc.want {
				t.Errorf("last_error %q\nwant %q", hb.LastError, tc.want)
			}
		})
	}
}

// A reload refused because the new configuration is invalid names every
// problem config found on /healthz, in its reason, as the log lists them;
// so many that the line would be long are counted, with the first.
func TestHealthNamesEveryConfigProblem(t *testing.T) {
	const site = "  - {id: s%d, name: S, latitude: %s, longitude: %s, timezone: Europe/Zurich}\n"
	invalid := func(sites string) error {
		_, err := config.Parse(strings.NewReader("sites:\n"+sites+"feeds:\n  - {id: f, site: s0, kinds: [sunrise]}\n"), "yaml")
		var ve *config.ValidationError
		if !errors.As(err, &ve) {
			t.Fatalf("not a configuration's problems: %v", err)
		}
		ve.Source = "heliocal.yaml" // as config.Load names the file
		return ve
	}
	var many strings.Builder
	for i := range 30 {
		fmt.Fprintf(&many, site, i, "95", "9.7")
	}
	two, thirty, one := invalid(fmt.Sprintf(site, 0, "95", "200")), invalid(many.String()), invalid(fmt.Sprintf(site, 0, "95", "9.7"))
	// each problem as the log's line gives it, with the file's name
	lines := strings.Split(two.Error(), "\n")
	if len(lines) != 2 || !strings.HasPrefix(lines[0], "heliocal.yaml:2: sites[0].latitude: 95: must be within -90..90") || !strings.HasPrefix(lines[1], "heliocal.yaml:2: sites[0].longitude: 200: ") {
		t.Fatalf("the problems of a latitude 95 and a longitude 200:\n%v", two)
	}
	lat, lon := lines[0], lines[1]
	for _, tc := range []struct {
		name string
		err  error
		want string
	}{
		{"two problems", two, lat + "; " + lon},
		{"thirty problems", thirty, "30 problems, the first: " + lat},
		{"one problem", one, lat},
	} {
		t.Run(tc.name, func(t *testing.T) {
			s := builtAt(t, time.Date(2026, 12, 2, 3, 15, 0, 0, time.UTC))
			s.RefuseReload(tc.err)
			hb := healthOf(t, s)
			reason := "configuration reload refused at 2026-12-02T03:15:00Z, still serving the previous configuration: " + tc.want
			if len(hb.Reasons) != 1 || hb.Reasons[0] != reason {
				t.Errorf("reasons %q\nwant [%q]", hb.Reasons, reason)
			}
		})
	}
}

// builtAt is a server refreshed daily at 03:15 UTC whose clock stands at
// now, after its first build.
func builtAt(t *testing.T, now time.Time) *Server {
	t.Helper()
	s, err := New(Options{Build: (&builder{b: testBundle("a")}).build, Logger: quiet(), Metrics: NewRegistry(),
		Schedule: "15 3 * * *", ScheduleZone: time.UTC})
	if err != nil {
		t.Fatal(err)
	}
	s.now = func() time.Time { return now }
	if err := s.Refresh(t.Context()); err != nil {
		t.Fatal(err)
	}
	return s
}

// healthOf is the body of s's /healthz.
func healthOf(t *testing.T, s *Server) health {
	t.Helper()
	var hb health
	if err := json.Unmarshal([]byte(body(t, get(t, s.Handler(), "GET", "/healthz"))), &hb); err != nil {
		t.Fatal(err)
	}
	return hb
}
