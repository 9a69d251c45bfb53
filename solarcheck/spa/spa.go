package spa

import (
	"math"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/angle"
)

// Default atmosphere for the refraction correction (SPA Eq. 42): the
// report's standard values. Observer fields are used exactly as given, so a
// caller that wants refraction must set them (NewObserver does).
const (
	DefaultPressureHPa  = 1013.25
	DefaultTemperatureC = 10.0
)

// sunRadiusDeg is the Sun's apparent radius used by SPA in the refraction
// rule (report section 3.14, "0.26667°").
const sunRadiusDeg = 0.26667

// horizonRefractionDeg is the refraction at the horizon assumed by SPA's
// rule for when to apply refraction (report section 3.14, "0.5667°").
const horizonRefractionDeg = 0.5667

// Observer is a place on the Earth and the air above it.
//
// PressureHPa and TemperatureC feed SPA's refraction formula (Eq. 42) and
// are used as given: a zero pressure means no refraction (airless sky), and
// 0 °C is a real temperature. Use NewObserver, or DefaultPressureHPa and
// DefaultTemperatureC, for the report's standard atmosphere.
type Observer struct {
	LatDeg       float64 // geodetic latitude, north positive, −90..90
	LonDeg       float64 // longitude, east positive, −180..180
	ElevationM   float64 // height above the ellipsoid/sea level, metres
	PressureHPa  float64 // mean local air pressure, hPa (= mbar)
	TemperatureC float64 // mean local air temperature, °C
}

// NewObserver returns an observer at the given place with the standard
// atmosphere (DefaultPressureHPa, DefaultTemperatureC).
func NewObserver(latDeg, lonDeg, elevationM float64) Observer {
	return Observer{LatDeg: latDeg, LonDeg: lonDeg, ElevationM: elevationM,
		PressureHPa: DefaultPressureHPa, TemperatureC: DefaultTemperatureC}
}

// Geocentric holds every SPA quantity that depends only on the instant
// (report sections 3.1–3.10 and A.1). It is the slow part of the algorithm
// (about 260 periodic terms); Topocentric adds an observer cheaply, so a
// search over many places at one instant computes it once.
type Geocentric struct {
	Time      time.Time // the instant, taken as UT1
	JD        float64   // Julian Day (UT), Eq. 4
	JDE       float64   // Julian Ephemeris Day (TT), Eq. 5
	DeltaTSec float64   // ΔT = TT − UT1 used, seconds
	JC, JCE   float64   // Julian (ephemeris) centuries since J2000.0, Eq. 6–7
	JME       float64   // Julian ephemeris millennia since J2000.0, Eq. 8

	HelioLonDeg   float64 // Earth heliocentric longitude L, Eq. 9–12
	HelioLatDeg   float64 // Earth heliocentric latitude B, Eq. 9–12
	EarthRadiusAU float64 // Earth–Sun distance R, Eq. 9–12

	GeoLonDeg float64 // geocentric longitude Θ, Eq. 13
	GeoLatDeg float64 // geocentric latitude β, Eq. 14

	NutationLonDeg float64 // nutation in longitude Δψ, Eq. 22
	NutationOblDeg float64 // nutation in obliquity Δε, Eq. 23
	ObliquityDeg   float64 // true obliquity of the ecliptic ε, Eq. 25
	AberrationDeg  float64 // aberration correction Δτ, Eq. 26
	ApparentLonDeg float64 // apparent sun longitude λ, Eq. 27

	MeanSiderealDeg float64 // mean sidereal time at Greenwich ν0, Eq. 28
	SiderealDeg     float64 // apparent sidereal time at Greenwich ν, Eq. 29

	RightAscensionDeg float64 // apparent geocentric right ascension α, 0..360, Eq. 30
	DeclinationDeg    float64 // apparent geocentric declination δ, Eq. 31

	SunMeanLonDeg     float64 // sun's mean longitude M, Eq. A2
	EquationOfTimeMin float64 // apparent minus mean solar time E, Eq. A1
}

// Position is the Sun seen from an observer at an instant.
type Position struct {
	Geocentric Geocentric // the instant-only quantities it was computed from

	AzimuthDeg         float64 // topocentric azimuth Φ, clockwise from true north, 0..360, Eq. 46
	AltitudeDeg        float64 // topocentric elevation e with refraction, Eq. 43
	AltitudeAirlessDeg float64 // topocentric elevation e0 without refraction, Eq. 41
	RefractionDeg      float64 // refraction Δe applied (0 when SPA's rule skips it), Eq. 42
	ZenithDeg          float64 // topocentric zenith angle θ = 90 − e, Eq. 44

	DeclinationDeg        float64 // apparent geocentric declination δ, Eq. 31
	RightAscensionDeg     float64 // apparent geocentric right ascension α, Eq. 30
	GeoHourAngleDeg       float64 // observer's local hour angle H (geocentric), −180..180, Eq. 32
	HourAngleDeg          float64 // topocentric local hour angle H', −180..180 (west positive), Eq. 40
	TopoRightAscensionDeg float64 // topocentric right ascension α', Eq. 38
	TopoDeclinationDeg    float64 // topocentric declination δ', Eq. 39
	ParallaxRADeg         float64 // parallax in right ascension Δα, Eq. 37

	EquationOfTimeMin float64       // Eq. A1, minutes
	ApparentSolarTime time.Duration // local apparent solar time since apparent midnight, 0..24 h: 12 h + H/15
	SubsolarLatDeg    float64       // latitude where the sun is overhead (= δ)
	SubsolarLonDeg    float64       // longitude where the sun is overhead (H = 0), −180..180
}

// unixEpochJD is the Julian Day of 1970-01-01T00:00:00 UT.
const unixEpochJD = 2440587.5

// J2000 is the Julian (Ephemeris) Day of 2000-01-01T12:00.
const j2000 = 2451545.0

// JulianDay returns the Julian Day of an instant (its clock reading taken
// as UT). It is SPA Eq. 4 for Gregorian dates, computed from the Unix time
// so that it holds for any instant time.Time can represent.
func JulianDay(t time.Time) float64 {
	sec := t.Unix()
	days := sec / 86400
	rem := sec % 86400
	if rem < 0 {
		rem += 86400
		days--
	}
	return unixEpochJD + float64(days) + (float64(rem)+float64(t.Nanosecond())*1e-9)/86400
}

// TimeFromJulianDay is the inverse of JulianDay, to the nearest microsecond.
func TimeFromJulianDay(jd float64) time.Time {
	d := jd - unixEpochJD
	days := math.Floor(d)
	us := math.Round((d - days) * 86400e6)
	return time.Unix(int64(days)*86400, 0).Add(time.Duration(us) * time.Microsecond).UTC()
}

// GeocentricAt evaluates the instant-only part of SPA (report sections
// 3.1–3.10 and A.1) at t, taken as UT1, with TT = UT1 + deltaTSec.
func GeocentricAt(t time.Time, deltaTSec float64) Geocentric {
	g := geocentricJD(JulianDay(t), deltaTSec)
	g.Time = t.UTC()
	return g
}

// geocentricJD is GeocentricAt for a Julian Day (UT).
func geocentricJD(jd, deltaTSec float64) Geocentric {
	g := Geocentric{JD: jd, DeltaTSec: deltaTSec}
	// 3.1 Julian and ephemeris day, century, millennium.
	g.JDE = jd + deltaTSec/86400    // Eq. 5
	g.JC = (jd - j2000) / 36525     // Eq. 6
	g.JCE = (g.JDE - j2000) / 36525 // Eq. 7
	g.JME = g.JCE / 10              // Eq. 8
	jme := g.JME

	// 3.2 Earth heliocentric longitude, latitude and radius vector.
	lRad := seriesSum(jme, 0, 6)                   // Eq. 9–11
	bRad := seriesSum(jme, 6, 2)                   // Eq. 9–11 for B
	g.EarthRadiusAU = seriesSum(jme, 8, 5)         // Eq. 9–11 for R, AU
	g.HelioLonDeg = angle.Norm360(angle.Deg(lRad)) // Eq. 12
	g.HelioLatDeg = angle.Deg(bRad)                // Eq. 12 for B

	// 3.3 Geocentric longitude and latitude.
	g.GeoLonDeg = angle.Norm360(g.HelioLonDeg + 180) // Eq. 13
	g.GeoLatDeg = -g.HelioLatDeg                     // Eq. 14

	// 3.4 Nutation in longitude and obliquity.
	g.NutationLonDeg, g.NutationOblDeg = nutation(g.JCE) // Eq. 15–23

	// 3.5 True obliquity of the ecliptic.
	u := jme / 10 // Eq. 24: U = JME/10
	eps0 := 84381.448 + u*(-4680.93+u*(-1.55+u*(1999.25+u*(-51.38+u*(-249.67+
		u*(-39.05+u*(7.12+u*(27.87+u*(5.79+u*2.45))))))))) // Eq. 24, arcsec
	g.ObliquityDeg = eps0/3600 + g.NutationOblDeg // Eq. 25

	// 3.6 Aberration correction.
	g.AberrationDeg = -20.4898 / (3600 * g.EarthRadiusAU) // Eq. 26

	// 3.7 Apparent sun longitude.
	g.ApparentLonDeg = g.GeoLonDeg + g.NutationLonDeg + g.AberrationDeg // Eq. 27

	// 3.8 Apparent sidereal time at Greenwich.
	jc := g.JC
	g.MeanSiderealDeg = angle.Norm360(280.46061837 + 360.98564736629*(jd-j2000) +
		jc*jc*(0.000387933-jc/38710000)) // Eq. 28
	epsRad := angle.Rad(g.ObliquityDeg)
	g.SiderealDeg = g.MeanSiderealDeg + g.NutationLonDeg*math.Cos(epsRad) // Eq. 29

	// 3.9–3.10 Geocentric right ascension and declination.
	lam := angle.Rad(g.ApparentLonDeg)
	beta := angle.Rad(g.GeoLatDeg)
	sinLam, cosLam := math.Sincos(lam)
	sinEps, cosEps := math.Sincos(epsRad)
	g.RightAscensionDeg = angle.Norm360(angle.Deg(math.Atan2(sinLam*cosEps-math.Tan(beta)*sinEps, cosLam))) // Eq. 30
	g.DeclinationDeg = angle.Deg(math.Asin(math.Sin(beta)*cosEps + math.Cos(beta)*sinEps*sinLam))           // Eq. 31

	// A.1 Equation of time.
	g.SunMeanLonDeg = angle.Norm360(280.4664567 + jme*(360007.6982779+jme*(0.03032028+
		jme*(1.0/49931+jme*(-1.0/15300+jme*(-1.0/2000000)))))) // Eq. A2
	e := g.SunMeanLonDeg - 0.0057183 - g.RightAscensionDeg + g.NutationLonDeg*cosEps // Eq. A1, degrees
	eMin := 4 * e
	// The report limits E to ±20 min by adding or subtracting 1440 min.
	eMin = math.Mod(eMin, 1440)
	switch {
	case eMin > 20:
		eMin -= 1440
	case eMin < -20:
		eMin += 1440
	}
	g.EquationOfTimeMin = eMin
	return g
}

// seriesSum evaluates Σ_i X_i·JME^i / 1e8 over n consecutive Earth series
// starting at index first, where X_i = Σ A·cos(B + C·JME) (Eq. 9–11).
func seriesSum(jme float64, first, n int) float64 {
	sum, pow := 0.0, 1.0
	for i := 0; i < n; i++ {
		x := 0.0
		for _, t := range earthTerms[first+i] {
			x += t.A * math.Cos(t.B+t.C*jme) // Eq. 9
		}
		sum += x * pow // Eq. 10–11
		pow *= jme
	}
	return sum / 1e8
}

// nutation returns Δψ and Δε in degrees (report section 3.4).
func nutation(jce float64) (dPsiDeg, dEpsDeg float64) {
	var x [5]float64
	x[0] = 297.85036 + jce*(445267.111480+jce*(-0.0019142+jce/189474)) // Eq. 15: mean elongation of the moon D
	x[1] = 357.52772 + jce*(35999.050340+jce*(-0.0001603-jce/300000))  // Eq. 16: mean anomaly of the sun M
	x[2] = 134.96298 + jce*(477198.867398+jce*(0.0086972+jce/56250))   // Eq. 17: mean anomaly of the moon M'
	x[3] = 93.27191 + jce*(483202.017538+jce*(-0.0036825+jce/327270))  // Eq. 18: moon's argument of latitude F
	x[4] = 125.04452 + jce*(-1934.136261+jce*(0.0020708+jce/450000))   // Eq. 19: longitude of the ascending node Ω
	var sumPsi, sumEps float64
	for _, t := range nutationTerms {
		arg := angle.Rad(x[0]*t.Y[0] + x[1]*t.Y[1] + x[2]*t.Y[2] + x[3]*t.Y[3] + x[4]*t.Y[4])
		s, c := math.Sincos(arg)
		sumPsi += (t.A + t.B*jce) * s // Eq. 20
		sumEps += (t.C + t.D*jce) * c // Eq. 21
	}
	return sumPsi / 36000000, sumEps / 36000000 // Eq. 22–23: 0.0001″ → degrees
}

// Topocentric completes SPA for an observer (report sections 3.11–3.15):
// the fast part, a few dozen floating-point operations. It reads only
// SiderealDeg, RightAscensionDeg, DeclinationDeg, EarthRadiusAU and
// EquationOfTimeMin of g, so a caller may supply those from an
// interpolated ephemeris.
func (g Geocentric) Topocentric(o Observer) Position {
	p := Position{Geocentric: g, DeclinationDeg: g.DeclinationDeg, RightAscensionDeg: g.RightAscensionDeg,
		EquationOfTimeMin: g.EquationOfTimeMin}
	phi := angle.Rad(o.LatDeg)

	// 3.11 Observer local hour angle.
	h := angle.Norm360(g.SiderealDeg + o.LonDeg - g.RightAscensionDeg) // Eq. 32
	p.GeoHourAngleDeg = angle.Wrap180(h)
	hRad := angle.Rad(h)
	sinH, cosH := math.Sincos(hRad)

	// 3.12 Topocentric right ascension and declination.
	xi := angle.Rad(8.794 / (3600 * g.EarthRadiusAU)) // Eq. 33: equatorial horizontal parallax ξ
	u := math.Atan(0.99664719 * math.Tan(phi))        // Eq. 34
	sinU, cosU := math.Sincos(u)
	sinPhi, cosPhi := math.Sincos(phi)
	x := cosU + o.ElevationM/6378140*cosPhi            // Eq. 35
	y := 0.99664719*sinU + o.ElevationM/6378140*sinPhi // Eq. 36
	delta := angle.Rad(g.DeclinationDeg)
	sinDelta, cosDelta := math.Sincos(delta)
	sinXi := math.Sin(xi)
	den := cosDelta - x*sinXi*cosH
	dAlpha := math.Atan2(-x*sinXi*sinH, den) // Eq. 37
	p.ParallaxRADeg = angle.Deg(dAlpha)
	p.TopoRightAscensionDeg = angle.Norm360(g.RightAscensionDeg + p.ParallaxRADeg) // Eq. 38
	deltaP := math.Atan2((sinDelta-y*sinXi)*math.Cos(dAlpha), den)                 // Eq. 39
	p.TopoDeclinationDeg = angle.Deg(deltaP)

	// 3.13 Topocentric local hour angle.
	hp := hRad - dAlpha // Eq. 40
	p.HourAngleDeg = angle.Wrap180(angle.Deg(hp))
	sinHp, cosHp := math.Sincos(hp)
	sinDp, cosDp := math.Sincos(deltaP)

	// 3.14 Topocentric zenith angle.
	e0 := angle.Deg(math.Asin(sinPhi*sinDp + cosPhi*cosDp*cosHp)) // Eq. 41
	p.AltitudeAirlessDeg = e0
	p.RefractionDeg = Refraction(e0, o.PressureHPa, o.TemperatureC) // Eq. 42
	p.AltitudeDeg = e0 + p.RefractionDeg                            // Eq. 43
	p.ZenithDeg = 90 - p.AltitudeDeg                                // Eq. 44

	// 3.15 Topocentric azimuth.
	gamma := angle.Deg(math.Atan2(sinHp, cosHp*sinPhi-math.Tan(deltaP)*cosPhi)) // Eq. 45: astronomers' azimuth Γ (from south)
	p.AzimuthDeg = angle.Norm360(gamma + 180)                                   // Eq. 46: from north, clockwise

	p.SubsolarLatDeg = g.DeclinationDeg
	p.SubsolarLonDeg = angle.Wrap180(g.RightAscensionDeg - g.SiderealDeg) // where Eq. 32 gives H = 0
	// Local apparent solar time is the hour angle of the true sun plus 12 h.
	// It is taken from H rather than from UT + longitude + E because E of
	// Eq. A1 uses the mean sun of TT, which drifts from the UT-based mean
	// sun by ΔT·0.9856°/day (0.003 min at ΔT = 65 s, 2 min at −2000).
	p.ApparentSolarTime = durationOfDay((angle.Norm360(h+180) / 15) * 3600)
	return p
}

// Refraction is SPA's atmospheric refraction correction Δe in degrees for a
// true (airless) topocentric elevation e0 in degrees (Eq. 42). SPA applies
// it only while the sun's upper limb can be at or above the horizon,
// e0 ≥ −(0.26667° + 0.5667°) (report section 3.14); below that it returns 0.
func Refraction(e0Deg, pressureHPa, temperatureC float64) float64 {
	if e0Deg < -(sunRadiusDeg + horizonRefractionDeg) {
		return 0
	}
	return pressureHPa / 1010 * 283 / (273 + temperatureC) *
		1.02 / (60 * math.Tan(angle.Rad(e0Deg+10.3/(e0Deg+5.11)))) // Eq. 42
}

// At computes the Sun's position for an observer at t (UT1) with
// TT = UT1 + deltaTSec: GeocentricAt(t, deltaTSec).Topocentric(o).
func At(t time.Time, o Observer, deltaTSec float64) Position {
	return GeocentricAt(t, deltaTSec).Topocentric(o)
}

// ApparentSolarTime returns local apparent solar time at t (UT) and
// longitude lonDeg (east positive), given the equation of time: the time
// since local apparent midnight, in [0, 24 h). Local mean time is UT plus
// 4 min per degree of east longitude; apparent time adds the equation of
// time (SPA Appendix A.1). Position.ApparentSolarTime, taken from the hour
// angle, agrees with it to within ΔT·0.0000456 min.
func ApparentSolarTime(t time.Time, lonDeg, eotMin float64) time.Duration {
	u := t.UTC()
	sod := float64(u.Hour()*3600+u.Minute()*60+u.Second()) + float64(u.Nanosecond())*1e-9
	return durationOfDay(sod + lonDeg*240 + eotMin*60)
}

// durationOfDay maps seconds to a duration in [0, 24 h).
func durationOfDay(sec float64) time.Duration {
	s := math.Mod(sec, 86400)
	if s < 0 {
		s += 86400
	}
	d := time.Duration(math.Round(s * 1e9))
	if d >= 24*time.Hour {
		d -= 24 * time.Hour
	}
	return d
}
