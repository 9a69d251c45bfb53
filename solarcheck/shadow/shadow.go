// Package shadow converts between the shadow of a vertical object and the
// direction of the sun that casts it, on level ground and on a uniformly
// inclined plane, and propagates the examiner's measurement uncertainties to
// the sun's azimuth and altitude.
//
// Geometry: the object is a vertical segment of height h standing on the
// ground at its base; the shadow is the segment from the base to the tip,
// where the ray from the sun through the top of the object meets the ground.
// The sun is treated as a point at the centre of its disc, so the tip is the
// middle of the penumbra; the altitude recovered from a shadow is therefore
// the apparent (refracted) altitude of the sun's centre, the one a camera
// sees. Azimuths and bearings are degrees clockwise from true north.
//
// Conventions for sloped ground: the ground is a plane through the base,
// inclined by SlopeDeg and falling toward the bearing TowardDeg (the downhill
// direction). The shadow bearing is the horizontal (map) bearing of the line
// from base to tip; the shadow length is the distance from base to tip
// measured along the ground, as a tape laid on the slope would measure it.
// Height and length may be in any one unit of length: only their ratio
// matters.
//
// Uncertainty: first-order (Jacobian) propagation of independent 1-sigma
// errors of height, length and bearing. Slope and its direction are taken as
// exact. First order is accurate while the relative errors are small (a few
// per cent); the tests check it against a Monte Carlo simulation.
//
// Limits: the object must be vertical (a leaning pole biases both angles),
// the ground must be planar between base and tip, and the base must be the
// true foot of the object. None of this is checked.
package shadow

import (
	"errors"
	"fmt"
	"math"

	"github.com/gnomon-forensics/gnomon/internal/angle"
)

// ErrInvalid marks input that cannot describe a shadow (a negative height, a
// zero length, a slope of 90° or more). Errors wrap it; test with errors.Is.
var ErrInvalid = errors.New("invalid shadow input")

// ErrNoShadow marks a sun that casts no shadow on the ground described: the
// sun is at or below the horizon, or behind the slope (the ground faces
// away from the sun and lies in its own shade).
var ErrNoShadow = errors.New("sun casts no shadow on this ground")

// Ground is the plane the shadow falls on. The zero value is level ground.
type Ground struct {
	SlopeDeg  float64 // inclination of the plane, 0 ≤ SlopeDeg < 90
	TowardDeg float64 // bearing the plane falls toward (downhill), degrees true
}

// Shadow is a measured shadow of a vertical object.
type Shadow struct {
	Height     float64 // height of the object, > 0, same unit as Length
	Length     float64 // base to tip along the ground, > 0
	BearingDeg float64 // horizontal bearing base → tip, degrees true
	Ground     Ground
}

// Sun is a direction of the sun: azimuth clockwise from true north and
// altitude above the horizontal, both in degrees.
type Sun struct {
	AzimuthDeg  float64
	AltitudeDeg float64
}

// Uncertainty holds independent 1-sigma measurement errors.
type Uncertainty struct {
	HeightSD     float64 // same unit as Height
	LengthSDPct  float64 // per cent of the measured length
	BearingSDDeg float64
}

// Estimate is a sun direction with its propagated 1-sigma errors.
// Correlation is the correlation coefficient between the azimuth and altitude
// errors; it is zero on level ground and in general non-zero on a slope,
// where the bearing also changes the tip's height.
type Estimate struct {
	Sun            Sun
	AzimuthSDDeg   float64
	AltitudeSDDeg  float64
	Correlation    float64
	ShadowRelative float64 // Length / Height, for the record
}

func (g Ground) check() error {
	if math.IsNaN(g.SlopeDeg) || g.SlopeDeg < 0 || g.SlopeDeg >= 90 {
		return fmt.Errorf("slope %g°: want 0 ≤ slope < 90: %w", g.SlopeDeg, ErrInvalid)
	}
	if math.IsNaN(g.TowardDeg) || math.IsInf(g.TowardDeg, 0) {
		return fmt.Errorf("slope direction %g°: %w", g.TowardDeg, ErrInvalid)
	}
	return nil
}

// tilt returns k = tan(slope)·cos(bearing − toward): the rate at which the
// ground falls per unit of horizontal distance along bearingDeg.
func (g Ground) tilt(bearingDeg float64) float64 {
	return math.Tan(angle.Rad(g.SlopeDeg)) * math.Cos(angle.Rad(bearingDeg-g.TowardDeg))
}

func (s Shadow) check() error {
	switch {
	case !(s.Height > 0) || math.IsInf(s.Height, 0):
		return fmt.Errorf("height %g: want > 0: %w", s.Height, ErrInvalid)
	case !(s.Length > 0) || math.IsInf(s.Length, 0):
		return fmt.Errorf("shadow length %g: want > 0: %w", s.Length, ErrInvalid)
	case math.IsNaN(s.BearingDeg) || math.IsInf(s.BearingDeg, 0):
		return fmt.Errorf("shadow bearing %g: %w", s.BearingDeg, ErrInvalid)
	}
	return s.Ground.check()
}

// Derivation (local east-north-up frame, base of the object at the origin).
//
// Let the unit horizontal vector of bearing β be u(β) = (sin β, cos β). The
// ground is the plane z = −tan(s)·(p·u(f)) for horizontal position p: it
// falls by tan(s) per unit distance toward f. A point at horizontal distance
// D along bearing b therefore lies at height
//
//	z = −D·tan(s)·cos(b − f) = −D·k,   k = tan(s)·cos(b − f).          (1)
//
// The sun lies at azimuth A and altitude e; the ray from the top (0, 0, h)
// away from the sun runs along −(cos e sin A, cos e cos A, sin e), so its
// horizontal track has bearing b = A + 180° (the shadow's bearing does not
// depend on the slope) and it drops tan(e) per unit horizontal distance:
//
//	z(D) = h − D·tan(e).                                              (2)
//
// The tip is where (1) and (2) meet: h − D·tan e = −D·k, so
//
//	D = h / (tan e − k),        tan e = h/D + k.                     (3)
//
// A shadow exists only if tan e − k > 0; otherwise the ray never reaches the
// ground ahead (the ground faces away from the sun). Along the ground the
// tip is at slant distance
//
//	L = D·√(1 + k²),           D = L / √(1 + k²).                    (4)
//
// On level ground k = 0 and these reduce to L = h / tan e.

// SunFromShadow returns the direction of the sun that casts the shadow s,
// by eq. (3)–(4) above: azimuth = bearing + 180°, tan(altitude) = h/D + k.
func SunFromShadow(s Shadow) (Sun, error) {
	if err := s.check(); err != nil {
		return Sun{}, err
	}
	k := s.Ground.tilt(s.BearingDeg)
	d := s.Length / math.Sqrt(1+k*k) // eq. (4)
	tanE := s.Height/d + k           // eq. (3)
	if !(tanE > 0) {
		// The tip is above the top of the object: no sun above the
		// horizon could have cast this shadow.
		return Sun{}, fmt.Errorf("shadow climbs above the object's top: %w", ErrNoShadow)
	}
	return Sun{
		AzimuthDeg:  angle.Norm360(s.BearingDeg + 180),
		AltitudeDeg: angle.Deg(math.Atan(tanE)),
	}, nil
}

// ShadowFromSun returns the shadow that a vertical object of the given
// height casts on ground g when the sun is at sun: its length along the
// ground and its horizontal bearing, by eq. (3)–(4).
func ShadowFromSun(sun Sun, height float64, g Ground) (length, bearingDeg float64, err error) {
	if !(height > 0) || math.IsInf(height, 0) {
		return 0, 0, fmt.Errorf("height %g: want > 0: %w", height, ErrInvalid)
	}
	if err := g.check(); err != nil {
		return 0, 0, err
	}
	if math.IsNaN(sun.AltitudeDeg) || math.IsNaN(sun.AzimuthDeg) || sun.AltitudeDeg > 90 {
		return 0, 0, fmt.Errorf("sun at azimuth %g°, altitude %g°: %w", sun.AzimuthDeg, sun.AltitudeDeg, ErrInvalid)
	}
	if sun.AltitudeDeg <= 0 {
		return 0, 0, fmt.Errorf("sun altitude %g°: %w", sun.AltitudeDeg, ErrNoShadow)
	}
	bearingDeg = angle.Norm360(sun.AzimuthDeg + 180)
	k := g.tilt(bearingDeg)
	den := math.Tan(angle.Rad(sun.AltitudeDeg)) - k // eq. (3)
	if !(den > 0) {
		return 0, 0, fmt.Errorf("sun at altitude %g° is behind a %g° slope: %w", sun.AltitudeDeg, g.SlopeDeg, ErrNoShadow)
	}
	d := height / den
	return d * math.Sqrt(1+k*k), bearingDeg, nil // eq. (4)
}

// Propagate returns the sun direction for s with 1-sigma errors obtained by
// first-order propagation of u:
//
//	σ_az = σ_b (the azimuth is the bearing plus 180°)
//	σ_e² = (∂e/∂h σ_h)² + (∂e/∂L σ_L)² + (∂e/∂b σ_b)²
//
// with g = tan e = h·√(1+k²)/L + k (eq. 3–4), ∂e/∂x = (∂g/∂x)/(1+g²) and
//
//	∂g/∂h = √(1+k²)/L
//	∂g/∂L = −h·√(1+k²)/L²
//	∂g/∂b = (∂k/∂b)·(1 + h·k/(L·√(1+k²))),   ∂k/∂b = −tan(s)·sin(b − f).
//
// The covariance of azimuth and altitude is (∂e/∂b)·σ_b².
func Propagate(s Shadow, u Uncertainty) (Estimate, error) {
	sun, err := SunFromShadow(s)
	if err != nil {
		return Estimate{}, err
	}
	if u.HeightSD < 0 || u.LengthSDPct < 0 || u.BearingSDDeg < 0 ||
		math.IsNaN(u.HeightSD+u.LengthSDPct+u.BearingSDDeg) {
		return Estimate{}, fmt.Errorf("uncertainties %+v: want ≥ 0: %w", u, ErrInvalid)
	}
	h, l := s.Height, s.Length
	k := s.Ground.tilt(s.BearingDeg)
	r := math.Sqrt(1 + k*k)
	g := h*r/l + k
	dEdG := 1 / (1 + g*g) // radians per unit of g
	dGdH := r / l
	dGdL := -h * r / (l * l)
	dKdB := -math.Tan(angle.Rad(s.Ground.SlopeDeg)) * math.Sin(angle.Rad(s.BearingDeg-s.Ground.TowardDeg)) // per radian
	dGdB := dKdB * (1 + h*k/(l*r))

	sdL := u.LengthSDPct / 100 * l
	sdB := angle.Rad(u.BearingSDDeg)
	eH := dEdG * dGdH * u.HeightSD
	eL := dEdG * dGdL * sdL
	eB := dEdG * dGdB * sdB
	sdE := math.Sqrt(eH*eH + eL*eL + eB*eB)
	est := Estimate{
		Sun:            sun,
		AzimuthSDDeg:   u.BearingSDDeg,
		AltitudeSDDeg:  angle.Deg(sdE),
		ShadowRelative: l / h,
	}
	if sdE > 0 && sdB > 0 {
		est.Correlation = eB / sdE // cov(az, e)/(σ_az·σ_e) = (∂e/∂b·σ_b²)/(σ_b·σ_e)
	}
	return est, nil
}
