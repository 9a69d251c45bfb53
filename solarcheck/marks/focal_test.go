package marks

import (
	"errors"
	"math"
	"testing"
)

func TestFocalFromEXIF(t *testing.T) {
	tests := []struct {
		source     string
		in         FocalInput
		wantPx     float64
		wantSDPct  float64
		wantWarned bool
	}{
		// A full-frame sensor is 36 × 24 mm, so its 35 mm equivalent is its
		// focal length: 50 mm over 6000 px across 36 mm (common knowledge).
		{"full frame: 36 mm over 6000 px", FocalInput{WidthPx: 6000, HeightPx: 4000, FocalLength35mm: 50}, 50 * 6000 / 36.0, 3, false},
		{"full frame, portrait", FocalInput{WidthPx: 4000, HeightPx: 6000, FocalLength35mm: 50}, 50 * 6000 / 36.0, 3, false},
		// 4:3 frame: diagonal 5040 px for 4032 × 3024 (Pythagoras); the
		// width convention (26 × 4032/36) differs by 3.9 %, half of which
		// joins the 3 % in quadrature.
		{"phone 4:3, diagonal convention", FocalInput{WidthPx: 4032, HeightPx: 3024, FocalLength35mm: 26}, 26 * 5040 / math.Hypot(36, 24), math.Hypot(3, 100*(26*4032/36.0/(26*5040/math.Hypot(36, 24))-1)/2), false},
		// 1 inch = 25.4 mm (common knowledge): 4.5 mm at 16510 px/inch.
		{"focal plane, inches", FocalInput{WidthPx: 4000, HeightPx: 3000, FocalLengthMM: 4.5, FocalPlaneXResolution: 16510, FocalPlaneResolutionUnit: 2}, 4.5 * 16510 / 25.4, 2, true},
		{"focal plane, centimetres", FocalInput{WidthPx: 4000, HeightPx: 3000, FocalLengthMM: 4.5, FocalPlaneXResolution: 6500, FocalPlaneResolutionUnit: 3}, 4.5 * 650, 2, true},
		{"override", FocalInput{WidthPx: 4000, HeightPx: 3000, FocalLength35mm: 26, OverridePx: 3100}, 3100, 1, false},
		{"cropped 2:1", FocalInput{WidthPx: 4000, HeightPx: 2000, FocalLength35mm: 26}, 26 * math.Hypot(4000, 2000) / math.Hypot(36, 24), 10, true},
	}
	for _, tc := range tests {
		f, err := FocalFromEXIF(tc.in)
		if err != nil {
			t.Errorf("%s: %v", tc.source, err)
			continue
		}
		if math.Abs(f.Px-tc.wantPx) > 1e-9*tc.wantPx {
			t.Errorf("%s: %.6f px, want %.6f", tc.source, f.Px, tc.wantPx)
		}
		if got := 100 * f.SDPx / f.Px; math.Abs(got-tc.wantSDPct) > 1e-9 {
			t.Errorf("%s: 1-sigma %.4f %%, want %.4f %%", tc.source, got, tc.wantSDPct)
		}
		if (len(f.Warnings) > 0) != tc.wantWarned {
			t.Errorf("%s: warnings %q", tc.source, f.Warnings)
		}
	}
	if _, err := FocalFromEXIF(FocalInput{WidthPx: 4000, HeightPx: 3000}); !errors.Is(err, ErrNoFocal) {
		t.Errorf("no focal data: %v, want ErrNoFocal", err)
	}
}

// TestDip: the Nautical Almanac's metric form (1.76′√h, h in metres)
// against its form in feet (0.97′√h, h in feet; 1 ft = 0.3048 m), and
// against plain geometry: without refraction the dip is arccos(R/(R+h))
// for an Earth of radius R = 6371 km (common knowledge); standard
// terrestrial refraction lifts the horizon, so the tabulated dip is some
// 5–12 % smaller.
func TestDip(t *testing.T) {
	for _, h := range []float64{1.5, 10, 30, 100} {
		got := DipDeg(h) * 60
		feet := 0.97 * math.Sqrt(h/0.3048)
		if math.Abs(got/feet-1) > 0.005 {
			t.Errorf("h = %g m: dip %.3f′, feet form %.3f′", h, got, feet)
		}
		geom := math.Acos(6371e3/(6371e3+h)) / deg * 60
		if r := 1 - got/geom; r < 0.05 || r > 0.12 {
			t.Errorf("h = %g m: dip %.3f′ is %.1f %% below the unrefracted %.3f′", h, got, 100*r, geom)
		}
	}
}

// TestChi2: the 95 % points of the chi-square distribution for 2, 4 and 6
// degrees of freedom (NIST/SEMATECH e-Handbook of Statistical Methods,
// table 1.3.6.7.4: 5.991, 9.488, 12.592).
func TestChi2(t *testing.T) {
	for _, tc := range []struct {
		dof  int
		want float64
	}{{2, 5.991}, {4, 9.488}, {6, 12.592}} {
		if got := chi2Quantile(0.95, tc.dof); math.Abs(got-tc.want) > 0.0005 {
			t.Errorf("chi-square 95 %% point, %d dof: %.4f, want %.3f", tc.dof, got, tc.want)
		}
	}
}
