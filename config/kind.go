package config

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
	"time"
	"unicode"
)

// Kind is one event kind of the configuration vocabulary, parsed from its
// written form: "sunrise", "sun-altitude:-3.5", "photoperiod:12h30m".
type Kind struct {
	// Name is the base name, e.g. "sunrise", "sun-altitude", "photoperiod".
	Name string
	// Altitude is the threshold in degrees for "sun-altitude:<deg>", and
	// the lower bound of "sun-band:<low>..<high>".
	Altitude float64
	// High is the upper bound in degrees of "sun-band:<low>..<high>".
	High float64
	// DayLength is the threshold for "photoperiod:<duration>" and the
	// target for "lighting:<duration>".
	DayLength time.Duration
}

// Kind base names that take a parameter after a colon.
const (
	// KindSunAltitude is written "sun-altitude:<deg>": the instants the Sun's
	// centre crosses the altitude <deg> (−90 < deg < 90), rising and setting.
	KindSunAltitude = "sun-altitude"
	// KindPhotoperiod is written "photoperiod:<duration>": the dates on which
	// the day length (sunrise to sunset) crosses <duration> (0 < d < 24h),
	// rising or falling.
	KindPhotoperiod = "photoperiod"
	// KindLighting is written "lighting:<duration>": on each date whose
	// natural day is shorter than the target photoperiod <duration>
	// (0 < d < 24h), the lamp periods that make up the difference.
	KindLighting = "lighting"
	// KindSunBand is written "sun-band:<low>..<high>": spans while the Sun's
	// centre is between the altitudes low and high (−90 < low < high < 90),
	// morning and evening, like golden hour between any two altitudes.
	KindSunBand = "sun-band"
)

// Kind families, returned by Kind.Family.
const (
	FamilySun      = "sun"      // sunrise, sunset, solar noon, custom altitude, photoperiod, daily summary
	FamilyTwilight = "twilight" // civil, nautical, astronomical twilight, golden and blue hour
	FamilyYear     = "year"     // equinoxes, solstices, cross-quarter days, perihelion, aphelion
	FamilyMoon     = "moon"     // phases, moonrise, moonset, transit, dark-sky windows
	FamilyEclipse  = "eclipse"  // solar and lunar eclipses seen from the site
)

type kindFlags uint8

const (
	flagSpan   kindFlags = 1 << iota // an interval with a start and an end
	flagMoon                         // needs the Moon's position
	flagYearly                       // a few instants a year or a month, not one per day
	flagParam                        // written with ":<parameter>"
)

type kindDef struct {
	name    string
	family  string
	flags   kindFlags
	members []string // for group kinds: the kinds they stand for
	doc     string
}

// kindTable is the whole vocabulary, in the order of KindNames.
var kindTable = []kindDef{
	{name: "sunrise", family: FamilySun, doc: "upper limb of the Sun on the horizon in the morning (standard refraction)"},
	{name: "sunset", family: FamilySun, doc: "upper limb of the Sun on the horizon in the evening"},
	{name: "solar-noon", family: FamilySun, doc: "the Sun crosses the meridian, its highest point of the day"},
	{name: "sun-hidden", family: FamilySun, flags: flagSpan, doc: "spans between sunrise and sunset while the Sun is hidden behind the site's skyline (a peak, a building); needs a skyline"},
	{name: "noon-clear", family: FamilySun, flags: flagYearly, doc: "the dates from which the noon Sun clears the site's skyline again, and from which it stays behind it (a valley in winter); needs a skyline"},
	{name: "civil-dawn", family: FamilyTwilight, doc: "start of morning civil twilight (Sun 6° below the horizon)"},
	{name: "civil-dusk", family: FamilyTwilight, doc: "end of evening civil twilight (Sun 6° below the horizon)"},
	{name: "nautical-dawn", family: FamilyTwilight, doc: "start of morning nautical twilight (Sun 12° below the horizon)"},
	{name: "nautical-dusk", family: FamilyTwilight, doc: "end of evening nautical twilight (Sun 12° below the horizon)"},
	{name: "astronomical-dawn", family: FamilyTwilight, doc: "start of morning astronomical twilight (Sun 18° below the horizon)"},
	{name: "astronomical-dusk", family: FamilyTwilight, doc: "end of evening astronomical twilight (Sun 18° below the horizon)"},
	{name: "golden-hour", family: FamilyTwilight, flags: flagSpan, doc: "spans, morning and evening, while the Sun is between −4° and 6° altitude"},
	{name: "blue-hour", family: FamilyTwilight, flags: flagSpan, doc: "spans, morning and evening, while the Sun is between −6° and −4° altitude"},
	{name: KindSunBand, family: FamilySun, flags: flagParam | flagSpan, doc: "spans, morning and evening, while the Sun's centre is between <low> and <high> degrees of altitude, e.g. sun-band:20..35"},
	{name: KindSunAltitude, family: FamilySun, flags: flagParam, doc: "the Sun's centre crosses <deg> degrees of altitude, rising and setting (−90 < deg < 90)"},
	{name: "march-equinox", family: FamilyYear, flags: flagYearly, doc: "apparent solar longitude 0°"},
	{name: "june-solstice", family: FamilyYear, flags: flagYearly, doc: "apparent solar longitude 90°"},
	{name: "september-equinox", family: FamilyYear, flags: flagYearly, doc: "apparent solar longitude 180°"},
	{name: "december-solstice", family: FamilyYear, flags: flagYearly, doc: "apparent solar longitude 270°"},
	{name: "seasons", family: FamilyYear, flags: flagYearly, members: []string{"march-equinox", "june-solstice", "september-equinox", "december-solstice"}, doc: "the two equinoxes and the two solstices"},
	{name: "cross-quarter", family: FamilyYear, flags: flagYearly, doc: "the four instants at apparent solar longitude 45°, 135°, 225° and 315°, halfway between equinoxes and solstices"},
	{name: "perihelion", family: FamilyYear, flags: flagYearly, doc: "the Earth at its least distance from the Sun"},
	{name: "aphelion", family: FamilyYear, flags: flagYearly, doc: "the Earth at its greatest distance from the Sun"},
	{name: KindPhotoperiod, family: FamilySun, flags: flagParam, doc: "the dates on which day length crosses <duration>, rising or falling (0 < duration < 24h)"},
	{name: KindLighting, family: FamilySun, flags: flagParam | flagSpan, doc: "supplemental lighting: the lamp periods that bring a short natural day up to <duration> (0 < duration < 24h)"},
	{name: "daily-summary", family: FamilySun, doc: "an all-day entry per day: sunrise–sunset, day length, twilight"},
	{name: "new-moon", family: FamilyMoon, flags: flagMoon | flagYearly, doc: "apparent geocentric longitude of the Moon equals the Sun's"},
	{name: "first-quarter", family: FamilyMoon, flags: flagMoon | flagYearly, doc: "Moon 90° east of the Sun"},
	{name: "full-moon", family: FamilyMoon, flags: flagMoon | flagYearly, doc: "Moon opposite the Sun"},
	{name: "last-quarter", family: FamilyMoon, flags: flagMoon | flagYearly, doc: "Moon 90° west of the Sun"},
	{name: "moon-phases", family: FamilyMoon, flags: flagMoon | flagYearly, members: []string{"new-moon", "first-quarter", "full-moon", "last-quarter"}, doc: "the four principal phases"},
	{name: "moonrise", family: FamilyMoon, flags: flagMoon, doc: "upper limb of the Moon on the horizon, rising"},
	{name: "moonset", family: FamilyMoon, flags: flagMoon, doc: "upper limb of the Moon on the horizon, setting"},
	{name: "moon-transit", family: FamilyMoon, flags: flagMoon, doc: "the Moon crosses the meridian"},
	{name: "dark-window", family: FamilyMoon, flags: flagMoon | flagSpan, doc: "spans of astronomical night with the Moon below the horizon (or lit less than max_illumination)"},
	{name: "solar-eclipse", family: FamilyEclipse, flags: flagMoon | flagSpan | flagYearly, doc: "solar eclipses seen from the site, first to last contact, with type, magnitude and obscuration there"},
	{name: "lunar-eclipse", family: FamilyEclipse, flags: flagMoon | flagSpan | flagYearly, doc: "lunar eclipses with the Moon above the site's horizon for any part, first to last penumbral contact"},
}

var kindIndex = func() map[string]*kindDef {
	m := make(map[string]*kindDef, len(kindTable))
	for i := range kindTable {
		m[kindTable[i].name] = &kindTable[i]
	}
	return m
}()

// KindNames lists every kind base name of the configuration file, in the
// order the documentation gives them. "sun-altitude" and "photoperiod" are
// written with a parameter ("sun-altitude:-3.5", "photoperiod:12h30m"); the
// others stand alone. "seasons" and "moon-phases" are groups (see
// Kind.Members). KindExamples holds one parseable written form per name.
var KindNames = func() []string {
	names := make([]string, len(kindTable))
	for i, d := range kindTable {
		names[i] = d.name
	}
	return names
}()

// KindExamples holds one valid written form for each entry of KindNames, in
// the same order: the name itself, or the name with an example parameter.
var KindExamples = func() []string {
	ex := make([]string, len(kindTable))
	for i, d := range kindTable {
		switch d.name {
		case KindSunAltitude:
			ex[i] = "sun-altitude:-3.5"
		case KindPhotoperiod:
			ex[i] = "photoperiod:12h30m"
		case KindLighting:
			ex[i] = "lighting:16h"
		case KindSunBand:
			ex[i] = "sun-band:20..35"
		default:
			ex[i] = d.name
		}
	}
	return ex
}()

// KindDoc returns the one-line description of a kind base name, or "" when
// the name is unknown.
func KindDoc(name string) string {
	if d, ok := kindIndex[name]; ok {
		return d.doc
	}
	return ""
}

// KindError reports a kind that cannot be parsed.
type KindError struct {
	Value string // the text as written
	Msg   string // what is wrong
	Hint  string // a suggestion, may be empty
}

const msgUnknownKind = "unknown kind"

func (e *KindError) Error() string {
	s := fmt.Sprintf("kind %q: %s", e.Value, e.Msg)
	if e.Msg == msgUnknownKind {
		s = fmt.Sprintf("%s %q", e.Msg, e.Value)
	}
	if e.Hint != "" {
		s += " (" + e.Hint + ")"
	}
	return s
}

// kindWords are the kinds meant by a word that names none: a family of
// kinds by the name of what they bound ("civil-twilight": its dawn and its
// dusk) or a kind by its everyday name ("noon", "summary"). The keys are
// written in lower case with hyphens between words.
var kindWords = map[string][]string{
	"twilight":              {"civil-dawn", "civil-dusk"},
	"civil-twilight":        {"civil-dawn", "civil-dusk"},
	"nautical-twilight":     {"nautical-dawn", "nautical-dusk"},
	"astronomical-twilight": {"astronomical-dawn", "astronomical-dusk"},
	"dawn":                  {"civil-dawn", "nautical-dawn", "astronomical-dawn"},
	"dusk":                  {"civil-dusk", "nautical-dusk", "astronomical-dusk"},
	"first-light":           {"civil-dawn"},
	"last-light":            {"civil-dusk"},
	"noon":                  {"solar-noon"},
	"midday":                {"solar-noon"},
	"summary":               {"daily-summary"},
	"daylight":              {"daily-summary"},
	"day-length":            {"daily-summary"},
	"daylength":             {"daily-summary"},
	"sunrise-sunset":        {"sunrise", "sunset"},
	"eclipse":               {"solar-eclipse", "lunar-eclipse"},
	"eclipses":              {"solar-eclipse", "lunar-eclipse"},
	"equinox":               {"march-equinox", "september-equinox"},
	"equinoxes":             {"march-equinox", "september-equinox"},
	"solstice":              {"june-solstice", "december-solstice"},
	"solstices":             {"june-solstice", "december-solstice"},
	"phases":                {"moon-phases"},
	"dark-sky":              {"dark-window"},
	"darkness":              {"dark-window"},
}

// hyphenWords writes the words of a text with hyphens between them, as
// kindWords's keys are written ("civil twilight", "civil_twilight":
// "civil-twilight").
var hyphenWords = strings.NewReplacer(" ", "-", "_", "-")

// kindWordHint is the hint naming the kinds a word means: the one it likely
// means (`did you mean "solar-noon"?`), or the family's (`its kinds are
// "civil-dawn" and "civil-dusk"`).
func kindWordHint(kinds []string) string {
	if len(kinds) == 1 {
		return didYouMean(kinds[0])
	}
	q := make([]string, len(kinds))
	for i, k := range kinds {
		q[i] = strconv.Quote(k)
	}
	return fmt.Sprintf("its kinds are %s and %s", strings.Join(q[:len(q)-1], ", "), q[len(q)-1])
}

// severalKinds is each kind of text, several kinds written as one
// ("sunrise, sunset", "sunrise sunset"), in quotes; nil when text is not
// two kinds or more.
func severalKinds(text string) []string {
	parts := strings.FieldsFunc(text, func(r rune) bool { return r == ',' || r == ';' || unicode.IsSpace(r) })
	if len(parts) < 2 {
		return nil
	}
	for i, p := range parts {
		if _, ok := kindIndex[p]; !ok {
			return nil
		}
		parts[i] = strconv.Quote(p)
	}
	return parts
}

// ParseKind parses the written form of a kind: a name from KindNames, or
// "sun-altitude:<deg>" (−90 < deg < 90) or "photoperiod:<duration>"
// (0 < duration < 24h, Go duration syntax such as "14h30m"). Case and
// surrounding spaces are ignored. ParseKind(k.String()) == k for every kind
// it returns.
func ParseKind(s string) (Kind, error) {
	text := strings.ToLower(strings.TrimSpace(s))
	base, param, hasParam := strings.Cut(text, ":")
	base = strings.TrimSpace(base)
	param = strings.TrimSpace(param)
	d, ok := kindIndex[base]
	if !ok {
		msg, hint := msgUnknownKind, "known kinds: "+strings.Join(KindNames, ", ")
		if text == "" { // `kind: ""`, `kinds: [""]`: no value to name
			msg = "is empty: name a kind"
		} else if kinds := severalKinds(text); kinds != nil {
			msg, hint = fmt.Sprintf("%d kinds in one entry", len(kinds)), "write each as an entry of its own: "+strings.Join(kinds, ", ")
		} else if kinds := kindWords[hyphenWords.Replace(text)]; kinds != nil {
			hint = kindWordHint(kinds)
		} else if near := nearKind(text, KindNames); near != "" {
			hint = didYouMean(near)
		}
		return Kind{}, &KindError{Value: s, Msg: msg, Hint: hint}
	}
	if d.flags&flagParam == 0 {
		if hasParam {
			return Kind{}, &KindError{Value: s, Msg: "takes no parameter", Hint: fmt.Sprintf("write %q", d.name)}
		}
		return Kind{Name: d.name}, nil
	}
	switch d.name {
	case KindSunAltitude:
		if param == "" {
			return Kind{}, &KindError{Value: s, Msg: "needs an altitude in degrees", Hint: `e.g. "sun-altitude:-3.5"`}
		}
		deg, err := strconv.ParseFloat(param, 64)
		if err != nil || math.IsNaN(deg) || math.IsInf(deg, 0) {
			hint := `write degrees as a decimal number, e.g. "sun-altitude:-3.5"`
			if num, unit, _, err := numberAndUnit(param); err == nil && slices.Contains(numberUnits["low"], unit) {
				hint = didYouMean(KindSunAltitude + ":" + num) // sun-altitude:30°
			}
			return Kind{}, &KindError{Value: s, Msg: "malformed altitude", Hint: hint}
		}
		if !(deg > -90 && deg < 90) {
			return Kind{}, &KindError{Value: s, Msg: "altitude must be above -90 and below 90", Hint: "civil twilight is -6, the horizon 0"}
		}
		return Kind{Name: KindSunAltitude, Altitude: deg}, nil
	case KindSunBand:
		const hint = `write two altitudes in degrees, low first, e.g. "sun-band:20..35" or "sun-band:-4..6"`
		a, b, ok := strings.Cut(param, "..")
		if !ok {
			return Kind{}, &KindError{Value: s, Msg: "needs two altitudes, low..high", Hint: hint}
		}
		lo, err1 := strconv.ParseFloat(strings.TrimSpace(a), 64)
		hi, err2 := strconv.ParseFloat(strings.TrimSpace(b), 64)
		if err1 != nil || err2 != nil || math.IsNaN(lo) || math.IsNaN(hi) || math.IsInf(lo, 0) || math.IsInf(hi, 0) {
			return Kind{}, &KindError{Value: s, Msg: "malformed altitudes", Hint: hint}
		}
		if !(lo > -90 && hi < 90) {
			return Kind{}, &KindError{Value: s, Msg: "altitudes must be above -90 and below 90", Hint: hint}
		}
		if !(lo < hi) {
			h := hint
			if lo > hi { // sun-band:35..20: the two the other way round
				h = didYouMean(fmt.Sprintf("%s:%s..%s", KindSunBand, strings.TrimSpace(b), strings.TrimSpace(a)))
			}
			return Kind{}, &KindError{Value: s, Msg: "the low altitude must be below the high one", Hint: h}
		}
		return Kind{Name: KindSunBand, Altitude: lo, High: hi}, nil
	default: // KindPhotoperiod, KindLighting
		if param == "" {
			return Kind{}, &KindError{Value: s, Msg: "needs a day length", Hint: fmt.Sprintf(`e.g. "%s:12h" or "%s:14h30m"`, d.name, d.name)}
		}
		dur, err := time.ParseDuration(param)
		if err != nil {
			hint := fmt.Sprintf(`write hours and minutes with units, e.g. "%s:14h30m"`, d.name)
			joined := strings.Join(strings.Fields(param), "")             // "16 h"
			if m := wordDuration().FindStringSubmatch(joined); m != nil { // "16 hours"
				joined = m[1] + strings.ToLower(m[2][:1])
			}
			if near := d.name + ":" + joined; near != text {
				if _, err := ParseKind(near); err == nil {
					hint = didYouMean(near)
				}
			}
			return Kind{}, &KindError{Value: s, Msg: "malformed day length", Hint: hint}
		}
		if !(dur > 0 && dur < 24*time.Hour) {
			return Kind{}, &KindError{Value: s, Msg: "day length must be longer than 0 and shorter than 24h", Hint: fmt.Sprintf(`e.g. "%s:12h"`, d.name)}
		}
		return Kind{Name: d.name, DayLength: dur}, nil
	}
}

// nearKind returns the written kind that text (lower case, trimmed), an
// unknown kind, most likely means: the name among names nearest to its base
// name, with text's parameter or, when it has none, the kind's example
// ("photoperod:12h": "photoperiod:12h", "photoperod": "photoperiod:12h30m"),
// or the kind whose colon is missing, with its parameter ("lighting 14h":
// "lighting:14h"); "" when no name is near.
func nearKind(text string, names []string) string {
	base, param, hasParam := strings.Cut(text, ":")
	if !hasParam {
		if near := kindWithParam(text, names); near != "" {
			return near
		}
	}
	param = strings.TrimSpace(param)
	near := closest(strings.TrimSpace(base), names)
	if near == "" || kindIndex[near].flags&flagParam == 0 {
		return near
	}
	if hasParam && param != "" {
		return near + ":" + param
	}
	return exampleFor(near)
}

// kindWithParam is the written kind that text (lower case, trimmed) means
// when it is a kind with a parameter whose colon is missing: the name, or a
// misspelt one, run into its parameter or parted from it by a space, "=",
// "-" or "_" ("lighting 14h", "lighting14h", "photoperiod=12h",
// "sun-altitude -3", "sun-band 2..12"). It is the name among names, a colon
// and the parameter as written, when that parses; "" otherwise, so that a
// misspelt kind never gets another kind's example parameter in place of
// its own.
func kindWithParam(text string, names []string) string {
	try := func(name, rest string) string {
		if d, ok := kindIndex[name]; !ok || d.flags&flagParam == 0 {
			return ""
		}
		rest = strings.TrimLeft(rest, " \t=_")
		for _, p := range []string{rest, strings.TrimPrefix(rest, "-")} {
			if p == "" {
				continue
			}
			if _, err := ParseKind(name + ":" + p); err == nil {
				return name + ":" + p
			}
		}
		return ""
	}
	for _, name := range names {
		if rest, ok := strings.CutPrefix(text, name); ok {
			if near := try(name, rest); near != "" {
				return near
			}
		}
	}
	if i := strings.IndexAny(text, " \t="); i > 0 { // "lightning 14h"
		if near := closest(text[:i], names); near != "" {
			return try(near, text[i:])
		}
	}
	return ""
}

func exampleFor(name string) string {
	for i, n := range KindNames {
		if n == name {
			return KindExamples[i]
		}
	}
	return name
}

// String returns the written form: "sunrise", "sun-altitude:-3.5",
// "photoperiod:14h30m". The zero Kind gives "".
func (k Kind) String() string {
	switch k.Name {
	case KindSunAltitude:
		return KindSunAltitude + ":" + strconv.FormatFloat(k.Altitude, 'f', -1, 64)
	case KindSunBand:
		return KindSunBand + ":" + strconv.FormatFloat(k.Altitude, 'f', -1, 64) + ".." + strconv.FormatFloat(k.High, 'f', -1, 64)
	case KindPhotoperiod, KindLighting:
		return k.Name + ":" + ShortDuration(k.DayLength)
	}
	return k.Name
}

// ShortDuration writes d like time.Duration.String without the zero tails:
// 12h, 14h30m, 12h0m30s. The result parses back to d exactly.
func ShortDuration(d time.Duration) string {
	s := d.String()
	if strings.HasSuffix(s, "m0s") {
		s = strings.TrimSuffix(s, "0s")
	}
	if strings.HasSuffix(s, "h0m") {
		s = strings.TrimSuffix(s, "0m")
	}
	return s
}

// UnmarshalText parses the written form (see ParseKind).
func (k *Kind) UnmarshalText(b []byte) error {
	p, err := ParseKind(string(b))
	if err != nil {
		return err
	}
	*k = p
	return nil
}

// MarshalText writes the written form (see Kind.String).
func (k Kind) MarshalText() ([]byte, error) {
	return []byte(k.String()), nil
}

// IsZero reports whether k is the zero Kind (no kind given).
func (k Kind) IsZero() bool { return k == Kind{} }

// Family returns the group a kind belongs to: FamilySun, FamilyTwilight,
// FamilyYear, FamilyMoon or FamilyEclipse ("" for an unknown name).
func (k Kind) Family() string {
	if d, ok := kindIndex[k.Name]; ok {
		return d.family
	}
	return ""
}

func (k Kind) has(f kindFlags) bool {
	d, ok := kindIndex[k.Name]
	return ok && d.flags&f != 0
}

// IsSpan reports whether the kind's events are intervals with a start and an
// end (golden-hour, blue-hour, dark-window, eclipses) rather than instants.
func (k Kind) IsSpan() bool { return k.has(flagSpan) }

// IsMoon reports whether computing the kind needs the Moon's position
// (phases, moonrise, moonset, moon-transit, dark-window, eclipses).
func (k Kind) IsMoon() bool { return k.has(flagMoon) }

// IsYearly reports whether the kind has a few events a year or a month
// (equinoxes, solstices, cross-quarter days, apsides, moon phases, eclipses)
// rather than events computed day by day.
func (k Kind) IsYearly() bool { return k.has(flagYearly) }

// IsAllDay reports whether the kind's events are all-day entries by nature
// (daily-summary and photoperiod: they name a date, not an instant).
func (k Kind) IsAllDay() bool {
	return k.Name == "daily-summary" || k.Name == KindPhotoperiod
}

// IsGroup reports whether the kind stands for several kinds (seasons,
// moon-phases).
func (k Kind) IsGroup() bool {
	d, ok := kindIndex[k.Name]
	return ok && len(d.members) > 0
}

// Members returns the kinds a group stands for ("seasons" gives the two
// equinoxes and the two solstices, "moon-phases" the four phases), or k alone
// for any other kind.
func (k Kind) Members() []Kind {
	d, ok := kindIndex[k.Name]
	if !ok || len(d.members) == 0 {
		return []Kind{k}
	}
	out := make([]Kind, len(d.members))
	for i, m := range d.members {
		out[i] = Kind{Name: m}
	}
	return out
}
