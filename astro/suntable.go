package astro

import (
	_ "embed" // the Sun's daily table, sunTableData
	"encoding/binary"
	"math"
	"sync"
)

// The Sun's daily samples over the years people plan in are shipped with
// the program, computed beforehand by this package's own code (sunSamples:
// VSOP87D, the IAU 1980 nutation and the ΔT and UT1 − UTC model of
// deltat.go), as ephemeris files ship the values of a theory: NewEphemeris
// reads the days of its span that the table holds instead of computing
// them again. The table is not taken from anywhere else; it is this
// package's computation, stored.
//
// suntable.bin, little-endian:
//
//	offset  size  field
//	0       8     "hcSunDay", the format's mark
//	8       4     version, 1
//	12      4     days per block of the computation (sunChebDays)
//	16      8     first day, in days since 1970-01-01 (int64)
//	24      4     number of days
//	28      4     bytes per day, 24
//	32      24·n  per day at 0h UTC: the Greenwich hour angle (rad, not
//	              reduced), the declination (rad) and the distance (Earth
//	              radii) of the apparent Sun, three float64
//
// The days are taken in one run from the first (blocks of sunChebDays on
// that grid), as NewEphemeris takes a span's. The values depend on ΔT and
// UT1 − UTC (the samples are at 0h UTC: the Sun's place at that instant and
// the Earth's rotation then), on the nutation and on VSOP87D: when any of
// them changes the table must be written again (`go test ./astro -run
// TestSunTable -update`, see DEVELOPERS.md); TestSunTable computes every
// day again and fails until then.
//
// sin δ and cos δ, which the track also keeps (trigRange), are not stored:
// a sine and cosine a day cost less than the 16 more bytes a day would
// (650 kB more, and more pages touched).

//go:embed suntable.bin
var sunTableData []byte

const (
	sunTableMark   = "hcSunDay"
	sunTableHeader = 32
	sunTableRecord = 24
)

// sunTable is the table's layout, read from its header once.
type sunTable struct {
	first float64 // Unix s of the first day's 0h UTC
	n     int     // days
	days  []byte  // the records
}

var loadSunTable = sync.OnceValue(func() sunTable {
	t, ok := parseSunTable(sunTableData)
	if !ok {
		// a malformed table is a build defect (TestSunTable); the days
		// are then computed
		return sunTable{}
	}
	return t
})

// parseSunTable reads b's header; ok is false when b is not a table of
// this format.
func parseSunTable(b []byte) (t sunTable, ok bool) {
	le := binary.LittleEndian
	if len(b) < sunTableHeader || string(b[:8]) != sunTableMark || le.Uint32(b[8:]) != 1 ||
		le.Uint32(b[12:]) != sunChebDays || le.Uint32(b[28:]) != sunTableRecord {
		return sunTable{}, false
	}
	n := int(le.Uint32(b[24:]))
	if len(b) != sunTableHeader+n*sunTableRecord {
		return sunTable{}, false
	}
	first := float64(int64(le.Uint64(b[16:]))) * secondsPerDay
	return sunTable{first: first, n: n, days: b[sunTableHeader:]}, true
}

// day returns day i's hour angle, declination and distance.
func (t *sunTable) day(i int) (gha, dec, dist float64) {
	r := t.days[i*sunTableRecord : (i+1)*sunTableRecord]
	le := binary.LittleEndian
	return math.Float64frombits(le.Uint64(r)), math.Float64frombits(le.Uint64(r[8:])), math.Float64frombits(le.Uint64(r[16:]))
}

// readSunTable fills the samples of tr (daily, from a 0h UTC) that the
// table holds, with the sine and cosine of their declination, and returns
// them as k0..k1−1 (k0 == k1 when none).
func readSunTable(tr *track) (k0, k1 int) {
	t := loadSunTable()
	n := len(tr.g)
	// index in the table of tr's sample 0 (the samples are on whole days)
	d := int(math.Round((tr.start - t.first) / secondsPerDay))
	k0, k1 = min(max(-d, 0), n), min(max(t.n-d, 0), n)
	if k0 >= k1 {
		return n, n
	}
	for k := k0; k < k1; k++ {
		gha, dec, dist := t.day(d + k)
		tr.set(k, gha, dec, dist)
	}
	tr.trigRange(k0, k1)
	return k0, k1
}
