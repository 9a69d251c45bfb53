package shadow

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/gnomon-forensics/gnomon/internal/angle"
)

func near(a, b, tol float64) bool { return math.Abs(a-b) <= tol }

// Level ground: the shadow of a vertical object is h/tan(altitude).
func TestLevelGroundFacts(t *testing.T) {
	tests := []struct {
		source     string
		height     float64
		length     float64
		bearingDeg float64
		wantAzDeg  float64
		wantAltDeg float64
	}{
		{"common knowledge: 45° sun, shadow equals height", 2, 2, 0, 180, 45},
		{"common knowledge: 30° sun, L = h·√3", 1, math.Sqrt(3), 90, 270, 30},
		{"common knowledge: 60° sun, L = h/√3", 3, 3 / math.Sqrt(3), 300, 120, 60},
		{"common knowledge: tan(alt) = h/L (3-4-5 triangle)", 3, 4, 225, 45, angle.Deg(math.Atan2(3, 4))},
		{"common knowledge: shadow points away from the sun", 1, 1, 359, 179, 45},
	}
	for _, tc := range tests {
		sun, err := SunFromShadow(Shadow{Height: tc.height, Length: tc.length, BearingDeg: tc.bearingDeg})
		if err != nil {
			t.Fatalf("%s: %v", tc.source, err)
		}
		if !near(sun.AzimuthDeg, tc.wantAzDeg, 1e-9) || !near(sun.AltitudeDeg, tc.wantAltDeg, 1e-9) {
			t.Errorf("%s: got az %.9f alt %.9f, want %.9f %.9f", tc.source, sun.AzimuthDeg, sun.AltitudeDeg, tc.wantAzDeg, tc.wantAltDeg)
		}
		l, b, err := ShadowFromSun(sun, tc.height, Ground{})
		if err != nil {
			t.Fatalf("%s: back: %v", tc.source, err)
		}
		if !near(l, tc.length, 1e-9) || !near(b, math.Mod(tc.bearingDeg+360, 360), 1e-9) {
			t.Errorf("%s: back: got L %.9f b %.9f, want %.9f %.9f", tc.source, l, b, tc.length, tc.bearingDeg)
		}
	}
}

// Sloped ground, checked against the law of sines in the triangle
// base–top–tip: with the shadow running straight down a slope s the angle at
// the tip is e − s and the angle at the top 90° − e, so L = h·cos e / sin(e − s);
// straight up the slope L = h·cos e / sin(e + s). Across the slope the tip
// stays level, so the shadow is as on flat ground.
func TestSlopeLawOfSines(t *testing.T) {
	tests := []struct {
		source string
		altDeg float64
		slope  float64
		rel    float64 // shadow bearing minus downhill bearing
		want   func(h, e, s float64) float64
	}{
		{"law of sines (textbook trigonometry), downhill", 50, 20, 0, func(h, e, s float64) float64 { return h * math.Cos(e) / math.Sin(e-s) }},
		{"law of sines (textbook trigonometry), downhill", 30, 10, 0, func(h, e, s float64) float64 { return h * math.Cos(e) / math.Sin(e-s) }},
		{"law of sines (textbook trigonometry), uphill", 30, 15, 180, func(h, e, s float64) float64 { return h * math.Cos(e) / math.Sin(e+s) }},
		{"law of sines (textbook trigonometry), uphill", 10, 40, 180, func(h, e, s float64) float64 { return h * math.Cos(e) / math.Sin(e+s) }},
		{"common knowledge: across the fall line the ground is level", 35, 25, 90, func(h, e, s float64) float64 { return h / math.Tan(e) }},
		{"common knowledge: across the fall line the ground is level", 35, 25, 270, func(h, e, s float64) float64 { return h / math.Tan(e) }},
	}
	for _, tc := range tests {
		const h = 1.7
		toward := 40.0
		bearing := toward + tc.rel
		sun := Sun{AzimuthDeg: angle.Norm360(bearing + 180), AltitudeDeg: tc.altDeg}
		g := Ground{SlopeDeg: tc.slope, TowardDeg: toward}
		l, b, err := ShadowFromSun(sun, h, g)
		if err != nil {
			t.Fatalf("%s: %v", tc.source, err)
		}
		want := tc.want(h, angle.Rad(tc.altDeg), angle.Rad(tc.slope))
		if !near(l, want, 1e-9*want) || !near(b, angle.Norm360(bearing), 1e-9) {
			t.Errorf("%s (alt %g, slope %g, rel %g): L %.9f b %.6f, want L %.9f b %.6f", tc.source, tc.altDeg, tc.slope, tc.rel, l, b, want, angle.Norm360(bearing))
		}
		back, err := SunFromShadow(Shadow{Height: h, Length: l, BearingDeg: b, Ground: g})
		if err != nil {
			t.Fatalf("%s: back: %v", tc.source, err)
		}
		if !near(back.AltitudeDeg, sun.AltitudeDeg, 1e-9) || !near(back.AzimuthDeg, sun.AzimuthDeg, 1e-9) {
			t.Errorf("%s: back %+v, want %+v", tc.source, back, sun)
		}
	}
}

// Random round trips over arbitrary slopes and directions.
func TestSlopeRoundTrip(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	for i := 0; i < 2000; i++ {
		g := Ground{SlopeDeg: r.Float64() * 60, TowardDeg: r.Float64() * 360}
		sun := Sun{AzimuthDeg: r.Float64() * 360, AltitudeDeg: 1 + r.Float64()*88}
		l, b, err := ShadowFromSun(sun, 2, g)
		if errors.Is(err, ErrNoShadow) {
			continue
		}
		if err != nil {
			t.Fatal(err)
		}
		back, err := SunFromShadow(Shadow{Height: 2, Length: l, BearingDeg: b, Ground: g})
		if err != nil {
			t.Fatalf("%+v %+v: %v", g, sun, err)
		}
		if !near(back.AltitudeDeg, sun.AltitudeDeg, 1e-8) || !near(back.AzimuthDeg, sun.AzimuthDeg, 1e-8) {
			t.Fatalf("%+v: back %+v, want %+v", g, back, sun)
		}
	}
}

func TestErrors(t *testing.T) {
	tests := []struct {
		source string
		s      Shadow
		want   error
	}{
		{"common knowledge: heights are positive", Shadow{Height: -1, Length: 1}, ErrInvalid},
		{"common knowledge: lengths are positive", Shadow{Height: 1, Length: 0}, ErrInvalid},
		{"common knowledge: a slope is less than vertical", Shadow{Height: 1, Length: 1, Ground: Ground{SlopeDeg: 90}}, ErrInvalid},
		// Shadow running 10 units up a 45° slope from a 1-unit pole: the tip
		// is above the pole's top, so no sun above the horizon casts it.
		{"common knowledge: a shadow cannot climb above the top of the object", Shadow{Height: 1, Length: 10, BearingDeg: 0, Ground: Ground{SlopeDeg: 45, TowardDeg: 180}}, ErrNoShadow},
	}
	for _, tc := range tests {
		if _, err := SunFromShadow(tc.s); !errors.Is(err, tc.want) {
			t.Errorf("%s: got %v, want %v", tc.source, err, tc.want)
		}
	}
	if _, _, err := ShadowFromSun(Sun{AzimuthDeg: 180, AltitudeDeg: -1}, 1, Ground{}); !errors.Is(err, ErrNoShadow) {
		t.Errorf("common knowledge: sun below the horizon casts no shadow: got %v", err)
	}
	// Sun at 20° shining down a 30° slope: the slope faces away and is in shade.
	if _, _, err := ShadowFromSun(Sun{AzimuthDeg: 0, AltitudeDeg: 20}, 1, Ground{SlopeDeg: 30, TowardDeg: 180}); !errors.Is(err, ErrNoShadow) {
		t.Errorf("common knowledge: a slope steeper than the sun facing away is in shade: got %v", err)
	}
}

// Monte Carlo check of the first-order propagation: sample height, length and
// bearing from independent normals, recompute the sun, and compare the sample
// standard deviations and correlation with the analytic ones.
func TestPropagateMonteCarlo(t *testing.T) {
	tests := []struct {
		source string
		s      Shadow
		u      Uncertainty
	}{
		{"Monte Carlo (seeded math/rand/v2)", Shadow{Height: 2, Length: 3, BearingDeg: 40}, Uncertainty{HeightSD: 0.02, LengthSDPct: 3, BearingSDDeg: 2}},
		{"Monte Carlo (seeded math/rand/v2)", Shadow{Height: 1, Length: 5, BearingDeg: 200}, Uncertainty{HeightSD: 0.01, LengthSDPct: 2, BearingSDDeg: 1}},
		{"Monte Carlo (seeded math/rand/v2)", Shadow{Height: 1.5, Length: 2.5, BearingDeg: 100, Ground: Ground{SlopeDeg: 15, TowardDeg: 60}}, Uncertainty{HeightSD: 0.01, LengthSDPct: 2, BearingSDDeg: 3}},
		{"Monte Carlo (seeded math/rand/v2)", Shadow{Height: 1, Length: 1.2, BearingDeg: 330, Ground: Ground{SlopeDeg: 25, TowardDeg: 10}}, Uncertainty{HeightSD: 0.005, LengthSDPct: 1, BearingSDDeg: 4}},
	}
	for i, tc := range tests {
		est, err := Propagate(tc.s, tc.u)
		if err != nil {
			t.Fatal(err)
		}
		r := rand.New(rand.NewPCG(uint64(i)+7, 99))
		const n = 200000
		var sa, saa, se, see, sae float64
		for j := 0; j < n; j++ {
			s := tc.s
			s.Height += r.NormFloat64() * tc.u.HeightSD
			s.Length *= 1 + r.NormFloat64()*tc.u.LengthSDPct/100
			s.BearingDeg += r.NormFloat64() * tc.u.BearingSDDeg
			sun, err := SunFromShadow(s)
			if err != nil {
				t.Fatal(err)
			}
			a := math.Remainder(sun.AzimuthDeg-est.Sun.AzimuthDeg, 360)
			e := sun.AltitudeDeg - est.Sun.AltitudeDeg
			sa += a
			saa += a * a
			se += e
			see += e * e
			sae += a * e
		}
		ma, me := sa/n, se/n
		sdA := math.Sqrt(saa/n - ma*ma)
		sdE := math.Sqrt(see/n - me*me)
		corr := (sae/n - ma*me) / (sdA * sdE)
		if math.Abs(sdA/est.AzimuthSDDeg-1) > 0.03 || math.Abs(sdE/est.AltitudeSDDeg-1) > 0.03 || math.Abs(corr-est.Correlation) > 0.03 {
			t.Errorf("%s case %d: analytic σaz %.4f σalt %.4f ρ %.3f; sampled %.4f %.4f %.3f",
				tc.source, i, est.AzimuthSDDeg, est.AltitudeSDDeg, est.Correlation, sdA, sdE, corr)
		}
	}
}

// FuzzRoundTrip: any shadow that SunFromShadow accepts must come back
// from ShadowFromSun unchanged, and nothing may panic or return NaN.
func FuzzRoundTrip(f *testing.F) {
	f.Add(1.0, 1.0, 0.0, 0.0, 0.0)
	f.Add(1.8, 2.6, 315.0, 10.0, 45.0)
	f.Add(1.0, 10.0, 0.0, 45.0, 180.0)
	f.Fuzz(func(t *testing.T, h, l, b, s, tw float64) {
		sh := Shadow{Height: h, Length: l, BearingDeg: b, Ground: Ground{SlopeDeg: s, TowardDeg: tw}}
		sun, err := SunFromShadow(sh)
		if err != nil {
			return
		}
		if math.IsNaN(sun.AltitudeDeg) || math.IsNaN(sun.AzimuthDeg) || sun.AltitudeDeg <= 0 || sun.AltitudeDeg > 90 {
			t.Fatalf("%+v -> %+v", sh, sun)
		}
		if sun.AltitudeDeg > 89.9 || sun.AltitudeDeg < 0.1 || l/h > 1e6 || h/l > 1e6 || math.Abs(b) > 1e6 || math.Abs(tw) > 1e6 {
			return // ill-conditioned: no round-trip precision to expect
		}
		l2, b2, err := ShadowFromSun(sun, h, sh.Ground)
		if err != nil {
			t.Fatalf("%+v -> %+v -> %v", sh, sun, err)
		}
		if math.Abs(l2-l) > 1e-6*l || math.Abs(math.Remainder(b2-b, 360)) > 1e-6 {
			t.Fatalf("%+v -> %+v -> L %g b %g", sh, sun, l2, b2)
		}
	})
}
