package config

import (
	"fmt"
	"testing"
	"time"
)

// A kind given twice in one list is found the same way for a feed's kinds
// and for `heliocal events --kinds` (both call KindsTwice), with one
// wording that names both entries: a group counts as its members, and a
// kind with another offset is another kind.
func TestKindsTwice(t *testing.T) {
	spec := func(name string, offset time.Duration) KindSpec {
		k, err := ParseKind(name)
		if err != nil {
			t.Fatal(err)
		}
		return KindSpec{Kind: k, Offset: Duration(offset)}
	}
	at := func(i int) string { return fmt.Sprintf("feeds[0].kinds[%d]", i) }
	for _, c := range []struct {
		specs      []KindSpec
		second     int // -1: none
		flag, feed string
	}{
		{[]KindSpec{spec("sunrise", 0), spec("sunset", 0), spec("sunrise", 0)}, 2,
			`"sunrise" listed twice`, `"sunrise" listed twice, also as feeds[0].kinds[0]`},
		{[]KindSpec{spec("seasons", 0), spec("june-solstice", 0)}, 1,
			`"june-solstice" listed twice, also in "seasons"`, `"june-solstice" listed twice, also in "seasons" at feeds[0].kinds[0]`},
		{[]KindSpec{spec("june-solstice", 0), spec("seasons", 0)}, 1,
			`"june-solstice" listed twice, also in "seasons"`, `"june-solstice" listed twice: as feeds[0].kinds[0] and in "seasons"`},
		{[]KindSpec{spec("moon-phases", 0), spec("moon-phases", 0)}, 1,
			`"moon-phases" listed twice`, `"moon-phases" listed twice, also as feeds[0].kinds[0]`},
		{[]KindSpec{spec("sunrise", 0), spec("sunrise", -30*time.Minute)}, -1, "", ""},
		{[]KindSpec{spec("golden-hour", 0), spec("sun-band:-4..6", 0), spec("blue-hour", 0)}, -1, "", ""},
	} {
		twice := KindsTwice(c.specs)
		if c.second < 0 {
			if len(twice) > 0 {
				t.Errorf("%v: %+v, want none", c.specs, twice)
			}
			continue
		}
		if len(twice) != 1 || twice[0].Second != c.second {
			t.Errorf("%v: %+v, want entry %d", c.specs, twice, c.second)
			continue
		}
		if got := twice[0].Msg(nil); got != c.flag {
			t.Errorf("flag: %q, want %q", got, c.flag)
		}
		if got := twice[0].Msg(at); got != c.feed {
			t.Errorf("feed: %q, want %q", got, c.feed)
		}
	}
	// every later entry that repeats one is reported, each once
	twice := KindsTwice([]KindSpec{spec("sunrise", 0), spec("sunrise", 0), spec("seasons", 0), spec("march-equinox", 0), spec("sunrise", 0)})
	if len(twice) != 3 || twice[0].Second != 1 || twice[1].Second != 3 || twice[2].Second != 4 || twice[2].First != 0 {
		t.Errorf("%+v", twice)
	}
	gh := KindsTwice([]KindSpec{spec("golden-hour", 0), spec("golden-hour", 0)})
	if len(gh) != 1 || gh[0].Hint(true) != `give each kind once, or give one an offset; for a second band of the Sun give it as a kind of its own, e.g. "sun-band:-4..8"` ||
		gh[0].Hint(false) != `give each kind once; for a second band of the Sun give it as a kind of its own, e.g. "sun-band:-4..8"` {
		t.Errorf("hints %q / %q", gh[0].Hint(true), gh[0].Hint(false))
	}
}
