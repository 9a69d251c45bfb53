package clock

import (
	"errors"
	"math"
	"math/rand/v2"
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
	// Sampled is the number of pairwise slopes the slope was taken from
	// when there were more than MaxExactPairs (see TheilSen); 0 when every
	// pair was used.
	Sampled int
}

// MaxExactPairs is the largest number of pairwise slopes TheilSen sorts in
// full (16 MB of slopes; about 2,000 points). Above it the slopes come from
// SampledPairs pairs drawn with a fixed seed.
const MaxExactPairs = 2_000_000

// SampledPairs is how many pairwise slopes a large fit draws. The sampled
// median's rank among all N slopes is off by at most
// z_0.975·√(0.25/SampledPairs)·N ≈ 0.0022·N in 95 % of samples (the
// binomial error of a sample quantile, common knowledge).
const SampledPairs = 200_000

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
//
// Approximation for large n: when N exceeds MaxExactPairs, sorting all N
// slopes would cost O(n² log n) time and 8·N bytes (25,000 points: 2.5 GB),
// so the slopes of SampledPairs pairs drawn uniformly with a fixed seed
// (reruns give the same line) stand in for all of them: the slope is their
// median, and the interval bounds are their quantiles at the fractions
// M1/N and (M2+1)/N, each widened outward by the sample quantile's own 95 %
// error z_0.975·√(q(1−q)/SampledPairs), so the sampling cannot make the
// interval narrower than Sen's. Line.Sampled says when this was done.
func TheilSen(x, y []float64) (Line, error) {
	n := len(x)
	if n != len(y) {
		return Line{}, errors.New("theil-sen: x and y differ in length")
	}
	nPairs := n*(n-1)/2 - tiedPairs(x)
	if nPairs <= 0 {
		return Line{}, ErrTooFewPoints
	}
	var slopes []float64
	sampled := nPairs > MaxExactPairs
	if sampled {
		slopes = samplePairSlopes(x, y, SampledPairs)
	}
	if len(slopes) < SampledPairs/10 { // exact, or too many ties to sample
		sampled = false
		slopes = make([]float64, 0, nPairs)
		for i := 0; i < n; i++ {
			for j := 0; j < n; j++ {
				if x[j] > x[i] {
					slopes = append(slopes, (y[j]-y[i])/(x[j]-x[i]))
				}
			}
		}
	}
	sort.Float64s(slopes)
	l := Line{Slope: medianSorted(slopes), Pairs: nPairs}
	if sampled {
		l.Sampled = len(slopes)
	}
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
		nt := float64(nPairs)
		lo := int(math.RoundToEven((nt-c)/2)) - 1 // 0-based index of rank M1
		hi := int(math.RoundToEven((nt + c) / 2)) // 0-based index of rank M2+1
		if lo >= 0 && hi < nPairs {
			if !sampled {
				l.Low, l.High, l.CI = slopes[lo], slopes[hi], true
			} else {
				m := float64(len(slopes))
				widen := func(q float64) float64 { return z975 * math.Sqrt(q*(1-q)/m) }
				qlo, qhi := float64(lo)/nt, float64(hi)/nt
				ilo := int(math.Floor((qlo - widen(qlo)) * m))
				ihi := int(math.Ceil((qhi + widen(qhi)) * m))
				l.Low, l.High, l.CI = slopes[max(ilo, 0)], slopes[min(ihi, len(slopes)-1)], true
			}
		}
	}
	return l, nil
}

// samplePairSlopes draws m pairs (i, j) with x_i ≠ x_j uniformly, with a
// fixed seed, and returns their slopes. Pairs with tied x are redrawn, up to
// 20·m draws in all, so it may return fewer than m slopes when most pairs tie.
func samplePairSlopes(x, y []float64, m int) []float64 {
	rng := rand.New(rand.NewPCG(0x7468656c, 0x73656e)) // fixed: reruns give the same fit
	n := len(x)
	out := make([]float64, 0, m)
	for draws := 0; len(out) < m && draws < 20*m; draws++ {
		i, j := rng.IntN(n), rng.IntN(n)
		if x[i] == x[j] {
			continue
		}
		out = append(out, (y[j]-y[i])/(x[j]-x[i]))
	}
	return out
}

// tiedPairs is the number of pairs with equal values in v.
func tiedPairs(v []float64) int {
	s := append([]float64(nil), v...)
	sort.Float64s(s)
	sum := 0
	for i := 0; i < len(s); {
		j := i + 1
		for j < len(s) && s[j] == s[i] {
			j++
		}
		sum += (j - i) * (j - i - 1) / 2
		i = j
	}
	return sum
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
