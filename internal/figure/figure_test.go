package figure

import (
	"math"
	"testing"
)

// TestNumber checks the GUM rule (JCGM 100:2008 §7.2.6: the uncertainty to
// at most two significant digits, the value to the same decimal place)
// against the GUM's own worked figures.
func TestNumber(t *testing.T) {
	tests := []struct {
		x, u      float64
		want, unc string
		source    string
	}{
		// GUM §7.2.6: "if y = 10.057 62 Ω with uc(y) = 27 mΩ, y should be
		// rounded to 10.058 Ω" (from memory of the GUM text).
		{10.05762, 0.027, "10.058", "0.027", "GUM §7.2.6 example (from memory)"},
		// GUM §7.2.2: mS = 100.021 47 g with uc = 0.35 mg.
		{100.02147, 0.00035, "100.02147", "0.00035", "GUM §7.2.2 example (from memory)"},
		// Two significant digits of the uncertainty, then the value at that place.
		{2248.46, 347, "2250", "350", "GUM §7.2.6 rule"},
		{-0.04, 0.3, "−0.04", "0.30", "GUM §7.2.6 rule"},
		{-0.004, 0.3, "0.00", "0.30", "GUM §7.2.6 rule; −0.00 is written 0.00 (common practice)"},
		{12.345, 0.0996, "12.35", "0.10", "GUM §7.2.6: 0.0996 to two digits is 0.10"},
		{-3.14159, 0.0012, "−3.1416", "0.0012", "GUM §7.2.6 rule, true minus sign (ISO 80000-1 §7.1.3, common practice)"},
	}
	for _, tc := range tests {
		if got := Number(tc.x, tc.u, 2); got != tc.want {
			t.Errorf("Number(%v, %v) = %q, want %q (%s)", tc.x, tc.u, got, tc.want, tc.source)
		}
		if got := Uncertainty(tc.u); got != tc.unc {
			t.Errorf("Uncertainty(%v) = %q, want %q (%s)", tc.u, got, tc.unc, tc.source)
		}
	}
	if got := Number(1.23456, 0, 2); got != "1.23" {
		t.Errorf("no uncertainty: %q, want the caller's 2 decimals", got)
	}
	if got := Number(math.NaN(), 1, 2); got != "NaN" {
		t.Errorf("NaN: %q", got)
	}
}

// TestSpan: time spans end in the unit their uncertainty supports, and the
// value, low and high ends of an interval share one step, so a table and a
// sentence built from the same figures agree.
func TestSpan(t *testing.T) {
	tests := []struct {
		sec, u float64
		want   string
		source string
	}{
		{2248.46, 0, "+37 min 28 s", "no interval: to the second (common practice)"},
		{2248.46, 45, "+37 min 28 s", "GUM rule: u = 45 s, step 1 s"},
		{2248.46, 360, "+37 min 30 s", "GUM rule: u = 360 s (6 min), step 10 s"},
		{68, 360, "+1 min 10 s", "issue 10: no '+1 min 08 s' on a ±6 min window"},
		{2248.46, 1800, "+37 min", "GUM rule in minutes: u = 30 min, step 1 min"},
		{-11007, 9000, "−3 h 00 min", "GUM rule in minutes: u = 150 min, step 10 min"},
		{3.44, 5, "+3.4 s", "GUM rule: u = 5.0 s, step 0.1 s"},
		{3.444, 0.5, "+3.44 s", "GUM rule: u = 0.50 s, step 0.01 s"},
		{-0.2, 0, "+0 s", "−0 is 0 (common practice)"},
		{90061, 0, "+1 d 1 h 01 min 01 s", "86400 s in a day (ISO 80000-3)"},
		{42904, 40000, "+12 h", "GUM rule in hours: u = 11 h, step 1 h"},
	}
	for _, tc := range tests {
		if got := Span(tc.sec, tc.u); got != tc.want {
			t.Errorf("Span(%v, %v) = %q, want %q (%s)", tc.sec, tc.u, got, tc.want, tc.source)
		}
	}
	// The case of issue 10: the sentence rounded the raw offset, the table
	// the stored one (2248.5 after rounding to 0.1 s): +37 min 28 s against
	// +37 min 29 s. Rounded once by the interval's step, both agree.
	raw := [3]float64{2248.46, 2100.2, 2390.9}
	step := IntervalStep(raw[1], raw[2])
	var stored [3]float64
	for i, v := range raw {
		stored[i] = Round(v, step)
	}
	a1, a2, a3 := Spans(raw[0], raw[1], raw[2])
	b1, b2, b3 := Spans(stored[0], stored[1], stored[2])
	if a1 != b1 || a2 != b2 || a3 != b3 {
		t.Errorf("raw %s (%s to %s) but stored %s (%s to %s)", a1, a2, a3, b1, b2, b3)
	}
}

func TestDegreesAndExposure(t *testing.T) {
	// 3° 41′ 12.48″ W as EXIF rationals 3/1, 41/1, 1248/100 (CIPA DC-008
	// GPSLongitude): 3 + 41/60 + 12.48/3600 = 3.6868 exactly in decimal.
	lon := -(3.0 + 41.0/60 + 12.48/3600)
	tests := []struct {
		got, want, source string
	}{
		{Degrees(lon), "−3.6868", "CIPA DC-008 GPS rationals; arithmetic"},
		{Degrees(44.230501000000004), "44.230501", "float noise of a DMS sum"},
		{Exposure(1.0 / 60), "1/60 s", "EXIF ExposureTime as photographers write it (common practice)"},
		{Exposure(0.004), "1/250 s", "common practice"},
		{Exposure(1.0 / 3), "1/3 s", "common practice"},
		{Exposure(0.8), "0.8 s", "common practice: no fraction for 4/5 s"},
		{Exposure(2), "2 s", "common practice"},
		{Millis(123456789), ".123", "EXIF SubSecTime holds digits of a second; shown to 1 ms at most"},
		{Millis(500000000), ".5", "trailing zeros dropped"},
		{Millis(0), "", "no sub-second"},
	}
	for _, tc := range tests {
		if tc.got != tc.want {
			t.Errorf("got %q, want %q (%s)", tc.got, tc.want, tc.source)
		}
	}
}
