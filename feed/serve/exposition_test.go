package serve

import (
	"bytes"
	"compress/gzip"
	"errors"
	"io"
	"math"
	"os"
	"os/exec"
	"regexp"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	dto "github.com/prometheus/client_model/go"
	"github.com/prometheus/common/expfmt"
	"github.com/prometheus/common/model"
)

// /metrics is read back by Prometheus's own parser of the text format
// (github.com/prometheus/common/expfmt, in the tests only): every metric
// docs/serving.md names is there with its type and labels, the histograms'
// buckets are cumulative and end at +Inf with the count, and the process's
// and the Go runtime's metrics that dashboards and alerts use are there
// with plausible values.
func TestMetricsExposition(t *testing.T) {
	reg, err := registry(nil) // as New makes it: with the process's and the runtime's metrics
	if err != nil {
		t.Fatal(err)
	}
	s, b := newTestServer(t, Options{Adhoc: adhocICS, Metrics: reg, Version: "1.2.3", Revision: "abc"})
	h := s.Handler()
	get(t, h, "GET", "/feeds/meadowbrook-sun.ics")
	get(t, h, "GET", "/at.ics?lat=45&lon=0&tz=UTC&kinds=sunrise")
	b.set(nil, errors.New("boom"))
	s.Refresh(t.Context())
	resp := get(t, h, "GET", "/metrics")
	if ct := resp.Header.Get("Content-Type"); !strings.HasPrefix(ct, "text/plain; version=0.0.4") {
		t.Errorf("Content-Type %q", ct)
	}
	text := body(t, resp)
	parser := expfmt.NewTextParser(model.UTF8Validation)
	fams, err := parser.TextToMetricFamilies(strings.NewReader(text))
	if err != nil {
		t.Fatalf("the text format does not parse: %v\n%s", err, text)
	}
	want := map[string]dto.MetricType{
		"heliocal_reloads_refused_total":                  dto.MetricType_COUNTER,
		"heliocal_http_requests_total":                    dto.MetricType_COUNTER,
		"heliocal_http_request_duration_seconds":          dto.MetricType_HISTOGRAM,
		"heliocal_refresh_duration_seconds":               dto.MetricType_HISTOGRAM,
		"heliocal_refreshes_total":                        dto.MetricType_COUNTER,
		"heliocal_refresh_last_success_timestamp_seconds": dto.MetricType_GAUGE,
		"heliocal_refresh_last_successful":                dto.MetricType_GAUGE,
		"heliocal_feeds":                                  dto.MetricType_GAUGE,
		"heliocal_events":                                 dto.MetricType_GAUGE,
		"heliocal_build_info":                             dto.MetricType_GAUGE,
		"heliocal_adhoc_cache_total":                      dto.MetricType_COUNTER,
		"heliocal_adhoc_build_duration_seconds":           dto.MetricType_HISTOGRAM,
		"process_cpu_seconds_total":                       dto.MetricType_COUNTER,
		"process_resident_memory_bytes":                   dto.MetricType_GAUGE,
		"process_virtual_memory_bytes":                    dto.MetricType_GAUGE,
		"process_open_fds":                                dto.MetricType_GAUGE,
		"process_max_fds":                                 dto.MetricType_GAUGE,
		"process_start_time_seconds":                      dto.MetricType_GAUGE,
		"go_goroutines":                                   dto.MetricType_GAUGE,
		"go_threads":                                      dto.MetricType_GAUGE,
		"go_info":                                         dto.MetricType_GAUGE,
		"go_gc_duration_seconds":                          dto.MetricType_SUMMARY,
		"go_memstats_alloc_bytes":                         dto.MetricType_GAUGE,
		"go_memstats_heap_inuse_bytes":                    dto.MetricType_GAUGE,
		"go_memstats_sys_bytes":                           dto.MetricType_GAUGE,
	}
	for name, typ := range want {
		f, ok := fams[name]
		if !ok {
			t.Errorf("/metrics lacks %s", name)
			continue
		}
		if f.GetType() != typ {
			t.Errorf("%s: type %v, want %v", name, f.GetType(), typ)
		}
	}
	// every metric docs/serving.md names is served
	doc, err := os.ReadFile("../../docs/serving.md")
	if err != nil {
		t.Fatal(err)
	}
	for _, name := range regexp.MustCompile("`(heliocal_[a-z_]+)").FindAllStringSubmatch(string(doc), -1) {
		if _, ok := fams[name[1]]; !ok && name[1] != "heliocal_serve" {
			t.Errorf("docs/serving.md names %s, which /metrics does not serve", name[1])
		}
	}
	labels := func(m *dto.Metric) map[string]string {
		l := map[string]string{}
		for _, p := range m.GetLabel() {
			l[p.GetName()] = p.GetValue()
		}
		return l
	}
	// every value of the refreshes' labels is named where docs/serving.md
	// gives the metric
	refreshes := regexp.MustCompile("`heliocal_refreshes_total\\{trigger,result\\}` \\(([^)]*)\\)").FindSubmatch(doc)
	if refreshes == nil {
		t.Error("docs/serving.md does not say what the labels of heliocal_refreshes_total are")
	} else {
		for _, m := range fams["heliocal_refreshes_total"].GetMetric() {
			for name, value := range labels(m) {
				if !bytes.Contains(refreshes[1], []byte("`"+value+"`")) {
					t.Errorf("docs/serving.md does not name the %s %q of heliocal_refreshes_total", name, value)
				}
			}
		}
	}
	found := false
	for _, m := range fams["heliocal_http_requests_total"].GetMetric() {
		if l := labels(m); l["route"] == "feed" && l["code"] == "200" {
			found = m.GetCounter().GetValue() == 1
		}
	}
	if !found {
		t.Error(`heliocal_http_requests_total{route="feed",code="200"} is not 1`)
	}
	if l := labels(fams["heliocal_build_info"].GetMetric()[0]); l["version"] != "1.2.3" || l["revision"] != "abc" || !strings.HasPrefix(l["goversion"], "go") {
		t.Errorf("heliocal_build_info labels %v", l)
	}
	for name, f := range fams {
		if f.GetType() != dto.MetricType_HISTOGRAM {
			continue
		}
		for _, m := range f.GetMetric() {
			h := m.GetHistogram()
			var last uint64
			for _, bk := range h.GetBucket() {
				if bk.GetCumulativeCount() < last {
					t.Errorf("%s %v: buckets not cumulative", name, labels(m))
				}
				last = bk.GetCumulativeCount()
			}
			// the parser keeps +Inf's count as the sample count
			if last > h.GetSampleCount() {
				t.Errorf("%s %v: buckets count %d, more than the count %d", name, labels(m), last, h.GetSampleCount())
			}
		}
	}
	// the first build and the failed refresh
	if got := fams["heliocal_refresh_duration_seconds"].GetMetric()[0].GetHistogram().GetSampleCount(); got != 2 {
		t.Errorf("heliocal_refresh_duration_seconds_count %d, want 2", got)
	}
	if !strings.Contains(text, `heliocal_refresh_duration_seconds_bucket{le="+Inf"} 2`+"\n") {
		t.Error("no +Inf bucket holding both rebuilds")
	}
	if v := fams["process_resident_memory_bytes"].GetMetric()[0].GetGauge().GetValue(); !(v > 1<<20) {
		t.Errorf("process_resident_memory_bytes %v", v)
	}
	if v := fams["process_start_time_seconds"].GetMetric()[0].GetGauge().GetValue(); !(v > 1.7e9 && v < 4e9) {
		t.Errorf("process_start_time_seconds %v", v)
	}
	if v := fams["go_goroutines"].GetMetric()[0].GetGauge().GetValue(); !(v >= 1) || math.IsInf(v, 0) {
		t.Errorf("go_goroutines %v", v)
	}
}

// The server does not link the Prometheus client library: its package
// initialisation would run in every command of the program.
func TestNoPrometheusClient(t *testing.T) {
	goTool, err := exec.LookPath("go")
	if err != nil {
		t.Skip("go tool not found")
	}
	out, err := exec.Command(goTool, "list", "-deps", "../../cmd/heliocal").CombinedOutput()
	if err != nil {
		t.Fatalf("go list: %v\n%s", err, out)
	}
	for _, p := range strings.Fields(string(out)) {
		if strings.HasPrefix(p, "github.com/prometheus/") {
			t.Errorf("cmd/heliocal depends on %s", p)
		}
	}
}

// While requests are observed, every scrape's histogram has its +Inf
// bucket equal to its _count (the text format's rule), and neither a count
// nor a counter goes down from one scrape to the next (run with -race in
// .ci/run).
func TestMetricsScrapedWhileObserved(t *testing.T) {
	reg := NewRegistry()
	m, err := newMetrics(reg)
	if err != nil {
		t.Fatal(err)
	}
	stop := make(chan struct{})
	done := make(chan struct{})
	for g := range 2 {
		go func() {
			defer func() { done <- struct{}{} }()
			for i := 0; ; i++ {
				select {
				case <-stop:
					return
				default:
				}
				m.request(routeFeed, 200, time.Duration(g*i%50)*time.Millisecond)
			}
		}()
	}
	inf := regexp.MustCompile(`(?m)^heliocal_http_request_duration_seconds_bucket\{route="feed",le="\+Inf"\} (\S+)$`)
	count := regexp.MustCompile(`(?m)^heliocal_http_request_duration_seconds_count\{route="feed"\} (\S+)$`)
	total := regexp.MustCompile(`(?m)^heliocal_http_requests_total\{code="200",route="feed"\} (\S+)$`)
	var lastCount, lastTotal float64
	for range 200 {
		text := string(reg.WriteText(nil))
		num := func(re *regexp.Regexp) float64 {
			mm := re.FindStringSubmatch(text)
			if mm == nil {
				t.Fatalf("no line matching %s in\n%s", re, text)
			}
			n, err := strconv.ParseFloat(mm[1], 64)
			if err != nil {
				t.Fatal(err)
			}
			return n
		}
		c, tot := num(count), num(total)
		if i := num(inf); i != c {
			t.Fatalf(`le="+Inf" bucket %v, _count %v`, i, c)
		}
		if c < lastCount || tot < lastTotal {
			t.Fatalf("went down: count %v after %v, total %v after %v", c, lastCount, tot, lastTotal)
		}
		lastCount, lastTotal = c, tot
	}
	close(stop)
	<-done
	<-done
}

// A scrape shows each histogram as one snapshot: its buckets, _count and
// _sum all count the same observations, even while they come in. Every
// observation here is the same value v (a power of two, so the sums are
// exact), so a scrape must show _sum == v·_count, the buckets from v's up
// equal to _count and those below it 0 (the text format's rules for a
// cumulative histogram; run with -race in .ci/run).
func TestHistogramScrapeIsOneSnapshot(t *testing.T) {
	const v = 0.25
	reg := NewRegistry()
	plain := newHistogram("test_plain_seconds", "A histogram without labels.", []float64{0.1, 0.25, 1})
	labelled := newHistogramVec("test_labelled_seconds", "A histogram with a label.", []float64{0.001, 0.5}, "route")
	for _, f := range []family{plain, labelled} {
		if err := reg.register(f); err != nil {
			t.Fatal(err)
		}
	}
	stop := make(chan struct{})
	var wg, started sync.WaitGroup
	for _, h := range []*histogram{plain.histogram, labelled.WithLabelValues("feed"), plain.histogram} {
		started.Add(1)
		var first sync.Once
		untilStopped(&wg, stop, func() bool { h.Observe(v); first.Do(started.Done); return true })
	}
	defer func() { close(stop); wg.Wait() }()
	// Scrape only once every observer runs: with a single processor the
	// scrapes could otherwise all come before the first observation.
	started.Wait()
	line := regexp.MustCompile(`(?m)^(test_\w+?)_(bucket|sum|count)(?:\{(?:route="feed",?)?(?:le="([^"]+)")?\})? (\S+)$`)
	var seen float64
	for range 300 {
		text := string(reg.WriteText(nil))
		type snap struct {
			sum, count float64
			buckets    map[string]float64
		}
		snaps := map[string]*snap{}
		for _, m := range line.FindAllStringSubmatch(text, -1) {
			s := snaps[m[1]]
			if s == nil {
				s = &snap{buckets: map[string]float64{}}
				snaps[m[1]] = s
			}
			n, err := strconv.ParseFloat(m[4], 64)
			if err != nil {
				t.Fatal(err)
			}
			switch m[2] {
			case "sum":
				s.sum = n
			case "count":
				s.count = n
			default:
				s.buckets[m[3]] = n
			}
		}
		if len(snaps) != 2 {
			t.Fatalf("%d histograms in\n%s", len(snaps), text)
		}
		for name, s := range snaps {
			if want := map[string]int{"test_plain_seconds": 4, "test_labelled_seconds": 3}[name]; len(s.buckets) != want {
				t.Fatalf("%s: %d buckets, want %d\n%s", name, len(s.buckets), want, text)
			}
			if s.sum != v*s.count {
				t.Fatalf("%s: _sum %v, _count %v: want _sum = %v·_count\n%s", name, s.sum, s.count, v, text)
			}
			for le, n := range s.buckets {
				bound, err := strconv.ParseFloat(le, 64) // reads "+Inf" too
				if err != nil {
					t.Fatal(err)
				}
				if want := map[bool]float64{true: s.count, false: 0}[bound >= v]; n != want {
					t.Fatalf("%s: bucket le=%q %v, want %v (_count %v)\n%s", name, le, n, want, s.count, text)
				}
			}
			seen = max(seen, s.count)
		}
	}
	if seen == 0 {
		t.Fatal("no observation seen by any scrape")
	}
}

// /metrics is gzipped for a scraper that takes it (Prometheus sends
// Accept-Encoding: gzip), as the client library's handler did, and plain
// for one that does not.
func TestMetricsGzip(t *testing.T) {
	s, _ := newTestServer(t, Options{})
	h := s.Handler()
	plainResp := get(t, h, "GET", "/metrics")
	if ce := plainResp.Header.Get("Content-Encoding"); ce != "" {
		t.Errorf("without Accept-Encoding: Content-Encoding %q", ce)
	}
	plainText := body(t, plainResp)
	resp := get(t, h, "GET", "/metrics", "Accept-Encoding", "gzip")
	if ce, v := resp.Header.Get("Content-Encoding"), resp.Header.Get("Vary"); ce != "gzip" || v != "Accept-Encoding" {
		t.Fatalf("Content-Encoding %q, Vary %q, want gzip and Accept-Encoding", ce, v)
	}
	zr, err := gzip.NewReader(resp.Body)
	if err != nil {
		t.Fatal(err)
	}
	text, err := io.ReadAll(zr)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(plainText, "\nheliocal_feeds 2\n") || !strings.Contains(string(text), "\nheliocal_feeds 2\n") {
		t.Errorf("/metrics, plain or gzipped, lacks heliocal_feeds 2:\n%s", text)
	}
	parser := expfmt.NewTextParser(model.UTF8Validation)
	if _, err := parser.TextToMetricFamilies(bytes.NewReader(text)); err != nil {
		t.Errorf("gzipped /metrics does not parse: %v", err)
	}
}

// Label values and help texts are escaped as the text format 0.0.4 says
// (a backslash, a double quote in a label value, a line feed): Prometheus's
// parser reads back the very strings, and a label value with all three
// stays one series.
func TestMetricsEscaping(t *testing.T) {
	reg := NewRegistry()
	c := newCounterVec("escape_test_total", "Help with a \\ backslash\nand a second line.", "path")
	if err := reg.register(c); err != nil {
		t.Fatal(err)
	}
	odd := "a\"quoted\" C:\\dir\nnext line"
	c.WithLabelValues(odd).Inc()
	c.WithLabelValues("plain").Inc()
	c.WithLabelValues("plain").Inc()
	parser := expfmt.NewTextParser(model.UTF8Validation)
	fams, err := parser.TextToMetricFamilies(bytes.NewReader(reg.WriteText(nil)))
	if err != nil {
		t.Fatalf("does not parse: %v\n%s", err, reg.WriteText(nil))
	}
	f := fams["escape_test_total"]
	if f == nil {
		t.Fatal("escape_test_total missing")
	}
	if f.GetHelp() != "Help with a \\ backslash\nand a second line." {
		t.Errorf("help read back as %q", f.GetHelp())
	}
	got := map[string]float64{}
	for _, m := range f.GetMetric() {
		got[m.GetLabel()[0].GetValue()] = m.GetCounter().GetValue()
	}
	if len(got) != 2 || got[odd] != 1 || got["plain"] != 2 {
		t.Errorf("series read back as %v, want %q: 1 and plain: 2", got, odd)
	}
}
