package main

import (
	"context"
	"errors"
	"fmt"
	"io/fs"
	"log/slog"
	"net"
	"os"
	"os/signal"
	"sync"
	"sync/atomic"
	"syscall"
	"time"

	"github.com/spf13/cobra"

	"heliocal/config"
	"heliocal/feed/publish"
	"heliocal/feed/serve"
)

type serveOptions struct {
	listen    string
	baseURL   string
	logFormat string
	accessLog bool
}

func newServeCommand(g *globals) *cobra.Command {
	o := &serveOptions{}
	cmd := &cobra.Command{
		Use:   "serve",
		Short: "Serve the feeds over HTTP and refresh them on schedule",
		Long: `Serve the configured feeds over HTTP: / (the page: a calendar builder and the feeds),
/index.html, /<id>.ics, /feeds.json, /healthz, /metrics, ad-hoc feeds for any place at
/at.ics?lat=..&lon=..&kinds=..&days=.. (tz found from the coordinates unless given), their
seven-day preview at /at.json?.. and a printable day-by-day table at /at?..
The feeds are rebuilt on the configured schedule (service.refresh, nightly at 03:15 by default)
and swapped in whole. SIGHUP reloads the configuration: an invalid one is refused and logged,
and the old feeds keep being served. A feed over service.max_feed_bytes under
service.oversize: fail is refused as publish refuses it: at start serve exits 1 naming the
feed and its size; later the old feeds keep being served. SIGTERM or SIGINT shut down
gracefully.` + exitStatusHelp,
		Example: `  heliocal serve
  heliocal serve --config farm.yaml --listen 127.0.0.1:8080 --base-url https://sky.example.org/`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			return runServe(cmd.Context(), g, o)
		},
	}
	f := cmd.Flags()
	f.StringVarP(&o.listen, "listen", "l", "", "address to listen on (default: service.listen, \":8080\")")
	f.StringVar(&o.baseURL, "base-url", "", "public URL the server is reached at (default: service.base_url)")
	f.StringVar(&o.logFormat, "log-format", "text", "log format on stderr: text or json")
	f.BoolVar(&o.accessLog, "access-log", true, "log one line per request (--access-log=false to turn off)")
	return cmd
}

// reloadServe reads the configuration again and, if it is valid and its
// feeds build, serves them: with its base URL, and on its refresh schedule
// when that changed. It returns the new configuration, or nil when the
// reload was refused (the old feeds, URL and schedule stay). listenFlag is
// --listen, "" when not given: a changed service.listen then asks for a
// restart; under --listen a restart would listen where it does now.
func reloadServe(ctx context.Context, g *globals, log *slog.Logger, srv *serve.Server, old *config.Config, baseOf func(*config.Config) string, listenFlag string) *config.Config {
	if g.configPath == stdinPath {
		log.Error("reload refused: the configuration was read from standard input, which cannot be read again; still serving the old feeds (restart heliocal to change them)")
		srv.RefuseReload(errors.New("the configuration was read from standard input"))
		return nil
	}
	next, src, err := loadConfig(g)
	if err != nil {
		msg := "reload refused: the new configuration is invalid; still serving the old feeds"
		if errors.Is(err, fs.ErrNotExist) || errors.Is(err, fs.ErrPermission) { // removed, or made unreadable
			msg = "reload refused: the configuration file cannot be read; still serving the old feeds"
		}
		log.Error(msg, "err", err)
		srv.RefuseReload(err)
		return nil
	}
	if err := srv.Reload(ctx, serveBuild(next, baseOf(next), log)); err != nil {
		return nil // srv logged it and shows it on /healthz
	}
	if next.Service.Refresh != old.Service.Refresh || next.Service.RefreshZone.Name() != old.Service.RefreshZone.Name() {
		if err := srv.Reschedule(next.Service.Refresh, next.Service.RefreshZone.Location); err != nil {
			log.Error("the new refresh schedule could not be applied; keeping the old one", "err", err)
		}
	}
	if next.Service.Listen != old.Service.Listen {
		if listenFlag == "" {
			log.Warn("service.listen changed: restart heliocal to listen on the new address", "listen", next.Service.Listen)
		} else {
			log.Info("service.listen changed, but --listen is given and stays in force, after a restart too", "listen", listenFlag, "service.listen", next.Service.Listen)
		}
	}
	log.Info("configuration reloaded", "source", src.String(), "sites", len(next.Sites), "feeds", len(next.Feeds), "base_url", baseOf(next))
	return next
}

// serveBuild returns the function that renders every feed of cfg, counting
// "today" afresh at each call. The lighting limits that do nothing on some
// dates (the warnings of check) are logged after the first build, and after
// a later one only when a limit is newly warned about: a refresh that finds
// the same limits says nothing, though its window and count of dates moved.
// A feed over service.max_feed_bytes under service.oversize: warn is
// served and logged likewise, in the words of check and publish; under
// service.oversize: trim publish's note on the shortened feed is logged,
// at WARN, after the first build that shortens it. As publish does, the
// first feeds of each get a record of their own and the rest one record
// naming them together (warnGrouped).
func serveBuild(cfg *config.Config, base string, log *slog.Logger) serve.BuildFunc {
	var mu sync.Mutex
	logged := map[string]bool{} // what the latest build warned about: lamp limits, feeds shortened or over the limit
	return func(ctx context.Context, gzip serve.GzipFunc) (*publish.Bundle, error) {
		srcs, opts, err := build(cfg, time.Now(), newLayout(base))
		if err != nil {
			return nil, err
		}
		opts.Gzip = gzip // each feed held in its gzip form from the moment it is rendered
		lamps := &lampWatch{}
		lamps.watch(cfg, srcs)
		b, err := publish.Render(ctx, srcs, opts)
		if err != nil {
			return nil, err
		}
		mu.Lock()
		defer mu.Unlock()
		found := map[string]bool{}
		warn := func(key, text string) { // unless the build before warned of it
			if !logged[key] {
				log.Warn(text)
			}
			found[key] = true
		}
		for _, w := range lamps.warnings() {
			warn(w.limit, w.text)
		}
		// the feeds newly shortened or over the limit: the first few each
		// in a record of its own, the rest named together in one
		var trimmed []publish.Trimmed
		var trimmedIDs []string
		for _, t := range b.Trimmed { // service.oversize: trim: publish's note
			if key := "trimmed:" + t.Feed.ID; !logged[key] {
				trimmed, trimmedIDs = append(trimmed, t), append(trimmedIDs, t.Feed.ID)
			}
			found["trimmed:"+t.Feed.ID] = true
		}
		warnGrouped(log, publish.TrimNotes(trimmed, opts.MaxFeedBytes), trimmedIDs)
		if opts.Oversize == "" || opts.Oversize == publish.OversizeWarn { // published all the same: say so, as publish does
			var over []publish.FeedInfo
			var overIDs []string
			for _, f := range b.Feeds {
				if limit := opts.MaxFeedBytes; limit > 0 && f.Bytes > limit {
					if key := "oversize:" + f.ID; !logged[key] {
						over, overIDs = append(over, f), append(overIDs, f.ID)
					}
					found["oversize:"+f.ID] = true
				}
			}
			warnGrouped(log, publish.OversizeWarnings(over, opts.MaxFeedBytes), overIDs)
		}
		logged = found
		return b, nil
	}
}

// warnGrouped logs at WARN lines, publish.OversizeWarnings or
// publish.TrimNotes of the feeds ids, a record each: the line that names
// the feeds after the first publish.EachWarned together carries their ids
// as feed_ids too, for a reader of the log that takes its attributes.
func warnGrouped(log *slog.Logger, lines, ids []string) {
	for i, l := range lines {
		if i == publish.EachWarned {
			log.Warn(l, "feed_ids", ids[i:])
			continue
		}
		log.Warn(l)
	}
}

func runServe(ctx context.Context, g *globals, o *serveOptions) error {
	var handler slog.Handler
	switch o.logFormat {
	case "text":
		handler = slog.NewTextHandler(g.stderr, nil)
	case "json":
		handler = slog.NewJSONHandler(g.stderr, nil)
	default:
		return badInput("--log-format: %q: use text or json", o.logFormat)
	}
	log := slog.New(handler)
	if err := checkBaseURLFlag(o.baseURL); err != nil {
		return err
	}
	if o.listen != "" {
		if err := config.CheckListen(o.listen); err != nil {
			return badInput("--listen: %w", err)
		}
	}
	cfg, src, err := loadConfig(g)
	if err != nil {
		return err
	}
	// The base URL: --base-url, else service.base_url of the configuration
	// in force (a reload with a new one applies it).
	baseOf := func(c *config.Config) string {
		if o.baseURL != "" {
			return o.baseURL
		}
		return c.Service.BaseURL
	}
	listen := cfg.Service.Listen
	if o.listen != "" {
		listen = o.listen
	}
	var adhoc atomic.Pointer[adhocSettings]
	setAdhoc := func(c *config.Config) {
		adhoc.Store(&adhocSettings{layout: newLayout(baseOf(c)), refresh: refreshInterval(c, time.Now())})
	}
	setAdhoc(cfg)
	access := log
	if !o.accessLog {
		access = slog.New(slog.DiscardHandler)
	}
	v := currentVersion()
	srv, err := serve.New(serve.Options{
		Logger:            log,
		AccessLogger:      access,
		Build:             serveBuild(cfg, baseOf(cfg), log),
		BaseURL:           baseOf(cfg),
		TrustedProxies:    cfg.Service.TrustedProxies,
		Version:           v.Version,
		Revision:          v.Revision,
		Adhoc:             adhocFeedFrom(func() adhocSettings { return *adhoc.Load() }),
		Preview:           adhocCalendarFrom(func() adhocSettings { return *adhoc.Load() }),
		Page:              pageInfo(cfg),
		AdhocDefaultKinds: []string{"sunrise", "sunset", "civil-dawn", "civil-dusk"},
		AdhocMaxBytes:     cfg.Service.MaxFeedBytes,
		Schedule:          cfg.Service.Refresh,
		ScheduleZone:      cfg.Service.RefreshZone.Location,
	})
	if err != nil {
		return inputError{err}
	}
	log.Info("configuration loaded", "source", src.String(), "sites", len(cfg.Sites), "feeds", len(cfg.Feeds))
	for _, s := range cfg.Sites {
		if s.ZoneInferred {
			log.Info("site without timezone: using the zone in force at its coordinates", "site", s.ID, "zone", s.TimeZone.Name())
		}
	}

	// SIGHUP reloads the configuration; the signal stays here so the serve
	// package can be run by tests without signals.
	hup := make(chan os.Signal, 1)
	signal.Notify(hup, syscall.SIGHUP)
	defer signal.Stop(hup)
	go func() {
		for {
			select {
			case <-ctx.Done():
				return
			case <-hup:
				if next := reloadServe(ctx, g, log, srv, cfg, baseOf, o.listen); next != nil {
					cfg = next
					setAdhoc(cfg)
					srv.SetPage(pageInfo(cfg))
					if err := srv.SetPublic(baseOf(cfg), cfg.Service.TrustedProxies); err != nil {
						log.Error("the new base_url or trusted_proxies could not be applied", "err", err)
					}
				}
			}
		}
	}()
	// Listen here, so that a failure names where the address came from.
	ln, err := net.Listen("tcp", listen)
	if err != nil {
		from := "service.listen"
		if o.listen != "" {
			from = "--listen"
		} else if v, ok := g.getenv("HELIOCAL_LISTEN"); ok && v != "" {
			from = "HELIOCAL_LISTEN"
		}
		cause := errors.Unwrap(err) // drop the "listen tcp <addr>:" the address is already named
		if cause == nil {
			cause = err
		}
		return fmt.Errorf("%s %s: cannot listen: %w", from, listen, cause)
	}
	defer startServeGC(g.getenv)() // fewer collections for the ad-hoc feeds' garbage
	// The first ad-hoc requests find today's ephemeris ready. Before the
	// feeds' first build, which would slow it down (it takes every core):
	// about 15 ms of CPU.
	srv.WarmAdhoc(ctx)
	return srv.Run(ctx, ln)
}
