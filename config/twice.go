package config

import (
	"strconv"
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
// listed twice`, `"june-solstice" listed twice, also in "seasons"`. at
// names an entry of the list by its index ("feeds[0].kinds[0]"); nil when
// the list has no such names (a flag's value). The message names the
// earlier entry as what it is: the kind itself (`"sunrise" listed twice,
// also as feeds[0].kinds[0]`) or a group giving it (`also in "seasons" at
// feeds[0].kinds[0]`); when the later entry is the group, both are named
// (`listed twice: as feeds[0].kinds[0] and in "seasons"`).
func (t KindTwice) Msg(at func(i int) string) string {
	m := strconv.Quote(t.Kind.String()) + " listed twice"
	first, second := t.Given[0], t.Given[1]
	switch {
	case first != t.Kind && at != nil: // the earlier entry is a group
		return m + ", also in " + strconv.Quote(first.String()) + " at " + at(t.First)
	case first != t.Kind:
		return m + ", also in " + strconv.Quote(first.String())
	case second != t.Kind && at != nil: // the later entry is a group
		return m + ": as " + at(t.First) + " and in " + strconv.Quote(second.String())
	case second != t.Kind:
		return m + ", also in " + strconv.Quote(second.String())
	case at != nil:
		return m + ", also as " + at(t.First)
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
