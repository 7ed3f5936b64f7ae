package config

import (
	"errors"
	"strings"
	"testing"
	"time"
)

// An unquoted date in YAML is a timestamp to the YAML reader; a plan's date
// keeps it as the date written.
func TestPlanDateUnquoted(t *testing.T) {
	c, err := Parse(strings.NewReader(`
sites: [{id: s, latitude: 1, longitude: 2, timezone: UTC}]
feeds: [{id: f, site: s, plans: [{title: Open day, date: 2027-03-06}]}]
`), "yaml")
	if err != nil {
		t.Fatal(err)
	}
	if got := c.Feeds[0].Plans[0].Date; got != "2027-03-06" {
		t.Errorf("date %q", got)
	}
}

// TestParseDateRule reads each form of the date rules.
func TestParseDateRule(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want DateRule
	}{
		{"every day", DateRule{Type: RuleEveryDay}},
		{"Every Friday", DateRule{Type: RuleWeekly, Weekday: time.Friday}},
		{"every 04-25", DateRule{Type: RuleYearly, Month: time.April, Day: 25}},
		{"every 02-29", DateRule{Type: RuleYearly, Month: time.February, Day: 29}},
		{"2027-06-12", DateRule{Type: RuleOnce, Date: time.Date(2027, 6, 12, 0, 0, 0, 0, time.UTC)}},
		{"full-moon", DateRule{Type: RuleEvent, Event: Kind{Name: "full-moon"}}},
		{"sat nearest new-moon", DateRule{Type: RuleWeekdayOf, Weekday: time.Saturday, Relation: RelNearest, Event: Kind{Name: "new-moon"}}},
		{"monday after photoperiod:12h", DateRule{Type: RuleWeekdayOf, Weekday: time.Monday, Relation: RelAfter, Event: Kind{Name: "photoperiod", DayLength: 12 * time.Hour}}},
	} {
		got, err := ParseDateRule(tc.in)
		if err != nil || got != tc.want {
			t.Errorf("%q: %+v, %v; want %+v", tc.in, got, err, tc.want)
		}
	}
	for _, bad := range []string{"", "every", "every 13-01", "2027-02-30", "sunset", "saturday near new-moon", "someday nearest new-moon"} {
		if _, err := ParseDateRule(bad); err == nil {
			t.Errorf("%q: no error", bad)
		}
	}
}

// TestParseTimeSpec reads clock times and events with offsets.
func TestParseTimeSpec(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want TimeSpec
	}{
		{"20:00", TimeSpec{IsClock: true, Clock: 20 * time.Hour}},
		{"7:05", TimeSpec{IsClock: true, Clock: 7*time.Hour + 5*time.Minute}},
		{"sunset", TimeSpec{Event: Kind{Name: "sunset"}}},
		{"sunset+30m", TimeSpec{Event: Kind{Name: "sunset"}, Offset: 30 * time.Minute}},
		{"astronomical-dusk-1h15m", TimeSpec{Event: Kind{Name: "astronomical-dusk"}, Offset: -75 * time.Minute}},
	} {
		got, err := ParseTimeSpec(tc.in)
		if err != nil || got != tc.want {
			t.Errorf("%q: %+v, %v; want %+v", tc.in, got, err, tc.want)
		}
	}
	for _, bad := range []string{"24:00", "8pm", "golden-hour", "sunset+13h", "sun-altitude:-3", "daily-summary"} {
		if _, err := ParseTimeSpec(bad); err == nil {
			t.Errorf("%q: no error", bad)
		}
	}
}

// A weekday, "day" or "every" alone is a weekly or daily rule short of a
// word, not an unknown kind: the hint gives the rule meant.
func TestDateRuleMissingEvery(t *testing.T) {
	for in, hint := range map[string]string{
		"friday": `write "every friday"`,
		"Sat":    `write "every saturday"`,
		"daily":  `write "every day"`,
		"every":  `say every what: "every day", "every friday" or "every 04-25"`,
	} {
		_, err := ParseDateRule(in)
		var re *RuleError
		if !errors.As(err, &re) || re.Msg != "not a date rule" || re.Hint != hint {
			t.Errorf("%q: %v, want not a date rule (%s)", in, err, hint)
		}
	}
}
