package spa

import (
	"math"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/angle"
)

// Altitudes h0' of the day events (SPA Appendix A.2 and the usual
// definitions of twilight), degrees.
const (
	SunriseAltitudeDeg      = -0.8333 // upper limb on the horizon with standard refraction (SPA A.2)
	CivilTwilightDeg        = -6.0
	NauticalTwilightDeg     = -12.0
	AstronomicalTwilightDeg = -18.0
)

// Polar says why a rise or set did not happen in a Day.
type Polar int

const (
	// RisesAndSets: the event happened (or, rarely, fell just outside the window).
	RisesAndSets Polar = iota
	// AlwaysAbove: the sun stayed above the event's altitude all day
	// (midnight sun for sunrise/sunset, "white night" for twilight).
	AlwaysAbove
	// AlwaysBelow: the sun stayed below the event's altitude all day (polar night).
	AlwaysBelow
)

// String names the case.
func (p Polar) String() string {
	switch p {
	case AlwaysAbove:
		return "always above"
	case AlwaysBelow:
		return "always below"
	}
	return "rises and sets"
}

// Day holds the sun's events for one observer in a 24-hour window.
// A nil pointer means the event does not happen that day; the matching
// Polar field says whether the sun stayed above or below.
type Day struct {
	Start              time.Time // start of the 24 h window
	Transit            time.Time // solar noon: local hour angle 0, Eq. A13
	TransitAltitudeDeg float64   // geocentric altitude at transit, Eq. A12 (no refraction)

	Sunrise, Sunset *time.Time // Eq. A14, A15 with h0' = −0.8333°
	SunPolar        Polar

	CivilDawn, CivilDusk *time.Time // h0' = −6°
	CivilPolar           Polar

	NauticalDawn, NauticalDusk *time.Time // h0' = −12°
	NauticalPolar              Polar

	AstroDawn, AstroDusk *time.Time // h0' = −18°
	AstroPolar           Polar
}

// DayAt computes transit, sunrise, sunset and the three twilights for an
// observer by the method of SPA Appendix A.2, in the 24 hours starting at
// start (UT1; TT = UT1 + deltaTSec).
//
// The report's method works on the UT day (start = 0 h UT); passing local
// midnight instead gives the events of the observer's local day. The
// method assigns each event to the window by its fraction of day m (Eq.
// A3–A6 limit m to 0..1), so an event may belong to a neighbouring local
// day when the window and the local day disagree: with start = 0 h UT the
// report's own example (Table A5.1) gives the sunset of the previous local
// evening. Rise and set are geocentric, at fixed h0' (see the package doc).
// Against PyEphem's iterative search (testdata/events.csv) the times agree
// within 10 s, or within 0.02° of altitude where the sun climbs slowly
// (high latitudes); where the sun barely grazes h0' the time is
// ill-conditioned and the event may be found or missed by either method.
//
// Where the right ascension wraps through 360° between consecutive days
// (around the March equinox) the daily differences are wrapped into
// −180..180; the report's rule (Eq. A9, "if |a| > 2, limit a to 0..1")
// gives the same result for the Sun, whose right ascension changes by
// about 0.91° a day at the equinox.
func DayAt(start time.Time, o Observer, deltaTSec float64) Day {
	jd0 := JulianDay(start)
	// A.2 step 1: ν at 0 h of the window, with ΔT = 0.
	nu := geocentricJD(jd0, 0).SiderealDeg
	// A.2 step 2: α and δ at 0 TT of the day before, the day, the day after
	// (ΔT = 0, so JDE = JD).
	var alpha, delta [3]float64
	for i := 0; i < 3; i++ {
		g := geocentricJD(jd0+float64(i-1), 0)
		alpha[i], delta[i] = g.RightAscensionDeg, g.DeclinationDeg
	}
	r := riseSet{o: o, nu: nu, dtDay: deltaTSec / 86400, alpha: alpha, delta: delta,
		sinPhi: math.Sin(angle.Rad(o.LatDeg)), cosPhi: math.Cos(angle.Rad(o.LatDeg))}

	d := Day{Start: start}
	m0 := (alpha[1] - o.LonDeg - nu) / 360 // Eq. A3
	m0 = limit01(m0)
	_, hp0, _ := r.at(m0)
	tFrac := m0 - hp0/360 // Eq. A13
	d.Transit = addDays(start, tFrac)
	d.TransitAltitudeDeg, _, _ = r.at(tFrac)

	ev := func(h0 float64) (rise, set *time.Time, p Polar) {
		x := (math.Sin(angle.Rad(h0)) - r.sinPhi*math.Sin(angle.Rad(delta[1]))) / (r.cosPhi * math.Cos(angle.Rad(delta[1]))) // Eq. A4
		switch {
		case math.IsNaN(x) || x > 1:
			return nil, nil, AlwaysBelow
		case x < -1:
			return nil, nil, AlwaysAbove
		}
		bigH0 := angle.Deg(math.Acos(x)) // Eq. A4, 0..180
		m1 := limit01(m0 - bigH0/360)    // Eq. A5
		m2 := limit01(m0 + bigH0/360)    // Eq. A6
		rf := r.correct(m1, h0)          // Eq. A14
		sf := r.correct(m2, h0)          // Eq. A15
		rt, st := addDays(start, rf), addDays(start, sf)
		return &rt, &st, RisesAndSets
	}
	d.Sunrise, d.Sunset, d.SunPolar = ev(SunriseAltitudeDeg)
	d.CivilDawn, d.CivilDusk, d.CivilPolar = ev(CivilTwilightDeg)
	d.NauticalDawn, d.NauticalDusk, d.NauticalPolar = ev(NauticalTwilightDeg)
	d.AstroDawn, d.AstroDusk, d.AstroPolar = ev(AstronomicalTwilightDeg)
	return d
}

// riseSet carries the interpolation state of SPA Appendix A.2.
type riseSet struct {
	o              Observer
	nu             float64 // ν at 0 h, degrees
	dtDay          float64 // ΔT in days
	alpha, delta   [3]float64
	sinPhi, cosPhi float64
}

// at returns, for fraction of day m, the altitude h (Eq. A12), the local
// hour angle H' (Eq. A11, −180..180) and the interpolated declination δ'.
func (r riseSet) at(m float64) (hDeg, hpDeg, deltaPDeg float64) {
	nuI := r.nu + 360.985647*m // Eq. A7
	n := m + r.dtDay           // Eq. A8
	alphaP := interp(r.alpha, n, true)
	deltaP := interp(r.delta, n, false)
	hp := angle.Wrap180(nuI + r.o.LonDeg - alphaP) // Eq. A11
	sd, cd := math.Sincos(angle.Rad(deltaP))
	h := angle.Deg(math.Asin(r.sinPhi*sd + r.cosPhi*cd*math.Cos(angle.Rad(hp)))) // Eq. A12
	return h, hp, deltaP
}

// correct applies Eq. A14/A15 to the first guess m for altitude h0.
func (r riseSet) correct(m, h0 float64) float64 {
	h, hp, dp := r.at(m)
	return m + (h-h0)/(360*math.Cos(angle.Rad(dp))*r.cosPhi*math.Sin(angle.Rad(hp)))
}

// interp is SPA Eq. A9/A10: second-order interpolation through the values
// at days −1, 0, +1. For right ascension the daily differences are wrapped
// into −180..180 (see DayAt).
func interp(v [3]float64, n float64, wrap bool) float64 {
	a := v[1] - v[0]
	b := v[2] - v[1]
	if wrap {
		a = angle.Wrap180(a)
		b = angle.Wrap180(b)
	}
	c := b - a
	return v[1] + n*(a+b+c*n)/2
}

func limit01(m float64) float64 { return m - math.Floor(m) }

func addDays(t time.Time, frac float64) time.Time {
	return t.Add(time.Duration(math.Round(frac * 86400e9)))
}
