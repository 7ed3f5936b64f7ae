package config

import (
	"errors"
	"fmt"
	"math"
	"unicode/utf8"

	"github.com/tidwall/geojson/geometry"
	"github.com/twpayne/go-polyline"
)

// The zone map's two files (github.com/ringsaturn/tzf-rel-lite) are
// Protocol Buffers messages of the schema tzf/v1 (tzf's pb/tzf/v1/tzinfo.proto).
// They are decoded here from the wire format itself: the protobuf runtime and
// the tzf package that wraps the files would link their package
// initialisation, and orb's GeoJSON with mongo-driver's bson through its tile
// helper, into every start of heliocal (a fifth of the instructions of
// `heliocal --version`), for a map only a place without a zone reads.
// The answers are tzf's own (TestZoneMapDecodesAsTzf): the same tiles, the
// same polygons, searched in the same order.

// zoneTile is a map tile of the Web Mercator (OpenStreetMap) scheme.
type zoneTile struct{ x, y, z uint32 }

// tileAt is the tile holding a point at zoom z, the tile scheme's formula
// (OpenStreetMap's "Slippy map tilenames"), with latitudes beyond the
// projection's ±85.0511° in the first or last row: the same arithmetic, in
// the same order, as the tile helper that made the map (paulmach/orb's
// maptile.At), so a point on a tile's edge falls in the same tile.
func tileAt(lon, lat float64, z uint32) zoneTile {
	factor := uint32(1 << z)
	maxtiles := float64(factor)
	x := lon/360.0 + 0.5
	px := x * maxtiles
	var py float64
	switch {
	case lat < -85.0511:
		py = maxtiles - 1
	case lat > 85.0511:
		py = 0
	default:
		siny := math.Sin(lat * math.Pi / 180.0)
		y := 0.5 + 0.5*math.Log((1.0+siny)/(1.0-siny))/(-2*math.Pi)
		py = y * maxtiles
	}
	return zoneTile{x: uint32(px), y: uint32(py), z: z}
}

// zoneTileMap is the map of tiles that lie wholly within one zone, from zoom
// aggZoom (large tiles) to idxZoom (small ones).
type zoneTileMap struct {
	aggZoom, idxZoom uint32
	zone             map[zoneTile]string // the first zone the file lists for a tile
}

// name is the zone of the first tile, from the largest to the smallest,
// that holds the point; "" when none does (near a border).
func (m *zoneTileMap) name(lon, lat float64) string {
	for z := m.aggZoom; z <= m.idxZoom; z++ {
		if name, ok := m.zone[tileAt(lon, lat, z)]; ok {
			return name
		}
	}
	return ""
}

// decodeZoneTiles decodes a tzf.v1.PreindexTimezones message: idx_zoom (1),
// agg_zoom (2), the repeated tiles (3: name 1, x 2, y 3, z 4), version (4).
func decodeZoneTiles(data []byte) (*zoneTileMap, error) {
	m := &zoneTileMap{zone: map[zoneTile]string{}}
	r := wireReader{b: data}
	for r.next() {
		switch {
		case r.field == 1 && r.typ == wireVarint:
			m.idxZoom = uint32(int32(r.varint()))
		case r.field == 2 && r.typ == wireVarint:
			m.aggZoom = uint32(int32(r.varint()))
		case r.field == 3 && r.typ == wireBytes:
			var name string
			var t zoneTile
			k := wireReader{b: r.bytes()}
			for k.next() {
				switch {
				case k.field == 1 && k.typ == wireBytes:
					name = k.text()
				case k.field == 2 && k.typ == wireVarint:
					t.x = uint32(int32(k.varint()))
				case k.field == 3 && k.typ == wireVarint:
					t.y = uint32(int32(k.varint()))
				case k.field == 4 && k.typ == wireVarint:
					t.z = uint32(int32(k.varint()))
				default:
					k.skip()
				}
			}
			if k.err != nil {
				return nil, k.err
			}
			if _, ok := m.zone[t]; !ok {
				m.zone[t] = name
			}
		case r.field == 4 && r.typ == wireBytes:
			r.text()
		default:
			r.skip()
		}
	}
	if r.err != nil {
		return nil, r.err
	}
	return m, nil
}

// zonePolygons is the map of the zones' polygons, in the file's order.
type zonePolygons struct {
	zones []zoneShape
}

type zoneShape struct {
	name  string
	polys []*geometry.Poly
}

func (s *zoneShape) contains(p geometry.Point) bool {
	for _, poly := range s.polys {
		if poly.ContainsPoint(p) {
			return true
		}
	}
	return false
}

// name is the first zone in the file's (alphabetical) order whose polygons
// hold the point; "" when none does.
func (m *zonePolygons) name(lon, lat float64) string {
	p := geometry.Point{X: lon, Y: lat}
	for i := range m.zones {
		if m.zones[i].contains(p) {
			return m.zones[i].name
		}
	}
	return ""
}

// zoneRings is one polygon of a zone as the file holds it: the outer ring
// and the holes, each ring's points (longitude, latitude) as
// single-precision numbers, which the map's points are.
type zoneRings struct {
	outer []geometry.Point
	holes [][]geometry.Point
}

// decodeZonePolygons decodes a tzf.v1.CompressedTimezones message: method
// (1, only 1: Google's encoded polyline), the repeated zones (2: the
// repeated polygons 1, name 2), version (3). A polygon (tzf.v1.
// CompressedPolygon) is its outer ring's points (1, an encoded polyline)
// and its repeated holes (2), each a polygon whose own holes are not read.
func decodeZonePolygons(data []byte) (names []string, shapes [][]zoneRings, err error) {
	method := uint64(0)
	r := wireReader{b: data}
	for r.next() {
		switch {
		case r.field == 1 && r.typ == wireVarint:
			method = r.varint()
		case r.field == 2 && r.typ == wireBytes:
			var name string
			var rings []zoneRings
			z := wireReader{b: r.bytes()}
			for z.next() {
				switch {
				case z.field == 1 && z.typ == wireBytes:
					p, err := decodePolygon(z.bytes())
					if err != nil {
						return nil, nil, err
					}
					rings = append(rings, p)
				case z.field == 2 && z.typ == wireBytes:
					name = z.text()
				default:
					z.skip()
				}
			}
			if z.err != nil {
				return nil, nil, z.err
			}
			names = append(names, name)
			shapes = append(shapes, rings)
		case r.field == 3 && r.typ == wireBytes:
			r.text()
		default:
			r.skip()
		}
	}
	if r.err != nil {
		return nil, nil, r.err
	}
	if method != 1 {
		return nil, nil, fmt.Errorf("compression method %d: only 1 (encoded polyline) is known", method)
	}
	return names, shapes, nil
}

func decodePolygon(b []byte) (zoneRings, error) {
	p := zoneRings{outer: polylinePoints(nil)}
	r := wireReader{b: b}
	for r.next() {
		switch {
		case r.field == 1 && r.typ == wireBytes:
			p.outer = polylinePoints(r.bytes())
		case r.field == 2 && r.typ == wireBytes:
			hole := polylinePoints(nil)
			h := wireReader{b: r.bytes()}
			for h.next() {
				if h.field == 1 && h.typ == wireBytes {
					hole = polylinePoints(h.bytes())
				} else {
					h.skip()
				}
			}
			if h.err != nil {
				return p, h.err
			}
			p.holes = append(p.holes, hole)
		default:
			r.skip()
		}
	}
	return p, r.err
}

// polylinePoints decodes an encoded polyline of (longitude, latitude)
// pairs, each rounded to single precision as the map stores its points; a
// malformed tail ends the ring where it starts.
func polylinePoints(b []byte) []geometry.Point {
	coords, _, _ := polyline.DecodeCoords(b)
	pts := make([]geometry.Point, 0, len(coords))
	for _, c := range coords {
		pts = append(pts, geometry.Point{X: float64(float32(c[0])), Y: float64(float32(c[1]))})
	}
	return pts
}

// newZonePolygons indexes every polygon (an R-tree over the edges of a ring
// of 64 points or more) for the point-in-polygon test.
func newZonePolygons(names []string, shapes [][]zoneRings) *zonePolygons {
	m := &zonePolygons{zones: make([]zoneShape, len(names))}
	for i, name := range names {
		m.zones[i].name = name
		for _, p := range shapes[i] {
			holes := make([][]geometry.Point, 0, len(p.holes))
			holes = append(holes, p.holes...)
			m.zones[i].polys = append(m.zones[i].polys,
				geometry.NewPoly(p.outer, holes, &geometry.IndexOptions{Kind: geometry.RTree, MinPoints: 64}))
		}
	}
	return m
}

// The wire types of the Protocol Buffers encoding
// (protobuf.dev/programming-guides/encoding).
const (
	wireVarint  = 0
	wireFixed64 = 1
	wireBytes   = 2
	wireFixed32 = 5
)

var errWire = errors.New("malformed protobuf message")

// wireReader walks the fields of one Protocol Buffers message.
type wireReader struct {
	b     []byte
	field uint64
	typ   uint64
	err   error
}

// next reads the next field's tag; false at the end or on an error.
func (r *wireReader) next() bool {
	if r.err != nil || len(r.b) == 0 {
		return false
	}
	tag := r.varint()
	r.field, r.typ = tag>>3, tag&7
	if r.field == 0 {
		r.fail()
	}
	return r.err == nil
}

func (r *wireReader) fail() {
	if r.err == nil {
		r.err = errWire
	}
	r.b = nil
}

func (r *wireReader) varint() uint64 {
	var v uint64
	for i := 0; i < 10; i++ {
		if i >= len(r.b) {
			break
		}
		c := r.b[i]
		v |= uint64(c&0x7f) << (7 * i)
		if c < 0x80 {
			r.b = r.b[i+1:]
			return v
		}
	}
	r.fail()
	return 0
}

func (r *wireReader) bytes() []byte {
	n := r.varint()
	if r.err != nil || n > uint64(len(r.b)) {
		r.fail()
		return nil
	}
	b := r.b[:n:n]
	r.b = r.b[n:]
	return b
}

// text reads a string field, which must be UTF-8.
func (r *wireReader) text() string {
	b := r.bytes()
	if !utf8.Valid(b) {
		r.fail()
		return ""
	}
	return string(b)
}

// skip passes over the value of a field not read.
func (r *wireReader) skip() {
	switch r.typ {
	case wireVarint:
		r.varint()
	case wireBytes:
		r.bytes()
	case wireFixed64, wireFixed32:
		n := 8
		if r.typ == wireFixed32 {
			n = 4
		}
		if len(r.b) < n {
			r.fail()
			return
		}
		r.b = r.b[n:]
	default: // groups, long deprecated, are not in the schema
		r.fail()
	}
}
