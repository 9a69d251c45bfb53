package invert

import (
	"syscall"
	"testing"
	"time"

	"github.com/gnomon-forensics/gnomon/solarcheck/spa"
)

// benchQuery is a full calendar year at one place with a shadow-like
// measurement of both angles (one window on most days).
func benchQuery() Query {
	o := spa.NewObserver(48.85, 2.35, 35)
	tt := time.Date(2024, 6, 3, 9, 17, 0, 0, time.UTC)
	p := spa.At(tt, o, spa.DeltaT(tt))
	return Query{
		Observer: o,
		From:     time.Date(2024, 1, 1, 0, 0, 0, 0, time.UTC),
		To:       time.Date(2024, 12, 31, 23, 59, 59, 0, time.UTC),
		Measurement: Measurement{HasAzimuth: true, AzimuthDeg: p.AzimuthDeg, AzimuthSDDeg: 1,
			HasAltitude: true, AltitudeDeg: p.AltitudeDeg, AltitudeSDDeg: 1},
	}
}

// cpuTime returns the process's user+system CPU time. The benchmarks
// report it per operation ("cpu-ms/op") beside the wall time, because the
// machine is shared: wall time measures the load as much as the code.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

func reportCPU(b *testing.B, start time.Duration) {
	b.ReportMetric(float64(cpuTime()-start)/float64(time.Millisecond)/float64(b.N), "cpu-ms/op")
}

// BenchmarkWhenFullYear: one place, one calendar year, azimuth and altitude.
func BenchmarkWhenFullYear(b *testing.B) {
	q := benchQuery()
	c0 := cpuTime()
	for b.Loop() {
		if _, err := When(q); err != nil {
			b.Fatal(err)
		}
	}
	reportCPU(b, c0)
}

// BenchmarkWhenFullYearAltitudeOnly: two windows a day.
func BenchmarkWhenFullYearAltitudeOnly(b *testing.B) {
	q := benchQuery()
	q.Measurement.HasAzimuth = false
	c0 := cpuTime()
	for b.Loop() {
		if _, err := When(q); err != nil {
			b.Fatal(err)
		}
	}
	reportCPU(b, c0)
}

// BenchmarkWhenBruteForceDay is the naive alternative for comparison: full
// spa.At every minute of one day. Multiply by 366 for a year.
func BenchmarkWhenBruteForceDay(b *testing.B) {
	q := benchQuery()
	m := q.Measurement
	t0 := time.Date(2024, 6, 3, 0, 0, 0, 0, time.UTC)
	dt := spa.DeltaT(t0)
	c0 := cpuTime()
	for b.Loop() {
		for i := 0; i < 1440; i++ {
			p := spa.At(t0.Add(time.Duration(i)*time.Minute), q.Observer, dt)
			_ = m.chi2(p.AzimuthDeg, p.AltitudeDeg)
		}
	}
	reportCPU(b, c0)
}
