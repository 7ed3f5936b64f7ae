package feed

import (
	"context"
	"reflect"
	"strings"
	"testing"
	"time"

	"heliocal/config"
)

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
