package solarcheck

import (
	"errors"
	"fmt"
	"path"
	"sort"
	"time"

	"github.com/gnomon-forensics/gnomon/solarcheck/clock"
)

// ClockInput is what a camera's clock model needs of one photo. It is a
// few numbers, not the whole finding, so that a batch of any size can be
// modelled while its findings wait on disk (internal/audit spools them).
type ClockInput struct {
	Path    string // the photo's Finding.Path
	Camera  string // Finding.Camera
	Claimed time.Time
	// Offset is the photo's own time evidence (claimed minus evidence), if
	// HasEvidence; photos without keep their place in the order checks.
	Offset      Interval
	HasEvidence bool
	// StepSec and Verdict decide whether the evidence joins the fit: a
	// photo that alone shows a step the rest of the camera does not share
	// stays out of it.
	StepSec float64
	Verdict Verdict
}

// ClockInput returns what f's camera model needs of it; false when f names
// no camera or claims no time, so it has no place in any camera's model.
func (f *Finding) ClockInput() (ClockInput, bool) {
	if f.Camera == "" || !f.HasClaimed {
		return ClockInput{}, false
	}
	in := ClockInput{Path: f.Path, Camera: f.Camera, Claimed: f.Claimed, StepSec: f.Basis.StepSec, Verdict: f.Verdict}
	if hasTimeEvidence(f) {
		in.Offset, in.HasEvidence = *f.Offset, true
	}
	return in, true
}

// Camera is one camera's clock across the batch.
type Camera struct {
	ID string
	// Inputs are the camera's photos, sorted by claimed time; Model.Photos
	// and InFit follow the same order.
	Inputs []ClockInput
	// Model is the fitted clock; Fitted is false when no photo of the
	// camera had a time witness (the model then holds only order checks).
	Model  clock.Model
	Fitted bool
	// StepSec is the step (zone, 12 h) shared by most of the camera's
	// photos with evidence; 0 when its clock keeps the place's zone.
	StepSec float64
	// InFit says which inputs' evidence the fit used.
	InFit []bool
	Note  string
}

// Cameras are the batch's fitted cameras, indexed so that each finding can
// be given its camera's conclusions on its own (Apply), in any order.
type Cameras struct {
	List []Camera // sorted by id
	// of[j] locates the j-th input given to FitCameras in its camera's
	// model; breaks[j] are the order breaks it is the later photo of.
	// A slice, not a map keyed by path: it costs 8 bytes a photo.
	of     []photoRef
	breaks map[int][]int
}

// photoRef locates a photo in its camera's model: indexes into List and
// into that camera's Model.Photos (and Inputs).
type photoRef struct{ camera, photo int32 }

// FitCameras fits every camera's clock from the time evidence of its photos
// (see Finding.ClockInput). A photo with evidence joins its camera's fit
// unless it shows a daylight-saving or 12-hour step the rest of the camera
// does not share: such slips happen to single photos (a clock changed
// after a battery swap, a change of season).
func (x *Examiner) FitCameras(inputs []ClockInput) *Cameras {
	byCam := map[string][]int{} // indexes into inputs
	for j, in := range inputs {
		byCam[in.Camera] = append(byCam[in.Camera], j)
	}
	ids := make([]string, 0, len(byCam))
	for id := range byCam {
		ids = append(ids, id)
	}
	sort.Strings(ids)

	cs := &Cameras{of: make([]photoRef, len(inputs)), breaks: map[int][]int{}}
	for _, id := range ids {
		idx := byCam[id]
		sort.SliceStable(idx, func(a, b int) bool { return inputs[idx[a]].Claimed.Before(inputs[idx[b]].Claimed) })
		ins := make([]ClockInput, len(idx))
		for k, j := range idx {
			ins[k] = inputs[j]
			cs.of[j] = photoRef{camera: int32(len(cs.List)), photo: int32(k)}
		}
		cam := Camera{ID: id, Inputs: ins, StepSec: dominantStep(ins), InFit: make([]bool, len(ins))}
		pts := make([]clock.Point, len(ins))
		for k, in := range ins {
			pts[k] = clock.Point{Key: in.Path, ClaimedUTC: in.Claimed, FileName: path.Base(in.Path)}
			if in.HasEvidence && (in.StepSec == cam.StepSec || in.Verdict == ZoneSlip) {
				pts[k].HasEvidence = true
				pts[k].OffsetSec = in.Offset.Sec
				pts[k].HalfWidth95Sec = in.Offset.HalfWidth()
				cam.InFit[k] = true
			}
		}
		m, err := clock.Fit(pts, clock.Options{})
		cam.Model = m
		switch {
		case errors.Is(err, clock.ErrNoEvidence):
			cam.Note = "No photo of this camera has a time witness; its clock is not modelled."
		case err != nil:
			cam.Note = "The clock model could not be fitted: " + err.Error() + "."
		default:
			cam.Fitted = true
		}
		if len(m.OrderBreaks) > 0 {
			byPath := map[string]int{}
			for _, j := range idx {
				byPath[inputs[j].Path] = j
			}
			for b, ob := range m.OrderBreaks {
				if j, ok := byPath[ob.Later]; ok {
					cs.breaks[j] = append(cs.breaks[j], b)
				}
			}
		}
		cs.List = append(cs.List, cam)
	}
	return cs
}

// Apply writes f's camera's conclusions into f:
//
//   - a photo without a witness of its own gets the camera's corrected window;
//   - a photo whose own witnesses are too wide to tell, but whose camera's
//     clock is known to be off at that time, is judged on the camera's clock;
//   - a photo that disagrees with its camera is flagged as a possible edit;
//     one that alone shows a zone step is re-judged as a clock offset, since a
//     zone setting belongs to the camera, not to one photo;
//   - capture order that contradicts the file numbering is flagged.
//
// j is the index, in the slice given to FitCameras, of f's ClockInput. A
// finding whose camera was not fitted keeps its verdict.
func (x *Examiner) Apply(cs *Cameras, j int, f *Finding) {
	ref := cs.of[j]
	cam := &cs.List[ref.camera]
	for _, b := range cs.breaks[j] {
		ob := cam.Model.OrderBreaks[b]
		f.check(Check{Kind: KindShotOrder, Status: Conflicts, Figure: float64(ob.LaterNumber), HasFigure: true, Unit: "file number",
			Sentence: fmt.Sprintf("By its claimed time this photo (file number %d) comes after %s (file number %d): the camera's numbering says otherwise. One of the two times may have been changed, or the files renamed.", ob.LaterNumber, ob.Earlier, ob.EarlierNumber)})
	}
	if !cam.Fitted {
		return
	}
	p := cam.Model.Photos[ref.photo]
	switch {
	case p.Outlier:
		f.check(Check{Kind: KindCameraClock, Status: Conflicts, Figure: p.ResidualSec, HasFigure: true, Unit: "s",
			Sentence: fmt.Sprintf("This photo's time disagrees with the other photos of its camera by %s beyond the camera's fitted clock: a possible edit of the timestamp, or a wrong measurement. A flag for review, not a finding of edit.", signedDuration(p.ResidualSec))})
		if f.Verdict == ZoneSlip && f.Basis.StepSec != cam.StepSec {
			f.Rejected = append(f.Rejected, Alternative{Verdict: ZoneSlip,
				Reason: fmt.Sprintf("%s is a whole zone step, but a zone setting applies to every photo of a camera and the other photos of this camera do not share it", signedDuration(f.Basis.StepSec))})
			f.Verdict, f.Basis.StepSec = ClockOffset, 0
			sec, low, high := f.Offset.spans()
			f.Explanation = fmt.Sprintf("The claimed time is off by %s (95 %% interval %s to %s) while the other photos of the same camera are not: the time of this photo alone was changed, or its clock was set by hand. A possible edit, for review.",
				sec, low, high)
		}
	case hasTimeEvidence(f) && p.Segment >= 0:
		f.check(Check{Kind: KindCameraClock, Status: Agrees, Figure: p.ResidualSec, HasFigure: true, Unit: "s",
			Sentence: fmt.Sprintf("This photo agrees with its camera's fitted clock (residual %s).", signedDuration(p.ResidualSec))})
		if f.Verdict == Consistent {
			x.judgeByCamera(f, cam.Model.Segments[p.Segment])
		}
	case f.Offset == nil && p.Segment >= 0 && f.Verdict == Unverified:
		f.FromCamera = true
		f.Earliest = p.Corrected.Add(-p.HalfWidth95)
		f.Latest = p.Corrected.Add(p.HalfWidth95)
		seg := cam.Model.Segments[p.Segment]
		f.Explanation = fmt.Sprintf("No witness of its own; by its camera's fitted clock (offset %s at %s, drift %+.1f s/day) the photo was taken between %s and %s UTC.",
			signedDuration(seg.OffsetSec), seg.T0.Format(time.DateOnly), seg.DriftSecPerDay, f.Earliest.Format(time.DateTime), f.Latest.Format(time.DateTime))
	}
}

// hasTimeEvidence reports whether f's offset comes from its own witnesses
// about the time of day (not a season or place finding).
func hasTimeEvidence(f *Finding) bool {
	return f.Offset != nil && !f.FromCamera && f.Verdict != SeasonMismatch && f.Verdict != PlaceMismatch
}

// dominantStep is the step most of a camera's photos with evidence show;
// ties go to the smaller step, so a camera is taken to keep the place's
// zone unless most of its photos say otherwise.
func dominantStep(ins []ClockInput) float64 {
	count := map[float64]int{}
	for _, in := range ins {
		if in.HasEvidence {
			count[in.StepSec]++
		}
	}
	best, n := 0.0, -1
	for s, c := range count {
		if c > n || (c == n && abs(s) < abs(best)) {
			best, n = s, c
		}
	}
	return best
}

func abs(v float64) float64 {
	if v < 0 {
		return -v
	}
	return v
}

// judgeByCamera re-judges a photo whose own witnesses allow no clock error
// when its camera's fitted clock, at the photo's time, excludes zero: the
// camera's many photos say more than one wide interval.
func (x *Examiner) judgeByCamera(f *Finding, seg clock.Segment) {
	off, half := seg.OffsetAt(f.Claimed)
	if abs(off) <= half {
		return
	}
	own := *f.Offset
	iv := Interval{Sec: off, LowSec: off - half, HighSec: off + half}
	f.Rejected = nil
	f.setOffset(iv)
	f.FromCamera = true
	x.judgeOffset(f, iv, fmt.Sprintf("its camera's clock fitted from %d photos", seg.Points))
	sec, low, high := own.spans()
	f.Explanation = fmt.Sprintf("Its own witnesses allow no clock error at their uncertainty (offset %s, 95 %% interval %s to %s), but its camera's clock was off at that time: %s",
		sec, low, high, f.Explanation)
}
