package config

import (
	"bytes"
	"cmp"
	_ "embed"
	"encoding/binary"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"sync"
	"time"
	"unicode"
	"unicode/utf16"
	"unicode/utf8"

	"github.com/go-viper/mapstructure/v2"
	"github.com/pelletier/go-toml/v2"
	"github.com/spf13/viper"
	"go.yaml.in/yaml/v3"
)

// Defaults applied after parsing when a key is absent.
const (
	DefaultListen       = ":8080"
	DefaultOutDir       = "public"
	DefaultRefresh      = "15 3 * * *" // nightly at 03:15
	DefaultMaxFeedBytes = 1000000      // some web calendars drop subscriptions over about 1 MB
	DefaultDaysBack     = 30
	DefaultDaysAhead    = 365
	// MaxWindowDays bounds days_back + days_ahead: ten years.
	MaxWindowDays = 3653
	// maxFileBytes bounds what Parse reads; a configuration is a few kB.
	maxFileBytes = 8 << 20
)

// ErrUnreadable is wrapped by errors for input that is not a YAML, TOML or
// JSON document at all (syntax errors, wrong top-level shape, too large).
var ErrUnreadable = errors.New("cannot read the file")

// errNoSuchFile words a missing configuration file once; it is
// fs.ErrNotExist.
var errNoSuchFile = noSuchFile{}

type noSuchFile struct{}

func (noSuchFile) Error() string        { return "no such file" }
func (noSuchFile) Is(target error) bool { return target == fs.ErrNotExist }

// LookupEnv looks up one environment variable; os.LookupEnv fits. A nil
// LookupEnv means no environment.
type LookupEnv func(key string) (string, bool)

// envVars maps each environment override to the key it replaces. Only
// deployment settings can be overridden.
var envVars = []struct{ name, path string }{
	{"HELIOCAL_LISTEN", "service.listen"},
	{"HELIOCAL_OUT_DIR", "service.out_dir"},
	{"HELIOCAL_BASE_URL", "service.base_url"},
	{"HELIOCAL_REFRESH", "service.refresh"},
	{"HELIOCAL_REFRESH_ZONE", "service.refresh_zone"},
	{"HELIOCAL_MAX_FEED_BYTES", "service.max_feed_bytes"},
}

// EnvNames lists the environment variables heliocal reads, in the order
// documented: HELIOCAL_LISTEN, HELIOCAL_OUT_DIR, HELIOCAL_BASE_URL,
// HELIOCAL_REFRESH, HELIOCAL_REFRESH_ZONE, HELIOCAL_MAX_FEED_BYTES.
var EnvNames = func() []string {
	out := make([]string, len(envVars))
	for i, e := range envVars {
		out[i] = e.name
	}
	return out
}()

// Parse reads a configuration in the given format ("yaml", "yml", "toml" or
// "json"), applies the defaults and validates it. The environment is not
// consulted (see ParseEnv). Every problem is reported at once in a
// *ValidationError; input that is no document at all gives an error wrapping
// ErrUnreadable.
func Parse(r io.Reader, format string) (*Config, error) {
	return ParseEnv(r, format, nil)
}

// ParseEnv is Parse with environment overrides of the deployment settings
// (see EnvNames) looked up through env.
func ParseEnv(r io.Reader, format string, env LookupEnv) (*Config, error) {
	return parseFrom(r, format, env, "")
}

// parseFrom is ParseEnv for a file in the directory dir (see parse).
func parseFrom(r io.Reader, format string, env LookupEnv, dir string) (*Config, error) {
	f := strings.ToLower(strings.TrimPrefix(format, "."))
	switch f {
	case "yml":
		f = "yaml"
	case "yaml", "toml", "json":
	default:
		return nil, fmt.Errorf("config: unsupported format %q (use yaml, toml or json)", format)
	}
	data, err := io.ReadAll(io.LimitReader(r, maxFileBytes+1))
	if err != nil {
		return nil, fmt.Errorf("%w: %w", ErrUnreadable, err)
	}
	if len(data) > maxFileBytes {
		return nil, fmt.Errorf("%w: larger than %d MiB (%d bytes), where a configuration takes a few kB: is it the configuration?", ErrUnreadable, maxFileBytes>>20, maxFileBytes)
	}
	return parse(data, f, env, dir)
}

// parse reads a configuration; dir is the directory of the file it came
// from, where a relative skyline file name is read from ("" for the
// working directory: standard input, the demo).
func parse(data []byte, format string, env LookupEnv, dir string) (c *Config, err error) {
	// UTF-16 with its byte order mark, as Windows editors save "Unicode"
	// text: read as the same text in UTF-8 (the YAML decoder reads it,
	// the TOML and JSON decoders see a character out of place)
	data = fromUTF16(data)
	if line, b, ok := notUTF8(data); ok {
		return nil, unreadable(format, fmt.Sprintf("line %d: the byte 0x%02X is not UTF-8 text, which a configuration is written in (save the file as UTF-8)", line, b))
	}
	if format != "yaml" {
		// A byte order mark, which some Windows editors write at the
		// start of a UTF-8 file: the YAML decoder skips it, the TOML and
		// JSON decoders take it for a character out of place ("ï").
		data = bytes.TrimPrefix(data, []byte("\ufeff"))
	}
	if format == "json" && len(bytes.TrimSpace(data)) == 0 {
		// an empty file configures nothing, as an empty YAML or TOML
		// file does ("sites: no sites"), rather than "unexpected end
		// of JSON input"
		data = []byte("{}")
	}
	if format == "yaml" {
		if data, err = yamlVersion(data); err != nil {
			return nil, err
		}
		if line, end := secondDocument(data); end > 0 {
			return nil, unreadable("yaml", fmt.Sprintf("line %d: a second document begins here, after the end marker ... of line %d, and heliocal reads one (write every site and feed under one sites: and one feeds:, without ...)", line, end))
		} else if line > 0 {
			return nil, unreadable("yaml", fmt.Sprintf("line %d: a second document begins here with ---, and heliocal reads one (write every site and feed under one sites: and one feeds:)", line))
		}
	}
	// Duplicate keys are problems of their own; the first of each is kept
	// so that every other problem of the document is listed with them.
	dups, doc, places := duplicateKeys(data, format)
	decoded, decodedAs := data, format
	if len(dups) > 0 {
		decoded, decodedAs = withoutDuplicates(data, format)
		doc = nil // the text without them is decoded
	}
	v := viper.New()
	v.SetConfigType(decodedAs)
	if err := readConfig(v, decoded, doc); err != nil {
		if format == "toml" {
			if quoted, ok := quoteTOMLValues(data, decoded); ok {
				return parse(quoted, format, env, dir)
			}
		}
		if len(dups) > 0 {
			return nil, newValidationError(dups)
		}
		return nil, unreadable(format, syntaxMessage(err, data)+formatHint(data, format))
	}
	explicit := explicitWindows(v.Get("feeds"))
	located := explicitCoordinates(v.Get("sites"))

	c = new(Config)
	var problems []FieldError
	if err := v.UnmarshalExact(c, viper.DecodeHook(decodeHook()), func(dc *mapstructure.DecoderConfig) {
		dc.WeaklyTypedInput = false
	}); err != nil {
		// the values as written, read again for the problems: a document
		// kept from the start through the decoding held 1.5 times the
		// memory of a 3,000-site configuration's check
		var written *yaml.Node
		if format == "yaml" {
			written = yamlDocument(data)
		}
		decoded := decodeProblems(err, written)
		settings := v.AllSettings() // built afresh by each call: once for all problems
		problems = make([]FieldError, len(decoded))
		for i, d := range decoded {
			problems[i] = d.FieldError
			if problems[i].Msg == msgUnknownKey {
				if h := kindParamHint(settings, problems[i].Path, format); h != "" {
					problems[i].Hint = h // target: 16h beside kind: lighting
				} else if format == "toml" {
					problems[i].Hint = tomlTableHint(settings, problems[i].Path, problems[i].Value, problems[i].Hint)
				}
			}
			if format == "toml" && d.given == valueNumber {
				if w := tomlNumberAt(data, places, problems[i].Path); w != "" {
					problems[i].Value = w // start = 17.30 as written, not 17.3
				}
			}
			n := yamlScalarAt(written, problems[i].Path)
			if n != nil && d.given == valueNumber &&
				(n.Tag == "!!int" || n.Tag == "!!float") && n.Style == 0 && n.Value != problems[i].Value {
				problems[i].Value = n.Value // 1e3 as written, not the 1000 it is
			}
			if problems[i].Value == "" { // a mapping or a list given as one value: name it
				problems[i].Value = rawAt(settings, problems[i].Path)
				if d.list && d.given == valueMapping && problems[i].Hint == "" {
					problems[i].Hint = listHint(format, problems[i].Path)
				}
				if key, value, ok := yamlEquals(problems[i].Value); ok && format == "yaml" && problems[i].Hint == "" &&
					d.given == valueText && !strings.Contains(value, "=") {
					// "service:" and "listen = ':8080'" on the line below it: one text
					problems[i].Hint = fmt.Sprintf("YAML writes a key with a colon, not =: %s: %s", key, value)
				}
			}
		}
	}

	if format == "yaml" {
		problems = append(problems, commentValues(data, places)...)
	}
	for i := range c.Sites {
		problems = append(problems, c.Sites[i].resolveHorizon(fmt.Sprintf("sites[%d].horizon", i), dir, format)...)
	}
	fromEnv, envProblems := applyEnv(c, env)
	problems = append(problems, envProblems...)
	applyDefaults(c, explicit)
	for i := range c.Sites {
		for j, key := range [2]string{"latitude", "longitude"} {
			if i < len(located) && !located[i][j] {
				problems = append(problems, FieldError{Path: fmt.Sprintf("sites[%d].%s", i, key), Msg: msgRequired,
					Hint: coordinateText[key]})
			}
		}
	}
	for i := range problems {
		if problems[i].Msg != msgUnknownZone {
			continue
		}
		site, key, _ := strings.Cut(problems[i].Path, ".")
		list, n := splitSegment(site)
		if list != "sites" || key != "timezone" || n < 0 || n >= len(c.Sites) || n >= len(located) || !located[n][0] || !located[n][1] {
			continue
		}
		problems[i].Hint = zoneHintAt(problems[i].Value, c.Sites[n].Latitude, c.Sites[n].Longitude, "site", "timezone")
	}
	// The zones of sites without one are looked up only for a file
	// without other problems; until then a missing zone is no problem.
	inferred := len(problems) == 0
	if inferred {
		problems = append(problems, inferZones(c)...)
	}

	unreadSites := slices.ContainsFunc(problems, func(p FieldError) bool { return p.Path == "sites" })
	var verr *ValidationError
	if err := c.Validate(); errors.As(err, &verr) {
		for _, p := range verr.Problems {
			if !inferred && p.Msg == msgZoneNotSet {
				continue
			}
			if covered(p.Path, problems) {
				continue
			}
			if p.Msg == msgNoSuchSite && unreadSites {
				continue // the sites could not be read: their ids are unknown, not missing
			}
			if p.Msg == msgNeedsStart && covered(p.Path[:strings.LastIndexByte(p.Path, '.')]+".start", problems) {
				continue // the start is written, as a value that could not be read
			}
			problems = append(problems, p)
		}
	}
	if len(dups) > 0 {
		var rest []FieldError
		for _, p := range problems {
			if !covered(p.Path, dups) {
				rest = append(rest, p)
			}
		}
		problems = append(dups, rest...)
	}
	for i := range problems {
		if name, ok := fromEnv[problems[i].Path]; ok { // one bracket: "(set by HELIOCAL_LISTEN; e.g. …)"
			if problems[i].Hint == "" {
				problems[i].Hint = "set by " + name
			} else {
				problems[i].Hint = "set by " + name + "; " + problems[i].Hint
			}
		}
	}
	lines := fieldLines{places: places}
	for i := len(dups); i < len(problems); i++ { // the duplicates come first, and name their lines
		if _, env := fromEnv[problems[i].Path]; !env {
			problems[i].Line = lines.of(problems[i].Path)
		}
	}
	if format == "yaml" {
		problems = kindsWithColon(problems)
	}
	problems = slices.DeleteFunc(problems, func(p FieldError) bool { return writtenAs(p, problems) })
	for i := range problems {
		if open, inner, end, ok := typographicQuoted(problems[i].Value); ok {
			// a phone or a word processor's quotes: part of the text
			problems[i].Hint = fmt.Sprintf("the quotes %s %s are typographic, part of the text: write %q, in straight quotes", open, end, inner)
			if format == "yaml" {
				problems[i].Hint += ", or without quotes"
			}
		}
	}
	if len(problems) > 0 {
		ve := newValidationError(problems)
		// named file:line: as a compiler names them, they come in the
		// file's order; those of no line (set by the environment, a
		// duplicate naming its own lines) before them
		slices.SortStableFunc(ve.Problems, func(a, b FieldError) int { return cmp.Compare(a.Line, b.Line) })
		return nil, ve
	}
	return c, nil
}

// yamlDocument is the YAML document of data, nil when it is none (or the
// decoder panics on hostile input, as duplicateKeys allows).
func yamlDocument(data []byte) (doc *yaml.Node) {
	defer func() {
		if recover() != nil {
			doc = nil
		}
	}()
	var n yaml.Node
	if yaml.Unmarshal(data, &n) != nil || n.Kind != yaml.DocumentNode {
		return nil
	}
	return &n
}

// yamlScalarAt is the scalar node of the YAML document doc at a decoder
// path ("sites[0].name", keys in any case); nil when there is none there.
func yamlScalarAt(doc *yaml.Node, path string) *yaml.Node {
	if doc == nil || doc.Kind != yaml.DocumentNode || len(doc.Content) != 1 {
		return nil
	}
	n := doc.Content[0]
	for _, seg := range strings.Split(path, ".") {
		name, idx, _ := strings.Cut(seg, "[")
		if name != "" {
			if n.Kind != yaml.MappingNode {
				return nil
			}
			var next *yaml.Node
			for i := 0; i+1 < len(n.Content); i += 2 {
				if strings.EqualFold(n.Content[i].Value, name) {
					next = n.Content[i+1]
					break
				}
			}
			if next == nil {
				return nil
			}
			n = next
		}
		for idx != "" {
			num, rest, _ := strings.Cut(idx, "]")
			i, err := strconv.Atoi(num)
			if err != nil || n.Kind != yaml.SequenceNode || i < 0 || i >= len(n.Content) {
				return nil
			}
			n, idx = n.Content[i], strings.TrimPrefix(rest, "[")
		}
	}
	if n.Kind != yaml.ScalarNode {
		return nil
	}
	return n
}

// fieldLines finds the lines fields are written on (of), from places,
// where the keys (and YAML's list items) are.
type fieldLines struct {
	places map[string]keyPlace
	// firsts is the line of the first key of each list item ("sites[3]"),
	// gathered from places at the first lookup that needs it
	firsts map[string]int
}

// of is the line the field at path is written on; for a field not written
// (a key that is missing, a default), the line of the nearest mapping or
// list item around it that is; 0 when none is.
func (l *fieldLines) of(path string) int {
	for p := strings.ToLower(path); p != ""; {
		if at, ok := l.places[p]; ok && at.line > 0 {
			return at.line
		}
		if strings.HasSuffix(p, "]") {
			// a TOML [[sites]] entry has no key of its own: the line of
			// its first key, for a field missing from it
			if first := l.first(p); first > 0 {
				return first
			}
		}
		i := strings.LastIndexAny(p, ".[")
		if i < 0 {
			break
		}
		p = p[:i]
	}
	return 0
}

// first is the first line of the keys within the list item p ("sites[3]":
// those whose path begins with "sites[3]."), 0 when there is none.
func (l *fieldLines) first(p string) int {
	if l.firsts == nil {
		l.firsts = map[string]int{}
		for q, at := range l.places {
			if at.line <= 0 {
				continue
			}
			for i := 0; i+1 < len(q); i++ {
				if q[i] != ']' || q[i+1] != '.' {
					continue
				}
				if f, ok := l.firsts[q[:i+1]]; !ok || at.line < f {
					l.firsts[q[:i+1]] = at.line
				}
			}
		}
	}
	return l.firsts[p]
}

// fromUTF16 is data in UTF-8 when it is UTF-16 text that begins with its
// byte order mark (FF FE little-endian, FE FF big-endian), data itself
// otherwise. A last odd byte is dropped; unpaired surrogates become
// U+FFFD.
func fromUTF16(data []byte) []byte {
	var order binary.ByteOrder
	switch {
	case bytes.HasPrefix(data, []byte{0xFF, 0xFE}):
		order = binary.LittleEndian
	case bytes.HasPrefix(data, []byte{0xFE, 0xFF}):
		order = binary.BigEndian
	default:
		return data
	}
	units := make([]uint16, 0, len(data)/2-1)
	for i := 2; i+1 < len(data); i += 2 {
		units = append(units, order.Uint16(data[i:]))
	}
	return []byte(string(utf16.Decode(units)))
}

// notUTF8 finds the first byte of data that is not UTF-8 text (a file
// saved as Latin-1 or Windows-1252: "caf\xe9"), with its line; the
// decoders say "incomplete UTF-8 octet sequence" without one.
func notUTF8(data []byte) (line int, b byte, found bool) {
	if utf8.Valid(data) {
		return 0, 0, false
	}
	for i := 0; i < len(data); {
		r, size := utf8.DecodeRune(data[i:])
		if r == utf8.RuneError && size <= 1 {
			return bytes.Count(data[:i], []byte("\n")) + 1, data[i], true
		}
		i += size
	}
	return 0, 0, false
}

// yamlVersion reads the directives of data, the lines starting with "%"
// before its first content. The decoder takes "%YAML 1.1" alone, and
// refuses "%YAML 1.2", the version of most files that declare one, with its
// bare "found incompatible YAML document"; yet it reads every document
// alike, by YAML 1.2's rules for the most part, whatever version the
// document declares. A 1.2 document is therefore read as one without the
// directive: data comes back with its version written 1.1, in as many
// bytes, so that the lines and columns of other messages stay right.
// Another version (or none), or directives not followed by the document
// marker "---" (which the decoder reports as a key out of place), is an
// error naming the line.
func yamlVersion(data []byte) ([]byte, error) {
	out := data
	n, end := 0, 0    // the line, and the offset of its end
	last, at := "", 0 // the last directive, as written, and its line
	for l := range bytes.Lines(data) {
		n, end = n+1, end+len(l)
		t := bytes.TrimRight(l, "\r\n")
		if n == 1 {
			t = bytes.TrimPrefix(t, []byte("\ufeff")) // a byte order mark
		}
		switch {
		case len(bytes.TrimSpace(t)) == 0 || t[0] == '#':
			continue
		case t[0] != '%' && last != "" && !docMarker(t, "---"):
			return nil, unreadable("yaml", fmt.Sprintf("line %d: the directive %s is not followed by ---, the start of the document (add a line --- before line %d, or remove the directive)", at, last, n))
		case t[0] != '%':
			return out, nil
		}
		fields := strings.Fields(string(t))
		if i := slices.IndexFunc(fields, func(f string) bool { return f[0] == '#' }); i > 0 {
			fields = fields[:i] // a comment after the directive
		}
		last, at = strings.Join(fields, " "), n
		if fields[0] != "%YAML" {
			continue // %TAG, or a directive the decoder ignores
		}
		version := ""
		if len(fields) > 1 {
			version = fields[1]
		}
		switch major, minor, _ := strings.Cut(version, "."); {
		case major == "1" && minor == "1":
		case major == "1" && minor == "2":
			out = bytes.Clone(data)
			i := end - len(l) + bytes.Index(l, []byte("%YAML")) + len("%YAML")
			i += bytes.Index(out[i:], []byte(version))
			out[i+len(version)-1] = '1' // "1.2" read as the decoder's "1.1"
		case version == "":
			return nil, unreadable("yaml", fmt.Sprintf("line %d: %%YAML without a version (heliocal reads YAML 1.1 and 1.2: write %%YAML 1.2, or remove the line)", n))
		default:
			return nil, unreadable("yaml", fmt.Sprintf("line %d: %%YAML %s: a version of YAML heliocal does not read (it reads 1.1 and 1.2: write %%YAML 1.2, or remove the line)", n, version))
		}
	}
	return out, nil
}

// secondDocument returns the line where a second YAML document with content
// begins, 0 when there is none: the decoder reads the first document alone,
// and the sites and feeds of the others would be dropped without a word. A
// second document begins at a document marker ("---") that follows content,
// or at content that follows a document end marker ("...", whose line is
// end then; 0 for a "---"). A marker before the first content, or one
// followed by comments only, is no second document. The lines are looked
// at first; the decoder reads the file again only when a marker follows
// content.
func secondDocument(data []byte) (line, end int) {
	content, i := false, -1
	for l := range bytes.Lines(data) { // the lines without a copy of their list: every YAML file is looked at
		l, i = bytes.TrimRight(l, "\r\n"), i+1
		marker := docMarker(l, "---")
		switch {
		case marker && content:
			line, end = i+1, 0
		case docMarker(l, "...") && content:
			if end == 0 {
				end = i + 1
			}
			continue
		case marker, len(bytes.TrimSpace(l)) == 0, l[0] == '#', l[0] == '%', docMarker(l, "..."):
			continue
		case end > 0:
			line = i + 1
		default:
			content = true
			continue
		}
		break
	}
	if line == 0 {
		return 0, 0
	}
	dec := yaml.NewDecoder(bytes.NewReader(data))
	var first, second yaml.Node
	if dec.Decode(&first) != nil {
		return 0, 0 // a syntax error the reader reports
	}
	if end > 0 {
		// The decoder wants a "---" before a document that follows a
		// "...", and the reader, which decodes the first one alone,
		// never sees the rest.
		return line, end
	}
	if dec.Decode(&second) != nil {
		return 0, 0 // one document, or a syntax error the reader reports
	}
	for _, n := range second.Content {
		if n.Kind != yaml.ScalarNode || n.Tag != "!!null" {
			return line, 0
		}
	}
	return 0, 0
}

// docMarker reports whether the line l is the YAML document marker m
// ("---" or "..."), alone or followed by a space, a tab or a comment.
func docMarker(l []byte, m string) bool {
	return bytes.HasPrefix(l, []byte(m)) && (len(l) == 3 || l[3] == ' ' || l[3] == '\t')
}

// readConfig runs viper's reader, turning a panic of a format decoder on
// hostile input into an error: the file is then unreadable, never a crash.
//
// doc, when not nil, is data's YAML document as duplicateKeys parsed
// it: decoded from there, the text is not parsed a second time. The map
// is the one viper's ReadConfig would decode from the text (the same
// decoder, from the same document), which MergeConfigMap takes into the
// empty configuration as ReadConfig would; a document that does not
// decode as a mapping is read from the text, whose error is the one
// reported.
func readConfig(v *viper.Viper, data []byte, doc *yaml.Node) (err error) {
	defer func() {
		if r := recover(); r != nil {
			err = fmt.Errorf("malformed document")
		}
	}()
	if doc != nil {
		m := map[string]any{}
		if doc.Decode(&m) == nil {
			return v.MergeConfigMap(m)
		}
	}
	return v.ReadConfig(bytes.NewReader(data))
}

// tomlLine is a TOML table header ("[service]", "[[sites]]") or key/value
// line ("listen = ':8080'"); neither is valid at the top of a YAML mapping
// of heliocal's keys. Compiled at first use: most commands never need it.
var tomlLine = sync.OnceValue(func() *regexp.Regexp {
	return regexp.MustCompile(`^(\[\[?[A-Za-z0-9_."-]+\]\]?\s*(#.*)?|[A-Za-z0-9_."-]+\s*=.*)$`)
})

// yamlLine is a YAML key of heliocal's ("sites:", "service: {…}"), the
// document marker "---" or a list item: no TOML or JSON line starts so.
var yamlLine = sync.OnceValue(func() *regexp.Regexp {
	return regexp.MustCompile(`^([A-Za-z_][A-Za-z0-9_-]*:(\s.*)?|---(\s.*)?|- .*)$`)
})

// SniffFormat tells the format of a configuration without a file name
// (standard input) from its first significant line: "{" starts JSON, a
// TOML table header or key = value line is TOML, anything else is read as
// YAML.
func SniffFormat(data []byte) string {
	format, _, _ := sniff(data)
	return format
}

// sniff is SniffFormat with the line (from 1) that tells the format, and
// whether it shows it (false: YAML by default, no line like YAML's).
func sniff(data []byte) (format string, line int, shown bool) {
	for l := range bytes.Lines(data) {
		line++
		t := strings.TrimSpace(strings.TrimPrefix(string(l), "\ufeff"))
		switch {
		case t == "" || strings.HasPrefix(t, "#"):
			continue
		case strings.HasPrefix(t, "{"):
			return "json", line, true
		case tomlLine().MatchString(t):
			return "toml", line, true
		}
		return "yaml", line, yamlLine().MatchString(t)
	}
	return "yaml", 0, false
}

// formatHint is what follows a syntax error of data read as format when
// its first significant line is written in another format: the file's
// name chose the format ("; line 1 is TOML, but the file's name makes it
// read as YAML (rename it .toml, or write it in YAML)"); "" otherwise.
func formatHint(data []byte, format string) string {
	other, line, shown := sniff(data)
	if !shown || other == format {
		return ""
	}
	name := map[string]string{"yaml": "YAML", "toml": "TOML", "json": "JSON"}
	return fmt.Sprintf("; line %d is %s, but the file's name makes it read as %s (rename it .%s, or write it in %s)",
		line, name[other], name[format], other, name[format])
}

// syntaxMessage words a reader error on one line, with the line number
// when the format's decoder knows it.
func syntaxMessage(err error, data []byte) string {
	var inner error = err
	if u := errors.Unwrap(err); u != nil {
		inner = u // drop viper's "While parsing config:" wrapper
	}
	msg := inner.Error()
	msg = strings.Replace(msg, "unmarshal errors:\n", "", 1)
	var lines []string
	for _, l := range strings.Split(msg, "\n") {
		if l = strings.Join(strings.Fields(l), " "); l != "" {
			lines = append(lines, l)
		}
	}
	msg = strings.Join(lines, "; ")
	if what, ok := topNotMapping(msg); ok {
		return what + ", not a mapping of keys (a configuration starts with keys such as sites: and feeds:)"
	}
	var pos interface{ Position() (int, int) } // TOML decoder errors
	var js *json.SyntaxError
	switch {
	case errors.As(err, &pos):
		row, col := pos.Position()
		if bare := tomlBareText(data, row); bare != "" {
			msg = fmt.Sprintf("line %d: %s", row, bare) // not the parser's "incomplete number"
			break
		}
		if slip := tomlSlip(msg, data, row); slip != "" {
			msg = slip
			break
		}
		msg = fmt.Sprintf("line %d, column %d: %s%s", row, col, tomlValueAt(data, row, col), msg)
	case errors.As(err, &js):
		off := min(int(js.Offset), len(data))
		// the offset is past the character at fault: a line break
		// within text is on the line it ends
		row := bytes.Count(data[:max(off-1, 0)], []byte("\n")) + 1
		hint := jsonHint(msg, data[:off])
		if hint == "" && formatHint(data, "json") == "" { // not a document of another format
			hint = jsonValueHint(msg, data, off)
		}
		msg = fmt.Sprintf("line %d: %s%s", row, msg, hint)
	default:
		msg = yamlTabMessage(msg, data)
	}
	return msg
}

// topNotMapping recognises the decoders' words for a document that is a
// list, a text or a number rather than a mapping ("yaml: line 1: cannot
// unmarshal !!seq into map[string]interface {}", "json: cannot unmarshal
// array into Go value of type map[string]interface {}") and says what the
// document is instead, with the line when the decoder gives one.
func topNotMapping(msg string) (string, bool) {
	m := topNotMappingRE().FindStringSubmatch(msg)
	if m == nil {
		return "", false
	}
	what := map[string]string{
		"!!seq": "a list", "array": "a list",
		"!!str": "text", "string": "text",
		"!!int": "a number", "!!float": "a number", "number": "a number",
		"!!bool": "true or false", "bool": "true or false",
		"!!timestamp": "a date",
	}[m[2]]
	if what == "" {
		what = m[2]
	}
	if m[1] != "" {
		return "line " + m[1] + ": the document is " + what, true
	}
	return "the document is " + what, true
}

var topNotMappingRE = sync.OnceValue(func() *regexp.Regexp {
	return regexp.MustCompile("^(?:yaml|json): (?:line ([0-9]+): )?cannot unmarshal (\\S+)(?: `[^`]*`)? into (?:Go value of type )?map\\[string\\]interface \\{\\}$")
})

// tomlValueAt names the unquoted value (a date, a time or a number) that
// the TOML decoder refused at line row, column col of data, and the key it
// is given to when it is written on that line: "dates: 2027-02-30: " for
// `dates = [2027-06-12, 2027-02-30]`; "" when no such value starts there.
func tomlValueAt(data []byte, row, col int) string {
	l, ok := lineAt(data, row)
	if !ok || col < 1 || col > len(l) {
		return ""
	}
	line := string(bytes.TrimRight(l, "\r"))
	if col > len(line) || line[col-1] < '0' || line[col-1] > '9' {
		return ""
	}
	value := string(valueFrom([]byte(line), col))
	key, _, ok := strings.Cut(line[:col-1], "=")
	if key = strings.TrimSpace(key); !ok || key == "" || strings.ContainsAny(key, "[{\"'") {
		return value + ": "
	}
	return key + ": " + value + ": "
}

// lineAt is line row (from 1) of data, as written up to its "\n"; false
// past the last line. It finds the one line without splitting the file.
func lineAt(data []byte, row int) ([]byte, bool) {
	if row < 1 {
		return nil, false
	}
	for ; row > 1; row-- {
		i := bytes.IndexByte(data, '\n')
		if i < 0 {
			return nil, false
		}
		data = data[i+1:]
	}
	if i := bytes.IndexByte(data, '\n'); i >= 0 {
		data = data[:i]
	}
	return data, true
}

// jsonHint says what the usual slips that give the JSON decoder's syntax
// error msg are, read before holds the document up to the error: a comma
// before a closing bracket, text in single quotes, a comment, a key
// without quotes, a missing colon or comma; "" for other errors.
func jsonHint(msg string, before []byte) string {
	prev := bytes.TrimRight(before, " \t\r\n")
	if len(prev) > 0 {
		prev = bytes.TrimRight(prev[:len(prev)-1], " \t\r\n") // the character at fault
	}
	switch {
	case (strings.HasPrefix(msg, "invalid character '}'") || strings.HasPrefix(msg, "invalid character ']'")) && bytes.HasSuffix(prev, []byte(",")):
		return " (JSON has no comma after the last item of a list or mapping)"
	case strings.HasPrefix(msg, `invalid character '\''`):
		return ` (JSON writes text and keys in double quotes: "sites")`
	case strings.HasPrefix(msg, "invalid character '/'") || strings.HasPrefix(msg, "invalid character '#'"):
		return " (JSON has no comments)"
	case strings.HasSuffix(msg, "looking for beginning of object key string"):
		return ` (JSON writes keys in double quotes: "sites")`
	case strings.HasSuffix(msg, "after object key"): // {"id" "a"}: not a comma
		return ` (a colon is missing between the key and its value, as in "id": "a")`
	case strings.HasPrefix(msg, `invalid character '"' after`):
		return " (a comma is missing before it)"
	}
	return ""
}

// jsonValueHint says what the JSON decoder's syntax error msg, at the
// offset off of data (past the character at fault), shows when it is no
// slip of jsonHint's: a value JSON does not have (text without quotes,
// True, NaN, a number with a + or a leading zero), a line break within
// text, a comma missing between items, a second document, or a bracket
// never closed; "" for other errors.
func jsonValueHint(msg string, data []byte, off int) string {
	word := ""
	if off >= 1 {
		w := data[off-1:]
		if i := bytes.IndexAny(w, " \t\r\n,:]}"); i >= 0 {
			w = w[:i]
		}
		word = string(w)
	}
	prev := bytes.TrimRight(data[:max(off-1, 0)], " \t\r\n")
	switch {
	case strings.HasSuffix(msg, "looking for beginning of value") && word != "":
		switch c := word[0]; {
		case strings.EqualFold(word, "true") || strings.EqualFold(word, "false"):
			return fmt.Sprintf(" (JSON writes %s in small letters)", strings.ToLower(word))
		case strings.EqualFold(word, "nan") || strings.EqualFold(word, "infinity"):
			return " (JSON has no " + word + ": write a number)"
		case c == '+':
			return fmt.Sprintf(" (a number does not begin with + in JSON: write %s)", word[1:])
		case c < utf8.RuneSelf && unicode.IsLetter(rune(c)):
			return fmt.Sprintf(" (JSON writes text in double quotes: %q)", word)
		}
	case strings.HasPrefix(msg, "invalid character '\\n' in string literal"):
		return " (the text in quotes is not closed on its line; JSON writes a line break within text as \\n)"
	case strings.HasSuffix(msg, "after object key:value pair") || strings.HasSuffix(msg, "after array element"):
		if word != "" && word[0] >= '0' && word[0] <= '9' && bytes.HasSuffix(prev, []byte("0")) {
			return " (a number does not begin with 0 in JSON: write it without the leading zeros)"
		}
		return " (a comma is missing before it)"
	case strings.HasSuffix(msg, "after top-level value"):
		return " (a JSON file holds one document: its sites and feeds go in one {…})"
	case msg == "unexpected end of JSON input":
		return " (a { or [ is not closed with its } or ])"
	}
	return ""
}

// tomlBareText words line row of TOML data when its value is text written
// without quotes (`timezone = Europe/Vienna`, `kinds = [sunrise, sunset]`),
// which the TOML parser refuses as a malformed number: the line as written
// and the line to write, `timezone = "Europe/Vienna"`; "" for other lines.
func tomlBareText(data []byte, row int) string {
	l, ok := lineAt(data, row)
	if !ok {
		return ""
	}
	key, value, ok := strings.Cut(strings.TrimSpace(strings.TrimRight(string(l), "\r")), "=")
	key, value = strings.TrimSpace(key), strings.TrimSpace(value)
	if i := strings.Index(value, " #"); i >= 0 { // a comment after the value
		value = strings.TrimSpace(value[:i])
	}
	if !ok || key == "" || value == "" || strings.ContainsAny(key, "[{\"'") {
		return ""
	}
	if k := strings.ToLower(key); k != "latitude" && k != "longitude" && slices.Contains(numberKeys, k) && numberWithUnit(value) {
		// elevation = 650m: the number, not "650m" in quotes (a
		// coordinate's slips are tomlSlip's)
		if hint := NumberTextHint(k, value); hint != "" {
			return fmt.Sprintf("%s = %s: %s", key, value, hint)
		}
	}
	// quoted says w in quotes when it is text written bare (a word that
	// begins with a letter and is none of TOML's own words), yes and no as
	// TOML's true and false, else w
	quoted := func(w string) (string, bool) {
		w = strings.TrimSpace(w)
		r, _ := utf8.DecodeRuneInString(w)
		switch {
		case isBareDuration(w): // offset = -30m
			return strconv.Quote(w), true
		case isBareClock(w): // start = 20:00, which TOML reads as a time only with its seconds
			return strconv.Quote(w), true
		case !unicode.IsLetter(r), w == "true", w == "false", w == "inf", w == "nan", strings.ContainsAny(w, "\"'[]{}="):
			return w, false
		case strings.EqualFold(w, "true"), strings.EqualFold(w, "yes"), strings.EqualFold(w, "on"):
			return "true", true
		case strings.EqualFold(w, "false"), strings.EqualFold(w, "no"), strings.EqualFold(w, "off"):
			return "false", true
		}
		return strconv.Quote(w), true
	}
	written := value
	if inner, ok := strings.CutPrefix(value, "["); ok {
		inner, ok = strings.CutSuffix(inner, "]")
		if !ok {
			return ""
		}
		parts, bare := strings.Split(inner, ","), false
		for i, p := range parts {
			var b bool
			parts[i], b = quoted(p)
			bare = bare || b
		}
		if !bare {
			return ""
		}
		written = "[" + strings.Join(parts, ", ") + "]"
	} else {
		var bare bool
		if written, bare = quoted(value); !bare {
			return ""
		}
		switch key { // a list of one: weekdays = "sat" would be refused too
		case "kinds", "weekdays", "months", "dates", "trusted_proxies":
			written = "[" + written + "]"
		}
	}
	if written == "true" || written == "false" {
		return fmt.Sprintf("%s = %s: not a TOML value (write %s = %s)", key, value, key, written)
	}
	if after, neg := strings.CutPrefix(value, "-"); neg && strings.EqualFold(key, "alarm") && isBareDuration(value) {
		// alarm = -15m: both slips in one message, not the second after
		// the first is mended
		return fmt.Sprintf("%s = %s: text is written in quotes in TOML, and an alarm must not be negative: it is the time before each event (write %s = %q)", key, value, key, after)
	}
	return fmt.Sprintf("%s = %s: text is written in quotes in TOML (write %s = %s)", key, value, key, written)
}

// tomlSlip words the TOML parser's error msg at line row of data when the
// line shows a usual slip: a key and its value written with ":" as in
// YAML, a key with spaces, a number with thousands separators, a ' within
// text in single quotes, text in quotes not closed on its line, a comma
// after the last item of an inline table, or a list in brackets left open
// on a line above; "" for other errors.
func tomlSlip(msg string, data []byte, row int) string {
	l, ok := lineAt(data, row)
	if !ok {
		return ""
	}
	t := strings.TrimSpace(strings.TrimRight(string(l), "\r"))
	key, value, hasEq := strings.Cut(t, "=")
	key, value = strings.TrimSpace(key), strings.TrimSpace(value)
	at := func(format string, a ...any) string {
		return fmt.Sprintf("line %d: %s: ", row, t) + fmt.Sprintf(format, a...)
	}
	switch {
	case strings.HasSuffix(msg, "expected character ="):
		if k, v, ok := strings.Cut(t, ":"); ok && !hasEq && !strings.ContainsAny(k, " \"'") && strings.TrimSpace(v) != "" {
			return at("TOML writes a key and its value with =, not a colon (write %s = %s)", k, strings.TrimSpace(v))
		}
		if hasEq && strings.Contains(key, " ") && !strings.ContainsAny(key, "\"'") {
			return at("a key is written without spaces (write %s = %s)", strings.Join(strings.Fields(key), "_"), value)
		}
	case (key == "latitude" || key == "longitude") && (strings.HasPrefix(msg, "toml: expected newline but got") || strings.Contains(msg, "unable to parse float")):
		// 47,5 or 74.0W, read as a number and then more (8.5E as a
		// number without its exponent): the decimal degrees they are,
		// not 475 or 740
		if v, ok := coordinateValue(key, value); ok {
			return at("a coordinate is written in %s (write %s = %s)", coordinateUnits(key), key, v)
		}
		if !strings.ContainsAny(value[:min(len(value), 1)], "\"'[{") {
			if over := coordinateOver(key, value); over != "" {
				return at("%s", over) // 95N: the range
			}
			return at("a coordinate is written in %s", coordinateText[key])
		}
	case strings.HasSuffix(msg, "expected newline but got U+002C ','") && thousands(value):
		return at("a number is written without separators (write %s = %s)", key, strings.ReplaceAll(value, ",", ""))
	case strings.HasSuffix(msg, "expected newline but got U+002C ','") && strings.Count(value, ",") == 1 && strings.Trim(value, "+-0123456789,") == "":
		// 9,7: a decimal comma, not 97
		return at("a number is written with a decimal point, not a comma (write %s = %s)", key, strings.Replace(value, ",", ".", 1))
	case strings.HasPrefix(msg, "toml: expected newline but got") && strings.HasPrefix(value, "'") && strings.Count(value, "'") > 2:
		return at("the text in single quotes ends at its second ' (write it in double quotes: %s = %q)", key, strings.Trim(value, "'"))
	case strings.HasSuffix(msg, "basic strings cannot have new lines"), strings.HasSuffix(msg, "literal strings cannot have new lines"):
		return at("the text in quotes is not closed on its line (close it there, or write text of several lines in triple quotes: \"\"\"…\"\"\")")
	case strings.HasSuffix(msg, "invalid character at start of key: }"):
		return at("TOML has no comma after the last item of a mapping in braces {…}")
	case strings.HasSuffix(msg, "array elements must be separated by commas"):
		lines := bytes.Split(data, []byte("\n")) // split once: the walk back is not quadratic in a long file
		for n := row - 1; n >= 1; n-- {
			if pt := strings.TrimSpace(string(lines[n-1])); strings.Count(pt, "[") > strings.Count(pt, "]") && strings.Contains(pt, "=") {
				return fmt.Sprintf("line %d: %s: the list opened with [ is not closed with ] (its items are separated by commas)", n, strings.TrimRight(pt, "\r"))
			}
		}
	}
	return ""
}

// thousands reports whether v is a whole number written with commas
// between groups of three digits ("1,000,000"), as the thousands separators
// of English text; "9,7" is a decimal comma.
func thousands(v string) bool {
	groups := strings.Split(strings.TrimLeft(v, "+-"), ",")
	if len(groups) < 2 || len(groups[0]) < 1 || len(groups[0]) > 3 {
		return false
	}
	for i, g := range groups {
		if strings.Trim(g, "0123456789") != "" || (i > 0 && len(g) != 3) {
			return false
		}
	}
	return true
}

// isBareClock says whether w is a clock time "HH:MM" ("20:00", "5:30"),
// which TOML refuses unquoted (the parser's "times are expected to have
// the format HH:MM:SS").
func isBareClock(w string) bool {
	h, m, ok := strings.Cut(w, ":")
	digits := func(s string) bool { return strings.Trim(s, "0123456789") == "" }
	return ok && len(h) >= 1 && len(h) <= 2 && len(m) == 2 && digits(h) && digits(m)
}

// isBareDuration says whether w is a duration with its unit, "-30m" or
// "1h30m", which TOML refuses unquoted (the parser's "expected newline").
func isBareDuration(w string) bool {
	if w == "" || w[len(w)-1] < 'a' || w[len(w)-1] > 'z' {
		return false
	}
	_, err := time.ParseDuration(w)
	return err == nil
}

// quoteBudget bounds the bytes quoteTOMLValues has the TOML parser read
// again, once per value it quotes: a thousand values in a file of 32 kB,
// a few in one of megabytes (hostile input is then refused as it is
// written, without the time of a parse per value).
const quoteBudget = 32 << 20

// quoteTOMLValues puts in quotes each unquoted value written as a date that
// the TOML parser refuses ("2027-6-12", "27-06-12", "2027-02-30": TOML
// dates are YYYY-MM-DD and exist), so that it is read as text and checked
// as the same date written in YAML or JSON is: "feeds[0].kinds[0].dates[1]:
// 2027-6-12: not a date (write it 2027-06-12)", with the field's path,
// rather than a syntax error. A number written as people write one
// elsewhere ("95N", "8.5E", "650 m", "20%") is put in quotes too, and
// checked as the same value in YAML is. decoded is data as the parser
// reads it (its repeated keys blanked, the lines numbered as in data). It
// returns data with the quotes, and whether the parser then reads it;
// false when a refusal is of anything else, which is then reported as it
// is.
func quoteTOMLValues(data, decoded []byte) (out []byte, ok bool) {
	defer func() {
		if recover() != nil {
			out, ok = nil, false // hostile input: the reader reports it
		}
	}()
	most := quoteBudget / max(len(decoded), 1)
	for i := range most + 1 {
		var m map[string]any
		err := toml.Unmarshal(decoded, &m)
		if err == nil {
			return data, i > 0
		}
		if i == most {
			break
		}
		var pos interface{ Position() (int, int) }
		if !errors.As(err, &pos) {
			return nil, false
		}
		row, col := pos.Position()
		if decoded, ok = quoteAt(decoded, row, col); !ok {
			return nil, false
		}
		if data, ok = quoteAt(data, row, col); !ok {
			return nil, false
		}
	}
	return nil, false
}

// valueFrom is the unquoted TOML value that starts at column col (1-based,
// in bytes, within line): up to the space, comma, bracket, brace or comment
// that ends it.
func valueFrom(line []byte, col int) []byte {
	value := line[col-1:]
	if i := bytes.IndexAny(value, " \t\r,]}#"); i >= 0 {
		value = value[:i]
	}
	return value
}

// quoteAt puts in quotes the value written as a date that starts at line
// row, column col (1-based, in bytes) of data, or the value of a key that
// takes a number written as elsewhere (bareNumber); false when there is
// neither.
func quoteAt(data []byte, row, col int) ([]byte, bool) {
	start := 0
	for range row - 1 {
		i := bytes.IndexByte(data[start:], '\n')
		if i < 0 {
			return nil, false
		}
		start += i + 1
	}
	line := data[start:]
	if i := bytes.IndexByte(line, '\n'); i >= 0 {
		line = line[:i]
	}
	if col < 1 || col > len(line) {
		return nil, false
	}
	for col > 1 && bytes.IndexByte([]byte("0123456789-/."), line[col-2]) >= 0 {
		col-- // the parser stops within 12.06.2027, at its second dot
	}
	value := valueFrom(line, col)
	quoted := append(append([]byte{'"'}, value...), '"')
	if !isDateLike(string(value)) {
		from, v, ok := bareNumber(line, col)
		if !ok {
			return nil, false
		}
		col, value = from+1, v
		quoted = []byte(strconv.Quote(string(value)))
	}
	at := start + col - 1
	out := make([]byte, 0, len(data)+len(quoted))
	out = append(out, data[:at]...)
	out = append(out, quoted...)
	return append(out, data[at+len(value):]...), true
}

// numberKeys are the keys whose value is a number and that a number
// with its unit or written as elsewhere is given to ("650 m", "20%",
// "95N"); the horizon, which may be text (a file's name), is not one.
var numberKeys = []string{"latitude", "longitude", "elevation", "pressure_hpa", "temperature_c",
	"days_back", "days_ahead", "low", "high", "max_illumination", "max_feed_bytes"}

// numberWithUnit reports whether v is a number followed by its unit
// ("650 m", "20%", "365 days", "5°"), not by other digits ("1,000").
func numberWithUnit(v string) bool {
	_, unit, _, err := numberAndUnit(v)
	r, _ := utf8.DecodeRuneInString(unit)
	return err == nil && (unicode.IsLetter(r) || r == '%' || r == '°')
}

// bareNumber is the value, written without quotes, of the key = value
// whose value the TOML parser refused at column col (1-based, in bytes) of
// line, when the key takes a number (numberKeys) and the value is one
// written as people write it elsewhere, which TOML refuses: a coordinate
// ("95N", "8.5E", "47,5", "47°30′N"), a number with its unit ("650 m",
// "365 days", "20%"), a word ("high"); not a number with commas ("1,000",
// "4,5"), which tomlSlip words. It returns where the value starts in line
// (from 0); false for other values. Put in quotes, the value is read as
// text and checked as the same value written in YAML is:
// "sites[0].latitude: \"95N\": must be a number, not text", with the hint
// of the number to write.
func bareNumber(line []byte, col int) (from int, value []byte, ok bool) {
	eq := bytes.LastIndexByte(line[:min(col-1, len(line))], '=')
	if eq < 0 {
		return 0, nil, false
	}
	before := bytes.TrimRight(line[:eq], " \t")
	start := bytes.LastIndexAny(before, " \t,{") + 1
	if !slices.Contains(numberKeys, strings.ToLower(string(before[start:]))) {
		return 0, nil, false
	}
	inline := len(bytes.TrimSpace(before[:start])) > 0 // { kind = "dark-window", max_illumination = 20% }
	from = eq + 1
	for from < len(line) && (line[from] == ' ' || line[from] == '\t') {
		from++
	}
	end := from
	for end < len(line) && line[end] != '#' && line[end] != '\r' && !(inline && (line[end] == ',' || line[end] == '}')) {
		end++ // no number has a #: the comment after the value
	}
	value = bytes.TrimRight(line[from:end], " \t")
	if len(value) == 0 || bytes.IndexByte([]byte("\"'[{"), value[0]) >= 0 || col-1 < from || col-1 > end {
		return 0, nil, false
	}
	if key := strings.ToLower(string(before[start:])); key != "latitude" && key != "longitude" {
		if v := string(value); strings.Contains(v, ",") && strings.Trim(v, "+-0123456789,") == "" {
			return 0, nil, false // 1,000 or 4,5, which tomlSlip words
		}
	}
	return from, value, true
}

// yamlTabMessage names the line of a tab in YAML's indentation: the YAML
// decoder's "found a tab character that violates indentation" gives the
// line of the key before it, and "found character that cannot start any
// token" does not say the character is a tab.
func yamlTabMessage(msg string, data []byte) string {
	rest, ok := strings.CutPrefix(msg, "yaml: line ")
	if !ok {
		return yamlAnchorMessage(msg, data)
	}
	num, what, ok := strings.Cut(rest, ": ")
	line, err := strconv.Atoi(num)
	if !ok || err != nil || line < 1 {
		return msg
	}
	tabbed := func(l []byte) bool { // a tab before the line's first other character
		i := bytes.IndexFunc(l, func(r rune) bool { return r != ' ' && r != '\t' })
		if i < 0 {
			i = len(l)
		}
		return bytes.IndexByte(l[:i], '\t') >= 0
	}
	lines := bytes.Split(data, []byte("\n"))
	switch {
	case strings.HasPrefix(what, "found a tab character"):
		for n := line; n <= len(lines); n++ {
			if tabbed(lines[n-1]) {
				return fmt.Sprintf("yaml: line %d: a tab in the indentation (YAML indents with spaces only)", n)
			}
		}
	case strings.HasPrefix(what, "found character that cannot start any token"):
		if line <= len(lines) && tabbed(lines[line-1]) {
			return fmt.Sprintf("yaml: line %d: a tab in the indentation (YAML indents with spaces only)", line)
		}
		if line <= len(lines) {
			// @ and ` are reserved in YAML, and % begins a directive
			if v := yamlValue(lines[line-1]); v != "" && strings.ContainsAny(v[:1], "@`%") {
				return fmt.Sprintf("yaml: line %d: a value cannot begin with %s in YAML (write it in quotes: %q)", line, v[:1], v)
			}
		}
	case strings.HasPrefix(what, "did not find expected ',' or ']'"), strings.HasPrefix(what, "did not find expected ',' or '}'"):
		// the decoder names the line where the block around the list began
		if n, open := yamlUnclosedFlow(lines); n > 0 {
			what := map[byte]string{'[': "a list opened with [ is not closed with ]", '{': "a mapping opened with { is not closed with }"}[open]
			return fmt.Sprintf("yaml: line %d: %s (its items are separated by commas)", n, what)
		}
	case strings.HasPrefix(what, "found unexpected end of stream") && line <= len(lines):
		if q := yamlValue(lines[line-1]); q != "" && (q[0] == '"' || q[0] == '\'') && strings.Count(q, q[:1]) == 1 {
			return fmt.Sprintf("yaml: line %d: the text in quotes that begins here is not closed with %s", line, q[:1])
		}
	case strings.HasPrefix(what, "mapping values are not allowed") && line <= len(lines):
		if hint := yamlColonHint(lines, line); hint != "" {
			return msg + " (" + hint + ")"
		}
	case strings.HasPrefix(what, "did not find expected key"), strings.HasPrefix(what, "did not find expected '-' indicator"):
		// the decoder names the line where the block began, often line 1
		if n, indent := yamlMisaligned(lines, line); n > 0 {
			return fmt.Sprintf("yaml: line %d: indented by %d, unlike the lines above it (%s)", n, indent, what)
		}
		for n := line; n <= len(lines); n++ {
			// 'O'Brien farm': the text ends at the second quote
			if q := yamlValue(lines[n-1]); len(q) > 1 && q[0] == '\'' {
				if end := strings.IndexByte(q[1:], '\''); end >= 0 && end+2 < len(q) && q[end+2] != '\'' && !strings.HasPrefix(q[end+2:], " #") {
					return fmt.Sprintf("yaml: line %d: the text in quotes ends at its second ' (write a ' within it twice, %s, or the text in double quotes)",
						n, "'"+strings.ReplaceAll(q[1:len(q)-1], "'", "''")+"'")
				}
			}
		}
	}
	return msg
}

// yamlValue is the value written on line l of a YAML document, after its
// key or list dash ("'O'Brien farm'" of `    name: 'O'Brien farm'`),
// without the line end; "" for a line without one.
func yamlValue(l []byte) string {
	t := strings.TrimSpace(strings.TrimRight(string(l), "\r"))
	for strings.HasPrefix(t, "- ") {
		t = strings.TrimSpace(t[2:])
	}
	if i := strings.Index(t, ": "); i >= 0 && !strings.ContainsAny(t[:1], "\"'[{") {
		t = strings.TrimSpace(t[i+2:])
	}
	return t
}

// yamlUnclosedFlow finds the line of the first list ([…]) or mapping
// ({…}) written in brackets that the document does not close, and its
// opening bracket; 0 when every one is closed. A bracket opens one where a
// value begins (after "key: " or "- ") or inside another; quoted text and
// comments are skipped.
func yamlUnclosedFlow(lines [][]byte) (int, byte) {
	type open struct {
		line int
		b    byte
	}
	var stack []open
	for n, l := range lines {
		t := strings.TrimRight(string(l), "\r")
		if len(stack) == 0 {
			v := yamlValue([]byte(t))
			if v == "" || (v[0] != '[' && v[0] != '{') {
				continue
			}
			t = v
		}
		var quote byte
		for i := 0; i < len(t); i++ {
			c := t[i]
			switch {
			case quote != 0:
				if c == quote {
					quote = 0
				}
			case c == '"' || c == '\'':
				quote = c
			case c == '#' && (i == 0 || t[i-1] == ' '):
				i = len(t) // a comment
			case c == '[' || c == '{':
				stack = append(stack, open{n + 1, c})
			case (c == ']' || c == '}') && len(stack) > 0:
				stack = stack[:len(stack)-1]
			}
		}
	}
	if len(stack) == 0 {
		return 0, 0
	}
	return stack[0].line, stack[0].b
}

// yamlAnchorMessage names the line of an alias whose anchor the document
// lacks ("yaml: unknown anchor 'farm' referenced", without a line): a
// value that begins with * is such an alias in YAML.
func yamlAnchorMessage(msg string, data []byte) string {
	name, ok := strings.CutPrefix(msg, "yaml: unknown anchor '")
	if !ok {
		return msg
	}
	name, _, _ = strings.Cut(name, "'")
	for n, l := range bytes.Split(data, []byte("\n")) {
		if v := yamlValue(l); v == "*"+name {
			return fmt.Sprintf("yaml: line %d: *%s is a reference to an anchor &%s, which the file does not have (a text that begins with * is written in quotes: %q)", n+1, name, name, v)
		}
	}
	return msg
}

// keysTogether reports whether a and b are two keys of one mapping of the
// configuration (kind and offset, of a kinds entry), in any section.
func keysTogether(a, b string) bool {
	a, b = strings.ToLower(a), strings.ToLower(b)
	for _, sec := range keySections {
		if keys := keysAt(sec.path); a != b && slices.Contains(keys, a) && slices.Contains(keys, b) {
			return true
		}
	}
	return false
}

// yamlColonHint says why line n of a YAML document has a key where none
// may be: its value holds ": " (`name: North: Field`), which YAML reads
// as a second key, or it is indented deeper than the line above it, which
// opens no block; "" otherwise.
func yamlColonHint(lines [][]byte, n int) string {
	l := strings.TrimRight(string(lines[n-1]), "\r")
	t := strings.TrimLeft(l, " ")
	body := strings.TrimSpace(strings.TrimPrefix(t, "- "))
	if key, value, ok := strings.Cut(body, ": "); ok && strings.Contains(value, ": ") && !strings.ContainsAny(value[:1], "\"'[{") {
		// "kind: sunset offset: -30m": two keys on one line, not a
		// value with a colon, when the word before the colon is a key
		first, second, _ := strings.Cut(value, ": ")
		if words := strings.Fields(first); len(words) >= 2 && keysTogether(key, words[len(words)-1]) {
			next := words[len(words)-1]
			v := strings.Join(words[:len(words)-1], " ")
			return fmt.Sprintf("two keys on one line: write %s: %s on a line of its own below %s: %s, or both in braces: {%s: %s, %s: %s}",
				next, strings.TrimSpace(second), key, v, key, v, next, strings.TrimSpace(second))
		}
		return fmt.Sprintf("a value with \": \" in it goes in quotes: %s: %q", key, strings.TrimSpace(value))
	}
	for p := n - 1; p >= 1; p-- {
		prev := strings.TrimRight(string(lines[p-1]), "\r")
		pt := strings.TrimLeft(prev, " ")
		if pt == "" || pt[0] == '#' {
			continue
		}
		if key, value, ok := yamlEquals(pt); ok {
			return fmt.Sprintf("line %d writes %s = %s, and YAML writes a key with a colon: %s: %s", p, key, value, key, value)
		}
		if len(l)-len(t) > len(prev)-len(pt) && !strings.HasSuffix(pt, ":") && !strings.HasPrefix(pt, "- ") {
			return fmt.Sprintf("the line is indented deeper than line %d above it", p)
		}
		if item, ok := strings.CutPrefix(pt, "- "); ok && !strings.HasSuffix(pt, ":") {
			// "- kind: golden-hour" over "   offset: 10m": the keys of
			// the entry line up with the first, after the dash
			key, _, isKey := strings.Cut(strings.TrimLeft(item, " "), ": ")
			col := len(prev) - len(strings.TrimLeft(item, " "))
			if isKey && len(l)-len(t) > col && !strings.ContainsAny(key, " \"'[{") {
				return fmt.Sprintf("the line is indented deeper than %s: on line %d above it: indent it by %d spaces, as %s: is", key, p, col, key)
			}
		}
		break
	}
	return ""
}

// yamlEquals reads t, a line of a YAML document without its indentation,
// as a key written with TOML's "=" (`- id = "north-field"`, `listen =
// ":8080"`), which YAML reads as text: the key and its value; false for
// another line.
func yamlEquals(t string) (key, value string, ok bool) {
	body := strings.TrimSpace(strings.TrimPrefix(t, "- "))
	if !tomlLine().MatchString(body) || strings.HasPrefix(body, "[") || strings.Contains(body, ": ") {
		return "", "", false
	}
	key, value, _ = strings.Cut(body, "=")
	return strings.TrimSpace(key), strings.TrimSpace(value), true
}

// yamlMisaligned finds the first line from line from on whose indentation
// does not continue the blocks above it: a line indented to no level open
// above it, more deeply than a block the line before opens, or a key among
// list items ("- ") or a list item among keys at one level (a list may
// start at its key's own indentation). It returns the line and its
// indentation in spaces, or 0 when every line continues its blocks. Block
// text (after | or >) and lines inside a flow list or mapping ([…], {…})
// are skipped.
func yamlMisaligned(lines [][]byte, from int) (int, int) {
	type level struct {
		indent int
		seq    bool // its lines are list items
		items  bool // a list at the indentation of the key before it
	}
	var stack []level
	opens, prevIndent := true, 0 // the line before opens a block; its indentation
	text, flow := -1, 0          // the indentation of a key of block text; open flow brackets
	for n := max(from, 1); n <= len(lines); n++ {
		l := strings.TrimRight(string(lines[n-1]), "\r")
		t := strings.TrimLeft(l, " ")
		ind := len(l) - len(t)
		if t == "" || t[0] == '#' {
			continue
		}
		if text >= 0 && ind > text {
			continue
		}
		text = -1
		if flow > 0 || strings.HasPrefix(t, "---") || strings.HasPrefix(t, "...") || strings.HasPrefix(t, "\t") {
			flow += strings.Count(t, "[") + strings.Count(t, "{") - strings.Count(t, "]") - strings.Count(t, "}")
			continue
		}
		seq := t == "-" || strings.HasPrefix(t, "- ")
		popped := false
		for len(stack) > 0 && stack[len(stack)-1].indent > ind {
			stack, popped = stack[:len(stack)-1], true
		}
		switch {
		case len(stack) == 0 || stack[len(stack)-1].indent < ind:
			if popped || !opens {
				return n, ind
			}
			stack = append(stack, level{indent: ind, seq: seq})
		default:
			top := &stack[len(stack)-1]
			switch {
			case seq == top.seq:
				top.items = false
			case seq && opens && ind == prevIndent: // "kinds:" then "- sunrise" below it
				top.items = true
			case seq && top.items:
			default:
				return n, ind
			}
		}
		// what this line opens: a key without a value, a list item, a
		// key of block text; the flow brackets it leaves open
		body := t
		if seq {
			body = strings.TrimSpace(strings.TrimPrefix(t, "-"))
		}
		if i := strings.Index(body, " #"); i >= 0 {
			body = strings.TrimSpace(body[:i])
		}
		opens = seq || strings.HasSuffix(body, ":")
		if strings.HasSuffix(body, "|") || strings.HasSuffix(body, ">") || strings.HasSuffix(body, "|-") || strings.HasSuffix(body, ">-") {
			text = ind
		}
		flow = strings.Count(body, "[") + strings.Count(body, "{") - strings.Count(body, "]") - strings.Count(body, "}")
		prevIndent = ind
		if seq && body != "" && !strings.HasPrefix(body, "[") && !strings.HasPrefix(body, "{") {
			// the keys of a list item's mapping line up with its first
			key := ind + len(t) - len(strings.TrimLeft(strings.TrimPrefix(t, "-"), " "))
			if strings.Contains(body, ": ") || strings.HasSuffix(body, ":") {
				stack = append(stack, level{indent: key})
			}
		}
	}
	return 0, 0
}

func oneLine(s string) string {
	s = strings.ReplaceAll(s, "\r", " ")
	return strings.ReplaceAll(s, "\n", "; ")
}

// covered reports whether a validation problem at path is explained by a
// decoding problem at the same path or at an enclosing one.
func covered(path string, decoded []FieldError) bool {
	for _, d := range decoded {
		if path == d.Path || strings.HasPrefix(path, d.Path+".") || strings.HasPrefix(path, d.Path+"[") ||
			strings.HasPrefix(d.Path, path+".") || strings.HasPrefix(d.Path, path+"[") {
			return true
		}
	}
	return false
}

// explicitWindows records, for each feed of the raw document, whether
// days_back and days_ahead were written, so that an explicit 0 is kept and
// only absent keys get the defaults.
func explicitWindows(raw any) map[int][2]bool {
	out := map[int][2]bool{}
	list, ok := raw.([]any)
	if !ok {
		return out
	}
	for i, item := range list {
		m, ok := item.(map[string]any)
		if !ok {
			continue
		}
		var set [2]bool
		for k, v := range m {
			if v == nil { // "days_ahead:" with no value: the default, not 0
				continue
			}
			switch strings.ToLower(k) {
			case "days_back":
				set[0] = true
			case "days_ahead":
				set[1] = true
			}
		}
		out[i] = set
	}
	return out
}

// explicitCoordinates records, for each site of the raw document, whether
// latitude and longitude were written: a missing one must not become 0°.
func explicitCoordinates(raw any) [][2]bool {
	list, ok := raw.([]any)
	if !ok {
		return nil
	}
	out := make([][2]bool, len(list))
	for i, item := range list {
		m, ok := item.(map[string]any)
		if !ok {
			out[i] = [2]bool{true, true} // not a mapping: the decoder says so
			continue
		}
		for k, v := range m {
			if v == nil { // "latitude:" with no value is no latitude either
				continue
			}
			switch strings.ToLower(k) {
			case "latitude":
				out[i][0] = true
			case "longitude":
				out[i][1] = true
			}
		}
	}
	return out
}

// inferZones gives every site without a timezone the zone at its
// coordinates and marks it ZoneInferred. Sites whose coordinates are out of
// range are left to Validate.
func inferZones(c *Config) []FieldError {
	var problems []FieldError
	for i := range c.Sites {
		s := &c.Sites[i]
		if s.TimeZone.Location != nil || !(s.Latitude >= -90 && s.Latitude <= 90) || !(s.Longitude >= -180 && s.Longitude <= 180) {
			continue
		}
		z, err := ZoneLocationAt(s.Latitude, s.Longitude)
		if err != nil {
			problems = append(problems, FieldError{Path: fmt.Sprintf("sites[%d].timezone", i), Msg: "not given, and not found from the coordinates: " + err.Error(),
				Hint: `give an IANA time zone name such as "Europe/Vienna"`})
			continue
		}
		s.TimeZone, s.ZoneInferred = z, true
	}
	return problems
}

// applyEnv overrides deployment settings from the environment and returns
// which paths were overridden by which variable.
func applyEnv(c *Config, env LookupEnv) (map[string]string, []FieldError) {
	from := map[string]string{}
	if env == nil {
		return from, nil
	}
	var problems []FieldError
	for _, e := range envVars {
		val, ok := env(e.name)
		if !ok || val == "" {
			continue
		}
		from[e.path] = e.name
		switch e.name {
		case "HELIOCAL_LISTEN":
			c.Service.Listen = val
		case "HELIOCAL_OUT_DIR":
			c.Service.OutDir = val
		case "HELIOCAL_BASE_URL":
			c.Service.BaseURL = val
		case "HELIOCAL_REFRESH":
			c.Service.Refresh = val
		case "HELIOCAL_REFRESH_ZONE":
			var z Zone
			if err := z.UnmarshalText([]byte(val)); err != nil {
				var ze *ZoneError
				errors.As(err, &ze)
				problems = append(problems, FieldError{Path: e.path, Value: val, Msg: msgUnknownZone, Hint: ze.Hint})
				continue
			}
			c.Service.RefreshZone = z
		case "HELIOCAL_MAX_FEED_BYTES":
			n, err := strconv.Atoi(strings.TrimSpace(val))
			if err != nil {
				problems = append(problems, FieldError{Path: e.path, Value: val, Msg: "must be a whole number of bytes", Hint: "e.g. 1000000"})
				continue
			}
			c.Service.MaxFeedBytes = n
		}
	}
	return from, problems
}

// applyDefaults fills absent keys. explicit tells, per feed index, whether
// days_back and days_ahead were written in the file.
func applyDefaults(c *Config, explicit map[int][2]bool) {
	s := &c.Service
	if s.Listen == "" {
		s.Listen = DefaultListen
	}
	if s.OutDir == "" {
		s.OutDir = DefaultOutDir
	}
	if s.Refresh == "" {
		s.Refresh = DefaultRefresh
	}
	if s.MaxFeedBytes == 0 {
		s.MaxFeedBytes = DefaultMaxFeedBytes
	}
	if s.Oversize == "" {
		s.Oversize = OversizeWarn
	}
	for i := range c.Sites {
		if c.Sites[i].Name == "" {
			c.Sites[i].Name = c.Sites[i].ID
		}
	}
	for i := range c.Feeds {
		f := &c.Feeds[i]
		if f.Title == "" {
			f.Title = f.ID
		}
		// a YAML block (description: |) ends in a line break, which would
		// leave an empty line more before what the texts add after it
		f.Description = strings.TrimRight(f.Description, " \t\r\n")
		for j := range f.Plans {
			f.Plans[j].Description = strings.TrimRight(f.Plans[j].Description, " \t\r\n")
		}
		set := explicit[i]
		if !set[0] && f.DaysBack == 0 {
			f.DaysBack = DefaultDaysBack
		}
		if !set[1] && f.DaysAhead == 0 {
			f.DaysAhead = DefaultDaysAhead
		}
	}
}

// ApplyDefaults fills the defaults of a configuration built in code: empty
// service settings, site names and feed titles, the window of feeds whose
// days_back and days_ahead are both 0, and the zone of sites without one
// (from their coordinates, see ZoneAt; a failure is left to Validate).
// Parse applies the defaults itself (keeping an explicit 0).
func (c *Config) ApplyDefaults() {
	explicit := map[int][2]bool{}
	for i, f := range c.Feeds {
		if f.DaysBack != 0 || f.DaysAhead != 0 {
			explicit[i] = [2]bool{true, true}
		}
	}
	applyDefaults(c, explicit)
	inferZones(c)
}

// valueError is a decoding failure that knows the offending value.
type valueError struct {
	Value, Msg, Hint string
	given            string // decodeProblem's
	list             bool   // a list belongs there (listTypeError)
}

func (e *valueError) Error() string {
	s := e.Msg
	if e.Hint != "" {
		s += " (" + e.Hint + ")"
	}
	return s
}

var (
	durationType = reflect.TypeFor[Duration]()
	kindSpecType = reflect.TypeFor[KindSpec]()
	kindType     = reflect.TypeFor[Kind]()
	zoneType     = reflect.TypeFor[Zone]()
)

// decodeHook converts the file's scalars into the configuration types:
// strings to Kind, KindSpec (a bare kind name), Duration and Zone; it refuses
// numbers where a duration is expected (the unit would be a guess) and
// fractional numbers where a whole number is expected.
func decodeHook() mapstructure.DecodeHookFunc {
	return func(from reflect.Type, to reflect.Type, data any) (any, error) {
		if to.Kind() == reflect.Slice {
			if err := listTypeError(to, data); err != nil {
				return nil, err
			}
		}
		switch to {
		case kindSpecType:
			if s, ok := data.(string); ok {
				k, err := ParseKind(s)
				if err != nil {
					return nil, kindValueError(err)
				}
				return KindSpec{Kind: k}, nil
			}
			if notMapping(data) {
				return nil, scalarTypeError(to, data, `e.g. sunrise, or a mapping such as {kind: sunrise, offset: -30m}`)
			}
		case kindType:
			if s, ok := data.(string); ok {
				k, err := ParseKind(s)
				if err != nil {
					return nil, kindValueError(err)
				}
				return k, nil
			}
		case zoneType:
			if s, ok := data.(string); ok {
				var z Zone
				if err := z.UnmarshalText([]byte(s)); err != nil {
					var ze *ZoneError
					errors.As(err, &ze)
					return nil, &valueError{Value: s, Msg: msgUnknownZone, Hint: ze.Hint}
				}
				return z, nil
			}
			if notMapping(data) {
				return nil, scalarTypeError(to, data, `an IANA name such as "Europe/Vienna"`)
			}
		case durationType:
			switch x := data.(type) {
			case string:
				d, err := time.ParseDuration(strings.TrimSpace(x))
				if err != nil {
					return nil, &valueError{Value: x, Msg: "malformed duration", Hint: durationHint(x)}
				}
				return Duration(d), nil
			case int, int64, uint64, float64:
				if fmt.Sprint(x) == "0" {
					return Duration(0), nil
				}
				hint := fmt.Sprintf(`write e.g. "%vm" for minutes or "%vh" for hours`, x, x)
				if n, _ := strconv.ParseFloat(fmt.Sprint(x), 64); math.Abs(n) > MaxOffset.Hours() {
					// 600 hours is beyond every duration's limit (an
					// offset's 12h, an alarm's 7 days): minutes alone
					hint = fmt.Sprintf(`write e.g. "%vm" for minutes`, x)
				}
				return nil, &valueError{Value: fmt.Sprint(x), Msg: "a duration needs a unit", Hint: hint}
			}
		}
		if t, ok := data.(time.Time); ok && to.Kind() == reflect.String {
			// YAML reads an unquoted 2027-06-12 as a timestamp: give
			// text keys (a plan's date) the date as written
			if t.Equal(civilDate(t)) {
				return t.Format(time.DateOnly), nil
			}
			return t.Format(time.RFC3339), nil
		}
		if d, ok := data.(toml.LocalDate); ok && to.Kind() == reflect.String {
			// TOML reads an unquoted 2027-06-12 as a local date: give
			// text keys (a plan's date, a dates list) the date as written
			return d.String(), nil
		}
		if to.Kind() == reflect.Int && (from.Kind() == reflect.Float64 || from.Kind() == reflect.Float32) {
			f := reflect.ValueOf(data).Float()
			if f != math.Trunc(f) {
				hint := ""
				if math.Abs(f) < 1e6 {
					hint = fmt.Sprintf("write %g or %g", math.Floor(f), math.Ceil(f)) // 36 or 37 for 36.5
				}
				return nil, &valueError{Value: strconv.FormatFloat(f, 'g', -1, 64), Msg: "must be a whole number", Hint: hint}
			}
			if math.Abs(f) > 1<<53 { // a whole number, but past what is read exactly
				return nil, &valueError{Value: strconv.FormatFloat(f, 'g', -1, 64), Msg: "is far too large"}
			}
		}
		return data, nil
	}
}

// notMapping reports whether data, decoded into a type that takes text or
// a mapping (a zone, a kinds entry), is neither: a number, true or false, a
// date, a list. The decoder would ask for a mapping of keys, which a zone
// never is.
func notMapping(data any) bool {
	switch data.(type) {
	case nil, string, map[string]any, map[any]any:
		return false
	}
	return true
}

// listTypeError words one value where a list of to belongs, as it is
// written (a YAML or TOML date as its date, not as a date and time), and,
// for a list of names, dates or kinds, says to write it as a list of one:
// `write it ["fri"]` for weekdays: fri, `write it ["2027-06-12"]` for
// dates: 2027-06-12, or, for text with commas, of its items: `write it
// ["sat", "sun"]` for weekdays: sat, sun. nil for a list, for nothing and
// for a mapping, which the decoder words.
func listTypeError(to reflect.Type, data any) error {
	value, what := showValue(data), describeValue(data)
	switch x := data.(type) {
	case nil, []any, map[string]any, map[any]any:
		return nil
	case time.Time:
		if x.Equal(civilDate(x)) {
			value, what = x.Format(time.DateOnly), "a date"
		}
	case toml.LocalDate:
		value = x.String()
	}
	hint := ""
	if to.Elem().Kind() == reflect.String || to.Elem() == kindSpecType {
		// each item quoted, as JSON needs it and YAML and TOML take it;
		// text of items with commas between them is a list written
		// without its brackets ("sat, sun"), not one item
		items := strings.Split(value, ",")
		if _, isText := data.(string); !isText {
			items = []string{value}
		} else if len(items) == 1 {
			items = spacedItems(to, value)
		}
		var quoted []string
		for _, it := range items {
			if it = strings.TrimSpace(it); it != "" || len(items) == 1 {
				quoted = append(quoted, strconv.Quote(it))
			}
		}
		hint = "write it [" + strings.Join(quoted, ", ") + "]"
	}
	return &valueError{Value: value, Msg: "must be a list, not " + what, Hint: hint, given: what, list: true}
}

// spacedItems splits text without commas at its spaces when it is items
// written one after another: YAML folds the lines of a list without its
// dashes into one text ("kinds:" over "sunrise" and "sunset" is "sunrise
// sunset"). Names, dates and addresses hold no spaces, so a list of text
// is split; a list of kinds only when every word is a kind, as "golden
// hour" is one kind misspelt, not two.
func spacedItems(to reflect.Type, value string) []string {
	words := strings.Fields(value)
	if len(words) < 2 {
		return []string{value}
	}
	if to.Elem() == kindSpecType {
		for _, w := range words {
			if _, err := ParseKind(w); err != nil {
				return []string{value}
			}
		}
	}
	return words
}

// scalarTypeError words a value of the wrong type for to, naming what to
// takes.
func scalarTypeError(to reflect.Type, data any, hint string) error {
	value := showValue(data)
	if t, ok := data.(time.Time); ok {
		value = t.Format(time.DateOnly)
	}
	given := describeValue(data)
	return &valueError{Value: value, Msg: "must be " + describeType(to) + ", not " + given, Hint: hint, given: given}
}

func kindValueError(err error) error {
	var ke *KindError
	if errors.As(err, &ke) {
		if strings.TrimSpace(ke.Value) == "" { // shown, as `kind: ""` is written
			return &valueError{Value: strconv.Quote(ke.Value), Msg: ke.Msg, Hint: ke.Hint}
		}
		return &valueError{Value: ke.Value, Msg: ke.Msg, Hint: ke.Hint}
	}
	return err
}

// decodeProblem is a problem of the decoding: given words the value it
// refuses where a value of another type belongs, as its message ends
// ("a number", "text": describeValue's or kindWord's words), "" for another
// problem; list says that a list belongs there.
type decodeProblem struct {
	FieldError
	given string
	list  bool
}

// decodeProblems turns the decoder's joined errors into field problems;
// written is the YAML document decoded, nil for another format.
func decodeProblems(err error, written *yaml.Node) []decodeProblem {
	var out []decodeProblem
	var walk func(error)
	walk = func(err error) {
		switch e := err.(type) {
		case *mapstructure.DecodeError:
			inner := e.Unwrap()
			if j, ok := inner.(interface{ Unwrap() []error }); ok {
				for _, x := range j.Unwrap() {
					walk(x)
				}
				return
			}
			out = append(out, problemFor(e.Name(), inner, written)...)
		case interface{ Unwrap() []error }:
			for _, x := range e.Unwrap() {
				walk(x)
			}
		case interface{ Unwrap() error }:
			if x := e.Unwrap(); x != nil {
				walk(x)
				return
			}
			out = append(out, decodeProblem{FieldError: FieldError{Path: "(file)", Msg: oneLine(err.Error())}})
		default:
			out = append(out, decodeProblem{FieldError: FieldError{Path: "(file)", Msg: oneLine(err.Error())}})
		}
	}
	walk(err)
	return out
}

func problemFor(path string, err error, written *yaml.Node) []decodeProblem {
	shown := path
	if shown == "" {
		shown = "(top level)"
	}
	var ve *valueError
	var pe *mapstructure.ParseError
	var ue *mapstructure.UnconvertibleTypeError
	switch {
	case errors.As(err, &ve):
		hint := ve.Hint
		if ve.list && ve.given == valueNumber {
			if h := namesListHint(fieldKey(path), ve.Value); h != "" {
				hint = h // "write it [\"6\"]" would lead to "6: not a month"
			}
		}
		return []decodeProblem{{FieldError{Path: shown, Value: ve.Value, Msg: ve.Msg, Hint: hint}, ve.given, ve.list}}
	case errors.As(err, &ue):
		given := describeValue(ue.Value)
		if what := dateKey(path); what != "" && ue.Expected.Type().Kind() == reflect.String {
			return []decodeProblem{{FieldError{Path: shown, Value: quotedValue(ue.Value), Msg: "must be " + what + ", not " + given, Hint: dateValueHint(ue.Value)}, given, false}}
		}
		return []decodeProblem{{FieldError{Path: shown, Value: quotedValue(ue.Value), Msg: "must be " + describeType(ue.Expected.Type()) + ", not " + given,
			Hint: typeHint(path, ue.Expected.Type(), ue.Value, yamlScalarAt(written, shown))}, given, ue.Expected.Type().Kind() == reflect.Slice}}
	case errors.As(err, &pe):
		return []decodeProblem{{FieldError: FieldError{Path: shown, Value: quotedValue(pe.Value), Msg: "must be " + describeType(pe.Expected.Type())}}}
	}
	msg := err.Error()
	switch {
	case strings.HasPrefix(msg, "expected a map or struct, got "):
		given := kindWord(strings.Trim(strings.TrimPrefix(msg, "expected a map or struct, got "), `"`))
		return []decodeProblem{{FieldError{Path: shown, Msg: "must be a mapping of keys, not " + given}, given, false}}
	case strings.HasPrefix(msg, "source data must be an array or slice, got "):
		given := kindWord(strings.TrimPrefix(msg, "source data must be an array or slice, got "))
		return []decodeProblem{{FieldError{Path: shown, Msg: "must be a list, not " + given}, given, true}}
	}
	if rest, ok := strings.CutPrefix(msg, "has invalid keys: "); ok {
		var out []decodeProblem
		keys := keysAt(path)
		for _, key := range strings.Split(rest, ", ") {
			shownKey := key
			if shownKey == "" {
				shownKey = `""`
			}
			p := shownKey
			if path != "" {
				p = path + "." + shownKey
			}
			fe := FieldError{Path: p, Value: key, Msg: msgUnknownKey}
			if len(keys) > 0 {
				if near := nearKey(key, keys); near != "" {
					fe.Hint = didYouMean(near)
				} else {
					fe.Hint = keyElsewhere(key) + "known keys here: " + strings.Join(keys, ", ")
				}
			}
			out = append(out, decodeProblem{FieldError: fe})
		}
		return out
	}
	return []decodeProblem{{FieldError: FieldError{Path: shown, Msg: oneLine(msg)}}}
}

// kindParamHint is the hint of an unknown key at path of a kinds entry
// whose kind takes a parameter and is written without it, when the key's
// value makes that kind whole: kind: lighting with target: 16h is
// lighting:16h, written as format writes it; "" otherwise.
func kindParamHint(settings map[string]any, path, format string) string {
	entry, key, ok := cutLast(path)
	if !ok || !kindsEntry().MatchString(entry) {
		return ""
	}
	base := strings.ToLower(strings.TrimSpace(rawAt(settings, entry+".kind")))
	what := map[string]string{KindLighting: "day length", KindPhotoperiod: "day length", KindSunAltitude: "altitude"}[base]
	value := strings.TrimSpace(rawAt(settings, path))
	if what == "" || value == "" {
		return ""
	}
	k, err := ParseKind(base + ":" + value)
	if err != nil {
		return ""
	}
	kind := k.String()
	if format == "toml" || format == "json" {
		kind = strconv.Quote(kind) // text, in quotes
	}
	return fmt.Sprintf("a %s entry takes its %s in the kind: write %s and leave %s out", base, what, keyWritten(format, "kind", kind), key)
}

// keyWritten is key with its value as format writes them ("yaml", "toml"
// or "json"; YAML for another): "horizon: 2", "horizon = 2", `"horizon":
// 2`. value is written as given, in quotes when it is text in TOML or JSON.
func keyWritten(format, key, value string) string {
	switch format {
	case "toml":
		return key + " = " + value
	case "json":
		return strconv.Quote(key) + ": " + value
	}
	return key + ": " + value
}

// cutLast splits a decoder path at its last key: "feeds[0].kinds[1]" and
// "target" for "feeds[0].kinds[1].target".
func cutLast(path string) (before, key string, ok bool) {
	i := strings.LastIndexByte(path, '.')
	if i < 0 {
		return "", "", false
	}
	return path[:i], path[i+1:], true
}

// kindsEntry matches the path of a kinds entry, "feeds[0].kinds[2]".
var kindsEntry = sync.OnceValue(func() *regexp.Regexp { return regexp.MustCompile(`^feeds\[\d+\]\.kinds\[\d+\]$`) })

// tomlNumberAt is the number written at path in TOML data, as written
// ("17.30", "1e3"), read from the line of its key (places); "" when that
// line does not hold the key = a number.
func tomlNumberAt(data []byte, places map[string]keyPlace, path string) string {
	at, ok := places[strings.ToLower(path)]
	l, found := lineAt(data, at.line)
	if !ok || !found || at.col < 1 || at.col > len(l) {
		return ""
	}
	_, rest, ok := strings.Cut(string(l[at.col-1:]), "=")
	rest = strings.TrimLeft(rest, " \t")
	value := string(valueFrom([]byte(rest), 1))
	if !ok || value == "" || strings.Trim(value, "+-0123456789._eE") != "" {
		return ""
	}
	return value
}

// nearKey is the key of keys, those known where an unknown key is
// written, that the key likely means: the key a short name stands for
// ("latitude" for "lat"), or the nearest in spelling; "" for none.
func nearKey(key string, keys []string) string {
	if long := shortKeys[strings.ToLower(key)]; slices.Contains(keys, long) {
		return long
	}
	if word := keyWords[strings.ToLower(key)]; slices.Contains(keys, word) {
		return word
	}
	return closest(key, keys)
}

// keyWords are the keys that other words for them stand for where those
// keys are written (a plan's "time" is its start, a feed's or a plan's
// "name" its title, a "reminder" an alarm); unlike shortKeys, no command
// line flag is named so.
var keyWords = map[string]string{
	"time": "start", "begin": "start", "from": "start", "starts": "start",
	"until": "end", "to": "end", "finish": "end", "ends": "end",
	"day": "date", "when": "date",
	"duration": "for", "length": "for",
	"name":     "title",
	"reminder": "alarm", "alert": "alarm", "notify": "alarm",
}

// tomlTableHint is the hint of key, unknown at path of a TOML document
// (settings, as decoded), written as a table with the name of a list of
// tables near it, "[site]" for "[[sites]]": the header to write, in two
// brackets, for the did-you-mean of the list's key, which followed alone
// gives "[sites]", a table where a list belongs; hint, key's own, otherwise.
func tomlTableHint(settings map[string]any, path, key, hint string) string {
	parent := strings.TrimSuffix(strings.TrimSuffix(path, key), ".")
	near := nearKey(key, keysAt(parent))
	if !slices.Contains([]string{"sites", "feeds", "kinds", "plans"}, near) {
		return hint
	}
	if v, _ := valueAt(settings, path); !isMap(v) {
		return hint
	}
	name := near
	if i := strings.LastIndexByte(path, '.'); i >= 0 {
		name = listIndex().ReplaceAllString(path[:i], "") + "." + near
	}
	return fmt.Sprintf("did you mean [[%s]]? %s", name, listHint("toml", name))
}

func isMap(v any) bool { _, ok := v.(map[string]any); return ok }

// listHint says how the format writes a list of mappings, for one given
// as a mapping at path ("sites", "feeds[0].kinds"): TOML's [[sites]] with
// two brackets, where [sites] is one table.
func listHint(format, path string) string {
	switch format {
	case "toml":
		name := listIndex().ReplaceAllString(path, "")
		return fmt.Sprintf("in TOML each entry of the list begins with [[%s]], in two brackets", name)
	case "json":
		return "a list is written in brackets: [{…}, {…}]"
	}
	return `each entry of the list begins with "- "`
}

// typographicQuoted reports whether v is text in typographic quotes
// (“sunset”, ‘sunset’, „sunset“, «sunset»), which YAML, TOML and JSON read
// as part of the text, and returns the quotes and the text within them.
func typographicQuoted(v string) (open, inner, end string, ok bool) {
	o, n := utf8.DecodeRuneInString(v)
	e, m := utf8.DecodeLastRuneInString(v)
	if len(v) <= n+m || !strings.ContainsRune("“‘„‚«‹”", o) || !strings.ContainsRune("”’“‘»›", e) {
		return "", "", "", false
	}
	inner = strings.TrimSpace(v[n : len(v)-m])
	return string(o), inner, string(e), inner != ""
}

// commentValue is a YAML line whose key has no value but a comment that
// begins right after its # ("color: #ff8800"): a value that was meant.
var commentValue = sync.OnceValue(func() *regexp.Regexp {
	return regexp.MustCompile(`^[ \t]*(?:-[ \t]+)?([A-Za-z_][A-Za-z0-9_]*):[ \t]+(#[^ \t#].*?)[ \t]*$`)
})

// commentValues are the keys of a YAML document data left empty by a value
// that begins with #, which YAML reads as a comment ("color: #ff8800",
// "label: #1 vents"), each named at its path (from places, the keys' lines).
// A comment written as one, "# …" with a space, is no problem.
func commentValues(data []byte, places map[string]keyPlace) []FieldError {
	if !bytes.Contains(data, []byte(": #")) && !bytes.Contains(data, []byte(":\t#")) {
		return nil
	}
	var out []FieldError
	var onLine map[int][]string // the paths of places by line, gathered at the first key found
	lines := bytes.Split(data, []byte("\n"))
	for i, l := range lines {
		if bytes.IndexByte(l, '#') < 0 {
			continue
		}
		at := commentValue().FindSubmatchIndex(bytes.TrimRight(l, "\r"))
		if at == nil || nestedBelow(lines[i+1:], at[2]) {
			continue // "kinds: #sun" over "  - sunrise": a comment, and a value below it
		}
		m := [][]byte{nil, l[at[2]:at[3]], l[at[4]:at[5]]}
		key, comment := strings.ToLower(string(m[1])), string(m[2])
		if onLine == nil {
			onLine = map[int][]string{}
			for path, at := range places {
				onLine[at.line] = append(onLine[at.line], path)
			}
		}
		for _, path := range onLine[i+1] {
			if path[strings.LastIndexAny(path, ".]")+1:] != key {
				continue
			}
			hint := fmt.Sprintf("write it in quotes: %s: %q", m[1], comment)
			if _, _, code := readColor(comment); key == "color" && code {
				hint = colorHint(comment) // the nearest name
			} else if key == "color" {
				hint = `color takes a CSS3 colour name, e.g. "steelblue", not a hex code`
			}
			out = append(out, FieldError{Path: path, Msg: fmt.Sprintf("is empty: %q after it is a comment in YAML", comment), Hint: hint})
		}
	}
	return out
}

// nestedBelow reports whether the first line of lines with text, not a
// comment, is a value of a key at column col of the line above them:
// indented deeper, or a list's dash at the key's own column.
func nestedBelow(lines [][]byte, col int) bool {
	for _, l := range lines {
		t := bytes.TrimLeft(l, " ")
		if len(bytes.TrimSpace(t)) == 0 || t[0] == '#' {
			continue
		}
		indent := len(l) - len(t)
		return indent > col || (indent == col && t[0] == '-')
	}
	return false
}

// kindsWithColon words a kinds entry written as a kind with a colon after
// it ("- sunrise:"), which YAML reads as a mapping of the one key
// "sunrise" without a value, as one problem at the entry that says to
// drop the colon, in place of the entry's "kind: is required" and its
// unknown key "sunrise".
func kindsWithColon(problems []FieldError) []FieldError {
	entries := map[string]string{} // a kinds entry's path: the kind written as its key
	for _, p := range problems {
		dot := strings.LastIndexByte(p.Path, '.')
		if p.Msg != msgUnknownKey || dot < 0 || !strings.HasSuffix(p.Path[:dot], "]") || fieldKey(p.Path[:dot]) != "kinds" {
			continue
		}
		if _, err := ParseKind(p.Path[dot+1:]); err == nil {
			entries[p.Path[:dot]] = p.Path[dot+1:]
		}
	}
	if len(entries) == 0 {
		return problems
	}
	var out []FieldError
	for _, p := range problems {
		dot := strings.LastIndexByte(p.Path, '.')
		if dot < 0 {
			out = append(out, p)
			continue
		}
		kind, ok := entries[p.Path[:dot]]
		switch {
		case ok && p.Msg == msgUnknownKey && p.Path[dot+1:] == kind:
			out = append(out, FieldError{Path: p.Path[:dot], Value: strconv.Quote(kind + ":"), Msg: "a kind with a colon after it is a mapping without a kind: key",
				Hint: fmt.Sprintf("write - %s, without the colon", kind), Line: p.Line})
		case ok && p.Msg == msgRequired && p.Path[dot+1:] == "kind":
			// said by the problem above
		default:
			out = append(out, p)
		}
	}
	return out
}

// writtenAs reports whether p says a key is required that an unknown key
// beside it is named as (`lat: unknown key (did you mean "latitude"?)`):
// that problem says what to write, and once it is followed the key is there.
func writtenAs(p FieldError, problems []FieldError) bool {
	dot := strings.LastIndexByte(p.Path, '.')
	if p.Msg != msgRequired || dot < 0 {
		return false
	}
	parent, key := p.Path[:dot+1], p.Path[dot+1:]
	return slices.ContainsFunc(problems, func(q FieldError) bool {
		return q.Msg == msgUnknownKey && q.Hint == didYouMean(key) && strings.HasPrefix(q.Path, parent) &&
			!strings.ContainsAny(q.Path[len(parent):], ".[")
	})
}

// listIndex is the index of a list in a decoder path: "[0]".
var listIndex = sync.OnceValue(func() *regexp.Regexp { return regexp.MustCompile(`\[[0-9]+\]`) })

// shortKeys are the short names people write for the configuration's
// keys, from the command line's flags (--lat, --lon, --elev, --tz,
// --pressure, --temperature, --max-illumination) and other tools, which
// are too far from the key for closest to take them for it: "lat" is three
// letters of "latitude"'s eight.
var shortKeys = map[string]string{
	"lat": "latitude", "lon": "longitude", "lng": "longitude", "long": "longitude",
	"elev": "elevation", "alt": "elevation", "altitude": "elevation", "height": "elevation",
	"tz": "timezone", "zone": "timezone", "time_zone": "timezone",
	"pressure": "pressure_hpa", "temperature": "temperature_c", "max-illumination": "max_illumination",
}

// ShortKey is the configuration's key that name, a command line flag's
// name without its dashes or another tool's short name, stands for:
// "latitude" for "lat" (--lat) or "lng", "elevation" for "elev", "timezone"
// for "tz", "max_illumination" for "max-illumination"; false for any other
// name. A key written so in the file is told the key to write, and a
// flag's value that is no number is told how to write it in the words of
// its key's hint (NumberTextHint).
func ShortKey(name string) (key string, ok bool) {
	key, ok = shortKeys[name]
	return key, ok
}

// keySections are the places a key is written, with the words that name
// them in keyElsewhere.
var keySections = []struct{ path, words string }{
	{"", "the top of the file"},
	{"service", "service:"},
	{"page", "page:"},
	{"sites", "a site"},
	{"feeds", "a feed"},
	{"feeds.kinds", "a kinds entry ({kind: …})"},
	{"feeds.plans", "a plan"},
}

// keyElsewhere says where the key written in the wrong place belongs
// ("listen is a key of service:; "): a site's timezone written in a feed,
// a service's listen in a site; "" for a key of no place.
func keyElsewhere(key string) string {
	var where []string
	for _, sec := range keySections {
		if slices.Contains(keysAt(sec.path), strings.ToLower(key)) {
			where = append(where, sec.words)
		}
	}
	switch len(where) {
	case 0:
		return ""
	case 1:
		return key + " is a key of " + where[0] + "; "
	}
	return key + " is a key of " + strings.Join(where[:len(where)-1], ", ") + " or " + where[len(where)-1] + "; "
}

// rawAt returns, as text, the single value written at a decoder path such
// as "sites[1]" or "feeds[0].kinds" in the settings read (keys in any
// case); "" when there is none there or it is a mapping or a list.
func rawAt(v any, path string) string {
	v, ok := valueAt(v, path)
	if !ok {
		return ""
	}
	switch v.(type) {
	case map[string]any, []any, nil:
		return ""
	}
	return showValue(v)
}

// valueAt is the value at path ("feeds[0].kinds[2]") of v, a document as
// decoded, its keys in any case; false when there is none.
func valueAt(v any, path string) (any, bool) {
	for _, seg := range strings.Split(path, ".") {
		name, idx, _ := strings.Cut(seg, "[")
		if name != "" {
			m, ok := v.(map[string]any)
			if !ok {
				return nil, false
			}
			found := false
			for k, x := range m {
				if strings.EqualFold(k, name) {
					v, found = x, true
					break
				}
			}
			if !found {
				return nil, false
			}
		}
		for idx != "" {
			n, rest, _ := strings.Cut(idx, "]")
			i, err := strconv.Atoi(n)
			list, ok := v.([]any)
			if err != nil || !ok || i < 0 || i >= len(list) {
				return nil, false
			}
			v, idx = list[i], strings.TrimPrefix(rest, "[")
		}
	}
	return v, true
}

// keysAt lists the keys allowed at a decoder path such as "feeds[2].kinds[0]".
func keysAt(path string) []string {
	t := reflect.TypeFor[Config]()
	if path != "" {
		for _, part := range strings.Split(path, ".") {
			name, _, _ := strings.Cut(part, "[")
			f, ok := fieldByTag(t, name)
			if !ok {
				return nil
			}
			t = f.Type
			for t.Kind() == reflect.Slice || t.Kind() == reflect.Pointer {
				t = t.Elem()
			}
			if t.Kind() != reflect.Struct {
				return nil
			}
		}
	}
	var keys []string
	for i := 0; i < t.NumField(); i++ {
		if tag := t.Field(i).Tag.Get("mapstructure"); tag != "" && tag != "-" {
			keys = append(keys, strings.Split(tag, ",")[0])
		}
	}
	return keys
}

func fieldByTag(t reflect.Type, name string) (reflect.StructField, bool) {
	if t.Kind() != reflect.Struct {
		return reflect.StructField{}, false
	}
	for i := 0; i < t.NumField(); i++ {
		f := t.Field(i)
		if strings.Split(f.Tag.Get("mapstructure"), ",")[0] == name {
			return f, true
		}
	}
	return reflect.StructField{}, false
}

func describeType(t reflect.Type) string {
	switch t {
	case zoneType:
		return "a time zone name"
	case kindType, kindSpecType:
		return "a kind name or a mapping with a \"kind\" key"
	case durationType:
		return "a duration such as \"30m\""
	}
	switch t.Kind() {
	case reflect.String:
		return "text"
	case reflect.Bool:
		return "true or false"
	case reflect.Int, reflect.Int64, reflect.Int32:
		return "a whole number"
	case reflect.Float64, reflect.Float32:
		return "a number"
	case reflect.Slice:
		return "a list"
	case reflect.Struct, reflect.Map:
		return "a mapping of keys"
	}
	return t.String()
}

// The words of a value given where a value of another type belongs
// (describeValue's, kindWord's) that a problem's reading looks for.
const (
	valueNumber  = "a number"
	valueText    = "text"
	valueMapping = "a mapping"
)

func describeValue(v any) string {
	if isNumber(v) {
		return valueNumber
	}
	switch v.(type) {
	case nil:
		return "empty"
	case string:
		return valueText
	case bool:
		return "true/false"
	case []any:
		return "a list"
	case map[string]any, map[any]any:
		return valueMapping
	case toml.LocalDate:
		return "a date"
	case toml.LocalTime:
		return "a time of day"
	case toml.LocalDateTime, time.Time: // TOML's, and YAML's timestamps
		return "a date and time"
	}
	return fmt.Sprintf("a %T", v)
}

// isNumber reports whether v, a decoded value, is a number.
func isNumber(v any) bool {
	switch v.(type) {
	case int, int64, uint64, int32, float64, float32:
		return true
	}
	return false
}

// typeHint is the hint of v, decoded at path, which is no value of type t;
// n is v's scalar node in the YAML document, nil for none or another format.
func typeHint(path string, t reflect.Type, v any, n *yaml.Node) string {
	key := fieldKey(path)
	if t == durationType { // alarm: true, offset: [30m]
		if b, ok := v.(bool); ok && !b {
			return `write "0s" for none`
		}
		return `write a number with a unit, e.g. "15m" or "1h"`
	}
	if x, ok := v.(string); ok && (t.Kind() == reflect.Float64 || t.Kind() == reflect.Int) {
		x = strings.TrimSpace(x)
		if _, err := strconv.ParseFloat(x, 64); err == nil {
			return "write the number without quotes" // "47.5" where 47.5 belongs
		}
		return NumberTextHint(key, x)
	}
	if x, ok := v.(string); ok && t.Kind() == reflect.Bool {
		hint := "write true or false"
		switch strings.ToLower(strings.TrimSpace(x)) {
		case "true", "yes", "y", "on":
			hint = "write true"
		case "false", "no", "n", "off":
			hint = "write false"
		}
		if n != nil && n.Style == 0 {
			return hint // utc: yes, written without quotes, is text to YAML 1.2
		}
		return hint + ", without quotes"
	}
	if t.Kind() == reflect.String {
		if _, ok := v.(string); !ok {
			if h := nameHint(key, v); h != "" {
				return h
			}
			return "put the value in quotes"
		}
	}
	return ""
}

// fieldKey is the last key of a field path, without its index:
// "months" for "feeds[0].kinds[1].months[2]".
func fieldKey(path string) string {
	key := path[strings.LastIndexByte(path, '.')+1:]
	if i := strings.IndexByte(key, '['); i >= 0 {
		key = key[:i]
	}
	return key
}

// numberUnits lists, for the keys that hold a number, the units people
// write after it ("120 m", "1013 hPa"), which the key's name already says.
var numberUnits = map[string][]string{
	"elevation":     {"m", "metre", "metres", "meter", "meters"},
	"pressure_hpa":  {"hpa", "mbar", "mb"},
	"temperature_c": {"c", "°c", "°", "degc", "celsius"},
	"days_back":     {"d", "day", "days"},
	"days_ahead":    {"d", "day", "days"},
	"low":           {"°", "deg", "degrees"},
	"high":          {"°", "deg", "degrees"},
	"horizon":       {"°", "deg", "degrees"}, // --horizon and an ad-hoc feed's horizon: the key's own is any
}

// byteUnits are the units of a size written after its number, in bytes
// (SI, as max_feed_bytes' limit of 1 MB is 1000000 bytes).
var byteUnits = map[string]float64{"b": 1, "bytes": 1, "kb": 1e3, "mb": 1e6}

// NumberTextHint says how to write, as a number, text x that is not one
// where the configuration's key holds a number: the number alone when the
// text is a number and the key's own unit ("write 120" for elevation
// "120m"), a fraction for a percentage of max_illumination, Celsius for a
// temperature in Fahrenheit, the bytes of a size in kB or MB, decimal
// degrees for a latitude or longitude in degrees and minutes; for words
// ("lots"), which have no number to keep, what the key's number is, or "".
// The flags and the ad-hoc feeds' parameters that give the same numbers
// (--lat, lat) take their hints from here too, and an ad-hoc feed's horizon
// ("horizon", whose hints name the skyline points it may be as well).
func NumberTextHint(key, x string) string {
	num, unit, f, err := numberAndUnit(x)
	switch {
	case key == "latitude", key == "longitude":
		return coordinateHint(key, x)
	case groupedNumber().MatchString(strings.TrimSpace(x)): // "1,340" m, "1 013" hPa, "1,000,000" bytes
		return "write the number without separators: " + strings.NewReplacer(",", "", " ", "", "\u00a0", "", "\u202f", "").Replace(strings.TrimSpace(x))
	case key == "elevation" && err == nil && (unit == "ft" || unit == "feet" || unit == "foot"):
		return fmt.Sprintf("metres above sea level, not feet: write %.0f for %s ft", f*0.3048, num) // the international foot, 0.3048 m
	case key == "max_illumination":
		return IlluminationHint(x)
	case key == "max_feed_bytes":
		if mul, ok := byteUnits[unit]; ok && err == nil {
			return fmt.Sprintf("write the number of bytes: %.0f", f*mul) // 1000000 for "1MB"
		}
		return "write the number of bytes, e.g. 1000000"
	case err != nil:
		return numberWords[key] // "high" for high
	case key == "temperature_c" && (unit == "f" || unit == "°f"):
		return fahrenheitHint(f, num)
	}
	for _, u := range numberUnits[key] {
		if unit == u {
			hint := "write the number alone, without the unit: " + num
			if key == "horizon" { // which may be skyline points too
				hint += "; " + horizonPoints
			}
			return hint
		}
	}
	if key == "days_back" || key == "days_ahead" {
		return "write a number of days, e.g. 365 for a year" // "1y"
	}
	return numberWords[key]
}

// groupedNumber is a whole number written with a separator between its
// thousands ("1,340", "1 013", "1,000,000"; a no-break or thin space too).
var groupedNumber = sync.OnceValue(func() *regexp.Regexp {
	return regexp.MustCompile("^[0-9]{1,3}(?:[, \u00a0\u202f][0-9]{3})+$")
})

// numberAndUnit splits x, a number written with a unit ("120m", "30 %"),
// into the number as written, num, and its unit in lower case, and reads
// the number, f (err when x does not start with one).
func numberAndUnit(x string) (num, unit string, f float64, err error) {
	n := len(x) - len(strings.TrimLeft(x, "+-.0123456789"))
	num, unit = x[:n], strings.ToLower(strings.TrimSpace(x[n:]))
	f, err = strconv.ParseFloat(num, 64)
	return num, unit, f, err
}

// LatitudeText and LongitudeText say how a latitude and a longitude are
// written, the hint of one out of range, missing, or given in degrees and
// minutes: a site's latitude and longitude, --lat and --lon, and an ad-hoc
// feed's lat and lon say it in these words.
const (
	LatitudeText  = "decimal degrees, north positive, south negative, e.g. -42.88 for 42°52′48″S"
	LongitudeText = "decimal degrees, east positive, west negative, e.g. -72.26 for 72°15′36″W"
)

// HorizonText says what a horizon of one altitude is, the hint of one out
// of range; HorizonPointsText adds the skyline points written
// azimuth:altitude, the hint of a horizon that is neither (the
// configuration's horizon takes a list of points instead). A site's
// horizon, --horizon and an ad-hoc feed's horizon say it in these words.
const (
	HorizonText       = "the altitude of the visible skyline in degrees: 0 for a flat horizon, 2 behind low hills"
	HorizonPointsText = HorizonText + "; " + horizonPoints
	horizonPoints     = "or skyline points azimuth:altitude, e.g. 0:2,90:8,180:1"
)

// coordinateText is LatitudeText and LongitudeText by key.
var coordinateText = map[string]string{"latitude": LatitudeText, "longitude": LongitudeText}

// numberWords say what the number of a key is, for text that holds none.
var numberWords = map[string]string{
	"elevation":     "metres above sea level, e.g. 120",
	"pressure_hpa":  "the air pressure at the site in hPa, e.g. 1013",
	"temperature_c": "degrees Celsius, e.g. -5",
	"low":           "the Sun's altitude in degrees, e.g. -4",
	"high":          "the Sun's altitude in degrees, e.g. 6",
	"horizon":       HorizonPointsText,
}

// IlluminationText says what a max_illumination (--max-illumination) is.
const IlluminationText = "the Moon's illuminated fraction, e.g. 0.25 for a quarter lit"

// IlluminationHint is the hint of a max_illumination (--max-illumination)
// written x, a number out of 0..1 or text that is no number: for a
// percentage ("30", "30%", "30 %"), the fraction it means, "write a
// fraction of 1: 0.3 for 30 %"; for anything else, IlluminationText.
func IlluminationHint(x string) string {
	num, unit, f, err := numberAndUnit(strings.TrimSpace(x))
	// 30 is no fraction of 1, and taken for a percentage as 30 % is
	percent := err == nil && (unit == "%" && f >= 0 && f <= 100 || unit == "" && f > 1 && f <= 100)
	if !percent {
		return IlluminationText
	}
	return "write a fraction of 1: " + strconv.FormatFloat(f/100, 'g', -1, 64) + " for " + num + " %"
}

// nameHint says how to write a value that is not text where key holds
// text: a month's or a weekday's name for a number in months or weekdays,
// a clock time "HH:MM" for a number or a TOML time where a time of day
// belongs (`write it "23:00"` for 2300 and for 23, "17:30" for 17.30), ":8080" for a port
// alone where host:port belongs; "" for other keys and values.
func nameHint(key string, v any) string {
	clock := key == "latest_off" || key == "earliest_on" || key == "start" || key == "end"
	var n int64
	switch x := v.(type) {
	case toml.LocalTime: // TOML's unquoted 20:00:00
		if clock {
			return fmt.Sprintf(`write it "%02d:%02d"`, x.Hour, x.Minute)
		}
		return ""
	case int:
		n = int64(x)
	case int64:
		n = x
	case uint64:
		n = int64(x)
	case float64:
		if h, m := math.Trunc(x), math.Round((x-math.Trunc(x))*100); clock && x != h && x > 0 && h < 24 && m < 60 {
			return fmt.Sprintf(`write it "%02.0f:%02.0f"`, h, m) // 17.30, read as the number 17.3
		}
		if x != math.Trunc(x) || math.Abs(x) > 1e6 {
			return ""
		}
		n = int64(x)
	default:
		return ""
	}
	switch key {
	case "listen":
		return portAloneHint(n)
	case "months":
		return monthNumberHint(n, "write the month's name: jan, feb, mar, apr, may, jun, jul, aug, sep, oct, nov or dec")
	case "weekdays":
		return "write the day's name: mon, tue, wed, thu, fri, sat or sun"
	}
	if clock {
		if n >= 0 && n < 24 { // an hour alone: 23 is 23:00, not 00:23
			return fmt.Sprintf(`write it "%02d:00"`, n)
		}
		return clockDigitsHint(strconv.FormatInt(n, 10), `write a local time "HH:MM" in quotes, e.g. "22:00"`) // 2300, 930
	}
	return ""
}

// namesListHint says how to write one number given where key holds a list
// of month or weekday names (`months: 6`): the list of the month's name,
// `write it ["jun"]`, as a list of the number is no month either; the
// names to write for another number or for weekdays; "" for other keys.
func namesListHint(key, value string) string {
	n, err := strconv.Atoi(value)
	switch {
	case err != nil:
		return ""
	case key == "months" && n >= 1 && n <= 12:
		return fmt.Sprintf("write it [%q]", monthNames[n-1])
	case key == "months":
		return `write a list of the months' names, e.g. ["jun", "jul"]`
	case key == "weekdays":
		return `write a list of the days' names, e.g. ["sat", "sun"]`
	}
	return ""
}

// dateKey says what the key at path holds when it is a date: "a date" for
// an entry of a kinds entry's dates list, "a date or a date rule" for a
// plan's date; "" for any other key.
func dateKey(path string) string {
	key := fieldKey(path)
	switch {
	case key == "dates" && strings.Contains(path, ".kinds["):
		return "a date"
	case key == "date" && strings.Contains(path, ".plans["):
		return "a date or a date rule"
	}
	return ""
}

// dateValueHint says how to write, as a date, a value of another type where
// a date belongs: the date of a date and time ("write it 2027-06-12" for
// TOML's 2027-06-12T10:00:00), the date a number spells as YYYYMMDD, in
// quotes, as JSON needs them (`write it "2027-06-12"` for 20270612), and
// the form for the rest.
func dateValueHint(v any) string {
	switch x := v.(type) {
	case toml.LocalDateTime:
		return "write it " + x.LocalDate.String()
	case time.Time:
		return "write it " + x.Format(time.DateOnly)
	case int, int64, uint64, float64:
		n := showValue(x)
		if d, err := time.Parse("20060102", n); err == nil && len(n) == 8 {
			return `write it "` + d.Format(time.DateOnly) + `"`
		}
	}
	return `write YYYY-MM-DD in quotes, e.g. "2027-06-12"`
}

// kindWord names a Go kind in the file's terms.
func kindWord(k string) string {
	switch k {
	case "int", "int64", "uint64", "float64", "float32":
		return valueNumber
	case "string":
		return valueText
	case "bool":
		return "true/false"
	case "slice", "array":
		return "a list"
	case "map", "struct":
		return valueMapping
	}
	return k
}

// quotedValue shows a value for a type problem: text in quotes, so that
// `latitude: "95"` reads as the text it is.
func quotedValue(v any) string {
	if s, ok := v.(string); ok {
		if len(s) > 80 {
			s = s[:80] + "…"
		}
		return strconv.Quote(s)
	}
	return showValue(v)
}

// numberText writes a number read from a JSON file as JSON writes it:
// 20270612 stays 20270612 (fmt would show 2.0270612e+07), and only the
// very small or large take an exponent (encoding/json's rule).
func numberText(x float64) string {
	if a := math.Abs(x); a != 0 && (a < 1e-6 || a >= 1e21) {
		return strconv.FormatFloat(x, 'g', -1, 64)
	}
	return strconv.FormatFloat(x, 'f', -1, 64)
}

func showValue(v any) string {
	switch x := v.(type) {
	case nil:
		return ""
	case string:
		return x
	case []any:
		return "[…]"
	case map[string]any, map[any]any:
		return "{…}"
	case float64:
		return numberText(x)
	}
	s := fmt.Sprint(v)
	if len(s) > 80 {
		s = s[:80] + "…"
	}
	return s
}

// Load reads the configuration file at path; the format comes from the
// extension (.yaml, .yml, .toml, .json). The environment is not consulted
// (see LoadEnv). A *ValidationError from Load names the file in Source.
func Load(path string) (*Config, error) {
	return LoadEnv(path, nil)
}

// LoadEnv is Load with environment overrides (see ParseEnv).
func LoadEnv(path string, env LookupEnv) (*Config, error) {
	ext := strings.ToLower(filepath.Ext(path))
	switch ext {
	case ".yaml", ".yml", ".toml", ".json":
	default:
		if st, err := os.Stat(path); err == nil && st.IsDir() { // "--config /etc/heliocal"
			return nil, fmt.Errorf("%s: is a directory, not a configuration file", path)
		}
		return nil, fmt.Errorf("%s: unknown file extension %q (use .yaml, .yml, .toml or .json)", path, ext)
	}
	f, err := os.Open(path)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			if target, lerr := os.Readlink(path); lerr == nil { // a link to a file moved or removed
				return nil, fmt.Errorf("%s: %w: a symbolic link to %s, which does not exist", path, errNoSuchFile, target)
			}
			return nil, fmt.Errorf("%s: %w", path, errNoSuchFile)
		}
		var pe *fs.PathError
		if errors.As(err, &pe) {
			return nil, fmt.Errorf("%s: %w", path, pe.Err)
		}
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	defer f.Close()
	if st, err := f.Stat(); err == nil && st.IsDir() {
		return nil, fmt.Errorf("%s: is a directory, not a configuration file", path)
	}
	c, err := parseFrom(f, ext, env, filepath.Dir(path))
	if err != nil {
		var verr *ValidationError
		if errors.As(err, &verr) {
			verr.Source = path
			return nil, verr
		}
		var serr *SyntaxError
		if errors.As(err, &serr) {
			serr.Source = path // "farm.yaml:5: cannot read the file as yaml: …"
			return nil, serr
		}
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return c, nil
}

//go:embed demo.yaml
var demoYAML []byte

// DemoYAML returns the text of the built-in demo configuration.
func DemoYAML() []byte { return bytes.Clone(demoYAML) }

// Demo returns a fresh copy of the built-in demo configuration, parsed,
// defaulted and validated (a test keeps it valid).
func Demo() *Config {
	c, err := Parse(bytes.NewReader(demoYAML), "yaml")
	if err != nil {
		panic("config: built-in demo is invalid: " + err.Error())
	}
	return c
}

// DefaultPath is the configuration file Resolve looks for in the working
// directory when no path is given.
const DefaultPath = "heliocal.yaml"

// Source tells where a resolved configuration came from.
type Source struct {
	Path string // the file read; empty for the built-in demo
	Demo bool   // true when the built-in demo was used
}

func (s Source) String() string {
	if s.Demo {
		return "built-in demo"
	}
	return s.Path
}

// Resolve finds the configuration: flagPath when it is not empty, else
// ./heliocal.yaml when that file exists, else the built-in demo. env
// supplies the HELIOCAL_ overrides (nil for none). It returns which source
// was used, so the command line can say so.
func Resolve(flagPath string, env LookupEnv) (*Config, Source, error) {
	if flagPath != "" {
		c, err := LoadEnv(flagPath, env)
		return c, Source{Path: flagPath}, err
	}
	if st, err := os.Stat(DefaultPath); err == nil && !st.IsDir() {
		c, err := LoadEnv(DefaultPath, env)
		return c, Source{Path: DefaultPath}, err
	}
	c, err := ParseEnv(bytes.NewReader(demoYAML), "yaml", env)
	return c, Source{Demo: true}, err
}

// civilDate is t's date at 00:00 in t's location.
func civilDate(t time.Time) time.Time {
	return time.Date(t.Year(), t.Month(), t.Day(), 0, 0, 0, 0, t.Location())
}
