package config

import (
	"errors"
	"slices"
	"testing"

	"github.com/ringsaturn/tzf"
	tzfrellite "github.com/ringsaturn/tzf-rel-lite"
	pb "github.com/ringsaturn/tzf/gen/go/tzf/v1"
	"github.com/ringsaturn/tzf/reduce"
	"github.com/tidwall/geojson/geometry"
	"google.golang.org/protobuf/proto"
)

// The zone map's files decode as the tzf package and the protobuf runtime
// (linked into the tests only) decode them: every tile with the zone tzf's
// tile finder answers, and every zone's polygons point by point.
func TestZoneMapDecodesAsTzf(t *testing.T) {
	in := &pb.PreindexTimezones{}
	if err := proto.Unmarshal(tzfrellite.PreindexData, in); err != nil {
		t.Fatal(err)
	}
	tiles, err := decodeZoneTiles(tzfrellite.PreindexData)
	if err != nil {
		t.Fatal(err)
	}
	if tiles.aggZoom != uint32(in.AggZoom) || tiles.idxZoom != uint32(in.IdxZoom) {
		t.Errorf("zooms %d..%d, tzf %d..%d", tiles.aggZoom, tiles.idxZoom, in.AggZoom, in.IdxZoom)
	}
	want := map[zoneTile]string{}
	for _, k := range in.Keys {
		tile := zoneTile{uint32(k.X), uint32(k.Y), uint32(k.Z)}
		if _, ok := want[tile]; !ok {
			want[tile] = k.Name
		}
	}
	if len(tiles.zone) != len(want) || len(want) < 1000 {
		t.Errorf("%d tiles, tzf %d", len(tiles.zone), len(want))
	}
	for tile, name := range want {
		if tiles.zone[tile] != name {
			t.Fatalf("tile %v: %q, tzf %q", tile, tiles.zone[tile], name)
		}
	}
	fuzzy, err := tzf.NewFuzzyFinderFromPB(in)
	if err != nil {
		t.Fatal(err)
	}
	step := 0.25
	if testing.Short() {
		step = 1
	}
	answered := 0
	for lat := -90.0; lat <= 90; lat += step {
		for lon := -180.0; lon <= 180; lon += step {
			got, exp := tiles.name(lon, lat), fuzzy.GetTimezoneName(lon, lat)
			if got != exp {
				t.Fatalf("%v, %v: tile %q, tzf %q", lat, lon, got, exp)
			}
			if got != "" {
				answered++
			}
		}
	}
	if answered == 0 {
		t.Error("no point of the grid in a tile")
	}

	cin := &pb.CompressedTimezones{}
	if err := proto.Unmarshal(tzfrellite.LiteCompressData, cin); err != nil {
		t.Fatal(err)
	}
	zones, err := reduce.Decompress(cin)
	if err != nil {
		t.Fatal(err)
	}
	names, shapes, err := decodeZonePolygons(tzfrellite.LiteCompressData)
	if err != nil {
		t.Fatal(err)
	}
	if len(names) != len(zones.Timezones) || len(names) < 300 {
		t.Fatalf("%d zones, tzf %d", len(names), len(zones.Timezones))
	}
	same := func(where string, got []geometry.Point, exp []*pb.Point) {
		t.Helper()
		if len(got) != len(exp) {
			t.Fatalf("%s: %d points, tzf %d", where, len(got), len(exp))
		}
		for i, p := range exp {
			if got[i].X != float64(p.Lng) || got[i].Y != float64(p.Lat) {
				t.Fatalf("%s, point %d: %v, tzf %v", where, i, got[i], p)
			}
		}
	}
	for i, z := range zones.Timezones {
		if names[i] != z.Name || len(shapes[i]) != len(z.Polygons) {
			t.Fatalf("zone %d: %s with %d polygons, tzf %s with %d", i, names[i], len(shapes[i]), z.Name, len(z.Polygons))
		}
		for j, p := range z.Polygons {
			same(z.Name, shapes[i][j].outer, p.Points)
			if len(shapes[i][j].holes) != len(p.Holes) {
				t.Fatalf("%s, polygon %d: %d holes, tzf %d", z.Name, j, len(shapes[i][j].holes), len(p.Holes))
			}
			for k, h := range p.Holes {
				same(z.Name, shapes[i][j].holes[k], h.Points)
			}
		}
	}
}

// A damaged message is refused, never read past its end.
func TestZoneMapRefusesMalformed(t *testing.T) {
	for _, c := range []struct {
		name string
		data []byte
	}{
		{"varint without its last byte", []byte{0x08, 0x80}},
		{"length past the end", []byte{0x1a, 0x05, 0x0a}},
		{"field number 0", []byte{0x00, 0x01}},
		{"a group", []byte{0x0b}},
		{"name not UTF-8", []byte{0x1a, 0x03, 0x0a, 0x01, 0xff}},
		{"fixed32 cut short", []byte{0x2d, 0x01, 0x02}},
	} {
		if _, err := decodeZoneTiles(c.data); !errors.Is(err, errWire) {
			t.Errorf("%s: tiles: %v, want %v", c.name, err, errWire)
		}
		if _, _, err := decodeZonePolygons(c.data); !errors.Is(err, errWire) {
			t.Errorf("%s: polygons: %v, want %v", c.name, err, errWire)
		}
	}
	if _, _, err := decodeZonePolygons([]byte{0x08, 0x02}); err == nil {
		t.Error("compression method 2 accepted")
	}
}

// The polygon lookup answers as tzf's own finder over the same file, on a
// 1° grid over land and sea: the name, or none, at each point, and
// all the names at points that several polygons hold.
func TestZonePolygonsAnswerAsTzf(t *testing.T) {
	if testing.Short() {
		t.Skip("builds both polygon indexes (about a second)")
	}
	cin := &pb.CompressedTimezones{}
	if err := proto.Unmarshal(tzfrellite.LiteCompressData, cin); err != nil {
		t.Fatal(err)
	}
	finder, err := tzf.NewFinderFromCompressed(cin)
	if err != nil {
		t.Fatal(err)
	}
	names, shapes, err := decodeZonePolygons(tzfrellite.LiteCompressData)
	if err != nil {
		t.Fatal(err)
	}
	mine := newZonePolygons(names, shapes)
	answered := 0
	for lat := -89.5; lat < 90; lat++ {
		for lon := -179.5; lon < 180; lon++ {
			got, exp := mine.name(lon, lat), finder.GetTimezoneName(lon, lat)
			if got != exp {
				t.Fatalf("%v, %v: %q, tzf %q", lat, lon, got, exp)
			}
			if got == "" {
				continue
			}
			answered++
			all, _ := finder.GetTimezoneNames(lon, lat)
			if gotAll := mine.names(lon, lat); !slices.Equal(gotAll, all) {
				t.Fatalf("%v, %v: %q, tzf %q", lat, lon, gotAll, all)
			}
		}
	}
	if answered < 60000 { // the files give the seas their Etc/GMT zones: nearly every point has one
		t.Errorf("only %d points of the grid in a zone", answered)
	}
}

// names lists, sorted, every zone whose polygons hold the point: more than
// one where polygons overlap (disputed land).
func (m *zonePolygons) names(lon, lat float64) []string {
	p := geometry.Point{X: lon, Y: lat}
	var out []string
	for i := range m.zones {
		if m.zones[i].contains(p) {
			out = append(out, m.zones[i].name)
		}
	}
	slices.Sort(out)
	return out
}
