package ical

// A strict RFC 5545 checker, written for the tests independently of the
// encoder: it reads the bytes the way a validator would and reports every
// rule it finds broken. Sources: RFC 5545 §3.1 (lines, folding), §3.2
// (parameters), §3.3 (value types), §3.6 (components), §3.8 (properties);
// RFC 7986 §5 (calendar properties).

import (
	"bytes"
	"fmt"
	"regexp"
	"sort"
	"strings"
	"time"
	"unicode/utf8"
)

// prop is one unfolded content line.
type prop struct {
	Name   string
	Params map[string][]string
	Value  string
	Line   int // first physical line, 1-based
}

func (p *prop) param(name string) string {
	if v := p.Params[name]; len(v) > 0 {
		return v[0]
	}
	return ""
}

// comp is a parsed component.
type comp struct {
	Name     string
	Props    []*prop
	Children []*comp
}

func (c *comp) all(name string) []*prop {
	var r []*prop
	for _, p := range c.Props {
		if p.Name == name {
			r = append(r, p)
		}
	}
	return r
}

func (c *comp) get(name string) *prop {
	if ps := c.all(name); len(ps) > 0 {
		return ps[0]
	}
	return nil
}

func (c *comp) children(name string) []*comp {
	var r []*comp
	for _, ch := range c.Children {
		if ch.Name == name {
			r = append(r, ch)
		}
	}
	return r
}

// parseStrict checks the physical form of data and parses it into components.
// It returns the VCALENDAR (nil if unusable) and every problem found.
func parseStrict(data []byte) (*comp, []string) {
	var probs []string
	bad := func(line int, format string, args ...any) {
		probs = append(probs, fmt.Sprintf("line %d: ", line)+fmt.Sprintf(format, args...))
	}
	if bytes.HasPrefix(data, []byte("\xef\xbb\xbf")) {
		bad(1, "starts with a byte order mark")
	}
	if !utf8.Valid(data) {
		bad(0, "not valid UTF-8")
	}
	if !bytes.HasSuffix(data, []byte("END:VCALENDAR\r\n")) {
		bad(0, "does not end with END:VCALENDAR CRLF (or has content after it)")
	}
	phys := strings.Split(string(data), "\r\n")
	if len(phys) > 0 && phys[len(phys)-1] == "" {
		phys = phys[:len(phys)-1]
	}
	type logical struct {
		text  string
		line  int
		parts []string // continuation pieces, joined after the scan
	}
	var lines []logical
	for i, l := range phys {
		n := i + 1
		if strings.ContainsAny(l, "\r\n") {
			bad(n, "bare CR or LF (lines must end in CRLF)")
		}
		if len(l) > 75 {
			bad(n, "%d octets (more than 75)", len(l))
		}
		if !utf8.ValidString(l) {
			bad(n, "fold splits a UTF-8 sequence (%q)", l)
		}
		if l == "" {
			bad(n, "empty line")
			continue
		}
		if l[0] == ' ' || l[0] == '\t' {
			if len(lines) == 0 {
				bad(n, "continuation line first")
				continue
			}
			last := &lines[len(lines)-1]
			last.parts = append(last.parts, l[1:])
			continue
		}
		lines = append(lines, logical{text: l, line: n})
	}
	for i := range lines {
		if len(lines[i].parts) > 0 {
			lines[i].text += strings.Join(lines[i].parts, "")
		}
	}
	var stack []*comp
	var root *comp
	for _, l := range lines {
		for _, r := range l.text {
			if r < 0x20 && r != '\t' || r == 0x7f {
				bad(l.line, "control character %U in %q", r, l.text)
			}
		}
		p, err := parseLine(l.text)
		if err != nil {
			bad(l.line, "%v", err)
			continue
		}
		p.Line = l.line
		switch p.Name {
		case "BEGIN":
			c := &comp{Name: p.Value}
			if len(stack) == 0 {
				if root != nil {
					bad(l.line, "second top-level component %s", p.Value)
				}
				root = c
			} else {
				top := stack[len(stack)-1]
				top.Children = append(top.Children, c)
			}
			stack = append(stack, c)
		case "END":
			if len(stack) == 0 || stack[len(stack)-1].Name != p.Value {
				bad(l.line, "unbalanced END:%s", p.Value)
				continue
			}
			stack = stack[:len(stack)-1]
		default:
			if len(stack) == 0 {
				bad(l.line, "property %s outside any component", p.Name)
				continue
			}
			top := stack[len(stack)-1]
			if len(top.Children) > 0 {
				bad(l.line, "property %s after a sub-component of %s", p.Name, top.Name)
			}
			top.Props = append(top.Props, p)
		}
	}
	if len(stack) != 0 {
		bad(0, "unterminated %s", stack[len(stack)-1].Name)
	}
	if root == nil || root.Name != "VCALENDAR" {
		bad(0, "no VCALENDAR")
		return nil, probs
	}
	return root, probs
}

var nameRE = regexp.MustCompile(`^[A-Za-z0-9-]+$`)

// parseLine splits a content line into name, parameters and value
// (RFC 5545 §3.1 contentline, §3.2 param-value: quoted-string or paramtext).
func parseLine(s string) (*prop, error) {
	i := strings.IndexAny(s, ";:")
	if i <= 0 {
		return nil, fmt.Errorf("malformed content line %q", s)
	}
	p := &prop{Name: strings.ToUpper(s[:i]), Params: map[string][]string{}}
	if !nameRE.MatchString(p.Name) {
		return nil, fmt.Errorf("bad property name %q", p.Name)
	}
	s = s[i:]
	for s[0] == ';' {
		s = s[1:]
		eq := strings.IndexByte(s, '=')
		if eq <= 0 || !nameRE.MatchString(s[:eq]) {
			return nil, fmt.Errorf("%s: malformed parameter in %q", p.Name, s)
		}
		pname := strings.ToUpper(s[:eq])
		s = s[eq+1:]
		for {
			var v string
			if strings.HasPrefix(s, `"`) {
				end := strings.IndexByte(s[1:], '"')
				if end < 0 {
					return nil, fmt.Errorf("%s: unterminated quoted parameter value", p.Name)
				}
				v, s = s[1:1+end], s[2+end:]
			} else {
				end := strings.IndexAny(s, `;:,"`)
				if end < 0 {
					return nil, fmt.Errorf("%s: parameter without value", p.Name)
				}
				if s[end] == '"' {
					return nil, fmt.Errorf("%s: DQUOTE inside unquoted parameter value", p.Name)
				}
				v, s = s[:end], s[end:]
			}
			if strings.Contains(v, `\`) {
				return nil, fmt.Errorf("%s: parameter %s value %q has a backslash (parameter values are quoted, never escaped)", p.Name, pname, v)
			}
			p.Params[pname] = append(p.Params[pname], v)
			if s == "" {
				return nil, fmt.Errorf("%s: no value", p.Name)
			}
			if s[0] != ',' {
				break
			}
			s = s[1:]
		}
		if s[0] != ';' && s[0] != ':' {
			return nil, fmt.Errorf("%s: unexpected %q after parameter", p.Name, s[0])
		}
	}
	p.Value = s[1:]
	return p, nil
}

// unescapeText decodes a TEXT value, or a TEXT list when list is true
// (RFC 5545 §3.3.11). Unescaped ";" is an error; so is an unescaped "," in a
// single value.
func unescapeText(v string, list bool) ([]string, error) {
	var out []string
	var b strings.Builder
	for i := 0; i < len(v); i++ {
		switch c := v[i]; c {
		case '\\':
			i++
			if i == len(v) {
				return nil, fmt.Errorf("backslash at end of %q", v)
			}
			switch v[i] {
			case '\\', ';', ',':
				b.WriteByte(v[i])
			case 'n', 'N':
				b.WriteByte('\n')
			default:
				return nil, fmt.Errorf("invalid escape \\%c in %q", v[i], v)
			}
		case ';':
			return nil, fmt.Errorf("unescaped ';' in %q", v)
		case ',':
			if !list {
				return nil, fmt.Errorf("unescaped ',' in %q", v)
			}
			out = append(out, b.String())
			b.Reset()
		default:
			b.WriteByte(c)
		}
	}
	return append(out, b.String()), nil
}

var (
	geoRE      = regexp.MustCompile(`^-?[0-9]+(\.[0-9]{1,6})?;-?[0-9]+(\.[0-9]{1,6})?$`)
	offsetRE   = regexp.MustCompile(`^[+-][0-9]{4}([0-9]{2})?$`)
	durationRE = regexp.MustCompile(`^[+-]?P([0-9]+W|([0-9]+D)?(T([0-9]+H([0-9]+M([0-9]+S)?)?|[0-9]+M([0-9]+S)?|[0-9]+S))?)$`)
	dateRE     = regexp.MustCompile(`^[0-9]{8}$`)
	dateTimeRE = regexp.MustCompile(`^[0-9]{8}T[0-9]{6}Z?$`)
)

// textProps are single TEXT values; listProps are TEXT lists.
var (
	textProps = map[string]bool{"SUMMARY": true, "DESCRIPTION": true, "LOCATION": true, "NAME": true,
		"X-WR-CALNAME": true, "X-WR-CALDESC": true, "TZNAME": true, "UID": true, "PRODID": true}
	listProps = map[string]bool{"CATEGORIES": true}
	uriProps  = map[string]bool{"URL": true, "SOURCE": true, "TZURL": true}
)

// checkStrict runs every rule on data and returns the problems, sorted.
func checkStrict(data []byte) []string {
	cal, probs := parseStrict(data)
	bad := func(p *prop, format string, args ...any) {
		line := 0
		if p != nil {
			line = p.Line
		}
		probs = append(probs, fmt.Sprintf("line %d: ", line)+fmt.Sprintf(format, args...))
	}
	if len(data) > MaxAdvisedSize {
		bad(nil, "%d bytes, over the advised %d", len(data), MaxAdvisedSize)
	}
	if cal == nil {
		return probs
	}
	once := func(c *comp, names ...string) {
		for _, n := range names {
			if k := len(c.all(n)); k != 1 {
				bad(c.get(n), "%s has %d %s (want exactly one)", c.Name, k, n)
			}
		}
	}
	atMostOnce := func(c *comp, names ...string) {
		for _, n := range names {
			if ps := c.all(n); len(ps) > 1 {
				bad(ps[1], "%s has %d %s (at most one)", c.Name, len(ps), n)
			}
		}
	}
	// Value checks for every property anywhere.
	var walk func(c *comp)
	walk = func(c *comp) {
		for _, p := range c.Props {
			switch {
			case textProps[p.Name]:
				if _, err := unescapeText(p.Value, false); err != nil {
					bad(p, "%s: %v", p.Name, err)
				}
			case listProps[p.Name]:
				if _, err := unescapeText(p.Value, true); err != nil {
					bad(p, "%s: %v", p.Name, err)
				}
			case uriProps[p.Name]:
				if strings.ContainsAny(p.Value, "\\ ") {
					bad(p, "%s: URI %q is escaped or has a space", p.Name, p.Value)
				}
			}
			if p.Name == "GEO" && !geoRE.MatchString(p.Value) {
				bad(p, "GEO %q is not two plain decimals with at most 6 places", p.Value)
			}
			if (p.Name == "TZOFFSETFROM" || p.Name == "TZOFFSETTO") && !offsetRE.MatchString(p.Value) {
				bad(p, "%s %q is not a UTC-OFFSET", p.Name, p.Value)
			}
			if p.Name == "TRIGGER" || p.param("VALUE") == "DURATION" || p.Name == "X-PUBLISHED-TTL" {
				if !durationRE.MatchString(p.Value) {
					bad(p, "%s %q is not a DURATION", p.Name, p.Value)
				}
			}
			if p.Name == "REFRESH-INTERVAL" && p.param("VALUE") != "DURATION" {
				bad(p, "REFRESH-INTERVAL without VALUE=DURATION")
			}
			if p.Name == "SOURCE" && p.param("VALUE") != "URI" {
				bad(p, "SOURCE without VALUE=URI")
			}
			if p.Name == "COLOR" && !cssColorNames[p.Value] {
				bad(p, "COLOR %q is not a CSS3 colour name", p.Value)
			}
		}
		for _, ch := range c.Children {
			walk(ch)
		}
	}
	walk(cal)

	once(cal, "VERSION", "PRODID")
	atMostOnce(cal, "CALSCALE", "METHOD", "NAME", "X-WR-CALNAME", "DESCRIPTION", "X-WR-CALDESC",
		"REFRESH-INTERVAL", "X-PUBLISHED-TTL", "COLOR", "SOURCE", "URL", "X-WR-TIMEZONE", "LAST-MODIFIED")
	if p := cal.get("VERSION"); p != nil && p.Value != "2.0" {
		bad(p, "VERSION %q", p.Value)
	}
	if p := cal.get("CALSCALE"); p != nil && p.Value != "GREGORIAN" {
		bad(p, "CALSCALE %q", p.Value)
	}
	if p := cal.get("METHOD"); p != nil && p.Value != "PUBLISH" {
		bad(p, "METHOD %q", p.Value)
	}
	if p := cal.get("PRODID"); p != nil && strings.Contains(p.Value, "Golang ICS Library") {
		bad(p, "library default PRODID %q", p.Value)
	}

	zones := map[string]*vzone{}
	for _, tz := range cal.children("VTIMEZONE") {
		once(tz, "TZID")
		id := ""
		if p := tz.get("TZID"); p != nil {
			l, _ := unescapeText(p.Value, false)
			id = l[0]
		}
		if zones[id] != nil {
			bad(tz.get("TZID"), "two VTIMEZONEs for %q", id)
		}
		z, err := parseVZone(tz)
		if err != nil {
			bad(tz.get("TZID"), "VTIMEZONE %q: %v", id, err)
			continue
		}
		zones[id] = z
	}
	uids := map[string]bool{}
	for _, ev := range cal.children("VEVENT") {
		once(ev, "UID", "DTSTAMP", "DTSTART")
		atMostOnce(ev, "DTEND", "SUMMARY", "DESCRIPTION", "LOCATION", "GEO", "TRANSP", "SEQUENCE",
			"LAST-MODIFIED", "CATEGORIES", "STATUS", "CLASS", "URL")
		if ev.get("DTEND") != nil && ev.get("DURATION") != nil {
			bad(ev.get("DTEND"), "both DTEND and DURATION")
		}
		if p := ev.get("UID"); p != nil {
			if uids[p.Value] {
				bad(p, "duplicate UID %q", p.Value)
			}
			uids[p.Value] = true
		}
		for _, n := range []string{"DTSTAMP", "LAST-MODIFIED"} {
			if p := ev.get(n); p != nil && (!strings.HasSuffix(p.Value, "Z") || len(p.Params) > 0 || !dateTimeRE.MatchString(p.Value)) {
				bad(p, "%s %q is not a UTC DATE-TIME", n, p.Value)
			}
		}
		start, end := ev.get("DTSTART"), ev.get("DTEND")
		var ts, te time.Time
		var errS, errE error
		if start != nil {
			ts, errS = resolveTime(start, zones)
			if errS != nil {
				bad(start, "DTSTART: %v", errS)
			}
		}
		if end != nil {
			te, errE = resolveTime(end, zones)
			if errE != nil {
				bad(end, "DTEND: %v", errE)
			}
		}
		if start != nil && end != nil && errS == nil && errE == nil {
			if (start.param("VALUE") == "DATE") != (end.param("VALUE") == "DATE") {
				bad(end, "DTEND and DTSTART have different value types")
			}
			if !te.After(ts) {
				bad(end, "DTEND %s is not after DTSTART %s", end.Value, start.Value)
			}
		}
		for _, a := range ev.children("VALARM") {
			once(a, "ACTION", "TRIGGER")
			if p := a.get("ACTION"); p != nil && p.Value == "DISPLAY" {
				once(a, "DESCRIPTION")
			}
		}
	}
	sort.Strings(probs)
	return probs
}

// cssColorNames is the checker's own copy of the CSS3 colour keywords
// (CSS Color Module Level 3, §4.1 basic and §4.3 extended: 147 names).
var cssColorNames = func() map[string]bool {
	m := map[string]bool{}
	for _, n := range strings.Fields(`aliceblue antiquewhite aqua aquamarine azure beige bisque black
blanchedalmond blue blueviolet brown burlywood cadetblue chartreuse chocolate coral cornflowerblue cornsilk
crimson cyan darkblue darkcyan darkgoldenrod darkgray darkgreen darkgrey darkkhaki darkmagenta darkolivegreen
darkorange darkorchid darkred darksalmon darkseagreen darkslateblue darkslategray darkslategrey darkturquoise
darkviolet deeppink deepskyblue dimgray dimgrey dodgerblue firebrick floralwhite forestgreen fuchsia gainsboro
ghostwhite gold goldenrod gray grey green greenyellow honeydew hotpink indianred indigo ivory khaki lavender
lavenderblush lawngreen lemonchiffon lightblue lightcoral lightcyan lightgoldenrodyellow lightgray lightgreen
lightgrey lightpink lightsalmon lightseagreen lightskyblue lightslategray lightslategrey lightsteelblue
lightyellow lime limegreen linen magenta maroon mediumaquamarine mediumblue mediumorchid mediumpurple
mediumseagreen mediumslateblue mediumspringgreen mediumturquoise mediumvioletred midnightblue mintcream
mistyrose moccasin navajowhite navy oldlace olive olivedrab orange orangered orchid palegoldenrod palegreen
paleturquoise palevioletred papayawhip peachpuff peru pink plum powderblue purple red rosybrown royalblue
saddlebrown salmon sandybrown seagreen seashell sienna silver skyblue slateblue slategray slategrey snow
springgreen steelblue tan teal thistle tomato turquoise violet wheat white whitesmoke yellow yellowgreen`) {
		m[n] = true
	}
	return m
}()

// vzone is a VTIMEZONE read back from the file: its observances in onset order.
type vzone struct {
	obs []vobs
}

type vobs struct {
	onset    time.Time // UTC instant of the onset
	from, to int       // seconds east of UTC
	name     string
	daylight bool
}

func parseOffset(s string) (int, error) {
	if !offsetRE.MatchString(s) {
		return 0, fmt.Errorf("bad UTC-OFFSET %q", s)
	}
	var h, m, sec int
	fmt.Sscanf(s[1:3], "%d", &h)
	fmt.Sscanf(s[3:5], "%d", &m)
	if len(s) == 7 {
		fmt.Sscanf(s[5:7], "%d", &sec)
	}
	off := h*3600 + m*60 + sec
	if s[0] == '-' {
		if off == 0 {
			return 0, fmt.Errorf("UTC-OFFSET %q: -0000 is not allowed", s)
		}
		off = -off
	}
	return off, nil
}

// parseVZone reads the STANDARD/DAYLIGHT observances (RFC 5545 §3.6.5); the
// onset DTSTART is local time in TZOFFSETFROM. RRULE/RDATE are not supported
// by this reader, and heliocal must not write them.
func parseVZone(tz *comp) (*vzone, error) {
	z := &vzone{}
	for _, ch := range tz.Children {
		if ch.Name != "STANDARD" && ch.Name != "DAYLIGHT" {
			return nil, fmt.Errorf("unexpected %s", ch.Name)
		}
		for _, n := range []string{"DTSTART", "TZOFFSETFROM", "TZOFFSETTO"} {
			if len(ch.all(n)) != 1 {
				return nil, fmt.Errorf("%s needs exactly one %s", ch.Name, n)
			}
		}
		if ch.get("RRULE") != nil || ch.get("RDATE") != nil {
			return nil, fmt.Errorf("RRULE/RDATE not expected")
		}
		ds := ch.get("DTSTART").Value
		if len(ds) != 15 || len(ch.get("DTSTART").Params) > 0 {
			return nil, fmt.Errorf("observance DTSTART %q must be local time", ds)
		}
		wall, err := time.Parse(localLayout, ds)
		if err != nil {
			return nil, err
		}
		from, err := parseOffset(ch.get("TZOFFSETFROM").Value)
		if err != nil {
			return nil, err
		}
		to, err := parseOffset(ch.get("TZOFFSETTO").Value)
		if err != nil {
			return nil, err
		}
		o := vobs{onset: wall.Add(-time.Duration(from) * time.Second), from: from, to: to, daylight: ch.Name == "DAYLIGHT"}
		if p := ch.get("TZNAME"); p != nil {
			o.name = p.Value
		}
		z.obs = append(z.obs, o)
	}
	if len(z.obs) == 0 {
		return nil, fmt.Errorf("no STANDARD or DAYLIGHT observance")
	}
	sort.Slice(z.obs, func(i, j int) bool { return z.obs[i].onset.Before(z.obs[j].onset) })
	return z, nil
}

// offsetAt returns the offset in effect at instant t and whether t is covered
// (on or after the first onset).
func (z *vzone) offsetAt(t time.Time) (int, bool) {
	off, ok := 0, false
	for _, o := range z.obs {
		if o.onset.After(t) {
			break
		}
		off, ok = o.to, true
	}
	return off, ok
}

// resolve turns a local wall clock into an instant: the first instant whose
// local time is wall (RFC 5545 §3.3.5), or an error for a wall clock that
// does not exist or is not covered.
func (z *vzone) resolve(wall time.Time) (time.Time, error) {
	var best time.Time
	seen := map[int]bool{}
	for _, o := range z.obs {
		for _, off := range []int{o.from, o.to} {
			if seen[off] {
				continue
			}
			seen[off] = true
			t := wall.Add(-time.Duration(off) * time.Second)
			if got, ok := z.offsetAt(t); ok && got == off && (best.IsZero() || t.Before(best)) {
				best = t
			}
		}
	}
	if best.IsZero() {
		return best, fmt.Errorf("local time %s is not covered or does not exist", wall.Format(localLayout))
	}
	return best, nil
}

// resolveTime reads DTSTART/DTEND: DATE (needs VALUE=DATE), UTC, or local
// with a TZID that must have a VTIMEZONE in the file.
func resolveTime(p *prop, zones map[string]*vzone) (time.Time, error) {
	if p.param("VALUE") == "DATE" {
		if !dateRE.MatchString(p.Value) || p.param("TZID") != "" {
			return time.Time{}, fmt.Errorf("bad DATE %q", p.Value)
		}
		return time.Parse("20060102", p.Value)
	}
	if v := p.param("VALUE"); v != "" && v != "DATE-TIME" {
		return time.Time{}, fmt.Errorf("VALUE=%s", v)
	}
	if !dateTimeRE.MatchString(p.Value) {
		return time.Time{}, fmt.Errorf("bad DATE-TIME %q (a bare date needs VALUE=DATE)", p.Value)
	}
	tzid := p.param("TZID")
	if strings.HasSuffix(p.Value, "Z") {
		if tzid != "" {
			return time.Time{}, fmt.Errorf("UTC value %q with TZID=%s", p.Value, tzid)
		}
		return time.Parse(utcLayout, p.Value)
	}
	if tzid == "" {
		return time.Time{}, fmt.Errorf("floating time %q", p.Value)
	}
	z := zones[tzid]
	if z == nil {
		return time.Time{}, fmt.Errorf("TZID %q has no VTIMEZONE in the file", tzid)
	}
	wall, err := time.Parse(localLayout, p.Value)
	if err != nil {
		return time.Time{}, err
	}
	return z.resolve(wall)
}
