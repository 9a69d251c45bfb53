package main

import (
	"encoding/json"
	"math"
	"strings"
	"testing"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/sphere"
	"github.com/gnomon-forensics/gnomon/solarcheck/spa"
)

func TestWhereExitCodes(t *testing.T) {
	ok := []string{"where", "--time", "2024-06-03T09:17:00Z", "--azimuth", "117.4", "--altitude", "50"}
	with := func(extra ...string) []string { return append(append([]string{}, ok...), extra...) }
	tests := []struct {
		name   string
		args   []string
		want   int
		reason string
	}{
		{"help", []string{"where", "-h"}, exitOK, ""},
		{"good", with(), exitOK, ""},
		{"good json", with("--json", "--azimuth-sd", "0.5", "--altitude-sd", "0.2"), exitOK, ""},
		{"offset time", []string{"where", "--time", "2024-06-03T11:17:00+02:00", "--azimuth", "117.4", "--altitude", "50"}, exitOK, ""},
		{"missing time", []string{"where", "--azimuth", "1", "--altitude", "50"}, exitUsage, "--time is required"},
		{"missing altitude", []string{"where", "--time", "2024-06-03T09:17:00Z", "--azimuth", "1"}, exitUsage, "--altitude is required"},
		{"unparseable time", []string{"where", "--time", "June 3rd", "--azimuth", "1", "--altitude", "50"}, exitUsage, "is not RFC 3339"},
		{"time without offset", []string{"where", "--time", "2024-06-03T09:17:00", "--azimuth", "1", "--altitude", "50"}, exitUsage, "is not RFC 3339"},
		{"altitude beyond 90", with("--altitude", "91"), exitUsage, "--altitude 91 is outside"},
		{"sun below horizon", with("--altitude", "-10"), exitUsage, "--altitude -10 is outside"},
		{"negative sd", with("--altitude-sd", "-1"), exitUsage, "--altitude-sd -1 must be"},
		{"azimuth beyond 360", with("--azimuth", "400"), exitUsage, "--azimuth 400 is outside 0..360"},
		{"negative azimuth", with("--azimuth", "-10"), exitUsage, "--azimuth -10 is outside 0..360"},
		{"azimuth not a number", with("--azimuth", "NaN"), exitUsage, "--azimuth NaN is outside"},
		{"azimuth sd beyond a half turn", with("--azimuth-sd", "200"), exitUsage, "--azimuth-sd 200 must be"},
		{"altitude sd beyond 90", with("--altitude-sd", "95"), exitUsage, "--altitude-sd 95 must be"},
		{"unknown flag", with("--lat", "3"), exitUsage, "flag provided but not defined"},
	}
	for _, tc := range tests {
		code, _, stderr := captureRun(tc.args...)
		if code != tc.want {
			t.Errorf("%s: exit %d, want %d; stderr:\n%s", tc.name, code, tc.want, stderr)
			continue
		}
		if tc.want == exitUsage {
			checkUsageError(t, tc.name, "where", stderr, tc.reason)
		}
	}
}

func TestWhereJSON(t *testing.T) {
	tests := []struct {
		source   string
		lat, lon float64
		at       time.Time
		alt      float64 // if non-zero, the measured altitude instead of spa's
	}{
		{srcSPART, 48.85, 2.35, time.Date(2024, 6, 3, 9, 17, 0, 0, time.UTC), 0},
		{srcSPART, -33.87, 151.21, time.Date(2024, 8, 14, 2, 40, 0, 0, time.UTC), 0},
		{srcSPART, 10, -75, time.Date(2024, 6, 21, 14, 0, 0, 0, time.UTC), 0},
		{srcSPART + "; common knowledge: midnight sun at 78° N in June", 78, 15, time.Date(2024, 6, 3, 23, 17, 0, 0, time.UTC), 0},
	}
	for _, tc := range tests {
		p := spa.At(tc.at, spa.NewObserver(tc.lat, tc.lon, 0), spa.DeltaT(tc.at))
		code, out, stderr := captureRun("where", "--time", tc.at.Format(time.RFC3339), "--azimuth", f6(p.AzimuthDeg),
			"--altitude", f6(p.AltitudeDeg), "--json")
		if code != exitOK {
			t.Fatalf("%s: exit %d: %s", tc.source, code, stderr)
		}
		var doc struct {
			Lat          *float64 `json:"lat"`
			Lon          *float64 `json:"lon"`
			RadiusKm     *float64 `json:"radius_km"`
			SemiMajorKm  *float64 `json:"semi_major_km"`
			SemiMinorKm  *float64 `json:"semi_minor_km"`
			MajorAxisDeg *float64 `json:"major_axis_deg"`
			Alternatives []struct {
				Lat, Lon float64
				RadiusKm float64 `json:"radius_km"`
			} `json:"alternatives"`
		}
		if err := json.Unmarshal([]byte(out), &doc); err != nil || doc.Lat == nil || doc.Lon == nil || doc.RadiusKm == nil {
			t.Fatalf("%s: want {lat, lon, radius_km}: %v\n%s", tc.source, err, out)
		}
		best := sphere.DistanceKm(*doc.Lat, *doc.Lon, tc.lat, tc.lon)
		for _, a := range doc.Alternatives {
			best = math.Min(best, sphere.DistanceKm(a.Lat, a.Lon, tc.lat, tc.lon))
		}
		// Output is rounded to 0.0001° (11 m).
		if best > 0.05 {
			t.Errorf("%s: nearest place %.3f km from the truth:\n%s", tc.source, best, out)
		}
		// Defaults 1° and 1°: at least 111 km × √5.991 ≈ 272 km (5.991: χ²
		// 95 % point for 2 dof, NIST/SEMATECH e-Handbook 1.3.6.7.4).
		if *doc.RadiusKm < 270 || *doc.RadiusKm > 5000 {
			t.Errorf("%s: radius %.1f km", tc.source, *doc.RadiusKm)
		}
		// The ellipse: the radius encloses it (√5.991 × the major semi-axis,
		// to the printed rounding); the minor axis is the smaller; the
		// bearing of an axis is a half turn at most.
		if doc.SemiMajorKm == nil || doc.SemiMinorKm == nil || doc.MajorAxisDeg == nil ||
			math.Abs(*doc.RadiusKm-math.Sqrt(5.991)**doc.SemiMajorKm) > 0.2 || *doc.SemiMinorKm > *doc.SemiMajorKm ||
			*doc.MajorAxisDeg < 0 || *doc.MajorAxisDeg > 180 {
			t.Errorf("%s: error ellipse missing or inconsistent:\n%s", tc.source, out)
		}
	}
}

// common knowledge: the sun is overhead at the subsolar point.
func TestWhereZenithCLI(t *testing.T) {
	at := time.Date(2024, 6, 21, 12, 0, 0, 0, time.UTC)
	p := spa.At(at, spa.Observer{}, spa.DeltaT(at))
	code, out, stderr := captureRun("where", "--time", at.Format(time.RFC3339), "--azimuth", "0", "--altitude", "90", "--json")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var doc struct{ Lat, Lon float64 }
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	if d := sphere.DistanceKm(doc.Lat, doc.Lon, p.SubsolarLatDeg, p.SubsolarLonDeg); d > 0.5 {
		t.Errorf("common knowledge: overhead sun: %.4f, %.4f is %.2f km from the subsolar point %.4f, %.4f",
			doc.Lat, doc.Lon, d, p.SubsolarLatDeg, p.SubsolarLonDeg)
	}
}

func TestWhereTable(t *testing.T) {
	code, out, stderr := captureRun("where", "--time", "2024-06-03T23:17:00Z", "--azimuth", "4.3859", "--altitude", "10.58")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	for _, want := range []string{"lat °", "lon °", "radius km", "subsolar point", "More than one place fits"} {
		if !strings.Contains(out, want) {
			t.Errorf("table lacks %q:\n%s", want, out)
		}
	}
}

// In June (declination +23.4°) the sun is due east only at altitudes of at
// least 23.4° (sin h = sin δ / sin φ), so east at 5° fits nowhere.
func TestWhereNothingFits(t *testing.T) {
	const source = "spherical astronomy: on the prime vertical sin h = sin δ / sin φ"
	code, out, stderr := captureRun("where", "--time", "2024-06-21T12:00:00Z", "--azimuth", "90", "--altitude", "5", "--json")
	if code != exitFailure || out != "" || !strings.Contains(stderr, "no place") {
		t.Errorf("%s: exit %d, stdout %q, stderr %q", source, code, out, stderr)
	}
}

// TestPoleWarnings: at a pole every direction is south (north), so an
// azimuth means nothing there (common knowledge). when --lat 90 with an
// azimuth warns on stderr and in JSON; a place that is not at a pole does not.
func TestPoleWarnings(t *testing.T) {
	const source = "common knowledge: at the North Pole every direction is south"
	code, out, stderr := captureRun("when", "--lat", "90", "--lon", "0", "--date", "2024-06-21", "--azimuth", "180", "--json")
	if code != exitOK || !strings.Contains(stderr, "warning: the place is at the North Pole") || !strings.Contains(out, `"warnings"`) {
		t.Errorf("%s: exit %d, stderr %q\n%s", source, code, stderr, out)
	}
	code, out, stderr = captureRun("when", "--lat", "-90", "--lon", "0", "--date", "2024-12-21", "--azimuth", "0")
	if code != exitOK || !strings.Contains(stderr, "South Pole") {
		t.Errorf("%s: exit %d, stderr %q\n%s", source, code, stderr, out)
	}
	code, out, stderr = captureRun("when", "--lat", "89.9", "--lon", "0", "--date", "2024-06-21", "--azimuth", "180", "--json")
	if code != exitOK || strings.Contains(stderr, "warning") || strings.Contains(out, `"warnings"`) {
		t.Errorf("no warning away from the pole: exit %d, stderr %q", code, stderr)
	}
	if w := poleWarning(89.99995); !strings.Contains(w, "North Pole") {
		t.Errorf("a fix 5 m from the pole: %q", w)
	}
}
