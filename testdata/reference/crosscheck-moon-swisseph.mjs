// crosscheck-moon-swisseph.mjs writes crosscheck-moon-swisseph.csv: Moon
// phases, moonrise, moonset and upper transits from the Swiss Ephemeris
// (version printed in every row), through the npm package swisseph-wasm
// 0.1.0, which ships the Swiss Ephemeris files sepl_18.se1 / semo_18.se1
// (the JPL DE431 ephemeris compressed to better than 0.001″, 1800–2400).
// It is the JPL-grade reference of TestMoonCrossCheck
// (astro/moon_crosscheck_test.go); the Go test reads the committed CSV, so
// `go test ./...` needs neither node nor the package.
//
// Regenerate from the repository root:
//
//   d=$(mktemp -d) && (cd "$d" && npm install --no-save swisseph-wasm@0.1.0) &&
//     cp testdata/reference/crosscheck-moon-swisseph.mjs "$d"/gen.mjs &&
//     node "$d"/gen.mjs > testdata/reference/crosscheck-moon-swisseph.csv
//
// Definitions used with the library:
//   - phases: apparent geocentric ecliptic longitudes of date (swe_calc with
//     the Swiss Ephemeris files: light time, aberration, nutation), Moon −
//     Sun = 0/90/180/270°, solved here by Newton's method in Terrestrial Time
//     (the tt_jd column; ΔT models do not enter the comparison);
//   - rise/set: swe_rise_trans_true_hor with SE_BIT_NO_REFRACTION and a
//     horizon height of −34′: the upper limb of the topocentric Moon at a
//     geometric altitude of −34′, i.e. 34′ of standard refraction (USNO's
//     definition; the library's own refraction model would differ by a few
//     seconds); sea-level observers; transits with SE_CALC_MTRANSIT. The
//     library converts UT with its own ΔT.
import SwissEph from 'swisseph-wasm';

const swe = new SwissEph();
await swe.initSwissEph();
const SOURCE = `Swiss Ephemeris ${swe.version()} with DE431-based files (npm swisseph-wasm 0.1.0)`;

const SEFLG_SWIEPH = 2, SEFLG_SPEED = 256;
const SE_SUN = 0, SE_MOON = 1;
const SE_CALC_RISE = 1, SE_CALC_SET = 2, SE_CALC_MTRANSIT = 4, SE_BIT_NO_REFRACTION = 512;

// The same sites and months as crosscheck-moon-gen.js.
const sites = [
  [0.0, 0.0], [-60.0, -68.3], [-51.7, -57.9], [-45.0, 170.5], [-33.9, 18.5],
  [-23.5, -46.6], [-12.0, 130.8], [-1.3, 36.8], [8.5, -179.9], [14.6, 121.0],
  [19.8, -155.5], [29.0, -81.0], [35.7, 139.7], [40.4, -3.7], [48.2, 16.4],
  [52.5, 13.4], [55.8, 37.6], [59.9, 10.7], [60.0, -150.0], [36.95, -112.52],
  [-36.9, 174.8], [64.8, -147.7], [-65.0, 140.0], [45.0, 179.9],
];
function monthFor(i) {
  return [1950 + ((i * 37) % 131), (i * 5) % 12];
}

const jdUnix = 2440587.5;
const isoFromJD = (jd) => new Date(Math.round((jd - jdUnix) * 86400000)).toISOString();
const jdFromDate = (d) => d.getTime() / 86400000 + jdUnix;

function elongation(jdTT) {
  const m = swe.calc(jdTT, SE_MOON, SEFLG_SWIEPH | SEFLG_SPEED);
  const s = swe.calc(jdTT, SE_SUN, SEFLG_SWIEPH | SEFLG_SPEED);
  return [m.longitude - s.longitude, m.longitudeSpeed - s.longitudeSpeed];
}

const rows = ['kind,lat,lon,elev_m,span_start,span_end,utc,tt_jd,source'];

// Phases: mean phases (Meeus eq. 49.1 constants) as starting values, then
// Newton's method on the apparent elongation, in TT.
const phaseKinds = ['new_moon', 'first_quarter', 'full_moon', 'last_quarter'];
for (const year of [1900, 1927, 1950, 1969, 1986, 2000, 2013, 2024, 2025, 2026, 2038, 2050, 2077, 2099]) {
  const start = new Date(Date.UTC(year, 0, 1));
  const end = new Date(Date.UTC(year + 1, 0, 1));
  const jdStart = jdFromDate(start), jdEnd = jdFromDate(end);
  let k = Math.floor((jdStart - 2451550.09766) / 29.530588861 * 4) / 4 - 0.25;
  for (;; k += 0.25) {
    let t = 2451550.09766 + 29.530588861 * k;
    if (t > jdEnd + 2) break;
    const q = ((Math.round(k * 4) % 4) + 4) % 4;
    for (let i = 0; i < 20; i++) {
      const [e, rate] = elongation(t);
      const d = (((e - 90 * q) % 360) + 540) % 360 - 180;
      const step = d / rate;
      t -= step;
      if (Math.abs(step) < 1e-9) break;
    }
    const ut = t - swe.deltat(t);
    const utc = isoFromJD(ut);
    if (new Date(utc) >= start && new Date(utc) < end) {
      rows.push([phaseKinds[q], '', '', '', start.toISOString(), end.toISOString(), utc, t.toFixed(8), SOURCE].join(','));
    }
  }
}

// Moonrise, moonset, upper transit: every event in one month per site.
sites.forEach(([lat, lon], i) => {
  const [year, month] = monthFor(i);
  const start = new Date(Date.UTC(year, month, 1));
  const end = new Date(Date.UTC(year, month + 1, 1));
  const jdStart = jdFromDate(start), jdEnd = jdFromDate(end);
  const events = [];
  for (const [kind, rsmi] of [['moonrise', SE_CALC_RISE | SE_BIT_NO_REFRACTION], ['moonset', SE_CALC_SET | SE_BIT_NO_REFRACTION], ['moon_transit', SE_CALC_MTRANSIT]]) {
    let t = jdStart;
    while (t < jdEnd) {
      const r = swe.rise_trans_true_hor(t, SE_MOON, '', SEFLG_SWIEPH, rsmi, [lon, lat, 0], 0, 0, -34 / 60);
      if (r === null || !(r[0] > t)) { // no event soon (Moon circumpolar): look again a day later
        t += 1;
        continue;
      }
      if (r[0] >= jdEnd) break;
      events.push([kind, r[0]]);
      t = r[0] + 0.01;
    }
  }
  events.sort((a, b) => a[1] - b[1]);
  for (const [kind, jd] of events) {
    rows.push([kind, lat, lon, 0, start.toISOString(), end.toISOString(), isoFromJD(jd), (jd + swe.deltat(jd)).toFixed(8), SOURCE].join(','));
  }
});

process.stdout.write('# Generated by testdata/reference/crosscheck-moon-swisseph.mjs with ' + SOURCE + '; do not edit.\n');
process.stdout.write(rows.join('\n') + '\n');
