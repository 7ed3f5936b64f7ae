package ical

import (
	"errors"
	"fmt"
	"io"
	"math"
	"math/bits"
	"net/url"
	"strconv"
	"strings"
	"sync"
	"unicode"
	"unicode/utf8"

	ics "github.com/arran4/golang-ical"
)

// cleanText prepares a string for a TEXT value (RFC 5545 §3.3.11): invalid
// UTF-8 becomes U+FFFD, CRLF and lone CR become LF (the library's escaping
// would pass a CR through raw), and every other control character except
// HTAB is removed. Escaping is left to the serializer.
//
// Nearly every text a feed carries is already clean, so one pass first
// checks that: valid UTF-8 with no control character other than HTAB and LF
// is exactly the text the full normalisation returns unchanged. ASCII bytes
// are checked directly; a multi-byte rune is decoded (RuneError of width 1
// is invalid UTF-8; the only non-ASCII controls are U+0080..U+009F).
func cleanText(s string) string {
	for i := 0; i < len(s); {
		// 8 octets at a time while they are ASCII with no control
		// character (HTAB and LF, too, take the octet-wise path).
		for i+8 <= len(s) {
			if m := cleanMask(load64(s, i)); m != 0 {
				i += bits.TrailingZeros64(m) / 8 // the first such octet
				break
			}
			i += 8
		}
		if i >= len(s) {
			break
		}
		if c := s[i]; c < utf8.RuneSelf {
			if (c < ' ' && c != '\t' && c != '\n') || c == 0x7f {
				return normaliseText(s)
			}
			i++
			continue
		}
		r, size := utf8.DecodeRuneInString(s[i:])
		if (r == utf8.RuneError && size == 1) || unicode.IsControl(r) {
			return normaliseText(s)
		}
		i += size
	}
	return s
}

// normaliseText is cleanText for a text that needs changing.
func normaliseText(s string) string {
	s = strings.ToValidUTF8(s, "\uFFFD")
	if strings.IndexFunc(s, func(r rune) bool { return unicode.IsControl(r) && r != '\n' && r != '\t' }) < 0 {
		return s
	}
	s = strings.ReplaceAll(s, "\r\n", "\n")
	s = strings.ReplaceAll(s, "\r", "\n")
	return strings.Map(func(r rune) rune {
		if unicode.IsControl(r) && r != '\n' && r != '\t' {
			return -1
		}
		return r
	}, s)
}

// textEscaper escapes one TEXT value (RFC 5545 §3.3.11).
var textEscaper = strings.NewReplacer(`\`, `\\`, ";", `\;`, ",", `\,`, "\n", `\n`)

// categories returns the CATEGORIES value: the cleaned, escaped, non-empty
// values joined by unescaped commas.
func categories(cats []string) string {
	var vals []string
	for _, c := range cats {
		if c = cleanText(c); c != "" {
			vals = append(vals, textEscaper.Replace(c))
		}
	}
	return strings.Join(vals, ",")
}

// formatGeo returns the GEO value "lat;lon" as plain decimals with at most six
// decimals (about 0.1 m), never in exponent notation (RFC 5545 §3.3.7 FLOAT).
func formatGeo(lat, lon float64) (string, error) {
	if math.IsNaN(lat) || lat < -90 || lat > 90 {
		return "", fmt.Errorf("latitude %v is outside -90..90", lat)
	}
	if math.IsNaN(lon) || lon < -180 || lon > 180 {
		return "", fmt.Errorf("longitude %v is outside -180..180", lon)
	}
	return formatFloat(lat) + ";" + formatFloat(lon), nil
}

func formatFloat(x float64) string {
	s := strconv.FormatFloat(x, 'f', 6, 64)
	s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	if s == "-0" {
		s = "0"
	}
	return s
}

// checkURI accepts an empty string or an absolute URI with no spaces, control
// characters or DQUOTE.
func checkURI(s string) error {
	if s == "" {
		return nil
	}
	if strings.ContainsFunc(s, func(r rune) bool { return r <= ' ' || r == 0x7f || r == '"' || !utf8.ValidRune(r) }) {
		return errors.New("contains a space, a control character or a double quote")
	}
	u, err := url.Parse(s)
	if err != nil {
		return fmt.Errorf("not a URI: %w", err)
	}
	if !u.IsAbs() {
		return errors.New("not an absolute URI")
	}
	return nil
}

// utcNames are zone names that mean UTC itself; a site in one of them gets
// "Z" values and no VTIMEZONE.
var utcNames = map[string]bool{
	"UTC": true, "Etc/UTC": true, "UCT": true, "Etc/UCT": true, "Universal": true, "Etc/Universal": true,
	"Zulu": true, "Etc/Zulu": true, "GMT": true, "Etc/GMT": true, "GMT0": true, "Etc/GMT0": true,
	"GMT+0": true, "Etc/GMT+0": true, "GMT-0": true, "Etc/GMT-0": true, "Greenwich": true, "Etc/Greenwich": true,
}

func isUTC(loc interface{ String() string }) bool { return utcNames[loc.String()] }

// checkTZID rejects zone names that cannot be a TZID parameter value: empty,
// or holding a control character or DQUOTE (RFC 5545 §3.2 has no escape for
// those), or a backslash (legal, but parsers that wrongly unescape parameter
// values, golang-ical among them, would read another name).
func checkTZID(name string) error {
	if name == "" {
		return errors.New("time zone has an empty name")
	}
	if strings.ContainsFunc(name, func(r rune) bool { return unicode.IsControl(r) || r == '"' || r == '\\' }) {
		return fmt.Errorf("time zone name %q cannot be a TZID parameter", name)
	}
	return nil
}

// libraryParamSafe reports whether golang-ical writes v unchanged as a
// parameter value. It backslash-escapes , " ; : \ and ' , which RFC 5545 §3.2
// does not allow (parameter values are quoted, never escaped).
func libraryParamSafe(v string) bool {
	return !strings.ContainsAny(v, `,";:\'`)
}

// paramValue writes a parameter value per RFC 5545 §3.2: DQUOTEd when it
// contains ":", ";" or ",". The caller has rejected DQUOTE and controls.
func paramValue(v string) string {
	if strings.ContainsAny(v, ":;,") {
		return `"` + v + `"`
	}
	return v
}

// contentLine is one pre-formatted, unfolded content line ("NAME;PARAM=V:value")
// for a property golang-ical v0.3.4 cannot write correctly: its serializer
// re-escapes every TEXT-typed value (so a comma-separated CATEGORIES list would
// lose its separators) and backslash-escapes parameter values. Pre-formatted
// values cannot be passed through AddProperty, because the library applies
// TEXT escaping again on serialization. An event writes its CATEGORIES line
// and its DTSTART/DTEND with a DQUOTEd TZID as such lines, after its other
// properties and before any VALARM (see vevent.SerializeTo), folded as
// contentLine.SerializeTo folds them: at most 75 octets per line, never
// inside a UTF-8 sequence. contentLine also implements ics.Component, which
// the library serializes in order with a component's other children (the
// reference encoder of the tests places it among a VEVENT's children).
type contentLine struct {
	line string
}

var _ ics.Component = (*contentLine)(nil)

func (l *contentLine) UnknownPropertiesIANAProperties() []ics.IANAProperty { return nil }
func (l *contentLine) SubComponents() []ics.Component                      { return nil }

func (l *contentLine) SerializeTo(w io.Writer, cfg *ics.SerializationConfiguration) error {
	if max := cfg.MaxLength; max >= 5 && len(l.line) <= max {
		// Short enough not to fold: the same bytes as fold, without
		// building the folded string.
		if _, err := io.WriteString(w, l.line); err != nil {
			return err
		}
		_, err := io.WriteString(w, cfg.NewLine)
		return err
	}
	_, err := w.Write(appendFold(nil, l.line, cfg.MaxLength, cfg.NewLine))
	return err
}

// fold splits a content line into physical lines of at most max octets
// (RFC 5545 §3.1), each continuation starting with one space, breaking only
// between UTF-8 sequences; every physical line ends with newline.
func fold(s string, max int, newline string) string {
	return string(appendFold(nil, s, max, newline))
}

// appendFold appends fold(s, max, newline) to b.
func appendFold[S string | []byte](b []byte, s S, max int, newline string) []byte {
	if max < 5 {
		max = 75
	}
	limit := max
	for len(s) > limit {
		cut := limit
		for cut > 0 && !utf8.RuneStart(s[cut]) {
			cut--
		}
		b = append(append(append(b, s[:cut]...), newline...), ' ')
		s = s[cut:]
		limit = max - 1
	}
	return append(append(b, s...), newline...)
}

// formatOffset writes a UTC offset in seconds as RFC 5545 §3.3.14
// UTC-OFFSET: "+0100", "-0330", "+1245", "+0019" plus seconds when needed
// ("-001430"); zero is "+0000".
func formatOffset(secs int) string {
	sign := "+"
	if secs < 0 {
		sign, secs = "-", -secs
	}
	s := fmt.Sprintf("%s%02d%02d", sign, secs/3600, secs/60%60)
	if secs%60 != 0 {
		s += fmt.Sprintf("%02d", secs%60)
	}
	return s
}

// cssColors are the CSS3 colour keywords (CSS Color Module Level 3 §4.1 and
// §4.3), the names RFC 7986 §5.9 COLOR accepts, made at first use.
var cssColors = sync.OnceValue(func() map[string]bool {
	m := map[string]bool{}
	for _, n := range strings.Fields(`aliceblue antiquewhite aqua aquamarine azure beige bisque black
		blanchedalmond blue blueviolet brown burlywood cadetblue chartreuse chocolate coral cornflowerblue
		cornsilk crimson cyan darkblue darkcyan darkgoldenrod darkgray darkgreen darkgrey darkkhaki
		darkmagenta darkolivegreen darkorange darkorchid darkred darksalmon darkseagreen darkslateblue
		darkslategray darkslategrey darkturquoise darkviolet deeppink deepskyblue dimgray dimgrey dodgerblue
		firebrick floralwhite forestgreen fuchsia gainsboro ghostwhite gold goldenrod gray green greenyellow
		grey honeydew hotpink indianred indigo ivory khaki lavender lavenderblush lawngreen lemonchiffon
		lightblue lightcoral lightcyan lightgoldenrodyellow lightgray lightgreen lightgrey lightpink
		lightsalmon lightseagreen lightskyblue lightslategray lightslategrey lightsteelblue lightyellow lime
		limegreen linen magenta maroon mediumaquamarine mediumblue mediumorchid mediumpurple mediumseagreen
		mediumslateblue mediumspringgreen mediumturquoise mediumvioletred midnightblue mintcream mistyrose
		moccasin navajowhite navy oldlace olive olivedrab orange orangered orchid palegoldenrod palegreen
		paleturquoise palevioletred papayawhip peachpuff peru pink plum powderblue purple red rosybrown
		royalblue saddlebrown salmon sandybrown seagreen seashell sienna silver skyblue slateblue slategray
		slategrey snow springgreen steelblue tan teal thistle tomato turquoise violet wheat white whitesmoke
		yellow yellowgreen`) {
		m[n] = true
	}
	return m
})
