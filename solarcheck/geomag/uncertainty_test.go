package geomag

import (
	"math"
	"testing"
)

// TestDeclinationSD checks the WMM2025 declination error model,
// √(0.26² + (5417/H)²) degrees (WMM2025 Technical Report; WMM-2025
// software constants), at hand-computed points.
func TestDeclinationSD(t *testing.T) {
	tests := []struct {
		hnT, want float64
		source    string
	}{
		{20000, 0.3755, "5417/20000 = 0.27085; √(0.0676 + 0.07336) = 0.3755 (arithmetic)"},
		{5417, 1.0332, "5417/5417 = 1; √(0.0676 + 1) = 1.0332 (arithmetic)"},
		{1e9, 0.26, "strong field: the 0.26° floor"},
		{0, 180, "no horizontal field: capped at 180° as the WMM software does"},
	}
	for _, tc := range tests {
		if got := DeclinationSDDeg(tc.hnT); math.Abs(got-tc.want) > 5e-4 {
			t.Errorf("H = %v nT: %.4f°, want %.4f° (%s)", tc.hnT, got, tc.want, tc.source)
		}
	}
}
