package geomag

import "math"

// The WMM2025 error model for declination (WMM2025 Technical Report, NOAA
// NCEI and British Geological Survey, §"Model uncertainty"; the same two
// figures are the constants WMM_UNCERTAINTY_D_OFFSET and
// WMM_UNCERTAINTY_D_COEF of the WMM-2025 software): a global 1-sigma floor
// and a part that grows as the horizontal field weakens toward the
// magnetic poles, where a compass points poorly.
const (
	declSDOffsetDeg = 0.26   // degrees
	declSDCoefNTDeg = 5417.0 // degree·nT
)

// DeclinationSDDeg is the WMM2025 1-sigma uncertainty of the declination,
// in degrees, where the horizontal intensity is hnT:
// √(0.26² + (5417 / H)²). It is capped at 180°, as the WMM software caps it.
func DeclinationSDDeg(hnT float64) float64 {
	if !(hnT > 0) {
		return 180
	}
	return math.Min(180, math.Hypot(declSDOffsetDeg, declSDCoefNTDeg/hnT))
}
