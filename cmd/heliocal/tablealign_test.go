package main

import (
	"strings"
	"testing"
)

// Every row of a long events table starts its TIME, KIND and DETAILS at the
// heading's offsets, though the wider values come chunks after the first
// row: Austria kept CET all year until summer time came back on 6 April
// 1980, 01:00 CEST (`zdump -v -c 1979,1981 Europe/Vienna`: Sat Apr 5
// 23:00:00 1980 UT = Sun Apr 6 01:00:00 1980 CEST), 188 days after the
// first date, past the first chunk (feed.ChunkDays), and the September
// equinox, the longest kind asked for, comes after it.
func TestEventsTableColumnsLineUp(t *testing.T) {
	code, out, errOut := runCLI(t, "events", "--lat", "48.2", "--lon", "16.4", "--tz", "Europe/Vienna",
		"--from", "1979-10-01", "--to", "1980-09-30", "--kinds", "sunrise,march-equinox,september-equinox")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	lines := strings.Split(strings.TrimSuffix(out, "\n"), "\n")
	if len(lines) < 3 || !strings.HasPrefix(lines[2], "DATE ") {
		t.Fatalf("no heading on the third line:\n%s", out)
	}
	heading := lines[2]
	var at []int
	for _, h := range []string{"TIME", "KIND", "DETAILS"} {
		at = append(at, strings.Index(heading, h))
	}
	rows := lines[3:]
	if len(rows) != 366+2 { // a sunrise on each date of the span (1980 is a leap year), two equinoxes
		t.Fatalf("%d rows, want %d", len(rows), 366+2)
	}
	for _, r := range rows {
		for i, col := range at {
			// a column starts after two spaces at least, right at the heading's offset
			if len(r) < col || r[col-2:col] != "  " || i < 2 && r[col] == ' ' {
				t.Fatalf("row %q: column %d does not start at %d, the heading's %q", r, i+2, col, heading)
			}
		}
	}
	for _, want := range []string{"1980-04-05 Sat  05:24:32 CET ", "1980-04-06 Sun  06:22:30 CEST", "september-equinox  \n"} {
		if !strings.Contains(out, want) {
			t.Errorf("no %q in the table", want)
		}
	}
}
