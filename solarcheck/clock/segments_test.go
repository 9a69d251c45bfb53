package clock

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"
	"time"
)

// TestDriftNotDetermined: below the points Sen's interval needs, or over a
// span too short to resolve a drift, the model states no drift and says
// why (issue "defensible inference": one photo gave "0.00 s/day", two
// photos four hours apart gave 736.6 s/day).
func TestDriftNotDetermined(t *testing.T) {
	pts := func(n int, every time.Duration, driftPerDay float64) []Point {
		var out []Point
		for i := 0; i < n; i++ {
			d := time.Duration(i) * every
			out = append(out, Point{Key: string(rune('a' + i)), Reading: epoch.Add(d), HasEvidence: true,
				OffsetSec: 60 + driftPerDay*d.Hours()/24 + float64(i%2)*2, HalfWidth95Sec: 4})
		}
		return out
	}
	same := func(n int) []Point {
		out := pts(n, 24*time.Hour, 0)
		for i := range out {
			out[i].OffsetSec = 60
		}
		return out
	}
	cases := []struct {
		source   string
		points   []Point
		measured bool
		reason   string
	}{
		{"1 photo: no slope exists (hand check)", pts(1, 0, 0), false, "only 1 photo"},
		{"2 photos 4 h apart, 2 s apart in offset: the issue's 736.6 s/day case", pts(2, 4*time.Hour, 0), false, "only 2 photos"},
		{"4 photos: Sen's rank M1 = (6 − 5.77)/2 rounds to 0 (hand check)", pts(4, 24*time.Hour, 1), false, "at least 5"},
		{"6 photos in 50 minutes: interval hundreds of s/day wide (hand check: 4 s / 0.03 day)", pts(6, 10*time.Minute, 0), false, "too wide"},
		{"8 photos over a week at 1 s/day: drift stated (simulation)", pts(8, 24*time.Hour, 1), true, ""},
		{"6 photos over 5 days, every offset the same: Sen's Var(S) is 0 once the y ties are taken out (Sen 1968 eq. 2.6)", same(6), false, "tie"},
	}
	for _, c := range cases {
		m, err := Fit(c.points, Options{})
		if err != nil {
			t.Fatal(err)
		}
		s := m.Segments[0]
		if s.DriftMeasured != c.measured || !strings.Contains(s.DriftReason, c.reason) {
			t.Errorf("%s: measured %v reason %q", c.source, s.DriftMeasured, s.DriftReason)
		}
		if !c.measured && s.DriftSecPerDay != 0 {
			t.Errorf("%s: a drift of %v s/day is used although none is stated", c.source, s.DriftSecPerDay)
		}
		if s.OffsetHalf95Sec <= 0 {
			t.Errorf("%s: offset without an interval", c.source)
		}
	}
}

// TestDriftIntervalCoverage: Sen's 95 % interval holds the true drift in
// 93–97 % of 1,000 simulated cameras (simulation: truth known by
// construction; 12 photos over 30 days, 3 s noise, true drift 1.7 s/day).
func TestDriftIntervalCoverage(t *testing.T) {
	const runs, truth = 1000, 1.7
	in := 0
	for seed := uint64(1); seed <= runs; seed++ {
		m, err := Fit(simulate(seed, 12, 30, -20, truth, 3), Options{})
		if err != nil {
			t.Fatal(err)
		}
		s := m.Segments[0]
		if !s.DriftMeasured {
			t.Fatalf("seed %d: %s", seed, s.DriftReason)
		}
		if s.DriftLowSecPerDay <= truth && truth <= s.DriftHighSecPerDay {
			in++
		}
	}
	cov := float64(in) / runs
	t.Logf("drift interval coverage %.3f over %d simulated cameras", cov, runs)
	if cov < 0.93 || cov > 0.97 {
		t.Errorf("coverage %.3f outside 0.93–0.97", cov)
	}
}

// TestFactoryReset: a camera whose clock fell back to 2000-01-01 partway
// through the batch. The reset is named by the first photo after it, the
// factory-dated photos are not corrected by the set clock's model, and the
// set clock is fitted from its own photos only (issue 19: the old model put
// the reset photos into the first segment, found no reset and gave 153 s/day).
func TestFactoryReset(t *testing.T) {
	var pts []Point
	for i := 0; i < 6; i++ {
		name := "DSC_" + string(rune('0'+i)) + ".JPG"
		pts = append(pts, Point{Key: name, FileName: name, Reading: epoch.Add(time.Duration(i) * 3 * time.Hour),
			HasEvidence: true, OffsetSec: 7200 + float64(i%3), HalfWidth95Sec: 5})
	}
	for i := 6; i < 9; i++ {
		name := "DSC_" + string(rune('0'+i)) + ".JPG"
		pts = append(pts, Point{Key: name, FileName: name, Reading: time.Date(2000, 1, 1, 0, 2+i, 0, 0, time.UTC)})
	}
	m, err := Fit(pts, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(m.Resets) != 1 || !m.Resets[0].Factory || m.Resets[0].After != "DSC_6.JPG" || m.Resets[0].Before != "DSC_5.JPG" ||
		!m.Resets[0].Epoch.Equal(time.Date(2000, 1, 1, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("resets %+v, want one fall-back to 2000-01-01 after DSC_5 (hand-built case)", m.Resets)
	}
	for i := 6; i < 9; i++ {
		if p := m.Photos[i]; !p.Factory || p.Segment != -1 || !p.Corrected.IsZero() {
			t.Errorf("%s: %+v, want a factory reading left uncorrected", p.Key, p)
		}
	}
	if len(m.Segments) != 1 || m.Segments[0].Points != 6 || math.Abs(m.Segments[0].OffsetSec-7201) > 1 {
		t.Errorf("segments %+v, want one of the 6 set photos at +7201 s", m.Segments)
	}
	// Unnumbered: the fall-back follows the last set reading.
	for i := range pts {
		pts[i].FileName = ""
	}
	m, _ = Fit(pts, Options{})
	if len(m.Resets) != 1 || m.Resets[0].Before != "DSC_5.JPG" || m.Resets[0].After != "DSC_6.JPG" {
		t.Errorf("unnumbered: resets %+v", m.Resets)
	}
	// Readings near a factory date (common practice of the trade).
	for _, c := range []struct {
		reading time.Time
		want    bool
	}{
		{time.Date(2000, 1, 1, 0, 4, 0, 0, time.UTC), true},
		{time.Date(1970, 1, 1, 0, 0, 12, 0, time.UTC), true},
		{time.Date(1980, 1, 3, 9, 0, 0, 0, time.UTC), true},
		{time.Date(1999, 12, 31, 15, 5, 0, 0, time.UTC), true}, // 2000-01-01 00:05 at UTC+09:00
		{time.Date(1999, 12, 30, 23, 59, 0, 0, time.UTC), false},
		{time.Date(2000, 3, 1, 0, 4, 0, 0, time.UTC), false},
		{time.Date(2026, 1, 1, 0, 4, 0, 0, time.UTC), false},
	} {
		if _, ok := FactoryEpoch(c.reading); ok != c.want {
			t.Errorf("FactoryEpoch(%v) = %v, want %v", c.reading, ok, c.want)
		}
	}
}

// TestSegmentZone: a camera kept on its home time (UTC+1) while carried one
// and two zones east has one clock; the witnesses pick the zone it is set
// to among the places' offsets (the only one within 15 min plus the
// interval). Witnesses too wide to tell zones apart, two candidates within
// reach, or none, leave it undecided (hand-built cases).
func TestSegmentZone(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	build := func(zones [][]int, half float64) []Point {
		var pts []Point
		for i, z := range zones {
			pts = append(pts, Point{Key: string(rune('a' + i)), Reading: epoch.Add(time.Duration(i) * 6 * time.Hour),
				Zones: z, HasEvidence: true, OffsetSec: 3600 + r.NormFloat64()*half/4, HalfWidth95Sec: half})
		}
		return pts
	}
	cases := []struct {
		source  string
		zones   [][]int
		half    float64
		decided bool
	}{
		{"GPS clock, home then one zone east", [][]int{{3600}, {3600}, {7200}, {7200}, {7200}, {3600}}, 3, true},
		{"GPS clock, home, one and two zones east", [][]int{{3600}, {7200}, {10800}, {10800}, {7200}, {3600}}, 3, true},
		{"GPS clock, both places half an hour from its setting (UTC+00:30 and +01:30): neither within 15 min", [][]int{{1800}, {5400}}, 3, false},
		{"two shadow photos ±83 min: cannot tell +1 h from +2 h", [][]int{{3600}, {7200}}, 5000, false},
		{"a clock 10 min fast on UTC+00:50 (hand-built): within the 15 min a quartz clock drifts in a year", [][]int{{3000}, {3000}, {3000}}, 3, true},
		{"a clock 3 h from every place's offset (a camera on another continent's time): undecided", [][]int{{-7200}, {-7200}, {-7200}}, 3, false},
	}
	for _, c := range cases {
		m, err := Fit(build(c.zones, c.half), Options{})
		if err != nil {
			t.Fatal(err)
		}
		if len(m.Segments) != 1 {
			t.Errorf("%s: %d segments, want one clock", c.source, len(m.Segments))
			continue
		}
		s := m.Segments[0]
		if s.Zone.Decided != c.decided || (c.decided && s.Zone.OffsetSec != c.zones[0][0]) {
			t.Errorf("%s: zone %+v", c.source, s.Zone)
		}
		for _, p := range m.Photos {
			if p.Outlier {
				t.Errorf("%s: %s flagged", c.source, p.Key)
			}
		}
	}
}

// TestOrderAcrossFallBack: a phone that follows the place's clock takes
// IMG_0001 at 01:50 EDT and IMG_0002 30 minutes later at 01:20 EST
// (New York, 2025-11-02; tz database). The readings step back, the
// instants do not: no break. Without the second reading of the repeated
// hour the pair would be a break.
func TestOrderAcrossFallBack(t *testing.T) {
	wall := func(h, m int) time.Time { return time.Date(2025, 11, 2, h, m, 0, 0, time.UTC) }
	a := Point{Key: "IMG_0001.JPG", FileName: "IMG_0001.JPG", Reading: wall(1, 50), Instants: []time.Time{wall(5, 50)}}
	b := Point{Key: "IMG_0002.JPG", FileName: "IMG_0002.JPG", Reading: wall(1, 20), Instants: []time.Time{wall(5, 20), wall(6, 20)}}
	if m, _ := Fit([]Point{a, b}, Options{}); len(m.OrderBreaks) != 0 {
		t.Errorf("across the repeated hour: %+v", m.OrderBreaks)
	}
	b.Instants = b.Instants[:1]
	if m, _ := Fit([]Point{a, b}, Options{}); len(m.OrderBreaks) != 1 {
		t.Errorf("one reading only: %+v, want the break", m.OrderBreaks)
	}
}
