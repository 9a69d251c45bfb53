package solarcheck

import (
	"fmt"
	"math"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/angle"
	"github.com/gnomon-forensics/gnomon/solarcheck/geomag"
	"github.com/gnomon-forensics/gnomon/solarcheck/invert"
	"github.com/gnomon-forensics/gnomon/solarcheck/shadow"
)

// directions turns the examiner's measurements of a photo into sun
// directions in true-north degrees, one per measured object. Measurements
// that cannot be turned
// (a magnetic bearing outside the magnetic model's years with no explicit
// declination, a shadow the geometry refuses) are reported in problems.
func directions(rows []Measurement, latDeg, lonDeg float64, hasPlace bool, at time.Time) (ds []Direction, problems []string) {
	for _, r := range rows {
		corr, corrSD, err := bearingCorrection(r, latDeg, lonDeg, hasPlace, at)
		if err != nil {
			problems = append(problems, fmt.Sprintf("%s: %v", r.Source, err))
			continue
		}
		// The correction's own error (the magnetic model's) adds to the
		// examiner's bearing error: independent, so in quadrature.
		bearingSD := math.Hypot(r.BearingSDDeg, corrSD)
		d := Direction{Object: r.Object, Sheet: r, NorthCorrectionDeg: corr, NorthCorrectionSDDeg: corrSD}
		switch r.Kind {
		case MeasureShadow:
			est, err := shadow.Propagate(shadow.Shadow{
				Height:     r.ObjectHeight,
				Length:     r.ShadowLength,
				BearingDeg: angle.Norm360(r.ShadowBearingDeg + corr),
				Ground:     shadow.Ground{SlopeDeg: r.SlopeDeg, TowardDeg: angle.Norm360(r.SlopeTowardDeg + corr)},
			}, shadow.Uncertainty{LengthSDPct: r.LengthSDPct, BearingSDDeg: bearingSD})
			if err != nil {
				problems = append(problems, fmt.Sprintf("%s: %v", r.Source, err))
				continue
			}
			d.AzimuthDeg, d.AzimuthSDDeg, d.HasAzimuth = est.Sun.AzimuthDeg, est.AzimuthSDDeg, true
			d.AltitudeDeg, d.AltitudeSDDeg, d.HasAltitude = est.Sun.AltitudeDeg, est.AltitudeSDDeg, true
			d.Correlation = est.Correlation
		case MeasureShadowBearing:
			d.AzimuthDeg, d.AzimuthSDDeg, d.HasAzimuth = angle.Norm360(r.ShadowBearingDeg+corr+180), bearingSD, true
		case MeasureSighting:
			if r.SunAzimuthDeg != nil {
				d.AzimuthDeg, d.AzimuthSDDeg, d.HasAzimuth = angle.Norm360(*r.SunAzimuthDeg+corr), bearingSD, true
			}
			if r.SunAltitudeDeg != nil {
				// A sighted altitude is taken with the same 1-sigma as the bearing.
				d.AltitudeDeg, d.AltitudeSDDeg, d.HasAltitude = *r.SunAltitudeDeg, r.BearingSDDeg, true
			}
		default:
			continue
		}
		ds = append(ds, d)
	}
	return ds, problems
}

// bearingCorrection is what to add to a bearing in the row's reference to
// make it a true bearing, with its 1-sigma error: the magnetic declination
// (east positive) for magnetic bearings, with the WMM2025 error model's
// uncertainty (geomag.DeclinationSDDeg) when the model gives it and none
// when the examiner wrote it; the grid convergence for grid bearings (exact
// for the projection, so no error).
func bearingCorrection(r Measurement, latDeg, lonDeg float64, hasPlace bool, at time.Time) (corr, sd float64, err error) {
	switch r.North {
	case MagneticNorth:
		if r.DeclinationDeg != nil {
			return *r.DeclinationDeg, 0, nil
		}
		if !hasPlace {
			return 0, 0, fmt.Errorf("magnetic bearing needs a place for the declination, or a declination column")
		}
		fld, err := geomag.At(latDeg, lonDeg, 0, at)
		if err != nil {
			return 0, 0, fmt.Errorf("magnetic bearing: %w; give the declination in the sheet's declination column", err)
		}
		return fld.Main.DeclinationDeg, geomag.DeclinationSDDeg(fld.Main.HnT), nil
	case GridNorth:
		if !hasPlace {
			return 0, 0, fmt.Errorf("grid bearing needs a place for the meridian convergence")
		}
		conv, _, err := geomag.Convergence(latDeg, lonDeg)
		if err != nil {
			return 0, 0, fmt.Errorf("grid bearing: %w", err)
		}
		return geomag.GridToTrue(0, conv), 0, nil
	default:
		return 0, 0, nil
	}
}

// combine merges the directions measured in one photo (all of the same sun
// at the same instant) into one measurement: inverse-variance weighted means
// of the azimuths (on the circle) and of the altitudes. It also returns the
// chi-square of the objects about their mean and its degrees of freedom, so
// that objects which disagree with each other can be reported.
func combine(ds []Direction) (m invert.Measurement, spreadChi2 float64, dof int) {
	var sx, sy, wAz, wAlt, sAlt, sCorr float64
	nAz, nAlt := 0, 0
	for _, d := range ds {
		if d.HasAzimuth {
			w := 1 / (d.AzimuthSDDeg * d.AzimuthSDDeg)
			sx += w * math.Cos(angle.Rad(d.AzimuthDeg))
			sy += w * math.Sin(angle.Rad(d.AzimuthDeg))
			wAz += w
			nAz++
		}
		if d.HasAltitude {
			w := 1 / (d.AltitudeSDDeg * d.AltitudeSDDeg)
			sAlt += w * d.AltitudeDeg
			wAlt += w
			nAlt++
		}
		if d.HasAzimuth && d.HasAltitude {
			sCorr += d.Correlation
		}
	}
	if nAz > 0 {
		m.HasAzimuth = true
		m.AzimuthDeg = angle.Norm360(angle.Deg(math.Atan2(sy, sx)))
		m.AzimuthSDDeg = 1 / math.Sqrt(wAz)
	}
	if nAlt > 0 {
		m.HasAltitude = true
		m.AltitudeDeg = sAlt / wAlt
		m.AltitudeSDDeg = 1 / math.Sqrt(wAlt)
	}
	if nAz == 1 && nAlt == 1 && len(ds) == 1 {
		m.Correlation = sCorr
	}
	for _, d := range ds {
		if d.HasAzimuth {
			r := angle.Wrap180(d.AzimuthDeg-m.AzimuthDeg) / d.AzimuthSDDeg
			spreadChi2 += r * r
		}
		if d.HasAltitude {
			r := (d.AltitudeDeg - m.AltitudeDeg) / d.AltitudeSDDeg
			spreadChi2 += r * r
		}
	}
	dof = max(nAz-1, 0) + max(nAlt-1, 0)
	return m, spreadChi2, dof
}
