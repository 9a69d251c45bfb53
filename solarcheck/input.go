package solarcheck

import (
	"github.com/gnomon-forensics/gnomon/exifread"
	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

// Photo is the input for one photo: what the file says and what the
// examiner measured in it. The examiner's part is plain values of this
// package, so that any reader (the measurement sheet today) converts its own
// rows into them and the checks never see a file format.
type Photo struct {
	// Path identifies the photo in messages and reports (relative to its
	// input root, slash form).
	Path   string
	Record exifread.Record
	// Measurements are the sun directions the examiner measured in the
	// photo, in the order given.
	Measurements []Measurement
	// Override is what the examiner states about the photo's place and time.
	Override Override
}

// MeasureKind is what one measurement observed.
type MeasureKind int

// Measurement kinds.
const (
	// MeasureShadow: an object's height, its shadow's length and bearing,
	// giving the sun's azimuth and altitude.
	MeasureShadow MeasureKind = iota + 1
	// MeasureShadowBearing: a shadow's bearing alone, giving the azimuth.
	MeasureShadowBearing
	// MeasureSighting: the sun's azimuth and/or altitude measured directly.
	MeasureSighting
)

// North says which north a bearing is measured from.
type North int

// Bearing references. The zero value is true north.
const (
	TrueNorth     North = iota // geographic north
	MagneticNorth              // needs the magnetic declination at the place and date
	GridNorth                  // needs the map grid's meridian convergence at the place
)

// Measurement is one object measured by the examiner. Angles are degrees,
// lengths in any one unit (only their ratio counts), uncertainties 1-sigma.
type Measurement struct {
	// Source says where the examiner wrote it ("sheet.csv line 4"), for
	// messages about a measurement that could not be used.
	Source string
	Kind   MeasureKind
	Object string

	// MeasureShadow and MeasureShadowBearing: the shadow, with the ground's
	// slope (0 when level) and the bearing it falls toward.
	ObjectHeight     float64
	ShadowLength     float64
	ShadowBearingDeg float64
	SlopeDeg         float64
	SlopeTowardDeg   float64
	LengthSDPct      float64 // per cent of the length

	// MeasureSighting: either or both of the sun's azimuth and altitude.
	SunAzimuthDeg  *float64
	SunAltitudeDeg *float64

	// North is the reference of every bearing of the row (shadow, slope,
	// sighted azimuth); BearingSDDeg their 1-sigma error (also taken for a
	// sighted altitude). DeclinationDeg is the examiner's own magnetic
	// declination (east positive), used instead of the magnetic model.
	North          North
	BearingSDDeg   float64
	DeclinationDeg *float64
}

// Override is what the examiner states about a photo, replacing or
// completing what its file says.
type Override struct {
	// HasPlace marks LatDeg/LonDeg (geodetic degrees, east positive): the
	// place when the file has no usable GPS position.
	HasPlace       bool
	LatDeg, LonDeg float64
	// Wall is a clock reading without offset (zero for none), used when the
	// file holds no capture time; it is read in the place's zone.
	Wall zone.Wall
	// Time is a full time, an offset or a zone for the photo's wall time.
	Time zone.Override
}
