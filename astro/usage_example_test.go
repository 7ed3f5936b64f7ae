package astro_test

import (
	"context"
	"errors"
	"fmt"
	"math"
	"time"

	"heliocal/astro"
)

// Sunrise and sunset for a place and a date: build an Ephemeris for the
// dates, then ask SunDays for the crossings of the observer's rise/set
// altitude. The instants are UTC; In shows them on the local clock.
//
// U.S. Naval Observatory, one-day data for Washington, DC (38°53′N, 77°02′W,
// UTC−5), 2024 March 5: sunrise 06:34, sunset 18:06
// (testdata/reference/sun-times.csv, rows sun-0270 and sun-0272; USNO rounds
// to the minute, so the times are rounded to the minute here).
func Example() {
	est := time.FixedZone("EST", -5*3600)
	date := time.Date(2024, 3, 5, 0, 0, 0, 0, est)
	eph, err := astro.NewEphemeris(date, date)
	if err != nil {
		fmt.Println(err)
		return
	}
	site := astro.Observer{Latitude: 38.889444, Longitude: -77.035278}
	days, err := eph.SunDays(context.Background(), site, site.RiseSetAltitude(), est, date, date)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, d := range days {
		fmt.Println(d.Date.Format("2006-01-02"), d.State)
		for _, t := range d.Rising {
			fmt.Println("sunrise", t.In(est).Round(time.Minute).Format("15:04"))
		}
		for _, t := range d.Setting {
			fmt.Println("sunset ", t.In(est).Round(time.Minute).Format("15:04"))
		}
	}
	// Output:
	// 2024-03-05 crosses
	// sunrise 06:34
	// sunset  18:06
}

// Twilight is the crossings of lower altitudes of the Sun's centre: pass
// CivilTwilight, NauticalTwilight or AstronomicalTwilight where sunrise takes
// RiseSetAltitude. The rising crossing is dawn, the setting one dusk.
//
// U.S. Naval Observatory one-year tables for Ithaca, NY (42°27′N, 76°30′W,
// the tables' fixed UTC−4), 2015 January 1 (testdata/reference/sun-times.csv,
// rows sun-0001..sun-0008), to the minute as USNO rounds.
func ExampleEphemeris_SunDays_twilight() {
	zone := time.FixedZone("UTC-4", -4*3600)
	date := time.Date(2015, 1, 1, 0, 0, 0, 0, zone)
	eph, err := astro.NewEphemeris(date, date)
	if err != nil {
		fmt.Println(err)
		return
	}
	site := astro.Observer{Latitude: 42.45, Longitude: -76.5}
	for _, th := range []struct {
		name     string
		altitude float64
	}{
		{"astronomical", astro.AstronomicalTwilight},
		{"nautical", astro.NauticalTwilight},
		{"civil", astro.CivilTwilight},
		{"sunrise/set", site.RiseSetAltitude()},
	} {
		days, err := eph.SunDays(context.Background(), site, th.altitude, zone, date, date)
		if err != nil {
			fmt.Println(err)
			return
		}
		d := days[0]
		fmt.Printf("%-12s %s  %s\n", th.name,
			d.Rising[0].In(zone).Round(time.Minute).Format("15:04"),
			d.Setting[0].In(zone).Round(time.Minute).Format("15:04"))
	}
	// Output:
	// astronomical 06:54  19:25
	// nautical     07:28  18:51
	// civil        08:04  18:16
	// sunrise/set  08:36  17:44
}

// A site in the southern hemisphere takes a negative latitude; its short
// days come in June. Longitude is east-positive.
//
// U.S. Naval Observatory one-year table for 42°27′S, 76°30′E (the table's
// fixed UTC+4), 2015 (testdata/reference/sun-times.csv, rows sun-0123,
// sun-0124, sun-0131 and sun-0132), to the minute as USNO rounds.
func ExampleEphemeris_SunDays_southern() {
	zone := time.FixedZone("UTC+4", 4*3600)
	site := astro.Observer{Latitude: -42.45, Longitude: 76.5}
	for _, date := range []time.Time{
		time.Date(2015, 2, 15, 0, 0, 0, 0, zone),
		time.Date(2015, 6, 21, 0, 0, 0, 0, zone),
	} {
		eph, err := astro.NewEphemeris(date, date)
		if err != nil {
			fmt.Println(err)
			return
		}
		days, err := eph.SunDays(context.Background(), site, site.RiseSetAltitude(), zone, date, date)
		if err != nil {
			fmt.Println(err)
			return
		}
		d := days[0]
		fmt.Println(d.Date.Format("2006-01-02"),
			"sunrise", d.Rising[0].In(zone).Round(time.Minute).Format("15:04"),
			"sunset", d.Setting[0].In(zone).Round(time.Minute).Format("15:04"))
	}
	// Output:
	// 2015-02-15 sunrise 04:15 sunset 18:00
	// 2015-06-21 sunrise 06:24 sunset 15:28
}

// Near the poles a date may have a sunrise and no sunset, and then no
// crossing at all: the Sun stays up (State AlwaysAbove, the midnight Sun) or
// down (AlwaysBelow, the polar night). These are states of the result, not
// errors, and no time is invented for them.
//
// U.S. Naval Observatory one-year table for 80°N, 0° (UTC), 2015: April 13
// sunrise 00:58 and no sunset, April 14 the Sun continuously above the
// horizon (testdata/reference/sun-times.csv, rows sun-0167..sun-0169), to the
// minute as USNO rounds.
func ExampleEphemeris_SunDays_midnightSun() {
	first := time.Date(2015, 4, 13, 0, 0, 0, 0, time.UTC)
	last := time.Date(2015, 4, 14, 0, 0, 0, 0, time.UTC)
	eph, err := astro.NewEphemeris(first, last)
	if err != nil {
		fmt.Println(err)
		return
	}
	site := astro.Observer{Latitude: 80, Longitude: 0}
	days, err := eph.SunDays(context.Background(), site, site.RiseSetAltitude(), time.UTC, first, last)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, d := range days {
		fmt.Print(d.Date.Format("2006-01-02"), " ", d.State)
		for _, t := range d.Rising {
			fmt.Print(" rise ", t.Round(time.Minute).Format("15:04"))
		}
		for _, t := range d.Setting {
			fmt.Print(" set ", t.Round(time.Minute).Format("15:04"))
		}
		fmt.Println()
	}
	// Output:
	// 2015-04-13 crosses rise 00:58
	// 2015-04-14 always-above
}

// Solar noon is the Sun's upper transit; SunTransits also gives the Sun's
// altitude then (negative in the polar night).
//
// U.S. Naval Observatory, one-day data for Washington, DC (38°53′N, 77°02′W,
// UTC−5), 2024 March 5: upper transit 12:19 (testdata/reference/sun-times.csv,
// row sun-0271), to the minute as USNO rounds; the altitude 45.44° is
// PyEphem 4.1.4's for the same instant (its Sun's centre, pressure 0),
// printed to 0.01°, as far as the two agree.
func ExampleEphemeris_SunTransits() {
	est := time.FixedZone("EST", -5*3600)
	date := time.Date(2024, 3, 5, 0, 0, 0, 0, est)
	eph, err := astro.NewEphemeris(date, date)
	if err != nil {
		fmt.Println(err)
		return
	}
	site := astro.Observer{Latitude: 38.889444, Longitude: -77.035278}
	noons, err := eph.SunTransits(site, date, date.AddDate(0, 0, 1))
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, n := range noons {
		fmt.Printf("solar noon %s, altitude %.2f°\n", n.Time.In(est).Round(time.Minute).Format("15:04"), n.Altitude)
	}
	// Output:
	// solar noon 12:19, altitude 45.44°
}

// The Sun's place in a site's sky at an instant: SunAltitude (geometric, no
// refraction) and SunAzimuth (from the north through the east). The instant
// may be given in any location; only the instant counts.
//
// NOAA Global Monitoring Laboratory solar calculation spreadsheet, 40°N,
// 105°W, 2010 June 21 12:00 at UTC−7: elevation 73.4385° corrected for
// refraction (73.433° without its 0.005°), azimuth 178.5332°
// (testdata/reference/worked-examples.csv, row NOAA-2-pos); PyEphem 4.1.4
// gives 73.4327° and 178.5257° (pressure 0). Printed to 0.1°, which both
// sources agree on.
func ExampleEphemeris_SunAzimuth() {
	mst := time.FixedZone("MST", -7*3600)
	t := time.Date(2010, 6, 21, 12, 0, 0, 0, mst)
	eph, err := astro.NewEphemeris(t, t)
	if err != nil {
		fmt.Println(err)
		return
	}
	site := astro.Observer{Latitude: 40, Longitude: -105}
	alt, err := eph.SunAltitude(site, t)
	if err != nil {
		fmt.Println(err)
		return
	}
	az, err := eph.SunAzimuth(site, t)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("altitude %.1f°, azimuth %.1f° (%s)\n", alt, az, astro.CompassPoint(az))
	// Output:
	// altitude 73.4°, azimuth 178.5° (south)
}

// Where the Sun is now, from here, in one call: SunFrom needs no Ephemeris.
// Altitude is geometric (the Sun's centre without the air); RefractedAltitude
// is where it is seen, raised by the refraction of the Observer's air (the
// standard air when Pressure is 0).
//
// PyEphem 4.1.4 (ephem.Observer at 40°N, 105°W, elevation 0, date
// 2010/6/21 19:00:00, ephem.Sun()): altitude 73.4327° with pressure 0 and
// 73.4375° with pressure 1010 hPa, temp 10 °C, azimuth 178.5257°, Earth
// distance 1.016205 au, radius 944.33″ = 15.74′ (geocentric; the observer
// is 0.00004 au nearer). NOAA's solar calculation spreadsheet, same place
// and instant, 12:00 at UTC−7 (testdata/reference/worked-examples.csv, row
// NOAA-2-pos): 73.4385° corrected for refraction, azimuth 178.5332°.
// Printed as far as the sources agree.
func ExampleSunFrom() {
	mst := time.FixedZone("MST", -7*3600)
	site := astro.Observer{Latitude: 40, Longitude: -105}
	sun, err := astro.SunFrom(site, time.Date(2010, 6, 21, 12, 0, 0, 0, mst))
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("altitude %.3f° (seen at %.2f°), azimuth %.1f° (%s)\n", sun.Altitude, sun.RefractedAltitude, sun.Azimuth, astro.CompassPoint(sun.Azimuth))
	fmt.Printf("distance %.4f au, semidiameter %.1f′\n", sun.Distance, sun.Semidiameter*60)
	// Output:
	// altitude 73.433° (seen at 73.44°), azimuth 178.5° (south)
	// distance 1.0162 au, semidiameter 15.7′
}

// The equinoxes and solstices of a year, in UTC.
//
// U.S. Naval Observatory, Earth's Seasons 2022 (testdata/reference/seasons.csv,
// rows march-equinox-2022..december-solstice-2022): 03-20 15:33, 06-21 09:14,
// 09-23 01:04, 12-21 21:48 UT, rounded to the minute as USNO rounds.
func ExampleSeasons() {
	seasons, err := astro.Seasons(2022)
	if err != nil {
		fmt.Println(err)
		return
	}
	names := [4]string{"March equinox", "June solstice", "September equinox", "December solstice"}
	for i, t := range seasons {
		fmt.Printf("%-17s %s\n", names[i], t.Round(time.Minute).Format("2006-01-02 15:04 MST"))
	}
	// Output:
	// March equinox     2022-03-20 15:33 UTC
	// June solstice     2022-06-21 09:14 UTC
	// September equinox 2022-09-23 01:04 UTC
	// December solstice 2022-12-21 21:48 UTC
}

// The principal phases of the Moon within a span (MoonIllumination gives the
// lit fraction at any instant).
//
// U.S. Naval Observatory, phases of the Moon 2024 (testdata/reference/
// moon-phases.csv, rows mp-0101..mp-0103): new moon 10-02 18:49, first
// quarter 10-10 18:55, full moon 10-17 11:26 UT, rounded to the minute as
// USNO rounds.
func ExampleMoonPhases() {
	phases, err := astro.MoonPhases(time.Date(2024, 10, 1, 0, 0, 0, 0, time.UTC), time.Date(2024, 10, 20, 0, 0, 0, 0, time.UTC))
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, p := range phases {
		fmt.Printf("%-13s %s\n", p.Kind, p.Time.Round(time.Minute).Format("2006-01-02 15:04"))
	}
	// Output:
	// new moon      2024-10-02 18:49
	// first quarter 2024-10-10 18:55
	// full moon     2024-10-17 11:26
}

// Errors say what was wrong: an invalid observer gives an *InputError that
// matches ErrInvalidInput, a date outside 1800..2200 a *RangeError that
// matches ErrOutOfRange. Polar day and night are not errors (see
// ExampleEphemeris_SunDays_midnightSun).
func Example_errors() {
	date := time.Date(2026, 6, 21, 0, 0, 0, 0, time.UTC)
	eph, err := astro.NewEphemeris(date, date)
	if err != nil {
		fmt.Println(err)
		return
	}
	site := astro.Observer{Latitude: math.NaN()}
	_, err = eph.SunDays(context.Background(), site, site.RiseSetAltitude(), time.UTC, date, date)
	fmt.Println(err)
	fmt.Println(errors.Is(err, astro.ErrInvalidInput))

	_, err = astro.NewEphemeris(time.Date(1750, 1, 1, 0, 0, 0, 0, time.UTC), time.Date(1750, 1, 2, 0, 0, 0, 0, time.UTC))
	fmt.Println(err)
	fmt.Println(errors.Is(err, astro.ErrOutOfRange))
	// Output:
	// astro: observer latitude NaN: must be within -90..90 degrees
	// true
	// astro: ephemeris start 1750-01-01T00:00:00Z outside the supported range 1800-01-01..2200-12-31
	// true
}
