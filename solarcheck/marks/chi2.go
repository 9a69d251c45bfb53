package marks

import "math"

// chi2Survival is P(X > x) for a chi-square variable with an even number k
// of degrees of freedom, in closed form: e^(−x/2) Σ_{i<k/2} (x/2)^i / i!
// (Abramowitz and Stegun, Handbook of Mathematical Functions, 26.4.21).
// The lighting check's degrees of freedom, 2 × (objects − 1), are even.
func chi2Survival(x float64, k int) float64 {
	if x <= 0 {
		return 1
	}
	h := x / 2
	term, sum := 1.0, 1.0
	for i := 1; i < k/2; i++ {
		term *= h / float64(i)
		sum += term
	}
	return math.Exp(-h) * sum
}

// chi2Quantile is the point x with P(X ≤ x) = prob, by bisection on
// chi2Survival (even k only).
func chi2Quantile(prob float64, k int) float64 {
	lo, hi := 0.0, 10.0*float64(k)+50
	for range 200 {
		mid := (lo + hi) / 2
		if 1-chi2Survival(mid, k) < prob {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}
