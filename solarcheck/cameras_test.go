package solarcheck

import (
	"testing"
	"time"
)

// fitAndApply runs the camera stage on examined findings as the audit does.
func fitAndApply(x *Examiner, fs []Finding) *Cameras {
	var ins []ClockInput
	var at []int
	for i := range fs {
		if in, ok := x.ClockInput(&fs[i]); ok {
			ins = append(ins, in)
			at = append(at, i)
		}
	}
	cs, refs := x.FitCameras(ins)
	for k, i := range at {
		x.Apply(refs[k], &fs[i])
	}
	return cs
}

// TestOwnWitnessesComeFirst: a camera whose clock runs 8 minutes fast
// (6 GPS-witnessed photos say so) takes one more photo whose only witness,
// its shadows measured at ±8° (1σ), is too wide to exclude zero. Issue 19:
// the photo's own witnesses decide its verdict, consistent; the camera's
// model raises camera_clock to conflicts and says by how much, but does
// not turn the verdict into clock_offset (which the old model did). Photos
// with no witness of their own are dated by the model and stay unverified.
func TestOwnWitnessesComeFirst(t *testing.T) {
	x := sharedExaminer()
	zurich := mustLoc(t, "Europe/Zurich")
	const fast = 8 * time.Minute
	start := time.Date(2026, 6, 1, 10, 0, 0, 0, time.UTC)
	var fs []Finding
	for i := 0; i < 6; i++ {
		truth := start.Add(time.Duration(i) * 26 * time.Hour)
		s := scene{trueUTC: truth, wall: truth.Add(fast).In(zurich), lat: 47.37, lon: 8.54, gps: true, gpsTime: ptr(truth), camera: "Fast"}
		fs = append(fs, x.Examine(s.photo(t, "f/IMG_000"+string(rune('1'+i))+".jpg")))
	}
	truth := start.Add(3*24*time.Hour + 2*time.Hour)
	wide := scene{trueUTC: truth, wall: truth.Add(fast).In(zurich), lat: 47.37, lon: 8.54, shadows: 1, bearingSD: 8, camera: "Fast"}
	fs = append(fs, x.Examine(wide.photo(t, "f/IMG_0007.jpg")))
	bare := scene{trueUTC: truth.Add(time.Hour), wall: truth.Add(time.Hour + fast).In(zurich), lat: 47.37, lon: 8.54, camera: "Fast"}
	fs = append(fs, x.Examine(bare.photo(t, "f/IMG_0008.jpg")))
	if fs[6].Verdict != Consistent {
		t.Fatalf("the shadow-only photo is %s before the camera stage (%s); the case needs a witness too wide to tell", fs[6].Verdict, fs[6].Explanation)
	}
	fitAndApply(x, fs)

	w := fs[6]
	c, ok := w.Check(KindCameraClock)
	if w.Verdict != Consistent || !ok || c.Status != Conflicts {
		t.Errorf("shadow-only photo: %s, camera_clock %+v; want consistent with a conflicting camera_clock", w.Verdict, c)
	}
	b := fs[7]
	if b.Verdict != Unverified || !b.FromCamera || b.Earliest.After(truth.Add(time.Hour)) || b.Latest.Before(truth.Add(time.Hour)) {
		t.Errorf("unwitnessed photo: %s, window %v–%v, truth %v", b.Verdict, b.Earliest, b.Latest, truth.Add(time.Hour))
	}
	for _, f := range fs[:6] {
		if f.Verdict != ClockOffset {
			t.Errorf("%s: %s, want clock_offset by its own GPS clock", f.Path, f.Verdict)
		}
		if c, _ := f.Check(KindCameraClock); c.Status != Agrees {
			t.Errorf("%s: camera_clock %s, want agrees", f.Path, c.Status)
		}
	}
}

// TestCameraClockOpenWithFewPhotos: with only two other witnessed photos on
// its clock, the camera cannot test a photo: camera_clock is open, not
// agrees (issue 10).
func TestCameraClockOpenWithFewPhotos(t *testing.T) {
	x := sharedExaminer()
	zurich := mustLoc(t, "Europe/Zurich")
	start := time.Date(2026, 6, 1, 10, 0, 0, 0, time.UTC)
	var fs []Finding
	for i := 0; i < 3; i++ {
		truth := start.Add(time.Duration(i) * 5 * time.Hour)
		s := scene{trueUTC: truth, wall: truth.In(zurich), lat: 47.37, lon: 8.54, gps: true, gpsTime: ptr(truth), camera: "Few"}
		fs = append(fs, x.Examine(s.photo(t, "g/IMG_000"+string(rune('1'+i))+".jpg")))
	}
	fitAndApply(x, fs)
	for _, f := range fs {
		if c, ok := f.Check(KindCameraClock); !ok || c.Status != Open {
			t.Errorf("%s: camera_clock %+v, want open", f.Path, c)
		}
	}
}

// TestSheetTimeIsNoClockReading: a wall time the examiner typed into the
// sheet for a file without one is not what the camera's clock showed, so
// the photo has no place in its camera's clock model.
func TestSheetTimeIsNoClockReading(t *testing.T) {
	x := sharedExaminer()
	zurich := mustLoc(t, "Europe/Zurich")
	truth := time.Date(2026, 6, 1, 10, 0, 0, 0, time.UTC)
	s := scene{trueUTC: truth, wall: truth.In(zurich), lat: 47.37, lon: 8.54, gps: true, gpsTime: ptr(truth), camera: "Cam"}
	f := x.Examine(s.photo(t, "h/IMG_0001.jpg"))
	if _, ok := x.ClockInput(&f); !ok {
		t.Fatal("a photo with its own capture time is left out of its camera's model")
	}
	f.WallTag = sheetTimeTag
	if _, ok := x.ClockInput(&f); ok {
		t.Error("a sheet time was taken for a clock reading")
	}
}
