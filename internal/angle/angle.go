// Package angle reduces angles in degrees to their usual ranges. Every
// package uses this one copy, so that all agree on the boundaries.
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
