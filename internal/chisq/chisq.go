// Package chisq is the chi-square distribution: the one home of the
// probability points every goodness-of-fit test and confidence region of
// gnomon uses, computed rather than copied from a table so that no two
// packages can disagree about them.
package chisq

import "math"

// Survival returns P(X ≥ x) for X chi-square distributed with dof degrees
// of freedom: the p-value of a misfit x. It is the regularized upper
// incomplete gamma function Q(dof/2, x/2), by its series below a+1 and its
// continued fraction above (Abramowitz & Stegun 6.5.29 and 6.5.31). dof < 1
// or x ≤ 0 gives 1; x = +Inf gives 0; NaN gives NaN.
func Survival(x float64, dof int) float64 {
	switch {
	case math.IsNaN(x):
		return math.NaN()
	case dof < 1 || x <= 0:
		return 1
	case math.IsInf(x, 1):
		return 0
	}
	a, z := float64(dof)/2, x/2
	lg, _ := math.Lgamma(a)
	pre := math.Exp(a*math.Log(z) - z - lg) // z^a e^−z / Γ(a)
	if z < a+1 {
		// P(a, z) = z^a e^−z / Γ(a) · Σ z^n / (a (a+1) … (a+n))
		term, sum := 1/a, 1/a
		for n := 1; n < 1000; n++ {
			term *= z / (a + float64(n))
			sum += term
			if term < sum*1e-16 {
				break
			}
		}
		return math.Max(0, 1-pre*sum)
	}
	// Q(a, z) by Lentz's method on the continued fraction
	// 1/(z+1−a− 1·(1−a)/(z+3−a− 2·(2−a)/(z+5−a− …))).
	const tiny = 1e-300
	b := z + 1 - a
	c := 1 / tiny
	d := 1 / b
	h := d
	for i := 1; i < 1000; i++ {
		an := -float64(i) * (float64(i) - a)
		b += 2
		d = an*d + b
		if math.Abs(d) < tiny {
			d = tiny
		}
		c = b + an/c
		if math.Abs(c) < tiny {
			c = tiny
		}
		d = 1 / d
		del := d * c
		h *= del
		if math.Abs(del-1) < 1e-16 {
			break
		}
	}
	return pre * h
}

// Point returns the upper-tail point x with Survival(x, dof) = alpha, e.g.
// Point(0.05, 2) = 5.991, the 95 % point for two degrees of freedom. It
// bisects Survival, which falls monotonically, to 1e-12 relative. dof < 1
// or alpha outside (0, 1) gives NaN.
func Point(alpha float64, dof int) float64 {
	if dof < 1 || !(alpha > 0 && alpha < 1) {
		return math.NaN()
	}
	lo, hi := 0.0, float64(dof)+10
	for Survival(hi, dof) > alpha {
		lo, hi = hi, 2*hi
	}
	for hi-lo > 1e-12*hi {
		mid := (lo + hi) / 2
		if Survival(mid, dof) > alpha {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}

// P95 is Point(0.05, dof): the misfit below which 95 % of honest
// measurements with dof degrees of freedom fall.
func P95(dof int) float64 { return Point(0.05, dof) }
