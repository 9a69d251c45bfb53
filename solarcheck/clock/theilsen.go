package clock

import (
	"errors"
	"math"
	"sort"
)

// ErrTooFewPoints marks data from which no slope can be formed: fewer than
// two points with distinct x.
var ErrTooFewPoints = errors.New("fewer than two points with distinct x")

// z975 is the 0.975 quantile of the standard normal distribution.
const z975 = 1.959963984540054

// Line is a Theil–Sen fit y ≈ Intercept + Slope·x.
type Line struct {
	Slope     float64
	Intercept float64 // median of y − Slope·x
	// Low and High bound Sen's 95 % interval for the slope; CI is false when
	// there are too few points for the interval's ranks to exist.
	Low, High float64
	CI        bool
	Pairs     int // number of pairwise slopes (pairs with distinct x)
}

// TheilSen fits a line by the Theil (1950) – Sen (1968) estimator: the
// slope is the median of (y_j − y_i)/(x_j − x_i) over all pairs with
// x_j > x_i, the intercept the median of y − slope·x ("joint" form).
//
// The 95 % interval follows Sen (1968) eq. 2.6: with n points and N pairwise
// slopes sorted ascending, C = z_0.975·√Var(S), where
// Var(S) = [n(n−1)(2n+5) − Σ t(t−1)(2t+5)]/18 and the sum runs over groups
// of t tied x values and of t tied y values; the bounds are the slopes of
// 1-based rank M1 = (N − C)/2 and M2 + 1 = (N + C)/2 + 1, rounded half to
// even (as scipy.stats.theilslopes does, whose output the tests compare
// against). When a rank falls outside 1..N the interval is not given.
func TheilSen(x, y []float64) (Line, error) {
	n := len(x)
	if n != len(y) {
		return Line{}, errors.New("theil-sen: x and y differ in length")
	}
	slopes := make([]float64, 0, n*(n-1)/2)
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			if x[j] > x[i] {
				slopes = append(slopes, (y[j]-y[i])/(x[j]-x[i]))
			}
		}
	}
	if len(slopes) == 0 {
		return Line{}, ErrTooFewPoints
	}
	sort.Float64s(slopes)
	l := Line{Slope: medianSorted(slopes), Pairs: len(slopes)}
	res := make([]float64, n)
	for i := range x {
		res[i] = y[i] - l.Slope*x[i]
	}
	l.Intercept = median(res)

	nf := float64(n)
	v := nf * (nf - 1) * (2*nf + 5)
	v -= tieTerm(x) + tieTerm(y)
	v /= 18
	if v > 0 {
		c := z975 * math.Sqrt(v)
		nt := float64(len(slopes))
		lo := int(math.RoundToEven((nt-c)/2)) - 1 // 0-based index of rank M1
		hi := int(math.RoundToEven((nt + c) / 2)) // 0-based index of rank M2+1
		if lo >= 0 && hi < len(slopes) {
			l.Low, l.High, l.CI = slopes[lo], slopes[hi], true
		}
	}
	return l, nil
}

// tieTerm is Σ t(t−1)(2t+5) over groups of t equal values (Sen 1968 eq. 2.6).
func tieTerm(v []float64) float64 {
	s := append([]float64(nil), v...)
	sort.Float64s(s)
	sum := 0.0
	for i := 0; i < len(s); {
		j := i + 1
		for j < len(s) && s[j] == s[i] {
			j++
		}
		if t := float64(j - i); t > 1 {
			sum += t * (t - 1) * (2*t + 5)
		}
		i = j
	}
	return sum
}

func medianSorted(s []float64) float64 {
	n := len(s)
	if n == 0 {
		return math.NaN()
	}
	if n%2 == 1 {
		return s[n/2]
	}
	return (s[n/2-1] + s[n/2]) / 2
}

// median returns the median of v without changing v.
func median(v []float64) float64 {
	s := append([]float64(nil), v...)
	sort.Float64s(s)
	return medianSorted(s)
}

// mad is the median absolute deviation from the median.
func mad(v []float64) float64 {
	m := median(v)
	d := make([]float64, len(v))
	for i, x := range v {
		d[i] = math.Abs(x - m)
	}
	return median(d)
}

// madToSigma scales a MAD to the standard deviation of a normal
// distribution: 1/Φ⁻¹(3/4) (common knowledge).
const madToSigma = 1.482602218505602
