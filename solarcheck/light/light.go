// Package light implements check 4: does a photo's exposure fit the natural
// light expected for the sun's altitude at the claimed moment?
//
// Method:
//
//  1. Exposure value at ISO 100 from the f-number N, exposure time t (s) and
//     ISO speed S (APEX; ISO 2720:1974 exposure equation):
//     EV100 = log2(N²/t) − log2(S/100), plus any exposure compensation the
//     camera applied (a +1 EV bias means the metered scene was 1 EV brighter
//     than the settings say).
//  2. Scene luminance from the reflected-light meter calibration constant
//     K = 12.5 cd·s/m² (ISO 2720; the value camera makers commonly use):
//     L = K·2^EV100 / 100 cd/m².
//  3. Illuminance implied for an average scene of reflectance ρ = 0.18
//     treated as a Lambertian surface: L = ρ·E/π, so E = π·L/ρ lux.
//  4. Expected horizontal illuminance from sun and sky under a clear sky:
//     the fit of U.S. Naval Observatory Circular 171 (Janiczek & DeYoung
//     1987), log10 E = l0 + l1·x + l2·x² + l3·x³ with x = altitude/90°, six
//     altitude ranges from −18° to 90°. The coefficients are checked against
//     the table reprinted in Vallado, Fundamentals of Astrodynamics and
//     Applications (2001), Eq. 5-9 (not against the circular itself), for
//     continuity at the range joins and against handbook figures (see the
//     tests). Clouds divide the clear-sky value by about 3 (average
//     overcast) to 10 (dark overcast), the factor range the circular
//     recommends (from memory).
//  5. The exposure agrees when the implied illuminance lies within the
//     natural range [clear/OvercastFactor, max(clear, MoonLux)] widened by
//     ToleranceEV stops each way: automatic exposure, scene reflectance and
//     metering pattern easily move a photo 2–3 EV from the average.
//
// Limits: the check cannot tell daylight from artificial light, an indoor
// scene from a dark time of day, or a camera at the end of its exposure range
// (which under-exposes and so implies more light than there was). It is
// skipped when the flash fired or when the exposure or the sun is unknown,
// and its sentence is always a hint, never proof. The moon is modelled only
// as an upper bound of MoonLux (full moon high in a clear sky: about
// 0.1–0.3 lux, common knowledge).
package light

import (
	"strconv"

	"errors"
	"fmt"
	"github.com/gnomon-forensics/gnomon/internal/figure"
	"math"
)

// K is the reflected-light meter calibration constant of ISO 2720, in
// cd·s/m², the value in common use by camera makers.
const K = 12.5

// Reflectance is the assumed average scene reflectance ("18 % grey").
const Reflectance = 0.18

// ErrBadExposure marks missing or impossible exposure settings.
var ErrBadExposure = errors.New("exposure settings missing or not positive")

// Exposure holds a photo's exposure settings as the EXIF tags give them.
type Exposure struct {
	FNumber         float64 // N, > 0
	ExposureTimeSec float64 // t, > 0
	ISO             float64 // S, > 0 (PhotographicSensitivity)
	BiasEV          float64 // ExposureBiasValue, EV; 0 when absent
}

// EV100 returns the exposure value referred to ISO 100 (APEX):
// log2(N²/t) − log2(S/100) + bias.
func EV100(e Exposure) (float64, error) {
	if !(e.FNumber > 0) || !(e.ExposureTimeSec > 0) || !(e.ISO > 0) ||
		math.IsInf(e.FNumber, 0) || math.IsInf(e.ISO, 0) || math.IsNaN(e.BiasEV) || math.IsInf(e.BiasEV, 0) {
		return math.NaN(), fmt.Errorf("%w: N=%v t=%v s ISO=%v", ErrBadExposure, e.FNumber, e.ExposureTimeSec, e.ISO)
	}
	return math.Log2(e.FNumber*e.FNumber/e.ExposureTimeSec) - math.Log2(e.ISO/100) + e.BiasEV, nil
}

// Luminance is the scene luminance in cd/m² that a meter calibrated with K
// reads at ev100: L = K·2^EV100/100 (ISO 2720 exposure equation with S = 100).
func Luminance(ev100 float64) float64 { return K * math.Exp2(ev100) / 100 }

// ImpliedLux is the illuminance in lux on an average scene (reflectance
// 0.18, Lambertian: L = ρE/π) that reads as ev100.
func ImpliedLux(ev100 float64) float64 { return math.Pi * Luminance(ev100) / Reflectance }

// circ171 holds the clear-sky fit for the sun (sun + sky, horizontal
// plane): for altitude above Min, log10 E[lux] = L0 + L1·x + L2·x² + L3·x³,
// x = altitude/90. USNO Circular 171 (Janiczek & DeYoung 1987), as tabled in
// Vallado (2001) Eq. 5-9.
var circ171 = []struct {
	MinDeg         float64
	L0, L1, L2, L3 float64
}{
	{20, 3.74, 3.97, -4.07, 1.47},
	{5, 3.05, 13.28, -45.98, 64.33},
	{-0.8, 2.88, 22.26, -207.64, 1034.30},
	{-5, 2.88, 21.81, -258.11, -858.36},
	{-12, 2.70, 12.17, -431.69, -1899.83},
	{-18, 13.84, 262.72, 1447.42, 2797.93},
}

// MinModelAltitudeDeg is the lowest sun altitude the clear-sky fit covers;
// below it the sun adds nothing measurable to the night sky.
const MinModelAltitudeDeg = -18.0

// ClearSkyLux is the horizontal illuminance from sun and sky under a clear
// sky for a sun at altitudeDeg (USNO Circular 171 fit, see the package doc).
// Below −18° it returns the value at −18° (the sun's share is then nil and
// the sky's own glow remains, about 0.001 lux). Altitudes above 90° are
// clamped to 90°.
func ClearSkyLux(altitudeDeg float64) float64 {
	h := math.Min(math.Max(altitudeDeg, MinModelAltitudeDeg), 90)
	x := h / 90
	for _, c := range circ171 {
		if h > c.MinDeg || c.MinDeg == MinModelAltitudeDeg {
			return math.Pow(10, c.L0+x*(c.L1+x*(c.L2+x*c.L3)))
		}
	}
	panic("unreachable")
}

// Band names the light of a sun altitude.
type Band int

// Bands of natural light, by the sun's altitude h (almanac conventions).
const (
	Unknown      Band = iota
	Night             // h < −18°
	Astronomical      // −18° ≤ h < −12°: astronomical twilight
	Nautical          // −12° ≤ h < −6°: nautical twilight
	Civil             // −6° ≤ h < −0.833°: civil twilight
	Daylight          // h ≥ −0.833°: the sun's upper limb is above the horizon (standard refraction)
)

func (b Band) String() string {
	return [...]string{"unknown", "night", "astronomical twilight", "nautical twilight", "civil twilight", "daylight"}[b]
}

// BandOf returns the band of a sun altitude in degrees.
func BandOf(altitudeDeg float64) Band {
	switch {
	case math.IsNaN(altitudeDeg):
		return Unknown
	case altitudeDeg < -18:
		return Night
	case altitudeDeg < -12:
		return Astronomical
	case altitudeDeg < -6:
		return Nautical
	case altitudeDeg < -0.833:
		return Civil
	}
	return Daylight
}

// equivalentAltitude inverts ClearSkyLux (monotonic on [−18°, 90°]) by
// bisection: the sun altitude whose clear sky gives lux.
func equivalentAltitude(lux float64) float64 {
	lo, hi := MinModelAltitudeDeg, 90.0
	if lux <= ClearSkyLux(lo) {
		return math.Inf(-1)
	}
	if lux >= ClearSkyLux(hi) {
		return hi
	}
	for i := 0; i < 60; i++ {
		mid := (lo + hi) / 2
		if ClearSkyLux(mid) < lux {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}

// Flash is the state of the flash from the EXIF Flash tag.
type Flash int

// Flash states.
const (
	FlashUnknown Flash = iota
	FlashFired
	FlashNotFired
)

// Input is what Check needs about one photo.
type Input struct {
	Exposure Exposure
	Flash    Flash
	// SunAltitudeDeg is the sun's apparent altitude at the claimed moment
	// and place; nil when unknown (a pointer, so that a forgotten field is
	// not read as a sun on the horizon).
	SunAltitudeDeg *float64
}

// Options tune Check; zero fields take the defaults named.
type Options struct {
	ToleranceEV    float64 // stops allowed each way beyond the natural range; default 3
	OvercastFactor float64 // clear-sky value divided by this under dark overcast; default 10
	MoonLux        float64 // brightest natural night light (full moon); default 0.3
}

func (o Options) withDefaults() Options {
	if o.ToleranceEV <= 0 {
		o.ToleranceEV = 3
	}
	if o.OvercastFactor <= 0 {
		o.OvercastFactor = 10
	}
	if o.MoonLux <= 0 {
		o.MoonLux = 0.3
	}
	return o
}

// Status is the outcome of the check.
type Status string

// Statuses.
const (
	Agree    Status = "agree"
	Disagree Status = "disagree"
	Skipped  Status = "unknown" // not checked: flash, or inputs missing
)

// Result is the check's finding for one photo. Lux figures are horizontal
// illuminance.
type Result struct {
	Status              Status
	ExposureEV100       float64
	ImpliedLux          float64
	ExpectedLuxClear    float64
	ExpectedLuxOvercast float64 // clear / OvercastFactor
	Band                Band    // of the sun's altitude at the claimed moment
	// ImpliedBand is the band of the sun altitude whose clear sky would give
	// ImpliedLux (Daylight when brighter than any sky).
	ImpliedBand Band
	// OffEV is how many stops the implied light lies outside the natural
	// range (positive: brighter; negative: darker; 0 inside).
	OffEV    float64
	Sentence string
}

// Check compares the photo's exposure with the natural light expected at
// the sun's altitude (see the package doc).
func Check(in Input, opt Options) Result {
	opt = opt.withDefaults()
	alt := math.NaN()
	if in.SunAltitudeDeg != nil {
		alt = *in.SunAltitudeDeg
	}
	r := Result{Status: Skipped, Band: BandOf(alt), ExposureEV100: math.NaN(),
		ImpliedLux: math.NaN(), ExpectedLuxClear: math.NaN(), ExpectedLuxOvercast: math.NaN()}
	if in.Flash == FlashFired {
		r.Sentence = "Light not checked: the flash fired, so the exposure says nothing about daylight."
		return r
	}
	ev, err := EV100(in.Exposure)
	if err != nil {
		r.Sentence = "Light not checked: the exposure settings (f-number, exposure time, ISO) are incomplete."
		return r
	}
	r.ExposureEV100 = ev
	r.ImpliedLux = ImpliedLux(ev)
	r.ImpliedBand = BandOf(equivalentAltitude(r.ImpliedLux))
	if math.IsNaN(alt) || math.IsInf(alt, 0) {
		r.Sentence = "Light not checked: the sun's position at the claimed moment is unknown."
		return r
	}
	r.ExpectedLuxClear = ClearSkyLux(alt)
	r.ExpectedLuxOvercast = r.ExpectedLuxClear / opt.OvercastFactor
	lo := r.ExpectedLuxOvercast
	hi := math.Max(r.ExpectedLuxClear, opt.MoonLux)
	switch {
	case r.ImpliedLux > hi*math.Exp2(opt.ToleranceEV):
		r.OffEV = math.Log2(r.ImpliedLux / hi)
	case r.ImpliedLux < lo*math.Exp2(-opt.ToleranceEV):
		r.OffEV = math.Log2(r.ImpliedLux / lo)
	}
	altText := fmt.Sprintf("%.1f°", alt)
	// The sentence names the figure the ratio was tested against: the
	// brightest natural light (a clear sky, or the full moon when that is
	// brighter) above, dark overcast below.
	settings := fmt.Sprintf("%s at f/%s, ISO %s: EV100 %.1f", figure.Exposure(in.Exposure.ExposureTimeSec),
		strconv.FormatFloat(in.Exposure.FNumber, 'f', -1, 64), strconv.FormatFloat(in.Exposure.ISO, 'f', -1, 64), ev)
	brightest := fmt.Sprintf("a clear sky with the sun at %s (%s, about %s)", altText, r.Band, luxText(r.ExpectedLuxClear))
	if opt.MoonLux > r.ExpectedLuxClear {
		brightest = fmt.Sprintf("the brightest moonlit sky (about %s; the sun at %s, %s, gives about %s)", luxText(opt.MoonLux), altText, r.Band, luxText(r.ExpectedLuxClear))
	}
	switch {
	case r.OffEV > 0:
		r.Status = Disagree
		r.Sentence = fmt.Sprintf("Hint, not proof: the exposure (%s) implies about %s, %.0f stops above %s; artificial light, a camera at the end of its exposure range, or a different time of day could explain it.",
			settings, luxText(r.ImpliedLux), r.OffEV, brightest)
	case r.OffEV < 0:
		r.Status = Disagree
		r.Sentence = fmt.Sprintf("Hint, not proof: the exposure (%s) implies about %s, %.0f stops below dark overcast with the sun at %s (%s, about %s); an indoor or shaded scene, or a different time of day could explain it.",
			settings, luxText(r.ImpliedLux), -r.OffEV, altText, r.Band, luxText(r.ExpectedLuxOvercast))
	default:
		r.Status = Agree
		r.Sentence = fmt.Sprintf("Hint, not proof: the exposure (%s, about %s) fits the natural light expected with the sun at %s (%s, clear sky about %s) within %.0f stops.",
			settings, luxText(r.ImpliedLux), altText, r.Band, luxText(r.ExpectedLuxClear), opt.ToleranceEV)
	}
	return r
}

// luxText rounds a lux figure to two significant digits: the model is no
// better than that.
func luxText(lux float64) string {
	if lux <= 0 || math.IsNaN(lux) {
		return "0 lux"
	}
	e := math.Floor(math.Log10(lux)) - 1
	v := math.Round(lux/math.Pow(10, e)) * math.Pow(10, e)
	if e >= 0 {
		return fmt.Sprintf("%.0f lux", v)
	}
	return fmt.Sprintf("%.*f lux", int(-e), v)
}
