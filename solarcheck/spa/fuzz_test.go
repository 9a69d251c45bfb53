package spa

import (
	"math"
	"testing"
	"time"
)

// FuzzCalendarRoundTrip: any valid date in any calendar converts to an
// instant and back to the same fields, and its Julian Day agrees with the
// instant's.
func FuzzCalendarRoundTrip(f *testing.F) {
	f.Add(1582, 10, 4, 12, 2)
	f.Add(-4712, 1, 1, 0, 0)
	f.Add(2000, 2, 29, 23, 1)
	f.Fuzz(func(t *testing.T, y, m, d, h, c int) {
		cd := CalendarDate{Year: y%10000 - 3000, Month: m, Day: d, Hour: h, Calendar: Calendar(((c % 3) + 3) % 3)}
		jd, err := cd.JulianDay()
		if err != nil {
			return
		}
		tm, err := cd.In(time.UTC)
		if err != nil {
			t.Fatalf("%v: JulianDay ok but In failed: %v", cd, err)
		}
		if j := JulianDay(tm); math.Abs(j-jd) > 1e-6 {
			t.Fatalf("%v: JD %v, instant %v has JD %v", cd, jd, tm, j)
		}
		back := CalendarDateOf(tm, cd.Calendar)
		if back.Year != cd.Year || back.Month != cd.Month || back.Day != cd.Day || back.Hour != cd.Hour {
			t.Fatalf("%v -> %v -> %v", cd, tm, back)
		}
	})
}

// FuzzAt: any instant in SPA's range and any place give finite angles in
// their ranges.
func FuzzAt(f *testing.F) {
	f.Add(int64(0), 0.0, 0.0, 0.0)
	f.Add(int64(1066000000), 89.999, -179.9, 8848.0)
	f.Fuzz(func(t *testing.T, sec int64, lat, lon, elev float64) {
		if math.IsNaN(lat) || math.IsNaN(lon) || math.IsNaN(elev) || math.Abs(lat) > 90 || math.Abs(lon) > 180 || math.Abs(elev) > 1e4 {
			return
		}
		const span = 4000 * 365 * 86400 // ±4000 years around 1970 stays within −2000..6000
		tm := time.Unix(sec%span, 0)
		p := At(tm, NewObserver(lat, lon, elev), DeltaT(tm))
		if !(p.AzimuthDeg >= 0 && p.AzimuthDeg < 360) || !(math.Abs(p.AltitudeAirlessDeg) <= 90) ||
			!(math.Abs(p.DeclinationDeg) < 24.3) || math.IsNaN(p.AltitudeDeg) || math.Abs(p.EquationOfTimeMin) > 20 {
			t.Fatalf("%v lat %g lon %g: %+v", tm, lat, lon, p)
		}
	})
}
