package marks

import (
	"math"

	"github.com/gnomon-forensics/gnomon/internal/angle"
)

const deg = math.Pi / 180

// model is the pinhole scene the marks are fitted to. The camera stands one
// unit above level ground (the scale of the scene cannot be seen and does
// not matter); its up direction is u(a, b). Parameters, in order:
//
//	a, b                up direction (upFromParams)
//	alt, φ              the sun's elevation and relative azimuth, when any object or the sun's disc is marked
//	f                   focal length, pixels (with the EXIF value as a prior)
//	H                   true heading of h1, when a bearing reference exists
//	per object          base (x, y) on the ground along h1, h2; height h;
//	                    and, in the separate-suns model, alt and φ of its own (all but the first object)
//	per vertical edge   relative azimuth of its vertical plane; elevations of its two points
//	per horizon point   relative azimuth
//	per ground line     From (x, y) on the ground, length L, true bearing
//
// The parameters after H belong each to one element (an object, an edge,
// the horizon, a ground line), which alone they move: the Jacobian uses
// that. Observations, element by element: the marked coordinates in pixels,
// a ground line's bearing, the sun's disc, and the priors of the focal
// length and the heading, each with its 1-sigma.
type model struct {
	cam      camera
	in       Input
	dipRad   float64
	separate bool

	iSun, iF, iH int // −1 when absent
	iObj         []int
	iEdge        []int
	iHz          int
	iLine        []int
	n            int
	nGlobal      int

	elems []element
	owner []int     // element of each parameter, −1 for the globals
	sd    []float64 // 1-sigma of each observation
	wrap  []bool    // observation is an angle in radians (difference wrapped)
	nObs  int
	work  []float64 // scratch of fit, reused from one fit to the next
}

// element is a group of observations with the parameters of its own.
type element struct {
	obs0, nObs int
	eval       func(g *state, p, out []float64) bool
}

// state is what every element needs from the global parameters.
type state struct {
	fr  frame
	cam camera
}

func sdOr(v, def float64) float64 {
	if v > 0 {
		return v
	}
	return def
}

func newModel(in Input, separate bool) *model {
	m := &model{in: in, separate: separate, iSun: -1, iH: -1, iHz: -1}
	m.cam = camera{f: in.Camera.FocalPx, cx: float64(in.Camera.WidthPx) / 2, cy: float64(in.Camera.HeightPx) / 2}
	if in.Horizon != nil {
		m.dipRad = DipDeg(in.Horizon.CameraHeightM) * deg
	}
	n := 2
	if len(in.Objects) > 0 || in.Sun != nil {
		m.iSun, n = n, n+2
	}
	m.iF, n = n, n+1
	if len(in.GroundLines) > 0 || in.Heading != nil {
		m.iH, n = n, n+1
	}
	m.nGlobal = n
	for range n {
		m.owner = append(m.owner, -1)
	}
	// add registers an element with k own parameters and its observations'
	// 1-sigmas, and returns the index of its first parameter.
	add := func(k int, sds []float64, wrap []bool, eval func(g *state, p, out []float64) bool) int {
		first := n
		for range k {
			m.owner = append(m.owner, len(m.elems))
		}
		n += k
		m.elems = append(m.elems, element{obs0: len(m.sd), nObs: len(sds), eval: eval})
		m.sd = append(m.sd, sds...)
		if wrap == nil {
			wrap = make([]bool, len(sds))
		}
		m.wrap = append(m.wrap, wrap...)
		return first
	}
	rep := func(v float64, k int) []float64 {
		s := make([]float64, k)
		for i := range s {
			s[i] = v
		}
		return s
	}
	for j, o := range in.Objects {
		k := 3
		if separate && j > 0 {
			k = 5
		}
		m.iObj = append(m.iObj, add(k, rep(sdOr(o.SDPx, DefaultMarkSDPx), 6), nil, func(g *state, p, out []float64) bool {
			i := m.iObj[j]
			b := ground(g.fr, p[i], p[i+1])
			h := p[i+2]
			alt, phi := m.sunOf(p, j)
			// The tip is where the ray from the top away from the sun
			// meets the ground: h/tan(alt) from the base, opposite the sun.
			s := b.sub(g.fr.dir(phi, 0).scale(h / math.Tan(alt)))
			return put(g.cam, out, b, b.add(g.fr.u.scale(h)), s)
		}))
	}
	for e, ed := range in.Edges {
		m.iEdge = append(m.iEdge, add(3, rep(sdOr(ed.SDPx, DefaultMarkSDPx), 4), nil, func(g *state, p, out []float64) bool {
			i := m.iEdge[e]
			return put(g.cam, out, g.fr.dir(p[i], p[i+1]), g.fr.dir(p[i], p[i+2]))
		}))
	}
	if h := in.Horizon; h != nil {
		m.iHz = add(2, rep(sdOr(h.SDPx, DefaultMarkSDPx), 4), nil, func(g *state, p, out []float64) bool {
			return put(g.cam, out, g.fr.dir(p[m.iHz], -m.dipRad), g.fr.dir(p[m.iHz+1], -m.dipRad))
		})
	}
	for l, gl := range in.GroundLines {
		sds := append(rep(sdOr(gl.SDPx, DefaultMarkSDPx), 4), sdOr(gl.BearingSDDeg, DefaultBearingSDDeg)*deg)
		m.iLine = append(m.iLine, add(4, sds, []bool{false, false, false, false, true}, func(g *state, p, out []float64) bool {
			i := m.iLine[l]
			from := ground(g.fr, p[i], p[i+1])
			psi := p[i+3] - p[m.iH]
			out[4] = p[i+3]
			return put(g.cam, out, from, from.add(g.fr.dir(psi, 0).scale(p[i+2])))
		}))
	}
	if s := in.Sun; s != nil {
		add(0, rep(sdOr(s.SDPx, DefaultMarkSDPx), 2), nil, func(g *state, p, out []float64) bool {
			return put(g.cam, out, g.fr.dir(p[m.iSun+1], p[m.iSun]))
		})
	}
	add(0, []float64{sdOr(in.Camera.FocalSDPx, 1e-6*in.Camera.FocalPx)}, nil, func(g *state, p, out []float64) bool {
		out[0] = p[m.iF]
		return true
	})
	if h := in.Heading; h != nil {
		add(0, []float64{sdOr(h.SDDeg, DefaultHeadingSDDeg) * deg}, []bool{true}, func(g *state, p, out []float64) bool {
			out[0] = p[m.iH]
			return true
		})
	}
	m.n = n
	m.nObs = len(m.sd)
	return m
}

func ground(fr frame, x, y float64) vec {
	return fr.u.scale(-1).add(fr.h1.scale(x)).add(fr.h2.scale(y))
}

// put projects the points or directions vs into out, two values each, and
// returns false when one lies behind the camera.
func put(cam camera, out []float64, vs ...vec) bool {
	ok := true
	for k, v := range vs {
		q, front := cam.project(v)
		ok = ok && front
		out[2*k], out[2*k+1] = q.X, q.Y
	}
	return ok
}

// observed returns the observation vector of the input, in the elements'
// order.
func (m *model) observed() []float64 {
	var o []float64
	pt := func(ps ...Point) {
		for _, p := range ps {
			o = append(o, p.X, p.Y)
		}
	}
	for _, ob := range m.in.Objects {
		pt(ob.Base, ob.Top, ob.Tip)
	}
	for _, e := range m.in.Edges {
		pt(e.A, e.B)
	}
	if h := m.in.Horizon; h != nil {
		pt(h.A, h.B)
	}
	for _, g := range m.in.GroundLines {
		pt(g.From, g.To)
		o = append(o, g.BearingDeg*deg)
	}
	if s := m.in.Sun; s != nil {
		pt(s.Centre)
	}
	o = append(o, m.in.Camera.FocalPx)
	if h := m.in.Heading; h != nil {
		o = append(o, h.Deg*deg)
	}
	return o
}

// sunOf returns the elevation and relative azimuth of the sun that lights
// object j.
func (m *model) sunOf(p []float64, j int) (alt, phi float64) {
	if m.separate && j > 0 {
		k := m.iObj[j] + 3
		return p[k], p[k+1]
	}
	return p[m.iSun], p[m.iSun+1]
}

func (m *model) state(p []float64) state {
	return state{fr: newFrame(upFromParams(p[0], p[1])), cam: camera{f: p[m.iF], cx: m.cam.cx, cy: m.cam.cy}}
}

// predict writes the model's value of every observation into out, and
// returns false when a marked point would lie behind the camera.
func (m *model) predict(p []float64, out []float64) bool {
	g := m.state(p)
	ok := true
	for _, e := range m.elems {
		ok = e.eval(&g, p, out[e.obs0:e.obs0+e.nObs]) && ok
	}
	return ok
}

// resid turns predictions into weighted residuals for observations
// [from, to) and returns their sum of squares.
func (m *model) resid(obs, pred, r []float64, from, to int) float64 {
	var c float64
	for i := from; i < to; i++ {
		d := pred[i] - obs[i]
		if m.wrap[i] {
			d = angle.Wrap180(d/deg) * deg
		}
		r[i] = d / m.sd[i]
		c += r[i] * r[i]
	}
	return c
}

// residuals writes (model − observed)/sd and returns the sum of squares
// (the chi-square of the fit), +Inf when the model is not valid there.
func (m *model) residuals(p, obs, pred, r []float64) float64 {
	if !m.predict(p, pred) {
		return math.Inf(1)
	}
	c := m.resid(obs, pred, r, 0, len(obs))
	if math.IsNaN(c) {
		return math.Inf(1)
	}
	return c
}

// fit refines p in place by Levenberg–Marquardt (Hartley and Zisserman,
// appendix 6.2) with a forward-difference Jacobian (central differences
// when central is set: slower, but exact to the last digits even where the
// geometry is poorly conditioned), and returns the final
// chi-square. It stops when a step lowers the chi-square by less than
// relTol of itself, or no longer changes the parameters.
func (m *model) fit(p, obs []float64, maxIter int, relTol float64, central bool) float64 {
	nObs, n := len(obs), m.n
	if len(m.work) != 4*nObs+nObs*n+2*n*n+3*n {
		m.work = make([]float64, 4*nObs+nObs*n+2*n*n+3*n)
	}
	w := m.work
	take := func(k int) []float64 {
		s := w[:k:k]
		w = w[k:]
		return s
	}
	pred, r, rr, rm := take(nObs), take(nObs), take(nObs), take(nObs)
	jac, a, chol := take(nObs*n), take(n*n), take(n*n)
	g, step, trial := take(n), take(n), take(n)
	cost := m.residuals(p, obs, pred, r)
	if math.IsInf(cost, 1) {
		return cost
	}
	lambda := 1e-3
	for it := 0; it < maxIter; it++ {
		clear(jac)
		st := m.state(p)
		for j := range n {
			m.column(st, p, obs, pred, r, rr, rm, jac, j, central)
		}
		for j := range n {
			g[j] = 0
			for k := range n {
				a[j*n+k] = 0
			}
		}
		for i := range nObs {
			row := jac[i*n : (i+1)*n]
			for j := range n {
				if row[j] == 0 {
					continue
				}
				g[j] += row[j] * r[i]
				for k := j; k < n; k++ {
					a[j*n+k] += row[j] * row[k]
				}
			}
		}
		improved := false
		for lambda < 1e12 {
			if !solveDamped(a, g, lambda, n, step, chol) {
				lambda *= 10
				continue
			}
			small := true
			for j := range n {
				trial[j] = p[j] - step[j]
				if math.Abs(step[j]) > 1e-13*math.Max(1, math.Abs(p[j])) {
					small = false
				}
			}
			if small {
				return cost
			}
			c := m.residuals(trial, obs, pred, rr)
			if c <= cost {
				copy(p, trial)
				copy(r, rr)
				done := cost-c <= relTol*cost
				cost = c
				if done {
					return cost
				}
				lambda = math.Max(lambda/10, 1e-12)
				improved = true
				break
			}
			lambda *= 10
		}
		if !improved {
			break
		}
		m.predict(p, pred)
	}
	return cost
}

// column fills column j of the Jacobian of the residuals at p, whose
// predictions and residuals are pred and r; rr and rm are scratch.
func (m *model) column(st state, p, obs, pred, r, rr, rm, jac []float64, j int, central bool) {
	n, nObs := m.n, len(obs)
	h := 1e-7 * math.Max(1, math.Abs(p[j]))
	if central {
		h = 1e-5 * math.Max(1, math.Abs(p[j]))
	}
	old := p[j]
	from, to := 0, nObs
	eval := func(v float64, out []float64) bool {
		p[j] = v
		defer func() { p[j] = old }()
		if e := m.owner[j]; e >= 0 {
			// A parameter of one element moves only its observations.
			el := m.elems[e]
			from, to = el.obs0, el.obs0+el.nObs
			if !el.eval(&st, p, out[from:to]) {
				return false
			}
			m.resid(obs, out, out, from, to)
			return true
		}
		return !math.IsInf(m.residuals(p, obs, out, out), 1)
	}
	switch {
	case central && eval(old+h, rr) && eval(old-h, rm):
		for i := from; i < to; i++ {
			jac[i*n+j] = (rr[i] - rm[i]) / (2 * h)
		}
	case eval(old+h, rr):
		for i := from; i < to; i++ {
			jac[i*n+j] = (rr[i] - r[i]) / h
		}
	default:
		eval(old-h, rr)
		for i := from; i < to; i++ {
			jac[i*n+j] = (r[i] - rr[i]) / h
		}
	}
}

// solveDamped solves (A + λ·diag(A)) x = g by Cholesky, with A's upper
// triangle given, using l for the factor; false when the matrix is not positive definite.
func solveDamped(a, g []float64, lambda float64, n int, x, l []float64) bool {
	for i := range n {
		for j := 0; j <= i; j++ {
			s := a[j*n+i]
			if i == j {
				s += lambda*a[i*n+i] + 1e-300
			}
			for k := range j {
				s -= l[i*n+k] * l[j*n+k]
			}
			if i == j {
				if !(s > 0) {
					return false
				}
				l[i*n+i] = math.Sqrt(s)
			} else {
				l[i*n+j] = s / l[j*n+j]
			}
		}
	}
	for i := range n {
		s := g[i]
		for k := range i {
			s -= l[i*n+k] * x[k]
		}
		x[i] = s / l[i*n+i]
	}
	for i := n - 1; i >= 0; i-- {
		s := x[i]
		for k := i + 1; k < n; k++ {
			s -= l[k*n+i] * x[k]
		}
		x[i] = s / l[i*n+i]
	}
	return true
}
