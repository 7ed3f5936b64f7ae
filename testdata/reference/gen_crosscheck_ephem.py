#!/usr/bin/env python3
"""Generate a second, general-purpose cross-check of the Sun's daily events
with PyEphem (Debian's python3-ephem, libastro):

    apt-get install -y python3-ephem
    /usr/bin/python3 testdata/reference/gen_crosscheck_ephem.py

It writes crosscheck-sun-ephem.csv next to this script, in the format of
crosscheck-sun-erfa.csv: per site, local date (fixed zone round(lon/15) h)
and threshold, the list of crossings ("R:" rising, "S:" setting, "T:" upper
transit) within the date. Conventions matched to heliocal's: pressure = 0
(no refraction), the threshold is the geometric altitude of the Sun's
centre (use_center), sea-level observer; sunrise at -0:50 (-0.8333 deg).
PyEphem takes the time as UT (no UT1 - UTC) and uses its own Delta T and a
shorter solar theory, so agreement is expected within about a second, not
to the hundredths of ERFA. Latitudes up to 60 degrees: PyEphem's
next_rising/next_setting is not meant for grazing polar cases.
"""

import csv
import math
import os
import random

import ephem

HERE = os.path.dirname(os.path.abspath(__file__))
SOURCE = "PyEphem %s (python3-ephem, Debian; libastro); gen_crosscheck_ephem.py" % ephem.__version__
THRESHOLDS = [-0.8333, -6.0, -12.0, -18.0, 6.0, -4.0]


def day_events(lat, lon, start, end, alt):
    obs = ephem.Observer()
    obs.lat, obs.lon = str(lat), str(lon)
    obs.elevation = 0
    obs.pressure = 0
    if alt != "transit":
        obs.horizon = str(alt)
    sun = ephem.Sun()
    out = []
    if alt == "transit":
        t = start
        while True:
            obs.date = t
            r = obs.next_transit(sun)
            if r >= end:
                break
            out.append(("T", r))
            t = ephem.Date(r + ephem.second)
        return out
    for kind, fn in (("R", obs.next_rising), ("S", obs.next_setting)):
        t = start
        while True:
            obs.date = t
            try:
                r = fn(sun, use_center=True)
            except (ephem.AlwaysUpError, ephem.NeverUpError):
                break
            if r >= end:
                break
            out.append((kind, r))
            t = ephem.Date(r + ephem.second)
    out.sort(key=lambda x: x[1])
    return out


def iso_ms(d):
    y, mo, dd, h, mi, s = ephem.Date(d).tuple()
    ms = int(round(s * 1000))
    base = "%04d-%02d-%02dT%02d:%02d:" % (y, mo, dd, h, mi)
    if ms >= 60000:  # let ephem carry the rounding into the minute
        return iso_ms(d + 0.0005 * ephem.second)
    return base + "%02d.%03dZ" % (ms // 1000, ms % 1000)


def main():
    rnd = random.Random(20270102)
    rows = []
    case = 0
    for lat in range(-60, 61, 5):
        for lon in (-179.9, -97.5, -43.2, 0.0, 16.4, 88.3, 151.2, 179.9):
            year = rnd.randint(1900, 2100)
            month, day = rnd.randint(1, 12), rnd.randint(1, 28)
            tz = int(round(lon / 15.0))
            start = ephem.Date("%04d/%02d/%02d 00:00:00" % (year, month, day)) - tz * ephem.hour
            end = ephem.Date(start + 1)
            date = "%04d-%02d-%02d" % (year, month, day)
            for alt in THRESHOLDS + ["transit"]:
                evs = day_events(lat, lon, start, end, alt)
                label = "transit" if alt == "transit" else "%.6f" % alt
                rows.append([case, float(lat), lon, 0.0, tz, date, label,
                             ";".join("%s:%s" % (k, iso_ms(r)) for k, r in evs), SOURCE])
            case += 1
    with open(os.path.join(HERE, "crosscheck-sun-ephem.csv"), "w", newline="") as f:
        w = csv.writer(f)
        w.writerow(["case", "lat", "lon", "elev_m", "tz_hours", "date", "altitude_deg", "events", "source"])
        w.writerows(rows)


if __name__ == "__main__":
    main()
