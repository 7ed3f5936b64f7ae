package config

import (
	"bytes"
	"encoding/json"
	"fmt"
	"strconv"
	"strings"
	"time"

	"github.com/pelletier/go-toml/v2/unstable"
	"go.yaml.in/yaml/v3"
)

// duplicateKeys finds keys written twice in one mapping of a document,
// ignoring case as the configuration does ("latitude" and "Latitude" are
// one key). The decoders keep the last one silently, so each is a problem
// naming both places. Input that does not parse is left to the decoder,
// which words the syntax error. It also returns the YAML document it
// parsed (nil for the other formats and for input that does not parse),
// so that readConfig decodes it without parsing the text again: parsing
// is most of the work of reading a large YAML configuration.
func duplicateKeys(data []byte, format string) (problems []FieldError, doc *yaml.Node, places map[string]keyPlace) {
	defer func() {
		if recover() != nil {
			problems, doc, places = nil, nil, nil // hostile input: the decoder reports it
		}
	}()
	d := &dupFinder{seen: map[string]keyPlace{}, dups: map[string]bool{}}
	switch format {
	case "json":
		d.json(data)
	case "yaml":
		d.yaml(data)
	case "toml":
		d.toml(data)
	}
	return d.problems, d.doc, d.seen
}

type keyPlace struct {
	written   string // the key as written
	line, col int    // 1-based
}

func (k keyPlace) String() string {
	return fmt.Sprintf("line %d, column %d (%q)", k.line, k.col, k.written)
}

type dupFinder struct {
	// seen is where each key is first written, by path with lower-case
	// keys; each item of a list too
	// ("feeds[0].kinds[2]"), which a problem's line is then read from
	seen     map[string]keyPlace
	dups     map[string]bool // paths reported
	problems []FieldError

	// TOML: the lines [from, to) of each repeated key = value or table
	// (1-based), and whether a duplicate lies within an inline table,
	// which whole lines cannot remove
	dropLines   [][2]int
	inlineTable bool

	// YAML: the document parsed, when it parsed as one
	doc *yaml.Node
}

// underDuplicate reports whether path or one of its ancestors is a
// reported duplicate.
func (d *dupFinder) underDuplicate(path string) bool {
	for path != "" {
		if d.dups[path] {
			return true
		}
		i := strings.LastIndexAny(path, ".[")
		if i < 0 {
			return false
		}
		path = path[:i]
	}
	return false
}

// key records a key of the mapping at parent and returns its path.
func (d *dupFinder) key(parent, written string, line, col int) string {
	path := strings.ToLower(written)
	if path == "" {
		path = `""` // an empty key (YAML's "&a:", JSON's "") still needs a name
	}
	if parent != "" {
		path = parent + "." + path
	}
	here := keyPlace{written, line, col}
	if d.underDuplicate(parent) {
		return path // the enclosing mapping is already reported
	}
	if first, dup := d.seen[path]; dup {
		d.dups[path] = true
		d.problems = append(d.problems, FieldError{Path: path,
			Msg:  fmt.Sprintf("duplicate key: written at %s and at %s; keys ignore case, only one may be given", first, here),
			Hint: "keep one of them"})
	} else {
		d.seen[path] = here
	}
	return path
}

func index(parent string, i int) string { return fmt.Sprintf("%s[%d]", parent, i) }

func (d *dupFinder) json(data []byte) {
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.UseNumber()
	lines := lineCursor{data: data, line: 1}
	var walk func(path string) bool
	walk = func(path string) bool {
		tok, err := dec.Token()
		if err != nil {
			return false
		}
		switch tok {
		case json.Delim('{'):
			for dec.More() {
				kt, err := dec.Token()
				if err != nil {
					return false
				}
				k, _ := kt.(string)
				end := int(dec.InputOffset()) // just after the key's closing quote
				line, start := lines.at(end)
				col := end - start + 1 - len(strconv.Quote(k)) // the opening quote, for plain keys
				if !walk(d.key(path, k, line, max(col, 1))) {
					return false
				}
			}
		case json.Delim('['):
			for i := 0; dec.More(); i++ {
				item := index(path, i)
				// the item's first character: past the end of the token
				// before it, its comma and the white space around it
				at := int(dec.InputOffset())
				for at < len(data) && bytes.IndexByte([]byte(" \t\r\n,"), data[at]) >= 0 {
					at++
				}
				line, start := lines.at(at)
				d.seen[item] = keyPlace{line: line, col: at - start + 1}
				if !walk(item) {
					return false
				}
			}
		default:
			return true
		}
		_, err = dec.Token() // the closing delimiter
		return err == nil
	}
	walk("")
}

// lineCursor gives the line of offsets into data taken in increasing
// order, as a decoder reads them, counting each line break once: the
// count from the start for every key and item was quadratic in the size
// of the file.
type lineCursor struct {
	data  []byte
	off   int // the offset the line breaks are counted up to
	line  int // the line of off, from 1
	start int // the offset of that line's first byte
}

// at is the line of the byte at offset off of data (from 1) and the
// offset of that line's first byte.
func (c *lineCursor) at(off int) (line, start int) {
	if off < c.off { // back: counted again from the start
		c.off, c.line, c.start = 0, 1, 0
	}
	for {
		i := bytes.IndexByte(c.data[c.off:off], '\n')
		if i < 0 {
			break
		}
		c.line++
		c.start = c.off + i + 1
		c.off = c.start
	}
	c.off = off
	return c.line, c.start
}

func (d *dupFinder) yaml(data []byte) {
	var doc yaml.Node
	if yaml.Unmarshal(data, &doc) != nil {
		return
	}
	if doc.Kind == yaml.DocumentNode {
		d.doc = &doc
	}
	var walk func(n *yaml.Node, path string)
	walk = func(n *yaml.Node, path string) {
		switch n.Kind {
		case yaml.DocumentNode:
			for _, c := range n.Content {
				walk(c, path)
			}
		case yaml.MappingNode:
			for i := 0; i+1 < len(n.Content); i += 2 {
				k := n.Content[i]
				walk(n.Content[i+1], d.key(path, k.Value, k.Line, k.Column))
			}
		case yaml.SequenceNode:
			for i, c := range n.Content {
				item := index(path, i)
				d.seen[item] = keyPlace{line: c.Line, col: c.Column}
				walk(c, item)
			}
		case yaml.ScalarNode:
			keepDateAsWritten(n)
			keepDecimal(n)
		}
	}
	walk(&doc, "")
}

// keepDateAsWritten makes text of a plain YAML scalar that YAML 1.1 reads
// as a timestamp whose date has a one-digit month or day ("2027-6-12",
// "2027-06-1"): the decoder would turn it into 2027-06-12 and the file
// would be read as it is not written. As text it is checked as TOML and
// JSON give it, and refused as every date not written YYYY-MM-DD is.
func keepDateAsWritten(n *yaml.Node) {
	if n.Kind != yaml.ScalarNode || n.Tag != "!!timestamp" || n.Style&yaml.TaggedStyle != 0 {
		return
	}
	date := n.Value
	if i := strings.IndexAny(date, "Tt "); i >= 0 {
		date = date[:i] // the time of "2027-6-12T10:00:00Z"
	}
	if len(date) != len(time.DateOnly) {
		n.Tag = "!!str"
	}
}

// keepDecimal makes the number of a plain YAML scalar written with a
// leading zero (elevation: 0420, latest_off: 0530) the decimal number
// written, 420, as YAML 1.2 reads it (yaml.org/spec/1.2.2, 10.3.2 "Tag
// Resolution": octal is written 0o…): the decoder reads it as YAML 1.1's
// octal, 272, and the file would be read as it is not written (a clock
// time's hint would be "03:44" for 0530, not "05:30"). TOML and JSON
// refuse such numbers; the document then decodes otherwise than the text,
// as for keepDateAsWritten.
func keepDecimal(n *yaml.Node) {
	v := n.Value
	if n.Kind != yaml.ScalarNode || n.Tag != "!!int" || n.Style != 0 {
		return
	}
	sign := ""
	if v != "" && (v[0] == '-' || v[0] == '+') {
		sign, v = v[:1], v[1:]
	}
	if len(v) < 2 || v[0] != '0' {
		return
	}
	for _, c := range v {
		if c < '0' || c > '7' {
			return // 0930 is read as decimal already; 0o530 is octal as written
		}
	}
	if v = strings.TrimLeft(v, "0"); v == "" {
		v = "0"
	}
	n.Value = sign + v
}

func (d *dupFinder) toml(data []byte) {
	p := unstable.Parser{}
	p.Reset(data)
	tables := map[string]int{} // arrays of tables: elements so far
	// resolve turns a dotted key into the path of its parent and its last
	// key, entering the last element of each array of tables on the way, as
	// TOML does.
	resolve := func(base string, it unstable.Iterator) (parent string, last *unstable.Node) {
		path := base
		for it.Next() {
			k := it.Node()
			last = k
			if it.IsLast() {
				return path, last
			}
			seg := strings.ToLower(string(k.Data))
			if path != "" {
				path += "." + seg
			} else {
				path = seg
			}
			if n, ok := tables[path]; ok {
				path = index(path, n-1)
			}
		}
		return path, last
	}
	// at is the line and column (from 1, in bytes) where r begins: the
	// parser's Shape counts the lines from the start of data again for
	// each, and its end's too
	lines := lineCursor{data: data, line: 1}
	at := func(r unstable.Range) (line, col int) {
		line, start := lines.at(int(r.Offset))
		return line, int(r.Offset) - start + 1
	}
	key := func(parent string, k *unstable.Node) string {
		line, col := at(k.Raw)
		return d.key(parent, string(k.Data), line, col)
	}
	var value func(v *unstable.Node, path string)
	value = func(v *unstable.Node, path string) {
		switch v.Kind {
		case unstable.InlineTable:
			for it := v.Children(); it.Next(); {
				kv := it.Node()
				parent, k := resolve(path, kv.Key())
				n := len(d.problems)
				value(kv.Value(), key(parent, k))
				d.inlineTable = d.inlineTable || len(d.problems) > n
			}
		case unstable.Array:
			i := 0
			for it := v.Children(); it.Next(); i++ {
				item := index(path, i)
				if n := it.Node(); n.Raw.Length > 0 { // a value written as text: a string, a number
					line, col := at(n.Raw)
					d.seen[item] = keyPlace{line: line, col: col}
				}
				value(it.Node(), item)
			}
		}
	}
	current := ""
	open := -1 // the index in dropLines of a repeated table still running
	for p.NextExpression() {
		e := p.Expression()
		line := 0
		if it := e.Key(); it.Next() {
			line, _ = at(it.Node().Raw)
		}
		if n := len(d.dropLines); n > 0 && d.dropLines[n-1][1] == 0 && (n-1 != open || e.Kind != unstable.KeyValue) {
			d.dropLines[n-1][1] = line // the repeated expression ends where the next begins
			if n-1 == open {
				open = -1
			}
		}
		n := len(d.problems)
		switch e.Kind {
		case unstable.Table:
			parent, k := resolve("", e.Key())
			current = key(parent, k)
			if len(d.problems) > n {
				d.dropLines = append(d.dropLines, [2]int{line, 0})
				open = len(d.dropLines) - 1
			}
		case unstable.ArrayTable:
			parent, k := resolve("", e.Key())
			path := strings.ToLower(string(k.Data))
			if parent != "" {
				path = parent + "." + path
			}
			if first, written := d.seen[path]; written && !d.underDuplicate(parent) || d.dups[path] {
				// kinds = [...] and then [[feeds.kinds]]: the tables are
				// dropped, the list kept
				if !d.dups[path] {
					d.dups[path] = true
					d.problems = append(d.problems, listThenTables(data, path, first, tableName(e.Key()), line))
				}
				d.dropLines = append(d.dropLines, [2]int{line, 0})
				open = len(d.dropLines) - 1
			}
			tables[path]++
			current = index(path, tables[path]-1)
		case unstable.KeyValue:
			parent, k := resolve(current, e.Key())
			kp := key(parent, k)
			if len(d.problems) > n && open < 0 {
				d.dropLines = append(d.dropLines, [2]int{line, 0})
			}
			value(e.Value(), kp)
		}
	}
}

// tableName is the name of a TOML table header as written, "feeds.kinds".
func tableName(it unstable.Iterator) string {
	var parts []string
	for it.Next() {
		parts = append(parts, string(it.Node().Data))
	}
	return strings.Join(parts, ".")
}

// listThenTables is the problem of a key written as a value (first, e.g.
// kinds = ["sunrise"]) and then as an array of tables ([[feeds.kinds]] at
// line), which TOML refuses without saying where: it names both lines and
// shows the two ways of writing the list.
func listThenTables(data []byte, path string, first keyPlace, name string, line int) FieldError {
	written := first.written
	if l, ok := lineAt(data, first.line); ok {
		written = string(bytes.TrimSpace(l)) // kinds = ["sunrise"]
		if strings.Count(written, "[") > strings.Count(written, "]") {
			written += " …]" // a list over several lines
		}
	}
	msg := fmt.Sprintf("written twice: as %s at line %d and as [[%s]] at line %d", written, first.line, name, line)
	hint := fmt.Sprintf("write all of it one way: in the list, or each entry as a table [[%s]]", name)
	if strings.HasSuffix(path, ".kinds") {
		hint = fmt.Sprintf(`write the kinds one way: all in the list, kinds = ["sunrise", "sunset"], or each as a table, [[%s]] with kind = "sunrise" and its options on the lines below it`, name)
	}
	return FieldError{Path: path, Msg: msg, Hint: hint}
}

// tomlWithoutDuplicates blanks the lines of each repeated key = value and
// of each repeated table with its keys, keeping the first, so that the rest
// of the document can be decoded; the lines keep their numbers. A document
// with a duplicate inside an inline table is returned unchanged.
func tomlWithoutDuplicates(data []byte) (out []byte) {
	defer func() {
		if recover() != nil {
			out = data
		}
	}()
	d := &dupFinder{seen: map[string]keyPlace{}, dups: map[string]bool{}}
	d.toml(data)
	if d.inlineTable || len(d.dropLines) == 0 {
		return data
	}
	lines := bytes.SplitAfter(data, []byte("\n"))
	for _, r := range d.dropLines {
		to := r[1]
		if to == 0 {
			to = len(lines) + 1
		}
		for l := r[0]; l < to && l <= len(lines); l++ {
			if l >= 1 && bytes.HasSuffix(lines[l-1], []byte("\n")) {
				lines[l-1] = []byte("\n") // the line break keeps the numbering
			} else if l >= 1 {
				lines[l-1] = nil
			}
		}
	}
	return bytes.Join(lines, nil)
}

// withoutDuplicates rewrites a YAML or JSON document keeping only the first
// of each set of keys that differ at most in case, so that the rest of the
// document can still be decoded and checked once its duplicates are
// reported. It returns the document to decode and its format; a document
// it cannot rewrite is returned unchanged.
func withoutDuplicates(data []byte, format string) ([]byte, string) {
	if format == "toml" {
		return tomlWithoutDuplicates(data), format
	}
	if format != "yaml" && format != "json" {
		return data, format
	}
	var doc yaml.Node
	if yaml.Unmarshal(data, &doc) != nil {
		return data, format
	}
	var strip func(n *yaml.Node)
	strip = func(n *yaml.Node) {
		keepDateAsWritten(n)
		if n.Kind == yaml.MappingNode {
			seen := map[string]bool{}
			kept := n.Content[:0]
			for i := 0; i+1 < len(n.Content); i += 2 {
				k := strings.ToLower(n.Content[i].Value)
				if seen[k] {
					continue
				}
				seen[k] = true
				kept = append(kept, n.Content[i], n.Content[i+1])
			}
			n.Content = kept
		}
		for _, c := range n.Content {
			strip(c)
		}
	}
	strip(&doc)
	out, err := yaml.Marshal(&doc)
	if err != nil {
		return data, format
	}
	return out, "yaml"
}
