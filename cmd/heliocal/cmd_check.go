package main

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
	"text/tabwriter"
	"time"

	"github.com/spf13/cobra"

	"heliocal/astro"
	"heliocal/config"
	"heliocal/feed"
	"heliocal/feed/publish"
)

func newCheckCommand(g *globals) *cobra.Command {
	var format string
	cmd := &cobra.Command{
		Use:   "check",
		Short: "Validate the configuration and summarise its sites and feeds",
		Long: `Validate the configuration (every problem is listed, each with its field and value) and,
when it is valid, build every feed once and print the directory publish writes to (a
relative service.out_dir is read from the working directory, not the file's, and is shown
joined to it), the sites, the feeds, their event counts and sizes. A feed larger than service.max_feed_bytes is reported as publish and serve treat
it under service.oversize: warn publishes it as it is, with a warning (some widely used web
calendars are reported to drop events from subscriptions over about 1 MB); trim shortens it,
with publish's note and the shortened feed's size in the table; fail refuses it: check then
exits 1, as publish does. A lighting
latest_off (earliest_on) that comes before the evening lamps start (after the morning lamps
end) on some dates, and so does not limit them there, gets a warning too, as does a
date a kinds entry lists or a plan is on before the feed's window, or that the entry's own
months or weekdays leave out: it is never published. One after the window gets a note: it
is published once the window reaches it; so does a plan's date of the window that the
clocks skip whole (30 December 2011 in Pacific/Apia): the plan has no entry there. A photoperiod threshold no date of the window
crosses gets a warning whatever the dates its kinds entry keeps, as do a plan whose date is
an event of the sky (photoperiod:20h, full-moon) that no date of the window has, a plan on
29 February (every 02-29) whose window holds none, an alarm on all-day entries (calendars set no reminder
before them) and all_day: true on a kind whose entries are all-day already.

--format json prints one JSON document on standard output for scripts: the sites and feeds
of a valid configuration, or {"valid": false, "problems": [...]} with one object per
problem (exit code 2).` + exitStatusHelp,
		Example: `  heliocal check --config farm.yaml
  heliocal check --config - < farm.toml
  heliocal check --format json | jq '.feeds[] | select(.oversize) | .id'`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			switch format {
			case "text", "json":
			default:
				return badInput("--format: %q: use text or json", format)
			}
			return runCheck(cmd.Context(), g, time.Now(), format)
		},
	}
	cmd.Flags().StringVar(&format, "format", "text", "output: text (tables) or json (for scripts)")
	return cmd
}

// checkReport is what check finds, for --format json.
type checkReport struct {
	Configuration string `json:"configuration"` // file name, "standard input" or "built-in demo"
	Valid         bool   `json:"valid"`
	// OutDir is service.out_dir as publish finds it: a relative directory
	// joined to the working directory (resolvedOutDir)
	OutDir   string         `json:"out_dir,omitempty"`
	Problems []checkProblem `json:"problems,omitempty"`
	Sites    []checkSite    `json:"sites"`
	Feeds    []checkFeed    `json:"feeds"`
	Warnings []string       `json:"warnings"`
	// Notes are what check tells that needs no change: a listed date after
	// a feed's window, published once the window reaches it; a feed that
	// publish and serve shorten to fit max_feed_bytes (oversize: trim).
	Notes []string `json:"notes"`
	// Refused are the feeds publish and serve refuse, over max_feed_bytes
	// under oversize: fail (exit 1, as publish).
	Refused []string `json:"refused,omitempty"`
	// outDir is service.out_dir as written, which the text names beside
	// OutDir when it is relative
	outDir string
	// limit is service.max_feed_bytes, which the text table's size of an
	// Oversize feed is told apart from, as its warning or note tells it
	limit int
	// oversize are the feeds over limit published as they are, their
	// warnings at oversizeAt in Warnings; trimmed the feeds shortened to
	// fit, their notes at trimmedAt in Notes: the text names those after
	// the first few together (publish.OversizeWarnings, TrimNotes), the
	// JSON each in its own line
	oversize              []publish.FeedInfo
	oversizeAt, trimmedAt []int
	trimmed               []publish.Trimmed
}

type checkProblem struct {
	Field string `json:"field"`
	// Line is the line of the file the field is written on (or the
	// mapping it is missing from); absent when not known.
	Line    int    `json:"line,omitempty"`
	Value   string `json:"value"`
	Message string `json:"message"`
	Hint    string `json:"hint,omitempty"`
}

type checkSite struct {
	ID string `json:"id"`
	sitePlace
	// SkylineFile is the CSV file the skyline was read from.
	SkylineFile string `json:"skyline_file,omitempty"`
	siteHorizon
	TimeZone         string `json:"timezone"`
	TimeZoneInferred bool   `json:"timezone_inferred"`
}

// siteHorizon says which horizon rise and set at a site are taken over, as
// the JSON of check and of events give it: "horizon_deg": 0 alone is both
// the level horizon written 0 and the flat one an elevation lowers by its
// dip.
type siteHorizon struct {
	// HorizonSet is true when the horizon is one altitude as written, 0
	// included (a level horizon): rise and set are taken over it, with no
	// dip.
	HorizonSet bool `json:"horizon_set"`
	// Dip is the dip of the horizon in degrees that lowers the flat horizon
	// rise and set are taken over (no horizon written, elevation above 0;
	// with a skyline, its points at 0°), to a thousandth; 0 when none does.
	Dip float64 `json:"dip_deg"`
}

func horizonOf(s *config.Site) siteHorizon {
	return siteHorizon{HorizonSet: s.OwnHorizon(), Dip: dipOf(s)}
}

// horizonText is a site's horizon in the table: "0°", "1.5°", "−0.8°",
// "0° level, no dip" for a horizon written 0, "0°, dip 1.0°" for the flat
// horizon of an elevated site, or "skyline 1–14° (8 points, hills.csv)",
// with the minus sign of every altitude the texts write.
func horizonText(s checkSite) string {
	switch {
	case len(s.Skyline) > 0:
		return feed.SkylineText(feed.SkylineFactsOf(s.Skyline, s.SkylineFile))
	case s.HorizonSet && s.Horizon == 0:
		return "0° level, no dip"
	case s.Dip > 0:
		return fmt.Sprintf("0°, dip %.1f°", s.Dip)
	}
	return feed.AltitudeText(s.Horizon)
}

// dipOf is the dip of the horizon (degrees, to a thousandth) that rise and
// set at s are taken over: that of its elevation over the flat horizon or
// a skyline's points at 0°, none over a horizon written as one altitude.
func dipOf(s *config.Site) float64 {
	if s.OwnHorizon() || len(s.Skyline) > 0 && !slices.ContainsFunc(s.Skyline, func(p [2]float64) bool { return p[1] == 0 }) {
		return 0
	}
	return math.Round(astro.Dip(s.Elevation)*1000) / 1000
}

type checkFeed struct {
	ID    string   `json:"id"`
	Site  string   `json:"site"`
	Kinds []string `json:"kinds"`
	// KindsShown are the kinds entries as the text table and the warnings
	// write them: with an entry's offset ("sunrise-30m"), so two sunrise
	// entries read apart; Kinds keeps the kind names
	KindsShown []string `json:"kinds_shown"`
	Plans      int      `json:"plans"`
	DaysBack   int      `json:"days_back"`
	DaysAhead  int      `json:"days_ahead"`
	Events     int      `json:"events"`
	Bytes      int      `json:"bytes"`
	Oversize   bool     `json:"oversize"` // over service.max_feed_bytes, the whole window
	// TrimmedTo is the last date of a feed shortened to fit (oversize:
	// trim); Events and Bytes are then the shortened feed's. Of a feed
	// refused (Oversize without TrimmedTo, among the report's refused),
	// Events are the whole window's and Bytes the size its refusal names.
	TrimmedTo string `json:"trimmed_to,omitempty"`
}

// writeCheckJSON prints a report, indented, on standard output.
func writeCheckJSON(g *globals, r *checkReport) error {
	b, err := json.MarshalIndent(r, "", "  ")
	if err != nil {
		return err
	}
	_, err = g.stdout.Write(append(b, '\n'))
	return err
}

// checkProblems is the JSON report of an invalid configuration; the error
// is returned unchanged for the exit code, without a second listing.
func checkProblems(g *globals, src config.Source, err error) error {
	var ve *config.ValidationError
	r := &checkReport{Configuration: src.String(), Sites: []checkSite{}, Feeds: []checkFeed{}, Warnings: []string{}, Notes: []string{}}
	if errors.As(err, &ve) {
		for _, p := range ve.Problems {
			r.Problems = append(r.Problems, checkProblem{Field: p.Path, Line: p.Line, Value: p.Value, Message: p.Msg, Hint: p.Hint})
		}
	} else {
		r.Problems = []checkProblem{{Message: err.Error()}}
	}
	if werr := writeCheckJSON(g, r); werr != nil {
		return werr
	}
	return silentError{err}
}

func runCheck(ctx context.Context, g *globals, now time.Time, format string) error {
	cfg, src, err := loadConfig(g)
	if err != nil {
		if format == "json" {
			return checkProblems(g, src, err)
		}
		return err
	}
	r, zoneLines, err := checkConfig(ctx, cfg, src, now)
	if err != nil {
		return err
	}
	if format == "json" {
		if err := writeCheckJSON(g, r); err != nil {
			return err
		}
		if len(r.Refused) > 0 {
			return silentError{refusedError(r.Refused)}
		}
		return nil
	}
	if err := writeCheckText(g, r, zoneLines); err != nil {
		return err
	}
	if len(r.Refused) > 0 {
		return refusedError(r.Refused)
	}
	return nil
}

// refusedError is the feeds publish and serve refuse, one per line: a
// run-time failure (exit 1) as publish's, since a feed's size moves with
// its window, not a problem of the file.
type refusedError []string

func (e refusedError) Error() string { return strings.Join(e, "\n") }

// zoneNotes says, for each site without a timezone, which zone was taken
// from its coordinates.
func zoneNotes(cfg *config.Config, now time.Time) []string {
	var notes []string
	for _, s := range cfg.Sites {
		if s.ZoneInferred {
			notes = append(notes, "note: "+zoneNote(&s, now, ""))
		}
	}
	return notes
}

// zoneNote says which zone was taken from the coordinates of site s, which
// has no timezone, named with its offset at when: the words of check,
// publish, serve and events alike. With flag (events at a place given by
// its coordinates: "--tz") it says that flag was not given, and to give it.
func zoneNote(s *config.Site, when time.Time, flag string) string {
	missing, choose := "site "+s.ID+" has no timezone", "; add timezone: to choose another"
	if flag != "" {
		missing, choose = "no "+flag+" given", " (give "+flag+" to choose another)"
	}
	return fmt.Sprintf("%s: using %s, the zone in force at %s%s",
		missing, config.DescribeZone(s.TimeZone.Location, when), feed.Coords(s.Latitude, s.Longitude, 4), choose)
}

// checkConfig builds every feed of a valid configuration once, encoded as
// publish encodes it under service.oversize, and reports the sites and
// feeds, the warnings (a feed over max_feed_bytes under warn, a photoperiod
// kind that gives only a note, whatever its filters, lighting limits that
// do not limit, dates before a feed's window or left out by their entry's
// months or weekdays, a plan on 29 February whose window holds none,
// options all-day entries make do nothing), the notes (dates after a feed's window, a feed
// shortened under trim) and the feeds refused under fail; it returns apart
// the lines that note which sites take their zone from their coordinates.
func checkConfig(ctx context.Context, cfg *config.Config, src config.Source, now time.Time) (*checkReport, []string, error) {
	srcs, opts, err := build(cfg, now, newLayout(cfg.Service.BaseURL))
	if err != nil {
		return nil, nil, err
	}
	r := &checkReport{Configuration: src.String(), Valid: true, OutDir: resolvedOutDir(cfg.Service.OutDir), outDir: cfg.Service.OutDir,
		Sites: []checkSite{}, Feeds: []checkFeed{}, Warnings: []string{}, Notes: []string{}}
	for _, s := range cfg.Sites {
		r.Sites = append(r.Sites, checkSite{ID: s.ID, sitePlace: placeOf(&s), SkylineFile: s.HorizonFile,
			siteHorizon: horizonOf(&s), TimeZone: s.TimeZone.Name(), TimeZoneInferred: s.ZoneInferred})
	}
	zoneLines := zoneNotes(cfg, now)
	r.Warnings = append(r.Warnings, zoneWarnings(cfg, now)...)
	limit := cfg.Service.MaxFeedBytes
	r.limit = limit
	for i, s := range srcs {
		if err := ctx.Err(); err != nil {
			return nil, nil, err
		}
		f := cfg.Feeds[i]
		cal, err := s.Build(ctx)
		if err != nil {
			return nil, nil, err
		}
		kinds, shown := make([]string, len(f.Kinds)), make([]string, len(f.Kinds))
		for j, k := range f.Kinds {
			kinds[j], shown[j] = k.Kind.String(), k.Kind.String()
			if off := k.Offset.D(); off > 0 {
				shown[j] += "+" + k.Offset.String()
			} else if off < 0 {
				shown[j] += k.Offset.String()
			}
		}
		// as the note reads on the window's first date, whatever dates the
		// kinds entry keeps
		for _, n := range cal.NotCrossed {
			shows := "the feed shows only this note for it"
			if !slices.ContainsFunc(cal.Entries, func(e feed.Entry) bool { return e.Facts.Note && e.Kind == n.Kind }) {
				shows = "the feed shows nothing for it: its months, weekdays or dates keep no date of the window"
			}
			r.Warnings = append(r.Warnings, fmt.Sprintf("feed %q: %s: %s; %s", f.ID, n.Kind, n.Title, shows))
		}
		for _, w := range lampLimitWarnings(&f, cal) {
			r.Warnings = append(r.Warnings, w.text)
		}
		listed := make([][]time.Time, len(f.Kinds))
		for j, k := range f.Kinds {
			listed[j] = config.ListedDates(k.Dates)
		}
		rules := planRules(f.Plans)
		warnings, later := datesOutsideWindow(&f, shown, listed, rules, cal)
		r.Warnings = append(r.Warnings, warnings...)
		r.Warnings = append(r.Warnings, datesFilteredOut(&f, shown, listed)...)
		r.Warnings = append(r.Warnings, planDatesFilteredOut(&f, rules)...)
		r.Warnings = append(r.Warnings, leapDayWarnings(&f, rules, cal)...)
		r.Warnings = append(r.Warnings, eventPlanWarnings(&f, rules, cal)...)
		r.Warnings = append(r.Warnings, allDayWarnings(&f, shown)...)
		r.Notes = append(r.Notes, later...)
		r.Notes = append(r.Notes, skippedPlanNotes(&f, cal)...)
		// encoded as publish and serve encode it, under service.oversize:
		// as it is, shortened, or refused
		cf := checkFeed{ID: f.ID, Site: f.Site, Kinds: kinds, KindsShown: shown, Plans: len(f.Plans), DaysBack: f.DaysBack, DaysAhead: f.DaysAhead}
		whole := len(cal.Entries)
		data, err := publish.Encode(cal, &opts)
		cf.Events = len(cal.Entries) // as trim left them
		var oe *publish.OversizeError
		switch {
		case errors.As(err, &oe):
			// the whole window's events, however trim left the calendar
			// (with no entry, or as it came): publish and serve refuse it whole
			cf.Events, cf.Bytes, cf.Oversize = whole, oe.Bytes, true
			r.Refused = append(r.Refused, publish.OversizeRefusal(oe))
		case err != nil:
			return nil, nil, fmt.Errorf("feed %q: %w", f.ID, err)
		case !cal.TrimmedTo.IsZero():
			cf.Bytes, cf.Oversize, cf.TrimmedTo = len(data), true, cal.TrimmedTo.Format(time.DateOnly)
			t := publish.Trimmed{Feed: publish.FeedInfo{ID: f.ID, File: f.ID + ".ics", Events: cf.Events, Bytes: cf.Bytes}, To: cal.TrimmedTo}
			r.trimmed, r.trimmedAt = append(r.trimmed, t), append(r.trimmedAt, len(r.Notes))
			r.Notes = append(r.Notes, publish.TrimNote(t, limit))
		default:
			cf.Bytes, cf.Oversize = len(data), limit > 0 && len(data) > limit
			if cf.Oversize {
				r.oversize = append(r.oversize, publish.FeedInfo{ID: f.ID, File: f.ID + ".ics", Events: cf.Events, Bytes: cf.Bytes})
				r.oversizeAt = append(r.oversizeAt, len(r.Warnings))
				r.Warnings = append(r.Warnings, publish.OversizeWarning(f.ID, len(data), limit))
			}
		}
		r.Feeds = append(r.Feeds, cf)
	}
	return r, zoneLines, nil
}

// writeCheckText prints the report as two tables on standard output, the
// zoneLines after the sites' and the report's notes after the feeds', and
// the warnings on standard error. Standard output is written in one piece,
// so that an output that cannot take it (a full disk, a closed pipe) is an
// error.
func writeCheckText(g *globals, r *checkReport, zoneLines []string) error {
	w := new(bytes.Buffer)
	fmt.Fprintf(w, "configuration: %s (valid)\n", r.Configuration)
	if r.OutDir != r.outDir {
		fmt.Fprintf(w, "out_dir: %s (%s, relative to the working directory)\n\n", r.OutDir, r.outDir)
	} else {
		fmt.Fprintf(w, "out_dir: %s\n\n", r.OutDir)
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "SITE\tNAME\tLATITUDE\tLONGITUDE\tELEVATION\tHORIZON\tZONE")
	for _, s := range r.Sites {
		zone := s.TimeZone
		if s.TimeZoneInferred {
			zone += " (from the coordinates)"
		}
		fmt.Fprintf(tw, "%s\t%s\t%.4f\t%.4f\t%g m\t%s\t%s\n", s.ID, s.Name, s.Latitude, s.Longitude, s.Elevation, horizonText(s), zone)
	}
	tw.Flush()
	for _, line := range zoneLines {
		fmt.Fprintln(w, line)
	}
	fmt.Fprintln(w)
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "FEED\tSITE\tKINDS\tWINDOW\tEVENTS\tSIZE")
	for _, f := range r.Feeds {
		kinds := f.KindsShown
		switch f.Plans {
		case 0:
		case 1:
			kinds = append(kinds[:len(kinds):len(kinds)], "1 plan")
		default:
			kinds = append(kinds[:len(kinds):len(kinds)], fmt.Sprintf("%d plans", f.Plans))
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\n", f.ID, f.Site, strings.Join(kinds, ","), window(f.DaysBack, f.DaysAhead), feed.FormatCount(f.Events), f.size(r.limit))
	}
	tw.Flush()
	for _, n := range grouped(r.Notes, r.trimmedAt, publish.TrimNotes(r.trimmed, r.limit)) {
		fmt.Fprintln(w, "note: "+n)
	}
	_, err := g.stdout.Write(w.Bytes())
	for _, wmsg := range grouped(r.Warnings, r.oversizeAt, publish.OversizeWarnings(r.oversize, r.limit)) {
		fmt.Fprintln(g.stderr, "heliocal: warning: "+wmsg)
	}
	return err
}

// grouped is lines with those at the indexes at (ascending), one per feed
// of a kind, replaced in turn by the lines of group, which tell the first
// feeds each in its own line and name the rest together in one
// (publish.OversizeWarnings, publish.TrimNotes): that line takes the place
// of the first feed it names, and the later feeds' own lines are left out.
func grouped(lines []string, at []int, group []string) []string {
	out := make([]string, 0, len(lines))
	k := 0
	for i, l := range lines {
		if k < len(at) && at[k] == i {
			if k < len(group) {
				out = append(out, group[k])
			}
			k++
			continue
		}
		out = append(out, l)
	}
	return out
}

// size writes a feed's size as every size heliocal reports, and that of a
// feed over max_feed_bytes (shortened or refused for it) with the decimals
// that tell it from the limit, as the feed's warning or note writes it:
// "1.05 MB" over "1 MB", not "1.0 MB"; limit is service.max_feed_bytes.
func (f *checkFeed) size(limit int) string {
	if f.Oversize && limit > 0 {
		s, _ := publish.FormatBytesOver(int64(f.Bytes), int64(limit))
		return s
	}
	return publish.FormatBytes(int64(f.Bytes))
}

// window writes a feed's window of days_back and days_ahead as the check
// table shows it: "-30/+365 d", a side of none left out ("+365 d", "-30 d"),
// and "today" for a window of today alone.
func window(back, ahead int) string {
	switch {
	case back == 0 && ahead == 0:
		return "today"
	case back == 0:
		return fmt.Sprintf("+%d d", ahead)
	case ahead == 0:
		return fmt.Sprintf("-%d d", back)
	}
	return fmt.Sprintf("-%d/+%d d", back, ahead)
}
