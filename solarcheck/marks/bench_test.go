package marks

import "testing"

func BenchmarkSolve(b *testing.B) {
	_, scenes := loadScenes(b)
	s := scenes[1]
	n := stated
	in := s.input(combo{objects: 3, edge: true, horizon: true, ground: true}, n)
	for b.Loop() {
		Solve(in)
	}
}
