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

// eclipseJSON returns the eclipse fields of an event, nil for other kinds.
func eclipseJSON(e feed.Event) *jsonEclipse {
	at := func(t time.Time) string {
		if t.IsZero() {
			return ""
		}
		return utcStamp(t)
	}
	round := func(v float64) *float64 {
		r := math.Round(v*1e4) / 1e4
		return &r
	}
	var j *jsonEclipse
	switch {
	case e.Solar != nil:
		l := e.Solar
		j = &jsonEclipse{Max: at(l.Max.Time), Type: l.Type.String(), Magnitude: round(l.Magnitude),
			Obscuration: round(l.Obscuration), TotalStart: at(l.C2.Time), TotalEnd: at(l.C3.Time)}
	case e.Lunar != nil:
		l := e.Lunar.Eclipse
		j = &jsonEclipse{Max: at(l.Max), Type: l.Type.String(), UmbralMagnitude: round(l.UmbralMagnitude),
			PartialStart: at(l.U1), PartialEnd: at(l.U4), TotalStart: at(l.U2), TotalEnd: at(l.U3)}
	default:
		return nil
	}
	if e.Skyline {
		var seen time.Duration
		for _, v := range e.Visible {
			seen += v.Length
		}
		s := math.Round(seen.Seconds()*1000) / 1000
		j.VisibleS = &s
		if n := len(e.Visible); n > 0 {
			j.VisibleStart, j.VisibleEnd = at(e.Visible[0].Start), at(e.Visible[n-1].End)
		}
	}
	return j
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
	switch {
	case e.Solar != nil:
		l := e.Solar
		parts = append(parts, l.Type.String(), fmt.Sprintf("max %s", clock(l.Max.Time, loc)),
			fmt.Sprintf("magnitude %.3f", l.Magnitude), fmt.Sprintf("obscuration %.3f", l.Obscuration))
		if !l.C2.IsZero() {
			parts = append(parts, fmt.Sprintf("%s %s–%s", l.Type, clock(l.C2.Time, loc), clock(l.C3.Time, loc)))
		}
		if !l.Max.Up {
			parts = append(parts, "max below the horizon")
		}
		horizon(l.Horizon, "Sun")
	case e.Lunar != nil:
		l := e.Lunar.Eclipse
		parts = append(parts, l.Type.String(), fmt.Sprintf("max %s", clock(l.Max, loc)),
			fmt.Sprintf("umbral magnitude %.3f", l.UmbralMagnitude))
		if !e.Lunar.Max.Up {
			parts = append(parts, "max below the horizon")
		}
		horizon(e.Lunar.Horizon, "Moon")
	}
	return parts
}

// eclipseMark is the year chart's label of an eclipse: "partial solar
// eclipse", "total lunar eclipse".
func eclipseMark(e feed.Event) string {
	switch {
	case e.Solar != nil:
		return e.Solar.Type.String() + " solar eclipse"
	case e.Lunar != nil:
		return e.Lunar.Eclipse.Type.String() + " lunar eclipse"
	}
	return e.Kind.Name
}
