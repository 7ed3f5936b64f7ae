package serve

import (
	"math"
	"net/url"
	"slices"
	"strconv"
	"strings"
	"time"

	"heliocal/config"
)

// builderFill is what the builder's form opens with when the page is asked
// for with a query, as the table's "make another" link asks for it: the
// ad-hoc parameters the form has a field for, each checked as the ad-hoc
// feed checks it. A value the feed would refuse, a kind or a shift the form
// has no box for, an unknown or repeated parameter is left out, and
// Ignored says so, naming the parameter and the value.
type builderFill struct {
	Lat, Lon, Name, Elev, Horizon, Zone string
	Alarm                               string // minutes
	Lighting                            string // hours, e.g. "14.5"
	Start                               string // YYYY-MM-DD: the server's today unless StartChosen
	// Days is the length of the table the builder's share link opens, ""
	// for the preview's seven days: a table's "make another" keeps its own
	Days string
	// StartChosen marks a start the query gave: the preview asks for it
	// even when it is the server's today (builder.js, query).
	StartChosen bool
	Ignored     []string
}

// builderParams are the ad-hoc parameters the builder has a field for, in
// the order its notes name them.
var builderParams = []string{ParamLatitude, ParamLongitude, ParamElevation, ParamZone, ParamName, ParamHorizon,
	ParamKinds, ParamLighting, ParamOffsets, ParamAlarm, ParamStart, ParamDays}

// builderFill reads the query raw of the builder's page (see builderFill),
// today being the server's date; groups are the page's kinds, ticked and
// shifted as the query asks (kindGroups, unchanged, when it names none the
// builder has a box for).
func (s *Server) builderFill(raw, today string) (builderFill, []kindGroup) {
	r := filler{f: builderFill{Elev: "0", Alarm: "0", Start: today}, lim: *s.limits}
	if raw == "" {
		return r.f, kindGroups
	}
	if len(raw) > maxQueryLength {
		r.ignore("", "", "the link's query is longer than "+strconv.Itoa(maxQueryLength)+" bytes: none of it is used")
		return r.f, kindGroups
	}
	// the pairs that parse are kept when some do not
	var err error
	if r.vals, err = url.ParseQuery(raw); err != nil {
		r.ignore("", "", "a part of the link's query is malformed and left out: "+quoteValue(raw))
	}
	for _, p := range append(slices.Clone(builderParams), ParamUTC) {
		if len(r.vals[p]) > 1 {
			r.ignore(p, strings.Join(r.vals[p], ","), "given more than once")
		}
	}
	r.lim.defaultDays = previewDays
	f, q := &r.f, &r.q
	var lat, lon bool // read: an unknown tz is told the zone there
	r.read(ParamLatitude, func(get getter) error {
		v, err := parseCoord(get, ParamLatitude, 90, config.LatitudeText)
		f.Lat = strconv.FormatFloat(v, 'f', -1, 64)
		q.Latitude, lat = v, err == nil
		return err
	})
	r.read(ParamLongitude, func(get getter) error {
		v, err := parseCoord(get, ParamLongitude, 180, config.LongitudeText)
		f.Lon = strconv.FormatFloat(v, 'f', -1, 64)
		q.Longitude, lon = v, err == nil
		return err
	})
	q.placed = lat && lon
	r.read(ParamElevation, func(get getter) error {
		err := q.parseElevation(get)
		f.Elev = strconv.FormatFloat(q.Elevation, 'f', -1, 64)
		return err
	})
	r.read(ParamZone, func(get getter) error {
		err := q.parseZone(get, &r.lim)
		if err == nil {
			f.Zone = q.Location.String()
		}
		return err
	})
	r.read(ParamName, func(get getter) error {
		err := q.parseExtras(get, &r.lim)
		f.Name = q.Name
		return err
	})
	r.read(ParamHorizon, func(get getter) error {
		err := q.parseExtras(get, &r.lim)
		switch {
		case err != nil:
		case len(q.Skyline) > 0:
			f.Horizon = q.skylineText()
		case q.horizonGiven(): // 0 written: a level horizon, no dip
			f.Horizon = strconv.FormatFloat(q.Horizon, 'f', -1, 64)
		}
		return err
	})
	ticked, shifts := r.kinds()
	r.read(ParamAlarm, func(get getter) error {
		err := q.parseExtras(get, &r.lim)
		f.Alarm = strconv.FormatInt(int64(q.Alarm/time.Minute), 10)
		return err
	})
	r.read(ParamStart, func(get getter) error {
		q.Location = time.UTC // read only without a start
		err := q.parseWindow(get, time.Time{}, &r.lim)
		f.Start, f.StartChosen = q.Start.Format(time.DateOnly), true
		return err
	})
	r.read(ParamDays, func(get getter) error {
		lim := r.lim
		lim.maxDays = maxTable // a table's length, as the table takes it
		q.Location = time.UTC  // read only without a start
		err := q.parseWindow(get, s.now(), &lim)
		if err == nil && q.Days != previewDays {
			f.Days = strconv.Itoa(q.Days)
		}
		return err
	})
	r.read(ParamUTC, func(get getter) error {
		err := q.parseUTC(get)
		if err == nil && q.UTC {
			r.ignore(ParamUTC, r.vals.Get(ParamUTC), "the builder's calendars give local times")
		}
		return err
	})
	// the parameters the builder does not know last: the notes on its own
	// come first
	var unknown []string
	for k := range r.vals {
		if !slices.Contains(adhocParams, k) {
			unknown = append(unknown, k)
		}
	}
	slices.Sort(unknown)
	for _, k := range unknown {
		if k == "" {
			r.ignore("", "", "a value without a parameter's name is left out: "+quoteValue(r.vals.Get(k)))
			continue
		}
		r.ignore(k, r.vals.Get(k), "unknown parameter (the builder reads "+strings.Join(builderParams, ", ")+")")
	}
	if n := len(f.Ignored); n > maxFillNotes {
		f.Ignored = append(f.Ignored[:maxFillNotes-1], strconv.Itoa(n-maxFillNotes+1)+" more values left out")
	}
	if ticked == nil && shifts == nil {
		return r.f, kindGroups
	}
	return r.f, fillGroups(ticked, shifts)
}

// filler reads the query of the builder's page, one parameter at a time.
type filler struct {
	f    builderFill
	vals url.Values
	lim  adhocLimits
	q    AdhocQuery // where each parse step puts what it read
}

// ignore adds the note on the value of param left out, msg saying why.
func (r *filler) ignore(param, value, msg string) {
	r.note(&QueryError{Param: param, Value: value, Msg: msg})
}

// has reports whether the query gives name once.
func (r *filler) has(name string) bool { return len(r.vals[name]) == 1 }

// only tells the parameter name alone, given once, to a parse step.
func (r *filler) only(name string) getter {
	return func(n string) (string, bool) {
		if n != name || !r.has(n) {
			return "", false
		}
		return r.vals[n][0], true
	}
}

// read runs the parse step of the parameter name, when the query gives it
// once, with name alone; when it fails, its error is said in a note and
// the form keeps what it had before the step.
func (r *filler) read(name string, step func(getter) error) {
	if !r.has(name) {
		return
	}
	keep := r.f
	if err := step(r.only(name)); err != nil {
		r.f = keep
		r.note(err)
	}
}

// note adds the note of err, a value left out, without its package's
// prefix.
func (r *filler) note(err error) {
	r.f.Ignored = append(r.f.Ignored, strings.TrimPrefix(err.Error(), "serve: "))
}

// maxFillNotes is the most lines the builder's note on the values of its
// link it left out has: a link of hundreds of unknown parameters is said
// in a screenful.
const maxFillNotes = 12

// kinds reads lighting, kinds and offsets: the lighting target goes in the
// form, the kinds the builder has a box for are ticked, and shifts holds
// the minutes of their offsets. ticked is nil when the query names no kind
// the builder has a box for and no lighting target (the page keeps its
// default choices).
func (r *filler) kinds() (ticked map[string]bool, shifts map[string]string) {
	q := &r.q
	lighting := "" // the target's kind, lighting:<duration>
	setLighting := func(kind string) bool {
		h, ok := strings.CutPrefix(kind, config.KindLighting+":")
		d, err := time.ParseDuration(h)
		if !ok || err != nil {
			return false
		}
		r.f.Lighting, lighting = strconv.FormatFloat(math.Round(d.Hours()*1e4)/1e4, 'f', -1, 64), kind
		return true
	}
	r.read(ParamLighting, func(get getter) error {
		err := q.parseExtras(get, &r.lim)
		if err == nil && len(q.Kinds) == 1 {
			setLighting(q.Kinds[0])
		}
		return err
	})
	q.Kinds = nil
	if r.has(ParamKinds) {
		err := kindItems(r.vals.Get(ParamKinds), r.lim.parseKind, func(p, k string, err error) bool {
			isLighting := strings.HasPrefix(k, config.KindLighting+":")
			switch {
			case p == "":
				return true
			case err != nil:
				r.note(err)
				return true
			case k == lighting:
			case isLighting && lighting != "":
				r.ignore(ParamKinds, p, "the builder takes one lighting target, "+lighting)
			case isLighting:
				setLighting(k)
			case builderKind(k) == nil:
				r.ignore(ParamKinds, p, "the builder has no box for this kind")
			default:
				if ticked == nil {
					ticked = map[string]bool{}
				}
				ticked[k] = true
			}
			q.Kinds = append(q.Kinds, k) // for offsets, as the feed reads them
			return true
		})
		if err != nil {
			r.note(err)
		}
	}
	if lighting != "" && ticked == nil {
		ticked = map[string]bool{} // the lighting target alone
	}
	if !r.has(ParamOffsets) {
		return ticked, shifts
	}
	if v := r.vals.Get(ParamOffsets); strings.Count(v, ",") >= maxKinds {
		r.ignore(ParamOffsets, v, "more than "+strconv.Itoa(maxKinds)+" kinds")
		return ticked, shifts
	}
	for _, item := range strings.Split(r.vals.Get(ParamOffsets), ",") {
		if strings.TrimSpace(item) == "" {
			continue
		}
		if err := q.parseOffsets(item, &r.lim); err != nil {
			r.note(err)
			continue
		}
		for k, d := range q.Offsets { // one kind, or none for a shift of 0
			if c := builderKind(k); c == nil || !c.Shift || !ticked[k] {
				r.ignore(ParamOffsets, strings.TrimSpace(item), "the builder has no shift for this kind")
				continue
			}
			if shifts == nil {
				shifts = map[string]string{}
			}
			shifts[k] = strconv.FormatInt(int64(d/time.Minute), 10)
		}
	}
	return ticked, shifts
}

// builderKind is the builder's box of the kind k (canonical form), nil
// when it has none.
func builderKind(k string) *kindChoice {
	for i := range kindGroups {
		for j := range kindGroups[i].Kinds {
			if c := &kindGroups[i].Kinds[j]; c.Kind == k {
				return c
			}
		}
	}
	return nil
}

// fillGroups are kindGroups with the kinds of ticked ticked (the default
// choices when ticked is nil) and the shifts in minutes of shifts.
func fillGroups(ticked map[string]bool, shifts map[string]string) []kindGroup {
	out := slices.Clone(kindGroups)
	for i := range out {
		out[i].Kinds = slices.Clone(out[i].Kinds)
		for j := range out[i].Kinds {
			c := &out[i].Kinds[j]
			if ticked != nil {
				c.Checked = ticked[c.Kind]
			}
			c.Offset = shifts[c.Kind]
		}
	}
	return out
}

// builderQuery is the query of the builder's page that opens it filled
// with q (builderFill reads it back): the place, the zone when it was given
// (not found from the coordinates), the kinds with the lighting target,
// the shifts, the reminder and start, the query's own start date ("" when
// it gave none), the table's length when it is not the preview's (the
// builder's share link keeps it). utc=false, which the builder has no
// field for, is left out; utc=true is kept, for the builder to say that it
// leaves it out.
func (q AdhocQuery) builderQuery(start string) string {
	v := url.Values{}
	v.Set(ParamLatitude, strconv.FormatFloat(q.Latitude, 'f', -1, 64))
	v.Set(ParamLongitude, strconv.FormatFloat(q.Longitude, 'f', -1, 64))
	if q.Elevation != 0 {
		v.Set(ParamElevation, strconv.FormatFloat(q.Elevation, 'f', -1, 64))
	}
	if !q.ZoneFound {
		v.Set(ParamZone, q.Location.String())
	}
	if q.Name != "" {
		v.Set(ParamName, q.Name)
	}
	switch {
	case len(q.Skyline) > 0:
		v.Set(ParamHorizon, q.skylineText())
	case q.horizonGiven():
		v.Set(ParamHorizon, strconv.FormatFloat(q.Horizon, 'f', -1, 64))
	}
	v.Set(ParamKinds, strings.Join(q.Kinds, ","))
	if len(q.Offsets) > 0 {
		v.Set(ParamOffsets, q.offsetList())
	}
	if q.Alarm != 0 {
		v.Set(ParamAlarm, config.ShortDuration(q.Alarm))
	}
	if start != "" {
		v.Set(ParamStart, start)
	}
	if q.Days != previewDays {
		v.Set(ParamDays, strconv.Itoa(q.Days))
	}
	if q.UTC {
		v.Set(ParamUTC, "true")
	}
	return v.Encode()
}
