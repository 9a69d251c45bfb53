package invert

import (
	"fmt"
	"math/rand/v2"
	"sort"
	"strings"
	"testing"
	"time"

	"github.com/gnomon-forensics/gnomon/solarcheck/spa"
)

// srcSim names the witness of the simulations: the truth is a time drawn at
// random, the measurement is spa.At's sun at that time plus Gaussian noise
// of the stated 1-sigma (seeded math/rand/v2, so every run is the same),
// and a 95 % interval must then contain the truth in 95 % of the photos
// (the definition of a 95 % interval). With n = 1000 the binomial sd of the
// rate is 0.7 %, so 93–97 % is about ±3 sd.
const srcSim = "simulation: spa.At truth + seeded Gaussian noise; a 95 % interval covers the truth 95 % of the time"

// simPhoto draws a daytime instant with the sun between 10° and 75° up, at
// a random place between 60° S and 60° N in 2024.
func simPhoto(r *rand.Rand) (lat, lon float64, truth time.Time, p spa.Position) {
	for {
		lat = r.Float64()*120 - 60
		lon = r.Float64()*360 - 180
		truth = time.Date(2024, 1, 1, 0, 0, 0, 0, time.UTC).Add(time.Duration(r.IntN(366*86400)) * time.Second)
		p = sunAt(lat, lon, truth)
		if p.AltitudeDeg > 10 && p.AltitudeDeg < 75 {
			return
		}
	}
}

// covers reports whether some window of r (the fitting ones, or the
// closest when none fits) contains t.
func covers(r Result, t time.Time) bool {
	ws := r.Windows
	if len(ws) == 0 && r.Closest != nil {
		ws = []Window{*r.Closest}
	}
	for _, w := range ws {
		if !t.Before(w.Earliest) && !t.After(w.Latest) {
			return true
		}
	}
	return false
}

// TestWhenCoverageSimulation: the 95 % windows cover the true time in
// 93–97 % of 1,000 simulated photos for each kind of measurement, and the
// goodness-of-fit test calls an honest measurement a misfit in about 5 %
// of them (two angles) or fewer (one angle, where the test is conservative).
// The search spans ±14 h about a claim up to 2 h from the truth, as the
// audit's shadow check does.
func TestWhenCoverageSimulation(t *testing.T) {
	if testing.Short() {
		t.Skip("simulation of 3,000 photos")
	}
	kinds := []struct {
		name    string
		az, alt bool
		sd      float64
	}{
		{"azimuth and altitude, 1°", true, true, 1},
		{"altitude only, 0.5°", false, true, 0.5},
		{"azimuth only, 2°", true, false, 2},
	}
	const n = 1000
	var tab strings.Builder
	fmt.Fprintf(&tab, "\n%-28s %6s %10s %12s %16s\n", "measurement", "photos", "coverage", "misfit >95%", "median width")
	for ki, k := range kinds {
		r := rand.New(rand.NewPCG(2026, uint64(ki)))
		hits, misfits := 0, 0
		var widths []time.Duration
		for i := 0; i < n; i++ {
			lat, lon, truth, p := simPhoto(r)
			m := Measurement{}
			if k.az {
				m.HasAzimuth, m.AzimuthDeg, m.AzimuthSDDeg = true, p.AzimuthDeg+k.sd*r.NormFloat64(), k.sd
			}
			if k.alt {
				m.HasAltitude, m.AltitudeDeg, m.AltitudeSDDeg = true, p.AltitudeDeg+k.sd*r.NormFloat64(), k.sd
			}
			claim := truth.Add(time.Duration(r.IntN(4*3600)-2*3600) * time.Second)
			res, err := When(Query{Observer: spa.NewObserver(lat, lon, 0), From: claim.Add(-14 * time.Hour), To: claim.Add(14 * time.Hour), Measurement: m})
			if err != nil {
				t.Fatal(err)
			}
			if covers(res, truth) {
				hits++
			}
			if len(res.Windows) == 0 {
				misfits++
			}
			if res.Closest != nil {
				widths = append(widths, res.Closest.Latest.Sub(res.Closest.Earliest))
			}
		}
		cov := float64(hits) / n
		fmt.Fprintf(&tab, "%-28s %6d %9.1f%% %11.1f%% %16s\n", k.name, n, 100*cov, 100*float64(misfits)/n, median(widths).Round(time.Second))
		if cov < 0.93 || cov > 0.97 {
			t.Errorf("%s: %s: coverage %.1f %%, want 93–97 %%", srcSim, k.name, 100*cov)
		}
		// The goodness-of-fit test at 95 %: about 5 % false alarms for two
		// angles (binomial sd 0.7 %), and no more than that for one.
		if rate := float64(misfits) / n; rate > 0.075 || (k.az && k.alt && rate < 0.025) {
			t.Errorf("%s: %s: %.1f %% of honest measurements called a misfit, want about 5 %% (at most for one angle)", srcSim, k.name, 100*rate)
		}
	}
	t.Log(tab.String())
}

func median(ds []time.Duration) time.Duration {
	if len(ds) == 0 {
		return 0
	}
	s := append([]time.Duration(nil), ds...)
	sort.Slice(s, func(i, j int) bool { return s[i] < s[j] })
	return s[len(s)/2]
}

// TestWhenWidthUnderSystematicError: a measurement with a growing bias
// (azimuth off by 0 to 8 sd) gets windows no narrower than the unbiased
// ones: the window says how well the time is determined, and a worse fit
// is reported by the misfit, not by a narrower window. The old rule (the
// times with an absolute χ² below 5.991) narrowed the window to nothing
// as the bias grew. The same 50 places serve every bias.
func TestWhenWidthUnderSystematicError(t *testing.T) {
	const places = 50
	biases := []float64{0, 1, 2, 3, 4, 8}
	var tab strings.Builder
	fmt.Fprintf(&tab, "\n%-14s %14s %14s %14s %12s %8s\n", "azimuth bias", "median width", "median ratio", "lowest ratio", "mean misfit", "fits")
	ref := make([]time.Duration, places)
	for bi, b := range biases {
		var widths []time.Duration
		var ratios []float64
		fits := 0
		var misfit float64
		r := rand.New(rand.NewPCG(7, 99))
		for i := 0; i < places; i++ {
			lat, lon, truth, p := simPhoto(r)
			const sd = 1.0
			m := Measurement{HasAzimuth: true, AzimuthDeg: p.AzimuthDeg + b*sd, AzimuthSDDeg: sd,
				HasAltitude: true, AltitudeDeg: p.AltitudeDeg, AltitudeSDDeg: sd}
			res, err := When(Query{Observer: spa.NewObserver(lat, lon, 0), From: truth.Add(-14 * time.Hour), To: truth.Add(14 * time.Hour), Measurement: m})
			if err != nil {
				t.Fatal(err)
			}
			if res.Closest == nil {
				t.Fatalf("bias %g: no closest window at %.1f, %.1f", b, lat, lon)
			}
			w := res.Closest.Latest.Sub(res.Closest.Earliest)
			widths = append(widths, w)
			if bi == 0 {
				ref[i] = w
			}
			ratios = append(ratios, float64(w)/float64(ref[i]))
			if res.Closest.Fits() {
				fits++
			}
			misfit += res.Closest.Misfit / places
		}
		sort.Float64s(ratios)
		fmt.Fprintf(&tab, "%12.0f σ %14s %14.2f %14.2f %12.1f %5d/%d\n", b, median(widths).Round(time.Second), ratios[places/2], ratios[0], misfit, fits, places)
		// The typical window keeps its width; single windows move along the
		// sun's track with the bias, where its speed differs by some tens of
		// per cent, but none collapses.
		if ratios[places/2] < 0.97 || ratios[0] < 0.5 {
			t.Errorf("%s: bias %g σ: windows shrank (median ratio %.2f, lowest %.2f of the unbiased width)", srcSim, b, ratios[places/2], ratios[0])
		}
	}
	t.Log(tab.String())
}
