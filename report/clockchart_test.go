package report

import (
	"bytes"
	"strconv"
	"strings"
	"testing"
	"time"
)

// TestClockChartSegments: a camera whose clock was reset between two
// segments gets one fitted line per segment, over that segment's points
// only, and a dashed reset line between them (issue 19: "the chart shows
// the break"). A camera without segments keeps one line over all points.
// Hand-built cases.
func TestClockChartSegments(t *testing.T) {
	day := time.Date(2026, 1, 10, 12, 0, 0, 0, time.UTC)
	var pts []ClockPoint
	for i := range 8 {
		seg, off := 0, 5.0
		if i >= 4 {
			seg, off = 1, 3605
		}
		ts := day.Add(time.Duration(i) * 24 * time.Hour).Format(time.RFC3339)
		pts = append(pts, ClockPoint{Path: "p", ClaimedUTC: ts, OffsetS: off, LowS: off - 5, HighS: off + 5, Segment: seg})
	}
	f := func(v float64) *float64 { return &v }
	c := Camera{ID: "x", OffsetS: f(5), Points: pts, Segments: []ClockSegment{
		{OffsetS: f(5), OffsetAtUTC: pts[1].ClaimedUTC},
		{OffsetS: f(3605), OffsetAtUTC: pts[5].ClaimedUTC},
	}}
	ch := buildClock(c).Chart
	if ch == nil {
		t.Fatal("no chart")
	}
	if n := strings.Count(ch.Line, "M"); n != 2 {
		t.Errorf("line %q: %d pieces, want one per segment", ch.Line, n)
	}
	if len(ch.Breaks) != 1 {
		t.Fatalf("breaks %v, want one reset", ch.Breaks)
	}
	// The break lies between the 4th and 5th points.
	x3, x4, xb := num(t, ch.Points[3].X), num(t, ch.Points[4].X), num(t, ch.Breaks[0])
	if !(x3 < xb && xb < x4) {
		t.Errorf("break at x=%v, not between %v and %v", xb, x3, x4)
	}

	c.Segments = nil
	ch = buildClock(c).Chart
	if n := strings.Count(ch.Line, "M"); n != 1 || len(ch.Breaks) != 0 {
		t.Errorf("without segments: line %q, breaks %v", ch.Line, ch.Breaks)
	}
}

func num(t *testing.T, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatalf("%q: %v", s, err)
	}
	return v
}

// TestCameraClockText: the chart header states the clock's zone, its error
// with the 95 % interval and the drift with its interval, rounded by the
// one rule (GUM §7.2.6: two significant digits of the uncertainty; hand
// checks), or says the drift is not determined.
func TestCameraClockText(t *testing.T) {
	f := func(v float64) *float64 { return &v }
	cases := []struct {
		source string
		c      Camera
		want   string
	}{
		{"drift 4.4 ± 8.5 s/day: tenths", Camera{ClockZone: "UTC-04:00", OffsetS: f(580), OffsetLowS: f(440), OffsetHighS: f(710),
			DriftSPerDay: f(4.4), DriftLowSPerDay: f(-4.6), DriftHighSPerDay: f(12.1)},
			"clock on UTC-04:00, off by +9 min 40 s (95 % +7 min 20 s to +11 min 50 s) · drift 4.4 s/day (95 % −4.6 to 12.1)"},
		{"no drift stated", Camera{OffsetS: f(-25360), OffsetLowS: f(-25620), OffsetHighS: f(-25090)},
			"zone setting undecided, off UTC by −7 h 02 min 40 s (95 % −7 h 07 min 00 s to −6 h 58 min 10 s) · drift not determined"},
		{"no model", Camera{}, "no offset modelled · drift not determined"},
	}
	for _, c := range cases {
		if got := cameraClockText(c.c); got != c.want {
			t.Errorf("%s:\n got %s\nwant %s", c.source, got, c.want)
		}
	}
}

// TestClockResetInEveryFormat: the first photo after a clock reset says so
// in report.json, report.csv and report.geojson (issue 19: "resets names the
// first photo after each break, in all report formats").
func TestClockResetInEveryFormat(t *testing.T) {
	lat, lon := 48.8566, 2.3522
	note := "The clock fell back to its factory date (2000-01-01) between trip/DSC_0003.JPG and trip/DSC_0004.JPG."
	a := &Audit{Schema: SchemaID, Photos: []Photo{{Path: "DSC_0004.JPG", Verdict: "season_mismatch", Lat: &lat, Lon: &lon, ClockReset: note}}, Cameras: []Camera{}}
	for name, write := range map[string]func(*bytes.Buffer) error{
		"report.json":    func(b *bytes.Buffer) error { return WriteJSON(b, a) },
		"report.csv":     func(b *bytes.Buffer) error { return WriteCSV(b, a) },
		"report.geojson": func(b *bytes.Buffer) error { return WriteGeoJSON(b, a) },
	} {
		var b bytes.Buffer
		if err := write(&b); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if !strings.Contains(b.String(), "factory date (2000-01-01) between trip/DSC_0003.JPG") {
			t.Errorf("%s does not carry the reset note:\n%s", name, b.String())
		}
	}
}
