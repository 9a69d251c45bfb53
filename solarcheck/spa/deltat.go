package spa

import (
	"time"
)

// DeltaT returns ΔT = TT − UT1 in seconds for an instant, from the
// polynomial expressions of F. Espenak and J. Meeus, "Five Millennium Canon
// of Solar Eclipses: −1999 to +3000" (NASA/TP-2006-214141), section 2.6,
// evaluated at y = year + (month − 0.5)/12 of t's proleptic Gregorian UTC date.
//
// The polynomials are fits to observations before 2005 and extrapolations
// after; the extrapolation overestimates today's ΔT by several seconds
// (it gives about 75 s for 2026), which moves the computed sun by under
// 0.0001°. Callers with a better value (IERS Bulletin A) should pass it
// to At instead.
func DeltaT(t time.Time) float64 {
	u := t.UTC()
	return DeltaTYear(float64(u.Year()) + (float64(u.Month())-0.5)/12)
}

// DeltaTYear is DeltaT for a decimal year y (astronomical numbering:
// year 0 = 1 BC).
func DeltaTYear(y float64) float64 {
	switch {
	case y < -500:
		u := (y - 1820) / 100
		return -20 + 32*u*u
	case y < 500:
		u := y / 100
		return poly(u, 10583.6, -1014.41, 33.78311, -5.952053, -0.1798452, 0.022174192, 0.0090316521)
	case y < 1600:
		u := (y - 1000) / 100
		return poly(u, 1574.2, -556.01, 71.23472, 0.319781, -0.8503463, -0.005050998, 0.0083572073)
	case y < 1700:
		t := y - 1600
		return poly(t, 120, -0.9808, -0.01532, 1.0/7129)
	case y < 1800:
		t := y - 1700
		return poly(t, 8.83, 0.1603, -0.0059285, 0.00013336, -1.0/1174000)
	case y < 1860:
		t := y - 1800
		return poly(t, 13.72, -0.332447, 0.0068612, 0.0041116, -0.00037436, 0.0000121272, -0.0000001699, 0.000000000875)
	case y < 1900:
		t := y - 1860
		return poly(t, 7.62, 0.5737, -0.251754, 0.01680668, -0.0004473624, 1.0/233174)
	case y < 1920:
		t := y - 1900
		return poly(t, -2.79, 1.494119, -0.0598939, 0.0061966, -0.000197)
	case y < 1941:
		t := y - 1920
		return poly(t, 21.20, 0.84493, -0.076100, 0.0020936)
	case y < 1961:
		t := y - 1950
		return poly(t, 29.07, 0.407, -1.0/233, 1.0/2547)
	case y < 1986:
		t := y - 1975
		return poly(t, 45.45, 1.067, -1.0/260, -1.0/718)
	case y < 2005:
		t := y - 2000
		return poly(t, 63.86, 0.3345, -0.060374, 0.0017275, 0.000651814, 0.00002373599)
	case y < 2050:
		t := y - 2000
		return poly(t, 62.92, 0.32217, 0.005589)
	case y < 2150:
		u := (y - 1820) / 100
		return -20 + 32*u*u - 0.5628*(2150-y)
	default:
		u := (y - 1820) / 100
		return -20 + 32*u*u
	}
}

// poly evaluates c[0] + c[1]·x + c[2]·x² + … by Horner's rule.
func poly(x float64, c ...float64) float64 {
	s := 0.0
	for i := len(c) - 1; i >= 0; i-- {
		s = s*x + c[i]
	}
	return s
}
