package feed

import (
	"bufio"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"os"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"heliocal/config"
)

// TestDemoUIDsKeptFromCad5212: every entry of the built-in demo's feeds has
// the UID cad5212 gave it, over the demo's window on 5 December 2026 (local
// dates 2026-11-05..2027-12-04). A calendar app updates an entry in place
// only while its UID stays the same: a new UID for the same sunrise shows it
// twice, or drops it and adds it again, in every subscriber's calendar. The
// texts have changed since (daily summaries, lamp titles, polar nights), the
// UIDs must not; so unlike the golden files, testdata/demo-uids-cad5212.txt
// is never rewritten from the current code. It holds, for each feed and
// month, the entries (distinct dates and UIDs), the first of them and a
// digest of all, as cad5212's `heliocal events --feed ID --from 2026-11-05
// --to 2027-12-04 --format json` lists them (tools/uidpin/pin.py, whose doc
// has the commands). A change that adds or removes entries on purpose
// moves the digest of their months: set the lines of those months apart
// here with the reason, and keep the others.
func TestDemoUIDsKeptFromCad5212(t *testing.T) {
	want := readUIDPins(t, "testdata/demo-uids-cad5212.txt")
	cfg := config.Demo()
	first, last := date("2026-11-05"), date("2027-12-04")
	cat, err := NewCatalogue(cfg, Options{Now: time.Date(2026, 12, 5, 12, 0, 0, 0, time.UTC)})
	if err != nil {
		t.Fatal(err)
	}
	got := map[string]uidPin{}
	entries := map[string][]Entry{} // by feed and month, to show on a mismatch
	for i := range cfg.Feeds {
		f := &cfg.Feeds[i]
		cal, err := cat.CalendarBetween(context.Background(), f, first, last)
		if err != nil {
			t.Fatal(err)
		}
		for k, p := range monthPins(f.ID, cal.Entries) {
			got[k] = p
		}
		for _, e := range cal.Entries {
			k := f.ID + " " + e.Date.Format("2006-01")
			entries[k] = append(entries[k], e)
		}
	}
	pinned := map[string]bool{}
	for k := range want {
		id, _, _ := strings.Cut(k, " ")
		pinned[id] = true
	}
	for _, f := range cfg.Feeds {
		if !pinned[f.ID] {
			t.Errorf("feed %s: not pinned: the file is not the whole demo", f.ID)
		}
	}
	shown := 0
	for _, k := range slices.Sorted(mapKeys(want, got)) {
		w, g := want[k], got[k]
		if w == g {
			continue
		}
		t.Errorf("%s: %d entries from %s %s, digest %s; cad5212 wrote %d from %s %s, digest %s",
			k, g.n, g.firstDate, g.firstUID, g.digest, w.n, w.firstDate, w.firstUID, w.digest)
		if shown++; shown > 2 {
			continue
		}
		// the month's entries, to set beside those of a build of cad5212:
		// heliocal events --feed <feed> --from <month>-01 --to <its last> --format json
		var b strings.Builder
		for _, e := range entries[k] {
			fmt.Fprintf(&b, "\n  %s %s %s %q", e.Date.Format(time.DateOnly), e.UID, e.Kind, e.Title)
		}
		t.Logf("%s, this version's entries:%s", k, b.String())
	}
}

// uidPin is one month of a feed: its entries (distinct dates and UIDs), the
// first of them in date and UID order, and the first 16 hex digits of the
// SHA-256 of their lines "<date> <uid>\n" in that order.
type uidPin struct {
	n                           int
	firstDate, firstUID, digest string
}

// monthPins returns the pins of a feed's entries by "<feed> <month>".
func monthPins(feedID string, es []Entry) map[string]uidPin {
	months := map[string][]string{}
	seen := map[string]bool{}
	for _, e := range es {
		line := e.Date.Format(time.DateOnly) + " " + e.UID
		if seen[line] {
			continue
		}
		seen[line] = true
		m := feedID + " " + e.Date.Format("2006-01")
		months[m] = append(months[m], line)
	}
	pins := map[string]uidPin{}
	for m, lines := range months {
		slices.Sort(lines)
		sum := sha256.Sum256([]byte(strings.Join(lines, "\n") + "\n"))
		d, u, _ := strings.Cut(lines[0], " ")
		pins[m] = uidPin{len(lines), d, u, hex.EncodeToString(sum[:8])}
	}
	return pins
}

// readUIDPins reads a file of tools/uidpin/pin.py: after comment lines,
// "<feed> <month> <entries> <first date> <first uid> <digest>".
func readUIDPins(t *testing.T, path string) map[string]uidPin {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	pins := map[string]uidPin{}
	sc := bufio.NewScanner(f)
	for line := 1; sc.Scan(); line++ {
		if strings.HasPrefix(sc.Text(), "#") {
			continue
		}
		fs := strings.Fields(sc.Text())
		if len(fs) != 6 {
			t.Fatalf("%s:%d: %q: want 6 fields", path, line, sc.Text())
		}
		n, err := strconv.Atoi(fs[2])
		if err != nil {
			t.Fatalf("%s:%d: entries %q: %v", path, line, fs[2], err)
		}
		pins[fs[0]+" "+fs[1]] = uidPin{n, fs[3], fs[4], fs[5]}
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	return pins
}

// mapKeys is the keys of a and b together.
func mapKeys(a, b map[string]uidPin) func(func(string) bool) {
	return func(yield func(string) bool) {
		for k := range a {
			if !yield(k) {
				return
			}
		}
		for k := range b {
			if _, ok := a[k]; !ok && !yield(k) {
				return
			}
		}
	}
}
