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
// Observations: every marked coordinate in pixels, then the priors (focal
// length, each ground line's bearing, the heading), each with its 1-sigma.
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

	sd   []float64 // 1-sigma of each observation
	wrap []bool    // observation is an angle in radians (difference wrapped)
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
	for j := range in.Objects {
		m.iObj = append(m.iObj, n)
		n += 3
		if separate && j > 0 {
			n += 2
		}
	}
	for range in.Edges {
		m.iEdge = append(m.iEdge, n)
		n += 3
	}
	if in.Horizon != nil {
		m.iHz, n = n, n+2
	}
	for range in.GroundLines {
		m.iLine = append(m.iLine, n)
		n += 4
	}
	m.n = n

	add := func(sd float64, k int) {
		for range k {
			m.sd = append(m.sd, sd)
			m.wrap = append(m.wrap, false)
		}
	}
	for _, o := range in.Objects {
		add(sdOr(o.SDPx, DefaultMarkSDPx), 6)
	}
	for _, e := range in.Edges {
		add(sdOr(e.SDPx, DefaultMarkSDPx), 4)
	}
	if h := in.Horizon; h != nil {
		add(sdOr(h.SDPx, DefaultMarkSDPx), 4)
	}
	for _, g := range in.GroundLines {
		add(sdOr(g.SDPx, DefaultMarkSDPx), 4)
	}
	if s := in.Sun; s != nil {
		add(sdOr(s.SDPx, DefaultMarkSDPx), 2)
	}
	add(sdOr(in.Camera.FocalSDPx, 1e-6*in.Camera.FocalPx), 1)
	for _, g := range in.GroundLines {
		add(sdOr(g.BearingSDDeg, DefaultBearingSDDeg)*deg, 1)
		m.wrap[len(m.wrap)-1] = true
	}
	if h := in.Heading; h != nil {
		add(sdOr(h.SDDeg, DefaultHeadingSDDeg)*deg, 1)
		m.wrap[len(m.wrap)-1] = true
	}
	return m
}

// observed returns the observation vector of the input.
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
	}
	if s := m.in.Sun; s != nil {
		pt(s.Centre)
	}
	o = append(o, m.in.Camera.FocalPx)
	for _, g := range m.in.GroundLines {
		o = append(o, g.BearingDeg*deg)
	}
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

// predict writes the model's value of every observation into out, and
// returns false when a marked point would lie behind the camera.
func (m *model) predict(p []float64, out []float64) bool {
	fr := newFrame(upFromParams(p[0], p[1]))
	cam := camera{f: p[m.iF], cx: m.cam.cx, cy: m.cam.cy}
	ok := true
	k := 0
	put := func(vs ...vec) {
		for _, v := range vs {
			q, front := cam.project(v)
			ok = ok && front
			out[k], out[k+1] = q.X, q.Y
			k += 2
		}
	}
	ground := func(x, y float64) vec { return fr.u.scale(-1).add(fr.h1.scale(x)).add(fr.h2.scale(y)) }
	for j := range m.in.Objects {
		i := m.iObj[j]
		b := ground(p[i], p[i+1])
		h := p[i+2]
		alt, phi := m.sunOf(p, j)
		t := b.add(fr.u.scale(h))
		// The tip is where the ray from the top away from the sun meets
		// the ground: h/tan(alt) from the base, opposite the sun.
		s := b.sub(fr.dir(phi, 0).scale(h / math.Tan(alt)))
		put(b, t, s)
	}
	for e := range m.in.Edges {
		i := m.iEdge[e]
		put(fr.dir(p[i], p[i+1]), fr.dir(p[i], p[i+2]))
	}
	if m.iHz >= 0 {
		put(fr.dir(p[m.iHz], -m.dipRad), fr.dir(p[m.iHz+1], -m.dipRad))
	}
	for g := range m.in.GroundLines {
		i := m.iLine[g]
		from := ground(p[i], p[i+1])
		psi := p[i+3] - p[m.iH]
		put(from, from.add(fr.dir(psi, 0).scale(p[i+2])))
	}
	if m.in.Sun != nil {
		put(fr.dir(p[m.iSun+1], p[m.iSun]))
	}
	out[k] = p[m.iF]
	k++
	for g := range m.in.GroundLines {
		out[k] = p[m.iLine[g]+3]
		k++
	}
	if m.in.Heading != nil {
		out[k] = p[m.iH]
	}
	return ok
}

// residuals writes (model − observed)/sd and returns the sum of squares
// (the chi-square of the fit), +Inf when the model is not valid there.
func (m *model) residuals(p, obs, pred, r []float64) float64 {
	if !m.predict(p, pred) {
		return math.Inf(1)
	}
	var c float64
	for i := range obs {
		d := pred[i] - obs[i]
		if m.wrap[i] {
			d = angle.Wrap180(d/deg) * deg
		}
		r[i] = d / m.sd[i]
		c += r[i] * r[i]
	}
	if math.IsNaN(c) {
		return math.Inf(1)
	}
	return c
}

// fit refines p in place by Levenberg–Marquardt (Hartley and Zisserman,
// appendix 6.2) with a forward-difference Jacobian, and returns the final
// chi-square. It stops when a step no longer changes the parameters.
func (m *model) fit(p, obs []float64, maxIter int) float64 {
	nObs, n := len(obs), m.n
	pred := make([]float64, nObs)
	r := make([]float64, nObs)
	rr := make([]float64, nObs)
	jac := make([]float64, nObs*n)
	a := make([]float64, n*n)
	g := make([]float64, n)
	step := make([]float64, n)
	trial := make([]float64, n)
	cost := m.residuals(p, obs, pred, r)
	if math.IsInf(cost, 1) {
		return cost
	}
	lambda := 1e-3
	for it := 0; it < maxIter; it++ {
		for j := range n {
			h := 1e-7 * math.Max(1, math.Abs(p[j]))
			old := p[j]
			p[j] = old + h
			c := m.residuals(p, obs, pred, rr)
			p[j] = old
			if math.IsInf(c, 1) {
				h = -h
				p[j] = old + h
				m.residuals(p, obs, pred, rr)
				p[j] = old
			}
			for i := range nObs {
				jac[i*n+j] = (rr[i] - r[i]) / h
			}
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
			if !solveDamped(a, g, lambda, n, step) {
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
				cost = c
				lambda = math.Max(lambda/10, 1e-12)
				improved = true
				break
			}
			lambda *= 10
		}
		if !improved {
			break
		}
	}
	return cost
}

// solveDamped solves (A + λ·diag(A)) x = g by Cholesky, with A's upper
// triangle given; false when the matrix is not positive definite.
func solveDamped(a, g []float64, lambda float64, n int, x []float64) bool {
	l := make([]float64, n*n)
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
