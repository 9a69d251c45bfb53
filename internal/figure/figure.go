// Package figure rounds every figure a person reads (report tables, charts,
// sentences, the command line) by one rule, so that a table and a sentence
// about the same quantity always show the same digits. The rule is that of
// the GUM (JCGM 100:2008, §7.2.6): the uncertainty is stated with at most
// two significant digits and the value is rounded to the same decimal
// place. A figure with no stated uncertainty keeps a precision chosen by
// its caller (a second for times, for instance).
package figure

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Minus is the true minus sign used in text a person reads.
const Minus = "−"

// Step returns the rounding step for a figure whose uncertainty (95 %
// half-width, or any stated uncertainty) is u: the power of ten of the
// second significant digit of u, after u itself is rounded to two digits
// (so 0.0996 has step 0.01, like 0.10). It returns 0 when u is not a
// positive finite number: no step can be derived.
func Step(u float64) float64 {
	if !(u > 0) || math.IsInf(u, 0) {
		return 0
	}
	e := math.Floor(math.Log10(u))
	step := math.Pow(10, e-1)
	if math.Round(u/step) >= 100 { // 99.6 rounds to 100: three digits, one decade up
		step *= 10
	}
	return step
}

// Decimals is the number of decimal places that show a multiple of step;
// 0 for a step of 1 or more (and for 0).
func Decimals(step float64) int {
	if !(step > 0) || step >= 1 {
		return 0
	}
	return int(math.Round(-math.Log10(step)))
}

// Round returns x rounded to a multiple of step, halves away from zero,
// without binary noise in the result (0.1 steps give 0.3, not
// 0.30000000000000004). A step of 0 leaves x as it is.
func Round(x, step float64) float64 {
	if !(step > 0) || math.IsNaN(x) || math.IsInf(x, 0) {
		return x
	}
	if step >= 1 {
		return math.Round(x/step) * step
	}
	d := Decimals(step)
	p := math.Pow(10, float64(d))
	r, err := strconv.ParseFloat(strconv.FormatFloat(math.Round(x*p)/p, 'f', d, 64), 64)
	if err != nil {
		return x
	}
	return r
}

// Number formats x rounded to the step its uncertainty u supports, with a
// true minus sign: Number(2248.46, 37) is "2248", Number(0.1234, 0.021) is
// "0.123". When u gives no step, def decimals are used.
func Number(x, u float64, def int) string { return sign(Decimal(x, u, def)) }

// Decimal is Number with an ASCII hyphen-minus, for machine-readable text
// (report.csv).
func Decimal(x, u float64, def int) string {
	if s, ok := nonFinite(x); ok {
		return s
	}
	step := Step(u)
	d := def
	if step > 0 {
		d = Decimals(step)
		x = Round(x, step)
	}
	s := strconv.FormatFloat(x, 'f', d, 64)
	if strings.HasPrefix(s, "-") && strings.Trim(s[1:], "0.") == "" {
		s = s[1:] // -0 is 0
	}
	return s
}

// Uncertainty formats u with two significant digits (GUM §7.2.6):
// Uncertainty(0.0347) is "0.035", Uncertainty(347) is "350".
func Uncertainty(u float64) string {
	if s, ok := nonFinite(u); ok {
		return s
	}
	step := Step(u)
	if step == 0 {
		return strconv.FormatFloat(u, 'g', 2, 64)
	}
	return strconv.FormatFloat(Round(u, step), 'f', Decimals(step), 64)
}

// SpanStep is the rounding step, in seconds, of a time span with
// uncertainty u seconds: the GUM rule applied in the unit the span ends
// with, so that a span never ends in a unit finer than its uncertainty
// supports: seconds (and tenths) while u is under 10 min, whole minutes
// (or tens of minutes) while u is under 10 h, whole hours beyond. With no
// usable u the step is one second.
func SpanStep(u float64) float64 {
	switch {
	case Step(u) == 0:
		return 1
	case u < 600:
		return Step(u)
	case u < 36000:
		return Step(u/60) * 60
	}
	return Step(u/3600) * 3600
}

// Span formats a signed time span in seconds, rounded to SpanStep(u):
// "+37 min 29 s", "−2 h 05 min", "+3.4 s", "+1 d 2 h 05 min 09 s". The sign
// is always shown (a span here is an offset: claimed minus evidence).
func Span(sec, u float64) string {
	return spanAt(sec, SpanStep(u))
}

// Spans formats a value and its 95 % interval with one step, taken from
// the interval's half-width, so that the three figures agree.
func Spans(sec, low, high float64) (string, string, string) {
	step := SpanStep((high - low) / 2)
	return spanAt(sec, step), spanAt(low, step), spanAt(high, step)
}

// IntervalStep is the step Spans uses for an interval, for a caller that
// stores the rounded figures (report.json), so that a reader rounding them
// again by the same rule gets the same digits.
func IntervalStep(low, high float64) float64 { return SpanStep((high - low) / 2) }

func spanAt(sec, step float64) string {
	if s, ok := nonFinite(sec); ok {
		return s
	}
	sgn := "+"
	if sec = Round(sec, step); sec < 0 {
		sgn, sec = Minus, -sec
	}
	d := Decimals(step)
	whole := math.Floor(sec)
	frac := sec - whole
	t := int64(whole)
	days, h, m, s := t/86400, t%86400/3600, t%3600/60, t%60
	var parts []string
	add := func(n int64, unit string, pad bool) {
		if pad && len(parts) > 0 {
			parts = append(parts, fmt.Sprintf("%02d %s", n, unit))
		} else {
			parts = append(parts, fmt.Sprintf("%d %s", n, unit))
		}
	}
	if days > 0 {
		add(days, "d", false)
	}
	if days > 0 || h > 0 {
		add(h, "h", false)
	}
	if step < 3600 && (len(parts) > 0 || m > 0) {
		add(m, "min", true)
	}
	if step < 60 {
		sec := strconv.FormatFloat(float64(s)+frac, 'f', d, 64)
		if len(parts) > 0 && s < 10 {
			sec = "0" + sec
		}
		parts = append(parts, sec+" s")
	}
	return sgn + strings.Join(parts, " ")
}

// Degrees formats an angle or coordinate in degrees that was computed from
// a file's rationals, without the binary noise of the sum (−3.6868, not
// −3.6868000000000003): rounded to 1e-9° (0.1 mm on the ground), finer than
// any GPS rational in practice, then written in its shortest form.
func Degrees(x float64) string {
	if s, ok := nonFinite(x); ok {
		return s
	}
	return sign(strconv.FormatFloat(Round(x, 1e-9), 'f', -1, 64))
}

// Exposure formats an exposure time in seconds as photographers write it:
// "1/60 s" for 1/60, "1/3 s", "0.8 s", "2 s", "2.5 s". Times under 1 s whose
// reciprocal is within 1 % of a whole number are written as that fraction,
// which is how cameras store them (EXIF ExposureTime is a rational).
func Exposure(sec float64) string {
	if s, ok := nonFinite(sec); ok {
		return s
	}
	if sec > 0 && sec < 1 {
		if n := math.Round(1 / sec); math.Abs(1/sec-n) <= 0.01*n {
			return fmt.Sprintf("1/%d s", int64(n))
		}
	}
	return strconv.FormatFloat(Round(sec, 0.001), 'f', -1, 64) + " s"
}

// Millis formats a fraction of a second for a time of day to at most
// milliseconds, trailing zeros dropped: ".5", ".125", "" for none.
// A clock reading is never stated finer than a millisecond: no camera
// or GPS tag in the EXIF standard records more.
func Millis(nanos int) string {
	ms := int(math.Round(float64(nanos) / 1e6))
	if ms <= 0 || ms >= 1000 {
		return ""
	}
	return strings.TrimRight(fmt.Sprintf(".%03d", ms), "0")
}

func sign(s string) string {
	if strings.HasPrefix(s, "-") {
		if strings.Trim(s[1:], "0.") == "" {
			return s[1:] // −0 is 0
		}
		return Minus + s[1:]
	}
	return s
}

func nonFinite(x float64) (string, bool) {
	switch {
	case math.IsNaN(x):
		return "NaN", true
	case math.IsInf(x, 1):
		return "+Inf", true
	case math.IsInf(x, -1):
		return "-Inf", true
	}
	return "", false
}
