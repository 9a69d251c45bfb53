package geomag

import "testing"

// BenchmarkCompute: one full synthesis (field, rates, elements).
func BenchmarkCompute(b *testing.B) {
	for b.Loop() {
		if _, err := Compute(52.52, 13.405, 0.05, 2026.5); err != nil {
			b.Fatal(err)
		}
	}
}
