package astro

import (
	"slices"
	"testing"
	"time"
)

// TestZoneChanges: the changes of a zone's offset past the tz database's
// last transition (2037), across the end of a leap year, where Go's
// ZoneBounds gives 31 December 00:00 UTC as the end of the period for every
// instant of that day, and 1 January 00:00 UTC as a bound of every year.
// The instants are zdump's: zdump -v -c 2040,2042 <zone> (Debian GLIBC 2.36,
// Debian's tzdata), each the first second of the new offset.
func TestZoneChanges(t *testing.T) {
	at := func(s string) time.Time {
		v, err := time.Parse(time.RFC3339, s)
		if err != nil {
			t.Fatal(err)
		}
		return v
	}
	for _, tc := range []struct {
		zone, from, to string
		want           []string
	}{
		// UTC+1, UTC+2 in summer: CET/CEST
		{"Europe/Zurich", "2040-06-01T00:00:00Z", "2041-12-31T00:00:00Z", []string{
			"2040-10-28T01:00:00Z", "2041-03-31T01:00:00Z", "2041-10-27T01:00:00Z"}},
		// from an instant whose ZoneBounds end (31 December 00:00 UTC) is before it
		{"Europe/Zurich", "2040-12-31T12:00:00Z", "2041-04-01T00:00:00Z", []string{"2041-03-31T01:00:00Z"}},
		{"Europe/Zurich", "2040-12-31T00:00:00Z", "2041-01-01T00:00:00Z", nil},
		// UTC−5, UTC−4 in summer: the bounds Go gives fall on 31 December local time
		{"America/New_York", "2040-06-01T00:00:00Z", "2041-12-31T00:00:00Z", []string{
			"2040-11-04T06:00:00Z", "2041-03-10T07:00:00Z", "2041-11-03T06:00:00Z"}},
		// southern hemisphere, UTC+11 over the new year
		{"Australia/Sydney", "2040-12-31T12:00:00Z", "2041-12-31T00:00:00Z", []string{
			"2041-04-06T16:00:00Z", "2041-10-05T16:00:00Z"}},
		// no summer time: zdump -v -c 2037,2201 lists no change
		{"Asia/Tokyo", "2037-01-01T00:00:00Z", "2201-01-01T00:00:00Z", nil},
		{"America/Phoenix", "2037-01-01T00:00:00Z", "2201-01-01T00:00:00Z", nil},
		{"UTC", "2037-01-01T00:00:00Z", "2201-01-01T00:00:00Z", nil},
	} {
		loc, err := time.LoadLocation(tc.zone)
		if err != nil {
			t.Fatal(err)
		}
		var got []string
		for c := range ZoneChanges(loc, at(tc.from), at(tc.to)) {
			if c.Location() != loc {
				t.Errorf("%s: change %s in %s, want %s", tc.zone, c, c.Location(), loc)
			}
			got = append(got, c.UTC().Format(time.RFC3339))
		}
		if !slices.Equal(got, tc.want) {
			t.Errorf("%s %s..%s: %v, want %v", tc.zone, tc.from, tc.to, got, tc.want)
		}
	}
}

// TestZoneChangesTo2200: every change of the supported range after the tz
// database's last transition, two a year, as zdump -v -c 2038,2201 <zone>
// lists them (326 for each zone; its first and last shown here), and each
// a change of offset.
func TestZoneChangesTo2200(t *testing.T) {
	for _, tc := range []struct {
		zone        string
		first, last string
	}{
		{"Europe/Zurich", "2038-03-28T01:00:00Z", "2200-10-26T01:00:00Z"},
		{"America/New_York", "2038-03-14T07:00:00Z", "2200-11-02T06:00:00Z"},
		{"Australia/Sydney", "2038-04-03T16:00:00Z", "2200-10-04T16:00:00Z"},
		{"Pacific/Auckland", "2038-04-03T14:00:00Z", "2200-09-27T14:00:00Z"},
	} {
		loc, err := time.LoadLocation(tc.zone)
		if err != nil {
			t.Fatal(err)
		}
		var got []time.Time
		for c := range ZoneChanges(loc, time.Date(2038, 1, 1, 0, 0, 0, 0, time.UTC), time.Date(2201, 1, 1, 0, 0, 0, 0, time.UTC)) {
			if _, before := c.Add(-time.Second).Zone(); before == offsetOf(c) {
				t.Errorf("%s: %s changes no offset", tc.zone, c.UTC())
			}
			got = append(got, c)
		}
		if len(got) != 326 {
			t.Fatalf("%s: %d changes, want 326", tc.zone, len(got))
		}
		if f, l := got[0].UTC().Format(time.RFC3339), got[len(got)-1].UTC().Format(time.RFC3339); f != tc.first || l != tc.last {
			t.Errorf("%s: first %s, last %s; want %s, %s", tc.zone, f, l, tc.first, tc.last)
		}
	}
}

func offsetOf(t time.Time) int {
	_, off := t.Zone()
	return off
}

// TestZonePeriod: the period that holds an instant on 31 December of a leap
// year past 2037 ends after it (Go's ZoneBounds gives 31 December 00:00 UTC
// for every instant of the day); elsewhere it is ZoneBounds' own. zdump -v
// -c 2040,2042 Europe/Zurich (Debian GLIBC 2.36): CET from 28 October 2040
// 01:00 UTC to 31 March 2041 01:00 UTC; America/New_York: EST from 4
// November 2040 06:00 UTC to 10 March 2041 07:00 UTC.
func TestZonePeriod(t *testing.T) {
	for _, tc := range []struct {
		zone, at     string
		start        string
		endAfter, by string // the end is after endAfter and not after by
	}{
		{"Europe/Zurich", "2040-12-31T00:00:00Z", "2040-10-28T01:00:00Z", "2040-12-31T00:00:00Z", "2041-03-31T01:00:00Z"},
		{"Europe/Zurich", "2040-12-31T12:00:00Z", "2040-10-28T01:00:00Z", "2040-12-31T12:00:00Z", "2041-03-31T01:00:00Z"},
		{"Europe/Zurich", "2040-12-31T23:59:59Z", "2040-10-28T01:00:00Z", "2040-12-31T23:59:59Z", "2041-03-31T01:00:00Z"},
		{"America/New_York", "2040-12-31T20:00:00Z", "2040-11-04T06:00:00Z", "2040-12-31T20:00:00Z", "2041-03-10T07:00:00Z"},
		// not a leap year: ZoneBounds' end, 1 January 00:00 UTC
		{"Europe/Zurich", "2041-12-31T12:00:00Z", "2041-10-27T01:00:00Z", "2041-12-31T12:00:00Z", "2042-01-01T00:00:00Z"},
	} {
		loc, err := time.LoadLocation(tc.zone)
		if err != nil {
			t.Fatal(err)
		}
		at, _ := time.Parse(time.RFC3339, tc.at)
		after, _ := time.Parse(time.RFC3339, tc.endAfter)
		by, _ := time.Parse(time.RFC3339, tc.by)
		start, end := ZonePeriod(at.In(loc))
		if got := start.UTC().Format(time.RFC3339); got != tc.start {
			t.Errorf("%s %s: start %s, want %s", tc.zone, tc.at, got, tc.start)
		}
		if !end.After(after) || end.After(by) {
			t.Errorf("%s %s: end %s, want after %s and not after %s", tc.zone, tc.at, end.UTC(), tc.endAfter, tc.by)
		}
		if end.Location() != loc {
			t.Errorf("%s %s: end in %s", tc.zone, tc.at, end.Location())
		}
	}
}
