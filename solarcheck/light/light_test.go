package light

import (
	"fmt"
	"math"
	"strings"
	"testing"
)

func TestEV100(t *testing.T) {
	cases := []struct {
		source string
		e      Exposure
		want   float64
		tol    float64
	}{
		{"definition of EV (APEX / ISO 2720): f/1, 1 s, ISO 100 is EV 0", Exposure{FNumber: 1, ExposureTimeSec: 1, ISO: 100}, 0, 1e-12},
		{"common knowledge: sunny 16 rule (f/16, 1/ISO s) is about EV 15", Exposure{FNumber: 16, ExposureTimeSec: 1.0 / 100, ISO: 100}, 15, 0.5},
		{"common knowledge: sunny 16 holds at any ISO (EV referred to ISO 100)", Exposure{FNumber: 16, ExposureTimeSec: 1.0 / 400, ISO: 400}, 15, 0.5},
		{"EV tables, common knowledge: f/8 at 1/125 s, ISO 100 is EV 13", Exposure{FNumber: 8, ExposureTimeSec: 1.0 / 125, ISO: 100}, 13, 0.05},
		{"definition: doubling ISO lowers EV100 by one stop", Exposure{FNumber: 1, ExposureTimeSec: 1, ISO: 200}, -1, 1e-12},
		{"definition: +1 EV compensation means a scene 1 EV brighter", Exposure{FNumber: 1, ExposureTimeSec: 1, ISO: 100, BiasEV: 1}, 1, 1e-12},
	}
	for _, c := range cases {
		got, err := EV100(c.e)
		if err != nil || math.Abs(got-c.want) > c.tol {
			t.Errorf("%s: EV100 = %v (%v), want %v ± %v", c.source, got, err, c.want, c.tol)
		}
	}
	for _, e := range []Exposure{{}, {FNumber: 2, ExposureTimeSec: 0, ISO: 100}, {FNumber: 2, ExposureTimeSec: 1, ISO: -5}, {FNumber: math.NaN(), ExposureTimeSec: 1, ISO: 100}} {
		if _, err := EV100(e); err == nil {
			t.Errorf("%+v accepted", e)
		}
	}
}

func TestLuminanceAndIlluminance(t *testing.T) {
	cases := []struct {
		source   string
		got      float64
		lo, hi   float64
		quantity string
	}{
		{"ISO 2720 with K = 12.5: EV 0 at ISO 100 is 0.125 cd/m² (common EV tables)", Luminance(0), 0.125 - 1e-12, 0.125 + 1e-12, "cd/m²"},
		{"common knowledge: full sun (sunny 16, EV ≈ 14.6) on a grey scene ≈ 32,000–100,000 lux direct sunlight", ImpliedLux(14.64), 32000, 100000, "lux"},
		{"common knowledge: overcast day ≈ EV 12, roughly 1,000–10,000 lux", ImpliedLux(12), 1000, 10000, "lux"},
		{"common knowledge: full moonlight ≈ EV −2 … −4 at ISO 100, about 0.05–0.3 lux on the ground (loose)", ImpliedLux(-3), 0.05, 1, "lux"},
	}
	for _, c := range cases {
		if c.got < c.lo || c.got > c.hi {
			t.Errorf("%s: %.4g %s not in [%g, %g]", c.source, c.got, c.quantity, c.lo, c.hi)
		}
	}
}

func TestClearSkyLux(t *testing.T) {
	cases := []struct {
		source string
		altDeg float64
		lo, hi float64
	}{
		{"common knowledge: sun high, direct sun + sky ≈ 100,000–130,000 lux", 90, 100000, 135000},
		{"common knowledge: direct sunlight 32,000–100,000 lux", 45, 32000, 100000},
		{"Wikipedia 'Lux' table (common knowledge): sunrise or sunset on a clear day ≈ 400 lux; within a factor 2", 0, 300, 900},
		{"Wikipedia 'Lux' table: dark limit of civil twilight under a clear sky 3.4 lux", -6, 2.5, 4.5},
		{"Wikipedia 'Lux' table: moonless clear night sky with airglow ≈ 0.002 lux (sun at −18° or lower adds nothing more)", -18, 0.0001, 0.002},
		{"clamp below the model's range", -40, 0.0001, 0.002},
	}
	for _, c := range cases {
		if got := ClearSkyLux(c.altDeg); got < c.lo || got > c.hi {
			t.Errorf("%s: E(%v°) = %.4g lux not in [%g, %g]", c.source, c.altDeg, got, c.lo, c.hi)
		}
	}
	// The six polynomial pieces of the published fit join continuously;
	// check every join to 1.5 %.
	for i := 0; i+1 < len(circ171); i++ {
		h := circ171[i].MinDeg
		x := h / 90
		a, b := circ171[i], circ171[i+1]
		ea := a.L0 + x*(a.L1+x*(a.L2+x*a.L3))
		eb := b.L0 + x*(b.L1+x*(b.L2+x*b.L3))
		if r := math.Pow(10, math.Abs(ea-eb)); r > 1.015 {
			t.Errorf("internal consistency: pieces disagree by %.1f %% at %v°", (r-1)*100, h)
		}
	}
	// Monotonic in altitude (more sun, more light): the inversion relies on it.
	prev := 0.0
	for h := -18.0; h <= 90; h += 0.05 {
		e := ClearSkyLux(h)
		if e <= prev {
			t.Fatalf("not increasing at %v°", h)
		}
		prev = e
	}
}

// TestCirc171Coefficients holds the coefficients against the published
// table: Vallado, Fundamentals of Astrodynamics and Applications (2nd ed.
// 2001), pp. 295–297, Eq. 5-9 and its table of the USNO Circular 171 fit for
// the sun, as printed in the author's companion routine sunill.m (ranges
// h ≥ 20°, 5–20°, −0.8–5°, −5–−0.8°, −12–−5°, −18–−12°). The circular itself
// was not at hand.
func TestCirc171Coefficients(t *testing.T) {
	const source = "Vallado 2001 Eq. 5-9 table (after USNO Circular 171)"
	want := []struct {
		minDeg         float64
		l0, l1, l2, l3 float64
	}{
		{20, 3.74, 3.97, -4.07, 1.47},
		{5, 3.05, 13.28, -45.98, 64.33},
		{-0.8, 2.88, 22.26, -207.64, 1034.30},
		{-5, 2.88, 21.81, -258.11, -858.36},
		{-12, 2.70, 12.17, -431.69, -1899.83},
		{-18, 13.84, 262.72, 1447.42, 2797.93},
	}
	if len(circ171) != len(want) {
		t.Fatalf("%s: %d ranges, want %d", source, len(circ171), len(want))
	}
	for i, w := range want {
		c := circ171[i]
		if c.MinDeg != w.minDeg || c.L0 != w.l0 || c.L1 != w.l1 || c.L2 != w.l2 || c.L3 != w.l3 {
			t.Errorf("%s: range %d = %+v, want %+v", source, i, c, w)
		}
	}
}

func TestBandOf(t *testing.T) {
	cases := []struct {
		source string
		alt    float64
		want   Band
	}{
		{"almanac convention: sunrise/sunset at −0.833°", 10, Daylight},
		{"almanac convention", -0.5, Daylight},
		{"civil twilight 0..−6°", -3, Civil},
		{"nautical twilight −6..−12°", -6.5, Nautical},
		{"civil twilight ends at −6° (boundary in the brighter band)", -6, Civil},
		{"nautical twilight", -11.9, Nautical},
		{"astronomical twilight −12..−18°", -15, Astronomical},
		{"night below −18°", -30, Night},
		{"unknown", math.NaN(), Unknown},
	}
	for _, c := range cases {
		if got := BandOf(c.alt); got != c.want {
			t.Errorf("%s: BandOf(%v) = %v, want %v", c.source, c.alt, got, c.want)
		}
	}
}

func TestCheck(t *testing.T) {
	sunny16 := Exposure{FNumber: 16, ExposureTimeSec: 1.0 / 200, ISO: 200}
	cases := []struct {
		source  string
		in      Input
		status  Status
		implied Band
		words   string
	}{
		{"common knowledge: sunny 16 with the sun 55° up", Input{sunny16, FlashNotFired, deg(55)}, Agree, Daylight, "fits"},
		{"common knowledge: overcast EV 12 with the sun 40° up (overcast ÷3…10)", Input{Exposure{FNumber: 5.6, ExposureTimeSec: 1.0 / 125, ISO: 100}, FlashNotFired, deg(40)}, Agree, Daylight, "fits"},
		{"common knowledge: full sun exposure claimed at night", Input{sunny16, FlashNotFired, deg(-30)}, Disagree, Daylight, "stops above the brightest moonlit sky"},
		{"common knowledge: bright interior ≈ EV 7 with the sun high", Input{Exposure{FNumber: 2, ExposureTimeSec: 1.0 / 30, ISO: 100}, FlashUnknown, deg(50)}, Disagree, Civil, "indoor"},
		{"common knowledge: dusk street scene f/1.8 1/15 s ISO 1600 (EV100 ≈ 1.6) in civil twilight", Input{Exposure{FNumber: 1.8, ExposureTimeSec: 1.0 / 15, ISO: 1600}, FlashNotFired, deg(-4)}, Agree, Civil, "fits"},
		{"skipped: flash fired", Input{sunny16, FlashFired, deg(-30)}, Skipped, Unknown, "flash"},
		{"skipped: no exposure", Input{Exposure{FNumber: 4}, FlashNotFired, deg(30)}, Skipped, Unknown, "incomplete"},
		{"skipped: no sun", Input{sunny16, FlashNotFired, nil}, Skipped, Daylight, "unknown"},
	}
	for _, c := range cases {
		r := Check(c.in, Options{})
		if r.Status != c.status || r.ImpliedBand != c.implied || !strings.Contains(r.Sentence, c.words) {
			t.Errorf("%s: %s, implied %v: %q", c.source, r.Status, r.ImpliedBand, r.Sentence)
		}
		if r.Status != Skipped && !strings.HasPrefix(r.Sentence, "Hint, not proof") {
			t.Errorf("%s: sentence must be worded as a hint: %q", c.source, r.Sentence)
		}
	}
}

// TestCheckStatesTheRatioItTested: the stops a sentence states are the
// ratio of the implied light to the figure the sentence names (issue 10:
// "18 stops more than natural light … clear sky about 0.12 lux" was a ratio
// to the full moon, 0.3 lux, not to the 0.12 lux it showed). The witness is
// the arithmetic log2(implied / named figure) on the sentence's own numbers.
func TestCheckStatesTheRatioItTested(t *testing.T) {
	sunny16 := Exposure{FNumber: 16, ExposureTimeSec: 1.0 / 200, ISO: 200}
	cases := []struct {
		source string
		alt    float64
		named  string // the words naming the reference
		ref    func(Result) float64
	}{
		{"night: the full moon (0.3 lux, default MoonLux) is brighter than the sky", -9, "stops above the brightest moonlit sky (about 0.30 lux",
			func(Result) float64 { return 0.3 }},
		{"day: a clear sky is the brightest natural light", 20, "stops above a clear sky with the sun at 20.0°",
			func(r Result) float64 { return r.ExpectedLuxClear }},
	}
	for _, c := range cases {
		in := Input{sunny16, FlashNotFired, deg(c.alt)}
		if c.alt > 0 {
			in.Exposure.ExposureTimeSec = 1.0 / 64000 // far brighter than any sky
		}
		r := Check(in, Options{})
		if !strings.Contains(r.Sentence, c.named) {
			t.Errorf("%s: sentence does not name its reference %q: %q", c.source, c.named, r.Sentence)
			continue
		}
		want := math.Round(math.Log2(r.ImpliedLux / c.ref(r)))
		if !strings.Contains(r.Sentence, fmt.Sprintf(", %.0f stops above", want)) {
			t.Errorf("%s: want %.0f stops (log2 of %.3g / %.3g): %q", c.source, want, r.ImpliedLux, c.ref(r), r.Sentence)
		}
	}
	// The settings are shown as photographers write them.
	if r := Check(Input{sunny16, FlashNotFired, deg(55)}, Options{}); !strings.Contains(r.Sentence, "1/200 s at f/16, ISO 200") {
		t.Errorf("settings not shown as 1/200 s at f/16, ISO 200: %q", r.Sentence)
	}
}

func deg(v float64) *float64 { return &v }
