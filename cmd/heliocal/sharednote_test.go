package main

import (
	"encoding/csv"
	"encoding/json"
	"slices"
	"strings"
	"testing"
)

// polarConfig is a feed of civil dawn and dusk and of sunrise and sunset
// at Longyearbyen, 78.22° N, where the Sun does not set from 20 April to
// 22 August (timeanddate.com, Longyearbyen: midnight sun).
const polarConfig = `sites:
  - id: lyr
    latitude: 78.22
    longitude: 15.65
    timezone: Arctic/Longyearbyen
feeds:
  - id: polar
    site: lyr
    kinds: [civil-dawn, civil-dusk, sunrise, sunset]
`

// A note the feed writes once for two kinds ("No civil dusk or dawn
// today", "Midnight sun: the Sun does not set today") is listed by `events
// --feed` in JSON and CSV under each kind asked for, with the one uid of
// the entry: a script that picks civil-dusk's or sunset's rows finds every
// date of the midnight sun, 1–3 June 2027 at Longyearbyen.
func TestSharedNoteUnderEachKind(t *testing.T) {
	cfg := writeConfig(t, polarConfig)
	args := []string{"events", "--config", cfg, "--feed", "polar", "--from", "2027-06-01", "--to", "2027-06-03"}
	code, out, errOut := runCLI(t, append(args, "--format", "json")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var got struct {
		Entries []struct {
			Kind, Date, UID string
			Note            bool
		}
	}
	if err := json.Unmarshal([]byte(out), &got); err != nil {
		t.Fatal(err)
	}
	uids := map[string]map[string]string{} // date: kind: uid
	for _, e := range got.Entries {
		if !e.Note {
			t.Errorf("%s %s: not a note, though the Sun does not set", e.Date, e.Kind)
		}
		if uids[e.Date] == nil {
			uids[e.Date] = map[string]string{}
		}
		uids[e.Date][e.Kind] = e.UID
	}
	code, csvOut, errOut := runCLI(t, append(args, "--format", "csv")...)
	rows, err := csv.NewReader(strings.NewReader(csvOut)).ReadAll()
	if code != 0 || err != nil {
		t.Fatalf("csv: exit %d, %v: %s", code, err, errOut)
	}
	if len(rows)-1 != len(got.Entries) {
		t.Errorf("csv has %d rows, json %d entries", len(rows)-1, len(got.Entries))
	}
	for _, d := range []string{"2027-06-01", "2027-06-02", "2027-06-03"} {
		k := uids[d]
		for _, pair := range [][2]string{{"civil-dawn", "civil-dusk"}, {"sunrise", "sunset"}} {
			a, b := k[pair[0]], k[pair[1]]
			if a == "" || a != b {
				t.Errorf("%s: %s's note %q, %s's %q: want the one entry under both", d, pair[0], a, pair[1], b)
			}
		}
		if k["civil-dawn"] == k["sunrise"] {
			t.Errorf("%s: the twilight's note and the Sun's are one entry", d)
		}
		if !slices.ContainsFunc(rows[1:], func(r []string) bool { return r[0] == d && r[1] == "civil-dusk" && r[25] == k["civil-dawn"] }) {
			t.Errorf("%s: no civil-dusk row in the csv with the note's uid", d)
		}
	}
}
