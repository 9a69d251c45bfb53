package spa

import (
	"math"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/angle"
)

// nodeStep is the spacing of the GeocentricAt nodes. The instant-only
// quantities vary with periods of days or longer (the shortest nutation
// terms in SPA's Table A4.3 have periods near 5.6 days and amplitudes of
// milli-arcseconds), so a cubic through 12-hourly nodes is exact to well
// below 1e-5° (TestEphemerisMatchesAt compares it with At).
const nodeStep = 12 * time.Hour

// SiderealRateDegPerDay is the rate of mean sidereal time in degrees per day of
// UT, the coefficient of (JD − 2451545) in SPA Eq. 28; the remainder of
// Eq. 28–29 varies slowly and is interpolated.
const SiderealRateDegPerDay = 360.98564736629

// Ephemeris interpolates the instant-only part of the SPA (Geocentric)
// between nodes computed every 12 hours, by 4-point Lagrange interpolation of
// right ascension, declination, the slowly varying part of sidereal time,
// the Earth–Sun distance and the equation of time. Searches and charts that
// need the sun at thousands of instants use it with Geocentric.Topocentric:
// one full evaluation per node instead of one per instant. Times are given
// as seconds since Start(), so that a search can step in float64.
type Ephemeris struct {
	t0     time.Time
	jd0    float64 // Julian Day of t0
	first  float64 // seconds from t0 to node 0 (negative: margin)
	stepS  float64
	ra     []float64 // right ascension, unwrapped, degrees
	dec    []float64
	sidRes []float64 // sidereal time minus SiderealRateDegPerDay·(JD − J2000), unwrapped
	radius []float64
	eot    []float64
	dt     []float64 // ΔT used at the node
}

// NewEphemeris builds nodes covering [t0, t0+spanS] (seconds) with two
// nodes of margin on each side; deltaT gives ΔT for an instant (DeltaT for
// the default model).
func NewEphemeris(t0 time.Time, spanS float64, deltaT func(time.Time) float64) *Ephemeris {
	step := nodeStep.Seconds()
	n := int(math.Ceil(spanS/step)) + 5
	e := &Ephemeris{t0: t0, jd0: JulianDay(t0), first: -2 * step, stepS: step,
		ra: make([]float64, n), dec: make([]float64, n), sidRes: make([]float64, n),
		radius: make([]float64, n), eot: make([]float64, n), dt: make([]float64, n)}
	for i := 0; i < n; i++ {
		s := e.first + float64(i)*step
		t := t0.Add(time.Duration(s * 1e9))
		d := deltaT(t)
		g := GeocentricAt(t, d)
		e.ra[i] = g.RightAscensionDeg
		e.dec[i] = g.DeclinationDeg
		e.sidRes[i] = g.SiderealDeg - SiderealRateDegPerDay*(g.JD-j2000)
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
func (e *Ephemeris) weights(s float64) (int, [4]float64) {
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

func lagrange4(v []float64, i int, w [4]float64) float64 {
	return w[0]*v[i-1] + w[1]*v[i] + w[2]*v[i+1] + w[3]*v[i+2]
}

// Start returns the instant that offsets are counted from.
func (e *Ephemeris) Start() time.Time { return e.t0 }

// RaDecSidereal returns the interpolated right ascension, declination and
// Greenwich apparent sidereal time at s seconds after Start (degrees;
// right ascension unwrapped and sidereal time not normalised, so that
// differences stay continuous).
func (e *Ephemeris) RaDecSidereal(s float64) (raDeg, decDeg, sidDeg float64) {
	i, w := e.weights(s)
	jd := e.jd0 + s/86400
	return lagrange4(e.ra, i, w), lagrange4(e.dec, i, w), SiderealRateDegPerDay*(jd-j2000) + lagrange4(e.sidRes, i, w)
}

// At returns the interpolated Geocentric at s seconds after Start, with
// the fields that Geocentric.Topocentric reads (time, JD, ΔT, right
// ascension, declination, sidereal time, Earth–Sun distance, equation of
// time); the other fields are zero.
func (e *Ephemeris) At(s float64) Geocentric {
	i, w := e.weights(s)
	jd := e.jd0 + s/86400
	dt := lagrange4(e.dt, i, w)
	return Geocentric{
		Time:              e.t0.Add(time.Duration(math.Round(s * 1e9))).UTC(),
		JD:                jd,
		JDE:               jd + dt/86400,
		DeltaTSec:         dt,
		RightAscensionDeg: angle.Norm360(lagrange4(e.ra, i, w)),
		DeclinationDeg:    lagrange4(e.dec, i, w),
		SiderealDeg:       angle.Norm360(SiderealRateDegPerDay*(jd-j2000) + lagrange4(e.sidRes, i, w)),
		EarthRadiusAU:     lagrange4(e.radius, i, w),
		EquationOfTimeMin: lagrange4(e.eot, i, w),
	}
}
