package publish

import (
	"context"
	"regexp"
	"strings"
	"testing"

	"heliocal/feed"
)

// A number and its unit, and the hours and minutes of one length, are
// joined by no-break spaces (U+00A0); other spaces and words stay.
func TestKeepUnits(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"Daylight 6 h 17 min", "Daylight 6\u00a0h\u00a017\u00a0min"},
		{"to reach 16 h on 5 Jun", "to reach 16\u00a0h on 5\u00a0Jun"},
		{"from 5 Dec 2026 to 4 Dec 2027 (21 June)", "from 5\u00a0Dec\u00a02026 to 4\u00a0Dec\u00a02027 (21\u00a0June)"},
		{"night of 12–13 February 2027, May 2026", "night of 12–13\u00a0February\u00a02027, May\u00a02026"},
		{"5 Mayor 2026, 5 Decembers, Junk 2026, Dec 20265, xDec 2026, 3 may", "5 Mayor 2026, 5 Decembers, Junk 2026, Dec 20265, xDec 2026, 3 may"},
		{"Lamp periods on 176 days, +1 day", "Lamp periods on 176\u00a0days, +1\u00a0day"},
		{"elevation 240 m, 1.5 km away, 30 s", "elevation 240\u00a0m, 1.5\u00a0km away, 30\u00a0s"},
		{"12 hours, 3 minutes, 5 mice, 2026 spring", "12 hours, 3 minutes, 5 mice, 2026 spring"},
		{"h 12", "h 12"},
		{"", ""},
	} {
		if got := KeepUnits(tc.in); got != tc.want {
			t.Errorf("KeepUnits(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

// plainAmount is a number and its unit apart with a plain space, the break
// a narrow screen may put between them.
var plainAmount = regexp.MustCompile(`\d (h|min|s|days?|k?m)\b`)

// The index page joins the amounts of the charts' captions and of the
// feeds' descriptions; the feeds and feeds.json keep the plain spaces of
// their bytes.
func TestIndexKeepsUnits(t *testing.T) {
	cals := testCalendars(t, "")
	opts := testOptions()
	opts.Charts = func(_ context.Context, s feed.Site, _ []Trimmed) (*SiteChart, error) { return usnoChart(t, s), nil }
	opts.Page = &PageText{Intro: "Lamps run up to 16 h.", Descriptions: map[string]string{cals[0].ID: "The seedling house is lit up to 14 h 30 min."}}
	b, err := Render(context.Background(), Calendars(cals...), opts)
	if err != nil {
		t.Fatal(err)
	}
	page := string(b.File(IndexName).Data)
	for _, want := range []string{"up to 16\u00a0h.", "up to 14\u00a0h\u00a030\u00a0min."} {
		if !strings.Contains(page, want) {
			t.Errorf("the index lacks %q", want)
		}
	}
	captions := regexp.MustCompile(`(?s)<figcaption>.*?</figcaption>`).FindAllString(page, -1)
	if len(captions) == 0 || !strings.Contains(captions[0], "\u00a0h") {
		t.Fatalf("no caption with an amount: %d captions", len(captions))
	}
	for _, c := range captions {
		if m := plainAmount.FindString(c); m != "" {
			t.Errorf("a caption keeps a plain space in %q", m)
		}
	}
	for _, f := range b.Files {
		if f.Name != IndexName && strings.Contains(string(f.Data), "\u00a0") {
			t.Errorf("%s has a no-break space", f.Name)
		}
	}
}

// keepUnitsRE is KeepUnits written as the regular expressions of its twin
// in feed/serve's builder.js, which the page's preview runs.
func keepUnitsRE(s string) string {
	unit := regexp.MustCompile(`(\d) (h|min|s|days?|k?m)\b`)
	hm := regexp.MustCompile("(\\d\u00a0h) (\\d+\u00a0min)")
	const month = `(January|February|March|April|May|June|July|August|September|October|November|December|Jan|Feb|Mar|Apr|Jun|Jul|Aug|Sep|Oct|Nov|Dec)\b`
	day := regexp.MustCompile(`(\d) ` + month)
	year := regexp.MustCompile(`\b` + month + ` (\d{4})\b`)
	s = hm.ReplaceAllString(unit.ReplaceAllString(s, "$1\u00a0$2"), "$1\u00a0$2")
	return year.ReplaceAllString(day.ReplaceAllString(s, "$1\u00a0$2"), "$1\u00a0$2")
}

// KeepUnits joins the same spaces as builder.js's keepUnits, so that the
// page /at and the builder's preview break their lines alike.
func FuzzKeepUnitsAsBuilder(f *testing.F) {
	for _, s := range []string{
		"Daylight 6 h 17 min", "Lamps on for 6 h 44 min, to reach 16 h", "Lamp periods on 176 days, +1 day",
		"elevation 240 m, 1.5 km away, 30 s", "12 hours, 3 minutes, 5 mice, 2026 spring", "h 12", "",
		"9 h 05 mins", "1 h 2 h 3 min", "5 ms 6 kms 7 m_ 8 m\u00e9", "9\u00a0h 05\u00a0min", "3 h 4 minutes 5 h 6",
		"2 days 3 dayx 4 s", "1 h 05 min 55 s", " 1", "1 ",
		"from 5 Dec 2026 to 4 Dec 2027", "21 June", "5 Mayor 2026", "Dec 20265", "xDec 2026", "12–13 February 2027",
		"5 May 2026 2027", "1 Jun 1 Jul 2027 h", "3 Dec\u00a02026", "May 2026 5 m",
	} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		if got, want := KeepUnits(s), keepUnitsRE(s); got != want {
			t.Errorf("KeepUnits(%q) = %q, builder.js's keepUnits writes %q", s, got, want)
		}
	})
}

func BenchmarkKeepUnits(b *testing.B) {
	const caption = "Daylight 9 h 05 min on 5 Jun, 16 h 30 min at most; lamps on for 6 h 44 min, to reach 16 h, on 176 days."
	for b.Loop() {
		KeepUnits(caption)
	}
}
