package solarcheck

import (
	"errors"
	"math"
	"strings"
	"unicode"

	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

// ordinaryDriftSec bounds what the explanations call an ordinary clock
// error: a consumer camera's quartz clock gains or loses up to about a
// minute a month (common practice), so a year without setting it leaves it
// off by up to about a quarter of an hour. Beyond that, or for a photo its
// own camera does not share, the words leave room for a changed time.
const ordinaryDriftSec = 15 * 60

// clockOffsetCause words the cause of an offset that is no zone,
// daylight-saving or 12-hour step by its size (issue 18): a few seconds to
// minutes is a clock that runs fast or slow, never an edit; more may be a
// clock set wrongly or a changed time. sec is claimed minus evidence, so a
// positive offset is a clock ahead of the true time.
func clockOffsetCause(sec float64) string {
	if math.Abs(sec) <= ordinaryDriftSec {
		if sec > 0 {
			return "the camera clock runs fast, an ordinary clock error"
		}
		return "the camera clock runs slow, an ordinary clock error"
	}
	return "the camera clock was set off by that much, or the time was changed"
}

// claimProblem says in plain words why a claimed time could not be placed
// in UTC; the error itself (with the zone package's codes) stays in the
// logs of a caller that wants it.
func claimProblem(err error) string {
	switch {
	case errors.Is(err, zone.ErrNoBasis):
		return "the photo has no time-zone offset tag and no GPS position, and the measurement sheet gives no time, offset or time zone for it"
	case errors.Is(err, zone.ErrUnknownZone):
		return "the time zone named in the measurement sheet is not in the time zone database"
	case errors.Is(err, zone.ErrBadOverride):
		return "the time given in the measurement sheet is neither a full time, a UTC offset (±hh:mm) nor a time zone name"
	case errors.Is(err, zone.ErrInvalidWall):
		return "the camera's date and time do not exist on the calendar"
	case errors.Is(err, zone.ErrInvalidCoordinates):
		return "the GPS position is out of range"
	case errors.Is(err, zone.ErrZoneMap):
		return "the built-in time zone map could not be loaded"
	}
	return err.Error()
}

// cameraName is how a person reads a camera: make, model and serial as the
// camera wrote them ("Brisa BR-10, serial BR10-2290"), with NUL padding and
// runs of white space tidied and the make not repeated when the model
// already starts with it ("Canon", "Canon EOS R5": "Canon EOS R5"). The
// grouping key stays clock.CameraID; "" when make and model are empty.
func cameraName(maker, model, serial string) string {
	tidy := func(s string) string {
		s = strings.Map(func(r rune) rune {
			if r == 0 || unicode.IsSpace(r) {
				return ' '
			}
			return r
		}, s)
		return strings.Join(strings.Fields(s), " ")
	}
	mk, md, sn := tidy(maker), tidy(model), tidy(serial)
	name := strings.TrimSpace(mk + " " + md)
	if mk != "" && strings.HasPrefix(strings.ToLower(md), strings.ToLower(mk)) {
		name = md
	}
	if name == "" {
		return ""
	}
	if sn != "" {
		name += ", serial " + sn
	}
	return name
}
