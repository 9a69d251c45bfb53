// Package marks measures the sun's direction from points an examiner marks
// in one photo: the base, top and shadow tip of vertical objects, vertical
// edges, the sea or plain horizon, a ground line of known bearing and the
// sun's disc, with the camera's focal length from EXIF.
//
// Method: single-view metrology (A. Criminisi, I. Reid and A. Zisserman,
// "Single View Metrology", IJCV 40(2), 2000): vertical lines meet at the
// vertical vanishing point, the horizon is the vanishing line of the ground
// plane, and with the focal length known the two fix the up direction in
// the camera. The sun's direction is then the direction of the light ray
// from a shadow tip to the top that casts it. Everything is refined together
// by one least-squares fit of a pinhole model to all marks in pixels (the
// maximum-likelihood estimate under Gaussian marking noise; R. Hartley and
// A. Zisserman, Multiple View Geometry, 2nd ed., 2004, §4.2 and appendix 6),
// with the EXIF focal length as a prior. The closed-form start (vanishing
// point by least squares, one object's own ray) is only the starting point.
//
// Uncertainty: a seeded parametric Monte Carlo (Draws draws from the fitted
// model with the stated marking noise, focal-length error and reference
// errors, each refitted); reruns are byte-identical.
//
// Lighting consistency: with two or more objects, the light rays from the
// shadow tips through the tops meet in one image point, the sun's vanishing
// point (E. Kee, J. F. O'Brien and H. Farid, "Exposing Photo Manipulation
// with Inconsistent Shadows", ACM Transactions on Graphics 32(3), 2013).
// Here it is a likelihood-ratio test: the fit with one sun for all objects
// against the fit with a sun of its own for each.
//
// Pixel convention: coordinates of the photo as displayed (after its EXIF
// orientation), origin at the top-left corner of the image, x to the right,
// y down; the centre of the top-left pixel is (0.5, 0.5). The principal
// point is taken at the image centre (width/2, height/2).
//
// Limits: a pinhole camera (lens distortion, strong in wide-angle phones,
// bends vertical lines and is not modelled), level ground under the objects
// and their shadows, truly vertical objects, an uncropped frame (a crop
// moves the principal point). None of these is checked except through the
// lighting consistency, which a slope or a leaning object also fails.
// Geometry too weak to support an answer is refused with the reason (see
// Refusal and the thresholds in solve.go); what the marks cannot determine
// is "not determined" with the reason, never a default.
//
// The package is not yet called by the audit: the measurement sheet, the
// report and the demo case are to use it in a later step.
package marks

import (
	"errors"
	"fmt"
	"math"
)

// Point is a position in the photo in pixels (see the package's convention).
type Point struct{ X, Y float64 }

// DefaultMarkSDPx is the 1-sigma marking error, in pixels, of a point
// whose own is not given: a careful click on a sharp feature in a photo
// viewed at 100 % (common practice; the prototype in issue 13 used 1.5 px).
const DefaultMarkSDPx = 1.5

// DefaultBearingSDDeg is the 1-sigma of a ground line's bearing taken from
// a map when none is given (common practice for a kerb or quay read off a
// large-scale map).
const DefaultBearingSDDeg = 1.0

// DefaultHeadingSDDeg is the 1-sigma of a phone's compass heading when none
// is given. Phone compasses are disturbed by cars, steel and the phone's
// own magnets; errors of 10° to 20° are common (common practice), so the
// heading is a weak reference.
const DefaultHeadingSDDeg = 15.0

// Object is a vertical object with its shadow on the ground: its base (where
// it meets the ground), its top, and the shadow of the top on the ground.
type Object struct {
	Label          string
	Base, Top, Tip Point
	SDPx           float64 // 1-sigma of each marked point; 0 = DefaultMarkSDPx
}

// Edge is a vertical edge without a usable shadow (a door frame, a pole, a
// building's corner): any two points on it.
type Edge struct {
	Label string
	A, B  Point
	SDPx  float64
}

// Horizon is two points on the true horizon of the sea or a flat plain,
// seen from CameraHeightM above its surface.
type Horizon struct {
	A, B          Point
	SDPx          float64
	CameraHeightM float64 // > 0; sets the dip of the horizon
}

// GroundLine is a straight line on level ground (a kerb, a quay edge, the
// foot of a wall) whose bearing is known from a map.
type GroundLine struct {
	Label        string
	From, To     Point
	SDPx         float64
	BearingDeg   float64 // true bearing from the From point toward the To point
	BearingSDDeg float64 // 1-sigma; 0 = DefaultBearingSDDeg
}

// SunDisc is the centre of the sun's disc when the sun is in the frame.
type SunDisc struct {
	Centre Point
	SDPx   float64
}

// Heading is the true azimuth of the camera's optical axis (EXIF
// GPSImgDirection converted to true north, or the examiner's override).
type Heading struct {
	Deg    float64
	SDDeg  float64 // 0 = DefaultHeadingSDDeg
	Source string  // plain words, e.g. "the phone's compass (EXIF)"
}

// Camera is the pinhole camera of the photo as displayed.
type Camera struct {
	WidthPx, HeightPx int
	FocalPx           float64 // focal length in pixels (see Focal)
	FocalSDPx         float64 // its 1-sigma
}

// Input is everything the geometry needs: the camera and the marks.
type Input struct {
	Camera      Camera
	Objects     []Object
	Edges       []Edge
	Horizon     *Horizon
	GroundLines []GroundLine
	Sun         *SunDisc
	Heading     *Heading
}

// ErrInvalid marks input that cannot describe a photo and its marks.
var ErrInvalid = errors.New("invalid marks")

// Angle is one output angle: its value and 1-sigma when Determined, and
// otherwise the reason it is not. How says, in plain words, which marks
// determined it.
type Angle struct {
	Deg, SDDeg float64
	Determined bool
	How        string
	Reason     string
}

// Vertical is the up direction found in the camera, expressed as the
// camera's pitch (elevation of the optical axis above the horizontal) and
// roll (its turn about the optical axis, positive when its right side
// dips, so the scene appears turned anticlockwise in the picture), each
// with 1-sigma, and SDDeg, the angular 1-sigma of the up direction itself.
type Vertical struct {
	Determined        bool
	How, Reason       string
	PitchDeg, RollDeg float64
	PitchSDDeg        float64
	RollSDDeg         float64
	SDDeg             float64
}

// ObjectSun is the sun direction one object's marks give on their own,
// with the up direction and focal length of the joint fit.
type ObjectSun struct {
	Label                      string
	AltitudeDeg, AltitudeSDDeg float64
	AzimuthDeg, AzimuthSDDeg   float64
	HasAzimuth                 bool
}

// LightCheck is the lighting-consistency test of two or more objects.
type LightCheck struct {
	// Chi2 is the shared-light chi-square: how much worse, in squared
	// marking sigmas, one sun for all objects fits than a sun for each.
	Chi2        float64
	DOF         int     // 2 × (objects − 1)
	Threshold95 float64 // the chi-square 95 % point for DOF
	PValue      float64
	Shared      bool // Chi2 ≤ Threshold95
	Sentence    string
}

// RefusalKind names why the geometry was refused.
type RefusalKind string

// The refusal kinds (codes for JSON; the Refusal's Sentence is for people).
const (
	RefuseSameBearing       RefusalKind = "objects_same_bearing"
	RefuseAltitudeUncertain RefusalKind = "altitude_too_uncertain"
	RefuseUpUncertain       RefusalKind = "vertical_too_uncertain"
	RefuseAboveHorizon      RefusalKind = "ground_point_above_horizon"
	RefuseNearHorizon       RefusalKind = "ground_point_near_horizon"
	RefuseShadowTowardSun   RefusalKind = "shadow_toward_sun"
	RefuseSunBelowHorizon   RefusalKind = "sun_below_horizon"
	RefuseNoFit             RefusalKind = "no_fit"
)

// Refusal says why the marks cannot support an answer.
type Refusal struct {
	Kind     RefusalKind
	Sentence string
}

// Result is what the marks determine. When Refusal is set, no figure is
// given: Altitude and Azimuth are not determined and carry the refusal as
// their reason.
type Result struct {
	Vertical    Vertical
	Altitude    Angle   // of the sun's centre above the ground plane
	Azimuth     Angle   // true, clockwise from north
	Correlation float64 // of the altitude and azimuth errors, when both are determined
	FocalPx     float64 // refined focal length
	FocalSDPx   float64
	Objects     []ObjectSun
	Light       *LightCheck
	Refusal     *Refusal
	Draws       int // Monte Carlo draws that converged
}

func finite(v ...float64) bool {
	for _, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}

func (in Input) check() error {
	c := in.Camera
	if c.WidthPx <= 0 || c.HeightPx <= 0 {
		return fmt.Errorf("image size %d×%d: %w", c.WidthPx, c.HeightPx, ErrInvalid)
	}
	if !(c.FocalPx > 0) || !finite(c.FocalPx) || !(c.FocalSDPx >= 0) || !finite(c.FocalSDPx) {
		return fmt.Errorf("focal length %g ± %g px: %w", c.FocalPx, c.FocalSDPx, ErrInvalid)
	}
	pts := func(what string, sd float64, ps ...Point) error {
		if !(sd >= 0) || !finite(sd) {
			return fmt.Errorf("%s: marking uncertainty %g px: %w", what, sd, ErrInvalid)
		}
		for _, p := range ps {
			if !finite(p.X, p.Y) {
				return fmt.Errorf("%s: point (%g, %g): %w", what, p.X, p.Y, ErrInvalid)
			}
		}
		return nil
	}
	for i, o := range in.Objects {
		if err := pts(fmt.Sprintf("object %d", i+1), o.SDPx, o.Base, o.Top, o.Tip); err != nil {
			return err
		}
	}
	for i, e := range in.Edges {
		if err := pts(fmt.Sprintf("vertical edge %d", i+1), e.SDPx, e.A, e.B); err != nil {
			return err
		}
		if e.A == e.B {
			return fmt.Errorf("vertical edge %d: its two points coincide: %w", i+1, ErrInvalid)
		}
	}
	if h := in.Horizon; h != nil {
		if err := pts("horizon", h.SDPx, h.A, h.B); err != nil {
			return err
		}
		if h.A == h.B {
			return fmt.Errorf("horizon: its two points coincide: %w", ErrInvalid)
		}
		if !(h.CameraHeightM > 0) || !finite(h.CameraHeightM) {
			return fmt.Errorf("horizon: camera height %g m: want > 0: %w", h.CameraHeightM, ErrInvalid)
		}
	}
	for i, g := range in.GroundLines {
		if err := pts(fmt.Sprintf("ground line %d", i+1), g.SDPx, g.From, g.To); err != nil {
			return err
		}
		if g.From == g.To {
			return fmt.Errorf("ground line %d: its two points coincide: %w", i+1, ErrInvalid)
		}
		if !finite(g.BearingDeg) || !(g.BearingSDDeg >= 0) || !finite(g.BearingSDDeg) {
			return fmt.Errorf("ground line %d: bearing %g ± %g°: %w", i+1, g.BearingDeg, g.BearingSDDeg, ErrInvalid)
		}
	}
	if s := in.Sun; s != nil {
		if err := pts("sun", s.SDPx, s.Centre); err != nil {
			return err
		}
	}
	if h := in.Heading; h != nil && (!finite(h.Deg) || !(h.SDDeg >= 0) || !finite(h.SDDeg)) {
		return fmt.Errorf("heading %g ± %g°: %w", h.Deg, h.SDDeg, ErrInvalid)
	}
	return nil
}
