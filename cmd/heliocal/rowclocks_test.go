package main

import (
	"encoding/json"
	"strings"
	"testing"
)

// A row of the served tables whose span the clocks change during (a dark
// window across the night they go forward) says so beside its title, in
// the sentence of the feed's description, in the table page /at and in
// /at.json, which the builder's preview shows; the rows of the nights
// around it do not, nor does a row without a span. Havana: the clocks go
// forward from 00:00 CST to 01:00 CDT on Sunday 14 March 2027 (IANA tz
// database, Rule Cuba 2012 max: second Sunday in March, at 0:00 standard
// time).
func TestRowSaysTheClocksChangeDuringIt(t *testing.T) {
	ts := builderServer(t)
	q := "lat=23.11&lon=-82.41&tz=America/Havana&kinds=dark-window,sunset&days=3&start=2027-03-12"
	const said = "The clocks go forward for summer time by 1 h during it: 00:00 CST becomes 01:00 CDT."
	var res struct {
		Days []struct {
			Date    string
			Entries []struct{ Kind, Clocks string }
		}
	}
	if err := json.Unmarshal([]byte(getOK(t, ts.URL+"/at.json?"+q)), &res); err != nil {
		t.Fatal(err)
	}
	var rows []string
	for _, d := range res.Days {
		for _, e := range d.Entries {
			rows = append(rows, d.Date+" "+e.Kind+": "+e.Clocks)
		}
	}
	want := []string{"2027-03-12 sunset: ", "2027-03-12 dark-window: ", "2027-03-13 sunset: ", "2027-03-13 dark-window: " + said,
		"2027-03-14 sunset: ", "2027-03-14 dark-window: "}
	if strings.Join(rows, "\n") != strings.Join(want, "\n") {
		t.Errorf("/at.json rows:\n%s\nwant\n%s", strings.Join(rows, "\n"), strings.Join(want, "\n"))
	}
	b := getOK(t, ts.URL+"/at?"+q)
	if strings.Count(b, `<span class="during">`) != 1 || !strings.Contains(b, `<span class="during">`+strings.Replace(said, "1 h", "1\u00a0h", 1)+`</span></li>`) {
		t.Errorf("the table page does not say once that the clocks change during the night of 13–14 March:\n%s", b)
	}
}
