package astro_test

import (
	"context"
	"fmt"
	"math"
	"time"

	"heliocal/astro"
)

// hms formats degrees of right ascension or sidereal time as hours,
// minutes and seconds with prec decimals.
func hms(deg float64, prec int) string {
	s := deg / 15 * 3600
	h := math.Floor(s / 3600)
	s -= h * 3600
	m := math.Floor(s / 60)
	s -= m * 60
	return fmt.Sprintf("%.0fh%02.0fm%0*.*fs", h, m, prec+3, prec, s)
}

// dms formats degrees as signed degrees, minutes and seconds.
func dms(deg float64, prec int) string {
	sign := "+"
	if deg < 0 {
		sign, deg = "-", -deg
	}
	s := deg * 3600
	d := math.Floor(s / 3600)
	s -= d * 3600
	m := math.Floor(s / 60)
	s -= m * 60
	return fmt.Sprintf("%s%.0f°%02.0f′%0*.*f″", sign, d, m, prec+3, prec, s)
}

func ExampleJulianDay_meeus7a() {
	// Meeus, Astronomical Algorithms 2nd ed., Example 7.a, p. 61:
	// the launch of Sputnik 1, 1957 October 4.81 → JD 2436116.31.
	t := time.Date(1957, 10, 4, 19, 26, 24, 0, time.UTC) // .81 day
	fmt.Printf("JD %.2f\n", astro.JulianDay(t))
	// Example 7.c, p. 64, the other way round.
	fmt.Println(astro.TimeFromJulianDay(2436116.31).Format("2006-01-02 15:04:05"))
	// Output:
	// JD 2436116.31
	// 1957-10-04 19:26:24
}

func ExampleMeanSiderealTime_meeus12a() {
	// Meeus, Astronomical Algorithms 2nd ed., Example 12.a, p. 88:
	// 1987 April 10, 0h UT → mean sidereal time 13h10m46.3668s, apparent
	// 13h10m46.1351s (with the nutation of Example 22.a).
	jd := 2446895.5
	fmt.Println("mean    ", hms(astro.MeanSiderealTime(jd), 4))
	fmt.Println("apparent", hms(astro.ApparentSiderealTime(jd, jd), 4))
	// Example 12.b, p. 89: 1987 April 10, 19h21m00s UT → 8h34m57.0896s.
	fmt.Println("19:21 UT", hms(astro.MeanSiderealTime(astro.JulianDay(time.Date(1987, 4, 10, 19, 21, 0, 0, time.UTC))), 4))
	// Output:
	// mean     13h10m46.3668s
	// apparent 13h10m46.1351s
	// 19:21 UT 8h34m57.0896s
}

func ExampleNutation_meeus22a() {
	// Meeus, Astronomical Algorithms 2nd ed., Example 22.a, p. 148:
	// 1987 April 10, 0h TD → Δψ = −3.788″, Δε = +9.443″,
	// ε₀ = 23°26′27.407″, ε = 23°26′36.850″.
	jde := 2446895.5
	dpsi, deps := astro.Nutation(jde)
	fmt.Printf("Δψ %+.3f″  Δε %+.3f″\n", dpsi*3600, deps*3600)
	fmt.Println("ε₀", dms(astro.MeanObliquity(jde), 3))
	fmt.Println("ε ", dms(astro.TrueObliquity(jde), 3))
	// Output:
	// Δψ -3.788″  Δε +9.443″
	// ε₀ +23°26′27.407″
	// ε  +23°26′36.850″
}

func ExampleSun_meeus25b() {
	// Meeus, Astronomical Algorithms 2nd ed., Example 25.b, p. 169 (and
	// p. 165): the Sun on 1992 October 13.0 TD with the complete VSOP87 →
	// α = 13h13m30.749s, δ = −7°47′01.74″, R = 0.99760853 au. This package
	// adds the IAU 2000 precession-rate correction (0.02″ here), so it
	// prints α to 0.01 s and δ to 0.1″.
	t, err := astro.TimeFromJulianEphemerisDay(2448908.5)
	if err != nil {
		fmt.Println(err)
		return
	}
	s, err := astro.Sun(t)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("α", hms(s.RightAscension, 2))
	fmt.Println("δ", dms(s.Declination, 1))
	fmt.Printf("R %.7f au\n", s.Distance)
	// Output:
	// α 13h13m30.75s
	// δ -7°47′01.7″
	// R 0.9976085 au
}

func ExampleSun_equationOfTime28a() {
	// Meeus, Astronomical Algorithms 2nd ed., Example 28.a, p. 184:
	// 1992 October 13.0 TD → E = +13m42.6s (sundial fast).
	t, err := astro.TimeFromJulianEphemerisDay(2448908.5)
	if err != nil {
		fmt.Println(err)
		return
	}
	s, err := astro.Sun(t)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("E", s.EquationOfTime.Round(100*time.Millisecond))
	// Output:
	// E 13m42.6s
}

func ExampleSeasons_meeus27b() {
	// Meeus, Astronomical Algorithms 2nd ed., Example 27.b, p. 180: the June
	// solstice of 1962 at 21:24:42 TD (Dynamical Time; UT = TD − ΔT). This
	// package finds 21:24:39 TD: it adds the IAU 2000 precession-rate
	// correction (0.11″ of solar longitude in 1962, 2.7 s) that the book's
	// VSOP87 of date lacks; TestMeeusSeasons checks the book within 5 s.
	s, err := astro.Seasons(1962)
	if err != nil {
		fmt.Println(err)
		return
	}
	jde, _ := astro.JulianEphemerisDay(s[1])
	fmt.Println(astro.TimeFromJulianDay(jde).Round(time.Minute).Format("2006-01-02 15:04"), "TD")
	// Output:
	// 1962-06-21 21:25 TD
}

func ExampleEphemeris_SunDays() {
	// Sunrise and sunset at an invented hillside vineyard near 48.2° N,
	// 16.4° E, 180 m above sea level, on the first days of 2027 (local
	// time, Europe/Vienna). PyEphem 4.1.4 (the Sun's centre at −0.8333°
	// less the dip of 180 m, pressure 0) gives 07:42:13–16:13:36,
	// 07:42:12–16:14:34 and 07:42:07–16:15:35 CET: the same minutes, as
	// printed here cut to the minute.
	loc, err := time.LoadLocation("Europe/Vienna")
	if err != nil {
		fmt.Println(err)
		return
	}
	first := time.Date(2027, 1, 1, 0, 0, 0, 0, loc)
	last := time.Date(2027, 1, 3, 0, 0, 0, 0, loc)
	eph, err := astro.NewEphemeris(first, last)
	if err != nil {
		fmt.Println(err)
		return
	}
	site := astro.Observer{Latitude: 48.2, Longitude: 16.4, Elevation: 180}
	days, err := eph.SunDays(context.Background(), site, site.RiseSetAltitude(), loc, first, last)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, d := range days {
		fmt.Println(d.Date.Format("2006-01-02"), "rise", d.Rising[0].In(loc).Format("15:04"), "set", d.Setting[0].In(loc).Format("15:04"))
	}
	// Output:
	// 2027-01-01 rise 07:42 set 16:13
	// 2027-01-02 rise 07:42 set 16:14
	// 2027-01-03 rise 07:42 set 16:15
}

func ExampleEphemeris_SunDays_polarNight() {
	// At 78° N in mid-December the Sun stays below the horizon all day: the
	// state says so instead of an error or an invented event. PyEphem 4.1.4
	// (pressure 0) has the Sun's centre 11.64° below the horizon at its
	// transit that day, far under sunrise's −0.83°.
	first := time.Date(2027, 12, 21, 0, 0, 0, 0, time.UTC)
	eph, err := astro.NewEphemeris(first, first)
	if err != nil {
		fmt.Println(err)
		return
	}
	site := astro.Observer{Latitude: 78.2, Longitude: 15.6}
	days, err := eph.SunDays(context.Background(), site, site.RiseSetAltitude(), time.UTC, first, first)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(days[0].Date.Format("2006-01-02"), days[0].State, len(days[0].Rising), len(days[0].Setting))
	// Output:
	// 2027-12-21 always-below 0 0
}

func ExampleObserver_RiseSetAltitude() {
	// A site 1,500 m up in the Alps (46.80° N, 9.84° E) sees the Sun rise
	// earlier and set later than a sea-level site there: its flat horizon
	// lies 1.76′·√1500 = 68.2′ lower (Dip), so the Sun's centre rises at
	// −1.97° instead of −0.83°, and the day of the 2026 June solstice is
	// 17 minutes longer. PyEphem 4.1.4 (the Sun's upper limb at −34′ less
	// the dip, pressure 0) gives 05:26:26–21:18:28 CEST at sea level
	// (15 h 52 min 3 s) and 05:18:04–21:26:50 at 1,500 m (16 h 8 min 46 s):
	// the same minutes, cut to the minute as printed here.
	loc, err := time.LoadLocation("Europe/Zurich")
	if err != nil {
		fmt.Println(err)
		return
	}
	date := time.Date(2026, 6, 21, 0, 0, 0, 0, loc)
	eph, err := astro.NewEphemeris(date, date)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, elevation := range []float64{0, 1500} {
		site := astro.Observer{Latitude: 46.80, Longitude: 9.84, Elevation: elevation}
		days, err := eph.SunDays(context.Background(), site, site.RiseSetAltitude(), loc, date, date)
		if err != nil {
			fmt.Println(err)
			return
		}
		rise, set := days[0].Rising[0], days[0].Setting[0]
		fmt.Printf("elevation %.0f m: Sun's centre at %.2f°, sunrise %s, sunset %s, day %s\n", elevation, site.RiseSetAltitude(),
			rise.In(loc).Truncate(time.Minute).Format("15:04"), set.In(loc).Truncate(time.Minute).Format("15:04"),
			set.Sub(rise).Truncate(time.Minute))
	}
	// Output:
	// elevation 0 m: Sun's centre at -0.83°, sunrise 05:26, sunset 21:18, day 15h52m0s
	// elevation 1500 m: Sun's centre at -1.97°, sunrise 05:18, sunset 21:26, day 16h8m0s
}

func ExampleEphemeris_SunDays_polarTwilight() {
	// In Tromsø (69.65° N, 18.96° E) at the December solstice the Sun does
	// not rise (State AlwaysBelow for sunrise and sunset) but comes within
	// 6° of the horizon around noon: civil, nautical and astronomical
	// twilight each have a dawn and a dusk. PyEphem 4.1.4 (the Sun's centre
	// at −6°, −12°, −18°, pressure 0) gives 09:31:15–13:53:10,
	// 07:46:43–15:37:42 and 06:28:20–16:56:05 CET, rounded as printed here,
	// and raises NeverUpError for sunrise.
	loc, err := time.LoadLocation("Europe/Oslo")
	if err != nil {
		fmt.Println(err)
		return
	}
	date := time.Date(2026, 12, 21, 0, 0, 0, 0, loc)
	eph, err := astro.NewEphemeris(date, date)
	if err != nil {
		fmt.Println(err)
		return
	}
	site := astro.Observer{Latitude: 69.6492, Longitude: 18.9553}
	for _, th := range []struct {
		name     string
		altitude float64
	}{
		{"sunrise/set", site.RiseSetAltitude()},
		{"civil", astro.CivilTwilight},
		{"nautical", astro.NauticalTwilight},
		{"astronomical", astro.AstronomicalTwilight},
	} {
		days, err := eph.SunDays(context.Background(), site, th.altitude, loc, date, date)
		if err != nil {
			fmt.Println(err)
			return
		}
		d := days[0]
		if d.State != astro.Crosses {
			fmt.Printf("%-12s %s\n", th.name, d.State)
			continue
		}
		fmt.Printf("%-12s %s–%s\n", th.name, d.Rising[0].In(loc).Round(time.Minute).Format("15:04"), d.Setting[0].In(loc).Round(time.Minute).Format("15:04"))
	}
	// Output:
	// sunrise/set  always-below
	// civil        09:31–13:53
	// nautical     07:47–15:38
	// astronomical 06:28–16:56
}

func ExampleMoonFrom() {
	// The Moon from Vienna (48.21° N, 16.37° E) on the evening of the full
	// moon of 2027 March 22, at 21:00 UTC: its topocentric altitude (no
	// refraction) and azimuth, its distance from the site and how much of
	// it is lit (MoonIllumination, from the Earth's centre). PyEphem 4.1.4
	// (ephem.Moon for an Observer at elevation 0, pressure 0) gives altitude
	// 26.8255°, azimuth 141.2112°, distance 371263.6 km and phase 99.66 %,
	// printed here as far as the two agree.
	site := astro.Observer{Latitude: 48.21, Longitude: 16.37}
	t := time.Date(2027, 3, 22, 21, 0, 0, 0, time.UTC)
	moon, err := astro.MoonFrom(site, t)
	if err != nil {
		fmt.Println(err)
		return
	}
	lit, err := astro.MoonIllumination(t)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("altitude %.2f°, azimuth %.2f° (%s), %.1f thousand km away, %.1f %% lit\n",
		moon.Altitude, moon.Azimuth, astro.CompassPoint(moon.Azimuth), moon.Distance/1000, lit.Fraction*100)
	// Output:
	// altitude 26.83°, azimuth 141.21° (south-east), 371.3 thousand km away, 99.7 % lit
}

func ExampleLunarEclipses() {
	// The lunar eclipses of 2028, with the Moon's altitude at the greatest
	// eclipse from Vienna (48.21° N, 16.37° E, 190 m) by Local. The Swiss
	// Ephemeris 2.10.03 (testdata/reference/eclipses-swiss.csv, the rows
	// for Vienna and, for July's magnitude, Cairo, where all of it is seen)
	// gives the greatest eclipses 01-12 04:13:07, 07-06 18:19:45 and 12-31
	// 16:52:08 UT, the partial phases 03:45:01–04:41:15, 17:08:58–19:30:30
	// and 15:07:41–18:36:34, the total phase 16:16:27–17:27:48 and umbral
	// magnitudes 0.0667, 0.3893 and 1.2462: the same minutes, cut to the
	// minute as printed here (its shadow enlargement is not Danjon's: the
	// contacts differ by a few seconds).
	// PyEphem 4.1.4 (pressure 0) has the Moon at 24.04°, −5.87° and 15.28°
	// then, and the moonrises of July 6 and December 31, with the dip of
	// 190 m, at 18:53:51 and 14:55:06 UT.
	eclipses, err := astro.LunarEclipses(time.Date(2028, 1, 1, 0, 0, 0, 0, time.UTC), time.Date(2029, 1, 1, 0, 0, 0, 0, time.UTC))
	if err != nil {
		fmt.Println(err)
		return
	}
	vienna := astro.Observer{Latitude: 48.21, Longitude: 16.37, Elevation: 190}
	hm := func(t time.Time) string { return t.Truncate(time.Minute).Format("15:04") }
	for _, e := range eclipses {
		fmt.Printf("%s %-7s umbral magnitude %.2f, partial %s–%s", e.Greatest.Truncate(time.Minute).Format("2006-01-02 15:04"), e.Type, e.UmbralMagnitude, hm(e.U1), hm(e.U4))
		if !e.U2.IsZero() {
			fmt.Printf(", total %s–%s", hm(e.U2), hm(e.U3))
		}
		l := e.Local(vienna)
		fmt.Printf("; from Vienna the Moon at %.1f°", l.Greatest.Altitude)
		for _, h := range l.Horizon {
			fmt.Printf(", %s at %s", map[astro.Direction]string{astro.Rising: "moonrise", astro.Setting: "moonset"}[h.Direction], hm(h.Time))
		}
		fmt.Println()
	}
	// Output:
	// 2028-01-12 04:13 partial umbral magnitude 0.07, partial 03:45–04:41; from Vienna the Moon at 24.0°
	// 2028-07-06 18:19 partial umbral magnitude 0.39, partial 17:08–19:30; from Vienna the Moon at -5.9°, moonrise at 18:53
	// 2028-12-31 16:52 total   umbral magnitude 1.25, partial 15:07–18:36, total 16:16–17:27; from Vienna the Moon at 15.3°, moonrise at 14:55
}
