package zone

import (
	"testing"
	"time"
)

// FuzzResolve: for any valid wall time in a handful of zones with unusual rules,
// Resolve does not fail, real candidates read back as the wall time on the zone's
// clock, Normal has one candidate, Skipped and Repeated two or more.
func FuzzResolve(f *testing.F) {
	f.Add(2025, 3, 30, 2, 30, 0)
	f.Add(2011, 12, 30, 12, 0, 1)
	f.Add(1943, 6, 1, 0, 0, 2)
	f.Add(1, 1, 1, 0, 0, 3)
	zones := []string{"Europe/Berlin", "Pacific/Apia", "Asia/Kolkata", "Australia/Lord_Howe", "America/St_Johns", "Europe/Moscow", "Africa/Casablanca", "Antarctica/Troll"}
	db := NewDB()
	f.Fuzz(func(t *testing.T, y, mo, d, h, mi, zi int) {
		w := Wall{Year: y, Month: time.Month(mo), Day: d, Hour: h, Minute: mi}
		if w.Validate() != nil {
			return
		}
		if zi < 0 {
			zi = -zi
		}
		loc, err := db.Load(zones[zi%len(zones)])
		if err != nil {
			t.Fatal(err)
		}
		res, err := Resolve(w, loc)
		if err != nil {
			t.Fatalf("%v in %s: %v", w, loc, err)
		}
		switch {
		case res.Kind == Normal && len(res.Candidates) != 1,
			res.Kind != Normal && len(res.Candidates) < 2:
			t.Fatalf("%v in %s: %v with %d candidates", w, loc, res.Kind, len(res.Candidates))
		}
		for _, c := range res.Candidates {
			lt := c.UTC.In(loc)
			same := lt.Year() == w.Year && lt.Month() == w.Month && lt.Day() == w.Day && lt.Hour() == w.Hour && lt.Minute() == w.Minute
			if c.Real != same {
				t.Fatalf("%v in %s: candidate %v (real %v) reads %v", w, loc, c.UTC, c.Real, lt)
			}
		}
	})
}

// FuzzParseFixedOffset: never panics; accepted offsets are within ±23:59.
func FuzzParseFixedOffset(f *testing.F) {
	for _, s := range []string{"+05:30", "UTC-3", "GMT+3", "Z", "−0930", "+99:99", "Europe/Berlin"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		off, ok, err := parseFixedOffset(s)
		if ok && (err != nil || off < -maxOffsetSec || off > maxOffsetSec) {
			t.Fatalf("%q: %d %v %v", s, off, ok, err)
		}
	})
}
