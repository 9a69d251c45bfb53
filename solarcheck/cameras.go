package solarcheck

import (
	"errors"
	"fmt"
	"path"
	"slices"
	"sort"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/figure"
	"github.com/gnomon-forensics/gnomon/solarcheck/clock"
	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

// ClockInput is what a camera's clock model needs of one photo. It is a
// few numbers, not the whole finding, so that a batch of any size can be
// modelled while its findings wait on disk (internal/audit spools them).
type ClockInput struct {
	Path   string // the photo's Finding.Path
	Camera string // Finding.Camera
	// Reading is what the clock showed: the capture time's digits,
	// labelled UTC (see clock.Point). Instants are the instants the claim
	// stands for, the one used first.
	Reading  time.Time
	Instants []time.Time
	// Zones are the UTC offsets (seconds) the clock may be set to, by this
	// photo: the offset its claim was read with, and the place's.
	Zones []int
	// Tagged says the capture time carried its offset tag: the clock named
	// the zone it showed, so Reading is already UTC (a phone that follows
	// the place's legal time keeps one clock across a daylight-saving
	// change or a journey).
	Tagged bool
	// PlaceZone is the IANA zone of the place ("" when unknown) and
	// PlaceOffsetSec the offset it kept at the claimed instant: a clock
	// kept on the time of another place the camera was at is on another
	// zone's time there.
	PlaceZone      string
	PlaceOffsetSec int
	// Offset is the photo's own time evidence in the clock's scale (the
	// reading minus the evidence's instant), if HasEvidence; photos
	// without keep their place in the order checks.
	Offset      Interval
	HasEvidence bool
}

// ClockInput returns what f's camera model needs of it; false when f names
// no camera or claims no time, so it has no place in any camera's model.
func (x *Examiner) ClockInput(f *Finding) (ClockInput, bool) {
	// A wall time the examiner typed into the sheet is not a clock reading.
	if f.Camera == "" || !f.HasClaimed || f.Wall.IsZero() || f.WallTag == sheetTimeTag {
		return ClockInput{}, false
	}
	w := f.Wall
	reading := time.Date(w.Year, w.Month, w.Day, w.Hour, w.Minute, w.Second, w.Nanosecond, time.UTC)
	in := ClockInput{Path: f.Path, Camera: f.Camera, Instants: []time.Time{f.Claimed}}
	if w.HasOffset {
		// The clock says which zone it showed: its own scale is UTC.
		reading = reading.Add(-time.Duration(w.OffsetSec) * time.Second)
		in.Tagged = true
	}
	in.Reading = reading
	for _, c := range f.Claim.Candidates {
		if !c.UTC.Equal(f.Claimed) {
			in.Instants = append(in.Instants, c.UTC)
		}
	}
	// The offset the claim was read with: reading = claimed + offset. It
	// suggests a zone unless the examiner gave the instant outright.
	claimOff := reading.Sub(f.Claimed).Seconds()
	if f.Claim.Rule != zone.RuleOverrideTime {
		in.Zones = append(in.Zones, int(claimOff))
	}
	if zs := x.zoneOffsets(f, f.Claimed); len(zs) > 0 {
		_, in.PlaceOffsetSec = f.Claimed.In(zs[0].loc).Zone()
		in.PlaceZone = zs[0].name
		if !in.Tagged && !slices.Contains(in.Zones, in.PlaceOffsetSec) {
			in.Zones = append(in.Zones, in.PlaceOffsetSec)
		}
	}
	if hasTimeEvidence(f) {
		o := *f.Offset
		in.Offset = Interval{Sec: o.Sec + claimOff, LowSec: o.LowSec + claimOff, HighSec: o.HighSec + claimOff}
		in.HasEvidence = true
	}
	return in, true
}

// Camera is one camera's clock across the batch.
type Camera struct {
	ID string
	// Inputs are the camera's photos, sorted by reading; Model.Photos
	// follows the same order.
	Inputs []ClockInput
	// Model is the fitted clock; Fitted is false when no photo of the
	// camera had a time witness (the model then holds only order checks
	// and fall-backs to a factory date).
	Model  clock.Model
	Fitted bool
	// Tagged is set when every photo carried its offset tag: the clock is
	// then read in UTC, through the tags.
	Tagged bool
	Note   string
	// breaks[k] are the order breaks whose later photo is Inputs[k].
	breaks map[int32][]int
	// resetAfter[k] is the reset that Inputs[k] is the first photo after.
	resetAfter map[int32]int
	// placesAt[s][offset] are the zones of the places where segment s's
	// untagged photos were taken while the place kept that offset.
	placesAt []map[int]map[string]bool
}

// Cameras are the batch's fitted cameras.
type Cameras struct {
	List []*Camera // sorted by id
}

// CameraPhoto is one photo's place in its camera's model: FitCameras gives
// one per input, and Apply takes it back with the photo's finding, so that
// the caller hands over values and need not keep the inputs in any order.
// The zero value stands for a photo with no camera model.
type CameraPhoto struct {
	cam *Camera
	k   int32
}

// Segment returns the clock segment the photo belongs to in its camera's
// model; false when the camera is not fitted or the photo lies in none.
func (p CameraPhoto) Segment() (clock.Segment, bool) {
	if p.cam == nil || !p.cam.Fitted {
		return clock.Segment{}, false
	}
	k := p.cam.Model.Photos[p.k].Segment
	if k < 0 {
		return clock.Segment{}, false
	}
	return p.cam.Model.Segments[k], true
}

// ResetBefore returns the clock reset this photo is the first photo after,
// if any.
func (p CameraPhoto) ResetBefore() (clock.Reset, bool) {
	if p.cam == nil {
		return clock.Reset{}, false
	}
	r, ok := p.cam.resetAfter[p.k]
	if !ok {
		return clock.Reset{}, false
	}
	return p.cam.Model.Resets[r], true
}

// FitCameras fits every camera's clock from the time evidence of its photos
// (see Examiner.ClockInput), in the clock's own time scale: a camera
// carried to another zone without changing its clock keeps one model. It
// returns the cameras and, for inputs[j], its place in its camera's model.
func (x *Examiner) FitCameras(inputs []ClockInput) (*Cameras, []CameraPhoto) {
	byCam := map[string][]int{} // indexes into inputs
	for j, in := range inputs {
		byCam[in.Camera] = append(byCam[in.Camera], j)
	}
	ids := make([]string, 0, len(byCam))
	for id := range byCam {
		ids = append(ids, id)
	}
	sort.Strings(ids)

	cs := &Cameras{}
	refs := make([]CameraPhoto, len(inputs))
	for _, id := range ids {
		idx := byCam[id]
		sort.SliceStable(idx, func(a, b int) bool { return inputs[idx[a]].Reading.Before(inputs[idx[b]].Reading) })
		cam := &Camera{ID: id, Inputs: make([]ClockInput, len(idx)), breaks: map[int32][]int{}, resetAfter: map[int32]int{}}
		pts := make([]clock.Point, len(idx))
		cam.Tagged = true
		for k, j := range idx {
			in := inputs[j]
			cam.Tagged = cam.Tagged && in.Tagged
			cam.Inputs[k] = in
			refs[j] = CameraPhoto{cam: cam, k: int32(k)}
			pts[k] = clock.Point{Key: in.Path, Reading: in.Reading, Instants: in.Instants, Zones: in.Zones, FileName: path.Base(in.Path)}
			if in.HasEvidence {
				pts[k].HasEvidence = true
				pts[k].OffsetSec = in.Offset.Sec
				pts[k].HalfWidth95Sec = in.Offset.HalfWidth()
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
		if len(m.OrderBreaks) > 0 || len(m.Resets) > 0 {
			byKey := map[string]int32{}
			for k, in := range cam.Inputs {
				byKey[in.Path] = int32(k)
			}
			for b, ob := range m.OrderBreaks {
				if k, ok := byKey[ob.Later]; ok {
					cam.breaks[k] = append(cam.breaks[k], b)
				}
			}
			for r, rs := range m.Resets {
				if k, ok := byKey[rs.After]; ok {
					cam.resetAfter[k] = r
				}
			}
		}
		cam.placesAt = make([]map[int]map[string]bool, len(m.Segments))
		for k, in := range cam.Inputs {
			sg := m.Photos[k].Segment
			if sg < 0 || in.Tagged || in.PlaceZone == "" {
				continue
			}
			if cam.placesAt[sg] == nil {
				cam.placesAt[sg] = map[int]map[string]bool{}
			}
			if cam.placesAt[sg][in.PlaceOffsetSec] == nil {
				cam.placesAt[sg][in.PlaceOffsetSec] = map[string]bool{}
			}
			cam.placesAt[sg][in.PlaceOffsetSec][in.PlaceZone] = true
		}
		cs.List = append(cs.List, cam)
	}
	return cs, refs
}

// Apply writes f's camera's conclusions into f. A photo's own witnesses
// come first: the camera's model never changes the verdict of a photo that
// has a time witness of its own; it adds the camera_clock check (agrees,
// conflicts, or open when too few other photos share its clock) and, for a
// photo that disagrees with its camera, says by how much. Only a photo
// without a witness of its own is dated by its camera's model. Capture
// order that contradicts the file numbering is flagged, and the first
// photo after a clock reset says so.
func (x *Examiner) Apply(p CameraPhoto, f *Finding) {
	cam := p.cam
	if cam == nil {
		return
	}
	for _, b := range cam.breaks[p.k] {
		ob := cam.Model.OrderBreaks[b]
		f.check(Check{Kind: KindShotOrder, Status: Conflicts, Figure: float64(ob.LaterNumber), HasFigure: true, Unit: "file number",
			Sentence: fmt.Sprintf("By its claimed time this photo (file number %d) comes after %s (file number %d): the camera's numbering says otherwise. One of the two times may have been changed, or the files renamed.", ob.LaterNumber, ob.Earlier, ob.EarlierNumber)})
	}
	mp := cam.Model.Photos[p.k]
	if r, ok := cam.resetAfter[p.k]; ok {
		// Said last, after any explanation the camera's model writes.
		defer func() { f.Explanation += " " + resetSentence(cam.Model.Resets[r]) }()
	}
	if mp.Factory {
		f.check(Check{Kind: KindCameraClock, Status: Conflicts,
			Sentence: fmt.Sprintf("The camera's clock reads %s, just after a date cameras fall back to when their clock loses its setting: the clock had been reset, and this time is not when the photo was taken.", cam.Inputs[p.k].Reading.Format("2006-01-02 15:04"))})
	}
	if !cam.Fitted || mp.Segment < 0 {
		return
	}
	seg := cam.Model.Segments[mp.Segment]
	switch {
	case hasTimeEvidence(f) && mp.Others < clock.MinOthers:
		c := Check{Kind: KindCameraClock, Status: Open,
			Sentence: fmt.Sprintf("Only %s of this camera share its clock setting and have a time witness: too few to test this photo against.", otherPhotos(mp.Others))}
		if mp.Others == 0 {
			c.Sentence = "No other photo of this camera shares its clock setting and has a time witness: nothing to test this photo against."
		}
		f.check(c)
	case hasTimeEvidence(f) && mp.Outlier:
		f.check(Check{Kind: KindCameraClock, Status: Conflicts, Figure: mp.ResidualSec, HasFigure: true, Unit: "s",
			Sentence: fmt.Sprintf("This photo's time differs from its camera's other %d photos with a time witness by %s, beyond the camera's fitted clock: a possible edit of the timestamp, or a wrong measurement. A flag for review, not a finding of edit.", mp.Others, signedDuration(mp.ResidualSec))})
		if f.Verdict == ZoneSlip {
			// The photo's own witnesses already say its claim is off; what
			// the camera adds is that the step is not a zone setting: a
			// zone setting is the clock's, and its other photos (read in
			// the clock's own time) do not share it.
			f.Rejected = append(f.Rejected, Alternative{Verdict: ZoneSlip,
				Reason: fmt.Sprintf("%s is a whole zone step, but a zone setting belongs to the camera's clock and its other photos do not share it", signedDuration(f.Offset.Sec))})
			f.Verdict, f.Basis.StepSec = ClockOffset, 0
			sec, low, high := f.Offset.spans()
			f.Explanation = fmt.Sprintf("The claimed time is off by %s (95 %% interval %s to %s) while the other photos of the same camera are not: the time of this photo alone was changed, or its clock was set by hand. A possible edit, for review.",
				sec, low, high)
		}
	case hasTimeEvidence(f):
		c := Check{Kind: KindCameraClock, Status: Agrees, Figure: mp.ResidualSec, HasFigure: true, Unit: "s",
			Sentence: fmt.Sprintf("This photo agrees with its camera's clock fitted from %d other photos (residual %s).", mp.Others, signedDuration(mp.ResidualSec))}
		if f.Verdict == DSTSlip && !cam.Tagged {
			x.zoneByCamera(f, cam, mp.Segment, seg)
		}
		if f.Verdict == Consistent {
			// The photo's own witnesses reach zero; the camera's clock may
			// still say the claim is off, with a narrower interval.
			if iv := x.cameraOffset(cam, p.k, seg); !iv.Contains(0, 0) {
				c.Status = Conflicts
				sec, low, high := iv.spans()
				c.Sentence = fmt.Sprintf("By its camera's clock, fitted from %d other photos, this photo's time is off by %s (95 %% interval %s to %s); its own witnesses are too wide to confirm or exclude that, and they decide its verdict.",
					mp.Others, sec, low, high)
			}
		}
		f.check(c)
	case f.Offset == nil && f.Verdict == Unverified:
		f.FromCamera = true
		f.Earliest = mp.Corrected.Add(-mp.HalfWidth95)
		f.Latest = mp.Corrected.Add(mp.HalfWidth95)
		f.Explanation = fmt.Sprintf("No witness of its own. Its camera's clock, fitted from %s with a time witness, was %s; by that clock the photo was taken between %s and %s UTC.",
			otherPhotos(seg.Points), clockSummary(seg), f.Earliest.Format(time.DateTime), f.Latest.Format(time.DateTime))
	case f.Offset == nil && f.Verdict == Ambiguous:
		// The camera's clock is read in its own time scale, so its window
		// does not depend on the reading; it may fit one reading only. Like
		// an unverified photo's, the verdict stays: the photo has no witness
		// of its own.
		f.FromCamera = true
		f.Earliest = mp.Corrected.Add(-mp.HalfWidth95)
		f.Latest = mp.Corrected.Add(mp.HalfWidth95)
		f.Explanation += " " + fmt.Sprintf("Its camera's clock, fitted from %s with a time witness, was %s; by that clock the photo was taken between %s and %s UTC, ",
			otherPhotos(seg.Points), clockSummary(seg), f.Earliest.Format(time.DateTime), f.Latest.Format(time.DateTime)) + readingsInWindow(f)
	}
}

// zoneByCamera names the step of a photo whose own witnesses show one hour
// at a place that keeps daylight saving, when its camera's clock is set to
// the time another place kept where the same clock took other photos: a
// camera kept on Maine time (UTC−04:00) in Halifax (UTC−03:00) is on
// another zone's time, not behind a daylight-saving change. Both readings
// fit the photo's own interval; the camera's other photos tell them apart.
// A clock whose setting only this place's zone ever kept (the same place in
// the other season) stays a missed daylight-saving change.
func (x *Examiner) zoneByCamera(f *Finding, cam *Camera, k int, seg clock.Segment) {
	if !seg.Zone.Decided || len(f.PlaceZones) == 0 {
		return
	}
	zs := x.zoneOffsets(f, f.Claimed)
	if len(zs) == 0 {
		return
	}
	z := seg.Zone.OffsetSec
	_, now := f.Claimed.In(zs[0].loc).Zone()
	step := float64(z - now)
	var elsewhere []string
	for name := range cam.placesAt[k][z] {
		if name != f.PlaceZones[0] {
			elsewhere = append(elsewhere, name)
		}
	}
	if z == now || len(elsewhere) == 0 || !f.Offset.Contains(step, stepSlackSec) {
		return
	}
	sort.Strings(elsewhere)
	f.Rejected = append(f.Rejected, Alternative{Verdict: DSTSlip,
		Reason: fmt.Sprintf("a missed daylight-saving change: the camera's clock was set to %s, the time its other photos show it kept at %s", offsetLabel(z), elsewhere[0])})
	f.Verdict, f.Basis.StepSec = ZoneSlip, step
	sec, low, high := f.Offset.spans()
	f.Explanation = fmt.Sprintf("The claimed time is off by %s (95 %% interval %s to %s), a whole time-zone step: the camera's clock was kept on %s, the time of %s where its other photos were taken, while this place keeps %s.",
		sec, low, high, offsetLabel(z), elsewhere[0], offsetLabel(now))
}

// cameraOffset is the camera model's offset for input k in the photo's own
// terms (claimed minus true), with its 95 % interval.
func (x *Examiner) cameraOffset(cam *Camera, k int32, seg clock.Segment) Interval {
	in := cam.Inputs[k]
	off, half := seg.OffsetAt(in.Reading)
	off -= in.Reading.Sub(in.Instants[0]).Seconds() // reading scale → claimed scale
	return Interval{Sec: off, LowSec: off - half, HighSec: off + half}
}

// otherPhotos is "1 photo" or "n photos".
func otherPhotos(n int) string {
	if n == 1 {
		return "1 photo"
	}
	return fmt.Sprintf("%d photos", n)
}

// clockSummary states a segment's clock in plain words: its error against
// the zone it is set to, at a stated date, and its drift or why none is
// given.
func clockSummary(s clock.Segment) string {
	e, h := s.ErrorSec(), s.OffsetHalf95Sec
	sec, low, high := Interval{Sec: e, LowSec: e - h, HighSec: e + h}.spans()
	out := fmt.Sprintf("set to %s and off by %s (95 %% interval %s to %s) on %s", offsetLabel(s.Zone.OffsetSec), sec, low, high, s.T0.Format(time.DateOnly))
	if !s.Zone.Decided {
		out = fmt.Sprintf("%s off UTC (95 %% interval %s to %s) on %s, the zone it was set to not decided", sec, low, high, s.T0.Format(time.DateOnly))
	}
	if s.DriftMeasured {
		u := max(s.DriftHighSecPerDay-s.DriftSecPerDay, s.DriftSecPerDay-s.DriftLowSecPerDay)
		return out + fmt.Sprintf(", drift %s s/day (95 %% interval %s to %s)",
			figure.Number(s.DriftSecPerDay, u, 1), figure.Number(s.DriftLowSecPerDay, u, 1), figure.Number(s.DriftHighSecPerDay, u, 1))
	}
	return out + ", drift not determined"
}

// OffsetLabel formats an offset from UTC as "UTC+05:30", as reports name
// the zone a camera's clock is set to.
func OffsetLabel(sec int) string { return offsetLabel(sec) }

// ResetNote says in plain words what happened at a reset, for the report's
// camera section.
func ResetNote(r clock.Reset) string {
	if r.Factory {
		if r.Before == "" {
			return fmt.Sprintf("The clock fell back to its factory date (%s) before %s.", r.Epoch.Format(time.DateOnly), r.After)
		}
		return fmt.Sprintf("The clock fell back to its factory date (%s) between %s and %s.", r.Epoch.Format(time.DateOnly), r.Before, r.After)
	}
	return fmt.Sprintf("The clock was reset by %s between %s and %s.", signedDuration(r.StepSec), r.Before, r.After)
}

// resetSentence tells the first photo after a reset what happened.
func resetSentence(r clock.Reset) string {
	if r.Factory {
		s := fmt.Sprintf("Its camera's clock fell back to its factory date (%s) before this photo", r.Epoch.Format(time.DateOnly))
		if r.Before != "" {
			s += fmt.Sprintf("; the last photo before that is %s", r.Before)
		}
		return s + "."
	}
	return fmt.Sprintf("Its camera's clock was reset by %s between %s and this photo; the two settings are modelled apart.", signedDuration(r.StepSec), r.Before)
}

// hasTimeEvidence reports whether f's offset comes from its own witnesses
// about the time of day (not a season or place finding).
func hasTimeEvidence(f *Finding) bool {
	return f.Offset != nil && !f.FromCamera && f.Verdict != SeasonMismatch && f.Verdict != PlaceMismatch
}
