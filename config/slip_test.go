package config

import (
	"errors"
	"fmt"
	"strings"
	"testing"
)

// A configuration without a file name (standard input) is read in the
// format its first significant line shows.
func TestSniffFormat(t *testing.T) {
	for text, want := range map[string]string{
		"{\"sites\": []}":                      "json",
		"\ufeff# comment\n\n  {":               "json",
		"[service]\nlisten = \":8080\"":        "toml",
		"# sites\n[[sites]]\nid = \"a\"":       "toml",
		"title = \"x\"":                        "toml",
		"sites:\n  - id: a":                    "yaml",
		"---\nsites: []":                       "yaml",
		"service: {listen: \":8080\"}":         "yaml",
		"- just a list":                        "yaml",
		"":                                     "yaml",
		"feeds: [{id: \"a = b\", kinds: [x]}]": "yaml",
	} {
		if got := SniffFormat([]byte(text)); got != want {
			t.Errorf("SniffFormat(%q) = %s, want %s", text, got, want)
		}
	}
}

// A file written in another format than its name says (TOML or JSON in a
// .yaml file, YAML in a .toml or .json one) is told so after the syntax
// error, with the line that shows it: the error alone ("the document is a
// list", "expected character =") does not say what is wrong. A syntax error
// in a file of its own format, or in one whose first line shows no format,
// gets no such hint.
func TestOtherFormatHint(t *testing.T) {
	for _, tc := range []struct{ format, in, want string }{
		{"yaml", "# farm\n[[sites]]\nid = \"north-field\"\nlatitude = 47.5\n",
			"cannot read the file as yaml: line 2: the document is a list, not a mapping of keys (a configuration starts with keys such as sites: and feeds:); line 2 is TOML, but the file's name makes it read as YAML (rename it .toml, or write it in YAML)"},
		{"toml", "sites:\n  - id: north-field\n",
			"cannot read the file as toml: line 1, column 6: expected character =; line 1 is YAML, but the file's name makes it read as TOML (rename it .yaml, or write it in TOML)"},
		{"json", "sites:\n  - id: north-field\n",
			"cannot read the file as json: line 1: invalid character 's' looking for beginning of value; line 1 is YAML, but the file's name makes it read as JSON (rename it .yaml, or write it in JSON)"},
		{"json", "[service]\nlisten = \":8080\"\n",
			"cannot read the file as json: line 1: invalid character 's' looking for beginning of value; line 1 is TOML, but the file's name makes it read as JSON (rename it .toml, or write it in JSON)"},
		{"toml", "[[sites]]\nid = north\n",
			`cannot read the file as toml: line 2: id = north: text is written in quotes in TOML (write id = "north")`},
		{"json", "{\"sites\": [}\n",
			"cannot read the file as json: line 1: invalid character '}' looking for beginning of value"},
		{"toml", "(sites)\n",
			"cannot read the file as toml: line 1, column 1: invalid character at start of key: ("},
	} {
		_, err := Parse(strings.NewReader(tc.in), tc.format)
		if !errors.Is(err, ErrUnreadable) || err.Error() != tc.want {
			t.Errorf("%s %q:\n%v\nwant\n%s", tc.format, tc.in, err, tc.want)
		}
	}
}

// A key written with TOML's "=" in a YAML file is read by YAML as text: the
// error that follows, on that line or the next, says how YAML writes it.
func TestYAMLEqualsHint(t *testing.T) {
	_, err := Parse(strings.NewReader("sites:\n  - id = \"north-field\"\n    latitude: 47.5\n"), "yaml")
	want := `cannot read the file as yaml: line 3: mapping values are not allowed in this context (line 2 writes id = "north-field", and YAML writes a key with a colon: id: "north-field")`
	if !errors.Is(err, ErrUnreadable) || err.Error() != want {
		t.Errorf("%v\nwant\n%s", err, want)
	}
	_, err = Parse(strings.NewReader("service:\n  listen = \":8080\"\nsites:\n  - {id: x, latitude: 1, longitude: 2, timezone: UTC}\nfeeds:\n  - {id: f, site: x, kinds: [sunrise]}\n"), "yaml")
	got := problemsOf(t, err)
	wantP := FieldError{Path: "service", Value: `listen = ":8080"`, Msg: "must be a mapping of keys, not text", Hint: `YAML writes a key with a colon, not =: listen: ":8080"`, Line: 1}
	if len(got) != 1 || got[0] != wantP {
		t.Errorf("problems %+v, want %+v", got, wantP)
	}
}

// An empty file configures nothing, in every format: the problem is the
// missing sites, not the JSON decoder's "unexpected end of JSON input". A
// file of megabytes is refused in words a user can act on.
func TestEmptyAndHugeFiles(t *testing.T) {
	for _, format := range []string{"yaml", "toml", "json"} {
		for _, in := range []string{"", "\n  \n"} {
			_, err := Parse(strings.NewReader(in), format)
			ps := problemsOf(t, err)
			if len(ps) == 0 || ps[0].Path != "sites" || ps[0].Msg != "no sites: at least one site is needed" {
				t.Errorf("%s %q: %v, want the missing sites first", format, in, err)
			}
		}
	}
	_, err := Parse(strings.NewReader(strings.Repeat("#", maxFileBytes+1)), "yaml")
	want := "cannot read the file: larger than 8 MiB (8388608 bytes), where a configuration takes a few kB: is it the configuration?"
	if !errors.Is(err, ErrUnreadable) || err.Error() != want {
		t.Errorf("%v\nwant\n%s", err, want)
	}
}

// A YAML syntax error is named with the line at fault, in words that say
// what to write, where the decoder names the line a block began on ("line
// 1: did not find expected ',' or ']'" for a list left open on line 3, "did
// not find expected key" for a quote within quotes), no line at all (an
// unknown anchor), or a token it cannot start with.
func TestYAMLSyntaxSlips(t *testing.T) {
	for in, want := range map[string]string{
		"sites:\n  - id: a\n    name: [North\n    latitude: 1\n":         "line 3: a list opened with [ is not closed with ] (its items are separated by commas)",
		"a: 1\nb: {x: 1, y: 2\nc: [1, 2]\n":                              "line 2: a mapping opened with { is not closed with } (its items are separated by commas)",
		"sites:\n  - id: a\n    name: 'O'Brien farm'\n    latitude: 1\n": "line 3: the text in quotes ends at its second ' (write a ' within it twice, 'O''Brien farm', or the text in double quotes)",
		"sites:\n  - id: a\n    name: \"North Field\n    latitude: 1\n":  `line 3: the text in quotes that begins here is not closed with "`,
		"service:\n  base_url: @example\n":                               `line 2: a value cannot begin with @ in YAML (write it in quotes: "@example")`,
		"sites:\n  - id: %north\n":                                       `line 2: a value cannot begin with % in YAML (write it in quotes: "%north")`,
		"sites:\n  - id: a\n    name: *farm\n":                           `line 3: *farm is a reference to an anchor &farm, which the file does not have (a text that begins with * is written in quotes: "*farm")`,
	} {
		_, err := Parse(strings.NewReader(in), "yaml")
		if want = "cannot read the file as yaml: " + want; !errors.Is(err, ErrUnreadable) || err.Error() != want {
			t.Errorf("%q:\n%v\nwant\n%s", in, err, want)
		}
	}
}

// A TOML syntax error that shows a usual slip on its line (YAML's colon,
// a key with a space, a capital True, a number with separators, a quote
// within single quotes, quotes not closed, a comma closing an inline
// table) or a list left open on a line above is said so with what to
// write, instead of the parser's "expected character =" or "array elements
// must be separated by commas" on the line after.
func TestTOMLSyntaxSlips(t *testing.T) {
	for in, want := range map[string]string{
		"[[feeds]]\nkinds: [\"sunrise\"]\n": `line 2: kinds: ["sunrise"]: TOML writes a key and its value with =, not a colon (write kinds = ["sunrise"])`,
		"[[feeds]]\ndays ahead = 30\n":      `line 2: days ahead = 30: a key is written without spaces (write days_ahead = 30)`,
		"[[feeds]]\nutc = True\n":           `line 2: utc = True: not a TOML value (write utc = true)`,
		"[[feeds]]\ndays_ahead = 1,000\n":   `line 2: days_ahead = 1,000: a number is written without separators (write days_ahead = 1000)`,
		// a comma before one or two digits is a decimal comma: 9,7 is
		// 9.7, not 97, which would be another place and pass the checks
		"[[sites]]\nelevation = 4,5\n":                                  `line 2: elevation = 4,5: a number is written with a decimal point, not a comma (write elevation = 4.5)`,
		"[[sites]]\nname = 'O'Brien farm'\n":                            `line 2: name = 'O'Brien farm': the text in single quotes ends at its second ' (write it in double quotes: name = "O'Brien farm")`,
		"[[sites]]\nname = \"North\nid = \"a\"\n":                       `line 2: name = "North: the text in quotes is not closed on its line (close it there, or write text of several lines in triple quotes: """…""")`,
		"[[feeds]]\nkinds = [{kind = \"sunrise\",}]\n":                  `line 2: kinds = [{kind = "sunrise",}]: TOML has no comma after the last item of a mapping in braces {…}`,
		"[[feeds]]\nkinds = [\"sunrise\", \"sunset\"\ndays_ahead = 3\n": `line 2: kinds = ["sunrise", "sunset": the list opened with [ is not closed with ] (its items are separated by commas)`,
	} {
		_, err := Parse(strings.NewReader(in), "toml")
		if want = "cannot read the file as toml: " + want; !errors.Is(err, ErrUnreadable) || err.Error() != want {
			t.Errorf("%q:\n%v\nwant\n%s", in, err, want)
		}
	}
}

// A latitude or longitude written in TOML as people write one elsewhere,
// without quotes ("95N", "8.5E", "47,5"), which the TOML parser refuses,
// is named with its file's line, its field and the value as written, with
// the hint the same value gets in YAML: the decimal degrees to write, or,
// beyond the pole, the range; so is a number with its unit ("650 m",
// "20%") where a number belongs. With a syntax error of another kind
// further down, the parser's first error is worded with the same hint.
func TestTOMLNumberAsYAML(t *testing.T) {
	for _, value := range []string{"95N", "47.3N", "8.5E", "47,5", "74.0W", "47°30'15\"N", "9 42 0 E", "200E"} {
		for _, key := range []string{"latitude", "longitude"} {
			other := map[string]string{"latitude": "longitude", "longitude": "latitude"}[key]
			toml := fmt.Sprintf("[[sites]]\nid = \"a\"\n%s = %s # as written\n%s = 1\ntimezone = \"UTC\"\n", key, value, other)
			yaml := fmt.Sprintf("sites:\n  - id: a\n    %s: %q\n    %s: 1\n    timezone: UTC\n", key, value, other)
			_, terr := Parse(strings.NewReader(toml), "toml")
			_, yerr := Parse(strings.NewReader(yaml), "yaml")
			var tv, yv *ValidationError
			if !errors.As(terr, &tv) || !errors.As(yerr, &yv) || len(tv.Problems) != 1 || terr.Error() != yerr.Error() || tv.Problems[0].Line != 3 {
				t.Errorf("%s = %s:\ntoml: %v\nyaml: %v", key, value, terr, yerr)
			}
		}
	}
	// a number with its unit, or a word, where a number belongs: as in
	// YAML too, in a table and in a mapping in braces
	const feed = "[[feeds]]\nid = \"f\"\nsite = \"a\"\n"
	for in, want := range map[string]string{
		"[[sites]]\nid = \"a\"\nlatitude = 1\nlongitude = 1\nelevation = 650 m\n":                                                        `sites[0].elevation: "650 m": must be a number, not text (write the number alone, without the unit: 650)`,
		"[[sites]]\nid = \"a\"\nlatitude = 1\nlongitude = 1\nelevation = high # the top field\n":                                         `sites[0].elevation: "high": must be a number, not text (metres above sea level, e.g. 120)`,
		"[[sites]]\nid = \"a\"\nlatitude = 1\nlongitude = 1\n" + feed + "kinds = [\"sunrise\"]\ndays_ahead = 365 days\n":                 `feeds[0].days_ahead: "365 days": must be a whole number, not text (write the number alone, without the unit: 365)`,
		"[[sites]]\nid = \"a\"\nlatitude = 1\nlongitude = 1\n" + feed + "kinds = [{ kind = \"dark-window\", max_illumination = 20% }]\n": `feeds[0].kinds[0].max_illumination: "20%": must be a number, not text (write a fraction of 1: 0.2 for 20 %)`,
	} {
		_, err := Parse(strings.NewReader(in), "toml")
		if got := problemLines(t, err); len(got) != 1 || got[0] != want {
			t.Errorf("%q:\n%v\nwant\n%s", in, err, want)
		}
	}
	for in, want := range map[string]string{
		"[[sites]]\nlatitude = 95N\nname = \"North\n":   `line 2: latitude = 95N: a latitude is at most 90°, N or S: write decimal degrees, north positive, south negative, e.g. -42.88 for 42°52′48″S`,
		"[[sites]]\nlongitude = 8.5E\nname = \"North\n": `line 2: longitude = 8.5E: a coordinate is written in decimal degrees, east positive, west negative (write longitude = 8.5)`,
		"[[sites]]\nelevation = 650m\nname = \"North\n": `line 2: elevation = 650m: write the number alone, without the unit: 650`,
	} {
		_, err := Parse(strings.NewReader(in), "toml")
		if want = "cannot read the file as toml: " + want; !errors.Is(err, ErrUnreadable) || err.Error() != want {
			t.Errorf("%q:\n%v\nwant\n%s", in, err, want)
		}
	}
}

// A JSON syntax error is named on the line of the character at fault (a
// line break within text was named on the next line) with what JSON
// writes instead.
func TestJSONSyntaxSlips(t *testing.T) {
	for in, want := range map[string]string{
		`{"sites": [{"timezone": Europe/Zurich}]}`:        `line 1: invalid character 'E' looking for beginning of value (JSON writes text in double quotes: "Europe/Zurich")`,
		`{"feeds": [{"utc": True}]}`:                      `line 1: invalid character 'T' looking for beginning of value (JSON writes true in small letters)`,
		`{"sites": [{"latitude": NaN}]}`:                  `line 1: invalid character 'N' looking for beginning of value (JSON has no NaN: write a number)`,
		`{"sites": [{"elevation": +420}]}`:                `line 1: invalid character '+' looking for beginning of value (a number does not begin with + in JSON: write 420)`,
		`{"sites": [{"elevation": 0420}]}`:                `line 1: invalid character '4' after object key:value pair (a number does not begin with 0 in JSON: write it without the leading zeros)`,
		"{\"sites\": [{\"id\": \"a\"}\n{\"id\": \"b\"}]}": `line 2: invalid character '{' after array element (a comma is missing before it)`,
		"{\"sites\": [{\"name\": \"North\nField\"}]}":     `line 1: invalid character '\n' in string literal (the text in quotes is not closed on its line; JSON writes a line break within text as \n)`,
		"{\"sites\": []}\n{\"feeds\": []}\n":              `line 2: invalid character '{' after top-level value (a JSON file holds one document: its sites and feeds go in one {…})`,
		"{\"sites\": [{\"id\": \"a\"}\n":                  `line 1: unexpected end of JSON input (a { or [ is not closed with its } or ])`,
	} {
		_, err := Parse(strings.NewReader(in), "json")
		if want = "cannot read the file as json: " + want; !errors.Is(err, ErrUnreadable) || err.Error() != want {
			t.Errorf("%q:\n%v\nwant\n%s", in, err, want)
		}
	}
}

// Each problem carries the line its field is written on, in every format
// (an item of a list, its own line);
// a field not written (a missing key), the line of the mapping it is
// missing from; one set by the environment, none. The file's name is
// followed by the line, as compilers write it.
func TestProblemLines(t *testing.T) {
	for _, tc := range []struct {
		format, in string
		env        map[string]string
		want       map[string]int
	}{
		{"yaml", "sites:\n  - id: a\n    latitude: 95\n    longitude: 9\n    timezone: UTC\n  - id: b\n    longitude: 9\nfeeds:\n  - id: f\n    site: a\n    kinds:\n      - sunrise\n      - sunrize\n",
			nil, map[string]int{"sites[0].latitude": 3, "sites[1].latitude": 6, "feeds[0].kinds[1]": 13}},
		{"toml", "[[sites]]\nid = \"a\"\nlatitude = 95\nlongitude = 9\ntimezone = \"UTC\"\n\n[[feeds]]\nid = \"f\"\nsite = \"a\"\nkinds = [\"sunrise\"]\ndays_ahead = -3\n",
			nil, map[string]int{"sites[0].latitude": 3, "feeds[0].days_ahead": 11}},
		{"json", "{\"sites\": [{\"id\": \"a\",\n \"latitude\": 95, \"longitude\": 9, \"timezone\": \"UTC\"}],\n \"feeds\": [{\"id\": \"f\", \"site\": \"a\", \"kinds\": [\"sunrise\"]}]}\n",
			nil, map[string]int{"sites[0].latitude": 2}},
		// a list's items each on their own line (JSON, TOML): each item's problem
		// on its line, not on the line of the list's key
		{"json", "{\"sites\": [{\"id\": \"a\", \"latitude\": 1, \"longitude\": 9, \"timezone\": \"UTC\"},\n  {\"id\": \"b\", \"latitude\": 1, \"longitude\": 9}],\n \"feeds\": [{\"id\": \"f\", \"site\": \"a\",\n  \"kinds\": [\n    \"sunrise\",\n    \"sunrize\",\n    {\"kind\": \"sunset\", \"weekdays\": [\"sat\",\n      \"Samstag\"]}],\n  \"plans\": [\n    {\"title\": \"x\", \"date\": \"every day\", \"start\": \"10:00\"},\n    {\n      \"title\": \"y\", \"start\": \"10:00\"}]}]}\n",
			nil, map[string]int{"feeds[0].kinds[1]": 6, "feeds[0].kinds[2].weekdays[1]": 8, "feeds[0].plans[1].date": 11}},
		{"toml", "[[sites]]\nid = \"a\"\nlatitude = 1\nlongitude = 2\ntimezone = \"UTC\"\n[[feeds]]\nid = \"f\"\nsite = \"a\"\nkinds = [\n  \"sunrise\",\n  \"sunrize\",\n  { kind = \"sunset\", weekdays = [\"sat\",\n    \"Samstag\"] },\n]\n",
			nil, map[string]int{"feeds[0].kinds[1]": 11, "feeds[0].kinds[2].weekdays[1]": 13}},
		{"yaml", "service:\n  listen: \":8080\"\nsites:\n  - {id: a, latitude: 95, longitude: 9, timezone: UTC}\nfeeds:\n  - {id: f, site: a, kinds: [sunrise]}\n",
			map[string]string{"HELIOCAL_LISTEN": "nowhere"}, map[string]int{"service.listen": 0, "sites[0].latitude": 4}},
	} {
		_, err := ParseEnv(strings.NewReader(tc.in), tc.format, func(k string) (string, bool) { v, ok := tc.env[k]; return v, ok })
		got := problemsByPath(t, err)
		for path, line := range tc.want {
			if p, ok := got[path]; !ok || p.Line != line {
				t.Errorf("%s: %s on line %d (found: %v), want line %d\n%v", tc.format, path, p.Line, ok, line, err)
			}
		}
	}
	var ve *ValidationError
	_, err := Parse(strings.NewReader("sites:\n  - {id: a, latitude: 95, longitude: 9, timezone: UTC}\n"), "yaml")
	if !errors.As(err, &ve) {
		t.Fatalf("%v", err)
	}
	ve.Source = "farm.yaml"
	if want := "farm.yaml:2: sites[0].latitude: 95: must be within -90..90"; !strings.HasPrefix(ve.Error(), want) {
		t.Errorf("%s\nwant it to begin %s", ve, want)
	}
}

// A file that is not UTF-8 (saved as Latin-1: "café" as caf\xe9) is
// refused naming the line and the byte, in every format, not with the
// decoders' "incomplete UTF-8 octet sequence" without a line.
func TestNotUTF8(t *testing.T) {
	for format, in := range map[string]string{
		"yaml": "sites:\n  - id: a\n    name: Caf\xe9 du Nord\n",
		"toml": "[[sites]]\nid = \"a\"\nname = \"Caf\xe9 du Nord\"\n",
		"json": "{\"sites\": [{\"id\": \"a\",\n\"name\": \"Caf\xe9 du Nord\"}]}",
	} {
		_, err := Parse(strings.NewReader(in), format)
		want := "cannot read the file as " + format + ": line 3: the byte 0xE9 is not UTF-8 text, which a configuration is written in (save the file as UTF-8)"
		if format == "json" {
			want = strings.Replace(want, "line 3", "line 2", 1)
		}
		if !errors.Is(err, ErrUnreadable) || err.Error() != want {
			t.Errorf("%s: %v\nwant %s", format, err, want)
		}
	}
}

// A number where text belongs is named as it is written, not as the number
// the decoder made of it: 1e3, not 1000; 0x1F, not 31.
func TestNumberNamedAsWritten(t *testing.T) {
	for _, v := range []string{"1e3", "0x1F", ".5", "-7"} {
		_, err := Parse(strings.NewReader("sites:\n  - {id: a, name: "+v+", latitude: 1, longitude: 2, timezone: UTC}\nfeeds:\n  - {id: f, site: a, kinds: [sunrise]}\n"), "yaml")
		ps := problemsOf(t, err)
		if len(ps) != 1 || ps[0].Path != "sites[0].name" || ps[0].Value != v || ps[0].Msg != "must be text, not a number" {
			t.Errorf("name %s: %v", v, err)
		}
	}
}

// A TOML table named near a list of tables, [site] for [[sites]], is told
// the header to write in two brackets: the key's name alone, [sites],
// would be a table where a list belongs. A value of that name is told the
// key only.
func TestTOMLTableNearList(t *testing.T) {
	const site = "[[sites]]\nid = \"a\"\nlatitude = 1\nlongitude = 1\n"
	for in, want := range map[string]string{
		"[site]\nid = \"a\"\nlatitude = 1\nlongitude = 1\n":                                                `site: unknown key (did you mean [[sites]]? in TOML each entry of the list begins with [[sites]], in two brackets)`,
		site + "[[feeds]]\nid = \"f\"\nsite = \"a\"\nkinds = [\"sunrise\"]\n[feeds.plan]\ntitle = \"x\"\n": `feeds[0].plan: unknown key (did you mean [[feeds.plans]]? in TOML each entry of the list begins with [[feeds.plans]], in two brackets)`,
		site + "[[feeds]]\nid = \"f\"\nsite = \"a\"\nkind = [\"sunrise\"]\n":                               `feeds[0].kind: unknown key (did you mean "kinds"?)`,
	} {
		_, err := Parse(strings.NewReader(in), "toml")
		var found bool
		for _, p := range problemLines(t, err) {
			found = found || p == want
		}
		if !found {
			t.Errorf("%q:\n%v\nwant the problem\n%s", in, err, want)
		}
	}
}
