#!/usr/bin/env python3
"""Audit heliocal against PyEphem where things break: local time zones far
from the Sun's time or with odd offsets, clocks that skip midnight, the
latitudes where the Sun or the Moon stops rising or setting, high sites,
and thresholds near the Sun's highest altitude of the year.

    apt-get install -y python3-ephem
    go build -o /tmp/heliocal ./cmd/heliocal
    /usr/bin/python3 tools/pyephem-checks/edges.py /tmp/heliocal [--from 2027-01-01] [--to 2028-12-31]
        [--jobs 2] [--erfa] [--no-eclipses] [NAME ...]

The definitions and time scales are audit.py's (whose functions this script
uses): PyEphem with pressure 0, the dip of an elevated site, the Moon's
upper limb with heliocal's radius, heliocal's Delta T. Beyond audit.py,
which lists in UTC:

  * each place is listed in its own time zone (--tz), so that the local
    dates an event is filed under are checked: every event's `date` must
    be the local date of its start (a dark window's, the date of the
    evening of its night, local noon to local noon), and every date of a
    daily kind has an event or a note;
  * sun-altitude thresholds just under the Sun's highest altitude of the
    window (0.003 deg and 0.05 deg under it), where a crossing barely
    exists, and -3 deg and +10 deg;
  * dark windows: astronomical night (the Sun's centre below -18 deg)
    while the Moon is down (moonset rule), rebuilt from PyEphem's
    crossings and compared bound by bound;
  * solar and lunar eclipses at the places of
    testdata/reference/eclipses-swiss.csv (Swiss Ephemeris 2.10.03),
    2026-2035: contacts and magnitudes (the library's maximum of a solar
    eclipse whose greatest phase is below the horizon is its last visible
    instant, and its shadow is enlarged by its own rule: see
    astro/eclipse_swiss_test.go for what the Go test allows).

Differences are listed over 1 s (Sun) or 5 s (Moon), with every missing or
extra event and every date without an event or a note. With --erfa (Debian
python3-erfa) each Sun difference over 1 s is set beside ERFA's altitude at
both instants (which one ERFA puts nearer the threshold), and each Sun
event one side lists alone beside ERFA's extreme of the altitude within 20
min (whether the crossing exists): at a crossing that barely happens 0.1"
of altitude moves the time by seconds, and PyEphem's Sun is off by more
than that.
"""

import concurrent.futures
import csv
import datetime
import math
import os
import sys
import zoneinfo

import ephem

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import audit  # noqa: E402
from audit import (SUN_TOL, MOON_TOL, Site, Sky, crossings, heliocal, match_moon,  # noqa: E402
                   match, parse, print_worst, tally, to_ephem, tt_events, tt_of, ecl_lon, ut1_minus_utc)

UTC = datetime.timezone.utc

# name, lat, lon, elevation, zone: chosen to break things
PLACES = [
    # east and west of the date line, far from the Sun's time
    ("Kiritimati", 1.87, -157.40, 0, "Pacific/Kiritimati"),          # +14
    ("Pago Pago", -14.28, -170.70, 0, "Pacific/Pago_Pago"),          # -11
    ("Apia", -13.83, -171.76, 0, "Pacific/Apia"),                    # +13
    ("Nuku'alofa", -21.14, -175.20, 0, "Pacific/Tongatapu"),         # +13
    ("Adak", 51.88, -176.65, 0, "America/Adak"),                     # -10/-9
    ("Anadyr 66.3 N", 66.30, -179.10, 0, "Asia/Anadyr"),             # +12 west of 180
    ("Niue", -19.05, -169.87, 0, "Pacific/Niue"),                    # -11
    # odd offsets
    ("Kathmandu", 27.70, 85.32, 1400, "Asia/Kathmandu"),             # +5:45
    ("Eucla", -31.68, 128.88, 0, "Australia/Eucla"),                 # +8:45
    ("Chatham", -43.95, -176.55, 0, "Pacific/Chatham"),              # +12:45/+13:45
    ("Lord Howe", -31.55, 159.08, 0, "Australia/Lord_Howe"),         # +10:30/+11 (half-hour DST)
    ("Marquesas", -9.80, -139.03, 0, "Pacific/Marquesas"),           # -9:30
    ("St John's", 47.56, -52.71, 0, "America/St_Johns"),             # -3:30/-2:30
    ("Tehran", 35.69, 51.39, 1190, "Asia/Tehran"),                   # +3:30
    # clocks that skip midnight
    ("Santiago", -33.45, -70.67, 570, "America/Santiago"),
    ("Easter Island", -27.11, -109.35, 0, "Pacific/Easter"),
    ("Beirut", 33.89, 35.50, 0, "Asia/Beirut"),
    ("Havana", 23.13, -82.38, 0, "America/Havana"),
    ("Asuncion", -25.26, -57.58, 0, "America/Asuncion"),
    ("Cairo", 30.04, 31.24, 23, "Africa/Cairo"),
    # high sites
    ("Potosi 4070 m", -19.58, -65.75, 4070, "America/La_Paz"),
    ("Mauna Kea 4200 m", 19.82, -155.47, 4200, "Pacific/Honolulu"),
    ("Tibet 4000 m", 30.00, 91.00, 4000, "Asia/Shanghai"),
    ("Andes 4000 m 66 S", -45.00, -71.50, 4000, "America/Santiago"),
    # where the Sun stops rising or setting: 66-67.5 deg
    ("Pangnirtung 66.15 N", 66.15, -65.71, 0, "America/Iqaluit"),
    ("Grimsey 66.54 N", 66.54, -18.02, 0, "Atlantic/Reykjavik"),
    ("Rovaniemi 66.5 N", 66.50, 25.73, 100, "Europe/Helsinki"),
    ("Salekhard 66.53 N", 66.53, 66.60, 0, "Asia/Yekaterinburg"),
    ("Kotzebue 66.9 N", 66.90, -162.60, 0, "America/Nome"),
    ("Bodo 67.28 N", 67.28, 14.40, 0, "Europe/Oslo"),
    ("67.5 N Yakutia", 67.50, 133.40, 0, "Asia/Yakutsk"),
    ("Casey 66.28 S", -66.28, 110.53, 0, "Antarctica/Casey"),
    ("Dumont d'Urville 66.66 S", -66.66, 140.00, 0, "Antarctica/DumontDUrville"),
    ("Rothera 67.57 S", -67.57, -68.13, 0, "Antarctica/Rothera"),
    ("Mawson 67.6 S", -67.60, 62.87, 0, "Antarctica/Mawson"),
    ("66.8 S near 180", -66.80, 179.90, 0, "Pacific/Auckland"),
    # 72 deg
    ("Tiksi 71.64 N", 71.64, 128.87, 0, "Asia/Yakutsk"),
    ("Upernavik 72.79 N", 72.79, -56.15, 0, "America/Nuuk"),
    ("Troll 72.01 S", -72.01, 2.53, 1270, "Antarctica/Troll"),
    ("72 S Ross Sea", -72.00, 175.00, 0, "Antarctica/McMurdo"),
    # 78 deg
    ("Longyearbyen 78.22 N", 78.22, 15.65, 0, "Arctic/Longyearbyen"),
    ("Siorapaluk 77.78 N", 77.78, -70.64, 0, "America/Thule"),
    ("Vostok 78.46 S 3490 m", -78.46, 106.84, 3490, "Antarctica/Vostok"),
    ("Ross Ice Shelf 78.5 S", -78.50, -170.00, 0, "Antarctica/McMurdo"),
]

SUN_KINDS = audit.SUN_KINDS
BANDS = audit.BANDS
MOON_KINDS = audit.MOON_KINDS
PHASES = audit.PHASES
SEASONS = audit.SEASONS
DAILY = list(SUN_KINDS) + ["solar-noon", "moonrise", "moonset", "moon-transit", "golden-hour", "blue-hour",
                           "dark-window"]


def local_midnight(date, zone):
    """The first instant of a local date in UTC: a date whose midnight the
    clocks skip starts at the change (fold 0 takes the offset before it)."""
    return datetime.datetime(date.year, date.month, date.day, tzinfo=zone).astimezone(UTC)


def max_noon_altitude(sky, e0, e1):
    """The Sun's highest altitude at its transits from e0 to e1."""
    return max([-90.0] + [sky.sun_alt(tr) for tr in sky.transits(sky.sun, e0, e1)])


def intervals_below(cr_list, below_at_start, t0, t1):
    """Intervals of [t0, t1] during which a quantity is below its threshold,
    from its sorted crossings ((t, 'rising'|'setting'))."""
    out, start = [], (t0 if below_at_start else None)
    for t, d in cr_list:
        if d == "setting":
            start = t
        elif start is not None:
            out.append((start, t))
            start = None
    if start is not None:
        out.append((start, t1))
    return out


def intersect(a, b):
    out, i, j = [], 0, 0
    while i < len(a) and j < len(b):
        lo, hi = max(a[i][0], b[j][0]), min(a[i][1], b[j][1])
        if lo < hi:
            out.append((lo, hi))
        if a[i][1] < b[j][1]:
            i += 1
        else:
            j += 1
    return out


def check(binary, place, start, end):
    name, lat, lon, elev, tzname = place
    zone = zoneinfo.ZoneInfo(tzname)
    site = Site(name, lat, lon, elev)
    first, last = datetime.date.fromisoformat(start), datetime.date.fromisoformat(end)
    d0, d1 = local_midnight(first, zone), local_midnight(last + datetime.timedelta(days=1), zone)
    before = (first - datetime.timedelta(days=1)).isoformat()
    results, missing = [], []
    sky = Sky(site, d0, d1)
    shift, sun_alt, moon_alt, rate = sky.shift, sky.sun_alt, sky.moon_alt, sky.rate
    e0, e1 = to_ephem(d0) - 1.5, to_ephem(d1) + 1.5

    top = max_noon_altitude(sky, to_ephem(d0), to_ephem(d1))
    near_top = [math.floor((top - 0.003) * 1000) / 1000, math.floor((top - 0.05) * 1000) / 1000]
    altitudes = sorted(set([-3.0, 10.0] + [a for a in near_top if -89 < a < 89]))
    kinds = (list(SUN_KINDS) + ["solar-noon"] + ["sun-altitude:%g" % a for a in altitudes] + list(BANDS) +
             list(MOON_KINDS) + ["moon-transit", "dark-window"] + list(PHASES) + list(SEASONS))
    doc = heliocal(binary, site, before, end, kinds, tz=tzname)
    evs, notes = doc["events"], doc.get("notes", [])

    # local dates: an event's date is the local date of its start (a dark
    # window's, of its night's evening); every date of a daily kind has an
    # event or a note
    seen = {}
    for e in evs:
        s = parse(e["start"]).astimezone(zone)
        want = s.date()
        if e["kind"] == "dark-window" and s.hour < 12:
            want -= datetime.timedelta(days=1)
        if e["date"] != want.isoformat():
            missing.append((e["kind"] + " date", "filed under %s, starts %s local" % (e["date"], s.isoformat()), ""))
        seen.setdefault(e["kind"], set()).add(e["date"])
    for n in notes:
        seen.setdefault(n["kind"], set()).add(n["date"])
    day = first
    while day <= last:
        for k in DAILY:
            if day.isoformat() not in seen.get(k, ()):
                missing.append((k + " date", "no event and no note on %s" % day.isoformat(), ""))
        day += datetime.timedelta(days=1)

    hmoon = -34 / 60 - site.dip()
    thresholds = sorted({fn(site) for fn, _ in SUN_KINDS.values()} | set(altitudes) |
                        {h for b in BANDS.values() for h in b})
    cr = crossings(sun_alt, e0, e1, 10 * ephem.minute, thresholds)
    window = (d0, d1)
    thr = {}  # label -> the Sun's thresholds (deg), for --erfa
    for kind, (fn, direction) in SUN_KINDS.items():
        thr[kind] = [fn(site)]
        ref = [shift(t) for t, d in cr[fn(site)] if d == direction]
        hel = [parse(e["start"]) for e in evs if e["kind"] == kind]
        match(hel, ref, SUN_TOL, window, kind, results, missing, rate(sun_alt))
    for a in altitudes:
        kind = "sun-altitude:%g" % a
        label = "sun-altitude near top" if a in near_top else kind
        for direction in ("rising", "setting"):
            thr.setdefault("%s %s" % (label, direction), []).append(a)
            ref = [shift(t) for t, d in cr[a] if d == direction]
            hel = [parse(e["start"]) for e in evs if e["kind"] == kind and e.get("direction") == direction]
            match(hel, ref, SUN_TOL, window, "%s %s" % (label, direction), results, missing, rate(sun_alt))
    for kind, (lo, hi) in BANDS.items():
        thr[kind + " bounds"] = [lo, hi]
        ref = sorted(shift(t) for h in (lo, hi) for t, d in cr[h])
        hel = []
        for e in evs:
            if e["kind"] != kind:
                continue
            s = parse(e["start"])
            if s >= d0 - datetime.timedelta(hours=1):
                hel.append(s)
            if not e.get("open"):
                hel.append(parse(e["end"]))
        hel = [t for t in hel if t >= d0 - datetime.timedelta(hours=1)]
        match(sorted(hel), ref, SUN_TOL, window, kind + " bounds", results, missing, rate(sun_alt))
    ref = [shift(tr) for tr in sky.transits(sky.sun, e0, e1)]
    hel = [parse(e["start"]) for e in evs if e["kind"] == "solar-noon"]
    match(hel, ref, SUN_TOL, window, "solar-noon", results, missing)

    mc = match_moon(sky, evs, hmoon, e0, e1, window, results, missing)

    # dark windows from PyEphem's crossings (instants as heliocal's UTC)
    t0, t1 = shift(e0), shift(e1)
    dark_sun = intervals_below([(shift(t), d) for t, d in cr[-18.0]], sun_alt(e0) < -18, t0, t1)
    moon_down = intervals_below([(shift(t), d) for t, d in mc[hmoon]], moon_alt(e0) < hmoon, t0, t1)
    dark = intersect(dark_sun, moon_down)
    hel_s, hel_e = [], []
    for e in evs:
        if e["kind"] == "dark-window":
            s, x = parse(e["start"]), parse(e["end"])
            # a spell split at local noon (polar winter) is one interval here
            if s.astimezone(zone).strftime("%H:%M") != "12:00":
                hel_s.append(s)
            if x.astimezone(zone).strftime("%H:%M") != "12:00":
                hel_e.append(x)
    match(hel_s, [a for a, _ in dark], MOON_TOL, window, "dark-window start", results, missing)
    match(hel_e, [b for _, b in dark], MOON_TOL, window, "dark-window end", results, missing)

    for kind, target in PHASES.items():
        ref = tt_events(lambda d: (ecl_lon(ephem.Moon(), d) - ecl_lon(ephem.Sun(), d)), target, e0, e1, 0.5)
        hel = [tt_of(parse(e["start"])) for e in evs if e["kind"] == kind]
        match(hel, ref, MOON_TOL, window, kind + " (TT)", results, missing)
    for kind, target in SEASONS.items():
        hel = [tt_of(parse(e["start"])) for e in evs if e["kind"] == kind]
        erfa = [x for lon, x in ERFA_SEASONS if lon == target]
        # the ERFA table covers 1900-2100
        hel = [x for x in hel if erfa[0] - datetime.timedelta(days=200) < x < erfa[-1] + datetime.timedelta(days=200)]
        match(hel, erfa, SUN_TOL, (tt_of(d0), tt_of(d1)), kind + " (TT, vs ERFA)", results, missing)
    return name, lat, lon, elev, tzname, top, results, missing, thr


ERFA_SEASONS = audit.ERFA_SEASONS_BY_LON


class Erfa:
    """The Sun's topocentric geometric altitude from ERFA (IAU 2006/2000A,
    eraEpv00), the model of testdata/reference/gen_crosscheck_erfa.py, with
    heliocal's time scales (TT - UTC as audit.py takes it, UT1 - UTC from
    its Delta T): the arbiter where heliocal and PyEphem differ at a
    crossing that barely happens, where 0.1" moves the time by seconds."""

    def __init__(self):
        here = os.path.dirname(os.path.abspath(__file__))
        sys.path.insert(0, os.path.join(here, "..", "..", "testdata", "reference"))
        import erfa
        import gen_crosscheck_erfa as g
        self.erfa, self.g = erfa, g

    def altitude(self, dt, lat, lon, elev):
        erfa, g = self.erfa, self.g
        jd = 2440587.5 + dt.timestamp() / 86400
        tt = jd + audit.tt_minus_utc(dt) / 86400
        ut1 = jd + ut1_minus_utc(dt) / 86400
        ra, dec, dist, _ = g.sun_apparent(tt)
        gast = erfa.gst06a(ut1, 0.0, tt, 0.0)
        phi, lam = math.radians(lat), math.radians(lon)
        xyz = erfa.gd2gc(1, lam, phi, elev)
        rc, rs = math.hypot(xyz[0], xyz[1]) / g.A_WGS84, xyz[2] / g.A_WGS84
        h = gast + lam - ra[0]
        d = dist[0] * erfa.DAU / g.A_WGS84
        bx = d * math.cos(dec[0]) * math.cos(h) - rc
        by = -d * math.cos(dec[0]) * math.sin(h)
        bz = d * math.sin(dec[0]) - rs
        up = bx * math.cos(phi) + bz * math.sin(phi)
        return math.degrees(math.asin(up / math.sqrt(bx * bx + by * by + bz * bz)))

    def judge(self, place, label, thresholds, h, r):
        """Which of two instants of a crossing ERFA puts nearer the
        threshold: its altitude minus the threshold at each, in arcsec."""
        _, lat, lon, elev, _ = place
        ah = self.altitude(h, lat, lon, elev)
        t = min(thresholds, key=lambda x: abs(ah - x))
        dh, dr = (ah - t) * 3600, (self.altitude(r, lat, lon, elev) - t) * 3600
        return "ERFA: %+.3f\" from %g at heliocal's instant, %+.3f\" at PyEphem's: %s nearer" % (
            dh, t, dr, "heliocal" if abs(dh) < abs(dr) else "PyEphem")

    def extreme(self, place, thresholds, at):
        """ERFA's extreme of the Sun's altitude within 20 min of an event one
        side lists alone, against the nearest threshold: whether the
        crossing exists."""
        _, lat, lon, elev, _ = place
        f = lambda s: self.altitude(at + datetime.timedelta(seconds=s), lat, lon, elev)
        vals = [(f(s), s) for s in range(-1200, 1201, 10)]
        hi, lo = max(vals), min(vals)
        out = []
        for t in thresholds:
            out.append("max %+.3f\" above %g" % ((hi[0] - t) * 3600, t) if abs(hi[0] - t) < abs(lo[0] - t)
                       else "min %+.3f\" above %g" % ((lo[0] - t) * 3600, t))
        return "ERFA within 20 min: " + ", ".join(out) + " (10-s samples)"


def eclipses(binary):
    """heliocal's eclipses at the places of eclipses-swiss.csv, 2026-2035."""
    here = os.path.dirname(os.path.abspath(__file__))
    path = os.path.join(here, "..", "..", "testdata", "reference", "eclipses-swiss.csv")
    rows = []
    with open(path) as f:
        rows = list(csv.DictReader(line for line in f if not line.startswith("#")))
    print("\n== eclipses vs Swiss Ephemeris 2.10.03 (eclipses-swiss.csv), 2026-2035")
    diffs = {}
    for place in sorted({r["site"] for r in rows}):
        rs = [r for r in rows if r["site"] == place]
        lat, lon, elev = float(rs[0]["lat"]), float(rs[0]["lon"]), float(rs[0]["elev_m"])
        doc = heliocal(binary, Site(place, lat, lon, elev), "2026-01-01", "2035-12-31", ["solar-eclipse", "lunar-eclipse"])
        hel = [e for e in doc["events"]]
        used = set()
        for r in rs:
            mx = parse(r["max_utc"])
            kind = r["kind"] + "-eclipse"
            cands = [e for e in hel if e["kind"] == kind and abs((parse(e["max"]) - mx).total_seconds()) < 6 * 3600]
            if not cands:
                print("   %-12s %s %s: listed by the library only" % (place, kind, r["max_utc"]))
                continue
            e = cands[0]
            used.add(id(e))
            pairs = [("first contact", "start", "c1_or_p1_utc"), ("last contact", "end", "c4_or_p4_utc")]
            if kind == "lunar-eclipse":
                pairs += [("U1", "partial_start", "c2_or_u1_utc"), ("U4", "partial_end", "c3_or_u4_utc"),
                          ("U2", "total_start", "total_start_utc"), ("U3", "total_end", "total_end_utc")]
            line = []
            for label, hk, rk in pairs:
                if r[rk] and hk in e:
                    d = (parse(e[hk]) - parse(r[rk])).total_seconds()
                    diffs.setdefault(kind + " " + label, []).append(abs(d))
                    line.append("%s %+.1f s" % (label, d))
                elif bool(r[rk]) != (hk in e):
                    line.append("%s: %s" % (label, "library only" if r[rk] else "heliocal only"))
            dmax = (parse(e["max"]) - mx).total_seconds()
            mag = e.get("magnitude", e.get("umbral_magnitude"))
            line.append("max %+.1f s" % dmax)
            line.append("magnitude %.4f vs %s" % (mag, r["magnitude"]))
            print("   %-12s %s %s: %s" % (place, kind, e["date"], ", ".join(line)))
        for e in hel:
            if id(e) not in used:
                print("   %-12s %s %s: listed by heliocal only (%s..%s)" % (place, e["kind"], e["date"], e["start"], e["end"]))
    for k in sorted(diffs):
        v = sorted(diffs[k])
        print("  %-28s n=%3d  median %.1f s  max %.1f s" % (k, len(v), v[len(v) // 2], v[-1]))


def main():
    args = sys.argv[1:]
    binary = args.pop(0) if args and not args[0].startswith("--") else "/tmp/heliocal"
    start, end, jobs, only = "2027-01-01", "2028-12-31", 2, []
    while args:
        a = args.pop(0)
        if a == "--from":
            start = args.pop(0)
        elif a == "--to":
            end = args.pop(0)
        elif a == "--jobs":
            jobs = int(args.pop(0))
        elif a in ("--no-eclipses", "--erfa"):
            only.append(a)
        else:
            only.append(a)
    names = [x for x in only if not x.startswith("--")]
    places = [p for p in PLACES if not names or any(x.lower() in p[0].lower() for x in names)]
    print("PyEphem %s; heliocal %s; %d places, %s..%s (local dates)" % (ephem.__version__, binary, len(places), start, end))
    alld, worst, total = {}, {}, 0
    arbiter = Erfa() if "--erfa" in only else None
    with concurrent.futures.ProcessPoolExecutor(jobs) as ex:
        futs = [ex.submit(check, binary, p, start, end) for p in places]
        for place, f in zip(places, futs):
            name, lat, lon, elev, tzname, top, results, missing, thr = f.result()
            total += len(results)
            over = [r for r in results if abs(r[3]) > (MOON_TOL if r[0].startswith(("moon", "new", "first", "full", "last", "dark")) else SUN_TOL)]
            print("== %s (%g, %g, %g m, %s; Sun's top %.3f deg): %d matched, %d over tolerance, %d unpaired or undated" % (
                name, lat, lon, elev, tzname, top, len(results), len(over), len(missing)))
            for label, h, r, d, dh in over:
                print("   %-30s heliocal %s %s %s diff %+.2f s%s" % (
                    label, h.isoformat(), "ERFA" if "ERFA" in label else "PyEphem", r.isoformat(), d,
                    "" if dh is None else ", %+.3f\" in altitude" % dh))
                if arbiter and label in thr:
                    print("   %30s %s" % ("", arbiter.judge(place, label, thr[label], h, r)))
            for m in missing:
                print("   %-30s %s %s" % m)
                if arbiter and m[0] in thr:
                    at = datetime.datetime.fromisoformat(m[2]) if m[2] else datetime.datetime.fromisoformat(m[1].split("PyEphem ")[1].rstrip(")"))
                    print("   %30s %s" % ("", arbiter.extreme(place, thr[m[0]], at)))
            for label, h, r, d, _ in results:
                tally(alld, worst, label, name, h, d)
    print("\n%d events matched. Differences per kind (|heliocal - PyEphem|, or ERFA where named):" % total)
    print_worst(alld, worst, 32, 6)
    if "--no-eclipses" not in only:
        eclipses(binary)


if __name__ == "__main__":
    main()
