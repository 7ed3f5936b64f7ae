package publish

import (
	"strings"
	"testing"
	"time"
)

// The chart's title names the lamp periods and dark windows it draws, and
// its words say when they fall: on how many days (or nights), in which
// seasons (parted by four weeks without any), and the longest, a period
// across midnight counted whole on the date it begins. The spans are
// invented: evening lamps 17:00–19:00 in the winter months with one long
// evening to 01:30, and dark windows 22:00–04:00 with a ten-night gap
// around a full Moon and a night parted by the Moon.
func TestChartWordsLampsAndDark(t *testing.T) {
	date := func(m time.Month, d int) time.Time { return time.Date(2027, m, d, 0, 0, 0, 0, time.UTC) }
	var days []ChartDay
	for d := date(1, 1); d.Year() == 2027; d = d.AddDate(0, 0, 1) {
		days = append(days, ChartDay{Date: d, Daylight: 10 * time.Hour})
	}
	winter := func(d time.Time) bool { return d.Month() <= 2 || d.Month() >= 11 }
	c := &SiteChart{Days: days, Today: date(1, 1)}
	for _, day := range days {
		d := day.Date
		if winter(d) {
			to := 19 * time.Hour
			if d.Equal(date(1, 20)) {
				to = 24 * time.Hour
			}
			c.Lamps = append(c.Lamps, ClockSpan{Date: d, From: 17 * time.Hour, To: to})
		}
		if d.Equal(date(1, 21)) { // the 20th's lamps, after midnight
			c.Lamps = append(c.Lamps, ClockSpan{Date: d, From: 0, To: 90 * time.Minute})
		}
		night := (d.Month() <= 4 || d.Month() >= 9) && !(d.Month() == 2 && d.Day() >= 10 && d.Day() <= 19)
		switch {
		case d.Equal(date(3, 5)): // the Moon up from 23:00 to 01:00
			c.Dark = append(c.Dark, ClockSpan{Date: d, From: 20 * time.Hour, To: 23 * time.Hour}, ClockSpan{Date: d.AddDate(0, 0, 1), From: time.Hour, To: 4 * time.Hour})
		case d.Equal(date(4, 1)):
			c.Dark = append(c.Dark, ClockSpan{Date: d, From: 21 * time.Hour, To: 24 * time.Hour}, ClockSpan{Date: d.AddDate(0, 0, 1), To: 5 * time.Hour})
		case night:
			c.Dark = append(c.Dark, ClockSpan{Date: d, From: 22 * time.Hour, To: 24 * time.Hour})
			if !d.Equal(date(12, 31)) {
				c.Dark = append(c.Dark, ClockSpan{Date: d.AddDate(0, 0, 1), To: 4 * time.Hour})
			}
		}
	}
	// the end of the night before the chart's first date
	c.Dark = append(c.Dark, ClockSpan{Date: date(1, 1), To: 4 * time.Hour})

	v := chart("fen", "Fen Glasshouses", c)
	if want := "Sunrise, sunset, lamp periods and dark windows at Fen Glasshouses, 2027"; v.Title != want {
		t.Errorf("title %q, want %q", v.Title, want)
	}
	for _, want := range []string{
		// 59 days in January and February, 61 in November and December
		"Lamp periods on 120 days, from 1 Jan to 28 Feb and from 1 Nov to 31 Dec; the longest 8 h 30 min (on 20 Jan).",
		// 110 nights from January to April (ten left out in February), 122
		// from September; the night of 5 March counted once
		"Dark windows on 232 nights, from 1 Jan to 30 Apr and from 1 Sep to 31 Dec; the longest 8 h (the night of 1 Apr).",
	} {
		if !strings.Contains(v.Summary, want) {
			t.Errorf("summary %q lacks %q", v.Summary, want)
		}
	}

	// From 1 March on, the words speak of the coming winter's lamps only.
	c.Today = date(3, 1)
	if v, want := chart("fen", "Fen Glasshouses", c), "Lamp periods on 61 days, from 1 Nov to 31 Dec; the longest 2 h (on 1 Nov)."; !strings.Contains(v.Summary, want) {
		t.Errorf("from 1 March: summary %q lacks %q", v.Summary, want)
	}
	c.Lamps, c.Dark = nil, c.Dark[:1]
	if v := chart("fen", "Fen Glasshouses", c); !strings.HasPrefix(v.Title, "Sunrise, sunset and dark windows at ") ||
		strings.Contains(v.Summary, "Lamp periods") || !strings.Contains(v.Summary, "No dark windows from today on.") {
		t.Errorf("without lamps, dark windows before today only: title %q, summary %q", v.Title, v.Summary)
	}
}

// The chart starts four weeks before today, so a photoperiod crossing may lie
// in the shaded weeks: its words are in the past tense, as the caption says
// the figures are for the year from today.
func TestThresholdBeforeTodayInPastTense(t *testing.T) {
	first := time.Date(2027, 3, 1, 0, 0, 0, 0, time.UTC)
	var days []ChartDay
	for i, h := range []float64{11.8, 11.9, 12.1, 12.2, 12.3, 12.4, 12.3, 12.2, 11.9, 11.8} {
		days = append(days, ChartDay{Date: first.AddDate(0, 0, i), Daylight: time.Duration(h * float64(time.Hour))})
	}
	got := thresholds(days, []Level{{Length: 12 * time.Hour}}, 5)
	want := []string{"Day length reached 12 h on 3 Mar", "Day length drops under 12 h on 9 Mar"}
	if len(got) != len(want) {
		t.Fatalf("%d crossings, want %d", len(got), len(want))
	}
	for i, w := range want {
		if got[i].Text != w {
			t.Errorf("crossing %d reads %q, want %q", i, got[i].Text, w)
		}
	}
}

// A stretch whose last date carries its year (the same day of the year
// before is in the chart) gives its first date, in the year before, its
// year too: a chart of four weeks before today (5 December 2026) and a
// year on reads "from 5 Dec 2026 to 4 Dec 2027", never "from 5 Dec to
// 4 Dec 2027", which reads backwards. A stretch whose dates carry no year
// keeps none.
func TestChartStretchAcrossYearsGivesFirstYear(t *testing.T) {
	d := func(y int, m time.Month, day int) time.Time { return time.Date(y, m, day, 0, 0, 0, 0, time.UTC) }
	first, last := d(2026, 11, 7), d(2027, 12, 4)
	var all []time.Time
	for t := d(2026, 12, 5); !t.After(last); t = t.AddDate(0, 0, 1) {
		all = append(all, t)
	}
	for _, tc := range []struct {
		name  string
		dates []time.Time
		want  string
	}{
		{"a year", all, "from 5 Dec 2026 to 4 Dec 2027"},
		{"a winter", []time.Time{d(2026, 12, 20), d(2027, 1, 10), d(2027, 2, 6)}, "from 20 Dec to 6 Feb"},
	} {
		if got := seasons(tc.dates, first, last); got != tc.want {
			t.Errorf("%s: %q, want %q", tc.name, got, tc.want)
		}
	}
	held := HeldDates{Feed: "dark", What: []string{"dark windows"}, First: d(2026, 12, 5), Last: d(2027, 12, 1)}
	if got, want := heldText([]HeldDates{held}, first, last, time.Time{}), "Dark windows of the feed dark drawn from 5 Dec 2026 to 1 Dec 2027, the dates it holds."; got != want {
		t.Errorf("feed of fewer dates: %q, want %q", got, want)
	}
}
