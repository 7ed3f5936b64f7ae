package publish

import (
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
	for i := 0; i < len(u); i++ {
		c := u[i]
		if (c == '?' || c == '&') && i > 0 {
			b.WriteString("<wbr/>")
		}
		switch c {
		case '&':
			b.WriteString("&amp;")
		case '<':
			b.WriteString("&lt;")
		case '>':
			b.WriteString("&gt;")
		case '"':
			b.WriteString("&#34;")
		case '\'':
			b.WriteString("&#39;")
		default:
			b.WriteByte(c)
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
			b.WriteString("<wbr/>")
		}
	}
	return template.HTML(b.String())
}
