package report

import (
	_ "embed"
	"errors"
	"fmt"
	"github.com/gnomon-forensics/gnomon/internal/figure"
	"html/template"
	"io"
	"iter"
	"math"
	"path"
	"slices"
	"strconv"
	"strings"
	"time"
	"unicode/utf8"
)

//go:embed report.html.tmpl
var htmlSource string

// pageTemplate is parsed once; html/template escapes every value by context
// (text, attribute, URL), which is what keeps evidence strings inert.
var pageTemplate = template.Must(template.New("page").Funcs(template.FuncMap{
	"vis":   Visible,
	"num":   fmtNum,
	"opt":   fmtOpt,
	"optd":  fmtOptOffset,
	"offs":  offsetSpans,
	"clock": cameraClockText,
	"claim": claimSourceText,
	"sheet": sheetText,
	"kind":  checkKindText,
	"stat":  checkStatusText,
	"fig":   fmtFigure,
	"unc":   fmtUncertainty,
	"style": verdictStyleOf,
	"place": fmtPlace,
	"sub":   func(a, b int) int { return a - b },
}).Parse(htmlSource))

// verdictStyle is how the HTML page shows one verdict: our own label, a
// one-line gloss, a colour class and a mark shape drawn in SVG.
type verdictStyle struct {
	Code  string // the fixed verdict word, as in report.json
	Label string // display label
	Gloss string // what it means, in a sentence
	Class string // CSS class carrying the colour
	Shape string // mark drawn beside it: disc, dial, split, stripe, halfmoon, leaf, pin, rays, ring, cross
}

// verdictStyles lists every verdict in the order the summary shows them.
var verdictStyles = []verdictStyle{
	{"consistent", "Sun agrees", "Every check that could be made agrees with the claimed time and place.", "v-ok", "disc"},
	{"clock_offset", "Clock off", "The camera clock differs from the evidence by an amount that is no time-zone, daylight-saving or 12-hour step: a clock running fast or slow, or set wrongly.", "v-clock", "dial"},
	{"zone_slip", "Zone mix-up", "The clock reads the time of another zone (whole or half hours off).", "v-zone", "split"},
	{"dst_slip", "Summer-time slip", "The clock is one hour off around a daylight-saving change.", "v-dst", "stripe"},
	{"ampm_slip", "Half-day slip", "The time reads twelve hours off: morning and afternoon swapped.", "v-ampm", "halfmoon"},
	{"season_mismatch", "Wrong season", "The sun's path fits another time of year, not the claimed date.", "v-season", "leaf"},
	{"place_mismatch", "Wrong place", "The sun fits the claimed time only somewhere else on Earth.", "v-place", "pin"},
	{"light_mismatch", "Light disagrees", "The exposure needs far more or less light than the sun gave then.", "v-light", "rays"},
	{"ambiguous", "Two readings", "The wall time means more than one instant (an hour repeated or skipped by a clock change, or zones that overlap) and the evidence does not say which.", "v-none", "split"},
	{"unverified", "Not testable", "Nothing independent was available to test the claim.", "v-none", "ring"},
	{"unreadable", "Not read", "Files that could not be read as photos: damaged photos, and files of other kinds (text, video), each card saying which.", "v-bad", "cross"},
	{"sidecar", "Read with its photo", "An XMP sidecar file: its contents are read with the photo it belongs to.", "v-none", "ring"},
}

// Flagged reports whether a verdict calls for the examiner's attention:
// every verdict but consistent, unverified, ambiguous (a wall time with
// several readings the evidence does not separate: no accusation, like
// unverified) and sidecar (a file read with its photo). It is the one rule
// behind the choice of HTML cards and the audit's --strict exit status.
func Flagged(verdict string) bool {
	switch verdict {
	case "consistent", "unverified", "ambiguous", "sidecar":
		return false
	}
	return true
}

func verdictStyleOf(code string) verdictStyle {
	for _, s := range verdictStyles {
		if s.Code == code {
			return s
		}
	}
	return verdictStyle{Code: code, Label: "Unknown verdict", Gloss: "A verdict this page does not know.", Class: "v-none", Shape: "ring"}
}

// WriteHTML writes report.html: one self-contained page (inline CSS and SVG,
// no script, a Content-Security-Policy that forbids scripts and remote
// content) that shows the run, a tally per verdict, each camera's clock chart
// and one card per photo. Thumbnails are referenced by Photo.Thumbnail, a
// relative path inside the report folder (written by WriteThumbnail); any
// other form (absolute, "..", a URL scheme) is not linked. Every string from
// a photo or a sheet is escaped by html/template and shown through Visible.
// It is [NewHTMLSink] fed every photo, with the cards chosen by [Carded].
func WriteHTML(w io.Writer, a *Audit) error {
	if a == nil {
		return errors.New("report: WriteHTML: nil audit")
	}
	c := sorted(a)
	verdicts := make([]string, len(c.Photos))
	for i := range c.Photos {
		verdicts[i] = c.Photos[i].Verdict
	}
	return feed(NewHTMLSink(w, c, Carded(verdicts)), c.Photos)
}

// htmlSink gathers what report.html needs as photos arrive: the carded
// photos themselves (at most MaxCards) and, for every photo, only its
// verdict's count. Its memory is bounded by the cards, not the batch.
type htmlSink struct {
	sinkState
	w      io.Writer
	head   Audit
	carded []bool
	counts map[string]int // every photo, by verdict
	left   map[string]int // photos without a card, by verdict
	cards  []cardPhoto
}

// cardPhoto is a photo kept for its card, with its place in the full list.
type cardPhoto struct {
	p     Photo
	index int // 1-based
}

// NewHTMLSink returns a Sink that writes report.html to w, byte for byte as
// [WriteHTML] does for the same photos when carded is [Carded] of their
// verdicts. head gives the tool, run and cameras (head.Photos is ignored;
// nil is an empty head). carded[i] says whether the i-th photo given gets a
// card (an index beyond len(carded) gets none); at most MaxCards photos are
// kept, so a carded photo beyond that is counted as left without a card.
// A kept photo is a shallow copy: the caller must not change its slices
// (SunPath, Checks, ...) before Close. The page is rendered at Close.
func NewHTMLSink(w io.Writer, head *Audit, carded []bool) Sink {
	return &htmlSink{sinkState: sinkState{format: "HTML"}, w: w, head: headOf(head), carded: carded,
		counts: map[string]int{}, left: map[string]int{}}
}

func (s *htmlSink) Photo(p *Photo) error {
	if err := s.admit(p); err != nil {
		return err
	}
	i := s.n - 1 // admit counted p
	s.counts[p.Verdict]++
	if i < len(s.carded) && s.carded[i] && len(s.cards) < MaxCards {
		s.cards = append(s.cards, cardPhoto{p: *p, index: i + 1})
	} else {
		s.left[p.Verdict]++
	}
	return nil
}

func (s *htmlSink) Close() error {
	if ok, err := s.closing(); !ok {
		return err
	}
	page, err := s.page()
	if err != nil {
		return s.fail(err)
	}
	if err := pageTemplate.Execute(s.w, page); err != nil {
		return s.fail(err)
	}
	return nil
}

type htmlPage struct {
	A        *Audit
	Tally    []tallyRow
	Glossary []glossaryGroup
	TallyBar []barSeg
	Total    int
	Cameras  []cameraView
	// SkyBG is the sky charts' fixed background (rings, spokes, compass
	// letters), rendered once by html/template from constants and reused
	// by every card.
	SkyBG template.HTML
	// Cards yields one card at a time, so that the charts of a large batch
	// are built while the page streams out rather than all held at once.
	Cards iter.Seq[cardView]
	// Carded is how many photos have a card (see Carded); Left counts the
	// photos without one per verdict, and LeftRows lists them in tally order.
	Carded   int
	MaxCards int
	Left     map[string]int
	LeftRows []tallyRow
}

// MaxCards is the most photo cards report.html shows. A card with its sky
// chart is several kilobytes of page; tens of thousands of them make a page
// no browser opens comfortably and no examiner reads. report.json and
// report.csv always hold every photo.
const MaxCards = 1000

// Carded reports, for each photo in report order (given by its verdict),
// whether report.html gives it a card. Every photo gets one when there are
// at most MaxCards. Otherwise the cards go first to the photos whose verdict
// calls for attention ([Flagged]), then to the
// others; within each of those two groups the verdicts take turns, each in
// path order, so that a rare finding is never crowded out by a common one.
// The choice depends only on the photos' order and verdicts, so reruns
// choose alike; taking the verdicts alone lets a caller that streams the
// photos choose the cards before the first photo reaches [NewHTMLSink].
func Carded(verdicts []string) []bool {
	out := make([]bool, len(verdicts))
	if len(verdicts) <= MaxCards {
		for i := range out {
			out[i] = true
		}
		return out
	}
	byVerdict := map[string][]int{}
	var order []string
	for i, v := range verdicts {
		if _, ok := byVerdict[v]; !ok {
			order = append(order, v)
		}
		byVerdict[v] = append(byVerdict[v], i)
	}
	slices.Sort(order)
	var flagged, calm []string
	for _, v := range order {
		if Flagged(v) {
			flagged = append(flagged, v)
		} else {
			calm = append(calm, v)
		}
	}
	left := MaxCards
	for _, group := range [][]string{flagged, calm} {
		next := map[string]int{}
		for left > 0 {
			took := false
			for _, v := range group {
				if k := next[v]; k < len(byVerdict[v]) && left > 0 {
					out[byVerdict[v][k]] = true
					next[v], left, took = k+1, left-1, true
				}
			}
			if !took {
				break
			}
		}
	}
	return out
}

type tallyRow struct {
	Style verdictStyle
	Count int
}

type barSeg struct {
	Class    string
	X, W     string
	Label    string
	Count    int
	TextX    string
	ShowText bool
}

type cardView struct {
	P     Photo
	Index int
	Style verdictStyle
	Thumb string // safe relative URL or ""
	Sky   *skyChart
}

// page builds the page from what the sink gathered.
func (s *htmlSink) page() (htmlPage, error) {
	pg := htmlPage{A: &s.head, Total: s.n, MaxCards: MaxCards, Left: s.left, Carded: len(s.cards), Glossary: glossary()}
	var bg strings.Builder
	if err := pageTemplate.ExecuteTemplate(&bg, "skybg", skyStatic()); err != nil {
		return pg, err
	}
	pg.SkyBG = template.HTML(bg.String()) // our own markup, built from constants only
	known := map[string]bool{}
	for _, st := range verdictStyles {
		known[st.Code] = true
		pg.Tally = append(pg.Tally, tallyRow{st, s.counts[st.Code]})
	}
	var unknown []string
	for code := range s.counts {
		if !known[code] {
			unknown = append(unknown, code)
		}
	}
	slices.Sort(unknown)
	for _, code := range unknown {
		pg.Tally = append(pg.Tally, tallyRow{verdictStyleOf(code), s.counts[code]})
	}
	const barW = 900.0
	x := 0.0
	for _, t := range pg.Tally {
		if t.Count == 0 || pg.Total == 0 {
			continue
		}
		w := barW * float64(t.Count) / float64(pg.Total)
		pg.TallyBar = append(pg.TallyBar, barSeg{Class: t.Style.Class, X: f1(x), W: f1(w), Label: t.Style.Label,
			Count: t.Count, TextX: f1(x + w/2), ShowText: w >= 28})
		x += w
	}
	for _, c := range s.head.Cameras {
		pg.Cameras = append(pg.Cameras, buildClock(c))
	}
	for _, t := range pg.Tally {
		if n := pg.Left[t.Style.Code]; n > 0 {
			pg.LeftRows = append(pg.LeftRows, tallyRow{t.Style, n})
		}
	}
	pg.Cards = func(yield func(cardView) bool) {
		for _, c := range s.cards {
			if !yield(cardView{P: c.p, Index: c.index, Style: cardStyle(&c.p),
				Thumb: safeThumb(c.p.Thumbnail), Sky: buildSky(c.p)}) {
				return
			}
		}
	}
	return pg, nil
}

// safeThumb returns rel if it is a plain relative path inside the report
// folder, else "". Thumbnail names are chosen by the caller (never taken from
// the evidence), so a strict alphabet costs nothing: ASCII letters, digits,
// '.', '_', '-' and '/', no empty, "." or ".." segment, no leading slash.
func safeThumb(rel string) string {
	if rel == "" || path.Clean(rel) != rel || strings.HasPrefix(rel, "/") {
		return ""
	}
	for _, seg := range strings.Split(rel, "/") {
		if seg == "" || seg == "." || seg == ".." {
			return ""
		}
	}
	for _, r := range rel {
		ok := r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || strings.ContainsRune("._-/", r)
		if !ok {
			return ""
		}
	}
	return rel
}

// Visible returns s for display with nothing hidden: bytes that are not
// valid UTF-8 become ⟦0xFF⟧, and control, format and direction-changing
// characters (which could reorder or hide text, e.g. U+202E RIGHT-TO-LEFT
// OVERRIDE) become ⟦U+202E⟧. Values over 2,000 characters are cut, saying
// how much was left out (report.json keeps the whole value). Escaping for
// HTML is html/template's job, not this function's.
func Visible(s string) string {
	const limit = 2000
	var b strings.Builder
	n := 0
	for i := 0; i < len(s); {
		if n >= limit {
			fmt.Fprintf(&b, " … (%d more bytes, see report.json)", len(s)-i)
			break
		}
		r, size := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && size == 1:
			fmt.Fprintf(&b, "⟦0x%02X⟧", s[i])
		case hiddenRune(r):
			fmt.Fprintf(&b, "⟦U+%04X⟧", r)
		default:
			b.WriteRune(r)
		}
		i += size
		n++
	}
	return b.String()
}

func hiddenRune(r rune) bool {
	switch {
	case r < 0x20, r >= 0x7f && r <= 0x9f: // C0, DEL, C1 controls
		return true
	case r == 0x061c, r == 0x200b, r == 0x200c, r == 0x200d, r == 0x200e, r == 0x200f,
		r >= 0x202a && r <= 0x202e, r >= 0x2060 && r <= 0x2069, r == 0x2028, r == 0x2029,
		r == 0xfeff, r >= 0xfff9 && r <= 0xfffb:
		return true
	}
	return false
}

func f1(x float64) string { return strconv.FormatFloat(x, 'f', 1, 64) }

// fmtNum formats a figure with d decimals, using a true minus sign.
func fmtNum(x float64, d int) string {
	if n := nonFiniteName(x); n != "" {
		return n
	}
	s := strconv.FormatFloat(x, 'f', d, 64)
	if strings.HasPrefix(s, "-") {
		s = "−" + s[1:]
	}
	return s
}

func fmtOpt(x *float64, d int) string {
	if x == nil {
		return "—"
	}
	return fmtNum(*x, d)
}

// fmtOffset writes seconds as a signed, readable span to the second:
// "+2 h 05 min 09 s" (figure.Span), for figures with no interval.
func fmtOffset(sec float64) string { return figure.Span(sec, 0) }

// spans is an offset and its 95 % interval as the card shows them.
type spans struct{ Sec, Low, High string }

// offsetSpans formats a photo's offset and interval with the step the
// interval supports, by the rule the explanation sentence uses
// (figure.Spans), so that table and sentence show the same digits; nil
// when the photo has no offset.
func offsetSpans(p Photo) *spans {
	if p.OffsetS == nil || p.OffsetLowS == nil || p.OffsetHighS == nil {
		return nil
	}
	var s spans
	s.Sec, s.Low, s.High = figure.Spans(*p.OffsetS, *p.OffsetLowS, *p.OffsetHighS)
	return &s
}

// cameraClockText is a camera's clock in the words of the chart header: the
// zone it was set to, its error with the 95 % interval, and its drift with
// its interval or "drift not determined", every figure rounded by the one
// rule (package figure).
func cameraClockText(c Camera) string {
	var b strings.Builder
	switch {
	case c.OffsetS == nil:
		b.WriteString("no offset modelled")
	default:
		if c.ClockZone != "" {
			b.WriteString("clock on " + c.ClockZone + ", ")
		} else {
			b.WriteString("zone setting undecided, ")
		}
		off := "off by "
		if c.ClockZone == "" {
			off = "off UTC by "
		}
		if c.OffsetLowS != nil && c.OffsetHighS != nil {
			sec, low, high := figure.Spans(*c.OffsetS, *c.OffsetLowS, *c.OffsetHighS)
			b.WriteString(off + sec + " (95 % " + low + " to " + high + ")")
		} else {
			b.WriteString(off + fmtOffset(*c.OffsetS))
		}
	}
	b.WriteString(" · ")
	if c.DriftSPerDay == nil || c.DriftLowSPerDay == nil || c.DriftHighSPerDay == nil {
		b.WriteString("drift not determined")
		return b.String()
	}
	d, lo, hi := *c.DriftSPerDay, *c.DriftLowSPerDay, *c.DriftHighSPerDay
	u := max(hi-d, d-lo)
	b.WriteString("drift " + figure.Number(d, u, 2) + " s/day (95 % " + figure.Number(lo, u, 2) + " to " + figure.Number(hi, u, 2) + ")")
	return b.String()
}

// fmtFigure writes a check's figure rounded to the step its uncertainty
// supports (GUM §7.2.6, package figure); two decimals when it has none.
func fmtFigure(x, u *float64) string {
	if x == nil {
		return "—"
	}
	if u == nil {
		return figure.Number(*x, 0, plainDecimals(*x))
	}
	return figure.Number(*x, *u, 2)
}

// fmtUncertainty writes an uncertainty with two significant digits.
func fmtUncertainty(u *float64) string {
	if u == nil {
		return "—"
	}
	return figure.Uncertainty(*u)
}

func fmtOptOffset(x *float64) string {
	if x == nil {
		return "—"
	}
	return fmtOffset(*x)
}

func parseUTC(s string) (time.Time, bool) {
	t, err := time.Parse(time.RFC3339Nano, s)
	return t, err == nil
}

// fmtPlace shows a position, or why there is none to show.
func fmtPlace(lat, lon *float64) string {
	if lat == nil && lon == nil {
		return "no position"
	}
	if _, why := point(lat, lon); why != "" {
		return fmt.Sprintf("%s°, %s° (not drawn: %s)", fmtOpt(lat, 5), fmtOpt(lon, 5), why)
	}
	return fmt.Sprintf("%s°, %s°", figure.Degrees(*lat), figure.Degrees(*lon))
}

// fmtTick writes a tick label: a signed span without zero sub-units.
func fmtTick(sec float64) string {
	if sec == 0 {
		return "0"
	}
	sign := "+"
	if sec < 0 {
		sign, sec = "−", -sec
	}
	if sec < 60 {
		return sign + strconv.FormatFloat(sec, 'f', -1, 64) + " s"
	}
	t := int64(math.Round(sec))
	parts := []string{}
	for _, u := range []struct {
		n    int64
		name string
	}{{86400, "d"}, {3600, "h"}, {60, "min"}, {1, "s"}} {
		if q := t / u.n; q > 0 {
			parts = append(parts, fmt.Sprintf("%d %s", q, u.name))
			t -= q * u.n
		}
	}
	return sign + strings.Join(parts, " ")
}

// sheetText describes what the examiner wrote for one measured object and
// the north correction applied to it, so that a card shows the raw sheet
// values beside the sun direction derived from them.
func sheetText(m Measured) string {
	v := m.Sheet
	num := func(x float64) string { return figure.Number(x, 0, 1) }
	var parts []string
	if v.Bearing != nil {
		what := "shadow bearing"
		if v.Kind == "sighting" {
			what = "sun bearing"
		}
		parts = append(parts, fmt.Sprintf("%s %s° from %s north (σ %s°)", what, num(*v.Bearing), v.North, num(v.BearingSD)))
	}
	if v.ShadowLength != nil && v.ObjectHeight != nil {
		parts = append(parts, fmt.Sprintf("shadow length %s for height %s", strconv.FormatFloat(*v.ShadowLength, 'f', -1, 64), strconv.FormatFloat(*v.ObjectHeight, 'f', -1, 64)))
	}
	if v.SunAltitude != nil {
		parts = append(parts, fmt.Sprintf("sun altitude %s°", num(*v.SunAltitude)))
	}
	switch {
	case v.North == "magnetic" && v.Declination != nil:
		parts = append(parts, fmt.Sprintf("declination %s° as given in the sheet", num(m.NorthCorrection)))
	case v.North == "magnetic":
		parts = append(parts, fmt.Sprintf("magnetic declination %s° ± %s° (World Magnetic Model 2025, 1σ, included in the σ below)",
			figure.Number(m.NorthCorrection, m.NorthCorrectionSD, 2), figure.Uncertainty(m.NorthCorrectionSD)))
	case v.North == "grid":
		parts = append(parts, fmt.Sprintf("grid convergence %s°", figure.Number(m.NorthCorrection, 0, 2)))
	}
	if len(parts) == 0 {
		return ""
	}
	return "sheet: " + strings.Join(parts, "; ")
}

// cardStyle is a photo's verdict style, with the label of an unreadable
// item saying what it is (issue 18): a damaged photo is evidence that
// should have been readable; a text file or a video is not a photo at all.
// The kind comes from the container found in the bytes and, when the bytes
// are no image, from the name's extension.
func cardStyle(p *Photo) verdictStyle {
	st := verdictStyleOf(p.Verdict)
	if p.Verdict != "unreadable" {
		return st
	}
	ext := strings.ToLower(path.Ext(p.Path))
	switch {
	case p.Container != "" && p.Container != "unknown":
		st.Label = "Damaged photo"
	case slices.Contains([]string{".jpg", ".jpeg", ".jpe", ".heic", ".heif", ".avif", ".png", ".webp", ".tif", ".tiff", ".dng", ".nef", ".cr2", ".cr3", ".arw", ".orf", ".rw2", ".pef", ".raf"}, ext):
		st.Label = "Damaged photo: its bytes are no image"
	case slices.Contains([]string{".mp4", ".mov", ".m4v", ".avi", ".mts", ".m2ts", ".3gp", ".mkv", ".webm"}, ext):
		st.Label = "Not a photo: a video, not read yet"
	case slices.Contains([]string{".txt", ".csv", ".md", ".log", ".json", ".xml", ".html", ".htm"}, ext):
		st.Label = "Not a photo: a text file"
	case slices.Contains([]string{".pdf", ".doc", ".docx", ".odt", ".rtf"}, ext):
		st.Label = "Not a photo: a document"
	default:
		st.Label = "Not a photo, or of a kind this tool does not read"
	}
	return st
}

// plainDecimals is how many decimals a figure with no uncertainty shows:
// none for a whole number (a file number, a count: "1234", not "1234.00"),
// else two.
func plainDecimals(x float64) int {
	if x == math.Trunc(x) && math.Abs(x) < 1e15 {
		return 0
	}
	return 2
}
