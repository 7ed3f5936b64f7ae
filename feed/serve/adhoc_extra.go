package serve

import (
	"fmt"
	"maps"
	"math"
	"slices"
	"strings"
	"time"
	"unicode"
	"unicode/utf8"

	"heliocal/config"
)

// Bounds of the place name of an ad-hoc query.
const maxNameRunes = 80

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
		h, err := parseFloat(ParamHorizon, v)
		if err != nil {
			return err
		}
		if h < config.MinHorizon || h > config.MaxHorizon {
			return &QueryError{Param: ParamHorizon, Value: v,
				Msg: fmt.Sprintf("must be within %g..%g degrees (the skyline's altitude; 0 for a flat horizon)", config.MinHorizon, config.MaxHorizon)}
		}
		q.Horizon = math.Round(h*10)/10 + 0
	}
	if v, ok := get(ParamAlarm); ok {
		d, err := time.ParseDuration(strings.TrimSpace(v))
		if err != nil {
			return &QueryError{Param: ParamAlarm, Value: v, Msg: `not a duration such as "15m" or "1h"`}
		}
		if d < 0 || d > config.MaxAlarm {
			return &QueryError{Param: ParamAlarm, Value: v, Msg: "must be within 0..168h (the time before each event)"}
		}
		q.Alarm = d.Round(time.Minute)
	}
	if v, ok := get(ParamLighting); ok {
		d, err := time.ParseDuration(strings.TrimSpace(v))
		if err != nil || d <= 0 || d >= 24*time.Hour {
			return &QueryError{Param: ParamLighting, Value: v, Msg: `must be a day length between 0 and 24h, e.g. "16h" or "14h30m"`}
		}
		k, err := lim.parseKind(config.KindLighting + ":" + config.ShortDuration(d))
		if err != nil {
			return &QueryError{Param: ParamLighting, Value: v, Msg: oneLine(err.Error())}
		}
		if len(q.Kinds) >= maxKinds {
			return &QueryError{Param: ParamLighting, Value: v, Msg: fmt.Sprintf("more than %d kinds", maxKinds)}
		}
		kinds := append(slices.Clone(q.Kinds), k) // Kinds may be the shared default list
		slices.Sort(kinds)
		q.Kinds = slices.Compact(kinds)
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
