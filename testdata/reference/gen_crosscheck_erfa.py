#!/usr/bin/env python3
"""Generate independent check values for heliocal's astro package with ERFA.

ERFA (Essential Routines for Fundamental Astronomy, the BSD-licensed
derivative of the IAU SOFA library) through Debian's python3-erfa package:

    apt-get install -y python3-erfa python3-numpy
    /usr/bin/python3 testdata/reference/gen_crosscheck_erfa.py

It writes, next to this script:

  crosscheck-sunpos-erfa.csv   apparent geocentric Sun (RA, Dec, ecliptic
                               longitude of date, distance) at TT instants
  crosscheck-seasons-erfa.csv  equinoxes, solstices, cross-quarters (TT),
                               Earth perihelion/aphelion (TT) 1900-2100
  crosscheck-sun-erfa.csv      sunrise/sunset/twilight/golden-hour/custom
                               crossings and solar noon for site-dates
  crosscheck-nutation-erfa.csv the complete IAU 1980 nutation (eraNut80),
                               IAU 1980 mean obliquity (eraObl80) and IAU 1982
                               mean sidereal time (eraGmst82), 1800-2200

Pass section names (sunpos, seasons, events, nutation) to write only those.

The model here shares nothing with astro/ except the conventions:
Earth: eraEpv00 (heliocentric and barycentric Earth, fitted to DE405,
1900-2100); light time; annual aberration (eraAb) with the Earth's
barycentric velocity; IAU 2006/2000A bias-precession-nutation (eraPnm06a);
Greenwich apparent sidereal time IAU 2006/2000A (eraGst06a); observer on
the WGS 84 ellipsoid (eraGd2gc). Altitudes are topocentric and geometric.
UTC->TT through ERFA's leap-second table (eraDat); UT1 = TT - dT with the
observed monthly dT of series/deltat-monthly.csv (so events are limited to
1973-02..2023-05, where dT is observed). Crossings are found by sampling the
altitude every 2 minutes (30 s above 60 degrees of latitude) and bisection
to 1e-5 s.
"""

import csv
import math
import os
import sys

import erfa
import numpy as np

HERE = os.path.dirname(os.path.abspath(__file__))
C_AU_PER_DAY = 173.1446326846693
SOURCE = "ERFA %s (python3-erfa, Debian), IAU 2006/2000A + eraEpv00; gen_crosscheck_erfa.py" % erfa.__version__

# --- time scales -----------------------------------------------------------

_dt = []
with open(os.path.join(HERE, "series", "deltat-monthly.csv")) as f:
    for row in csv.DictReader(f):
        d1, d2 = erfa.cal2jd(int(row["year"]), int(row["month"]), 1)
        _dt.append((d1 + d2, float(row["delta_t_s"])))
DT_JD = np.array([x[0] for x in _dt])
DT_S = np.array([x[1] for x in _dt])


def utc_to_tt_ut1(jd_utc):
    """UTC Julian day (quasi, as 86400-s days) -> (TT JD, UT1 JD)."""
    jd_utc = np.asarray(jd_utc, dtype=float)
    tai1, tai2 = erfa.utctai(np.floor(jd_utc - 0.5) + 0.5, jd_utc - (np.floor(jd_utc - 0.5) + 0.5))
    tt1, tt2 = erfa.taitt(tai1, tai2)
    tt = tt1 + tt2
    dt = np.interp(jd_utc, DT_JD, DT_S)
    ut1 = tt - dt / 86400.0
    return tt, ut1


# --- the Sun ------------------------------------------------------------


def sun_apparent(tt):
    """Apparent geocentric Sun: RA, Dec (rad, true equator/equinox of date), distance (au), GCRS-of-date vector."""
    tt = np.atleast_1d(np.asarray(tt, dtype=float))
    pvh, pvb = erfa.epv00(tt, 0.0)
    eb, ev = pvb["p"], pvb["v"]
    sb = pvb["p"] - pvh["p"]
    sv = pvb["v"] - pvh["v"]
    p = sb - eb
    for _ in range(3):
        tau = np.linalg.norm(p, axis=-1) / C_AU_PER_DAY
        p = sb - sv * tau[:, None] - eb
    dist = np.linalg.norm(p, axis=-1)
    pn = p / dist[:, None]
    v = ev / C_AU_PER_DAY
    bm1 = np.sqrt(1 - np.sum(v * v, axis=-1))
    ppr = erfa.ab(pn, v, dist, bm1)
    rnpb = erfa.pnm06a(tt, 0.0)
    x = np.einsum("nij,nj->ni", rnpb, ppr)
    ra = np.arctan2(x[:, 1], x[:, 0]) % (2 * math.pi)
    dec = np.arcsin(np.clip(x[:, 2], -1, 1))
    return ra, dec, dist, x


def ecliptic_longitude(tt):
    """Apparent longitude of the Sun on the true ecliptic of date (rad)."""
    tt = np.atleast_1d(np.asarray(tt, dtype=float))
    _, _, _, x = sun_apparent(tt)
    eps = erfa.obl06(tt, 0.0) + erfa.nut06a(tt, 0.0)[1]
    ce, se = np.cos(eps), np.sin(eps)
    y = x[:, 1] * ce + x[:, 2] * se
    return np.arctan2(y, x[:, 0]) % (2 * math.pi)


def earth_sun_distance(tt):
    pvh, _ = erfa.epv00(np.atleast_1d(np.asarray(tt, dtype=float)), 0.0)
    return np.linalg.norm(pvh["p"], axis=-1)


# --- sites ---------------------------------------------------------------

A_WGS84 = 6378137.0


def altitude(jd_utc, lat, lon, elev):
    """Topocentric geometric altitude (rad) of the Sun's centre; arrays."""
    tt, ut1 = utc_to_tt_ut1(jd_utc)
    ra, dec, dist, _ = sun_apparent(tt)
    gast = erfa.gst06a(ut1, 0.0, tt, 0.0)
    phi, lam = math.radians(lat), math.radians(lon)
    xyz = erfa.gd2gc(1, lam, phi, elev)  # metres, Earth-fixed
    rc = math.hypot(xyz[0], xyz[1]) / A_WGS84  # rho cos phi'
    rs = xyz[2] / A_WGS84  # rho sin phi'
    H = gast + lam - ra
    d = dist * erfa.DAU / A_WGS84
    bx = d * np.cos(dec) * np.cos(H) - rc
    by = -d * np.cos(dec) * np.sin(H)
    bz = d * np.sin(dec) - rs
    up = bx * math.cos(phi) + bz * math.sin(phi)
    return np.arcsin(up / np.sqrt(bx * bx + by * by + bz * bz)), np.remainder(H + math.pi, 2 * math.pi) - math.pi


def bisect(fun, a, b, fa, iters=40):
    """Vectorised bisection of fun on brackets [a, b] (arrays)."""
    for _ in range(iters):
        m = 0.5 * (a + b)
        fm = fun(m)
        left = np.sign(fm) == np.sign(fa)
        a = np.where(left, m, a)
        fa = np.where(left, fm, fa)
        b = np.where(left, b, m)
    return 0.5 * (a + b)


def iso_ms(jd):
    y, mo, d, fd = erfa.jd2cal(math.floor(jd - 0.5) + 0.5, jd - (math.floor(jd - 0.5) + 0.5))
    ms = int(round(fd * 86400000))
    h, rem = divmod(ms, 3600000)
    mi, rem = divmod(rem, 60000)
    s, ms = divmod(rem, 1000)
    if h == 24:  # rounding at midnight
        return iso_ms(jd + 1e-9)
    return "%04d-%02d-%02dT%02d:%02d:%02d.%03dZ" % (y, mo, d, h, mi, s, ms)


def day_events(lat, lon, elev, jd0, thresholds):
    """Crossings of each threshold (deg) and upper transits in [jd0, jd0+1)."""
    step = (30.0 if abs(lat) > 60 else 120.0) / 86400
    n = int(round(1 / step))
    t = jd0 + np.arange(n + 1) * step
    h, H = altitude(t, lat, lon, elev)
    out = {}
    for th in thresholds:
        f = h - math.radians(th)
        idx = np.nonzero(np.sign(f[:-1]) != np.sign(f[1:]))[0]
        evs = []
        if len(idx):
            fun = lambda x: altitude(x, lat, lon, elev)[0] - math.radians(th)
            roots = bisect(fun, t[idx], t[idx + 1], f[idx])
            for i, r in zip(idx, roots):
                if jd0 <= r < jd0 + 1:
                    evs.append(("R" if f[i + 1] > f[i] else "S", r))
        out[th] = evs
    idx = np.nonzero((H[:-1] < 0) & (H[1:] >= 0))[0]
    evs = []
    if len(idx):
        fun = lambda x: altitude(x, lat, lon, elev)[1]
        roots = bisect(fun, t[idx], t[idx + 1], H[idx])
        evs = [("T", r) for r in roots if jd0 <= r < jd0 + 1]
    out["transit"] = evs
    return out


def nutation():
    with open(os.path.join(HERE, "crosscheck-nutation-erfa.csv"), "w", newline="") as f:
        w = csv.writer(f)
        w.writerow(["jd", "dpsi_arcsec", "deps_arcsec", "eps0_arcsec", "gmst_deg", "source"])
        jd = 2378496.5 + np.arange(0, 146100, 97.3)  # 1800-2200
        dpsi, deps = erfa.nut80(jd, 0.0)
        eps0 = erfa.obl80(jd, 0.0)
        gmst = erfa.gmst82(jd, 0.0)
        r = 180 * 3600 / math.pi
        for i in range(len(jd)):
            w.writerow(["%.5f" % jd[i], "%.7f" % (dpsi[i] * r), "%.7f" % (deps[i] * r), "%.7f" % (eps0[i] * r),
                        "%.10f" % math.degrees(gmst[i]), SOURCE.replace("IAU 2006/2000A + eraEpv00", "eraNut80, eraObl80, eraGmst82")])


def main():
    sections = set(sys.argv[1:]) or {"sunpos", "seasons", "events", "nutation"}
    rng = np.random.default_rng(20270101)
    if "nutation" in sections:
        nutation()
    if "sunpos" not in sections:
        tts = np.sort(rng.uniform(2415020.5, 2488069.5, 400))  # keep the random sequence
    else:
        sun_positions(rng)
    if "seasons" in sections:
        seasons()
    if "events" in sections:
        events(rng)


def sun_positions(rng):
    # --- sun positions
    with open(os.path.join(HERE, "crosscheck-sunpos-erfa.csv"), "w", newline="") as f:
        w = csv.writer(f)
        w.writerow(["tt_jd", "ra_deg", "dec_deg", "lambda_deg", "distance_au", "source"])
        tts = np.sort(rng.uniform(2415020.5, 2488069.5, 400))  # 1900-2100
        ra, dec, dist, _ = sun_apparent(tts)
        lam = ecliptic_longitude(tts)
        for i in range(len(tts)):
            w.writerow(["%.6f" % tts[i], "%.9f" % math.degrees(ra[i]), "%.9f" % math.degrees(dec[i]),
                        "%.9f" % math.degrees(lam[i]), "%.10f" % dist[i], SOURCE])


def seasons():
    # --- seasons, cross-quarters, apsides (TT)
    with open(os.path.join(HERE, "crosscheck-seasons-erfa.csv"), "w", newline="") as f:
        w = csv.writer(f)
        w.writerow(["year", "kind", "tt_jd", "value", "source"])
        for year in range(1900, 2101):
            jd_jan1 = sum(erfa.cal2jd(year, 1, 1))
            for lon in (315, 0, 45, 90, 135, 180, 225, 270):
                days = ((lon - 280) % 360) / 360 * 365.2422
                g = jd_jan1 + days + 0.0
                a, b = np.array([g - 4.0]), np.array([g + 4.0])
                fun = lambda x: np.remainder(ecliptic_longitude(x) - math.radians(lon) + math.pi, 2 * math.pi) - math.pi
                r = bisect(fun, a, b, fun(a), iters=45)[0]
                w.writerow([year, "longitude_%d" % lon, "%.8f" % r, "", SOURCE])
            for kind, approx, sign in (("perihelion", 3.0, 1), ("aphelion", 185.0, -1)):
                g = jd_jan1 + approx
                t = g + np.arange(-6.0, 6.0001, 0.05)
                d = sign * earth_sun_distance(t)
                i = int(np.argmin(d))
                a, b = t[i] - 0.05, t[i] + 0.05
                for _ in range(60):  # golden-section search
                    m1, m2 = a + 0.382 * (b - a), a + 0.618 * (b - a)
                    if sign * earth_sun_distance(m1)[0] < sign * earth_sun_distance(m2)[0]:
                        b = m2
                    else:
                        a = m1
                r = 0.5 * (a + b)
                w.writerow([year, kind, "%.8f" % r, "%.10f" % earth_sun_distance(r)[0], SOURCE])


def events(rng):
    # --- daily events
    thresholds = [-0.8333, -6.0, -12.0, -18.0, 6.0, -4.0, 20.0]
    sites = []
    for lat in list(np.arange(-66, 67, 6)) + [-89, -85, -80, -75, -70, 70, 75, 78, 80, 85, 89]:
        for lon in (-179.9, -122.3, -58.4, -3.7, 0.0, 16.4, 77.2, 139.7, 179.9):
            sites.append((float(lat), lon))
    rows = []
    n = 0
    for (lat, lon) in sites:
        # one date per site, spread over 1973-2023; high latitudes get three
        k = 3 if abs(lat) >= 70 else 1
        for _ in range(k):
            jd = math.floor(rng.uniform(2441714.5, 2460065.5)) + 0.5  # 1973-02-01 .. 2023-04-30
            elev = float(rng.choice([0.0, 0.0, 350.0, 1800.0]))
            tz = int(round(lon / 15.0))
            jd0 = jd - tz / 24.0
            ths = list(thresholds)
            dip = 1.76 / 60 * math.sqrt(elev)
            rs = -0.8333 - dip
            ths[0] = rs
            ev = day_events(lat, lon, elev, jd0, ths)
            y, mo, d, _ = erfa.jd2cal(jd, 0.0)
            date = "%04d-%02d-%02d" % (y, mo, d)
            for th in ths + ["transit"]:
                label = "transit" if th == "transit" else ("%.6f" % th)
                rows.append([n, lat, lon, elev, tz, date, label,
                             ";".join("%s:%s" % (k2, iso_ms(r)) for k2, r in ev[th]), SOURCE])
            n += 1
        sys.stderr.write(".")
    with open(os.path.join(HERE, "crosscheck-sun-erfa.csv"), "w", newline="") as f:
        w = csv.writer(f)
        w.writerow(["case", "lat", "lon", "elev_m", "tz_hours", "date", "altitude_deg", "events", "source"])
        w.writerows(rows)
    sys.stderr.write("\n")


if __name__ == "__main__":
    main()
