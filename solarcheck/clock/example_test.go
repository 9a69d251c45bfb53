package clock_test

import (
	"fmt"
	"time"

	"github.com/gnomon-forensics/gnomon/solarcheck/clock"
)

func ExampleFit() {
	start := time.Date(2026, 5, 1, 8, 0, 0, 0, time.UTC)
	var pts []clock.Point
	for i := 0; i < 10; i++ {
		days := float64(i) * 2
		name := fmt.Sprintf("DSC_%04d.JPG", 100+i)
		pts = append(pts, clock.Point{
			Key:            name,
			FileName:       name,
			Reading:        start.Add(time.Duration(days * 24 * float64(time.Hour))),
			HasEvidence:    i%2 == 0, // shadows measured on every other photo
			OffsetSec:      300 + 1.5*days,
			HalfWidth95Sec: 4,
		})
	}
	m, err := clock.Fit(pts, clock.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	s := m.Segments[0]
	fmt.Printf("drift %.2f s/day (%.1f ppm), offset %.0f s at %s\n", s.DriftSecPerDay, s.DriftPPM(), s.OffsetSec, s.T0.Format(time.DateOnly))
	p := m.Photos[3] // no evidence of its own
	fmt.Printf("%s: read %s, corrected %s ± %.0f s\n", p.Key, pts[3].Reading.Format(time.TimeOnly), p.Corrected.Format(time.TimeOnly), p.HalfWidth95.Seconds())
	// Output:
	// drift 1.50 s/day (17.4 ppm), offset 312 s at 2026-05-09
	// DSC_0103.JPG: read 08:00:00, corrected 07:54:51 ± 2 s
}

func ExampleTheilSen() {
	l, _ := clock.TheilSen([]float64{0, 1, 2, 3, 4}, []float64{1, 3, 5, 7, 100})
	fmt.Println(l.Slope, l.Intercept)
	// Output: 2 1
}

func ExampleCameraID() {
	fmt.Println(clock.CameraID("NIKON CORPORATION", "NIKON D750 ", ""))
	// Output: nikon corporation|nikon d750
}

func ExampleFileNumber() {
	fmt.Println(clock.FileNumber("DCIM/100NIKON/DSC_0042.NEF"))
	// Output: 42 4 true
}
