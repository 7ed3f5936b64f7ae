#!/usr/bin/env python3
"""Audit heliocal's event times against PyEphem (libastro) from outside:
run the built binary, compute the same events with PyEphem under the
same definitions, match them and list every difference over the tolerance.

    apt-get install -y python3-ephem
    go build -o /tmp/heliocal ./cmd/heliocal
    /usr/bin/python3 tools/pyephem-checks/audit.py /tmp/heliocal [--quick]

Definitions, matched to heliocal's README (Event kinds):
  * sunrise/sunset: the Sun's centre at -0.8333 deg less the dip of the
    horizon, 1.76' * sqrt(elevation in m): PyEphem with pressure = 0 (no
    refraction of its own), the centre's topocentric altitude;
  * twilights, sun-altitude:X, golden hour (-4..+6), blue hour (-6..-4):
    the centre's geometric topocentric altitude, no dip;
  * solar-noon, moon-transit: PyEphem's next_transit;
  * moonrise/moonset: the topocentric Moon's upper limb at -34' less the
    dip, pressure = 0, with PyEphem's semidiameter scaled from its Moon's
    radius (1740 km) to heliocal's (the IAU mean radius, 1737.4 km);
  * Moon phases: apparent geocentric elongation in longitude 0/90/180/270;
    seasons and cross-quarter days: apparent geocentric longitude of the
    Sun. Both are found here from PyEphem's apparent RA/Dec turned into
    ecliptic longitude with the true obliquity (PyEphem's own
    next_equinox() solves for the right ascension, and its Moon phases use
    the mean obliquity); the seasons are also set beside ERFA's instants
    in testdata/reference/crosscheck-seasons-erfa.csv.
The Sun's and Moon's altitudes are sampled every 10 min (Sun) or 5 min
(Moon) and each extreme refined, so that grazing crossings near the polar
circles are found; a difference in time is also given in altitude where it
exceeds the tolerance (at a grazing crossing 0.1" moves the time by seconds).

Time scales. PyEphem's dates are UT (UT1) and its Delta T is its own (75 s
for 2027, 225 s for 2100). The Delta T heliocal's README describes is used
instead: the Espenak-Meeus expressions before 1973, the observed monthly
values of testdata/reference/series/deltat-monthly.csv to 2023, then
69.18 s + 32.5 s ((year - 2023.33)/100)^2. For rise, set and transit,
PyEphem's observer is turned back by the Earth's rotation over the
difference of the two Delta T and its instants moved by it, so that the
bodies stand where heliocal's Delta T puts them while the sky turns as at
the same UT1; UT1 is then taken to UTC with the leap seconds (1972 to the
table's end; UTC is UT1 before and after, as heliocal takes it). Phases and
seasons are compared in TT: PyEphem's UT plus its Delta T, heliocal's UTC
plus TT - UTC.
"""

import csv
import datetime
import json
import math
import os
import subprocess
import sys

import ephem

DEG = math.pi / 180
SUN_TOL, MOON_TOL = 1.0, 5.0
# The Moon's radius: heliocal takes the IAU mean radius, 1737.4 km, for its
# upper limb; libastro's Moon has 1740 km (1.4" more semidiameter).
MOON_RADIUS_KM, PYEPHEM_MOON_RADIUS_KM = 1737.4, 1740.0

LEAPS = [  # (first UTC date, TAI - UTC)
    ("1972-01-01", 10), ("1972-07-01", 11), ("1973-01-01", 12), ("1974-01-01", 13), ("1975-01-01", 14),
    ("1976-01-01", 15), ("1977-01-01", 16), ("1978-01-01", 17), ("1979-01-01", 18), ("1980-01-01", 19),
    ("1981-07-01", 20), ("1982-07-01", 21), ("1983-07-01", 22), ("1985-07-01", 23), ("1988-01-01", 24),
    ("1990-01-01", 25), ("1991-01-01", 26), ("1992-07-01", 27), ("1993-07-01", 28), ("1994-07-01", 29),
    ("1996-01-01", 30), ("1997-07-01", 31), ("1999-01-01", 32), ("2006-01-01", 33), ("2009-01-01", 34),
    ("2012-07-01", 35), ("2015-07-01", 36), ("2017-01-01", 37)]


def to_dt(d):
    return ephem.Date(d).datetime().replace(tzinfo=datetime.timezone.utc)


def to_ephem(dt):
    return ephem.Date(dt.astimezone(datetime.timezone.utc).replace(tzinfo=None))


def year_of(dt):
    return dt.year + (dt.timetuple().tm_yday - 0.5) / 365.25


def _load_deltat():
    here = os.path.dirname(os.path.abspath(__file__))
    path = os.path.join(here, "..", "..", "testdata", "reference", "series", "deltat-monthly.csv")
    rows = []
    with open(path) as f:
        for r in csv.DictReader(f):
            rows.append((int(r["year"]) + (int(r["month"]) - 1) / 12, float(r["delta_t_s"])))
    return rows


DELTAT = _load_deltat()  # USNO/IERS observed monthly Delta T, 1973-02..2023-05


def espenak_meeus(y):
    """Delta T, Espenak & Meeus (NASA Five Millennium Canon), 1800-1986."""
    if y < 1860:
        t = y - 1800
        return (13.72 - 0.332447 * t + 0.0068612 * t ** 2 + 0.0041116 * t ** 3 - 0.00037436 * t ** 4 +
                0.0000121272 * t ** 5 - 0.0000001699 * t ** 6 + 0.000000000875 * t ** 7)
    if y < 1900:
        t = y - 1860
        return 7.62 + 0.5737 * t - 0.251754 * t ** 2 + 0.01680668 * t ** 3 - 0.0004473624 * t ** 4 + t ** 5 / 233174
    if y < 1920:
        t = y - 1900
        return -2.79 + 1.494119 * t - 0.0598939 * t ** 2 + 0.0061966 * t ** 3 - 0.000197 * t ** 4
    if y < 1941:
        t = y - 1920
        return 21.20 + 0.84493 * t - 0.076100 * t ** 2 + 0.0020936 * t ** 3
    if y < 1961:
        t = y - 1950
        return 29.07 + 0.407 * t - t ** 2 / 233 + t ** 3 / 2547
    t = y - 1975
    return 45.45 + 1.067 * t - t ** 2 / 260 - t ** 3 / 718


def delta_t(dt):
    """Delta T as the README describes heliocal's: the Espenak-Meeus
    expressions before the observed table, the observed monthly values,
    then 69.18 s + 32.5 s ((year - 2023.33)/100)^2."""
    y = year_of(dt)
    if y < DELTAT[0][0]:
        return espenak_meeus(y)
    if y >= DELTAT[-1][0]:
        return 69.18 + 32.5 * ((y - 2023.33) / 100) ** 2
    for (y0, v0), (y1, v1) in zip(DELTAT, DELTAT[1:]):
        if y0 <= y < y1:
            return v0 + (v1 - v0) * (y - y0) / (y1 - y0)


def tt_minus_utc(dt):
    """TT - UTC: 32.184 s + the leap seconds while UTC is observed
    (1972..the table's end), else Delta T (UTC taken as UT)."""
    s = dt.strftime("%Y-%m-%d")
    if s < LEAPS[0][0] or year_of(dt) >= DELTAT[-1][0]:
        return delta_t(dt)
    return 32.184 + [n for d, n in LEAPS if d <= s][-1]


def ut1_minus_utc(dt):
    return tt_minus_utc(dt) - delta_t(dt)


def true_obliquity(d):
    """Mean obliquity (IAU 1980) plus the main nutation terms, radians."""
    jd = ephem.julian_date(d)
    t = (jd - 2451545.0) / 36525
    eps0 = 84381.448 - 46.8150 * t - 0.00059 * t * t + 0.001813 * t ** 3
    om = (125.04452 - 1934.136261 * t) * DEG
    ls = (280.4665 + 36000.7698 * t) * DEG
    lm = (218.3165 + 481267.8813 * t) * DEG
    deps = 9.20 * math.cos(om) + 0.57 * math.cos(2 * ls) + 0.10 * math.cos(2 * lm) - 0.09 * math.cos(2 * om)
    return (eps0 + deps) / 3600 * DEG


def ecl_lon(body, d):
    """Apparent geocentric ecliptic longitude of the body at UT d (radians)."""
    body.compute(ephem.Date(d))
    a, dec = float(body.g_ra), float(body.g_dec)
    e = true_obliquity(d)
    return math.atan2(math.sin(a) * math.cos(e) + math.tan(dec) * math.sin(e), math.cos(a)) % (2 * math.pi)


def solve(f, t0, t1, iters=60):
    """A root of f in [t0, t1] by bisection (f(t0), f(t1) of opposite sign)."""
    f0 = f(t0)
    for _ in range(iters):
        m = (t0 + t1) / 2
        fm = f(m)
        if (fm > 0) == (f0 > 0):
            t0, f0 = m, fm
        else:
            t1 = m
        if t1 - t0 < 1e-9:
            break
    return (t0 + t1) / 2


def extreme(f, a, b, maximum, iters=60):
    g = (math.sqrt(5) - 1) / 2
    sgn = 1 if maximum else -1
    c, d = b - g * (b - a), a + g * (b - a)
    fc, fd = sgn * f(c), sgn * f(d)
    for _ in range(iters):
        if fc > fd:
            b, d, fd = d, c, fc
            c = b - g * (b - a)
            fc = sgn * f(c)
        else:
            a, c, fc = c, d, fd
            d = a + g * (b - a)
            fd = sgn * f(d)
        if b - a < 1e-8:
            break
    t = (a + b) / 2
    return t, f(t)


def crossings(f, t0, t1, step, thresholds):
    """For each threshold, the crossings of f (rising/setting) in [t0, t1]."""
    n = int((t1 - t0) / step) + 1
    ts = [t0 + i * step for i in range(n + 1)]
    vs = [f(t) for t in ts]
    out = {h: [] for h in thresholds}
    for i in range(len(ts) - 1):
        for h in thresholds:
            a, b = vs[i] - h, vs[i + 1] - h
            if (a > 0) != (b > 0):
                t = solve(lambda x: f(x) - h, ts[i], ts[i + 1])
                out[h].append((t, "rising" if b > 0 else "setting"))
    # grazing: an extreme between samples that crosses a threshold the samples do not
    for i in range(1, len(ts) - 1):
        up = vs[i] > vs[i - 1] and vs[i] >= vs[i + 1]
        down = vs[i] < vs[i - 1] and vs[i] <= vs[i + 1]
        if not (up or down):
            continue
        te, ve = extreme(f, ts[i - 1], ts[i + 1], up)
        for h in thresholds:
            sides = {vs[i - 1] > h, vs[i] > h, vs[i + 1] > h}
            if len(sides) != 1 or (ve > h) == (vs[i] > h):
                continue
            for lo, hi in ((ts[i - 1], te), (te, ts[i + 1])):
                t = solve(lambda x: f(x) - h, lo, hi)
                rising = (f(hi) > h)
                out[h].append((t, "rising" if rising else "setting"))
    for h in thresholds:
        out[h].sort()
    return out


class Site:
    def __init__(self, name, lat, lon, elev):
        self.name, self.lat, self.lon, self.elev = name, lat, lon, elev

    def observer(self, delta=0.0):
        """PyEphem's observer, for UT instants shifted by delta seconds:
        the Earth turned back by as much, so that the bodies are placed
        at the TT of heliocal's Delta T while the sky turns as at UT."""
        o = ephem.Observer()
        o.lat = str(self.lat)
        o.lon = str(self.lon - delta * 1.00273781191 * 360 / 86400)
        o.elevation = self.elev
        o.pressure = 0
        o.horizon = 0
        return o

    def dip(self):
        return 1.76 / 60 * math.sqrt(self.elev) if self.elev > 0 else 0.0


class Sky:
    """PyEphem's sky at a site over the window d0..d1: the observer turned
    for heliocal's Delta T at the middle of the window (Site.observer), the
    Sun and the Moon, and the conversions between the observer's instants
    and heliocal's UTC."""

    def __init__(self, site, d0, d1):
        mid = d0 + (d1 - d0) / 2
        self.delta = delta_t(mid) - ephem.delta_t(to_ephem(mid))  # heliocal's Delta T - PyEphem's
        self.o = site.observer(self.delta)
        self.sun, self.moon = ephem.Sun(), ephem.Moon()

    def shift(self, u):
        """PyEphem's instant on the shifted observer as heliocal's UTC."""
        dt = to_dt(u) - datetime.timedelta(seconds=self.delta)
        return dt - datetime.timedelta(seconds=ut1_minus_utc(dt))

    def unshift(self, dt):
        """heliocal's UTC as PyEphem's instant on the shifted observer."""
        return to_ephem(dt + datetime.timedelta(seconds=ut1_minus_utc(dt) + self.delta))

    def sun_alt(self, t):
        self.o.date = t
        self.sun.compute(self.o)
        return float(self.sun.alt) / DEG

    def moon_alt(self, t):
        """The altitude of the Moon's upper limb, with heliocal's radius."""
        self.o.date = t
        self.moon.compute(self.o)
        return (float(self.moon.alt) + float(self.moon.radius) * MOON_RADIUS_KM / PYEPHEM_MOON_RADIUS_KM) / DEG

    def transits(self, body, e0, e1):
        """PyEphem's instants of the body's transits from e0 to e1 (PyEphem
        dates), each the next after half a day past the one before."""
        out, t = [], e0
        while t < e1:
            self.o.date = t
            tr = self.o.next_transit(body)
            out.append(tr)
            t = ephem.Date(tr + 0.5)
        return out

    def rate(self, f):
        """The rate of f, in degrees an hour, at heliocal's UTC instant."""
        def r(dt):
            u = self.unshift(dt)
            return (f(u + 30 * ephem.second) - f(u - 30 * ephem.second)) / 60 * 3600
        return r


def tally(alld, worst, key, name, h, d):
    """Counts the difference d of the event at h of the place name under
    key: every absolute difference (alld) and the largest (worst)."""
    alld.setdefault(key, []).append(abs(d))
    if key not in worst or abs(d) > abs(worst[key][0]):
        worst[key] = (d, name, h.isoformat())


def print_worst(alld, worst, width, count_width):
    """Prints, per key, the count, median, 99th percentile and largest of
    the differences tallied, and where the largest is."""
    for k in sorted(worst):
        d, name, when = worst[k]
        v = sorted(alld[k])
        print("  %-*s n=%*d  median %.2f s  p99 %.2f s  max %+8.2f s  %s  %s" % (
            width, k, count_width, len(v), v[len(v) // 2], v[min(len(v) - 1, int(len(v) * 0.99))], d, name, when))


def heliocal(binary, site, start, end, kinds, extra=(), tz="UTC"):
    cmd = [binary, "events", "--lat", str(site.lat), "--lon", str(site.lon), "--elev", str(site.elev),
           "--tz", tz, "--from", start, "--to", end, "--kinds", ",".join(kinds), "--format", "json", *extra]
    p = subprocess.run(cmd, capture_output=True, text=True)
    if p.returncode != 0:
        raise RuntimeError("%s: %s" % (" ".join(cmd), p.stderr.strip()))
    return json.loads(p.stdout)


def parse(s):
    return datetime.datetime.strptime(s, "%Y-%m-%dT%H:%M:%S.%fZ").replace(tzinfo=datetime.timezone.utc)


SUN_KINDS = {  # kind -> (threshold function of the site, direction)
    "sunrise": (lambda s: -0.8333 - s.dip(), "rising"),
    "sunset": (lambda s: -0.8333 - s.dip(), "setting"),
    "civil-dawn": (lambda s: -6.0, "rising"), "civil-dusk": (lambda s: -6.0, "setting"),
    "nautical-dawn": (lambda s: -12.0, "rising"), "nautical-dusk": (lambda s: -12.0, "setting"),
    "astronomical-dawn": (lambda s: -18.0, "rising"), "astronomical-dusk": (lambda s: -18.0, "setting"),
}
ALTITUDES = [10.0, -3.0, 30.0]
BANDS = {"golden-hour": (-4.0, 6.0), "blue-hour": (-6.0, -4.0)}
MOON_KINDS = {"moonrise": "rising", "moonset": "setting"}
PHASES = {"new-moon": 0, "first-quarter": 90, "full-moon": 180, "last-quarter": 270}
SEASONS = {"march-equinox": 0, "june-solstice": 90, "september-equinox": 180, "december-solstice": 270}


def match(hel, ref, tol, window, label, out, missing, rate=None):
    """Pair each heliocal instant with the nearest reference instant; record
    the differences and the unpaired ones on either side. rate, if given,
    is the altitude's rate of change (arcsec/s) at a reference instant: a
    difference in time is then also given as one in altitude (grazing
    crossings, where a hundredth of an arcsecond moves the time by
    seconds)."""
    used = set()
    lo, hi = window
    for t in hel:
        best, bi = None, None
        for i, r in enumerate(ref):
            if i in used:
                continue
            d = (t - r).total_seconds()
            if best is None or abs(d) < abs(best):
                best, bi = d, i
        if best is None or abs(best) > 600:
            missing.append((label, "extra in heliocal", t.isoformat()))
            continue
        used.add(bi)
        dh = best * rate(ref[bi]) if rate is not None and abs(best) > tol else None
        out.append((label, t, ref[bi], best, dh))
    for i, r in enumerate(ref):
        if i not in used and lo + datetime.timedelta(hours=1) <= r < hi - datetime.timedelta(hours=1):
            missing.append((label, "missing in heliocal (PyEphem %s)" % r.isoformat(), ""))


def match_moon(sky, evs, hmoon, e0, e1, window, results, missing):
    """Matches heliocal's moonrise and moonset (evs) with PyEphem's crossings
    of the altitude hmoon over e0..e1, and its Moon transits with PyEphem's;
    returns the crossings ({hmoon: [(instant, direction), ...]})."""
    mc = crossings(sky.moon_alt, e0, e1, 5 * ephem.minute, [hmoon])
    for kind, direction in MOON_KINDS.items():
        ref = [sky.shift(t) for t, d in mc[hmoon] if d == direction]
        hel = [parse(e["start"]) for e in evs if e["kind"] == kind]
        match(hel, ref, MOON_TOL, window, kind, results, missing, sky.rate(sky.moon_alt))
    ref = [sky.shift(tr) for tr in sky.transits(sky.moon, e0, e1)]
    hel = [parse(e["start"]) for e in evs if e["kind"] == "moon-transit"]
    match(hel, ref, MOON_TOL, window, "moon-transit", results, missing)
    return mc


def audit(binary, site, start, end, moon=True, year_kinds=True):
    d0 = datetime.datetime.strptime(start, "%Y-%m-%d").replace(tzinfo=datetime.timezone.utc)
    d1 = datetime.datetime.strptime(end, "%Y-%m-%d").replace(tzinfo=datetime.timezone.utc) + datetime.timedelta(days=1)
    window = (d0, d1)
    kinds = list(SUN_KINDS) + ["solar-noon"] + ["sun-altitude:%g" % a for a in ALTITUDES] + list(BANDS)
    if moon:
        kinds += list(MOON_KINDS) + ["moon-transit"] + list(PHASES)
    if year_kinds:
        kinds += list(SEASONS) + ["cross-quarter"]
    # from the date before: a span begun then (a golden hour around
    # midnight) ends inside the window
    before = max(d0 - datetime.timedelta(days=1), datetime.datetime(1800, 1, 1, tzinfo=datetime.timezone.utc))
    doc = heliocal(binary, site, before.strftime("%Y-%m-%d"), end, kinds)
    evs = doc["events"]
    results, missing = [], []
    sky = Sky(site, d0, d1)
    shift, sun_alt, moon_alt, rate = sky.shift, sky.sun_alt, sky.moon_alt, sky.rate
    e0, e1 = to_ephem(d0) - 1.5, to_ephem(d1) + 1.5

    thresholds = sorted({fn(site) for fn, _ in SUN_KINDS.values()} | set(ALTITUDES) |
                        {h for b in BANDS.values() for h in b})
    cr = crossings(sun_alt, e0, e1, 10 * ephem.minute, thresholds)
    for kind, (fn, direction) in SUN_KINDS.items():
        h = fn(site)
        ref = [shift(t) for t, d in cr[h] if d == direction]
        hel = [parse(e["start"]) for e in evs if e["kind"] == kind]
        match(hel, ref, SUN_TOL, window, kind, results, missing, rate(sun_alt))
    for a in ALTITUDES:
        kind = "sun-altitude:%g" % a
        for direction in ("rising", "setting"):
            ref = [shift(t) for t, d in cr[a] if d == direction]
            hel = [parse(e["start"]) for e in evs if e["kind"] == kind and e.get("direction") == direction]
            match(hel, ref, SUN_TOL, window, "%s %s" % (kind, direction), results, missing, rate(sun_alt))
    for kind, (lo, hi) in BANDS.items():
        ref = sorted(shift(t) for h in (lo, hi) for t, d in cr[h])
        hel = []
        for e in evs:
            if e["kind"] != kind:
                continue
            s = parse(e["start"])
            if s != before:
                hel.append(s)
            if not e.get("open"):
                hel.append(parse(e["end"]))
        # a span's end past the listing's last date is a crossing too: keep the reference as wide
        match(sorted(hel), ref, SUN_TOL, (d0, d1), kind + " bounds", results, missing, rate(sun_alt))
    # solar noon: PyEphem's transits
    ref, alts = [], {}
    for tr in sky.transits(sky.sun, e0, e1):
        ref.append(shift(tr))
        alts[ref[-1]] = sun_alt(tr)
    hel = [parse(e["start"]) for e in evs if e["kind"] == "solar-noon"]
    match(hel, ref, SUN_TOL, window, "solar-noon", results, missing)
    for e in evs:
        if e["kind"] == "solar-noon" and "altitude_deg" in e:
            s = parse(e["start"])
            r = min(alts, key=lambda x: abs((x - s).total_seconds()))
            if abs(alts[r] - e["altitude_deg"]) > 0.0002:
                missing.append(("solar-noon altitude", "heliocal %.4f PyEphem %.4f" % (e["altitude_deg"], alts[r]),
                                s.isoformat()))
    if moon:
        hmoon = -34 / 60 - site.dip()
        match_moon(sky, evs, hmoon, e0, e1, window, results, missing)
        for kind, target in PHASES.items():
            ref = tt_events(lambda d: (ecl_lon(ephem.Moon(), d) - ecl_lon(ephem.Sun(), d)), target, e0, e1, 0.5)
            hel = [tt_of(parse(e["start"])) for e in evs if e["kind"] == kind]
            match(hel, ref, MOON_TOL, window, kind + " (TT)", results, missing)
    if year_kinds:
        for kind, target in SEASONS.items():
            ref = tt_events(lambda d: ecl_lon(ephem.Sun(), d), target, e0, e1, 5)
            hel = [tt_of(parse(e["start"])) for e in evs if e["kind"] == kind]
            match(hel, ref, SUN_TOL, window, kind + " (TT)", results, missing)
            erfa = [e for e in ERFA_SEASONS if d0 - datetime.timedelta(days=2) <= e < d1 + datetime.timedelta(days=2)]
            if erfa:
                match(hel, erfa, SUN_TOL, (d0, d0), kind + " (TT, vs ERFA)", results, missing)
        ref = []
        for target in (45, 135, 225, 315):
            ref += tt_events(lambda d: ecl_lon(ephem.Sun(), d), target, e0, e1, 5)
        hel = [tt_of(parse(e["start"])) for e in evs if e["kind"] == "cross-quarter"]
        match(sorted(hel), sorted(ref), SUN_TOL, window, "cross-quarter (TT)", results, missing)
        erfa = [e for e in ERFA_SEASONS if d0 - datetime.timedelta(days=2) <= e < d1 + datetime.timedelta(days=2)]
        if erfa:
            match(sorted(hel), erfa, SUN_TOL, (d0, d0), "cross-quarter (TT, vs ERFA)", results, missing)
    return results, missing, doc.get("notes", [])


def _load_erfa_seasons():
    """ERFA's instants (TT) of the Sun's apparent longitude 0, 45, ..., 315
    deg, 1900-2100, as (longitude, instant), from the committed cross-check
    table testdata/reference/crosscheck-seasons-erfa.csv."""
    here = os.path.dirname(os.path.abspath(__file__))
    path = os.path.join(here, "..", "..", "testdata", "reference", "crosscheck-seasons-erfa.csv")
    with open(path) as f:
        return [(int(r["kind"][len("longitude_"):]), to_dt(float(r["tt_jd"]) - 2415020.0))
                for r in csv.DictReader(f) if r["kind"].startswith("longitude_")]


ERFA_SEASONS_BY_LON = _load_erfa_seasons()
ERFA_SEASONS = sorted(t for _, t in ERFA_SEASONS_BY_LON)


def tt_of(dt):
    return dt + datetime.timedelta(seconds=tt_minus_utc(dt))


def tt_events(lon, target, e0, e1, step):
    """Instants (as TT datetimes) where lon(d) - target crosses zero upwards."""
    def f(d):
        return (lon(d) / DEG - target + 180) % 360 - 180
    out = []
    t = e0
    prev = f(t)
    while t < e1:
        n = t + step
        cur = f(n)
        if prev < 0 <= cur and cur - prev < 90:
            u = solve(f, t, n)
            out.append(to_dt(u) + datetime.timedelta(seconds=ephem.delta_t(ephem.Date(u))))
        t, prev = n, cur
    return out


SITES = [  # name, lat, lon, elevation, windows (from, to)
    ("equator, sea level", 0.0, 32.0, 0, [("1900-03-10", "1900-04-10"), ("2063-09-01", "2063-09-30")]),
    ("Quito", -0.22, -78.51, 2850, [("1975-06-01", "1975-06-30")]),
    ("Singapore", 1.35, 103.82, 0, [("2005-12-01", "2005-12-31")]),
    ("Nairobi", -1.29, 36.82, 1795, [("1988-02-01", "1988-02-29")]),
    ("La Paz", -16.5, -68.15, 3640, [("2031-07-01", "2031-07-31")]),
    ("Havana", 23.13, -82.38, 0, [("1921-06-01", "1921-06-30")]),
    ("Madrid", 40.4, -3.7, 650, [("1950-03-01", "1950-03-31")]),
    ("New York", 40.7, -74.0, 10, [("2015-06-20", "2015-07-10")]),
    ("Vienna", 48.2, 16.4, 180, [("2027-01-01", "2027-12-31")]),
    ("Alps 3000 m", 46.55, 7.98, 3000, [("2012-12-01", "2012-12-31")]),
    ("Dead Sea -430 m", 31.5, 35.5, -430, [("2033-03-01", "2033-03-31")]),
    ("Sydney", -33.87, 151.21, 0, [("1999-12-15", "2000-01-15")]),
    ("Buenos Aires", -34.6, -58.4, 25, [("2088-04-01", "2088-04-30")]),
    ("Cape Town", -33.9, 18.4, 0, [("1905-09-01", "1905-09-30")]),
    ("Wellington", -41.3, 174.8, 0, [("2044-11-01", "2044-11-30")]),
    ("Ushuaia", -54.8, -68.3, 0, [("2019-06-01", "2019-06-30")]),
    ("Helsinki", 60.17, 24.94, 0, [("1962-06-01", "1962-06-30")]),
    ("Anchorage", 61.2, -149.9, 0, [("2099-12-01", "2100-01-31")]),
    ("King George Is.", -62.2, -58.9, 0, [("2022-06-01", "2022-06-30")]),
    ("Reykjavik", 64.15, -21.95, 0, [("2030-06-10", "2030-07-10")]),
    ("65.9 N", 65.9, 20.0, 0, [("2026-05-20", "2026-07-20"), ("2026-11-25", "2027-01-15")]),
    ("Antarctic Pen. 65 S", -65.0, -64.0, 0, [("2040-11-15", "2041-01-15")]),
    ("Dumont d'Urville 66.66 S", -66.66, 140.0, 0, [("1990-01-01", "1990-12-31")]),
    ("Tromso 69.65 N", 69.65, 18.96, 0, [("2027-01-01", "2027-12-31")]),
    ("Longyearbyen 78.22 N", 78.22, 15.65, 0, [("2050-01-01", "2050-12-31")]),
    ("McMurdo 77.85 S", -77.85, 166.67, 0, [("1960-01-01", "1960-12-31")]),
    ("Alert 82.5 N", 82.5, -62.3, 0, [("2010-02-15", "2010-04-15"), ("2010-08-15", "2010-10-15")]),
    ("edge 1800", 51.5, 0.0, 0, [("1800-01-01", "1800-01-15")]),
    ("edge 2200", 35.0, 139.7, 40, [("2200-12-15", "2200-12-31")]),
]


def bennett(h):
    """Refraction (arcmin) at apparent altitude h deg, Meeus eq. 16.4."""
    return 1 / math.tan((h + 7.31 / (h + 4.4)) * DEG)


def extra_checks(binary):
    """The options and values beside the times: a skyline altitude
    (--horizon), the air (--pressure, --temperature), the azimuths of rise
    and set, the Moon's illuminated fraction, and the supported dates."""
    print("\n== other checks")
    site = Site("Vienna", 48.2, 16.4, 0)
    sun = ephem.Sun()
    # --horizon: the upper limb on the skyline with Bennett's refraction
    # there (taken at -1 deg below -1 deg), no dip; --pressure/--temperature:
    # 34' scaled by (P/1010)(283/(273+T)) (Meeus ch. 16)
    cases = [("--horizon %g" % h, ("--horizon", str(h)), h - bennett(max(h, -1)) / 60 - 16 / 60)
             for h in (2.0, 0.5, -0.5, -1.0, -3.0)]
    for p, t in ((1030, -20), (1000, 35)):
        f = p / 1010 * 283 / (273 + t)
        cases.append(("--pressure %g --temperature %g" % (p, t), ("--pressure", str(p), "--temperature", str(t)),
                      -(34 * f + 16) / 60))
    for label, args, h in cases:
        o = site.observer()
        o.horizon = str(h)
        worst = 0.0
        for e in heliocal(binary, site, "2027-03-01", "2027-03-10", ["sunrise", "sunset"], args)["events"]:
            t = parse(e["start"])
            o.date = to_ephem(t) - 0.25
            r = (o.next_rising if e["kind"] == "sunrise" else o.next_setting)(sun, use_center=True)
            worst = max(worst, abs((t - to_dt(r)).total_seconds()))
        print("   %-36s centre at %+.4f deg: sunrise/sunset within %.2f s" % (label, h, worst))
    # azimuths and the Moon's illuminated fraction (geocentric, from the
    # phase angle of PyEphem's Sun and Moon)
    wa, wk = 0.0, 0.0
    for name, lat, lon in (("Vienna", 48.2, 16.4), ("Sydney", -33.87, 151.21), ("Tromso", 69.65, 18.96)):
        site = Site(name, lat, lon, 0)
        o = site.observer()
        for e in heliocal(binary, site, "2027-01-01", "2027-02-28", ["sunrise", "sunset", "moonrise", "moonset"])["events"]:
            t = to_ephem(parse(e["start"]))
            o.date = t
            b = ephem.Sun() if e["kind"].startswith("sun") else ephem.Moon()
            b.compute(o)
            wa = max(wa, abs((e["azimuth_deg"] - float(b.az) / DEG + 180) % 360 - 180))
            if "illuminated" in e:
                s, m = ephem.Sun(t), ephem.Moon(t)
                vs = [s.earth_distance * x for x in unit(s.g_ra, s.g_dec)]
                vm = [m.earth_distance * x for x in unit(m.g_ra, m.g_dec)]
                ms = [a - b for a, b in zip(vs, vm)]
                cosi = -sum(a * b for a, b in zip(ms, vm)) / math.sqrt(sum(a * a for a in ms) * sum(a * a for a in vm))
                wk = max(wk, abs(e["illuminated"] - (1 + cosi) / 2))
    print("   azimuths of rise and set within %.4f deg (JSON has 0.01); illuminated fraction within %.5f" % (wa, wk))
    site = Site("London", 51.5, 0.0, 0)
    for start, end, ok in (("1800-01-01", "1800-01-01", True), ("2200-12-31", "2200-12-31", True),
                           ("1799-12-31", "1800-01-01", False), ("2200-12-31", "2201-01-01", False)):
        p = subprocess.run([binary, "events", "--lat", "51.5", "--lon", "0", "--tz", "UTC", "--from", start, "--to", end,
                            "--kinds", "sunrise,moonrise,moon-phases,seasons", "--format", "json"],
                           capture_output=True, text=True)
        print("   %s..%s: exit %d%s %s" % (start, end, p.returncode, "" if (p.returncode == 0) == ok else " (UNEXPECTED)",
                                          p.stderr.strip()))


def unit(ra, dec):
    return (math.cos(dec) * math.cos(ra), math.cos(dec) * math.sin(ra), math.sin(dec))


def main():
    binary = sys.argv[1] if len(sys.argv) > 1 else "/tmp/heliocal"
    quick = "--quick" in sys.argv
    only = [a for a in sys.argv[2:] if not a.startswith("--")]
    print("PyEphem %s; heliocal %s" % (ephem.__version__, binary))
    worst, alld = {}, {}
    total = 0
    for name, lat, lon, elev, windows in SITES:
        if only and not any(x.lower() in name.lower() for x in only):
            continue
        site = Site(name, lat, lon, elev)
        for start, end in windows:
            if quick:
                end = min(end, (datetime.date.fromisoformat(start) + datetime.timedelta(days=9)).isoformat())
            results, missing, notes = audit(binary, site, start, end)
            total += len(results)
            over = [r for r in results if abs(r[3]) > (MOON_TOL if r[0].startswith(("moon", "new", "first", "full", "last")) else SUN_TOL)]
            print("== %s (%g, %g, %g m) %s..%s: %d events matched, %d over tolerance, %d unpaired" % (
                name, lat, lon, elev, start, end, len(results), len(over), len(missing)))
            for label, h, r, d, dh in over:
                print("   %-28s heliocal %s PyEphem %s diff %+.2f s%s" % (
                    label, h.isoformat(), r.isoformat(), d, "" if dh is None else ", %+.2f\" in altitude" % dh))
            for m in missing:
                print("   %-28s %s %s" % m)
            for label, h, r, d, _ in results:
                tally(alld, worst, label.split(" ")[0] + (" vs ERFA" if "ERFA" in label else ""), name, h, d)
    print("\n%d events matched. Largest difference per kind (heliocal - PyEphem):" % total)
    print_worst(alld, worst, 24, 5)
    extra_checks(binary)


if __name__ == "__main__":
    main()
