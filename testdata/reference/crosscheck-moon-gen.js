// crosscheck-moon-gen.js writes crosscheck-moon.csv: Moon phases, moonrise,
// moonset and upper transits computed by an independent general-purpose
// library from the npm registry, astronomy-engine (pinned below), for the Go
// test TestMoonCrossCheck (astro/moon_crosscheck_test.go). The Go test reads
// the committed CSV, so `go test ./...` needs neither node nor the library.
//
// Regenerate from the repository root:
//
//   d=$(mktemp -d) && (cd "$d" && npm install --no-save astronomy-engine@2.1.19) &&
//     NODE_PATH="$d/node_modules" node testdata/reference/crosscheck-moon-gen.js \
//     > testdata/reference/crosscheck-moon.csv
//
// Conventions of the library (its documentation): rise/set is the top of the
// Moon's disk (equatorial radius 1738.1 km, topocentric distance) at the
// horizon with 34′ of refraction, for a topocentric Moon; sea-level
// observers here (no dip). Its ΔT is the Espenak–Meeus polynomials; phases
// are written with their TT instant so ΔT models do not enter the phase
// comparison.
//
// Phases: the library's own SearchMoonQuarter compares longitudes without
// the annual aberration of the Sun (its PairLongitude uses positions without
// aberration), which puts every phase about 40 s after the almanac-office
// (USNO) definition by apparent longitudes. So each of its quarters is solved
// again here, with the library's Search, on the library's apparent positions:
// the Sun from GeoVector(Sun, t, aberration = true), the Moon from GeoMoon at
// t − light time (the geocentric apparent Moon), both through Ecliptic (true
// ecliptic and equinox of date).
'use strict';
const Astronomy = require('astronomy-engine');

const LIBRARY = 'astronomy-engine';
const VERSION = '2.1.19';
const SOURCE = `${LIBRARY} ${VERSION} (npm)`;

// Sites from 60°S to 60°N (plus two at 65°), spread in longitude, including
// both sides of the date line. Coordinates only; no place is implied.
const sites = [
  [0.0, 0.0], [-60.0, -68.3], [-51.7, -57.9], [-45.0, 170.5], [-33.9, 18.5],
  [-23.5, -46.6], [-12.0, 130.8], [-1.3, 36.8], [8.5, -179.9], [14.6, 121.0],
  [19.8, -155.5], [29.0, -81.0], [35.7, 139.7], [40.4, -3.7], [48.2, 16.4],
  [52.5, 13.4], [55.8, 37.6], [59.9, 10.7], [60.0, -150.0], [36.95, -112.52],
  [-36.9, 174.8], [64.8, -147.7], [-65.0, 140.0], [45.0, 179.9],
];

// One month per site, spread over 1950–2080.
function monthFor(i) {
  const year = 1950 + ((i * 37) % 131);
  const month = (i * 5) % 12; // 0-based
  return [year, month];
}

function iso(t) { return t.date.toISOString(); }
function ttJD(t) { return (t.tt + 2451545.0).toFixed(8); }

const rows = [];
rows.push('kind,lat,lon,elev_m,span_start,span_end,utc,tt_jd,source');

// apparentElongation returns the library's apparent geocentric elongation in
// longitude Moon − Sun (degrees, [0, 360)) at time t.
function apparentElongation(t) {
  const sun = Astronomy.Ecliptic(Astronomy.GeoVector(Astronomy.Body.Sun, t, true)).elon;
  const g = Astronomy.GeoMoon(t);
  const tau = Math.hypot(g.x, g.y, g.z) / Astronomy.C_AUDAY;
  const m = Astronomy.GeoMoon(t.AddDays(-tau));
  m.t = t;
  const moon = Astronomy.Ecliptic(m).elon;
  return ((moon - sun) % 360 + 360) % 360;
}

function solvePhase(quarter, approx) {
  const target = 90 * quarter;
  const f = (t) => {
    let d = apparentElongation(t) - target;
    d = ((d + 180) % 360 + 360) % 360 - 180;
    return d;
  };
  const r = Astronomy.Search(f, approx.AddDays(-0.05), approx.AddDays(0.05), { dt_tolerance_seconds: 0.01 });
  if (r === null) throw new Error('phase not bracketed near ' + approx.date.toISOString());
  return r;
}

// Moon phases: every phase of a sample of years 1900–2100.
const phaseKinds = ['new_moon', 'first_quarter', 'full_moon', 'last_quarter'];
for (const year of [1900, 1927, 1950, 1969, 1986, 2000, 2013, 2024, 2025, 2026, 2038, 2050, 2077, 2099]) {
  const start = new Date(Date.UTC(year, 0, 1));
  const end = new Date(Date.UTC(year + 1, 0, 1));
  let t = Astronomy.MakeTime(start);
  for (;;) {
    const q = Astronomy.SearchMoonQuarter(t);
    if (q.time.date >= end) break;
    const tm = solvePhase(q.quarter, q.time);
    if (tm.date >= start && tm.date < end) {
      rows.push([phaseKinds[q.quarter], '', '', '', start.toISOString(), end.toISOString(), iso(tm), ttJD(tm), SOURCE].join(','));
    }
    t = q.time.AddDays(1);
  }
}

// Moonrise, moonset, upper transit: every event in one month per site.
sites.forEach(([lat, lon], i) => {
  const [year, month] = monthFor(i);
  const start = new Date(Date.UTC(year, month, 1));
  const end = new Date(Date.UTC(year, month + 1, 1));
  const obs = new Astronomy.Observer(lat, lon, 0);
  const span = (end - start) / 86400000;
  const events = [];
  for (const [kind, dir] of [['moonrise', +1], ['moonset', -1]]) {
    let t = Astronomy.MakeTime(start);
    for (;;) {
      const limit = span - (t.ut - Astronomy.MakeTime(start).ut);
      if (limit <= 0) break;
      const r = Astronomy.SearchRiseSet(Astronomy.Body.Moon, obs, dir, t, limit);
      if (r === null || r.date >= end) break;
      events.push([kind, r]);
      t = r.AddDays(0.01);
    }
  }
  let t = Astronomy.MakeTime(start);
  for (;;) {
    const h = Astronomy.SearchHourAngle(Astronomy.Body.Moon, obs, 0, t);
    if (h.time.date >= end) break;
    events.push(['moon_transit', h.time]);
    t = h.time.AddDays(0.1);
  }
  events.sort((a, b) => a[1].ut - b[1].ut);
  for (const [kind, tm] of events) {
    rows.push([kind, lat, lon, 0, start.toISOString(), end.toISOString(), iso(tm), ttJD(tm), SOURCE].join(','));
  }
});

process.stdout.write('# Generated by testdata/reference/crosscheck-moon-gen.js with ' + SOURCE + '; do not edit.\n');
process.stdout.write(rows.join('\n') + '\n');
