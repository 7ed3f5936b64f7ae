package config

import (
	"fmt"
	"slices"
	"strings"
	"sync"
	"testing"
	"time"

	tzfrellite "github.com/ringsaturn/tzf-rel-lite"
)

// The zone of each place below is a fact (the tz database's own comments
// and the places' laws; common practice); the coordinates are town centres
// given from memory, to about 0.01°.
var zonePlaces = []struct {
	place    string
	lat, lon float64
	zone     string
}{
	{"Vienna", 48.21, 16.37, "Europe/Vienna"},
	{"Havana (clocks skip midnight at the spring change)", 23.13, -82.38, "America/Havana"},
	{"Santiago de Chile", -33.45, -70.67, "America/Santiago"},
	{"Auckland", -36.85, 174.76, "Pacific/Auckland"},
	{"Hobart (Tasmania)", -42.88, 147.33, "Australia/Hobart"},
	{"Kathmandu (UTC+05:45)", 27.71, 85.32, "Asia/Kathmandu"},
	{"Reykjavík", 64.15, -21.94, "Atlantic/Reykjavik"},
	{"Longyearbyen (Svalbard)", 78.22, 15.65, "Arctic/Longyearbyen"},
	// near borders
	{"Broken Hill: New South Wales, on South Australia's time", -31.95, 141.45, "Australia/Broken_Hill"},
	{"El Paso, Texas: mountain time", 31.76, -106.49, "America/Denver"},
	{"Ciudad Juárez, across the river from El Paso", 31.69, -106.42, "America/Ciudad_Juarez"},
	{"San Diego", 32.72, -117.16, "America/Los_Angeles"},
	{"Tijuana, 25 km south of San Diego", 32.53, -117.04, "America/Tijuana"},
	{"Büsingen am Hochrhein, a German exclave in Switzerland", 47.697, 8.690, "Europe/Busingen"},
	{"Schaffhausen, Swiss town 5 km west of Büsingen", 47.697, 8.634, "Europe/Zurich"},
	{"Gary, Indiana: central time", 41.59, -87.35, "America/Chicago"},
	{"Indianapolis", 39.77, -86.16, "America/Indiana/Indianapolis"},
	{"Kaliningrad", 54.71, 20.51, "Europe/Kaliningrad"},
	// at sea: nautical zones, 15° wide, centred on multiples of 15° (common practice)
	{"mid-Atlantic on the equator", 0, -30, "Etc/GMT+2"},
	{"North Pacific", 10, -150, "Etc/GMT+10"},
	{"South Pacific", -40, -140, "Etc/GMT+9"},
	{"Indian Ocean", -30, 80, "Etc/GMT-5"},
	{"Gulf of Guinea, 0° 0°", 0, 0, "Etc/GMT"},
}

func TestZoneAtKnownPlaces(t *testing.T) {
	if raceEnabled && testing.Short() {
		t.Skip("loads the zone polygons: covered by the run without -race")
	}
	for _, p := range zonePlaces {
		got, err := ZoneAt(p.lat, p.lon)
		if err != nil {
			t.Errorf("%s (%v, %v): %v", p.place, p.lat, p.lon, err)
			continue
		}
		if got != p.zone {
			t.Errorf("%s (%v, %v): ZoneAt = %s, want %s", p.place, p.lat, p.lon, got, p.zone)
		}
	}
}

func TestZoneAtRefusesOutOfRange(t *testing.T) {
	for _, c := range []struct {
		lat, lon float64
		word     string
	}{{91, 0, "latitude"}, {-90.5, 0, "latitude"}, {0, 180.1, "longitude"}, {0, -181, "longitude"}} {
		if _, err := ZoneAt(c.lat, c.lon); err == nil || !strings.Contains(err.Error(), c.word) {
			t.Errorf("ZoneAt(%v, %v) = %v, want an error naming the %s", c.lat, c.lon, err, c.word)
		}
	}
}

// Every point of the globe gets a zone Go's tz database can load: the poles,
// the date line, a grid over land and sea.
func TestZoneAtEverywhereLoadable(t *testing.T) {
	if raceEnabled && testing.Short() {
		t.Skip("loads the zone polygons: covered by the run without -race")
	}
	step := 10.0
	if testing.Short() {
		step = 30
	}
	for lat := -90.0; lat <= 90; lat += step {
		for lon := -180.0; lon <= 180; lon += step {
			if _, err := ZoneLocationAt(lat, lon); err != nil {
				t.Errorf("ZoneLocationAt(%v, %v): %v", lat, lon, err)
			}
		}
	}
}

func TestZoneAtConcurrent(t *testing.T) {
	var wg sync.WaitGroup
	for i := 0; i < 8; i++ {
		wg.Go(func() {
			if z, err := ZoneAt(48.21, 16.37); err != nil || z != "Europe/Vienna" {
				t.Errorf("ZoneAt = %q, %v", z, err)
			}
		})
	}
	wg.Wait()
}

// The tiles answer as the polygons do wherever they answer: on a 3° grid
// over the globe and at the named places. Where polygons overlap (disputed
// land, e.g. Abyei between the two Sudans) the tiles give one of them.
func TestZoneTilesAgreeWithPolygons(t *testing.T) {
	if raceEnabled && testing.Short() {
		t.Skip("loads the zone polygons: covered by the run without -race")
	}
	tiles, err := zoneTiles()
	if err != nil {
		t.Fatal(err)
	}
	polys, err := zoneFinder()
	if err != nil {
		t.Fatal(err)
	}
	step := 3.0
	if testing.Short() {
		step = 9
	}
	answered, total := 0, 0
	check := func(lat, lon float64) {
		total++
		if z := tiles.name(lon, lat); z != "" {
			answered++
			if ps := polys.names(lon, lat); !slices.Contains(ps, z) {
				t.Errorf("%v, %v: tiles say %s, polygons %v", lat, lon, z, ps)
			}
		}
	}
	for lat := -89.0; lat < 90; lat += step {
		for lon := -179.0; lon < 180; lon += step {
			check(lat, lon)
		}
	}
	for _, p := range zonePlaces {
		check(p.lat, p.lon)
	}
	if answered < total/2 {
		t.Errorf("the tiles answer only %d of %d points", answered, total)
	}
}

func TestNauticalZone(t *testing.T) {
	// common practice: zone n covers longitudes 15n ± 7.5°, Etc/GMT signs inverted
	for _, c := range []struct {
		lon  float64
		want string
	}{{0, "Etc/GMT"}, {7.4, "Etc/GMT"}, {-30, "Etc/GMT+2"}, {45, "Etc/GMT-3"}, {-179, "Etc/GMT+12"}, {179, "Etc/GMT-12"}} {
		if got := nauticalZone(c.lon); got != c.want {
			t.Errorf("nauticalZone(%v) = %s, want %s", c.lon, got, c.want)
		}
	}
}

func TestDescribeZone(t *testing.T) {
	at := time.Date(2027, 1, 15, 12, 0, 0, 0, time.UTC)
	for _, c := range []struct{ zone, want string }{
		{"Etc/GMT+5", "Etc/GMT+5 (UTC−05:00)"},
		{"Europe/Vienna", "Europe/Vienna (UTC+01:00, CET)"},
		{"Asia/Kathmandu", "Asia/Kathmandu (UTC+05:45)"},
		{"America/Havana", "America/Havana (UTC−05:00, CST)"},
	} {
		loc, err := time.LoadLocation(c.zone)
		if err != nil {
			t.Fatal(err)
		}
		if got := DescribeZone(loc, at); got != c.want {
			t.Errorf("DescribeZone(%s) = %q, want %q", c.zone, got, c.want)
		}
	}
}

// BenchmarkZoneAt measures a lookup once the map is loaded; the first call
// (loading the map) is measured by BenchmarkZoneMapLoad.
func BenchmarkZoneAt(b *testing.B) {
	if _, err := ZoneAt(0, 0); err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for i := 0; b.Loop(); i++ {
		p := zonePlaces[i%len(zonePlaces)]
		_, _ = ZoneAt(p.lat, p.lon)
	}
}

// BenchmarkZoneMapLoad measures loading the polygons (a place near a
// border); BenchmarkZoneTilesLoad the tiles alone (most places).
func BenchmarkZoneMapLoad(b *testing.B) {
	for b.Loop() {
		if _, err := loadZoneMap(); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkZoneTilesLoad(b *testing.B) {
	for b.Loop() {
		if _, err := decodeZoneTiles(tzfrellite.PreindexData); err != nil {
			b.Fatal(err)
		}
	}
}

// A site without a timezone gets the zone at its coordinates, marked as
// inferred; a written one is kept as written.
func TestSiteZoneInferred(t *testing.T) {
	c, err := loadTestdata(t, "missing-timezone.yaml")
	if err != nil {
		t.Fatal(err)
	}
	if s := c.Sites[0]; s.TimeZone.Name() != "America/Havana" || !s.ZoneInferred {
		t.Errorf("zone %q, inferred %v; want America/Havana from 22.95° N 82.30° W", s.TimeZone.Name(), s.ZoneInferred)
	}
	c = Demo()
	for _, s := range c.Sites {
		if s.ZoneInferred {
			t.Errorf("site %s: zone %s marked inferred, but the demo names it", s.ID, s.TimeZone.Name())
		}
	}
}

// Missing coordinates are refused in every format, each at its own key.
func TestSiteCoordinatesRequired(t *testing.T) {
	for _, c := range []struct{ format, doc, path string }{
		{"json", `{"sites":[{"id":"a","latitude":10,"timezone":"UTC"}],"feeds":[{"id":"f","site":"a","kinds":["sunrise"]}]}`, "sites[0].longitude"},
		{"toml", "[[sites]]\nid = \"a\"\nlongitude = 10\ntimezone = \"UTC\"\n[[feeds]]\nid = \"f\"\nsite = \"a\"\nkinds = [\"sunrise\"]\n", "sites[0].latitude"},
		{"yaml", "sites:\n  - id: a\n    Latitude: 10\n    LONGITUDE: 5\nfeeds:\n  - {id: f, site: a, kinds: [sunrise]}\n", ""},
	} {
		_, err := Parse(strings.NewReader(c.doc), c.format)
		if c.path == "" {
			if err != nil {
				t.Errorf("%s: %v (keys in any case count as given)", c.format, err)
			}
			continue
		}
		ps := problemsOf(t, err)
		if len(ps) != 1 || ps[0].Path != c.path || ps[0].Msg != "is required" {
			t.Errorf("%s: %v, want %s: is required", c.format, err, c.path)
		}
	}
}

// A site without a timezone is valid (its zone comes from the coordinates)
// even when another part of the file has a problem: only that problem is
// listed, not a "timezone is not set" at the site without one.
func TestMissingZoneNoProblemBesideOthers(t *testing.T) {
	for _, bad := range []string{"timezone: America/Santiagoo", "elevation: 20000", `latitude: "47.5"`} {
		doc := "sites:\n  - id: a\n    longitude: 10\n    " + bad + "\n"
		if !strings.HasPrefix(bad, "latitude") {
			doc = "sites:\n  - id: a\n    latitude: 47\n    longitude: 10\n    " + bad + "\n"
		}
		doc += "  - id: b\n    latitude: 22.95\n    longitude: -82.30\nfeeds:\n  - {id: f, site: b, kinds: [sunrise]}\n"
		_, err := Parse(strings.NewReader(doc), "yaml")
		ps := problemsOf(t, err)
		if len(ps) != 1 || !strings.HasPrefix(ps[0].Path, "sites[0].") {
			t.Errorf("%s: problems %v, want one, at sites[0]", bad, ps)
		}
	}
}

// A zone name the tz database does not know, at a site whose coordinates
// are given, is told the zone in force there when its spelling names no
// zone near it: "Europe/Geneva" is no name of the tz database, whose one
// zone for Switzerland is Europe/Zurich (zone1970.tab: CH), and the zone
// nearest in spelling, "Europe/Kiev", is another country's. A UTC offset is
// told the place's zone; a misspelling of a letter or two keeps its
// suggestion, with the zone at the site beside it when that is another
// (Vienna and Zurich are both in the tz database's zone1970.tab, for AT
// and CH); typographic quotes keep theirs.
func TestUnknownZoneAtSite(t *testing.T) {
	const here = `the zone at the site's latitude and longitude is "Europe/Zurich"`
	for zone, want := range map[string]string{
		"Europe/Geneva":   here + "; or leave timezone out, and it is taken from them",
		"UTC+1":           "a UTC offset is not a time zone: " + here + ", which follows its clock changes",
		"Europe/Zurik":    `did you mean "Europe/Zurich"?`,
		"Europe/Viena":    `did you mean "Europe/Vienna"? ` + here,
		"“Europe/Zurich”": `the quotes “ ” are typographic, part of the text: write "Europe/Zurich", in straight quotes, or without quotes`,
	} {
		// Geneva, 46.2044° N, 6.1432° E (from memory, well inside Switzerland)
		doc := fmt.Sprintf("sites:\n  - {id: a, latitude: 46.2044, longitude: 6.1432, timezone: %q}\nfeeds:\n  - {id: f, site: a, kinds: [sunrise]}\n", zone)
		_, err := Parse(strings.NewReader(doc), "yaml")
		ps := problemsOf(t, err)
		if len(ps) != 1 || ps[0].Msg != "unknown time zone" || ps[0].Hint != want {
			t.Errorf("%s: %v\nwant the hint %s", zone, err, want)
		}
	}
	// without coordinates, the spelling's suggestion alone
	_, err := Parse(strings.NewReader("sites:\n  - {id: a, timezone: Europe/Geneva}\n"), "yaml")
	for _, p := range problemsOf(t, err) {
		if p.Path == "sites[0].timezone" && (p.Hint != ZoneHint("Europe/Geneva") || strings.Contains(p.Hint, "latitude")) {
			t.Errorf("no coordinates: %v", p)
		}
	}
}

// A zone name given with a place's coordinates (--tz beside --lat and --lon,
// an ad-hoc feed's tz) is told the zone in force there as a site's is, in
// the words of a place and its own key: the Chatham Islands keep
// Pacific/Chatham, UTC+12:45 in winter and +13:45 in summer (the tz
// database's zone1970.tab: NZ, -4357-17633, "Chatham Islands").
func TestZoneHintAtPlace(t *testing.T) {
	const here = `the zone at the place's latitude and longitude is "Pacific/Chatham"`
	for name, want := range map[string]string{
		"+12:45":         "a UTC offset is not a time zone: " + here + ", which follows its clock changes",
		"UTC+13:45":      "a UTC offset is not a time zone: " + here + ", which follows its clock changes",
		"Chatam":         here + "; or leave --tz out, and it is taken from them",
		"Pacific/Chatam": `did you mean "Pacific/Chatham"?`,
	} {
		if got := ZoneHintAt(name, -43.95, -176.56, "--tz"); got != want {
			t.Errorf("%s: %s\nwant %s", name, got, want)
		}
	}
}
