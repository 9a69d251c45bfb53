package solarcheck

import (
	"math"
	"testing"
	"time"

	"github.com/gnomon-forensics/gnomon/solarcheck/geomag"
)

// TestMagneticBearingCarriesModelError: a compass bearing is turned true
// by the WMM2025 declination, and the model's own 1-sigma error
// (WMM2025 Technical Report error model, geomag.DeclinationSDDeg) enters
// the bearing's uncertainty in quadrature (independent errors, GUM §5.1.2);
// a declination the examiner wrote carries none of the model's.
func TestMagneticBearingCarriesModelError(t *testing.T) {
	at := time.Date(2026, 6, 21, 12, 0, 0, 0, time.UTC)
	lat, lon := 44.23, -69.11 // coastal Maine, as in the demo case
	fld, err := geomag.At(lat, lon, 0, at)
	if err != nil {
		t.Fatal(err)
	}
	sdModel := geomag.DeclinationSDDeg(fld.Main.HnT)
	given := -15.0
	rows := []Measurement{
		{Source: "model", Kind: MeasureShadowBearing, Object: "a", ShadowBearingDeg: 200, North: MagneticNorth, BearingSDDeg: 1},
		{Source: "given", Kind: MeasureShadowBearing, Object: "b", ShadowBearingDeg: 200, North: MagneticNorth, BearingSDDeg: 1, DeclinationDeg: &given},
	}
	ds, problems := directions(rows, lat, lon, true, at)
	if len(problems) > 0 || len(ds) != 2 {
		t.Fatalf("directions: %v %v", ds, problems)
	}
	if want := math.Hypot(1, sdModel); math.Abs(ds[0].AzimuthSDDeg-want) > 1e-9 || ds[0].NorthCorrectionDeg != fld.Main.DeclinationDeg || ds[0].NorthCorrectionSDDeg != sdModel {
		t.Errorf("modelled declination: σ %.4f° (want %.4f°), correction %.3f° ± %.3f° (want %.3f° ± %.3f°)",
			ds[0].AzimuthSDDeg, want, ds[0].NorthCorrectionDeg, ds[0].NorthCorrectionSDDeg, fld.Main.DeclinationDeg, sdModel)
	}
	if ds[1].AzimuthSDDeg != 1 || ds[1].NorthCorrectionDeg != given || ds[1].NorthCorrectionSDDeg != 0 {
		t.Errorf("given declination: σ %v, correction %v ± %v", ds[1].AzimuthSDDeg, ds[1].NorthCorrectionDeg, ds[1].NorthCorrectionSDDeg)
	}
	if ds[0].Sheet.ShadowBearingDeg != 200 || ds[0].Sheet.North != MagneticNorth {
		t.Errorf("the sheet row is not kept as written: %+v", ds[0].Sheet)
	}
}
