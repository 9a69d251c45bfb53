package report

import (
	"bytes"
	"encoding/json"
	"math"
	"strings"
	"testing"
)

func TestGeoJSONPositions(t *testing.T) {
	tests := []struct {
		name       string
		lat, lon   *float64
		wantCoords []float64 // nil: skipped
		wantReason string
		source     string
	}{
		{"ordinary", fp(43.21), fp(5.37), []float64{5.37, 43.21}, "", "RFC 7946 §3.1.1: longitude first"},
		{"southern-western", fp(-33.86), fp(-151.2), []float64{-151.2, -33.86}, "", "RFC 7946 §3.1.1"},
		{"antimeridian", fp(0), fp(-180), []float64{-180, 0}, "", "RFC 7946 §3.1.1: range includes ±180"},
		{"pole", fp(90), fp(0), []float64{0, 90}, "", "RFC 7946 §3.1.1"},
		{"NaN latitude", fp(math.NaN()), fp(5), nil, "latitude is not a finite number", "RFC 8259 §6: no NaN in JSON"},
		{"latitude 91", fp(91), fp(5), nil, "beyond ±90", "RFC 7946 §3.1.1: WGS 84 range"},
		{"longitude 181", fp(10), fp(181), nil, "beyond ±180", "RFC 7946 §3.1.1"},
		{"infinite longitude", fp(10), fp(math.Inf(-1)), nil, "longitude is not a finite number", "RFC 8259 §6"},
		{"longitude missing", fp(10), nil, nil, "longitude missing", "package doc"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var b bytes.Buffer
			a := &Audit{Photos: []Photo{{Path: "p.jpg", Lat: tc.lat, Lon: tc.lon, Verdict: "consistent"}}}
			if err := WriteGeoJSON(&b, a); err != nil {
				t.Fatal(err)
			}
			fc := decodeGeo(t, b.Bytes())
			fs := fc["features"].([]any)
			if len(fs) != 1 {
				t.Fatalf("%d features, want 1", len(fs))
			}
			f := fs[0].(map[string]any)
			props := f["properties"].(map[string]any)
			if tc.wantCoords == nil {
				if f["geometry"] != nil {
					t.Errorf("geometry %v, want null (%s)", f["geometry"], tc.source)
				}
				if r, _ := props["skipped_reason"].(string); !strings.Contains(r, tc.wantReason) {
					t.Errorf("skipped_reason %q, want it to contain %q", r, tc.wantReason)
				}
				return
			}
			g := f["geometry"].(map[string]any)
			c := g["coordinates"].([]any)
			if c[0].(float64) != tc.wantCoords[0] || c[1].(float64) != tc.wantCoords[1] {
				t.Errorf("coordinates %v, want %v (%s)", c, tc.wantCoords, tc.source)
			}
		})
	}
}

func decodeGeo(t *testing.T, b []byte) map[string]any {
	t.Helper()
	if !json.Valid(b) {
		t.Fatal("not valid JSON")
	}
	var fc map[string]any
	if err := json.Unmarshal(b, &fc); err != nil {
		t.Fatal(err)
	}
	return fc
}

// TestGeoJSONStructure checks the RFC 7946 rules on the whole fixture.
func TestGeoJSONStructure(t *testing.T) {
	var b, b2 bytes.Buffer
	a := fixtureAudit()
	if err := WriteGeoJSON(&b, a); err != nil {
		t.Fatal(err)
	}
	if err := WriteGeoJSON(&b2, a); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(b.Bytes(), b2.Bytes()) {
		t.Fatal("two writes differ")
	}
	fc := decodeGeo(t, b.Bytes())
	if fc["type"] != "FeatureCollection" {
		t.Fatalf("type %v (RFC 7946 §3.3)", fc["type"])
	}
	kinds := map[string]int{}
	skipped := 0
	for i, x := range fc["features"].([]any) {
		f := x.(map[string]any)
		if f["type"] != "Feature" {
			t.Errorf("feature %d: type %v (RFC 7946 §3.2)", i, f["type"])
		}
		props, ok := f["properties"].(map[string]any)
		if !ok {
			t.Fatalf("feature %d: properties not an object (RFC 7946 §3.2)", i)
		}
		kinds[props["kind"].(string)]++
		for _, k := range []string{"path", "verdict", "claimed_utc", "corrected_utc_earliest", "corrected_utc_latest", "camera", "kind"} {
			if _, ok := props[k]; !ok {
				t.Errorf("feature %d: property %q missing (brief)", i, k)
			}
		}
		if props["kind"] == FeatureShadowFix {
			if _, ok := props["radius_km"].(float64); !ok {
				t.Errorf("feature %d: shadow_fix without radius_km", i)
			}
		}
		if f["geometry"] == nil {
			skipped++
			if props["skipped_reason"] == nil {
				t.Errorf("feature %d: null geometry without a reason", i)
			}
			continue
		}
		g := f["geometry"].(map[string]any)
		c, _ := g["coordinates"].([]any)
		if g["type"] != "Point" || len(c) != 2 {
			t.Fatalf("feature %d: geometry %v (RFC 7946 §3.1.2)", i, g)
		}
		lon, lat := c[0].(float64), c[1].(float64)
		if math.Abs(lon) > 180 || math.Abs(lat) > 90 {
			t.Errorf("feature %d: [%v, %v] out of range (RFC 7946 §3.1.1)", i, lon, lat)
		}
	}
	// The fixture: 11 photos with GPS tags (one of them invalid), one shadow fix.
	if kinds[FeatureGPS] != 11 || kinds[FeatureShadowFix] != 1 || skipped != 1 {
		t.Errorf("kinds %v, %d skipped; want 11 gps, 1 shadow_fix, 1 skipped", kinds, skipped)
	}
}
