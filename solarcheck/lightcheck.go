package solarcheck

import (
	"github.com/gnomon-forensics/gnomon/exifread"
	"github.com/gnomon-forensics/gnomon/solarcheck/light"
)

// checkLight compares the exposure the camera chose with the daylight
// expected at the claimed sun altitude (package light). It is a hint: an
// exposure far brighter than any natural light at that moment (a daylight
// exposure on a night-time claim) counts against the claim; one that is
// darker proves nothing, since shade, interiors and lamps make any scene
// darker than the open sky.
func (x *Examiner) checkLight(f *Finding, rec exifread.Record) {
	if f.Sun == nil || rec.FNumber == nil || rec.ExposureTimeSec == nil || rec.ISO <= 0 {
		return
	}
	fl := light.FlashUnknown
	if rec.Flash != nil {
		fl = light.FlashNotFired
		if rec.Flash.Fired {
			fl = light.FlashFired
		}
	}
	r := light.Check(light.Input{
		Exposure:       light.Exposure{FNumber: *rec.FNumber, ExposureTimeSec: *rec.ExposureTimeSec, ISO: float64(rec.ISO)},
		Flash:          fl,
		SunAltitudeDeg: &f.Sun.AltitudeDeg,
	}, light.Options{})
	c := Check{Kind: KindLight, Figure: r.OffEV, HasFigure: true, Unit: "EV", Sentence: r.Sentence}
	switch {
	case r.Status == light.Skipped:
		c.Status, c.HasFigure = Skipped, false
	case r.Status == light.Agree:
		c.Status = Agrees
	case r.OffEV > 0:
		c.Status = Conflicts
		f.Basis.LightOff = true
	default:
		c.Status = Open
	}
	f.check(c)
}
