package invert_test

import (
	"fmt"
	"time"

	"github.com/gnomon-forensics/gnomon/solarcheck/invert"
	"github.com/gnomon-forensics/gnomon/solarcheck/shadow"
	"github.com/gnomon-forensics/gnomon/solarcheck/spa"
)

// Time window from a shadow: a 1.20 m post in a courtyard (invented
// scenario) casts a 1.20 m shadow toward bearing 283.6° on level ground.
func ExampleWhen() {
	est, err := shadow.Propagate(shadow.Shadow{Height: 1.20, Length: 1.20, BearingDeg: 283.6},
		shadow.Uncertainty{HeightSD: 0.01, LengthSDPct: 5, BearingSDDeg: 2})
	if err != nil {
		fmt.Println(err)
		return
	}
	from := time.Date(2025, time.July, 14, 0, 0, 0, 0, time.UTC)
	to := from.Add(24*time.Hour - time.Second)
	res, err := invert.When(invert.Query{
		Observer:    spa.NewObserver(43.77, 11.25, 50),
		From:        from,
		To:          to,
		Measurement: invert.FromShadow(est),
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, w := range res.Windows {
		fmt.Printf("%s to %s, best %s, misfit %.2f (%d dof, p = %.2f)\n", w.Earliest.Format("15:04"), w.Latest.Format("15:04"), w.Best.Format("15:04"), w.Misfit, w.Dof, w.PValue)
	}
	// Output: 07:57 to 08:22, best 08:10, misfit 0.00 (1 dof, p = 0.98)
}

// Where from a measured sun direction at a known instant.
func ExampleWhere() {
	fixes, err := invert.Where(invert.WhereQuery{
		Time:         time.Date(2025, 7, 14, 8, 30, 0, 0, time.UTC),
		PressureHPa:  spa.DefaultPressureHPa,
		TemperatureC: spa.DefaultTemperatureC,
		Measurement: invert.Measurement{
			HasAzimuth: true, AzimuthDeg: 110, AzimuthSDDeg: 1,
			HasAltitude: true, AltitudeDeg: 45, AltitudeSDDeg: 0.5,
		},
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, f := range fixes {
		fmt.Printf("%.2f°, %.2f° ± %.0f km\n", f.LatDeg, f.LonDeg, f.RadiusKm)
	}
	// Output: 48.43°, 8.34° ± 234 km
}

// A shadow's propagated errors become a two-angle measurement.
func ExampleFromShadow() {
	est, _ := shadow.Propagate(shadow.Shadow{Height: 2, Length: 2, BearingDeg: 0},
		shadow.Uncertainty{LengthSDPct: 5, BearingSDDeg: 2})
	m := invert.FromShadow(est)
	fmt.Printf("azimuth %.1f ± %.1f°, altitude %.2f ± %.2f°, %d angles, goodness of fit on %d dof\n",
		m.AzimuthDeg, m.AzimuthSDDeg, m.AltitudeDeg, m.AltitudeSDDeg, m.Dof(), m.FitDof())
	// Output: azimuth 180.0 ± 2.0°, altitude 45.00 ± 1.43°, 2 angles, goodness of fit on 1 dof
}
