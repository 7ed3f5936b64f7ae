package config

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
)

// resolveHorizon reads a site's horizon key: one altitude (a number), a
// skyline as a list of [azimuth, altitude] points, or the name of a CSV
// file of such points (one "azimuth,altitude" per line; a header line and
// lines starting with # are skipped; a relative name is read from dir, the
// configuration file's directory, or the working directory when dir is
// empty). It sets Horizon or Skyline and returns the problems, whose hints
// write a key as format writes it ("yaml", "toml" or "json"; a flag's path
// begins with "--").
func (s *Site) resolveHorizon(path, dir, format string) []FieldError {
	switch v := s.HorizonValue.(type) {
	case nil:
		return nil
	case float64:
		s.Horizon, s.HorizonSet = v, true
		return nil
	case int:
		s.Horizon, s.HorizonSet = float64(v), true
		return nil
	case int64:
		s.Horizon, s.HorizonSet = float64(v), true
		return nil
	case string:
		name := v
		if dir != "" && !filepath.IsAbs(name) {
			name = filepath.Join(dir, name)
		}
		pts, lines, bad, err := readSkylineCSV(name)
		hint := `a CSV file of "azimuth,altitude" lines, e.g. "90,8"`
		if err != nil {
			if name != v {
				hint = "a relative name is read from the configuration file's directory; " + hint
			}
			if n := altitudeText(v); n != "" { // "2°", or "2" in quotes
				written := keyWritten(format, "horizon", n)
				if strings.HasPrefix(path, "--") {
					written = path + " " + n // a flag: "--horizon 2"
				}
				hint = "for one altitude, write the number alone: " + written
			}
			return []FieldError{{Path: path, Value: v, Msg: err.Error(), Hint: hint}}
		}
		s.HorizonFile = name
		for i := range bad {
			bad[i].Path, bad[i].Hint = path, hint
		}
		// a bad point is named by the file and its line, not its index
		ps := s.setSkyline(skylinePoints{path: path, pts: pts, found: bad, places: lines,
			name: func(line int) string { return fmt.Sprintf("line %d", line) }})
		for i := range ps {
			if ps[i].Path != path {
				ps[i].Msg = ps[i].Path + ": " + ps[i].Value + ": " + ps[i].Msg
			}
			ps[i].Path, ps[i].Value = path, v
		}
		return inOrder(ps)
	case []any:
		pts := make([][2]float64, 0, len(v))
		var at []int // the index in v of each point of pts
		var ps []pointProblem
		for j, e := range v {
			p, ok := pointOf(e)
			if !ok {
				ps = append(ps, pointProblem{at: j, FieldError: FieldError{Path: fmt.Sprintf("%s[%d]", path, j), Value: fmt.Sprint(e),
					Msg: "must be a pair [azimuth, altitude] of numbers", Hint: "e.g. horizon: [[0, 2.5], [90, 8], [180, 1], [270, 4]]"}})
				continue
			}
			pts, at = append(pts, p), append(at, j)
		}
		return inOrder(s.setSkyline(skylinePoints{path: path, pts: pts, found: ps, places: at,
			name: func(i int) string { return fmt.Sprintf("%s[%d]", path, i) }}))
	}
	return []FieldError{{Path: path, Value: showValue(s.HorizonValue), Msg: "must be a number, a list of [azimuth, altitude] points or a CSV file name",
		Hint: "e.g. horizon: 1.5, or horizon: [[0, 2.5], [90, 8]]"}}
}

// skylineGiven reports whether the site has a skyline, or its horizon key
// holds something other than one altitude: a list of points or a file
// name, refused with its own problems, which a "no skyline" problem would
// only contradict.
func (s *Site) skylineGiven() bool {
	switch s.HorizonValue.(type) {
	case nil, float64, int, int64:
		return len(s.Skyline) > 0
	}
	return true
}

func pointOf(e any) ([2]float64, bool) {
	l, ok := e.([]any)
	if !ok || len(l) != 2 {
		return [2]float64{}, false
	}
	var p [2]float64
	for i, x := range l {
		switch n := x.(type) {
		case float64:
			p[i] = n
		case int:
			p[i] = float64(n)
		case int64:
			p[i] = float64(n)
		default:
			return p, false
		}
	}
	return p, true
}

// pointProblem is a problem of a skyline with the place, in what the user
// wrote, of the point it names (its index in a list, its line in a file;
// -1 for the skyline as a whole): the problems are reported in that order.
type pointProblem struct {
	at int
	FieldError
}

// inOrder is the problems ps in the order of the points they name, those
// of one point in the order found.
func inOrder(ps []pointProblem) []FieldError {
	sort.SliceStable(ps, func(i, j int) bool { return ps[i].at < ps[j].at })
	out := make([]FieldError, len(ps))
	for i := range ps {
		out[i] = ps[i].FieldError
	}
	return out
}

// skylinePoints are the points of a skyline as read, with what their
// problems need: where each was written and how to name it.
type skylinePoints struct {
	path  string         // the horizon's path ("sites[0].horizon", "--horizon")
	pts   [][2]float64   // the points, [azimuth, altitude]
	found []pointProblem // the problems already found reading them (points that are not two numbers)
	// places are the place of each point in what the user wrote (its
	// index in a list, its line in a file); nil: its index in pts.
	places []int
	// name is the path of the point at a place ("line 4" of a file).
	name func(place int) string
	// show, when not nil, is the point j as the user wrote it, the value
	// of its problems; nil: "[azimuth, altitude]".
	show func(j int) string
}

// placeOf is the place of the point j in what the user wrote.
func (sp *skylinePoints) placeOf(j int) int {
	if sp.places != nil {
		return sp.places[j]
	}
	return j
}

// value is the point j as its problems show it.
func (sp *skylinePoints) value(j int) string {
	if sp.show != nil {
		return sp.show(j)
	}
	return fmt.Sprintf("[%s, %s]", ftoa(sp.pts[j][0]), ftoa(sp.pts[j][1]))
}

// setSkyline checks the points of sp (azimuth 0..360, 360 being 0,
// distinct; altitude within MinHorizon..MaxHorizon) and returns their
// problems after those found reading them. Without any it sorts the points
// and sets Skyline, with some it clears Skyline. No point and some found is
// no skyline to check, not an empty one. The problem of the point j is at
// its place, with the path name(place) and the point as value (see
// skylinePoints).
func (s *Site) setSkyline(sp skylinePoints) []pointProblem {
	if len(sp.pts) == 0 {
		s.Skyline = nil
		if len(sp.found) > 0 {
			return sp.found
		}
		return []pointProblem{{at: -1, FieldError: FieldError{Path: sp.path, Value: "[]", Msg: "an empty skyline", Hint: "give at least one [azimuth, altitude] point, or a number"}}}
	}
	seen := map[float64]int{}
	ps := sp.found
	for j, p := range sp.pts {
		place := sp.placeOf(j)
		at, value := sp.name(place), sp.value(j)
		if !(p[0] >= 0 && p[0] <= 360) {
			ps = append(ps, pointProblem{place, FieldError{Path: at, Value: value, Msg: "azimuth must be within 0..360", Hint: "degrees from the north through the east: 90 is east, 180 south"}})
			continue
		}
		if !(p[1] >= MinHorizon && p[1] <= MaxHorizon) {
			ps = append(ps, pointProblem{place, FieldError{Path: at, Value: value, Msg: fmt.Sprintf("altitude must be within %g..%g degrees", MinHorizon, MaxHorizon), Hint: "the apparent altitude of the skyline in that direction; azimuth comes first"}})
			continue
		}
		az := p[0]
		if az == 360 {
			az = 0
		}
		if k, dup := seen[az]; dup {
			msg := fmt.Sprintf("azimuth %s given twice, also at %s", ftoa(az), sp.name(sp.placeOf(k)))
			if az == 0 {
				msg += ": 0 and 360 are the same" // north, written both ways
			}
			ps = append(ps, pointProblem{place, FieldError{Path: at, Value: value, Msg: msg, Hint: "one altitude per direction"}})
			continue
		}
		seen[az] = j
		sp.pts[j][0] = az
	}
	if len(ps) > 0 {
		s.Skyline = nil
		return ps
	}
	sort.Slice(sp.pts, func(i, j int) bool { return sp.pts[i][0] < sp.pts[j][0] })
	s.Skyline = sp.pts
	return nil
}

// altitudeText is the number of a horizon written as text, as a single
// altitude is meant: "2" for "2", "2°" or "2 deg"; "" for other text (a
// file name).
func altitudeText(v string) string {
	t := strings.TrimSpace(v)
	for _, unit := range []string{"°", "degrees", "deg"} {
		t = strings.TrimSpace(strings.TrimSuffix(t, unit))
	}
	if _, err := strconv.ParseFloat(t, 64); err != nil {
		return ""
	}
	return t
}

// readSkylineCSV reads "azimuth,altitude" lines: the points and the line
// of each in the file, and a problem for each line that is not a point, at
// that line, whose message names it ("line 7: …"; Path, Value and Hint are
// the caller's). err is a file that cannot be read, or is not CSV.
func readSkylineCSV(name string) (pts [][2]float64, lines []int, bad []pointProblem, err error) {
	f, err := os.Open(name)
	if err != nil {
		if errors.Is(err, os.ErrNotExist) {
			return nil, nil, nil, fmt.Errorf("no such skyline file (looked for %s)", name)
		}
		var pe *fs.PathError
		if errors.As(err, &pe) {
			err = pe.Err
		}
		return nil, nil, nil, fmt.Errorf("cannot read the skyline file %s: %v", name, err)
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.Comment = '#'
	r.FieldsPerRecord = -1
	r.TrimLeadingSpace = true
	for first := true; ; first = false {
		rec, err := r.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, nil, nil, fmt.Errorf("not CSV: %v", err)
		}
		line, _ := r.FieldPos(0) // comments and blank lines counted
		if len(rec) != 2 {
			fields := fmt.Sprintf("%d fields", len(rec))
			if len(rec) == 1 {
				fields = "1 field"
			}
			bad = append(bad, pointProblem{line, FieldError{Msg: fmt.Sprintf("line %d: %s, want azimuth,altitude", line, fields)}})
			continue
		}
		a, err1 := strconv.ParseFloat(strings.TrimSpace(rec[0]), 64)
		b, err2 := strconv.ParseFloat(strings.TrimSpace(rec[1]), 64)
		if err1 != nil || err2 != nil {
			if first {
				continue // a header
			}
			bad = append(bad, pointProblem{line, FieldError{Msg: fmt.Sprintf("line %d: %q is not two numbers", line, strings.Join(rec, ","))}})
			continue
		}
		pts, lines = append(pts, [2]float64{a, b}), append(lines, line)
	}
	return pts, lines, bad, nil
}

// HorizonFromText reads a horizon written on a command line (flag names
// the flag, e.g. "--horizon"): one altitude ("1.5"), skyline points
// "azimuth:altitude" separated by commas ("0:2,90:8,180:1,270:4"), or the
// name of a CSV file of them, read from the working directory. It sets
// Horizon or Skyline (and HorizonFile) as the configuration's horizon key
// does, with the same checks; the error names the flag and the value.
func (s *Site) HorizonFromText(flag, v string) error {
	t := strings.TrimSpace(v)
	if x, err := strconv.ParseFloat(t, 64); err == nil {
		if !(x >= MinHorizon && x <= MaxHorizon) {
			return FieldError{Path: flag, Value: v, Msg: fmt.Sprintf("must be within %g..%g degrees", MinHorizon, MaxHorizon),
				Hint: HorizonText}
		}
		s.Horizon, s.HorizonValue, s.HorizonSet = x, x, true
		return nil
	}
	s.HorizonValue = t
	if strings.Contains(t, ":") {
		// the points' problems as an ad-hoc feed's skyline words them:
		// by their place in the list as written, "point 2 (90:60)"
		// (checked and sorted there, as resolveHorizon does a list)
		pts, err := SkylineFromText(flag, t, nil)
		if err != nil {
			return err
		}
		s.Skyline = pts
		return nil
	}
	if ps := s.resolveHorizon(flag, "", ""); len(ps) > 0 {
		return oneProblem(ps)
	}
	return nil
}

// oneProblem is the problems ps of one flag's value (each with that Path
// and Value) as one error, as a command line or a query parameter reports
// them: every problem's message, in order, joined by "; ", with the hint
// they share (none when they differ).
func oneProblem(ps []FieldError) FieldError {
	p := ps[0]
	for _, q := range ps[1:] {
		p.Msg += "; " + q.Msg
		if q.Hint != p.Hint {
			p.Hint = ""
		}
	}
	return p
}

// SkylineFromText reads skyline points written "azimuth:altitude" and
// separated by commas ("0:2,90:8,180:1,270:4"), each coordinate passed
// through round first when round is not nil (two points may then fall in
// one direction), with the checks of the configuration's horizon key. Unlike
// HorizonFromText it reads no file: for text from the network. A problem
// is a FieldError for flag and the value whose message names the point at
// fault by its place and as written, "point 2 (90:60): altitude must be
// within -5..45 degrees", and another point by its place, "also at point
// 1: …"; several points at fault are all named, one after the other
// (oneProblem). The points come back sorted by azimuth, 360 written 0.
func SkylineFromText(flag, v string, round func(float64) float64) ([][2]float64, error) {
	items := strings.Split(strings.TrimSpace(v), ",")
	point := func(j int) string { return "point " + strconv.Itoa(j+1) }
	written := func(j int) string { return strings.TrimSpace(items[j]) }
	pts := make([][2]float64, len(items))
	var bad []FieldError // points that are not two numbers: all of them
	for j, item := range items {
		p, ok := parsePoint(item)
		if !ok {
			bad = append(bad, FieldError{Path: flag, Value: v, Msg: point(j) + " (" + written(j) + "): must be azimuth:altitude, two numbers",
				Hint: "e.g. " + flag + " 0:2,90:8,180:1,270:4, in degrees, the azimuth from the north through the east"})
			continue
		}
		if round != nil {
			p = [2]float64{round(p[0]), round(p[1])}
		}
		pts[j] = p
	}
	if len(bad) > 0 {
		return nil, oneProblem(bad)
	}
	var s Site
	if ps := inOrder(s.setSkyline(skylinePoints{path: flag, pts: pts, name: point, show: written})); len(ps) > 0 {
		for i := range ps {
			if ps[i].Path != flag { // a point's problem
				ps[i].Msg = ps[i].Path + " (" + ps[i].Value + "): " + ps[i].Msg
			}
			ps[i].Path, ps[i].Value = flag, v
		}
		return nil, oneProblem(ps)
	}
	return s.Skyline, nil
}

// parsePoint reads one skyline point written "azimuth:altitude".
func parsePoint(item string) ([2]float64, bool) {
	a, b, ok := strings.Cut(strings.TrimSpace(item), ":")
	az, err1 := strconv.ParseFloat(strings.TrimSpace(a), 64)
	alt, err2 := strconv.ParseFloat(strings.TrimSpace(b), 64)
	return [2]float64{az, alt}, ok && err1 == nil && err2 == nil
}
