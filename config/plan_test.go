package config

import (
	"errors"
	"fmt"
	"slices"
	"strconv"
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

// TestDateRuleWrittenOneWay: a plan's yearly date is written MM-DD and its
// one date YYYY-MM-DD, as a dates list's dates are; written otherwise the
// hint gives the rule as it should be written (29 February exists in leap
// years, so "every 2-29" is "every 02-29"); a date of the year written day
// first, after "every", is the month first.
func TestDateRuleWrittenOneWay(t *testing.T) {
	for _, tc := range []struct{ in, msg, hint string }{
		{"every 6-12", `"6-12" is not a date of the year written MM-DD`, `write it "every 06-12"`},
		{"every 06-1", `"06-1" is not a date of the year written MM-DD`, `write it "every 06-01"`},
		{"every 2-29", `"2-29" is not a date of the year written MM-DD`, `write it "every 02-29"`},
		{"every 2-30", `"2-30" is not a date of the year: MM-DD is a month 01..12, then a day that month has`, `e.g. "every 04-25"; "every 02-29" is in leap years only`},
		{"every 29-02", `"29-02" is not a date of the year: MM-DD is a month 01..12, then a day that month has`, `the month comes first: write it "every 02-29"`}, // written DD-MM
		{"every 25-4", `"25-4" is not a date of the year: MM-DD is a month 01..12, then a day that month has`, `the month comes first: write it "every 04-25"`},
		{"every 31-04", `"31-04" is not a date of the year: MM-DD is a month 01..12, then a day that month has`, `e.g. "every 04-25"; "every 02-29" is in leap years only`}, // 30 April is the last
		{"every feb 29", `"every" takes one word, a weekday, "day" or a date MM-DD, not "feb 29"`, `write the date MM-DD: "every 02-29"`},
		{"every 25 April", `"every" takes one word, a weekday, "day" or a date MM-DD, not "25 april"`, `write the date MM-DD: "every 04-25"`},
		{"every 30 feb", `"every" takes one word, a weekday, "day" or a date MM-DD, not "30 feb"`, `e.g. "every friday" or "every 04-25"; an event's dates alone: "full-moon"`}, // no such date
		{"every 25.12.", `"25.12." is not a weekday, "day" or a date MM-DD`, `every year on 25 December: write "every 12-25"`},
		{"every 2027-06-12", `"2027-06-12" is one date, not a date of every year`, `for that date alone, write it without "every"; for every year, "every MM-DD"`},
		{"2027-6-12", "not a date", "write it 2027-06-12"},
		{"2027/06/12", "not a date", "write it 2027-06-12"},
		{"12-06-2027", "not a date", "write YYYY-MM-DD, the year first: 2027-06-12 for 12 June, 2027-12-06 for 6 December"},
		{"12.06.2027", "not a date", "12 June 2027: write it 2027-06-12"},
		{"2028-02-30", "not a date", "February 2028 has 29 days"},
		{"2201-01-01", "outside the supported range 1800-01-01..2200-12-31", "the sky is computed for these dates only"},
	} {
		_, err := ParseDateRule(tc.in)
		var re *RuleError
		if !errors.As(err, &re) || re.Msg != tc.msg || re.Hint != tc.hint {
			t.Errorf("%q: %v, want %s (%s)", tc.in, err, tc.msg, tc.hint)
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

// A plan time written with the 12-hour clock, with another mark than the
// colon, or with its offset in words gets the time to write; the problem names the value once, so an unknown
// kind that is the whole value is not repeated in the message.
func TestPlanTimeWrittenOtherwise(t *testing.T) {
	for _, tc := range []struct{ in, msg, hint string }{
		{"11:30 pm", "not a clock time", `the clock has 24 hours: write it "23:30"`},
		{"9pm", "not a clock time", `the clock has 24 hours: write it "21:00"`},
		{"12 am", "not a clock time", `the clock has 24 hours: write it "00:00"`},
		{"12:15 PM", "not a clock time", `the clock has 24 hours: write it "12:15"`},
		{"8.15 p.m.", "not a clock time", `the clock has 24 hours: write it "20:15"`},
		{"13pm", "not a clock time", `write HH:MM (00:00..23:59), e.g. "20:00"`},
		// the hours and minutes apart with a dot (German, Scandinavian), an
		// h (French) or a space, or the seconds written too
		{"17.30", "not a clock time", `write it "17:30"`},
		{"7.05", "not a clock time", `write it "07:05"`},
		{"17h30", "not a clock time", `write it "17:30"`},
		{"17 30", "not a clock time", `write it "17:30"`},
		{"17:30:00", "not a clock time", `write it "17:30"`},
		{"25.30", "not a clock time", `write HH:MM (00:00..23:59), e.g. "20:00"`},
		{"sunset + 30 min", "malformed offset", `did you mean "sunset+30m"?`},
		{"Sunset - 2 hours", "malformed offset", `did you mean "sunset-2h"?`},
		{"sun set", "unknown kind", `did you mean "sunset"?`},
		{"sunsett+30m", `unknown kind "sunsett"`, `did you mean "sunset+30m"?`},
	} {
		_, err := ParseTimeSpec(tc.in)
		var re *RuleError
		if !errors.As(err, &re) || re.Msg != tc.msg || re.Hint != tc.hint {
			t.Errorf("%q: %v, want %s (%s)", tc.in, err, tc.msg, tc.hint)
		}
		if re != nil && re.Hint != "" && strings.HasPrefix(re.Hint, "did you mean") {
			near := strings.Trim(strings.TrimPrefix(re.Hint, "did you mean "), `"?`)
			if _, err := ParseTimeSpec(near); err != nil {
				t.Errorf("%q: the hint %q is refused: %v", tc.in, near, err)
			}
		}
	}
}

// A date of the year without its "every", or written day first with dots
// as in German ("25.04."), is told the rule to write; no kind begins with
// a digit, so it is not called an unknown kind.
func TestDateRuleDayOfYear(t *testing.T) {
	for in, hint := range map[string]string{
		"04-25":  `every year on 25 April: write "every 04-25"`,
		"4-25":   `every year on 25 April: write "every 04-25"`,
		"25.04.": `every year on 25 April: write "every 04-25"`,
		"29.2":   `every year on 29 February: write "every 02-29"`,
		"31.02.": dateRuleHint,
		"4/25":   dateRuleHint,
	} {
		_, err := ParseDateRule(in)
		var re *RuleError
		if !errors.As(err, &re) || re.Msg != "not a date rule" || re.Hint != hint {
			t.Errorf("%q: %v, want not a date rule (%s)", in, err, hint)
		}
		if w, ok := strings.CutPrefix(re.Hint, "every year on "); ok {
			rule := strings.Trim(w[strings.Index(w, "write ")+len("write "):], `"`)
			if _, err := ParseDateRule(rule); err != nil {
				t.Errorf("%q: the hint %q is refused: %v", in, rule, err)
			}
		}
	}
}

// A one-word date rule near no event kind is told it is no date rule, not
// an unknown kind: "saturdays" means "every saturday", and "weekly" names
// no day. A misspelt kind ("fullmoon") stays an unknown kind.
func TestDateRuleWordNearNoKind(t *testing.T) {
	for rule, want := range map[string][2]string{
		"saturdays": {"not a date rule", `did you mean "every saturday"?`},
		"weekly":    {"not a date rule", dateRuleHint},
		"fullmoon":  {"unknown kind", `did you mean "full-moon"?`},
	} {
		_, err := ParseDateRule(rule)
		var re *RuleError
		if !errors.As(err, &re) || re.Msg != want[0] || re.Hint != want[1] {
			t.Errorf("%s: %v, want %s (%s)", rule, err, want[0], want[1])
		}
	}
}

// An unknown kind that is the whole date rule is not named twice:
// `date: fullmoon: unknown kind (did you mean "full-moon"?)`.
func TestDateRuleUnknownKindOnce(t *testing.T) {
	_, err := ParseDateRule("fullmoon")
	var re *RuleError
	if !errors.As(err, &re) || re.Msg != "unknown kind" || re.Hint != `did you mean "full-moon"?` {
		t.Errorf("%v, want unknown kind (did you mean \"full-moon\"?)", err)
	}
	_, err = ParseDateRule("saturday nearest fullmoon")
	if !errors.As(err, &re) || re.Msg != `unknown kind "fullmoon"` {
		t.Errorf("%v, want the unknown kind of a longer rule named", err)
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

// A misspelt word of a plan's date rule, start or end gets the whole value
// it likely means as a did-you-mean, as a misspelt kind of a kinds entry
// does; a word near nothing keeps the forms of a rule as its hint.
func TestPlanDidYouMean(t *testing.T) {
	for _, tc := range []struct{ in, hint string }{
		{"saturdy nearest new-moon", `did you mean "saturday nearest new-moon"?`},
		{"evry friday", `did you mean "every friday"?`},
		{"sundy after full-moon", `did you mean "sunday after full-moon"?`},
		{"every fridy", `did you mean "every friday"?`},
		{"evry day", `did you mean "every day"?`},
		{"saturday neerest new-moon", `did you mean "saturday nearest new-moon"?`},
		{"saturday near new-moon", `did you mean "saturday nearest new-moon"?`},
		{"sat befor ful-moon", `did you mean "sat before full-moon"?`},
		{"saturday nearest new-mon", `did you mean "saturday nearest new-moon"?`},
		{"saturday nearest full moon", `did you mean "saturday nearest full-moon"?`},
		{"ful-moon", `did you mean "full-moon"?`},
		{"full moon", `did you mean "full-moon"?`},
		{"photoperod:12h", `did you mean "photoperiod:12h"?`},
		{"fridy", `did you mean "every friday"?`},
		{"dayly", `did you mean "every day"?`},
		// near nothing, or near only what a rule cannot take: no guess
		{"every fortnight", `e.g. "every friday" or "every 04-25"`},
		{"every sunset", `e.g. "every friday" or "every 04-25"`},
		{"sunsett", dateRuleHint},
		{"friday nearest sunsett", dateRuleHint},
		{"saturday nearest", dateRuleHint},
		{"sat nearest photoperiod:25h", `e.g. "photoperiod:12h"`},
	} {
		_, err := ParseDateRule(tc.in)
		var re *RuleError
		if !errors.As(err, &re) || re.Hint != tc.hint {
			t.Errorf("date %q: %v, want the hint %s", tc.in, err, tc.hint)
		}
	}
	for _, tc := range []struct{ in, hint string }{
		{"sunsett+30m", `did you mean "sunset+30m"?`},
		{"civl-dusk-15m", `did you mean "civil-dusk-15m"?`},
		{"sunrse", `did you mean "sunrise"?`},
		{"Sunset + 30m", `did you mean "sunset+30m"?`},
		// the offset in words before the event: the plan time it means
		{"30m before sunrise", `did you mean "sunrise-30m"?`},
		{"30 min before sunrise", `did you mean "sunrise-30m"?`},
		{"1 hour after sunset", `did you mean "sunset+1h"?`},
		{"1h 30m before civil-dusk", `did you mean "civil-dusk-1h30m"?`},
		// golden-hour is near but no plan time; a unit missing is no misspelling
		{"golden-houre", timeSpecHint},
		{"astronomical-dusk-15", timeSpecHint},
		{"30m before golden-hour", `write HH:MM (00:00..23:59), e.g. "20:00"`}, // no instant: no guess
	} {
		_, err := ParseTimeSpec(tc.in)
		var re *RuleError
		if !errors.As(err, &re) || re.Hint != tc.hint {
			t.Errorf("time %q: %v, want the hint %s", tc.in, err, tc.hint)
		}
	}
}

// The did-you-mean reaches `heliocal check` as the rest of the
// configuration's do: the field, the value as written, the hint, the line.
func TestPlanDidYouMeanFields(t *testing.T) {
	_, err := Parse(strings.NewReader(`
sites: [{id: s, latitude: 47, longitude: 8, timezone: Europe/Zurich}]
feeds:
- id: f
  site: s
  plans:
  - {title: a, date: "Saturdy nearest new-moon", start: "sunsett+30m", end: "sunrse"}
  - {title: b, date: "evry friday", months: [juli, febuary]}
`), "yaml")
	ps := problemsOf(t, err)
	want := []FieldError{
		{"feeds[0].plans[0].date", "Saturdy nearest new-moon", `"saturdy" is not a weekday`, `did you mean "saturday nearest new-moon"?`, 7},
		{"feeds[0].plans[0].start", "sunsett+30m", `unknown kind "sunsett"`, `did you mean "sunset+30m"?`, 7},
		{"feeds[0].plans[0].end", "sunrse", "unknown kind", `did you mean "sunrise"?`, 7},
		{"feeds[0].plans[1].date", "evry friday", "not a date rule", `did you mean "every friday"?`, 8},
		{"feeds[0].plans[1].months[0]", "juli", "not a month", `did you mean "jul"?`, 8},
		{"feeds[0].plans[1].months[1]", "febuary", "not a month", `did you mean "february"?`, 8},
	}
	if !slices.Equal(ps, want) {
		t.Errorf("problems:\n%v\nwant:\n%v", ps, want)
	}
}

// A start or end that is a known kind but no instant says why, and the
// hint names exactly the kinds that are allowed: each of them parses as a
// plan time, and no other kind does.
func TestPlanTimeNotInstant(t *testing.T) {
	for _, tc := range []struct{ in, msg string }{
		{"golden-hour", `"golden-hour" gives spans, not one instant`},
		{"dark-window+10m", `"dark-window" gives spans, not one instant`},
		{"lighting:16h", `"lighting:16h" gives spans, not one instant`},
		{"solar-eclipse", `"solar-eclipse" gives spans, not one instant`},
		{"seasons", `"seasons" stands for several kinds: name one of them (march-equinox, june-solstice, september-equinox, december-solstice)`},
		{"moon-phases-1h", `"moon-phases" stands for several kinds: name one of them (new-moon, first-quarter, full-moon, last-quarter)`},
		{"photoperiod:12h", `"photoperiod:12h" gives dates, not a time of day: as a date rule (date: photoperiod:12h) it picks the dates`},
		{"daily-summary", `"daily-summary" gives one all-day entry a date, not a time of day`},
		{"sun-altitude:-3", `"sun-altitude:-3" is crossed twice a day, rising and setting, not once`},
	} {
		_, err := ParseTimeSpec(tc.in)
		var re *RuleError
		if !errors.As(err, &re) || re.Msg != tc.msg || re.Hint != instantHint {
			t.Errorf("time %q: %v, want %s (%s)", tc.in, err, tc.msg, instantHint)
		}
	}
	list := strings.TrimPrefix(instantHint, "a plan starts and ends at one of ")
	list, _, _ = strings.Cut(list, `, with an optional offset`)
	named := strings.Split(list, ", ")
	for _, name := range named {
		if _, err := ParseTimeSpec(name); err != nil {
			t.Errorf("the hint names %q, which is refused: %v", name, err)
		}
	}
	for _, name := range KindNames {
		if _, err := ParseTimeSpec(name); err == nil && !slices.Contains(named, name) {
			t.Errorf("%q is a plan time the hint does not name", name)
		}
	}
	if len(named) != len(instantNames) {
		t.Errorf("the hint names %d kinds, want %d: %s", len(named), len(instantNames), instantHint)
	}
}

// A description written as a YAML block (description: |) keeps its lines
// but not the line break the block ends in (YAML 1.2 §8.1.1.2: a block's
// final line break is kept by default, "clip"), so that the calendar's and
// a plan's texts after it do not begin after an empty line more.
func TestDescriptionBlockTrailingBreak(t *testing.T) {
	c, err := Parse(strings.NewReader(`sites:
  - {id: s, latitude: 48.2, longitude: 16.4, timezone: Europe/Vienna}
feeds:
  - id: f
    site: s
    description: |
      Lines for the farm.
      Second line.
    kinds: [sunrise]
    plans:
      - title: Frost
        date: every 04-25
        description: |
          Cover the seedlings.
`), "yaml")
	if err != nil {
		t.Fatal(err)
	}
	f := c.Feeds[0]
	if f.Description != "Lines for the farm.\nSecond line." || f.Plans[0].Description != "Cover the seedlings." {
		t.Errorf("descriptions %q and %q, want them without the block's last line break", f.Description, f.Plans[0].Description)
	}
}

// Days and months named in German, French, Spanish or Italian are told the
// English name to write, a translation no spelling distance finds; a name
// near an English one in spelling gets it as a did-you-mean.
func TestForeignNames(t *testing.T) {
	_, err := Parse(strings.NewReader(`
sites: [{id: a, latitude: 47.5, longitude: 9.7, timezone: Europe/Zurich}]
feeds:
  - id: f
    site: a
    kinds: [{kind: sunset, weekdays: [Samstag, Di, dimanche, sabato], months: [Dezember, août, Juni]}]
`), "yaml")
	var got []string
	for _, p := range problemsOf(t, err) {
		got = append(got, p.Value+": "+p.Hint)
	}
	want := []string{
		`Samstag: weekdays are named in English: write "sat"`,
		`Di: weekdays are named in English: write "tue"`,
		`dimanche: weekdays are named in English: write "sun"`,
		`sabato: weekdays are named in English: write "sat"`, // Italian
		`Dezember: did you mean "december"?`,                 // near in spelling: the English name
		`août: months are named in English: write "aug"`,
		`Juni: did you mean "jun"?`,
	}
	if !slices.Equal(got, want) {
		t.Errorf("hints:\n%s\nwant\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
}

// A plan's date rule written in German, French, Spanish or Italian, the
// word for "every" with a day ("jeden Samstag" is German for "every
// Saturday"), is told the rule to write in English, as the names of the
// days are; so is a foreign day after "every" and German's "samstags" ("on
// Saturdays"). Each is named at its line with its field.
func TestDateRuleForeignEvery(t *testing.T) {
	rules := []struct{ in, want string }{
		{"jeden Samstag", `not a date rule (date rules are written in English: write "every saturday")`},
		{"chaque samedi", `not a date rule (date rules are written in English: write "every saturday")`},
		{"cada sábado", `not a date rule (date rules are written in English: write "every saturday")`},
		{"ogni sabato", `not a date rule (date rules are written in English: write "every saturday")`},
		{"tous les lundis", `not a date rule (date rules are written in English: write "every monday")`},
		{"todos los domingos", `not a date rule (date rules are written in English: write "every sunday")`},
		{"jeden Tag", `not a date rule (date rules are written in English: write "every day")`},
		{"chaque jour", `not a date rule (date rules are written in English: write "every day")`},
		{"samstags", `not a date rule (date rules are written in English: write "every saturday")`},
		{"Freitag", `not a date rule (date rules are written in English: write "every friday")`},
		{"every Samstag", `"samstag" is not a weekday, "day" or a date MM-DD (weekdays are named in English: write "every saturday")`},
	}
	doc := "sites: [{id: a, latitude: 47.5, longitude: 9.7, timezone: Europe/Zurich}]\nfeeds:\n  - id: f\n    site: a\n    plans:\n"
	for _, r := range rules {
		doc += fmt.Sprintf("      - {title: Open day, start: \"10:00\", date: %s}\n", r.in)
	}
	_, err := Parse(strings.NewReader(doc), "yaml")
	var got, want []string
	for _, p := range problemsOf(t, err) {
		got = append(got, fmt.Sprintf("%d: %s", p.Line, p.Error()))
	}
	for i, r := range rules {
		shown := r.in // in quotes when it has a space, as every value is shown
		if strings.Contains(shown, " ") {
			shown = strconv.Quote(shown)
		}
		want = append(want, fmt.Sprintf("%d: feeds[0].plans[%d].date: %s: %s", 6+i, i, shown, r.want))
	}
	if !slices.Equal(got, want) {
		t.Errorf("problems\n%s\nwant\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
}

// A clock time where a time of day belongs, written without quotes with a
// dot (start: 17.30), is the number 17.3 to YAML and TOML: it is named as
// written and told the time to write, as the same text in quotes is. A duration whose minutes
// have no unit, or written with spaces, is told the duration to write.
func TestClockAsNumberAndDurationSlips(t *testing.T) {
	for format, doc := range map[string]string{
		"yaml": "sites: [{id: a, latitude: 1, longitude: 2, timezone: UTC}]\nfeeds:\n  - id: f\n    site: a\n    plans:\n      - {title: a, date: every day, start: 17.30, for: 1h30}\n      - {title: b, date: every day, start: \"17.30\", for: 1h 30m}\n",
		"toml": "[[sites]]\nid = \"a\"\nlatitude = 1\nlongitude = 2\ntimezone = \"UTC\"\n[[feeds]]\nid = \"f\"\nsite = \"a\"\n[[feeds.plans]]\ntitle = \"a\"\ndate = \"every day\"\nstart = 17.30\nfor = \"1h30\"\n[[feeds.plans]]\ntitle = \"b\"\ndate = \"every day\"\nstart = \"17.30\"\nfor = \"1h 30m\"\n",
	} {
		_, err := Parse(strings.NewReader(doc), format)
		var got []string
		for _, p := range problemsOf(t, err) {
			got = append(got, p.Path+": "+p.Value+": "+p.Hint)
		}
		want := []string{
			`feeds[0].plans[0].start: 17.30: write it "17:30"`, // as written, not the number 17.3
			`feeds[0].plans[0].for: 1h30: the minutes need their unit too: write "1h30m"`,
			`feeds[0].plans[1].start: 17.30: write it "17:30"`,
			`feeds[0].plans[1].for: 1h 30m: write it without spaces: "1h30m"`,
		}
		if !slices.Equal(got, want) {
			t.Errorf("%s: hints\n%s\nwant\n%s", format, strings.Join(got, "\n"), strings.Join(want, "\n"))
		}
	}
}

// A number where a duration belongs is told its unit; the hours are offered
// only where they are within every duration's limit (an offset's 12h), as
// "600h" would be refused once written.
func TestDurationNumberHint(t *testing.T) {
	for in, hint := range map[string]string{
		"alarm: 10":  `write e.g. "10m" for minutes or "10h" for hours`,
		"alarm: 600": `write e.g. "600m" for minutes`,
	} {
		_, err := Parse(strings.NewReader("sites: [{id: a, latitude: 1, longitude: 2, timezone: UTC}]\nfeeds:\n  - id: f\n    site: a\n    kinds: [sunrise]\n    "+in+"\n"), "yaml")
		if err == nil {
			t.Errorf("%s: no error", in)
			continue
		}
		ps := problemsOf(t, err)
		if len(ps) != 1 || ps[0].Msg != "a duration needs a unit" || ps[0].Hint != hint {
			t.Errorf("%s: %v\nwant the hint %s", in, err, hint)
		}
	}
}
