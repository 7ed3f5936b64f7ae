package serve

import (
	"errors"
	"fmt"
	"maps"
	"math"
	"slices"
	"strconv"
	"strings"
	"time"
	"unicode"
	"unicode/utf8"

	"heliocal/config"
)

// Bounds of the place name and the skyline of an ad-hoc query.
const (
	maxNameRunes       = 80
	maxSkylinePoints   = 72 // one every 5°
	skylineParamFormat = "azimuth:altitude points in degrees, comma-separated, azimuth from the north through the east, e.g. 0:2,90:8,180:1,270:4"
)

// tenth rounds a horizon's or skyline point's degrees to 0.1°, which is
// how an ad-hoc query keeps them (the cache key and the feed's id).
func tenth(deg float64) float64 { return math.Round(deg*10)/10 + 0 }

// parseExtras reads name, horizon, alarm and lighting.
func (q *AdhocQuery) parseExtras(get getter, lim *adhocLimits) error {
	if v, ok := get(ParamName); ok {
		name := strings.Join(strings.Fields(v), " ")
		if name == "" || utf8.RuneCountInString(name) > maxNameRunes {
			return &QueryError{Param: ParamName, Value: v, Msg: fmt.Sprintf("must be 1..%d characters", maxNameRunes)}
		}
		for _, r := range name {
			if unicode.IsControl(r) || r == utf8.RuneError {
				return &QueryError{Param: ParamName, Value: v, Msg: "contains a control character"}
			}
		}
		q.Name = name
	}
	if v, ok := get(ParamHorizon); ok {
		if strings.Contains(v, ":") {
			if err := q.parseSkyline(v); err != nil {
				return err
			}
		} else {
			h, err := parseFloat(ParamHorizon, v)
			if err != nil {
				return err
			}
			if h < config.MinHorizon || h > config.MaxHorizon {
				return &QueryError{Param: ParamHorizon, Value: v,
					Msg: fmt.Sprintf("must be within %g..%g degrees (%s)", config.MinHorizon, config.MaxHorizon, config.HorizonText)}
			}
			q.Horizon, q.HorizonSet = tenth(h), true
		}
	}
	if v, ok := get(ParamAlarm); ok {
		d, err := time.ParseDuration(strings.TrimSpace(v))
		if err != nil {
			return &QueryError{Param: ParamAlarm, Value: v, Msg: "malformed duration (" + config.DurationHint(v) + ")"}
		}
		if d < 0 || d > config.MaxAlarm {
			return &QueryError{Param: ParamAlarm, Value: v, Msg: "must be within 0..168h (the time before each event)"}
		}
		q.Alarm = d.Round(time.Minute)
	}
	if v, ok := get(ParamLighting); ok {
		d, err := time.ParseDuration(strings.TrimSpace(v))
		if err != nil || d <= 0 || d >= 24*time.Hour {
			msg := `must be a day length between 0 and 24h, e.g. "16h" or "14h30m"`
			if h, err := strconv.ParseFloat(strings.TrimSpace(v), 64); err == nil && h > 0 && h < 24 {
				msg += fmt.Sprintf(` (did you mean "%sh"?)`, strings.TrimSpace(v)) // lighting=14: hours, as the builder asks
			}
			return &QueryError{Param: ParamLighting, Value: v, Msg: msg}
		}
		k, err := lim.parseKind(config.KindLighting + ":" + config.ShortDuration(d))
		if err != nil {
			return &QueryError{Param: ParamLighting, Value: v, Msg: oneLine(err.Error())}
		}
		if len(q.Kinds) >= maxKinds {
			return &QueryError{Param: ParamLighting, Value: v, Msg: fmt.Sprintf("more than %d kinds", maxKinds)}
		}
		if !slices.Contains(q.Kinds, k) { // after the kinds asked for
			q.Kinds = append(slices.Clone(q.Kinds), k) // Kinds may be the shared default list
		}
	}
	if v, ok := get(ParamOffsets); ok {
		return q.parseOffsets(v, lim)
	}
	return nil
}

// parseOffsets reads offsets: "kind:duration" items, comma-separated. The
// duration follows the last colon (a kind may hold colons itself, as in
// sun-altitude:-6); it is read and checked as a configuration's kinds entry
// offset is.
func (q *AdhocQuery) parseOffsets(v string, lim *adhocLimits) error {
	const hint = `must be kind:duration items, e.g. "sunset:-30m,sunrise:15m"`
	q.Offsets = map[string]time.Duration{}
	for _, item := range strings.Split(v, ",") {
		item = strings.TrimSpace(item)
		i := strings.LastIndexByte(item, ':')
		if i <= 0 {
			return &QueryError{Param: ParamOffsets, Value: item, Msg: hint}
		}
		k, err := lim.parseKind(strings.TrimSpace(item[:i]))
		if err != nil {
			return &QueryError{Param: ParamOffsets, Value: item, Msg: oneLine(err.Error())}
		}
		if !slices.Contains(q.Kinds, k) {
			return &QueryError{Param: ParamOffsets, Value: item, Msg: "the kind " + k + " is not among the kinds asked for"}
		}
		if _, dup := q.Offsets[k]; dup {
			return &QueryError{Param: ParamOffsets, Value: item, Msg: "the kind " + k + " is given more than once"}
		}
		var d config.Duration
		if err := d.UnmarshalText([]byte(strings.TrimSpace(item[i+1:]))); err != nil {
			return &QueryError{Param: ParamOffsets, Value: item, Msg: oneLine(err.Error())}
		}
		kind, _ := config.ParseKind(k) // the zero Kind under another vocabulary: only the range is checked
		if msg, _ := config.OffsetProblem(kind, d.D()); msg != "" {
			return &QueryError{Param: ParamOffsets, Value: item, Msg: "offset " + msg}
		}
		if d != 0 {
			q.Offsets[k] = d.D().Round(time.Minute)
		}
	}
	if len(q.Offsets) == 0 {
		q.Offsets = nil
	}
	return nil
}

// offsetList writes Offsets in their canonical form, sorted by kind.
func (q AdhocQuery) offsetList() string {
	items := make([]string, 0, len(q.Offsets))
	for _, k := range slices.Sorted(maps.Keys(q.Offsets)) {
		items = append(items, k+":"+config.ShortDuration(q.Offsets[k]))
	}
	return strings.Join(items, ",")
}

// parseSkyline reads horizon as a skyline: azimuth:altitude points (as the
// events command's --horizon takes them, but never a file name), at most
// maxSkylinePoints, each rounded to 0.1°, checked as a site's horizon list
// is (azimuth 0..360, altitude within config.MinHorizon..MaxHorizon, one
// altitude per direction); a problem names the point ("point 2 (90:60):
// …", config.SkylineFromText).
func (q *AdhocQuery) parseSkyline(v string) error {
	if n := strings.Count(v, ",") + 1; n > maxSkylinePoints {
		return &QueryError{Param: ParamHorizon, Value: v, Msg: fmt.Sprintf("%d skyline points, at most %d (one every 5°)", n, maxSkylinePoints)}
	}
	pts, err := config.SkylineFromText(ParamHorizon, v, tenth)
	if err != nil {
		msg := err.Error()
		var fe config.FieldError
		if errors.As(err, &fe) {
			msg = fe.Msg
		}
		return &QueryError{Param: ParamHorizon, Value: v, Msg: msg + " (" + skylineParamFormat + ")"}
	}
	q.Skyline = pts
	return nil
}

// skylineText writes Skyline in its canonical form, azimuth:altitude points
// sorted by azimuth.
func (q AdhocQuery) skylineText() string {
	items := make([]string, len(q.Skyline))
	for i, p := range q.Skyline {
		items[i] = strconv.FormatFloat(p[0], 'f', -1, 64) + ":" + strconv.FormatFloat(p[1], 'f', -1, 64)
	}
	return strings.Join(items, ",")
}

// horizonWords says, for the table page's heading, the horizon the times
// are for when it is not flat: ", horizon 2°", ", skyline 0:3, 90:12, 180:1"
// (azimuth:altitude), or ", skyline of 72 points" when the list is long.
func (q AdhocQuery) horizonWords() string {
	switch {
	case len(q.Skyline) > 8:
		return fmt.Sprintf(", skyline of %d points", len(q.Skyline))
	case len(q.Skyline) > 0:
		return ", skyline " + strings.ReplaceAll(q.skylineText(), ",", ", ") + " (azimuth:altitude)"
	case q.horizonGiven():
		return ", horizon " + strconv.FormatFloat(q.Horizon, 'f', -1, 64) + "°"
	}
	return ""
}
