package publish

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
	"time"

	"heliocal/feed"
)

// SiteChart is the year of one site as the index page draws it: sunrise and
// sunset on the local clock through the year, the dates the day length
// crosses each photoperiod threshold, lamp periods and dark windows where the
// site's feeds have them, the Moon's new and full phases, and the feed's
// notable events marked. The caller computes it (publish does no astronomy);
// Above turns a day's crossings into the durations.
type SiteChart struct {
	// Days are consecutive local dates, in order (typically one year).
	Days []ChartDay
	// Today is the local date the chart is drawn for (the build's reference
	// date), marked by a vertical line; zero for none.
	Today time.Time
	// Marks are dated events drawn as vertical lines, e.g. the equinoxes and
	// solstices. Marks outside Days are left out.
	Marks []Mark
	// Levels are photoperiod thresholds: each date the day length crosses
	// one is marked.
	Levels []Level
	// Phases are the Moon's new and full phases, drawn along the top.
	Phases []Phase
	// Lamps are lamp periods and Dark the dark windows, each piece within
	// one local date.
	Lamps, Dark []ClockSpan
	// Location is the site's time zone: Marks and Phases are drawn and
	// dated on its local dates, as Days are. Nil means UTC.
	Location *time.Location
	// Held are the site's feeds that hold fewer dates than the chart has (a
	// shorter window, or shortened to fit their size): their lamp periods,
	// dark windows, photoperiod crossings and marks are drawn on their own
	// dates only, which the caption says.
	Held []HeldDates
}

// HeldDates are the dates of the chart a feed holds, First..Last (local
// dates at 00:00 UTC), and What the chart draws of it on those dates only
// ("lamp periods", "dark windows").
type HeldDates struct {
	Feed        string
	What        []string
	First, Last time.Time
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
	// Rise and Set are the local clock times of sunrise and sunset (time
	// since local midnight as the clock reads), when HasRise and HasSet.
	Rise, Set       time.Duration
	HasRise, HasSet bool
}

// Mark is an event drawn as a vertical line at its date (and time).
type Mark struct {
	At    time.Time
	Label string
}

// Level is a photoperiod threshold, a day length.
type Level struct {
	Length time.Duration
	Label  string
	// Keeps, when set, says which crossings are drawn: those on the local
	// dates it keeps (the dates a feed's filtered kinds entry has them).
	// Nil draws every crossing.
	Keeps func(date time.Time) bool
}

// Phase is a new or full Moon.
type Phase struct {
	At   time.Time
	Full bool
}

// ClockSpan is a stretch of one local date on the clock, From to To since
// local midnight.
type ClockSpan struct {
	Date     time.Time // the local date, at 00:00 UTC
	From, To time.Duration
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

// geometry is where a chart is drawn, in SVG user units: the viewBox W×H
// and the plot inside it, Left..Left+PlotW across and Top..Top+PlotH down.
// The clock runs down the plot, midnight at the top and at the bottom.
type geometry struct {
	W, H, Left, Top, PlotW, PlotH float64
	// Phone is the narrow chart shown on a phone in place of the wide one:
	// no hour suffix ":00", no labels of marks, thresholds and today (their
	// lines keep their tooltips, the caption says them), the hour labels
	// centred on their lines.
	Phone bool
}

// desk is the wide chart of a tablet, a desk and paper; phone is drawn in
// its place on screens up to 28rem wide (a 390 px phone shows it about
// 370 px wide, 14 units an hour: a plot about 350 px tall where the wide
// chart, scaled to the width, had 115).
var (
	desk  = geometry{W: 760, H: 318, Left: 44, Top: 44, PlotW: 700, PlotH: 240} // 10 units an hour
	phone = geometry{W: 360, H: 370, Left: 26, Top: 14, PlotW: 328, PlotH: 336, Phone: true}
)

// bottom is the plot's lower edge.
func (g geometry) bottom() float64 { return g.Top + g.PlotH }

// chartView is what the page says and draws of a site's year: the title and
// words once, and the drawing in the wide geometry (desk, embedded) and the
// narrow one (Phone).
type chartView struct {
	ID      string // unique id for aria references
	Title   string
	Summary string
	Held    string // the dates the feeds of shorter windows are drawn on, in words
	drawing
	Phone drawing
}

// Desk is the chart drawn in the wide geometry.
func (v *chartView) Desk() drawing { return v.drawing }

// drawing is a chart drawn in one geometry.
type drawing struct {
	ID         string // the chart's id, for the shared hatch pattern
	Title      string // the chart's title, its name
	Class      string // "desk" or "ph"
	ViewBox    string // "0 0 W H"
	W, H       string
	Left, Top  string // the plot's corner
	PlotW      string
	PlotH      string
	Right      string // Left+PlotW
	Bottom     string // Top+PlotH
	TickEnd    string // the lower end of the months' ticks
	Phone      bool
	Rise, Set  string // path data of the sunrise and sunset curves
	Lamps      string // path data of the lamp periods, one stroke a day
	Dark       string // path data of the dark windows
	Step       string // width of one day
	Months     []tickView
	Hours      []tickView
	Marks      []markView
	Thresholds []thresholdView
	Phases     []phaseView
	Today      *todayView
}

type tickView struct {
	X, Y, TX, TY string
	Label        string
	// Short marks a month label with too few of its days in the chart for
	// the larger labels of a narrow screen, which leave it out; Alt every
	// second one of the others, which the narrowest screens leave out.
	Short, Alt bool
	day        int // a month's tick: the index of its date in the chart's days
}

type markView struct {
	X, Y1, Y2, TY string
	Anchor        string // text-anchor of the label: kept inside the chart
	Label, Date   string
	Shown         bool          // the label fits above the plot
	off           time.Duration // where it falls on the chart (see onChart)
}

type thresholdView struct {
	X, TX, TY string
	Label     string // e.g. "12 h ↑"
	Text      string // in words, for the tooltip and the caption
	day       int    // the index of the crossing's date in the chart's days
}

type phaseView struct {
	X, Y string
	Full bool
	Date string
	off  time.Duration // where it falls on the chart (see onChart)
}

type todayView struct {
	X, TX, TY, Y2, Date string
	PastW               string // width of the shade over the dates before today
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

// yOf is the height of a clock time, h hours after local midnight.
func (g geometry) yOf(h float64) float64 { return g.Top + h*g.PlotH/24 }

// dayStep is the width of one day of n.
func (g geometry) dayStep(n int) float64 { return g.PlotW / float64(n) }

// curve is the path of a clock time through the days, broken where a day
// has none (the polar day and night) and where the time passes midnight
// from one day to the next (a sunset just after midnight near the midnight
// Sun), rather than drawn across the whole plot.
func (g geometry) curve(days []ChartDay, val func(ChartDay) (time.Duration, bool)) string {
	step := g.dayStep(len(days))
	var b strings.Builder
	pen := false
	var prev time.Duration
	for i, d := range days {
		v, ok := val(d)
		if !ok {
			pen = false
			continue
		}
		if pen && (v-prev > 12*time.Hour || prev-v > 12*time.Hour) {
			pen = false
		}
		prev = v
		if b.Len() > 0 {
			b.WriteByte(' ')
		}
		if pen {
			b.WriteByte('L')
		} else {
			b.WriteByte('M')
		}
		b.WriteString(num(g.Left + (float64(i)+0.5)*step))
		b.WriteByte(',')
		b.WriteString(num(g.yOf(clipHours(v))))
		pen = true
	}
	return b.String()
}

// spans is the path of clock spans, one vertical stroke (as wide as a day)
// per piece.
func (g geometry) spans(days []ChartDay, ss []ClockSpan) string {
	if len(ss) == 0 {
		return ""
	}
	first := days[0].Date
	step := g.dayStep(len(days))
	var b strings.Builder
	for _, s := range ss {
		i := int(math.Round(s.Date.Sub(first).Hours() / 24))
		if i < 0 || i >= len(days) || s.To <= s.From {
			continue
		}
		if b.Len() > 0 {
			b.WriteByte(' ')
		}
		fmt.Fprintf(&b, "M%s,%sV%s", num(g.Left+(float64(i)+0.5)*step), num(g.yOf(clipHours(s.From))), num(g.yOf(clipHours(s.To))))
	}
	return b.String()
}

// formatLength writes a day length as "7 h 41 min".
func formatLength(d time.Duration) string {
	return feed.Length(min(max(d, 0), 24*time.Hour), time.Minute)
}

// chart turns a SiteChart into what the template draws; nil when empty.
func chart(id, siteName string, c *SiteChart) *chartView {
	if c == nil || len(c.Days) == 0 {
		return nil
	}
	days := c.Days
	first, last := days[0].Date, days[len(days)-1].Date
	today := todayIndex(c.Today, days)
	v := &chartView{
		ID:    "chart-" + id,
		Title: chartTitle(siteName, first, last, len(c.Lamps) > 0, len(c.Dark) > 0),
		Held:  heldText(c.Held, first, last, c.Today),
	}
	sh := shared{
		today:  today,
		ts:     thresholds(days, c.Levels, today),
		months: months(days),
		marks:  datedMarks(c.Marks, c.Location, first, last),
		phases: datedPhases(c.Phases, c.Location, first, last),
	}
	v.drawing = desk.draw("chart-"+id, "desk", c, sh)
	v.Phone = phone.draw("chart-"+id, "ph", c, sh)
	v.drawing.Title, v.Phone.Title = v.Title, v.Title
	ahead := days // the summary speaks of the year from today
	if today > 0 {
		ahead = days[today:]
	}
	v.Summary = chartSummary(ahead)
	for _, w := range []string{spanWords(c.Lamps, true, ahead[0].Date, first, last), spanWords(c.Dark, false, ahead[0].Date, first, last)} {
		if w != "" {
			v.Summary += " " + w
		}
	}
	for _, t := range sh.ts {
		v.Summary += " " + t.Text + "."
	}
	if v.Today != nil {
		// The key names the shade over the weeks before today; said here,
		// it was said twice. What the words count starts at today, while
		// a feed's strokes may be drawn from before it.
		v.Summary += " Today at this site (" + v.Today.Date + ") is marked; the figures are for the year from it."
	}
	return v
}

// shared is what both drawings of a chart draw alike, found once by chart
// and placed by each geometry's draw.
type shared struct {
	today  int             // the index of today's date in the chart's days (see todayIndex)
	ts     []thresholdView // the photoperiod crossings (see thresholds)
	months []tickView      // the months' ticks (see months)
	marks  []markView      // the marks on the chart (see datedMarks)
	phases []phaseView     // the Moon's phases on the chart (see datedPhases)
}

// draw draws the chart c in the geometry g, with what sh found for every
// geometry.
func (g geometry) draw(id, class string, c *SiteChart, sh shared) drawing {
	days := c.Days
	span := chartSpan(days[0].Date, days[len(days)-1].Date)
	return drawing{
		ID: id, Class: class, Phone: g.Phone,
		ViewBox:    "0 0 " + num(g.W) + " " + num(g.H),
		W:          num(g.W),
		H:          num(g.H),
		Left:       num(g.Left),
		Top:        num(g.Top),
		PlotW:      num(g.PlotW),
		PlotH:      num(g.PlotH),
		Right:      num(g.Left + g.PlotW),
		Bottom:     num(g.bottom()),
		TickEnd:    num(g.bottom() + 5),
		Rise:       g.curve(days, func(d ChartDay) (time.Duration, bool) { return d.Rise, d.HasRise }),
		Set:        g.curve(days, func(d ChartDay) (time.Duration, bool) { return d.Set, d.HasSet }),
		Lamps:      g.spans(days, c.Lamps),
		Dark:       g.spans(days, c.Dark),
		Step:       num(math.Max(g.dayStep(len(days)), 1)),
		Months:     g.monthTicks(sh.months, len(days)),
		Hours:      g.hourTicks(),
		Marks:      g.markViews(sh.marks, span),
		Thresholds: g.thresholdViews(sh.ts, len(days)),
		Phases:     g.phaseViews(sh.phases, span),
		Today:      g.todayMark(sh.today, days),
	}
}

// heldText says, for each feed that holds fewer dates than the chart
// first..last, on which dates its kinds are drawn: "Lamp periods of the
// feed fernhollow-lamps drawn from 8 Jan to 14 Jul, the dates it holds."
// A first date before today (zero: none marked), where the chart's
// figures do not count, is said to be in the shaded weeks before today,
// so that it does not read as a second start beside theirs.
func heldText(held []HeldDates, first, last, today time.Time) string {
	var b strings.Builder
	todayIn := !today.IsZero() && today.After(first) && !today.After(last) // the chart shades the weeks before it
	for _, h := range held {
		if len(h.What) == 0 {
			continue
		}
		what := feed.AndList(h.What)
		from, to := stretchDates(h.First, h.Last, first, last)
		shaded := ""
		if todayIn && h.First.Before(today) {
			shaded = ", in the shaded weeks before today"
		}
		b.WriteString(" ")
		b.WriteString(feed.Capital(what))
		fmt.Fprintf(&b, " of the feed %s ", h.Feed)
		switch {
		case h.Last.Before(h.First):
			b.WriteString("not drawn: it holds none of the chart's dates.")
		case !h.First.After(first):
			fmt.Fprintf(&b, "drawn to %s, where it ends.", to)
		case !h.Last.Before(last):
			fmt.Fprintf(&b, "drawn from %s, where it begins%s.", from, shaded)
		default:
			if shaded != "" {
				shaded += ","
			}
			fmt.Fprintf(&b, "drawn from %s%s to %s, the dates it holds.", from, shaded, to)
		}
	}
	return strings.TrimPrefix(b.String(), " ")
}

// wallClock is the local clock reading of t in loc written as a UTC time,
// the way the chart's dates are (a local date at 00:00 UTC): an equinox at
// 20:25 UTC on 20 March falls on 21 March in Auckland, and is drawn there.
func wallClock(t time.Time, loc *time.Location) time.Time {
	if loc == nil {
		return t
	}
	l := t.In(loc)
	return time.Date(l.Year(), l.Month(), l.Day(), l.Hour(), l.Minute(), l.Second(), l.Nanosecond(), time.UTC)
}

// chartTitle says what the chart draws (sunrise and sunset, and the lamp
// periods and dark windows when it has them), where, and over which year
// (or dates).
func chartTitle(siteName string, first, last time.Time, lamps, dark bool) string {
	what := "Sunrise and sunset"
	switch {
	case lamps && dark:
		what = "Sunrise, sunset, lamp periods and dark windows"
	case lamps:
		what = "Sunrise, sunset and lamp periods"
	case dark:
		what = "Sunrise, sunset and dark windows"
	}
	if first.Year() == last.Year() {
		return fmt.Sprintf("%s at %s, %d", what, siteName, first.Year())
	}
	return fmt.Sprintf("%s at %s, %s to %s", what, siteName,
		first.Format("2 Jan 2006"), last.Format("2 Jan 2006"))
}

// chartSummary says in words what the chart shows: the shortest daylight
// (unless the Sun stays down all day then) and the longest, and how many
// days the Sun stays up or down all day, over days (the chart's dates from
// today).
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
	longest := fmt.Sprintf("%s (%s)", formatLength(days[hi].Daylight), days[hi].Date.Format("2 Jan"))
	// a shortest day of polar night is no "0 min" of daylight: the days the
	// Sun stays down are counted below instead
	s := "Daylight up to " + longest + "."
	if clipHours(days[lo].Daylight) > 0 {
		s = fmt.Sprintf("Daylight from %s (%s) to %s.", formatLength(days[lo].Daylight), days[lo].Date.Format("2 Jan"), longest)
	}
	sun := "The Sun"
	if polarDay > 0 {
		s += fmt.Sprintf(" The Sun stays up all day on %d %s.", polarDay, plural(polarDay, "day", "days"))
		sun = "It"
	}
	if polarNight > 0 {
		s += fmt.Sprintf(" %s stays down all day on %d %s.", sun, polarNight, plural(polarNight, "day", "days"))
	}
	return s
}

// months are the ticks at each first of the month (and at the start),
// labelled when at least 12 days of that month are in the chart; Short when
// fewer than 27 are, too narrow a column for the label a phone draws, and
// Alt every second label of the others. They are not yet placed (see
// monthTicks): the same in every geometry, so found once for both drawings.
func months(days []ChartDay) []tickView {
	var ticks []tickView
	alt := false
	for i, d := range days {
		if d.Date.Day() != 1 && i != 0 {
			continue
		}
		tv := tickView{day: i}
		end := time.Date(d.Date.Year(), d.Date.Month()+1, 1, 0, 0, 0, 0, time.UTC)
		if n := len(days) - i; end.Sub(d.Date) >= 12*24*time.Hour && n >= 12 {
			tv.Label = d.Date.Format("Jan")
			tv.Short = end.Sub(d.Date) < 27*24*time.Hour || n < 27
			if !tv.Short {
				tv.Alt, alt = alt, !alt
			}
		}
		if d.Date.Day() == 1 || tv.Label != "" {
			ticks = append(ticks, tv)
		}
	}
	return ticks
}

// monthTicks places the months' ticks ms (see months) on a chart of n days.
func (g geometry) monthTicks(ms []tickView, n int) []tickView {
	if len(ms) == 0 {
		return nil
	}
	step := g.dayStep(n)
	ticks := make([]tickView, len(ms))
	for k, tv := range ms {
		x := g.Left + float64(tv.day)*step
		tv.X, tv.TX, tv.TY = num(x), num(x+3), num(g.bottom()+14)
		if g.Phone {
			// centred on its month's days, not begun 3 units after
			// its first: "May" (wide) and "Jun" (narrow) touched
			// there, read as one word, each month's column as wide
			// as its label at 12 px
			next := n
			if k+1 < len(ms) {
				next = ms[k+1].day
			}
			tv.TX = num(x + float64(next-tv.day)*step/2)
		}
		ticks[k] = tv
	}
	return ticks
}

// hourTicks marks the clock every 6 hours, labelled with the hour ("06";
// the template adds ":00", which a phone leaves out).
func (g geometry) hourTicks() []tickView {
	var ticks []tickView
	for h := 0; h <= 24; h += 6 {
		y := g.yOf(float64(h))
		tv := tickView{Y: num(y), TX: num(g.Left - 6), TY: num(y + 4), Label: fmt.Sprintf("%02d", h)}
		if g.Phone {
			tv.TX, tv.TY = num(g.Left-5), num(y) // centred on the line by the page's style
		}
		ticks = append(ticks, tv)
	}
	return ticks
}

// datedMarks are the marks within the dates first..last in time order,
// with their labels and dates but not yet placed (see markViews): the same
// in every geometry, so found once for both drawings.
func datedMarks(marks []Mark, loc *time.Location, first, last time.Time) []markView {
	marks = append([]Mark(nil), marks...)
	sort.SliceStable(marks, func(i, j int) bool { return marks[i].At.Before(marks[j].At) })
	var views []markView
	for _, m := range marks {
		if off, date, ok := onChart(m.At, loc, first, last); ok {
			views = append(views, markView{Label: m.Label, Date: date, off: off})
		}
	}
	return views
}

// markViews places the marks ms (see datedMarks) on a chart of span as
// vertical lines. Each label stays inside the chart, on the first of two
// rows where it does not run into the previous label; with no room, the
// line stays and the label is only in its tooltip and the caption.
func (g geometry) markViews(ms []markView, span time.Duration) []markView {
	if len(ms) == 0 {
		return nil
	}
	views := make([]markView, len(ms))
	rowEnd := [2]float64{math.Inf(-1), math.Inf(-1)}
	for k, mv := range ms {
		x := g.chartX(mv.off, span)
		mv.X, mv.Y1, mv.Y2 = num(x), num(g.Top), num(g.bottom())
		if !g.Phone { // a phone has no room for the labels: the tooltip and the caption say them
			w := 5.6 * float64(len([]rune(mv.Label))) // about 5.6 units a character at 10 px
			left := x - w/2
			mv.Anchor = "middle"
			switch {
			case x+w/2 > g.W-2:
				mv.Anchor, left = "end", x-w
			case x-w/2 < 2:
				mv.Anchor, left = "start", x
			}
			for r := range rowEnd {
				if left > rowEnd[r]+6 {
					rowEnd[r] = left + w
					mv.Y1, mv.TY, mv.Shown = num(g.Top-10-12*float64(r)), num(g.Top-14-12*float64(r)), true
					break
				}
			}
		}
		views[k] = mv
	}
	return views
}

// thresholds are the dates on which the day length crosses a photoperiod
// threshold: the first day at or over it ("↑") or the first day under it
// ("↓"), in date order, with their labels and words but not yet placed (see
// thresholdViews). A crossing in the weeks before today (the index of today
// in days, or -1) is told in the past tense. The words are the same in
// every geometry, so they are found once for both drawings.
func thresholds(days []ChartDay, levels []Level, today int) []thresholdView {
	type crossing struct {
		i  int
		up bool
		lv Level
	}
	var cs []crossing
	for _, lv := range levels {
		for i := 1; i < len(days); i++ {
			was, is := days[i-1].Daylight >= lv.Length, days[i].Daylight >= lv.Length
			if was != is && (lv.Keeps == nil || lv.Keeps(days[i].Date)) {
				cs = append(cs, crossing{i: i, up: is, lv: lv})
			}
		}
	}
	sort.SliceStable(cs, func(a, b int) bool { return cs[a].i < cs[b].i })
	views := make([]thresholdView, len(cs))
	for n, c := range cs {
		label := formatHours(c.lv.Length)
		tv := thresholdView{day: c.i}
		past := c.i < today
		var verb string
		switch {
		case c.up && past:
			tv.Label, verb = label+" ↑", "reached"
		case c.up:
			tv.Label, verb = label+" ↑", "reaches"
		case past:
			tv.Label, verb = label+" ↓", "dropped under"
		default:
			tv.Label, verb = label+" ↓", "drops under"
		}
		tv.Text = fmt.Sprintf("Day length %s %s on %s", verb, label, chartDate(days[c.i].Date, days[0].Date, days[len(days)-1].Date))
		if c.lv.Label != "" {
			tv.Text += " (" + c.lv.Label + ")"
		}
		views[n] = tv
	}
	return views
}

// thresholdViews places the crossings ts (see thresholds) on a chart of n
// days. The labels alternate between two rows, left to right, so that
// neighbours do not overlap.
func (g geometry) thresholdViews(ts []thresholdView, n int) []thresholdView {
	step := g.dayStep(n)
	views := make([]thresholdView, len(ts))
	for k, tv := range ts {
		x := g.Left + float64(tv.day)*step
		tv.X, tv.TX, tv.TY = num(x), num(x+2), num(g.bottom()-4-12*float64(k%2))
		views[k] = tv
	}
	return views
}

// chartSpan is the time a chart of the dates first..last covers, from
// first's midnight to the midnight after last.
func chartSpan(first, last time.Time) time.Duration { return last.Add(24 * time.Hour).Sub(first) }

// onChart is where the instant at falls on the chart of the dates
// first..last in loc (see wallClock): the time from first's midnight on the
// local clock, and its date as the chart writes it (see chartDate); false
// when it is outside the chart.
func onChart(at time.Time, loc *time.Location, first, last time.Time) (time.Duration, string, bool) {
	at = wallClock(at, loc)
	off := at.Sub(first)
	if off < 0 || off >= chartSpan(first, last) {
		return 0, "", false
	}
	return off, chartDate(at.UTC(), first, last), true
}

// chartX is the x of a time off after the start of a chart of span (see
// onChart).
func (g geometry) chartX(off, span time.Duration) float64 {
	return g.Left + g.PlotW*off.Hours()/span.Hours()
}

// datedPhases are the new and full Moons within first..last, dated but not
// yet placed (see phaseViews): the same in every geometry, so found once
// for both drawings.
func datedPhases(phases []Phase, loc *time.Location, first, last time.Time) []phaseView {
	var views []phaseView
	for _, p := range phases {
		if off, date, ok := onChart(p.At, loc, first, last); ok {
			views = append(views, phaseView{Full: p.Full, Date: date, off: off})
		}
	}
	return views
}

// phaseViews places the new and full Moons ps (see datedPhases) on the row
// above the plot of a chart of span.
func (g geometry) phaseViews(ps []phaseView, span time.Duration) []phaseView {
	if len(ps) == 0 {
		return nil
	}
	views := make([]phaseView, len(ps))
	for k, p := range ps {
		p.X, p.Y = num(g.chartX(p.off, span)), num(g.Top-6)
		views[k] = p
	}
	return views
}

// chartDate writes a date of the chart as "7 Nov", with the year ("7 Nov
// 2026") when the same day of another year is also in the chart, first..last
// (a chart of more than a year).
func chartDate(t, first, last time.Time) string {
	if !t.AddDate(1, 0, 0).After(last) || !t.AddDate(-1, 0, 0).Before(first) {
		return t.Format("2 Jan 2006")
	}
	return t.Format("2 Jan")
}

// stretchDates writes the dates a..b of a stretch of the chart first..last as
// chartDate does, except that a, in another year than b, gets its year when
// b has one: "from 5 Dec 2026 to 4 Dec 2027", never "from 5 Dec to 4 Dec
// 2027", which reads backwards.
func stretchDates(a, b, first, last time.Time) (string, string) {
	from, to := chartDate(a, first, last), chartDate(b, first, last)
	if a.Year() != b.Year() && to != b.Format("2 Jan") {
		from = a.Format("2 Jan 2006")
	}
	return from, to
}

// todayMark is the line at days[i], today's date (see todayIndex); nil when
// today is not in the chart (i < 0).
func (g geometry) todayMark(i int, days []ChartDay) *todayView {
	if i < 0 {
		return nil
	}
	x := g.Left + (float64(i)+0.5)*g.dayStep(len(days))
	tv := &todayView{X: num(x), TX: num(x + 3), TY: num(g.bottom() + 26), Y2: num(g.bottom() + 12), Date: days[i].Date.Format("2 Jan 2006"),
		PastW: num(float64(i) * g.dayStep(len(days)))}
	if g.Phone { // no label under the plot: the line ends at it
		tv.Y2 = num(g.bottom())
	}
	return tv
}

// todayIndex is the index of today's date in days, -1 when it is not in
// the chart (or today is not set).
func todayIndex(today time.Time, days []ChartDay) int {
	if today.IsZero() || len(days) == 0 {
		return -1
	}
	i := int(math.Round(today.Sub(days[0].Date).Hours() / 24))
	if i < 0 || i >= len(days) {
		return -1
	}
	return i
}

// formatHours writes a day length as "12 h" or "14 h 30 min".
func formatHours(d time.Duration) string {
	return feed.Amount(time.Duration(math.Round(clipHours(d)*60)) * time.Minute)
}

func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}
