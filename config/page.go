package config

import (
	"fmt"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Lengths of the page texts, in characters.
var pageLimits = []struct {
	key string
	max int
	get func(*Page) string
}{
	{"title", 120, func(p *Page) string { return p.Title }},
	{"intro", 1000, func(p *Page) string { return p.Intro }},
	{"contact", 300, func(p *Page) string { return p.Contact }},
	{"caution", 2000, func(p *Page) string { return p.Caution }},
}

func (p *Page) validate(ps *problems) {
	for _, l := range pageLimits {
		v := l.get(p)
		if n := utf8.RuneCountInString(v); n > l.max {
			ps.add("page."+l.key, v, fmt.Sprintf("has %d characters, more than %d", n, l.max), "keep it short: it is shown on the page")
			continue
		}
		if !utf8.ValidString(v) || strings.IndexFunc(v, func(r rune) bool { return unicode.IsControl(r) && r != '\n' }) >= 0 {
			ps.add("page."+l.key, v, "contains a control character", "plain text only")
		}
	}
}
