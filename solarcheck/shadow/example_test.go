package shadow_test

import (
	"fmt"

	"github.com/gnomon-forensics/gnomon/solarcheck/shadow"
)

func ExampleSunFromShadow() {
	// A 1.80 m post casts a 2.60 m shadow toward bearing 315° on level ground.
	sun, err := shadow.SunFromShadow(shadow.Shadow{Height: 1.80, Length: 2.60, BearingDeg: 315})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("azimuth %.1f°, altitude %.2f°\n", sun.AzimuthDeg, sun.AltitudeDeg)
	// Output: azimuth 135.0°, altitude 34.70°
}

func ExampleShadowFromSun() {
	// Sun at 40° altitude in the south-west; ground falls 10° toward the north-east.
	l, b, err := shadow.ShadowFromSun(shadow.Sun{AzimuthDeg: 225, AltitudeDeg: 40}, 1.0,
		shadow.Ground{SlopeDeg: 10, TowardDeg: 45})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("length %.3f along the ground, bearing %.0f°\n", l, b)
	// Output: length 1.532 along the ground, bearing 45°
}

func ExamplePropagate() {
	est, err := shadow.Propagate(
		shadow.Shadow{Height: 1.80, Length: 2.60, BearingDeg: 315},
		shadow.Uncertainty{HeightSD: 0.01, LengthSDPct: 5, BearingSDDeg: 2})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("azimuth %.1f ± %.1f°, altitude %.2f ± %.2f°\n",
		est.Sun.AzimuthDeg, est.AzimuthSDDeg, est.Sun.AltitudeDeg, est.AltitudeSDDeg)
	// Output: azimuth 135.0 ± 2.0°, altitude 34.70 ± 1.35°
}
