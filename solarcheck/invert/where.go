package invert

import (
	"fmt"
	"math"
	"sort"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/angle"
	"github.com/gnomon-forensics/gnomon/internal/chisq"
	"github.com/gnomon-forensics/gnomon/internal/sphere"
	"github.com/gnomon-forensics/gnomon/solarcheck/spa"
)

// earthRadiusKm turns angles on the ground into kilometres.
const earthRadiusKm = sphere.MeanRadiusKm

// fixLevel is the χ² point of a place's 95 % region: two parameters of
// interest (latitude and longitude), chisq.P95(2) = 5.991.
var fixLevel = chisq.P95(2)

// WhereQuery is a Where problem: an instant and a measured sun direction
// (both azimuth and altitude are required), and the observer's height and
// air, which SPA needs for parallax and refraction.
type WhereQuery struct {
	Time        time.Time
	Measurement Measurement
	// ElevationM, PressureHPa and TemperatureC are used as in
	// spa.Observer; PressureHPa 0 means no refraction, so set
	// spa.DefaultPressureHPa and spa.DefaultTemperatureC for the standard air.
	ElevationM   float64
	PressureHPa  float64
	TemperatureC float64
	// DeltaT gives ΔT in seconds; nil means spa.DeltaT.
	DeltaT func(time.Time) float64
}

// Fix is a position on Earth with its uncertainty.
type Fix struct {
	LatDeg, LonDeg float64
	// RadiusKm encloses the 95 % error ellipse: √5.991 × SemiMajorKm.
	RadiusKm float64
	// SemiMajorKm and SemiMinorKm are the 1-sigma semi-axes of the error
	// ellipse and MajorAxisDeg the bearing of the major axis.
	SemiMajorKm, SemiMinorKm float64
	MajorAxisDeg             float64
	// Misfit is χ² (2 dof) of the measurement at the fix: zero when some
	// place fits exactly; below 5.991 for every fix returned.
	Misfit float64
	// SubsolarLatDeg and SubsolarLonDeg are the centre of the circle of
	// equal altitude (geocentric), for the record.
	SubsolarLatDeg, SubsolarLonDeg float64
}

// Where returns the places on Earth from which the sun was seen at
// q.Measurement at q.Time (method in the package doc). Usually there is one.
// There are two when the circle of equal altitude encloses a pole (the
// sun's altitude is below its declination's magnitude): near the meridian
// a low sun in the north is seen both across the pole at midnight and from
// the southern hemisphere at noon. The fixes are ordered by RadiusKm; which
// one is real needs other evidence. No fix and an error when nothing fits.
func Where(q WhereQuery) ([]Fix, error) {
	m := q.Measurement
	if !m.HasAzimuth || !m.HasAltitude {
		return nil, fmt.Errorf("where needs both azimuth and altitude: %w", ErrInvalid)
	}
	if err := m.check(); err != nil {
		return nil, err
	}
	if m.AltitudeDeg < -1 {
		return nil, fmt.Errorf("altitude %g°: the sun must be near or above the horizon: %w", m.AltitudeDeg, ErrInvalid)
	}
	dt := q.DeltaT
	if dt == nil {
		dt = spa.DeltaT
	}
	g := spa.GeocentricAt(q.Time, dt(q.Time))
	obs := spa.Observer{ElevationM: q.ElevationM, PressureHPa: q.PressureHPa, TemperatureC: q.TemperatureC}
	ssp := g.Topocentric(obs) // any observer: the subsolar point depends only on the instant

	// Residual: horizontal components of the sun's unit vector, predicted
	// minus measured. Both are smooth through the zenith.
	wantE, wantN := horiz(m.AzimuthDeg, m.AltitudeDeg)
	resid := func(lat, lon float64) (float64, float64) {
		obs.LatDeg, obs.LonDeg = lat, lon
		p := g.Topocentric(obs)
		e, n := horiz(p.AzimuthDeg, p.AltitudeDeg)
		return e - wantE, n - wantN
	}
	// jac returns ∂(e, n)/∂(north km, east km) at (lat, lon) by central
	// differences of 1 km. (Within about 0.01° of the zenith SPA's
	// refraction formula turns slightly negative, which folds the map; a
	// 1 km step keeps that artefact below 0.5 % of the uncertainty.)
	jac := func(lat, lon float64) mat2 {
		const hKm = 1.0
		dLat := angle.Deg(hKm / earthRadiusKm)
		dLon := dLat / math.Max(math.Cos(angle.Rad(lat)), 1e-6)
		e1, n1 := resid(lat+dLat, lon)
		e0, n0 := resid(lat-dLat, lon)
		e3, n3 := resid(lat, lon+dLon)
		e2, n2 := resid(lat, lon-dLon)
		return mat2{
			{(e1 - e0) / (2 * hKm), (e3 - e2) / (2 * hKm)},
			{(n1 - n0) / (2 * hKm), (n3 - n2) / (2 * hKm)},
		}
	}
	apply := func(lat, lon, dN, dE float64) (float64, float64) {
		lat += angle.Deg(dN / earthRadiusKm)
		lon += angle.Deg(dE/earthRadiusKm) / math.Max(math.Cos(angle.Rad(lat)), 1e-6)
		if lat > 90 { // stepped over a pole
			lat, lon = 180-lat, lon+180
		} else if lat < -90 {
			lat, lon = -180-lat, lon+180
		}
		return lat, angle.Wrap180(lon)
	}
	// solve minimises |r|² by Levenberg–Marquardt steps in north/east km.
	// Where an exact solution exists this is Newton's method near it;
	// where a noisy measurement has none, it ends at the closest place,
	// which is then judged by its misfit.
	solve := func(lat, lon float64) (float64, float64) {
		re, rn := resid(lat, lon)
		cost := re*re + rn*rn
		lambda := 1e-6
		for it := 0; it < 100 && cost > 1e-24; it++ {
			j := jac(lat, lon)
			jtj := mul(transpose(j), j)
			gN := j[0][0]*re + j[1][0]*rn
			gE := j[0][1]*re + j[1][1]*rn
			a := jtj
			a[0][0] *= 1 + lambda
			a[1][1] *= 1 + lambda
			ai, ok := inverse(a)
			if !ok {
				break
			}
			dN := -(ai[0][0]*gN + ai[0][1]*gE)
			dE := -(ai[1][0]*gN + ai[1][1]*gE)
			nLat, nLon := apply(lat, lon, dN, dE)
			nre, nrn := resid(nLat, nLon)
			if c := nre*nre + nrn*nrn; c < cost {
				lat, lon, re, rn, cost = nLat, nLon, nre, nrn, c
				lambda = math.Max(lambda/10, 1e-9)
				if math.Hypot(dN, dE) < 1e-6 { // 1 mm
					break
				}
			} else {
				lambda *= 10
				if lambda > 1e8 {
					break
				}
			}
		}
		return lat, lon
	}

	// Measurement covariance mapped to (e, n) by the Jacobian of horiz.
	sA, cA := math.Sincos(angle.Rad(m.AzimuthDeg))
	sH, cH := math.Sincos(angle.Rad(m.AltitudeDeg))
	ma := mat2{{cH * cA, -sH * sA}, {-cH * sA, -sH * cA}} // ∂(e, n)/∂(az, alt), per radian
	sdA, sdH := angle.Rad(m.AzimuthSDDeg), angle.Rad(m.AltitudeSDDeg)
	cov := mat2{{sdA * sdA, m.Correlation * sdA * sdH}, {m.Correlation * sdA * sdH, sdH * sdH}}
	sEN := mul(mul(ma, cov), transpose(ma))

	var fixes []Fix
	trueAlt := m.AltitudeDeg - spa.Refraction(m.AltitudeDeg, q.PressureHPa, q.TemperatureC)
	starts := circleOfPosition(ssp.SubsolarLatDeg, ssp.SubsolarLonDeg, m.AzimuthDeg, trueAlt)
	// Also start from the best of 72 points around the circle of equal
	// altitude, for measurements that no place fits exactly.
	bestChi, bestStart := math.Inf(1), [2]float64{}
	for i := 0; i < 72; i++ {
		lat, lon := destination(ssp.SubsolarLatDeg, ssp.SubsolarLonDeg, float64(i)*5, 90-trueAlt)
		obs.LatDeg, obs.LonDeg = lat, lon
		p := g.Topocentric(obs)
		if c := m.chi2(p.AzimuthDeg, p.AltitudeDeg); c < bestChi {
			bestChi, bestStart = c, [2]float64{lat, lon}
		}
	}
	starts = append(starts, bestStart)
	for _, st := range starts {
		lat, lon := solve(st[0], st[1])
		obs.LatDeg, obs.LonDeg = lat, lon
		p := g.Topocentric(obs)
		misfit := m.chi2(p.AzimuthDeg, p.AltitudeDeg)
		if misfit >= fixLevel {
			continue
		}
		dup := false
		for _, f := range fixes {
			if sphere.DistanceKm(f.LatDeg, f.LonDeg, lat, lon) < 1 {
				dup = true
			}
		}
		if dup {
			continue
		}
		// Uncertainty: Σ_pos = J⁻¹ Σ_en J⁻ᵀ in north/east km².
		ji, ok := inverse(jac(lat, lon))
		if !ok {
			continue
		}
		sPos := mul(mul(ji, sEN), transpose(ji))
		a, b, c := sPos[0][0], sPos[0][1], sPos[1][1]
		mid, d := (a+c)/2, math.Hypot((a-c)/2, b)
		f := Fix{LatDeg: lat, LonDeg: lon, Misfit: misfit, SubsolarLatDeg: ssp.SubsolarLatDeg, SubsolarLonDeg: ssp.SubsolarLonDeg,
			SemiMajorKm: math.Sqrt(mid + d), SemiMinorKm: math.Sqrt(math.Max(mid-d, 0))}
		// Bearing of the major axis: the eigenvector's angle from north, tan 2θ = 2b/(a − c).
		f.MajorAxisDeg = math.Mod(angle.Norm360(angle.Deg(math.Atan2(2*b, a-c)/2)), 180)
		f.RadiusKm = math.Sqrt(fixLevel) * f.SemiMajorKm
		fixes = append(fixes, f)
	}
	if len(fixes) == 0 {
		return nil, fmt.Errorf("no place sees the sun at azimuth %g° and altitude %g° at %s",
			m.AzimuthDeg, m.AltitudeDeg, q.Time.UTC().Format(time.RFC3339))
	}
	sort.SliceStable(fixes, func(i, j int) bool { return fixes[i].RadiusKm < fixes[j].RadiusKm })
	return fixes, nil
}

// destination returns the point at angular distance distDeg from
// (latDeg, lonDeg) along initial bearing bearingDeg, on a sphere
// (standard direct geodesic problem on the sphere).
func destination(latDeg, lonDeg, bearingDeg, distDeg float64) (float64, float64) {
	sP, cP := math.Sincos(angle.Rad(latDeg))
	sD, cD := math.Sincos(angle.Rad(distDeg))
	sB, cB := math.Sincos(angle.Rad(bearingDeg))
	lat := math.Asin(sP*cD + cP*sD*cB)
	lon := angle.Rad(lonDeg) + math.Atan2(sB*sD*cP, cD-sP*math.Sin(lat))
	return angle.Deg(lat), angle.Wrap180(angle.Deg(lon))
}

// horiz returns the east and north components of the unit vector toward
// a sun at azimuth az and altitude alt.
func horiz(azDeg, altDeg float64) (e, n float64) {
	sA, cA := math.Sincos(angle.Rad(azDeg))
	c := math.Cos(angle.Rad(altDeg))
	return c * sA, c * cA
}

// circleOfPosition solves the navigational triangle on a sphere: the
// observers for whom a body with geographic position (decDeg, gpLonDeg)
// stands at azimuth azDeg and true altitude altDeg. With zenith distance
// z = 90° − alt, the cosine rule of the triangle pole–observer–body gives
//
//	sin δ = sin φ cos z + cos φ sin z cos A,
//
// i.e. R sin(φ + ψ) = sin δ with R = √(cos²z + sin²z cos²A) and
// ψ = atan2(sin z cos A, cos z), which has two roots φ. For each, the sine
// and cosine rules give the hour angle,
//
//	sin H = −sin A sin z / cos δ,  cos H = (cos z − sin φ sin δ)/(cos φ cos δ),
//
// and longitude = GP longitude + H (H west positive). A root is kept when
// it reproduces the azimuth and altitude to 0.5°: one root normally, both
// when the circle of equal altitude encloses a pole.
func circleOfPosition(decDeg, gpLonDeg, azDeg, altDeg float64) [][2]float64 {
	z := angle.Rad(90 - altDeg)
	sz, cz := math.Sincos(z)
	sA, cA := math.Sincos(angle.Rad(azDeg))
	sD, cD := math.Sincos(angle.Rad(decDeg))
	a, b := cz, sz*cA
	r := math.Hypot(a, b)
	psi := math.Atan2(b, a)
	q := math.Asin(math.Max(-1, math.Min(1, sD/r)))
	var out [][2]float64
	for _, phi := range []float64{q - psi, math.Pi - q - psi} {
		phi = math.Remainder(phi, 2*math.Pi)
		if phi > math.Pi/2 || phi < -math.Pi/2 {
			continue
		}
		sP, cP := math.Sincos(phi)
		if cP < 1e-12 || cD < 1e-12 {
			continue
		}
		sH := -sA * sz / cD
		cH := (cz - sP*sD) / (cP * cD)
		h := math.Atan2(sH, cH)
		sh, ch := math.Sincos(h)
		gotAlt := angle.Deg(math.Asin(sP*sD + cP*cD*ch))
		gotAz := angle.Deg(math.Atan2(sh, ch*sP-sD/cD*cP)) + 180 // SPA Eq. 45–46 without parallax
		if math.Abs(angle.Wrap180(gotAz-azDeg))*math.Cos(angle.Rad(altDeg))+math.Abs(gotAlt-altDeg) < 0.5 {
			out = append(out, [2]float64{angle.Deg(phi), angle.Wrap180(gpLonDeg + angle.Deg(h))})
		}
	}
	if len(out) == 0 && (altDeg > 89.9 || cD < 1e-12) { // degenerate: start at the GP
		out = append(out, [2]float64{decDeg, gpLonDeg})
	}
	return out
}

type mat2 = [2][2]float64

func mul(a, b mat2) mat2 {
	return mat2{
		{a[0][0]*b[0][0] + a[0][1]*b[1][0], a[0][0]*b[0][1] + a[0][1]*b[1][1]},
		{a[1][0]*b[0][0] + a[1][1]*b[1][0], a[1][0]*b[0][1] + a[1][1]*b[1][1]},
	}
}

func transpose(a mat2) mat2 { return mat2{{a[0][0], a[1][0]}, {a[0][1], a[1][1]}} }

func inverse(a mat2) (mat2, bool) {
	det := a[0][0]*a[1][1] - a[0][1]*a[1][0]
	if det == 0 || math.IsNaN(det) {
		return mat2{}, false
	}
	return mat2{{a[1][1] / det, -a[0][1] / det}, {-a[1][0] / det, a[0][0] / det}}, true
}
