package clock

import (
	"testing"
	"time"
)

// TestCorrectedCoverage measures how often the corrected time's 95 %
// interval holds the true time, over 300 simulated cameras per size
// (simulation: truth known by construction). Nominal is 0.95; the test
// accepts 0.90–0.995 (the interval is built to err on the wide side).
func TestCorrectedCoverage(t *testing.T) {
	cases := []struct {
		source string
		n      int
	}{
		{"simulation, 5 points over 60 days (Sen interval = range of the 10 slopes)", 5},
		{"simulation, 10 points over 60 days", 10},
		{"simulation, 30 points over 60 days", 30},
	}
	for _, c := range cases {
		in, tot := 0, 0
		for seed := uint64(100); seed < 400; seed++ {
			pts := simulate(seed, c.n, 60, 50, 1.2, 3)
			m, err := Fit(pts, Options{})
			if err != nil {
				t.Fatal(err)
			}
			for i, ph := range m.Photos {
				days := pts[i].Reading.Sub(epoch).Hours() / 24
				truth := pts[i].Reading.Add(-time.Duration((50 + 1.2*days) * float64(time.Second)))
				tot++
				if absDur(ph.Corrected.Sub(truth)) <= ph.HalfWidth95 {
					in++
				}
			}
		}
		cov := float64(in) / float64(tot)
		t.Logf("%s: coverage %.3f of %d photos", c.source, cov, tot)
		if cov < 0.90 || cov > 0.995 {
			t.Errorf("%s: coverage %.3f outside 0.90–0.995", c.source, cov)
		}
	}
}
