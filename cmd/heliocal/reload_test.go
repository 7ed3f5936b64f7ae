package main

import (
	"context"
	"encoding/json"
	"io"
	"net/http"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

const reloadSite = `
sites:
  - id: north-field
    latitude: 47.5
    longitude: 9.7
    timezone: Europe/Zurich
feeds:
  - id: north-sun
    site: north-field
    kinds: [sunrise, sunset]
    days_back: 1
    days_ahead: 20
`

// A SIGHUP that changes base_url and the refresh schedule applies both
// without a restart: the feeds (and ad-hoc feeds) carry the new URL, the
// next refresh follows the new schedule, and Cache-Control its interval. A
// changed service.listen asks for no restart while --listen is given.
// /metrics names the running build.
func TestServeReloadAppliesBaseURLAndSchedule(t *testing.T) {
	path := filepath.Join(t.TempDir(), "sky.yaml")
	write := func(service string) {
		t.Helper()
		if err := os.WriteFile(path, []byte("service:\n"+service+reloadSite), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	write("  base_url: https://a.example.org/cal/\n  refresh: \"15 3 * * *\"\n  refresh_zone: UTC\n")
	addr, logs, stop := serveInBackground(t, "--config", path, "--access-log=false")
	base := "http://" + addr
	fetch := func(p string) (int, http.Header, string) {
		resp, err := http.Get(base + p)
		if err != nil {
			return 0, nil, ""
		}
		defer resp.Body.Close()
		b, _ := io.ReadAll(resp.Body)
		return resp.StatusCode, resp.Header, string(b)
	}
	waitFor(t, logs, "the first build", func() bool { code, _, _ := fetch("/healthz"); return code == http.StatusOK })
	_, h, body := fetch("/feeds/north-sun.ics")
	if !strings.Contains(body, "SOURCE;VALUE=URI:https://a.example.org/cal/north-sun.ics\r\n") || h.Get("Cache-Control") != "public, max-age=86400" {
		t.Fatalf("before the reload: Cache-Control %q, feed:\n%.600s", h.Get("Cache-Control"), body)
	}
	if _, _, m := fetch("/metrics"); !strings.Contains(m, `heliocal_build_info{goversion="go`) || !strings.Contains(m, `version="`+versionString()+`"} 1`) {
		t.Errorf("/metrics lacks heliocal_build_info:\n%s", grepLines(m, "build_info"))
	}

	// service.listen changes too, but --listen is given: a restart would
	// listen where serve does now, so the log must not ask for one.
	write("  base_url: https://b.example.org/\n  refresh: \"@every 2h\"\n  refresh_zone: UTC\n  listen: \"127.0.0.1:1\"\n")
	sendSIGHUP(t)
	waitFor(t, logs, "the reload", func() bool { return strings.Contains(logs.String(), "configuration reloaded") })
	if l := logs.String(); strings.Contains(l, "restart heliocal") || !strings.Contains(l, "--listen is given and stays in force") {
		t.Errorf("a changed service.listen under --listen: the log asks for a restart or does not say --listen stays:\n%s", grepLines(l, "listen"))
	}
	_, h, body = fetch("/feeds/north-sun.ics")
	if !strings.Contains(body, "SOURCE;VALUE=URI:https://b.example.org/north-sun.ics\r\n") || !strings.Contains(body, "REFRESH-INTERVAL;VALUE=DURATION:PT2H\r\n") {
		t.Errorf("after the reload the feed has the old URL or interval:\n%.800s", body)
	}
	if cc := h.Get("Cache-Control"); cc != "public, max-age=7200" {
		t.Errorf("Cache-Control after the reload: %q", cc)
	}
	_, _, adhoc := fetch("/at.ics?lat=47.5&lon=9.7&tz=Europe/Zurich&days=2")
	if !strings.Contains(adhoc, "URL:https://b.example.org/\r\n") {
		t.Errorf("ad-hoc feed after the reload:\n%.800s", adhoc)
	}
	_, _, health := fetch("/healthz")
	var hz struct {
		NextRefresh time.Time `json:"next_refresh"`
	}
	if err := json.Unmarshal([]byte(health), &hz); err != nil {
		t.Fatalf("%v: %s", err, health)
	}
	if until := time.Until(hz.NextRefresh); until <= 0 || until > 2*time.Hour {
		t.Errorf("next refresh %v (in %v), want within the new 2 h schedule", hz.NextRefresh, until)
	}
	if code := stop(); code != 0 {
		t.Errorf("serve exited %d:\n%s", code, logs.String())
	}
}

// With the configuration on standard input a SIGHUP cannot read it again:
// the reload is refused with a message and the feeds stay.
func TestServeReloadFromStdinRefused(t *testing.T) {
	addr := freePort(t)
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	logs := &lockedBuffer{}
	done := make(chan int, 1)
	go func() {
		done <- runWithInput(ctx, []string{"serve", "--config", "-", "--listen", addr, "--access-log=false"},
			strings.NewReader(reloadSite), io.Discard, logs, noEnv)
	}()
	ok := func() bool {
		resp, err := http.Get("http://" + addr + "/feeds/north-sun.ics")
		if err != nil {
			return false
		}
		resp.Body.Close()
		return resp.StatusCode == http.StatusOK
	}
	for deadline := time.Now().Add(60 * time.Second); !ok(); time.Sleep(50 * time.Millisecond) {
		if time.Now().After(deadline) {
			t.Fatalf("timed out waiting for the first build\n%s", logs.String())
		}
	}
	sendSIGHUP(t)
	for deadline := time.Now().Add(30 * time.Second); !strings.Contains(logs.String(), "reload refused: the configuration was read from standard input"); time.Sleep(50 * time.Millisecond) {
		if time.Now().After(deadline) {
			t.Fatalf("no refusal logged\n%s", logs.String())
		}
	}
	if !ok() {
		t.Error("the feed is gone after the refused reload")
	}
	cancel()
	if code := <-done; code != 0 {
		t.Errorf("serve exited %d:\n%s", code, logs.String())
	}
}

func grepLines(s, sub string) string {
	var out []string
	for _, l := range strings.Split(s, "\n") {
		if strings.Contains(l, sub) {
			out = append(out, l)
		}
	}
	return strings.Join(out, "\n")
}

// A feed over max_feed_bytes under oversize: fail is refused by serve as
// by publish: at start serve stops with exit 1 naming the feed and its
// size (so a container crash-loops, as deploy/ says, instead of answering
// 503 "failing" for ever); on a reload the old feeds stay served and
// /healthz (200) gives the refusal among its reasons, as for an invalid
// file.
func TestServeRefusesOversizeFeed(t *testing.T) {
	const refusing = "service:\n  max_feed_bytes: 2000\n  oversize: fail\n"
	refused := "feed north-sun: "
	over := "over service.max_feed_bytes (2 kB)"

	path := filepath.Join(t.TempDir(), "sky.yaml")
	if err := os.WriteFile(path, []byte(refusing+reloadSite), 0o644); err != nil {
		t.Fatal(err)
	}
	code, logs, last := serveExits(t, "--config", path, "--access-log=false")
	if code != exitFailure || !strings.HasPrefix(last, "heliocal: ") || !strings.Contains(last, refused) || !strings.Contains(last, over) {
		t.Errorf("serve exited %d, last line %q; want %d naming %q and %q", code, last, exitFailure, refused, over)
	}
	// nothing was served: the log does not speak of previous feeds
	if strings.Contains(logs.String(), "previous feeds") || !strings.Contains(logs.String(), "no feeds to serve yet") {
		t.Errorf("the first build's failure is logged as:\n%s", logs.String())
	}

	// a reload to the refusing file keeps the old feeds
	if err := os.WriteFile(path, []byte(reloadSite), 0o644); err != nil {
		t.Fatal(err)
	}
	addr, logs, stop := serveInBackground(t, "--config", path, "--access-log=false")
	health := func() (int, string) {
		resp, err := http.Get("http://" + addr + "/healthz")
		if err != nil {
			return 0, ""
		}
		defer resp.Body.Close()
		b, _ := io.ReadAll(resp.Body)
		return resp.StatusCode, string(b)
	}
	waitFor(t, logs, "the first build", func() bool { code, _ := health(); return code == http.StatusOK })
	if err := os.WriteFile(path, []byte(refusing+reloadSite), 0o644); err != nil {
		t.Fatal(err)
	}
	sendSIGHUP(t)
	waitFor(t, logs, "the refused reload", func() bool { _, b := health(); return strings.Contains(b, "failed to build") })
	code, body := health()
	if code != http.StatusOK || !strings.Contains(body, refused) || !strings.Contains(body, over) || strings.Count(body, "failed to build") != 1 {
		t.Errorf("/healthz after the refused reload: %d %s", code, body)
	}
	// one line of error for one reload, saying what happened
	if n := strings.Count(logs.String(), "level=ERROR"); n != 1 || !strings.Contains(logs.String(), "reload failed: the new configuration's feeds did not build") {
		t.Errorf("%d error lines for the reload:\n%s", n, logs.String())
	}
	if resp, err := http.Get("http://" + addr + "/feeds/north-sun.ics"); err != nil || resp.StatusCode != http.StatusOK {
		t.Errorf("the old feed is not served: %v", err)
	} else {
		resp.Body.Close()
	}
	if code := stop(); code != 0 {
		t.Errorf("serve exited %d:\n%s", code, logs.String())
	}
}

// A configuration file removed before a SIGHUP is said to be unreadable,
// not invalid; the feeds stay served, /healthz names the file, and the
// file put back is reloaded.
func TestServeReloadFileRemoved(t *testing.T) {
	path := filepath.Join(t.TempDir(), "sky.yaml")
	if err := os.WriteFile(path, []byte(reloadSite), 0o644); err != nil {
		t.Fatal(err)
	}
	addr, logs, stop := serveInBackground(t, "--config", path, "--access-log=false")
	fetch := fetcher(addr)
	waitFor(t, logs, "the first build", func() bool { code, _ := fetch("/healthz"); return code == http.StatusOK })
	if err := os.Rename(path, path+".moved"); err != nil {
		t.Fatal(err)
	}
	sendSIGHUP(t)
	const refused = `msg="reload refused: the configuration file cannot be read; still serving the old feeds" err="--config ` // then the path
	waitFor(t, logs, "the refusal", func() bool { return strings.Contains(logs.String(), refused) })
	if l := logs.String(); !strings.Contains(l, path+`: no such file"`) || strings.Contains(l, "is invalid") {
		t.Errorf("the refusal does not name the missing file, or calls it invalid:\n%s", grepLines(l, "reload"))
	}
	if code, _ := fetch("/feeds/north-sun.ics"); code != http.StatusOK {
		t.Errorf("the feed after the refused reload: %d", code)
	}
	if _, h := fetch("/healthz"); !strings.Contains(h, `"degraded"`) || !strings.Contains(h, "no such file") {
		t.Errorf("/healthz after the refused reload:\n%s", h)
	}
	if err := os.Rename(path+".moved", path); err != nil {
		t.Fatal(err)
	}
	sendSIGHUP(t)
	waitFor(t, logs, "the reload", func() bool { return strings.Contains(logs.String(), "configuration reloaded") })
	if code := stop(); code != 0 {
		t.Errorf("serve exited %d:\n%s", code, logs.String())
	}
}
