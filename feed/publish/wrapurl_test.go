package publish

import (
	"strings"
	"testing"
)

// An address breaks only at its natural points: after "/" (not inside
// "//"), "." and "-", after ",", before "?" and "&"; never inside a word,
// a decimal or after a minus sign; its text stays the address, escaped.
func TestURLBreaks(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"https://sky.example.net/cal/ice-camp-sun.ics",
			"https://<wbr/>sky.<wbr/>example.<wbr/>net/<wbr/>cal/<wbr/>ice-<wbr/>camp-<wbr/>sun.<wbr/>ics"},
		{"http://127.0.0.1:8080/a.ics", "http://<wbr/>127.0.0.1:8080/<wbr/>a.<wbr/>ics"},
		{"https://h.net/at?lat=-33.45&kinds=sunrise,sunset",
			"https://<wbr/>h.<wbr/>net/<wbr/>at<wbr/>?lat=-33.45<wbr/>&amp;kinds=sunrise,<wbr/>sunset"},
		{`x"<'>`, "x&#34;&lt;&#39;&gt;"},
		{"", ""},
	} {
		got := string(URLBreaks(tc.in))
		if got != tc.want {
			t.Errorf("URLBreaks(%q) = %q, want %q", tc.in, got, tc.want)
		}
		if plain := strings.ReplaceAll(got, "<wbr/>", ""); plain != strings.NewReplacer("&", "&amp;", `"`, "&#34;", "<", "&lt;", "'", "&#39;", ">", "&gt;").Replace(tc.in) {
			t.Errorf("URLBreaks(%q) without its breaks is %q", tc.in, plain)
		}
	}
}
