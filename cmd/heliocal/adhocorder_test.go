package main

import (
	"slices"
	"strings"
	"testing"

	"heliocal/config"
	"heliocal/feed"
)

// An ad-hoc feed's description says what its kinds mean in the order the
// query gave them, as a configured feed's does in the order of its kinds
// entries (feed.CalendarDescription): kinds=sunset,moonrise,civil-dawn
// explains sunset first, then moonrise, then civil dawn, not the kinds in
// alphabetical order; the same kinds in another order keep the feed's
// UIDs.
func TestAdhocMeaningsInQueryOrder(t *testing.T) {
	ts := builderServer(t)
	const place = "/at.ics?lat=48.2&lon=16.4&tz=Europe/Vienna&start=2027-01-01&days=3&kinds="
	site := &config.Site{ID: "s", Latitude: 48.2, Longitude: 16.4}
	var first []string // the UIDs of the first order
	for _, kinds := range []string{"sunset,moonrise,civil-dawn", "civil-dawn,sunset,moonrise", "moonrise,civil-dawn,sunset"} {
		ics := getOK(t, ts.URL+place+kinds)
		desc := unfold(ics)
		f := &config.Feed{ID: "f", Site: "s"}
		var firsts []string // the first words of each kind's meaning, in the configured feed's order
		for _, name := range strings.Split(kinds, ",") {
			k, err := config.ParseKind(name)
			if err != nil {
				t.Fatal(err)
			}
			f.Kinds = append(f.Kinds, config.KindSpec{Kind: k})
		}
		for line := range strings.SplitSeq(feed.CalendarDescription(site, f), "\n") {
			if line != "" {
				firsts = append(firsts, line[:min(len(line), 40)])
			}
		}
		if len(firsts) < 3 {
			t.Fatalf("%s: the configured feed's description has %d lines", kinds, len(firsts))
		}
		at := -1
		for _, m := range firsts[:3] {
			i := strings.Index(desc, escapeText(m))
			if i < 0 || i < at {
				t.Errorf("kinds=%s: %q is not where the configured feed has it, after the meanings before it:\n%s", kinds, m, desc)
			}
			at = i
		}
		var uids []string
		for line := range strings.SplitSeq(ics, "\r\n") {
			if uid, ok := strings.CutPrefix(line, "UID:"); ok {
				uids = append(uids, uid)
			}
		}
		slices.Sort(uids)
		if first == nil {
			first = uids
		} else if !slices.Equal(uids, first) {
			t.Errorf("kinds=%s: UIDs %v, not those of the same kinds in another order %v", kinds, uids, first)
		}
	}
	if len(first) == 0 {
		t.Error("no entries to compare the UIDs of")
	}
}

// escapeText writes s as an iCalendar TEXT value does (RFC 5545 §3.3.11).
func escapeText(s string) string {
	return strings.NewReplacer(`\`, `\\`, ";", `\;`, ",", `\,`, "\n", `\n`).Replace(s)
}
