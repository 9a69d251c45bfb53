// Package geomag computes the Earth's main magnetic field with the World Magnetic
// Model 2025 (WMM2025, NOAA NCEI and British Geological Survey), and converts
// magnetic and grid bearings to true bearings.
//
// The synthesis follows section 1.2 of the technical report "The US/UK World
// Magnetic Model for 2025–2030": geodetic (WGS84) coordinates are turned into
// geocentric spherical ones, Schmidt semi-normalised associated Legendre functions
// and the time-adjusted Gauss coefficients give the field in geocentric components,
// which are rotated to the geodetic frame and reduced to the seven elements X, Y,
// Z, H, F, I, D (and GV near the poles), with their yearly rates.
//
// Equation numbers beside each step follow section 1.2 of the WMM technical report
// as remembered from its 2020 edition; they could not be checked against the 2025
// report here, and NOAA's own C library cites an older
// edition's numbers in its comments (Eqs. 17–18 for the coordinate conversion, Eq. 19
// for the time adjustment). Check them before quoting them. The method itself is
// checked: the coefficients are generated from NOAA's WMM.COF values (see
// coeffs_gen.go) and the result reproduces all twelve
// official test values (see the tests).
//
// Limits, stated so that no finding leans on more than the model gives:
//   - Valid from 2025.0 to 2030.0 and from 1 km below to 850 km above the WGS84
//     ellipsoid. Outside, Compute returns an *OutOfRangeError: the caller must supply
//     an explicit declination instead.
//   - WMM describes the core field only. Crustal anomalies, and steel or electrics
//     near a compass, can deflect a needle by degrees; the model's own global error
//     is a fraction of a degree in declination at mid latitudes and grows where H is
//     weak. Compute reports a CompassZone ("caution" below 6000 nT of H, "blackout"
//     below 2000 nT, the zones defined in the WMM2025 report) where a compass is
//     unreliable.
//   - At the geographic poles declination is undefined; latitudes within 1e-9° of
//     ±90° are moved to that distance.
//
// Bearings: MagneticToTrue (true = magnetic + D, D east positive) and GridToTrue
// (true = grid + γ, γ the bearing of grid north clockwise from true north). γ is the
// meridian convergence of the UTM grid on the WGS84 ellipsoid (Convergence), in the
// standard 6° zones with the Norway (32V) and Svalbard (31X–37X) exceptions, between
// 80°S and 84°N; the polar (UPS) grids are not handled. A grid bearing taken from a
// map in another transverse Mercator grid (a national grid) needs that grid's own
// central meridian: ConvergenceFrom.
package geomag

//go:generate go run ./internal/gen

import (
	"errors"
	"fmt"
	"math"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/angle"
)

// coefficient is one row of the model: degree, order, g, h (nT at the epoch) and
// their rates (nT/yr).
type coefficient struct {
	n, m         int
	g, h, dg, dh float64
}

const (
	maxDegree = 12
	epoch     = 2025.0 // model epoch, decimal year
	validFrom = 2025.0
	validTo   = 2030.0

	// WGS84 ellipsoid (semi-major axis in km, flattening) and the model's reference
	// radius, as given in the WMM technical report.
	wgs84A      = 6378.137
	wgs84InvF   = 298.257223563
	refRadiusKm = 6371.2

	minHeightKm = -1.0
	maxHeightKm = 850.0
)

// ErrOutsideModel is matched (errors.Is) by every *OutOfRangeError.
var ErrOutsideModel = errors.New("outside the World Magnetic Model's validity")

// OutOfRangeError reports a date, height or position the model does not cover.
type OutOfRangeError struct {
	What  string  // "date", "height", "latitude" or "longitude"
	Value float64 // decimal year, km or degrees
}

func (e *OutOfRangeError) Error() string {
	switch e.What {
	case "date":
		return fmt.Sprintf("geomag: date %.3f is outside WMM2025 (valid %.1f to %.1f): give an explicit declination for this row", e.Value, validFrom, validTo)
	case "height":
		return fmt.Sprintf("geomag: height %.3f km is outside WMM2025 (valid %.0f to %.0f km above the WGS84 ellipsoid): give an explicit declination for this row", e.Value, minHeightKm, maxHeightKm)
	}
	return fmt.Sprintf("geomag: %s %v out of range", e.What, e.Value)
}

func (e *OutOfRangeError) Is(target error) bool { return target == ErrOutsideModel }

// Elements are the magnetic field elements at a place (or their rates per year).
type Elements struct {
	XnT float64 // north component, nT
	YnT float64 // east component, nT
	ZnT float64 // vertical component, down positive, nT
	HnT float64 // horizontal intensity, nT
	FnT float64 // total intensity, nT

	InclinationDeg float64 // I, down positive
	DeclinationDeg float64 // D, east of true north positive
	// GridVariationDeg (GV) is defined only poleward of 55° latitude (NaN elsewhere):
	// the angle between grid north of the polar stereographic grid and magnetic north.
	GridVariationDeg float64
}

// Field is the model's answer at one place and time.
type Field struct {
	Main        Elements // values
	PerYear     Elements // secular variation: the same elements per year
	DecimalYear float64
	// CompassZone is "", "caution" (H < 6000 nT) or "blackout" (H < 2000 nT).
	CompassZone string
	Model       string // "WMM2025"
}

// DecimalYear returns t (converted to UTC) as a decimal year: the year plus the
// elapsed fraction of it.
func DecimalYear(t time.Time) float64 {
	t = t.UTC()
	y := t.Year()
	start := time.Date(y, 1, 1, 0, 0, 0, 0, time.UTC)
	end := time.Date(y+1, 1, 1, 0, 0, 0, 0, time.UTC)
	return float64(y) + float64(t.Sub(start))/float64(end.Sub(start))
}

// At is Compute at a time instead of a decimal year.
func At(latDeg, lonDeg, heightKm float64, t time.Time) (Field, error) {
	return Compute(latDeg, lonDeg, heightKm, DecimalYear(t))
}

// Compute evaluates WMM2025 at geodetic latitude and longitude (degrees, north and
// east positive), height above the WGS84 ellipsoid (km) and decimal year.
func Compute(latDeg, lonDeg, heightKm, decimalYear float64) (Field, error) {
	switch {
	case math.IsNaN(decimalYear) || decimalYear < validFrom || decimalYear > validTo:
		return Field{}, &OutOfRangeError{What: "date", Value: decimalYear}
	case math.IsNaN(heightKm) || heightKm < minHeightKm || heightKm > maxHeightKm:
		return Field{}, &OutOfRangeError{What: "height", Value: heightKm}
	case math.IsNaN(latDeg) || latDeg < -90 || latDeg > 90:
		return Field{}, &OutOfRangeError{What: "latitude", Value: latDeg}
	case math.IsNaN(lonDeg) || math.IsInf(lonDeg, 0):
		return Field{}, &OutOfRangeError{What: "longitude", Value: lonDeg}
	}
	const poleGuard = 90 - 1e-9
	latDeg = math.Max(-poleGuard, math.Min(poleGuard, latDeg))

	phi := angle.Rad(latDeg)
	lambda := angle.Rad(lonDeg)

	// Eq. (7) [step 1]: geodetic to geocentric spherical coordinates on WGS84.
	// Rc is the radius of curvature in the prime vertical.
	f := 1 / wgs84InvF
	e2 := f * (2 - f)
	sinPhi, cosPhi := math.Sincos(phi)
	rc := wgs84A / math.Sqrt(1-e2*sinPhi*sinPhi)
	p := (rc + heightKm) * cosPhi
	z := (rc*(1-e2) + heightKm) * sinPhi
	r := math.Hypot(p, z)
	phiC := math.Asin(z / r) // geocentric latitude φ'

	// Eqs. (4)–(6) [step 2]: Schmidt semi-normalised associated Legendre functions
	// P̆(n,m) of sin φ' and their derivatives with respect to φ'.
	P, dP := legendre(phiC)

	// Eq. (9) [step 3]: Gauss coefficients at the requested time,
	// g(t) = g(t0) + (t − t0)·ġ(t0), likewise h.
	dt := decimalYear - epoch

	// Eqs. (10)–(12) [step 4]: field in geocentric components X', Y', Z' from the
	// gradient of the potential, Eq. (2); Eqs. (13)–(15): their secular variation
	// (the same sums over ġ, ḣ).
	var xc, yc, zc, xcDot, ycDot, zcDot float64
	cosPhiC := math.Cos(phiC)
	ar := refRadiusKm / r
	for _, c := range wmm2025Coefficients {
		n, m := c.n, c.m
		g := c.g + dt*c.dg
		h := c.h + dt*c.dh
		sinML, cosML := math.Sincos(float64(m) * lambda)
		k := math.Pow(ar, float64(n+2))
		gc := g*cosML + h*sinML
		gs := g*sinML - h*cosML
		dgc := c.dg*cosML + c.dh*sinML
		dgs := c.dg*sinML - c.dh*cosML
		xc += k * gc * dP[n][m]
		yc += k * float64(m) * gs * P[n][m]
		zc -= k * float64(n+1) * gc * P[n][m]
		xcDot += k * dgc * dP[n][m]
		ycDot += k * float64(m) * dgs * P[n][m]
		zcDot -= k * float64(n+1) * dgc * P[n][m]
	}
	// X' = −(1/r)·∂V/∂φ' (north), Y' = −(1/(r cos φ'))·∂V/∂λ (east),
	// Z' = ∂V/∂r (down): the sums above carry the signs of Y' and Z'; X' takes its
	// minus sign here.
	xc, xcDot = -xc, -xcDot
	yc /= cosPhiC
	ycDot /= cosPhiC

	// Eq. (17) [step 5]: rotate from geocentric to geodetic (ellipsoidal) frame;
	// Eq. (18) likewise for the rates.
	psi := phiC - phi
	sinPsi, cosPsi := math.Sincos(psi)
	x := xc*cosPsi - zc*sinPsi
	zz := xc*sinPsi + zc*cosPsi
	xDot := xcDot*cosPsi - zcDot*sinPsi
	zDot := xcDot*sinPsi + zcDot*cosPsi
	y, yDot := yc, ycDot

	// Eq. (19) [step 6]: the field elements H, F, I, D.
	hh := math.Hypot(x, y)
	ff := math.Hypot(hh, zz)
	main := Elements{
		XnT: x, YnT: y, ZnT: zz, HnT: hh, FnT: ff,
		InclinationDeg: angle.Deg(math.Atan2(zz, hh)),
		DeclinationDeg: angle.Deg(math.Atan2(y, x)),
	}
	// Rates of H, F, I, D from those of X, Y, Z (the report's secular-variation
	// formulas that follow Eq. (19)): Ḣ = (XẊ+YẎ)/H, Ḟ = (XẊ+YẎ+ZŻ)/F,
	// İ = (HŻ−ZḢ)/F², Ḋ = (XẎ−YẊ)/H².
	hDot := (x*xDot + y*yDot) / hh
	rate := Elements{
		XnT: xDot, YnT: yDot, ZnT: zDot, HnT: hDot,
		FnT:            (x*xDot + y*yDot + zz*zDot) / ff,
		InclinationDeg: angle.Deg((hh*zDot - zz*hDot) / (ff * ff)),
		DeclinationDeg: angle.Deg((x*yDot - y*xDot) / (hh * hh)),
	}
	// Grid variation, as the report defines it: GV = D − λ north of
	// 55°N, D + λ south of 55°S, reduced to (−180°, 180°]; its rate is D's.
	main.GridVariationDeg, rate.GridVariationDeg = math.NaN(), math.NaN()
	switch {
	case latDeg > 55:
		main.GridVariationDeg = wrap180(main.DeclinationDeg - lonDeg)
		rate.GridVariationDeg = rate.DeclinationDeg
	case latDeg < -55:
		main.GridVariationDeg = wrap180(main.DeclinationDeg + lonDeg)
		rate.GridVariationDeg = rate.DeclinationDeg
	}

	out := Field{Main: main, PerYear: rate, DecimalYear: decimalYear, Model: "WMM2025"}
	switch {
	case hh < 2000:
		out.CompassZone = "blackout"
	case hh < 6000:
		out.CompassZone = "caution"
	}
	return out, nil
}

// legendre returns the Schmidt semi-normalised associated Legendre functions
// P̆(n,m)(sin φ') (Eqs. (4)–(6): P̆ = sqrt(2(n−m)!/(n+m)!)·P for m > 0, P for m = 0,
// without the Condon–Shortley phase) and their derivatives with respect to the
// geocentric latitude φ', for n ≤ 12. Computed by the standard recurrences in the
// colatitude θ = 90° − φ' (so that d/dφ' = −d/dθ):
//
//	P̆(n,n) = sqrt((2n−1)/(2n))·sin θ·P̆(n−1,n−1)                  (n ≥ 2; P̆(1,1) = sin θ)
//	P̆(n,m) = [(2n−1)·cos θ·P̆(n−1,m) − sqrt((n−1)²−m²)·P̆(n−2,m)] / sqrt(n²−m²)
func legendre(phiC float64) (P, dP [maxDegree + 1][maxDegree + 1]float64) {
	cosT, sinT := math.Sincos(phiC)              // cos θ = sin φ', sin θ = cos φ'
	var dT [maxDegree + 1][maxDegree + 1]float64 // d/dθ
	P[0][0] = 1
	for n := 1; n <= maxDegree; n++ {
		// Diagonal.
		if n == 1 {
			P[1][1] = sinT
			dT[1][1] = cosT
		} else {
			k := math.Sqrt(float64(2*n-1) / float64(2*n))
			P[n][n] = k * sinT * P[n-1][n-1]
			dT[n][n] = k * (cosT*P[n-1][n-1] + sinT*dT[n-1][n-1])
		}
		// Below the diagonal.
		for m := 0; m < n; m++ {
			a := float64(2*n - 1)
			b := 0.0
			var p2, d2 float64
			if n-2 >= m {
				b = math.Sqrt(float64((n-1)*(n-1) - m*m))
				p2, d2 = P[n-2][m], dT[n-2][m]
			}
			den := math.Sqrt(float64(n*n - m*m))
			P[n][m] = (a*cosT*P[n-1][m] - b*p2) / den
			dT[n][m] = (a*(cosT*dT[n-1][m]-sinT*P[n-1][m]) - b*d2) / den
		}
	}
	for n := range dT {
		for m := range dT[n] {
			dP[n][m] = -dT[n][m]
		}
	}
	return P, dP
}

// wrap180 reduces an angle to (−180°, 180°].
func wrap180(a float64) float64 {
	a = math.Mod(a, 360)
	switch {
	case a > 180:
		a -= 360
	case a <= -180:
		a += 360
	}
	return a
}
