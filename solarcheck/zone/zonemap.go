package zone

import (
	"fmt"
	"slices"
	"sync"

	pb "github.com/ringsaturn/tzf/gen/go/tzf/v1"
	"github.com/tidwall/geojson/geometry"
	"github.com/twpayne/go-polyline"
	"google.golang.org/protobuf/encoding/protowire"
	"google.golang.org/protobuf/proto"
)

// The zone map answers exactly as tzf's exact finder (tzf.NewFinderFromCompressed,
// whose GetTimezoneNames returns every zone with a polygon holding the point) over
// the same data, tzf-rel-lite, but builds nothing it does not need. tzf decodes
// every polyline into one heap-allocated protobuf point per vertex and builds an
// R-tree segment index for each of the 1,319 polygons at start: about 0.5 s and
// 390 MB allocated to keep 22 MB. Here each polygon is decoded straight into a
// flat point slice with tzf's rounding, its bounding box is kept, and its segment
// index (the same tidwall/geojson polygon tzf builds, so the same point-in-polygon
// rule, edges included) is built the first time a looked-up point falls inside the
// box. The agreement is checked point by point in zonemap_test.go against a table
// made with tzf's exact finder.

// polyIndex is the index tzf builds for every polygon (tzf.NewFinderFromPB).
var polyIndex = &geometry.IndexOptions{Kind: geometry.RTree, MinPoints: 64}

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

// lazyPoly is one polygon with holes, indexed on first use.
type lazyPoly struct {
	box   geometry.Rect
	ext   []geometry.Point
	holes [][]geometry.Point

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
		p.poly = geometry.NewPoly(p.ext, p.holes, polyIndex)
		p.ext, p.holes = nil, nil // NewPoly keeps its own copy
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

// decodeZoneMap decodes tzf's compressed boundary data (pb.CompressedTimezones,
// polyline-encoded rings).
func decodeZoneMap(data []byte) (*zoneMap, error) {
	in := &pb.CompressedTimezones{}
	if err := proto.Unmarshal(data, in); err != nil {
		return nil, fmt.Errorf("decode boundary data: %w", err)
	}
	if in.Method != pb.CompressMethod_COMPRESS_METHOD_POLYLINE {
		return nil, fmt.Errorf("decode boundary data: compression %v, want polyline", in.Method)
	}
	m := &zoneMap{version: in.Version, zones: make([]zoneShape, 0, len(in.Timezones))}
	for _, tz := range in.Timezones {
		z := zoneShape{name: tz.Name, polys: make([]*lazyPoly, 0, len(tz.Data))}
		first := true
		for _, cp := range tz.Data {
			p := &lazyPoly{ext: decodeRing(cp.Points)}
			p.box = bounds(p.ext)
			for _, h := range cp.Holes {
				p.holes = append(p.holes, decodeRing(h.Points))
			}
			z.polys = append(z.polys, p)
			if len(p.ext) == 0 {
				continue
			}
			if first {
				z.box, first = p.box, false
			} else {
				z.box = union(z.box, p.box)
			}
		}
		if first { // no points at all: a box no point is in
			z.box = geometry.Rect{Min: geometry.Point{X: 1, Y: 1}, Max: geometry.Point{X: -1, Y: -1}}
		}
		m.zones = append(m.zones, z)
	}
	return m, nil
}

// decodeRing decodes one polyline-encoded ring (longitude first, scale 1e5) into
// a flat point slice, with the rounding tzf applies: go-polyline's DecodeCoords
// sums the scaled deltas in float64, and tzf (reduce.DecompressedPolylineBytesToPoints)
// stores each coordinate as float32, widened back to float64 for the geometry. A
// malformed ring decodes to no points, as in tzf, which ignores the error.
func decodeRing(b []byte) []geometry.Point {
	n := 0 // values in b: one per byte without the continuation bit
	for _, c := range b {
		if (c-63)&0x20 == 0 {
			n++
		}
	}
	pts := make([]geometry.Point, 0, n/2)
	var x, y float64
	for len(b) > 0 {
		dx, rest, err := polyline.DecodeInt(b)
		if err != nil {
			return nil
		}
		dy, rest, err := polyline.DecodeInt(rest)
		if err != nil {
			return nil
		}
		b = rest
		if len(pts) == 0 {
			x, y = float64(dx)/1e5, float64(dy)/1e5
		} else {
			x, y = float64(dx)/1e5+x, float64(dy)/1e5+y
		}
		pts = append(pts, geometry.Point{X: float64(float32(x)), Y: float64(float32(y))})
	}
	return pts
}

// bounds returns the smallest box holding pts (the zero box for none).
func bounds(pts []geometry.Point) geometry.Rect {
	if len(pts) == 0 {
		return geometry.Rect{}
	}
	r := geometry.Rect{Min: pts[0], Max: pts[0]}
	for _, p := range pts[1:] {
		r.Min.X = min(r.Min.X, p.X)
		r.Min.Y = min(r.Min.Y, p.Y)
		r.Max.X = max(r.Max.X, p.X)
		r.Max.Y = max(r.Max.Y, p.Y)
	}
	return r
}

// union returns the smallest box holding a and b.
func union(a, b geometry.Rect) geometry.Rect {
	return geometry.Rect{
		Min: geometry.Point{X: min(a.Min.X, b.Min.X), Y: min(a.Min.Y, b.Min.Y)},
		Max: geometry.Point{X: max(a.Max.X, b.Max.X), Y: max(a.Max.Y, b.Max.Y)},
	}
}

// zoneMapDataVersion reads only the version field of the compressed boundary data
// (pb.CompressedTimezones), skipping the boundaries, so that the report can name
// the data without decoding it.
func zoneMapDataVersion(data []byte) (string, error) {
	field := (&pb.CompressedTimezones{}).ProtoReflect().Descriptor().Fields().ByName("version").Number()
	for len(data) > 0 {
		num, typ, n := protowire.ConsumeTag(data)
		if n < 0 {
			return "", fmt.Errorf("read boundary data version: %w", protowire.ParseError(n))
		}
		data = data[n:]
		if num == field && typ == protowire.BytesType {
			v, n := protowire.ConsumeBytes(data)
			if n < 0 {
				return "", fmt.Errorf("read boundary data version: %w", protowire.ParseError(n))
			}
			return string(v), nil
		}
		n = protowire.ConsumeFieldValue(num, typ, data)
		if n < 0 {
			return "", fmt.Errorf("read boundary data version: %w", protowire.ParseError(n))
		}
		data = data[n:]
	}
	return "", fmt.Errorf("read boundary data version: no version field")
}
