package light

import "testing"

func BenchmarkCheck(b *testing.B) {
	alt := 35.0
	in := Input{Exposure{FNumber: 8, ExposureTimeSec: 1.0 / 250, ISO: 100}, FlashNotFired, &alt}
	for b.Loop() {
		_ = Check(in, Options{})
	}
}
