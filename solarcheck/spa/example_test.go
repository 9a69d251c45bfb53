package spa_test

import (
	"fmt"
	"time"

	"github.com/gnomon-forensics/gnomon/solarcheck/spa"
)

// The example of SPA report Table A5.1.
func ExampleAt() {
	t := time.Date(2003, 10, 17, 12, 30, 30, 0, time.FixedZone("UTC-7", -7*3600))
	o := spa.Observer{LatDeg: 39.742476, LonDeg: -105.1786, ElevationM: 1830.14, PressureHPa: 820, TemperatureC: 11}
	p := spa.At(t, o, 67)
	fmt.Printf("zenith %.5f°, azimuth %.5f°, equation of time %.4f min\n", p.ZenithDeg, p.AzimuthDeg, p.EquationOfTimeMin)
	// Output: zenith 50.11162°, azimuth 194.34024°, equation of time 14.6415 min
}

// Compute the instant-only part once, then many observers cheaply.
func ExampleGeocentric_Topocentric() {
	t := time.Date(2024, 6, 20, 12, 0, 0, 0, time.UTC)
	g := spa.GeocentricAt(t, spa.DeltaT(t))
	for _, lat := range []float64{60, 0, -60} {
		p := g.Topocentric(spa.NewObserver(lat, 0, 0))
		fmt.Printf("lat %+3.0f: altitude %5.2f°, azimuth %6.2f°\n", lat, p.AltitudeDeg, p.AzimuthDeg)
	}
	// Output:
	// lat +60: altitude 53.45°, azimuth 179.34°
	// lat  +0: altitude 66.56°, azimuth   0.98°
	// lat -60: altitude  6.69°, azimuth   0.39°
}

func ExampleGeocentricAt() {
	t := time.Date(2024, 3, 20, 3, 6, 0, 0, time.UTC) // near the March equinox
	g := spa.GeocentricAt(t, 69)
	fmt.Printf("declination %.2f″, distance %.4f AU\n", g.DeclinationDeg*3600, g.EarthRadiusAU)
	// Output: declination -0.01″, distance 0.9959 AU
}

// Sunrise, solar noon and sunset of a local day: pass local midnight.
func ExampleDayAt() {
	zone := time.FixedZone("UTC+1", 3600)
	midnight := time.Date(2024, 6, 21, 0, 0, 0, 0, zone)
	d := spa.DayAt(midnight, spa.NewObserver(48.8566, 2.3522, 35), spa.DeltaT(midnight))
	hm := func(t time.Time) string { return t.In(zone).Round(time.Minute).Format("15:04") }
	fmt.Println("sunrise", hm(*d.Sunrise))
	fmt.Println("noon   ", hm(d.Transit))
	fmt.Println("sunset ", hm(*d.Sunset))
	fmt.Println("astronomical twilight:", d.AstroPolar)
	// Output:
	// sunrise 04:47
	// noon    12:53
	// sunset  20:58
	// astronomical twilight: always above
}

func ExampleDeltaT() {
	fmt.Printf("%.1f s\n", spa.DeltaT(time.Date(2000, 1, 1, 0, 0, 0, 0, time.UTC)))
	// Output: 63.9 s
}

func ExampleDeltaTYear() {
	fmt.Printf("%.0f s\n", spa.DeltaTYear(1000))
	// Output: 1574 s
}

// A date written in the Julian calendar (Meeus ch. 7, example 7.b).
func ExampleCalendarDate_JulianDay() {
	jd, err := spa.CalendarDate{Year: 333, Month: 1, Day: 27, Hour: 12, Calendar: spa.Julian}.JulianDay()
	fmt.Println(jd, err)
	// Output: 1.842713e+06 <nil>
}

// The instant of a Julian-calendar wall time, as a time.Time.
func ExampleCalendarDate_In() {
	t, err := spa.CalendarDate{Year: 1917, Month: 10, Day: 25, Hour: 21, Minute: 45, Calendar: spa.Julian}.In(time.UTC)
	fmt.Println(t, err)
	// Output: 1917-11-07 21:45:00 +0000 UTC <nil>
}

func ExampleCalendarDateOf() {
	t := time.Date(1582, 10, 15, 0, 0, 0, 0, time.UTC)
	fmt.Println(spa.CalendarDateOf(t.AddDate(0, 0, -1), spa.Reform))
	// Output: 1582-10-04T00:00:00 [julian]
}

func ExampleParseCalendar() {
	c, err := spa.ParseCalendar("julian")
	fmt.Println(c, err)
	// Output: julian <nil>
}

func ExampleJulianDay() {
	fmt.Println(spa.JulianDay(time.Date(2000, 1, 1, 12, 0, 0, 0, time.UTC)))
	// Output: 2.451545e+06
}

func ExampleTimeFromJulianDay() {
	fmt.Println(spa.TimeFromJulianDay(2451545))
	// Output: 2000-01-01 12:00:00 +0000 UTC
}

func ExampleApparentSolarTime() {
	// 10:00 UT at 15° E with the sun 3.5 min fast: 11:03:30 apparent.
	fmt.Println(spa.ApparentSolarTime(time.Date(2024, 5, 5, 10, 0, 0, 0, time.UTC), 15, 3.5))
	// Output: 11h3m30s
}

func ExampleRefraction() {
	fmt.Printf("%.4f°\n", spa.Refraction(10, spa.DefaultPressureHPa, spa.DefaultTemperatureC))
	// Output: 0.0904°
}

func ExampleNewObserver() {
	o := spa.NewObserver(51.4779, -0.0015, 46)
	fmt.Println(o.PressureHPa, o.TemperatureC)
	// Output: 1013.25 10
}
