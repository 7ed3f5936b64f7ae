package config

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"github.com/spf13/viper"
)

// A key written twice in one mapping, in any case, is refused with both
// places; the decoders would silently keep the last one.
func TestDuplicateKeysRefused(t *testing.T) {
	const feeds = "feeds:\n  - id: f\n    site: a\n    kinds: [sunrise]\n"
	for _, tc := range []struct {
		name, format, doc, path, first, second string
	}{
		{"json same key", "json", `{"sites":[{"id":"a","latitude":47.5,
"latitude":10,"longitude":9.7,"timezone":"UTC"}],"feeds":[{"id":"f","site":"a","kinds":["sunrise"]}]}`,
			"sites[0].latitude", `line 1, column 21 ("latitude")`, `line 2, column 1 ("latitude")`},
		{"json other case", "json", `{"Service":{"listen":":8080"},"service":{"listen":":9090"},"sites":[{"id":"a","latitude":1,"longitude":2}],"feeds":[{"id":"f","site":"a","kinds":["sunrise"]}]}`,
			"service", `line 1, column 2 ("Service")`, `line 1, column 31 ("service")`},
		{"yaml other case", "yaml", "sites:\n  - id: a\n    latitude: 47.5\n    longitude: 9.7\n    Latitude: 10\n" + feeds,
			"sites[0].latitude", `line 3, column 5 ("latitude")`, `line 5, column 5 ("Latitude")`},
		{"yaml same key", "yaml", "sites:\n  - id: a\n    latitude: 47.5\n    longitude: 9.7\n    latitude: 10\n" + feeds,
			"sites[0].latitude", `line 3, column 5 ("latitude")`, `line 5, column 5 ("latitude")`},
		{"yaml second item", "yaml", "sites:\n  - {id: a, latitude: 1, longitude: 2}\n  - id: b\n    latitude: 1\n    longitude: 2\n    ID: c\n" + feeds,
			"sites[1].id", `line 3, column 5 ("id")`, `line 6, column 5 ("ID")`},
		{"toml other case", "toml", "[[sites]]\nid = \"a\"\nlatitude = 47.5\nlongitude = 9.7\nLatitude = 10\n[[feeds]]\nid = \"f\"\nsite = \"a\"\nkinds = [\"sunrise\"]\n",
			"sites[0].latitude", `line 3, column 1 ("latitude")`, `line 5, column 1 ("Latitude")`},
		{"toml same key", "toml", "[[sites]]\nid = \"a\"\nlatitude = 47.5\nlongitude = 9.7\nlatitude = 10\n[[feeds]]\nid = \"f\"\nsite = \"a\"\nkinds = [\"sunrise\"]\n",
			"sites[0].latitude", `line 3, column 1 ("latitude")`, `line 5, column 1 ("latitude")`},
		{"toml same table", "toml", "[service]\nlisten = \":8080\"\n[service]\nout_dir = \"x\"\n[[sites]]\nid = \"a\"\nlatitude = 1\nlongitude = 2\n",
			"service", `line 1, column 2 ("service")`, `line 3, column 2 ("service")`},
		{"toml second table", "toml", "[[sites]]\nid = \"a\"\nlatitude = 1\nlongitude = 2\n[[sites]]\nid = \"b\"\nlatitude = 1\nLONGITUDE = 2\nlongitude = 3\n[[feeds]]\nid = \"f\"\nsite = \"a\"\nkinds = [\"sunrise\"]\n",
			"sites[1].longitude", `line 8, column 1 ("LONGITUDE")`, `line 9, column 1 ("longitude")`},
		{"toml table headers", "toml", "[service]\nlisten = \":8080\"\n[Service]\nout_dir = \"x\"\n[[sites]]\nid = \"a\"\nlatitude = 1\nlongitude = 2\n",
			"service", `line 1, column 2 ("service")`, `line 3, column 2 ("Service")`},
		{"toml inline table", "toml", "[[sites]]\nid = \"a\"\nlatitude = 1\nlongitude = 2\n[[feeds]]\nid = \"f\"\nsite = \"a\"\nkinds = [{kind = \"sunrise\", Kind = \"sunset\"}]\n",
			"feeds[0].kinds[0].kind", `line 8, column 11 ("kind")`, `line 8, column 29 ("Kind")`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Parse(strings.NewReader(tc.doc), tc.format)
			ps := problemsOf(t, err)
			if len(ps) != 1 {
				t.Fatalf("%d problems, want 1: %v", len(ps), err)
			}
			p := ps[0]
			if p.Path != tc.path || !strings.Contains(p.Msg, "duplicate key") || !strings.Contains(p.Msg, tc.first) || !strings.Contains(p.Msg, tc.second) {
				t.Errorf("got %v\nwant %s: duplicate key at %s and %s", p, tc.path, tc.first, tc.second)
			}
		})
	}
}

// The same key in different mappings is no duplicate: every site has an id.
func TestDuplicateKeysOnlyWithinOneMapping(t *testing.T) {
	for _, format := range []string{"yaml", "json", "toml"} {
		if dups, _, _ := duplicateKeys(demoIn(t, format), format); len(dups) != 0 {
			t.Errorf("%s: %v", format, dups)
		}
	}
}

func demoIn(t *testing.T, format string) []byte {
	t.Helper()
	switch format {
	case "yaml":
		return DemoYAML()
	case "json":
		return []byte(`{"sites":[{"id":"a","latitude":1,"longitude":2},{"id":"b","latitude":1,"longitude":2}],
"feeds":[{"id":"f","site":"a","kinds":["sunrise",{"kind":"sunset","offset":"-30m"}]},{"id":"g","site":"b","kinds":[{"kind":"sunset"}]}]}`)
	}
	return []byte("[service]\nlisten = \":8080\"\n[[sites]]\nid = \"a\"\nlatitude = 1\nlongitude = 2\n[[sites]]\nid = \"b\"\nlatitude = 1\nlongitude = 2\n" +
		"[[feeds]]\nid = \"f\"\nsite = \"a\"\n[[feeds.kinds]]\nkind = \"sunrise\"\n[[feeds.kinds]]\nkind = \"sunset\"\n[[feeds]]\nid = \"g\"\nsite = \"b\"\n[[feeds.kinds]]\nkind = \"sunrise\"\n")
}

// A duplicate key does not hide the other problems of the document: all are
// listed at once, the duplicate among them.
func TestDuplicateKeysListedWithOtherProblems(t *testing.T) {
	for _, tc := range []struct{ format, doc string }{
		{"yaml", "sites:\n  - id: a\n    latitude: 47.5\n    Latitude: 10\n    longitude: 500\n    timezone: Mars/Base\nfeeds:\n  - id: f\n    site: nowhere\n    kinds: [sunrise]\n"},
		{"yaml", "sites:\n  - id: a\n    latitude: 47.5\n    latitude: 10\n    longitude: 500\n    timezone: Mars/Base\nfeeds:\n  - id: f\n    site: nowhere\n    kinds: [sunrise]\n"},
		{"json", `{"sites":[{"id":"a","latitude":47.5,"latitude":10,"longitude":500,"timezone":"Mars/Base"}],"feeds":[{"id":"f","site":"nowhere","kinds":["sunrise"]}]}`},
		{"toml", "[[sites]]\nid = \"a\"\nlatitude = 47.5\nLatitude = 10\nlongitude = 500\ntimezone = \"Mars/Base\"\n[[feeds]]\nid = \"f\"\nsite = \"nowhere\"\nkinds = [\"sunrise\"]\n"},
		// the same key exactly, which the TOML decoder itself refuses
		{"toml", "[[sites]]\nid = \"a\"\nlatitude = 47.5\nlatitude = [\n  10,\n]\nlongitude = 500\ntimezone = \"Mars/Base\"\n[[feeds]]\nid = \"f\"\nsite = \"nowhere\"\nkinds = [\"sunrise\"]\n"},
		// a table written twice: its second section is set aside with it
		{"toml", "[service]\nlisten = \":8080\"\n[service]\nout_dir = \"x\"\nlisten = 5\n[[sites]]\nid = \"a\"\nlatitude = 47.5\nlatitude = 10\nlongitude = 500\ntimezone = \"Mars/Base\"\n[[feeds]]\nid = \"f\"\nsite = \"nowhere\"\nkinds = [\"sunrise\"]\n"},
	} {
		_, err := Parse(strings.NewReader(tc.doc), tc.format)
		ps := problemsOf(t, err)
		want := map[string]bool{"sites[0].latitude": false, "sites[0].longitude": false, "sites[0].timezone": false, "feeds[0].site": false}
		for _, p := range ps {
			if _, ok := want[p.Path]; ok {
				want[p.Path] = true
			}
			if p.Path == "sites[0].latitude" && !strings.Contains(p.Msg, "duplicate key") {
				t.Errorf("%s: latitude problem is not the duplicate: %v", tc.format, p)
			}
		}
		for path, seen := range want {
			if !seen {
				t.Errorf("%s: no problem at %s in %v", tc.format, path, err)
			}
		}
	}
}

// TestReadConfigFromDocument: a YAML configuration decoded from the
// document duplicateKeys parsed gives viper the settings, and the
// error, that reading its text does, for the demo and every YAML file of
// testdata/config (syntax errors, hostile shapes and mistakes included).
func TestReadConfigFromDocument(t *testing.T) {
	files, err := filepath.Glob("../testdata/config/*.yaml")
	if err != nil || len(files) == 0 {
		t.Fatalf("no YAML configurations: %v", err)
	}
	inputs := map[string][]byte{"demo": DemoYAML(), "empty": nil, "list": []byte("- a\n- b\n"), "scalar": []byte("12\n")}
	for _, f := range files {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		inputs[filepath.Base(f)] = b
	}
	fromDoc := 0
	for name, data := range inputs {
		_, doc, _ := duplicateKeys(data, "yaml")
		if doc != nil {
			fromDoc++
		} else if name == "demo" {
			t.Errorf("the demo's document was not kept")
		}
		text, parsed := viper.New(), viper.New()
		text.SetConfigType("yaml")
		parsed.SetConfigType("yaml")
		errText, errDoc := readConfig(text, data, nil), readConfig(parsed, data, doc)
		if fmt.Sprint(errText) != fmt.Sprint(errDoc) {
			t.Errorf("%s: error %v from the document, %v from the text", name, errDoc, errText)
		}
		if !reflect.DeepEqual(text.AllSettings(), parsed.AllSettings()) {
			t.Errorf("%s: settings from the document differ from the text's:\n%v\n%v", name, parsed.AllSettings(), text.AllSettings())
		}
	}
	if fromDoc == len(inputs) {
		t.Errorf("every input parsed: the test does not reach the text's own error")
	}
}

// A TOML feed whose kinds are written as a list and then as [[feeds.kinds]]
// tables, which the TOML decoder refuses without a line ("key value already
// exists as a kinds, but should be an array table"), is told where each is
// and how to write the kinds one way, as YAML names both places of a key
// written twice; the list is kept, the tables set aside, and the rest of
// the document checked as usual (the second feed's unknown site).
func TestTOMLKindsListThenTables(t *testing.T) {
	doc := `[[sites]]
id = "a"
latitude = 47.5
longitude = 9.7
timezone = "Europe/Zurich"

[[feeds]]
id = "f"
site = "a"
kinds = ["sunrise", "sunset"]

[[feeds.kinds]]
kind = "civil-dawn"
offset = "-30m"

[[feeds.kinds]]
kind = "civil-dusk"

[[feeds]]
id = "g"
site = "nowhere"
kinds = [
  "sunrise",
]
[[feeds.kinds]]
kind = "sunset"
`
	_, err := Parse(strings.NewReader(doc), "toml")
	ps := problemsOf(t, err)
	want := []string{
		`feeds[0].kinds: written twice: as kinds = ["sunrise", "sunset"] at line 10 and as [[feeds.kinds]] at line 12 (write the kinds one way: all in the list, kinds = ["sunrise", "sunset"], or each as a table, [[feeds.kinds]] with kind = "sunrise" and its options on the lines below it)`,
		`feeds[1].kinds: written twice: as kinds = [ …] at line 22 and as [[feeds.kinds]] at line 25 (write the kinds one way: all in the list, kinds = ["sunrise", "sunset"], or each as a table, [[feeds.kinds]] with kind = "sunrise" and its options on the lines below it)`,
	}
	var got []string
	site := false
	for _, p := range ps {
		if strings.HasSuffix(p.Path, ".kinds") {
			got = append(got, p.Error())
		}
		site = site || p.Path == "feeds[1].site"
	}
	if strings.Join(got, "\n") != strings.Join(want, "\n") || !site {
		t.Errorf("problems:\n%v\nwant among them:\n%s\nand feeds[1].site", err, strings.Join(want, "\n"))
	}
}

// A clock time written in YAML as a number with a leading zero is told the
// time written: YAML 1.1, which the decoder follows there, reads 0530 as
// octal, 344 ("03:44"), and 0700 as 448 ("04:48"); YAML 1.2 (yaml.org/spec/
// 1.2.2, 10.3.2 "Tag Resolution": octal is 0o…) reads them as 530 and 700.
// Either way the value is shown as written, 0530. Written in quotes, "0530"
// is text and not a clock time, told the same.
func TestClockWrittenWithLeadingZero(t *testing.T) {
	const head = "sites:\n  - {id: a, latitude: 47.5, longitude: 9.7, timezone: Europe/Zurich}\nfeeds:\n  - id: f\n    site: a\n"
	for in, want := range map[string]string{
		"    kinds:\n      - kind: lighting:16h\n        earliest_on: 0530\n":          `feeds[0].kinds[0].earliest_on: 0530: must be text, not a number (write it "05:30")`,
		"    plans:\n      - title: x\n        date: every day\n        start: 0700\n": `feeds[0].plans[0].start: 0700: must be text, not a number (write it "07:00")`,
	} {
		_, err := Parse(strings.NewReader(head+in), "yaml")
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("%q: %v\nwant %q", in, err, want)
		}
	}
	// the digits in quotes are text, not a clock time either
	for in, want := range map[string]string{
		"    kinds:\n      - kind: lighting:16h\n        earliest_on: \"0530\"\n":          `feeds[0].kinds[0].earliest_on: 0530: not a clock time (write it "05:30")`,
		"    plans:\n      - title: x\n        date: every day\n        start: \"930\"\n":  `feeds[0].plans[0].start: 930: not a clock time (write it "09:30")`,
		"    plans:\n      - title: x\n        date: every day\n        start: \"2460\"\n": `feeds[0].plans[0].start: 2460: not a clock time (write HH:MM (00:00..23:59), e.g. "20:00")`,
	} {
		_, err := Parse(strings.NewReader(head+in), "yaml")
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("%q: %v\nwant %q", in, err, want)
		}
	}
}

// Any number written in YAML with a leading zero is the decimal number
// written, as YAML 1.2 reads it (yaml.org/spec/1.2.2, 10.3.2 "Tag
// Resolution": octal is written 0o…), not YAML 1.1's octal, which the
// decoder follows there: elevation 0420 is 420 m, not 272; days_ahead 0365
// is 365 days, not 245. An octal number written 0o is octal.
func TestNumberWrittenWithLeadingZero(t *testing.T) {
	const head = "sites:\n  - {id: a, latitude: 47.5, longitude: 9.7, timezone: Europe/Zurich, elevation: %s}\nfeeds:\n  - {id: f, site: a, kinds: [sunrise], days_ahead: %s}\n"
	for _, tc := range []struct {
		elevation, days string
		m               float64
		d               int
	}{
		{"0420", "0365", 420, 365},
		{"-0042", "0100", -42, 100},
		{"0o644", "0o12", 420, 10}, // 6·64 + 4·8 + 4 = 420; 1·8 + 2 = 10
		{"0", "00", 0, 0},
	} {
		c, err := Parse(strings.NewReader(fmt.Sprintf(head, tc.elevation, tc.days)), "yaml")
		if err != nil {
			t.Errorf("elevation %s, days_ahead %s: %v", tc.elevation, tc.days, err)
			continue
		}
		if c.Sites[0].Elevation != tc.m || c.Feeds[0].DaysAhead != tc.d {
			t.Errorf("elevation %s, days_ahead %s read as %v m and %d days, want %v and %d",
				tc.elevation, tc.days, c.Sites[0].Elevation, c.Feeds[0].DaysAhead, tc.m, tc.d)
		}
	}
}

// lineCursor gives the line and the line's start that counting the line
// breaks before each offset gives, for offsets taken forwards and back.
func TestLineCursor(t *testing.T) {
	data := []byte("{\n  \"sites\": [\n\n    {\"id\": \"a\"}\r\n  ]\n}")
	c := lineCursor{data: data, line: 1}
	for _, off := range []int{0, 1, 2, 5, 15, 16, 20, 33, 15, 3, len(data)} {
		line, start := c.at(off)
		wantLine := bytes.Count(data[:off], []byte("\n")) + 1
		wantStart := bytes.LastIndexByte(data[:off], '\n') + 1
		if line != wantLine || start != wantStart {
			t.Errorf("offset %d: line %d from %d, want line %d from %d", off, line, start, wantLine, wantStart)
		}
	}
}
