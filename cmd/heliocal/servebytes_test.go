package main

import (
	"bytes"
	"compress/gzip"
	"io"
	"net/http"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// serve holds each feed in its gzip form alone, and a client that does not
// take gzip gets the feed inflated: byte for byte the file publish writes
// for the same configuration, with its length; a client that takes gzip
// gets the same bytes compressed. Publish runs before and after serve
// builds, and each feed served must be one of the two it wrote (the window
// moves at midnight).
func TestServedFeedsArePublished(t *testing.T) {
	t.Chdir(t.TempDir())
	const base = "https://sky.example.org/"
	publishDir := func(dir string) string {
		t.Helper()
		if code, _, errOut := runCLI(t, "publish", "--quiet", "--base-url", base, "--out", dir); code != 0 {
			t.Fatalf("publish: exit %d: %s", code, errOut)
		}
		return dir
	}
	before := publishDir("before")
	addr, logs, stop := serveInBackground(t, "--access-log=false", "--base-url", base)
	fetch := fetcher(addr)
	waitFor(t, logs, "the first build", func() bool { code, _ := fetch("/healthz"); return code == http.StatusOK })
	after := publishDir("after")

	feeds, err := filepath.Glob(filepath.Join(before, "*.ics"))
	if err != nil || len(feeds) == 0 {
		t.Fatalf("publish wrote no feeds: %v", err)
	}
	client := &http.Client{Transport: &http.Transport{DisableCompression: true}}
	defer client.CloseIdleConnections()
	do := func(method, path, acceptEncoding string) (*http.Response, []byte) {
		t.Helper()
		req, err := http.NewRequest(method, "http://"+addr+path, nil)
		if err != nil {
			t.Fatal(err)
		}
		if acceptEncoding != "" {
			req.Header.Set("Accept-Encoding", acceptEncoding)
		}
		resp, err := client.Do(req)
		if err != nil {
			t.Fatal(err)
		}
		defer resp.Body.Close()
		b, err := io.ReadAll(resp.Body)
		if err != nil {
			t.Fatal(err)
		}
		return resp, b
	}
	for _, p := range feeds {
		name := filepath.Base(p)
		want := map[string]bool{}
		for _, dir := range []string{before, after} {
			b, err := os.ReadFile(filepath.Join(dir, name))
			if err != nil {
				t.Fatal(err)
			}
			want[string(b)] = true
		}
		resp, got := do("GET", "/"+name, "")
		if resp.StatusCode != http.StatusOK || resp.Header.Get("Content-Encoding") != "" || !want[string(got)] {
			t.Errorf("%s without gzip: %d, Content-Encoding %q, %d bytes that are not the file publish wrote",
				name, resp.StatusCode, resp.Header.Get("Content-Encoding"), len(got))
			continue
		}
		if cl := resp.Header.Get("Content-Length"); cl != strconv.Itoa(len(got)) {
			t.Errorf("%s without gzip: Content-Length %q, want %d", name, cl, len(got))
		}
		if head, _ := do("HEAD", "/"+name, ""); head.Header.Get("Content-Length") != strconv.Itoa(len(got)) {
			t.Errorf("%s, HEAD without gzip: Content-Length %q, want %d", name, head.Header.Get("Content-Length"), len(got))
		}
		resp, gz := do("GET", "/"+name, "gzip")
		if resp.Header.Get("Content-Encoding") != "gzip" {
			t.Errorf("%s with gzip: Content-Encoding %q", name, resp.Header.Get("Content-Encoding"))
			continue
		}
		zr, err := gzip.NewReader(bytes.NewReader(gz))
		if err != nil {
			t.Fatalf("%s with gzip: %v", name, err)
		}
		if inflated, err := io.ReadAll(zr); err != nil || !bytes.Equal(inflated, got) {
			t.Errorf("%s with gzip: %d bytes (%v), not the %d served without it", name, len(inflated), err, len(got))
		}
	}
	if !strings.Contains(logs.String(), "feeds refreshed") {
		t.Errorf("no build logged:\n%s", logs.String())
	}
	if code := stop(); code != 0 {
		t.Errorf("serve exited %d:\n%s", code, logs.String())
	}
}
