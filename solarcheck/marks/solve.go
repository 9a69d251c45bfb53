package marks

import (
	"fmt"
	"math"
	"math/rand/v2"
	"sort"
	"strings"

	"github.com/gnomon-forensics/gnomon/internal/angle"
)

// Draws is the number of Monte Carlo draws behind every 1-sigma. With 200
// draws a standard deviation is known to about ±5 % (1/√(2·200)).
const Draws = 200

// mcTol ends a Monte Carlo refit when a step lowers its chi-square by
// less than this fraction: the parameters are then within about a
// thousandth of their 1-sigma of the minimum.
const mcTol = 1e-4

// The seed of the Monte Carlo draws: fixed, so that reruns are identical.
const seed1, seed2 = 0x676e6f6d6f6e, 13

// Thresholds of the refusal gate.
const (
	// MaxVerticalSDDeg: an up direction less certain than this (1-sigma)
	// cannot support an answer. On the reference scenes the accepted cases
	// then keep their altitude errors within 2.5° and their intervals'
	// coverage near 95 %, while the refused ones include errors of tens of
	// degrees (README, noisy_test.go).
	MaxVerticalSDDeg = 1.0
	// SameBearingDeg: vertical lines whose bearings from the camera all
	// lie within this of one another nearly coincide in the picture and
	// do not fix the vertical direction.
	SameBearingDeg = 3.0
	// MinDepressionSigmas: a point on the ground must lie below the
	// horizon by at least this many times the 1-sigma of its depression,
	// so that its distance is known to about ±25 % or better and the
	// Monte Carlo's linear spread describes it.
	MinDepressionSigmas = 4
	// MaxAltitudeSDDeg: an altitude less certain than this (1-sigma) is
	// not given: the marks then sit where the geometry is so bent that
	// the Monte Carlo's spread no longer describes the error (measured on
	// the reference scenes).
	MaxAltitudeSDDeg = 3.0
)

// verticalLines counts the marks that give a vertical line.
func (in Input) verticalLines() int { return len(in.Objects) + len(in.Edges) }

// determine says, from the kinds of marks alone, which outputs they can
// determine, and why not the others. It never assumes a level camera.
func determine(in Input) Result {
	var res Result
	nv := in.verticalLines()
	switch {
	case nv >= 2 && in.Horizon != nil:
		res.Vertical = Vertical{Determined: true, How: fmt.Sprintf("from %d vertical lines and the horizon", nv)}
	case nv >= 2:
		res.Vertical = Vertical{Determined: true, How: fmt.Sprintf("from %d vertical lines", nv)}
	case in.Horizon != nil:
		res.Vertical = Vertical{Determined: true, How: "from the horizon"}
	case nv == 1:
		res.Vertical.Reason = "only one vertical line is marked and no horizon, so the vertical direction is not fixed (a level camera is never assumed): mark a second vertical line or the horizon"
	default:
		res.Vertical.Reason = "no vertical line and no horizon is marked, so the vertical direction is not fixed: mark two vertical lines (objects or edges) or the horizon"
	}
	var how []string
	if len(in.Objects) > 0 {
		if len(in.Objects) == 1 {
			how = append(how, "the shadow of one object")
		} else {
			how = append(how, fmt.Sprintf("the shadows of %d objects", len(in.Objects)))
		}
	}
	if in.Sun != nil {
		how = append(how, "the sun's disc in the frame")
	}
	switch {
	case !res.Vertical.Determined:
		res.Altitude.Reason = "the vertical direction is not fixed"
	case len(how) == 0:
		res.Altitude.Reason = "no shadow-casting object and no sun in the frame is marked"
	default:
		res.Altitude = Angle{Determined: true, How: "from " + strings.Join(how, " and ")}
	}
	how = how[:0]
	if len(in.GroundLines) > 0 {
		if len(in.GroundLines) == 1 {
			how = append(how, "a ground line of known bearing")
		} else {
			how = append(how, fmt.Sprintf("%d ground lines of known bearing", len(in.GroundLines)))
		}
	}
	if h := in.Heading; h != nil {
		src := "the camera's heading"
		if h.Source != "" {
			src += " (" + h.Source + ")"
		}
		how = append(how, src)
	}
	switch {
	case !res.Altitude.Determined:
		res.Azimuth.Reason = "the sun's altitude is not determined"
	case len(how) == 0:
		res.Azimuth.Reason = "no bearing reference: mark a ground line of known bearing, or give the camera's heading"
	default:
		res.Azimuth = Angle{Determined: true, How: "from " + strings.Join(how, " and ")}
	}
	return res
}

// objectAlone is what one object's marks give with a known up direction
// and focal length: the base and tip back-projected to the ground, the top
// on the vertical through the base (least squares against its ray), and the
// light ray from tip to top.
type objectAlone struct {
	x, y, h           float64 // base on the ground (along h1, h2) and height
	altRad, phiRad    float64 // the sun's elevation and relative azimuth
	shadowRad         float64 // relative azimuth from base to tip
	baseOK, tipOK, ok bool
}

func aloneObject(cam camera, fr frame, o Object) objectAlone {
	var a objectAlone
	b, okB := onGround(cam.ray(o.Base), fr.u)
	s, okS := onGround(cam.ray(o.Tip), fr.u)
	a.baseOK, a.tipOK = okB, okS
	if !okB || !okS {
		return a
	}
	// Minimise |b + h·u − t·r| over h and t (u is a unit vector).
	r := cam.ray(o.Top)
	ur, rr := fr.u.dot(r), r.dot(r)
	det := rr - ur*ur
	if !(det > 1e-15*rr) {
		return a
	}
	a.h = (b.dot(r)*ur - b.dot(fr.u)*rr) / det
	a.x, a.y = b.dot(fr.h1), b.dot(fr.h2)
	t := b.add(fr.u.scale(a.h))
	a.phiRad, a.altRad = fr.azEl(t.sub(s))
	d := s.sub(b)
	a.shadowRad = math.Atan2(d.dot(fr.h2), d.dot(fr.h1))
	a.ok = a.h > 0
	return a
}

// startUps are the up directions the fit starts from: the vertical
// vanishing point (least squares over the vertical lines), the normal of
// the horizon's plane, and each turned about the camera's x axis (in pitch)
// by up to ±20°, because lines that nearly agree in the picture place
// the vanishing point poorly and a fit started far from the truth can stop
// in a false minimum.
func (m *model) startUps() []vec {
	in, cam := m.in, m.cam
	var pairs [][2]vec
	for _, o := range in.Objects {
		pairs = append(pairs, [2]vec{cam.ray(o.Base), cam.ray(o.Top)})
	}
	for _, e := range in.Edges {
		pairs = append(pairs, [2]vec{cam.ray(e.A), cam.ray(e.B)})
	}
	var bases []vec
	if len(pairs) >= 2 {
		bases = append(bases, vanishingPoint(pairs))
	}
	if in.Horizon != nil {
		bases = append(bases, cam.ray(in.Horizon.A).cross(cam.ray(in.Horizon.B)).unit())
	}
	var ups []vec
	for _, u := range bases {
		if u[1] > 0 {
			u = u.scale(-1)
		}
		for _, d := range []float64{0, -2, 2, -4, 4, -7, 7, -11, 11, -15, 15, -20, 20} {
			c, s := math.Cos(d*deg), math.Sin(d*deg)
			ups = append(ups, vec{u[0], c*u[1] - s*u[2], s*u[1] + c*u[2]})
		}
	}
	return ups
}

// start is the closed-form starting point of the fit from the up direction
// u; refusal is set when the marks cannot be placed on the ground at all.
func (m *model) start(u vec) ([]float64, *Refusal) {
	in := m.in
	p := make([]float64, m.n)
	cam := m.cam
	p[0], p[1] = upToParams(u)
	fr := newFrame(upFromParams(p[0], p[1]))
	p[m.iF] = cam.f
	above := &Refusal{Kind: RefuseAboveHorizon}
	var sum vec
	for j, o := range in.Objects {
		a := aloneObject(cam, fr, o)
		if !a.baseOK || !a.tipOK {
			above.Sentence = fmt.Sprintf("the base or shadow tip of %s lies at or above the horizon, so it cannot be on the level ground under the camera", objectName(o, j))
			return nil, above
		}
		i := m.iObj[j]
		p[i], p[i+1], p[i+2] = a.x, a.y, math.Max(a.h, 1e-3)
		sum = sum.add(fr.dir(a.phiRad, a.altRad))
		if m.separate && j > 0 {
			p[i+3], p[i+4] = a.altRad, a.phiRad
		}
	}
	if m.iSun >= 0 {
		if in.Sun != nil {
			sum = cam.ray(in.Sun.Centre)
		}
		p[m.iSun+1], p[m.iSun] = fr.azEl(sum)
	}
	for e, ed := range in.Edges {
		i := m.iEdge[e]
		p[i], p[i+1] = fr.azEl(cam.ray(ed.A))
		_, p[i+2] = fr.azEl(cam.ray(ed.B))
	}
	if m.iHz >= 0 {
		p[m.iHz], _ = fr.azEl(cam.ray(in.Horizon.A))
		p[m.iHz+1], _ = fr.azEl(cam.ray(in.Horizon.B))
	}
	for g, gl := range in.GroundLines {
		from, ok1 := onGround(cam.ray(gl.From), fr.u)
		to, ok2 := onGround(cam.ray(gl.To), fr.u)
		if !ok1 || !ok2 {
			above.Sentence = fmt.Sprintf("a point of ground line %d lies at or above the horizon, so it cannot be on the level ground under the camera", g+1)
			return nil, above
		}
		d := to.sub(from)
		psi := math.Atan2(d.dot(fr.h2), d.dot(fr.h1))
		i := m.iLine[g]
		p[i], p[i+1], p[i+2], p[i+3] = from.dot(fr.h1), from.dot(fr.h2), d.norm(), gl.BearingDeg*deg
		if g == 0 {
			p[m.iH] = gl.BearingDeg*deg - psi
		}
	}
	if len(in.GroundLines) == 0 && in.Heading != nil {
		p[m.iH] = in.Heading.Deg * deg
	}
	return p, nil
}

func objectName(o Object, j int) string {
	if o.Label != "" {
		return fmt.Sprintf("object %q", o.Label)
	}
	return fmt.Sprintf("object %d", j+1)
}

// normalise puts a fitted sun above the horizon: without the sun's disc a
// shadow cannot tell the sun from the point opposite it (alt, φ and −alt,
// φ+180° cast the same tip), and a shadow needs the sun above the horizon.
// The fit may also carry an elevation past ±90°; the direction is
// re-expressed with the elevation in [−90°, 90°] first.
func (m *model) normalise(p []float64) {
	fr := newFrame(upFromParams(p[0], p[1]))
	flip := func(i int, either bool) {
		p[i+1], p[i] = fr.azEl(fr.dir(p[i+1], p[i]))
		if either && p[i] < 0 {
			p[i], p[i+1] = -p[i], p[i+1]+math.Pi
		}
		p[i+1] = angle.Wrap180(p[i+1]/deg) * deg
	}
	if m.iSun >= 0 {
		flip(m.iSun, m.in.Sun == nil)
	}
	if m.separate {
		for j := 1; j < len(m.iObj); j++ {
			flip(m.iObj[j]+3, true)
		}
	}
}

// estimate is the fit and its Monte Carlo, before the refusal gate.
type estimate struct {
	p        []float64
	chi2     float64
	altDeg   float64
	azDeg    float64 // true azimuth, when a bearing reference exists
	altSD    float64
	azSD     float64
	corr     float64
	pitchDeg float64
	rollDeg  float64
	pitchSD  float64
	rollSD   float64
	upSD     float64
	fPx      float64
	fSD      float64
	objects  []ObjectSun
	alone    []objectAlone
	draws    int
}

func attitude(u vec) (pitchDeg, rollDeg float64) {
	return math.Asin(u[2]) / deg, math.Atan2(-u[0], -u[1]) / deg
}

// fitOnce fits the model from its closed-form start.
func fitOnce(in Input) (m *model, p []float64, chi2 float64, ref *Refusal) {
	m = newModel(in, false)
	obs := m.observed()
	// A fit whose chi-square is plausible for its degrees of freedom (below
	// dof + 4·√(2·dof) + 4) needs no other start.
	dof := float64(len(obs) - m.n)
	good := dof + 4*math.Sqrt(2*math.Max(dof, 0)) + 4
	type cand struct {
		p []float64
		c float64
	}
	var cands []cand
	for k, u := range m.startUps() {
		q, r := m.start(u)
		if r != nil {
			ref = r
			continue
		}
		if k == 0 {
			if c := m.fit(q, obs, 200, 1e-15, true); c <= good {
				m.normalise(q)
				return m, q, c, nil
			}
		}
		// A short fit from each start; the best few are then finished.
		cands = append(cands, cand{q, m.fit(q, obs, 8, 1e-6, false)})
	}
	sort.Slice(cands, func(i, j int) bool { return cands[i].c < cands[j].c })
	chi2 = math.Inf(1)
	for _, c := range cands[:min(3, len(cands))] {
		if v := m.fit(c.p, obs, 200, 1e-15, true); v < chi2 {
			p, chi2 = c.p, v
		}
	}
	if p == nil {
		// No start could place the marks on the ground: when the vertical
		// lines all stand at one bearing, that is the reason to give.
		if ups := m.startUps(); len(ups) > 0 {
			if spread, same := sameBearing(in, m.cam, newFrame(ups[0])); same {
				return nil, nil, 0, sameBearingRefusal(spread)
			}
		}
		return nil, nil, 0, ref
	}
	if math.IsInf(chi2, 1) {
		return nil, nil, 0, &Refusal{Kind: RefuseNoFit, Sentence: "the marks do not fit any camera looking at level ground"}
	}
	m.normalise(p)
	return m, p, chi2, nil
}

// run fits the model and draws its Monte Carlo.
func run(in Input) (*estimate, *Refusal) {
	m, p, chi2, ref := fitOnce(in)
	if ref != nil {
		return nil, ref
	}
	obs := m.observed()
	e := &estimate{p: p, chi2: chi2}
	u := upFromParams(p[0], p[1])
	fr := newFrame(u)
	e.pitchDeg, e.rollDeg = attitude(u)
	e.fPx = p[m.iF]
	cam := camera{f: e.fPx, cx: m.cam.cx, cy: m.cam.cy}
	if m.iSun >= 0 {
		e.altDeg = p[m.iSun] / deg
		if m.iH >= 0 {
			e.azDeg = angle.Norm360((p[m.iH] + p[m.iSun+1]) / deg)
		}
	}
	for _, o := range in.Objects {
		e.alone = append(e.alone, aloneObject(cam, fr, o))
	}

	// Parametric Monte Carlo: new observations drawn about the fitted
	// model's values with the stated 1-sigmas, each refitted from the fit.
	hat := make([]float64, len(obs))
	m.predict(p, hat)
	rng := rand.New(rand.NewPCG(seed1, seed2))
	draw := make([]float64, len(obs))
	q := make([]float64, m.n)
	nObj := len(in.Objects)
	var sAlt, sAz, sAltAz, sPitch, sRoll, sUp, sF float64
	oAlt := make([]float64, nObj)
	oAz := make([]float64, nObj)
	for range Draws {
		for i := range obs {
			draw[i] = hat[i] + m.sd[i]*rng.NormFloat64()
		}
		copy(q, p)
		if c := m.fit(q, draw, 50, mcTol, false); math.IsInf(c, 1) {
			continue
		}
		m.normalise(q)
		uq := upFromParams(q[0], q[1])
		pq, rq := attitude(uq)
		dAlt, dAz := 0.0, 0.0
		if m.iSun >= 0 {
			dAlt = q[m.iSun]/deg - e.altDeg
			if m.iH >= 0 {
				dAz = angle.Wrap180((q[m.iH]+q[m.iSun+1])/deg - e.azDeg)
			}
		}
		sAlt += dAlt * dAlt
		sAz += dAz * dAz
		sAltAz += dAlt * dAz
		sPitch += (pq - e.pitchDeg) * (pq - e.pitchDeg)
		sRoll += angle.Wrap180(rq-e.rollDeg) * angle.Wrap180(rq-e.rollDeg)
		sUp += math.Pow(math.Acos(math.Min(1, uq.dot(u)))/deg, 2)
		sF += (q[m.iF] - e.fPx) * (q[m.iF] - e.fPx)
		frq := newFrame(uq)
		camq := camera{f: q[m.iF], cx: m.cam.cx, cy: m.cam.cy}
		for j := range nObj {
			k := 6 * j
			o := Object{Base: Point{draw[k], draw[k+1]}, Top: Point{draw[k+2], draw[k+3]}, Tip: Point{draw[k+4], draw[k+5]}}
			a := aloneObject(camq, frq, o)
			oAlt[j] += math.Pow(a.altRad/deg-e.alone[j].altRad/deg, 2)
			if m.iH >= 0 {
				oAz[j] += math.Pow(angle.Wrap180((a.phiRad-e.alone[j].phiRad+q[m.iH]-p[m.iH])/deg), 2)
			}
		}
		e.draws++
	}
	if e.draws < Draws/2 {
		return nil, &Refusal{Kind: RefuseNoFit, Sentence: "the marks fit too loosely: most Monte Carlo refits failed"}
	}
	nd := float64(e.draws)
	rms := func(s float64) float64 { return math.Sqrt(s / nd) }
	e.altSD, e.azSD = rms(sAlt), rms(sAz)
	if e.altSD > 0 && e.azSD > 0 {
		e.corr = sAltAz / nd / (e.altSD * e.azSD)
	}
	e.pitchSD, e.rollSD, e.upSD, e.fSD = rms(sPitch), rms(sRoll), rms(sUp), rms(sF)
	for j, o := range in.Objects {
		a := e.alone[j]
		os := ObjectSun{Label: o.Label, AltitudeDeg: a.altRad / deg, AltitudeSDDeg: rms(oAlt[j])}
		if m.iH >= 0 {
			os.AzimuthDeg, os.AzimuthSDDeg, os.HasAzimuth = angle.Norm360((a.phiRad+p[m.iH])/deg), rms(oAz[j]), true
		}
		e.objects = append(e.objects, os)
	}
	return e, nil
}

// gate refuses geometry that cannot support an answer.
func gate(in Input, e *estimate) *Refusal {
	m := newModel(in, false)
	u := upFromParams(e.p[0], e.p[1])
	fr := newFrame(u)
	cam := camera{f: e.fPx, cx: m.cam.cx, cy: m.cam.cy}
	if spread, ok := sameBearing(in, cam, fr); ok {
		return sameBearingRefusal(spread)
	}
	if e.upSD > MaxVerticalSDDeg {
		return &Refusal{Kind: RefuseUpUncertain, Sentence: fmt.Sprintf("the vertical direction is too uncertain (±%.1f°, 1-sigma; at most ±%.0f° is used): mark more vertical lines far apart in the picture, or the horizon", e.upSD, MaxVerticalSDDeg)}
	}
	// A point on the ground lies below the horizon; its distance is
	// 1/tan of its depression, so the depression must also clearly exceed
	// its own uncertainty (the marking and the vertical direction's).
	below := func(pt Point, sdPx float64) (at, near bool) {
		_, el := fr.azEl(cam.ray(pt))
		sd := math.Hypot(sdOr(sdPx, DefaultMarkSDPx)/cam.f, e.upSD*deg)
		return el >= 0, -el < MinDepressionSigmas*sd
	}
	nearSentence := fmt.Sprintf("so close to the fitted horizon that its distance cannot be measured (its depression below the horizon is less than %g times its uncertainty)", float64(MinDepressionSigmas))
	for j, o := range in.Objects {
		at1, near1 := below(o.Base, o.SDPx)
		at2, near2 := below(o.Tip, o.SDPx)
		switch {
		case at1 || at2:
			return &Refusal{Kind: RefuseAboveHorizon, Sentence: fmt.Sprintf("the base or shadow tip of %s lies at or above the fitted horizon, so it cannot be on the level ground under the camera", objectName(o, j))}
		case near1 || near2:
			return &Refusal{Kind: RefuseNearHorizon, Sentence: fmt.Sprintf("the base or shadow tip of %s lies %s", objectName(o, j), nearSentence)}
		}
	}
	for g, gl := range in.GroundLines {
		at1, near1 := below(gl.From, gl.SDPx)
		at2, near2 := below(gl.To, gl.SDPx)
		switch {
		case at1 || at2:
			return &Refusal{Kind: RefuseAboveHorizon, Sentence: fmt.Sprintf("a point of ground line %d lies at or above the fitted horizon, so it cannot be on the level ground under the camera", g+1)}
		case near1 || near2:
			return &Refusal{Kind: RefuseNearHorizon, Sentence: fmt.Sprintf("a point of ground line %d lies %s", g+1, nearSentence)}
		}
	}
	if m.iSun >= 0 && e.altSD > MaxAltitudeSDDeg {
		return &Refusal{Kind: RefuseAltitudeUncertain, Sentence: fmt.Sprintf("the marks fix the sun's altitude too loosely (±%.0f°, 1-sigma; at most ±%.0f° is given): mark more objects or the horizon", e.altSD, MaxAltitudeSDDeg)}
	}
	if m.iSun >= 0 {
		if e.p[m.iSun] <= 0 {
			return &Refusal{Kind: RefuseSunBelowHorizon, Sentence: "the sun's disc lies below the fitted horizon"}
		}
		sunRel := e.p[m.iSun+1]
		for j, a := range e.alone {
			if !a.ok || math.Abs(angle.Wrap180((a.shadowRad-sunRel)/deg-180)) > 90 {
				return &Refusal{Kind: RefuseShadowTowardSun, Sentence: fmt.Sprintf("the shadow of %s does not point away from the sun the marks give (or its top is not above its base): check its points", objectName(in.Objects[j], j))}
			}
		}
	}
	return nil
}

func sameBearingRefusal(spreadDeg float64) *Refusal {
	return &Refusal{Kind: RefuseSameBearing, Sentence: fmt.Sprintf("the vertical lines all stand at nearly the same bearing from the camera (within %.1f°), so they nearly coincide in the picture and do not fix the vertical direction: mark a vertical line elsewhere in the picture or the horizon", spreadDeg)}
}

// sameBearing reports whether, with no horizon, all vertical lines stand
// within SameBearingDeg of one another in bearing from the camera, and
// their spread in degrees.
func sameBearing(in Input, cam camera, fr frame) (spreadDeg float64, same bool) {
	if in.Horizon != nil || in.verticalLines() < 2 {
		return 0, false
	}
	var pts []Point
	for _, o := range in.Objects {
		pts = append(pts, o.Base)
	}
	for _, e := range in.Edges {
		pts = append(pts, e.A)
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	ref, _ := fr.azEl(cam.ray(pts[0]))
	for _, p := range pts {
		az, _ := fr.azEl(cam.ray(p))
		d := angle.Wrap180((az - ref) / deg)
		lo, hi = math.Min(lo, d), math.Max(hi, d)
	}
	return hi - lo, hi-lo < SameBearingDeg
}

// lightCheck compares one sun for all objects with a sun for each.
func lightCheck(in Input, e *estimate) *LightCheck {
	n := len(in.Objects)
	if n < 2 {
		return nil
	}
	shared := newModel(in, false)
	sep := newModel(in, true)
	p := make([]float64, sep.n)
	// Carry the shared fit over; each object's own sun starts at the shared one.
	copy(p, e.p[:shared.iObj[0]])
	for j := range n {
		copy(p[sep.iObj[j]:sep.iObj[j]+3], e.p[shared.iObj[j]:shared.iObj[j]+3])
		if j > 0 {
			p[sep.iObj[j]+3], p[sep.iObj[j]+4] = e.p[shared.iSun], e.p[shared.iSun+1]
		}
	}
	rest := shared.iObj[n-1] + 3
	copy(p[sep.iObj[n-1]+5:], e.p[rest:])
	chi2Sep := sep.fit(p, sep.observed(), 200, 1e-10, false)
	lc := &LightCheck{Chi2: math.Max(0, e.chi2-chi2Sep), DOF: 2 * (n - 1)}
	lc.Threshold95 = chi2Quantile(0.95, lc.DOF)
	lc.PValue = chi2Survival(lc.Chi2, lc.DOF)
	lc.Shared = lc.Chi2 <= lc.Threshold95
	if lc.Shared {
		lc.Sentence = "the shadows in this photo agree with one light source"
	} else {
		lc.Sentence = "the shadows in this photo do not share one light source: a possible composite, a mis-marked point, sloping ground or a leaning object"
	}
	return lc
}

// Solve measures the sun's direction from the marks. It returns what the
// marks determine, "not determined" with the reason for the rest, the
// lighting-consistency check when two or more objects are marked, and a
// refusal when the geometry cannot support an answer.
func Solve(in Input) (Result, error) {
	res, _, err := solve(in)
	return res, err
}

// solve is Solve that also hands the tests the estimate behind a refusal.
func solve(in Input) (Result, *estimate, error) {
	if err := in.check(); err != nil {
		return Result{}, nil, err
	}
	res := determine(in)
	if !res.Vertical.Determined {
		return res, nil, nil
	}
	e, ref := run(in)
	if ref == nil {
		ref = gate(in, e)
	}
	if ref != nil {
		res.Refusal = ref
		res.Vertical = Vertical{Reason: ref.Sentence}
		for _, a := range []*Angle{&res.Altitude, &res.Azimuth} {
			if a.Determined {
				*a = Angle{Reason: ref.Sentence}
			}
		}
		return res, e, nil
	}
	res.Vertical.PitchDeg, res.Vertical.RollDeg = e.pitchDeg, e.rollDeg
	res.Vertical.PitchSDDeg, res.Vertical.RollSDDeg, res.Vertical.SDDeg = e.pitchSD, e.rollSD, e.upSD
	res.FocalPx, res.FocalSDPx, res.Draws = e.fPx, e.fSD, e.draws
	if res.Altitude.Determined {
		res.Altitude.Deg, res.Altitude.SDDeg = e.altDeg, e.altSD
		res.Objects = e.objects
		res.Light = lightCheck(in, e)
	}
	if res.Azimuth.Determined {
		res.Azimuth.Deg, res.Azimuth.SDDeg = e.azDeg, e.azSD
		res.Correlation = e.corr
	}
	return res, e, nil
}
