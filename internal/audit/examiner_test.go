package audit

import (
	"strings"
	"testing"
	"time"

	"github.com/gnomon-forensics/gnomon/solarcheck"
	"github.com/gnomon-forensics/gnomon/solarcheck/sheet"
)

// TestExaminerInput: every sheet row kind reaches solarcheck as its value,
// nothing of the sheet's own layout (file, line) travels except as the
// measurement's Source text, and the place and time overrides come through
// (an RFC 3339 time as an instant, a wall reading as a wall time).
func TestExaminerInput(t *testing.T) {
	src := "photo,object,object_height,shadow_length,shadow_bearing,bearing_ref,bearing_sd,declination,sun_azimuth,sun_altitude,lat,lon,time\n" +
		"a.jpg,pole,2,3.5,47.5,,,,,,,,\n" +
		"a.jpg,fence,,,50,magnetic,1.5,-3.25,,,,,\n" +
		"a.jpg,sun,,,,grid,,,181.25,33,,,\n" +
		"a.jpg,,,,,,,,,,48.8584,2.2945,2026-05-03T14:22:05+02:00\n" +
		"b.jpg,,,,,,,,,,,,2026-05-03 14:22:05\n"
	s, err := sheet.Parse(strings.NewReader(src), "m.csv")
	if err != nil {
		t.Fatal(err)
	}
	rows, err := s.Resolve([]sheet.Name{{ID: "a.jpg", Rel: "a.jpg"}, {ID: "b.jpg", Rel: "b.jpg"}})
	if err != nil {
		t.Fatal(err)
	}

	ms, ov := examinerInput(rows["a.jpg"])
	if len(ms) != 3 {
		t.Fatalf("%d measurements, want 3 (the override row is none): %+v", len(ms), ms)
	}
	pole, fence, sun := ms[0], ms[1], ms[2]
	if pole.Kind != solarcheck.MeasureShadow || pole.ObjectHeight != 2 || pole.ShadowLength != 3.5 || pole.ShadowBearingDeg != 47.5 ||
		pole.North != solarcheck.TrueNorth || pole.BearingSDDeg != sheet.DefaultBearingSDDeg || pole.LengthSDPct != sheet.DefaultLengthSDPct ||
		pole.Source != "m.csv line 2" || pole.Object != "pole" {
		t.Errorf("shadow row: %+v", pole)
	}
	if fence.Kind != solarcheck.MeasureShadowBearing || fence.ShadowBearingDeg != 50 || fence.North != solarcheck.MagneticNorth ||
		fence.BearingSDDeg != 1.5 || fence.DeclinationDeg == nil || *fence.DeclinationDeg != -3.25 {
		t.Errorf("shadow-bearing row: %+v", fence)
	}
	if sun.Kind != solarcheck.MeasureSighting || sun.North != solarcheck.GridNorth ||
		sun.SunAzimuthDeg == nil || *sun.SunAzimuthDeg != 181.25 || sun.SunAltitudeDeg == nil || *sun.SunAltitudeDeg != 33 {
		t.Errorf("sighting row: %+v", sun)
	}
	// 14:22:05+02:00 is 12:22:05 UTC (RFC 3339 §4.2: local minus offset).
	if !ov.HasPlace || ov.LatDeg != 48.8584 || ov.LonDeg != 2.2945 || !ov.Time.HasInstant ||
		!ov.Time.Instant.Equal(time.Date(2026, 5, 3, 12, 22, 5, 0, time.UTC)) || !ov.Wall.IsZero() {
		t.Errorf("override: %+v", ov)
	}

	ms, ov = examinerInput(rows["b.jpg"])
	if len(ms) != 0 || ov.HasPlace || !ov.Time.IsZero() || ov.Wall.String() != "2026-05-03T14:22:05" {
		t.Errorf("wall-time override: %d measurements, %+v", len(ms), ov)
	}
}
