package publish

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
	"time"
)

// SiteChart is the year of one site as the index page draws it: how long the
// Sun stays above the horizon and above each twilight limit on every day,
// with the feed's notable events marked. The caller computes it (publish
// does no astronomy); Above turns a day's crossings into the durations.
type SiteChart struct {
	// Days are consecutive local dates, in order (typically one year).
	Days []ChartDay
	// Marks are dated events drawn as vertical lines, e.g. the equinoxes and
	// solstices. Marks outside Days are left out.
	Marks []Mark
	// Levels are day lengths drawn as horizontal lines, e.g. a photoperiod
	// threshold of 12 h.
	Levels []Level
}

// ChartDay is one local day of a SiteChart. Each duration is the time the
// Sun's centre (or its upper limb for Daylight, as sunrise is defined) spends
// above the limit during that local day: 0 when it never gets there (Daylight
// in the polar night), the whole day when it never drops below (Daylight in
// the midnight sun, Astronomical in a northern summer night that never gets
// dark). Values are clipped to 0..24 h.
type ChartDay struct {
	Date         time.Time     // the local date, at 00:00 UTC
	Daylight     time.Duration // sunrise to sunset
	Civil        time.Duration // above −6°: civil dawn to civil dusk
	Nautical     time.Duration // above −12°
	Astronomical time.Duration // above −18°
}

// Mark is an event drawn as a vertical line at its date (and time).
type Mark struct {
	At    time.Time
	Label string
}

// Level is a day length drawn as a horizontal line.
type Level struct {
	Length time.Duration
	Label  string
}

// Above returns how long the Sun stays above a limit during the local day
// [dayStart, dayEnd), from that day's crossings of the limit: rising are the
// upward crossings and setting the downward ones, each in any number (none,
// one, or two near the start or end of a polar period). Whether the Sun is
// above the limit at dayStart follows from the first crossing; with no
// crossing at all, alwaysAbove tells whether it stayed above all day (polar
// day: the whole day) or below (polar night: 0). This matches astro.Day:
// Above(d.Date, next midnight, d.Rising, d.Setting, d.State == astro.AlwaysAbove).
func Above(dayStart, dayEnd time.Time, rising, setting []time.Time, alwaysAbove bool) time.Duration {
	type crossing struct {
		at time.Time
		up bool
	}
	cs := make([]crossing, 0, len(rising)+len(setting))
	for _, t := range rising {
		cs = append(cs, crossing{t, true})
	}
	for _, t := range setting {
		cs = append(cs, crossing{t, false})
	}
	if len(cs) == 0 {
		if alwaysAbove {
			return dayEnd.Sub(dayStart)
		}
		return 0
	}
	sort.Slice(cs, func(i, j int) bool { return cs[i].at.Before(cs[j].at) })
	above := !cs[0].up // above at the start if the first crossing goes down
	from := dayStart
	var total time.Duration
	for _, c := range cs {
		if above {
			total += c.at.Sub(from)
		}
		above, from = c.up, c.at
	}
	if above {
		total += dayEnd.Sub(from)
	}
	return total
}

// Chart geometry, in SVG user units.
const (
	chartW     = 760
	chartH     = 300
	plotLeft   = 44
	plotTop    = 30
	plotW      = 700
	plotH      = 240 // 10 units per hour
	plotBottom = plotTop + plotH
)

type chartView struct {
	ID      string // unique id for aria references
	Title   string
	Summary string
	Bands   []bandView
	Months  []tickView
	Hours   []tickView
	Marks   []markView
	Levels  []levelView
}

type bandView struct {
	Class  string
	Points string
}

type tickView struct {
	X, Y, TX, TY string
	Label        string
}

type markView struct {
	X, Y1, Y2, TY string
	Anchor        string // text-anchor of the label: kept inside the chart
	Label, Date   string
	Shown         bool // the label fits above the plot
}

type levelView struct {
	Y, TX, TY string
	Label     string
}

func num(v float64) string {
	v = math.Round(v*10) / 10
	if v == 0 {
		v = 0 // no "-0"
	}
	return strconv.FormatFloat(v, 'f', -1, 64)
}

func clipHours(d time.Duration) float64 {
	h := d.Hours()
	switch {
	case math.IsNaN(h) || h < 0:
		return 0
	case h > 24:
		return 24
	}
	return h
}

func yOf(h float64) float64 { return plotBottom - h*plotH/24 }

// bandPoints is the polygon of an area from 0 h up to each day's value.
// Runs of equal height are reduced to their ends, so a polar plateau costs
// two points.
func bandPoints(days []ChartDay, val func(ChartDay) time.Duration) string {
	n := len(days)
	step := float64(plotW) / float64(n)
	type pt struct{ x, y float64 }
	pts := []pt{{plotLeft, plotBottom}}
	ys := make([]float64, n)
	for i, d := range days {
		ys[i] = math.Round(yOf(clipHours(val(d)))*10) / 10
	}
	pts = append(pts, pt{plotLeft, ys[0]})
	for i := range n {
		if i > 0 && i < n-1 && ys[i] == ys[i-1] && ys[i] == ys[i+1] {
			continue
		}
		pts = append(pts, pt{plotLeft + (float64(i)+0.5)*step, ys[i]})
	}
	pts = append(pts, pt{plotLeft + plotW, ys[n-1]}, pt{plotLeft + plotW, plotBottom})
	var b strings.Builder
	for i, p := range pts {
		if i > 0 {
			b.WriteByte(' ')
		}
		b.WriteString(num(p.x))
		b.WriteByte(',')
		b.WriteString(num(p.y))
	}
	return b.String()
}

// formatLength writes a day length as "7 h 41 min".
func formatLength(d time.Duration) string {
	m := int(math.Round(clipHours(d) * 60))
	return fmt.Sprintf("%d h %02d min", m/60, m%60)
}

// chart turns a SiteChart into what the template draws; nil when empty.
func chart(id, siteName string, c *SiteChart) *chartView {
	if c == nil || len(c.Days) == 0 {
		return nil
	}
	days := c.Days
	first, last := days[0].Date, days[len(days)-1].Date
	return &chartView{
		ID:    "chart-" + id,
		Title: chartTitle(siteName, first, last),
		Bands: []bandView{
			{"astro", bandPoints(days, func(d ChartDay) time.Duration { return d.Astronomical })},
			{"naut", bandPoints(days, func(d ChartDay) time.Duration { return d.Nautical })},
			{"civil", bandPoints(days, func(d ChartDay) time.Duration { return d.Civil })},
			{"day", bandPoints(days, func(d ChartDay) time.Duration { return d.Daylight })},
		},
		Summary: chartSummary(days),
		Months:  monthTicks(days),
		Hours:   hourTicks(),
		Marks:   markViews(c.Marks, first, last),
		Levels:  levelViews(c.Levels),
	}
}

// chartTitle names the site and the year (or the dates) the chart covers.
func chartTitle(siteName string, first, last time.Time) string {
	if first.Year() == last.Year() {
		return fmt.Sprintf("Day length and twilight at %s, %d", siteName, first.Year())
	}
	return fmt.Sprintf("Day length and twilight at %s, %s to %s", siteName,
		first.Format("2 Jan 2006"), last.Format("2 Jan 2006"))
}

// chartSummary says in words what the chart shows: the shortest and the
// longest daylight, and how many days the Sun stays up or down all day.
func chartSummary(days []ChartDay) string {
	lo, hi := 0, 0
	polarDay, polarNight := 0, 0
	for i, d := range days {
		if d.Daylight < days[lo].Daylight {
			lo = i
		}
		if d.Daylight > days[hi].Daylight {
			hi = i
		}
		switch h := clipHours(d.Daylight); {
		case h >= 24:
			polarDay++
		case h <= 0:
			polarNight++
		}
	}
	s := fmt.Sprintf("Daylight from %s (%s) to %s (%s).",
		formatLength(days[lo].Daylight), days[lo].Date.Format("2 Jan"),
		formatLength(days[hi].Daylight), days[hi].Date.Format("2 Jan"))
	if polarDay > 0 {
		s += fmt.Sprintf(" The Sun stays up all day on %d %s.", polarDay, plural(polarDay, "day", "days"))
	}
	if polarNight > 0 {
		s += fmt.Sprintf(" It stays down all day on %d %s.", polarNight, plural(polarNight, "day", "days"))
	}
	return s
}

// monthTicks puts a tick at each first of the month (and at the start),
// labelled when at least 12 days of that month are in the chart.
func monthTicks(days []ChartDay) []tickView {
	var ticks []tickView
	step := float64(plotW) / float64(len(days))
	for i, d := range days {
		if d.Date.Day() != 1 && i != 0 {
			continue
		}
		x := plotLeft + float64(i)*step
		tv := tickView{X: num(x), TX: num(x + 3), TY: num(plotBottom + 14)}
		end := time.Date(d.Date.Year(), d.Date.Month()+1, 1, 0, 0, 0, 0, time.UTC)
		if n := len(days) - i; end.Sub(d.Date) >= 12*24*time.Hour && n >= 12 {
			tv.Label = d.Date.Format("Jan")
		}
		if d.Date.Day() == 1 || tv.Label != "" {
			ticks = append(ticks, tv)
		}
	}
	return ticks
}

// hourTicks marks the day-length axis every 6 hours.
func hourTicks() []tickView {
	var ticks []tickView
	for h := 0; h <= 24; h += 6 {
		y := yOf(float64(h))
		ticks = append(ticks, tickView{Y: num(y), TX: num(plotLeft - 6), TY: num(y + 4), Label: strconv.Itoa(h) + " h"})
	}
	return ticks
}

// markViews places the marks within the dates first..last as vertical
// lines. Each label stays inside the chart, on the first of two rows where
// it does not run into the previous label; with no room, the line stays and
// the label is only in its tooltip and the caption.
func markViews(marks []Mark, first, last time.Time) []markView {
	span := last.Add(24 * time.Hour).Sub(first)
	marks = append([]Mark(nil), marks...)
	sort.SliceStable(marks, func(i, j int) bool { return marks[i].At.Before(marks[j].At) })
	var views []markView
	rowEnd := [2]float64{math.Inf(-1), math.Inf(-1)}
	for _, m := range marks {
		off := m.At.Sub(first)
		if off < 0 || off >= span {
			continue
		}
		x := plotLeft + float64(plotW)*off.Hours()/span.Hours()
		w := 5.6 * float64(len([]rune(m.Label))) // about 5.6 units a character at 10 px
		anchor, left := "middle", x-w/2
		switch {
		case x+w/2 > chartW-2:
			anchor, left = "end", x-w
		case x-w/2 < 2:
			anchor, left = "start", x
		}
		mv := markView{X: num(x), Y1: num(plotTop), Y2: num(plotBottom), Anchor: anchor, Label: m.Label,
			Date: m.At.UTC().Format("2 Jan")}
		for r := range rowEnd {
			if left > rowEnd[r]+6 {
				rowEnd[r] = left + w
				mv.Y1, mv.TY, mv.Shown = num(plotTop-2-12*float64(r)), num(plotTop-6-12*float64(r)), true
				break
			}
		}
		views = append(views, mv)
	}
	return views
}

// levelViews draws each level as a horizontal line with its label (the
// day length itself when it has none).
func levelViews(levels []Level) []levelView {
	var views []levelView
	for _, lv := range levels {
		y := yOf(clipHours(lv.Length))
		label := lv.Label
		if label == "" {
			label = formatHours(lv.Length)
		}
		views = append(views, levelView{Y: num(y), TX: num(plotLeft + plotW - 4), TY: num(y - 3), Label: label})
	}
	return views
}

// formatHours writes a day length as "12 h" or "14 h 30 min".
func formatHours(d time.Duration) string {
	m := int(math.Round(clipHours(d) * 60))
	if m%60 == 0 {
		return strconv.Itoa(m/60) + " h"
	}
	return fmt.Sprintf("%d h %d min", m/60, m%60)
}

func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}
