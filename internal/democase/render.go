package democase

import (
	"image"
	"image/color"
	"math"
	"sort"

	"golang.org/x/image/font"
	"golang.org/x/image/font/basicfont"
	"golang.org/x/image/math/fixed"
	"golang.org/x/image/vector"

	"github.com/gnomon-forensics/gnomon/internal/angle"
)

// Image size of every demo photo, pixels.
const (
	ImageWidth  = 640
	ImageHeight = 480
)

// Scene constants, metres (see the package doc for the frame).
const (
	WaterLineM = 40.0 // the quay ends here; water beyond (north)
	nearM      = 0.5  // points closer to the camera plane are not drawn
)

// pose is a pinhole camera: position (m), heading clockwise from true
// north, pitch downward, focal length in pixels.
type pose struct {
	X, Y, Z              float64
	HeadingDeg, PitchDeg float64
	FocalPx              float64
}

// aim is the pose at (x, y, z) looking at the ground point (tx, ty).
func aim(x, y, z, tx, ty, focalPx float64) pose {
	h := angle.Deg(math.Atan2(tx-x, ty-y))
	if h < 0 {
		h += 360
	}
	return pose{X: x, Y: y, Z: z, HeadingDeg: h, PitchDeg: angle.Deg(math.Atan2(z, math.Hypot(tx-x, ty-y))), FocalPx: focalPx}
}

type vec3 struct{ x, y, z float64 }

func (a vec3) sub(b vec3) vec3      { return vec3{a.x - b.x, a.y - b.y, a.z - b.z} }
func (a vec3) add(b vec3) vec3      { return vec3{a.x + b.x, a.y + b.y, a.z + b.z} }
func (a vec3) scale(k float64) vec3 { return vec3{a.x * k, a.y * k, a.z * k} }
func (a vec3) dot(b vec3) float64   { return a.x*b.x + a.y*b.y + a.z*b.z }
func (a vec3) cross(b vec3) vec3 {
	return vec3{a.y*b.z - a.z*b.y, a.z*b.x - a.x*b.z, a.x*b.y - a.y*b.x}
}

// camera is a pose turned into the basis of the package doc.
type camera struct {
	p, f, r, u    vec3
	focal, cx, cy float64
	width, height int
}

func newCamera(ps pose, w, h int) camera {
	psi, th := angle.Rad(ps.HeadingDeg), angle.Rad(ps.PitchDeg)
	f := vec3{math.Sin(psi) * math.Cos(th), math.Cos(psi) * math.Cos(th), -math.Sin(th)}
	r := vec3{math.Cos(psi), -math.Sin(psi), 0}
	return camera{p: vec3{ps.X, ps.Y, ps.Z}, f: f, r: r, u: r.cross(f),
		focal: ps.FocalPx, cx: float64(w) / 2, cy: float64(h) / 2, width: w, height: h}
}

// project returns the image position of x and its depth along the optical
// axis; ok is false for points behind the near plane.
func (c camera) project(x vec3) (u, v, depth float64, ok bool) {
	d := x.sub(c.p)
	depth = d.dot(c.f)
	if depth < nearM {
		return 0, 0, depth, false
	}
	return c.cx + c.focal*d.dot(c.r)/depth, c.cy - c.focal*d.dot(c.u)/depth, depth, true
}

// ray is the direction through the centre of pixel (px, py).
func (c camera) ray(px, py int) vec3 {
	xn := (float64(px) + 0.5 - c.cx) / c.focal
	yn := -(float64(py) + 0.5 - c.cy) / c.focal
	return c.f.add(c.r.scale(xn)).add(c.u.scale(yn))
}

// object is a vertical cylinder standing on the quay.
type object struct {
	Name    string
	X, Y    float64 // base, m
	HeightM float64
	RadiusM float64
	col     color.RGBA
}

// bar is a horizontal bar (fence rail, mast yard, lamp arm) at HeightM.
type bar struct {
	ax, ay, bx, by float64
	HeightM        float64
	halfWidthM     float64
	col            color.RGBA
}

// The quay's furniture. Heights are what an examiner would measure on site
// and write in the sheet.
var sceneObjects = []object{
	{Name: "mast", X: 2, Y: 14, HeightM: 7.5, RadiusM: 0.14, col: color.RGBA{236, 236, 228, 255}},
	{Name: "lamp post", X: -7, Y: 9, HeightM: 4.2, RadiusM: 0.11, col: color.RGBA{38, 70, 52, 255}},
	{Name: "fence post 1", X: -4, Y: 3, HeightM: 1.3, RadiusM: 0.09, col: color.RGBA{112, 78, 46, 255}},
	{Name: "fence post 2", X: -1.5, Y: 3, HeightM: 1.3, RadiusM: 0.09, col: color.RGBA{112, 78, 46, 255}},
	{Name: "fence post 3", X: 1, Y: 3, HeightM: 1.3, RadiusM: 0.09, col: color.RGBA{112, 78, 46, 255}},
	{Name: "fence post 4", X: 3.5, Y: 3, HeightM: 1.3, RadiusM: 0.09, col: color.RGBA{112, 78, 46, 255}},
	{Name: "bollard", X: 7, Y: 0, HeightM: 0.7, RadiusM: 0.2, col: color.RGBA{44, 44, 48, 255}},
}

func sceneBars() []bar {
	rail := color.RGBA{128, 92, 58, 255}
	var bs []bar
	for i := 2; i < 5; i++ {
		a, b := sceneObjects[i], sceneObjects[i+1]
		for _, h := range []float64{0.45, 1.1} {
			bs = append(bs, bar{a.X, a.Y, b.X, b.Y, h, 0.05, rail})
		}
	}
	m, l := sceneObjects[0], sceneObjects[1]
	bs = append(bs,
		bar{m.X - 0.9, m.Y, m.X + 0.9, m.Y, 5.8, 0.05, m.col},        // mast yard
		bar{l.X, l.Y, l.X + 0.7, l.Y, l.HeightM - 0.05, 0.06, l.col}) // lamp arm
	return bs
}

// sunState is what the renderer needs of the sun.
type sunState struct {
	sunny       bool
	azimuthDeg  float64
	altitudeDeg float64 // apparent
}

// shadowDir returns the unit horizontal vector of the shadow bearing
// (sun azimuth + 180°) and the factor 1/tan(altitude) that turns a height
// into a shadow length on level ground.
func (s sunState) shadowDir() (sx, sy, perHeight float64) {
	b := angle.Rad(s.azimuthDeg + 180)
	return math.Sin(b), math.Cos(b), 1 / math.Tan(angle.Rad(s.altitudeDeg))
}

// segDist2 is the squared distance from p to the segment [a, b] in the plane.
func segDist2(px, py, ax, ay, bx, by float64) float64 {
	dx, dy := bx-ax, by-ay
	l2 := dx*dx + dy*dy
	t := 0.0
	if l2 > 0 {
		t = ((px-ax)*dx + (py-ay)*dy) / l2
		if t < 0 {
			t = 0
		} else if t > 1 {
			t = 1
		}
	}
	ex, ey := px-(ax+t*dx), py-(ay+t*dy)
	return ex*ex + ey*ey
}

// painted marks on the quay: a north arrow and the letter N, as segments
// (x0, y0, x1, y1, half-width).
var paint = [][5]float64{
	{-2, -6, -2, -1.3, 0.09},
	{-2.7, -2.4, -2, -1.2, 0.09}, {-1.3, -2.4, -2, -1.2, 0.09},
}

func shade(c color.RGBA, k float64) color.RGBA {
	f := func(v uint8) uint8 { return uint8(math.Max(0, math.Min(255, math.Round(float64(v)*k)))) }
	return color.RGBA{f(c.R), f(c.G), f(c.B), 255}
}

func lerp(a, b color.RGBA, t float64) color.RGBA {
	t = math.Max(0, math.Min(1, t))
	f := func(x, y uint8) uint8 { return uint8(math.Round(float64(x) + (float64(y)-float64(x))*t)) }
	return color.RGBA{f(a.R, b.R), f(a.G, b.G), f(a.B, b.B), 255}
}

// render draws one photo of the quay.
func render(ps pose, sun sunState, caption string) *image.RGBA {
	cam := newCamera(ps, ImageWidth, ImageHeight)
	img := image.NewRGBA(image.Rect(0, 0, ImageWidth, ImageHeight))
	bars := sceneBars()
	var segs []shadowSeg
	if sun.sunny {
		sx, sy, perH := sun.shadowDir()
		segs = shadowSegs(sx, sy, perH, bars)
	}

	skyLow, skyHigh := color.RGBA{206, 224, 238, 255}, color.RGBA{72, 132, 204, 255}
	light := 0.62 + 0.38*math.Sin(angle.Rad(math.Max(sun.altitudeDeg, 0)))
	if !sun.sunny {
		skyLow, skyHigh = color.RGBA{188, 190, 194, 255}, color.RGBA{150, 154, 162, 255}
		light = 0.72
	}
	paving, joint := color.RGBA{178, 172, 160, 255}, color.RGBA{128, 122, 112, 255}
	white, water, kerb := color.RGBA{240, 240, 232, 255}, color.RGBA{46, 92, 112, 255}, color.RGBA{210, 206, 196, 255}

	for py := 0; py < ImageHeight; py++ {
		for px := 0; px < ImageWidth; px++ {
			d := cam.ray(px, py)
			var c color.RGBA
			if d.z >= -1e-9 {
				el := angle.Deg(math.Atan2(d.z, math.Hypot(d.x, d.y)))
				c = lerp(skyLow, skyHigh, el/35)
				img.SetRGBA(px, py, c)
				continue
			}
			t := -cam.p.z / d.z
			gx, gy := cam.p.x+t*d.x, cam.p.y+t*d.y
			dist := math.Hypot(gx-cam.p.x, gy-cam.p.y)
			switch {
			case gy > WaterLineM+0.4:
				c = shade(water, light)
				c = lerp(c, skyLow, (dist-60)/600)
				img.SetRGBA(px, py, c)
				continue
			case gy > WaterLineM:
				c = kerb
			default:
				c = paving
				jw := 0.05 + dist*0.002 // joints widen with distance so they stay visible
				if fx, fy := gx/3-math.Floor(gx/3), gy/3-math.Floor(gy/3); dist < 45 && (fx*3 < jw || fy*3 < jw) {
					c = lerp(paving, joint, 1-dist/45)
				}
				for _, p := range paint {
					if segDist2(gx, gy, p[0], p[1], p[2], p[3]) <= p[4]*p[4] {
						c = white
					}
				}
			}
			k := light
			if sun.sunny && inShadow(gx, gy, segs) {
				k *= 0.42
			}
			img.SetRGBA(px, py, shade(c, k))
		}
	}
	drawObjects(img, cam, bars, light)
	drawCaption(img, caption)
	return img
}

// shadowSeg is the shadow of an object or bar on the ground: the points
// within sqrt(r2) of the segment [a, b] (package doc, "Shadows"), with a
// bounding box for a quick rejection.
type shadowSeg struct {
	ax, ay, bx, by, r2     float64
	minX, maxX, minY, maxY float64
}

func newShadowSeg(ax, ay, bx, by, r float64) shadowSeg {
	return shadowSeg{ax, ay, bx, by, r * r,
		math.Min(ax, bx) - r, math.Max(ax, bx) + r, math.Min(ay, by) - r, math.Max(ay, by) + r}
}

// shadowSegs lists the shadows cast with the shadow direction (sx, sy) and
// length per unit height perH: a cylinder of height h at b casts the
// segment [b, b + h·perH·s]; a bar at height hr is the bar moved by hr·perH·s.
func shadowSegs(sx, sy, perH float64, bars []bar) []shadowSeg {
	var out []shadowSeg
	for _, o := range sceneObjects {
		l := o.HeightM * perH
		out = append(out, newShadowSeg(o.X, o.Y, o.X+l*sx, o.Y+l*sy, o.RadiusM))
	}
	for _, b := range bars {
		l := b.HeightM * perH
		out = append(out, newShadowSeg(b.ax+l*sx, b.ay+l*sy, b.bx+l*sx, b.by+l*sy, b.halfWidthM))
	}
	return out
}

func inShadow(gx, gy float64, segs []shadowSeg) bool {
	for i := range segs {
		s := &segs[i]
		if gx < s.minX || gx > s.maxX || gy < s.minY || gy > s.maxY {
			continue
		}
		if segDist2(gx, gy, s.ax, s.ay, s.bx, s.by) <= s.r2 {
			return true
		}
	}
	return false
}

// fill paints the polygon through the given image points (anti-aliased),
// rasterizing only its bounding box.
func fill(img *image.RGBA, col color.RGBA, pts ...[2]float64) {
	x0, y0, x1, y1 := math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
	for _, p := range pts {
		x0, y0, x1, y1 = math.Min(x0, p[0]), math.Min(y0, p[1]), math.Max(x1, p[0]), math.Max(y1, p[1])
	}
	box := image.Rect(int(math.Floor(x0)), int(math.Floor(y0)), int(math.Ceil(x1))+1, int(math.Ceil(y1))+1).Intersect(img.Bounds())
	if box.Empty() {
		return
	}
	ox, oy := float64(box.Min.X), float64(box.Min.Y)
	z := vector.NewRasterizer(box.Dx(), box.Dy())
	z.MoveTo(float32(pts[0][0]-ox), float32(pts[0][1]-oy))
	for _, p := range pts[1:] {
		z.LineTo(float32(p[0]-ox), float32(p[1]-oy))
	}
	z.ClosePath()
	z.Draw(img, box, image.NewUniform(col), image.Point{})
}

// thickSegment draws the world segment a–b as a band of world half-width hw.
func thickSegment(img *image.RGBA, cam camera, a, b vec3, hw float64, col color.RGBA) {
	ua, va, da, oka := cam.project(a)
	ub, vb, db, okb := cam.project(b)
	if !oka || !okb {
		return
	}
	wa, wb := math.Max(cam.focal*hw/da, 0.6), math.Max(cam.focal*hw/db, 0.6)
	dx, dy := ub-ua, vb-va
	n := math.Hypot(dx, dy)
	if n < 1e-6 {
		return
	}
	nx, ny := -dy/n, dx/n
	fill(img, col, [2]float64{ua + nx*wa, va + ny*wa}, [2]float64{ub + nx*wb, vb + ny*wb},
		[2]float64{ub - nx*wb, vb - ny*wb}, [2]float64{ua - nx*wa, va - ny*wa})
}

// drawObjects paints the furniture over the ground, farthest first.
func drawObjects(img *image.RGBA, cam camera, bars []bar, light float64) {
	type item struct {
		depth float64
		draw  func()
	}
	var items []item
	for _, o := range sceneObjects {
		base, top := vec3{o.X, o.Y, 0}, vec3{o.X, o.Y, o.HeightM}
		_, _, d, ok := cam.project(base)
		if !ok {
			continue
		}
		col := shade(o.col, light)
		items = append(items, item{d, func() { thickSegment(img, cam, base, top, o.RadiusM, col) }})
		if o.Name == "mast" {
			pen := shade(color.RGBA{196, 40, 36, 255}, light)
			items = append(items, item{d - 0.01, func() {
				u0, v0, _, ok0 := cam.project(top)
				u1, v1, _, ok1 := cam.project(vec3{o.X, o.Y, o.HeightM - 0.5})
				u2, v2, _, ok2 := cam.project(vec3{o.X + 0.9, o.Y, o.HeightM - 0.25})
				if ok0 && ok1 && ok2 {
					fill(img, pen, [2]float64{u0, v0}, [2]float64{u1, v1}, [2]float64{u2, v2})
				}
			}})
		}
	}
	for _, b := range bars {
		a, e := vec3{b.ax, b.ay, b.HeightM}, vec3{b.bx, b.by, b.HeightM}
		_, _, d, ok := cam.project(vec3{(b.ax + b.bx) / 2, (b.ay + b.by) / 2, 0})
		if !ok {
			continue
		}
		col := shade(b.col, light)
		items = append(items, item{d - 0.02, func() { thickSegment(img, cam, a, e, b.halfWidthM, col) }})
	}
	sort.SliceStable(items, func(i, j int) bool { return items[i].depth > items[j].depth })
	for _, it := range items {
		it.draw()
	}
}

// drawCaption marks every picture as invented, bottom left.
func drawCaption(img *image.RGBA, text string) {
	face := basicfont.Face7x13
	x, y := 8, ImageHeight-8
	w := font.MeasureString(face, text).Ceil()
	for py := y - 12; py < y+4; py++ {
		for px := x - 4; px < x+w+4; px++ {
			c := img.RGBAAt(px, py)
			img.SetRGBA(px, py, shade(c, 0.35))
		}
	}
	dr := font.Drawer{Dst: img, Src: image.NewUniform(color.RGBA{250, 250, 240, 255}), Face: face,
		Dot: fixed.P(x, y)}
	dr.DrawString(text)
}
