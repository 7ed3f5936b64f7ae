package publish

import (
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"testing"
	"time"

	"heliocal/feed"
)

// usnoRow is one row of testdata/usno-sun-2015.csv: sunrise and sunset from
// USNO one-year tables 'Rise and Set for the Sun' for 2015 (source column in
// the file; copied from the project's shared reference, ids kept).
type usnoRow struct {
	ID, Place, Kind, Source string
	Lat, Lon                float64
	Date                    time.Time // the table's date, 00:00 UTC
	At                      time.Time // zero when the table is blank ("none") or a polar marker
}

func loadUSNO(t testing.TB) []usnoRow {
	t.Helper()
	f, err := os.Open(filepath.Join("testdata", "usno-sun-2015.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	var rows []usnoRow
	for _, r := range recs[1:] {
		lat, _ := strconv.ParseFloat(r[2], 64)
		lon, _ := strconv.ParseFloat(r[3], 64)
		d, err := time.Parse("2006-01-02", r[4])
		if err != nil {
			t.Fatal(err)
		}
		row := usnoRow{ID: r[0], Place: r[1], Lat: lat, Lon: lon, Date: d, Kind: r[5], Source: r[7]}
		if r[6] != "" && r[6] != "none" {
			row.At, err = time.Parse("2006-01-02T15:04Z", r[6])
			if err != nil {
				t.Fatal(err)
			}
		}
		rows = append(rows, row)
	}
	return rows
}

// The invented sites of the tests, placed at two USNO table locations.
func testSites(t testing.TB) (orchard, camp feed.Site) {
	ny, err := time.LoadLocation("America/New_York")
	if err != nil {
		t.Fatal(err)
	}
	orchard = feed.Site{ID: "cayuga-orchard", Name: "Cayuga Ridge Orchard", Latitude: 42.45, Longitude: -76.5, Elevation: 250, Location: ny}
	camp = feed.Site{ID: "ice-camp", Name: "Driftwood Ice Camp <North>", Latitude: 80, Longitude: 0, Location: time.UTC}
	return orchard, camp
}

// testCalendars builds three feeds from the USNO rows: the orchard's sunrises,
// its sunsets, and the ice camp's rises, sets and polar notes. rev changes
// every feed's title, so a new revision changes every file's bytes.
func testCalendars(t testing.TB, rev string) []*feed.Calendar {
	t.Helper()
	orchard, camp := testSites(t)
	start := time.Date(2015, 1, 1, 0, 0, 0, 0, time.UTC)
	mk := func(id, title string, site feed.Site, keep func(usnoRow) bool) *feed.Calendar {
		c := &feed.Calendar{
			ID: id, Title: title + rev, Description: "Sun times for " + site.Name + ".",
			Site: site, Color: "goldenrod", Refresh: 24 * time.Hour,
			WindowStart: start, WindowEnd: start.AddDate(1, 0, 0), Stamp: start,
		}
		occ := map[string]int{}
		for _, r := range loadUSNO(t) {
			if !keep(r) {
				continue
			}
			key := r.Kind + r.Date.Format("20060102")
			occ[key]++
			e := feed.Entry{
				UID:  id + "-" + key + "-" + strconv.Itoa(occ[key]) + "@heliocal",
				Kind: r.Kind, Date: r.Date, Categories: []string{"Sun"},
			}
			switch {
			case r.Kind == "polar_day":
				e.Title, e.AllDay, e.Start, e.End = "The Sun does not set today", true, r.Date, r.Date.AddDate(0, 0, 1)
			case r.Kind == "polar_night":
				e.Title, e.AllDay, e.Start, e.End = "The Sun does not rise today", true, r.Date, r.Date.AddDate(0, 0, 1)
			case r.At.IsZero():
				continue
			default:
				e.Title = feed.Capital(r.Kind)
				e.Start = r.At
				e.Categories = append(e.Categories, e.Title)
			}
			e.Description = "Computed time; USNO table " + r.ID + "."
			c.Entries = append(c.Entries, e)
		}
		sort.Slice(c.Entries, func(i, j int) bool {
			a, b := c.Entries[i], c.Entries[j]
			if !a.Start.Equal(b.Start) {
				return a.Start.Before(b.Start)
			}
			return a.UID < b.UID
		})
		return c
	}
	at := func(lat float64) func(usnoRow) bool { return func(r usnoRow) bool { return r.Lat == lat } }
	return []*feed.Calendar{
		mk("orchard-sunrise", "Orchard sunrise", orchard, func(r usnoRow) bool { return at(42.45)(r) && r.Kind == "sunrise" }),
		mk("orchard-sunset", "Orchard sunset", orchard, func(r usnoRow) bool { return at(42.45)(r) && r.Kind == "sunset" }),
		mk("ice-camp-sun", "Ice camp sun", camp, at(80)),
	}
}

// snapshot reads every file of dir (name → bytes), temporary files included,
// the (empty) lock file left out.
func snapshot(t testing.TB, dir string) map[string][]byte {
	t.Helper()
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	m := map[string][]byte{}
	for _, e := range ents {
		if !e.Type().IsRegular() || e.Name() == LockName || e.Name() == LiveName {
			continue
		}
		b, err := os.ReadFile(filepath.Join(dir, e.Name()))
		if err != nil {
			t.Fatal(err)
		}
		m[e.Name()] = b
	}
	return m
}

func tempNames(t testing.TB, dir string) []string {
	t.Helper()
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, e := range ents {
		if strings.Contains(e.Name(), ".tmp-") {
			out = append(out, e.Name())
		}
	}
	return out
}

// listedMismatches checks the promise of feeds.json: every file it lists is
// in dir with the listed size and SHA-256. It returns one line per broken
// entry, and the number of entries.
func listedMismatches(t testing.TB, dir string) ([]string, int) {
	t.Helper()
	var fj feedsJSON
	bad := listedIn(t, dir, FeedsJSONName, &fj)
	return bad, len(fj.Feeds)
}

// listedMismatchesIn checks the same of a listing named name (feeds.json or
// a shard manifest, which has the same "feeds" list); a missing one lists
// nothing.
func listedMismatchesIn(t testing.TB, dir, name string) []string {
	t.Helper()
	var fj feedsJSON
	return listedIn(t, dir, name, &fj)
}

func listedIn(t testing.TB, dir, name string, fj *feedsJSON) []string {
	t.Helper()
	raw, err := os.ReadFile(filepath.Join(dir, name))
	if errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(raw, fj); err != nil {
		return []string{fmt.Sprintf("%s unreadable: %v", name, err)}
	}
	var bad []string
	for _, f := range fj.Feeds {
		b, err := os.ReadFile(filepath.Join(dir, f.File))
		switch {
		case err != nil:
			bad = append(bad, fmt.Sprintf("%s: %v", f.File, err))
		case len(b) != f.Bytes:
			bad = append(bad, fmt.Sprintf("%s: %d bytes on disk, %s says %d", f.File, len(b), name, f.Bytes))
		case checksum(b) != f.Checksum:
			bad = append(bad, fmt.Sprintf("%s: sha256 %.12s… on disk, %s says %.12s…", f.File, checksum(b), name, f.Checksum))
		}
	}
	return bad
}

// The wide chart's plot as its tests read it, written out rather than taken
// from desk: a drawing that moves is then a failing test.
const (
	plotLeft   = 44
	plotTop    = 44
	plotW      = 700
	plotH      = 240 // 10 units an hour
	plotBottom = plotTop + plotH
)

// yOf is the height of a clock time on the wide chart, h hours after
// local midnight.
func yOf(h float64) float64 { return plotTop + h*plotH/24 }

// dayStep is the width of one day of n on the wide chart.
func dayStep(n int) float64 { return float64(plotW) / float64(n) }
