package publish

import (
	"context"
	"os"
	"testing"
	"time"

	"heliocal/astro"
	"heliocal/feed"
)

func TestScratchDump(t *testing.T) {
	eph, err := astro.NewEphemeris(time.Date(2026, 12, 1, 0, 0, 0, 0, time.UTC), time.Date(2028, 1, 5, 0, 0, 0, 0, time.UTC))
	if err != nil {
		t.Fatal(err)
	}
	opts := testOptions()
	opts.Charts = func(_ context.Context, s feed.Site) (*SiteChart, error) {
		c, err := astroChart(eph, s, 2027)
		if err == nil {
			c.Levels = []Level{{12 * time.Hour, ""}, {14*time.Hour + 30*time.Minute, ""}}
			cq, _ := astro.CrossQuarters(2027)
			for _, x := range cq {
				c.Marks = append(c.Marks, Mark{At: x, Label: "Cross-quarter day"})
			}
			p, _, _ := astro.Perihelion(2027)
			a, _, _ := astro.Aphelion(2027)
			c.Marks = append(c.Marks, Mark{At: p, Label: "Perihelion"}, Mark{At: a, Label: "Aphelion"})
		}
		return c, err
	}
	b, err := Render(context.Background(), Calendars(testCalendars(t, "")...), opts)
	if err != nil {
		t.Fatal(err)
	}
	os.WriteFile("/tmp/index.html", b.File("index.html").Data, 0o644)
}
