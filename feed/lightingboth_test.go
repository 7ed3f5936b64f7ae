package feed

import (
	"context"
	"regexp"
	"strings"
	"testing"
	"time"

	"heliocal/config"
)

// With lamps: both each period's description names the date's other
// period, with its clock times as its title writes them and its length,
// so that the natural day and the two lengths read alone add up to the
// target. Ithaca, NY, 1 January 2015, USNO (rows sun-0001 and sun-0002 of
// testdata/reference/sun-times.csv): sunrise 08:36, sunset 17:44 in UTC−4,
// where the morning lamps end and the evening lamps begin (±1 min: the
// table rounds to the minute). Over the year every pair names each other,
// and lamps: evening names no morning period.
func TestLightingBothNamesTheOtherPeriod(t *testing.T) {
	rise, set, s := ithacaDay(t, "2015-01-01")
	sk := sky(t, "2015-01-01", "2015-12-31")
	entries := func(lamps string, first, last string) []Entry {
		spec := lightingSpec(t, "lighting:16h", func(ks *config.KindSpec) { ks.Lamps = lamps })
		es, err := sk.Entries(context.Background(), s, "f", []config.KindSpec{spec}, date(first), date(last))
		if err != nil {
			t.Fatal(err)
		}
		return es
	}
	es := entries(config.LampsBoth, "2015-01-01", "2015-01-01")
	if len(es) != 2 {
		t.Fatalf("%d entries, want a morning and an evening period", len(es))
	}
	// "; evening lamps 17:44–22:13, 4 h 29 min"; "; morning lamps 03:32–08:36, …"
	other := regexp.MustCompile(`; (morning|evening) lamps (\d\d:\d\d)–(\d\d:\d\d), (\d+ h \d\d min|\d+ min)\)`)
	m, e := other.FindStringSubmatch(es[0].Description), other.FindStringSubmatch(es[1].Description)
	if m == nil || e == nil || m[1] != "evening" || e[1] != "morning" {
		t.Fatalf("descriptions do not name the other period:\n%s\n%s", es[0].Description, es[1].Description)
	}
	clock := func(s string) time.Time {
		c, _ := time.Parse("15:04", s)
		return time.Date(2015, 1, 1, c.Hour(), c.Minute(), 0, 0, rise.Location())
	}
	if !near(clock(m[2]), set, time.Minute) || !near(clock(e[3]), rise, time.Minute) {
		t.Errorf("the morning names the evening from %s, the evening the morning to %s; want USNO's sunset %s and sunrise %s",
			m[2], e[3], set.Format("15:04"), rise.Format("15:04"))
	}
	year := entries(config.LampsBoth, "2015-01-01", "2015-12-31")
	title := regexp.MustCompile(`^Lamps on (\d\d:\d\d–\d\d:\d\d(?: \+1 day)?) \(([^,;]+)[,;]`)
	pairs := 0
	for i := 0; i+1 < len(year); i++ {
		a, b := year[i], year[i+1]
		if a.Date != b.Date || a.Facts.Part != partMorning || b.Facts.Part != partEvening {
			continue
		}
		pairs++
		ta, tb := title.FindStringSubmatch(a.Title), title.FindStringSubmatch(b.Title)
		if ta == nil || tb == nil {
			t.Fatalf("%s: titles %q, %q", a.Date.Format(time.DateOnly), a.Title, b.Title)
		}
		if want := "; evening lamps " + tb[1] + ", " + tb[2] + ")"; !strings.Contains(a.Description, want) {
			t.Errorf("%s: the morning's description does not hold %q:\n%s", a.Date.Format(time.DateOnly), want, a.Description)
		}
		if want := "; morning lamps " + ta[1] + ", " + ta[2] + ")"; !strings.Contains(b.Description, want) {
			t.Errorf("%s: the evening's description does not hold %q:\n%s", b.Date.Format(time.DateOnly), want, b.Description)
		}
	}
	if pairs < 100 {
		t.Errorf("%d dates with both periods, want the winter half of the year", pairs)
	}
	for _, x := range entries(config.LampsEvening, "2015-01-01", "2015-12-31") {
		if strings.Contains(x.Description, "morning lamps") || strings.Contains(x.Description, "evening lamps ") {
			t.Fatalf("lamps: evening names another period: %s", x.Description)
		}
	}
}
