package main

import (
	"strings"
	"testing"
	"time"
)

func TestLoopbackOnly(t *testing.T) {
	for _, u := range []string{
		"http://127.0.0.1:8080/feeds/a.ics",
		"http://127.8.9.10/at.ics",
		"http://[::1]:8080/",
		"http://localhost:18080/feeds.json",
	} {
		if err := loopbackOnly(u); err != nil {
			t.Errorf("loopbackOnly(%q) = %v, want accepted", u, err)
		}
	}
	for _, u := range []string{
		"http://192.168.1.10:8080/feeds/a.ics",
		"http://10.0.0.1/",
		"http://sky.example.org/feeds/a.ics",
		"http://0.0.0.0:8080/",
		"https://127.0.0.1/",
		"http://[::ffff:8.8.8.8]/",
		"ftp://127.0.0.1/",
		"http://127.0.0.1.example.org/",
	} {
		if err := loopbackOnly(u); err == nil || !strings.Contains(err.Error(), u) {
			t.Errorf("loopbackOnly(%q) = %v, want refused naming the URL", u, err)
		}
	}
}

func TestPercentile(t *testing.T) {
	// Nearest-rank percentiles of 1..100 ms are 50 ms and 99 ms.
	var sorted []time.Duration
	for i := 1; i <= 100; i++ {
		sorted = append(sorted, time.Duration(i)*time.Millisecond)
	}
	if p := pct(sorted, 50); p != 50*time.Millisecond {
		t.Errorf("p50 = %v, want 50ms", p)
	}
	if p := pct(sorted, 99); p != 99*time.Millisecond {
		t.Errorf("p99 = %v, want 99ms", p)
	}
	if p := pct(sorted[:1], 99); p != time.Millisecond {
		t.Errorf("p99 of one sample = %v, want 1ms", p)
	}
}
