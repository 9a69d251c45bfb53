package solarcheck

import (
	"github.com/gnomon-forensics/gnomon/internal/figure"
	"time"

	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

// Verdict is the diagnosis of one photo. The words are binding: they are the
// JSON field "verdict" of the report and scripts depend on them.
type Verdict string

// The verdicts, from "the evidence agrees" to "nothing to judge".
const (
	Consistent     Verdict = "consistent"      // every witness agrees with the claim at the stated uncertainty
	ClockOffset    Verdict = "clock_offset"    // off by an amount that is not a zone, DST or 12 h step
	ZoneSlip       Verdict = "zone_slip"       // off by whole zone increments (a camera on another zone's time)
	DSTSlip        Verdict = "dst_slip"        // off by one hour where the place keeps daylight saving
	AMPMSlip       Verdict = "ampm_slip"       // off by 12 hours
	SeasonMismatch Verdict = "season_mismatch" // no time on the claimed date fits the shadows; another date does
	PlaceMismatch  Verdict = "place_mismatch"  // the shadows put the camera somewhere else than its GPS tag
	LightMismatch  Verdict = "light_mismatch"  // the exposure does not fit the light at the claimed moment
	Ambiguous      Verdict = "ambiguous"       // the wall time denotes several instants and the evidence does not tell which (Finding.Readings)
	Unverified     Verdict = "unverified"      // no independent witness
	Unreadable     Verdict = "unreadable"      // the file could not be read well enough to judge
	Sidecar        Verdict = "sidecar"         // an XMP sidecar: read with its photo, not judged on its own
)

// Status is the outcome of one check.
type Status string

// Check statuses.
const (
	Agrees    Status = "agrees"    // the witness fits the claim within its 95 % interval
	Conflicts Status = "conflicts" // the witness excludes the claim at the 95 % level
	Open      Status = "open"      // the witness was consulted but cannot decide
	Skipped   Status = "skipped"   // the check did not apply (no witness, or a reason given)
)

// Kind names a check: our names for the independent witnesses. The words
// are binding, like Verdict's: they are the JSON field "kind" of a check.
type Kind string

// Check kinds.
const (
	KindShadowTime   Kind = "shadow_time"  // sun direction from shadows/sightings vs the sun at the claimed moment
	KindSunUp        Kind = "sun_up"       // shadows need the sun above the horizon
	KindGPSClock     Kind = "gps_clock"    // camera clock vs the GPS receiver's UTC
	KindOffsetTag    Kind = "offset_tag"   // the camera's OffsetTime tag vs the place's zone
	KindLight        Kind = "light"        // exposure vs expected daylight (a hint)
	KindShadowPlace  Kind = "shadow_place" // position from the shadows vs the GPS tag
	KindCameraClock  Kind = "camera_clock" // this photo vs its camera's fitted clock
	KindShotOrder    Kind = "shot_order"   // capture order vs file numbering
	KindMeasurements Kind = "measurements" // agreement between the objects measured in one photo
)

// Check is one witness's testimony about one photo.
type Check struct {
	Kind   Kind
	Status Status
	// Figure is the check's number in Unit (an offset in seconds, a distance
	// in km, an exposure difference in EV); HasFigure is false when there is none.
	Figure    float64
	HasFigure bool
	Unit      string
	// Uncertainty is the half-width of the figure's 95 % interval, same unit.
	Uncertainty    float64
	HasUncertainty bool
	// Fit is the goodness of fit behind the figure, for checks that fit a
	// measurement (shadow_time); nil for the others.
	Fit      *Fit
	Sentence string
}

// Fit is how well a measurement fits the sun at its best-fitting time: the
// misfit χ², its degrees of freedom, and the p-value, the chance of a
// misfit at least this large if the measurement and its stated errors are
// right. A p-value below 0.05 means the measurement and the sun disagree
// at every time searched (the 95 % convention).
type Fit struct {
	Chi2   float64
	Dof    int
	PValue float64
}

// DateBand is a run of consecutive dates on which the measured sun
// direction fits the sun at the place (p ≥ 0.05), with the best-fitting
// time in it. First and Last are dates (midnight UTC of the local solar
// date).
type DateBand struct {
	First, Last time.Time
	// DaysFromClaim is the signed number of days from the band to the
	// claimed date: positive when the band lies before it (claimed minus
	// evidence, like every offset).
	DaysFromClaim float64
	Best          SunSample
	Fit           Fit
}

// Interval is a time offset in seconds (claimed minus evidence) with its 95 %
// interval [LowSec, HighSec].
type Interval struct {
	Sec, LowSec, HighSec float64
}

// HalfWidth is half the interval's width, in seconds.
func (iv Interval) HalfWidth() float64 { return (iv.HighSec - iv.LowSec) / 2 }

// spans formats the offset and its interval as sentences show them, with
// the rounding step the interval supports (figure.Spans); report.json
// stores the same figures rounded by the same step.
func (iv Interval) spans() (sec, low, high string) {
	return figure.Spans(iv.Sec, iv.LowSec, iv.HighSec)
}

// Contains reports whether x lies in the interval widened by slack on both sides.
func (iv Interval) Contains(x, slackSec float64) bool {
	return x >= iv.LowSec-slackSec && x <= iv.HighSec+slackSec
}

// Alternative is an explanation that was tested and rejected, with why.
type Alternative struct {
	Verdict Verdict
	Reason  string
}

// SunSample is the sun at one instant.
type SunSample struct {
	Time        time.Time
	AzimuthDeg  float64
	AltitudeDeg float64
}

// Direction is one measured sun direction (from a shadow or a sighting) in
// true-north degrees, with 1-sigma errors.
type Direction struct {
	Object        string
	AzimuthDeg    float64
	AzimuthSDDeg  float64
	HasAzimuth    bool
	AltitudeDeg   float64
	AltitudeSDDeg float64
	HasAltitude   bool
	Correlation   float64
	// Sheet is the examiner's row as written, so that a report shows the
	// raw values beside the direction derived from them.
	Sheet Measurement
	// NorthCorrectionDeg is what was added to the sheet's bearings to make
	// them true (the magnetic declination, or the grid convergence; 0 for
	// true bearings), with its 1-sigma error, which is part of AzimuthSDDeg.
	NorthCorrectionDeg, NorthCorrectionSDDeg float64
}

// Fix is a place on Earth with a 95 % radius.
type Fix struct {
	LatDeg, LonDeg, RadiusKm float64
}

// Finding is everything the checks concluded about one photo.
type Finding struct {
	Path   string
	Camera string // camera id (clock.CameraID); "" when the file names none
	// CameraName is the camera as a person reads it: make, model and serial
	// as written ("Brisa BR-10, serial BR10-2290").
	CameraName string

	// Wall is the capture wall time used, and WallTag which tag it came from.
	Wall    zone.Wall
	WallTag string
	// Claim is how the claimed UTC instant was decided; Claimed is the
	// instant the checks, figures and verdict follow: the only candidate,
	// or, when a skipped or repeated wall time or overlapping zones give
	// several, the one the evidence supports (Readings[ReadingUsed]). For
	// an Ambiguous finding it is the earliest candidate, kept only so that
	// charts have a day to draw; no figure is stated for it.
	Claim      zone.Claimed
	Claimed    time.Time
	HasClaimed bool
	// Readings are the outcomes of the checks under each of Claim's
	// candidates, in their order, when there are several; nil otherwise.
	// ReadingUsed indexes the one Claimed follows, -1 when the verdict is
	// Ambiguous.
	Readings    []Reading
	ReadingUsed int

	// Place is where the photo was taken, by PlaceSource ("gps" or "sheet"),
	// and PlaceZones the IANA zones that hold there (several where zones
	// overlap).
	LatDeg, LonDeg float64
	HasPlace       bool
	PlaceSource    string
	ElevationM     float64
	PlaceZones     []string
	// GPSRejected says why the file's GPS position was not used (its raw
	// value and the reader's reason); "" when there was none or it was used.
	GPSRejected string

	Sun      *SunSample  // at the claimed moment and place
	BestFit  *SunSample  // the sun at the best-fitting shadow time
	Measured []Direction // per object, true north
	Checks   []Check

	Verdict     Verdict
	Offset      *Interval // claimed minus evidence, seconds; nil without a time witness
	Earliest    time.Time // corrected UTC window; zero without one
	Latest      time.Time
	Explanation string
	Rejected    []Alternative
	ShadowFix   *Fix
	// SeasonBands are the date ranges on which the shadows fit the sun,
	// nearest the claim first, when no time near the claim does.
	SeasonBands []DateBand
	// FactoryDate marks a capture date that looks like a camera clock
	// reset to its factory default (clock.FactoryEpoch).
	FactoryDate bool

	// FromCamera marks a corrected window that comes from the camera's
	// clock model rather than the photo's own witnesses.
	FromCamera bool

	// Basis is what the diagnosis weighed, for Examine's own use: nothing
	// after Examine reads it (the camera model works from ClockInput and
	// the finding's verdict and offset), and the audit's spool does not keep
	// it.
	Basis Basis
}

// Reading is the outcome of the checks when the claimed wall time is read
// as one of several candidate instants.
type Reading struct {
	Candidate   zone.Candidate
	Verdict     Verdict
	Offset      *Interval // claimed minus evidence under this reading; nil without a time witness
	Explanation string
}

// Basis is the time evidence the checks gathered about one photo, for the
// diagnosis and for its camera's model.
type Basis struct {
	ShadowOffset *Interval // from the shadows, nil without
	GPSOffset    *Interval // from the GPS clock, nil without
	SeasonOff    bool      // shadows fit another season only
	ShadowMisfit bool      // shadows fit the sun nowhere near the claim, and no other date rules it out
	LightOff     bool      // the exposure conflicts with the light at the claim
	StepSec      float64   // the step (zone, DST, 12 h) the verdict names; 0 for none
	PlaceNote    string    // why a GPS position in the file was not used, as a sentence
}

// check appends c to f's checks.
func (f *Finding) check(c Check) { f.Checks = append(f.Checks, c) }

// Check returns the check of the given kind, if f has one.
func (f *Finding) Check(kind Kind) (Check, bool) {
	for _, c := range f.Checks {
		if c.Kind == kind {
			return c, true
		}
	}
	return Check{}, false
}
