package invert

import (
	"github.com/gnomon-forensics/gnomon/internal/angle"
	"math"
	"time"

	"github.com/gnomon-forensics/gnomon/solarcheck/spa"
)

// nodeStep is the spacing of the spa.GeocentricAt nodes. The instant-only
// quantities vary with periods of days or longer (the shortest nutation
// terms in SPA's Table A4.3 have periods near 5.6 days and amplitudes of
// milli-arcseconds), so a cubic through 12-hourly nodes is exact to well
// below 1e-5° (TestEphemMatchesSPA compares it with spa.At).
const nodeStep = 12 * time.Hour

// siderealRateDeg is the rate of mean sidereal time in degrees per day of
// UT, from SPA Eq. 28; the remainder of Eq. 28–29 varies slowly and is
// interpolated.
const siderealRateDeg = 360.98564736629

const j2000 = 2451545.0

// ephem interpolates spa.Geocentric between nodes. Times are seconds since
// start (t0).
type ephem struct {
	t0     time.Time
	jd0    float64 // Julian Day of t0
	first  float64 // seconds from t0 to node 0 (negative: margin)
	stepS  float64
	ra     []float64 // right ascension, unwrapped, degrees
	dec    []float64
	sidRes []float64 // sidereal time minus siderealRateDeg·(JD − J2000), unwrapped
	radius []float64
	eot    []float64
	dt     []float64 // ΔT used at the node
}

// newEphem builds nodes covering [t0, t0+spanS] with two nodes of margin on
// each side.
func newEphem(t0 time.Time, spanS float64, deltaT func(time.Time) float64) *ephem {
	step := nodeStep.Seconds()
	n := int(math.Ceil(spanS/step)) + 5
	e := &ephem{t0: t0, jd0: spa.JulianDay(t0), first: -2 * step, stepS: step,
		ra: make([]float64, n), dec: make([]float64, n), sidRes: make([]float64, n),
		radius: make([]float64, n), eot: make([]float64, n), dt: make([]float64, n)}
	for i := 0; i < n; i++ {
		s := e.first + float64(i)*step
		t := t0.Add(time.Duration(s * 1e9))
		d := deltaT(t)
		g := spa.GeocentricAt(t, d)
		e.ra[i] = g.RightAscensionDeg
		e.dec[i] = g.DeclinationDeg
		e.sidRes[i] = g.SiderealDeg - siderealRateDeg*(g.JD-j2000)
		e.radius[i] = g.EarthRadiusAU
		e.eot[i] = g.EquationOfTimeMin
		e.dt[i] = d
		if i > 0 { // unwrap so that the cubic sees continuous curves
			e.ra[i] = unwrapNear(e.ra[i], e.ra[i-1])
			e.sidRes[i] = unwrapNear(e.sidRes[i], e.sidRes[i-1])
		}
	}
	return e
}

// unwrapNear returns a + 360·k closest to ref.
func unwrapNear(a, ref float64) float64 {
	return a - 360*math.Round((a-ref)/360)
}

// weights returns the node index i and the 4-point Lagrange weights for
// nodes i−1, i, i+1, i+2 at time s (seconds since t0).
func (e *ephem) weights(s float64) (int, [4]float64) {
	u := (s - e.first) / e.stepS
	i := int(math.Floor(u))
	if i < 1 {
		i = 1
	}
	if i > len(e.ra)-3 {
		i = len(e.ra) - 3
	}
	x := u - float64(i)
	return i, [4]float64{
		-x * (x - 1) * (x - 2) / 6,
		(x + 1) * (x - 1) * (x - 2) / 2,
		-(x + 1) * x * (x - 2) / 2,
		(x + 1) * x * (x - 1) / 6,
	}
}

func interp(v []float64, i int, w [4]float64) float64 {
	return w[0]*v[i-1] + w[1]*v[i] + w[2]*v[i+1] + w[3]*v[i+2]
}

// raDecHA returns the interpolated right ascension, declination and the
// Greenwich apparent sidereal time (degrees, sidereal not normalised).
func (e *ephem) raDecSid(s float64) (raDeg, decDeg, sidDeg float64) {
	i, w := e.weights(s)
	jd := e.jd0 + s/86400
	return interp(e.ra, i, w), interp(e.dec, i, w), siderealRateDeg*(jd-j2000) + interp(e.sidRes, i, w)
}

// geocentric returns the interpolated spa.Geocentric at s with the fields
// that Geocentric.Topocentric reads (time, JD, ΔT, RA, Dec, sidereal time,
// Earth–Sun distance, equation of time).
func (e *ephem) geocentric(s float64) spa.Geocentric {
	i, w := e.weights(s)
	jd := e.jd0 + s/86400
	dt := interp(e.dt, i, w)
	return spa.Geocentric{
		Time:              e.t0.Add(time.Duration(math.Round(s * 1e9))).UTC(),
		JD:                jd,
		JDE:               jd + dt/86400,
		DeltaTSec:         dt,
		RightAscensionDeg: angle.Norm360(interp(e.ra, i, w)),
		DeclinationDeg:    interp(e.dec, i, w),
		SiderealDeg:       angle.Norm360(siderealRateDeg*(jd-j2000) + interp(e.sidRes, i, w)),
		EarthRadiusAU:     interp(e.radius, i, w),
		EquationOfTimeMin: interp(e.eot, i, w),
	}
}
