package invert

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/angle"
	"github.com/gnomon-forensics/gnomon/internal/chisq"
	"github.com/gnomon-forensics/gnomon/solarcheck/shadow"
	"github.com/gnomon-forensics/gnomon/solarcheck/spa"
)

// ErrInvalid marks a query that cannot be answered as asked (no angle
// measured, a non-positive uncertainty, an empty or over-long range).
// Errors wrap it; test with errors.Is.
var ErrInvalid = errors.New("invalid inverse query")

// FitLevel is the goodness-of-fit level: a window whose least misfit
// would be exceeded by chance less often than this (p-value below 0.05)
// does not fit. The 95 % convention of every other figure of gnomon.
const FitLevel = 0.05

// ProfileDof is the number of parameters of interest of a time window: the
// time alone. A window is the profile interval Δχ² = χ² − χ²min below
// chisq.P95(ProfileDof) = 3.841, whatever the number of angles measured.
const ProfileDof = 1

// skySDDeg is σ_sky of the package doc: the uncertainty of the sun's
// position itself, which makes azimuth meaningless near the zenith.
const skySDDeg = 0.01

// horizonScaleDeg is the scale of the below-horizon penalty.
const horizonScaleDeg = 0.01

// MaxRange is the longest date range When accepts: the search keeps a
// handful of numbers per minute of range in flight and sensible questions
// span days to a few years.
const MaxRange = 3*366*24*time.Hour + 24*time.Hour

// gridStep is the screening resolution.
const gridStep = time.Minute

// Measurement is what the examiner measured of the sun: its azimuth
// (degrees clockwise from true north) and/or its apparent altitude
// (refracted, of the centre of the disc), each with a 1-sigma error.
type Measurement struct {
	HasAzimuth   bool
	AzimuthDeg   float64
	AzimuthSDDeg float64

	HasAltitude   bool
	AltitudeDeg   float64
	AltitudeSDDeg float64

	// Correlation of the azimuth and altitude errors, −1 < ρ < 1; zero
	// unless both come from one shadow on sloped ground.
	Correlation float64

	// BelowHorizonOK lets times with the sun below the horizon match. It
	// is false for anything seen in a photograph (a shadow needs the sun up).
	BelowHorizonOK bool
}

// FromShadow turns a shadow estimate (package shadow) into a measurement
// of both angles with their propagated errors and correlation.
func FromShadow(e shadow.Estimate) Measurement {
	return Measurement{
		HasAzimuth: true, AzimuthDeg: e.Sun.AzimuthDeg, AzimuthSDDeg: e.AzimuthSDDeg,
		HasAltitude: true, AltitudeDeg: e.Sun.AltitudeDeg, AltitudeSDDeg: e.AltitudeSDDeg,
		Correlation: e.Correlation,
	}
}

// Dof returns the degrees of freedom of the misfit: the number of angles measured.
func (m Measurement) Dof() int {
	n := 0
	if m.HasAzimuth {
		n++
	}
	if m.HasAltitude {
		n++
	}
	return n
}

// FitDof returns the degrees of freedom of the misfit at the best time as
// a goodness-of-fit test: the angles measured less the one parameter
// fitted (the time), and at least one. With a single angle the fit is
// exact wherever the sun passes the measured value, and a misfit arises
// only when it never does (the measured altitude is above the day's
// highest); its distribution is then a mixture of zero and χ² with one
// degree of freedom, so testing it against one degree of freedom errs
// toward "fits" (conservative, as an accusation must be).
func (m Measurement) FitDof() int { return max(m.Dof()-1, 1) }

func (m Measurement) check() error {
	if m.Dof() == 0 {
		return fmt.Errorf("no azimuth or altitude measured: %w", ErrInvalid)
	}
	if m.HasAzimuth && (!(m.AzimuthSDDeg > 0) || math.IsInf(m.AzimuthSDDeg, 0) || math.IsNaN(m.AzimuthDeg) || math.IsInf(m.AzimuthDeg, 0)) {
		return fmt.Errorf("azimuth %g° ± %g°: want a finite angle and sd > 0: %w", m.AzimuthDeg, m.AzimuthSDDeg, ErrInvalid)
	}
	if m.HasAltitude && (!(m.AltitudeSDDeg > 0) || math.IsInf(m.AltitudeSDDeg, 0) || !(m.AltitudeDeg >= -90 && m.AltitudeDeg <= 90)) {
		return fmt.Errorf("altitude %g° ± %g°: want −90..90 and sd > 0: %w", m.AltitudeDeg, m.AltitudeSDDeg, ErrInvalid)
	}
	if !(m.Correlation > -1 && m.Correlation < 1) {
		return fmt.Errorf("correlation %g: want −1 < ρ < 1: %w", m.Correlation, ErrInvalid)
	}
	return nil
}

// chi2 is the misfit of a sun at (azDeg, altDeg) against m (package doc).
func (m *Measurement) chi2(azDeg, altDeg float64) float64 {
	return m.chi2c(azDeg, altDeg, math.Cos(angle.Rad(altDeg)))
}

// chi2c is chi2 with the cosine of the altitude supplied by the caller.
func (m *Measurement) chi2c(azDeg, altDeg, c float64) float64 {
	var dAz, dAlt, rho float64
	if m.HasAzimuth {
		if c < 1e-9 {
			c = 1e-9
		}
		f := skySDDeg / c
		sd := math.Sqrt(m.AzimuthSDDeg*m.AzimuthSDDeg + f*f)
		dAz = angle.Wrap180(azDeg-m.AzimuthDeg) / sd
		rho = m.Correlation * m.AzimuthSDDeg / sd
	}
	if m.HasAltitude {
		dAlt = (altDeg - m.AltitudeDeg) / m.AltitudeSDDeg
	}
	chi := dAz*dAz + dAlt*dAlt
	if rho != 0 {
		chi = (chi - 2*rho*dAz*dAlt) / (1 - rho*rho)
	}
	if !m.BelowHorizonOK && altDeg < 0 {
		p := altDeg / horizonScaleDeg
		chi += p * p
	}
	return chi
}

// Query is a When search: a place, a range of time and a measurement.
type Query struct {
	// Observer is the place and atmosphere. Its PressureHPa is used as
	// given (zero = no refraction); spa.NewObserver sets the standard one.
	Observer spa.Observer
	// From and To bound the search, [From, To]. Callers turn calendar
	// dates in a zone into instants (zone.DayStart, which knows the zones
	// whose midnight is skipped or repeated).
	From, To    time.Time
	Measurement Measurement
	// DeltaT gives ΔT in seconds for an instant; nil means spa.DeltaT.
	DeltaT func(time.Time) float64
	// MaxMisfit, when positive, makes Result.Windows list every window
	// whose least misfit is below it, fitting or not (Window.Fits still
	// tells), for callers that build a joint region over several
	// parameters, such as date and time of day. It should be at least the
	// goodness-of-fit point. Zero lists the windows that fit.
	MaxMisfit float64
}

// Window is one interval of time about a local minimum of the misfit
// (package doc): the times at which the sun's position is within the
// measurement's 95 % profile interval of the best time of that minimum.
type Window struct {
	Best     time.Time // least misfit, to about 1 s
	Earliest time.Time // first time inside the 95 % window
	Latest   time.Time // last time inside the 95 % window
	// Sun at Best by the full spa.At: azimuth (true north) and refracted altitude.
	AzimuthDeg  float64
	AltitudeDeg float64
	// Misfit is χ² at Best, the least in the window; Dof its degrees of
	// freedom as a goodness-of-fit test (Measurement.FitDof) and PValue
	// the chance of a misfit at least this large if the measurement and
	// its stated errors are right and the sun stood at Best.
	Misfit float64
	Dof    int
	PValue float64
	// StartsBefore / EndsAfter report that the window was cut by the
	// searched range: the sun matched before From or after To too.
	StartsBefore bool
	EndsAfter    bool
}

// Fits reports whether the measurement fits the sun at w's best time at
// the 95 % level (PValue ≥ FitLevel).
func (w Window) Fits() bool { return w.PValue >= FitLevel }

// Result is the answer of When.
type Result struct {
	// Windows are the windows in which the measurement fits the sun
	// (Window.Fits), in time order. Empty when it fits at no time.
	Windows []Window
	// Closest is the window of least misfit in the whole range, whether
	// it fits or not, so that a measurement that fits nowhere can be
	// reported with its misfit. Nil when the sun was below the horizon
	// throughout (and Measurement.BelowHorizonOK is false).
	Closest *Window
}

// searcher holds one When search.
type searcher struct {
	m      Measurement
	fitThr float64 // χ² below which a minimum is listed (FitLevel, FitDof; or Query.MaxMisfit)
	delta  float64 // Δχ² of the 95 % profile interval (ProfileDof)
	o      spa.Observer
	eph    *spa.Ephemeris
	spanS  float64
	stepS  float64
	n      int // grid points 0..n
	sinPhi float64
	cosPhi float64
	// maxRefrDeg bounds the refraction SPA applies for this atmosphere
	// (its value at the lowest altitude it corrects, Eq. 42).
	maxRefrDeg float64
}

// When finds the windows in [q.From, q.To] in which the sun, seen from
// q.Observer, matched q.Measurement at the 95 % level, and the window of
// least misfit whether it matched or not. The method is in the package
// doc. It runs on the caller's goroutine: callers decide concurrency.
func When(q Query) (Result, error) {
	if err := q.Measurement.check(); err != nil {
		return Result{}, err
	}
	o := q.Observer
	if !(o.LatDeg >= -90 && o.LatDeg <= 90) || math.IsNaN(o.LonDeg) || math.IsInf(o.LonDeg, 0) {
		return Result{}, fmt.Errorf("observer at %g°, %g°: %w", o.LatDeg, o.LonDeg, ErrInvalid)
	}
	span := q.To.Sub(q.From)
	if span < 0 {
		return Result{}, fmt.Errorf("range %s to %s runs backwards: %w", q.From.Format(time.RFC3339), q.To.Format(time.RFC3339), ErrInvalid)
	}
	if span < time.Minute {
		return Result{}, fmt.Errorf("range of %s is shorter than the 1-minute search step: %w", span, ErrInvalid)
	}
	if span > MaxRange {
		return Result{}, fmt.Errorf("range of %.0f days exceeds the %.0f-day limit: %w", span.Hours()/24, MaxRange.Hours()/24, ErrInvalid)
	}
	dt := q.DeltaT
	if dt == nil {
		dt = spa.DeltaT
	}
	m := q.Measurement
	listed := func(w Window) bool { return w.Fits() }
	s := &searcher{m: m, fitThr: chisq.Point(FitLevel, m.FitDof()), delta: chisq.P95(ProfileDof), o: o, spanS: span.Seconds()}
	if q.MaxMisfit > 0 {
		s.fitThr = max(s.fitThr, q.MaxMisfit)
		listed = func(w Window) bool { return w.Misfit < q.MaxMisfit }
	}
	s.sinPhi, s.cosPhi = math.Sincos(angle.Rad(o.LatDeg))
	s.maxRefrDeg = max(0, spa.Refraction(-0.8333, o.PressureHPa, o.TemperatureC)) + 0.01
	s.n = int(math.Ceil(s.spanS / gridStep.Seconds()))
	if s.n < 1 {
		s.n = 1
	}
	s.stepS = s.spanS / float64(s.n)
	s.eph = spa.NewEphemeris(q.From, s.spanS, dt)

	wins, closest := s.refine(s.screen())
	toWindow := func(w interval) Window {
		// Times are good to about a second: report whole seconds.
		best := q.From.Add(time.Duration(math.Round(w.best * 1e9))).Round(time.Second)
		p := spa.At(best, o, dt(best))
		chi := s.m.chi2(p.AzimuthDeg, p.AltitudeDeg)
		return Window{
			Best:         best.UTC(),
			Earliest:     q.From.Add(time.Duration(math.Round(w.lo * 1e9))).Round(time.Second).UTC(),
			Latest:       q.From.Add(time.Duration(math.Round(w.hi * 1e9))).Round(time.Second).UTC(),
			AzimuthDeg:   p.AzimuthDeg,
			AltitudeDeg:  p.AltitudeDeg,
			Misfit:       chi,
			Dof:          m.FitDof(),
			PValue:       chisq.Survival(chi, m.FitDof()),
			StartsBefore: w.lo <= 0,
			EndsAfter:    w.hi >= s.spanS,
		}
	}
	var res Result
	for _, w := range wins {
		if win := toWindow(w); listed(win) {
			res.Windows = append(res.Windows, win)
		}
	}
	if closest != nil {
		c := toWindow(*closest)
		res.Closest = &c
	}
	return res, nil
}

// gridS is the time of grid point k in seconds since From.
func (s *searcher) gridS(k int) float64 {
	if k >= s.n {
		return s.spanS
	}
	return float64(k) * s.stepS
}

// cheap is the screening misfit: geocentric, interpolated, with SPA's
// refraction and without parallax.
func (s *searcher) cheap(t float64) float64 {
	ra, dec, sid := s.eph.RaDecSidereal(t)
	sinH, cosH := math.Sincos(angle.Rad(sid + s.o.LonDeg - ra))
	sinD, cosD := math.Sincos(angle.Rad(dec))
	alt0 := angle.Deg(math.Asin(s.sinPhi*sinD + s.cosPhi*cosD*cosH))
	alt := alt0 + spa.Refraction(alt0, s.o.PressureHPa, s.o.TemperatureC)
	var az float64
	if s.m.HasAzimuth {
		az = angle.Deg(math.Atan2(sinH, cosH*s.sinPhi-sinD/cosD*s.cosPhi)) + 180 // SPA Eq. 45–46 without parallax
	}
	return s.m.chi2(az, alt)
}

// precise is the refinement misfit: interpolated geocentric quantities
// through SPA's topocentric part.
func (s *searcher) precise(t float64) float64 {
	p := s.eph.At(t).Topocentric(s.o)
	return s.m.chi2(p.AzimuthDeg, p.AltitudeDeg)
}

// blockSpan is one screening block: grid indices kb..ke and a lower
// bound of the cheap misfit anywhere in it.
type blockSpan struct {
	kb, ke int
	lb     float64
}

// screen evaluates the cheap misfit on the grid and returns the
// grid-local minima, sorted. Blocks are visited from the lowest lower
// bound up, and a block is skipped once its bound exceeds both the fit
// threshold and the least misfit found so far (each plus one, for the
// cheap model's error): it can then hold neither a fitting minimum nor the
// closest one (branch and bound).
func (s *searcher) screen() []int {
	var blocks []blockSpan
	for kb := 0; kb <= s.n; kb += screenBlock {
		ke := min(kb+screenBlock, s.n)
		blocks = append(blocks, blockSpan{kb: kb, ke: ke, lb: s.blockBound(s.gridS(kb), s.gridS(ke))})
	}
	sort.SliceStable(blocks, func(i, j int) bool { return blocks[i].lb < blocks[j].lb })
	vals := make([]float64, s.n+1)
	for i := range vals {
		vals[i] = math.Inf(1)
	}
	least := math.Inf(1)
	for _, b := range blocks {
		if b.lb > max(s.fitThr, least)+1 {
			break
		}
		s.cheapBlock(b.kb, b.ke, vals[b.kb:b.ke+1])
		for _, v := range vals[b.kb : b.ke+1] {
			least = min(least, v)
		}
	}
	var seeds []int
	for k, v := range vals {
		prev, next := math.Inf(1), math.Inf(1)
		if k > 0 {
			prev = vals[k-1]
		}
		if k < s.n {
			next = vals[k+1]
		}
		// Only minima that could fit or be the closest are worth refining.
		if v < prev && v <= next && v <= max(s.fitThr, least)+1 {
			seeds = append(seeds, k)
		}
	}
	return seeds
}

// sunRateDegPerS bounds how fast the sun's altitude can change: its
// diurnal motion on the sky is 15.041°/h × cos δ at most (one turn per
// sidereal day), and no component of a motion is faster than the motion.
const sunRateDegPerS = 15.05 / 3600

// blockBound returns a lower bound of the cheap misfit at every time in
// [ta, tb] from the airless altitudes at its two ends: inside the block
// the altitude stays within ±(rate × half the block) of their mean, and
// refraction raises it by at most its value at the horizon. χ² is at least
// d_alt² whatever the azimuth term and correlation, plus the below-horizon
// penalty when the sun cannot have been up, so the bound only looks at the
// altitude. Night (for a visible sun) and hours when the altitude is far
// from a measured one get high bounds and are not evaluated point by point.
func (s *searcher) blockBound(ta, tb float64) float64 {
	alt := func(t float64) float64 {
		ra, dec, sid := s.eph.RaDecSidereal(t)
		sinD, cosD := math.Sincos(angle.Rad(dec))
		cosH := math.Cos(angle.Rad(sid + s.o.LonDeg - ra))
		return angle.Deg(math.Asin(max(-1, min(1, s.sinPhi*sinD+s.cosPhi*cosD*cosH))))
	}
	altA, altB := alt(ta), alt(tb)
	half := sunRateDegPerS * (tb - ta) / 2
	lo := (altA+altB)/2 - half - 0.001 // SPA's refraction is slightly negative at the zenith
	hi := (altA+altB)/2 + half + s.maxRefrDeg
	var lb float64
	if !s.m.BelowHorizonOK && hi < 0 {
		p := hi / horizonScaleDeg
		lb += p * p
	}
	if s.m.HasAltitude {
		d := max(0, lo-s.m.AltitudeDeg, s.m.AltitudeDeg-hi) / s.m.AltitudeSDDeg
		lb += d * d
	}
	return lb
}

// screenBlock is the number of grid steps over which cheapBlock treats the
// hour angle as linear in time and the declination's sine and cosine as
// linear: over an hour the hour angle departs from a straight line by
// about 1e-8° and the declination moves by at most 0.017°, so the
// linear forms are good to 1e-7°.
const screenBlock = 60

// cheapBlock fills out[k−kb] with the cheap misfit at grid indices
// kb..ke (one screening block). It evaluates the interpolated ephemeris
// only at the block's ends and steps the hour angle's sine and cosine by
// rotation in between, which makes the screen several times faster than
// calling cheap per point.
func (s *searcher) cheapBlock(kb, ke int, out []float64) {
	sinPhi, cosPhi := s.sinPhi, s.cosPhi
	p, tc := s.o.PressureHPa, s.o.TemperatureC
	ta, tb := s.gridS(kb), s.gridS(ke)
	raA, decA, sidA := s.eph.RaDecSidereal(ta)
	raB, decB, sidB := s.eph.RaDecSidereal(tb)
	hA := sidA + s.o.LonDeg - raA
	hB := sidB + s.o.LonDeg - raB
	ref := hA + (tb-ta)*spa.SiderealRateDegPerDay/86400
	hB = ref + angle.Wrap180(hB-ref) // continue hA's turn, not a jump of 360°
	sinDA, cosDA := math.Sincos(angle.Rad(decA))
	sinDB, cosDB := math.Sincos(angle.Rad(decB))
	steps := ke - kb
	var dH, dSin, dCos float64
	if steps > 0 {
		dH = angle.Rad((hB - hA) / float64(steps))
		dSin, dCos = (sinDB-sinDA)/float64(steps), (cosDB-cosDA)/float64(steps)
	}
	rs, rc := math.Sincos(dH)
	sinH, cosH := math.Sincos(angle.Rad(hA))
	for j := 0; j <= steps; j++ {
		sinD := sinDA + float64(j)*dSin
		cosD := cosDA + float64(j)*dCos
		x := sinPhi*sinD + cosPhi*cosD*cosH
		alt0 := angle.Deg(math.Asin(max(-1, min(1, x))))
		alt := alt0 + spa.Refraction(alt0, p, tc)
		var az float64
		if s.m.HasAzimuth {
			az = angle.Deg(math.Atan2(sinH, cosH*sinPhi-sinD/cosD*cosPhi)) + 180 // SPA Eq. 45–46 without parallax
		}
		out[j] = s.m.chi2c(az, alt, math.Sqrt(max(0, 1-x*x))) // cos of the airless altitude
		sinH, cosH = sinH*rc+cosH*rs, cosH*rc-sinH*rs
	}
}

// interval is a window in seconds since From, with its best time and the
// least misfit there.
type interval struct{ lo, hi, best, chi float64 }

// refine turns grid seeds into windows (package doc, step 3): the fitting
// ones, and the closest (least misfit) one, which is nil when the sun was
// below the horizon at every candidate and that is not allowed.
func (s *searcher) refine(seeds []int) ([]interval, *interval) {
	type cand struct{ t, chi float64 }
	var cands []cand
	ci := -1
	for _, k := range seeds {
		a := s.gridS(max(k-1, 0))
		b := s.gridS(min(k+1, s.n))
		t, chi := s.golden(a, b)
		cands = append(cands, cand{t, chi})
		if ci < 0 || chi < cands[ci].chi {
			ci = len(cands) - 1
		}
	}
	var wins []interval
	for _, c := range cands {
		if c.chi > s.fitThr {
			continue
		}
		if n := len(wins); n > 0 && c.t <= wins[n-1].hi {
			if c.chi < wins[n-1].chi {
				wins[n-1].best, wins[n-1].chi = c.t, c.chi
			}
			continue
		}
		wins = append(wins, s.window(c.t, c.chi))
	}
	// Merge any overlaps left by disagreement between the two models.
	sort.Slice(wins, func(i, j int) bool { return wins[i].lo < wins[j].lo })
	var out []interval
	for _, w := range wins {
		if n := len(out); n > 0 && w.lo <= out[n-1].hi {
			last := &out[n-1]
			last.hi = math.Max(last.hi, w.hi)
			if w.chi < last.chi {
				last.best, last.chi = w.best, w.chi
			}
			continue
		}
		out = append(out, w)
	}
	if ci < 0 {
		return out, nil
	}
	c := cands[ci]
	for i := range out {
		if c.t >= out[i].lo && c.t <= out[i].hi {
			return out, &out[i]
		}
	}
	if !s.m.BelowHorizonOK && s.eph.At(c.t).Topocentric(s.o).AltitudeDeg < -0.5 {
		return out, nil // the sun never rose: there is no closest time to speak of
	}
	w := s.window(c.t, c.chi)
	return out, &w
}

// window returns the profile interval about a local minimum chi at t: the
// times either side before the misfit first reaches chi + Δχ².
func (s *searcher) window(t, chi float64) interval {
	thr := chi + s.delta
	return interval{lo: s.edge(t, -1, thr), hi: s.edge(t, +1, thr), best: t, chi: chi}
}

// golden minimises the precise misfit on [a, b] by golden-section search
// to about 0.5 s and returns the minimiser and the minimum; the ends of
// the bracket are candidates too.
func (s *searcher) golden(a, b float64) (float64, float64) {
	const r = 0.6180339887498949
	fa, fb := s.precise(a), s.precise(b)
	c, d := b-r*(b-a), a+r*(b-a)
	fc, fd := s.precise(c), s.precise(d)
	for b-a > 0.5 {
		if fc < fd {
			b, d, fd = d, c, fc
			c = b - r*(b-a)
			fc = s.precise(c)
		} else {
			a, c, fc = c, d, fd
			d = a + r*(b-a)
			fd = s.precise(d)
		}
	}
	t, f := c, fc
	if fd < f {
		t, f = d, fd
	}
	if fa < f {
		t, f = a, fa
	}
	if fb < f {
		t, f = b, fb
	}
	return t, f
}

// edge walks the grid from inside (misfit below thr) in direction dir
// until the misfit reaches thr, then bisects the last step with the
// precise model to about 0.5 s. It returns the last inside time, or the
// end of the range if the window runs past it.
func (s *searcher) edge(in float64, dir int, thr float64) float64 {
	for {
		var k int
		if dir > 0 { // the tolerance keeps a point on the grid from finding itself
			k = int(math.Floor(in/s.stepS+1e-9)) + 1
		} else {
			k = int(math.Ceil(in/s.stepS-1e-9)) - 1
		}
		if k < 0 || k > s.n {
			if dir > 0 {
				return s.spanS
			}
			return 0
		}
		next := s.gridS(k)
		if s.cheap(next) < thr || s.precise(next) < thr {
			in = next
			continue
		}
		out := next
		for math.Abs(out-in) > 0.5 {
			mid := (in + out) / 2
			if s.precise(mid) < thr {
				in = mid
			} else {
				out = mid
			}
		}
		return in
	}
}
