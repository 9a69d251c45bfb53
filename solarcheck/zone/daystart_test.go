package zone

import (
	"strings"
	"testing"
	"time"
)

// TestDayStart: the first instant that showed a date, where midnight was
// ordinary, skipped or repeated. Facts: tz database, northamerica, Rule Cuba
// 2012 max (clocks forward at 0:00 standard time on the second Sunday of
// March, back at 0:00 standard time = 1:00 daylight on the first Sunday of
// November; CST is UTC−5, CDT UTC−4); 15 U.S.C. §260a for New York (changes
// at 2:00 local, so midnight is ordinary).
func TestDayStart(t *testing.T) {
	db := NewDB()
	tests := []struct {
		zone       string
		y          int
		m          time.Month
		d          int
		kind       Kind
		want       time.Time
		source     string
		normalised string // the date the start belongs to, after normalising d
	}{
		{"America/Havana", 2025, time.March, 9, Skipped, utc(2025, 3, 9, 5, 0), "Rule Cuba: 00:00 CST never shown; the day starts at the change, 05:00 UTC", "2025-03-09"},
		{"America/Havana", 2025, time.November, 2, Repeated, utc(2025, 11, 2, 4, 0), "Rule Cuba: 00:00 shown at 04:00 UTC (CDT) and 05:00 UTC (CST); the first counts", "2025-11-02"},
		{"America/New_York", 2025, time.November, 2, Normal, utc(2025, 11, 2, 4, 0), "15 U.S.C. §260a: midnight EDT = 04:00 UTC", "2025-11-02"},
		{"America/New_York", 2025, time.October, 33, Normal, utc(2025, 11, 2, 4, 0), "day 33 of October is 2 November (normalised like time.Date)", "2025-11-02"},
		{"UTC", -500, time.June, 1, Normal, time.Date(-500, 6, 1, 0, 0, 0, 0, time.UTC), "years before 1: read directly", "-0500-06-01"},
	}
	for _, tc := range tests {
		loc := mustLoad(t, db, tc.zone)
		got, res, err := DayStart(tc.y, tc.m, tc.d, loc)
		if err != nil {
			t.Errorf("%s %d-%d-%d: %v", tc.zone, tc.y, tc.m, tc.d, err)
			continue
		}
		if !got.Equal(tc.want) || res.Kind != tc.kind {
			t.Errorf("%s %d-%d-%d: %v (%v), want %v (%v) [%s]", tc.zone, tc.y, tc.m, tc.d, got.UTC(), res.Kind, tc.want, tc.kind, tc.source)
		}
		if d := got.In(loc).Format(time.DateOnly); d != tc.normalised {
			t.Errorf("%s: start shows date %s, want %s", tc.zone, d, tc.normalised)
		}
	}
}

// TestDescribe: the sentence for a skipped or repeated wall time names the
// reading used and every other one, in UTC and with its offset; an ordinary
// wall time has none. Facts: 15 U.S.C. §260a (DST from 2:00 on the second
// Sunday of March to 2:00 on the first Sunday of November), EST UTC−5, EDT
// UTC−4.
func TestDescribe(t *testing.T) {
	ny := mustLoad(t, NewDB(), "America/New_York")
	tests := []struct {
		w    Wall
		used int
		want []string
	}{
		{wall(2025, 11, 2, 1, 30), 1, []string{"2025-11-02 01:30:00 came twice in America/New_York", "went back at 2025-11-02 06:00 UTC",
			"read as UTC−05:00 (EST), 2025-11-02 06:30:00 UTC", "the other reading is UTC−04:00 (EDT), 2025-11-02 05:30:00 UTC"}},
		{wall(2025, 3, 9, 2, 30), 0, []string{"2025-03-09 02:30:00 never came in America/New_York", "went forward at 2025-03-09 07:00 UTC",
			"never showed it", "read as UTC−04:00 (EDT), 2025-03-09 06:30:00 UTC", "the other reading is UTC−05:00 (EST), 2025-03-09 07:30:00 UTC"}},
		{wall(2025, 6, 1, 12, 0), 0, nil},
	}
	for _, tc := range tests {
		res, err := Resolve(tc.w, ny)
		if err != nil {
			t.Fatal(err)
		}
		got := res.Describe(tc.w, tc.used)
		if tc.want == nil && got != "" {
			t.Errorf("%s: ordinary wall time described as %q", tc.w, got)
		}
		for _, s := range tc.want {
			if !strings.Contains(got, s) {
				t.Errorf("%s: %q lacks %q", tc.w, got, s)
			}
		}
	}
}

// TestClaimSameInstantOnce: zones that overlap at a place but keep the same
// offset (Europe/Rome and Europe/Vatican, both CEST in June: tz database,
// europe) give one reading, not two to choose between; zones with different
// offsets keep one each.
func TestClaimSameInstantOnce(t *testing.T) {
	db := NewDB()
	w := wall(2025, 6, 1, 12, 0)
	var c Claimed
	for _, name := range []string{"Europe/Rome", "Europe/Vatican", "Europe/London"} {
		res, err := Resolve(w, mustLoad(t, db, name))
		if err != nil {
			t.Fatal(err)
		}
		c.add(res)
	}
	want := []time.Time{utc(2025, 6, 1, 10, 0), utc(2025, 6, 1, 11, 0)} // 12:00 CEST, 12:00 BST
	if len(c.Candidates) != len(want) || !c.Candidates[0].UTC.Equal(want[0]) || !c.Candidates[1].UTC.Equal(want[1]) || len(c.Zones) != 3 {
		t.Errorf("candidates %v, zones %v; want %v and all three zones named", c.Candidates, c.Zones, want)
	}
}
