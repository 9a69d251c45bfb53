package solarcheck

import (
	"strings"
	"testing"
	"time"

	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

// TestReadingsOfARepeatedOrSkippedHour: a wall time that the place's zone
// repeated or skipped is judged under every reading; the one the evidence
// supports is used and said, and with nothing to separate them the verdict
// is ambiguous, with both. Facts: 15 U.S.C. §260a and the tz database
// (America/New_York): daylight time ends at 02:00 EDT on the first Sunday of
// November (2025-11-02, 06:00 UTC), so 01:30 came at 05:30 UTC (EDT, UTC−4)
// and again at 06:30 UTC (EST, UTC−5); it begins at 02:00 EST on the second
// Sunday of March (2025-03-09, 07:00 UTC), so 02:30 never came (02:30 EDT
// would be 06:30 UTC, 02:30 EST 07:30 UTC). Asia/Urumqi keeps UTC+6 and
// Asia/Shanghai UTC+8 over the same place (tz database, asia: "Xinjiang
// time"), so 12:00 there is 04:00 or 06:00 UTC. A GPS stamp a few seconds
// after the true instant is the receiver's fix lag (common practice).
func TestReadingsOfARepeatedOrSkippedHour(t *testing.T) {
	x := sharedExaminer()
	const nyLat, nyLon = 40.7128, -74.0060
	fold := time.Date(2025, 11, 2, 1, 30, 0, 0, time.UTC)
	gap := time.Date(2025, 3, 9, 2, 30, 0, 0, time.UTC)
	at := func(y int, m time.Month, d, h, mi, s int) *time.Time {
		u := time.Date(y, m, d, h, mi, s, 0, time.UTC)
		return &u
	}
	tests := []struct {
		name     string
		s        scene
		verdict  Verdict
		used     int // index of the reading used; -1 for none
		claimed  time.Time
		readings []time.Time
		explain  []string
	}{
		{"fold, GPS fits the standard-time reading", scene{wall: fold, lat: nyLat, lon: nyLon, gps: true, gpsTime: at(2025, 11, 2, 6, 30, 5)},
			Consistent, 1, time.Date(2025, 11, 2, 6, 30, 0, 0, time.UTC),
			[]time.Time{time.Date(2025, 11, 2, 5, 30, 0, 0, time.UTC), time.Date(2025, 11, 2, 6, 30, 0, 0, time.UTC)},
			[]string{"came twice", "fits only the reading UTC−05:00 (EST), 2025-11-02 06:30:00 UTC"}},
		{"fold, GPS fits the daylight-time reading", scene{wall: fold, lat: nyLat, lon: nyLon, gps: true, gpsTime: at(2025, 11, 2, 5, 30, 4)},
			Consistent, 0, time.Date(2025, 11, 2, 5, 30, 0, 0, time.UTC),
			[]time.Time{time.Date(2025, 11, 2, 5, 30, 0, 0, time.UTC), time.Date(2025, 11, 2, 6, 30, 0, 0, time.UTC)},
			[]string{"came twice", "fits only the reading UTC−04:00 (EDT), 2025-11-02 05:30:00 UTC"}},
		{"fold, no witness", scene{wall: fold, lat: nyLat, lon: nyLon, gps: true},
			Ambiguous, -1, time.Time{},
			[]time.Time{time.Date(2025, 11, 2, 5, 30, 0, 0, time.UTC), time.Date(2025, 11, 2, 6, 30, 0, 0, time.UTC)},
			[]string{"came twice", "does not tell which", "UTC−04:00 (EDT), 2025-11-02 05:30:00 UTC", "UTC−05:00 (EST), 2025-11-02 06:30:00 UTC", "No independent witness"}},
		{"gap, no witness", scene{wall: gap, lat: nyLat, lon: nyLon, gps: true},
			Ambiguous, -1, time.Time{},
			[]time.Time{time.Date(2025, 3, 9, 6, 30, 0, 0, time.UTC), time.Date(2025, 3, 9, 7, 30, 0, 0, time.UTC)},
			[]string{"never came", "not on the legal time", "put forward before the change", "not yet put forward"}},
		{"gap, GPS fits the camera not yet put forward", scene{wall: gap, lat: nyLat, lon: nyLon, gps: true, gpsTime: at(2025, 3, 9, 7, 30, 3)},
			Consistent, 1, time.Date(2025, 3, 9, 7, 30, 0, 0, time.UTC),
			[]time.Time{time.Date(2025, 3, 9, 6, 30, 0, 0, time.UTC), time.Date(2025, 3, 9, 7, 30, 0, 0, time.UTC)},
			[]string{"never came", "not on the legal time", "UTC−05:00 (EST), 2025-03-09 07:30:00 UTC (a camera not yet put forward), which is used"}},
		{"overlapping zones, GPS fits UTC+6", scene{wall: time.Date(2025, 6, 1, 12, 0, 0, 0, time.UTC), lat: 43.8256, lon: 87.6168, gps: true, gpsTime: at(2025, 6, 1, 6, 0, 2)},
			Consistent, 1, time.Date(2025, 6, 1, 6, 0, 0, 0, time.UTC),
			[]time.Time{time.Date(2025, 6, 1, 4, 0, 0, 0, time.UTC), time.Date(2025, 6, 1, 6, 0, 0, 0, time.UTC)},
			[]string{"different instant in each zone", "fits only the reading UTC+06:00"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			f := x.Examine(tc.s.photo(t, "p.jpg"))
			if f.Verdict != tc.verdict {
				t.Errorf("verdict %s, want %s: %s", f.Verdict, tc.verdict, f.Explanation)
			}
			if len(f.Readings) != len(tc.readings) {
				t.Fatalf("%d readings, want %d", len(f.Readings), len(tc.readings))
			}
			for i, r := range f.Readings {
				if !r.Candidate.UTC.Equal(tc.readings[i]) || r.Explanation == "" || r.Verdict == "" {
					t.Errorf("reading %d: %+v, want instant %s with an outcome", i, r, tc.readings[i])
				}
			}
			if f.ReadingUsed != tc.used {
				t.Errorf("reading used %d, want %d", f.ReadingUsed, tc.used)
			}
			if tc.used >= 0 && !f.Claimed.Equal(tc.claimed) {
				t.Errorf("claimed %s, want %s", f.Claimed, tc.claimed)
			}
			if tc.used >= 0 && len(f.Rejected) == 0 {
				t.Errorf("the other reading is not named among the rejected explanations")
			}
			if tc.used < 0 && (f.Offset != nil || !f.Earliest.IsZero() || f.Basis.GPSOffset != nil || f.Basis.ShadowOffset != nil) {
				t.Errorf("an ambiguous finding states a figure: offset %v, window %v", f.Offset, f.Earliest)
			}
			for _, s := range tc.explain {
				if !strings.Contains(f.Explanation, s) {
					t.Errorf("explanation lacks %q:\n%s", s, f.Explanation)
				}
			}
		})
	}
}

// TestSheetWallTimeBesideTheFiles: a sheet time without offset only stands
// in for a missing capture time; beside the file's own it is not used, and
// the claim's notes say so rather than drop it silently.
func TestSheetWallTimeBesideTheFiles(t *testing.T) {
	s := scene{wall: time.Date(2025, 6, 1, 12, 0, 0, 0, time.UTC), lat: 40.7128, lon: -74.006, gps: true}
	p := s.photo(t, "p.jpg")
	p.Override.Wall = zone.Wall{Year: 2025, Month: time.June, Day: 1, Hour: 13}
	f := sharedExaminer().Examine(p)
	// 12:00 EDT is 16:00 UTC (15 U.S.C. §260a: daylight time in June, UTC−4).
	if !f.Claimed.Equal(time.Date(2025, 6, 1, 16, 0, 0, 0, time.UTC)) || f.WallTag != "DateTimeOriginal" {
		t.Errorf("claimed %s from %s, want the file's 12:00 EDT = 16:00 UTC", f.Claimed, f.WallTag)
	}
	if n := strings.Join(f.Claim.Notes, " "); !strings.Contains(n, "2025-06-01 13:00:00 was not used") {
		t.Errorf("notes %q do not say the sheet's time was not used", f.Claim.Notes)
	}
}
