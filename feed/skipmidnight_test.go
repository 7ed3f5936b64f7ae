package feed

import (
	"testing"
	"time"

	"heliocal/config"
)

// The changes of the clocks these tests read, from the tz database
// (zdump -v -c 2027,2028 for each zone; zdump -v -c 2011,2012 Pacific/Apia):
//   - America/Nuuk: "Sun Mar 28 00:59:59 2027 UT = Sat Mar 27 22:59:59 2027
//     -02" and "Sun Mar 28 01:00:00 2027 UT = Sun Mar 28 00:00:00 2027 -01":
//     the clocks skip 23:00–24:00 on Saturday 27 March, a skipped hour that
//     runs into midnight;
//   - America/Havana: "Sun Mar 14 04:59:59 2027 UT = Sat Mar 13 23:59:59
//     2027 CST" and "Sun Mar 14 05:00:00 2027 UT = Sun Mar 14 01:00:00 2027
//     CDT": they skip 00:00–01:00 on Sunday 14 March, a skipped hour that
//     starts at midnight;
//   - America/Santiago: "Sun Sep 5 03:59:59 2027 UT = Sat Sep 4 23:59:59
//     2027 -04" and "Sun Sep 5 04:00:00 2027 UT = Sun Sep 5 01:00:00 2027
//     -03": 24:00 on Saturday becomes 01:00 on Sunday 5 September;
//   - Europe/London: 01:00 GMT becomes 02:00 BST at 01:00 UT on Sunday 28
//     March 2027 (Rule EU, Mar lastSun 1:00u);
//   - Pacific/Apia: "Fri Dec 30 09:59:59 2011 UT = Thu Dec 29 23:59:59 2011
//     -10" and "Fri Dec 30 10:00:00 2011 UT = Sat Dec 31 00:00:00 2011 +14":
//     the whole of Friday 30 December is skipped.
type skipChange struct {
	zone          string
	at            string // the UTC instant of the change
	before, after int    // the offsets around it, in hours
}

var (
	nuukSkip     = skipChange{"America/Nuuk", "2027-03-28T01:00:00Z", -2, -1}
	havanaSkip   = skipChange{"America/Havana", "2027-03-14T05:00:00Z", -5, -4}
	santiagoSkip = skipChange{"America/Santiago", "2027-09-05T04:00:00Z", -4, -3}
	londonSkip   = skipChange{"Europe/London", "2027-03-28T01:00:00Z", 0, 1}
	apiaSkip     = skipChange{"Pacific/Apia", "2011-12-30T10:00:00Z", -10, 14}
)

// location loads the change's zone and checks that its data has the
// change as zdump prints it.
func (c skipChange) location(t *testing.T) *time.Location {
	t.Helper()
	loc, err := time.LoadLocation(c.zone)
	if err != nil {
		t.Fatal(err)
	}
	at := utc(c.at)
	if _, off := at.Add(-time.Second).In(loc).Zone(); off != c.before*3600 {
		t.Fatalf("zone data: %s offset %d s before %s, want %d h", c.zone, off, at, c.before)
	}
	if _, off := at.In(loc).Zone(); off != c.after*3600 {
		t.Fatalf("zone data: %s offset %d s at %s, want %d h", c.zone, off, at, c.after)
	}
	return loc
}

func utc(s string) time.Time {
	t, err := time.Parse(time.RFC3339, s)
	if err != nil {
		panic(err)
	}
	return t
}

// TestClockOnSkippedHour: a clock time the clocks skip is moved by their
// jump (docs/configuration.md), on whichever date that puts it: 23:10 of
// Saturday 27 March 2027 in America/Nuuk is 00:10 −01 on Sunday (01:10 UT),
// not 22:10 −02 on Saturday, an hour early; the skipped hours that start
// at midnight, or end past it, stay as they were.
func TestClockOnSkippedHour(t *testing.T) {
	for _, c := range []struct {
		change skipChange
		date   string
		clock  string
		want   string // UTC
	}{
		// the hour skipped runs into midnight: to the next date
		{nuukSkip, "2027-03-27", "23:10", "2027-03-28T01:10:00Z"}, // 00:10 −01 on Sunday
		{nuukSkip, "2027-03-27", "23:00", "2027-03-28T01:00:00Z"}, // 00:00 −01
		{nuukSkip, "2027-03-27", "23:59", "2027-03-28T01:59:00Z"}, // 00:59 −01
		{nuukSkip, "2027-03-27", "22:59", "2027-03-28T00:59:00Z"}, // shown: 22:59 −02
		{nuukSkip, "2027-03-28", "00:00", "2027-03-28T01:00:00Z"}, // shown: the change
		{nuukSkip, "2027-03-28", "23:10", "2027-03-29T00:10:00Z"}, // 23:10 −01
		// the hour skipped starts at midnight: on the date
		{havanaSkip, "2027-03-14", "00:00", "2027-03-14T05:00:00Z"},   // 01:00 CDT
		{havanaSkip, "2027-03-14", "00:30", "2027-03-14T05:30:00Z"},   // 01:30 CDT
		{havanaSkip, "2027-03-13", "23:59", "2027-03-14T04:59:00Z"},   // shown: 23:59 CST
		{santiagoSkip, "2027-09-05", "00:00", "2027-09-05T04:00:00Z"}, // 01:00 −03
		{santiagoSkip, "2027-09-05", "00:30", "2027-09-05T04:30:00Z"}, // 01:30 −03
		{santiagoSkip, "2027-09-04", "23:30", "2027-09-05T03:30:00Z"}, // shown: 23:30 −04
		// within the date
		{londonSkip, "2027-03-28", "01:30", "2027-03-28T01:30:00Z"}, // 02:30 BST
		// a date skipped whole: moved by the jump, 24 h, to Saturday
		{apiaSkip, "2011-12-30", "12:00", "2011-12-30T22:00:00Z"}, // 12:00 +14 on Sat 31 Dec
	} {
		loc := c.change.location(t)
		clock, err := config.ParseClock(c.clock)
		if err != nil {
			t.Fatal(err)
		}
		if got, want := clockOn(date(c.date), clock, loc), utc(c.want); !got.Equal(want) {
			t.Errorf("%s %s %s: %s (%s), want %s (%s)", c.change.zone, c.date, c.clock, got.UTC(), got.In(loc), want, want.In(loc))
		}
	}
}
