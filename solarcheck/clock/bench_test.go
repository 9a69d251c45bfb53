package clock

import (
	"fmt"
	"testing"
)

func BenchmarkFit(b *testing.B) {
	for _, n := range []int{30, 300, 10000} {
		pts := simulate(1, n, 60, 100, 1, 2)
		b.Run(fmt.Sprint(n), func(b *testing.B) {
			for b.Loop() {
				if _, err := Fit(pts, Options{}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
