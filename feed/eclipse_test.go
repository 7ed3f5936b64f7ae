package feed

import (
	"context"
	"math"
	"regexp"
	"strings"
	"testing"
	"time"

	"heliocal/astro"
	"heliocal/config"
)

// eclipseEntries returns the entries of kinds for a site over first..last.
func eclipseEntries(t *testing.T, s *config.Site, first, last string, kinds ...string) []Entry {
	t.Helper()
	var specs []config.KindSpec
	for _, k := range mustKinds(t, kinds...) {
		specs = append(specs, config.KindSpec{Kind: k})
	}
	es, err := sky(t, first, last).Entries(context.Background(), s, "f", specs, date(first), date(last))
	if err != nil {
		t.Fatal(err)
	}
	return es
}

func nearTime(t *testing.T, what string, got time.Time, want string, tol time.Duration) {
	t.Helper()
	w, err := time.Parse(time.RFC3339, want)
	if err != nil {
		t.Fatal(err)
	}
	if d := got.Sub(w); math.Abs(float64(d)) > float64(tol) {
		t.Errorf("%s: %s, want %s within %s", what, got.UTC().Format(time.RFC3339Nano), want, tol)
	}
}

// Vienna, August 2026: the solar eclipse of the 12th is partial there and the
// Sun sets before it ends; the Moon sets during the partial lunar eclipse of
// the 28th. Contact instants: Swiss Ephemeris 2.10.03
// (testdata/reference/eclipses-swiss.csv, rows "vienna"), 5 s for the Sun, 10 s
// for the Moon (the library's own shadow enlargement; see astro's tests).
func TestEclipseEntriesVienna(t *testing.T) {
	s := site(t, "vienna", 48.21, 16.37, "Europe/Vienna")
	s.Elevation = 190
	es := eclipseEntries(t, s, "2026-08-01", "2026-08-31", "solar-eclipse", "lunar-eclipse")
	if len(es) != 2 {
		t.Fatalf("%d entries, want the solar eclipse of the 12th and the lunar one of the 28th: %+v", len(es), es)
	}
	sol, lun := es[0], es[1]
	if sol.Kind != "solar-eclipse" || sol.Date != date("2026-08-12") || lun.Kind != "lunar-eclipse" || lun.Date != date("2026-08-28") {
		t.Fatalf("entries %s %s, %s %s", sol.Kind, sol.Date, lun.Kind, lun.Date)
	}
	nearTime(t, "first contact", sol.Start, "2026-08-12T17:22:05.10Z", 5*time.Second)
	nearTime(t, "last contact", sol.End, "2026-08-12T19:03:15.09Z", 5*time.Second)
	nearTime(t, "P1", lun.Start, "2026-08-28T01:23:57.68Z", 10*time.Second)
	nearTime(t, "P4", lun.End, "2026-08-28T07:01:49.61Z", 10*time.Second)
	for _, want := range []string{"Partial solar eclipse", "ISO 12312-2", "local health authority", "The Sun sets at 20:16:21 CEST still eclipsed, 88 % of its diameter covered.", "Sun below the horizon", "k = 0.2725076", "Elsewhere on the Earth this eclipse is total"} {
		if !strings.Contains(sol.Description, want) {
			t.Errorf("solar description lacks %q:\n%s", want, sol.Description)
		}
	}
	if !strings.HasSuffix(sol.Title, "(seen until sunset)") || !strings.Contains(sol.Title, "89 %") {
		t.Errorf("solar title %q", sol.Title)
	}
	for _, want := range []string{"Partial lunar eclipse", "umbral magnitude 0.930", "The Moon sets at 06:14",
		"Danjon", "Five Millennium Canon", "Moon below the horizon"} {
		if !strings.Contains(lun.Description, want) {
			t.Errorf("lunar description lacks %q:\n%s", want, lun.Description)
		}
	}
	// the umbral magnitude is the fraction of the Moon's diameter in the
	// umbra, not of its area (the definition of Espenak & Meeus, Five
	// Millennium Canon of Lunar Eclipses, NASA/TP-2009-214172; from memory)
	if lun.Title != "Partial lunar eclipse: 93 % of the Moon's diameter in the Earth's shadow (seen until moonset)" {
		t.Errorf("lunar title %q", lun.Title)
	}
	// the README's example of when an eclipse is seen: from P1 (above) to
	// the moonset of 04:14:40 UT, 06:14:40 CEST (PyEphem 4.1.4: pressure 0,
	// the Moon's upper limb at −34′ less the dip of 190 m, 24.3′; 2 s), of
	// the eclipse from P1 to P4
	seen := regexp.MustCompile(`^The Moon is above the horizon, so seen from the site, from the start of the eclipse at 03:2[34]:\d\d CEST ` +
		`to moonset at 06:14:(3[89]|4[0-2]) CEST: 2 h 5[01] min of the eclipse's 5 h 3[78] min\.$`)
	if lines := strings.Split(lun.Description, "\n"); len(lines) < 2 || !seen.MatchString(lines[1]) {
		t.Errorf("lunar description's second line, want %s:\n%s", seen, lun.Description)
	}
	if got := strings.Join(sol.Categories, ","); got != "Sun,Solar eclipse" {
		t.Errorf("categories %s", got)
	}
}

// Every solar-eclipse entry over ten years, at sites north and south, carries
// the eye-protection caution (ISO 12312-2, common practice for eclipse
// viewing) and names the Moon's radius used.
func TestEverySolarEclipseEntryCautions(t *testing.T) {
	n := 0
	for _, s := range []*config.Site{site(t, "vienna", 48.21, 16.37, "Europe/Vienna"),
		site(t, "baires", -34.6, -58.38, "America/Argentina/Buenos_Aires"),
		site(t, "polar", 78.2, 15.6, "Arctic/Longyearbyen")} {
		for _, e := range eclipseEntries(t, s, "2026-01-01", "2035-12-31", "solar-eclipse") {
			n++
			if !strings.Contains(e.Description, cautionEclipse) || !strings.Contains(e.Description, "k = 0.2725076") {
				t.Errorf("%s %s: no caution:\n%s", s.ID, e.Date.Format(time.DateOnly), e.Description)
			}
		}
	}
	if n < 10 {
		t.Errorf("only %d solar eclipses at three sites over ten years", n)
	}
}

// Which eclipses a site gets: at Honolulu the total solar eclipse of
// 2027-08-02 happens at night (none listed), and the penumbral lunar
// eclipses of 2027-07-18 and 2027-08-17 are listed, as Swiss Ephemeris 2.10.03
// lists them (testdata/reference/eclipses-swiss.csv, rows "honolulu").
func TestEclipsesSiteGets(t *testing.T) {
	s := site(t, "honolulu", 21.31, -157.86, "Pacific/Honolulu")
	s.Elevation = 5
	es := eclipseEntries(t, s, "2027-07-01", "2027-08-31", "solar-eclipse", "lunar-eclipse")
	var got []string
	for _, e := range es {
		got = append(got, e.Kind+" "+e.Date.Format(time.DateOnly))
	}
	want := "lunar-eclipse 2027-07-18,lunar-eclipse 2027-08-16"
	if strings.Join(got, ",") != want {
		t.Errorf("got %q, want %q (local dates in Honolulu)", got, want)
	}
}

// An eclipse that begins as the Sun sets is listed, with what can be seen:
// at Vienna on 2028-01-26 first contact comes 3.5 minutes before sunset.
// (Swiss Ephemeris 2.10.03, with its own horizon, leaves this one out; see
// TestEclipsesSwissEphemeris in astro.)
func TestEclipseAtSunset(t *testing.T) {
	s := site(t, "vienna", 48.21, 16.37, "Europe/Vienna")
	s.Elevation = 190
	es := eclipseEntries(t, s, "2028-01-26", "2028-01-26", "solar-eclipse")
	if len(es) != 1 {
		t.Fatalf("%d entries", len(es))
	}
	for _, want := range []string{"16:42:41 CET first contact, the Moon begins to cover the Sun; Sun on the horizon in the west-south-west",
		"The Sun sets at 16:46:15 CET still eclipsed, 5 % of its diameter covered.",
		"Greatest eclipse happens with the Sun below the horizon here", cautionEclipse} {
		if !strings.Contains(es[0].Description, want) {
			t.Errorf("description lacks %q:\n%s", want, es[0].Description)
		}
	}
	if es[0].Title != "Partial solar eclipse: 5 % of the Sun's diameter covered (seen until sunset)" {
		t.Errorf("title %q", es[0].Title)
	}
}

// min_duration applies to eclipses like any span: at Vienna in 2026–2035 the
// solar eclipses last from under an hour to over two; a floor of 2 h keeps
// only the longer ones.
func TestEclipseMinDuration(t *testing.T) {
	s := site(t, "vienna", 48.21, 16.37, "Europe/Vienna")
	k := mustKinds(t, "solar-eclipse")[0]
	sk := sky(t, "2026-01-01", "2035-12-31")
	all, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{{Kind: k}}, date("2026-01-01"), date("2035-12-31"))
	if err != nil {
		t.Fatal(err)
	}
	kept, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{{Kind: k, MinDuration: config.Duration(2 * time.Hour)}}, date("2026-01-01"), date("2035-12-31"))
	if err != nil {
		t.Fatal(err)
	}
	long := 0
	for _, e := range all {
		if e.End.Sub(e.Start) >= 2*time.Hour {
			long++
		}
	}
	if long == 0 || long == len(all) || len(kept) != long {
		t.Errorf("%d eclipses, %d of 2 h or more, %d kept", len(all), long, len(kept))
	}
}

// At a site with a skyline (the demo's invented valley, with 15° hills to
// the west-south-west) an eclipse is listed as over the flat horizon, and
// its entry says what of it is over the skyline: the setting Sun of 12
// August 2026 disappears behind the hills at the same instant as that
// date's sunset over the skyline (its last disappearance); the eclipse of
// 26 January 2028 stays wholly behind them; the Sun of 2 August 2027 is
// over them throughout. A flat site's entries say nothing of a skyline.
func TestEclipseBehindSkyline(t *testing.T) {
	s := site(t, "valley", 47.05, 11.2, "Europe/Vienna")
	s.Skyline = [][2]float64{{0, 3}, {100, 12}, {150, 4}, {176, 25}, {184, 25}, {190, 4}, {260, 15}, {300, 3}}
	sk := sky(t, "2026-08-01", "2028-01-31")
	evs, _, err := sk.Events(context.Background(), PlaceOf(s), mustKinds(t, "solar-eclipse", "sunset"), date("2026-08-12"), date("2028-01-26"))
	if err != nil {
		t.Fatal(err)
	}
	var sunset time.Time
	got := map[string]Event{}
	for _, e := range evs {
		switch {
		case e.Kind.Name == "sunset" && e.Date == date("2026-08-12"):
			sunset = e.Start
		case e.Kind.Name == "solar-eclipse":
			got[e.Date.Format(time.DateOnly)] = e
		}
	}
	facts := func(d string) (Event, EclipseFacts) {
		e := got[d]
		if x := e.EclipseFacts(); x != nil {
			return e, *x
		}
		t.Errorf("%s: no eclipse", d)
		return e, EclipseFacts{}
	}
	partly, px := facts("2026-08-12")
	_, hx := facts("2028-01-26")
	whole, wx := facts("2027-08-02")
	if !px.Skyline || len(px.Visible) != 1 || !px.Visible[0].Start.Equal(partly.Start) ||
		px.Visible[0].End.Sub(sunset).Abs() > 2*time.Millisecond {
		t.Errorf("12 Aug 2026: over the skyline %+v, sunset over the skyline %v", px.Visible, sunset)
	}
	if !hx.Skyline || len(hx.Visible) != 0 {
		t.Errorf("26 Jan 2028: over the skyline %+v, want none", hx.Visible)
	}
	if len(wx.Visible) != 1 || !wx.Visible[0].Start.Equal(whole.Start) || !wx.Visible[0].End.Equal(whole.End) {
		t.Errorf("2 Aug 2027: over the skyline %+v, want all of %v–%v", wx.Visible, whole.Start, whole.End)
	}

	es := eclipseEntries(t, s, "2026-08-12", "2028-01-26", "solar-eclipse")
	texts := map[string]Entry{}
	for _, e := range es {
		texts[e.Date.Format(time.DateOnly)] = e
	}
	for date, want := range map[string][]string{
		"2026-08-12": {"(partly behind the skyline)", "The Sun disappears behind the site's skyline at 19:39:4", "Seen from the site, over its skyline, for 15 min of the eclipse's 1 h 43 min.", "behind the site's skyline; the Moon covers", "ISO 12312-2"},
		"2028-01-26": {"(behind the skyline here)", "The Sun stays behind the site's skyline all through the eclipse: none of it can be seen from the site.", "ISO 12312-2"},
		"2027-08-02": {"The Sun is over the site's skyline all through the eclipse."},
	} {
		e := texts[date]
		for _, w := range want {
			if !strings.Contains(e.Title+"\n"+e.Description, w) {
				t.Errorf("%s lacks %q:\n%s\n%s", date, w, e.Title, e.Description)
			}
		}
		if strings.Contains(e.Title, "(seen until sunset)") || strings.Contains(e.Description, "above the horizon, so seen") {
			t.Errorf("%s: title %q or description speaks of the flat horizon's sunset:\n%s", date, e.Title, e.Description)
		}
	}
	flat := site(t, "flat", 47.05, 11.2, "Europe/Vienna")
	for _, e := range eclipseEntries(t, flat, "2026-08-12", "2028-01-26", "solar-eclipse", "lunar-eclipse") {
		if strings.Contains(e.Title+e.Description, "skyline") {
			t.Errorf("flat site: %s\n%s", e.Title, e.Description)
		}
	}
}

// The penumbral lunar eclipse of 17 August 2027 runs from 05:24:29.53 to
// 09:03:12.42 UT (Swiss Ephemeris 2.10.03, testdata/reference/eclipses-swiss.csv,
// rows "honolulu" and "buenos-aires": a penumbral eclipse's contacts are the
// same everywhere), 22:24 MST on the 16th to 02:03 MST on the 17th at
// Phoenix (America/Phoenix, UT − 7 h all year, tz database): the first line
// of its description marks the end's next date as the other spans do.
func TestEclipseFirstLineMarksNextDay(t *testing.T) {
	s := site(t, "phoenix", 33.45, -112.07, "America/Phoenix")
	es := eclipseEntries(t, s, "2027-08-16", "2027-08-17", "lunar-eclipse")
	if len(es) != 1 {
		t.Fatalf("%d entries, want the eclipse of 16–17 August: %+v", len(es), es)
	}
	nearTime(t, "first contact", es[0].Start, "2027-08-17T05:24:29Z", 10*time.Second)
	nearTime(t, "last contact", es[0].End, "2027-08-17T09:03:12Z", 10*time.Second)
	first, _, _ := strings.Cut(es[0].Description, "\n")
	if !regexp.MustCompile(`, 22:24:[23]\d MST to 02:03:[01]\d MST the next day \(Tue 17 Aug\)\.$`).MatchString(first) {
		t.Errorf("first line %q: want the end marked the next day (Tue 17 Aug)", first)
	}
}

// A rise or set during an eclipse is said at the time the sunrise, sunset,
// moonrise or moonset entry of the same site gives it, never a second apart:
// the eclipse's own search of the horizon, from its fitted positions, lands
// a few tenths of a second away, which showed as "Moon rises 07:36:27" in the
// eclipse beside a moonrise at 07:36:26. Each time is also within 1 s of
// PyEphem 4.1.4 (pressure 0; the Sun's centre at −50′, the Moon's upper limb
// at −34′, topocentric), the last field of each case.
func TestEclipseRiseSetAsEntries(t *testing.T) {
	for _, c := range []struct {
		lat, lon      float64
		day, kind     string
		eclipse, body string
		pyephem       string
	}{
		{-31.27, 149.07, "2027-08-17", "moonrise", "lunar-eclipse", "The Moon rises at ", "2027-08-17T07:36:26.606Z"},
		{20, 149.07, "2032-11-03", "sunset", "solar-eclipse", "The Sun sets at ", "2032-11-03T07:28:08.632Z"},
		{0, 149.07, "2033-04-14", "moonset", "lunar-eclipse", "The Moon sets at ", "2033-04-14T20:05:27.000Z"},
	} {
		s := site(t, "here", c.lat, c.lon, "UTC")
		var ecl, ev *Entry
		es := eclipseEntries(t, s, c.day, c.day, c.eclipse, c.kind)
		for i := range es {
			switch es[i].Kind {
			case c.eclipse:
				ecl = &es[i]
			case c.kind:
				ev = &es[i]
			}
		}
		if ecl == nil || ev == nil {
			t.Fatalf("%s at %v, %v: entries %+v", c.day, c.lat, c.lon, es)
		}
		nearTime(t, c.kind, ev.Start, c.pyephem, time.Second)
		x := ecl.Facts.Eclipse
		var hs []astro.HorizonEvent
		switch {
		case x.Solar != nil:
			hs = x.Solar.Horizon
		case x.Lunar != nil:
			hs = x.Lunar.Horizon
		}
		// to the millisecond: the entries' own search moves by a
		// millisecond or so with the span it is run over
		if len(hs) != 1 || hs[0].Time.Sub(ev.Start).Abs() > 2*time.Millisecond {
			t.Errorf("%s at %v, %v: the eclipse's rise or set %+v, the %s entry at %s", c.day, c.lat, c.lon, hs, c.kind, ev.Start.Format(time.RFC3339Nano))
		}
		if want := c.body + ev.Start.Round(time.Second).Format("15:04:05") + " UTC"; !strings.Contains(ecl.Description, want) {
			t.Errorf("%s at %v, %v: the eclipse's description lacks %q:\n%s", c.day, c.lat, c.lon, want, ecl.Description)
		}
	}
}

// An eclipse entry spans the whole eclipse, from its first contact, as its
// start in every output and the contacts in its description do; one the
// body rises or sets during says in its title which part the site sees and
// in its description when, near the top: the penumbral lunar eclipse of 17
// August 2027 at 31.27° S, 149.07° E (sea level, UTC) begins at 05:24:29
// UT and ends at 09:03:12 UT (Swiss Ephemeris 2.10.03, as
// TestEclipseFirstLineMarksNextDay; 10 s), and the Moon rises at
// 07:36:26.552 UT (PyEphem 4.1.4: pressure 0, the Moon's upper limb at
// −34′, topocentric; 1 s), 1 h 27 min before the end.
func TestEclipseSaysWhenItIsSeen(t *testing.T) {
	s := site(t, "here", -31.27, 149.07, "UTC")
	es := eclipseEntries(t, s, "2027-08-17", "2027-08-17", "lunar-eclipse")
	if len(es) != 1 {
		t.Fatalf("%d entries, want the eclipse of 17 August: %+v", len(es), es)
	}
	e := es[0]
	nearTime(t, "first contact", e.Start, "2027-08-17T05:24:29Z", 10*time.Second)
	nearTime(t, "last contact", e.End, "2027-08-17T09:03:12Z", 10*time.Second)
	if want := "Penumbral lunar eclipse: a slight dimming of the Moon (seen from moonrise)"; e.Title != want {
		t.Errorf("title %q, want %q", e.Title, want)
	}
	lines := strings.Split(e.Description, "\n")
	re := regexp.MustCompile(`^The Moon is above the horizon, so seen from the site, from moonrise at 07:36:2[67] UTC ` +
		`to the end of the eclipse at 09:03:(0\d|1[0-2]) UTC: 1 h 27 min of the eclipse's 3 h 3[89] min\.$`)
	if len(lines) < 2 || !re.MatchString(lines[1]) {
		t.Errorf("description's second line, want %s:\n%s", re, e.Description)
	}
}

// A solar eclipse the Sun both rises and sets during is titled so, not
// "(seen from sunrise)" as though the site saw it to its end: the partial
// eclipse of 14 January 2029 at 69.5° N, 82° W (Igloolik, Nunavut, in the
// short days of its winter). PyEphem 4.1.4 (pressure 0, the Sun's upper limb
// at −34′) has the Sun rise at 17:05:49 UT and set at 18:09:22 UT that day;
// 1 min, since the Sun grazes the horizon there.
func TestSolarEclipseRisesAndSets(t *testing.T) {
	s := site(t, "igloolik", 69.5, -82, "America/Iqaluit")
	es := eclipseEntries(t, s, "2029-01-14", "2029-01-14", "solar-eclipse")
	if len(es) != 1 || es[0].Facts.Eclipse == nil || es[0].Facts.Eclipse.Solar == nil {
		t.Fatalf("%d entries, want the solar eclipse of 14 January 2029: %+v", len(es), es)
	}
	e := es[0]
	hs := e.Facts.Eclipse.Solar.Horizon
	if len(hs) != 2 || hs[0].Direction != astro.Rising || hs[1].Direction != astro.Setting {
		t.Fatalf("the Sun's horizon events %+v, want a rising then a setting", hs)
	}
	nearTime(t, "sunrise", hs[0].Time, "2029-01-14T17:05:49Z", time.Minute)
	nearTime(t, "sunset", hs[1].Time, "2029-01-14T18:09:22Z", time.Minute)
	if want := " (the Sun rises and sets during it)"; !strings.HasSuffix(e.Title, want) {
		t.Errorf("title %q, want it to end %q", e.Title, want)
	}
	if lines := strings.Split(e.Description, "\n"); len(lines) < 2 || !strings.Contains(lines[1], " from sunrise at ") || !strings.Contains(lines[1], " to sunset at ") {
		t.Errorf("description's second line, want when the Sun is up, from sunrise to sunset:\n%s", e.Description)
	}
}

// The description's line of when an eclipse is seen names a time's date
// once, after the first time on it, as a span's end on its start's date is
// not marked again: the partial eclipse of 11–12 June 2029 at 66° N, 62° W
// (America/Iqaluit, EDT) begins on the evening of the 11th, and the Sun
// sets and rises again after midnight, at 04:00:36 and 04:14:55 UT (00:00:36
// and 00:14:55 EDT on the 12th; PyEphem 4.1.4, pressure 0, the Sun's upper
// limb at −34′; 2 min, since the Sun grazes the horizon there).
func TestEclipseSeenSaysDateOnce(t *testing.T) {
	s := site(t, "davis-strait", 66, -62, "America/Iqaluit")
	es := eclipseEntries(t, s, "2029-06-11", "2029-06-12", "solar-eclipse")
	if len(es) != 1 || es[0].Date != date("2029-06-11") || es[0].Facts.Eclipse == nil || es[0].Facts.Eclipse.Solar == nil {
		t.Fatalf("%d entries, want the solar eclipse of 11 June 2029: %+v", len(es), es)
	}
	e := es[0]
	hs := e.Facts.Eclipse.Solar.Horizon
	if len(hs) != 2 || hs[0].Direction != astro.Setting || hs[1].Direction != astro.Rising {
		t.Fatalf("the Sun's horizon events %+v, want a setting then a rising", hs)
	}
	nearTime(t, "sunset", hs[0].Time, "2029-06-12T04:00:36Z", 2*time.Minute)
	nearTime(t, "sunrise", hs[1].Time, "2029-06-12T04:14:55Z", 2*time.Minute)
	lines := strings.Split(e.Description, "\n")
	if len(lines) < 2 || strings.Count(lines[1], " the next day (Tue 12 Jun)") != 1 ||
		!regexp.MustCompile(` to sunset at 00:0\d:\d\d EDT the next day \(Tue 12 Jun\) and from sunrise at 00:1\d:\d\d EDT to `).MatchString(lines[1]) {
		t.Errorf("description's second line, want the next day named once, after sunset:\n%s", e.Description)
	}
}
