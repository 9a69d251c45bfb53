package invert

import (
	"errors"
	"math"
	"testing"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/chisq"
	"github.com/gnomon-forensics/gnomon/solarcheck/shadow"
	"github.com/gnomon-forensics/gnomon/solarcheck/spa"
)

// srcRT names the witness of every round trip: the forward model is spa.At,
// which package spa checks against the SPA report (Table A5.1) and an
// astropy-generated table.
const srcRT = "round trip through spa (itself checked against the SPA report and astropy)"

func sunAt(lat, lon float64, t time.Time) spa.Position {
	return spa.At(t, spa.NewObserver(lat, lon, 0), spa.DeltaT(t))
}

// when is When for tests that look only at the fitting windows.
func when(q Query) ([]Window, error) {
	r, err := When(q)
	return r.Windows, err
}

func utcDay(t time.Time) (time.Time, time.Time) {
	y, m, d := t.UTC().Date()
	start := time.Date(y, m, d, 0, 0, 0, 0, time.UTC)
	return start, start.Add(24*time.Hour - time.Second)
}

type whenCase struct {
	source    string
	name      string
	lat, lon  float64
	truth     time.Time
	az, alt   bool    // which angles are "measured"
	sd        float64 // sd of each measured angle
	wantCount int     // windows expected in the UTC day of truth; −1: do not check
	noMatch   bool    // expect nothing at all
}

func TestWhenRoundTrip(t *testing.T) {
	tests := []whenCase{
		{srcRT, "mid-latitude, both angles", 48.85, 2.35, time.Date(2024, 6, 3, 9, 17, 0, 0, time.UTC), true, true, 1, 1, false},
		{srcRT + "; common knowledge: an altitude is reached twice a day, before and after noon", "mid-latitude, altitude only", 48.85, 2.35, time.Date(2024, 3, 3, 9, 17, 0, 0, time.UTC), false, true, 0.5, 2, false},
		{srcRT, "southern hemisphere, azimuth only", -33.87, 151.21, time.Date(2024, 8, 14, 2, 40, 0, 0, time.UTC), true, false, 1, 1, false},
		{srcRT + "; common knowledge: where the declination exceeds the latitude the azimuth turns back", "tropics 10° N in June: azimuth reversal", 10, -75, time.Date(2024, 6, 21, 11, 40, 0, 0, time.UTC), true, false, 0.1, 2, false},
		{srcRT, "tropics 10° N in June: after the reversal", 10, -75, time.Date(2024, 6, 21, 13, 30, 0, 0, time.UTC), true, true, 0.2, 1, false},
		{srcRT, "near the zenith, 23° N at the June solstice", 23, 90, time.Date(2024, 6, 21, 5, 50, 0, 0, time.UTC), true, true, 0.5, 1, false},
		{srcRT, "equator at equinox, morning", 0.3, 36.8, time.Date(2024, 3, 20, 6, 30, 0, 0, time.UTC), true, true, 1, 1, false},
		{srcRT, "high latitude in winter, low sun", 65, 25, time.Date(2024, 12, 10, 10, 0, 0, 0, time.UTC), true, true, 0.5, 1, false},
		{srcRT + "; common knowledge: midnight sun at 78° N in June", "polar day: midnight sun, azimuth only", 78.2, 15.6, time.Date(2024, 6, 20, 23, 0, 0, 0, time.UTC), true, false, 1, -1, false},
		{srcRT + "; common knowledge: midnight sun at 78° N in June", "polar day: altitude only", 78.2, 15.6, time.Date(2024, 6, 20, 8, 0, 0, 0, time.UTC), false, true, 0.5, 2, false},
		{srcRT + "; common knowledge: polar night at 78° N in December", "polar night: nothing matches", 78.2, 15.6, time.Date(2024, 12, 20, 11, 0, 0, 0, time.UTC), true, true, 1, 0, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			p := sunAt(tc.lat, tc.lon, tc.truth)
			m := Measurement{}
			if tc.az {
				m.HasAzimuth, m.AzimuthDeg, m.AzimuthSDDeg = true, p.AzimuthDeg, tc.sd
			}
			if tc.alt {
				m.HasAltitude, m.AltitudeDeg, m.AltitudeSDDeg = true, p.AltitudeDeg, tc.sd
			}
			if tc.noMatch {
				// The sun is below the horizon all day: ask for a
				// daytime-looking direction instead of the true one.
				m.AzimuthDeg, m.AltitudeDeg = 180, 5
			}
			from, to := utcDay(tc.truth)
			ws, err := when(Query{Observer: spa.NewObserver(tc.lat, tc.lon, 0), From: from, To: to, Measurement: m})
			if err != nil {
				t.Fatal(err)
			}
			if tc.noMatch {
				if len(ws) != 0 {
					t.Fatalf("%s: want no match, got %d: %+v", tc.source, len(ws), ws)
				}
				return
			}
			if tc.wantCount >= 0 && len(ws) != tc.wantCount {
				t.Errorf("%s: %d windows, want %d: %+v", tc.source, len(ws), tc.wantCount, ws)
			}
			found := false
			for _, w := range ws {
				if w.Best.Before(w.Earliest) || w.Best.After(w.Latest) {
					t.Errorf("%s: best %s outside [%s, %s]", tc.source, w.Best, w.Earliest, w.Latest)
				}
				if !w.Fits() || w.Dof != m.FitDof() {
					t.Errorf("%s: a returned window must fit: misfit %.3f, %d dof, p %.3f", tc.source, w.Misfit, w.Dof, w.PValue)
				}
				if !tc.truth.Before(w.Earliest) && !tc.truth.After(w.Latest) {
					found = true
					if d := w.Best.Sub(tc.truth); d.Abs() > 2*time.Second && tc.sd >= 0 && m.Dof() == 2 && !w.StartsBefore && !w.EndsAfter {
						// With both angles measured exactly, the best time is the true time.
						t.Errorf("%s: best %s, truth %s", tc.source, w.Best, tc.truth)
					}
				}
			}
			if !found {
				t.Errorf("%s: no window contains the true time %s: %+v", tc.source, tc.truth, ws)
			}
		})
	}
}

// Altitude only, measured just below the day's maximum: the morning and
// afternoon solutions merge into one wide window around noon.
func TestWhenNearNoonMerges(t *testing.T) {
	const lat, lon = 40.0, -3.7
	day := time.Date(2024, 5, 10, 0, 0, 0, 0, time.UTC)
	// Find the transit by brute force with spa.At (1 s is plenty).
	best, bestAlt := day, -90.0
	for s := 0; s < 86400; s += 10 {
		ts := day.Add(time.Duration(s) * time.Second)
		if a := sunAt(lat, lon, ts).AltitudeDeg; a > bestAlt {
			best, bestAlt = ts, a
		}
	}
	m := Measurement{HasAltitude: true, AltitudeDeg: bestAlt - 0.3, AltitudeSDDeg: 1}
	ws, err := when(Query{Observer: spa.NewObserver(lat, lon, 0), From: day, To: day.Add(24*time.Hour - time.Second), Measurement: m})
	if err != nil {
		t.Fatal(err)
	}
	if len(ws) != 1 {
		t.Fatalf("%s; common knowledge: altitude is flat at noon: want one merged window, got %+v", srcRT, ws)
	}
	w := ws[0]
	if best.Before(w.Earliest) || best.After(w.Latest) {
		t.Errorf("%s: transit %s outside [%s, %s]", srcRT, best, w.Earliest, w.Latest)
	}
	if w.Latest.Sub(w.Earliest) < 90*time.Minute {
		t.Errorf("%s: near-noon window only %s wide", srcRT, w.Latest.Sub(w.Earliest))
	}
}

// Windows from a shadow: forward with spa.At and package shadow, back with When.
func TestWhenFromShadow(t *testing.T) {
	tests := []struct {
		source   string
		lat, lon float64
		truth    time.Time
		ground   shadow.Ground
	}{
		{srcRT, 51.48, 0, time.Date(2024, 9, 12, 14, 5, 0, 0, time.UTC), shadow.Ground{}},
		{srcRT, 51.48, 0, time.Date(2024, 9, 12, 14, 5, 0, 0, time.UTC), shadow.Ground{SlopeDeg: 12, TowardDeg: 20}},
		{srcRT, -22.9, -43.2, time.Date(2024, 1, 5, 17, 45, 0, 0, time.UTC), shadow.Ground{SlopeDeg: 8, TowardDeg: 250}},
	}
	for _, tc := range tests {
		p := sunAt(tc.lat, tc.lon, tc.truth)
		l, b, err := shadow.ShadowFromSun(shadow.Sun{AzimuthDeg: p.AzimuthDeg, AltitudeDeg: p.AltitudeDeg}, 1.5, tc.ground)
		if err != nil {
			t.Fatal(err)
		}
		est, err := shadow.Propagate(shadow.Shadow{Height: 1.5, Length: l, BearingDeg: b, Ground: tc.ground},
			shadow.Uncertainty{HeightSD: 0.01, LengthSDPct: 5, BearingSDDeg: 2})
		if err != nil {
			t.Fatal(err)
		}
		from, to := utcDay(tc.truth)
		ws, err := when(Query{Observer: spa.NewObserver(tc.lat, tc.lon, 0), From: from, To: to, Measurement: FromShadow(est)})
		if err != nil {
			t.Fatal(err)
		}
		if len(ws) != 1 || tc.truth.Before(ws[0].Earliest) || tc.truth.After(ws[0].Latest) || ws[0].Best.Sub(tc.truth).Abs() > 2*time.Second {
			t.Errorf("%s: shadow %+v: windows %+v, truth %s", tc.source, tc.ground, ws, tc.truth)
		}
	}
}

// bruteEdges scans with full spa.At every stepS seconds outward from a
// window's best time and returns the first samples at which the misfit
// reaches the window's edge level, its least misfit plus Δχ² (the package
// doc's profile interval); the zero time where the scan leaves the range.
func bruteEdges(o spa.Observer, from, to time.Time, stepS int, m Measurement, w Window) (lo, hi time.Time) {
	dt := spa.DeltaT(from)
	thr := w.Misfit + chisq.P95(ProfileDof)
	chi := func(ts time.Time) float64 { p := spa.At(ts, o, dt); return m.chi2(p.AzimuthDeg, p.AltitudeDeg) }
	for ts := w.Best; !ts.Before(from); ts = ts.Add(-time.Duration(stepS) * time.Second) {
		if chi(ts) >= thr {
			lo = ts
			break
		}
	}
	for ts := w.Best; !ts.After(to); ts = ts.Add(time.Duration(stepS) * time.Second) {
		if chi(ts) >= thr {
			hi = ts
			break
		}
	}
	return lo, hi
}

// bruteMinima returns the sampled local minima of the misfit (full spa.At
// every stepS seconds) whose value is below limit.
func bruteMinima(o spa.Observer, from time.Time, n, stepS int, m Measurement, limit float64) []time.Time {
	dt := spa.DeltaT(from)
	v := make([]float64, n+1)
	for i := range v {
		p := spa.At(from.Add(time.Duration(i*stepS)*time.Second), o, dt)
		v[i] = m.chi2(p.AzimuthDeg, p.AltitudeDeg)
	}
	var out []time.Time
	for i := 1; i < n; i++ {
		if v[i] < v[i-1] && v[i] <= v[i+1] && v[i] < limit {
			out = append(out, from.Add(time.Duration(i*stepS)*time.Second))
		}
	}
	return out
}

// The fast search must agree with a plain scan with full SPA every 15 s:
// every sampled minimum that fits lies in a window, and each window's
// edges are where the misfit first reaches its least misfit + 3.841
// (within a scan step and a second).
func TestWhenMatchesBruteForce(t *testing.T) {
	tests := []struct {
		source   string
		lat, lon float64
		truth    time.Time
		az, alt  bool
		sd       float64
		biasDeg  float64 // added to the measured azimuth or altitude
	}{
		{srcRT, 10, -75, time.Date(2024, 6, 21, 11, 40, 0, 0, time.UTC), true, false, 0.1, 0},
		{srcRT, 45, 7, time.Date(2024, 11, 2, 8, 40, 0, 0, time.UTC), false, true, 0.3, 0},
		{srcRT, 78.2, 15.6, time.Date(2024, 6, 20, 23, 0, 0, 0, time.UTC), true, true, 1, 0},
		{srcRT, 23, 90, time.Date(2024, 6, 21, 5, 50, 0, 0, time.UTC), true, false, 0.5, 0},
		{srcRT, -45, 170, time.Date(2024, 2, 2, 1, 0, 0, 0, time.UTC), true, true, 2, 0},
		{srcRT + "; a 2σ bias", -45, 170, time.Date(2024, 2, 2, 1, 0, 0, 0, time.UTC), true, true, 1, 2},
	}
	for _, tc := range tests {
		p := sunAt(tc.lat, tc.lon, tc.truth)
		m := Measurement{HasAzimuth: tc.az, AzimuthDeg: p.AzimuthDeg + tc.biasDeg, AzimuthSDDeg: tc.sd,
			HasAltitude: tc.alt, AltitudeDeg: p.AltitudeDeg, AltitudeSDDeg: tc.sd}
		if !tc.az {
			m.AltitudeDeg += tc.biasDeg
		}
		from := time.Date(tc.truth.Year(), tc.truth.Month(), tc.truth.Day()-1, 0, 0, 0, 0, time.UTC)
		const days, step = 3, 15
		to := from.Add(days*24*time.Hour - time.Second)
		o := spa.NewObserver(tc.lat, tc.lon, 0)
		ws, err := when(Query{Observer: o, From: from, To: to, Measurement: m})
		if err != nil {
			t.Fatal(err)
		}
		if len(ws) == 0 {
			t.Errorf("%s at %.1f,%.1f: no window", tc.source, tc.lat, tc.lon)
			continue
		}
		tol := time.Duration(step+1) * time.Second
		for _, bm := range bruteMinima(o, from, days*86400/step-1, step, m, chisq.Point(FitLevel, m.FitDof())*0.99) {
			in := false
			for _, w := range ws {
				if !bm.Before(w.Earliest.Add(-tol)) && !bm.After(w.Latest.Add(tol)) {
					in = true
				}
			}
			if !in {
				t.Errorf("%s at %.1f,%.1f: sampled fitting minimum %s lies in no window %+v", tc.source, tc.lat, tc.lon, bm, ws)
			}
		}
		for i, w := range ws {
			lo, hi := bruteEdges(o, from, to, step, m, w)
			if (!lo.IsZero() && w.Earliest.Sub(lo).Abs() > tol) || (!hi.IsZero() && w.Latest.Sub(hi).Abs() > tol) ||
				lo.IsZero() != w.StartsBefore || hi.IsZero() != w.EndsAfter {
				t.Errorf("%s at %.1f,%.1f window %d: [%s, %s], brute force edges %s, %s", tc.source, tc.lat, tc.lon, i,
					w.Earliest, w.Latest, lo, hi)
			}
		}
	}
}

func TestWhenErrors(t *testing.T) {
	o := spa.NewObserver(45, 7, 0)
	day := time.Date(2024, 1, 1, 0, 0, 0, 0, time.UTC)
	good := Measurement{HasAzimuth: true, AzimuthDeg: 180, AzimuthSDDeg: 1}
	tests := []struct {
		source string
		q      Query
	}{
		{"common knowledge: something must be measured", Query{Observer: o, From: day, To: day.Add(time.Hour)}},
		{"common knowledge: an uncertainty is positive", Query{Observer: o, From: day, To: day.Add(time.Hour), Measurement: Measurement{HasAzimuth: true, AzimuthDeg: 180}}},
		{"common knowledge: a range runs forward", Query{Observer: o, From: day, To: day.Add(-time.Hour), Measurement: good}},
		{"package limit: the 1-minute search step", Query{Observer: o, From: day, To: day, Measurement: good}},
		{"package limit MaxRange", Query{Observer: o, From: day, To: day.Add(MaxRange + time.Hour), Measurement: good}},
		{"common knowledge: latitude is within ±90°", Query{Observer: spa.NewObserver(91, 0, 0), From: day, To: day.Add(time.Hour), Measurement: good}},
	}
	for _, tc := range tests {
		if _, err := When(tc.q); !errors.Is(err, ErrInvalid) {
			t.Errorf("%s: got %v, want ErrInvalid", tc.source, err)
		}
	}
}

// Only a visible sun matches unless told otherwise.
func TestWhenSunMustBeUp(t *testing.T) {
	const source = "common knowledge: at 49° N in June the sun is due north only at night, below the horizon"
	o := spa.NewObserver(48.85, 2.35, 0)
	from, to := utcDay(time.Date(2024, 6, 3, 0, 0, 0, 0, time.UTC))
	m := Measurement{HasAzimuth: true, AzimuthDeg: 0, AzimuthSDDeg: 1}
	ws, err := when(Query{Observer: o, From: from, To: to, Measurement: m})
	if err != nil {
		t.Fatal(err)
	}
	if len(ws) != 0 {
		t.Errorf("%s: got %+v", source, ws)
	}
	m.BelowHorizonOK = true
	ws, err = when(Query{Observer: o, From: from, To: to, Measurement: m})
	if err != nil {
		t.Fatal(err)
	}
	if len(ws) != 1 || ws[0].AltitudeDeg > -10 {
		t.Errorf("%s: with BelowHorizonOK want one window deep below the horizon, got %+v", source, ws)
	}
}

// FuzzWhen: arbitrary measurements over one day must not panic and must
// return well-formed windows.
func FuzzWhen(f *testing.F) {
	f.Add(48.0, 2.0, 120.0, 1.0, 40.0, 1.0, uint8(3), int64(0))
	f.Add(78.0, 15.0, 0.0, 0.5, 10.0, 0.2, uint8(1), int64(170))
	f.Add(-5.0, 100.0, 200.0, 3.0, 85.0, 0.1, uint8(2), int64(80))
	f.Fuzz(func(t *testing.T, lat, lon, az, azSD, alt, altSD float64, which uint8, day int64) {
		if !(lat >= -90 && lat <= 90) || math.IsNaN(lon) || math.IsInf(lon, 0) || math.Abs(lon) > 1e4 {
			return
		}
		m := Measurement{HasAzimuth: which&1 != 0, AzimuthDeg: az, AzimuthSDDeg: azSD,
			HasAltitude: which&2 != 0, AltitudeDeg: alt, AltitudeSDDeg: altSD}
		if math.Abs(az) > 1e6 || azSD > 1e3 || altSD > 1e3 || (m.HasAzimuth && azSD < 1e-3) || (m.HasAltitude && altSD < 1e-3) {
			return
		}
		from := time.Date(2024, 1, 1, 0, 0, 0, 0, time.UTC).AddDate(0, 0, int(day%366))
		ws, err := when(Query{Observer: spa.NewObserver(lat, lon, 0), From: from, To: from.Add(24 * time.Hour), Measurement: m})
		if err != nil {
			if !errors.Is(err, ErrInvalid) {
				t.Fatalf("unexpected error kind: %v", err)
			}
			return
		}
		var prev time.Time
		for _, w := range ws {
			if w.Best.Before(w.Earliest) || w.Best.After(w.Latest) || w.Earliest.Before(prev) || w.Earliest.Before(from) || w.Latest.After(from.Add(24*time.Hour)) {
				t.Fatalf("malformed windows %+v", ws)
			}
			if !w.Fits() {
				t.Fatalf("window that does not fit: %+v", w)
			}
			prev = w.Latest
		}
	})
}

// Near the pole in midsummer the sun circles at an almost constant
// altitude, so an altitude-only match is continuous over days.
func TestWhenContinuousPolarDay(t *testing.T) {
	const source = "common knowledge: at the pole the sun's altitude equals its declination (about 23.4° at the June solstice)"
	from := time.Date(2024, 6, 16, 0, 0, 0, 0, time.UTC)
	to := time.Date(2024, 6, 26, 0, 0, 0, 0, time.UTC)
	m := Measurement{HasAltitude: true, AltitudeDeg: 23.4, AltitudeSDDeg: 1}
	ws, err := when(Query{Observer: spa.NewObserver(89.5, 0, 0), From: from, To: to, Measurement: m})
	if err != nil {
		t.Fatal(err)
	}
	if len(ws) != 1 || !ws[0].StartsBefore || !ws[0].EndsAfter || !ws[0].Earliest.Equal(from) || !ws[0].Latest.Equal(to) {
		t.Errorf("%s: want one window covering the whole range, got %+v", source, ws)
	}
}

// TestWhenMaxMisfit: with Query.MaxMisfit a window that does not fit is
// listed (and says so); without it, only the closest window reports it.
// Altitude 70° at 48.85° N, where the sun climbs to at most 64.6° (90° −
// 48.85° + 23.44°; common knowledge), with σ 2°: misfit about 7.
func TestWhenMaxMisfit(t *testing.T) {
	from := time.Date(2024, 6, 21, 0, 0, 0, 0, time.UTC)
	q := Query{Observer: spa.NewObserver(48.85, 2.35, 0), From: from, To: from.Add(24*time.Hour - time.Second),
		Measurement: Measurement{HasAltitude: true, AltitudeDeg: 70, AltitudeSDDeg: 2}}
	r, err := When(q)
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Windows) != 0 || r.Closest == nil || r.Closest.Fits() || r.Closest.Misfit < 5 || r.Closest.Misfit > 9 {
		t.Fatalf("common knowledge: 70° is out of reach: %+v, closest %+v", r.Windows, r.Closest)
	}
	q.MaxMisfit = 20
	r, err = When(q)
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Windows) != 1 || r.Windows[0].Fits() || r.Windows[0].Best.Sub(r.Closest.Best).Abs() > 2*time.Second {
		t.Errorf("MaxMisfit 20: want the one non-fitting window near noon, got %+v", r.Windows)
	}
}
