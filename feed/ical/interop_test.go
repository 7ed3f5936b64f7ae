package ical

import (
	"bufio"
	"bytes"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"heliocal/feed"
)

// Feeds read back by two more independent implementations: libical (C, the
// library behind many calendar servers and clients, with its strict RFC
// 5545/5546 restriction check) and python's recurring-ical-events over
// python-icalendar (a widely used expansion library). Each runs when it is
// installed (.ci/run installs both on Debian) and is skipped otherwise.

// interopZones: DST in both hemispheres, a 30-minute DST shift, a zone whose
// clocks skip midnight, and a 45-minute offset.
var interopZones = []string{"Europe/Vienna", "America/Santiago", "Australia/Lord_Howe", "America/Havana", "Pacific/Chatham"}

// readBack is what an implementation reports: timed starts as Unix times,
// all-day starts as YYYYMMDD, by UID.
type readBack struct {
	timed  map[string]int64
	days   map[string]string
	errors []string
}

func parseReadBack(t *testing.T, out []byte) readBack {
	t.Helper()
	r := readBack{timed: map[string]int64{}, days: map[string]string{}}
	sc := bufio.NewScanner(bytes.NewReader(out))
	for sc.Scan() {
		f := strings.SplitN(sc.Text(), " ", 3)
		switch {
		case f[0] == "ERROR":
			r.errors = append(r.errors, sc.Text())
		case len(f) == 3 && f[0] == "EVENT":
			n, err := strconv.ParseInt(f[2], 10, 64)
			if err != nil {
				t.Fatalf("line %q: %v", sc.Text(), err)
			}
			r.timed[f[1]] = n
		case len(f) == 3 && f[0] == "DAY":
			r.days[f[1]] = f[2]
		default:
			t.Fatalf("unexpected line %q", sc.Text())
		}
	}
	return r
}

// compare checks that every entry of c was read back at its instant (or on
// its date).
func (r readBack) compare(t *testing.T, who string, c *feed.Calendar) {
	t.Helper()
	if n := len(r.timed) + len(r.days); n != len(c.Entries) {
		t.Errorf("%s read %d events, the feed has %d", who, n, len(c.Entries))
	}
	bad := 0
	for _, e := range c.Entries {
		if e.AllDay {
			if got, want := r.days[e.UID], e.Start.Format("20060102"); got != want && bad < 5 {
				bad++
				t.Errorf("%s: %s on %q, want %s", who, e.UID, got, want)
			}
			continue
		}
		want := e.Start.Round(time.Millisecond).Round(time.Second).Unix() // as wantTimes
		if got, ok := r.timed[e.UID]; (!ok || got != want) && bad < 5 {
			bad++
			t.Errorf("%s: %s starts at %s, want %s (%s local)", who, e.UID, time.Unix(got, 0).UTC().Format(time.RFC3339),
				time.Unix(want, 0).UTC().Format(time.RFC3339), e.Start.In(c.Site.Location).Format("15:04:05 MST"))
		}
	}
}

// buildLibicalCheck compiles testdata/libical/check.c against libical, or
// says why it cannot.
func buildLibicalCheck(t *testing.T) (string, error) {
	flags, err := exec.Command("pkg-config", "--cflags", "--libs", "libical").Output()
	if err != nil {
		return "", err
	}
	bin := filepath.Join(t.TempDir(), "check")
	args := append([]string{"-o", bin, filepath.Join("testdata", "libical", "check.c")}, strings.Fields(string(flags))...)
	if out, err := exec.Command("cc", args...).CombinedOutput(); err != nil {
		return "", fmt.Errorf("cc %s: %v\n%s", strings.Join(args, " "), err, out)
	}
	return bin, nil
}

// libicalReads has the libical check bin read data, c encoded, and
// checks that libical flags nothing in it and reads every entry of c at
// its instant (or on its date).
func libicalReads(t *testing.T, bin string, c *feed.Calendar, data []byte) {
	t.Helper()
	out, err := exec.Command(bin, writeTemp(t, data)).Output()
	if err != nil {
		t.Fatalf("libical: %v\n%s", err, out)
	}
	r := parseReadBack(t, out)
	if len(r.errors) > 0 {
		t.Errorf("libical flags the feed:\n%s", strings.Join(r.errors, "\n"))
	}
	r.compare(t, "libical", c)
}

func writeTemp(t *testing.T, data []byte) string {
	t.Helper()
	p := filepath.Join(t.TempDir(), "feed.ics")
	if err := os.WriteFile(p, data, 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// libical finds nothing to flag in a feed (no X-LIC-ERROR, its RFC 5546
// restriction check included: the feeds carry no METHOD, so no ORGANIZER
// is owed), and reads every event at its instant, through the file's own
// VTIMEZONE, in the repeated and skipped hours too.
func TestLibical(t *testing.T) {
	bin, err := buildLibicalCheck(t)
	if err != nil {
		t.Skipf("libical not available (Debian: apt-get install libical-dev): %v", err)
	}
	for _, zone := range interopZones {
		t.Run(zone, func(t *testing.T) {
			c := testCalendar(t, zone, utc(2026, 1, 1, 0, 0, 0), utc(2027, 1, 1, 0, 0, 0))
			data, err := Marshal(c, Options{Version: "interop"})
			if err != nil {
				t.Fatal(err)
			}
			libicalReads(t, bin, c, data)
		})
	}
	// Control: the check does flag a METHOD:PUBLISH calendar whose events
	// have no ORGANIZER (RFC 5546 §3.2.1).
	c := smallCalendar(t, "Europe/Vienna")
	data, err := Marshal(c, Options{})
	if err != nil {
		t.Fatal(err)
	}
	withMethod := bytes.Replace(data, []byte("CALSCALE:GREGORIAN\r\n"), []byte("CALSCALE:GREGORIAN\r\nMETHOD:PUBLISH\r\n"), 1)
	out, _ := exec.Command(bin, writeTemp(t, withMethod)).Output()
	if !bytes.Contains(out, []byte("ORGANIZER")) {
		t.Errorf("control: libical does not flag METHOD:PUBLISH without ORGANIZER:\n%s", out)
	}
}

// python3 returns an interpreter with recurring_ical_events, or "".
func pythonWithExpansion() string {
	for _, p := range []string{"/usr/bin/python3", "python3"} {
		if path, err := exec.LookPath(p); err == nil {
			if exec.Command(path, "-c", "import recurring_ical_events, icalendar").Run() == nil {
				return path
			}
		}
	}
	return ""
}

// python's recurring-ical-events reads every event at its instant. The
// events written in UTC in the hour that repeats when clocks go back are
// the case it gets wrong when a calendar carries X-WR-TIMEZONE (it reads
// them through that zone and puts the first occurrence an hour late), which
// is why the feeds carry none.
func TestPythonExpansion(t *testing.T) {
	py := pythonWithExpansion()
	if py == "" {
		t.Skip("python recurring-ical-events not available (Debian: apt-get install python3-recurring-ical-events)")
	}
	for _, zone := range interopZones {
		t.Run(zone, func(t *testing.T) {
			c := testCalendar(t, zone, utc(2026, 1, 1, 0, 0, 0), utc(2027, 1, 1, 0, 0, 0))
			data, err := Marshal(c, Options{Version: "interop"})
			if err != nil {
				t.Fatal(err)
			}
			if bytes.Contains(data, []byte("X-WR-TIMEZONE")) {
				t.Fatal("the feed carries X-WR-TIMEZONE")
			}
			out, err := exec.Command(py, filepath.Join("testdata", "expand.py"), writeTemp(t, data), "2025", "2027").Output()
			if err != nil {
				t.Fatalf("expand.py: %v\n%s", err, out)
			}
			parseReadBack(t, out).compare(t, "recurring-ical-events", c)
		})
	}
	// What X-WR-TIMEZONE would do: 00:30 UTC on 25 October 2026 is 02:30
	// CEST, the first 02:30 of Vienna's repeated hour (EU rule: clocks go
	// back at 01:00 UTC on the last Sunday of October).
	c := smallCalendar(t, "Europe/Vienna")
	c.Entries = []feed.Entry{{UID: "repeated@test", Title: "x", Start: utc(2026, 10, 25, 0, 30, 0)}}
	c.WindowStart, c.WindowEnd = utc(2026, 10, 1, 0, 0, 0), utc(2026, 11, 1, 0, 0, 0)
	data, err := Marshal(c, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(data, []byte("DTSTART:20261025T003000Z\r\n")) {
		t.Fatalf("the repeated-hour event is not written in UTC:\n%s", data)
	}
	withX := bytes.Replace(data, []byte("CALSCALE:GREGORIAN\r\n"), []byte("CALSCALE:GREGORIAN\r\nX-WR-TIMEZONE:Europe/Vienna\r\n"), 1)
	for _, v := range []struct {
		name string
		data []byte
	}{{"as written", data}, {"with X-WR-TIMEZONE", withX}} {
		out, err := exec.Command(py, filepath.Join("testdata", "expand.py"), writeTemp(t, v.data), "2026", "2026").Output()
		if err != nil {
			t.Fatalf("expand.py: %v\n%s", err, out)
		}
		r := parseReadBack(t, out)
		got := time.Unix(r.timed["repeated@test"], 0).UTC()
		t.Logf("%s: recurring-ical-events reads 00:30 UTC as %s", v.name, got.Format(time.RFC3339))
		if v.name == "as written" && !got.Equal(utc(2026, 10, 25, 0, 30, 0)) {
			t.Errorf("as written: read at %s", got.Format(time.RFC3339))
		}
	}
}

// TestEncodeDateLine: a feed over Pacific/Apia's jump across the date line
// (zdump -v Pacific/Apia: from 23:59:59 on 29 December 2011, −10, to
// 00:00 on the 31st, +14) and Pacific/Kiritimati's (from 23:59:59 on 30
// December 1994, −10, to 00:00 on 1 January 1995, +14) is read back at
// its instants by go-ical and through its own VTIMEZONE, and by libical
// and python's recurring-ical-events where they are installed (see
// TestLibical, TestPythonExpansion).
func TestEncodeDateLine(t *testing.T) {
	lib, _ := buildLibicalCheck(t)
	py := pythonWithExpansion()
	for _, tc := range []struct {
		zone     string
		from, to time.Time
	}{
		{"Pacific/Apia", utc(2011, 11, 1, 0, 0, 0), utc(2012, 5, 31, 0, 0, 0)},
		{"Pacific/Kiritimati", utc(1994, 11, 1, 0, 0, 0), utc(1995, 5, 31, 0, 0, 0)},
	} {
		t.Run(tc.zone, func(t *testing.T) {
			c := testCalendar(t, tc.zone, tc.from, tc.to)
			data, err := Marshal(c, Options{Version: "test"})
			if err != nil {
				t.Fatal(err)
			}
			verify(t, c, data)
			if lib != "" {
				libicalReads(t, lib, c, data)
			}
			if py != "" {
				years := []string{strconv.Itoa(tc.from.Year() - 1), strconv.Itoa(tc.to.Year() + 1)}
				out, err := exec.Command(py, append([]string{filepath.Join("testdata", "expand.py"), writeTemp(t, data)}, years...)...).Output()
				if err != nil {
					t.Fatalf("expand.py: %v\n%s", err, out)
				}
				parseReadBack(t, out).compare(t, "recurring-ical-events", c)
			}
		})
	}
}
