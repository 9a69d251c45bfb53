package marks

import "math"

// vec is a vector in the camera frame: x right, y down, z along the optical
// axis (the frame OpenCV uses), or a homogeneous image point or line.
type vec [3]float64

func (a vec) add(b vec) vec       { return vec{a[0] + b[0], a[1] + b[1], a[2] + b[2]} }
func (a vec) sub(b vec) vec       { return vec{a[0] - b[0], a[1] - b[1], a[2] - b[2]} }
func (a vec) scale(k float64) vec { return vec{k * a[0], k * a[1], k * a[2]} }
func (a vec) dot(b vec) float64   { return a[0]*b[0] + a[1]*b[1] + a[2]*b[2] }
func (a vec) norm() float64       { return math.Sqrt(a.dot(a)) }
func (a vec) unit() vec           { return a.scale(1 / a.norm()) }
func (a vec) cross(b vec) vec {
	return vec{a[1]*b[2] - a[2]*b[1], a[2]*b[0] - a[0]*b[2], a[0]*b[1] - a[1]*b[0]}
}

// frame is the camera's attitude: the up direction u and two horizontal
// directions, h1 along the optical axis's horizontal track and h2 a quarter
// turn clockwise from it seen from above (to the camera's right). A
// direction at relative azimuth φ (clockwise from h1) and elevation ε is
// cos ε (cos φ h1 + sin φ h2) + sin ε u; its true azimuth is the heading of
// h1 plus φ.
type frame struct{ u, h1, h2 vec }

func newFrame(u vec) frame {
	u = u.unit()
	z := vec{0, 0, 1}
	h1 := z.sub(u.scale(z.dot(u))).unit()
	return frame{u: u, h1: h1, h2: h1.cross(u)}
}

func (fr frame) dir(azRad, elRad float64) vec {
	c := math.Cos(elRad)
	return fr.h1.scale(c * math.Cos(azRad)).add(fr.h2.scale(c * math.Sin(azRad))).add(fr.u.scale(math.Sin(elRad)))
}

// azEl is the inverse of dir for any vector.
func (fr frame) azEl(v vec) (azRad, elRad float64) {
	v = v.unit()
	return math.Atan2(v.dot(fr.h2), v.dot(fr.h1)), math.Asin(math.Max(-1, math.Min(1, v.dot(fr.u))))
}

// upFromParams maps the two up-direction parameters to the up vector.
// u = (a, −1, b)/|…| covers every attitude with the picture's top above its
// bottom (|pitch| and |roll| below 90°).
func upFromParams(a, b float64) vec { return vec{a, -1, b}.unit() }

func upToParams(u vec) (a, b float64) { return u[0] / -u[1], u[2] / -u[1] }

// camera is the pinhole model: focal length f and principal point (cx, cy).
type camera struct{ f, cx, cy float64 }

// ray is the direction, in the camera frame, of the light arriving at p.
func (c camera) ray(p Point) vec { return vec{(p.X - c.cx) / c.f, (p.Y - c.cy) / c.f, 1} }

// project returns the pixel position of the point or direction v, and false
// when v lies behind the camera.
func (c camera) project(v vec) (Point, bool) {
	if !(v[2] > 0 && v[2]*v[2] > 1e-24*v.dot(v)) {
		return Point{}, false
	}
	return Point{c.cx + c.f*v[0]/v[2], c.cy + c.f*v[1]/v[2]}, true
}

// onGround returns the point where the ray r meets the ground plane
// {X : X·u = −1} (the camera one unit above it), and false when the ray
// does not descend (the point is at or above the horizon).
func onGround(r, u vec) (vec, bool) {
	d := r.dot(u)
	if !(d < 0) {
		return vec{}, false
	}
	return r.scale(-1 / d), true
}

// vanishingPoint returns the unit direction v minimising Σ (l_i·v)² over
// the lines through the given pairs of rays (each l_i normalised), that is
// the least-squares meeting point of the lines in the image (Criminisi,
// Reid and Zisserman 2000, §3: vanishing points from several lines).
func vanishingPoint(pairs [][2]vec) vec {
	var m [3][3]float64
	for _, pq := range pairs {
		l := pq[0].cross(pq[1])
		l = l.scale(1 / math.Hypot(l[0], l[1]))
		for i := range 3 {
			for j := range 3 {
				m[i][j] += l[i] * l[j]
			}
		}
	}
	return smallestEigenvector(m)
}

// smallestEigenvector of a symmetric 3×3 matrix, by cyclic Jacobi
// rotations (Golub and Van Loan, Matrix Computations, §8.5).
func smallestEigenvector(a [3][3]float64) vec {
	v := [3][3]float64{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}
	for sweep := 0; sweep < 50; sweep++ {
		off := a[0][1]*a[0][1] + a[0][2]*a[0][2] + a[1][2]*a[1][2]
		if off < 1e-300 {
			break
		}
		for p := 0; p < 2; p++ {
			for q := p + 1; q < 3; q++ {
				if a[p][q] == 0 {
					continue
				}
				theta := (a[q][q] - a[p][p]) / (2 * a[p][q])
				t := math.Copysign(1, theta) / (math.Abs(theta) + math.Sqrt(theta*theta+1))
				c := 1 / math.Sqrt(t*t+1)
				s := t * c
				for k := range 3 {
					akp, akq := a[k][p], a[k][q]
					a[k][p], a[k][q] = c*akp-s*akq, s*akp+c*akq
				}
				for k := range 3 {
					apk, aqk := a[p][k], a[q][k]
					a[p][k], a[q][k] = c*apk-s*aqk, s*apk+c*aqk
				}
				for k := range 3 {
					vkp, vkq := v[k][p], v[k][q]
					v[k][p], v[k][q] = c*vkp-s*vkq, s*vkp+c*vkq
				}
			}
		}
	}
	best := 0
	for i := 1; i < 3; i++ {
		if a[i][i] < a[best][best] {
			best = i
		}
	}
	return vec{v[0][best], v[1][best], v[2][best]}.unit()
}

// DipDeg is the dip of the sea horizon, in degrees, seen from heightM
// metres above the surface: the angle by which the visible horizon lies
// below the true horizontal, with standard terrestrial refraction. The
// Nautical Almanac's formula: dip = 1.76′ √h with h in metres (0.97′ √h
// with h in feet).
func DipDeg(heightM float64) float64 { return 1.76 / 60 * math.Sqrt(heightM) }
