package clock

import (
	"math"
	"math/rand/v2"
	"sort"
	"testing"
)

// TestTheilSenSampled checks the large-n approximation against the exact
// estimator on simulated cameras with more than MaxExactPairs slopes: the
// sampled slope's rank among all N exact slopes must lie within
// 4·√(0.25/SampledPairs) ≈ 0.0045 of the median's (the binomial error of a
// sample quantile, four standard errors; common knowledge), and the
// widened interval must not be narrower than Sen's exact one by more than
// that rank tolerance on either side.
func TestTheilSenSampled(t *testing.T) {
	cases := []struct {
		source     string
		n          int
		seed       uint64
		drift, sd  float64
		outlierPct int
	}{
		{"simulation: 2,100 points, drift 1.5 s/day, 10 % wild points", 2100, 1, 1.5, 2, 10},
		{"simulation: 2,100 points, bursts with tied times", 2100, 3, -0.7, 1, 0},
	}
	tol := 4 * math.Sqrt(0.25/SampledPairs)
	for _, c := range cases {
		r := rand.New(rand.NewPCG(c.seed, 11))
		x, y := make([]float64, c.n), make([]float64, c.n)
		for i := range x {
			x[i] = 90 * r.Float64()
			if c.seed == 3 {
				x[i] = math.Round(x[i]*200) / 200 // many points share a time
			}
			y[i] = 30 + c.drift*x[i] + c.sd*r.NormFloat64()
			if r.IntN(100) < c.outlierPct {
				y[i] += 3600 * r.Float64()
			}
		}
		got, err := TheilSen(x, y)
		if err != nil {
			t.Fatalf("%s: %v", c.source, err)
		}
		var all []float64
		for i := range x {
			for j := range x {
				if x[j] > x[i] {
					all = append(all, (y[j]-y[i])/(x[j]-x[i]))
				}
			}
		}
		sort.Float64s(all)
		nt := float64(len(all))
		if got.Pairs != len(all) || got.Sampled == 0 {
			t.Errorf("%s: Pairs %d (want %d), Sampled %d (want > 0)", c.source, got.Pairs, len(all), got.Sampled)
		}
		rank := func(v float64) float64 { return float64(sort.SearchFloat64s(all, v)) / nt }
		if d := math.Abs(rank(got.Slope) - 0.5); d > tol {
			t.Errorf("%s: sampled slope %.6g has rank %.5f, off the median's by %.5f > %.5f", c.source, got.Slope, rank(got.Slope), d, tol)
		}
		nf := float64(c.n)
		cv := z975 * math.Sqrt((nf*(nf-1)*(2*nf+5)-tieTerm(x)-tieTerm(y))/18)
		qlo, qhi := (nt-cv)/2/nt, (nt+cv)/2/nt
		if !got.CI || rank(got.Low) > qlo+tol || rank(got.High) < qhi-tol {
			t.Errorf("%s: interval [%g, %g] (ranks %.5f, %.5f) narrower than Sen's (ranks %.5f, %.5f)", c.source, got.Low, got.High, rank(got.Low), rank(got.High), qlo, qhi)
		}
		// The same input gives the same line (fixed seed).
		if again, _ := TheilSen(x, y); again != got {
			t.Errorf("%s: two fits differ: %+v, %+v", c.source, got, again)
		}
	}
}

// TestFitLargeCamera: a camera with 10,000 evidence points (far beyond the
// exact Theil–Sen) still recovers its simulated offset and drift.
func TestFitLargeCamera(t *testing.T) {
	pts := simulate(5, 10000, 200, 300, 2.5, 3)
	m, err := Fit(pts, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(m.Segments) != 1 {
		t.Fatalf("want one segment (no reset simulated), got %d", len(m.Segments))
	}
	s := m.Segments[0]
	if math.Abs(s.DriftSecPerDay-2.5) > 0.01 || !(s.DriftLowSecPerDay <= 2.5 && 2.5 <= s.DriftHighSecPerDay) {
		t.Errorf("drift %.4f s/day [%.4f, %.4f], want 2.5 within 0.01 and inside the interval (simulation)", s.DriftSecPerDay, s.DriftLowSecPerDay, s.DriftHighSecPerDay)
	}
	off, _ := s.OffsetAt(pts[0].Reading)
	want := 300 + 2.5*pts[0].Reading.Sub(epoch).Hours()/24 // the noise-free line
	if math.Abs(off-want) > 0.5 {
		t.Errorf("offset at the first photo %.3f s, want %.3f within 0.5 (simulation)", off, want)
	}
}

// TestRunningMedians compares the heap-based running medians with the
// definition (median of each prefix and suffix), ties included.
func TestRunningMedians(t *testing.T) {
	r := rand.New(rand.NewPCG(9, 9))
	for _, n := range []int{1, 2, 3, 10, 101} {
		v := make([]float64, n)
		for i := range v {
			v[i] = float64(r.IntN(7)) - 3 + r.Float64()*float64(i%2)
		}
		before, after := runningMedians(v)
		for k := 1; k <= n; k++ {
			if want := median(v[:k]); before[k] != want {
				t.Errorf("n=%d: median of first %d = %v, want %v", n, k, before[k], want)
			}
			if want := median(v[k-1:]); after[k-1] != want {
				t.Errorf("n=%d: median from %d = %v, want %v", n, k-1, after[k-1], want)
			}
		}
	}
}
