package angle

import "testing"

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
