package main

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"strings"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/angle"
	"github.com/gnomon-forensics/gnomon/solarcheck/invert"
	"github.com/gnomon-forensics/gnomon/solarcheck/spa"
)

const whereSynopsis = "gnomon where --time T --azimuth A --altitude H [--azimuth-sd S] [--altitude-sd S] [--json]"

const whereAbout = `Find the place on Earth from which the sun stood at a measured azimuth and
apparent altitude at a known instant: the circle of equal altitude about the
subsolar point crossed with the azimuth, refined with NREL SPA (parallax,
refraction at the standard atmosphere, sea level).

--time is RFC 3339 (2024-06-03T09:17:00Z or with an offset); UTC is read as
UT1. radius_km is the radius of the circle that encloses the 95 % error
ellipse, from first-order propagation of the 1-sigma errors (defaults 1°
each). It leaves out clock error: each second of time error moves the place
by up to 0.46 km east or west. JSON also gives the error ellipse: its 1-sigma
semi-axes (semi_major_km, semi_minor_km) and the bearing of its major axis
(major_axis_deg, 0..180 from true north). Azimuth is 0..360 degrees clockwise
from true north. When the sun's altitude is below its
declination the circle of equal altitude encloses a pole and two places can
fit; both are listed ("alternatives" in JSON) and other evidence must decide.
If no place fits at the 95 % level, the command says so and exits with 1.`

type whereFixJSON struct {
	Lat      float64 `json:"lat"`
	Lon      float64 `json:"lon"`
	RadiusKm float64 `json:"radius_km"`
	// The error ellipse: 1-sigma semi-axes in km on the ground and the
	// bearing of the major axis (degrees from true north, 0..180).
	SemiMajorKm  float64 `json:"semi_major_km"`
	SemiMinorKm  float64 `json:"semi_minor_km"`
	MajorAxisDeg float64 `json:"major_axis_deg"`
	// Misfit is χ² (2 dof) of the measurement at the place.
	Misfit float64 `json:"misfit"`
}

type whereJSON struct {
	whereFixJSON
	// Warnings say where a figure is undefined (a place at a pole).
	Warnings []string `json:"warnings,omitempty"`
	// Alternatives lists further places that fit equally well (see whereAbout).
	Alternatives []whereFixJSON `json:"alternatives,omitempty"`
}

func runWhere(e env, args []string) int {
	fs := newFlagSet(e, "where", whereSynopsis, whereAbout)
	ts := fs.String("time", "", "`TIME` of the measurement, RFC 3339 (e.g. 2024-06-03T09:17:00Z)")
	az := fs.Float64("azimuth", 0, "measured sun azimuth in `DEGREES` clockwise from true north")
	alt := fs.Float64("altitude", 0, "measured apparent (refracted) sun altitude in `DEGREES`")
	azSD := fs.Float64("azimuth-sd", 1, "1-sigma error of --azimuth in `DEGREES`")
	altSD := fs.Float64("altitude-sd", 1, "1-sigma error of --altitude in `DEGREES`")
	asJSON := fs.Bool("json", false, "print one JSON object")
	if _, code, done := parseNoArgs(fs, args, "time", "azimuth", "altitude"); done {
		return code
	}
	t, err := time.Parse(time.RFC3339, strings.TrimSpace(*ts))
	if err != nil {
		return usageErr(fs, "--time %q is not RFC 3339 (YYYY-MM-DDTHH:MM:SS with Z or an offset)", *ts)
	}
	switch {
	case !(*az >= 0 && *az <= 360):
		return usageErr(fs, "--azimuth %g is outside 0..360 (degrees clockwise from true north)", *az)
	case !(*alt >= -1 && *alt <= 90):
		return usageErr(fs, "--altitude %g is outside -1..90 (the sun must be up)", *alt)
	case !(*azSD > 0 && *azSD <= 180):
		return usageErr(fs, "--azimuth-sd %g must be a positive number of degrees up to 180", *azSD)
	case !(*altSD > 0 && *altSD <= 90):
		return usageErr(fs, "--altitude-sd %g must be a positive number of degrees up to 90", *altSD)
	}
	fixes, err := invert.Where(invert.WhereQuery{
		Time:         t,
		PressureHPa:  spa.DefaultPressureHPa,
		TemperatureC: spa.DefaultTemperatureC,
		Measurement: invert.Measurement{
			HasAzimuth: true, AzimuthDeg: angle.Norm360(*az), AzimuthSDDeg: *azSD,
			HasAltitude: true, AltitudeDeg: *alt, AltitudeSDDeg: *altSD,
		},
	})
	if errors.Is(err, invert.ErrInvalid) {
		return usageErr(fs, "%v", err)
	}
	if err != nil {
		return fail(e.stderr, "where", err)
	}
	js := func(f invert.Fix) whereFixJSON {
		return whereFixJSON{Lat: roundTo(f.LatDeg, 4), Lon: roundTo(f.LonDeg, 4), RadiusKm: roundTo(f.RadiusKm, 1),
			SemiMajorKm: roundTo(f.SemiMajorKm, 1), SemiMinorKm: roundTo(f.SemiMinorKm, 1), MajorAxisDeg: roundTo(f.MajorAxisDeg, 0),
			Misfit: roundTo(f.Misfit, 3)}
	}
	out := whereJSON{whereFixJSON: js(fixes[0])}
	for _, f := range fixes[1:] {
		out.Alternatives = append(out.Alternatives, js(f))
	}
	for _, f := range fixes {
		if w := poleWarning(f.LatDeg); w != "" {
			out.Warnings = append(out.Warnings, w)
			fmt.Fprintln(e.stderr, "gnomon where: warning: "+w)
			break
		}
	}
	if *asJSON {
		enc := json.NewEncoder(e.stdout)
		enc.SetIndent("", "  ")
		if err := enc.Encode(out); err != nil {
			return fail(e.stderr, "where", fmt.Errorf("write JSON: %w", err))
		}
		return exitOK
	}
	if err := writeWhereTable(e.stdout, t, *az, *azSD, *alt, *altSD, fixes); err != nil {
		return fail(e.stderr, "where", fmt.Errorf("write output: %w", err))
	}
	return exitOK
}

// poleDeg is how close to a pole a latitude counts as the pole: 0.0001°,
// 11 m, the precision the commands print.
const poleDeg = 1e-4

// poleWarning says, for a latitude at a pole, that azimuth (and
// longitude) mean nothing there: every direction from the North Pole is
// south and every direction from the South Pole is north (common
// knowledge). "" elsewhere.
func poleWarning(latDeg float64) string {
	switch {
	case latDeg >= 90-poleDeg:
		return "the place is at the North Pole, where every direction is south: azimuth and longitude are undefined there"
	case latDeg <= -90+poleDeg:
		return "the place is at the South Pole, where every direction is north: azimuth and longitude are undefined there"
	}
	return ""
}

func writeWhereTable(w io.Writer, t time.Time, az, azSD, alt, altSD float64, fixes []invert.Fix) error {
	var b strings.Builder
	fmt.Fprintf(&b, "%-16s %s\n", "time (UT1)", t.UTC().Format(time.RFC3339))
	fmt.Fprintf(&b, "%-16s azimuth %.2f° ± %.2f°, altitude %.2f° ± %.2f° (1-sigma)\n", "sun", az, azSD, alt, altSD)
	fmt.Fprintf(&b, "%-16s %.4f° lat, %.4f° lon\n", "subsolar point", fixes[0].SubsolarLatDeg, fixes[0].SubsolarLonDeg)
	b.WriteString("\n")
	fmt.Fprintf(&b, "%3s  %10s  %11s  %10s  %15s  %15s  %10s\n", "#", "lat °", "lon °", "radius km", "1σ major km", "1σ minor km", "major axis °")
	for i, f := range fixes {
		fmt.Fprintf(&b, "%3d  %10.4f  %11.4f  %10.1f  %15.1f  %15.1f  %10.0f\n", i+1,
			f.LatDeg, f.LonDeg, f.RadiusKm, f.SemiMajorKm, f.SemiMinorKm, f.MajorAxisDeg)
	}
	b.WriteString("\nradius: 95 % (encloses the error ellipse); clock error not included.\n")
	if len(fixes) > 1 {
		b.WriteString("More than one place fits: the circle of equal altitude encloses a pole; other evidence must decide.\n")
	}
	_, err := io.WriteString(w, b.String())
	return err
}
