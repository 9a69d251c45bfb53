package geomag_test

import (
	"fmt"
	"time"

	"github.com/gnomon-forensics/gnomon/solarcheck/geomag"
)

func ExampleCompute() {
	// First official WMM2025 test point: 80°N 0°E, sea level, 2025.0.
	f, err := geomag.Compute(80, 0, 0, 2025.0)
	if err != nil {
		panic(err)
	}
	fmt.Printf("D %.2f° I %.2f° F %.1f nT\n", f.Main.DeclinationDeg, f.Main.InclinationDeg, f.Main.FnT)
	// Output: D 1.28° I 83.21° F 55178.5 nT
}

func ExampleAt() {
	_, err := geomag.At(48.0, 11.0, 0.5, time.Date(2031, 5, 1, 0, 0, 0, 0, time.UTC))
	fmt.Println(err)
	// Output: geomag: date 2031.329 is outside WMM2025 (valid 2025.0 to 2030.0): give an explicit declination for this row
}

func ExampleDecimalYear() {
	fmt.Println(geomag.DecimalYear(time.Date(2027, 7, 2, 12, 0, 0, 0, time.UTC)))
	// Output: 2027.5
}

func ExampleMagneticToTrue() {
	// A compass bearing of 350° where the declination is 12.5° east.
	fmt.Println(geomag.MagneticToTrue(350, 12.5))
	// Output: 2.5
}

func ExampleGridToTrue() {
	gamma, zone, _ := geomag.Convergence(40.7128, -74.0060) // New York, UTM zone 18
	fmt.Printf("zone %d, γ %.3f°, grid 90° is true %.3f°\n", zone, gamma, geomag.GridToTrue(90, gamma))
	// Output: zone 18, γ 0.648°, grid 90° is true 90.648°
}

func ExampleUTMZone() {
	zone, cm, _ := geomag.UTMZone(60.3913, 5.3221) // Bergen: the 32V exception
	fmt.Println(zone, cm)
	// Output: 32 9
}

func ExampleConvergence() {
	gamma, zone, _ := geomag.Convergence(52.52, 13.405) // Berlin, west of 15°E
	fmt.Printf("%d %.3f\n", zone, gamma)
	// Output: 33 -1.266
}

func ExampleConvergenceFrom() {
	// Convergence in a non-UTM transverse Mercator with central meridian 12°E.
	// PROJ 9.1.1 (+proj=tmerc +lon_0=12, WGS84) gives 1.11504°.
	fmt.Printf("%.3f\n", geomag.ConvergenceFrom(52.52, 13.405, 12))
	// Output: 1.115
}
