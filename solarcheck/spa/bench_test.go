package spa

import (
	"testing"
	"time"
)

var sinkPos Position

// BenchmarkAt is one full SPA evaluation (instant part and observer part).
func BenchmarkAt(b *testing.B) {
	t := spaExampleTime
	for i := 0; i < b.N; i++ {
		sinkPos = At(t.Add(time.Duration(i)*time.Second), spaExampleObs, spaExampleDeltaT)
	}
}

// BenchmarkTopocentric is the observer part only (Eq. 32–46).
func BenchmarkTopocentric(b *testing.B) {
	g := GeocentricAt(spaExampleTime, spaExampleDeltaT)
	o := spaExampleObs
	for i := 0; i < b.N; i++ {
		o.LonDeg = -105 + float64(i%100)*0.01
		sinkPos = g.Topocentric(o)
	}
}

// BenchmarkDayAt is one day's transit, rise/set and three twilights.
func BenchmarkDayAt(b *testing.B) {
	day := time.Date(2003, 10, 17, 0, 0, 0, 0, time.UTC)
	for i := 0; i < b.N; i++ {
		_ = DayAt(day, spaExampleObs, spaExampleDeltaT)
	}
}
