package serve

import (
	"errors"
	"fmt"
	"runtime"
	"strconv"
	"time"

	"github.com/prometheus/client_golang/prometheus"
	"github.com/prometheus/client_golang/prometheus/collectors"
)

// Routes, the values of the "route" label: a fixed set, so the label's
// cardinality stays bounded whatever paths clients try.
const (
	routeIndex   = "index"
	routeFeed    = "feed"
	routeFeeds   = "feeds_json"
	routeHealth  = "healthz"
	routeMetrics = "metrics"
	routeAdhoc   = "adhoc"
	routePage    = "page"    // the builder, its files and the /at table
	routePreview = "preview" // /at.json
	routeOther   = "other"
)

var routes = []string{routeIndex, routeFeed, routeFeeds, routeHealth, routeMetrics, routeAdhoc, routePage, routePreview, routeOther}

// Refresh triggers, the values of the "trigger" label.
const (
	triggerInitial  = "initial"
	triggerSchedule = "schedule"
	triggerReload   = "reload"
	triggerManual   = "manual"
)

type metrics struct {
	requests       *prometheus.CounterVec
	requestSeconds *prometheus.HistogramVec
	refreshSeconds prometheus.Histogram
	refreshes      *prometheus.CounterVec
	lastSuccess    prometheus.Gauge
	lastOK         prometheus.Gauge
	feeds          prometheus.Gauge
	events         prometheus.Gauge
	adhocCache     *prometheus.CounterVec
	adhocSeconds   prometheus.Histogram
	reloadsRefused prometheus.Counter

	// Pre-resolved children for the hot path: route × common status.
	hot      map[string]map[int]prometheus.Counter
	duration map[string]prometheus.Observer
}

func newMetrics(reg prometheus.Registerer) (*metrics, error) {
	m := &metrics{
		requests: prometheus.NewCounterVec(prometheus.CounterOpts{
			Name: "heliocal_http_requests_total",
			Help: "HTTP requests served, by route and status code.",
		}, []string{"route", "code"}),
		requestSeconds: prometheus.NewHistogramVec(prometheus.HistogramOpts{
			Name:    "heliocal_http_request_duration_seconds",
			Help:    "Time to serve an HTTP request, by route.",
			Buckets: []float64{.0001, .0005, .001, .005, .01, .025, .05, .1, .25, .5, 1, 5},
		}, []string{"route"}),
		refreshSeconds: prometheus.NewHistogram(prometheus.HistogramOpts{
			Name:    "heliocal_refresh_duration_seconds",
			Help:    "Time to rebuild every feed, successful or not.",
			Buckets: prometheus.ExponentialBuckets(0.05, 2, 12), // 50 ms .. 102 s
		}),
		refreshes: prometheus.NewCounterVec(prometheus.CounterOpts{
			Name: "heliocal_refreshes_total",
			Help: "Feed rebuilds, by trigger (initial, schedule, reload, manual) and result (success, failure).",
		}, []string{"trigger", "result"}),
		lastSuccess: prometheus.NewGauge(prometheus.GaugeOpts{
			Name: "heliocal_refresh_last_success_timestamp_seconds",
			Help: "Unix time of the last successful rebuild (0 if none yet).",
		}),
		lastOK: prometheus.NewGauge(prometheus.GaugeOpts{
			Name: "heliocal_refresh_last_successful",
			Help: "1 if the latest rebuild succeeded, 0 if it failed and older feeds are being served.",
		}),
		feeds: prometheus.NewGauge(prometheus.GaugeOpts{
			Name: "heliocal_feeds",
			Help: "Feeds currently served.",
		}),
		events: prometheus.NewGauge(prometheus.GaugeOpts{
			Name: "heliocal_events",
			Help: "Events in the feeds currently served.",
		}),
		adhocCache: prometheus.NewCounterVec(prometheus.CounterOpts{
			Name: "heliocal_adhoc_cache_total",
			Help: "Ad-hoc feed requests by cache result (hit, miss).",
		}, []string{"result"}),
		adhocSeconds: prometheus.NewHistogram(prometheus.HistogramOpts{
			Name:    "heliocal_adhoc_build_duration_seconds",
			Help:    "Time to build (and compress) one ad-hoc feed.",
			Buckets: []float64{.001, .0025, .005, .01, .025, .05, .1, .25, .5, 1, 2.5},
		}),
		reloadsRefused: prometheus.NewCounter(prometheus.CounterOpts{
			Name: "heliocal_reloads_refused_total",
			Help: "Configuration reloads refused (invalid configuration) or failed (build error); the previous feeds stay.",
		}),
	}
	for _, c := range []prometheus.Collector{m.requests, m.requestSeconds, m.refreshSeconds, m.refreshes,
		m.lastSuccess, m.lastOK, m.feeds, m.events, m.adhocCache, m.adhocSeconds, m.reloadsRefused} {
		if err := reg.Register(c); err != nil {
			return nil, fmt.Errorf("serve: registering metrics: %w", err)
		}
	}
	m.hot = make(map[string]map[int]prometheus.Counter, len(routes))
	m.duration = make(map[string]prometheus.Observer, len(routes))
	for _, r := range routes {
		m.hot[r] = make(map[int]prometheus.Counter)
		for _, code := range []int{200, 206, 304, 400, 404, 405, 412, 416, 500, 503} {
			m.hot[r][code] = m.requests.WithLabelValues(r, strconv.Itoa(code))
		}
		m.duration[r] = m.requestSeconds.WithLabelValues(r)
	}
	for _, t := range []string{triggerInitial, triggerSchedule, triggerReload, triggerManual} {
		m.refreshes.WithLabelValues(t, "success")
		m.refreshes.WithLabelValues(t, "failure")
	}
	m.adhocCache.WithLabelValues("hit")
	m.adhocCache.WithLabelValues("miss")
	return m, nil
}

func (m *metrics) request(route string, code int, d time.Duration) {
	if c, ok := m.hot[route][code]; ok {
		c.Inc()
	} else {
		m.requests.WithLabelValues(route, strconv.Itoa(code)).Inc()
	}
	m.duration[route].Observe(d.Seconds())
}

// registry returns the Registerer and Gatherer to use: the given ones, or a
// fresh registry with the Go runtime and process collectors.
func registry(reg prometheus.Registerer, g prometheus.Gatherer) (prometheus.Registerer, prometheus.Gatherer, error) {
	switch {
	case reg == nil && g == nil:
		r := prometheus.NewRegistry()
		r.MustRegister(collectors.NewGoCollector(), collectors.NewProcessCollector(collectors.ProcessCollectorOpts{}))
		return r, r, nil
	case reg != nil && g == nil:
		if gg, ok := reg.(prometheus.Gatherer); ok {
			return reg, gg, nil
		}
		return nil, nil, errors.New("serve: Options.Gatherer is required when Options.Registerer is not a registry")
	case reg == nil:
		return nil, nil, errors.New("serve: Options.Registerer is required when Options.Gatherer is set")
	}
	return reg, g, nil
}

// registerBuildInfo adds heliocal_build_info, a constant 1 whose labels say
// which build is running (the usual Prometheus "info" metric): join it to
// other series to see which version served them, or count the versions of
// a fleet of replicas.
func registerBuildInfo(reg prometheus.Registerer, version, revision string) error {
	g := prometheus.NewGaugeVec(prometheus.GaugeOpts{
		Name: "heliocal_build_info",
		Help: "A constant 1 labelled with the running build: version, VCS revision and Go release.",
	}, []string{"version", "revision", "goversion"})
	if err := reg.Register(g); err != nil {
		return fmt.Errorf("serve: registering metrics: %w", err)
	}
	g.WithLabelValues(version, revision, runtime.Version()).Set(1)
	return nil
}
