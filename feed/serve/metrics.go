package serve

import (
	"fmt"
	"runtime"
	"strconv"
	"time"
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
	requests       *counterVec
	requestSeconds *histogramVec
	refreshSeconds *histogramFamily
	refreshes      *counterVec
	lastSuccess    *gauge
	lastOK         *gauge
	feeds          *gauge
	events         *gauge
	adhocCache     *counterVec
	adhocSeconds   *histogramFamily
	reloadsRefused *counterFamily

	// Pre-resolved children for the hot path: route × common status.
	hot      map[string]map[int]*counter
	duration map[string]*histogram
}

// exponentialBuckets returns n upper bounds from start, each factor times
// the one before.
func exponentialBuckets(start, factor float64, n int) []float64 {
	b := make([]float64, n)
	for i := range b {
		b[i] = start
		start *= factor
	}
	return b
}

func newMetrics(reg *Registry) (*metrics, error) {
	m := &metrics{
		requests: newCounterVec("heliocal_http_requests_total",
			"HTTP requests served, by route and status code.", "route", "code"),
		requestSeconds: newHistogramVec("heliocal_http_request_duration_seconds",
			"Time to serve an HTTP request, by route.",
			[]float64{.0001, .0005, .001, .005, .01, .025, .05, .1, .25, .5, 1, 5}, "route"),
		refreshSeconds: newHistogram("heliocal_refresh_duration_seconds",
			"Time to rebuild every feed, successful or not.",
			exponentialBuckets(0.05, 2, 12)), // 50 ms .. 102 s
		refreshes: newCounterVec("heliocal_refreshes_total",
			"Feed rebuilds, by trigger (initial, schedule, reload, manual) and result (success, failure).", "trigger", "result"),
		lastSuccess: newGauge("heliocal_refresh_last_success_timestamp_seconds",
			"Unix time of the last successful rebuild (0 if none yet)."),
		lastOK: newGauge("heliocal_refresh_last_successful",
			"1 if the latest rebuild succeeded, 0 if it failed and older feeds are being served."),
		feeds:  newGauge("heliocal_feeds", "Feeds currently served."),
		events: newGauge("heliocal_events", "Events in the feeds currently served."),
		adhocCache: newCounterVec("heliocal_adhoc_cache_total",
			"Ad-hoc feed requests by cache result (hit, miss).", "result"),
		adhocSeconds: newHistogram("heliocal_adhoc_build_duration_seconds",
			"Time to build (and compress) one ad-hoc feed.",
			[]float64{.001, .0025, .005, .01, .025, .05, .1, .25, .5, 1, 2.5}),
		reloadsRefused: newCounter("heliocal_reloads_refused_total",
			"Configuration reloads refused (invalid configuration) or failed (build error); the previous feeds stay."),
	}
	for _, f := range []family{m.requests, m.requestSeconds, m.refreshSeconds, m.refreshes,
		m.lastSuccess, m.lastOK, m.feeds, m.events, m.adhocCache, m.adhocSeconds, m.reloadsRefused} {
		if err := reg.register(f); err != nil {
			return nil, fmt.Errorf("serve: registering metrics: %w", err)
		}
	}
	m.hot = make(map[string]map[int]*counter, len(routes))
	m.duration = make(map[string]*histogram, len(routes))
	for _, r := range routes {
		m.hot[r] = make(map[int]*counter)
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

// registry returns the registry to use: the given one, or a fresh one with
// the process's and the Go runtime's metrics.
func registry(reg *Registry) (*Registry, error) {
	if reg != nil {
		if reg.families == nil {
			return nil, errNoRegistry
		}
		return reg, nil
	}
	r := NewRegistry()
	if err := registerRuntime(r); err != nil {
		return nil, err
	}
	return r, nil
}

// registerBuildInfo adds heliocal_build_info, a constant 1 whose labels say
// which build is running (the usual Prometheus "info" metric): join it to
// other series to see which version served them, or count the versions of
// a fleet of replicas.
func registerBuildInfo(reg *Registry, version, revision string) error {
	f := &infoFamily{newDesc("heliocal_build_info",
		"A constant 1 labelled with the running build: version, VCS revision and Go release.", "gauge",
		"version", "revision", "goversion"), []string{version, revision, runtime.Version()}}
	if err := reg.register(f); err != nil {
		return fmt.Errorf("serve: registering metrics: %w", err)
	}
	return nil
}
