// Package sphere measures on the Earth taken as a sphere of its mean
// radius: the one copy of the great-circle distance every package uses.
// The ellipsoid changes such distances by under 0.5 %, far inside the
// uncertainties they are compared with.
package sphere

import (
	"math"

	"github.com/gnomon-forensics/gnomon/internal/angle"
)

// MeanRadiusKm is the mean radius of the Earth, R1 of the IUGG (Moritz,
// Geodetic Reference System 1980): 6371.0088 km, used to 0.1 km.
const MeanRadiusKm = 6371.0

// DistanceKm is the great-circle distance between two points given in
// degrees, by the haversine formula (R. W. Sinnott, "Virtues of the
// Haversine", Sky and Telescope 68(2), 1984), which stays accurate for
// points close together.
func DistanceKm(lat1, lon1, lat2, lon2 float64) float64 {
	s1 := math.Sin(angle.Rad(lat2-lat1) / 2)
	s2 := math.Sin(angle.Rad(lon2-lon1) / 2)
	h := s1*s1 + math.Cos(angle.Rad(lat1))*math.Cos(angle.Rad(lat2))*s2*s2
	return 2 * MeanRadiusKm * math.Asin(math.Min(1, math.Sqrt(h)))
}
