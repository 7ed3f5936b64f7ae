package main

import (
	"encoding/csv"
	"slices"
	"strings"
	"testing"
)

// The README says to read the CSV columns by their header's names: the
// listing of kinds and a feed's entries put the fields they share in
// different orders (direction 5th and 10th), and a field read by its name
// is the same in both. Fernhollow's sunrise on 10 January 2027, listed
// both ways.
func TestReadmeCSVColumnsByHeader(t *testing.T) {
	readme := strings.Join(strings.Fields(string(readmeBytes(t))), " ")
	const said = "Read CSV columns by their header's names, not their places: `events --kinds` and `events --feed` put the fields they share in different orders (`direction` is the 5th column of one and the 10th of the other)"
	if !strings.Contains(readme, said) {
		t.Fatalf("the README does not say %q", said)
	}
	if i, j := slices.Index(eventsCSVHeader, "direction"), slices.Index(entriesCSVHeader, "direction"); i != 4 || j != 9 {
		t.Errorf("direction is column %d of --kinds and %d of --feed, the README says 5 and 10", i+1, j+1)
	}
	read := func(args ...string) map[string]string {
		t.Helper()
		code, out, errOut := runCLI(t, append(args, "--from", "2027-01-10", "--to", "2027-01-10", "--format", "csv")...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", args, code, errOut)
		}
		rows, err := csv.NewReader(strings.NewReader(out)).ReadAll()
		if err != nil {
			t.Fatal(err)
		}
		for _, r := range rows[1:] {
			if r[slices.Index(rows[0], "kind")] != "sunrise" {
				continue
			}
			m := map[string]string{}
			for i, h := range rows[0] {
				m[h] = r[i]
			}
			return m
		}
		t.Fatalf("%v: no sunrise row:\n%s", args, out)
		return nil
	}
	kinds, entries := read("events", "--site", "fernhollow", "--kinds", "sunrise"), read("events", "--feed", "fernhollow-sun")
	shared := 0
	for _, h := range eventsCSVHeader {
		v, ok := entries[h]
		if !ok {
			continue
		}
		shared++
		if v != kinds[h] {
			t.Errorf("%s: %q with --feed, %q with --kinds", h, v, kinds[h])
		}
	}
	if shared < 10 || kinds["direction"] != "rising" || kinds["azimuth_deg"] == "" {
		t.Errorf("%d shared columns; the sunrise's direction %q, azimuth %q", shared, kinds["direction"], kinds["azimuth_deg"])
	}
}
