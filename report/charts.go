package report

import (
	"fmt"
	"github.com/gnomon-forensics/gnomon/internal/angle"
	"github.com/gnomon-forensics/gnomon/internal/figure"
	"math"
	"slices"
	"strings"
	"time"
)

// The sky chart is a polar plot seen as on a map: north up, east right,
// azimuth clockwise from north, the zenith at the centre and altitude falling
// linearly to skyFloorDeg at the rim, so that a sun below the horizon (a night
// timestamp) still shows, inside the shaded band.
const (
	skySize     = 300.0
	skyC        = skySize / 2
	skyR        = 118.0
	skyFloorDeg = -20.0
)

type pt struct{ X, Y string }

type labelAt struct {
	X, Y, Text string
	Anchor     string // SVG text-anchor: "" (the class default), "start", "middle" or "end"
}

type wedge struct {
	D      string // the ±2σ area
	Axis   string // the measured azimuth, zenith to rim
	Dot    *pt    // the measured altitude, when there is one
	Object string
	Legend string
}

type skyChart struct {
	Size, C, R, Horizon string
	Rings               []labelAt // X holds the radius, Text the altitude label at (Y=label y)
	Spokes              []string  // path data of the 30° azimuth spokes
	Cardinals           []labelAt
	PathD               string
	Hours               []labelAt
	Claim               *pt
	ClaimRays           string
	Best                *pt
	Wedges              []wedge
	Notes               []string
}

func skyRadius(altDeg float64) float64 {
	altDeg = min(max(altDeg, skyFloorDeg), 90)
	return skyR * (90 - altDeg) / (90 - skyFloorDeg)
}

func skyXY(azDeg, r float64) (float64, float64) {
	a := angle.Rad(azDeg)
	return skyC + r*math.Sin(a), skyC - r*math.Cos(a)
}

func finite(xs ...float64) bool {
	for _, x := range xs {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}

// skyStatic is the part of the sky chart that is the same on every card.
func skyStatic() *skyChart {
	s := &skyChart{Size: f1(skySize), C: f1(skyC), R: f1(skyR), Horizon: f1(skyRadius(0))}
	for _, alt := range []float64{60, 30} {
		r := skyRadius(alt)
		s.Rings = append(s.Rings, labelAt{X: f1(r), Y: f1(skyC - r - 2), Text: fmt.Sprintf("%g°", alt)})
	}
	for az := 0.0; az < 360; az += 30 {
		x, y := skyXY(az, skyR)
		s.Spokes = append(s.Spokes, fmt.Sprintf("M%s %sL%s %s", f1(skyC), f1(skyC), f1(x), f1(y)))
	}
	for i, c := range []string{"N", "E", "S", "W"} {
		x, y := skyXY(float64(i)*90, skyR+12)
		s.Cardinals = append(s.Cardinals, labelAt{X: f1(x), Y: f1(y + 4), Text: c})
	}
	return s
}

// buildSky returns the polar sun chart for p, or nil when there is nothing to draw.
func buildSky(p Photo) *skyChart {
	if p.Sun == nil && len(p.SunPath) == 0 && len(p.Measured) == 0 && p.BestFit == nil {
		return nil
	}
	s := &skyChart{Size: f1(skySize), C: f1(skyC), R: f1(skyR), Horizon: f1(skyRadius(0))}
	// The day's track, broken where it dips under the chart's floor.
	var d strings.Builder
	pen := false
	for _, q := range p.SunPath {
		if !finite(q.Azimuth, q.Altitude) || q.Altitude < skyFloorDeg {
			pen = false
			continue
		}
		x, y := skyXY(q.Azimuth, skyRadius(q.Altitude))
		if pen {
			d.WriteString("L")
		} else {
			d.WriteString("M")
		}
		fmt.Fprintf(&d, "%s %s", f1(x), f1(y))
		pen = true
		if t, ok := parseUTC(q.Time); ok && t.Minute() == 0 && t.Second() == 0 {
			// A dot every hour, a label every second hour to keep the noon end legible.
			l := labelAt{X: f1(x), Y: f1(y)}
			if t.UTC().Hour()%2 == 0 {
				l.Text = t.UTC().Format("15")
			}
			s.Hours = append(s.Hours, l)
		}
	}
	s.PathD = d.String()
	if p.Sun != nil && finite(p.Sun.Azimuth, p.Sun.Altitude) {
		x, y := skyXY(p.Sun.Azimuth, skyRadius(p.Sun.Altitude))
		s.Claim = &pt{f1(x), f1(y)}
		var rays strings.Builder
		for k := range 8 {
			a := float64(k) * math.Pi / 4
			fmt.Fprintf(&rays, "M%s %sL%s %s", f1(x+8*math.Cos(a)), f1(y+8*math.Sin(a)), f1(x+12*math.Cos(a)), f1(y+12*math.Sin(a)))
		}
		s.ClaimRays = rays.String()
		if p.Sun.Altitude < 0 {
			s.Notes = append(s.Notes, fmt.Sprintf("At the claimed moment the sun was %s° below the horizon.", fmtNum(-p.Sun.Altitude, 1)))
		}
		if p.Sun.Altitude < skyFloorDeg {
			s.Notes = append(s.Notes, fmt.Sprintf("It is drawn on the rim of the chart, which stops at %g°.", skyFloorDeg))
		}
	}
	if p.BestFit != nil && finite(p.BestFit.Azimuth, p.BestFit.Altitude) {
		x, y := skyXY(p.BestFit.Azimuth, skyRadius(p.BestFit.Altitude))
		s.Best = &pt{f1(x), f1(y)}
	}
	for _, m := range p.Measured {
		if w, ok := buildWedge(m); ok {
			s.Wedges = append(s.Wedges, w)
		}
	}
	return s
}

// buildWedge draws a measured direction as the area azimuth ± 2σ (and, when
// the sheet gave an altitude, altitude ± 2σ), about a 95 % region for a
// normal error.
func buildWedge(m Measured) (wedge, bool) {
	if !finite(m.Azimuth, m.AzimuthSD, m.Altitude, m.AltitudeSD) {
		return wedge{}, false
	}
	half := min(max(2*math.Abs(m.AzimuthSD), 0.5), 179.5)
	a1, a2 := m.Azimuth-half, m.Azimuth+half
	rIn, rOut := 0.0, skyRadius(0)
	if m.HasAltitude {
		rIn = skyRadius(m.Altitude + 2*math.Abs(m.AltitudeSD))
		rOut = skyRadius(m.Altitude - 2*math.Abs(m.AltitudeSD))
	}
	large := 0
	if 2*half > 180 {
		large = 1
	}
	ox1, oy1 := skyXY(a1, rOut)
	ox2, oy2 := skyXY(a2, rOut)
	var d string
	if rIn < 0.5 {
		d = fmt.Sprintf("M%s %sL%s %sA%s %s 0 %d 1 %s %sZ", f1(skyC), f1(skyC), f1(ox1), f1(oy1),
			f1(rOut), f1(rOut), large, f1(ox2), f1(oy2))
	} else {
		ix1, iy1 := skyXY(a1, rIn)
		ix2, iy2 := skyXY(a2, rIn)
		d = fmt.Sprintf("M%s %sA%s %s 0 %d 1 %s %sL%s %sA%s %s 0 %d 0 %s %sZ",
			f1(ox1), f1(oy1), f1(rOut), f1(rOut), large, f1(ox2), f1(oy2),
			f1(ix2), f1(iy2), f1(rIn), f1(rIn), large, f1(ix1), f1(iy1))
	}
	ex, ey := skyXY(m.Azimuth, skyRadius(0))
	w := wedge{D: d, Axis: fmt.Sprintf("M%s %sL%s %s", f1(skyC), f1(skyC), f1(ex), f1(ey)), Object: m.Object}
	w.Legend = fmt.Sprintf("azimuth %s° ± %s°", fmtNum(m.Azimuth, 1), fmtNum(2*math.Abs(m.AzimuthSD), 1))
	if m.HasAltitude {
		x, y := skyXY(m.Azimuth, skyRadius(m.Altitude))
		w.Dot = &pt{f1(x), f1(y)}
		w.Legend += fmt.Sprintf(", altitude %s° ± %s°", fmtNum(m.Altitude, 1), fmtNum(2*math.Abs(m.AltitudeSD), 1))
	}
	return w, true
}

// The clock chart plots each photo's measured offset (claimed minus
// evidence) against its claimed time, with its interval, and the camera's
// fitted line.
const (
	clockW, clockH               = 860.0, 250.0
	clockL, clockR               = 118.0, 840.0
	clockT, clockB               = 16.0, 212.0
	clockMaxTicks                = 6
	secondsPerDay                = 86400.0
	minClockSpan   time.Duration = 2 * time.Hour
)

type clockPoint struct {
	X, Y, YLow, YHigh string
	Outlier           bool
	Title             string
}

type clockChart struct {
	W, H, L, R, T, B string
	YTicks           []labelAt
	XTicks           []labelAt
	Zero             string // y of the zero line, "" when out of range
	Line             string // the fitted clock of each segment, one path
	// Breaks are the x of each clock reset between two plotted segments.
	Breaks []string
	Points []clockPoint
}

type cameraView struct {
	C     Camera
	Chart *clockChart
}

func buildClock(c Camera) cameraView {
	type pv struct {
		t             time.Time
		off, lo, hi   float64
		outlier       bool
		path, claimed string
		seg           int
	}
	var pts []pv
	for _, q := range c.Points {
		t, ok := parseUTC(q.ClaimedUTC)
		if !ok || !finite(q.OffsetS, q.LowS, q.HighS) {
			continue
		}
		pts = append(pts, pv{t, q.OffsetS, min(q.LowS, q.HighS, q.OffsetS), max(q.LowS, q.HighS, q.OffsetS), q.Outlier, q.Path, q.ClaimedUTC, q.Segment})
	}
	if len(pts) == 0 {
		return cameraView{C: c}
	}
	slices.SortStableFunc(pts, func(a, b pv) int { return a.t.Compare(b.t) })
	t0, t1 := pts[0].t, pts[len(pts)-1].t
	if t1.Sub(t0) < minClockSpan {
		mid := t0.Add(t1.Sub(t0) / 2)
		t0, t1 = mid.Add(-minClockSpan/2), mid.Add(minClockSpan/2)
	}
	// The fitted lines: each segment's OffsetS at its OffsetAtUTC, sloping
	// by its drift (none when no drift is stated), drawn over the span of
	// its own points. A report without segments draws the camera's line
	// over every point.
	type fitLine struct {
		from, to time.Time
		at       func(time.Time) float64
	}
	lineOf := func(offset, drift *float64, at string, ref time.Time) func(time.Time) float64 {
		if offset == nil || !finite(*offset) {
			return nil
		}
		if r, ok := parseUTC(at); ok {
			ref = r
		}
		d := 0.0
		if drift != nil && finite(*drift) {
			d = *drift
		}
		off := *offset
		return func(t time.Time) float64 { return off + d*t.Sub(ref).Seconds()/secondsPerDay }
	}
	var lines []fitLine
	var breaks []time.Time
	if len(c.Segments) == 0 {
		if f := lineOf(c.OffsetS, c.DriftSPerDay, c.OffsetAtUTC, pts[len(pts)/2].t); f != nil {
			lines = append(lines, fitLine{t0, t1, f})
		}
	}
	prevLast := -1
	for k, sg := range c.Segments {
		first, last := -1, -1
		for i, q := range pts {
			if q.seg == k {
				if first < 0 {
					first = i
				}
				last = i
			}
		}
		if first < 0 {
			continue
		}
		if f := lineOf(sg.OffsetS, sg.DriftSPerDay, sg.OffsetAtUTC, pts[first].t); f != nil {
			lines = append(lines, fitLine{pts[first].t, pts[last].t, f})
		}
		if prevLast >= 0 {
			breaks = append(breaks, pts[prevLast].t.Add(pts[first].t.Sub(pts[prevLast].t)/2))
		}
		prevLast = last
	}
	lo, hi := pts[0].lo, pts[0].hi
	for _, q := range pts {
		lo, hi = min(lo, q.lo), max(hi, q.hi)
	}
	for _, l := range lines {
		lo, hi = min(lo, l.at(l.from), l.at(l.to)), max(hi, l.at(l.from), l.at(l.to))
	}
	step := niceStep(hi - lo)
	lo, hi = math.Floor(lo/step)*step, math.Ceil(hi/step)*step
	if hi-lo < step {
		lo, hi = lo-step, hi+step
	}
	xOf := func(t time.Time) float64 {
		return clockL + (clockR-clockL)*t.Sub(t0).Seconds()/t1.Sub(t0).Seconds()
	}
	yOf := func(v float64) float64 { return clockB - (clockB-clockT)*(v-lo)/(hi-lo) }
	ch := &clockChart{W: f1(clockW), H: f1(clockH), L: f1(clockL), R: f1(clockR), T: f1(clockT), B: f1(clockB)}
	for v := lo; v <= hi+step/2; v += step {
		ch.YTicks = append(ch.YTicks, labelAt{X: f1(clockL - 6), Y: f1(yOf(v)), Text: fmtTick(v)})
	}
	if lo <= 0 && hi >= 0 {
		ch.Zero = f1(yOf(0))
	}
	layout := "2006-01-02"
	if t1.Sub(t0) < 72*time.Hour {
		layout = "01-02 15:04"
	}
	for k := range 5 {
		t := t0.Add(time.Duration(float64(t1.Sub(t0)) * float64(k) / 4))
		l := labelAt{X: f1(xOf(t)), Y: f1(clockB + 18), Text: t.UTC().Format(layout)}
		if k == 4 {
			l.Anchor = "end" // keep the last date inside the chart
		}
		ch.XTicks = append(ch.XTicks, l)
	}
	for _, l := range lines {
		x0, x1 := xOf(l.from), xOf(l.to)
		if x1-x0 < 8 { // one point, or points close together: a short dash
			x0, x1 = x0-4, x1+4
		}
		if ch.Line != "" {
			ch.Line += " "
		}
		ch.Line += fmt.Sprintf("M%s %sL%s %s", f1(x0), f1(yOf(l.at(l.from))), f1(x1), f1(yOf(l.at(l.to))))
	}
	for _, b := range breaks {
		ch.Breaks = append(ch.Breaks, f1(xOf(b)))
	}
	for _, q := range pts {
		ch.Points = append(ch.Points, clockPoint{
			X: f1(xOf(q.t)), Y: f1(yOf(q.off)), YLow: f1(yOf(q.lo)), YHigh: f1(yOf(q.hi)), Outlier: q.outlier,
			Title: pointTitle(q.path, q.claimed, q.off, q.lo, q.hi),
		})
	}
	return cameraView{C: c, Chart: ch}
}

// niceStep picks a tick step (in seconds) on a human scale giving at most
// clockMaxTicks intervals over span.
func niceStep(span float64) float64 {
	steps := []float64{0.1, 0.2, 0.5, 1, 2, 5, 10, 15, 30, 60, 120, 300, 600, 900, 1800, 3600, 7200,
		10800, 21600, 43200, 86400, 172800, 432000, 864000}
	for _, s := range steps {
		if span/s <= clockMaxTicks {
			return s
		}
	}
	return math.Pow(10, math.Ceil(math.Log10(span/clockMaxTicks)))
}

// pointTitle is a clock chart point's tooltip: the photo and its offset
// with interval, rounded as its card rounds them (figure.Spans).
func pointTitle(path, claimed string, off, lo, hi float64) string {
	sec, low, high := figure.Spans(off, lo, hi)
	return fmt.Sprintf("%s — %s, offset %s (%s to %s)", Visible(path), Visible(claimed), sec, low, high)
}
