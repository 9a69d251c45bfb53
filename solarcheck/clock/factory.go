package clock

import (
	"sort"
	"time"
)

// factoryEpochs are the dates camera clocks fall back to when they lose
// their setting (a flat backup cell, a firmware reset): the start of the
// Unix clock (1970-01-01), of the FAT file system's clock (1980-01-01) and
// 2000-01-01, the first date of many camera menus (common practice of the
// trade; each camera maker picks its own, and these are the usual ones).
var factoryEpochs = []time.Time{
	time.Date(1970, 1, 1, 0, 0, 0, 0, time.UTC),
	time.Date(1980, 1, 1, 0, 0, 0, 0, time.UTC),
	time.Date(2000, 1, 1, 0, 0, 0, 0, time.UTC),
}

// FactoryWindow is how long after a factory epoch a reading is taken as a
// clock that fell back to it: a reset clock starts at midnight and runs on,
// and a trip goes on for days before anyone notices (common practice; a
// true photo taken in the first month of 1970, 1980 or 2000 by a camera
// that writes EXIF is not a case this tool meets).
const FactoryWindow = 31 * 24 * time.Hour

// FactoryEpoch reports whether a clock reading lies within FactoryWindow
// after one of the factory default dates, and which. A reading up to 14 h
// before the date counts too: a clock that names its zone is read in UTC,
// and 2000-01-01 00:05 at UTC+09:00 is 1999-12-31 15:05 UTC.
func FactoryEpoch(reading time.Time) (time.Time, bool) {
	for _, e := range factoryEpochs {
		if !reading.Before(e.Add(-14*time.Hour)) && reading.Sub(e) < FactoryWindow {
			return e, true
		}
	}
	return time.Time{}, false
}

// factoryResets lists each fall-back to a factory date: After is the
// first photo of a run at a factory date, Before the photo taken just
// before it. Which photo came before is read from the file numbers when
// the photos have them (the clock can no longer tell); without numbers, a
// fall-back is taken to follow the last photo with a set clock.
func factoryResets(points []Point, photos []Photo) []Reset {
	type item struct {
		i, n    int
		factory bool
	}
	var items []item
	numbered := true
	for i, p := range points {
		n, _, ok := FileNumber(p.FileName)
		numbered = numbered && ok
		items = append(items, item{i, n, photos[i].Factory})
	}
	if len(items) == 0 {
		return nil
	}
	if numbered {
		sort.SliceStable(items, func(a, b int) bool { return items[a].n < items[b].n })
	} else {
		// Set readings in order, then the factory readings in order.
		sort.SliceStable(items, func(a, b int) bool {
			if items[a].factory != items[b].factory {
				return !items[a].factory
			}
			return points[items[a].i].Reading.Before(points[items[b].i].Reading)
		})
	}
	var out []Reset
	for k := range items {
		it := items[k]
		if !it.factory || (k > 0 && items[k-1].factory) {
			continue
		}
		r := Reset{After: points[it.i].Key, Factory: true}
		r.Epoch, _ = FactoryEpoch(points[it.i].Reading)
		if k > 0 {
			r.Before = points[items[k-1].i].Key
		}
		out = append(out, r)
	}
	return out
}
