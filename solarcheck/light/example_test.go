package light_test

import (
	"fmt"

	"github.com/gnomon-forensics/gnomon/solarcheck/light"
)

func ExampleCheck() {
	sunAltDeg := -9.0 // the sun at the claimed moment
	in := light.Input{
		Exposure:       light.Exposure{FNumber: 11, ExposureTimeSec: 1.0 / 250, ISO: 100},
		Flash:          light.FlashNotFired,
		SunAltitudeDeg: &sunAltDeg,
	}
	r := light.Check(in, light.Options{})
	fmt.Println(r.Status, r.Band, "/", r.ImpliedBand)
	fmt.Println(r.Sentence)
	// Output:
	// disagree nautical twilight / daylight
	// Hint, not proof: the exposure (1/250 s at f/11, ISO 100: EV100 14.9) implies about 66000 lux, 18 stops above the brightest moonlit sky (about 0.30 lux; the sun at -9.0°, nautical twilight, gives about 0.12 lux); artificial light, a camera at the end of its exposure range, or a different time of day could explain it.
}

func ExampleEV100() {
	ev, _ := light.EV100(light.Exposure{FNumber: 8, ExposureTimeSec: 1.0 / 125, ISO: 100})
	fmt.Printf("EV100 %.2f\n", ev)
	// Output: EV100 12.97
}

func ExampleLuminance() {
	fmt.Printf("%.3f cd/m²\n", light.Luminance(0))
	// Output: 0.125 cd/m²
}

func ExampleImpliedLux() {
	fmt.Printf("%.0f lux\n", light.ImpliedLux(15))
	// Output: 71489 lux
}

func ExampleClearSkyLux() {
	for _, h := range []float64{60, 0, -6, -18} {
		fmt.Printf("%.0f°: %.4g lux\n", h, light.ClearSkyLux(h))
	}
	// Output:
	// 60°: 1.031e+05 lux
	// 0°: 758.6 lux
	// -6°: 3.412 lux
	// -18°: 0.0006447 lux
}

func ExampleBandOf() {
	fmt.Println(light.BandOf(-4))
	// Output: civil twilight
}
