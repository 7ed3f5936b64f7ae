#!/usr/bin/env python3
"""Print the PyEphem (libastro) values that heliocal's tests record as
outside check values for the README's figures on a day across midnight and
on refraction scaled for the air:

    apt-get install -y python3-ephem
    /usr/bin/python3 tools/pyephem-checks/values.py

The tests do not run this script: the values it prints are recorded in them
with this script's name beside each one (cmd/heliocal/readme_test.go
TestReadmeDayAcrossMidnight; feed/change_test.go
TestSummaryShowsSunsetAfterMidnight, TestProfilesDayLengthIsTheSummarys and
TestDayLengthEndOfMidnightSun;
astro/atmosphere_test.go TestRefractionScaling; cmd/heliocal/main_test.go
TestEventsAzimuth; feed/plan_test.go TestPlanEndFirstAfterStart,
TestPlanDateOnlyAnchor, TestPlanEveningStart and TestPlanEndClockPassed; feed/lighting_test.go
TestLightingMinimumNamesTheDroppedPeriod, TestLightingUnderAMinute and TestLightingEntries;
cmd/heliocal/preview_lamps_test.go TestPreviewLampsNoteAsFed and
TestPreviewLampsNoteSubscriptionEnd; astro/sunfrom_test.go
TestSunFromPyEphem).

Definitions, matched to heliocal's:
  * sunrise/sunset: the Sun's centre at -0.8333 deg (upper limb 16' plus 34'
    of refraction at a sea-level flat horizon): Observer with pressure = 0
    (no refraction of PyEphem's own), horizon -0.8333 deg, use_center;
    elevation 0; PyEphem's positions are topocentric, as heliocal's are.
  * refraction scaled for the air (Meeus, Astronomical Algorithms 2nd ed.,
    ch. 16): 34' * (P/1010) * (283/(273+T)), so the threshold is
    -(34' * f + 16'), again with pressure = 0 and use_center.
  * day length: from a sunrise to the next sunset, even past midnight; on
    the date the midnight Sun ends (25 August 2027 at 78.2 N) the stretch
    from local midnight to that last sunset is not counted: the date's day
    runs from its own sunrise (both are printed).
For comparison the script also prints the shifts with PyEphem's own
refraction model (pressure/temp set on the Observer, horizon 0, upper limb):
libastro refracts 37.1' at the horizon at 1010 hPa and 10 C, not 34', so its
shifts are some 10 % larger; they are a different definition, recorded for
reference and checked loosely.
PyEphem takes times as UT (no UT1 - UTC) and uses its own Delta T and solar
theory: agreement with heliocal is expected within about a second for
events at mid latitudes, within a few seconds where the Sun grazes the
horizon (78.2 N, sunset near midnight: about 0.7 deg per hour).
"""

import datetime
import math
from zoneinfo import ZoneInfo

import ephem

SUN = ephem.Sun()
HOUR = ephem.hour


def observer(lat, lon, horizon, pressure=0.0, temp=10.0):
    o = ephem.Observer()
    o.lat, o.lon = str(lat), str(lon)
    o.elevation = 0
    o.pressure = pressure
    o.temp = temp
    o.horizon = str(horizon)
    return o


def iso(d):
    """ephem.Date as ISO 8601 UTC to the millisecond."""
    t = ephem.Date(d).datetime() + datetime.timedelta(microseconds=500)  # rounded, not truncated
    return t.strftime("%Y-%m-%dT%H:%M:%S.") + "%03dZ" % (t.microsecond // 1000)


def fmt_len(s):
    h, r = divmod(s, 3600)
    m, r = divmod(r, 60)
    return "%d h %02d min %06.3f s" % (h, m, r)


def day_across_midnight():
    print("# 78.2 N, 15.6 E, sea level; local dates in CEST (UTC+2, Arctic/Longyearbyen)")
    prev = None
    for date in ("2027/4/15", "2027/4/16"):
        o = observer(78.2, 15.6, -0.8333)
        o.date = ephem.Date(ephem.Date(date) + 22 * HOUR)  # local midnight, 00:00 CEST of the next date
        rise = o.next_rising(SUN, use_center=True)
        o.date = rise
        sset = o.next_setting(SUN, use_center=True)
        length = (sset - rise) * 86400
        local = ephem.Date(rise + 2 * HOUR).datetime().date()
        line = "%s sunrise %s (CEST %s) sunset %s (CEST %s) day %.3f s = %s" % (
            local, iso(rise), ephem.Date(rise + 2 * HOUR), iso(sset), ephem.Date(sset + 2 * HOUR), length, fmt_len(length))
        if prev is not None:
            line += " change %+.3f s" % (length - prev)
        print(line)
        prev = length
    o = observer(78.2, 15.6, -0.8333)
    o.date = sset
    rise = o.next_rising(SUN, use_center=True)
    low = min(_alt(o, ephem.Date(rise + k * ephem.minute)) for k in range(1, 48 * 60))
    print("2027-04-18 sunrise %s (CEST %s), then the midnight Sun: lowest altitude of the next 48 h %.4f deg; "
          "day to 00:00 CEST of the 19th %.3f s" % (
              iso(rise), ephem.Date(rise + 2 * HOUR), low, (ephem.Date("2027/4/18 22:00") - rise) * 86400))


def _alt(o, when):
    """The centre's topocentric altitude in degrees at when (no refraction)."""
    o.date = when
    SUN.compute(o)
    return SUN.alt / ephem.degree


def passages(o, start, n):
    """The Sun's centre's next n passages of o's horizon after start, a
    setting first, then a rising, a setting and on, each found from the one
    before."""
    out = []
    o.date = start
    for i in range(n):
        find = o.next_setting if i % 2 == 0 else o.next_rising
        out.append(find(SUN, use_center=True))
        o.date = out[-1]
    return out


def end_of_midnight_sun():
    print("# 78.2 N, 15.6 E, sea level; the midnight Sun ends: local dates in CEST (UTC+2)")
    o = observer(78.2, 15.6, -0.8333)
    midnight = ephem.Date("2027/8/24 22:00")  # 00:00 CEST, 25 August
    last, rise25, set25, rise26, set26 = passages(o, midnight, 5)
    stretch = (last - midnight) * 86400
    span25, span26 = (set25 - rise25) * 86400, (set26 - rise26) * 86400
    print("midnight Sun sets %s (CEST %s): %.3f s after midnight" % (iso(last), ephem.Date(last + 2 * HOUR), stretch))
    print("2027-08-25 sunrise %s (CEST %s) sunset %s (CEST %s) span %.3f s, day with the stretch %.3f s = %s" % (
        iso(rise25), ephem.Date(rise25 + 2 * HOUR), iso(set25), ephem.Date(set25 + 2 * HOUR), span25, span25 + stretch,
        fmt_len(span25 + stretch)))
    print("2027-08-26 sunrise %s sunset %s day %.3f s change %+.3f s" % (
        iso(rise26), iso(set26), span26, span26 - span25 - stretch))


def midnight_sun_tails():
    """The date on which the midnight Sun ends, at two sites: its last
    sunset after local midnight, then the date's own day (sunrise to the
    sunset after the next midnight), then the next date's."""
    for name, lat, lon, off, midnight in (
            ("78.92 N, 11.93 E, CEST (UT + 2 h), 27-28 August 2027", 78.92, 11.93, 2, "2027/8/26 22:00"),
            ("77.85 S, 166.67 E, NZDT (UT + 13 h), 20-21 February 2027", -77.85, 166.67, 13, "2027/2/19 11:00")):
        print("# %s, sea level" % name)
        o = observer(lat, lon, -0.8333)
        start = ephem.Date(midnight)
        low = min(_alt(o, ephem.Date(start - k * ephem.minute)) for k in range(0, 24 * 60))
        last, rise1, set1, rise2, set2 = passages(o, start, 5)
        print("lowest altitude in the 24 h before the first midnight %.4f deg; midnight Sun sets %s (local %s), %.3f s after midnight" % (
            low, iso(last), ephem.Date(last + off * HOUR), (last - start) * 86400))
        for r, st in ((rise1, set1), (rise2, set2)):
            print("sunrise %s (local %s) sunset %s (local %s) day %.3f s = %s" % (
                iso(r), ephem.Date(r + off * HOUR), iso(st), ephem.Date(st + off * HOUR), (st - r) * 86400, fmt_len((st - r) * 86400)))


def refraction_scaled():
    print("# 48.2 N, 16.4 E, sea level, 2027-01-15 (UT)")

    def rise_set(o, center=True):
        o.date = "2027/1/15"
        return o.next_rising(SUN, use_center=center), o.next_setting(SUN, use_center=center)

    def factor(p, t):
        return p / 1010 * 283 / (273 + t)

    r0, s0 = rise_set(observer(48.2, 16.4, -0.8333))
    print("standard: sunrise %s sunset %s" % (iso(r0), iso(s0)))
    n0 = rise_set(observer(48.2, 16.4, 0, 1010, 10), center=False)
    for name, p, t in (("cold", 1030, -20), ("hot", 1000, 35)):
        r, s = rise_set(observer(48.2, 16.4, -(34 * factor(p, t) + 16) / 60))
        print("%s (%g hPa, %g C), Meeus-scaled 34': sunrise earlier by %.3f s, sunset later by %.3f s, day longer by %.3f s" % (
            name, p, t, (r0 - r) * 86400, (s - s0) * 86400, ((s - r) - (s0 - r0)) * 86400))
        nr, ns = rise_set(observer(48.2, 16.4, 0, p, t), center=False)
        print("%s (%g hPa, %g C), PyEphem's own refraction: sunrise earlier by %.3f s, sunset later by %.3f s, day longer by %.3f s" % (
            name, p, t, (n0[0] - nr) * 86400, (ns - n0[1]) * 86400, ((ns - nr) - (n0[1] - n0[0])) * 86400))


def solstice_sunrise():
    print("# 48.2 N, 16.4 E, sea level, 2027-06-21 (UT; CEST = UT + 2 h)")
    o = observer(48.2, 16.4, -0.8333)
    o.date = "2027/6/21"
    r = o.next_rising(SUN, use_center=True)
    cest = ephem.Date(r + 2 * HOUR).datetime() + datetime.timedelta(microseconds=500000)
    print("sunrise %s, %s CEST to the second" % (iso(r), cest.strftime("%H:%M:%S")))


def _crossings(lat, lon, h, start, hours):
    """The Sun's setting crossings of altitude h (the centre, no refraction)
    in the hours after start: sampled each minute, then bisected. PyEphem's
    next_setting gives up on a night the Sun stays above h."""
    o = observer(lat, lon, 0)
    out, step = [], ephem.minute
    prev = _alt(o, start)
    for k in range(1, int(hours * 60) + 1):
        t = ephem.Date(start + k * step)
        cur = _alt(o, t)
        if prev > h >= cur:
            lo, hi = t - step, t
            for _ in range(40):
                mid = (lo + hi) / 2
                if _alt(o, ephem.Date(mid)) > h:
                    lo = mid
                else:
                    hi = mid
            out.append(ephem.Date((lo + hi) / 2))
        prev = cur
    return out


def plan_ends_past_midnight():
    print("# plans: the first end event after the start (feed/plan_test.go TestPlanEndFirstAfterStart,")
    print("# TestPlanEveningStart, TestPlanDateOnlyAnchor); twilights: the centre at -6/-12/-18 deg")
    print("# 52.3 N, 0 E, sea level, BST (UT + 1 h): the evening of Friday 14 May 2027")
    for name, h in (("nautical dusk", -12), ("astronomical dusk", -18)):
        for t in _crossings(52.3, 0, h, ephem.Date("2027/5/14 12:00"), 18):
            print("%s %s (BST %s)" % (name, iso(t), ephem.Date(t + HOUR)))
    print("# 78.92 N, 11.93 E, sea level, CEST (UT + 2 h)")
    for name, h, start, hours in (
            ("sunset", -0.8333, "2027/9/9 22:00", 72), ("civil dusk", -6, "2027/9/9 22:00", 72),
            ("sunset", -0.8333, "2027/4/13 22:00", 72)):
        for t in _crossings(78.92, 11.93, h, ephem.Date(start), hours):
            print("%s %s (CEST %s)" % (name, iso(t), ephem.Date(t + 2 * HOUR)))
    print("# 78.92 N, 11.93 E: day length, sunrise to sunset, crossing 1 h (local dates, CET/CEST)")
    for day, off in (("2027/2/16", 1), ("2027/2/17", 1), ("2027/2/18", 1), ("2027/2/19", 1),
                     ("2027/10/23", 2), ("2027/10/24", 2), ("2027/10/25", 1), ("2027/10/26", 1)):
        o = observer(78.92, 11.93, -0.8333)
        o.date = ephem.Date(ephem.Date(day) - off * HOUR)  # local midnight
        try:
            rise = o.next_rising(SUN, use_center=True)
            o.date = rise
            sset = o.next_setting(SUN, use_center=True)
            print("%s sunrise %s sunset %s day %s" % (day, iso(rise), iso(sset), fmt_len((sset - rise) * 86400)))
        except ephem.NeverUpError:
            print("%s the Sun does not rise: day 0" % day)


def plan_evening_starts():
    print("# plans at an evening event: the first after the date's noon, past midnight too")
    print("# (feed/plan_test.go TestPlanEveningStart, TestPlanEndClockPassed)")
    print("# 56.5 N, 4.0 W, sea level, BST (UT + 1 h): astronomical dusk (centre at -18 deg), from noon UT of each date")
    for day in ("2027/4/24", "2027/4/30", "2027/5/1", "2027/5/2"):
        ts = _crossings(56.5, -4.0, -18, ephem.Date(day + " 12:00"), 24)
        print("%s evening: %s" % (day, ", ".join("%s (BST %s)" % (iso(t), ephem.Date(t + HOUR)) for t in ts) or "none"))
    print("# 69.7 N, 19.0 E, sea level, CEST (UT + 2 h): sunsets from noon UT of 26 July 2027, three days")
    for t in _crossings(69.7, 19.0, -0.8333, ephem.Date("2027/7/26 12:00"), 72):
        print("sunset %s (CEST %s)" % (iso(t), ephem.Date(t + 2 * HOUR)))


def lamp_periods():
    print("# lamp periods: civil dawn and dusk (centre at -6 deg) and sunrise and sunset, UT")
    for name, lat, lon, h, start in (
            ("78.92 N, 11.93 E, civil, 2027-02-27 (CET = UT + 1 h)", 78.92, 11.93, -6, "2027/2/26 23:00"),
            ("78.92 N, 11.93 E, civil, 2027-10-09 (CEST = UT + 2 h)", 78.92, 11.93, -6, "2027/10/8 22:00"),
            ("35 S, 144.96 E, 2027-01-26 (AEDT = UT + 11 h)", -35.0, 144.96, -0.8333, "2027/1/25 13:00"),
            ("48.2 N, 16.4 E, 2027-04-21 (CEST = UT + 2 h)", 48.2, 16.4, -0.8333, "2027/4/20 22:00")):
        o = observer(lat, lon, h)
        o.date = start
        r = o.next_rising(SUN, use_center=True)
        o.date = r
        s = o.next_setting(SUN, use_center=True)
        length = (s - r) * 86400
        print("%s: rise %s set %s day %.1f s = %s, %.1f s short of 14 h" % (
            name, iso(r), iso(s), length, fmt_len(length), 14 * 3600 - length))


def _local_day_length(o, zone, d):
    """Seconds from the sunrise of the local date d in zone to the sunset
    after it; 24 h on a date the Sun does not rise and is up at noon, 0 on
    one it does not rise and is down, and on the one whose sunrise starts
    the midnight Sun."""
    tz = ZoneInfo(zone)
    utc = datetime.timezone.utc
    start = datetime.datetime(d.year, d.month, d.day, tzinfo=tz)
    end = (start + datetime.timedelta(days=1)).astimezone(utc).replace(tzinfo=None)
    start = start.astimezone(utc).replace(tzinfo=None)
    o.date = ephem.Date(start)
    try:
        r = o.next_rising(SUN, use_center=True)
    except (ephem.AlwaysUpError, ephem.NeverUpError):
        r = None
    if r is None or r.datetime() >= end:
        o.date = ephem.Date(start + datetime.timedelta(hours=12))
        SUN.compute(o)
        return 86400.0 if SUN.alt > 0 else 0.0
    o.date = r
    try:
        return (o.next_setting(SUN, use_center=True) - r) * 86400
    except ephem.AlwaysUpError:  # the rise that starts the midnight Sun
        return 86400.0


def no_lamps_stretches():
    print("# stretches of local dates whose natural day (sunrise to sunset) reaches a lighting target")
    for name, lat, lon, zone, hours, within in (
            ("48.2 N, 16.4 E", 48.2, 16.4, "Europe/Vienna", 16, "2027-06-20"),
            ("69.65 N, 18.96 E", 69.65, 18.96, "Europe/Oslo", 16, "2027-05-20"),
            ("71.29 N, 156.8 W", 71.29, -156.8, "America/Anchorage", 12, "2027-05-20")):
        o = observer(lat, lon, -0.8333)
        day = datetime.timedelta(days=1)
        first = last = datetime.date.fromisoformat(within)
        while _local_day_length(o, zone, first - day) >= hours * 3600:
            first -= day
        while _local_day_length(o, zone, last + day) >= hours * 3600:
            last += day
        print("%s (%s): a day of %d h or more from %s to %s; lamps needed again on %s" % (
            name, zone, hours, first, last, last + day))


def sun_from():
    print("# the Sun from a site at one instant (astro/sunfrom_test.go TestSunFromPyEphem): altitude and")
    print("# azimuth with pressure 0, altitude with pressure 1010 hPa, temp 10 C; PyEphem's Delta T, s")
    for lat, lon, elev, when in (
            (40, -105, 0, "2010/6/21 19:00:00"), (40, -105, 0, "2010/6/21 07:06:00"),
            (51.4769, -0.0005, 0, "1850/3/1 10:00:00"), (48.2, 16.4, 0, "2030/12/21 07:50:00"),
            (-33.9, 151.2, 0, "2041/3/15 02:00:00"), (69.7, 19.0, 500, "2035/6/21 23:00:00"),
            (0, 0, 0, "2100/9/23 12:00:00"), (-77.8, 166.7, 3000, "2060/1/10 05:00:00"),
            (27.98, 86.92, 8000, "2150/5/20 03:30:00")):
        o = ephem.Observer()
        o.lat, o.lon, o.elevation, o.date = str(lat), str(lon), elev, when
        o.pressure = 0
        s = ephem.Sun()
        s.compute(o)
        alt, az = math.degrees(s.alt), math.degrees(s.az)
        o.pressure, o.temp = 1010, 10
        s.compute(o)
        print("%g, %g, %g m, %s UT: altitude %.6f, refracted %.6f, azimuth %.6f; delta T %.3f" % (
            lat, lon, elev, when, alt, math.degrees(s.alt), az, ephem.delta_t(o.date)))


if __name__ == "__main__":
    print("PyEphem %s (libastro)" % ephem.__version__)
    day_across_midnight()
    end_of_midnight_sun()
    midnight_sun_tails()
    refraction_scaled()
    solstice_sunrise()
    plan_ends_past_midnight()
    plan_evening_starts()
    lamp_periods()
    no_lamps_stretches()
    sun_from()
