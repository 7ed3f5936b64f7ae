package publish

import (
	"regexp"
	"strings"
)

// The spaces KeepUnits makes no-break: between a number and its unit
// ("16 h", "45 min", "+1 day") and between the hours and the minutes of
// one length ("9 h 05 min").
var (
	unitSpace  = regexp.MustCompile(`(\d) (h|min|s|days?|k?m)\b`)
	hourMinute = regexp.MustCompile("(\\d\u00a0h) (\\d+\u00a0min)")
)

// KeepUnits joins the amounts of a text of the HTML pages (this package's
// index page; feed/serve's page /at) with no-break spaces (U+00A0), so that
// a narrow screen does not put "16" at the end of one line and "h" on the
// next; the feeds, JSON and CSV keep their plain spaces. feed/serve's
// builder.js has its twin for the builder's preview.
func KeepUnits(s string) string {
	if !strings.Contains(s, " ") {
		return s
	}
	return hourMinute.ReplaceAllString(unitSpace.ReplaceAllString(s, "$1\u00a0$2"), "$1\u00a0$2")
}
