package ical

import (
	"bytes"
	"testing"

	goical "github.com/emersion/go-ical"

	"heliocal/feed"
)

// FuzzEncodeText: whatever text a feed carries, the output passes the strict
// checker and the independent parser reads back the same text after the
// promised normalisation (valid UTF-8, LF newlines, no other controls).
func FuzzEncodeText(f *testing.F) {
	for _, s := range [][3]string{
		{"Sunrise", "Upper limb; refraction 34'", "Sun"},
		{"a,b;c\\d", "line\r\nline\rline\nend", "Dawn, civil"},
		{"🌅🌄🌇" + string(make([]byte, 3)), "\x00\x1b\x7f\u0085\u2028", ";,\\"},
		{"\xff\xfe invalid", "é" + string(bytes.Repeat([]byte("日"), 40)), "\t"},
		{"", "", ""},
	} {
		f.Add(s[0], s[1], s[2])
	}
	loc := mustLoad(f, "Europe/Vienna")
	f.Fuzz(func(t *testing.T, summary, description, category string) {
		c := &feed.Calendar{ID: "fuzz", Title: summary, Description: description,
			Site:        feed.Site{ID: "s", Name: category, Latitude: 48.2, Longitude: 16.4, Location: loc},
			WindowStart: utc(2026, 3, 1, 0, 0, 0), WindowEnd: utc(2026, 4, 1, 0, 0, 0), Stamp: utc(2026, 3, 1, 0, 0, 0),
			Entries: []feed.Entry{{UID: "fuzz@t", Title: summary, Description: description,
				Categories: []string{category, "Sun"}, Start: utc(2026, 3, 29, 0, 30, 0), End: utc(2026, 3, 29, 1, 30, 0)}},
			Alarm: 1,
		}
		data, err := Marshal(c, Options{})
		if err != nil {
			t.Fatal(err)
		}
		for _, p := range checkStrict(data) {
			t.Errorf("strict: %s", p)
		}
		gcal, err := goical.NewDecoder(bytes.NewReader(data)).Decode()
		if err != nil {
			t.Fatalf("go-ical: %v", err)
		}
		ev := gcal.Events()[0]
		text := func(p *goical.Prop) string {
			if p == nil {
				return ""
			}
			s, err := p.Text()
			if err != nil {
				t.Fatalf("%s: %v", p.Name, err)
			}
			return s
		}
		for name, want := range map[string]string{goical.PropSummary: summary, goical.PropDescription: description,
			goical.PropLocation: category} {
			if got := text(ev.Props.Get(name)); got != normText(want) {
				t.Errorf("%s: got %q, want %q", name, got, normText(want))
			}
		}
		if got := text(gcal.Props.Get("X-WR-CALNAME")); got != normText(summary) {
			t.Errorf("X-WR-CALNAME: got %q, want %q", got, normText(summary))
		}
		cats, err := ev.Props.Get(goical.PropCategories).TextList()
		if err != nil {
			t.Fatal(err)
		}
		want := []string{"Sun"}
		if n := normText(category); n != "" {
			want = []string{n, "Sun"}
		}
		if len(cats) != len(want) || cats[0] != want[0] || cats[len(cats)-1] != "Sun" {
			t.Errorf("CATEGORIES %q, want %q", cats, want)
		}
		if s, e := ev.DateTimeStart(nil); e != nil || !s.Equal(utc(2026, 3, 29, 0, 30, 0)) {
			t.Errorf("DTSTART %s %v", s, e)
		}
	})
}
