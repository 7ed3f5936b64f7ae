package feed

import (
	"context"
	"reflect"
	"strings"
	"testing"
	"time"

	"heliocal/config"
)

// A calendar's descriptions, titles and UIDs are substrings of memory that
// Release hands to the next calendar, cleared (slicePool.putUsed): a string used
// after Release reads NUL bytes, here and in every other package's tests,
// instead of passing by chance while the memory waits unused.
func TestReleaseOverwritesText(t *testing.T) {
	s := site(t, "release", 48.2, 16.4, "Europe/Vienna")
	sk := sky(t, "2027-01-01", "2027-01-31")
	f := &config.Feed{ID: "release", Site: s.ID}
	for _, k := range mustKinds(t, "sunrise", "sunset") {
		f.Kinds = append(f.Kinds, config.KindSpec{Kind: k})
	}
	cal, err := sk.Calendar(context.Background(), s, f, date("2027-01-02"), date("2027-01-30"), Options{})
	if err != nil {
		t.Fatal(err)
	}
	desc, uid := cal.Entries[0].Description, cal.Entries[0].UID
	if !strings.HasPrefix(desc, "Sunrise at ") {
		t.Fatalf("first description = %q, want a sunrise", desc)
	}
	cal.Release()
	if strings.Trim(desc, "\x00") != "" || strings.Trim(uid, "\x00") != "" {
		t.Errorf("after Release the kept description reads %q and the UID %q: Release must clear the text it hands back", desc, uid)
	}
}

// A feed's plans write their texts into the calendar's buffer after the
// kinds' (planEntries with the buffer of entries): the same texts as the
// plans alone get (PlanEntries, which copies them), and handed back with
// the rest on Release.
func TestPlanTextInCalendarBuffer(t *testing.T) {
	s := site(t, "plans", 48.2, 16.4, "Europe/Vienna")
	sk := sky(t, "2027-01-01", "2027-03-31")
	f := &config.Feed{ID: "plans", Site: s.ID, Kinds: []config.KindSpec{{Kind: mustKinds(t, "sunrise")[0]}},
		Plans: []config.Plan{{Title: "Walk", Date: "every saturday", Start: "sunrise+30m", For: config.Duration(time.Hour)}}}
	first, last := date("2027-01-15"), date("2027-02-15")
	cal, err := sk.Calendar(context.Background(), s, f, first, last, Options{})
	if err != nil {
		t.Fatal(err)
	}
	alone, err := sk.PlanEntries(context.Background(), s, f.ID, f.Plans, first, last)
	if err != nil {
		t.Fatal(err)
	}
	var kept []string // the plans' descriptions as the calendar has them
	for _, e := range cal.Entries {
		if e.Kind != KindPlan {
			continue
		}
		if len(kept) >= len(alone) {
			t.Fatalf("more plan entries in the calendar than the %d of the plans alone", len(alone))
		}
		a := alone[len(kept)]
		if e.UID != a.UID || e.Description != a.Description || e.Title != a.Title {
			t.Errorf("plan entry %d: %q %q, alone %q %q", len(kept), e.UID, e.Description, a.UID, a.Description)
		}
		kept = append(kept, e.Description)
	}
	// Saturdays 16, 23 and 30 January, 6 and 13 February 2027 (the
	// Gregorian calendar)
	if len(kept) != 5 || len(alone) != 5 {
		t.Fatalf("%d plan entries in the calendar, %d alone, want 5", len(kept), len(alone))
	}
	cal.Release()
	for _, d := range kept {
		if strings.Trim(d, "\x00") != "" {
			t.Errorf("after Release a plan's description reads %q: it is not in the calendar's text", d)
		}
	}
}

// The descriptions and UIDs of a released calendar's entries live in a
// buffer the next calendar writes over (Calendar.Release): a calendar
// built after another was released has its own texts, as a calendar built
// alone has them.
func TestReleasedTextIsNotShared(t *testing.T) {
	cfg, err := config.Parse(strings.NewReader(`
sites:
  - {id: vale, name: Invented vale, latitude: 47.3, longitude: 8.5, elevation: 400, timezone: Europe/Zurich}
  - {id: cape, name: Invented cape, latitude: -33.9, longitude: 18.4, elevation: 10, timezone: Africa/Johannesburg}
feeds:
  - {id: vale-sun, title: Vale sun, site: vale, days_back: 0, days_ahead: 40, kinds: [sunrise, sunset, civil-dawn]}
  - {id: cape-sun, title: Cape sun, site: cape, days_back: 0, days_ahead: 40, kinds: [sunrise, golden-hour]}
`), "yaml")
	if err != nil {
		t.Fatal(err)
	}
	opts := Options{Now: time.Date(2027, 3, 20, 12, 0, 0, 0, time.UTC)}
	build := func(i int) *Calendar {
		cat, err := NewCatalogue(cfg, opts)
		if err != nil {
			t.Fatal(err)
		}
		c, err := cat.Calendar(context.Background(), &cfg.Feeds[i])
		if err != nil {
			t.Fatal(err)
		}
		return c
	}
	texts := func(c *Calendar) []string {
		var out []string
		for _, e := range c.Entries {
			out = append(out, strings.Clone(e.UID), strings.Clone(e.Description))
		}
		return out
	}
	alone := texts(build(1))
	first := build(0)
	firstTexts := texts(first)
	first.Release()
	second := build(1)
	if got := texts(second); !reflect.DeepEqual(got, alone) {
		t.Error("a calendar built after another was released differs from the same calendar built alone")
	}
	third := build(0) // may take the second's buffer only once it is released
	if got := texts(second); !reflect.DeepEqual(got, alone) {
		t.Error("building a calendar changed the texts of one not released")
	}
	if got := texts(third); !reflect.DeepEqual(got, firstTexts) {
		t.Error("the same calendar built twice differs")
	}
}
