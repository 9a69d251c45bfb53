package solarcheck

import (
	"errors"
	"fmt"
	"path"
	"sort"
	"time"

	"github.com/gnomon-forensics/gnomon/solarcheck/clock"
)

// Camera is one camera's clock across the batch.
type Camera struct {
	ID     string
	Photos []string // paths, sorted by claimed time
	// Model is the fitted clock; Fitted is false when no photo of the
	// camera had a time witness (the model then holds only order checks).
	Model  clock.Model
	Fitted bool
	// StepSec is the step (zone, 12 h) shared by most of the camera's
	// photos with evidence; 0 when its clock keeps the place's zone.
	StepSec float64
	// InFit names the photos whose witnesses the fit used (paths).
	InFit map[string]bool
	Note  string
}

// ModelCameras fits every camera's clock from the time witnesses of its
// photos, then updates the findings (in place):
//
//   - photos without a witness of their own get the camera's corrected window;
//   - a photo whose own witnesses are too wide to tell, but whose camera's
//     clock is known to be off at that time, is judged on the camera's clock;
//   - a photo that disagrees with its camera is flagged as a possible edit;
//     one that alone shows a zone step is re-judged as a clock offset, since a
//     zone setting belongs to the camera, not to one photo;
//   - capture order that contradicts the file numbering is flagged.
//
// Photos that show a daylight-saving or 12-hour step the rest of the camera
// does not share keep their verdict and stay out of the fit: such slips
// happen to single photos (a clock changed after a battery swap, a change
// of season). Cameras are returned sorted by id.
func (x *Examiner) ModelCameras(findings []Finding) []Camera {
	byCam := map[string][]int{}
	for i, f := range findings {
		if f.Camera == "" || !f.HasClaimed {
			continue
		}
		byCam[f.Camera] = append(byCam[f.Camera], i)
	}
	ids := make([]string, 0, len(byCam))
	for id := range byCam {
		ids = append(ids, id)
	}
	sort.Strings(ids)

	var cams []Camera
	for _, id := range ids {
		idx := byCam[id]
		sort.SliceStable(idx, func(a, b int) bool { return findings[idx[a]].Claimed.Before(findings[idx[b]].Claimed) })
		cam := Camera{ID: id, StepSec: dominantStep(findings, idx), InFit: map[string]bool{}}
		pts := make([]clock.Point, len(idx))
		for k, i := range idx {
			f := &findings[i]
			cam.Photos = append(cam.Photos, f.Path)
			pts[k] = clock.Point{Key: f.Path, ClaimedUTC: f.Claimed, FileName: path.Base(f.Path)}
			if hasTimeEvidence(f) && (f.stepSec == cam.StepSec || f.Verdict == ZoneSlip) {
				pts[k].HasEvidence = true
				pts[k].OffsetSec = f.Offset.Sec
				pts[k].HalfWidth95Sec = f.Offset.HalfWidth()
				cam.InFit[f.Path] = true
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
		x.applyModel(findings, idx, cam)
		cams = append(cams, cam)
	}
	return cams
}

// hasTimeEvidence reports whether f's offset comes from its own witnesses
// about the time of day (not a season or place finding).
func hasTimeEvidence(f *Finding) bool {
	return f.Offset != nil && !f.FromCamera && f.Verdict != SeasonMismatch && f.Verdict != PlaceMismatch
}

// dominantStep is the step most of a camera's photos with evidence show;
// ties go to the smaller step, so a camera is taken to keep the place's
// zone unless most of its photos say otherwise.
func dominantStep(findings []Finding, idx []int) float64 {
	count := map[float64]int{}
	for _, i := range idx {
		if f := &findings[i]; hasTimeEvidence(f) {
			count[f.stepSec]++
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

// applyModel writes the camera's conclusions into its photos' findings.
func (x *Examiner) applyModel(findings []Finding, idx []int, cam Camera) {
	byKey := map[string]*Finding{}
	for _, i := range idx {
		byKey[findings[i].Path] = &findings[i]
	}
	for _, ob := range cam.Model.OrderBreaks {
		if f := byKey[ob.Later]; f != nil {
			f.check(Check{Kind: KindShotOrder, Status: Conflicts, Figure: float64(ob.LaterNumber), HasFigure: true, Unit: "file number",
				Sentence: fmt.Sprintf("By its claimed time this photo (file number %d) comes after %s (file number %d): the camera's numbering says otherwise. One of the two times may have been changed, or the files renamed.", ob.LaterNumber, ob.Earlier, ob.EarlierNumber)})
		}
	}
	if !cam.Fitted {
		return
	}
	for _, p := range cam.Model.Photos {
		f := byKey[p.Key]
		if f == nil {
			continue
		}
		switch {
		case p.Outlier:
			f.check(Check{Kind: KindCameraClock, Status: Conflicts, Figure: p.ResidualSec, HasFigure: true, Unit: "s",
				Sentence: fmt.Sprintf("This photo's time disagrees with the other photos of its camera by %s beyond the camera's fitted clock: a possible edit of the timestamp, or a wrong measurement. A flag for review, not a finding of edit.", signedDuration(p.ResidualSec))})
			if f.Verdict == ZoneSlip && f.stepSec != cam.StepSec {
				f.Rejected = append(f.Rejected, Alternative{Verdict: ZoneSlip,
					Reason: fmt.Sprintf("%s is a whole zone step, but a zone setting applies to every photo of a camera and the other photos of this camera do not share it", signedDuration(f.stepSec))})
				f.Verdict, f.stepSec = ClockOffset, 0
				f.Explanation = fmt.Sprintf("The claimed time is off by %s (95 %% interval %s to %s) while the other photos of the same camera are not: the time of this photo alone was changed, or its clock was set by hand. A possible edit, for review.",
					signedDuration(f.Offset.Sec), signedDuration(f.Offset.LowSec), signedDuration(f.Offset.HighSec))
			}
		case hasTimeEvidence(f) && p.Segment >= 0:
			f.check(Check{Kind: KindCameraClock, Status: Agrees, Figure: p.ResidualSec, HasFigure: true, Unit: "s",
				Sentence: fmt.Sprintf("This photo agrees with its camera's fitted clock (residual %s).", signedDuration(p.ResidualSec))})
			if f.Verdict == Consistent {
				x.judgeByCamera(f, cam.Model.Segments[p.Segment], cam)
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
}

// judgeByCamera re-judges a photo whose own witnesses allow no clock error
// when its camera's fitted clock, at the photo's time, excludes zero: the
// camera's many photos say more than one wide interval.
func (x *Examiner) judgeByCamera(f *Finding, seg clock.Segment, cam Camera) {
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
	f.Explanation = fmt.Sprintf("Its own witnesses allow no clock error at their uncertainty (offset %s, 95 %% interval %s to %s), but its camera's clock was off at that time: %s",
		signedDuration(own.Sec), signedDuration(own.LowSec), signedDuration(own.HighSec), f.Explanation)
}
