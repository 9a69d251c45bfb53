package angle

import (
	"math"
	"testing"
)

// The ranges are the conventions of the trade (azimuth 0–360° clockwise
// from north; differences in −180..180°): common knowledge.
func TestRanges(t *testing.T) {
	cases := []struct {
		in, n360, w180 float64
	}{
		{0, 0, 0},
		{360, 0, 0},
		{-90, 270, -90},
		{450, 90, 90},
		{180, 180, -180},
		{-180, 180, -180},
		{179.5, 179.5, 179.5},
		{-1e-17, 0, 0}, // below the resolution of a sum with 180
		{725, 5, 5},
	}
	for _, c := range cases {
		if got := Norm360(c.in); got != c.n360 {
			t.Errorf("Norm360(%v) = %v, want %v", c.in, got, c.n360)
		}
		if got := Wrap180(c.in); got != c.w180 {
			t.Errorf("Wrap180(%v) = %v, want %v", c.in, got, c.w180)
		}
	}
}

// TestRadDeg: 180° = π rad by definition of the radian; a right angle is
// π/2, and one radian is 57.29577951308232° (180/π, common knowledge).
func TestRadDeg(t *testing.T) {
	cases := []struct {
		source   string
		deg, rad float64
	}{
		{"definition", 180, math.Pi},
		{"definition", 90, math.Pi / 2},
		{"definition", -45, -math.Pi / 4},
		{"definition", 0, 0},
		{"common knowledge: 1 rad = 57.29577951308232°", 57.29577951308232, 1},
	}
	for _, c := range cases {
		if got := Rad(c.deg); math.Abs(got-c.rad) > 1e-15*math.Max(1, math.Abs(c.rad)) {
			t.Errorf("%s: Rad(%v) = %v, want %v", c.source, c.deg, got, c.rad)
		}
		if got := Deg(c.rad); math.Abs(got-c.deg) > 1e-13*math.Max(1, math.Abs(c.deg)) {
			t.Errorf("%s: Deg(%v) = %v, want %v", c.source, c.rad, got, c.deg)
		}
	}
}
