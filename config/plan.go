package config

import (
	"fmt"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"sync"
	"time"
)

// Values of the lighting options (KindSpec.Lamps and KindSpec.Natural).
const (
	LampsEvening = "evening" // lamps from sunset until the target is reached (default)
	LampsMorning = "morning" // lamps from before sunrise until sunrise
	LampsBoth    = "both"    // the shortfall split equally between morning and evening

	NaturalSunriseSunset = "sunrise-sunset" // the natural day is sunrise to sunset (default)
	NaturalCivil         = "civil"          // civil dawn to civil dusk counts as natural light
)

var weekdayNames = []string{"sun", "mon", "tue", "wed", "thu", "fri", "sat"}

var monthNames = []string{"jan", "feb", "mar", "apr", "may", "jun", "jul", "aug", "sep", "oct", "nov", "dec"}

// The weekdays' and months' names in full and in lower case ("sunday",
// "january"), as time writes them, made once: a feed's plans read their
// date rules each time the feed is built.
var (
	weekdayFull = lowerNames(7, func(i int) string { return time.Weekday(i).String() })
	monthFull   = lowerNames(12, func(i int) string { return time.Month(i + 1).String() })
)

func lowerNames(n int, name func(int) string) []string {
	out := make([]string, n)
	for i := range out {
		out[i] = strings.ToLower(name(i))
	}
	return out
}

// ParseWeekday reads a day of the week: "mon" or "monday", any case.
func ParseWeekday(s string) (time.Weekday, bool) {
	t := strings.ToLower(strings.TrimSpace(s))
	for i, n := range weekdayNames {
		if t == n || t == weekdayFull[i] {
			return time.Weekday(i), true
		}
	}
	return 0, false
}

// ParseMonth reads a month: "jan" or "january", any case.
func ParseMonth(s string) (time.Month, bool) {
	t := strings.ToLower(strings.TrimSpace(s))
	for i, n := range monthNames {
		if t == n || t == monthFull[i] {
			return time.Month(i + 1), true
		}
	}
	return 0, false
}

// DateFilter keeps the dates on some days of the week, in some months and
// among some listed dates. The zero DateFilter keeps every date.
type DateFilter struct {
	weekdays uint8   // bit d: time.Weekday d kept; 0 = all
	months   uint16  // bit m: time.Month m kept; 0 = all
	dates    []int64 // the listed dates kept, as days since 1970-01-01, sorted; empty = all
}

// NewDateFilter builds the filter of the weekdays, months and dates lists
// as written in the file; values that do not parse are ignored (Validate
// reports them).
func NewDateFilter(weekdays, months, dates []string) DateFilter {
	var f DateFilter
	for _, w := range weekdays {
		if d, ok := ParseWeekday(w); ok {
			f.weekdays |= 1 << d
		}
	}
	for _, m := range months {
		if mm, ok := ParseMonth(m); ok {
			f.months |= 1 << mm
		}
	}
	for _, d := range ListedDates(dates) {
		f.dates = append(f.dates, dayNumber(d))
	}
	slices.Sort(f.dates)
	return f
}

// IsZero reports whether the filter keeps every date.
func (f DateFilter) IsZero() bool { return f.weekdays == 0 && f.months == 0 && len(f.dates) == 0 }

// Allows reports whether the civil date d (its year, month and day) is kept.
func (f DateFilter) Allows(d time.Time) bool {
	if f.weekdays != 0 && f.weekdays&(1<<d.Weekday()) == 0 {
		return false
	}
	if f.months != 0 && f.months&(1<<d.Month()) == 0 {
		return false
	}
	if len(f.dates) == 0 {
		return true
	}
	_, ok := slices.BinarySearch(f.dates, dayNumber(d))
	return ok
}

// LeftOutBy says which list leaves the civil date d out: "months",
// "weekdays" or "dates" (the first that does, in that order), or "" when
// the filter keeps d.
func (f DateFilter) LeftOutBy(d time.Time) string {
	switch {
	case f.months != 0 && f.months&(1<<d.Month()) == 0:
		return "months"
	case f.weekdays != 0 && f.weekdays&(1<<d.Weekday()) == 0:
		return "weekdays"
	case !f.Allows(d):
		return "dates"
	}
	return ""
}

// dayNumber is the number of days from 1970-01-01 to the civil date of d
// (its year, month and day, whatever its location).
func dayNumber(d time.Time) int64 {
	return time.Date(d.Year(), d.Month(), d.Day(), 0, 0, 0, 0, time.UTC).Unix() / (24 * 60 * 60)
}

// The dates a kinds entry's dates list may name: the span the astronomy
// covers (astro.MinTime..astro.MaxTime; config does not import astro).
const (
	FirstListedDate = "1800-01-01"
	LastListedDate  = "2200-12-31"
)

// ParseListedDate reads a date of a dates list or a plan's date rule,
// "YYYY-MM-DD" (see parseDate), and returns it at 00:00 UTC. A date written
// otherwise ("2027-6-12"), one that does not exist ("2027-02-30") or one
// outside FirstListedDate..LastListedDate is a *RuleError.
func ParseListedDate(s string) (time.Time, error) {
	d, re := parseDate(s)
	if re != nil {
		return time.Time{}, re
	}
	if t := d.Format(time.DateOnly); t < FirstListedDate || t > LastListedDate {
		return time.Time{}, &RuleError{Msg: fmt.Sprintf("outside the supported range %s..%s", FirstListedDate, LastListedDate),
			Hint: "the sky is computed for these dates only"}
	}
	return d, nil
}

// ListedDates are the dates of a dates list (see ParseListedDate), in the
// order written; those that do not parse are left out (Validate reports
// them).
func ListedDates(dates []string) []time.Time {
	var out []time.Time
	for _, s := range dates {
		if d, err := ParseListedDate(s); err == nil {
			out = append(out, d)
		}
	}
	return out
}

// Filter returns the date filter of a kinds entry.
func (ks KindSpec) Filter() DateFilter { return NewDateFilter(ks.Weekdays, ks.Months, ks.Dates) }

// Filter returns the date filter of a plan (its date rule names its dates).
func (p Plan) Filter() DateFilter { return NewDateFilter(p.Weekdays, p.Months, nil) }

// ParseClock reads a local clock time "HH:MM" (00:00..23:59) and returns
// the time since midnight.
func ParseClock(s string) (time.Duration, error) {
	t := strings.TrimSpace(s)
	h, m, ok := strings.Cut(t, ":")
	hh, err1 := strconv.Atoi(h)
	mm, err2 := strconv.Atoi(m)
	if !ok || err1 != nil || err2 != nil || len(m) != 2 || len(h) < 1 || len(h) > 2 || hh < 0 || hh > 23 || mm < 0 || mm > 59 {
		return 0, fmt.Errorf("not a clock time")
	}
	return time.Duration(hh)*time.Hour + time.Duration(mm)*time.Minute, nil
}

// RuleError reports a date rule or a time that cannot be parsed.
type RuleError struct {
	Msg, Hint string
}

func (e *RuleError) Error() string {
	if e.Hint == "" {
		return e.Msg
	}
	return e.Msg + " (" + e.Hint + ")"
}

// Date rule types (DateRule.Type).
const (
	RuleEveryDay  = iota + 1 // "every day"
	RuleWeekly               // "every friday"
	RuleYearly               // "every 04-25"
	RuleOnce                 // "2027-06-12"
	RuleEvent                // "full-moon": the local date of each event
	RuleWeekdayOf            // "saturday nearest new-moon"
)

// Relations of a RuleWeekdayOf rule.
const (
	RelNearest = "nearest" // the closest such weekday to the event's local date (the date itself if it is one)
	RelBefore  = "before"  // the last such weekday strictly before the event's local date
	RelAfter   = "after"   // the first such weekday strictly after it
)

// DateRule is a parsed plan date (Plan.Date).
type DateRule struct {
	Type     int
	Weekday  time.Weekday // RuleWeekly, RuleWeekdayOf
	Month    time.Month   // RuleYearly
	Day      int          // RuleYearly
	Date     time.Time    // RuleOnce, 00:00 UTC
	Event    Kind         // RuleEvent, RuleWeekdayOf
	Relation string       // RuleWeekdayOf: RelNearest, RelBefore or RelAfter
}

const dateRuleHint = `e.g. "every day", "every friday", "every 04-25", "2027-06-12", "full-moon", "saturday nearest new-moon"`

// ParseDateRule reads a plan's date rule: "every day", "every <weekday>",
// "every MM-DD", one date "YYYY-MM-DD", an event kind whose events name
// dates ("full-moon", "june-solstice", "photoperiod:12h"), or
// "<weekday> nearest|before|after <event kind>". A misspelt word gets the
// rule it likely means as the error's hint ("saturdy nearest new-mon": did
// you mean "saturday nearest new-moon"?).
func ParseDateRule(s string) (DateRule, error) {
	f := strings.Fields(strings.ToLower(s))
	r, err := parseDateRule(f)
	if err != nil {
		near := "" // the rule suggested
		if en := englishRule(f); en != "" {
			// "jeden Samstag", "chaque samedi": the rule in English
			if f[0] == "every" {
				err.Hint = fmt.Sprintf("weekdays are named in English: write %q", en)
			} else {
				err.Msg, err.Hint = "not a date rule", fmt.Sprintf("date rules are written in English: write %q", en)
			}
		} else if near = nearRule(f); near != "" {
			err.Hint = didYouMean(near)
		}
		if _, kerr := ParseKind(near); err.Msg == msgUnknownKind && kerr != nil {
			// "weekly", "saturdays": a word near no kind is no misspelt
			// event but a rule written otherwise
			err.Msg = "not a date rule"
		}
		return DateRule{}, err
	}
	return r, nil
}

// everyWords are the words for "every" before a day in German, French,
// Spanish and Italian ("jeden Samstag", "chaque samedi", "cada sábado",
// "ogni sabato"); everyPairs are the two words of "every" before a day in
// the plural ("tous les samedis", "todos los sábados").
var (
	everyWords = []string{"jeden", "jede", "jedes", "alle", "chaque", "cada", "ogni"}
	everyPairs = []string{"tous les", "todos los", "tutti i", "tutte le"}
)

// dayWords are "day" and "days" in German, French, Spanish and Italian.
var dayWords = []string{"tag", "tage", "jour", "jours", "día", "dia", "días", "dias", "giorno", "giorni"}

// englishRule is the rule a date rule f (its words in lower case) written
// in German, French, Spanish or Italian says in English: "every saturday"
// for "jeden samstag", "chaque samedi", "tous les samedis", "every samstag"
// or "samstags" (German for "on Saturdays"), "every day" for "jeden tag" or
// "täglich"; "" when f is no such rule.
func englishRule(f []string) string {
	var day string
	switch {
	case len(f) == 1 && f[0] == "täglich":
		day = "tag"
	case len(f) == 1 && len(f[0]) > 3: // "samstag", "samstags"; not "sa"
		day = f[0]
	case len(f) == 2 && (f[0] == "every" || slices.Contains(everyWords, f[0])):
		day = f[1]
	case len(f) == 3 && slices.Contains(everyPairs, f[0]+" "+f[1]):
		day = f[2]
	default:
		return ""
	}
	if slices.Contains(dayWords, day) {
		return "every day"
	}
	for _, w := range []string{day, strings.TrimSuffix(day, "s")} {
		if d, ok := ParseWeekday(w); ok && len(f) > 1 && f[0] != "every" {
			return "every " + weekdayFull[d] // "jeden saturday"
		}
		if en, ok := foreignNames[w]; ok && en[:3] == "sun" {
			d, _ := ParseWeekday(en[3:])
			return "every " + weekdayFull[d]
		}
	}
	return ""
}

// namedMonthDay reads a date of the year written with the month's name,
// either way round ("feb 29", "25 april", "29th february"): its month and
// day when the day is one that month has (29 February in leap years).
func namedMonthDay(f []string) (m time.Month, d int, ok bool) {
	if len(f) != 2 {
		return 0, 0, false
	}
	day := func(s string) (int, bool) {
		for _, suffix := range []string{"st", "nd", "rd", "th"} {
			s = strings.TrimSuffix(s, suffix)
		}
		n, err := strconv.Atoi(s)
		return n, err == nil
	}
	if m, ok = ParseMonth(f[0]); ok {
		d, ok = day(f[1])
	} else if m, ok = ParseMonth(f[1]); ok {
		d, ok = day(f[0])
	}
	if !ok || d < 1 || d > daysIn(m, 2028) { // a leap year: 29 February is a date of the year
		return 0, 0, false
	}
	return m, d, true
}

func parseDateRule(f []string) (DateRule, *RuleError) {
	switch {
	case len(f) == 0:
		return DateRule{}, &RuleError{Msg: "is empty", Hint: dateRuleHint}
	case len(f) == 2 && f[0] == "every":
		if f[1] == "day" {
			return DateRule{Type: RuleEveryDay}, nil
		}
		if d, ok := ParseWeekday(f[1]); ok {
			return DateRule{Type: RuleWeekly, Weekday: d}, nil
		}
		if t, err := time.Parse("01-02", f[1]); err == nil || f[1] == "02-29" {
			if f[1] == "02-29" {
				return DateRule{Type: RuleYearly, Month: time.February, Day: 29}, nil
			}
			return DateRule{Type: RuleYearly, Month: t.Month(), Day: t.Day()}, nil
		}
		if isDateLike(f[1]) {
			return DateRule{}, &RuleError{Msg: fmt.Sprintf("%q is one date, not a date of every year", f[1]),
				Hint: `for that date alone, write it without "every"; for every year, "every MM-DD"`}
		}
		if m, d, ok := monthDay(f[1]); ok {
			// written as a date of the year: one-digit ("6-12"), or no
			// date of the year ("02-30", "13-01")
			if m >= 1 && m <= 12 && d >= 1 && d <= daysIn(time.Month(m), 2028) { // a leap year: 2-29 is a date of the year
				return DateRule{}, &RuleError{Msg: fmt.Sprintf("%q is not a date of the year written MM-DD", f[1]),
					Hint: fmt.Sprintf(`write it "every %02d-%02d"`, m, d)}
			}
			hint := `e.g. "every 04-25"; "every 02-29" is in leap years only`
			if d >= 1 && d <= 12 && m >= 1 && m <= daysIn(time.Month(d), 2028) { // the day first: "29-02"
				hint = fmt.Sprintf(`the month comes first: write it "every %02d-%02d"`, d, m)
			}
			return DateRule{}, &RuleError{Msg: fmt.Sprintf("%q is not a date of the year: MM-DD is a month 01..12, then a day that month has", f[1]),
				Hint: hint}
		}
		hint := `e.g. "every friday" or "every 04-25"`
		if m, d, ok := dayOfYear(f[1]); ok && strings.Contains(f[1], ".") { // "every 25.12.", day first
			hint = fmt.Sprintf(`every year on %d %s: write "every %02d-%02d"`, d, time.Month(m), m, d)
		}
		return DateRule{}, &RuleError{Msg: fmt.Sprintf("%q is not a weekday, \"day\" or a date MM-DD", f[1]), Hint: hint}
	case len(f) == 1 && (isDateLike(f[0]) || isDateTime(f[0])):
		// a date with a time of day (YAML's unquoted 2027-06-12T10:00:00)
		// is refused as a date, with the date to write
		d, err := ParseListedDate(f[0])
		if err != nil {
			return DateRule{}, err.(*RuleError)
		}
		return DateRule{Type: RuleOnce, Date: d}, nil
	case len(f) == 1 && isDayWord(f[0]):
		// "friday" alone is a weekly rule without its "every", not a kind
		hint := `write "every day"`
		if d, ok := ParseWeekday(f[0]); ok {
			hint = fmt.Sprintf(`write "every %s"`, strings.ToLower(d.String()))
		} else if f[0] == "every" {
			hint = `say every what: "every day", "every friday" or "every 04-25"`
		}
		return DateRule{}, &RuleError{Msg: "not a date rule", Hint: hint}
	case len(f) == 1 && f[0][0] >= '0' && f[0][0] <= '9':
		// no kind begins with a digit: a date of the year without its
		// "every" ("04-25"), or written as a day and a month ("25.04.")
		hint := dateRuleHint
		if m, d, ok := dayOfYear(f[0]); ok {
			hint = fmt.Sprintf(`every year on %d %s: write "every %02d-%02d"`, d, time.Month(m), m, d)
		}
		return DateRule{}, &RuleError{Msg: "not a date rule", Hint: hint}
	case len(f) == 1:
		k, err := anchorKind(f[0], true)
		if err != nil {
			return DateRule{}, err
		}
		return DateRule{Type: RuleEvent, Event: k}, nil
	case len(f) > 2 && f[0] == "every":
		// "every blue moon", "every other friday"
		hint := `e.g. "every friday" or "every 04-25"; an event's dates alone: "full-moon"`
		if m, d, ok := namedMonthDay(f[1:]); ok { // "every feb 29", "every 25 april"
			hint = fmt.Sprintf(`write the date MM-DD: "every %02d-%02d"`, m, d)
		}
		return DateRule{}, &RuleError{Msg: fmt.Sprintf("\"every\" takes one word, a weekday, \"day\" or a date MM-DD, not %q", strings.Join(f[1:], " ")),
			Hint: hint}
	case len(f) == 3:
		d, ok := ParseWeekday(f[0])
		if !ok {
			return DateRule{}, &RuleError{Msg: fmt.Sprintf("%q is not a weekday", f[0]), Hint: `e.g. "saturday nearest new-moon"`}
		}
		if !isRelation(f[1]) {
			return DateRule{}, &RuleError{Msg: fmt.Sprintf("%q: write nearest, before or after", f[1]), Hint: `e.g. "saturday nearest new-moon"`}
		}
		k, err := anchorKind(f[2], false)
		if err != nil {
			return DateRule{}, err
		}
		return DateRule{Type: RuleWeekdayOf, Weekday: d, Relation: f[1], Event: k}, nil
	}
	return DateRule{}, &RuleError{Msg: "not a date rule", Hint: dateRuleHint}
}

func isWeekday(s string) bool { _, ok := ParseWeekday(s); return ok }

// dayOfYear reads a date of the year written without a year: MM-DD as a
// date rule writes it ("04-25", "4-25"), or the day first with dots, as
// German and many other European languages write dates ("25.04.", "25.4"),
// when it is a date of the year (29 February included).
func dayOfYear(s string) (month, day int, ok bool) {
	if strings.Contains(s, ".") {
		d, m, found := strings.Cut(strings.TrimSuffix(s, "."), ".")
		if !found {
			return 0, 0, false
		}
		month, day, ok = monthDay(m + "-" + d)
	} else {
		month, day, ok = monthDay(s)
	}
	if !ok || month < 1 || month > 12 || day < 1 || day > daysIn(time.Month(month), 2028) { // a leap year: 29 February is a date of the year
		return 0, 0, false
	}
	return month, day, true
}

// isDayWord reports whether a one-word rule is a weekly or daily rule short
// of a word: a weekday, "day", "daily" or "every".
func isDayWord(s string) bool { return s == "every" || s == "day" || s == "daily" || isWeekday(s) }

var relations = []string{RelNearest, RelBefore, RelAfter}

func isRelation(s string) bool { return slices.Contains(relations, s) }

// anchorKind parses the event kind a date rule is anchored to: a kind with a
// few events a year or a month, or photoperiod. whole says that s is the
// whole rule, which the problem names: an unknown kind is then "unknown
// kind" without its name.
func anchorKind(s string, whole bool) (Kind, *RuleError) {
	k, err := ParseKind(s)
	if err != nil {
		ke, ok := err.(*KindError)
		if !ok {
			return Kind{}, &RuleError{Msg: err.Error()}
		}
		if ke.Msg == msgUnknownKind {
			// the kinds that pick dates are a few of all: the hint is the
			// rule nearRule finds, or the forms of a rule
			msg := fmt.Sprintf("unknown kind %q", ke.Value)
			if whole {
				msg = msgUnknownKind
			}
			return Kind{}, &RuleError{Msg: msg, Hint: dateRuleHint}
		}
		return Kind{}, &RuleError{Msg: fmt.Sprintf("kind %q: %s", ke.Value, ke.Msg), Hint: ke.Hint}
	}
	if !isAnchor(k) {
		return Kind{}, &RuleError{Msg: fmt.Sprintf("%q happens every day: it does not pick dates", k.String()),
			Hint: "use a kind with a few dates a year or a month (full-moon, june-solstice, photoperiod:12h…), or \"every day\""}
	}
	return k, nil
}

func isAnchor(k Kind) bool { return k.IsYearly() || k.Name == KindPhotoperiod }

// The kinds a date rule can be anchored to, and those a plan can start or
// end at: the names a misspelt one is compared with.
var (
	anchorNames  = kindNamesWhere(isAnchor)
	instantNames = kindNamesWhere(Kind.IsInstant)
)

func kindNamesWhere(keep func(Kind) bool) []string {
	var names []string
	for _, n := range KindNames {
		if keep(Kind{Name: n}) {
			names = append(names, n)
		}
	}
	return names
}

// nearRule returns the date rule that the words f of a rule that does not
// parse most likely mean: each misspelt word replaced by the word of its
// place it is nearest to ("saturdy nearest new-mon": "saturday nearest
// new-moon", "evry friday": "every friday", "fridy": "every friday"), and a
// kind written as two words joined ("full moon": "full-moon"). It returns ""
// when a word is near none, when no word was changed, or when the result
// does not parse either.
func nearRule(f []string) string {
	words := nearWords(f)
	if len(words) == 0 || slices.Contains(words, "") || slices.Equal(words, f) {
		return ""
	}
	if _, err := parseDateRule(words); err != nil {
		return ""
	}
	return strings.Join(words, " ")
}

// nearWords returns the words of a rule with each one that is not a word of
// its place replaced by the nearest that is, or "" when none is near.
func nearWords(f []string) []string {
	fix := func(w string, ok func(string) bool, near func(string) string) string {
		if ok(w) {
			return w
		}
		return near(w)
	}
	anchor := func(w string) string {
		return fix(w, func(w string) bool { _, err := ParseKind(w); return err == nil },
			func(w string) string { return nearKind(w, anchorNames) })
	}
	switch len(f) {
	case 1:
		if isDayWord(f[0]) || isDateLike(f[0]) {
			return nil // its own hint says what to write
		}
		if k := anchor(f[0]); k != "" {
			return []string{k}
		}
		if d := nearDay(f[0]); d != "" {
			return []string{"every", d}
		}
	case 2:
		if closest(f[0], []string{"every"}) == "" {
			return []string{anchor(f[0] + "-" + f[1])} // "full moon"
		}
		day := fix(f[1], func(w string) bool { _, err := parseDateRule([]string{"every", w}); return err == nil }, nearDay)
		return []string{"every", day}
	case 3:
		return []string{fix(f[0], isWeekday, nearWeekday), fix(f[1], isRelation, nearRelation), anchor(f[2])}
	case 4:
		return nearWords([]string{f[0], f[1], f[2] + "-" + f[3]}) // "saturday nearest full moon"
	}
	return nil
}

// nearWeekday is the weekday a misspelt name most likely means: the short or
// full name within a few edits ("satday": "saturday", "fridy": "friday"),
// or the full name it begins ("satur"); "" when none is near. Unlike the
// weekdays lists (nearName), a word is not taken for the weekday whose short
// name it begins with: in a date rule "sunset" is not "sunday".
func nearWeekday(w string) string {
	if near := closest(w, weekdayNames); near != "" {
		return near
	}
	return nearIn(w, weekdayFull)
}

// nearDay is what a misspelt word after "every" most likely means: "day"
// ("dayly"; "dya" is too far) or a weekday, or "".
func nearDay(w string) string {
	if closest(w, []string{"day", "daily"}) != "" {
		return "day"
	}
	return nearWeekday(w)
}

// nearRelation is the relation a misspelt one most likely means: the one
// within a few edits ("neerest", "befor") or the one it begins ("near",
// "aft"), or "".
func nearRelation(w string) string {
	return nearIn(w, relations)
}

// nearIn is the word of names within a few edits of w, or else the one w
// begins (three letters at least), or "".
func nearIn(w string, names []string) string {
	if near := closest(w, names); near != "" {
		return near
	}
	for _, n := range names {
		if len(w) >= 3 && strings.HasPrefix(n, w) {
			return n
		}
	}
	return ""
}

// TimeSpec is a parsed plan time (Plan.Start, Plan.End): a local clock time
// or an event with an offset.
type TimeSpec struct {
	IsClock bool
	Clock   time.Duration // since local midnight, when IsClock
	Event   Kind          // otherwise: the event whose time on the date is used
	Offset  time.Duration // added to the event's time
}

// clockDigitsHint says how to write a clock time written as its digits
// alone, "0530" or "930": `write it "05:30"`; hint for other text.
func clockDigitsHint(s, hint string) string {
	s = strings.TrimSpace(s)
	if m := twelveHour().FindStringSubmatch(strings.ToLower(s)); m != nil {
		h, _ := strconv.Atoi(m[1])
		mm := 0
		if m[2] != "" {
			mm, _ = strconv.Atoi(m[2])
		}
		if h >= 1 && h <= 12 {
			h %= 12 // 12 am is midnight, 12 pm noon
			if m[3][0] == 'p' {
				h += 12
			}
			return fmt.Sprintf(`the clock has 24 hours: write it "%02d:%02d"`, h, mm)
		}
	}
	if m := clockOtherMark().FindStringSubmatch(strings.ToLower(s)); m != nil { // 17.30, 17h30, 17:30:00
		if h, _ := strconv.Atoi(m[1]); h <= 23 {
			return fmt.Sprintf(`write it "%02d:%s"`, h, m[2]+m[3])
		}
	}
	n, err := strconv.Atoi(s)
	if err != nil || len(s) < 3 || len(s) > 4 || s[0] == '+' || s[0] == '-' || n/100 > 23 || n%100 > 59 {
		return hint
	}
	return fmt.Sprintf(`write it "%02d:%02d"`, n/100, n%100)
}

// clockOtherMark is a clock time of the 24-hour clock written with a dot,
// an h or a space between its hours and minutes ("17.30", "17h30", as in
// French, "17 30"), or with its seconds ("17:30:00").
var clockOtherMark = sync.OnceValue(func() *regexp.Regexp {
	return regexp.MustCompile(`^([0-9]{1,2})(?:[.h ]([0-5][0-9])|:([0-5][0-9]):[0-5][0-9])$`)
})

// twelveHour is a clock time of the 12-hour clock: "11:30 pm", "9pm",
// "8.15 p.m.".
var twelveHour = sync.OnceValue(func() *regexp.Regexp {
	return regexp.MustCompile(`^([0-9]{1,2})(?:[:.]([0-5][0-9]))? ?([ap])\.? ?m\.?$`)
})

const timeSpecHint = `an event with an optional offset, e.g. "sunset", "sunset+30m", "astronomical-dusk-15m", or a local time "20:00"`

// ParseTimeSpec reads a plan time: "20:00", or an instant kind with an
// optional offset within ±12h: "sunset", "sunset+30m",
// "astronomical-dawn-1h".
func ParseTimeSpec(s string) (TimeSpec, error) {
	ts, err := parseTimeSpec(strings.ToLower(strings.TrimSpace(s)), true)
	if err != nil {
		return TimeSpec{}, err
	}
	return ts, nil
}

// parseTimeSpec reads a plan time t (lower case, trimmed); with suggest, an
// unknown kind gets the plan time it likely means as the error's hint.
func parseTimeSpec(t string, suggest bool) (TimeSpec, *RuleError) {
	if t == "" {
		return TimeSpec{}, &RuleError{Msg: "is empty", Hint: timeSpecHint}
	}
	if t[0] >= '0' && t[0] <= '9' {
		c, err := ParseClock(t)
		if err != nil {
			if near := offsetInWords(t); suggest && near != "" { // "30m before sunrise"
				return TimeSpec{}, &RuleError{Msg: "malformed offset", Hint: didYouMean(near)}
			}
			return TimeSpec{}, &RuleError{Msg: "not a clock time", Hint: clockDigitsHint(t, `write HH:MM (00:00..23:59), e.g. "20:00"`)}
		}
		return TimeSpec{IsClock: true, Clock: c}, nil
	}
	// The offset is the longest tail "+<duration>" or "-<duration>" after
	// a kind name ("sun-altitude:-3-10m" is sun-altitude:-3, 10 min before);
	// when no prefix is a kind, the last such tail, so that the error names
	// the kind as written.
	name, offset := t, time.Duration(0)
	found := false
	for i := len(t) - 1; i > 0; i-- {
		if t[i] != '+' && t[i] != '-' {
			continue
		}
		if d, err := time.ParseDuration(t[i:]); err == nil {
			if _, kerr := ParseKind(t[:i]); kerr == nil {
				name, offset = t[:i], d
				break
			}
			if !found {
				name, offset, found = t[:i], d, true
			}
		}
	}
	k, err := ParseKind(name)
	if err != nil {
		hint := timeSpecHint
		if suggest {
			if near := nearTimeSpec(t, name); near != "" {
				hint = didYouMean(near)
			}
		}
		msg := fmt.Sprintf("unknown kind %q", name)
		if name == t {
			msg = "unknown kind" // the whole value, which the problem names
			if hasKindPrefix(strings.Join(strings.Fields(t), "")) {
				msg = "malformed offset" // "sunset + 30 min": the kind is known
			}
		}
		return TimeSpec{}, &RuleError{Msg: msg, Hint: hint}
	}
	if !k.IsInstant() {
		return TimeSpec{}, notInstant(k)
	}
	if offset < -MaxOffset || offset > MaxOffset {
		return TimeSpec{}, &RuleError{Msg: "offset must be within -12h..12h", Hint: `e.g. "sunset+30m"`}
	}
	return TimeSpec{Event: k, Offset: offset}, nil
}

// notInstant says why the kind k, known but no instant, cannot be a plan's
// start or end, and names every kind that can.
func notInstant(k Kind) *RuleError {
	why := "gives spans, not one instant"
	switch {
	case k.IsGroup():
		names := make([]string, 0, 4)
		for _, m := range k.Members() {
			names = append(names, m.Name)
		}
		why = "stands for several kinds: name one of them (" + strings.Join(names, ", ") + ")"
	case k.Name == KindPhotoperiod:
		why = "gives dates, not a time of day: as a date rule (date: " + k.String() + ") it picks the dates"
	case k.IsAllDay():
		why = "gives one all-day entry a date, not a time of day"
	case k.Name == KindSunAltitude:
		why = "is crossed twice a day, rising and setting, not once"
	}
	return &RuleError{Msg: fmt.Sprintf("%q %s", k.String(), why), Hint: instantHint}
}

// instantHint names what a plan's start and end can be: every instant
// kind, and a local time.
var instantHint = "a plan starts and ends at one of " + strings.Join(instantNames, ", ") +
	`, with an optional offset ("sunset+30m"), or at a local time "20:00"`

// nearTimeSpec returns the plan time that t, whose kind name is unknown,
// most likely means: the instant kind nearest to name with t's offset as
// written ("sunsett+30m": "sunset+30m"), or t without spaces ("sunset +
// 30m"); "" when neither is a plan time.
func nearTimeSpec(t, name string) string {
	joined := strings.Join(strings.Fields(t), "")
	near := []string{joined}
	if i := strings.LastIndexAny(joined, "+-"); i > 0 {
		// an offset in words: "sunset + 30 min" is "sunset+30m"
		if m := wordDuration().FindStringSubmatch(joined[i:]); m != nil {
			near = append(near, joined[:i]+m[1]+strings.ToLower(m[2][:1]))
		}
	}
	if !hasKindPrefix(name) {
		// "sunset-15" is a sunset with an offset short of its unit, not
		// a misspelt kind
		near = append(near, nearKind(name, instantNames)+t[len(name):])
	}
	for _, near := range near {
		if near != t {
			if _, err := parseTimeSpec(near, false); err == nil {
				return near
			}
		}
	}
	return ""
}

// offsetInWords returns the plan time that t (lower case, trimmed) means
// when it says its offset in words before the event: "30m before sunrise"
// is "sunrise-30m", "1 hour after sunset" "sunset+1h"; "" when t is no such
// thing or the event is no plan time.
func offsetInWords(t string) string {
	m := offsetWords().FindStringSubmatch(t)
	if m == nil {
		return ""
	}
	d := strings.Join(strings.Fields(m[1]), "")
	if w := wordDuration().FindStringSubmatch(d); w != nil {
		d = w[1] + strings.ToLower(w[2][:1])
	}
	if !isBareDuration(d) {
		return ""
	}
	sign := map[string]string{"before": "-", "after": "+"}[m[2]]
	near := strings.Join(strings.Fields(m[3]), "") + sign + d
	if _, err := parseTimeSpec(near, false); err != nil {
		return ""
	}
	return near
}

// offsetWords is a length, "before" or "after", and an event: "30m before
// sunrise", "1 hour after sunset".
var offsetWords = sync.OnceValue(func() *regexp.Regexp {
	return regexp.MustCompile(`^([0-9][0-9a-z. ]*?)\s*\b(before|after)\s+(\S.*)$`)
})

// hasKindPrefix reports whether name begins with a kind followed by "+" or
// "-".
func hasKindPrefix(name string) bool {
	for i := 1; i < len(name); i++ {
		if name[i] == '+' || name[i] == '-' {
			if _, err := ParseKind(name[:i]); err == nil {
				return true
			}
		}
	}
	return false
}

// IsInstant reports whether a kind gives at most one instant per event a
// plan can start or end at: not a span, a group, an all-day kind, lighting,
// or sun-altitude (which crosses twice a day).
func (k Kind) IsInstant() bool {
	switch {
	case k.IsSpan(), k.IsGroup(), k.IsAllDay(), k.Name == KindSunAltitude, k.Name == KindLighting:
		return false
	}
	_, ok := kindIndex[k.Name]
	return ok
}

// msgNeedsStart is the problem of a plan's end or length without a start;
// parse leaves it out when the start was written but could not be read.
const msgNeedsStart = "needs a start: a plan without start is all-day"

// spanLimit bounds min_duration and a plan's length.
const spanLimit = 24 * time.Hour

// checkAlarm checks an alarm at path: a feed's (override false), or a kinds
// entry's or a plan's that replaces it (override true: "0s" turns the
// feed's reminder off there, which the hint says); nil is no alarm given.
func checkAlarm(ps *problems, path string, a *Duration, override bool) {
	if a == nil { // none given: the feed's alarm holds
		return
	}
	if d := a.D(); d < 0 {
		hint := `e.g. "15m" for 15 minutes before`
		if override {
			hint += `, "0s" for no reminder`
		}
		ps.add(path, a.String(), "must not be negative: it is the time before each event", hint)
	} else if d > MaxAlarm {
		ps.add(path, a.String(), "must be at most 7 days, 168h", `e.g. "15m" or "1h"`)
	}
}

// foreignNames are the names of the days of the week and of the months in
// German, French, Spanish and Italian (and German's two-letter days, "Sa",
// "So") that differ from the English ones the keys take, each with the
// first of its list's English names ("sun" for a day, "jan" for a month)
// and then its own English name: "samstag" is "sunsat".
var foreignNames = func() map[string]string {
	m := map[string]string{}
	for first, lists := range map[string]map[string]string{"sun": {
		"sun": "sonntag so dimanche domingo domenica",
		"mon": "montag mo lundi lunes lunedì lunedi",
		"tue": "dienstag di mardi martes martedì martedi",
		"wed": "mittwoch mi mercredi miércoles miercoles mercoledì mercoledi",
		"thu": "donnerstag do jeudi jueves giovedì giovedi",
		"fri": "freitag fr vendredi viernes venerdì venerdi",
		"sat": "samstag sonnabend sa samedi sábado sabado sabato",
	}, "jan": {
		"jan": "januar jänner janvier enero gennaio",
		"feb": "februar février fevrier febrero febbraio",
		"mar": "märz maerz mars marzo",
		"apr": "avril abril aprile",
		"may": "mai mayo maggio",
		"jun": "juni juin junio giugno",
		"jul": "juli juillet julio luglio",
		"aug": "août aout agosto",
		"sep": "septembre septiembre settembre",
		"oct": "oktober octobre octubre ottobre",
		"nov": "novembre noviembre",
		"dec": "dezember décembre decembre diciembre dicembre",
	}} {
		for en, names := range lists {
			for _, n := range strings.Fields(names) {
				m[n] = first + en
			}
		}
	}
	return m
}()

func checkFilter(ps *problems, p string, weekdays, months, dates []string) {
	for _, l := range []struct {
		key, what, all      string
		values, names, full []string
		ok                  func(string) bool
	}{
		{"weekdays", "not a day of the week", "mon, tue, wed, thu, fri, sat or sun", weekdays, weekdayNames, weekdayFull,
			func(s string) bool { _, ok := ParseWeekday(s); return ok }},
		{"months", "not a month", "jan, feb, mar, apr, may, jun, jul, aug, sep, oct, nov or dec", months, monthNames, monthFull,
			func(s string) bool { _, ok := ParseMonth(s); return ok }},
	} {
		seen := make(map[string]int, len(l.values)) // the short name: its first index
		for i, v := range l.values {
			if l.ok(v) {
				// "sat" and "saturday" are one day, as dates are refused twice
				name := strings.ToLower(strings.TrimSpace(v))[:3]
				if j, ok := seen[name]; ok {
					ps.add(fmt.Sprintf("%s.%s[%d]", p, l.key, i), v, fmt.Sprintf("listed twice, also as %s.%s[%d]", p, l.key, j), "remove one")
				} else {
					seen[name] = i
				}
				continue
			}
			hint := l.all
			if near := nearName(strings.ToLower(strings.TrimSpace(v)), l.names, l.full); near != "" {
				hint = didYouMean(near) // "juli": "jul"
			} else if en, ok := foreignNames[strings.ToLower(strings.TrimSpace(v))]; ok && l.names[0] == en[:3] {
				hint = fmt.Sprintf("%s are named in English: write %q", l.key, en[3:]) // "Samstag": "sat"
			} else if m, err := strconv.Atoi(strings.TrimSpace(v)); err == nil && l.key == "months" {
				hint = monthNumberHint(int64(m), hint) // "8" for August
			}
			ps.add(fmt.Sprintf("%s.%s[%d]", p, l.key, i), v, l.what, hint)
		}
	}
	seen := make(map[int64]int, len(dates)) // day number: its first index
	for i, v := range dates {
		path := fmt.Sprintf("%s.dates[%d]", p, i)
		d, err := ParseListedDate(v)
		if err != nil {
			re := err.(*RuleError)
			ps.add(path, v, re.Msg, re.Hint)
			continue
		}
		if j, ok := seen[dayNumber(d)]; ok {
			ps.add(path, v, fmt.Sprintf("listed twice, also as %s.dates[%d]", p, j), "remove one")
			continue
		}
		seen[dayNumber(d)] = i
	}
}

// monthNumberHint says how to write month n, a number where a month's name
// belongs: `write the month's name: "aug"` for 8; hint for a number that is
// no month.
func monthNumberHint(n int64, hint string) string {
	if n < 1 || n > 12 {
		return hint
	}
	return fmt.Sprintf("write the month's name: %q", monthNames[n-1])
}

// nearName is the day or month name a misspelt one v (lower case) most
// likely means: the short name within a few edits ("juli": "jul"), else the
// full name whose short name v begins with ("wednesdy": "wednesday", the
// short names being the full ones' first three letters), else the full name
// within a few edits ("febuary": "february"); "" when none is near.
func nearName(v string, short, full []string) string {
	if near := closest(v, short); near != "" {
		return near
	}
	if len(v) > 3 {
		if i := slices.Index(short, v[:3]); i >= 0 {
			return full[i]
		}
	}
	return closest(v, full)
}

// validateOptions checks the per-entry options of a kinds entry: alarm,
// min_duration, weekdays, months, dates and the lighting options.
func (ks *KindSpec) validateOptions(ps *problems, p string) {
	checkAlarm(ps, p+".alarm", ks.Alarm, true)
	if md := ks.MinDuration.D(); md < 0 || md > spanLimit {
		ps.add(p+".min_duration", ks.MinDuration.String(), "must be within 0..24h", `e.g. "45m"`)
	} else if md != 0 && !ks.Kind.IsSpan() {
		ps.add(p+".min_duration", ks.MinDuration.String(), fmt.Sprintf("has no meaning for %s: its events have no length", ks.Kind.String()),
			"use it on dark-window, golden-hour, blue-hour, lighting or the eclipses")
	}
	checkFilter(ps, p, ks.Weekdays, ks.Months, ks.Dates)
	lighting := ks.Kind.Name == KindLighting
	instead := "lighting:16h" // for photoperiod:14h, lighting:14h: the same day length
	if ks.Kind.Name == KindPhotoperiod {
		instead = Kind{Name: KindLighting, DayLength: ks.Kind.DayLength}.String()
	}
	onlyLighting := func(key, v string) bool {
		if v != "" && !lighting {
			ps.add(p+"."+key, v, "applies only to lighting", fmt.Sprintf("remove it, or use kind: %q", instead))
			return false
		}
		return v != ""
	}
	if onlyLighting("lamps", ks.Lamps) && ks.Lamps != LampsEvening && ks.Lamps != LampsMorning && ks.Lamps != LampsBoth {
		ps.add(p+".lamps", ks.Lamps, "must be evening, morning or both",
			nearValue(ks.Lamps, []string{LampsEvening, LampsMorning, LampsBoth}, "when the lamps run: after sunset, before sunrise, or half of each"))
	}
	if onlyLighting("natural", ks.Natural) && ks.Natural != NaturalSunriseSunset && ks.Natural != NaturalCivil {
		hint := nearValue(ks.Natural, []string{NaturalSunriseSunset, NaturalCivil}, "what counts as natural light: the Sun up, or civil twilight too")
		if w := hyphenWords.Replace(strings.ToLower(strings.TrimSpace(ks.Natural))); w == "civil-twilight" || w == "twilight" {
			hint = didYouMean(NaturalCivil) // civil twilight counted as light
		}
		ps.add(p+".natural", ks.Natural, "must be sunrise-sunset or civil", hint)
	}
	for _, c := range []struct{ key, v string }{{"latest_off", ks.LatestOff}, {"earliest_on", ks.EarliestOn}} {
		if onlyLighting(c.key, c.v) {
			if _, err := ParseClock(c.v); err != nil {
				ps.add(p+"."+c.key, c.v, "not a clock time", clockDigitsHint(c.v, `write local time as HH:MM, e.g. "22:00"`))
			}
		}
	}
}

func (pl *Plan) validate(ps *problems, p string) {
	if strings.TrimSpace(pl.Title) == "" {
		ps.add(p+".title", "", msgRequired, `e.g. "Public stargazing night"`)
	}
	checkText(ps, p+".title", pl.Title, false, MaxTextLength)
	checkText(ps, p+".description", pl.Description, true, 4000)
	if strings.TrimSpace(pl.Date) == "" {
		ps.add(p+".date", "", msgRequired, dateRuleHint)
	} else if _, err := ParseDateRule(pl.Date); err != nil {
		re := err.(*RuleError)
		ps.add(p+".date", pl.Date, re.Msg, firstNonEmpty(re.Hint, dateRuleHint))
	}
	for _, t := range []struct{ key, v string }{{"start", pl.Start}, {"end", pl.End}} {
		if t.v == "" {
			continue
		}
		if _, err := ParseTimeSpec(t.v); err != nil {
			re := err.(*RuleError)
			ps.add(p+"."+t.key, t.v, re.Msg, firstNonEmpty(re.Hint, timeSpecHint))
		}
	}
	switch {
	case pl.Start == "" && (pl.End != "" || pl.For != 0):
		v, key := pl.End, "end"
		if pl.End == "" {
			v, key = pl.For.String(), "for"
		}
		ps.add(p+"."+key, v, msgNeedsStart, `add e.g. start: "20:00", or remove it`)
	case pl.End != "" && pl.For != 0:
		ps.add(p+".for", pl.For.String(), "give either end or for, not both", "remove one")
	case pl.For < 0 || pl.For > Duration(spanLimit):
		ps.add(p+".for", pl.For.String(), "must be within 0..24h", `e.g. "3h"`)
	}
	// two clock times: an end not after the start is on the next day only
	// before 12:00 (an end past midnight); one at or after 12:00 would leave
	// the plan no time on any date
	if start, err := ParseTimeSpec(pl.Start); err == nil && start.IsClock {
		if end, err := ParseTimeSpec(pl.End); err == nil && end.IsClock && end.Clock <= start.Clock && end.Clock >= 12*time.Hour {
			ps.add(p+".end", pl.End, fmt.Sprintf("is not after the start %q and not before 12:00: the plan would never have a time", pl.Start),
				`give an end after the start, one before 12:00 for an end past midnight ("01:00"), or a length: for: 2h`)
		}
	}
	checkFilter(ps, p, pl.Weekdays, pl.Months, nil)
	checkAlarm(ps, p+".alarm", pl.Alarm, true)
}

func firstNonEmpty(a, b string) string {
	if a != "" {
		return a
	}
	return b
}
