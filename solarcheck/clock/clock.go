package clock

import (
	"container/heap"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"math"
	"path"
	"sort"
	"strings"
	"time"
	"unicode"
	"unicode/utf8"
)

// ErrNoEvidence marks a camera none of whose photos has independent
// evidence: no clock model can be fitted (order checks still run).
var ErrNoEvidence = errors.New("no photo of this camera has independent time evidence")

const secPerDay = 86400.0

// Point is one photo of one camera.
type Point struct {
	Key        string    // the photo's path, as reports name it
	ClaimedUTC time.Time // the instant the camera's clock claimed
	// HasEvidence says OffsetSec and HalfWidth95Sec are set: the photo has an
	// independent time (shadows, GPS clock, ...).
	HasEvidence    bool
	OffsetSec      float64 // claimed minus evidence, seconds
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
	return o
}

// Segment is the clock model between two resets.
type Segment struct {
	First, Last time.Time // claimed times of the segment's first and last evidence point
	Points      int       // evidence points in the segment
	T0          time.Time // reference instant: the median claimed time of the evidence
	OffsetSec   float64   // clock offset at T0 (claimed minus true)
	// OffsetHalf95Sec is the half-width of the offset's 95 % interval.
	OffsetHalf95Sec float64
	DriftSecPerDay  float64 // how many seconds the clock gains per day
	// DriftLowSecPerDay and DriftHighSecPerDay bound the drift's 95 %
	// interval: Sen's interval when DriftMeasured, otherwise the drift ±
	// Options.AssumedDriftBound.
	DriftLowSecPerDay, DriftHighSecPerDay float64
	DriftMeasured                         bool
	SigmaSec                              float64 // robust scatter of the residuals, 1σ
}

// DriftPPM is the drift in parts per million: s/day ÷ 86400 s × 10⁶.
func (s Segment) DriftPPM() float64 { return s.DriftSecPerDay / secPerDay * 1e6 }

// OffsetAt is the modelled offset (claimed minus true) at claimed time t,
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
	// Corrected is the claimed instant minus the modelled offset, with the
	// half-width of its 95 % interval; zero when Segment is −1.
	Corrected   time.Time
	HalfWidth95 time.Duration
	// ResidualSec is the evidence offset minus the model (evidence points only).
	ResidualSec float64
	// Outlier marks evidence that disagrees with its camera's model beyond
	// both the robust scatter and the stated uncertainties: a possible edit,
	// or a wrong measurement. It is a flag for review, not a finding of edit.
	Outlier bool
}

// Reset is a step in the clock between two evidence points adjacent in
// claimed time.
type Reset struct {
	Before, After string // keys of the last point before and the first after
	// StepSec is the later segment's offset minus the earlier segment's
	// model extrapolated to the later segment's T0.
	StepSec float64
}

// OrderBreak is a pair of photos whose claimed order contradicts their file
// numbers: Later was taken after Earlier by the claimed times but carries the
// smaller number.
type OrderBreak struct {
	Earlier, Later             string
	EarlierNumber, LaterNumber int
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
// a Model that still holds the order breaks and uncorrected photos.
func Fit(points []Point, opt Options) (Model, error) {
	opt = opt.withDefaults()
	m := Model{Photos: make([]Photo, len(points))}
	for i, p := range points {
		if p.HasEvidence && (math.IsNaN(p.OffsetSec) || math.IsInf(p.OffsetSec, 0) || !(p.HalfWidth95Sec >= 0) || math.IsInf(p.HalfWidth95Sec, 0)) {
			return Model{}, fmt.Errorf("clock: point %q: offset %v ± %v is not a finite measurement", p.Key, p.OffsetSec, p.HalfWidth95Sec)
		}
		m.Photos[i] = Photo{Key: p.Key, Segment: -1}
	}
	m.OrderBreaks = orderBreaks(points)

	var ev []int
	for i, p := range points {
		if p.HasEvidence {
			ev = append(ev, i)
		}
	}
	if len(ev) == 0 {
		return m, ErrNoEvidence
	}
	sort.SliceStable(ev, func(a, b int) bool { return points[ev[a]].ClaimedUTC.Before(points[ev[b]].ClaimedUTC) })

	for _, seg := range split(points, ev, opt) {
		s := fitSegment(points, seg, opt)
		k := len(m.Segments)
		if k > 0 {
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
			off, h := s.OffsetAt(points[i].ClaimedUTC)
			r := points[i].OffsetSec - off
			m.Photos[i].ResidualSec = r
			m.Photos[i].Outlier = math.Abs(r) > opt.OutlierK*s.SigmaSec && math.Abs(r) > points[i].HalfWidth95Sec+h
		}
	}

	// Photos without evidence join the segment whose evidence span holds
	// their claimed time; before the first or after the last span they join
	// that end segment; between two spans, or inside two, they stay unassigned.
	for i, p := range points {
		if p.HasEvidence {
			continue
		}
		m.Photos[i].Segment = assign(m.Segments, p.ClaimedUTC)
	}
	for i, p := range points {
		k := m.Photos[i].Segment
		if k < 0 {
			continue
		}
		off, h := m.Segments[k].OffsetAt(p.ClaimedUTC)
		m.Photos[i].Corrected = p.ClaimedUTC.Add(-secDuration(off))
		m.Photos[i].HalfWidth95 = secDuration(h)
	}
	return m, nil
}

// lastOf returns the index of the latest-claimed point assigned to segment k.
func lastOf(points []Point, photos []Photo, k int) int {
	best := -1
	for i, ph := range photos {
		if ph.Segment == k && (best < 0 || points[i].ClaimedUTC.After(points[best].ClaimedUTC)) {
			best = i
		}
	}
	return best
}

func secDuration(s float64) time.Duration {
	return time.Duration(math.Round(s * float64(time.Second)))
}

func assign(segs []Segment, t time.Time) int {
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
	t0 := points[idx[0]].ClaimedUTC
	for k, i := range idx {
		x[k] = points[i].ClaimedUTC.Sub(t0).Seconds() / secPerDay
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
	s := Segment{First: points[idx[0]].ClaimedUTC, Last: points[idx[len(idx)-1]].ClaimedUTC, Points: len(idx)}
	x0 := median(x)
	s.T0 = s.First.Add(secDuration(x0 * secPerDay))
	l, err := TheilSen(x, y)
	if err == nil {
		s.DriftSecPerDay = l.Slope
	}
	if err == nil && l.CI {
		s.DriftLowSecPerDay, s.DriftHighSecPerDay, s.DriftMeasured = l.Low, l.High, true
	} else {
		s.DriftLowSecPerDay = s.DriftSecPerDay - opt.AssumedDriftBound
		s.DriftHighSecPerDay = s.DriftSecPerDay + opt.AssumedDriftBound
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

// CameraID groups photos by camera: make, model and serial number, each
// trimmed of spaces and NUL padding, inner runs of white space collapsed and
// case folded, joined as "make|model|serial"; without a serial,
// "make|model". It returns "" when make and model are both empty: such
// photos cannot be grouped by camera.
//
// An id longer than MaxCameraIDBytes (no real camera writes one; a crafted
// or corrupt tag does) is cut and ends with "…#" and the first 16 hex
// digits of the SHA-256 of the whole id, so different long ids stay apart
// while each photo's id, held for the whole batch, stays small. The full
// tag values remain in the file and in `gnomon meta`.
func CameraID(maker, model, serial string) string {
	id := cameraID(maker, model, serial)
	if len(id) <= MaxCameraIDBytes {
		return id
	}
	sum := sha256.Sum256([]byte(id))
	cut := MaxCameraIDBytes - len("…#") - 16
	for cut > 0 && !utf8.RuneStart(id[cut]) {
		cut-- // do not split a character
	}
	return id[:cut] + "…#" + hex.EncodeToString(sum[:8])
}

// MaxCameraIDBytes bounds the length of a CameraID.
const MaxCameraIDBytes = 160

func cameraID(maker, model, serial string) string {
	norm := func(s string) string {
		s = strings.Map(func(r rune) rune {
			if r == 0 || unicode.IsSpace(r) {
				return ' '
			}
			return unicode.ToLower(r)
		}, s)
		return strings.Join(strings.Fields(s), " ")
	}
	mk, md, sn := norm(maker), norm(model), norm(serial)
	if mk == "" && md == "" {
		return ""
	}
	if sn == "" {
		return mk + "|" + md
	}
	return mk + "|" + md + "|" + sn
}

// FileNumber parses the trailing digits of a file's base name without its
// extension: "DSC_0012.JPG" gives 12 with 4 digits. ok is false when the
// name does not end in digits or they are more than 9.
func FileNumber(name string) (n, digits int, ok bool) {
	base := path.Base(strings.ReplaceAll(name, `\`, "/"))
	if i := strings.LastIndexByte(base, '.'); i > 0 {
		base = base[:i]
	}
	j := len(base)
	for j > 0 && base[j-1] >= '0' && base[j-1] <= '9' {
		j--
	}
	digits = len(base) - j
	if digits == 0 || digits > 9 || timestampName(base, j) {
		return 0, 0, false
	}
	for _, c := range base[j:] {
		n = n*10 + int(c-'0')
	}
	return n, digits, true
}

// timestampName reports whether the trailing digits of base, starting at j,
// are the time part of a date-and-time name such as IMG_20271010_150211
// (phones name files by their capture time, common practice): a time of
// day, not a counter, so it says nothing about capture order.
func timestampName(base string, j int) bool {
	if j < 9 || (base[j-1] != '_' && base[j-1] != '-') {
		return false
	}
	for _, c := range base[j-9 : j-1] {
		if c < '0' || c > '9' {
			return false
		}
	}
	return true
}

// orderBreaks sorts the numbered photos by claimed time and reports each
// adjacent pair (same digit count, distinct claimed times) whose number
// steps backward by less than half the counter's range; a larger backward
// step is read as the counter wrapping or being restarted.
func orderBreaks(points []Point) []OrderBreak {
	type np struct {
		i, n, d int
	}
	var ps []np
	for i, p := range points {
		if n, d, ok := FileNumber(p.FileName); ok {
			ps = append(ps, np{i, n, d})
		}
	}
	sort.SliceStable(ps, func(a, b int) bool { return points[ps[a].i].ClaimedUTC.Before(points[ps[b].i].ClaimedUTC) })
	var out []OrderBreak
	for k := 1; k < len(ps); k++ {
		a, b := ps[k-1], ps[k]
		if a.d != b.d || !points[a.i].ClaimedUTC.Before(points[b.i].ClaimedUTC) {
			continue
		}
		mod := int(math.Pow10(a.d))
		forward := ((b.n-a.n)%mod + mod) % mod
		if forward > mod/2 {
			out = append(out, OrderBreak{Earlier: points[a.i].Key, Later: points[b.i].Key, EarlierNumber: a.n, LaterNumber: b.n})
		}
	}
	return out
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
