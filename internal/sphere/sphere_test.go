package sphere

import (
	"math"
	"testing"
)

func TestDistanceKm(t *testing.T) {
	tests := []struct {
		source                 string
		lat1, lon1, lat2, lon2 float64
		want, tol              float64
	}{
		// Rosetta Code, task "Haversine formula": Nashville BNA (36.12, −86.67)
		// to Los Angeles LAX (33.94, −118.40) is 2887.2599506 km on a sphere of
		// radius 6372.8 km; on ours the distance scales by 6371/6372.8.
		{"Rosetta Code 'Haversine formula' (scaled to R = 6371 km)", 36.12, -86.67, 33.94, -118.40, 2887.2599506 * 6371 / 6372.8, 1e-6},
		// Geometry: a quarter meridian is πR/2; the antipode is πR away;
		// one degree of a great circle is 2πR/360.
		{"geometry: pole to equator = πR/2", 90, 0, 0, 17, math.Pi / 2 * MeanRadiusKm, 1e-9},
		{"geometry: antipodes = πR", 10, 20, -10, -160, math.Pi * MeanRadiusKm, 1e-6},
		{"geometry: 1° of the equator = 2πR/360", 0, 179.5, 0, -179.5, 2 * math.Pi * MeanRadiusKm / 360, 1e-9},
		{"geometry: same point", 48.85, 2.35, 48.85, 2.35, 0, 0},
	}
	for _, tc := range tests {
		if got := DistanceKm(tc.lat1, tc.lon1, tc.lat2, tc.lon2); math.Abs(got-tc.want) > tc.tol {
			t.Errorf("%s: got %.7f km, want %.7f", tc.source, got, tc.want)
		}
	}
}
