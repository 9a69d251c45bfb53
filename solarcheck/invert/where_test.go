package invert

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/angle"
	"github.com/gnomon-forensics/gnomon/internal/sphere"
	"github.com/gnomon-forensics/gnomon/solarcheck/spa"
)

func whereQuery(t time.Time, p spa.Position, sdAz, sdAlt float64) WhereQuery {
	return WhereQuery{Time: t, PressureHPa: spa.DefaultPressureHPa, TemperatureC: spa.DefaultTemperatureC,
		Measurement: Measurement{HasAzimuth: true, AzimuthDeg: p.AzimuthDeg, AzimuthSDDeg: sdAz,
			HasAltitude: true, AltitudeDeg: p.AltitudeDeg, AltitudeSDDeg: sdAlt}}
}

func TestWhereRoundTrip(t *testing.T) {
	tests := []struct {
		source   string
		name     string
		lat, lon float64
		at       time.Time
	}{
		{srcRT, "mid-latitude morning", 48.85, 2.35, time.Date(2024, 6, 3, 9, 17, 0, 0, time.UTC)},
		{srcRT, "southern hemisphere", -33.87, 151.21, time.Date(2024, 8, 14, 2, 40, 0, 0, time.UTC)},
		{srcRT, "tropics 10° N in June, azimuth reversal hour", 10, -75, time.Date(2024, 6, 21, 11, 40, 0, 0, time.UTC)},
		{srcRT, "near the zenith", 23, 90, time.Date(2024, 6, 21, 5, 55, 0, 0, time.UTC)},
		{srcRT, "equator", 0.3, 36.8, time.Date(2024, 3, 20, 6, 30, 0, 0, time.UTC)},
		{srcRT, "high latitude winter", 65, 25, time.Date(2024, 12, 10, 10, 0, 0, 0, time.UTC)},
		// Sun at 10.6° in the north at midnight from 78° N: the circle of
		// equal altitude encloses the pole, and from about 57° S at local
		// noon the sun stands at the same azimuth and altitude.
		{srcRT + "; common knowledge: midnight sun at 78° N in June", "polar day: midnight sun, two places", 78, 15, time.Date(2024, 6, 3, 23, 17, 0, 0, time.UTC)},
		{srcRT, "high southern latitude", -60, -60, time.Date(2024, 12, 21, 20, 0, 0, 0, time.UTC)},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			p := sunAt(tc.lat, tc.lon, tc.at)
			fixes, err := Where(whereQuery(tc.at, p, 0.5, 0.5))
			if err != nil {
				t.Fatal(err)
			}
			// Spherical trigonometry: a circle of equal altitude that
			// encloses a pole (altitude below |declination|) meets a given
			// azimuth twice or not at all; otherwise once.
			wantN := 1
			if p.AltitudeAirlessDeg < math.Abs(p.DeclinationDeg) {
				wantN = 2
			}
			if len(fixes) != wantN {
				t.Errorf("%s; spherical trigonometry: %d fixes, want %d: %+v", tc.source, len(fixes), wantN, fixes)
			}
			best := math.Inf(1)
			for _, f := range fixes {
				best = math.Min(best, sphere.DistanceKm(f.LatDeg, f.LonDeg, tc.lat, tc.lon))
				// Every fix must really see the sun where it was measured.
				q := sunAt(f.LatDeg, f.LonDeg, tc.at)
				if math.Abs(angle.Wrap180(q.AzimuthDeg-p.AzimuthDeg))*math.Cos(angle.Rad(p.AltitudeDeg)) > 1e-6 || math.Abs(q.AltitudeDeg-p.AltitudeDeg) > 1e-6 {
					t.Errorf("%s: fix %+v sees az %.6f alt %.6f, measured %.6f %.6f", tc.source, f, q.AzimuthDeg, q.AltitudeDeg, p.AzimuthDeg, p.AltitudeDeg)
				}
				// 0.5° in altitude moves the circle of position by 55.6 km.
				if f.SemiMajorKm < 50 || f.RadiusKm > 3000 {
					t.Errorf("%s: implausible uncertainty %+v", tc.source, f)
				}
			}
			if best > 0.01 {
				t.Errorf("%s: nearest fix %.3f km from the truth: %+v", tc.source, best, fixes)
			}
		})
	}
}

// Sun straight overhead: the observer is at the subsolar point.
func TestWhereZenith(t *testing.T) {
	tests := []struct {
		source string
		at     time.Time
	}{
		{"common knowledge: the sun is overhead at the subsolar point", time.Date(2024, 6, 21, 12, 0, 0, 0, time.UTC)},
		{"common knowledge: the sun is overhead at the subsolar point", time.Date(2024, 3, 20, 3, 6, 0, 0, time.UTC)},
		{"common knowledge: the sun is overhead at the subsolar point", time.Date(2025, 12, 21, 18, 30, 0, 0, time.UTC)},
	}
	for _, tc := range tests {
		g := spa.GeocentricAt(tc.at, spa.DeltaT(tc.at))
		ssp := g.Topocentric(spa.Observer{})
		// Azimuth is meaningless overhead; any value must give the same place.
		for _, az := range []float64{0, 137} {
			q := WhereQuery{Time: tc.at, PressureHPa: spa.DefaultPressureHPa, TemperatureC: spa.DefaultTemperatureC,
				Measurement: Measurement{HasAzimuth: true, AzimuthDeg: az, AzimuthSDDeg: 1, HasAltitude: true, AltitudeDeg: 90, AltitudeSDDeg: 0.5}}
			fixes, err := Where(q)
			if err != nil {
				t.Fatalf("%s: %v", tc.source, err)
			}
			if len(fixes) != 1 {
				t.Fatalf("%s: %d fixes", tc.source, len(fixes))
			}
			f := fixes[0]
			if d := sphere.DistanceKm(f.LatDeg, f.LonDeg, ssp.SubsolarLatDeg, ssp.SubsolarLonDeg); d > 0.5 {
				t.Errorf("%s at %s: fix %.4f, %.4f is %.2f km from the subsolar point %.4f, %.4f", tc.source, tc.at,
					f.LatDeg, f.LonDeg, d, ssp.SubsolarLatDeg, ssp.SubsolarLonDeg)
			}
			// Radius: 0.5° of altitude is 55.6 km on the ground; 95 % circle √5.991 × that
			// (5.991: χ² 95 % point for 2 dof, NIST/SEMATECH e-Handbook 1.3.6.7.4).
			if want := angle.Rad(math.Sqrt(5.991)*0.5) * earthRadiusKm; math.Abs(f.RadiusKm-want) > 0.01*want {
				t.Errorf("%s: radius %.1f km, want %.1f", tc.source, f.RadiusKm, want)
			}
		}
	}
}

// Coverage: with noise drawn from the stated sds, the true place lies
// within RadiusKm of a fix at least 95 % of the time (the circle encloses
// the 95 % ellipse, so a little more).
func TestWhereCoverage(t *testing.T) {
	const source = "chi-square 95 % point (statistics handbook) with noise from seeded math/rand/v2"
	r := rand.New(rand.NewPCG(5, 6))
	const n = 300
	hits, trials := 0, 0
	for trials < n {
		lat := r.Float64()*140 - 70
		lon := r.Float64()*360 - 180
		at := time.Date(2024, time.Month(1+r.IntN(12)), 1+r.IntN(28), r.IntN(24), r.IntN(60), 0, 0, time.UTC)
		p := sunAt(lat, lon, at)
		if p.AltitudeDeg < 15 || p.AltitudeDeg > 75 {
			continue
		}
		trials++
		const sdAz, sdAlt = 1.0, 0.3
		q := whereQuery(at, p, sdAz, sdAlt)
		q.Measurement.AzimuthDeg += sdAz * r.NormFloat64()
		q.Measurement.AltitudeDeg += sdAlt * r.NormFloat64()
		fixes, err := Where(q)
		if err != nil {
			t.Fatal(err)
		}
		for _, f := range fixes {
			if sphere.DistanceKm(f.LatDeg, f.LonDeg, lat, lon) <= f.RadiusKm {
				hits++
				break
			}
		}
	}
	if hits < 280 { // expected ≥ 95 % of 300 = 285; 280 allows sampling noise
		t.Errorf("%s: %d of %d true places within the radius", source, hits, n)
	}
	t.Logf("coverage %d/%d", hits, n)
}

func TestWhereErrors(t *testing.T) {
	at := time.Date(2024, 6, 1, 12, 0, 0, 0, time.UTC)
	tests := []struct {
		source string
		m      Measurement
	}{
		{"common knowledge: one angle fixes no point", Measurement{HasAzimuth: true, AzimuthDeg: 100, AzimuthSDDeg: 1}},
		{"common knowledge: an uncertainty is positive", Measurement{HasAzimuth: true, AzimuthDeg: 100, HasAltitude: true, AltitudeDeg: 30, AltitudeSDDeg: 1}},
		{"common knowledge: altitude is at most 90°", Measurement{HasAzimuth: true, AzimuthDeg: 100, AzimuthSDDeg: 1, HasAltitude: true, AltitudeDeg: 95, AltitudeSDDeg: 1}},
		{"common knowledge: a shadow needs the sun up", Measurement{HasAzimuth: true, AzimuthDeg: 100, AzimuthSDDeg: 1, HasAltitude: true, AltitudeDeg: -20, AltitudeSDDeg: 1}},
	}
	for _, tc := range tests {
		if _, err := Where(WhereQuery{Time: at, Measurement: tc.m}); !errors.Is(err, ErrInvalid) {
			t.Errorf("%s: got %v, want ErrInvalid", tc.source, err)
		}
	}
}
