package clock

import (
	"container/heap"
	"errors"
	"fmt"
	"math"
	"sort"
	"time"
)

// ErrNoEvidence marks a camera none of whose photos has independent
// evidence: no clock model can be fitted (order checks still run).
var ErrNoEvidence = errors.New("no photo of this camera has independent time evidence")

const secPerDay = 86400.0

// Point is one photo of one camera, in the clock's own time scale.
type Point struct {
	Key string // the photo's path, as reports name it
	// Reading is what the clock showed: the capture time's digits as
	// written, held in a time.Time labelled UTC. It is not an instant: the
	// clock may be set to any zone, and a camera carried to another zone
	// keeps showing its home time. The model is fitted on this scale, so a
	// travelling camera has one clock, one offset and one drift.
	Reading time.Time
	// Instants are the instants the capture time stands for when read in
	// the place's zone (or its offset tag): the one used first, then any
	// other reading of a repeated hour. The order check uses them.
	Instants []time.Time
	// Zones are the UTC offsets (seconds) this photo suggests its clock may
	// be set to: the offset the place kept at that moment, the offset tag.
	Zones []int
	// HasEvidence says OffsetSec and HalfWidth95Sec are set: the photo has an
	// independent time (shadows, GPS clock, ...).
	HasEvidence bool
	// OffsetSec is the reading minus the evidence's instant, seconds: the
	// clock's zone offset plus its error.
	OffsetSec      float64
	HalfWidth95Sec float64 // half-width of OffsetSec's 95 % interval, ≥ 0
	// FileName is the file's base name for the order check ("" to skip).
	FileName string
}

// Options tune Fit; zero fields take the defaults named beside them.
type Options struct {
	OutlierK          float64       // robust σ beyond which a point may be an outlier; default 4
	ResetK            float64       // robust σ a step must exceed to be a reset; default 6
	MinStep           time.Duration // smallest step called a reset; default 60 s
	MinSegment        int           // evidence points needed on each side of a reset; default 3
	AssumedDriftBound float64       // s/day assumed when the data give no drift interval; default 2
	// MaxDriftHalfWidth is the widest drift interval (half-width, s/day)
	// still stated as a drift; default 100 s/day (about 1,200 ppm, sixty
	// times a quartz crystal's tolerance). A wider one says only that the
	// photos span too short a time to tell.
	MaxDriftHalfWidth float64
}

func (o Options) withDefaults() Options {
	if o.OutlierK <= 0 {
		o.OutlierK = 4
	}
	if o.ResetK <= 0 {
		o.ResetK = 6
	}
	if o.MinStep <= 0 {
		o.MinStep = 60 * time.Second
	}
	if o.MinSegment <= 0 {
		o.MinSegment = 3
	}
	if o.AssumedDriftBound <= 0 {
		o.AssumedDriftBound = 2
	}
	if o.MaxDriftHalfWidth <= 0 {
		o.MaxDriftHalfWidth = 100
	}
	return o
}

// zoneSlackSec is how far from a zone's offset a clock may be and still be
// read as set to that zone: 15 minutes, about a year of a consumer quartz
// clock's drift (common practice; the bound the report uses for an
// ordinary clock error).
const zoneSlackSec = 900

// Segment is the clock model between two resets.
type Segment struct {
	First, Last time.Time // readings of the segment's first and last evidence point
	Points      int       // evidence points in the segment
	T0          time.Time // reference reading: the median reading of the evidence
	// OffsetSec is the reading minus the true instant at T0, seconds: the
	// zone offset the clock is set to plus its error (see Zone).
	OffsetSec float64
	// OffsetHalf95Sec is the half-width of the offset's 95 % interval.
	OffsetHalf95Sec float64
	// DriftSecPerDay is how many seconds the clock gains per day when
	// DriftMeasured; otherwise 0, and DriftLow/High are ± the assumed
	// bound (Options.AssumedDriftBound) used only to widen predictions.
	DriftSecPerDay float64
	// DriftLowSecPerDay and DriftHighSecPerDay bound the drift's 95 %
	// interval (Sen's interval when DriftMeasured).
	DriftLowSecPerDay, DriftHighSecPerDay float64
	DriftMeasured                         bool
	// DriftReason says, in plain words, why no drift is stated when
	// DriftMeasured is false.
	DriftReason string
	SigmaSec    float64 // robust scatter of the residuals, 1σ
	Zone        Zone    // the zone the clock was set to, as far as the witnesses tell
}

// Zone is the verdict on which UTC offset a segment's clock was set to.
type Zone struct {
	// Candidates are the offsets (seconds) the segment's photos suggest,
	// ascending: the places' offsets and any offset tags.
	Candidates []int
	// OffsetSec is the one the witnesses support when Decided: the only
	// candidate the clock's offset lies within its 95 % interval plus
	// zoneSlackSec (15 min) of.
	OffsetSec int
	Decided   bool
}

// ErrorSec is the clock's error at T0 against the zone it is set to: the
// segment offset minus the decided zone offset, or minus 0 (against UTC)
// when the zone is undecided.
func (s Segment) ErrorSec() float64 { return s.OffsetSec - float64(s.Zone.OffsetSec) }

// DriftPPM is the drift in parts per million: s/day ÷ 86400 s × 10⁶.
func (s Segment) DriftPPM() float64 { return s.DriftSecPerDay / secPerDay * 1e6 }

// OffsetAt is the modelled offset (reading minus true) at reading t,
// with the half-width of its 95 % interval.
func (s Segment) OffsetAt(t time.Time) (offsetSec, half95Sec float64) {
	days := t.Sub(s.T0).Seconds() / secPerDay
	slopeHalf := math.Max(s.DriftHighSecPerDay-s.DriftSecPerDay, s.DriftSecPerDay-s.DriftLowSecPerDay)
	return s.OffsetSec + s.DriftSecPerDay*days, math.Hypot(s.OffsetHalf95Sec, slopeHalf*days)
}

// Photo is the model's finding for one input point.
type Photo struct {
	Key     string
	Segment int // index into Model.Segments; −1 when the photo lies between segments
	// Corrected is the reading minus the modelled offset, with the
	// half-width of its 95 % interval; zero when Segment is −1.
	Corrected   time.Time
	HalfWidth95 time.Duration
	// ResidualSec is the evidence offset minus the model (evidence points only).
	ResidualSec float64
	// Others is how many other evidence points of the photo's segment the
	// model rests on: below MinOthers the model cannot test this photo.
	Others int
	// Outlier marks evidence that disagrees with its camera's model beyond
	// both the robust scatter and the stated uncertainties: a possible edit,
	// or a wrong measurement. It is a flag for review, not a finding of edit.
	Outlier bool
	// Factory marks a reading at a camera's factory default date (see
	// FactoryEpoch): the clock had lost its setting.
	Factory bool
}

// MinOthers is how many other witnessed photos of the same clock segment a
// photo needs before the model may say it agrees or conflicts: with fewer,
// the "model" is one or two photos, a witness no stronger than the photo's
// own.
const MinOthers = 3

// Reset is a step in the clock between two evidence points adjacent in
// reading, or a fall-back to a factory default date.
type Reset struct {
	Before, After string // keys of the last point before and the first after
	// StepSec is the later segment's offset minus the earlier segment's
	// model extrapolated to the later segment's T0 (0 for a factory reset).
	StepSec float64
	// Factory is set when the clock fell back to a factory default date
	// (FactoryEpoch); Epoch is that date.
	Factory bool
	Epoch   time.Time
}

// Model is one camera's clock model.
type Model struct {
	Segments    []Segment
	Photos      []Photo // one per input point, in input order
	Resets      []Reset
	OrderBreaks []OrderBreak
}

// Fit models the clock of one camera from its points (see the package doc
// for the methods). When no point has evidence it returns ErrNoEvidence with
// a Model that still holds the order breaks, uncorrected photos and any
// fall-back to a factory date.
func Fit(points []Point, opt Options) (Model, error) {
	opt = opt.withDefaults()
	m := Model{Photos: make([]Photo, len(points))}
	for i, p := range points {
		if p.HasEvidence && (math.IsNaN(p.OffsetSec) || math.IsInf(p.OffsetSec, 0) || !(p.HalfWidth95Sec >= 0) || math.IsInf(p.HalfWidth95Sec, 0)) {
			return Model{}, fmt.Errorf("clock: point %q: offset %v ± %v is not a finite measurement", p.Key, p.OffsetSec, p.HalfWidth95Sec)
		}
		_, factory := FactoryEpoch(p.Reading)
		m.Photos[i] = Photo{Key: p.Key, Segment: -1, Factory: factory}
	}
	m.OrderBreaks = orderBreaks(points)

	// Readings at a factory date and the others are two clocks: each group
	// is segmented and fitted on its own, and photos of one group are never
	// corrected by the other's model.
	var evSet, evFactory []int
	for i, p := range points {
		if p.HasEvidence {
			if m.Photos[i].Factory {
				evFactory = append(evFactory, i)
			} else {
				evSet = append(evSet, i)
			}
		}
	}
	m.Resets = factoryResets(points, m.Photos)
	byReading := func(ev []int) {
		sort.SliceStable(ev, func(a, b int) bool { return points[ev[a]].Reading.Before(points[ev[b]].Reading) })
	}
	byReading(evSet)
	byReading(evFactory)
	for g, ev := range [][]int{evSet, evFactory} {
		if len(ev) == 0 {
			continue
		}
		first := len(m.Segments)
		for _, seg := range split(points, ev, opt) {
			s := fitSegment(points, seg, opt)
			k := len(m.Segments)
			if k > first {
				prev := m.Segments[k-1]
				m.Resets = append(m.Resets, Reset{
					Before: points[lastOf(points, m.Photos, k-1)].Key,
					After:  points[seg[0]].Key,
					StepSec: s.OffsetSec - prev.OffsetSec -
						prev.DriftSecPerDay*s.T0.Sub(prev.T0).Seconds()/secPerDay,
				})
			}
			m.Segments = append(m.Segments, s)
			for _, i := range seg {
				m.Photos[i].Segment = k
				m.Photos[i].Others = len(seg) - 1
				off, h := s.OffsetAt(points[i].Reading)
				r := points[i].OffsetSec - off
				m.Photos[i].ResidualSec = r
				m.Photos[i].Outlier = math.Abs(r) > opt.OutlierK*s.SigmaSec && math.Abs(r) > points[i].HalfWidth95Sec+h
			}
		}
		// Photos without evidence join the segment of their own group whose
		// evidence span holds their reading; before the first or after the
		// last span they join that end segment; between two spans, or inside
		// two, they stay unassigned.
		for i, p := range points {
			if p.HasEvidence || m.Photos[i].Factory != (g == 1) {
				continue
			}
			if k := assign(m.Segments[first:], p.Reading); k >= 0 {
				m.Photos[i].Segment = first + k
			}
		}
	}
	// The zones each segment's photos suggest, gathered in one pass.
	cands := make([]map[int]bool, len(m.Segments))
	for i, p := range points {
		if k := m.Photos[i].Segment; k >= 0 {
			if cands[k] == nil {
				cands[k] = map[int]bool{}
			}
			for _, c := range p.Zones {
				cands[k][c] = true
			}
		}
	}
	for k := range m.Segments {
		m.Segments[k].Zone = segmentZone(cands[k], m.Segments[k])
	}
	for i, p := range points {
		k := m.Photos[i].Segment
		if k < 0 {
			continue
		}
		off, h := m.Segments[k].OffsetAt(p.Reading)
		m.Photos[i].Corrected = p.Reading.Add(-secDuration(off))
		m.Photos[i].HalfWidth95 = secDuration(h)
	}
	if len(evSet)+len(evFactory) == 0 {
		return m, ErrNoEvidence
	}
	return m, nil
}

// segmentZone decides which of the zone offsets suggested by a segment's
// photos its clock was set to: the only one its offset's 95 % interval,
// widened by zoneSlackSec, reaches. Two candidates a quarter or half hour
// apart may both be reached, and a wide interval reaches several: then, as
// for a clock off by more than a quarter hour from every candidate, the
// zone is undecided.
func segmentZone(cands map[int]bool, s Segment) Zone {
	var z Zone
	for c := range cands {
		z.Candidates = append(z.Candidates, c)
	}
	sort.Ints(z.Candidates)
	fits := 0
	for _, c := range z.Candidates {
		if math.Abs(s.OffsetSec-float64(c)) <= s.OffsetHalf95Sec+zoneSlackSec {
			fits++
			z.OffsetSec = c
		}
	}
	if fits != 1 {
		z.OffsetSec = 0
		return z
	}
	z.Decided = true
	return z
}

// lastOf returns the index of the latest-read point assigned to segment k.
func lastOf(points []Point, photos []Photo, k int) int {
	best := -1
	for i, ph := range photos {
		if ph.Segment == k && (best < 0 || points[i].Reading.After(points[best].Reading)) {
			best = i
		}
	}
	return best
}

func secDuration(s float64) time.Duration {
	return time.Duration(math.Round(s * float64(time.Second)))
}

// assign returns the index in segs of the segment a reading t belongs to,
// or −1 (see Fit).
func assign(segs []Segment, t time.Time) int {
	if len(segs) == 0 {
		return -1
	}
	var in []int
	for k, s := range segs {
		if !t.Before(s.First) && !t.After(s.Last) {
			in = append(in, k)
		}
	}
	if len(in) == 1 {
		return in[0]
	}
	if len(in) > 1 {
		return -1
	}
	first, last := 0, 0
	for k, s := range segs {
		if s.First.Before(segs[first].First) {
			first = k
		}
		if s.Last.After(segs[last].Last) {
			last = k
		}
	}
	if t.Before(segs[first].First) {
		return first
	}
	if t.After(segs[last].Last) {
		return last
	}
	return -1
}

// xy returns days since the first point and offsets for the given points.
func xy(points []Point, idx []int) (x, y []float64) {
	x = make([]float64, len(idx))
	y = make([]float64, len(idx))
	t0 := points[idx[0]].Reading
	for k, i := range idx {
		x[k] = points[i].Reading.Sub(t0).Seconds() / secPerDay
		y[k] = points[i].OffsetSec
	}
	return x, y
}

// ownSigma is the median of the points' own 1σ (half-width / 1.96).
func ownSigma(points []Point, idx []int) float64 {
	s := make([]float64, len(idx))
	for k, i := range idx {
		s[k] = points[i].HalfWidth95Sec / z975
	}
	return median(s)
}

// residuals of a Theil–Sen fit over idx; slope 0 when it cannot be formed.
func residuals(points []Point, idx []int) []float64 {
	x, y := xy(points, idx)
	l, err := TheilSen(x, y)
	if err != nil {
		l = Line{Intercept: median(y)}
	}
	r := make([]float64, len(idx))
	for k := range idx {
		r[k] = y[k] - (l.Intercept + l.Slope*x[k])
	}
	return r
}

// split performs the binary segmentation described in the package doc on
// idx (evidence indices sorted by claimed time).
func split(points []Point, idx []int, opt Options) [][]int {
	if len(idx) < 2*opt.MinSegment {
		return [][]int{idx}
	}
	r := residuals(points, idx)
	d := make([]float64, len(r)-1)
	for k := range d {
		d[k] = r[k+1] - r[k]
	}
	sigma := math.Max(madToSigma*mad(d)/math.Sqrt2, ownSigma(points, idx))
	threshold := math.Max(opt.MinStep.Seconds(), opt.ResetK*sigma)
	bestK, bestStep := -1, 0.0
	before, after := runningMedians(r)
	for k := opt.MinSegment; k <= len(idx)-opt.MinSegment; k++ {
		step := math.Abs(after[k] - before[k])
		if step > bestStep {
			bestK, bestStep = k, step
		}
	}
	if bestK < 0 || bestStep <= threshold {
		return [][]int{idx}
	}
	return append(split(points, idx[:bestK], opt), split(points, idx[bestK:], opt)...)
}

func fitSegment(points []Point, idx []int, opt Options) Segment {
	x, y := xy(points, idx)
	s := Segment{First: points[idx[0]].Reading, Last: points[idx[len(idx)-1]].Reading, Points: len(idx)}
	x0 := median(x)
	s.T0 = s.First.Add(secDuration(x0 * secPerDay))
	l, err := TheilSen(x, y)
	switch {
	case (err != nil || !l.CI) && distinctReadings(points, idx) < 5:
		s.DriftReason = fmt.Sprintf("%s: a drift and its 95 %% interval need at least 5 at different times", photoCount(len(idx)))
	case err != nil || !l.CI:
		// Sen's variance is zero when every offset ties: no interval.
		s.DriftReason = fmt.Sprintf("the offsets of the %d photos with a time witness tie, which leaves Sen's interval undefined", len(idx))
	case (l.High-l.Low)/2 > opt.MaxDriftHalfWidth:
		s.DriftReason = fmt.Sprintf("its 95 %% interval would be %+.0f to %+.0f s/day, too wide to say anything about a clock (the %d photos with a time witness span %s)",
			l.Low, l.High, len(idx), spanText(s.Last.Sub(s.First)))
	default:
		s.DriftSecPerDay, s.DriftLowSecPerDay, s.DriftHighSecPerDay, s.DriftMeasured = l.Slope, l.Low, l.High, true
	}
	if !s.DriftMeasured {
		// No drift is stated; predictions away from T0 are widened by the
		// drift a working quartz clock may have.
		s.DriftLowSecPerDay, s.DriftHighSecPerDay = -opt.AssumedDriftBound, opt.AssumedDriftBound
	}
	r := make([]float64, len(idx))
	for k := range idx {
		r[k] = y[k] - s.DriftSecPerDay*(x[k]-x0)
	}
	s.OffsetSec = median(r)
	for k := range r {
		r[k] -= s.OffsetSec
	}
	s.SigmaSec = math.Max(madToSigma*mad(r), ownSigma(points, idx))
	// Standard error of a median of n normal errors: √(π/2)·σ/√n.
	s.OffsetHalf95Sec = z975 * math.Sqrt(math.Pi/2) * s.SigmaSec / math.Sqrt(float64(len(idx)))
	return s
}

// distinctReadings counts the different readings among points idx.
func distinctReadings(points []Point, idx []int) int {
	seen := map[time.Time]bool{}
	for _, i := range idx {
		seen[points[i].Reading] = true
	}
	return len(seen)
}

func photoCount(n int) string {
	if n == 1 {
		return "only 1 photo has a time witness"
	}
	return fmt.Sprintf("only %d photos have a time witness", n)
}

// spanText is a duration in the largest whole unit a reader needs.
func spanText(d time.Duration) string {
	switch {
	case d >= 48*time.Hour:
		return fmt.Sprintf("%.0f days", d.Hours()/24)
	case d >= 2*time.Hour:
		return fmt.Sprintf("%.0f hours", d.Hours())
	default:
		return fmt.Sprintf("%.0f minutes", d.Minutes())
	}
}

// runningMedians returns before[k] = median(r[:k]) and after[k] =
// median(r[k:]) for every k (NaN where empty), in O(n log n) with two heaps
// rather than a sort per split (O(n² log n)); the values are the same as
// median's, bit for bit.
func runningMedians(r []float64) (before, after []float64) {
	n := len(r)
	before, after = make([]float64, n+1), make([]float64, n+1)
	var rm runMedian
	before[0] = math.NaN()
	for k := 0; k < n; k++ {
		rm.add(r[k])
		before[k+1] = rm.median()
	}
	rm = runMedian{}
	after[n] = math.NaN()
	for k := n - 1; k >= 0; k-- {
		rm.add(r[k])
		after[k] = rm.median()
	}
	return before, after
}

// runMedian keeps the lower half of the values in a max-heap and the upper
// half in a min-heap; the lower half holds the extra value of an odd count.
type runMedian struct{ low, high floatHeap }

func (m *runMedian) add(v float64) {
	if m.low.Len() == 0 || v <= -m.low[0] {
		heap.Push(&m.low, -v) // negated: a max-heap on a min-heap
	} else {
		heap.Push(&m.high, v)
	}
	switch {
	case m.low.Len() > m.high.Len()+1:
		heap.Push(&m.high, -heap.Pop(&m.low).(float64))
	case m.high.Len() > m.low.Len():
		heap.Push(&m.low, -heap.Pop(&m.high).(float64))
	}
}

func (m *runMedian) median() float64 {
	if m.low.Len() > m.high.Len() {
		return -m.low[0]
	}
	return (-m.low[0] + m.high[0]) / 2
}

type floatHeap []float64

func (h floatHeap) Len() int           { return len(h) }
func (h floatHeap) Less(i, j int) bool { return h[i] < h[j] }
func (h floatHeap) Swap(i, j int)      { h[i], h[j] = h[j], h[i] }
func (h *floatHeap) Push(x any)        { *h = append(*h, x.(float64)) }
func (h *floatHeap) Pop() any {
	old := *h
	v := old[len(old)-1]
	*h = old[:len(old)-1]
	return v
}
