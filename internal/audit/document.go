package audit

import (
	"context"
	"fmt"
	"github.com/gnomon-forensics/gnomon/internal/figure"
	"math"
	"time"

	"github.com/gnomon-forensics/gnomon/exifread"
	"github.com/gnomon-forensics/gnomon/report"
	"github.com/gnomon-forensics/gnomon/solarcheck"
	"github.com/gnomon-forensics/gnomon/solarcheck/clock"
	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

// Header is what the command knows about the run, for the report's header.
type Header struct {
	Tool        report.Tool
	Started     time.Time
	Finished    time.Time
	CommandLine []string
	Inputs      []string
	Sheet       string // path as given, "" for none
	SheetSHA256 string
	DeltaTModel string
	TZData      string
	ZoneMap     string
	Magnetic    string
	SelfTest    report.SelfTest
	Notes       []string
}

// Head builds the report's header: everything but the photos, which
// Result.Photos hands out one at a time (report.Audit.Photos stays empty).
func Head(res *Result, h Header) *report.Audit {
	a := &report.Audit{
		Schema: report.SchemaID,
		Tool:   h.Tool,
		Run: report.Run{
			Started:        stamp(h.Started),
			Finished:       stamp(h.Finished),
			CommandLine:    h.CommandLine,
			Inputs:         h.Inputs,
			ShadowSheet:    h.Sheet,
			ShadowSheetSHA: h.SheetSHA256,
			DeltaTModel:    h.DeltaTModel,
			TZDataVersion:  h.TZData,
			ZoneMapVersion: h.ZoneMap,
			MagneticModel:  h.Magnetic,
			SelfTest:       h.SelfTest,
			SheetErrors:    nonNil(res.SheetProblems),
			Notes:          nonNil(h.Notes),
			Counts:         report.Counts{Files: len(res.Verdicts), ByVerdict: map[string]int{}},
		},
		Photos:  []report.Photo{},
		Cameras: []report.Camera{},
	}
	for _, v := range res.Verdicts {
		a.Run.Counts.ByVerdict[v]++
	}
	for _, c := range res.Cameras.List {
		if c.Fitted {
			a.Run.Counts.Cameras++
		}
		rc := camera(c)
		rc.Name = res.cameraNames[c.ID]
		a.Cameras = append(a.Cameras, rc)
	}
	return a
}

// Carded says which photos, in report order, report.html gives a card.
func (r *Result) Carded() []bool { return report.Carded(r.Verdicts) }

// Photos hands every photo of the report to fn, in report order, each
// built afresh from the spool (fn may keep it). withSunPaths adds a day of
// sun positions to each photo that report.html gives a card (for the HTML
// charts only, not part of the JSON): a day of sun positions for each of
// 100,000 photos would be hundreds of megabytes that the page does not
// show. It stops at fn's first error or when ctx is done.
func (r *Result) Photos(ctx context.Context, withSunPaths bool, fn func(p *report.Photo) error) error {
	var carded []bool
	if withSunPaths {
		carded = r.Carded()
	}
	return r.each(ctx, func(k int, s *stored) error {
		p := photo(r.entries[r.order[k]], s)
		if s.Clock >= 0 {
			if rs, ok := r.photoClock[s.Clock].ResetBefore(); ok {
				p.ClockReset = solarcheck.ResetNote(rs)
			}
			if seg, ok := r.photoClock[s.Clock].Segment(); ok && seg.DriftMeasured {
				d := clockSegment(seg)
				p.CameraDriftSPerDay, p.CameraDriftLowSPerDay, p.CameraDriftHighSPerDay = d.DriftSPerDay, d.DriftLowSPerDay, d.DriftHighSPerDay
			}
		}
		if a, ok := r.x.Local(&s.Finding, s.Finding.Earliest); ok {
			b, _ := r.x.Local(&s.Finding, s.Finding.Latest)
			p.CorrectedLocalEarliest, p.CorrectedLocalLatest = localStamp(a), localStamp(b)
		}
		if t, ok := r.late[k]; ok {
			p.Thumbnail = t
		}
		if withSunPaths && carded[k] {
			for _, sp := range r.x.SunPath(&s.Finding) {
				p.SunPath = append(p.SunPath, sunAt(sp))
			}
		}
		return fn(&p)
	})
}

func photo(e Entry, s *stored) report.Photo {
	f := &s.Finding
	p := report.Photo{
		Path:        e.Rel,
		Root:        e.Root,
		ID:          e.ID,
		SHA256:      s.SHA256,
		Size:        s.Size,
		Container:   s.Container,
		Camera:      f.Camera,
		CameraName:  f.CameraName,
		ZoneOptions: []string{},
		Checks:      []report.Check{},
		Rejected:    []report.Alternative{},
		Measured:    []report.Measured{},
		Verdict:     string(f.Verdict),
		Explanation: f.Explanation,
		Error:       s.Error,
		FileNotes:   append([]string{}, s.Notes...),
		GPSRejected: f.GPSRejected,
		Thumbnail:   s.Thumbnail,
	}
	if !f.Wall.IsZero() {
		p.ClaimedLocal = wallText(f.Wall)
	}
	if f.HasClaimed {
		p.ClaimSource = string(f.Claim.Rule)
		if f.Verdict != solarcheck.Ambiguous {
			p.ClaimedUTC = stamp(f.Claimed)
		}
	}
	p.ClaimNotes = f.Claim.Notes
	for i, r := range f.Readings {
		c := r.Candidate
		rr := report.Reading{UTC: stamp(c.UTC), UTCOffset: c.UTC.In(time.FixedZone("", c.OffsetSec)).Format("-07:00"),
			Abbreviation: c.Abbrev, Zone: c.Zone, WallTimeExisted: c.Real, Used: i == f.ReadingUsed,
			Verdict: string(r.Verdict), Explanation: r.Explanation}
		if c.Abbrev != "" && (c.Abbrev[0] == '+' || c.Abbrev[0] == '-') {
			rr.Abbreviation = "" // the tz database's numeric stand-in, not a name
		}
		if r.Offset != nil {
			step := figure.IntervalStep(r.Offset.LowSec, r.Offset.HighSec)
			rr.OffsetS, rr.OffsetLowS, rr.OffsetHighS = ptr(figure.Round(r.Offset.Sec, step)), ptr(figure.Round(r.Offset.LowSec, step)), ptr(figure.Round(r.Offset.HighSec, step))
		}
		p.Readings = append(p.Readings, rr)
	}
	// The zone is the place's when the place is known (the claim may have
	// used an offset tag instead); otherwise whatever the claim used.
	switch {
	case len(f.PlaceZones) > 0:
		p.Zone, p.ZoneOptions = f.PlaceZones[0], f.PlaceZones
	case len(f.Claim.Zones) > 0:
		p.Zone, p.ZoneOptions = f.Claim.Zones[0], f.Claim.Zones
	}
	if f.HasPlace {
		// Without the binary noise of the degrees-minutes-seconds sum:
		// −3.6868, as the file's rationals give it, not −3.6868000000000003.
		p.Lat, p.Lon = ptr(figure.Round(f.LatDeg, 1e-9)), ptr(figure.Round(f.LonDeg, 1e-9))
	}
	if f.Sun != nil {
		s := sunAt(*f.Sun)
		p.Sun = &s
	}
	if f.BestFit != nil {
		s := sunAt(*f.BestFit)
		p.BestFit = &s
	}
	for _, c := range f.Checks {
		rc := report.Check{Kind: string(c.Kind), Status: string(c.Status), Unit: c.Unit, Sentence: c.Sentence}
		if c.HasFigure {
			rc.Figure = ptr(round(c.Figure, 3))
		}
		if c.HasUncertainty {
			rc.Uncertainty = ptr(round(c.Uncertainty, 3))
		}
		if c.Fit != nil {
			rc.MisfitChi2, rc.MisfitDof, rc.MisfitP = ptr(round(c.Fit.Chi2, 2)), ptr(c.Fit.Dof), ptr(round(c.Fit.PValue, 4))
		}
		p.Checks = append(p.Checks, rc)
	}
	if f.Offset != nil {
		// Rounded by the step the interval supports, as the sentences are
		// (figure.Spans), so that report.json, the card and the explanation
		// state the same digits.
		step := figure.IntervalStep(f.Offset.LowSec, f.Offset.HighSec)
		p.OffsetS, p.OffsetLowS, p.OffsetHighS = ptr(figure.Round(f.Offset.Sec, step)), ptr(figure.Round(f.Offset.LowSec, step)), ptr(figure.Round(f.Offset.HighSec, step))
	}
	if !f.Earliest.IsZero() {
		p.CorrectedUTCEarliest, p.CorrectedUTCLatest = stamp(f.Earliest), stamp(f.Latest)
	}
	for _, r := range f.Rejected {
		p.Rejected = append(p.Rejected, report.Alternative{Verdict: string(r.Verdict), Reason: r.Reason})
	}
	for _, b := range f.SeasonBands {
		p.SeasonBands = append(p.SeasonBands, report.SeasonBand{First: b.First.Format(time.DateOnly), Last: b.Last.Format(time.DateOnly),
			DaysFromClaim: b.DaysFromClaim, Best: stamp(b.Best.Time)})
	}
	p.FactoryDate = f.FactoryDate
	if f.ShadowFix != nil {
		p.ShadowFix = &report.Fix{Lat: round(f.ShadowFix.LatDeg, 5), Lon: round(f.ShadowFix.LonDeg, 5), RadiusKm: round(f.ShadowFix.RadiusKm, 2)}
	}
	for _, d := range f.Measured {
		p.Measured = append(p.Measured, report.Measured{
			Object: d.Object, Azimuth: round(d.AzimuthDeg, 3), AzimuthSD: round(d.AzimuthSDDeg, 3),
			Altitude: round(d.AltitudeDeg, 3), AltitudeSD: round(d.AltitudeSDDeg, 3), HasAltitude: d.HasAltitude,
			Sheet:           sheetValues(d.Sheet),
			NorthCorrection: round(d.NorthCorrectionDeg, 3), NorthCorrectionSD: round(d.NorthCorrectionSDDeg, 3),
		})
	}
	return p
}

func camera(c *solarcheck.Camera) report.Camera {
	rc := report.Camera{ID: c.ID, Photos: len(c.Inputs), Segments: []report.ClockSegment{}, Outliers: []string{}, Resets: []string{}, ResetNotes: []string{}, OrderBreaks: []string{}, Points: []report.ClockPoint{}, Note: c.Note}
	for _, ob := range c.Model.OrderBreaks {
		rc.OrderBreaks = append(rc.OrderBreaks, fmt.Sprintf("%s (file %d) claims a time after %s (file %d)", ob.Later, ob.LaterNumber, ob.Earlier, ob.EarlierNumber))
	}
	for _, r := range c.Model.Resets {
		rc.Resets = append(rc.Resets, r.After)
		rc.ResetNotes = append(rc.ResetNotes, solarcheck.ResetNote(r))
	}
	if !c.Fitted || len(c.Model.Segments) == 0 {
		return rc
	}
	// The segment with the most evidence stands for the camera; every
	// segment is listed, and the chart shows each with the breaks.
	main := 0
	for k, s := range c.Model.Segments {
		cs := clockSegment(s)
		if c.Tagged {
			cs.ClockZone = "the zone of each photo's offset tag"
		}
		rc.Segments = append(rc.Segments, cs)
		if s.Points > c.Model.Segments[main].Points {
			main = k
		}
	}
	seg, top := c.Model.Segments[main], rc.Segments[main]
	rc.ClockZone, rc.OffsetS, rc.OffsetLowS, rc.OffsetHighS, rc.OffsetAtUTC = top.ClockZone, top.OffsetS, top.OffsetLowS, top.OffsetHighS, top.OffsetAtUTC
	rc.OffsetSDs = ptr(round(seg.OffsetHalf95Sec/1.96, 1))
	rc.DriftSPerDay, rc.DriftLowSPerDay, rc.DriftHighSPerDay, rc.DriftNote = top.DriftSPerDay, top.DriftLowSPerDay, top.DriftHighSPerDay, top.DriftNote
	if seg.DriftMeasured {
		half := max(seg.DriftHighSecPerDay-seg.DriftSecPerDay, seg.DriftSecPerDay-seg.DriftLowSecPerDay)
		rc.DriftPPM = ptr(figure.Round(seg.DriftPPM(), figure.Step(half/86400*1e6)))
	}
	if len(c.Model.Segments) > 1 {
		rc.Note = fmt.Sprintf("The clock was reset %d time(s); the figures above are for the segment with the most evidence (%d photos with a time witness); every segment is listed.", len(c.Model.Segments)-1, seg.Points)
	}
	for k, mp := range c.Model.Photos {
		if mp.Outlier {
			rc.Outliers = append(rc.Outliers, mp.Key)
		}
		in := c.Inputs[k]
		if !in.HasEvidence || mp.Segment < 0 || mp.Factory {
			continue // the chart shows the evidence of the set clock
		}
		z := float64(c.Model.Segments[mp.Segment].Zone.OffsetSec)
		rc.Points = append(rc.Points, report.ClockPoint{
			Path: in.Path, ClaimedUTC: stamp(in.Reading.Add(-time.Duration(z) * time.Second)),
			OffsetS: round(in.Offset.Sec-z, 1), LowS: round(in.Offset.LowSec-z, 1), HighS: round(in.Offset.HighSec-z, 1),
			Outlier: mp.Outlier, Segment: mp.Segment,
		})
	}
	return rc
}

// clockSegment is one segment's figures for the report: the clock's error
// against the zone it is set to (UTC when undecided), its interval, and its
// drift with its interval or the reason none is stated.
func clockSegment(s clock.Segment) report.ClockSegment {
	z := time.Duration(s.Zone.OffsetSec) * time.Second
	e, h := s.ErrorSec(), s.OffsetHalf95Sec
	step := figure.IntervalStep(e-h, e+h) // the figures as the sentences round them
	out := report.ClockSegment{
		From: stamp(s.First.Add(-z)), To: stamp(s.Last.Add(-z)), Photos: s.Points,
		OffsetS:     ptr(figure.Round(e, step)),
		OffsetLowS:  ptr(figure.Round(e-h, step)),
		OffsetHighS: ptr(figure.Round(e+h, step)),
		OffsetAtUTC: stamp(s.T0.Add(-z)),
		DriftNote:   s.DriftReason,
	}
	if s.Zone.Decided {
		out.ClockZone = solarcheck.OffsetLabel(s.Zone.OffsetSec)
	}
	if s.DriftMeasured {
		ds := figure.Step(max(s.DriftHighSecPerDay-s.DriftSecPerDay, s.DriftSecPerDay-s.DriftLowSecPerDay))
		out.DriftSPerDay = ptr(figure.Round(s.DriftSecPerDay, ds))
		out.DriftLowSPerDay = ptr(figure.Round(s.DriftLowSecPerDay, ds))
		out.DriftHighSPerDay = ptr(figure.Round(s.DriftHighSecPerDay, ds))
	}
	return out
}

// wallText formats a wall time as ISO 8601 local time, with the
// sub-seconds the camera wrote (trailing zeros dropped) and the offset when
// one was tagged.
func wallText(w zone.Wall) string {
	t := time.Date(w.Year, w.Month, w.Day, w.Hour, w.Minute, w.Second, w.Nanosecond, time.UTC)
	s := t.Format("2006-01-02T15:04:05.999") // to the millisecond at most, as every figure (package figure)
	if w.HasOffset {
		s += time.Date(2000, 1, 1, 0, 0, 0, 0, time.FixedZone("", w.OffsetSec)).Format("-07:00")
	}
	return s
}

func sunAt(s solarcheck.SunSample) report.SunAt {
	return report.SunAt{Time: stamp(s.Time), Azimuth: round(s.AzimuthDeg, 3), Altitude: round(s.AltitudeDeg, 3)}
}

// stamp formats t as RFC 3339 UTC with the sub-seconds it has, to the
// millisecond at most (no camera or GPS tag records finer; a corrected time
// computed from a float offset would otherwise show nanosecond noise); ""
// for zero.
func stamp(t time.Time) string {
	if t.IsZero() {
		return ""
	}
	return t.UTC().Format("2006-01-02T15:04:05.999Z07:00")
}

// round keeps d decimals: the report states figures to a precision that
// means something, and stable rounding keeps reruns byte-identical.
func round(v float64, d int) float64 {
	p := math.Pow(10, float64(d))
	return math.Round(v*p) / p
}

func ptr[T any](v T) *T { return &v }

func nonNil(s []string) []string {
	if s == nil {
		return []string{}
	}
	return s
}

// LateThumbnails writes the thumbnails of the photos that report.html gives
// a card (Result.Carded), after the run: on a batch larger than
// report.MaxCards the command passes no Options.Thumbs to Run, since which
// photos get a card is known only once every verdict is, and a thumbnail
// per photo of 100,000 would fill the report folder with images no page
// shows. Each file is read again (metadata and preview only, not hashed) by
// up to workers goroutines; thumbs is Options.Thumbs. Photos then carries
// the thumbnails. It stops early, returning ctx.Err(), when ctx is
// cancelled.
func LateThumbnails(ctx context.Context, res *Result, workers int, read exifread.Options, thumbs func(int, Entry, *exifread.Record) string) error {
	read.SkipHash, read.SkipSidecar = true, true
	var todo []int // report positions
	for k, carded := range res.Carded() {
		if v := res.Verdicts[k]; carded && v != string(solarcheck.Unreadable) && v != string(solarcheck.Sidecar) {
			todo = append(todo, k)
		}
	}
	names := make([]string, len(todo))
	err := parallel(ctx, len(todo), workers, func(j int) {
		i := res.order[todo[j]]
		e := res.entries[i]
		rec := exifread.ReadFile(e.Abs, read)
		if rec.Err == nil {
			names[j] = thumbs(i, e, &rec)
		}
	})
	if err != nil {
		return err
	}
	res.late = map[int]string{}
	for j, k := range todo {
		if names[j] != "" {
			res.late[k] = names[j]
		}
	}
	return nil
}

// sheetValues is the examiner's row as written, for the report.
func sheetValues(m solarcheck.Measurement) report.SheetValues {
	v := report.SheetValues{BearingSD: m.BearingSDDeg, Declination: m.DeclinationDeg}
	switch m.North {
	case solarcheck.MagneticNorth:
		v.North = "magnetic"
	case solarcheck.GridNorth:
		v.North = "grid"
	default:
		v.North = "true"
	}
	switch m.Kind {
	case solarcheck.MeasureShadow:
		v.Kind, v.Bearing, v.ObjectHeight, v.ShadowLength = "shadow", ptr(m.ShadowBearingDeg), ptr(m.ObjectHeight), ptr(m.ShadowLength)
	case solarcheck.MeasureShadowBearing:
		v.Kind, v.Bearing = "shadow_bearing", ptr(m.ShadowBearingDeg)
	case solarcheck.MeasureSighting:
		v.Kind, v.Bearing, v.SunAltitude = "sighting", m.SunAzimuthDeg, m.SunAltitudeDeg
	}
	return v
}

// localStamp formats a local time as ISO 8601 with its UTC offset, to the
// millisecond at most, as stamp does for UTC.
func localStamp(t time.Time) string { return t.Format("2006-01-02T15:04:05.999-07:00") }
