package marks

import (
	"math"
	"testing"

	"github.com/gnomon-forensics/gnomon/internal/angle"
)

// expect is the table of README's "what each combination of marks
// determines", written out independently of determine().
func expect(c combo) (vertical, altitude, azimuth bool) {
	vertical = c.objects+b2i(c.edge) >= 2 || c.horizon
	altitude = vertical && (c.objects > 0 || c.sun)
	azimuth = altitude && (c.ground || c.head)
	return
}

func b2i(b bool) int {
	if b {
		return 1
	}
	return 0
}

// TestNoiseFreeRecovery: with exact marks, every combination that
// determines an output recovers the OpenCV scene's truth (pitch, roll, sun
// altitude and azimuth) to within 1e-9°. Witness: cv2.projectPoints
// (OpenCV 4.6.0, testdata/gen_scenes.py).
func TestNoiseFreeRecovery(t *testing.T) {
	header, scenes := loadScenes(t)
	t.Log(header)
	const tol = 1e-9
	var n, worst, degenerate int
	var worstErr float64
	for _, s := range scenes {
		for _, c := range s.combos() {
			in := s.input(c, noise{})
			v, al, az := expect(c)
			res := determine(in)
			if res.Vertical.Determined != v || res.Altitude.Determined != al || res.Azimuth.Determined != az {
				t.Fatalf("scene %d %v: determined vertical/altitude/azimuth %v/%v/%v, want %v/%v/%v", s.id, c,
					res.Vertical.Determined, res.Altitude.Determined, res.Azimuth.Determined, v, al, az)
			}
			if !v {
				if res.Vertical.Reason == "" || res.Altitude.Reason == "" {
					t.Fatalf("scene %d %v: not determined without a reason", s.id, c)
				}
				continue
			}
			m, p, _, ref := fitOnce(in)
			if ref != nil {
				t.Errorf("scene %d %v: refused before the fit: %s", s.id, c, ref.Sentence)
				continue
			}
			if _, same := sameBearing(in, camera{f: p[m.iF], cx: m.cam.cx, cy: m.cam.cy}, newFrame(upFromParams(p[0], p[1]))); same {
				// Degenerate: the gate refuses it; float rounding of the
				// table is amplified without bound there.
				degenerate++
				continue
			}
			pitch, roll := attitude(upFromParams(p[0], p[1]))
			errs := []float64{pitch - s.pitch, roll - s.roll}
			if al {
				errs = append(errs, p[m.iSun]/deg-s.alt)
			}
			if az {
				errs = append(errs, angle.Wrap180((p[m.iH]+p[m.iSun+1])/deg-s.az))
			}
			n++
			for _, e := range errs {
				if math.Abs(e) > worstErr {
					worstErr, worst = math.Abs(e), s.id
				}
				if math.Abs(e) > tol {
					t.Errorf("scene %d (%s) %v: errors pitch, roll, altitude, azimuth %.3g°, want within %g°", s.id, s.kind, c, errs, tol)
					break
				}
			}
		}
	}
	t.Logf("%d scenes, %d determined combinations (and %d with all vertical lines at one bearing, which the gate refuses): largest error %.2g° (scene %d)", len(scenes), n, degenerate, worstErr, worst)
}
