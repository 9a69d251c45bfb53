package zone

import (
	"runtime"
	"testing"
	"time"
)

// BenchmarkLookup: one zone lookup after the boundary data is loaded.
func BenchmarkLookup(b *testing.B) {
	f := finder(b)
	if _, err := f.Lookup(0, 0); err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for i := 0; b.Loop(); i++ {
		if _, err := f.Lookup(40.7128+float64(i%100)*0.001, -74.0060); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkInit: loading the boundary data; reports the heap left in use after
// initialisation and the peak heap seen by the runtime (approximate: sampled).
func BenchmarkInit(b *testing.B) {
	for b.Loop() {
		runtime.GC()
		var m0, m1 runtime.MemStats
		runtime.ReadMemStats(&m0)
		f := NewFinder(nil)
		if _, err := f.Lookup(0, 0); err != nil {
			b.Fatal(err)
		}
		runtime.ReadMemStats(&m1)
		b.ReportMetric(float64(m1.HeapAlloc-m0.HeapAlloc)/(1<<20), "MB-retained")
		b.ReportMetric(float64(m1.TotalAlloc-m0.TotalAlloc)/(1<<20), "MB-allocated")
		b.ReportMetric(float64(m1.Sys)/(1<<20), "MB-sys")
		runtime.KeepAlive(f)
	}
}

// BenchmarkResolve: one wall time in a zone with daylight saving.
func BenchmarkResolve(b *testing.B) {
	loc, err := NewDB().Load("Europe/Berlin")
	if err != nil {
		b.Fatal(err)
	}
	w := Wall{Year: 2025, Month: time.March, Day: 30, Hour: 2, Minute: 30}
	for b.Loop() {
		if _, err := Resolve(w, loc); err != nil {
			b.Fatal(err)
		}
	}
}
