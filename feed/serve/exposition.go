package serve

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"net/http"
	"os"
	"runtime"
	"runtime/debug"
	rtmetrics "runtime/metrics"
	"slices"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"time"

	"heliocal/internal/cputime"
)

// The metrics /metrics shows, written in the Prometheus text exposition
// format 0.0.4 (docs/serving.md): counters, gauges and histograms, with or
// without labels, and the process's and the Go runtime's own figures. A
// registry of its own rather than a client library: a library's package
// initialisation (its default registry and collectors) ran in every command
// of the program, `heliocal events` among them, for a server only `serve`
// starts.

// Registry holds a server's metrics and writes them for /metrics. The zero
// value is not usable: make one with NewRegistry.
type Registry struct {
	mu       sync.Mutex
	families map[string]family
}

// NewRegistry returns an empty registry; New adds the server's metrics to it
// (and the process's and the runtime's when Options.Metrics is nil).
func NewRegistry() *Registry { return &Registry{families: map[string]family{}} }

// family is one metric name's help, type and series.
type family interface {
	name() string
	write(b []byte) []byte
}

// register adds f, or returns an error when its name is taken.
func (r *Registry) register(f family) error {
	r.mu.Lock()
	defer r.mu.Unlock()
	if _, ok := r.families[f.name()]; ok {
		return fmt.Errorf("metric %s registered twice", f.name())
	}
	r.families[f.name()] = f
	return nil
}

// WriteText appends every metric in the text format, by name.
func (r *Registry) WriteText(b []byte) []byte {
	r.mu.Lock()
	fs := make([]family, 0, len(r.families))
	for _, f := range r.families {
		fs = append(fs, f)
	}
	r.mu.Unlock()
	slices.SortFunc(fs, func(a, b family) int { return strings.Compare(a.name(), b.name()) })
	for _, f := range fs {
		b = f.write(b)
	}
	return b
}

// ServeHTTP writes the metrics as text/plain; version=0.0.4, gzipped for a
// client that takes it (Prometheus asks for it: the text of a server's
// metrics, about 25 kB, is 3 kB gzipped).
func (r *Registry) ServeHTTP(w http.ResponseWriter, req *http.Request) {
	h := w.Header()
	h.Set("Content-Type", "text/plain; version=0.0.4; charset=utf-8")
	h["Vary"] = hdrVary
	text := r.WriteText(nil)
	if acceptsGzip(req.Header.Get("Accept-Encoding")) {
		if gz := gzipFast(text); gz != nil {
			h["Content-Encoding"] = hdrGzip
			text = gz
		}
	}
	w.Write(text)
}

// desc is what every family has: its name, help, type and label names.
type desc struct {
	n, help, typ string
	labels       []string // in the order WithLabelValues takes them
	order        []int    // indices of labels sorted by name, as the text format writes them
}

// newDesc is the desc of a family with labels: their order by name is
// worked out once here, not on every sample line of every scrape.
func newDesc(name, help, typ string, labels ...string) desc {
	order := make([]int, len(labels))
	for i := range order {
		order[i] = i
	}
	slices.SortFunc(order, func(x, y int) int { return strings.Compare(labels[x], labels[y]) })
	return desc{n: name, help: help, typ: typ, labels: labels, order: order}
}

func (d *desc) name() string { return d.n }

// header appends the # HELP and # TYPE lines.
func (d *desc) header(b []byte) []byte {
	b = append(b, "# HELP "...)
	b = append(b, d.n...)
	b = append(b, ' ')
	b = appendEscaped(b, d.help, false)
	b = append(b, "\n# TYPE "...)
	b = append(b, d.n...)
	b = append(b, ' ')
	b = append(b, d.typ...)
	return append(b, '\n')
}

// series appends a sample line: the name with suffix, the labels (sorted
// by name, with extra, such as le, last) and the value.
func (d *desc) series(b []byte, suffix string, values []string, extra, extraValue string, v float64) []byte {
	b = append(b, d.n...)
	b = append(b, suffix...)
	if len(d.labels) > 0 || extra != "" {
		b = append(b, '{')
		for k, i := range d.order {
			if k > 0 {
				b = append(b, ',')
			}
			b = appendLabel(b, d.labels[i], values[i])
		}
		if extra != "" {
			if len(d.order) > 0 {
				b = append(b, ',')
			}
			b = appendLabel(b, extra, extraValue)
		}
		b = append(b, '}')
	}
	b = append(b, ' ')
	b = appendValue(b, v)
	return append(b, '\n')
}

func appendLabel(b []byte, name, value string) []byte {
	b = append(b, name...)
	b = append(b, `="`...)
	b = appendEscaped(b, value, true)
	return append(b, '"')
}

// appendEscaped appends s with a backslash and a line feed escaped, as the
// text format wants in a help text, and a double quote as well when quote
// is set (a label value).
func appendEscaped(b []byte, s string, quote bool) []byte {
	for _, c := range []byte(s) {
		switch {
		case c == '\\':
			b = append(b, `\\`...)
		case c == '\n':
			b = append(b, `\n`...)
		case c == '"' && quote:
			b = append(b, `\"`...)
		default:
			b = append(b, c)
		}
	}
	return b
}

// appendValue writes a sample value as the text format does: +Inf, -Inf,
// NaN, else the shortest decimal that reads back exactly.
func appendValue(b []byte, v float64) []byte {
	switch {
	case math.IsInf(v, 1):
		return append(b, "+Inf"...)
	case math.IsInf(v, -1):
		return append(b, "-Inf"...)
	case math.IsNaN(v):
		return append(b, "NaN"...)
	}
	return strconv.AppendFloat(b, v, 'g', -1, 64)
}

// atomicFloat is a float64 updated without a lock.
type atomicFloat struct{ bits atomic.Uint64 }

func (f *atomicFloat) load() float64   { return math.Float64frombits(f.bits.Load()) }
func (f *atomicFloat) store(v float64) { f.bits.Store(math.Float64bits(v)) }
func (f *atomicFloat) add(v float64) {
	for {
		old := f.bits.Load()
		if f.bits.CompareAndSwap(old, math.Float64bits(math.Float64frombits(old)+v)) {
			return
		}
	}
}

// vec holds the children of a labelled family by their label values, in the
// order they were first asked for.
type vec[T any] struct {
	mu       sync.Mutex
	children map[string]*T
	list     []child[T] // the children with their label values
	make     func() *T
}

// child is a child of a vec and its label values.
type child[T any] struct {
	values []string
	c      *T
}

func (v *vec[T]) with(n int, values []string) *T {
	if len(values) != n {
		panic(fmt.Sprintf("metrics: %d label values for %d labels", len(values), n))
	}
	key := strings.Join(values, "\xff")
	v.mu.Lock()
	defer v.mu.Unlock()
	c, ok := v.children[key]
	if !ok {
		if v.children == nil {
			v.children = map[string]*T{}
		}
		c = v.make()
		v.children[key] = c
		v.list = append(v.list, child[T]{slices.Clone(values), c})
	}
	return c
}

// each calls fn for every child, in the order of their label values taken
// by label name (byName: the family's desc.order), as Prometheus writes them.
func (v *vec[T]) each(byName []int, fn func(values []string, c *T)) {
	v.mu.Lock()
	list := slices.Clone(v.list)
	v.mu.Unlock()
	slices.SortFunc(list, func(x, y child[T]) int {
		for _, l := range byName {
			if c := strings.Compare(x.values[l], y.values[l]); c != 0 {
				return c
			}
		}
		return 0
	})
	for _, e := range list {
		fn(e.values, e.c)
	}
}

// counter is a value that only goes up.
type counter struct{ v atomicFloat }

// Inc adds 1.
func (c *counter) Inc() { c.v.add(1) }

// counterVec is a counter family with labels.
type counterVec struct {
	desc
	vec[counter]
}

// newCounterVec makes a labelled counter family.
func newCounterVec(name, help string, labels ...string) *counterVec {
	return &counterVec{desc: newDesc(name, help, "counter", labels...),
		vec: vec[counter]{make: func() *counter { return &counter{} }}}
}

// WithLabelValues returns the counter of these label values (in the order
// of the family's labels), made at 0 the first time.
func (c *counterVec) WithLabelValues(values ...string) *counter {
	return c.with(len(c.labels), values)
}

func (c *counterVec) write(b []byte) []byte {
	b = c.header(b)
	c.each(c.order, func(values []string, x *counter) { b = c.series(b, "", values, "", "", x.v.load()) })
	return b
}

// counterFamily is a counter without labels.
type counterFamily struct {
	desc
	counter
}

func newCounter(name, help string) *counterFamily {
	return &counterFamily{desc: desc{n: name, help: help, typ: "counter"}}
}

func (c *counterFamily) write(b []byte) []byte {
	return c.series(c.header(b), "", nil, "", "", c.v.load())
}

// gauge is a value that goes up and down.
type gauge struct {
	desc
	v atomicFloat
}

func newGauge(name, help string) *gauge {
	return &gauge{desc: desc{n: name, help: help, typ: "gauge"}}
}

// Set sets the value.
func (g *gauge) Set(v float64) { g.v.store(v) }

func (g *gauge) write(b []byte) []byte {
	return g.series(g.header(b), "", nil, "", "", g.v.load())
}

// histogram counts observations into cumulative buckets (upper bounds,
// increasing; +Inf is added) and keeps their sum. A scrape copies the
// counts and the sum under the lock an observation holds, so its buckets,
// _count and _sum are one snapshot: the count is the +Inf bucket's, and the
// sum has neither more nor fewer observations than the buckets. The lock
// costs an observation what the atomic add to its bucket and the
// compare-and-swap loop of the sum cost before (two atomic instructions,
// uncontended), and a request makes one observation.
type histogram struct {
	bounds []float64
	les    []string // the le label of each bucket, "+Inf" last (leLabels)

	mu     sync.Mutex
	counts []uint64 // per bucket, not cumulative; the last is +Inf
	sum    float64
}

// leLabels formats the le label values of bounds, and "+Inf", once for a
// histogram (or for every child of a labelled family), not at each scrape.
func leLabels(bounds []float64) []string {
	les := make([]string, len(bounds)+1)
	for i, b := range bounds {
		les[i] = string(appendValue(nil, b))
	}
	les[len(bounds)] = "+Inf"
	return les
}

func newHistogramValues(bounds []float64, les []string) *histogram {
	return &histogram{bounds: bounds, les: les, counts: make([]uint64, len(bounds)+1)}
}

// Observe records v.
func (h *histogram) Observe(v float64) {
	i, _ := slices.BinarySearch(h.bounds, v) // the first bound ≥ v: le is inclusive
	h.mu.Lock()
	h.counts[i]++
	h.sum += v
	h.mu.Unlock()
}

func (h *histogram) write(b []byte, d *desc, values []string) []byte {
	var buf [16]uint64
	counts := buf[:0]
	h.mu.Lock()
	counts = append(counts, h.counts...)
	sum := h.sum
	h.mu.Unlock()
	var cum uint64
	for i, n := range counts {
		cum += n
		b = d.series(b, "_bucket", values, "le", h.les[i], float64(cum))
	}
	b = d.series(b, "_sum", values, "", "", sum)
	return d.series(b, "_count", values, "", "", float64(cum))
}

// histogramFamily is a histogram without labels.
type histogramFamily struct {
	desc
	*histogram
}

func newHistogram(name, help string, bounds []float64) *histogramFamily {
	return &histogramFamily{desc{n: name, help: help, typ: "histogram"}, newHistogramValues(bounds, leLabels(bounds))}
}

func (h *histogramFamily) write(b []byte) []byte { return h.histogram.write(h.header(b), &h.desc, nil) }

// histogramVec is a histogram family with labels.
type histogramVec struct {
	desc
	vec[histogram]
}

func newHistogramVec(name, help string, bounds []float64, labels ...string) *histogramVec {
	les := leLabels(bounds) // shared by the children
	return &histogramVec{desc: newDesc(name, help, "histogram", labels...),
		vec: vec[histogram]{make: func() *histogram { return newHistogramValues(bounds, les) }}}
}

// WithLabelValues returns the histogram of these label values.
func (h *histogramVec) WithLabelValues(values ...string) *histogram {
	return h.with(len(h.labels), values)
}

func (h *histogramVec) write(b []byte) []byte {
	b = h.header(b)
	h.each(h.order, func(values []string, x *histogram) { b = x.write(b, &h.desc, values) })
	return b
}

// gaugeFunc is a gauge or counter read when the metrics are written.
type gaugeFunc struct {
	desc
	read func() (float64, bool) // false: leave the metric out this time
}

func (g *gaugeFunc) write(b []byte) []byte {
	v, ok := g.read()
	if !ok {
		return b
	}
	return g.series(g.header(b), "", nil, "", "", v)
}

// infoFamily is a constant 1 with labels (go_info, heliocal_build_info).
type infoFamily struct {
	desc
	values []string
}

func (f *infoFamily) write(b []byte) []byte {
	return f.series(f.header(b), "", f.values, "", "", 1)
}

// gcSummary is go_gc_duration_seconds: the quantiles of the recent garbage
// collections' stop-the-world pauses, with their sum and count.
type gcSummary struct{ desc }

func (s *gcSummary) write(b []byte) []byte {
	var st debug.GCStats
	st.PauseQuantiles = make([]time.Duration, 5)
	debug.ReadGCStats(&st)
	b = s.header(b)
	for i, q := range []string{"0", "0.25", "0.5", "0.75", "1"} {
		b = s.series(b, "", nil, "quantile", q, st.PauseQuantiles[i].Seconds())
	}
	b = s.series(b, "_sum", nil, "", "", st.PauseTotal.Seconds())
	return s.series(b, "_count", nil, "", "", float64(st.NumGC))
}

// registerRuntime adds the process's and the Go runtime's metrics, under
// the names Prometheus's own Go and process collectors use, so that the
// usual dashboards and alerts find them: process_cpu_seconds_total,
// process_resident_memory_bytes, process_virtual_memory_bytes,
// process_open_fds, process_max_fds, process_start_time_seconds (Linux's
// /proc, getrusage(2) and getrlimit(2) on any Unix: left out where they are
// missing, see process_*.go), go_goroutines, go_threads,
// go_info, go_gc_duration_seconds, go_memstats_alloc_bytes,
// go_memstats_alloc_bytes_total, go_memstats_sys_bytes,
// go_memstats_heap_alloc_bytes, go_memstats_heap_inuse_bytes,
// go_memstats_heap_objects, go_memstats_next_gc_bytes,
// go_memstats_mallocs_total, go_memstats_frees_total,
// go_memstats_last_gc_time_seconds and the rest of the runtime's memory
// statistics, go_sched_gomaxprocs_threads, go_gc_gogc_percent,
// go_gc_gomemlimit_bytes, process_virtual_memory_max_bytes and
// process_network_{receive,transmit}_bytes_total: every name the client
// library's default collectors gave.
func registerRuntime(r *Registry) error {
	var ms struct {
		sync.Mutex
		at time.Time
		runtime.MemStats
	}
	// memstats reads the runtime's statistics at most once per 100 ms: a
	// scrape asks for several of them at once
	memstats := func(f func(*runtime.MemStats) float64) func() (float64, bool) {
		return func() (float64, bool) {
			ms.Lock()
			defer ms.Unlock()
			if time.Since(ms.at) > 100*time.Millisecond {
				runtime.ReadMemStats(&ms.MemStats)
				ms.at = time.Now()
			}
			return f(&ms.MemStats), true
		}
	}
	fs := []family{
		&gaugeFunc{desc{n: "process_cpu_seconds_total", help: "Total user and system CPU time spent in seconds.", typ: "counter"}, cpuSeconds},
		&gaugeFunc{desc{n: "process_resident_memory_bytes", help: "Resident memory size in bytes.", typ: "gauge"}, func() (float64, bool) { return statm(1) }},
		&gaugeFunc{desc{n: "process_virtual_memory_bytes", help: "Virtual memory size in bytes.", typ: "gauge"}, func() (float64, bool) { return statm(0) }},
		&gaugeFunc{desc{n: "process_open_fds", help: "Number of open file descriptors.", typ: "gauge"}, func() (float64, bool) {
			ents, err := os.ReadDir("/proc/self/fd")
			return float64(len(ents)), err == nil
		}},
		&gaugeFunc{desc{n: "process_max_fds", help: "Maximum number of open file descriptors.", typ: "gauge"}, maxFDs},
		&gaugeFunc{desc{n: "process_start_time_seconds", help: "Start time of the process since unix epoch in seconds.", typ: "gauge"}, processStart},
		&gaugeFunc{desc{n: "go_goroutines", help: "Number of goroutines that currently exist.", typ: "gauge"}, func() (float64, bool) {
			return float64(runtime.NumGoroutine()), true
		}},
		&gaugeFunc{desc{n: "go_threads", help: "Number of OS threads created.", typ: "gauge"}, func() (float64, bool) {
			n, _ := runtime.ThreadCreateProfile(nil)
			return float64(n), true
		}},
		&infoFamily{newDesc("go_info", "Information about the Go environment.", "gauge", "version"), []string{runtime.Version()}},
		&gcSummary{desc{n: "go_gc_duration_seconds", help: "A summary of the pause duration of garbage collection cycles.", typ: "summary"}},
		&gaugeFunc{desc{n: "go_memstats_alloc_bytes", help: "Number of bytes allocated and still in use.", typ: "gauge"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.Alloc) })},
		&gaugeFunc{desc{n: "go_memstats_alloc_bytes_total", help: "Total number of bytes allocated, even if freed.", typ: "counter"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.TotalAlloc) })},
		&gaugeFunc{desc{n: "go_memstats_sys_bytes", help: "Number of bytes obtained from system.", typ: "gauge"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.Sys) })},
		&gaugeFunc{desc{n: "go_memstats_heap_alloc_bytes", help: "Number of heap bytes allocated and still in use.", typ: "gauge"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.HeapAlloc) })},
		&gaugeFunc{desc{n: "go_memstats_heap_inuse_bytes", help: "Number of heap bytes that are in use.", typ: "gauge"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.HeapInuse) })},
		&gaugeFunc{desc{n: "go_memstats_heap_objects", help: "Number of allocated objects.", typ: "gauge"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.HeapObjects) })},
		&gaugeFunc{desc{n: "go_memstats_next_gc_bytes", help: "Number of heap bytes when next garbage collection will take place.", typ: "gauge"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.NextGC) })},
		&gaugeFunc{desc{n: "go_memstats_mallocs_total", help: "Total number of mallocs.", typ: "counter"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.Mallocs) })},
		&gaugeFunc{desc{n: "go_memstats_frees_total", help: "Total number of frees.", typ: "counter"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.Frees) })},
		&gaugeFunc{desc{n: "go_memstats_last_gc_time_seconds", help: "Number of seconds since 1970 of last garbage collection.", typ: "gauge"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.LastGC) / 1e9 })},
		&gaugeFunc{desc{n: "go_memstats_buck_hash_sys_bytes", help: "Number of bytes used by the profiling bucket hash table.", typ: "gauge"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.BuckHashSys) })},
		&gaugeFunc{desc{n: "go_memstats_gc_sys_bytes", help: "Number of bytes used for garbage collection system metadata.", typ: "gauge"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.GCSys) })},
		&gaugeFunc{desc{n: "go_memstats_heap_idle_bytes", help: "Number of heap bytes waiting to be used.", typ: "gauge"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.HeapIdle) })},
		&gaugeFunc{desc{n: "go_memstats_heap_released_bytes", help: "Number of heap bytes released to OS.", typ: "gauge"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.HeapReleased) })},
		&gaugeFunc{desc{n: "go_memstats_heap_sys_bytes", help: "Number of heap bytes obtained from system.", typ: "gauge"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.HeapSys) })},
		&gaugeFunc{desc{n: "go_memstats_mcache_inuse_bytes", help: "Number of bytes in use by mcache structures.", typ: "gauge"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.MCacheInuse) })},
		&gaugeFunc{desc{n: "go_memstats_mcache_sys_bytes", help: "Number of bytes used for mcache structures obtained from system.", typ: "gauge"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.MCacheSys) })},
		&gaugeFunc{desc{n: "go_memstats_mspan_inuse_bytes", help: "Number of bytes in use by mspan structures.", typ: "gauge"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.MSpanInuse) })},
		&gaugeFunc{desc{n: "go_memstats_mspan_sys_bytes", help: "Number of bytes used for mspan structures obtained from system.", typ: "gauge"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.MSpanSys) })},
		&gaugeFunc{desc{n: "go_memstats_other_sys_bytes", help: "Number of bytes used for other system allocations.", typ: "gauge"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.OtherSys) })},
		&gaugeFunc{desc{n: "go_memstats_stack_inuse_bytes", help: "Number of bytes in use by the stack allocator.", typ: "gauge"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.StackInuse) })},
		&gaugeFunc{desc{n: "go_memstats_stack_sys_bytes", help: "Number of bytes obtained from system for stack allocator.", typ: "gauge"}, memstats(func(m *runtime.MemStats) float64 { return float64(m.StackSys) })},
		&gaugeFunc{desc{n: "go_sched_gomaxprocs_threads", help: "The current runtime.GOMAXPROCS setting.", typ: "gauge"}, func() (float64, bool) {
			return float64(runtime.GOMAXPROCS(0)), true
		}},
		&gaugeFunc{desc{n: "go_gc_gogc_percent", help: "Heap size target percentage configured by the user, otherwise 100 (GOGC, debug.SetGCPercent).", typ: "gauge"}, func() (float64, bool) {
			s := []rtmetrics.Sample{{Name: "/gc/gogc:percent"}}
			rtmetrics.Read(s)
			if s[0].Value.Kind() != rtmetrics.KindUint64 { // Uint64 would panic
				return 0, false
			}
			return float64(s[0].Value.Uint64()), true
		}},
		&gaugeFunc{desc{n: "go_gc_gomemlimit_bytes", help: "Go runtime memory limit configured by the user, otherwise math.MaxInt64 (GOMEMLIMIT, debug.SetMemoryLimit).", typ: "gauge"}, func() (float64, bool) {
			return float64(debug.SetMemoryLimit(-1)), true // a negative limit only reads it
		}},
		&gaugeFunc{desc{n: "process_virtual_memory_max_bytes", help: "Maximum amount of virtual memory available in bytes.", typ: "gauge"}, maxVirtual},
		&gaugeFunc{desc{n: "process_network_receive_bytes_total", help: "Number of bytes received by the process over the network.", typ: "counter"}, func() (float64, bool) { return netDev(0) }},
		&gaugeFunc{desc{n: "process_network_transmit_bytes_total", help: "Number of bytes sent by the process over the network.", typ: "counter"}, func() (float64, bool) { return netDev(8) }},
	}
	for _, f := range fs {
		if err := r.register(f); err != nil {
			return err
		}
	}
	return nil
}

// statm returns field i of /proc/self/statm (pages) in bytes.
func statm(i int) (float64, bool) {
	data, err := os.ReadFile("/proc/self/statm")
	if err != nil {
		return 0, false
	}
	f := strings.Fields(string(data))
	if i >= len(f) {
		return 0, false
	}
	n, err := strconv.ParseUint(f[i], 10, 64)
	return float64(n) * float64(os.Getpagesize()), err == nil
}

// netDev returns the sum over the interfaces of column col (0: bytes
// received, 8: bytes sent) of /proc/self/net/dev: the traffic of the
// process's network namespace.
func netDev(col int) (float64, bool) {
	data, err := os.ReadFile("/proc/self/net/dev")
	if err != nil {
		return 0, false
	}
	var sum float64
	for line := range strings.Lines(string(data)) {
		_, counts, ok := strings.Cut(line, ":")
		if !ok {
			continue // the two header lines
		}
		f := strings.Fields(counts)
		if col >= len(f) {
			return 0, false
		}
		n, err := strconv.ParseUint(f[col], 10, 64)
		if err != nil {
			return 0, false
		}
		sum += float64(n)
	}
	return sum, true
}

// maxVirtual is the soft limit on the process's address space, from
// /proc/self/limits ("Max address space"; unlimited is 2^64 − 1, as
// getrlimit(2) gives RLIM_INFINITY).
func maxVirtual() (float64, bool) {
	data, err := os.ReadFile("/proc/self/limits")
	if err != nil {
		return 0, false
	}
	for line := range strings.Lines(string(data)) {
		if v, ok := strings.CutPrefix(line, "Max address space"); ok {
			f := strings.Fields(v)
			if len(f) == 0 {
				return 0, false
			}
			if f[0] == "unlimited" {
				return math.MaxUint64, true
			}
			n, err := strconv.ParseUint(f[0], 10, 64)
			return float64(n), err == nil
		}
	}
	return 0, false
}

// cpuSeconds is the process's user and system CPU time (getrusage(2) on
// Unix, see internal/cputime).
func cpuSeconds() (float64, bool) {
	d, ok := cputime.Read()
	return float64(d) / 1e9, ok
}

// userHZ is the unit of /proc's clock-tick fields: 100 on every Linux
// architecture Go runs on (sysconf(_SC_CLK_TCK)).
const userHZ = 100

// processStart reads the process's start from /proc/self/stat (field 22,
// clock ticks after boot) and the boot time from /proc/stat (btime).
func processStart() (float64, bool) {
	stat, err := os.ReadFile("/proc/self/stat")
	if err != nil {
		return 0, false
	}
	// the command name (field 2) is in parentheses and may hold spaces
	i := bytes.LastIndexByte(stat, ')')
	if i < 0 {
		return 0, false
	}
	f := strings.Fields(string(stat[i+1:])) // fields 3 onwards
	if len(f) < 20 {
		return 0, false
	}
	ticks, err := strconv.ParseUint(f[19], 10, 64) // field 22
	if err != nil {
		return 0, false
	}
	sys, err := os.ReadFile("/proc/stat")
	if err != nil {
		return 0, false
	}
	for line := range strings.Lines(string(sys)) {
		if v, ok := strings.CutPrefix(line, "btime "); ok {
			boot, err := strconv.ParseUint(strings.TrimSpace(v), 10, 64)
			if err != nil {
				return 0, false
			}
			return float64(boot) + float64(ticks)/userHZ, true
		}
	}
	return 0, false
}

// errNoRegistry is returned for a registry made without NewRegistry.
var errNoRegistry = errors.New("serve: Options.Metrics was not made by NewRegistry")
