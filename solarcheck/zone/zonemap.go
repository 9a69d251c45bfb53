package zone

import (
	"fmt"
	"slices"
	"sync"

	"github.com/tidwall/geojson/geometry"
	"github.com/twpayne/go-polyline"
	"google.golang.org/protobuf/encoding/protowire"
)

// The zone map answers exactly as tzf's exact finder (tzf.NewFinderFromCompressed,
// whose GetTimezoneNames returns every zone with a polygon holding the point) over
// the same data, tzf-rel-lite, but builds nothing it does not need. tzf decodes
// every polyline into one heap-allocated protobuf point per vertex and builds an
// R-tree segment index for each of the 1,319 polygons at start: about 0.6 s and
// 400 MB allocated to keep 23 MB. Here the protocol buffer is walked in place (the
// rings stay in the embedded bytes), each ring is decoded once for its bounding
// box, and a polygon is decoded into flat point slices, with tzf's rounding, and
// indexed (the same tidwall/geojson polygon tzf builds, so the same
// point-in-polygon rule, edges included) the first time a looked-up point falls
// inside its box. The agreement is checked point by point in zonemap_test.go
// against a table made with tzf's exact finder.

// zoneMap is the decoded boundary data.
type zoneMap struct {
	version string
	zones   []zoneShape
}

// zoneShape is one named zone: its polygons and the box around them all.
type zoneShape struct {
	name  string
	box   geometry.Rect
	polys []*lazyPoly
}

// lazyPoly is one polygon with holes, polyline-encoded until first use.
type lazyPoly struct {
	box   geometry.Rect
	ext   []byte   // the exterior ring, in the embedded data
	holes [][]byte // the holes' rings, in the embedded data

	once sync.Once
	poly *geometry.Poly
}

// contains reports whether the polygon holds pt. The box test is the one
// geometry.Poly.ContainsPoint makes first (edges inclusive), so skipping the
// polygon outside its box changes no answer.
func (p *lazyPoly) contains(pt geometry.Point) bool {
	if !p.box.ContainsPoint(pt) {
		return false
	}
	p.once.Do(func() {
		holes := make([][]geometry.Point, len(p.holes))
		for i, h := range p.holes {
			holes[i] = decodeRing(h)
		}
		ext := decodeRing(p.ext)
		// The index tzf builds for every polygon (tzf.NewFinderFromPB).
		p.poly = geometry.NewPoly(ext, holes, &geometry.IndexOptions{Kind: geometry.RTree, MinPoints: 64})
		p.ext, p.holes = nil, nil
	})
	return p.poly.ContainsPoint(pt)
}

// zonesAt returns the names of every zone with a polygon holding (lng, lat),
// sorted; nil where none does. Coordinates are in tzf's order, longitude first.
func (m *zoneMap) zonesAt(lng, lat float64) []string {
	pt := geometry.Point{X: lng, Y: lat}
	var names []string
	for i := range m.zones {
		z := &m.zones[i]
		if !z.box.ContainsPoint(pt) {
			continue
		}
		for _, p := range z.polys {
			if p.contains(pt) {
				names = append(names, z.name)
				break
			}
		}
	}
	slices.Sort(names)
	return names
}

// Field numbers of tzf's compressed boundary data (tzf/v1/tzinfo.proto; checked
// against the generated descriptors in zonemap_test.go).
const (
	fieldMethod    = 1 // CompressedTimezones.method: CompressMethod
	fieldTimezones = 2 // CompressedTimezones.timezones: repeated CompressedTimezone
	fieldVersion   = 3 // CompressedTimezones.version: string
	fieldData      = 1 // CompressedTimezone.data: repeated CompressedPolygon
	fieldName      = 2 // CompressedTimezone.name: string
	fieldPoints    = 1 // CompressedPolygon.points: bytes (polyline)
	fieldHoles     = 2 // CompressedPolygon.holes: repeated CompressedPolygon

	methodPolyline = 1 // COMPRESS_METHOD_POLYLINE
)

// eachField calls fn for every field of one protocol buffer message, with the
// bytes of a length-delimited field or the value of a varint; other wire types
// are skipped.
func eachField(msg []byte, fn func(num protowire.Number, b []byte, v uint64) error) error {
	for len(msg) > 0 {
		num, typ, n := protowire.ConsumeTag(msg)
		if n < 0 {
			return protowire.ParseError(n)
		}
		msg = msg[n:]
		var b []byte
		var v uint64
		switch typ {
		case protowire.BytesType:
			b, n = protowire.ConsumeBytes(msg)
		case protowire.VarintType:
			v, n = protowire.ConsumeVarint(msg)
		default:
			n = protowire.ConsumeFieldValue(num, typ, msg)
		}
		if n < 0 {
			return protowire.ParseError(n)
		}
		msg = msg[n:]
		if typ == protowire.BytesType || typ == protowire.VarintType {
			if err := fn(num, b, v); err != nil {
				return err
			}
		}
	}
	return nil
}

// decodeZoneMap reads tzf's compressed boundary data (pb.CompressedTimezones) in
// place: the rings are kept as slices of data, which must not change.
func decodeZoneMap(data []byte) (*zoneMap, error) {
	m := &zoneMap{}
	method := uint64(0)
	err := eachField(data, func(num protowire.Number, b []byte, v uint64) error {
		switch num {
		case fieldMethod:
			method = v
		case fieldVersion:
			m.version = string(b)
		case fieldTimezones:
			z, err := decodeZone(b)
			if err != nil {
				return err
			}
			m.zones = append(m.zones, z)
		}
		return nil
	})
	if err != nil {
		return nil, fmt.Errorf("decode boundary data: %w", err)
	}
	if method != methodPolyline {
		return nil, fmt.Errorf("decode boundary data: compression method %d, want polyline (%d)", method, methodPolyline)
	}
	return m, nil
}

// noBox is a box no point is in, for a zone without points.
var noBox = geometry.Rect{Min: geometry.Point{X: 1, Y: 1}, Max: geometry.Point{X: -1, Y: -1}}

// decodeZone reads one CompressedTimezone: its name, its polygons and their boxes.
func decodeZone(msg []byte) (zoneShape, error) {
	z := zoneShape{box: noBox}
	err := eachField(msg, func(num protowire.Number, b []byte, _ uint64) error {
		switch num {
		case fieldName:
			z.name = string(b)
		case fieldData:
			p, err := decodePolygon(b)
			if err != nil {
				return err
			}
			z.polys = append(z.polys, p)
			if p.box == noBox {
				return nil
			}
			if z.box == noBox {
				z.box = p.box
			}
			z.box = union(z.box, p.box)
		}
		return nil
	})
	return z, err
}

// decodePolygon reads one CompressedPolygon (exterior ring and holes) and the
// box of its exterior ring, noBox for a ring without points.
func decodePolygon(msg []byte) (*lazyPoly, error) {
	p := &lazyPoly{}
	err := eachField(msg, func(num protowire.Number, b []byte, _ uint64) error {
		switch num {
		case fieldPoints:
			p.ext = b
		case fieldHoles:
			return eachField(b, func(num protowire.Number, b []byte, _ uint64) error {
				if num == fieldPoints {
					p.holes = append(p.holes, b)
				}
				return nil
			})
		}
		return nil
	})
	if err != nil {
		return nil, err
	}
	p.box = noBox
	n := 0
	ok := eachVertex(p.ext, func(pt geometry.Point) {
		if n++; n == 1 {
			p.box = geometry.Rect{Min: pt, Max: pt}
		}
		p.box = union(p.box, geometry.Rect{Min: pt, Max: pt})
	})
	if !ok {
		p.box = noBox
	}
	return p, nil
}

// eachVertex calls fn for each vertex of one ring in Google's Encoded Polyline
// Algorithm Format (longitude first, scale 1e5), with the rounding tzf applies:
// go-polyline's DecodeCoords sums the scaled deltas in float64, and tzf
// (reduce.DecompressedPolylineBytesToPoints) stores each coordinate as float32,
// widened back to float64 for the geometry. It reports false for a malformed
// ring, which tzf reads as no points (it ignores the error and keeps none).
func eachVertex(b []byte, fn func(geometry.Point)) bool {
	var x, y float64
	for first := true; len(b) > 0; first = false {
		dx, rest, err := polyline.DecodeInt(b)
		if err != nil {
			return false
		}
		dy, rest, err := polyline.DecodeInt(rest)
		if err != nil {
			return false
		}
		b = rest
		if first {
			x, y = float64(dx)/1e5, float64(dy)/1e5
		} else {
			x, y = float64(dx)/1e5+x, float64(dy)/1e5+y
		}
		fn(geometry.Point{X: float64(float32(x)), Y: float64(float32(y))})
	}
	return true
}

// decodeRing decodes one polyline-encoded ring into a flat point slice (nil
// for a malformed ring, as tzf reads it).
func decodeRing(b []byte) []geometry.Point {
	n := 0 // values in b: one per byte without the continuation bit
	for _, c := range b {
		if (c-63)&0x20 == 0 {
			n++
		}
	}
	pts := make([]geometry.Point, 0, n/2)
	if !eachVertex(b, func(pt geometry.Point) { pts = append(pts, pt) }) {
		return nil
	}
	return pts
}

// union returns the smallest box holding a and b.
func union(a, b geometry.Rect) geometry.Rect {
	return geometry.Rect{
		Min: geometry.Point{X: min(a.Min.X, b.Min.X), Y: min(a.Min.Y, b.Min.Y)},
		Max: geometry.Point{X: max(a.Max.X, b.Max.X), Y: max(a.Max.Y, b.Max.Y)},
	}
}

// zoneMapDataVersion reads only the version field of the compressed boundary
// data, skipping the boundaries, so that the report can name the data without
// decoding it.
func zoneMapDataVersion(data []byte) (string, error) {
	var v string
	found := false
	err := eachField(data, func(num protowire.Number, b []byte, _ uint64) error {
		if num == fieldVersion {
			v, found = string(b), true
		}
		return nil
	})
	if err != nil {
		return "", fmt.Errorf("read boundary data version: %w", err)
	}
	if !found {
		return "", fmt.Errorf("read boundary data version: no version field")
	}
	return v, nil
}
