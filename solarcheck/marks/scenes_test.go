package marks

import (
	"bufio"
	"encoding/csv"
	"fmt"
	"io"
	"math/rand/v2"
	"os"
	"strconv"
	"strings"
	"testing"
)

// scene is one row of testdata/scenes_opencv.csv: the truth of a synthetic
// photo and its marks as OpenCV projected them (see gen_scenes.py).
type scene struct {
	id                                   int
	kind                                 string
	w, h                                 int
	f35, fPx, pitch, roll, heading, camH float64
	alt, az                              float64
	obj                                  [3][3]Point // base, top, tip
	edge, hz, gl                         *[2]Point
	glBearing                            float64
	sun                                  *Point
	rot                                  map[int]Point // object 3's tip, its shadow turned by 10, 20, 40°
	slopeTip                             *Point        // object 3's tip on ground sloping 2°
	leanTop, leanTip                     *Point        // object 3 leaning 2°
}

const scenesFile = "testdata/scenes_opencv.csv"

func loadScenes(t testing.TB) (header string, scenes []scene) {
	t.Helper()
	f, err := os.Open(scenesFile)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	br := bufio.NewReader(f)
	header, err = br.ReadString('\n')
	if err != nil || !strings.HasPrefix(header, "# OpenCV") {
		t.Fatalf("%s: want a '# OpenCV …' header line, got %q (%v)", scenesFile, header, err)
	}
	r := csv.NewReader(br)
	cols, err := r.Read()
	if err != nil {
		t.Fatal(err)
	}
	for line := 3; ; line++ {
		rec, err := r.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("%s:%d: %v", scenesFile, line, err)
		}
		row := map[string]string{}
		for i, c := range cols {
			row[c] = rec[i]
		}
		num := func(c string) float64 {
			v, err := strconv.ParseFloat(row[c], 64)
			if err != nil {
				t.Fatalf("%s:%d: column %s: %v", scenesFile, line, c, err)
			}
			return v
		}
		pt := func(prefix string) Point { return Point{num(prefix + "x"), num(prefix + "y")} }
		pair := func(a, b string) *[2]Point {
			if row[a+"x"] == "" {
				return nil
			}
			return &[2]Point{pt(a), pt(b)}
		}
		s := scene{id: int(num("scene")), kind: row["kind"], w: int(num("width")), h: int(num("height")),
			f35: num("f35"), fPx: num("f_px"), pitch: num("pitch"), roll: num("roll"), heading: num("heading"),
			camH: num("cam_h"), alt: num("sun_alt"), az: num("sun_az"), rot: map[int]Point{}}
		for i := range 3 {
			for k, n := range "bts" {
				s.obj[i][k] = pt(fmt.Sprintf("o%d_%c", i+1, n))
			}
		}
		s.edge = pair("e_a", "e_b")
		s.hz = pair("hz_a", "hz_b")
		if s.gl = pair("gl_a", "gl_b"); s.gl != nil {
			s.glBearing = num("gl_bearing")
		}
		if row["sun_x"] != "" {
			p := pt("sun_")
			s.sun = &p
		}
		for _, d := range []int{10, 20, 40} {
			if row[fmt.Sprintf("o3_rot%d_sx", d)] != "" {
				s.rot[d] = pt(fmt.Sprintf("o3_rot%d_s", d))
			}
		}
		if p := pair("o3_lean2_t", "o3_lean2_s"); p != nil {
			s.leanTop, s.leanTip = &p[0], &p[1]
		}
		if row["o3_slope2_sx"] != "" {
			p := pt("o3_slope2_s")
			s.slopeTip = &p
		}
		scenes = append(scenes, s)
	}
	return header, scenes
}

// combo picks which of a scene's marks an input uses.
type combo struct {
	objects                     int
	edge, horizon, ground, head bool
	sun                         bool
}

func (c combo) String() string {
	var s []string
	s = append(s, fmt.Sprintf("%d obj", c.objects))
	for _, x := range []struct {
		on   bool
		name string
	}{{c.edge, "edge"}, {c.horizon, "horizon"}, {c.ground, "ground line"}, {c.head, "heading"}, {c.sun, "sun"}} {
		if x.on {
			s = append(s, x.name)
		}
	}
	return strings.Join(s, "+")
}

// combos lists every combination of marks the scene has.
func (s scene) combos() []combo {
	var out []combo
	for n := 0; n <= 3; n++ {
		for bits := range 32 {
			c := combo{objects: n, edge: bits&1 != 0, horizon: bits&2 != 0, ground: bits&4 != 0, head: bits&8 != 0, sun: bits&16 != 0}
			if (c.edge && s.edge == nil) || (c.horizon && s.hz == nil) || (c.ground && s.gl == nil) || (c.sun && s.sun == nil) {
				continue
			}
			out = append(out, c)
		}
	}
	return out
}

// noise is what the noisy tests add: marking noise on every point (px),
// a relative error of the focal length's prior, and the errors of the
// ground line's bearing and the heading (degrees), each 1-sigma.
type noise struct {
	px, focalFrac, bearingDeg, headingDeg float64
	rng                                   *rand.Rand
}

func (n noise) jitter(p Point) Point {
	if n.rng == nil {
		return p
	}
	return Point{p.X + n.px*n.rng.NormFloat64(), p.Y + n.px*n.rng.NormFloat64()}
}

func (n noise) gauss(sd float64) float64 {
	if n.rng == nil {
		return 0
	}
	return sd * n.rng.NormFloat64()
}

// input builds the marks of combination c, with noise n (zero: exact).
func (s scene) input(c combo, n noise) Input {
	sd := n.px
	if sd == 0 {
		sd = 1e-6
	}
	focalSD := n.focalFrac * s.fPx
	if focalSD == 0 {
		focalSD = 1e-6 * s.fPx
	}
	in := Input{Camera: Camera{WidthPx: s.w, HeightPx: s.h, FocalPx: s.fPx + n.gauss(focalSD), FocalSDPx: focalSD}}
	for i := range c.objects {
		o := s.obj[i]
		in.Objects = append(in.Objects, Object{Label: fmt.Sprint(i + 1), Base: n.jitter(o[0]), Top: n.jitter(o[1]), Tip: n.jitter(o[2]), SDPx: sd})
	}
	if c.edge {
		in.Edges = []Edge{{A: n.jitter(s.edge[0]), B: n.jitter(s.edge[1]), SDPx: sd}}
	}
	if c.horizon {
		in.Horizon = &Horizon{A: n.jitter(s.hz[0]), B: n.jitter(s.hz[1]), SDPx: sd, CameraHeightM: s.camH}
	}
	if c.ground {
		bsd := n.bearingDeg
		if bsd == 0 {
			bsd = 1e-6
		}
		in.GroundLines = []GroundLine{{From: n.jitter(s.gl[0]), To: n.jitter(s.gl[1]), SDPx: sd, BearingDeg: s.glBearing + n.gauss(bsd), BearingSDDeg: bsd}}
	}
	if c.head {
		hsd := n.headingDeg
		if hsd == 0 {
			hsd = 1e-6
		}
		in.Heading = &Heading{Deg: s.heading + n.gauss(hsd), SDDeg: hsd, Source: "test"}
	}
	if c.sun {
		p := n.jitter(*s.sun)
		in.Sun = &SunDisc{Centre: p, SDPx: sd}
	}
	return in
}
