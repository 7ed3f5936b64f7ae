package feed

import (
	"context"
	"math/rand/v2"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"heliocal/config"
)

// TestSortEntries: the merge of runs puts entries in the order of a plain
// sort by Start, then UID, whatever the runs: none, one, many, of one entry,
// with equal starts, and random.
func TestSortEntries(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	t0 := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)
	entry := func(minutes int, uid string) Entry {
		return Entry{Start: t0.Add(time.Duration(minutes) * time.Minute), UID: uid, Title: uid}
	}
	var cases [][]Entry
	cases = append(cases, nil, []Entry{entry(1, "a")})
	for _, runs := range []int{1, 2, 3, 5, 8} { // kinds, each date after date
		var es []Entry
		for k := range runs {
			for d := range 50 {
				es = append(es, entry(d*1440+k*7%5, "k"+strconv.Itoa(k)+"d"+strconv.Itoa(d)))
			}
		}
		cases = append(cases, es)
	}
	for range 20 {
		es := make([]Entry, r.IntN(300))
		for i := range es {
			es[i] = entry(r.IntN(40), strconv.Itoa(r.IntN(1000))+"-"+strconv.Itoa(i))
		}
		cases = append(cases, es)
	}
	desc := make([]Entry, 100)
	for i := range desc {
		desc[i] = entry(100-i, strconv.Itoa(i))
	}
	cases = append(cases, desc)
	for n, es := range cases {
		want := slices.Clone(es)
		slices.SortFunc(want, func(a, b Entry) int {
			if c := a.Start.Compare(b.Start); c != 0 {
				return c
			}
			return strings.Compare(a.UID, b.UID)
		})
		got := sortEntries(slices.Clone(es))
		if len(got) != len(want) {
			t.Fatalf("case %d: %d entries, want %d", n, len(got), len(want))
		}
		for i := range got {
			if got[i].UID != want[i].UID || got[i].Title != want[i].Title || !got[i].Start.Equal(want[i].Start) {
				t.Fatalf("case %d: entry %d is %s at %v, want %s at %v", n, i, got[i].UID, got[i].Start, want[i].UID, want[i].Start)
			}
		}
	}
}

// The all-day entries of a date come in one fixed order, whatever their
// UIDs: the kinds in the catalogue's order (the Sun, twilight, the Moon),
// plans last, each before the timed entries of that instant.
func TestSortEntriesAllDay(t *testing.T) {
	d := time.Date(2027, 4, 19, 0, 0, 0, 0, time.UTC)
	day := func(kind, title, uid string) Entry {
		return Entry{Kind: kind, Title: title, UID: uid, Start: d, End: d.AddDate(0, 0, 1), AllDay: true, Date: d}
	}
	// each kind a run of its own, as the builder gives them; the UIDs, hashes
	// in a feed, put them in another order
	es := []Entry{
		day(KindPlan, "Open day", "1"),
		day("dark-window", "No dark sky on the night of 19–20 April 2027", "2"),
		{Kind: "moonrise", Title: "Moonrise", UID: "0", Start: d, Date: d},
		day("daily-summary", "Daylight 24 h", "3"),
		day("civil-dawn", "No civil dusk or dawn tonight", "4"),
		day("photoperiod:14h", "b", "5"),
		day("photoperiod:12h", "a", "6"),
		day("sunrise", "Midnight sun: the Sun does not set today", "7"),
	}
	var kinds []string
	for _, e := range sortEntries(es) {
		kinds = append(kinds, e.Kind)
	}
	want := "sunrise civil-dawn photoperiod:12h photoperiod:14h daily-summary dark-window " + KindPlan + " moonrise"
	if got := strings.Join(kinds, " "); got != want {
		t.Errorf("order %s, want %s", got, want)
	}
}

// TestSortEntriesByDate: entries of many dates, all-day and timed, in runs
// as the kinds give them or shuffled, and with dates too far apart for a
// bucket each, come in the order of CompareEntries.
func TestSortEntriesByDate(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	d0 := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)
	kinds := []string{"sunrise", "sunset", "photoperiod:12h", "daily-summary", KindPlan, "lighting:16h"}
	for n, spread := range []int{1, 3, 40, 400, 400, 100000} {
		var es []Entry
		for k, kind := range kinds {
			for i := range 60 {
				d := d0.AddDate(0, 0, i*spread/60)
				if n == 4 {
					d = d0.AddDate(0, 0, r.IntN(spread))
				}
				e := Entry{Kind: kind, Title: kind + strconv.Itoa(r.IntN(3)), UID: strconv.Itoa(k) + "-" + strconv.Itoa(i), Date: d,
					Start: d.Add(time.Duration(r.IntN(48)) * time.Hour / 2)}
				if r.IntN(4) == 0 {
					e.AllDay, e.Start, e.End = true, d, d.AddDate(0, 0, 1)
				}
				es = append(es, e)
			}
		}
		want := slices.Clone(es)
		slices.SortStableFunc(want, func(a, b Entry) int { return CompareEntries(&a, &b) })
		got := sortEntries(slices.Clone(es))
		for i := range got {
			if got[i].UID != want[i].UID {
				t.Fatalf("spread %d: entry %d is %s (%s %v), want %s (%s %v)", spread, i,
					got[i].UID, got[i].Kind, got[i].Start, want[i].UID, want[i].Kind, want[i].Start)
			}
		}
	}
}

// TestSameStartFixedOrder: entries with the same start keep one order on
// every date, the catalogue's order of kinds (AllDayOrder), not their UIDs'
// (a hash of the date among others, which swapped them from one date to
// the next): evening lamps of lighting:16h come on at the sunset that ends
// the natural day, sunrise to sunset, at the same instant as the sunset
// entry (the rule of the lighting kind), and the sunset comes first.
func TestSameStartFixedOrder(t *testing.T) {
	s := site(t, "farm", 48.2, 16.4, "Europe/Vienna")
	sk := sky(t, "2027-01-01", "2027-01-14")
	var specs []config.KindSpec
	for _, k := range mustKinds(t, "lighting:16h", "sunset") {
		specs = append(specs, config.KindSpec{Kind: k})
	}
	es, err := sk.Entries(context.Background(), s, "farm", specs, date("2027-01-01"), date("2027-01-14"))
	if err != nil {
		t.Fatal(err)
	}
	if len(es) != 28 {
		t.Fatalf("%d entries, want a sunset and a lamp period on each of 14 dates", len(es))
	}
	for i := 0; i+1 < len(es); i += 2 {
		a, b := es[i], es[i+1]
		if !a.Start.Equal(b.Start) || a.Kind != "sunset" || b.Kind != "lighting:16h" {
			t.Errorf("%s: %s at %s, then %s at %s; want the sunset, then the lamps from the same instant",
				a.Date.Format(time.DateOnly), a.Kind, a.Start, b.Kind, b.Start)
		}
	}
}
