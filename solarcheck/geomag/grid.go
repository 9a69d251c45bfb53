package geomag

import (
	"fmt"
	"math"

	"github.com/gnomon-forensics/gnomon/internal/angle"
)

// Bearing conventions used throughout gnomon: bearings are clockwise from north in
// degrees, [0, 360). A magnetic bearing is measured from magnetic north, a grid
// bearing from grid north (the +y axis of the UTM grid), a true bearing from the
// geographic meridian.

// MagneticToTrue turns a magnetic bearing into a true one: true = magnetic + D,
// where D (declination) is positive when magnetic north lies east of true north.
// Example: D = +3° (east); a compass reading of 100° is 103° true.
func MagneticToTrue(magneticDeg, declinationDeg float64) float64 {
	return angle.Norm360(magneticDeg + declinationDeg)
}

// GridToTrue turns a grid bearing into a true one: true = grid + γ, where γ (the
// meridian convergence, as returned by Convergence) is the bearing of grid north
// measured clockwise from true north. In the northern hemisphere γ is positive east
// of the zone's central meridian and negative west of it; in the southern hemisphere
// the signs swap.
func GridToTrue(gridDeg, convergenceDeg float64) float64 {
	return angle.Norm360(gridDeg + convergenceDeg)
}

// UTMZoneError reports a latitude outside the UTM system (80°S to 84°N), where the
// polar stereographic (UPS) grid applies instead, or a non-finite position.
type UTMZoneError struct {
	LatDeg, LonDeg float64
}

func (e *UTMZoneError) Error() string {
	return fmt.Sprintf("geomag: %.5f,%.5f is outside the UTM system (80°S to 84°N); grid bearings there use the polar (UPS) grid, give a true or magnetic bearing instead", e.LatDeg, e.LonDeg)
}

// UTMZone returns the UTM zone number (1–60) and its central meridian (degrees) for
// a geodetic position: standard 6° zones, zone 1 starting at 180°W, with the two
// exceptions of the UTM definition (NGA/DMA TM 8358.2): zone 32V is widened to 3°E–12°E
// for south-western Norway (56°N–64°N), and between 72°N and 84°N (Svalbard) only
// zones 31, 33, 35 and 37 are used, with boundaries at 9°E, 21°E and 33°E.
func UTMZone(latDeg, lonDeg float64) (zone int, centralMeridianDeg float64, err error) {
	if math.IsNaN(latDeg) || math.IsNaN(lonDeg) || math.IsInf(lonDeg, 0) || latDeg < -80 || latDeg > 84 {
		return 0, 0, &UTMZoneError{LatDeg: latDeg, LonDeg: lonDeg}
	}
	lon := wrap180(lonDeg)
	if lon == 180 {
		lon = -180
	}
	zone = int(math.Floor((lon+180)/6)) + 1
	if zone > 60 {
		zone = 60
	}
	switch {
	case latDeg >= 56 && latDeg < 64 && lon >= 3 && lon < 12:
		zone = 32
	case latDeg >= 72 && lon >= 0 && lon < 42:
		switch {
		case lon < 9:
			zone = 31
		case lon < 21:
			zone = 33
		case lon < 33:
			zone = 35
		default:
			zone = 37
		}
	}
	return zone, float64(6*zone - 183), nil
}

// Convergence returns the meridian convergence γ (degrees) of the UTM grid at a
// geodetic position, in the zone UTMZone assigns, with that zone. γ is the bearing
// of grid north clockwise from true north, so true = grid + γ (GridToTrue).
func Convergence(latDeg, lonDeg float64) (convergenceDeg float64, zone int, err error) {
	zone, cm, err := UTMZone(latDeg, lonDeg)
	if err != nil {
		return 0, 0, err
	}
	return ConvergenceFrom(latDeg, lonDeg, cm), zone, nil
}

// ConvergenceFrom returns the meridian convergence (degrees, grid north clockwise
// from true north) of a transverse Mercator projection with the given central
// meridian on the WGS84 ellipsoid. Method: the closed form given by C. F. F. Karney
// (2008, posted to the PROJ mailing list with his transverse Mercator series; the
// exact method is in Karney, "Transverse Mercator with an accuracy of a few
// nanometers", J. Geodesy 85, 2011):
//
//	γ = atan2(sin φ · sin l · (1 + ε), cos l)
//
// where l is the longitude from the central meridian and ε a correction of order
// e'² cos⁴φ sin²l (given to second order in e'²). On a sphere (ε = 0) this is the
// exact convergence γ = atan(tan l · sin φ) of the transverse Mercator projection.
// The ellipsoidal correction is below 0.0002° within a UTM zone.
func ConvergenceFrom(latDeg, lonDeg, centralMeridianDeg float64) float64 {
	f := 1 / wgs84InvF
	e2 := f * (2 - f)
	ep2 := e2 / (1 - e2) // second eccentricity squared
	phi := angle.Rad(latDeg)
	l := angle.Rad(wrap180(lonDeg - centralMeridianDeg))
	c := math.Cos(phi)
	s := math.Sin(l)
	c2, s2 := c*c, s*s
	d := 1 - s2*c2
	carg := 1 + c2*c2*s2/d*ep2*(1+c2/(3*d*d)*(2-s2*(c2*((4*c2-1)*s2-9)+8))*ep2)
	return angle.Deg(math.Atan2(math.Sin(phi)*s*carg, math.Cos(l)))
}
