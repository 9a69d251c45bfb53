package marks

import (
	"errors"
	"math"
	"math/rand/v2"
	"reflect"
	"strings"
	"testing"
)

// TestSameBearingRefused: the generator's "same_bearing" scenes put two
// objects within 1° of one another in bearing from the camera; with only
// those two marked, the vertical direction is not fixed and the answer is
// refused with that reason (cv2.projectPoints, testdata/gen_scenes.py).
func TestSameBearingRefused(t *testing.T) {
	_, scenes := loadScenes(t)
	rng := rand.New(rand.NewPCG(2026, 14))
	var n int
	for _, s := range scenes {
		if s.kind != "same_bearing" {
			continue
		}
		nz := stated
		nz.rng = rng
		res, err := Solve(s.input(combo{objects: 2}, nz))
		if err != nil {
			t.Fatal(err)
		}
		n++
		if res.Refusal == nil || res.Refusal.Kind != RefuseSameBearing {
			t.Errorf("scene %d: refusal %+v, want %s", s.id, res.Refusal, RefuseSameBearing)
			continue
		}
		if res.Altitude.Determined || res.Altitude.Reason == "" || res.Vertical.Determined {
			t.Errorf("scene %d: refused, yet altitude %+v, vertical %+v", s.id, res.Altitude, res.Vertical)
		}
	}
	if n < 10 {
		t.Fatalf("only %d same-bearing scenes", n)
	}
}

// TestShadowTurnedAround: an object whose shadow tip is marked on the wrong
// side of its base (mirrored through the base in the picture) is never
// passed silently: the answer is refused or the lighting check fires.
func TestShadowTurnedAround(t *testing.T) {
	_, scenes := loadScenes(t)
	var checked int
	for _, s := range scenes[:40] {
		if s.kind != "ground" {
			continue
		}
		in := s.input(combo{objects: 3, horizon: s.hz != nil, edge: s.edge != nil}, noise{px: 1.5, focalFrac: 0.03})
		o := &in.Objects[2]
		o.Tip = Point{2*o.Base.X - o.Tip.X, 2*o.Base.Y - o.Tip.Y}
		if o.Tip.X < 0 || o.Tip.Y < 0 || o.Tip.X > float64(s.w) || o.Tip.Y > float64(s.h) {
			continue
		}
		res, err := Solve(in)
		if err != nil {
			t.Fatal(err)
		}
		checked++
		if res.Refusal == nil && (res.Light == nil || res.Light.Shared) {
			t.Errorf("scene %d: a shadow marked on the wrong side passed: altitude %.1f°, light %+v", s.id, res.Altitude.Deg, res.Light)
		}
	}
	t.Logf("%d scenes checked", checked)
}

// TestNotDeterminedReasons: plain-words reasons, never a silent default.
func TestNotDeterminedReasons(t *testing.T) {
	_, scenes := loadScenes(t)
	s := scenes[1]
	tests := []struct {
		c                 combo
		vertical, alt, az bool
		reasonHas         string
	}{
		{combo{objects: 1}, false, false, false, "only one vertical line"},
		{combo{objects: 1, head: true}, false, false, false, "a level camera is never assumed"},
		{combo{edge: true, horizon: true}, true, false, false, "no shadow-casting object"},
		{combo{objects: 2}, true, true, false, "no bearing reference"},
	}
	for _, tc := range tests {
		in := s.input(tc.c, noise{px: 1.5, focalFrac: 0.03})
		solved, err := Solve(in)
		if err != nil {
			t.Fatal(err)
		}
		for _, a := range []Angle{solved.Altitude, solved.Azimuth} {
			if !a.Determined && (a.Deg != 0 || a.SDDeg != 0 || a.Reason == "") {
				t.Errorf("%v: not determined, yet %+v", tc.c, a)
			}
		}
		res := determine(in)
		if res.Vertical.Determined != tc.vertical || res.Altitude.Determined != tc.alt || res.Azimuth.Determined != tc.az {
			t.Errorf("%v: determined %v/%v/%v, want %v/%v/%v", tc.c, res.Vertical.Determined, res.Altitude.Determined, res.Azimuth.Determined, tc.vertical, tc.alt, tc.az)
		}
		all := res.Vertical.Reason + " | " + res.Altitude.Reason + " | " + res.Azimuth.Reason
		if !strings.Contains(all, tc.reasonHas) {
			t.Errorf("%v: reasons %q, want one saying %q", tc.c, all, tc.reasonHas)
		}
	}
}

func TestInvalidInput(t *testing.T) {
	good := Input{Camera: Camera{WidthPx: 4000, HeightPx: 3000, FocalPx: 3000, FocalSDPx: 90}}
	bad := []struct {
		name string
		edit func(*Input)
	}{
		{"no size", func(in *Input) { in.Camera.WidthPx = 0 }},
		{"no focal length", func(in *Input) { in.Camera.FocalPx = 0 }},
		{"NaN point", func(in *Input) { in.Objects = []Object{{Base: Point{math.NaN(), 1}}} }},
		{"edge of one point", func(in *Input) { in.Edges = []Edge{{A: Point{1, 2}, B: Point{1, 2}}} }},
		{"horizon without height", func(in *Input) { in.Horizon = &Horizon{A: Point{1, 2}, B: Point{3, 4}} }},
		{"negative marking error", func(in *Input) { in.Sun = &SunDisc{Centre: Point{1, 2}, SDPx: -1} }},
		{"infinite bearing", func(in *Input) {
			in.GroundLines = []GroundLine{{From: Point{1, 2}, To: Point{3, 4}, BearingDeg: math.Inf(1)}}
		}},
	}
	for _, tc := range bad {
		in := good
		tc.edit(&in)
		if _, err := Solve(in); !errors.Is(err, ErrInvalid) {
			t.Errorf("%s: %v, want ErrInvalid", tc.name, err)
		}
	}
}

// TestRerunIdentical: the Monte Carlo is seeded, so a rerun gives the very
// same result, bit for bit.
func TestRerunIdentical(t *testing.T) {
	_, scenes := loadScenes(t)
	in := scenes[1].input(combo{objects: 2, horizon: true, ground: true}, noise{px: 1.5, focalFrac: 0.03, bearingDeg: 1})
	a, err := Solve(in)
	if err != nil {
		t.Fatal(err)
	}
	b, _ := Solve(in)
	if !reflect.DeepEqual(a, b) {
		t.Errorf("reruns differ:\n%+v\n%+v", a, b)
	}
	if a.Draws != Draws {
		t.Errorf("%d of %d draws converged", a.Draws, Draws)
	}
}
