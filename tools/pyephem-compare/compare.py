#!/usr/bin/env python3
"""Events per second of `heliocal events` against PyEphem, whole process
against whole process, on the same machine in one run.

    apt-get install -y python3-ephem
    go build -o /tmp/heliocal ./cmd/heliocal
    /usr/bin/python3 tools/pyephem-compare/compare.py --heliocal /tmp/heliocal [--runs 3] [--years 20]
        [--to file|pipe|null] [--floor]

Both sides compute the same kinds for the same place and dates with the same
method (for each threshold of the Sun's centre, every rising and setting
crossing, found date after date; solar noon as the upper transit) and write
the events as JSON to stdout. heliocal runs

    heliocal events --lat 47.3 --lon 8.5 --elev 400 --tz UTC --from 2020-01-01
      --to 2039-12-31 --kinds sunrise,sunset,solar-noon,civil-dawn,civil-dusk,
      nautical-dawn,nautical-dusk,astronomical-dawn,astronomical-dusk,
      sun-altitude:6,sun-altitude:-4 --format json

and PyEphem (libastro) runs this script's "pyephem" mode: Observer with
pressure 0 (the thresholds are geometric altitudes of the centre, as in
heliocal), use_center, the rise/set threshold -0.8333 deg lowered by the dip
of the horizon for 400 m (1.76' sqrt(h), as heliocal does). The runs
alternate (heliocal, PyEphem, heliocal, ...) so that both see the same load;
each is timed by its wall clock and by its CPU time (user + system, from
the kernel's child accounting). The script prints each run, the median
events per second of each side and their ratio, and the load average.

Where the output goes (--to) is part of what is timed:
  file  a fresh temporary file (as `> events.json` would; the default): the
        kernel puts the 10.7 MB into new page-cache pages, which costs the
        writer more after the machine has done other work (see --floor);
  pipe  a pipe this script reads (the reader's own pace is part of the
        writer's wall time; --pipe is the same);
  null  /dev/null, as hyperfine runs a command by default: the process's
        own work, from exec to exit, without the destination's.
--floor also times `cat` copying heliocal's output into the same kind of
destination, each run right after a PyEphem run as heliocal's runs are (the
sequence becomes heliocal, PyEphem, cat, PyEphem): what the destination alone
costs a process that only writes those bytes.
"""

import argparse
import json
import math
import os
import resource
import statistics
import subprocess
import sys
import tempfile
import time

LAT, LON, ELEV = 47.3, 8.5, 400.0
KINDS = ("sunrise,sunset,solar-noon,civil-dawn,civil-dusk,nautical-dawn,nautical-dusk,"
         "astronomical-dawn,astronomical-dusk,sun-altitude:6,sun-altitude:-4")
# the ratio heliocal / PyEphem that the README's performance table asks for
# (>= 300x): --floor prints the wall time of PyEphem's median run over it,
# the most that heliocal's run may take
GOAL = 300


def pyephem_events(first_year, last_year):
    """The PyEphem side: every event of KINDS over the years, as JSON."""
    import ephem

    rise_set = -0.8333 - 1.76 / 60 * math.sqrt(ELEV)
    # kind name, threshold (deg), which crossing(s)
    kinds = [
        ("sunrise", rise_set, "R"), ("sunset", rise_set, "S"),
        ("civil-dawn", -6.0, "R"), ("civil-dusk", -6.0, "S"),
        ("nautical-dawn", -12.0, "R"), ("nautical-dusk", -12.0, "S"),
        ("astronomical-dawn", -18.0, "R"), ("astronomical-dusk", -18.0, "S"),
        ("sun-altitude:6", 6.0, "RS"), ("sun-altitude:-4", -4.0, "RS"),
    ]
    start = ephem.Date("%d/1/1" % first_year)
    end = ephem.Date("%d/1/1" % (last_year + 1))
    sun = ephem.Sun()
    events = []

    def observer(horizon):
        o = ephem.Observer()
        o.lat, o.lon = str(LAT), str(LON)
        o.elevation = ELEV
        o.pressure = 0
        o.horizon = str(horizon)
        return o

    for name, alt, which in kinds:
        obs = observer(alt)
        for d, fn in (("rising", obs.next_rising), ("setting", obs.next_setting)):
            if d[0].upper() not in which:
                continue
            t = start
            while True:
                obs.date = t
                try:
                    r = fn(sun, use_center=True)
                except (ephem.AlwaysUpError, ephem.NeverUpError):
                    t = ephem.Date(t + 1)
                    if t >= end:
                        break
                    continue
                if r >= end:
                    break
                events.append((r, name, d))
                t = ephem.Date(r + ephem.minute)
    obs = observer(0)
    t = start
    while True:
        obs.date = t
        r = obs.next_transit(sun)
        if r >= end:
            break
        events.append((r, "solar-noon", ""))
        t = ephem.Date(r + ephem.minute)
    events.sort(key=lambda e: e[0])
    out = []
    for r, name, d in events:
        dt = ephem.Date(r).datetime()
        e = {"kind": name, "start": dt.strftime("%Y-%m-%dT%H:%M:%S.") + "%03dZ" % (dt.microsecond // 1000),
             "date": dt.strftime("%Y-%m-%d")}
        if d:
            e["direction"] = d
        out.append(e)
    # the layout of heliocal's listing: one event per line
    w = sys.stdout.write
    w('{\n  "events": [')
    for i, e in enumerate(out):
        w((",\n    " if i else "\n    ") + json.dumps(e, separators=(",", ":")))
    w("\n  ]\n}\n")


def timed(cmd, to, stdin=None):
    """Runs cmd with stdout to a temporary file (to "file", as `> events.json`
    would), to a pipe that this script reads ("pipe") or to /dev/null
    ("null"); returns (wall s, cpu s, events, output). Through a pipe the
    reader's own pace is part of the writer's wall time. With "null" the
    events are not counted (0) and the output is empty."""
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    if to == "pipe":
        t0 = time.perf_counter()
        p = subprocess.run(cmd, stdin=stdin, stdout=subprocess.PIPE, check=True)
        wall = time.perf_counter() - t0
        out = p.stdout
    elif to == "null":
        with open(os.devnull, "wb") as f:
            t0 = time.perf_counter()
            subprocess.run(cmd, stdin=stdin, stdout=f, check=True)
            wall = time.perf_counter() - t0
        out = b""
    else:
        with tempfile.TemporaryFile() as f:
            t0 = time.perf_counter()
            subprocess.run(cmd, stdin=stdin, stdout=f, check=True)
            wall = time.perf_counter() - t0
            f.seek(0)
            out = f.read()
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    cpu = (after.ru_utime - before.ru_utime) + (after.ru_stime - before.ru_stime)
    return wall, cpu, out.count(b'"kind"'), out


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--heliocal", default="heliocal", help="path of the heliocal binary")
    ap.add_argument("--runs", type=int, default=3, help="runs of each side")
    ap.add_argument("--years", type=int, default=20, help="years from 2020")
    ap.add_argument("--to", choices=["file", "pipe", "null"], default="file",
                    help="where each side's output goes: a fresh temporary file, a pipe this script reads, "
                         "or /dev/null")
    ap.add_argument("--pipe", action="store_true", help="the same as --to pipe")
    ap.add_argument("--floor", action="store_true",
                    help="also time cat copying heliocal's output into the same kind of destination")
    ap.add_argument("mode", nargs="?", default="compare", choices=["compare", "pyephem"])
    a = ap.parse_args()
    if a.pipe:
        a.to = "pipe"
    first, last = 2020, 2020 + a.years - 1
    if a.mode == "pyephem":
        pyephem_events(first, last)
        return
    hc = [a.heliocal, "events", "--lat", str(LAT), "--lon", str(LON), "--elev", "%g" % ELEV, "--tz", "UTC",
          "--from", "%d-01-01" % first, "--to", "%d-12-31" % last, "--kinds", KINDS, "--format", "json"]
    py = [sys.executable, os.path.abspath(__file__), "--years", str(a.years), "pyephem"]
    if a.floor and a.to == "null":
        ap.error("--floor copies into a file or a pipe: use it with --to file or --to pipe")
    # with --to null the timed runs' output is not kept: each side's events
    # are counted first, in a run to a pipe that is not timed (the PyEphem
    # one comes last, so that heliocal's first timed run follows a PyEphem
    # run as the others do)
    count = {}
    if a.to == "null":
        for name, cmd in (("heliocal", hc), ("pyephem", py)):
            count[name] = timed(cmd, "pipe")[2]
            print("events (counted in a run to a pipe, not timed): %-8s %d" % (name, count[name]), flush=True)
    saved = tempfile.TemporaryFile() if a.floor else None  # heliocal's output, for cat
    rows = {"heliocal": [], "pyephem": [], "cat": []}
    order = [("heliocal", hc), ("pyephem", py)]
    if a.floor:
        order += [("cat", ["cat"]), ("pyephem", py)]
    print("output to: %s; load average before: %.2f %.2f %.2f" % ((a.to,) + os.getloadavg()))
    for i in range(a.runs):
        for name, cmd in order:
            stdin = None
            if name == "cat":
                saved.seek(0)
                stdin = saved
            wall, cpu, n, out = timed(cmd, a.to, stdin)
            if name == "heliocal" and i == 0 and a.floor:
                saved.write(out)
                saved.flush()
            if a.to == "null":
                n = count[name]
            rows[name].append((wall, cpu, n))
            print("run %d %-8s %7d events  wall %7.3f s (%9.0f events/s)  cpu %7.3f s (%9.0f events/s)"
                  % (i + 1, name, n, wall, n / wall, cpu, n / cpu), flush=True)
    print("load average after: %.2f %.2f %.2f" % os.getloadavg())
    med = {}
    for name, r in rows.items():
        if not r:
            continue
        med[name] = (statistics.median(n / w for w, c, n in r), statistics.median(n / c for w, c, n in r))
        print("median %-8s %9.0f events/s (wall)  %9.0f events/s (cpu)  %7.1f ms (wall)"
              % (name, med[name][0], med[name][1], statistics.median(w for w, c, n in r) * 1000))
    print("ratio heliocal / PyEphem: %.0fx (wall), %.0fx (cpu)"
          % (med["heliocal"][0] / med["pyephem"][0], med["heliocal"][1] / med["pyephem"][1]))
    if "cat" in med:
        print("cat alone copying heliocal's output to the same destination: %.1f ms (median wall);"
              " PyEphem's median wall / %d: %.1f ms"
              % (statistics.median(w for w, c, n in rows["cat"]) * 1000, GOAL,
                 statistics.median(w for w, c, n in rows["pyephem"]) * 1000 / GOAL))


if __name__ == "__main__":
    main()
