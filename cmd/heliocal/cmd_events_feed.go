package main

import (
	"context"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"iter"
	"slices"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"

	"heliocal/astro"
	"heliocal/config"
	"heliocal/feed"
	"heliocal/feed/ical"
)

// localCSVTime is the layout of local times in CSV: the offset is always
// numeric ("+00:00" in UTC, never "Z"), so a local time reads as one.
// localCSVTimeSeconds is the layout for an offset that is not whole minutes
// (local mean times before standard time, Europe/Amsterdam's +00:19:32
// until 1937): the offset with its seconds, so that the time and its offset
// still give the instant.
const (
	localCSVTime        = "2006-01-02T15:04:05-07:00"
	localCSVTimeSeconds = "2006-01-02T15:04:05-07:00:00"
)

// runEventsFeed lists the entries of a configured feed exactly as the feed
// has them: its kinds with their options, its plans, notes and titles.
func runEventsFeed(ctx context.Context, g *globals, o *eventsOptions) error {
	if o.site != "" || o.placeFlag || o.tz != "" || o.maxLit != 0 {
		return badInput("--feed %q: give either --feed, --site or --lat/--lon/--tz; the feed's options come from the configuration", o.feed)
	}
	if o.placeOnly != "" {
		return placeOnlyError(o.placeOnly, "--feed", o.feed)
	}
	cfg, _, err := loadConfig(g)
	if err != nil {
		return err
	}
	var f *config.Feed
	for i := range cfg.Feeds {
		if cfg.Feeds[i].ID == o.feed {
			f = &cfg.Feeds[i]
		}
	}
	if f == nil {
		return noSuchFeed(cfg, o.feed)
	}
	l := newLayout(cfg.Service.BaseURL)
	cat, err := feed.NewCatalogue(cfg, feed.Options{Now: o.now, FeedURL: l.feedURL, PageURL: l.base, Refresh: refreshInterval(cfg, o.now)})
	if err != nil {
		return err
	}
	first, last, err := cat.Window(f)
	if err != nil {
		return err
	}
	var site *config.Site
	for i := range cfg.Sites {
		if cfg.Sites[i].ID == f.Site {
			site = &cfg.Sites[i]
		}
	}
	if o.from != "" {
		if first, err = parseDate("--from", o.from); err != nil {
			return err
		}
		if o.to == "" {
			last = first.AddDate(0, 0, 6)
		}
	}
	if o.to != "" {
		if last, err = parseDate("--to", o.to); err != nil {
			return err
		}
	}
	toDefault := ""
	if o.from != "" && o.to == "" {
		toDefault = "--from + 6 days"
	}
	if err := checkRange(first, last, toDefault); err != nil {
		return err
	}
	cal, err := cat.CalendarBetween(ctx, f, first, last)
	if err != nil {
		return err
	}
	if site.ZoneInferred { // as events --site says it
		fmt.Fprintf(g.stderr, "heliocal: note: %s\n", zoneNote(site, noonOn(first, site.TimeZone.Location), ""))
	}
	for _, n := range skippedPlanNotes(f, cal) { // as check notes them
		fmt.Fprintf(g.stderr, "heliocal: note: %s\n", n)
	}
	switch o.format {
	case "ics":
		data, err := ical.Marshal(cal, ical.Options{Version: versionString()})
		if err != nil {
			return err
		}
		_, err = g.stdout.Write(data)
		return err
	case "json":
		return writeEntriesJSON(g.stdout, site, first, last, cal)
	case "csv":
		return writeEntriesCSV(g.stdout, cal)
	case "table":
		return writeEntriesTable(g.stdout, site, cal)
	}
	return badInput("--format: %q: use table, json, csv or ics", o.format)
}

// checkRange refuses a date range that is reversed or outside the supported
// dates 1800-01-01..2200-12-31 (astro computes a month beyond them, enough
// for the ephemeris, the plans and far time zones).
//
// toDefault says where to came from when --to was not given ("--from + 6
// days"), "" when it was: a range that ends past the supported dates only by
// that default says so and which --to the range can have, the user never
// having written its end.
func checkRange(from, to time.Time, toDefault string) error {
	if to.Before(from) {
		return badInput("--to: %s is before --from %s", to.Format(time.DateOnly), from.Format(time.DateOnly))
	}
	lo, hi := astro.MinTime(), astro.MaxTime().AddDate(0, 0, -1)
	if toDefault != "" && !from.Before(lo) && !from.After(hi) && to.After(hi) {
		return badInput("--to: not given, so %s: %s..%s, past the supported dates %s..%s: give --to %s", toDefault,
			from.Format(time.DateOnly), to.Format(time.DateOnly), lo.Format(time.DateOnly), hi.Format(time.DateOnly), hi.Format(time.DateOnly))
	}
	if from.Before(lo) || to.After(hi) {
		return badInput("--from/--to: %s..%s: outside the supported dates %s..%s", from.Format(time.DateOnly),
			to.Format(time.DateOnly), lo.Format(time.DateOnly), hi.Format(time.DateOnly))
	}
	return nil
}

// jsonEntry is one calendar entry in JSON and, field by field, in CSV.
type jsonEntry struct {
	Kind  string `json:"kind"`
	Title string `json:"title"`
	Date  string `json:"date"`
	Start string `json:"start,omitempty"` // timed entries only
	End   string `json:"end,omitempty"`
	// Open: a band's span not left before the listing ends (End is its end)
	Open bool `json:"open,omitempty"`
	// eclipse fields (max, type, magnitudes, phases), inline as in the
	// events of the kinds
	*jsonEclipse
	AllDay      bool     `json:"all_day,omitempty"`
	Part        string   `json:"part,omitempty"`
	Direction   string   `json:"direction,omitempty"`
	Note        bool     `json:"note,omitempty"`
	State       string   `json:"state,omitempty"`
	Until       string   `json:"until,omitempty"`
	Altitude    *float64 `json:"altitude_deg,omitempty"`
	Azimuth     *float64 `json:"azimuth_deg,omitempty"`
	Distance    *float64 `json:"distance_au,omitempty"`
	DayLength   *float64 `json:"day_length_s,omitempty"`
	DirectSun   *float64 `json:"direct_sun_s,omitempty"` // in place of day_length_s over a skyline
	DayChange   *float64 `json:"day_change_s,omitempty"`
	Lit         *float64 `json:"illuminated,omitempty"`
	Lamp        *float64 `json:"lamp_s,omitempty"`
	Short       bool     `json:"target_not_reached,omitempty"`
	NextDay     bool     `json:"next_day,omitempty"`
	Missing     string   `json:"missing_start,omitempty"`
	Alarm       *float64 `json:"alarm_s,omitempty"`
	UID         string   `json:"uid"`
	Description string   `json:"description"`
}

// carriesDayLength says whether the events of the kind named name carry
// the day length in their JSON, with --feed or without, a length of 0 too
// (polar night).
func carriesDayLength(name string) bool {
	switch name {
	case "photoperiod", "sunrise", "sunset", config.KindLighting, "daily-summary":
		return true
	}
	return false
}

// roundTo rounds x to the given number of decimals, as the nearest
// float64 to the decimal written (no 124.21000000000001 in the output).
func roundTo(x float64, decimals int) *float64 {
	v, _ := strconv.ParseFloat(strconv.FormatFloat(x, 'f', decimals, 64), 64)
	return &v
}

func seconds(d time.Duration) *float64 {
	if d == 0 {
		return nil
	}
	return roundTo(d.Seconds(), 3)
}

// endsNextDay says whether end, as shown (to the second), falls on the
// local date after date (00:00 UTC) in loc: next_day for every entry that
// has such an end (a lamp period or a dark window past midnight, a plan),
// the " +1 day" of its title and of the table.
func endsNextDay(end, date time.Time, loc *time.Location) bool {
	t := feed.ToSecond(end).In(loc)
	return time.Date(t.Year(), t.Month(), t.Day(), 0, 0, 0, 0, time.UTC).Equal(date.AddDate(0, 0, 1))
}

func toJSONEntry(cal *feed.Calendar, e *feed.Entry) jsonEntry {
	f := e.Facts
	j := jsonEntry{Kind: e.Kind, Title: e.Title, Date: e.Date.Format(time.DateOnly), AllDay: e.AllDay,
		Part: f.Part, Direction: feed.DirectionName(e.Kind, f.Direction), Note: f.Note, Short: f.Short, NextDay: f.NextDay, Open: f.Open,
		Missing: f.Missing, UID: e.UID, Description: e.Description, jsonEclipse: eclipseJSON(f.Eclipse)}
	if !e.AllDay {
		j.Start = feed.UTCStamp(e.Start)
		if !e.End.IsZero() {
			j.End = feed.UTCStamp(e.End)
			j.NextDay = j.NextDay || endsNextDay(e.End, e.Date, cal.Site.Location)
		}
		alarm := cal.Alarm
		if e.Alarm != nil {
			alarm = *e.Alarm
		}
		if alarm > 0 {
			j.Alarm = seconds(alarm)
		}
	}
	if f.Note {
		j.State = stateName(f.State)
		if strings.HasPrefix(e.Kind, config.KindLighting+":") {
			j.State = lampState(f.Short)
		}
		if f.Longest > 0 { // spans on the date, all left out by min_duration
			j.State = underMinDuration
		}
		if !f.Until.IsZero() {
			j.Until = f.Until.Format(time.DateOnly)
		}
	}
	if f.Altitude != 0 {
		j.Altitude = roundTo(f.Altitude, 4)
	}
	if f.Azimuth != 0 {
		j.Azimuth = roundTo(f.Azimuth, 2)
	}
	if f.Distance != 0 {
		d := f.Distance
		j.Distance = &d
	}
	j.DayLength, j.DayChange, j.Lamp = seconds(f.DayLength), seconds(f.DayChange), seconds(f.Lamp)
	if !f.Note { // the kinds whose events carry a day length carry it when it is 0 too, as without --feed
		if base, _, _ := strings.Cut(e.Kind, ":"); carriesDayLength(base) && !f.LongDay {
			j.DayLength = roundTo(f.DayLength.Seconds(), 3)
		}
		if e.Kind == "daily-summary" {
			j.DayChange = roundTo(f.DayChange.Seconds(), 3)
		}
	}
	if f.DirectSun { // time above the skyline, not sunrise to sunset; 0 in a shaded valley
		j.DirectSun, j.DayLength = roundTo(f.DayLength.Seconds(), 3), nil
	}
	if f.Illuminated != 0 {
		j.Lit = roundTo(f.Illuminated, 4)
	}
	return j
}

// writeEntriesJSON writes {"feed": …, "entries": […], "site": {…}} as the
// events listing is written: each entry on a line of its own, the rest
// indented by two spaces.
func writeEntriesJSON(w io.Writer, s *config.Site, from, to time.Time, cal *feed.Calendar) error {
	id, err := json.Marshal(cal.ID)
	if err != nil {
		return err
	}
	b := append([]byte("{\n  \"feed\": "), id...)
	b = append(b, ",\n  \"entries\": ["...)
	n := 0
	for i := range cal.Entries {
		for kind := range listedKinds(cal, &cal.Entries[i]) {
			j := toJSONEntry(cal, &cal.Entries[i])
			j.Kind = kind
			line, err := json.Marshal(j)
			if err != nil {
				return err
			}
			if n > 0 {
				b = append(b, ',')
			}
			b = append(b, "\n    "...)
			b = append(b, line...)
			n++
		}
	}
	if n > 0 {
		b = append(b, "\n  "...)
	}
	b, err = appendSiteEnd(append(b, ']'), s, from, to)
	if err != nil {
		return err
	}
	_, err = w.Write(b)
	return err
}

// entriesCSVHeader is the header row of a feed's entries as CSV: every
// field of their JSON form (a test holds it complete), and the local times;
// the eclipse fields come last.
var entriesCSVHeader = append([]string{"date", "kind", "title", "all_day", "start_utc", "end_utc", "start_local", "end_local",
	"part", "direction", "note", "state", "until", "altitude_deg", "azimuth_deg", "distance_au", "day_length_s", "direct_sun_s", "day_change_s",
	"illuminated", "lamp_s", "target_not_reached", "next_day", "missing_start", "alarm_s", "uid", "description", "open"}, eclipseCSVHeader...)

func writeEntriesCSV(w io.Writer, cal *feed.Calendar) error {
	loc := cal.Site.Location
	cw := csv.NewWriter(w)
	_ = cw.Write(entriesCSVHeader)
	for i := range cal.Entries {
		e := &cal.Entries[i]
		j := toJSONEntry(cal, e)
		startLocal, endLocal := "", ""
		if !e.AllDay {
			startLocal = localStamp(e.Start, loc)
			if !e.End.IsZero() {
				endLocal = localStamp(e.End, loc)
			}
		}
		for kind := range listedKinds(cal, e) {
			_ = cw.Write(append([]string{j.Date, kind, j.Title, yes(j.AllDay), j.Start, j.End, startLocal, endLocal,
				j.Part, j.Direction, yes(j.Note), j.State, j.Until, num(j.Altitude), num(j.Azimuth), num(j.Distance), num(j.DayLength), num(j.DirectSun),
				num(j.DayChange), num(j.Lit), num(j.Lamp), yes(j.Short), yes(j.NextDay), j.Missing, num(j.Alarm), j.UID, j.Description, yes(j.Open)},
				j.jsonEclipse.csvCells()...))
		}
	}
	cw.Flush()
	return cw.Error()
}

// listedKinds are the kinds an entry is listed under in JSON and CSV: its
// own, then every other kind a note stands for (SharedNotes), so that
// a script that picks the rows of civil-dusk finds "No civil dusk or dawn
// today", written once in the feed for civil-dawn and civil-dusk, on its
// date; the rows of one entry have the same uid.
func listedKinds(cal *feed.Calendar, e *feed.Entry) iter.Seq[string] {
	return func(yield func(string) bool) {
		if !yield(e.Kind) {
			return
		}
		for _, k := range cal.SharedNotes[e.UID] {
			if !yield(k) {
				return
			}
		}
	}
}

func yes(b bool) string {
	if b {
		return "true"
	}
	return ""
}

func num(p *float64) string {
	if p == nil {
		return ""
	}
	return strconv.FormatFloat(*p, 'f', -1, 64)
}

func writeEntriesTable(w io.Writer, s *config.Site, cal *feed.Calendar) error {
	loc := s.TimeZone.Location
	fmt.Fprintf(w, "%s (%s): %s, %s\n\n", cal.Title, cal.ID, s.Name, loc)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "DATE\tTIME\tKIND\tTITLE")
	for i := range cal.Entries {
		e := &cal.Entries[i]
		when := "all day"
		if !e.AllDay {
			when = feed.LocalClock(feed.ToSecond(e.Start), loc, true) + feed.DayMark(e.Start, e.Date, loc)
			switch {
			// " – ": the start ends in its zone's label ("UTC−04",
			// "CET"), which a bare dash would run into
			case e.Facts.Open: // the end of the listing, not the Sun's leaving the band
				when += " – past the end of the listing"
			case !e.End.IsZero():
				when += " – " + endClock(e.Start, e.End, loc) + feed.DayMark(e.End, e.Date, loc)
			}
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\n", e.Date.Format("2006-01-02 Mon"), when, e.Kind, e.Title)
	}
	return tw.Flush()
}

// toJSONNote is a date without an event; a lighting note says until when
// no lamps are needed.
func toJSONNote(n feed.Note) jsonNote {
	j := jsonNote{Kind: n.Kind.String(), Date: n.Date.Format(time.DateOnly), State: stateName(n.State)}
	if n.Kind.Name == "photoperiod" {
		j.Detail = feed.NotReachedText(n)
	}
	if n.Kind.Name == config.KindLighting {
		j.State = lampState(n.Lamp > 0)
		if !n.Until.IsZero() {
			j.Until = n.Until.Format(time.DateOnly)
		}
	}
	return j
}

// noteText is a note's details in the table, at a site in loc.
func noteText(n *feed.Note, loc *time.Location) string {
	if n.Kind.Name == "dark-window" {
		why := "the Sun stays less than 18° below the horizon"
		if n.State == astro.AlwaysBelow {
			why = "the Moon is up and bright"
		}
		return "no dark sky on the " + feed.NightOf(n.Date, loc) + ": " + why
	}
	if n.Kind.Name == "photoperiod" {
		return feed.NotReachedText(*n)
	}
	if n.Kind.Name != config.KindLighting {
		switch n.Kind.Name {
		case "golden-hour", "blue-hour", config.KindSunBand:
			if n.State == astro.Crosses { // the band's light goes on: as the feed's "No golden hour begins today"
				return "no span begins on this date: the one that began before lasts into it"
			}
		}
		return stateText(n.State)
	}
	if n.Lamp > 0 {
		return "lamps not scheduled, " + n.Why + ": the target is not reached"
	}
	if n.Until.IsZero() {
		return "no lamps needed to the end of the dates listed"
	}
	return "no lamps needed until " + n.Until.Format("2006-01-02")
}

// eventsCSVHeader is the header row of the events as CSV: every field of
// the JSON form (a test holds it complete; JSON's start and end are
// start_utc and end_utc), and the instants in local time with a numeric
// offset.
var eventsCSVHeader = []string{"date", "kind", "start_utc", "end_utc", "direction", "start_local", "end_local", "state",
	"until", "detail", "part", "altitude_deg", "distance_au", "day_length_s", "day_change_s", "illuminated", "lamp_s",
	"target_not_reached", "uncertainty_s", "max", "type", "magnitude", "obscuration", "umbral_magnitude",
	"partial_start", "partial_end", "total_start", "total_end", "azimuth_deg", "direct_sun_s",
	"visible_s", "visible_start", "visible_end", "open"}

// writeEventsCSVRows writes the rows of events and notes (one chunk of
// dates) under eventsCSVHeader, by local date, notes first on their date.
func writeEventsCSVRows(cw *csv.Writer, loc *time.Location, events []feed.Event, notes []feed.Note) error {
	for _, r := range mergeRows(events, notes) {
		if e := r.event; e != nil && plainJSONKinds[e.Kind.Name] && !e.DirectSun && !e.Open {
			if err := cw.Write(plainCSVRow(e, loc)); err != nil {
				return err
			}
			continue
		}
		var v any
		local := map[string]string{}
		if r.note != nil {
			v = toJSONNote(*r.note)
		} else {
			e := r.event
			v = toJSONEvent(*e)
			if !e.DateOnly() {
				local["start_local"] = localStamp(e.Start, loc)
			}
			if !e.End.IsZero() {
				local["end_local"] = localStamp(e.End, loc)
			}
		}
		if err := cw.Write(csvRow(v, local)); err != nil {
			return err
		}
	}
	return nil
}

// csvCol numbers the columns of eventsCSVHeader that plainCSVRow fills.
var csvCol = func() (c struct{ date, kind, start, end, direction, startLocal, endLocal, part, altitude, dayLength, azimuth int }) {
	at := func(name string) int { return slices.Index(eventsCSVHeader, name) }
	c.date, c.kind, c.start, c.end, c.direction = at("date"), at("kind"), at("start_utc"), at("end_utc"), at("direction")
	c.startLocal, c.endLocal, c.part = at("start_local"), at("end_local"), at("part")
	c.altitude, c.dayLength, c.azimuth = at("altitude_deg"), at("day_length_s"), at("azimuth_deg")
	return c
}()

// plainCSVRow is csvRow of toJSONEvent(*e) with e's local times, for an
// event of the kinds the JSON writer writes itself (plainJSONKinds, not
// over a skyline), formatted directly instead of through a JSON object
// (ten times faster): the same fields, numbers written as the JSON writer
// writes them (TestEventsJSONFormatting).
func plainCSVRow(e *feed.Event, loc *time.Location) []string {
	row := make([]string, len(eventsCSVHeader))
	row[csvCol.date] = e.Date.Format(time.DateOnly)
	row[csvCol.kind] = e.Kind.String()
	if !e.DateOnly() {
		row[csvCol.start], row[csvCol.startLocal] = feed.UTCStamp(e.Start), localStamp(e.Start, loc)
	}
	if !e.End.IsZero() {
		row[csvCol.end], row[csvCol.endLocal] = feed.UTCStamp(e.End), localStamp(e.End, loc)
	}
	row[csvCol.direction] = direction(*e)
	row[csvCol.part] = e.Part
	rounded := func(x float64, digits int) string { return string(appendRounded(nil, x, digits)) }
	if feed.MergedSpan(*e) {
		row[csvCol.altitude] = rounded(e.Altitude, 4)
	}
	switch e.Kind.Name {
	case "solar-noon":
		row[csvCol.altitude] = rounded(e.Altitude, 4)
	case "sunrise", "sunset":
		if !e.LongDay { // the end of the midnight Sun: no day length
			row[csvCol.dayLength] = rounded(e.DayLength.Seconds(), 3)
		}
		row[csvCol.azimuth] = rounded(e.Azimuth, 2)
	}
	return row
}

// csvRow writes the fields of a JSON object in the order of
// eventsCSVHeader: text as is, numbers and true as JSON writes them.
func csvRow(v any, local map[string]string) []string {
	b, _ := json.Marshal(v)
	var m map[string]json.RawMessage
	_ = json.Unmarshal(b, &m)
	row := make([]string, len(eventsCSVHeader))
	for i, c := range eventsCSVHeader {
		if l, ok := local[c]; ok {
			row[i] = l
			continue
		}
		raw, ok := m[strings.TrimSuffix(c, "_utc")]
		if !ok {
			continue
		}
		var str string
		if json.Unmarshal(raw, &str) == nil {
			row[i] = str
		} else if string(raw) != "false" && string(raw) != "null" {
			row[i] = string(raw)
		}
	}
	return row
}

// writeEventsICS writes the events of a query as a one-off iCalendar file,
// built as a feed of these kinds would be, streamed (unless a kind's notes
// speak of the whole range, see rangeNotes): the entries are
// computed feed.ChunkDays dates at a time and each chunk is written before
// the next is computed, so memory stays that of about two chunks whatever
// the span. The bytes are those of the whole calendar encoded at once
// (TestEventsICSStreamedAsWhole).
func writeEventsICS(ctx context.Context, w io.Writer, s *config.Site, specs []config.KindSpec, sky *feed.Sky, from, to time.Time) error {
	f := &config.Feed{ID: "events", Title: s.Name + " — events", Site: s.ID, Kinds: specs}
	if slices.ContainsFunc(specs, rangeNotes) {
		cal, err := sky.Calendar(ctx, s, f, from, to, feed.Options{})
		if err != nil {
			return err
		}
		data, err := ical.Marshal(cal, ical.Options{Version: versionString()})
		if err != nil {
			return err
		}
		_, err = w.Write(data)
		return err
	}
	chunk := func(first time.Time) (*feed.Calendar, error) {
		last := first.AddDate(0, 0, feed.ChunkDays-1)
		if last.After(to) {
			last = to
		}
		return sky.Calendar(ctx, s, f, first, last, feed.Options{})
	}
	var starts []time.Time
	for d := from; !d.After(to); d = d.AddDate(0, 0, feed.ChunkDays) {
		starts = append(starts, d)
	}
	first, err := chunk(starts[0])
	if err != nil {
		return err
	}
	last := first
	if len(starts) > 1 {
		if last, err = chunk(starts[len(starts)-1]); err != nil {
			return err
		}
	}
	// The head: the whole range's window; the first and last chunks'
	// entries size its time zone as the whole calendar's would.
	head := *first
	head.WindowEnd = last.WindowEnd
	head.Entries = append(slices.Clip(first.Entries), last.Entries...)
	st, err := ical.NewStream(w, &head, ical.Options{Version: versionString()})
	if err != nil {
		return err
	}
	var pending []feed.Entry
	for i := range starts {
		cal := first
		switch {
		case i == len(starts)-1:
			cal = last
		case i > 0:
			if cal, err = chunk(starts[i]); err != nil {
				return err
			}
		}
		if pending, err = streamEntries(st, pending, cal.Entries); err != nil {
			return err
		}
	}
	if err := st.Write(pending); err != nil {
		return err
	}
	return st.Close()
}

// rangeNotes reports whether a kind's notes speak of the whole range (a
// photoperiod no date of the calendar crosses, lamps needed to the end of
// the calendar): its calendar is computed and encoded whole, not by chunks.
func rangeNotes(k config.KindSpec) bool {
	return k.Kind.Name == "photoperiod" || k.Kind.Name == "lighting"
}

// streamEntries writes the entries of a chunk in the order of the whole
// calendar (feed.CompareEntries). pending are the earlier chunks' entries not
// yet written, in that order: those that come before the chunk's first
// entry are written (no later chunk has an entry that early), the others
// are merged with the chunk's and returned, to be written with the next.
// Entries go date by date, so a chunk's entries come after the earlier
// chunks'; the merge keeps the whole calendar's order whatever a chunk holds.
func streamEntries(st *ical.Stream, pending, entries []feed.Entry) ([]feed.Entry, error) {
	if len(entries) == 0 {
		return pending, nil
	}
	n := 0
	for n < len(pending) && entryBefore(&pending[n], &entries[0]) {
		n++
	}
	if err := st.Write(pending[:n]); err != nil {
		return nil, err
	}
	rest := pending[n:]
	merged := make([]feed.Entry, 0, len(rest)+len(entries))
	i, j := 0, 0
	for i < len(rest) || j < len(entries) {
		if j == len(entries) || (i < len(rest) && entryBefore(&rest[i], &entries[j])) {
			merged = append(merged, rest[i])
			i++
		} else {
			merged = append(merged, entries[j])
			j++
		}
	}
	return merged, nil
}

// entryBefore is the order of a calendar's entries (feed.CompareEntries).
func entryBefore(a, b *feed.Entry) bool { return feed.CompareEntries(a, b) < 0 }

// underMinDuration is the JSON state of a note of a span kind on a date
// whose spans are all shorter than the kind's min_duration.
const underMinDuration = "under-min-duration"

// lampState is the JSON state of a lighting note: lamps needed but none
// scheduled (all under the kind's min_duration), or none needed.
func lampState(notScheduled bool) string {
	if notScheduled {
		return "lamps-not-scheduled"
	}
	return "no-lamps-needed"
}
