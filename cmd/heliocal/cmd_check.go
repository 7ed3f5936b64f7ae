package main

import (
	"context"
	"fmt"
	"strings"
	"text/tabwriter"
	"time"

	"github.com/spf13/cobra"

	"heliocal/config"
	"heliocal/feed/ical"
)

func newCheckCommand(g *globals) *cobra.Command {
	return &cobra.Command{
		Use:   "check",
		Short: "Validate the configuration and summarise its sites and feeds",
		Long: `Validate the configuration (every problem is listed, each with its field and value) and,
when it is valid, build every feed once and print the sites, the feeds, their event counts
and sizes. A feed larger than service.max_feed_bytes gets a warning: some widely used web
calendars are reported to drop events from subscriptions over about 1 MB.` + exitStatusHelp,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			return runCheck(cmd.Context(), g, time.Now())
		},
	}
}

func runCheck(ctx context.Context, g *globals, now time.Time) error {
	cfg, src, err := loadConfig(g)
	if err != nil {
		return err
	}
	srcs, _, err := build(cfg, now, newLayout(cfg.Service.BaseURL))
	if err != nil {
		return err
	}
	w := g.stdout
	fmt.Fprintf(w, "configuration: %s (valid)\n\n", src)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "SITE\tNAME\tLATITUDE\tLONGITUDE\tELEVATION\tZONE")
	var inferred []string
	for _, s := range cfg.Sites {
		zone := s.TimeZone.Name()
		if s.ZoneInferred {
			zone += " (from the coordinates)"
			inferred = append(inferred, fmt.Sprintf("note: site %s has no timezone: using %s, the zone in force at %.4f, %.4f; add timezone: to choose another",
				s.ID, config.DescribeZone(s.TimeZone.Location, now), s.Latitude, s.Longitude))
		}
		fmt.Fprintf(tw, "%s\t%s\t%.4f\t%.4f\t%g m\t%s\n", s.ID, s.Name, s.Latitude, s.Longitude, s.Elevation, zone)
	}
	tw.Flush()
	for _, line := range inferred {
		fmt.Fprintln(w, line)
	}
	fmt.Fprintln(w)
	limit := cfg.Service.MaxFeedBytes
	var warnings []string
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "FEED\tSITE\tKINDS\tWINDOW\tEVENTS\tSIZE")
	for i, s := range srcs {
		if err := ctx.Err(); err != nil {
			return err
		}
		f := cfg.Feeds[i]
		cal, err := s.Build(ctx)
		if err != nil {
			return err
		}
		data, err := ical.Marshal(cal, ical.Options{Version: versionString()})
		if err != nil {
			return fmt.Errorf("feed %q: %w", f.ID, err)
		}
		kinds := make([]string, len(f.Kinds))
		for j, k := range f.Kinds {
			kinds[j] = k.Kind.String()
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t-%d/+%d d\t%d\t%s\n", f.ID, f.Site, strings.Join(kinds, ","), f.DaysBack, f.DaysAhead, len(cal.Entries), size(len(data)))
		if limit > 0 && len(data) > limit {
			warnings = append(warnings, fmt.Sprintf("warning: feed %q is %s, over service.max_feed_bytes (%s): some web calendars drop events from subscriptions this large; shorten days_back/days_ahead or split the kinds into several feeds", f.ID, size(len(data)), size(limit)))
		}
	}
	tw.Flush()
	for _, wmsg := range warnings {
		fmt.Fprintln(g.stderr, wmsg)
	}
	return nil
}

func size(n int) string {
	switch {
	case n >= 1_000_000:
		return fmt.Sprintf("%.1f MB", float64(n)/1e6)
	case n >= 1000:
		return fmt.Sprintf("%.0f kB", float64(n)/1e3)
	}
	return fmt.Sprintf("%d B", n)
}
