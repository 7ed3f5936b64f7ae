package main

import (
	"fmt"
	"math"
	"time"

	"heliocal/astro"
	"heliocal/feed"
)

// jsonEclipse holds the fields an eclipse adds to its JSON event: for the
// Sun {"max", "type", "magnitude", "obscuration"} and "total_start"/"total_end"
// (second and third contact) when the eclipse is total or annular at the
// site; for the Moon {"max", "type", "umbral_magnitude"} and
// "partial_start"/"partial_end" (U1, U4), "total_start"/"total_end" (U2, U3)
// where they exist. start and end are the first and last contact (P1, P4).
type jsonEclipse struct {
	Max             string   `json:"max"`
	Type            string   `json:"type"`
	Magnitude       *float64 `json:"magnitude,omitempty"`
	Obscuration     *float64 `json:"obscuration,omitempty"`
	UmbralMagnitude *float64 `json:"umbral_magnitude,omitempty"`
	PartialStart    string   `json:"partial_start,omitempty"`
	PartialEnd      string   `json:"partial_end,omitempty"`
	TotalStart      string   `json:"total_start,omitempty"`
	TotalEnd        string   `json:"total_end,omitempty"`
	// At a site with a skyline: the time the body is over it during the
	// eclipse, and its first appearance and last disappearance within it.
	VisibleS     *float64 `json:"visible_s,omitempty"`
	VisibleStart string   `json:"visible_start,omitempty"`
	VisibleEnd   string   `json:"visible_end,omitempty"`
}

// eclipseJSON returns the eclipse fields of an event or a feed's entry
// (feed.Event.EclipseFacts, feed.Facts.Eclipse), nil for other kinds.
func eclipseJSON(x *feed.EclipseFacts) *jsonEclipse {
	if x == nil {
		return nil
	}
	at := func(t time.Time) string {
		if t.IsZero() {
			return ""
		}
		return feed.UTCStamp(t)
	}
	round := func(v float64) *float64 {
		r := math.Round(v*1e4) / 1e4
		return &r
	}
	var j *jsonEclipse
	switch {
	case x.Solar != nil:
		l := x.Solar
		j = &jsonEclipse{Max: at(l.Max.Time), Type: l.Type.String(), Magnitude: round(l.Magnitude),
			Obscuration: round(l.Obscuration), TotalStart: at(l.C2.Time), TotalEnd: at(l.C3.Time)}
	case x.Lunar != nil:
		l := x.Lunar.Eclipse
		j = &jsonEclipse{Max: at(l.Greatest), Type: l.Type.String(), UmbralMagnitude: round(l.UmbralMagnitude),
			PartialStart: at(l.U1), PartialEnd: at(l.U4), TotalStart: at(l.U2), TotalEnd: at(l.U3)}
	default:
		return nil
	}
	if x.Skyline {
		var seen time.Duration
		for _, v := range x.Visible {
			seen += v.Length
		}
		s := math.Round(seen.Seconds()*1000) / 1000
		j.VisibleS = &s
		if n := len(x.Visible); n > 0 {
			j.VisibleStart, j.VisibleEnd = at(x.Visible[0].Start), at(x.Visible[n-1].End)
		}
	}
	return j
}

// eclipseCSVHeader are the CSV columns of the eclipse fields, in the order
// of jsonEclipse (a feed's entries end with them).
var eclipseCSVHeader = []string{"max", "type", "magnitude", "obscuration", "umbral_magnitude", "partial_start",
	"partial_end", "total_start", "total_end", "visible_s", "visible_start", "visible_end"}

// csvCells are the eclipse fields under eclipseCSVHeader, all empty for
// another kind.
func (j *jsonEclipse) csvCells() []string {
	if j == nil {
		return make([]string, len(eclipseCSVHeader))
	}
	return []string{j.Max, j.Type, num(j.Magnitude), num(j.Obscuration), num(j.UmbralMagnitude), j.PartialStart,
		j.PartialEnd, j.TotalStart, j.TotalEnd, num(j.VisibleS), j.VisibleStart, j.VisibleEnd}
}

// eclipseDetails are the table's details of an eclipse: type, maximum and
// its numbers, and the body's risings and settings during it.
func eclipseDetails(e *feed.Event, loc *time.Location) []string {
	var parts []string
	horizon := func(hs []astro.HorizonEvent, body string) {
		for _, h := range hs {
			verb := "rises"
			if h.Direction == astro.Setting {
				verb = "sets"
			}
			parts = append(parts, fmt.Sprintf("%s %s %s", body, verb, clock(h.Time, loc)))
		}
	}
	x := e.EclipseFacts()
	switch {
	case x == nil:
	case x.Solar != nil:
		l := x.Solar
		parts = append(parts, l.Type.String(), fmt.Sprintf("max %s", clock(l.Max.Time, loc)),
			fmt.Sprintf("magnitude %.3f", l.Magnitude), fmt.Sprintf("obscuration %.3f", l.Obscuration))
		if !l.C2.IsZero() {
			parts = append(parts, fmt.Sprintf("%s %s–%s", l.Type, clock(l.C2.Time, loc), clock(l.C3.Time, loc)))
		}
		if !l.Max.Up {
			parts = append(parts, "max below the horizon")
		}
		horizon(l.Horizon, "Sun")
	case x.Lunar != nil:
		l := x.Lunar.Eclipse
		parts = append(parts, l.Type.String(), fmt.Sprintf("max %s", clock(l.Greatest, loc)),
			"umbral magnitude "+signed(l.UmbralMagnitude, 3))
		if !x.Lunar.Greatest.Up {
			parts = append(parts, "max below the horizon")
		}
		horizon(x.Lunar.Horizon, "Moon")
	}
	return parts
}

// eclipseMark is the year chart's label of an eclipse: "partial solar
// eclipse", "total lunar eclipse".
func eclipseMark(e feed.Event) string {
	x := e.EclipseFacts()
	switch {
	case x == nil:
	case x.Solar != nil:
		return x.Solar.Type.String() + " solar eclipse"
	case x.Lunar != nil:
		return x.Lunar.Eclipse.Type.String() + " lunar eclipse"
	}
	return e.Kind.Name
}
