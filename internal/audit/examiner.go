package audit

import (
	"fmt"

	"github.com/gnomon-forensics/gnomon/solarcheck"
	"github.com/gnomon-forensics/gnomon/solarcheck/sheet"
	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

// examinerInput converts the sheet rows matched to one photo into the plain
// values solarcheck takes: one Measurement per shadow or sighting row, and
// the photo's place and time overrides (sheet.Resolve has already dropped
// rows whose overrides disagree, so the first one given is the one).
func examinerInput(rows []sheet.Row) ([]solarcheck.Measurement, solarcheck.Override) {
	var ms []solarcheck.Measurement
	var ov solarcheck.Override
	for _, r := range rows {
		if r.Lat != nil && r.Lon != nil && !ov.HasPlace {
			ov.HasPlace, ov.LatDeg, ov.LonDeg = true, *r.Lat, *r.Lon
		}
		if r.Time != nil && ov.Wall.IsZero() && ov.Time.IsZero() {
			if r.Time.HasOffset {
				ov.Time = zone.Override{Instant: r.Time.Instant, HasInstant: true}
			} else {
				t := r.Time.Instant // the reading's fields, in time.UTC as a container
				ov.Wall = zone.Wall{Year: t.Year(), Month: t.Month(), Day: t.Day(),
					Hour: t.Hour(), Minute: t.Minute(), Second: t.Second(), Nanosecond: t.Nanosecond()}
			}
		}
		if m, ok := measurement(r); ok {
			ms = append(ms, m)
		}
	}
	return ms, ov
}

// measurement converts one shadow or sighting row; ok is false for a row
// that only overrides place or time.
func measurement(r sheet.Row) (m solarcheck.Measurement, ok bool) {
	m = solarcheck.Measurement{
		Source: fmt.Sprintf("%s line %d", r.File, r.Line), Object: r.Object,
		SlopeDeg: r.SlopeDeg, SlopeTowardDeg: r.SlopeTowardDeg, LengthSDPct: r.LengthSDPct,
		SunAzimuthDeg: r.SunAzimuthDeg, SunAltitudeDeg: r.SunAltitudeDeg,
		BearingSDDeg: r.BearingSDDeg, DeclinationDeg: r.DeclinationDeg,
	}
	switch r.BearingRef {
	case sheet.RefMagnetic:
		m.North = solarcheck.MagneticNorth
	case sheet.RefGrid:
		m.North = solarcheck.GridNorth
	default:
		m.North = solarcheck.TrueNorth
	}
	if r.ShadowBearingDeg != nil {
		m.ShadowBearingDeg = *r.ShadowBearingDeg
	}
	switch r.Kind {
	case sheet.KindShadow:
		m.Kind, m.ObjectHeight, m.ShadowLength = solarcheck.MeasureShadow, *r.ObjectHeight, *r.ShadowLength
	case sheet.KindShadowBearing:
		m.Kind = solarcheck.MeasureShadowBearing
	case sheet.KindSighting:
		m.Kind = solarcheck.MeasureSighting
	default:
		return m, false
	}
	return m, true
}
