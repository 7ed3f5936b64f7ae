package main

import (
	"encoding/json"
	"strings"
	"testing"
)

// A daily summary belongs to its date, as its all-day calendar entry does: no
// start in JSON and no clock time in the table or the CSV. In Havana the
// clocks skipped 14 March 2027's midnight (tz database, America/Havana), where
// a summary used to show "01:00:00 CDT".
func TestDailySummaryHasNoClockTime(t *testing.T) {
	args := []string{"events", "--lat", "23.13", "--lon", "-82.38", "--tz", "America/Havana",
		"--from", "2027-03-13", "--to", "2027-03-14", "--kinds", "daily-summary"}
	code, out, errOut := runCLI(t, append(args, "--format", "json")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var doc struct{ Events []map[string]any }
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Events) != 2 {
		t.Fatalf("events %v, want one summary per date", doc.Events)
	}
	for _, e := range doc.Events {
		if _, ok := e["start"]; ok || e["date"] == nil || e["day_length_s"] == nil {
			t.Errorf("summary %v: want a date, the day length and no start", e)
		}
	}
	_, table, _ := runCLI(t, args...)
	_, csvOut, _ := runCLI(t, append(args, "--format", "csv")...)
	// the table's DETAILS of 14 March say the change of the clocks, in
	// clock times that are not the summary's
	const clocks = ", clocks go forward for summer time by 1 h: 00:00 becomes 01:00\n"
	if strings.Count(table, clocks) != 1 {
		t.Errorf("table does not say the change of the clocks once:\n%s", table)
	}
	for name, text := range map[string]string{"table": strings.Replace(table, clocks, "\n", 1), "csv": csvOut} {
		if strings.Contains(text, "00:00") || strings.Contains(text, "01:00") {
			t.Errorf("%s shows a clock time for a daily summary:\n%s", name, text)
		}
	}
	if strings.Count(table, "all day") != 2 {
		t.Errorf("table does not mark the summaries all day:\n%s", table)
	}
}

// The table words a day-length change as the feeds do: at 78.22° N the Sun
// first rises again on 16 February 2027 after the polar night (common
// practice: Longyearbyen's sun returns in mid-February), a change of over
// an hour from a day of 0 s, "+1 h 42 min 55 s" rather than "+102 min";
// the polar night's last date, 0 s after 0 s, is "day length 0 min, the
// same as the day before", as the feeds' summaries say it, not "change +0 s".
func TestTableDayChangeInHours(t *testing.T) {
	code, out, errOut := runCLI(t, "events", "--lat", "78.22", "--lon", "15.65", "--tz", "Arctic/Longyearbyen",
		"--from", "2027-02-15", "--to", "2027-02-16", "--kinds", "daily-summary")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	if !strings.Contains(out, "day length 0 min, the same as the day before") || strings.Contains(out, "+0 s") ||
		!strings.Contains(out, "change +1 h ") || strings.Contains(out, "102 min") {
		t.Errorf("table does not word the changes as the feeds do:\n%s", out)
	}
}
