package publish

import (
	"html"
	"html/template"
	"strings"
)

// URLBreaks writes u as HTML text with a line-break opportunity (<wbr/>,
// closed, as the index page is well-formed XML) at its natural points, so
// that a long address wraps there rather than inside a word
// ("sky.exampl" / "e.net" under word-break: break-all): after a run of
// "/" ("https://", never between its slashes), after "." and "-" unless a
// digit follows (a decimal or a minus sign in a query: "47.8", "lat=-33"),
// after "," and before "?" and "&". The text is escaped; the opportunities
// only allow a break where a line is full, and nothing is added at either
// end.
func URLBreaks(u string) template.HTML {
	var b strings.Builder
	b.Grow(len(u) + len(u)/4)
	from := 0 // u[from:] is not written yet
	wbr := func(at int) {
		b.WriteString(html.EscapeString(u[from:at]))
		b.WriteString("<wbr/>")
		from = at
	}
	for i := 0; i < len(u); i++ {
		c := u[i]
		if (c == '?' || c == '&') && i > 0 {
			wbr(i)
		}
		if i+1 == len(u) {
			break
		}
		next := u[i+1]
		digit := next >= '0' && next <= '9'
		switch {
		case c == '/' && next != '/',
			(c == '.' || c == '-') && !digit,
			c == ',':
			wbr(i + 1)
		}
	}
	b.WriteString(html.EscapeString(u[from:]))
	return template.HTML(b.String())
}
