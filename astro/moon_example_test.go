package astro_test

import (
	"context"
	"fmt"
	"math"
	"time"

	"heliocal/astro"
)

// Meeus, Astronomical Algorithms 2nd ed., Example 47.a, p. 342–343: the Moon
// on 1992 April 12 at 0h TD; apparent λ = 133.167265°, β = −3.229126°,
// Δ = 368409.7 km, π = 0.991990°, α = 134.688470°, δ = 13.768368°
// (the book's shorter series; ELP/MPP02 differs by about 2″ and 4 km).
func ExampleMoon_meeus47a() {
	t, _ := astro.TimeFromJulianEphemerisDay(2448724.5) // 0h TD
	m, err := astro.Moon(t)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("λ %.3f° β %.3f° Δ %.0f km π %.4f°\n", m.Longitude, m.Latitude, math.Round(m.Distance/10)*10, m.Parallax)
	fmt.Printf("α %.3f° δ %.3f°\n", m.RightAscension, m.Declination)
	// Output:
	// λ 133.167° β -3.229° Δ 368410 km π 0.9920°
	// α 134.688° δ 13.768°
}

// Meeus, Astronomical Algorithms 2nd ed., Example 48.a, p. 346–347: on 1992
// April 12 at 0h TD the Moon is waxing with k = 0.6786 of its disk lit and
// the bright limb at position angle χ = 285.0°.
func ExampleMoonIllumination_meeus48a() {
	t, _ := astro.TimeFromJulianEphemerisDay(2448724.5)
	il, err := astro.MoonIllumination(t)
	if err != nil {
		fmt.Println(err)
		return
	}
	state := "waning"
	if il.Waxing {
		state = "waxing"
	}
	fmt.Printf("%s, %.0f %% lit (k = %.3f), bright limb at %.0f°\n", state, il.Fraction*100, il.Fraction, il.BrightLimb)
	// Output:
	// waxing, 68 % lit (k = 0.679), bright limb at 285°
}

// Meeus, Astronomical Algorithms 2nd ed., Example 49.a, p. 353: the new moon
// of 1977 February, JDE 2443192.65118 (1977-02-18 03:37:42 TD) by the
// chapter's method; printed to 1e-4 day (9 s).
func ExampleMoonPhases_meeus49a() {
	phases, err := astro.MoonPhases(time.Date(1977, 2, 10, 0, 0, 0, 0, time.UTC), time.Date(1977, 2, 25, 0, 0, 0, 0, time.UTC))
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, p := range phases {
		if p.Kind == astro.NewMoon {
			jde, _ := astro.JulianEphemerisDay(p.Time)
			fmt.Printf("%s %s UTC, JDE %.4f\n", p.Kind, p.Time.Format("2006-01-02 15:04"), jde)
		}
	}
	// Output:
	// new moon 1977-02-18 03:36 UTC, JDE 2443192.6512
}

// U.S. Naval Observatory, one-day data for Washington, DC (38°53′N,
// 77°02′W, UTC−5), 2024 March 5: moonrise 03:27, upper transit 07:53,
// moonset 12:21 (testdata/reference/moon-times.csv, rows moon-0078..0080).
func ExampleMoonEphemeris_MoonDays() {
	est := time.FixedZone("EST", -5*3600)
	day := time.Date(2024, 3, 5, 0, 0, 0, 0, est)
	me, err := astro.NewMoonEphemeris(day, day.AddDate(0, 0, 1))
	if err != nil {
		fmt.Println(err)
		return
	}
	o := astro.Observer{Latitude: 38.889444, Longitude: -77.035278}
	days, err := me.MoonDays(context.Background(), o, est, day, day)
	if err != nil {
		fmt.Println(err)
		return
	}
	tr, _ := me.MoonTransits(o, day, day.AddDate(0, 0, 1))
	for _, d := range days {
		for _, r := range d.Rising {
			fmt.Println("moonrise", r.In(est).Round(time.Minute).Format("15:04"))
		}
		for _, x := range tr {
			fmt.Println("transit ", x.Time.In(est).Round(time.Minute).Format("15:04"))
		}
		for _, s := range d.Setting {
			fmt.Println("moonset ", s.In(est).Round(time.Minute).Format("15:04"))
		}
	}
	// Output:
	// moonrise 03:27
	// transit  07:53
	// moonset  12:21
}

// Dark-sky windows for a week of January 2026 at a site at 48.2°N 16.4°E,
// with the Moon required to be below the horizon: the nights around the
// full moon of January 3 have none (the Moon is up all through astronomical
// night), then the windows grow as the Moon rises later each night.
// PyEphem 4.1.4 (the Sun's centre at −18°, the Moon's upper limb at −34′,
// pressure 0) gives the same: dusk 18:08:29, 18:09:27, 18:10:26, 18:11:27
// and moonrise 18:49:13, 20:10:05, 21:26:06, 22:38:19 CET on January 5..8,
// cut to the minute as printed here.
func ExampleMoonEphemeris_DarkWindows() {
	cet := time.FixedZone("CET", 3600)
	first := time.Date(2026, 1, 2, 0, 0, 0, 0, cet)
	me, err := astro.NewMoonEphemeris(first, first.AddDate(0, 0, 8))
	if err != nil {
		fmt.Println(err)
		return
	}
	nights, err := me.DarkWindows(context.Background(), astro.Observer{Latitude: 48.2, Longitude: 16.4}, cet, first, first.AddDate(0, 0, 6), 0)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, n := range nights {
		fmt.Print(n.Date.Format("Jan 2"), ": ", n.State)
		for _, w := range n.Windows {
			fmt.Printf(" %s–%s (%s)", w.Start.In(cet).Format("15:04"), w.End.In(cet).Format("15:04"), w.Length.Round(time.Minute))
		}
		fmt.Println()
	}
	// Output:
	// Jan 2: moonlit
	// Jan 3: moonlit
	// Jan 4: moonlit
	// Jan 5: dark 18:08–18:49 (41m0s)
	// Jan 6: dark 18:09–20:10 (2h1m0s)
	// Jan 7: dark 18:10–21:26 (3h16m0s)
	// Jan 8: dark 18:11–22:38 (4h27m0s)
}
