package feed

import (
	"context"
	"regexp"
	"slices"
	"strings"
	"testing"
	"time"

	"heliocal/config"
)

// templateOf reduces a description to its wording: numbers, clock times,
// the site and the kind's own name are taken out, so two kinds that only
// fill in different values of one text reduce to the same template.
func templateOf(e Event, desc string) string {
	desc = strings.ReplaceAll(desc, plainNames[e.Kind.Name], "<kind>")
	desc = strings.ReplaceAll(desc, strings.ToLower(plainNames[e.Kind.Name]), "<kind>")
	return regexp.MustCompile(`[−+-]?[0-9][0-9.,:]*`).ReplaceAllString(desc, "#")
}

// Every kind has its own text as a reader sees it, the entry's description
// with what its kind means (written once in the calendar's description,
// kindMeanings): no two kinds share a template by accident (the blue hour
// once read as the golden hour's warm light with a warning not to look at
// the Sun), and each says what is true of it.
func TestDescriptionsOwnPerKind(t *testing.T) {
	site := &config.Site{ID: "orchard", Name: "Test Orchard", Latitude: 48.2, Longitude: 16.4, TimeZone: zone(t, "Europe/Vienna")}
	first, last := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC), time.Date(2027, 12, 31, 0, 0, 0, 0, time.UTC)
	sky, err := NewSky(first, last)
	if err != nil {
		t.Fatal(err)
	}
	var kinds []config.Kind
	for _, name := range append(config.KindNames, "sun-altitude:10", "photoperiod:12h") {
		k, err := config.ParseKind(name)
		if err != nil || k.IsGroup() || k.Name == "daily-summary" || k.Name == config.KindLighting ||
			(k.Name == "sun-altitude" && k.Altitude == 0) || (k.Name == "photoperiod" && k.DayLength == 0) {
			continue
		}
		kinds = append(kinds, k)
	}
	events, _, err := sky.Events(context.Background(), PlaceOf(site), kinds, first, last)
	if err != nil {
		t.Fatal(err)
	}
	info := newSiteInfo(site)
	seen := map[string]string{} // template → kind
	described := map[string]string{}
	for _, e := range events {
		name := e.Kind.Name
		if _, done := described[name]; done {
			continue
		}
		_, _, desc := describe(info, e)
		if m := kindMeanings(site, []config.KindSpec{{Kind: e.Kind}}); len(m) > 0 {
			desc += "\n" + strings.Join(m, "\n")
		}
		described[name] = desc
		tpl := templateOf(e, desc)
		if other, dup := seen[tpl]; dup {
			t.Errorf("%s and %s share one description template:\n%s", other, name, tpl)
		}
		seen[tpl] = name
	}
	for _, k := range kinds {
		if _, ok := described[k.Name]; !ok && k.Name != "solar-eclipse" && k.Name != "lunar-eclipse" && k.Name != "sun-hidden" && k.Name != "noon-clear" { // sun-hidden: needs a skyline (TestSkylineSite)
			t.Errorf("no %s event in 2027 at 48.2° N to describe", k.Name)
		}
	}

	// What each text must (and must not) say. Sources: the twilight and
	// photographic definitions are common practice; the caution on the eyes
	// applies only while the Sun can be in view.
	for name, c := range map[string]struct{ has, hasNot []string }{
		"blue-hour":         {has: []string{"between −6° and −4°", "no direct sunlight", "blue", " min)"}, hasNot: []string{"warm", cautionEyes, "(0 h"}},
		"golden-hour":       {has: []string{"warm", cautionEyes}},
		"sunrise":           {has: []string{"appears", "from the day before", " min "}, hasNot: []string{"disappears", " m "}},
		"sunset":            {has: []string{"disappears"}},
		"moonrise":          {has: []string{"appears"}},
		"moonset":           {has: []string{"disappears"}},
		"sun-altitude":      {has: []string{"rising through 10.0°", cautionEyes}},
		"photoperiod":       {has: []string{"sunrise to sunset"}, hasNot: []string{"on the day before"}},
		"cross-quarter":     {has: []string{"midpoints"}, hasNot: []string{"quarter points"}},
		"astronomical-dusk": {hasNot: []string{"fully dark"}},
		"full-moon":         {hasNot: []string{"up all night"}},
		"civil-dawn":        {hasNot: []string{cautionEyes}},
		"dark-window":       {hasNot: []string{cautionEyes}},
	} {
		d, ok := described[name]
		if !ok {
			continue // reported above
		}
		for _, w := range c.has {
			if !strings.Contains(d, w) {
				t.Errorf("%s: description lacks %q:\n%s", name, w, d)
			}
		}
		for _, w := range c.hasNot {
			if strings.Contains(d, w) {
				t.Errorf("%s: description says %q:\n%s", name, w, d)
			}
		}
	}
}

// Directions read the same in the calendar text as in JSON, CSV and the
// table: the Sun rising or setting through an altitude, day length rising
// or falling through a duration.
func TestDirectionWords(t *testing.T) {
	site := &config.Site{ID: "orchard", Name: "Test Orchard", Latitude: 48.2, Longitude: 16.4, TimeZone: zone(t, "Europe/Vienna")}
	first, last := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC), time.Date(2027, 12, 31, 0, 0, 0, 0, time.UTC)
	sky, err := NewSky(first, last)
	if err != nil {
		t.Fatal(err)
	}
	alt, _ := config.ParseKind("sun-altitude:-3")
	pp, _ := config.ParseKind("photoperiod:12h")
	events, _, err := sky.Events(context.Background(), PlaceOf(site), []config.Kind{alt, pp}, first, last)
	if err != nil {
		t.Fatal(err)
	}
	words := map[string]bool{}
	for _, e := range events {
		w := DirectionWord(e)
		words[e.Kind.Name+" "+w] = true
		title, _, desc := describe(newSiteInfo(site), e)
		if !strings.Contains(title, w) || !strings.Contains(desc, w) {
			t.Errorf("%s %s: the text does not say %q: %s / %s", e.Kind, e.Start, w, title, desc)
		}
	}
	for _, want := range []string{"sun-altitude rising", "sun-altitude setting", "photoperiod rising", "photoperiod falling"} {
		if !words[want] {
			t.Errorf("no %s event", want)
		}
	}
}

func zone(t *testing.T, name string) config.Zone {
	t.Helper()
	var z config.Zone
	if err := z.UnmarshalText([]byte(name)); err != nil {
		t.Fatal(err)
	}
	return z
}

func TestDurationWords(t *testing.T) {
	for d, want := range map[time.Duration]string{48 * time.Minute: "48 min", 9*time.Hour + 5*time.Minute: "9 h 05 min", 0: "0 min",
		19 * time.Second: "under 1 min", 29*time.Second + 999*time.Millisecond: "under 1 min", 30 * time.Second: "1 min"} {
		if got := hm(d); got != want {
			t.Errorf("hm(%v) = %q, want %q", d, got, want)
		}
	}
	// a span (a dark window, a golden hour) of a few seconds is not "0 min";
	// near a day and beyond, the days are counted as before
	for d, want := range map[time.Duration]string{19 * time.Second: "under 1 min", 2*time.Hour + 16*time.Minute: "2 h 16 min",
		23*time.Hour + 59*time.Minute + 29*time.Second: "23 h 59 min", 23*time.Hour + 59*time.Minute + 30*time.Second: "1 day",
		72 * time.Hour: "3 days", 48*time.Hour + 30*time.Minute: "2 days 30 min",
		83*24*time.Hour + 23*time.Hour + 9*time.Minute: "83 days 23 h 09 min"} {
		if got := SpanLength(d); got != want {
			t.Errorf("SpanLength(%v) = %q, want %q", d, got, want)
		}
	}
	for d, want := range map[time.Duration]string{
		14*time.Hour + 2*time.Minute: "14 h 02 min", 14*time.Hour + 2*time.Minute + 29*time.Second: "14 h 02 min",
		14*time.Hour + 2*time.Minute + 30*time.Second: "14 h 03 min", 12 * time.Hour: "12 h",
	} {
		if got := Length(d, time.Minute); got != want {
			t.Errorf("Length(%v, min) = %q, want %q", d, got, want)
		}
	}
	// an amount from the configuration is written exactly, in the same
	// units, its zero units at the end left out
	for d, want := range map[time.Duration]string{
		time.Hour: "1 h", 90 * time.Minute: "1 h 30 min", 65 * time.Minute: "1 h 05 min", 45 * time.Second: "45 s",
		time.Hour + 5*time.Second: "1 h 00 min 05 s", 12*time.Hour + 5*time.Minute: "12 h 05 min",
	} {
		if got := Amount(d); got != want {
			t.Errorf("Amount(%v) = %q, want %q", d, got, want)
		}
	}
	// a change that rounds to nothing has no minus sign: "+0 s", as a
	// change of nothing, not "−0 s"
	for d, want := range map[time.Duration]string{-32 * time.Second: "−32 s", 64 * time.Second: "+1 min 04 s", 0: "+0 s",
		-400 * time.Millisecond: "+0 s", 499 * time.Millisecond: "+0 s", -500 * time.Millisecond: "−1 s", -59500 * time.Millisecond: "−1 min"} {
		if got := Change(d); got != want {
			t.Errorf("Change(%v) = %q, want %q", d, got, want)
		}
	}
}

// What the entries of a kind mean is the same on every date: it is written
// once in the calendar's description, for each kind of the feed (a kind
// given twice, with an offset, once), and no entry repeats it, nor the
// site (LOCATION and GEO carry it). Each entry still says what it is and
// gives its own numbers: its description starts with its title or its
// kind, a sunrise or sunset keeps its direction and the day length, a
// daily summary the day's times and length.
func TestMeaningsOncePerCalendar(t *testing.T) {
	flat := site(t, "flat", 48.2, 16.4, "Europe/Vienna")
	ridge := site(t, "ridge", 47.05, 11.2, "Europe/Vienna")
	ridge.Skyline = [][2]float64{{0, 3}, {100, 12}, {150, 4}, {176, 8}, {184, 8}, {190, 4}, {260, 15}, {300, 3}}
	sk := sky(t, "2027-03-01", "2027-03-03")
	var specs []config.KindSpec
	for _, k := range mustKinds(t, "sunrise", "sunset", "civil-dawn", "nautical-dusk", "astronomical-dawn", "golden-hour", "blue-hour",
		"sun-band:2..12", "sun-band:20..35", "seasons", "solar-noon", "daily-summary") {
		specs = append(specs, config.KindSpec{Kind: k})
	}
	reminder := specs[0]
	reminder.Offset = config.Duration(-30 * time.Minute)
	specs = append(specs, reminder)
	for _, c := range []struct {
		s     *config.Site
		rise  string // the meaning of sunrise at the site
		entry string // how a sunrise entry starts
	}{
		{flat, "Sunrise: the Sun's upper limb appears on the horizon (standard refraction).", "Sunrise at "},
		{ridge, "Sunrise: the Sun's upper limb first appears over the site's skyline (standard refraction for the skyline's altitude).", "Sunrise over the skyline at "},
	} {
		f := &config.Feed{ID: "f", Kinds: specs}
		cal, err := sk.Calendar(context.Background(), c.s, f, date("2027-03-01"), date("2027-03-03"), Options{})
		if err != nil {
			t.Fatal(err)
		}
		meanings := kindMeanings(c.s, specs)
		if len(meanings) != 12 || meanings[0] != c.rise || meanings[len(meanings)-1] != azimuthMeaning {
			t.Errorf("%s: %d meanings, want 12 (9 kinds, 2 bands, the azimuth), sunrise's first:\n%s", c.s.ID, len(meanings), strings.Join(meanings, "\n"))
		}
		for _, m := range meanings {
			if n := strings.Count(cal.Description, m); n != 1 {
				t.Errorf("%s: %q %d times in the calendar's description", c.s.ID, m, n)
			}
		}
		kinds := map[string]int{}
		for _, e := range cal.Entries {
			kinds[e.Kind]++
			for _, w := range append(meanings, "upper limb", "Sun's centre is", "Caution:") {
				if strings.Contains(e.Description, w) {
					t.Errorf("%s: %s entry repeats %q:\n%s", c.s.ID, e.Kind, w, e.Description)
				}
			}
			switch {
			case e.Kind == "daily-summary":
				// the day's times, then its length, not the site (LOCATION and GEO)
				if !strings.HasPrefix(e.Description, "Civil dawn ") || !strings.HasSuffix(e.Description, " from the day before).") || strings.Contains(e.Description, c.s.ID) {
					t.Errorf("%s: daily summary:\n%s", c.s.ID, e.Description)
				}
			case len(kindMeanings(c.s, []config.KindSpec{{Kind: mustKinds(t, e.Kind)[0]}})) > 0 &&
				!strings.HasPrefix(e.Description, e.Title) && !strings.HasPrefix(e.Description, plainNames[e.Kind]+" at "):
				t.Errorf("%s: %s entry starts with neither its title %q nor its kind:\n%s", c.s.ID, e.Kind, e.Title, e.Description)
			}
			if e.Kind == "sunrise" && e.Title == "Sunrise" && (!strings.HasPrefix(e.Description, c.entry) || !strings.Contains(e.Description, ", azimuth ") ||
				!strings.Contains(e.Description, "from the day before).")) {
				t.Errorf("%s: sunrise entry:\n%s", c.s.ID, e.Description)
			}
		}
		for _, k := range []string{"sunrise", "sunset", "civil-dawn", "nautical-dusk", "astronomical-dawn", "golden-hour", "blue-hour", "sun-band:2..12", "sun-band:20..35", "solar-noon", "daily-summary"} {
			if kinds[k] == 0 {
				t.Errorf("%s: no %s entry in 3 days", c.s.ID, k)
			}
		}
	}
}

// A calendar with solar eclipses carries in its description the eye
// protection an eclipse needs (ISO 12312-2 filters, common practice, as
// the README's caution says it), not only "Never look directly at the
// Sun."; a calendar without them does not.
func TestEclipseCautionInCalendarDescription(t *testing.T) {
	s := site(t, "flat", 48.2, 16.4, "Europe/Vienna")
	for _, c := range []struct {
		kinds []string
		want  bool
	}{
		{[]string{"solar-eclipse"}, true},
		{[]string{"sunrise", "solar-eclipse", "lunar-eclipse"}, true},
		{[]string{"lunar-eclipse"}, false},
		{[]string{"sunrise", "golden-hour"}, false},
	} {
		var specs []config.KindSpec
		for _, k := range mustKinds(t, c.kinds...) {
			specs = append(specs, config.KindSpec{Kind: k})
		}
		d := CalendarDescription(s, &config.Feed{ID: "f", Kinds: specs})
		has := strings.Count(d, "ISO 12312-2") == 1 && strings.Contains(d, "During a solar eclipse, never look at the Sun without eye protection") &&
			strings.HasSuffix(d, "Follow the advice of your local health authority.")
		if has != c.want || strings.Count(d, "ISO 12312-2") > 1 || !strings.Contains(d, CalendarCaution(PlaceOf(s).Observer)) {
			t.Errorf("%v: eclipse caution %v, want %v:\n%s", c.kinds, has, c.want, d)
		}
	}
}

// An angle written to a tenth of a degree that rounds to zero has no sign:
// a solar noon or Moon transit 0.03° below the horizon is "at 0.0°
// altitude", not "−0.0°" (a signed zero is no quantity).
func TestDegreesNoNegativeZero(t *testing.T) {
	for a, want := range map[float64]string{-0.04: "0.0°", -0.0: "0.0°", 0.04: "0.0°", -0.06: "−0.1°", -12: "−12.0°", 35.14: "35.1°"} {
		if got := degrees(a); got != want {
			t.Errorf("degrees(%v) = %q, want %q", a, got, want)
		}
	}
}

// A place named by its coordinates alone (events --lat --lon, an ad-hoc
// feed) is not named twice in a text: "Moonrise at 02:53:42 -03, 45.000° S,
// 72.000° W: …", not "45.0000° S, 72.0000° W (45.000° S, 72.000° W)"; a
// named site keeps its name and coordinates.
func TestWhereNamesCoordinatesOnce(t *testing.T) {
	for _, c := range []struct {
		name     string
		lat, lon float64
		want     string
	}{
		{"45.0000° S, 72.0000° W", -45, -72, "45.000° S, 72.000° W"},
		{"48.2000° N, 16.4000° E", 48.2, 16.4, "48.200° N, 16.400° E"},
		{"Fernhollow Mixed Farm", 48.26, 15.92, "Fernhollow Mixed Farm (48.260° N, 15.920° E)"},
		{"48.2000, 16.4000", 48.3, 16.4, "48.2000, 16.4000 (48.300° N, 16.400° E)"}, // a name of the user's own
	} {
		if got := where(&config.Site{Name: c.name, Latitude: c.lat, Longitude: c.lon}); got != c.want {
			t.Errorf("where(%q at %v, %v) = %q, want %q", c.name, c.lat, c.lon, got, c.want)
		}
	}
}

// A note of a date without a Moon transit gives the reason, not the site
// and the date (the entry's LOCATION and date carry them). The Moon
// transits about 50 minutes later each day on average (24 h 50 min, common
// knowledge), so about once a month a date has none.
func TestMoonTransitNoteReads(t *testing.T) {
	s := site(t, "Cairnmoor", 39.08, -105.42, "America/Denver")
	title, _, desc := describeMoonNote(newSiteInfo(s), Note{Kind: mustKinds(t, "moon-transit")[0], Date: date("2026-12-23")})
	if title != "No Moon transit today: the Moon crosses the meridian about 50 minutes later each day" ||
		desc != "No Moon transit on this date: the Moon crosses the meridian about 50 minutes later each day." {
		t.Errorf("title %q\ndescription %q", title, desc)
	}
}

// The Moon's kinds and the notes of dates without an event are written as
// the Sun's kinds are: what a kind means once in the calendar's
// description, and on each entry only its own numbers (time, direction,
// illumination, altitude, length); no entry or note names the site, its
// coordinates or its date (LOCATION, GEO and DTSTART carry them). At 78.2° N
// in November the Sun does not rise (polar night, common knowledge of the
// place), so the Sun's kinds give notes there.
func TestMoonMeaningsAndNotesOncePerCalendar(t *testing.T) {
	for _, s := range []*config.Site{
		site(t, "Cairnmoor Observatory", 39.08, -105.42, "America/Denver"),
		site(t, "Skarvlia Field Station", 78.2, 15.6, "Arctic/Longyearbyen"),
	} {
		var specs []config.KindSpec
		for _, k := range mustKinds(t, "moonrise", "moonset", "moon-phases", "moon-transit", "dark-window", "sunrise", "golden-hour", "civil-dawn") {
			specs = append(specs, config.KindSpec{Kind: k})
		}
		specs[4].MaxIllumination = 0.25
		sk := sky(t, "2026-11-01", "2026-11-30")
		cal, err := sk.Calendar(context.Background(), s, &config.Feed{ID: "f", Kinds: specs}, date("2026-11-01"), date("2026-11-30"), Options{})
		if err != nil {
			t.Fatal(err)
		}
		meanings := kindMeanings(s, specs)
		for _, want := range []string{
			"Moonrise: the Moon's upper limb appears on the horizon (standard refraction).",
			"Moonset: the Moon's upper limb disappears below the horizon (standard refraction).",
			"Full moon: the Moon is opposite the Sun and fully lit;",
			"Moon highest: the Moon crosses the meridian, its highest of the day",
			"Dark sky: the Sun is more than 18° below the horizon and the Moon is below the horizon or less than 25 % lit.",
			azimuthMeaning,
		} {
			if !slices.ContainsFunc(meanings, func(m string) bool { return strings.HasPrefix(m, want) }) {
				t.Errorf("%s: no meaning %q in\n%s", s.ID, want, strings.Join(meanings, "\n"))
			}
		}
		for _, m := range meanings {
			if n := strings.Count(cal.Description, m); n != 1 {
				t.Errorf("%s: %q %d times in the calendar's description", s.ID, m, n)
			}
		}
		coords := Coords(s.Latitude, s.Longitude, 3)
		own := map[string]*regexp.Regexp{ // each Moon entry's own numbers
			"moonrise":     regexp.MustCompile(`^Moonrise at \d\d:\d\d:\d\d \S+, azimuth \d+° \([a-z-]+\); wa(x|n)ing, \d+ % lit\.$`),
			"moonset":      regexp.MustCompile(`^Moonset at \d\d:\d\d:\d\d \S+, azimuth \d+° \([a-z-]+\); wa(x|n)ing, \d+ % lit\.$`),
			"moon-transit": regexp.MustCompile(`^Moon highest at \d\d:\d\d:\d\d \S+, at −?\d+\.\d° altitude(, below the horizon)? \(wa(x|n)ing, \d+ % lit\)\.$`),
			"moon-phases":  regexp.MustCompile(`^(New moon|First quarter|Full moon|Last quarter) at \d\d:\d\d:\d\d \S+ \(2026-11-\d\d \d\d:\d\d:\d\d UTC\)\.$`),
			"dark-window":  regexp.MustCompile(`^Dark sky on the night of [0-9–]+ (November–1 December|November) 2026 from \d\d:\d\d:\d\d \S+( the next day \((Sun|Mon|Tue|Wed|Thu|Fri|Sat) \d+ (Nov|Dec)\))? to \d\d:\d\d:\d\d \S+ (the next day \((Sun|Mon|Tue|Wed|Thu|Fri|Sat) \d+ (Nov|Dec); )?\(?(\d+ h|(\d+ h )?\d+ min)\)\.$`),
		}
		notes := 0
		for _, e := range cal.Entries {
			for _, w := range append(meanings, "upper limb", s.Name, coords, "Caution:", "November 2026 ", "day 2") {
				if strings.Contains(e.Description, w) && !(e.Kind == "dark-window" && w == "November 2026 ") {
					t.Errorf("%s: %s entry %q repeats %q:\n%s", s.ID, e.Kind, e.Title, w, e.Description)
				}
			}
			for _, day := range []string{"Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday", "Sunday"} {
				if strings.Contains(e.Description, day) {
					t.Errorf("%s: %s entry names its date: %q", s.ID, e.Kind, e.Description)
				}
			}
			if e.Facts.Note {
				notes++
				continue
			}
			if re, ok := own[e.Kind]; ok && !re.MatchString(e.Description) {
				t.Errorf("%s: %s entry %q, want it to match %s", s.ID, e.Kind, e.Description, re)
			}
		}
		if notes == 0 {
			t.Errorf("%s: no note in November 2026", s.ID)
		}
	}
	// the polar night's notes, as a reader sees them
	s := site(t, "Skarvlia Field Station", 78.2, 15.6, "Arctic/Longyearbyen")
	sk := sky(t, "2026-11-10", "2026-11-10")
	es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{{Kind: mustKinds(t, "sunrise")[0]}, {Kind: mustKinds(t, "golden-hour")[0]}}, date("2026-11-10"), date("2026-11-10"))
	if err != nil {
		t.Fatal(err)
	}
	got := map[string]string{}
	for _, e := range es {
		got[e.Title] = e.Description
	}
	for title, desc := range map[string]string{
		"Polar night: the Sun does not rise today":    "The Sun stays below the horizon all day.",
		"No golden hour today: the Sun stays too low": "The Sun's centre stays below the golden hour's altitudes all day.",
	} {
		if got[title] != desc {
			t.Errorf("10 November 2026 at 78.2° N: %q reads %q, want %q (all: %v)", title, got[title], desc, got)
		}
	}
}

// Day-length thresholds and cross-quarter days follow the same rule: what
// they mean is written once in the calendar's description (all of a
// feed's thresholds in one line), and each entry keeps its own numbers.
// At 48.2° N, 16.4° E (Europe/Vienna) day length first reaches 12 h on
// 18 March 2027 (12 h 01 min; 11 h 58 min on the 17th) and the Sun reaches
// ecliptic longitude 315° on 4 February 2027. Sources: PyEphem 4.1.4 sunrise
// and sunset (pressure 0, horizon −34′, upper limb) for the day lengths;
// PyEphem's solar longitude for the cross-quarter date (01:43 UT; the
// date is what is checked here).
func TestThresholdsAndCrossQuarterMeanOnce(t *testing.T) {
	s := site(t, "vienna", 48.2, 16.4, "Europe/Vienna")
	sk := sky(t, "2027-01-01", "2027-03-31")
	var specs []config.KindSpec
	for _, k := range mustKinds(t, "photoperiod:12h", "photoperiod:10h30m", "cross-quarter") {
		specs = append(specs, config.KindSpec{Kind: k})
	}
	cal, err := sk.Calendar(context.Background(), s, &config.Feed{ID: "f", Kinds: specs}, date("2027-01-01"), date("2027-03-31"), Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, m := range []string{
		"Day length 12 h, 10 h 30 min: the dates on which day length (sunrise to sunset) rises past or falls below the threshold; " +
			"lighting programmes for greenhouses and livestock are set by such thresholds.",
		"Cross-quarter day: the Sun is midway in ecliptic longitude between an equinox and a solstice",
	} {
		if n := strings.Count(cal.Description, m); n != 1 {
			t.Errorf("%q %d times in the calendar's description:\n%s", m, n, cal.Description)
		}
	}
	seen := map[string]string{}
	for _, e := range cal.Entries {
		for _, w := range []string{"lighting programmes", "Lighting programs", "farm calendars"} {
			if strings.Contains(e.Description, w) {
				t.Errorf("%s entry repeats %q:\n%s", e.Kind, w, e.Description)
			}
		}
		day := e.Start.Format(time.DateOnly) // an all-day entry's date
		if !e.AllDay {
			day = e.Start.In(s.TimeZone.Location).Format(time.DateOnly)
		}
		seen[e.Kind+" "+day] = e.Description
	}
	if d := seen["photoperiod:12h 2027-03-18"]; !strings.HasPrefix(d, "Day length rising past 12 h today: the Sun is up for 12 h 01 min") {
		t.Errorf("18 March: %q, want day length rising past 12 h (12 h 01 min)", d)
	}
	if d := seen["cross-quarter 2027-02-04"]; !strings.Contains(d, "ecliptic longitude 315°") {
		t.Errorf("4 February: %q, want the cross-quarter day at 315°", d)
	}
}

// A solar noon between the date's sunrise and sunset finds the Sun up, even
// when its centre is geometrically below the horizon (refraction lifts its
// upper limb into view): the entry says so and carries the caution for the
// eyes; in polar night it carries none. At 80° N, 0° the Sun rises at 11:21
// and sets at 13:09 UT on 21 February 2015 (rows sun-0159, sun-0160) and
// stays down on 21 December 2015 (marker ----, row sun-0182). Source: USNO
// one-year table 'Rise and Set for the Sun', N80 00 / 000 00, 2015. Its
// centre culminates about 0.6° below the horizon on 21 February and 13.4°
// below it on 21 December (90° − 80° less the declination, −10.57° and
// −23.43° by PyEphem 4.1.4).
func TestSolarNoonOnTheHorizon(t *testing.T) {
	s := site(t, "usno-80n", 80, 0, "UTC")
	for _, tc := range []struct {
		day, title string
		eyes       bool
	}{
		{"2015-02-21", "Solar noon, Sun on the horizon", true},
		{"2015-12-21", "Solar noon, Sun 13.4° below the horizon", false},
	} {
		sk := sky(t, tc.day, tc.day)
		specs := []config.KindSpec{{Kind: mustKinds(t, "solar-noon")[0]}}
		entries, err := sk.Entries(context.Background(), s, "noon", specs, date(tc.day), date(tc.day))
		if err != nil {
			t.Fatal(err)
		}
		if len(entries) != 1 {
			t.Fatalf("%s: %d entries, want one solar noon", tc.day, len(entries))
		}
		e := entries[0]
		if e.Title != tc.title || strings.Contains(e.Description, cautionEyes) != tc.eyes {
			t.Errorf("%s: %q\n%s\nwant the title %q, the eye caution %v", tc.day, e.Title, e.Description, tc.title, tc.eyes)
		}
	}
}

// A solar noon at a site with a horizon altitude says what is seen over that
// horizon, as the date's sunrise does. At 80° N, 0° the Sun's centre
// culminates 0.57° below the horizon on 21 February 2015 and 1.29° below it
// on 19 February (PyEphem 4.1.4, pressure 0: −0.5707° at 12:13:37 UT,
// −1.2887° at 12:13:50 UT; the Sun's radius 16.2′ on both days). With the
// refraction of Bennett's formula (Meeus, Astronomical Algorithms 2nd ed.,
// eq. 16.4: 32′ at 0.23°, 40′ at −0.36°) its upper limb is seen 0.23° high
// on 21 February: under a horizon 2° high, so the Sun neither rises there
// nor is in view at noon. On 19 February it is seen 0.36° below eye level:
// over a sea horizon 0.8° below it, where the Sun rises that day.
func TestSolarNoonFollowsSiteHorizon(t *testing.T) {
	for _, tc := range []struct {
		name, day string
		horizon   float64
		rises     bool   // the date has a sunrise at the site
		title     string // of the solar noon
		says      string // in its description
		eyes      bool   // the eye caution
	}{
		{"horizon 2°", "2015-02-21", 2, false, "Solar noon, Sun 0.6° below the horizon",
			"the Sun at −0.6° altitude, its centre below the horizon, its upper limb behind the site's horizon, 2° high.", false},
		{"horizon 0.8° below eye level", "2015-02-19", -0.8, true, "Solar noon, Sun on the horizon",
			"the Sun at −1.3° altitude, its centre below the horizon, its upper limb in view over the site's horizon, 0.8° below eye level.", true},
		{"flat", "2015-02-21", 0, true, "Solar noon, Sun on the horizon",
			"the Sun at −0.6° altitude, its centre below the horizon, its upper limb in view over a flat horizon.", true},
	} {
		s := site(t, "usno-80n", 80, 0, "UTC")
		s.Horizon = tc.horizon
		var specs []config.KindSpec
		for _, k := range mustKinds(t, "sunrise", "solar-noon") {
			specs = append(specs, config.KindSpec{Kind: k})
		}
		entries, err := sky(t, tc.day, tc.day).Entries(context.Background(), s, "noon", specs, date(tc.day), date(tc.day))
		if err != nil {
			t.Fatal(err)
		}
		var rises bool
		var noon *Entry
		for i, e := range entries {
			switch e.Kind {
			case "sunrise":
				rises = !e.AllDay
			case "solar-noon":
				noon = &entries[i]
			}
		}
		if noon == nil {
			t.Fatalf("%s: no solar noon on %s in %d entries", tc.name, tc.day, len(entries))
		}
		if rises != tc.rises {
			t.Errorf("%s: a sunrise on %s: %v, want %v", tc.name, tc.day, rises, tc.rises)
		}
		if noon.Title != tc.title || !strings.Contains(noon.Description, tc.says) || strings.Contains(noon.Description, cautionEyes) != tc.eyes {
			t.Errorf("%s: %q\n%s\nwant the title %q, the description %q, the eye caution %v", tc.name, noon.Title, noon.Description, tc.title, tc.says, tc.eyes)
		}
	}
}

// A photoperiod date whose day length rounds to the threshold itself says
// it to the second, so that "falling below 12 h" is not followed by "up
// for 12 h". Santiago, 33.45° S 70.67° W (PyEphem 4.1.4, upper
// limb, 34′ refraction, sea level): sunrise to sunset 43,312.3 s (12 h 01
// min 52 s) on 23 March 2027 and 43,187.5 s (11 h 59 min 47 s) on 24
// March, the date the day length falls below 12 h.
func TestPhotoperiodLengthNotTheThresholdWhenBelow(t *testing.T) {
	s := site(t, "santiago", -33.45, -70.67, "America/Santiago")
	sk := sky(t, "2027-03-20", "2027-03-28")
	cal, err := sk.Calendar(context.Background(), s, &config.Feed{ID: "f", Kinds: []config.KindSpec{{Kind: mustKinds(t, "photoperiod:12h")[0]}}},
		date("2027-03-20"), date("2027-03-28"), Options{})
	if err != nil {
		t.Fatal(err)
	}
	const want = "Day length falling below 12 h today: the Sun is up for 11 h 59 min 47 s (−2 min 05 s from the day before), sunrise to sunset."
	var got []string
	for _, e := range cal.Entries {
		got = append(got, e.Start.Format(time.DateOnly)+": "+e.Description)
	}
	if len(got) != 1 || got[0] != "2027-03-24: "+want {
		t.Errorf("entries %q, want one on 2027-03-24: %q", got, want)
	}
}

// What a calendar says sunrise, sunset, moonrise, moonset and a dark sky
// are follows what is computed at the site: over a flat horizon the upper
// limb on it with the standard refraction (and the dip of the elevation);
// over a horizon altitude (`horizon: 2`, or a sea horizon below eye level
// seen from a height) the upper limb over that altitude, with the
// refraction at it and no dip; over a skyline its first and last
// appearance; with pressure_hpa or temperature_c the refraction for that
// air, which the calendar's caution names too.
func TestRiseSetMeaningFollowsSite(t *testing.T) {
	cold := func(s *config.Site) *config.Site {
		p, temp := 1030.0, -20.0
		s.Pressure, s.Temperature = &p, &temp
		return s
	}
	flat := func() *config.Site {
		s := site(t, "flat", -41.35, 172.98, "Pacific/Auckland")
		s.Elevation = 90
		return s
	}
	raised := func(h float64) *config.Site {
		s := flat()
		s.Horizon, s.HorizonSet = h, true
		return s
	}
	sea := func() *config.Site {
		s := flat()
		s.Elevation = 0
		return s
	}
	plateau := func() *config.Site { // Owlgate, 1150 m: the dip 1.76′·√1150 = 59.7′ (N. Bowditch, The American Practical Navigator, dip of the sea horizon)
		s := site(t, "plateau", -31.27, 149.07, "Australia/Sydney")
		s.Elevation = 1150
		return s
	}
	ridge := func() *config.Site {
		s := flat()
		s.Skyline = [][2]float64{{0, 3}, {100, 12}, {150, 4}, {260, 15}, {300, 3}}
		return s
	}
	var specs []config.KindSpec
	for _, k := range mustKinds(t, "sunrise", "sunset", "moonrise", "moonset", "dark-window") {
		specs = append(specs, config.KindSpec{Kind: k})
	}
	const std, air = "standard atmospheric refraction;", "refraction for 1030 hPa and −20 °C;"
	for _, c := range []struct {
		name    string
		s       *config.Site
		want    []string // the meanings of sunrise, sunset, moonrise, moonset, dark sky
		caution string   // the refraction the caution names
	}{
		{"sea level", sea(), []string{
			"Sunrise: the Sun's upper limb appears on the horizon (standard refraction).",
			"Sunset: the Sun's upper limb disappears below the horizon (standard refraction).",
			"Moonrise: the Moon's upper limb appears on the horizon (standard refraction).",
			"Moonset: the Moon's upper limb disappears below the horizon (standard refraction).",
			"Dark sky: the Sun is more than 18° below the horizon and the Moon is below the horizon.",
		}, std},
		{"flat from 90 m", flat(), []string{ // the dip 1.76′·√90 = 16.7′
			"Sunrise: the Sun's upper limb appears over a horizon 17′ below eye level, as seen from 90 m (standard refraction).",
			"Sunset: the Sun's upper limb disappears behind a horizon 17′ below eye level, as seen from 90 m (standard refraction).",
			"Moonrise: the Moon's upper limb appears over a horizon 17′ below eye level, as seen from 90 m (standard refraction).",
			"Moonset: the Moon's upper limb disappears behind a horizon 17′ below eye level, as seen from 90 m (standard refraction).",
			"Dark sky: the Sun is more than 18° below the horizon and the Moon is below the horizon.",
		}, std},
		{"flat from 1150 m", plateau(), []string{
			"Sunrise: the Sun's upper limb appears over a horizon 1.0° below eye level, as seen from 1150 m (standard refraction).",
			"Moonset: the Moon's upper limb disappears behind a horizon 1.0° below eye level, as seen from 1150 m (standard refraction).",
		}, std},
		{"level horizon written 0", raised(0), []string{
			"Sunrise: the Sun's upper limb appears over the site's level horizon (standard refraction for that altitude).",
			"Sunset: the Sun's upper limb disappears behind the site's level horizon (standard refraction for that altitude).",
			"Moonrise: the Moon's upper limb appears over the site's level horizon (standard refraction for that altitude).",
			"Moonset: the Moon's upper limb disappears behind the site's level horizon (standard refraction for that altitude).",
			"Dark sky: the Sun is more than 18° below the horizon and the Moon is below the site's horizon (level). " +
				"The Sun's 18° are counted from the flat horizon, not the site's horizon.",
		}, std},
		{"horizon 2°", raised(2), []string{
			"Sunrise: the Sun's upper limb appears over the site's horizon, 2° high (standard refraction for that altitude).",
			"Sunset: the Sun's upper limb disappears behind the site's horizon, 2° high (standard refraction for that altitude).",
			"Moonrise: the Moon's upper limb appears over the site's horizon, 2° high (standard refraction for that altitude).",
			"Moonset: the Moon's upper limb disappears behind the site's horizon, 2° high (standard refraction for that altitude).",
			"Dark sky: the Sun is more than 18° below the horizon and the Moon is below the site's horizon (2° high). " +
				"The Sun's 18° are counted from the flat horizon, not the site's horizon.",
		}, std},
		{"horizon −0.8°", raised(-0.8), []string{
			"Sunrise: the Sun's upper limb appears over the site's horizon, 0.8° below eye level (standard refraction for that altitude).",
			"Sunset: the Sun's upper limb disappears behind the site's horizon, 0.8° below eye level (standard refraction for that altitude).",
			"Moonrise: the Moon's upper limb appears over the site's horizon, 0.8° below eye level (standard refraction for that altitude).",
			"Moonset: the Moon's upper limb disappears behind the site's horizon, 0.8° below eye level (standard refraction for that altitude).",
			"Dark sky: the Sun is more than 18° below the horizon and the Moon is below the site's horizon (0.8° below eye level). " +
				"The Sun's 18° are counted from the flat horizon, not the site's horizon.",
		}, std},
		{"skyline", ridge(), []string{
			"Sunrise: the Sun's upper limb first appears over the site's skyline (standard refraction for the skyline's altitude).",
			"Sunset: the Sun's upper limb last disappears behind the site's skyline (standard refraction for the skyline's altitude).",
			"Moonrise: the Moon's upper limb first appears over the site's skyline (standard refraction for the skyline's altitude).",
			"Moonset: the Moon's upper limb last disappears behind the site's skyline (standard refraction for the skyline's altitude).",
			"Dark sky: the Sun is more than 18° below the horizon and the Moon is behind the site's skyline. " +
				"The Sun's 18° are counted from the flat horizon, not the skyline: the glow of twilight lights the sky over the hills as well.",
		}, std},
		{"flat, cold air", cold(sea()), []string{
			"Sunrise: the Sun's upper limb appears on the horizon (refraction for 1030 hPa and −20 °C).",
			"Sunset: the Sun's upper limb disappears below the horizon (refraction for 1030 hPa and −20 °C).",
			"Moonrise: the Moon's upper limb appears on the horizon (refraction for 1030 hPa and −20 °C).",
			"Moonset: the Moon's upper limb disappears below the horizon (refraction for 1030 hPa and −20 °C).",
		}, air},
		{"flat from 90 m, cold air", cold(flat()), []string{
			"Sunrise: the Sun's upper limb appears over a horizon 17′ below eye level, as seen from 90 m (refraction for 1030 hPa and −20 °C).",
		}, air},
		{"horizon 1.5°, cold air", cold(raised(1.5)), []string{
			"Sunrise: the Sun's upper limb appears over the site's horizon, 1.5° high (refraction for 1030 hPa and −20 °C at that altitude).",
			"Sunset: the Sun's upper limb disappears behind the site's horizon, 1.5° high (refraction for 1030 hPa and −20 °C at that altitude).",
			"Moonrise: the Moon's upper limb appears over the site's horizon, 1.5° high (refraction for 1030 hPa and −20 °C at that altitude).",
			"Moonset: the Moon's upper limb disappears behind the site's horizon, 1.5° high (refraction for 1030 hPa and −20 °C at that altitude).",
		}, air},
		{"skyline, cold air", cold(ridge()), []string{
			"Sunrise: the Sun's upper limb first appears over the site's skyline (refraction for 1030 hPa and −20 °C at the skyline's altitude).",
			"Sunset: the Sun's upper limb last disappears behind the site's skyline (refraction for 1030 hPa and −20 °C at the skyline's altitude).",
			"Moonrise: the Moon's upper limb first appears over the site's skyline (refraction for 1030 hPa and −20 °C at the skyline's altitude).",
			"Moonset: the Moon's upper limb last disappears behind the site's skyline (refraction for 1030 hPa and −20 °C at the skyline's altitude).",
		}, air},
	} {
		d := CalendarDescription(c.s, &config.Feed{ID: "f", Kinds: specs})
		for _, w := range c.want {
			if !strings.Contains(d, w+"\n") {
				t.Errorf("%s: no line %q in the calendar's description:\n%s", c.name, w, d)
			}
		}
		if caution := "a flat or configured horizon and " + c.caution + " real conditions move them"; !strings.Contains(d, caution) {
			t.Errorf("%s: the caution does not say %q:\n%s", c.name, caution, d)
		}
	}
}

// A photoperiod date on which the Sun stops setting or rising says so, not
// "up for 24 h …, sunrise to sunset" or "up for 0 min". Tromsø, 69.65° N
// 18.96° E, Europe/Oslo: PyEphem 4.1.4 (upper limb, 34′ refraction,
// pressure 0, sea level) has the first local dates with neither a sunrise
// nor a sunset on 19 May 2027 (the Sun stays up; 17 May's sunset falls
// after midnight) and on 28 November 2027 (it stays down; 27 November
// still has both).
func TestPhotoperiodSaysSunDoesNotSetOrRise(t *testing.T) {
	s := site(t, "tromso", 69.65, 18.96, "Europe/Oslo")
	sk := sky(t, "2027-01-01", "2027-12-31")
	cal, err := sk.Calendar(context.Background(), s, &config.Feed{ID: "f", Kinds: []config.KindSpec{
		{Kind: mustKinds(t, "photoperiod:23h30m")[0]}, {Kind: mustKinds(t, "photoperiod:20m")[0]}}},
		date("2027-01-01"), date("2027-12-31"), Options{})
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]string{
		"2027-05-19": "Day length rising past 23 h 30 min today: the Sun does not set (+1 h 01 min from the day before).",
		"2027-11-28": "Day length falling below 20 min today: the Sun does not rise (−37 min 26 s from the day before).",
	}
	for _, e := range cal.Entries {
		day := e.Start.Format(time.DateOnly)
		if w, ok := want[day]; ok {
			if e.Description != w {
				t.Errorf("%s: %q, want %q", day, e.Description, w)
			}
			delete(want, day)
		} else if strings.Contains(e.Description, "does not") {
			t.Errorf("%s: %q: the Sun rises and sets that day", day, e.Description)
		}
	}
	for day := range want {
		t.Errorf("no photoperiod entry on %s", day)
	}
}

// A dark window across a change of the clocks says so, so that its clock
// times, which the change puts an hour nearer or further apart, read with
// its length. At 36.4° S, 145.2° E (Australia/Melbourne) summer time ends
// at 03:00 AEDT on Sunday 4 April 2027 and begins at 02:00 AEST on Sunday
// 3 October 2027 (the tz database's rule for Victoria: the first Sundays of
// April and October); the nights of 3–4 April and 2–3 October are dark
// through those hours (astronomical dusk 20:36:32 AEDT, moonrise 03:33:41
// AEST; 20:58:56 AEST to astronomical dawn 05:26:03 AEDT, each within a
// second of PyEphem 4.1.4). The nights around them say nothing of the
// clocks.
func TestDarkWindowAcrossClockChange(t *testing.T) {
	s := site(t, "Quillon Heights", -36.4, 145.2, "Australia/Melbourne")
	for _, c := range []struct {
		first, last, night, want string
	}{
		{"2027-04-02", "2027-04-04", "2027-04-03",
			"Dark sky on the night of 3–4 April 2027 from 20:36:32 AEDT to 03:33:41 AEST the next day (Sun 4 Apr; 7 h 57 min). " +
				"The clocks go back from summer time by 1 h during it: 03:00 AEDT becomes 02:00 AEST."},
		{"2027-10-01", "2027-10-03", "2027-10-02",
			"Dark sky on the night of 2–3 October 2027 from 20:58:56 AEST to 05:26:03 AEDT the next day (Sun 3 Oct; 7 h 27 min). " +
				"The clocks go forward for summer time by 1 h during it: 02:00 AEST becomes 03:00 AEDT."},
	} {
		checkClocksSaidOn(t, s, config.KindSpec{Kind: mustKinds(t, "dark-window")[0]}, c.first, c.last, c.night, c.want)
	}
	// A change that is not whole minutes says its seconds: zdump -v
	// Africa/Monrovia gives MMT (−00:44:30) until 00:44:29 UT on 7 January
	// 1972, then GMT. At 6.3° N, 30° W the night of 6–7 January 1972 is dark
	// from astronomical dusk at 21:13:21 UT to moonrise at 00:49:12 UT
	// (PyEphem 4.1.4, to the second).
	s = site(t, "Monrovia Meridian", 6.3, -30, "Africa/Monrovia")
	checkClocksSaidOn(t, s, config.KindSpec{Kind: mustKinds(t, "dark-window")[0]}, "1972-01-05", "1972-01-07", "1972-01-06",
		"Dark sky on the night of 6–7 January 1972 from 20:28:51 MMT to 00:49:12 GMT the next day (Fri 7 Jan; 3 h 36 min). "+
			"The clocks go forward by 44 min 30 s during it: 00:00 MMT becomes 00:44:30 GMT.")
}

// checkClocksSaidOn checks that spec's entry of the date day, among those
// of first..last, has the description want, and that no other entry
// speaks of the clocks.
func checkClocksSaidOn(t *testing.T, s *config.Site, spec config.KindSpec, first, last, day, want string) {
	t.Helper()
	sk := sky(t, first, last)
	es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date(first), date(last))
	if err != nil {
		t.Fatal(err)
	}
	found := false
	for _, e := range es {
		if e.Date.Format(time.DateOnly) == day {
			found = true
			if e.Description != want {
				t.Errorf("%s %s:\n got %q\nwant %q", spec.Kind, day, e.Description, want)
			}
		} else if strings.Contains(e.Description, "clocks") {
			t.Errorf("%s %s, without a change of the clocks: %q", spec.Kind, e.Date.Format(time.DateOnly), e.Description)
		}
	}
	if !found {
		t.Errorf("no %s entry on %s in %d entries", spec.Kind, day, len(es))
	}
}

// A lamp period across a change of the clocks says so too: morning lamps
// to 18 h at 52.95° N, 1.05° W (Europe/London, whose clocks go back at
// 02:00 BST on Sunday 31 October 2027 and forward at 01:00 GMT on Sunday
// 28 March 2027: the tz database's EU rule, the last Sundays of October
// and March) burn from the evening before until sunrise, 06:59:17 GMT on
// 31 October and 06:48:26 BST on 28 March (PyEphem 4.1.4: 06:59:17 UT and
// 05:48:25 UT, within a second). Their clock times read an hour off their
// length; the dates around them say nothing of the clocks.
func TestLampPeriodAcrossClockChange(t *testing.T) {
	s := site(t, "Thistlewick Barn", 52.95, -1.05, "Europe/London")
	spec := config.KindSpec{Kind: mustKinds(t, "lighting:18h")[0], Lamps: config.LampsMorning}
	for _, c := range []struct {
		first, last, day, want string
	}{
		{"2027-10-30", "2027-11-01", "2027-10-31",
			"Morning lamps on at 23:35:35 BST the day before (Sat 30 Oct), off at 06:59:17 GMT (8 h 24 min). " +
				"The clocks go back from summer time by 1 h during it: 02:00 BST becomes 01:00 GMT.\nNatural day 9 h 36 min; target 18 h."},
		{"2027-03-27", "2027-03-29", "2027-03-28",
			"Morning lamps on at 00:31:19 GMT, off at 06:48:26 BST (5 h 17 min). " +
				"The clocks go forward for summer time by 1 h during it: 01:00 GMT becomes 02:00 BST.\nNatural day 12 h 43 min; target 18 h."},
	} {
		checkClocksSaidOn(t, s, spec, c.first, c.last, c.day, c.want)
	}
}
