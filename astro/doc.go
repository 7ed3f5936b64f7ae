// Package astro computes the positions and events of the Sun and the Moon
// for heliocal: time scales, the apparent Sun and Moon, equinoxes and
// solstices, the Earth's perihelion and aphelion, the Moon's phases, and
// horizon events (sunrise, sunset, twilight, golden and blue hour, any
// altitude threshold, solar noon, moonrise, moonset, dark-sky windows) for
// any site on the Earth.
//
// It implements published methods with the standard library only: no I/O,
// no files read at run time (the coefficient tables are generated Go
// source), no logging.
//
// # Where to start
//
// Events at a place are searched on an ephemeris built once for a span of
// dates and shared by any number of places (see the examples):
//
//   - sunrise, sunset and twilight: NewEphemeris for the dates, an Observer
//     for the place, then Ephemeris.SunDays with Observer.RiseSetAltitude
//     (sunrise and sunset), CivilTwilight, NauticalTwilight,
//     AstronomicalTwilight or any altitude: one Day per local date with its
//     rising and setting crossings, or the State AlwaysAbove (midnight Sun)
//     or AlwaysBelow (polar night) when there is none. Ephemeris.SunCrossings
//     gives the same crossings over a span of instants instead of dates;
//   - solar noon: Ephemeris.SunTransits;
//   - the Sun's place in a site's sky at one instant ("where is the Sun now,
//     from here?"): SunFrom, one call without an Ephemeris (altitude,
//     refracted altitude, azimuth, distance, semidiameter); MoonFrom for the
//     Moon. For many instants of a span, Ephemeris.SunAltitude and
//     Ephemeris.SunAzimuth give the same altitude and azimuth cheaper;
//   - moonrise, moonset and the Moon's transits: NewMoonEphemeris, then
//     MoonEphemeris.MoonDays and MoonEphemeris.MoonTransits; dark-sky
//     windows: MoonEphemeris.DarkWindows;
//   - the Moon's phases and lit fraction: MoonPhases, MoonIllumination;
//   - equinoxes and solstices: Seasons (CrossQuarters, Perihelion and
//     Aphelion likewise, by year); eclipses: SolarEclipses, LunarEclipses
//     and their Local circumstances;
//   - the geocentric Sun and Moon at an instant: Sun, Moon; time scales:
//     JulianDay, JulianEphemerisDay, DeltaT.
//
// Instants may be given in any location: only the instant counts, and
// results are in UTC (In shows them on a local clock). The per-date searches
// (SunDays, MoonDays, DarkWindows and their skyline forms) take the time
// zone whose dates they list, and read first and last as dates in it.
//
// Every function and method is safe for concurrent use: an Ephemeris or
// MoonEphemeris is immutable once built, and the package keeps no other
// state than tables computed once.
//
// # Sources
//
//	file                      method                                       published source
//	julian.go                 Julian day ↔ time.Time                       Meeus, Astronomical Algorithms 2nd ed. (1998), ch. 7
//	deltat.go, zz_deltat.go   UTC → TT, UT1; ΔT model                      USNO/IERS observed ΔT 1973–2023; Espenak & Meeus polynomials (NASA, 2006) before;
//	                                                                       Stephenson, Morrison & Hohenkerk, Proc. R. Soc. A 472 (2016) after; IERS leap seconds
//	nutation.go               nutation, obliquity                          IAU 1980 theory, Meeus ch. 22 (Table 22.A, eq. 22.2)
//	sidereal.go               mean and apparent sidereal time              Meeus ch. 12 (eq. 12.4, IAU 1982)
//	vsop87.go, zz_vsop87_*.go the Earth's heliocentric position            VSOP87D, Bretagnon & Francou, A&A 202, 309 (1988); Meeus ch. 32
//	sun.go                    apparent Sun, equation of time               Meeus ch. 25 (higher accuracy), 28; FK5 correction eq. 32.3;
//	                                                                       IAU 2000 precession-rate correction (Mathews et al. 2002)
//	seasons.go                equinoxes, solstices, cross-quarters         Meeus ch. 27 (Table 27.B starting values, iterated on sun.go)
//	apsides.go                perihelion, aphelion (Earth centre)          Meeus ch. 38 (eq. 38.1 start), extrema of VSOP87D R
//	ephemeris.go, horizon.go  shared track, threshold crossings, transits  Meeus ch. 15 (hour-angle estimate), ch. 11 (observer, WGS 84),
//	                                                                       USNO rise/set and twilight definitions; refraction: Bennett's
//	                                                                       formula scaled for pressure and temperature, Meeus ch. 16
//	azimuth.go                azimuth of the Sun and the Moon              Meeus ch. 13 (counted here from the north)
//	topocentric.go, sun.go    the Sun and the Moon from a site at one      Meeus ch. 40 (parallax, eqs. 40.2, 40.3), 13 (altitude, azimuth),
//	                          instant (SunFrom, MoonFrom)                  16 (Bennett's refraction, solved for the apparent altitude)
//	skyline.go                rise and set over a skyline per direction    Meeus eq. 16.4 (refraction at the skyline's altitude)
//	elp.go, zz_elp_moon.go    the Moon's geocentric position               ELP/MPP02 (DE405 fit), Chapront & Francou, A&A 404, 735 (2003)
//	moon.go                   apparent Moon (light time, nutation),        Meeus ch. 47 (method), 40 (parallax), 48 (illuminated fraction,
//	                          topocentric Moon, illumination               bright limb)
//	phases.go                 new, first quarter, full, last quarter       Meeus ch. 49 (starting values), iterated on moon.go and sun.go
//	moonrise.go               moonrise, moonset, transit                   USNO definitions, the search of horizon.go
//	darksky.go                dark-sky windows                             USNO astronomical twilight; moonrise.go
//	lunar_apsides.go          the Moon's perigee and apogee                Meeus ch. 50 (eq. 50.1 start), extrema of the ELP/MPP02 distance
//	eclipse*.go               solar eclipses: Besselian elements, local    Explanatory Supplement to the Astronomical Almanac (1992), ch. 8.3;
//	                          circumstances; lunar eclipses: contacts,     k = 0.2725076 (IAU 1982); lunar shadow: Danjon (1951) as in Espenak &
//	                          magnitudes, the Moon at the site             Meeus, Five Millennium Canon of Lunar Eclipses (NASA/TP-2009-214172)
//
// # Conventions
//
// Instants are time.Time and are read as UTC. UTC is converted to
// Terrestrial Time (TT, for the theories) and to UT1 (for the Earth's
// rotation) as deltat.go describes: TT − UTC from the leap seconds and
// UT1 − UTC from the observed ΔT within 1972–2023, UT1 = UTC outside, and a
// ΔT model (observed values, Espenak–Meeus polynomials, a smooth
// extrapolation after 2023). Julian days of TT are called jde, of UT jd.
// Exported angles are degrees, distances au (Sun) or km (Moon), durations
// time.Duration. Longitude is east-positive everywhere (ISO 6709): unlike
// Meeus's west-positive convention, and there is no conversion anywhere.
// Altitudes of horizon events are topocentric (parallax included: 8.794″/r
// for the Sun) and geometric: refraction is part of the thresholds
// (sunrise −0.8333° = 34′ of refraction + 16′ of semidiameter; the dip of the
// horizon 1.76′·√h for an elevated observer; twilight −6°, −12°, −18°).
//
// The supported span is 1800-01-01 to 2200-12-31 (MinTime, MaxTime), every
// kind of event on every date of it; the computations run a month beyond it
// (RangeMargin; the yearly ones for 1799..2201) for the margins the dates at
// either end need. Outside that, functions return a *RangeError that matches
// ErrOutOfRange. Invalid input (a latitude of 95°, a NaN, a span that ends
// before it starts) gives an error matching ErrInvalidInput: for a number,
// an *InputError naming the field and value. Polar day and polar night are
// not errors: they are states (State, Day) of the result.
//
// # Accuracy
//
// Measured in the package's tests against independent references (ERFA,
// the IAU SOFA-derived library, with IAU 2006/2000A precession-nutation and
// its DE405-fitted Earth; USNO tables; Meeus's worked examples):
//
//   - apparent Sun 1900–2100: within 0.06″ of ERFA in longitude, right
//     ascension and declination;
//   - equinoxes, solstices and cross-quarters 1900–2100: within 1.2 s (TT)
//     of ERFA; USNO's minute-rounded table 1905–2100 within 2 min (ΔT
//     models differ after 2023);
//   - perihelion and aphelion 1960–2060: within 27 s (TT, median 4.4 s) of
//     JPL's DE405 ephemeris itself; within 34 s of ERFA (whose own Earth is
//     up to 23 s off DE405 there) and within 46 s of Meeus's table (0.01 h);
//   - sunrise, sunset, twilight, other thresholds, solar noon, 1973–2023:
//     within 0.05 s of ERFA up to 66° of latitude, every event present
//     from 89° S to 89° N; within the minute rounding of USNO's tables.
//   - the Sun from a site (SunFrom): within 0.51″ of PyEphem in altitude
//     and azimuth at PyEphem's time scales, within 2″ of NOAA's spreadsheet
//     in altitude once NOAA's omitted parallax is added back; within
//     0.001″ of Ephemeris.SunAltitude and SunAzimuth;
//   - apparent Moon 1800–2199: within 0.13″ of the Swiss Ephemeris with its
//     DE431-based files (0.4 km in distance);
//   - Moon phases 1900–2099: within 0.22 s (TT) of the same; within the
//     minute rounding of USNO's table 1900–2019;
//   - moonrise, moonset, lunar transit: within 0.54 s of the same from 60° S
//     to 60° N where the ΔT models agree (to 2023), the same events at
//     66°–85°; within the minute rounding of USNO's tables.
//
// # Incomplete
//
//   - Nutation is the IAU 1980 theory in the 63 terms of Meeus Table 22.A,
//     not the complete 106 terms nor IAU 2000A: the dropped terms are below
//     0.003″ (measured against the complete series), and IAU 1980 stays
//     within 0.05″ of IAU 2000A; both are far below what a sunrise or a
//     season instant can show (0.05″ of solar longitude is 1.2 s).
//   - Polar motion and diurnal aberration (0.3″ at most) are ignored.
//   - Refraction is the standard one (34′ at a flat horizon, Bennett's
//     formula at a raised one), scaled for a site's pressure and temperature
//     when they are given; the air's layers (inversions, mirages) move a
//     sunrise by minutes more, at high latitudes further.
//   - UT1 − UTC is known only where ΔT is observed (1972–2023); elsewhere
//     UT1 = UTC is assumed, which is within 0.9 s for future dates as long
//     as leap seconds keep |UT1 − UTC| below 0.9 s.
//   - ΔT before 1973 and after 2023 is a model; for events in UT the
//     uncertainty grows to a minute by 2100 (not for sunrise and sunset,
//     which depend on UT1 only through the Earth's rotation).
//   - The Julian calendar (dates before 1582) is not supported: the
//     supported span starts in 1800.
//   - The Moon is ELP/MPP02 in its published 4,862-term reduced form,
//     truncated to 2,096 terms (within 0.08″ of it over 1800–2200); the
//     illuminated fraction is geocentric; librations are not computed.
package astro
