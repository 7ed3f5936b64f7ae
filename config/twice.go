package config

import (
	"strconv"
	"strings"
)

// KindTwice is a kind that two entries of one list give: a feed's kinds or
// the kinds of `heliocal events --kinds`. A group counts as its members
// ("seasons" gives june-solstice), and a kind with another offset is
// another kind.
type KindTwice struct {
	First, Second int     // the two entries, First < Second
	Kind          Kind    // the kind both give (the entry itself when both are the same)
	Given         [2]Kind // the two entries as written: a kind or a group
}

// KindsTwice returns, for each entry of specs that gives a kind an earlier
// entry gives, the first such kind, in the order of the entries; none when
// every kind is given once.
func KindsTwice(specs []KindSpec) []KindTwice {
	type key struct {
		kind   Kind
		offset Duration
	}
	var out []KindTwice
	seen := map[key]int{}
	for j, ks := range specs {
		for _, m := range ks.Kind.Members() {
			if m.IsZero() {
				continue
			}
			k := key{m, ks.Offset}
			if i, dup := seen[k]; dup {
				t := KindTwice{First: i, Second: j, Kind: m, Given: [2]Kind{specs[i].Kind, ks.Kind}}
				if t.Given[0] == t.Given[1] { // one kind or group, twice
					t.Kind = ks.Kind
				}
				out = append(out, t)
				break
			}
			seen[k] = j
		}
	}
	return out
}

// Msg is what is wrong, one wording wherever kinds are listed: `"sunrise"
// listed twice`, `"june-solstice" listed twice (also in "seasons")`. at
// names an entry of the list by its index ("feeds[0].kinds[0]"); nil when
// the list has no such names (a flag's value).
func (t KindTwice) Msg(at func(i int) string) string {
	var also []string
	if at != nil {
		also = append(also, at(t.First))
	}
	group := t.Given[0] // the entry that gives the kind without being it
	if group == t.Kind {
		group = t.Given[1]
	}
	if group != t.Kind {
		also = append(also, strconv.Quote(group.String()))
	}
	m := strconv.Quote(t.Kind.String()) + " listed twice"
	if len(also) > 0 {
		m += " (also in " + strings.Join(also, ", ") + ")"
	}
	return m
}

// Hint is how to mend it; offsets says the list's entries take an offset
// (a feed's kinds), which makes a kind another one.
func (t KindTwice) Hint(offsets bool) string {
	h := "give each kind once"
	if offsets {
		h += ", or give one an offset"
	}
	if t.Kind.Name == "golden-hour" || t.Kind.Name == "blue-hour" {
		h += `; for a second band of the Sun give it as a kind of its own, e.g. "sun-band:-4..8"`
	}
	return h
}
