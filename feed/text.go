package feed

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
	"time"
	"unicode"
	"unicode/utf8"

	"heliocal/astro"
	"heliocal/config"
)

// Cautions appended to descriptions that someone could rely on for legal
// purposes or for their eyes.
const (
	cautionLegal = "Computed for planning; local rules decide legal times such as hunting hours, " +
		"lighting-up times and aviation night."
	cautionEyes = "Never look directly at the Sun."
)

// dirString is a direction's name, "" when unset.
func dirString(d astro.Direction) string {
	if d == 0 {
		return ""
	}
	return d.String()
}

// localClock formats an instant, rounded to the second (ToSecond), as
// site-local clock time with the zone's label: LocalClock, "06:47:12 CET".
func localClock(t time.Time, loc *time.Location) string { return LocalClock(ToSecond(t), loc, true) }

// ShownTwice reports whether the clocks of t's zone (t.Location()) show
// t's reading at another instant too: t is in the hour (or the time) they
// show again when they go back, before the change (its first pass) or after
// it (its second). The iCalendar writer writes such a time in UTC, and the
// served tables write its zone's label beside it.
func ShownTwice(t time.Time) bool {
	start, end := astro.ZonePeriod(t) // its end after t past the zone data's last transition too
	_, off := t.Zone()
	if !end.IsZero() {
		if _, next := end.Zone(); shownAgain(off, next, end.Sub(t)) > 0 {
			return true
		}
	}
	return secondPass(t, start)
}

// secondPass reports whether t, in the period of its zone that begins at
// start (astro.ZonePeriod), is the second pass of a reading the clocks
// show twice: within the time they went back at start.
func secondPass(t, start time.Time) bool {
	if start.IsZero() {
		return false
	}
	_, off := t.Zone()
	_, prev := start.Add(-time.Second).Zone()
	back := time.Duration(prev-off) * time.Second
	return back > 0 && t.Sub(start) < back
}

// secondPass is the package's secondPass of t in its zone's period, the
// offsets looked up in z: the reading of t is the second that day when the
// offset before t's period was ahead of it by more than t is into it.
func (z *zoneCache) secondPass(t time.Time) bool {
	u := t.Unix()
	_, off := z.at(u)
	from := z.from
	if from == math.MinInt64 {
		return false
	}
	_, prev := z.at(from - 1)
	return prev > off && u-from < prev-off
}

// shownAgain is how far the clocks go back at a change of offset from off
// to next (seconds east of UTC) that comes toChange after an instant whose
// reading they show again after it (the instant is in the first pass of
// the repeated hour); 0 when they do not go back, or not so far.
func shownAgain(off, next int, toChange time.Duration) time.Duration {
	back := time.Duration(off-next) * time.Second
	if back <= 0 || toChange > back {
		return 0
	}
	return back
}

// ZoneLabel is how the texts name a zone at an instant: its abbreviation
// ("CET", "EDT"), or, where the time zone database has none and gives the
// offset instead ("-03", "+0530"), that offset from UTC with a true minus
// sign: "UTC−03", "UTC+05:30". A bare "-03" after a clock reads as a
// subtraction ("04:30:00 -03–06:55:13").
func ZoneLabel(abbr string) string {
	if len(abbr) != 3 && len(abbr) != 5 || abbr[0] != '+' && abbr[0] != '-' {
		return abbr
	}
	for _, c := range abbr[1:] {
		if c < '0' || c > '9' {
			return abbr
		}
	}
	sign := "+"
	if abbr[0] == '-' {
		sign = config.MinusSign
	}
	if len(abbr) == 3 {
		return "UTC" + sign + abbr[1:]
	}
	return "UTC" + sign + abbr[1:3] + ":" + abbr[3:]
}

// zoneLabelOf is the ZoneLabel of t's zone at t.
func zoneLabelOf(t time.Time) string {
	abbr, _ := t.Zone()
	return ZoneLabel(abbr)
}

// LocalClock is t in loc as "15:04:05" and the zone's label (ZoneLabel):
// "06:47:12 CET", "06:21:46 UTC−03"; to the minute ("06:47 CET") when
// seconds is false. t is used as given (round it first).
func LocalClock(t time.Time, loc *time.Location, seconds bool) string {
	lt := t.In(loc)
	if seconds {
		h, m, sec := lt.Clock()
		return string(appendClockZone(make([]byte, 0, 16), h, m, sec, zoneLabelOf(lt)))
	}
	return lt.Format("15:04 ") + zoneLabelOf(lt)
}

// appendClockZone appends a clock to the second and a zone's label
// (ZoneLabel), "06:47:12 CET": the one way the descriptions write an
// instant (localClock, zoneCache.appendClock, the lamp periods).
func appendClockZone(b []byte, h, m, sec int, zone string) []byte {
	b = append(b, byte('0'+h/10), byte('0'+h%10), ':', byte('0'+m/10), byte('0'+m%10), ':', byte('0'+sec/10), byte('0'+sec%10), ' ')
	return append(b, zone...)
}

// zoneCache answers a zone's offset and label (ZoneLabel) at an instant from
// the last period of the zone it looked up (the instants from..to-1, Unix
// seconds, in which the zone keeps one offset and name), so that the
// entries of a feed, written in time order kind after kind, look the zone
// up about twice a year instead of several times per entry. It is not safe
// for concurrent use.
type zoneCache struct {
	loc      *time.Location
	from, to int64 // from inclusive, to exclusive; from > to before the first look-up
	off      int64 // seconds east of UTC
	name     string
	// seen are the first periods looked up (lookup): a feed's kinds,
	// its plans and its lamps' checks each go through the window from
	// its first date again, and find them here
	seen  [8]zonePeriod
	nseen int
}

// zonePeriod is a period of a zone, as zoneCache holds it.
type zonePeriod struct {
	from, to, off int64
	name          string
}

func newZoneCache(loc *time.Location) *zoneCache {
	return &zoneCache{loc: loc, from: 1, to: 0}
}

// at returns the zone's label (ZoneLabel) and offset (seconds east of UTC) at
// the Unix second u.
func (z *zoneCache) at(u int64) (string, int64) {
	if u < z.from || u >= z.to {
		z.lookup(u)
	}
	return z.name, z.off
}

// nextChange is the Unix second of the zone's first change after the Unix
// second u, the end of u's period (math.MaxInt64: none after u).
func (z *zoneCache) nextChange(u int64) int64 {
	if u < z.from || u >= z.to {
		z.lookup(u)
	}
	return z.to
}

// lookup caches the zone's period of the Unix second u, for at and
// nextChange: they, without it, are small enough to be written in place
// where they are called.
func (z *zoneCache) lookup(u int64) {
	for i := range z.nseen {
		if p := &z.seen[i]; u >= p.from && u < p.to {
			z.name, z.off, z.from, z.to = p.name, p.off, p.from, p.to
			return
		}
	}
	lt := time.Unix(u, 0).In(z.loc)
	name, off := lt.Zone()
	name = ZoneLabel(name)
	from, to := astro.ZonePeriod(lt)
	z.name, z.off, z.from, z.to = name, int64(off), math.MinInt64, math.MaxInt64
	if !from.IsZero() {
		z.from = from.Unix()
	}
	if !to.IsZero() {
		z.to = to.Unix()
	}
	if z.nseen < len(z.seen) {
		z.seen[z.nseen] = zonePeriod{from: z.from, to: z.to, off: z.off, name: z.name}
		z.nseen++
	}
}

// day is the number of days since 1970-01-01 of the local date of t.
func (z *zoneCache) day(t time.Time) int64 { return z.dayOf(t.Unix()) }

// dayOf is the number of days since 1970-01-01 of the local date of the
// Unix second u.
func (z *zoneCache) dayOf(u int64) int64 {
	_, off := z.at(u)
	return floorDiv(u+off, secondsPerDay)
}

// date is the local date of t at 00:00 UTC, as localDate gives it.
func (z *zoneCache) date(t time.Time) time.Time {
	return time.Unix(z.day(t)*secondsPerDay, 0).UTC()
}

// appendClock appends localClock(t, z.loc) to b, the zone looked up in z.
func (z *zoneCache) appendClock(b []byte, t time.Time) []byte {
	b, _ = z.appendClockDay(b, t)
	return b
}

// appendStamp appends t as t.In(z.loc).Format("Mon 2 Jan 2006 15:04 ")
// writes it (the clock to the minute, cut, not rounded) and the zone's
// label looked up in z (ZoneLabel): "Sat 9 Jan 2027 17:31 CET".
func (z *zoneCache) appendStamp(b []byte, t time.Time) []byte {
	u := t.Unix()
	name, off := z.at(u)
	days := floorDiv(u+off, secondsPerDay)
	d := time.Unix(days*secondsPerDay, 0).UTC()
	y, m, day := d.Date()
	if name == "" || y < 1000 || y > 9999 {
		lt := t.In(z.loc)
		return append(lt.AppendFormat(b, "Mon 2 Jan 2006 15:04 "), zoneLabelOf(lt)...)
	}
	b = append(append(b, d.Weekday().String()[:3]...), ' ')
	b = append(append(strconv.AppendInt(b, int64(day), 10), ' '), m.String()[:3]...)
	b = strconv.AppendInt(append(b, ' '), int64(y), 10)
	s := daySeconds(u + off)
	h, min := s/3600, s/60%60
	b = append(b, ' ', byte('0'+h/10), byte('0'+h%10), ':', byte('0'+min/10), byte('0'+min%10), ' ')
	return append(b, name...)
}

// appendDays appends the mark of an instant n local dates after the date
// it is listed under (see DayMark): nothing for 0, " +1 day", " −2 days".
func appendDays(b []byte, n int64) []byte {
	switch {
	case n == 0:
		return b
	case n == 1:
		return append(b, " +1 day"...)
	case n > 1:
		return append(strconv.AppendInt(append(b, " +"...), n, 10), " days"...)
	case n == -1:
		return append(b, " "+config.MinusSign+"1 day"...)
	}
	return append(strconv.AppendInt(append(b, " "+config.MinusSign...), -n, 10), " days"...)
}

// appendOtherDay appends, after the clock time of an instant on the local
// date at in a description of an entry listed under the date d (a plan's
// time, an event moved past midnight by its offset, a span's end: see
// appendDayOf), which date it is: " the next day (Mon 13 Mar)", " the day
// before (Sat 11 Mar)", " on Wed 15 Mar"; nothing when at is d.
func appendOtherDay(b []byte, at, d time.Time) []byte {
	return appendOtherDayNumber(b, floorDiv(at.Unix(), secondsPerDay), floorDiv(d.Unix(), secondsPerDay))
}

// appendOtherDayNumber is appendOtherDay of two dates given as days since
// 1970-01-01: the instant's day and the entry's, nothing written when they
// are the same day.
func appendOtherDayNumber(b []byte, day, ref int64) []byte {
	if day == ref {
		return b
	}
	at := time.Unix(day*secondsPerDay, 0).UTC()
	switch day - ref {
	case 1:
		return append(at.AppendFormat(append(b, " the next day ("...), "Mon 2 Jan"), ')')
	case -1:
		return append(at.AppendFormat(append(b, " the day before ("...), "Mon 2 Jan"), ')')
	}
	return at.AppendFormat(append(b, " on "...), "Mon 2 Jan")
}

// appendDayOf appends, after the clock time of the instant t (as shown, to
// the second) in a description of an entry listed under the local date d,
// which date t falls on, in the words a plan's description uses: " the next
// day (Sun 10 Jan)", " the day before (Sat 9 Jan)", " on Tue 12 Jan";
// nothing when it is d. Titles and the listing's tables keep the short
// mark (DayMark): " +1 day".
func (z *zoneCache) appendDayOf(b []byte, t, d time.Time) []byte {
	return appendOtherDayNumber(b, z.dayOf(UnixSecond(t)), floorDiv(d.Unix(), secondsPerDay))
}

// dateOf is the local date (00:00 UTC) of the instant t as shown, to the
// second.
func (z *zoneCache) dateOf(t time.Time) time.Time {
	return time.Unix(z.dayOf(UnixSecond(t))*secondsPerDay, 0).UTC()
}

// appendDayBracket appends the date of the instant t against the date ref
// (days since 1970-01-01, endRef), as appendDayOf writes it, and opens the
// bracket that follows the clock time, so that one bracket holds the date
// and what the caller writes next (a length): " the next day (Sun 10 Jan; "
// or " (".
func (z *zoneCache) appendDayBracket(b []byte, t time.Time, ref int64) []byte {
	return appendDayNumberBracket(b, z.dayOf(UnixSecond(t)), ref)
}

// appendDayNumberBracket is appendDayBracket of a date given as days since
// 1970-01-01.
func appendDayNumberBracket(b []byte, day, ref int64) []byte {
	n := len(b)
	if b = appendOtherDayNumber(b, day, ref); len(b) > n && b[len(b)-1] == ')' {
		return append(b[:len(b)-1], ';', ' ')
	}
	return append(b, ' ', '(')
}

// appendSpanDays appends "<start> to <end>" for a span listed under the
// local date d, each clock time followed by its date when it is not d
// (appendDayOf), an end on the start's date not marked again, and opens the
// bracket after the end (appendDayBracket): "18:32:07 MST to 05:45:42 MST
// the next day (Sun 10 Jan; ", "01:04:36 MDT the next day (Sun 7 Nov) to
// 05:04:29 MST (". Each end's zone is looked up once, for its clock time
// and its date.
func (z *zoneCache) appendSpanDays(b []byte, start, end, d time.Time) []byte {
	ref := floorDiv(d.Unix(), secondsPerDay)
	b, sday := z.appendClockDay(b, start)
	b = appendOtherDayNumber(b, sday, ref)
	b, eday := z.appendClockDay(append(b, " to "...), end)
	if eday == sday {
		ref = sday
	}
	return appendDayNumberBracket(b, eday, ref)
}

// appendClockDay is appendClock, and the instant's local date as shown, in
// days since 1970-01-01.
func (z *zoneCache) appendClockDay(b []byte, t time.Time) ([]byte, int64) {
	u := UnixSecond(t)
	name, off := z.at(u)
	s := daySeconds(u + off)
	return appendClockZone(b, s/3600, s/60%60, s%60, name), floorDiv(u+off, secondsPerDay)
}

// endRef is the date (days since 1970-01-01) an end's date is said against
// (appendDayBracket) in a span from start listed under d: the start's date
// when the end falls on it, said once after the start; else d.
func (z *zoneCache) endRef(start, end, d time.Time) int64 {
	if sd := z.dayOf(UnixSecond(start)); sd == z.dayOf(UnixSecond(end)) {
		return sd
	}
	return floorDiv(d.Unix(), secondsPerDay)
}

// floorDiv is a/b rounded towards minus infinity (b > 0).
func floorDiv(a, b int64) int64 {
	if a >= 0 {
		// the usual case, unsigned: a division by a constant b is then
		// a multiplication without the sign's corrections
		return int64(uint64(a) / uint64(b))
	}
	q := a / b
	if a%b < 0 {
		q--
	}
	return q
}

// appendDate appends the date of t as time.DateOnly writes it.
func appendDate(b []byte, t time.Time) []byte {
	y, m, d := t.Date()
	if y < 0 || y > 9999 {
		return t.AppendFormat(b, time.DateOnly)
	}
	return append(b, byte('0'+y/1000), byte('0'+y/100%10), byte('0'+y/10%10), byte('0'+y%10), '-',
		byte('0'+m/10), byte('0'+m%10), '-', byte('0'+d/10), byte('0'+d%10))
}

// NightOf names the night that begins on the evening of the local date d
// (00:00 UTC) in loc: "night of 3–4 March", "night of 31 March–1 April". A
// night belongs to the date of its evening and runs from local noon to local
// noon of the next date that exists in loc (astro.DarkWindows): in
// Pacific/Apia, whose clocks jumped over 30 December 2011, the "night of
// 29–31 December 2011". A nil loc is UTC.
func NightOf(d time.Time, loc *time.Location) string {
	n := d.AddDate(0, 0, 1)
	if loc != nil && skipped(n, loc) {
		n = n.AddDate(0, 0, 1) // the clocks jump over the whole date
	}
	switch {
	case n.Year() != d.Year():
		return "night of " + d.Format("2 January 2006") + "–" + n.Format("2 January 2006")
	case n.Month() != d.Month():
		return "night of " + d.Format("2 January") + "–" + n.Format("2 January 2006")
	}
	return "night of " + d.Format("2") + "–" + n.Format("2 January 2006")
}

// DayMark returns "" when the instant t (as shown, to the second) falls on
// the local date d (00:00 UTC) in loc, else " +1 day" (" +2 days", " −1
// day"): written after the clock time of an event listed under another date,
// such as the after-midnight part of a night, in a title and the tables of
// heliocal events; a description names the date instead (appendDayOf).
func DayMark(t, d time.Time, loc *time.Location) string {
	return string(appendDays(nil, int64(math.Round(localDate(ToSecond(t), loc).Sub(d).Hours()/24))))
}

// Durations are written one way in every title, description and table:
// hours, minutes and seconds, the first unit as a plain number and each
// later one in two digits, "14 h 02 min", "1 min 05 s", "48 min", and zero
// units at the end left out, "14 h", "1 h 00 min 05 s": a lamp period of
// 14 h beside its target reads "14 h, to reach 14 h", not "14 h 00 min, to
// reach 14 h". A measured duration (a day length, a window, a change) is
// rounded to the unit it is shown to, half a unit up, and one that rounds to
// nothing is "0 min" (or "0 s"); a span between two instants is taken
// between the instants as shown, to the second (see ToSecond). An amount
// from the configuration ("1 h before sunset", "past 12 h 30 min") is
// written exactly.

// Length writes a measured duration rounded to unit (time.Minute or
// time.Second): "9 h 05 min", "48 min", "12 h", "0 min", "1 h 42 min 55 s".
func Length(d, unit time.Duration) string { return string(appendDuration(nil, d, unit, false)) }

// Amount writes a configured duration exactly, without zero units at the
// end: "30 min", "1 h", "1 h 05 min", "45 s".
func Amount(d time.Duration) string { return string(appendDuration(nil, d, time.Second, true)) }

// appendDuration appends d, rounded to unit, as the rule above says,
// leaving out zero units at the end; a zero duration is written in the unit
// it is shown to ("0 min", "0 s"), or in hours when trim ("0 h", an amount).
func appendDuration(b []byte, d, unit time.Duration, trim bool) []byte {
	d = d.Round(unit)
	parts := [3]int{int(d / time.Hour), int(d % time.Hour / time.Minute), int(d % time.Minute / time.Second)}
	names := [3]string{" h", " min", " s"}
	last := 1 // the unit shown: minutes
	if unit < time.Minute {
		last = 2
	}
	if trim || d != 0 {
		for last > 0 && parts[last] == 0 {
			last--
		}
	}
	first := 0
	for first < last && parts[first] == 0 {
		first++
	}
	for i := first; i <= last; i++ {
		if i > first {
			b = append(append(b, ' '), byte('0'+parts[i]/10), byte('0'+parts[i]%10))
		} else {
			b = strconv.AppendInt(b, int64(parts[i]), 10)
		}
		b = append(b, names[i]...)
	}
	return b
}

// hm writes a measured duration to the minute: "9 h 05 min", "48 min",
// "14 h"; one that lasts but rounds to no minute is "under 1 min", never
// "0 min".
func hm(d time.Duration) string { return string(appendHM(nil, d)) }

// appendHM appends hm(d) to b.
func appendHM(b []byte, d time.Duration) []byte {
	if d < 0 {
		return appendDuration(b, d, time.Minute, false)
	}
	if d > 0 && d < 30*time.Second { // a dark window of 19 s is not "0 min"
		return append(b, "under 1 min"...)
	}
	// whole minutes, half a minute up (d.Round for d ≥ 0), divided
	// unsigned (see floorDiv)
	ud := uint64(d)
	mins := ud / uint64(time.Minute)
	if ud%uint64(time.Minute) >= uint64(30*time.Second) {
		mins++
	}
	h, m := int64(mins/60), int(mins%60)
	switch {
	case h > 0 && m == 0: // whole hours: "14 h", as a target or an amount
		return append(strconv.AppendInt(b, h, 10), " h"...)
	case h == 0 && m < 10:
		return append(b, byte('0'+m), ' ', 'm', 'i', 'n')
	case h == 0:
		return append(b, byte('0'+m/10), byte('0'+m%10), ' ', 'm', 'i', 'n')
	case h < 10:
		b = append(b, byte('0'+h), ' ', 'h', ' ')
	case h < 100: // a day length, a lamp period of half a day
		b = append(b, byte('0'+h/10), byte('0'+h%10), ' ', 'h', ' ')
	default:
		b = append(strconv.AppendInt(b, h, 10), " h "...)
	}
	return append(b, byte('0'+m/10), byte('0'+m%10), ' ', 'm', 'i', 'n')
}

// SpanLength writes the length of a band's span to the minute as hm does,
// "2 h 16 min", and a span of days near a pole (AroundTheClock) in days:
// "83 days 23 h 09 min", not "2015 h 09 min"; whole days as rounded are
// "1 day", "3 days", not "1 day 0 min".
func SpanLength(d time.Duration) string { return string(appendSpanLength(nil, d)) }

// appendSpanLength appends SpanLength(d) to b.
func appendSpanLength(b []byte, d time.Duration) []byte {
	if d < 24*time.Hour-30*time.Second { // under a day as rounded; appendHM rounds
		return appendHM(b, d)
	}
	d = d.Round(time.Minute)
	days := int64(d / (24 * time.Hour))
	b = strconv.AppendInt(b, days, 10)
	if days == 1 {
		b = append(b, " day"...)
	} else {
		b = append(b, " days"...)
	}
	if d%(24*time.Hour) == 0 {
		return b
	}
	return appendDuration(append(b, ' '), d%(24*time.Hour), time.Minute, false)
}

// Change formats a signed day-length change as "+1 min 30 s", "−2 min 05 s"
// or "−32 s"; a change under half a second either way is "+0 s", never
// "−0 s".
func Change(d time.Duration) string { return string(appendChange(nil, d)) }

// appendChange appends Change(d) to b.
func appendChange(b []byte, d time.Duration) []byte {
	// the sign is that of the change as shown, to the second
	if d = d.Round(time.Second); d < 0 {
		b, d = append(b, config.MinusSign...), -d
	} else {
		b = append(b, '+')
	}
	return appendDuration(b, d, time.Second, false)
}

// days formats a long duration as "92 d 18 h", or "89 d" when it rounds to
// whole days (never "89 d 0 h").
func days(d time.Duration) string {
	d = d.Round(time.Hour)
	n, h := int(d/(24*time.Hour)), int((d%(24*time.Hour))/time.Hour)
	if h == 0 {
		return fmt.Sprintf("%d d", n)
	}
	return fmt.Sprintf("%d d %d h", n, h)
}

// degrees formats an angle with one decimal and a proper minus sign; an
// angle that rounds to zero has none ("0.0°", never "−0.0°").
func degrees(a float64) string {
	s := fmt.Sprintf("%.1f°", a)
	if s == "-0.0°" {
		return "0.0°"
	}
	return config.Minus(s)
}

// height says how high a body is in a title: "35.2° high" (with the word
// given) above the horizon, "10.4° below the horizon" under it, never a
// negative height.
func height(alt float64, above string) string {
	a := math.Round(alt*10) / 10
	if a < 0 {
		return degrees(-a) + " below the horizon"
	}
	return degrees(math.Abs(a)) + " " + above
}

// siteInfo is a site with its description, formatted once per feed.
type siteInfo struct {
	*config.Site
	where    string // "Name (48.200° N, 16.400° E)"
	zone     *zoneCache
	band     *bandText // the band kind last written
	flatRise float64   // flatRiseAltitude: the Sun's centre rises over a flat horizon through it
	// rise is the altitude through which the Sun's centre rises over the
	// site's horizon altitude (`horizon: 2`), flatRise without one or with a
	// skyline.
	rise float64
}

// newSiteInfo returns the siteInfo of s, for one goroutine (its zone cache).
func newSiteInfo(s *config.Site) *siteInfo {
	o := PlaceOf(s).Observer
	si := &siteInfo{Site: s, where: where(s), zone: newZoneCache(s.TimeZone.Location), flatRise: flatRiseAltitude(o)}
	si.rise = si.flatRise
	if s.OwnHorizon() {
		si.rise = o.RiseSetAltitude()
	}
	return si
}

// riseHorizon names the horizon the Sun rises over at s, as a solar noon
// near it says: "a flat horizon", or "the site's horizon, 2° high" for a
// horizon altitude (s.rise).
func (s *siteInfo) riseHorizon() string {
	if s.rise != s.flatRise {
		return "the site's horizon, " + horizonHeight(s.Horizon)
	}
	return "a flat horizon"
}

// RefractionText names the refraction rise and set are computed with:
// "standard refraction", or "refraction for 1030 hPa and −20 °C".
func RefractionText(o astro.Observer) string {
	if o.Pressure == 0 {
		return "standard refraction"
	}
	return fmt.Sprintf("refraction for %.0f hPa and %s °C", o.Pressure, numberText(math.Round(o.Temperature*10)/10))
}

// Conditions names what the times of site s are computed for besides its
// place, when that is not a flat horizon and the standard refraction: its
// horizon ("horizon 1.5°", "horizon −0.8°", "horizon 0°" for a level one
// written, with no dip, or a skyline in SkylineText's
// words) and its air ("refraction for 1030 hPa and −20 °C", RefractionText),
// joined by a comma; "" for neither. The events table's heading, the index's
// place lines and the served page's list of sites say it in these words.
func (s Site) Conditions() string {
	var words []string
	switch {
	case s.Skyline.Points > 0:
		words = append(words, SkylineText(s.Skyline))
	case s.Horizon != 0 || s.HorizonSet:
		words = append(words, "horizon "+AltitudeText(s.Horizon))
	}
	if s.Pressure != 0 {
		words = append(words, RefractionText(astro.Observer{Pressure: s.Pressure, Temperature: s.Temperature}))
	}
	return strings.Join(words, ", ")
}

// SkylineText is a skyline in a few words: "skyline 1–14° (8 points)",
// with the file it was read from, if any: "(8 points, hills.csv)". A
// skyline that dips below eye level has its range in words, with a proper
// minus sign, "skyline −1° to 3°", where a dash would read as a second minus.
func SkylineText(f SkylineFacts) string {
	from := ""
	if f.File != "" {
		from = ", " + f.File
	}
	span := strconv.FormatFloat(f.Low, 'f', -1, 64) + "–" + strconv.FormatFloat(f.High, 'f', -1, 64) + "°"
	if f.Low < 0 {
		span = AltitudeText(f.Low) + " to " + AltitudeText(f.High)
	}
	return fmt.Sprintf("skyline %s (%d points%s)", span, f.Points, from)
}

// AltitudeText writes an altitude with a proper minus sign and no plus:
// "−0.8°", "3°".
func AltitudeText(v float64) string { return numberText(v) + "°" }

// numberText writes v with the digits it needs and a proper minus sign:
// "−20", "1.5".
func numberText(v float64) string {
	return config.Minus(strconv.FormatFloat(v, 'f', -1, 64))
}

// where names site s in a text with its coordinates: "Fernhollow Mixed Farm
// (48.260° N, 15.920° E)"; a place named by its coordinates alone, as
// `events --lat --lon` and ad-hoc feeds name it ("45.0000° S, 72.0000° W"), is
// written once: "45.000° S, 72.000° W".
func where(s *config.Site) string {
	c := Coords(s.Latitude, s.Longitude, 3)
	if s.Name == "" || s.Name == CoordsName(s.Latitude, s.Longitude) {
		return c
	}
	return s.Name + " (" + c + ")"
}

var plainNames = map[string]string{
	"sunrise":           "Sunrise",
	"sunset":            "Sunset",
	"sun-hidden":        "Sun behind the skyline",
	"noon-clear":        "Noon Sun and the skyline",
	"solar-noon":        "Solar noon",
	"civil-dawn":        "Civil dawn",
	"civil-dusk":        "Civil dusk",
	"nautical-dawn":     "Nautical dawn",
	"nautical-dusk":     "Nautical dusk",
	"astronomical-dawn": "Astronomical dawn",
	"astronomical-dusk": "Astronomical dusk",
	"golden-hour":       "Golden hour",
	"blue-hour":         "Blue hour",
	"march-equinox":     "March equinox",
	"june-solstice":     "June solstice",
	"september-equinox": "September equinox",
	"december-solstice": "December solstice",
	"cross-quarter":     "Cross-quarter day",
	"perihelion":        "Perihelion",
	"aphelion":          "Aphelion",
	"new-moon":          "New moon",
	"first-quarter":     "First quarter",
	"full-moon":         "Full moon",
	"last-quarter":      "Last quarter",
	"moonrise":          "Moonrise",
	"moonset":           "Moonset",
	"moon-transit":      "Moon highest",
	"dark-window":       "Dark sky",
	"solar-eclipse":     "Solar eclipse",
	"lunar-eclipse":     "Lunar eclipse",
}

// twilightMeaning says what each twilight threshold means (common
// practice: the almanac offices' definitions of the three twilights).
var twilightMeaning = map[string]string{
	"civil-dawn":        "Civil dawn: the Sun's centre is rising through 6° below the horizon; from now there is usually light enough for outdoor work without lamps.",
	"civil-dusk":        "Civil dusk: the Sun's centre is setting through 6° below the horizon; from now outdoor work usually needs lamps.",
	"nautical-dawn":     "Nautical dawn: the Sun's centre is rising through 12° below the horizon; the sea horizon becomes visible.",
	"nautical-dusk":     "Nautical dusk: the Sun's centre is setting through 12° below the horizon; the sea horizon fades from view.",
	"astronomical-dawn": "Astronomical dawn: the Sun's centre is rising through 18° below the horizon; from now the Sun begins to brighten the sky.",
	"astronomical-dusk": "Astronomical dusk: the Sun's centre is setting through 18° below the horizon; from now the Sun no longer brightens the sky (the Moon and city lights may).",
}

// CalendarCaution is the caution every calendar carries once, in its
// description, for a site whose rise and set are computed for observer o:
// the times are computed (with the refraction RefractionText names:
// "standard atmospheric refraction", or "refraction for 1030 hPa and
// −20 °C" for a site with pressure_hpa or temperature_c), and where a time
// has legal weight local rules decide. Entries repeat the legal part only
// where their time is itself a limit in such rules (civil dawn and dusk:
// aviation night).
func CalendarCaution(o astro.Observer) string {
	refr := "standard atmospheric refraction"
	if o.Pressure != 0 {
		refr = RefractionText(o)
	}
	return "Caution: times are computed for planning from the site's coordinates, a flat or " +
		"configured horizon and " + refr + "; real conditions move them by a minute or more. " +
		"Where a time has legal weight (hunting hours, aviation night, lighting-up times, curfews) local rules " +
		"and their official tables decide, not this calendar. " + cautionEyes
}

// CalendarDescription is the description of feed f of site s: the feed's
// own text, what the entries of each of its kinds mean (kindMeanings:
// written once here, not on each of hundreds of entries that only differ
// in their times) and CalendarCaution, with the eye protection an eclipse
// needs (calendarEclipseCaution) when the feed has solar eclipses.
func CalendarDescription(s *config.Site, f *config.Feed) string {
	var b strings.Builder
	if f.Description != "" {
		b.WriteString(f.Description + "\n\n")
	}
	if m := kindMeanings(s, f.Kinds); len(m) > 0 {
		b.WriteString(strings.Join(m, "\n") + "\n\n")
	}
	b.WriteString(CalendarCaution(PlaceOf(s).Observer))
	if hasKind(f.Kinds, "solar-eclipse") {
		b.WriteString(" " + calendarEclipseCaution)
	}
	return b.String()
}

// calendarEclipseCaution follows CalendarCaution in the description of a
// calendar with solar eclipses: the caution each eclipse entry carries
// (cautionEclipse), said of the calendar as the README says it.
var calendarEclipseCaution = "During a solar eclipse, n" + cautionEclipse[1:]

// hasKind says whether specs have the kind name, alone or in a group.
func hasKind(specs []config.KindSpec, name string) bool {
	for _, spec := range specs {
		for _, k := range spec.Kind.Members() {
			if k.Name == name {
				return true
			}
		}
	}
	return false
}

// kindMeanings are the sentences that say what the entries of the kinds of
// specs mean, once for each kind (a group's members included) whose entries
// leave it out: sunrise and sunset, the twilights, golden hour, blue hour,
// sun bands, the Moon's kinds (moonMeaning) and supplemental lighting (lightingMeaning, with what counts as
// natural light and the advice for lamps once). Their entries say what they are and give their own times
// and numbers ("Civil dawn at 06:14:47 CET."); the meaning is the same on
// every date.
func kindMeanings(s *config.Site, specs []config.KindSpec) []string {
	var out, thresholds []string
	azimuth, lighting, civilLight := false, false, false
	add := func(m string) {
		if m != "" && !slices.Contains(out, m) {
			out = append(out, m)
		}
	}
	var filters, filterKinds []string // the filters' phrases, and the kinds of each
	for _, spec := range specs {
		if name, m := filterMeaning(spec); m != "" {
			if i := slices.Index(filters, m); i >= 0 {
				filterKinds[i] += "\x00" + Small(name)
			} else {
				filters, filterKinds = append(filters, m), append(filterKinds, name)
			}
		}
		if spec.Kind.Name == config.KindLighting {
			add(lightingMeaning(s, spec))
			lighting, civilLight = true, civilLight || spec.Natural == config.NaturalCivil
			continue
		}
		for _, k := range spec.Kind.Members() {
			switch k.Name {
			case "golden-hour", "blue-hour":
				lo, hi := spec.Band()
				add(bandMeaning(k, lo, hi))
			case config.KindSunBand:
				add(bandMeaning(k, k.Altitude, k.High))
			case "sunrise", "sunset":
				add(kindMeaning(s, k.Name))
				azimuth = true
			case "moonrise", "moonset":
				add(moonMeaning(s, k.Name, 0))
				azimuth = true
			case "dark-window", "new-moon", "first-quarter", "full-moon", "last-quarter", "moon-transit":
				add(moonMeaning(s, k.Name, spec.MaxIllumination))
			case "photoperiod":
				if t := amount(k.DayLength); !slices.Contains(thresholds, t) {
					thresholds = append(thresholds, t)
				}
			default:
				add(kindMeaning(s, k.Name))
			}
			add(minDurationMeaning(k, spec.MinDuration.D()))
		}
	}
	if len(thresholds) > 0 {
		out = append(out, photoperiodMeaning(s, thresholds))
	}
	for i, m := range filters { // "Golden hour, blue hour and sunset: only on …"
		out = append(out, AndList(strings.Split(filterKinds[i], "\x00"))+": only "+m+".")
	}
	if azimuth {
		out = append(out, azimuthMeaning)
	}
	if civilLight {
		out = append(out, civilLightMeaning)
	}
	if lighting {
		out = append(out, lightingAdvice)
	}
	return out
}

// filterMeaning says on which dates the weekdays, months and dates filters
// of a kinds entry keep its entries, which a subscriber does not see
// otherwise: the kind's name and "on Fridays and Saturdays, in June, July
// and August" ("" without filters).
func filterMeaning(spec config.KindSpec) (name, phrase string) {
	var days [7]bool
	var months [13]bool
	for _, w := range spec.Weekdays {
		if d, ok := config.ParseWeekday(w); ok {
			days[d] = true
		}
	}
	for _, m := range spec.Months {
		if mm, ok := config.ParseMonth(m); ok {
			months[mm] = true
		}
	}
	var parts, names []string
	for i := range 7 {
		if d := time.Weekday((i + 1) % 7); days[d] { // Monday first
			names = append(names, d.String()+"s")
		}
	}
	if len(names) > 0 {
		parts = append(parts, "on "+AndList(names))
	}
	names = nil
	for m := time.January; m <= time.December; m++ {
		if months[m] {
			names = append(names, m.String())
		}
	}
	if len(names) > 0 {
		parts = append(parts, "in "+AndList(names))
	}
	if dates := config.ListedDates(spec.Dates); len(dates) > 0 {
		slices.SortFunc(dates, time.Time.Compare)
		names = nil
		for _, d := range dates {
			names = append(names, d.Format("2 January 2006"))
		}
		parts = append(parts, "on "+AndList(names))
	}
	if len(parts) == 0 {
		return "", ""
	}
	return Capital(plainName(spec.Kind)), strings.Join(parts, ", ")
}

// Capital writes s with its first letter a capital, as a sentence or a
// title begins: "total solar eclipse" is "Total solar eclipse".
func Capital(s string) string {
	r, n := utf8.DecodeRuneInString(s)
	if u := unicode.ToUpper(r); u != r {
		return string(u) + s[n:]
	}
	return s
}

// Small writes s with its first letter a small one, as the text is read
// within a sentence: "Polar night" is "polar night"; the twin of Capital.
func Small(s string) string {
	r, n := utf8.DecodeRuneInString(s)
	if l := unicode.ToLower(r); l != r {
		return string(l) + s[n:]
	}
	return s
}

// AndList joins words as a sentence lists them: "a", "a and b", "a, b and
// c".
func AndList(words []string) string {
	if len(words) < 2 {
		return strings.Join(words, "")
	}
	return strings.Join(words[:len(words)-1], ", ") + " and " + words[len(words)-1]
}

// minDurationMeaning says, once in the calendar's description, that the
// spans of kind k shorter than its min_duration d are left out, and that a
// date (a night) of a daily span kind left without one has a note saying
// so; "" when d is 0 or the kind has no spans to leave out.
func minDurationMeaning(k config.Kind, d time.Duration) string {
	if d <= 0 {
		return ""
	}
	switch k.Name {
	case "golden-hour", "blue-hour", config.KindSunBand:
		return fmt.Sprintf("%s: spans under %s are left out; a date that has only shorter ones gets a note saying so.", plainName(k), amount(d))
	case "dark-window":
		return fmt.Sprintf("Dark sky: windows under %s are left out; a night that has only shorter ones gets a note saying so.", amount(d))
	case "solar-eclipse", "lunar-eclipse":
		return fmt.Sprintf("%s: spans under %s are left out.", plainNames[k.Name], amount(d))
	}
	return ""
}

// azimuthMeaning says how sunrise, sunset, moonrise and moonset entries
// give their direction.
const azimuthMeaning = "Azimuths are in degrees from the north through the east (90° east, 180° south)."

// photoperiodMeaning is the meaning of the photoperiod kinds of a feed at
// site s, with their thresholds ("12 h", "14 h 30 min"): one line for all.
func photoperiodMeaning(s *config.Site, thresholds []string) string {
	what, of := "Day length", "day length (sunrise to sunset)"
	if len(s.Skyline) > 0 {
		what, of = "Direct Sun", "the hours of direct Sun over the site's skyline"
	}
	return what + " " + strings.Join(thresholds, ", ") + ": the dates on which " + of +
		" rises past or falls below the threshold; lighting programmes for greenhouses and livestock are set by such thresholds."
}

// kindMeaning is the meaning of a sunrise, a sunset, a twilight's dawn or
// dusk, a solar noon, a daily summary or a cross-quarter day at site s, ""
// for other kinds.
func kindMeaning(s *config.Site, kind string) string {
	if m, ok := twilightMeaning[kind]; ok {
		return m
	}
	switch kind {
	case "cross-quarter":
		return "Cross-quarter day: the Sun is midway in ecliptic longitude between an equinox and a solstice (315°, 45°, 135°, 225°); " +
			"many farm calendars mark these midpoints of the seasons."
	case "solar-noon":
		return "Solar noon: the Sun crosses the meridian, its highest of the day."
	case "daily-summary":
		if len(s.Skyline) > 0 {
			return "Direct Sun: the day's civil dawn, sunrise and sunset over the site's skyline (the Sun's first " +
				"appearance and last disappearance) and civil dusk, to the minute, and how long the Sun is over the skyline."
		}
		return "Daylight: the day's civil dawn, sunrise, sunset and civil dusk, to the minute, and the day length, " +
			"from sunrise to the sunset that ends the day."
	}
	if kind != "sunrise" && kind != "sunset" {
		return ""
	}
	return limbMeaning(s, kind, "Sun", kind == "sunrise")
}

// limbMeaning is the meaning of the rise (rising) or set of body ("Sun",
// "Moon") at site s, kind its kind's name, in the terms the time is
// computed in: "Sunrise: the Sun's upper limb appears on the horizon
// (standard refraction)." over a flat horizon at sea level, "…appears over
// a horizon 1.0° below eye level, as seen from 1150 m (…)" over the flat
// horizon lowered by the dip of an elevation, "…appears over the site's
// horizon, 2° high (standard refraction for that altitude)." for a horizon
// altitude (no dip; "the site's level horizon" for one written 0), and
// "…first appears over the site's skyline (…)" for a skyline.
func limbMeaning(s *config.Site, kind, body string, rising bool) string {
	var air astro.Observer
	air.Pressure, air.Temperature = airOf(s)
	verb, refr := "disappears below the horizon", RefractionText(air)
	if rising {
		verb = "appears on the horizon"
	}
	// "standard refraction for that altitude", "refraction for 1030 hPa
	// and −20 °C at that altitude"
	at := " for "
	if air.Pressure != 0 {
		at = " at "
	}
	switch {
	case len(s.Skyline) > 0:
		verb, refr = "last disappears behind the site's skyline", refr+at+"the skyline's altitude"
		if rising {
			verb = "first appears over the site's skyline"
		}
	case s.OwnHorizon():
		over := "the site's horizon, " + horizonHeight(s.Horizon)
		if s.Horizon == 0 {
			over = "the site's level horizon"
		}
		verb, refr = "disappears behind "+over, refr+at+"that altitude"
		if rising {
			verb = "appears over " + over
		}
	case s.Elevation > 0:
		over := "a horizon " + dipText(astro.Dip(s.Elevation)) + " below eye level, as seen from " +
			strconv.FormatFloat(s.Elevation, 'f', -1, 64) + " m"
		verb = "disappears behind " + over
		if rising {
			verb = "appears over " + over
		}
	}
	return plainNames[kind] + ": the " + body + "'s upper limb " + verb + " (" + refr + ")."
}

// dipText writes the dip of the horizon d (degrees) as the meaning of rise
// and set names it: in degrees to a tenth from 1°, "1.0°", and in whole
// arcminutes below, "17′" (from 90 m), never less than "1′".
func dipText(d float64) string {
	m := math.Round(d * 60)
	if m >= 60 {
		return strconv.FormatFloat(d, 'f', 1, 64) + "°"
	}
	return strconv.FormatFloat(max(m, 1), 'f', 0, 64) + "′"
}

// horizonHeight says how high a site's horizon altitude h is: "2° high",
// "1.5° high", "0.8° below eye level" (a sea horizon seen from a height),
// "level" for 0.
func horizonHeight(h float64) string {
	if h == 0 {
		return "level"
	}
	d := AltitudeText(math.Abs(h))
	if h < 0 {
		return d + " below eye level"
	}
	return d + " high"
}

// bandMeaning is the meaning of the spans of a band kind (golden hour,
// blue hour, a sun band) between the altitudes low and high.
func bandMeaning(k config.Kind, low, high float64) string {
	name, light := plainNames[k.Name], map[string]string{
		"golden-hour": "low, warm sunlight and long shadows, for photography and events",
		"blue-hour":   "no direct sunlight; an even, deep blue sky, for photography with the lights on",
	}[k.Name]
	if k.Name == config.KindSunBand {
		name, light = bandBase(low, high), "a band of the Sun's altitude chosen for this feed"
	}
	return name + ": the Sun's centre is between " + between(low, high) + "; " + light + "."
}

// bandBase is a sun band's name: "Sun between +2° and +12°".
func bandBase(low, high float64) string {
	return "Sun between " + signedDegrees(low) + " and " + signedDegrees(high)
}

// categories are the CATEGORIES of a kind: a family word and the kind's name.
func categories(k config.Kind) []string {
	name := plainNames[k.Name]
	switch k.Name {
	case "sun-altitude":
		name = "Sun altitude"
	case config.KindSunBand:
		name = "Sun band"
	case "photoperiod":
		name = "Day length"
	case "daily-summary":
		name = "Daylight"
	case config.KindLighting:
		name = "Supplemental lighting"
	case "seasons":
		name = "Season"
	}
	family := "Sun"
	if strings.Contains(k.Name, "moon") || k.Name == "first-quarter" || k.Name == "last-quarter" || k.Name == "dark-window" || k.Name == "lunar-eclipse" {
		family = "Moon"
	}
	return []string{family, name}
}

// offsetTitle names a shifted event: "30 min before sunrise",
// "1 h 15 min after sunset".
func offsetTitle(offset time.Duration, title string) string {
	word := "after"
	if offset < 0 {
		word, offset = "before", -offset
	}
	return amount(offset) + " " + word + " " + Small(title)
}

// amount is Amount: "30 min", "1 h", "1 h 15 min", "45 s".
func amount(d time.Duration) string { return Amount(d) }

// describe gives the title, its form in a row of the event's date among
// other dates when that says otherwise (RowTitle), and the plain-language
// description of an event.
func describe(s *siteInfo, e Event) (title, row, desc string) {
	if b, title, ok := appendDaily(nil, s, &e); ok {
		return title, "", string(b)
	}
	loc := s.TimeZone.Location
	at := localClock(e.Start, loc)
	var b strings.Builder
	b.Grow(320)
	title = plainNames[e.Kind.Name]
	switch e.Kind.Name {
	case "noon-clear":
		if e.Direction == astro.Rising {
			title = "The noon Sun clears the skyline again"
			fmt.Fprintf(&b, "From today the Sun is over the skyline at solar noon (%s, %s high).", at, degrees(e.Altitude))
		} else {
			const stays = "The noon Sun stays behind the skyline from "
			title, row = stays+"today", stays+"this date"
			fmt.Fprintf(&b, "From today the Sun is behind the skyline at solar noon (%s, %s high), until it clears it again.", at, degrees(e.Altitude))
		}
	case "sun-hidden":
		title = fmt.Sprintf("Sun behind the skyline for %s", hm(ToSecond(e.End).Sub(ToSecond(e.Start))))
		fmt.Fprintf(&b, "The Sun goes behind the skyline at %s, towards %s (%.0f°), and comes out again at %s.",
			at, astro.CompassPoint(e.Azimuth), e.Azimuth, localClock(e.End, loc))
	case "solar-noon":
		title = "Solar noon, Sun " + height(e.Altitude, "high")
		// what solar noon is, in the calendar's description (kindMeaning)
		fmt.Fprintf(&b, "Solar noon at %s, the Sun at %s altitude", at, degrees(e.Altitude))
		switch {
		case e.Altitude > s.rise && e.Altitude < 0:
			// the date's sunrise and sunset come before and after: the
			// refraction (and the dip, or a horizon below eye level) keep
			// its upper limb in view
			title = "Solar noon, Sun on the horizon"
			b.WriteString(", its centre below the horizon, its upper limb in view over " + s.riseHorizon() + ".\n" + cautionEyes)
		case e.Altitude <= s.rise && e.Altitude > s.flatRise:
			// up over a flat horizon, but the site's raised horizon hides
			// it: the date has no sunrise there
			if e.Altitude < 0 {
				b.WriteString(", its centre below the horizon")
			}
			b.WriteString(", its upper limb behind " + s.riseHorizon() + ".")
		case e.Altitude < 0:
			b.WriteString(", its centre below the horizon.")
		default:
			b.WriteString(".\n" + cautionEyes)
		}
	case "sun-altitude":
		verb := DirectionWord(e) + " through"
		title = fmt.Sprintf("Sun %s %s", verb, degrees(e.Kind.Altitude))
		fmt.Fprintf(&b, "The Sun's centre is %s %s altitude at %s.", verb, degrees(e.Kind.Altitude), at)
		if e.Kind.Altitude > -1 {
			b.WriteString("\n" + cautionEyes) // the Sun may be in view
		}
	case "march-equinox", "june-solstice", "september-equinox", "december-solstice":
		season := seasonStarted(e.Kind.Name, s.Latitude)
		fmt.Fprintf(&b, "%s at %s (%s UTC).\nStart of astronomical %s in the %s hemisphere; it lasts %s, until the next equinox or solstice.",
			title, at, ToSecond(e.Start).UTC().Format("2006-01-02 15:04:05"), season, hemisphere(s.Latitude), days(e.SeasonLength()))
		b.WriteString(FutureNote(e.Start))
		title = fmt.Sprintf("%s: %s begins", title, season) // lower case after the colon, as every title
	case "cross-quarter":
		fmt.Fprintf(&b, "Cross-quarter day at %s (%s UTC): the Sun reaches ecliptic longitude %s°, midway between %s.", at, ToSecond(e.Start).UTC().Format("2006-01-02 15:04:05"), e.Part, crossQuarterBetween[e.Part])
		b.WriteString(FutureNote(e.Start))
	case "perihelion", "aphelion":
		near := "closest to"
		if e.Kind.Name == "aphelion" {
			near = "farthest from"
		}
		title = fmt.Sprintf("%s: Earth %s the Sun", title, near)
		fmt.Fprintf(&b, "Earth is %s the Sun at %s (%s UTC): %.6f au (%s km).", near, at,
			ToSecond(e.Start).UTC().Format("2006-01-02 15:04:05"), e.Distance(), FormatCount(int(math.Round(e.Distance()*149597870.7))))
		b.WriteString(FutureNote(e.Start))
	case "photoperiod":
		what := "Day length"
		if e.DirectSun {
			what = "Direct Sun"
		}
		if e.Direction == astro.Rising {
			title = fmt.Sprintf("%s rising past %s", what, amount(e.Kind.DayLength))
		} else {
			title = fmt.Sprintf("%s falling below %s", what, amount(e.Kind.DayLength))
		}
		length := hm(e.DayLength)
		if shown := e.DayLength.Round(time.Minute); (e.Direction == astro.Rising) != (shown >= e.Kind.DayLength) {
			// to the minute it would read as the threshold itself ("falling
			// below 12 h: up for 12 h"): to the second instead
			length = Length(e.DayLength, time.Second)
		}
		change := Change(e.DayChange)
		switch {
		case e.DirectSun:
			fmt.Fprintf(&b, "%s today: the Sun is over the site's skyline for %s (%s from the day before).", title, length, change)
		case e.DayLength >= 24*time.Hour: // the first date of the midnight Sun
			fmt.Fprintf(&b, "%s today: the Sun does not set (%s from the day before).", title, change)
		case e.DayLength <= 0: // the first date of the polar night
			fmt.Fprintf(&b, "%s today: the Sun does not rise (%s from the day before).", title, change)
		default:
			fmt.Fprintf(&b, "%s today: the Sun is up for %s (%s from the day before), sunrise to sunset.", title, length, change)
		}
	case "solar-eclipse", "lunar-eclipse":
		title, desc = describeEclipse(s, e)
		return title, "", desc
	default:
		return describeMoon(s, e)
	}
	return title, row, b.String()
}

// appendDescription appends the description of e to b and returns the
// title and its row's form: describe without its intermediate strings for
// the daily kinds that make up most feeds (see appendDaily).
func appendDescription(b []byte, s *siteInfo, e *Event) (_ []byte, title, row string) {
	if b, title, ok := appendDaily(b, s, e); ok {
		return b, title, ""
	}
	title, row, desc := describe(s, *e)
	return append(b, desc...), title, row
}

// longDayEnd is what a sunset that ends the midnight Sun says in place of
// a day length (Event.LongDay), in the words of the daily summary's
// "the Sun then stays up for more than a day: midnight sun".
const longDayEnd = "It ends the midnight sun: the Sun had stayed up for more than a day."

// appendDaily appends the description of a sunrise, a sunset or a dawn or
// dusk of the three twilights to b, with its title; ok is false, and b
// unchanged, for the other kinds.
func appendDaily(b []byte, s *siteInfo, e *Event) (_ []byte, title string, ok bool) {
	switch e.Kind.Name {
	case "sunrise", "sunset":
		// what a sunrise is (the upper limb, the refraction) is in the
		// calendar's description (kindMeaning), as is the caution
		title = plainNames[e.Kind.Name]
		b = append(b, title...)
		if e.DirectSun {
			b = append(b, " over the skyline"...)
		}
		b = append(s.zone.appendClock(append(b, " at "...), e.Start), ", azimuth "...)
		b = append(appendAzimuthWords(b, e), ").\n"...)
		if e.LongDay {
			return append(b, longDayEnd...), title, true
		}
		if e.DirectSun {
			b = append(b, "Direct Sun over the skyline "...)
		} else {
			b = append(b, "Day length "...)
		}
		b = append(appendHM(b, e.DayLength), " ("...)
		return append(appendChange(b, e.DayChange), " from the day before)."...), title, true
	case "civil-dawn", "civil-dusk", "nautical-dawn", "nautical-dusk", "astronomical-dawn", "astronomical-dusk":
		title = plainNames[e.Kind.Name]
		// the threshold's meaning is in the calendar's description
		// (kindMeaning); civil dawn and dusk bound aviation night
		b = append(s.zone.appendClock(append(append(b, title...), " at "...), e.Start), '.')
		if strings.HasPrefix(e.Kind.Name, "civil") {
			b = append(append(b, '\n'), cautionLegal...)
		}
		return b, title, true
	case "golden-hour", "blue-hour", config.KindSunBand:
		bt := s.bandText(e)
		part, days, glow := spanPart(e, s.flatRise)
		title = bt.title(part)
		z := s.zone
		b = append(append(b, title...), " from "...)
		if e.Open {
			b = z.appendDayOf(z.appendClock(b, e.Start), e.Start, e.Date)
			b = append(b, " to past the end of this calendar"...)
		} else {
			b = append(appendSpanLength(z.appendSpanDays(b, e.Start, e.End, e.Date), span(e.Start, e.End)), ')')
		}
		switch {
		case days:
			b = append(append(append(b, ": the Sun's centre stays between "...), between(e.Low, e.High)...), " day and night"...)
		case e.Kind.Name != config.KindSunBand:
			b = appendMerged(b, e, glow)
		}
		b = append(b, '.')
		if bt.eyes && !glow {
			b = append(append(b, '\n'), cautionEyes...)
		}
		return b, title, true
	}
	return b, "", false
}

// partGlow stands, in bandText.title, for the part "all-day" of a span in
// which the Sun does not rise; partDays for a span longer than a day.
const (
	partGlow = "glow"
	partDays = "days"
)

// spanPart is the part of a band's span e as its title names it (see
// bandPartWords): partDays when the Sun stays in the band for more than a
// day (near a pole), partGlow for a span through noon of a Sun that does
// not rise over a flat horizon (its centre at most flatRise: polar night),
// which is twilight glow with no Sun to look at, else e.Part.
func spanPart(e *Event, flatRise float64) (part string, days, glow bool) {
	days = AroundTheClock(*e)
	glow = e.Part == "all-day" && e.Altitude <= flatRise && e.High > flatRise
	switch {
	case days:
		return partDays, true, glow
	case glow:
		return partGlow, false, true
	}
	return e.Part, false, false
}

// bandPartWords are the words in brackets after the name of the band kind
// in the title of a span of part p (spanPart): partName's, but "through
// midday" for a sun band's one span through noon (a high band's usual day,
// not a low Sun).
func bandPartWords(kind, p string) string {
	if kind == config.KindSunBand && (p == "all-day" || p == partGlow) {
		return "through midday"
	}
	return partName(p)
}

// SpanWords are the words a feed's title gives the part of a band's span
// (golden hour, blue hour, sun-band), in brackets after the band's name:
// "morning", "evening", "morning and evening in one", "around midnight",
// "twilight glow, Sun below the horizon", "around the clock", "through
// midday"; "" for the events of other kinds. o is the site's observer:
// its elevation and air set the altitude at which the Sun rises over a
// flat horizon, which tells twilight glow.
func SpanWords(e Event, o astro.Observer) string {
	if !isBand(e.Kind) {
		return ""
	}
	p, _, _ := spanPart(&e, flatRiseAltitude(o))
	return bandPartWords(e.Kind.Name, p)
}

// appendMerged appends to b, after a golden or blue hour's times, why a
// span of part "all-day" or "night" is one span, with the Sun's highest
// (lowest) altitude in it: the morning and evening spans meet because the
// Sun stays under the band's upper bound all day (over its lower bound all
// night); glow says that the Sun does not rise in the span.
func appendMerged(b []byte, e *Event, glow bool) []byte {
	if !glow && !MergedSpan(*e) {
		return b // a morning or an evening: nothing to add (and no altitude to write)
	}
	alt := degreesWithin(e.Altitude, e.Low, e.High)
	switch {
	case glow:
		b = append(b, ": the Sun does not rise (its centre at most "...)
		b = append(append(b, alt...), "), the light is twilight glow and the morning and evening spans meet"...)
	case e.Part == "all-day":
		b = append(append(b, ": the Sun's centre stays below "...), signedDegrees(e.High)...)
		b = append(append(append(b, " (at most "...), alt...), "), so the morning and evening spans meet"...)
	case e.Part == "night":
		b = append(append(b, ": the Sun's centre stays above "...), signedDegrees(e.Low)...)
		b = append(append(append(b, " (at least "...), alt...), "), so the evening and morning spans meet"...)
	}
	return b
}

// degreesWithin is degrees for an altitude a that lies strictly between
// the band's bounds lo and hi (the Sun's highest or lowest in one of its
// spans): where rounding to a tenth would put it on a bound or past it
// ("at least 6.0°" in a golden hour, which ends at +6°), it is cut to the
// tenth inside the band instead (5.9°).
func degreesWithin(a, lo, hi float64) string {
	r := math.Round(a*10) / 10
	switch {
	case r >= hi && a < hi:
		return degrees(math.Floor(a*10) / 10)
	case r <= lo && a > lo:
		return degrees(math.Ceil(a*10) / 10)
	}
	return degrees(a)
}

// bandText is the text of a band kind's spans (golden hour, blue hour, a
// sun-band) that is the same on every date, written once per feed; what the
// band means is in the calendar's description (bandMeaning).
type bandText struct {
	name      string
	low, high float64
	base      string // "Golden hour", "Sun between +2° and +12°"
	eyes      bool   // the Sun may be in view: the spans carry cautionEyes
	parts     []string
	titles    []string // by part: "Golden hour (morning)"
}

// bandText returns the text of e's band, built once per feed.
func (s *siteInfo) bandText(e *Event) *bandText {
	if bt := s.band; bt != nil && bt.name == e.Kind.Name && bt.low == e.Low && bt.high == e.High {
		return bt
	}
	bt := &bandText{name: e.Kind.Name, low: e.Low, high: e.High, base: plainNames[e.Kind.Name], eyes: e.High > -1}
	if e.Kind.Name == config.KindSunBand {
		bt.base = bandBase(e.Low, e.High)
	}
	s.band = bt
	return bt
}

// title is the title of the band's span of part p.
func (bt *bandText) title(p string) string {
	for i, q := range bt.parts {
		if q == p {
			return bt.titles[i]
		}
	}
	t := bt.base + " (" + bandPartWords(bt.name, p) + ")"
	bt.parts, bt.titles = append(bt.parts, p), append(bt.titles, t)
	return t
}

// Uncertain returns how uncertain the instant t is because the Earth's
// rotation after the last observation (2023) is a forecast (astro's future
// ΔT: 9 s per decade), rounded to the second, when that reaches half a
// minute (from about 2057); otherwise zero.
func Uncertain(t time.Time) time.Duration {
	u := astro.FutureUncertainty(t).Round(time.Second)
	if u < 30*time.Second {
		return 0
	}
	return u
}

// FutureNote is the sentence that tells a reader how uncertain a
// far-future instant is ("" when Uncertain is zero).
func FutureNote(t time.Time) string {
	u := Uncertain(t)
	if u == 0 {
		return ""
	}
	return fmt.Sprintf("\nUncertain by about ±%s: the Earth's rotation this far ahead is a forecast.", roughly(u))
}

// roughly writes an uncertainty as "40 s" or "1 min 20 s" rounded to 10 s.
func roughly(d time.Duration) string { return Amount(d.Round(10 * time.Second)) }

// between writes the bounds of a band signed, "−4° and +6°", also when
// both are below the horizon, "−6° and −4°": golden and blue hour side by
// side in one description read in one convention.
func between(lo, hi float64) string {
	return signedDegrees(lo) + " and " + signedDegrees(hi)
}

// signedDegrees writes an altitude with its sign: "−4°", "+6°", "0°".
func signedDegrees(v float64) string {
	d := AltitudeText(v)
	if v > 0 {
		return "+" + d
	}
	return d
}

// azimuthText is an event's azimuth in whole degrees with its compass
// point, e.g. "125°, south-east".
func azimuthText(e Event) string {
	return string(appendDegrees(nil, &e)) + ", " + astro.CompassPoint(e.Azimuth)
}

// appendAzimuthWords appends an event's azimuth as a sunrise's text has
// it, its compass point in brackets without the closing one: "112°
// (east-south-east".
func appendAzimuthWords(b []byte, e *Event) []byte {
	return append(append(appendDegrees(b, e), " ("...), astro.CompassPoint(e.Azimuth)...)
}

// appendDegrees appends an event's azimuth in whole degrees, 0–359: "112°".
func appendDegrees(b []byte, e *Event) []byte {
	if az := math.Round(e.Azimuth) - 360*math.Floor(math.Round(e.Azimuth)/360); az >= 0 && az < 360 {
		b = strconv.AppendInt(b, int64(az), 10) // a whole number of degrees, as 'f' with no decimals writes it
	} else {
		b = strconv.AppendFloat(b, az, 'f', 0, 64)
	}
	return append(b, "°"...)
}

var crossQuarterBetween = map[string]string{
	"45":  "the March equinox and the June solstice",
	"135": "the June solstice and the September equinox",
	"225": "the September equinox and the December solstice",
	"315": "the December solstice and the March equinox",
}

// partName is the words for the part p of a band's span in its title
// (an Event's Part, partGlow or partDays).
func partName(p string) string {
	switch p {
	case "all-day":
		return "morning and evening in one"
	case "night":
		return "around midnight"
	case partGlow:
		return "twilight glow, Sun below the horizon"
	case partDays:
		return "around the clock"
	}
	return p
}

func hemisphere(lat float64) string {
	if lat < 0 {
		return "southern"
	}
	return "northern"
}

// seasonStarted is the astronomical season an equinox or solstice starts in
// the site's hemisphere.
func seasonStarted(kind string, lat float64) string {
	north := map[string]string{"march-equinox": "spring", "june-solstice": "summer",
		"september-equinox": "autumn", "december-solstice": "winter"}
	south := map[string]string{"march-equinox": "autumn", "june-solstice": "winter",
		"september-equinox": "spring", "december-solstice": "summer"}
	if lat < 0 {
		return south[kind]
	}
	return north[kind]
}

// FormatCount writes 41210 as "41,210", with grouping commas; every count
// heliocal reports is written this way (publish's sizes beside it).
func FormatCount(n int) string {
	s := strconv.Itoa(n)
	neg := strings.HasPrefix(s, "-")
	s = strings.TrimPrefix(s, "-")
	var b strings.Builder
	for i, r := range s {
		if i > 0 && (len(s)-i)%3 == 0 {
			b.WriteByte(',')
		}
		b.WriteRune(r)
	}
	if neg {
		return "-" + b.String()
	}
	return b.String()
}

// describeNote gives the all-day entry for a date without an event: its
// title, the title's form in a row of the date among other dates when that
// says otherwise (RowTitle), and its description.
func describeNote(s *siteInfo, n Note) (title, row, desc string) {
	above := n.State == astro.AlwaysAbove
	if n.Kind.Name == "photoperiod" {
		t := NotReachedText(n)
		return t, "", t + ": no date of this calendar crosses it."
	}
	if n.Longest > 0 {
		var why string
		title, row, why = underMinimumText(n, s.TimeZone.Location)
		return title, row, title + why + "."
	}
	if n.State == astro.Crosses && !n.Kind.IsMoon() {
		title, row, desc = noEventToday(n.Kind)
		if !n.Dusk.IsZero() {
			// the evening's dusk is known: it comes after midnight
			loc := s.TimeZone.Location
			desc = fmt.Sprintf("No %s on this date: this evening's comes after midnight, at %s on %s",
				strings.ToLower(plainNames[n.Kind.Name]), localClock(n.Dusk, loc), ToSecond(n.Dusk).In(loc).Format("Mon 2 Jan"))
		}
		return title, row, desc + "."
	}
	switch n.Family {
	case "sun-horizon":
		switch {
		case len(s.Skyline) > 0 && above:
			title, row = onDate("The Sun stays over the skyline all day: no sunset", "today", "")
			desc = "The Sun stays over the site's skyline all day and night"
		case n.Hidden:
			title, row = onDate("No direct Sun", "today", ": the Sun stays behind the skyline")
			desc = "The Sun is up but does not get over the site's skyline all day"
		case above:
			title, row = onDate("Midnight sun: the Sun does not set", "today", "")
			desc = "The Sun stays above the horizon all day and night"
		default:
			title, row = onDate("Polar night: the Sun does not rise", "today", "")
			desc = "The Sun stays below the horizon all day"
		}
	case "civil", "nautical", "astronomical":
		deg := map[string]string{"civil": "6°", "nautical": "12°", "astronomical": "18°"}[n.Family]
		switch {
		case above && n.SunUp && len(s.Skyline) > 0:
			// the twilights are counted from the flat horizon, and the Sun
			// may set behind the skyline that day: not "does not set"
			title, row = onDate("No "+n.Family+" dusk or dawn", "today", ": the Sun stays above the flat horizon")
			desc = "The Sun stays above the flat horizon all day and night (the twilights are counted from it, not from the site's skyline)"
		case above && n.SunUp:
			title, row = onDate("No "+n.Family+" dusk or dawn", "today", ": the Sun does not set")
			desc = "The Sun stays above the horizon all day and night"
		case above && !n.Dusk.IsZero():
			// the last date without a dawn: the night before had none,
			// this evening has its dusk
			loc := s.TimeZone.Location
			head := "No " + n.Family + " dawn"
			title = head + " today: " + n.Family + " twilight lasted all last night"
			row = head + " on this date: " + n.Family + " twilight lasted all the night before"
			desc = fmt.Sprintf("The Sun's centre stayed less than %s below the horizon all last night; this evening's %s dusk comes after midnight, at %s on %s",
				deg, n.Family, localClock(n.Dusk, loc), ToSecond(n.Dusk).In(loc).Format("Mon 2 Jan"))
		case above:
			title, row = onDate("No "+n.Family+" dusk or dawn", "tonight", ": "+n.Family+" twilight lasts all night")
			desc = fmt.Sprintf("The Sun's centre stays less than %s below the horizon all night", deg)
		default:
			title, row = onDate("No "+n.Family+" twilight", "today", ": the Sun stays more than "+deg+" below the horizon")
			desc = title
		}
	default:
		switch n.Kind.Name {
		case "golden-hour", "blue-hour":
			name := strings.ToLower(plainNames[n.Kind.Name])
			if above {
				title, row = onDate("No "+name, "today", ": the Sun stays too high")
				desc = fmt.Sprintf("The Sun's centre stays above the %s's altitudes all day and night", name)
			} else {
				title, row = onDate("No "+name, "today", ": the Sun stays too low")
				desc = fmt.Sprintf("The Sun's centre stays below the %s's altitudes all day", name)
			}
		case config.KindSunBand: // the band's bounds as its spans' titles write them
			if above {
				title = "The Sun stays above " + signedDegrees(n.Kind.High) + " all day"
			} else {
				title = "The Sun stays below " + signedDegrees(n.Kind.Altitude) + " all day"
			}
			desc = title
		case "sun-altitude":
			if above {
				title = fmt.Sprintf("The Sun stays above %s all day", degrees(n.Kind.Altitude))
			} else {
				title = fmt.Sprintf("The Sun stays below %s all day", degrees(n.Kind.Altitude))
			}
			desc = title
		default:
			return describeMoonNote(s, n)
		}
	}
	// the site and the date are the entry's LOCATION and date
	return title, row, desc + "."
}

// onDate is the title of a note that names its date as a calendar app shows
// the note on it, head, when ("today", "tonight") and tail, and the title's
// form in a row of the date among other dates (RowTitle), which says "on
// this date" instead.
func onDate(head, when, tail string) (title, row string) {
	return head + " " + when + tail, head + " on this date" + tail
}

// onNight is onDate for a note of a night: "on the night of 5–6 December
// 2026", the night that begins on the evening of d, is "on this night" in
// a row.
func onNight(head string, d time.Time, loc *time.Location, tail string) (title, row string) {
	return head + " on the " + NightOf(d, loc) + tail, head + " on this night" + tail
}

// NotReachedText says that a photoperiod threshold is not crossed in a
// window (a note from the photoperiod kind with DayLength and ExtremeDate
// set): "Day length never reaches 14 h here (longest 12 h 42 min, 21 June)"
// over a year or more, "Day length stays below 14 h from 1 January to 31
// March 2027 (longest …)" over a shorter window; over a window all in polar
// night or midnight Sun, "(the Sun does not rise on these dates)", "(the
// Sun does not set on these dates)".
func NotReachedText(n Note) string {
	target := Amount(n.Kind.DayLength)
	from := n.start() // the window's first date, where a filter moved the note from
	extreme := "longest"
	verb, span := "never reaches", "never reaches"
	if n.State == astro.AlwaysAbove {
		extreme, verb, span = "shortest", "never falls below", "stays at or above"
	} else {
		span = "stays below"
	}
	when := fmt.Sprintf("%s %s here", verb, target)
	switch {
	case n.Last.Equal(from):
		when = fmt.Sprintf("%s %s on %s", span, target, from.Format("2 January 2006"))
	case n.Last.Sub(from) < 364*24*time.Hour:
		when = fmt.Sprintf("%s %s from %s to %s", span, target, from.Format("2 January"), n.Last.Format("2 January 2006"))
	}
	what := "Day length"
	if n.DirectSun {
		what = "Direct Sun"
	}
	// to the minute a longest day of 13 h 59 min 40 s would read "14 h"
	// beside "never reaches 14 h": it is then given to the second
	length := hm(n.DayLength)
	if length == hm(n.Kind.DayLength) {
		length = Length(n.DayLength, time.Second)
	}
	// a window all in polar night or midnight Sun: what the grower sees,
	// not "longest 0 min" or "shortest 24 h" on a date among equals
	dates := "on these dates"
	if n.Last.Equal(from) {
		dates = "on this date"
	}
	sun := ""
	switch {
	case n.State != astro.AlwaysAbove && n.DayLength <= 0 && n.DirectSun:
		sun = "stays behind the skyline"
	case n.State != astro.AlwaysAbove && n.DayLength <= 0:
		sun = "does not rise"
	case n.State == astro.AlwaysAbove && n.DayLength >= 24*time.Hour && n.DirectSun:
		sun = "stays over the skyline all day"
	case n.State == astro.AlwaysAbove && n.DayLength >= 24*time.Hour:
		sun = "does not set"
	}
	if sun != "" {
		return fmt.Sprintf("%s %s (the Sun %s %s)", what, when, sun, dates)
	}
	out := ""
	switch n.ExtremeLeftOut {
	case "months":
		out = ", outside the months this feed keeps"
	case "weekdays":
		out = ", a day of the week this feed leaves out"
	case "dates":
		out = ", not among the dates this feed keeps"
	}
	return fmt.Sprintf("%s %s (%s %s, %s%s)", what, when, extreme, length, n.ExtremeDate.Format("2 January"), out)
}

// noEventToday gives the title, its row's form (onDate) and the
// explanation of a date on which a Sun kind has no event although the Sun
// crosses its threshold on the dates around it.
func noEventToday(k config.Kind) (title, row, desc string) {
	name := strings.ToLower(plainNames[k.Name])
	switch k.Name {
	case "solar-noon":
		title, row = onDate("No solar noon", "today", "")
		return title, row, row + ": the Sun crosses the meridian just before the date begins and just after it ends"
	case "golden-hour", "blue-hour":
		title, row = onDate("No "+name+" begins", "today", "")
		return title, row, row + ": the one that began before it lasts into it"
	case "sun-altitude":
		name = "crossing of " + degrees(k.Altitude)
	case config.KindSunBand:
		// the band in the words of its spans' titles: "Sun between −3° and +3°"
		title, row = onDate("No span with the "+bandBase(k.Altitude, k.High)+" begins", "today", "")
		return title, row, row + ": the one that began before it lasts into it"
	}
	title, row = onDate("No "+name, "today", "")
	return title, row, row + ": around this time of year it comes close to midnight and moves from one date to the next"
}

// describeSummary gives the daily summary of date d: sunrise, sunset, day
// length and civil twilight, with the polar states spelled out, and the
// change of the clocks on d (ClockChange). A sunset
// after midnight that ends d's day is in evs with its own date; carried
// says that d's first sunset ends the day before, and dusk is the civil
// dusk after midnight that ends the twilight of the day before (zero when
// none), marked as that sunset is.
func describeSummary(s *siteInfo, d time.Time, length, delta time.Duration, evs []Event, notes []Note, carried bool, dusk time.Time) (string, string) {
	loc := s.TimeZone.Location
	var b strings.Builder
	title := fmt.Sprintf("Daylight %s", hm(length))
	lengthName := "Day length"
	if len(s.Skyline) > 0 {
		title = fmt.Sprintf("Direct Sun %s", hm(length))
		lengthName = "Direct Sun over the skyline" // what it is: in the calendar's description (kindMeaning)
	}
	midnightSun := slices.ContainsFunc(notes, func(n Note) bool {
		return n.Family == "sun-horizon" && n.State == astro.AlwaysAbove
	})
	if length == 0 && slices.ContainsFunc(notes, func(n Note) bool {
		return n.Family == "sun-horizon" && n.State == astro.AlwaysBelow && !n.Hidden // not behind the hills
	}) {
		// not "Daylight 0 min": the date's state, as its description
		// begins, and not "no daylight" either where the date has civil
		// twilight, which its civil dawn calls light enough for outdoor
		// work
		switch civil := civilTwilight(d, loc, evs); {
		case len(s.Skyline) > 0:
			title = "Polar night: no direct Sun"
		case civil > 0:
			title = "Polar night: civil twilight " + hm(civil)
		default:
			title = "Polar night: the Sun stays below the horizon"
		}
	}
	var said []string // dawn and dusk may give one note twice
	for _, n := range notes {
		if n.SunUp && midnightSun {
			continue // "Midnight sun: the Sun does not set today" says it
		}
		t, _, _ := describeNote(s, n)
		if !slices.Contains(said, t) {
			said = append(said, t)
			b.WriteString(t + ".\n")
		}
	}
	// staysUp: the date's last sunrise, evs[upFrom], has no sunset after
	// it, not even one after midnight (evs has that one when it ends the
	// date's day): the Sun stays up for more than a day, and the day
	// length runs to midnight
	upFrom := -1
	for i, e := range evs {
		switch e.Kind.Name {
		case "sunrise":
			upFrom = i
		case "sunset":
			upFrom = -1
		}
	}
	staysUp := upFrom >= 0
	first := true
	for i, e := range evs {
		fmt.Fprintf(&b, "%s %s", plainNames[e.Kind.Name], LocalClock(ToMinute(e.Start), loc, false))
		switch {
		case e.Kind.Name == "sunset":
			switch {
			case e.Date.After(d):
				fmt.Fprintf(&b, " (after midnight, %s)", e.Date.Format("Mon 2 January"))
			case e.LongDay:
				b.WriteString(" (ending the midnight sun: the Sun had stayed up for more than a day)")
			case carried && first:
				b.WriteString(" (ending the day before)")
			}
			first = false
		case e.Kind.Name == "civil-dusk" && e.Start.Equal(dusk):
			b.WriteString(" (ending the day before)")
		case i == upFrom:
			b.WriteString(" (the Sun then stays up for more than a day: midnight sun)")
		}
		b.WriteString(".\n") // every line a sentence, as the notes' and the last
	}
	switch {
	case delta.Round(time.Second) == 0 && (length == 0 || length == 24*time.Hour):
		// polar night or midnight Sun on both dates: no "+0 s" beside "0 min"
		fmt.Fprintf(&b, "%s %s, the same as the day before.", lengthName, hm(length))
	case staysUp:
		fmt.Fprintf(&b, "%s %s, sunrise to midnight (%s from the day before).", lengthName, hm(length), Change(delta))
	default:
		fmt.Fprintf(&b, "%s %s (%s from the day before).", lengthName, hm(length), Change(delta))
	}
	if c := ClockChange(d, loc); c != "" {
		// the times above carry the offsets on both sides of it
		b.WriteString("\n" + c + ".")
	}
	return title, b.String()
}

// civilTwilight is the time of date d, starting at midnight in loc, that
// the Sun's centre spends above −6°, from the civil dawns and dusks of evs
// as the summary shows them, to the minute: 08:35 to 16:21 is 7 h 46 min.
// A dusk before any dawn ends a twilight that began before the date, and
// a dawn without a dusk after it starts one that lasts past the date's
// end; a dusk after midnight that ends the date's twilight counts on the
// next date.
func civilTwilight(d time.Time, loc *time.Location, evs []Event) time.Duration {
	start, end := midnight(d, loc), midnight(d.AddDate(0, 0, 1), loc)
	from := start
	var sum time.Duration
	in := false
	for _, e := range evs {
		if e.Start.Before(start) || !e.Start.Before(end) {
			continue
		}
		switch e.Kind.Name {
		case "civil-dawn":
			from, in = ToMinute(e.Start), true
		case "civil-dusk":
			sum += ToMinute(e.Start).Sub(from)
			in = false
		}
	}
	if in {
		sum += end.Sub(from)
	}
	return sum
}
