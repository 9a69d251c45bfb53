package solarcheck

import "math"

// chi2P95Table holds the 95 % points of the chi-square distribution for
// 1..10 degrees of freedom (any statistics handbook, e.g. the NIST/SEMATECH
// e-Handbook of Statistical Methods, table 1.3.6.7.4).
var chi2P95Table = [...]float64{3.841, 5.991, 7.815, 9.488, 11.070, 12.592, 14.067, 15.507, 16.919, 18.307}

// chi2P95 returns the 95 % point of the chi-square distribution with dof
// degrees of freedom: the handbook table up to 10, and the Wilson–Hilferty
// (1931) cube-root approximation above, which is within 0.5 % there.
func chi2P95(dof int) float64 {
	if dof < 1 {
		return 0
	}
	if dof <= len(chi2P95Table) {
		return chi2P95Table[dof-1]
	}
	k := float64(dof)
	const z95 = 1.6448536269514722 // standard normal 95 % one-sided point
	a := 2 / (9 * k)
	return k * math.Pow(1-a+z95*math.Sqrt(a), 3)
}
