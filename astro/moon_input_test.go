package astro

import (
	"context"
	"errors"
	"math"
	"testing"
	"time"
)

// TestMoonBadInput: out-of-range instants are *RangeError (matching
// ErrOutOfRange) naming the input and the supported span; a reversed span,
// a nil location and invalid observers are clear errors naming the field and
// the value, matching ErrInvalidInput.
func TestMoonBadInput(t *testing.T) {
	early := time.Date(1799, 11, 30, 0, 0, 0, 0, time.UTC) // before MinTime − RangeMargin
	day := time.Date(2026, 5, 1, 0, 0, 0, 0, time.UTC)
	me, err := NewMoonEphemeris(day, day.AddDate(0, 0, 2))
	if err != nil {
		t.Fatal(err)
	}
	bad := Observer{Latitude: 12, Longitude: 190}
	for _, tc := range []struct {
		name  string
		err   func() error
		is    error
		wantS string
	}{
		{"Moon before 1800", func() error { _, err := Moon(early); return err }, ErrOutOfRange,
			"astro: time 1799-11-30T00:00:00Z outside the supported range 1800-01-01..2200-12-31"},
		{"MoonIllumination after 2200", func() error { _, err := MoonIllumination(MaxTime().Add(RangeMargin)); return err }, ErrOutOfRange, ""},
		{"MoonPhases from before 1800", func() error { _, err := MoonPhases(early, day); return err }, ErrOutOfRange,
			"astro: moon phases from 1799-11-30T00:00:00Z outside the supported range 1800-01-01..2200-12-31"},
		{"MoonPhases reversed", func() error { _, err := MoonPhases(day, day.AddDate(0, 0, -1)); return err }, ErrInvalidInput,
			"astro: moon phases: to 2026-04-30T00:00:00Z is before from 2026-05-01T00:00:00Z"},
		{"NewMoonEphemeris before 1800", func() error { _, err := NewMoonEphemeris(early, day); return err }, ErrOutOfRange, ""},
		{"MoonRiseSet longitude 190", func() error { _, err := me.MoonRiseSet(bad, day, day.AddDate(0, 0, 1)); return err }, ErrInvalidInput,
			"astro: observer longitude 190: must be within -180..180 degrees (east positive)"},
		{"MoonRiseSet outside coverage", func() error {
			_, err := me.MoonRiseSet(Observer{}, day.AddDate(0, 0, 10), day.AddDate(0, 0, 11))
			return err
		}, ErrOutOfRange, ""},
		{"MoonDays nil location", func() error { _, err := me.MoonDays(context.Background(), Observer{}, nil, day, day); return err }, ErrInvalidInput, "astro: MoonDays: nil location"},
		{"MoonDays reversed", func() error {
			_, err := me.MoonDays(context.Background(), Observer{}, time.UTC, day.AddDate(0, 0, 1), day)
			return err
		}, ErrInvalidInput,
			"astro: MoonDays: last date 2026-05-01 is before the first 2026-05-02"},
		{"LunarApsides reversed", func() error { _, err := LunarApsides(day, day.AddDate(0, 0, -1)); return err }, ErrInvalidInput,
			"astro: lunar apsides: to 2026-04-30T00:00:00Z is before from 2026-05-01T00:00:00Z"},
		{"SolarEclipses reversed", func() error { _, err := SolarEclipses(day, day.AddDate(0, 0, -1)); return err }, ErrInvalidInput,
			"astro: eclipses: to 2026-04-30T00:00:00Z is before from 2026-05-01T00:00:00Z"},
		{"LunarEclipses reversed", func() error { _, err := LunarEclipses(day, day.AddDate(0, 0, -1)); return err }, ErrInvalidInput,
			"astro: eclipses: to 2026-04-30T00:00:00Z is before from 2026-05-01T00:00:00Z"},
		{"NewMoonEphemeris reversed", func() error { _, err := NewMoonEphemeris(day, day.AddDate(0, 0, -1)); return err }, ErrInvalidInput,
			"astro: ephemeris end 2026-04-30T00:00:00Z is before its start 2026-05-01T00:00:00Z"},
		{"MoonFrom latitude -91", func() error { _, err := MoonFrom(Observer{Latitude: -91}, day); return err }, ErrInvalidInput,
			"astro: observer latitude -91: must be within -90..90 degrees"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			err := tc.err()
			if err == nil {
				t.Fatal("no error")
			}
			if tc.is != nil && !errors.Is(err, tc.is) {
				t.Errorf("%v does not match %v", err, tc.is)
			}
			if tc.wantS != "" && err.Error() != tc.wantS {
				t.Errorf("error %q, want %q", err, tc.wantS)
			}
		})
	}
}

// TestPhaseKindString: the names used in feeds and errors.
func TestPhaseKindString(t *testing.T) {
	for k, want := range map[PhaseKind]string{NewMoon: "new moon", FirstQuarter: "first quarter", FullMoon: "full moon", LastQuarter: "last quarter", 7: "PhaseKind(7)"} {
		if k.String() != want {
			t.Errorf("%d: %q, want %q", int(k), k.String(), want)
		}
	}
	if NightState(9).String() != "NightState(9)" || Moonlit.String() != "moonlit" {
		t.Errorf("NightState names")
	}
	for k, want := range map[EclipseType]string{0: "none", Partial: "partial", Penumbral: "penumbral", 9: "EclipseType(9)", -1: "EclipseType(-1)"} {
		if k.String() != want {
			t.Errorf("EclipseType %d: %q, want %q", int(k), k.String(), want)
		}
	}
}

// TestPhaseKindElongation: the principal phases are the elongations 0°,
// 90°, 180° and 270° (Meeus, Astronomical Algorithms 2nd ed., ch. 49); a
// value that is no phase has none (NaN).
func TestPhaseKindElongation(t *testing.T) {
	for k, want := range map[PhaseKind]float64{NewMoon: 0, FirstQuarter: 90, FullMoon: 180, LastQuarter: 270} {
		if got := k.Elongation(); got != want {
			t.Errorf("%v: elongation %v, want %v", k, got, want)
		}
	}
	for _, k := range []PhaseKind{-1, 4, 7} {
		if got := k.Elongation(); !math.IsNaN(got) {
			t.Errorf("PhaseKind(%d).Elongation() = %v, want NaN", int(k), got)
		}
	}
}

// TestMoonRangeEnds: the first and last month of the supported range work
// for every Moon function (the searches look a few days beyond their span).
func TestMoonRangeEnds(t *testing.T) {
	for _, span := range [][2]time.Time{
		{MinTime(), MinTime().AddDate(0, 1, 0)},
		{MaxTime().AddDate(0, -1, 0), MaxTime()},
	} {
		ph, err := MoonPhases(span[0], span[1])
		if err != nil || len(ph) < 3 {
			t.Errorf("MoonPhases %v: %d phases, %v", span, len(ph), err)
		}
		aps, err := LunarApsides(span[0], span[1])
		if err != nil || len(aps) < 1 {
			t.Errorf("LunarApsides %v: %d, %v", span, len(aps), err)
		}
		me, err := NewMoonEphemeris(span[0], span[1].Add(-time.Second))
		if err != nil {
			t.Fatalf("NewMoonEphemeris %v: %v", span, err)
		}
		days, err := me.MoonDays(context.Background(), Observer{Latitude: 40}, time.UTC, span[0], span[1].Add(-time.Second))
		if err != nil || len(days) < 28 {
			t.Errorf("MoonDays %v: %d days, %v", span, len(days), err)
		}
		nights, err := me.DarkWindows(context.Background(), Observer{Latitude: 40}, time.UTC, span[0], span[1].AddDate(0, 0, -2), 0.2)
		if err != nil || len(nights) < 27 {
			t.Errorf("DarkWindows %v: %d nights, %v", span, len(nights), err)
		}
	}
}
