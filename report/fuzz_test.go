package report

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"math"
	"strings"
	"testing"

	"github.com/gnomon-forensics/gnomon/internal/testkit/browsertest"
)

// FuzzJSON: for any bytes in photo strings and any number, report.json is
// valid JSON (encoding/json.Valid is the witness), ReadJSON gives back the
// exact bytes, and re-encoding is byte-identical.
func FuzzJSON(f *testing.F) {
	f.Add("quay/IMG_0101.JPG", "cam-A", 43.2)
	f.Add("\xff\xfe", "\xed\xa0\x80", math.NaN())
	f.Add(hostScript, hostRTL, math.Inf(-1))
	f.Fuzz(func(t *testing.T, path, camera string, lat float64) {
		a := &Audit{Photos: []Photo{{Path: path, Camera: camera, Lat: &lat, ZoneOptions: []string{camera, path}}},
			Cameras: []Camera{{ID: camera, Outliers: []string{path}}}}
		var b bytes.Buffer
		if err := WriteJSON(&b, a); err != nil {
			t.Fatal(err)
		}
		if !json.Valid(b.Bytes()) {
			t.Fatalf("invalid JSON: %q", b.String())
		}
		back, err := ReadJSON(bytes.NewReader(b.Bytes()))
		if err != nil {
			t.Fatal(err)
		}
		p := back.Photos[0]
		if p.Path != path || p.Camera != camera || p.ZoneOptions[1] != path || back.Cameras[0].Outliers[0] != path || !sameFloat(*p.Lat, lat) {
			t.Fatalf("bytes lost: %q %q %v", p.Path, p.Camera, *p.Lat)
		}
		var again bytes.Buffer
		if err := WriteJSON(&again, back); err != nil || !bytes.Equal(again.Bytes(), b.Bytes()) {
			t.Fatalf("re-encoding differs (%v)", err)
		}
	})
}

// FuzzCSV: any text reads back (encoding/csv is the witness) as the
// neutralised cell, which never starts a formula.
func FuzzCSV(f *testing.F) {
	for _, s := range []string{"=1+1", " \t@x", "-2", "a,b\"c\nd", "\r=x", "＝1", "\xff"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		var b bytes.Buffer
		if err := WriteCSV(&b, &Audit{Photos: []Photo{{Path: s, Explanation: s}}}); err != nil {
			t.Fatal(err)
		}
		recs, err := csv.NewReader(&b).ReadAll()
		if err != nil {
			t.Fatalf("unreadable CSV: %v", err)
		}
		if len(recs) != 2 {
			t.Fatalf("%d records", len(recs))
		}
		got := recs[1][col("path")]
		want := NeutraliseCell(s)
		// encoding/csv's reader turns \r\n inside quoted fields into \n (RFC 4180 allows either).
		if got != strings.ReplaceAll(want, "\r\n", "\n") && got != want {
			t.Fatalf("cell %q, want %q", got, want)
		}
		trim := strings.TrimLeft(got, " \t\r\n\v\f\u0085\u00a0")
		if !strings.HasPrefix(got, "'") && trim != "" && strings.ContainsAny(trim[:1], "=+-@") {
			t.Fatalf("formula start in %q", got)
		}
	})
}

// FuzzHTML: no string in a photo becomes markup in the page.
func FuzzHTML(f *testing.F) {
	for _, s := range []string{hostScript, hostImg, hostSVG, hostJSURL, hostTitle, hostStyle, "thumbs/x.jpg"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		a := &Audit{Photos: []Photo{{Path: s, Camera: s, Thumbnail: s, Explanation: s, Sun: &SunAt{Azimuth: 10, Altitude: 20},
			Measured: []Measured{{Object: s, Azimuth: 1, AzimuthSD: 1}}}},
			Cameras: []Camera{{ID: s, Points: []ClockPoint{{Path: s, ClaimedUTC: "2025-01-01T00:00:00Z"}}}}}
		var b bytes.Buffer
		if err := WriteHTML(&b, a); err != nil {
			t.Fatal(err)
		}
		for _, e := range browsertest.Elements(b.String()) {
			switch e.Name {
			case "script", "iframe", "object", "embed", "frame", "base", "form", "link":
				t.Fatalf("element <%s> injected from %q", e.Name, s)
			}
			for k, v := range e.Attrs {
				if strings.HasPrefix(k, "on") || (k == "src" || k == "href") && (v != s || safeThumb(v) == "") {
					t.Fatalf("attribute %s=%q on <%s> injected from %q", k, v, e.Name, s)
				}
			}
		}
	})
}

// FuzzGeoJSON: every drawn point is within RFC 7946 ranges, longitude first.
func FuzzGeoJSON(f *testing.F) {
	f.Add(43.2, 5.4)
	f.Add(math.NaN(), 181.0)
	f.Add(-90.0, -180.0)
	f.Fuzz(func(t *testing.T, lat, lon float64) {
		var b bytes.Buffer
		a := &Audit{Photos: []Photo{{Lat: &lat, Lon: &lon, ShadowFix: &Fix{Lat: lon, Lon: lat}}}}
		if err := WriteGeoJSON(&b, a); err != nil {
			t.Fatal(err)
		}
		var fc struct {
			Features []struct {
				Geometry *struct{ Coordinates []float64 }
			}
		}
		if err := json.Unmarshal(b.Bytes(), &fc); err != nil {
			t.Fatal(err)
		}
		if len(fc.Features) != 2 {
			t.Fatalf("%d features, want 2", len(fc.Features))
		}
		g := fc.Features[0].Geometry
		if g != nil && (g.Coordinates[0] != lon || g.Coordinates[1] != lat || math.Abs(lat) > 90 || math.Abs(lon) > 180) {
			t.Fatalf("bad point %v for lat %v lon %v", g.Coordinates, lat, lon)
		}
	})
}
