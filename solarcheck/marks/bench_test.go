package marks

import "testing"

// BenchmarkSolve: one photo with three objects, a vertical edge, the
// horizon and a ground line, with the stated noise (the Monte Carlo's
// Draws refits dominate).
func BenchmarkSolve(b *testing.B) {
	_, scenes := loadScenes(b)
	in := scenes[1].input(combo{objects: 3, edge: true, horizon: true, ground: true}, noise{px: 1.5, focalFrac: 0.03, bearingDeg: 1})
	for b.Loop() {
		if _, err := Solve(in); err != nil {
			b.Fatal(err)
		}
	}
}
