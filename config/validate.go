package config

import (
	"errors"
	"fmt"
	"math"
	"net"
	"net/url"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"sync"
	"time"
	"unicode"
	"unicode/utf8"

	"github.com/robfig/cron/v3"
)

// Bounds checked by Validate.
const (
	MinElevation   = -500.0 // metres; the lowest dry land is about −430 m (common practice: Dead Sea shore)
	MaxElevation   = 9000.0 // metres; above the highest summit
	MinHorizon     = -5.0   // degrees; a high site looking down to a far sea horizon
	MaxHorizon     = 45.0   // degrees; a valley floor under steep slopes
	MinPressure    = 300.0  // hPa; about 9000 m
	MaxPressure    = 1100.0 // hPa; above any sea-level record
	MinTemperature = -90.0  // °C; the coldest measured
	MaxTemperature = 60.0   // °C; the hottest measured
	MaxOffset      = 12 * time.Hour
	MaxAlarm       = 7 * 24 * time.Hour
	MaxIDLength    = 64
	MaxTextLength  = 200 // runes, for names, titles and labels
)

// idPattern is the shape of site and feed ids: they become file names and
// URL path segments. It is compiled at first use, as the other tables of
// this package are, not when the program starts.
var idPattern = sync.OnceValue(func() *regexp.Regexp { return regexp.MustCompile(`^[a-z0-9][a-z0-9-]*$`) })

// msgNoSuchSite is the problem of a feed's site that no site has as id.
const msgNoSuchSite = "no site has this id"

// The problems of a key missing, of a key the configuration does not have
// and of a time zone name the tz database does not know, which the reading
// of a file looks for among its problems.
const (
	msgRequired    = "is required"
	msgUnknownKey  = "unknown key"
	msgUnknownZone = "unknown time zone"
)

// FieldError is one problem of a configuration.
type FieldError struct {
	Path  string // e.g. "sites[2].latitude"
	Value string // the offending value as written, e.g. "95"; empty when missing
	Msg   string // what is wrong, e.g. "must be within -90..90"
	Hint  string // how to fix it, may be empty
	// Line is the line of the file the field is written on (or, when it
	// is missing, the mapping it is missing from); 0 when not known.
	// ValidationError writes it after the file's name: "farm.yaml:4: ".
	Line int
}

func (e FieldError) Error() string {
	var b strings.Builder
	b.WriteString(e.Path)
	b.WriteString(": ")
	e.writeProblem(&b)
	return b.String()
}

// writeProblem writes e without its path: the value, what is wrong, and the
// hint in brackets.
func (e FieldError) writeProblem(b *strings.Builder) {
	if e.Value != "" && !strings.HasSuffix(e.Path, "."+e.Value) && e.Path != e.Value {
		// a key's path ends in the key itself: "sites[0].lat: unknown
		// key", not "sites[0].lat: lat: unknown key"
		b.WriteString(quoteValue(e.Value))
		b.WriteString(": ")
	}
	b.WriteString(e.Msg)
	if e.Hint != "" {
		b.WriteString(" (")
		b.WriteString(e.Hint)
		b.WriteString(")")
	}
}

// quoteValue shows plain tokens (numbers, ids, zone names) as they are and
// anything else quoted, so spaces and empty strings stay visible.
func quoteValue(v string) string {
	if len(v) >= 2 && v[0] == '"' && v[len(v)-1] == '"' {
		if _, err := strconv.Unquote(v); err == nil {
			return v // already quoted
		}
	}
	if len(v) > 120 {
		v = v[:120] + "…"
	}
	for _, r := range v {
		if !(unicode.IsLetter(r) || unicode.IsDigit(r) || strings.ContainsRune("-_+./:*@", r)) {
			return strconv.Quote(v)
		}
	}
	return v
}

// ValidationError lists every problem found in a configuration, one per
// line, ordered by path (service, sites, feeds); a configuration's read
// from a file, by the lines its problems are written on (those of no line
// first, each in the order of paths), as a compiler lists them.
type ValidationError struct {
	Source   string // file name, prefixed to each line when set, with the problem's line when known
	Problems []FieldError
}

func (e *ValidationError) Error() string {
	lines := make([]string, len(e.Problems))
	for i, p := range e.Problems {
		switch {
		case e.Source != "" && p.Line > 0:
			lines[i] = fmt.Sprintf("%s:%d: %s", e.Source, p.Line, p.Error())
		case e.Source != "":
			lines[i] = e.Source + ": " + p.Error()
		default:
			lines[i] = p.Error()
		}
	}
	return strings.Join(lines, "\n")
}

func newValidationError(problems []FieldError) *ValidationError {
	slices.SortStableFunc(problems, func(a, b FieldError) int { return comparePaths(a.Path, b.Path) })
	return &ValidationError{Problems: problems}
}

// comparePaths orders paths the way the file is laid out: keys in the
// order of the configuration structs (service, sites, feeds; id, name,
// latitude…), list items by index (feeds[2] before feeds[10]).
func comparePaths(a, b string) int {
	sa, sb := strings.Split(a, "."), strings.Split(b, ".")
	prefix := ""
	for i := 0; i < len(sa) && i < len(sb); i++ {
		na, ia := splitSegment(sa[i])
		nb, ib := splitSegment(sb[i])
		if na != nb {
			keys := keysAt(prefix)
			pa, pb := slices.Index(keys, na), slices.Index(keys, nb)
			if pa < 0 {
				pa = len(keys)
			}
			if pb < 0 {
				pb = len(keys)
			}
			if pa != pb {
				return pa - pb
			}
			return strings.Compare(na, nb)
		}
		if ia != ib {
			return ia - ib
		}
		if prefix != "" {
			prefix += "."
		}
		prefix += sa[i]
	}
	return len(sa) - len(sb)
}

// splitSegment splits "feeds[12]" into "feeds" and 12 (-1 without index).
func splitSegment(seg string) (string, int) {
	open := strings.IndexByte(seg, '[')
	if open < 0 || !strings.HasSuffix(seg, "]") {
		return seg, -1
	}
	n, err := strconv.Atoi(seg[open+1 : len(seg)-1])
	if err != nil {
		return seg, -1
	}
	return seg[:open], n
}

type problems []FieldError

func (ps *problems) add(path, value, msg, hint string) {
	*ps = append(*ps, FieldError{Path: path, Value: value, Msg: msg, Hint: hint})
}

func ftoa(f float64) string { return strconv.FormatFloat(f, 'g', -1, 64) }

// Validate checks the whole configuration and returns a *ValidationError
// listing every problem, or nil. Parse and Load call it; call it yourself on
// a configuration built or changed in code (after ApplyDefaults).
func (c *Config) Validate() error {
	var ps problems
	c.Service.validate(&ps)
	c.Page.validate(&ps)

	if len(c.Sites) == 0 {
		ps.add("sites", "", "no sites: at least one site is needed", "add a site with id, latitude, longitude and timezone")
	}
	siteIDs := make(map[string]int, len(c.Sites))
	var ids []string
	for i := range c.Sites {
		s := &c.Sites[i]
		p := fmt.Sprintf("sites[%d]", i)
		s.validate(&ps, p)
		if s.ID == "" {
			continue
		}
		if j, dup := siteIDs[s.ID]; dup {
			ps.add(p+".id", s.ID, fmt.Sprintf("duplicate site id, also that of sites[%d]", j), "give every site its own id")
			continue
		}
		siteIDs[s.ID] = i
		if validID(s.ID) {
			ids = append(ids, s.ID) // only valid ids are ever suggested
		}
	}

	feedIDs := make(map[string]int, len(c.Feeds))
	for i := range c.Feeds {
		f := &c.Feeds[i]
		p := fmt.Sprintf("feeds[%d]", i)
		f.validate(&ps, p)
		if f.ID != "" {
			if j, dup := feedIDs[f.ID]; dup {
				ps.add(p+".id", f.ID, fmt.Sprintf("duplicate feed id, also that of feeds[%d]", j), "feed ids name the published files; give every feed its own id")
			} else {
				feedIDs[f.ID] = i
			}
		}
		switch _, ok := siteIDs[f.Site]; {
		case f.Site == "":
			ps.add(p+".site", "", "is required: the id of the site the feed is computed for", siteList(ids))
		case !ok:
			hint := nearValue(f.Site, ids, siteList(ids))
			if id := siteNamed(c.Sites, f.Site); id != "" { // the site's name written for its id
				hint = fmt.Sprintf("that is the name of the site %q: a feed names its site by id", id)
			}
			ps.add(p+".site", f.Site, msgNoSuchSite, hint)
		default:
			for j, ks := range f.Kinds {
				if (ks.Kind.Name == "sun-hidden" || ks.Kind.Name == "noon-clear") && !c.Sites[siteIDs[f.Site]].skylineGiven() {
					ps.add(fmt.Sprintf("%s.kinds[%d]", p, j), ks.Kind.Name, fmt.Sprintf("site %q has no skyline, so the Sun is never hidden between sunrise and sunset", f.Site),
						"give the site a horizon of [azimuth, altitude] points, e.g. horizon: [[0, 2], [170, 2], [180, 25], [190, 2]]")
				}
			}
		}
	}
	freeSuggestions(ps, "sites", siteIDs)
	freeSuggestions(ps, "feeds", feedIDs)
	if len(ps) == 0 {
		return nil
	}
	return newValidationError(ps)
}

// freeSuggestions makes the id an invalid id of list ("sites", "feeds") is
// told to write one no other entry has: "North-Sun" beside a feed
// "north-sun" is told "north-sun-2", as "north-sun" would be a duplicate
// id when followed. ids are the ids of the list's entries.
func freeSuggestions(ps problems, list string, ids map[string]int) {
	owner := make(map[string]string, len(ids)) // an id taken: whose, in words
	for id, j := range ids {
		if validID(id) {
			owner[id] = fmt.Sprintf("the id of %s[%d]", list, j)
		}
	}
	for i := range ps {
		p := &ps[i]
		if p.Msg != msgIDPattern || !strings.HasPrefix(p.Path, list+"[") {
			continue
		}
		near := slug(p.Value)
		if near == "" || !validID(near) {
			continue
		}
		if whose, ok := owner[near]; ok {
			n := 2
			for owner[fmt.Sprintf("%s-%d", near, n)] != "" {
				n++
			}
			free := fmt.Sprintf("%s-%d", near, n)
			if !validID(free) {
				continue
			}
			p.Hint = fmt.Sprintf("ids become file names and URLs, and %q is %s: e.g. %q", near, whose, free)
			near = free
		}
		owner[near] = "the one suggested for " + strings.TrimSuffix(p.Path, ".id")
	}
}

// siteNamed is the id of the one site whose name is name (spaces around
// it and case aside), "" when none or several have it or that id is none.
func siteNamed(sites []Site, name string) string {
	id := ""
	for _, s := range sites {
		if s.Name != "" && strings.EqualFold(strings.TrimSpace(s.Name), strings.TrimSpace(name)) {
			if id != "" || !validID(s.ID) {
				return ""
			}
			id = s.ID
		}
	}
	return id
}

func siteList(ids []string) string {
	if len(ids) == 0 {
		return "define the site under sites first"
	}
	if len(ids) > 8 {
		ids = append(ids[:8:8], "…")
	}
	return "sites: " + strings.Join(ids, ", ")
}

func (s *Service) validate(ps *problems) {
	if s.Listen != "" {
		if msg, hint := listenProblem(s.Listen); msg != "" {
			ps.add("service.listen", s.Listen, msg, hint)
		}
	}
	if strings.ContainsRune(s.OutDir, 0) {
		ps.add("service.out_dir", s.OutDir, "contains a NUL byte", "")
	}
	if s.BaseURL != "" {
		if msg, hint := baseURLProblem(s.BaseURL); msg != "" {
			ps.add("service.base_url", redactURL(s.BaseURL), msg, hint)
		}
	}
	if s.Refresh != "" {
		if msg := checkCron(s.Refresh); msg != "" {
			hint := `five fields: minute hour day-of-month month day-of-week, e.g. "15 3 * * *" for 03:15 every night`
			if at := "@" + strings.ToLower(strings.TrimSpace(s.Refresh)); checkCron(at) == "" && checkCronFires(at, time.Now()) == "" {
				hint = didYouMean(at) // daily, every 6h: "@daily", "@every 6h"
			}
			ps.add("service.refresh", s.Refresh, msg, hint)
		} else if msg := checkCronFires(s.Refresh, time.Now()); msg != "" {
			ps.add("service.refresh", s.Refresh, msg, `e.g. "15 3 * * *" for 03:15 every night, or "@every 6h"`)
		}
	}
	for i, v := range s.TrustedProxies {
		if _, err := parseProxy(v); err != nil {
			ps.add(fmt.Sprintf("service.trusted_proxies[%d]", i), v, "not an IP address or CIDR prefix", `e.g. "127.0.0.1" or "10.0.0.0/8"`)
		}
	}
	if s.MaxFeedBytes < 0 {
		ps.add("service.max_feed_bytes", strconv.Itoa(s.MaxFeedBytes), "must not be negative", "leave it out for 1000000")
	}
	switch s.Oversize {
	case OversizeWarn, OversizeTrim, OversizeFail, "":
	default:
		ps.add("service.oversize", s.Oversize, "must be warn, trim or fail",
			nearValue(s.Oversize, []string{OversizeWarn, OversizeTrim, OversizeFail}, "warn publishes and says so; trim shortens the window; fail stops"))
	}
}

// CheckListen tells what is wrong with a listen address such as ":8080"
// (service.listen, serve --listen); nil when it is usable. The error names
// no field: the caller does.
func CheckListen(addr string) error {
	if msg, hint := listenProblem(addr); msg != "" {
		return settingError(addr, msg, hint)
	}
	return nil
}

// CheckBaseURL tells what is wrong with a public base URL (service.base_url,
// --base-url); nil when it is usable. A URL with a user name or password is
// refused: it would be published in every feed, feeds.json and index.html.
// The error shows the URL with any credentials masked.
func CheckBaseURL(raw string) error {
	if msg, hint := baseURLProblem(raw); msg != "" {
		return settingError(redactURL(raw), msg, hint)
	}
	return nil
}

// ElevationHint is the hint of an elevation out of range (a site's
// elevation, --elev): "metres above sea level, not feet", with the metres
// of a value that fits as feet, ": write 3658 for 12000 ft" (the
// international foot, 0.3048 m).
func ElevationHint(v float64) string {
	hint := "metres above sea level, not feet"
	if v > MaxElevation && v*0.3048 <= MaxElevation {
		hint += fmt.Sprintf(": write %.0f for %s ft", v*0.3048, ftoa(v))
	}
	return hint
}

// LongitudeHint is the hint of a longitude out of range (a site's
// longitude, --lon, an ad-hoc feed's lon): LongitudeText, and for one
// counted east all the way round, past 180 and under 360 (as some maps and
// GPS units give it), the longitude to write: -176.56 (176.56°W) for 183.44.
func LongitudeHint(v float64) string {
	if !(v > 180 && v < 360) {
		return LongitudeText
	}
	w := math.Round((v-360)*1e9) / 1e9 // 183.44 − 360 without the float's tail
	return fmt.Sprintf("decimal degrees, east positive, west negative: write %s (%s°W) for %s° counted east", ftoa(w), ftoa(-w), ftoa(v))
}

// TemperatureHint is the hint of a temperature out of range (a site's
// temperature_c, --temperature): "degrees Celsius, not Fahrenheit", with
// the degrees Celsius of a value over the range that fits as Fahrenheit,
// ": write 35 for 95 °F".
func TemperatureHint(v float64) string {
	if v > MaxTemperature && v <= 140 { // 140 °F is 60 °C
		return fahrenheitHint(v, ftoa(v))
	}
	return "degrees Celsius, not Fahrenheit"
}

// fahrenheitHint is the hint of f °F, as written, where degrees Celsius
// belong: "degrees Celsius, not Fahrenheit: write 35 for 95 °F", to 0.1 °C.
func fahrenheitHint(f float64, written string) string {
	c := math.Round((f-32)*5/9*10)/10 + 0 // + 0: "0", not "-0", for 31.99 °F
	return fmt.Sprintf("degrees Celsius, not Fahrenheit: write %g for %s °F", c, written)
}

func settingError(value, msg, hint string) error {
	var b strings.Builder
	FieldError{Value: value, Msg: msg, Hint: hint}.writeProblem(&b)
	return errors.New(b.String())
}

// portAloneHint is the hint of a port n written alone where host:port
// belongs (listen, as text or a number; --listen): `a port alone comes
// after a colon: write it ":8080"`, which listens on every address, or, for
// a number that is no port, the ports there are.
func portAloneHint(n int64) string {
	if n >= 0 && n <= 65535 {
		return fmt.Sprintf(`a port alone comes after a colon: write it ":%d"`, n)
	}
	return `a port is 0..65535, written after a colon, e.g. ":8080"` // not "70000" in quotes either
}

func listenProblem(addr string) (msg, hint string) {
	host, port, err := net.SplitHostPort(addr)
	n, perr := strconv.Atoi(port)
	switch {
	case err != nil:
		if n, err := strconv.ParseInt(addr, 10, 64); err == nil && addr[0] != '+' {
			return "must be host:port", portAloneHint(n)
		}
		return "must be host:port", `e.g. ":8080" or "127.0.0.1:8080"`
	case perr != nil || n < 0 || n > 65535:
		return "port must be a number within 0..65535", `e.g. ":8080"`
	case strings.ContainsAny(host, " /"):
		return "host must be a name or an IP address", `e.g. "127.0.0.1:8080", or ":8080" for every address`
	}
	return "", ""
}

func baseURLProblem(raw string) (msg, hint string) {
	const example = `e.g. "https://sky.example.org/calendars/"`
	u, err := url.Parse(raw)
	switch {
	case err != nil:
		return "malformed URL", example
	case u.User != nil:
		return "must not contain a user name or password: the URL is published in every feed, feeds.json and index.html",
			"protect the directory with the web server's own access control instead"
	case u.Scheme != "http" && u.Scheme != "https":
		return "must be an absolute http or https URL", example
	case u.Host == "":
		return "has no host name", example
	case u.RawQuery != "" || u.Fragment != "" || u.ForceQuery:
		return "must not have a query or fragment: feed file names are appended to it", ""
	}
	return "", ""
}

// redactURL masks the user name and password of a URL, so an error message
// or a log line never repeats them.
func redactURL(raw string) string {
	u, err := url.Parse(raw)
	if err != nil || u.User == nil {
		if at := strings.LastIndex(raw, "@"); err != nil && at >= 0 {
			if scheme := strings.Index(raw, "://"); scheme >= 0 && scheme < at {
				return raw[:scheme+3] + "***" + raw[at:]
			}
		}
		return raw
	}
	u.User = nil
	s := u.String()
	i := strings.Index(s, "://")
	if i < 0 {
		return s
	}
	return s[:i+3] + "***@" + s[i+3:]
}

// checkCron validates a standard 5-field cron expression (or a descriptor
// such as "@daily"); the time zone goes in refresh_zone, not in the
// expression.
func checkCron(expr string) string {
	t := strings.TrimSpace(expr)
	if strings.HasPrefix(t, "TZ=") || strings.HasPrefix(t, "CRON_TZ=") {
		return "time zone prefix not allowed here: set refresh_zone instead"
	}
	if !strings.HasPrefix(t, "@") && len(strings.Fields(t)) != 5 {
		return fmt.Sprintf("must have 5 fields, has %d", len(strings.Fields(t)))
	}
	if _, err := cron.ParseStandard(t); err != nil {
		return "malformed cron expression: " + oneLine(err.Error())
	}
	return ""
}

// MinRefreshInterval is the shortest time between two refreshes a
// schedule may ask for: a rebuild of every feed more often than this would
// only burn CPU (the sky does not change that fast).
const MinRefreshInterval = time.Minute

// checkCronFires tells what is wrong with a well-formed schedule that never
// fires (no date matches, e.g. "0 0 30 2 *") or fires more often than once
// per MinRefreshInterval (e.g. "@every 1ns"), looking at its next runs
// after now; "" when it is fine.
func checkCronFires(expr string, now time.Time) string {
	sched, err := cron.ParseStandard(strings.TrimSpace(expr))
	if err != nil {
		return "" // reported by checkCron
	}
	prev := sched.Next(now.UTC())
	if prev.IsZero() {
		return "never fires: no date matches it"
	}
	for range 3 {
		next := sched.Next(prev)
		if next.IsZero() {
			break
		}
		if gap := next.Sub(prev); gap < MinRefreshInterval {
			return fmt.Sprintf("fires every %v, more often than once a minute", gap)
		}
		prev = next
	}
	return ""
}

// windowsDevice reports whether id, an id of idPattern, is a name Windows
// keeps for a device whatever extension follows it (nul.ics is NUL): con,
// prn, aux, nul, com1..com9 and lpt1..lpt9. A feed's id names its file, and
// published directories are synced to and served from Windows too.
func windowsDevice(id string) bool {
	switch id {
	case "con", "prn", "aux", "nul":
		return true
	}
	return len(id) == 4 && (id[:3] == "com" || id[:3] == "lpt") && id[3] >= '1' && id[3] <= '9'
}

const msgIDPattern = "must match [a-z0-9][a-z0-9-]*"

// validID reports whether checkID accepts id.
func validID(id string) bool {
	return id != "" && len(id) <= MaxIDLength && idPattern().MatchString(id)
}

func checkID(ps *problems, path, id, what string) {
	switch {
	case id == "":
		ps.add(path, "", msgRequired, fmt.Sprintf("a short %s id of lower-case letters, digits and dashes, e.g. \"north-field\"", what))
	case len(id) > MaxIDLength:
		ps.add(path, id, fmt.Sprintf("longer than %d characters", MaxIDLength), "ids become file names and URLs; keep them short")
	case !idPattern().MatchString(id):
		hint := "ids become file names and URLs: use lower-case letters, digits and dashes, starting with a letter or digit"
		if s := slug(id); s != "" && idPattern().MatchString(s) {
			hint = fmt.Sprintf("ids become file names and URLs; e.g. %q", s)
		}
		ps.add(path, id, msgIDPattern, hint)
	}
}

// latinFold writes common accented Latin letters without their accents, so
// that a suggested id keeps the word: "viña" is "vina", not "vi-a".
var latinFold = strings.NewReplacer(
	"à", "a", "á", "a", "â", "a", "ã", "a", "ä", "a", "å", "a", "ā", "a", "ą", "a", "æ", "ae",
	"ç", "c", "ć", "c", "č", "c", "ď", "d", "ð", "d", "đ", "d",
	"è", "e", "é", "e", "ê", "e", "ë", "e", "ē", "e", "ę", "e", "ě", "e",
	"ğ", "g", "ì", "i", "í", "i", "î", "i", "ï", "i", "ī", "i", "ı", "i",
	"ł", "l", "ľ", "l", "ñ", "n", "ń", "n", "ň", "n",
	"ò", "o", "ó", "o", "ô", "o", "õ", "o", "ö", "o", "ø", "o", "ō", "o", "ő", "o", "œ", "oe",
	"ř", "r", "ś", "s", "š", "s", "ş", "s", "ß", "ss", "ť", "t", "ţ", "t", "þ", "th",
	"ù", "u", "ú", "u", "û", "u", "ü", "u", "ū", "u", "ů", "u", "ű", "u",
	"ý", "y", "ÿ", "y", "ź", "z", "ż", "z", "ž", "z",
)

// slug turns "North Field #2" into "north-field-2" and "Viña Alta" into
// "vina-alta".
func slug(s string) string {
	var b strings.Builder
	dash := false
	for _, r := range latinFold.Replace(strings.ToLower(s)) {
		if (r >= 'a' && r <= 'z') || (r >= '0' && r <= '9') {
			if dash && b.Len() > 0 {
				b.WriteByte('-')
			}
			b.WriteRune(r)
			dash = false
		} else {
			dash = true
		}
	}
	return b.String()
}

// checkText refuses text that would corrupt a calendar line: invalid UTF-8,
// control characters (newlines only where allowNewline), excessive length.
func checkText(ps *problems, path, s string, allowNewline bool, maxRunes int) {
	if !utf8.ValidString(s) {
		ps.add(path, strings.ToValidUTF8(s, "\uFFFD"), "is not valid UTF-8", "save the file as UTF-8")
		return
	}
	for _, r := range s {
		if r == '\n' || r == '\t' {
			if allowNewline || r == '\t' {
				continue
			}
		}
		if unicode.IsControl(r) {
			ps.add(path, s, fmt.Sprintf("contains the control character %U", r), "remove it")
			return
		}
	}
	if maxRunes > 0 && utf8.RuneCountInString(s) > maxRunes {
		ps.add(path, s, fmt.Sprintf("longer than %d characters", maxRunes), "shorten it")
	}
}

func (s *Site) validate(ps *problems, p string) {
	checkID(ps, p+".id", s.ID, "site")
	checkText(ps, p+".name", s.Name, false, MaxTextLength)
	if !(s.Latitude >= -90 && s.Latitude <= 90) {
		ps.add(p+".latitude", ftoa(s.Latitude), "must be within -90..90", LatitudeText)
	}
	if !(s.Longitude >= -180 && s.Longitude <= 180) {
		ps.add(p+".longitude", ftoa(s.Longitude), "must be within -180..180", LongitudeHint(s.Longitude))
	}
	if !(s.Elevation >= MinElevation && s.Elevation <= MaxElevation) {
		ps.add(p+".elevation", ftoa(s.Elevation), fmt.Sprintf("must be within %g..%g metres", MinElevation, MaxElevation), ElevationHint(s.Elevation))
	}
	if !(s.Horizon >= MinHorizon && s.Horizon <= MaxHorizon) {
		ps.add(p+".horizon", ftoa(s.Horizon), fmt.Sprintf("must be within %g..%g degrees", MinHorizon, MaxHorizon), HorizonText)
	}
	if s.Pressure != nil && !(*s.Pressure >= MinPressure && *s.Pressure <= MaxPressure) {
		ps.add(p+".pressure_hpa", ftoa(*s.Pressure), fmt.Sprintf("must be within %g..%g hPa", MinPressure, MaxPressure), "the air pressure at the site (not reduced to sea level), e.g. 1013; leave it out for standard refraction")
	}
	if s.Temperature != nil && !(*s.Temperature >= MinTemperature && *s.Temperature <= MaxTemperature) {
		ps.add(p+".temperature_c", ftoa(*s.Temperature), fmt.Sprintf("must be within %g..%g °C", MinTemperature, MaxTemperature), TemperatureHint(*s.Temperature))
	}
	if s.TimeZone.Location == nil && s.Latitude >= -90 && s.Latitude <= 90 && s.Longitude >= -180 && s.Longitude <= 180 {
		ps.add(p+".timezone", "", msgZoneNotSet, `an IANA time zone name such as "Europe/Vienna"`)
	}
}

// msgZoneNotSet is Validate's problem for a site without a zone: a
// configuration read from a file takes it from the coordinates (Parse), one
// built in code from ApplyDefaults.
const msgZoneNotSet = "is not set"

func (f *Feed) validate(ps *problems, p string) {
	checkID(ps, p+".id", f.ID, "feed")
	if windowsDevice(f.ID) {
		ps.add(p+".id", f.ID, fmt.Sprintf("is a device name on Windows, with any extension: %s.ics cannot be created there, nor synced to a Windows computer", f.ID),
			fmt.Sprintf("feed ids name the published files; e.g. %q", f.ID+"-feed"))
	}
	checkText(ps, p+".title", f.Title, false, MaxTextLength)
	checkText(ps, p+".description", f.Description, true, 4000)
	if len(f.Kinds) == 0 && len(f.Plans) == 0 {
		ps.add(p+".kinds", "", "no kinds: a feed needs at least one event kind or plan", `e.g. kinds: [sunrise, sunset]`)
	}
	for j := range f.Plans {
		f.Plans[j].validate(ps, fmt.Sprintf("%s.plans[%d]", p, j))
	}
	for j := range f.Kinds {
		f.Kinds[j].validate(ps, fmt.Sprintf("%s.kinds[%d]", p, j))
	}
	at := func(i int) string { return fmt.Sprintf("%s.kinds[%d]", p, i) }
	for _, t := range KindsTwice(f.Kinds) {
		ps.add(at(t.Second), t.Given[1].String(), t.Msg(at), t.Hint(true))
	}
	if f.DaysBack < 0 {
		ps.add(p+".days_back", strconv.Itoa(f.DaysBack), "must not be negative", "the number of past days kept in the feed, e.g. 30")
	}
	if f.DaysAhead < 0 {
		ps.add(p+".days_ahead", strconv.Itoa(f.DaysAhead), "must not be negative", "the number of future days in the feed, e.g. 365")
	}
	if f.DaysBack >= 0 && f.DaysAhead >= 0 && (f.DaysBack > MaxWindowDays || f.DaysAhead > MaxWindowDays || f.DaysBack+f.DaysAhead > MaxWindowDays) {
		window := "window"
		if f.DaysBack < 1<<40 && f.DaysAhead < 1<<40 { // the sum cannot overflow
			window = fmt.Sprintf("window of %d days", f.DaysBack+f.DaysAhead)
		}
		ps.add(p+".days_ahead", strconv.Itoa(f.DaysAhead), fmt.Sprintf("%s (days_back %d + days_ahead %d) is over 10 years, %d days", window, f.DaysBack, f.DaysAhead, MaxWindowDays), "large feeds are dropped by some calendar apps; use 30 back and 365 ahead")
	}
	if f.Color != "" && !IsColorName(f.Color) {
		ps.add(p+".color", f.Color, "not a CSS3 colour name", colorHint(f.Color))
	}
	checkAlarm(ps, p+".alarm", &f.Alarm, false)
}

// OffsetProblem says why offset o cannot shift the events of kind k (a
// kinds entry's offset), with a hint; it returns "" when o is fine.
func OffsetProblem(k Kind, o time.Duration) (msg, hint string) {
	switch {
	case o < -MaxOffset || o > MaxOffset:
		return "must be within -12h..12h", `e.g. "-30m" for 30 minutes before`
	case o != 0 && k.Name == KindLighting:
		return "has no meaning for lighting: the lamp times follow from the target", "remove the offset; use latest_off or earliest_on to bound the lamps"
	case o != 0 && k.IsAllDay():
		return fmt.Sprintf("has no meaning for %s: its entries name a date, not a time", k.Name), "remove the offset"
	}
	return "", ""
}

func (ks *KindSpec) validate(ps *problems, p string) {
	if ks.Kind.IsZero() {
		ps.add(p+".kind", "", msgRequired, "one of: "+strings.Join(KindNames, ", "))
		return
	}
	if _, ok := kindIndex[ks.Kind.Name]; !ok {
		ps.add(p+".kind", ks.Kind.Name, "unknown kind", nearValue(ks.Kind.Name, KindNames, ""))
		return
	}
	// Kinds built in code bypass ParseKind: check the thresholds again.
	if _, err := ParseKind(ks.Kind.String()); err != nil {
		ps.add(p+".kind", ks.Kind.String(), "malformed threshold", err.Error())
	}
	if msg, hint := OffsetProblem(ks.Kind, ks.Offset.D()); msg != "" {
		ps.add(p+".offset", ks.Offset.String(), msg, hint)
	}
	checkText(ps, p+".label", ks.Label, false, MaxTextLength)
	mi := ks.MaxIllumination
	switch {
	case math.IsNaN(mi) || mi < 0 || mi > 1:
		ps.add(p+".max_illumination", ftoa(mi), "must be within 0..1", IlluminationHint(ftoa(mi)))
	case mi != 0 && ks.Kind.Name != "dark-window":
		ps.add(p+".max_illumination", ftoa(mi), "applies only to dark-window", "remove it, or use kind: dark-window")
	}
	ks.validateBand(ps, p)
	ks.validateOptions(ps, p)
}

// BandDefaults are the altitude bounds (degrees) of golden-hour and
// blue-hour when the kinds entry sets no low or high (common practice).
var BandDefaults = map[string][2]float64{"golden-hour": {-4, 6}, "blue-hour": {-6, -4}}

// Band returns the altitude bounds of a golden-hour or blue-hour entry: its
// low and high options, else the defaults.
func (ks *KindSpec) Band() (low, high float64) {
	d := BandDefaults[ks.Kind.Name]
	low, high = d[0], d[1]
	if ks.Low != nil {
		low = *ks.Low
	}
	if ks.High != nil {
		high = *ks.High
	}
	return low, high
}

// validateBand checks the low and high options: golden-hour and blue-hour
// only, within -90..90, low below high.
func (ks *KindSpec) validateBand(ps *problems, p string) {
	if ks.Low == nil && ks.High == nil {
		return
	}
	if _, ok := BandDefaults[ks.Kind.Name]; !ok {
		key, v := "low", ks.Low
		if v == nil {
			key, v = "high", ks.High
		}
		ps.add(p+"."+key, ftoa(*v), "applies only to golden-hour and blue-hour", fmt.Sprintf(`for a band of your own write kind: "sun-band:<low>..<high>", e.g. "sun-band:%s..30"`, ftoa(*v)))
		return
	}
	for _, o := range []struct {
		key string
		v   *float64
	}{{"low", ks.Low}, {"high", ks.High}} {
		if o.v != nil && !(*o.v > -90 && *o.v < 90) {
			ps.add(p+"."+o.key, ftoa(*o.v), "must be above -90 and below 90", "the Sun's altitude in degrees, negative below the horizon")
			return
		}
	}
	if lo, hi := ks.Band(); !(lo < hi) {
		key, v := "low", lo
		if ks.Low == nil {
			key, v = "high", hi
		}
		ps.add(p+"."+key, ftoa(v), fmt.Sprintf("the band %s..%s is empty: low must be below high", ftoa(lo), ftoa(hi)), fmt.Sprintf("the default %s is %g..%g", ks.Kind.Name, BandDefaults[ks.Kind.Name][0], BandDefaults[ks.Kind.Name][1]))
	}
}
