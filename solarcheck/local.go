package solarcheck

import "time"

// Local returns t as the legal time at the photo's place: in the first
// zone found there (Finding.PlaceZones), from the embedded tz database. ok
// is false when the place has no zone. A report shows corrected times this
// way beside UTC, as an examiner reads them against the scene.
func (x *Examiner) Local(f *Finding, t time.Time) (local time.Time, ok bool) {
	if len(f.PlaceZones) == 0 || t.IsZero() {
		return time.Time{}, false
	}
	loc, err := x.zones.DB().Load(f.PlaceZones[0])
	if err != nil {
		return time.Time{}, false
	}
	return t.In(loc), true
}
