package zone

import (
	"bufio"
	"compress/gzip"
	"os"
	"slices"
	"strconv"
	"strings"
	"testing"

	tzfrellite "github.com/ringsaturn/tzf-rel-lite"
	pb "github.com/ringsaturn/tzf/gen/go/tzf/v1"
	"google.golang.org/protobuf/encoding/protowire"
	"google.golang.org/protobuf/proto"
	"google.golang.org/protobuf/reflect/protoreflect"
)

// refPoint is one point of the reference table and the zones tzf's exact
// finder gives there.
type refPoint struct {
	lng, lat float64
	want     []string
}

// readZoneGrid reads testdata/zonegrid.txt.gz (format: internal/gengrid).
func readZoneGrid(t *testing.T) (pts []refPoint, header []string) {
	t.Helper()
	const path = "testdata/zonegrid.txt.gz"
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	zr, err := gzip.NewReader(f)
	if err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	sc := bufio.NewScanner(zr)
	line := 0
	next := func() string {
		if !sc.Scan() {
			t.Fatalf("%s: ends early after line %d (%v)", path, line, sc.Err())
		}
		line++
		return sc.Text()
	}
	var zones []string
	answer := func() []string {
		s := next()
		if s == "-" {
			return nil
		}
		var names []string
		for _, p := range strings.Split(s, "+") {
			i, err := strconv.Atoi(p)
			if err != nil || i < 0 || i >= len(zones) {
				t.Fatalf("%s:%d: bad answer %q", path, line, s)
			}
			names = append(names, zones[i])
		}
		return names
	}
	for sc.Scan() {
		line++
		s := sc.Text()
		f := strings.Fields(s)
		switch {
		case strings.HasPrefix(s, "#"):
			header = append(header, s)
		case len(f) == 2 && f[0] == "zone":
			zones = append(zones, f[1])
		case len(f) == 6 && f[0] == "grid":
			var g [5]int
			for i := range g {
				if g[i], err = strconv.Atoi(f[i+1]); err != nil || (i == 4 && g[i] <= 0) {
					t.Fatalf("%s:%d: bad grid %q", path, line, s)
				}
			}
			for la := g[0]; la <= g[1]; la += g[4] {
				for lo := g[2]; lo <= g[3]; lo += g[4] {
					pts = append(pts, refPoint{lng: float64(lo) / 1e6, lat: float64(la) / 1e6, want: answer()})
				}
			}
		case len(f) == 3 && f[0] == "point":
			lng, err1 := strconv.ParseFloat(f[1], 32)
			lat, err2 := strconv.ParseFloat(f[2], 32)
			if err1 != nil || err2 != nil {
				t.Fatalf("%s:%d: bad point %q", path, line, s)
			}
			pts = append(pts, refPoint{lng: lng, lat: lat, want: answer()})
		default:
			t.Fatalf("%s:%d: unreadable line %q", path, line, s)
		}
	}
	if err := sc.Err(); err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	return pts, header
}

// TestZoneMapAgreesWithTzf: at every point of the reference table (a whole-Earth
// grid every 0.5°, denser grids over Europe, the USA and the western China and
// Kashmir borders, and every 97th vertex of the data, about 450,000 points) the
// finder gives exactly the zones tzf's own exact finder gave (reference: tzf
// v1.0.2 and tzf-rel-lite, named in the table's header), every name where zones
// overlap, none where no polygon holds the point.
func TestZoneMapAgreesWithTzf(t *testing.T) {
	pts, header := readZoneGrid(t)
	for _, h := range header[:3] {
		t.Log(h)
	}
	if len(pts) < 300000 {
		t.Fatalf("reference table has %d points, want at least 300,000", len(pts))
	}
	zm, err := decodeZoneMap(tzfrellite.LiteCompressData)
	if err != nil {
		t.Fatal(err)
	}
	stride := 1
	if raceEnabled {
		stride = 7
	}
	var overlaps, atSea, none, bad int
	for i := 0; i < len(pts); i += stride {
		p := pts[i]
		got := zm.zonesAt(p.lng, p.lat)
		switch {
		case len(p.want) == 0:
			none++
		case len(p.want) > 1:
			overlaps++
		case strings.HasPrefix(p.want[0], "Etc/"):
			atSea++
		}
		if !slices.Equal(got, p.want) {
			if bad++; bad <= 20 {
				t.Errorf("lng %v lat %v: %v, want %v (tzf exact finder)", p.lng, p.lat, got, p.want)
			}
		}
	}
	if bad > 0 {
		t.Errorf("%d of %d points disagree with the reference", bad, len(pts)/stride)
	}
	// The table must exercise what it is meant to check.
	if overlaps < 1000/stride || atSea < 10000/stride {
		t.Errorf("table has %d overlap and %d open-sea points; want many of both", overlaps, atSea)
	}
	t.Logf("%d of the table's %d points checked (one in %d): %d where zones overlap, %d in one nautical zone, %d in no polygon", (len(pts)+stride-1)/stride, len(pts), stride, overlaps, atSea, none)
}

// TestZoneMapDataVersion: the version read without decoding the boundaries is
// the one protobuf's own decoder reads from tzf's message type, and the one the
// decoded map carries.
func TestZoneMapDataVersion(t *testing.T) {
	in := &pb.CompressedTimezones{}
	if err := proto.Unmarshal(tzfrellite.LiteCompressData, in); err != nil {
		t.Fatal(err)
	}
	v, err := zoneMapDataVersion(tzfrellite.LiteCompressData)
	if err != nil || v != in.Version || v == "" {
		t.Fatalf("zoneMapDataVersion = %q, %v; protobuf reads %q", v, err, in.Version)
	}
	zm, err := decodeZoneMap(tzfrellite.LiteCompressData)
	if err != nil || zm.version != v || len(zm.zones) != len(in.Timezones) {
		t.Fatalf("decoded map: version %q, %d zones, %v; protobuf reads %q, %d zones", zm.version, len(zm.zones), err, v, len(in.Timezones))
	}
	if _, err := zoneMapDataVersion([]byte{0x1a, 0x05, 'a'}); err == nil {
		t.Error("a truncated version field was read without error")
	}
	if _, err := decodeZoneMap([]byte{0x08, 0x02}); err == nil {
		t.Error("data in an unknown compression method was decoded without error")
	}
}

// TestFieldNumbers: the field numbers the map is read with are those of tzf's
// generated message types.
func TestFieldNumbers(t *testing.T) {
	num := func(m proto.Message, field string) protowire.Number {
		return m.ProtoReflect().Descriptor().Fields().ByName(protoreflect.Name(field)).Number()
	}
	for _, c := range []struct {
		got, want protowire.Number
		what      string
	}{
		{fieldMethod, num(&pb.CompressedTimezones{}, "method"), "CompressedTimezones.method"},
		{fieldTimezones, num(&pb.CompressedTimezones{}, "timezones"), "CompressedTimezones.timezones"},
		{fieldVersion, num(&pb.CompressedTimezones{}, "version"), "CompressedTimezones.version"},
		{fieldData, num(&pb.CompressedTimezone{}, "data"), "CompressedTimezone.data"},
		{fieldName, num(&pb.CompressedTimezone{}, "name"), "CompressedTimezone.name"},
		{fieldPoints, num(&pb.CompressedPolygon{}, "points"), "CompressedPolygon.points"},
		{fieldHoles, num(&pb.CompressedPolygon{}, "holes"), "CompressedPolygon.holes"},
		{methodPolyline, protowire.Number(pb.CompressMethod_COMPRESS_METHOD_POLYLINE), "COMPRESS_METHOD_POLYLINE"},
	} {
		if c.got != c.want || c.want == 0 {
			t.Errorf("%s: %d, tzf's descriptor says %d", c.what, c.got, c.want)
		}
	}
}

// TestDecodeRing: the polyline example of Google's encoding documentation
// ("_p~iF~ps|U_ulLnnqC_mqNvxq`@" is (38.5, -120.2), (40.7, -120.95),
// (43.252, -126.453) in latitude-first order) decodes, read longitude first as
// tzf stores it, to those values rounded to float32; a truncated ring decodes
// to no points, as tzf reads it.
func TestDecodeRing(t *testing.T) {
	got := decodeRing([]byte("_p~iF~ps|U_ulLnnqC_mqNvxq`@"))
	want := [][2]float32{{38.5, -120.2}, {40.7, -120.95}, {43.252, -126.453}}
	if len(got) != len(want) {
		t.Fatalf("%d points, want %d", len(got), len(want))
	}
	for i, w := range want {
		if got[i].X != float64(w[0]) || got[i].Y != float64(w[1]) {
			t.Errorf("point %d = %v,%v, want %v,%v", i, got[i].X, got[i].Y, w[0], w[1])
		}
	}
	if pts := decodeRing([]byte("_p~iF~ps|U_ulL")); pts != nil {
		t.Errorf("truncated ring: %v, want no points", pts)
	}
}
