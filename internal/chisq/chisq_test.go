package chisq

import (
	"fmt"
	"math"
	"testing"
)

// nistUpper is the table of upper-tail critical values of the chi-square
// distribution in the NIST/SEMATECH e-Handbook of Statistical Methods,
// section 1.3.6.7.4 ("Critical Values of the Chi-Square Distribution"),
// rows ν = 1, 2, 3, 4, 5, 10, 20, 30, 100, printed to three decimals.
var nistUpper = []struct {
	dof  int
	vals [5]float64 // upper-tail probability 0.10, 0.05, 0.025, 0.01, 0.001
}{
	{1, [5]float64{2.706, 3.841, 5.024, 6.635, 10.828}},
	{2, [5]float64{4.605, 5.991, 7.378, 9.210, 13.816}},
	{3, [5]float64{6.251, 7.815, 9.348, 11.345, 16.266}},
	{4, [5]float64{7.779, 9.488, 11.143, 13.277, 18.467}},
	{5, [5]float64{9.236, 11.070, 12.833, 15.086, 20.515}},
	{10, [5]float64{15.987, 18.307, 20.483, 23.209, 29.588}},
	{20, [5]float64{28.412, 31.410, 34.170, 37.566, 45.315}},
	{30, [5]float64{40.256, 43.773, 46.979, 50.892, 59.703}},
	{100, [5]float64{118.498, 124.342, 129.561, 135.807, 149.449}},
}

var alphas = [5]float64{0.10, 0.05, 0.025, 0.01, 0.001}

func TestPointMatchesNISTTable(t *testing.T) {
	for _, row := range nistUpper {
		for i, want := range row.vals {
			t.Run(fmt.Sprintf("dof%d/alpha%g", row.dof, alphas[i]), func(t *testing.T) {
				got := Point(alphas[i], row.dof)
				// The table is rounded to 0.001: half a unit of its last place.
				if math.Abs(got-want) > 0.0005+1e-9 {
					t.Errorf("Point(%g, %d) = %.4f, NIST table %.3f", alphas[i], row.dof, got, want)
				}
				// And the p-value of the table's point is the column's probability,
				// to the table's rounding (the density there bounds the slope).
				if p := Survival(want, row.dof); math.Abs(p-alphas[i]) > 0.0005*density(want, row.dof)+1e-9 {
					t.Errorf("Survival(%.3f, %d) = %.6f, want %g", want, row.dof, p, alphas[i])
				}
			})
		}
	}
}

// density is the chi-square density, to bound how far a rounding of the
// table's point moves the probability.
func density(x float64, dof int) float64 {
	k := float64(dof) / 2
	lg, _ := math.Lgamma(k)
	return math.Exp((k-1)*math.Log(x) - x/2 - k*math.Ln2 - lg)
}

// TestSurvivalClosedForms checks the two closed forms (handbook facts):
// one degree of freedom is the square of a standard normal, so
// Q = erfc(√(x/2)); two degrees of freedom are exponential, Q = e^(−x/2).
func TestSurvivalClosedForms(t *testing.T) {
	for _, x := range []float64{0.01, 0.5, 1, 2.5, 3.841, 7, 15, 40, 100} {
		if got, want := Survival(x, 1), math.Erfc(math.Sqrt(x/2)); math.Abs(got-want)/want > 1e-9 {
			t.Errorf("Survival(%g, 1) = %g, erfc form %g", x, got, want)
		}
		if got, want := Survival(x, 2), math.Exp(-x/2); math.Abs(got-want)/want > 1e-9 {
			t.Errorf("Survival(%g, 2) = %g, exponential form %g", x, got, want)
		}
	}
}

func TestEdges(t *testing.T) {
	tests := []struct {
		name string
		got  float64
		want float64
	}{
		{"zero misfit", Survival(0, 2), 1},
		{"negative misfit", Survival(-1, 1), 1},
		{"no dof", Survival(3, 0), 1},
		{"infinite misfit", Survival(math.Inf(1), 3), 0},
	}
	for _, tc := range tests {
		if tc.got != tc.want {
			t.Errorf("%s: got %g, want %g", tc.name, tc.got, tc.want)
		}
	}
	if !math.IsNaN(Survival(math.NaN(), 1)) || !math.IsNaN(Point(0, 1)) || !math.IsNaN(Point(0.05, 0)) {
		t.Error("NaN inputs and impossible probabilities must give NaN")
	}
}
