// Package angle reduces angles in degrees to their usual ranges and converts
// between degrees and radians. Every package uses this one copy, so that all
// agree on the boundaries and round the same way.
package angle

import "math"

// Norm360 maps an angle to [0°, 360°), for azimuths and bearings.
func Norm360(a float64) float64 {
	a = math.Mod(a, 360)
	if a < 0 {
		a += 360
	}
	if a >= 360 { // -1e-17 + 360 rounds to 360
		a = 0
	}
	return a
}

// Wrap180 maps an angle to [−180°, 180°), for differences of azimuths and
// for hour angles.
func Wrap180(a float64) float64 {
	return Norm360(a+180) - 180
}

// Rad converts degrees to radians. Degrees are the unit at the edges and in
// names (azimuthDeg); radians exist only inside a formula's math.Sin/Cos.
func Rad(deg float64) float64 { return deg * (math.Pi / 180) }

// Deg converts radians to degrees.
func Deg(rad float64) float64 { return rad * (180 / math.Pi) }
