package democase

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"strconv"

	"github.com/gnomon-forensics/gnomon/internal/angle"
	"github.com/gnomon-forensics/gnomon/internal/exifwrite"
)

// sheetColumns is the header of measurements.csv, in the order of the
// sheet package's column list.
var sheetColumns = []string{"photo", "object", "object_height", "shadow_length", "shadow_bearing",
	"bearing_ref", "bearing_sd", "length_sd_pct", "slope", "slope_toward", "sun_azimuth",
	"sun_altitude", "declination", "lat", "lon", "time", "note"}

// Pixel margins inside which a shadow counts as measurable (the bottom one
// keeps clear of the caption).
const (
	marginPx       = 10
	marginBottomPx = 26
	minShadowPx    = 14
)

// measure returns the sheet rows an examiner could take from the picture:
// every object whose base and shadow tip are on the quay and in the frame,
// up to the camera's limit, with seeded measurement errors.
func measure(ps pose, sun sunState, spec cameraSpec, declDeg float64, r *rand.Rand) []Shadow {
	cam := newCamera(ps, ImageWidth, ImageHeight)
	sx, sy, perH := sun.shadowDir()
	trueBearing := angle.Norm360(sun.azimuthDeg + 180)
	inFrame := func(u, v float64) bool {
		return u >= marginPx && u <= ImageWidth-marginPx && v >= marginPx && v <= ImageHeight-marginBottomPx
	}
	var out []Shadow
	for _, o := range sceneObjects {
		if len(out) == spec.maxObjects {
			break
		}
		l := o.HeightM * perH
		tx, ty := o.X+l*sx, o.Y+l*sy
		if ty > WaterLineM {
			continue // the tip falls on the water
		}
		ub, vb, _, okb := cam.project(vec3{o.X, o.Y, 0})
		ut, vt, _, okt := cam.project(vec3{tx, ty, 0})
		if !okb || !okt || !inFrame(ub, vb) || !inFrame(ut, vt) || math.Hypot(ut-ub, vt-vb) < minShadowPx {
			continue
		}
		// A shadow that runs behind its own object in the picture is hidden
		// by it: skip it when the two image directions are within 30°.
		uu, vu, _, oku := cam.project(vec3{o.X, o.Y, o.HeightM})
		if oku {
			ax, ay, bx, by := ut-ub, vt-vb, uu-ub, vu-vb
			if cos := (ax*bx + ay*by) / (math.Hypot(ax, ay) * math.Hypot(bx, by)); cos > math.Cos(angle.Rad(30)) {
				continue
			}
		}
		s := Shadow{Object: o.Name, HeightM: o.HeightM, TrueLengthM: l, TrueBearingDeg: trueBearing, BearingRef: "true"}
		measured := angle.Norm360(trueBearing + normal(r)*BearingSDDeg)
		s.SheetLengthM = round(l*(1+normal(r)*LengthSDPct/100), 2)
		if spec.magnetic {
			// A compass reads magnetic bearings: true = magnetic + declination.
			s.BearingRef, s.DeclinationDeg = "magnetic", declDeg
			measured = angle.Norm360(measured - declDeg)
		}
		s.SheetBearing = angle.Norm360(round(measured, 1))
		out = append(out, s)
	}
	return out
}

func round(v float64, places int) float64 {
	k := math.Pow(10, float64(places))
	return math.Round(v*k) / k
}

func ftoa(v float64, places int) string { return strconv.FormatFloat(v, 'f', places, 64) }

// sheetRows turns a photo's measurements into CSV records.
func sheetRows(p Photo, spec cameraSpec, sh shot) [][]string {
	lat, lon := ftoa(PlaceLatDeg, 4), ftoa(PlaceLonDeg, 4)
	if spec.HasGPS {
		lat, lon = "", "" // the GPS tag gives the place
	}
	if len(p.Shadows) == 0 {
		if spec.HasGPS {
			return nil
		}
		note := "place from the claim file; shaded close-up, no shadows to measure"
		if sh.sunny {
			note = "place from the claim file; shadows not measured"
		}
		return [][]string{{p.Path, "", "", "", "", "", "", "", "", "", "", "", "", lat, lon, "", note}}
	}
	var rows [][]string
	for _, s := range p.Shadows {
		decl, note := "", "tape and protractor on the perspective-corrected print"
		if s.BearingRef == "magnetic" {
			decl, note = ftoa(s.DeclinationDeg, 1), "bearing by hand compass on site; declination WMM2025"
		}
		rows = append(rows, []string{p.Path, s.Object, ftoa(s.HeightM, 2), ftoa(s.SheetLengthM, 2),
			ftoa(s.SheetBearing, 1), s.BearingRef, ftoa(BearingSDDeg, 0), ftoa(LengthSDPct, 0),
			"", "", "", "", decl, lat, lon, "", note})
	}
	return rows
}

// writeSheet writes measurements.csv per RFC 4180 (CRLF line ends).
func writeSheet(name string, rows [][]string) error {
	var b bytes.Buffer
	w := csv.NewWriter(&b)
	w.UseCRLF = true
	if err := w.Write(sheetColumns); err != nil {
		return fmt.Errorf("democase: sheet: %w", err)
	}
	if err := w.WriteAll(rows); err != nil {
		return fmt.Errorf("democase: sheet: %w", err)
	}
	if err := os.WriteFile(name, b.Bytes(), 0o644); err != nil {
		return fmt.Errorf("democase: %w", err)
	}
	return nil
}

// Standard shutter speeds in third stops, seconds.
var shutterDens = []uint32{8000, 6400, 5000, 4000, 3200, 2500, 2000, 1600, 1250, 1000, 800, 640, 500,
	400, 320, 250, 200, 160, 125, 100, 80, 60, 50, 40, 30}

// exposureFor picks the exposure a metering camera would choose in clear
// sunshine at the given solar altitude, with aperture fNumber and the ISO:
// daylight illuminance E ≈ 130 klx · sin(e)^1.2 (a rough clear-sky fit: about
// 110 klx at 60°, 57 klx at 30°, 16 klx at 10°, the order of the tables in
// USNO Circular 171), exposure value EV100 = log2(E / 2.5) (incident-light
// calibration C = 250, ISO 2720), then the nearest standard shutter speed.
// It returns the f-number, the time and the EV100 of the written settings.
func exposureFor(altitudeDeg, fNumber float64, iso int) (float64, exifwrite.Rational, float64) {
	alt := math.Max(altitudeDeg, 3)
	lux := 130_000 * math.Pow(math.Sin(angle.Rad(alt)), 1.2)
	ev100 := math.Log2(lux / 2.5)
	evISO := ev100 + math.Log2(float64(iso)/100)
	want := fNumber * fNumber / math.Pow(2, evISO)
	best := shutterDens[0]
	for _, d := range shutterDens {
		if math.Abs(math.Log2(want*float64(d))) < math.Abs(math.Log2(want*float64(best))) {
			best = d
		}
	}
	t := exifwrite.Rational{Num: 1, Den: best}
	return fNumber, t, math.Log2(fNumber*fNumber/t.Float()) - math.Log2(float64(iso)/100)
}
